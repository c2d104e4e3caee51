/* sl-matches-panel.h: the Matches page of the window's side notebook:
 * the rows that imports with a match radius joined to stars by position,
 * the ambiguous ones first (with their candidates and separations), then
 * the joined ones (row id to star, separation, epoch) and the split ones;
 * a search, the counts, and a Split button.
 *
 * The panel computes nothing: it reads src/core/match-list.c (a bounded
 * list with counts, so a million matches cost no more than a hundred),
 * and Split is win.split-match, which calls sl_match_split as
 * `starledger-cli split` does (one transaction, one ledger entry).
 * Choosing a row selects its star, and an ambiguous row's candidates,
 * everywhere. */
#pragma once

#include <adwaita.h>

G_BEGIN_DECLS

typedef struct _SlWindow SlWindow;

#define SL_TYPE_MATCHES_PANEL (sl_matches_panel_get_type ())
G_DECLARE_FINAL_TYPE (SlMatchesPanel, sl_matches_panel, SL, MATCHES_PANEL, GtkBox)

/* At most this many rows are listed; the counts cover every match. */
#define SL_MATCHES_PANEL_LIMIT 200

SlMatchesPanel *sl_matches_panel_new (SlWindow *window);

/* Reads the matches again (after the project changed, or another one
 * was opened), in a thread; the list follows when it is done. */
void            sl_matches_panel_reload (SlMatchesPanel *panel);

/* Installs win.split-match ("SOURCE:LINE", as `split` takes it) in the
 * window's class; called from sl_window_class_init. */
void            sl_matches_panel_install_actions (GtkWidgetClass *window_class);

/* For tests only (tests/test-gui.c).  The window's panel; whether a
 * read is still running; the search;
 * how many rows are listed; row I's status ("ambiguous", "matched",
 * "split"), its reference SOURCE:LINE (newly allocated) and its text as
 * shown (newly allocated); choosing row I as a click does; the counts
 * line. */
SlMatchesPanel *sl_matches_panel_of (SlWindow *window);
gboolean        sl_matches_panel_is_loading (SlMatchesPanel *panel);
void            sl_matches_panel_set_search (SlMatchesPanel *panel, const char *text);
guint           sl_matches_panel_get_n_rows (SlMatchesPanel *panel);
const char     *sl_matches_panel_get_status (SlMatchesPanel *panel, guint i);
char           *sl_matches_panel_get_ref (SlMatchesPanel *panel, guint i);
char           *sl_matches_panel_get_text (SlMatchesPanel *panel, guint i);
void            sl_matches_panel_choose (SlMatchesPanel *panel, guint i);
const char     *sl_matches_panel_get_counts (SlMatchesPanel *panel);

G_END_DECLS
