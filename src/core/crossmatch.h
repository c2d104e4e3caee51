/* crossmatch.h: positions moved to a common epoch, and a sky index that
 * finds every star within a radius of a position.
 *
 * Method: both catalogues' positions are carried to one epoch with their
 * proper motions, parallax and radial velocity (ERFA's space motion,
 * eraPmsafe); the existing stars are then bucketed in declination zones
 * at least as tall as the radius, each zone sorted by right ascension, so
 * a query looks at the neighbouring zones only, in an RA window widened
 * by 1/cos(dec), wrapping at RA 0/360 and taking whole zones next to a
 * pole.  Distances are exact great-circle separations.
 *
 * Inputs: ICRS right ascension and declination in degrees, proper motion
 * in mas/yr (pmra includes cos dec), parallax in mas, radial velocity in
 * km/s, epochs in Julian years (TDB; the difference from TT or UTC moves
 * no star measurably).  Outputs: positions in degrees, separations in
 * arcseconds.
 *
 * Validity: any position on the sphere; radii up to a few degrees (the
 * zones and windows stay correct for larger ones but the index gains
 * nothing).  Without a parallax a star is put at a great distance, so
 * its proper motion is carried as a straight line on the sky; without an
 * epoch or a proper motion a position is not moved.
 */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

/* One star's astrometry; NAN where not known. */
typedef struct {
  double ra, dec;        /* deg, ICRS */
  double pmra, pmdec;    /* mas/yr, pmra times cos dec */
  double parallax;       /* mas; NAN, zero or negative: unknown distance */
  double vrad;           /* km/s; NAN: taken as 0 */
  double epoch;          /* Julian year of ra, dec */
} SlAstrometry;

/* Sets every member to NAN. */
void sl_astrometry_init (SlAstrometry *a);

/* Moves A's position to EPOCH (Julian year): *RA and *DEC in degrees.
 * Returns TRUE if it moved, FALSE if it stays where it is (no epoch, no
 * proper motion, the same epoch, or ERFA could not solve it); the
 * position is written either way. */
gboolean sl_astrometry_propagate (const SlAstrometry *a, double epoch, double *ra, double *dec);

/* Great-circle separation of two positions in degrees, in arcseconds
 * (ERFA's eraSeps, from the cross and dot products: accurate at every
 * distance). */
double sl_sky_separation (double ra1, double dec1, double ra2, double dec2);

typedef struct SlSkyIndex SlSkyIndex;

/* A star found near a position. */
typedef struct {
  gint64 key;           /* as given to sl_sky_index_add */
  double separation;    /* arcsec */
} SlSkyCandidate;

/* An index for queries of RADIUS_ARCSEC (> 0).  Add the points, then
 * sl_sky_index_build; after that it is read-only (and safe to query from
 * several threads). */
SlSkyIndex *sl_sky_index_new   (double radius_arcsec);
void        sl_sky_index_add   (SlSkyIndex *index, double ra, double dec, gint64 key);
void        sl_sky_index_build (SlSkyIndex *index);
gsize       sl_sky_index_size  (const SlSkyIndex *index);
double      sl_sky_index_radius (const SlSkyIndex *index);
void        sl_sky_index_free  (SlSkyIndex *index);

/* Fills FOUND (an array of SlSkyCandidate, emptied first) with every key
 * that has a point within the radius of (RA, DEC), each once at its
 * nearest point, nearest first (ties by key).  Returns how many. */
guint sl_sky_index_query (const SlSkyIndex *index, double ra, double dec, GArray *found);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlSkyIndex, sl_sky_index_free)

/* The outcome for one incoming row of a cross-match. */
typedef enum {
  SL_MATCH_NONE,        /* no star within the radius: a new star */
  SL_MATCH_UNIQUE,      /* one star within the radius, claimed by no other row */
  SL_MATCH_AMBIGUOUS,   /* two or more stars within the radius, or its
                         * star is the nearest of another row too */
} SlMatchStatus;

typedef struct {
  SlMatchStatus status;
  gint64        star;          /* nearest star's index in STARS, or -1 */
  double        separation;    /* arcsec to it at the common epoch; NAN if none */
  guint         n_candidates;  /* stars within the radius */
} SlMatch;

/* The whole rule in one call (what the import does row by row): moves
 * STARS and ROWS to EPOCH, and for each row finds the stars within
 * RADIUS_ARCSEC.  A row is UNIQUE when exactly one star lies within the
 * radius and no other row has that star as its nearest; with two or more
 * stars, or a star that is the nearest of several rows, it is AMBIGUOUS
 * (and so is every other row with that nearest star).  OUT has N_ROWS
 * entries. */
void sl_crossmatch (const SlAstrometry *stars, gsize n_stars,
                    const SlAstrometry *rows, gsize n_rows,
                    double radius_arcsec, double epoch, SlMatch *out);

G_END_DECLS
