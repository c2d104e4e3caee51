/* sl-plot-view.c: a figure of src/plot drawn into the window.
 *
 * The view draws with the same functions as starledger-cli figure, onto
 * the widget's cairo surface, under a zoom and pan transform.  The draw
 * functions record where each star went (SlFigure.positions); the mouse
 * finds stars there: hover shows a star's key values, a click selects it
 * (Ctrl adds), a drag with Shift selects a region, a plain drag pans, the
 * scroll wheel and a pinch zoom, a double click resets.
 *
 * The figure is drawn into a picture (an image surface) that is kept
 * until what it shows changes: a region being dragged out, a tooltip or
 * a repaint of the window costs one paint, not a redraw of every star.
 * A figure of many stars (a million take seconds) is drawn in a worker
 * thread; meanwhile the last picture is shown moved and scaled to the
 * new zoom and pan, so the window never waits for the stars.
 */
#include "sl-plot-view.h"

#include <glib/gi18n.h>
#include <math.h>

#include "hrd.h"
#include "parallax-path.h"
#include "sky.h"

#define PICK_RADIUS_PX 6.0

/* What a picture shows: a drawn picture is good while its key is the
 * view's. */
typedef struct {
  int     width, height, scale;   /* widget px, device scale */
  double  zoom, pan_x, pan_y;
  guint   stars_serial;           /* bumped by each set_stars */
  guint   selection_serial;       /* bumped by each set_selection */
} PictureKey;

struct _SlPlotView {
  GtkWidget        parent_instance;

  SlPlotKind       kind;
  SlStarSet       *stars;          /* a reference (sl_star_set_ref) */
  SlStarSet       *chosen;         /* the selected stars, for the parallax view */
  GStrv            selection;
  guint            stars_serial, selection_serial;

  cairo_surface_t *picture;        /* the last picture drawn, or NULL */
  PictureKey       picture_key;
  GCancellable    *drawing;        /* a worker drawing, or NULL */
  PictureKey       drawing_key;
  guint            n_pictures;     /* pictures drawn so far (tests) */

  double           zoom;           /* 1: the whole figure */
  double           pan_x, pan_y;   /* px, after zoom */
  double           drag_start_pan_x, drag_start_pan_y;
  gboolean         region_drag;
  double           region[4];      /* x0, y0, x1, y1 in widget px while region-selecting */

  GArray          *positions;      /* SlPlotPosition of the picture, page coordinates */
};

G_DEFINE_FINAL_TYPE (SlPlotView, sl_plot_view, GTK_TYPE_WIDGET)

enum {
  SIGNAL_STAR_SELECTED,
  SIGNAL_REGION_SELECTED,
  N_SIGNALS
};

static guint signals[N_SIGNALS];

/* ------------------------------------------------------------------ */
/* Drawing                                                            */

static void
screen_style (SlFigureStyle *style)
{
  sl_figure_style_init (style);
  style->font_pt = 9.0;
  style->line_pt = 0.8;
}

/* The stars of the selection, as their own set (the parallax view draws
 * only these). */
static SlStarSet *
selected_subset (const SlStarSet *stars, const char *const *selection)
{
  SlStarSet *subset = g_new0 (SlStarSet, 1);
  g_autoptr (GHashTable) wanted = g_hash_table_new (g_str_hash, g_str_equal);

  subset->stars = g_array_new (FALSE, FALSE, sizeof (SlPlotStar));
  subset->strings = g_string_chunk_new (256);
  subset->run_id = stars->run_id;
  for (guint i = 0; selection && selection[i]; i++)
    g_hash_table_add (wanted, (gpointer) selection[i]);
  for (guint i = 0; i < stars->stars->len && g_hash_table_size (wanted) > 0; i++)
    {
      SlPlotStar star = *sl_star_set_get (stars, i);

      if (!g_hash_table_remove (wanted, star.designation))
        continue;
      star.designation = g_string_chunk_insert (subset->strings, star.designation);
      g_array_append_val (subset->stars, star);
    }
  return subset;
}

/* The parallax view draws only the selected stars: picked out once when
 * the stars or the selection change, not at every redraw. */
static void
update_chosen (SlPlotView *self)
{
  g_clear_pointer (&self->chosen, sl_star_set_free);
  if (self->kind == SL_PLOT_KIND_PARALLAX && self->stars)
    self->chosen = selected_subset (self->stars, (const char *const *) self->selection);
}

/* Beyond this many stars a picture is drawn in a worker thread. */
#define DRAW_IN_THREAD_STARS 50000

/* Everything one drawing needs, copied or referenced, so that a worker
 * thread can draw while the view changes. */
typedef struct {
  SlPlotKind  kind;
  SlStarSet  *stars;        /* a reference */
  GStrv       selection;
  PictureKey  key;
  char       *empty_message;
  cairo_surface_t *picture; /* the result */
  GArray     *positions;    /* the result */
} Drawing;

static void
drawing_free (Drawing *d)
{
  g_clear_pointer (&d->stars, sl_star_set_free);
  g_strfreev (d->selection);
  g_free (d->empty_message);
  g_clear_pointer (&d->picture, cairo_surface_destroy);
  g_clear_pointer (&d->positions, g_array_unref);
  g_free (d);
}

static gboolean
same_key (const PictureKey *a, const PictureKey *b)
{
  return a->width == b->width && a->height == b->height && a->scale == b->scale && a->zoom == b->zoom
         && a->pan_x == b->pan_x && a->pan_y == b->pan_y && a->stars_serial == b->stars_serial
         && a->selection_serial == b->selection_serial;
}

static PictureKey
current_key (SlPlotView *self)
{
  PictureKey key = {
    gtk_widget_get_width (GTK_WIDGET (self)), gtk_widget_get_height (GTK_WIDGET (self)),
    gtk_widget_get_scale_factor (GTK_WIDGET (self)), self->zoom, self->pan_x, self->pan_y,
    self->stars_serial, self->selection_serial,
  };

  return key;
}

/* Draws D's figure into a new picture, with the same functions as
 * starledger-cli figure; any thread. */
static void
draw_picture (Drawing *d)
{
  const PictureKey *k = &d->key;
  SlFigureStyle style;
  SlFigure fig;
  cairo_t *cr;

  d->picture = cairo_image_surface_create (CAIRO_FORMAT_RGB24, MAX (k->width * k->scale, 1),
                                           MAX (k->height * k->scale, 1));
  cairo_surface_set_device_scale (d->picture, k->scale, k->scale);
  d->positions = g_array_new (FALSE, FALSE, sizeof (SlPlotPosition));
  cr = cairo_create (d->picture);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  cairo_set_source_rgb (cr, 0, 0, 0);
  if (d->stars == NULL)
    {
      cairo_destroy (cr);
      return;
    }
  screen_style (&style);
  cairo_translate (cr, k->pan_x, k->pan_y);
  cairo_scale (cr, k->zoom, k->zoom);
  sl_figure_init (&fig, cr, k->width, k->height, &style);
  fig.positions = d->positions;
  switch (d->kind)
    {
    case SL_PLOT_KIND_HRD:
      {
        SlHrdOptions options;

        sl_hrd_options_init (&options);
        options.highlight = (const char *const *) d->selection;
        options.empty_message = d->empty_message;
        sl_hrd_draw (&fig, d->stars, &options, NULL, NULL, NULL);
        break;
      }
    case SL_PLOT_KIND_SKY:
      {
        SlSkyOptions options;

        sl_sky_options_init (&options);
        options.highlight = (const char *const *) d->selection;
        sl_sky_draw (&fig, d->stars, &options, NULL, NULL);
        break;
      }
    case SL_PLOT_KIND_PARALLAX:
      {
        SlParallaxOptions options;

        sl_parallax_options_init (&options);
        options.empty_message = d->empty_message;
        sl_parallax_draw (&fig, d->stars, &options, NULL, NULL);
        break;
      }
    }
  sl_figure_clear (&fig);
  cairo_destroy (cr);
}

static Drawing *
drawing_new (SlPlotView *self, const PictureKey *key)
{
  Drawing *d = g_new0 (Drawing, 1);
  SlStarSet *drawn = self->kind == SL_PLOT_KIND_PARALLAX ? self->chosen : self->stars;

  d->kind = self->kind;
  d->stars = drawn ? sl_star_set_ref (drawn) : NULL;
  d->selection = g_strdupv (self->selection);
  d->key = *key;
  /* What to do next, in the window's words rather than the command line's. */
  d->empty_message = g_strdup (self->kind == SL_PLOT_KIND_HRD
                                 ? _("No star has a derived temperature and luminosity yet: Derive… (Ctrl+D) derives them.")
                                 : _("Select stars in the table or a view to see their parallax paths."));
  return d;
}

static void
take_picture (SlPlotView *self, Drawing *d, gint64 took_us)
{
  g_clear_pointer (&self->picture, cairo_surface_destroy);
  self->picture = g_steal_pointer (&d->picture);
  self->picture_key = d->key;
  g_array_unref (self->positions);
  self->positions = g_steal_pointer (&d->positions);
  self->n_pictures++;
  if (g_getenv ("STARLEDGER_DEBUG_TIMING"))
    g_printerr ("starledger: view %d drawn in %.1f ms (%u stars)\n", self->kind, took_us / 1000.0,
                d->stars ? d->stars->stars->len : 0);
}

static void
draw_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  gint64 start = g_get_monotonic_time ();

  draw_picture (task_data);
  g_task_return_int (task, g_get_monotonic_time () - start);
}

static void
on_picture_drawn (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlPlotView *self = SL_PLOT_VIEW (source);
  Drawing *d = g_task_get_task_data (G_TASK (result));
  gint64 took_us = g_task_propagate_int (G_TASK (result), NULL);

  g_clear_object (&self->drawing);
  take_picture (self, d, took_us);
  /* Shown if it is still what the view wants; otherwise the next
   * snapshot starts the picture it does want. */
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
start_drawing (SlPlotView *self, const PictureKey *key)
{
  g_autoptr (GTask) task = NULL;

  self->drawing = g_cancellable_new ();
  self->drawing_key = *key;
  task = g_task_new (self, self->drawing, on_picture_drawn, NULL);
  g_task_set_task_data (task, drawing_new (self, key), (GDestroyNotify) drawing_free);
  g_task_run_in_thread (task, draw_thread);
}

/* The last picture, moved and scaled from the zoom and pan it was drawn at
 * to the view's: a page point p is at p zoom + pan in both. */
static void
paint_stand_in (SlPlotView *self, cairo_t *cr)
{
  const PictureKey *k = &self->picture_key;
  double factor = self->zoom / k->zoom;

  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  cairo_save (cr);
  cairo_translate (cr, self->pan_x - k->pan_x * factor, self->pan_y - k->pan_y * factor);
  cairo_scale (cr, factor, factor);
  cairo_set_source_surface (cr, self->picture, 0, 0);
  cairo_paint (cr);
  cairo_restore (cr);
}

static void
sl_plot_view_snapshot (GtkWidget *widget, GtkSnapshot *snapshot)
{
  SlPlotView *self = SL_PLOT_VIEW (widget);
  double width = gtk_widget_get_width (widget), height = gtk_widget_get_height (widget);
  cairo_t *cr = gtk_snapshot_append_cairo (snapshot, &GRAPHENE_RECT_INIT (0, 0, width, height));
  PictureKey key = current_key (self);
  const SlStarSet *drawn = self->kind == SL_PLOT_KIND_PARALLAX ? self->chosen : self->stars;

  if (self->picture == NULL || !same_key (&self->picture_key, &key))
    {
      if (drawn == NULL || drawn->stars->len < DRAW_IN_THREAD_STARS)
        {
          Drawing *d = drawing_new (self, &key);
          gint64 start = g_get_monotonic_time ();

          draw_picture (d);
          take_picture (self, d, g_get_monotonic_time () - start);
          drawing_free (d);
        }
      else if (self->drawing == NULL)
        start_drawing (self, &key);
      /* else: the worker's picture comes first, then the next snapshot
       * asks for this key if it still differs. */
    }
  if (self->picture && same_key (&self->picture_key, &key))
    {
      cairo_set_source_surface (cr, self->picture, 0, 0);
      cairo_paint (cr);
    }
  else if (self->picture && self->picture_key.stars_serial == key.stars_serial)
    paint_stand_in (self, cr);
  else
    {
      cairo_set_source_rgb (cr, 1, 1, 1);
      cairo_paint (cr);
    }

  if (self->region_drag)
    {
      cairo_identity_matrix (cr);
      cairo_rectangle (cr, MIN (self->region[0], self->region[2]), MIN (self->region[1], self->region[3]),
                       fabs (self->region[2] - self->region[0]), fabs (self->region[3] - self->region[1]));
      cairo_set_source_rgba (cr, 0.2, 0.4, 0.8, 0.15);
      cairo_fill_preserve (cr);
      cairo_set_source_rgba (cr, 0.2, 0.4, 0.8, 0.8);
      cairo_set_line_width (cr, 1);
      cairo_stroke (cr);
    }
  cairo_destroy (cr);
}

/* ------------------------------------------------------------------ */
/* Finding stars under the mouse                                      */

static void
to_widget (SlPlotView *self, double page_x, double page_y, double *x, double *y)
{
  *x = page_x * self->zoom + self->pan_x;
  *y = page_y * self->zoom + self->pan_y;
}

/* The star drawn nearest (X, Y) within the pick radius, or NULL. */
static const SlPlotStar *
star_at (SlPlotView *self, double x, double y)
{
  const SlStarSet *drawn = self->kind == SL_PLOT_KIND_PARALLAX ? self->chosen : self->stars;
  double best = PICK_RADIUS_PX * PICK_RADIUS_PX;
  const SlPlotStar *found = NULL;

  if (drawn == NULL)
    return NULL;
  for (guint i = 0; i < self->positions->len; i++)
    {
      const SlPlotPosition *p = &g_array_index (self->positions, SlPlotPosition, i);
      double wx, wy, d2;

      to_widget (self, p->x, p->y, &wx, &wy);
      d2 = (wx - x) * (wx - x) + (wy - y) * (wy - y);
      if (d2 < best && p->index < drawn->stars->len)
        {
          best = d2;
          found = sl_star_set_get (drawn, p->index);
        }
    }
  return found;
}

static gboolean
on_query_tooltip (GtkWidget *widget, int x, int y, gboolean keyboard, GtkTooltip *tooltip, gpointer data)
{
  SlPlotView *self = SL_PLOT_VIEW (widget);
  const SlPlotStar *star = star_at (self, x, y);
  g_autoptr (GString) text = NULL;
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  if (star == NULL)
    return FALSE;
  text = g_string_new (star->designation);
  if (isfinite (star->teff))
    g_string_append_printf (text, _("\nTeff %s K"), g_ascii_formatd (buf, sizeof buf, "%.0f", star->teff));
  if (isfinite (star->lum))
    g_string_append_printf (text, _("\nL %s L☉"), g_ascii_formatd (buf, sizeof buf, "%.3g", star->lum));
  if (isfinite (star->parallax))
    g_string_append_printf (text, _("\nparallax %s mas"), g_ascii_formatd (buf, sizeof buf, "%.3f", star->parallax));
  if (isfinite (star->vmag))
    g_string_append_printf (text, _("\nV %s mag"), g_ascii_formatd (buf, sizeof buf, "%.2f", star->vmag));
  gtk_tooltip_set_text (tooltip, text->str);
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Gestures                                                           */

static void
on_click (GtkGestureClick *gesture, int n_press, double x, double y, SlPlotView *self)
{
  GdkModifierType state = gtk_event_controller_get_current_event_state (GTK_EVENT_CONTROLLER (gesture));
  const SlPlotStar *star;

  if (n_press == 2)
    {
      sl_plot_view_reset (self);
      return;
    }
  star = star_at (self, x, y);
  g_signal_emit (self, signals[SIGNAL_STAR_SELECTED], 0, star ? star->designation : NULL,
                 (state & GDK_CONTROL_MASK) != 0);
}

static void
on_drag_begin (GtkGestureDrag *gesture, double x, double y, SlPlotView *self)
{
  GdkModifierType state = gtk_event_controller_get_current_event_state (GTK_EVENT_CONTROLLER (gesture));

  self->region_drag = (state & GDK_SHIFT_MASK) != 0 && self->kind != SL_PLOT_KIND_PARALLAX;
  self->region[0] = self->region[2] = x;
  self->region[1] = self->region[3] = y;
  self->drag_start_pan_x = self->pan_x;
  self->drag_start_pan_y = self->pan_y;
}

static void
on_drag_update (GtkGestureDrag *gesture, double dx, double dy, SlPlotView *self)
{
  if (self->region_drag)
    {
      self->region[2] = self->region[0] + dx;
      self->region[3] = self->region[1] + dy;
    }
  else
    {
      self->pan_x = self->drag_start_pan_x + dx;
      self->pan_y = self->drag_start_pan_y + dy;
    }
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
on_drag_end (GtkGestureDrag *gesture, double dx, double dy, SlPlotView *self)
{
  g_autoptr (GStrvBuilder) builder = NULL;
  g_auto (GStrv) chosen = NULL;
  double x0, x1, y0, y1;

  if (!self->region_drag)
    return;
  self->region_drag = FALSE;
  x0 = MIN (self->region[0], self->region[2]), x1 = MAX (self->region[0], self->region[2]);
  y0 = MIN (self->region[1], self->region[3]), y1 = MAX (self->region[1], self->region[3]);
  builder = g_strv_builder_new ();
  for (guint i = 0; i < self->positions->len; i++)
    {
      const SlPlotPosition *p = &g_array_index (self->positions, SlPlotPosition, i);
      double wx, wy;

      to_widget (self, p->x, p->y, &wx, &wy);
      if (wx >= x0 && wx <= x1 && wy >= y0 && wy <= y1 && p->index < self->stars->stars->len)
        g_strv_builder_add (builder, sl_star_set_get (self->stars, p->index)->designation);
    }
  chosen = g_strv_builder_end (builder);
  g_signal_emit (self, signals[SIGNAL_REGION_SELECTED], 0, chosen);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

/* Zooms by FACTOR keeping the point (X, Y) of the widget still. */
static void
zoom_about (SlPlotView *self, double factor, double x, double y)
{
  double zoom = CLAMP (self->zoom * factor, 1.0, 200.0);

  factor = zoom / self->zoom;
  self->pan_x = x - (x - self->pan_x) * factor;
  self->pan_y = y - (y - self->pan_y) * factor;
  self->zoom = zoom;
  if (zoom == 1.0)
    self->pan_x = self->pan_y = 0.0;
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static gboolean
on_scroll (GtkEventControllerScroll *controller, double dx, double dy, SlPlotView *self)
{
  double x = gtk_widget_get_width (GTK_WIDGET (self)) / 2.0, y = gtk_widget_get_height (GTK_WIDGET (self)) / 2.0;
  GdkEvent *event = gtk_event_controller_get_current_event (GTK_EVENT_CONTROLLER (controller));

  if (event)
    gdk_event_get_position (event, &x, &y);
  zoom_about (self, pow (1.15, -dy), x, y);
  return TRUE;
}

static void
on_pinch (GtkGestureZoom *gesture, double scale, SlPlotView *self)
{
  double x, y;

  gtk_gesture_get_bounding_box_center (GTK_GESTURE (gesture), &x, &y);
  zoom_about (self, scale / MAX (self->zoom, 1e-9) * self->zoom / MAX (scale, 1e-9) * scale, x, y);
}

/* ------------------------------------------------------------------ */
/* Public                                                             */

void
sl_plot_view_set_stars (SlPlotView *self, SlStarSet *stars)
{
  g_return_if_fail (SL_IS_PLOT_VIEW (self));
  g_clear_pointer (&self->stars, sl_star_set_free);
  self->stars = stars ? sl_star_set_ref (stars) : NULL;
  self->stars_serial++;
  update_chosen (self);
  g_array_set_size (self->positions, 0);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

void
sl_plot_view_set_selection (SlPlotView *self, const char *const *designations)
{
  g_return_if_fail (SL_IS_PLOT_VIEW (self));
  g_strfreev (self->selection);
  self->selection = g_strdupv ((char **) designations);
  self->selection_serial++;
  update_chosen (self);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

void
sl_plot_view_reset (SlPlotView *self)
{
  self->zoom = 1.0;
  self->pan_x = self->pan_y = 0.0;
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

SlPlotKind
sl_plot_view_get_kind (SlPlotView *self)
{
  return self->kind;
}

guint
sl_plot_view_get_n_drawn (SlPlotView *self)
{
  g_return_val_if_fail (SL_IS_PLOT_VIEW (self), 0);
  return self->positions->len;
}

guint
sl_plot_view_get_n_pictures (SlPlotView *self)
{
  g_return_val_if_fail (SL_IS_PLOT_VIEW (self), 0);
  return self->n_pictures;
}

gboolean
sl_plot_view_is_drawing (SlPlotView *self)
{
  g_return_val_if_fail (SL_IS_PLOT_VIEW (self), FALSE);
  return self->drawing != NULL;
}

static void
sl_plot_view_finalize (GObject *object)
{
  SlPlotView *self = SL_PLOT_VIEW (object);

  g_clear_pointer (&self->chosen, sl_star_set_free);
  g_clear_pointer (&self->stars, sl_star_set_free);
  g_clear_pointer (&self->picture, cairo_surface_destroy);
  g_strfreev (self->selection);
  g_array_unref (self->positions);
  G_OBJECT_CLASS (sl_plot_view_parent_class)->finalize (object);
}

static void
sl_plot_view_class_init (SlPlotViewClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->finalize = sl_plot_view_finalize;
  widget_class->snapshot = sl_plot_view_snapshot;

  signals[SIGNAL_STAR_SELECTED] =
    g_signal_new ("star-selected", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL, NULL,
                  G_TYPE_NONE, 2, G_TYPE_STRING, G_TYPE_BOOLEAN);
  signals[SIGNAL_REGION_SELECTED] =
    g_signal_new ("stars-selected-in-region", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 1, G_TYPE_STRV);
  gtk_widget_class_set_css_name (widget_class, "plotview");
}

static void
sl_plot_view_init (SlPlotView *self)
{
  GtkGesture *click = gtk_gesture_click_new ();
  GtkGesture *drag = gtk_gesture_drag_new ();
  GtkGesture *pinch = gtk_gesture_zoom_new ();
  GtkEventController *scroll = gtk_event_controller_scroll_new (GTK_EVENT_CONTROLLER_SCROLL_VERTICAL);

  self->zoom = 1.0;
  self->positions = g_array_new (FALSE, FALSE, sizeof (SlPlotPosition));
  gtk_widget_set_size_request (GTK_WIDGET (self), 200, 160);
  gtk_widget_set_has_tooltip (GTK_WIDGET (self), TRUE);
  g_signal_connect (self, "query-tooltip", G_CALLBACK (on_query_tooltip), NULL);

  g_signal_connect (click, "pressed", G_CALLBACK (on_click), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (click));
  g_signal_connect (drag, "drag-begin", G_CALLBACK (on_drag_begin), self);
  g_signal_connect (drag, "drag-update", G_CALLBACK (on_drag_update), self);
  g_signal_connect (drag, "drag-end", G_CALLBACK (on_drag_end), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (drag));
  g_signal_connect (pinch, "scale-changed", G_CALLBACK (on_pinch), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (pinch));
  g_signal_connect (scroll, "scroll", G_CALLBACK (on_scroll), self);
  gtk_widget_add_controller (GTK_WIDGET (self), scroll);
}

SlPlotView *
sl_plot_view_new (SlPlotKind kind)
{
  SlPlotView *self = g_object_new (SL_TYPE_PLOT_VIEW, NULL);

  self->kind = kind;
  return self;
}
