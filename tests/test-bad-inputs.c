/* test-bad-inputs.c: the catalogue of bad input files, one table.
 *
 * Every case is a CSV file that is wrong in one way.  Either the whole
 * file is refused (the message names the file, and the line where there
 * is one, and the project is left exactly as it was: no source, no star,
 * no measurement, no rejected row, no ledger entry), or one row is
 * rejected (its line, column and reason are kept; the star of that row
 * gets no measurement, the good rows around it do), or the file is
 * imported with a warning (values valid but suspicious).  Cases that need
 * a file too big to write out (a 200 MB line) or a file that changes
 * while it is read have functions of their own below the table. */
#include <fcntl.h>
#include <locale.h>
#include <string.h>
#include <unistd.h>

#include "csv-reader.h"
#include "import.h"
#include "sl-error.h"
#include "test-util.h"

typedef enum {
  REFUSED,    /* no import at all */
  REJECTED,   /* line 3 rejected, lines 2 and 4 imported */
  WARNED,     /* imported, with a warning */
  STORED,     /* imported as given (the edge that is not an error) */
} Outcome;

typedef struct {
  const char *name;
  const char *contents;    /* the whole file; for REJECTED only line 3 */
  gssize      length;      /* -1: a string */
  const char *maps[3];     /* --map specs, NULL-terminated */
  char        delimiter;   /* --delimiter, 0: detect */
  Outcome     outcome;
  int         code;        /* REFUSED: the SL_ERROR code */
  const char *message;     /* what the user reads, a substring of it */
} BadInput;

/* For REJECTED cases: the header and the rows around line 3. */
#define REJECT_HEADER "id,ra,dec,parallax,parallax_err,vmag,sptype\n"
#define GOOD_LINE_2   "Good-2,10,20,1,0.1,5,G2\n"
#define GOOD_LINE_4   "Good-4,11,21,2,0.2,6,K0\n"

static const BadInput bad_inputs[] = {
  /* Not a table at all. */
  { "empty-file", "", 0, { NULL }, 0, REFUSED, SL_ERROR_BAD_INPUT,
    "bad.csv: the file is empty" },
  { "blank-lines-only", "\n\n  \n", -1, { NULL }, 0, REFUSED, SL_ERROR_BAD_INPUT,
    "bad.csv: no header row" },
  { "header-only", "id,parallax,parallax_err\n", -1, { NULL }, 0, REFUSED, SL_ERROR_NOTHING_ACCEPTED,
    "bad.csv: no data rows after the header (line 1)" },
  { "binary-png", "\x89PNG\r\n\x1a\n\0\0\0\rIHDR\0\0\0\x10", 20, { NULL }, 0, REFUSED, SL_ERROR_BAD_INPUT,
    "bad.csv: not a text file (a NUL byte at offset 8)" },
  { "binary-late-nul", "id,parallax\nA,1\nB,2\0\n", 21, { NULL }, 0, REFUSED, SL_ERROR_BAD_INPUT,
    "bad.csv: not a text file (a NUL byte at offset 19)" },
  { "cr-only-line-ends", "id,parallax\rA,1\r", -1, { NULL }, 0, REFUSED, SL_ERROR_BAD_INPUT,
    "bad.csv: lines end in CR only" },
  { "line-over-1-mib-quoted", NULL, 0, { NULL }, 0, REFUSED, SL_ERROR_BAD_INPUT,
    "bad.csv:2: line longer than 1 MiB" },   /* contents made in bad_input_contents */

  /* A table, but not read as the file means it. */
  { "wrong-delimiter-detected", "id|parallax|parallax_err\nA|1|0.1\n", -1, { NULL }, 0,
    REFUSED, SL_ERROR_BAD_MAPPING,
    "bad.csv:1: the header is one column, 'id|parallax|parallax_err', holding a vertical bar" },
  { "wrong-delimiter-given", "id;parallax\nA;1\n", -1, { NULL }, ',',
    REFUSED, SL_ERROR_BAD_MAPPING, "bad.csv:1: the header is one column, 'id;parallax', holding a semicolon" },
  { "duplicate-column-names", "id,parallax,vmag,parallax\nA,1,5,2\n", -1, { NULL }, 0,
    REFUSED, SL_ERROR_BAD_MAPPING, "bad.csv:1: the header has two columns named 'parallax' (columns 2 and 4)" },
  { "two-columns-one-field", "id,plx_a,plx_b\nA,1,2\n", -1, { "parallax=plx_a", "parallax=plx_b", NULL }, 0,
    REFUSED, SL_ERROR_BAD_MAPPING, "--map: parallax is mapped twice" },
  { "one-column-two-fields", "id,mag\nA,5\n", -1, { "vmag=mag", "bmag=mag", NULL }, 0,
    REFUSED, SL_ERROR_BAD_MAPPING, "bad.csv:1: column 'mag' is mapped to both vmag and bmag" },
  { "map-names-no-column", "id,plx\nA,1\n", -1, { "parallax=parallax_mas", NULL }, 0,
    REFUSED, SL_ERROR_BAD_MAPPING, "bad.csv:1: no column named 'parallax_mas'; the header has 'id', 'plx'" },
  { "header-invalid-utf8", "id,p\xe4rallax\nA,1\n", -1, { NULL }, 0, REFUSED, SL_ERROR_BAD_INPUT,
    "bad.csv:1: column 2 of the header is not valid UTF-8" },
  { "every-row-bad", "id,parallax\nA,one\nB,two\n", -1, { NULL }, 0, REFUSED, SL_ERROR_NOTHING_ACCEPTED,
    "bad.csv: no row could be imported; all 2 were rejected, the first at line 2: parallax: not a number" },

  /* One bad row among good ones: line 3. */
  { "nan-is-missing-not-zero", "Nan-3,12,22,NaN,0.1,5,G2", -1, { NULL }, 0, STORED, 0, NULL },
  { "infinity", "Inf-3,12,22,inf,0.1,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax: not a number: 'inf'" },
  { "minus-infinity", "Inf-3,12,22,1,0.1,-Infinity,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: vmag: not a number: '-Infinity'" },
  { "enormous-beyond-double", "Big-3,12,22,1e400,0.1,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax: number out of range: '1e400'" },
  { "enormous-but-finite", "Big-3,12,22,1e300,0.1,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax: parallax must be in" },
  { "tiny-underflows-to-zero", "Tiny-3,12,22,1,1e-400,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax_err: number too small (it would be stored as 0): '1e-400'" },
  { "error-zero", "Zero-3,12,22,1,0,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax_err: an uncertainty must be positive, not 0" },
  { "error-negative", "Neg-3,12,22,1,-0.2,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax_err: an uncertainty must be positive, not -0.2" },
  { "dec-90.0000001", "Pole-3,12,90.0000001,1,0.1,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: dec: dec must be in [-90, 90]" },
  { "dec-minus-90.0000001", "Pole-3,12,-90.0000001,1,0.1,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: dec: dec must be in [-90, 90]" },
  { "ra-360", "Wrap-3,360,22,1,0.1,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: ra: ra must be in [0, 360)" },
  { "text-in-numeric-column", "Text-3,12,22,twelve,0.1,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax: not a number: 'twelve'" },
  { "units-in-numeric-cell", "Text-3,12,22,12 mas,0.1,5,G2", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax: not a number: '12 mas'" },
  { "invalid-utf8-in-text", "Utf-3,12,22,1,0.1,5,K0 \xc3\x28 III", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: sptype: not valid UTF-8 text" },
  { "invalid-utf8-in-id", "Utf-\xff,12,22,1,0.1,5,K0", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: id: not valid UTF-8 text" },
  { "invalid-utf8-in-number", "Utf-3,12,22,1\xff,0.1,5,K0", -1, { NULL }, 0, REJECTED, 0,
    "bad.csv:3: parallax: not a number" },

  /* Valid values in the wrong unit, as far as one can tell: a warning. */
  { "parallax-looks-like-arcsec", "id,plx,e_plx\nA,0.0123,0.0004\nB,0.2051,0.0009\nC,-0.0021,0.0008\n", -1,
    { "parallax=plx", "parallax_err=e_plx", NULL }, 0, WARNED, 0,
    "bad.csv: column 'plx' was read as parallax in mas, but all 3 values are below 1 with errors below 0.01: "
    "they look like arcseconds; if they are, read columns 'plx' and 'e_plx' in arcsec" },
  /* ... and not when one value is a plausible parallax in mas. */
  { "parallax-in-mas-no-warning", "id,plx,e_plx\nA,0.0123,0.0004\nB,12.3,0.05\n", -1,
    { "parallax=plx", "parallax_err=e_plx", NULL }, 0, STORED, 0, NULL },
  /* ... nor when the column was declared in arcseconds. */
  { "parallax-declared-arcsec", "id,plx,e_plx\nA,0.0123,0.0004\n", -1,
    { "parallax=plx:arcsec", "parallax_err=e_plx:arcsec", NULL }, 0, STORED, 0, NULL },
};

/* The file of case C; *LENGTH set.  REJECTED and STORED-with-one-row
 * cases put their row between two good ones. */
static char *
bad_input_contents (const BadInput *c, gsize *length)
{
  if (strcmp (c->name, "line-over-1-mib-quoted") == 0)
    {
      /* An open quote that never closes: the scan for the record's end
       * must stop at the bound, not run to the end of the file. */
      GString *text = g_string_new ("id,sptype\nA,\"");

      for (gsize i = 0; i < SL_CSV_MAX_RECORD_BYTES / 8 + 16; i++)
        g_string_append (text, "K0 III\n ");
      *length = text->len;
      return g_string_free (text, FALSE);
    }
  if (c->outcome == REJECTED || (c->outcome == STORED && c->maps[0] == NULL))
    {
      char *text = g_strconcat (REJECT_HEADER, GOOD_LINE_2, c->contents, "\n", GOOD_LINE_4, NULL);

      *length = strlen (text);
      return text;
    }
  *length = c->length < 0 ? strlen (c->contents) : (gsize) c->length;
  return g_memdup2 (c->contents, *length);
}

static void
assert_contains (const char *text, const char *part, const char *what)
{
  if (text == NULL || strstr (text, part) == NULL)
    g_error ("%s: want a text containing \"%s\", got \"%s\"", what, part, text ? text : "(none)");
}

/* The project holds only what sl_project_create put there. */
static void
assert_nothing_written (SlTestProject *f)
{
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM sources"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM rejected_rows"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM ledger"), ==, 1);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM ledger WHERE action = 'import'"), ==, 0);
}

static SlImportReport *
import_case (SlTestProject *f, const BadInput *c, const char *path, GError **error)
{
  g_autoptr (GArray) maps = g_array_new (FALSE, FALSE, sizeof (SlColumnMap));
  SlImportOptions options;

  g_array_set_clear_func (maps, (GDestroyNotify) sl_column_map_clear);
  for (guint i = 0; c->maps[i]; i++)
    {
      SlColumnMap map;

      g_assert_true (sl_column_map_parse (c->maps[i], &map, NULL));
      g_array_append_val (maps, map);
    }
  sl_import_options_init (&options);
  options.maps = (const SlColumnMap *) maps->data;
  options.n_maps = maps->len;
  options.delimiter = c->delimiter;
  return sl_import_csv (f->project, path, &options, error);
}

static void
test_bad_input (SlTestProject *f, gconstpointer data)
{
  const BadInput *c = data;
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;
  g_autofree char *contents = NULL;
  g_autofree char *path = NULL;
  gsize length;

  contents = bad_input_contents (c, &length);
  path = sl_test_write_file (f->dir, "bad.csv", contents, length);
  report = import_case (f, c, path, &error);

  switch (c->outcome)
    {
    case REFUSED:
      g_assert_null (report);
      g_assert_error (error, SL_ERROR, c->code);
      assert_contains (error->message, c->message, "the refusal");
      assert_nothing_written (f);
      break;

    case REJECTED:
      {
        const SlRejection *r;
        g_autofree char *said = NULL;

        g_assert_no_error (error);
        g_assert_cmpuint (report->rows_accepted, ==, 2);
        g_assert_cmpuint (report->rejections->len, ==, 1);
        r = &g_array_index (report->rejections, SlRejection, 0);
        /* As the command line prints it: FILE:LINE: COLUMN: REASON. */
        said = g_strdup_printf ("%s:%u: %s: %s", report->file_name, r->line, r->column, r->reason);
        assert_contains (said, c->message, "the rejection");
        /* Kept as rejected with its bytes; nothing of it among the
         * measurements. */
        g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM rejected_rows WHERE line = 3"), ==, 1);
        g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements"), ==, 2);
        g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements WHERE line = 3"), ==, 0);
        g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars WHERE designation LIKE 'Good-_'"), ==, 2);
        g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars"), ==, 2);
        g_assert_cmpuint (report->warnings->len, ==, 0);
      }
      break;

    case WARNED:
      g_assert_no_error (error);
      g_assert_cmpuint (report->rejections->len, ==, 0);
      g_assert_cmpuint (report->warnings->len, ==, 1);
      assert_contains (report->warnings->pdata[0], c->message, "the warning");
      g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements"), ==,
                       (gint64) report->rows_accepted);
      break;

    case STORED:
      g_assert_no_error (error);
      g_assert_cmpuint (report->rejections->len, ==, 0);
      g_assert_cmpuint (report->warnings->len, ==, 0);
      g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements"), ==,
                       (gint64) report->rows_accepted);
      break;
    }
}

/* NaN is a missing value (as an empty cell), stored as NULL: never 0 and
 * never a number that compares. */
static void
test_nan_stored_as_null (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;
  g_autofree char *path = sl_test_write_file (f->dir, "nan.csv", "id,parallax,vmag\nA,NaN,nan\nB,-nan,5\n", -1);

  report = import_case (f, &(BadInput) { .maps = { NULL } }, path, &error);
  g_assert_no_error (error);
  /* "-nan" is not one of the missing-value tokens: rejected, not 0. */
  g_assert_cmpuint (report->rows_accepted, ==, 1);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements WHERE parallax IS NULL AND vmag IS NULL"), ==, 1);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM measurements WHERE parallax = 0 OR vmag = 0"), ==, 0);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM rejected_rows WHERE line = 3"), ==, 1);
}

/* A file of one 200 MB line, made here and never kept: refused at the
 * bound, from the import and from the preview alike. */
static void
test_huge_single_line (SlTestProject *f, gconstpointer data)
{
  g_autofree char *path = g_build_filename (f->dir, "huge.csv", NULL);
  g_autofree char *chunk = g_malloc (1 << 20);
  g_autoptr (GError) error = NULL;
  SlImportOptions options;
  int fd;

  memset (chunk, '7', 1 << 20);
  memcpy (chunk, "id,parallax,", 12);
  fd = open (path, O_WRONLY | O_CREAT | O_TRUNC, 0644);
  g_assert_cmpint (fd, >=, 0);
  for (int i = 0; i < 200; i++)
    {
      g_assert_cmpint (write (fd, chunk, 1 << 20), ==, 1 << 20);
      if (i == 0)
        memset (chunk, '7', 12);
    }
  g_assert_cmpint (write (fd, "\n", 1), ==, 1);
  close (fd);

  sl_import_options_init (&options);
  g_assert_null (sl_import_csv (f->project, path, &options, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_cmpstr (error->message, ==, "huge.csv:1: line longer than 1 MiB; not a table of measurements");
  assert_nothing_written (f);
  g_clear_error (&error);

  g_assert_null (sl_import_preview (path, &options, 20, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_cmpstr (error->message, ==, "huge.csv:1: line longer than 1 MiB; not a table of measurements");
  g_unlink (path);
}

/* A long line after good ones refuses the whole file too: the rows read
 * before it are rolled back. */
static void
test_long_line_after_good_rows (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) text = g_string_new ("id,parallax,sptype\nA,1,K0\nB,2,G2\nC,3,");
  g_autoptr (GError) error = NULL;
  g_autofree char *path = NULL;
  SlImportOptions options;

  for (gsize i = 0; i < SL_CSV_MAX_RECORD_BYTES; i++)
    g_string_append_c (text, 'M');
  g_string_append (text, "\nD,4,M0\n");
  path = sl_test_write_file (f->dir, "long.csv", text->str, text->len);

  sl_import_options_init (&options);
  g_assert_null (sl_import_csv (f->project, path, &options, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_cmpstr (error->message, ==, "long.csv:4: line longer than 1 MiB; not a table of measurements");
  assert_nothing_written (f);
}

/* Another program appends to the file while the import reads it. */
static void
append_on_progress (double fraction, gpointer user_data)
{
  const char *path = user_data;
  int fd = open (path, O_WRONLY | O_APPEND);

  g_assert_cmpint (fd, >=, 0);
  g_assert_cmpint (write (fd, "Late,1,0.1\n", 11), ==, 11);
  close (fd);
}

/* Imports NAME, 10,000 rows, while CHANGE (a progress callback, called
 * every 4096 rows) alters it: refused, nothing written.  Returns the
 * file's path. */
static char *
import_while_changing (SlTestProject *f, const char *name, SlProgressFunc change)
{
  g_autoptr (GString) text = g_string_new ("id,parallax,parallax_err\n");
  g_autoptr (GError) error = NULL;
  g_autofree char *want = NULL;
  char *path;
  SlImportOptions options;

  for (int i = 0; i < 10000; i++)
    g_string_append_printf (text, "S%d,%d.5,0.1\n", i, i % 50);
  path = sl_test_write_file (f->dir, name, text->str, text->len);

  sl_import_options_init (&options);
  options.progress = change;
  options.progress_data = path;
  g_assert_null (sl_import_csv (f->project, path, &options, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_IO);
  want = g_strdup_printf ("%s: the file changed while it was read (another program is writing to it); "
                          "nothing was imported: import it again once it is complete", name);
  g_assert_cmpstr (error->message, ==, want);
  assert_nothing_written (f);
  return path;
}

static void
test_file_changes_while_read (SlTestProject *f, gconstpointer data)
{
  g_autofree char *path = import_while_changing (f, "growing.csv", append_on_progress);
  g_autoptr (GError) error = NULL;
  SlImportOptions options;

  /* Once it stands still it imports, appended rows and all. */
  sl_import_options_init (&options);
  {
    g_autoptr (SlImportReport) report = sl_import_csv (f->project, path, &options, &error);

    g_assert_no_error (error);
    g_assert_cmpuint (report->rows_read, ==, 10002);
  }
}

/* Another program truncates the file while the import reads it: refused
 * with the same message, nothing written.  (With the file mapped into
 * memory this ended the process with SIGBUS; it is read into memory now.) */
static void
truncate_on_progress (double fraction, gpointer user_data)
{
  g_assert_cmpint (truncate (user_data, 100), ==, 0);
}

static void
test_file_truncated_while_read (SlTestProject *f, gconstpointer data)
{
  g_free (import_while_changing (f, "shrinking.csv", truncate_on_progress));
}

int
main (int argc, char **argv)
{
  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);

  for (gsize i = 0; i < G_N_ELEMENTS (bad_inputs); i++)
    {
      g_autofree char *path = g_strdup_printf ("/bad-inputs/%s", bad_inputs[i].name);

      g_test_add (path, SlTestProject, &bad_inputs[i], sl_test_project_set_up, test_bad_input,
                  sl_test_project_tear_down);
    }
#define ADD(path, func) g_test_add (path, SlTestProject, NULL, sl_test_project_set_up, func, \
                                        sl_test_project_tear_down)
  ADD ("/bad-inputs/nan-stored-as-null", test_nan_stored_as_null);
  ADD ("/bad-inputs/200-mb-single-line", test_huge_single_line);
  ADD ("/bad-inputs/long-line-after-good-rows", test_long_line_after_good_rows);
  ADD ("/bad-inputs/file-truncated-while-read", test_file_truncated_while_read);
  ADD ("/bad-inputs/file-changes-while-read", test_file_changes_while_read);
#undef ADD

  return g_test_run ();
}
