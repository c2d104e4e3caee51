/* derivation.c: derivation runs, overrides and verification on a project.
 *
 * Contents:
 *   the derived row ........ DerivedColumns, bind_derived_row, read_derived_row
 *   choosing stars ......... stars_to_derive
 *   overrides .............. load_all_overrides, sl_override_set, sl_override_clear
 *   the run ................ sl_derivation_run
 *   verification ........... sl_verify
 */
#include "derivation.h"
#include <inttypes.h>

#include <inttypes.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "derive/pool.h"
#include "input-reader.h"
#include "ledger.h"
#include "sl-error.h"
#include "util.h"

#define ROWS_PER_CHECK 4096

/* The measurements rows a derived row records, by the field that leads
 * each group of inputs (inputs.c). */
static const struct {
  const char *column;
  SlField     field;
} measurement_columns[] = {
  { "m_position", SL_FIELD_RA }, { "m_parallax", SL_FIELD_PARALLAX }, { "m_pm", SL_FIELD_PMRA },
  { "m_vmag", SL_FIELD_VMAG }, { "m_bmag", SL_FIELD_BMAG }, { "m_bv", SL_FIELD_BV },
  { "m_ebv", SL_FIELD_EBV }, { "m_vrad", SL_FIELD_VRAD }, { "m_sptype", SL_FIELD_SPTYPE },
};

#define N_MEASUREMENT_COLUMNS G_N_ELEMENTS (measurement_columns)

/* ------------------------------------------------------------------ */
/* The derived row                                                    */

/* The columns after star_id and run_id, in one order for writing and
 * reading: stale, flags, monte_carlo, m_*, each numeric q with q_lo and
 * q_hi, spclass, and the log Teff - log L ellipse. */
static char *
derived_columns_sql (void)
{
  GString *sql = g_string_new ("stale, flags, monte_carlo");

  for (gsize i = 0; i < N_MEASUREMENT_COLUMNS; i++)
    g_string_append_printf (sql, ", %s", measurement_columns[i].column);
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      const char *name = sl_quantity_info (q)->name;

      if (sl_quantity_info (q)->is_text)
        g_string_append_printf (sql, ", %s", name);
      else
        g_string_append_printf (sql, ", %s, %s_lo, %s_hi", name, name, name);
    }
  g_string_append (sql, ", logt_sigma, logl_sigma, logt_logl_corr");
  return g_string_free (sql, FALSE);
}

static char *
derived_insert_sql (const char *columns)
{
  GString *sql = g_string_new (NULL);

  g_string_append_printf (sql, "INSERT INTO derived (star_id, run_id, %s) VALUES (?, ?", columns);
  for (const char *p = columns; *p; p++)
    if (*p == ',')
      g_string_append (sql, ", ?");
  g_string_append (sql, ", ?)");   /* the first column has no comma before it */
  return g_string_free (sql, FALSE);
}

/* UPDATE derived SET run_id = ?2, COLUMN = ?3, ... WHERE star_id = ?1:
 * the parameters of the insert, in its order. */
static char *
derived_update_sql (const char *columns)
{
  g_auto (GStrv) names = g_strsplit (columns, ", ", -1);
  GString *sql = g_string_new ("UPDATE derived SET run_id = ?2");

  for (int i = 0; names[i]; i++)
    g_string_append_printf (sql, ", %s = ?%d", names[i], i + 3);
  g_string_append (sql, " WHERE star_id = ?1");
  return g_string_free (sql, FALSE);
}

static void
bind_double_or_null (sqlite3_stmt *stmt, int index, gboolean present, double value)
{
  if (present && isfinite (value))
    sqlite3_bind_double (stmt, index, value);
  else
    sqlite3_bind_null (stmt, index);
}

/* Binds a star's derived row from parameter FIRST on (stale is 0). */
static void
bind_derived_row (sqlite3_stmt *stmt, int first, const SlStarInputs *in, const SlDerivedValues *v)
{
  int i = first;

  sqlite3_bind_int (stmt, i++, 0);
  sqlite3_bind_int64 (stmt, i++, v->flags);
  sqlite3_bind_int (stmt, i++, v->monte_carlo);
  for (gsize m = 0; m < N_MEASUREMENT_COLUMNS; m++, i++)
    {
      gint64 id = in->measurement[measurement_columns[m].field];

      if (id > 0)
        sqlite3_bind_int64 (stmt, i, id);
      else
        sqlite3_bind_null (stmt, i);
    }
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      if (sl_quantity_info (q)->is_text)
        {
          if (v->has[q])
            sqlite3_bind_text (stmt, i++, v->text[q], -1, SQLITE_TRANSIENT);
          else
            sqlite3_bind_null (stmt, i++);
          continue;
        }
      bind_double_or_null (stmt, i++, v->has[q], v->value[q]);
      bind_double_or_null (stmt, i++, v->has[q], v->lo[q]);
      bind_double_or_null (stmt, i++, v->has[q], v->hi[q]);
    }
  bind_double_or_null (stmt, i++, TRUE, v->logt_sigma);
  bind_double_or_null (stmt, i++, TRUE, v->logl_sigma);
  bind_double_or_null (stmt, i++, TRUE, v->logt_logl_corr);
}

char *
sl_derived_select_sql (const char *where_and_order)
{
  g_autofree char *columns = derived_columns_sql ();

  return g_strdup_printf ("SELECT star_id, run_id, %s FROM derived %s", columns,
                          where_and_order ? where_and_order : "");
}

void
sl_derived_row_read (sqlite3_stmt *stmt, SlDerivedRow *row)
{
  SlDerivedValues *v = &row->values;
  int c = 0;

  memset (row, 0, sizeof *row);
  row->star_id = sqlite3_column_int64 (stmt, c++);
  row->run_id = sqlite3_column_int64 (stmt, c++);
  row->stale = sqlite3_column_int (stmt, c++);
  v->flags = (guint32) sqlite3_column_int64 (stmt, c++);
  v->monte_carlo = sqlite3_column_int (stmt, c++);
  for (gsize m = 0; m < N_MEASUREMENT_COLUMNS; m++)
    row->measurement[measurement_columns[m].field] = sqlite3_column_int64 (stmt, c++);
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      if (sl_quantity_info (q)->is_text)
        {
          const char *text = (const char *) sqlite3_column_text (stmt, c++);

          v->has[q] = text != NULL;
          g_strlcpy (v->text[q], text ? text : "", sizeof v->text[q]);
          continue;
        }
      v->has[q] = sqlite3_column_type (stmt, c) != SQLITE_NULL;
      v->value[q] = sl_column_double_or_nan (stmt, c++);
      v->lo[q] = sl_column_double_or_nan (stmt, c++);
      v->hi[q] = sl_column_double_or_nan (stmt, c++);
    }
  v->logt_sigma = sl_column_double_or_nan (stmt, c++);
  v->logl_sigma = sl_column_double_or_nan (stmt, c++);
  v->logt_logl_corr = sl_column_double_or_nan (stmt, c++);
}

gboolean
sl_derived_row_load (SlProject *project, gint64 star_id, SlDerivedRow *row, GError **error)
{
  g_autofree char *sql = sl_derived_select_sql ("WHERE star_id = ?");
  sqlite3_stmt *stmt = sl_project_prepare (project, sql, error);
  gboolean found = FALSE;

  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_int64 (stmt, 1, star_id);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    {
      sl_derived_row_read (stmt, row);
      found = TRUE;
    }
  sqlite3_finalize (stmt);
  return found;
}

/* ------------------------------------------------------------------ */
/* Overrides                                                          */

static void
override_array_free (gpointer data)
{
  g_array_unref (data);
}

static GArray *
read_overrides (sqlite3_stmt *stmt, GHashTable *by_star, GError **error)
{
  GArray *single = by_star ? NULL : g_array_new (FALSE, FALSE, sizeof (SlOverride));
  int rc;

  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      gint64 star_id = sqlite3_column_int64 (stmt, 0);
      SlOverride o;
      GArray *list = single;

      if (!sl_quantity_from_name ((const char *) sqlite3_column_text (stmt, 1), &o.quantity))
        continue;   /* written by a newer Starledger: ignored, not guessed */
      o.value = sqlite3_column_double (stmt, 2);
      o.lo = sl_column_double_or_nan (stmt, 3);
      o.hi = sl_column_double_or_nan (stmt, 4);
      if (by_star)
        {
          list = g_hash_table_lookup (by_star, &star_id);
          if (list == NULL)
            {
              gint64 *key = g_new (gint64, 1);

              *key = star_id;
              list = g_array_new (FALSE, FALSE, sizeof (SlOverride));
              g_hash_table_insert (by_star, key, list);
            }
        }
      g_array_append_val (list, o);
    }
  if (rc != SQLITE_DONE)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, "%s", sqlite3_errmsg (sqlite3_db_handle (stmt)));
      if (single)
        g_array_unref (single);
      return NULL;
    }
  return single;
}

#define OVERRIDE_COLUMNS "SELECT star_id, quantity, value, lo, hi FROM overrides WHERE cleared_at IS NULL"

static GHashTable *
load_all_overrides (SlProject *project, GError **error)
{
  GHashTable *by_star = g_hash_table_new_full (g_int64_hash, g_int64_equal, g_free, override_array_free);
  sqlite3_stmt *stmt = sl_project_prepare (project, OVERRIDE_COLUMNS " ORDER BY id", error);
  GError *local = NULL;

  if (stmt == NULL)
    {
      g_hash_table_unref (by_star);
      return NULL;
    }
  read_overrides (stmt, by_star, &local);
  sqlite3_finalize (stmt);
  if (local)
    {
      g_propagate_error (error, local);
      g_hash_table_unref (by_star);
      return NULL;
    }
  return by_star;
}

GArray *
sl_overrides_for_star (SlProject *project, gint64 star_id, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, OVERRIDE_COLUMNS " AND star_id = ? ORDER BY id", error);
  GArray *list;

  if (stmt == NULL)
    return NULL;
  sqlite3_bind_int64 (stmt, 1, star_id);
  list = read_overrides (stmt, NULL, error);
  sqlite3_finalize (stmt);
  return list;
}

gint64
sl_star_lookup (SlProject *project, const char *designation, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT id FROM stars WHERE designation = ?", error);
  gint64 id = 0;

  if (stmt == NULL)
    return 0;
  sqlite3_bind_text (stmt, 1, designation, -1, SQLITE_STATIC);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    id = sqlite3_column_int64 (stmt, 0);
  sqlite3_finalize (stmt);
  if (id == 0)
    g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: no star '%s' in the project"),
                 sl_project_path (project), designation);
  return id;
}

static gboolean
mark_stale (SlProject *project, gint64 star_id, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "UPDATE derived SET stale = 1 WHERE star_id = ?", error);
  gboolean ok;

  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_int64 (stmt, 1, star_id);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  if (!ok)
    sl_project_set_db_error (project, error, "derived");
  sqlite3_finalize (stmt);
  return ok;
}

/* Marks the active override of (STAR, QUANTITY) cleared; returns how many
 * rows it touched (0 or 1), or -1 on error. */
static int
clear_active_override (SlProject *project, gint64 star_id, SlQuantity quantity, const char *now,
                       GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "UPDATE overrides SET cleared_by = ?, cleared_at = ? "
                                           "WHERE star_id = ? AND quantity = ? AND cleared_at IS NULL",
                                           error);
  int changed;

  if (stmt == NULL)
    return -1;
  sqlite3_bind_text (stmt, 1, sl_current_user (), -1, SQLITE_TRANSIENT);
  sqlite3_bind_text (stmt, 2, now, -1, SQLITE_STATIC);
  sqlite3_bind_int64 (stmt, 3, star_id);
  sqlite3_bind_text (stmt, 4, sl_quantity_info (quantity)->name, -1, SQLITE_STATIC);
  changed = sqlite3_step (stmt) == SQLITE_DONE ? sqlite3_changes (sl_project_db (project)) : -1;
  if (changed < 0)
    sl_project_set_db_error (project, error, "overrides");
  sqlite3_finalize (stmt);
  return changed;
}

static char *
override_ledger_details (const char *designation, SlQuantity quantity, double value, double lo,
                         double hi, const char *reason)
{
  GString *json = g_string_new ("{\"star\":");

  sl_json_append_string (json, designation);
  g_string_append (json, ",\"quantity\":");
  sl_json_append_string (json, sl_quantity_info (quantity)->name);
  g_string_append (json, ",\"value\":");
  sl_json_append_number (json, value);
  g_string_append (json, ",\"lo\":");
  sl_json_append_number (json, lo);
  g_string_append (json, ",\"hi\":");
  sl_json_append_number (json, hi);
  g_string_append (json, ",\"reason\":");
  sl_json_append_string (json, reason);
  g_string_append_c (json, '}');
  return g_string_free (json, FALSE);
}

gboolean
sl_override_set (SlProject *project, const char *designation, SlQuantity quantity, double value,
                 double lo, double hi, const char *reason, GError **error)
{
  g_autofree char *now = sl_now_utc ();
  g_autofree char *summary = NULL;
  g_autofree char *details = NULL;
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  sqlite3_stmt *stmt;
  gint64 star_id;
  gboolean ok;

  g_return_val_if_fail (quantity < SL_N_QUANTITIES, FALSE);
  if (sl_quantity_info (quantity)->is_text || !isfinite (value)
      || (isfinite (lo) && !(lo <= value)) || (isfinite (hi) && !(hi >= value))
      || isfinite (lo) != isfinite (hi) || reason == NULL || *reason == '\0')
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   sl_quantity_info (quantity)->is_text
                     ? _("%s is text and cannot be set by hand")
                     : _("an override of %s needs a finite value, both or neither of lo <= value <= hi, "
                         "and a reason"),
                   sl_quantity_info (quantity)->name);
      return FALSE;
    }

  if (!sl_project_begin (project, error))
    return FALSE;
  star_id = sl_star_lookup (project, designation, error);
  stmt = star_id ? sl_project_prepare (project,
                                       "INSERT INTO overrides (star_id, quantity, value, lo, hi, reason, set_by, set_at) "
                                       "VALUES (?, ?, ?, ?, ?, ?, ?, ?)", error)
                 : NULL;
  if (stmt == NULL || clear_active_override (project, star_id, quantity, now, error) < 0)
    {
      sqlite3_finalize (stmt);
      sl_project_rollback (project);
      return FALSE;
    }
  sqlite3_bind_int64 (stmt, 1, star_id);
  sqlite3_bind_text (stmt, 2, sl_quantity_info (quantity)->name, -1, SQLITE_STATIC);
  sqlite3_bind_double (stmt, 3, value);
  bind_double_or_null (stmt, 4, TRUE, lo);
  bind_double_or_null (stmt, 5, TRUE, hi);
  sqlite3_bind_text (stmt, 6, reason, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 7, sl_current_user (), -1, SQLITE_TRANSIENT);
  sqlite3_bind_text (stmt, 8, now, -1, SQLITE_STATIC);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  if (!ok)
    sl_project_set_db_error (project, error, "overrides");
  sqlite3_finalize (stmt);

  summary = g_strdup_printf (_("set %s of %s to %s by hand: %s"), sl_quantity_info (quantity)->name,
                             designation, sl_format_double (buf, value), reason);
  details = override_ledger_details (designation, quantity, value, lo, hi, reason);
  if (!ok || !mark_stale (project, star_id, error)
      || !sl_ledger_append (project, "override", summary, details, error)
      || !sl_project_commit (project, error))
    {
      sl_project_rollback (project);
      return FALSE;
    }
  return TRUE;
}

gboolean
sl_override_clear (SlProject *project, const char *designation, SlQuantity quantity,
                   const char *reason, GError **error)
{
  g_autofree char *now = sl_now_utc ();
  g_autofree char *summary = NULL;
  g_autofree char *details = NULL;
  gint64 star_id;
  int cleared;

  if (!sl_project_begin (project, error))
    return FALSE;
  star_id = sl_star_lookup (project, designation, error);
  cleared = star_id ? clear_active_override (project, star_id, quantity, now, error) : -1;
  if (cleared == 0)
    g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: %s of %s was not set by hand"),
                 sl_project_path (project), sl_quantity_info (quantity)->name, designation);
  if (cleared <= 0)
    {
      sl_project_rollback (project);
      return FALSE;
    }
  summary = g_strdup_printf (_("cleared the hand-set %s of %s%s%s"), sl_quantity_info (quantity)->name,
                             designation, reason && *reason ? ": " : "", reason ? reason : "");
  details = override_ledger_details (designation, quantity, NAN, NAN, NAN, reason ? reason : "");
  if (!mark_stale (project, star_id, error)
      || !sl_ledger_append (project, "override", summary, details, error)
      || !sl_project_commit (project, error))
    {
      sl_project_rollback (project);
      return FALSE;
    }
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Choosing the stars                                                 */

static GArray *
stars_to_derive (SlProject *project, const char *params_text, gboolean all, guint64 *total,
                 GError **error)
{
  /* Every star needs no look at the derived table, which is most of the
   * file: reading it would cost more than the stars' ids. */
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           all ? "SELECT id, 1 FROM stars ORDER BY id"
                                               : "SELECT s.id, d.star_id IS NULL OR d.stale OR r.parameters <> ?2 "
                                                 "FROM stars s LEFT JOIN derived d ON d.star_id = s.id "
                                                 "LEFT JOIN derivation_runs r ON r.id = d.run_id ORDER BY s.id",
                                           error);
  GArray *ids;
  int rc;

  if (stmt == NULL)
    return NULL;
  if (!all)
    sqlite3_bind_text (stmt, 2, params_text, -1, SQLITE_STATIC);
  ids = g_array_new (FALSE, FALSE, sizeof (gint64));
  *total = 0;
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      gint64 id = sqlite3_column_int64 (stmt, 0);

      (*total)++;
      if (sqlite3_column_int (stmt, 1))
        g_array_append_val (ids, id);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "derived");
      g_array_unref (ids);
      return NULL;
    }
  return ids;
}

/* ------------------------------------------------------------------ */
/* The run                                                            */

static char *
methods_json (void)
{
  guint n;
  const SlModule *const *modules = sl_modules (&n);
  GString *json = g_string_new ("{");

  for (guint i = 0; i < n; i++)
    {
      if (i)
        g_string_append_c (json, ',');
      sl_json_append_string (json, modules[i]->name);
      g_string_append_printf (json, ":%d", modules[i]->version);
    }
  g_string_append_c (json, '}');
  return g_string_free (json, FALSE);
}

static gint64
insert_run (SlProject *project, const char *params_text, const char *started, GError **error)
{
  g_autofree char *methods = methods_json ();
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "INSERT INTO derivation_runs (started_at, who, software_version, "
                                           "parameters, methods) VALUES (?, ?, ?, ?, ?)", error);
  gint64 id = 0;

  if (stmt == NULL)
    return 0;
  sqlite3_bind_text (stmt, 1, started, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 2, sl_current_user (), -1, SQLITE_TRANSIENT);
  sqlite3_bind_text (stmt, 3, PACKAGE_VERSION, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 4, params_text, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 5, methods, -1, SQLITE_STATIC);
  if (sqlite3_step (stmt) == SQLITE_DONE)
    id = sqlite3_last_insert_rowid (sl_project_db (project));
  else
    sl_project_set_db_error (project, error, "derivation_runs");
  sqlite3_finalize (stmt);
  return id;
}

static gboolean
finish_run (SlProject *project, const SlDeriveParams *params, SlDeriveReport *report, GError **error)
{
  g_autofree char *now = sl_now_utc ();
  g_autofree char *described = sl_derive_params_describe (params);
  g_autofree char *summary = NULL;
  g_autofree char *details = NULL;
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "UPDATE derivation_runs SET finished_at = ?, stars = ?, duration_s = ? "
                                           "WHERE id = ?", error);
  gboolean ok;

  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_text (stmt, 1, now, -1, SQLITE_STATIC);
  sqlite3_bind_int64 (stmt, 2, (gint64) report->computed);
  sqlite3_bind_double (stmt, 3, report->seconds);
  sqlite3_bind_int64 (stmt, 4, report->run_id);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  sqlite3_finalize (stmt);
  if (!ok)
    {
      sl_project_set_db_error (project, error, "derivation_runs");
      return FALSE;
    }
  {
    /* Numbers formatted first: a translator's string holds no 64-bit
     * format macros, which gettext cannot carry. */
    g_autofree char *stars = g_strdup_printf ("%" G_GUINT64_FORMAT, report->computed);
    g_autofree char *run = g_strdup_printf ("%" G_GINT64_FORMAT, report->run_id);

    summary = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "derived %s star (run %s; %s)",
                                            "derived %s stars (run %s; %s)", report->computed),
                               stars, run, described);
  }
  details = g_strdup_printf ("{\"run_id\":%" G_GINT64_FORMAT ",\"stars\":%" G_GUINT64_FORMAT
                             ",\"up_to_date\":%" G_GUINT64_FORMAT "}",
                             report->run_id, report->computed, report->up_to_date);
  return sl_ledger_append (project, "derive", summary, details, error);
}

/* The largest star id with a derived row (0: none).  No star above it
 * has a row, so its row is inserted straight away: trying an UPDATE
 * first bound the whole row twice and looked the star up for nothing,
 * which made the first derive of a million stars slower than a re-derive. */
static gint64
last_derived_star (SlProject *project, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT max(star_id) FROM derived", error);
  gint64 id = -1;

  if (stmt == NULL)
    return -1;
  if (sqlite3_step (stmt) == SQLITE_ROW)
    id = sqlite3_column_int64 (stmt, 0);   /* NULL, no rows: 0 */
  else
    sl_project_set_db_error (project, error, "derived");
  sqlite3_finalize (stmt);
  return id;
}

/* Writes one star's derived row: over the one it may have (UPDATE keeps
 * the row where it is, which costs less than a delete and an insert), or
 * as a new row when the UPDATE found none or the star is above
 * LAST_DERIVED, the largest star id with a row. */
static gboolean
store_row (SlProject *project, sqlite3_stmt *update, sqlite3_stmt *insert, gint64 run_id,
           gint64 last_derived, const SlDeriveItem *item, GError **error)
{
  sqlite3_stmt *stmt = item->inputs.star_id > last_derived ? insert : update;

  for (int pass = 0; pass < 2; pass++, stmt = insert)
    {
      int rc;

      sqlite3_bind_int64 (stmt, 1, item->inputs.star_id);
      sqlite3_bind_int64 (stmt, 2, run_id);
      bind_derived_row (stmt, 3, &item->inputs, &item->values);
      rc = sqlite3_step (stmt);
      if (rc != SQLITE_DONE)
        sl_project_set_db_error (project, error, "derived");
      sqlite3_reset (stmt);
      if (rc != SQLITE_DONE)
        return FALSE;
      if (stmt == insert || sqlite3_changes (sl_project_db (project)) > 0)
        break;
    }
  return TRUE;
}

static gboolean
run_in_transaction (SlProject *project, const SlDeriveParams *params, gboolean all,
                    GCancellable *cancellable, SlProgressFunc progress, gpointer progress_data,
                    SlDeriveReport *report, GError **error)
{
  g_autofree char *params_text = NULL;
  g_autofree char *started = sl_now_utc ();
  g_autofree char *columns = derived_columns_sql ();
  g_autofree char *insert_sql = NULL;
  g_autofree char *update_sql = NULL;
  sqlite3_stmt *update = NULL;
  g_autoptr (GArray) ids = NULL;
  g_autoptr (GHashTable) overrides = NULL;
  g_autoptr (SlInputReader) reader = NULL;
  g_autoptr (SlDerivePool) pool = NULL;
  g_autoptr (GTimer) timer = g_timer_new ();
  sqlite3_stmt *insert = NULL;
  SlStarInputs inputs;
  GError *local = NULL;
  guint64 total;
  gint64 last_derived = 0;
  gboolean read_all = FALSE;
  /* Monte Carlo stars take a thousand times longer: report them often. */
  guint check_every = params->errors == SL_ERRORS_MONTE_CARLO ? 64 : ROWS_PER_CHECK;

  memset (report, 0, sizeof *report);
  /* The same limits whichever front end chose the parameters. */
  if (!sl_derive_params_check (params, error))
    return FALSE;
  insert_sql = derived_insert_sql (columns);
  update_sql = derived_update_sql (columns);

  if (!sl_project_begin (project, error))
    return FALSE;
  report->params = *params;
  if (!sl_combine_policy_read (project, &report->params.combine, error))
    {
      sl_project_rollback (project);
      return FALSE;
    }
  params = &report->params;
  params_text = sl_derive_params_to_keyfile (params);
  ids = stars_to_derive (project, params_text, all, &total, error);
  overrides = ids ? load_all_overrides (project, error) : NULL;
  last_derived = overrides ? last_derived_star (project, error) : -1;
  report->run_id = last_derived >= 0 ? insert_run (project, params_text, started, error) : 0;
  insert = report->run_id ? sl_project_prepare (project, insert_sql, error) : NULL;
  update = insert ? sl_project_prepare (project, update_sql, error) : NULL;
  reader = update ? sl_input_reader_new (project, ids, &params->combine, error) : NULL;
  if (reader == NULL)
    {
      sqlite3_finalize (insert);
      sqlite3_finalize (update);
      sl_project_rollback (project);
      return FALSE;
    }

  /* This thread writes (one SQLite connection, one thread), the reader
   * reads on a thread of its own; the pool derives, in order, on as many
   * threads as there are cores. */
  pool = sl_derive_pool_new (params, sl_derive_threads (), cancellable);
  for (;;)
    {
      const SlDeriveItem *item;

      while (!read_all && !sl_derive_pool_full (pool))
        {
          GArray *star_overrides;

          if (!sl_input_reader_next (reader, &inputs, &local))
            {
              read_all = TRUE;
              break;
            }
          star_overrides = g_hash_table_lookup (overrides, &inputs.star_id);
          sl_derive_pool_push (pool, &inputs,
                               star_overrides ? (const SlOverride *) star_overrides->data : NULL,
                               star_overrides ? star_overrides->len : 0);
        }
      if (local != NULL || (item = sl_derive_pool_pop (pool)) == NULL)
        break;
      /* A cancelled worker leaves the rest of its batch underived. */
      if (g_cancellable_set_error_if_cancelled (cancellable, &local))
        break;
      if (!store_row (project, update, insert, report->run_id, last_derived, item, &local))
        break;
      report->computed++;
      if (report->computed % check_every == 0 && progress)
        progress ((double) report->computed / ids->len, progress_data);
    }
  /* Done with before the commit: the reader's snapshot would keep the
   * checkpoint that follows it from copying this run's pages into the
   * file. */
  g_clear_pointer (&reader, sl_input_reader_free);
  sqlite3_finalize (insert);
  sqlite3_finalize (update);

  report->up_to_date = total - report->computed;
  report->seconds = g_timer_elapsed (timer, NULL);
  if (local != NULL || !finish_run (project, params, report, &local) || !sl_project_commit (project, &local))
    {
      g_propagate_error (error, local);
      sl_project_rollback (project);
      return FALSE;
    }
  return TRUE;
}

gboolean
sl_derivation_run (SlProject *project, const SlDeriveParams *params, gboolean all,
                   GCancellable *cancellable, SlProgressFunc progress, gpointer progress_data,
                   SlDeriveReport *report, GError **error)
{
  gboolean ok;

  memset (report, 0, sizeof *report);
  /* Every derived row refers to a star read in the run's transaction and
   * to the run it inserted: checking both references again for each row
   * took a third of the time of writing it.  The setting holds for whole
   * transactions, so it changes outside one. */
  if (!sl_project_exec (project, "PRAGMA foreign_keys = OFF", error))
    return FALSE;
  ok = run_in_transaction (project, params, all, cancellable, progress, progress_data, report, error);
  if (!sl_project_exec (project, "PRAGMA foreign_keys = ON", ok ? error : NULL))
    ok = FALSE;
  return ok;
}

gboolean
sl_derivation_latest_params (SlProject *project, SlDeriveParams *params, gint64 *run_id, GError **error)
{
  sqlite3_stmt *stmt;
  gboolean ok = TRUE;
  gint64 id = 0;
  int rc;

  g_return_val_if_fail (project != NULL, FALSE);
  g_return_val_if_fail (params != NULL, FALSE);

  sl_derive_params_init (params);
  stmt = sl_project_prepare (project,
                             "SELECT id, parameters FROM derivation_runs WHERE finished_at IS NOT NULL "
                             "ORDER BY id DESC LIMIT 1", error);
  if (stmt == NULL)
    return FALSE;
  rc = sqlite3_step (stmt);
  if (rc == SQLITE_ROW)
    {
      id = sqlite3_column_int64 (stmt, 0);
      ok = sl_derive_params_from_keyfile (params, (const char *) sqlite3_column_text (stmt, 1), error);
    }
  else if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "derivation_runs");
      ok = FALSE;
    }
  sqlite3_finalize (stmt);
  if (!ok)
    sl_derive_params_init (params);
  if (run_id)
    *run_id = ok ? id : 0;
  return ok;
}

/* ------------------------------------------------------------------ */
/* Verification                                                       */

static SlEngine *
engine_for_run (SlProject *project, GHashTable *engines, gint64 run_id, GError **error)
{
  SlEngine *engine = g_hash_table_lookup (engines, &run_id);
  sqlite3_stmt *stmt;
  SlDeriveParams params;
  gboolean ok = FALSE;
  gint64 *key;

  if (engine)
    return engine;
  stmt = sl_project_prepare (project, "SELECT parameters FROM derivation_runs WHERE id = ?", error);
  if (stmt == NULL)
    return NULL;
  sqlite3_bind_int64 (stmt, 1, run_id);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    ok = sl_derive_params_from_keyfile (&params, (const char *) sqlite3_column_text (stmt, 0), error);
  else
    g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, _("derived values refer to run %" PRId64
                                                       ", which is not recorded"), run_id);
  sqlite3_finalize (stmt);
  if (!ok)
    return NULL;
  key = g_new (gint64, 1);
  *key = run_id;
  engine = sl_engine_new (&params);
  g_hash_table_insert (engines, key, engine);
  return engine;
}

static gboolean
same_double (sqlite3_stmt *stmt, int column, gboolean present, double value)
{
  gboolean stored_null = sqlite3_column_type (stmt, column) == SQLITE_NULL;

  if (!present || !isfinite (value))
    return stored_null;
  return !stored_null && sqlite3_column_double (stmt, column) == value;
}

static void
describe_stored (sqlite3_stmt *stmt, int column, char *buf)
{
  if (sqlite3_column_type (stmt, column) == SQLITE_NULL)
    g_strlcpy (buf, "none", G_ASCII_DTOSTR_BUF_SIZE);
  else
    g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, "%.17g", sqlite3_column_double (stmt, column));
}

/* Compares a stored row (columns from FIRST on, as derived_columns_sql)
 * with a recomputation; appends a line per difference. */
static void
compare_row (sqlite3_stmt *stmt, int first, const SlStarInputs *in, const SlDerivedValues *v,
             GPtrArray *mismatches)
{
  char stored[G_ASCII_DTOSTR_BUF_SIZE], again[G_ASCII_DTOSTR_BUF_SIZE];
  int c = first + 1;   /* after stale */

  if ((guint32) sqlite3_column_int64 (stmt, c) != v->flags)
    g_ptr_array_add (mismatches, g_strdup_printf (_("%s: flags differ"), in->designation));
  c += 2;
  for (gsize m = 0; m < N_MEASUREMENT_COLUMNS; m++, c++)
    if (sqlite3_column_int64 (stmt, c) != in->measurement[measurement_columns[m].field])
      g_ptr_array_add (mismatches, g_strdup_printf (_("%s: %s: the inputs now come from another row"),
                                                    in->designation, measurement_columns[m].column));
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      const char *name = sl_quantity_info (q)->name;

      if (sl_quantity_info (q)->is_text)
        {
          const char *text = (const char *) sqlite3_column_text (stmt, c++);

          if (g_strcmp0 (text, v->has[q] ? v->text[q] : NULL) != 0)
            g_ptr_array_add (mismatches, g_strdup_printf (_("%s: %s: stored %s, recomputed %s"), in->designation,
                                                          name, text ? text : "none",
                                                          v->has[q] ? v->text[q] : "none"));
          continue;
        }
      for (int part = 0; part < 3; part++, c++)
        {
          double value = part == 0 ? v->value[q] : part == 1 ? v->lo[q] : v->hi[q];

          if (same_double (stmt, c, v->has[q], value))
            continue;
          describe_stored (stmt, c, stored);
          if (v->has[q] && isfinite (value))
            g_ascii_formatd (again, sizeof again, "%.17g", value);
          else
            g_strlcpy (again, "none", sizeof again);
          g_ptr_array_add (mismatches, g_strdup_printf (_("%s: %s%s: stored %s, recomputed %s"),
                                                        in->designation, name,
                                                        part == 0 ? "" : part == 1 ? "_lo" : "_hi",
                                                        stored, again));
        }
    }
}

static char *
integrity_check (SlProject *project, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "PRAGMA integrity_check", error);
  GString *text = g_string_new (NULL);

  if (stmt == NULL)
    {
      g_string_free (text, TRUE);
      return NULL;
    }
  while (sqlite3_step (stmt) == SQLITE_ROW)
    g_string_append_printf (text, "%s%s", text->len ? "; " : "", sqlite3_column_text (stmt, 0));
  sqlite3_finalize (stmt);
  return g_string_free (text, FALSE);
}

SlVerifyReport *
sl_verify (SlProject *project, GCancellable *cancellable, GError **error)
{
  g_autoptr (SlVerifyReport) report = g_new0 (SlVerifyReport, 1);
  g_autofree char *columns = derived_columns_sql ();
  g_autofree char *sql = g_strdup_printf ("SELECT star_id, run_id, %s FROM derived ORDER BY star_id", columns);
  g_autoptr (GHashTable) engines = g_hash_table_new_full (g_int64_hash, g_int64_equal, g_free,
                                                         (GDestroyNotify) sl_engine_free);
  g_autoptr (GHashTable) overrides = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  sqlite3_stmt *stmt = NULL;
  SlCombinePolicy policy;
  SlStarInputs inputs;
  gboolean have_inputs = FALSE;
  GError *local = NULL;
  int rc;

  report->mismatches = g_ptr_array_new_with_free_func (g_free);
  if (!sl_project_exec (project, "BEGIN", error))
    return NULL;
  report->integrity = integrity_check (project, error);
  overrides = report->integrity ? load_all_overrides (project, error) : NULL;
  stmt = overrides ? sl_project_prepare (project, sql, error) : NULL;
  cursor = stmt && sl_combine_policy_read (project, &policy, error)
             ? sl_input_cursor_new_with_policy (project, 0, &policy, error) : NULL;
  if (cursor == NULL)
    {
      sqlite3_finalize (stmt);
      sl_project_rollback (project);
      return NULL;
    }

  while (local == NULL && (rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      gint64 star_id = sqlite3_column_int64 (stmt, 0);
      SlEngine *engine;
      SlDerivedValues values;
      GArray *star_overrides;

      if (sqlite3_column_int (stmt, 2))
        {
          report->stale++;
          continue;
        }
      /* Walk the inputs in step with the derived rows (both by star id). */
      while ((!have_inputs || inputs.star_id < star_id)
             && (have_inputs = sl_input_cursor_next (cursor, &inputs, &local)))
        ;
      if (local)
        break;
      report->checked++;
      if (!have_inputs || inputs.star_id != star_id)
        {
          g_ptr_array_add (report->mismatches,
                           g_strdup_printf (_("star %" PRId64 ": derived values but no measurements"),
                                            star_id));
          continue;
        }
      engine = engine_for_run (project, engines, sqlite3_column_int64 (stmt, 1), &local);
      if (engine == NULL)
        break;
      /* The run's policy chose its inputs, whatever the project's is now. */
      if (!sl_combine_policy_equal (&sl_engine_params (engine)->combine, &policy))
        sl_input_cursor_choose (cursor, &sl_engine_params (engine)->combine, &inputs);
      star_overrides = g_hash_table_lookup (overrides, &star_id);
      sl_engine_derive (engine, &inputs, star_overrides ? (const SlOverride *) star_overrides->data : NULL,
                        star_overrides ? star_overrides->len : 0, &values);
      compare_row (stmt, 2, &inputs, &values, report->mismatches);
      if (report->checked % ROWS_PER_CHECK == 0
          && g_cancellable_set_error_if_cancelled (cancellable, &local))
        break;
    }
  sqlite3_finalize (stmt);
  sl_project_rollback (project);
  if (local)
    {
      g_propagate_error (error, local);
      return NULL;
    }
  return g_steal_pointer (&report);
}

void
sl_verify_report_free (SlVerifyReport *report)
{
  if (report == NULL)
    return;
  if (report->mismatches)
    g_ptr_array_unref (report->mismatches);
  g_free (report->integrity);
  g_free (report);
}
