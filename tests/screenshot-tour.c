/* screenshot-tour.c: the pictures of README.md's user guide, taken by
 * driving the real window through one session on the demo catalogues.
 *
 * Run by build-aux/take-screenshots under Xvfb, with a scratch HOME (so
 * the project is ~/Observing/nearby-stars.starledger, as a user would
 * have it) and STARLEDGER_DEMO_DIR pointing at data/demo:
 *
 *   screenshot-tour OUTPUT_DIR
 *
 * It writes OUTPUT_DIR/NAME.png for each step of the guide, in its order:
 * the welcome page, the import assistant's check and column mapping, the
 * Matches page, the Derive dialog, the Trail, Set by Hand, the Ledger,
 * New List and the Lists page, Export Figure, and the window itself.
 * Every step goes through what a user's click would reach (the window's
 * actions, the dialogs' widgets); the one thing a click cannot reach
 * under Xvfb, the New Project file chooser, is done as its response
 * handler does it (sl_project_create, then open).
 *
 * Not a test: it stops with a message on the first thing that does not
 * happen.  It is built with the tests because it links the window's
 * library as test-gui does. */
#include <glib/gstdio.h>
#include <locale.h>
#include <stdarg.h>
#include <stdlib.h>

#include "gui-util.h"
#include "project.h"
#include "sl-application.h"
#include "sl-combine-dialog.h"
#include "sl-derive-dialog.h"
#include "sl-figure-dialog.h"
#include "sl-import-dialog.h"
#include "sl-lists-panel.h"
#include "sl-matches-panel.h"
#include "sl-window.h"

#define WAIT_S 60.0

static const char *out_dir;
static SlWindow   *window;

static G_NORETURN void
die (const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;

  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  g_printerr ("screenshot-tour: %s\n", message);
  exit (1);
}

/* ------------------------------------------------------------------ */
/* Waiting                                                            */

/* Spins the main loop until COND holds; stops the tour after WAIT_S.
 * A timer in main() wakes the loop every 20 ms. */
#define WAIT_FOR(cond, what)                                                      \
  G_STMT_START {                                                                  \
    gint64 wait_end_ = g_get_monotonic_time () + (gint64) (WAIT_S * G_USEC_PER_SEC); \
    while (!(cond))                                                               \
      {                                                                           \
        if (g_get_monotonic_time () > wait_end_)                                  \
          die ("timed out after %.0f s waiting for %s", WAIT_S, (what));          \
        g_main_context_iteration (NULL, TRUE);                                    \
      }                                                                           \
  } G_STMT_END

/* Spins for about MS milliseconds: for an animation that has no signal
 * to wait for. */
static void
settle (guint ms)
{
  gint64 end = g_get_monotonic_time () + (gint64) ms * 1000;

  while (g_get_monotonic_time () < end)
    g_main_context_iteration (NULL, TRUE);
}

/* Asks TOPLEVEL for a new frame and waits until it is painted, twice: a
 * first frame may still lay out what changed just before. */
static void
paint (GtkWidget *toplevel)
{
  for (int round = 0; round < 2; round++)
    {
      const char *failed = sl_gui_paint (toplevel, WAIT_S);

      if (failed)
        die ("%s %s within %.0f s", G_OBJECT_TYPE_NAME (toplevel), failed, WAIT_S);
    }
}

/* Until the window has no job running and has read the project again. */
static void
wait_idle (const char *what)
{
  WAIT_FOR (!sl_window_is_working (window) && !sl_window_is_loading (window), what);
}

/* ------------------------------------------------------------------ */
/* Finding widgets                                                    */

static gboolean
is_entry_row_titled (GtkWidget *widget, gconstpointer title)
{
  return ADW_IS_ENTRY_ROW (widget)
         && g_str_has_prefix (adw_preferences_row_get_title (ADW_PREFERENCES_ROW (widget)), title);
}

static gboolean
is_group_titled (GtkWidget *widget, gconstpointer title)
{
  return ADW_IS_PREFERENCES_GROUP (widget)
         && g_strcmp0 (adw_preferences_group_get_title (ADW_PREFERENCES_GROUP (widget)), title) == 0;
}

/* The widget under ROOT that gtk_widget_set_name named NAME; stops the
 * tour if there is none. */
static GtkWidget *
named (GtkWidget *root, const char *name)
{
  GtkWidget *found = sl_gui_find_named (root, name);

  if (found == NULL)
    die ("no widget named '%s' in %s", name, G_OBJECT_TYPE_NAME (root));
  return found;
}

static GtkWidget *
descendant (GtkWidget *root, GType type)
{
  GtkWidget *found = sl_gui_find_descendant (root, type);

  if (found == NULL)
    die ("no %s in %s", g_type_name (type), G_OBJECT_TYPE_NAME (root));
  return found;
}


/* Selects the item of CHOOSER whose text is TEXT, as a click would. */
static void
choose (GtkDropDown *chooser, const char *text)
{
  if (!sl_gui_choose (chooser, text))
    die ("no item '%s' in a chooser", text);
}

static void
activate (GtkWidget *widget, const char *action, GVariant *parameter)
{
  if (!gtk_widget_activate_action_variant (widget, action, parameter))
    die ("the action %s is not there", action);
}

static void
click (GtkWidget *button)
{
  if (!gtk_widget_get_sensitive (button))
    die ("the button %s cannot be clicked", gtk_widget_get_name (button));
  g_signal_emit_by_name (button, "clicked");
}

/* The side notebook (Trail, Ledger, Lists, Matches) showing PAGE. */
static void
show_side_page (GtkWidget *page)
{
  GtkNotebook *notebook = GTK_NOTEBOOK (gtk_widget_get_ancestor (page, GTK_TYPE_NOTEBOOK));

  gtk_notebook_set_current_page (notebook, gtk_notebook_page_num (notebook, page));
}

/* The notebook's page whose tab reads LABEL. */
static GtkWidget *
side_page (const char *label)
{
  GtkNotebook *notebook = GTK_NOTEBOOK (gtk_widget_get_ancestor (GTK_WIDGET (sl_window_get_lists_panel (window)),
                                                                 GTK_TYPE_NOTEBOOK));

  for (int i = 0; i < gtk_notebook_get_n_pages (notebook); i++)
    {
      GtkWidget *page = gtk_notebook_get_nth_page (notebook, i);

      if (g_strcmp0 (gtk_notebook_get_tab_label_text (notebook, page), label) == 0)
        return page;
    }
  die ("no page '%s' in the side notebook", label);
}

/* Gives the side notebook (Trail, Ledger, ...) the room of all but
 * TABLE_PX of the left column, as a user drags the divider up to read a
 * long trail; 0: the position the window had. */
static void
side_notebook_room (int table_px)
{
  static int usual = -1;
  GtkPaned *paned = GTK_PANED (gtk_widget_get_ancestor (side_page ("Trail"), GTK_TYPE_PANED));

  if (paned == NULL)
    die ("the side notebook is not in a paned");
  if (usual < 0)
    usual = gtk_paned_get_position (paned);
  gtk_paned_set_position (paned, table_px > 0 ? table_px : usual);
}

/* Dismisses every toast of the window and waits for them to go: each
 * picture shows its own step, not what the one before reported. */
static gboolean
is_toast_widget (GtkWidget *widget, gconstpointer data)
{
  return g_strcmp0 (G_OBJECT_TYPE_NAME (widget), "AdwToastWidget") == 0;
}

static void
dismiss_toasts (void)
{
  GtkWidget *shown;

  while ((shown = sl_gui_find_widget (GTK_WIDGET (window), is_toast_widget, NULL)) != NULL)
    {
      g_autoptr (AdwToast) toast = NULL;
      gint64 end = g_get_monotonic_time () + (gint64) (WAIT_S * G_USEC_PER_SEC);

      /* Dismissed while it still slides in, libadwaita 1.2 frees the
       * toast twice: let it arrive first. */
      WAIT_FOR (gtk_widget_get_mapped (shown), "a toast to be shown");
      settle (600);
      g_object_get (shown, "toast", &toast, NULL);
      if (toast == NULL)
        die ("a toast widget without its toast");
      adw_toast_dismiss (toast);
      /* The widget leaves after its animation. */
      while (sl_gui_find_widget (GTK_WIDGET (window), is_toast_widget, NULL) == shown)
        {
          if (g_get_monotonic_time () > end)
            die ("a toast did not go");
          g_main_context_iteration (NULL, TRUE);
        }
    }
}

/* ------------------------------------------------------------------ */
/* Pictures                                                           */

/* WIDGET as it was last drawn, written to OUT_DIR/NAME.  Rendered from
 * the widget itself, so the picture is the window or dialog alone,
 * without the screen around it. */
static void
shoot (GtkWidget *widget, const char *name)
{
  g_autoptr (GdkPaintable) paintable = NULL;
  g_autofree char *path = g_build_filename (out_dir, name, NULL);
  GtkSnapshot *snapshot;
  GskRenderNode *node;
  cairo_surface_t *surface;
  cairo_t *cr;
  int width, height;

  paint (GTK_WIDGET (gtk_widget_get_root (widget)));
  paintable = gtk_widget_paintable_new (widget);
  width = gdk_paintable_get_intrinsic_width (paintable);
  height = gdk_paintable_get_intrinsic_height (paintable);
  if (width <= 0 || height <= 0)
    die ("%s has no size to picture", name);
  snapshot = gtk_snapshot_new ();
  gdk_paintable_snapshot (paintable, GDK_SNAPSHOT (snapshot), width, height);
  node = gtk_snapshot_free_to_node (snapshot);
  /* Opaque: the README's page may be dark, and a window has no holes. */
  surface = cairo_image_surface_create (CAIRO_FORMAT_RGB24, width, height);
  cr = cairo_create (surface);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  if (node)
    {
      gsk_render_node_draw (node, cr);
      gsk_render_node_unref (node);
    }
  cairo_destroy (cr);
  if (cairo_surface_write_to_png (surface, path) != CAIRO_STATUS_SUCCESS)
    die ("cannot write %s", path);
  cairo_surface_destroy (surface);
  g_print ("screenshot-tour: wrote %s (%d x %d)\n", path, width, height);
}

/* ------------------------------------------------------------------ */
/* The steps                                                          */

static char *
demo_file (const char *name)
{
  const char *dir = g_getenv ("STARLEDGER_DEMO_DIR");

  if (dir == NULL || *dir == '\0')
    die ("STARLEDGER_DEMO_DIR must name data/demo");
  return g_build_filename (dir, name, NULL);
}

/* 1. The window with no project: open, create, or the demo. */
static void
step_welcome (void)
{
  gtk_window_present (GTK_WINDOW (window));
  paint (GTK_WIDGET (window));
  shoot (GTK_WIDGET (window), "welcome.png");
}

/* 2. A new project, as New Project… makes it once its file is chosen. */
static void
step_new_project (const char *path)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = NULL;
  g_autofree char *folder = g_path_get_dirname (path);

  g_mkdir_with_parents (folder, 0755);
  /* A tour run before in the same home left its project: start afresh. */
  for (const char *const *suffix = (const char *const[]) { "", "-wal", "-shm", NULL }; *suffix; suffix++)
    {
      g_autofree char *file = g_strconcat (path, *suffix, NULL);

      g_unlink (file);
    }
  project = sl_project_create (path, &error);
  if (project == NULL)
    die ("cannot create %s: %s", path, error->message);
  g_clear_pointer (&project, sl_project_close);
  if (!sl_window_open_project (window, path, &error))
    die ("cannot open %s: %s", path, error->message);
  wait_idle ("the new project to open");
}

static SlImportDialog *
open_assistant (const char *file)
{
  g_autofree char *path = demo_file (file);
  SlImportDialog *assistant = sl_import_dialog_open (window, path);

  if (assistant == NULL)
    die ("the import assistant did not open on %s", path);
  return assistant;
}

static void
set_row_text (GtkWidget *root, const char *title, const char *text)
{
  GtkWidget *row = sl_gui_find_widget (root, is_entry_row_titled, title);

  if (row == NULL)
    die ("no entry row '%s'", title);
  gtk_editable_set_text (GTK_EDITABLE (row), text);
}

static void
check_and_import (SlImportDialog *assistant, const char *picture, gboolean scroll_to_foot)
{
  activate (GTK_WIDGET (assistant), "assistant.check", NULL);
  WAIT_FOR (!sl_import_dialog_is_checking (assistant), "the check");
  g_print ("screenshot-tour: %s\n", sl_import_dialog_get_check_summary (assistant));
  if (scroll_to_foot)
    {
      GtkScrolledWindow *scroller = GTK_SCROLLED_WINDOW (descendant (GTK_WIDGET (assistant),
                                                                     GTK_TYPE_SCROLLED_WINDOW));
      GtkAdjustment *adjustment = gtk_scrolled_window_get_vadjustment (scroller);

      paint (GTK_WIDGET (assistant));
      gtk_adjustment_set_value (adjustment, gtk_adjustment_get_upper (adjustment));
    }
  if (picture)
    shoot (GTK_WIDGET (assistant), picture);
  activate (GTK_WIDGET (assistant), "assistant.import", NULL);
  WAIT_FOR (sl_gui_find_toplevel (SL_TYPE_IMPORT_DIALOG) == NULL, "the assistant to close");
  wait_idle ("the import");
  dismiss_toasts ();
}

/* 3. The programme's astrometry: named like Starledger's fields, so
 * nothing to map; Check finds the two bad rows. */
static void
step_import_astrometry (void)
{
  SlImportDialog *assistant = open_assistant ("astrometry.csv");

  set_row_text (GTK_WIDGET (assistant), "Source name", "Larkspur Hill astrometry 2026");
  check_and_import (assistant, "import-check.png", TRUE);
}

/* 4. The partner's photometry: its own column names, sexagesimal
 * positions at J2000, 99.99 for "no value". */
static void
step_import_photometry (void)
{
  static const struct {
    guint       column;
    const char *field;
    const char *unit;   /* NULL: the field's own */
  } maps[] = {
    { 0, "id", NULL }, { 1, "ra", "hms" }, { 2, "dec", "dms" }, { 3, "vmag", NULL }, { 4, "vmag_err", NULL },
    { 5, "bv", NULL }, { 6, "bv_err", NULL }, { 7, "ebv", NULL }, { 8, "ebv_err", NULL }, { 9, "sptype", NULL },
  };
  SlImportDialog *assistant = open_assistant ("photometry.csv");

  for (guint i = 0; i < G_N_ELEMENTS (maps); i++)
    {
      choose (sl_import_dialog_get_field_chooser (assistant, maps[i].column), maps[i].field);
      if (maps[i].unit)
        choose (sl_import_dialog_get_unit_chooser (assistant, maps[i].column), maps[i].unit);
    }
  set_row_text (GTK_WIDGET (assistant), "Missing-value tokens", "99.99");
  set_row_text (GTK_WIDGET (assistant), "Epoch of rows", "2000.0");
  set_row_text (GTK_WIDGET (assistant), "Source name", "Partner photometry extract");
  if (sl_import_dialog_get_problem (assistant))
    die ("the photometry's mapping: %s", sl_import_dialog_get_problem (assistant));
  {
    /* The first rows as split, under the mapping each column gets. */
    GtkScrolledWindow *scroller = GTK_SCROLLED_WINDOW (descendant (GTK_WIDGET (assistant),
                                                                   GTK_TYPE_SCROLLED_WINDOW));
    GtkWidget *rows = sl_gui_find_widget (GTK_WIDGET (assistant), is_group_titled, "First Rows");
    graphene_rect_t bounds;

    if (rows == NULL)
      die ("no First Rows in the assistant");
    paint (GTK_WIDGET (assistant));
    if (!gtk_widget_compute_bounds (rows, gtk_scrolled_window_get_child (scroller), &bounds))
      die ("the First Rows have no place");
    gtk_adjustment_set_value (gtk_scrolled_window_get_vadjustment (scroller), bounds.origin.y - 12);
  }
  check_and_import (assistant, "import-columns.png", FALSE);
}

/* 5. The survey's second epoch, with its own ids: joined to the
 * programme's stars by position within 1 arcsec; then the Matches page
 * with its first ambiguous row chosen. */
static void
step_matches (void)
{
  static const struct {
    guint       column;
    const char *field;
  } maps[] = {
    { 0, "id" }, { 1, "ra" }, { 2, "ra_err" }, { 3, "dec" }, { 4, "dec_err" },
  };
  SlImportDialog *assistant = open_assistant ("second-epoch.csv");
  SlMatchesPanel *panel = sl_matches_panel_of (window);

  for (guint i = 0; i < G_N_ELEMENTS (maps); i++)
    choose (sl_import_dialog_get_field_chooser (assistant, maps[i].column), maps[i].field);
  set_row_text (GTK_WIDGET (assistant), "Join rows to known stars by position", "1");
  set_row_text (GTK_WIDGET (assistant), "Source name", "Tarn Ridge second epoch 2016");
  if (sl_import_dialog_get_problem (assistant))
    die ("the second epoch's mapping: %s", sl_import_dialog_get_problem (assistant));
  check_and_import (assistant, NULL, FALSE);
  WAIT_FOR (!sl_matches_panel_is_loading (panel), "the Matches page");
  if (sl_matches_panel_get_n_rows (panel) == 0)
    die ("the second epoch joined no row by position");
  show_side_page (GTK_WIDGET (panel));
  side_notebook_room (300);
  sl_matches_panel_choose (panel, 0);
  shoot (GTK_WIDGET (window), "matches.png");
}

/* 5b. Combining Sources: the survey and the programme both measured the
 * proper motions of the stars they share; average them. */
static void
step_combine (void)
{
  SlCombineDialog *dialog;

  activate (GTK_WIDGET (window), "win.combine-sources", NULL);
  WAIT_FOR ((dialog = SL_COMBINE_DIALOG (sl_gui_find_toplevel (SL_TYPE_COMBINE_DIALOG))) != NULL,
            "the Combining Sources dialog");
  adw_combo_row_set_selected (ADW_COMBO_ROW (named (GTK_WIDGET (dialog), "pm")), 2);
  shoot (GTK_WIDGET (dialog), "combine.png");
  click (named (GTK_WIDGET (dialog), "save"));
  WAIT_FOR (sl_gui_find_toplevel (SL_TYPE_COMBINE_DIALOG) == NULL, "the Combining Sources dialog to close");
  wait_idle ("the reload");
  dismiss_toasts ();
}

/* 6. Derive… with the project's first run: the defaults. */
static void
step_derive (void)
{
  SlDeriveDialog *dialog;

  activate (GTK_WIDGET (window), "win.derive", NULL);
  WAIT_FOR ((dialog = SL_DERIVE_DIALOG (sl_gui_find_toplevel (SL_TYPE_DERIVE_DIALOG))) != NULL, "the Derive dialog");
  shoot (GTK_WIDGET (dialog), "derive.png");
  click (named (GTK_WIDGET (dialog), "derive"));
  WAIT_FOR (sl_gui_find_toplevel (SL_TYPE_DERIVE_DIALOG) == NULL, "the Derive dialog to close");
  wait_idle ("the derivation");
  dismiss_toasts ();
}

/* 7. A programme star's luminosity and how it was obtained. */
static void
step_trail (void)
{
  static const char *const star[] = { "LHO 0004", NULL };

  sl_window_set_selection (window, star);
  show_side_page (side_page ("Trail"));
  side_notebook_room (230);
  g_signal_emit_by_name (sl_window_get_catalogue (window), "cell-activated", "LHO 0004", "lum");
  shoot (GTK_WIDGET (window), "trail.png");
}

/* The open message dialog, if any. */
static AdwMessageDialog *
message_dialog (void)
{
  return ADW_MESSAGE_DIALOG (sl_gui_find_toplevel (ADW_TYPE_MESSAGE_DIALOG));
}

/* 8. Its temperature set by hand from a spectrum, with the reason. */
static void
step_override (void)
{
  const char *const form[] = { "5790", "5740", "5840", "spectroscopic Teff from the May 2026 spectra" };
  AdwMessageDialog *dialog;
  GtkWidget *grid;
  guint row = 0;

  g_signal_emit_by_name (sl_window_get_catalogue (window), "cell-activated", "LHO 0004", "teff");
  activate (GTK_WIDGET (window), "win.override", NULL);
  WAIT_FOR ((dialog = message_dialog ()) != NULL, "the Set by Hand dialog");
  grid = adw_message_dialog_get_extra_child (dialog);
  for (GtkWidget *child = gtk_widget_get_first_child (grid); child; child = gtk_widget_get_next_sibling (child))
    if (GTK_IS_ENTRY (child) && row < G_N_ELEMENTS (form))
      gtk_editable_set_text (GTK_EDITABLE (child), form[row++]);
  if (row != G_N_ELEMENTS (form))
    die ("the Set by Hand dialog has %u entries, not %u", row, (guint) G_N_ELEMENTS (form));
  shoot (GTK_WIDGET (dialog), "override.png");
  adw_message_dialog_response (dialog, "set");
  gtk_window_close (GTK_WINDOW (dialog));
  wait_idle ("the value set by hand and what follows from it");
  dismiss_toasts ();
}

/* 9. The Ledger: every change, newest first. */
static void
step_ledger (void)
{
  show_side_page (side_page ("Ledger"));
  side_notebook_room (330);
  shoot (GTK_WIDGET (window), "ledger.png");
}

/* 10. New List… built with the condition rows, then the Lists page with
 * the table and the views showing only the list. */
#define LIST_NAME "Sun-like within 100 pc"

static void
step_lists (void)
{
  GtkWindow *dialog = NULL;
  GtkWidget *second;

  sl_window_set_selection (window, NULL);
  activate (GTK_WIDGET (window), "win.new-list", NULL);
  WAIT_FOR ((dialog = sl_gui_find_toplevel (ADW_TYPE_WINDOW)) != NULL
            && g_strcmp0 (gtk_window_get_title (dialog), "New List") == 0, "the New List dialog");
  gtk_editable_set_text (GTK_EDITABLE (named (GTK_WIDGET (dialog), "list-name")), LIST_NAME);
  choose (GTK_DROP_DOWN (named (GTK_WIDGET (dialog), "condition-column")), "teff");
  choose (GTK_DROP_DOWN (named (GTK_WIDGET (dialog), "condition-op")), "≥");
  gtk_editable_set_text (GTK_EDITABLE (named (GTK_WIDGET (dialog), "condition-value")), "5300");
  click (named (GTK_WIDGET (dialog), "add-condition"));
  second = gtk_widget_get_last_child (gtk_widget_get_parent (gtk_widget_get_parent (
    named (GTK_WIDGET (dialog), "condition-column"))));
  choose (GTK_DROP_DOWN (named (second, "condition-column")), "teff");
  choose (GTK_DROP_DOWN (named (second, "condition-op")), "≤");
  gtk_editable_set_text (GTK_EDITABLE (named (second, "condition-value")), "6300");
  click (named (GTK_WIDGET (dialog), "add-condition"));
  second = gtk_widget_get_last_child (gtk_widget_get_parent (second));
  choose (GTK_DROP_DOWN (named (second, "condition-column")), "dist");
  choose (GTK_DROP_DOWN (named (second, "condition-op")), "<");
  gtk_editable_set_text (GTK_EDITABLE (named (second, "condition-value")), "100");
  WAIT_FOR (g_str_has_suffix (gtk_label_get_text (GTK_LABEL (named (GTK_WIDGET (dialog), "match-count"))),
                              "match now."), "the count of matching stars");
  shoot (GTK_WIDGET (dialog), "new-list.png");
  /* Create closes the dialog, which then goes away. */
  g_object_add_weak_pointer (G_OBJECT (dialog), (gpointer *) &dialog);
  click (named (GTK_WIDGET (dialog), "create-list"));
  WAIT_FOR (dialog == NULL || !gtk_widget_get_visible (GTK_WIDGET (dialog)), "the New List dialog to close");
  if (dialog)
    g_object_remove_weak_pointer (G_OBJECT (dialog), (gpointer *) &dialog);
  wait_idle ("the list");
  dismiss_toasts ();
  if (!sl_lists_panel_set_current (sl_window_get_lists_panel (window), LIST_NAME))
    die ("the new list is not on the Lists page");
  show_side_page (GTK_WIDGET (sl_window_get_lists_panel (window)));
  sl_window_show_list (window, LIST_NAME);
  wait_idle ("the list's stars in the table and the views");
  shoot (GTK_WIDGET (window), "lists.png");
}

/* 11. Export Figure… from the HR diagram, for a single journal column. */
static void
step_figure (void)
{
  SlFigureDialog *dialog = NULL;

  activate (GTK_WIDGET (window), "win.export-figure", g_variant_new_string ("hr"));
  WAIT_FOR ((dialog = SL_FIGURE_DIALOG (sl_gui_find_toplevel (SL_TYPE_FIGURE_DIALOG))) != NULL
            && sl_figure_dialog_is_ready (dialog), "the Export Figure dialog and its stars");
  shoot (GTK_WIDGET (dialog), "figure.png");
  gtk_window_close (GTK_WINDOW (dialog));
  WAIT_FOR (sl_gui_find_toplevel (SL_TYPE_FIGURE_DIALOG) == NULL, "the Export Figure dialog to close");
}

/* 12. The window README.md opens with: two stars chosen in the views. */
static void
step_window (void)
{
  static const char *const stars[] = { "LHO 0004", "LHO 0010", NULL };

  sl_window_show_list (window, NULL);
  wait_idle ("every star to be shown");
  side_notebook_room (0);
  sl_window_set_selection (window, stars);
  show_side_page (side_page ("Trail"));
  g_signal_emit_by_name (sl_window_get_catalogue (window), "cell-activated", "LHO 0004", "lum");
  shoot (GTK_WIDGET (window), "window.png");
}

int
main (int argc, char **argv)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlApplication) app = NULL;
  g_autofree char *project = NULL;

  setlocale (LC_ALL, "");
  if (argc != 2)
    {
      g_printerr ("usage: %s OUTPUT_DIR   (see build-aux/take-screenshots)\n", argv[0]);
      return 2;
    }
  out_dir = argv[1];
  if (g_mkdir_with_parents (out_dir, 0755) != 0)
    die ("cannot make %s", out_dir);
  g_setenv ("GTK_A11Y", "none", FALSE);
  /* A critical is a step that went wrong: stop there, not pictures later. */
  g_log_set_always_fatal (G_LOG_LEVEL_CRITICAL | G_LOG_FATAL_MASK);

  app = sl_application_new ();
  if (!g_application_register (G_APPLICATION (app), NULL, &error))
    die ("cannot register the application: %s", error->message);
  sl_gui_wake_loop_every (20);

  project = g_build_filename (g_get_home_dir (), "Observing", "nearby-stars.starledger", NULL);
  window = sl_window_new (GTK_APPLICATION (app));
  step_welcome ();
  step_new_project (project);
  step_import_astrometry ();
  step_import_photometry ();
  step_matches ();
  step_combine ();
  step_derive ();
  step_trail ();
  step_override ();
  step_ledger ();
  step_lists ();
  step_figure ();
  step_window ();

  gtk_window_destroy (GTK_WINDOW (window));
  while (g_main_context_iteration (NULL, FALSE))
    ;
  return 0;
}
