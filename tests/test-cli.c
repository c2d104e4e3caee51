/* test-cli.c: starledger-cli end to end on the demo data: exit statuses,
 * messages, the import report, export, ledger and summary, and the same
 * numbers under a comma-decimal locale. */
#include <string.h>

#include "cli-util.h"
#include "derive/engine.h"
#include "test-util.h"

static void
test_usage (void)
{
  const char *const commands[] = { "new", "import", "export", "summary", "ledger", NULL };
  g_auto (CliResult) none = { 0 };
  g_auto (CliResult) unknown = { 0 };

  run_cli (&none, NULL);
  g_assert_cmpint (none.status, ==, 2);
  run_cli (&unknown, "frobnicate", NULL);
  g_assert_cmpint (unknown.status, ==, 2);
  assert_contains (unknown.err, "'frobnicate' is not a command");
  assert_commands_usage (commands);
}

static void
test_new_refuses_existing (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = g_build_filename (dir, "p.starledger", NULL);
  g_auto (CliResult) first = { 0 };
  g_auto (CliResult) second = { 0 };

  run_cli (&first, "new", project, NULL);
  g_assert_cmpint (first.status, ==, 0);
  run_cli (&second, "new", project, NULL);
  assert_user_error (&second, "already exists");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* The deliberate bad rows of data/demo (README there) are rejected, each
 * named by file, line, column and reason, and nothing else is. */
static void
test_demo_import (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = g_build_filename (dir, "demo.starledger", NULL);
  g_autofree char *a = demo_file ("astrometry.csv");
  g_autofree char *p = demo_file ("photometry.csv");
  g_auto (CliResult) astrometry = { 0 };
  g_auto (CliResult) photometry = { 0 };
  g_auto (CliResult) again = { 0 };
  g_autofree char *want_a = g_strdup_printf ("%s:92: dec: dec must be in [-90, 90] deg, not 91.3\n"
                                             "%s:138: parallax: not a number: '12.7.1'\n"
                                             "%s:176: parallax_err: an uncertainty must be positive, not 0\n"
                                             "%s:236: id: id 'LHO 0064' appears twice in this file (first on line 69)\n"
                                             "%s:267: id: the id is empty\n", a, a, a, a, a);
  g_autofree char *want_p = g_strdup_printf ("%s:79: dec_sexa: minutes must be below 60: '+12 61 10.0'\n"
                                             "%s:156: v: vmag must be in [-30, 30] mag, not 41.2\n"
                                             "%s:236: spectral_type: not valid UTF-8 text\n", p, p, p);

  import_demo (project, NULL, &astrometry, &photometry);
  g_assert_cmpint (astrometry.status, ==, 0);
  assert_prefix (astrometry.out, "imported 317 rows, rejected 5\n");
  g_assert_cmpstr (astrometry.err, ==, want_a);
  g_assert_cmpint (photometry.status, ==, 0);
  assert_prefix (photometry.out, "imported 311 rows, rejected 3\n");
  g_assert_cmpstr (photometry.err, ==, want_p);
  assert_contains (photometry.out, "11 new stars");

  run_cli (&again, "import", project, a, NULL);
  assert_user_error (&again, "--again");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* import --dry-run: the report of the import (counts and every rejection,
 * word for word) and nothing written: no source, no star, no ledger entry,
 * and the real import afterwards is not refused as a second one. */
static void
test_import_dry_run (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = g_build_filename (dir, "dry.starledger", NULL);
  g_autofree char *a = demo_file ("astrometry.csv");
  g_auto (CliResult) created = { 0 };
  g_auto (CliResult) dry = { 0 };
  g_auto (CliResult) summary = { 0 };
  g_auto (CliResult) ledger = { 0 };
  g_auto (CliResult) real = { 0 };

  run_cli (&created, "new", project, NULL);
  g_assert_cmpint (created.status, ==, 0);
  run_cli (&dry, "import", project, a, "--dry-run", NULL);
  g_assert_cmpint (dry.status, ==, 0);
  assert_prefix (dry.out, "dry run: would import 317 rows, reject 5; nothing was written\n");
  assert_contains (dry.out, "comma-delimited");
  assert_contains (dry.err, ":138: parallax: not a number: '12.7.1'\n");

  run_cli (&summary, "summary", project, NULL);
  g_assert_cmpint (summary.status, ==, 0);
  assert_contains (summary.out, "0 stars, 0 measurements from 0 sources");
  run_cli (&ledger, "ledger", project, NULL);
  assert_lacks (ledger.out, "import");

  run_cli (&real, "import", project, a, NULL);
  g_assert_cmpint (real.status, ==, 0);
  assert_prefix (real.out, "imported 317 rows, rejected 5\n");
  g_assert_cmpstr (real.err, ==, dry.err);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

static void
test_demo_export_ledger_summary (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = g_build_filename (dir, "demo.starledger", NULL);
  g_autofree char *out_path = g_build_filename (dir, "stars.csv", NULL);
  g_auto (CliResult) a = { 0 };
  g_auto (CliResult) p = { 0 };
  g_auto (CliResult) to_stdout = { 0 };
  g_auto (CliResult) to_file = { 0 };
  g_auto (CliResult) columns = { 0 };
  g_auto (CliResult) bad_columns = { 0 };
  g_auto (CliResult) ledger = { 0 };
  g_auto (CliResult) summary = { 0 };
  g_autofree char *file_text = NULL;
  g_auto (GStrv) lines = NULL;

  import_demo (project, NULL, &a, &p);

  run_cli (&to_stdout, "export", project, NULL);
  g_assert_cmpint (to_stdout.status, ==, 0);
  lines = g_strsplit (to_stdout.out, "\n", -1);
  g_assert_cmpuint (g_strv_length (lines), ==, 1 + 337 + 1);   /* header, stars, final "" */

  run_cli (&to_file, "export", project, "-o", out_path, NULL);
  g_assert_cmpint (to_file.status, ==, 0);
  g_assert_true (g_file_get_contents (out_path, &file_text, NULL, NULL));
  g_assert_cmpstr (file_text, ==, to_stdout.out);

  run_cli (&columns, "export", project, "--columns", "parallax, sptype", NULL);
  g_assert_cmpint (columns.status, ==, 0);
  assert_prefix (columns.out, "id,parallax,parallax_lo,parallax_hi,sptype\n");

  run_cli (&bad_columns, "export", project, "--columns", "distance", NULL);
  assert_user_error (&bad_columns, NULL);

  run_cli (&ledger, "ledger", project, NULL);
  g_assert_cmpint (ledger.status, ==, 0);
  assert_contains (ledger.out, "create");
  assert_contains (ledger.out, "imported astrometry.csv: 317 rows accepted, 5 rejected");
  assert_contains (ledger.out, "imported photometry.csv: 311 rows accepted, 3 rejected");

  run_cli (&summary, "summary", project, NULL);
  g_assert_cmpint (summary.status, ==, 0);
  assert_contains (summary.out, "337 stars, 683 measurements from 3 sources, 8 rejected rows");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

static void
test_errors_are_one_line (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *not_project = sl_test_write_file (dir, "notes.txt", "hello\n", -1);
  g_autofree char *project = g_build_filename (dir, "p.starledger", NULL);
  g_autofree char *missing = g_build_filename (dir, "missing.csv", NULL);
  g_auto (CliResult) created = { 0 };
  g_auto (CliResult) foreign = { 0 };
  g_auto (CliResult) no_file = { 0 };
  g_auto (CliResult) bad_map = { 0 };
  g_auto (CliResult) bad_epoch = { 0 };

  run_cli (&foreign, "summary", not_project, NULL);
  assert_user_error (&foreign, "not a Starledger project");

  run_cli (&created, "new", project, NULL);
  run_cli (&no_file, "import", project, missing, NULL);
  assert_user_error (&no_file, "missing.csv");

  run_cli (&bad_map, "import", project, not_project, "--map", "dec=x:hms", NULL);
  g_assert_cmpint (bad_map.status, ==, 2);
  run_cli (&bad_epoch, "import", project, not_project, "--epoch", "2451545.0", NULL);
  g_assert_cmpint (bad_epoch.status, ==, 2);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* The same files under a comma-decimal locale give the same numbers. */
static void
test_locale_independent (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *c_project = g_build_filename (dir, "c.starledger", NULL);
  g_autofree char *de_project = g_build_filename (dir, "de.starledger", NULL);
  g_auto (CliResult) a1 = { 0 }, p1 = { 0 }, a2 = { 0 }, p2 = { 0 };
  g_auto (CliResult) c_export = { 0 };
  g_auto (CliResult) de_export = { 0 };

  if (!g_file_test ("/usr/lib/locale/locale-archive", G_FILE_TEST_EXISTS))
    {
      g_test_skip ("no compiled locales (build-aux/dev generates de_DE.UTF-8)");
      sl_test_scratch_free (g_steal_pointer (&dir));
      return;
    }
  import_demo (c_project, "C.UTF-8", &a1, &p1);
  import_demo (de_project, "de_DE.UTF-8", &a2, &p2);
  g_assert_cmpint (p2.status, ==, 0);
  run_cli_in_locale (&c_export, "C.UTF-8", "export", c_project, NULL);
  run_cli_in_locale (&de_export, "de_DE.UTF-8", "export", de_project, NULL);
  g_assert_cmpint (de_export.status, ==, 0);
  g_assert_cmpstr (de_export.out, ==, c_export.out);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* `methods` lists every module of the registry, in the engine's order,
 * with its citation, and every run parameter with its default. */
static void
test_methods_lists_registry (void)
{
  g_autoptr (GPtrArray) modules = sl_modules_in_order ();
  g_auto (CliResult) r = { 0 };
  g_auto (CliResult) extra = { 0 };
  const char *at;

  run_cli (&r, "methods", NULL);
  g_assert_cmpint (r.status, ==, 0);
  at = r.out;
  for (guint i = 0; i < modules->len; i++)
    {
      const SlModule *m = modules->pdata[i];
      g_autofree char *heading = g_strdup_printf ("\n%s (version %d)\n", m->name, m->version);
      const char *found = strstr (at, heading);

      if (found == NULL)
        g_error ("'%s' is missing or out of order in:\n%s", m->name, r.out);
      assert_contains (found, m->citation);
      at = found + 1;
    }
  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    assert_contains (r.out, sl_param_info (p)->name);
  assert_contains (r.out, "length_scale_pc      default 1350 pc");

  run_cli (&extra, "methods", "surplus", NULL);
  g_assert_cmpint (extra.status, ==, 2);
}

int
main (int argc, char **argv)
{
  cli_test_init (&argc, &argv);

  g_test_add_func ("/cli/usage", test_usage);
  g_test_add_func ("/cli/new/refuses-existing", test_new_refuses_existing);
  g_test_add_func ("/cli/demo/import-report", test_demo_import);
  g_test_add_func ("/cli/import/dry-run", test_import_dry_run);
  g_test_add_func ("/cli/demo/export-ledger-summary", test_demo_export_ledger_summary);
  g_test_add_func ("/cli/errors-are-one-line", test_errors_are_one_line);
  g_test_add_func ("/cli/locale/comma-decimal-locale", test_locale_independent);
  g_test_add_func ("/cli/methods/lists-registry", test_methods_lists_registry);

  return g_test_run ();
}
