/* schema.c: the SQL of each schema version, oldest first.
 *
 * Conventions: STRICT tables, canonical units in column names' comments,
 * timestamps as ISO 8601 UTC text, JSON for structured details.  Raw
 * measurements are never updated after import; everything derived lives
 * in tables of its own so it can be recomputed and compared.
 */
#include "schema.h"

#include <glib/gi18n.h>
#include <string.h>

#include "sl-error.h"

/* Version 1: stars, import sources, measurements, rejected rows, ledger. */
static const char migration_to_1[] =
  "CREATE TABLE sources ("
  "  id             INTEGER PRIMARY KEY,"
  "  name           TEXT NOT NULL,"      /* --source-name, or the file's name */
  "  file_name      TEXT NOT NULL,"      /* base name of the imported file */
  "  file_path      TEXT NOT NULL,"      /* as given on import */
  "  sha256         TEXT NOT NULL,"
  "  size_bytes     INTEGER NOT NULL,"
  "  imported_by    TEXT NOT NULL,"
  "  imported_at    TEXT NOT NULL,"
  "  delimiter      TEXT NOT NULL,"
  "  mapping        TEXT NOT NULL,"      /* JSON: [{field, column, unit}] */
  "  missing_tokens TEXT NOT NULL,"      /* JSON array of strings */
  "  epoch          REAL,"               /* --epoch for rows without one, Julian year */
  "  rows_read      INTEGER NOT NULL DEFAULT 0,"
  "  rows_accepted  INTEGER NOT NULL DEFAULT 0,"
  "  rows_rejected  INTEGER NOT NULL DEFAULT 0"
  ") STRICT;"
  "CREATE INDEX sources_by_sha256 ON sources (sha256);"
  "CREATE TABLE stars ("
  "  id              INTEGER PRIMARY KEY,"
  "  designation     TEXT NOT NULL UNIQUE,"
  "  notes           TEXT NOT NULL DEFAULT '',"
  "  first_source_id INTEGER NOT NULL REFERENCES sources (id)"
  ") STRICT;"
  /* One wide row per star per source, in canonical units (vocabulary.c). */
  "CREATE TABLE measurements ("
  "  id           INTEGER PRIMARY KEY,"
  "  star_id      INTEGER NOT NULL REFERENCES stars (id),"
  "  source_id    INTEGER NOT NULL REFERENCES sources (id),"
  "  line         INTEGER NOT NULL,"     /* first line of the row in the source file */
  "  ra REAL, ra_err REAL, dec REAL, dec_err REAL,"   /* deg, deg, mas (on sky), mas */
  "  epoch REAL,"                                      /* Julian year */
  "  parallax REAL, parallax_err REAL,"                /* mas */
  "  pmra REAL, pmra_err REAL, pmdec REAL, pmdec_err REAL," /* mas/yr, pmra times cos dec */
  "  vmag REAL, vmag_err REAL, bmag REAL, bmag_err REAL,"   /* mag */
  "  bv REAL, bv_err REAL, ebv REAL, ebv_err REAL,"         /* mag */
  "  vrad REAL, vrad_err REAL,"                              /* km/s */
  "  sptype TEXT,"
  "  UNIQUE (star_id, source_id)"       /* also the index from a star to its rows */
  ") STRICT;"
  "CREATE TABLE rejected_rows ("
  "  id          INTEGER PRIMARY KEY,"
  "  source_id   INTEGER NOT NULL REFERENCES sources (id),"
  "  line        INTEGER NOT NULL,"
  "  column_name TEXT,"                  /* NULL when the row as a whole is at fault */
  "  reason      TEXT NOT NULL,"
  "  raw         BLOB NOT NULL"          /* the row's bytes as read, valid UTF-8 or not */
  ") STRICT;"
  "CREATE INDEX rejected_rows_by_source ON rejected_rows (source_id, line);"
  /* The audit log: appended to, never updated. */
  "CREATE TABLE ledger ("
  "  id      INTEGER PRIMARY KEY,"
  "  at      TEXT NOT NULL,"
  "  who     TEXT NOT NULL,"
  "  action  TEXT NOT NULL,"
  "  summary TEXT NOT NULL,"
  "  details TEXT NOT NULL DEFAULT '{}'"
  ") STRICT;";

/* Version 2: project settings (method parameters, policies) and named
 * target lists with per-star priority, tags and notes. */
static const char migration_to_2[] =
  "CREATE TABLE settings ("
  "  key   TEXT PRIMARY KEY,"
  "  value TEXT NOT NULL"
  ") STRICT;"
  "CREATE TABLE lists ("
  "  id          INTEGER PRIMARY KEY,"
  "  name        TEXT NOT NULL UNIQUE,"
  "  description TEXT NOT NULL DEFAULT '',"
  "  condition   TEXT,"                  /* the condition it was built from, if any */
  "  created_by  TEXT NOT NULL,"
  "  created_at  TEXT NOT NULL"
  ") STRICT;"
  "CREATE TABLE list_members ("
  "  list_id  INTEGER NOT NULL REFERENCES lists (id) ON DELETE CASCADE,"
  "  star_id  INTEGER NOT NULL REFERENCES stars (id),"
  "  priority INTEGER NOT NULL DEFAULT 0,"
  "  tags     TEXT NOT NULL DEFAULT '',"
  "  notes    TEXT NOT NULL DEFAULT '',"
  "  PRIMARY KEY (list_id, star_id)"
  ") STRICT, WITHOUT ROWID;";

/* Version 3: derivation runs, one wide row of derived values per star,
 * and values set by hand.  Column names are the vocabulary's; every
 * number q has q_lo and q_hi, the bounds of its 68% interval (NULL: none). */
static const char migration_to_3[] =
  "CREATE TABLE derivation_runs ("
  "  id               INTEGER PRIMARY KEY,"
  "  started_at       TEXT NOT NULL,"
  "  finished_at      TEXT,"
  "  who              TEXT NOT NULL,"
  "  software_version TEXT NOT NULL,"
  "  parameters       TEXT NOT NULL,"      /* GLib key file (derive.h SlDeriveParams) */
  "  methods          TEXT NOT NULL,"      /* JSON: {module: version} */
  "  stars            INTEGER NOT NULL DEFAULT 0,"
  "  duration_s       REAL"
  ") STRICT;"
  "CREATE TABLE derived ("
  "  star_id        INTEGER PRIMARY KEY REFERENCES stars (id),"
  "  run_id         INTEGER NOT NULL REFERENCES derivation_runs (id),"
  "  stale          INTEGER NOT NULL DEFAULT 0,"   /* inputs or overrides changed since */
  "  flags          INTEGER NOT NULL DEFAULT 0,"   /* derive.h SlFlag bits */
  "  monte_carlo    INTEGER NOT NULL DEFAULT 0,"   /* intervals are draw percentiles */
  /* The measurements rows each group of inputs came from. */
  "  m_position INTEGER, m_parallax INTEGER, m_pm INTEGER, m_vmag INTEGER, m_bmag INTEGER,"
  "  m_bv INTEGER, m_ebv INTEGER, m_vrad INTEGER, m_sptype INTEGER,"
  "  plx_snr REAL, plx_snr_lo REAL, plx_snr_hi REAL,"
  "  dist REAL, dist_lo REAL, dist_hi REAL,"
  "  distmod REAL, distmod_lo REAL, distmod_hi REAL,"
  "  av REAL, av_lo REAL, av_hi REAL,"
  "  bv0 REAL, bv0_lo REAL, bv0_hi REAL,"
  "  absmag REAL, absmag_lo REAL, absmag_hi REAL,"
  "  teff REAL, teff_lo REAL, teff_hi REAL,"
  "  bc REAL, bc_lo REAL, bc_hi REAL,"
  "  mbol REAL, mbol_lo REAL, mbol_hi REAL,"
  "  lum REAL, lum_lo REAL, lum_hi REAL,"
  "  radius REAL, radius_lo REAL, radius_hi REAL,"
  "  vtan REAL, vtan_lo REAL, vtan_hi REAL,"
  "  elon REAL, elon_lo REAL, elon_hi REAL,"
  "  elat REAL, elat_lo REAL, elat_hi REAL,"
  "  ellipse_a REAL, ellipse_a_lo REAL, ellipse_a_hi REAL,"
  "  ellipse_b REAL, ellipse_b_lo REAL, ellipse_b_hi REAL,"
  "  ellipse_pa REAL, ellipse_pa_lo REAL, ellipse_pa_hi REAL,"
  "  spclass TEXT,"
  /* The 1-sigma error ellipse in log Teff - log L, for the HR diagram. */
  "  logt_sigma REAL, logl_sigma REAL, logt_logl_corr REAL"
  ") STRICT;"
  "CREATE INDEX derived_by_run ON derived (run_id);"
  "CREATE TABLE overrides ("
  "  id         INTEGER PRIMARY KEY,"
  "  star_id    INTEGER NOT NULL REFERENCES stars (id),"
  "  quantity   TEXT NOT NULL,"
  "  value      REAL NOT NULL,"
  "  lo         REAL,"
  "  hi         REAL,"
  "  reason     TEXT NOT NULL,"
  "  set_by     TEXT NOT NULL,"
  "  set_at     TEXT NOT NULL,"
  "  cleared_by TEXT,"                     /* history is kept: a cleared override stays */
  "  cleared_at TEXT"
  ") STRICT;"
  "CREATE UNIQUE INDEX overrides_active ON overrides (star_id, quantity) WHERE cleared_at IS NULL;";

/* Version 4: how each row imported with --match-radius was joined to a
 * star by position: the star it joined (or was given when no star or
 * more than one could be chosen), its separation at the common epoch, the
 * stars within the radius, and whether the match was later undone. */
static const char migration_to_4[] =
  "CREATE TABLE matches ("
  /* Keyed by the row itself: one B-tree, appended to in import order. */
  "  measurement_id    INTEGER PRIMARY KEY REFERENCES measurements (id),"
  "  row_designation   TEXT NOT NULL,"      /* the row's own id in its file */
  /* matched: the row is part of the star its measurement belongs to;
   * ambiguous: a star of its own; split: no longer part of split_from. */
  "  status            TEXT NOT NULL CHECK (status IN ('matched', 'ambiguous', 'split')),"
  "  separation_arcsec REAL,"               /* to the nearest star, at the common epoch */
  "  epoch             REAL,"               /* the common epoch, Julian year; NULL: none known */
  "  radius_arcsec     REAL NOT NULL,"
  "  candidates        TEXT NOT NULL DEFAULT '[]',"  /* JSON [{star_id, designation, separation_arcsec}] */
  "  reason            TEXT NOT NULL DEFAULT '',"    /* why ambiguous, in words */
  "  split_by          TEXT,"
  "  split_at          TEXT,"
  "  split_from        INTEGER REFERENCES stars (id)" /* split: the star it had joined */
  ") STRICT;"
  /* Few rows are ever split: a partial index finds them from the star
   * they left without slowing every import down. */
  "CREATE INDEX matches_split_from ON matches (split_from) WHERE split_from IS NOT NULL;";

static const char *const migrations[] = {
  migration_to_1,
  migration_to_2,
  migration_to_3,
  migration_to_4,
};

int
sl_schema_current_version (void)
{
  return (int) G_N_ELEMENTS (migrations);
}

/* Runs the migrations from version FROM up to version TO. */
static gboolean
run_migrations (sqlite3 *db, int from, int to, GError **error)
{
  char *errmsg = NULL;

  for (int version = from; version < to; version++)
    {
      if (sqlite3_exec (db, migrations[version], NULL, NULL, &errmsg) != SQLITE_OK)
        {
          g_set_error (error, SL_ERROR, SL_ERROR_DATABASE,
                       _("cannot upgrade the project to schema version %d: %s"),
                       version + 1, errmsg);
          sqlite3_free (errmsg);
          return FALSE;
        }
    }
  return TRUE;
}

gboolean
sl_schema_migrate (sqlite3 *db, int from, GError **error)
{
  char *errmsg = NULL;
  char *pragma;

  g_return_val_if_fail (from >= 0 && from <= sl_schema_current_version (), FALSE);

  if (!run_migrations (db, from, sl_schema_current_version (), error))
    return FALSE;

  pragma = g_strdup_printf ("PRAGMA user_version = %d", sl_schema_current_version ());
  if (sqlite3_exec (db, pragma, NULL, NULL, &errmsg) != SQLITE_OK)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, "%s", errmsg);
      sqlite3_free (errmsg);
      g_free (pragma);
      return FALSE;
    }
  g_free (pragma);
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* The expected schema                                                */

/* SQL text with every run of blanks made one space and the blanks next
 * to punctuation dropped: the text SQLite keeps is the statement as
 * written, and a file written by an older build (or rebuilt from a dump)
 * may differ from ours in layout only. */
static char *
normalise_sql (const char *sql)
{
  GString *out = g_string_new (NULL);
  gboolean blank = FALSE;

  for (const char *p = sql ? sql : ""; *p; p++)
    {
      if (g_ascii_isspace (*p))
        {
          blank = TRUE;
          continue;
        }
      if (blank && out->len > 0 && !strchr ("(),;", *p)
          && !strchr ("(),;", out->str[out->len - 1]))
        g_string_append_c (out, ' ');
      blank = FALSE;
      g_string_append_c (out, *p);
    }
  return g_string_free (out, FALSE);
}

/* sqlite_schema of the "main" database of DB: name -> "type|table|sql"
 * (normalised).  SQLite's statistics tables (ANALYZE) are left out. */
static GHashTable *
read_schema (sqlite3 *db)
{
  GHashTable *objects = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, g_free);
  sqlite3_stmt *stmt;

  if (sqlite3_prepare_v2 (db, "SELECT type, name, tbl_name, sql FROM main.sqlite_schema "
                              "WHERE name NOT LIKE 'sqlite\\_stat%' ESCAPE '\\'",
                          -1, &stmt, NULL) != SQLITE_OK)
    {
      g_hash_table_unref (objects);
      return NULL;
    }
  while (sqlite3_step (stmt) == SQLITE_ROW)
    {
      g_autofree char *sql = normalise_sql ((const char *) sqlite3_column_text (stmt, 3));

      g_hash_table_insert (objects, g_strdup ((const char *) sqlite3_column_text (stmt, 1)),
                           g_strdup_printf ("%s|%s|%s", sqlite3_column_text (stmt, 0),
                                            sqlite3_column_text (stmt, 2), sql));
    }
  sqlite3_finalize (stmt);
  return objects;
}

/* The schema the migrations make for VERSION, built once per version in
 * a database in memory: the migrations' own SQL is the reference, so a
 * new version is covered as soon as its migration is written. */
static GHashTable *
expected_schema (int version)
{
  static GHashTable *cache[G_N_ELEMENTS (migrations) + 1];
  G_LOCK_DEFINE_STATIC (cache);
  GHashTable *objects = NULL;

  G_LOCK (cache);
  if (cache[version] == NULL)
    {
      sqlite3 *db = NULL;

      if (sqlite3_open_v2 (":memory:", &db, SQLITE_OPEN_READWRITE | SQLITE_OPEN_MEMORY, NULL) == SQLITE_OK
          && run_migrations (db, 0, version, NULL))
        cache[version] = read_schema (db);
      sqlite3_close (db);
    }
  if (cache[version] != NULL)
    objects = g_hash_table_ref (cache[version]);
  G_UNLOCK (cache);
  return objects;
}

/* "table", "index", "trigger" or "view" as a reader says it. */
static const char *
kind_name (const char *description)
{
  if (g_str_has_prefix (description, "table|"))
    return _("table");
  if (g_str_has_prefix (description, "index|"))
    return _("index");
  if (g_str_has_prefix (description, "trigger|"))
    return _("trigger");
  if (g_str_has_prefix (description, "view|"))
    return _("view");
  return _("schema object");
}

gboolean
sl_schema_check (sqlite3 *db, int version, const char *path, GError **error)
{
  g_autoptr (GHashTable) want = NULL;
  g_autoptr (GHashTable) got = NULL;
  g_autoptr (GList) names = NULL;
  GHashTableIter iter;
  gpointer name, description;

  g_return_val_if_fail (version >= 0 && version <= sl_schema_current_version (), FALSE);

  want = expected_schema (version);
  got = read_schema (db);
  if (want == NULL || got == NULL)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, _("%s: cannot read the file's schema: %s"),
                   path, sqlite3_errmsg (db));
      return FALSE;
    }

  /* Sorted, so that the message names the same object every time. */
  names = g_list_sort (g_hash_table_get_keys (got), (GCompareFunc) strcmp);
  for (GList *l = names; l != NULL; l = l->next)
    {
      const char *have = g_hash_table_lookup (got, l->data);
      const char *expected = g_hash_table_lookup (want, l->data);

      if (expected == NULL)
        {
          g_set_error (error, SL_ERROR, SL_ERROR_UNTRUSTED,
                       _("%s: refused: the file holds something Starledger does not make: the %s '%s' "
                         "(schema version %d); a project file from elsewhere may hide code "
                         "in its schema"),
                       path, kind_name (have), (const char *) l->data, version);
          return FALSE;
        }
      if (strcmp (have, expected) != 0)
        {
          g_set_error (error, SL_ERROR, SL_ERROR_UNTRUSTED,
                       _("%s: refused: the %s '%s' is not as schema version %d defines it "
                         "(the file was altered outside Starledger)"),
                       path, kind_name (have), (const char *) l->data, version);
          return FALSE;
        }
    }
  g_hash_table_iter_init (&iter, want);
  while (g_hash_table_iter_next (&iter, &name, &description))
    if (!g_hash_table_contains (got, name))
      {
        g_set_error (error, SL_ERROR, SL_ERROR_UNTRUSTED,
                     _("%s: refused: the %s '%s' of schema version %d is missing "
                       "(the file was altered outside Starledger, or is damaged)"),
                     path, kind_name (description), (const char *) name, version);
        return FALSE;
      }
  return TRUE;
}
