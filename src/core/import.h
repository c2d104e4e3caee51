/* import.h: bringing a CSV file of measurements into a project.
 *
 * One file is one source.  Each row becomes one measurement of one star
 * (joined by designation, or with a match radius by position: see
 * matching.h), in canonical units, with the line it came from.
 * A row with a bad value is rejected with its line, column and reason and
 * kept in rejected_rows; the import goes on.  The whole import is one
 * transaction: a failure or a cancel leaves the project as it was.
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
} SlImportReport;

SlImportReport *sl_import_csv (SlProject *project, const char *path,
                               const SlImportOptions *options, GError **error);

void sl_import_report_free (SlImportReport *report);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlImportReport, sl_import_report_free)

G_END_DECLS
