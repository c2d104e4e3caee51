/* luminosity.c: luminosity from the bolometric magnitude.
 *
 * Computes: lum = 10^(-0.4 (M_bol - M_bol,sun)) [L_sun, nominal].
 * Method: M_bol,sun must be the one consistent with the BC scale in use,
 *   not the IAU 2015 B2 value 4.74 (Torres 2010, AJ 140, 1158): with
 *   Flower's BCs, M_bol,sun = V_sun + 31.572 + BC_V(5772 K) = 4.73117
 *   (V_sun = -26.76, Torres 2010; 31.572 = 5 log10(10 pc / 1 au), IAU 2015
 *   B2; 5772 K, IAU 2015 B3).  L is in units of the nominal solar
 *   luminosity 3.828e26 W (IAU 2015 B3).
 * Inputs: mbol [mag].  Outputs: lum [L_sun].
 * Validity: wherever mbol is; the scale's zero point holds to about 0.03
 *   mag (the error of V_sun).
 */
#include <glib/gi18n.h>

#include "derive.h"
#include "methods.h"

static void
compute_luminosity (SlEval *ev)
{
  if (!ev->has[SL_Q_MBOL])
    return;
  sl_eval_set (ev, SL_Q_LUM, sl_dual_exp10 (sl_dual_scale (sl_dual_offset (ev->q[SL_Q_MBOL],
                                                                           -sl_mbol_sun_flower ()),
                                                           -0.4)));
}

const SlModule sl_module_luminosity = {
  .name = "luminosity",
  .version = 1,
  .method = N_("L/L_sun from M_bol with M_bol,sun on the Flower/Torres BC scale (4.7312)"),
  .citation = "Torres 2010, AJ 140, 1158; IAU 2015 Resolutions B2 and B3",
  .formula = N_("lum = 10^(-0.4 (mbol - 4.73117)); 4.73117 = V_sun (-26.76) + 31.572 + BC(5772 K)"),
  .validity = N_("the BC scale's zero point holds to about 0.03 mag"),
  .inputs = { SL_FIELD_NONE },
  .needs = { SL_Q_MBOL, SL_Q_NONE },
  .gives = { SL_Q_LUM, SL_Q_NONE },
  .parameters = "",
  .compute = compute_luminosity,
};
