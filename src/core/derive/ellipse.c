/* ellipse.c: the annual parallax ellipse.
 *
 * Computes: ellipse_a = parallax [mas] (semi-major axis, parallel to the
 *   ecliptic); ellipse_b = parallax |sin elat| [mas] (semi-minor axis, along
 *   ecliptic latitude); ellipse_pa [deg], the position angle (from north
 *   through east) of the major axis: that of ecliptic north plus 90 deg,
 *     PA_north = atan2(-sin e cos a, cos e cos d + sin e sin d sin a).
 * Method: the parallactic displacement for a circular Earth orbit
 *   (dl cos b = p sin(l_sun - l), db = -p sin b cos(l_sun - l); e.g. the
 *   Astronomical Almanac, and REFERENCES.md 7).  A star at the ecliptic pole
 *   traces a circle of radius p; one on the ecliptic a line of half-length p.
 * Inputs: parallax [mas] (zero point subtracted), ra, dec [deg]; elat.
 * Outputs: ellipse_a, ellipse_b [mas], ellipse_pa in [0, 180) deg.
 * Validity: positive parallaxes; the Earth's orbit taken as circular
 *   (eccentricity 0.017 changes the axes by under 2 per cent).
 */
#include <erfa.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "../constants.h"
#include "derive.h"
#include "methods.h"

/* The orientation from the measured position: its uncertainty from
 * position errors is negligible. */
static double
position_angle (double ra_deg, double dec_deg)
{
  double eps = sl_obliquity_j2000 ();
  double ra = ra_deg * ERFA_DD2R, dec = dec_deg * ERFA_DD2R;
  double pa = atan2 (-sin (eps) * cos (ra), cos (eps) * cos (dec) + sin (eps) * sin (dec) * sin (ra)) * ERFA_DR2D
              + 90.0;

  return fmod (fmod (pa, 180.0) + 180.0, 180.0);
}

static SlDual
abs_sin_latitude (SlDual elat)
{
  return sl_dual_fabs (sl_dual_sin (sl_dual_scale (elat, ERFA_DD2R)));
}

static gboolean
same_bits (double a, double b)
{
  return memcmp (&a, &b, sizeof a) == 0;
}

/* A star's Monte Carlo draws share its measured position, and its
 * latitude when the position has no errors: the trigonometry of the
 * previous call on this thread is reused when its arguments are the
 * same bits (the same operations, so the same numbers). */
static _Thread_local struct {
  gboolean set;
  double   ra, dec, pa;
  double   elat;
  SlDual   abs_sin_b;
} memo;

static void
compute_ellipse (SlEval *ev)
{
  SlDual parallax, elat, abs_sin_b;
  double ra, dec, pa;

  if (!ev->has_in[SL_FIELD_PARALLAX] || !ev->has[SL_Q_ELAT]
      || (ev->flags & SL_FLAG_NONPOSITIVE_PARALLAX))
    return;
  parallax = ev->in[SL_FIELD_PARALLAX];
  elat = ev->q[SL_Q_ELAT];
  ra = ev->measured[SL_FIELD_RA];
  dec = ev->measured[SL_FIELD_DEC];
  if (ev->rng == NULL || elat.n != 0)
    {
      abs_sin_b = abs_sin_latitude (elat);
      pa = position_angle (ra, dec);
    }
  else
    {
      if (!memo.set || !same_bits (memo.ra, ra) || !same_bits (memo.dec, dec))
        {
          memo.ra = ra;
          memo.dec = dec;
          memo.pa = position_angle (ra, dec);
          memo.elat = elat.v;
          memo.abs_sin_b = abs_sin_latitude (elat);
          memo.set = TRUE;
        }
      else if (!same_bits (memo.elat, elat.v))
        {
          memo.elat = elat.v;
          memo.abs_sin_b = abs_sin_latitude (elat);
        }
      abs_sin_b = memo.abs_sin_b;
      pa = memo.pa;
    }
  sl_eval_set (ev, SL_Q_ELLIPSE_A, parallax);
  sl_eval_set (ev, SL_Q_ELLIPSE_B, sl_dual_mul (parallax, abs_sin_b));
  sl_eval_set (ev, SL_Q_ELLIPSE_PA, sl_dual_const (pa));
}

const SlModule sl_module_ellipse = {
  .name = "parallax-ellipse",
  .version = 1,
  .method = N_("annual parallax ellipse for a circular Earth orbit"),
  .citation = "Astronomical Almanac (parallax in ecliptic coordinates); REFERENCES.md 7",
  .formula = N_("ellipse_a = parallax; ellipse_b = parallax |sin elat|; ellipse_pa = PA of ecliptic north + 90 deg"),
  .validity = N_("positive parallaxes; circular Earth orbit (axes good to 2 per cent)"),
  .inputs = { SL_FIELD_PARALLAX, SL_FIELD_PARALLAX_ERR, SL_FIELD_RA, SL_FIELD_DEC, SL_FIELD_NONE },
  .needs = { SL_Q_ELAT, SL_Q_PLX_SNR, SL_Q_NONE },
  .gives = { SL_Q_ELLIPSE_A, SL_Q_ELLIPSE_B, SL_Q_ELLIPSE_PA, SL_Q_NONE },
  .parameters = "parallax_zero_point",
  .compute = compute_ellipse,
};
