/* test-gui.c: the window on the demo project, under Xvfb (tests/meson.build
 * runs it as it runs gui-smoke).  One SlApplication is registered (not
 * run): it loads the help overlay and the app actions; the test spins the
 * main loop itself until what it waits for holds, or fails after a time
 * limit.  The checks reach into the window through the few test-only
 * accessors of sl-window.h, sl-plot-view.h and sl-catalogue-view.h, and
 * otherwise through the core API and the widgets' own signals.
 *
 * Pictures of the window, the About window and the shortcuts window are
 * rendered (GtkWidgetPaintable -> render node -> cairo) into the test
 * build directory: gui-snapshot.png, gui-selected.png, gui-about.png,
 * gui-shortcuts.png.  Look at them after changing what the window shows. */
#include <errno.h>
#include <locale.h>
#include <stdlib.h>
#include <string.h>

#include "derivation.h"
#include "ledger.h"
#include "sl-application.h"
#include "sl-catalogue-row.h"
#include "sl-catalogue-view.h"
#include "sl-import-dialog.h"
#include "sl-plot-view.h"
#include "sl-window.h"
#include "summary.h"
#include "test-util.h"

#define DEMO_STARS 328
#define LOAD_TIMEOUT_S 60.0
#define FRAME_TIMEOUT_S 10.0

static SlApplication *app;
static SlWindow      *demo;   /* the window on the demo project, made by the first test that needs it */

/* ------------------------------------------------------------------ */
/* Waiting                                                            */

/* Spins the main loop until COND holds; fails the test (and returns from
 * it) after SECONDS.  A timer in main() wakes the loop every 20 ms. */
#define WAIT_UNTIL(cond, seconds, what)                                                       \
  G_STMT_START {                                                                              \
    gint64 wait_end_ = g_get_monotonic_time () + (gint64) ((seconds) * G_USEC_PER_SEC);       \
    while (!(cond))                                                                           \
      {                                                                                       \
        if (g_get_monotonic_time () > wait_end_)                                              \
          {                                                                                   \
            g_test_fail_printf ("timed out after %.0f s waiting for %s", (double) (seconds), (what)); \
            return;                                                                           \
          }                                                                                   \
        g_main_context_iteration (NULL, TRUE);                                                \
      }                                                                                       \
  } G_STMT_END

static gboolean
wake (gpointer data)
{
  return G_SOURCE_CONTINUE;
}

static void
count_paint (GdkFrameClock *clock, guint *painted)
{
  (*painted)++;
}

/* Asks TOPLEVEL for a new frame and spins until it has been painted:
 * everything changed before the call is on screen after it.  FALSE on a
 * time-out (the test has failed then). */
static gboolean
wait_for_paint (GtkWidget *toplevel)
{
  gint64 end = g_get_monotonic_time () + (gint64) (FRAME_TIMEOUT_S * G_USEC_PER_SEC);
  GdkFrameClock *clock;
  guint painted = 0;
  gulong handler;

  while (!gtk_widget_get_mapped (toplevel) || gtk_widget_get_frame_clock (toplevel) == NULL)
    {
      if (g_get_monotonic_time () > end)
        {
          g_test_fail_printf ("%s was never mapped", G_OBJECT_TYPE_NAME (toplevel));
          return FALSE;
        }
      g_main_context_iteration (NULL, TRUE);
    }
  clock = gtk_widget_get_frame_clock (toplevel);
  handler = g_signal_connect (clock, "after-paint", G_CALLBACK (count_paint), &painted);
  gtk_widget_queue_draw (toplevel);
  while (painted == 0 && g_get_monotonic_time () <= end)
    g_main_context_iteration (NULL, TRUE);
  g_signal_handler_disconnect (clock, handler);
  if (painted == 0)
    g_test_fail_printf ("%s painted no frame in %.0f s", G_OBJECT_TYPE_NAME (toplevel), FRAME_TIMEOUT_S);
  return painted > 0;
}

#define PAINT(widget)                                        \
  G_STMT_START {                                             \
    if (!wait_for_paint (GTK_WIDGET (widget)))               \
      return;                                                \
  } G_STMT_END

static GtkWindow *find_toplevel (GType type);

static SlPlotView *
view (SlPlotKind kind)
{
  return sl_window_get_view (demo, kind);
}

static guint
drawn (SlPlotKind kind)
{
  return sl_plot_view_get_n_drawn (view (kind));
}

/* The window on a fresh demo project, with the views' stars loaded.
 * FALSE if that failed (the test has failed then). */
static gboolean
ensure_demo (void)
{
  g_autoptr (GError) error = NULL;
  gint64 end;

  if (demo == NULL)
    {
      demo = sl_window_new (GTK_APPLICATION (app));
      gtk_window_present (GTK_WINDOW (demo));
      if (!sl_window_open_demo (demo, &error))
        {
          g_test_fail_printf ("the demo project does not open: %s", error->message);
          return FALSE;
        }
    }
  end = g_get_monotonic_time () + (gint64) (LOAD_TIMEOUT_S * G_USEC_PER_SEC);
  while (sl_window_is_loading (demo))
    {
      if (g_get_monotonic_time () > end)
        {
          g_test_fail_printf ("the window was still loading after %.0f s", LOAD_TIMEOUT_S);
          return FALSE;
        }
      g_main_context_iteration (NULL, TRUE);
    }
  return wait_for_paint (GTK_WIDGET (demo));
}

#define ENSURE_DEMO()      \
  G_STMT_START {           \
    if (!ensure_demo ())   \
      return;              \
  } G_STMT_END

static char *
demo_path (void)
{
  return g_build_filename (g_get_user_cache_dir (), "starledger", "demo.starledger", NULL);
}

/* A click on a star (or on nothing: NULL) in VIEW, as the view reports it. */
static void
click_star (SlPlotKind kind, const char *designation, gboolean extend)
{
  g_signal_emit_by_name (view (kind), "star-selected", designation, extend);
}

static int
compare_strings (const void *a, const void *b)
{
  return strcmp (*(const char *const *) a, *(const char *const *) b);
}

/* The designations of the rows selected in the Catalogue, sorted. */
static GStrv
catalogue_selected (void)
{
  GtkSelectionModel *model = sl_catalogue_view_get_selection_model (sl_window_get_catalogue (demo));
  g_autoptr (GtkBitset) set = gtk_selection_model_get_selection (model);
  g_autoptr (GStrvBuilder) builder = g_strv_builder_new ();
  GtkBitsetIter iter;
  guint position;
  GStrv result;

  for (gboolean more = gtk_bitset_iter_init_first (&iter, set, &position); more;
       more = gtk_bitset_iter_next (&iter, &position))
    {
      g_autoptr (SlCatalogueRow) row = g_list_model_get_item (G_LIST_MODEL (model), position);

      g_strv_builder_add (builder, sl_catalogue_row_get_designation (row));
    }
  result = g_strv_builder_end (builder);
  qsort (result, g_strv_length (result), sizeof (char *), compare_strings);
  return result;
}

static guint
catalogue_rows (void)
{
  return g_list_model_get_n_items (G_LIST_MODEL (sl_catalogue_view_get_selection_model (sl_window_get_catalogue (demo))));
}

/* The window's selection as one string, "A|B" (sorted), "" for none. */
static char *
window_selection (void)
{
  g_auto (GStrv) copy = g_strdupv ((char **) sl_window_get_selection (demo));

  if (copy == NULL)
    return g_strdup ("");
  qsort (copy, g_strv_length (copy), sizeof (char *), compare_strings);
  return g_strjoinv ("|", copy);
}

static char *
catalogue_selection (void)
{
  g_auto (GStrv) selected = catalogue_selected ();

  return g_strjoinv ("|", selected);
}

/* ------------------------------------------------------------------ */
/* Pictures                                                           */

/* WIDGET as it was last drawn, on an image surface of its size. */
static cairo_surface_t *
render_widget (GtkWidget *widget)
{
  g_autoptr (GdkPaintable) paintable = gtk_widget_paintable_new (widget);
  int width = gdk_paintable_get_intrinsic_width (paintable);
  int height = gdk_paintable_get_intrinsic_height (paintable);
  GtkSnapshot *snapshot = gtk_snapshot_new ();
  cairo_surface_t *surface;
  GskRenderNode *node;
  cairo_t *cr;

  g_assert_cmpint (width, >, 0);
  g_assert_cmpint (height, >, 0);
  gdk_paintable_snapshot (paintable, GDK_SNAPSHOT (snapshot), width, height);
  node = gtk_snapshot_free_to_node (snapshot);
  surface = cairo_image_surface_create (CAIRO_FORMAT_ARGB32, width, height);
  cr = cairo_create (surface);
  if (node)
    {
      gsk_render_node_draw (node, cr);
      gsk_render_node_unref (node);
    }
  cairo_destroy (cr);
  cairo_surface_flush (surface);
  return surface;
}

static void
save_png (cairo_surface_t *surface, const char *name)
{
  g_autofree char *path = g_build_filename (g_test_get_dir (G_TEST_BUILT), name, NULL);

  g_assert_cmpint (cairo_surface_write_to_png (surface, path), ==, CAIRO_STATUS_SUCCESS);
  g_test_message ("wrote %s", path);
}

typedef struct {
  guint n;             /* pixels looked at */
  guint dark;          /* luminance < 100 */
  guint coloured;      /* max - min channel >= 60 */
  guint dark_bands;    /* runs of scanlines with dark pixels: lines of text */
  guint colours;       /* distinct colours */
} Census;

/* What the pixels of RECT (clipped to the surface) are like. */
static Census
census (cairo_surface_t *surface, int x0, int y0, int x1, int y1)
{
  const guint8 *data = cairo_image_surface_get_data (surface);
  int stride = cairo_image_surface_get_stride (surface);
  g_autoptr (GHashTable) colours = g_hash_table_new (g_direct_hash, g_direct_equal);
  gboolean previous_dark_line = FALSE;
  Census c = { 0 };

  x0 = MAX (x0, 0), y0 = MAX (y0, 0);
  x1 = MIN (x1, cairo_image_surface_get_width (surface));
  y1 = MIN (y1, cairo_image_surface_get_height (surface));
  for (int y = y0; y < y1; y++)
    {
      const guint32 *line = (const guint32 *) (data + (gsize) y * stride);
      gboolean dark_line = FALSE;

      for (int x = x0; x < x1; x++)
        {
          guint32 p = line[x];
          int a = p >> 24, r = (p >> 16) & 0xff, g = (p >> 8) & 0xff, b = p & 0xff;
          int hi = MAX (r, MAX (g, b)), lo = MIN (r, MIN (g, b));

          c.n++;
          g_hash_table_add (colours, GUINT_TO_POINTER (p));
          if (a < 128)
            continue;
          if (0.30 * r + 0.59 * g + 0.11 * b < 100)
            c.dark++, dark_line = TRUE;
          if (hi - lo >= 60)
            c.coloured++;
        }
      if (dark_line && !previous_dark_line)
        c.dark_bands++;
      previous_dark_line = dark_line;
    }
  c.colours = g_hash_table_size (colours);
  return c;
}

/* The census of WIDGET's area in a picture of the window. */
static Census
census_of (cairo_surface_t *surface, GtkWidget *widget)
{
  graphene_rect_t bounds;

  g_assert_true (gtk_widget_compute_bounds (widget, GTK_WIDGET (demo), &bounds));
  return census (surface, (int) bounds.origin.x, (int) bounds.origin.y,
                 (int) (bounds.origin.x + bounds.size.width), (int) (bounds.origin.y + bounds.size.height));
}

/* ------------------------------------------------------------------ */
/* Tests                                                              */

/* The demo project opens with every view drawn: the table holds every
 * star, the HR diagram and the sky draw most of them, the parallax view
 * (nothing selected) draws no panel and says how to choose stars. */
static void
test_demo_populated (void)
{
  cairo_surface_t *picture;
  Census c;

  ENSURE_DEMO ();
  click_star (SL_PLOT_KIND_SKY, NULL, FALSE);
  PAINT (demo);

  g_assert_cmpuint (catalogue_rows (), ==, DEMO_STARS);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_HRD), >, 200);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_HRD), <=, DEMO_STARS);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_SKY), >, 300);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_SKY), <=, DEMO_STARS);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_PARALLAX), ==, 0);
  g_test_message ("drawn: HR %u, sky %u of %u stars", drawn (SL_PLOT_KIND_HRD), drawn (SL_PLOT_KIND_SKY),
                  DEMO_STARS);

  /* The message: dark text on white, nothing coloured. */
  picture = render_widget (GTK_WIDGET (view (SL_PLOT_KIND_PARALLAX)));
  c = census (picture, 0, 0, G_MAXINT, G_MAXINT);
  g_test_message ("parallax view: %u dark pixels in %u bands, %u coloured", c.dark, c.dark_bands, c.coloured);
  g_assert_cmpuint (c.dark, >, 100);
  g_assert_cmpuint (c.dark_bands, >=, 1);
  g_assert_cmpuint (c.dark_bands, <=, 4);
  g_assert_cmpuint (c.coloured, ==, 0);
  cairo_surface_destroy (picture);
}

/* One selection for all: a click in a view selects in the window, the
 * table and the parallax view; Ctrl adds; a click on nothing clears; a
 * row selected in the table reaches the views. */
static void
test_selection_shared (void)
{
  GtkSelectionModel *rows;
  g_autofree char *s1 = NULL, *s2 = NULL, *s3 = NULL, *s4 = NULL, *s5 = NULL, *s6 = NULL, *s7 = NULL,
                  *s8 = NULL;

  ENSURE_DEMO ();
  click_star (SL_PLOT_KIND_SKY, "LHO 0004", FALSE);
  g_assert_cmpstr ((s1 = window_selection ()), ==, "LHO 0004");
  g_assert_cmpstr ((s2 = catalogue_selection ()), ==, "LHO 0004");
  PAINT (demo);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_PARALLAX), ==, 1);

  click_star (SL_PLOT_KIND_HRD, "LHO 0010", TRUE);
  g_assert_cmpstr ((s3 = window_selection ()), ==, "LHO 0004|LHO 0010");
  g_assert_cmpstr ((s4 = catalogue_selection ()), ==, "LHO 0004|LHO 0010");
  PAINT (demo);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_PARALLAX), ==, 2);

  /* Ctrl on a selected star takes nothing away twice, adds nothing. */
  click_star (SL_PLOT_KIND_SKY, "LHO 0010", TRUE);
  g_assert_cmpstr ((s5 = window_selection ()), ==, "LHO 0004|LHO 0010");

  click_star (SL_PLOT_KIND_SKY, NULL, FALSE);
  g_assert_cmpstr ((s6 = window_selection ()), ==, "");
  g_assert_cmpstr ((s7 = catalogue_selection ()), ==, "");
  PAINT (demo);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_PARALLAX), ==, 0);

  /* The table's own selection (row 3 is LHO 0003 in id order). */
  rows = sl_catalogue_view_get_selection_model (sl_window_get_catalogue (demo));
  g_assert_true (gtk_selection_model_select_item (rows, 2, TRUE));
  g_assert_cmpstr ((s8 = window_selection ()), ==, "LHO 0003");
  PAINT (demo);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_PARALLAX), ==, 1);

  click_star (SL_PLOT_KIND_SKY, NULL, FALSE);
  PAINT (demo);
}

/* The newest ledger entry of the project at PATH, or NULL. */
static SlLedgerEntry *
newest_entry (const char *path, guint *n_entries)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_open (path, &error);
  g_autoptr (GPtrArray) entries = NULL;
  SlLedgerEntry *newest;

  g_assert_no_error (error);
  entries = sl_ledger_read (project, &error);
  g_assert_no_error (error);
  g_ptr_array_set_free_func (entries, (GDestroyNotify) sl_ledger_entry_free);
  *n_entries = entries->len;
  if (entries->len == 0)
    return NULL;
  newest = g_ptr_array_steal_index (entries, entries->len - 1);
  return newest;
}

static gint64
stale_stars (const char *path)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_open (path, &error);
  g_autoptr (SlProjectSummary) summary = NULL;

  g_assert_no_error (error);
  summary = sl_project_summary (project, &error);
  g_assert_no_error (error);
  return summary->n_stale;
}

/* The text of every GtkTextView in the window, in widget order. */
static void
collect_text_views (GtkWidget *widget, GPtrArray *texts)
{
  if (GTK_IS_TEXT_VIEW (widget))
    {
      GtkTextBuffer *buffer = gtk_text_view_get_buffer (GTK_TEXT_VIEW (widget));
      GtkTextIter start, end;

      gtk_text_buffer_get_bounds (buffer, &start, &end);
      g_ptr_array_add (texts, gtk_text_buffer_get_text (buffer, &start, &end, FALSE));
    }
  for (GtkWidget *child = gtk_widget_get_first_child (widget); child; child = gtk_widget_get_next_sibling (child))
    collect_text_views (child, texts);
}

/* Whether a text view of the window begins with PREFIX. */
static gboolean
text_view_starts_with (const char *prefix)
{
  g_autoptr (GPtrArray) texts = g_ptr_array_new_with_free_func (g_free);

  collect_text_views (GTK_WIDGET (demo), texts);
  for (guint i = 0; i < texts->len; i++)
    if (g_str_has_prefix (texts->pdata[i], prefix))
      return TRUE;
  return FALSE;
}

/* Whether a text view of the window holds TEXT. */
static gboolean
text_view_contains (const char *text)
{
  g_autoptr (GPtrArray) texts = g_ptr_array_new_with_free_func (g_free);

  collect_text_views (GTK_WIDGET (demo), texts);
  for (guint i = 0; i < texts->len; i++)
    if (strstr (texts->pdata[i], text) != NULL)
      return TRUE;
  return FALSE;
}

/* The text view whose first line begins with AT, the time of a ledger
 * entry: the Ledger tab shows the newest entry first. */
static gboolean
ledger_view_starts_with (const char *at, const char *action)
{
  g_autoptr (GPtrArray) texts = g_ptr_array_new_with_free_func (g_free);

  collect_text_views (GTK_WIDGET (demo), texts);
  for (guint i = 0; i < texts->len; i++)
    {
      const char *text = texts->pdata[i];
      g_autofree char *first = g_strndup (text, strcspn (text, "\n"));

      if (g_str_has_prefix (first, at) && strstr (first, action))
        return TRUE;
    }
  return FALSE;
}

/* The first widget of TYPE under WIDGET, depth first. */
static GtkWidget *
find_descendant (GtkWidget *widget, GType type)
{
  if (G_TYPE_CHECK_INSTANCE_TYPE (widget, type))
    return widget;
  for (GtkWidget *child = gtk_widget_get_first_child (widget); child; child = gtk_widget_get_next_sibling (child))
    {
      GtkWidget *found = find_descendant (child, type);

      if (found)
        return found;
    }
  return NULL;
}

/* The first button under WIDGET that activates ACTION. */
static GtkWidget *
action_button (GtkWidget *widget, const char *action)
{
  if (GTK_IS_BUTTON (widget) && g_strcmp0 (gtk_actionable_get_action_name (GTK_ACTIONABLE (widget)), action) == 0)
    return widget;
  for (GtkWidget *child = gtk_widget_get_first_child (widget); child; child = gtk_widget_get_next_sibling (child))
    {
      GtkWidget *found = action_button (child, action);

      if (found)
        return found;
    }
  return NULL;
}

/* A value set by hand makes a star stale; Derive in the window derives
 * that one star, the ledger says so, nothing is stale after, and the
 * Trail, showing that star, explains the new run's value. */
static void
test_actions_derive (void)
{
  g_autofree char *path = demo_path ();
  g_autoptr (GError) error = NULL;
  g_autoptr (SlLedgerEntry) before = NULL;
  g_autoptr (SlLedgerEntry) after = NULL;
  g_autofree char *trail = NULL;
  const char *run;
  guint n_before = 0, n_after = 0;

  ENSURE_DEMO ();
  click_star (SL_PLOT_KIND_SKY, "LHO 0004", FALSE);
  g_assert_true (text_view_starts_with ("LHO 0004: lum\nDerived in run "));
  {
    g_autoptr (SlProject) project = sl_project_open (path, &error);

    g_assert_no_error (error);
    g_assert_true (sl_override_set (project, "LHO 0004", SL_Q_TEFF, 5600.0, NAN, NAN, "test-gui", &error));
    g_assert_no_error (error);
  }
  g_assert_cmpint (stale_stars (path), ==, 1);
  before = newest_entry (path, &n_before);
  g_assert_nonnull (before);
  g_assert_cmpstr (before->action, ==, "override");

  g_assert_true (gtk_widget_get_sensitive (action_button (GTK_WIDGET (demo), "win.derive")));
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.derive", NULL));
  g_assert_true (sl_window_is_loading (demo));
  /* Long work shows its progress and a way to cancel it. */
  g_assert_true (gtk_revealer_get_reveal_child (GTK_REVEALER (find_descendant (GTK_WIDGET (demo), GTK_TYPE_REVEALER))));
  g_assert_true (gtk_widget_get_sensitive (action_button (GTK_WIDGET (demo), "win.cancel-work")));
  /* One derivation at a time: the button is off while it runs. */
  g_assert_false (gtk_widget_get_sensitive (action_button (GTK_WIDGET (demo), "win.derive")));
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the derivation and the reload");

  after = newest_entry (path, &n_after);
  g_assert_cmpuint (n_after, ==, n_before + 1);
  g_assert_cmpstr (after->action, ==, "derive");
  g_assert_nonnull (strstr (after->details, "\"stars\":1,"));
  run = strstr (after->details, "\"run_id\":");
  g_assert_nonnull (run);
  trail = g_strdup_printf ("LHO 0004: lum\nDerived in run %d ", atoi (run + strlen ("\"run_id\":")));
  g_assert_true (text_view_starts_with (trail));
  g_assert_cmpint (stale_stars (path), ==, 0);
  g_assert_true (ledger_view_starts_with (after->at, "derive"));
  g_assert_false (gtk_revealer_get_reveal_child (GTK_REVEALER (find_descendant (GTK_WIDGET (demo), GTK_TYPE_REVEALER))));
  /* Derive can be asked for again. */
  g_assert_true (gtk_widget_get_sensitive (action_button (GTK_WIDGET (demo), "win.derive")));
  click_star (SL_PLOT_KIND_SKY, NULL, FALSE);
  PAINT (demo);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_HRD), >, 200);
}

/* The open message dialog of the window, if any. */
static AdwMessageDialog *
open_message_dialog (void)
{
  GListModel *toplevels = gtk_window_get_toplevels ();

  for (guint i = 0; i < g_list_model_get_n_items (toplevels); i++)
    {
      g_autoptr (GObject) window = g_list_model_get_item (toplevels, i);

      if (ADW_IS_MESSAGE_DIALOG (window) && gtk_widget_get_visible (GTK_WIDGET (window)))
        return ADW_MESSAGE_DIALOG (window);
    }
  return NULL;
}

/* The dialog's entries in order: value, lower, upper bound, reason. */
static void
fill_form (AdwMessageDialog *dialog, const char *const texts[4])
{
  GtkWidget *grid = adw_message_dialog_get_extra_child (dialog);
  int row = 0;

  for (GtkWidget *child = gtk_widget_get_first_child (grid); child; child = gtk_widget_get_next_sibling (child))
    if (GTK_IS_ENTRY (child))
      gtk_editable_set_text (GTK_EDITABLE (child), texts[row++]);
  g_assert_cmpint (row, ==, 4);
}

/* Set by Hand in the Trail: the dialog's value lands in the project with
 * its reason, what follows is derived again, and Clear takes it back. */
static void
test_trail_override (void)
{
  g_autofree char *path = demo_path ();
  const char *const form[4] = { "6100", "6050", "6150", "spectroscopic Teff from the test" };
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) overrides = NULL;
  AdwMessageDialog *dialog;
  gint64 star;

  ENSURE_DEMO ();
  click_star (SL_PLOT_KIND_SKY, "LHO 0004", FALSE);
  g_signal_emit_by_name (sl_window_get_catalogue (demo), "cell-activated", "LHO 0004", "teff");
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.override", NULL));
  WAIT_UNTIL ((dialog = open_message_dialog ()) != NULL, FRAME_TIMEOUT_S, "the dialog");
  fill_form (dialog, form);
  PAINT (GTK_WIDGET (dialog));
  {
    cairo_surface_t *picture = render_widget (GTK_WIDGET (dialog));

    save_png (picture, "gui-override.png");
    cairo_surface_destroy (picture);
  }
  /* As a click on Set does: the response, then the dialog closes. */
  adw_message_dialog_response (dialog, "set");
  gtk_window_close (GTK_WINDOW (dialog));
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the override and its derivation");

  project = sl_project_open (path, &error);
  g_assert_no_error (error);
  star = sl_star_lookup (project, "LHO 0004", &error);
  overrides = sl_overrides_for_star (project, star, &error);
  g_assert_cmpuint (overrides->len, ==, 1);
  g_assert_cmpfloat (g_array_index (overrides, SlOverride, 0).value, ==, 6100.0);
  g_assert_cmpfloat (g_array_index (overrides, SlOverride, 0).hi, ==, 6150.0);
  g_assert_cmpint (stale_stars (path), ==, 0);
  g_assert_true (text_view_contains ("SET BY HAND"));
  g_assert_true (text_view_contains ("spectroscopic Teff from the test"));

  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.clear-override", NULL));
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the clear and its derivation");
  g_clear_pointer (&overrides, g_array_unref);
  overrides = sl_overrides_for_star (project, star, &error);
  g_assert_cmpuint (overrides->len, ==, 0);
  g_assert_false (text_view_contains ("SET BY HAND"));
}

/* The Ledger's filters: one kind of change, one person. */
static void
test_ledger_filters (void)
{
  GtkDropDown *kind = NULL;
  GtkSearchEntry *person = NULL;
  GtkWidget *w;

  ENSURE_DEMO ();
  /* Find the two filter widgets in the window. */
  for (w = GTK_WIDGET (demo); w; )
    {
      if (GTK_IS_DROP_DOWN (w) && kind == NULL)
        kind = GTK_DROP_DOWN (w);
      if (GTK_IS_SEARCH_ENTRY (w) && person == NULL)
        {
          g_autofree char *placeholder = NULL;

          /* Not the drop-down's own search entry: the one that asks who. */
          g_object_get (w, "placeholder-text", &placeholder, NULL);
          if (g_strcmp0 (placeholder, "Who") == 0)
            person = GTK_SEARCH_ENTRY (w);
        }
      /* Depth-first walk. */
      if (gtk_widget_get_first_child (w))
        w = gtk_widget_get_first_child (w);
      else
        {
          while (w && !gtk_widget_get_next_sibling (w))
            w = gtk_widget_get_parent (w);
          if (w)
            w = gtk_widget_get_next_sibling (w);
        }
    }
  g_assert_nonnull (kind);
  g_assert_nonnull (person);

  gtk_drop_down_set_selected (kind, 3);   /* import */
  g_assert_true (text_view_contains ("import    imported astrometry.csv"));
  {
    GtkWidget *notebook = gtk_widget_get_ancestor (GTK_WIDGET (kind), GTK_TYPE_NOTEBOOK);
    cairo_surface_t *picture;

    gtk_notebook_set_current_page (GTK_NOTEBOOK (notebook), 1);
    PAINT (demo);
    picture = render_widget (notebook);
    save_png (picture, "gui-ledger.png");
    cairo_surface_destroy (picture);
    gtk_notebook_set_current_page (GTK_NOTEBOOK (notebook), 0);
  }
  g_assert_false (text_view_contains ("create    created the project"));
  gtk_drop_down_set_selected (kind, 0);
  g_assert_true (text_view_contains ("create    created the project"));
  gtk_editable_set_text (GTK_EDITABLE (person), "nobody-by-that-name");
  WAIT_UNTIL (!text_view_contains ("created the project"), FRAME_TIMEOUT_S, "the person filter");
  gtk_editable_set_text (GTK_EDITABLE (person), "");
  WAIT_UNTIL (text_view_contains ("created the project"), FRAME_TIMEOUT_S, "the filter cleared");
}

static GtkDropTarget *
drop_target (GtkWidget *widget)
{
  g_autoptr (GListModel) controllers = gtk_widget_observe_controllers (widget);

  for (guint i = 0; i < g_list_model_get_n_items (controllers); i++)
    {
      g_autoptr (GObject) controller = g_list_model_get_item (controllers, i);

      if (GTK_IS_DROP_TARGET (controller))
        return GTK_DROP_TARGET (controller);
    }
  return NULL;
}

/* A CSV file dropped on the window opens the import assistant, whose
 * Import imports it in a thread: one new star in the table and on the sky. */
static void
test_actions_import_by_drop (void)
{
  static const char csv[] =
    "id,ra,ra_err,dec,dec_err,epoch,parallax,parallax_err,vmag,vmag_err\n"
    "GUI 0001,150.125,0.3,20.5,0.3,2026.25,41.2,0.3,8.75,0.02\n";
  g_autofree char *path = demo_path ();
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *file = sl_test_write_file (dir, "gui-drop.csv", csv, -1);
  g_autoptr (GFile) gfile = g_file_new_for_path (file);
  g_autoptr (SlLedgerEntry) newest = NULL;
  g_auto (GValue) value = G_VALUE_INIT;
  GtkDropTarget *target;
  SlImportDialog *assistant;
  guint rows, sky, n_entries;
  gboolean accepted = FALSE;

  ENSURE_DEMO ();
  target = drop_target (GTK_WIDGET (demo));
  g_assert_nonnull (target);
  rows = catalogue_rows ();
  sky = drawn (SL_PLOT_KIND_SKY);

  g_value_init (&value, G_TYPE_FILE);
  g_value_set_object (&value, gfile);
  g_signal_emit_by_name (target, "drop", &value, 100.0, 100.0, &accepted);
  g_assert_true (accepted);
  /* The drop opens the import assistant; its Import runs the import in a
   * thread, with the window's progress bar and Cancel. */
  assistant = SL_IMPORT_DIALOG (find_toplevel (SL_TYPE_IMPORT_DIALOG));
  g_assert_nonnull (assistant);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.import", NULL));
  g_assert_true (sl_window_is_working (demo));
  WAIT_UNTIL (!sl_window_is_loading (demo) && catalogue_rows () == rows + 1, LOAD_TIMEOUT_S,
              "the table to show the imported star");
  newest = newest_entry (path, &n_entries);
  g_assert_cmpstr (newest->action, ==, "import");
  PAINT (demo);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_SKY), ==, sky + 1);
  g_assert_true (ledger_view_starts_with (newest->at, "import"));
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* The import assistant                                               */

/* The row count SQL gives in the project at PATH. */
static gint64
count_in (const char *path, const char *sql)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_open (path, &error);

  g_assert_no_error (error);
  return sl_test_query_int (sl_project_db (project), sql);
}

/* Selects the item of CHOOSER whose text is TEXT, as a click would. */
static void
choose (GtkDropDown *chooser, const char *text)
{
  GListModel *model = gtk_drop_down_get_model (chooser);

  for (guint i = 0; i < g_list_model_get_n_items (model); i++)
    if (g_strcmp0 (gtk_string_list_get_string (GTK_STRING_LIST (model), i), text) == 0)
      {
        gtk_drop_down_set_selected (chooser, i);
        return;
      }
  g_test_fail_printf ("no item '%s' in the chooser", text);
}

static void
save_window_png (GtkWidget *window, const char *name)
{
  cairo_surface_t *picture;
  Census c;

  picture = render_widget (window);
  save_png (picture, name);
  c = census (picture, 0, 0, G_MAXINT, G_MAXINT);
  g_assert_cmpuint (c.dark, >, 500);   /* text, not a blank window */
  cairo_surface_destroy (picture);
}

/* The assistant on a semicolon file whose id column is called 'name',
 * whose parallaxes are in arcsec, and with one bad row (and markup-like
 * text in its name, a header and a cell, shown as written): the preview guesses
 * the columns named like fields, the check reports without writing, and
 * the import stores the parallaxes converted to mas and the rejected row. */
static void
test_import_assistant (void)
{
  static const char csv[] =
    "name;ra;dec;parallax;vmag;seeing & <b>notes</b>\n"
    "GUI B001;151.25;21.5;0.0412;8.75;good <i>& calm\n"
    "GUI B002;152.5;22.25;0.0105;9.5;\n"
    "GUI B003;153.0;23.0;0,02;10.25;\n";
  g_autofree char *path = demo_path ();
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *file = sl_test_write_file (dir, "gui <assistant> & co.csv", csv, -1);
  const SlImportPreview *preview;
  SlImportDialog *assistant;
  AdwMessageDialog *reasons;
  gint64 sources, measurements, ledger, stars;
  const SlField guessed[] = { SL_FIELD_NONE, SL_FIELD_RA, SL_FIELD_DEC, SL_FIELD_PARALLAX, SL_FIELD_VMAG,
                              SL_FIELD_NONE };

  ENSURE_DEMO ();
  WAIT_UNTIL (!sl_window_is_working (demo) && !sl_window_is_loading (demo), LOAD_TIMEOUT_S,
              "earlier work to finish");
  sources = count_in (path, "SELECT count(*) FROM sources");
  measurements = count_in (path, "SELECT count(*) FROM measurements");
  ledger = count_in (path, "SELECT count(*) FROM ledger");
  stars = count_in (path, "SELECT count(*) FROM stars");

  assistant = sl_import_dialog_open (demo, file);
  g_assert_nonnull (assistant);
  g_assert_true (gtk_window_get_transient_for (GTK_WINDOW (assistant)) == GTK_WINDOW (demo));
  g_assert_true (gtk_window_get_modal (GTK_WINDOW (assistant)));

  /* The preview: delimiter detected, known columns found by name, no id. */
  preview = sl_import_dialog_get_preview (assistant);
  g_assert_cmpint (preview->delimiter, ==, ';');
  g_assert_cmpuint (preview->columns->len, ==, G_N_ELEMENTS (guessed));
  g_assert_cmpuint (preview->rows->len, ==, 3);
  for (guint c = 0; c < G_N_ELEMENTS (guessed); c++)
    {
      g_assert_cmpint (g_array_index (preview->columns, SlPreviewColumn, c).automatic, ==, guessed[c]);
      g_assert_cmpuint (gtk_drop_down_get_selected (sl_import_dialog_get_field_chooser (assistant, c)), ==,
                        guessed[c] == SL_FIELD_NONE ? 0 : guessed[c] + 1);
    }
  g_assert_nonnull (sl_import_dialog_get_problem (assistant));
  g_assert_nonnull (strstr (sl_import_dialog_get_problem (assistant), "id"));
  PAINT (assistant);
  save_window_png (GTK_WIDGET (assistant), "gui-import-guess.png");

  /* The choices, through the choosers. */
  choose (sl_import_dialog_get_field_chooser (assistant, 0), "id");
  choose (sl_import_dialog_get_unit_chooser (assistant, 3), "arcsec");
  g_assert_null (sl_import_dialog_get_problem (assistant));
  preview = sl_import_dialog_get_preview (assistant);
  g_assert_cmpint (g_array_index (preview->columns, SlPreviewColumn, 0).field, ==, SL_FIELD_ID);
  g_assert_cmpint (g_array_index (preview->columns, SlPreviewColumn, 3).unit, ==, SL_UNIT_ARCSEC);

  /* The check: a dry run in a thread; counts and the bad row shown, the
   * project as it was. */
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.check", NULL));
  g_assert_true (sl_import_dialog_is_checking (assistant));
  WAIT_UNTIL (!sl_import_dialog_is_checking (assistant), LOAD_TIMEOUT_S, "the check");
  g_test_message ("check: %s", sl_import_dialog_get_check_summary (assistant));
  g_assert_nonnull (strstr (sl_import_dialog_get_check_summary (assistant),
                            "Of 3 rows read, 2 would be imported and 1 rejected; 2 new stars."));
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM sources"), ==, sources);
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM measurements"), ==, measurements);
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM ledger"), ==, ledger);
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM stars"), ==, stars);
  PAINT (assistant);
  save_window_png (GTK_WIDGET (assistant), "gui-import-assistant.png");
  {
    /* The lower half: the columns' choosers and the check's findings. */
    GtkScrolledWindow *scroller = GTK_SCROLLED_WINDOW (find_descendant (GTK_WIDGET (assistant),
                                                                        GTK_TYPE_SCROLLED_WINDOW));
    GtkAdjustment *adjustment = gtk_scrolled_window_get_vadjustment (scroller);

    gtk_adjustment_set_value (adjustment, gtk_adjustment_get_upper (adjustment));
    PAINT (assistant);
    save_window_png (GTK_WIDGET (assistant), "gui-import-check.png");
  }

  /* Import: the dialog closes, the window imports with those choices. */
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.import", NULL));
  g_assert_null (find_toplevel (SL_TYPE_IMPORT_DIALOG));
  WAIT_UNTIL (!sl_window_is_working (demo) && !sl_window_is_loading (demo)
              && count_in (path, "SELECT count(*) FROM sources") == sources + 1,
              LOAD_TIMEOUT_S, "the import");
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM measurements"), ==, measurements + 2);
  sl_assert_close ((double) count_in (path, "SELECT round (m.parallax * 1000) FROM measurements m "
                                            "JOIN stars s ON s.id = m.star_id WHERE s.designation = 'GUI B001'"),
                   41200.0, 0.0, "0.0412 arcsec stored as 41.2 mas");
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM rejected_rows r JOIN sources s ON s.id = r.source_id "
                                   "WHERE s.file_name = 'gui <assistant> & co.csv' AND r.line = 4 "
                                   "AND r.column_name = 'parallax'"), ==, 1);
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM sources WHERE file_name = 'gui <assistant> & co.csv' "
                                   "AND json_extract (mapping, '$[0].column') = 'name'"), ==, 1);

  /* The toast's button: the rejected row with its reason. */
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "import-result.show-rejections", NULL));
  WAIT_UNTIL ((reasons = open_message_dialog ()) != NULL, FRAME_TIMEOUT_S, "the reasons");
  PAINT (reasons);
  save_window_png (GTK_WIDGET (reasons), "gui-import-reasons.png");
  gtk_window_close (GTK_WINDOW (reasons));
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* The entry row under WIDGET whose title starts with TITLE. */
static GtkWidget *
find_entry_row (GtkWidget *widget, const char *title)
{
  if (ADW_IS_ENTRY_ROW (widget)
      && g_str_has_prefix (adw_preferences_row_get_title (ADW_PREFERENCES_ROW (widget)), title))
    return widget;
  for (GtkWidget *child = gtk_widget_get_first_child (widget); child; child = gtk_widget_get_next_sibling (child))
    {
      GtkWidget *found = find_entry_row (child, title);

      if (found)
        return found;
    }
  return NULL;
}

/* A change of delimiter reads the file again: with a comma the semicolon
 * file is one column, and nothing is mapped; a bad epoch is named;
 * closing the assistant writes nothing. */
static void
test_import_assistant_delimiter (void)
{
  static const char csv[] = "id;parallax\nGUI C001;12.5\n";
  g_autofree char *path = demo_path ();
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *file = sl_test_write_file (dir, "gui-delimiter.csv", csv, -1);
  SlImportDialog *assistant;
  const SlImportPreview *preview;
  AdwComboRow *delimiter = NULL;
  GtkWidget *epoch;
  gint64 sources;

  ENSURE_DEMO ();
  WAIT_UNTIL (!sl_window_is_working (demo) && !sl_window_is_loading (demo), LOAD_TIMEOUT_S,
              "earlier work to finish");
  sources = count_in (path, "SELECT count(*) FROM sources");
  assistant = sl_import_dialog_open (demo, file);
  g_assert_nonnull (assistant);
  g_assert_null (sl_import_dialog_get_problem (assistant));
  g_assert_cmpuint (sl_import_dialog_get_preview (assistant)->columns->len, ==, 2);

  delimiter = ADW_COMBO_ROW (find_descendant (GTK_WIDGET (assistant), ADW_TYPE_COMBO_ROW));
  g_assert_nonnull (delimiter);
  adw_combo_row_set_selected (delimiter, 0);   /* comma */
  preview = sl_import_dialog_get_preview (assistant);
  g_assert_cmpint (preview->delimiter, ==, ',');
  g_assert_true (preview->delimiter_given);
  g_assert_cmpuint (preview->columns->len, ==, 1);
  g_assert_nonnull (sl_import_dialog_get_problem (assistant));
  adw_combo_row_set_selected (delimiter, 1);   /* semicolon again */
  g_assert_cmpuint (sl_import_dialog_get_preview (assistant)->columns->len, ==, 2);
  g_assert_null (sl_import_dialog_get_problem (assistant));

  /* The epoch entry takes a Julian year or nothing. */
  epoch = find_entry_row (GTK_WIDGET (assistant), "Epoch");
  g_assert_nonnull (epoch);
  gtk_editable_set_text (GTK_EDITABLE (epoch), "2016,5");
  g_assert_nonnull (sl_import_dialog_get_problem (assistant));
  g_assert_nonnull (strstr (sl_import_dialog_get_problem (assistant), "Epoch"));
  gtk_editable_set_text (GTK_EDITABLE (epoch), "2016.5");
  g_assert_null (sl_import_dialog_get_problem (assistant));

  gtk_window_close (GTK_WINDOW (assistant));
  WAIT_UNTIL (find_toplevel (SL_TYPE_IMPORT_DIALOG) == NULL, FRAME_TIMEOUT_S, "the assistant to close");
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM sources"), ==, sources);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* A long check can be stopped: nothing found is shown, nothing written,
 * and the next check runs to the end. */
static void
test_import_assistant_stop (void)
{
  g_autofree char *path = demo_path ();
  g_autofree char *dir = sl_test_scratch_new ();
  g_autoptr (GString) csv = g_string_new ("id,parallax,parallax_err\n");
  g_autofree char *file = NULL;
  SlImportDialog *assistant;
  gint64 sources, ledger;

  for (int i = 0; i < 20000; i++)
    g_string_append_printf (csv, "GUI D%05d,%d.5,0.1\n", i, i % 100);
  file = sl_test_write_file (dir, "gui-long.csv", csv->str, -1);
  ENSURE_DEMO ();
  WAIT_UNTIL (!sl_window_is_working (demo) && !sl_window_is_loading (demo), LOAD_TIMEOUT_S,
              "earlier work to finish");
  sources = count_in (path, "SELECT count(*) FROM sources");
  ledger = count_in (path, "SELECT count(*) FROM ledger");
  assistant = sl_import_dialog_open (demo, file);
  g_assert_nonnull (assistant);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.check", NULL));
  g_assert_true (sl_import_dialog_is_checking (assistant));
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.stop-check", NULL));
  g_assert_false (sl_import_dialog_is_checking (assistant));
  g_assert_cmpstr (sl_import_dialog_get_check_summary (assistant), ==, "");

  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.check", NULL));
  WAIT_UNTIL (!sl_import_dialog_is_checking (assistant), LOAD_TIMEOUT_S, "the second check");
  g_assert_nonnull (strstr (sl_import_dialog_get_check_summary (assistant),
                            "Of 20000 rows read, 20000 would be imported and 0 rejected; 20000 new stars."));
  gtk_window_close (GTK_WINDOW (assistant));
  WAIT_UNTIL (find_toplevel (SL_TYPE_IMPORT_DIALOG) == NULL, FRAME_TIMEOUT_S, "the assistant to close");
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM ledger"), ==, ledger);
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM sources"), ==, sources);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* A parallax column whose values look like arcseconds though read in
 * mas: the check shows the warning, and writes nothing.  Saved as
 * gui-import-warning.png. */
static void
test_import_assistant_unit_warning (void)
{
  g_autofree char *path = demo_path ();
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *file = sl_test_write_file (dir, "gui-arcsec.csv",
                                              "id,parallax,parallax_err\n"
                                              "GUI W001,0.0213,0.0008\n"
                                              "GUI W002,0.0087,0.0011\n", -1);
  SlImportDialog *assistant;
  gint64 sources;

  ENSURE_DEMO ();
  WAIT_UNTIL (!sl_window_is_working (demo) && !sl_window_is_loading (demo), LOAD_TIMEOUT_S,
              "earlier work to finish");
  sources = count_in (path, "SELECT count(*) FROM sources");
  assistant = sl_import_dialog_open (demo, file);
  g_assert_nonnull (assistant);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.check", NULL));
  WAIT_UNTIL (!sl_import_dialog_is_checking (assistant), LOAD_TIMEOUT_S, "the check");
  g_test_message ("check: %s", sl_import_dialog_get_check_summary (assistant));
  g_assert_nonnull (strstr (sl_import_dialog_get_check_summary (assistant),
                            "\nWarning: gui-arcsec.csv: column 'parallax' was read as parallax in mas, "
                            "but all 2 values are below 1 with errors below 0.01: they look like arcseconds"));
  {
    /* The check's findings are at the foot of the page. */
    GtkWidget *scrolled = find_descendant (GTK_WIDGET (assistant), GTK_TYPE_SCROLLED_WINDOW);
    GtkAdjustment *adjustment = gtk_scrolled_window_get_vadjustment (GTK_SCROLLED_WINDOW (scrolled));

    PAINT (assistant);
    gtk_adjustment_set_value (adjustment, gtk_adjustment_get_upper (adjustment));
  }
  PAINT (assistant);
  save_window_png (GTK_WIDGET (assistant), "gui-import-warning.png");

  /* Read in arcseconds, the same file gives no warning. */
  choose (sl_import_dialog_get_unit_chooser (assistant, 1), "arcsec");
  choose (sl_import_dialog_get_unit_chooser (assistant, 2), "arcsec");
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.check", NULL));
  WAIT_UNTIL (!sl_import_dialog_is_checking (assistant), LOAD_TIMEOUT_S, "the second check");
  g_assert_nonnull (strstr (sl_import_dialog_get_check_summary (assistant), "2 would be imported"));
  g_assert_null (strstr (sl_import_dialog_get_check_summary (assistant), "Warning"));
  gtk_window_close (GTK_WINDOW (assistant));
  WAIT_UNTIL (find_toplevel (SL_TYPE_IMPORT_DIALOG) == NULL, FRAME_TIMEOUT_S, "the assistant to close");
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM sources"), ==, sources);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* The window as a picture: not blank; the table's text on the left; the
 * HR diagram in colour; with two stars selected, their parallax paths.
 * Saved as gui-snapshot.png and gui-selected.png. */
static void
test_snapshot (void)
{
  cairo_surface_t *picture;
  int width, height;
  Census all, table, hrd, parallax;

  ENSURE_DEMO ();
  click_star (SL_PLOT_KIND_SKY, NULL, FALSE);
  PAINT (demo);
  picture = render_widget (GTK_WIDGET (demo));
  save_png (picture, "gui-snapshot.png");
  width = cairo_image_surface_get_width (picture);
  height = cairo_image_surface_get_height (picture);
  g_test_message ("window: %d x %d", width, height);

  all = census (picture, 0, 0, width, height);
  table = census (picture, 0, height / 10, width / 3, height / 2);
  hrd = census_of (picture, GTK_WIDGET (view (SL_PLOT_KIND_HRD)));
  g_test_message ("whole: %u colours; left third: %u dark of %u in %u bands; HR view: %u coloured",
                  all.colours, table.dark, table.n, table.dark_bands, hrd.coloured);
  g_assert_cmpuint (all.colours, >, 500);
  /* Text: a few percent of the pixels dark, in many separate lines. */
  g_assert_cmpuint (table.dark, >, table.n / 200);
  g_assert_cmpuint (table.dark, <, table.n / 3);
  g_assert_cmpuint (table.dark_bands, >=, 10);
  g_assert_cmpuint (hrd.coloured, >, 500);
  cairo_surface_destroy (picture);

  click_star (SL_PLOT_KIND_SKY, "LHO 0004", FALSE);
  click_star (SL_PLOT_KIND_SKY, "LHO 0010", TRUE);
  PAINT (demo);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_PARALLAX), ==, 2);
  picture = render_widget (GTK_WIDGET (demo));
  save_png (picture, "gui-selected.png");
  parallax = census_of (picture, GTK_WIDGET (view (SL_PLOT_KIND_PARALLAX)));
  g_test_message ("parallax view with two stars: %u dark, %u coloured, %u colours", parallax.dark,
                  parallax.coloured, parallax.colours);
  g_assert_cmpuint (parallax.colours, >, 50);
  g_assert_cmpuint (parallax.dark, >, 500);
  cairo_surface_destroy (picture);
}

static GtkWindow *
find_toplevel (GType type)
{
  GListModel *toplevels = gtk_window_get_toplevels ();   /* not ours */

  for (guint i = 0; i < g_list_model_get_n_items (toplevels); i++)
    {
      g_autoptr (GObject) window = g_list_model_get_item (toplevels, i);

      if (G_TYPE_CHECK_INSTANCE_TYPE (window, type) && gtk_widget_get_visible (GTK_WIDGET (window)))
        return GTK_WINDOW (window);
    }
  return NULL;
}

/* About Starledger: a window with the icon, name and version. */
static void
test_about (void)
{
  cairo_surface_t *picture;
  GtkWindow *about;
  Census c;

  ENSURE_DEMO ();
  g_action_group_activate_action (G_ACTION_GROUP (app), "about", NULL);
  about = find_toplevel (ADW_TYPE_ABOUT_WINDOW);
  g_assert_nonnull (about);
  g_assert_true (gtk_window_get_transient_for (about) == GTK_WINDOW (demo));
  g_assert_cmpstr (adw_about_window_get_version (ADW_ABOUT_WINDOW (about)), ==, PACKAGE_VERSION);
  /* The icon comes with the application's resources, installed or not. */
  g_assert_true (gtk_icon_theme_has_icon (gtk_icon_theme_get_for_display (gtk_widget_get_display (GTK_WIDGET (about))),
                                          adw_about_window_get_application_icon (ADW_ABOUT_WINDOW (about))));
  PAINT (about);
  picture = render_widget (GTK_WIDGET (about));
  save_png (picture, "gui-about.png");
  c = census (picture, 0, 0, G_MAXINT, G_MAXINT);
  g_assert_cmpuint (c.colours, >, 30);
  g_assert_cmpuint (c.dark, >, 200);
  cairo_surface_destroy (picture);
  gtk_window_destroy (about);
}

static void
collect_shortcuts (GtkWidget *widget, GPtrArray *shortcuts)
{
  if (GTK_IS_SHORTCUTS_SHORTCUT (widget))
    g_ptr_array_add (shortcuts, widget);
  for (GtkWidget *child = gtk_widget_get_first_child (widget); child; child = gtk_widget_get_next_sibling (child))
    collect_shortcuts (child, shortcuts);
}

/* ACCELERATOR ("<Control>o", maybe several separated by spaces) as
 * canonical names added to SET. */
static void
add_accelerators (GHashTable *set, const char *accelerator)
{
  g_auto (GStrv) each = g_strsplit (accelerator, " ", -1);

  for (guint i = 0; each[i]; i++)
    {
      guint key = 0;
      GdkModifierType mods = 0;

      if (each[i][0] && gtk_accelerator_parse (each[i], &key, &mods))
        g_hash_table_add (set, gtk_accelerator_name (key, mods));
    }
}

/* The keys WIDGET's own shortcut controllers (the class bindings of
 * SlWindow and of GtkWindow) react to; with PREFIX only those activating
 * an action whose name begins so ("win."). */
static void
add_widget_shortcuts (GHashTable *set, GtkWidget *widget, const char *prefix)
{
  g_autoptr (GListModel) controllers = gtk_widget_observe_controllers (widget);

  for (guint i = 0; i < g_list_model_get_n_items (controllers); i++)
    {
      g_autoptr (GObject) controller = g_list_model_get_item (controllers, i);

      if (!GTK_IS_SHORTCUT_CONTROLLER (controller))
        continue;
      for (guint j = 0; j < g_list_model_get_n_items (G_LIST_MODEL (controller)); j++)
        {
          g_autoptr (GtkShortcut) shortcut = g_list_model_get_item (G_LIST_MODEL (controller), j);
          GtkShortcutTrigger *trigger = gtk_shortcut_get_trigger (shortcut);
          GtkShortcutAction *action = gtk_shortcut_get_action (shortcut);

          if (prefix && !(GTK_IS_NAMED_ACTION (action)
                          && g_str_has_prefix (gtk_named_action_get_action_name (GTK_NAMED_ACTION (action)), prefix)))
            continue;
          if (GTK_IS_KEYVAL_TRIGGER (trigger))
            g_hash_table_add (set, gtk_accelerator_name (gtk_keyval_trigger_get_keyval (GTK_KEYVAL_TRIGGER (trigger)),
                                                         gtk_keyval_trigger_get_modifiers (GTK_KEYVAL_TRIGGER (trigger))));
        }
    }
}

/* The shortcuts window: every shortcut listed shows its keys, keys the
 * window or the application really has; every key the window binds to
 * one of its actions is listed. */
static void
test_shortcuts (void)
{
  g_autoptr (GPtrArray) shortcuts = g_ptr_array_new ();
  g_autoptr (GHashTable) listed = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);
  g_autoptr (GHashTable) bound = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);
  g_autoptr (GHashTable) window_keys = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);
  g_auto (GStrv) actions = NULL;
  cairo_surface_t *picture;
  GtkShortcutsWindow *overlay;
  GHashTableIter iter;
  const char *key;
  Census c;

  ENSURE_DEMO ();
  overlay = gtk_application_window_get_help_overlay (GTK_APPLICATION_WINDOW (demo));
  g_assert_nonnull (overlay);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.show-help-overlay", NULL));
  PAINT (overlay);

  /* What the window and the application react to. */
  add_widget_shortcuts (window_keys, GTK_WIDGET (demo), "win.");
  add_widget_shortcuts (bound, GTK_WIDGET (demo), NULL);
  actions = gtk_application_list_action_descriptions (GTK_APPLICATION (app));
  for (guint i = 0; actions[i]; i++)
    {
      g_auto (GStrv) accels = gtk_application_get_accels_for_action (GTK_APPLICATION (app), actions[i]);

      for (guint j = 0; accels[j]; j++)
        add_accelerators (bound, accels[j]);
    }

  /* The shortcuts window (it holds each shortcut twice: its page and its
   * search results). */
  collect_shortcuts (GTK_WIDGET (overlay), shortcuts);
  g_assert_cmpuint (shortcuts->len, >=, 5);
  for (guint i = 0; i < shortcuts->len; i++)
    {
      g_autoptr (GHashTable) keys = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);
      g_autofree char *title = NULL;
      g_autofree char *accelerator = NULL;

      g_object_get (shortcuts->pdata[i], "title", &title, "accelerator", &accelerator, NULL);
      add_accelerators (keys, accelerator ? accelerator : "");
      if (g_hash_table_size (keys) == 0)
        g_test_fail_printf ("the shortcut \"%s\" shows no keys", title);
      g_hash_table_iter_init (&iter, keys);
      while (g_hash_table_iter_next (&iter, (gpointer *) &key, NULL))
        {
          if (!g_hash_table_contains (bound, key))
            g_test_fail_printf ("the shortcut \"%s\" shows %s, which nothing binds", title, key);
          g_hash_table_add (listed, g_strdup (key));
        }
    }
  g_hash_table_iter_init (&iter, window_keys);
  while (g_hash_table_iter_next (&iter, (gpointer *) &key, NULL))
    if (!g_hash_table_contains (listed, key))
      g_test_fail_printf ("the window binds %s but the shortcuts window does not list it", key);

  picture = render_widget (GTK_WIDGET (overlay));
  save_png (picture, "gui-shortcuts.png");
  c = census (picture, 0, 0, G_MAXINT, G_MAXINT);
  g_assert_cmpuint (c.dark, >, 200);
  cairo_surface_destroy (picture);
  gtk_widget_set_visible (GTK_WIDGET (overlay), FALSE);
}

int
main (int argc, char **argv)
{
  g_autoptr (GError) error = NULL;
  char *own_cache;
  int status;

  setlocale (LC_ALL, "");
  g_test_init (&argc, &argv, NULL);
  /* gui-smoke (and another copy of this program, with meson test
   * --repeat) makes its demo project in the same cache directory, maybe at
   * the same time: this program keeps its own below it, removed at the
   * end. */
  {
    const char *cache = g_getenv ("XDG_CACHE_HOME");

    own_cache = g_build_filename (cache && *cache ? cache : g_get_tmp_dir (), "test-gui-XXXXXX", NULL);
    g_mkdir_with_parents (cache && *cache ? cache : g_get_tmp_dir (), 0700);
    if (g_mkdtemp (own_cache) == NULL)
      g_error ("cannot make %s: %s", own_cache, g_strerror (errno));
    g_setenv ("XDG_CACHE_HOME", own_cache, TRUE);
  }
  /* The AT-SPI registry D-Bus would start for GTK's accessibility tree
   * writes a line to standard output, which is this program's TAP stream. */
  g_setenv ("GTK_A11Y", "none", FALSE);

  app = sl_application_new ();
  if (!g_application_register (G_APPLICATION (app), NULL, &error))
    g_error ("cannot register the application: %s", error->message);
  g_timeout_add (20, wake, NULL);

  g_test_add_func ("/gui/demo/populated", test_demo_populated);
  g_test_add_func ("/gui/selection/shared", test_selection_shared);
  g_test_add_func ("/gui/actions/derive", test_actions_derive);
  g_test_add_func ("/gui/actions/import-by-drop", test_actions_import_by_drop);
  g_test_add_func ("/gui/trail/override", test_trail_override);
  g_test_add_func ("/gui/ledger/filters", test_ledger_filters);
  g_test_add_func ("/gui/snapshot", test_snapshot);
  g_test_add_func ("/gui/about", test_about);
  g_test_add_func ("/gui/shortcuts", test_shortcuts);
  g_test_add_func ("/gui/import/assistant", test_import_assistant);
  g_test_add_func ("/gui/import/assistant-delimiter", test_import_assistant_delimiter);
  g_test_add_func ("/gui/import/assistant-stop-check", test_import_assistant_stop);
  g_test_add_func ("/gui/import/assistant-unit-warning", test_import_assistant_unit_warning);
  status = g_test_run ();

  if (demo)
    gtk_window_destroy (GTK_WINDOW (demo));
  while (g_main_context_iteration (NULL, FALSE))
    ;
  g_clear_object (&app);
  sl_test_scratch_free (own_cache);
  return status;
}
