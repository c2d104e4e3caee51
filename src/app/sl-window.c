/* sl-window.c: a project's window.
 *
 * Contents:
 *   the project ........... sl_window_open_project, load_stars (a GTask thread)
 *   the selection ......... set_selection: one selection for the table and every view
 *   trail and ledger ...... show_trail (kept current by reload), show_ledger
 *   actions ............... open, new, open-demo
 *   long work ............. sl_window_run_work: derive, import, export (GTask threads,
 *                           progress bar, Cancel)
 *   the views ............. Export Figure… (sl-figure-dialog.c), maximise one view
 *   drag and drop ......... a project opens, a CSV file opens the import assistant
 *   settings .............. window size, pane positions, the table's columns (GSettings)
 *   target lists .......... sl_window_show_list, sl_window_lists_changed (the
 *                           Lists page and its actions: sl-lists-panel.c)
 *
 * The window computes nothing: it calls src/core and src/plot.
 */
#include "sl-window.h"

#include <inttypes.h>
#include <glib/gi18n.h>
#include <glib/gstdio.h>
#include <math.h>
#include <string.h>

#include "derivation.h"
#include "explain.h"
#include "import.h"
#include "ledger.h"
#include "sl-application.h"
#include "sl-catalogue-view.h"
#include "sl-combine-dialog.h"
#include "sl-derive-dialog.h"
#include "sl-figure-dialog.h"
#include "sl-import-dialog.h"
#include "sl-lists-panel.h"
#include "sl-matches-panel.h"
#include "sl-plot-view.h"
#include "sl-recent-projects.h"
#include "sl-view-pane.h"
#include "starset.h"
#include "units.h"

struct _SlWindow {
  AdwApplicationWindow parent_instance;

  /* Template widgets. */
  AdwToastOverlay *toasts;
  AdwWindowTitle  *window_title;
  GtkStack        *stack;
  GtkPaned        *main_paned, *left_paned, *views_paned, *lower_views_paned;
  GtkBox          *catalogue_box, *hrd_box, *sky_box, *parallax_box;
  GtkNotebook     *side_notebook;
  GtkTextView     *trail_view, *ledger_view;
  GtkLabel        *trail_title;
  GtkRevealer     *work_revealer;
  GtkLabel        *work_label;
  GtkProgressBar  *work_progress;
  GCancellable    *work_cancel;       /* the running job (derive, import, export), if any */
  GtkDropDown     *ledger_kind;
  GtkSearchEntry  *ledger_person;
  GPtrArray       *ledger_entries;    /* SlLedgerEntry, oldest first, as last read */

  SlCatalogueView *catalogue;
  SlPlotView      *views[3];          /* indexed by SlPlotKind */
  SlListsPanel    *lists;             /* the Lists page of side_notebook */
  char            *shown_list;        /* the table and views show only this list; NULL: every star */
  char            *stars_list;        /* the list self->stars holds; NULL: every star */

  char            *path;              /* the open project, or NULL */
  char            *trail_star;        /* what the Trail shows: this star's ... */
  char            *trail_quantity;    /* ... quantity; NULL: nothing yet */
  SlStarSet       *stars;             /* what the views draw */
  GStrv            selection;         /* selected designations */
  GCancellable    *work;              /* the running star load, if any */
  guint            busy;              /* star loads and derivations running */
  GSettings       *settings;

  SlViewPane      *panes[3];          /* each view under its header strip, by SlPlotKind */
  int              maximized;         /* the maximised view's SlPlotKind + 1; 0: none */
  int              saved_positions[2];  /* views_paned, lower_views_paned before maximising */
};

G_DEFINE_FINAL_TYPE (SlWindow, sl_window, ADW_TYPE_APPLICATION_WINDOW)

static void show_work (SlWindow *self, const char *what);

static void
toast (SlWindow *self, const char *message)
{
  adw_toast_overlay_add_toast (self->toasts, adw_toast_new (message));
}

/* ------------------------------------------------------------------ */
/* Trail and ledger                                                   */

static void
set_text (GtkTextView *view, const char *text)
{
  gtk_text_buffer_set_text (gtk_text_view_get_buffer (view), text, -1);
}

/* Explains the value the Trail is showing again: after a derivation or an
 * import it may come from another run. */
static void
update_trail (SlWindow *self)
{
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GString) text = g_string_new (NULL);
  g_autoptr (GError) error = NULL;

  SlQuantity q;
  gboolean settable;
  g_autofree char *title = NULL;

  if (self->path == NULL || self->trail_star == NULL)
    return;
  project = sl_project_open (self->path, &error);
  if (project == NULL
      || !sl_explain (project, self->trail_star, self->trail_quantity, SL_EXPLAIN_TEXT, text, &error))
    g_string_assign (text, error->message);
  set_text (self->trail_view, text->str);

  /* Only a derived number can be set by hand. */
  settable = sl_quantity_from_name (self->trail_quantity, &q) && !sl_quantity_info (q)->is_text;
  title = g_strdup_printf ("%s · %s", self->trail_star, self->trail_quantity);
  gtk_label_set_text (self->trail_title, title);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "win.override", settable);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "win.clear-override", settable);
}

static void
show_trail (SlWindow *self, const char *designation, const char *quantity)
{
  char *star = g_strdup (designation), *name = g_strdup (quantity);

  g_free (self->trail_star);
  g_free (self->trail_quantity);
  self->trail_star = star;
  self->trail_quantity = name;
  update_trail (self);
  gtk_notebook_set_current_page (self->side_notebook, 0);
}

/* A long summary wraps under the summary column, not under the time: each
 * entry stays one block.  (The columns before it are 44 characters wide in
 * the view's monospace font.) */
static void
hang_ledger_lines (SlWindow *self)
{
  GtkTextBuffer *buffer = gtk_text_view_get_buffer (self->ledger_view);
  GtkTextTag *tag = gtk_text_tag_table_lookup (gtk_text_buffer_get_tag_table (buffer), "hang");
  g_autoptr (PangoLayout) layout = gtk_widget_create_pango_layout (GTK_WIDGET (self->ledger_view),
                                                                   "2026-01-01T00:00:00Z  who         action    ");
  GtkTextIter start, end;
  int width;

  pango_layout_get_pixel_size (layout, &width, NULL);
  if (tag == NULL)
    tag = gtk_text_buffer_create_tag (buffer, "hang", NULL);
  /* A negative indent hangs: the first line has the full width. */
  g_object_set (tag, "indent", -width, NULL);
  gtk_text_buffer_get_bounds (buffer, &start, &end);
  gtk_text_buffer_apply_tag (buffer, tag, &start, &end);
}

/* The ledger as read, newest first, through the kind and person filters. */
static void
render_ledger (SlWindow *self)
{
  g_autoptr (GString) text = g_string_new (NULL);
  guint kind = gtk_drop_down_get_selected (self->ledger_kind);
  const char *action = kind == 0 || kind == GTK_INVALID_LIST_POSITION
                         ? NULL
                         : gtk_string_list_get_string (GTK_STRING_LIST (gtk_drop_down_get_model (self->ledger_kind)), kind);
  const char *person = gtk_editable_get_text (GTK_EDITABLE (self->ledger_person));

  if (self->ledger_entries == NULL)
    return;
  for (guint i = self->ledger_entries->len; i-- > 0;)
    {
      const SlLedgerEntry *e = self->ledger_entries->pdata[i];

      if (action && g_strcmp0 (e->action, action) != 0)
        continue;
      if (*person && strstr (e->who, person) == NULL)
        continue;
      g_string_append_printf (text, "%s  %-10s  %-8s  %s\n", e->at, e->who, e->action, e->summary);
    }
  set_text (self->ledger_view, text->str);
  hang_ledger_lines (self);
}

static void
on_ledger_filter_changed (SlWindow *self)
{
  render_ledger (self);
}

static void
show_ledger (SlWindow *self, SlProject *project)
{
  g_autoptr (GPtrArray) entries = NULL;
  g_autoptr (GError) error = NULL;

  entries = sl_ledger_read (project, &error);
  if (entries == NULL)
    {
      set_text (self->ledger_view, error->message);
      return;
    }
  g_clear_pointer (&self->ledger_entries, g_ptr_array_unref);
  self->ledger_entries = g_steal_pointer (&entries);
  render_ledger (self);
}

/* ------------------------------------------------------------------ */
/* The selection                                                      */

void
sl_window_set_selection (SlWindow *self, const char *const *designations)
{
  g_strfreev (self->selection);
  self->selection = g_strdupv ((char **) designations);
  for (guint i = 0; i < G_N_ELEMENTS (self->views); i++)
    sl_plot_view_set_selection (self->views[i], (const char *const *) self->selection);
  sl_catalogue_view_set_selection (self->catalogue, (const char *const *) self->selection);
  if (self->selection && self->selection[0])
    show_trail (self, self->selection[0], "lum");
}

static void
on_view_star_selected (SlPlotView *view, const char *designation, gboolean extend, SlWindow *self)
{
  g_autoptr (GStrvBuilder) builder = g_strv_builder_new ();
  g_auto (GStrv) selection = NULL;

  if (extend && self->selection)
    g_strv_builder_addv (builder, (const char **) self->selection);
  if (designation && !(extend && self->selection && g_strv_contains ((const char *const *) self->selection, designation)))
    g_strv_builder_add (builder, designation);
  selection = g_strv_builder_end (builder);
  sl_window_set_selection (self, (const char *const *) selection);
}

static void
on_view_region_selected (SlPlotView *view, GStrv designations, SlWindow *self)
{
  sl_window_set_selection (self, (const char *const *) designations);
}

static void
on_catalogue_selection_changed (SlCatalogueView *view, GStrv designations, SlWindow *self)
{
  g_strfreev (self->selection);
  self->selection = g_strdupv (designations);
  for (guint i = 0; i < G_N_ELEMENTS (self->views); i++)
    sl_plot_view_set_selection (self->views[i], (const char *const *) self->selection);
}

static void
on_catalogue_cell_activated (SlCatalogueView *view, const char *designation, const char *quantity,
                             SlWindow *self)
{
  show_trail (self, designation, quantity);
}

/* ------------------------------------------------------------------ */
/* The project                                                        */

static void
set_stars (SlWindow *self, SlStarSet *stars, const char *list)
{
  g_free (self->stars_list);
  self->stars_list = g_strdup (list);
  for (guint i = 0; i < G_N_ELEMENTS (self->views); i++)
    sl_plot_view_set_stars (self->views[i], stars);
  g_clear_pointer (&self->stars, sl_star_set_free);
  self->stars = stars;
  for (guint i = 0; i < G_N_ELEMENTS (self->views); i++)
    sl_plot_view_set_selection (self->views[i], (const char *const *) self->selection);
}

/* task_data: the project's path, then the list's name or nothing (see load_stars). */
static void
load_stars_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  const char *const *what = task_data;
  g_autoptr (SlProject) project = NULL;
  GError *error = NULL;
  SlStarSet *stars = NULL;

  project = sl_project_open (what[0], &error);
  if (project && what[1])
    stars = sl_star_set_load_list_full (project, what[1], cancellable, &error);
  else if (project)
    stars = sl_star_set_load_full (project, NULL, cancellable, &error);
  if (stars)
    g_task_return_pointer (task, stars, (GDestroyNotify) sl_star_set_free);
  else
    g_task_return_error (task, error);
}

static void
on_stars_loaded (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlWindow *self = SL_WINDOW (source);
  g_autoptr (GError) error = NULL;
  SlStarSet *stars = g_task_propagate_pointer (G_TASK (result), &error);

  self->busy--;
  if (stars == NULL)
    {
      if (!g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED))
        toast (self, error->message);
      return;
    }
  set_stars (self, stars, ((const char *const *) g_task_get_task_data (G_TASK (result)))[1]);
}

/* Loads the views' stars off the main thread: a million stars take seconds. */
static void
load_stars (SlWindow *self)
{
  g_autoptr (GTask) task = NULL;

  g_cancellable_cancel (self->work);
  g_clear_object (&self->work);
  self->work = g_cancellable_new ();
  self->busy++;
  task = g_task_new (self, self->work, on_stars_loaded, NULL);
  {
    char **what = g_new0 (char *, 3);

    what[0] = g_strdup (self->path);
    what[1] = g_strdup (self->shown_list);
    g_task_set_task_data (task, what, (GDestroyNotify) g_strfreev);
  }
  g_task_run_in_thread (task, load_stars_thread);
}

/* Reads everything again after the project changed. */
static void
reload (SlWindow *self)
{
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;

  project = sl_project_open (self->path, &error);
  if (project == NULL)
    {
      toast (self, error->message);
      return;
    }
  show_ledger (self, project);
  update_trail (self);
  sl_lists_panel_reload (self->lists);
  sl_matches_panel_reload (sl_matches_panel_of (self));
  sl_catalogue_view_reload (self->catalogue);
  load_stars (self);
}

gboolean
sl_window_open_project (SlWindow *self, const char *path, GError **error)
{
  g_autoptr (SlProject) project = NULL;
  g_autofree char *name = NULL;

  g_return_val_if_fail (SL_IS_WINDOW (self), FALSE);

  project = sl_project_open (path, error);
  if (project == NULL)
    return FALSE;
  /* Another project shows every star. */
  if (self->shown_list)
    sl_catalogue_view_set_list (self->catalogue, NULL);
  g_clear_pointer (&self->shown_list, g_free);
  if (!sl_catalogue_view_set_project (self->catalogue, path, error))
    return FALSE;

  g_free (self->path);
  self->path = g_strdup (path);
  name = g_path_get_basename (path);
  adw_window_title_set_title (self->window_title, name);
  {
    g_autofree char *shown = sl_path_for_display (path);

    adw_window_title_set_subtitle (self->window_title, shown);
  }
  gtk_stack_set_visible_child_name (self->stack, "project");
  g_clear_pointer (&self->trail_star, g_free);
  g_clear_pointer (&self->trail_quantity, g_free);
  set_text (self->trail_view, _("Click a value in the table to see how it was obtained."));
  show_ledger (self, project);
  sl_lists_panel_set_current (self->lists, NULL);
  sl_matches_panel_reload (sl_matches_panel_of (self));
  if (self->work_cancel == NULL)
    show_work (self, NULL);
  sl_recent_projects_add (path);
  load_stars (self);
  return TRUE;
}

/* The demo project as build-aux/dev and README make it (data/demo/README.md
 * describes the three files and their dialects). */
static gboolean
import_demo_file (SlProject *project, const char *dir, const char *file, const char *source_name,
                  const char *const *map_specs, const char *const *missing, double epoch,
                  double match_radius, GError **error)
{
  g_autofree char *path = g_build_filename (dir, file, NULL);
  g_autoptr (GArray) maps = g_array_new (FALSE, FALSE, sizeof (SlColumnMap));
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;

  g_array_set_clear_func (maps, (GDestroyNotify) sl_column_map_clear);
  for (guint i = 0; map_specs && map_specs[i]; i++)
    {
      SlColumnMap map;

      if (!sl_column_map_parse (map_specs[i], &map, error))
        return FALSE;
      g_array_append_val (maps, map);
    }
  sl_import_options_init (&options);
  options.maps = (const SlColumnMap *) maps->data;
  options.n_maps = maps->len;
  options.missing = missing;
  options.epoch = epoch;
  options.source_name = source_name;
  options.match_radius = match_radius;
  report = sl_import_csv (project, path, &options, error);
  return report != NULL;
}

gboolean
sl_window_open_demo (SlWindow *self, GError **error)
{
  static const char *const photometry_map[] = {
    "id=star", "ra=ra_sexa:hms", "dec=dec_sexa:dms", "vmag=v", "vmag_err=v_sigma", "bv=b_minus_v",
    "bv_err=b_minus_v_sigma", "ebv=reddening", "ebv_err=reddening_sigma", "sptype=spectral_type", NULL
  };
  static const char *const missing[] = { "99.99", NULL };
  static const char *const second_map[] = {
    "id=trs_id", "ra=ra_deg", "ra_err=ra_err_mas", "dec=dec_deg", "dec_err=dec_err_mas", NULL
  };
  g_autofree char *dir = g_build_filename (g_get_user_cache_dir (), "starledger", NULL);
  g_autofree char *path = g_build_filename (dir, "demo.starledger", NULL);
  g_autofree char *wal = g_strconcat (path, "-wal", NULL);
  g_autofree char *shm = g_strconcat (path, "-shm", NULL);
  g_autoptr (SlProject) project = NULL;
  SlDeriveParams params;
  SlDeriveReport report;
  const char *demo = sl_application_demo_dir ();

  g_mkdir_with_parents (dir, 0700);
  g_unlink (path);
  g_unlink (wal);
  g_unlink (shm);
  project = sl_project_create (path, error);
  sl_derive_params_init (&params);
  if (project == NULL
      || !import_demo_file (project, demo, "astrometry.csv", _("Larkspur Hill astrometry 2026"), NULL, NULL,
                            NAN, 0.0, error)
      || !import_demo_file (project, demo, "photometry.csv", _("Partner photometry extract"), photometry_map,
                            missing, 2000.0, 0.0, error)
      || !import_demo_file (project, demo, "second-epoch.csv", _("Tarn Ridge second epoch 2016"), second_map,
                            NULL, NAN, 1.0, error)
      || !sl_derivation_run (project, &params, FALSE, NULL, NULL, NULL, &report, error))
    return FALSE;
  g_clear_pointer (&project, sl_project_close);
  return sl_window_open_project (self, path, error);
}

/* ------------------------------------------------------------------ */
/* Actions                                                            */

static void
on_open_response (GtkNativeDialog *dialog, int response, SlWindow *self)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (dialog));
      g_autofree char *path = g_file_get_path (file);
      g_autoptr (GError) error = NULL;

      if (path && !sl_window_open_project (self, path, &error))
        toast (self, error->message);
    }
  g_object_unref (dialog);
}

static GtkFileFilter *
project_filter (void)
{
  GtkFileFilter *filter = gtk_file_filter_new ();

  gtk_file_filter_set_name (filter, _("Starledger projects"));
  gtk_file_filter_add_pattern (filter, "*.starledger");
  return filter;
}

static void
open_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  GtkFileChooserNative *dialog = gtk_file_chooser_native_new (_("Open a Project"), GTK_WINDOW (self),
                                                              GTK_FILE_CHOOSER_ACTION_OPEN, _("_Open"),
                                                              _("_Cancel"));
  g_autoptr (GtkFileFilter) filter = project_filter ();

  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (dialog), filter);
  g_signal_connect (dialog, "response", G_CALLBACK (on_open_response), self);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (dialog));
}

static void
on_new_response (GtkNativeDialog *dialog, int response, SlWindow *self)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (dialog));
      g_autofree char *path = g_file_get_path (file);
      g_autoptr (GError) error = NULL;
      g_autoptr (SlProject) project = path ? sl_project_create (path, &error) : NULL;

      if (project != NULL)
        {
          g_clear_pointer (&project, sl_project_close);
          sl_window_open_project (self, path, &error);
        }
      if (error)
        toast (self, error->message);
    }
  g_object_unref (dialog);
}

static void
new_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  GtkFileChooserNative *dialog = gtk_file_chooser_native_new (_("Create a Project"), GTK_WINDOW (self),
                                                              GTK_FILE_CHOOSER_ACTION_SAVE, _("_Create"),
                                                              _("_Cancel"));

  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (dialog), _("targets.starledger"));
  g_signal_connect (dialog, "response", G_CALLBACK (on_new_response), self);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (dialog));
}

/* A row of the welcome page's Recent Projects. */
static void
on_recent_project_activated (SlWindow *self, const char *path)
{
  g_autoptr (GError) error = NULL;

  if (!sl_window_open_project (self, path, &error))
    toast (self, error->message);
}

static void
open_demo_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  g_autoptr (GError) error = NULL;

  if (!sl_window_open_demo (self, &error))
    toast (self, error->message);
}

/* Long work: one job at a time, off the main thread, with the progress
 * bar and Cancel.  Derive, import and figure export all go through here. */

typedef struct {
  GAsyncReadyCallback done;
  gpointer            done_data;
} WorkClosure;

/* Progress from the worker thread, shown on the main thread. */
typedef struct {
  SlWindow *window;
  double    fraction;
} ProgressUpdate;

static gboolean
apply_progress (gpointer data)
{
  ProgressUpdate *update = data;

  if (update->window->work_cancel)
    gtk_progress_bar_set_fraction (update->window->work_progress, update->fraction);
  return G_SOURCE_REMOVE;
}

static void
progress_update_free (gpointer data)
{
  ProgressUpdate *update = data;

  g_object_unref (update->window);
  g_free (update);
}

void
sl_window_report_progress (double fraction, gpointer window)
{
  ProgressUpdate *update = g_new (ProgressUpdate, 1);

  update->window = g_object_ref (SL_WINDOW (window));
  update->fraction = fraction;
  g_idle_add_full (G_PRIORITY_DEFAULT, apply_progress, update, progress_update_free);
}

/* While a job runs, nothing else that writes the project may start. */
static const char *const work_actions[] = { "win.derive", "win.derive-now", "win.import", "win.combine-sources",
                                            NULL };

static void
show_work (SlWindow *self, const char *what)
{
  gboolean running = what != NULL;

  gtk_label_set_text (self->work_label, what);
  gtk_progress_bar_set_fraction (self->work_progress, 0.0);
  gtk_revealer_set_reveal_child (self->work_revealer, running);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "win.cancel-work", running);
  for (guint i = 0; work_actions[i]; i++)
    gtk_widget_action_set_enabled (GTK_WIDGET (self), work_actions[i], !running && self->path != NULL);
}

static void
on_work_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlWindow *self = SL_WINDOW (source);
  WorkClosure *closure = user_data;

  self->busy--;
  g_clear_object (&self->work_cancel);
  show_work (self, NULL);
  closure->done (source, result, closure->done_data);
  g_free (closure);
}

gboolean
sl_window_run_work (SlWindow *self, const char *what, GTaskThreadFunc thread, gpointer task_data,
                    GDestroyNotify task_data_free, GAsyncReadyCallback done, gpointer done_data)
{
  g_autoptr (GTask) task = NULL;
  WorkClosure *closure;

  g_return_val_if_fail (SL_IS_WINDOW (self), FALSE);
  if (self->work_cancel != NULL)
    {
      if (task_data_free)
        task_data_free (task_data);
      toast (self, _("Wait for the running job to finish, or cancel it"));
      return FALSE;
    }
  closure = g_new (WorkClosure, 1);
  closure->done = done;
  closure->done_data = done_data;
  self->busy++;
  self->work_cancel = g_cancellable_new ();
  show_work (self, what);
  task = g_task_new (self, self->work_cancel, on_work_done, closure);
  g_task_set_task_data (task, task_data, task_data_free);
  g_task_run_in_thread (task, thread);
  return TRUE;
}

gboolean
sl_window_is_working (SlWindow *self)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), FALSE);
  return self->work_cancel != NULL;
}

/* Derive: the parameters come from the Derive dialog, or (derive-now,
 * after a value was set by hand) from the project's latest run. */
typedef struct {
  char           *project;
  SlDeriveParams  params;
  gboolean        all;
} DeriveJob;

static void
derive_job_free (gpointer data)
{
  DeriveJob *job = data;

  g_free (job->project);
  g_free (job);
}

static void
derive_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  DeriveJob *job = task_data;
  g_autoptr (SlProject) project = NULL;
  SlDeriveReport *report = g_new0 (SlDeriveReport, 1);
  GError *error = NULL;

  project = sl_project_open (job->project, &error);
  if (project
      && sl_derivation_run (project, &job->params, job->all, cancellable, sl_window_report_progress, source, report,
                            &error))
    g_task_return_pointer (task, report, g_free);
  else
    {
      g_free (report);
      g_task_return_error (task, error);
    }
}

static void
on_derived (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlWindow *self = SL_WINDOW (source);
  g_autoptr (GError) error = NULL;
  g_autofree SlDeriveReport *report = g_task_propagate_pointer (G_TASK (result), &error);
  g_autofree char *message = NULL;
  g_autofree char *count = NULL;

  if (report == NULL)
    {
      toast (self, g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED)
                     ? _("Derivation cancelled: the project is as it was")
                     : error->message);
      return;
    }
  count = g_strdup_printf ("%" PRIu64, report->computed);
  message = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "Derived %s star", "Derived %s stars",
                                          report->computed), count);
  toast (self, message);
  reload (self);
}

gboolean
sl_window_derive (SlWindow *self, const SlDeriveParams *params, gboolean all)
{
  DeriveJob *job;

  g_return_val_if_fail (SL_IS_WINDOW (self), FALSE);
  g_return_val_if_fail (params != NULL, FALSE);
  if (self->path == NULL)
    return FALSE;
  job = g_new0 (DeriveJob, 1);
  job->project = g_strdup (self->path);
  job->params = *params;
  job->all = all;
  return sl_window_run_work (self, _("Deriving…"), derive_thread, job, derive_job_free, on_derived, NULL);
}

static void
derive_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);

  if (self->path == NULL)
    return;
  gtk_window_present (GTK_WINDOW (sl_derive_dialog_new (self)));
}

static void
combine_sources_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);

  if (self->path == NULL)
    return;
  gtk_window_present (GTK_WINDOW (sl_combine_dialog_new (self)));
}

static void
derive_now_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  SlDeriveParams params;

  if (self->path == NULL)
    return;
  project = sl_project_open (self->path, &error);
  if (project == NULL || !sl_derivation_latest_params (project, &params, NULL, &error))
    {
      toast (self, error->message);
      return;
    }
  sl_window_derive (self, &params, FALSE);
}

static void
cancel_work_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);

  if (self->work_cancel)
    g_cancellable_cancel (self->work_cancel);
}

static void
on_import_response (GtkNativeDialog *dialog, int response, SlWindow *self)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (dialog));
      g_autofree char *path = g_file_get_path (file);

      if (path)
        sl_import_dialog_open (self, path);
    }
  g_object_unref (dialog);
}

static void
import_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  GtkFileChooserNative *dialog = gtk_file_chooser_native_new (_("Import Measurements"), GTK_WINDOW (self),
                                                              GTK_FILE_CHOOSER_ACTION_OPEN, _("_Import"),
                                                              _("_Cancel"));
  g_autoptr (GtkFileFilter) filter = gtk_file_filter_new ();

  gtk_file_filter_set_name (filter, _("CSV files"));
  gtk_file_filter_add_pattern (filter, "*.csv");
  gtk_file_filter_add_mime_type (filter, "text/csv");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (dialog), filter);
  g_signal_connect (dialog, "response", G_CALLBACK (on_import_response), self);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (dialog));
}

/* The hand-set value dialog: value, optional 68% bounds, and the reason
 * the ledger keeps. */
typedef struct {
  SlWindow *window;
  GtkEntry *value, *lo, *hi, *reason;
} OverrideForm;

static gboolean
read_number (GtkEntry *entry, double *value, gboolean optional)
{
  const char *text = gtk_editable_get_text (GTK_EDITABLE (entry));
  const char *problem;

  *value = NAN;
  if (optional && *text == '\0')
    return TRUE;
  return sl_parse_number (text, value, &problem);
}

static void
on_override_response (AdwMessageDialog *dialog, const char *response, OverrideForm *form)
{
  SlWindow *self = form->window;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  double value, lo, hi;
  SlQuantity q;

  if (g_strcmp0 (response, "set") != 0 || !sl_quantity_from_name (self->trail_quantity, &q))
    return;
  if (!read_number (form->value, &value, FALSE) || !read_number (form->lo, &lo, TRUE)
      || !read_number (form->hi, &hi, TRUE))
    {
      toast (self, _("The value and its bounds must be numbers written with a '.'"));
      return;
    }
  project = sl_project_open (self->path, &error);
  if (project == NULL
      || !sl_override_set (project, self->trail_star, q, value, lo, hi,
                           gtk_editable_get_text (GTK_EDITABLE (form->reason)), &error))
    {
      toast (self, error->message);
      return;
    }
  /* What follows from the value is derived again at once. */
  gtk_widget_activate_action (GTK_WIDGET (self), "win.derive-now", NULL);
}

static GtkEntry *
form_row (GtkGrid *grid, int row, const char *label, const char *placeholder)
{
  GtkWidget *title = gtk_label_new (label);
  GtkWidget *entry = gtk_entry_new ();

  gtk_label_set_xalign (GTK_LABEL (title), 1.0);
  gtk_entry_set_placeholder_text (GTK_ENTRY (entry), placeholder);
  gtk_widget_set_hexpand (entry, TRUE);
  gtk_grid_attach (grid, title, 0, row, 1, 1);
  gtk_grid_attach (grid, entry, 1, row, 1, 1);
  return GTK_ENTRY (entry);
}

static void
override_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  OverrideForm *form = g_new0 (OverrideForm, 1);
  GtkGrid *grid = GTK_GRID (gtk_grid_new ());
  g_autofree char *heading = g_strdup_printf (_("Set %s of %s by Hand"), self->trail_quantity, self->trail_star);
  AdwMessageDialog *dialog = ADW_MESSAGE_DIALOG (
    adw_message_dialog_new (GTK_WINDOW (self), heading,
                            _("The value replaces the derived one, and the values that follow from it are "
                              "derived again. Who, when and why are recorded in the ledger.")));

  gtk_grid_set_row_spacing (grid, 6);
  gtk_grid_set_column_spacing (grid, 12);
  form->window = self;
  form->value = form_row (grid, 0, _("Value"), _("for example 6530"));
  form->lo = form_row (grid, 1, _("Lower bound"), /* xgettext:no-c-format */ _("68% interval, optional"));
  form->hi = form_row (grid, 2, _("Upper bound"), /* xgettext:no-c-format */ _("68% interval, optional"));
  form->reason = form_row (grid, 3, _("Reason"), _("for example: spectroscopic Teff, our 2026 run"));
  adw_message_dialog_set_extra_child (dialog, GTK_WIDGET (grid));
  adw_message_dialog_add_responses (dialog, "cancel", _("_Cancel"), "set", _("_Set"), NULL);
  adw_message_dialog_set_response_appearance (dialog, "set", ADW_RESPONSE_SUGGESTED);
  adw_message_dialog_set_default_response (dialog, "set");
  g_signal_connect_data (dialog, "response", G_CALLBACK (on_override_response), form,
                         (GClosureNotify) (void (*) (void)) g_free, 0);
  gtk_window_present (GTK_WINDOW (dialog));
}

static void
clear_override_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  SlQuantity q;

  if (!sl_quantity_from_name (self->trail_quantity, &q))
    return;
  project = sl_project_open (self->path, &error);
  if (project == NULL || !sl_override_clear (project, self->trail_star, q, NULL, &error))
    {
      toast (self, error->message);
      return;
    }
  gtk_widget_activate_action (GTK_WIDGET (self), "win.derive-now", NULL);
}

/* ------------------------------------------------------------------ */
/* Drag and drop                                                      */

static gboolean
on_drop (GtkDropTarget *target, const GValue *value, double x, double y, SlWindow *self)
{
  GFile *file = g_value_get_object (value);
  g_autofree char *path = g_file_get_path (file);
  g_autoptr (GError) error = NULL;

  if (path == NULL)
    return FALSE;
  if (g_str_has_suffix (path, ".csv") && self->path)
    return sl_import_dialog_open (self, path) != NULL;
  if (!sl_window_open_project (self, path, &error))
    toast (self, error->message);
  return error == NULL;
}

/* ------------------------------------------------------------------ */
/* The views: export a figure, maximise one                           */

static const char *
view_title (SlPlotKind kind)
{
  switch (kind)
    {
    case SL_PLOT_KIND_HRD:
      return _("HR Diagram");
    case SL_PLOT_KIND_SKY:
      return _("Sky");
    default:
      return _("Parallax");
    }
}

/* PARAMETER: the kind's name as the command line has it ("hr", "sky",
 * "parallax"); SlPlotKind and SlFigureKind list the kinds alike. */
static gboolean
kind_of (GVariant *parameter, SlPlotKind *kind)
{
  SlFigureKind figure;

  if (!sl_figure_kind_from_name (g_variant_get_string (parameter, NULL), &figure))
    return FALSE;
  *kind = (SlPlotKind) figure;
  return TRUE;
}

static void
export_figure_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  SlPlotKind kind;

  if (self->path == NULL || !kind_of (parameter, &kind))
    return;
  gtk_window_present (GTK_WINDOW (sl_figure_dialog_new (self, (SlFigureKind) kind)));
}

static void
restore_view_positions (SlWindow *self)
{
  gtk_paned_set_position (self->views_paned, self->saved_positions[0]);
  gtk_paned_set_position (self->lower_views_paned, self->saved_positions[1]);
}

static gboolean
restore_view_positions_after_layout (GtkWidget *widget, GdkFrameClock *clock, gpointer data)
{
  SlWindow *self = SL_WINDOW (widget);

  if (self->maximized == 0)
    restore_view_positions (self);
  return G_SOURCE_REMOVE;
}

/* One view fills the area right of the table; the others are hidden and
 * the panes' positions kept for when they come back. */
static void
show_views (SlWindow *self, int maximized)
{
  GtkWidget *hrd = GTK_WIDGET (self->hrd_box), *sky = GTK_WIDGET (self->sky_box);
  GtkWidget *parallax = GTK_WIDGET (self->parallax_box), *lower = GTK_WIDGET (self->lower_views_paned);

  if (self->maximized == 0 && maximized != 0)
    {
      self->saved_positions[0] = gtk_paned_get_position (self->views_paned);
      self->saved_positions[1] = gtk_paned_get_position (self->lower_views_paned);
    }
  gtk_widget_set_visible (hrd, maximized == 0 || maximized == SL_PLOT_KIND_HRD + 1);
  gtk_widget_set_visible (lower, maximized != SL_PLOT_KIND_HRD + 1);
  gtk_widget_set_visible (sky, maximized != SL_PLOT_KIND_PARALLAX + 1);
  gtk_widget_set_visible (parallax, maximized != SL_PLOT_KIND_SKY + 1);
  if (self->maximized != 0 && maximized == 0)
    {
      restore_view_positions (self);
      /* Once more after the first layout: a paned that gets its children
       * back rescales its position to an allocation that may still be
       * settling, which can move it by a pixel or two. */
      gtk_widget_add_tick_callback (GTK_WIDGET (self), restore_view_positions_after_layout, NULL, NULL);
    }
  self->maximized = maximized;
  for (guint i = 0; i < G_N_ELEMENTS (self->panes); i++)
    sl_view_pane_set_maximized (self->panes[i], maximized == (int) i + 1);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "win.restore-views", maximized != 0);
}

/* The view's button: maximise it, or, when it is maximised, show all. */
static void
maximize_view_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *self = SL_WINDOW (widget);
  SlPlotKind kind;

  if (!kind_of (parameter, &kind))
    return;
  show_views (self, self->maximized == (int) kind + 1 ? 0 : (int) kind + 1);
}

static void
restore_views_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  show_views (SL_WINDOW (widget), 0);
}

/* ------------------------------------------------------------------ */
/* Construction                                                       */

static void
add_view (SlWindow *self, SlPlotKind kind, GtkBox *box)
{
  self->views[kind] = sl_plot_view_new (kind);
  self->panes[kind] = sl_view_pane_new (self->views[kind], view_title (kind));
  gtk_box_append (box, GTK_WIDGET (self->panes[kind]));
  g_signal_connect (self->views[kind], "star-selected", G_CALLBACK (on_view_star_selected), self);
  g_signal_connect (self->views[kind], "stars-selected-in-region", G_CALLBACK (on_view_region_selected), self);
}

static void
sl_window_dispose (GObject *object)
{
  SlWindow *self = SL_WINDOW (object);

  g_cancellable_cancel (self->work);
  g_clear_object (&self->work);
  if (self->work_cancel)
    g_cancellable_cancel (self->work_cancel);
  g_clear_object (&self->work_cancel);
  for (guint i = 0; i < G_N_ELEMENTS (self->views); i++)
    if (self->views[i])
      sl_plot_view_set_stars (self->views[i], NULL);
  g_clear_pointer (&self->stars, sl_star_set_free);
  g_clear_pointer (&self->stars_list, g_free);
  g_clear_pointer (&self->selection, g_strfreev);
  g_clear_pointer (&self->path, g_free);
  g_clear_pointer (&self->trail_star, g_free);
  g_clear_pointer (&self->trail_quantity, g_free);
  g_clear_pointer (&self->shown_list, g_free);
  g_clear_object (&self->settings);
  g_clear_pointer (&self->ledger_entries, g_ptr_array_unref);
  G_OBJECT_CLASS (sl_window_parent_class)->dispose (object);
}

static void
sl_window_class_init (SlWindowClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = sl_window_dispose;

  gtk_widget_class_set_template_from_resource (widget_class, "/org/starledger/Starledger/sl-window.ui");
  gtk_widget_class_bind_template_child (widget_class, SlWindow, toasts);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, window_title);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, stack);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, main_paned);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, left_paned);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, views_paned);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, lower_views_paned);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, catalogue_box);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, hrd_box);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, sky_box);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, parallax_box);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, side_notebook);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, trail_view);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, trail_title);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, work_revealer);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, work_label);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, work_progress);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, ledger_kind);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, ledger_person);
  gtk_widget_class_bind_template_child (widget_class, SlWindow, ledger_view);
  g_type_ensure (SL_TYPE_RECENT_PROJECTS);
  gtk_widget_class_bind_template_callback (widget_class, on_recent_project_activated);

  /* Everything the window can do, in one place. */
  gtk_widget_class_install_action (widget_class, "win.open", NULL, open_action);
  gtk_widget_class_install_action (widget_class, "win.new", NULL, new_action);
  gtk_widget_class_install_action (widget_class, "win.open-demo", NULL, open_demo_action);
  gtk_widget_class_install_action (widget_class, "win.derive", NULL, derive_action);
  gtk_widget_class_install_action (widget_class, "win.derive-now", NULL, derive_now_action);
  gtk_widget_class_install_action (widget_class, "win.combine-sources", NULL, combine_sources_action);
  gtk_widget_class_install_action (widget_class, "win.import", NULL, import_action);
  gtk_widget_class_install_action (widget_class, "win.cancel-work", NULL, cancel_work_action);
  gtk_widget_class_install_action (widget_class, "win.override", NULL, override_action);
  gtk_widget_class_install_action (widget_class, "win.clear-override", NULL, clear_override_action);
  gtk_widget_class_install_action (widget_class, "win.export-figure", "s", export_figure_action);
  gtk_widget_class_install_action (widget_class, "win.maximize-view", "s", maximize_view_action);
  gtk_widget_class_install_action (widget_class, "win.restore-views", NULL, restore_views_action);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_o, GDK_CONTROL_MASK, "win.open", NULL);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_n, GDK_CONTROL_MASK, "win.new", NULL);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_d, GDK_CONTROL_MASK, "win.derive", NULL);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_i, GDK_CONTROL_MASK, "win.import", NULL);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "win.restore-views", NULL);
  sl_lists_panel_install_actions (widget_class);
  sl_matches_panel_install_actions (widget_class);
}

static void
bind_settings (SlWindow *self)
{
  GSettingsSchemaSource *source = g_settings_schema_source_get_default ();
  g_autoptr (GSettingsSchema) schema = source ? g_settings_schema_source_lookup (source, SL_APPLICATION_ID, TRUE) : NULL;

  /* Run from the build tree without the compiled schema: no memory. */
  if (schema == NULL)
    return;
  self->settings = g_settings_new (SL_APPLICATION_ID);
  g_settings_bind (self->settings, "window-width", self, "default-width", G_SETTINGS_BIND_DEFAULT);
  g_settings_bind (self->settings, "window-height", self, "default-height", G_SETTINGS_BIND_DEFAULT);
  g_settings_bind (self->settings, "window-maximized", self, "maximized", G_SETTINGS_BIND_DEFAULT);
  g_settings_bind (self->settings, "table-width", self->main_paned, "position", G_SETTINGS_BIND_DEFAULT);
  g_settings_bind (self->settings, "table-height", self->left_paned, "position", G_SETTINGS_BIND_DEFAULT);
  g_settings_bind (self->settings, "diagram-height", self->views_paned, "position", G_SETTINGS_BIND_DEFAULT);
  g_settings_bind (self->settings, "sky-width", self->lower_views_paned, "position", G_SETTINGS_BIND_DEFAULT);
  g_settings_bind (self->settings, "catalogue-columns", self->catalogue, "columns", G_SETTINGS_BIND_DEFAULT);
}

static void
sl_window_init (SlWindow *self)
{
  GtkDropTarget *drop;

  gtk_widget_init_template (GTK_WIDGET (self));
  g_signal_connect_swapped (self->ledger_kind, "notify::selected", G_CALLBACK (on_ledger_filter_changed), self);
  g_signal_connect_swapped (self->ledger_person, "search-changed", G_CALLBACK (on_ledger_filter_changed), self);

  self->catalogue = sl_catalogue_view_new ();
  gtk_widget_set_vexpand (GTK_WIDGET (self->catalogue), TRUE);
  gtk_box_append (self->catalogue_box, GTK_WIDGET (self->catalogue));
  g_signal_connect (self->catalogue, "selection-changed", G_CALLBACK (on_catalogue_selection_changed), self);
  g_signal_connect (self->catalogue, "cell-activated", G_CALLBACK (on_catalogue_cell_activated), self);
  add_view (self, SL_PLOT_KIND_HRD, self->hrd_box);
  add_view (self, SL_PLOT_KIND_SKY, self->sky_box);
  add_view (self, SL_PLOT_KIND_PARALLAX, self->parallax_box);
  self->lists = sl_lists_panel_new (self);
  gtk_notebook_append_page (self->side_notebook, GTK_WIDGET (self->lists), gtk_label_new (_("Lists")));
  gtk_notebook_append_page (self->side_notebook, GTK_WIDGET (sl_matches_panel_new (self)), gtk_label_new (_("Matches")));

  drop = gtk_drop_target_new (G_TYPE_FILE, GDK_ACTION_COPY);
  g_signal_connect (drop, "drop", G_CALLBACK (on_drop), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (drop));

  gtk_window_set_default_size (GTK_WINDOW (self), 1280, 820);
  bind_settings (self);
  show_work (self, NULL);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "win.override", FALSE);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "win.clear-override", FALSE);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "win.restore-views", FALSE);
}

SlWindow *
sl_window_new (GtkApplication *application)
{
  return g_object_new (SL_TYPE_WINDOW, "application", application, NULL);
}

/* ------------------------------------------------------------------ */
/* For tests                                                          */

SlCatalogueView *
sl_window_get_catalogue (SlWindow *self)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), NULL);
  return self->catalogue;
}

SlPlotView *
sl_window_get_view (SlWindow *self, SlPlotKind kind)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), NULL);
  g_return_val_if_fail (kind < G_N_ELEMENTS (self->views), NULL);
  return self->views[kind];
}

gboolean
sl_window_is_loading (SlWindow *self)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), FALSE);
  return self->busy > 0;
}

const char *const *
sl_window_get_selection (SlWindow *self)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), NULL);
  return (const char *const *) self->selection;
}

/* ------------------------------------------------------------------ */
/* For the window's dialogs and panels                                */

SlStarSet *
sl_window_ref_stars (SlWindow *self, const char **list)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), NULL);
  if (list)
    *list = self->stars_list;
  return self->stars ? sl_star_set_ref (self->stars) : NULL;
}

const char *
sl_window_get_project_path (SlWindow *self)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), NULL);
  return self->path;
}

void
sl_window_toast (SlWindow *self, const char *message)
{
  g_return_if_fail (SL_IS_WINDOW (self));
  toast (self, message);
}

void
sl_window_add_toast (SlWindow *self, AdwToast *toast)
{
  g_return_if_fail (SL_IS_WINDOW (self));
  adw_toast_overlay_add_toast (self->toasts, toast);
}

void
sl_window_reload (SlWindow *self)
{
  g_return_if_fail (SL_IS_WINDOW (self));
  if (self->path)
    reload (self);
}

/* ------------------------------------------------------------------ */
/* Target lists (the Lists panel, sl-lists-panel.c)                   */

SlListsPanel *
sl_window_get_lists_panel (SlWindow *self)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), NULL);
  return self->lists;
}

const char *
sl_window_get_shown_list (SlWindow *self)
{
  g_return_val_if_fail (SL_IS_WINDOW (self), NULL);
  return self->shown_list;
}

void
sl_window_show_list (SlWindow *self, const char *name)
{
  char *copy = g_strdup (name);

  g_return_if_fail (SL_IS_WINDOW (self));

  g_free (self->shown_list);
  self->shown_list = copy;
  if (self->path == NULL)
    return;
  /* Whichever tab is in front, the title says that not every star is shown. */
  {
    g_autofree char *shown = sl_path_for_display (self->path);
    g_autofree char *subtitle = name ? g_strdup_printf (_("only list “%s” · %s"), name, shown) : NULL;

    adw_window_title_set_subtitle (self->window_title, subtitle ? subtitle : shown);
  }
  sl_catalogue_view_set_list (self->catalogue, name);
  load_stars (self);
  sl_lists_panel_reload (self->lists);
}

void
sl_window_lists_changed (SlWindow *self, const char *name)
{
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;

  g_return_if_fail (SL_IS_WINDOW (self));

  if (self->path == NULL)
    return;
  project = sl_project_open (self->path, &error);
  if (project == NULL)
    {
      toast (self, error->message);
      return;
    }
  show_ledger (self, project);
  sl_lists_panel_reload (self->lists);
  /* The table and the views read again only if they show that list. */
  if (self->shown_list && g_strcmp0 (self->shown_list, name) == 0)
    {
      sl_catalogue_view_reload (self->catalogue);
      load_stars (self);
    }
}
