/* units.h: the units a column may be declared in, their conversion to
 * Starledger's canonical units, and locale-independent parsing of numbers
 * and sexagesimal angles.
 *
 * Canonical units (DESIGN.md): positions in degrees, small angles
 * (parallaxes, position errors) in milliarcseconds, proper motions in
 * mas/yr, magnitudes in mag, velocities in km/s, epochs in Julian years.
 */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

typedef enum {
  SL_UNIT_NONE,          /* text fields, and "the field's canonical unit" */
  SL_UNIT_DEG,
  SL_UNIT_RAD,
  SL_UNIT_HMS,           /* sexagesimal hours: 14 29 42.9, 14:29:42.9, 14h29m42.9s */
  SL_UNIT_DMS,           /* sexagesimal degrees: -00 12 30, -00:12:30, -0d12m30s */
  SL_UNIT_MAS,
  SL_UNIT_ARCSEC,
  SL_UNIT_MAS_PER_YR,
  SL_UNIT_ARCSEC_PER_YR,
  SL_UNIT_MAG,
  SL_UNIT_KELVIN,
  SL_UNIT_KM_PER_S,
  SL_UNIT_JULIAN_YEAR,
  SL_N_UNITS
} SlUnit;

/* What a unit measures; a column may only be declared in a unit of its
 * field's dimension. */
typedef enum {
  SL_DIM_NONE,
  SL_DIM_ANGLE,
  SL_DIM_ANGULAR_RATE,
  SL_DIM_MAGNITUDE,
  SL_DIM_TEMPERATURE,
  SL_DIM_VELOCITY,
  SL_DIM_TIME,
} SlDimension;

const char  *sl_unit_name      (SlUnit unit);
SlDimension  sl_unit_dimension (SlUnit unit);
gboolean     sl_unit_is_sexagesimal (SlUnit unit);

/* Looks a unit up by its name as written after ':' in --map; FALSE if
 * NAME is no unit. */
gboolean     sl_unit_from_name (const char *name, SlUnit *unit);

/* The factor that takes a value in FROM to a value in TO (same dimension);
 * the sexagesimal units count as hours and degrees. */
double       sl_unit_factor    (SlUnit from, SlUnit to);

/* Parses a whole cell as a decimal number: optional sign, digits, an
 * optional '.' fraction and exponent, surrounded by optional blanks.
 * Never depends on the locale and rejects what strtod would stretch to
 * (hexadecimal, "inf", "nan", a trailing comma fraction).  On failure
 * sets *REASON to a static English phrase, translated by the caller. */
gboolean     sl_parse_number   (const char *text, double *value, const char **reason);

/* Parses a sexagesimal angle, HOURS selecting hours (RA) or degrees (Dec).
 * Accepts 1 to 3 components separated by blanks, ':' or unit letters
 * (h m s, d ° ' ′ " ″); only the last component may have a fraction.
 * The sign applies to the whole angle, so "-00 12 30" is negative.
 * Minutes and seconds must be below 60, hours below 24.  The result is in
 * hours or degrees. */
gboolean     sl_parse_sexagesimal (const char *text, gboolean hours,
                                   double *value, const char **reason);

/* Formats an angle in degrees as sexagesimal hours ("14 29 42.949",
 * wrapped into [0, 24) h) or signed degrees ("-00 12 30.00"), rounded to
 * DECIMALS digits of seconds with the carry into minutes, hours and the
 * 24 h wrap done by ERFA.  Returns a newly allocated string. */
char        *sl_format_sexagesimal (double degrees, gboolean hours, int decimals);

G_END_DECLS
