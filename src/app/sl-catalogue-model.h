/* sl-catalogue-model.h: the stars of a project as a GListModel of
 * SlCatalogueRow, for the Catalogue.
 *
 * A million stars without a million objects: the model keeps the star ids
 * in display order (8 bytes a star, sorted in SQL) and reads rows on
 * demand, a page of SL_CATALOGUE_MODEL_PAGE_ROWS at a time, keeping at
 * most SL_CATALOGUE_MODEL_MAX_PAGES pages (least recently used dropped).
 * Sorting replaces the id order and announces every item removed, then
 * every item added (two signals); rows are never re-sorted one by one.
 * A page reads only the columns shown (one query built from them, joining
 * only what they need), so a column costs nothing while it is hidden.  The model reads through a connection
 * of its own, made read-only; WAL lets it read while another connection
 * writes.
 */
#pragma once

#include <gio/gio.h>

#include "sl-catalogue-row.h"

G_BEGIN_DECLS

#define SL_CATALOGUE_MODEL_PAGE_ROWS 256
#define SL_CATALOGUE_MODEL_MAX_PAGES 16

#define SL_TYPE_CATALOGUE_MODEL (sl_catalogue_model_get_type ())
G_DECLARE_FINAL_TYPE (SlCatalogueModel, sl_catalogue_model, SL, CATALOGUE_MODEL, GObject)

SlCatalogueModel *sl_catalogue_model_new (void);

/* Shows PATH's stars in the model's current order; NULL: none.  On an
 * error the model is left empty. */
gboolean  sl_catalogue_model_set_project (SlCatalogueModel *self, const char *path, GError **error);
const char *sl_catalogue_model_get_path  (SlCatalogueModel *self);

/* Shows only the stars of target list LIST (lists.h); NULL: every star.
 * Takes effect at the next set_project, reload or sort (sync or async);
 * a list that does not exist (any longer) shows no stars. */
void        sl_catalogue_model_set_list (SlCatalogueModel *self, const char *list);
const char *sl_catalogue_model_get_list (SlCatalogueModel *self);

/* The columns the rows are read with (the table's shown columns, in its
 * order; duplicates dropped).  The default: sl_catalogue_default_columns.
 * With a project, the rows held are dropped and announced as every row
 * removed and added again (the same order).  A row's other columns are
 * missing. */
gboolean  sl_catalogue_model_set_columns (SlCatalogueModel *self, const SlCatalogueColumn *columns,
                                          guint n_columns, GError **error);
const SlCatalogueColumn *sl_catalogue_model_get_columns (SlCatalogueModel *self, guint *n_columns);

/* Reads the stars again (after an import or a derivation), keeping the
 * order. */
gboolean  sl_catalogue_model_reload (SlCatalogueModel *self, GError **error);

/* Orders the stars by COLUMN (SL_CATALOGUE_COLUMN_NONE: by id), missing
 * values last in both directions, ties by id. */
gboolean  sl_catalogue_model_sort (SlCatalogueModel *self, SlCatalogueColumn column, gboolean descending,
                                   GError **error);
/* The order asked for last (shown, or being computed by an async call). */
void      sl_catalogue_model_get_sort (SlCatalogueModel *self, SlCatalogueColumn *column, gboolean *descending);

/* The same two off the main thread: the model keeps showing the old order
 * until the new one is ready (seconds at a million stars), then swaps.  A
 * later request, set_project or a sync call supersedes a pending one,
 * which then fails with G_IO_ERROR_CANCELLED. */
void      sl_catalogue_model_sort_async   (SlCatalogueModel *self, SlCatalogueColumn column, gboolean descending,
                                           GCancellable *cancellable, GAsyncReadyCallback callback,
                                           gpointer user_data);
void      sl_catalogue_model_reload_async (SlCatalogueModel *self, GCancellable *cancellable,
                                           GAsyncReadyCallback callback, gpointer user_data);
gboolean  sl_catalogue_model_order_finish (SlCatalogueModel *self, GAsyncResult *result, GError **error);

/* The positions (ascending) of the stars named; unknown names are
 * skipped.  A GArray of guint. */
GArray   *sl_catalogue_model_find (SlCatalogueModel *self, const char *const *designations);

/* The designations at N_POSITIONS positions, in that order (GStrv). */
char    **sl_catalogue_model_get_designations (SlCatalogueModel *self, const guint *positions,
                                               guint n_positions);

/* Rows held in the page cache (for tests): at most
 * SL_CATALOGUE_MODEL_PAGE_ROWS * SL_CATALOGUE_MODEL_MAX_PAGES. */
guint     sl_catalogue_model_get_cached_rows (SlCatalogueModel *self);

/* For tests: page queries run so far, and the SQL of the page query for
 * the shown columns (a new string). */
guint     sl_catalogue_model_get_pages_read (SlCatalogueModel *self);
char     *sl_catalogue_model_get_page_sql (SlCatalogueModel *self);

G_END_DECLS
