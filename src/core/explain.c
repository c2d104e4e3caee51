/* explain.c: the derivation trail of one value.
 *
 * The walk: the module that gives the quantity, and recursively those
 * that give what it needs, in evaluation order; for each, the stored
 * values it gave and the raw inputs it read (from the measurement rows the
 * derived row records).  One walk feeds two writers, text and JSON.
 */
#include "explain.h"

#include <inttypes.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "derivation.h"
#include "inputs.h"
#include "matching.h"
#include "derive/engine.h"
#include "sl-error.h"
#include "util.h"

/* A raw input's value and where it came from. */
typedef struct {
  SlField  field;
  gboolean present;
  double   value, error;
  char    *text;
  gint64   line;
  char    *source_name, *file_name, *sha256, *imported_by, *imported_at, *column;
  char    *unit_declared;
  guint    n_averaged;   /* > 0: not a row but the weighted mean of the next N raw inputs */
} RawInput;

static void
raw_input_clear (RawInput *r)
{
  g_free (r->text);
  g_free (r->source_name);
  g_free (r->file_name);
  g_free (r->sha256);
  g_free (r->imported_by);
  g_free (r->imported_at);
  g_free (r->column);
  g_free (r->unit_declared);
}

/* Loads FIELD (and its error) from measurement MEASUREMENT_ID with the
 * source's provenance and the column the field was mapped from. */
static gboolean
load_raw_input (SlProject *project, gint64 measurement_id, SlField field, RawInput *r, GError **error)
{
  const SlFieldInfo *info = sl_field_info (field);
  SlField err = info->error;
  g_autofree char *sql = g_strdup_printf (
    "SELECT m.%s, %s%s, m.line, s.name, s.file_name, s.sha256, s.imported_by, s.imported_at, "
    "(SELECT value ->> 'column' FROM json_each (s.mapping) WHERE value ->> 'field' = ?2), "
    "(SELECT value ->> 'unit' FROM json_each (s.mapping) WHERE value ->> 'field' = ?2) "
    "FROM measurements m JOIN sources s ON s.id = m.source_id WHERE m.id = ?1",
    info->name, err != SL_FIELD_NONE ? "m." : "NULL", err != SL_FIELD_NONE ? sl_field_info (err)->name : "");
  sqlite3_stmt *stmt = sl_project_prepare (project, sql, error);

  memset (r, 0, sizeof *r);
  r->field = field;
  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_int64 (stmt, 1, measurement_id);
  sqlite3_bind_text (stmt, 2, info->name, -1, SQLITE_STATIC);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    {
      r->present = sqlite3_column_type (stmt, 0) != SQLITE_NULL;
      if (info->kind == SL_FIELD_KIND_TEXT)
        r->text = sl_column_text_dup (stmt, 0);
      r->value = sqlite3_column_double (stmt, 0);
      r->error = sl_column_double_or_nan (stmt, 1);
      r->line = sqlite3_column_int64 (stmt, 2);
      sl_column_texts_dup (stmt, 3, &r->source_name, &r->file_name, &r->sha256, &r->imported_by,
                           &r->imported_at, &r->column, &r->unit_declared, NULL);
    }
  sqlite3_finalize (stmt);
  return TRUE;
}

/* The run a derived row belongs to. */
typedef struct {
  char *started_at, *who, *software_version, *parameters, *methods;
  SlDeriveParams params;
} RunInfo;

static void
run_info_clear (RunInfo *run)
{
  g_free (run->started_at);
  g_free (run->who);
  g_free (run->software_version);
  g_free (run->parameters);
  g_free (run->methods);
}

static gboolean
load_run (SlProject *project, gint64 run_id, RunInfo *run, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "SELECT started_at, who, software_version, parameters, methods "
                                           "FROM derivation_runs WHERE id = ?", error);
  gboolean ok = FALSE;

  memset (run, 0, sizeof *run);
  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_int64 (stmt, 1, run_id);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    {
      sl_column_texts_dup (stmt, 0, &run->started_at, &run->who, &run->software_version,
                           &run->parameters, &run->methods, NULL);
      ok = sl_derive_params_from_keyfile (&run->params, run->parameters, error);
    }
  else
    g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, _("run %" PRId64 " is not recorded"), run_id);
  sqlite3_finalize (stmt);
  return ok;
}

/* An active or past hand-set value. */
typedef struct {
  char  *quantity;
  double value, lo, hi;
  char  *reason, *set_by, *set_at;
} OverrideInfo;

static void
override_info_clear (OverrideInfo *o)
{
  g_free (o->quantity);
  g_free (o->reason);
  g_free (o->set_by);
  g_free (o->set_at);
}

static GArray *
load_override_infos (SlProject *project, gint64 star_id, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "SELECT quantity, value, lo, hi, reason, set_by, set_at FROM overrides "
                                           "WHERE star_id = ? AND cleared_at IS NULL ORDER BY id", error);
  GArray *list;

  if (stmt == NULL)
    return NULL;
  list = g_array_new (FALSE, TRUE, sizeof (OverrideInfo));
  g_array_set_clear_func (list, (GDestroyNotify) override_info_clear);
  sqlite3_bind_int64 (stmt, 1, star_id);
  while (sqlite3_step (stmt) == SQLITE_ROW)
    {
      OverrideInfo o = {
        sl_column_text_dup (stmt, 0), sqlite3_column_double (stmt, 1),
        sl_column_double_or_nan (stmt, 2), sl_column_double_or_nan (stmt, 3),
        sl_column_text_dup (stmt, 4), sl_column_text_dup (stmt, 5), sl_column_text_dup (stmt, 6),
      };

      g_array_append_val (list, o);
    }
  sqlite3_finalize (stmt);
  return list;
}

/* Marks in NEEDED every module the quantity Q depends on. */
static void
mark_needed (SlQuantity q, GHashTable *needed)
{
  const SlModule *m = sl_module_for_quantity (q);

  if (m == NULL || g_hash_table_contains (needed, m))
    return;
  g_hash_table_add (needed, (gpointer) m);
  for (int k = 0; k < SL_MODULE_MAX_IO && m->needs[k] != SL_Q_NONE; k++)
    mark_needed (m->needs[k], needed);
}

/* A parameter's value as recorded, by its name in SlModule.parameters. */
static char *
parameter_value (const SlDeriveParams *p, const char *name)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  if (strcmp (name, "distance") == 0)
    return g_strdup (p->distance == SL_DISTANCE_EDSD ? "edsd" : "inverse");
  if (strcmp (name, "length_scale_pc") == 0)
    return g_strdup_printf ("%s pc", sl_format_double (buf, p->length_scale_pc));
  if (strcmp (name, "parallax_zero_point") == 0)
    return g_strdup_printf ("%s mas", sl_format_double (buf, p->parallax_zero_point));
  if (strcmp (name, "rv") == 0)
    return g_strdup (sl_format_double (buf, p->rv));
  if (strcmp (name, "rv_err") == 0)
    return g_strdup (sl_format_double (buf, p->rv_err));
  if (strcmp (name, "teff") == 0)
    return g_strdup (p->teff == SL_TEFF_BALLESTEROS ? "ballesteros" : "flower");
  return g_strdup ("?");
}

/* ------------------------------------------------------------------ */
/* Writers                                                            */

typedef struct {
  SlExplainFormat format;
  GString        *out;
  gboolean        first_item;   /* JSON: no comma before the next item */
} Writer;

static void
text_value (GString *out, double value, double lo, double hi, const char *unit)
{
  char v[G_ASCII_DTOSTR_BUF_SIZE], l[G_ASCII_DTOSTR_BUF_SIZE], h[G_ASCII_DTOSTR_BUF_SIZE];

  g_ascii_formatd (v, sizeof v, "%.6g", value);
  g_string_append (out, v);
  if (unit && *unit)
    g_string_append_printf (out, " %s", unit);
  if (isfinite (lo) && isfinite (hi))
    g_string_append_printf (out, "  [68%%: %s .. %s]", g_ascii_formatd (l, sizeof l, "%.6g", lo),
                            g_ascii_formatd (h, sizeof h, "%.6g", hi));
  else
    g_string_append (out, _("  [no interval]"));
}

static void
json_key (Writer *w, const char *key)
{
  if (!w->first_item)
    g_string_append_c (w->out, ',');
  w->first_item = FALSE;
  sl_json_append_string (w->out, key);
  g_string_append_c (w->out, ':');
}

static void
json_number (Writer *w, const char *key, double value)
{
  json_key (w, key);
  sl_json_append_number (w->out, value);
}

static void
json_string (Writer *w, const char *key, const char *value)
{
  json_key (w, key);
  if (value)
    sl_json_append_string (w->out, value);
  else
    g_string_append (w->out, "null");
}

static void
json_open (Writer *w, const char *key, char bracket)
{
  if (key)
    json_key (w, key);
  else if (!w->first_item)
    g_string_append_c (w->out, ',');
  g_string_append_c (w->out, bracket);
  w->first_item = TRUE;
}

static void
json_close (Writer *w, char bracket)
{
  g_string_append_c (w->out, bracket);
  w->first_item = FALSE;
}

/* A value that is the weighted mean of the rows that follow it. */
static void
write_mean_input (Writer *w, const RawInput *r)
{
  const SlFieldInfo *info = sl_field_info (r->field);
  char v[G_ASCII_DTOSTR_BUF_SIZE], e[G_ASCII_DTOSTR_BUF_SIZE];

  if (w->format == SL_EXPLAIN_JSON)
    {
      json_open (w, NULL, '{');
      json_string (w, "field", info->name);
      json_number (w, "value", r->value);
      json_number (w, "error", r->error);
      json_string (w, "unit", sl_unit_name (info->canonical));
      json_string (w, "combined_by", "weighted-mean");
      json_number (w, "rows", r->n_averaged);
      json_close (w, '}');
      return;
    }
  g_string_append_printf (w->out, _("      %s = %s +/- %s %s, the inverse-variance weighted mean of the %u rows "
                                    "below (Taylor 1997, ch. 7):\n"),
                          info->name, sl_format_double (v, r->value), sl_format_double (e, r->error),
                          sl_unit_name (info->canonical), r->n_averaged);
}

static void
write_raw_input (Writer *w, const RawInput *r)
{
  const SlFieldInfo *info = sl_field_info (r->field);
  char sha[17];

  if (r->n_averaged > 0)
    {
      write_mean_input (w, r);
      return;
    }
  g_strlcpy (sha, r->sha256 ? r->sha256 : "", sizeof sha);
  if (w->format == SL_EXPLAIN_JSON)
    {
      json_open (w, NULL, '{');
      json_string (w, "field", info->name);
      if (info->kind == SL_FIELD_KIND_TEXT)
        json_string (w, "value", r->present ? r->text : NULL);
      else
        {
          json_number (w, "value", r->present ? r->value : NAN);
          json_number (w, "error", r->error);
          json_string (w, "error_unit", isfinite (r->error) ? sl_unit_name (sl_field_info (info->error)->canonical) : NULL);
        }
      json_string (w, "unit", sl_unit_name (info->canonical));
      json_string (w, "source", r->source_name);
      json_string (w, "file", r->file_name);
      json_string (w, "sha256", r->sha256);
      json_number (w, "line", (double) r->line);
      json_string (w, "column", r->column);
      json_string (w, "column_unit", r->unit_declared);
      json_string (w, "imported_by", r->imported_by);
      json_string (w, "imported_at", r->imported_at);
      json_close (w, '}');
      return;
    }

  g_string_append_printf (w->out, "      %s = ", info->name);
  if (info->kind == SL_FIELD_KIND_TEXT)
    g_string_append (w->out, r->present ? r->text : _("(none)"));
  else
    {
      char v[G_ASCII_DTOSTR_BUF_SIZE], e[G_ASCII_DTOSTR_BUF_SIZE];

      g_string_append_printf (w->out, "%s", sl_format_double (v, r->value));
      /* An error may have its own unit: ra and dec in deg, their errors in mas. */
      if (isfinite (r->error) && sl_field_info (info->error)->canonical != info->canonical)
        g_string_append_printf (w->out, " %s +/- %s %s", sl_unit_name (info->canonical),
                                sl_format_double (e, r->error), sl_unit_name (sl_field_info (info->error)->canonical));
      else if (isfinite (r->error))
        g_string_append_printf (w->out, " +/- %s %s", sl_format_double (e, r->error), sl_unit_name (info->canonical));
      else
        g_string_append_printf (w->out, "%s %s", _(" (no error)"), sl_unit_name (info->canonical));
    }
  g_string_append_printf (w->out, _("\n        from %s, line %" PRId64 ", column '%s' (%s)\n"
                                    "        source '%s', SHA-256 %s…, imported by %s at %s\n"),
                          r->file_name, r->line, r->column ? r->column : "?",
                          r->unit_declared && *r->unit_declared ? r->unit_declared : _("text"),
                          r->source_name, sha, r->imported_by, r->imported_at);
}

static const OverrideInfo *
find_override (GArray *overrides, SlQuantity q)
{
  for (guint i = 0; i < overrides->len; i++)
    {
      const OverrideInfo *o = &g_array_index (overrides, OverrideInfo, i);

      if (strcmp (o->quantity, sl_quantity_info (q)->name) == 0)
        return o;
    }
  return NULL;
}

static void
write_quantity_value (Writer *w, SlQuantity q, const SlDerivedValues *v, GArray *overrides)
{
  const SlQuantityInfo *info = sl_quantity_info (q);
  const OverrideInfo *o = find_override (overrides, q);

  if (w->format == SL_EXPLAIN_JSON)
    {
      json_open (w, NULL, '{');
      json_string (w, "quantity", info->name);
      if (info->is_text)
        json_string (w, "value", v->has[q] ? v->text[q] : NULL);
      else
        {
          json_number (w, "value", v->has[q] ? v->value[q] : NAN);
          json_number (w, "lo", v->has[q] ? v->lo[q] : NAN);
          json_number (w, "hi", v->has[q] ? v->hi[q] : NAN);
        }
      json_string (w, "unit", info->unit);
      if (o)
        {
          json_open (w, "set_by_hand", '{');
          json_string (w, "reason", o->reason);
          json_string (w, "by", o->set_by);
          json_string (w, "at", o->set_at);
          json_close (w, '}');
        }
      json_close (w, '}');
      return;
    }

  g_string_append_printf (w->out, "      %s = ", info->name);
  if (!v->has[q])
    g_string_append (w->out, _("(no value)"));
  else if (info->is_text)
    g_string_append (w->out, v->text[q]);
  else
    text_value (w->out, v->value[q], v->lo[q], v->hi[q], info->unit);
  g_string_append_c (w->out, '\n');
  if (o)
    g_string_append_printf (w->out, _("        SET BY HAND by %s at %s: %s\n"), o->set_by, o->set_at, o->reason);
}

static void
write_step (Writer *w, const SlModule *m, const SlDerivedRow *row, const RunInfo *run,
            GArray *overrides, GArray *raw_inputs, int number)
{
  g_auto (GStrv) params = g_strsplit (m->parameters, ",", -1);

  if (w->format == SL_EXPLAIN_JSON)
    {
      json_open (w, NULL, '{');
      json_string (w, "module", m->name);
      json_number (w, "version", m->version);
      json_string (w, "method", m->method);
      json_string (w, "citation", m->citation);
      json_string (w, "formula", m->formula);
      json_string (w, "validity", m->validity);
      json_open (w, "parameters", '{');
      for (guint i = 0; params[i]; i++)
        {
          g_autofree char *value = NULL;

          g_strstrip (params[i]);
          if (*params[i] == '\0')
            continue;
          value = parameter_value (&run->params, params[i]);
          json_string (w, params[i], value);
        }
      json_close (w, '}');
      json_open (w, "gives", '[');
      for (int k = 0; k < SL_MODULE_MAX_IO && m->gives[k] != SL_Q_NONE; k++)
        write_quantity_value (w, m->gives[k], &row->values, overrides);
      json_close (w, ']');
      json_open (w, "raw_inputs", '[');
      for (guint i = 0; i < raw_inputs->len; i++)
        write_raw_input (w, &g_array_index (raw_inputs, RawInput, i));
      json_close (w, ']');
      json_close (w, '}');
      return;
    }

  g_string_append_printf (w->out, _("  %d. %s (version %d): %s\n"), number, m->name, m->version, _(m->method));
  g_string_append_printf (w->out, _("     formula: %s\n"), _(m->formula));
  g_string_append_printf (w->out, _("     source: %s\n"), m->citation);
  g_string_append_printf (w->out, _("     valid: %s\n"), _(m->validity));
  for (guint i = 0; params[i]; i++)
    {
      g_autofree char *value = NULL;

      g_strstrip (params[i]);
      if (*params[i] == '\0')
        continue;
      value = parameter_value (&run->params, params[i]);
      g_string_append_printf (w->out, _("     parameter %s = %s\n"), params[i], value);
    }
  g_string_append (w->out, _("     gives:\n"));
  for (int k = 0; k < SL_MODULE_MAX_IO && m->gives[k] != SL_Q_NONE; k++)
    write_quantity_value (w, m->gives[k], &row->values, overrides);
  if (raw_inputs->len > 0)
    g_string_append (w->out, _("     from the measurements:\n"));
  for (guint i = 0; i < raw_inputs->len; i++)
    write_raw_input (w, &g_array_index (raw_inputs, RawInput, i));
}

/* The measurement row holding FIELD for this star: the one recorded for
 * the field's group. */
static gint64
measurement_for_field (const SlDerivedRow *row, SlField field)
{
  SlField lead = sl_input_group_lead (field);

  return lead == SL_FIELD_NONE ? 0 : row->measurement[lead];
}

/* The rows a run averaged for the group led by LEAD: the mean first,
 * then each row.  FALSE on a database error. */
static gboolean
collect_mean (SlProject *project, SlInputCursor *cursor, const SlStarInputs *in, SlField field, GArray *raw,
              GError **error)
{
  g_autoptr (GArray) rows = sl_input_cursor_contributions (cursor, sl_input_group_lead (field));
  RawInput mean = { .field = field, .present = TRUE, .value = in->value[field],
                    .error = in->value[sl_field_info (field)->error],
                    .n_averaged = in->n_combined[sl_input_group_lead (field)] };

  g_array_append_val (raw, mean);
  for (guint i = 0; i < rows->len; i++)
    {
      const SlInputContribution *c = &g_array_index (rows, SlInputContribution, i);
      RawInput r;

      if (!c->used)
        continue;
      if (!load_raw_input (project, c->measurement, field, &r, error))
        return FALSE;
      g_array_append_val (raw, r);
    }
  return TRUE;
}

/* The measurements behind module M's inputs: each field's row, or for a
 * field the run averaged over several rows (IN, chosen by the run's
 * policy through CURSOR), the mean and every row in it. */
static gboolean
collect_raw_inputs (SlProject *project, const SlModule *m, const SlDerivedRow *row, SlInputCursor *cursor,
                    const SlStarInputs *in, GArray *raw, GError **error)
{
  for (int k = 0; k < SL_MODULE_MAX_IO && m->inputs[k] != SL_FIELD_NONE; k++)
    {
      SlField f = m->inputs[k];
      gint64 measurement = measurement_for_field (row, f);
      SlField lead = sl_input_group_lead (f);
      RawInput r;

      if (sl_field_info (f)->kind == SL_FIELD_KIND_ERROR || measurement == 0)
        continue;   /* errors come with their values */
      if (in != NULL && lead != SL_FIELD_NONE && in->n_combined[lead] >= 2
          && sl_field_info (f)->error != SL_FIELD_NONE)
        {
          if (!collect_mean (project, cursor, in, f, raw, error))
            return FALSE;
          continue;
        }
      if (!load_raw_input (project, measurement, f, &r, error))
        return FALSE;
      g_array_append_val (raw, r);
    }
  return TRUE;
}

static void
write_header (Writer *w, const char *designation, const char *quantity, const SlDerivedRow *row,
              const RunInfo *run, gint64 run_id)
{
  g_autofree char *flags = sl_flags_to_string (row->values.flags);
  g_autofree char *described = sl_derive_params_describe (&run->params);

  if (w->format == SL_EXPLAIN_JSON)
    {
      json_string (w, "star", designation);
      json_string (w, "quantity", quantity);
      json_open (w, "run", '{');
      json_number (w, "id", (double) run_id);
      json_string (w, "started_at", run->started_at);
      json_string (w, "who", run->who);
      json_string (w, "software_version", run->software_version);
      json_string (w, "parameters", described);
      json_close (w, '}');
      json_string (w, "uncertainties", row->values.monte_carlo
                                       ? "monte carlo: median with 15.87 and 84.13 percentiles"
                                       : "first order: value -/+ 1 sigma, covariance carried");
      json_number (w, "stale", row->stale);
      json_open (w, "flags", '[');
      for (guint i = 0; i < SL_N_FLAGS; i++)
        if (row->values.flags & sl_flag_info (i)->flag)
          {
            json_open (w, NULL, '{');
            json_string (w, "flag", sl_flag_info (i)->name);
            json_string (w, "meaning", sl_flag_info (i)->explanation);
            json_close (w, '}');
          }
      json_close (w, ']');
      return;
    }

  g_string_append_printf (w->out, _("%s: %s\n"), designation, quantity);
  g_string_append_printf (w->out, _("Derived in run %" PRId64 " at %s by %s (Starledger %s)\n"),
                          run_id, run->started_at, run->who, run->software_version);
  g_string_append_printf (w->out, _("Parameters: %s\n"), described);
  g_string_append_printf (w->out, _("Uncertainties: %s\n"),
                          row->values.monte_carlo
                            ? _("Monte Carlo draws: median with the 15.87th and 84.13th percentiles")
                            : _("first-order propagation (value -/+ 1 sigma), covariances carried through the chain"));
  if (row->stale)
    g_string_append (w->out, _("STALE: the inputs or hand-set values changed after this run; run 'derive'.\n"));
  if (*flags)
    {
      g_string_append (w->out, _("Flags:\n"));
      for (guint i = 0; i < SL_N_FLAGS; i++)
        if (row->values.flags & sl_flag_info (i)->flag)
          g_string_append_printf (w->out, "  %s: %s\n", sl_flag_info (i)->name, _(sl_flag_info (i)->explanation));
    }
}

/* Teff, L and R share the colour: the 1-sigma ellipse the HR diagram draws. */
static void
write_hr_ellipse (Writer *w, const SlDerivedValues *v)
{
  char a[G_ASCII_DTOSTR_BUF_SIZE], b[G_ASCII_DTOSTR_BUF_SIZE], c[G_ASCII_DTOSTR_BUF_SIZE];

  if (w->format == SL_EXPLAIN_JSON)
    {
      json_open (w, "hr_error_ellipse", '{');
      json_number (w, "sigma_log_teff", v->logt_sigma);
      json_number (w, "sigma_log_lum", v->logl_sigma);
      json_number (w, "correlation", v->logt_logl_corr);
      json_close (w, '}');
      return;
    }
  g_string_append_printf (w->out, _("Error ellipse in the HR diagram: sigma(log Teff) = %s, sigma(log L) = %s, "
                                    "correlation %s\n"),
                          g_ascii_formatd (a, sizeof a, "%.3g", v->logt_sigma),
                          g_ascii_formatd (b, sizeof b, "%.3g", v->logl_sigma),
                          g_ascii_formatd (c, sizeof c, "%.3f", v->logt_logl_corr));
}

/* How the star's rows were joined to it by position (import
 * --match-radius), or left it (split): the evidence that two rows are one
 * star. */
static gboolean
write_matches (Writer *w, SlProject *project, gint64 star_id, GError **error)
{
  g_autoptr (GArray) infos = sl_match_infos_for_star (project, star_id, error);
  char sep[G_ASCII_DTOSTR_BUF_SIZE], ep[G_ASCII_DTOSTR_BUF_SIZE], rad[G_ASCII_DTOSTR_BUF_SIZE];

  if (infos == NULL)
    return FALSE;
  if (w->format == SL_EXPLAIN_JSON)
    {
      json_open (w, "matches", '[');
      for (guint i = 0; i < infos->len; i++)
        {
          const SlMatchInfo *m = &g_array_index (infos, SlMatchInfo, i);

          json_open (w, NULL, '{');
          json_string (w, "status", m->status);
          json_number (w, "source_id", (double) m->source_id);
          json_string (w, "source", m->source_name);
          json_string (w, "file", m->file_name);
          json_number (w, "line", m->line);
          json_string (w, "row_id", m->row_designation);
          json_string (w, "star", m->star);
          json_number (w, "separation_arcsec", m->separation);
          json_number (w, "epoch", m->epoch);
          json_number (w, "radius_arcsec", m->radius);
          json_key (w, "candidates");
          g_string_append (w->out, m->candidates);
          json_string (w, "reason", m->reason);
          json_string (w, "split_from", m->other_star);
          json_string (w, "split_by", m->split_by);
          json_string (w, "split_at", m->split_at);
          json_close (w, '}');
        }
      json_close (w, ']');
      return TRUE;
    }

  if (infos->len == 0)
    return TRUE;
  g_string_append (w->out, _("Rows joined by position (import --match-radius):\n"));
  for (guint i = 0; i < infos->len; i++)
    {
      const SlMatchInfo *m = &g_array_index (infos, SlMatchInfo, i);

      g_string_append_printf (w->out, _("  %s line %u (source %" PRId64 " '%s'), its id '%s': "),
                              m->file_name, m->line, m->source_id, m->source_name, m->row_designation);
      g_ascii_formatd (sep, sizeof sep, "%.3f", m->separation);
      if (isfinite (m->epoch))
        {
          ep[0] = 'J';
          g_ascii_formatd (ep + 1, sizeof ep - 1, "%.3f", m->epoch);
        }
      else
        g_strlcpy (ep, _("the positions' own epochs (none known)"), sizeof ep);
      sl_format_double (rad, m->radius);
      if (strcmp (m->status, "matched") == 0)
        g_string_append_printf (w->out, _("taken as this star: the only star within %s arcsec, %s arcsec "
                                          "away, both positions moved to %s with their proper motions\n"
                                          "    (undo with 'starledger-cli split PROJECT %" PRId64 ":%u')\n"),
                                rad, sep, ep, m->source_id, m->line);
      else if (strcmp (m->status, "ambiguous") == 0)
        g_string_append_printf (w->out, _("ambiguous at %s, so not merged but kept as this star of its own: %s\n"),
                                ep, m->reason);
      else
        g_string_append_printf (w->out, _("had been taken as star %s (%s arcsec away at %s); split off "
                                          "into star %s by %s at %s\n"),
                                m->other_star, sep, ep, m->star, m->split_by, m->split_at);
    }
  return TRUE;
}

/* For a group that two or more rows measured: the rule that chose, the
 * agreement test, and the rows the value did not use (those it used are
 * in the steps). */
static gboolean
write_sources (Writer *w, SlProject *project, SlInputCursor *cursor, const SlStarInputs *in, SlField lead,
               const SlCombinePolicy *policy, gboolean show_used, GError **error)
{
  g_autoptr (GArray) rows = sl_input_cursor_contributions (cursor, lead);
  SlCombineRule rule = policy->rule[lead];
  gboolean tested = in->n_tested[lead] >= 2;
  gboolean disagree = tested && policy->level > 0 && in->p_value[lead] < policy->level;
  char chi2[G_ASCII_DTOSTR_BUF_SIZE], p[G_ASCII_DTOSTR_BUF_SIZE], level[G_ASCII_DTOSTR_BUF_SIZE];

  if (rows->len < 2)
    return TRUE;
  g_ascii_formatd (chi2, sizeof chi2, "%.3g", in->chi2[lead]);
  g_ascii_formatd (p, sizeof p, "%.3g", in->p_value[lead]);
  sl_format_double (level, policy->level);
  if (w->format == SL_EXPLAIN_JSON)
    {
      json_open (w, NULL, '{');
      json_string (w, "group", sl_combine_group_name (lead));
      json_string (w, "rule", sl_combine_rule_name (rule));
      json_number (w, "rows", rows->len);
      json_number (w, "averaged", in->n_combined[lead]);
      json_number (w, "chi2", tested ? in->chi2[lead] : NAN);
      json_number (w, "dof", tested ? in->dof[lead] : NAN);
      json_number (w, "p_value", tested ? in->p_value[lead] : NAN);
      json_number (w, "level", policy->level);
      json_key (w, "disagree");
      g_string_append (w->out, disagree ? "true" : "false");
      json_open (w, "rows_not_used", '[');
    }
  else
    {
      g_string_append_printf (w->out, _("  %s: %u rows; rule %s"), sl_combine_group_name (lead), rows->len,
                              sl_combine_rule_name (rule));
      if (in->n_combined[lead] >= 2)
        g_string_append_printf (w->out, _(": the weighted mean of %u of them\n"), in->n_combined[lead]);
      else if (rule == SL_COMBINE_WEIGHTED_MEAN)
        g_string_append (w->out, _(": fewer than two rows with errors, so the smallest uncertainty\n"));
      else
        g_string_append (w->out, _(": one row chosen\n"));
      if (!tested)
        g_string_append (w->out, lead == SL_FIELD_RA
                                   ? _("    agreement not tested (positions of different epochs differ by the "
                                       "proper motion)\n")
                                   : _("    agreement not tested (fewer than two rows with errors)\n"));
      else
        g_string_append_printf (w->out, ngettext ("    agreement: chi-square %s for %u degree of freedom, P = %s: %s\n",
                                                  "    agreement: chi-square %s for %u degrees of freedom, P = %s: %s\n",
                                                  in->dof[lead]),
                                chi2, in->dof[lead], p,
                                policy->level <= 0 ? _("not judged (the run had no test level)")
                                : disagree ? _("the sources DISAGREE beyond their errors")
                                : _("consistent"));
      if (tested && policy->level > 0)
        g_string_append_printf (w->out, _("    (level %s; Taylor 1997, ch. 12)\n"), level);
    }
  for (guint i = 0; i < rows->len; i++)
    {
      const SlInputContribution *c = &g_array_index (rows, SlInputContribution, i);
      RawInput r;

      if (c->used && !show_used)
        continue;
      if (w->format == SL_EXPLAIN_TEXT)
        g_string_append (w->out, c->used ? _("    used:\n") : _("    not used:\n"));
      /* Every value of the group: both proper-motion components. */
      for (SlField f = 0; f < SL_N_FIELDS; f++)
        {
          if (sl_input_group_lead (f) != lead || sl_field_info (f)->kind != SL_FIELD_KIND_VALUE
              || sl_field_info (f)->error == SL_FIELD_NONE)
            continue;
          if (!load_raw_input (project, c->measurement, f, &r, error))
            return FALSE;
          write_raw_input (w, &r);
          raw_input_clear (&r);
        }
    }
  if (w->format == SL_EXPLAIN_JSON)
    {
      json_close (w, ']');
      json_close (w, '}');
    }
  return TRUE;
}

/* The sources section for the groups behind NEEDED's modules. */
static gboolean
write_all_sources (Writer *w, SlProject *project, SlInputCursor *cursor, const SlStarInputs *in,
                   const SlCombinePolicy *policy, GHashTable *needed, GError **error)
{
  gboolean want[SL_N_FIELDS] = { FALSE };
  gboolean any = FALSE;
  GHashTableIter iter;
  gpointer key;

  g_hash_table_iter_init (&iter, needed);
  while (g_hash_table_iter_next (&iter, &key, NULL))
    {
      const SlModule *m = key;

      for (int k = 0; k < SL_MODULE_MAX_IO && m->inputs[k] != SL_FIELD_NONE; k++)
        {
          SlField lead = sl_input_group_lead (m->inputs[k]);

          if (lead != SL_FIELD_NONE && sl_combine_group_name (lead) != NULL)
            want[lead] = TRUE;
        }
    }
  for (SlField lead = 0; lead < SL_N_FIELDS; lead++)
    {
      g_autoptr (GArray) rows = NULL;

      if (!want[lead])
        continue;
      rows = sl_input_cursor_contributions (cursor, lead);
      if (rows->len < 2)
        continue;
      if (!any && w->format == SL_EXPLAIN_JSON)
        json_open (w, "sources", '[');
      else if (!any)
        g_string_append (w->out, _("Inputs measured by several sources:\n"));
      any = TRUE;
      if (!write_sources (w, project, cursor, in, lead, policy, FALSE, error))
        return FALSE;
    }
  if (any && w->format == SL_EXPLAIN_JSON)
    json_close (w, ']');
  return TRUE;
}

static gboolean
explain_input (SlProject *project, const char *designation, SlField field, Writer *w, GError **error)
{
  gint64 star_id = sl_star_lookup (project, designation, error);
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (GArray) raw = g_array_new (FALSE, TRUE, sizeof (RawInput));
  SlField lead = sl_input_group_lead (field);
  SlCombinePolicy policy;
  SlStarInputs in;
  gboolean ok;

  g_array_set_clear_func (raw, (GDestroyNotify) raw_input_clear);
  if (star_id == 0 || !sl_combine_policy_read (project, &policy, error))
    return FALSE;
  cursor = sl_input_cursor_new_with_policy (project, star_id, &policy, error);
  if (cursor == NULL || !sl_input_cursor_next (cursor, &in, error))
    return FALSE;
  if (in.measurement[field] == 0)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s has no %s"), designation,
                   sl_field_info (field)->name);
      return FALSE;
    }
  if (in.n_combined[lead] >= 2 && sl_field_info (field)->error != SL_FIELD_NONE)
    ok = collect_mean (project, cursor, &in, field, raw, error);
  else
    {
      RawInput r;

      ok = load_raw_input (project, in.measurement[field], field, &r, error);
      if (ok)
        g_array_append_val (raw, r);
    }
  if (!ok)
    return FALSE;
  if (w->format == SL_EXPLAIN_JSON)
    {
      json_string (w, "star", designation);
      json_string (w, "quantity", sl_field_info (field)->name);
      json_open (w, "raw_inputs", '[');
      for (guint i = 0; i < raw->len; i++)
        write_raw_input (w, &g_array_index (raw, RawInput, i));
      json_close (w, ']');
      if (field != SL_FIELD_SPTYPE)
        json_open (w, "sources", '[');
    }
  else
    {
      g_string_append_printf (w->out, ngettext ("%s: %s, a measured input (the star has %u row of measurements; "
                                                "the project combines sources by its policy, see "
                                                "'starledger-cli combine')\n",
                                                "%s: %s, a measured input (the star has %u rows of measurements; "
                                                "the project combines sources by its policy, see "
                                                "'starledger-cli combine')\n", in.n_measurements),
                              designation, sl_field_info (field)->name, in.n_measurements);
      for (guint i = 0; i < raw->len; i++)
        write_raw_input (w, &g_array_index (raw, RawInput, i));
    }
  if (field != SL_FIELD_SPTYPE
      && !write_sources (w, project, cursor, &in, lead, &policy, FALSE, error))
    return FALSE;
  if (w->format == SL_EXPLAIN_JSON && field != SL_FIELD_SPTYPE)
    json_close (w, ']');
  return write_matches (w, project, star_id, error);
}

gboolean
sl_explain (SlProject *project, const char *designation, const char *quantity,
            SlExplainFormat format, GString *out, GError **error)
{
  Writer w = { format, out, TRUE };
  g_autoptr (GHashTable) needed = g_hash_table_new (NULL, NULL);
  g_autoptr (GPtrArray) order = NULL;
  g_autoptr (GArray) overrides = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;
  RunInfo run;
  SlDerivedRow row;
  SlQuantity q;
  SlField field;
  gint64 star_id;
  gboolean ok = TRUE;
  int number = 0;

  if (format == SL_EXPLAIN_JSON)
    g_string_append_c (out, '{');

  if (!sl_quantity_from_name (quantity, &q))
    {
      if (sl_field_from_name (quantity, &field) && sl_field_info (field)->kind != SL_FIELD_KIND_ERROR
          && field != SL_FIELD_ID)
        {
          ok = explain_input (project, designation, field, &w, error);
          if (format == SL_EXPLAIN_JSON)
            g_string_append (out, "}\n");
          return ok;
        }
      g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME,
                   _("'%s' is neither a derived quantity nor an input field"), quantity);
      return FALSE;
    }

  star_id = sl_star_lookup (project, designation, error);
  if (star_id == 0)
    return FALSE;
  if (!sl_derived_row_load (project, star_id, &row, error))
    {
      if (error && *error == NULL)
        g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME,
                     _("%s has no derived values yet; run 'starledger-cli derive' first"), designation);
      return FALSE;
    }
  if (!load_run (project, row.run_id, &run, error))
    return FALSE;
  /* The inputs as the run chose them: its policy, today's rows (a row
   * imported since makes the star stale, which the header says). */
  cursor = sl_input_cursor_new_with_policy (project, star_id, &run.params.combine, error);
  if (cursor == NULL || !sl_input_cursor_next (cursor, &in, error))
    {
      run_info_clear (&run);
      return FALSE;
    }
  overrides = load_override_infos (project, star_id, error);

  write_header (&w, designation, quantity, &row, &run, row.run_id);
  if ((q == SL_Q_TEFF || q == SL_Q_LUM || q == SL_Q_RADIUS) && isfinite (row.values.logt_logl_corr))
    write_hr_ellipse (&w, &row.values);
  if (format == SL_EXPLAIN_TEXT)
    g_string_append (out, _("Steps, from the measurements up:\n"));
  if (format == SL_EXPLAIN_JSON)
    {
      json_key (&w, "value");
      w.first_item = TRUE;
      write_quantity_value (&w, q, &row.values, overrides);
      json_open (&w, "steps", '[');
    }

  mark_needed (q, needed);
  order = sl_modules_in_order ();
  for (guint i = 0; ok && i < order->len; i++)
    {
      const SlModule *m = order->pdata[i];
      g_autoptr (GArray) raw = NULL;

      if (!g_hash_table_contains (needed, m))
        continue;
      raw = g_array_new (FALSE, TRUE, sizeof (RawInput));
      g_array_set_clear_func (raw, (GDestroyNotify) raw_input_clear);
      ok = collect_raw_inputs (project, m, &row, cursor, &in, raw, error);
      if (ok)
        write_step (&w, m, &row, &run, overrides, raw, ++number);
    }

  if (format == SL_EXPLAIN_JSON)
    json_close (&w, ']');
  ok = ok && write_all_sources (&w, project, cursor, &in, &run.params.combine, needed, error);
  ok = ok && write_matches (&w, project, star_id, error);
  if (format == SL_EXPLAIN_JSON)
    g_string_append (out, "}\n");
  run_info_clear (&run);
  return ok;
}
