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
 * gui-shortcuts.png, gui-derive.png, gui-derive-lower.png, gui-welcome.png,
 * gui-columns.png, gui-columns-chooser.png.
 * Look at them after changing what the window shows. */
#include <errno.h>
#include <glib/gstdio.h>
#include <locale.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "condition.h"
#include "derivation.h"
#include "export.h"
#include "explain.h"
#include "gui-util.h"
#include "inputs.h"
#include "ledger.h"
#include "lists.h"
#include "sl-application.h"
#include "sl-catalogue-row.h"
#include "sl-catalogue-view.h"
#include "sl-import-dialog.h"
#include "sl-matches-panel.h"
#include "sl-figure-dialog.h"
#include "sl-combine-dialog.h"
#include "sl-derive-dialog.h"
#include "sl-plot-view.h"
#include "sl-recent-projects.h"
#include "sl-window.h"
#include "summary.h"
#include "test-util.h"

#define DEMO_STARS 337
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


/* Asks TOPLEVEL for a new frame and spins until it has been painted:
 * everything changed before the call is on screen after it.  FALSE on a
 * time-out (the test has failed then). */
static gboolean
wait_for_paint (GtkWidget *toplevel)
{
  const char *failed = sl_gui_paint (toplevel, FRAME_TIMEOUT_S);

  if (failed)
    g_test_fail_printf ("%s %s within %.0f s", G_OBJECT_TYPE_NAME (toplevel), failed, FRAME_TIMEOUT_S);
  return failed == NULL;
}

#define PAINT(widget)                                        \
  G_STMT_START {                                             \
    if (!wait_for_paint (GTK_WIDGET (widget)))               \
      return;                                                \
  } G_STMT_END


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

/* The first button under WIDGET that activates ACTION. */
static gboolean
is_button_for_action (GtkWidget *widget, gconstpointer action)
{
  return GTK_IS_BUTTON (widget) && g_strcmp0 (gtk_actionable_get_action_name (GTK_ACTIONABLE (widget)), action) == 0;
}

static GtkWidget *
action_button (GtkWidget *widget, const char *action)
{
  return sl_gui_find_widget (widget, is_button_for_action, action);
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
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.derive-now", NULL));
  g_assert_true (sl_window_is_loading (demo));
  /* Long work shows its progress and a way to cancel it. */
  g_assert_true (gtk_revealer_get_reveal_child (GTK_REVEALER (sl_gui_find_descendant (GTK_WIDGET (demo), GTK_TYPE_REVEALER))));
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
  g_assert_false (gtk_revealer_get_reveal_child (GTK_REVEALER (sl_gui_find_descendant (GTK_WIDGET (demo), GTK_TYPE_REVEALER))));
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
  assistant = SL_IMPORT_DIALOG (sl_gui_find_toplevel (SL_TYPE_IMPORT_DIALOG));
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
  if (!sl_gui_choose (chooser, text))
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
    GtkScrolledWindow *scroller = GTK_SCROLLED_WINDOW (sl_gui_find_descendant (GTK_WIDGET (assistant),
                                                                        GTK_TYPE_SCROLLED_WINDOW));
    GtkAdjustment *adjustment = gtk_scrolled_window_get_vadjustment (scroller);

    gtk_adjustment_set_value (adjustment, gtk_adjustment_get_upper (adjustment));
    PAINT (assistant);
    save_window_png (GTK_WIDGET (assistant), "gui-import-check.png");
  }

  /* Import: the dialog closes, the window imports with those choices. */
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.import", NULL));
  g_assert_null (sl_gui_find_toplevel (SL_TYPE_IMPORT_DIALOG));
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
static gboolean
is_entry_row_titled (GtkWidget *widget, gconstpointer title)
{
  return ADW_IS_ENTRY_ROW (widget)
         && g_str_has_prefix (adw_preferences_row_get_title (ADW_PREFERENCES_ROW (widget)), title);
}

static GtkWidget *
find_entry_row (GtkWidget *widget, const char *title)
{
  return sl_gui_find_widget (widget, is_entry_row_titled, title);
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

  delimiter = ADW_COMBO_ROW (sl_gui_find_descendant (GTK_WIDGET (assistant), ADW_TYPE_COMBO_ROW));
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
  WAIT_UNTIL (sl_gui_find_toplevel (SL_TYPE_IMPORT_DIALOG) == NULL, FRAME_TIMEOUT_S, "the assistant to close");
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
  WAIT_UNTIL (sl_gui_find_toplevel (SL_TYPE_IMPORT_DIALOG) == NULL, FRAME_TIMEOUT_S, "the assistant to close");
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
    GtkWidget *scrolled = sl_gui_find_descendant (GTK_WIDGET (assistant), GTK_TYPE_SCROLLED_WINDOW);
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
  WAIT_UNTIL (sl_gui_find_toplevel (SL_TYPE_IMPORT_DIALOG) == NULL, FRAME_TIMEOUT_S, "the assistant to close");
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

/* About Starledger: a window with the icon, name and version. */
static void
test_about (void)
{
  cairo_surface_t *picture;
  GtkWindow *about;
  Census c;

  ENSURE_DEMO ();
  g_action_group_activate_action (G_ACTION_GROUP (app), "about", NULL);
  about = sl_gui_find_toplevel (ADW_TYPE_ABOUT_WINDOW);
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

/* ------------------------------------------------------------------ */
/* Figure export and maximised views                                  */

static void
set_spin (SlFigureDialog *dialog, const char *name, double value)
{
  GtkWidget *spin = sl_gui_find_named (GTK_WIDGET (dialog), name);

  g_assert_true (GTK_IS_SPIN_BUTTON (spin));
  gtk_spin_button_set_value (GTK_SPIN_BUTTON (spin), value);
}

static void
set_choice (SlFigureDialog *dialog, const char *name, guint selected)
{
  GtkWidget *row = sl_gui_find_named (GTK_WIDGET (dialog), name);

  g_assert_true (ADW_IS_COMBO_ROW (row));
  adw_combo_row_set_selected (ADW_COMBO_ROW (row), selected);
}

static void
set_switch (SlFigureDialog *dialog, const char *name, gboolean active)
{
  GtkWidget *toggle = sl_gui_find_named (GTK_WIDGET (dialog), name);

  g_assert_true (GTK_IS_SWITCH (toggle));
  gtk_switch_set_active (GTK_SWITCH (toggle), active);
}

/* Opens Export Figure from the view of KIND (its header strip's action)
 * and waits for its preview's stars; NULL if that failed (the test has
 * failed then). */
static SlFigureDialog *
open_figure_dialog (const char *kind)
{
  gint64 end = g_get_monotonic_time () + (gint64) (LOAD_TIMEOUT_S * G_USEC_PER_SEC);
  SlFigureDialog *dialog = NULL;

  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.export-figure", "s", kind));
  while (dialog == NULL || !sl_figure_dialog_is_ready (dialog))
    {
      if (g_get_monotonic_time () > end)
        {
          g_test_fail_printf ("the Export Figure dialog for %s did not open and load", kind);
          return NULL;
        }
      dialog = SL_FIGURE_DIALOG (sl_gui_find_toplevel (SL_TYPE_FIGURE_DIALOG));
      g_main_context_iteration (NULL, TRUE);
    }
  return dialog;
}

/* Runs starledger-cli ($STARLEDGER_CLI) with ARGS (NULL-terminated, no
 * program name); fails the test unless it exits 0. */
static void
run_cli_args (const char *const *args)
{
  g_autoptr (GPtrArray) argv = g_ptr_array_new ();
  g_autofree char *err = NULL;
  g_autoptr (GError) error = NULL;
  const char *cli = g_getenv ("STARLEDGER_CLI");
  int status = -1;

  g_assert_nonnull (cli);
  g_ptr_array_add (argv, (gpointer) cli);
  for (guint i = 0; args[i]; i++)
    g_ptr_array_add (argv, (gpointer) args[i]);
  g_ptr_array_add (argv, NULL);
  g_assert_true (g_spawn_sync (NULL, (char **) argv->pdata, NULL, G_SPAWN_STDOUT_TO_DEV_NULL, NULL, NULL, NULL,
                               &err, &status, &error));
  g_assert_no_error (error);
  if (!g_spawn_check_wait_status (status, NULL))
    g_test_fail_printf ("starledger-cli failed: %s", err);
}

/* The command line the dialog shows, run with its -o replaced by OUTPUT. */
static void
run_shown_command (SlFigureDialog *dialog, const char *output)
{
  g_auto (GStrv) words = NULL;
  g_autoptr (GError) error = NULL;

  g_assert_true (g_shell_parse_argv (sl_figure_dialog_get_command_line (dialog), NULL, &words, &error));
  g_assert_no_error (error);
  g_assert_cmpstr (words[0], ==, "starledger-cli");
  /* The project in the home folder is written "~/...", which a shell
   * expands and g_shell_parse_argv does not. */
  if (words[1] && g_str_has_prefix (words[1], "~/"))
    {
      char *expanded = g_build_filename (g_get_home_dir (), words[1] + 2, NULL);

      g_free (words[1]);
      words[1] = expanded;
    }
  for (guint i = 1; words[i]; i++)
    if (strcmp (words[i], "-o") == 0 && words[i + 1])
      {
        g_free (words[i + 1]);
        words[i + 1] = g_strdup (output);
      }
  run_cli_args ((const char *const *) words + 1);
}

static void
assert_same_file (const char *a, const char *b)
{
  g_autofree char *ca = NULL, *cb = NULL;
  gsize na = 0, nb = 0;

  g_assert_true (g_file_get_contents (a, &ca, &na, NULL));
  g_assert_true (g_file_get_contents (b, &cb, &nb, NULL));
  g_assert_cmpuint (na, >, 1000);
  if (na != nb || memcmp (ca, cb, na) != 0)
    g_test_fail_printf ("%s (%" G_GSIZE_FORMAT " bytes) and %s (%" G_GSIZE_FORMAT " bytes) differ", a, na, b, nb);
}

typedef struct {
  const char *kind;
  const char *file;                        /* the extension gives the format */
  void (*set_options) (SlFigureDialog *);  /* as a user would in the dialog */
  const char *cli[16];                     /* the same as starledger-cli options */
} ExportCase;

static void
hr_png_options (SlFigureDialog *d)
{
  set_choice (d, "size", 1);          /* double column */
  set_choice (d, "format", 2);        /* PNG */
  set_spin (d, "dpi", 150);
  set_switch (d, "grayscale", TRUE);
  set_choice (d, "plane", 1);         /* observational */
}

static void
sky_svg_options (SlFigureDialog *d)
{
  set_choice (d, "format", 1);        /* SVG */
  set_spin (d, "width", 120);
  set_spin (d, "height", 90);
  set_spin (d, "font", 8);
  set_choice (d, "coordinates", 1);   /* galactic */
  set_spin (d, "ellipses", 3000);
  set_choice (d, "list", 1);          /* the list the test made */
}

static void
parallax_png_options (SlFigureDialog *d)
{
  set_choice (d, "format", 2);
  set_spin (d, "dpi", 120);
  set_spin (d, "start", 2026.5);
  set_spin (d, "years", 2);
  set_switch (d, "proper-motion", TRUE);
  set_switch (d, "common-scale", TRUE);
}

static void
hr_svg_options (SlFigureDialog *d)
{
  set_choice (d, "format", 1);
  set_switch (d, "errors", FALSE);
}

/* Export Figure from each view writes, byte for byte, what
 * starledger-cli figure writes with the same options, and what the
 * command line the dialog shows writes; the preview is drawn (saved as
 * gui-figure-dialog.png). */
static void
test_figure_export (void)
{
  static const char *const selection[] = { "LHO 0004", "LHO 0010", NULL };
  static const char *const members[] = { "LHO 0004", "LHO 0010", "LHO 0012", "LHO 0020", NULL };
  g_autofree char *path = demo_path ();
  g_autofree char *dir = sl_test_scratch_new ();
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  const ExportCase cases[] = {
    { "hr", "hr.png", hr_png_options,
      { "--size", "double", "--dpi", "150", "--grayscale", "--plane", "observational", NULL } },
    { "sky", "sky.svg", sky_svg_options,
      { "--width-mm", "120", "--height-mm", "90", "--font-pt", "8", "--coordinates", "galactic",
        "--ellipses", "3000", "--list", "figure test", NULL } },
    { "parallax", "parallax.png", parallax_png_options,
      { "--dpi", "120", "--start", "2026.5", "--years", "2", "--proper-motion", "--common-scale", NULL } },
    { "hr", "hr.svg", hr_svg_options, { "--no-errors", NULL } },
  };

  ENSURE_DEMO ();
  /* A target list, for the dialog's "only the stars of list". */
  project = sl_project_open (path, &error);
  g_assert_no_error (error);
  if (!sl_list_create (project, "figure test", NULL, NULL))
    g_test_message ("the list was there already");
  g_assert_cmpint (sl_list_add_stars (project, "figure test", members, &error), >=, 0);
  g_assert_no_error (error);
  g_clear_pointer (&project, sl_project_close);
  sl_window_set_selection (demo, selection);

  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autofree char *by_window = g_build_filename (dir, cases[i].file, NULL);
      g_autofree char *cli_name = g_strconcat ("cli-", cases[i].file, NULL);
      g_autofree char *by_cli = g_build_filename (dir, cli_name, NULL);
      g_autoptr (GPtrArray) args = g_ptr_array_new ();
      SlFigureDialog *dialog = open_figure_dialog (cases[i].kind);

      if (dialog == NULL)
        return;
      g_assert_cmpint (sl_figure_dialog_get_job (dialog)->kind, ==, i == 1 ? 1 : i == 2 ? 2 : 0);
      cases[i].set_options (dialog);
      {
        SlFigureFormat want;

        g_assert_true (sl_figure_format_from_path (cases[i].file, &want));
        g_assert_cmpint (sl_figure_dialog_get_format (dialog), ==, want);
      }
      WAIT_UNTIL (sl_figure_dialog_is_ready (dialog), LOAD_TIMEOUT_S, "the list's stars");
      g_test_message ("%s: %s", cases[i].file, sl_figure_dialog_get_command_line (dialog));
      if (i == 1)
        {
          cairo_surface_t *picture;
          Census c;

          PAINT (dialog);
          picture = render_widget (GTK_WIDGET (dialog));
          save_png (picture, "gui-figure-dialog.png");
          {
            graphene_rect_t bounds;

            g_assert_true (gtk_widget_compute_bounds (sl_gui_find_named (GTK_WIDGET (dialog), "preview"),
                                                      GTK_WIDGET (dialog), &bounds));
            c = census (picture, bounds.origin.x, bounds.origin.y, bounds.origin.x + bounds.size.width,
                        bounds.origin.y + bounds.size.height);
          }
          g_assert_cmpuint (c.coloured, >, 100);
          cairo_surface_destroy (picture);
        }

      g_assert_true (sl_figure_dialog_export_to (dialog, by_window));
      WAIT_UNTIL (!sl_window_is_working (demo), LOAD_TIMEOUT_S, "the export");
      g_assert_null (sl_gui_find_toplevel (SL_TYPE_FIGURE_DIALOG));

      g_ptr_array_add (args, "figure");
      g_ptr_array_add (args, path);
      g_ptr_array_add (args, (gpointer) cases[i].kind);
      g_ptr_array_add (args, "-o");
      g_ptr_array_add (args, by_cli);
      for (guint j = 0; selection[j]; j++)
        {
          g_ptr_array_add (args, "--star");
          g_ptr_array_add (args, (gpointer) selection[j]);
        }
      for (guint j = 0; cases[i].cli[j]; j++)
        g_ptr_array_add (args, (gpointer) cases[i].cli[j]);
      g_ptr_array_add (args, NULL);
      run_cli_args ((const char *const *) args->pdata);
      assert_same_file (by_window, by_cli);
    }

  /* The command line shown, run: the same bytes (the last case's dialog
   * is gone; one more, left as it opens). */
  {
    g_autofree char *by_window = g_build_filename (dir, "plain-sky.png", NULL);
    g_autofree char *by_shown = g_build_filename (dir, "shown-sky.png", NULL);
    SlFigureDialog *dialog = open_figure_dialog ("sky");

    if (dialog == NULL)
      return;
    set_choice (dialog, "format", 2);
    set_spin (dialog, "dpi", 100);
    run_shown_command (dialog, by_shown);
    g_assert_true (sl_figure_dialog_export_to (dialog, by_window));
    WAIT_UNTIL (!sl_window_is_working (demo), LOAD_TIMEOUT_S, "the export");
    assert_same_file (by_window, by_shown);
  }
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* A star of the selection outside the list chosen: the dialog says so and
 * will not export. */
static void
test_figure_export_refused (void)
{
  static const char *const outside[] = { "LHO 0001", NULL };
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *out = g_build_filename (dir, "never.pdf", NULL);
  SlFigureDialog *dialog;

  ENSURE_DEMO ();
  sl_window_set_selection (demo, outside);
  dialog = open_figure_dialog ("hr");
  if (dialog == NULL)
    return;
  set_choice (dialog, "list", 1);
  WAIT_UNTIL (sl_figure_dialog_is_ready (dialog), LOAD_TIMEOUT_S, "the list's stars");
  g_assert_false (sl_figure_dialog_export_to (dialog, out));
  g_assert_false (sl_window_is_working (demo));
  g_assert_false (g_file_test (out, G_FILE_TEST_EXISTS));
  gtk_window_close (GTK_WINDOW (dialog));
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* Maximising a view hides the other two and gives it the whole area right
 * of the table; its button again, or Escape's action, brings them back
 * with the panes where they were.  Saved as gui-maximized.png. */
static void
test_maximize_view (void)
{
  GtkWidget *hrd, *sky, *parallax;
  GtkPaned *upper, *lower;
  int upper_position, lower_position, sky_width, sky_height;
  cairo_surface_t *picture;

  ENSURE_DEMO ();
  hrd = GTK_WIDGET (view (SL_PLOT_KIND_HRD));
  sky = GTK_WIDGET (view (SL_PLOT_KIND_SKY));
  parallax = GTK_WIDGET (view (SL_PLOT_KIND_PARALLAX));
  upper = GTK_PANED (gtk_widget_get_ancestor (hrd, GTK_TYPE_PANED));
  lower = GTK_PANED (gtk_widget_get_ancestor (sky, GTK_TYPE_PANED));
  g_assert_true (upper != lower);
  PAINT (demo);
  upper_position = gtk_paned_get_position (upper);
  lower_position = gtk_paned_get_position (lower);
  sky_width = gtk_widget_get_width (sky);
  sky_height = gtk_widget_get_height (sky);

  for (SlPlotKind kind = 0; kind < 3; kind++)
    {
      const char *name = kind == SL_PLOT_KIND_HRD ? "hr" : kind == SL_PLOT_KIND_SKY ? "sky" : "parallax";
      GtkWidget *views[3] = { hrd, sky, parallax };

      /* Restored means as they were just before (an earlier test's
       * layout may still settle by a pixel). */
      PAINT (demo);
      upper_position = gtk_paned_get_position (upper);
      lower_position = gtk_paned_get_position (lower);
      sky_width = gtk_widget_get_width (sky);
      g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.maximize-view", "s", name));
      PAINT (demo);
      for (guint i = 0; i < 3; i++)
        g_assert_cmpint (gtk_widget_is_visible (views[i]), ==, i == kind);
      if (kind == SL_PLOT_KIND_SKY)
        {
          g_assert_cmpint (gtk_widget_get_width (sky), >, sky_width + 100);
          g_assert_cmpint (gtk_widget_get_height (sky), >, sky_height + 100);
          picture = render_widget (GTK_WIDGET (demo));
          save_png (picture, "gui-maximized.png");
          cairo_surface_destroy (picture);
        }
      /* Its own button again for the first two, Escape's action for the last. */
      if (kind == SL_PLOT_KIND_PARALLAX)
        g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.restore-views", NULL));
      else
        g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.maximize-view", "s", name));
      /* The window sets the positions again after the first layout. */
      PAINT (demo);
      PAINT (demo);
      for (guint i = 0; i < 3; i++)
        g_assert_true (gtk_widget_is_visible (views[i]));
      /* Within a pixel: a paned rounds its position when its children
       * come back. */
      g_assert_cmpint (ABS (gtk_paned_get_position (upper) - upper_position), <=, 1);
      g_assert_cmpint (ABS (gtk_paned_get_position (lower) - lower_position), <=, 1);
      g_assert_cmpint (ABS (gtk_widget_get_width (sky) - sky_width), <=, 1);
    }

  /* One maximised view, then another: straight there; show all restores. */
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.maximize-view", "s", "hr"));
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.maximize-view", "s", "parallax"));
  PAINT (demo);
  g_assert_false (gtk_widget_is_visible (hrd));
  g_assert_true (gtk_widget_is_visible (parallax));
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.restore-views", NULL));
  PAINT (demo);
  PAINT (demo);
  g_assert_cmpint (ABS (gtk_paned_get_position (upper) - upper_position), <=, 1);
  g_assert_cmpint (ABS (gtk_paned_get_position (lower) - lower_position), <=, 1);
}

/* ------------------------------------------------------------------ */
/* The Derive dialog                                                  */

static SlDeriveDialog *
open_derive_dialog (void)
{
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.derive", NULL));
  return SL_DERIVE_DIALOG (sl_gui_find_toplevel (SL_TYPE_DERIVE_DIALOG));
}

static void
set_entry (SlDeriveDialog *dialog, SlParam param, const char *text)
{
  GtkWidget *entry = sl_gui_find_named (GTK_WIDGET (dialog), sl_param_info (param)->name);

  g_assert_true (GTK_IS_ENTRY (entry));
  gtk_editable_set_text (GTK_EDITABLE (entry), text);
}

static void
derive_set_choice (SlDeriveDialog *dialog, SlParam param, guint choice)
{
  GtkWidget *row = sl_gui_find_named (GTK_WIDGET (dialog), sl_param_info (param)->name);

  g_assert_true (ADW_IS_COMBO_ROW (row));
  adw_combo_row_set_selected (ADW_COMBO_ROW (row), choice);
}

/* Every row of DIALOG shows what PARAMS holds. */
static void
assert_dialog_shows (SlDeriveDialog *dialog, const SlDeriveParams *params)
{
  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    {
      const SlParamInfo *info = sl_param_info (p);
      GtkWidget *widget = sl_gui_find_named (GTK_WIDGET (dialog), info->name);

      g_assert_nonnull (widget);
      if (info->kind == SL_PARAM_KIND_CHOICE)
        g_assert_cmpuint (adw_combo_row_get_selected (ADW_COMBO_ROW (widget)), ==, sl_param_get_choice (params, p));
      else
        {
          g_autofree char *want = sl_param_to_text (params, p);

          g_assert_cmpstr (gtk_editable_get_text (GTK_EDITABLE (widget)), ==, want);
        }
    }
}

static SlDeriveParams
latest_params (const char *path, gint64 *run_id)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_open (path, &error);
  SlDeriveParams params;

  g_assert_no_error (error);
  g_assert_true (sl_derivation_latest_params (project, &params, run_id, &error));
  g_assert_no_error (error);
  return params;
}

/* The whole table (sl_export, every column) of the project at PATH. */
static char *
export_table (const char *path, const char *dir, const char *name)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_open (path, &error);
  g_autofree char *csv = g_build_filename (dir, name, NULL);
  SlExportOptions options = { SL_EXPORT_CSV, NULL, NULL, NULL };
  char *text = NULL;

  g_assert_no_error (error);
  g_assert_cmpint (sl_export (project, csv, &options, &error), >=, DEMO_STARS);
  g_assert_no_error (error);
  g_assert_true (g_file_get_contents (csv, &text, NULL, NULL));
  return text;
}

/* Ctrl+D's dialog starts from the latest run's parameters; a refused
 * number holds Derive back and says why; EDSD with L = 800 pc and Monte
 * Carlo with 200 draws and seed 42 are recorded as the newest run
 * exactly, give the values the core gives with the same parameters, and
 * are what the dialog shows when opened again.  Saved as gui-derive.png. */
static void
test_derive_dialog (void)
{
  g_autofree char *path = demo_path ();
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *copy = g_build_filename (dir, "copy.starledger", NULL);
  g_autofree char *before = NULL;
  g_autofree char *after = NULL;
  g_autofree char *by_core = NULL;
  g_autoptr (GError) error = NULL;
  SlDeriveParams start, want, got;
  SlDeriveDialog *dialog;
  GtkWidget *derive, *length;
  gint64 run_before, run_after;

  ENSURE_DEMO ();
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the window to be idle");
  start = latest_params (path, &run_before);
  g_assert_cmpint (run_before, >, 0);
  before = export_table (path, dir, "before.csv");
  {
    g_autoptr (SlProject) project = sl_project_open (path, &error);
    g_autofree char *sql = g_strdup_printf ("VACUUM INTO '%s'", copy);

    g_assert_no_error (error);
    g_assert_cmpint (sqlite3_exec (sl_project_db (project), sql, NULL, NULL, NULL), ==, SQLITE_OK);
  }

  dialog = open_derive_dialog ();
  g_assert_nonnull (dialog);
  g_assert_true (gtk_window_get_modal (GTK_WINDOW (dialog)));
  g_assert_true (gtk_window_get_transient_for (GTK_WINDOW (dialog)) == GTK_WINDOW (demo));
  assert_dialog_shows (dialog, &start);
  derive = sl_gui_find_named (GTK_WIDGET (dialog), "derive");
  g_assert_true (gtk_widget_get_sensitive (derive));

  /* A number the core refuses: marked, explained, and Derive waits. */
  derive_set_choice (dialog, SL_PARAM_DISTANCE, SL_DISTANCE_EDSD);
  set_entry (dialog, SL_PARAM_LENGTH_SCALE, "-5");
  length = sl_gui_find_named (GTK_WIDGET (dialog), "length_scale_pc");
  g_assert_true (gtk_widget_has_css_class (length, "error"));
  g_assert_false (gtk_widget_get_sensitive (derive));
  {
    GtkWidget *row = gtk_widget_get_ancestor (length, ADW_TYPE_ACTION_ROW);

    g_assert_cmpstr (adw_action_row_get_subtitle (ADW_ACTION_ROW (row)), ==,
                     "Prior length scale L: expected a number greater than 0, not “-5”");
  }
  set_entry (dialog, SL_PARAM_LENGTH_SCALE, "800");
  g_assert_false (gtk_widget_has_css_class (length, "error"));
  g_assert_true (gtk_widget_get_sensitive (derive));
  derive_set_choice (dialog, SL_PARAM_ERRORS, SL_ERRORS_MONTE_CARLO);
  set_entry (dialog, SL_PARAM_DRAWS, "200");
  set_entry (dialog, SL_PARAM_SEED, "42");
  /* The row of the temperature calibration cites the chosen method. */
  {
    GtkWidget *teff = sl_gui_find_named (GTK_WIDGET (dialog), "teff");

    g_assert_nonnull (strstr (adw_action_row_get_subtitle (ADW_ACTION_ROW (teff)), "Torres 2010, AJ 140, 1158"));
    derive_set_choice (dialog, SL_PARAM_TEFF, SL_TEFF_BALLESTEROS);
    g_assert_nonnull (strstr (adw_action_row_get_subtitle (ADW_ACTION_ROW (teff)), "Ballesteros 2012, EPL 97, 34008"));
    derive_set_choice (dialog, SL_PARAM_TEFF, SL_TEFF_FLOWER_TORRES);
  }
  PAINT (dialog);
  {
    cairo_surface_t *picture = render_widget (GTK_WIDGET (dialog));

    save_png (picture, "gui-derive.png");
    cairo_surface_destroy (picture);
  }
  /* And its lower half: uncertainties, stars, Reset. */
  {
    GtkScrolledWindow *scrolled = GTK_SCROLLED_WINDOW (sl_gui_find_descendant (GTK_WIDGET (dialog), GTK_TYPE_SCROLLED_WINDOW));
    GtkAdjustment *adjustment = gtk_scrolled_window_get_vadjustment (scrolled);
    cairo_surface_t *picture;

    gtk_adjustment_set_value (adjustment, gtk_adjustment_get_upper (adjustment));
    PAINT (dialog);
    picture = render_widget (GTK_WIDGET (dialog));
    save_png (picture, "gui-derive-lower.png");
    cairo_surface_destroy (picture);
  }

  want = start;
  want.distance = SL_DISTANCE_EDSD;
  want.length_scale_pc = 800.0;
  want.errors = SL_ERRORS_MONTE_CARLO;
  want.draws = 200;
  want.seed = 42;
  g_signal_emit_by_name (derive, "clicked");
  g_assert_null (sl_gui_find_toplevel (SL_TYPE_DERIVE_DIALOG));
  g_assert_true (sl_window_is_working (demo));
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the derivation and the reload");

  got = latest_params (path, &run_after);
  g_assert_cmpint (run_after, >, run_before);
  g_assert_cmpmem (&got, sizeof got, &want, sizeof want);
  after = export_table (path, dir, "after.csv");
  g_assert_cmpstr (after, !=, before);
  {
    g_autoptr (SlProject) project = sl_project_open (copy, &error);
    SlDeriveReport report;

    g_assert_no_error (error);
    g_assert_true (sl_derivation_run (project, &want, FALSE, NULL, NULL, NULL, &report, &error));
    g_assert_no_error (error);
    g_assert_cmpuint (report.computed, >=, DEMO_STARS);
  }
  by_core = export_table (copy, dir, "core.csv");
  g_assert_cmpstr (after, ==, by_core);

  /* Opened again: the choices of the run just made; Reset, then Cancel
   * changes nothing. */
  dialog = open_derive_dialog ();
  g_assert_nonnull (dialog);
  assert_dialog_shows (dialog, &want);
  g_signal_emit_by_name (sl_gui_find_named (GTK_WIDGET (dialog), "reset"), "clicked");
  {
    SlDeriveParams defaults;

    sl_derive_params_init (&defaults);
    assert_dialog_shows (dialog, &defaults);
  }
  gtk_window_close (GTK_WINDOW (dialog));
  WAIT_UNTIL (sl_gui_find_toplevel (SL_TYPE_DERIVE_DIALOG) == NULL, FRAME_TIMEOUT_S, "the dialog to close");
  g_assert_false (sl_window_is_working (demo));
  latest_params (path, &run_before);
  g_assert_cmpint (run_before, ==, run_after);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* Recent projects                                                    */

/* The titles of the rows under WIDGET, in order. */
static void
collect_row_titles (GtkWidget *widget, GPtrArray *titles)
{
  if (ADW_IS_ACTION_ROW (widget))
    g_ptr_array_add (titles, (gpointer) adw_preferences_row_get_title (ADW_PREFERENCES_ROW (widget)));
  for (GtkWidget *child = gtk_widget_get_first_child (widget); child; child = gtk_widget_get_next_sibling (child))
    collect_row_titles (child, titles);
}

static gboolean
is_action_row_titled (GtkWidget *widget, gconstpointer title)
{
  return ADW_IS_ACTION_ROW (widget) && g_strcmp0 (adw_preferences_row_get_title (ADW_PREFERENCES_ROW (widget)), title) == 0;
}

static GtkWidget *
row_titled (GtkWidget *widget, const char *title)
{
  return sl_gui_find_widget (widget, is_action_row_titled, title);
}

/* Projects opened in one window are listed on the welcome page of the
 * next, newest first, with their folder and when; one deleted since is
 * not, nor the demo project; a click opens one.  Saved as
 * gui-welcome.png. */
static void
test_welcome_recent (void)
{
  static const char *const names[] = { "north-field.starledger", "southern-targets.starledger", "gone.starledger" };
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *folder = g_path_get_basename (dir);
  g_autoptr (GPtrArray) titles = g_ptr_array_new ();
  g_autoptr (GError) error = NULL;
  char *paths[G_N_ELEMENTS (names)];
  SlWindow *opener, *welcome;
  GtkWidget *recent, *row;

  for (guint i = 0; i < G_N_ELEMENTS (names); i++)
    {
      g_autoptr (SlProject) project = NULL;

      paths[i] = g_build_filename (dir, names[i], NULL);
      project = sl_project_create (paths[i], &error);
      g_assert_no_error (error);
    }
  opener = sl_window_new (GTK_APPLICATION (app));
  for (guint i = 0; i < G_N_ELEMENTS (names); i++)
    {
      g_assert_true (sl_window_open_project (opener, paths[i], &error));
      g_assert_no_error (error);
      WAIT_UNTIL (!sl_window_is_loading (opener), LOAD_TIMEOUT_S, "a project to load");
      /* The store keeps whole seconds: one each, so "newest" is defined. */
      g_usleep (G_USEC_PER_SEC + 100000);
    }
  gtk_window_destroy (GTK_WINDOW (opener));
  g_assert_cmpint (g_unlink (paths[2]), ==, 0);

  welcome = sl_window_new (GTK_APPLICATION (app));
  gtk_window_present (GTK_WINDOW (welcome));
  PAINT (welcome);
  g_assert_null (sl_window_get_project_path (welcome));
  recent = sl_gui_find_descendant (GTK_WIDGET (welcome), SL_TYPE_RECENT_PROJECTS);
  g_assert_nonnull (recent);
  g_assert_true (gtk_widget_is_drawable (recent));
  collect_row_titles (recent, titles);
  g_assert_cmpuint (titles->len, ==, 2);
  g_assert_cmpstr (titles->pdata[0], ==, "southern-targets.starledger");
  g_assert_cmpstr (titles->pdata[1], ==, "north-field.starledger");
  row = row_titled (recent, "north-field.starledger");
  g_assert_nonnull (strstr (adw_action_row_get_subtitle (ADW_ACTION_ROW (row)), folder));
  g_assert_nonnull (strstr (adw_action_row_get_subtitle (ADW_ACTION_ROW (row)), "opened today at "));
  {
    cairo_surface_t *picture = render_widget (GTK_WIDGET (welcome));

    save_png (picture, "gui-welcome.png");
    cairo_surface_destroy (picture);
  }

  g_signal_emit_by_name (row, "activate");
  g_assert_cmpstr (sl_window_get_project_path (welcome), ==, paths[0]);
  WAIT_UNTIL (!sl_window_is_loading (welcome), LOAD_TIMEOUT_S, "the project to load");
  gtk_window_destroy (GTK_WINDOW (welcome));
  for (guint i = 0; i < G_N_ELEMENTS (names); i++)
    g_free (paths[i]);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* ------------------------------------------------------------------ */
/* Target lists                                                       */

/* The Lists page and the New List dialog, through their actions and
 * widgets; checked against the project through src/core/lists.c.  They
 * write gui-lists.png (the window with the Lists page), gui-new-list.png
 * and gui-new-list-columns.png (the dialog, its column chooser open). */

/* The first button under WIDGET whose label is LABEL (as written, with
 * its mnemonic). */
static gboolean
is_button_labelled (GtkWidget *widget, gconstpointer label)
{
  return GTK_IS_BUTTON (widget) && g_strcmp0 (gtk_button_get_label (GTK_BUTTON (widget)), label) == 0;
}

static GtkWidget *
find_button_labelled (GtkWidget *widget, const char *label)
{
  return sl_gui_find_widget (widget, is_button_labelled, label);
}

/* Whether a label under WIDGET begins with PREFIX. */
static gboolean
is_label_starting_with (GtkWidget *widget, gconstpointer prefix)
{
  return GTK_IS_LABEL (widget) && g_str_has_prefix (gtk_label_get_text (GTK_LABEL (widget)), prefix);
}

static gboolean
label_under_starts_with (GtkWidget *widget, const char *prefix)
{
  return sl_gui_find_widget (widget, is_label_starting_with, prefix) != NULL;
}

/* List NAME's members as the core reads them, "STAR:PRIORITY:TAGS:NOTES|..."
 * (highest priority first, then by designation); NULL if there is no such list. */
static char *
list_members (const char *name)
{
  g_autofree char *path = demo_path ();
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_open (path, &error);
  g_autoptr (GPtrArray) members = NULL;
  g_autoptr (GString) text = g_string_new (NULL);

  g_assert_no_error (error);
  members = sl_list_members (project, name, NULL);
  if (members == NULL)
    return NULL;
  for (guint i = 0; i < members->len; i++)
    {
      const SlListMember *m = members->pdata[i];

      g_string_append_printf (text, "%s%s:%" G_GINT64_FORMAT ":%s:%s", i ? "|" : "", m->designation, m->priority,
                              m->tags, m->notes);
    }
  return g_string_free (g_steal_pointer (&text), FALSE);
}

static gint64
list_size (const char *name)
{
  g_autofree char *path = demo_path ();
  g_autoptr (SlProject) project = sl_project_open (path, NULL);
  g_autoptr (GArray) ids = sl_list_star_ids (project, name, NULL);

  return ids ? (gint64) ids->len : -1;
}

static gint64
count_matching (const char *condition)
{
  g_autofree char *path = demo_path ();
  g_autoptr (SlProject) project = sl_project_open (path, NULL);
  g_autoptr (GError) error = NULL;
  gint64 n = sl_list_count_matching (project, condition, &error);

  g_assert_no_error (error);
  return n;
}

/* The rows the Lists panel shows for the chosen list's members. */
static guint
panel_member_rows (void)
{
  GtkWidget *view = sl_gui_find_named (GTK_WIDGET (sl_window_get_lists_panel (demo)), "list-members");

  g_assert_nonnull (view);
  return g_list_model_get_n_items (G_LIST_MODEL (gtk_column_view_get_model (GTK_COLUMN_VIEW (view))));
}

static void
create_list (const char *name, const char *description, const char *condition, gboolean with_selection)
{
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.create-list", "(sssb)", name, description,
                                             condition, with_selection));
}

/* win.create-list from a condition: the list holds the stars the core
 * counts for it, one ledger entry says so, the panel shows it with its
 * members, and the Ledger tab shows the entry. */
static void
test_lists_create_from_condition (void)
{
  const char *condition = "teff > 6000 and dist < 150";
  g_autofree char *path = demo_path ();
  g_autoptr (SlLedgerEntry) newest = NULL;
  guint before, after;
  gint64 want;

  ENSURE_DEMO ();
  g_clear_pointer (&newest, sl_ledger_entry_free);
  newest = newest_entry (path, &before);
  want = count_matching (condition);
  g_assert_cmpint (want, >, 5);
  g_assert_cmpint (want, <, DEMO_STARS / 2);
  create_list ("warm near", "spring run", condition, FALSE);

  g_assert_cmpint (list_size ("warm near"), ==, want);
  g_clear_pointer (&newest, sl_ledger_entry_free);
  newest = newest_entry (path, &after);
  g_assert_cmpuint (after, ==, before + 1);
  g_assert_cmpstr (newest->action, ==, "list");
  {
    g_autofree char *summary = g_strdup_printf ("made list warm near: %" G_GINT64_FORMAT " stars where %s", want,
                                                condition);

    g_assert_cmpstr (newest->summary, ==, summary);
  }
  g_assert_true (ledger_view_starts_with (newest->at, "list"));
  g_assert_cmpstr (sl_lists_panel_get_current (sl_window_get_lists_panel (demo)), ==, "warm near");
  g_assert_cmpuint (panel_member_rows (), ==, (guint) want);

  /* The same name again: an error in a toast, nothing written. */
  create_list ("warm near", "", "teff > 1", FALSE);
  g_clear_pointer (&newest, sl_ledger_entry_free);
  newest = newest_entry (path, &before);
  g_assert_cmpuint (before, ==, after);
  g_assert_cmpint (list_size ("warm near"), ==, want);
}

/* From the selection alone, and from a condition and the selection in one
 * ledger entry. */
static void
test_lists_create_from_selection (void)
{
  const char *const picked[] = { "LHO 0003", "LHO 0011", "LHO 0020", NULL };
  const char *condition = "teff > 9000";
  g_autofree char *path = demo_path ();
  g_autoptr (SlLedgerEntry) newest = NULL;
  g_autofree char *members = NULL;
  guint before, after;
  gint64 hot;

  ENSURE_DEMO ();
  sl_window_set_selection (demo, picked);
  create_list ("picked", "", "", TRUE);
  members = list_members ("picked");
  g_assert_cmpstr (members, ==, "LHO 0003:0::|LHO 0011:0::|LHO 0020:0::");

  hot = count_matching (condition);
  g_assert_cmpint (hot, >, 0);
  newest = newest_entry (path, &before);
  create_list ("hot or picked", "", condition, TRUE);
  g_clear_pointer (&newest, sl_ledger_entry_free);
  newest = newest_entry (path, &after);
  g_assert_cmpuint (after, ==, before + 1);
  /* None of the three is that hot (LHO 0011 has no colour at all). */
  g_assert_cmpint (list_size ("hot or picked"), ==, hot + 3);
  {
    g_autofree char *summary = g_strdup_printf ("made list hot or picked: %" G_GINT64_FORMAT " star%s where %s, "
                                                "and 3 more by hand", hot, hot == 1 ? "" : "s", condition);

    g_assert_cmpstr (newest->summary, ==, summary);
  }

  /* Without a condition, nothing selected: nothing is made. */
  sl_window_set_selection (demo, NULL);
  create_list ("nothing", "", "", TRUE);
  g_assert_cmpint (list_size ("nothing"), ==, -1);
}

/* win.show-list: the table and the views show only the list's stars, and
 * every star again with "". */
static void
test_lists_show_only (void)
{
  gint64 n;
  guint all_drawn, all_rows;

  ENSURE_DEMO ();
  if (list_size ("warm near") < 0)
    create_list ("warm near", "", "teff > 6000 and dist < 150", FALSE);
  n = list_size ("warm near");
  all_drawn = drawn (SL_PLOT_KIND_HRD);
  all_rows = catalogue_rows ();
  g_assert_cmpuint (all_rows, >=, DEMO_STARS);

  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.show-list", "s", "warm near"));
  g_assert_cmpstr (sl_window_get_shown_list (demo), ==, "warm near");
  {
    AdwWindowTitle *title = ADW_WINDOW_TITLE (sl_gui_find_descendant (GTK_WIDGET (demo), ADW_TYPE_WINDOW_TITLE));

    g_assert_true (g_str_has_prefix (adw_window_title_get_subtitle (title), "only list “warm near” · "));
  }
  WAIT_UNTIL (catalogue_rows () == (guint) n, LOAD_TIMEOUT_S, "the table to show the list");
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the views' stars");
  PAINT (demo);
  /* Every star of this list has a temperature and a distance: all drawn. */
  g_assert_cmpuint (drawn (SL_PLOT_KIND_HRD), ==, (guint) n);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_SKY), ==, (guint) n);
  g_assert_cmpuint (all_drawn, >, (guint) n);
  {
    GtkDropDown *show = GTK_DROP_DOWN (sl_gui_find_named (GTK_WIDGET (sl_window_get_lists_panel (demo)), "show-list"));
    GListModel *model = gtk_drop_down_get_model (show);

    g_assert_cmpstr (gtk_string_list_get_string (GTK_STRING_LIST (model), gtk_drop_down_get_selected (show)), ==,
                     "warm near");
  }

  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.show-list", "s", ""));
  g_assert_null (sl_window_get_shown_list (demo));
  WAIT_UNTIL (catalogue_rows () == all_rows, LOAD_TIMEOUT_S, "the table to show every star");
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the views' stars");
  PAINT (demo);
  g_assert_cmpuint (drawn (SL_PLOT_KIND_HRD), ==, all_drawn);
}

/* Adding and removing the selection, a member's priority, tags and notes
 * (through the action and through the Edit Star dialog), choosing a member
 * selects it everywhere, and a picture of the Lists page. */
static void
test_lists_members (void)
{
  const char *const two[] = { "LHO 0001", "LHO 0002", NULL };
  const char *const one[] = { "LHO 0001", NULL };
  g_autofree char *members = NULL;
  GtkWidget *notebook, *view;
  AdwMessageDialog *dialog;

  ENSURE_DEMO ();
  /* Neither a condition nor the selection: an empty list to fill by hand. */
  create_list ("by hand", "checked by eye", "", FALSE);
  g_assert_cmpint (list_size ("by hand"), ==, 0);
  sl_window_set_selection (demo, two);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.add-to-list", "s", "by hand"));
  g_assert_cmpint (list_size ("by hand"), ==, 2);

  sl_window_set_selection (demo, one);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.remove-from-list", "s", "by hand"));
  members = list_members ("by hand");
  g_assert_cmpstr (members, ==, "LHO 0002:0::");
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.add-to-list", "s", "by hand"));
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.set-list-member", "(ssxss)", "by hand",
                                             "LHO 0002", (gint64) 3, "binary", "check the companion"));
  g_clear_pointer (&members, g_free);
  members = list_members ("by hand");
  g_assert_cmpstr (members, ==, "LHO 0002:3:binary:check the companion|LHO 0001:0::");
  g_assert_true (ledger_view_starts_with ("", "set LHO 0002 in list by hand: priority 3"));

  /* The panel lists the members in the core's order; choosing the second
   * selects LHO 0001 everywhere and keeps the Lists page in front. */
  g_assert_true (sl_lists_panel_set_current (sl_window_get_lists_panel (demo), "by hand"));
  g_assert_cmpuint (panel_member_rows (), ==, 2);
  {
    GListModel *shown = G_LIST_MODEL (gtk_column_view_get_model (GTK_COLUMN_VIEW (
      sl_gui_find_named (GTK_WIDGET (sl_window_get_lists_panel (demo)), "list-members"))));
    g_autoptr (GtkStringObject) first = g_list_model_get_item (shown, 0);
    g_autoptr (GtkStringObject) second = g_list_model_get_item (shown, 1);

    g_assert_cmpstr (gtk_string_object_get_string (first), ==, "LHO 0002");   /* priority 3 */
    g_assert_cmpstr (gtk_string_object_get_string (second), ==, "LHO 0001");
    g_assert_null (g_list_model_get_item (shown, 2));
  }
  notebook = gtk_widget_get_ancestor (GTK_WIDGET (sl_window_get_lists_panel (demo)), GTK_TYPE_NOTEBOOK);
  gtk_notebook_set_current_page (GTK_NOTEBOOK (notebook), 2);
  view = sl_gui_find_named (GTK_WIDGET (sl_window_get_lists_panel (demo)), "list-members");
  gtk_selection_model_select_item (gtk_column_view_get_model (GTK_COLUMN_VIEW (view)), 1, TRUE);
  {
    g_autofree char *selected = window_selection ();

    g_assert_cmpstr (selected, ==, "LHO 0001");
  }
  g_assert_cmpint (gtk_notebook_get_current_page (GTK_NOTEBOOK (notebook)), ==, 2);

  /* Edit Star… on LHO 0001 (a double click on its row does the same). */
  g_signal_emit_by_name (view, "activate", 1);
  WAIT_UNTIL ((dialog = open_message_dialog ()) != NULL, FRAME_TIMEOUT_S, "the Edit Star dialog");
  {
    GtkWidget *grid = adw_message_dialog_get_extra_child (dialog);
    GtkWidget *spin = sl_gui_find_descendant (grid, GTK_TYPE_SPIN_BUTTON);
    const char *const texts[] = { "faint, spring", "ask for a spectrum", NULL };
    guint i = 0;

    gtk_spin_button_set_value (GTK_SPIN_BUTTON (spin), 7);
    for (GtkWidget *child = gtk_widget_get_first_child (grid); child; child = gtk_widget_get_next_sibling (child))
      if (GTK_IS_ENTRY (child))
        gtk_editable_set_text (GTK_EDITABLE (child), texts[i++]);
    g_assert_cmpuint (i, ==, 2);
  }
  adw_message_dialog_response (dialog, "save");
  gtk_window_close (GTK_WINDOW (dialog));
  g_clear_pointer (&members, g_free);
  members = list_members ("by hand");
  g_assert_cmpstr (members, ==, "LHO 0001:7:faint, spring:ask for a spectrum|LHO 0002:3:binary:check the companion");

  PAINT (demo);
  {
    cairo_surface_t *picture = render_widget (GTK_WIDGET (demo));
    Census c = census_of (picture, GTK_WIDGET (sl_window_get_lists_panel (demo)));

    save_png (picture, "gui-lists.png");
    /* Lines of text: the chooser, the buttons, the lists, the members. */
    g_assert_cmpuint (c.dark_bands, >=, 6);
    cairo_surface_destroy (picture);
  }
}

/* The New List dialog: rows write the condition, the count follows it, a
 * mistake shows inline, Create makes the list and closes the dialog. */
static void
test_lists_new_dialog (void)
{
  GtkWindow *dialog = NULL;
  GtkWidget *column, *op, *value, *text, *status;
  GListModel *names;
  guint teff = G_MAXUINT;
  g_autofree char *want = NULL;

  ENSURE_DEMO ();
  sl_window_set_selection (demo, NULL);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.new-list", NULL));
  WAIT_UNTIL ((dialog = sl_gui_find_toplevel (ADW_TYPE_WINDOW)) != NULL
              && g_strcmp0 (gtk_window_get_title (dialog), "New List") == 0,
              FRAME_TIMEOUT_S, "the New List dialog");
  column = sl_gui_find_named (GTK_WIDGET (dialog), "condition-column");
  op = sl_gui_find_named (GTK_WIDGET (dialog), "condition-op");
  value = sl_gui_find_named (GTK_WIDGET (dialog), "condition-value");
  text = sl_gui_find_named (GTK_WIDGET (dialog), "condition-text");
  status = sl_gui_find_named (GTK_WIDGET (dialog), "match-count");
  g_assert_true (column && op && value && text && status);

  /* The column chooser offers the core's names. */
  names = gtk_drop_down_get_model (GTK_DROP_DOWN (column));
  for (guint i = 0; i < g_list_model_get_n_items (names); i++)
    if (g_strcmp0 (gtk_string_list_get_string (GTK_STRING_LIST (names), i), "teff") == 0)
      teff = i;
  g_assert_cmpuint (teff, !=, G_MAXUINT);
  {
    g_autoptr (GArray) core = sl_condition_names ();

    g_assert_cmpuint (g_list_model_get_n_items (names), ==, core->len);
  }

  gtk_editable_set_text (GTK_EDITABLE (sl_gui_find_named (GTK_WIDGET (dialog), "list-name")), "from the dialog");
  gtk_drop_down_set_selected (GTK_DROP_DOWN (column), teff);
  gtk_drop_down_set_selected (GTK_DROP_DOWN (op), 4);   /* > */
  gtk_editable_set_text (GTK_EDITABLE (value), "7000");
  g_assert_cmpstr (gtk_editable_get_text (GTK_EDITABLE (text)), ==, "teff > 7000");

  /* A second row, any of: a text column with contains. */
  g_signal_emit_by_name (sl_gui_find_named (GTK_WIDGET (dialog), "add-condition"), "clicked");
  {
    GtkWidget *rows = gtk_widget_get_parent (gtk_widget_get_parent (column));
    GtkWidget *second = gtk_widget_get_last_child (rows);
    GtkWidget *column2 = sl_gui_find_named (second, "condition-column");
    GListModel *model = gtk_drop_down_get_model (GTK_DROP_DOWN (column2));

    for (guint i = 0; i < g_list_model_get_n_items (model); i++)
      if (g_strcmp0 (gtk_string_list_get_string (GTK_STRING_LIST (model), i), "sptype") == 0)
        gtk_drop_down_set_selected (GTK_DROP_DOWN (column2), i);
    gtk_drop_down_set_selected (GTK_DROP_DOWN (sl_gui_find_named (second, "condition-op")), 2);   /* contains */
    gtk_editable_set_text (GTK_EDITABLE (sl_gui_find_named (second, "condition-value")), "III");
  }
  gtk_drop_down_set_selected (GTK_DROP_DOWN (sl_gui_find_named (GTK_WIDGET (dialog), "condition-combine")), 1);
  g_assert_cmpstr (gtk_editable_get_text (GTK_EDITABLE (text)), ==, "teff > 7000 or sptype ~ 'III'");
  want = g_strdup_printf ("%" G_GINT64_FORMAT " derived stars match now.",
                          count_matching ("teff > 7000 or sptype ~ 'III'"));
  WAIT_UNTIL (g_strcmp0 (gtk_label_get_text (GTK_LABEL (status)), want) == 0, FRAME_TIMEOUT_S, "the count");
  g_assert_true (gtk_widget_get_sensitive (sl_gui_find_named (GTK_WIDGET (dialog), "create-list")));
  PAINT (dialog);
  {
    cairo_surface_t *picture = render_widget (GTK_WIDGET (dialog));

    save_png (picture, "gui-new-list.png");
    cairo_surface_destroy (picture);
  }

  /* The column chooser, open, says what each name is. */
  g_signal_emit_by_name (column, "activate");
  {
    GtkWidget *popover = sl_gui_find_descendant (column, GTK_TYPE_POPOVER);

    g_assert_nonnull (popover);
    WAIT_UNTIL (gtk_widget_get_mapped (popover), FRAME_TIMEOUT_S, "the column chooser to open");
    PAINT (popover);
    WAIT_UNTIL (label_under_starts_with (popover, "lower bound (68%) of: "), FRAME_TIMEOUT_S,
                "the names' descriptions");
    {
      cairo_surface_t *picture = render_widget (popover);

      save_png (picture, "gui-new-list-columns.png");
      cairo_surface_destroy (picture);
    }
    gtk_popover_popdown (GTK_POPOVER (popover));
  }

  /* A mistake in the text: the compiler's message, Create disabled. */
  gtk_editable_set_text (GTK_EDITABLE (text), "teff > 7000 or sptyp ~ 'III'");
  WAIT_UNTIL (g_str_has_prefix (gtk_label_get_text (GTK_LABEL (status)), "at 16: unknown name 'sptyp' (did you mean"),
              FRAME_TIMEOUT_S, "the compiler's message");
  g_assert_true (gtk_widget_has_css_class (status, "error"));
  g_assert_false (gtk_widget_get_sensitive (sl_gui_find_named (GTK_WIDGET (dialog), "create-list")));

  /* Written by hand, then made. */
  gtk_editable_set_text (GTK_EDITABLE (text), "(teff > 7000 or sptype ~ 'III') and not flag:low_parallax_snr");
  WAIT_UNTIL (gtk_widget_get_sensitive (sl_gui_find_named (GTK_WIDGET (dialog), "create-list")), FRAME_TIMEOUT_S,
              "Create to be possible");
  g_object_add_weak_pointer (G_OBJECT (dialog), (gpointer *) &dialog);
  g_signal_emit_by_name (sl_gui_find_named (GTK_WIDGET (dialog), "create-list"), "clicked");
  WAIT_UNTIL (dialog == NULL, FRAME_TIMEOUT_S, "the dialog to close");
  g_assert_cmpint (list_size ("from the dialog"), ==,
                   count_matching ("(teff > 7000 or sptype ~ 'III') and not flag:low_parallax_snr"));
}

/* Export through the core's export (CSV and LaTeX), then Delete: the list
 * is gone, and the table shows every star again if it showed the list. */
static void
test_lists_export_delete (void)
{
  g_autofree char *dir = g_dir_make_tmp ("starledger-lists-XXXXXX", NULL);
  g_autofree char *csv = g_build_filename (dir, "warm.csv", NULL);
  g_autofree char *tex = g_build_filename (dir, "warm.tex", NULL);
  g_autofree char *contents = NULL;
  g_auto (GStrv) lines = NULL;
  g_autofree char *path = demo_path ();
  g_autoptr (SlLedgerEntry) newest = NULL;
  guint n_entries, all_rows;
  gint64 n;

  ENSURE_DEMO ();
  all_rows = catalogue_rows ();
  if (list_size ("warm near") < 0)
    create_list ("warm near", "", "teff > 6000 and dist < 150", FALSE);
  n = list_size ("warm near");
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.export-list-to", "(ss)", "warm near", csv));
  WAIT_UNTIL (!sl_window_is_working (demo), LOAD_TIMEOUT_S, "the CSV export");
  g_assert_true (g_file_get_contents (csv, &contents, NULL, NULL));
  lines = g_strsplit (g_strchomp (contents), "\n", -1);
  g_assert_cmpuint (g_strv_length (lines), ==, (guint) n + 1);
  g_clear_pointer (&contents, g_free);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.export-list-to", "(ss)", "warm near", tex));
  WAIT_UNTIL (!sl_window_is_working (demo), LOAD_TIMEOUT_S, "the LaTeX export");
  g_assert_true (g_file_get_contents (tex, &contents, NULL, NULL));
  g_assert_nonnull (strstr (contents, "\\begin{tabular}"));

  /* Delete… asks first: Cancel keeps the list, Delete deletes it. */
  g_assert_true (sl_lists_panel_set_current (sl_window_get_lists_panel (demo), "by hand"));
  for (int round = 0; round < 2; round++)
    {
      GtkWidget *delete = find_button_labelled (GTK_WIDGET (sl_window_get_lists_panel (demo)), "_Delete…");
      AdwMessageDialog *dialog;

      g_assert_nonnull (delete);
      g_signal_emit_by_name (delete, "clicked");
      WAIT_UNTIL ((dialog = open_message_dialog ()) != NULL, FRAME_TIMEOUT_S, "the confirmation");
      g_assert_cmpstr (adw_message_dialog_get_heading (dialog), ==, "Delete List by hand?");
      adw_message_dialog_response (dialog, round == 0 ? "cancel" : "delete");
      gtk_window_close (GTK_WINDOW (dialog));
      WAIT_UNTIL (open_message_dialog () == NULL, FRAME_TIMEOUT_S, "the confirmation to close");
      g_assert_cmpint (list_size ("by hand"), ==, round == 0 ? 2 : -1);
    }
  g_assert_null (sl_lists_panel_get_current (sl_window_get_lists_panel (demo)));

  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.show-list", "s", "warm near"));
  WAIT_UNTIL (catalogue_rows () == (guint) n, LOAD_TIMEOUT_S, "the table to show the list");
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.delete-list", "s", "warm near"));
  g_assert_cmpint (list_size ("warm near"), ==, -1);
  newest = newest_entry (path, &n_entries);
  g_assert_true (g_str_has_prefix (newest->summary, "deleted list warm near"));
  g_assert_null (sl_window_get_shown_list (demo));
  WAIT_UNTIL (catalogue_rows () == all_rows, LOAD_TIMEOUT_S, "the table to show every star");
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the views' stars");

  g_unlink (csv);
  g_unlink (tex);
  g_rmdir (dir);
}

/* ------------------------------------------------------------------ */
/* Pictures of many stars                                             */

/* A sky of N stars made by hand, spread over the sphere, with V and Teff. */
static SlStarSet *
many_stars (guint n)
{
  SlStarSet *set = g_new0 (SlStarSet, 1);
  g_autoptr (GRand) rand = g_rand_new_with_seed (7);

  set->stars = g_array_sized_new (FALSE, TRUE, sizeof (SlPlotStar), n);
  set->strings = g_string_chunk_new (4096);
  for (guint i = 0; i < n; i++)
    {
      g_autofree char *name = g_strdup_printf ("MANY %06u", i);
      SlPlotStar s;

      memset (&s, 0, sizeof s);
      s.star_id = i + 1;
      s.designation = g_string_chunk_insert (set->strings, name);
      s.ra = g_rand_double_range (rand, 0, 360);
      s.dec = asin (g_rand_double_range (rand, -1, 1)) * 180.0 / G_PI;
      s.epoch = 2026.0;
      s.parallax = s.parallax_err = s.pmra = s.pmdec = NAN;
      s.vmag = g_rand_double_range (rand, 4, 15);
      s.bv0 = s.bv0_lo = s.bv0_hi = s.absmag = s.absmag_lo = s.absmag_hi = NAN;
      s.teff = g_rand_double_range (rand, 3000, 20000);
      s.teff_lo = s.teff_hi = s.lum = s.lum_lo = s.lum_hi = NAN;
      s.logt_sigma = s.logl_sigma = s.logt_logl_corr = s.elat = NAN;
      s.ellipse_a = s.ellipse_b = s.ellipse_pa = NAN;
      g_array_append_val (set->stars, s);
    }
  return set;
}

/* A sky of 200,000 stars is drawn in a worker thread while the window
 * keeps painting; the picture is then reused: repaints, a tooltip or a
 * region being dragged out draw no star again; a new selection or zoom
 * does. */
static void
test_view_picture_in_thread (void)
{
  GtkWidget *window = gtk_window_new ();
  SlPlotView *sky = sl_plot_view_new (SL_PLOT_KIND_SKY);
  SlStarSet *stars = many_stars (200000);
  const char *selection[] = { "MANY 000042", NULL };
  guint pictures;

  gtk_window_set_default_size (GTK_WINDOW (window), 600, 400);
  gtk_window_set_child (GTK_WINDOW (window), GTK_WIDGET (sky));
  gtk_window_present (GTK_WINDOW (window));
  sl_plot_view_set_stars (sky, stars);
  sl_star_set_free (stars);   /* the view keeps its own reference */
  PAINT (window);
  WAIT_UNTIL (sl_plot_view_get_n_drawn (sky) == 200000, LOAD_TIMEOUT_S, "the worker's picture");
  g_assert_false (sl_plot_view_is_drawing (sky));
  pictures = sl_plot_view_get_n_pictures (sky);

  for (guint i = 0; i < 3; i++)
    {
      gtk_widget_queue_draw (GTK_WIDGET (sky));
      PAINT (window);
    }
  g_assert_cmpuint (sl_plot_view_get_n_pictures (sky), ==, pictures);
  g_assert_false (sl_plot_view_is_drawing (sky));

  sl_plot_view_set_selection (sky, selection);
  PAINT (window);
  WAIT_UNTIL (sl_plot_view_get_n_pictures (sky) == pictures + 1 && !sl_plot_view_is_drawing (sky),
              LOAD_TIMEOUT_S, "the picture with the selection");

  gtk_window_destroy (GTK_WINDOW (window));
}

/* ------------------------------------------------------------------ */
/* The Catalogue's columns                                            */

/* The names of the columns the table shows, "a|b|c". */
static char *
shown_columns (void)
{
  g_auto (GStrv) names = sl_catalogue_view_get_columns (sl_window_get_catalogue (demo));

  return g_strjoinv ("|", names);
}

static gboolean
shown_columns_start_with (const char *prefix)
{
  g_autofree char *shown = shown_columns ();

  return g_str_has_prefix (shown, prefix);
}

/* Whether the table's first row is DESIGNATION's. */
static gboolean
first_row_is (const char *designation)
{
  GListModel *rows = G_LIST_MODEL (sl_catalogue_view_get_selection_model (sl_window_get_catalogue (demo)));
  g_autoptr (SlCatalogueRow) row = g_list_model_get_item (rows, 0);

  return row && g_strcmp0 (sl_catalogue_row_get_designation (row), designation) == 0;
}

static char *
stored_columns (GSettings *settings)
{
  g_auto (GStrv) names = g_settings_get_strv (settings, "catalogue-columns");

  return g_strjoinv ("|", names);
}

/* The column view's header titles, "a|b|c". */
static char *
header_titles (void)
{
  GtkWidget *table = sl_gui_find_descendant (GTK_WIDGET (sl_window_get_catalogue (demo)), GTK_TYPE_COLUMN_VIEW);
  GListModel *columns = gtk_column_view_get_columns (GTK_COLUMN_VIEW (table));
  g_autoptr (GString) titles = g_string_new (NULL);

  for (guint i = 0; i < g_list_model_get_n_items (columns); i++)
    {
      g_autoptr (GtkColumnViewColumn) column = g_list_model_get_item (columns, i);

      g_string_append_printf (titles, "%s%s", i ? "|" : "", gtk_column_view_column_get_title (column));
    }
  return g_string_free (g_steal_pointer (&titles), FALSE);
}

/* The first row drawn whose first cell shows a star's name: that label. */
static gboolean
is_mapped_star_label (GtkWidget *widget, gconstpointer unused)
{
  return GTK_IS_LABEL (widget) && g_str_has_prefix (gtk_label_get_text (GTK_LABEL (widget)), "LHO ")
         && gtk_widget_get_mapped (widget);
}

static GtkWidget *
first_star_label (GtkWidget *widget)
{
  return sl_gui_find_widget (widget, is_mapped_star_label, NULL);
}

/* The text of the cell in column INDEX of the row whose name cell is
 * NAME_LABEL (a row holds its cells in the columns' order). */
static const char *
cell_text (GtkWidget *name_label, guint index)
{
  GtkWidget *cell = gtk_widget_get_first_child (gtk_widget_get_parent (gtk_widget_get_parent (name_label)));

  for (guint i = 0; i < index && cell; i++)
    cell = gtk_widget_get_next_sibling (cell);
  g_assert_nonnull (cell);
  g_assert_true (GTK_IS_LABEL (gtk_widget_get_first_child (cell)));
  return gtk_label_get_text (GTK_LABEL (gtk_widget_get_first_child (cell)));
}

/* What the table must show for DESIGNATION's proper motion in RA and
 * tangential velocity: the core's inputs and derived row, formatted. */
static void
expected_cells (const char *designation, char **pmra, char **vtan)
{
  g_autofree char *path = demo_path ();
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_open (path, &error);
  gint64 id = project ? sl_star_lookup (project, designation, &error) : 0;
  g_autoptr (SlInputCursor) cursor = NULL;
  SlStarInputs in;
  SlDerivedRow row;
  double e;

  g_assert_no_error (error);
  cursor = sl_input_cursor_new (project, id, &error);
  g_assert_true (sl_input_cursor_next (cursor, &in, &error));
  g_assert_true (in.present[SL_FIELD_PMRA] && in.present[SL_FIELD_PMRA_ERR]);
  e = in.value[SL_FIELD_PMRA_ERR];
  *pmra = sl_catalogue_format_number (SL_CATALOGUE_KIND_NUMBER, in.value[SL_FIELD_PMRA],
                                      in.value[SL_FIELD_PMRA] - e, in.value[SL_FIELD_PMRA] + e);
  g_assert_true (sl_derived_row_load (project, id, &row, &error));
  g_assert_true (row.values.has[SL_Q_VTAN]);
  *vtan = sl_catalogue_format_number (SL_CATALOGUE_KIND_NUMBER, row.values.value[SL_Q_VTAN],
                                      row.values.lo[SL_Q_VTAN], row.values.hi[SL_Q_VTAN]);
}

static GtkCheckButton *
check_labelled (GtkWidget *widget, const char *label)
{
  if (GTK_IS_CHECK_BUTTON (widget) && g_strcmp0 (gtk_check_button_get_label (GTK_CHECK_BUTTON (widget)), label) == 0)
    return GTK_CHECK_BUTTON (widget);
  for (GtkWidget *child = gtk_widget_get_first_child (widget); child; child = gtk_widget_get_next_sibling (child))
    {
      GtkCheckButton *found = check_labelled (child, label);

      if (found)
        return found;
    }
  return NULL;
}

#define USUAL_COLUMNS "designation|ra|dec|parallax|vmag|bv|dist|absmag|teff|lum|radius|spclass|sptype|flags"

/* Columns shown through the chooser's action: in the table after the
 * shown columns the chooser lists before them, with the core's numbers in their cells, stored in
 * GSettings; the setting shows them too; the chooser's check buttons
 * follow and act; the last column stays; Reset brings the usual columns
 * back.  Saves gui-columns.png (the window with more columns) and
 * gui-columns-chooser.png (the chooser open). */
static void
test_catalogue_columns (void)
{
  g_autoptr (GSettings) settings = g_settings_new (SL_APPLICATION_ID);
  GtkWidget *catalogue;
  GtkWidget *chooser, *popover, *name;
  g_autofree char *shown = NULL, *stored = NULL, *titles = NULL, *want_pmra = NULL, *want_vtan = NULL;
  g_autofree char *designation = NULL;
  guint rows;

  ENSURE_DEMO ();
  catalogue = GTK_WIDGET (sl_window_get_catalogue (demo));
  rows = catalogue_rows ();
  g_assert_cmpstr ((shown = shown_columns ()), ==, USUAL_COLUMNS);
  g_assert_cmpstr ((stored = stored_columns (settings)), ==, USUAL_COLUMNS);

  g_assert_true (gtk_widget_activate_action (catalogue, "catalogue.toggle-column", "s", "pmra"));
  g_assert_true (gtk_widget_activate_action (catalogue, "catalogue.toggle-column", "s", "vtan"));
  g_clear_pointer (&shown, g_free);
  g_clear_pointer (&stored, g_free);
  g_assert_cmpstr ((shown = shown_columns ()), ==,
                   "designation|ra|dec|parallax|pmra|vmag|bv|dist|absmag|teff|lum|radius|spclass|sptype|vtan|flags");
  g_assert_cmpstr ((stored = stored_columns (settings)), ==, shown);
  g_assert_cmpstr ((titles = header_titles ()), ==,
                   "Star|RA|Dec|Parallax (mas)|PM in RA (mas/yr)|V (mag)|B−V (mag)|Distance (pc)|Abs. V (mag)|Teff (K)"
                   "|L (L☉)|R (R☉)|Class|Type|Tangential velocity (km/s)|Flags");

  /* The cells: what the core says of the star in the first row drawn. */
  PAINT (demo);
  WAIT_UNTIL ((name = first_star_label (catalogue)) != NULL, FRAME_TIMEOUT_S, "a row of the table");
  designation = g_strdup (gtk_label_get_text (GTK_LABEL (name)));
  expected_cells (designation, &want_pmra, &want_vtan);
  g_test_message ("%s: pmra %s, vtan %s", designation, want_pmra, want_vtan);
  WAIT_UNTIL (g_strcmp0 (cell_text (name, 4), want_pmra) == 0, FRAME_TIMEOUT_S, "the proper motion cell");
  g_assert_cmpstr (cell_text (name, 14), ==, want_vtan);
  /* With its interval, rounded to the uncertainty's digits. */
  g_assert_true (strstr (want_vtan, " ± ") || strstr (want_vtan, "/−"));
  {
    cairo_surface_t *picture = render_widget (GTK_WIDGET (demo));

    save_png (picture, "gui-columns.png");
    cairo_surface_destroy (picture);
  }

  /* The chooser: its check buttons say what is shown, and act. */
  chooser = sl_catalogue_view_get_column_chooser (SL_CATALOGUE_VIEW (catalogue));
  gtk_menu_button_popup (GTK_MENU_BUTTON (chooser));
  popover = GTK_WIDGET (gtk_menu_button_get_popover (GTK_MENU_BUTTON (chooser)));
  WAIT_UNTIL (gtk_widget_get_mapped (popover), FRAME_TIMEOUT_S, "the column chooser to open");
  g_assert_true (gtk_check_button_get_active (check_labelled (popover, "PM in RA (mas/yr)")));
  g_assert_true (gtk_check_button_get_active (check_labelled (popover, "Tangential velocity (km/s)")));
  g_assert_false (gtk_check_button_get_active (check_labelled (popover, "B (mag)")));
  gtk_check_button_set_active (check_labelled (popover, "B (mag)"), TRUE);
  gtk_check_button_set_active (check_labelled (popover, "PM in RA (mas/yr)"), FALSE);
  g_clear_pointer (&shown, g_free);
  g_assert_cmpstr ((shown = shown_columns ()), ==,
                   "designation|ra|dec|parallax|vmag|bmag|bv|dist|absmag|teff|lum|radius|spclass|sptype|vtan|flags");
  PAINT (popover);
  {
    cairo_surface_t *picture = render_widget (popover);

    save_png (picture, "gui-columns-chooser.png");
    cairo_surface_destroy (picture);
  }
  gtk_popover_popdown (GTK_POPOVER (popover));

  /* The setting shows its columns, in its order; unknown names are left
   * out; the last column cannot be hidden. */
  {
    const char *const stored_names[] = { "teff", "no such column", "designation", "ebv", NULL };
    const char *const alone[] = { "teff", NULL };

    g_assert_true (g_settings_set_strv (settings, "catalogue-columns", stored_names));
    g_clear_pointer (&shown, g_free);
    g_assert_cmpstr ((shown = shown_columns ()), ==, "teff|designation|ebv");
    g_assert_false (gtk_check_button_get_active (check_labelled (popover, "B (mag)")));
    g_assert_true (gtk_check_button_get_active (check_labelled (popover, "E(B−V) (mag)")));
    g_clear_pointer (&titles, g_free);
    g_assert_cmpstr ((titles = header_titles ()), ==, "Teff (K)|Star|E(B−V) (mag)");
    g_assert_true (g_settings_set_strv (settings, "catalogue-columns", alone));
    g_assert_true (gtk_widget_activate_action (catalogue, "catalogue.toggle-column", "s", "teff"));
    g_clear_pointer (&shown, g_free);
    g_assert_cmpstr ((shown = shown_columns ()), ==, "teff");
    g_assert_true (gtk_check_button_get_active (check_labelled (popover, "Teff (K)")));
  }

  /* Reset: the usual columns, shown and stored. */
  g_assert_true (gtk_widget_activate_action (catalogue, "catalogue.reset-columns", NULL));
  g_clear_pointer (&shown, g_free);
  g_clear_pointer (&stored, g_free);
  g_assert_cmpstr ((shown = shown_columns ()), ==, USUAL_COLUMNS);
  g_assert_cmpstr ((stored = stored_columns (settings)), ==, USUAL_COLUMNS);
  g_assert_cmpuint (catalogue_rows (), ==, rows);

  /* A header dragged elsewhere (what the column view's drag does): the
   * order is kept and stored. */
  {
    GtkWidget *table = sl_gui_find_descendant (catalogue, GTK_TYPE_COLUMN_VIEW);
    g_autoptr (GtkColumnViewColumn) teff = g_list_model_get_item (gtk_column_view_get_columns (GTK_COLUMN_VIEW (table)), 8);

    g_assert_cmpstr (gtk_column_view_column_get_title (teff), ==, "Teff (K)");
    gtk_column_view_insert_column (GTK_COLUMN_VIEW (table), 1, teff);
    WAIT_UNTIL (shown_columns_start_with ("designation|teff|ra|"), FRAME_TIMEOUT_S, "the new order");
    g_clear_pointer (&stored, g_free);
    g_assert_cmpstr ((stored = stored_columns (settings)), ==,
                     "designation|teff|ra|dec|parallax|vmag|bv|dist|absmag|lum|radius|spclass|sptype|flags");
  }
  g_assert_true (gtk_widget_activate_action (catalogue, "catalogue.reset-columns", NULL));
  g_clear_pointer (&shown, g_free);
  g_assert_cmpstr ((shown = shown_columns ()), ==, USUAL_COLUMNS);

  /* Sorted by a column: showing another keeps the order; hiding the
   * sorted one goes back to the order the stars entered the project. */
  {
    GtkWidget *table = sl_gui_find_descendant (catalogue, GTK_TYPE_COLUMN_VIEW);
    g_autoptr (GtkColumnViewColumn) teff = g_list_model_get_item (gtk_column_view_get_columns (GTK_COLUMN_VIEW (table)), 8);
    g_autofree char *path = demo_path ();
    g_autoptr (GError) error = NULL;
    g_autoptr (SlProject) project = sl_project_open (path, &error);
    g_autofree char *hottest = sl_test_query_text (sl_project_db (project), "SELECT s.designation FROM stars s JOIN derived d "
                                                   "ON d.star_id = s.id ORDER BY d.teff DESC NULLS LAST, s.id LIMIT 1");
    g_autofree char *first = sl_test_query_text (sl_project_db (project), "SELECT designation FROM stars ORDER BY id LIMIT 1");

    g_assert_no_error (error);
    g_assert_cmpstr (hottest, !=, first);
    gtk_column_view_sort_by_column (GTK_COLUMN_VIEW (table), teff, GTK_SORT_DESCENDING);
    WAIT_UNTIL (first_row_is (hottest), LOAD_TIMEOUT_S, "the table sorted by temperature");
    g_assert_true (gtk_widget_activate_action (catalogue, "catalogue.toggle-column", "s", "elat"));
    g_assert_true (first_row_is (hottest));
    g_assert_true (gtk_widget_activate_action (catalogue, "catalogue.toggle-column", "s", "teff"));
    WAIT_UNTIL (first_row_is (first), LOAD_TIMEOUT_S, "the table in the stars' order");
    g_assert_true (gtk_widget_activate_action (catalogue, "catalogue.reset-columns", NULL));
    g_assert_true (first_row_is (first));
  }
}

/* ------------------------------------------------------------------ */
/* Matches                                                            */

#define WAIT_MATCHES(panel) \
  WAIT_UNTIL (!sl_matches_panel_is_loading (panel), LOAD_TIMEOUT_S, "the Matches page to read the project")

/* The Matches page on the demo: the second-epoch survey's four ambiguous
 * rows come first with their candidates, then its 46 joined rows; a
 * search finds one; choosing a row selects its star (and an ambiguous
 * row's candidate) everywhere; win.split-match splits a joined row as
 * `starledger-cli split` does: its own star again, the match recorded as
 * split, a ledger entry, the star it left stale. */
static void
test_matches_panel (void)
{
  g_autofree char *path = demo_path ();
  SlMatchesPanel *panel;
  g_autofree char *ref = NULL;
  g_autofree char *text = NULL;
  gint64 n_matches, stale_before, measurement;
  GtkWidget *notebook;
  SlLedgerEntry *entry;
  guint n_entries;

  ENSURE_DEMO ();
  panel = sl_matches_panel_of (demo);
  g_assert_nonnull (panel);
  sl_matches_panel_set_search (panel, "");
  WAIT_MATCHES (panel);
  n_matches = count_in (path, "SELECT count(*) FROM matches");
  g_assert_cmpint (n_matches, ==, 50);
  g_assert_cmpuint (sl_matches_panel_get_n_rows (panel), ==, (guint) n_matches);
  for (guint i = 0; i < 4; i++)
    g_assert_cmpstr (sl_matches_panel_get_status (panel, i), ==, "ambiguous");
  g_assert_cmpstr (sl_matches_panel_get_status (panel, 4), ==, "matched");
  g_assert_cmpstr (sl_matches_panel_get_status (panel, 49), ==, "matched");
  g_assert_cmpstr (sl_matches_panel_get_counts (panel), ==, "46 joined by position · 4 ambiguous · 0 split");
  text = sl_matches_panel_get_text (panel, 0);
  g_assert_true (g_str_has_prefix (text, "TRS J0021: ambiguous, not merged\nsecond-epoch.csv:24 · candidates: LHO 0124 at 0."));
  g_assert_nonnull (strstr (text, "kept as star TRS J0021"));

  /* The ambiguous row and its candidate, selected together. */
  sl_matches_panel_choose (panel, 0);
  {
    g_autofree char *selected = window_selection ();

    g_assert_cmpstr (selected, ==, "LHO 0124|TRS J0021");
  }

  /* A fast star: 8.8 arcsec on between the epochs, still joined. */
  sl_matches_panel_set_search (panel, "lho 0185");
  WAIT_MATCHES (panel);
  g_assert_cmpuint (sl_matches_panel_get_n_rows (panel), ==, 1);
  g_clear_pointer (&text, g_free);
  text = sl_matches_panel_get_text (panel, 0);
  g_assert_true (g_str_has_prefix (text, "TRS J0028 → LHO 0185\nsecond-epoch.csv:31 · 0.0"));
  g_assert_nonnull (strstr (text, "arcsec apart at J2016.000 · radius 1 arcsec"));
  sl_matches_panel_choose (panel, 0);
  {
    g_autofree char *selected = window_selection ();

    g_assert_cmpstr (selected, ==, "LHO 0185");
  }
  sl_matches_panel_set_search (panel, "no such star");
  WAIT_MATCHES (panel);
  g_assert_cmpuint (sl_matches_panel_get_n_rows (panel), ==, 0);
  sl_matches_panel_set_search (panel, "LHO 0185");
  WAIT_MATCHES (panel);
  ref = sl_matches_panel_get_ref (panel, 0);
  g_assert_cmpstr (ref, ==, "3:31");

  stale_before = stale_stars (path);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.split-match", "s", ref));
  WAIT_MATCHES (panel);
  measurement = count_in (path, "SELECT m.id FROM measurements m WHERE m.source_id = 3 AND m.line = 31");
  {
    g_autofree char *status = NULL;
    g_autofree char *star = NULL;
    g_autoptr (GError) error = NULL;
    g_autoptr (SlProject) project = sl_project_open (path, &error);
    g_autofree char *sql = g_strdup_printf ("SELECT x.status, s.designation FROM matches x "
                                            "JOIN measurements m ON m.id = x.measurement_id "
                                            "JOIN stars s ON s.id = m.star_id WHERE x.measurement_id = %" G_GINT64_FORMAT,
                                            measurement);
    sqlite3_stmt *stmt;

    g_assert_no_error (error);
    g_assert_cmpint (sqlite3_prepare_v2 (sl_project_db (project), sql, -1, &stmt, NULL), ==, SQLITE_OK);
    g_assert_cmpint (sqlite3_step (stmt), ==, SQLITE_ROW);
    g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 0), ==, "split");
    g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 1), ==, "TRS J0028");
    sqlite3_finalize (stmt);
  }
  entry = newest_entry (path, &n_entries);
  g_assert_cmpstr (entry->action, ==, "split");
  sl_ledger_entry_free (entry);
  g_assert_cmpint (stale_stars (path), >, stale_before);
  /* The panel read the project again: the row is split now. */
  g_assert_cmpuint (sl_matches_panel_get_n_rows (panel), ==, 1);
  g_assert_cmpstr (sl_matches_panel_get_status (panel, 0), ==, "split");
  g_assert_cmpstr (sl_matches_panel_get_counts (panel), ==, "45 joined by position · 4 ambiguous · 1 split");
  /* Splitting it again is refused with a message, and changes nothing. */
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.split-match", "s", ref));
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM matches WHERE status = 'split'"), ==, 1);

  sl_matches_panel_set_search (panel, "");
  WAIT_MATCHES (panel);
  notebook = gtk_widget_get_ancestor (GTK_WIDGET (panel), GTK_TYPE_NOTEBOOK);
  gtk_notebook_set_current_page (GTK_NOTEBOOK (notebook),
                                 gtk_notebook_page_num (GTK_NOTEBOOK (notebook), GTK_WIDGET (panel)));
  sl_matches_panel_choose (panel, 1);
  PAINT (demo);
  {
    cairo_surface_t *picture = render_widget (GTK_WIDGET (demo));
    Census c = census_of (picture, GTK_WIDGET (panel));

    save_png (picture, "gui-matches.png");
    /* Dark lines of text: the counts and the rows' headlines (the
     * headings and details are dimmed). */
    g_assert_cmpuint (c.dark_bands, >=, 4);
    cairo_surface_destroy (picture);
  }
}


/* The preview of the HR diagram and the sky draws the window's own stars
 * (a million stars are hundreds of megabytes: no second copy); the
 * parallax figure loads the few stars whose paths it draws. */
static void
test_figure_shares_stars (void)
{
  const char *list = NULL;
  g_autoptr (SlStarSet) shown = NULL;

  ENSURE_DEMO ();
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the window to be idle");
  shown = sl_window_ref_stars (demo, &list);
  g_assert_nonnull (shown);
  g_assert_null (list);
  for (guint i = 0; i < 3; i++)
    {
      const char *kind = i == 0 ? "hr" : i == 1 ? "sky" : "parallax";
      SlFigureDialog *dialog = open_figure_dialog (kind);

      g_assert_nonnull (dialog);
      if (i < 2)
        g_assert_true (sl_figure_dialog_get_stars (dialog) == shown);
      else
        g_assert_true (sl_figure_dialog_get_stars (dialog) != shown);
      gtk_window_close (GTK_WINDOW (dialog));
      WAIT_UNTIL (sl_gui_find_toplevel (SL_TYPE_FIGURE_DIALOG) == NULL, 5, "the dialog to close");
    }
}

/* The figure dialog's numbers are written with a '.' whatever the
 * locale, as the command line it shows; a ',' typed reads as the decimal
 * point.  Under de_DE.UTF-8 where it is installed (build-aux/dev makes it). */
static void
test_figure_decimal_point (void)
{
  g_autofree char *numeric = g_strdup (setlocale (LC_NUMERIC, NULL));
  SlFigureDialog *dialog;
  GtkSpinButton *width;

  ENSURE_DEMO ();
  if (setlocale (LC_NUMERIC, "de_DE.UTF-8") == NULL)
    {
      g_test_skip ("no de_DE.UTF-8 locale (build-aux/dev generates it)");
      return;
    }
  dialog = open_figure_dialog ("hr");
  g_assert_nonnull (dialog);
  width = GTK_SPIN_BUTTON (sl_gui_find_named (GTK_WIDGET (dialog), "width"));
  gtk_spin_button_set_value (width, 120.5);
  g_assert_cmpstr (gtk_editable_get_text (GTK_EDITABLE (width)), ==, "120.5");
  gtk_editable_set_text (GTK_EDITABLE (width), "88,5");
  gtk_spin_button_update (width);
  g_assert_cmpfloat (gtk_spin_button_get_value (width), ==, 88.5);
  g_assert_cmpstr (gtk_editable_get_text (GTK_EDITABLE (width)), ==, "88.5");
  /* Typed: into the text the spin button holds. */
  gtk_editable_set_text (gtk_editable_get_delegate (GTK_EDITABLE (width)), "90.5");
  gtk_spin_button_update (width);
  g_assert_cmpfloat (gtk_spin_button_get_value (width), ==, 90.5);
  g_assert_cmpstr (gtk_editable_get_text (GTK_EDITABLE (width)), ==, "90.5");
  gtk_window_close (GTK_WINDOW (dialog));
  setlocale (LC_NUMERIC, numeric);
}

/* ------------------------------------------------------------------ */
/* Combining sources                                                  */

/* The Combining Sources dialog writes the project's policy through the
 * core: a rule per group, the source order (ticked, moved), the test
 * level (a refused level stops Save); saving marks the derived values
 * stale, and the next derive records the policy and averages the
 * proper motions of the stars the second catalogue matched.  Saved as
 * gui-combine.png.  Last of the tests: it changes how the demo derives. */
static void
test_combine_dialog (void)
{
  g_autofree char *path = demo_path ();
  g_autoptr (GError) error = NULL;
  g_autoptr (SlLedgerEntry) entry = NULL;
  const char *tarn = "Tarn Ridge second epoch 2016", *larkspur = "Larkspur Hill astrometry 2026";
  g_autofree char *up_larkspur = g_strdup_printf ("up:%s", larkspur);
  g_autofree char *listed_tarn = g_strdup_printf ("listed:%s", tarn);
  g_autofree char *listed_larkspur = g_strdup_printf ("listed:%s", larkspur);
  SlCombinePolicy policy;
  SlCombineDialog *dialog;
  GtkWidget *level, *save;
  cairo_surface_t *picture;
  guint n_entries = 0;

  ENSURE_DEMO ();
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the window to be idle");
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.combine-sources", NULL));
  dialog = SL_COMBINE_DIALOG (sl_gui_find_toplevel (SL_TYPE_COMBINE_DIALOG));
  g_assert_nonnull (dialog);
  g_assert_true (gtk_window_get_modal (GTK_WINDOW (dialog)));
  PAINT (dialog);

  /* Positions offer no mean; the parallax does. */
  g_assert_cmpuint (g_list_model_get_n_items (adw_combo_row_get_model (ADW_COMBO_ROW (sl_gui_find_named (GTK_WIDGET (dialog), "position")))),
                    ==, 2);
  adw_combo_row_set_selected (ADW_COMBO_ROW (sl_gui_find_named (GTK_WIDGET (dialog), "parallax")), 2);
  g_assert_nonnull (strstr (adw_action_row_get_subtitle (ADW_ACTION_ROW (sl_gui_find_named (GTK_WIDGET (dialog), "parallax"))),
                            "weighted mean"));
  adw_combo_row_set_selected (ADW_COMBO_ROW (sl_gui_find_named (GTK_WIDGET (dialog), "vmag")), 1);
  adw_combo_row_set_selected (ADW_COMBO_ROW (sl_gui_find_named (GTK_WIDGET (dialog), "pm")), 2);

  /* Tick two sources; the second ticked goes after the first, then moves up. */
  gtk_check_button_set_active (GTK_CHECK_BUTTON (sl_gui_find_named (GTK_WIDGET (dialog), listed_tarn)), TRUE);
  gtk_check_button_set_active (GTK_CHECK_BUTTON (sl_gui_find_named (GTK_WIDGET (dialog), listed_larkspur)), TRUE);
  g_assert_true (gtk_widget_get_sensitive (sl_gui_find_named (GTK_WIDGET (dialog), up_larkspur)));
  g_signal_emit_by_name (sl_gui_find_named (GTK_WIDGET (dialog), up_larkspur), "clicked");
  g_assert_false (gtk_widget_get_sensitive (sl_gui_find_named (GTK_WIDGET (dialog), up_larkspur)));

  /* A level of 1.5 is no probability: marked, and Save waits. */
  level = sl_gui_find_named (GTK_WIDGET (dialog), "level");
  save = sl_gui_find_named (GTK_WIDGET (dialog), "save");
  gtk_editable_set_text (GTK_EDITABLE (level), "1.5");
  g_assert_true (gtk_widget_has_css_class (level, "error"));
  g_assert_false (gtk_widget_get_sensitive (save));
  gtk_editable_set_text (GTK_EDITABLE (level), "0.05");
  g_assert_false (gtk_widget_has_css_class (level, "error"));
  g_assert_true (gtk_widget_get_sensitive (save));
  PAINT (dialog);
  picture = render_widget (GTK_WIDGET (dialog));
  save_png (picture, "gui-combine.png");
  cairo_surface_destroy (picture);

  g_signal_emit_by_name (save, "clicked");
  WAIT_UNTIL (sl_gui_find_toplevel (SL_TYPE_COMBINE_DIALOG) == NULL, 5, "the dialog to close");
  {
    g_autoptr (SlProject) project = sl_project_open (path, &error);

    g_assert_no_error (error);
    g_assert_true (sl_combine_policy_read (project, &policy, &error));
  }
  g_assert_cmpint (policy.rule[SL_FIELD_PARALLAX], ==, SL_COMBINE_WEIGHTED_MEAN);
  g_assert_cmpint (policy.rule[SL_FIELD_VMAG], ==, SL_COMBINE_PRIORITY);
  g_assert_cmpint (policy.rule[SL_FIELD_PMRA], ==, SL_COMBINE_WEIGHTED_MEAN);
  g_assert_cmpint (policy.rule[SL_FIELD_RA], ==, SL_COMBINE_SMALLEST_ERROR);
  g_assert_cmpstr (policy.priority, ==, "Larkspur Hill astrometry 2026\nTarn Ridge second epoch 2016");
  g_assert_cmpfloat (policy.level, ==, 0.05);
  entry = newest_entry (path, &n_entries);
  g_assert_cmpstr (entry->action, ==, "combine");
  g_assert_cmpint (stale_stars (path), >, 300);

  /* The next derive uses and records it. */
  g_clear_pointer (&entry, sl_ledger_entry_free);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (demo), "win.derive-now", NULL));
  WAIT_UNTIL (!sl_window_is_loading (demo), LOAD_TIMEOUT_S, "the derivation and the reload");
  g_assert_cmpint (stale_stars (path), ==, 0);
  {
    g_autoptr (SlProject) project = sl_project_open (path, &error);
    g_autoptr (GString) text = g_string_new (NULL);
    g_autofree char *star = NULL;

    g_assert_no_error (error);
    /* A programme star the second catalogue matched: two proper motions. */
    star = sl_test_query_text (sl_project_db (project),
                               "SELECT designation FROM stars WHERE id IN (SELECT star_id FROM measurements"
                               " WHERE pmra_err > 0 AND pmdec_err > 0 GROUP BY star_id HAVING count (*) = 2)"
                               " ORDER BY id LIMIT 1");
    g_assert_true (sl_explain (project, star, "vtan", SL_EXPLAIN_TEXT, text, &error));
    g_assert_no_error (error);
    g_assert_nonnull (strstr (text->str, "pm weighted-mean"));
    g_assert_nonnull (strstr (text->str, "pmra = "));
    g_assert_nonnull (strstr (text->str, "the inverse-variance weighted mean of the 2 rows below"));
  }
}

/* A match radius in the import assistant joins a row whose id the project
 * does not know to the star at its position, as starledger-cli import
 * --match-radius does; a radius that is not a number of arcseconds in
 * (0, 3600] holds Check and Import back and says why. */
static void
test_import_assistant_match_radius (void)
{
  g_autofree char *path = demo_path ();
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *file = NULL;
  g_autofree char *csv = NULL;
  char ra[G_ASCII_DTOSTR_BUF_SIZE], dec[G_ASCII_DTOSTR_BUF_SIZE], epoch[G_ASCII_DTOSTR_BUF_SIZE];
  SlImportDialog *assistant;
  GtkWidget *radius;
  gint64 stars;

  ENSURE_DEMO ();
  WAIT_UNTIL (!sl_window_is_working (demo) && !sl_window_is_loading (demo), LOAD_TIMEOUT_S,
              "earlier work to finish");
  /* LHO 0004 as the programme measured it, 0.2 arcsec north. */
  {
    g_autoptr (GError) error = NULL;
    g_autoptr (SlProject) project = sl_project_open (path, &error);
    sqlite3_stmt *stmt;

    g_assert_no_error (error);
    g_assert_cmpint (sqlite3_prepare_v2 (sl_project_db (project),
                                         "SELECT m.ra, m.dec, m.epoch FROM measurements m JOIN stars s ON s.id = m.star_id "
                                         "JOIN sources o ON o.id = m.source_id "
                                         "WHERE s.designation = 'LHO 0004' AND o.file_name = 'astrometry.csv'",
                                         -1, &stmt, NULL), ==, SQLITE_OK);
    g_assert_cmpint (sqlite3_step (stmt), ==, SQLITE_ROW);
    g_ascii_dtostr (ra, sizeof ra, sqlite3_column_double (stmt, 0));
    g_ascii_dtostr (dec, sizeof dec, sqlite3_column_double (stmt, 1) + 0.2 / 3600.0);
    g_ascii_dtostr (epoch, sizeof epoch, sqlite3_column_double (stmt, 2));
    sqlite3_finalize (stmt);
  }
  csv = g_strdup_printf ("id,ra,dec,epoch\nGUI M001,%s,%s,%s\n", ra, dec, epoch);
  file = sl_test_write_file (dir, "gui-by-position.csv", csv, -1);
  stars = count_in (path, "SELECT count(*) FROM stars");

  assistant = sl_import_dialog_open (demo, file);
  g_assert_nonnull (assistant);
  g_assert_null (sl_import_dialog_get_problem (assistant));
  radius = find_entry_row (GTK_WIDGET (assistant), "Join rows to known stars by position");
  g_assert_nonnull (radius);
  {
    const char *const refused[] = { "0", "-1", "3601", "one", "1,5" };

    for (guint i = 0; i < G_N_ELEMENTS (refused); i++)
      {
        gtk_editable_set_text (GTK_EDITABLE (radius), refused[i]);
        g_assert_nonnull (sl_import_dialog_get_problem (assistant));
        g_assert_true (g_str_has_prefix (sl_import_dialog_get_problem (assistant), "Match radius: "));
        g_assert_nonnull (strstr (sl_import_dialog_get_problem (assistant), refused[i]));
      }
  }
  gtk_editable_set_text (GTK_EDITABLE (radius), "1");
  g_assert_null (sl_import_dialog_get_problem (assistant));

  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.check", NULL));
  WAIT_UNTIL (!sl_import_dialog_is_checking (assistant), LOAD_TIMEOUT_S, "the check");
  g_test_message ("check: %s", sl_import_dialog_get_check_summary (assistant));
  g_assert_nonnull (strstr (sl_import_dialog_get_check_summary (assistant),
                            "0 new stars. Nothing was written.\nBy position: 1 row joined to a known star, "
                            "0 ambiguous"));
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM matches WHERE row_designation = 'GUI M001'"), ==, 0);

  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (assistant), "assistant.import", NULL));
  WAIT_UNTIL (!sl_window_is_working (demo) && !sl_window_is_loading (demo)
              && count_in (path, "SELECT count(*) FROM matches WHERE row_designation = 'GUI M001'") == 1,
              LOAD_TIMEOUT_S, "the import");
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM matches x JOIN measurements m ON m.id = x.measurement_id "
                                   "JOIN stars s ON s.id = m.star_id WHERE x.row_designation = 'GUI M001' "
                                   "AND x.status = 'matched' AND s.designation = 'LHO 0004' "
                                   "AND x.radius_arcsec = 1 AND abs (x.separation_arcsec - 0.2) < 0.01"), ==, 1);
  g_assert_cmpint (count_in (path, "SELECT count(*) FROM stars"), ==, stars);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* The window's subtitle and the welcome page show a path under the home
 * folder as "~/..."; a folder that only begins like the home folder's
 * name, or any other path, is shown as it is. */
static void
test_path_for_display (void)
{
  const char *home = g_get_home_dir ();
  g_autofree char *inside = g_build_filename (home, "Observing", "nearby.starledger", NULL);
  g_autofree char *lookalike = g_strconcat (home, "-old", G_DIR_SEPARATOR_S, "nearby.starledger", NULL);
  g_autofree char *shown_inside = NULL, *shown_lookalike = NULL, *shown_home = NULL, *shown_other = NULL;

  if (strlen (home) <= 1)
    {
      g_test_skip ("the home folder is the root folder");
      return;
    }
  g_assert_cmpstr ((shown_inside = sl_path_for_display (inside)), ==, "~/Observing/nearby.starledger");
  g_assert_cmpstr ((shown_lookalike = sl_path_for_display (lookalike)), ==, lookalike);
  g_assert_cmpstr ((shown_home = sl_path_for_display (home)), ==, "~");
  g_assert_cmpstr ((shown_other = sl_path_for_display ("/srv/stars/run7.starledger")), ==,
                   "/srv/stars/run7.starledger");
}

int
main (int argc, char **argv)
{
  g_autoptr (GError) error = NULL;
  char *own_cache;
  char *own_data;
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
  /* Its own recent-files store too ($XDG_DATA_HOME/recently-used.xbel):
   * the welcome page lists what this program opened, nothing else. */
  {
    const char *data = g_getenv ("XDG_DATA_HOME");

    own_data = g_build_filename (data && *data ? data : g_get_tmp_dir (), "test-gui-XXXXXX", NULL);
    g_mkdir_with_parents (data && *data ? data : g_get_tmp_dir (), 0700);
    if (g_mkdtemp (own_data) == NULL)
      g_error ("cannot make %s: %s", own_data, g_strerror (errno));
    g_setenv ("XDG_DATA_HOME", own_data, TRUE);
  }
  /* The AT-SPI registry D-Bus would start for GTK's accessibility tree
   * writes a line to standard output, which is this program's TAP stream. */
  g_setenv ("GTK_A11Y", "none", FALSE);

  app = sl_application_new ();
  if (!g_application_register (G_APPLICATION (app), NULL, &error))
    g_error ("cannot register the application: %s", error->message);
  sl_gui_wake_loop_every (20);

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
  g_test_add_func ("/gui/figure/export", test_figure_export);
  g_test_add_func ("/gui/figure/export-refused", test_figure_export_refused);
  g_test_add_func ("/gui/views/maximize", test_maximize_view);
  g_test_add_func ("/gui/views/picture-in-thread", test_view_picture_in_thread);
  g_test_add_func ("/gui/derive/dialog", test_derive_dialog);
  g_test_add_func ("/gui/welcome/recent-projects", test_welcome_recent);
  g_test_add_func ("/gui/lists/create-from-condition", test_lists_create_from_condition);
  g_test_add_func ("/gui/lists/create-from-selection", test_lists_create_from_selection);
  g_test_add_func ("/gui/lists/show-only", test_lists_show_only);
  g_test_add_func ("/gui/lists/members", test_lists_members);
  g_test_add_func ("/gui/lists/new-dialog", test_lists_new_dialog);
  g_test_add_func ("/gui/lists/export-delete", test_lists_export_delete);
  g_test_add_func ("/gui/matches/panel", test_matches_panel);
  g_test_add_func ("/gui/catalogue/columns", test_catalogue_columns);
  g_test_add_func ("/gui/import/assistant-unit-warning", test_import_assistant_unit_warning);
  g_test_add_func ("/gui/path-for-display", test_path_for_display);
  /* After /gui/matches/panel, which counts the demo's matches. */
  g_test_add_func ("/gui/matches/import-assistant-radius", test_import_assistant_match_radius);
  g_test_add_func ("/gui/figure/decimal-point", test_figure_decimal_point);
  g_test_add_func ("/gui/figure/shares-stars", test_figure_shares_stars);
  /* Last: it changes how the demo derives. */
  g_test_add_func ("/gui/combine/dialog", test_combine_dialog);
  status = g_test_run ();

  if (demo)
    gtk_window_destroy (GTK_WINDOW (demo));
  while (g_main_context_iteration (NULL, FALSE))
    ;
  g_clear_object (&app);
  sl_test_scratch_free (own_cache);
  sl_test_scratch_free (own_data);
  return status;
}
