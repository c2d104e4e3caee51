/* export.h: writing a project's stars as a table, CSV or LaTeX.
 *
 * CSV (RFC 4180): every numeric quantity q is three columns, q, q_lo and
 * q_hi: the value and the bounds of its 68% interval (DESIGN.md); an empty
 * cell is no value; the flags column lists flags separated by '|'.  LaTeX:
 * a tabular with each value and its (asymmetric) uncertainty rounded to
 * the uncertainty's significant digits.  A file is written to a temporary
 * name and renamed into place, so a failed export never leaves half a file.
 */
#pragma once

#include <gio/gio.h>

#include "project.h"

G_BEGIN_DECLS

typedef enum {
  SL_EXPORT_CSV,
  SL_EXPORT_TEX,
} SlExportFormat;

typedef struct {
  SlExportFormat     format;
  const char *const *columns;  /* names, NULL-terminated; NULL: every input, derived value and flags */
  GCancellable      *cancellable;
  const char        *list;     /* only the stars of this list (lists.h); NULL: every star */
} SlExportOptions;

/* Writes the table to PATH, or to standard output when PATH is "-".
 * Returns the number of stars written, or -1 on error. */
gint64 sl_export (SlProject *project, const char *path, const SlExportOptions *options,
                  GError **error);

/* The names --columns accepts, in table order. */
GPtrArray *sl_export_column_names (void);

G_END_DECLS
