/* engine.c: the derivation of one star, linear and Monte Carlo.
 *
 * Contents:
 *   module order .......... sl_modules_in_order (Kahn's algorithm on needs/gives)
 *   inputs ................ load_inputs, partial_sigmas
 *   linear pass ........... run_linear_pass, linear_intervals
 *   Monte Carlo ........... run_draws, draw_percentiles
 *
 * Conventions (REFERENCES.md 11): a linear value is the chain at the
 * measured inputs with value -/+ 1 sigma; a Monte Carlo value is the median
 * of the draws with the 15.87th and 84.13th percentiles, except where a
 * module gives a quantity its own interval (the EDSD distance keeps its
 * posterior mode and highest-density interval, the Bailer-Jones et al.
 * 2018 convention; the parallax S/N stays the measured ratio).  A quantity that
 * fewer than 95% of the draws give has no value (it sits at a calibration's
 * edge, where percentiles would be biased).
 */
#include "engine.h"

#include <gsl/gsl_randist.h>
#include <math.h>
#include <string.h>

#define P16 0.15865525393145705   /* Phi(-1) */
#define P84 0.8413447460685429    /* Phi(+1) */
#define MIN_DRAW_FRACTION 0.95

struct _SlEngine {
  SlDeriveParams        params;
  GPtrArray            *order;     /* const SlModule *, evaluation order */
  gsl_rng              *rng;
  double               *samples;   /* SL_N_QUANTITIES x draws */
  double               *logt_draws, *logl_draws;
  double               *scratch;   /* draws */
  gboolean              skip_constant;   /* run draw-independent modules once per star */
  SlEval                ev;
};

/* ------------------------------------------------------------------ */
/* Module order                                                       */

static gboolean
module_gives (const SlModule *m, SlQuantity q)
{
  for (int i = 0; i < SL_MODULE_MAX_IO && m->gives[i] != SL_Q_NONE; i++)
    if (m->gives[i] == q)
      return TRUE;
  return FALSE;
}

const SlModule *
sl_module_for_quantity (SlQuantity q)
{
  guint n;
  const SlModule *const *modules = sl_modules (&n);

  for (guint i = 0; i < n; i++)
    if (module_gives (modules[i], q))
      return modules[i];
  return NULL;
}

/* Orders modules so that each runs after those giving what it needs; a
 * need nobody gives, or a cycle, is a programming error. */
GPtrArray *
sl_modules_in_order (void)
{
  guint n;
  const SlModule *const *modules = sl_modules (&n);
  GPtrArray *order = g_ptr_array_new ();
  gboolean done[64] = { FALSE };
  gboolean available[SL_N_QUANTITIES] = { FALSE };

  g_assert (n <= G_N_ELEMENTS (done));
  while (order->len < n)
    {
      gboolean progress = FALSE;

      for (guint i = 0; i < n; i++)
        {
          gboolean ready = !done[i];

          for (int k = 0; ready && k < SL_MODULE_MAX_IO && modules[i]->needs[k] != SL_Q_NONE; k++)
            ready = available[modules[i]->needs[k]];
          if (!ready)
            continue;
          g_ptr_array_add (order, (gpointer) modules[i]);
          done[i] = progress = TRUE;
          for (int k = 0; k < SL_MODULE_MAX_IO && modules[i]->gives[k] != SL_Q_NONE; k++)
            available[modules[i]->gives[k]] = TRUE;
        }
      if (!progress)
        g_error ("derivation modules: a need that no module gives, or a cycle");
    }
  return order;
}

const SlDeriveParams *
sl_engine_params (const SlEngine *engine)
{
  return &engine->params;
}

SlEngine *
sl_engine_new (const SlDeriveParams *params)
{
  SlEngine *engine = g_new0 (SlEngine, 1);
  guint draws = MAX (params->draws, 1);

  engine->params = *params;
  engine->order = sl_modules_in_order ();
  engine->rng = gsl_rng_alloc (gsl_rng_mt19937);
  engine->samples = g_new (double, (gsize) SL_N_QUANTITIES * draws);
  engine->logt_draws = g_new (double, draws);
  engine->logl_draws = g_new (double, draws);
  engine->scratch = g_new (double, draws);
  engine->ev.params = &engine->params;
  engine->skip_constant = TRUE;
  return engine;
}

void
sl_engine_set_skip_constant (SlEngine *engine, gboolean skip)
{
  engine->skip_constant = skip;
}

void
sl_engine_free (SlEngine *engine)
{
  if (engine == NULL)
    return;
  g_ptr_array_unref (engine->order);
  gsl_rng_free (engine->rng);
  g_free (engine->samples);
  g_free (engine->logt_draws);
  g_free (engine->logl_draws);
  g_free (engine->scratch);
  g_free (engine);
}

const SlModule *const *
sl_engine_modules (SlEngine *engine, guint *n_modules)
{
  *n_modules = engine->order->len;
  return (const SlModule *const *) engine->order->pdata;
}

/* ------------------------------------------------------------------ */
/* Inputs                                                             */

/* The partial derivative slot of each input field, or -1. */
static int
partial_of (SlField f)
{
  switch (f)
    {
    case SL_FIELD_PARALLAX: return SL_PARTIAL_PARALLAX;
    case SL_FIELD_VMAG:     return SL_PARTIAL_VMAG;
    case SL_FIELD_BMAG:     return SL_PARTIAL_BMAG;
    case SL_FIELD_BV:       return SL_PARTIAL_BV;
    case SL_FIELD_EBV:      return SL_PARTIAL_EBV;
    case SL_FIELD_PMRA:     return SL_PARTIAL_PMRA;
    case SL_FIELD_PMDEC:    return SL_PARTIAL_PMDEC;
    case SL_FIELD_RA:       return SL_PARTIAL_RA;
    case SL_FIELD_DEC:      return SL_PARTIAL_DEC;
    case SL_FIELD_VRAD:     return SL_PARTIAL_VRAD;
    default:                return -1;
    }
}

/* The 1-sigma error of an input in its own unit: ra and dec errors are mas
 * on the sky, the values degrees. */
static double
input_sigma (const SlStarInputs *in, SlField f)
{
  SlField err = sl_field_info (f)->error;
  double sigma;

  if (err == SL_FIELD_NONE || !in->present[err])
    return NAN;
  sigma = in->value[err];
  if (f == SL_FIELD_DEC)
    sigma /= 3.6e6;
  if (f == SL_FIELD_RA)
    sigma /= 3.6e6 * cos (in->value[SL_FIELD_DEC] * G_PI / 180.0);
  return sigma;
}

static void
load_inputs (SlEngine *engine, const SlStarInputs *in)
{
  SlEval *ev = &engine->ev;

  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      SlFieldKind kind = sl_field_info (f)->kind;

      ev->has_in[f] = in->present[f] && kind == SL_FIELD_KIND_VALUE;
      ev->measured[f] = in->value[f];
      ev->sigma[f] = ev->has_in[f] ? input_sigma (in, f) : NAN;
    }
  if (ev->has_in[SL_FIELD_PARALLAX])
    ev->measured[SL_FIELD_PARALLAX] -= engine->params.parallax_zero_point;
  if (ev->has_in[SL_FIELD_RA] && !ev->has_in[SL_FIELD_DEC])
    ev->sigma[SL_FIELD_RA] = NAN;
  ev->sptype = in->present[SL_FIELD_SPTYPE] ? in->sptype : NULL;
}

static void
partial_sigmas (SlEngine *engine, const SlOverride *overrides, guint n_overrides, double *sigma)
{
  SlEval *ev = &engine->ev;

  for (int k = 0; k < SL_N_PARTIALS; k++)
    sigma[k] = 0.0;
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (ev->has_in[f] && partial_of (f) >= 0)
      sigma[partial_of (f)] = ev->sigma[f];
  sigma[SL_PARTIAL_RV] = engine->params.rv_err;
  /* One slot for hand-set values: a second override on the same star
   * shares it, which makes the two fully correlated (documented). */
  for (guint i = 0; i < n_overrides; i++)
    sigma[SL_PARTIAL_OVERRIDE] = (overrides[i].hi - overrides[i].lo) / 2.0;
}

/* Resets the per-pass state and puts inputs and overrides in place;
 * TRACK selects the linear pass (partials) over a draw. */
static void
start_pass (SlEngine *engine, const SlOverride *overrides, guint n_overrides, gboolean track)
{
  SlEval *ev = &engine->ev;

  memset (ev->has, 0, sizeof ev->has);
  memset (ev->overridden, 0, sizeof ev->overridden);
  memset (ev->has_interval, 0, sizeof ev->has_interval);
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      double value;

      if (!ev->has_in[f])
        continue;
      value = ev->measured[f];
      if (!track)
        {
          /* A draw: a plain value (sl_dual_const without the copy). */
          if (isfinite (ev->sigma[f]))
            value += gsl_ran_gaussian_ziggurat (ev->rng, ev->sigma[f]);
          ev->in[f].v = value;
          ev->in[f].n = 0;
          continue;
        }
      ev->in[f] = partial_of (f) >= 0 ? sl_dual_input (value, partial_of (f), track) : sl_dual_const (value);
    }
  for (guint i = 0; i < n_overrides; i++)
    {
      SlQuantity q = overrides[i].quantity;
      double value = overrides[i].value;
      double sigma = (overrides[i].hi - overrides[i].lo) / 2.0;

      if (!track && isfinite (sigma))
        value += gsl_ran_gaussian_ziggurat (ev->rng, sigma);
      ev->q[q] = sl_dual_input (value, SL_PARTIAL_OVERRIDE, track);
      ev->has[q] = TRUE;
      ev->overridden[q] = TRUE;
    }
}

/* start_pass for a draw after the first: only the inputs with an error
 * are drawn again (DRAWN, in field order, as start_pass draws them); the
 * others keep the plain values the first draw put in place. */
static void
start_next_draw (SlEngine *engine, const SlOverride *overrides, guint n_overrides, const SlField *drawn,
                 guint n_drawn)
{
  SlEval *ev = &engine->ev;

  memset (ev->has, 0, sizeof ev->has);
  memset (ev->overridden, 0, sizeof ev->overridden);
  memset (ev->has_interval, 0, sizeof ev->has_interval);
  for (guint i = 0; i < n_drawn; i++)
    ev->in[drawn[i]].v = ev->measured[drawn[i]] + gsl_ran_gaussian_ziggurat (ev->rng, ev->sigma[drawn[i]]);
  for (guint i = 0; i < n_overrides; i++)
    {
      SlQuantity q = overrides[i].quantity;
      double value = overrides[i].value;
      double sigma = (overrides[i].hi - overrides[i].lo) / 2.0;

      if (isfinite (sigma))
        value += gsl_ran_gaussian_ziggurat (ev->rng, sigma);
      ev->q[q].v = value;
      ev->q[q].n = 0;
      ev->has[q] = TRUE;
      ev->overridden[q] = TRUE;
    }
}

static gboolean
gives_text (const SlModule *m)
{
  return sl_quantity_info (m->gives[0])->is_text;
}

static void
run_modules (SlEngine *engine, gboolean numeric_only)
{
  for (guint i = 0; i < engine->order->len; i++)
    {
      const SlModule *m = engine->order->pdata[i];

      if (!numeric_only || !gives_text (m))
        m->compute (&engine->ev);
    }
}

/* ------------------------------------------------------------------ */
/* Results                                                            */

static void
linear_results (SlEngine *engine, const double *sigma, SlDerivedValues *out)
{
  SlEval *ev = &engine->ev;

  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      double s;

      out->has[q] = ev->has[q];
      out->lo[q] = out->hi[q] = NAN;
      if (!ev->has[q] || sl_quantity_info (q)->is_text)
        continue;
      out->value[q] = ev->q[q].v;
      if (ev->has_interval[q])
        {
          out->lo[q] = ev->interval_lo[q];
          out->hi[q] = ev->interval_hi[q];
          continue;
        }
      if (ev->q[q].n == 0)
        continue;   /* a constant: nothing to propagate */
      s = sl_dual_sigma (ev->q[q], sigma);
      if (isnan (s))
        {
          out->flags |= SL_FLAG_MISSING_ERROR;
          continue;
        }
      out->lo[q] = out->value[q] - s;
      out->hi[q] = out->value[q] + s;
    }

  if (ev->has[SL_Q_TEFF] && ev->has[SL_Q_LUM])
    {
      SlDual logt = sl_dual_log10 (ev->q[SL_Q_TEFF]);
      SlDual logl = sl_dual_log10 (ev->q[SL_Q_LUM]);

      out->logt_sigma = sl_dual_sigma (logt, sigma);
      out->logl_sigma = sl_dual_sigma (logl, sigma);
      out->logt_logl_corr = sl_dual_covariance (logt, logl, sigma) / (out->logt_sigma * out->logl_sigma);
    }
}

/* Puts the K-th smallest of DATA[LEFT..RIGHT] at DATA[K], the smaller
 * ones before it and the larger ones after: Floyd and Rivest's SELECT
 * (CACM 18, 173, 1975), which first narrows the range around K by
 * selecting within a sample, so that a median costs about 1.5 N
 * comparisons instead of quickselect's 3.4 N.  The order statistics are
 * values, not positions: any selection gives the same numbers as GSL's. */
static void
select_range (double *data, gssize left, gssize right, gssize k)
{
#define SWAP(a, b) G_STMT_START { double t_ = data[a]; data[a] = data[b]; data[b] = t_; } G_STMT_END
  while (right > left)
    {
      double t;
      gssize i, j;

      if (right - left > 600)
        {
          double n = right - left + 1, m = k - left + 1, z = log (n);
          double sample = 0.5 * exp (2.0 * z / 3.0);
          double sd = 0.5 * sqrt (z * sample * (n - sample) / n) * (m < n / 2 ? -1.0 : 1.0);
          gssize new_left = MAX (left, (gssize) (k - m * sample / n + sd));
          gssize new_right = MIN (right, (gssize) (k + (n - m) * sample / n + sd));

          select_range (data, new_left, new_right, k);
        }
      t = data[k];
      i = left;
      j = right;
      SWAP (left, k);
      if (data[right] > t)
        SWAP (right, left);
      while (i < j)
        {
          SWAP (i, j);
          i++;
          j--;
          while (data[i] < t)
            i++;
          while (data[j] > t)
            j--;
        }
      if (data[left] == t)
        SWAP (left, j);
      else
        {
          j++;
          SWAP (j, right);
        }
      if (j <= k)
        left = j + 1;
      if (k <= j)
        right = j - 1;
    }
#undef SWAP
}

static void
select_kth (double *data, gsize n, gsize k)
{
  select_range (data, 0, (gssize) n - 1, (gssize) k);
}

static double
min_of (const double *data, gsize n)
{
  double m = data[0];

  for (gsize i = 1; i < n; i++)
    if (data[i] < m)
      m = data[i];
  return m;
}

/* Linear between two order statistics (as GSL's quantiles, rounded as
 * this engine always did). */
static double
interpolate (double below, double above, double fraction)
{
  return below + fraction * (above - below);
}

/* The median and the 15.87th and 84.13th percentiles of DATA[0..N), N > 0,
 * in the order of the run's conventions: one selection for the median,
 * then one in each half, instead of two over the whole sample for each. */
static void
three_quantiles (double *data, gsize n, gboolean constant, double *median, double *p16, double *p84)
{
  const double p[3] = { 0.5, P16, P84 };
  gsize k[3];
  double fraction[3], below[3], above[3];

  for (int i = 0; i < 3; i++)
    {
      double position = p[i] * (n - 1);

      k[i] = (gsize) floor (position);
      fraction[i] = position - k[i];
    }

  if (constant)
    {
      /* Every order statistic is the one value. */
      for (int i = 0; i < 3; i++)
        below[i] = above[i] = data[0];
      goto from_order_statistics;
    }

  /* The median's order statistics k and k + 1. */
  select_kth (data, n, k[0]);
  below[0] = data[k[0]];
  above[0] = k[0] + 1 < n ? min_of (data + k[0] + 1, n - k[0] - 1) : below[0];

  /* The lower percentile among the k[0] smallest, which now come first. */
  if (k[1] < k[0])
    {
      select_kth (data, k[0], k[1]);
      below[1] = data[k[1]];
      above[1] = k[1] + 1 < k[0] ? min_of (data + k[1] + 1, k[0] - k[1] - 1) : data[k[0]];
    }
  else
    {
      below[1] = data[k[0]];
      above[1] = above[0];
    }

  /* The upper percentile among those after the median's k. */
  if (k[2] > k[0])
    {
      gsize base = k[0] + 1;

      select_kth (data + base, n - base, k[2] - base);
      below[2] = data[k[2]];
      above[2] = k[2] + 1 < n ? min_of (data + k[2] + 1, n - k[2] - 1) : below[2];
    }
  else
    {
      below[2] = below[0];
      above[2] = above[0];
    }

from_order_statistics:
  /* No interpolation at a whole position or at the end. */
  *median = fraction[0] == 0.0 || k[0] + 1 >= n ? below[0] : interpolate (below[0], above[0], fraction[0]);
  *p16 = fraction[1] == 0.0 || k[1] + 1 >= n ? below[1] : interpolate (below[1], above[1], fraction[1]);
  *p84 = fraction[2] == 0.0 || k[2] + 1 >= n ? below[2] : interpolate (below[2], above[2], fraction[2]);
}

void
sl_draw_quantiles (double *data, gsize n, double *median, double *p16, double *p84)
{
  gboolean constant = TRUE;

  g_return_if_fail (n > 0);
  for (gsize i = 1; i < n; i++)
    constant &= memcmp (&data[i], &data[0], sizeof (double)) == 0;
  three_quantiles (data, n, constant, median, p16, p84);
}

/* Median and 68% percentiles of the finite draws of Q. */
static void
draw_percentiles (SlEngine *engine, SlQuantity q, guint draws, SlDerivedValues *out)
{
  const double *samples = engine->samples + (gsize) q * draws;
  double *finite = engine->scratch;
  gboolean constant = TRUE;
  gsize n = 0;

  /* Draw-independent quantities (a position without errors) are common:
   * the same bits in every draw need no selection. */
  for (guint d = 0; d < draws; d++)
    if (isfinite (samples[d]))
      {
        finite[n] = samples[d];
        constant &= memcmp (&finite[n], &finite[0], sizeof (double)) == 0;
        n++;
      }
  if (n < MIN_DRAW_FRACTION * draws)
    {
      out->has[q] = FALSE;
      return;
    }
  out->has[q] = TRUE;
  three_quantiles (finite, n, constant, &out->value[q], &out->lo[q], &out->hi[q]);
}

/* A well-mixed 64-bit seed per star, so each star's draws are the same
 * whatever else the run holds and in whatever order (splitmix64). */
static unsigned long
star_seed (guint64 seed, gint64 star_id)
{
  guint64 z = seed + 0x9E3779B97F4A7C15ULL * (guint64) (star_id + 1);

  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return (unsigned long) (z ^ (z >> 31));
}

/* Which numeric modules must run in each draw of this star (RUN), and
 * which quantities differ between draws (VARIES): those that depend on an
 * input drawn with an error, on a hand-set value with an interval, or on
 * a module taking random numbers of its own.  The others are the same in
 * every draw, computed once (in the first draw) and copied. */
static void
plan_draws (SlEngine *engine, const SlOverride *overrides, guint n_overrides, gboolean *run,
            gboolean *varies)
{
  SlEval *ev = &engine->ev;

  memset (varies, 0, SL_N_QUANTITIES * sizeof *varies);
  for (guint i = 0; i < n_overrides; i++)
    if (isfinite ((overrides[i].hi - overrides[i].lo) / 2.0))
      varies[overrides[i].quantity] = TRUE;
  for (guint i = 0; i < engine->order->len; i++)
    {
      const SlModule *m = engine->order->pdata[i];
      gboolean v = m->draws || !engine->skip_constant;

      for (int k = 0; !v && k < SL_MODULE_MAX_IO && m->inputs[k] != SL_FIELD_NONE; k++)
        v = ev->has_in[m->inputs[k]] && isfinite (ev->sigma[m->inputs[k]]);
      for (int k = 0; !v && k < SL_MODULE_MAX_IO && m->needs[k] != SL_Q_NONE; k++)
        v = varies[m->needs[k]];
      run[i] = v && !gives_text (m);
      for (int k = 0; v && k < SL_MODULE_MAX_IO && m->gives[k] != SL_Q_NONE; k++)
        varies[m->gives[k]] = TRUE;
    }
}

/* KEEP marks quantities whose module gave them an interval of their own in
 * the linear pass (the EDSD posterior's mode and HDI, the parallax S/N as
 * measured): draws do not replace those. */
static void
run_draws (SlEngine *engine, gint64 star_id, const SlOverride *overrides, guint n_overrides,
           guint32 linear_flags, const gboolean *keep, SlDerivedValues *out)
{
  SlEval *ev = &engine->ev;
  guint draws = engine->params.draws;
  double n_pairs = 0, mt = 0, ml = 0, ctt = 0, cll = 0, ctl = 0;
  gboolean run[64], varies[SL_N_QUANTITIES], first_has[SL_N_QUANTITIES];
  SlDual first_q[SL_N_QUANTITIES];
  SlField drawn[SL_N_FIELDS];
  guint n_drawn = 0;

  g_assert (engine->order->len <= G_N_ELEMENTS (run));
  plan_draws (engine, overrides, n_overrides, run, varies);
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (ev->has_in[f] && isfinite (ev->sigma[f]))
      drawn[n_drawn++] = f;
  gsl_rng_set (engine->rng, star_seed (engine->params.seed, star_id));
  ev->rng = engine->rng;
  for (guint d = 0; d < draws; d++)
    {
      /* Every input is drawn in every draw, so that the generator's
       * sequence does not depend on what is skipped. */
      if (d == 0 || !engine->skip_constant)
        start_pass (engine, overrides, n_overrides, FALSE);
      else
        start_next_draw (engine, overrides, n_overrides, drawn, n_drawn);
      ev->flags = linear_flags;
      if (d == 0)
        {
          run_modules (engine, TRUE);
          memcpy (first_has, ev->has, sizeof first_has);
          memcpy (first_q, ev->q, sizeof first_q);
        }
      else
        {
          for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
            if (!varies[q])
              {
                /* Draws carry no partials: the value is all there is. */
                ev->has[q] = first_has[q];
                ev->q[q].v = first_q[q].v;
                ev->q[q].n = 0;
              }
          for (guint i = 0; i < engine->order->len; i++)
            if (run[i])
              ((const SlModule *) engine->order->pdata[i])->compute (ev);
        }
      for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
        if (d == 0 || varies[q])
          engine->samples[(gsize) q * draws + d] = ev->has[q] ? ev->q[q].v : NAN;
      engine->logt_draws[d] = engine->logl_draws[d] = NAN;
      if (ev->has[SL_Q_TEFF] && ev->has[SL_Q_LUM] && ev->q[SL_Q_TEFF].v > 0 && ev->q[SL_Q_LUM].v > 0)
        {
          engine->logt_draws[d] = log10 (ev->q[SL_Q_TEFF].v);
          engine->logl_draws[d] = log10 (ev->q[SL_Q_LUM].v);
        }
    }
  ev->rng = NULL;

  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    if (!sl_quantity_info (q)->is_text && !keep[q])
      {
        gboolean linear_interval = isfinite (out->lo[q]);

        if (varies[q])
          draw_percentiles (engine, q, draws, out);
        else
          {
            /* What draw_percentiles finds in DRAWS copies of the first. */
            double first = engine->samples[(gsize) q * draws];

            out->has[q] = isfinite (first);
            if (out->has[q])
              three_quantiles (&first, draws, TRUE, &out->value[q], &out->lo[q], &out->hi[q]);
          }
        /* No interval where first order has none: an input without an
         * error, or a value that depends on no measured input. */
        if (!linear_interval)
          out->lo[q] = out->hi[q] = NAN;
      }

  /* The sample covariance of log Teff and log L (two-pass, stable). */
  for (guint d = 0; d < draws; d++)
    if (isfinite (engine->logt_draws[d]))
      mt += engine->logt_draws[d], ml += engine->logl_draws[d], n_pairs++;
  out->logt_sigma = out->logl_sigma = out->logt_logl_corr = NAN;
  if (n_pairs >= MIN_DRAW_FRACTION * draws && n_pairs > 1)
    {
      mt /= n_pairs, ml /= n_pairs;
      for (guint d = 0; d < draws; d++)
        if (isfinite (engine->logt_draws[d]))
          {
            double dt = engine->logt_draws[d] - mt, dl = engine->logl_draws[d] - ml;

            ctt += dt * dt, cll += dl * dl, ctl += dt * dl;
          }
      out->logt_sigma = sqrt (ctt / (n_pairs - 1));
      out->logl_sigma = sqrt (cll / (n_pairs - 1));
      out->logt_logl_corr = ctl / sqrt (ctt * cll);
    }
}

/* Hand-set values are reported as given, whatever the pass. */
static void
apply_overrides (const SlOverride *overrides, guint n_overrides, SlDerivedValues *out)
{
  for (guint i = 0; i < n_overrides; i++)
    {
      SlQuantity q = overrides[i].quantity;

      out->has[q] = TRUE;
      out->value[q] = overrides[i].value;
      out->lo[q] = overrides[i].lo;
      out->hi[q] = overrides[i].hi;
      out->flags |= SL_FLAG_OVERRIDDEN;
    }
}

/* The text quantities follow the final numbers. */
static void
finish_text (SlEngine *engine, SlDerivedValues *out)
{
  SlEval *ev = &engine->ev;

  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      ev->has[q] = out->has[q] && !sl_quantity_info (q)->is_text;
      if (ev->has[q])
        ev->q[q] = sl_dual_const (out->value[q]);
    }
  ev->flags = out->flags;
  for (guint i = 0; i < engine->order->len; i++)
    {
      const SlModule *m = engine->order->pdata[i];

      if (gives_text (m))
        m->compute (ev);
    }
  out->flags = ev->flags;
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    if (sl_quantity_info (q)->is_text)
      {
        out->has[q] = ev->has[q];
        g_strlcpy (out->text[q], ev->has[q] ? ev->text[q] : "", sizeof out->text[q]);
      }
}

void
sl_engine_derive (SlEngine *engine, const SlStarInputs *inputs, const SlOverride *overrides,
                  guint n_overrides, SlDerivedValues *out)
{
  SlEval *ev = &engine->ev;
  double sigma[SL_N_PARTIALS];
  gboolean monte_carlo;

  memset (out, 0, sizeof *out);
  out->logt_sigma = out->logl_sigma = out->logt_logl_corr = NAN;

  load_inputs (engine, inputs);
  partial_sigmas (engine, overrides, n_overrides, sigma);
  ev->rng = NULL;
  ev->flags = inputs->flags;
  start_pass (engine, overrides, n_overrides, TRUE);
  run_modules (engine, TRUE);
  out->flags = ev->flags;
  linear_results (engine, sigma, out);

  /* First order fails for a distance from a poor parallax: where one was
   * derived (the EDSD method gives one at any S/N), draw. */
  monte_carlo = engine->params.errors == SL_ERRORS_MONTE_CARLO;
  if (!monte_carlo && ev->has[SL_Q_DIST] && ev->has[SL_Q_PLX_SNR]
      && ev->q[SL_Q_PLX_SNR].v < engine->params.mc_below_snr)
    {
      monte_carlo = TRUE;
      out->flags |= SL_FLAG_MONTE_CARLO_AUTO;
    }
  if (monte_carlo && engine->params.draws > 0)
    {
      gboolean keep[SL_N_QUANTITIES];

      memcpy (keep, ev->has_interval, sizeof keep);
      out->monte_carlo = TRUE;
      run_draws (engine, inputs->star_id, overrides, n_overrides, out->flags, keep, out);
    }

  apply_overrides (overrides, n_overrides, out);
  finish_text (engine, out);

  if (ev->cache)
    {
      ev->cache_free (ev->cache);
      ev->cache = NULL;
    }
}
