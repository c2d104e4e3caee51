/* units.c: unit names and factors, number and sexagesimal parsing. */
#include "units.h"

#include <glib/gi18n.h>
#include <erfa.h>
#include <erfam.h>
#include <float.h>
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

/* The exact fast path of Clinger (1990, "How to read floating point
 * numbers accurately", PLDI '90): when the decimal significand W is at
 * most 2^53 and the decimal exponent E has |E| <= 22, both W and 10^|E|
 * are exact doubles, so the one IEEE multiplication or division W * 10^E
 * rounds correctly: the result is the double nearest the decimal, bit for
 * bit what strtod gives.  That needs arithmetic in double precision, not
 * x87's extended registers (FLT_EVAL_METHOD 0), else strtod does it all.  Catalogue
 * values ("12.3456", "-0.25", "1.5e-3") almost all take it; the rest go to
 * strtod.  tests/test-units.c compares the two on millions of strings. */
static const double exact_powers_of_ten[] = {
  1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,  1e8,  1e9,  1e10, 1e11,
  1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
};

#define MAX_EXACT_SIGNIFICAND (G_GUINT64_CONSTANT (1) << 53)

/* A decimal as scanned: its significand's digits (up to 19 kept exactly),
 * how many significant digits there were, and the power of ten. */
typedef struct {
  guint64 significand;
  int     significant_digits;
  int     exponent;
  gboolean negative;
} ScannedDecimal;

static gboolean
fast_path_value (const ScannedDecimal *d, double *value)
{
  double w;

#if !defined(FLT_EVAL_METHOD) || FLT_EVAL_METHOD != 0
  return FALSE;
#endif
  if (d->significant_digits > 19 || d->significand > MAX_EXACT_SIGNIFICAND
      || d->exponent < -22 || d->exponent > 22)
    return FALSE;
  w = (double) d->significand;
  *value = d->exponent < 0 ? w / exact_powers_of_ten[-d->exponent] : w * exact_powers_of_ten[d->exponent];
  if (d->negative)
    *value = -*value;
  return TRUE;
}

static void
take_digit (ScannedDecimal *d, char c, gboolean after_point)
{
  if (d->significant_digits == 0 && c == '0')
    {
      /* A leading zero adds nothing, but after the point it shifts. */
      if (after_point)
        d->exponent--;
      return;
    }
  if (d->significant_digits < 19)
    {
      d->significand = d->significand * 10 + (guint64) (c - '0');
      if (after_point)
        d->exponent--;
    }
  else if (!after_point)
    d->exponent++;   /* beyond 19 digits the fast path is refused anyway */
  d->significant_digits++;
}

gboolean
sl_parse_number (const char *text, double *value, const char **reason)
{
  const char *p = text;
  const char *start;
  gboolean digits = FALSE;
  ScannedDecimal d = { 0, 0, 0, FALSE };
  double parsed;
  char *end;

  while (is_blank (*p))
    p++;
  start = p;
  if (*p == '+' || *p == '-')
    d.negative = *p++ == '-';
  while (g_ascii_isdigit (*p))
    take_digit (&d, *p++, FALSE), digits = TRUE;
  if (*p == '.')
    {
      p++;
      while (g_ascii_isdigit (*p))
        take_digit (&d, *p++, TRUE), digits = TRUE;
    }
  if (digits && (*p == 'e' || *p == 'E'))
    {
      const char *exponent = p + 1;
      gboolean negative_exponent = FALSE;
      int e = 0;

      if (*exponent == '+' || *exponent == '-')
        negative_exponent = *exponent++ == '-';
      if (g_ascii_isdigit (*exponent))
        {
          p = exponent;
          while (g_ascii_isdigit (*p))
            {
              if (e < 100000)
                e = e * 10 + (*p - '0');
              p++;
            }
          d.exponent += negative_exponent ? -e : e;
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

  if (d.significand == 0 && d.significant_digits == 0)
    d.exponent = 0;   /* zero, whatever its exponent */
  if (fast_path_value (&d, value))
    return TRUE;
  parsed = g_ascii_strtod (start, &end);
  if (!isfinite (parsed))
    {
      *reason = N_("number out of range");
      return FALSE;
    }
  /* Digits that are not all zero must not turn into zero: 1e-400 is
   * nothing a measurement means, and as 0 it would pass for one. */
  if (parsed == 0.0 && d.significand != 0)
    {
      *reason = N_("number too small (it would be stored as 0)");
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
