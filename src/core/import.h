/* import.h: bringing a CSV file of measurements into a project.
 *
 * One file is one source.  Each row becomes one measurement of one star
 * (joined by designation, or with a match radius by position: see
 * matching.h), in canonical units, with the line it came from.
 * A row with a bad value is rejected with its line, column and reason and
 * kept in rejected_rows; the import goes on.  The whole import is one
 * transaction: a failure or a cancel leaves the project as it was.
 *
 * sl_import_preview reads only the header and the first rows and says how
 * the import would map the columns (the import's own mapping code); a dry
 * run (options.dry_run) is the whole import, rolled back at the end.
 */
#pragma once

#include <gio/gio.h>

#include "matching.h"
#include "project.h"
#include "vocabulary.h"

G_BEGIN_DECLS

/* One --map FIELD=COLUMN[:UNIT]. */
typedef struct {
  SlField field;
  char   *column;   /* header name as written in the file */
  SlUnit  unit;     /* SL_UNIT_NONE: the field's canonical unit */
} SlColumnMap;

/* Parses FIELD=COLUMN[:UNIT].  The unit is split off at the last ':' only
 * when what follows is a unit name, so a column may contain ':'. */
gboolean sl_column_map_parse (const char *spec, SlColumnMap *map, GError **error);
void     sl_column_map_clear (SlColumnMap *map);

typedef void (*SlProgressFunc) (double fraction, gpointer user_data);

typedef struct {
  char           delimiter;     /* ',', ';', '\t', or 0 to detect */
  const SlColumnMap *maps;      /* explicit mappings, may be NULL */
  guint          n_maps;
  const char *const *missing;   /* extra missing-value tokens, NULL-terminated, may be NULL */
  double         epoch;         /* Julian year for rows without an epoch column; NAN: none */
  const char    *source_name;   /* NULL: the file's base name */
  gboolean       again;         /* import a file whose SHA-256 was imported before */
  gboolean       explicit_only; /* take only the columns in MAPS; no header name maps itself */
  gboolean       dry_run;       /* do everything, then roll back: the report of an import
                                 * that writes nothing (source_id is the one it would get) */
  double         match_radius;  /* arcsec: join rows to stars by position (matching.h); 0: by id */
  GCancellable  *cancellable;
  SlProgressFunc progress;      /* called now and then with the fraction read */
  gpointer       progress_data;
} SlImportOptions;

void sl_import_options_init (SlImportOptions *options);

typedef struct {
  guint  line;
  char  *column;    /* NULL when the row as a whole is at fault */
  char  *reason;
} SlRejection;

typedef struct {
  gint64     source_id;
  char      *file_name;       /* base name, for FILE:LINE messages */
  char      *sha256;
  char       delimiter;
  guint64    rows_read;
  guint64    rows_accepted;
  guint64    new_stars;
  GArray    *rejections;      /* SlRejection, in file order */
  GPtrArray *ignored_columns; /* header names that map to no field */
  GPtrArray *notes;           /* things the user should know, one sentence each */
  /* With a match radius: */
  guint64    matched;         /* rows joined to an existing star by position */
  GArray    *ambiguous;       /* SlAmbiguousRow: rows made stars of their own, in order found */
  double     match_epoch;     /* the common epoch, Julian year; NAN: none */
  GPtrArray *warnings;        /* values that look wrong though valid (a unit mismatch),
                               * one sentence each, naming the file and column */
} SlImportReport;

SlImportReport *sl_import_csv (SlProject *project, const char *path,
                               const SlImportOptions *options, GError **error);

void sl_import_report_free (SlImportReport *report);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlImportReport, sl_import_report_free)

/* One header column as an import with given options would take it. */
typedef struct {
  char     *name;          /* the header text, blanks stripped */
  SlField   field;         /* the field it is imported as; SL_FIELD_NONE: not imported */
  SlUnit    unit;          /* the unit it is read in (the field's canonical one unless mapped) */
  gboolean  explicit_map;  /* FIELD comes from options->maps, not from the name */
  SlField   automatic;     /* what the import maps it to with no maps; SL_FIELD_NONE: nothing */
} SlPreviewColumn;

/* One data record of the file's start, as split (quotes removed, blanks kept). */
typedef struct {
  guint  line;             /* first physical line, 1-based */
  GStrv  cells;
  char  *malformed;        /* NULL, or why the record could not be split */
} SlPreviewRow;

typedef struct {
  char      *file_name;        /* base name */
  char       delimiter;        /* as detected, or as given */
  gboolean   delimiter_given;  /* options->delimiter was not 0 */
  guint      header_line;
  GArray    *columns;          /* SlPreviewColumn, in header order */
  GPtrArray *rows;             /* SlPreviewRow *, the first max_rows data records */
  gboolean   more_rows;        /* the file holds more records than ROWS */
  char      *mapping_problem;  /* why the import would stop before reading a row
                                * (no id column, a map naming no column, ...); NULL: none */
  gsize      bytes_read;       /* how much of the file's start was read for this */
} SlImportPreview;

/* The delimiter, header, first MAX_ROWS records and column mapping of the
 * CSV file at PATH under OPTIONS (delimiter, maps, explicit_only).  Reads
 * only the file's start, enough for those records (a record longer than
 * SL_CSV_MAX_RECORD_BYTES is refused, as the import refuses it).  Fails
 * only when the file cannot be read as CSV at all (unreadable, not a
 * regular file, empty, binary, no header); a mapping that would stop the
 * import is mapping_problem. */
SlImportPreview *sl_import_preview (const char *path, const SlImportOptions *options,
                                    guint max_rows, GError **error);
void             sl_import_preview_free (SlImportPreview *preview);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlImportPreview, sl_import_preview_free)

G_END_DECLS
