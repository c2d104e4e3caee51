/* parallax.c: the parallax signal-to-noise ratio.
 *
 * Computes: plx_snr = parallax / parallax_err, after the run's parallax
 *   zero-point offset has been subtracted (done by the engine).
 * Method: definition (common practice).  The thresholds used with it are
 *   those of Bailer-Jones (2015, PASP 127, 994): inversion is reliable only
 *   for fractional errors below about 0.2, i.e. S/N above 5.
 * Inputs: parallax [mas], parallax_err [mas].  Outputs: plx_snr [1].
 * Validity: any parallax, negative included; needs a positive error.
 * Flags: no_parallax_error, nonpositive_parallax, low_parallax_snr.
 */
#include <glib/gi18n.h>

#include "derive.h"

/* Below this S/N, 1/parallax is no distance (Bailer-Jones 2015). */
#define LOW_SNR 5.0

static void
compute_snr (SlEval *ev)
{
  double plx, sigma;

  if (!ev->has_in[SL_FIELD_PARALLAX])
    return;
  plx = ev->measured[SL_FIELD_PARALLAX];
  sigma = ev->sigma[SL_FIELD_PARALLAX];
  if (plx <= 0.0)
    ev->flags |= SL_FLAG_NONPOSITIVE_PARALLAX;
  if (!(sigma > 0.0))
    {
      ev->flags |= SL_FLAG_NO_PARALLAX_ERROR;
      return;
    }
  if (plx / sigma < LOW_SNR)
    ev->flags |= SL_FLAG_LOW_PARALLAX_SNR;
  sl_eval_set (ev, SL_Q_PLX_SNR, sl_dual_scale (ev->in[SL_FIELD_PARALLAX], 1.0 / sigma));
  /* The ratio as measured, +/- 1 exactly: Monte Carlo draws keep it. */
  ev->has_interval[SL_Q_PLX_SNR] = TRUE;
  ev->interval_lo[SL_Q_PLX_SNR] = ev->q[SL_Q_PLX_SNR].v - 1.0;
  ev->interval_hi[SL_Q_PLX_SNR] = ev->q[SL_Q_PLX_SNR].v + 1.0;
}

const SlModule sl_module_parallax = {
  .name = "parallax",
  .version = 1,
  .method = N_("parallax signal-to-noise ratio"),
  .citation = "definition; S/N 5 threshold after Bailer-Jones 2015, PASP 127, 994",
  .formula = N_("plx_snr = (parallax - zero point) / parallax_err"),
  .validity = N_("any parallax with a positive error"),
  .inputs = { SL_FIELD_PARALLAX, SL_FIELD_PARALLAX_ERR, SL_FIELD_NONE },
  .needs = { SL_Q_NONE },
  .gives = { SL_Q_PLX_SNR, SL_Q_NONE },
  .parameters = "parallax_zero_point",
  .compute = compute_snr,
};
