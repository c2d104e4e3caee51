/* inputs.c: choosing a star's inputs among its measurements. */
#include "inputs.h"

#include <inttypes.h>
#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "derive/derive.h"
#include "ledger.h"
#include "sl-error.h"
#include "util.h"

/* The groups of fields chosen together, each led by the field whose
 * uncertainty decides. */
typedef struct {
  SlField lead;
  SlField members[5];
  guint   n_members;
} FieldGroup;

static const FieldGroup groups[] = {
  { SL_FIELD_RA, { SL_FIELD_RA, SL_FIELD_RA_ERR, SL_FIELD_DEC, SL_FIELD_DEC_ERR, SL_FIELD_EPOCH }, 5 },
  { SL_FIELD_PARALLAX, { SL_FIELD_PARALLAX, SL_FIELD_PARALLAX_ERR }, 2 },
  { SL_FIELD_PMRA, { SL_FIELD_PMRA, SL_FIELD_PMRA_ERR, SL_FIELD_PMDEC, SL_FIELD_PMDEC_ERR }, 4 },
  { SL_FIELD_VMAG, { SL_FIELD_VMAG, SL_FIELD_VMAG_ERR }, 2 },
  { SL_FIELD_BMAG, { SL_FIELD_BMAG, SL_FIELD_BMAG_ERR }, 2 },
  { SL_FIELD_BV, { SL_FIELD_BV, SL_FIELD_BV_ERR }, 2 },
  { SL_FIELD_EBV, { SL_FIELD_EBV, SL_FIELD_EBV_ERR }, 2 },
  { SL_FIELD_VRAD, { SL_FIELD_VRAD, SL_FIELD_VRAD_ERR }, 2 },
};

SlField
sl_input_group_lead (SlField field)
{
  g_return_val_if_fail (field < SL_N_FIELDS, SL_FIELD_NONE);
  if (field == SL_FIELD_SPTYPE)
    return SL_FIELD_SPTYPE;   /* alone: the later source's */
  for (gsize g = 0; g < G_N_ELEMENTS (groups); g++)
    for (guint m = 0; m < groups[g].n_members; m++)
      if (groups[g].members[m] == field)
        return groups[g].lead;
  return SL_FIELD_NONE;
}

/* One measurements row as read. */
typedef struct {
  gint64   id;
  gint64   source_id;
  guint    rank;      /* in the policy's source order; G_MAXUINT when not listed */
  gboolean present[SL_N_FIELDS];
  double   value[SL_N_FIELDS];
  char    *sptype;   /* in the cursor's string chunk */
} MeasurementRow;

struct _SlInputCursor {
  SlCombinePolicy policy;
  GHashTable   *source_names; /* source id -> name, for the source order */
  gint64        star_id;      /* the current star */
  const char   *designation;
  sqlite3_stmt *stmt;
  gboolean      has_pending;  /* stmt holds a stepped row of the next star */
  gboolean      finished;     /* stepped to the end, or failed */
  GArray       *rows;         /* MeasurementRow of the current star */
  GStringChunk *strings;      /* designation and spectral types of the current star */
};

/* Result columns: star_id, designation, id, source_id, then the fields
 * from ra on. */
#define FIRST_FIELD_COLUMN 4

/* Every source's name by id: what a source order ranks. */
static GHashTable *
read_source_names (SlProject *project, GError **error)
{
  GHashTable *names = g_hash_table_new_full (g_int64_hash, g_int64_equal, g_free, g_free);
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT id, name FROM sources", error);
  int rc;

  if (stmt == NULL)
    {
      g_hash_table_unref (names);
      return NULL;
    }
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    g_hash_table_insert (names, g_memdup2 (&(gint64) { sqlite3_column_int64 (stmt, 0) }, sizeof (gint64)),
                         g_strdup ((const char *) sqlite3_column_text (stmt, 1)));
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "sources");
      g_hash_table_unref (names);
      return NULL;
    }
  return names;
}

SlInputCursor *
sl_input_cursor_new (SlProject *project, gint64 star_id, GError **error)
{
  SlCombinePolicy policy;

  if (!sl_combine_policy_read (project, &policy, error))
    return NULL;
  return sl_input_cursor_new_with_policy (project, star_id, &policy, error);
}

SlInputCursor *
sl_input_cursor_new_with_policy (SlProject *project, gint64 star_id, const SlCombinePolicy *policy,
                                 GError **error)
{
  g_autoptr (GString) sql = g_string_new ("SELECT m.star_id, s.designation, m.id, m.source_id");
  g_autoptr (GHashTable) source_names = NULL;
  SlInputCursor *cursor;
  sqlite3_stmt *stmt;

  if (!sl_combine_policy_check (policy, error))
    return NULL;
  source_names = read_source_names (project, error);
  if (source_names == NULL)
    return NULL;
  for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
    g_string_append_printf (sql, ", m.%s", sl_field_info (f)->name);
  g_string_append (sql, " FROM measurements m JOIN stars s ON s.id = m.star_id");
  if (star_id > 0)
    g_string_append (sql, " WHERE m.star_id = ?1");
  g_string_append (sql, " ORDER BY m.star_id, m.source_id");

  stmt = sl_project_prepare (project, sql->str, error);
  if (stmt == NULL)
    return NULL;
  if (star_id > 0)
    sqlite3_bind_int64 (stmt, 1, star_id);

  cursor = g_new0 (SlInputCursor, 1);
  cursor->policy = *policy;
  cursor->source_names = g_steal_pointer (&source_names);
  cursor->stmt = stmt;
  cursor->rows = g_array_new (FALSE, FALSE, sizeof (MeasurementRow));
  cursor->strings = g_string_chunk_new (256);
  return cursor;
}

static void
read_row (SlInputCursor *cursor, MeasurementRow *row)
{
  row->id = sqlite3_column_int64 (cursor->stmt, 2);
  row->source_id = sqlite3_column_int64 (cursor->stmt, 3);
  row->rank = G_MAXUINT;
  row->sptype = NULL;
  for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
    {
      int column = FIRST_FIELD_COLUMN + (f - (SL_FIELD_ID + 1));

      row->present[f] = sqlite3_column_type (cursor->stmt, column) != SQLITE_NULL;
      row->value[f] = row->present[f] ? sqlite3_column_double (cursor->stmt, column) : NAN;
      if (f == SL_FIELD_SPTYPE && row->present[f])
        row->sptype = g_string_chunk_insert (cursor->strings,
                                             (const char *) sqlite3_column_text (cursor->stmt, column));
    }
}

/* Whether row A beats row B for a group led by LEAD (B came earlier). */
static gboolean
better_for_group (const MeasurementRow *a, const MeasurementRow *b, SlField lead)
{
  SlField error = sl_field_info (lead)->error;
  double ea, eb;

  if (!b->present[lead])
    return TRUE;
  if (error == SL_FIELD_NONE)
    return TRUE;
  if (a->present[error] != b->present[error])
    return a->present[error];
  if (!a->present[error])
    return TRUE;
  ea = a->value[error];
  eb = b->value[error];
  if (lead == SL_FIELD_RA && a->present[SL_FIELD_DEC_ERR] && b->present[SL_FIELD_DEC_ERR])
    {
      ea = hypot (ea, a->value[SL_FIELD_DEC_ERR]);
      eb = hypot (eb, b->value[SL_FIELD_DEC_ERR]);
    }
  return ea <= eb;
}

/* The group's value fields (those with an error field): what a mean
 * averages and the agreement test compares. */
static guint
group_values (const FieldGroup *group, SlField *values)
{
  guint n = 0;

  for (guint m = 0; m < group->n_members; m++)
    if (sl_field_info (group->members[m])->error != SL_FIELD_NONE)
      values[n++] = group->members[m];
  return n;
}

/* Whether ROW has every value of the group with a usable error. */
static gboolean
row_has_errors (const MeasurementRow *row, const SlField *values, guint n_values)
{
  for (guint v = 0; v < n_values; v++)
    {
      SlField error = sl_field_info (values[v])->error;

      if (!row->present[values[v]] || !row->present[error] || !(row->value[error] > 0))
        return FALSE;
    }
  return TRUE;
}

/* The weighted mean of FIELD over the ROWS that have every one of the
 * group's VALUES with an error (the same rows for each component); FALSE
 * with fewer than two.  *N_ROWS: how many went in. */
static gboolean
mean_of_rows (const GArray *rows, const SlField *values, guint n_values, SlField field, SlWeightedMean *mean,
              guint *n_rows)
{
  /* On the cursor's path for every star with several rows: no allocation
   * for the usual handful of sources. */
  double stack[2 * 16];
  g_autofree double *heap = rows->len > 16 ? g_new (double, 2 * rows->len) : NULL;
  double *x = heap ? heap : stack, *e = x + (heap ? rows->len : 16);
  guint n = 0;

  for (guint r = 0; r < rows->len; r++)
    {
      const MeasurementRow *row = &g_array_index (rows, MeasurementRow, r);

      if (!row_has_errors (row, values, n_values))
        continue;
      x[n] = row->value[field];
      e[n++] = row->value[sl_field_info (field)->error];
    }
  *n_rows = n;
  return n >= 2 && sl_weighted_mean (x, e, n, mean);
}

/* The single row a group takes under RULE (not a mean): NULL if no row
 * measured the group. */
static const MeasurementRow *
choose_row (const GArray *rows, const FieldGroup *group, SlCombineRule rule)
{
  const MeasurementRow *best = NULL;

  for (guint r = 0; r < rows->len; r++)
    {
      const MeasurementRow *row = &g_array_index (rows, MeasurementRow, r);

      if (!row->present[group->lead])
        continue;
      if (best == NULL)
        best = row;
      else if (rule == SL_COMBINE_PRIORITY && row->rank != best->rank)
        best = row->rank < best->rank ? row : best;
      else if (better_for_group (row, best, group->lead))
        best = row;
    }
  return best;
}

/* The weighted mean of each of the group's values over the rows that
 * have them all with errors (the same rows for each component), the one
 * computation behind both the agreement test and the mean; FALSE with
 * fewer than two such rows.  Positions are left out: rows of different
 * epochs differ by the proper motion. */
static gboolean
group_means (const GArray *rows, const FieldGroup *group, SlWeightedMean *means, guint *n_rows)
{
  SlField values[2];
  guint n_values = group_values (group, values);

  if (group->lead == SL_FIELD_RA || rows->len < 2)
    return FALSE;
  for (guint v = 0; v < n_values; v++)
    if (!mean_of_rows (rows, values, n_values, values[v], &means[v], n_rows))
      return FALSE;
  return TRUE;
}

/* The agreement test: chi-square summed over the group's values (for the
 * proper motion both components, 2 (n - 1) degrees of freedom). */
static void
record_agreement (const FieldGroup *group, const SlWeightedMean *means, guint n_rows,
                  const SlCombinePolicy *policy, SlStarInputs *inputs)
{
  SlField values[2];
  guint n_values = group_values (group, values), dof = 0;
  double chi2 = 0.0;

  for (guint v = 0; v < n_values; v++)
    {
      chi2 += means[v].chi2;
      dof += means[v].dof;
    }
  inputs->n_tested[group->lead] = n_rows;
  inputs->chi2[group->lead] = chi2;
  inputs->dof[group->lead] = dof;
  inputs->p_value[group->lead] = sl_chi2_tail (chi2, dof);
  if (policy->level > 0 && inputs->p_value[group->lead] < policy->level)
    inputs->flags |= SL_FLAG_SOURCES_DISAGREE;
}

/* The group's values as their means; the recorded row is the most
 * precise of those averaged. */
static void
take_means (const GArray *rows, const FieldGroup *group, const SlWeightedMean *means, guint n_rows,
            SlStarInputs *inputs)
{
  SlField values[2];
  guint n_values = group_values (group, values);
  const MeasurementRow *most_precise = NULL;

  for (guint r = 0; r < rows->len; r++)
    {
      const MeasurementRow *row = &g_array_index (rows, MeasurementRow, r);

      if (row_has_errors (row, values, n_values)
          && (most_precise == NULL || better_for_group (row, most_precise, group->lead)))
        most_precise = row;
    }
  for (guint v = 0; v < n_values; v++)
    {
      SlField error = sl_field_info (values[v])->error;

      inputs->present[values[v]] = inputs->present[error] = TRUE;
      inputs->value[values[v]] = means[v].mean;
      inputs->value[error] = means[v].error;
    }
  for (guint m = 0; m < group->n_members; m++)
    inputs->measurement[group->members[m]] = most_precise->id;
  inputs->n_combined[group->lead] = n_rows;
}

static void
take_row (const MeasurementRow *row, const FieldGroup *group, SlStarInputs *inputs)
{
  for (guint m = 0; m < group->n_members; m++)
    {
      SlField f = group->members[m];

      inputs->present[f] = row->present[f];
      inputs->value[f] = row->value[f];
      inputs->measurement[f] = row->present[f] ? row->id : 0;
    }
}

/* Each row's place in POLICY's source order (G_MAXUINT: not listed). */
static void
rank_rows (SlInputCursor *cursor, const SlCombinePolicy *policy)
{
  for (guint r = 0; r < cursor->rows->len; r++)
    {
      MeasurementRow *row = &g_array_index (cursor->rows, MeasurementRow, r);
      const char *name = g_hash_table_lookup (cursor->source_names, &row->source_id);
      guint rank = name ? sl_combine_priority_rank (policy, name) : 0;

      row->rank = rank > 0 ? rank : G_MAXUINT;
    }
}

static void
choose_inputs (SlInputCursor *cursor, const SlCombinePolicy *policy, SlStarInputs *inputs)
{
  memset (inputs->present, 0, sizeof inputs->present);
  memset (inputs->n_combined, 0, sizeof inputs->n_combined);
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      inputs->value[f] = NAN;
      inputs->measurement[f] = 0;
      inputs->chi2[f] = inputs->p_value[f] = NAN;
      inputs->dof[f] = inputs->n_tested[f] = 0;
    }
  inputs->sptype = NULL;
  inputs->flags = 0;
  inputs->n_measurements = cursor->rows->len;

  if (cursor->rows->len > 1 && policy->priority[0] != '\0')
    rank_rows (cursor, policy);
  for (gsize g = 0; g < G_N_ELEMENTS (groups); g++)
    {
      SlCombineRule rule = policy->rule[groups[g].lead];
      SlWeightedMean means[2];
      const MeasurementRow *row;
      guint n_rows = 0;

      if (group_means (cursor->rows, &groups[g], means, &n_rows))
        {
          record_agreement (&groups[g], means, n_rows, policy, inputs);
          if (rule == SL_COMBINE_WEIGHTED_MEAN)
            {
              take_means (cursor->rows, &groups[g], means, n_rows, inputs);
              continue;
            }
        }
      row = choose_row (cursor->rows, &groups[g], rule);
      if (row != NULL)
        take_row (row, &groups[g], inputs);
    }

  for (guint r = 0; r < cursor->rows->len; r++)
    {
      const MeasurementRow *row = &g_array_index (cursor->rows, MeasurementRow, r);

      if (row->sptype != NULL)
        {
          inputs->sptype = row->sptype;
          inputs->present[SL_FIELD_SPTYPE] = TRUE;
          inputs->measurement[SL_FIELD_SPTYPE] = row->id;
        }
    }
}

gboolean
sl_input_cursor_next (SlInputCursor *cursor, SlStarInputs *inputs, GError **error)
{
  int rc = SQLITE_ROW;

  if (cursor->finished)
    return FALSE;

  g_array_set_size (cursor->rows, 0);
  g_string_chunk_clear (cursor->strings);

  if (!cursor->has_pending)
    {
      rc = sqlite3_step (cursor->stmt);
      if (rc != SQLITE_ROW)
        goto finished;
    }

  inputs->star_id = cursor->star_id = sqlite3_column_int64 (cursor->stmt, 0);
  /* The schema says NOT NULL; a damaged file may say otherwise. */
  if (sqlite3_column_type (cursor->stmt, 1) != SQLITE_TEXT)
    {
      cursor->has_pending = FALSE;
      cursor->finished = TRUE;
      g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, _("star %" PRId64 " has no designation: the project is damaged"),
                   inputs->star_id);
      return FALSE;
    }
  inputs->designation = cursor->designation =
    g_string_chunk_insert (cursor->strings, (const char *) sqlite3_column_text (cursor->stmt, 1));
  do
    {
      MeasurementRow row;

      read_row (cursor, &row);
      g_array_append_val (cursor->rows, row);
      rc = sqlite3_step (cursor->stmt);
    }
  while (rc == SQLITE_ROW && sqlite3_column_int64 (cursor->stmt, 0) == inputs->star_id);

  cursor->has_pending = rc == SQLITE_ROW;
  /* Stepping a finished statement again would restart it. */
  cursor->finished = rc != SQLITE_ROW;
  if (rc != SQLITE_ROW && rc != SQLITE_DONE)
    goto finished;
  choose_inputs (cursor, &cursor->policy, inputs);
  return TRUE;

finished:
  cursor->has_pending = FALSE;
  cursor->finished = TRUE;
  if (rc != SQLITE_DONE)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, "%s",
                   sqlite3_errmsg (sqlite3_db_handle (cursor->stmt)));
    }
  return FALSE;
}

void
sl_input_cursor_choose (SlInputCursor *cursor, const SlCombinePolicy *policy, SlStarInputs *inputs)
{
  g_return_if_fail (cursor->rows->len > 0);
  inputs->star_id = cursor->star_id;
  inputs->designation = cursor->designation;
  choose_inputs (cursor, policy, inputs);
  if (cursor->rows->len > 1 && cursor->policy.priority[0] != '\0')
    rank_rows (cursor, &cursor->policy);
}

void
sl_input_cursor_free (SlInputCursor *cursor)
{
  if (cursor == NULL)
    return;
  sqlite3_finalize (cursor->stmt);
  g_hash_table_unref (cursor->source_names);
  g_array_unref (cursor->rows);
  g_string_chunk_free (cursor->strings);
  g_free (cursor);
}

static const FieldGroup *
group_of (SlField lead)
{
  for (gsize g = 0; g < G_N_ELEMENTS (groups); g++)
    if (groups[g].lead == lead)
      return &groups[g];
  return NULL;
}

GArray *
sl_input_cursor_contributions (SlInputCursor *cursor, SlField lead)
{
  GArray *out = g_array_new (FALSE, TRUE, sizeof (SlInputContribution));
  const FieldGroup *group = group_of (lead);
  const MeasurementRow *chosen = NULL;
  SlField values[2];
  guint n_values, n_with_errors = 0;
  gboolean mean;

  g_return_val_if_fail (group != NULL, out);
  n_values = group_values (group, values);
  for (guint r = 0; r < cursor->rows->len; r++)
    if (row_has_errors (&g_array_index (cursor->rows, MeasurementRow, r), values, n_values))
      n_with_errors++;
  mean = cursor->policy.rule[lead] == SL_COMBINE_WEIGHTED_MEAN && n_with_errors >= 2;
  if (!mean)
    chosen = choose_row (cursor->rows, group, cursor->policy.rule[lead]);
  for (guint r = 0; r < cursor->rows->len; r++)
    {
      const MeasurementRow *row = &g_array_index (cursor->rows, MeasurementRow, r);
      SlInputContribution c = { row->id, row->source_id, FALSE, FALSE };

      if (!row->present[lead])
        continue;
      c.tested = lead != SL_FIELD_RA && n_with_errors >= 2 && row_has_errors (row, values, n_values);
      c.used = mean ? row_has_errors (row, values, n_values) : row == chosen;
      g_array_append_val (out, c);
    }
  return out;
}

char *
sl_input_order_sql (const SlCombinePolicy *policy, SlField lead)
{
  GString *sql = g_string_new (NULL);
  const char *error = sl_field_info (sl_field_info (lead)->error)->name;

  g_return_val_if_fail (group_of (lead) != NULL, NULL);
  if (policy->rule[lead] == SL_COMBINE_PRIORITY && policy->priority[0] != '\0')
    {
      g_auto (GStrv) names = g_strsplit (policy->priority, "\n", -1);

      g_string_append (sql, "CASE (SELECT name FROM sources WHERE id = m.source_id)");
      for (guint i = 0; names[i] != NULL; i++)
        {
          char *quoted = sqlite3_mprintf ("%Q", names[i]);

          g_string_append_printf (sql, " WHEN %s THEN %u", quoted, i + 1);
          sqlite3_free (quoted);
        }
      g_string_append (sql, " ELSE 4294967295 END, ");
    }
  /* A row with an error first, then the smaller error (for the position
   * hypot (ra_err, dec_err), compared as its square), then the later
   * source.  (The cursor compares ra_err alone when only one of two rows
   * has a dec_err; no single sort key can say that.) */
  g_string_append_printf (sql, "m.%s IS NULL, ", error);
  if (lead == SL_FIELD_RA)
    g_string_append (sql, "m.ra_err * m.ra_err + coalesce (m.dec_err * m.dec_err, 0)");
  else
    g_string_append_printf (sql, "m.%s", error);
  g_string_append (sql, ", m.source_id DESC");
  return g_string_free (sql, FALSE);
}

char *
sl_input_value_sql (const SlCombinePolicy *policy, SlField field, const char *row, const char *star)
{
  const SlFieldInfo *info = sl_field_info (field);
  SlField lead = sl_input_group_lead (field);
  SlField value = info->kind == SL_FIELD_KIND_ERROR ? info->value_of : field;
  const FieldGroup *group = group_of (lead);
  g_autoptr (GString) rows_with_errors = g_string_new (NULL);
  const char *v, *e;
  SlField values[2];
  guint n_values;

  if (group == NULL || policy->rule[lead] != SL_COMBINE_WEIGHTED_MEAN
      || sl_field_info (value)->error == SL_FIELD_NONE)
    return g_strdup_printf ("%s.%s", row, info->name);
  n_values = group_values (group, values);
  for (guint i = 0; i < n_values; i++)
    g_string_append_printf (rows_with_errors, " AND m.%s IS NOT NULL AND m.%s > 0", sl_field_info (values[i])->name,
                            sl_field_info (sl_field_info (values[i])->error)->name);
  v = sl_field_info (value)->name;
  e = sl_field_info (sl_field_info (value)->error)->name;
  /* The weights as the cursor computes them: w = 1 / (e e), then w x. */
  if (info->kind == SL_FIELD_KIND_ERROR)
    return g_strdup_printf ("coalesce ((SELECT CASE WHEN count (*) >= 2 THEN 1.0 / sqrt (sum (1.0 / (m.%s * m.%s)))"
                            " END FROM measurements m WHERE m.star_id = %s%s), %s.%s)",
                            e, e, star, rows_with_errors->str, row, info->name);
  return g_strdup_printf ("coalesce ((SELECT CASE WHEN count (*) >= 2 THEN sum ((1.0 / (m.%s * m.%s)) * m.%s)"
                          " / sum (1.0 / (m.%s * m.%s)) END FROM measurements m WHERE m.star_id = %s%s), %s.%s)",
                          e, e, v, e, e, star, rows_with_errors->str, row, info->name);
}

/* The policy's key in the settings table. */
#define POLICY_KEY "combine"

gboolean
sl_combine_policy_read (SlProject *project, SlCombinePolicy *policy, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT value FROM settings WHERE key = '" POLICY_KEY "'",
                                           error);
  g_autoptr (GKeyFile) key_file = g_key_file_new ();
  g_autofree char *text = NULL;
  int rc;

  sl_combine_policy_init (policy);
  if (stmt == NULL)
    return FALSE;
  rc = sqlite3_step (stmt);
  if (rc == SQLITE_ROW)
    text = g_strdup ((const char *) sqlite3_column_text (stmt, 0));
  sqlite3_finalize (stmt);
  if (rc != SQLITE_ROW && rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "settings");
      return FALSE;
    }
  if (text == NULL)
    return TRUE;
  if (!g_key_file_load_from_data (key_file, text, -1, G_KEY_FILE_NONE, error)
      || !sl_combine_policy_load (policy, key_file, error))
    {
      g_prefix_error (error, _("the project's combination policy is damaged: "));
      return FALSE;
    }
  return TRUE;
}

GPtrArray *
sl_combine_source_names (SlProject *project, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "SELECT name FROM sources GROUP BY name ORDER BY min (id)",
                                           error);
  g_autoptr (GPtrArray) names = g_ptr_array_new_with_free_func (g_free);
  int rc;

  if (stmt == NULL)
    return NULL;
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    g_ptr_array_add (names, g_strdup ((const char *) sqlite3_column_text (stmt, 0)));
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "sources");
      return NULL;
    }
  return g_steal_pointer (&names);
}

/* Whether every name of the source order is a source's: a misspelt name
 * would silently rank nothing. */
static gboolean
check_source_order (SlProject *project, const SlCombinePolicy *policy, GError **error)
{
  g_autoptr (GPtrArray) names = NULL;
  g_auto (GStrv) order = NULL;

  if (policy->priority[0] == '\0')
    return TRUE;
  names = sl_combine_source_names (project, error);
  if (names == NULL)
    return FALSE;
  order = g_strsplit (policy->priority, "\n", -1);
  for (guint i = 0; order[i] != NULL; i++)
    {
      gboolean known = FALSE;

      for (guint n = 0; n < names->len && !known; n++)
        known = g_strcmp0 (order[i], names->pdata[n]) == 0;
      if (!known)
        {
          g_autoptr (GString) all = g_string_new (NULL);

          for (guint n = 0; n < names->len; n++)
            g_string_append_printf (all, "%s'%s'", n ? ", " : "", (const char *) names->pdata[n]);
          g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("no source is named '%s' (the sources: %s)"),
                       order[i], names->len ? all->str : _("none yet"));
          return FALSE;
        }
    }
  return TRUE;
}

gboolean
sl_combine_policy_write (SlProject *project, const SlCombinePolicy *policy, GError **error)
{
  g_autoptr (GKeyFile) key_file = g_key_file_new ();
  g_autofree char *text = NULL;
  g_autofree char *before = NULL;
  g_autofree char *after = NULL;
  g_autofree char *summary = NULL;
  g_autoptr (GString) details = g_string_new ("{\"before\": ");
  SlCombinePolicy old;
  sqlite3_stmt *stmt;
  gboolean ok;

  if (!sl_combine_policy_check (policy, error) || !sl_project_begin (project, error))
    return FALSE;
  if (!sl_combine_policy_read (project, &old, error) || !check_source_order (project, policy, error))
    {
      sl_project_rollback (project);
      return FALSE;
    }
  sl_combine_policy_save (policy, key_file);
  text = g_key_file_to_data (key_file, NULL, NULL);
  stmt = sl_project_prepare (project, "INSERT INTO settings (key, value) VALUES ('" POLICY_KEY "', ?1)"
                                      " ON CONFLICT (key) DO UPDATE SET value = excluded.value", error);
  if (stmt == NULL)
    {
      sl_project_rollback (project);
      return FALSE;
    }
  sqlite3_bind_text (stmt, 1, text, -1, SQLITE_STATIC);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  sqlite3_finalize (stmt);
  if (!ok)
    sl_project_set_db_error (project, error, "settings");
  before = sl_combine_policy_describe (&old);
  after = sl_combine_policy_describe (policy);
  summary = g_strdup_printf (_("combination policy: %s"), after);
  sl_json_append_string (details, before);
  g_string_append (details, ", \"after\": ");
  sl_json_append_string (details, after);
  g_string_append_c (details, '}');
  /* Values derived by the old policy no longer follow the project's. */
  ok = ok && (sl_combine_policy_equal (&old, policy)
              || sl_project_exec (project, "UPDATE derived SET stale = 1 WHERE stale = 0", error));
  ok = ok && sl_ledger_append (project, "combine", summary, details->str, error) && sl_project_commit (project, error);
  if (!ok)
    sl_project_rollback (project);
  return ok;
}
