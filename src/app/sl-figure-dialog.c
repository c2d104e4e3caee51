/* sl-figure-dialog.c: the Export Figure dialog.
 *
 * Contents:
 *   rows ................. spin, switch and choice rows of the options
 *   the request .......... read_options: the widgets into an SlFigureJob
 *   the preview's stars .. load_stars (a GTask thread, again when the list changes)
 *   the preview .......... draw_preview: sl_figure_job_draw scaled to fit
 *   export ............... the file chooser, then sl_window_run_work
 *   construction
 *
 * Everything the figure shows comes from src/plot/figure-job.c, the code
 * starledger-cli figure runs: the preview draws the job, the export writes
 * it, and the command line shown is the job spelled out.
 */
#include "sl-figure-dialog.h"

#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "lists.h"
#include "sl-recent-projects.h"

#define MM_PER_INCH 25.4
#define PT_PER_INCH 72.0
#define PREVIEW_MARGIN_PX 16.0

enum { SIZE_SINGLE, SIZE_DOUBLE, SIZE_CUSTOM };

struct _SlFigureDialog {
  AdwWindow       parent_instance;

  SlWindow       *window;            /* the parent (the dialog is destroyed with it) */
  char           *project;           /* its project's path */
  SlFigureJob     job;               /* what the options say now */
  SlFigureFormat  format;
  gboolean        syncing;           /* setting widgets from code: no feedback */

  /* The page. */
  AdwComboRow    *size;
  GtkSpinButton  *width, *height, *font;
  /* The file. */
  AdwComboRow    *format_row;
  GtkWidget      *dpi_row;
  GtkSpinButton  *dpi;
  GtkSwitch      *grayscale;
  /* The kind's own (those of other kinds stay NULL). */
  AdwComboRow    *plane, *coordinates;
  GtkSwitch      *errors, *proper_motion, *common_scale;
  GtkSpinButton  *ellipses, *start, *years;
  /* The stars. */
  AdwComboRow    *list;              /* NULL: the project has no lists */
  GStrv           list_names;

  GtkWidget      *preview;
  GtkLabel       *status;            /* loading, an error, or what the figure leaves out */
  GtkLabel       *command;
  GtkWidget      *export_button;

  SlStarSet      *stars;             /* the preview's, for the current list */
  char           *load_error;
  GCancellable   *loading;           /* the running load, if any */
  char           *notes;             /* of the last preview drawn, joined */
  guint           notes_idle;
  char           *output_name;       /* the file name last chosen (for the command line) */
};

G_DEFINE_FINAL_TYPE (SlFigureDialog, sl_figure_dialog, ADW_TYPE_WINDOW)

static void options_changed (SlFigureDialog *self);
static void load_stars (SlFigureDialog *self);

static const char *const format_extensions[] = { "pdf", "svg", "png" };

static void
copy_job (SlFigureJob *to, const SlFigureJob *from)
{
  *to = *from;
  to->stars = g_strdupv (from->stars);
  to->list = g_strdup (from->list);
}

/* ------------------------------------------------------------------ */
/* Rows                                                               */

static AdwPreferencesGroup *
add_group (AdwPreferencesPage *page, const char *title)
{
  GtkWidget *group = adw_preferences_group_new ();

  adw_preferences_group_set_title (ADW_PREFERENCES_GROUP (group), title);
  adw_preferences_page_add (page, ADW_PREFERENCES_GROUP (group));
  return ADW_PREFERENCES_GROUP (group);
}

static GtkWidget *
action_row (AdwPreferencesGroup *group, const char *title, const char *subtitle)
{
  GtkWidget *row = adw_action_row_new ();

  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), title);
  if (subtitle)
    adw_action_row_set_subtitle (ADW_ACTION_ROW (row), subtitle);
  adw_preferences_group_add (group, row);
  return row;
}

/* Numbers as the rest of Starledger writes and reads them, with a '.'
 * whatever the locale (README, Languages), so that the size shown is the
 * one the equivalent command line shows; a ',' typed out of habit is read
 * as the decimal point too. */
static gboolean
on_spin_output (GtkSpinButton *spin, gpointer data)
{
  char format[16], text[G_ASCII_DTOSTR_BUF_SIZE];
  GtkEditable *editable;

  g_snprintf (format, sizeof format, "%%.%uf", gtk_spin_button_get_digits (spin));
  g_ascii_formatd (text, sizeof text, format, gtk_adjustment_get_value (gtk_spin_button_get_adjustment (spin)));
  /* On the text itself: through the spin button, a '.' that is not the
   * locale's decimal point empties the text (GTK 4.8). */
  editable = gtk_editable_get_delegate (GTK_EDITABLE (spin));
  if (g_strcmp0 (gtk_editable_get_text (editable), text) != 0)
    gtk_editable_set_text (editable, text);
  return TRUE;
}

static int
on_spin_input (GtkSpinButton *spin, double *value, gpointer data)
{
  g_autofree char *text = g_strstrip (g_strdup (gtk_editable_get_text (GTK_EDITABLE (spin))));
  char *end;

  g_strdelimit (text, ",", '.');
  *value = g_ascii_strtod (text, &end);
  return *text != '\0' && *end == '\0' && isfinite (*value) ? TRUE : GTK_INPUT_ERROR;
}

/* The widgets carry NAME (gtk_widget_set_name), for tests to find them. */
static GtkSpinButton *
spin_row (SlFigureDialog *self, AdwPreferencesGroup *group, const char *title, const char *subtitle,
          const char *name, double min, double max, double step, guint digits, double value, GtkWidget **row_out)
{
  GtkWidget *row = action_row (group, title, subtitle);
  GtkWidget *spin = gtk_spin_button_new_with_range (min, max, step);

  g_signal_connect (spin, "output", G_CALLBACK (on_spin_output), NULL);
  g_signal_connect (spin, "input", G_CALLBACK (on_spin_input), NULL);
  gtk_spin_button_set_digits (GTK_SPIN_BUTTON (spin), digits);
  gtk_spin_button_set_value (GTK_SPIN_BUTTON (spin), value);
  gtk_widget_set_valign (spin, GTK_ALIGN_CENTER);
  gtk_widget_set_name (spin, name);
  gtk_accessible_update_property (GTK_ACCESSIBLE (spin), GTK_ACCESSIBLE_PROPERTY_LABEL, title, -1);
  adw_action_row_add_suffix (ADW_ACTION_ROW (row), spin);
  g_signal_connect_swapped (spin, "value-changed", G_CALLBACK (options_changed), self);
  if (row_out)
    *row_out = row;
  return GTK_SPIN_BUTTON (spin);
}

static GtkSwitch *
switch_row (SlFigureDialog *self, AdwPreferencesGroup *group, const char *title, const char *subtitle,
            const char *name, gboolean active)
{
  GtkWidget *row = action_row (group, title, subtitle);
  GtkWidget *toggle = gtk_switch_new ();

  gtk_switch_set_active (GTK_SWITCH (toggle), active);
  gtk_widget_set_valign (toggle, GTK_ALIGN_CENTER);
  gtk_widget_set_name (toggle, name);
  gtk_accessible_update_property (GTK_ACCESSIBLE (toggle), GTK_ACCESSIBLE_PROPERTY_LABEL, title, -1);
  adw_action_row_add_suffix (ADW_ACTION_ROW (row), toggle);
  adw_action_row_set_activatable_widget (ADW_ACTION_ROW (row), toggle);
  g_signal_connect_swapped (toggle, "notify::active", G_CALLBACK (options_changed), self);
  return GTK_SWITCH (toggle);
}

static AdwComboRow *
choice_row (SlFigureDialog *self, AdwPreferencesGroup *group, const char *title, const char *name,
            const char *const *items, guint selected)
{
  GtkWidget *row = adw_combo_row_new ();
  g_autoptr (GtkStringList) model = gtk_string_list_new (items);

  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), title);
  adw_combo_row_set_model (ADW_COMBO_ROW (row), G_LIST_MODEL (model));
  adw_combo_row_set_selected (ADW_COMBO_ROW (row), selected);
  gtk_widget_set_name (row, name);
  adw_preferences_group_add (group, row);
  g_signal_connect_swapped (row, "notify::selected", G_CALLBACK (options_changed), self);
  return ADW_COMBO_ROW (row);
}

/* ------------------------------------------------------------------ */
/* The request                                                        */

static double
spin_value (GtkSpinButton *spin, double fallback)
{
  return spin ? gtk_spin_button_get_value (spin) : fallback;
}

static gboolean
switch_active (GtkSwitch *toggle, gboolean fallback)
{
  return toggle ? gtk_switch_get_active (toggle) : fallback;
}

/* The size preset and the millimetres follow each other: a preset sets
 * them, other numbers make it Custom. */
static void
sync_size (SlFigureDialog *self, gboolean preset_changed)
{
  SlFigureStyle single, dbl;
  guint preset = adw_combo_row_get_selected (self->size);
  double w = gtk_spin_button_get_value (self->width), h = gtk_spin_button_get_value (self->height);

  sl_figure_style_init (&single);
  sl_figure_style_init (&dbl);
  sl_figure_style_preset (&dbl, "double");
  self->syncing = TRUE;
  if (preset_changed && preset != SIZE_CUSTOM)
    {
      const SlFigureStyle *s = preset == SIZE_SINGLE ? &single : &dbl;

      gtk_spin_button_set_value (self->width, s->width_mm);
      gtk_spin_button_set_value (self->height, s->height_mm);
    }
  else if (!preset_changed)
    adw_combo_row_set_selected (self->size, w == single.width_mm && h == single.height_mm ? SIZE_SINGLE
                                            : w == dbl.width_mm && h == dbl.height_mm   ? SIZE_DOUBLE
                                                                                          : SIZE_CUSTOM);
  self->syncing = FALSE;
}

static void
read_options (SlFigureDialog *self)
{
  SlFigureJob *job = &self->job;
  guint list = self->list ? adw_combo_row_get_selected (self->list) : 0;

  job->style.width_mm = gtk_spin_button_get_value (self->width);
  job->style.height_mm = gtk_spin_button_get_value (self->height);
  job->style.font_pt = gtk_spin_button_get_value (self->font);
  job->style.dpi = gtk_spin_button_get_value (self->dpi);
  job->style.grayscale = gtk_switch_get_active (self->grayscale);
  self->format = adw_combo_row_get_selected (self->format_row);

  if (self->plane)
    job->hrd.plane = adw_combo_row_get_selected (self->plane) == 1 ? SL_HRD_OBSERVATIONAL : SL_HRD_THEORETICAL;
  job->hrd.errors = switch_active (self->errors, job->hrd.errors);
  if (self->coordinates)
    job->sky.coordinates = adw_combo_row_get_selected (self->coordinates) == 1 ? SL_SKY_GALACTIC : SL_SKY_EQUATORIAL;
  job->sky.ellipse_scale = spin_value (self->ellipses, job->sky.ellipse_scale);
  job->parallax.start_jyear = spin_value (self->start, job->parallax.start_jyear);
  job->parallax.years = spin_value (self->years, job->parallax.years);
  job->parallax.proper_motion = switch_active (self->proper_motion, job->parallax.proper_motion);
  job->parallax.common_scale = switch_active (self->common_scale, job->parallax.common_scale);

  /* Row 0 is every star; row i the list i - 1. */
  if (g_strcmp0 (job->list, list > 0 ? self->list_names[list - 1] : NULL) != 0)
    {
      sl_figure_job_set_list (job, list > 0 ? self->list_names[list - 1] : NULL);
      load_stars (self);
    }
}

static char *
default_output (SlFigureDialog *self)
{
  return g_strdup_printf ("%s.%s", sl_figure_kind_name (self->job.kind), format_extensions[self->format]);
}

static void
update_command_line (SlFigureDialog *self)
{
  g_autofree char *fallback = default_output (self);
  g_autofree char *shown = NULL;
  g_autofree char *line = NULL;
  SlFigureFormat named;

  /* The file name last chosen, while it still fits the format. */
  if (self->output_name && (!sl_figure_format_from_path (self->output_name, &named) || named != self->format))
    g_clear_pointer (&self->output_name, g_free);
  /* The project as the window's title shows it (~/... in the home folder),
   * which a shell reads back as the same file. */
  shown = sl_path_for_display (self->project);
  line = sl_figure_job_command_line (&self->job, shown, self->output_name ? self->output_name : fallback);
  gtk_label_set_text (self->command, line);
}

static void
update_status (SlFigureDialog *self)
{
  if (self->load_error)
    gtk_label_set_text (self->status, self->load_error);
  else if (self->stars == NULL)
    gtk_label_set_text (self->status, _("Loading the stars…"));
  else
    gtk_label_set_text (self->status, self->notes ? self->notes : "");
  gtk_widget_set_sensitive (self->export_button, self->stars != NULL && self->load_error == NULL);
}

static void
options_changed (SlFigureDialog *self)
{
  if (self->syncing)
    return;
  if (self->size)
    sync_size (self, FALSE);
  read_options (self);
  gtk_widget_set_sensitive (self->dpi_row, self->format == SL_FIGURE_FORMAT_PNG);
  update_command_line (self);
  gtk_widget_queue_draw (self->preview);
}

static void
on_size_changed (SlFigureDialog *self)
{
  if (self->syncing)
    return;
  sync_size (self, TRUE);
  options_changed (self);
}

/* ------------------------------------------------------------------ */
/* The preview's stars                                                */

typedef struct {
  char        *project;
  SlFigureJob  job;
} LoadData;

static void
load_data_free (gpointer data)
{
  LoadData *d = data;

  g_free (d->project);
  sl_figure_job_clear (&d->job);
  g_free (d);
}

static void
load_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  LoadData *d = task_data;
  g_autoptr (SlProject) project = NULL;
  SlStarSet *stars = NULL;
  GError *error = NULL;

  project = sl_project_open (d->project, &error);
  if (project)
    stars = sl_figure_job_load (&d->job, project, cancellable, &error);
  if (stars)
    g_task_return_pointer (task, stars, (GDestroyNotify) sl_star_set_free);
  else
    g_task_return_error (task, error);
}

static void
on_stars_loaded (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlFigureDialog *self = SL_FIGURE_DIALOG (source);
  g_autoptr (GError) error = NULL;
  SlStarSet *stars = g_task_propagate_pointer (G_TASK (result), &error);

  /* A newer load replaced this one (or the dialog closed). */
  if (g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED))
    return;
  g_clear_object (&self->loading);
  g_clear_pointer (&self->stars, sl_star_set_free);
  g_clear_pointer (&self->load_error, g_free);
  self->stars = stars;
  if (error)
    self->load_error = g_strdup (error->message);
  update_status (self);
  gtk_widget_queue_draw (self->preview);
}

/* TRUE when the window's stars are the preview's (or the stars named are
 * not among them: then the reason is the preview's). */
static gboolean
share_window_stars (SlFigureDialog *self)
{
  const char *list = NULL;
  g_autoptr (SlStarSet) shown = sl_window_ref_stars (self->window, &list);
  g_autoptr (GError) error = NULL;

  self->stars = sl_figure_job_reuse (&self->job, shown, list, self->project, &error);
  if (error)
    self->load_error = g_strdup (error->message);
  return self->stars != NULL || error != NULL;
}

/* The stars depend only on the list (and the selection, fixed while the
 * dialog is open): loaded again when the list changes. */
static void
load_stars (SlFigureDialog *self)
{
  g_autoptr (GTask) task = NULL;
  LoadData *d = g_new0 (LoadData, 1);

  g_cancellable_cancel (self->loading);
  g_clear_object (&self->loading);
  g_clear_pointer (&self->stars, sl_star_set_free);
  g_clear_pointer (&self->load_error, g_free);
  /* The window's views hold these stars already (at a million stars,
   * hundreds of megabytes): the preview shares them.  The exported file
   * is drawn from the project as it is then (export_thread). */
  if (self->window && share_window_stars (self))
    {
      update_status (self);
      gtk_widget_queue_draw (self->preview);
      return;
    }
  self->loading = g_cancellable_new ();
  d->project = g_strdup (self->project);
  copy_job (&d->job, &self->job);
  task = g_task_new (self, self->loading, on_stars_loaded, NULL);
  g_task_set_task_data (task, d, load_data_free);
  g_task_run_in_thread (task, load_thread);
  update_status (self);
  gtk_widget_queue_draw (self->preview);
}

/* ------------------------------------------------------------------ */
/* The preview                                                        */

static gboolean
show_notes (gpointer data)
{
  SlFigureDialog *self = data;

  self->notes_idle = 0;
  update_status (self);
  return G_SOURCE_REMOVE;
}

/* The page as the file will have it, scaled to fit, on a shadow with an
 * outline so its edges show. */
static void
draw_preview (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer data)
{
  SlFigureDialog *self = data;
  double page_w = self->job.style.width_mm / MM_PER_INCH * PT_PER_INCH;
  double page_h = self->job.style.height_mm / MM_PER_INCH * PT_PER_INCH;
  double scale = MIN ((width - 2 * PREVIEW_MARGIN_PX) / page_w, (height - 2 * PREVIEW_MARGIN_PX) / page_h);
  double x0, y0;
  g_autoptr (GPtrArray) notes = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *joined = NULL;

  if (scale <= 0)
    return;
  x0 = floor ((width - page_w * scale) / 2.0);
  y0 = floor ((height - page_h * scale) / 2.0);
  cairo_rectangle (cr, x0 + 2, y0 + 3, page_w * scale, page_h * scale);
  cairo_set_source_rgba (cr, 0, 0, 0, 0.18);
  cairo_fill (cr);
  cairo_rectangle (cr, x0, y0, page_w * scale, page_h * scale);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_fill (cr);

  if (self->stars && self->load_error == NULL)
    {
      cairo_save (cr);
      cairo_translate (cr, x0, y0);
      cairo_scale (cr, scale, scale);
      sl_figure_job_draw (&self->job, self->stars, cr, notes, NULL);
      cairo_restore (cr);
    }

  cairo_rectangle (cr, x0 - 0.5, y0 - 0.5, page_w * scale + 1, page_h * scale + 1);
  cairo_set_source_rgba (cr, 0, 0, 0, 0.35);
  cairo_set_line_width (cr, 1.0);
  cairo_stroke (cr);

  /* What the figure leaves out, under the preview; not set while drawing. */
  if (notes->len > 0)
    {
      g_ptr_array_add (notes, NULL);
      joined = g_strjoinv ("\n", (char **) notes->pdata);
      g_ptr_array_remove_index (notes, notes->len - 1);
    }
  if (self->stars && g_strcmp0 (joined, self->notes) != 0)
    {
      g_free (self->notes);
      self->notes = g_steal_pointer (&joined);
      if (self->notes_idle == 0)
        self->notes_idle = g_idle_add (show_notes, self);
    }
}

/* ------------------------------------------------------------------ */
/* Export                                                             */

typedef struct {
  char          *project;
  char          *path;
  SlFigureFormat format;
  SlFigureJob    job;
} ExportData;

static void
export_data_free (gpointer data)
{
  ExportData *d = data;

  g_free (d->project);
  g_free (d->path);
  sl_figure_job_clear (&d->job);
  g_free (d);
}

/* Loading the stars is most of the work at a million stars, and it
 * answers Cancel; the file appears only once complete. */
static void
export_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  ExportData *d = task_data;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (SlStarSet) stars = NULL;
  GPtrArray *notes = g_ptr_array_new_with_free_func (g_free);
  GError *error = NULL;

  /* A Cancel that comes after the file is written must not report that no
   * file was: this thread says itself whether it was cancelled. */
  g_task_set_check_cancellable (task, FALSE);
  sl_window_report_progress (0.05, source);
  project = sl_project_open (d->project, &error);
  if (project)
    stars = sl_figure_job_load (&d->job, project, cancellable, &error);
  if (stars)
    sl_window_report_progress (0.6, source);
  if (stars && !g_cancellable_set_error_if_cancelled (cancellable, &error)
      && sl_figure_job_write (&d->job, stars, d->project, d->path, d->format, notes, &error))
    {
      sl_window_report_progress (1.0, source);
      g_task_return_pointer (task, notes, (GDestroyNotify) g_ptr_array_unref);
      return;
    }
  g_ptr_array_unref (notes);
  g_task_return_error (task, error);
}

static void
on_exported (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlWindow *window = SL_WINDOW (source);
  g_autofree char *path = user_data;
  g_autofree char *name = g_path_get_basename (path);
  g_autoptr (GError) error = NULL;
  g_autoptr (GPtrArray) notes = g_task_propagate_pointer (G_TASK (result), &error);
  g_autofree char *message = NULL;

  if (notes == NULL)
    {
      sl_window_toast (window, g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED)
                                 ? _("Export cancelled: no file was written")
                                 : error->message);
      return;
    }
  message = g_strdup_printf (_("Figure written to %s"), name);
  sl_window_toast (window, message);
  for (guint i = 0; i < notes->len; i++)
    sl_window_toast (window, notes->pdata[i]);
}

gboolean
sl_figure_dialog_export_to (SlFigureDialog *self, const char *path)
{
  ExportData *d;
  g_autofree char *name = NULL;
  g_autofree char *what = NULL;
  char *done_path;

  g_return_val_if_fail (SL_IS_FIGURE_DIALOG (self), FALSE);
  g_return_val_if_fail (path != NULL, FALSE);

  if (self->load_error)
    return FALSE;
  d = g_new0 (ExportData, 1);
  d->project = g_strdup (self->project);
  d->path = g_strdup (path);
  d->format = self->format;
  copy_job (&d->job, &self->job);
  name = g_path_get_basename (path);
  what = g_strdup_printf (_("Exporting %s…"), name);
  done_path = g_strdup (path);
  if (!sl_window_run_work (self->window, what, export_thread, d, export_data_free, on_exported, done_path))
    {
      g_free (done_path);
      return FALSE;
    }
  /* The window shows the progress and Cancel: the dialog, modal, would
   * keep them out of reach. */
  gtk_window_close (GTK_WINDOW (self));
  return TRUE;
}

static void
on_file_chosen (GtkNativeDialog *chooser, int response, SlFigureDialog *self)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = g_file_get_path (file);
      SlFigureFormat named;

      /* The extension follows the format chosen in the dialog. */
      if (path && (!sl_figure_format_from_path (path, &named) || named != self->format))
        {
          char *with = g_strconcat (path, ".", format_extensions[self->format], NULL);

          g_free (path);
          path = with;
        }
      if (path)
        {
          g_free (self->output_name);
          self->output_name = g_path_get_basename (path);
          update_command_line (self);
          sl_figure_dialog_export_to (self, path);
        }
    }
  g_object_unref (chooser);
}

static void
on_export_clicked (SlFigureDialog *self)
{
  GtkFileChooserNative *chooser = gtk_file_chooser_native_new (_("Export Figure"), GTK_WINDOW (self),
                                                               GTK_FILE_CHOOSER_ACTION_SAVE, _("_Export"),
                                                               _("_Cancel"));
  g_autofree char *name = self->output_name ? g_strdup (self->output_name) : default_output (self);

  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (chooser), name);
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (on_file_chosen), self);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

/* ------------------------------------------------------------------ */
/* Accessors                                                          */

const SlFigureJob *
sl_figure_dialog_get_job (SlFigureDialog *self)
{
  g_return_val_if_fail (SL_IS_FIGURE_DIALOG (self), NULL);
  return &self->job;
}

SlFigureFormat
sl_figure_dialog_get_format (SlFigureDialog *self)
{
  g_return_val_if_fail (SL_IS_FIGURE_DIALOG (self), SL_FIGURE_FORMAT_PDF);
  return self->format;
}

const SlStarSet *
sl_figure_dialog_get_stars (SlFigureDialog *self)
{
  g_return_val_if_fail (SL_IS_FIGURE_DIALOG (self), NULL);
  return self->stars;
}

gboolean
sl_figure_dialog_is_ready (SlFigureDialog *self)
{
  g_return_val_if_fail (SL_IS_FIGURE_DIALOG (self), FALSE);
  return self->loading == NULL;
}

const char *
sl_figure_dialog_get_command_line (SlFigureDialog *self)
{
  g_return_val_if_fail (SL_IS_FIGURE_DIALOG (self), NULL);
  return gtk_label_get_text (self->command);
}

/* ------------------------------------------------------------------ */
/* Construction                                                       */

static void
add_kind_options (SlFigureDialog *self, AdwPreferencesPage *page)
{
  AdwPreferencesGroup *group;

  switch (self->job.kind)
    {
    case SL_FIGURE_KIND_HR:
      {
        const char *const planes[] = { _("Theoretical"), _("Observational"), NULL };

        group = add_group (page, _("Diagram"));
        self->plane = choice_row (self, group, _("Plane"), "plane", planes, 0);
        adw_action_row_set_subtitle (ADW_ACTION_ROW (self->plane), _("log Teff and log L, or (B−V)₀ and M_V"));
        self->errors = switch_row (self, group, _("Error ellipses"),
                                   /* xgettext:no-c-format */ _("Or bars, from the 68% intervals"), "errors",
                                   self->job.hrd.errors);
        break;
      }
    case SL_FIGURE_KIND_SKY:
      {
        const char *const systems[] = { _("Equatorial"), _("Galactic"), NULL };

        group = add_group (page, _("Map"));
        self->coordinates = choice_row (self, group, _("Coordinates"), "coordinates", systems, 0);
        self->ellipses = spin_row (self, group, _("Parallax ellipses"), _("Magnified this many times; 0: none"),
                                   "ellipses", 0, 1e6, 100, 0, self->job.sky.ellipse_scale, NULL);
        break;
      }
    default:
      group = add_group (page, _("Paths"));
      self->start = spin_row (self, group, _("Start"), _("Julian year"), "start", 1000, 3000, 0.1, 2,
                              self->job.parallax.start_jyear, NULL);
      self->years = spin_row (self, group, _("Length"), _("Years"), "years", 0.01, 1000, 0.5, 2,
                              self->job.parallax.years, NULL);
      self->proper_motion = switch_row (self, group, _("Proper motion"), _("Add it to the parallax path"),
                                        "proper-motion", FALSE);
      self->common_scale = switch_row (self, group, _("One scale"), _("The same scale for every star"),
                                       "common-scale", FALSE);
      break;
    }
}

/* The stars: the list, if the project has any, and the selection. */
static void
add_star_options (SlFigureDialog *self, AdwPreferencesPage *page)
{
  AdwPreferencesGroup *group = add_group (page, _("Stars"));
  g_autoptr (SlProject) project = sl_project_open (self->project, NULL);
  guint n = self->job.stars ? g_strv_length (self->job.stars) : 0;
  g_autofree char *shown = NULL;
  GtkWidget *row;

  self->list_names = project ? sl_list_names (project, NULL) : NULL;
  if (self->list_names && self->list_names[0])
    {
      g_autoptr (GStrvBuilder) items = g_strv_builder_new ();
      g_auto (GStrv) strings = NULL;

      g_strv_builder_add (items, _("Every star"));
      g_strv_builder_addv (items, (const char **) self->list_names);
      strings = g_strv_builder_end (items);
      self->list = choice_row (self, group, _("Only the stars of list"), "list", (const char *const *) strings, 0);
    }

  if (n == 0)
    shown = g_strdup (self->job.kind == SL_FIGURE_KIND_PARALLAX
                        ? _("None: select stars in the table or a view first")
                        : _("None: select stars in the table or a view to mark them"));
  else if (n <= 4)
    shown = g_strjoinv (", ", self->job.stars);
  else
    shown = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%s, %s and %u more", "%s, %s and %u more", n - 2),
                             self->job.stars[0], self->job.stars[1], n - 2);
  row = action_row (group,
                    self->job.kind == SL_FIGURE_KIND_PARALLAX ? _("Paths of the selected stars")
                                                              : _("Marked: the selected stars"),
                    shown);
  gtk_widget_add_css_class (row, "property");
}

static GtkWidget *
build_options (SlFigureDialog *self)
{
  const char *const sizes[] = { _("Single column"), _("Double column"), _("Custom"), NULL };
  const char *const formats[] = { _("PDF"), _("SVG"), _("PNG"), NULL };
  GtkWidget *page = adw_preferences_page_new ();
  AdwPreferencesGroup *group;

  group = add_group (ADW_PREFERENCES_PAGE (page), _("Page"));
  self->size = choice_row (self, group, _("Size"), "size", sizes, SIZE_SINGLE);
  adw_action_row_set_subtitle (ADW_ACTION_ROW (self->size), _("A journal's column: 88 × 70 mm or 180 × 110 mm"));
  g_signal_handlers_disconnect_by_func (self->size, options_changed, self);
  g_signal_connect_swapped (self->size, "notify::selected", G_CALLBACK (on_size_changed), self);
  self->width = spin_row (self, group, _("Width"), _("Millimetres"), "width", 10, 1000, 1, 1,
                          self->job.style.width_mm, NULL);
  self->height = spin_row (self, group, _("Height"), _("Millimetres"), "height", 10, 1000, 1, 1,
                           self->job.style.height_mm, NULL);
  self->font = spin_row (self, group, _("Text size"), _("Points"), "font", 3, 30, 0.5, 1,
                         self->job.style.font_pt, NULL);

  group = add_group (ADW_PREFERENCES_PAGE (page), _("File"));
  self->format_row = choice_row (self, group, _("Format"), "format", formats, SL_FIGURE_FORMAT_PDF);
  self->dpi = spin_row (self, group, _("Resolution"), _("Dots per inch, for PNG"), "dpi", 10, 2400, 50, 0,
                        self->job.style.dpi, &self->dpi_row);
  self->grayscale = switch_row (self, group, _("Grayscale"), _("Grey instead of the colour scale, for print"),
                                "grayscale", FALSE);

  add_kind_options (self, ADW_PREFERENCES_PAGE (page));
  add_star_options (self, ADW_PREFERENCES_PAGE (page));
  gtk_widget_set_size_request (page, 380, -1);
  return page;
}

static GtkWidget *
build_preview (SlFigureDialog *self)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 6);
  GtkWidget *heading = gtk_label_new (_("Command line"));
  GtkWidget *scroller = gtk_scrolled_window_new ();

  gtk_widget_set_margin_start (box, 6);
  gtk_widget_set_margin_end (box, 12);
  gtk_widget_set_margin_top (box, 6);
  gtk_widget_set_margin_bottom (box, 12);

  self->preview = gtk_drawing_area_new ();
  gtk_widget_set_hexpand (self->preview, TRUE);
  gtk_widget_set_vexpand (self->preview, TRUE);
  gtk_widget_set_size_request (self->preview, 440, 300);
  gtk_drawing_area_set_draw_func (GTK_DRAWING_AREA (self->preview), draw_preview, self, NULL);
  gtk_widget_set_name (self->preview, "preview");
  gtk_box_append (GTK_BOX (box), self->preview);

  self->status = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_xalign (self->status, 0.0);
  gtk_label_set_wrap (self->status, TRUE);
  gtk_widget_add_css_class (GTK_WIDGET (self->status), "dim-label");
  gtk_box_append (GTK_BOX (box), GTK_WIDGET (self->status));

  gtk_label_set_xalign (GTK_LABEL (heading), 0.0);
  gtk_widget_add_css_class (heading, "heading");
  gtk_widget_set_tooltip_text (heading, _("Writes the same file from a script"));
  gtk_box_append (GTK_BOX (box), heading);
  self->command = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_xalign (self->command, 0.0);
  gtk_label_set_yalign (self->command, 0.0);
  gtk_label_set_wrap (self->command, TRUE);
  gtk_label_set_wrap_mode (self->command, PANGO_WRAP_WORD_CHAR);
  gtk_label_set_selectable (self->command, TRUE);
  gtk_widget_add_css_class (GTK_WIDGET (self->command), "monospace");
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (scroller), GTK_POLICY_NEVER, GTK_POLICY_AUTOMATIC);
  gtk_scrolled_window_set_propagate_natural_height (GTK_SCROLLED_WINDOW (scroller), TRUE);
  gtk_scrolled_window_set_min_content_height (GTK_SCROLLED_WINDOW (scroller), 84);
  gtk_scrolled_window_set_max_content_height (GTK_SCROLLED_WINDOW (scroller), 110);
  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (scroller), GTK_WIDGET (self->command));
  gtk_box_append (GTK_BOX (box), scroller);
  return box;
}

SlFigureDialog *
sl_figure_dialog_new (SlWindow *window, SlFigureKind kind)
{
  SlFigureDialog *self;
  GtkWidget *content, *header, *body, *cancel, *title;
  const char *project;

  g_return_val_if_fail (SL_IS_WINDOW (window), NULL);
  g_return_val_if_fail (kind < SL_FIGURE_N_KINDS, NULL);
  project = sl_window_get_project_path (window);
  g_return_val_if_fail (project != NULL, NULL);

  self = g_object_new (SL_TYPE_FIGURE_DIALOG, "transient-for", window, "modal", TRUE, "destroy-with-parent", TRUE,
                       "default-width", 1040, "default-height", 700, NULL);
  self->window = window;
  self->project = g_strdup (project);
  sl_figure_job_init (&self->job, kind);
  sl_figure_job_set_stars (&self->job, sl_window_get_selection (window));

  content = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  header = adw_header_bar_new ();
  title = adw_window_title_new (_("Export Figure"), sl_figure_kind_title (kind));
  adw_header_bar_set_title_widget (ADW_HEADER_BAR (header), title);
  adw_header_bar_set_show_end_title_buttons (ADW_HEADER_BAR (header), FALSE);
  cancel = gtk_button_new_with_mnemonic (_("_Cancel"));
  gtk_actionable_set_action_name (GTK_ACTIONABLE (cancel), "window.close");
  adw_header_bar_pack_start (ADW_HEADER_BAR (header), cancel);
  self->export_button = gtk_button_new_with_mnemonic (_("_Export…"));
  gtk_widget_add_css_class (self->export_button, "suggested-action");
  gtk_widget_set_tooltip_text (self->export_button, _("Choose a file and write the figure"));
  g_signal_connect_swapped (self->export_button, "clicked", G_CALLBACK (on_export_clicked), self);
  adw_header_bar_pack_end (ADW_HEADER_BAR (header), self->export_button);
  gtk_box_append (GTK_BOX (content), header);

  body = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 0);
  gtk_widget_set_vexpand (body, TRUE);
  gtk_box_append (GTK_BOX (body), build_options (self));
  gtk_box_append (GTK_BOX (body), gtk_separator_new (GTK_ORIENTATION_VERTICAL));
  gtk_box_append (GTK_BOX (body), build_preview (self));
  gtk_box_append (GTK_BOX (content), body);
  adw_window_set_content (ADW_WINDOW (self), content);

  options_changed (self);
  load_stars (self);
  return self;
}

static void
sl_figure_dialog_dispose (GObject *object)
{
  SlFigureDialog *self = SL_FIGURE_DIALOG (object);

  g_cancellable_cancel (self->loading);
  g_clear_object (&self->loading);
  g_clear_handle_id (&self->notes_idle, g_source_remove);
  G_OBJECT_CLASS (sl_figure_dialog_parent_class)->dispose (object);
}

static void
sl_figure_dialog_finalize (GObject *object)
{
  SlFigureDialog *self = SL_FIGURE_DIALOG (object);

  sl_figure_job_clear (&self->job);
  g_clear_pointer (&self->stars, sl_star_set_free);
  g_free (self->load_error);
  g_free (self->notes);
  g_free (self->output_name);
  g_free (self->project);
  g_strfreev (self->list_names);
  G_OBJECT_CLASS (sl_figure_dialog_parent_class)->finalize (object);
}

static void
sl_figure_dialog_class_init (SlFigureDialogClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = sl_figure_dialog_dispose;
  object_class->finalize = sl_figure_dialog_finalize;
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "window.close", NULL);
}

static void
sl_figure_dialog_init (SlFigureDialog *self)
{
}
