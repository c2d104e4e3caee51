/* test-cli-combine.c: starledger-cli combine end to end: the policy
 * printed, set and refused (one line, exit 1 or 2, the project
 * untouched), recorded by the next derive, read by export, explain and
 * select; verify judges each run by the policy it recorded. */
#include <sqlite3.h>
#include <string.h>

#include "cli-util.h"
#include "test-util.h"

/* Two sources of the same three stars: A agrees, B's V magnitudes
 * disagree by 10 sigma, C is only in the first. */
static const char north[] =
  "id,parallax,parallax_err,vmag,vmag_err,bv,bv_err\n"
  "A,10.0,0.5,8.00,0.02,0.60,0.01\n"
  "B,20.0,0.1,7.00,0.01,0.50,0.01\n"
  "C,30.0,0.1,6.00,0.01,0.40,0.01\n";
static const char south[] =
  "id,parallax,parallax_err,vmag,vmag_err\n"
  "A,10.3,0.2,8.01,0.03\n"
  "B,20.1,0.1,7.20,0.01\n";

typedef struct {
  char *dir;
  char *project;
} Scene;

static void
scene_set_up (Scene *s, gconstpointer data)
{
  g_auto (CliResult) created = { 0 };
  g_auto (CliResult) first = { 0 };
  g_auto (CliResult) second = { 0 };
  g_autofree char *a = NULL;
  g_autofree char *b = NULL;

  s->dir = sl_test_scratch_new ();
  s->project = g_build_filename (s->dir, "p.starledger", NULL);
  a = sl_test_write_file (s->dir, "north.csv", north, -1);
  b = sl_test_write_file (s->dir, "south.csv", south, -1);
  run_cli (&created, "new", s->project, NULL);
  run_cli (&first, "import", s->project, a, "--source-name", "North", NULL);
  run_cli (&second, "import", s->project, b, "--source-name", "South", NULL);
  g_assert_cmpint (second.status, ==, 0);
}

static void
scene_tear_down (Scene *s, gconstpointer data)
{
  g_free (s->project);
  sl_test_scratch_free (s->dir);
}

static char *
cell (const char *csv, const char *star, const char *column)
{
  g_auto (GStrv) lines = g_strsplit (csv, "\n", -1);
  g_auto (GStrv) header = g_strsplit (lines[0], ",", -1);
  guint index = 0;

  while (header[index] != NULL && strcmp (header[index], column) != 0)
    index++;
  g_assert_nonnull (header[index]);
  for (guint i = 1; lines[i] != NULL; i++)
    if (g_str_has_prefix (lines[i], star) && lines[i][strlen (star)] == ',')
      {
        g_auto (GStrv) cells = g_strsplit (lines[i], ",", -1);

        return g_strdup (cells[index]);
      }
  g_assert_not_reached ();
}

static void
test_usage (void)
{
  static const char *const commands[] = { "combine", NULL };

  assert_commands_usage (commands);
}

static void
test_defaults (Scene *s, gconstpointer data)
{
  g_auto (CliResult) shown = { 0 };

  run_cli (&shown, "combine", s->project, NULL);
  g_assert_cmpint (shown.status, ==, 0);
  assert_prefix (shown.out, "position  smallest-error\nparallax  smallest-error\npm        smallest-error\n");
  assert_contains (shown.out, "source order: none");
  assert_contains (shown.out, "below 0.01\n");
}

/* Weighted means: numbers by hand (Taylor 1997, eq. 7.10): A's parallax
 * (10/0.25 + 10.3/0.04) / (4 + 25) = 10.258620689655..., its error
 * 29^-1/2 = 0.18569533817705...; B's V magnitudes 7.00 and 7.20, each
 * +/- 0.01, differ by 14 sigma: flagged. */
static void
test_weighted_mean (Scene *s, gconstpointer data)
{
  g_auto (CliResult) set = { 0 };
  g_auto (CliResult) derive = { 0 };
  g_auto (CliResult) export = { 0 };
  g_auto (CliResult) explain = { 0 };
  g_auto (CliResult) verify = { 0 };
  g_auto (CliResult) ledger = { 0 };
  g_autofree char *parallax = NULL;
  g_autofree char *lo = NULL;
  g_autofree char *flags_a = NULL;
  g_autofree char *flags_b = NULL;
  g_autofree char *flags_c = NULL;

  run_cli (&set, "combine", s->project, "--rule", "parallax=weighted-mean", "--rule", "vmag=weighted-mean", NULL);
  g_assert_cmpint (set.status, ==, 0);
  assert_contains (set.out, "parallax  weighted-mean\n");
  assert_contains (set.out, "vmag      weighted-mean\n");
  run_cli (&ledger, "ledger", s->project, NULL);
  assert_contains (ledger.out, "combination policy: parallax weighted-mean, vmag weighted-mean");

  run_cli (&derive, "derive", s->project, NULL);
  g_assert_cmpint (derive.status, ==, 0);
  assert_contains (derive.out, "sources combined: parallax weighted-mean, vmag weighted-mean, others smallest-error");
  run_cli (&export, "export", s->project, "--columns", "parallax,flags", NULL);
  parallax = cell (export.out, "A", "parallax");
  lo = cell (export.out, "A", "parallax_lo");
  g_assert_cmpstr (parallax, ==, "10.2586206896552");
  g_assert_cmpstr (lo, ==, "10.0729253514781");   /* 10.258620689655172 - 0.18569533817705186 */
  flags_a = cell (export.out, "A", "flags");
  flags_b = cell (export.out, "B", "flags");
  flags_c = cell (export.out, "C", "flags");
  assert_lacks (flags_a, "sources_disagree");
  assert_contains (flags_b, "sources_disagree");
  assert_lacks (flags_c, "sources_disagree");

  run_cli (&explain, "explain", s->project, "B", "absmag", NULL);
  g_assert_cmpint (explain.status, ==, 0);
  assert_contains (explain.out, "the inverse-variance weighted mean of the 2 rows below");
  assert_contains (explain.out, "vmag: 2 rows; rule weighted-mean: the weighted mean of 2 of them\n");
  assert_contains (explain.out, "the sources DISAGREE beyond their errors");
  run_cli (&verify, "verify", s->project, NULL);
  assert_prefix (verify.out, "checked 3 stars: 0 differences; 0 stale");
}

/* A change of policy makes every derived star stale (verify skips them);
 * the next derive follows the new one.  select reads the mean. */
static void
test_change_and_verify (Scene *s, gconstpointer data)
{
  g_auto (CliResult) first = { 0 };
  g_auto (CliResult) set = { 0 };
  g_auto (CliResult) verify = { 0 };
  g_auto (CliResult) derive = { 0 };
  g_auto (CliResult) verify_after = { 0 };
  g_auto (CliResult) select = { 0 };
  g_auto (CliResult) order = { 0 };
  g_auto (CliResult) by_order = { 0 };
  g_autofree char *vmag = NULL;

  run_cli (&first, "derive", s->project, NULL);
  g_assert_cmpint (first.status, ==, 0);
  run_cli (&set, "combine", s->project, "--rule", "all=weighted-mean", "--level", "0", NULL);
  g_assert_cmpint (set.status, ==, 0);
  assert_contains (set.out, "position  smallest-error\n");   /* all but the position */
  assert_contains (set.out, "agreement test: off\n");
  run_cli (&verify, "verify", s->project, NULL);
  assert_prefix (verify.out, "checked 0 stars: 0 differences; 3 stale");
  run_cli (&derive, "derive", s->project, NULL);
  assert_prefix (derive.out, "derived 3 stars, 0 already up to date");
  run_cli (&verify_after, "verify", s->project, NULL);
  assert_prefix (verify_after.out, "checked 3 stars: 0 differences; 0 stale");
  run_cli (&select, "select", s->project, "--where", "parallax > 10.2 and parallax < 10.3", "--into", "mean", NULL);
  g_assert_cmpint (select.status, ==, 0);
  assert_contains (select.out, "1 star");

  /* A source order: South's V wherever it has one. */
  run_cli (&order, "combine", s->project, "--rule", "vmag=priority", "--source-order", "South", NULL);
  assert_contains (order.out, "  1. South\n");
  run_cli (&by_order, "export", s->project, "--columns", "vmag", NULL);
  vmag = cell (by_order.out, "B", "vmag");
  g_assert_cmpstr (vmag, ==, "7.2");
}

/* A run recorded before projects had a policy chose the smallest
 * uncertainty and tested nothing: verify judges its rows by that, not by
 * today's default (which would flag B). */
static void
test_verify_by_the_runs_policy (Scene *s, gconstpointer data)
{
  g_auto (CliResult) derive = { 0 };
  g_auto (CliResult) verify = { 0 };
  g_auto (CliResult) now = { 0 };
  sqlite3 *db;

  run_cli (&derive, "derive", s->project, NULL);
  g_assert_cmpint (derive.status, ==, 0);
  /* What such a run left: no [combine] group, no sources_disagree. */
  g_assert_cmpint (sqlite3_open (s->project, &db), ==, SQLITE_OK);
  g_assert_cmpint (sqlite3_exec (db,
                                 "UPDATE derivation_runs SET parameters = substr (parameters, 1,"
                                 " instr (parameters, '[combine]') - 1);"
                                 "UPDATE derived SET flags = flags & ~2048;", NULL, NULL, NULL), ==, SQLITE_OK);
  g_assert_cmpint (sqlite3_changes (db), ==, 3);
  sqlite3_close (db);
  run_cli (&verify, "verify", s->project, NULL);
  g_assert_cmpint (verify.status, ==, 0);
  assert_prefix (verify.out, "checked 3 stars: 0 differences; 0 stale");
  /* Today's derive re-derives them (other parameters) and flags B. */
  run_cli (&now, "derive", s->project, NULL);
  assert_prefix (now.out, "derived 3 stars, 0 already up to date");
}

static void
test_mistakes (Scene *s, gconstpointer data)
{
  static const char *const usage[][3] = {
    { "--rule", "parallax", NULL },
    { "--rule", "parallax=median", NULL },
    { "--rule", "colour=weighted-mean", NULL },
    { "--rule", "position=weighted-mean", NULL },
    { "--level", "2", NULL },
    { "--level", "often", NULL },
  };
  g_auto (CliResult) before = { 0 };
  g_auto (CliResult) unknown = { 0 };
  g_auto (CliResult) level_one = { 0 };
  g_auto (CliResult) after = { 0 };

  run_cli (&before, "ledger", s->project, NULL);
  for (guint i = 0; i < G_N_ELEMENTS (usage); i++)
    {
      g_auto (CliResult) wrong = { 0 };

      run_cli (&wrong, "combine", s->project, usage[i][0], usage[i][1], NULL);
      g_assert_cmpint (wrong.status, ==, 2);
      assert_contains (wrong.err, usage[i][0]);
    }
  run_cli (&unknown, "combine", s->project, "--source-order", "Nort", NULL);
  assert_user_error (&unknown, "no source is named 'Nort' (the sources: 'North', 'South')");
  run_cli (&level_one, "combine", s->project, "--level", "1", NULL);
  assert_user_error (&level_one, "level must lie in [0, 1)");
  run_cli (&after, "ledger", s->project, NULL);
  g_assert_cmpstr (after.out, ==, before.out);
}

int
main (int argc, char **argv)
{
  cli_test_init (&argc, &argv);

  g_test_add_func ("/cli/combine/usage", test_usage);
#define ADD(path, func) g_test_add (path, Scene, NULL, scene_set_up, func, scene_tear_down)
  ADD ("/cli/combine/defaults", test_defaults);
  ADD ("/cli/combine/weighted-mean", test_weighted_mean);
  ADD ("/cli/combine/change-and-verify", test_change_and_verify);
  ADD ("/cli/combine/verify-by-the-runs-policy", test_verify_by_the_runs_policy);
  ADD ("/cli/combine/mistakes", test_mistakes);
#undef ADD

  return g_test_run ();
}
