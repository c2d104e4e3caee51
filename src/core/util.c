/* util.c: who, when, numbers and JSON text for the rest of the core. */
#include "util.h"

#include <math.h>
#include <stdio.h>

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
