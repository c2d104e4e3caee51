/* project.h: a Starledger project, one SQLite file.
 *
 * Opening checks that the file is ours (application_id), upgrades an older
 * schema and refuses a newer one, and hardens the connection for files
 * that come from colleagues: defensive mode, untrusted schema, no
 * extension loading, foreign keys on, WAL journal.
 */
#pragma once

#include <glib.h>
#include <sqlite3.h>

G_BEGIN_DECLS

typedef struct _SlProject SlProject;

/* Creates a new project at PATH; fails if anything exists there. */
SlProject  *sl_project_create (const char *path, GError **error);

/* Opens an existing project for reading and writing, upgrading its schema
 * if it is older than this build's (recorded in the ledger). */
SlProject  *sl_project_open   (const char *path, GError **error);

void        sl_project_close  (SlProject *project);

const char *sl_project_path   (SlProject *project);
sqlite3    *sl_project_db     (SlProject *project);
int         sl_project_schema_version (SlProject *project);

/* Write transactions.  begin takes the write lock at once (BEGIN
 * IMMEDIATE) so a second writer waits or fails here, before any work. */
gboolean    sl_project_begin    (SlProject *project, GError **error);
gboolean    sl_project_commit   (SlProject *project, GError **error);
void        sl_project_rollback (SlProject *project);

/* Runs SQL without results. */
gboolean    sl_project_exec     (SlProject *project, const char *sql, GError **error);

/* Prepares SQL; on failure sets ERROR with SQLite's message. */
sqlite3_stmt *sl_project_prepare (SlProject *project, const char *sql, GError **error);

/* Sets ERROR from the connection's last SQLite error, prefixed by WHAT. */
void        sl_project_set_db_error (SlProject *project, GError **error, const char *what);

/* Column COLUMN of STMT's current row as a new string (NULL for SQL NULL)
 * or as a double (NAN for SQL NULL, so that a missing value is never
 * read as 0). */
char       *sl_column_text_dup      (sqlite3_stmt *stmt, int column);
double      sl_column_double_or_nan (sqlite3_stmt *stmt, int column);

/* Columns FIRST, FIRST + 1, ... of STMT's current row as new strings,
 * into the char ** that follow, up to a NULL: one call that keeps a
 * struct's fields in the order of the SELECT. */
void        sl_column_texts_dup     (sqlite3_stmt *stmt, int first, ...) G_GNUC_NULL_TERMINATED;

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlProject, sl_project_close)

G_END_DECLS
