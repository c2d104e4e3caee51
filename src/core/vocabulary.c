/* vocabulary.c: the table of input fields and its look-ups.
 *
 * The ranges are sanity limits, not physics: they exist to catch a wrong
 * unit or a typing slip before it reaches a derivation.  Each is wider than
 * any real star's value (common practice; the extremes noted beside them).
 */
#include "vocabulary.h"

#include <glib/gi18n.h>
#include <math.h>

#include "util.h"

#define NONE SL_FIELD_NONE

static const SlFieldInfo field_table[SL_N_FIELDS] = {
  [SL_FIELD_ID] = { "id", SL_FIELD_KIND_IDENTIFIER, SL_UNIT_NONE, NONE, NONE, 0, 0, FALSE,
                    N_("the star's designation") },
  /* Positions: ICRS right ascension and declination at the row's epoch. */
  [SL_FIELD_RA] = { "ra", SL_FIELD_KIND_VALUE, SL_UNIT_DEG, NONE, SL_FIELD_RA_ERR,
                    0.0, 360.0, TRUE, N_("right ascension (ICRS)") },
  /* Position errors are on the sky: ra_err is the error of RA times cos(Dec). */
  [SL_FIELD_RA_ERR] = { "ra_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAS, SL_FIELD_RA, NONE,
                        0.0, 3.6e6, FALSE, N_("error of right ascension on the sky (times cos Dec)") },
  [SL_FIELD_DEC] = { "dec", SL_FIELD_KIND_VALUE, SL_UNIT_DEG, NONE, SL_FIELD_DEC_ERR,
                     -90.0, 90.0, FALSE, N_("declination (ICRS)") },
  [SL_FIELD_DEC_ERR] = { "dec_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAS, SL_FIELD_DEC, NONE,
                         0.0, 3.6e6, FALSE, N_("error of declination") },
  /* Julian years; a Julian Date typed by mistake (2451545) fails loudly. */
  [SL_FIELD_EPOCH] = { "epoch", SL_FIELD_KIND_VALUE, SL_UNIT_JULIAN_YEAR, NONE, NONE,
                       1000.0, 3000.0, FALSE, N_("epoch of the position (Julian year)") },
  /* The nearest star has 768 mas; negative parallaxes are measurements too. */
  [SL_FIELD_PARALLAX] = { "parallax", SL_FIELD_KIND_VALUE, SL_UNIT_MAS, NONE, SL_FIELD_PARALLAX_ERR,
                          -1000.0, 1000.0, FALSE, N_("trigonometric parallax") },
  [SL_FIELD_PARALLAX_ERR] = { "parallax_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAS, SL_FIELD_PARALLAX, NONE,
                              0.0, 1000.0, FALSE, N_("error of the parallax") },
  /* The largest known proper motion is about 10 400 mas/yr. */
  [SL_FIELD_PMRA] = { "pmra", SL_FIELD_KIND_VALUE, SL_UNIT_MAS_PER_YR, NONE, SL_FIELD_PMRA_ERR,
                      -20000.0, 20000.0, FALSE, N_("proper motion in RA (times cos Dec)") },
  [SL_FIELD_PMRA_ERR] = { "pmra_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAS_PER_YR, SL_FIELD_PMRA, NONE,
                          0.0, 20000.0, FALSE, N_("error of the proper motion in RA") },
  [SL_FIELD_PMDEC] = { "pmdec", SL_FIELD_KIND_VALUE, SL_UNIT_MAS_PER_YR, NONE, SL_FIELD_PMDEC_ERR,
                       -20000.0, 20000.0, FALSE, N_("proper motion in declination") },
  [SL_FIELD_PMDEC_ERR] = { "pmdec_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAS_PER_YR, SL_FIELD_PMDEC, NONE,
                           0.0, 20000.0, FALSE, N_("error of the proper motion in declination") },
  /* Magnitudes: the Sun is -26.8; nothing catalogued is fainter than 30. */
  [SL_FIELD_VMAG] = { "vmag", SL_FIELD_KIND_VALUE, SL_UNIT_MAG, NONE, SL_FIELD_VMAG_ERR,
                      -30.0, 30.0, FALSE, N_("apparent V magnitude") },
  [SL_FIELD_VMAG_ERR] = { "vmag_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAG, SL_FIELD_VMAG, NONE,
                          0.0, 10.0, FALSE, N_("error of the V magnitude") },
  [SL_FIELD_BMAG] = { "bmag", SL_FIELD_KIND_VALUE, SL_UNIT_MAG, NONE, SL_FIELD_BMAG_ERR,
                      -30.0, 30.0, FALSE, N_("apparent B magnitude") },
  [SL_FIELD_BMAG_ERR] = { "bmag_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAG, SL_FIELD_BMAG, NONE,
                          0.0, 10.0, FALSE, N_("error of the B magnitude") },
  /* Colour index: hot O stars near -0.35, carbon stars up to about +5. */
  [SL_FIELD_BV] = { "bv", SL_FIELD_KIND_VALUE, SL_UNIT_MAG, NONE, SL_FIELD_BV_ERR,
                    -2.0, 6.0, FALSE, N_("colour index B-V") },
  [SL_FIELD_BV_ERR] = { "bv_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAG, SL_FIELD_BV, NONE,
                        0.0, 10.0, FALSE, N_("error of B-V") },
  /* A slightly negative colour excess is what noise gives near zero. */
  [SL_FIELD_EBV] = { "ebv", SL_FIELD_KIND_VALUE, SL_UNIT_MAG, NONE, SL_FIELD_EBV_ERR,
                     -0.5, 10.0, FALSE, N_("colour excess E(B-V)") },
  [SL_FIELD_EBV_ERR] = { "ebv_err", SL_FIELD_KIND_ERROR, SL_UNIT_MAG, SL_FIELD_EBV, NONE,
                         0.0, 10.0, FALSE, N_("error of E(B-V)") },
  /* Hypervelocity stars reach about 1 700 km/s. */
  [SL_FIELD_VRAD] = { "vrad", SL_FIELD_KIND_VALUE, SL_UNIT_KM_PER_S, NONE, SL_FIELD_VRAD_ERR,
                      -3000.0, 3000.0, FALSE, N_("radial velocity") },
  [SL_FIELD_VRAD_ERR] = { "vrad_err", SL_FIELD_KIND_ERROR, SL_UNIT_KM_PER_S, SL_FIELD_VRAD, NONE,
                          0.0, 3000.0, FALSE, N_("error of the radial velocity") },
  [SL_FIELD_SPTYPE] = { "sptype", SL_FIELD_KIND_TEXT, SL_UNIT_NONE, NONE, NONE, 0, 0, FALSE,
                        N_("spectral type as catalogued") },
};

const SlFieldInfo *
sl_field_info (SlField field)
{
  g_return_val_if_fail (field < SL_N_FIELDS, NULL);
  return &field_table[field];
}

gboolean
sl_field_from_name (const char *name, SlField *field)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (g_ascii_strcasecmp (name, field_table[f].name) == 0)
      {
        *field = f;
        return TRUE;
      }
  return FALSE;
}

gboolean
sl_field_accepts_unit (SlField field, SlUnit unit)
{
  const SlFieldInfo *info = sl_field_info (field);

  if (unit == SL_UNIT_NONE)
    return TRUE;
  if (sl_unit_dimension (unit) != sl_unit_dimension (info->canonical))
    return FALSE;
  /* Sexagesimal hours make sense for right ascension only. */
  if (unit == SL_UNIT_HMS)
    return field == SL_FIELD_RA;
  return TRUE;
}

/* Numbers in messages are printed with sl_format_double, never %g, so a
 * comma-decimal locale reads the same digits as the file holds. */
static char *
describe_out_of_range (const SlFieldInfo *info, double value)
{
  char got[G_ASCII_DTOSTR_BUF_SIZE], lo[G_ASCII_DTOSTR_BUF_SIZE], hi[G_ASCII_DTOSTR_BUF_SIZE];
  const char *unit = sl_unit_name (info->canonical);

  sl_format_double (got, value);
  sl_format_double (hi, info->max);
  if (info->kind == SL_FIELD_KIND_ERROR && !(value > 0.0))
    return g_strdup_printf (_("an uncertainty must be positive, not %s"), got);
  if (info->kind == SL_FIELD_KIND_ERROR)
    return g_strdup_printf (_("uncertainty %s %s is implausibly large (at most %s)"), got, unit, hi);
  sl_format_double (lo, info->min);
  return g_strdup_printf (_("%s must be in [%s, %s%c %s, not %s"), info->name, lo, hi,
                          info->max_is_open ? ')' : ']', unit, got);
}

gboolean
sl_field_check_value (SlField field, double value, char **reason)
{
  const SlFieldInfo *info = sl_field_info (field);
  gboolean ok;

  if (info->kind == SL_FIELD_KIND_ERROR)
    ok = value > 0.0 && value <= info->max;
  else
    ok = value >= info->min && (info->max_is_open ? value < info->max : value <= info->max);
  if (!ok)
    *reason = describe_out_of_range (info, value);
  return ok;
}
