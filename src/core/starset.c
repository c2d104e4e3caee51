/* starset.c: loading a project's stars for drawing. */
#include "starset.h"

#include <glib/gi18n.h>
#include <math.h>

#include "derivation.h"
#include "inputs.h"
#include "lists.h"
#include "sl-error.h"

/* Rows between two looks at the cancellable: a few milliseconds of work. */
#define CANCEL_CHECK_ROWS 4096

static double
value_or_nan (const SlStarInputs *in, SlField f)
{
  return in->present[f] ? in->value[f] : NAN;
}

static void
fill_inputs (SlPlotStar *s, const SlStarInputs *in)
{
  s->star_id = in->star_id;
  s->ra = value_or_nan (in, SL_FIELD_RA);
  s->dec = value_or_nan (in, SL_FIELD_DEC);
  s->epoch = value_or_nan (in, SL_FIELD_EPOCH);
  s->parallax = value_or_nan (in, SL_FIELD_PARALLAX);
  s->parallax_err = value_or_nan (in, SL_FIELD_PARALLAX_ERR);
  s->pmra = value_or_nan (in, SL_FIELD_PMRA);
  s->pmdec = value_or_nan (in, SL_FIELD_PMDEC);
  s->vmag = value_or_nan (in, SL_FIELD_VMAG);
}

static double
derived_or_nan (const SlDerivedValues *v, SlQuantity q, int part)
{
  if (v == NULL || !v->has[q])
    return NAN;
  return part == 0 ? v->value[q] : part < 0 ? v->lo[q] : v->hi[q];
}

static void
fill_derived (SlPlotStar *s, const SlDerivedValues *v)
{
  s->bv0 = derived_or_nan (v, SL_Q_BV0, 0);
  s->bv0_lo = derived_or_nan (v, SL_Q_BV0, -1);
  s->bv0_hi = derived_or_nan (v, SL_Q_BV0, 1);
  s->absmag = derived_or_nan (v, SL_Q_ABSMAG, 0);
  s->absmag_lo = derived_or_nan (v, SL_Q_ABSMAG, -1);
  s->absmag_hi = derived_or_nan (v, SL_Q_ABSMAG, 1);
  s->teff = derived_or_nan (v, SL_Q_TEFF, 0);
  s->teff_lo = derived_or_nan (v, SL_Q_TEFF, -1);
  s->teff_hi = derived_or_nan (v, SL_Q_TEFF, 1);
  s->lum = derived_or_nan (v, SL_Q_LUM, 0);
  s->lum_lo = derived_or_nan (v, SL_Q_LUM, -1);
  s->lum_hi = derived_or_nan (v, SL_Q_LUM, 1);
  s->elat = derived_or_nan (v, SL_Q_ELAT, 0);
  s->ellipse_a = derived_or_nan (v, SL_Q_ELLIPSE_A, 0);
  s->ellipse_b = derived_or_nan (v, SL_Q_ELLIPSE_B, 0);
  s->ellipse_pa = derived_or_nan (v, SL_Q_ELLIPSE_PA, 0);
  s->logt_sigma = v ? v->logt_sigma : NAN;
  s->logl_sigma = v ? v->logl_sigma : NAN;
  s->logt_logl_corr = v ? v->logt_logl_corr : NAN;
}

/* Steps the derived rows (in star order) up to STAR_ID. */
static const SlDerivedValues *
derived_for (sqlite3_stmt *stmt, gint64 star_id, SlDerivedRow *row, gboolean *pending, gboolean *done)
{
  while (!*done && (!*pending || row->star_id < star_id))
    {
      if (sqlite3_step (stmt) != SQLITE_ROW)
        {
          *done = TRUE;
          break;
        }
      sl_derived_row_read (stmt, row);
      *pending = TRUE;
    }
  return *pending && row->star_id == star_id ? &row->values : NULL;
}

/* WANTED (designations) or MEMBERS (star ids, ascending) restrict the
 * stars loaded when not NULL. */
/* When the newest run finished: figures carry it as their date, so the
 * same project gives the same file. */
static gboolean
note_run_time (SlStarSet *set, SlProject *project, GError **error)
{
  sqlite3_stmt *stmt;

  if (set->run_id == 0)
    return TRUE;
  stmt = sl_project_prepare (project, "SELECT finished_at FROM derivation_runs WHERE id = ?", error);
  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_int64 (stmt, 1, set->run_id);
  if (sqlite3_step (stmt) == SQLITE_ROW && sqlite3_column_type (stmt, 0) == SQLITE_TEXT)
    set->run_finished_at = g_string_chunk_insert (set->strings, (const char *) sqlite3_column_text (stmt, 0));
  sqlite3_finalize (stmt);
  return TRUE;
}

static gboolean
load_all (SlStarSet *set, SlProject *project, GHashTable *wanted, const GArray *members,
          GCancellable *cancellable, GError **error)
{
  g_autofree char *sql = sl_derived_select_sql ("ORDER BY star_id");
  g_autoptr (SlInputCursor) cursor = sl_input_cursor_new (project, 0, error);
  sqlite3_stmt *stmt = cursor ? sl_project_prepare (project, sql, error) : NULL;
  gboolean pending = FALSE, done = FALSE;
  SlDerivedRow row;
  SlStarInputs in;
  GError *local = NULL;
  guint next_member = 0;
  guint64 n_rows = 0;

  if (stmt == NULL)
    return FALSE;
  while (sl_input_cursor_next (cursor, &in, &local))
    {
      const SlDerivedValues *v;
      SlPlotStar s;
      guint *slot = NULL;

      if (++n_rows % CANCEL_CHECK_ROWS == 0 && g_cancellable_set_error_if_cancelled (cancellable, &local))
        break;
      v = derived_for (stmt, in.star_id, &row, &pending, &done);

      if (wanted && (slot = g_hash_table_lookup (wanted, in.designation)) == NULL)
        continue;
      if (members)
        {
          while (next_member < members->len && g_array_index (members, gint64, next_member) < in.star_id)
            next_member++;
          if (next_member == members->len || g_array_index (members, gint64, next_member) != in.star_id)
            continue;
        }
      fill_inputs (&s, &in);
      fill_derived (&s, v);
      s.designation = g_string_chunk_insert (set->strings, in.designation);
      if (v)
        {
          set->n_derived++;
          set->run_id = MAX (set->run_id, row.run_id);
        }
      if (slot)
        g_array_index (set->stars, SlPlotStar, *slot - 1) = s;
      else
        g_array_append_val (set->stars, s);
      if (slot)
        *slot = 0;   /* found */
    }
  sqlite3_finalize (stmt);
  if (local)
    {
      g_propagate_error (error, local);
      return FALSE;
    }
  return note_run_time (set, project, error);
}

SlStarSet *
sl_star_set_load (SlProject *project, const char *const *designations, GError **error)
{
  return sl_star_set_load_full (project, designations, NULL, error);
}

SlStarSet *
sl_star_set_load_full (SlProject *project, const char *const *designations, GCancellable *cancellable,
                       GError **error)
{
  g_autoptr (SlStarSet) set = g_new0 (SlStarSet, 1);
  g_autoptr (GHashTable) wanted = NULL;
  g_autofree guint *slots = NULL;
  guint n_wanted = designations ? g_strv_length ((char **) designations) : 0;

  set->stars = g_array_new (FALSE, TRUE, sizeof (SlPlotStar));
  set->strings = g_string_chunk_new (4096);

  /* Wanted stars keep the order they were named in: slot i + 1 for the
   * i-th name, 0 once found. */
  if (designations)
    {
      wanted = g_hash_table_new (g_str_hash, g_str_equal);
      slots = g_new (guint, n_wanted);
      g_array_set_size (set->stars, n_wanted);
      for (guint i = 0; i < n_wanted; i++)
        {
          slots[i] = i + 1;
          g_hash_table_insert (wanted, (gpointer) designations[i], &slots[i]);
        }
    }

  if (!sl_project_exec (project, "BEGIN", error))
    return NULL;
  if (!load_all (set, project, wanted, NULL, cancellable, error))
    {
      sl_project_rollback (project);
      return NULL;
    }
  sl_project_rollback (project);

  for (guint i = 0; i < n_wanted; i++)
    if (slots[i] != 0)
      {
        g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: no star '%s' in the project"),
                     sl_project_path (project), designations[i]);
        return NULL;
      }
  return g_steal_pointer (&set);
}

SlStarSet *
sl_star_set_load_list (SlProject *project, const char *name, GError **error)
{
  return sl_star_set_load_list_full (project, name, NULL, error);
}

SlStarSet *
sl_star_set_load_list_full (SlProject *project, const char *name, GCancellable *cancellable, GError **error)
{
  g_autoptr (SlStarSet) set = g_new0 (SlStarSet, 1);
  g_autoptr (GArray) members = NULL;
  gboolean ok;

  g_return_val_if_fail (name != NULL, NULL);

  set->stars = g_array_new (FALSE, TRUE, sizeof (SlPlotStar));
  set->strings = g_string_chunk_new (4096);
  if (!sl_project_exec (project, "BEGIN", error))
    return NULL;
  members = sl_list_star_ids (project, name, error);
  ok = members != NULL && load_all (set, project, NULL, members, cancellable, error);
  sl_project_rollback (project);
  return ok ? g_steal_pointer (&set) : NULL;
}

SlStarSet *
sl_star_set_ref (SlStarSet *set)
{
  g_return_val_if_fail (set != NULL, NULL);
  g_atomic_int_inc (&set->extra_refs);
  return set;
}

void
sl_star_set_free (SlStarSet *set)
{
  if (set == NULL)
    return;
  /* Each sl_star_set_ref asks for one more free before the set goes. */
  for (;;)
    {
      int extra = g_atomic_int_get (&set->extra_refs);

      if (extra == 0)
        break;
      if (g_atomic_int_compare_and_exchange (&set->extra_refs, extra, extra - 1))
        return;
    }
  g_array_unref (set->stars);
  g_string_chunk_free (set->strings);
  g_free (set);
}
