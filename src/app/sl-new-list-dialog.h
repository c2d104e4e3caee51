/* sl-new-list-dialog.h: the New List dialog: a name, a description, a
 * condition built from rows of [column | comparison | value] joined by
 * "all of" or "any of" (or written in the condition language itself), a
 * live count of the stars it selects, and "Also add the selected stars".
 * Creating calls sl_lists_panel_create_list: one transaction, one ledger
 * entry, as `starledger-cli select --where ... --into ...`. */
#pragma once

#include <adwaita.h>

G_BEGIN_DECLS

typedef struct _SlWindow SlWindow;

/* Opens the dialog over WINDOW (which must have a project open) and
 * returns it (owned by GTK; it closes itself). */
GtkWindow *sl_new_list_dialog_present (SlWindow *window);

G_END_DECLS
