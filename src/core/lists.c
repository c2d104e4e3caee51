/* lists.c: named target lists in the lists and list_members tables
 * (schema.c, version 2).
 *
 * Contents:
 *   names and look-ups .. check_name, find_list, unknown_list
 *   making lists ........ sl_list_create_from_condition, sl_list_create,
 *                         sl_list_create_with_stars, sl_list_count_matching
 *   members ............. sl_list_add_stars, sl_list_remove_stars, sl_list_set_member
 *   deleting ............ sl_list_delete
 *   reading ............. sl_list_names, sl_list_star_ids, sl_list_infos, sl_list_members
 */
#include "inputs.h"
#include "lists.h"

#include <inttypes.h>
#include <glib/gi18n.h>
#include <string.h>

#include "condition.h"
#include "ledger.h"
#include "sl-error.h"
#include "util.h"

/* ------------------------------------------------------------------ */
/* Names and look-ups                                                 */

static gboolean
check_name (const char *name, GError **error)
{
  gboolean ok = name != NULL && g_utf8_validate (name, -1, NULL) && *name != '\0';

  for (const char *p = name; ok && *p; p = g_utf8_next_char (p))
    if (g_unichar_iscntrl (g_utf8_get_char (p)))
      ok = FALSE;
  if (ok)
    {
      const char *last = g_utf8_find_prev_char (name, name + strlen (name));

      ok = !g_unichar_isspace (g_utf8_get_char (name)) && !g_unichar_isspace (g_utf8_get_char (last));
    }
  if (!ok)
    g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                 _("a list's name must be UTF-8 text, not empty, without control characters "
                   "and without blanks at either end"));
  return ok;
}

/* Free text (a description, tags, notes): NULL or valid UTF-8. */
static gboolean
check_text (const char *what, const char *text, GError **error)
{
  if (text == NULL || g_utf8_validate (text, -1, NULL))
    return TRUE;
  g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("the %s is not valid UTF-8"), what);
  return FALSE;
}

/* The list's id in *ID, 0 if there is none; FALSE only on a database
 * error. */
static gboolean
find_list (SlProject *project, const char *name, gint64 *id, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT id FROM lists WHERE name = ?", error);
  int rc;

  *id = 0;
  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_text (stmt, 1, name, -1, SQLITE_STATIC);
  rc = sqlite3_step (stmt);
  if (rc == SQLITE_ROW)
    *id = sqlite3_column_int64 (stmt, 0);
  sqlite3_finalize (stmt);
  if (rc != SQLITE_ROW && rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "lists");
      return FALSE;
    }
  return TRUE;
}

static void
unknown_list (SlProject *project, const char *name, GError **error)
{
  g_auto (GStrv) names = sl_list_names (project, NULL);
  g_autofree char *known = names && names[0] ? g_strjoinv (", ", names) : NULL;

  if (known)
    g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: no list '%s' in the project; the lists are: %s"),
                 sl_project_path (project), name, known);
  else
    g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: no list '%s' in the project; it has no lists yet"),
                 sl_project_path (project), name);
}

/* The id of an existing list, or 0 with ERROR set. */
static gint64
existing_list (SlProject *project, const char *name, GError **error)
{
  gint64 id;

  if (!find_list (project, name, &id, error))
    return 0;
  if (id == 0)
    unknown_list (project, name, error);
  return id;
}

static gint64
count_members (SlProject *project, gint64 list_id, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT count(*) FROM list_members WHERE list_id = ?",
                                           error);
  gint64 n = -1;

  if (stmt == NULL)
    return -1;
  sqlite3_bind_int64 (stmt, 1, list_id);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    n = sqlite3_column_int64 (stmt, 0);
  else
    sl_project_set_db_error (project, error, "list_members");
  sqlite3_finalize (stmt);
  return n;
}

/* Runs a statement of the condition's stars: ?1 is LIST_ID, the
 * condition's parameters follow. */
static gboolean
run_with_condition (SlProject *project, const char *sql, gint64 list_id, const SlCondition *condition,
                    GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, sql, error);
  gboolean ok;

  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_int64 (stmt, 1, list_id);
  sl_condition_bind (condition, stmt, 2);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  if (!ok)
    sl_project_set_db_error (project, error, "list_members");
  sqlite3_finalize (stmt);
  return ok;
}

/* The ledger's summary is one line, whatever blanks the condition has
 * (the details keep it as written). */
static gboolean
append_to_ledger (SlProject *project, char *summary, GString *details, GError **error)
{
  g_strdelimit (summary, "\t\r\n", ' ');
  return sl_ledger_append (project, "list", summary, details->str, error);
}

/* ------------------------------------------------------------------ */
/* Making lists                                                       */

/* The condition as the project reads its inputs: averaged where its
 * combination policy averages (inputs.h). */
static SlCondition *
compile_for_project (SlProject *project, const char *text, GError **error)
{
  SlCombinePolicy policy;

  if (!sl_combine_policy_read (project, &policy, error))
    return NULL;
  return sl_condition_compile_for (text, &policy, error);
}

gint64
sl_list_create_from_condition (SlProject *project, const char *name, const char *condition_text,
                               const char *description, gboolean replace, GError **error)
{
  g_autoptr (SlCondition) condition = NULL;
  g_autofree char *now = sl_now_utc ();
  g_autofree char *remove_sql = NULL;
  g_autofree char *insert_sql = NULL;
  g_autofree char *summary = NULL;
  g_autoptr (GString) details = g_string_new ("{\"list\": ");
  sqlite3_stmt *stmt = NULL;
  gint64 list_id, before = 0, n = 0;
  gboolean existed;

  g_return_val_if_fail (project != NULL && condition_text != NULL, -1);

  if (!check_name (name, error) || !check_text (_("description"), description, error))
    return -1;
  condition = compile_for_project (project, condition_text, error);
  if (condition == NULL)
    return -1;

  if (!sl_project_begin (project, error))
    return -1;
  if (!find_list (project, name, &list_id, error))
    goto fail;
  if (list_id != 0 && !replace)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_EXISTS,
                   _("%s: there is already a list '%s' (--replace makes it anew)"),
                   sl_project_path (project), name);
      goto fail;
    }
  existed = list_id != 0;

  if (existed)
    {
      before = count_members (project, list_id, error);
      stmt = before < 0 ? NULL
           : sl_project_prepare (project,
                                 "UPDATE lists SET description = ?2, condition = ?3, created_by = ?4, "
                                 "created_at = ?5 WHERE id = ?1", error);
    }
  else
    stmt = sl_project_prepare (project,
                               "INSERT INTO lists (name, description, condition, created_by, created_at) "
                               "VALUES (?6, ?2, ?3, ?4, ?5)", error);
  if (stmt == NULL)
    goto fail;
  sqlite3_bind_int64 (stmt, 1, list_id);
  sqlite3_bind_text (stmt, 2, description ? description : "", -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 3, condition_text, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 4, sl_current_user (), -1, SQLITE_TRANSIENT);
  sqlite3_bind_text (stmt, 5, now, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 6, name, -1, SQLITE_STATIC);
  if (sqlite3_step (stmt) != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "lists");
      goto fail;
    }
  g_clear_pointer (&stmt, sqlite3_finalize);
  if (!existed)
    list_id = sqlite3_last_insert_rowid (sl_project_db (project));

  /* Stars that stay keep their priority, tags and notes. */
  remove_sql = g_strdup_printf ("DELETE FROM list_members WHERE list_id = ?1 AND star_id NOT IN "
                                "(SELECT d.star_id FROM derived d%s WHERE %s)",
                                condition->joins, condition->where);
  insert_sql = g_strdup_printf ("INSERT OR IGNORE INTO list_members (list_id, star_id) "
                                "SELECT ?1, d.star_id FROM derived d%s WHERE %s",
                                condition->joins, condition->where);
  if ((before > 0 && !run_with_condition (project, remove_sql, list_id, condition, error))
      || !run_with_condition (project, insert_sql, list_id, condition, error)
      || (n = count_members (project, list_id, error)) < 0)
    goto fail;

  if (existed)
    summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "remade list %s: %" PRId64 " star where %s (it had %" PRId64 ")",
                                            "remade list %s: %" PRId64 " stars where %s (it had %" PRId64 ")", n),
                               name, n, condition_text, before);
  else
    summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "made list %s: %" PRId64 " star where %s",
                                            "made list %s: %" PRId64 " stars where %s", n),
                               name, n, condition_text);
  sl_json_append_string (details, name);
  g_string_append (details, ", \"condition\": ");
  sl_json_append_string (details, condition_text);
  g_string_append (details, ", \"description\": ");
  sl_json_append_string (details, description ? description : "");
  g_string_append_printf (details, ", \"stars\": %" PRId64 ", \"replaced\": %s", n,
                          existed ? "true" : "false");
  g_string_append_printf (details, ", \"stars_before\": %" PRId64 "}", before);
  if (!append_to_ledger (project, summary, details, error) || !sl_project_commit (project, error))
    goto fail;
  return n;

fail:
  sqlite3_finalize (stmt);
  sl_project_rollback (project);
  return -1;
}

gboolean
sl_list_create (SlProject *project, const char *name, const char *description, GError **error)
{
  return sl_list_create_with_stars (project, name, NULL, NULL, description, error) >= 0;
}

static gboolean star_exists (SlProject *project, const char *designation, GError **error);

/* Whether a star of that designation exists; FALSE with ERROR naming it
 * if not. */
static gboolean
star_exists (SlProject *project, const char *designation, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT 1 FROM stars WHERE designation = ?", error);
  gboolean found;

  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_text (stmt, 1, designation, -1, SQLITE_STATIC);
  found = sqlite3_step (stmt) == SQLITE_ROW;
  sqlite3_finalize (stmt);
  if (!found)
    g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: no star '%s' in the project"),
                 sl_project_path (project), designation);
  return found;
}

/* Runs STMT (?1: the list, ?2: a designation) for each of DESIGNATIONS,
 * adding or removing a member; the designations it changed go to DETAILS
 * as JSON array items.  A star that changed nothing must exist (already a
 * member, or not one to remove); an unknown one is an error.  Returns how
 * many changed, or -1 with ERROR set. */
static gint64
apply_to_members (SlProject *project, sqlite3_stmt *stmt, gint64 list_id, const char *const *designations,
                  GString *details, GError **error)
{
  gint64 changed = 0;

  for (guint i = 0; designations[i]; i++)
    {
      sqlite3_reset (stmt);
      sqlite3_bind_int64 (stmt, 1, list_id);
      sqlite3_bind_text (stmt, 2, designations[i], -1, SQLITE_STATIC);
      if (sqlite3_step (stmt) != SQLITE_DONE)
        {
          sl_project_set_db_error (project, error, "list_members");
          return -1;
        }
      if (sqlite3_changes (sl_project_db (project)) == 0)
        {
          if (!star_exists (project, designations[i], error))
            return -1;
          continue;
        }
      if (changed++ > 0)
        g_string_append (details, ", ");
      sl_json_append_string (details, designations[i]);
    }
  return changed;
}

gint64
sl_list_create_with_stars (SlProject *project, const char *name, const char *condition_text,
                           const char *const *designations, const char *description, GError **error)
{
  g_autoptr (SlCondition) condition = NULL;
  g_autofree char *now = sl_now_utc ();
  g_autofree char *insert_sql = NULL;
  g_autofree char *summary = NULL;
  g_autoptr (GString) details = g_string_new ("{\"list\": ");
  sqlite3_stmt *stmt = NULL;
  gint64 list_id, n_condition = 0, n_hand = 0, n;

  g_return_val_if_fail (project != NULL, -1);

  if (!check_name (name, error) || !check_text (_("description"), description, error))
    return -1;
  if (condition_text && (condition = compile_for_project (project, condition_text, error)) == NULL)
    return -1;

  if (!sl_project_begin (project, error))
    return -1;
  if (!find_list (project, name, &list_id, error))
    goto fail;
  if (list_id != 0)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_EXISTS, _("%s: there is already a list '%s'"),
                   sl_project_path (project), name);
      goto fail;
    }
  stmt = sl_project_prepare (project,
                             "INSERT INTO lists (name, description, condition, created_by, created_at) "
                             "VALUES (?, ?, ?, ?, ?)", error);
  if (stmt == NULL)
    goto fail;
  sqlite3_bind_text (stmt, 1, name, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 2, description ? description : "", -1, SQLITE_STATIC);
  if (condition_text)
    sqlite3_bind_text (stmt, 3, condition_text, -1, SQLITE_STATIC);
  else
    sqlite3_bind_null (stmt, 3);
  sqlite3_bind_text (stmt, 4, sl_current_user (), -1, SQLITE_TRANSIENT);
  sqlite3_bind_text (stmt, 5, now, -1, SQLITE_STATIC);
  if (sqlite3_step (stmt) != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "lists");
      goto fail;
    }
  g_clear_pointer (&stmt, sqlite3_finalize);
  list_id = sqlite3_last_insert_rowid (sl_project_db (project));

  if (condition)
    {
      insert_sql = g_strdup_printf ("INSERT OR IGNORE INTO list_members (list_id, star_id) "
                                    "SELECT ?1, d.star_id FROM derived d%s WHERE %s",
                                    condition->joins, condition->where);
      if (!run_with_condition (project, insert_sql, list_id, condition, error)
          || (n_condition = count_members (project, list_id, error)) < 0)
        goto fail;
    }

  sl_json_append_string (details, name);
  g_string_append (details, ", \"condition\": ");
  if (condition_text)
    sl_json_append_string (details, condition_text);
  else
    g_string_append (details, "null");
  g_string_append (details, ", \"description\": ");
  sl_json_append_string (details, description ? description : "");
  g_string_append (details, ", \"added\": [");
  if (designations && designations[0])
    {
      stmt = sl_project_prepare (project,
                                 "INSERT OR IGNORE INTO list_members (list_id, star_id) "
                                 "SELECT ?1, id FROM stars WHERE designation = ?2", error);
      if (stmt == NULL)
        goto fail;
      /* A star already in by the condition changes nothing. */
      n_hand = apply_to_members (project, stmt, list_id, designations, details, error);
      if (n_hand < 0)
        goto fail;
      g_clear_pointer (&stmt, sqlite3_finalize);
    }
  n = n_condition + n_hand;
  g_string_append_printf (details, "], \"stars\": %" PRId64 "}", n);

  if (condition_text && n_hand == 0)
    summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "made list %s: %" PRId64 " star where %s",
                                            "made list %s: %" PRId64 " stars where %s", n),
                               name, n, condition_text);
  else if (condition_text)
    summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                            "made list %s: %" PRId64 " star where %s, and %" PRId64 " more by hand",
                                            "made list %s: %" PRId64 " stars where %s, and %" PRId64 " more by hand",
                                            n_condition),
                               name, n_condition, condition_text, n_hand);
  else if (n == 0)
    summary = g_strdup_printf (_("made list %s by hand (empty)"), name);
  else
    summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "made list %s by hand: %" PRId64 " star",
                                            "made list %s by hand: %" PRId64 " stars", n),
                               name, n);
  if (!append_to_ledger (project, summary, details, error) || !sl_project_commit (project, error))
    goto fail;
  return n;

fail:
  sqlite3_finalize (stmt);
  sl_project_rollback (project);
  return -1;
}

gint64
sl_list_count_matching (SlProject *project, const char *condition_text, GError **error)
{
  g_autoptr (SlCondition) condition = NULL;
  g_autofree char *sql = NULL;
  sqlite3_stmt *stmt;
  gint64 n = -1;

  g_return_val_if_fail (project != NULL && condition_text != NULL, -1);

  condition = compile_for_project (project, condition_text, error);
  if (condition == NULL)
    return -1;
  sql = g_strdup_printf ("SELECT count(*) FROM derived d%s WHERE %s", condition->joins, condition->where);
  stmt = sl_project_prepare (project, sql, error);
  if (stmt == NULL)
    return -1;
  sl_condition_bind (condition, stmt, 1);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    n = sqlite3_column_int64 (stmt, 0);
  else
    sl_project_set_db_error (project, error, "derived");
  sqlite3_finalize (stmt);
  return n;
}

/* ------------------------------------------------------------------ */
/* Members                                                            */

/* Adds (ADD) or removes the stars; one statement per star, and a second
 * look only for a star that changed nothing (already in, or unknown). */
static gint64
change_members (SlProject *project, const char *name, const char *const *designations, gboolean add,
                GError **error)
{
  g_autofree char *summary = NULL;
  g_autoptr (GString) details = g_string_new ("{\"list\": ");
  sqlite3_stmt *stmt = NULL;
  gint64 list_id, changed = 0;

  g_return_val_if_fail (project != NULL && designations != NULL, -1);

  if (!sl_project_begin (project, error))
    return -1;
  list_id = existing_list (project, name, error);
  if (list_id == 0)
    goto fail;
  stmt = sl_project_prepare (project,
                             add ? "INSERT OR IGNORE INTO list_members (list_id, star_id) "
                                   "SELECT ?1, id FROM stars WHERE designation = ?2"
                                 : "DELETE FROM list_members WHERE list_id = ?1 AND star_id = "
                                   "(SELECT id FROM stars WHERE designation = ?2)",
                             error);
  if (stmt == NULL)
    goto fail;
  sl_json_append_string (details, name);
  g_string_append (details, add ? ", \"added\": [" : ", \"removed\": [");
  changed = apply_to_members (project, stmt, list_id, designations, details, error);
  if (changed < 0)
    goto fail;
  g_clear_pointer (&stmt, sqlite3_finalize);
  g_string_append (details, "]}");

  /* Nothing changed, nothing to record. */
  if (changed > 0)
    {
      if (add)
        summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "added %" PRId64 " star to list %s",
                                                "added %" PRId64 " stars to list %s", changed),
                                   changed, name);
      else
        summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "removed %" PRId64 " star from list %s",
                                                "removed %" PRId64 " stars from list %s", changed),
                                   changed, name);
      if (!append_to_ledger (project, summary, details, error))
        goto fail;
    }
  if (!sl_project_commit (project, error))
    goto fail;
  return changed;

fail:
  sqlite3_finalize (stmt);
  sl_project_rollback (project);
  return -1;
}

gint64
sl_list_add_stars (SlProject *project, const char *name, const char *const *designations, GError **error)
{
  return change_members (project, name, designations, TRUE, error);
}

gint64
sl_list_remove_stars (SlProject *project, const char *name, const char *const *designations, GError **error)
{
  return change_members (project, name, designations, FALSE, error);
}

gboolean
sl_list_set_member (SlProject *project, const char *name, const char *designation, gint64 priority,
                    const char *tags, const char *notes, GError **error)
{
  g_autofree char *summary = NULL;
  g_autoptr (GString) details = g_string_new ("{\"list\": ");
  sqlite3_stmt *stmt;
  gint64 list_id;
  gboolean ok;

  g_return_val_if_fail (project != NULL && designation != NULL, FALSE);

  if (!check_text (_("tags"), tags, error) || !check_text (_("notes"), notes, error))
    return FALSE;
  if (!sl_project_begin (project, error))
    return FALSE;
  list_id = existing_list (project, name, error);
  stmt = list_id == 0 ? NULL
       : sl_project_prepare (project,
                             "UPDATE list_members SET priority = ?3, tags = ?4, notes = ?5 "
                             "WHERE list_id = ?1 AND star_id = (SELECT id FROM stars WHERE designation = ?2)",
                             error);
  if (stmt == NULL)
    goto fail;
  sqlite3_bind_int64 (stmt, 1, list_id);
  sqlite3_bind_text (stmt, 2, designation, -1, SQLITE_STATIC);
  sqlite3_bind_int64 (stmt, 3, priority);
  sqlite3_bind_text (stmt, 4, tags ? tags : "", -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 5, notes ? notes : "", -1, SQLITE_STATIC);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  if (!ok)
    sl_project_set_db_error (project, error, "list_members");
  else if (sqlite3_changes (sl_project_db (project)) == 0)
    {
      ok = FALSE;
      if (star_exists (project, designation, error))
        g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: star '%s' is not in list '%s'"),
                     sl_project_path (project), designation, name);
    }
  sqlite3_finalize (stmt);
  if (!ok)
    goto fail;

  summary = g_strdup_printf (_("set %s in list %s: priority %" PRId64 ", tags '%s', notes '%s'"),
                             designation, name, priority, tags ? tags : "", notes ? notes : "");
  sl_json_append_string (details, name);
  g_string_append (details, ", \"star\": ");
  sl_json_append_string (details, designation);
  g_string_append_printf (details, ", \"priority\": %" PRId64 ", \"tags\": ", priority);
  sl_json_append_string (details, tags ? tags : "");
  g_string_append (details, ", \"notes\": ");
  sl_json_append_string (details, notes ? notes : "");
  g_string_append (details, "}");
  if (!append_to_ledger (project, summary, details, error) || !sl_project_commit (project, error))
    goto fail;
  return TRUE;

fail:
  sl_project_rollback (project);
  return FALSE;
}

/* ------------------------------------------------------------------ */
/* Deleting                                                           */

gboolean
sl_list_delete (SlProject *project, const char *name, GError **error)
{
  g_autofree char *summary = NULL;
  g_autoptr (GString) details = g_string_new ("{\"list\": ");
  sqlite3_stmt *stmt = NULL;
  gint64 list_id, n;

  g_return_val_if_fail (project != NULL, FALSE);

  if (!sl_project_begin (project, error))
    return FALSE;
  list_id = existing_list (project, name, error);
  if (list_id == 0 || (n = count_members (project, list_id, error)) < 0)
    goto fail;
  /* Members first: the cascade needs foreign keys on, and this does not. */
  stmt = sl_project_prepare (project, "DELETE FROM list_members WHERE list_id = ?", error);
  if (stmt == NULL)
    goto fail;
  sqlite3_bind_int64 (stmt, 1, list_id);
  if (sqlite3_step (stmt) != SQLITE_DONE)
    goto db_fail;
  sqlite3_finalize (stmt);
  stmt = sl_project_prepare (project, "DELETE FROM lists WHERE id = ?", error);
  if (stmt == NULL)
    goto fail;
  sqlite3_bind_int64 (stmt, 1, list_id);
  if (sqlite3_step (stmt) != SQLITE_DONE)
    goto db_fail;
  g_clear_pointer (&stmt, sqlite3_finalize);

  summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "deleted list %s (%" PRId64 " star)",
                                          "deleted list %s (%" PRId64 " stars)", n),
                             name, n);
  sl_json_append_string (details, name);
  g_string_append_printf (details, ", \"stars\": %" PRId64 "}", n);
  if (!append_to_ledger (project, summary, details, error) || !sl_project_commit (project, error))
    goto fail;
  return TRUE;

db_fail:
  sl_project_set_db_error (project, error, "lists");
fail:
  sqlite3_finalize (stmt);
  sl_project_rollback (project);
  return FALSE;
}

/* ------------------------------------------------------------------ */
/* Reading                                                            */

GStrv
sl_list_names (SlProject *project, GError **error)
{
  g_autoptr (GStrvBuilder) builder = g_strv_builder_new ();
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT name FROM lists ORDER BY name", error);
  int rc;

  if (stmt == NULL)
    return NULL;
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    g_strv_builder_add (builder, (const char *) sqlite3_column_text (stmt, 0));
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "lists");
      return NULL;
    }
  return g_strv_builder_end (builder);
}

GArray *
sl_list_star_ids (SlProject *project, const char *name, GError **error)
{
  g_autoptr (GArray) ids = g_array_new (FALSE, FALSE, sizeof (gint64));
  gint64 list_id = existing_list (project, name, error);
  sqlite3_stmt *stmt;
  int rc;

  if (list_id == 0)
    return NULL;
  stmt = sl_project_prepare (project, "SELECT star_id FROM list_members WHERE list_id = ? ORDER BY star_id",
                             error);
  if (stmt == NULL)
    return NULL;
  sqlite3_bind_int64 (stmt, 1, list_id);
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      gint64 id = sqlite3_column_int64 (stmt, 0);

      g_array_append_val (ids, id);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "list_members");
      return NULL;
    }
  return g_steal_pointer (&ids);
}

GPtrArray *
sl_list_infos (SlProject *project, GError **error)
{
  g_autoptr (GPtrArray) infos = g_ptr_array_new_with_free_func ((GDestroyNotify) sl_list_info_free);
  sqlite3_stmt *stmt;
  int rc;

  stmt = sl_project_prepare (project,
                             "SELECT l.name, l.description, l.condition, l.created_by, l.created_at, "
                             "  (SELECT count(*) FROM list_members m WHERE m.list_id = l.id), "
                             "  (SELECT count(*) FROM list_members m JOIN derived d ON d.star_id = m.star_id "
                             "   WHERE m.list_id = l.id AND d.stale <> 0) "
                             "FROM lists l ORDER BY l.name", error);
  if (stmt == NULL)
    return NULL;
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      SlListInfo *info = g_new0 (SlListInfo, 1);

      sl_column_texts_dup (stmt, 0, &info->name, &info->description, &info->condition, &info->created_by,
                           &info->created_at, NULL);
      info->n_stars = sqlite3_column_int64 (stmt, 5);
      info->n_stale = sqlite3_column_int64 (stmt, 6);
      g_ptr_array_add (infos, info);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "lists");
      return NULL;
    }
  return g_steal_pointer (&infos);
}

void
sl_list_info_free (SlListInfo *info)
{
  if (info == NULL)
    return;
  g_free (info->name);
  g_free (info->description);
  g_free (info->condition);
  g_free (info->created_by);
  g_free (info->created_at);
  g_free (info);
}

GPtrArray *
sl_list_members (SlProject *project, const char *name, GError **error)
{
  g_autoptr (GPtrArray) members = g_ptr_array_new_with_free_func ((GDestroyNotify) sl_list_member_free);
  gint64 list_id = existing_list (project, name, error);
  sqlite3_stmt *stmt;
  int rc;

  if (list_id == 0)
    return NULL;
  stmt = sl_project_prepare (project,
                             "SELECT m.star_id, s.designation, m.priority, m.tags, m.notes "
                             "FROM list_members m JOIN stars s ON s.id = m.star_id "
                             "WHERE m.list_id = ? ORDER BY m.priority DESC, s.designation", error);
  if (stmt == NULL)
    return NULL;
  sqlite3_bind_int64 (stmt, 1, list_id);
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      SlListMember *member = g_new0 (SlListMember, 1);

      member->star_id = sqlite3_column_int64 (stmt, 0);
      member->priority = sqlite3_column_int64 (stmt, 2);
      sl_column_texts_dup (stmt, 1, &member->designation, NULL);
      sl_column_texts_dup (stmt, 3, &member->tags, &member->notes, NULL);
      g_ptr_array_add (members, member);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "list_members");
      return NULL;
    }
  return g_steal_pointer (&members);
}

void
sl_list_member_free (SlListMember *member)
{
  if (member == NULL)
    return;
  g_free (member->designation);
  g_free (member->tags);
  g_free (member->notes);
  g_free (member);
}
