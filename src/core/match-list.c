/* match-list.c: counting and listing the matches table (see
 * match-list.h).
 *
 * Each status is read in measurement id order, which is the primary key
 * of matches (and import order), so a page stops after LIMIT rows
 * without sorting the table; only the scan for the rarer statuses reads
 * through it.  The candidates' JSON is turned into words by SQLite's
 * JSON functions, nearest first as stored.
 */
#include "match-list.h"

#include <string.h>


gboolean
sl_match_counts (SlProject *project, SlMatchCounts *counts, GError **error)
{
  /* One pass without grouping: a GROUP BY sorts a million rows first. */
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "SELECT total (status = 'matched'), total (status = 'ambiguous'), "
                                           "total (status = 'split') FROM matches", error);
  int rc;

  memset (counts, 0, sizeof *counts);
  if (stmt == NULL)
    return FALSE;
  rc = sqlite3_step (stmt);
  if (rc == SQLITE_ROW)
    {
      counts->matched = sqlite3_column_int64 (stmt, 0);
      counts->ambiguous = sqlite3_column_int64 (stmt, 1);
      counts->split = sqlite3_column_int64 (stmt, 2);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_ROW)
    {
      sl_project_set_db_error (project, error, "matches");
      return FALSE;
    }
  return TRUE;
}

static void
match_list_row_clear (gpointer data)
{
  SlMatchListRow *row = data;

  sl_match_info_clear (&row->info);
  g_free (row->candidates);
  g_strfreev (row->candidate_ids);
}

/* A LIKE pattern for "contains TEXT", with % _ and \ taken literally. */
static char *
contains_pattern (const char *text)
{
  GString *pattern = g_string_new ("%");

  for (const char *p = text; *p; p++)
    {
      if (*p == '%' || *p == '_' || *p == '\\')
        g_string_append_c (pattern, '\\');
      g_string_append_c (pattern, *p);
    }
  g_string_append_c (pattern, '%');
  return g_string_free (pattern, FALSE);
}

/* Reads up to LIMIT - found->len records of STATUS into FOUND; *MORE if
 * there were more. */
static gboolean
list_status (SlProject *project, const char *status, const char *pattern, guint limit, GArray *found,
             gboolean *more, GError **error)
{
  /* The stars whose designation matches are found once (a scan of the
   * designation index), then the matches of their rows by the row id:
   * joining each of a million matches to its star to compare names
   * would take seconds. */
  sqlite3_stmt *stmt = sl_project_prepare (project,
    "WITH hit (id) AS MATERIALIZED (SELECT id FROM stars WHERE ?2 IS NOT NULL "
    "                                AND designation LIKE ?2 ESCAPE '\\') "
    "SELECT x.status, src.id, src.name, src.file_name, m.line, x.row_designation, "
    "x.separation_arcsec, x.epoch, x.radius_arcsec, x.candidates, x.reason, "
    "old.designation, x.split_by, x.split_at, cur.designation, cur.id, "
    "(SELECT group_concat(printf ('%s at %.3f arcsec', c.value ->> '$.designation', "
    "                             c.value ->> '$.separation_arcsec'), ', ') "
    " FROM json_each (x.candidates) AS c), "
    "(SELECT group_concat(c.value ->> '$.designation', char(31)) FROM json_each (x.candidates) AS c) "
    "FROM matches x JOIN measurements m ON m.id = x.measurement_id "
    "JOIN sources src ON src.id = m.source_id "
    "JOIN stars cur ON cur.id = m.star_id "
    "LEFT JOIN stars old ON old.id = x.split_from "
    "WHERE x.status = ?1 AND (?2 IS NULL OR x.row_designation LIKE ?2 ESCAPE '\\' "
    "                         OR x.measurement_id IN (SELECT id FROM measurements "
    "                                                 WHERE star_id IN (SELECT id FROM hit)) "
    "                         OR x.split_from IN (SELECT id FROM hit)) "
    "ORDER BY x.measurement_id LIMIT ?3", error);
  guint want = limit - found->len;
  int rc;

  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_text (stmt, 1, status, -1, SQLITE_STATIC);
  if (pattern)
    sqlite3_bind_text (stmt, 2, pattern, -1, SQLITE_STATIC);
  sqlite3_bind_int64 (stmt, 3, (gint64) want + 1);
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      SlMatchListRow row = { 0 };
      const char *ids = (const char *) sqlite3_column_text (stmt, 17);

      if (found->len == limit)
        {
          *more = TRUE;
          break;
        }
      row.info.status = sl_column_text_dup (stmt, 0);
      row.info.source_id = sqlite3_column_int64 (stmt, 1);
      sl_column_texts_dup (stmt, 2, &row.info.source_name, &row.info.file_name, NULL);
      row.info.line = (guint) sqlite3_column_int64 (stmt, 4);
      row.info.row_designation = sl_column_text_dup (stmt, 5);
      row.info.separation = sl_column_double_or_nan (stmt, 6);
      row.info.epoch = sl_column_double_or_nan (stmt, 7);
      row.info.radius = sqlite3_column_double (stmt, 8);
      sl_column_texts_dup (stmt, 9, &row.info.candidates, &row.info.reason, &row.info.other_star,
                           &row.info.split_by, &row.info.split_at, &row.info.star, NULL);
      row.star_id = sqlite3_column_int64 (stmt, 15);
      row.candidates = g_strdup (sqlite3_column_text (stmt, 16) ? (const char *) sqlite3_column_text (stmt, 16) : "");
      row.candidate_ids = ids && *ids ? g_strsplit (ids, "\x1f", -1) : g_new0 (char *, 1);
      g_array_append_val (found, row);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE && rc != SQLITE_ROW)
    {
      sl_project_set_db_error (project, error, "matches");
      return FALSE;
    }
  return TRUE;
}

GArray *
sl_match_list (SlProject *project, const char *search, guint limit, gboolean *more, GError **error)
{
  static const char *const order[] = { "ambiguous", "matched", "split" };
  g_autofree char *pattern = search && *search ? contains_pattern (search) : NULL;
  GArray *found = g_array_new (FALSE, TRUE, sizeof (SlMatchListRow));

  g_array_set_clear_func (found, match_list_row_clear);
  *more = FALSE;
  /* One snapshot for the three reads. */
  if (!sl_project_exec (project, "BEGIN", error))
    {
      g_array_unref (found);
      return NULL;
    }
  for (guint i = 0; i < G_N_ELEMENTS (order) && !*more; i++)
    if (!list_status (project, order[i], pattern, limit, found, more, error))
      {
        sl_project_rollback (project);
        g_array_unref (found);
        return NULL;
      }
  sl_project_rollback (project);
  return found;
}
