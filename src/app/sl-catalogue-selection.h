/* sl-catalogue-selection.h: a multiple selection over a list model that
 * keeps only a bitset of positions.
 *
 * GtkMultiSelection (GTK 4.8) also fetches and holds every selected item
 * so that it can follow items across items-changed: selecting all of a
 * million stars would read every page of SlCatalogueModel and keep a
 * million rows alive.  The Catalogue restores its selection by
 * designation after a sort or reload instead, so it needs none of that.
 */
#pragma once

#include <gtk/gtk.h>

G_BEGIN_DECLS

#define SL_TYPE_CATALOGUE_SELECTION (sl_catalogue_selection_get_type ())
G_DECLARE_FINAL_TYPE (SlCatalogueSelection, sl_catalogue_selection, SL, CATALOGUE_SELECTION, GObject)

/* A selection over MODEL (referenced); nothing selected.  Items changed
 * in MODEL drop the selection of the positions replaced. */
SlCatalogueSelection *sl_catalogue_selection_new (GListModel *model);

G_END_DECLS
