/* sl-derive-dialog.h: the Derive dialog: every parameter of a derivation
 * run with its default and the citation of the method it selects, starting
 * from the project's most recent run; Derive runs it in the window. */
#pragma once

#include "sl-window.h"

G_BEGIN_DECLS

#define SL_TYPE_DERIVE_DIALOG (sl_derive_dialog_get_type ())
G_DECLARE_FINAL_TYPE (SlDeriveDialog, sl_derive_dialog, SL, DERIVE_DIALOG, AdwWindow)

/* A modal dialog for WINDOW's open project, transient for it; present it.
 * Its widgets are named after the parameters they set (derive.h,
 * SlParamInfo.name; "all", "derive", "reset" for the rest), which is how
 * tests/test-gui.c finds them. */
SlDeriveDialog *sl_derive_dialog_new (SlWindow *window);

G_END_DECLS
