/* summary.c: counting what a project holds. */
#include "summary.h"

static gboolean
count_rows (SlProject *project, const char *table, gint64 *count, GError **error)
{
  g_autofree char *sql = g_strdup_printf ("SELECT count(*) FROM %s", table);   /* TABLE may carry a WHERE */
  sqlite3_stmt *stmt = sl_project_prepare (project, sql, error);
  gboolean ok;

  if (stmt == NULL)
    return FALSE;
  ok = sqlite3_step (stmt) == SQLITE_ROW;
  *count = sqlite3_column_int64 (stmt, 0);
  if (!ok)
    sl_project_set_db_error (project, error, table);
  sqlite3_finalize (stmt);
  return ok;
}

static void
source_info_free (SlSourceInfo *info)
{
  g_free (info->name);
  g_free (info->file_name);
  g_free (info->sha256);
  g_free (info->imported_by);
  g_free (info->imported_at);
  g_free (info->delimiter);
  g_free (info->mapping);
  g_free (info);
}

static gboolean
read_sources (SlProject *project, GPtrArray *sources, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "SELECT id, name, file_name, sha256, imported_by, imported_at, "
                                           "delimiter, mapping, rows_accepted, rows_rejected "
                                           "FROM sources ORDER BY id", error);
  int rc;

  if (stmt == NULL)
    return FALSE;
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      SlSourceInfo *info = g_new0 (SlSourceInfo, 1);

      info->id = sqlite3_column_int64 (stmt, 0);
      sl_column_texts_dup (stmt, 1, &info->name, &info->file_name, &info->sha256, &info->imported_by,
                           &info->imported_at, &info->delimiter, &info->mapping, NULL);
      info->rows_accepted = sqlite3_column_int64 (stmt, 8);
      info->rows_rejected = sqlite3_column_int64 (stmt, 9);
      g_ptr_array_add (sources, info);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    sl_project_set_db_error (project, error, "sources");
  return rc == SQLITE_DONE;
}

SlProjectSummary *
sl_project_summary (SlProject *project, GError **error)
{
  g_autoptr (SlProjectSummary) summary = g_new0 (SlProjectSummary, 1);

  summary->sources = g_ptr_array_new_with_free_func ((GDestroyNotify) source_info_free);
  summary->schema_version = sl_project_schema_version (project);
  if (!count_rows (project, "stars", &summary->n_stars, error)
      || !count_rows (project, "measurements", &summary->n_measurements, error)
      || !count_rows (project, "rejected_rows", &summary->n_rejected, error)
      || !count_rows (project, "ledger", &summary->n_ledger, error)
      || !count_rows (project, "derived", &summary->n_derived, error)
      || !count_rows (project, "derived WHERE stale", &summary->n_stale, error)
      || !count_rows (project, "derivation_runs", &summary->n_runs, error)
      || !read_sources (project, summary->sources, error))
    return NULL;
  return g_steal_pointer (&summary);
}

void
sl_project_summary_free (SlProjectSummary *summary)
{
  if (summary == NULL)
    return;
  g_ptr_array_unref (summary->sources);
  g_free (summary);
}
