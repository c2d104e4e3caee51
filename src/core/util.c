/* util.c: who, when, numbers and JSON text for the rest of the core. */
#include "util.h"

#include <errno.h>
#include <fcntl.h>
#include <glib/gi18n.h>
#include <glib/gstdio.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include "sl-error.h"

const char *
sl_current_user (void)
{
  const char *who = g_getenv ("STARLEDGER_USER");

  if (who != NULL && *who != '\0')
    return who;
  return g_get_user_name ();
}

char *
sl_now_utc (void)
{
  g_autoptr (GDateTime) now = g_date_time_new_now_utc ();

  return g_date_time_format (now, "%Y-%m-%dT%H:%M:%SZ");
}

const char *
sl_format_double (char *buf, double value)
{
  /* 15 significant digits give back every value typed with 15 or fewer
   * (all catalogue values) and hide binary noise in computed bounds
   * (8.6154, not 8.6154000000000011); no measurement carries more. */
  return g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, "%.15g", value);
}

void
sl_json_append_string (GString *str, const char *value)
{
  g_string_append_c (str, '"');
  for (const unsigned char *p = (const unsigned char *) value; *p; p++)
    {
      switch (*p)
        {
        case '"':  g_string_append (str, "\\\""); break;
        case '\\': g_string_append (str, "\\\\"); break;
        case '\n': g_string_append (str, "\\n"); break;
        case '\r': g_string_append (str, "\\r"); break;
        case '\t': g_string_append (str, "\\t"); break;
        default:
          if (*p < 0x20)
            g_string_append_printf (str, "\\u%04x", *p);
          else
            g_string_append_c (str, (char) *p);
        }
    }
  g_string_append_c (str, '"');
}

void
sl_json_append_number (GString *str, double value)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  if (!isfinite (value))
    g_string_append (str, "null");
  else
    g_string_append (str, sl_format_double (buf, value));
}

/* Opens a temporary file beside PATH; the rename in close_output makes it
 * appear whole or not at all. */
FILE *
sl_output_open (const char *path, char **temp_path, GError **error)
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
  /* 0666 less the umask, as any new file: mkstemp alone gives 0600. */
  fd = g_mkstemp_full (*temp_path, O_WRONLY | O_CLOEXEC, 0666);
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

gboolean
sl_output_close (FILE *out, const char *path, char *temp_path, gboolean ok, GError **error)
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

