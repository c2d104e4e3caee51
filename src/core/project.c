/* project.c: opening, creating and hardening project files; reading the
 * columns of a query's row. */
#include "project.h"

#include <errno.h>
#include <glib/gi18n.h>
#include <glib/gstdio.h>
#include <math.h>
#include <stdarg.h>

#include "ledger.h"
#include "schema.h"
#include "sl-error.h"

struct _SlProject {
  sqlite3 *db;
  char    *path;
  int      schema_version;
};

/* How long a command waits for another process's write to finish. */
#define SL_BUSY_TIMEOUT_MS 5000

const char *
sl_project_path (SlProject *project)
{
  return project->path;
}

sqlite3 *
sl_project_db (SlProject *project)
{
  return project->db;
}

int
sl_project_schema_version (SlProject *project)
{
  return project->schema_version;
}

void
sl_project_set_db_error (SlProject *project, GError **error, const char *what)
{
  int code = sqlite3_errcode (project->db) & 0xff;  /* primary of the extended code */
  int system_errno = sqlite3_system_errno (project->db);

  /* SQLite says SQLITE_FULL only when write() made no progress; a write
   * cut short by the disk or by the file size limit is an I/O error
   * whose errno tells the story, when SQLite kept it. */
  if (code == SQLITE_IOERR && (system_errno == ENOSPC || system_errno == EFBIG
                               || system_errno == EDQUOT))
    code = SQLITE_FULL;

  if (code == SQLITE_BUSY || code == SQLITE_LOCKED)
    g_set_error (error, SL_ERROR, SL_ERROR_BUSY,
                 _("%s: the project is busy: another program is writing to it; try again"),
                 project->path);
  else if (code == SQLITE_READONLY)
    g_set_error (error, SL_ERROR, SL_ERROR_IO,
                 _("%s: the project file is read-only (or its folder is): nothing can be changed; "
                   "reading it still works"), project->path);
  else if (code == SQLITE_FULL)
    g_set_error (error, SL_ERROR, SL_ERROR_IO,
                 _("%s: the disk is full (or the file size limit is reached); nothing was changed"),
                 project->path);
  else if (sqlite3_extended_errcode (project->db) == SQLITE_IOERR_WRITE)
    g_set_error (error, SL_ERROR, SL_ERROR_IO,
                 _("%s: cannot write the project file (is the disk full?); nothing was changed"),
                 project->path);
  else
    g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, "%s: %s: %s",
                 project->path, what, sqlite3_errmsg (project->db));
}

gboolean
sl_project_exec (SlProject *project, const char *sql, GError **error)
{
  if (sqlite3_exec (project->db, sql, NULL, NULL, NULL) != SQLITE_OK)
    {
      sl_project_set_db_error (project, error, sql);
      return FALSE;
    }
  return TRUE;
}

sqlite3_stmt *
sl_project_prepare (SlProject *project, const char *sql, GError **error)
{
  sqlite3_stmt *stmt = NULL;

  if (sqlite3_prepare_v2 (project->db, sql, -1, &stmt, NULL) != SQLITE_OK)
    {
      sl_project_set_db_error (project, error, _("cannot prepare a query"));
      return NULL;
    }
  return stmt;
}

char *
sl_column_text_dup (sqlite3_stmt *stmt, int column)
{
  return g_strdup ((const char *) sqlite3_column_text (stmt, column));
}

double
sl_column_double_or_nan (sqlite3_stmt *stmt, int column)
{
  return sqlite3_column_type (stmt, column) == SQLITE_NULL ? NAN : sqlite3_column_double (stmt, column);
}

void
sl_column_texts_dup (sqlite3_stmt *stmt, int first, ...)
{
  va_list args;
  char **out;

  va_start (args, first);
  for (int column = first; (out = va_arg (args, char **)) != NULL; column++)
    *out = sl_column_text_dup (stmt, column);
  va_end (args);
}

gboolean
sl_project_begin (SlProject *project, GError **error)
{
  return sl_project_exec (project, "BEGIN IMMEDIATE", error);
}

gboolean
sl_project_commit (SlProject *project, GError **error)
{
  return sl_project_exec (project, "COMMIT", error);
}

void
sl_project_rollback (SlProject *project)
{
  if (!sqlite3_get_autocommit (project->db))
    sqlite3_exec (project->db, "ROLLBACK", NULL, NULL, NULL);
}

/* Returns the integer of a PRAGMA that has one, or -1 on error. */
static gint64
query_pragma (SlProject *project, const char *pragma)
{
  g_autofree char *sql = g_strdup_printf ("PRAGMA %s", pragma);
  sqlite3_stmt *stmt;
  gint64 value = -1;

  if (sqlite3_prepare_v2 (project->db, sql, -1, &stmt, NULL) != SQLITE_OK)
    return -1;
  if (sqlite3_step (stmt) == SQLITE_ROW)
    value = sqlite3_column_int64 (stmt, 0);
  sqlite3_finalize (stmt);
  return value;
}

/* Settings that hold for every connection, made before the file's schema
 * is read: a project file may come from anyone. */
static gboolean
harden_connection (SlProject *project, GError **error)
{
  sqlite3_db_config (project->db, SQLITE_DBCONFIG_DEFENSIVE, 1, NULL);
  sqlite3_db_config (project->db, SQLITE_DBCONFIG_TRUSTED_SCHEMA, 0, NULL);
  sqlite3_db_config (project->db, SQLITE_DBCONFIG_ENABLE_LOAD_EXTENSION, 0, NULL);
  sqlite3_busy_timeout (project->db, SL_BUSY_TIMEOUT_MS);
  return sl_project_exec (project,
                          "PRAGMA trusted_schema = OFF;"
                          "PRAGMA foreign_keys = ON;",
                          error);
}

/* WAL lets readers (the window) go on while a command writes; NORMAL
 * synchronous is crash-safe in WAL mode (SQLite docs, "WAL"). */
static gboolean
set_journal (SlProject *project, GError **error)
{
  return sl_project_exec (project,
                          "PRAGMA journal_mode = WAL;"
                          "PRAGMA synchronous = NORMAL;"
                          "PRAGMA cache_size = -65536;",   /* 64 MiB: bulk imports touch big indexes */
                          error);
}

/* Opens FILENAME (PATH, or a URI naming it) for PATH. */
static SlProject *
connect_as (const char *path, const char *filename, int flags, GError **error)
{
  SlProject *project = g_new0 (SlProject, 1);
  int rc;

  project->path = g_strdup (path);
  /* NOMUTEX: a connection is used by one thread at a time (each thread of
   * the window opens its own), so SQLite's per-call locking is pure cost. */
  rc = sqlite3_open_v2 (filename, &project->db,
                        flags | SQLITE_OPEN_EXRESCODE | SQLITE_OPEN_NOMUTEX, NULL);
  if (rc != SQLITE_OK)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_IO, _("%s: cannot open: %s"),
                   path, project->db ? sqlite3_errmsg (project->db) : sqlite3_errstr (rc));
      sl_project_close (project);
      return NULL;
    }
  if (!harden_connection (project, error))
    {
      sl_project_close (project);
      return NULL;
    }
  return project;
}

static SlProject *
connect (const char *path, int flags, GError **error)
{
  return connect_as (path, path, flags, error);
}

/* A project SQLite opened read-only (the file is not writable) whose
 * schema it cannot read: in WAL mode a reader needs the -shm file beside
 * the project, and a folder that is not writable cannot hold a new one.
 * SQLite still reads the file when told that it does not change
 * (immutable), which holds here: changing it takes the rights we lack.
 * Returns PROJECT itself when none of this applies. */
static SlProject *
reopen_if_unreadable (SlProject *project, GError **error)
{
  g_autofree char *escaped = NULL;
  g_autofree char *uri = NULL;
  g_autofree char *absolute = NULL;
  SlProject *immutable;

  if (sqlite3_db_readonly (project->db, "main") != 1
      || query_pragma (project, "schema_version") >= 0)
    return project;

  absolute = g_canonicalize_filename (project->path, NULL);
  escaped = g_uri_escape_string (absolute, "/", FALSE);
  uri = g_strconcat ("file:", escaped, "?immutable=1", NULL);
  immutable = connect_as (project->path, uri, SQLITE_OPEN_READONLY | SQLITE_OPEN_URI, error);
  if (immutable != NULL)
    sl_project_close (project);
  else
    {
      g_clear_error (error);
      immutable = project;
    }
  return immutable;
}

SlProject *
sl_project_create (const char *path, GError **error)
{
  g_autoptr (SlProject) project = NULL;
  g_autofree char *pragma = NULL;

  g_return_val_if_fail (path != NULL, NULL);

  if (g_file_test (path, G_FILE_TEST_EXISTS))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_EXISTS,
                   _("%s: a file of that name already exists"), path);
      return NULL;
    }

  project = connect (path, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE, error);
  if (project == NULL || !set_journal (project, error) || !sl_project_begin (project, error))
    {
      if (project != NULL)
        g_unlink (path);
      return NULL;
    }

  pragma = g_strdup_printf ("PRAGMA application_id = %d", SL_APPLICATION_ID);
  if (!sl_project_exec (project, pragma, error)
      || !sl_schema_migrate (project->db, 0, error)
      || !sl_ledger_append (project, "create", _("created the project"), "{}", error)
      || !sl_project_commit (project, error))
    {
      sl_project_rollback (project);
      g_clear_pointer (&project, sl_project_close);
      g_unlink (path);
      return NULL;
    }

  project->schema_version = sl_schema_current_version ();
  return g_steal_pointer (&project);
}

/* Whether the file holds no tables at all: an empty SQLite database. */
static gboolean
has_no_tables (SlProject *project)
{
  return query_pragma (project, "schema_version") == 0;
}

static gboolean
check_identity (SlProject *project, GError **error)
{
  gint64 app_id = query_pragma (project, "application_id");
  gint64 version;

  if (app_id < 0)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_NOT_A_PROJECT,
                   _("%s: not a Starledger project (not an SQLite database)"),
                   project->path);
      return FALSE;
    }
  if (app_id != SL_APPLICATION_ID)
    {
      if (app_id == 0 && has_no_tables (project))
        g_set_error (error, SL_ERROR, SL_ERROR_NOT_A_PROJECT,
                     _("%s: not a Starledger project (an empty SQLite database); "
                       "create one with 'starledger-cli new'"), project->path);
      else
        g_set_error (error, SL_ERROR, SL_ERROR_NOT_A_PROJECT,
                     _("%s: not a Starledger project (an SQLite database of another program)"),
                     project->path);
      return FALSE;
    }

  version = query_pragma (project, "user_version");
  if (version < 0 || (version == 0 && !has_no_tables (project)))
    {
      /* A project is created with its tables and version in one
       * transaction: tables without a version (or with a negative one,
       * found by fuzzing) were not made by Starledger. */
      g_set_error (error, SL_ERROR, SL_ERROR_NOT_A_PROJECT,
                   _("%s: a damaged project (tables but no valid schema version)"), project->path);
      return FALSE;
    }
  if (version > sl_schema_current_version ())
    {
      g_set_error (error, SL_ERROR, SL_ERROR_SCHEMA_TOO_NEW,
                   _("%s: written by a newer Starledger (schema version %d; this one "
                     "reads up to %d); upgrade Starledger to open it"),
                   project->path, (int) version, sl_schema_current_version ());
      return FALSE;
    }
  project->schema_version = (int) version;
  return TRUE;
}

static gboolean
upgrade_schema (SlProject *project, GError **error)
{
  int from = project->schema_version;
  g_autofree char *summary = NULL;
  g_autofree char *details = NULL;

  if (!sl_project_begin (project, error))
    return FALSE;
  /* Another process may have upgraded it while we waited for the lock. */
  from = (int) query_pragma (project, "user_version");
  if (from == sl_schema_current_version ())
    return sl_project_commit (project, error);

  summary = g_strdup_printf (_("upgraded the project file from schema version %d to %d"),
                             from, sl_schema_current_version ());
  details = g_strdup_printf ("{\"from\":%d,\"to\":%d}", from, sl_schema_current_version ());
  if (!sl_schema_migrate (project->db, from, error)
      || !sl_ledger_append (project, "upgrade", summary, details, error)
      || !sl_project_commit (project, error))
    {
      sl_project_rollback (project);
      return FALSE;
    }
  project->schema_version = sl_schema_current_version ();
  return TRUE;
}

SlProject *
sl_project_open (const char *path, GError **error)
{
  g_autoptr (SlProject) project = NULL;

  g_return_val_if_fail (path != NULL, NULL);

  if (!g_file_test (path, G_FILE_TEST_IS_REGULAR))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_IO,
                   g_file_test (path, G_FILE_TEST_EXISTS)
                     ? _("%s: not a regular file") : _("%s: no such project file"),
                   path);
      return NULL;
    }

  /* The journal mode is written into the file's header: set it only once
   * the file has proved to be a project, so that a refused file is left
   * byte for byte as it was (found by fuzzing). */
  project = connect (path, SQLITE_OPEN_READWRITE, error);
  if (project != NULL)
    project = reopen_if_unreadable (project, error);
  /* The version and the schema from one snapshot: another process may be
   * upgrading the file at this moment. */
  if (project == NULL || !sl_project_exec (project, "BEGIN", error))
    return NULL;
  if (!check_identity (project, error)
      || !sl_schema_check (project->db, project->schema_version, path, error))
    {
      sl_project_rollback (project);
      return NULL;
    }
  if (!sl_project_commit (project, error))
    return NULL;
  if (project->schema_version < sl_schema_current_version ()
      && !upgrade_schema (project, error))
    return NULL;
  if (!set_journal (project, error))
    return NULL;
  return g_steal_pointer (&project);
}

void
sl_project_close (SlProject *project)
{
  if (project == NULL)
    return;
  sqlite3_close_v2 (project->db);
  g_free (project->path);
  g_free (project);
}
