/* test-cli-derive.c: starledger-cli derive, verify, override, explain and
 * the LaTeX export end to end on the demo data: what is derived when,
 * that verify catches a changed raw value or derived value, that a new
 * measurement or a hand-set value makes a star stale, the derivation trail
 * down to the source file's line and SHA-256, the PDG rounding of the
 * LaTeX table, and the same bytes under a comma-decimal locale. */
#include <gio/gio.h>
#include <math.h>
#include <sqlite3.h>
#include <stdlib.h>
#include <string.h>

#include "cli-util.h"
#include "test-util.h"

#define N_DEMO_STARS 337

/* ------------------------------------------------------------------ */
/* Helpers                                                            */

/* Runs SQL on the project file through a plain SQLite connection, as
 * another program (or someone with the sqlite3 shell) would. */
static void
sql_exec (const char *path, const char *sql)
{
  sqlite3 *db;

  g_assert_cmpint (sqlite3_open (path, &db), ==, SQLITE_OK);
  if (sqlite3_exec (db, sql, NULL, NULL, NULL) != SQLITE_OK)
    g_error ("%s: %s", sql, sqlite3_errmsg (db));
  g_assert_cmpint (sqlite3_changes (db), >=, 1);
  sqlite3_close (db);
}

/* Opens the project file read-only, with a connection of the test's own
 * as another program would. */
static sqlite3 *
open_read_only (const char *path)
{
  sqlite3 *db;

  g_assert_cmpint (sqlite3_open_v2 (path, &db, SQLITE_OPEN_READONLY, NULL), ==, SQLITE_OK);
  return db;
}

static gint64
sql_int (const char *path, const char *sql)
{
  sqlite3 *db = open_read_only (path);
  gint64 value = sl_test_query_int (db, sql);

  sqlite3_close (db);
  return value;
}

static char *
sql_text (const char *path, const char *sql)
{
  sqlite3 *db = open_read_only (path);
  char *value = sl_test_query_text (db, sql);

  sqlite3_close (db);
  return value;
}

/* The demo project in DIR, imported as README does; derived too if DERIVE. */
static char *
demo_project (const char *dir, const char *locale, gboolean derive)
{
  char *project = g_build_filename (dir, "demo.starledger", NULL);
  g_auto (CliResult) a = { 0 };
  g_auto (CliResult) p = { 0 };
  g_auto (CliResult) derived = { 0 };

  import_demo (project, locale, &a, &p);
  g_assert_cmpint (a.status, ==, 0);
  g_assert_cmpint (p.status, ==, 0);
  if (derive)
    {
      run_cli_in_locale (&derived, locale, "derive", project, NULL);
      g_assert_cmpint (derived.status, ==, 0);
      assert_prefix (derived.out, "derived 337 stars, 0 already up to date");
    }
  return project;
}

/* The cell of column COLUMN in the row of star ID of CSV (an export with
 * no quoted cells); NULL if there is no such row or column. */
static char *
csv_cell (const char *csv, const char *id, const char *column)
{
  g_auto (GStrv) lines = g_strsplit (csv, "\n", -1);
  g_auto (GStrv) header = g_strsplit (lines[0], ",", -1);
  g_autofree char *prefix = g_strconcat (id, ",", NULL);
  int index = -1;

  for (int i = 0; header[i]; i++)
    if (strcmp (header[i], column) == 0)
      index = i;
  if (index < 0)
    return NULL;
  for (int i = 1; lines[i]; i++)
    if (g_str_has_prefix (lines[i], prefix))
      {
        g_auto (GStrv) cells = g_strsplit (lines[i], ",", -1);

        g_assert_cmpuint (g_strv_length (cells), ==, g_strv_length (header));
        return g_strdup (cells[index]);
      }
  return NULL;
}

static double
csv_number (const char *csv, const char *id, const char *column)
{
  g_autofree char *cell = csv_cell (csv, id, column);

  g_assert_nonnull (cell);
  return *cell ? g_ascii_strtod (cell, NULL) : NAN;
}

static guint
count_lines_containing (const char *text, const char *needle)
{
  g_auto (GStrv) lines = g_strsplit (text, "\n", -1);
  guint n = 0;

  for (guint i = 0; lines[i]; i++)
    if (strstr (lines[i], needle))
      n++;
  return n;
}

static char *
file_sha256 (const char *path)
{
  g_autofree char *contents = NULL;
  gsize length;

  g_assert_true (g_file_get_contents (path, &contents, &length, NULL));
  return g_compute_checksum_for_data (G_CHECKSUM_SHA256, (const guchar *) contents, length);
}

/* Line NUMBER (from 1) of the file at PATH. */
static char *
file_line (const char *path, gint64 number)
{
  g_autofree char *contents = NULL;
  g_auto (GStrv) lines = NULL;

  g_assert_true (g_file_get_contents (path, &contents, NULL, NULL));
  lines = g_strsplit (contents, "\n", -1);
  g_assert_cmpint (number, >=, 1);
  g_assert_cmpint (number, <=, g_strv_length (lines));
  return g_strdup (lines[number - 1]);
}

/* ------------------------------------------------------------------ */
/* Usage and the derive command                                       */

static void
test_usage (void)
{
  const char *const commands[] = { "derive", "verify", "explain", "override", NULL };

  assert_commands_usage (commands);
}

/* Only what needs it is derived: nothing the second time, everything with
 * --all or with other parameters. */
static void
test_derive_counts (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, FALSE);
  g_auto (CliResult) first = { 0 };
  g_auto (CliResult) second = { 0 };
  g_auto (CliResult) all = { 0 };
  g_auto (CliResult) edsd = { 0 };
  g_auto (CliResult) edsd_again = { 0 };
  g_auto (CliResult) ledger = { 0 };

  run_cli (&first, "derive", project, NULL);
  g_assert_cmpint (first.status, ==, 0);
  assert_prefix (first.out, "derived 337 stars, 0 already up to date (run 1, ");
  assert_contains (first.out, "parameters: distance inverse");
  g_assert_cmpstr (first.err, ==, "");
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived"), ==, N_DEMO_STARS);

  run_cli (&second, "derive", project, NULL);
  g_assert_cmpint (second.status, ==, 0);
  assert_prefix (second.out, "derived 0 stars, 337 already up to date");

  run_cli (&all, "derive", project, "--all", NULL);
  g_assert_cmpint (all.status, ==, 0);
  assert_prefix (all.out, "derived 337 stars, 0 already up to date");

  /* Other parameters: every star again, then nothing. */
  run_cli (&edsd, "derive", project, "--distance", "edsd", NULL);
  g_assert_cmpint (edsd.status, ==, 0);
  assert_prefix (edsd.out, "derived 337 stars, 0 already up to date");
  assert_contains (edsd.out, "distance edsd (L = 1350 pc)");
  run_cli (&edsd_again, "derive", project, "--distance", "edsd", NULL);
  assert_prefix (edsd_again.out, "derived 0 stars, 337 already up to date");

  /* Each derived row belongs to the run that computed it. */
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived WHERE run_id = 4"), ==, N_DEMO_STARS);
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derivation_runs WHERE finished_at IS NOT NULL"),
                   ==, 5);

  run_cli (&ledger, "ledger", project, NULL);
  g_assert_cmpint (ledger.status, ==, 0);
  g_assert_cmpuint (count_lines_containing (ledger.out, "derived 337 stars (run "), ==, 3);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

static void
test_derive_bad_options (void)
{
  const char *bad[][2] = {
    { "--distance", "foo" }, { "--distance", "edsd:L=-5" }, { "--errors", "mc:x" }, { "--errors", "mc:0" },
    { "--seed", "-1" }, { "--seed", "1.5" }, { "--teff", "nope" }, { "--extinction-ratio", "0" },
    { "--extinction-ratio-error", "-0.1" }, { "--parallax-zero-point", "0,02" },
    { "--monte-carlo-below-snr", "-1" },
  };
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, FALSE);
  g_autofree char *missing = g_build_filename (dir, "missing.starledger", NULL);
  g_auto (CliResult) no_project = { 0 };

  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      g_auto (CliResult) r = { 0 };

      run_cli (&r, "derive", project, bad[i][0], bad[i][1], NULL);
      if (r.status != 2)
        g_error ("derive %s %s: want exit status 2, got %d", bad[i][0], bad[i][1], r.status);
      assert_contains (r.err, bad[i][0]);
      assert_contains (r.err, "Try 'starledger-cli derive --help'");
      g_assert_cmpstr (r.out, ==, "");
    }
  /* A usage error derives nothing and records no run. */
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derivation_runs"), ==, 0);
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived"), ==, 0);

  run_cli (&no_project, "derive", missing, NULL);
  assert_user_error (&no_project, NULL);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* Every column of every derived row but run_id, in star order, as text. */
static char *
derived_rows_text (const char *path)
{
  sqlite3 *db = open_read_only (path);
  GString *text = g_string_new (NULL);
  sqlite3_stmt *stmt;

  g_assert_cmpint (sqlite3_prepare_v2 (db, "SELECT * FROM derived ORDER BY star_id", -1, &stmt, NULL), ==,
                   SQLITE_OK);
  while (sqlite3_step (stmt) == SQLITE_ROW)
    {
      for (int c = 0; c < sqlite3_column_count (stmt); c++)
        if (strcmp (sqlite3_column_name (stmt, c), "run_id") != 0)
          g_string_append_printf (text, "%s|", sqlite3_column_type (stmt, c) == SQLITE_NULL
                                                  ? "NULL" : (const char *) sqlite3_column_text (stmt, c));
      g_string_append_c (text, '\n');
    }
  sqlite3_finalize (stmt);
  sqlite3_close (db);
  return g_string_free (text, FALSE);
}

/* A run inserts the rows of stars above the largest star id with a row
 * without looking for them, and writes over the others; a star below it
 * whose row is missing (deleted here by hand) gets a new one all the
 * same.  Either way the rows are those of the first run. */
static void
test_derive_rows_inserted_and_updated (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  g_autofree char *first = derived_rows_text (project);
  g_autofree char *again = NULL;
  g_autofree char *all = NULL;
  g_autofree char *delete_two = NULL;
  g_autofree char *delete_middle = NULL;
  g_auto (CliResult) missing = { 0 };
  g_auto (CliResult) every = { 0 };
  g_auto (CliResult) verify = { 0 };
  gint64 middle = sql_int (project, "SELECT star_id FROM derived ORDER BY star_id LIMIT 1 OFFSET 100");
  gint64 last = sql_int (project, "SELECT max(star_id) FROM derived");

  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived"), ==, N_DEMO_STARS);
  delete_two = g_strdup_printf ("DELETE FROM derived WHERE star_id IN (%" G_GINT64_FORMAT ", %" G_GINT64_FORMAT ")",
                                middle, last);
  sql_exec (project, delete_two);
  run_cli (&missing, "derive", project, NULL);
  g_assert_cmpint (missing.status, ==, 0);
  assert_prefix (missing.out, "derived 2 stars, 335 already up to date");
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived"), ==, N_DEMO_STARS);
  again = derived_rows_text (project);
  g_assert_cmpstr (again, ==, first);

  delete_middle = g_strdup_printf ("DELETE FROM derived WHERE star_id = %" G_GINT64_FORMAT, middle);
  sql_exec (project, delete_middle);
  run_cli (&every, "derive", project, "--all", NULL);
  g_assert_cmpint (every.status, ==, 0);
  assert_prefix (every.out, "derived 337 stars, 0 already up to date (run 3, ");
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived WHERE run_id = 3"), ==, N_DEMO_STARS);
  all = derived_rows_text (project);
  g_assert_cmpstr (all, ==, first);

  run_cli (&verify, "verify", project, NULL);
  assert_prefix (verify.out, "checked 337 stars: 0 differences; 0 stale");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* Verify                                                             */

static void
test_verify_clean (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  g_auto (CliResult) verify = { 0 };

  run_cli (&verify, "verify", project, NULL);
  g_assert_cmpint (verify.status, ==, 0);
  assert_prefix (verify.out, "checked 337 stars: 0 differences; 0 stale");
  assert_contains (verify.out, "integrity ok");
  g_assert_cmpstr (verify.err, ==, "");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* Checks that every line of ERR names STAR, and that the count of
 * differences on stdout is the number of lines. */
static void
assert_differences_only_of (const CliResult *verify, const char *project, const char *star)
{
  g_autofree char *prefix = g_strdup_printf ("%s: %s: ", project, star);
  g_autofree char *count = NULL;
  g_auto (GStrv) lines = g_strsplit (verify->err, "\n", -1);
  guint n = g_strv_length (lines) - 1;   /* the last is "" */

  g_assert_cmpuint (n, >, 0);
  for (guint i = 0; i < n; i++)
    assert_prefix (lines[i], prefix);
  count = g_strdup_printf ("checked 337 stars: %u differences; 0 stale", n);
  assert_prefix (verify->out, count);
  assert_contains (verify->out, "integrity ok");
}

/* A raw measurement changed behind Starledger's back: verify recomputes
 * from it and every quantity that follows from the parallax differs. */
static void
test_verify_tampered_measurement (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  g_autofree char *star = NULL;
  g_auto (CliResult) verify = { 0 };
  const char *follow[] = { "plx_snr", "dist", "distmod", "absmag", "mbol", "lum", "radius", "vtan" };

  star = sql_text (project, "SELECT designation FROM stars WHERE id = 1");
  sql_exec (project, "UPDATE measurements SET parallax = parallax + 1 "
                     "WHERE id = (SELECT m_parallax FROM derived WHERE star_id = 1)");

  run_cli (&verify, "verify", project, NULL);
  g_assert_cmpint (verify.status, ==, 1);
  assert_differences_only_of (&verify, project, star);
  for (gsize i = 0; i < G_N_ELEMENTS (follow); i++)
    {
      g_autofree char *line = g_strdup_printf ("%s: %s: stored ", star, follow[i]);

      assert_contains (verify.err, line);
    }
  /* The temperature does not depend on the parallax. */
  assert_lacks (verify.err, ": teff: ");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* A derived value changed by hand in the file: verify names it and only it. */
static void
test_verify_tampered_derived (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  g_autofree char *star = NULL;
  g_autofree char *teff_line = NULL;
  g_auto (CliResult) verify = { 0 };

  star = sql_text (project, "SELECT designation FROM stars WHERE id = 2");
  sql_exec (project, "UPDATE derived SET teff = teff + 1 WHERE star_id = 2");

  run_cli (&verify, "verify", project, NULL);
  g_assert_cmpint (verify.status, ==, 1);
  assert_differences_only_of (&verify, project, star);
  teff_line = g_strdup_printf ("%s: %s: teff: stored ", project, star);
  assert_prefix (verify.err, teff_line);
  assert_one_line (verify.err);   /* teff alone: its bounds and what follows are as stored */
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* Monte Carlo values are recomputed exactly with the seed their run
 * recorded; another seed gives other values, so a pass means the seed
 * was used. */
static void
test_verify_monte_carlo (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, FALSE);
  g_auto (CliResult) mc = { 0 };
  g_auto (CliResult) verify = { 0 };
  g_auto (CliResult) export5 = { 0 };
  g_auto (CliResult) mc6 = { 0 };
  g_auto (CliResult) export6 = { 0 };
  g_auto (CliResult) verify6 = { 0 };

  run_cli (&mc, "derive", project, "--errors", "mc:200", "--seed", "5", NULL);
  g_assert_cmpint (mc.status, ==, 0);
  assert_prefix (mc.out, "derived 337 stars");
  assert_contains (mc.out, "errors mc:200 (seed 5)");
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived WHERE monte_carlo = 1"), ==, N_DEMO_STARS);

  run_cli (&verify, "verify", project, NULL);
  g_assert_cmpint (verify.status, ==, 0);
  assert_prefix (verify.out, "checked 337 stars: 0 differences; 0 stale");
  g_assert_cmpstr (verify.err, ==, "");

  run_cli (&export5, "export", project, "--columns", "dist,teff,lum", NULL);
  run_cli (&mc6, "derive", project, "--errors", "mc:200", "--seed", "6", NULL);
  assert_prefix (mc6.out, "derived 337 stars");
  run_cli (&export6, "export", project, "--columns", "dist,teff,lum", NULL);
  g_assert_cmpint (export6.status, ==, 0);
  g_assert_cmpstr (export5.out, !=, export6.out);
  run_cli (&verify6, "verify", project, NULL);
  g_assert_cmpint (verify6.status, ==, 0);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* derive --help cites each method and the source of each default, from
 * the same table as the window's Derive dialog (registry.c). */
static void
test_derive_help_cites_methods (void)
{
  g_auto (CliResult) help = { 0 };

  run_cli (&help, "derive", "--help", NULL);
  g_assert_cmpint (help.status, ==, 0);
  assert_contains (help.out, "\nMethods, defaults and their sources:\n");
  assert_contains (help.out, "\n  Distance method inverse (default): Bailer-Jones 2015, PASP 127, 994\n");
  assert_contains (help.out, "\n  Temperature calibration ballesteros: Ballesteros 2012, EPL 97, 34008\n");
  assert_contains (help.out, "\n  Prior length scale L, default 1350 pc: Astraatmadja & Bailer-Jones 2016, ApJ 833, 119\n");
  assert_contains (help.out, "\n  Monte Carlo draws, default 1000: JCGM 101:2008 (GUM Supplement 1)\n");
}

/* --monte-carlo-below-snr moves the S/N below which a first-order run
 * draws: 0 only for negative parallaxes, a high one draws for more stars; the run records it. */
static void
test_derive_monte_carlo_below (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, FALSE);
  g_auto (CliResult) edsd = { 0 };
  g_auto (CliResult) never = { 0 };
  g_auto (CliResult) more = { 0 };
  gint64 by_default, at_50;

  /* The prior gives low-S/N stars a distance, so they are drawn. */
  run_cli (&edsd, "derive", project, "--distance", "edsd", NULL);
  g_assert_cmpint (edsd.status, ==, 0);
  by_default = sql_int (project, "SELECT count(*) FROM derived WHERE monte_carlo = 1");
  g_assert_cmpint (by_default, >, 0);
  run_cli (&never, "derive", project, "--distance", "edsd", "--monte-carlo-below-snr", "0", NULL);
  g_assert_cmpint (never.status, ==, 0);
  assert_contains (never.out, "below parallax S/N 0)");
  /* Only negative parallaxes are below 0. */
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived WHERE monte_carlo = 1"), ==,
                   sql_int (project, "SELECT count(*) FROM derived WHERE plx_snr < 0 AND dist IS NOT NULL"));
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived WHERE monte_carlo = 1"), <, by_default);
  run_cli (&more, "derive", project, "--distance", "edsd", "--monte-carlo-below-snr", "50", NULL);
  g_assert_cmpint (more.status, ==, 0);
  at_50 = sql_int (project, "SELECT count(*) FROM derived WHERE monte_carlo = 1");
  g_assert_cmpint (at_50, >, by_default);
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derivation_runs WHERE parameters LIKE '%mc_below_snr=50%'"),
                   ==, 1);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* Stale stars                                                        */

/* A file with a better V magnitude for one star makes that star, and
 * only it, stale until the next derive. */
static void
test_reimport_marks_stale (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  g_autofree char *extra = sl_test_write_file (dir, "extra.csv", "id,vmag,vmag_err\nLHO 0001,8.85,0.005\n", -1);
  g_autofree char *flags = NULL;
  g_autofree char *flags_after = NULL;
  g_autofree char *vmag = NULL;
  g_auto (CliResult) original = { 0 };
  g_auto (CliResult) import = { 0 };
  g_auto (CliResult) verify = { 0 };
  g_auto (CliResult) export = { 0 };
  g_auto (CliResult) derive = { 0 };
  g_auto (CliResult) verify_after = { 0 };
  g_auto (CliResult) export_after = { 0 };

  run_cli (&original, "export", project, "--columns", "vmag,lum,flags", NULL);
  run_cli (&import, "import", project, extra, NULL);
  g_assert_cmpint (import.status, ==, 0);
  assert_prefix (import.out, "imported 1 rows, rejected 0\n");
  assert_contains (import.out, "0 new stars");

  run_cli (&verify, "verify", project, NULL);
  g_assert_cmpint (verify.status, ==, 0);
  assert_prefix (verify.out, "checked 336 stars: 0 differences; 1 stale");

  run_cli (&export, "export", project, "--columns", "vmag,lum,flags", NULL);
  g_assert_cmpint (export.status, ==, 0);
  flags = csv_cell (export.out, "LHO 0001", "flags");
  g_assert_cmpstr (flags, ==, "stale");
  g_assert_cmpuint (count_lines_containing (export.out, "stale"), ==, 1);
  vmag = csv_cell (export.out, "LHO 0001", "vmag");
  g_assert_cmpstr (vmag, ==, "8.85");   /* the new, more precise measurement is the input now */

  run_cli (&derive, "derive", project, NULL);
  g_assert_cmpint (derive.status, ==, 0);
  assert_prefix (derive.out, "derived 1 stars, 336 already up to date");

  run_cli (&verify_after, "verify", project, NULL);
  g_assert_cmpint (verify_after.status, ==, 0);
  assert_prefix (verify_after.out, "checked 337 stars: 0 differences; 0 stale");
  run_cli (&export_after, "export", project, "--columns", "vmag,lum,flags", NULL);
  flags_after = csv_cell (export_after.out, "LHO 0001", "flags");
  g_assert_cmpstr (flags_after, ==, "");
  /* Only V changed, so L scales as 10^(-0.4 delta V) (Pogson's ratio). */
  g_assert_cmpfloat (csv_number (original.out, "LHO 0001", "vmag"), >, 8.85);
  g_assert_cmpstr (original.out, !=, export.out);
  sl_assert_close (csv_number (export_after.out, "LHO 0001", "lum") / csv_number (export.out, "LHO 0001", "lum"),
                   pow (10.0, 0.4 * (csv_number (original.out, "LHO 0001", "vmag") - 8.85)), 1e-9,
                   "luminosity ratio after the new V magnitude");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* Hand-set values                                                    */

static void
test_override_set_and_clear (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  const char *columns = "teff,lum,radius,flags";
  g_auto (CliResult) before = { 0 };
  g_auto (CliResult) set = { 0 };
  g_auto (CliResult) verify_stale = { 0 };
  g_auto (CliResult) stale = { 0 };
  g_auto (CliResult) derive = { 0 };
  g_auto (CliResult) after = { 0 };
  g_auto (CliResult) verify = { 0 };
  g_auto (CliResult) explain = { 0 };
  g_auto (CliResult) explain_radius = { 0 };
  g_auto (CliResult) ledger = { 0 };
  g_auto (CliResult) clear = { 0 };
  g_auto (CliResult) derive_cleared = { 0 };
  g_auto (CliResult) cleared = { 0 };
  g_auto (CliResult) explain_cleared = { 0 };
  g_auto (CliResult) ledger_cleared = { 0 };
  g_autofree char *stale_flags = NULL;
  g_autofree char *teff = NULL, *teff_lo = NULL, *teff_hi = NULL, *flags = NULL;
  double lum, radius;

  run_cli (&before, "export", project, "--columns", columns, NULL);
  g_assert_cmpint (before.status, ==, 0);

  run_cli (&set, "override", project, "LHO 0001", "teff", "6530", "--lo", "6480", "--hi", "6580",
           "--reason", "spectroscopic Teff from the literature", NULL);
  g_assert_cmpint (set.status, ==, 0);
  assert_contains (set.out, "set teff of LHO 0001 by hand");
  g_assert_cmpstr (set.err, ==, "");

  /* Stale until derived again; the stored values are still the old ones. */
  run_cli (&verify_stale, "verify", project, NULL);
  g_assert_cmpint (verify_stale.status, ==, 0);
  assert_prefix (verify_stale.out, "checked 336 stars: 0 differences; 1 stale");
  run_cli (&stale, "export", project, "--columns", columns, NULL);
  stale_flags = csv_cell (stale.out, "LHO 0001", "flags");
  g_assert_cmpstr (stale_flags, ==, "stale");

  run_cli (&derive, "derive", project, NULL);
  g_assert_cmpint (derive.status, ==, 0);
  assert_prefix (derive.out, "derived 1 stars, 336 already up to date");

  run_cli (&after, "export", project, "--columns", columns, NULL);
  teff = csv_cell (after.out, "LHO 0001", "teff");
  teff_lo = csv_cell (after.out, "LHO 0001", "teff_lo");
  teff_hi = csv_cell (after.out, "LHO 0001", "teff_hi");
  flags = csv_cell (after.out, "LHO 0001", "flags");
  g_assert_cmpstr (teff, ==, "6530");
  g_assert_cmpstr (teff_lo, ==, "6480");
  g_assert_cmpstr (teff_hi, ==, "6580");
  assert_contains (flags, "overridden");
  assert_lacks (flags, "stale");
  lum = csv_number (after.out, "LHO 0001", "lum");
  radius = csv_number (after.out, "LHO 0001", "radius");
  g_assert_cmpfloat (lum, !=, csv_number (before.out, "LHO 0001", "lum"));
  g_assert_cmpfloat (radius, !=, csv_number (before.out, "LHO 0001", "radius"));
  /* The radius follows the hand-set Teff: R = sqrt(L) (5772 K / Teff)^2
   * (IAU 2015 Resolution B3 nominal T_eff,sun), to the CSV's 15 digits. */
  sl_assert_close (radius, sqrt (lum) * pow (5772.0 / 6530.0, 2), 1e-12 * radius,
                   "radius from the hand-set teff and the new luminosity");
  /* Other stars are untouched. */
  g_assert_cmpuint (count_lines_containing (after.out, "overridden"), ==, 1);

  run_cli (&verify, "verify", project, NULL);
  g_assert_cmpint (verify.status, ==, 0);
  assert_prefix (verify.out, "checked 337 stars: 0 differences; 0 stale");

  run_cli (&explain, "explain", project, "LHO 0001", "teff", NULL);
  g_assert_cmpint (explain.status, ==, 0);
  assert_contains (explain.out, "teff = 6530 K  [68%: 6480 .. 6580]");
  assert_contains (explain.out, "SET BY HAND by test-user at ");
  assert_contains (explain.out, ": spectroscopic Teff from the literature\n");
  assert_contains (explain.out, "overridden: ");
  run_cli (&explain_radius, "explain", project, "LHO 0001", "radius", NULL);
  assert_contains (explain_radius.out, "SET BY HAND by test-user");

  run_cli (&ledger, "ledger", project, NULL);
  g_assert_cmpint (ledger.status, ==, 0);
  assert_contains (ledger.out, "override");
  assert_contains (ledger.out, "set teff of LHO 0001 to 6530 by hand: spectroscopic Teff from the literature");

  /* Cleared: the derived value comes back, bit for bit. */
  run_cli (&clear, "override", project, "LHO 0001", "teff", "--clear", NULL);
  g_assert_cmpint (clear.status, ==, 0);
  assert_contains (clear.out, "cleared the hand-set teff of LHO 0001");
  run_cli (&derive_cleared, "derive", project, NULL);
  assert_prefix (derive_cleared.out, "derived 1 stars, 336 already up to date");
  run_cli (&cleared, "export", project, "--columns", columns, NULL);
  g_assert_cmpstr (cleared.out, ==, before.out);

  run_cli (&explain_cleared, "explain", project, "LHO 0001", "teff", NULL);
  assert_lacks (explain_cleared.out, "SET BY HAND");
  run_cli (&ledger_cleared, "ledger", project, NULL);
  assert_contains (ledger_cleared.out, "cleared the hand-set teff of LHO 0001");
  /* History is kept: the cleared override stays in the table. */
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM overrides WHERE cleared_at IS NOT NULL"), ==, 1);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

static void
test_override_refusals (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  g_auto (CliResult) no_reason = { 0 };
  g_auto (CliResult) empty_reason = { 0 };
  g_auto (CliResult) text = { 0 };
  g_auto (CliResult) unknown_quantity = { 0 };
  g_auto (CliResult) not_a_number = { 0 };
  g_auto (CliResult) comma = { 0 };
  g_auto (CliResult) unknown_star = { 0 };
  g_auto (CliResult) outside = { 0 };
  g_auto (CliResult) one_bound = { 0 };
  g_auto (CliResult) nothing_to_clear = { 0 };
  g_auto (CliResult) clear_extra = { 0 };

  run_cli (&no_reason, "override", project, "LHO 0001", "teff", "6530", NULL);
  g_assert_cmpint (no_reason.status, ==, 2);
  assert_contains (no_reason.err, "--reason");
  run_cli (&empty_reason, "override", project, "LHO 0001", "teff", "6530", "--reason", "", NULL);
  g_assert_cmpint (empty_reason.status, ==, 2);
  run_cli (&text, "override", project, "LHO 0001", "spclass", "5", "--reason", "x", NULL);
  g_assert_cmpint (text.status, ==, 2);
  assert_contains (text.err, "spclass");
  run_cli (&unknown_quantity, "override", project, "LHO 0001", "colour", "5", "--reason", "x", NULL);
  g_assert_cmpint (unknown_quantity.status, ==, 2);
  run_cli (&not_a_number, "override", project, "LHO 0001", "teff", "hot", "--reason", "x", NULL);
  g_assert_cmpint (not_a_number.status, ==, 2);
  run_cli (&comma, "override", project, "LHO 0001", "lum", "1,5", "--reason", "x", NULL);
  g_assert_cmpint (comma.status, ==, 2);

  run_cli (&unknown_star, "override", project, "LHO 9999", "teff", "6530", "--reason", "x", NULL);
  assert_user_error (&unknown_star, "LHO 9999");

  /* The interval must hold the value and come whole. */
  run_cli (&outside, "override", project, "LHO 0001", "teff", "6530", "--lo", "6600", "--hi", "6700",
           "--reason", "x", NULL);
  assert_user_error (&outside, NULL);
  run_cli (&one_bound, "override", project, "LHO 0001", "teff", "6530", "--lo", "6480", "--reason", "x", NULL);
  assert_user_error (&one_bound, NULL);

  run_cli (&nothing_to_clear, "override", project, "LHO 0001", "teff", "--clear", NULL);
  assert_user_error (&nothing_to_clear, "not set by hand");
  run_cli (&clear_extra, "override", project, "LHO 0001", "teff", "6530", "--clear", NULL);
  g_assert_cmpint (clear_extra.status, ==, 2);

  /* Nothing was written, nothing is stale. */
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM overrides"), ==, 0);
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM derived WHERE stale"), ==, 0);
  g_assert_cmpint (sql_int (project, "SELECT count(*) FROM ledger WHERE action = 'override'"), ==, 0);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* Explain                                                            */

/* The file name and line of each "from FILE, line N" in TEXT must be a
 * line of that demo file holding the star's row. */
static guint
check_cited_lines (const char *text, const char *file, const char *star)
{
  g_autofree char *path = demo_file (file);
  g_autofree char *needle = g_strdup_printf ("from %s, line ", file);
  guint n = 0;

  for (const char *p = strstr (text, needle); p; p = strstr (p + 1, needle))
    {
      gint64 number = g_ascii_strtoll (p + strlen (needle), NULL, 10);
      g_autofree char *line = file_line (path, number);

      if (strstr (line, star) == NULL)
        g_error ("%s line %" G_GINT64_FORMAT " is \"%s\", not a row of %s", file, number, line, star);
      n++;
    }
  return n;
}

static void
test_explain_text (void)
{
  const char *steps[] = { "parallax", "distance", "extinction", "absolute-magnitude", "temperature",
                          "bolometric", "luminosity", "radius" };
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  g_autofree char *astrometry = demo_file ("astrometry.csv");
  g_autofree char *photometry = demo_file ("photometry.csv");
  g_autofree char *sha_a = file_sha256 (astrometry);
  g_autofree char *sha_p = file_sha256 (photometry);
  g_auto (CliResult) explain = { 0 };
  const char *at;

  run_cli (&explain, "explain", project, "LHO 0001", "radius", NULL);
  g_assert_cmpint (explain.status, ==, 0);
  g_assert_cmpstr (explain.err, ==, "");
  assert_prefix (explain.out, "LHO 0001: radius\n");
  assert_contains (explain.out, "Derived in run 1 at ");
  assert_contains (explain.out, " by test-user (Starledger ");

  /* Every step, numbered, in evaluation order. */
  at = explain.out;
  for (gsize i = 0; i < G_N_ELEMENTS (steps); i++)
    {
      g_autofree char *step = g_strdup_printf ("  %" G_GSIZE_FORMAT ". %s (version ", i + 1, steps[i]);
      const char *found = strstr (at, step);

      if (found == NULL)
        g_error ("want step \"%s\" after the previous one in:\n%s", step, explain.out);
      at = found + strlen (step);
    }
  g_assert_null (strstr (explain.out, "  9. "));

  assert_contains (explain.out, "Torres 2010");
  assert_contains (explain.out, "Bailer-Jones 2015");
  assert_contains (explain.out, "Flower 1996");
  assert_contains (explain.out, "IAU 2015 Resolution B3");
  assert_contains (explain.out, "parameter distance = inverse\n");
  assert_contains (explain.out, "parameter parallax_zero_point = 0 mas\n");
  assert_contains (explain.out, "parameter rv = 3.1\n");
  assert_contains (explain.out, "parameter teff = flower\n");
  assert_contains (explain.out, "formula: radius = sqrt(lum) x (5772 K / teff)^2");

  /* The raw inputs, down to the file, its SHA-256 and the line. */
  assert_contains (explain.out, "SHA-256");
  g_assert_cmpuint (check_cited_lines (explain.out, "astrometry.csv", "LHO 0001"), >=, 2);
  g_assert_cmpuint (check_cited_lines (explain.out, "photometry.csv", "LHO 0001"), >=, 3);
  {
    g_autofree char *short_a = g_strndup (sha_a, 16);
    g_autofree char *short_p = g_strndup (sha_p, 16);

    assert_contains (explain.out, short_a);
    assert_contains (explain.out, short_p);
  }
  assert_contains (explain.out, "parallax = ");
  assert_contains (explain.out, "column 'reddening' (mag)");
  assert_contains (explain.out, "imported by test-user at ");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* Feeds TEXT to Python's json module; returns what the script prints. */
static char *
python_json (const char *text, const char *script)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (GSubprocess) python = NULL;
  g_autofree char *out = NULL;
  g_autofree char *err = NULL;

  python = g_subprocess_new (G_SUBPROCESS_FLAGS_STDIN_PIPE | G_SUBPROCESS_FLAGS_STDOUT_PIPE
                             | G_SUBPROCESS_FLAGS_STDERR_PIPE, &error,
                             "/usr/bin/python3", "-c", script, NULL);
  g_assert_no_error (error);
  g_subprocess_communicate_utf8 (python, text, NULL, &out, &err, &error);
  g_assert_no_error (error);
  if (!g_subprocess_get_successful (python))
    g_error ("not valid JSON (%s):\n%s", err, text);
  return g_steal_pointer (&out);
}

static void
test_explain_json (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = NULL;
  g_autofree char *astrometry = demo_file ("astrometry.csv");
  g_autofree char *photometry = demo_file ("photometry.csv");
  g_autofree char *sha_a = file_sha256 (astrometry);
  g_autofree char *sha_p = file_sha256 (photometry);
  g_autofree char *modules = NULL;
  g_autofree char *input = NULL;
  g_auto (CliResult) json = { 0 };
  g_auto (CliResult) input_json = { 0 };

  if (!g_file_test ("/usr/bin/python3", G_FILE_TEST_IS_EXECUTABLE))
    {
      g_test_skip ("no /usr/bin/python3 to read the JSON");
      sl_test_scratch_free (g_steal_pointer (&dir));
      return;
    }
  project = demo_project (dir, NULL, TRUE);
  run_cli (&json, "explain", project, "LHO 0001", "radius", "--json", NULL);
  g_assert_cmpint (json.status, ==, 0);
  modules = python_json (json.out, "import json, sys; d = json.load(sys.stdin); "
                                   "print(d['star'], d['quantity'], "
                                   "','.join(s['module'] for s in d['steps']))");
  g_assert_cmpstr (modules, ==, "LHO 0001 radius parallax,distance,extinction,absolute-magnitude,"
                                "temperature,bolometric,luminosity,radius\n");
  assert_contains (json.out, "\"steps\"");
  assert_contains (json.out, "\"raw_inputs\"");
  assert_contains (json.out, "\"sha256\"");
  assert_contains (json.out, "\"line\"");
  assert_contains (json.out, "\"citation\"");
  assert_contains (json.out, sha_a);
  assert_contains (json.out, sha_p);

  /* An input field in JSON too. */
  run_cli (&input_json, "explain", project, "LHO 0001", "parallax", "--json", NULL);
  g_assert_cmpint (input_json.status, ==, 0);
  input = python_json (input_json.out, "import json, sys; d = json.load(sys.stdin); "
                                       "r = d['raw_inputs'][0]; print(r['file'], r['line'], r['unit'])");
  assert_prefix (input, "astrometry.csv ");
  assert_contains (input, " mas\n");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

static void
test_explain_inputs_and_errors (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  g_autofree char *fresh_dir = g_build_filename (dir, "fresh", NULL);
  g_autofree char *fresh = NULL;
  g_auto (CliResult) parallax = { 0 };
  g_auto (CliResult) dec = { 0 };
  g_auto (CliResult) unknown = { 0 };
  g_auto (CliResult) unknown_star = { 0 };
  g_auto (CliResult) not_derived = { 0 };
  g_auto (CliResult) fresh_input = { 0 };

  run_cli (&parallax, "explain", project, "LHO 0001", "parallax", NULL);
  g_assert_cmpint (parallax.status, ==, 0);
  assert_prefix (parallax.out, "LHO 0001: parallax, a measured input");
  assert_contains (parallax.out, " mas\n");
  assert_contains (parallax.out, "SHA-256");
  g_assert_cmpuint (check_cited_lines (parallax.out, "astrometry.csv", "LHO 0001"), ==, 1);

  /* Declination in degrees, its error in mas (the canonical units). */
  run_cli (&dec, "explain", project, "LHO 0001", "dec", NULL);
  g_assert_cmpint (dec.status, ==, 0);
  assert_contains (dec.out, " deg +/- ");
  assert_contains (dec.out, " mas\n");

  run_cli (&unknown, "explain", project, "LHO 0001", "colour", NULL);
  assert_user_error (&unknown, "colour");

  run_cli (&unknown_star, "explain", project, "LHO 9999", "radius", NULL);
  assert_user_error (&unknown_star, "LHO 9999");

  /* A project imported but never derived. */
  g_assert_cmpint (g_mkdir (fresh_dir, 0700), ==, 0);
  fresh = demo_project (fresh_dir, NULL, FALSE);
  run_cli (&not_derived, "explain", fresh, "LHO 0001", "radius", NULL);
  assert_user_error (&not_derived, "run 'starledger-cli derive'");
  /* Its inputs can be explained all the same. */
  run_cli (&fresh_input, "explain", fresh, "LHO 0001", "vmag", NULL);
  g_assert_cmpint (fresh_input.status, ==, 0);
  g_assert_cmpuint (check_cited_lines (fresh_input.out, "photometry.csv", "LHO 0001"), ==, 1);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* The LaTeX table                                                    */

enum { PDG_TWO_DIGITS, PDG_ONE_DIGIT, PDG_UP_TO_1000, PDG_NO_INTERVAL, N_PDG_CASES };

static char *
format_at_place (double x, int place)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  if (place <= 0)
    {
      g_autofree char *format = g_strdup_printf ("%%.%df", -place);

      return g_strdup (g_ascii_formatd (buf, sizeof buf, format, x));
    }
  return g_strdup (g_ascii_formatd (buf, sizeof buf, "%.0f", round (x / pow (10.0, place)) * pow (10.0, place)));
}

/* The LaTeX cell for a value with its 68% interval, by the Particle Data
 * Group's rule (Review of Particle Physics, Introduction, "Rounding"):
 * the three leading digits of the uncertainty (the smaller side of the
 * interval) decide: 100-354 two significant digits, 355-949 one, 950-999
 * rounded up to 1000 and two; the value is rounded to the same decimal
 * place.  Leading digits are read from the decimal string here, not from
 * a logarithm as rounding.c does. */
static char *
pdg_cell (const char *value_text, const char *lo_text, const char *hi_text, int *pdg_case)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE], digits[32];
  double value, lo, hi, u;
  int three, exponent, place;
  g_autofree char *v = NULL;
  g_autofree char *plus = NULL;
  g_autofree char *minus = NULL;

  if (*value_text == '\0')
    return g_strdup ("");
  value = g_ascii_strtod (value_text, NULL);
  lo = *lo_text ? g_ascii_strtod (lo_text, NULL) : NAN;
  hi = *hi_text ? g_ascii_strtod (hi_text, NULL) : NAN;
  if (!(hi - value > 0 && value - lo > 0))
    {
      *pdg_case = PDG_NO_INTERVAL;
      return g_strdup_printf ("$%s$", g_ascii_formatd (buf, sizeof buf, "%.4g", value));
    }
  u = MIN (hi - value, value - lo);
  g_ascii_formatd (digits, sizeof digits, "%.12e", u);   /* d.dddddddddddde±XX */
  three = (digits[0] - '0') * 100 + (digits[2] - '0') * 10 + (digits[3] - '0');
  exponent = atoi (strchr (digits, 'e') + 1);
  if (three <= 354)
    *pdg_case = PDG_TWO_DIGITS, place = exponent - 1;
  else if (three <= 949)
    *pdg_case = PDG_ONE_DIGIT, place = exponent;
  else
    *pdg_case = PDG_UP_TO_1000, place = exponent;   /* 10^(exponent+1) to two digits */
  v = format_at_place (value, place);
  plus = format_at_place (hi - value, place);
  minus = format_at_place (value - lo, place);
  if (strcmp (plus, minus) == 0)
    return g_strdup_printf ("$%s \\pm %s$", v, plus);
  return g_strdup_printf ("$%s^{+%s}_{-%s}$", v, plus, minus);
}

/* The line of TEX for star ID. */
static char *
tex_row (const char *tex, const char *id)
{
  g_autofree char *start = g_strconcat ("\n", id, " & ", NULL);
  const char *row = strstr (tex, start);

  if (row == NULL)
    g_error ("no row for %s in:\n%s", id, tex);
  row++;
  return g_strndup (row, strchr (row, '\n') - row);
}

/* Checks every row of TEX against the values of CSV (both exported with
 * dist,teff,spclass,lum) and counts the PDG cases met. */
static void
check_tex_against_csv (const char *tex, const char *csv, guint counts[N_PDG_CASES])
{
  const char *numbers[] = { "dist", "teff", NULL, "lum" };   /* NULL: spclass, text */
  g_auto (GStrv) tex_lines = g_strsplit (tex, "\n", -1);
  g_auto (GStrv) csv_lines = g_strsplit (csv, "\n", -1);
  guint t = 0;

  while (tex_lines[t] && strcmp (tex_lines[t], "\\hline") != 0)
    t++;
  g_assert_cmpstr (tex_lines[t + 1], ==, "id & dist (pc) & teff (K) & spclass & lum (L\\_sun) \\\\");
  g_assert_cmpstr (tex_lines[t + 2], ==, "\\hline");
  t += 3;

  for (guint c = 1; csv_lines[c] && *csv_lines[c]; c++, t++)
    {
      g_auto (GStrv) cells = g_strsplit (csv_lines[c], ",", -1);
      g_autoptr (GString) want = g_string_new (cells[0]);

      g_assert_null (strpbrk (cells[0], "&%$#_{}~^\\"));   /* printed as is */
      for (guint k = 0, i = 1; k < G_N_ELEMENTS (numbers); k++)
        {
          g_string_append (want, " & ");
          if (numbers[k] == NULL)
            {
              g_assert_null (strpbrk (cells[i], "&%$#_{}~^\\"));
              g_string_append (want, cells[i++]);
            }
          else
            {
              int pdg_case = -1;
              g_autofree char *cell = pdg_cell (cells[i], cells[i + 1], cells[i + 2], &pdg_case);

              if (pdg_case >= 0)
                counts[pdg_case]++;
              g_string_append (want, cell);
              i += 3;
            }
        }
      g_string_append (want, " \\\\");
      g_assert_nonnull (tex_lines[t]);
      g_assert_cmpstr (tex_lines[t], ==, want->str);
    }
  g_assert_cmpstr (tex_lines[t], ==, "\\hline");
  g_assert_cmpstr (tex_lines[t + 1], ==, "\\end{tabular}");
  g_assert_cmpstr (tex_lines[t + 2], ==, "");
  g_assert_null (tex_lines[t + 3]);
}

static void
test_export_tex (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = demo_project (dir, NULL, TRUE);
  const char *columns = "dist,teff,spclass,lum";
  guint counts[N_PDG_CASES] = { 0 };
  g_auto (CliResult) tex = { 0 };
  g_auto (CliResult) csv = { 0 };
  g_auto (CliResult) edsd = { 0 };
  g_auto (CliResult) tex_edsd = { 0 };
  g_auto (CliResult) csv_edsd = { 0 };
  g_auto (CliResult) bad_format = { 0 };
  g_autofree char *teff = NULL, *teff_lo = NULL, *teff_hi = NULL;
  g_autofree char *teff_cell = NULL;
  g_autofree char *row_1 = NULL;
  g_autofree char *cell_1 = NULL;
  g_autofree char *row_2 = NULL;
  g_auto (CliResult) override = { 0 };
  g_auto (CliResult) derive = { 0 };
  g_auto (CliResult) tex_override = { 0 };
  g_auto (CliResult) csv_override = { 0 };
  int pdg_case;

  run_cli (&tex, "export", project, "--format", "tex", "--columns", columns, NULL);
  g_assert_cmpint (tex.status, ==, 0);
  g_assert_cmpstr (tex.err, ==, "");
  assert_contains (tex.out, "\\begin{tabular}{lrrlr}\n");
  assert_contains (tex.out, "\\pm");
  assert_contains (tex.out, "(L\\_sun)");
  assert_lacks (tex.out, "L_sun");
  g_assert_true (g_str_has_suffix (tex.out, "\\end{tabular}\n"));

  /* One number: LHO 0001's Teff, from the CSV export's value and bounds. */
  run_cli (&csv, "export", project, "--columns", columns, NULL);
  teff = csv_cell (csv.out, "LHO 0001", "teff");
  teff_lo = csv_cell (csv.out, "LHO 0001", "teff_lo");
  teff_hi = csv_cell (csv.out, "LHO 0001", "teff_hi");
  teff_cell = pdg_cell (teff, teff_lo, teff_hi, &pdg_case);
  g_test_message ("LHO 0001 teff %s [%s, %s] -> %s", teff, teff_lo, teff_hi, teff_cell);
  row_1 = tex_row (tex.out, "LHO 0001");
  cell_1 = g_strdup_printf (" & %s & ", teff_cell);
  assert_contains (row_1, cell_1);

  /* And every cell of every row. */
  check_tex_against_csv (tex.out, csv.out, counts);

  /* The EDSD prior gives asymmetric intervals: value^{+plus}_{-minus}. */
  run_cli (&edsd, "derive", project, "--distance", "edsd", NULL);
  g_assert_cmpint (edsd.status, ==, 0);
  run_cli (&tex_edsd, "export", project, "--format", "tex", "--columns", columns, NULL);
  run_cli (&csv_edsd, "export", project, "--columns", columns, NULL);
  assert_contains (tex_edsd.out, "^{+");
  assert_contains (tex_edsd.out, "}_{-");
  check_tex_against_csv (tex_edsd.out, csv_edsd.out, counts);

  /* A hand-set Teff of 4100 K with a 68% interval of +/- 97.3 K: the
   * leading digits 973 round up to 100 K, kept to two significant
   * digits (1.0 x 10^2), and the value to the tens: $4100 \pm 100$. */
  run_cli (&override, "override", project, "LHO 0002", "teff", "4100", "--lo", "4002.7", "--hi", "4197.3",
           "--reason", "rounding example", NULL);
  g_assert_cmpint (override.status, ==, 0);
  run_cli (&derive, "derive", project, "--distance", "edsd", NULL);
  assert_prefix (derive.out, "derived 1 stars");
  run_cli (&tex_override, "export", project, "--format", "tex", "--columns", columns, NULL);
  run_cli (&csv_override, "export", project, "--columns", columns, NULL);
  row_2 = tex_row (tex_override.out, "LHO 0002");
  assert_contains (row_2, " & $4100 \\pm 100$ & ");
  check_tex_against_csv (tex_override.out, csv_override.out, counts);

  g_test_message ("PDG cases: %u two digits, %u one digit, %u up to 1000, %u without interval",
                  counts[PDG_TWO_DIGITS], counts[PDG_ONE_DIGIT], counts[PDG_UP_TO_1000], counts[PDG_NO_INTERVAL]);
  g_assert_cmpuint (counts[PDG_TWO_DIGITS], >, 0);
  g_assert_cmpuint (counts[PDG_ONE_DIGIT], >, 0);
  g_assert_cmpuint (counts[PDG_UP_TO_1000], >, 0);

  run_cli (&bad_format, "export", project, "--format", "latex", NULL);
  g_assert_cmpint (bad_format.status, ==, 2);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* Locale                                                             */

/* Derived under a comma-decimal locale, with parameters typed with a
 * decimal point, the tables are the same bytes. */
static void
test_locale_independent (void)
{
  const char *locales[] = { "C.UTF-8", "de_DE.UTF-8" };
  char *csv[2] = { NULL, NULL }, *tex[2] = { NULL, NULL }, *parameters[2] = { NULL, NULL };
  g_autofree char *dir = sl_test_scratch_new ();

  if (!g_file_test ("/usr/lib/locale/locale-archive", G_FILE_TEST_EXISTS))
    {
      g_test_skip ("no compiled locales (build-aux/dev generates de_DE.UTF-8)");
      sl_test_scratch_free (g_steal_pointer (&dir));
      return;
    }
  for (int i = 0; i < 2; i++)
    {
      g_autofree char *sub = g_build_filename (dir, locales[i], NULL);
      g_autofree char *project = NULL;
      g_auto (CliResult) derive = { 0 };
      g_auto (CliResult) e_csv = { 0 };
      g_auto (CliResult) e_tex = { 0 };
      g_autoptr (GRegex) timing = g_regex_new ("^derived 337 stars, 0 already up to date \\(run 1, [0-9]+\\.[0-9]{2} s\\)\n",
                                               0, 0, NULL);

      g_assert_cmpint (g_mkdir (sub, 0700), ==, 0);
      project = demo_project (sub, locales[i], FALSE);
      run_cli_in_locale (&derive, locales[i], "derive", project, "--distance", "edsd:L=1500.5",
                         "--extinction-ratio", "3.05", "--extinction-ratio-error", "0.15", NULL);
      g_assert_cmpint (derive.status, ==, 0);
      if (!g_regex_match (timing, derive.out, 0, NULL))
        g_error ("under %s: want \"derived ... (run 1, S.SS s)\", got:\n%s", locales[i], derive.out);
      parameters[i] = g_strdup (strstr (derive.out, "parameters: "));
      run_cli_in_locale (&e_csv, locales[i], "export", project, NULL);
      run_cli_in_locale (&e_tex, locales[i], "export", project, "--format", "tex", NULL);
      g_assert_cmpint (e_csv.status, ==, 0);
      g_assert_cmpint (e_tex.status, ==, 0);
      csv[i] = g_steal_pointer (&e_csv.out);
      tex[i] = g_steal_pointer (&e_tex.out);
    }
  assert_contains (parameters[0], "L = 1500.5 pc");
  g_assert_cmpstr (parameters[1], ==, parameters[0]);
  /* The second-epoch survey's new and ambiguous rows are stars named by
   * its own ids (data/demo/README.md). */
  g_assert_cmpuint (count_lines_containing (csv[0], "LHO ") + count_lines_containing (csv[0], "TRS J"), ==,
                    N_DEMO_STARS);
  g_assert_cmpstr (csv[1], ==, csv[0]);
  g_assert_cmpstr (tex[1], ==, tex[0]);
  for (int i = 0; i < 2; i++)
    {
      g_free (csv[i]);
      g_free (tex[i]);
      g_free (parameters[i]);
    }
  sl_test_scratch_free (g_steal_pointer (&dir));
}

int
main (int argc, char **argv)
{
  cli_test_init (&argc, &argv);

  g_test_add_func ("/cli-derive/usage", test_usage);
  g_test_add_func ("/cli-derive/derive/what-is-derived", test_derive_counts);
  g_test_add_func ("/cli-derive/derive/bad-options", test_derive_bad_options);
  g_test_add_func ("/cli-derive/derive/rows-inserted-and-updated", test_derive_rows_inserted_and_updated);
  g_test_add_func ("/cli-derive/verify/clean", test_verify_clean);
  g_test_add_func ("/cli-derive/verify/tampered-measurement", test_verify_tampered_measurement);
  g_test_add_func ("/cli-derive/verify/tampered-derived-value", test_verify_tampered_derived);
  g_test_add_func ("/cli-derive/verify/monte-carlo-seed", test_verify_monte_carlo);
  g_test_add_func ("/cli-derive/derive/monte-carlo-below-snr", test_derive_monte_carlo_below);
  g_test_add_func ("/cli-derive/derive/help-cites-methods", test_derive_help_cites_methods);
  g_test_add_func ("/cli-derive/reimport/marks-stale", test_reimport_marks_stale);
  g_test_add_func ("/cli-derive/override/set-derive-clear", test_override_set_and_clear);
  g_test_add_func ("/cli-derive/override/refusals", test_override_refusals);
  g_test_add_func ("/cli-derive/explain/text", test_explain_text);
  g_test_add_func ("/cli-derive/explain/json", test_explain_json);
  g_test_add_func ("/cli-derive/explain/inputs-and-errors", test_explain_inputs_and_errors);
  g_test_add_func ("/cli-derive/export/tex-pdg-rounding", test_export_tex);
  g_test_add_func ("/cli-derive/locale/comma-decimal-locale", test_locale_independent);

  return g_test_run ();
}
