/* sl-import-dialog.c: the import assistant.
 *
 * Contents:
 *   the user's choices ..... ImportChoices: delimiter, one map per column,
 *                            missing tokens, epoch, match radius, source name
 *                            -> SlImportOptions
 *   the preview ............ refresh_preview (sl_import_preview), the rows table
 *   the columns ............ a field and a unit chooser per header column
 *   the check .............. a dry run (sl_import_csv, options.dry_run) in a GTask
 *   the import ............. sl_window_run_work; the toast, and the rejected
 *                            rows' reasons behind its button
 *
 * The assistant computes nothing: the preview and the dry run are the
 * core's, and what it imports is exactly what it checked.  Every column's
 * mapping is passed explicitly (explicit_only), so "Not imported" holds
 * even for a column whose name is a field's.
 */
#include "sl-import-dialog.h"

#include <inttypes.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "csv-reader.h"
#include "units.h"
#include "vocabulary.h"

/* Rejected rows listed under the check; the rest are counted. */
#define CHECK_REJECTIONS_SHOWN 10
/* Rejected rows listed behind the toast's button. */
#define REASONS_SHOWN 1000

static const char delimiters[] = { ',', ';', '\t' };

/* What the user chose for one header column. */
typedef struct {
  SlField field;   /* SL_FIELD_NONE: not imported */
  SlUnit  unit;    /* the unit the column is written in */
} ColumnChoice;

struct _SlImportDialog {
  AdwWindow parent_instance;

  SlWindow        *window;          /* owned; the project's window */
  char            *path;            /* the CSV file */
  SlImportPreview *preview;         /* as last read */
  char             delimiter;       /* 0: detected */
  GArray          *choices;         /* ColumnChoice, one per header column */
  char            *problem;         /* why Check and Import are off; NULL: none */
  char            *check_summary;   /* what the last dry run found, as shown */
  GCancellable    *check_cancel;    /* the running dry run, if any */
  guint            updating;        /* > 0 while the choosers are set from code */

  AdwWindowTitle  *title;
  AdwComboRow     *delimiter_row;
  AdwEntryRow     *missing_row, *epoch_row, *source_row;
  AdwEntryRow     *radius_row;      /* join rows to stars by position within, arcsec */
  AdwPreferencesGroup *rows_group, *columns_group;
  GtkScrolledWindow *rows_scroller;
  GtkGrid         *rows_grid;
  GPtrArray       *column_rows;     /* AdwActionRow, one per header column */
  GPtrArray       *field_choosers;  /* GtkDropDown, one per header column */
  GPtrArray       *unit_choosers;   /* GtkDropDown, one per header column */
  GtkLabel        *problem_label;
  GtkLabel        *check_label;
  GtkLabel        *rejections_label;
  GtkButton       *check_button;
  GtkButton       *stop_button;
  GtkProgressBar  *check_progress;
};

G_DEFINE_FINAL_TYPE (SlImportDialog, sl_import_dialog, ADW_TYPE_WINDOW)

static void refresh_preview (SlImportDialog *self, gboolean from_choices);
static void update_state (SlImportDialog *self);

/* ------------------------------------------------------------------ */
/* The user's choices                                                 */

/* Everything an import needs besides the project and the file, owned:
 * it outlives the dialog in the import's thread. */
typedef struct {
  char   *path;
  char   *project;
  char    delimiter;
  GArray *maps;          /* SlColumnMap */
  GStrv   missing;
  double  epoch;         /* NAN: none */
  double  match_radius;  /* arcsec: join rows to stars by position; 0: by id only */
  char   *source_name;   /* NULL: the file's name */
} ImportChoices;

static void
import_choices_free (gpointer data)
{
  ImportChoices *choices = data;

  g_free (choices->path);
  g_free (choices->project);
  g_array_unref (choices->maps);
  g_strfreev (choices->missing);
  g_free (choices->source_name);
  g_free (choices);
}

static void
import_choices_fill_options (const ImportChoices *choices, SlImportOptions *options)
{
  sl_import_options_init (options);
  options->delimiter = choices->delimiter;
  options->maps = (const SlColumnMap *) choices->maps->data;
  options->n_maps = choices->maps->len;
  options->explicit_only = TRUE;
  options->missing = (const char *const *) choices->missing;
  options->epoch = choices->epoch;
  options->match_radius = choices->match_radius;
  options->source_name = choices->source_name;
}

/* The epoch entry: empty is none; otherwise a valid epoch or *PROBLEM. */
static gboolean
read_epoch (SlImportDialog *self, double *epoch, char **problem)
{
  g_autofree char *text = g_strstrip (g_strdup (gtk_editable_get_text (GTK_EDITABLE (self->epoch_row))));
  const char *reason = NULL;
  char *range = NULL;

  *epoch = NAN;
  if (*text == '\0')
    return TRUE;
  if (!sl_parse_number (text, epoch, &reason))
    {
      *problem = g_strdup_printf (_("Epoch: %s: '%s'"), _(reason), text);
      return FALSE;
    }
  if (!sl_field_check_value (SL_FIELD_EPOCH, *epoch, &range))
    {
      *problem = g_strdup_printf (_("Epoch: %s"), range);
      g_free (range);
      return FALSE;
    }
  return TRUE;
}

/* The match radius entry: empty is none (rows join stars by id only);
 * otherwise arcseconds, as starledger-cli import --match-radius takes
 * them, or *PROBLEM. */
static gboolean
read_match_radius (SlImportDialog *self, double *radius, char **problem)
{
  g_autofree char *text = g_strstrip (g_strdup (gtk_editable_get_text (GTK_EDITABLE (self->radius_row))));
  const char *reason = NULL;

  *radius = 0.0;
  if (*text == '\0')
    return TRUE;
  /* Up to a degree, as the command line: beyond it "the same star" means little. */
  if (!sl_parse_number (text, radius, &reason) || !(*radius > 0.0) || *radius > 3600.0)
    {
      *problem = g_strdup_printf (_("Match radius: expected a number of arcseconds above 0 and at most "
                                    "3600, not “%s”"), text);
      *radius = 0.0;
      return FALSE;
    }
  return TRUE;
}

/* The choices as they stand; the maps only (for the preview) when
 * MAPS_ONLY, which cannot fail. */
static ImportChoices *
current_choices (SlImportDialog *self, gboolean maps_only, char **problem)
{
  ImportChoices *choices = g_new0 (ImportChoices, 1);
  const char *source = gtk_editable_get_text (GTK_EDITABLE (self->source_row));
  g_auto (GStrv) tokens = NULL;
  g_autoptr (GStrvBuilder) missing = g_strv_builder_new ();

  choices->path = g_strdup (self->path);
  choices->project = g_strdup (sl_window_get_project_path (self->window));
  choices->delimiter = self->delimiter;
  choices->maps = g_array_new (FALSE, FALSE, sizeof (SlColumnMap));
  g_array_set_clear_func (choices->maps, (GDestroyNotify) sl_column_map_clear);
  for (guint i = 0; self->preview && i < self->choices->len; i++)
    {
      const ColumnChoice *choice = &g_array_index (self->choices, ColumnChoice, i);
      SlColumnMap map = { choice->field, NULL, choice->unit };

      if (choice->field == SL_FIELD_NONE)
        continue;
      map.column = g_strdup (g_array_index (self->preview->columns, SlPreviewColumn, i).name);
      g_array_append_val (choices->maps, map);
    }
  choices->epoch = NAN;
  if (maps_only)
    return choices;

  tokens = g_strsplit_set (gtk_editable_get_text (GTK_EDITABLE (self->missing_row)), " \t", -1);
  for (guint i = 0; tokens[i]; i++)
    if (*tokens[i])
      g_strv_builder_add (missing, tokens[i]);
  choices->missing = g_strv_builder_end (missing);
  choices->source_name = *source ? g_strdup (source) : NULL;
  if (!read_epoch (self, &choices->epoch, problem)
      || !read_match_radius (self, &choices->match_radius, problem))
    {
      import_choices_free (choices);
      return NULL;
    }
  return choices;
}

/* ------------------------------------------------------------------ */
/* The check: a dry run                                               */

/* Forgets the last check, and stops the one running: its result, when it
 * comes, is for choices no longer shown. */
static void
clear_check (SlImportDialog *self)
{
  if (self->check_cancel)
    g_cancellable_cancel (self->check_cancel);
  g_clear_object (&self->check_cancel);
  g_clear_pointer (&self->check_summary, g_free);
  self->check_summary = g_strdup ("");
  gtk_label_set_text (self->check_label, _("Check reads the whole file as the import would, "
                                           "and writes nothing."));
  gtk_widget_remove_css_class (GTK_WIDGET (self->check_label), "error");
  gtk_widget_set_visible (GTK_WIDGET (self->rejections_label), FALSE);
}

/* The dry run's progress, from its thread to the dialog's bar. */
typedef struct {
  SlImportDialog *dialog;
  GCancellable   *check;      /* the run it is about */
  double          fraction;
} CheckProgress;

static gboolean
apply_check_progress (gpointer data)
{
  CheckProgress *progress = data;

  /* Only for the run still going: not after a stop, a change or a close. */
  if (progress->dialog->window && progress->dialog->check_cancel == progress->check)
    gtk_progress_bar_set_fraction (progress->dialog->check_progress, progress->fraction);
  return G_SOURCE_REMOVE;
}

static void
check_progress_free (gpointer data)
{
  CheckProgress *progress = data;

  g_object_unref (progress->dialog);
  g_object_unref (progress->check);
  g_free (progress);
}

static void
report_check_progress (double fraction, gpointer task)
{
  CheckProgress *progress = g_new (CheckProgress, 1);

  progress->dialog = g_object_ref (g_task_get_source_object (task));
  progress->check = g_object_ref (g_task_get_cancellable (task));
  progress->fraction = fraction;
  g_idle_add_full (G_PRIORITY_DEFAULT, apply_check_progress, progress, check_progress_free);
}

/* The import with CHOICES in a worker thread, written or (DRY_RUN) rolled
 * back; the task returns its SlImportReport. */
static void
import_in_thread (GTask *task, const ImportChoices *choices, gboolean dry_run, GCancellable *cancellable,
                  SlProgressFunc progress, gpointer progress_data)
{
  g_autoptr (SlProject) project = NULL;
  SlImportReport *report = NULL;
  SlImportOptions options;
  GError *error = NULL;

  import_choices_fill_options (choices, &options);
  options.dry_run = dry_run;
  options.cancellable = cancellable;
  options.progress = progress;
  options.progress_data = progress_data;
  project = sl_project_open (choices->project, &error);
  if (project)
    report = sl_import_csv (project, choices->path, &options, &error);
  if (report)
    g_task_return_pointer (task, report, (GDestroyNotify) sl_import_report_free);
  else
    g_task_return_error (task, error);
}

static void
check_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  import_in_thread (task, task_data, TRUE, cancellable, report_check_progress, task);
}

/* One rejected row as a line of text: "line 12, plx: not a number: 'x'". */
static void
append_rejection (GString *text, const SlRejection *rejection)
{
  if (rejection->column)
    g_string_append_printf (text, _("line %u, %s: %s\n"), rejection->line, rejection->column,
                            rejection->reason);
  else
    g_string_append_printf (text, _("line %u: %s\n"), rejection->line, rejection->reason);
}

static char *
report_summary (const SlImportReport *report)
{
  g_autofree char *n_accepted = g_strdup_printf ("%" PRIu64, report->rows_accepted);
  g_autofree char *n_new = g_strdup_printf ("%" PRIu64, report->new_stars);
  g_autofree char *n_read = g_strdup_printf ("%" PRIu64, report->rows_read);
  GString *text = g_string_new (NULL);
  g_autofree char *new_stars = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%s new star", "%s new stars",
                                                             report->new_stars), n_new);

  g_string_append_printf (text, g_dngettext (GETTEXT_PACKAGE,
                                             "Of %s row read, %s would be imported and %u rejected; %s.",
                                             "Of %s rows read, %s would be imported and %u rejected; %s.",
                                             report->rows_read),
                          n_read, n_accepted, report->rejections->len, new_stars);
  g_string_append (text, _(" Nothing was written."));
  if (report->matched > 0 || report->ambiguous->len > 0)
    {
      g_autofree char *n_matched = g_strdup_printf ("%" PRIu64, report->matched);

      g_string_append_printf (text, g_dngettext (GETTEXT_PACKAGE,
                                                 "\nBy position: %s row joined to a known star, %u ambiguous "
                                                 "(kept as stars of their own; the Matches page lists them).",
                                                 "\nBy position: %s rows joined to known stars, %u ambiguous "
                                                 "(kept as stars of their own; the Matches page lists them).",
                                                 report->matched),
                              n_matched, report->ambiguous->len);
    }
  if (report->ignored_columns->len > 0)
    {
      g_autofree char *names = NULL;

      g_ptr_array_add (report->ignored_columns, NULL);
      names = g_strjoinv ("', '", (char **) report->ignored_columns->pdata);
      g_ptr_array_set_size (report->ignored_columns, report->ignored_columns->len - 1);
      g_string_append_printf (text, _("\nNot imported: '%s'."), names);
    }
  for (guint i = 0; i < report->notes->len; i++)
    g_string_append_printf (text, _("\nNote: %s."), (const char *) report->notes->pdata[i]);
  for (guint i = 0; i < report->warnings->len; i++)
    g_string_append_printf (text, _("\nWarning: %s."), (const char *) report->warnings->pdata[i]);
  return g_string_free (text, FALSE);
}

static void
on_checked (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlImportDialog *self = SL_IMPORT_DIALOG (source);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = g_task_propagate_pointer (G_TASK (result), &error);

  /* Closed while checking (the widgets are gone), or a check stopped
   * (clear_check has said so). */
  if (self->window == NULL || g_task_get_cancellable (G_TASK (result)) != self->check_cancel)
    return;
  g_clear_object (&self->check_cancel);
  g_free (self->check_summary);
  if (report == NULL)
    {
      self->check_summary = g_strdup (error->message);
      gtk_widget_add_css_class (GTK_WIDGET (self->check_label), "error");
    }
  else
    {
      GString *rejections = g_string_new (NULL);

      self->check_summary = report_summary (report);
      for (guint i = 0; i < MIN (report->rejections->len, CHECK_REJECTIONS_SHOWN); i++)
        append_rejection (rejections, &g_array_index (report->rejections, SlRejection, i));
      if (report->rejections->len > CHECK_REJECTIONS_SHOWN)
        g_string_append_printf (rejections, _("and %u more"),
                                report->rejections->len - CHECK_REJECTIONS_SHOWN);
      if (rejections->len && rejections->str[rejections->len - 1] == '\n')
        g_string_truncate (rejections, rejections->len - 1);
      gtk_label_set_text (self->rejections_label, rejections->str);
      gtk_widget_set_visible (GTK_WIDGET (self->rejections_label), rejections->len > 0);
      g_string_free (rejections, TRUE);
    }
  gtk_label_set_text (self->check_label, self->check_summary);
  update_state (self);
}

static void
check_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlImportDialog *self = SL_IMPORT_DIALOG (widget);
  g_autoptr (GTask) task = NULL;
  g_autofree char *problem = NULL;
  ImportChoices *choices;

  if (self->problem || self->check_cancel)
    return;
  choices = current_choices (self, FALSE, &problem);
  if (choices == NULL)
    return;
  clear_check (self);
  gtk_label_set_text (self->check_label, _("Checking every row…"));
  gtk_progress_bar_set_fraction (self->check_progress, 0.0);
  self->check_cancel = g_cancellable_new ();
  task = g_task_new (self, self->check_cancel, on_checked, NULL);
  g_task_set_task_data (task, choices, import_choices_free);
  g_task_run_in_thread (task, check_thread);
  update_state (self);
}

static void
stop_check_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlImportDialog *self = SL_IMPORT_DIALOG (widget);

  if (self->check_cancel == NULL)
    return;
  clear_check (self);
  gtk_label_set_text (self->check_label, _("Check stopped; nothing was written."));
  update_state (self);
}

/* ------------------------------------------------------------------ */
/* The import                                                         */

static void
import_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  import_in_thread (task, task_data, FALSE, cancellable, sl_window_report_progress, source);
}

#define LAST_REPORT "sl-import-last-report"

/* The rejected rows of the window's last import, with their reasons. */
static void
show_rejections (GSimpleAction *action, GVariant *parameter, gpointer user_data)
{
  SlWindow *window = SL_WINDOW (user_data);
  const SlImportReport *report = g_object_get_data (G_OBJECT (window), LAST_REPORT);
  g_autofree char *heading = NULL;
  g_autofree char *body = NULL;
  GString *text = g_string_new (NULL);
  GtkWidget *dialog, *scroller, *label;

  if (report == NULL)
    {
      g_string_free (text, TRUE);
      return;
    }
  for (guint i = 0; i < MIN (report->rejections->len, REASONS_SHOWN); i++)
    append_rejection (text, &g_array_index (report->rejections, SlRejection, i));
  if (report->rejections->len > REASONS_SHOWN)
    g_string_append_printf (text, _("and %u more"), report->rejections->len - REASONS_SHOWN);
  heading = g_strdup_printf (_("Rows of %s Not Imported"), report->file_name);
  body = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                       "%u row was rejected. It is kept in the project with its reason.",
                                       "%u rows were rejected. Each is kept in the project with its reason.",
                                       report->rejections->len),
                          report->rejections->len);
  dialog = adw_message_dialog_new (GTK_WINDOW (window), heading, body);
  label = gtk_label_new (g_strstrip (text->str));
  g_string_free (text, TRUE);
  gtk_label_set_selectable (GTK_LABEL (label), TRUE);
  gtk_label_set_wrap (GTK_LABEL (label), TRUE);
  gtk_label_set_wrap_mode (GTK_LABEL (label), PANGO_WRAP_WORD_CHAR);
  gtk_label_set_xalign (GTK_LABEL (label), 0.0);
  gtk_label_set_yalign (GTK_LABEL (label), 0.0);
  gtk_widget_add_css_class (label, "monospace");
  scroller = gtk_scrolled_window_new ();
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (scroller), GTK_POLICY_NEVER, GTK_POLICY_AUTOMATIC);
  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (scroller), label);
  gtk_scrolled_window_set_propagate_natural_height (GTK_SCROLLED_WINDOW (scroller), TRUE);
  gtk_scrolled_window_set_max_content_height (GTK_SCROLLED_WINDOW (scroller), 320);
  adw_message_dialog_set_extra_child (ADW_MESSAGE_DIALOG (dialog), scroller);
  adw_message_dialog_add_response (ADW_MESSAGE_DIALOG (dialog), "close", _("_Close"));
  gtk_window_present (GTK_WINDOW (dialog));
}

/* The toast's button finds this group on the window. */
static void
install_result_actions (SlWindow *window)
{
  g_autoptr (GSimpleActionGroup) group = NULL;
  g_autoptr (GSimpleAction) action = NULL;

  if (g_object_get_data (G_OBJECT (window), "sl-import-result-actions"))
    return;
  group = g_simple_action_group_new ();
  action = g_simple_action_new ("show-rejections", NULL);
  g_signal_connect_object (action, "activate", G_CALLBACK (show_rejections), window, 0);
  g_action_map_add_action (G_ACTION_MAP (group), G_ACTION (action));
  gtk_widget_insert_action_group (GTK_WIDGET (window), "import-result", G_ACTION_GROUP (group));
  g_object_set_data (G_OBJECT (window), "sl-import-result-actions", GINT_TO_POINTER (1));
}

static void
on_imported (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlWindow *window = SL_WINDOW (source);
  g_autoptr (GError) error = NULL;
  SlImportReport *report = g_task_propagate_pointer (G_TASK (result), &error);
  g_autofree char *accepted = NULL;
  g_autofree char *rows = NULL;
  g_autofree char *message = NULL;
  AdwToast *toast;

  if (report == NULL)
    {
      sl_window_toast (window, g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED)
                               ? _("Import cancelled: the project is as it was")
                               : error->message);
      return;
    }
  accepted = g_strdup_printf ("%" PRIu64, report->rows_accepted);
  rows = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "Imported %s row", "Imported %s rows",
                                       report->rows_accepted), accepted);
  message = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%s, rejected %u", "%s, rejected %u",
                                          report->rejections->len), rows, report->rejections->len);
  toast = adw_toast_new (message);
  if (report->rejections->len > 0)
    {
      install_result_actions (window);
      adw_toast_set_button_label (toast, _("_Why Rejected"));
      adw_toast_set_action_name (toast, "import-result.show-rejections");
      adw_toast_set_timeout (toast, 10);
    }
  g_object_set_data_full (G_OBJECT (window), LAST_REPORT, report,
                          (GDestroyNotify) sl_import_report_free);
  sl_window_add_toast (window, toast);
  sl_window_reload (window);
}

static void
import_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlImportDialog *self = SL_IMPORT_DIALOG (widget);
  g_autofree char *problem = NULL;
  g_autofree char *what = NULL;
  ImportChoices *choices;

  if (self->problem)
    return;
  choices = current_choices (self, FALSE, &problem);
  if (choices == NULL)
    return;
  what = g_strdup_printf (_("Importing %s…"), self->preview->file_name);
  /* The window's job from here: its progress bar and Cancel. */
  if (sl_window_run_work (self->window, what, import_thread, choices, import_choices_free,
                          on_imported, NULL))
    gtk_window_close (GTK_WINDOW (self));
}

/* ------------------------------------------------------------------ */
/* The rows table                                                     */

static GtkWidget *
cell_label (const char *text, const char *css_class)
{
  GtkWidget *label = gtk_label_new (text);

  gtk_label_set_xalign (GTK_LABEL (label), 0.0);
  gtk_label_set_ellipsize (GTK_LABEL (label), PANGO_ELLIPSIZE_END);
  gtk_label_set_max_width_chars (GTK_LABEL (label), 24);
  /* As wide as its text (up to 24 characters) at the least: a wide file
   * scrolls sideways instead of cutting every cell to an ellipsis. */
  gtk_label_set_width_chars (GTK_LABEL (label), MIN ((int) g_utf8_strlen (text, -1), 24));
  if (css_class)
    gtk_widget_add_css_class (label, css_class);
  return label;
}

/* What the import takes from a column, as the table's second header line. */
static char *
column_fate (const ColumnChoice *choice)
{
  if (choice->field == SL_FIELD_NONE)
    return g_strdup (_("not imported"));
  if (sl_field_info (choice->field)->canonical == SL_UNIT_NONE)
    return g_strdup_printf ("→ %s", sl_field_info (choice->field)->name);
  return g_strdup_printf ("→ %s [%s]", sl_field_info (choice->field)->name, sl_unit_name (choice->unit));
}

static void
fill_rows_table (SlImportDialog *self)
{
  const SlImportPreview *preview = self->preview;
  GtkWidget *child;
  g_autofree char *description = NULL;

  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->rows_grid))))
    gtk_grid_remove (self->rows_grid, child);

  gtk_grid_attach (self->rows_grid, cell_label (_("Line"), "dim-label"), 0, 0, 1, 1);
  for (guint c = 0; c < preview->columns->len; c++)
    {
      const SlPreviewColumn *column = &g_array_index (preview->columns, SlPreviewColumn, c);
      const ColumnChoice *choice = &g_array_index (self->choices, ColumnChoice, c);
      g_autofree char *fate = column_fate (choice);

      gtk_grid_attach (self->rows_grid, cell_label (column->name, "heading"), (int) c + 1, 0, 1, 1);
      gtk_grid_attach (self->rows_grid, cell_label (fate, choice->field == SL_FIELD_NONE ? "dim-label" : "accent"),
                       (int) c + 1, 1, 1, 1);
    }
  for (guint r = 0; r < preview->rows->len; r++)
    {
      const SlPreviewRow *row = preview->rows->pdata[r];
      g_autofree char *line = g_strdup_printf ("%u", row->line);
      guint n_cells = g_strv_length (row->cells);

      gtk_grid_attach (self->rows_grid, cell_label (line, "dim-label"), 0, (int) r + 2, 1, 1);
      if (row->malformed || n_cells != preview->columns->len)
        {
          g_autofree char *why = row->malformed
                                   ? g_strdup (row->malformed)
                                   : g_strdup_printf (_("%u fields, the header has %u"), n_cells,
                                                      preview->columns->len);
          GtkWidget *label = cell_label (why, "error");

          gtk_grid_attach (self->rows_grid, label, 1, (int) r + 2, MAX (1, (int) preview->columns->len), 1);
          continue;
        }
      for (guint c = 0; c < n_cells; c++)
        gtk_grid_attach (self->rows_grid, cell_label (row->cells[c], "monospace"), (int) c + 1, (int) r + 2, 1, 1);
    }

  if (preview->rows->len == 0)
    description = g_strdup (_("The file has no data rows after its header."));
  else
    description = g_strdup_printf (preview->more_rows
                                     ? _("The first %u data rows, from line %u, as split; the header is line %u.")
                                     : _("All %u data rows, from line %u, as split; the header is line %u."),
                                   preview->rows->len, ((SlPreviewRow *) preview->rows->pdata[0])->line,
                                   preview->header_line);
  adw_preferences_group_set_description (self->rows_group, description);
}

/* ------------------------------------------------------------------ */
/* The columns                                                        */

/* The units a column of FIELD may be written in, the stored one first. */
static GArray *
units_for (SlField field)
{
  GArray *units = g_array_new (FALSE, FALSE, sizeof (SlUnit));
  SlUnit canonical;

  if (field == SL_FIELD_NONE)
    return units;
  canonical = sl_field_info (field)->canonical;
  if (canonical == SL_UNIT_NONE)
    return units;
  g_array_append_val (units, canonical);
  for (SlUnit u = SL_UNIT_NONE + 1; u < SL_N_UNITS; u++)
    if (u != canonical && sl_field_accepts_unit (field, u))
      g_array_append_val (units, u);
  return units;
}

static void
fill_unit_chooser (SlImportDialog *self, guint column)
{
  const ColumnChoice *choice = &g_array_index (self->choices, ColumnChoice, column);
  GtkDropDown *chooser = g_ptr_array_index (self->unit_choosers, column);
  g_autoptr (GArray) units = units_for (choice->field);
  g_autoptr (GtkStringList) names = gtk_string_list_new (NULL);
  guint selected = 0;

  self->updating++;
  for (guint i = 0; i < units->len; i++)
    {
      SlUnit unit = g_array_index (units, SlUnit, i);
      g_autofree char *name = i == 0 ? g_strdup_printf (_("%s (stored)"), sl_unit_name (unit))
                                     : g_strdup (sl_unit_name (unit));

      gtk_string_list_append (names, name);
      if (unit == choice->unit)
        selected = i;
    }
  if (units->len == 0)
    gtk_string_list_append (names, choice->field == SL_FIELD_NONE ? "—" : _("text"));
  gtk_drop_down_set_model (chooser, G_LIST_MODEL (names));
  gtk_drop_down_set_selected (chooser, selected);
  gtk_widget_set_sensitive (GTK_WIDGET (chooser), units->len > 1);
  g_object_set_data_full (G_OBJECT (chooser), "units", g_steal_pointer (&units), (GDestroyNotify) g_array_unref);
  self->updating--;
}

/* The subtitle of a column's row: where its mapping came from, and a
 * value from the first row as an example. */
static void
describe_column (SlImportDialog *self, guint column)
{
  const SlPreviewColumn *preview_column = &g_array_index (self->preview->columns, SlPreviewColumn, column);
  const ColumnChoice *choice = &g_array_index (self->choices, ColumnChoice, column);
  AdwActionRow *row = g_ptr_array_index (self->column_rows, column);
  const char *example = NULL;
  const char *origin;
  g_autofree char *subtitle = NULL;

  for (guint r = 0; r < self->preview->rows->len && example == NULL; r++)
    {
      const SlPreviewRow *preview_row = self->preview->rows->pdata[r];

      if (column < g_strv_length (preview_row->cells)
          && preview_row->cells[column][strspn (preview_row->cells[column], " \t")] != '\0')
        example = preview_row->cells[column];
    }
  if (choice->field == preview_column->automatic
      && (choice->field == SL_FIELD_NONE || choice->unit == sl_field_info (choice->field)->canonical))
    origin = choice->field == SL_FIELD_NONE ? _("No field has this name") : _("Found by its name");
  else
    origin = _("Chosen here");
  subtitle = example ? g_strdup_printf (_("%s · e.g. %s"), origin, example) : g_strdup (origin);
  adw_action_row_set_subtitle (row, subtitle);
}

static void
on_field_chosen (GtkDropDown *chooser, GParamSpec *pspec, SlImportDialog *self)
{
  guint column, selected;
  ColumnChoice *choice;

  if (self->updating || !g_ptr_array_find (self->field_choosers, chooser, &column))
    return;
  selected = gtk_drop_down_get_selected (chooser);
  choice = &g_array_index (self->choices, ColumnChoice, column);
  /* Position 0 is "Not imported", then the fields in vocabulary order. */
  choice->field = selected == 0 || selected == GTK_INVALID_LIST_POSITION ? SL_FIELD_NONE : (SlField) (selected - 1);
  choice->unit = choice->field == SL_FIELD_NONE ? SL_UNIT_NONE : sl_field_info (choice->field)->canonical;
  fill_unit_chooser (self, column);
  refresh_preview (self, TRUE);
}

static void
on_unit_chosen (GtkDropDown *chooser, GParamSpec *pspec, SlImportDialog *self)
{
  GArray *units = g_object_get_data (G_OBJECT (chooser), "units");
  guint column, selected = gtk_drop_down_get_selected (chooser);

  if (self->updating || !g_ptr_array_find (self->unit_choosers, chooser, &column)
      || units == NULL || selected >= units->len)
    return;
  g_array_index (self->choices, ColumnChoice, column).unit = g_array_index (units, SlUnit, selected);
  refresh_preview (self, TRUE);
}

static GtkStringList *
field_names (void)
{
  GtkStringList *names = gtk_string_list_new (NULL);

  gtk_string_list_append (names, _("Not imported"));
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    gtk_string_list_append (names, sl_field_info (f)->name);
  return names;
}

/* One row per header column, chosen as the importer maps the column by
 * itself (the preview's automatic mapping, in the stored unit). */
static void
build_column_rows (SlImportDialog *self)
{
  for (guint i = 0; i < self->column_rows->len; i++)
    adw_preferences_group_remove (self->columns_group, g_ptr_array_index (self->column_rows, i));
  g_ptr_array_set_size (self->column_rows, 0);
  g_ptr_array_set_size (self->field_choosers, 0);
  g_ptr_array_set_size (self->unit_choosers, 0);
  g_array_set_size (self->choices, 0);

  self->updating++;
  for (guint c = 0; c < self->preview->columns->len; c++)
    {
      const SlPreviewColumn *column = &g_array_index (self->preview->columns, SlPreviewColumn, c);
      ColumnChoice choice = { column->automatic, column->automatic == SL_FIELD_NONE
                                                   ? SL_UNIT_NONE : sl_field_info (column->automatic)->canonical };
      g_autoptr (GtkStringList) names = field_names ();
      GtkWidget *row = adw_action_row_new ();
      GtkWidget *field = gtk_drop_down_new (G_LIST_MODEL (g_object_ref (names)), NULL);
      GtkWidget *unit = gtk_drop_down_new (NULL, NULL);
      /* set_expression takes a reference of its own. */
      g_autoptr (GtkExpression) by_name = gtk_property_expression_new (GTK_TYPE_STRING_OBJECT, NULL, "string");

      g_array_append_val (self->choices, choice);
      /* A header is text as written, never markup; say so before it is set. */
      adw_preferences_row_set_use_markup (ADW_PREFERENCES_ROW (row), FALSE);
      adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), column->name);
      gtk_drop_down_set_expression (GTK_DROP_DOWN (field), by_name);
      gtk_drop_down_set_enable_search (GTK_DROP_DOWN (field), TRUE);
      gtk_drop_down_set_selected (GTK_DROP_DOWN (field), choice.field == SL_FIELD_NONE ? 0 : (guint) choice.field + 1);
      gtk_widget_set_valign (field, GTK_ALIGN_CENTER);
      gtk_widget_set_valign (unit, GTK_ALIGN_CENTER);
      gtk_widget_set_tooltip_text (field, _("The field this column is imported as"));
      gtk_widget_set_tooltip_text (unit, _("The unit the column is written in; values are stored converted"));
      adw_action_row_add_suffix (ADW_ACTION_ROW (row), field);
      adw_action_row_add_suffix (ADW_ACTION_ROW (row), unit);
      adw_preferences_group_add (self->columns_group, row);
      g_ptr_array_add (self->column_rows, row);
      g_ptr_array_add (self->field_choosers, field);
      g_ptr_array_add (self->unit_choosers, unit);
      fill_unit_chooser (self, c);
      g_signal_connect (field, "notify::selected", G_CALLBACK (on_field_chosen), self);
      g_signal_connect (unit, "notify::selected", G_CALLBACK (on_unit_chosen), self);
    }
  self->updating--;
}

/* ------------------------------------------------------------------ */
/* The preview and the state of the buttons                           */

/* Why the choices cannot be imported, in the assistant's own words where
 * they are about the choosers; NULL when they can. */
static char *
find_problem (SlImportDialog *self)
{
  gboolean has_id = FALSE;
  double epoch, radius;
  char *problem = NULL;

  for (guint i = 0; i < self->choices->len; i++)
    {
      const ColumnChoice *a = &g_array_index (self->choices, ColumnChoice, i);

      has_id |= a->field == SL_FIELD_ID;
      for (guint j = i + 1; a->field != SL_FIELD_NONE && j < self->choices->len; j++)
        if (g_array_index (self->choices, ColumnChoice, j).field == a->field)
          return g_strdup_printf (_("Columns '%s' and '%s' are both set to %s; choose one."),
                                  g_array_index (self->preview->columns, SlPreviewColumn, i).name,
                                  g_array_index (self->preview->columns, SlPreviewColumn, j).name,
                                  sl_field_info (a->field)->name);
    }
  if (!has_id)
    return g_strdup (_("No column is the id: set the column that holds each star's designation to 'id'."));
  if (self->preview->mapping_problem)
    return g_strdup (self->preview->mapping_problem);
  if (!read_epoch (self, &epoch, &problem) || !read_match_radius (self, &radius, &problem))
    return problem;
  return NULL;
}

static void
update_state (SlImportDialog *self)
{
  gboolean checking = self->check_cancel != NULL;

  g_clear_pointer (&self->problem, g_free);
  if (self->preview)
    self->problem = find_problem (self);
  gtk_label_set_text (self->problem_label, self->problem ? self->problem : "");
  gtk_widget_set_visible (GTK_WIDGET (self->problem_label), self->problem != NULL);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "assistant.check", self->problem == NULL && !checking);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "assistant.import", self->problem == NULL);
  gtk_widget_action_set_enabled (GTK_WIDGET (self), "assistant.stop-check", checking);
  gtk_widget_set_visible (GTK_WIDGET (self->check_button), !checking);
  gtk_widget_set_visible (GTK_WIDGET (self->stop_button), checking);
  gtk_widget_set_visible (GTK_WIDGET (self->check_progress), checking);
}

/* Reads the file's start again: with the maps as chosen (FROM_CHOICES), or
 * as the importer would map it by itself (a new delimiter, new columns). */
static void
refresh_preview (SlImportDialog *self, gboolean from_choices)
{
  ImportChoices *choices = current_choices (self, TRUE, NULL);
  g_autoptr (GError) error = NULL;
  SlImportPreview *preview;
  SlImportOptions options;

  import_choices_fill_options (choices, &options);
  options.explicit_only = from_choices;
  if (!from_choices)
    options.n_maps = 0;
  preview = sl_import_preview (self->path, &options, SL_IMPORT_DIALOG_ROWS, &error);
  import_choices_free (choices);
  clear_check (self);
  if (preview == NULL)
    {
      /* The file changed under us, or cannot be split this way: keep what
       * is shown and say why. */
      g_clear_pointer (&self->problem, g_free);
      gtk_label_set_text (self->problem_label, error->message);
      gtk_widget_set_visible (GTK_WIDGET (self->problem_label), TRUE);
      gtk_widget_action_set_enabled (GTK_WIDGET (self), "assistant.check", FALSE);
      gtk_widget_action_set_enabled (GTK_WIDGET (self), "assistant.import", FALSE);
      return;
    }
  g_clear_pointer (&self->preview, sl_import_preview_free);
  self->preview = preview;
  if (!from_choices)
    build_column_rows (self);
  for (guint c = 0; c < self->choices->len; c++)
    describe_column (self, c);
  fill_rows_table (self);
  update_state (self);
}

static void
on_delimiter_chosen (AdwComboRow *row, GParamSpec *pspec, SlImportDialog *self)
{
  guint selected = adw_combo_row_get_selected (row);

  if (self->updating || selected >= G_N_ELEMENTS (delimiters))
    return;
  self->delimiter = delimiters[selected];
  adw_action_row_set_subtitle (ADW_ACTION_ROW (row), _("Chosen here"));
  refresh_preview (self, FALSE);
}

static void
on_entry_changed (GtkEditable *editable, SlImportDialog *self)
{
  /* The missing tokens, epoch and name change what a check finds. */
  clear_check (self);
  update_state (self);
}

/* ------------------------------------------------------------------ */
/* Construction                                                       */

static void
sl_import_dialog_dispose (GObject *object)
{
  SlImportDialog *self = SL_IMPORT_DIALOG (object);

  if (self->check_cancel)
    g_cancellable_cancel (self->check_cancel);
  g_clear_object (&self->check_cancel);
  g_clear_object (&self->window);
  G_OBJECT_CLASS (sl_import_dialog_parent_class)->dispose (object);
}

static void
sl_import_dialog_finalize (GObject *object)
{
  SlImportDialog *self = SL_IMPORT_DIALOG (object);

  g_free (self->path);
  g_clear_pointer (&self->preview, sl_import_preview_free);
  g_array_unref (self->choices);
  g_free (self->problem);
  g_free (self->check_summary);
  g_ptr_array_unref (self->column_rows);
  g_ptr_array_unref (self->field_choosers);
  g_ptr_array_unref (self->unit_choosers);
  G_OBJECT_CLASS (sl_import_dialog_parent_class)->finalize (object);
}

static void
sl_import_dialog_class_init (SlImportDialogClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = sl_import_dialog_dispose;
  object_class->finalize = sl_import_dialog_finalize;
  gtk_widget_class_install_action (widget_class, "assistant.check", NULL, check_action);
  gtk_widget_class_install_action (widget_class, "assistant.stop-check", NULL, stop_check_action);
  gtk_widget_class_install_action (widget_class, "assistant.import", NULL, import_action);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "window.close", NULL);
}

static GtkWidget *
group_new (const char *title, const char *description)
{
  GtkWidget *group = adw_preferences_group_new ();

  adw_preferences_group_set_title (ADW_PREFERENCES_GROUP (group), title);
  if (description)
    adw_preferences_group_set_description (ADW_PREFERENCES_GROUP (group), description);
  return group;
}

static GtkWidget *
entry_row_new (SlImportDialog *self, const char *title)
{
  GtkWidget *row = adw_entry_row_new ();

  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), title);
  g_signal_connect (row, "changed", G_CALLBACK (on_entry_changed), self);
  return row;
}

static void
sl_import_dialog_init (SlImportDialog *self)
{
  const char *const delimiter_names[] = { N_("Comma"), N_("Semicolon"), N_("Tab"), NULL };
  g_autoptr (GtkStringList) delimiter_list = gtk_string_list_new (NULL);
  GtkWidget *content, *header, *cancel, *import, *scroller, *clamp, *box, *group, *check_box;

  self->choices = g_array_new (FALSE, FALSE, sizeof (ColumnChoice));
  self->column_rows = g_ptr_array_new ();
  self->field_choosers = g_ptr_array_new ();
  self->unit_choosers = g_ptr_array_new ();
  self->check_summary = g_strdup ("");

  gtk_window_set_title (GTK_WINDOW (self), _("Import Measurements"));
  gtk_window_set_default_size (GTK_WINDOW (self), 980, 760);
  gtk_window_set_modal (GTK_WINDOW (self), TRUE);

  content = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  header = adw_header_bar_new ();
  self->title = ADW_WINDOW_TITLE (adw_window_title_new (_("Import Measurements"), NULL));
  adw_header_bar_set_title_widget (ADW_HEADER_BAR (header), GTK_WIDGET (self->title));
  adw_header_bar_set_show_end_title_buttons (ADW_HEADER_BAR (header), FALSE);
  cancel = gtk_button_new_with_mnemonic (_("_Cancel"));
  gtk_actionable_set_action_name (GTK_ACTIONABLE (cancel), "window.close");
  import = gtk_button_new_with_mnemonic (_("_Import"));
  gtk_actionable_set_action_name (GTK_ACTIONABLE (import), "assistant.import");
  gtk_widget_add_css_class (import, "suggested-action");
  adw_header_bar_pack_start (ADW_HEADER_BAR (header), cancel);
  adw_header_bar_pack_end (ADW_HEADER_BAR (header), import);
  gtk_box_append (GTK_BOX (content), header);
  /* Why Import is off, above the scrolling part: always in sight. */
  self->problem_label = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_wrap (self->problem_label, TRUE);
  gtk_widget_set_margin_top (GTK_WIDGET (self->problem_label), 8);
  gtk_widget_set_margin_bottom (GTK_WIDGET (self->problem_label), 8);
  gtk_widget_set_margin_start (GTK_WIDGET (self->problem_label), 18);
  gtk_widget_set_margin_end (GTK_WIDGET (self->problem_label), 18);
  gtk_widget_add_css_class (GTK_WIDGET (self->problem_label), "error");
  gtk_box_append (GTK_BOX (content), GTK_WIDGET (self->problem_label));

  scroller = gtk_scrolled_window_new ();
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (scroller), GTK_POLICY_NEVER, GTK_POLICY_AUTOMATIC);
  gtk_widget_set_vexpand (scroller, TRUE);
  clamp = adw_clamp_new ();
  adw_clamp_set_maximum_size (ADW_CLAMP (clamp), 1100);
  box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 24);
  gtk_widget_set_margin_top (box, 18);
  gtk_widget_set_margin_bottom (box, 18);
  gtk_widget_set_margin_start (box, 18);
  gtk_widget_set_margin_end (box, 18);

  /* Reading the file. */
  group = group_new (_("Reading the File"), NULL);
  for (guint i = 0; delimiter_names[i]; i++)
    gtk_string_list_append (delimiter_list, _(delimiter_names[i]));
  self->delimiter_row = ADW_COMBO_ROW (adw_combo_row_new ());
  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (self->delimiter_row), _("Delimiter"));
  adw_combo_row_set_model (self->delimiter_row, G_LIST_MODEL (delimiter_list));
  g_signal_connect (self->delimiter_row, "notify::selected", G_CALLBACK (on_delimiter_chosen), self);
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (group), GTK_WIDGET (self->delimiter_row));
  self->missing_row = ADW_ENTRY_ROW (entry_row_new (self, _("Missing-value tokens besides empty and NaN, separated by spaces")));
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (group), GTK_WIDGET (self->missing_row));
  self->epoch_row = ADW_ENTRY_ROW (entry_row_new (self, _("Epoch of rows without an epoch column (Julian year; empty: none)")));
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (group), GTK_WIDGET (self->epoch_row));
  self->radius_row = ADW_ENTRY_ROW (entry_row_new (self, _("Join rows to known stars by position within (arcsec; empty: by id only)")));
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (group), GTK_WIDGET (self->radius_row));
  self->source_row = ADW_ENTRY_ROW (entry_row_new (self, _("Source name")));
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (group), GTK_WIDGET (self->source_row));
  gtk_box_append (GTK_BOX (box), group);

  /* The first rows. */
  self->rows_group = ADW_PREFERENCES_GROUP (group_new (_("First Rows"), NULL));
  self->rows_scroller = GTK_SCROLLED_WINDOW (gtk_scrolled_window_new ());
  /* Wide files scroll sideways; the assistant as a whole scrolls down. */
  gtk_scrolled_window_set_policy (self->rows_scroller, GTK_POLICY_AUTOMATIC, GTK_POLICY_NEVER);
  gtk_widget_add_css_class (GTK_WIDGET (self->rows_scroller), "card");
  self->rows_grid = GTK_GRID (gtk_grid_new ());
  gtk_grid_set_column_spacing (self->rows_grid, 18);
  gtk_grid_set_row_spacing (self->rows_grid, 2);
  gtk_widget_set_margin_top (GTK_WIDGET (self->rows_grid), 8);
  gtk_widget_set_margin_bottom (GTK_WIDGET (self->rows_grid), 8);
  gtk_widget_set_margin_start (GTK_WIDGET (self->rows_grid), 12);
  gtk_widget_set_margin_end (GTK_WIDGET (self->rows_grid), 12);
  gtk_scrolled_window_set_child (self->rows_scroller, GTK_WIDGET (self->rows_grid));
  adw_preferences_group_add (self->rows_group, GTK_WIDGET (self->rows_scroller));
  gtk_box_append (GTK_BOX (box), GTK_WIDGET (self->rows_group));

  /* The columns. */
  self->columns_group = ADW_PREFERENCES_GROUP (group_new (_("Columns"),
                                                          _("What each column is imported as, and the unit it is "
                                                            "written in. Columns named like a field are found by "
                                                            "their name.")));
  gtk_box_append (GTK_BOX (box), GTK_WIDGET (self->columns_group));

  /* The check. */
  group = group_new (_("Check"), NULL);
  check_box = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  self->check_progress = GTK_PROGRESS_BAR (gtk_progress_bar_new ());
  gtk_widget_set_valign (GTK_WIDGET (self->check_progress), GTK_ALIGN_CENTER);
  gtk_widget_set_size_request (GTK_WIDGET (self->check_progress), 160, -1);
  self->check_button = GTK_BUTTON (gtk_button_new_with_mnemonic (_("C_heck")));
  gtk_actionable_set_action_name (GTK_ACTIONABLE (self->check_button), "assistant.check");
  gtk_widget_set_tooltip_text (GTK_WIDGET (self->check_button),
                               _("Import every row as chosen, report, and write nothing"));
  self->stop_button = GTK_BUTTON (gtk_button_new_with_mnemonic (_("_Stop")));
  gtk_actionable_set_action_name (GTK_ACTIONABLE (self->stop_button), "assistant.stop-check");
  gtk_box_append (GTK_BOX (check_box), GTK_WIDGET (self->check_progress));
  gtk_box_append (GTK_BOX (check_box), GTK_WIDGET (self->check_button));
  gtk_box_append (GTK_BOX (check_box), GTK_WIDGET (self->stop_button));
  adw_preferences_group_set_header_suffix (ADW_PREFERENCES_GROUP (group), check_box);
  self->check_label = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_wrap (self->check_label, TRUE);
  gtk_label_set_xalign (self->check_label, 0.0);
  gtk_label_set_selectable (self->check_label, TRUE);
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (group), GTK_WIDGET (self->check_label));
  self->rejections_label = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_xalign (self->rejections_label, 0.0);
  gtk_label_set_selectable (self->rejections_label, TRUE);
  gtk_widget_set_margin_top (GTK_WIDGET (self->rejections_label), 6);
  gtk_widget_add_css_class (GTK_WIDGET (self->rejections_label), "monospace");
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (group), GTK_WIDGET (self->rejections_label));
  gtk_box_append (GTK_BOX (box), group);

  adw_clamp_set_child (ADW_CLAMP (clamp), box);
  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (scroller), clamp);
  gtk_box_append (GTK_BOX (content), scroller);
  adw_window_set_content (ADW_WINDOW (self), content);
  clear_check (self);
}

SlImportDialog *
sl_import_dialog_open (SlWindow *window, const char *path)
{
  g_autoptr (GError) error = NULL;
  SlImportPreview *preview;
  SlImportDialog *self;
  SlImportOptions options;

  g_return_val_if_fail (SL_IS_WINDOW (window) && path != NULL, NULL);
  if (sl_window_get_project_path (window) == NULL)
    return NULL;
  /* The file as the importer reads it by itself: detected delimiter,
   * columns mapped by their names. */
  sl_import_options_init (&options);
  preview = sl_import_preview (path, &options, SL_IMPORT_DIALOG_ROWS, &error);
  if (preview == NULL)
    {
      sl_window_toast (window, error->message);
      return NULL;
    }

  self = g_object_new (SL_TYPE_IMPORT_DIALOG, NULL);
  gtk_window_set_transient_for (GTK_WINDOW (self), GTK_WINDOW (window));
  self->window = g_object_ref (window);
  self->path = g_strdup (path);
  self->preview = preview;
  adw_window_title_set_subtitle (self->title, preview->file_name);
  gtk_editable_set_text (GTK_EDITABLE (self->source_row), preview->file_name);

  self->updating++;
  for (guint i = 0; i < G_N_ELEMENTS (delimiters); i++)
    if (delimiters[i] == preview->delimiter)
      adw_combo_row_set_selected (self->delimiter_row, i);
  adw_action_row_set_subtitle (ADW_ACTION_ROW (self->delimiter_row), _("Detected from the header line"));
  self->updating--;

  build_column_rows (self);
  for (guint c = 0; c < self->choices->len; c++)
    describe_column (self, c);
  fill_rows_table (self);
  update_state (self);
  gtk_window_present (GTK_WINDOW (self));
  return self;
}

/* ------------------------------------------------------------------ */
/* For tests                                                          */

const SlImportPreview *
sl_import_dialog_get_preview (SlImportDialog *self)
{
  g_return_val_if_fail (SL_IS_IMPORT_DIALOG (self), NULL);
  return self->preview;
}

GtkDropDown *
sl_import_dialog_get_field_chooser (SlImportDialog *self, guint column)
{
  g_return_val_if_fail (SL_IS_IMPORT_DIALOG (self) && column < self->field_choosers->len, NULL);
  return g_ptr_array_index (self->field_choosers, column);
}

GtkDropDown *
sl_import_dialog_get_unit_chooser (SlImportDialog *self, guint column)
{
  g_return_val_if_fail (SL_IS_IMPORT_DIALOG (self) && column < self->unit_choosers->len, NULL);
  return g_ptr_array_index (self->unit_choosers, column);
}

gboolean
sl_import_dialog_is_checking (SlImportDialog *self)
{
  g_return_val_if_fail (SL_IS_IMPORT_DIALOG (self), FALSE);
  return self->check_cancel != NULL;
}

const char *
sl_import_dialog_get_check_summary (SlImportDialog *self)
{
  g_return_val_if_fail (SL_IS_IMPORT_DIALOG (self), NULL);
  return self->check_summary;
}

const char *
sl_import_dialog_get_problem (SlImportDialog *self)
{
  g_return_val_if_fail (SL_IS_IMPORT_DIALOG (self), NULL);
  return self->problem;
}
