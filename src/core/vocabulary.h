/* vocabulary.h: the input fields Starledger knows (DESIGN.md, "Vocabulary"):
 * their names in files, database and command line, canonical units, the
 * units a column may be declared in, and the range a valid value lies in.
 *
 * The order of SlField is the column order of the measurements table and
 * of CSV exports.
 */
#pragma once

#include <glib.h>

#include "units.h"

G_BEGIN_DECLS

typedef enum {
  SL_FIELD_ID,
  SL_FIELD_RA,
  SL_FIELD_RA_ERR,
  SL_FIELD_DEC,
  SL_FIELD_DEC_ERR,
  SL_FIELD_EPOCH,
  SL_FIELD_PARALLAX,
  SL_FIELD_PARALLAX_ERR,
  SL_FIELD_PMRA,
  SL_FIELD_PMRA_ERR,
  SL_FIELD_PMDEC,
  SL_FIELD_PMDEC_ERR,
  SL_FIELD_VMAG,
  SL_FIELD_VMAG_ERR,
  SL_FIELD_BMAG,
  SL_FIELD_BMAG_ERR,
  SL_FIELD_BV,
  SL_FIELD_BV_ERR,
  SL_FIELD_EBV,
  SL_FIELD_EBV_ERR,
  SL_FIELD_VRAD,
  SL_FIELD_VRAD_ERR,
  SL_FIELD_SPTYPE,
  SL_N_FIELDS
} SlField;

#define SL_FIELD_NONE SL_N_FIELDS

typedef enum {
  SL_FIELD_KIND_IDENTIFIER,  /* the star's designation: joins rows to stars */
  SL_FIELD_KIND_VALUE,       /* a measured number */
  SL_FIELD_KIND_ERROR,       /* the 1-sigma uncertainty of another field: > 0 */
  SL_FIELD_KIND_TEXT,        /* free text such as a spectral type */
} SlFieldKind;

typedef struct {
  const char  *name;         /* vocabulary name, e.g. "parallax_err" */
  SlFieldKind  kind;
  SlUnit       canonical;    /* unit stored in the project */
  SlField      value_of;     /* for an error field, the field it qualifies */
  SlField      error;        /* for a value field, its error field, or SL_FIELD_NONE */
  double       min, max;     /* valid range in canonical units (inclusive) */
  gboolean     max_is_open;  /* the range excludes max, e.g. RA < 360 deg */
  const char  *description;  /* one line for --help and the README; marked for translation */
} SlFieldInfo;

const SlFieldInfo *sl_field_info (SlField field);

/* Looks a field up by vocabulary name, case-insensitively. */
gboolean sl_field_from_name (const char *name, SlField *field);

/* Whether a column of FIELD may be declared in UNIT. */
gboolean sl_field_accepts_unit (SlField field, SlUnit unit);

/* Checks a value already converted to canonical units; on failure sets
 * *REASON to a newly allocated English message naming the valid range. */
gboolean sl_field_check_value (SlField field, double value, char **reason);

G_END_DECLS
