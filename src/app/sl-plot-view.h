/* sl-plot-view.h: a view that draws one kind of figure (HR diagram, sky,
 * parallax paths) with src/plot into the window, with zoom, pan, hover and
 * selection.  What it shows is exactly what starledger-cli figure writes
 * for the same stars and options: one code path. */
#pragma once

#include <gtk/gtk.h>

#include "starset.h"

G_BEGIN_DECLS

typedef enum {
  SL_PLOT_KIND_HRD,
  SL_PLOT_KIND_SKY,
  SL_PLOT_KIND_PARALLAX,
} SlPlotKind;

#define SL_TYPE_PLOT_VIEW (sl_plot_view_get_type ())
G_DECLARE_FINAL_TYPE (SlPlotView, sl_plot_view, SL, PLOT_VIEW, GtkWidget)

SlPlotView *sl_plot_view_new (SlPlotKind kind);
SlPlotKind  sl_plot_view_get_kind (SlPlotView *view);

/* The stars to draw; the view takes a reference (sl_star_set_ref) and
 * frees it when it has another set or goes. */
void        sl_plot_view_set_stars (SlPlotView *view, SlStarSet *stars);

/* The selected stars by designation (NULL-terminated; NULL: none): ringed
 * and labelled; the parallax view draws their paths. */
void        sl_plot_view_set_selection (SlPlotView *view, const char *const *designations);

/* Back to the whole view after zooming and panning. */
void        sl_plot_view_reset (SlPlotView *view);

/* For tests only (tests/test-gui.c): how many stars (parallax view:
 * panels) the last draw recorded positions for. */
guint       sl_plot_view_get_n_drawn (SlPlotView *view);
/* How many pictures the view has drawn, and whether a worker is drawing
 * one now (large star sets). */
guint       sl_plot_view_get_n_pictures (SlPlotView *view);
gboolean    sl_plot_view_is_drawing (SlPlotView *view);

/* Signals:
 *   "star-selected" (const char *designation, gboolean extend):
 *       a click on a star (EXTEND with Ctrl); NULL designation: a click on
 *       nothing, which clears the selection.
 *   "stars-selected-in-region" (GStrv designations): a drag selected these. */

G_END_DECLS
