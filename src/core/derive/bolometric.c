/* bolometric.c: bolometric correction and bolometric magnitude.
 *
 * Computes: bc = BC_V(log Teff) [mag] and mbol = M_V + BC_V [mag].
 * Method: Flower (1996, ApJ 469, 355) BC_V as a polynomial in log Teff in
 *   three pieces, with the coefficients as corrected by Torres (2010, AJ
 *   140, 1158, Table 1; the original print had misprints).  Boundaries: the
 *   first piece below log T = 3.70, the second for 3.70 <= log T < 3.90,
 *   the third from 3.90 (our choice of ownership; the pieces do not join:
 *   the jump is 0.022 mag at 3.70 and 0.003 mag at 3.90).
 * Inputs: teff [K], absmag [mag].  Outputs: bc, mbol.
 * Validity: 2900-52 500 K, the range of Flower's calibration stars; outside
 *   it no value and the flag teff_out_of_range.
 * Note: the zero point of BC is arbitrary but M_bol,sun used with it is not
 *   (Torres 2010): see sl_mbol_sun_flower and luminosity.c.
 */
#include <glib/gi18n.h>
#include <math.h>

#include "../constants.h"
#include "derive.h"
#include "methods.h"

/* Torres (2010), Table 1: a + b x + c x^2 + ... with x = log10 Teff. */
static const double bc_cool[] = {
  -0.190537291496456e+05, 0.155144866764412e+05, -0.421278819301717e+04, 0.381476328422343e+03,
};
static const double bc_middle[] = {
  -0.370510203809015e+05, 0.385672629965804e+05, -0.150651486316025e+05, 0.261724637119416e+04,
  -0.170623810323864e+03,
};
static const double bc_hot[] = {
  -0.118115450538963e+06, 0.137145973583929e+06, -0.636233812100225e+05, 0.147412923562646e+05,
  -0.170587278406872e+04, 0.788731721804990e+02,
};

#define TEFF_MIN 2900.0
#define TEFF_MAX 52500.0

static const double *
bc_piece (double log_teff, int *n)
{
  if (log_teff < 3.70)
    return *n = G_N_ELEMENTS (bc_cool), bc_cool;
  if (log_teff < 3.90)
    return *n = G_N_ELEMENTS (bc_middle), bc_middle;
  return *n = G_N_ELEMENTS (bc_hot), bc_hot;
}

double
sl_flower_bc (double log_teff, double *dbc_dlogt)
{
  int n;
  const double *c = bc_piece (log_teff, &n);
  SlDual bc = sl_dual_poly (c, n, sl_dual_input (log_teff, 0, TRUE));

  if (dbc_dlogt)
    *dbc_dlogt = bc.d[0];
  return bc.v;
}

gboolean
sl_flower_bc_in_range (double teff)
{
  return teff >= TEFF_MIN && teff <= TEFF_MAX;
}

double
sl_mbol_sun_flower (void)
{
  return SL_SUN_V_MAG + SL_DISTMOD_AU_AT_10PC + sl_flower_bc (log10 (SL_NOMINAL_SUN_TEFF_K), NULL);
}

static void
compute_bolometric (SlEval *ev)
{
  SlDual log_teff;
  const double *c;
  int n;

  if (!ev->has[SL_Q_TEFF])
    return;
  if (!sl_flower_bc_in_range (ev->q[SL_Q_TEFF].v))
    {
      ev->flags |= ev->rng ? 0 : SL_FLAG_TEFF_OUT_OF_RANGE;
      return;
    }
  log_teff = sl_dual_log10 (ev->q[SL_Q_TEFF]);
  c = bc_piece (log_teff.v, &n);
  sl_eval_set (ev, SL_Q_BC, sl_dual_poly (c, n, log_teff));

  if (ev->has[SL_Q_ABSMAG])
    sl_eval_set (ev, SL_Q_MBOL, sl_dual_add (ev->q[SL_Q_ABSMAG], ev->q[SL_Q_BC]));
}

const SlModule sl_module_bolometric = {
  .name = "bolometric",
  .version = 1,
  .method = N_("Flower (1996) BC_V(log Teff) with Torres (2010) coefficients"),
  .citation = "Flower 1996, ApJ 469, 355; Torres 2010, AJ 140, 1158 (Table 1)",
  .formula = N_("bc = polynomial in log10 teff (three pieces, boundaries 3.70 and 3.90); mbol = absmag + bc"),
  .validity = N_("2900 K <= teff <= 52 500 K"),
  .inputs = { SL_FIELD_NONE },
  .needs = { SL_Q_TEFF, SL_Q_ABSMAG, SL_Q_NONE },
  .gives = { SL_Q_BC, SL_Q_MBOL, SL_Q_NONE },
  .parameters = "",
  .compute = compute_bolometric,
};
