/* sl-figure-dialog.h: Export Figure, from a view of the window: the page
 * (a journal's single or double column, or millimetres), the format,
 * resolution, colour or grey, type size, the view's own options and a
 * target list, with a live preview drawn by the code that writes the file
 * and the starledger-cli figure command that writes the same bytes.  The
 * stars highlighted (the parallax figure: whose paths) are the window's
 * selection.  The file is written in the window's long-work thread
 * (progress bar, Cancel). */
#pragma once

#include <adwaita.h>

#include "figure-job.h"
#include "sl-window.h"

G_BEGIN_DECLS

#define SL_TYPE_FIGURE_DIALOG (sl_figure_dialog_get_type ())
G_DECLARE_FINAL_TYPE (SlFigureDialog, sl_figure_dialog, SL, FIGURE_DIALOG, AdwWindow)

/* A modal dialog over WINDOW (which has a project open) for a figure of
 * KIND; present it with gtk_window_present. */
SlFigureDialog *sl_figure_dialog_new (SlWindow *window, SlFigureKind kind);

/* The figure the options describe now (borrowed). */
const SlFigureJob *sl_figure_dialog_get_job (SlFigureDialog *dialog);
/* The format the options ask for. */
SlFigureFormat     sl_figure_dialog_get_format (SlFigureDialog *dialog);

/* Writes the figure to PATH as Export… does after the file chooser: in
 * the window's long-work thread, the dialog closing.  FALSE if the window
 * is busy with another job or the figure cannot be drawn (its stars do not
 * load); the dialog then stays. */
gboolean           sl_figure_dialog_export_to (SlFigureDialog *dialog, const char *path);

/* For tests only (tests/test-gui.c): whether the preview's stars are
 * loaded (or failed to load); the command line shown. */
gboolean           sl_figure_dialog_is_ready (SlFigureDialog *dialog);
/* The stars the preview draws (not a new reference): for the HR diagram
 * and the sky, the window's own (sl_window_ref_stars), not a copy. */
const SlStarSet   *sl_figure_dialog_get_stars (SlFigureDialog *dialog);
const char        *sl_figure_dialog_get_command_line (SlFigureDialog *dialog);

G_END_DECLS
