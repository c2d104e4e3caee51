/* csv-reader.c: record boundaries and line numbers here, quoting in libcsv. */
#include "csv-reader.h"
#include <inttypes.h>

#include <csv.h>
#include <glib/gi18n.h>
#include <string.h>

#include "sl-error.h"

struct _SlCsvReader {
  const char *data;
  gsize       length;
  gsize       offset;       /* start of the next unread line */
  guint       line;         /* physical line number at offset, 1-based */
  char        delimiter;

  struct csv_parser parser;
  GByteArray *field_bytes;  /* the current record's fields, NUL-separated */
  GArray     *field_starts; /* offsets into field_bytes */
  GPtrArray  *fields;       /* pointers into field_bytes, rebuilt per record */
  guint       records_seen; /* record ends libcsv reported for this chunk */
};

static const unsigned char csv_options = CSV_STRICT | CSV_STRICT_FINI | CSV_APPEND_NULL;

const char *
sl_csv_delimiter_name (char delimiter)
{
  switch (delimiter)
    {
    case ',':  return "comma";
    case ';':  return "semicolon";
    case '\t': return "tab";
    case '|':  return "vertical bar";
    default:   return "other";
    }
}

/* libcsv trims blanks around unquoted fields; with tab as the delimiter
 * only spaces are blanks. */
static int
is_space_only (unsigned char c)
{
  return c == CSV_SPACE;
}

static int
is_space_or_tab (unsigned char c)
{
  return c == CSV_SPACE || c == CSV_TAB;
}

static void
init_parser (SlCsvReader *reader)
{
  csv_init (&reader->parser, csv_options);
  csv_set_delim (&reader->parser, (unsigned char) reader->delimiter);
  csv_set_space_func (&reader->parser,
                      reader->delimiter == '\t' ? is_space_only : is_space_or_tab);
}

static gboolean
is_blank_line (const char *p, const char *end)
{
  for (; p < end; p++)
    if (*p != ' ' && *p != '\t' && *p != '\r')
      return FALSE;
  return TRUE;
}

/* Where the record scanner is within a record (RFC 4180 section 2). */
typedef enum {
  AT_FIELD_START,
  IN_UNQUOTED,     /* a quote here is a literal; libcsv's strict mode rejects it */
  IN_QUOTED,
  AFTER_QUOTE,     /* a quote inside a quoted field: "" or the closing one */
} ScanState;

/* Finds the end of the record starting at START (the '\n' that ends it, or
 * the end of data) and counts the newlines inside quotes.  Only a quote at
 * the start of a field opens a quoted field, so a stray quote cannot swallow
 * the rest of the file. */
static const char *
find_record_end (const char *start, const char *end, char delimiter,
                 guint *inner_newlines, gboolean *unterminated)
{
  const char *nl = memchr (start, '\n', end - start);
  const char *line_end = nl ? nl : end;
  ScanState state = AT_FIELD_START;

  *inner_newlines = 0;
  *unterminated = FALSE;
  /* Most lines have no quote at all. */
  if (memchr (start, '"', line_end - start) == NULL)
    return line_end;

  for (const char *p = start; p < end; p++)
    {
      char c = *p;

      switch (state)
        {
        case AT_FIELD_START:
          if (c == '"')
            state = IN_QUOTED;
          else if (c == '\n')
            return p;
          else if (c != delimiter && c != ' ' && c != '\t')
            state = IN_UNQUOTED;
          break;
        case IN_UNQUOTED:
          if (c == '\n')
            return p;
          if (c == delimiter)
            state = AT_FIELD_START;
          break;
        case IN_QUOTED:
          if (c == '"')
            state = AFTER_QUOTE;
          else if (c == '\n')
            (*inner_newlines)++;
          break;
        case AFTER_QUOTE:
          if (c == '\n')
            return p;
          state = c == '"' ? IN_QUOTED : c == delimiter ? AT_FIELD_START : IN_UNQUOTED;
          break;
        }
    }
  *unterminated = state == IN_QUOTED;
  return end;
}

static char
detect_delimiter (const char *line, const char *end)
{
  static const char candidates[] = { ',', ';', '\t' };
  guint counts[G_N_ELEMENTS (candidates)] = { 0 };
  gboolean in_quotes = FALSE;
  guint best = 0;

  for (const char *p = line; p < end && *p != '\n'; p++)
    {
      if (*p == '"')
        in_quotes = !in_quotes;
      else if (!in_quotes)
        for (guint i = 0; i < G_N_ELEMENTS (candidates); i++)
          counts[i] += (*p == candidates[i]);
    }
  for (guint i = 1; i < G_N_ELEMENTS (candidates); i++)
    if (counts[i] > counts[best])
      best = i;
  return candidates[best];
}

/* Skips blank and comment lines from reader->offset; returns FALSE at the
 * end of the data. */
static gboolean
skip_to_record (SlCsvReader *reader)
{
  const char *end = reader->data + reader->length;

  while (reader->offset < reader->length)
    {
      const char *line = reader->data + reader->offset;
      const char *nl = memchr (line, '\n', end - line);
      const char *line_end = nl ? nl : end;

      if (*line != '#' && !is_blank_line (line, line_end))
        return TRUE;
      reader->offset = (nl ? nl + 1 : end) - reader->data;
      reader->line++;
    }
  return FALSE;
}

SlCsvReader *
sl_csv_reader_new (const char *data, gsize length, char delimiter,
                   const char *file_name, GError **error)
{
  SlCsvReader *reader;
  const char *nul;

  g_return_val_if_fail (delimiter == 0 || delimiter == ',' || delimiter == ';'
                        || delimiter == '\t', NULL);

  nul = memchr (data, '\0', length);
  if (nul != NULL)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   _("%s: not a text file (a NUL byte at offset %" PRIu64 ")"),
                   file_name, (guint64) (nul - data));
      return NULL;
    }
  if (memchr (data, '\n', length) == NULL && memchr (data, '\r', length) != NULL)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   _("%s: lines end in CR only (an old Mac text file); "
                     "convert it to LF or CRLF line ends"), file_name);
      return NULL;
    }

  reader = g_new0 (SlCsvReader, 1);
  reader->data = data;
  reader->length = length;
  reader->line = 1;
  if (length >= 3 && memcmp (data, "\xEF\xBB\xBF", 3) == 0)
    reader->offset = 3;

  reader->delimiter = delimiter;
  if (delimiter == 0)
    {
      gsize saved_offset = reader->offset;
      guint saved_line = reader->line;

      reader->delimiter = skip_to_record (reader)
                            ? detect_delimiter (data + reader->offset,
                                                data + MIN (length, reader->offset + SL_CSV_MAX_RECORD_BYTES))
                            : ',';
      reader->offset = saved_offset;
      reader->line = saved_line;
    }

  reader->field_bytes = g_byte_array_new ();
  reader->field_starts = g_array_new (FALSE, FALSE, sizeof (gsize));
  reader->fields = g_ptr_array_new ();
  init_parser (reader);
  return reader;
}

char
sl_csv_reader_get_delimiter (SlCsvReader *reader)
{
  return reader->delimiter;
}

gsize
sl_csv_reader_get_offset (SlCsvReader *reader)
{
  return reader->offset;
}

static void
on_field (void *text, size_t len, void *user_data)
{
  SlCsvReader *reader = user_data;
  gsize start = reader->field_bytes->len;

  g_array_append_val (reader->field_starts, start);
  g_byte_array_append (reader->field_bytes, text ? text : (void *) "", len);
  g_byte_array_append (reader->field_bytes, (const guint8 *) "", 1);
}

static void
on_record_end (int terminator, void *user_data)
{
  SlCsvReader *reader = user_data;

  reader->records_seen++;
}

/* Splits RAW into fields with libcsv; returns why it failed, or NULL. */
static const char *
split_fields (SlCsvReader *reader, const char *raw, gsize raw_len)
{
  const char *problem = NULL;

  g_byte_array_set_size (reader->field_bytes, 0);
  g_array_set_size (reader->field_starts, 0);
  reader->records_seen = 0;

  if (csv_parse (&reader->parser, raw, raw_len, on_field, on_record_end, reader) != raw_len
      || csv_fini (&reader->parser, on_field, on_record_end, reader) != 0)
    {
      problem = N_("malformed quoting (a quote inside an unquoted field, or text after a closing quote)");
      csv_free (&reader->parser);
      init_parser (reader);
    }
  else if (reader->records_seen > 1)
    problem = N_("a stray carriage return inside the row");

  g_ptr_array_set_size (reader->fields, 0);
  for (guint i = 0; i < reader->field_starts->len; i++)
    g_ptr_array_add (reader->fields,
                     reader->field_bytes->data + g_array_index (reader->field_starts, gsize, i));
  return problem;
}

gboolean
sl_csv_reader_next (SlCsvReader *reader, SlCsvRecord *record)
{
  const char *start, *end, *limit, *record_end;
  guint inner_newlines;
  gboolean unterminated;
  gsize raw_len;

  if (!skip_to_record (reader))
    return FALSE;

  start = reader->data + reader->offset;
  end = reader->data + reader->length;
  /* The scan stops one byte past the longest record split. */
  limit = (gsize) (end - start) > SL_CSV_MAX_RECORD_BYTES ? start + SL_CSV_MAX_RECORD_BYTES + 1 : end;
  record_end = find_record_end (start, limit, reader->delimiter, &inner_newlines, &unterminated);
  if (record_end == limit && limit < end)
    {
      const char *nl = memchr (limit, '\n', end - limit);

      record->line = reader->line;
      record->raw = start;
      record->raw_len = SL_CSV_MAX_RECORD_BYTES;
      record->malformed = N_("the line is too long");
      record->too_long = TRUE;
      record->n_fields = 0;
      record->fields = NULL;
      /* Quotes are not followed past the bound: the record ends at the
       * next line end. */
      reader->line++;
      reader->offset = (nl ? nl + 1 : end) - reader->data;
      return TRUE;
    }
  record->too_long = FALSE;
  raw_len = record_end - start;
  if (raw_len > 0 && start[raw_len - 1] == '\r')
    raw_len--;

  record->line = reader->line;
  record->raw = start;
  record->raw_len = raw_len;
  record->malformed = unterminated ? N_("a quoted field is never closed")
                                   : split_fields (reader, start, raw_len);
  record->n_fields = reader->fields->len;
  record->fields = (char *const *) reader->fields->pdata;
  if (unterminated)
    record->n_fields = 0;

  reader->line += inner_newlines + 1;
  reader->offset = (record_end < end ? record_end + 1 : end) - reader->data;
  return TRUE;
}

void
sl_csv_reader_free (SlCsvReader *reader)
{
  if (reader == NULL)
    return;
  csv_free (&reader->parser);
  g_byte_array_unref (reader->field_bytes);
  g_array_unref (reader->field_starts);
  g_ptr_array_unref (reader->fields);
  g_free (reader);
}
