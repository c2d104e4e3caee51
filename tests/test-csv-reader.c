/* test-csv-reader.c: records, fields and line numbers out of CSV text in
 * memory (src/core/csv-reader.c).
 *
 * Outside reference: RFC 4180 (quoting, doubled quotes, line breaks inside
 * quoted fields, CRLF).  Comment and blank lines, the byte-order mark, the
 * delimiter detection and the line numbers in messages follow common
 * practice of spreadsheet exports and compilers' FILE:LINE messages.
 */
#include <string.h>

#include "csv-reader.h"
#include "sl-error.h"
#include "test-util.h"

/* A record copied out of the reader, whose texts only last until the
 * next call. */
typedef struct {
  guint  line;
  char **fields;
  char  *raw;
  char  *malformed;
} Record;

static void
record_free (gpointer data)
{
  Record *rec = data;

  g_strfreev (rec->fields);
  g_free (rec->raw);
  g_free (rec->malformed);
  g_free (rec);
}

static Record *
record_copy (const SlCsvRecord *record)
{
  Record *rec = g_new0 (Record, 1);

  rec->line = record->line;
  rec->fields = g_new0 (char *, record->n_fields + 1);
  for (guint i = 0; i < record->n_fields; i++)
    rec->fields[i] = g_strdup (record->fields[i]);
  rec->raw = g_strndup (record->raw, record->raw_len);
  g_assert_cmpuint (strlen (rec->raw), ==, record->raw_len);
  rec->malformed = g_strdup (record->malformed);
  return rec;
}

/* Reads every record of DATA (LENGTH -1: a string) with DELIMITER (0:
 * detect) and checks the offset only ever grows, to LENGTH at the end. */
static GPtrArray *
read_all (const char *data, gssize length, char delimiter, char *detected)
{
  gsize len = length < 0 ? strlen (data) : (gsize) length;
  g_autoptr (GError) error = NULL;
  g_autoptr (SlCsvReader) reader = sl_csv_reader_new (data, len, delimiter, "test.csv", &error);
  GPtrArray *records = g_ptr_array_new_with_free_func (record_free);
  SlCsvRecord record;
  gsize offset = 0;

  g_assert_no_error (error);
  g_assert_nonnull (reader);
  if (detected)
    *detected = sl_csv_reader_get_delimiter (reader);
  while (sl_csv_reader_next (reader, &record))
    {
      g_assert_cmpuint (sl_csv_reader_get_offset (reader), >, offset);
      offset = sl_csv_reader_get_offset (reader);
      g_ptr_array_add (records, record_copy (&record));
    }
  g_assert_cmpuint (sl_csv_reader_get_offset (reader), ==, len);
  g_assert_false (sl_csv_reader_next (reader, &record));
  return records;
}

#define REC(records, i) ((Record *) g_ptr_array_index ((records), (i)))

/* Checks record I: its line, its fields (NULL-terminated) and that it is
 * well formed. */
static void
assert_record (GPtrArray *records, guint i, guint line, const char *const *fields)
{
  Record *rec;

  g_assert_cmpuint (i, <, records->len);
  rec = REC (records, i);
  g_assert_null (rec->malformed);
  g_assert_cmpuint (rec->line, ==, line);
  g_assert_cmpstrv (rec->fields, fields);
}

#define FIELDS(...) ((const char *const[]) { __VA_ARGS__, NULL })

/* ---- delimiters --------------------------------------------------------- */

static void
assert_detected (const char *data, char want)
{
  char got = 0;
  g_autoptr (GPtrArray) records = read_all (data, -1, 0, &got);

  g_assert_cmpint (got, ==, want);
  assert_record (records, 0, 1, FIELDS ("id", "ra", "dec"));
  assert_record (records, 1, 2, FIELDS ("LHO 1", "10.5", "-3.25"));
  g_assert_cmpuint (records->len, ==, 2);
}

/* Common practice: spreadsheets in comma-decimal locales write ';', and
 * tab-separated values are the other usual export. */
static void
test_detect_comma (void)
{
  assert_detected ("id,ra,dec\nLHO 1,10.5,-3.25\n", ',');
  g_assert_cmpstr (sl_csv_delimiter_name (','), ==, "comma");
}

static void
test_detect_semicolon (void)
{
  assert_detected ("id;ra;dec\nLHO 1;10.5;-3.25\n", ';');
  g_assert_cmpstr (sl_csv_delimiter_name (';'), ==, "semicolon");
}

static void
test_detect_tab (void)
{
  assert_detected ("id\tra\tdec\nLHO 1\t10.5\t-3.25\n", '\t');
  g_assert_cmpstr (sl_csv_delimiter_name ('\t'), ==, "tab");
}

/* The delimiter counts in the header line, not in comments before it or
 * inside quoted header names. */
static void
test_detect_ignores_comments_and_quotes (void)
{
  char got = 0;
  g_autoptr (GPtrArray) records =
    read_all ("# a, b, c, d, e\n\"x,y\";b;c\n1;2;3\n", -1, 0, &got);

  g_assert_cmpint (got, ==, ';');
  assert_record (records, 0, 2, FIELDS ("x,y", "b", "c"));
  assert_record (records, 1, 3, FIELDS ("1", "2", "3"));
}

/* An explicit delimiter wins over what the header suggests. */
static void
test_explicit_delimiter (void)
{
  char got = 0;
  g_autoptr (GPtrArray) records = read_all ("a;b;c,d\n1;2;3,4\n", -1, ',', &got);

  g_assert_cmpint (got, ==, ',');
  assert_record (records, 0, 1, FIELDS ("a;b;c", "d"));
  assert_record (records, 1, 2, FIELDS ("1;2;3", "4"));
}

/* ---- records and lines -------------------------------------------------- */

static void
test_header_and_records (void)
{
  g_autoptr (GPtrArray) records =
    read_all ("id,ra,dec\nA,1,2\nB,3,4\nC,,6\nD,7,\n", -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 5);
  assert_record (records, 0, 1, FIELDS ("id", "ra", "dec"));
  assert_record (records, 1, 2, FIELDS ("A", "1", "2"));
  assert_record (records, 2, 3, FIELDS ("B", "3", "4"));
  /* RFC 4180: n delimiters make n + 1 fields, empty ones included. */
  assert_record (records, 3, 4, FIELDS ("C", "", "6"));
  assert_record (records, 4, 5, FIELDS ("D", "7", ""));
}

/* Comment and blank lines are skipped but keep their place in the line
 * count, so messages point at the right line of the file. */
static void
test_comments_and_blank_lines (void)
{
  g_autoptr (GPtrArray) records =
    read_all ("# Larkspur Hill\n# units: deg\nid,ra\n\nA,1\n   \n\t\n# aside\nB,2\n\n", -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 3);
  assert_record (records, 0, 3, FIELDS ("id", "ra"));
  assert_record (records, 1, 5, FIELDS ("A", "1"));
  assert_record (records, 2, 9, FIELDS ("B", "2"));
}

/* ---- quoting (RFC 4180, section 2) -------------------------------------- */

static void
test_quoted_delimiter (void)
{
  g_autoptr (GPtrArray) records =
    read_all ("id;sptype;v\n\"LHO 0042\";\"K0 III; Ba\";7.5\n", -1, 0, NULL);

  assert_record (records, 1, 2, FIELDS ("LHO 0042", "K0 III; Ba", "7.5"));
}

/* RFC 4180 2.7: a quote inside a quoted field is written twice. */
static void
test_doubled_quotes (void)
{
  g_autoptr (GPtrArray) records =
    read_all ("id,note\nA,\"say \"\"hi\"\"\"\nB,\"\"\"\"\n", -1, 0, NULL);

  assert_record (records, 1, 2, FIELDS ("A", "say \"hi\""));
  assert_record (records, 2, 3, FIELDS ("B", "\""));
}

/* RFC 4180 2.6: a quoted field may hold a line break; the record starts on
 * its first line and the next record's line counts the break. */
static void
test_quoted_newline (void)
{
  const char *data = "id,note\nA,\"two\nlines\"\nB,x\n";
  g_autoptr (GPtrArray) records = read_all (data, -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 3);
  assert_record (records, 1, 2, FIELDS ("A", "two\nlines"));
  g_assert_cmpstr (REC (records, 1)->raw, ==, "A,\"two\nlines\"");
  assert_record (records, 2, 4, FIELDS ("B", "x"));
}

/* ---- line ends, byte-order mark, end of data ---------------------------- */

/* RFC 4180 2.1: CRLF is the standard line end; no '\r' is left anywhere. */
static void
test_crlf (void)
{
  g_autoptr (GPtrArray) records =
    read_all ("id;v\r\n\r\n# note\r\nA;1\r\nB;\"x\"\r\n", -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 3);
  assert_record (records, 0, 1, FIELDS ("id", "v"));
  assert_record (records, 1, 4, FIELDS ("A", "1"));
  assert_record (records, 2, 5, FIELDS ("B", "x"));
  for (guint i = 0; i < records->len; i++)
    {
      g_assert_null (strchr (REC (records, i)->raw, '\r'));
      for (char **f = REC (records, i)->fields; *f; f++)
        g_assert_null (strchr (*f, '\r'));
    }
  g_assert_cmpstr (REC (records, 1)->raw, ==, "A;1");
}

/* Common practice (Excel "CSV UTF-8"): the byte-order mark is no part of
 * the first header name. */
static void
test_bom_dropped (void)
{
  char got = 0;
  g_autoptr (GPtrArray) records = read_all ("\xEF\xBB\xBFstar;v\r\nA;1\r\n", -1, 0, &got);

  g_assert_cmpint (got, ==, ';');
  assert_record (records, 0, 1, FIELDS ("star", "v"));
  g_assert_cmpstr (REC (records, 0)->raw, ==, "star;v");
  assert_record (records, 1, 2, FIELDS ("A", "1"));
}

/* RFC 4180 2.2: the last record may lack a line end. */
static void
test_last_line_without_newline (void)
{
  g_autoptr (GPtrArray) records = read_all ("id,v\nA,1\nB,2", -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 3);
  assert_record (records, 2, 3, FIELDS ("B", "2"));
  g_assert_cmpstr (REC (records, 2)->raw, ==, "B,2");
}

/* raw is the record exactly as in the file, quotes included, line end not. */
static void
test_raw_bytes (void)
{
  const char *data = "id,v\n\"A,1\",  2 \nB,\"x\"\"y\"\n";
  g_autoptr (GPtrArray) records = read_all (data, -1, 0, NULL);

  g_assert_cmpstr (REC (records, 0)->raw, ==, "id,v");
  g_assert_cmpstr (REC (records, 1)->raw, ==, "\"A,1\",  2 ");
  g_assert_cmpstr (REC (records, 2)->raw, ==, "B,\"x\"\"y\"");
  assert_record (records, 2, 3, FIELDS ("B", "x\"y"));
}

/* ---- malformed records -------------------------------------------------- */

/* RFC 4180 2.5: a quote may only appear in a quoted field.  The bad record
 * is reported, and the records after it are read as usual. */
static void
test_malformed_stray_quote (void)
{
  g_autoptr (GPtrArray) records = read_all ("id,v,w\na,b\"c,d\nB,2,3\nC,4,5\n", -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 4);
  g_assert_nonnull (REC (records, 1)->malformed);
  g_assert_cmpuint (REC (records, 1)->line, ==, 2);
  g_assert_cmpstr (REC (records, 1)->raw, ==, "a,b\"c,d");
  assert_record (records, 2, 3, FIELDS ("B", "2", "3"));
  assert_record (records, 3, 4, FIELDS ("C", "4", "5"));
}

/* RFC 4180 2.5 and 2.7: text after a closing quote, and a field with two
 * stray quotes, are malformed; the reader recovers for the next record. */
static void
test_malformed_text_after_quote (void)
{
  g_autoptr (GPtrArray) records =
    read_all ("id,v\n\"ab\"c,d\nB,2\nx\"y\"z,1\nC,3\n", -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 5);
  g_assert_nonnull (REC (records, 1)->malformed);
  g_assert_cmpuint (REC (records, 1)->line, ==, 2);
  assert_record (records, 2, 3, FIELDS ("B", "2"));
  g_assert_nonnull (REC (records, 3)->malformed);
  g_assert_cmpuint (REC (records, 3)->line, ==, 4);
  assert_record (records, 4, 5, FIELDS ("C", "3"));
}

/* A carriage return alone inside a row would split it in two. */
static void
test_malformed_stray_cr (void)
{
  g_autoptr (GPtrArray) records = read_all ("id,v\nA,1\rB,2\nC,3\n", -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 3);
  g_assert_nonnull (REC (records, 1)->malformed);
  assert_record (records, 2, 3, FIELDS ("C", "3"));
}

/* A quote opened and never closed runs to the end of the data. */
static void
test_unterminated_quote_at_end (void)
{
  g_autoptr (GPtrArray) records = read_all ("id,v\nA,1\nB,\"open\nC,3\n", -1, 0, NULL);

  g_assert_cmpuint (records->len, ==, 3);
  assert_record (records, 1, 2, FIELDS ("A", "1"));
  g_assert_nonnull (REC (records, 2)->malformed);
  g_assert_cmpuint (REC (records, 2)->line, ==, 3);
  g_assert_cmpuint (g_strv_length (REC (records, 2)->fields), ==, 0);
}

/* ---- files that are not CSV text ---------------------------------------- */

static void
assert_refused (const char *data, gsize length, const char *needle)
{
  g_autoptr (GError) error = NULL;
  SlCsvReader *reader = sl_csv_reader_new (data, length, 0, "odd.csv", &error);

  g_assert_null (reader);
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_nonnull (strstr (error->message, "odd.csv"));
  if (strstr (error->message, needle) == NULL)
    g_error ("the message \"%s\" does not mention \"%s\"", error->message, needle);
}

/* A NUL byte means a binary file (common practice, as diff and grep tell
 * binary from text). */
static void
test_nul_byte (void)
{
  static const char data[] = "id,v\nA,\0\n";

  assert_refused (data, sizeof data - 1, "NUL");
}

/* CR-only line ends (classic Mac OS) are not RFC 4180 line ends. */
static void
test_cr_only (void)
{
  const char *data = "id,v\rA,1\rB,2\r";

  assert_refused (data, strlen (data), "CR");
}

/* ---- progress ------------------------------------------------------------ */

static void
test_offset_progress (void)
{
  const char *data = "id,v\nA,1\nB,2\n";
  g_autoptr (GError) error = NULL;
  g_autoptr (SlCsvReader) reader = sl_csv_reader_new (data, strlen (data), 0, "p.csv", &error);
  SlCsvRecord record;

  g_assert_no_error (error);
  g_assert_cmpuint (sl_csv_reader_get_offset (reader), ==, 0);
  g_assert_true (sl_csv_reader_next (reader, &record));
  g_assert_cmpuint (sl_csv_reader_get_offset (reader), ==, 5);
  g_assert_true (sl_csv_reader_next (reader, &record));
  g_assert_cmpuint (sl_csv_reader_get_offset (reader), ==, 9);
  g_assert_true (sl_csv_reader_next (reader, &record));
  g_assert_cmpuint (sl_csv_reader_get_offset (reader), ==, strlen (data));
  g_assert_false (sl_csv_reader_next (reader, &record));
  g_assert_cmpuint (sl_csv_reader_get_offset (reader), ==, strlen (data));
}

/* Empty data and data of comments only have no records. */
static void
test_no_records (void)
{
  g_autoptr (GPtrArray) none = read_all ("", 0, 0, NULL);
  g_autoptr (GPtrArray) comments = read_all ("# only\n\n# comments\n", -1, 0, NULL);

  g_assert_cmpuint (none->len, ==, 0);
  g_assert_cmpuint (comments->len, ==, 0);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/csv-reader/delimiter/comma", test_detect_comma);
  g_test_add_func ("/csv-reader/delimiter/semicolon", test_detect_semicolon);
  g_test_add_func ("/csv-reader/delimiter/tab", test_detect_tab);
  g_test_add_func ("/csv-reader/delimiter/ignores-comments-and-quotes",
                   test_detect_ignores_comments_and_quotes);
  g_test_add_func ("/csv-reader/delimiter/explicit", test_explicit_delimiter);
  g_test_add_func ("/csv-reader/records/header-and-records", test_header_and_records);
  g_test_add_func ("/csv-reader/records/comments-and-blank-lines", test_comments_and_blank_lines);
  g_test_add_func ("/csv-reader/quoting/delimiter-inside", test_quoted_delimiter);
  g_test_add_func ("/csv-reader/quoting/doubled-quotes", test_doubled_quotes);
  g_test_add_func ("/csv-reader/quoting/newline-inside", test_quoted_newline);
  g_test_add_func ("/csv-reader/lines/crlf", test_crlf);
  g_test_add_func ("/csv-reader/lines/bom-dropped", test_bom_dropped);
  g_test_add_func ("/csv-reader/lines/last-without-newline", test_last_line_without_newline);
  g_test_add_func ("/csv-reader/lines/raw-bytes", test_raw_bytes);
  g_test_add_func ("/csv-reader/malformed/stray-quote", test_malformed_stray_quote);
  g_test_add_func ("/csv-reader/malformed/text-after-quote", test_malformed_text_after_quote);
  g_test_add_func ("/csv-reader/malformed/stray-cr", test_malformed_stray_cr);
  g_test_add_func ("/csv-reader/malformed/unterminated-quote", test_unterminated_quote_at_end);
  g_test_add_func ("/csv-reader/refused/nul-byte", test_nul_byte);
  g_test_add_func ("/csv-reader/refused/cr-only", test_cr_only);
  g_test_add_func ("/csv-reader/offset/progress", test_offset_progress);
  g_test_add_func ("/csv-reader/offset/no-records", test_no_records);

  return g_test_run ();
}
