/* test-inputs.c: choosing one set of inputs per star among the
 * measurements of several sources. */
#include <locale.h>
#include <glib/gstdio.h>
#include <math.h>
#include <string.h>

#include "derivation.h"
#include "import.h"
#include "input-reader.h"
#include "inputs.h"
#include "test-util.h"

static void
import_text (SlTestProject *f, const char *name, const char *contents)
{
  g_autofree char *path = sl_test_write_file (f->dir, name, contents, -1);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  report = sl_import_csv (f->project, path, &options, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (report->rejections->len, ==, 0);
}

/* Reads the one star of the project; its texts stay valid while the
 * returned cursor lives. */
static SlInputCursor *
read_only_star (SlTestProject *f, SlStarInputs *inputs)
{
  g_autoptr (GError) error = NULL;
  SlInputCursor *cursor = sl_input_cursor_new (f->project, 0, &error);
  g_autoptr (SlInputCursor) check = sl_input_cursor_new (f->project, 0, &error);
  SlStarInputs first, second;

  g_assert_no_error (error);
  g_assert_true (sl_input_cursor_next (cursor, inputs, &error));
  g_assert_true (sl_input_cursor_next (check, &first, &error));
  g_assert_false (sl_input_cursor_next (check, &second, &error));
  g_assert_no_error (error);
  return cursor;
}

static void
test_smallest_error_wins (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;

  import_text (f, "one.csv", "id,ra,ra_err,dec,dec_err,epoch,parallax,parallax_err,sptype\n"
                             "A,10,1.0,20,1.0,2016,10.0,0.5,G2 V\n");
  import_text (f, "two.csv", "id,ra,dec,epoch,parallax,parallax_err,vmag,sptype\n"
                             "A,10.001,20.001,2000,10.3,0.2,7.5,G3 V\n");
  cursor = read_only_star (f, &in);

  g_assert_cmpstr (in.designation, ==, "A");
  g_assert_cmpuint (in.n_measurements, ==, 2);
  /* The parallax with the smaller error (source two). */
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 10.3, 0, "parallax from the better source");
  sl_assert_close (in.value[SL_FIELD_PARALLAX_ERR], 0.2, 0, "its error with it");
  /* The position that has an error beats one that has none, and its epoch
   * comes with it. */
  sl_assert_close (in.value[SL_FIELD_RA], 10.0, 0, "ra from the source with errors");
  sl_assert_close (in.value[SL_FIELD_EPOCH], 2016.0, 0, "the epoch of that position");
  g_assert_cmpint (in.measurement[SL_FIELD_RA], ==, in.measurement[SL_FIELD_EPOCH]);
  g_assert_cmpint (in.measurement[SL_FIELD_RA], !=, in.measurement[SL_FIELD_PARALLAX]);
  /* Only one source has V. */
  sl_assert_close (in.value[SL_FIELD_VMAG], 7.5, 0, "vmag");
  g_assert_false (in.present[SL_FIELD_VMAG_ERR]);
  /* The later source's spectral type. */
  g_assert_cmpstr (in.sptype, ==, "G3 V");
  g_assert_false (in.present[SL_FIELD_BV]);
}

static void
test_tie_goes_to_later_source (SlTestProject *f, gconstpointer data)
{
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;

  import_text (f, "one.csv", "id,parallax,parallax_err\nA,10.0,0.5\n");
  import_text (f, "two.csv", "id,parallax,parallax_err\nA,11.0,0.5\n");
  cursor = read_only_star (f, &in);
  sl_assert_close (in.value[SL_FIELD_PARALLAX], 11.0, 0, "equal errors: the later source");
}

/* A randomised check against the rule written the obvious way. */
static void
test_random_against_reference (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) a = g_string_new ("id,parallax,parallax_err\n");
  g_autoptr (GString) b = g_string_new ("id,parallax,parallax_err\n");
  g_autoptr (GError) error = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  double plx[2][200], err[2][200];
  SlStarInputs in;
  int n = 0;

  for (int i = 0; i < 200; i++)
    for (int s = 0; s < 2; s++)
      {
        GString *file = s == 0 ? a : b;
        char p[G_ASCII_DTOSTR_BUF_SIZE], e[G_ASCII_DTOSTR_BUF_SIZE];

        plx[s][i] = g_test_rand_double_range (-1, 50);
        err[s][i] = g_test_rand_int_range (1, 4) * 0.1;   /* ties happen */
        g_string_append_printf (file, "S%03d,%s,%s\n", i,
                                g_ascii_formatd (p, sizeof p, "%.17g", plx[s][i]),
                                g_ascii_formatd (e, sizeof e, "%.17g", err[s][i]));
      }
  import_text (f, "a.csv", a->str);
  import_text (f, "b.csv", b->str);

  cursor = sl_input_cursor_new (f->project, 0, &error);
  while (sl_input_cursor_next (cursor, &in, &error))
    {
      int i = atoi (in.designation + 1);
      int want = err[1][i] <= err[0][i] ? 1 : 0;

      sl_assert_close (in.value[SL_FIELD_PARALLAX], plx[want][i], 0, in.designation);
      n++;
    }
  g_assert_no_error (error);
  g_assert_cmpint (n, ==, 200);
}

static void
test_single_star_cursor (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;

  import_text (f, "one.csv", "id,parallax\nA,1\nB,2\nC,3\n");
  cursor = sl_input_cursor_new (f->project, 2, &error);
  g_assert_true (sl_input_cursor_next (cursor, &in, &error));
  g_assert_cmpstr (in.designation, ==, "B");
  g_assert_false (sl_input_cursor_next (cursor, &in, &error));
  /* A finished cursor stays finished. */
  g_assert_false (sl_input_cursor_next (cursor, &in, &error));
  g_assert_no_error (error);
}

/* ------------------------------------------------------------------ */
/* The inputs read ahead on a thread (input-reader.c)                 */

#define READER_STARS 3000

/* Two sources over READER_STARS stars (more than the reader holds in its
 * chunks at once), the second with parallaxes for every other star and
 * spectral types; star 10 has lost its measurements, so it is a star
 * without inputs. */
static void
import_reader_stars (SlTestProject *f)
{
  g_autoptr (GString) a = g_string_new ("id,ra,dec,parallax,parallax_err,vmag\n");
  g_autoptr (GString) b = g_string_new ("id,parallax,parallax_err,sptype\n");

  for (int i = 0; i < READER_STARS; i++)
    {
      g_string_append_printf (a, "R%04d,%d.5,%d.25,%d.5,0.%d,%d.1\n", i, i % 360, i % 90 - 45, i % 50 + 1,
                              i % 9 + 1, i % 15);
      if (i % 2 == 0)
        g_string_append_printf (b, "R%04d,%d.25,0.%d,G%d V\n", i, i % 50 + 1, i % 7 + 1, i % 10);
    }
  import_text (f, "a.csv", a->str);
  import_text (f, "b.csv", b->str);
  g_assert_true (sl_project_exec (f->project, "DELETE FROM measurements WHERE star_id = 10", NULL));
}

static void
assert_same_inputs (const SlStarInputs *got, const SlStarInputs *want)
{
  g_assert_cmpint (got->star_id, ==, want->star_id);
  g_assert_cmpstr (got->designation, ==, want->designation);
  g_assert_cmpstr (got->sptype, ==, want->sptype);
  g_assert_cmpuint (got->n_measurements, ==, want->n_measurements);
  g_assert_cmpmem (got->present, sizeof got->present, want->present, sizeof want->present);
  g_assert_cmpmem (got->measurement, sizeof got->measurement, want->measurement, sizeof want->measurement);
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (!isnan (want->value[f]) || !isnan (got->value[f]))   /* the spectral type has none */
      g_assert_cmpfloat (got->value[f], ==, want->value[f]);
}

/* The reader hands over exactly the wanted stars that have inputs, in
 * order, with the inputs the plain cursor gives them: on its own thread
 * in WAL mode (DATA NULL), on the caller's connection in the rollback
 * journal mode (DATA "delete"). */
static void
test_reader_same_as_cursor (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) ids = g_array_new (FALSE, FALSE, sizeof (gint64));
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (SlInputReader) reader = NULL;
  g_autofree char *mode = NULL;
  SlStarInputs want, got;
  guint next = 0, n = 0;

  import_reader_stars (f);
  if (data != NULL)
    g_assert_true (sl_project_exec (f->project, "PRAGMA journal_mode = DELETE", NULL));
  mode = sl_test_query_text (f->db, "PRAGMA journal_mode");
  g_assert_cmpstr (mode, ==, data ? "delete" : "wal");
  /* Every third star, star 10 (no inputs), and every star from 2000 on. */
  for (gint64 id = 1; id <= READER_STARS; id++)
    if (id % 3 == 1 || id == 10 || id >= 2000)
      g_array_append_val (ids, id);

  g_assert_true (sl_project_begin (f->project, &error));
  reader = sl_input_reader_new (f->project, ids, &error);
  g_assert_no_error (error);
  cursor = sl_input_cursor_new (f->project, 0, &error);
  while (sl_input_cursor_next (cursor, &want, &error))
    {
      while (next < ids->len && g_array_index (ids, gint64, next) < want.star_id)
        next++;
      if (next == ids->len || g_array_index (ids, gint64, next) != want.star_id)
        continue;
      g_assert_true (sl_input_reader_next (reader, &got, &error));
      assert_same_inputs (&got, &want);
      n++;
    }
  g_assert_no_error (error);
  g_assert_false (sl_input_reader_next (reader, &got, &error));
  g_assert_false (sl_input_reader_next (reader, &got, &error));   /* and stays at the end */
  g_assert_no_error (error);
  g_assert_cmpuint (n, ==, ids->len - 1);   /* all but star 10 */
  sl_project_rollback (f->project);
}

/* A caller that stops early (an error, a cancelled run) frees the reader
 * while its thread is ahead, or before it read anything: nothing hangs. */
static void
test_reader_stops_early (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) ids = g_array_new (FALSE, FALSE, sizeof (gint64));
  SlStarInputs in;

  import_reader_stars (f);
  for (gint64 id = 1; id <= READER_STARS; id++)
    g_array_append_val (ids, id);
  g_assert_true (sl_project_begin (f->project, &error));
  for (int taken = 0; taken < 600; taken += 300)
    {
      SlInputReader *reader = sl_input_reader_new (f->project, ids, &error);

      g_assert_no_error (error);
      for (int i = 0; i < taken; i++)
        {
          g_assert_true (sl_input_reader_next (reader, &in, &error));
          g_assert_cmpint (in.star_id, ==, i < 9 ? i + 1 : i + 2);   /* star 10 has no inputs */
        }
      sl_input_reader_free (reader);
    }
  sl_project_rollback (f->project);
}

/* A run's reader lets go of its snapshot before the run commits, so the
 * checkpoint after the commit (SQLite's automatic one, past 1000 pages in
 * the write-ahead log) copies the run's pages into the project file at
 * once; a snapshot from before the run would hold them back in the log
 * until some later commit.  The run here stops reading before the end:
 * the last star is up to date, and the reader's cursor is left open. */
static void
test_reader_done_before_commit (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) csv = g_string_new ("id,ra,dec,parallax,parallax_err,vmag,vmag_err,bv,bv_err\n");
  g_autoptr (GError) error = NULL;
  g_autofree char *last = NULL;
  SlDeriveParams params;
  SlDeriveReport report;
  GStatBuf before, after;
  const int n = 20000;

  for (int i = 0; i < n; i++)
    g_string_append_printf (csv, "C%05d,%d.5,%d.25,%d.5,0.%d,%d.1,0.02,0.%d,0.03\n", i, i % 360, i % 90 - 45,
                            i % 50 + 1, i % 9 + 1, i % 15, i % 9);
  import_text (f, "c.csv", csv->str);
  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_no_error (error);
  /* Every row but the last star's gone, and the file shrunk to match. */
  last = g_strdup_printf ("DELETE FROM derived WHERE star_id < %d; VACUUM; PRAGMA wal_checkpoint (TRUNCATE)", n);
  g_assert_true (sl_project_exec (f->project, last, &error));
  g_assert_no_error (error);
  g_assert_cmpint (g_stat (sl_project_path (f->project), &before), ==, 0);

  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_no_error (error);
  g_assert_cmpuint (report.computed, ==, (guint64) n - 1);
  g_assert_cmpuint (report.up_to_date, ==, 1);
  g_assert_cmpint (g_stat (sl_project_path (f->project), &after), ==, 0);
  /* A derived row takes a few hundred bytes. */
  g_assert_cmpint (after.st_size - before.st_size, >, (goffset) n * 200);
}

int
main (int argc, char **argv)
{
  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);

#define ADD(path, func) g_test_add (path, SlTestProject, NULL, sl_test_project_set_up, func, \
                                        sl_test_project_tear_down)
  ADD ("/inputs/smallest-error-wins", test_smallest_error_wins);
  ADD ("/inputs/tie-goes-to-later-source", test_tie_goes_to_later_source);
  ADD ("/inputs/random-against-reference", test_random_against_reference);
  ADD ("/inputs/single-star", test_single_star_cursor);
#undef ADD
  g_test_add ("/inputs/reader/same-as-cursor/wal", SlTestProject, NULL, sl_test_project_set_up,
              test_reader_same_as_cursor, sl_test_project_tear_down);
  g_test_add ("/inputs/reader/same-as-cursor/rollback-journal", SlTestProject, "delete",
              sl_test_project_set_up, test_reader_same_as_cursor, sl_test_project_tear_down);
  g_test_add ("/inputs/reader/stops-early", SlTestProject, NULL, sl_test_project_set_up,
              test_reader_stops_early, sl_test_project_tear_down);
  g_test_add ("/inputs/reader/done-before-commit", SlTestProject, NULL, sl_test_project_set_up,
              test_reader_done_before_commit, sl_test_project_tear_down);

  return g_test_run ();
}
