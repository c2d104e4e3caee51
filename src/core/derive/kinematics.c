/* kinematics.c: tangential velocity.
 *
 * Computes: vtan = A mu r [km/s], mu = sqrt(pmra^2 + pmdec^2) [arcsec/yr]
 *   (pmra includes cos Dec), r = dist [pc].
 * Method: A = 1 au per Julian year in km/s = 4.740470463533 (exact with
 *   the IAU 2012 au and the Julian year; the Hipparcos Catalogue, ESA 1997
 *   Vol. 1, used 4.740470446, 3.7e-9 smaller).
 * Inputs: pmra, pmdec [mas/yr]; dist [pc].  Outputs: vtan [km/s].
 * Validity: any proper motion; the pmra-pmdec correlation is not known to
 *   the vocabulary and is taken as zero.
 */
#include <glib/gi18n.h>

#include "../constants.h"
#include "derive.h"

static void
compute_vtan (SlEval *ev)
{
  SlDual mu;

  if (!ev->has[SL_Q_DIST] || !ev->has_in[SL_FIELD_PMRA] || !ev->has_in[SL_FIELD_PMDEC])
    return;
  mu = sl_dual_hypot (ev->in[SL_FIELD_PMRA], ev->in[SL_FIELD_PMDEC]);
  sl_eval_set (ev, SL_Q_VTAN, sl_dual_scale (sl_dual_mul (mu, ev->q[SL_Q_DIST]),
                                             SL_AU_PER_YEAR_KM_S / 1000.0));
}

const SlModule sl_module_kinematics = {
  .name = "kinematics",
  .version = 1,
  .method = N_("tangential velocity v = A mu r, A = 1 au per Julian year"),
  .citation = "IAU 2012 Resolution B2 (au); ESA 1997, The Hipparcos Catalogue, Vol. 1, 1.5",
  .formula = N_("vtan = 4.740470 km/s x (sqrt(pmra^2 + pmdec^2) / 1000) x dist"),
  .validity = N_("any proper motion; pmra-pmdec correlation taken as zero"),
  .inputs = { SL_FIELD_PMRA, SL_FIELD_PMRA_ERR, SL_FIELD_PMDEC, SL_FIELD_PMDEC_ERR, SL_FIELD_NONE },
  .needs = { SL_Q_DIST, SL_Q_NONE },
  .gives = { SL_Q_VTAN, SL_Q_NONE },
  .parameters = "",
  .compute = compute_vtan,
};
