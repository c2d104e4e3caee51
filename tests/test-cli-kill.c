/* test-cli-kill.c: crash safety.  starledger-cli is killed with SIGKILL at
 * a random moment of an import, a derive or an override, again and again,
 * each time on a fresh copy of one project; afterwards the project must
 * open, SQLite's integrity check and `verify` must pass, and the project
 * must hold all or none of the interrupted operation: the source with all
 * its rows and its ledger entry, or nothing of it; a derivation run with
 * every star's row, or the previous run's rows untouched; the hand-set
 * value with its ledger entry, or neither.
 *
 * STARLEDGER_KILL_ITERATIONS sets the number of kills per operation
 * (default 25; the README's figure comes from a run of 300). */
#include <gio/gio.h>
#include <glib/gstdio.h>
#include <signal.h>

#include "cli-util.h"
#include "derivation.h"
#include "project.h"
#include "test-util.h"

#define N_IMPORT_ROWS 4000

typedef struct {
  char  *dir;
  char  *base;          /* the project every iteration starts from */
  char  *work;          /* the copy the CLI is killed on */
  char  *csv;           /* a file of N_IMPORT_ROWS new stars */
  gint64 base_measurements;
  gint64 base_stars;
} Fixture;

static Fixture fixture;

static gint64
count (SlProject *project, const char *sql)
{
  g_autoptr (GError) error = NULL;
  sqlite3_stmt *stmt = sl_project_prepare (project, sql, &error);
  gint64 n;

  g_assert_no_error (error);
  g_assert_cmpint (sqlite3_step (stmt), ==, SQLITE_ROW);
  n = sqlite3_column_int64 (stmt, 0);
  sqlite3_finalize (stmt);
  return n;
}

static void
write_catalogue (const char *path, const char *prefix, guint n, guint32 seed)
{
  g_autoptr (GString) csv = g_string_new ("id,ra,dec,parallax,parallax_err,vmag,vmag_err,bv,bv_err\n");
  g_autoptr (GRand) rand = g_rand_new_with_seed (seed);

  for (guint i = 0; i < n; i++)
    g_string_append_printf (csv, "%s %05u,%.6f,%.6f,%.3f,%.3f,%.3f,0.01,%.3f,0.01\n", prefix, i,
                            g_rand_double_range (rand, 0, 360), g_rand_double_range (rand, -89, 89),
                            g_rand_double_range (rand, 1, 100), g_rand_double_range (rand, 0.05, 0.5),
                            g_rand_double_range (rand, 4, 14), g_rand_double_range (rand, -0.2, 1.8));
  g_assert_true (g_file_set_contents (path, csv->str, (gssize) csv->len, NULL));
}

static void
remove_project (const char *path)
{
  g_autofree char *wal = g_strconcat (path, "-wal", NULL);
  g_autofree char *shm = g_strconcat (path, "-shm", NULL);

  g_unlink (path);
  g_unlink (wal);
  g_unlink (shm);
}

static void
copy_base (void)
{
  g_autofree char *contents = NULL;
  gsize length;

  remove_project (fixture.work);
  g_assert_true (g_file_get_contents (fixture.base, &contents, &length, NULL));
  g_assert_true (g_file_set_contents (fixture.work, contents, (gssize) length, NULL));
}

/* Starts the CLI on the work copy, kills it after DELAY_US (or lets it
 * finish when it is quicker), and says whether the kill came first. */
static gboolean
run_and_kill (const char *const *args, gint64 delay_us)
{
  g_autoptr (GPtrArray) argv = g_ptr_array_new ();
  g_autoptr (GSubprocess) process = NULL;
  g_autoptr (GError) error = NULL;
  gint64 until;

  g_ptr_array_add (argv, (gpointer) g_getenv ("STARLEDGER_CLI"));
  for (guint i = 0; args[i]; i++)
    g_ptr_array_add (argv, (gpointer) args[i]);
  g_ptr_array_add (argv, NULL);
  process = g_subprocess_newv ((const char *const *) argv->pdata,
                               G_SUBPROCESS_FLAGS_STDOUT_SILENCE | G_SUBPROCESS_FLAGS_STDERR_SILENCE, &error);
  g_assert_no_error (error);
  until = g_get_monotonic_time () + delay_us;
  /* GLib's worker thread reaps the child: no identifier once it ended. */
  while (g_get_monotonic_time () < until && g_subprocess_get_identifier (process) != NULL)
    g_usleep (200);
  if (g_subprocess_get_identifier (process) != NULL)
    g_subprocess_force_exit (process);
  g_assert_true (g_subprocess_wait (process, NULL, &error));
  g_assert_no_error (error);
  return g_subprocess_get_if_signaled (process) && g_subprocess_get_term_sig (process) == SIGKILL;
}

/* Whatever happened, the project opens and verifies. */
static SlProject *
open_and_verify (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlVerifyReport) report = NULL;
  SlProject *project = sl_project_open (fixture.work, &error);

  g_assert_no_error (error);
  report = sl_verify (project, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpstr (report->integrity, ==, "ok");
  g_assert_cmpuint (report->mismatches->len, ==, 0);
  return project;
}

static gint64
time_once (const char *const *args)
{
  gint64 start;

  copy_base ();
  start = g_get_monotonic_time ();
  g_assert_false (run_and_kill (args, G_USEC_PER_SEC * 60));
  return g_get_monotonic_time () - start;
}

static guint
iterations (void)
{
  const char *n = g_getenv ("STARLEDGER_KILL_ITERATIONS");

  return n ? (guint) g_ascii_strtoull (n, NULL, 10) : 25;
}

typedef void (*CheckFunc) (SlProject *project);

/* Kills the command at moments spread over its whole run (a tenth more,
 * so that some runs finish) and checks the project each time. */
static void
kill_repeatedly (const char *const *args, CheckFunc check)
{
  gint64 duration = time_once (args);
  g_autoptr (GRand) rand = g_rand_new_with_seed (20261202);
  guint killed = 0, n = iterations ();

  for (guint i = 0; i < n; i++)
    {
      g_autoptr (SlProject) project = NULL;

      copy_base ();
      killed += run_and_kill (args, (gint64) g_rand_double_range (rand, 0, 1.1 * (double) duration));
      project = open_and_verify ();
      check (project);
    }
  g_test_message ("%s: %u runs, %u killed midway (an uninterrupted run takes %.0f ms)", args[0], n, killed,
                  duration / 1000.0);
  g_assert_cmpuint (killed, >, 0);
}

static void
check_import (SlProject *project)
{
  gint64 sources = count (project, "SELECT count(*) FROM sources");
  gint64 measurements = count (project, "SELECT count(*) FROM measurements");
  gint64 stars = count (project, "SELECT count(*) FROM stars");
  gint64 logged = count (project, "SELECT count(*) FROM ledger WHERE action = 'import'");

  g_assert_true (sources == 1 || sources == 2);
  g_assert_cmpint (logged, ==, sources);
  g_assert_cmpint (measurements, ==, fixture.base_measurements + (sources - 1) * N_IMPORT_ROWS);
  g_assert_cmpint (stars, ==, fixture.base_stars + (sources - 1) * N_IMPORT_ROWS);
}

static void
test_kill_import (void)
{
  const char *args[] = { "import", fixture.work, fixture.csv, NULL };

  kill_repeatedly (args, check_import);
}

static void
check_derive (SlProject *project)
{
  gint64 runs = count (project, "SELECT count(*) FROM derivation_runs");
  gint64 latest = count (project, "SELECT max(id) FROM derivation_runs");
  gint64 rows = count (project, "SELECT count(*) FROM derived");
  gint64 of_latest = count (project, "SELECT count(*) FROM derived WHERE run_id = (SELECT max(id) FROM derivation_runs)");
  gint64 logged = count (project, "SELECT count(*) FROM ledger WHERE action = 'derive'");

  g_assert_true (runs == 1 || runs == 2);
  g_assert_cmpint (logged, ==, runs);
  g_assert_cmpint (rows, ==, fixture.base_stars);
  /* All of the new run, or all of the old. */
  g_assert_cmpint (of_latest, ==, rows);
  g_assert_cmpint (latest, ==, runs);
}

static void
test_kill_derive (void)
{
  const char *args[] = { "derive", "--all", "--errors", "mc:40", fixture.work, NULL };

  kill_repeatedly (args, check_derive);
}

static void
check_override (SlProject *project)
{
  gint64 overrides = count (project, "SELECT count(*) FROM overrides");
  gint64 logged = count (project, "SELECT count(*) FROM ledger WHERE action = 'override'");
  gint64 runs = count (project, "SELECT count(*) FROM derivation_runs");

  g_assert_true (overrides == 0 || overrides == 1);
  g_assert_cmpint (logged, ==, overrides);
  g_assert_cmpint (runs, ==, 1);
}

static void
test_kill_override (void)
{
  const char *args[] = { "override", fixture.work, "BASE 00007", "teff", "5000", "--lo", "4900", "--hi", "5100",
                         "--reason", "spectroscopic temperature", NULL };

  kill_repeatedly (args, check_override);
}

static void
make_base_project (void)
{
  g_autofree char *seed_csv = g_build_filename (fixture.dir, "base.csv", NULL);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_auto (CliResult) r = { 0 };

  fixture.base = g_build_filename (fixture.dir, "base.starledger", NULL);
  fixture.work = g_build_filename (fixture.dir, "work.starledger", NULL);
  fixture.csv = g_build_filename (fixture.dir, "new-stars.csv", NULL);
  write_catalogue (seed_csv, "BASE", 3000, 1);
  write_catalogue (fixture.csv, "NEW", N_IMPORT_ROWS, 2);
  run_cli (&r, "new", fixture.base, NULL);
  g_assert_cmpint (r.status, ==, 0);
  cli_result_clear (&r);
  run_cli (&r, "import", fixture.base, seed_csv, NULL);
  g_assert_cmpint (r.status, ==, 0);
  cli_result_clear (&r);
  run_cli (&r, "derive", fixture.base, NULL);
  g_assert_cmpint (r.status, ==, 0);

  project = sl_project_open (fixture.base, &error);
  g_assert_no_error (error);
  fixture.base_measurements = count (project, "SELECT count(*) FROM measurements");
  fixture.base_stars = count (project, "SELECT count(*) FROM stars");
}

int
main (int argc, char **argv)
{
  int result;

  cli_test_init (&argc, &argv);
  fixture.dir = sl_test_scratch_new ();
  make_base_project ();
  g_test_add_func ("/kill/import", test_kill_import);
  g_test_add_func ("/kill/derive", test_kill_derive);
  g_test_add_func ("/kill/override", test_kill_override);
  result = g_test_run ();
  sl_test_scratch_free (fixture.dir);
  return result;
}
