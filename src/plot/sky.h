/* sky.h: star positions on the sky.
 *
 * All-sky: the Hammer-Aitoff equal-area projection in equatorial (right
 * ascension increasing to the left, as the sky is seen) or galactic
 * coordinates (ERFA eraIcrs2g), a labelled graticule, the ecliptic of
 * J2000 and the galactic plane as lines, marker area scaled by apparent
 * magnitude.  Field: a gnomonic projection around a centre with
 * proper-motion arrows over a number of years.  Optionally each star's
 * annual parallax ellipse, magnified, at its position.
 */
#pragma once

#include "figure.h"
#include "starset.h"

G_BEGIN_DECLS

typedef enum {
  SL_SKY_EQUATORIAL,
  SL_SKY_GALACTIC,
} SlSkyCoordinates;

typedef struct {
  SlSkyCoordinates   coordinates;
  gboolean           field;              /* gnomonic field view instead of all-sky */
  double             centre_ra, centre_dec, field_deg;   /* the field: centre and width, deg */
  double             pm_years;           /* proper-motion arrows over this span (field view); 0: none */
  double             ellipse_scale;      /* magnify parallax ellipses by this; 0: none */
  const char *const *highlight;          /* designations to mark and label */
} SlSkyOptions;

void     sl_sky_options_init (SlSkyOptions *options);

/* Hammer-Aitoff (Hammer 1892; Snyder 1987, "Map Projections - A Working
 * Manual", USGS PP 1395): longitude LON in [-pi, pi] and latitude LAT
 * (rad) to x in [-2 sqrt 2, 2 sqrt 2], y in [-sqrt 2, sqrt 2], east of
 * the centre to the left is the caller's business (negate x). */
void     sl_hammer_aitoff (double lon, double lat, double *x, double *y);

/* Gnomonic projection about (RA0, DEC0) (all rad) to standard
 * coordinates XI (east), ETA (north) in rad; FALSE for the far side. */
gboolean sl_gnomonic (double ra, double dec, double ra0, double dec0, double *xi, double *eta);

gboolean sl_sky_draw (SlFigure *fig, const SlStarSet *stars, const SlSkyOptions *options,
                      GPtrArray *notes, GError **error);

G_END_DECLS
