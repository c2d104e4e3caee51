/* test-export.c: the CSV table: value/lo/hi columns, intervals, --columns,
 * quoting, atomic writes and locale independence; positions at another
 * epoch against ERFA directly, their errors against hand-computed values. */
#include <erfa.h>
#include <erfam.h>
#include <locale.h>
#include <math.h>
#include <string.h>

#include "crossmatch.h"
#include "csv-reader.h"
#include "export.h"
#include "import.h"
#include "sl-error.h"
#include "test-util.h"

/* The scratch project with two stars imported: A with every value, B
 * with a quoted name, no errors, parallax or V, and a spectral type
 * padded with blanks. */
static void
fixture_set_up (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *input = NULL;
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;

  sl_test_project_set_up (f, data);
  input = sl_test_write_file (f->dir, "in.csv",
                              "id,ra,ra_err,dec,dec_err,parallax,parallax_err,vmag,sptype\n"
                              "A,10,1000,60,500,12.5,0.25,7.5,G2 V\n"
                              "\"B, the \"\"second\"\"\",359.5,,-30,,,,, K0 III \n", -1);
  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);
}

static char *
export_to_string (SlTestProject *f, const char *const *columns)
{
  g_autofree char *path = g_build_filename (f->dir, "out.csv", NULL);
  g_autoptr (GError) error = NULL;
  SlExportOptions options = { SL_EXPORT_CSV, columns, NULL };
  char *contents;

  g_assert_cmpint (sl_export (f->project, path, &options, &error), ==, 2);
  g_assert_no_error (error);
  g_assert_true (g_file_get_contents (path, &contents, NULL, NULL));
  return contents;
}

static void
test_header (SlTestProject *f, gconstpointer data)
{
  g_autofree char *text = export_to_string (f, NULL);
  g_auto (GStrv) lines = g_strsplit (text, "\n", -1);

  /* DESIGN.md: inputs, then derived values, each number as q, q_lo, q_hi,
   * then the flags. */
  g_assert_true (g_str_has_prefix (lines[0],
                   "id,ra,ra_lo,ra_hi,dec,dec_lo,dec_hi,epoch,epoch_lo,epoch_hi,"
                   "parallax,parallax_lo,parallax_hi,pmra,pmra_lo,pmra_hi,pmdec,pmdec_lo,pmdec_hi,"
                   "vmag,vmag_lo,vmag_hi,bmag,bmag_lo,bmag_hi,bv,bv_lo,bv_hi,ebv,ebv_lo,ebv_hi,"
                   "vrad,vrad_lo,vrad_hi,sptype,plx_snr,plx_snr_lo,plx_snr_hi,dist,dist_lo,dist_hi,"));
  g_assert_true (g_str_has_suffix (lines[0], ",ellipse_pa,ellipse_pa_lo,ellipse_pa_hi,spclass,flags"));
  /* Never derived: the flags say so. */
  g_assert_true (g_str_has_suffix (lines[1], ",not_derived"));
}

/* The bounds are value -/+ 1 sigma; the RA error is on the sky, so at
 * Dec +60 an error of 1 arcsec (1000 mas) spans 2 arcsec of RA. */
static void
test_intervals (SlTestProject *f, gconstpointer data)
{
  const char *columns[] = { "ra", "dec", "parallax", "vmag", NULL };
  g_autofree char *text = export_to_string (f, columns);
  g_auto (GStrv) lines = g_strsplit (text, "\n", -1);
  g_auto (GStrv) cells = g_strsplit (lines[1], ",", -1);

  g_assert_cmpstr (lines[0], ==, "id,ra,ra_lo,ra_hi,dec,dec_lo,dec_hi,parallax,parallax_lo,parallax_hi,"
                                 "vmag,vmag_lo,vmag_hi");
  g_assert_cmpstr (cells[0], ==, "A");
  sl_assert_close (g_ascii_strtod (cells[2], NULL), 10.0 - 2.0 / 3600.0, 1e-12, "ra_lo at dec 60");
  sl_assert_close (g_ascii_strtod (cells[3], NULL), 10.0 + 2.0 / 3600.0, 1e-12, "ra_hi at dec 60");
  sl_assert_close (g_ascii_strtod (cells[5], NULL), 60.0 - 0.5 / 3600.0, 1e-12, "dec_lo (500 mas)");
  g_assert_cmpstr (cells[7], ==, "12.5");
  g_assert_cmpstr (cells[8], ==, "12.25");
  g_assert_cmpstr (cells[9], ==, "12.75");
  /* A value without an error has no bounds, not a zero-width interval. */
  g_assert_cmpstr (cells[10], ==, "7.5");
  g_assert_cmpstr (cells[11], ==, "");
  g_assert_cmpstr (cells[12], ==, "");
}

/* Text cells survive a round trip through an RFC 4180 reader. */
static void
test_quoting_round_trip (SlTestProject *f, gconstpointer data)
{
  const char *columns[] = { "sptype", "dec", NULL };
  g_autofree char *text = export_to_string (f, columns);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlCsvReader) reader = sl_csv_reader_new (text, strlen (text), ',', "out.csv", &error);
  SlCsvRecord record;

  g_assert_no_error (error);
  g_assert_true (sl_csv_reader_next (reader, &record));   /* header */
  g_assert_true (sl_csv_reader_next (reader, &record));
  g_assert_true (sl_csv_reader_next (reader, &record));
  g_assert_null (record.malformed);
  g_assert_cmpuint (record.n_fields, ==, 5);
  g_assert_cmpstr (record.fields[0], ==, "B, the \"second\"");
  g_assert_cmpstr (record.fields[1], ==, "K0 III");   /* trimmed on import */
  g_assert_cmpstr (record.fields[2], ==, "-30");
  g_assert_cmpstr (record.fields[3], ==, "");
}

static void
test_unknown_column (SlTestProject *f, gconstpointer data)
{
  const char *columns[] = { "parallax", "distance", NULL };
  g_autofree char *path = g_build_filename (f->dir, "out.csv", NULL);
  g_autoptr (GError) error = NULL;
  SlExportOptions options = { SL_EXPORT_CSV, columns, NULL };

  g_assert_cmpint (sl_export (f->project, path, &options, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_nonnull (strstr (error->message, "no column 'distance'"));
  g_assert_nonnull (strstr (error->message, "parallax"));
  g_assert_false (g_file_test (path, G_FILE_TEST_EXISTS));
}

/* A failed export leaves no file and no temporary behind; a good one
 * replaces the old file whole. */
static void
test_atomic_write (SlTestProject *f, gconstpointer data)
{
  g_autofree char *bad = g_build_filename (f->dir, "no-such-dir", "out.csv", NULL);
  g_autofree char *good = sl_test_write_file (f->dir, "out.csv", "old contents\n", -1);
  g_autoptr (GError) error = NULL;
  g_autofree char *text = NULL;
  g_autoptr (GDir) dir = NULL;
  SlExportOptions options = { SL_EXPORT_CSV, NULL, NULL };
  const char *name;

  g_assert_cmpint (sl_export (f->project, bad, &options, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_IO);
  g_clear_error (&error);

  g_assert_cmpint (sl_export (f->project, good, &options, &error), ==, 2);
  g_assert_true (g_file_get_contents (good, &text, NULL, NULL));
  g_assert_true (g_str_has_prefix (text, "id,ra,"));

  dir = g_dir_open (f->dir, 0, NULL);
  while ((name = g_dir_read_name (dir)) != NULL)
    g_assert_false (g_str_has_prefix (name, ".out.csv."));
}

static void
test_locale_independent (SlTestProject *f, gconstpointer data)
{
  g_autofree char *in_c = export_to_string (f, NULL);
  g_autofree char *in_german = NULL;

  if (setlocale (LC_ALL, "de_DE.UTF-8") == NULL)
    {
      g_test_skip ("the de_DE.UTF-8 locale is not installed (build-aux/dev generates it)");
      return;
    }
  in_german = export_to_string (f, NULL);
  setlocale (LC_ALL, "C.UTF-8");
  g_assert_cmpstr (in_german, ==, in_c);
  g_assert_nonnull (strstr (in_c, "12.25"));
}

/* Text cells that a spreadsheet would run as a formula get a leading
 * apostrophe (common practice: the OWASP advice on CSV injection); numbers
 * with a sign and ordinary text are written as they are. */
static void
test_formula_neutralised (SlTestProject *f, gconstpointer data)
{
  static const char csv[] =
    "id,ra,dec,sptype\n"
    "\"=HYPERLINK(\"\"http://x\"\")\",10,10,+1\n"
    "@SUM(A1),11,11,-3.5\n"
    "-LHO 1,12,12,+G2 V\n";
  const char *columns[] = { "sptype", NULL };
  g_autofree char *input = sl_test_write_file (f->dir, "hostile.csv", csv, -1);
  g_autofree char *path = g_build_filename (f->dir, "hostile-out.csv", NULL);
  g_autofree char *text = NULL;
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GError) error = NULL;
  SlExportOptions export_options = { SL_EXPORT_CSV, columns, NULL };
  SlImportOptions options;

  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (report->rows_accepted, ==, 3);
  g_assert_cmpint (sl_export (f->project, path, &export_options, &error), ==, 5);
  g_assert_no_error (error);
  g_assert_true (g_file_get_contents (path, &text, NULL, NULL));
  g_assert_nonnull (strstr (text, "\n\"'=HYPERLINK(\"\"http://x\"\")\",+1\n"));
  g_assert_nonnull (strstr (text, "\n'@SUM(A1),-3.5\n"));
  g_assert_nonnull (strstr (text, "\n'-LHO 1,'+G2 V\n"));
}

/* ------------------------------------------------------------------ */
/* Positions at an epoch                                              */

/* Three more stars: M moves (parallax and radial velocity known), N has
 * no proper motion, P has a proper motion without errors.  The fixture's
 * A and B have no epoch. */
static const char moving_csv[] =
  "id,ra,ra_err,dec,dec_err,epoch,pmra,pmra_err,pmdec,pmdec_err,parallax,vrad\n"
  "M,100,2,40,3,2016,500,0.5,-300,0.4,50,30\n"
  "N,200,1,-10,1,2016,,,,,,\n"
  "P,10,1,80,1,2016,100,,100,,,\n";

/* The fields of star ID's row in the CSV TEXT, or NULL. */
static GStrv
csv_row (const char *text, const char *id)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlCsvReader) reader = sl_csv_reader_new (text, strlen (text), ',', "out.csv", &error);
  SlCsvRecord record;

  g_assert_no_error (error);
  while (sl_csv_reader_next (reader, &record))
    if (record.n_fields > 0 && strcmp (record.fields[0], id) == 0)
      {
        GStrv fields = g_new0 (char *, record.n_fields + 1);

        for (guint i = 0; i < record.n_fields; i++)
          fields[i] = g_strdup (record.fields[i]);
        return fields;
      }
  return NULL;
}

static char *
export_at_epoch (SlTestProject *f, const char *const *columns, double epoch, SlExportFormat format)
{
  g_autofree char *input = sl_test_write_file (f->dir, "moving.csv", moving_csv, -1);
  g_autofree char *path = g_build_filename (f->dir, "epoch.out", NULL);
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GError) error = NULL;
  SlExportOptions export_options = { format, columns, NULL, NULL, TRUE, epoch };
  SlImportOptions options;
  char *text;

  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (report->rows_accepted, ==, 3);
  g_assert_cmpint (sl_export (f->project, path, &export_options, &error), ==, 5);
  g_assert_no_error (error);
  g_assert_true (g_file_get_contents (path, &text, NULL, NULL));
  return text;
}

/* M at 2030 is where eraPmsafe, called here directly, puts it; its
 * errors grew by the proper-motion errors times 14 years:
 * sqrt(2^2 + (14 x 0.5)^2) = sqrt(53) mas in RA (on the sky) and
 * sqrt(3^2 + (14 x 0.4)^2) = sqrt(40.36) mas in Dec. */
static void
test_epoch_propagated (SlTestProject *f, gconstpointer data)
{
  const char *columns[] = { "ra", "dec", "flags", NULL };
  g_autofree char *text = export_at_epoch (f, columns, 2030.0, SL_EXPORT_CSV);
  g_auto (GStrv) header = g_strsplit (text, "\n", 2);
  g_auto (GStrv) m = csv_row (text, "M");
  double d1, d2, t1, t2, ra, dec, pmr, pmd, px, rv;
  double sigma_ra_deg, sigma_dec_deg;

  /* The epoch column comes with the position, right after it. */
  g_assert_cmpstr (header[0], ==, "id,ra,ra_lo,ra_hi,dec,dec_lo,dec_hi,epoch,epoch_lo,epoch_hi,flags");
  g_assert_nonnull (m);
  eraEpj2jd (2016.0, &d1, &d2);
  eraEpj2jd (2030.0, &t1, &t2);
  g_assert_cmpint (eraPmsafe (100.0 * ERFA_DD2R, 40.0 * ERFA_DD2R,
                              500.0 * ERFA_DMAS2R / cos (40.0 * ERFA_DD2R), -300.0 * ERFA_DMAS2R,
                              0.050, 30.0, d1, d2, t1, t2, &ra, &dec, &pmr, &pmd, &px, &rv), ==, 0);
  ra *= ERFA_DR2D;
  dec *= ERFA_DR2D;
  g_assert_cmpfloat_with_epsilon (g_ascii_strtod (m[1], NULL), ra, 1e-12);
  g_assert_cmpfloat_with_epsilon (g_ascii_strtod (m[4], NULL), dec, 1e-12);
  /* It really moved: 14 years at 583 mas/yr is 8.2 arcsec. */
  g_assert_cmpfloat (sl_sky_separation (100.0, 40.0, ra, dec), >, 8.0);
  /* The CSV has 15 significant digits: 1e-12 deg at RA 100. */
  sigma_ra_deg = 7.280109889280518 / 3.6e6 / cos (dec * G_PI / 180.0);
  sigma_dec_deg = 6.352952069707436 / 3.6e6;
  g_assert_cmpfloat_with_epsilon (g_ascii_strtod (m[3], NULL) - g_ascii_strtod (m[1], NULL),
                                  sigma_ra_deg, 3e-12);
  g_assert_cmpfloat_with_epsilon (g_ascii_strtod (m[1], NULL) - g_ascii_strtod (m[2], NULL),
                                  sigma_ra_deg, 3e-12);
  g_assert_cmpfloat_with_epsilon (g_ascii_strtod (m[6], NULL) - g_ascii_strtod (m[4], NULL),
                                  sigma_dec_deg, 3e-12);
  g_assert_cmpstr (m[7], ==, "2030");
  g_assert_cmpstr (m[10], ==, "not_derived");
}

/* N has no proper motion: its catalogue position and epoch, flagged;
 * P's proper motion has no error: it moves, its interval is unknown. */
static void
test_epoch_not_propagated (SlTestProject *f, gconstpointer data)
{
  const char *columns[] = { "dec", "flags", NULL };
  g_autofree char *text = export_at_epoch (f, columns, 2030.0, SL_EXPORT_CSV);
  g_auto (GStrv) n = csv_row (text, "N");
  g_auto (GStrv) p = csv_row (text, "P");
  g_auto (GStrv) a = csv_row (text, "A");

  g_assert_true (g_str_has_prefix (text, "id,dec,dec_lo,dec_hi,epoch,epoch_lo,epoch_hi,flags\n"));
  g_assert_cmpstr (n[1], ==, "-10");
  g_assert_cmpstr (n[4], ==, "2016");
  g_assert_cmpstr (n[7], ==, "not_derived|" SL_EXPORT_FLAG_NOT_PROPAGATED);
  g_assert_cmpstr (a[4], ==, "");
  g_assert_cmpstr (a[7], ==, "not_derived|" SL_EXPORT_FLAG_NOT_PROPAGATED);
  g_assert_cmpfloat (fabs (g_ascii_strtod (p[1], NULL) - 80.0) * 3600.0, >, 1.3);
  g_assert_cmpstr (p[2], ==, "");
  g_assert_cmpstr (p[3], ==, "");
  g_assert_cmpstr (p[4], ==, "2030");
  g_assert_cmpstr (p[7], ==, "not_derived");
}

/* Without --epoch nothing moves and no column is added. */
static void
test_epoch_default (SlTestProject *f, gconstpointer data)
{
  const char *columns[] = { "ra", NULL };
  g_autofree char *input = sl_test_write_file (f->dir, "moving.csv", moving_csv, -1);
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *text = NULL;
  g_auto (GStrv) m = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);
  {
    g_autofree char *path = g_build_filename (f->dir, "out.csv", NULL);
    SlExportOptions export_options = { SL_EXPORT_CSV, columns, NULL };

    g_assert_cmpint (sl_export (f->project, path, &export_options, &error), ==, 5);
    g_assert_true (g_file_get_contents (path, &text, NULL, NULL));
  }
  g_assert_true (g_str_has_prefix (text, "id,ra,ra_lo,ra_hi\n"));
  m = csv_row (text, "M");
  g_assert_cmpstr (m[1], ==, "100");
}

/* The LaTeX table states the frame and the epoch. */
static void
test_epoch_tex (SlTestProject *f, gconstpointer data)
{
  const char *columns[] = { "ra", NULL };
  g_autofree char *text = export_at_epoch (f, columns, 2030.5, SL_EXPORT_TEX);

  g_assert_nonnull (strstr (text, "% Positions: ICRS, epoch J2030.50,"));
  g_assert_nonnull (strstr (text, "id & ra (deg) & epoch (yr)"));
}

int
main (int argc, char **argv)
{
  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);

#define ADD(path, func) g_test_add (path, SlTestProject, NULL, fixture_set_up, func, \
                                        sl_test_project_tear_down)
  ADD ("/export/csv/header", test_header);
  ADD ("/export/csv/intervals", test_intervals);
  ADD ("/export/csv/quoting-round-trip", test_quoting_round_trip);
  ADD ("/export/csv/unknown-column", test_unknown_column);
  ADD ("/export/csv/atomic-write", test_atomic_write);
  ADD ("/export/csv/locale-independent", test_locale_independent);
  ADD ("/export/csv/formula-neutralised", test_formula_neutralised);
  ADD ("/export/epoch/propagated", test_epoch_propagated);
  ADD ("/export/epoch/not-propagated", test_epoch_not_propagated);
  ADD ("/export/epoch/default", test_epoch_default);
  ADD ("/export/epoch/tex", test_epoch_tex);
#undef ADD

  return g_test_run ();
}
