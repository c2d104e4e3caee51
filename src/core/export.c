/* export.c: the CSV table of each star's inputs.
 *
 * An input's interval is its value plus or minus its 1-sigma error.  The
 * right ascension error is on the sky (times cos Dec), so the RA interval
 * in degrees is widened by 1/cos Dec; at the poles it has no bounds.
 */
#include "export.h"

#include <errno.h>
#include <glib/gi18n.h>
#include <glib/gstdio.h>
#include <math.h>
#include <stdio.h>
#include <unistd.h>
#include <string.h>

#include "inputs.h"
#include "sl-error.h"
#include "util.h"
#include "vocabulary.h"

/* Whether a field is a quantity of the table (errors become intervals). */
static gboolean
is_quantity (SlField field)
{
  SlFieldKind kind = sl_field_info (field)->kind;

  return kind == SL_FIELD_KIND_VALUE || kind == SL_FIELD_KIND_TEXT;
}

GPtrArray *
sl_export_column_names (void)
{
  GPtrArray *names = g_ptr_array_new ();

  for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
    if (is_quantity (f))
      g_ptr_array_add (names, (gpointer) sl_field_info (f)->name);
  return names;
}

static GArray *
resolve_columns (const char *const *columns, GError **error)
{
  GArray *fields = g_array_new (FALSE, FALSE, sizeof (SlField));

  if (columns == NULL)
    {
      for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
        if (is_quantity (f))
          g_array_append_val (fields, f);
      return fields;
    }

  for (guint i = 0; columns[i]; i++)
    {
      SlField field;

      if (g_ascii_strcasecmp (columns[i], "id") == 0)
        continue;  /* always the first column */
      if (!sl_field_from_name (columns[i], &field) || !is_quantity (field))
        {
          g_autoptr (GPtrArray) names = sl_export_column_names ();
          g_autofree char *known = NULL;

          g_ptr_array_add (names, NULL);
          known = g_strjoinv (", ", (char **) names->pdata);
          g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME,
                       _("no column '%s'; the columns are: id, %s (each number comes "
                         "with its _lo and _hi bounds)"), columns[i], known);
          g_array_unref (fields);
          return NULL;
        }
      g_array_append_val (fields, field);
    }
  return fields;
}

static void
write_text_cell (FILE *out, const char *text)
{
  if (text == NULL)
    return;
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
write_number_cell (FILE *out, double value)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  if (isfinite (value))
    fputs (sl_format_double (buf, value), out);
}

static void
write_header (FILE *out, GArray *fields)
{
  fputs ("id", out);
  for (guint i = 0; i < fields->len; i++)
    {
      const char *name = sl_field_info (g_array_index (fields, SlField, i))->name;

      if (sl_field_info (g_array_index (fields, SlField, i))->kind == SL_FIELD_KIND_TEXT)
        fprintf (out, ",%s", name);
      else
        fprintf (out, ",%s,%s_lo,%s_hi", name, name, name);
    }
  fputc ('\n', out);
}

/* The half-width of FIELD's interval in its own unit, or NAN if none. */
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

static void
write_star (FILE *out, const SlStarInputs *in, GArray *fields)
{
  write_text_cell (out, in->designation);
  for (guint i = 0; i < fields->len; i++)
    {
      SlField f = g_array_index (fields, SlField, i);
      double half;

      fputc (',', out);
      if (sl_field_info (f)->kind == SL_FIELD_KIND_TEXT)
        {
          write_text_cell (out, in->sptype);
          continue;
        }
      half = in->present[f] ? interval_half_width (in, f) : NAN;
      write_number_cell (out, in->present[f] ? in->value[f] : NAN);
      fputc (',', out);
      write_number_cell (out, in->value[f] - half);
      fputc (',', out);
      write_number_cell (out, in->value[f] + half);
    }
  fputc ('\n', out);
}

/* Opens a temporary file beside PATH; the rename in close_output makes it
 * appear whole or not at all. */
static FILE *
open_output (const char *path, char **temp_path, GError **error)
{
  g_autofree char *dir = NULL;
  g_autofree char *base = NULL;
  int fd;
  FILE *out;

  *temp_path = NULL;
  if (strcmp (path, "-") == 0)
    return stdout;

  dir = g_path_get_dirname (path);
  base = g_path_get_basename (path);
  *temp_path = g_strdup_printf ("%s/.%s.XXXXXX", dir, base);
  fd = g_mkstemp (*temp_path);
  if (fd < 0 || (out = fdopen (fd, "w")) == NULL)
    {
      int saved = errno;

      g_set_error (error, SL_ERROR, SL_ERROR_IO, _("%s: cannot write: %s"), path,
                   g_strerror (saved));
      if (fd >= 0)
        close (fd), g_unlink (*temp_path);
      g_clear_pointer (temp_path, g_free);
      return NULL;
    }
  return out;
}

static gboolean
close_output (FILE *out, const char *path, char *temp_path, gboolean ok, GError **error)
{
  gboolean write_failed;

  if (temp_path == NULL)
    {
      write_failed = fflush (out) != 0 || ferror (out);
      if (ok && write_failed)
        g_set_error (error, SL_ERROR, SL_ERROR_IO, _("cannot write to standard output: %s"),
                     g_strerror (errno));
      return ok && !write_failed;
    }

  write_failed = ferror (out) | (fclose (out) != 0);
  if (ok && !write_failed && g_rename (temp_path, path) == 0)
    {
      g_free (temp_path);
      return TRUE;
    }
  if (ok)
    g_set_error (error, SL_ERROR, SL_ERROR_IO, _("%s: cannot write: %s"), path,
                 g_strerror (errno));
  g_unlink (temp_path);
  g_free (temp_path);
  return FALSE;
}

gint64
sl_export_csv (SlProject *project, const char *path, const SlExportOptions *options,
               GError **error)
{
  g_autoptr (GArray) fields = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (GError) local_error = NULL;
  char *temp_path;
  SlStarInputs inputs;
  gint64 count = 0;
  FILE *out;
  gboolean ok;

  fields = resolve_columns (options->columns, error);
  if (fields == NULL)
    return -1;
  /* Read in one transaction so the table is one consistent snapshot. */
  if (!sl_project_exec (project, "BEGIN", error))
    return -1;
  cursor = sl_input_cursor_new (project, 0, error);
  if (cursor == NULL || (out = open_output (path, &temp_path, error)) == NULL)
    {
      sl_project_rollback (project);
      return -1;
    }

  write_header (out, fields);
  while (sl_input_cursor_next (cursor, &inputs, &local_error))
    {
      write_star (out, &inputs, fields);
      if (++count % 4096 == 0 && g_cancellable_is_cancelled (options->cancellable))
        break;
    }
  ok = local_error == NULL
       && !g_cancellable_set_error_if_cancelled (options->cancellable, &local_error);
  sl_project_rollback (project);
  if (!close_output (out, path, temp_path, ok, error))
    {
      if (local_error)
        g_propagate_error (error, g_steal_pointer (&local_error));
      return -1;
    }
  return count;
}
