/* sl-catalogue-view.h: the Catalogue: a table of the project's stars with
 * chosen columns (inputs and derived values, each value with its interval
 * rounded to the uncertainty's digits, flags as small icons with a tooltip
 * each), sortable by any column.  Backed by SlCatalogueModel, a GListModel
 * over the project database with a paged cache: smooth at a million stars
 * without one object per star in memory. */
#pragma once

#include <gtk/gtk.h>

#include "project.h"

G_BEGIN_DECLS

#define SL_TYPE_CATALOGUE_VIEW (sl_catalogue_view_get_type ())
G_DECLARE_FINAL_TYPE (SlCatalogueView, sl_catalogue_view, SL, CATALOGUE_VIEW, GtkWidget)

SlCatalogueView *sl_catalogue_view_new (void);

/* Shows PATH's stars (opens its own read connection); NULL clears. */
gboolean sl_catalogue_view_set_project (SlCatalogueView *view, const char *path, GError **error);

/* Re-reads the rows after the project changed (import, derive). */
void     sl_catalogue_view_reload (SlCatalogueView *view);

/* Shows only the stars of target list LIST; NULL: every star (re-reads
 * the rows as reload does). */
void     sl_catalogue_view_set_list (SlCatalogueView *view, const char *list);

/* Selects (and scrolls to) the stars named; NULL: none. */
void     sl_catalogue_view_set_selection (SlCatalogueView *view, const char *const *designations);

/* The columns shown, by name (SlCatalogueColumnInfo.name), in order;
 * unknown names are left out, none shows the usual columns
 * (sl_catalogue_default_columns).  Also the "columns" property, and the
 * actions catalogue.toggle-column (s: a column's name) and
 * catalogue.reset-columns of the chooser at the table's top right. */
void     sl_catalogue_view_set_columns (SlCatalogueView *view, const char *const *names);
char   **sl_catalogue_view_get_columns (SlCatalogueView *view);

/* For tests only (tests/test-gui.c): the columns' menu button. */
GtkWidget *sl_catalogue_view_get_column_chooser (SlCatalogueView *view);

/* For tests only (tests/test-gui.c): the table's selection model, whose
 * items are the SlCatalogueRow of the stars shown (borrowed). */
GtkSelectionModel *sl_catalogue_view_get_selection_model (SlCatalogueView *view);

/* Signals:
 *   "selection-changed" (GStrv designations)
 *   "cell-activated" (const char *designation, const char *quantity):
 *       a click on a value: the window shows its trail. */

G_END_DECLS
