/* sl-window.h: a project's window: the Catalogue table, the HR diagram,
 * Sky and Parallax views beside it, and the Trail and Ledger below; one
 * selection shared by all. */
#pragma once

#include <adwaita.h>

#include "derive/derive.h"
#include "sl-catalogue-view.h"
#include "sl-lists-panel.h"
#include "sl-plot-view.h"

G_BEGIN_DECLS

#define SL_TYPE_WINDOW (sl_window_get_type ())
G_DECLARE_FINAL_TYPE (SlWindow, sl_window, SL, WINDOW, AdwApplicationWindow)

SlWindow *sl_window_new (GtkApplication *application);

/* Opens the project at PATH in this window; FALSE with ERROR if it cannot. */
gboolean  sl_window_open_project (SlWindow *window, const char *path, GError **error);

/* Makes a fresh demo project in the user's cache directory and opens it. */
gboolean  sl_window_open_demo (SlWindow *window, GError **error);

/* For the window's dialogs and panels.
 * Long work: runs THREAD in a GTask (source object: the window; cancellable:
 * the Cancel button's) while the progress bar shows WHAT; DONE runs on the
 * main thread after the bar is gone.  One job at a time: FALSE (and a toast)
 * if one is running, TASK_DATA freed.  sl_window_report_progress is an
 * SlProgressFunc for the thread, with the window as its data. */
gboolean  sl_window_run_work (SlWindow *window, const char *what, GTaskThreadFunc thread,
                              gpointer task_data, GDestroyNotify task_data_free,
                              GAsyncReadyCallback done, gpointer done_data);
void      sl_window_report_progress (double fraction, gpointer window);
gboolean  sl_window_is_working (SlWindow *window);
/* The open project's path (borrowed; NULL: none); a toast; reading the
 * project again after it changed (table, views, Trail, Ledger). */
/* The stars the views draw (a new reference; NULL while none are loaded)
 * and in *LIST the target list they are (NULL: every star): a dialog that
 * previews a figure of the same stars shares them instead of loading a
 * second copy. */
SlStarSet  *sl_window_ref_stars (SlWindow *self, const char **list);
const char *sl_window_get_project_path (SlWindow *window);
void      sl_window_toast (SlWindow *window, const char *message);
void      sl_window_add_toast (SlWindow *window, AdwToast *toast);   /* takes TOAST */
void      sl_window_reload (SlWindow *window);
/* Derives the open project with PARAMS (ALL: every star, otherwise the
 * stale ones) as long work; FALSE if no project is open or a job runs.
 * The Derive dialog ends here; win.derive-now derives with the latest
 * run's parameters without asking. */
gboolean  sl_window_derive (SlWindow *window, const SlDeriveParams *params, gboolean all);

/* Target lists.  The table and the views show only list NAME (NULL:
 * every star); the list they show (borrowed; NULL: every star).  After a
 * list NAME changed: the ledger and the Lists panel are read again, and
 * the table and the views if they show NAME.  The Lists panel. */
void          sl_window_show_list      (SlWindow *window, const char *name);
const char   *sl_window_get_shown_list (SlWindow *window);
void          sl_window_lists_changed  (SlWindow *window, const char *name);
SlListsPanel *sl_window_get_lists_panel (SlWindow *window);

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
