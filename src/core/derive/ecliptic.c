/* ecliptic.c: ecliptic longitude and latitude.
 *
 * Computes: elon, elat [deg]: the ICRS position referred to the mean
 *   ecliptic and equinox of J2000.0 (IAU 2006 precession, obliquity
 *   84381.406 arcsec, Hilton et al. 2006, CeMDA 94, 351), including the
 *   frame bias (< 25 mas).
 * Method: ERFA (the IAU SOFA algorithms) for the values: the matrix of
 *   eraEcm06 at J2000 applied to the position, which is what eraEqec06 does; the
 *   partial derivatives for the error propagation come from the fixed-
 *   obliquity rotation (sin b = sin d cos e - cos d sin e sin a;
 *   l = atan2(sin a cos e + tan d sin e, cos a)), which differs from ERFA
 *   by at most 0.03 arcsec and not at all in its derivatives to first order.
 * Inputs: ra, dec [deg] (at the row's epoch; no precession to date).
 * Outputs: elon in [0, 360), elat in [-90, 90].
 * Validity: everywhere; the ecliptic is that of J2000, not of date.
 */
#include <erfa.h>
#include <glib/gi18n.h>

#include "../constants.h"
#include "derive.h"
#include "methods.h"

/* The ICRS-to-ecliptic matrix of J2000 (ERFA eraEcm06), the same for every
 * star: computed once.  eraEqec06 is this matrix applied to the position
 * vector, as done here. */
static const double (*ecliptic_matrix (void))[3]
{
  static double rm[3][3];
  static gsize done = 0;

  if (g_once_init_enter (&done))
    {
      eraEcm06 (SL_J2000_JD, 0.0, rm);
      g_once_init_leave (&done, 1);
    }
  return (const double (*)[3]) rm;
}

double
sl_obliquity_j2000 (void)
{
  static double eps;
  static gsize done = 0;

  if (g_once_init_enter (&done))
    {
      eps = eraObl06 (SL_J2000_JD, 0.0);
      g_once_init_leave (&done, 1);
    }
  return eps;
}

void
sl_ecliptic_from_icrs (double ra_deg, double dec_deg, double *lon_deg, double *lat_deg)
{
  double p[3], v[3], lon, lat;

  eraS2c (ra_deg * ERFA_DD2R, dec_deg * ERFA_DD2R, p);
  eraRxp ((double (*)[3]) ecliptic_matrix (), p, v);
  eraC2s (v, &lon, &lat);
  *lon_deg = eraAnp (lon) * ERFA_DR2D;
  *lat_deg = lat * ERFA_DR2D;
}

static void
compute_ecliptic (SlEval *ev)
{
  double eps = sl_obliquity_j2000 ();
  double lon, lat;
  SlDual a, d, sin_b, y, x, l, b;

  if (!ev->has_in[SL_FIELD_RA] || !ev->has_in[SL_FIELD_DEC])
    return;
  if (ev->in[SL_FIELD_RA].n == 0 && ev->in[SL_FIELD_DEC].n == 0)
    {
      /* A Monte Carlo draw: the values are all that is needed. */
      sl_ecliptic_from_icrs (ev->in[SL_FIELD_RA].v, ev->in[SL_FIELD_DEC].v, &lon, &lat);
      sl_eval_set (ev, SL_Q_ELON, sl_dual_const (lon));
      sl_eval_set (ev, SL_Q_ELAT, sl_dual_const (lat));
      return;
    }
  a = sl_dual_scale (ev->in[SL_FIELD_RA], ERFA_DD2R);
  d = sl_dual_scale (ev->in[SL_FIELD_DEC], ERFA_DD2R);

  sin_b = sl_dual_sub (sl_dual_scale (sl_dual_sin (d), cos (eps)),
                       sl_dual_scale (sl_dual_mul (sl_dual_cos (d), sl_dual_sin (a)), sin (eps)));
  b = sl_dual_chain1 (asin (sin_b.v), 1.0 / sqrt (1.0 - sin_b.v * sin_b.v), sin_b);
  y = sl_dual_add (sl_dual_scale (sl_dual_sin (a), cos (eps)),
                   sl_dual_scale (sl_dual_div (sl_dual_sin (d), sl_dual_cos (d)), sin (eps)));
  x = sl_dual_cos (a);
  l = sl_dual_atan2 (y, x);

  sl_ecliptic_from_icrs (ev->in[SL_FIELD_RA].v, ev->in[SL_FIELD_DEC].v, &lon, &lat);
  l = sl_dual_scale (l, ERFA_DR2D);
  b = sl_dual_scale (b, ERFA_DR2D);
  l.v = lon;
  b.v = lat;
  sl_eval_set (ev, SL_Q_ELON, l);
  sl_eval_set (ev, SL_Q_ELAT, b);
}

const SlModule sl_module_ecliptic = {
  .name = "ecliptic",
  .version = 1,
  .method = N_("ICRS to mean ecliptic and equinox of J2000 (IAU 2006), ERFA eraEqec06"),
  .citation = "IAU 2006 precession (Hilton et al. 2006, CeMDA 94, 351); ERFA/SOFA eraEqec06",
  .formula = N_("(elon, elat) = rotation of (ra, dec) by the J2000 obliquity 23.4392794 deg, with frame bias"),
  .validity = N_("everywhere; ecliptic of J2000, position at its own epoch"),
  .inputs = { SL_FIELD_RA, SL_FIELD_RA_ERR, SL_FIELD_DEC, SL_FIELD_DEC_ERR, SL_FIELD_NONE },
  .needs = { SL_Q_NONE },
  .gives = { SL_Q_ELON, SL_Q_ELAT, SL_Q_NONE },
  .parameters = "",
  .compute = compute_ecliptic,
};
