/* test-cli-match.c: starledger-cli import --match-radius and split end
 * to end: what the import reports (matches, the epoch, every ambiguous
 * row with its candidates), explain after it, split and its mistakes as
 * one line with exit status 1 (2 for usage); export --epoch carrying the
 * first catalogue to the second's epoch. */
#include <math.h>
#include <string.h>

#include "cli-util.h"
#include "test-util.h"

static const char catalogue_a[] =
  "id,ra,dec,epoch,pmra,pmdec,parallax,vmag\n"
  "A1,10.0,20.0,2000.0,0,0,10,5.0\n"
  "A2,10.01,20.0,2000.0,0,0,10,6.0\n"
  "A3,50.0,-30.0,2000.0,5000,-3000,300,7.0\n"
  "A4,100.0,45.0,2000.0,0,0,5,8.0\n"
  "A5,100.0001,45.0,2000.0,0,0,5,8.5\n";

/* Another epoch, other names: B1 is A1, B2 is A3 80 arcsec on, B3 lies
 * between A4 and A5, B4 is new. */
static const char catalogue_b[] =
  "name;ra;dec;vmag\n"
  "B1;10.00002;20.00001;5.1\n"
  "B2;50.0256600;-30.0133333;7.1\n"
  "B3;100.00005;45.0;8.1\n"
  "B4;200.0;10.0;9.0\n";

typedef struct {
  char *dir;
  char *project;
  char *b;
} Scene;

static void
scene_set_up (Scene *s, gconstpointer data)
{
  g_auto (CliResult) created = { 0 };
  g_auto (CliResult) first = { 0 };
  g_autofree char *a = NULL;

  s->dir = sl_test_scratch_new ();
  s->project = g_build_filename (s->dir, "p.starledger", NULL);
  a = sl_test_write_file (s->dir, "a.csv", catalogue_a, -1);
  s->b = sl_test_write_file (s->dir, "b.csv", catalogue_b, -1);
  run_cli (&created, "new", s->project, NULL);
  g_assert_cmpint (created.status, ==, 0);
  run_cli (&first, "import", s->project, a, NULL);
  g_assert_cmpint (first.status, ==, 0);
}

static void
scene_tear_down (Scene *s, gconstpointer data)
{
  g_free (s->project);
  g_free (s->b);
  sl_test_scratch_free (s->dir);
}

static void
import_b (Scene *s, CliResult *r)
{
  run_cli (r, "import", s->project, s->b, "--map", "id=name", "--epoch", "2016",
           "--match-radius", "1", "--source-name", "second epoch", NULL);
}

static void
test_usage (void)
{
  const char *const commands[] = { "split", NULL };

  assert_commands_usage (commands);
}

static void
test_import_reports (Scene *s, gconstpointer data)
{
  g_auto (CliResult) r = { 0 };
  g_autofree char *line = NULL;

  import_b (s, &r);
  g_assert_cmpint (r.status, ==, 0);
  assert_contains (r.out, "imported 4 rows, rejected 0\n");
  assert_contains (r.out, "matched by position at epoch J2016.000: 2 rows joined existing stars, 1 ambiguous\n");
  line = g_strdup_printf ("%s:4: ambiguous, not merged: 2 stars within 1 arcsec: A5 at 0.127 arcsec, "
                          "A4 at 0.127 arcsec; kept as star 'B3'\n", s->b);
  assert_contains (r.out, line);
  assert_contains (r.out, "2 new stars\n");
}

static void
test_bad_radius (Scene *s, gconstpointer data)
{
  const char *const bad[] = { "0", "-1", "x", "3601" };

  for (guint i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      g_auto (CliResult) r = { 0 };

      run_cli (&r, "import", s->project, s->b, "--map", "id=name", "--match-radius", bad[i], NULL);
      g_assert_cmpint (r.status, ==, 2);
      assert_contains (r.err, "--match-radius");
      assert_contains (r.err, "expected a number of arcseconds above 0 and at most 3600");
    }
}

static void
test_explain_and_split (Scene *s, gconstpointer data)
{
  g_auto (CliResult) imported = { 0 };
  g_auto (CliResult) before = { 0 };
  g_auto (CliResult) json = { 0 };
  g_auto (CliResult) split = { 0 };
  g_auto (CliResult) after = { 0 };
  g_auto (CliResult) again = { 0 };
  g_auto (CliResult) ledger = { 0 };

  import_b (s, &imported);
  g_assert_cmpint (imported.status, ==, 0);

  run_cli (&before, "explain", s->project, "A3", "vmag", NULL);
  g_assert_cmpint (before.status, ==, 0);
  assert_contains (before.out, "b.csv line 3 (source 2 'second epoch'), its id 'B2': taken as this star");
  assert_contains (before.out, "starledger-cli split PROJECT 2:3");
  run_cli (&json, "explain", s->project, "A3", "vmag", "--json", NULL);
  assert_contains (json.out, "\"matches\":[{\"status\":\"matched\"");
  assert_contains (json.out, "\"row_id\":\"B2\"");

  /* By the source's name, as explain shows it. */
  run_cli (&split, "split", s->project, "second epoch:3", NULL);
  g_assert_cmpint (split.status, ==, 0);
  g_assert_cmpstr (split.out, ==, "second epoch:3: now star 'B2'\n");
  run_cli (&after, "explain", s->project, "B2", "vmag", NULL);
  assert_contains (after.out, "had been taken as star A3");
  run_cli (&ledger, "ledger", s->project, NULL);
  assert_contains (ledger.out, "split 1 row from its star: b.csv:3 (B2) from A3 into B2");

  run_cli (&again, "split", s->project, "2:3", NULL);
  assert_user_error (&again, "b.csv:3: this row was split already; it is star B2");
}

static void
test_split_mistakes (Scene *s, gconstpointer data)
{
  g_auto (CliResult) imported = { 0 };
  g_auto (CliResult) not_matched = { 0 };
  g_auto (CliResult) no_source = { 0 };
  g_auto (CliResult) bad_ref = { 0 };
  g_auto (CliResult) no_row = { 0 };

  import_b (s, &imported);
  run_cli (&not_matched, "split", s->project, "1:2", NULL);
  assert_user_error (&not_matched, "a.csv:2: this row was not matched by position; it is star A1's own row");
  run_cli (&no_source, "split", s->project, "third:2", NULL);
  assert_user_error (&no_source, "no source 'third'");
  run_cli (&no_row, "split", s->project, "2:40", NULL);
  assert_user_error (&no_row, "source 2 has no imported row at line 40");
  run_cli (&bad_ref, "split", s->project, "2-3", NULL);
  g_assert_cmpint (bad_ref.status, ==, 2);
  assert_contains (bad_ref.err, "'2-3': expected SOURCE:LINE");
}

/* At J2016 A3 is where the second catalogue saw it (B2, within 0.1
 * arcsec), with the epoch column saying so; a bad epoch is a usage
 * error that names the option. */
static void
test_export_epoch (Scene *s, gconstpointer data)
{
  g_auto (CliResult) r = { 0 };
  g_auto (CliResult) tex = { 0 };
  const char *const bad[] = { "soon", "J", "1e9" };
  const char *a3;
  double ra, dec;

  run_cli (&r, "export", s->project, "--epoch", "J2016", "--columns", "ra,dec", NULL);
  g_assert_cmpint (r.status, ==, 0);
  assert_prefix (r.out, "id,ra,ra_lo,ra_hi,dec,dec_lo,dec_hi,epoch,epoch_lo,epoch_hi\n");
  a3 = strstr (r.out, "\nA3,");
  g_assert_nonnull (a3);
  {
    g_autofree char *line = g_strndup (a3 + 1, strcspn (a3 + 1, "\n"));
    g_auto (GStrv) cells = g_strsplit (line, ",", -1);

    g_assert_cmpuint (g_strv_length (cells), ==, 10);
    ra = g_ascii_strtod (cells[1], NULL);
    dec = g_ascii_strtod (cells[4], NULL);
  }
  g_assert_cmpfloat (fabs (ra - 50.0256600) * 3600.0 * cos (30.0 * G_PI / 180.0), <, 0.1);
  g_assert_cmpfloat (fabs (dec + 30.0133333) * 3600.0, <, 0.1);
  assert_contains (a3, ",2016,,\n");

  run_cli (&tex, "export", s->project, "--epoch", "2016", "--format", "tex", NULL);
  g_assert_cmpint (tex.status, ==, 0);
  assert_contains (tex.out, "% Positions: ICRS, epoch J2016.00,");

  for (guint i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      g_auto (CliResult) wrong = { 0 };

      run_cli (&wrong, "export", s->project, "--epoch", bad[i], NULL);
      g_assert_cmpint (wrong.status, ==, 2);
      assert_contains (wrong.err, "--epoch");
      g_assert_cmpstr (wrong.out, ==, "");
    }
}

int
main (int argc, char **argv)
{
  cli_test_init (&argc, &argv);

  g_test_add_func ("/cli/match/usage", test_usage);
#define ADD(path, func) g_test_add (path, Scene, NULL, scene_set_up, func, scene_tear_down)
  ADD ("/cli/match/import-reports", test_import_reports);
  ADD ("/cli/match/bad-radius", test_bad_radius);
  ADD ("/cli/match/explain-and-split", test_explain_and_split);
  ADD ("/cli/match/split-mistakes", test_split_mistakes);
  ADD ("/cli/match/export-epoch", test_export_epoch);
#undef ADD

  return g_test_run ();
}
