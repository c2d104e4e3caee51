/* export.h: writing a project's stars as an RFC 4180 CSV table.
 *
 * Every numeric quantity q is three columns, q, q_lo and q_hi: the value
 * and the bounds of its 68% interval (DESIGN.md); an empty cell is no
 * value.  The file is written to a temporary name and renamed into place,
 * so a failed export never leaves half a file.
 */
#pragma once

#include <gio/gio.h>

#include "project.h"

G_BEGIN_DECLS

typedef struct {
  const char *const *columns;  /* quantity names, NULL-terminated; NULL: all */
  GCancellable      *cancellable;
} SlExportOptions;

/* Writes the table to PATH, or to standard output when PATH is "-".
 * Returns the number of stars written, or -1 on error. */
gint64 sl_export_csv (SlProject *project, const char *path,
                      const SlExportOptions *options, GError **error);

/* The quantity names --columns accepts, in table order. */
GPtrArray *sl_export_column_names (void);

G_END_DECLS
