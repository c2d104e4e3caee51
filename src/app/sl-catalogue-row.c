/* sl-catalogue-row.c: one star of the Catalogue, the table of columns, and
 * how a value with its interval is written in a cell. */
#include "sl-catalogue-row.h"

#include <glib/gi18n.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "rounding.h"
#include "units.h"

#define M SL_CATALOGUE_GROUP_MEASURED
#define D SL_CATALOGUE_GROUP_DERIVED
#define NUMBER SL_CATALOGUE_KIND_NUMBER
#define NO_FIELD SL_FIELD_NONE
#define NO_QUANTITY SL_Q_NONE

/* Widths fit a typical value with an asymmetric interval.  Titles say the
 * unit; a test checks that every input field and derived quantity has its
 * column here. */
static const SlCatalogueColumnInfo column_table[SL_CATALOGUE_N_COLUMNS] = {
  [SL_CATALOGUE_COLUMN_DESIGNATION] = { "designation", N_("Star"), SL_CATALOGUE_KIND_TEXT, 100, M, NO_FIELD, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_RA] = { "ra", N_("RA"), SL_CATALOGUE_KIND_RA, 100, M, SL_FIELD_RA, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_DEC] = { "dec", N_("Dec"), SL_CATALOGUE_KIND_DEC, 100, M, SL_FIELD_DEC, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_EPOCH] = { "epoch", N_("Epoch (yr)"), NUMBER, 90, M, SL_FIELD_EPOCH, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_PARALLAX] = { "parallax", N_("Parallax (mas)"), NUMBER, 130, M, SL_FIELD_PARALLAX, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_PMRA] = { "pmra", N_("PM in RA (mas/yr)"), NUMBER, 140, M, SL_FIELD_PMRA, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_PMDEC] = { "pmdec", N_("PM in Dec (mas/yr)"), NUMBER, 140, M, SL_FIELD_PMDEC, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_VMAG] = { "vmag", N_("V (mag)"), NUMBER, 115, M, SL_FIELD_VMAG, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_BMAG] = { "bmag", N_("B (mag)"), NUMBER, 115, M, SL_FIELD_BMAG, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_BV] = { "bv", N_("B−V (mag)"), NUMBER, 115, M, SL_FIELD_BV, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_EBV] = { "ebv", N_("E(B−V) (mag)"), NUMBER, 115, M, SL_FIELD_EBV, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_VRAD] = { "vrad", N_("Radial velocity (km/s)"), NUMBER, 150, M, SL_FIELD_VRAD, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_SPTYPE] = { "sptype", N_("Type"), SL_CATALOGUE_KIND_TEXT, 80, M, SL_FIELD_SPTYPE, NO_QUANTITY },
  [SL_CATALOGUE_COLUMN_PLX_SNR] = { "plx_snr", N_("Parallax S/N"), NUMBER, 110, D, NO_FIELD, SL_Q_PLX_SNR },
  [SL_CATALOGUE_COLUMN_DIST] = { "dist", N_("Distance (pc)"), NUMBER, 140, D, NO_FIELD, SL_Q_DIST },
  [SL_CATALOGUE_COLUMN_DISTMOD] = { "distmod", N_("Distance modulus (mag)"), NUMBER, 160, D, NO_FIELD, SL_Q_DISTMOD },
  [SL_CATALOGUE_COLUMN_AV] = { "av", N_("Extinction in V (mag)"), NUMBER, 150, D, NO_FIELD, SL_Q_AV },
  [SL_CATALOGUE_COLUMN_BV0] = { "bv0", N_("(B−V)₀ (mag)"), NUMBER, 125, D, NO_FIELD, SL_Q_BV0 },
  [SL_CATALOGUE_COLUMN_ABSMAG] = { "absmag", N_("Abs. V (mag)"), NUMBER, 125, D, NO_FIELD, SL_Q_ABSMAG },
  [SL_CATALOGUE_COLUMN_TEFF] = { "teff", N_("Teff (K)"), NUMBER, 115, D, NO_FIELD, SL_Q_TEFF },
  [SL_CATALOGUE_COLUMN_BC] = { "bc", N_("Bol. correction (mag)"), NUMBER, 150, D, NO_FIELD, SL_Q_BC },
  [SL_CATALOGUE_COLUMN_MBOL] = { "mbol", N_("Abs. bol. (mag)"), NUMBER, 125, D, NO_FIELD, SL_Q_MBOL },
  [SL_CATALOGUE_COLUMN_LUM] = { "lum", N_("L (L☉)"), NUMBER, 150, D, NO_FIELD, SL_Q_LUM },
  [SL_CATALOGUE_COLUMN_RADIUS] = { "radius", N_("R (R☉)"), NUMBER, 150, D, NO_FIELD, SL_Q_RADIUS },
  [SL_CATALOGUE_COLUMN_VTAN] = { "vtan", N_("Tangential velocity (km/s)"), NUMBER, 170, D, NO_FIELD, SL_Q_VTAN },
  [SL_CATALOGUE_COLUMN_ELON] = { "elon", N_("Ecl. longitude (°)"), NUMBER, 140, D, NO_FIELD, SL_Q_ELON },
  [SL_CATALOGUE_COLUMN_ELAT] = { "elat", N_("Ecl. latitude (°)"), NUMBER, 140, D, NO_FIELD, SL_Q_ELAT },
  [SL_CATALOGUE_COLUMN_ELLIPSE_A] = { "ellipse_a", N_("Ellipse major (mas)"), NUMBER, 140, D, NO_FIELD, SL_Q_ELLIPSE_A },
  [SL_CATALOGUE_COLUMN_ELLIPSE_B] = { "ellipse_b", N_("Ellipse minor (mas)"), NUMBER, 140, D, NO_FIELD, SL_Q_ELLIPSE_B },
  [SL_CATALOGUE_COLUMN_ELLIPSE_PA] = { "ellipse_pa", N_("Ellipse angle (°)"), NUMBER, 130, D, NO_FIELD, SL_Q_ELLIPSE_PA },
  [SL_CATALOGUE_COLUMN_SPCLASS] = { "spclass", N_("Class"), SL_CATALOGUE_KIND_TEXT, 60, D, NO_FIELD, SL_Q_SPCLASS },
  [SL_CATALOGUE_COLUMN_FLAGS] = { "flags", N_("Flags"), SL_CATALOGUE_KIND_FLAGS, 60, D, NO_FIELD, NO_QUANTITY },
};

#undef M
#undef D
#undef NUMBER
#undef NO_FIELD
#undef NO_QUANTITY

/* The table as it first opened: what a reset brings back. */
static const SlCatalogueColumn default_columns[] = {
  SL_CATALOGUE_COLUMN_DESIGNATION, SL_CATALOGUE_COLUMN_RA, SL_CATALOGUE_COLUMN_DEC,
  SL_CATALOGUE_COLUMN_PARALLAX, SL_CATALOGUE_COLUMN_VMAG, SL_CATALOGUE_COLUMN_BV,
  SL_CATALOGUE_COLUMN_DIST, SL_CATALOGUE_COLUMN_ABSMAG, SL_CATALOGUE_COLUMN_TEFF,
  SL_CATALOGUE_COLUMN_LUM, SL_CATALOGUE_COLUMN_RADIUS, SL_CATALOGUE_COLUMN_SPCLASS,
  SL_CATALOGUE_COLUMN_SPTYPE, SL_CATALOGUE_COLUMN_FLAGS,
};

const SlCatalogueColumnInfo *
sl_catalogue_column_info (SlCatalogueColumn column)
{
  g_return_val_if_fail (column < SL_CATALOGUE_N_COLUMNS, NULL);
  return &column_table[column];
}

gboolean
sl_catalogue_column_from_name (const char *name, SlCatalogueColumn *column)
{
  g_return_val_if_fail (name != NULL, FALSE);

  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    if (strcmp (column_table[c].name, name) == 0)
      {
        if (column)
          *column = c;
        return TRUE;
      }
  return FALSE;
}

const char *
sl_catalogue_column_describe (SlCatalogueColumn column)
{
  const SlCatalogueColumnInfo *info = sl_catalogue_column_info (column);

  g_return_val_if_fail (info != NULL, NULL);
  if (info->field != SL_FIELD_NONE)
    return _(sl_field_info (info->field)->description);
  if (info->quantity != SL_Q_NONE)
    return _(sl_quantity_info (info->quantity)->description);
  if (info->kind == SL_CATALOGUE_KIND_FLAGS)
    return _("what a reader of the values must know, as icons; hover for the explanations");
  return _(sl_field_info (SL_FIELD_ID)->description);
}

const SlCatalogueColumn *
sl_catalogue_default_columns (guint *n_columns)
{
  if (n_columns)
    *n_columns = G_N_ELEMENTS (default_columns);
  return default_columns;
}

/* Appends TEXT with each '-' as U+2212 MINUS SIGN. */
static void
append_with_minus_signs (GString *out, const char *text)
{
  for (const char *p = text; *p; p++)
    {
      if (*p == '-')
        g_string_append (out, "\u2212");
      else
        g_string_append_c (out, *p);
    }
}

/* Whether [LO, HI] is VALUE -/+ one error: the two sides differ by no
 * more than the rounding of value -/+ error leaves (a measured 0.58 with
 * 0.195 would otherwise print as +0.19/-0.20). */
static gboolean
is_symmetric (double value, double lo, double hi)
{
  double plus = hi - value, minus = value - lo;

  return fabs (plus - minus) <= 1e-9 * MAX (fabs (plus), fabs (minus));
}

/* Appends the power of ten 10^EXPONENT as "×10⁻⁴". */
static void
append_power_of_ten (GString *out, int exponent)
{
  static const char *const superscript[] = { "⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹" };
  char digits[16];

  g_snprintf (digits, sizeof digits, "%d", ABS (exponent));
  g_string_append (out, "\u00d710");
  if (exponent < 0)
    g_string_append (out, "⁻");
  for (const char *p = digits; *p; p++)
    g_string_append (out, superscript[*p - '0']);
}

/* Appends a number as printed by "%.4g" or by the rounding, with minus
 * signs and "1.235e+05" as 1.235×10⁵. */
static void
append_plain (GString *out, const char *text)
{
  const char *e = strchr (text, 'e');
  g_autofree char *mantissa = e ? g_strndup (text, (gsize) (e - text)) : NULL;

  if (e == NULL)
    {
      append_with_minus_signs (out, text);
      return;
    }
  append_with_minus_signs (out, mantissa);
  append_power_of_ten (out, atoi (e + 1));
}

/* Decimal places beyond which a value and its interval are written as
 * (1.24 ± 0.06)×10⁻⁴: a small luminosity would not fit its column. */
#define MAX_DECIMALS 4

static void
append_number (GString *out, double value, double lo, double hi)
{
  SlRounded r;
  int exponent = 0;

  if (!sl_round_with_interval (value, lo, hi, &r))
    {
      append_plain (out, r.value);
      return;
    }
  if (r.decimals > MAX_DECIMALS && value != 0.0)
    {
      double scale;

      exponent = (int) floor (log10 (fabs (value)));
      scale = pow (10.0, -exponent);
      if (!sl_round_with_interval (value * scale, lo * scale, hi * scale, &r))
        g_return_if_reached ();
      g_string_append_c (out, '(');
    }
  append_with_minus_signs (out, r.value);
  if (strcmp (r.plus, r.minus) == 0 || is_symmetric (value, lo, hi))
    {
      /* The larger side's digits: an uncertainty is never understated. */
      g_string_append (out, " \u00b1 ");
      g_string_append (out, hi - value >= value - lo ? r.plus : r.minus);
    }
  else
    g_string_append_printf (out, " +%s/\u2212%s", r.plus, r.minus);
  if (exponent != 0)
    {
      g_string_append_c (out, ')');
      append_power_of_ten (out, exponent);
    }
}

char *
sl_catalogue_format_number (SlCatalogueKind kind, double value, double lo, double hi)
{
  GString *out = g_string_new (NULL);

  if (!isfinite (value))
    return g_string_free (out, FALSE);
  switch (kind)
    {
    case SL_CATALOGUE_KIND_RA:
    case SL_CATALOGUE_KIND_DEC:
      {
        /* 0.01 s of time and 0.1″: finer than the positions' errors
         * matter in a table, and the columns stay narrow. */
        g_autofree char *text = sl_format_sexagesimal (value, kind == SL_CATALOGUE_KIND_RA,
                                                       kind == SL_CATALOGUE_KIND_RA ? 2 : 1);

        append_with_minus_signs (out, text);
        break;
      }
    case SL_CATALOGUE_KIND_NUMBER:
      append_number (out, value, lo, hi);
      break;
    case SL_CATALOGUE_KIND_TEXT:
    case SL_CATALOGUE_KIND_FLAGS:
    default:
      g_return_val_if_reached (g_string_free (out, FALSE));
    }
  return g_string_free (out, FALSE);
}

/* ------------------------------------------------------------------ */
/* The row                                                            */

struct _SlCatalogueRow {
  GObject  parent_instance;

  gint64   star_id;
  double   value[SL_CATALOGUE_N_COLUMNS];   /* in the column's unit (header file); NAN: missing */
  double   lo[SL_CATALOGUE_N_COLUMNS];      /* 68% interval, NAN: none */
  double   hi[SL_CATALOGUE_N_COLUMNS];
  char    *text[SL_CATALOGUE_N_COLUMNS];    /* text columns; NULL: missing */
  gboolean derived;                         /* the star has a derived row */
  gboolean stale;                           /* ... whose inputs changed since */
  guint32  flags;                           /* SlFlag bits of the derived row */
};

G_DEFINE_FINAL_TYPE (SlCatalogueRow, sl_catalogue_row, G_TYPE_OBJECT)

static void
sl_catalogue_row_finalize (GObject *object)
{
  SlCatalogueRow *self = SL_CATALOGUE_ROW (object);

  for (guint c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    g_free (self->text[c]);
  G_OBJECT_CLASS (sl_catalogue_row_parent_class)->finalize (object);
}

static void
sl_catalogue_row_class_init (SlCatalogueRowClass *klass)
{
  G_OBJECT_CLASS (klass)->finalize = sl_catalogue_row_finalize;
}

static void
sl_catalogue_row_init (SlCatalogueRow *self)
{
  for (guint c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    self->value[c] = self->lo[c] = self->hi[c] = NAN;
}

SlCatalogueRow *
sl_catalogue_row_new (gint64 star_id)
{
  SlCatalogueRow *self = g_object_new (SL_TYPE_CATALOGUE_ROW, NULL);

  self->star_id = star_id;
  return self;
}

gint64
sl_catalogue_row_get_star_id (SlCatalogueRow *row)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_ROW (row), 0);
  return row->star_id;
}

const char *
sl_catalogue_row_get_designation (SlCatalogueRow *row)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_ROW (row), NULL);
  return row->text[SL_CATALOGUE_COLUMN_DESIGNATION];
}

static gboolean
is_number_column (SlCatalogueColumn column)
{
  SlCatalogueKind kind = column_table[column].kind;

  return kind == SL_CATALOGUE_KIND_NUMBER || kind == SL_CATALOGUE_KIND_RA || kind == SL_CATALOGUE_KIND_DEC;
}

gboolean
sl_catalogue_row_get_number (SlCatalogueRow *row, SlCatalogueColumn column, double *value, double *lo,
                             double *hi)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_ROW (row), FALSE);
  g_return_val_if_fail (column < SL_CATALOGUE_N_COLUMNS && is_number_column (column), FALSE);

  if (value)
    *value = row->value[column];
  if (lo)
    *lo = row->lo[column];
  if (hi)
    *hi = row->hi[column];
  return isfinite (row->value[column]);
}

const char *
sl_catalogue_row_get_text (SlCatalogueRow *row, SlCatalogueColumn column)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_ROW (row), NULL);
  g_return_val_if_fail (column < SL_CATALOGUE_N_COLUMNS && column_table[column].kind == SL_CATALOGUE_KIND_TEXT,
                        NULL);
  return row->text[column];
}

gboolean
sl_catalogue_row_get_flags (SlCatalogueRow *row, guint32 *flags, gboolean *stale)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_ROW (row), FALSE);

  if (flags)
    *flags = row->flags;
  if (stale)
    *stale = row->stale;
  return row->derived;
}

char *
sl_catalogue_row_format (SlCatalogueRow *row, SlCatalogueColumn column)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_ROW (row), NULL);
  g_return_val_if_fail (column < SL_CATALOGUE_N_COLUMNS, NULL);

  switch (column_table[column].kind)
    {
    case SL_CATALOGUE_KIND_TEXT:
      return g_strdup (row->text[column] ? row->text[column] : "");
    case SL_CATALOGUE_KIND_FLAGS:
      return g_strdup ("");
    case SL_CATALOGUE_KIND_NUMBER:
    case SL_CATALOGUE_KIND_RA:
    case SL_CATALOGUE_KIND_DEC:
    default:
      return sl_catalogue_format_number (column_table[column].kind, row->value[column], row->lo[column],
                                         row->hi[column]);
    }
}

void
sl_catalogue_row_set_text (SlCatalogueRow *row, SlCatalogueColumn column, const char *text)
{
  g_return_if_fail (SL_IS_CATALOGUE_ROW (row));
  g_return_if_fail (column < SL_CATALOGUE_N_COLUMNS && column_table[column].kind == SL_CATALOGUE_KIND_TEXT);

  g_free (row->text[column]);
  row->text[column] = g_strdup (text);
}

void
sl_catalogue_row_set_number (SlCatalogueRow *row, SlCatalogueColumn column, double value, double lo, double hi)
{
  g_return_if_fail (SL_IS_CATALOGUE_ROW (row));
  g_return_if_fail (column < SL_CATALOGUE_N_COLUMNS && is_number_column (column));

  row->value[column] = value;
  row->lo[column] = lo;
  row->hi[column] = hi;
}

void
sl_catalogue_row_set_flags (SlCatalogueRow *row, guint32 flags, gboolean stale)
{
  g_return_if_fail (SL_IS_CATALOGUE_ROW (row));

  row->derived = TRUE;
  row->flags = flags;
  row->stale = stale;
}
