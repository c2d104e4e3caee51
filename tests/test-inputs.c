/* test-inputs.c: choosing one set of inputs per star among the
 * measurements of several sources. */
#include <locale.h>
#include <glib/gstdio.h>
#include <math.h>
#include <string.h>

#include "derivation.h"
#include "derive/derive.h"
#include "import.h"
#include "input-reader.h"
#include "inputs.h"
#include "sl-error.h"
#include "test-util.h"

static void
import_text (SlTestProject *f, const char *name, const char *contents)
{
  g_autofree char *path = sl_test_write_file (f->dir, name, contents, -1);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  report = sl_import_csv (f->project, path, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (report->rejections->len, ==, 0);
}

/* Reads the one star of the project; its texts stay valid while the
 * returned cursor lives. */
static SlInputCursor *
read_only_star (SlTestProject *f, SlStarInputs *inputs)
{
  g_autoptr (GError) error = NULL;
  SlInputCursor *cursor = sl_input_cursor_new (f->project, 0, &error);
  g_autoptr (SlInputCursor) check = sl_input_cursor_new (f->project, 0, &error);
  SlStarInputs first, second;

  g_assert_no_error (error);
  g_assert_true (sl_input_cursor_next (cursor, inputs, &error));
  g_assert_true (sl_input_cursor_next (check, &first, &error));
  g_assert_false (sl_input_cursor_next (check, &second, &error));
  g_assert_no_error (error);
  return cursor;
}

static void
test_smallest_error_wins (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;

  import_text (f, "one.csv", "id,ra,ra_err,dec,dec_err,epoch,parallax,parallax_err,sptype\n"
                             "A,10,1.0,20,1.0,2016,10.0,0.5,G2 V\n");
  import_text (f, "two.csv", "id,ra,dec,epoch,parallax,parallax_err,vmag,sptype\n"
                             "A,10.001,20.001,2000,10.3,0.2,7.5,G3 V\n");
  cursor = read_only_star (f, &in);

  g_assert_cmpstr (in.designation, ==, "A");
  g_assert_cmpuint (in.n_measurements, ==, 2);
  /* The parallax with the smaller error (source two). */
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 10.3, 0, "parallax from the better source");
  sl_assert_close (in.value[SL_FIELD_PARALLAX_ERR], 0.2, 0, "its error with it");
  /* The position that has an error beats one that has none, and its epoch
   * comes with it. */
  sl_assert_close (in.value[SL_FIELD_RA], 10.0, 0, "ra from the source with errors");
  sl_assert_close (in.value[SL_FIELD_EPOCH], 2016.0, 0, "the epoch of that position");
  g_assert_cmpint (in.measurement[SL_FIELD_RA], ==, in.measurement[SL_FIELD_EPOCH]);
  g_assert_cmpint (in.measurement[SL_FIELD_RA], !=, in.measurement[SL_FIELD_PARALLAX]);
  /* Only one source has V. */
  sl_assert_close (in.value[SL_FIELD_VMAG], 7.5, 0, "vmag");
  g_assert_false (in.present[SL_FIELD_VMAG_ERR]);
  /* The later source's spectral type. */
  g_assert_cmpstr (in.sptype, ==, "G3 V");
  g_assert_false (in.present[SL_FIELD_BV]);
}

static void
test_tie_goes_to_later_source (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;

  import_text (f, "one.csv", "id,parallax,parallax_err\nA,10.0,0.5\n");
  import_text (f, "two.csv", "id,parallax,parallax_err\nA,11.0,0.5\n");
  cursor = read_only_star (f, &in);
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 11.0, 0, "equal errors: the later source");
}

/* A randomised check against the rule written the obvious way. */
static void
test_random_against_reference (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) a = g_string_new ("id,parallax,parallax_err\n");
  g_autoptr (GString) b = g_string_new ("id,parallax,parallax_err\n");
  g_autoptr (GError) error = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  double plx[2][200], err[2][200];
  SlStarInputs in;
  int n = 0;

  for (int i = 0; i < 200; i++)
    for (int s = 0; s < 2; s++)
      {
        GString *file = s == 0 ? a : b;
        char p[G_ASCII_DTOSTR_BUF_SIZE], e[G_ASCII_DTOSTR_BUF_SIZE];

        plx[s][i] = g_test_rand_double_range (-1, 50);
        err[s][i] = g_test_rand_int_range (1, 4) * 0.1;   /* ties happen */
        g_string_append_printf (file, "S%03d,%s,%s\n", i,
                                g_ascii_formatd (p, sizeof p, "%.17g", plx[s][i]),
                                g_ascii_formatd (e, sizeof e, "%.17g", err[s][i]));
      }
  import_text (f, "a.csv", a->str);
  import_text (f, "b.csv", b->str);

  cursor = sl_input_cursor_new (f->project, 0, &error);
  while (sl_input_cursor_next (cursor, &in, &error))
    {
      int i = atoi (in.designation + 1);
      int want = err[1][i] <= err[0][i] ? 1 : 0;

      sl_assert_close (in.value[SL_FIELD_PARALLAX], plx[want][i], 0, in.designation);
      n++;
    }
  g_assert_no_error (error);
  g_assert_cmpint (n, ==, 200);
}

static void
test_single_star_cursor (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;

  import_text (f, "one.csv", "id,parallax\nA,1\nB,2\nC,3\n");
  cursor = sl_input_cursor_new (f->project, 2, &error);
  g_assert_true (sl_input_cursor_next (cursor, &in, &error));
  g_assert_cmpstr (in.designation, ==, "B");
  g_assert_false (sl_input_cursor_next (cursor, &in, &error));
  /* A finished cursor stays finished. */
  g_assert_false (sl_input_cursor_next (cursor, &in, &error));
  g_assert_no_error (error);
}


/* ------------------------------------------------------------------ */
/* Combination policies (combine.h)                                    */

static void
set_policy (SlTestProject *f, SlField lead, SlCombineRule rule, const char *priority, double level)
{
  g_autoptr (GError) error = NULL;
  SlCombinePolicy policy;

  g_assert_true (sl_combine_policy_read (f->project, &policy, &error));
  policy.rule[lead] = rule;
  g_strlcpy (policy.priority, priority, sizeof policy.priority);
  policy.level = level;
  g_assert_true (sl_combine_policy_write (f->project, &policy, &error));
  g_assert_no_error (error);
}

/* Three sources of one parallax, the second without a V error. */
static void
import_three_parallaxes (SlTestProject *f)
{
  import_text (f, "north.csv", "id,parallax,parallax_err,vmag,vmag_err\nA,10.0,0.5,8.00,0.02\n");
  import_text (f, "south.csv", "id,parallax,parallax_err,vmag\nA,10.3,0.2,8.10\n");
  import_text (f, "archive.csv", "id,parallax,parallax_err,vmag,vmag_err\nA,9.9,0.4,8.05,0.05\n");
}

static void
test_weighted_mean (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (GArray) used = NULL;
  SlStarInputs in;

  import_three_parallaxes (f);
  set_policy (f, SL_FIELD_PARALLAX, SL_COMBINE_WEIGHTED_MEAN, "", 0.01);
  cursor = read_only_star (f, &in);
  /* By hand: weights 1/sigma^2 = 4, 25, 6.25 (sum 35.25); sum w x =
   * 40 + 257.5 + 61.875 = 359.375; mean 359.375 / 35.25; error
   * 35.25^-1/2 (Taylor 1997, eqs. 7.10 and 7.12). */
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 359.375 / 35.25, 1e-13, "weighted mean");
  sl_assert_close (in.value[SL_FIELD_PARALLAX_ERR], 1.0 / sqrt (35.25), 1e-15, "error of the mean");
  g_assert_cmpuint (in.n_combined[SL_FIELD_PARALLAX], ==, 3);
  /* chi-square by hand: 4 (10 - m)^2 + 25 (10.3 - m)^2 + 6.25 (9.9 - m)^2
   * = 0.97163...; with 2 degrees of freedom its tail is exp (-chi2 / 2)
   * = 0.61520 (scipy.stats.chi2.sf gives 0.6151952371116288). */
  sl_assert_close (in.chi2[SL_FIELD_PARALLAX], 0.9716312056737612, 1e-12, "chi-square");
  g_assert_cmpuint (in.dof[SL_FIELD_PARALLAX], ==, 2);
  sl_assert_close (in.p_value[SL_FIELD_PARALLAX], exp (-0.9716312056737612 / 2), 1e-12, "tail probability");
  g_assert_false (in.flags & SL_FLAG_SOURCES_DISAGREE);
  /* The recorded row is the most precise of those averaged (south). */
  g_assert_cmpint (in.measurement[SL_FIELD_PARALLAX], ==,
                   sl_test_query_int (f->db, "SELECT m.id FROM measurements m JOIN sources s ON s.id = m.source_id"
                                             " WHERE s.name = 'south.csv'"));
  /* V keeps the smallest uncertainty: north's 8.00, not a mean. */
  sl_assert_close (in.value[SL_FIELD_VMAG], 8.00, 0, "vmag by its own rule");
  g_assert_cmpuint (in.n_combined[SL_FIELD_VMAG], ==, 0);
  /* Two of three V rows have errors: tested, agreeing (0.05 apart, errors 0.02 and 0.05). */
  g_assert_cmpuint (in.n_tested[SL_FIELD_VMAG], ==, 2);
  used = sl_input_cursor_contributions (cursor, SL_FIELD_PARALLAX);
  g_assert_cmpuint (used->len, ==, 3);
  for (guint i = 0; i < used->len; i++)
    g_assert_true (g_array_index (used, SlInputContribution, i).used);
}

static void
test_weighted_mean_needs_two_errors (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (GArray) used = NULL;
  SlStarInputs in;

  /* Only one V has an error: no mean, the rule falls back to the
   * smallest uncertainty (the row with an error). */
  import_text (f, "one.csv", "id,vmag,vmag_err\nA,8.00,0.02\n");
  import_text (f, "two.csv", "id,vmag\nA,8.30\n");
  set_policy (f, SL_FIELD_VMAG, SL_COMBINE_WEIGHTED_MEAN, "", 0.01);
  cursor = read_only_star (f, &in);
  sl_assert_close (in.value[SL_FIELD_VMAG], 8.00, 0, "the one row with an error");
  g_assert_cmpuint (in.n_combined[SL_FIELD_VMAG], ==, 0);
  g_assert_cmpuint (in.n_tested[SL_FIELD_VMAG], ==, 0);
  g_assert_true (isnan (in.p_value[SL_FIELD_VMAG]));
  used = sl_input_cursor_contributions (cursor, SL_FIELD_VMAG);
  g_assert_cmpuint (used->len, ==, 2);
  g_assert_true (g_array_index (used, SlInputContribution, 0).used);
  g_assert_false (g_array_index (used, SlInputContribution, 1).used);
}

static void
test_weighted_mean_proper_motion (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;

  /* Each component on its own: pmra 100 +/- 1 and 103 +/- 2 give
   * (100 + 103/4) / 1.25 = 102.6 ... by hand: weights 1 and 0.25. */
  import_text (f, "one.csv", "id,pmra,pmra_err,pmdec,pmdec_err\nA,100,1,-50,2\n");
  import_text (f, "two.csv", "id,pmra,pmra_err,pmdec,pmdec_err\nA,103,2,-52,2\n");
  set_policy (f, SL_FIELD_PMRA, SL_COMBINE_WEIGHTED_MEAN, "", 0.01);
  cursor = read_only_star (f, &in);
  sl_assert_close (in.value[SL_FIELD_PMRA], (100.0 + 103.0 / 4.0) / 1.25, 1e-13, "pmra mean");
  sl_assert_close (in.value[SL_FIELD_PMRA_ERR], 1.0 / sqrt (1.25), 1e-15, "pmra error");
  sl_assert_close (in.value[SL_FIELD_PMDEC], -51.0, 1e-13, "pmdec mean of equal errors");
  sl_assert_close (in.value[SL_FIELD_PMDEC_ERR], 2.0 / sqrt (2.0), 1e-15, "pmdec error");
  /* chi-square summed over both components: (3^2 / 5) + (2^2 / 8) = 1.8 + 0.5
   * with 2 degrees of freedom (a difference d of two values with errors
   * s1, s2 contributes d^2 / (s1^2 + s2^2)). */
  sl_assert_close (in.chi2[SL_FIELD_PMRA], 2.3, 1e-12, "chi-square of both components");
  g_assert_cmpuint (in.dof[SL_FIELD_PMRA], ==, 2);
}

static void
test_source_order (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (GArray) used = NULL;
  SlStarInputs in;

  import_three_parallaxes (f);
  /* archive first: its 9.9 +/- 0.4 despite south's smaller error. */
  set_policy (f, SL_FIELD_PARALLAX, SL_COMBINE_PRIORITY, "archive.csv\nnorth.csv", 0.01);
  cursor = read_only_star (f, &in);
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 9.9, 0, "the first source in the order");
  used = sl_input_cursor_contributions (cursor, SL_FIELD_PARALLAX);
  g_assert_cmpuint (used->len, ==, 3);
  g_assert_cmpuint ((guint) g_array_index (used, SlInputContribution, 2).used, ==, TRUE);
  g_assert_false (g_array_index (used, SlInputContribution, 0).used);
  g_clear_pointer (&cursor, sl_input_cursor_free);

  /* Listed sources come before unlisted ones, whatever their errors. */
  set_policy (f, SL_FIELD_PARALLAX, SL_COMBINE_PRIORITY, "north.csv", 0.01);
  cursor = read_only_star (f, &in);
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 10.0, 0, "the only listed source");
  g_clear_pointer (&cursor, sl_input_cursor_free);

  /* The listed source has no parallax: as smallest-error. */
  import_text (f, "colours.csv", "id,bv,bv_err\nA,0.65,0.01\n");
  set_policy (f, SL_FIELD_PARALLAX, SL_COMBINE_PRIORITY, "colours.csv", 0.01);
  cursor = read_only_star (f, &in);
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 10.3, 0, "unlisted: the smallest uncertainty");
}

static void
test_disagreement (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;

  /* 10.0 and 11.0, each +/- 0.1: chi-square 50 with 1 degree of freedom,
   * P = 1.54e-12 (scipy.stats.chi2.sf (50, 1)). */
  import_text (f, "one.csv", "id,parallax,parallax_err\nA,10.0,0.1\n");
  import_text (f, "two.csv", "id,parallax,parallax_err\nA,11.0,0.1\n");
  cursor = read_only_star (f, &in);
  sl_assert_close (in.chi2[SL_FIELD_PARALLAX], 50.0, 1e-12, "chi-square");
  sl_assert_close (in.p_value[SL_FIELD_PARALLAX], 1.5374597944280386e-12, 1e-9 * 1.54e-12, "tail");
  g_assert_true (in.flags & SL_FLAG_SOURCES_DISAGREE);
  g_clear_pointer (&cursor, sl_input_cursor_free);

  /* Level 0: no test. */
  set_policy (f, SL_FIELD_PARALLAX, SL_COMBINE_SMALLEST_ERROR, "", 0.0);
  cursor = read_only_star (f, &in);
  g_assert_false (in.flags & SL_FLAG_SOURCES_DISAGREE);
}

static void
test_policy_setting (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *summary = NULL;
  SlCombinePolicy policy, again;

  /* A new project: the defaults. */
  g_assert_true (sl_combine_policy_read (f->project, &policy, &error));
  for (SlField lead = 0; lead < SL_N_FIELDS; lead++)
    g_assert_cmpint (policy.rule[lead], ==, SL_COMBINE_SMALLEST_ERROR);
  g_assert_cmpfloat (policy.level, ==, SL_COMBINE_DEFAULT_LEVEL);

  /* Stored, read back, recorded in the ledger, derived values made stale. */
  import_text (f, "one.csv", "id,parallax,parallax_err\nA,10.0,0.1\n");
  import_text (f, "ridge;2016.csv", "id,parallax,parallax_err\nA,10.1,0.1\n");
  g_assert_cmpint (sqlite3_exec (f->db, "INSERT INTO derivation_runs (started_at, who, software_version, parameters, methods)"
                       " VALUES ('now', 'me', '1', '', '{}');"
                       "INSERT INTO derived (star_id, run_id) SELECT id, 1 FROM stars;", NULL, NULL, NULL), ==, SQLITE_OK);
  policy.rule[SL_FIELD_VMAG] = SL_COMBINE_WEIGHTED_MEAN;
  g_strlcpy (policy.priority, "ridge;2016.csv\none.csv", sizeof policy.priority);
  policy.level = 0.001;
  g_assert_true (sl_combine_policy_write (f->project, &policy, &error));
  g_assert_no_error (error);
  g_assert_true (sl_combine_policy_read (f->project, &again, &error));
  g_assert_true (sl_combine_policy_equal (&policy, &again));
  g_assert_cmpuint (sl_combine_priority_rank (&again, "one.csv"), ==, 2);
  g_assert_cmpuint (sl_combine_priority_rank (&again, "ridge;2016.csv"), ==, 1);
  g_assert_cmpuint (sl_combine_priority_rank (&again, "ridge"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT stale FROM derived"), ==, 1);
  summary = sl_test_query_text (f->db, "SELECT summary FROM ledger WHERE action = 'combine'");
  g_assert_nonnull (strstr (summary, "vmag weighted-mean"));

  /* Refused, and nothing changed: an unknown source, a mean of positions,
   * a level of 1. */
  g_strlcpy (again.priority, "one.csv\nnone.csv", sizeof again.priority);
  g_assert_false (sl_combine_policy_write (f->project, &again, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_nonnull (strstr (error->message, "'none.csv'"));
  g_assert_nonnull (strstr (error->message, "'ridge;2016.csv'"));
  g_clear_error (&error);
  g_strlcpy (again.priority, policy.priority, sizeof again.priority);
  again.rule[SL_FIELD_RA] = SL_COMBINE_WEIGHTED_MEAN;
  g_assert_false (sl_combine_policy_write (f->project, &again, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_clear_error (&error);
  again.rule[SL_FIELD_RA] = SL_COMBINE_SMALLEST_ERROR;
  again.level = 1.0;
  g_assert_false (sl_combine_policy_write (f->project, &again, &error));
  g_clear_error (&error);
  g_assert_true (sl_combine_policy_read (f->project, &again, &error));
  g_assert_true (sl_combine_policy_equal (&policy, &again));
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM ledger WHERE action = 'combine'"), ==, 1);
}

static void
test_choose_again (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  SlCombinePolicy mean;
  SlStarInputs in, other;

  /* What verify does with a run's policy: the same rows, chosen anew. */
  import_three_parallaxes (f);
  cursor = read_only_star (f, &in);
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 10.3, 0, "the project's policy");
  sl_combine_policy_init (&mean);
  mean.rule[SL_FIELD_PARALLAX] = SL_COMBINE_WEIGHTED_MEAN;
  sl_input_cursor_choose (cursor, &mean, &other);
  sl_assert_close (other.value[SL_FIELD_PARALLAX], 359.375 / 35.25, 1e-13, "a run's policy");
  g_assert_cmpstr (other.designation, ==, "A");
  g_assert_cmpint (other.star_id, ==, in.star_id);
}

/* ------------------------------------------------------------------ */
/* The inputs read ahead on a thread (input-reader.c)                 */

#define READER_STARS 3000

/* Two sources over READER_STARS stars (more than the reader holds in its
 * chunks at once), the second with parallaxes for every other star and
 * spectral types; star 10 has lost its measurements, so it is a star
 * without inputs. */
static void
import_reader_stars (SlTestProject *f)
{
  g_autoptr (GString) a = g_string_new ("id,ra,dec,parallax,parallax_err,vmag\n");
  g_autoptr (GString) b = g_string_new ("id,parallax,parallax_err,sptype\n");

  for (int i = 0; i < READER_STARS; i++)
    {
      g_string_append_printf (a, "R%04d,%d.5,%d.25,%d.5,0.%d,%d.1\n", i, i % 360, i % 90 - 45, i % 50 + 1,
                              i % 9 + 1, i % 15);
      if (i % 2 == 0)
        g_string_append_printf (b, "R%04d,%d.25,0.%d,G%d V\n", i, i % 50 + 1, i % 7 + 1, i % 10);
    }
  import_text (f, "a.csv", a->str);
  import_text (f, "b.csv", b->str);
  g_assert_true (sl_project_exec (f->project, "DELETE FROM measurements WHERE star_id = 10", NULL));
}

static void
assert_same_inputs (const SlStarInputs *got, const SlStarInputs *want)
{
  g_assert_cmpint (got->star_id, ==, want->star_id);
  g_assert_cmpstr (got->designation, ==, want->designation);
  g_assert_cmpstr (got->sptype, ==, want->sptype);
  g_assert_cmpuint (got->n_measurements, ==, want->n_measurements);
  g_assert_cmpmem (got->present, sizeof got->present, want->present, sizeof want->present);
  g_assert_cmpmem (got->measurement, sizeof got->measurement, want->measurement, sizeof want->measurement);
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (!isnan (want->value[f]) || !isnan (got->value[f]))   /* the spectral type has none */
      g_assert_cmpfloat (got->value[f], ==, want->value[f]);
  g_assert_cmpmem (got->n_combined, sizeof got->n_combined, want->n_combined, sizeof want->n_combined);
  g_assert_cmpuint (got->flags, ==, want->flags);
}

/* The reader hands over exactly the wanted stars that have inputs, in
 * order, with the inputs the plain cursor gives them: on its own thread
 * in WAL mode (DATA NULL), on the caller's connection in the rollback
 * journal mode (DATA "delete"). */
static void
test_reader_same_as_cursor (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) ids = g_array_new (FALSE, FALSE, sizeof (gint64));
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (SlInputReader) reader = NULL;
  g_autofree char *mode = NULL;
  SlCombinePolicy policy;
  SlStarInputs want, got;
  guint next = 0, n = 0;

  /* A run's policy that averages: the reader chooses as the cursor does. */
  sl_combine_policy_init (&policy);
  policy.rule[SL_FIELD_PARALLAX] = SL_COMBINE_WEIGHTED_MEAN;
  import_reader_stars (f);
  if (data != NULL)
    g_assert_true (sl_project_exec (f->project, "PRAGMA journal_mode = DELETE", NULL));
  mode = sl_test_query_text (f->db, "PRAGMA journal_mode");
  g_assert_cmpstr (mode, ==, data ? "delete" : "wal");
  /* Every third star, star 10 (no inputs), and every star from 2000 on. */
  for (gint64 id = 1; id <= READER_STARS; id++)
    if (id % 3 == 1 || id == 10 || id >= 2000)
      g_array_append_val (ids, id);

  g_assert_true (sl_project_begin (f->project, &error));
  reader = sl_input_reader_new (f->project, ids, &policy, &error);
  g_assert_no_error (error);
  cursor = sl_input_cursor_new_with_policy (f->project, 0, &policy, &error);
  while (sl_input_cursor_next (cursor, &want, &error))
    {
      while (next < ids->len && g_array_index (ids, gint64, next) < want.star_id)
        next++;
      if (next == ids->len || g_array_index (ids, gint64, next) != want.star_id)
        continue;
      g_assert_true (sl_input_reader_next (reader, &got, &error));
      assert_same_inputs (&got, &want);
      n++;
    }
  g_assert_no_error (error);
  g_assert_false (sl_input_reader_next (reader, &got, &error));
  g_assert_false (sl_input_reader_next (reader, &got, &error));   /* and stays at the end */
  g_assert_no_error (error);
  g_assert_cmpuint (n, ==, ids->len - 1);   /* all but star 10 */
  sl_project_rollback (f->project);
}

/* A caller that stops early (an error, a cancelled run) frees the reader
 * while its thread is ahead, or before it read anything: nothing hangs. */
static void
test_reader_stops_early (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) ids = g_array_new (FALSE, FALSE, sizeof (gint64));
  SlCombinePolicy policy;
  SlStarInputs in;

  sl_combine_policy_init (&policy);
  import_reader_stars (f);
  for (gint64 id = 1; id <= READER_STARS; id++)
    g_array_append_val (ids, id);
  g_assert_true (sl_project_begin (f->project, &error));
  for (int taken = 0; taken < 600; taken += 300)
    {
      SlInputReader *reader = sl_input_reader_new (f->project, ids, &policy, &error);

      g_assert_no_error (error);
      for (int i = 0; i < taken; i++)
        {
          g_assert_true (sl_input_reader_next (reader, &in, &error));
          g_assert_cmpint (in.star_id, ==, i < 9 ? i + 1 : i + 2);   /* star 10 has no inputs */
        }
      sl_input_reader_free (reader);
    }
  sl_project_rollback (f->project);
}

/* A run's reader lets go of its snapshot before the run commits, so the
 * checkpoint after the commit (SQLite's automatic one, past 1000 pages in
 * the write-ahead log) copies the run's pages into the project file at
 * once; a snapshot from before the run would hold them back in the log
 * until some later commit.  The run here stops reading before the end:
 * the last star is up to date, and the reader's cursor is left open. */
static void
test_reader_done_before_commit (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) csv = g_string_new ("id,ra,dec,parallax,parallax_err,vmag,vmag_err,bv,bv_err\n");
  g_autoptr (GError) error = NULL;
  g_autofree char *last = NULL;
  SlDeriveParams params;
  SlDeriveReport report;
  GStatBuf before, after;
  const int n = 20000;

  for (int i = 0; i < n; i++)
    g_string_append_printf (csv, "C%05d,%d.5,%d.25,%d.5,0.%d,%d.1,0.02,0.%d,0.03\n", i, i % 360, i % 90 - 45,
                            i % 50 + 1, i % 9 + 1, i % 15, i % 9);
  import_text (f, "c.csv", csv->str);
  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_no_error (error);
  /* Every row but the last star's gone, and the file shrunk to match. */
  last = g_strdup_printf ("DELETE FROM derived WHERE star_id < %d; VACUUM; PRAGMA wal_checkpoint (TRUNCATE)", n);
  g_assert_true (sl_project_exec (f->project, last, &error));
  g_assert_no_error (error);
  g_assert_cmpint (g_stat (sl_project_path (f->project), &before), ==, 0);

  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_no_error (error);
  g_assert_cmpuint (report.computed, ==, (guint64) n - 1);
  g_assert_cmpuint (report.up_to_date, ==, 1);
  g_assert_cmpint (g_stat (sl_project_path (f->project), &after), ==, 0);
  /* A derived row takes a few hundred bytes. */
  g_assert_cmpint (after.st_size - before.st_size, >, (goffset) n * 200);
}

int
main (int argc, char **argv)
{
  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);

#define ADD(path, func) g_test_add (path, SlTestProject, NULL, sl_test_project_set_up, func, \
                                        sl_test_project_tear_down)
  ADD ("/inputs/smallest-error-wins", test_smallest_error_wins);
  ADD ("/inputs/tie-goes-to-later-source", test_tie_goes_to_later_source);
  ADD ("/inputs/random-against-reference", test_random_against_reference);
  ADD ("/inputs/single-star", test_single_star_cursor);
  ADD ("/inputs/combine/weighted-mean", test_weighted_mean);
  ADD ("/inputs/combine/weighted-mean-needs-two-errors", test_weighted_mean_needs_two_errors);
  ADD ("/inputs/combine/weighted-mean-proper-motion", test_weighted_mean_proper_motion);
  ADD ("/inputs/combine/source-order", test_source_order);
  ADD ("/inputs/combine/disagreement", test_disagreement);
  ADD ("/inputs/combine/policy-setting", test_policy_setting);
  ADD ("/inputs/combine/choose-again", test_choose_again);
#undef ADD
  g_test_add ("/inputs/reader/same-as-cursor/wal", SlTestProject, NULL, sl_test_project_set_up,
              test_reader_same_as_cursor, sl_test_project_tear_down);
  g_test_add ("/inputs/reader/same-as-cursor/rollback-journal", SlTestProject, "delete",
              sl_test_project_set_up, test_reader_same_as_cursor, sl_test_project_tear_down);
  g_test_add ("/inputs/reader/stops-early", SlTestProject, NULL, sl_test_project_set_up,
              test_reader_stops_early, sl_test_project_tear_down);
  g_test_add ("/inputs/reader/done-before-commit", SlTestProject, NULL, sl_test_project_set_up,
              test_reader_done_before_commit, sl_test_project_tear_down);

  return g_test_run ();
}
