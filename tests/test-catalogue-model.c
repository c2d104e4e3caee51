/* test-catalogue-model.c: the Catalogue's paged list model against a
 * trivially correct reference: every star read into a plain array (the
 * inputs through the core's input cursor, the derived values by a direct
 * SQL query), then compared row by row in random access order, in every
 * sort order (the reference sorted with qsort and the same rule: missing
 * values last, ties by id), with the page cache checked against its limit
 * after every access; every column of the table shown, or a few (the
 * others then missing from the rows: a hidden column is not read).  No
 * display needed: GListModel only (and the
 * selection model, which is GTK but no widget). */
#include <locale.h>
#include <string.h>

#include "derivation.h"
#include "import.h"
#include "inputs.h"
#include "lists.h"
#include "sl-catalogue-model.h"
#include "sl-catalogue-row.h"
#include "sl-catalogue-selection.h"
#include "test-util.h"

#define CACHE_LIMIT (SL_CATALOGUE_MODEL_PAGE_ROWS * SL_CATALOGUE_MODEL_MAX_PAGES)

/* The catalogue of the random tests: stars in the first file, more in the
 * second (which also competes for the inputs), derived, then a third file
 * of new stars and changed ones (no derived row, stale rows). */
#define N_FIRST  4500
#define N_SECOND_NEW 250
#define N_LATE_NEW 300
#define N_LATE_CHANGED 200

/* Random reads after the sequential one, per order of the sort tests. */
#define SORT_SAMPLES 600

/* The big one: reading its last row must not read more than a page. */
#define N_LARGE 1000000

/* ------------------------------------------------------------------ */
/* The reference                                                      */

typedef struct {
  gint64   id;
  double   value[SL_CATALOGUE_N_COLUMNS];  /* NAN: missing */
  double   lo[SL_CATALOGUE_N_COLUMNS];
  double   hi[SL_CATALOGUE_N_COLUMNS];
  char    *text[SL_CATALOGUE_N_COLUMNS];   /* NULL: missing */
  gboolean derived, stale;
  guint32  flags;
} RefStar;

static void
ref_star_clear (gpointer data)
{
  RefStar *s = data;

  for (guint c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    g_free (s->text[c]);
}

static void
ref_set (RefStar *s, SlCatalogueColumn c, const SlStarInputs *in, SlField field)
{
  SlField error = sl_field_info (field)->error;
  double e;

  if (!in->present[field])
    return;
  s->value[c] = in->value[field];
  if (error != SL_FIELD_NONE && field != SL_FIELD_RA && field != SL_FIELD_DEC && in->present[error])
    {
      e = in->value[error];
      s->lo[c] = s->value[c] - e;
      s->hi[c] = s->value[c] + e;
    }
}

/* Every star, in id order, every column. */
static GArray *
read_reference (SlProject *project)
{
  GArray *stars = g_array_new (FALSE, TRUE, sizeof (RefStar));
  g_autoptr (GError) error = NULL;
  g_autoptr (SlInputCursor) cursor = sl_input_cursor_new (project, 0, &error);
  g_autoptr (GHashTable) by_id = g_hash_table_new (g_int64_hash, g_int64_equal);
  g_autoptr (GString) sql = g_string_new ("SELECT star_id, stale, flags");
  sqlite3_stmt *stmt;
  SlStarInputs in;

  g_array_set_clear_func (stars, ref_star_clear);
  g_assert_no_error (error);
  while (sl_input_cursor_next (cursor, &in, &error))
    {
      RefStar s = { 0 };

      s.id = in.star_id;
      for (guint c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
        s.value[c] = s.lo[c] = s.hi[c] = NAN;
      s.text[SL_CATALOGUE_COLUMN_DESIGNATION] = g_strdup (in.designation);
      for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
        {
          SlField field = sl_catalogue_column_info (c)->field;

          if (field == SL_FIELD_SPTYPE)
            s.text[c] = g_strdup (in.sptype);
          else if (field != SL_FIELD_NONE)
            ref_set (&s, c, &in, field);
        }
      g_array_append_val (stars, s);
    }
  g_assert_no_error (error);
  for (guint i = 0; i < stars->len; i++)
    g_hash_table_insert (by_id, &g_array_index (stars, RefStar, i).id, GUINT_TO_POINTER (i));

  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    {
      SlQuantity q = sl_catalogue_column_info (c)->quantity;
      const char *name = q != SL_Q_NONE ? sl_quantity_info (q)->name : NULL;

      if (name && sl_quantity_info (q)->is_text)
        g_string_append_printf (sql, ", %s", name);
      else if (name)
        g_string_append_printf (sql, ", %s, %s_lo, %s_hi", name, name, name);
    }
  g_string_append (sql, " FROM derived");
  g_assert_cmpint (sqlite3_prepare_v2 (sl_project_db (project), sql->str, -1, &stmt, NULL), ==, SQLITE_OK);
  while (sqlite3_step (stmt) == SQLITE_ROW)
    {
      gint64 id = sqlite3_column_int64 (stmt, 0);
      gpointer index;
      RefStar *s;
      int next = 3;

      g_assert_true (g_hash_table_lookup_extended (by_id, &id, NULL, &index));
      s = &g_array_index (stars, RefStar, GPOINTER_TO_UINT (index));
      s->derived = TRUE;
      s->stale = sqlite3_column_int (stmt, 1);
      s->flags = (guint32) sqlite3_column_int64 (stmt, 2);
      for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
        {
          SlQuantity q = sl_catalogue_column_info (c)->quantity;

          if (q == SL_Q_NONE)
            continue;
          if (sl_quantity_info (q)->is_text)
            {
              s->text[c] = sl_column_text_dup (stmt, next++);
              continue;
            }
          if (sqlite3_column_type (stmt, next) != SQLITE_NULL)
            {
              s->value[c] = sl_column_double_or_nan (stmt, next);
              s->lo[c] = sl_column_double_or_nan (stmt, next + 1);
              s->hi[c] = sl_column_double_or_nan (stmt, next + 2);
            }
          next += 3;
        }
    }
  sqlite3_finalize (stmt);
  return stars;
}

/* Relative: 0 but where SQLite's sums stand beside the cursor's (a
 * weighted mean: the same terms, the last bit may differ). */
static double tolerance = 0.0;

static gboolean
same_double (double a, double b)
{
  return (isnan (a) && isnan (b)) || a == b || fabs (a - b) <= tolerance * fabs (b);
}

/* ROW is WANT in the columns SHOWN; the others are missing (the
 * designation is always read). */
static void
assert_row_is (SlCatalogueRow *row, const RefStar *want, guint position, const gboolean *shown)
{
  guint32 flags;
  gboolean stale;

  if (sl_catalogue_row_get_star_id (row) != want->id)
    g_error ("position %u: want star %" G_GINT64_FORMAT ", got %" G_GINT64_FORMAT, position, want->id,
             sl_catalogue_row_get_star_id (row));
  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    {
      const SlCatalogueColumnInfo *info = sl_catalogue_column_info (c);
      double value, lo, hi;

      if (!shown[c] && c != SL_CATALOGUE_COLUMN_DESIGNATION)
        {
          if (info->kind == SL_CATALOGUE_KIND_TEXT)
            g_assert_null (sl_catalogue_row_get_text (row, c));
          else if (info->kind == SL_CATALOGUE_KIND_FLAGS)
            g_assert_false (sl_catalogue_row_get_flags (row, NULL, NULL));
          else if (sl_catalogue_row_get_number (row, c, &value, &lo, &hi) || !isnan (lo) || !isnan (hi))
            g_error ("star %" G_GINT64_FORMAT ": hidden column %s has %g [%g, %g]", want->id, info->name, value,
                     lo, hi);
          continue;
        }
      if (info->kind == SL_CATALOGUE_KIND_TEXT)
        {
          if (g_strcmp0 (sl_catalogue_row_get_text (row, c), want->text[c]) != 0)
            g_error ("star %" G_GINT64_FORMAT " %s: want '%s', got '%s'", want->id, info->title,
                     want->text[c] ? want->text[c] : "(null)", sl_catalogue_row_get_text (row, c));
          continue;
        }
      if (info->kind == SL_CATALOGUE_KIND_FLAGS)
        continue;
      g_assert_cmpint (sl_catalogue_row_get_number (row, c, &value, &lo, &hi), ==, !isnan (want->value[c]));
      if (!same_double (value, want->value[c]) || !same_double (lo, want->lo[c]) || !same_double (hi, want->hi[c]))
        g_error ("star %" G_GINT64_FORMAT " %s: want %.17g [%.17g, %.17g], got %.17g [%.17g, %.17g]", want->id,
                 info->title, want->value[c], want->lo[c], want->hi[c], value, lo, hi);
    }
  if (!shown[SL_CATALOGUE_COLUMN_FLAGS])
    return;
  g_assert_cmpint (sl_catalogue_row_get_flags (row, &flags, &stale), ==, want->derived);
  if (want->derived)
    {
      g_assert_cmpuint (flags, ==, want->flags);
      g_assert_cmpint (stale, ==, want->stale);
    }
}

/* Compares every position of MODEL with WANT[order[position]] (ORDER
 * NULL: the identity), reading them in a random order; with N_SAMPLES > 0
 * in order instead (a page read once) and then N_SAMPLES random
 * positions, for the many orders of the sort test.  The cache stays
 * within its limit throughout. */
static void
assert_model_is (SlCatalogueModel *model, GArray *want, const guint *order, guint n_samples)
{
  guint n = want->len, n_reads = n_samples ? n + n_samples : n, n_shown;
  g_autofree guint *positions = g_new (guint, n_reads);
  const SlCatalogueColumn *columns = sl_catalogue_model_get_columns (model, &n_shown);
  gboolean shown[SL_CATALOGUE_N_COLUMNS] = { FALSE };

  for (guint i = 0; i < n_shown; i++)
    shown[columns[i]] = TRUE;

  g_assert_cmpuint (g_list_model_get_n_items (G_LIST_MODEL (model)), ==, n);
  for (guint i = 0; i < n; i++)
    positions[i] = i;
  for (guint i = n; i < n_reads; i++)
    positions[i] = (guint) g_test_rand_int_range (0, (gint32) n);
  for (guint i = n; n_samples == 0 && i > 1; i--)
    {
      guint j = (guint) g_test_rand_int_range (0, (gint32) i), t = positions[i - 1];

      positions[i - 1] = positions[j];
      positions[j] = t;
    }
  for (guint i = 0; i < n_reads; i++)
    {
      guint p = positions[i];
      g_autoptr (SlCatalogueRow) row = g_list_model_get_item (G_LIST_MODEL (model), p);

      g_assert_nonnull (row);
      assert_row_is (row, &g_array_index (want, RefStar, order ? order[p] : p), p, shown);
      g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), <=, CACHE_LIMIT);
    }
  g_assert_null (g_list_model_get_item (G_LIST_MODEL (model), n));
}

/* ------------------------------------------------------------------ */
/* The catalogue                                                      */

static const char *const sptypes[] = { "G2 V", "K0 III", "M4 V", "B9.5 IV", "F5 V", "A0 V", "K5 V", "G8 III" };

/* A value of UNITS * 10^-DECIMALS, written without the locale. */
static void
append_fixed (GString *s, gint64 units, int decimals)
{
  gint64 scale = 1;

  for (int i = 0; i < decimals; i++)
    scale *= 10;
  if (units < 0)
    g_string_append_c (s, '-');
  units = ABS (units);
  g_string_append_printf (s, "%" G_GINT64_FORMAT, units / scale);
  if (decimals > 0)
    g_string_append_printf (s, ".%0*" G_GINT64_FORMAT, decimals, units % scale);
}

static gboolean
chance (double p)
{
  return g_test_rand_double () < p;
}

/* One of a few errors (in units of 10^-DECIMALS), so that ties between
 * sources are frequent. */
static void
maybe_error (GString *s, gboolean has_value, double p, int decimals)
{
  static const gint64 choices[] = { 1, 2, 3, 10 };

  g_string_append_c (s, ',');
  if (has_value && chance (p))
    append_fixed (s, choices[g_test_rand_int_range (0, G_N_ELEMENTS (choices))], decimals);
}

static void
append_position (GString *s, double p)
{
  gboolean has = chance (p), errors = has && chance (0.8);

  /* ra_err and dec_err together or not at all: see CHOSEN_ROW in the model. */
  g_string_append_c (s, ',');
  if (has)
    append_fixed (s, g_test_rand_int_range (0, 360000000), 6);
  maybe_error (s, errors, 1.0, 1);
  g_string_append_c (s, ',');
  if (has)
    append_fixed (s, g_test_rand_int_range (-90000000, 90000001), 6);
  maybe_error (s, errors, 1.0, 1);
}

static void
import_string (SlProject *project, const char *dir, const char *name, const char *contents)
{
  g_autofree char *path = sl_test_write_file (dir, name, contents, -1);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  report = sl_import_csv (project, path, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (report->rejections->len, ==, 0);
}

static void
append_value_with_error (GString *s, double p, gint64 lo, gint64 hi, int decimals, double p_error)
{
  gboolean has = chance (p);

  g_string_append_c (s, ',');
  if (has)
    append_fixed (s, g_test_rand_int_range ((gint32) lo, (gint32) hi), decimals);
  maybe_error (s, has, p_error, decimals);
}

/* Proper motion, B, E(B-V) and radial velocity, each with chance P (and
 * an error with 0.8): the groups the default columns leave hidden. */
#define EXTRA_HEADER "pmra,pmra_err,pmdec,pmdec_err,bmag,bmag_err,ebv,ebv_err,vrad,vrad_err"

static void
append_extras (GString *s, double p)
{
  append_value_with_error (s, p, -500000, 500000, 3, 0.8);
  append_value_with_error (s, p, -500000, 500000, 3, 0.8);
  append_value_with_error (s, p, -10, 200, 1, 0.8);
  append_value_with_error (s, p, 0, 150, 2, 0.8);
  append_value_with_error (s, p, -30000, 30000, 1, 0.8);
}

/* The random catalogue (see N_FIRST). */
static void
build_catalogue (SlTestProject *f)
{
  g_autoptr (GString) first = g_string_new ("id,ra,ra_err,dec,dec_err,epoch,parallax,parallax_err," EXTRA_HEADER "\n");
  g_autoptr (GString) second = g_string_new ("id,ra,ra_err,dec,dec_err,parallax,parallax_err,vmag,vmag_err,"
                                             "bv,bv_err,sptype," EXTRA_HEADER "\n");
  g_autoptr (GString) late = g_string_new ("id,vmag,vmag_err,sptype,parallax,parallax_err\n");
  g_autofree guint *names = g_new (guint, N_FIRST);
  g_autoptr (GHashTable) late_names = g_hash_table_new (NULL, NULL);
  g_autoptr (GError) error = NULL;
  SlDeriveParams params;
  SlDeriveReport report;

  /* Designations in a random order, so that by name is not by id. */
  for (guint i = 0; i < N_FIRST; i++)
    names[i] = i;
  for (guint i = N_FIRST; i > 1; i--)
    {
      guint j = (guint) g_test_rand_int_range (0, (gint32) i), t = names[i - 1];

      names[i - 1] = names[j];
      names[j] = t;
    }
  for (guint i = 0; i < N_FIRST; i++)
    {
      g_string_append_printf (first, "S %05u", names[i]);
      append_position (first, 1.0);
      g_string_append (first, ",2016.0");
      append_value_with_error (first, 0.95, -2000, 200000, 3, 0.9);
      append_extras (first, 0.6);
      g_string_append_c (first, '\n');
    }
  for (guint i = 0; i < N_FIRST + N_SECOND_NEW; i++)
    {
      gboolean is_new = i >= N_FIRST;

      if (!is_new && !chance (0.7))
        continue;
      g_string_append_printf (second, "S %05u", i);
      append_position (second, is_new ? 1.0 : 0.3);
      append_value_with_error (second, is_new ? 0.9 : 0.3, -2000, 200000, 3, 0.8);
      /* V to 0.1 mag: ties in the sort. */
      append_value_with_error (second, 0.9, -10, 150, 1, 0.8);
      append_value_with_error (second, 0.85, -30, 200, 2, 0.8);
      g_string_append_c (second, ',');
      if (chance (0.7))
        g_string_append (second, sptypes[g_test_rand_int_range (0, G_N_ELEMENTS (sptypes))]);
      append_extras (second, is_new ? 0.8 : 0.4);
      g_string_append_c (second, '\n');
    }
  import_string (f->project, f->dir, "first.csv", first->str);
  import_string (f->project, f->dir, "second.csv", second->str);
  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_no_error (error);

  for (guint i = 0; i < N_LATE_NEW + N_LATE_CHANGED; i++)
    {
      guint name = i < N_LATE_NEW ? N_FIRST + N_SECOND_NEW + i : (guint) g_test_rand_int_range (0, N_FIRST);

      if (!g_hash_table_add (late_names, GUINT_TO_POINTER (name + 1)))
        continue;   /* one row a star in a file */
      g_string_append_printf (late, "S %05u", name);
      append_value_with_error (late, 0.9, -10, 150, 1, 0.8);
      g_string_append_c (late, ',');
      if (chance (0.5))
        g_string_append (late, sptypes[g_test_rand_int_range (0, G_N_ELEMENTS (sptypes))]);
      append_value_with_error (late, 0.5, -2000, 200000, 3, 0.8);
      g_string_append_c (late, '\n');
    }
  import_string (f->project, f->dir, "late.csv", late->str);
}

/* Every column of the table, in the table's order. */
static void
show_every_column (SlCatalogueModel *model)
{
  SlCatalogueColumn every[SL_CATALOGUE_N_COLUMNS];
  g_autoptr (GError) error = NULL;

  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    every[c] = c;
  g_assert_true (sl_catalogue_model_set_columns (model, every, SL_CATALOGUE_N_COLUMNS, &error));
  g_assert_no_error (error);
}

static SlCatalogueModel *
open_model (SlTestProject *f)
{
  SlCatalogueModel *model = sl_catalogue_model_new ();
  g_autoptr (GError) error = NULL;

  g_assert_true (sl_catalogue_model_set_project (model, sl_project_path (f->project), &error));
  g_assert_no_error (error);
  return model;
}

/* ------------------------------------------------------------------ */
/* Sorting the reference                                              */

typedef struct {
  const RefStar    *stars;
  SlCatalogueColumn column;
  gboolean          descending;
} SortContext;

static gboolean
ref_missing (const RefStar *s, SlCatalogueColumn c)
{
  switch (sl_catalogue_column_info (c)->kind)
    {
    case SL_CATALOGUE_KIND_TEXT:
      return s->text[c] == NULL;
    case SL_CATALOGUE_KIND_FLAGS:
      return !s->derived;
    default:
      return isnan (s->value[c]);
    }
}

static int
ref_compare_values (const RefStar *a, const RefStar *b, SlCatalogueColumn c)
{
  switch (sl_catalogue_column_info (c)->kind)
    {
    case SL_CATALOGUE_KIND_TEXT:
      return strcmp (a->text[c], b->text[c]);
    case SL_CATALOGUE_KIND_FLAGS:
      return a->flags < b->flags ? -1 : a->flags > b->flags;
    default:
      return a->value[c] < b->value[c] ? -1 : a->value[c] > b->value[c];
    }
}

/* Missing values last in both directions, ties by id. */
static int
ref_compare (gconstpointer pa, gconstpointer pb, gpointer user_data)
{
  const SortContext *ctx = user_data;
  const RefStar *a = &ctx->stars[*(const guint *) pa], *b = &ctx->stars[*(const guint *) pb];
  gboolean ma = ref_missing (a, ctx->column), mb = ref_missing (b, ctx->column);
  int r;

  if (ma != mb)
    return ma ? 1 : -1;
  if (!ma && (r = ref_compare_values (a, b, ctx->column)) != 0)
    return ctx->descending ? -r : r;
  return a->id < b->id ? -1 : a->id > b->id;
}

static guint *
ref_order (GArray *stars, SlCatalogueColumn column, gboolean descending)
{
  SortContext ctx = { (const RefStar *) stars->data, column, descending };
  guint *order = g_new (guint, stars->len);

  for (guint i = 0; i < stars->len; i++)
    order[i] = i;
  if (column != SL_CATALOGUE_COLUMN_NONE)
    g_qsort_with_data (order, (gint) stars->len, sizeof (guint), ref_compare, &ctx);
  return order;
}

/* A new order is announced as all removed, then all added. */
static void
count_items_changed (GListModel *model, guint position, guint removed, guint added, guint *calls)
{
  (*calls)++;
  g_assert_cmpuint (position, ==, 0);
  if (*calls % 2 == 1)
    {
      g_assert_cmpuint (added, ==, 0);
      g_assert_cmpuint (g_list_model_get_n_items (model), ==, 0);
      g_assert_null (g_list_model_get_item (model, 0));
    }
  else
    {
      g_assert_cmpuint (removed, ==, 0);
      g_assert_cmpuint (g_list_model_get_n_items (model), ==, added);
    }
}

/* ------------------------------------------------------------------ */
/* Tests                                                              */

static void
test_format (void)
{
  static const struct {
    SlCatalogueKind kind;
    double          value, lo, hi;
    const char     *want;
  } cases[] = {
    /* PDG: uncertainty 0.0123 -> leading 123 -> two digits. */
    { SL_CATALOGUE_KIND_NUMBER, 12.3456, 12.3456 - 0.0123, 12.3456 + 0.0123, "12.346 ± 0.012" },
    /* Asymmetric: the smaller side (10, leading 100) decides. */
    { SL_CATALOGUE_KIND_NUMBER, 100.0, 90.0, 125.0, "100 +25/−10" },
    { SL_CATALOGUE_KIND_NUMBER, -1.5, -1.75, -1.25, "−1.50 ± 0.25" },
    /* A measured error at a rounding boundary: 0.58 -/+ 0.195 leaves the
     * sides 0.19499999999999995 and 0.195: one error, the larger side's. */
    { SL_CATALOGUE_KIND_NUMBER, 0.58, 0.58 - 0.195, 0.58 + 0.195, "0.58 ± 0.20" },
    { SL_CATALOGUE_KIND_NUMBER, 0.583, 0.583 - 0.175, 0.583 + 0.175, "0.58 ± 0.18" },
    /* No interval: 4 significant digits. */
    { SL_CATALOGUE_KIND_NUMBER, 1234.5678, NAN, NAN, "1235" },
    { SL_CATALOGUE_KIND_NUMBER, NAN, NAN, NAN, "" },
    /* Beyond 4 decimals: a power of ten. */
    { SL_CATALOGUE_KIND_NUMBER, 1.24e-4, 1.18e-4, 1.30e-4, "(1.24 ± 0.06)×10⁻⁴" },
    { SL_CATALOGUE_KIND_NUMBER, -1.24e-4, -1.30e-4, -1.17e-4, "(−1.24 +0.07/−0.06)×10⁻⁴" },
    { SL_CATALOGUE_KIND_NUMBER, 268512.0, NAN, NAN, "2.685×10⁵" },
    { SL_CATALOGUE_KIND_NUMBER, 1.2344e-12, NAN, NAN, "1.234×10⁻¹²" },
    { SL_CATALOGUE_KIND_NUMBER, 0.0002685, NAN, NAN, "0.0002685" },
    /* 14h 29m 42.949s and -0d 12' 30" */
    { SL_CATALOGUE_KIND_RA, 15.0 * (14.0 + 29.0 / 60.0 + 42.949 / 3600.0), NAN, NAN, "14 29 42.95" },
    { SL_CATALOGUE_KIND_DEC, -(12.0 / 60.0 + 30.0 / 3600.0), NAN, NAN, "−00 12 30.0" },
    { SL_CATALOGUE_KIND_DEC, NAN, NAN, NAN, "" },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autofree char *got = sl_catalogue_format_number (cases[i].kind, cases[i].value, cases[i].lo, cases[i].hi);

      g_assert_cmpstr (got, ==, cases[i].want);
    }
}

/* Every input field a user reads (not the id, not an error) and every
 * derived quantity has one column, under its vocabulary name, in the
 * chooser's group; the usual columns are the table's first fourteen. */
static void
test_column_table (void)
{
  static const char *const usual[] = { "designation", "ra", "dec", "parallax", "vmag", "bv", "dist", "absmag",
                                       "teff", "lum", "radius", "spclass", "sptype", "flags" };
  guint field_columns[SL_N_FIELDS] = { 0 }, quantity_columns[SL_N_QUANTITIES] = { 0 }, n;
  const SlCatalogueColumn *defaults = sl_catalogue_default_columns (&n);

  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    {
      const SlCatalogueColumnInfo *info = sl_catalogue_column_info (c);
      SlCatalogueColumn back;

      g_assert_true (sl_catalogue_column_from_name (info->name, &back));
      g_assert_cmpint (back, ==, c);
      g_assert_true (info->title && *info->title);
      g_assert_true (sl_catalogue_column_describe (c) && *sl_catalogue_column_describe (c));
      g_assert_false (info->field != SL_FIELD_NONE && info->quantity != SL_Q_NONE);
      if (info->field != SL_FIELD_NONE)
        {
          field_columns[info->field]++;
          g_assert_cmpstr (info->name, ==, sl_field_info (info->field)->name);
          g_assert_cmpint (info->group, ==, SL_CATALOGUE_GROUP_MEASURED);
        }
      if (info->quantity != SL_Q_NONE)
        {
          quantity_columns[info->quantity]++;
          g_assert_cmpstr (info->name, ==, sl_quantity_info (info->quantity)->name);
          g_assert_cmpint (info->group, ==, SL_CATALOGUE_GROUP_DERIVED);
          g_assert_cmpint (info->kind == SL_CATALOGUE_KIND_TEXT, ==, sl_quantity_info (info->quantity)->is_text);
        }
    }
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      SlFieldKind kind = sl_field_info (f)->kind;
      guint want = kind == SL_FIELD_KIND_VALUE || kind == SL_FIELD_KIND_TEXT ? 1 : 0;

      if (field_columns[f] != want)
        g_error ("input field %s: %u columns, want %u", sl_field_info (f)->name, field_columns[f], want);
    }
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    if (quantity_columns[q] != 1)
      g_error ("quantity %s: %u columns, want 1", sl_quantity_info (q)->name, quantity_columns[q]);
  g_assert_false (sl_catalogue_column_from_name ("parallax_err", NULL));
  g_assert_false (sl_catalogue_column_from_name ("Parallax", NULL));

  g_assert_cmpuint (n, ==, G_N_ELEMENTS (usual));
  for (guint i = 0; i < n; i++)
    g_assert_cmpstr (sl_catalogue_column_info (defaults[i])->name, ==, usual[i]);
}

static void
test_random_access (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GArray) want = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;

  build_catalogue (f);
  want = read_reference (f->project);
  g_assert_cmpuint (want->len, ==, N_FIRST + N_SECOND_NEW + N_LATE_NEW);
  model = open_model (f);
  /* The usual columns, twice (the second pass meets a warm cache), then
   * every column. */
  assert_model_is (model, want, NULL, 0);
  assert_model_is (model, want, NULL, 0);
  show_every_column (model);
  assert_model_is (model, want, NULL, 0);
}

static void
test_sort (SlTestProject *f, gconstpointer data)
{
  SlCatalogueColumn columns[SL_CATALOGUE_N_COLUMNS + 1];
  g_autoptr (GArray) want = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;
  guint calls = 0;

  /* By every column, then none; the rows read with the star's name and
   * the column sorted by (the random-access test reads every column
   * whole).  The first sort reads every column, and the usual ones are
   * read for the order by id. */
  for (SlCatalogueColumn c = 0; c <= SL_CATALOGUE_N_COLUMNS; c++)
    columns[c] = c;
  build_catalogue (f);
  want = read_reference (f->project);
  model = open_model (f);
  g_signal_connect (model, "items-changed", G_CALLBACK (count_items_changed), &calls);
  for (gsize i = 0; i < G_N_ELEMENTS (columns); i++)
    for (int descending = 0; descending <= 1; descending++)
      {
        SlCatalogueColumn shown[2] = { SL_CATALOGUE_COLUMN_DESIGNATION, columns[i] };

        g_autoptr (GError) error = NULL;
        g_autofree guint *order = ref_order (want, columns[i], descending);
        SlCatalogueColumn column;
        gboolean got_descending;
        guint before = calls;

        g_test_message ("sort by %s %s", columns[i] < SL_CATALOGUE_N_COLUMNS
                        ? sl_catalogue_column_info (columns[i])->title : "id", descending ? "down" : "up");
        if (i == 0 && !descending)
          show_every_column (model);
        else if (columns[i] == SL_CATALOGUE_COLUMN_NONE)
          {
            guint n;
            const SlCatalogueColumn *usual = sl_catalogue_default_columns (&n);

            g_assert_true (sl_catalogue_model_set_columns (model, usual, n, &error));
          }
        else
          g_assert_true (sl_catalogue_model_set_columns (model, shown, 2, &error));
        g_assert_no_error (error);
        before = calls;
        g_assert_true (sl_catalogue_model_sort (model, columns[i], descending, &error));
        g_assert_no_error (error);
        /* The order is swapped in whole: two signals, no row by row. */
        g_assert_cmpuint (calls, ==, before + 2);
        g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), ==, 0);
        sl_catalogue_model_get_sort (model, &column, &got_descending);
        g_assert_cmpint (column, ==, columns[i]);
        g_assert_cmpint (got_descending, ==, descending);
        assert_model_is (model, want, order, SORT_SAMPLES);
      }
}

static void
test_find (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GArray) want = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;
  g_autoptr (GError) error = NULL;

  build_catalogue (f);
  want = read_reference (f->project);
  model = open_model (f);
  g_assert_true (sl_catalogue_model_sort (model, SL_CATALOGUE_COLUMN_TEFF, TRUE, &error));
  for (int round = 0; round < 20; round++)
    {
      g_autoptr (GStrvBuilder) builder = g_strv_builder_new ();
      g_auto (GStrv) names = NULL;
      g_auto (GStrv) back = NULL;
      g_autoptr (GArray) positions = NULL;
      guint n = (guint) g_test_rand_int_range (0, 12);

      for (guint i = 0; i < n; i++)
        g_strv_builder_add (builder, g_array_index (want, RefStar, g_test_rand_int_range (0, (gint32) want->len))
                                       .text[SL_CATALOGUE_COLUMN_DESIGNATION]);
      g_strv_builder_add (builder, "no such star");
      names = g_strv_builder_end (builder);
      positions = sl_catalogue_model_find (model, (const char *const *) names);
      back = sl_catalogue_model_get_designations (model, (const guint *) positions->data, positions->len);
      /* Every name found once (duplicates collapse), the unknown one not. */
      for (guint i = 0; i < positions->len; i++)
        {
          g_autoptr (SlCatalogueRow) row = g_list_model_get_item (G_LIST_MODEL (model),
                                                                  g_array_index (positions, guint, i));

          g_assert_cmpstr (sl_catalogue_row_get_designation (row), ==, back[i]);
          g_assert_true (g_strv_contains ((const char *const *) names, back[i]));
          if (i > 0)
            g_assert_cmpuint (g_array_index (positions, guint, i - 1), <, g_array_index (positions, guint, i));
        }
      for (guint i = 0; i < n; i++)
        g_assert_true (g_strv_contains ((const char *const *) back, names[i]));
      g_assert_false (g_strv_contains ((const char *const *) back, "no such star"));
    }
}

static void
test_reload (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GArray) want = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;
  g_autoptr (GError) error = NULL;
  guint calls = 0, n;

  build_catalogue (f);
  model = open_model (f);
  g_assert_true (sl_catalogue_model_sort (model, SL_CATALOGUE_COLUMN_VMAG, FALSE, &error));
  n = g_list_model_get_n_items (G_LIST_MODEL (model));
  import_string (f->project, f->dir, "more.csv", "id,vmag,sptype\nNEW 1,-5.0,O5 V\nNEW 2,3.0,\nS 00001,-6.0,\n");
  /* The model shows what it read until it is told to read again. */
  g_assert_cmpuint (g_list_model_get_n_items (G_LIST_MODEL (model)), ==, n);
  g_signal_connect (model, "items-changed", G_CALLBACK (count_items_changed), &calls);
  g_assert_false (calls);
  {
    g_autoptr (SlCatalogueRow) row = g_list_model_get_item (G_LIST_MODEL (model), 0);

    g_assert_cmpstr (sl_catalogue_row_get_designation (row), !=, "NEW 1");
  }
  g_signal_handlers_disconnect_by_func (model, count_items_changed, &calls);
  g_assert_true (sl_catalogue_model_reload (model, &error));
  g_assert_no_error (error);
  want = read_reference (f->project);
  g_assert_cmpuint (want->len, ==, n + 2);
  {
    g_autofree guint *order = ref_order (want, SL_CATALOGUE_COLUMN_VMAG, FALSE);

    assert_model_is (model, want, order, SORT_SAMPLES);
  }
}

/* The input columns follow the project's combination policy (inputs.h):
 * each value and interval as the input cursor takes it, after a reload,
 * and sorted by it. */
static void
test_policy (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GArray) want = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;
  g_autoptr (GError) error = NULL;
  SlCombinePolicy policy;
  guint n_means = 0;

  build_catalogue (f);
  model = open_model (f);
  show_every_column (model);
  sl_combine_policy_init (&policy);
  policy.rule[SL_FIELD_PARALLAX] = SL_COMBINE_WEIGHTED_MEAN;
  policy.rule[SL_FIELD_VMAG] = SL_COMBINE_WEIGHTED_MEAN;
  policy.rule[SL_FIELD_RA] = SL_COMBINE_PRIORITY;
  policy.rule[SL_FIELD_BV] = SL_COMBINE_PRIORITY;
  g_strlcpy (policy.priority, "second.csv\nfirst.csv", sizeof policy.priority);
  g_assert_true (sl_combine_policy_write (f->project, &policy, &error));
  g_assert_no_error (error);
  g_assert_true (sl_catalogue_model_reload (model, &error));
  g_assert_no_error (error);

  want = read_reference (f->project);
  {
    g_autoptr (SlInputCursor) cursor = sl_input_cursor_new (f->project, 0, &error);
    SlStarInputs in;

    while (sl_input_cursor_next (cursor, &in, &error))
      n_means += in.n_combined[SL_FIELD_PARALLAX] >= 2;
    g_assert_no_error (error);
  }
  g_assert_cmpuint (n_means, >, 50);   /* the test means something */
  tolerance = 1e-14;
  assert_model_is (model, want, NULL, 0);
  for (int descending = 0; descending <= 1; descending++)
    {
      g_autofree guint *order = ref_order (want, SL_CATALOGUE_COLUMN_PARALLAX, descending);

      g_assert_true (sl_catalogue_model_sort (model, SL_CATALOGUE_COLUMN_PARALLAX, descending, &error));
      assert_model_is (model, want, order, SORT_SAMPLES);
    }
  tolerance = 0.0;
}

typedef struct {
  GMainLoop *loop;
  guint      done, cancelled;
} AsyncState;

static void
on_order_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  AsyncState *state = user_data;
  g_autoptr (GError) error = NULL;

  if (sl_catalogue_model_order_finish (SL_CATALOGUE_MODEL (source), result, &error))
    state->done++;
  else
    {
      g_assert_error (error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
      state->cancelled++;
    }
  if (state->done + state->cancelled == 2)
    g_main_loop_quit (state->loop);
}

/* Two sorts asked for at once: the first is superseded, the second shown. */
static void
test_sort_async (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GArray) want = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;
  g_autoptr (GMainLoop) loop = g_main_loop_new (NULL, FALSE);
  g_autofree guint *order = NULL;
  AsyncState state = { loop, 0, 0 };

  build_catalogue (f);
  want = read_reference (f->project);
  model = open_model (f);
  sl_catalogue_model_sort_async (model, SL_CATALOGUE_COLUMN_DIST, FALSE, NULL, on_order_done, &state);
  sl_catalogue_model_sort_async (model, SL_CATALOGUE_COLUMN_SPTYPE, TRUE, NULL, on_order_done, &state);
  g_main_loop_run (loop);
  g_assert_cmpuint (state.done, ==, 1);
  g_assert_cmpuint (state.cancelled, ==, 1);
  order = ref_order (want, SL_CATALOGUE_COLUMN_SPTYPE, TRUE);
  assert_model_is (model, want, order, SORT_SAMPLES);
}

/* A page reads the shown columns only: the query joins what they need
 * and nothing else, and the rows lack the hidden columns (checked
 * against the reference, which has them); a change of columns is
 * announced as every row removed and added again, and the next read runs
 * one page query. */
static void
test_hidden_columns (SlTestProject *f, gconstpointer data)
{
  static const struct {
    SlCatalogueColumn columns[4];
    guint             n;
    const char       *joined[3];      /* must be in the page query */
    const char       *not_joined[4];  /* must not */
  } cases[] = {
    { { SL_CATALOGUE_COLUMN_DESIGNATION, SL_CATALOGUE_COLUMN_TEFF }, 2,
      { "derived d", "d.teff_lo" }, { "measurements", "d.flags", "d.lum" } },
    { { SL_CATALOGUE_COLUMN_PMDEC, SL_CATALOGUE_COLUMN_DESIGNATION }, 2,
      { "m_pmra.pmdec", "m_pmra.pmdec_err" }, { "derived", "m_pmra.pmra,", "m_ra", "sptype" } },
    { { SL_CATALOGUE_COLUMN_BMAG, SL_CATALOGUE_COLUMN_FLAGS, SL_CATALOGUE_COLUMN_EPOCH, SL_CATALOGUE_COLUMN_VRAD }, 4,
      { "m_bmag.bmag_err", "d.flags", "m_ra.epoch" }, { "m_vmag", "d.teff", "m_ra.ra", "m_parallax" } },
  };
  g_autoptr (GArray) want = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;
  g_autoptr (GError) error = NULL;

  build_catalogue (f);
  want = read_reference (f->project);
  model = open_model (f);
  {
    g_autofree char *sql = sl_catalogue_model_get_page_sql (model);

    /* The usual columns: no proper motion, B, E(B-V) or radial velocity. */
    for (const char *const *p = (const char *const[]) { "pmra", "bmag", "ebv", "vrad", "plx_snr", NULL }; *p; p++)
      if (strstr (sql, *p))
        g_error ("the usual columns' query reads %s: %s", *p, sql);
  }
  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      guint calls = 0, pages, n;
      const SlCatalogueColumn *got;
      g_autofree char *sql = NULL;
      g_autofree guint *order = NULL;

      /* Some rows held: a change of columns drops them. */
      g_clear_object (&error);
      g_clear_pointer (&order, g_free);
      g_object_unref (g_list_model_get_item (G_LIST_MODEL (model), 0));
      g_signal_connect (model, "items-changed", G_CALLBACK (count_items_changed), &calls);
      g_assert_true (sl_catalogue_model_set_columns (model, cases[i].columns, cases[i].n, &error));
      g_assert_no_error (error);
      g_signal_handlers_disconnect_by_func (model, count_items_changed, &calls);
      g_assert_cmpuint (calls, ==, 2);
      g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), ==, 0);
      got = sl_catalogue_model_get_columns (model, &n);
      g_assert_cmpuint (n, ==, cases[i].n);
      g_assert_cmpmem (got, n * sizeof *got, cases[i].columns, cases[i].n * sizeof *got);

      sql = sl_catalogue_model_get_page_sql (model);
      for (guint k = 0; k < G_N_ELEMENTS (cases[i].joined) && cases[i].joined[k]; k++)
        if (!strstr (sql, cases[i].joined[k]))
          g_error ("case %" G_GSIZE_FORMAT ": the page query lacks %s: %s", i, cases[i].joined[k], sql);
      for (guint k = 0; k < G_N_ELEMENTS (cases[i].not_joined) && cases[i].not_joined[k]; k++)
        if (strstr (sql, cases[i].not_joined[k]))
          g_error ("case %" G_GSIZE_FORMAT ": the page query reads %s: %s", i, cases[i].not_joined[k], sql);

      pages = sl_catalogue_model_get_pages_read (model);
      {
        g_autoptr (SlCatalogueRow) row = g_list_model_get_item (G_LIST_MODEL (model), 1);

        g_assert_cmpuint (sl_catalogue_model_get_pages_read (model), ==, pages + 1);
      }
      /* Sorted by a shown column; every row against the reference. */
      g_assert_true (sl_catalogue_model_sort (model, cases[i].columns[0], i % 2 == 1, &error));
      order = ref_order (want, cases[i].columns[0], i % 2 == 1);
      assert_model_is (model, want, order, 0);
    }
}

/* ------------------------------------------------------------------ */
/* A target list                                                      */

/* Only the list's stars, in the order asked for (the reference's order
 * with the other stars left out), in sync and async orders alike; back to
 * every star without the list; a list that is gone shows none. */
static void
test_list (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GArray) want = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) members = NULL;
  g_autoptr (GHashTable) in_list = g_hash_table_new (g_int64_hash, g_int64_equal);
  g_autoptr (GMainLoop) loop = g_main_loop_new (NULL, FALSE);
  g_autofree guint *order = NULL;
  AsyncState state = { loop, 0, 0 };
  gint64 n;
  guint position = 0;

  build_catalogue (f);
  want = read_reference (f->project);
  n = sl_list_create_from_condition (f->project, "cool", "teff < 5000 or sptype ~ 'M'", NULL, FALSE, &error);
  g_assert_no_error (error);
  g_assert_cmpint (n, >, 10);
  g_assert_cmpint (n, <, (gint64) want->len / 2);
  members = sl_list_star_ids (f->project, "cool", &error);
  g_assert_no_error (error);
  for (guint i = 0; i < members->len; i++)
    g_hash_table_add (in_list, &g_array_index (members, gint64, i));

  model = open_model (f);
  sl_catalogue_model_set_list (model, "cool");
  g_assert_cmpstr (sl_catalogue_model_get_list (model), ==, "cool");
  /* Nothing changes until the model reads again. */
  g_assert_cmpuint (g_list_model_get_n_items (G_LIST_MODEL (model)), ==, want->len);
  g_assert_true (sl_catalogue_model_sort (model, SL_CATALOGUE_COLUMN_TEFF, TRUE, &error));
  g_assert_no_error (error);
  g_assert_cmpuint (g_list_model_get_n_items (G_LIST_MODEL (model)), ==, (guint) n);
  order = ref_order (want, SL_CATALOGUE_COLUMN_TEFF, TRUE);
  for (guint k = 0; k < want->len; k++)
    {
      const RefStar *ref = &g_array_index (want, RefStar, order[k]);
      g_autoptr (SlCatalogueRow) row = NULL;

      if (!g_hash_table_contains (in_list, &ref->id))
        continue;
      row = g_list_model_get_item (G_LIST_MODEL (model), position++);
      g_assert_cmpstr (sl_catalogue_row_get_designation (row), ==, ref->text[SL_CATALOGUE_COLUMN_DESIGNATION]);
    }
  g_assert_cmpuint (position, ==, (guint) n);

  /* An async reload keeps the list; a second call completes the loop. */
  sl_catalogue_model_reload_async (model, NULL, on_order_done, &state);
  sl_catalogue_model_sort_async (model, SL_CATALOGUE_COLUMN_NONE, FALSE, NULL, on_order_done, &state);
  g_main_loop_run (loop);
  g_assert_cmpuint (state.done, ==, 1);
  g_assert_cmpuint (g_list_model_get_n_items (G_LIST_MODEL (model)), ==, (guint) n);
  {
    g_autoptr (SlCatalogueRow) first = g_list_model_get_item (G_LIST_MODEL (model), 0);
    g_autofree char *name = sl_test_query_text (f->db, "SELECT s.designation FROM stars s JOIN list_members m "
                                                       "ON m.star_id = s.id ORDER BY s.id LIMIT 1");

    g_assert_cmpstr (sl_catalogue_row_get_designation (first), ==, name);
  }

  sl_catalogue_model_set_list (model, NULL);
  g_assert_true (sl_catalogue_model_reload (model, &error));
  g_assert_cmpuint (g_list_model_get_n_items (G_LIST_MODEL (model)), ==, want->len);

  g_assert_true (sl_list_delete (f->project, "cool", &error));
  sl_catalogue_model_set_list (model, "cool");
  g_assert_true (sl_catalogue_model_reload (model, &error));
  g_assert_no_error (error);
  g_assert_cmpuint (g_list_model_get_n_items (G_LIST_MODEL (model)), ==, 0);
}

/* ------------------------------------------------------------------ */
/* A large project                                                    */

static void
test_large (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) csv = g_string_sized_new ((gsize) N_LARGE * 40);
  g_autofree char *path = NULL;
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (SlCatalogueModel) model = NULL;
  g_autoptr (SlCatalogueSelection) selection = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GtkBitset) selected = NULL;
  SlImportOptions options;
  const char *names[] = { "L 0999999", "L 0000000", "L 0500000", NULL };
  g_autoptr (GArray) positions = NULL;

  g_string_append (csv, "id,ra,dec,parallax,parallax_err,vmag\n");
  for (guint i = 0; i < N_LARGE; i++)
    {
      g_string_append_printf (csv, "L %07u,", i);
      append_fixed (csv, (gint64) (i * 7919u % 360000u), 3);
      g_string_append_c (csv, ',');
      append_fixed (csv, (gint64) (i * 104729u % 180000u) - 90000, 3);
      g_string_append_c (csv, ',');
      append_fixed (csv, (gint64) (i % 50000u) + 100, 3);
      g_string_append (csv, ",0.1,");
      append_fixed (csv, (gint64) (i % 200u) - 20, 1);
      g_string_append_c (csv, '\n');
    }
  path = sl_test_write_file (f->dir, "large.csv", csv->str, (gssize) csv->len);
  g_string_truncate (csv, 0);
  sl_import_options_init (&options);
  report = sl_import_csv (f->project, path, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (report->rows_accepted, ==, N_LARGE);

  model = open_model (f);
  g_assert_cmpuint (g_list_model_get_n_items (G_LIST_MODEL (model)), ==, N_LARGE);
  g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), ==, 0);

  /* The last star reads one page: the last. */
  {
    g_autoptr (SlCatalogueRow) row = g_list_model_get_item (G_LIST_MODEL (model), N_LARGE - 1);

    g_assert_cmpstr (sl_catalogue_row_get_designation (row), ==, "L 0999999");
    g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), ==,
                      N_LARGE - (N_LARGE - 1) / SL_CATALOGUE_MODEL_PAGE_ROWS * SL_CATALOGUE_MODEL_PAGE_ROWS);
  }
  /* Twenty columns shown: the last star still reads one page, the
   * last. */
  {
    static const SlCatalogueColumn twenty[] = {
      SL_CATALOGUE_COLUMN_DESIGNATION, SL_CATALOGUE_COLUMN_RA, SL_CATALOGUE_COLUMN_DEC,
      SL_CATALOGUE_COLUMN_EPOCH, SL_CATALOGUE_COLUMN_PARALLAX, SL_CATALOGUE_COLUMN_PMRA,
      SL_CATALOGUE_COLUMN_PMDEC, SL_CATALOGUE_COLUMN_VMAG, SL_CATALOGUE_COLUMN_BMAG,
      SL_CATALOGUE_COLUMN_BV, SL_CATALOGUE_COLUMN_EBV, SL_CATALOGUE_COLUMN_VRAD,
      SL_CATALOGUE_COLUMN_SPTYPE, SL_CATALOGUE_COLUMN_PLX_SNR, SL_CATALOGUE_COLUMN_DIST,
      SL_CATALOGUE_COLUMN_ABSMAG, SL_CATALOGUE_COLUMN_TEFF, SL_CATALOGUE_COLUMN_LUM,
      SL_CATALOGUE_COLUMN_SPCLASS, SL_CATALOGUE_COLUMN_FLAGS,
    };
    guint pages = sl_catalogue_model_get_pages_read (model);
    g_autoptr (SlCatalogueRow) row = NULL;
    double value;

    g_assert_true (sl_catalogue_model_set_columns (model, twenty, G_N_ELEMENTS (twenty), &error));
    g_assert_no_error (error);
    g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), ==, 0);
    row = g_list_model_get_item (G_LIST_MODEL (model), N_LARGE - 1);
    g_assert_cmpstr (sl_catalogue_row_get_designation (row), ==, "L 0999999");
    g_assert_true (sl_catalogue_row_get_number (row, SL_CATALOGUE_COLUMN_PARALLAX, &value, NULL, NULL));
    g_assert_cmpfloat (value, ==, 50.099);   /* 999999 % 50000 + 100, in 10^-3 mas */
    g_assert_cmpuint (sl_catalogue_model_get_pages_read (model), ==, pages + 1);
    g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), ==,
                      N_LARGE - (N_LARGE - 1) / SL_CATALOGUE_MODEL_PAGE_ROWS * SL_CATALOGUE_MODEL_PAGE_ROWS);
  }
  /* Pages far apart: the cache stays within its limit. */
  for (guint i = 0; i < 200; i++)
    {
      guint p = (guint) g_test_rand_int_range (0, N_LARGE);
      g_autoptr (SlCatalogueRow) row = g_list_model_get_item (G_LIST_MODEL (model), p);
      g_autofree char *name = g_strdup_printf ("L %07u", p);

      g_assert_cmpstr (sl_catalogue_row_get_designation (row), ==, name);
      g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), <=, CACHE_LIMIT);
    }

  /* Selecting everything fetches no row. */
  selection = sl_catalogue_selection_new (G_LIST_MODEL (model));
  g_assert_true (sl_catalogue_model_sort (model, SL_CATALOGUE_COLUMN_DESIGNATION, TRUE, &error));
  g_assert_no_error (error);
  g_assert_true (gtk_selection_model_select_all (GTK_SELECTION_MODEL (selection)));
  g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), ==, 0);
  selected = gtk_selection_model_get_selection (GTK_SELECTION_MODEL (selection));
  g_assert_cmpuint (gtk_bitset_get_size (selected), ==, N_LARGE);
  g_assert_true (gtk_selection_model_unselect_item (GTK_SELECTION_MODEL (selection), 7));
  g_assert_false (gtk_selection_model_is_selected (GTK_SELECTION_MODEL (selection), 7));
  g_assert_true (gtk_selection_model_is_selected (GTK_SELECTION_MODEL (selection), N_LARGE - 1));
  g_assert_cmpuint (sl_catalogue_model_get_cached_rows (model), ==, 0);

  /* Found by name in the order shown: descending names put L 0999999 first. */
  positions = sl_catalogue_model_find (model, names);
  g_assert_cmpuint (positions->len, ==, 3);
  g_assert_cmpuint (g_array_index (positions, guint, 0), ==, 0);
  g_assert_cmpuint (g_array_index (positions, guint, 1), ==, N_LARGE / 2 - 1);
  g_assert_cmpuint (g_array_index (positions, guint, 2), ==, N_LARGE - 1);

  /* A new order drops the selection of the positions replaced. */
  g_assert_true (sl_catalogue_model_sort (model, SL_CATALOGUE_COLUMN_VMAG, FALSE, &error));
  g_clear_pointer (&selected, gtk_bitset_unref);
  selected = gtk_selection_model_get_selection (GTK_SELECTION_MODEL (selection));
  g_assert_true (gtk_bitset_is_empty (selected));
  {
    /* V = -2.0 first (i % 200 == 0), ties by id. */
    g_autoptr (SlCatalogueRow) first = g_list_model_get_item (G_LIST_MODEL (model), 0);
    g_autoptr (SlCatalogueRow) second = g_list_model_get_item (G_LIST_MODEL (model), 1);

    g_assert_cmpstr (sl_catalogue_row_get_designation (first), ==, "L 0000000");
    g_assert_cmpstr (sl_catalogue_row_get_designation (second), ==, "L 0000200");
  }
}

int
main (int argc, char **argv)
{
  setlocale (LC_ALL, "");
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/catalogue-model/format", test_format);
  g_test_add_func ("/catalogue-model/columns/table", test_column_table);
  g_test_add ("/catalogue-model/random-access", SlTestProject, NULL, sl_test_project_set_up, test_random_access,
              sl_test_project_tear_down);
  g_test_add ("/catalogue-model/sort", SlTestProject, NULL, sl_test_project_set_up, test_sort,
              sl_test_project_tear_down);
  g_test_add ("/catalogue-model/columns/hidden", SlTestProject, NULL, sl_test_project_set_up, test_hidden_columns,
              sl_test_project_tear_down);
  g_test_add ("/catalogue-model/find", SlTestProject, NULL, sl_test_project_set_up, test_find,
              sl_test_project_tear_down);
  g_test_add ("/catalogue-model/policy", SlTestProject, NULL, sl_test_project_set_up, test_policy,
              sl_test_project_tear_down);
  g_test_add ("/catalogue-model/reload", SlTestProject, NULL, sl_test_project_set_up, test_reload,
              sl_test_project_tear_down);
  g_test_add ("/catalogue-model/sort-async", SlTestProject, NULL, sl_test_project_set_up, test_sort_async,
              sl_test_project_tear_down);
  g_test_add ("/catalogue-model/list", SlTestProject, NULL, sl_test_project_set_up, test_list,
              sl_test_project_tear_down);
  g_test_add ("/catalogue-model/large", SlTestProject, NULL, sl_test_project_set_up, test_large,
              sl_test_project_tear_down);
  return g_test_run ();
}
