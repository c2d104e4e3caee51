/* parallax-path.h: the apparent annual path of stars on the sky.
 *
 * For each chosen star, the displacement by parallax (with the Earth's
 * barycentric position from ERFA eraEpv00, not a circle), alone or with
 * the proper motion over a span of years, as offsets in mas in the tangent
 * plane with east to the left; month ticks; the band the parallax error
 * allows.  Several stars as small multiples on a common or per-star scale,
 * each titled with designation, parallax and ecliptic latitude.
 */
#pragma once

#include "figure.h"
#include "starset.h"

G_BEGIN_DECLS

typedef struct {
  double   start_jyear;     /* the path starts here (Julian year) */
  double   years;           /* and lasts this long */
  gboolean proper_motion;   /* add the proper motion (from the star's epoch) */
  gboolean common_scale;    /* one scale for all panels */
  gboolean band;            /* the band of parallax -/+ its error */
  const char *empty_message;  /* shown when no star is chosen; NULL: how to choose them on the command line */
} SlParallaxOptions;

void sl_parallax_options_init (SlParallaxOptions *options);

/* The parallactic displacement at Julian year JYEAR (TDB taken as TT, a
 * difference far below the accuracy needed) of a star at (RA, DEC) deg with
 * PARALLAX mas: east = d(alpha) cos(delta), north = d(delta), in mas:
 *   east  = p (X sin a - Y cos a)
 *   north = p (X cos a sin d + Y sin a sin d - Z cos d)
 * with (X, Y, Z) the Earth's barycentric position in au (eraEpv00). */
void sl_parallax_offset (double ra, double dec, double parallax, double jyear,
                         double *east, double *north);

gboolean sl_parallax_draw (SlFigure *fig, const SlStarSet *stars, const SlParallaxOptions *options,
                           GPtrArray *notes, GError **error);

G_END_DECLS
