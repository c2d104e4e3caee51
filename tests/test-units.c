/* test-units.c: unit names and factors, locale-independent number parsing,
 * and sexagesimal angles in and out (src/core/units.c).
 *
 * Outside references: ERFA (eraTf2a, eraAf2a and the constants of erfam.h)
 * for what a sexagesimal angle and a unit factor are worth; the IAU's
 * sexagesimal notation as catalogues write it ("common practice") for the
 * accepted forms and the rounding with carry.
 */
#include <erfa.h>
#include <erfam.h>
#include <locale.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "test-util.h"
#include "units.h"

/* Reading one number wrong by more than this is a bug, not rounding. */
#define EXACT 1e-12

/* ---- sl_parse_number ---------------------------------------------------- */

static double
parse_number_ok (const char *text)
{
  const char *reason = NULL;
  double value = NAN;

  if (!sl_parse_number (text, &value, &reason))
    g_test_fail_printf ("sl_parse_number (\"%s\") failed: %s", text, reason);
  return value;
}

static const char *
parse_number_fails (const char *text)
{
  const char *reason = NULL;
  double value = NAN;

  if (sl_parse_number (text, &value, &reason))
    {
      g_test_fail_printf ("sl_parse_number (\"%s\") accepted it as %.17g", text, value);
      return "";
    }
  g_assert_nonnull (reason);
  return reason;
}

/* Common practice (C strtod syntax, restricted to decimal). */
static void
test_number_integers (void)
{
  g_assert_cmpfloat (parse_number_ok ("0"), ==, 0.0);
  g_assert_cmpfloat (parse_number_ok ("42"), ==, 42.0);
  g_assert_cmpfloat (parse_number_ok ("-17"), ==, -17.0);
  g_assert_cmpfloat (parse_number_ok ("+8"), ==, 8.0);
  g_assert_cmpfloat (parse_number_ok ("007"), ==, 7.0);
}

/* Common practice: '.' is the decimal mark in every catalogue format. */
static void
test_number_decimals (void)
{
  sl_assert_close (parse_number_ok ("12.5"), 12.5, EXACT, "12.5");
  sl_assert_close (parse_number_ok ("-0.125"), -0.125, EXACT, "-0.125");
  sl_assert_close (parse_number_ok (".5"), 0.5, EXACT, ".5");
  sl_assert_close (parse_number_ok ("5."), 5.0, EXACT, "5.");
  sl_assert_close (parse_number_ok ("768.0665"), 768.0665, EXACT, "768.0665");
}

/* Common practice (FITS and VOTable write exponents as E or e). */
static void
test_number_exponents (void)
{
  sl_assert_close (parse_number_ok ("1e3"), 1000.0, EXACT, "1e3");
  sl_assert_close (parse_number_ok ("1.5E-3"), 0.0015, EXACT, "1.5E-3");
  sl_assert_close (parse_number_ok ("-2.5e+2"), -250.0, EXACT, "-2.5e+2");
  sl_assert_close (parse_number_ok ("6.02e23"), 6.02e23, 6.02e23 * 1e-15, "6.02e23");
}

static void
test_number_blanks (void)
{
  sl_assert_close (parse_number_ok ("  12.5"), 12.5, EXACT, "leading blanks");
  sl_assert_close (parse_number_ok ("12.5  "), 12.5, EXACT, "trailing blanks");
  sl_assert_close (parse_number_ok ("\t-3e2\t"), -300.0, EXACT, "tabs");
  parse_number_fails ("1 2");
  parse_number_fails ("- 1");
}

static void
test_number_rejects (void)
{
  static const char *const bad[] = {
    "", "   ", "abc", "0x10", "inf", "-inf", "Infinity", "nan", "NaN",
    "1e", "1e+", "--1", "+-1", "1.2.3", ".", "-", "e5", "1,5", "12.5 mas", "1_000",
  };

  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    parse_number_fails (bad[i]);
}

/* A European spreadsheet writes 1,5 for 1.5: the reason says so. */
static void
test_number_decimal_comma_hint (void)
{
  const char *reason = parse_number_fails ("1,5");

  g_assert_nonnull (strstr (reason, "decimal comma"));
  reason = parse_number_fails ("abc");
  g_assert_null (strstr (reason, "decimal comma"));
}

/* A number beyond the double range is refused, not stored as infinity. */
static void
test_number_out_of_range (void)
{
  parse_number_fails ("1e400");
  parse_number_fails ("-1e400");
}

/* sl_parse_number takes an exact fast path for short decimals and leaves
 * the rest to strtod; either way the double must be the one the C
 * library's strtod (glibc: correctly rounded) gives, bit for bit.  The
 * strings are random decimals of every shape and the hard cases: integers
 * around 2^53, the shortest and longest round-trip forms of random doubles,
 * the halfway points between neighbouring doubles, powers of ten at the
 * edge of the fast path, long runs of zeros.  Two million strings here;
 * `test-units -m slow` tries a hundred million. */

static void
random_decimal (GRand *rand, GString *out)
{
  int leading_zeros = g_rand_int_range (rand, 0, 4) == 0 ? g_rand_int_range (rand, 1, 6) : 0;
  int digits = g_rand_int_range (rand, 1, 26);
  int point = g_rand_int_range (rand, -1, digits + 1);   /* -1: no point */

  g_string_truncate (out, 0);
  if (g_rand_boolean (rand))
    g_string_append_c (out, g_rand_boolean (rand) ? '-' : '+');
  for (int i = 0; i < leading_zeros; i++)
    g_string_append_c (out, '0');
  for (int i = 0; i < digits; i++)
    {
      if (i == point)
        g_string_append_c (out, '.');
      g_string_append_c (out, '0' + g_rand_int_range (rand, 0, 10));
    }
  if (point == digits)
    g_string_append (out, ".5");
  if (g_rand_int_range (rand, 0, 3) == 0)
    g_string_append_printf (out, "%c%d", g_rand_boolean (rand) ? 'e' : 'E', g_rand_int_range (rand, -40, 41));
}

/* Halfway between a random double and its successor, written with enough
 * digits to be exact: strtod must round it to even. */
static void
adversarial_decimal (GRand *rand, guint kind, GString *out)
{
  double x = g_rand_double_range (rand, -1e6, 1e6) * pow (10.0, g_rand_int_range (rand, -25, 26));

  g_string_truncate (out, 0);
  switch (kind % 6)
    {
    case 0:
      g_string_printf (out, "%" G_GUINT64_FORMAT,
                       (G_GUINT64_CONSTANT (1) << 53) + (guint64) g_rand_int_range (rand, -64, 65));
      break;
    case 1:
      g_string_printf (out, "%.17g", x);
      break;
    case 2:
      g_string_printf (out, "%.15g", x);
      break;
    case 3:
      g_string_printf (out, "%.40g", x + (nextafter (x, INFINITY) - x) / 2.0);
      break;
    case 4:
      g_string_printf (out, "%de%d", g_rand_int_range (rand, 1, 10000), g_rand_int_range (rand, -24, 25));
      break;
    default:
      g_string_printf (out, "0.%0*d%d", g_rand_int_range (rand, 0, 30), 0, g_rand_int_range (rand, 1, 1000000));
      break;
    }
}

static void
assert_same_as_strtod (const char *text)
{
  const char *reason = NULL;
  double ours = NAN, theirs = strtod (text, NULL);

  if (!isfinite (theirs))
    return;
  if (!sl_parse_number (text, &ours, &reason) || memcmp (&ours, &theirs, sizeof ours) != 0)
    g_error ("'%s': sl_parse_number gives %.17g (%s), strtod %.17g", text, ours, reason ? reason : "ok", theirs);
}

static void
test_number_bit_identical_to_strtod (void)
{
  g_autoptr (GRand) rand = g_rand_new_with_seed (20261202);
  g_autoptr (GString) text = g_string_new (NULL);
  guint n = g_test_slow () ? 50000000 : 1000000;

  setlocale (LC_NUMERIC, "C");
  for (guint i = 0; i < n; i++)
    {
      random_decimal (rand, text);
      assert_same_as_strtod (text->str);
      adversarial_decimal (rand, i, text);
      assert_same_as_strtod (text->str);
    }
}

/* The numbers in a file do not change with the user's locale (common
 * practice: CSV numbers are written with '.' whatever the locale). */
static void
test_number_locale_independent (void)
{
  const char *reason = NULL;
  double value = NAN;

  if (setlocale (LC_ALL, "de_DE.UTF-8") == NULL)
    {
      g_test_skip ("the de_DE.UTF-8 locale is not installed");
      return;
    }
  /* The locale really uses a decimal comma: strtod stops at the '.'. */
  g_assert_cmpfloat (strtod ("12.5", NULL), ==, 12.0);

  g_assert_true (sl_parse_number ("12.5", &value, &reason));
  sl_assert_close (value, 12.5, EXACT, "12.5 in de_DE");
  g_assert_false (sl_parse_number ("12,5", &value, &reason));

  g_assert_nonnull (setlocale (LC_ALL, "C.UTF-8"));
}

/* ---- sl_parse_sexagesimal ----------------------------------------------- */

static double
parse_sexa_ok (const char *text, gboolean hours)
{
  const char *reason = NULL;
  double value = NAN;

  if (!sl_parse_sexagesimal (text, hours, &value, &reason))
    g_test_fail_printf ("sl_parse_sexagesimal (\"%s\", %s) failed: %s", text,
                        hours ? "hours" : "degrees", reason);
  return value;
}

static const char *
parse_sexa_fails (const char *text, gboolean hours)
{
  const char *reason = NULL;
  double value = NAN;

  if (sl_parse_sexagesimal (text, hours, &value, &reason))
    {
      g_test_fail_printf ("sl_parse_sexagesimal (\"%s\", %s) accepted it as %.17g", text,
                          hours ? "hours" : "degrees", value);
      return "";
    }
  g_assert_nonnull (reason);
  return reason;
}

/* ERFA eraTf2a: hours, minutes, seconds to radians; here back to hours. */
static double
erfa_hours (char sign, int h, int m, double s)
{
  double rad;

  g_assert_cmpint (eraTf2a (sign, h, m, s, &rad), ==, 0);
  return rad * ERFA_DR2D / 15.0;
}

/* ERFA eraAf2a: degrees, arcminutes, arcseconds to radians; here degrees. */
static double
erfa_degrees (char sign, int d, int m, double s)
{
  double rad;

  g_assert_cmpint (eraAf2a (sign, d, m, s, &rad), ==, 0);
  return rad * ERFA_DR2D;
}

/* The three ways catalogues write sexagesimal hours (common practice);
 * values from ERFA eraTf2a. */
static void
test_sexa_hours_forms (void)
{
  double want = erfa_hours ('+', 14, 29, 42.9);

  sl_assert_close (parse_sexa_ok ("14 29 42.9", TRUE), want, EXACT, "blanks");
  sl_assert_close (parse_sexa_ok ("14:29:42.9", TRUE), want, EXACT, "colons");
  sl_assert_close (parse_sexa_ok ("14h29m42.9s", TRUE), want, EXACT, "letters");
  sl_assert_close (parse_sexa_ok ("  14 29 42.9  ", TRUE), want, EXACT, "outer blanks");
  sl_assert_close (parse_sexa_ok ("14\t29\t42.9", TRUE), want, EXACT, "tabs");
  sl_assert_close (parse_sexa_ok ("00 00 00", TRUE), 0.0, EXACT, "zero");
  sl_assert_close (parse_sexa_ok ("23 59 59.9999", TRUE),
                   erfa_hours ('+', 23, 59, 59.9999), EXACT, "just below 24 h");
}

/* Values from ERFA eraAf2a. */
static void
test_sexa_degrees_forms (void)
{
  double want = erfa_degrees ('-', 62, 40, 46.1);

  sl_assert_close (parse_sexa_ok ("-62 40 46.1", FALSE), want, EXACT, "blanks");
  sl_assert_close (parse_sexa_ok ("-62:40:46.1", FALSE), want, EXACT, "colons");
  sl_assert_close (parse_sexa_ok ("-62d40m46.1s", FALSE), want, EXACT, "letters");
  sl_assert_close (parse_sexa_ok ("+05d12m30s", FALSE),
                   erfa_degrees ('+', 5, 12, 30.0), EXACT, "plus sign, letters");
  sl_assert_close (parse_sexa_ok ("05 12 30", FALSE),
                   erfa_degrees ('+', 5, 12, 30.0), EXACT, "no sign");
}

/* The sign belongs to the whole angle: "-00 12 30" is -0.2083 deg, the
 * classic trap of reading the degrees as an integer (common practice;
 * value from ERFA eraAf2a). */
static void
test_sexa_negative_zero_degrees (void)
{
  double value = parse_sexa_ok ("-00 12 30", FALSE);

  sl_assert_close (value, erfa_degrees ('-', 0, 12, 30.0), EXACT, "-00 12 30");
  sl_assert_close (value, -(12.0 / 60.0 + 30.0 / 3600.0), EXACT, "-00 12 30 by hand");
  g_assert_cmpfloat (value, <, 0.0);

  value = parse_sexa_ok ("-00:00:01", FALSE);
  sl_assert_close (value, erfa_degrees ('-', 0, 0, 1.0), EXACT, "-00:00:01");
  g_assert_cmpfloat (value, <, 0.0);

  value = parse_sexa_ok ("-0d30m", FALSE);
  sl_assert_close (value, -0.5, EXACT, "-0d30m");
}

/* U+2212 MINUS SIGN, as typeset tables and copied web pages write it. */
static void
test_sexa_unicode_minus (void)
{
  double value = parse_sexa_ok ("\xe2\x88\x92" "00 30 00", FALSE);

  sl_assert_close (value, -0.5, EXACT, "U+2212 00 30 00");
  sl_assert_close (parse_sexa_ok ("\xe2\x88\x92" "12 30 00", FALSE), -12.5, EXACT,
                   "U+2212 12 30 00");
}

/* Degree sign, prime and double prime, in Unicode and as ASCII quotes
 * (common practice); value from ERFA eraAf2a. */
static void
test_sexa_degree_sign_and_primes (void)
{
  double want = erfa_degrees ('+', 12, 34, 56.7);

  sl_assert_close (parse_sexa_ok ("12\xc2\xb0" "34\xe2\x80\xb2" "56.7\xe2\x80\xb3", FALSE),
                   want, EXACT, "12°34′56.7″");
  sl_assert_close (parse_sexa_ok ("12\xc2\xb0" "34'56.7\"", FALSE), want, EXACT,
                   "12°34'56.7\"");
  sl_assert_close (parse_sexa_ok ("-12\xc2\xb0 34\xe2\x80\xb2 56.7\xe2\x80\xb3", FALSE),
                   -want, EXACT, "-12° 34′ 56.7″");
}

/* Catalogues of lower precision drop the seconds or minutes. */
static void
test_sexa_fewer_parts (void)
{
  sl_assert_close (parse_sexa_ok ("14 29.5", TRUE), 14.0 + 29.5 / 60.0, EXACT, "14 29.5");
  sl_assert_close (parse_sexa_ok ("14:29", TRUE), 14.0 + 29.0 / 60.0, EXACT, "14:29");
  sl_assert_close (parse_sexa_ok ("14.5", TRUE), 14.5, EXACT, "14.5");
  sl_assert_close (parse_sexa_ok ("-14.5", FALSE), -14.5, EXACT, "-14.5 deg");
  sl_assert_close (parse_sexa_ok ("-00 30.5", FALSE), -30.5 / 60.0, EXACT, "-00 30.5");
}

/* Minutes and seconds of 60 or more are typing slips (common practice;
 * ERFA eraTf2a and eraAf2a refuse them too, with status 2 and 3). */
static void
test_sexa_rejects_sixty (void)
{
  double rad;
  const char *reason;

  g_assert_cmpint (eraTf2a ('+', 14, 60, 0.0, &rad), ==, 2);
  g_assert_cmpint (eraAf2a ('+', 12, 0, 60.0, &rad), ==, 3);

  reason = parse_sexa_fails ("14 60 00", TRUE);
  g_assert_nonnull (strstr (reason, "minutes"));
  parse_sexa_fails ("14 61 00", TRUE);
  parse_sexa_fails ("+12 61 10.0", FALSE);
  parse_sexa_fails ("14 60", TRUE);
  reason = parse_sexa_fails ("14 29 60", TRUE);
  g_assert_nonnull (strstr (reason, "seconds"));
  parse_sexa_fails ("-00 00 60.0", FALSE);
  parse_sexa_fails ("14 29 60.5", TRUE);
}

/* Right ascension lies in [0, 24) h (common practice). */
static void
test_sexa_rejects_hours_range (void)
{
  parse_sexa_fails ("24 00 00", TRUE);
  parse_sexa_fails ("24", TRUE);
  parse_sexa_fails ("25 10 00", TRUE);
  parse_sexa_fails ("-01 00 00", TRUE);
  parse_sexa_fails ("-00 00 01", TRUE);
  parse_sexa_fails ("\xe2\x88\x92" "05 00 00", TRUE);
  /* The same texts are fine as degrees. */
  sl_assert_close (parse_sexa_ok ("24 00 00", FALSE), 24.0, EXACT, "24 deg");
  sl_assert_close (parse_sexa_ok ("-01 00 00", FALSE), -1.0, EXACT, "-1 deg");
}

/* Only the last part may carry a fraction: "14.5 30" is ambiguous. */
static void
test_sexa_rejects_inner_fraction (void)
{
  const char *reason = parse_sexa_fails ("14.5 30", TRUE);

  g_assert_nonnull (strstr (reason, "fraction"));
  parse_sexa_fails ("14 29.5 30", TRUE);
  parse_sexa_fails ("-00 12.5 30", FALSE);
}

static void
test_sexa_rejects_garbage (void)
{
  static const char *const bad[] = {
    "", "   ", "-", "abc", "14 2x 30", "14 29 42.9 1", "x14 29 42",
    "14 -29 30", "14,29,42", "1e1", "--14 29 42", ": 14 29",
  };

  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      parse_sexa_fails (bad[i], TRUE);
      parse_sexa_fails (bad[i], FALSE);
    }
}

/* Each part is one decimal number: a second '.' or a lone '.' is a typing
 * slip, as sl_parse_number refuses "1.2.3" (common practice). */
static void
test_sexa_rejects_malformed_numbers (void)
{
  static const char *const bad[] = {
    "14 29 42.9.1", "14.29.42", "1.2.3", ".", "14 29 .", "14 29 42..",
  };

  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      parse_sexa_fails (bad[i], TRUE);
      parse_sexa_fails (bad[i], FALSE);
    }
}

/* ---- sl_format_sexagesimal ---------------------------------------------- */

static void
assert_format (double degrees, gboolean hours, int decimals, const char *want)
{
  g_autofree char *got = sl_format_sexagesimal (degrees, hours, decimals);

  if (g_strcmp0 (got, want) != 0)
    g_test_fail_printf ("%.17g deg as %s with %d decimals: want \"%s\", got \"%s\"",
                        degrees, hours ? "hours" : "degrees", decimals, want, got);
}

static double
hms_to_degrees (int h, int m, double s)
{
  return 15.0 * (h + m / 60.0 + s / 3600.0);
}

static double
dms_to_degrees (int d, int m, double s)
{
  return d + m / 60.0 + s / 3600.0;
}

/* The notation catalogues use (common practice): two-digit fields,
 * blanks between them, a signed declination. */
static void
test_format_plain (void)
{
  assert_format (hms_to_degrees (14, 29, 42.949), TRUE, 3, "14 29 42.949");
  assert_format (hms_to_degrees (0, 5, 3.25), TRUE, 2, "00 05 03.25");
  assert_format (hms_to_degrees (14, 29, 42.949), TRUE, 0, "14 29 43");
  assert_format (-dms_to_degrees (62, 40, 46.1), FALSE, 1, "-62 40 46.1");
  assert_format (dms_to_degrees (5, 12, 30.0), FALSE, 2, "+05 12 30.00");
  assert_format (0.0, FALSE, 0, "+00 00 00");
}

/* Rounding carries into the minute and the hour (common practice: never
 * "10 59 60.000"). */
static void
test_format_carry (void)
{
  assert_format (hms_to_degrees (10, 59, 59.9996), TRUE, 3, "11 00 00.000");
  assert_format (hms_to_degrees (10, 58, 59.9996), TRUE, 3, "10 59 00.000");
  assert_format (hms_to_degrees (10, 59, 59.9994), TRUE, 3, "10 59 59.999");
  assert_format (dms_to_degrees (29, 59, 59.996), FALSE, 2, "+30 00 00.00");
  assert_format (-dms_to_degrees (0, 59, 59.96), FALSE, 1, "-01 00 00.0");
}

/* A right ascension that rounds up to 24 h is 0 h, and negative angles
 * wrap into [0, 24) h (common practice). */
static void
test_format_wraps_24h (void)
{
  assert_format (hms_to_degrees (23, 59, 59.9999), TRUE, 3, "00 00 00.000");
  assert_format (hms_to_degrees (23, 59, 59.9994), TRUE, 3, "23 59 59.999");
  assert_format (-15.0, TRUE, 0, "23 00 00");
  assert_format (360.0, TRUE, 1, "00 00 00.0");
}

/* The sign of a declination between -1 and 0 degrees is kept (the
 * "-00" trap, common practice). */
static void
test_format_negative_zero_degrees (void)
{
  assert_format (-dms_to_degrees (0, 12, 30.0), FALSE, 2, "-00 12 30.00");
  assert_format (-dms_to_degrees (0, 0, 1.0), FALSE, 0, "-00 00 01");
  assert_format (dms_to_degrees (0, 12, 30.0), FALSE, 2, "+00 12 30.00");
}

/* Difference of two hour angles, taking the 24 h wrap into account. */
static double
hours_apart (double a, double b)
{
  double d = fmod (a - b, 24.0);

  if (d > 12.0)
    d -= 24.0;
  if (d < -12.0)
    d += 24.0;
  return d;
}

/* Formatting to N decimals of seconds and parsing back loses at most half
 * a unit in the last place (the definition of rounding), in seconds of
 * time for hours and seconds of arc for degrees. */
static void
test_format_round_trip (void)
{
  for (int i = 0; i < 2000; i++)
    {
      gboolean hours = i % 2 == 0;
      int decimals = g_test_rand_int_range (0, 7);
      double degrees = hours ? g_test_rand_double_range (0.0, 360.0)
                             : g_test_rand_double_range (-90.0, 90.0);
      /* A share of declinations in (-1, 0) to exercise the "-00" case. */
      double value = (!hours && i % 10 == 1) ? -g_test_rand_double_range (0.0, 1.0) : degrees;
      g_autofree char *text = sl_format_sexagesimal (value, hours, decimals);
      double back = parse_sexa_ok (text, hours);
      double half_unit_s = 0.5 * pow (10.0, -decimals) + 1e-9;
      double diff_s = hours ? hours_apart (back, value / 15.0) * 3600.0
                            : (back - value) * 3600.0;

      if (!(fabs (diff_s) <= half_unit_s))
        {
          g_test_fail_printf ("%.17g deg (%s, %d decimals) -> \"%s\" -> %.17g: off by %.3g s",
                              value, hours ? "hours" : "degrees", decimals, text, back, diff_s);
          break;
        }
    }
}

/* ---- unit names and factors --------------------------------------------- */

/* ERFA's erfam.h: ERFA_DR2D is 180/pi. */
static void
test_factor_rad_deg (void)
{
  g_assert_cmpfloat (sl_unit_factor (SL_UNIT_RAD, SL_UNIT_DEG), ==, ERFA_DR2D);
  sl_assert_close (sl_unit_factor (SL_UNIT_RAD, SL_UNIT_DEG), 180.0 / G_PI, EXACT, "rad->deg");
  sl_assert_close (sl_unit_factor (SL_UNIT_DEG, SL_UNIT_RAD), ERFA_DD2R, 1e-18, "deg->rad");
  /* ERFA_DAS2R: one arcsecond in radians. */
  sl_assert_close (sl_unit_factor (SL_UNIT_ARCSEC, SL_UNIT_RAD), ERFA_DAS2R, 1e-20,
                   "arcsec->rad");
  sl_assert_close (sl_unit_factor (SL_UNIT_MAS, SL_UNIT_RAD), ERFA_DMAS2R, 1e-23, "mas->rad");
}

/* Definitions: 1 arcsec = 1000 mas, 1 h = 15 deg, 1 deg = 3600 arcsec
 * (IAU; also ERFA's eraTf2a and ERFA_DAS2R). */
static void
test_factor_small_angles (void)
{
  double one_hour_rad;

  g_assert_cmpint (eraTf2a ('+', 1, 0, 0.0, &one_hour_rad), ==, 0);
  sl_assert_close (sl_unit_factor (SL_UNIT_ARCSEC, SL_UNIT_MAS), 1000.0, EXACT, "arcsec->mas");
  sl_assert_close (sl_unit_factor (SL_UNIT_MAS, SL_UNIT_ARCSEC), 1e-3, 1e-18, "mas->arcsec");
  sl_assert_close (sl_unit_factor (SL_UNIT_DEG, SL_UNIT_MAS), 3.6e6, 1e-6, "deg->mas");
  sl_assert_close (sl_unit_factor (SL_UNIT_HMS, SL_UNIT_DEG), 15.0, EXACT, "hms->deg");
  sl_assert_close (sl_unit_factor (SL_UNIT_DMS, SL_UNIT_DEG), 1.0, EXACT, "dms->deg");
  sl_assert_close (sl_unit_factor (SL_UNIT_HMS, SL_UNIT_RAD), one_hour_rad, 1e-15, "hms->rad");
}

static void
test_factor_rates_and_identity (void)
{
  sl_assert_close (sl_unit_factor (SL_UNIT_ARCSEC_PER_YR, SL_UNIT_MAS_PER_YR), 1000.0, EXACT,
                   "arcsec/yr->mas/yr");
  sl_assert_close (sl_unit_factor (SL_UNIT_MAS_PER_YR, SL_UNIT_ARCSEC_PER_YR), 1e-3, 1e-18,
                   "mas/yr->arcsec/yr");
  for (SlUnit u = SL_UNIT_NONE; u < SL_N_UNITS; u++)
    g_assert_cmpfloat (sl_unit_factor (u, u), ==, 1.0);
}

/* Converting a magnitude to degrees is a programming error. */
static void
test_factor_refuses_other_dimension (void)
{
  double factor;

  g_test_expect_message (NULL, G_LOG_LEVEL_CRITICAL, "*assertion*dimension*failed*");
  factor = sl_unit_factor (SL_UNIT_MAG, SL_UNIT_DEG);
  g_test_assert_expected_messages ();
  g_assert_true (isnan (factor));
}

/* The names of the --map contract (README, "starledger-cli import --help"). */
static void
test_unit_names (void)
{
  static const struct { const char *name; SlUnit unit; SlDimension dim; } names[] = {
    { "deg", SL_UNIT_DEG, SL_DIM_ANGLE },
    { "rad", SL_UNIT_RAD, SL_DIM_ANGLE },
    { "hms", SL_UNIT_HMS, SL_DIM_ANGLE },
    { "dms", SL_UNIT_DMS, SL_DIM_ANGLE },
    { "mas", SL_UNIT_MAS, SL_DIM_ANGLE },
    { "arcsec", SL_UNIT_ARCSEC, SL_DIM_ANGLE },
    { "mas/yr", SL_UNIT_MAS_PER_YR, SL_DIM_ANGULAR_RATE },
    { "arcsec/yr", SL_UNIT_ARCSEC_PER_YR, SL_DIM_ANGULAR_RATE },
    { "mag", SL_UNIT_MAG, SL_DIM_MAGNITUDE },
    { "K", SL_UNIT_KELVIN, SL_DIM_TEMPERATURE },
    { "km/s", SL_UNIT_KM_PER_S, SL_DIM_VELOCITY },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (names); i++)
    {
      SlUnit unit = SL_UNIT_NONE;

      if (!sl_unit_from_name (names[i].name, &unit))
        {
          g_test_fail_printf ("unit \"%s\" is not known", names[i].name);
          continue;
        }
      g_assert_cmpint (unit, ==, names[i].unit);
      g_assert_cmpstr (sl_unit_name (unit), ==, names[i].name);
      g_assert_cmpint (sl_unit_dimension (unit), ==, names[i].dim);
      g_assert_cmpint (sl_unit_is_sexagesimal (unit), ==,
                       unit == SL_UNIT_HMS || unit == SL_UNIT_DMS);
    }
}

static void
test_unit_names_rejected (void)
{
  static const char *const bad[] = {
    "degrees", "", "deg ", "arcsec/year", "mas/y", "kms", "radian", "hours",
  };

  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      SlUnit unit = SL_UNIT_MAG;

      if (sl_unit_from_name (bad[i], &unit))
        g_test_fail_printf ("\"%s\" was taken for unit %s", bad[i], sl_unit_name (unit));
      else
        g_assert_cmpint (unit, ==, SL_UNIT_MAG);   /* left alone */
    }
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/units/number/integers", test_number_integers);
  g_test_add_func ("/units/number/decimals", test_number_decimals);
  g_test_add_func ("/units/number/exponents", test_number_exponents);
  g_test_add_func ("/units/number/blanks", test_number_blanks);
  g_test_add_func ("/units/number/rejects", test_number_rejects);
  g_test_add_func ("/units/number/decimal-comma-hint", test_number_decimal_comma_hint);
  g_test_add_func ("/units/number/out-of-range", test_number_out_of_range);
  g_test_add_func ("/units/number/locale-independent", test_number_locale_independent);
  g_test_add_func ("/units/number/bit-identical-to-strtod", test_number_bit_identical_to_strtod);

  g_test_add_func ("/units/sexagesimal/hours-forms", test_sexa_hours_forms);
  g_test_add_func ("/units/sexagesimal/degrees-forms", test_sexa_degrees_forms);
  g_test_add_func ("/units/sexagesimal/negative-zero-degrees", test_sexa_negative_zero_degrees);
  g_test_add_func ("/units/sexagesimal/unicode-minus", test_sexa_unicode_minus);
  g_test_add_func ("/units/sexagesimal/degree-sign-and-primes", test_sexa_degree_sign_and_primes);
  g_test_add_func ("/units/sexagesimal/fewer-parts", test_sexa_fewer_parts);
  g_test_add_func ("/units/sexagesimal/rejects-sixty", test_sexa_rejects_sixty);
  g_test_add_func ("/units/sexagesimal/rejects-hours-range", test_sexa_rejects_hours_range);
  g_test_add_func ("/units/sexagesimal/rejects-inner-fraction", test_sexa_rejects_inner_fraction);
  g_test_add_func ("/units/sexagesimal/rejects-garbage", test_sexa_rejects_garbage);
  g_test_add_func ("/units/sexagesimal/rejects-malformed-numbers",
                   test_sexa_rejects_malformed_numbers);

  g_test_add_func ("/units/format/plain", test_format_plain);
  g_test_add_func ("/units/format/carry", test_format_carry);
  g_test_add_func ("/units/format/wraps-24h", test_format_wraps_24h);
  g_test_add_func ("/units/format/negative-zero-degrees", test_format_negative_zero_degrees);
  g_test_add_func ("/units/format/round-trip", test_format_round_trip);

  g_test_add_func ("/units/factor/rad-deg", test_factor_rad_deg);
  g_test_add_func ("/units/factor/small-angles", test_factor_small_angles);
  g_test_add_func ("/units/factor/rates-and-identity", test_factor_rates_and_identity);
  g_test_add_func ("/units/factor/refuses-other-dimension", test_factor_refuses_other_dimension);
  g_test_add_func ("/units/name/contract", test_unit_names);
  g_test_add_func ("/units/name/rejected", test_unit_names_rejected);

  return g_test_run ();
}
