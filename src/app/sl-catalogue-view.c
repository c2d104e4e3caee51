/* sl-catalogue-view.c: the Catalogue: a GtkColumnView over SlCatalogueModel.
 *
 * Contents:
 *   cells ............ a label per cell (numbers right-aligned, tabular
 *                      figures), the flags as icons with a tooltip
 *   clicks ........... a click on a value, Enter or a double click: "cell-activated"
 *   sorting .......... header clicks become an order computed in SQL
 *   selection ........ kept as designations, so it survives sorts and reloads
 *   the project ...... sl_catalogue_view_set_project, _reload, _set_list
 *   columns .......... which columns are shown, in which order: the
 *                      "columns" property, the chooser and its actions
 *
 * The selection model is SlCatalogueSelection, a bitset: GtkMultiSelection
 * would fetch (and keep) every selected row, all million of them after
 * Ctrl+A.
 *
 * Scrolling to a selected star: GTK 4.8 has no gtk_column_view_scroll_to,
 * so the view activates "list.scroll-to-item" on the column view's inner
 * GtkListView (the action its rows use to scroll to the focused row),
 * which brings the row into view.  That happens on set_selection and after
 * a sort; a reload keeps the scroll position instead.
 */
#include "sl-catalogue-view.h"

#include <glib/gi18n.h>
#include <string.h>

#include "derive/derive.h"
#include "sl-catalogue-model.h"
#include "sl-catalogue-selection.h"

/* Flags that question a value get the warning icon; the others say how a
 * value was obtained. */
#define WARNING_FLAGS                                                                        \
  (SL_FLAG_NONPOSITIVE_PARALLAX | SL_FLAG_LOW_PARALLAX_SNR | SL_FLAG_PRIOR_DOMINATED        \
   | SL_FLAG_COLOUR_OUT_OF_RANGE | SL_FLAG_TEFF_OUT_OF_RANGE | SL_FLAG_SPTYPE_NOT_DWARF      \
   | SL_FLAG_SOURCES_DISAGREE)

/* What a click on a cell of a column without a quantity of its own shows. */
#define DEFAULT_QUANTITY "lum"

/* A click and the activation it starts (a double click) are one request. */
#define SAME_CLICK_US (G_USEC_PER_SEC / 2)

/* What a column's factory and marker sorter need to know. */
typedef struct {
  SlCatalogueView     *view;     /* not referenced: the columns die with it */
  SlCatalogueColumn    column;
  GtkColumnViewColumn *gtk_column;  /* owned; in the column view while shown */
  GtkCheckButton      *check;       /* its check button in the chooser */
} ColumnData;

struct _SlCatalogueView {
  GtkWidget             parent_instance;

  GtkWidget            *box;               /* the strip over the table */
  GtkWidget            *scroller;
  GtkWidget            *chooser;           /* the columns' menu button */
  GtkColumnView        *column_view;
  SlCatalogueModel     *model;
  SlCatalogueSelection *selection;
  ColumnData            columns[SL_CATALOGUE_N_COLUMNS];
  SlCatalogueColumn     shown[SL_CATALOGUE_N_COLUMNS];   /* in the table's order */
  guint                 n_shown;
  gboolean              arranging;         /* the columns are being put in place here */
  guint                 follow_drag;       /* idle source reading a dragged order */

  /* Which header sorts: the column view's sorter compares two probe items
   * and the marker sorter it asks first says who it is. */
  GObject              *probe[2];
  gboolean              probing;
  SlCatalogueColumn     probed_column;

  GCancellable         *ordering;          /* the pending sort or reload */
  GStrv                 selected;          /* selected designations; NULL: none */
  gboolean              updating;          /* selection changes made here, not by the user */
  guint                 clicked_position;  /* the last cell clicked ... */
  SlCatalogueColumn     clicked_column;
  gint64                clicked_at;        /* ... and when, monotonic us */

  /* A reload shows the same order again: the rows stay where they were. */
  gboolean              reloading;         /* a reload is pending */
  double                scroll;            /* px, the vertical scroll before the rows were replaced */
  guint                 restore_scroll;    /* idle source putting it back */
};

G_DEFINE_FINAL_TYPE (SlCatalogueView, sl_catalogue_view, GTK_TYPE_WIDGET)

enum {
  SELECTION_CHANGED,
  CELL_ACTIVATED,
  N_SIGNALS
};

static guint signals[N_SIGNALS];

enum {
  PROP_0,
  PROP_COLUMNS,
  N_PROPS
};

static GParamSpec *properties[N_PROPS];

/* The quantity a click on COLUMN explains: its own, if it has one. */
static const char *
quantity_of (SlCatalogueColumn column)
{
  const SlCatalogueColumnInfo *info = column < SL_CATALOGUE_N_COLUMNS ? sl_catalogue_column_info (column) : NULL;

  return info && (info->field != SL_FIELD_NONE || info->quantity != SL_Q_NONE) ? info->name : DEFAULT_QUANTITY;
}

/* ------------------------------------------------------------------ */
/* Clicks                                                             */

static void
emit_cell_activated (SlCatalogueView *self, guint position, SlCatalogueColumn column)
{
  g_auto (GStrv) designation = sl_catalogue_model_get_designations (self->model, &position, 1);

  if (designation[0] != NULL)
    g_signal_emit (self, signals[CELL_ACTIVATED], 0, designation[0], quantity_of (column));
}

/* A press on a cell: the row's selection is the column view's business
 * (the press goes on to it); the value's trail is ours. */
static void
on_cell_pressed (GtkGestureClick *gesture, int n_press, double x, double y, GtkListItem *list_item)
{
  GtkWidget *cell = gtk_event_controller_get_widget (GTK_EVENT_CONTROLLER (gesture));
  SlCatalogueView *self = SL_CATALOGUE_VIEW (gtk_widget_get_ancestor (cell, SL_TYPE_CATALOGUE_VIEW));
  ColumnData *data = g_object_get_data (G_OBJECT (gesture), "sl-column");
  guint position = gtk_list_item_get_position (list_item);

  if (self == NULL || n_press != 1 || position == GTK_INVALID_LIST_POSITION)
    return;
  self->clicked_position = position;
  self->clicked_column = data->column;
  self->clicked_at = g_get_monotonic_time ();
  emit_cell_activated (self, position, data->column);
}

static void
add_click (GtkWidget *cell, GtkListItem *list_item, ColumnData *data)
{
  GtkGesture *click = gtk_gesture_click_new ();

  gtk_gesture_single_set_button (GTK_GESTURE_SINGLE (click), GDK_BUTTON_PRIMARY);
  g_object_set_data (G_OBJECT (click), "sl-column", data);
  g_signal_connect (click, "pressed", G_CALLBACK (on_cell_pressed), list_item);
  gtk_widget_add_controller (cell, GTK_EVENT_CONTROLLER (click));
}

/* Enter, or the second click of a double click (whose first click has
 * already shown the value clicked). */
static void
on_activate (GtkColumnView *column_view, guint position, SlCatalogueView *self)
{
  gboolean same_row = position == self->clicked_position;

  if (same_row && g_get_monotonic_time () - self->clicked_at < SAME_CLICK_US)
    return;
  emit_cell_activated (self, position, same_row ? self->clicked_column : SL_CATALOGUE_COLUMN_NONE);
}

/* ------------------------------------------------------------------ */
/* Cells                                                              */

static void
setup_label (GtkSignalListItemFactory *factory, GtkListItem *list_item, ColumnData *data)
{
  GtkWidget *label = gtk_label_new (NULL);
  gboolean is_text = sl_catalogue_column_info (data->column)->kind == SL_CATALOGUE_KIND_TEXT;
  SlCatalogueKind kind;

  gtk_label_set_xalign (GTK_LABEL (label), is_text ? 0.0f : 1.0f);
  gtk_label_set_ellipsize (GTK_LABEL (label), PANGO_ELLIPSIZE_END);
  gtk_label_set_single_line_mode (GTK_LABEL (label), TRUE);
  if (!is_text)
    gtk_widget_add_css_class (label, "numeric");
  /* GTK 4.8 has no column-header tooltip: the cells say the frame and
   * epoch (export --epoch gives positions at another epoch). */
  kind = sl_catalogue_column_info (data->column)->kind;
  if (kind == SL_CATALOGUE_KIND_RA || kind == SL_CATALOGUE_KIND_DEC)
    gtk_widget_set_tooltip_text (label, _("ICRS, at each star's catalogue epoch"));
  add_click (label, list_item, data);
  gtk_list_item_set_child (list_item, label);
}

static void
bind_label (GtkSignalListItemFactory *factory, GtkListItem *list_item, ColumnData *data)
{
  SlCatalogueRow *row = gtk_list_item_get_item (list_item);
  g_autofree char *text = sl_catalogue_row_format (row, data->column);

  gtk_label_set_text (GTK_LABEL (gtk_list_item_get_child (list_item)), text);
}

/* The flags' explanations, one a line, for the tooltip. */
static gboolean
on_flags_query_tooltip (GtkWidget *cell, int x, int y, gboolean keyboard, GtkTooltip *tooltip,
                        GtkListItem *list_item)
{
  SlCatalogueRow *row = gtk_list_item_get_item (list_item);
  g_autoptr (GString) markup = g_string_new (NULL);
  guint32 flags = 0;
  gboolean stale = FALSE;

  if (row == NULL || !sl_catalogue_row_get_flags (row, &flags, &stale))
    return FALSE;
  for (guint i = 0; i < SL_N_FLAGS; i++)
    {
      const SlFlagInfo *info = sl_flag_info (i);
      g_autofree char *line = NULL;

      if (!(flags & info->flag))
        continue;
      line = g_markup_printf_escaped ("%s<b>%s</b>: %s", markup->len ? "\n" : "", info->name, _(info->explanation));
      g_string_append (markup, line);
    }
  if (stale)
    {
      g_autofree char *line = g_markup_printf_escaped (
        "%s<b>%s</b>: %s", markup->len ? "\n" : "", _("stale"),
        _("The inputs changed after these values were derived: derive again."));

      g_string_append (markup, line);
    }
  if (markup->len == 0)
    return FALSE;
  gtk_tooltip_set_markup (tooltip, markup->str);
  return TRUE;
}

static GtkWidget *
flag_icon (GtkWidget *box, const char *icon_name, const char *style_class)
{
  GtkWidget *image = gtk_image_new_from_icon_name (icon_name);

  if (style_class)
    gtk_widget_add_css_class (image, style_class);
  gtk_widget_set_visible (image, FALSE);
  gtk_box_append (GTK_BOX (box), image);
  return image;
}

/* Three icons, shown as the flags ask: warning, information, stale. */
static void
setup_flags (GtkSignalListItemFactory *factory, GtkListItem *list_item, ColumnData *data)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 2);

  flag_icon (box, "dialog-warning-symbolic", "warning");
  flag_icon (box, "dialog-information-symbolic", "dim-label");
  flag_icon (box, "view-refresh-symbolic", "dim-label");
  gtk_widget_set_halign (box, GTK_ALIGN_START);
  gtk_widget_set_has_tooltip (box, TRUE);
  g_signal_connect (box, "query-tooltip", G_CALLBACK (on_flags_query_tooltip), list_item);
  add_click (box, list_item, data);
  gtk_list_item_set_child (list_item, box);
}

static void
bind_flags (GtkSignalListItemFactory *factory, GtkListItem *list_item, ColumnData *data)
{
  SlCatalogueRow *row = gtk_list_item_get_item (list_item);
  GtkWidget *warning = gtk_widget_get_first_child (gtk_list_item_get_child (list_item));
  GtkWidget *information = gtk_widget_get_next_sibling (warning);
  GtkWidget *stale_icon = gtk_widget_get_next_sibling (information);
  guint32 flags = 0;
  gboolean stale = FALSE;

  sl_catalogue_row_get_flags (row, &flags, &stale);
  gtk_widget_set_visible (warning, (flags & WARNING_FLAGS) != 0);
  gtk_widget_set_visible (information, (flags & ~WARNING_FLAGS) != 0);
  gtk_widget_set_visible (stale_icon, stale);
}

/* ------------------------------------------------------------------ */
/* Selection                                                          */

/* Selects the rows of self->selected (without telling anyone: the caller
 * knows), and with SCROLL brings the first into view. */
static void
apply_selection (SlCatalogueView *self, gboolean scroll)
{
  guint n = g_list_model_get_n_items (G_LIST_MODEL (self->model));
  g_autoptr (GArray) positions = sl_catalogue_model_find (self->model, (const char *const *) self->selected);
  g_autoptr (GtkBitset) selected = gtk_bitset_new_empty ();
  g_autoptr (GtkBitset) everything = gtk_bitset_new_range (0, n);

  for (guint i = 0; i < positions->len; i++)
    gtk_bitset_add (selected, g_array_index (positions, guint, i));
  self->updating = TRUE;
  gtk_selection_model_set_selection (GTK_SELECTION_MODEL (self->selection), selected, everything);
  self->updating = FALSE;

  if (scroll && positions->len > 0)
    for (GtkWidget *child = gtk_widget_get_first_child (GTK_WIDGET (self->column_view)); child;
         child = gtk_widget_get_next_sibling (child))
      if (GTK_IS_LIST_VIEW (child))
        {
          gtk_widget_activate_action (child, "list.scroll-to-item", "u", g_array_index (positions, guint, 0));
          break;
        }
}

static void
on_selection_changed (GtkSelectionModel *model, guint position, guint n_items, SlCatalogueView *self)
{
  g_autoptr (GtkBitset) set = NULL;
  g_autoptr (GArray) positions = NULL;
  GtkBitsetIter iter;
  guint value;

  if (self->updating)
    return;
  set = gtk_selection_model_get_selection (model);
  positions = g_array_sized_new (FALSE, FALSE, sizeof (guint), (guint) gtk_bitset_get_size (set));
  for (gboolean more = gtk_bitset_iter_init_first (&iter, set, &value); more;
       more = gtk_bitset_iter_next (&iter, &value))
    g_array_append_val (positions, value);
  g_strfreev (self->selected);
  self->selected = sl_catalogue_model_get_designations (self->model, (const guint *) positions->data, positions->len);
  g_signal_emit (self, signals[SELECTION_CHANGED], 0, self->selected);
}

static gboolean
restore_scroll (gpointer data)
{
  SlCatalogueView *self = data;

  self->restore_scroll = 0;
  gtk_adjustment_set_value (gtk_scrollable_get_vadjustment (GTK_SCROLLABLE (self->column_view)), self->scroll);
  return G_SOURCE_REMOVE;
}

/* After the model showed another order or project (all rows removed,
 * then all added): the same stars stay selected, wherever they are now.
 * After a reload the table keeps its scroll position (set once the new
 * rows are laid out); after a sort it shows the first selected star. */
static void
on_model_items_changed (GListModel *model, guint position, guint removed, guint added, SlCatalogueView *self)
{
  self->clicked_position = GTK_INVALID_LIST_POSITION;   /* another star's row now */
  if (added == 0)
    {
      self->scroll = gtk_adjustment_get_value (gtk_scrollable_get_vadjustment (GTK_SCROLLABLE (self->column_view)));
      return;
    }
  apply_selection (self, !self->reloading);
  if (self->reloading && self->restore_scroll == 0)
    self->restore_scroll = g_idle_add (restore_scroll, self);
  self->reloading = FALSE;
}

void
sl_catalogue_view_set_selection (SlCatalogueView *view, const char *const *designations)
{
  g_return_if_fail (SL_IS_CATALOGUE_VIEW (view));

  g_strfreev (view->selected);
  view->selected = g_strdupv ((char **) designations);
  apply_selection (view, TRUE);
}

/* ------------------------------------------------------------------ */
/* Sorting                                                            */

static int
marker_compare (gconstpointer a, gconstpointer b, gpointer user_data)
{
  ColumnData *data = user_data;

  if (!data->view->probing)
    return GTK_ORDERING_EQUAL;
  data->view->probed_column = data->column;
  return GTK_ORDERING_SMALLER;
}

/* The column whose header shows the sort arrow, and its direction.  (GTK
 * 4.10 has gtk_column_view_sorter_get_primary_sort_column; 4.8 only lets
 * us ask the sorter to compare.) */
static SlCatalogueColumn
primary_sort (SlCatalogueView *self, gboolean *descending)
{
  GtkSorter *sorter = gtk_column_view_get_sorter (self->column_view);
  GtkOrdering order;

  self->probed_column = SL_CATALOGUE_COLUMN_NONE;
  self->probing = TRUE;
  order = gtk_sorter_compare (sorter, self->probe[0], self->probe[1]);
  self->probing = FALSE;
  *descending = order == GTK_ORDERING_LARGER;
  return self->probed_column;
}

static void
on_order_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  g_autoptr (SlCatalogueView) self = user_data;
  g_autoptr (GError) error = NULL;

  /* Cancelled: superseded by a newer request, which owns the cursor now. */
  if (!sl_catalogue_model_order_finish (SL_CATALOGUE_MODEL (source), result, &error)
      && g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED))
    return;
  if (error)
    g_warning ("the Catalogue cannot order the stars: %s", error->message);
  gtk_widget_set_cursor (GTK_WIDGET (self), NULL);
}

static void
start_ordering (SlCatalogueView *self)
{
  g_cancellable_cancel (self->ordering);
  g_clear_object (&self->ordering);
  self->ordering = g_cancellable_new ();
  gtk_widget_set_cursor_from_name (GTK_WIDGET (self), "progress");
}

static void
on_sorter_changed (GtkSorter *sorter, GtkSorterChange change, SlCatalogueView *self)
{
  gboolean descending;
  SlCatalogueColumn column = primary_sort (self, &descending);

  start_ordering (self);
  self->reloading = FALSE;
  sl_catalogue_model_sort_async (self->model, column, descending, self->ordering, on_order_done,
                                 g_object_ref (self));
}

/* ------------------------------------------------------------------ */
/* The project                                                        */

gboolean
sl_catalogue_view_set_project (SlCatalogueView *view, const char *path, GError **error)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_VIEW (view), FALSE);

  /* The model keeps the order the headers asked for last. */
  g_cancellable_cancel (view->ordering);
  view->reloading = FALSE;
  gtk_widget_set_cursor (GTK_WIDGET (view), NULL);
  return sl_catalogue_model_set_project (view->model, path, error);
}

void
sl_catalogue_view_reload (SlCatalogueView *view)
{
  g_return_if_fail (SL_IS_CATALOGUE_VIEW (view));

  start_ordering (view);
  view->reloading = TRUE;
  sl_catalogue_model_reload_async (view->model, view->ordering, on_order_done, g_object_ref (view));
}

void
sl_catalogue_view_set_list (SlCatalogueView *view, const char *list)
{
  g_return_if_fail (SL_IS_CATALOGUE_VIEW (view));

  sl_catalogue_model_set_list (view->model, list);
  sl_catalogue_view_reload (view);
}

/* ------------------------------------------------------------------ */
/* Columns                                                            */

/* The check buttons say what is shown (without acting on it). */
static void
sync_checks (SlCatalogueView *self)
{
  gboolean shown[SL_CATALOGUE_N_COLUMNS] = { FALSE };

  for (guint i = 0; i < self->n_shown; i++)
    shown[self->shown[i]] = TRUE;
  self->arranging = TRUE;
  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    if (self->columns[c].check)
      gtk_check_button_set_active (self->columns[c].check, shown[c]);
  self->arranging = FALSE;
}

/* Shows COLUMNS (N of them, no duplicates) in that order: the column
 * view's columns replaced, the sort arrow kept where its column stays,
 * the model told to read those columns (the rows stay where they were). */
static void
show_columns (SlCatalogueView *self, const SlCatalogueColumn *columns, guint n)
{
  GListModel *current = gtk_column_view_get_columns (self->column_view);
  GtkSorter *sorter = gtk_column_view_get_sorter (self->column_view);
  g_autoptr (GError) error = NULL;
  gboolean descending, sorted_stays = FALSE;
  SlCatalogueColumn sorted = primary_sort (self, &descending);

  g_assert (n > 0 && n <= SL_CATALOGUE_N_COLUMNS);
  memmove (self->shown, columns, n * sizeof *columns);
  self->n_shown = n;

  self->arranging = TRUE;
  g_signal_handlers_block_by_func (sorter, on_sorter_changed, self);
  while (g_list_model_get_n_items (current) > 0)
    {
      g_autoptr (GtkColumnViewColumn) column = g_list_model_get_item (current, 0);

      gtk_column_view_remove_column (self->column_view, column);
    }
  for (guint i = 0; i < n; i++)
    {
      gtk_column_view_append_column (self->column_view, self->columns[self->shown[i]].gtk_column);
      sorted_stays |= self->shown[i] == sorted;
    }
  if (sorted_stays)
    gtk_column_view_sort_by_column (self->column_view, self->columns[sorted].gtk_column,
                                    descending ? GTK_SORT_DESCENDING : GTK_SORT_ASCENDING);
  g_signal_handlers_unblock_by_func (sorter, on_sorter_changed, self);
  self->arranging = FALSE;

  /* The rows are read again with the new columns, in the same order. */
  self->reloading = sl_catalogue_model_get_path (self->model) != NULL;
  if (!sl_catalogue_model_set_columns (self->model, self->shown, n, &error))
    g_warning ("the Catalogue cannot read these columns: %s", error->message);
  self->reloading = FALSE;
  /* The stars were in the order of a column now hidden: back to the
   * order they entered the project, as the headers say. */
  if (sorted != SL_CATALOGUE_COLUMN_NONE && !sorted_stays)
    on_sorter_changed (sorter, GTK_SORTER_CHANGE_DIFFERENT, self);
  sync_checks (self);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_COLUMNS]);
}

void
sl_catalogue_view_set_columns (SlCatalogueView *view, const char *const *names)
{
  SlCatalogueColumn columns[SL_CATALOGUE_N_COLUMNS];
  gboolean seen[SL_CATALOGUE_N_COLUMNS] = { FALSE };
  guint n = 0;

  g_return_if_fail (SL_IS_CATALOGUE_VIEW (view));

  for (guint i = 0; names && names[i]; i++)
    {
      SlCatalogueColumn c;

      /* A name from another version of the program: left out. */
      if (!sl_catalogue_column_from_name (names[i], &c) || seen[c])
        continue;
      seen[c] = TRUE;
      columns[n++] = c;
    }
  if (n == 0)
    {
      const SlCatalogueColumn *usual = sl_catalogue_default_columns (&n);

      memcpy (columns, usual, n * sizeof *usual);
    }
  if (n == view->n_shown && memcmp (columns, view->shown, n * sizeof *columns) == 0)
    return;
  show_columns (view, columns, n);
}

char **
sl_catalogue_view_get_columns (SlCatalogueView *view)
{
  g_autoptr (GStrvBuilder) builder = g_strv_builder_new ();

  g_return_val_if_fail (SL_IS_CATALOGUE_VIEW (view), NULL);

  for (guint i = 0; i < view->n_shown; i++)
    g_strv_builder_add (builder, sl_catalogue_column_info (view->shown[i])->name);
  return g_strv_builder_end (builder);
}

/* Shows or hides the column named by the string PARAMETER.  A column
 * shown goes where the chooser lists it, after the shown columns listed
 * before it; the last column shown stays. */
static void
toggle_column_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlCatalogueView *self = SL_CATALOGUE_VIEW (widget);
  SlCatalogueColumn columns[SL_CATALOGUE_N_COLUMNS], column;
  guint n = 0, at = 0;
  gboolean shown = FALSE;

  if (!sl_catalogue_column_from_name (g_variant_get_string (parameter, NULL), &column))
    {
      g_warning ("the Catalogue has no column %s", g_variant_get_string (parameter, NULL));
      return;
    }
  for (guint i = 0; i < self->n_shown; i++)
    {
      if (self->shown[i] == column)
        shown = TRUE;
      else
        columns[n++] = self->shown[i];
      if (self->shown[i] < column)
        at = n;
    }
  if (shown && n == 0)
    {
      sync_checks (self);
      return;
    }
  if (!shown)
    {
      memmove (columns + at + 1, columns + at, (n - at) * sizeof *columns);
      columns[at] = column;
      n++;
    }
  show_columns (self, columns, n);
}

static void
reset_columns_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  sl_catalogue_view_set_columns (SL_CATALOGUE_VIEW (widget), NULL);
}

static void
on_check_toggled (GtkCheckButton *check, ColumnData *data)
{
  if (data->view->arranging)
    return;
  gtk_widget_activate_action (GTK_WIDGET (data->view), "catalogue.toggle-column", "s",
                              sl_catalogue_column_info (data->column)->name);
}

/* A header dragged elsewhere: the order shown is the user's order now
 * (read once the column view has settled). */
static gboolean
follow_drag (gpointer data)
{
  SlCatalogueView *self = data;
  GListModel *current = gtk_column_view_get_columns (self->column_view);
  guint n = g_list_model_get_n_items (current);

  self->follow_drag = 0;
  if (n != self->n_shown)
    return G_SOURCE_REMOVE;
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (GtkColumnViewColumn) column = g_list_model_get_item (current, i);

      for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
        if (self->columns[c].gtk_column == column)
          self->shown[i] = c;
    }
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_COLUMNS]);
  return G_SOURCE_REMOVE;
}

static void
on_columns_changed (GListModel *list, guint position, guint removed, guint added, SlCatalogueView *self)
{
  if (!self->arranging && self->follow_drag == 0)
    self->follow_drag = g_idle_add (follow_drag, self);
}

/* A heading and the check buttons of GROUP, one under another, in GRID's
 * column X. */
static void
add_group (SlCatalogueView *self, GtkGrid *grid, int x, SlCatalogueGroup group, const char *heading)
{
  GtkWidget *label = gtk_label_new (heading);
  int y = 1;

  gtk_label_set_xalign (GTK_LABEL (label), 0.0f);
  gtk_widget_add_css_class (label, "heading");
  gtk_widget_set_margin_start (label, 6);
  gtk_widget_set_margin_bottom (label, 4);
  gtk_grid_attach (grid, label, x, 0, 1, 1);
  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    {
      const SlCatalogueColumnInfo *info = sl_catalogue_column_info (c);
      GtkWidget *check;

      if (info->group != group)
        continue;
      check = gtk_check_button_new_with_label (_(info->title));
      gtk_widget_set_tooltip_text (check, sl_catalogue_column_describe (c));
      g_signal_connect (check, "toggled", G_CALLBACK (on_check_toggled), &self->columns[c]);
      self->columns[c].check = GTK_CHECK_BUTTON (check);
      gtk_grid_attach (grid, check, x, y++, 1, 1);
    }
}

/* The strip over the table: its name, and the columns' menu button with
 * the chooser: Measured and Derived side by side, then the reset. */
static GtkWidget *
make_strip (SlCatalogueView *self)
{
  GtkWidget *strip = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 0);
  GtkWidget *label = gtk_label_new (_("Catalogue"));
  GtkWidget *content = gtk_box_new (GTK_ORIENTATION_VERTICAL, 8);
  GtkWidget *grid = gtk_grid_new ();
  GtkWidget *scroller = gtk_scrolled_window_new ();
  GtkWidget *reset = gtk_button_new_with_mnemonic (_("_Reset to the Usual Columns"));
  GtkWidget *popover = gtk_popover_new ();

  gtk_widget_set_margin_start (strip, 8);
  gtk_widget_set_margin_end (strip, 2);
  gtk_label_set_xalign (GTK_LABEL (label), 0.0f);
  gtk_widget_set_hexpand (label, TRUE);
  gtk_widget_add_css_class (label, "dim-label");
  gtk_widget_add_css_class (label, "caption-heading");
  gtk_box_append (GTK_BOX (strip), label);

  gtk_grid_set_column_spacing (GTK_GRID (grid), 18);
  add_group (self, GTK_GRID (grid), 0, SL_CATALOGUE_GROUP_MEASURED, _("Measured"));
  add_group (self, GTK_GRID (grid), 1, SL_CATALOGUE_GROUP_DERIVED, _("Derived"));
  gtk_actionable_set_action_name (GTK_ACTIONABLE (reset), "catalogue.reset-columns");
  gtk_widget_set_halign (reset, GTK_ALIGN_END);
  /* On a small screen the list scrolls; the reset stays in sight. */
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (scroller), GTK_POLICY_NEVER, GTK_POLICY_AUTOMATIC);
  gtk_scrolled_window_set_propagate_natural_height (GTK_SCROLLED_WINDOW (scroller), TRUE);
  gtk_scrolled_window_set_propagate_natural_width (GTK_SCROLLED_WINDOW (scroller), TRUE);
  gtk_scrolled_window_set_max_content_height (GTK_SCROLLED_WINDOW (scroller), 640);
  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (scroller), grid);
  gtk_box_append (GTK_BOX (content), scroller);
  gtk_box_append (GTK_BOX (content), reset);
  gtk_widget_set_margin_top (content, 6);
  gtk_widget_set_margin_bottom (content, 6);
  gtk_widget_set_margin_start (content, 6);
  gtk_widget_set_margin_end (content, 6);
  gtk_popover_set_child (GTK_POPOVER (popover), content);

  self->chooser = gtk_menu_button_new ();
  gtk_menu_button_set_icon_name (GTK_MENU_BUTTON (self->chooser), "view-more-symbolic");
  gtk_menu_button_set_popover (GTK_MENU_BUTTON (self->chooser), popover);
  gtk_widget_add_css_class (self->chooser, "flat");
  gtk_widget_set_valign (self->chooser, GTK_ALIGN_CENTER);
  gtk_widget_set_tooltip_text (self->chooser, _("Choose Columns"));
  gtk_box_append (GTK_BOX (strip), self->chooser);
  return strip;
}

GtkWidget *
sl_catalogue_view_get_column_chooser (SlCatalogueView *view)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_VIEW (view), NULL);
  return view->chooser;
}

/* ------------------------------------------------------------------ */
/* Construction                                                       */

/* Every column, shown or not, made once: showing one is appending it. */
static void
make_columns (SlCatalogueView *self)
{
  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    {
      const SlCatalogueColumnInfo *info = sl_catalogue_column_info (c);
      ColumnData *data = &self->columns[c];
      GtkListItemFactory *factory = gtk_signal_list_item_factory_new ();
      g_autoptr (GtkSorter) marker = NULL;

      data->view = self;
      data->column = c;
      if (info->kind == SL_CATALOGUE_KIND_FLAGS)
        {
          g_signal_connect (factory, "setup", G_CALLBACK (setup_flags), data);
          g_signal_connect (factory, "bind", G_CALLBACK (bind_flags), data);
        }
      else
        {
          g_signal_connect (factory, "setup", G_CALLBACK (setup_label), data);
          g_signal_connect (factory, "bind", G_CALLBACK (bind_label), data);
        }
      data->gtk_column = gtk_column_view_column_new (_(info->title), factory);
      gtk_column_view_column_set_resizable (data->gtk_column, TRUE);
      gtk_column_view_column_set_fixed_width (data->gtk_column, info->width);
      /* Only a marker: the model sorts in SQL (primary_sort). */
      marker = GTK_SORTER (gtk_custom_sorter_new (marker_compare, data, NULL));
      gtk_column_view_column_set_sorter (data->gtk_column, marker);
    }
}

static void
sl_catalogue_view_dispose (GObject *object)
{
  SlCatalogueView *self = SL_CATALOGUE_VIEW (object);

  g_cancellable_cancel (self->ordering);
  g_clear_object (&self->ordering);
  g_clear_handle_id (&self->restore_scroll, g_source_remove);
  g_clear_handle_id (&self->follow_drag, g_source_remove);
  if (self->model)
    g_signal_handlers_disconnect_by_func (self->model, on_model_items_changed, self);
  if (self->selection)
    g_signal_handlers_disconnect_by_func (self->selection, on_selection_changed, self);
  if (self->column_view)
    {
      g_signal_handlers_disconnect_by_func (gtk_column_view_get_sorter (self->column_view), on_sorter_changed, self);
      g_signal_handlers_disconnect_by_func (gtk_column_view_get_columns (self->column_view), on_columns_changed,
                                            self);
    }
  g_clear_pointer (&self->box, gtk_widget_unparent);
  self->scroller = NULL;
  self->column_view = NULL;
  self->chooser = NULL;
  for (SlCatalogueColumn c = 0; c < SL_CATALOGUE_N_COLUMNS; c++)
    {
      g_clear_object (&self->columns[c].gtk_column);
      self->columns[c].check = NULL;
    }
  g_clear_object (&self->selection);
  g_clear_object (&self->model);
  g_clear_object (&self->probe[0]);
  g_clear_object (&self->probe[1]);
  g_clear_pointer (&self->selected, g_strfreev);
  G_OBJECT_CLASS (sl_catalogue_view_parent_class)->dispose (object);
}

static void
sl_catalogue_view_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  switch (prop_id)
    {
    case PROP_COLUMNS:
      g_value_take_boxed (value, sl_catalogue_view_get_columns (SL_CATALOGUE_VIEW (object)));
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
sl_catalogue_view_set_property (GObject *object, guint prop_id, const GValue *value, GParamSpec *pspec)
{
  switch (prop_id)
    {
    case PROP_COLUMNS:
      sl_catalogue_view_set_columns (SL_CATALOGUE_VIEW (object), g_value_get_boxed (value));
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
sl_catalogue_view_class_init (SlCatalogueViewClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = sl_catalogue_view_dispose;
  object_class->get_property = sl_catalogue_view_get_property;
  object_class->set_property = sl_catalogue_view_set_property;

  /* The shown columns' names (SlCatalogueColumnInfo.name), in order;
   * empty: the usual columns.  The window keeps it in GSettings. */
  properties[PROP_COLUMNS] = g_param_spec_boxed ("columns", NULL, NULL, G_TYPE_STRV,
                                                 G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY
                                                   | G_PARAM_STATIC_STRINGS);
  g_object_class_install_properties (object_class, N_PROPS, properties);

  /* The column chooser's, for keyboards and tests too. */
  gtk_widget_class_install_action (widget_class, "catalogue.toggle-column", "s", toggle_column_action);
  gtk_widget_class_install_action (widget_class, "catalogue.reset-columns", NULL, reset_columns_action);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "catalogue");

  /* The user selected these stars (GStrv of designations). */
  signals[SELECTION_CHANGED] = g_signal_new ("selection-changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0,
                                             NULL, NULL, NULL, G_TYPE_NONE, 1, G_TYPE_STRV);
  /* A click on a value (designation, quantity name): show its trail. */
  signals[CELL_ACTIVATED] = g_signal_new ("cell-activated", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0,
                                          NULL, NULL, NULL, G_TYPE_NONE, 2, G_TYPE_STRING, G_TYPE_STRING);
}

static void
sl_catalogue_view_init (SlCatalogueView *self)
{
  self->clicked_position = GTK_INVALID_LIST_POSITION;
  self->probe[0] = G_OBJECT (sl_catalogue_row_new (0));
  self->probe[1] = G_OBJECT (sl_catalogue_row_new (0));

  self->model = sl_catalogue_model_new ();
  self->selection = sl_catalogue_selection_new (G_LIST_MODEL (self->model));
  /* After the selection has followed the model's change. */
  g_signal_connect_after (self->model, "items-changed", G_CALLBACK (on_model_items_changed), self);
  g_signal_connect (self->selection, "selection-changed", G_CALLBACK (on_selection_changed), self);

  self->column_view = GTK_COLUMN_VIEW (gtk_column_view_new (g_object_ref (GTK_SELECTION_MODEL (self->selection))));
  gtk_column_view_set_show_column_separators (self->column_view, TRUE);
  gtk_column_view_set_reorderable (self->column_view, TRUE);
  gtk_widget_add_css_class (GTK_WIDGET (self->column_view), "data-table");
  make_columns (self);
  g_signal_connect (self->column_view, "activate", G_CALLBACK (on_activate), self);
  g_signal_connect (gtk_column_view_get_sorter (self->column_view), "changed", G_CALLBACK (on_sorter_changed), self);

  self->scroller = gtk_scrolled_window_new ();
  gtk_widget_set_vexpand (self->scroller, TRUE);
  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (self->scroller), GTK_WIDGET (self->column_view));
  self->box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  gtk_box_append (GTK_BOX (self->box), make_strip (self));
  gtk_box_append (GTK_BOX (self->box), gtk_separator_new (GTK_ORIENTATION_HORIZONTAL));
  gtk_box_append (GTK_BOX (self->box), self->scroller);
  gtk_widget_set_parent (self->box, GTK_WIDGET (self));
  {
    guint n;
    const SlCatalogueColumn *usual = sl_catalogue_default_columns (&n);

    show_columns (self, usual, n);
  }
  g_signal_connect (gtk_column_view_get_columns (self->column_view), "items-changed",
                    G_CALLBACK (on_columns_changed), self);
}

SlCatalogueView *
sl_catalogue_view_new (void)
{
  return g_object_new (SL_TYPE_CATALOGUE_VIEW, NULL);
}

GtkSelectionModel *
sl_catalogue_view_get_selection_model (SlCatalogueView *view)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_VIEW (view), NULL);
  return GTK_SELECTION_MODEL (view->selection);
}
