/* temperature.c: effective temperature from the intrinsic colour.
 *
 * Computes: teff [K] from (B-V)0, by one of two methods (parameter teff):
 *  - flower (default): log Teff = sum_i c_i (B-V)0^i, Flower (1996, ApJ 469,
 *    355), with the coefficients as corrected and reprinted by Torres
 *    (2010, AJ 140, 1158, Table 2; main sequence, subgiants and giants).
 *    Validity: Flower's calibration stars span 2900-52 500 K; the
 *    polynomial gives that range for -0.343 <= (B-V)0 <= 1.805.
 *  - ballesteros: the black-body-based relation of Ballesteros (2012, EPL
 *    97, 34008), T = 4600 K [1/(0.92 (B-V) + 1.7) + 1/(0.92 (B-V) + 0.62)].
 *    It agrees with Flower to a few per cent between 4000 and 9000 K only
 *    and underestimates hot stars badly (REFERENCES.md 3.1), so it is
 *    given for 0.103 <= (B-V)0 <= 1.370, where it yields 9000-4000 K.
 * Inputs: bv0 [mag].  Outputs: teff [K].
 * Outside a method's range: no value, flag colour_out_of_range.
 */
#include <glib/gi18n.h>
#include <math.h>

#include "derive.h"
#include "methods.h"

/* Torres (2010), Table 2, first column: c_0 ... c_7. */
static const double flower_torres_logt[] = {
  3.979145106714099, -0.654992268598245, 1.740690042385095, -4.608815154057166,
  6.792599779944473, -5.396909891322525, 2.192970376522490, -0.359495739295671,
};

double
sl_flower_log_teff (double bv0, double *dlogt_dbv)
{
  SlDual x = sl_dual_input (bv0, 0, TRUE);
  SlDual logt = sl_dual_poly (flower_torres_logt, G_N_ELEMENTS (flower_torres_logt), x);

  if (dlogt_dbv)
    *dlogt_dbv = logt.d[0];
  return logt.v;
}

gboolean
sl_flower_colour_in_range (double bv0)
{
  return bv0 >= -0.343 && bv0 <= 1.805;
}

double
sl_ballesteros_teff (double bv0, double *dt_dbv)
{
  double u = 0.92 * bv0 + 1.7, v = 0.92 * bv0 + 0.62;

  if (dt_dbv)
    *dt_dbv = -4600.0 * 0.92 * (1.0 / (u * u) + 1.0 / (v * v));
  return 4600.0 * (1.0 / u + 1.0 / v);
}

gboolean
sl_ballesteros_colour_in_range (double bv0)
{
  return bv0 >= 0.103 && bv0 <= 1.370;
}

static void
compute_teff (SlEval *ev)
{
  SlDual bv0;
  double derivative;

  if (!ev->has[SL_Q_BV0])
    return;
  bv0 = ev->q[SL_Q_BV0];

  if (ev->params->teff == SL_TEFF_BALLESTEROS)
    {
      if (!sl_ballesteros_colour_in_range (bv0.v))
        {
          ev->flags |= ev->rng ? 0 : SL_FLAG_COLOUR_OUT_OF_RANGE;
          return;
        }
      sl_eval_set (ev, SL_Q_TEFF, sl_dual_chain1 (sl_ballesteros_teff (bv0.v, &derivative), derivative, bv0));
      return;
    }

  if (!sl_flower_colour_in_range (bv0.v))
    {
      ev->flags |= ev->rng ? 0 : SL_FLAG_COLOUR_OUT_OF_RANGE;
      return;
    }
  sl_eval_set (ev, SL_Q_TEFF,
               sl_dual_exp10 (sl_dual_poly (flower_torres_logt, G_N_ELEMENTS (flower_torres_logt), bv0)));
}

const SlModule sl_module_temperature = {
  .name = "temperature",
  .version = 1,
  .method = N_("Flower (1996) log Teff((B-V)0) with Torres (2010) coefficients, or Ballesteros (2012)"),
  .citation = "Flower 1996, ApJ 469, 355; Torres 2010, AJ 140, 1158 (Table 2); Ballesteros 2012, EPL 97, 34008",
  .formula = N_("flower: log10 teff = sum c_i bv0^i (i = 0..7); ballesteros: teff = 4600 K "
                "(1/(0.92 bv0 + 1.7) + 1/(0.92 bv0 + 0.62))"),
  .validity = N_("flower: -0.343 <= bv0 <= 1.805 (2900-52 500 K); ballesteros: 0.103 <= bv0 <= 1.370 "
                 "(9000-4000 K)"),
  .inputs = { SL_FIELD_NONE },
  .needs = { SL_Q_BV0, SL_Q_NONE },
  .gives = { SL_Q_TEFF, SL_Q_NONE },
  .parameters = "teff",
  .compute = compute_teff,
};
