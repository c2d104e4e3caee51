/* summary.h: what a project holds, in numbers: stars, sources with their
 * import counts, measurements, rejected rows, ledger entries. */
#pragma once

#include "project.h"

G_BEGIN_DECLS

typedef struct {
  gint64  id;
  char   *name;
  char   *file_name;
  char   *sha256;
  char   *imported_by;
  char   *imported_at;
  char   *delimiter;
  char   *mapping;        /* JSON */
  gint64  rows_accepted;
  gint64  rows_rejected;
} SlSourceInfo;

typedef struct {
  gint64     n_stars;
  gint64     n_measurements;
  gint64     n_rejected;
  gint64     n_ledger;
  gint64     n_derived;      /* stars with derived values */
  gint64     n_stale;        /* of which inputs changed since their run */
  gint64     n_runs;         /* derivation runs */
  int        schema_version;
  GPtrArray *sources;     /* SlSourceInfo, oldest first */
} SlProjectSummary;

SlProjectSummary *sl_project_summary (SlProject *project, GError **error);
void              sl_project_summary_free (SlProjectSummary *summary);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlProjectSummary, sl_project_summary_free)

G_END_DECLS
