/* sl-catalogue-row.h: one star as the Catalogue shows it: its designation,
 * the inputs chosen among its measurements, its derived values with their
 * intervals, and its flags.  Every column the table can show is listed
 * here, with where its values come from and how each is formatted;
 * SlCatalogueModel fills the rows' shown columns from the project. */
#pragma once

#include <glib-object.h>

#include "derive/derive.h"
#include "vocabulary.h"

G_BEGIN_DECLS

/* Every column the Catalogue can show, in the column chooser's order:
 * the measured inputs (input fields of vocabulary.h), then the derived
 * quantities (derive.h) and the flags.  Which of them the table shows, and
 * in which order, is the user's choice (sl_catalogue_view_set_columns). */
typedef enum {
  SL_CATALOGUE_COLUMN_DESIGNATION,
  SL_CATALOGUE_COLUMN_RA,          /* deg, shown in sexagesimal hours */
  SL_CATALOGUE_COLUMN_DEC,         /* deg, shown in sexagesimal degrees */
  SL_CATALOGUE_COLUMN_EPOCH,       /* Julian year, no interval */
  SL_CATALOGUE_COLUMN_PARALLAX,    /* mas; measured columns: interval +/- the error */
  SL_CATALOGUE_COLUMN_PMRA,        /* mas/yr (times cos Dec) */
  SL_CATALOGUE_COLUMN_PMDEC,       /* mas/yr */
  SL_CATALOGUE_COLUMN_VMAG,        /* mag */
  SL_CATALOGUE_COLUMN_BMAG,        /* mag */
  SL_CATALOGUE_COLUMN_BV,          /* mag */
  SL_CATALOGUE_COLUMN_EBV,         /* mag */
  SL_CATALOGUE_COLUMN_VRAD,        /* km/s */
  SL_CATALOGUE_COLUMN_SPTYPE,      /* text, catalogued */
  SL_CATALOGUE_COLUMN_PLX_SNR,     /* derived columns: the 68% interval */
  SL_CATALOGUE_COLUMN_DIST,        /* pc */
  SL_CATALOGUE_COLUMN_DISTMOD,     /* mag */
  SL_CATALOGUE_COLUMN_AV,          /* mag */
  SL_CATALOGUE_COLUMN_BV0,         /* mag */
  SL_CATALOGUE_COLUMN_ABSMAG,      /* mag */
  SL_CATALOGUE_COLUMN_TEFF,        /* K */
  SL_CATALOGUE_COLUMN_BC,          /* mag */
  SL_CATALOGUE_COLUMN_MBOL,        /* mag */
  SL_CATALOGUE_COLUMN_LUM,         /* L_sun */
  SL_CATALOGUE_COLUMN_RADIUS,      /* R_sun */
  SL_CATALOGUE_COLUMN_VTAN,        /* km/s */
  SL_CATALOGUE_COLUMN_ELON,        /* deg */
  SL_CATALOGUE_COLUMN_ELAT,        /* deg */
  SL_CATALOGUE_COLUMN_ELLIPSE_A,   /* mas */
  SL_CATALOGUE_COLUMN_ELLIPSE_B,   /* mas */
  SL_CATALOGUE_COLUMN_ELLIPSE_PA,  /* deg */
  SL_CATALOGUE_COLUMN_SPCLASS,     /* text, derived */
  SL_CATALOGUE_COLUMN_FLAGS,       /* SlFlag bits */
  SL_CATALOGUE_N_COLUMNS
} SlCatalogueColumn;

/* No sort column: the stars in the order they entered the project (id). */
#define SL_CATALOGUE_COLUMN_NONE SL_CATALOGUE_N_COLUMNS

typedef enum {
  SL_CATALOGUE_KIND_TEXT,
  SL_CATALOGUE_KIND_NUMBER,        /* value, with an interval where there is one */
  SL_CATALOGUE_KIND_RA,
  SL_CATALOGUE_KIND_DEC,
  SL_CATALOGUE_KIND_FLAGS,
} SlCatalogueKind;

/* The chooser's two groups. */
typedef enum {
  SL_CATALOGUE_GROUP_MEASURED,     /* the star's name and its chosen inputs */
  SL_CATALOGUE_GROUP_DERIVED,      /* the derivation's values and flags */
} SlCatalogueGroup;

typedef struct {
  const char      *name;      /* the column's name in settings and actions: the
                               * vocabulary name of its input field or derived
                               * quantity, else "designation" or "flags" */
  const char      *title;     /* column header with the unit, marked N_() */
  SlCatalogueKind  kind;
  int              width;     /* initial width, px */
  SlCatalogueGroup group;
  SlField          field;     /* the input field shown, or SL_FIELD_NONE */
  SlQuantity       quantity;  /* the derived quantity shown, or SL_Q_NONE */
} SlCatalogueColumnInfo;

const SlCatalogueColumnInfo *sl_catalogue_column_info (SlCatalogueColumn column);

/* The column named NAME (SlCatalogueColumnInfo.name, exactly). */
gboolean sl_catalogue_column_from_name (const char *name, SlCatalogueColumn *column);

/* A line on what the column holds, for the chooser's tooltips: the
 * vocabulary's or the registry's description (translated). */
const char *sl_catalogue_column_describe (SlCatalogueColumn column);

/* The usual columns, in their order: the table's default (*N_COLUMNS set). */
const SlCatalogueColumn *sl_catalogue_default_columns (guint *n_columns);

/* What a cell shows for VALUE with the 68% interval [LO, HI] (NAN: none)
 * in a column of KIND: "12.34 ± 0.05", "1.23 +0.10/−0.08" (rounded to the
 * uncertainty's digits; beyond 4 decimals "(1.24 ± 0.06)×10⁻⁴"), a value
 * alone to 4 significant digits ("2.685×10⁵" for large ones), sexagesimal
 * angles; "" for a missing value.  Minus signs are U+2212.  A new string. */
char *sl_catalogue_format_number (SlCatalogueKind kind, double value, double lo, double hi);

#define SL_TYPE_CATALOGUE_ROW (sl_catalogue_row_get_type ())
G_DECLARE_FINAL_TYPE (SlCatalogueRow, sl_catalogue_row, SL, CATALOGUE_ROW, GObject)

/* An empty row for STAR_ID: no designation, every value missing. */
SlCatalogueRow *sl_catalogue_row_new (gint64 star_id);

gint64      sl_catalogue_row_get_star_id     (SlCatalogueRow *row);
const char *sl_catalogue_row_get_designation (SlCatalogueRow *row);

/* A number column's value and interval; FALSE (and NANs) if missing. */
gboolean    sl_catalogue_row_get_number (SlCatalogueRow *row, SlCatalogueColumn column,
                                         double *value, double *lo, double *hi);
/* A text column's text (designation, spclass, sptype), or NULL. */
const char *sl_catalogue_row_get_text   (SlCatalogueRow *row, SlCatalogueColumn column);

/* The derived row's flags; FALSE if the star has no derived row. */
gboolean    sl_catalogue_row_get_flags  (SlCatalogueRow *row, guint32 *flags, gboolean *stale);

/* What the cell of COLUMN shows (see sl_catalogue_format_number); "" for
 * the flags column.  A new string. */
char       *sl_catalogue_row_format     (SlCatalogueRow *row, SlCatalogueColumn column);

/* Filling a row (SlCatalogueModel): TEXT is copied; LO, HI may be NAN. */
void        sl_catalogue_row_set_text   (SlCatalogueRow *row, SlCatalogueColumn column, const char *text);
void        sl_catalogue_row_set_number (SlCatalogueRow *row, SlCatalogueColumn column,
                                         double value, double lo, double hi);
void        sl_catalogue_row_set_flags  (SlCatalogueRow *row, guint32 flags, gboolean stale);

G_END_DECLS
