/* ledger.c: appending to and reading the audit log. */
#include "ledger.h"

#include "util.h"

gboolean
sl_ledger_append (SlProject *project, const char *action, const char *summary,
                  const char *details, GError **error)
{
  g_autofree char *now = sl_now_utc ();
  sqlite3_stmt *stmt;
  gboolean ok;

  stmt = sl_project_prepare (project,
                             "INSERT INTO ledger (at, who, action, summary, details) "
                             "VALUES (?, ?, ?, ?, json(?))", error);
  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_text (stmt, 1, now, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 2, sl_current_user (), -1, SQLITE_TRANSIENT);
  sqlite3_bind_text (stmt, 3, action, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 4, summary, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 5, details ? details : "{}", -1, SQLITE_STATIC);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  if (!ok)
    sl_project_set_db_error (project, error, "ledger");
  sqlite3_finalize (stmt);
  return ok;
}

GPtrArray *
sl_ledger_read (SlProject *project, GError **error)
{
  g_autoptr (GPtrArray) entries = g_ptr_array_new_with_free_func ((GDestroyNotify) sl_ledger_entry_free);
  sqlite3_stmt *stmt;
  int rc;

  stmt = sl_project_prepare (project,
                             "SELECT id, at, who, action, summary, details FROM ledger ORDER BY id",
                             error);
  if (stmt == NULL)
    return NULL;
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      SlLedgerEntry *entry = g_new0 (SlLedgerEntry, 1);

      entry->id = sqlite3_column_int64 (stmt, 0);
      sl_column_texts_dup (stmt, 1, &entry->at, &entry->who, &entry->action, &entry->summary,
                           &entry->details, NULL);
      g_ptr_array_add (entries, entry);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "ledger");
      return NULL;
    }
  return g_steal_pointer (&entries);
}

void
sl_ledger_entry_free (SlLedgerEntry *entry)
{
  if (entry == NULL)
    return;
  g_free (entry->at);
  g_free (entry->who);
  g_free (entry->action);
  g_free (entry->summary);
  g_free (entry->details);
  g_free (entry);
}
