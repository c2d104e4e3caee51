/* units.c: unit names and factors, number and sexagesimal parsing. */
#include "units.h"

#include <glib/gi18n.h>
#include <erfa.h>
#include <erfam.h>
#include <math.h>
#include <string.h>

typedef struct {
  const char *name;
  SlDimension dimension;
  double      factor;   /* to the dimension's base: deg, mas/yr, mag, K, km/s, yr */
} SlUnitInfo;

static const SlUnitInfo unit_table[SL_N_UNITS] = {
  [SL_UNIT_NONE]          = { "",          SL_DIM_NONE,         1.0 },
  [SL_UNIT_DEG]           = { "deg",       SL_DIM_ANGLE,        1.0 },
  [SL_UNIT_RAD]           = { "rad",       SL_DIM_ANGLE,        ERFA_DR2D },
  [SL_UNIT_HMS]           = { "hms",       SL_DIM_ANGLE,        15.0 },
  [SL_UNIT_DMS]           = { "dms",       SL_DIM_ANGLE,        1.0 },
  [SL_UNIT_MAS]           = { "mas",       SL_DIM_ANGLE,        1.0 / 3600000.0 },
  [SL_UNIT_ARCSEC]        = { "arcsec",    SL_DIM_ANGLE,        1.0 / 3600.0 },
  [SL_UNIT_MAS_PER_YR]    = { "mas/yr",    SL_DIM_ANGULAR_RATE, 1.0 },
  [SL_UNIT_ARCSEC_PER_YR] = { "arcsec/yr", SL_DIM_ANGULAR_RATE, 1000.0 },
  [SL_UNIT_MAG]           = { "mag",       SL_DIM_MAGNITUDE,    1.0 },
  [SL_UNIT_KELVIN]        = { "K",         SL_DIM_TEMPERATURE,  1.0 },
  [SL_UNIT_KM_PER_S]      = { "km/s",      SL_DIM_VELOCITY,     1.0 },
  [SL_UNIT_JULIAN_YEAR]   = { "yr",        SL_DIM_TIME,         1.0 },
};

const char *
sl_unit_name (SlUnit unit)
{
  g_return_val_if_fail (unit < SL_N_UNITS, "");
  return unit_table[unit].name;
}

SlDimension
sl_unit_dimension (SlUnit unit)
{
  g_return_val_if_fail (unit < SL_N_UNITS, SL_DIM_NONE);
  return unit_table[unit].dimension;
}

gboolean
sl_unit_is_sexagesimal (SlUnit unit)
{
  return unit == SL_UNIT_HMS || unit == SL_UNIT_DMS;
}

gboolean
sl_unit_from_name (const char *name, SlUnit *unit)
{
  for (SlUnit u = SL_UNIT_NONE + 1; u < SL_N_UNITS; u++)
    if (strcmp (name, unit_table[u].name) == 0)
      {
        *unit = u;
        return TRUE;
      }
  return FALSE;
}

double
sl_unit_factor (SlUnit from, SlUnit to)
{
  g_return_val_if_fail (from < SL_N_UNITS && to < SL_N_UNITS, NAN);
  g_return_val_if_fail (unit_table[from].dimension == unit_table[to].dimension, NAN);
  return unit_table[from].factor / unit_table[to].factor;
}

static gboolean
is_blank (char c)
{
  return c == ' ' || c == '\t';
}

gboolean
sl_parse_number (const char *text, double *value, const char **reason)
{
  const char *p = text;
  const char *start;
  gboolean digits = FALSE;
  double parsed;
  char *end;

  while (is_blank (*p))
    p++;
  start = p;
  if (*p == '+' || *p == '-')
    p++;
  while (g_ascii_isdigit (*p))
    p++, digits = TRUE;
  if (*p == '.')
    {
      p++;
      while (g_ascii_isdigit (*p))
        p++, digits = TRUE;
    }
  if (digits && (*p == 'e' || *p == 'E'))
    {
      const char *exponent = p + 1;

      if (*exponent == '+' || *exponent == '-')
        exponent++;
      if (g_ascii_isdigit (*exponent))
        {
          p = exponent;
          while (g_ascii_isdigit (*p))
            p++;
        }
    }
  while (is_blank (*p))
    p++;

  if (!digits || *p != '\0')
    {
      *reason = (*p == ',' && digits) ? N_("not a number (a decimal comma? use '.')")
                                      : N_("not a number");
      return FALSE;
    }

  parsed = g_ascii_strtod (start, &end);
  if (!isfinite (parsed))
    {
      *reason = N_("number out of range");
      return FALSE;
    }
  *value = parsed;
  return TRUE;
}

/* One component of a sexagesimal angle: its number and whether it had a
 * fraction. */
typedef struct {
  double   value;
  gboolean fractional;
} SexaPart;

static gboolean
is_sexa_separator (const char *p, gsize *len)
{
  static const char *const separators[] = {
    "\xc2\xb0", "\xe2\x80\xb2", "\xe2\x80\xb3",   /* ° ′ ″ */
    ":", "h", "m", "s", "d", "'", "\"", " ", "\t",
  };

  for (gsize i = 0; i < G_N_ELEMENTS (separators); i++)
    {
      gsize n = strlen (separators[i]);

      if (strncmp (p, separators[i], n) == 0)
        {
          *len = n;
          return TRUE;
        }
    }
  return FALSE;
}

gboolean
sl_parse_sexagesimal (const char *text, gboolean hours, double *value,
                      const char **reason)
{
  SexaPart parts[3];
  guint n_parts = 0;
  const char *p = text;
  gsize len;
  double sign = 1.0;
  double total;

  while (is_blank (*p))
    p++;
  if (*p == '-' || *p == '+')
    sign = (*p++ == '-') ? -1.0 : 1.0;
  else if (strncmp (p, "\xe2\x88\x92", 3) == 0)   /* U+2212 MINUS SIGN */
    sign = -1.0, p += 3;

  while (*p != '\0')
    {
      const char *start = p;
      guint digits = 0, points = 0;
      gboolean fractional;
      char number[64];

      for (; g_ascii_isdigit (*p) || *p == '.'; p++)
        {
          digits += g_ascii_isdigit (*p);
          points += *p == '.';
        }
      fractional = points > 0;
      /* One number: digits with at most one point, as in "42.5" or "42.". */
      if (digits == 0 || points > 1 || (gsize) (p - start) >= sizeof number)
        {
          *reason = N_("not a sexagesimal angle");
          return FALSE;
        }
      if (n_parts == 3)
        {
          *reason = N_("not a sexagesimal angle (more than three parts)");
          return FALSE;
        }
      if (n_parts > 0 && parts[n_parts - 1].fractional)
        {
          *reason = N_("not a sexagesimal angle (only the last part may have a fraction)");
          return FALSE;
        }
      memcpy (number, start, p - start);
      number[p - start] = '\0';
      parts[n_parts].value = g_ascii_strtod (number, NULL);
      parts[n_parts].fractional = fractional;
      n_parts++;

      while (*p != '\0' && is_sexa_separator (p, &len))
        p += len;
    }

  if (n_parts == 0)
    {
      *reason = N_("not a sexagesimal angle");
      return FALSE;
    }
  for (guint i = 1; i < n_parts; i++)
    if (parts[i].value >= 60.0)
      {
        *reason = (i == 1) ? N_("minutes must be below 60") : N_("seconds must be below 60");
        return FALSE;
      }

  total = parts[0].value;
  if (n_parts > 1)
    total += parts[1].value / 60.0;
  if (n_parts > 2)
    total += parts[2].value / 3600.0;

  if (hours && (sign < 0 || total >= 24.0))
    {
      *reason = N_("hours must be in [0, 24)");
      return FALSE;
    }
  *value = sign * total;
  return TRUE;
}

static char *
format_sexagesimal_parts (char sign, const int parts[4], int ndp)
{
  GString *text = g_string_new (NULL);

  if (sign != '\0')
    g_string_append_c (text, sign);
  g_string_append_printf (text, "%02d %02d %02d", parts[0], parts[1], parts[2]);
  if (ndp > 0)
    g_string_append_printf (text, ".%0*d", ndp, parts[3]);
  return g_string_free (text, FALSE);
}

char *
sl_format_sexagesimal (double degrees, gboolean hours, int decimals)
{
  char sign;
  int parts[4];
  int ndp = CLAMP (decimals, 0, 9);

  if (!isfinite (degrees))
    return g_strdup ("");

  if (!hours)
    {
      eraA2af (ndp, degrees * ERFA_DD2R, &sign, parts);
      return format_sexagesimal_parts (sign, parts, ndp);
    }

  /* eraA2tf rounds with the carry into minutes and hours; a value that
   * rounds up to 24 h is the same right ascension as 0 h. */
  eraA2tf (ndp, eraAnp (degrees * ERFA_DD2R), &sign, parts);
  if (parts[0] == 24)
    parts[0] = 0;
  return format_sexagesimal_parts ('\0', parts, ndp);
}
