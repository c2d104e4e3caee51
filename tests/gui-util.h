/* gui-util.h: what the programs that drive the window share
 * (tests/test-gui.c, tests/screenshot-tour.c): finding widgets and
 * windows, and waiting for a frame to be painted. */
#pragma once

#include <gtk/gtk.h>

G_BEGIN_DECLS

typedef gboolean (*SlWidgetTest) (GtkWidget *widget, gconstpointer data);

/* The first widget under ROOT (ROOT included), depth first, for which
 * TEST holds; NULL if none. */
GtkWidget *sl_gui_find_widget     (GtkWidget *root, SlWidgetTest test, gconstpointer data);
gboolean   sl_gui_is_named        (GtkWidget *widget, gconstpointer name);
gboolean   sl_gui_is_of_type      (GtkWidget *widget, gconstpointer type);   /* a GType as a pointer */
/* The widget gtk_widget_set_name named NAME, the first of TYPE. */
GtkWidget *sl_gui_find_named      (GtkWidget *root, const char *name);
GtkWidget *sl_gui_find_descendant (GtkWidget *root, GType type);
/* The visible toplevel window of TYPE, or NULL. */
GtkWindow *sl_gui_find_toplevel   (GType type);

/* Selects the item of CHOOSER (a GtkStringList) whose text is TEXT, as a
 * click would; FALSE if there is none. */
gboolean   sl_gui_choose          (GtkDropDown *chooser, const char *text);

/* A timer that wakes the main loop every MS milliseconds, so that a wait
 * spinning g_main_context_iteration (NULL, TRUE) sees its condition
 * change even when nothing else happens. */
void       sl_gui_wake_loop_every (guint ms);

/* Asks TOPLEVEL for a new frame and spins the main loop until it has
 * been painted (everything changed before the call is then on screen).
 * NULL when it was; otherwise what did not happen within TIMEOUT_S
 * seconds ("was never mapped", "painted no frame"). */
const char *sl_gui_paint          (GtkWidget *toplevel, double timeout_s);

G_END_DECLS
