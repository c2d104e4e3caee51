/* sl-window.h: a project's window: the Catalogue table, the HR diagram,
 * Sky and Parallax views beside it, and the Trail and Ledger below; one
 * selection shared by all. */
#pragma once

#include <adwaita.h>

G_BEGIN_DECLS

#define SL_TYPE_WINDOW (sl_window_get_type ())
G_DECLARE_FINAL_TYPE (SlWindow, sl_window, SL, WINDOW, AdwApplicationWindow)

SlWindow *sl_window_new (GtkApplication *application);

/* Opens the project at PATH in this window; FALSE with ERROR if it cannot. */
gboolean  sl_window_open_project (SlWindow *window, const char *path, GError **error);

/* Makes a fresh demo project in the user's cache directory and opens it. */
gboolean  sl_window_open_demo (SlWindow *window, GError **error);

G_END_DECLS
