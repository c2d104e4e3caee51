/* test-vocabulary.c: the table of input fields (src/core/vocabulary.c):
 * look-up by name, which units a column may be declared in, the sanity
 * ranges, and the links between a value and its error field.
 *
 * Outside references: the IAU sky coordinates (declination in [-90, 90]
 * deg, right ascension in [0, 360) deg), the Gaia archive's convention
 * that a negative parallax is a valid measurement, and common practice
 * that a 1-sigma uncertainty is positive.
 */
#include <math.h>
#include <string.h>

#include "test-util.h"
#include "vocabulary.h"

static void
assert_field_name (const char *name, SlField want)
{
  SlField got = SL_FIELD_NONE;

  if (!sl_field_from_name (name, &got))
    g_test_fail_printf ("\"%s\" is not found as a field", name);
  else
    g_assert_cmpint (got, ==, want);
}

/* Headers come in any case (common practice: "RA", "Dec", "Vmag"). */
static void
test_from_name_case_insensitive (void)
{
  assert_field_name ("ra", SL_FIELD_RA);
  assert_field_name ("RA", SL_FIELD_RA);
  assert_field_name ("Dec", SL_FIELD_DEC);
  assert_field_name ("Parallax_Err", SL_FIELD_PARALLAX_ERR);
  assert_field_name ("PMRA", SL_FIELD_PMRA);
  assert_field_name ("Vmag", SL_FIELD_VMAG);
  assert_field_name ("ID", SL_FIELD_ID);
  assert_field_name ("SpType", SL_FIELD_SPTYPE);
}

static void
test_from_name_rejects (void)
{
  static const char *const bad[] = {
    "", "r", "ra ", " ra", "ra_", "declination", "plx", "ra-err", "vmag_error",
  };

  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      SlField field = SL_FIELD_VRAD;

      if (sl_field_from_name (bad[i], &field))
        g_test_fail_printf ("\"%s\" was taken for field %s", bad[i], sl_field_info (field)->name);
      else
        g_assert_cmpint (field, ==, SL_FIELD_VRAD);
    }
}

/* Every field's own name finds it, and no two fields share a name. */
static void
test_from_name_every_field (void)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      g_autofree char *upper = g_ascii_strup (sl_field_info (f)->name, -1);

      assert_field_name (sl_field_info (f)->name, f);
      assert_field_name (upper, f);
    }
}

/* Sexagesimal hours are for right ascension only (common practice: a
 * declination is never written in hours). */
static void
test_accepts_unit_hms (void)
{
  g_assert_true (sl_field_accepts_unit (SL_FIELD_RA, SL_UNIT_HMS));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_DEC, SL_UNIT_HMS));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_PARALLAX, SL_UNIT_HMS));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_RA_ERR, SL_UNIT_HMS));
}

static void
test_accepts_unit_angles (void)
{
  g_assert_true (sl_field_accepts_unit (SL_FIELD_RA, SL_UNIT_DEG));
  g_assert_true (sl_field_accepts_unit (SL_FIELD_RA, SL_UNIT_RAD));
  g_assert_true (sl_field_accepts_unit (SL_FIELD_DEC, SL_UNIT_DMS));
  g_assert_true (sl_field_accepts_unit (SL_FIELD_DEC, SL_UNIT_RAD));
  g_assert_true (sl_field_accepts_unit (SL_FIELD_PARALLAX, SL_UNIT_MAS));
  g_assert_true (sl_field_accepts_unit (SL_FIELD_PARALLAX, SL_UNIT_ARCSEC));
  g_assert_true (sl_field_accepts_unit (SL_FIELD_RA_ERR, SL_UNIT_ARCSEC));
  g_assert_true (sl_field_accepts_unit (SL_FIELD_PMRA, SL_UNIT_ARCSEC_PER_YR));
  g_assert_true (sl_field_accepts_unit (SL_FIELD_PMDEC_ERR, SL_UNIT_MAS_PER_YR));
}

/* A unit of another dimension is a mapping mistake. */
static void
test_accepts_unit_refuses_dimension (void)
{
  g_assert_false (sl_field_accepts_unit (SL_FIELD_PARALLAX, SL_UNIT_MAG));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_PARALLAX, SL_UNIT_MAS_PER_YR));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_PMRA, SL_UNIT_MAS));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_VMAG, SL_UNIT_DEG));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_VRAD, SL_UNIT_MAS_PER_YR));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_RA, SL_UNIT_KM_PER_S));
  g_assert_false (sl_field_accepts_unit (SL_FIELD_SPTYPE, SL_UNIT_MAG));
}

/* Every field takes its own canonical unit, and "no unit" (= canonical). */
static void
test_accepts_unit_canonical (void)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      g_assert_true (sl_field_accepts_unit (f, sl_field_info (f)->canonical));
      g_assert_true (sl_field_accepts_unit (f, SL_UNIT_NONE));
    }
}

static void
assert_value_ok (SlField field, double value)
{
  char *reason = NULL;

  if (!sl_field_check_value (field, value, &reason))
    g_test_fail_printf ("%s = %.17g refused: %s", sl_field_info (field)->name, value, reason);
  else
    g_assert_null (reason);
  g_free (reason);
}

/* Returns the reason, to be freed. */
static char *
assert_value_refused (SlField field, double value)
{
  char *reason = NULL;

  if (sl_field_check_value (field, value, &reason))
    {
      g_test_fail_printf ("%s = %.17g accepted", sl_field_info (field)->name, value);
      return g_strdup ("");
    }
  g_assert_nonnull (reason);
  return reason;
}

/* Declination lies in [-90, 90] deg, both poles included (IAU). */
static void
test_check_dec (void)
{
  g_autofree char *reason = NULL;

  assert_value_ok (SL_FIELD_DEC, 90.0);
  assert_value_ok (SL_FIELD_DEC, -90.0);
  assert_value_ok (SL_FIELD_DEC, 0.0);
  assert_value_ok (SL_FIELD_DEC, -0.208333);
  reason = assert_value_refused (SL_FIELD_DEC, 90.0000001);
  /* The message names the field and the closed range. */
  g_assert_nonnull (strstr (reason, "dec"));
  g_assert_nonnull (strstr (reason, "[-90, 90]"));
  g_free (assert_value_refused (SL_FIELD_DEC, -90.0000001));
  g_free (assert_value_refused (SL_FIELD_DEC, 91.3));
}

/* A value that is no number lies in no range. */
static void
test_check_not_finite (void)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      SlFieldKind kind = sl_field_info (f)->kind;

      if (kind != SL_FIELD_KIND_VALUE && kind != SL_FIELD_KIND_ERROR)
        continue;
      g_free (assert_value_refused (f, NAN));
      g_free (assert_value_refused (f, INFINITY));
      g_free (assert_value_refused (f, -INFINITY));
    }
}

/* Right ascension lies in [0, 360) deg: 360 is 0 written wrongly (IAU). */
static void
test_check_ra (void)
{
  g_autofree char *reason = NULL;

  assert_value_ok (SL_FIELD_RA, 0.0);
  assert_value_ok (SL_FIELD_RA, 359.9999999);
  assert_value_ok (SL_FIELD_RA, 217.429);
  reason = assert_value_refused (SL_FIELD_RA, 360.0);
  g_assert_nonnull (strstr (reason, "360)"));   /* an open range */
  g_free (assert_value_refused (SL_FIELD_RA, -0.001));
  g_free (assert_value_refused (SL_FIELD_RA, 400.0));
}

/* A 1-sigma uncertainty is positive (common practice): zero is a missing
 * value written wrongly. */
static void
test_check_errors_positive (void)
{
  g_autofree char *reason = NULL;

  reason = assert_value_refused (SL_FIELD_PARALLAX_ERR, 0.0);
  g_assert_nonnull (strstr (reason, "positive"));
  g_free (assert_value_refused (SL_FIELD_PARALLAX_ERR, -0.1));
  g_free (assert_value_refused (SL_FIELD_RA_ERR, 0.0));
  g_free (assert_value_refused (SL_FIELD_VMAG_ERR, -0.01));
  g_free (assert_value_refused (SL_FIELD_VMAG_ERR, NAN));
  assert_value_ok (SL_FIELD_PARALLAX_ERR, 0.02);
  assert_value_ok (SL_FIELD_VMAG_ERR, 0.005);
  assert_value_ok (SL_FIELD_VRAD_ERR, 1.5);
}

/* The faintest catalogued objects are near magnitude 30 (common practice;
 * the demo data plants 41.20 as a typing slip). */
static void
test_check_magnitude (void)
{
  g_free (assert_value_refused (SL_FIELD_VMAG, 41.2));
  g_free (assert_value_refused (SL_FIELD_BMAG, 31.0));
  assert_value_ok (SL_FIELD_VMAG, -1.46);
  assert_value_ok (SL_FIELD_VMAG, 21.0);
}

/* Negative parallaxes are measurements of distant stars (Gaia archive
 * documentation; Luri et al. 2018, A&A 616, A9): never refused. */
static void
test_check_negative_parallax (void)
{
  assert_value_ok (SL_FIELD_PARALLAX, -5.0);
  assert_value_ok (SL_FIELD_PARALLAX, -0.3);
  assert_value_ok (SL_FIELD_PARALLAX, 768.0665);
  g_free (assert_value_refused (SL_FIELD_PARALLAX, 5000.0));
}

/* A Julian Date typed for a Julian year is refused (J2000.0 is JD
 * 2451545.0, IAU). */
static void
test_check_epoch (void)
{
  g_free (assert_value_refused (SL_FIELD_EPOCH, 2451545.0));
  g_free (assert_value_refused (SL_FIELD_EPOCH, 51544.5));  /* an MJD */
  assert_value_ok (SL_FIELD_EPOCH, 2000.0);
  assert_value_ok (SL_FIELD_EPOCH, 2016.0);
}

/* Each value's error field points back to the value, and only error
 * fields qualify another field. */
static void
test_error_links_consistent (void)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      const SlFieldInfo *info = sl_field_info (f);

      if (info->kind == SL_FIELD_KIND_ERROR)
        {
          const SlFieldInfo *value;

          g_assert_cmpint (info->value_of, <, SL_N_FIELDS);
          value = sl_field_info (info->value_of);
          g_assert_cmpint (value->kind, ==, SL_FIELD_KIND_VALUE);
          g_assert_cmpint (value->error, ==, f);
          g_assert_cmpint (info->error, ==, SL_FIELD_NONE);
          /* An error is in a unit of its value's dimension. */
          g_assert_cmpint (sl_unit_dimension (info->canonical), ==,
                           sl_unit_dimension (value->canonical));
        }
      else
        {
          g_assert_cmpint (info->value_of, ==, SL_FIELD_NONE);
        }
      if (info->error != SL_FIELD_NONE)
        {
          g_assert_cmpint (info->kind, ==, SL_FIELD_KIND_VALUE);
          g_assert_cmpint (sl_field_info (info->error)->kind, ==, SL_FIELD_KIND_ERROR);
          g_assert_cmpint (sl_field_info (info->error)->value_of, ==, f);
        }
    }
}

/* Every row of the table is filled in and its range is not empty. */
static void
test_table_complete (void)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      const SlFieldInfo *info = sl_field_info (f);

      g_assert_nonnull (info->name);
      g_assert_cmpstr (info->name, !=, "");
      g_assert_nonnull (info->description);
      if (info->kind == SL_FIELD_KIND_VALUE || info->kind == SL_FIELD_KIND_ERROR)
        {
          g_assert_cmpint (info->canonical, !=, SL_UNIT_NONE);
          g_assert_cmpfloat (info->min, <, info->max);
        }
      else
        {
          g_assert_cmpint (info->canonical, ==, SL_UNIT_NONE);
        }
    }
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/vocabulary/from-name/case-insensitive", test_from_name_case_insensitive);
  g_test_add_func ("/vocabulary/from-name/rejects", test_from_name_rejects);
  g_test_add_func ("/vocabulary/from-name/every-field", test_from_name_every_field);
  g_test_add_func ("/vocabulary/accepts-unit/hms-ra-only", test_accepts_unit_hms);
  g_test_add_func ("/vocabulary/accepts-unit/angles", test_accepts_unit_angles);
  g_test_add_func ("/vocabulary/accepts-unit/refuses-dimension", test_accepts_unit_refuses_dimension);
  g_test_add_func ("/vocabulary/accepts-unit/canonical", test_accepts_unit_canonical);
  g_test_add_func ("/vocabulary/check/dec", test_check_dec);
  g_test_add_func ("/vocabulary/check/ra-open-range", test_check_ra);
  g_test_add_func ("/vocabulary/check/not-finite", test_check_not_finite);
  g_test_add_func ("/vocabulary/check/errors-positive", test_check_errors_positive);
  g_test_add_func ("/vocabulary/check/magnitude", test_check_magnitude);
  g_test_add_func ("/vocabulary/check/negative-parallax", test_check_negative_parallax);
  g_test_add_func ("/vocabulary/check/epoch-not-julian-date", test_check_epoch);
  g_test_add_func ("/vocabulary/table/error-links", test_error_links_consistent);
  g_test_add_func ("/vocabulary/table/complete", test_table_complete);

  return g_test_run ();
}
