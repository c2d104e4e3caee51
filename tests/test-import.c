/* test-import.c: CSV import: dialects, units, missing values, every
 * rejection reason, the one-transaction rule, the re-import guard,
 * provenance and locale independence, the dry run and the preview. */
#include <glib/gstdio.h>
#include <locale.h>
#include <sqlite3.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "import.h"
#include "sl-error.h"
#include "test-util.h"

/* The value of one measurement column of a star, or NAN for NULL. */
static double
stored (SlTestProject *f, const char *designation, const char *column)
{
  g_autofree char *sql = g_strdup_printf ("SELECT m.%s FROM measurements m JOIN stars s "
                                          "ON s.id = m.star_id WHERE s.designation = ?", column);
  sqlite3_stmt *stmt;
  double value = NAN;

  g_assert_cmpint (sqlite3_prepare_v2 (f->db, sql, -1, &stmt, NULL), ==, SQLITE_OK);
  sqlite3_bind_text (stmt, 1, designation, -1, SQLITE_STATIC);
  g_assert_cmpint (sqlite3_step (stmt), ==, SQLITE_ROW);
  if (sqlite3_column_type (stmt, 0) != SQLITE_NULL)
    value = sqlite3_column_double (stmt, 0);
  sqlite3_finalize (stmt);
  return value;
}

/* Imports CONTENTS as NAME with MAPS ("field=column:unit" strings, NULL-
 * terminated, may be NULL) and default options otherwise. */
static SlImportReport *
import_with (SlTestProject *f, const char *name, const char *contents, gssize length,
             const char *const *map_specs, const SlImportOptions *base, GError **error)
{
  g_autofree char *path = sl_test_write_file (f->dir, name, contents, length);
  g_autoptr (GArray) maps = g_array_new (FALSE, FALSE, sizeof (SlColumnMap));
  SlImportOptions options;
  SlImportReport *report;

  g_array_set_clear_func (maps, (GDestroyNotify) sl_column_map_clear);
  if (base)
    options = *base;
  else
    sl_import_options_init (&options);
  for (guint i = 0; map_specs && map_specs[i]; i++)
    {
      SlColumnMap map;
      g_autoptr (GError) map_error = NULL;

      g_assert_true (sl_column_map_parse (map_specs[i], &map, &map_error));
      g_assert_no_error (map_error);
      g_array_append_val (maps, map);
    }
  options.maps = (const SlColumnMap *) maps->data;
  options.n_maps = maps->len;
  report = sl_import_csv (f->project, path, &options, error);
  return report;
}

static SlImportReport *
import_ok (SlTestProject *f, const char *contents, const char *const *maps)
{
  g_autoptr (GError) error = NULL;
  SlImportReport *report = import_with (f, "input.csv", contents, -1, maps, NULL, &error);

  g_assert_no_error (error);
  g_assert_nonnull (report);
  return report;
}

/* ---------------------------------------------------------------- units */

static void
test_units_converted (SlTestProject *f, gconstpointer data)
{
  const char *maps[] = { "ra=RA:hms", "dec=DE:dms", "parallax=plx:arcsec", "parallax_err=e_plx:arcsec",
                         "pmra=pmx:arcsec/yr", "pmdec=pmy:arcsec/yr", NULL };
  g_autoptr (SlImportReport) report =
    import_ok (f, "id,RA,DE,plx,e_plx,pmx,pmy\n"
                  "S1,14 29 42.9,-62 40 46.1,0.7685,0.0003,-3.781,0.770\n"
                  "S2,00:00:00.0,-00 12 30,0.010,0.001,0.001,-0.002\n", maps);

  g_assert_cmpuint (report->rows_accepted, ==, 2);
  /* 14h29m42.9s = 15 * (14 + 29/60 + 42.9/3600) deg (definition of the hour angle unit). */
  sl_assert_close (stored (f, "S1", "ra"), 15.0 * (14.0 + 29.0 / 60.0 + 42.9 / 3600.0), 1e-12, "hms to deg");
  sl_assert_close (stored (f, "S1", "dec"), -(62.0 + 40.0 / 60.0 + 46.1 / 3600.0), 1e-12, "dms to deg");
  sl_assert_close (stored (f, "S1", "parallax"), 768.5, 1e-9, "arcsec to mas");
  sl_assert_close (stored (f, "S1", "parallax_err"), 0.3, 1e-12, "arcsec error to mas");
  sl_assert_close (stored (f, "S1", "pmra"), -3781.0, 1e-9, "arcsec/yr to mas/yr");
  /* The sign of "-00 12 30" applies to the whole angle. */
  sl_assert_close (stored (f, "S2", "dec"), -12.5 / 60.0, 1e-15, "-00 12 30 is negative");
}

static void
test_units_radians (SlTestProject *f, gconstpointer data)
{
  const char *maps[] = { "ra=a:rad", "dec=d:rad", NULL };
  g_autoptr (SlImportReport) report = import_ok (f, "id,a,d\nR,3.14159265358979,-0.5\n", maps);

  sl_assert_close (stored (f, "R", "ra"), 3.14159265358979 * 180.0 / G_PI, 1e-12, "rad to deg");
  sl_assert_close (stored (f, "R", "dec"), -0.5 * 180.0 / G_PI, 1e-12, "rad to deg");
}

/* -------------------------------------------------------------- dialects */

static void
test_dialect_semicolon_crlf_bom (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report =
    import_ok (f, "\xEF\xBB\xBFid;parallax;sptype\r\nA;10.5;\"G2 V; peculiar\"\r\nB;-0.3;K0\r\n", NULL);

  g_assert_cmpint (report->delimiter, ==, ';');
  g_assert_cmpuint (report->rows_accepted, ==, 2);
  sl_assert_close (stored (f, "A", "parallax"), 10.5, 0, "semicolon file");
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements WHERE sptype = 'G2 V; peculiar'"), ==, 1);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars WHERE designation = 'A'"), ==, 1);  /* BOM not in the id header */
}

static void
test_dialect_tab_comments (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report =
    import_ok (f, "# our reduction\n# units: mas\n\nid\tparallax\tparallax_err\n"
                  "# a comment between rows\nA\t 12.0 \t0.5\n\nB\t3\t1\n", NULL);

  g_assert_cmpint (report->delimiter, ==, '\t');
  g_assert_cmpuint (report->rows_accepted, ==, 2);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT line FROM measurements WHERE parallax = 12.0"), ==, 6);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT line FROM measurements WHERE parallax = 3"), ==, 8);
}

static void
test_dialect_quoted_multiline (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report =
    import_ok (f, "id,sptype,parallax\n\"A, the first\",\"K0 III\nwith \"\"notes\"\"\",1\nB,M2 V,2\n", NULL);

  g_assert_cmpuint (report->rows_accepted, ==, 2);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars WHERE designation = 'A, the first'"), ==, 1);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements WHERE sptype = 'K0 III\nwith \"notes\"'"), ==, 1);
  /* B starts on line 4: the quoted field spans lines 2 and 3. */
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT line FROM measurements WHERE parallax = 2"), ==, 4);
}

static void
test_header_case_insensitive (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_ok (f, "ID,Parallax,VMAG,comment\nA,5,7.25,nice\n", NULL);

  sl_assert_close (stored (f, "A", "vmag"), 7.25, 0, "VMAG header maps to vmag");
  g_assert_cmpuint (report->ignored_columns->len, ==, 1);
  g_assert_cmpstr (report->ignored_columns->pdata[0], ==, "comment");
}

/* -------------------------------------------------------- missing values */

static void
test_missing_values (SlTestProject *f, gconstpointer data)
{
  const char *tokens[] = { "--", "99.99", NULL };
  SlImportOptions options;
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;

  sl_import_options_init (&options);
  options.missing = tokens;
  report = import_with (f, "m.csv", "id,vmag,bv,parallax\nA,,NaN,--\nB,99.99,nan,1\nC,9.99,0.5, \n",
                        -1, NULL, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (report->rows_accepted, ==, 3);
  g_assert_true (isnan (stored (f, "A", "vmag")));
  g_assert_true (isnan (stored (f, "A", "bv")));
  g_assert_true (isnan (stored (f, "A", "parallax")));
  g_assert_true (isnan (stored (f, "B", "vmag")));
  g_assert_true (isnan (stored (f, "C", "parallax")));
  sl_assert_close (stored (f, "C", "vmag"), 9.99, 0, "9.99 is not the token 99.99");
  /* Missing is NULL, never zero. */
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements WHERE vmag = 0 OR parallax = 0"), ==, 0);
}

static void
test_negative_parallax_kept (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_ok (f, "id,parallax,parallax_err\nFar,-0.42,0.61\n", NULL);

  g_assert_cmpuint (report->rejections->len, ==, 0);
  sl_assert_close (stored (f, "Far", "parallax"), -0.42, 0, "a negative parallax is a measurement");
}

/* ------------------------------------------------------------- rejections */

typedef struct {
  const char *name;
  const char *row;       /* after the header id,ra,dec,parallax,parallax_err,vmag,sptype */
  const char *column;    /* NULL: the whole row */
  const char *reason;    /* a substring of the reason */
} RejectionCase;

static const RejectionCase rejection_cases[] = {
  { "not-a-number", "B,10,20,12.7.1,0.1,5,G2", "parallax", "not a number: '12.7.1'" },
  { "decimal-comma", "B,10,20,\"12,5\",0.1,5,G2", "parallax", "decimal comma" },
  { "dec-above-90", "B,10,90.0000001,1,0.1,5,G2", "dec", "dec must be in [-90, 90]" },
  { "ra-360", "B,360,20,1,0.1,5,G2", "ra", "ra must be in [0, 360)" },
  { "ra-negative", "B,-0.1,20,1,0.1,5,G2", "ra", "ra must be in [0, 360)" },
  { "zero-error", "B,10,20,1,0,5,G2", "parallax_err", "uncertainty must be positive" },
  { "negative-error", "B,10,20,1,-0.1,5,G2", "parallax_err", "uncertainty must be positive" },
  { "faint-magnitude", "B,10,20,1,0.1,41.2,G2", "vmag", "vmag must be in [-30, 30]" },
  { "infinity", "B,10,20,inf,0.1,5,G2", "parallax", "not a number" },
  { "huge-number", "B,10,20,1e400,0.1,5,G2", "parallax", "out of range" },
  { "parallax-in-arcsec-range", "B,10,20,1500,0.1,5,G2", "parallax", "parallax must be in" },
  { "empty-id", ",10,20,1,0.1,5,G2", "id", "the id is empty" },
  { "invalid-utf8", "B,10,20,1,0.1,5,G5 \xff V", "sptype", "not valid UTF-8" },
  { "too-few-fields", "B,10,20,1", NULL, "the row has 4 fields, the header has 7" },
  { "too-many-fields", "B,10,20,1,0.1,5,G2,extra", NULL, "the row has 8 fields" },
  { "bad-quoting", "B,10,20,1\"2,0.1,5,G2", NULL, "malformed quoting" },
};

static void
test_rejection (SlTestProject *f, gconstpointer data)
{
  const RejectionCase *c = data;
  g_autofree char *contents = g_strdup_printf ("id,ra,dec,parallax,parallax_err,vmag,sptype\n"
                                               "A,10,20,1,0.1,5,G2\n%s\nC,11,21,2,0.2,6,K0\n",
                                               c->row);
  g_autoptr (SlImportReport) report = import_ok (f, contents, NULL);
  const SlRejection *r;
  sqlite3_stmt *stmt;

  g_assert_cmpuint (report->rows_accepted, ==, 2);
  g_assert_cmpuint (report->rejections->len, ==, 1);
  r = &g_array_index (report->rejections, SlRejection, 0);
  g_assert_cmpuint (r->line, ==, 3);
  g_assert_cmpstr (r->column, ==, c->column);
  if (strstr (r->reason, c->reason) == NULL)
    g_error ("reason: want a message containing \"%s\", got \"%s\"", c->reason, r->reason);

  /* Kept in the project with its raw bytes, nothing silently dropped. */
  g_assert_cmpint (sqlite3_prepare_v2 (f->db,
                                       "SELECT line, reason, raw FROM rejected_rows", -1, &stmt, NULL), ==, SQLITE_OK);
  g_assert_cmpint (sqlite3_step (stmt), ==, SQLITE_ROW);
  g_assert_cmpint (sqlite3_column_int (stmt, 0), ==, 3);
  g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 1), ==, r->reason);
  g_assert_cmpmem (sqlite3_column_blob (stmt, 2), sqlite3_column_bytes (stmt, 2), c->row, strlen (c->row));
  sqlite3_finalize (stmt);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT rows_rejected FROM sources"), ==, 1);
}

static void
test_reject_duplicate_id (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_ok (f, "id,parallax\nA,1\nB,2\nA,3\n", NULL);
  const SlRejection *r = &g_array_index (report->rejections, SlRejection, 0);

  g_assert_cmpuint (report->rows_accepted, ==, 2);
  g_assert_cmpuint (r->line, ==, 4);
  g_assert_cmpstr (r->column, ==, "id");
  g_assert_cmpstr (r->reason, ==, "id 'A' appears twice in this file (first on line 2)");
  sl_assert_close (stored (f, "A", "parallax"), 1, 0, "the first row is kept");
}

static void
test_reject_sexagesimal_minutes (SlTestProject *f, gconstpointer data)
{
  const char *maps[] = { "dec=d:dms", NULL };
  g_autoptr (SlImportReport) report = import_ok (f, "id,d\nA,+12 59 10\nB,+12 61 10.0\n", maps);
  const SlRejection *r = &g_array_index (report->rejections, SlRejection, 0);

  g_assert_cmpuint (report->rejections->len, ==, 1);
  g_assert_cmpstr (r->column, ==, "d");
  g_assert_cmpstr (r->reason, ==, "minutes must be below 60: '+12 61 10.0'");
}

/* --------------------------------------------------- whole-file failures */

typedef struct {
  const char *name;
  const char *contents;
  gssize      length;
  int         code;
  const char *message;   /* a substring */
} FailureCase;

static const FailureCase failure_cases[] = {
  { "empty-file", "", 0, SL_ERROR_BAD_INPUT, "the file is empty" },
  { "only-comments", "# nothing here\n\n", -1, SL_ERROR_BAD_INPUT, "no header row" },
  { "header-only", "id,parallax\n", -1, SL_ERROR_NOTHING_ACCEPTED, "no data rows after the header (line 1)" },
  { "all-rejected", "id,parallax\nA,x\nB,y\n", -1, SL_ERROR_NOTHING_ACCEPTED,
    "all 2 were rejected, the first at line 2: parallax: not a number" },
  { "no-id-column", "name,parallax\nA,1\n", -1, SL_ERROR_BAD_MAPPING, "no id column" },
  { "binary", "id,parallax\nA,1\0\0\x01\x02", 16, SL_ERROR_BAD_INPUT, "not a text file" },
  { "duplicate-header", "id,parallax,parallax\nA,1,2\n", -1, SL_ERROR_BAD_MAPPING,
    "two columns named 'parallax' (columns 2 and 3)" },
  { "header-invalid-utf8", "id,p\xe9rallax\nA,1\n", -1, SL_ERROR_BAD_INPUT, "not valid UTF-8" },
  { "cr-only", "id,parallax\rA,1\r", -1, SL_ERROR_BAD_INPUT, "CR only" },
};

static void
test_whole_file_failure (SlTestProject *f, gconstpointer data)
{
  const FailureCase *c = data;
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = import_with (f, "bad.csv", c->contents, c->length, NULL, NULL, &error);

  g_assert_null (report);
  g_assert_error (error, SL_ERROR, c->code);
  if (strstr (error->message, c->message) == NULL)
    g_error ("message: want one containing \"%s\", got \"%s\"", c->message, error->message);
  g_assert_true (g_str_has_prefix (error->message, "bad.csv"));
  /* Nothing written: no source, no star, no ledger entry beyond creation. */
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM sources"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM rejected_rows"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM ledger"), ==, 1);
}

static void
test_mapping_errors (SlTestProject *f, gconstpointer data)
{
  const char *unknown_column[] = { "parallax=plx", NULL };
  const char *twice[] = { "parallax=a", "parallax=b", NULL };
  const char *one_column_two_fields[] = { "vmag=a", "bmag=a", NULL };
  g_autoptr (GError) error = NULL;
  SlColumnMap map;

  g_assert_null (import_with (f, "a.csv", "id,a,b\nA,1,2\n", -1, unknown_column, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING);
  g_assert_nonnull (strstr (error->message, "no column named 'plx'; the header has 'id', 'a', 'b'"));
  g_clear_error (&error);

  g_assert_null (import_with (f, "b.csv", "id,a,b\nA,1,2\n", -1, twice, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING);
  g_assert_nonnull (strstr (error->message, "parallax is mapped twice"));
  g_clear_error (&error);

  g_assert_null (import_with (f, "c.csv", "id,a,b\nA,1,2\n", -1, one_column_two_fields, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING);
  g_assert_nonnull (strstr (error->message, "mapped to both vmag and bmag"));
  g_clear_error (&error);

  /* The map syntax itself. */
  g_assert_false (sl_column_map_parse ("dec=d:hms", &map, &error));
  g_assert_nonnull (strstr (error->message, "unit hms does not apply to dec"));
  g_clear_error (&error);
  g_assert_false (sl_column_map_parse ("distance=d", &map, &error));
  g_assert_nonnull (strstr (error->message, "'distance' is not a field"));
  g_clear_error (&error);
  g_assert_false (sl_column_map_parse ("parallax", &map, &error));
  g_clear_error (&error);
  /* A ':' that is not followed by a unit belongs to the column name. */
  g_assert_true (sl_column_map_parse ("ra=RA:J2000", &map, &error));
  g_assert_cmpstr (map.column, ==, "RA:J2000");
  g_assert_cmpint (map.unit, ==, SL_UNIT_NONE);
  sl_column_map_clear (&map);
  g_assert_true (sl_column_map_parse ("ra=RA:J2000:hms", &map, &error));
  g_assert_cmpstr (map.column, ==, "RA:J2000");
  g_assert_cmpint (map.unit, ==, SL_UNIT_HMS);
  sl_column_map_clear (&map);

  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM sources"), ==, 0);
}

/* ------------------------------------------------------ the transaction */

static void
cancel_on_progress (double fraction, gpointer user_data)
{
  g_cancellable_cancel (G_CANCELLABLE (user_data));
}

/* A cancel after thousands of rows have been written leaves nothing. */
static void
test_cancel_midway (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) contents = g_string_new ("id,parallax,parallax_err\n");
  g_autoptr (GCancellable) cancellable = g_cancellable_new ();
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;

  for (int i = 0; i < 20000; i++)
    g_string_append_printf (contents, "S%d,%d.5,0.1\n", i, i % 100);
  sl_import_options_init (&options);
  options.cancellable = cancellable;
  options.progress = cancel_on_progress;
  options.progress_data = cancellable;

  report = import_with (f, "big.csv", contents->str, -1, NULL, &options, &error);
  g_assert_null (report);
  g_assert_error (error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM sources"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM ledger"), ==, 1);
  g_assert_cmpint (sl_test_query_int (f->db, "PRAGMA foreign_keys"), ==, 1);
}

/* The records are parsed on a thread of their own, ahead of the writes,
 * in chunks: over many chunks every row is stored with its own values
 * and texts, and every refused row is reported with its own line and
 * reason, in the file's order. */
static void
test_parsed_ahead_in_order (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) contents = g_string_new ("id,parallax,parallax_err,sptype\n");
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GPtrArray) want = g_ptr_array_new_with_free_func (g_free);
  guint refused = 0;

  for (int i = 0; i < 5000; i++)
    {
      guint line = (guint) i + 2;

      if (i % 997 == 996)
        {
          g_string_append_printf (contents, "S%d,x%d,0.1,G%d V\n", i, i, i % 10);
          g_ptr_array_add (want, g_strdup_printf ("%u parallax not a number: 'x%d'", line, i));
        }
      else if (i % 1301 == 1300)
        {
          g_string_append_printf (contents, "S%d,%d.25,0.1,G%d V,extra\n", i, i % 900, i % 10);
          g_ptr_array_add (want, g_strdup_printf ("%u - the row has 5 fields, the header has 4", line));
        }
      else if (i == 4321)
        {
          g_string_append (contents, "S3,1.5,0.1,K0 III\n");
          g_ptr_array_add (want, g_strdup_printf ("%u id id 'S3' appears twice in this file (first on line 5)",
                                                  line));
        }
      else
        g_string_append_printf (contents, "S%d,%d.25,0.1,G%d V\n", i, i % 900, i % 10);
    }

  report = import_with (f, "chunks.csv", contents->str, -1, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (report->rows_read, ==, 5000);
  g_assert_cmpuint (report->rejections->len, ==, want->len);
  for (guint i = 0; i < report->rejections->len; i++)
    {
      const SlRejection *r = &g_array_index (report->rejections, SlRejection, i);
      g_autofree char *got = g_strdup_printf ("%u %s %s", r->line, r->column ? r->column : "-", r->reason);

      g_assert_cmpstr (got, ==, g_ptr_array_index (want, i));
      refused++;
    }
  g_assert_cmpuint (report->rows_accepted, ==, 5000 - refused);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements"), ==, 5000 - refused);
  /* Each stored row has the values of its own line. */
  g_assert_cmpint (sl_test_query_int (f->db,
                                      "SELECT count(*) FROM measurements m JOIN stars s ON s.id = m.star_id "
                                      "WHERE m.parallax <> CAST (substr (s.designation, 2) AS INTEGER) % 900 + 0.25 "
                                      "OR m.sptype <> 'G' || (CAST (substr (s.designation, 2) AS INTEGER) % 10) || ' V' "
                                      "OR m.line <> CAST (substr (s.designation, 2) AS INTEGER) + 2"),
                   ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM rejected_rows"), ==, refused);
  /* Written without checking references, which are all sound, and
   * checked again from here on. */
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM pragma_foreign_key_check"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "PRAGMA foreign_keys"), ==, 1);
}

static void
test_reimport_guard (SlTestProject *f, gconstpointer data)
{
  const char *contents = "id,parallax\nA,1\n";
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) first = import_ok (f, contents, NULL);
  g_autoptr (SlImportReport) again = NULL;
  SlImportOptions options;

  g_assert_null (import_with (f, "renamed.csv", contents, -1, NULL, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_ALREADY_IMPORTED);
  g_assert_nonnull (strstr (error->message, "already imported as source 1 (input.csv"));
  g_assert_nonnull (strstr (error->message, "--again"));
  g_clear_error (&error);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM sources"), ==, 1);

  sl_import_options_init (&options);
  options.again = TRUE;
  again = import_with (f, "renamed.csv", contents, -1, NULL, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (again->notes->len, ==, 1);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM sources"), ==, 2);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars"), ==, 1);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements"), ==, 2);
}

/* ------------------------------------------------------------ provenance */

static void
test_provenance (SlTestProject *f, gconstpointer data)
{
  const char *contents = "id,ra,dec,parallax\nA,10,20,1\nB,11,21,x\n";
  g_autofree char *sha = g_compute_checksum_for_string (G_CHECKSUM_SHA256, contents, -1);
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;
  g_autoptr (GError) error = NULL;
  sqlite3_stmt *stmt;

  sl_import_options_init (&options);
  options.epoch = 2016.0;
  options.source_name = "Our reduction";
  report = import_with (f, "input.csv", contents, -1, NULL, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpstr (report->sha256, ==, sha);

  g_assert_cmpint (sqlite3_prepare_v2 (f->db,
                                       "SELECT name, file_name, sha256, size_bytes, imported_by, delimiter, "
                                       "json_array_length (mapping), epoch, rows_read, rows_accepted, rows_rejected "
                                       "FROM sources", -1, &stmt, NULL), ==, SQLITE_OK);
  g_assert_cmpint (sqlite3_step (stmt), ==, SQLITE_ROW);
  g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 0), ==, "Our reduction");
  g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 1), ==, "input.csv");
  g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 2), ==, sha);
  g_assert_cmpint (sqlite3_column_int (stmt, 3), ==, strlen (contents));
  g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 4), ==, "test-user");
  g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 5), ==, ",");
  g_assert_cmpint (sqlite3_column_int (stmt, 6), ==, 4);
  sl_assert_close (sqlite3_column_double (stmt, 7), 2016.0, 0, "--epoch recorded");
  g_assert_cmpint (sqlite3_column_int (stmt, 8), ==, 2);
  g_assert_cmpint (sqlite3_column_int (stmt, 9), ==, 1);
  g_assert_cmpint (sqlite3_column_int (stmt, 10), ==, 1);
  sqlite3_finalize (stmt);

  sl_assert_close (stored (f, "A", "epoch"), 2016.0, 0, "--epoch fills rows without one");
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT line FROM measurements"), ==, 2);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM ledger WHERE action = 'import' "
                             "AND json_extract (details, '$.rejected') = 1 AND who = 'test-user'"), ==, 1);
}

static void
test_note_missing_epoch (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_ok (f, "id,ra,dec\nA,10,20\n", NULL);

  g_assert_cmpuint (report->notes->len, ==, 1);
  g_assert_nonnull (strstr (report->notes->pdata[0], "no epoch"));
}

/* -------------------------------------------------------------- dry run */

/* What a project holds, as one comparable text: the row counts of every
 * table an import writes, and the ledger entry by entry. */
static char *
project_content (SlTestProject *f)
{
  static const char *const tables[] = { "sources", "stars", "measurements", "rejected_rows",
                                        "ledger", "derived", NULL };
  GString *content = g_string_new (NULL);
  sqlite3_stmt *stmt;

  for (guint i = 0; tables[i]; i++)
    {
      g_autofree char *sql = g_strdup_printf ("SELECT count(*) FROM %s", tables[i]);

      g_string_append_printf (content, "%s %" G_GINT64_FORMAT "\n", tables[i],
                              sl_test_query_int (f->db, sql));
    }
  g_assert_cmpint (sqlite3_prepare_v2 (f->db, "SELECT id, at, who, action, summary, details "
                                       "FROM ledger ORDER BY id", -1, &stmt, NULL), ==, SQLITE_OK);
  while (sqlite3_step (stmt) == SQLITE_ROW)
    for (int c = 0; c < 6; c++)
      g_string_append_printf (content, "%s%s", sqlite3_column_text (stmt, c), c == 5 ? "\n" : "|");
  sqlite3_finalize (stmt);
  return g_string_free (content, FALSE);
}

/* A dry run leaves the project as it was and reports what the import of
 * the same file then does: the same counts, rejections and notes. */
static void
test_dry_run (SlTestProject *f, gconstpointer data)
{
  const char *contents = "id,ra,dec,plx\n"
                         "A,10,20,0.0412\n"
                         "B,11,91,0.02\n"
                         "C,12,22,x\n"
                         "A,13,23,0.01\n"
                         "D,14,24,0.005\n";
  const char *const maps[] = { "parallax=plx:arcsec", NULL };
  g_autoptr (SlImportReport) earlier = import_ok (f, "id,vmag\nD,9.5\n", NULL);
  g_autoptr (SlImportReport) dry = NULL;
  g_autoptr (SlImportReport) real = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *before = project_content (f);
  g_autofree char *after_dry = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  options.dry_run = TRUE;
  dry = import_with (f, "run.csv", contents, -1, maps, &options, &error);
  g_assert_no_error (error);
  after_dry = project_content (f);
  g_assert_cmpstr (after_dry, ==, before);

  real = import_with (f, "run.csv", contents, -1, maps, NULL, &error);
  g_assert_no_error (error);
  g_free (after_dry);
  after_dry = project_content (f);
  g_assert_cmpstr (after_dry, !=, before);

  g_assert_cmpuint (dry->rows_read, ==, 5);
  g_assert_cmpuint (dry->rows_accepted, ==, 2);
  g_assert_cmpuint (dry->new_stars, ==, 1);   /* A; D was there */
  g_assert_cmpuint (dry->rows_read, ==, real->rows_read);
  g_assert_cmpuint (dry->rows_accepted, ==, real->rows_accepted);
  g_assert_cmpuint (dry->new_stars, ==, real->new_stars);
  g_assert_cmpint (dry->source_id, ==, real->source_id);
  g_assert_cmpint (dry->delimiter, ==, real->delimiter);
  g_assert_cmpstr (dry->sha256, ==, real->sha256);
  g_assert_cmpuint (dry->rejections->len, ==, 3);
  g_assert_cmpuint (dry->rejections->len, ==, real->rejections->len);
  for (guint i = 0; i < dry->rejections->len; i++)
    {
      const SlRejection *d = &g_array_index (dry->rejections, SlRejection, i);
      const SlRejection *r = &g_array_index (real->rejections, SlRejection, i);

      g_assert_cmpuint (d->line, ==, r->line);
      g_assert_cmpstr (d->column, ==, r->column);
      g_assert_cmpstr (d->reason, ==, r->reason);
    }
  g_assert_cmpuint (g_array_index (dry->rejections, SlRejection, 0).line, ==, 3);
  g_assert_cmpstr (g_array_index (dry->rejections, SlRejection, 1).column, ==, "plx");
  g_assert_nonnull (strstr (g_array_index (dry->rejections, SlRejection, 2).reason, "appears twice"));
  g_assert_cmpuint (dry->notes->len, ==, real->notes->len);
  g_assert_cmpuint (dry->ignored_columns->len, ==, real->ignored_columns->len);
  sl_assert_close (stored (f, "A", "parallax"), 41.2, 1e-12, "0.0412 arcsec in mas");
}

/* A dry run of a file already imported refuses as the import would, and
 * one that fails as a whole fails the same way. */
static void
test_dry_run_refusals (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) first = import_ok (f, "id,parallax\nA,1\n", NULL);
  g_autoptr (GError) error = NULL;
  g_autofree char *before = project_content (f);
  g_autofree char *after = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  options.dry_run = TRUE;
  g_assert_null (import_with (f, "again.csv", "id,parallax\nA,1\n", -1, NULL, &options, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_ALREADY_IMPORTED);
  g_clear_error (&error);
  g_assert_null (import_with (f, "bad.csv", "id,parallax\nB,x\n", -1, NULL, &options, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_NOTHING_ACCEPTED);
  after = project_content (f);
  g_assert_cmpstr (after, ==, before);
}

/* explicit_only: a column named like a field stays out unless mapped. */
static void
test_explicit_only (SlTestProject *f, gconstpointer data)
{
  const char *const maps[] = { "id=id", "parallax=parallax", NULL };
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GError) error = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  options.explicit_only = TRUE;
  report = import_with (f, "input.csv", "id,parallax,vmag\nA,12.5,9.25\n", -1, maps, &options, &error);
  g_assert_no_error (error);
  sl_assert_close (stored (f, "A", "parallax"), 12.5, 0, "a mapped column");
  g_assert_true (isnan (stored (f, "A", "vmag")));
  g_assert_cmpuint (report->ignored_columns->len, ==, 1);
  g_assert_cmpstr (report->ignored_columns->pdata[0], ==, "vmag");
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT json_array_length (mapping) FROM sources"), ==, 2);
}

/* -------------------------------------------------------------- preview */

static const SlPreviewColumn *
preview_column (const SlImportPreview *preview, guint i)
{
  g_assert_cmpuint (i, <, preview->columns->len);
  return &g_array_index (preview->columns, SlPreviewColumn, i);
}

/* The preview maps the columns as the import does: names that are fields
 * by themselves, in their stored unit; the rest not imported; explicit
 * maps win and say so; the delimiter detected; the first rows as split. */
static void
test_preview (SlTestProject *f, gconstpointer data)
{
  const char *contents = "# observing run 7\n"
                         "name;RA;dec;plx;Vmag\n"
                         "S1;10.5;20;0.0412;9.1\n"
                         "S2;11;\"-21\";0.02;\n"
                         "S3;12;22;x;8\n";
  g_autofree char *path = sl_test_write_file (f->dir, "run7.csv", contents, -1);
  g_autoptr (SlImportPreview) automatic = NULL;
  g_autoptr (SlImportPreview) mapped = NULL;
  g_autoptr (SlImportPreview) only = NULL;
  g_autoptr (SlImportPreview) short_preview = NULL;
  g_autoptr (GError) error = NULL;
  SlColumnMap maps[2];
  SlImportOptions options;
  const SlPreviewRow *row;

  sl_import_options_init (&options);
  automatic = sl_import_preview (path, &options, 20, &error);
  g_assert_no_error (error);
  g_assert_cmpstr (automatic->file_name, ==, "run7.csv");
  g_assert_cmpint (automatic->delimiter, ==, ';');
  g_assert_false (automatic->delimiter_given);
  g_assert_cmpuint (automatic->header_line, ==, 2);
  g_assert_cmpuint (automatic->columns->len, ==, 5);
  g_assert_cmpstr (preview_column (automatic, 0)->name, ==, "name");
  g_assert_cmpint (preview_column (automatic, 0)->automatic, ==, SL_FIELD_NONE);
  g_assert_cmpint (preview_column (automatic, 1)->automatic, ==, SL_FIELD_RA);
  g_assert_cmpint (preview_column (automatic, 2)->automatic, ==, SL_FIELD_DEC);
  g_assert_cmpint (preview_column (automatic, 3)->automatic, ==, SL_FIELD_NONE);
  g_assert_cmpint (preview_column (automatic, 4)->automatic, ==, SL_FIELD_VMAG);
  /* No id column: the import would stop, so nothing is mapped. */
  g_assert_nonnull (automatic->mapping_problem);
  g_assert_nonnull (strstr (automatic->mapping_problem, "no id column"));
  g_assert_cmpint (preview_column (automatic, 1)->field, ==, SL_FIELD_NONE);
  g_assert_cmpuint (automatic->rows->len, ==, 3);
  g_assert_false (automatic->more_rows);
  row = automatic->rows->pdata[1];
  g_assert_cmpuint (row->line, ==, 4);
  g_assert_cmpuint (g_strv_length (row->cells), ==, 5);
  g_assert_cmpstr (row->cells[2], ==, "-21");
  g_assert_cmpstr (row->cells[4], ==, "");

  g_assert_true (sl_column_map_parse ("id=name", &maps[0], NULL));
  g_assert_true (sl_column_map_parse ("parallax=plx:arcsec", &maps[1], NULL));
  options.maps = maps;
  options.n_maps = 2;
  mapped = sl_import_preview (path, &options, 20, &error);
  g_assert_no_error (error);
  g_assert_null (mapped->mapping_problem);
  g_assert_cmpint (preview_column (mapped, 0)->field, ==, SL_FIELD_ID);
  g_assert_true (preview_column (mapped, 0)->explicit_map);
  g_assert_cmpint (preview_column (mapped, 1)->field, ==, SL_FIELD_RA);
  g_assert_cmpint (preview_column (mapped, 1)->unit, ==, SL_UNIT_DEG);
  g_assert_false (preview_column (mapped, 1)->explicit_map);
  g_assert_cmpint (preview_column (mapped, 3)->field, ==, SL_FIELD_PARALLAX);
  g_assert_cmpint (preview_column (mapped, 3)->unit, ==, SL_UNIT_ARCSEC);
  g_assert_cmpint (preview_column (mapped, 4)->field, ==, SL_FIELD_VMAG);

  /* Only what is mapped: RA, Dec and V stay out. */
  options.explicit_only = TRUE;
  only = sl_import_preview (path, &options, 2, &error);
  g_assert_no_error (error);
  g_assert_cmpint (preview_column (only, 1)->field, ==, SL_FIELD_NONE);
  g_assert_cmpint (preview_column (only, 1)->automatic, ==, SL_FIELD_RA);
  g_assert_cmpint (preview_column (only, 3)->field, ==, SL_FIELD_PARALLAX);
  g_assert_cmpuint (only->rows->len, ==, 2);
  g_assert_true (only->more_rows);

  /* A delimiter given is used as given: one column. */
  options.delimiter = ',';
  short_preview = sl_import_preview (path, &options, 20, &error);
  g_assert_no_error (error);
  g_assert_true (short_preview->delimiter_given);
  g_assert_cmpuint (short_preview->columns->len, ==, 1);
  g_assert_nonnull (short_preview->mapping_problem);

  sl_column_map_clear (&maps[0]);
  sl_column_map_clear (&maps[1]);
}

/* A file that is no CSV at all has no preview; the message names it. */
static void
test_preview_refusals (SlTestProject *f, gconstpointer data)
{
  g_autofree char *empty = sl_test_write_file (f->dir, "empty.csv", "", 0);
  g_autofree char *comments = sl_test_write_file (f->dir, "comments.csv", "# nothing\n\n", -1);
  g_autofree char *missing = g_build_filename (f->dir, "missing.csv", NULL);
  g_autoptr (GError) error = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  g_assert_null (sl_import_preview (empty, &options, 20, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_nonnull (strstr (error->message, "empty.csv: the file is empty"));
  g_clear_error (&error);
  g_assert_null (sl_import_preview (comments, &options, 20, &error));
  g_assert_nonnull (strstr (error->message, "no header row"));
  g_clear_error (&error);
  g_assert_null (sl_import_preview (missing, &options, 20, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_IO);
}

/* The preview reads the file's start, not the file: a 10 MB tail of rows
 * that ends in a NUL byte (which the import refuses, having read it all)
 * is never reached, and the rows it shows are the file's first ones. */
static void
test_preview_reads_a_prefix (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) text = g_string_new ("# run 12\nid,parallax,vmag\n");
  g_autofree char *path = NULL;
  g_autoptr (SlImportPreview) preview = NULL;
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GError) error = NULL;
  SlImportOptions options;
  guint i;

  for (i = 0; text->len < 10u << 20; i++)
    g_string_append_printf (text, "S%u,%u.25,%u.5\n", i, i % 97, 5 + i % 11);
  g_string_append_c (text, '\0');
  path = sl_test_write_file (f->dir, "long-run.csv", text->str, text->len);

  sl_import_options_init (&options);
  preview = sl_import_preview (path, &options, 20, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (preview->header_line, ==, 2);
  g_assert_cmpuint (preview->rows->len, ==, 20);
  g_assert_true (preview->more_rows);
  for (i = 0; i < 20; i++)
    {
      const SlPreviewRow *row = preview->rows->pdata[i];
      g_autofree char *id = g_strdup_printf ("S%u", i);
      g_autofree char *parallax = g_strdup_printf ("%u.25", i % 97);
      g_autofree char *vmag = g_strdup_printf ("%u.5", 5 + i % 11);

      g_assert_cmpuint (row->line, ==, i + 3);
      g_assert_cmpuint (g_strv_length (row->cells), ==, 3);
      g_assert_cmpstr (row->cells[0], ==, id);
      g_assert_cmpstr (row->cells[1], ==, parallax);
      g_assert_cmpstr (row->cells[2], ==, vmag);
      g_assert_null (row->malformed);
    }
  g_assert_cmpuint (preview->bytes_read, >, 0);
  g_assert_cmpuint (preview->bytes_read, <=, 256u << 10);

  /* The import reads every byte, so it meets the NUL. */
  report = sl_import_csv (f->project, path, &options, &error);
  g_assert_null (report);
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_nonnull (strstr (error->message, "not a text file"));
}

/* A row longer than what the preview reads first is read to its end; the
 * header may end on a CR whose LF the first read did not reach; a row over
 * 1 MiB is refused with its line, as the import refuses it. */
static void
test_preview_long_rows (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) text = g_string_new ("id,parallax,");
  g_autoptr (GString) refused = NULL;
  g_autofree char *long_note = NULL;
  g_autofree char *path = NULL;
  g_autofree char *refused_path = NULL;
  g_autoptr (SlImportPreview) preview = NULL;
  g_autoptr (GError) error = NULL;
  SlImportOptions options;
  const SlPreviewRow *row;

  /* A header of 64 KiB less its CR and LF: the CR is the last byte of the
   * first read (the reader would take a lone CR for an old Mac line end). */
  while (text->len < (64u << 10) - 1)
    g_string_append_c (text, 'x');
  g_string_append (text, "\r\nA,1,\r\n");
  long_note = g_strnfill (300u << 10, 'n');
  g_string_append_printf (text, "B,2,\"%s\"\r\nC,3,short\r\n", long_note);
  path = sl_test_write_file (f->dir, "long-rows.csv", text->str, text->len);

  sl_import_options_init (&options);
  preview = sl_import_preview (path, &options, 20, &error);
  g_assert_no_error (error);
  g_assert_cmpint (preview->delimiter, ==, ',');
  g_assert_cmpuint (preview->columns->len, ==, 3);
  g_assert_cmpuint (strlen (preview_column (preview, 2)->name), ==, (64u << 10) - 1 - 12);
  g_assert_cmpuint (preview->rows->len, ==, 3);
  g_assert_false (preview->more_rows);
  row = preview->rows->pdata[1];
  g_assert_cmpuint (row->line, ==, 3);
  g_assert_cmpstr (row->cells[0], ==, "B");
  g_assert_cmpstr (row->cells[2], ==, long_note);
  row = preview->rows->pdata[2];
  g_assert_cmpuint (row->line, ==, 4);
  g_assert_cmpstr (row->cells[2], ==, "short");
  g_assert_cmpuint (preview->bytes_read, ==, text->len);

  refused = g_string_new ("id,parallax,sptype\nA,1,K0\nB,2,G2\nC,3,");
  while (refused->len < (3u << 20))
    g_string_append_c (refused, 'M');
  g_string_append (refused, "\nD,4,F5\n");
  refused_path = sl_test_write_file (f->dir, "long-line.csv", refused->str, refused->len);
  g_assert_null (sl_import_preview (refused_path, &options, 20, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_cmpstr (error->message, ==,
                   "long-line.csv:4: line longer than 1 MiB; not a table of measurements");
}

/* A file cut in the middle of its last line (another program stopped
 * writing it there) shows that line as far as it goes. */
static void
test_preview_partial_last_line (SlTestProject *f, gconstpointer data)
{
  g_autofree char *cut = sl_test_write_file (f->dir, "cut.csv",
                                             "id,parallax,vmag\nA,1,9.5\nB,2.", -1);
  g_autofree char *cut_quote = sl_test_write_file (f->dir, "cut-quote.csv",
                                                   "id,sptype\nA,K0\nB,\"G2 V", -1);
  g_autoptr (SlImportPreview) preview = NULL;
  g_autoptr (SlImportPreview) quoted = NULL;
  g_autoptr (GError) error = NULL;
  SlImportOptions options;
  const SlPreviewRow *row;

  sl_import_options_init (&options);
  preview = sl_import_preview (cut, &options, 20, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (preview->rows->len, ==, 2);
  g_assert_false (preview->more_rows);
  row = preview->rows->pdata[1];
  g_assert_cmpuint (row->line, ==, 3);
  g_assert_cmpuint (g_strv_length (row->cells), ==, 2);
  g_assert_cmpstr (row->cells[0], ==, "B");
  g_assert_cmpstr (row->cells[1], ==, "2.");
  g_assert_null (row->malformed);

  quoted = sl_import_preview (cut_quote, &options, 20, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (quoted->rows->len, ==, 2);
  row = quoted->rows->pdata[1];
  g_assert_cmpuint (row->line, ==, 3);
  g_assert_cmpstr (row->malformed, ==, "a quoted field is never closed");
}

/* A named pipe, a folder or a file the user may not read has no preview,
 * and the preview says so at once (opening a pipe must not wait for a
 * writer that never comes). */
static void
test_preview_not_a_file (SlTestProject *f, gconstpointer data)
{
  g_autofree char *fifo = g_build_filename (f->dir, "pipe.csv", NULL);
  g_autofree char *folder = g_build_filename (f->dir, "folder.csv", NULL);
  g_autofree char *locked = sl_test_write_file (f->dir, "locked.csv", "id\nA\n", -1);
  g_autoptr (GError) error = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  g_assert_cmpint (mkfifo (fifo, 0600), ==, 0);
  g_assert_null (sl_import_preview (fifo, &options, 20, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_IO);
  g_assert_true (g_str_has_prefix (error->message, fifo));
  g_assert_nonnull (strstr (error->message, "not a regular file"));
  g_clear_error (&error);

  g_assert_cmpint (g_mkdir (folder, 0700), ==, 0);
  g_assert_null (sl_import_preview (folder, &options, 20, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_IO);
  g_assert_nonnull (strstr (error->message, "not a regular file"));
  g_clear_error (&error);

  g_assert_cmpint (g_chmod (locked, 0), ==, 0);
  if (access (locked, R_OK) == 0)
    {
      /* Root reads it anyway; the test of the message needs another user. */
      g_test_message ("running as root: locked.csv is readable; its message is not checked");
      return;
    }
  g_assert_null (sl_import_preview (locked, &options, 20, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_IO);
  g_assert_nonnull (strstr (error->message, "locked.csv: cannot read: "));
}

/* ---------------------------------------------------------------- locale */

/* A German locale writes 12,5; the file says 12.5 and must still be read
 * as twelve and a half. */
static void
test_locale_independent (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = NULL;

  if (setlocale (LC_ALL, "de_DE.UTF-8") == NULL)
    {
      g_test_skip ("the de_DE.UTF-8 locale is not installed (build-aux/dev generates it)");
      return;
    }
  report = import_ok (f, "id,parallax,vmag,ra\nA,12.5,1.25e1,359.999\n", NULL);
  setlocale (LC_ALL, "C.UTF-8");
  g_assert_cmpuint (report->rows_accepted, ==, 1);
  sl_assert_close (stored (f, "A", "parallax"), 12.5, 0, "12.5 under de_DE");
  sl_assert_close (stored (f, "A", "vmag"), 12.5, 0, "1.25e1 under de_DE");
  sl_assert_close (stored (f, "A", "ra"), 359.999, 0, "359.999 under de_DE");
}

int
main (int argc, char **argv)
{
  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);

#define ADD(path, func) g_test_add (path, SlTestProject, NULL, sl_test_project_set_up, func, \
                                        sl_test_project_tear_down)
  ADD ("/import/units/converted-to-canonical", test_units_converted);
  ADD ("/import/units/radians", test_units_radians);
  ADD ("/import/dialect/semicolon-crlf-bom", test_dialect_semicolon_crlf_bom);
  ADD ("/import/dialect/tab-and-comments", test_dialect_tab_comments);
  ADD ("/import/dialect/quoted-multiline", test_dialect_quoted_multiline);
  ADD ("/import/mapping/header-any-case", test_header_case_insensitive);
  ADD ("/import/mapping/errors", test_mapping_errors);
  ADD ("/import/missing/empty-nan-and-tokens", test_missing_values);
  ADD ("/import/negative-parallax-kept", test_negative_parallax_kept);
  ADD ("/import/reject/duplicate-id", test_reject_duplicate_id);
  ADD ("/import/reject/sexagesimal-minutes", test_reject_sexagesimal_minutes);
  for (gsize i = 0; i < G_N_ELEMENTS (rejection_cases); i++)
    {
      g_autofree char *path = g_strdup_printf ("/import/reject/%s", rejection_cases[i].name);

      g_test_add (path, SlTestProject, &rejection_cases[i], sl_test_project_set_up, test_rejection,
                  sl_test_project_tear_down);
    }
  for (gsize i = 0; i < G_N_ELEMENTS (failure_cases); i++)
    {
      g_autofree char *path = g_strdup_printf ("/import/refuse/%s", failure_cases[i].name);

      g_test_add (path, SlTestProject, &failure_cases[i], sl_test_project_set_up,
                  test_whole_file_failure, sl_test_project_tear_down);
    }
  ADD ("/import/transaction/cancel-midway-leaves-nothing", test_cancel_midway);
  ADD ("/import/transaction/parsed-ahead-in-order", test_parsed_ahead_in_order);
  ADD ("/import/reimport-guard", test_reimport_guard);
  ADD ("/import/provenance", test_provenance);
  ADD ("/import/note/missing-epoch", test_note_missing_epoch);
  ADD ("/import/locale/comma-decimal-locale", test_locale_independent);
  ADD ("/import/dry-run/same-report-nothing-written", test_dry_run);
  ADD ("/import/dry-run/refusals", test_dry_run_refusals);
  ADD ("/import/mapping/explicit-only", test_explicit_only);
  ADD ("/import/preview/mapping-and-rows", test_preview);
  ADD ("/import/preview/refusals", test_preview_refusals);
  ADD ("/import/preview/reads-a-prefix", test_preview_reads_a_prefix);
  ADD ("/import/preview/long-rows", test_preview_long_rows);
  ADD ("/import/preview/partial-last-line", test_preview_partial_last_line);
  ADD ("/import/preview/not-a-file", test_preview_not_a_file);
#undef ADD

  return g_test_run ();
}
