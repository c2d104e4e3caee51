/* export.c: the table of each star's inputs, derived values and flags.
 *
 * An input's interval is its value plus or minus its 1-sigma error.  The
 * right ascension error is on the sky (times cos Dec), so the RA interval
 * in degrees is widened by 1/cos Dec; at the poles it has no bounds.
 * Derived values come with the bounds stored by their run.  Positions
 * at another epoch: see export.h.
 */
#include "export.h"

#include <glib/gi18n.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "crossmatch.h"
#include "derivation.h"
#include "inputs.h"
#include "lists.h"
#include "rounding.h"
#include "sl-error.h"
#include "units.h"
#include "util.h"
#include "vocabulary.h"

/* One column of the table: an input field, a derived quantity, or the
 * flags. */
typedef enum {
  COLUMN_INPUT,
  COLUMN_DERIVED,
  COLUMN_FLAGS,
} ColumnKind;

typedef struct {
  ColumnKind kind;
  int        index;   /* SlField or SlQuantity */
} Column;

/* Whether a field is a quantity of the table (errors become intervals). */
static gboolean
is_input_quantity (SlField field)
{
  SlFieldKind kind = sl_field_info (field)->kind;

  return kind == SL_FIELD_KIND_VALUE || kind == SL_FIELD_KIND_TEXT;
}

static const char *
column_name (const Column *c)
{
  switch (c->kind)
    {
    case COLUMN_INPUT:   return sl_field_info (c->index)->name;
    case COLUMN_DERIVED: return sl_quantity_info (c->index)->name;
    default:             return "flags";
    }
}

static const char *
column_unit (const Column *c)
{
  switch (c->kind)
    {
    case COLUMN_INPUT:   return sl_unit_name (sl_field_info (c->index)->canonical);
    case COLUMN_DERIVED: return sl_quantity_info (c->index)->unit;
    default:             return "";
    }
}

static gboolean
column_is_text (const Column *c)
{
  switch (c->kind)
    {
    case COLUMN_INPUT:   return sl_field_info (c->index)->kind == SL_FIELD_KIND_TEXT;
    case COLUMN_DERIVED: return sl_quantity_info (c->index)->is_text;
    default:             return TRUE;
    }
}

static GArray *
all_columns (void)
{
  GArray *columns = g_array_new (FALSE, FALSE, sizeof (Column));

  for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
    if (is_input_quantity (f))
      g_array_append_val (columns, ((Column) { COLUMN_INPUT, f }));
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    g_array_append_val (columns, ((Column) { COLUMN_DERIVED, q }));
  g_array_append_val (columns, ((Column) { COLUMN_FLAGS, 0 }));
  return columns;
}

GPtrArray *
sl_export_column_names (void)
{
  g_autoptr (GArray) columns = all_columns ();
  GPtrArray *names = g_ptr_array_new ();

  for (guint i = 0; i < columns->len; i++)
    g_ptr_array_add (names, (gpointer) column_name (&g_array_index (columns, Column, i)));
  return names;
}

static GArray *
resolve_columns (const char *const *names, GError **error)
{
  g_autoptr (GArray) known = all_columns ();
  GArray *columns;

  if (names == NULL)
    return g_steal_pointer (&known);

  columns = g_array_new (FALSE, FALSE, sizeof (Column));
  for (guint i = 0; names[i]; i++)
    {
      gboolean found = FALSE;

      if (g_ascii_strcasecmp (names[i], "id") == 0)
        continue;  /* always the first column */
      for (guint k = 0; k < known->len && !found; k++)
        if (g_ascii_strcasecmp (names[i], column_name (&g_array_index (known, Column, k))) == 0)
          {
            g_array_append_val (columns, g_array_index (known, Column, k));
            found = TRUE;
          }
      if (!found)
        {
          g_autoptr (GPtrArray) all = sl_export_column_names ();
          g_autofree char *list = NULL;

          g_ptr_array_add (all, NULL);
          list = g_strjoinv (", ", (char **) all->pdata);
          g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME,
                       _("no column '%s'; the columns are: id, %s (each number comes "
                         "with its _lo and _hi bounds)"), names[i], list);
          g_array_unref (columns);
          return NULL;
        }
    }
  return columns;
}

/* With positions at an epoch, the epoch column says which epoch each
 * row's position is at: chosen ra or dec bring it, right after them. */
static void
add_epoch_column (GArray *columns)
{
  guint after = 0;
  gboolean has_position = FALSE;

  for (guint i = 0; i < columns->len; i++)
    {
      const Column *c = &g_array_index (columns, Column, i);

      if (c->kind != COLUMN_INPUT)
        continue;
      if (c->index == SL_FIELD_EPOCH)
        return;
      if (c->index == SL_FIELD_RA || c->index == SL_FIELD_DEC)
        {
          has_position = TRUE;
          after = i + 1;
        }
    }
  if (has_position)
    g_array_insert_val (columns, after, ((Column) { COLUMN_INPUT, SL_FIELD_EPOCH }));
}

/* ------------------------------------------------------------------ */
/* One row's cells                                                    */

/* A star's inputs and, if derived, its derived row. */
typedef struct {
  const SlStarInputs *in;
  const SlDerivedRow *derived;   /* NULL if the star was never derived */
  gboolean            not_propagated;  /* asked for another epoch, but not moved */
} StarRow;

/* The half-width of an input's interval in its own unit, or NAN if none. */
static double
interval_half_width (const SlStarInputs *in, SlField field)
{
  SlField error = sl_field_info (field)->error;
  double width;

  if (error == SL_FIELD_NONE || !in->present[error])
    return NAN;
  width = in->value[error];
  if (field == SL_FIELD_RA || field == SL_FIELD_DEC)
    width /= 3.6e6;   /* mas to degrees */
  if (field == SL_FIELD_RA)
    {
      double cos_dec = in->present[SL_FIELD_DEC] ? cos (in->value[SL_FIELD_DEC] * G_PI / 180.0) : NAN;

      width = cos_dec > 1e-9 ? width / cos_dec : NAN;
    }
  return width;
}

/* The numbers of a numeric column: FALSE if there is no value. */
static gboolean
column_numbers (const Column *c, const StarRow *row, double *value, double *lo, double *hi)
{
  if (c->kind == COLUMN_INPUT)
    {
      double half;

      if (!row->in->present[c->index])
        return FALSE;
      half = interval_half_width (row->in, c->index);
      *value = row->in->value[c->index];
      *lo = *value - half;
      *hi = *value + half;
      return TRUE;
    }
  if (row->derived == NULL || !row->derived->values.has[c->index])
    return FALSE;
  *value = row->derived->values.value[c->index];
  *lo = row->derived->values.lo[c->index];
  *hi = row->derived->values.hi[c->index];
  return TRUE;
}

/* The text of a text column (NULL: empty); FREE_ME holds what to free. */
static const char *
column_text (const Column *c, const StarRow *row, char **free_me)
{
  *free_me = NULL;
  if (c->kind == COLUMN_INPUT)
    return row->in->sptype;
  if (c->kind == COLUMN_DERIVED)
    return row->derived && row->derived->values.has[c->index] ? row->derived->values.text[c->index] : NULL;
  if (row->derived == NULL)
    *free_me = g_strdup ("not_derived");
  else
    *free_me = sl_flags_to_string (row->derived->values.flags);
  if (row->derived != NULL && row->derived->stale)
    {
      char *with_stale = g_strconcat (**free_me ? *free_me : "", **free_me ? "|" : "", "stale", NULL);

      g_free (*free_me);
      *free_me = with_stale;
    }
  if (row->not_propagated)
    {
      char *with_note = g_strconcat (**free_me ? *free_me : "", **free_me ? "|" : "",
                                     SL_EXPORT_FLAG_NOT_PROPAGATED, NULL);

      g_free (*free_me);
      *free_me = with_note;
    }
  return *free_me;
}

/* ------------------------------------------------------------------ */
/* Positions at an epoch                                              */

/* A 1-sigma position error (mas) grown over DT years by a proper-motion
 * error (mas/yr): the first-order propagation sigma^2 = sigma_0^2 +
 * (dt sigma_mu)^2 (ESA 1997, Hipparcos Catalogue Vol. 1, Sect. 1.5.5,
 * without the position/proper-motion correlations, which no catalogue
 * row we read carries). */
static double
grown_error (double sigma0, double dt, double sigma_mu)
{
  return sqrt (sigma0 * sigma0 + dt * dt * sigma_mu * sigma_mu);
}

gboolean
sl_export_position_at_epoch (SlStarInputs *in, double epoch)
{
  SlAstrometry a;
  double ra, dec, dt;

  if (!in->present[SL_FIELD_RA] || !in->present[SL_FIELD_DEC] || !in->present[SL_FIELD_EPOCH]
      || !in->present[SL_FIELD_PMRA] || !in->present[SL_FIELD_PMDEC] || !isfinite (epoch))
    return FALSE;
  sl_astrometry_init (&a);
  a.ra = in->value[SL_FIELD_RA];
  a.dec = in->value[SL_FIELD_DEC];
  a.epoch = in->value[SL_FIELD_EPOCH];
  a.pmra = in->value[SL_FIELD_PMRA];
  a.pmdec = in->value[SL_FIELD_PMDEC];
  if (in->present[SL_FIELD_PARALLAX])
    a.parallax = in->value[SL_FIELD_PARALLAX];
  if (in->present[SL_FIELD_VRAD])
    a.vrad = in->value[SL_FIELD_VRAD];
  dt = epoch - a.epoch;
  /* The same epoch: nothing moves, and it is where it was asked to be. */
  if (dt != 0.0 && !sl_astrometry_propagate (&a, epoch, &ra, &dec))
    return FALSE;
  if (dt != 0.0)
    {
      in->value[SL_FIELD_RA] = ra;
      in->value[SL_FIELD_DEC] = dec;
    }
  in->value[SL_FIELD_EPOCH] = epoch;
  /* Each coordinate's error grows with its own proper-motion error; with
   * that unknown, so is the error at the new epoch. */
  for (guint k = 0; k < 2; k++)
    {
      SlField error = k == 0 ? SL_FIELD_RA_ERR : SL_FIELD_DEC_ERR;
      SlField pm_error = k == 0 ? SL_FIELD_PMRA_ERR : SL_FIELD_PMDEC_ERR;

      if (!in->present[error] || dt == 0.0)
        continue;
      if (in->present[pm_error])
        in->value[error] = grown_error (in->value[error], dt, in->value[pm_error]);
      else
        in->present[error] = FALSE;
    }
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* CSV                                                                */

/* A spreadsheet runs a cell that starts with = + - @ (or a tab or carriage
 * return, which some strip first) as a formula: a hostile designation in a
 * catalogue extract could then run commands on a colleague's machine.  As
 * common practice (the OWASP advice on CSV injection) recommends, such a
 * text cell, unless it is a plain number, is written with a leading
 * apostrophe, which spreadsheets show as text and do not evaluate. */
static gboolean
csv_text_needs_neutralising (const char *text)
{
  const char *problem;
  double number;

  if (strchr ("=+-@\t\r", text[0]) == NULL || text[0] == '\0')
    return FALSE;
  return !sl_parse_number (text, &number, &problem);
}

static void
write_csv_text (FILE *out, const char *text)
{
  g_autofree char *neutral = NULL;

  if (text == NULL)
    return;
  if (csv_text_needs_neutralising (text))
    text = neutral = g_strconcat ("'", text, NULL);
  if (strpbrk (text, ",\"\r\n") == NULL && text[0] != ' '
      && (text[0] == '\0' || text[strlen (text) - 1] != ' '))
    {
      fputs (text, out);
      return;
    }
  fputc ('"', out);
  for (const char *p = text; *p; p++)
    {
      if (*p == '"')
        fputc ('"', out);
      fputc (*p, out);
    }
  fputc ('"', out);
}

static void
write_csv_number (FILE *out, double value)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  if (isfinite (value))
    fputs (sl_format_double (buf, value), out);
}

static void
write_csv_header (FILE *out, GArray *columns)
{
  fputs ("id", out);
  for (guint i = 0; i < columns->len; i++)
    {
      const Column *c = &g_array_index (columns, Column, i);
      const char *name = column_name (c);

      if (column_is_text (c))
        fprintf (out, ",%s", name);
      else
        fprintf (out, ",%s,%s_lo,%s_hi", name, name, name);
    }
  fputc ('\n', out);
}

static void
write_csv_row (FILE *out, GArray *columns, const StarRow *row)
{
  write_csv_text (out, row->in->designation);
  for (guint i = 0; i < columns->len; i++)
    {
      const Column *c = &g_array_index (columns, Column, i);
      double value = NAN, lo = NAN, hi = NAN;

      fputc (',', out);
      if (column_is_text (c))
        {
          g_autofree char *free_me = NULL;

          write_csv_text (out, column_text (c, row, &free_me));
          continue;
        }
      column_numbers (c, row, &value, &lo, &hi);
      write_csv_number (out, value);
      fputc (',', out);
      write_csv_number (out, lo);
      fputc (',', out);
      write_csv_number (out, hi);
    }
  fputc ('\n', out);
}

/* ------------------------------------------------------------------ */
/* LaTeX                                                              */

static void
write_tex_text (FILE *out, const char *text)
{
  for (const char *p = text ? text : ""; *p; p++)
    switch (*p)
      {
      case '&': case '%': case '$': case '#': case '_': case '{': case '}':
        fprintf (out, "\\%c", *p);
        break;
      case '~':  fputs ("\\textasciitilde{}", out); break;
      case '^':  fputs ("\\textasciicircum{}", out); break;
      case '\\': fputs ("\\textbackslash{}", out); break;
      default:   fputc (*p, out);
      }
}

static void
write_tex_header (FILE *out, GArray *columns, const SlExportOptions *options)
{
  char epoch[G_ASCII_DTOSTR_BUF_SIZE];

  fputs ("% Written by Starledger " PACKAGE_VERSION ". Uncertainties are 68% intervals, rounded\n"
         "% to their significant digits (Particle Data Group rule).\n", out);
  /* The frame and epoch travel with the table. */
  if (options->at_epoch)
    fprintf (out, "%% Positions: ICRS, epoch J%s, carried from each star's catalogue epoch with its\n"
             "%% proper motion; stars flagged position_not_propagated stay at their catalogue epoch.\n",
             g_ascii_formatd (epoch, sizeof epoch, "%.2f", options->epoch));
  else
    fputs ("% Positions: ICRS, at each star's catalogue epoch (the epoch column).\n", out);
  fputs ("\\begin{tabular}{l", out);
  for (guint i = 0; i < columns->len; i++)
    fputs (column_is_text (&g_array_index (columns, Column, i)) ? "l" : "r", out);
  fputs ("}\n\\hline\nid", out);
  for (guint i = 0; i < columns->len; i++)
    {
      const Column *c = &g_array_index (columns, Column, i);

      fputs (" & ", out);
      write_tex_text (out, column_name (c));
      if (*column_unit (c))
        {
          fputs (" (", out);
          write_tex_text (out, column_unit (c));
          fputc (')', out);
        }
    }
  fputs (" \\\\\n\\hline\n", out);
}

static void
write_tex_row (FILE *out, GArray *columns, const StarRow *row)
{
  write_tex_text (out, row->in->designation);
  for (guint i = 0; i < columns->len; i++)
    {
      const Column *c = &g_array_index (columns, Column, i);
      double value, lo, hi;
      SlRounded r;

      fputs (" & ", out);
      if (column_is_text (c))
        {
          g_autofree char *free_me = NULL;

          write_tex_text (out, column_text (c, row, &free_me));
          continue;
        }
      if (!column_numbers (c, row, &value, &lo, &hi))
        continue;
      if (!sl_round_with_interval (value, lo, hi, &r))
        fprintf (out, "$%s$", r.value);
      else if (strcmp (r.plus, r.minus) == 0)
        fprintf (out, "$%s \\pm %s$", r.value, r.plus);
      else
        fprintf (out, "$%s^{+%s}_{-%s}$", r.value, r.plus, r.minus);
    }
  fputs (" \\\\\n", out);
}

/* Reads derived rows in star order alongside the inputs. */
static gboolean
next_derived_row (sqlite3_stmt *stmt, gint64 star_id, SlDerivedRow *row, gboolean *pending,
                  gboolean *finished)
{
  while (!*finished && (!*pending || row->star_id < star_id))
    {
      if (sqlite3_step (stmt) != SQLITE_ROW)
        {
          *finished = TRUE;
          break;
        }
      sl_derived_row_read (stmt, row);
      *pending = TRUE;
    }
  return *pending && row->star_id == star_id;
}

gint64
sl_export (SlProject *project, const char *path, const SlExportOptions *options, GError **error)
{
  g_autoptr (GArray) columns = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (GError) local_error = NULL;
  g_autoptr (GArray) list_ids = NULL;
  guint next_member = 0;
  g_autofree char *derived_sql = sl_derived_select_sql ("ORDER BY star_id");
  sqlite3_stmt *derived = NULL;
  gboolean pending = FALSE, finished = FALSE;
  SlDerivedRow derived_row;
  char *temp_path;
  SlStarInputs inputs;
  gint64 count = 0;
  FILE *out;
  gboolean ok;

  columns = resolve_columns (options->columns, error);
  if (columns == NULL)
    return -1;
  if (options->at_epoch)
    add_epoch_column (columns);
  /* Read in one transaction so the table is one consistent snapshot. */
  if (!sl_project_exec (project, "BEGIN", error))
    return -1;
  if (options->list != NULL && (list_ids = sl_list_star_ids (project, options->list, error)) == NULL)
    {
      sl_project_rollback (project);
      return -1;
    }
  derived = sl_project_prepare (project, derived_sql, error);
  cursor = derived ? sl_input_cursor_new (project, 0, error) : NULL;
  if (cursor == NULL || (out = sl_output_open (path, &temp_path, error)) == NULL)
    {
      sqlite3_finalize (derived);
      sl_project_rollback (project);
      return -1;
    }

  if (options->format == SL_EXPORT_TEX)
    write_tex_header (out, columns, options);
  else
    write_csv_header (out, columns);
  while (sl_input_cursor_next (cursor, &inputs, &local_error))
    {
      StarRow row = { &inputs, NULL };

      /* Both walk in star id order. */
      if (list_ids != NULL)
        {
          while (next_member < list_ids->len && g_array_index (list_ids, gint64, next_member) < inputs.star_id)
            next_member++;
          if (next_member == list_ids->len || g_array_index (list_ids, gint64, next_member) != inputs.star_id)
            continue;
        }
      if (options->at_epoch && inputs.present[SL_FIELD_RA])
        row.not_propagated = !sl_export_position_at_epoch (&inputs, options->epoch);
      if (next_derived_row (derived, inputs.star_id, &derived_row, &pending, &finished))
        row.derived = &derived_row;
      if (options->format == SL_EXPORT_TEX)
        write_tex_row (out, columns, &row);
      else
        write_csv_row (out, columns, &row);
      if (++count % 4096 == 0 && g_cancellable_is_cancelled (options->cancellable))
        break;
    }
  if (options->format == SL_EXPORT_TEX)
    fputs ("\\hline\n\\end{tabular}\n", out);
  sqlite3_finalize (derived);
  ok = local_error == NULL
       && !g_cancellable_set_error_if_cancelled (options->cancellable, &local_error);
  sl_project_rollback (project);
  if (!sl_output_close (out, path, temp_path, ok, error))
    {
      if (local_error)
        g_propagate_error (error, g_steal_pointer (&local_error));
      return -1;
    }
  return count;
}
