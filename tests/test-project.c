/* test-project.c: creating, opening, refusing and upgrading project files. */
#include <sqlite3.h>
#include <string.h>

#include "ledger.h"
#include "project.h"
#include "schema.h"
#include "sl-error.h"
#include "test-util.h"

typedef struct {
  char *dir;
  char *path;
} Fixture;

static void
fixture_set_up (Fixture *f, gconstpointer data)
{
  f->dir = sl_test_scratch_new ();
  f->path = g_build_filename (f->dir, "test.starledger", NULL);
}

static void
fixture_tear_down (Fixture *f, gconstpointer data)
{
  g_free (f->path);
  sl_test_scratch_free (f->dir);
}

/* Runs SQL in a plain SQLite connection, as another program would. */
static void
run_raw_sql (const char *path, const char *sql)
{
  sqlite3 *db;

  g_assert_cmpint (sqlite3_open (path, &db), ==, SQLITE_OK);
  g_assert_cmpint (sqlite3_exec (db, sql, NULL, NULL, NULL), ==, SQLITE_OK);
  sqlite3_close (db);
}

static void
test_create (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_create (f->path, &error);
  g_autoptr (GPtrArray) entries = NULL;
  const SlLedgerEntry *entry;

  g_assert_no_error (error);
  g_assert_cmpint (sl_project_schema_version (project), ==, sl_schema_current_version ());
  g_assert_cmpint (sl_test_query_int (sl_project_db (project), "PRAGMA application_id"), ==, SL_APPLICATION_ID);
  g_assert_cmpint (sl_test_query_int (sl_project_db (project), "PRAGMA user_version"), ==,
                   sl_schema_current_version ());

  entries = sl_ledger_read (project, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (entries->len, ==, 1);
  entry = entries->pdata[0];
  g_assert_cmpstr (entry->action, ==, "create");
  g_assert_cmpstr (entry->who, ==, "test-user");   /* STARLEDGER_USER in the test environment */
  g_assert_true (g_str_has_suffix (entry->at, "Z"));
}

static void
test_create_refuses_existing (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *contents = NULL;
  SlProject *project;

  g_free (sl_test_write_file (f->dir, "test.starledger", "precious", -1));
  project = sl_project_create (f->path, &error);
  g_assert_null (project);
  g_assert_error (error, SL_ERROR, SL_ERROR_EXISTS);
  g_assert_true (g_file_get_contents (f->path, &contents, NULL, NULL));
  g_assert_cmpstr (contents, ==, "precious");
}

static void
test_reopen (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = NULL;

  sl_project_close (sl_project_create (f->path, &error));
  g_assert_no_error (error);
  project = sl_project_open (f->path, &error);
  g_assert_no_error (error);
  g_assert_nonnull (project);
  g_assert_cmpint (sl_project_schema_version (project), ==, sl_schema_current_version ());
}

static void
test_open_missing (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;

  g_assert_null (sl_project_open (f->path, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_IO);
  g_assert_nonnull (strstr (error->message, "no such project file"));
  g_assert_false (g_file_test (f->path, G_FILE_TEST_EXISTS));
}

/* Opening must refuse another program's database without changing a byte
 * of it (no journal mode switch, no schema). */
static void
test_open_foreign_sqlite (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *before = NULL;
  g_autofree char *after = NULL;
  gsize before_len, after_len;

  run_raw_sql (f->path, "CREATE TABLE recipes (name TEXT); INSERT INTO recipes VALUES ('bread');");
  g_assert_true (g_file_get_contents (f->path, &before, &before_len, NULL));

  g_assert_null (sl_project_open (f->path, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_NOT_A_PROJECT);
  g_assert_nonnull (strstr (error->message, "another program"));

  g_assert_true (g_file_get_contents (f->path, &after, &after_len, NULL));
  g_assert_cmpmem (before, before_len, after, after_len);
}

static void
test_open_empty_sqlite (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;

  g_free (sl_test_write_file (f->dir, "test.starledger", "", 0));
  g_assert_null (sl_project_open (f->path, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_NOT_A_PROJECT);
  g_assert_nonnull (strstr (error->message, "empty SQLite database"));
}

static void
test_open_text_file (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;

  g_free (sl_test_write_file (f->dir, "test.starledger",
                              "id,ra,dec\nA,1,2\nthis is a CSV file, not a project\n", -1));
  g_assert_null (sl_project_open (f->path, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_NOT_A_PROJECT);
  g_assert_nonnull (strstr (error->message, "not an SQLite database"));
}

static void
test_open_newer_schema (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *bump = g_strdup_printf ("PRAGMA user_version = %d",
                                           sl_schema_current_version () + 1);

  sl_project_close (sl_project_create (f->path, &error));
  g_assert_no_error (error);
  run_raw_sql (f->path, bump);

  g_assert_null (sl_project_open (f->path, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_SCHEMA_TOO_NEW);
  g_assert_nonnull (strstr (error->message, "newer Starledger"));
}

/* Loads the frozen project tests/data/NAME into F's file with a plain
 * SQLite connection, opens it (which upgrades it) and checks the version. */
static SlProject *
open_fixture (Fixture *f, const char *name)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *fixture = g_build_filename (g_getenv ("STARLEDGER_SOURCE_DIR"), "tests", "data", name, NULL);
  g_autofree char *sql = NULL;
  SlProject *project;

  g_assert_true (g_file_get_contents (fixture, &sql, NULL, NULL));
  run_raw_sql (f->path, sql);

  project = sl_project_open (f->path, &error);
  g_assert_no_error (error);
  g_assert_nonnull (project);
  g_assert_cmpint (sl_project_schema_version (project), ==, sl_schema_current_version ());
  g_assert_cmpint (sl_test_query_int (sl_project_db (project), "PRAGMA user_version"), ==, sl_schema_current_version ());
  return project;
}

/* Appends each row of SQL to TEXT, cells separated by '|'. */
static void
append_rows (sqlite3 *db, const char *sql, GString *text)
{
  sqlite3_stmt *stmt;

  g_assert_cmpint (sqlite3_prepare_v2 (db, sql, -1, &stmt, NULL), ==, SQLITE_OK);
  while (sqlite3_step (stmt) == SQLITE_ROW)
    {
      for (int c = 0; c < sqlite3_column_count (stmt); c++)
        g_string_append_printf (text, "%s|", sqlite3_column_type (stmt, c) == SQLITE_NULL
                                                ? "NULL" : (const char *) sqlite3_column_text (stmt, c));
      g_string_append_c (text, '\n');
    }
  sqlite3_finalize (stmt);
}

/* Every table's columns (name, type, not null, default, key), indexes
 * (unique, partial, origin) and their columns, as one text. */
static char *
schema_outline (sqlite3 *db)
{
  GString *text = g_string_new (NULL);

  append_rows (db, "SELECT m.name, p.name, p.type, p.\"notnull\", p.dflt_value, p.pk "
                   "FROM sqlite_schema m, pragma_table_info (m.name) p "
                   "WHERE m.type = 'table' ORDER BY m.name, p.cid", text);
  append_rows (db, "SELECT m.name, l.name, l.\"unique\", l.origin, l.partial, i.seqno, i.name "
                   "FROM sqlite_schema m, pragma_index_list (m.name) l, pragma_index_info (l.name) i "
                   "WHERE m.type = 'table' ORDER BY m.name, l.name, i.seqno", text);
  append_rows (db, "SELECT m.name, k.\"table\", k.\"from\", k.\"to\", k.on_delete "
                   "FROM sqlite_schema m, pragma_foreign_key_list (m.name) k "
                   "WHERE m.type = 'table' ORDER BY m.name, k.id, k.seq", text);
  return g_string_free (text, FALSE);
}

/* The upgraded file has the tables, columns and indexes of a new one. */
static void
assert_schema_as_new (Fixture *f, SlProject *upgraded)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *path = g_build_filename (f->dir, "new.starledger", NULL);
  g_autoptr (SlProject) fresh = sl_project_create (path, &error);
  g_autofree char *want = NULL;
  g_autofree char *got = NULL;

  g_assert_no_error (error);
  want = schema_outline (sl_project_db (fresh));
  got = schema_outline (sl_project_db (upgraded));
  g_assert_cmpstr (got, ==, want);
}

/* The rows of tests/data/project-v1.sql, which project-v2.sql holds too:
 * a source, two stars, their measurements, a rejected row. */
static void
assert_version_1_rows (sqlite3 *db)
{
  g_autofree char *notes = NULL;
  g_autofree char *raw = NULL;
  g_autofree char *mapping = NULL;

  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM sources"), ==, 1);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM stars"), ==, 2);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM measurements"), ==, 2);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM rejected_rows"), ==, 1);
  sl_assert_close (sl_test_query_int (db, "SELECT parallax * 1000 FROM measurements WHERE star_id = 2"),
                   -400, 0, "negative parallax kept through the upgrade");
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM measurements WHERE ra IS NULL AND vmag IS NULL"), ==, 2);
  notes = sl_test_query_text (db, "SELECT notes FROM stars WHERE designation = 'OLD 2'");
  g_assert_cmpstr (notes, ==, "bright companion");
  raw = sl_test_query_text (db, "SELECT hex (raw) FROM rejected_rows WHERE line = 4");
  g_assert_cmpstr (raw, ==, "4F4C4420332C78");
  mapping = sl_test_query_text (db, "SELECT mapping ->> '$[1].unit' FROM sources WHERE id = 1");
  g_assert_cmpstr (mapping, ==, "mas");
}

/* Version 3's tables exist and work: a run, a derived row of it, a
 * hand-set value, and the rule of one active hand-set value per star and
 * quantity. */
static void
assert_version_3_tables_work (SlProject *project)
{
  g_autoptr (GError) error = NULL;
  sqlite3 *db = sl_project_db (project);

  g_assert_true (sl_project_exec (project,
                                  "INSERT INTO derivation_runs (id, started_at, who, software_version, parameters, methods) "
                                  "VALUES (1, '2026-02-01T10:00:00Z', 'test', '0', '', '{}');"
                                  "INSERT INTO derived (star_id, run_id, m_parallax, dist, dist_lo, dist_hi) "
                                  "VALUES (1, 1, 1, 80, 78.1, 82.0);"
                                  "INSERT INTO overrides (star_id, quantity, value, reason, set_by, set_at) "
                                  "VALUES (2, 'teff', 5800, 'from a spectrum', 'test', '2026-02-01T10:05:00Z');",
                                  &error));
  g_assert_no_error (error);
  sl_assert_close (sl_test_query_int (db, "SELECT dist * 10 FROM derived WHERE star_id = 1"), 800, 0, "a derived row");
  g_assert_cmpint (sl_test_query_int (db, "SELECT stale + flags + monte_carlo FROM derived WHERE star_id = 1"), ==, 0);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM overrides WHERE cleared_at IS NULL"), ==, 1);

  /* A derived row needs a recorded run and a star that exists. */
  g_assert_false (sl_project_exec (project, "INSERT INTO derived (star_id, run_id) VALUES (2, 99)", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_DATABASE);
  g_clear_error (&error);
  g_assert_false (sl_project_exec (project, "INSERT INTO derived (star_id, run_id) VALUES (99, 1)", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_DATABASE);
  g_clear_error (&error);

  /* One active override per star and quantity; a cleared one stays. */
  g_assert_false (sl_project_exec (project,
                                   "INSERT INTO overrides (star_id, quantity, value, reason, set_by, set_at) "
                                   "VALUES (2, 'teff', 5900, 'again', 'test', '2026-02-01T10:06:00Z')", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_DATABASE);
  g_clear_error (&error);
  g_assert_true (sl_project_exec (project,
                                  "UPDATE overrides SET cleared_by = 'test', cleared_at = '2026-02-01T10:07:00Z';"
                                  "INSERT INTO overrides (star_id, quantity, value, reason, set_by, set_at) "
                                  "VALUES (2, 'teff', 5900, 'again', 'test', '2026-02-01T10:08:00Z');",
                                  &error));
  g_assert_no_error (error);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM overrides WHERE star_id = 2"), ==, 2);
}

/* The last ledger entry records the upgrade from version FROM; the file
 * had ENTRIES entries before it. */
static void
assert_upgrade_logged (sqlite3 *db, int from, gint64 entries)
{
  g_autofree char *action = sl_test_query_text (db, "SELECT action FROM ledger ORDER BY id DESC LIMIT 1");
  g_autofree char *details = sl_test_query_text (db, "SELECT details FROM ledger ORDER BY id DESC LIMIT 1");
  g_autofree char *want_from = g_strdup_printf ("\"from\":%d,", from);
  g_autofree char *want_to = g_strdup_printf ("\"to\":%d}", sl_schema_current_version ());

  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM ledger"), ==, entries + 1);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM ledger WHERE action = 'upgrade'"), ==, 1);
  g_assert_cmpstr (action, ==, "upgrade");
  g_assert_nonnull (strstr (details, want_from));
  g_assert_nonnull (strstr (details, want_to));
}

/* tests/data/project-v1.sql is a frozen version-1 file with a source, two
 * stars, their measurements, a rejected row and two ledger entries. */
static void
test_migrate_from_v1 (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = open_fixture (f, "project-v1.sql");
  sqlite3 *db = sl_project_db (project);

  assert_schema_as_new (f, project);
  assert_version_1_rows (db);

  /* Version 2's tables exist and work. */
  g_assert_true (sl_project_exec (project,
                                  "INSERT INTO lists (name, created_by, created_at) VALUES ('a', 'b', 'c');"
                                  "INSERT INTO list_members (list_id, star_id) VALUES (1, 2);"
                                  "INSERT INTO settings VALUES ('distance.length_scale_pc', '1350');",
                                  &error));
  g_assert_no_error (error);

  assert_upgrade_logged (db, 1, 2);
  assert_version_3_tables_work (project);
}

/* tests/data/project-v2.sql is a frozen version-2 file: version 1's rows
 * and ledger, and a setting, a target list and its two members. */
static void
test_migrate_from_v2 (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = open_fixture (f, "project-v2.sql");
  sqlite3 *db = sl_project_db (project);
  g_autofree char *setting = NULL;
  g_autofree char *condition = NULL;
  g_autofree char *tags = NULL;
  g_autofree char *notes = NULL;

  assert_schema_as_new (f, project);
  assert_version_1_rows (db);

  /* Version 2's rows are kept. */
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM settings"), ==, 1);
  setting = sl_test_query_text (db, "SELECT value FROM settings WHERE key = 'distance.length_scale_pc'");
  g_assert_cmpstr (setting, ==, "1350");
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM lists"), ==, 1);
  condition = sl_test_query_text (db, "SELECT condition FROM lists WHERE name = 'Run 2026A'");
  g_assert_cmpstr (condition, ==, "parallax > 10");
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM list_members"), ==, 2);
  g_assert_cmpint (sl_test_query_int (db, "SELECT priority FROM list_members WHERE star_id = 1"), ==, 2);
  tags = sl_test_query_text (db, "SELECT tags FROM list_members WHERE star_id = 1");
  notes = sl_test_query_text (db, "SELECT notes FROM list_members WHERE star_id = 1");
  g_assert_cmpstr (tags, ==, "bright;priority");
  g_assert_cmpstr (notes, ==, "observe twice");

  assert_upgrade_logged (db, 2, 2);
  assert_version_3_tables_work (project);

  /* Version 2's constraints still hold: a member must be a star, and a
   * list's members go with it. */
  g_assert_false (sl_project_exec (project, "INSERT INTO list_members (list_id, star_id) VALUES (1, 99)", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_DATABASE);
  g_clear_error (&error);
  g_assert_true (sl_project_exec (project, "DELETE FROM lists WHERE id = 1", &error));
  g_assert_no_error (error);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM list_members"), ==, 0);
}

/* tests/data/project-v3.sql is a frozen version-3 file: version 2's rows,
 * a derivation run with two derived rows, and two values set by hand (one
 * cleared).  Version 4 adds the matches table. */
static void
test_migrate_from_v3 (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = open_fixture (f, "project-v3.sql");
  sqlite3 *db = sl_project_db (project);
  g_autofree char *parameters = NULL;
  g_autofree char *reason = NULL;
  g_autofree char *status = NULL;

  assert_schema_as_new (f, project);
  assert_version_1_rows (db);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM list_members"), ==, 2);

  /* Version 3's rows are kept. */
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM derivation_runs"), ==, 1);
  parameters = sl_test_query_text (db, "SELECT parameters FROM derivation_runs WHERE id = 1");
  g_assert_nonnull (strstr (parameters, "errors=linear"));
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM derived"), ==, 2);
  sl_assert_close (sl_test_query_int (db, "SELECT round (dist_hi * 1e6) FROM derived WHERE star_id = 1"),
                   82051282, 0, "a derived interval kept");
  g_assert_cmpint (sl_test_query_int (db, "SELECT stale * 10 + flags FROM derived WHERE star_id = 2"), ==, 14);
  g_assert_cmpint (sl_test_query_int (db, "SELECT count(*) FROM overrides"), ==, 2);
  reason = sl_test_query_text (db, "SELECT reason FROM overrides WHERE cleared_at IS NULL");
  g_assert_cmpstr (reason, ==, "cluster membership");
  assert_upgrade_logged (db, 3, 3);

  /* Version 4's table works: a row of a source joined to a star by
   * position, and it refuses a measurement that does not exist and a
   * status it does not know. */
  g_assert_true (sl_project_exec (project,
                                  "INSERT INTO matches (measurement_id, row_designation, status, "
                                  "separation_arcsec, epoch, radius_arcsec) "
                                  "VALUES (2, 'B 7', 'matched', 0.4, 2016.0, 1.0)", &error));
  g_assert_no_error (error);
  status = sl_test_query_text (db, "SELECT status || ' ' || candidates FROM matches");
  g_assert_cmpstr (status, ==, "matched []");
  g_assert_false (sl_project_exec (project,
                                   "INSERT INTO matches (measurement_id, row_designation, status, radius_arcsec) "
                                   "VALUES (99, 'x', 'matched', 1)", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_DATABASE);
  g_clear_error (&error);
  g_assert_false (sl_project_exec (project,
                                   "INSERT INTO matches (measurement_id, row_designation, status, radius_arcsec) "
                                   "VALUES (1, 'x', 'merged', 1)", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_DATABASE);
}

static void
test_hardening (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = NULL;
  g_autofree char *journal = NULL;
  sqlite3 *db;
  int defensive = -1;

  sl_project_close (sl_project_create (f->path, &error));
  project = sl_project_open (f->path, &error);
  g_assert_no_error (error);
  db = sl_project_db (project);

  g_assert_cmpint (sl_test_query_int (db, "PRAGMA foreign_keys"), ==, 1);
  g_assert_cmpint (sl_test_query_int (db, "PRAGMA trusted_schema"), ==, 0);
  journal = sl_test_query_text (db, "PRAGMA journal_mode");
  g_assert_cmpstr (journal, ==, "wal");
  sqlite3_db_config (db, SQLITE_DBCONFIG_DEFENSIVE, -1, &defensive);
  g_assert_cmpint (defensive, ==, 1);

  /* Defensive mode: the schema cannot be edited behind SQLite's back. */
  sl_project_exec (project, "PRAGMA writable_schema = ON", NULL);
  g_assert_false (sl_project_exec (project,
                                   "UPDATE sqlite_schema SET sql = '' WHERE name = 'stars'", NULL));

  /* Foreign keys are enforced: no measurement of a star that does not exist. */
  g_assert_false (sl_project_exec (project,
                                   "INSERT INTO measurements (star_id, source_id, line) VALUES (99, 99, 1)",
                                   &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_DATABASE);
}

/* ------------------------------------------------ untrusted files */

/* A project file changed by another program before it reaches us: BASE is
 * "new" (a project this build made) or a frozen fixture in tests/data;
 * EDIT runs in a plain SQLite connection; the open must be refused with
 * a message containing MESSAGE, and must not change the file. */
typedef struct {
  const char *name;
  const char *base;
  const char *edit;
  const char *message;   /* '@': the current schema version */
} CraftedCase;

static const CraftedCase crafted_cases[] = {
  { "trigger", "new",
    "CREATE TRIGGER steal AFTER INSERT ON ledger BEGIN DELETE FROM measurements; END",
    "Starledger does not make: the trigger 'steal'" },
  { "view", "new",
    "CREATE VIEW bright AS SELECT * FROM measurements WHERE vmag < 6",
    "Starledger does not make: the view 'bright'" },
  { "extra-table", "new", "CREATE TABLE notes (t TEXT)",
    "Starledger does not make: the table 'notes'" },
  { "extra-index", "new", "CREATE INDEX by_vmag ON measurements (vmag)",
    "Starledger does not make: the index 'by_vmag'" },
  { "extra-column", "new", "ALTER TABLE stars ADD COLUMN secret TEXT",
    "the table 'stars' is not as schema version @ defines it" },
  { "missing-table", "new", "DROP TABLE overrides",
    "the table 'overrides' of schema version @ is missing" },
  { "missing-index", "new", "DROP INDEX sources_by_sha256",
    "the index 'sources_by_sha256' of schema version @ is missing" },
  { "table-altered", "new",
    "DROP TABLE settings; CREATE TABLE settings (key TEXT PRIMARY KEY, value ANY) STRICT",
    "the table 'settings' is not as schema version @ defines it" },
  { "check-added", "new",
    "DROP INDEX overrides_active; DROP TABLE overrides;"
    "CREATE TABLE overrides (id INTEGER PRIMARY KEY, star_id INTEGER NOT NULL REFERENCES stars (id),"
    " quantity TEXT NOT NULL, value REAL NOT NULL CHECK (value > 0), lo REAL, hi REAL, reason TEXT NOT NULL,"
    " set_by TEXT NOT NULL, set_at TEXT NOT NULL, cleared_by TEXT, cleared_at TEXT) STRICT;"
    "CREATE UNIQUE INDEX overrides_active ON overrides (star_id, quantity) WHERE cleared_at IS NULL",
    "the table 'overrides' is not as schema version @ defines it" },
  /* An old file is checked against its own version, before the upgrade. */
  { "old-version-trigger", "project-v1.sql",
    "CREATE TRIGGER t AFTER INSERT ON stars BEGIN SELECT 1; END",
    "Starledger does not make: the trigger 't' (schema version 1)" },
  { "old-version-later-table", "project-v1.sql",
    "CREATE TABLE settings (key TEXT PRIMARY KEY, value TEXT NOT NULL) STRICT",
    "Starledger does not make: the table 'settings' (schema version 1)" },
  { "old-version-missing-table", "project-v2.sql", "DROP TABLE list_members",
    "the table 'list_members' of schema version 2 is missing" },
};

static void
test_open_crafted (Fixture *f, gconstpointer data)
{
  const CraftedCase *c = data;
  g_autoptr (GError) error = NULL;
  g_autofree char *before = NULL;
  g_autofree char *after = NULL;
  gsize before_len, after_len;
  gint64 version;
  sqlite3 *db;

  if (strcmp (c->base, "new") == 0)
    sl_project_close (sl_project_create (f->path, &error));
  else
    {
      g_autofree char *fixture = g_build_filename (g_getenv ("STARLEDGER_SOURCE_DIR"), "tests",
                                                   "data", c->base, NULL);
      g_autofree char *sql = NULL;

      g_assert_true (g_file_get_contents (fixture, &sql, NULL, NULL));
      run_raw_sql (f->path, sql);
    }
  g_assert_no_error (error);
  run_raw_sql (f->path, c->edit);
  g_assert_true (g_file_get_contents (f->path, &before, &before_len, NULL));

  g_assert_null (sl_project_open (f->path, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_UNTRUSTED);
  g_assert_true (g_str_has_prefix (error->message, f->path));
  {
    g_autofree char *current = g_strdup_printf ("%d", sl_schema_current_version ());
    g_auto (GStrv) parts = g_strsplit (c->message, "@", -1);
    g_autofree char *want = g_strjoinv (current, parts);

    if (strstr (error->message, want) == NULL)
      g_error ("message: want one containing \"%s\", got \"%s\"", want, error->message);
  }

  /* Refused before anything was written: not upgraded, not a byte changed. */
  g_assert_true (g_file_get_contents (f->path, &after, &after_len, NULL));
  g_assert_cmpmem (after, after_len, before, before_len);
  g_assert_cmpint (sqlite3_open (f->path, &db), ==, SQLITE_OK);
  version = sl_test_query_int (db, "PRAGMA user_version");
  sqlite3_close (db);
  g_assert_cmpint (version, ==, strcmp (c->base, "new") == 0 ? sl_schema_current_version ()
                                : c->base[strlen ("project-v")] - '0');
}

/* What SQLite itself adds (ANALYZE's statistics) is not a foreign object,
 * and an untouched project of every older version opens. */
static void
test_open_statistics_allowed (Fixture *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = NULL;

  sl_project_close (sl_project_create (f->path, &error));
  g_assert_no_error (error);
  run_raw_sql (f->path, "ANALYZE");
  project = sl_project_open (f->path, &error);
  g_assert_no_error (error);
  g_assert_nonnull (project);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

#define ADD(path, func) g_test_add (path, Fixture, NULL, fixture_set_up, func, fixture_tear_down)
  ADD ("/project/create/new", test_create);
  ADD ("/project/create/refuses-existing-file", test_create_refuses_existing);
  ADD ("/project/open/reopen", test_reopen);
  ADD ("/project/open/missing-file", test_open_missing);
  ADD ("/project/open/refuses-foreign-sqlite", test_open_foreign_sqlite);
  ADD ("/project/open/refuses-empty-sqlite", test_open_empty_sqlite);
  ADD ("/project/open/refuses-text-file", test_open_text_file);
  ADD ("/project/open/refuses-newer-schema", test_open_newer_schema);
  ADD ("/project/migrate/from-version-1", test_migrate_from_v1);
  ADD ("/project/migrate/from-version-2", test_migrate_from_v2);
  ADD ("/project/migrate/from-version-3", test_migrate_from_v3);
  ADD ("/project/hardening", test_hardening);
  ADD ("/project/untrusted/statistics-allowed", test_open_statistics_allowed);
  for (gsize i = 0; i < G_N_ELEMENTS (crafted_cases); i++)
    {
      g_autofree char *path = g_strdup_printf ("/project/untrusted/%s", crafted_cases[i].name);

      g_test_add (path, Fixture, &crafted_cases[i], fixture_set_up, test_open_crafted,
                  fixture_tear_down);
    }
#undef ADD

  return g_test_run ();
}
