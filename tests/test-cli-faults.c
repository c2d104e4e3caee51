/* test-cli-faults.c: starledger-cli when the system is against it.
 *
 *  - A full disk: the CLI runs under a file size limit (RLIMIT_FSIZE, with
 *    SIGXFSZ ignored, so a write past it fails as on a full disk) during
 *    an import and a derive.  It must say so in one line and leave the
 *    project intact: verify passes, every count as before.
 *  - A read-only project: the file not writable, and its folder not
 *    writable either (no -wal or -shm can be made).  Reading (summary,
 *    export, verify) works; writing (import, derive) says the project is
 *    read-only.  As root, permissions do not bind, so the CLI then runs
 *    as user nobody.
 *  - Two processes: a CLI that meets another's write transaction waits
 *    for it (SQLite's busy timeout) and goes on, or after the timeout says
 *    the project is busy; two imports, and an import with a derive, run
 *    at once, and afterwards the project holds exactly what the ones that
 *    succeeded wrote.
 *  - And what the user reads of a bad input: the warning, the refusal. */
#include <gio/gio.h>
#include <grp.h>
#include <glib/gstdio.h>
#include <signal.h>
#include <sqlite3.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include "cli-util.h"
#include "test-util.h"

/* The user the CLI runs as when the test runs as root (nobody). */
#define UNPRIVILEGED_ID 65534

/* What a project holds, as one text, to compare before and after.  Read
 * and write, so that closing it removes the -wal and -shm files as the
 * CLI's own closing does (a read-only connection leaves them). */
static char *
project_counts (const char *path)
{
  const char *tables[] = { "sources", "stars", "measurements", "rejected_rows", "ledger",
                           "derivation_runs", "derived", "overrides", "lists", NULL };
  GString *text = g_string_new (NULL);
  sqlite3 *db;

  g_assert_cmpint (sqlite3_open_v2 (path, &db, SQLITE_OPEN_READWRITE, NULL), ==, SQLITE_OK);
  for (guint i = 0; tables[i]; i++)
    {
      g_autofree char *sql = g_strdup_printf ("SELECT count(*) FROM %s", tables[i]);

      g_string_append_printf (text, "%s %" G_GINT64_FORMAT "\n", tables[i], sl_test_query_int (db, sql));
    }
  sqlite3_close (db);
  return g_string_free (text, FALSE);
}

static void
assert_verifies (const char *project)
{
  g_auto (CliResult) r = { 0 };

  run_cli (&r, "verify", project, NULL);
  if (r.status != 0)
    g_error ("verify failed (%d): %s%s", r.status, r.out, r.err);
  assert_contains (r.out, "0 differences");
  assert_contains (r.out, "integrity ok");
}

/* A catalogue of N new stars named PREFIX NNNNN. */
static char *
write_catalogue (const char *dir, const char *name, const char *prefix, guint n)
{
  g_autoptr (GString) csv = g_string_new ("id,ra,dec,parallax,parallax_err,vmag,vmag_err,bv,bv_err\n");

  for (guint i = 0; i < n; i++)
    g_string_append_printf (csv, "%s %05u,%u.%04u,%d.%03u,%u.5,0.1%u,%u.25,0.01,0.%u,0.01\n", prefix, i,
                            i % 360, i % 9973, (int) (i % 170) - 85, i % 997, 1 + i % 90, i % 9,
                            4 + i % 10, i % 10);
  return sl_test_write_file (dir, name, csv->str, (gssize) csv->len);
}

/* ---------------------------------------------------------- child set-up */

typedef struct {
  rlim_t file_size_limit;   /* 0: none */
  gboolean unprivileged;    /* become nobody (the test runs as root) */
} ChildLimits;

/* Runs in the child between fork and exec: only async-signal-safe calls. */
static void
limit_child (gpointer data)
{
  const ChildLimits *limits = data;

  if (limits->file_size_limit > 0)
    {
      struct rlimit rl = { limits->file_size_limit, limits->file_size_limit };

      /* Ignored, a write past the limit fails with EFBIG instead of
       * killing the process: what a full disk does (ENOSPC). */
      signal (SIGXFSZ, SIG_IGN);
      if (setrlimit (RLIMIT_FSIZE, &rl) != 0)
        _exit (125);
    }
  if (limits->unprivileged
      && (setgroups (0, NULL) != 0 || setgid (UNPRIVILEGED_ID) != 0 || setuid (UNPRIVILEGED_ID) != 0))
    _exit (126);
}

/* run_cli with LIMITS applied to the child. */
static void
run_cli_limited (CliResult *r, const ChildLimits *limits, const char *first, ...)
{
  va_list args;

  va_start (args, first);
  run_cli_va (r, NULL, limit_child, (gpointer) limits, first, args);
  va_end (args);
  g_assert_cmpint (r->status, !=, 125);   /* the limit could not be set */
  g_assert_cmpint (r->status, !=, 126);   /* nor the user changed */
}

/* ------------------------------------------------------------- disk full */

/* A WAL file may grow to 64 KiB; the -shm file (32 KiB) fits. */
#define FULL_DISK_BYTES (64 * 1024)

static void
test_disk_full (void)
{
  g_autofree char *dir = NULL;
  g_autofree char *project = make_derived_demo_project (&dir);
  g_autofree char *csv = write_catalogue (dir, "big.csv", "Full", 20000);
  g_autofree char *before = project_counts (project);
  g_autofree char *after = NULL;
  g_auto (CliResult) import = { 0 };
  g_auto (CliResult) fresh = { 0 };
  g_auto (CliResult) derive = { 0 };
  g_auto (CliResult) summary = { 0 };
  ChildLimits limits = { FULL_DISK_BYTES, FALSE };

  run_cli_limited (&import, &limits, "import", project, csv, NULL);
  g_test_message ("import on a full disk: %s", import.err);
  assert_user_error (&import, "nothing was changed");
  assert_contains (import.err, "disk");
  after = project_counts (project);
  g_assert_cmpstr (after, ==, before);
  assert_verifies (project);

  /* A fresh project's first derive. */
  g_free (dir);
  g_free (project);
  dir = sl_test_scratch_new ();
  project = g_build_filename (dir, "fresh.starledger", NULL);
  {
    g_auto (CliResult) a = { 0 };
    g_auto (CliResult) p = { 0 };

    import_demo (project, NULL, &a, &p);
    g_assert_cmpint (a.status, ==, 0);
  }
  g_free (before);
  before = project_counts (project);
  run_cli_limited (&derive, &limits, "derive", project, NULL);
  g_test_message ("derive on a full disk: %s", derive.err);
  assert_user_error (&derive, "nothing was changed");
  g_free (after);
  after = project_counts (project);
  g_assert_cmpstr (after, ==, before);
  assert_verifies (project);

  /* With room again, the same work goes through. */
  run_cli (&fresh, "derive", project, NULL);
  g_assert_cmpint (fresh.status, ==, 0);
  run_cli (&summary, "summary", project, NULL);
  g_assert_cmpint (summary.status, ==, 0);
  assert_verifies (project);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------- read-only */

static void
test_read_only (void)
{
  g_autofree char *dir = NULL;
  g_autofree char *project = make_derived_demo_project (&dir);
  g_autofree char *out_dir = sl_test_scratch_new ();
  g_autofree char *out = g_build_filename (out_dir, "stars.csv", NULL);
  g_autofree char *csv = write_catalogue (out_dir, "new.csv", "Ro", 10);
  g_autofree char *before = project_counts (project);
  g_autofree char *after = NULL;
  g_autofree char *wal = g_strconcat (project, "-wal", NULL);
  g_autofree char *shm = g_strconcat (project, "-shm", NULL);
  ChildLimits limits = { 0, geteuid () == 0 };
  const char *read_commands[][4] = {
    { "summary", NULL },
    { "verify", NULL },
    { "export", "-o", NULL },
  };

  /* The file and its folder closed to writing; the output folder and the
   * catalogue open to the CLI whoever it runs as. */
  g_assert_false (g_file_test (wal, G_FILE_TEST_EXISTS));
  g_assert_cmpint (g_chmod (project, 0444), ==, 0);
  g_assert_cmpint (g_chmod (dir, 0555), ==, 0);
  g_assert_cmpint (g_chmod (out_dir, 0777), ==, 0);
  g_assert_cmpint (g_chmod (csv, 0644), ==, 0);

  for (guint i = 0; i < G_N_ELEMENTS (read_commands); i++)
    {
      g_auto (CliResult) r = { 0 };

      if (read_commands[i][1] != NULL)
        run_cli_limited (&r, &limits, read_commands[i][0], read_commands[i][1], out, project, NULL);
      else
        run_cli_limited (&r, &limits, read_commands[i][0], project, NULL);
      if (r.status != 0)
        g_error ("%s on a read-only project: exit %d: %s", read_commands[i][0], r.status, r.err);
    }
  g_assert_true (g_file_test (out, G_FILE_TEST_IS_REGULAR));

  {
    g_auto (CliResult) import = { 0 };
    g_auto (CliResult) derive = { 0 };

    run_cli_limited (&import, &limits, "import", project, csv, NULL);
    assert_user_error (&import, "the project file is read-only (or its folder is): nothing can be changed");
    assert_prefix (import.err, "starledger-cli: ");
    run_cli_limited (&derive, &limits, "derive", project, "--all", NULL);
    assert_user_error (&derive, "read-only");
  }

  /* Nothing was left beside the file, nothing in it changed. */
  g_assert_false (g_file_test (wal, G_FILE_TEST_EXISTS));
  g_assert_false (g_file_test (shm, G_FILE_TEST_EXISTS));
  g_assert_cmpint (g_chmod (dir, 0700), ==, 0);
  after = project_counts (project);
  g_assert_cmpstr (after, ==, before);

  /* A read-only file in a folder that is writable: the same. */
  {
    g_auto (CliResult) summary = { 0 };
    g_auto (CliResult) import = { 0 };

    g_assert_cmpint (g_chmod (dir, 0777), ==, 0);
    run_cli_limited (&summary, &limits, "summary", project, NULL);
    g_assert_cmpint (summary.status, ==, 0);
    run_cli_limited (&import, &limits, "import", project, csv, NULL);
    assert_user_error (&import, "read-only");
  }
  g_free (after);
  after = project_counts (project);
  g_assert_cmpstr (after, ==, before);
  g_assert_cmpint (g_chmod (project, 0644), ==, 0);
  assert_verifies (project);
  sl_test_scratch_free (g_steal_pointer (&dir));
  sl_test_scratch_free (g_steal_pointer (&out_dir));
}

/* ---------------------------------------------------- two processes */

/* A write transaction held by "another Starledger" while the CLI runs:
 * released after RELEASE_AFTER_MS, or never (-1). */
static void
hold_write_lock_and_run (const char *project, const char *csv, int release_after_ms, CliResult *r)
{
  g_autoptr (GSubprocess) cli = NULL;
  g_autoptr (GError) error = NULL;
  sqlite3 *db;

  g_assert_cmpint (sqlite3_open (project, &db), ==, SQLITE_OK);
  g_assert_cmpint (sqlite3_exec (db, "BEGIN IMMEDIATE", NULL, NULL, NULL), ==, SQLITE_OK);
  cli = g_subprocess_new (G_SUBPROCESS_FLAGS_STDOUT_PIPE | G_SUBPROCESS_FLAGS_STDERR_PIPE, &error,
                          g_getenv ("STARLEDGER_CLI"), "import", project, csv, NULL);
  g_assert_no_error (error);
  if (release_after_ms >= 0)
    {
      g_usleep (release_after_ms * 1000);
      g_assert_cmpint (sqlite3_exec (db, "ROLLBACK", NULL, NULL, NULL), ==, SQLITE_OK);
    }
  g_assert_true (g_subprocess_communicate_utf8 (cli, NULL, NULL, &r->out, &r->err, &error));
  g_assert_no_error (error);
  r->status = g_subprocess_get_exit_status (cli);
  if (release_after_ms < 0)
    sqlite3_exec (db, "ROLLBACK", NULL, NULL, NULL);
  sqlite3_close (db);
}

static void
test_busy_waits_then_says_busy (void)
{
  g_autofree char *dir = NULL;
  g_autofree char *project = make_derived_demo_project (&dir);
  g_autofree char *csv = write_catalogue (dir, "small.csv", "Busy", 20);
  g_autofree char *before = project_counts (project);
  g_autofree char *after = NULL;
  g_auto (CliResult) waited = { 0 };
  g_auto (CliResult) refused = { 0 };

  /* Held for a second: the CLI waits and imports. */
  hold_write_lock_and_run (project, csv, 1000, &waited);
  if (waited.status != 0)
    g_error ("import after a short wait: exit %d: %s", waited.status, waited.err);
  assert_contains (waited.out, "imported 20 rows");

  /* Held for good: after the timeout, a clear message and nothing done. */
  g_free (before);
  before = project_counts (project);
  hold_write_lock_and_run (project, csv, -1, &refused);
  assert_user_error (&refused, "the project is busy: another program is writing to it; try again");
  after = project_counts (project);
  g_assert_cmpstr (after, ==, before);
  assert_verifies (project);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* Starts the CLI with ARGS (NULL-terminated) without waiting for it. */
static GSubprocess *
start_cli (const char *const *args)
{
  g_autoptr (GPtrArray) argv = g_ptr_array_new ();
  g_autoptr (GError) error = NULL;
  GSubprocess *cli;

  g_ptr_array_add (argv, (gpointer) g_getenv ("STARLEDGER_CLI"));
  for (guint i = 0; args[i]; i++)
    g_ptr_array_add (argv, (gpointer) args[i]);
  g_ptr_array_add (argv, NULL);
  cli = g_subprocess_newv ((const char *const *) argv->pdata,
                           G_SUBPROCESS_FLAGS_STDOUT_PIPE | G_SUBPROCESS_FLAGS_STDERR_PIPE, &error);
  g_assert_no_error (error);
  return cli;
}

static void
finish_cli (GSubprocess *cli, CliResult *r)
{
  g_autoptr (GError) error = NULL;

  g_assert_true (g_subprocess_communicate_utf8 (cli, NULL, NULL, &r->out, &r->err, &error));
  g_assert_no_error (error);
  r->status = g_subprocess_get_exit_status (cli);
  /* Done, or refused as busy: never another failure. */
  if (r->status != 0)
    assert_user_error (r, "the project is busy: another program is writing to it; try again");
}

static gint64
count_in (const char *project, const char *sql)
{
  sqlite3 *db;
  gint64 n;

  g_assert_cmpint (sqlite3_open_v2 (project, &db, SQLITE_OPEN_READWRITE, NULL), ==, SQLITE_OK);
  n = sl_test_query_int (db, sql);
  sqlite3_close (db);
  return n;
}

static void
test_two_imports_at_once (void)
{
  g_autofree char *dir = NULL;
  g_autofree char *project = make_derived_demo_project (&dir);
  g_autofree char *big = write_catalogue (dir, "big.csv", "First", 60000);
  g_autofree char *small = write_catalogue (dir, "small.csv", "Second", 500);
  gint64 stars = count_in (project, "SELECT count(*) FROM stars");
  gint64 sources = count_in (project, "SELECT count(*) FROM sources");
  const char *first_args[] = { "import", project, big, NULL };
  const char *second_args[] = { "import", project, small, NULL };
  const char *derive_args[] = { "derive", project, NULL };
  g_autoptr (GSubprocess) first = start_cli (first_args);
  g_autoptr (GSubprocess) second = NULL;
  g_autoptr (GSubprocess) derive = NULL;
  g_auto (CliResult) first_result = { 0 };
  g_auto (CliResult) second_result = { 0 };
  g_auto (CliResult) derive_result = { 0 };
  gint64 want_stars = stars, want_sources = sources;

  g_usleep (200 * 1000);
  second = start_cli (second_args);
  derive = start_cli (derive_args);
  finish_cli (first, &first_result);
  finish_cli (second, &second_result);
  finish_cli (derive, &derive_result);
  g_test_message ("big import: %d, small import: %d, derive: %d", first_result.status,
                  second_result.status, derive_result.status);

  /* Each import is all or nothing, and none lost another's rows. */
  if (first_result.status == 0)
    {
      want_stars += 60000;
      want_sources++;
    }
  if (second_result.status == 0)
    {
      want_stars += 500;
      want_sources++;
    }
  g_assert_cmpint (count_in (project, "SELECT count(*) FROM stars"), ==, want_stars);
  g_assert_cmpint (count_in (project, "SELECT count(*) FROM sources"), ==, want_sources);
  g_assert_cmpint (count_in (project, "SELECT count(*) FROM ledger WHERE action = 'import'"), ==, want_sources);
  g_assert_cmpint (count_in (project, "SELECT count(*) FROM measurements m JOIN sources s ON s.id = m.source_id "
                                      "WHERE s.file_name = 'big.csv'"), ==, first_result.status == 0 ? 60000 : 0);
  g_assert_cmpint (count_in (project, "SELECT count(*) FROM measurements m JOIN sources s ON s.id = m.source_id "
                                      "WHERE s.file_name = 'small.csv'"), ==, second_result.status == 0 ? 500 : 0);
  assert_verifies (project);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* --------------------------------------------- what the user reads */

/* The command line prints the import's warning, and a refused file is
 * one line naming the file and line. */
static void
test_warning_and_refusal_printed (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *project = g_build_filename (dir, "p.starledger", NULL);
  g_autofree char *arcsec = sl_test_write_file (dir, "arcsec.csv",
                                                "id,parallax,parallax_err\nA,0.0213,0.0008\n", -1);
  g_autofree char *bars = sl_test_write_file (dir, "bars.csv", "id|parallax\nA|1\n", -1);
  g_auto (CliResult) created = { 0 };
  g_auto (CliResult) warned = { 0 };
  g_auto (CliResult) refused = { 0 };

  run_cli (&created, "new", project, NULL);
  g_assert_cmpint (created.status, ==, 0);
  run_cli (&warned, "import", project, arcsec, NULL);
  g_assert_cmpint (warned.status, ==, 0);
  assert_contains (warned.out, "WARNING: arcsec.csv: column 'parallax' was read as parallax in mas");
  run_cli (&refused, "import", project, bars, NULL);
  assert_user_error (&refused, "bars.csv:1: the header is one column, 'id|parallax', holding a vertical bar");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

int
main (int argc, char **argv)
{
  cli_test_init (&argc, &argv);

  g_test_add_func ("/cli/faults/disk-full", test_disk_full);
  g_test_add_func ("/cli/faults/read-only", test_read_only);
  g_test_add_func ("/cli/faults/busy-waits-then-says-busy", test_busy_waits_then_says_busy);
  g_test_add_func ("/cli/faults/two-writers-at-once", test_two_imports_at_once);
  g_test_add_func ("/cli/bad-input/warning-and-refusal-printed", test_warning_and_refusal_printed);

  return g_test_run ();
}
