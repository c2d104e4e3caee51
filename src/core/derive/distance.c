/* distance.c: distance from parallax.
 *
 * Computes: dist [pc], by one of two methods (parameter "distance"):
 *  - inverse: r = 1000 / parallax[mas].  Only where parallax S/N >= 5:
 *    below that 1/parallax is a biased, non-Gaussian estimator
 *    (Bailer-Jones 2015, PASP 127, 994; Luri et al. 2018, A&A 616, A9), so
 *    no value is given and the parallax flags say why.
 *  - edsd: the mode of the posterior with the exponentially decreasing
 *    space density prior P(r) = r^2 exp(-r/L) / (2 L^3) and a Gaussian
 *    likelihood (Bailer-Jones 2015), the real root of
 *        r^3/L - 2 r^2 + (parallax/sigma^2) r - 1/sigma^2 = 0
 *    (parallax and sigma in arcsec, r in pc) chosen as in the author's
 *    code: the only real root, or of three the smallest if parallax > 0.
 *    The interval is the 68% highest-density interval of the posterior
 *    (the convention of Bailer-Jones et al. 2018, AJ 156, 58); Monte Carlo
 *    runs draw distances from the posterior itself.
 * Inputs: parallax [mas] (zero point already subtracted), parallax_err
 *   [mas]; plx_snr.  Parameters: distance, length_scale_pc (L, 1350 pc by
 *   default after Astraatmadja & Bailer-Jones 2016, ApJ 833, 119).
 * Validity: inverse for S/N >= 5; edsd for any parallax with an error,
 *   flagged prior-dominated when sigma/parallax > 0.5 or parallax <= 0.
 */
#include <glib/gi18n.h>
#include <gsl/gsl_poly.h>
#include <math.h>

#include "derive.h"
#include "methods.h"

#define LOW_SNR 5.0
#define PRIOR_DOMINATED_FRACTION 0.5

/* ------------------------------------------------------------------ */
/* The EDSD posterior                                                 */

double
sl_edsd_mode (double parallax_mas, double sigma_mas, double length_pc)
{
  double w = parallax_mas / 1000.0, s = sigma_mas / 1000.0, L = length_pc;
  double roots[3];
  int n;

  g_return_val_if_fail (sigma_mas > 0.0 && length_pc > 0.0, NAN);

  /* x^3 + a x^2 + b x + c = 0: the cubic above multiplied by L. */
  n = gsl_poly_solve_cubic (-2.0 * L, L * w / (s * s), -L / (s * s),
                            &roots[0], &roots[1], &roots[2]);
  if (n == 1)
    return roots[0];
  if (w > 0.0)
    return roots[0];           /* roots come in ascending order */
  for (int i = n - 1; i >= 0; i--)
    if (roots[i] > 0.0)
      return roots[i];
  return NAN;
}

/* d mode / d parallax[mas] by implicit differentiation of the cubic. */
static double
edsd_mode_derivative (double r, double parallax_mas, double sigma_mas, double length_pc)
{
  double w = parallax_mas / 1000.0, s2 = (sigma_mas / 1000.0) * (sigma_mas / 1000.0);
  double dF_dr = 3.0 * r * r / length_pc - 4.0 * r + w / s2;
  double dF_dw = r / s2;

  return -(dF_dw / dF_dr) / 1000.0;
}

/* The posterior tabulated on a grid in ln r, wide enough that the mass
 * outside it is negligible: the likelihood confines 1/r to parallax +/- 8
 * sigma and the prior's tail beyond 50 L holds less than 1e-15. */
#define GRID 2048

struct _SlEdsdPosterior {
  double r[GRID];
  double density[GRID];  /* normalised, per pc */
  double cdf[GRID];
  int    mode_index;
};

static double
log_unnormalised (double r, double w, double s, double L)
{
  double d = w - 1.0 / r;

  return 2.0 * log (r) - r / L - d * d / (2.0 * s * s);
}

SlEdsdPosterior *
sl_edsd_posterior_new (double parallax_mas, double sigma_mas, double length_pc)
{
  SlEdsdPosterior *post = g_new (SlEdsdPosterior, 1);
  double w = parallax_mas / 1000.0, s = sigma_mas / 1000.0, L = length_pc;
  double r_min = (w + 8.0 * s > 0.0) ? 1.0 / (w + 8.0 * s) : 1e-3 * L;
  double r_max = (w - 8.0 * s > 0.0) ? MIN (1.0 / (w - 8.0 * s), 50.0 * L) : 50.0 * L;
  double ln_min = log (r_min), step = (log (r_max) - ln_min) / (GRID - 1);
  double peak = -INFINITY, total = 0.0;

  for (int i = 0; i < GRID; i++)
    {
      post->r[i] = exp (ln_min + i * step);
      post->density[i] = log_unnormalised (post->r[i], w, s, L);
      if (post->density[i] > peak)
        peak = post->density[i], post->mode_index = i;
    }
  for (int i = 0; i < GRID; i++)
    post->density[i] = exp (post->density[i] - peak);

  /* Trapezoids in r. */
  post->cdf[0] = 0.0;
  for (int i = 1; i < GRID; i++)
    {
      total += 0.5 * (post->density[i] + post->density[i - 1]) * (post->r[i] - post->r[i - 1]);
      post->cdf[i] = total;
    }
  for (int i = 0; i < GRID; i++)
    {
      post->cdf[i] /= total;
      post->density[i] /= total;
    }
  return post;
}

double
sl_edsd_posterior_quantile (const SlEdsdPosterior *post, double p)
{
  int lo = 0, hi = GRID - 1;

  if (p <= 0.0)
    return post->r[0];
  if (p >= 1.0)
    return post->r[GRID - 1];
  while (hi - lo > 1)
    {
      int mid = (lo + hi) / 2;

      if (post->cdf[mid] < p)
        lo = mid;
      else
        hi = mid;
    }
  /* Linear in the CDF between grid points. */
  return post->r[lo] + (post->r[hi] - post->r[lo]) * (p - post->cdf[lo])
                       / (post->cdf[hi] - post->cdf[lo]);
}

/* Grows an interval from the mode, always towards the denser side, until
 * it holds MASS: the highest-density interval of a unimodal posterior (of
 * a bimodal one, the connected interval around the higher mode). */
void
sl_edsd_posterior_hdi (const SlEdsdPosterior *post, double mass, double *lo, double *hi)
{
  int left = post->mode_index, right = post->mode_index;

  while (post->cdf[right] - post->cdf[left] < mass && (left > 0 || right < GRID - 1))
    {
      gboolean go_left = right == GRID - 1
                         || (left > 0 && post->density[left - 1] > post->density[right + 1]);

      if (go_left)
        left--;
      else
        right++;
    }
  *lo = post->r[left];
  *hi = post->r[right];
}

void
sl_edsd_posterior_free (SlEdsdPosterior *post)
{
  g_free (post);
}

/* ------------------------------------------------------------------ */
/* The module                                                         */

static void
inverse_distance (SlEval *ev)
{
  SlDual parallax = ev->in[SL_FIELD_PARALLAX];

  /* The parallax module's flags rest on the measurement (Monte Carlo draws
   * inherit them), so a draw never turns a refused star into a distance. */
  if (ev->flags & (SL_FLAG_NONPOSITIVE_PARALLAX | SL_FLAG_LOW_PARALLAX_SNR))
    return;
  if (parallax.v <= 0.0)
    return;   /* a draw beyond zero: no distance in this draw */
  sl_eval_set (ev, SL_Q_DIST, sl_dual_div (sl_dual_const (1000.0), parallax));
}

static void
edsd_distance (SlEval *ev)
{
  double plx = ev->measured[SL_FIELD_PARALLAX];
  double sigma = ev->sigma[SL_FIELD_PARALLAX];
  double L = ev->params->length_scale_pc;
  SlEdsdPosterior *post;
  double mode;

  if (!(sigma > 0.0))
    return;
  if (plx <= 0.0 || sigma / plx > PRIOR_DOMINATED_FRACTION)
    ev->flags |= SL_FLAG_PRIOR_DOMINATED;

  if (ev->cache == NULL)
    {
      ev->cache = sl_edsd_posterior_new (plx, sigma, L);
      ev->cache_free = (GDestroyNotify) sl_edsd_posterior_free;
    }
  post = ev->cache;

  if (ev->rng != NULL)
    {
      /* A draw from the posterior itself, by its inverse CDF. */
      sl_eval_set (ev, SL_Q_DIST, sl_dual_const (sl_edsd_posterior_quantile (post, gsl_rng_uniform_pos (ev->rng))));
      return;
    }

  mode = sl_edsd_mode (plx, sigma, L);
  sl_eval_set (ev, SL_Q_DIST, sl_dual_chain1 (mode, edsd_mode_derivative (mode, plx, sigma, L),
                                              ev->in[SL_FIELD_PARALLAX]));
  ev->has_interval[SL_Q_DIST] = TRUE;
  sl_edsd_posterior_hdi (post, 0.6827, &ev->interval_lo[SL_Q_DIST], &ev->interval_hi[SL_Q_DIST]);
}

static void
compute_distance (SlEval *ev)
{
  if (!ev->has_in[SL_FIELD_PARALLAX])
    return;
  if (ev->params->distance == SL_DISTANCE_EDSD)
    edsd_distance (ev);
  else
    inverse_distance (ev);
}

const SlModule sl_module_distance = {
  .name = "distance",
  .version = 1,
  .method = N_("inverse parallax (S/N >= 5), or the EDSD-prior posterior mode with its 68% HDI"),
  .citation = "Bailer-Jones 2015, PASP 127, 994; Bailer-Jones et al. 2018, AJ 156, 58",
  .formula = N_("inverse: dist = 1000 / parallax; edsd: the mode of r^2 exp(-r/L) N(parallax | 1/r, sigma), "
                "a root of r^3/L - 2r^2 + (parallax/sigma^2) r - 1/sigma^2 = 0"),
  .validity = N_("inverse: parallax S/N >= 5; edsd: any parallax with an error (prior-dominated when "
                 "sigma/parallax > 0.5)"),
  .inputs = { SL_FIELD_PARALLAX, SL_FIELD_PARALLAX_ERR, SL_FIELD_NONE },
  .needs = { SL_Q_PLX_SNR, SL_Q_NONE },
  .gives = { SL_Q_DIST, SL_Q_NONE },
  .parameters = "distance, length_scale_pc, parallax_zero_point",
  .compute = compute_distance,
  .draws = TRUE,
};
