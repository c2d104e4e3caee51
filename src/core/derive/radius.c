/* radius.c: stellar radius from the Stefan-Boltzmann law.
 *
 * Computes: radius = sqrt(L / L_sun) (T_sun / Teff)^2 [R_sun, nominal].
 * Method: the Stefan-Boltzmann law in ratio form with the IAU 2015 B3
 *   nominal solar values (T_sun = 5772 K).  The ratio form is exact by
 *   construction; mixing SI sigma with the nominal L_sun would be off by
 *   2.4e-6 (REFERENCES.md 1).
 * Inputs: lum [L_sun], teff [K].  Outputs: radius [R_sun].
 * Validity: a star radiating roughly as a black body of its Teff; not for
 *   rapidly rotating stars seen pole-on (no single Teff).
 */
#include <glib/gi18n.h>

#include "../constants.h"
#include "derive.h"

static void
compute_radius (SlEval *ev)
{
  SlDual ratio;

  if (!ev->has[SL_Q_LUM] || !ev->has[SL_Q_TEFF])
    return;
  ratio = sl_dual_div (sl_dual_const (SL_NOMINAL_SUN_TEFF_K), ev->q[SL_Q_TEFF]);
  sl_eval_set (ev, SL_Q_RADIUS, sl_dual_mul (sl_dual_sqrt (ev->q[SL_Q_LUM]), sl_dual_mul (ratio, ratio)));
}

const SlModule sl_module_radius = {
  .name = "radius",
  .version = 1,
  .method = N_("Stefan-Boltzmann law, ratio form with IAU 2015 nominal solar values"),
  .citation = "IAU 2015 Resolution B3 (Prsa et al. 2016, AJ 152, 41)",
  .formula = N_("radius = sqrt(lum) x (5772 K / teff)^2"),
  .validity = N_("stars radiating roughly as black bodies of their Teff"),
  .inputs = { SL_FIELD_NONE },
  .needs = { SL_Q_LUM, SL_Q_TEFF, SL_Q_NONE },
  .gives = { SL_Q_RADIUS, SL_Q_NONE },
  .parameters = "",
  .compute = compute_radius,
};
