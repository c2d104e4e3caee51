/* extinction.c: interstellar extinction and the intrinsic colour.
 *
 * Computes: av = R_V E(B-V) [mag] and bv0 = (B-V) - E(B-V) [mag].
 * Method: Cardelli, Clayton & Mathis (1989, ApJ 345, 245) parameterise the
 *   extinction curve by R_V = A_V / E(B-V); 3.1 for the diffuse
 *   interstellar medium is the default (parameter rv, with an optional
 *   uncertainty rv_err).
 * Inputs: ebv [mag], bv [mag].  Outputs: av, bv0.
 * Validity: R_V from about 2.75 to 5.3 in the Galaxy (same source).  Where
 *   no E(B-V) is known, A_V = 0 and (B-V)0 = B-V are assumed, and the flag
 *   extinction_assumed_zero says so.
 */
#include <glib/gi18n.h>
#include <gsl/gsl_randist.h>

#include "derive.h"

static void
compute_extinction (SlEval *ev)
{
  SlDual ebv, rv;

  if (!ev->has_in[SL_FIELD_EBV])
    {
      ev->flags |= SL_FLAG_EXTINCTION_ASSUMED_ZERO;
      sl_eval_set (ev, SL_Q_AV, sl_dual_const (0.0));
      if (ev->has_in[SL_FIELD_BV])
        sl_eval_set (ev, SL_Q_BV0, ev->in[SL_FIELD_BV]);
      return;
    }

  ebv = ev->in[SL_FIELD_EBV];
  rv = sl_dual_input (ev->params->rv, SL_PARTIAL_RV, ev->in[SL_FIELD_EBV].n > 0);
  if (ev->rng != NULL && ev->params->rv_err > 0.0)
    rv.v += gsl_ran_gaussian_ziggurat (ev->rng, ev->params->rv_err);
  sl_eval_set (ev, SL_Q_AV, sl_dual_mul (rv, ebv));
  if (ev->has_in[SL_FIELD_BV])
    sl_eval_set (ev, SL_Q_BV0, sl_dual_sub (ev->in[SL_FIELD_BV], ebv));
}

const SlModule sl_module_extinction = {
  .name = "extinction",
  .version = 1,
  .method = N_("A_V = R_V E(B-V), one-parameter extinction law"),
  .citation = "Cardelli, Clayton & Mathis 1989, ApJ 345, 245",
  .formula = N_("av = R_V x ebv; bv0 = bv - ebv (without ebv: av = 0, bv0 = bv)"),
  .validity = N_("R_V between about 2.75 and 5.3 in the Galaxy"),
  .inputs = { SL_FIELD_EBV, SL_FIELD_EBV_ERR, SL_FIELD_BV, SL_FIELD_BV_ERR, SL_FIELD_NONE },
  .needs = { SL_Q_NONE },
  .gives = { SL_Q_AV, SL_Q_BV0, SL_Q_NONE },
  .parameters = "rv, rv_err",
  .compute = compute_extinction,
  .draws = TRUE,
};
