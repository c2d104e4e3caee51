/* sl-import-dialog.h: the import assistant: a CSV file's first rows, its
 * delimiter, the column mapping with a unit per column, the missing-value
 * tokens, the epoch, the radius for joining rows to stars by position and
 * the source name, and a dry run's counts and rejected rows, all before
 * anything is written; Import then runs the import with
 * exactly those choices as the window's long work. */
#pragma once

#include <adwaita.h>

#include "import.h"
#include "sl-window.h"

G_BEGIN_DECLS

#define SL_TYPE_IMPORT_DIALOG (sl_import_dialog_get_type ())
G_DECLARE_FINAL_TYPE (SlImportDialog, sl_import_dialog, SL, IMPORT_DIALOG, AdwWindow)

/* How many of the file's first data rows the assistant shows. */
#define SL_IMPORT_DIALOG_ROWS 20

/* Opens the assistant, modal over WINDOW, on the CSV file at PATH for the
 * window's open project.  NULL (and a toast naming the problem) when no
 * project is open or the file cannot be read as CSV at all. */
SlImportDialog *sl_import_dialog_open (SlWindow *window, const char *path);

/* For tests only (tests/test-gui.c); the assistant itself does not use
 * them.  The preview as last read (borrowed); the field and unit choosers
 * of header column COLUMN (borrowed); whether a dry run is running; what
 * the last one found, as shown (borrowed; "" before the first).  The
 * assistant's actions are "assistant.check" and "assistant.import". */
const SlImportPreview *sl_import_dialog_get_preview        (SlImportDialog *self);
GtkDropDown           *sl_import_dialog_get_field_chooser  (SlImportDialog *self, guint column);
GtkDropDown           *sl_import_dialog_get_unit_chooser   (SlImportDialog *self, guint column);
gboolean               sl_import_dialog_is_checking        (SlImportDialog *self);
const char            *sl_import_dialog_get_check_summary  (SlImportDialog *self);
const char            *sl_import_dialog_get_problem        (SlImportDialog *self);

G_END_DECLS
