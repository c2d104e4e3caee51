/* csv-reader.h: RFC 4180 records out of a file in memory, with the line
 * each record starts on.
 *
 * libcsv does the quoting; this reader finds record boundaries itself so
 * that every record knows its first physical line (records may span lines
 * inside quotes), skips blank lines and '#' comment lines, drops a UTF-8
 * byte-order mark, accepts LF and CRLF, and detects the delimiter (comma,
 * semicolon or tab) from the header line.
 */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

typedef struct _SlCsvReader SlCsvReader;

typedef struct {
  guint         line;       /* first physical line, 1-based */
  guint         n_fields;
  char  *const *fields;     /* NUL-terminated field texts, quotes removed */
  const char   *raw;        /* the record's bytes as in the file, without its line end */
  gsize         raw_len;
  const char   *malformed;  /* NULL, or why libcsv could not split the record (English) */
  gboolean      too_long;   /* longer than SL_CSV_MAX_RECORD_BYTES: not split, raw cut there */
} SlCsvRecord;

/* The longest record the reader splits.  Real tables of measurements have
 * lines of a few hundred bytes; a longer one is not such a table, and the
 * bound keeps a huge single-line file from being copied into memory. */
#define SL_CSV_MAX_RECORD_BYTES ((gsize) 1 << 20)
#define SL_CSV_MAX_RECORD_MIB 1

/* Reads DATA (not copied; must outlive the reader).  DELIMITER is ',', ';'
 * or '\t', or 0 to detect it.  FILE_NAME is only for messages.  Fails on a
 * binary file (NUL bytes) and on CR-only line ends. */
SlCsvReader *sl_csv_reader_new (const char *data, gsize length, char delimiter,
                                const char *file_name, GError **error);

char         sl_csv_reader_get_delimiter (SlCsvReader *reader);

/* Fills RECORD with the next record; FALSE at the end of the data.  The
 * record's texts are valid until the next call. */
gboolean     sl_csv_reader_next (SlCsvReader *reader, SlCsvRecord *record);

/* How far the reader has got, in bytes, for progress reports. */
gsize        sl_csv_reader_get_offset (SlCsvReader *reader);

void         sl_csv_reader_free (SlCsvReader *reader);

/* A delimiter's name for messages and the source record: "comma", ... */
const char  *sl_csv_delimiter_name (char delimiter);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlCsvReader, sl_csv_reader_free)

G_END_DECLS
