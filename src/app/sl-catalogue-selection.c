/* sl-catalogue-selection.c: a multiple selection that is only a bitset:
 * selecting never fetches an item. */
#include "sl-catalogue-selection.h"

struct _SlCatalogueSelection {
  GObject     parent_instance;

  GListModel *model;
  GtkBitset  *selected;   /* positions in model */
};

static void sl_catalogue_selection_list_model_init (GListModelInterface *iface);
static void sl_catalogue_selection_selection_model_init (GtkSelectionModelInterface *iface);

G_DEFINE_FINAL_TYPE_WITH_CODE (SlCatalogueSelection, sl_catalogue_selection, G_TYPE_OBJECT,
                               G_IMPLEMENT_INTERFACE (G_TYPE_LIST_MODEL, sl_catalogue_selection_list_model_init)
                               G_IMPLEMENT_INTERFACE (GTK_TYPE_SELECTION_MODEL,
                                                      sl_catalogue_selection_selection_model_init))

static GType
sl_catalogue_selection_get_item_type (GListModel *list)
{
  return g_list_model_get_item_type (SL_CATALOGUE_SELECTION (list)->model);
}

static guint
sl_catalogue_selection_get_n_items (GListModel *list)
{
  return g_list_model_get_n_items (SL_CATALOGUE_SELECTION (list)->model);
}

static gpointer
sl_catalogue_selection_get_item (GListModel *list, guint position)
{
  return g_list_model_get_item (SL_CATALOGUE_SELECTION (list)->model, position);
}

static void
sl_catalogue_selection_list_model_init (GListModelInterface *iface)
{
  iface->get_item_type = sl_catalogue_selection_get_item_type;
  iface->get_n_items = sl_catalogue_selection_get_n_items;
  iface->get_item = sl_catalogue_selection_get_item;
}

static gboolean
sl_catalogue_selection_is_selected (GtkSelectionModel *model, guint position)
{
  return gtk_bitset_contains (SL_CATALOGUE_SELECTION (model)->selected, position);
}

/* The whole set: outside the range its values are allowed to be anything. */
static GtkBitset *
sl_catalogue_selection_get_selection_in_range (GtkSelectionModel *model, guint position, guint n_items)
{
  return gtk_bitset_ref (SL_CATALOGUE_SELECTION (model)->selected);
}

/* The interface's other methods (select_item, select_all, ...) default to
 * this one. */
static gboolean
sl_catalogue_selection_set_selection (GtkSelectionModel *model, GtkBitset *selected, GtkBitset *mask)
{
  SlCatalogueSelection *self = SL_CATALOGUE_SELECTION (model);
  g_autoptr (GtkBitset) changes = gtk_bitset_copy (selected);
  guint n = g_list_model_get_n_items (self->model), min, max;

  /* changes = (self->selected XOR selected) AND mask, within the model */
  gtk_bitset_difference (changes, self->selected);
  gtk_bitset_intersect (changes, mask);
  gtk_bitset_remove_range_closed (changes, n, G_MAXUINT);
  if (gtk_bitset_is_empty (changes))
    return TRUE;

  gtk_bitset_difference (self->selected, changes);
  min = gtk_bitset_get_minimum (changes);
  max = gtk_bitset_get_maximum (changes);
  gtk_selection_model_selection_changed (model, min, max - min + 1);
  return TRUE;
}

static void
sl_catalogue_selection_selection_model_init (GtkSelectionModelInterface *iface)
{
  iface->is_selected = sl_catalogue_selection_is_selected;
  iface->get_selection_in_range = sl_catalogue_selection_get_selection_in_range;
  iface->set_selection = sl_catalogue_selection_set_selection;
}

static void
on_items_changed (GListModel *model, guint position, guint removed, guint added, SlCatalogueSelection *self)
{
  gtk_bitset_splice (self->selected, position, removed, added);
  g_list_model_items_changed (G_LIST_MODEL (self), position, removed, added);
}

static void
sl_catalogue_selection_dispose (GObject *object)
{
  SlCatalogueSelection *self = SL_CATALOGUE_SELECTION (object);

  if (self->model)
    g_signal_handlers_disconnect_by_func (self->model, on_items_changed, self);
  g_clear_object (&self->model);
  G_OBJECT_CLASS (sl_catalogue_selection_parent_class)->dispose (object);
}

static void
sl_catalogue_selection_finalize (GObject *object)
{
  SlCatalogueSelection *self = SL_CATALOGUE_SELECTION (object);

  gtk_bitset_unref (self->selected);
  G_OBJECT_CLASS (sl_catalogue_selection_parent_class)->finalize (object);
}

static void
sl_catalogue_selection_class_init (SlCatalogueSelectionClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->dispose = sl_catalogue_selection_dispose;
  object_class->finalize = sl_catalogue_selection_finalize;
}

static void
sl_catalogue_selection_init (SlCatalogueSelection *self)
{
  self->selected = gtk_bitset_new_empty ();
}

SlCatalogueSelection *
sl_catalogue_selection_new (GListModel *model)
{
  SlCatalogueSelection *self;

  g_return_val_if_fail (G_IS_LIST_MODEL (model), NULL);

  self = g_object_new (SL_TYPE_CATALOGUE_SELECTION, NULL);
  self->model = g_object_ref (model);
  g_signal_connect (model, "items-changed", G_CALLBACK (on_items_changed), self);
  return self;
}
