/* test-derive-pool.c: the speed-ups of the derivation keep its numbers.
 *
 * The Monte Carlo percentiles (engine.c) against the sorted draws (order
 * statistics K and K + 1 of GSL's definition, interpolated as the engine
 * always did); a star's draws with the draw-independent modules run once
 * against running every module in every draw; and the worker pool
 * (derive/pool.h) with one, two and three threads, stars pushed in either
 * order, against the engine called star by star.  Every comparison is bit
 * for bit: verify recomputes stored values exactly.
 */
#include <gsl/gsl_rng.h>
#include <gsl/gsl_sort.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <string.h>

#include "derive/engine.h"
#include "derive/pool.h"

#define P16 0.15865525393145705
#define P84 0.8413447460685429

static void
assert_same_double (double a, double b, const char *what, guint index)
{
  if (memcmp (&a, &b, sizeof a) != 0 && !(isnan (a) && isnan (b)))
    g_error ("%s (%u): %.17g != %.17g", what, index, a, b);
}

static void
assert_same_values (const SlDerivedValues *a, const SlDerivedValues *b, guint index)
{
  g_assert_cmpuint (a->flags, ==, b->flags);
  g_assert_cmpint (a->monte_carlo, ==, b->monte_carlo);
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      g_assert_cmpint (a->has[q], ==, b->has[q]);
      if (!a->has[q])
        continue;
      if (sl_quantity_info (q)->is_text)
        {
          g_assert_cmpstr (a->text[q], ==, b->text[q]);
          continue;
        }
      assert_same_double (a->value[q], b->value[q], sl_quantity_info (q)->name, index);
      assert_same_double (a->lo[q], b->lo[q], sl_quantity_info (q)->name, index);
      assert_same_double (a->hi[q], b->hi[q], sl_quantity_info (q)->name, index);
    }
  assert_same_double (a->logt_sigma, b->logt_sigma, "logt_sigma", index);
  assert_same_double (a->logl_sigma, b->logl_sigma, "logl_sigma", index);
  assert_same_double (a->logt_logl_corr, b->logt_logl_corr, "logt_logl_corr", index);
}

/* ------------------------------------------------------------------ */
/* Percentiles                                                         */

/* The P quantile of SORTED as the engine computed it before it selected
 * (two gsl_stats_select calls): linear between order statistics K =
 * floor (P (N - 1)) and K + 1. */
static double
sorted_quantile (const double *sorted, gsize n, double p)
{
  double position = p * (n - 1);
  gsize k = (gsize) floor (position);
  double fraction = position - k;

  if (fraction == 0.0 || k + 1 >= n)
    return sorted[k];
  return sorted[k] + fraction * (sorted[k + 1] - sorted[k]);
}

static void
test_quantiles_match_sorted (void)
{
  /* Sizes around the interpolation cases and Floyd-Rivest's sampling
   * threshold (600); data with many ties, and all equal. */
  static const gsize sizes[] = { 1, 2, 3, 4, 5, 7, 10, 63, 100, 599, 601, 950, 1000, 1001, 4000 };
  gsl_rng *rng = gsl_rng_alloc (gsl_rng_mt19937);

  for (gsize s = 0; s < G_N_ELEMENTS (sizes); s++)
    for (int kind = 0; kind < 4; kind++)
      for (int rep = 0; rep < 8; rep++)
        {
          gsize n = sizes[s];
          g_autofree double *data = g_new (double, n);
          g_autofree double *sorted = g_new (double, n);
          double median, p16, p84;

          for (gsize i = 0; i < n; i++)
            {
              double u = gsl_rng_uniform (rng);

              data[i] = kind == 0 ? u - 0.5                      /* distinct */
                      : kind == 1 ? floor (u * 7.0)              /* many ties */
                      : kind == 2 ? 3.25                         /* constant */
                      : (double) i;                              /* already sorted */
            }
          memcpy (sorted, data, n * sizeof *data);
          gsl_sort (sorted, 1, n);
          sl_draw_quantiles (data, n, &median, &p16, &p84);
          assert_same_double (median, sorted_quantile (sorted, n, 0.5), "median", (guint) n);
          assert_same_double (p16, sorted_quantile (sorted, n, P16), "p16", (guint) n);
          assert_same_double (p84, sorted_quantile (sorted, n, P84), "p84", (guint) n);
          /* And GSL's own definition, to rounding. */
          g_assert_cmpfloat_with_epsilon (median, gsl_stats_quantile_from_sorted_data (sorted, 1, n, 0.5), 1e-12);
        }
  gsl_rng_free (rng);
}

/* ------------------------------------------------------------------ */
/* Stars of every kind                                                 */

#define N_STARS 60

/* Star I: a mix of what changes which modules vary between draws: the
 * position with and without errors, parallaxes from S/N 0.5 to 50 and
 * negative, with and without E(B-V), V without an error, proper motions,
 * a spectral type. */
static void
make_star (guint i, SlStarInputs *in)
{
  static const char *const sptypes[] = { "G2V", "K0III", "M3V" };

  memset (in, 0, sizeof *in);
  in->star_id = 1000 + 7 * i;
  in->designation = "star";
#define SET(f, v) G_STMT_START { in->present[f] = TRUE; in->value[f] = (v); } G_STMT_END
  SET (SL_FIELD_RA, 3.7 * i + 0.25);
  SET (SL_FIELD_DEC, -80.0 + 2.6 * i);
  if (i % 3 == 0)
    {
      SET (SL_FIELD_RA_ERR, 0.5 + i);
      SET (SL_FIELD_DEC_ERR, 0.4 + i);
    }
  SET (SL_FIELD_PARALLAX, i % 11 == 5 ? -0.3 : 0.5 + 0.8 * i);
  SET (SL_FIELD_PARALLAX_ERR, 1.0);
  SET (SL_FIELD_VMAG, 6.0 + 0.2 * i);
  if (i % 4 != 1)
    SET (SL_FIELD_VMAG_ERR, 0.01 + 0.001 * i);
  SET (SL_FIELD_BV, -0.2 + 0.035 * i);
  /* Every tenth from 2 on: colour and E(B-V) without errors, so that
   * only an uncertain R_V makes A_V differ between draws. */
  if (i % 10 != 2)
    SET (SL_FIELD_BV_ERR, 0.02);
  if (i % 5 == 2)
    {
      SET (SL_FIELD_EBV, 0.1);
      if (i % 10 != 2)
        SET (SL_FIELD_EBV_ERR, 0.03);
    }
  if (i % 2 == 0)
    {
      SET (SL_FIELD_PMRA, 10.0 - i);
      SET (SL_FIELD_PMRA_ERR, 0.5);
      SET (SL_FIELD_PMDEC, 3.0 + i);
      SET (SL_FIELD_PMDEC_ERR, 0.5);
    }
#undef SET
  if (i % 7 == 3)
    {
      in->present[SL_FIELD_SPTYPE] = TRUE;
      in->sptype = sptypes[i % G_N_ELEMENTS (sptypes)];
    }
}

/* Hand-set values on some stars: with an interval (drawn) and without.
 * The latitude is set on stars whose position has no errors, so that
 * only the override's interval makes it differ between draws. */
static guint
make_overrides (guint i, SlOverride *o)
{
  if (i % 9 == 4)
    {
      o->quantity = SL_Q_TEFF;
      o->value = 5500.0;
      o->lo = 5400.0;
      o->hi = 5600.0;
      return 1;
    }
  if (i % 9 == 1 && i % 3 != 0)
    {
      o->quantity = SL_Q_ELAT;
      o->value = 10.0;
      o->lo = 9.0;
      o->hi = 11.0;
      return 1;
    }
  if (i % 9 == 7)
    {
      o->quantity = SL_Q_DIST;
      o->value = 120.0;
      o->lo = o->hi = NAN;
      return 1;
    }
  return 0;
}

/* The parameter sets: Monte Carlo with the inverse distance, with EDSD
 * and an uncertain R_V, and the linear default (which draws below S/N 5). */
static void
params_for (int set, SlDeriveParams *params)
{
  sl_derive_params_init (params);
  params->draws = 300;
  params->seed = 7 + set;
  if (set == 0 || set == 1)
    params->errors = SL_ERRORS_MONTE_CARLO;
  if (set == 1)
    {
      params->distance = SL_DISTANCE_EDSD;
      params->rv_err = 0.2;
    }
}

static void
test_skip_constant_same_numbers (void)
{
  for (int set = 0; set < 3; set++)
    {
      SlDeriveParams params;
      g_autoptr (SlEngine) lean = NULL;
      g_autoptr (SlEngine) full = NULL;

      params_for (set, &params);
      lean = sl_engine_new (&params);
      full = sl_engine_new (&params);
      sl_engine_set_skip_constant (full, FALSE);
      for (guint i = 0; i < N_STARS; i++)
        {
          SlStarInputs in;
          SlOverride o;
          guint n_o = make_overrides (i, &o);
          SlDerivedValues a, b;

          make_star (i, &in);
          sl_engine_derive (lean, &in, &o, n_o, &a);
          sl_engine_derive (full, &in, &o, n_o, &b);
          assert_same_values (&a, &b, i);
        }
    }
}

/* ------------------------------------------------------------------ */
/* The pool                                                            */

static void
test_pool_any_thread_count (void)
{
  for (int set = 0; set < 3; set++)
    {
      SlDeriveParams params;
      g_autoptr (SlEngine) engine = NULL;
      SlDerivedValues *want = g_new (SlDerivedValues, N_STARS);
      SlOverride *overrides = g_new (SlOverride, N_STARS);
      guint *n_overrides = g_new (guint, N_STARS);

      params_for (set, &params);
      /* The reference: one engine, fresh for each star. */
      for (guint i = 0; i < N_STARS; i++)
        {
          SlStarInputs in;
          g_autoptr (SlEngine) fresh = sl_engine_new (&params);

          make_star (i, &in);
          n_overrides[i] = make_overrides (i, &overrides[i]);
          sl_engine_derive (fresh, &in, &overrides[i], n_overrides[i], &want[i]);
        }

      for (guint threads = 1; threads <= 3; threads++)
        for (int reversed = 0; reversed < 2; reversed++)
          {
            g_autoptr (SlDerivePool) pool = sl_derive_pool_new (&params, threads, NULL);
            const SlDeriveItem *item;
            guint pushed = 0, popped = 0;

            for (;;)
              {
                while (pushed < N_STARS && !sl_derive_pool_full (pool))
                  {
                    guint i = reversed ? N_STARS - 1 - pushed : pushed;
                    SlStarInputs in;
                    char designation[32];

                    make_star (i, &in);
                    /* The pool copies the strings: these go out of scope. */
                    g_snprintf (designation, sizeof designation, "star %u", i);
                    in.designation = designation;
                    sl_derive_pool_push (pool, &in, &overrides[i], n_overrides[i]);
                    pushed++;
                  }
                if ((item = sl_derive_pool_pop (pool)) == NULL)
                  break;
                {
                  guint i = reversed ? N_STARS - 1 - popped : popped;
                  g_autofree char *designation = g_strdup_printf ("star %u", i);

                  /* In push order, with the inputs as pushed. */
                  g_assert_cmpint (item->inputs.star_id, ==, 1000 + 7 * i);
                  g_assert_cmpstr (item->inputs.designation, ==, designation);
                  g_assert_true (item->overrides == &overrides[i]);
                  assert_same_values (&item->values, &want[i], i);
                }
                popped++;
              }
            g_assert_cmpuint (popped, ==, N_STARS);
          }
      g_free (want);
      g_free (overrides);
      g_free (n_overrides);
    }
}

static void
test_pool_cancelled (void)
{
  /* A cancelled pool stops its workers and can still be freed at once. */
  g_autoptr (GCancellable) cancellable = g_cancellable_new ();
  SlDeriveParams params;
  g_autoptr (SlDerivePool) pool = NULL;
  guint pushed = 0;

  params_for (0, &params);
  params.draws = 20000;
  pool = sl_derive_pool_new (&params, 2, cancellable);
  while (pushed < 400 && !sl_derive_pool_full (pool))
    {
      SlStarInputs in;

      make_star (pushed % N_STARS, &in);
      sl_derive_pool_push (pool, &in, NULL, 0);
      pushed++;
    }
  g_assert_cmpuint (pushed, >, 128);
  g_cancellable_cancel (cancellable);
  g_assert_nonnull (sl_derive_pool_pop (pool));
}

static void
test_threads_from_environment (void)
{
  g_setenv ("STARLEDGER_THREADS", "3", TRUE);
  g_assert_cmpuint (sl_derive_threads (), ==, 3);
  g_unsetenv ("STARLEDGER_THREADS");
  g_assert_cmpuint (sl_derive_threads (), ==, CLAMP (g_get_num_processors (), 1, 64));
  if (g_test_subprocess ())
    {
      g_setenv ("STARLEDGER_THREADS", "many", TRUE);
      g_assert_cmpuint (sl_derive_threads (), ==, CLAMP (g_get_num_processors (), 1, 64));
      return;
    }
  g_test_trap_subprocess (NULL, 0, 0);
  g_test_trap_assert_stderr ("*STARLEDGER_THREADS=many is not a count from 1 to 64*");
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/derive/pool/quantiles-match-sorted", test_quantiles_match_sorted);
  g_test_add_func ("/derive/pool/skip-constant-same-numbers", test_skip_constant_same_numbers);
  g_test_add_func ("/derive/pool/any-thread-count", test_pool_any_thread_count);
  g_test_add_func ("/derive/pool/cancelled", test_pool_cancelled);
  g_test_add_func ("/derive/pool/threads-from-environment", test_threads_from_environment);

  return g_test_run ();
}
