/* rounding.c: the PDG rounding rule. */
#include "rounding.h"

#include <math.h>

/* The decimal place (digits after the point) at which to round UNCERTAINTY. */
static int
decimal_place (double uncertainty)
{
  int exponent = (int) floor (log10 (uncertainty));
  double leading = uncertainty / pow (10.0, exponent - 2);   /* 100 <= leading < 1000 */
  int three = (int) floor (leading + 1e-9);

  if (three >= 1000)   /* floating point at a power of ten */
    three = 100, exponent++;
  if (three <= 354)
    return 1 - exponent;          /* two significant digits */
  if (three <= 949)
    return -exponent;             /* one significant digit */
  return 1 - (exponent + 1);      /* 950-999: 1000 with two significant digits */
}

static void
format_at (char *buf, double x, int decimals)
{
  if (decimals >= 0)
    {
      char format[16];

      g_snprintf (format, sizeof format, "%%.%df", decimals);
      g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, format, x);
    }
  else
    {
      double scale = pow (10.0, -decimals);

      g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, "%.0f", round (x / scale) * scale);
    }
}

gboolean
sl_round_with_interval (double value, double lo, double hi, SlRounded *r)
{
  double plus = hi - value, minus = value - lo, smaller;

  if (!(isfinite (plus) && isfinite (minus) && plus > 0 && minus > 0))
    {
      g_ascii_formatd (r->value, sizeof r->value, "%.4g", value);
      r->plus[0] = r->minus[0] = '\0';
      r->decimals = 0;
      return FALSE;
    }
  smaller = MIN (plus, minus);
  r->decimals = decimal_place (smaller);
  format_at (r->value, value, r->decimals);
  format_at (r->plus, plus, r->decimals);
  format_at (r->minus, minus, r->decimals);
  return TRUE;
}
