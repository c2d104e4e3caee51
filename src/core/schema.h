/* schema.h: the project file's tables and their forward migrations.
 *
 * PRAGMA user_version holds the schema version.  Migration N takes a
 * project from version N to N + 1; a new project runs them all.  A
 * migration, once released, is never edited: change the schema by
 * appending one, and add a frozen copy of the previous version to
 * tests/data/ so the migration test covers it.
 */
#pragma once

#include <glib.h>
#include <sqlite3.h>

G_BEGIN_DECLS

/* PRAGMA application_id of every Starledger project: "SLGR". */
#define SL_APPLICATION_ID 0x534C4752

/* The schema version this build writes. */
int sl_schema_current_version (void);

/* Runs the migrations from version FROM to the current one.  The caller
 * holds a write transaction. */
gboolean sl_schema_migrate (sqlite3 *db, int from, GError **error);

/* Compares the tables, indexes, triggers and views of DB's main database
 * with those the migrations make for VERSION (text compared with the
 * layout of blanks ignored).  Anything extra, missing or changed is an
 * SL_ERROR_UNTRUSTED naming it; PATH is for the message. */
gboolean sl_schema_check (sqlite3 *db, int version, const char *path, GError **error);

G_END_DECLS
