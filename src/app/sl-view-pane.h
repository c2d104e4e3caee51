/* sl-view-pane.h: a plot view with its header strip: the view's name, an
 * Export Figure… button and a button that maximises the view (or shows
 * every view again).  The buttons activate the window's actions
 * win.export-figure and win.maximize-view with the kind's name ("hr",
 * "sky", "parallax") as their parameter. */
#pragma once

#include <gtk/gtk.h>

#include "sl-plot-view.h"

G_BEGIN_DECLS

#define SL_TYPE_VIEW_PANE (sl_view_pane_get_type ())
G_DECLARE_FINAL_TYPE (SlViewPane, sl_view_pane, SL, VIEW_PANE, GtkWidget)

/* A pane around VIEW (taken as its child), titled TITLE. */
SlViewPane *sl_view_pane_new (SlPlotView *view, const char *title);

/* Whether the view fills the views' area: the button then offers to show
 * every view again. */
void        sl_view_pane_set_maximized (SlViewPane *pane, gboolean maximized);
gboolean    sl_view_pane_get_maximized (SlViewPane *pane);

G_END_DECLS
