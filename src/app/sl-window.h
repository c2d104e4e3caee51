/* sl-window.h: a project's window: the Catalogue table, the HR diagram,
 * Sky and Parallax views beside it, and the Trail and Ledger below; one
 * selection shared by all. */
#pragma once

#include <adwaita.h>

#include "sl-catalogue-view.h"
#include "sl-plot-view.h"

G_BEGIN_DECLS

#define SL_TYPE_WINDOW (sl_window_get_type ())
G_DECLARE_FINAL_TYPE (SlWindow, sl_window, SL, WINDOW, AdwApplicationWindow)

SlWindow *sl_window_new (GtkApplication *application);

/* Opens the project at PATH in this window; FALSE with ERROR if it cannot. */
gboolean  sl_window_open_project (SlWindow *window, const char *path, GError **error);

/* Makes a fresh demo project in the user's cache directory and opens it. */
gboolean  sl_window_open_demo (SlWindow *window, GError **error);

/* For tests only (tests/test-gui.c); the window itself does not use them.
 * The Catalogue and the view of KIND (borrowed); whether a background job
 * (loading the views' stars, a derivation) is still running; the selected
 * designations (borrowed, NULL-terminated; NULL: none). */
SlCatalogueView    *sl_window_get_catalogue (SlWindow *window);
SlPlotView         *sl_window_get_view      (SlWindow *window, SlPlotKind kind);
gboolean            sl_window_is_loading    (SlWindow *window);
const char *const  *sl_window_get_selection (SlWindow *window);

/* Selects the stars named (NULL: none) in the table and every view. */
void      sl_window_set_selection (SlWindow *window, const char *const *designations);

G_END_DECLS
