/* test-matching.c: import with a match radius, on a project: rows joined
 * by position and the matches table, new stars, ambiguous rows (close
 * pairs, two rows on one star) kept apart with their candidates, rows
 * without a position rejected, split (and its all-or-nothing rule),
 * what explain says about a match, and the bounded list of matches the
 * window shows (match-list.h). */
#include <string.h>

#include "crossmatch.h"
#include "explain.h"
#include "import.h"
#include "match-list.h"
#include "matching.h"
#include "sl-error.h"
#include "test-util.h"

/* The first catalogue, epoch 2000: a fast star (A3: 5 and -3 arcsec a
 * year), a close pair 0.25 arcsec apart (A4, A5), a star next to RA 0
 * (A6). */
static const char catalogue_a[] =
  "id,ra,dec,epoch,pmra,pmdec,parallax,vmag\n"
  "A1,10.0,20.0,2000.0,0,0,10,5.0\n"
  "A2,10.01,20.0,2000.0,0,0,10,6.0\n"
  "A3,50.0,-30.0,2000.0,5000,-3000,300,7.0\n"
  "A4,100.0,45.0,2000.0,0,0,5,8.0\n"
  "A5,100.0001,45.0,2000.0,0,0,5,8.5\n"
  "A6,359.99995,0.0,2000.0,0,0,1,9\n";

/* The second, epoch 2016, naming the stars differently: B1 is A1, B2 is
 * A3 where it is in 2016 (80 arcsec from its 2000 position), B3 lies
 * between A4 and A5, B4 is no star of A, B5 is A6 across RA 0, B6 and
 * B7 both lie on A2, B8 has no position, B9 is called A1 but lies far
 * from it. */
static const char catalogue_b[] =
  "id,ra,dec,epoch,vmag\n"
  "B1,10.00002,20.00001,2016.0,5.1\n"
  "B2,50.0256600,-30.0133333,2016.0,7.1\n"
  "B3,100.00005,45.0,2016.0,8.1\n"
  "B4,200.0,10.0,2016.0,9.0\n"
  "B5,0.00001,0.0,2016.0,9.1\n"
  "B6,10.0101,20.0,2016.0,6.1\n"
  "B7,10.0100,20.0,2016.0,6.2\n"
  "B8,,,2016.0,6.3\n"
  "A1,300.0,-60.0,2016.0,6.4\n";

static SlImportReport *
import_text (SlTestProject *f, const char *name, const char *text, double radius, GError **error)
{
  g_autofree char *path = sl_test_write_file (f->dir, name, text, -1);
  SlImportOptions options;

  sl_import_options_init (&options);
  options.match_radius = radius;
  return sl_import_csv (f->project, path, &options, error);
}

/* Imports both catalogues, the second with a 1 arcsec radius. */
static SlImportReport *
import_both (SlTestProject *f)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) first = import_text (f, "a.csv", catalogue_a, 0, &error);
  SlImportReport *second;

  g_assert_no_error (error);
  g_assert_nonnull (first);
  second = import_text (f, "b.csv", catalogue_b, 1.0, &error);
  g_assert_no_error (error);
  g_assert_nonnull (second);
  return second;
}

static gint64
query_int (SlTestProject *f, const char *format, ...) G_GNUC_PRINTF (2, 3);

static gint64
query_int (SlTestProject *f, const char *format, ...)
{
  va_list args;
  g_autofree char *sql = NULL;

  va_start (args, format);
  sql = g_strdup_vprintf (format, args);
  va_end (args);
  return sl_test_query_int (f->db, sql);
}

static char *
query_text (SlTestProject *f, const char *format, ...) G_GNUC_PRINTF (2, 3);

static char *
query_text (SlTestProject *f, const char *format, ...)
{
  va_list args;
  g_autofree char *sql = NULL;

  va_start (args, format);
  sql = g_strdup_vprintf (format, args);
  va_end (args);
  return sl_test_query_text (f->db, sql);
}

/* The star the row of b.csv at LINE belongs to. */
static char *
star_of_line (SlTestProject *f, guint line)
{
  return query_text (f, "SELECT s.designation FROM measurements m JOIN stars s ON s.id = m.star_id "
                        "WHERE m.source_id = 2 AND m.line = %u", line);
}

static void
test_joins_by_position (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autofree char *b1 = star_of_line (f, 2);
  g_autofree char *b5 = star_of_line (f, 6);
  g_autofree char *row_id = NULL;
  double want;

  g_assert_cmpstr (b1, ==, "A1");
  g_assert_cmpstr (b5, ==, "A6");
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM measurements WHERE star_id = 1"), ==, 2);
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM matches WHERE status = 'matched'"), ==, 3);
  g_assert_cmpuint (report->matched, ==, 3);
  sl_assert_close (report->match_epoch, 2016.0, 0, "the first row's epoch is the common epoch");

  /* The stored separation is the one at the common epoch (A1 does not
   * move), with the epoch and the radius; the row keeps its own id. */
  want = sl_sky_separation (10.0, 20.0, 10.00002, 20.00001);
  sl_assert_close ((double) query_int (f, "SELECT round (separation_arcsec * 1e9) FROM matches m "
                                          "JOIN measurements x ON x.id = m.measurement_id WHERE x.line = 2") / 1e9,
                   want, 1e-9, "B1's separation from A1 (arcsec)");
  g_assert_cmpint (query_int (f, "SELECT epoch * 1000 FROM matches WHERE row_designation = 'B1'"), ==, 2016000);
  g_assert_cmpint (query_int (f, "SELECT radius_arcsec * 1000 FROM matches WHERE row_designation = 'B1'"), ==, 1000);
  row_id = query_text (f, "SELECT row_designation FROM matches x JOIN measurements m ON m.id = x.measurement_id "
                          "WHERE m.star_id = 6 AND x.status = 'matched'");
  g_assert_cmpstr (row_id, ==, "B5");
  /* Across RA 0: A6 at 359.99995 and B5 at 0.00001 are 0.216 arcsec apart. */
  sl_assert_close ((double) query_int (f, "SELECT round (separation_arcsec * 1000) FROM matches WHERE row_designation = 'B5'"),
                   216, 0, "B5 from A6 across RA 0 (mas)");
}

/* A3 moved 93 arcsec between the catalogues' epochs: found all the same,
 * 0.014 arcsec from where it is in 2016. */
static void
test_high_proper_motion (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autofree char *b2 = star_of_line (f, 3);
  SlAstrometry a3;
  double ra, dec;

  g_assert_cmpstr (b2, ==, "A3");
  sl_astrometry_init (&a3);
  a3.ra = 50.0;
  a3.dec = -30.0;
  a3.pmra = 5000;
  a3.pmdec = -3000;
  a3.parallax = 300;
  a3.epoch = 2000.0;
  g_assert_true (sl_astrometry_propagate (&a3, 2016.0, &ra, &dec));
  g_assert_cmpfloat (sl_sky_separation (50.0, -30.0, 50.02566, -30.0133333), >, 90.0);
  sl_assert_close ((double) query_int (f, "SELECT round (separation_arcsec * 1e6) FROM matches WHERE row_designation = 'B2'") / 1e6,
                   sl_sky_separation (ra, dec, 50.0256600, -30.0133333), 1e-6, "B2 from A3 in 2016 (arcsec)");
}

/* No star within the radius: a new star named by the row's id; an id
 * that another star has already gets the source's number. */
static void
test_new_stars (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autofree char *b4 = star_of_line (f, 5);
  g_autofree char *renamed = star_of_line (f, 10);

  g_assert_cmpstr (b4, ==, "B4");
  g_assert_cmpstr (renamed, ==, "A1 (source 2)");
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM matches WHERE row_designation IN ('B4', 'A1')"), ==, 0);
  /* B3, B4, B6, B7 and the second A1. */
  g_assert_cmpuint (report->new_stars, ==, 5);
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM stars"), ==, 11);
}

/* B3 lies 0.127 arcsec from both A4 and A5: not merged with either; a
 * star of its own, recorded with both candidates and their separations,
 * and reported. */
static void
test_close_pair_ambiguous (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autofree char *b3 = star_of_line (f, 4);
  g_autofree char *first = NULL;
  g_autofree char *second = NULL;
  const SlAmbiguousRow *row = NULL;

  g_assert_cmpstr (b3, ==, "B3");
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM measurements WHERE star_id IN (4, 5)"), ==, 2);
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM matches WHERE row_designation = 'B3' "
                                 "AND status = 'ambiguous'"), ==, 1);
  g_assert_cmpint (query_int (f, "SELECT json_array_length (candidates) FROM matches WHERE row_designation = 'B3'"), ==, 2);
  first = query_text (f, "SELECT candidates ->> '$[0].designation' FROM matches WHERE row_designation = 'B3'");
  second = query_text (f, "SELECT candidates ->> '$[1].designation' FROM matches WHERE row_designation = 'B3'");
  g_assert_true ((g_str_equal (first, "A4") && g_str_equal (second, "A5"))
                 || (g_str_equal (first, "A5") && g_str_equal (second, "A4")));
  sl_assert_close ((double) query_int (f, "SELECT round (candidates ->> '$[1].separation_arcsec' * 1000) "
                                          "FROM matches WHERE row_designation = 'B3'"),
                   127, 0, "second candidate's separation (mas)");

  for (guint i = 0; i < report->ambiguous->len; i++)
    if (g_array_index (report->ambiguous, SlAmbiguousRow, i).line == 4)
      row = &g_array_index (report->ambiguous, SlAmbiguousRow, i);
  g_assert_nonnull (row);
  g_assert_cmpstr (row->designation, ==, "B3");
  g_assert_nonnull (strstr (row->explanation, "2 stars within 1 arcsec"));
  g_assert_nonnull (strstr (row->explanation, "A4 at 0.127 arcsec"));
}

/* B6 and B7 both have A2 as their only star: neither joins it (the first
 * is taken back out when the second comes); both are stars of their own,
 * each recorded with A2 as its candidate and the other line as reason. */
static void
test_two_rows_one_star (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autofree char *b6 = star_of_line (f, 7);
  g_autofree char *b7 = star_of_line (f, 8);
  g_autofree char *reason6 = query_text (f, "SELECT reason FROM matches WHERE row_designation = 'B6'");
  g_autofree char *reason7 = query_text (f, "SELECT reason FROM matches WHERE row_designation = 'B7'");
  g_autofree char *candidate6 = query_text (f, "SELECT candidates ->> '$[0].designation' FROM matches "
                                               "WHERE row_designation = 'B6'");
  g_autofree char *candidate7 = query_text (f, "SELECT candidates ->> '$[0].designation' FROM matches "
                                               "WHERE row_designation = 'B7'");

  g_assert_cmpstr (b6, ==, "B6");
  g_assert_cmpstr (b7, ==, "B7");
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM measurements WHERE star_id = 2"), ==, 1);
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM matches WHERE status = 'ambiguous'"), ==, 3);
  g_assert_cmpstr (reason6, ==, "A2 is also the nearest star of line 8");
  g_assert_cmpstr (reason7, ==, "A2 is also the nearest star of line 7");
  g_assert_cmpstr (candidate6, ==, "A2");
  g_assert_cmpstr (candidate7, ==, "A2");
  sl_assert_close ((double) query_int (f, "SELECT round (candidates ->> '$[0].separation_arcsec' * 1000) "
                                          "FROM matches WHERE row_designation = 'B6'"),
                   round (sl_sky_separation (10.01, 20.0, 10.0101, 20.0) * 1000), 0, "B6 from A2 (mas)");
  g_assert_cmpuint (report->ambiguous->len, ==, 3);
  g_assert_cmpuint (report->matched, ==, 3);
}

/* A row without a position cannot be matched by position: rejected with
 * the reason, kept in rejected_rows; the rest is imported. */
static void
test_no_position_rejected (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autofree char *reason = query_text (f, "SELECT reason FROM rejected_rows WHERE source_id = 2");

  g_assert_cmpuint (report->rejections->len, ==, 1);
  g_assert_cmpuint (g_array_index (report->rejections, SlRejection, 0).line, ==, 9);
  g_assert_nonnull (strstr (reason, "no position"));
  g_assert_cmpuint (report->rows_accepted, ==, 8);
}

/* The ledger entry of the import counts the matches. */
static void
test_ledger_counts (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autofree char *summary = query_text (f, "SELECT summary FROM ledger WHERE action = 'import' ORDER BY id DESC LIMIT 1");

  g_assert_nonnull (strstr (summary, "3 matched by position, 3 ambiguous"));
  g_assert_cmpint (query_int (f, "SELECT details ->> 'matched' FROM ledger WHERE action = 'import' "
                                 "ORDER BY id DESC LIMIT 1"), ==, 3);
  g_assert_cmpint (query_int (f, "SELECT details ->> 'match_radius_arcsec' FROM ledger WHERE action = 'import' "
                                 "ORDER BY id DESC LIMIT 1"), ==, 1);
}

/* Split: B1 leaves A1 for a star of its own; the match stays on record
 * as split, with who and when; A1's derived values are stale; one ledger
 * entry. */
static void
test_split (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autoptr (GError) error = NULL;
  g_autoptr (GPtrArray) names = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *b1 = NULL;
  g_autofree char *split_by = NULL;
  g_autofree char *ledger = NULL;
  SlRowRef ref;

  /* A derived row for A1, to see it go stale. */
  g_assert_true (sl_project_exec (f->project,
                                  "INSERT INTO derivation_runs (id, started_at, who, software_version, parameters, methods) "
                                  "VALUES (1, 'now', 'test', '0', '', '{}');"
                                  "INSERT INTO derived (star_id, run_id) VALUES (1, 1);", &error));
  g_assert_no_error (error);

  g_assert_true (sl_row_ref_parse ("b.csv:2", &ref, &error));
  g_assert_true (sl_match_split (f->project, &ref, 1, names, &error));
  g_assert_no_error (error);
  sl_row_ref_clear (&ref);

  g_assert_cmpuint (names->len, ==, 1);
  g_assert_cmpstr (names->pdata[0], ==, "B1");
  b1 = star_of_line (f, 2);
  g_assert_cmpstr (b1, ==, "B1");
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM measurements WHERE star_id = 1"), ==, 1);
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM matches WHERE row_designation = 'B1' AND status = 'split' "
                                 "AND split_from = 1"), ==, 1);
  split_by = query_text (f, "SELECT split_by FROM matches WHERE row_designation = 'B1'");
  g_assert_cmpstr (split_by, ==, "test-user");
  g_assert_cmpint (query_int (f, "SELECT stale FROM derived WHERE star_id = 1"), ==, 1);
  ledger = query_text (f, "SELECT summary FROM ledger ORDER BY id DESC LIMIT 1");
  g_assert_cmpstr (ledger, ==, "split 1 row from its star: b.csv:2 (B1) from A1 into B1");
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM ledger WHERE action = 'split'"), ==, 1);

  /* Once split, it cannot be split again. */
  g_assert_true (sl_row_ref_parse ("2:2", &ref, &error));
  g_assert_false (sl_match_split (f->project, &ref, 1, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_nonnull (strstr (error->message, "b.csv:2: this row was split already"));
  sl_row_ref_clear (&ref);
}

/* All or nothing: when one row of several cannot be split, none is. */
static void
test_split_all_or_nothing (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autoptr (GError) error = NULL;
  const char *const texts[] = { "2:2", "2:6", "2:5" };   /* B1, B5 matched; B4 a new star */
  SlRowRef refs[3];
  g_autofree char *b1 = NULL;

  for (guint i = 0; i < 3; i++)
    g_assert_true (sl_row_ref_parse (texts[i], &refs[i], NULL));
  g_assert_false (sl_match_split (f->project, refs, 3, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_nonnull (strstr (error->message, "b.csv:5: this row was not matched by position; it is star B4's own row"));
  for (guint i = 0; i < 3; i++)
    sl_row_ref_clear (&refs[i]);

  b1 = star_of_line (f, 2);
  g_assert_cmpstr (b1, ==, "A1");
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM matches WHERE status = 'split'"), ==, 0);
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM ledger WHERE action = 'split'"), ==, 0);
}

static void
test_split_bad_references (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autoptr (GError) error = NULL;
  SlRowRef ref;

  g_assert_false (sl_row_ref_parse ("b.csv", &ref, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_nonnull (strstr (error->message, "expected SOURCE:LINE"));
  g_clear_error (&error);
  g_assert_false (sl_row_ref_parse ("b.csv:0", &ref, &error));
  g_clear_error (&error);

  g_assert_true (sl_row_ref_parse ("nowhere.csv:2", &ref, NULL));
  g_assert_false (sl_match_split (f->project, &ref, 1, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_nonnull (strstr (error->message, "no source 'nowhere.csv'"));
  g_clear_error (&error);
  sl_row_ref_clear (&ref);

  g_assert_true (sl_row_ref_parse ("2:99", &ref, NULL));
  g_assert_false (sl_match_split (f->project, &ref, 1, NULL, &error));
  g_assert_nonnull (strstr (error->message, "source 2 has no imported row at line 99"));
  g_clear_error (&error);
  sl_row_ref_clear (&ref);

  g_assert_true (sl_row_ref_parse ("2:4", &ref, NULL));
  g_assert_false (sl_match_split (f->project, &ref, 1, NULL, &error));
  g_assert_nonnull (strstr (error->message, "b.csv:4: this row was ambiguous and is a star of its own already (B3)"));
  sl_row_ref_clear (&ref);
}

/* explain says why B1's row is part of A1, in text and JSON, and after a
 * split where it went. */
static void
test_explain (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autoptr (GError) error = NULL;
  g_autoptr (GString) text = g_string_new (NULL);
  g_autoptr (GString) json = g_string_new (NULL);
  g_autoptr (GString) after = g_string_new (NULL);
  SlRowRef ref;

  g_assert_true (sl_explain (f->project, "A1", "vmag", SL_EXPLAIN_TEXT, text, &error));
  g_assert_no_error (error);
  g_assert_nonnull (strstr (text->str, "b.csv line 2 (source 2 'b.csv'), its id 'B1': taken as this star: the only "
                                       "star within 1 arcsec, 0.077 arcsec away, both positions moved to J2016.000"));
  g_assert_nonnull (strstr (text->str, "starledger-cli split PROJECT 2:2"));

  g_assert_true (sl_explain (f->project, "A1", "vmag", SL_EXPLAIN_JSON, json, &error));
  g_assert_nonnull (strstr (json->str, "\"matches\":[{\"status\":\"matched\",\"source_id\":2,\"source\":\"b.csv\","
                                       "\"file\":\"b.csv\",\"line\":2,\"row_id\":\"B1\",\"star\":\"A1\""));

  g_assert_true (sl_row_ref_parse ("2:2", &ref, NULL));
  g_assert_true (sl_match_split (f->project, &ref, 1, NULL, &error));
  sl_row_ref_clear (&ref);
  g_assert_true (sl_explain (f->project, "B1", "vmag", SL_EXPLAIN_TEXT, after, &error));
  g_assert_nonnull (strstr (after->str, "had been taken as star A1"));
  g_assert_nonnull (strstr (after->str, "split off into star B1 by test-user"));
}

/* With --epoch the common epoch is that one, whatever the rows say;
 * without any epoch the positions are matched as they are, and a star
 * that moved is not found (nothing pretends to know where it was). */
static void
test_common_epoch (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) first = import_text (f, "a.csv", catalogue_a, 0, &error);
  g_autofree char *path = sl_test_write_file (f->dir, "c.csv",
                                              "id,ra,dec\n"
                                              "C1,10.00002,20.00001\n"
                                              "C2,50.0256600,-30.0133333\n", -1);
  g_autofree char *b2 = NULL;
  g_autoptr (SlImportReport) second = NULL;
  g_autoptr (SlImportReport) third = NULL;
  g_autoptr (GString) text = g_string_new (NULL);
  SlImportOptions options;

  sl_import_options_init (&options);
  options.match_radius = 1.0;
  second = sl_import_csv (f->project, path, &options, &error);
  g_assert_no_error (error);
  g_assert_true (isnan (second->match_epoch));
  g_assert_cmpuint (second->matched, ==, 1);
  g_assert_cmpuint (second->new_stars, ==, 1);   /* C2: A3 is 93 arcsec from where it was in 2000 */
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM matches WHERE row_designation = 'C1' AND epoch IS NULL"), ==, 1);
  g_assert_true (sl_explain (f->project, "A1", "ra", SL_EXPLAIN_TEXT, text, &error));
  g_assert_nonnull (strstr (text->str, "moved to the positions' own epochs (none known)"));

  /* The same rows said to be of 2016: A3 is carried there and found,
   * beside the star C2 made of the same row just now, so that row is
   * ambiguous between the two. */
  options.epoch = 2016.0;
  options.again = TRUE;
  third = sl_import_csv (f->project, path, &options, &error);
  g_assert_no_error (error);
  sl_assert_close (third->match_epoch, 2016.0, 0, "--epoch is the common epoch");
  g_assert_cmpuint (third->matched, ==, 1);
  g_assert_cmpuint (third->ambiguous->len, ==, 1);
  b2 = query_text (f, "SELECT group_concat (value ->> 'designation', ' ') FROM matches x, "
                      "json_each (x.candidates) JOIN measurements m ON m.id = x.measurement_id "
                      "WHERE m.source_id = 3 AND m.line = 3");
  g_assert_true (g_str_equal (b2, "C2 A3") || g_str_equal (b2, "A3 C2"));
}

/* Without a match radius nothing changes: rows join by id. */
static void
test_by_id_unchanged (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) first = import_text (f, "a.csv", catalogue_a, 0, &error);
  g_autoptr (SlImportReport) second = import_text (f, "b.csv", catalogue_b, 0, &error);

  g_assert_no_error (error);
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM matches"), ==, 0);
  g_assert_cmpint (query_int (f, "SELECT count(*) FROM measurements WHERE star_id = 1"), ==, 2);
  g_assert_cmpuint (second->matched, ==, 0);
  g_assert_cmpuint (second->ambiguous->len, ==, 0);
  g_assert_true (isnan (second->match_epoch));
}

/* The counts agree with the table; the list has the ambiguous rows first,
 * each group in file order; a limit stops it and says there is more; the
 * search ignores case, finds a row by its id, its star or the star it was
 * split from, and takes % and _ literally. */
static void
test_match_list (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlImportReport) report = import_both (f);
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) all = NULL;
  g_autoptr (GArray) two = NULL;
  g_autoptr (GArray) found = NULL;
  g_autoptr (GArray) none = NULL;
  g_autoptr (GArray) after = NULL;
  const SlMatchListRow *row;
  SlMatchCounts counts;
  gboolean more = TRUE;
  SlRowRef ref = { (char *) "2", 3 };
  guint n_ambiguous = 0;

  g_assert_true (sl_match_counts (f->project, &counts, &error));
  g_assert_no_error (error);
  g_assert_cmpint (counts.matched, ==, query_int (f, "SELECT count(*) FROM matches WHERE status = 'matched'"));
  g_assert_cmpint (counts.ambiguous, ==, query_int (f, "SELECT count(*) FROM matches WHERE status = 'ambiguous'"));
  g_assert_cmpint (counts.split, ==, 0);
  g_assert_cmpint (counts.matched, >=, 3);
  g_assert_cmpint (counts.ambiguous, ==, 3);   /* B3, B6, B7 */

  all = sl_match_list (f->project, NULL, 100, &more, &error);
  g_assert_no_error (error);
  g_assert_false (more);
  g_assert_cmpuint (all->len, ==, counts.matched + counts.ambiguous);
  for (guint i = 0; i < all->len; i++)
    {
      row = &g_array_index (all, SlMatchListRow, i);
      if (strcmp (row->info.status, "ambiguous") == 0)
        {
          g_assert_cmpuint (i, ==, n_ambiguous);
          n_ambiguous++;
        }
      if (i > 0 && strcmp (row->info.status, g_array_index (all, SlMatchListRow, i - 1).info.status) == 0)
        g_assert_cmpuint (row->info.line, >, g_array_index (all, SlMatchListRow, i - 1).info.line);
    }
  g_assert_cmpuint (n_ambiguous, ==, 3);
  row = &g_array_index (all, SlMatchListRow, 0);
  g_assert_cmpstr (row->info.row_designation, ==, "B3");
  g_assert_cmpuint (g_strv_length (row->candidate_ids), ==, 2);
  g_assert_nonnull (strstr (row->candidates, "A4 at 0.127 arcsec"));
  g_assert_nonnull (strstr (row->candidates, "A5 at 0.1"));

  two = sl_match_list (f->project, "", 2, &more, &error);
  g_assert_cmpuint (two->len, ==, 2);
  g_assert_true (more);

  found = sl_match_list (f->project, "a3", 100, &more, &error);
  g_assert_cmpuint (found->len, ==, 1);
  row = &g_array_index (found, SlMatchListRow, 0);
  g_assert_cmpstr (row->info.status, ==, "matched");
  g_assert_cmpstr (row->info.row_designation, ==, "B2");
  g_assert_cmpstr (row->info.star, ==, "A3");
  g_assert_cmpuint (row->info.line, ==, 3);
  g_assert_cmpfloat (row->info.epoch, ==, 2016.0);

  none = sl_match_list (f->project, "%", 100, &more, &error);
  g_assert_cmpuint (none->len, ==, 0);
  g_clear_pointer (&none, g_array_unref);
  none = sl_match_list (f->project, "B_", 100, &more, &error);
  g_assert_cmpuint (none->len, ==, 0);

  g_assert_true (sl_match_split (f->project, &ref, 1, NULL, &error));
  g_assert_no_error (error);
  after = sl_match_list (f->project, "A3", 100, &more, &error);
  g_assert_cmpuint (after->len, ==, 1);
  row = &g_array_index (after, SlMatchListRow, 0);
  g_assert_cmpstr (row->info.status, ==, "split");
  g_assert_cmpstr (row->info.other_star, ==, "A3");
  g_assert_cmpstr (row->info.star, ==, "B2");
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

#define ADD(path, func) g_test_add (path, SlTestProject, NULL, sl_test_project_set_up, func, sl_test_project_tear_down)
  ADD ("/matching/import/joins-by-position", test_joins_by_position);
  ADD ("/matching/import/high-proper-motion", test_high_proper_motion);
  ADD ("/matching/import/new-stars", test_new_stars);
  ADD ("/matching/import/close-pair-ambiguous", test_close_pair_ambiguous);
  ADD ("/matching/import/two-rows-one-star", test_two_rows_one_star);
  ADD ("/matching/import/no-position-rejected", test_no_position_rejected);
  ADD ("/matching/import/ledger-counts", test_ledger_counts);
  ADD ("/matching/import/by-id-unchanged", test_by_id_unchanged);
  ADD ("/matching/import/common-epoch", test_common_epoch);
  ADD ("/matching/split/one-row", test_split);
  ADD ("/matching/split/all-or-nothing", test_split_all_or_nothing);
  ADD ("/matching/split/bad-references", test_split_bad_references);
  ADD ("/matching/explain", test_explain);
  ADD ("/matching/list", test_match_list);
#undef ADD

  return g_test_run ();
}
