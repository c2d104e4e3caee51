/* sl-catalogue-row.c: one star of the Catalogue, the table of columns, and
 * how a value with its interval is written in a cell. */
#include "sl-catalogue-row.h"

#include <glib/gi18n.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "rounding.h"
#include "units.h"

/* Widths fit a typical value with an asymmetric interval. */
static const SlCatalogueColumnInfo column_table[SL_CATALOGUE_N_COLUMNS] = {
  [SL_CATALOGUE_COLUMN_DESIGNATION] = { NULL, N_("Star"), SL_CATALOGUE_KIND_TEXT, 100 },
  [SL_CATALOGUE_COLUMN_RA] = { "ra", N_("RA"), SL_CATALOGUE_KIND_RA, 100 },
  [SL_CATALOGUE_COLUMN_DEC] = { "dec", N_("Dec"), SL_CATALOGUE_KIND_DEC, 100 },
  [SL_CATALOGUE_COLUMN_PARALLAX] = { "parallax", N_("Parallax (mas)"), SL_CATALOGUE_KIND_NUMBER, 130 },
  [SL_CATALOGUE_COLUMN_VMAG] = { "vmag", N_("V (mag)"), SL_CATALOGUE_KIND_NUMBER, 115 },
  [SL_CATALOGUE_COLUMN_BV] = { "bv", N_("B−V (mag)"), SL_CATALOGUE_KIND_NUMBER, 115 },
  [SL_CATALOGUE_COLUMN_DIST] = { "dist", N_("Distance (pc)"), SL_CATALOGUE_KIND_NUMBER, 140 },
  [SL_CATALOGUE_COLUMN_ABSMAG] = { "absmag", N_("Abs. V (mag)"), SL_CATALOGUE_KIND_NUMBER, 125 },
  [SL_CATALOGUE_COLUMN_TEFF] = { "teff", N_("Teff (K)"), SL_CATALOGUE_KIND_NUMBER, 115 },
  [SL_CATALOGUE_COLUMN_LUM] = { "lum", N_("L (L☉)"), SL_CATALOGUE_KIND_NUMBER, 150 },
  [SL_CATALOGUE_COLUMN_RADIUS] = { "radius", N_("R (R☉)"), SL_CATALOGUE_KIND_NUMBER, 150 },
  [SL_CATALOGUE_COLUMN_SPCLASS] = { "spclass", N_("Class"), SL_CATALOGUE_KIND_TEXT, 60 },
  [SL_CATALOGUE_COLUMN_SPTYPE] = { "sptype", N_("Type"), SL_CATALOGUE_KIND_TEXT, 80 },
  [SL_CATALOGUE_COLUMN_FLAGS] = { NULL, N_("Flags"), SL_CATALOGUE_KIND_FLAGS, 60 },
};

const SlCatalogueColumnInfo *
sl_catalogue_column_info (SlCatalogueColumn column)
{
  g_return_val_if_fail (column < SL_CATALOGUE_N_COLUMNS, NULL);
  return &column_table[column];
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
