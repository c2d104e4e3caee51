/* sl-lists-panel.h: the Lists page of the window's side notebook: the
 * project's target lists, the members of the chosen one (priority, tags,
 * notes), the buttons that make, fill, empty, delete and export lists, and
 * the chooser that makes the table and the views show only one list.
 *
 * The panel computes nothing: every change goes through src/core/lists.c
 * (one transaction, one ledger entry), through the window's actions
 * (win.create-list, win.show-list, win.add-to-list, win.remove-from-list,
 * win.delete-list, win.set-list-member, win.new-list, win.export-list,
 * win.export-list-to),
 * which sl_lists_panel_install_actions adds to the window's class. */
#pragma once

#include <adwaita.h>

G_BEGIN_DECLS

typedef struct _SlWindow SlWindow;

#define SL_TYPE_LISTS_PANEL (sl_lists_panel_get_type ())
G_DECLARE_FINAL_TYPE (SlListsPanel, sl_lists_panel, SL, LISTS_PANEL, GtkBox)

SlListsPanel *sl_lists_panel_new (SlWindow *window);

/* Reads the lists and the chosen list's members again (after the project
 * changed, or another one was opened). */
void          sl_lists_panel_reload (SlListsPanel *panel);

/* The list whose members the panel shows (borrowed; NULL: none). */
const char   *sl_lists_panel_get_current (SlListsPanel *panel);
/* Shows list NAME's members (NULL: none); FALSE if there is no such list. */
gboolean      sl_lists_panel_set_current (SlListsPanel *panel, const char *name);

/* Makes list NAME of the stars that satisfy CONDITION (NULL or "": none)
 * and, WITH_SELECTION, the stars selected in the window, in one
 * transaction (sl_list_create_with_stars); the panel then shows it.  What
 * win.create-list and the New List dialog do. */
gboolean      sl_lists_panel_create_list (SlWindow *window, const char *name, const char *description,
                                          const char *condition, gboolean with_selection, GError **error);

/* Installs the win.* actions above (and Ctrl+Shift+L for New List…) in
 * the window's class; called from sl_window_class_init. */
void          sl_lists_panel_install_actions (GtkWidgetClass *window_class);

G_END_DECLS
