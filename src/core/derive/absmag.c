/* absmag.c: distance modulus and absolute visual magnitude.
 *
 * Computes: distmod = 5 log10(dist / 10 pc) [mag];
 *           absmag = V - distmod - A_V [mag] (M_V).
 * Method: the definition of absolute magnitude (standard; e.g. REFERENCES
 *   5); extinction subtracted after Cardelli et al. (1989).
 * Inputs: dist [pc], vmag [mag], av [mag].  Outputs: distmod, absmag.
 * Validity: any distance; V as measured (Johnson V).
 */
#include <glib/gi18n.h>

#include "derive.h"

static void
compute_absmag (SlEval *ev)
{
  if (!ev->has[SL_Q_DIST])
    return;
  sl_eval_set (ev, SL_Q_DISTMOD, sl_dual_offset (sl_dual_scale (sl_dual_log10 (ev->q[SL_Q_DIST]), 5.0), -5.0));
  if (!ev->has_in[SL_FIELD_VMAG] || !ev->has[SL_Q_AV])
    return;
  sl_eval_set (ev, SL_Q_ABSMAG, sl_dual_sub (sl_dual_sub (ev->in[SL_FIELD_VMAG], ev->q[SL_Q_DISTMOD]),
                                             ev->q[SL_Q_AV]));
}

const SlModule sl_module_absmag = {
  .name = "absolute-magnitude",
  .version = 1,
  .method = N_("distance modulus and absolute magnitude"),
  .citation = "definition of absolute magnitude",
  .formula = N_("distmod = 5 log10(dist) - 5; absmag = vmag - distmod - av"),
  .validity = N_("any distance"),
  .inputs = { SL_FIELD_VMAG, SL_FIELD_VMAG_ERR, SL_FIELD_NONE },
  .needs = { SL_Q_DIST, SL_Q_AV, SL_Q_NONE },
  .gives = { SL_Q_DISTMOD, SL_Q_ABSMAG, SL_Q_NONE },
  .parameters = "",
  .compute = compute_absmag,
};
