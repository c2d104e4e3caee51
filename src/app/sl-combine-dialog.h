/* sl-combine-dialog.h: the Combining Sources dialog: the project's policy
 * for turning several sources' measurements of one quantity into the
 * value derivations use (core: combine.h, inputs.h). */
#pragma once

#include "sl-window.h"

G_BEGIN_DECLS

#define SL_TYPE_COMBINE_DIALOG (sl_combine_dialog_get_type ())
G_DECLARE_FINAL_TYPE (SlCombineDialog, sl_combine_dialog, SL, COMBINE_DIALOG, AdwWindow)

/* A modal dialog for WINDOW's open project, transient for it; present it.
 * Widgets are named for tests/test-gui.c: each group's rule row by the
 * group's name ("parallax", "pm", ...), "level", "save", and each source's
 * row "source:NAME" with its check "listed:NAME" and buttons "up:NAME",
 * "down:NAME". */
SlCombineDialog *sl_combine_dialog_new (SlWindow *window);

G_END_DECLS
