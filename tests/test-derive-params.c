/* test-derive-params.c: the run parameters one by one (derive.h's
 * SlParamInfo table in registry.c): every parameter described, its
 * citations those of the modules that use it, text in and out, the
 * accepted ranges; and the parameters of a project's most recent run
 * (derivation.c), which the window's derive dialog starts from. */
#include <float.h>
#include <string.h>

#include "derivation.h"
#include "sl-error.h"
#include "test-util.h"

static const SlModule *
module_named (const char *name)
{
  guint n;
  const SlModule *const *modules = sl_modules (&n);

  for (guint i = 0; i < n; i++)
    if (strcmp (modules[i]->name, name) == 0)
      return modules[i];
  g_error ("no module %s", name);
  return NULL;
}

/* Every parameter has a name the run records, words for people, and a
 * range or its choices; every key of the recorded parameters is one. */
static void
test_table_complete (void)
{
  SlDeriveParams params;
  g_autofree char *recorded = NULL;
  g_autoptr (GKeyFile) kf = g_key_file_new ();
  g_auto (GStrv) keys = NULL;
  gsize n_keys;

  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    {
      const SlParamInfo *info = sl_param_info (p);
      SlParam found;

      g_assert_nonnull (info->name);
      g_assert_cmpuint (strlen (info->label), >, 0);
      g_assert_cmpuint (strlen (info->help), >, 0);
      g_assert_true (sl_param_from_name (info->name, &found));
      g_assert_cmpint (found, ==, p);
      if (info->kind == SL_PARAM_KIND_CHOICE)
        {
          g_assert_cmpuint (info->n_choices, ==, 2);
          for (guint c = 0; c < info->n_choices; c++)
            {
              g_assert_cmpuint (strlen (info->choices[c].label), >, 0);
              g_assert_cmpuint (strlen (info->choices[c].summary), >, 0);
              g_assert_cmpuint (strlen (info->choices[c].citation), >, 0);
            }
        }
      else if (info->kind == SL_PARAM_KIND_NUMBER)
        g_assert_cmpfloat (info->min, <, info->max);
      else
        g_assert_cmpuint (info->count_min, <, info->count_max);
    }
  g_assert_false (sl_param_from_name ("speed_of_light", &(SlParam) { 0 }));

  sl_derive_params_init (&params);
  recorded = sl_derive_params_to_keyfile (&params);
  g_assert_true (g_key_file_load_from_data (kf, recorded, -1, G_KEY_FILE_NONE, NULL));
  keys = g_key_file_get_keys (kf, "derive", &n_keys, NULL);
  g_assert_cmpuint (n_keys, ==, SL_N_PARAMS);
  for (gsize i = 0; i < n_keys; i++)
    g_assert_true (sl_param_from_name (keys[i], &(SlParam) { 0 }));
}

/* The method a choice selects is cited as the module that computes it
 * cites it, so the dialog, explain and the module agree. */
static void
test_citations_from_modules (void)
{
  const SlParamInfo *distance = sl_param_info (SL_PARAM_DISTANCE);
  const SlParamInfo *teff = sl_param_info (SL_PARAM_TEFF);
  SlDeriveParams params;

  for (guint c = 0; c < distance->n_choices; c++)
    g_assert_nonnull (strstr (module_named ("distance")->citation, distance->choices[c].citation));
  for (guint c = 0; c < teff->n_choices; c++)
    g_assert_nonnull (strstr (module_named ("temperature")->citation, teff->choices[c].citation));
  g_assert_cmpstr (sl_param_info (SL_PARAM_RV)->citation, ==, module_named ("extinction")->citation);
  g_assert_nonnull (strstr (module_named ("parallax")->citation, sl_param_info (SL_PARAM_MC_BELOW_SNR)->citation));

  /* A choice's citation follows the choice. */
  sl_derive_params_init (&params);
  g_assert_cmpstr (sl_param_citation (&params, SL_PARAM_TEFF), ==, "Flower 1996, ApJ 469, 355; Torres 2010, AJ 140, 1158 (Table 2)");
  params.teff = SL_TEFF_BALLESTEROS;
  g_assert_cmpstr (sl_param_citation (&params, SL_PARAM_TEFF), ==, "Ballesteros 2012, EPL 97, 34008");
  g_assert_cmpstr (sl_param_citation (&params, SL_PARAM_LENGTH_SCALE), ==,
                   "Astraatmadja & Bailer-Jones 2016, ApJ 833, 119");
}

/* Text in, the field set; the field out, the same text. */
static void
test_text_round_trip (void)
{
  static const struct { SlParam param; const char *text; } cases[] = {
    { SL_PARAM_DISTANCE, "edsd" },
    { SL_PARAM_LENGTH_SCALE, "400" },
    { SL_PARAM_PARALLAX_ZERO_POINT, "-0.017" },
    { SL_PARAM_RV, "3.6" },
    { SL_PARAM_RV_ERR, "0.2" },
    { SL_PARAM_TEFF, "ballesteros" },
    { SL_PARAM_ERRORS, "mc" },
    { SL_PARAM_DRAWS, "250" },
    { SL_PARAM_SEED, "18446744073709551615" },
    { SL_PARAM_MC_BELOW_SNR, "0" },
  };
  SlDeriveParams params;
  g_autoptr (GError) error = NULL;

  sl_derive_params_init (&params);
  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autofree char *before = sl_param_to_text (&params, cases[i].param);
      g_autofree char *after = NULL;

      g_assert_cmpstr (before, !=, cases[i].text);
      g_assert_true (sl_param_from_text (&params, cases[i].param, cases[i].text, &error));
      g_assert_no_error (error);
      after = sl_param_to_text (&params, cases[i].param);
      g_assert_cmpstr (after, ==, cases[i].text);
    }
  g_assert_cmpint (params.distance, ==, SL_DISTANCE_EDSD);
  g_assert_cmpfloat (params.length_scale_pc, ==, 400.0);
  g_assert_cmpfloat (params.parallax_zero_point, ==, -0.017);
  g_assert_cmpfloat (params.rv, ==, 3.6);
  g_assert_cmpfloat (params.rv_err, ==, 0.2);
  g_assert_cmpint (params.teff, ==, SL_TEFF_BALLESTEROS);
  g_assert_cmpint (params.errors, ==, SL_ERRORS_MONTE_CARLO);
  g_assert_cmpuint (params.draws, ==, 250);
  g_assert_cmpuint (params.seed, ==, G_MAXUINT64);
  g_assert_cmpfloat (params.mc_below_snr, ==, 0.0);
  g_assert_true (sl_derive_params_check (&params, &error));
  g_assert_no_error (error);
}

/* Outside its range a parameter is refused with its name and what it
 * accepts, and nothing changes.  The limits are those of starledger-cli
 * derive (test-cli-derive.c checks its side). */
static void
test_text_out_of_range (void)
{
  static const struct { SlParam param; const char *text; const char *message; } cases[] = {
    { SL_PARAM_DISTANCE, "parallax", "Distance method: expected inverse or edsd, not “parallax”" },
    { SL_PARAM_LENGTH_SCALE, "0", "Prior length scale L: expected a number greater than 0, not “0”" },
    { SL_PARAM_LENGTH_SCALE, "-5", "Prior length scale L: expected a number greater than 0, not “-5”" },
    { SL_PARAM_PARALLAX_ZERO_POINT, "0,02", "Parallax zero point: expected a number, not “0,02”" },
    { SL_PARAM_RV, "0", "Extinction ratio R_V: expected a number greater than 0, not “0”" },
    { SL_PARAM_RV_ERR, "-0.1", "Error of R_V: expected a number of 0 or more, not “-0.1”" },
    { SL_PARAM_TEFF, "", "Temperature calibration: expected flower or ballesteros, not “”" },
    { SL_PARAM_ERRORS, "mc:100", "Error propagation: expected linear or mc, not “mc:100”" },
    { SL_PARAM_DRAWS, "9", "Monte Carlo draws: expected a whole number from 10 to 10000000, not “9”" },
    { SL_PARAM_DRAWS, "10000001", "Monte Carlo draws: expected a whole number from 10 to 10000000, not “10000001”" },
    { SL_PARAM_SEED, "-1", "Random seed: expected a whole number, not “-1”" },
    { SL_PARAM_SEED, "18446744073709551616", "Random seed: expected a whole number, not “18446744073709551616”" },
    { SL_PARAM_MC_BELOW_SNR, "-1", "Monte Carlo below parallax S/N: expected a number of 0 or more, not “-1”" },
    { SL_PARAM_MC_BELOW_SNR, "inf", "Monte Carlo below parallax S/N: expected a number of 0 or more, not “inf”" },
  };
  SlDeriveParams params, defaults;

  sl_derive_params_init (&defaults);
  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr (GError) error = NULL;

      sl_derive_params_init (&params);
      g_assert_false (sl_param_from_text (&params, cases[i].param, cases[i].text, &error));
      g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
      g_assert_cmpstr (error->message, ==, cases[i].message);
      g_assert_cmpmem (&params, sizeof params, &defaults, sizeof defaults);
    }
  /* The edges are in. */
  g_assert_true (sl_param_from_text (&params, SL_PARAM_DRAWS, "10", NULL));
  g_assert_true (sl_param_from_text (&params, SL_PARAM_DRAWS, " 10000000 ", NULL));
  g_assert_true (sl_param_from_text (&params, SL_PARAM_RV_ERR, "0", NULL));
  g_assert_true (sl_param_from_text (&params, SL_PARAM_SEED, "0", NULL));
}

/* Parameters set in code are checked as text is, and a run refuses
 * what the check refuses. */
static void
test_check (SlTestProject *f, gconstpointer data)
{
  SlDeriveParams params;
  SlDeriveReport report;
  g_autoptr (GError) error = NULL;

  sl_derive_params_init (&params);
  g_assert_true (sl_derive_params_check (&params, &error));
  g_assert_no_error (error);

  params.draws = 5;
  g_assert_false (sl_derive_params_check (&params, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_cmpstr (error->message, ==, "Monte Carlo draws: expected a whole number from 10 to 10000000, not “5”");
  g_clear_error (&error);

  sl_derive_params_init (&params);
  params.rv = NAN;
  g_assert_false (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_nonnull (strstr (error->message, "Extinction ratio R_V"));
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM derivation_runs"), ==, 0);
  g_clear_error (&error);

  sl_derive_params_init (&params);
  params.teff = 7;
  g_assert_false (sl_derive_params_check (&params, &error));
  g_assert_cmpstr (error->message, ==, "Temperature calibration: expected flower or ballesteros, not “7”");
}

static void
import_stars (SlTestProject *f)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *input = sl_test_write_file (f->dir, "in.csv",
                                               "id,parallax,parallax_err,vmag,vmag_err,bv,bv_err\n"
                                               "A,100,0.5,5,0.01,0.3,0.01\n"
                                               "B,1,0.5,12,0.01,1.5,0.01\n", -1);
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);
}

/* With no run yet, the defaults. */
static void
test_latest_none (SlTestProject *f, gconstpointer data)
{
  SlDeriveParams params, defaults;
  g_autoptr (GError) error = NULL;
  gint64 run_id = -1;

  sl_derive_params_init (&defaults);
  memset (&params, 0xa5, sizeof params);
  g_assert_true (sl_derivation_latest_params (f->project, &params, &run_id, &error));
  g_assert_no_error (error);
  g_assert_cmpint (run_id, ==, 0);
  g_assert_cmpmem (&params, sizeof params, &defaults, sizeof defaults);
}

/* The newest run's parameters, exactly as it was given them, even when
 * it found nothing to derive. */
static void
test_latest_newest_run (SlTestProject *f, gconstpointer data)
{
  SlDeriveParams first, second, got;
  SlDeriveReport report;
  g_autoptr (GError) error = NULL;
  gint64 run_id;

  import_stars (f);
  sl_derive_params_init (&first);
  first.rv = 3.3;
  g_assert_true (sl_derivation_run (f->project, &first, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_true (sl_derivation_latest_params (f->project, &got, &run_id, &error));
  g_assert_no_error (error);
  g_assert_cmpint (run_id, ==, report.run_id);
  g_assert_cmpmem (&got, sizeof got, &first, sizeof first);

  sl_derive_params_init (&second);
  second.distance = SL_DISTANCE_EDSD;
  second.length_scale_pc = 812.5;
  second.parallax_zero_point = -0.021;
  second.rv_err = 0.15;
  second.teff = SL_TEFF_BALLESTEROS;
  second.errors = SL_ERRORS_MONTE_CARLO;
  second.draws = 321;
  second.seed = G_GUINT64_CONSTANT (9007199254740993);   /* 2^53 + 1: not a double */
  second.mc_below_snr = 7.5;
  g_assert_true (sl_derivation_run (f->project, &second, TRUE, NULL, NULL, NULL, &report, &error));
  g_assert_cmpuint (report.computed, ==, 2);
  g_assert_true (sl_derivation_latest_params (f->project, &got, &run_id, &error));
  g_assert_cmpint (run_id, ==, report.run_id);
  g_assert_cmpmem (&got, sizeof got, &second, sizeof second);

  /* A run with nothing to do is still the team's latest choice. */
  g_assert_true (sl_derivation_run (f->project, &first, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_true (sl_derivation_latest_params (f->project, &got, &run_id, &error));
  g_assert_cmpint (run_id, ==, report.run_id);
  g_assert_cmpmem (&got, sizeof got, &first, sizeof first);
}

/* A refused run leaves no record: the one before it is still the latest. */
static void
test_latest_after_refused (SlTestProject *f, gconstpointer data)
{
  SlDeriveParams params, refused, got;
  SlDeriveReport report;
  g_autoptr (GError) error = NULL;
  gint64 run_id, first_run;

  import_stars (f);
  sl_derive_params_init (&params);
  params.rv = 2.9;
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  first_run = report.run_id;

  refused = params;
  refused.rv = 4.0;
  refused.draws = 1;
  g_assert_false (sl_derivation_run (f->project, &refused, TRUE, NULL, NULL, NULL, &report, &error));
  g_clear_error (&error);
  g_assert_true (sl_derivation_latest_params (f->project, &got, &run_id, &error));
  g_assert_cmpint (run_id, ==, first_run);
  g_assert_cmpmem (&got, sizeof got, &params, sizeof params);
}

/* A damaged record is reported, not read as defaults. */
static void
test_latest_damaged (SlTestProject *f, gconstpointer data)
{
  SlDeriveParams params;
  SlDeriveReport report;
  g_autoptr (GError) error = NULL;
  gint64 run_id = -1;

  import_stars (f);
  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_cmpint (sqlite3_exec (f->db, "UPDATE derivation_runs SET parameters = '[derive]\nrv=three'", NULL, NULL,
                                 NULL), ==, SQLITE_OK);
  g_assert_false (sl_derivation_latest_params (f->project, &params, &run_id, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_DATABASE);
  g_assert_cmpint (run_id, ==, 0);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/derive/params/table-complete", test_table_complete);
  g_test_add_func ("/derive/params/citations-from-modules", test_citations_from_modules);
  g_test_add_func ("/derive/params/text/round-trip", test_text_round_trip);
  g_test_add_func ("/derive/params/text/out-of-range", test_text_out_of_range);
  g_test_add ("/derive/params/check", SlTestProject, NULL, sl_test_project_set_up, test_check,
              sl_test_project_tear_down);
  g_test_add ("/derivation/latest-params/none", SlTestProject, NULL, sl_test_project_set_up, test_latest_none,
              sl_test_project_tear_down);
  g_test_add ("/derivation/latest-params/newest-run", SlTestProject, NULL, sl_test_project_set_up,
              test_latest_newest_run, sl_test_project_tear_down);
  g_test_add ("/derivation/latest-params/refused-run-not-recorded", SlTestProject, NULL, sl_test_project_set_up,
              test_latest_after_refused, sl_test_project_tear_down);
  g_test_add ("/derivation/latest-params/damaged", SlTestProject, NULL, sl_test_project_set_up,
              test_latest_damaged, sl_test_project_tear_down);
  return g_test_run ();
}
