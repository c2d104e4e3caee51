/* sl-matches-panel.c: the Matches page: rows joined to stars by position.
 *
 * Contents:
 *   reading ........... reload: the counts and a bounded list (at most
 *                       SL_MATCHES_PANEL_LIMIT rows, from match-list.c),
 *                       read in a thread, into a GtkListBox, ambiguous
 *                       rows first, a header above each group
 *   choosing .......... a row selects its star (and an ambiguous row's
 *                       candidates) in the table and every view
 *   splitting ......... the Split button and win.split-match, through
 *                       sl_match_split as `starledger-cli split`
 *
 * Bounded rather than paged: nobody reads a million matches one by one;
 * the counts say how many there are and the search finds the one wanted
 * (a row's own id or its star), so memory stays at a few hundred rows
 * however large the project.
 */
#include "sl-matches-panel.h"

#include <inttypes.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "match-list.h"
#include "sl-window.h"

#define PANEL_KEY "sl-matches-panel"

struct _SlMatchesPanel {
  GtkBox          parent_instance;

  SlWindow       *window;      /* not owned: the window owns the panel */
  GtkSearchEntry *search;
  GtkLabel       *counts;
  GtkListBox     *rows;
  GtkWidget      *split_button;
  GArray         *found;       /* SlMatchListRow, as listed */
  guint           generation;  /* of the latest read: older ones are dropped */
  gboolean        loading;     /* a read is running */
  gboolean        updating;    /* the panel is changing its own widgets: no reactions */
};

G_DEFINE_FINAL_TYPE (SlMatchesPanel, sl_matches_panel, GTK_TYPE_BOX)

/* ------------------------------------------------------------------ */
/* Reading                                                            */

static const SlMatchListRow *
row_at (SlMatchesPanel *self, guint i)
{
  return self->found && i < self->found->len ? &g_array_index (self->found, SlMatchListRow, i) : NULL;
}

static const SlMatchListRow *
chosen_row (SlMatchesPanel *self)
{
  GtkListBoxRow *row = gtk_list_box_get_selected_row (self->rows);

  return row ? row_at (self, (guint) gtk_list_box_row_get_index (row)) : NULL;
}

/* The row's headline and its details, as the list shows them. */
static void
describe (const SlMatchListRow *row, char **title, char **details)
{
  const SlMatchInfo *info = &row->info;
  g_autoptr (GString) text = g_string_new (NULL);

  g_string_append_printf (text, "%s:%u", info->file_name ? info->file_name : info->source_name, info->line);
  if (strcmp (info->status, "ambiguous") == 0)
    {
      *title = g_strdup_printf (_("%s: ambiguous, not merged"), info->row_designation);
      if (*row->candidates)
        g_string_append_printf (text, " · %s %s", _("candidates:"), row->candidates);
      if (info->reason && *info->reason)
        g_string_append_printf (text, " · %s", info->reason);
      g_string_append_printf (text, " · ");
      g_string_append_printf (text, _("kept as star %s"), info->star);
    }
  else if (strcmp (info->status, "matched") == 0)
    {
      char epoch[G_ASCII_DTOSTR_BUF_SIZE];

      *title = g_strdup_printf (_("%s → %s"), info->row_designation, info->star);
      g_string_append (text, " · ");
      if (isfinite (info->epoch))
        g_string_append_printf (text, _("%.3f arcsec apart at J%s"), info->separation,
                                g_ascii_formatd (epoch, sizeof epoch, "%.3f", info->epoch));
      else
        g_string_append_printf (text, _("%.3f arcsec apart, positions as given"), info->separation);
      g_string_append (text, " · ");
      g_string_append_printf (text, _("radius %g arcsec"), info->radius);
    }
  else
    {
      *title = g_strdup_printf (_("%s: split from %s"), info->row_designation,
                                info->other_star ? info->other_star : "?");
      g_string_append (text, " · ");
      g_string_append_printf (text, _("now star %s, split by %s at %s"), info->star,
                              info->split_by ? info->split_by : "?", info->split_at ? info->split_at : "?");
    }
  *details = g_string_free (g_steal_pointer (&text), FALSE);
}

static GtkWidget *
match_row (const SlMatchListRow *match)
{
  GtkWidget *row = gtk_list_box_row_new ();
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 2);
  g_autofree char *title = NULL;
  g_autofree char *details = NULL;
  GtkWidget *headline, *about;

  describe (match, &title, &details);
  headline = gtk_label_new (title);
  about = gtk_label_new (details);
  gtk_label_set_xalign (GTK_LABEL (headline), 0.0);
  gtk_label_set_ellipsize (GTK_LABEL (headline), PANGO_ELLIPSIZE_END);
  gtk_widget_add_css_class (headline, "heading");
  gtk_label_set_xalign (GTK_LABEL (about), 0.0);
  gtk_label_set_wrap (GTK_LABEL (about), TRUE);
  gtk_label_set_wrap_mode (GTK_LABEL (about), PANGO_WRAP_WORD_CHAR);
  gtk_widget_add_css_class (about, "dim-label");
  gtk_widget_add_css_class (about, "caption");
  gtk_box_append (GTK_BOX (box), headline);
  gtk_box_append (GTK_BOX (box), about);
  gtk_widget_set_margin_top (box, 3);
  gtk_widget_set_margin_bottom (box, 3);
  gtk_list_box_row_set_child (GTK_LIST_BOX_ROW (row), box);
  gtk_widget_set_tooltip_text (row, details);
  return row;
}

/* A heading above each group: ambiguous, joined, split. */
static void
update_header (GtkListBoxRow *row, GtkListBoxRow *before, gpointer data)
{
  SlMatchesPanel *self = data;
  const SlMatchListRow *match = row_at (self, (guint) gtk_list_box_row_get_index (row));
  const SlMatchListRow *previous = before ? row_at (self, (guint) gtk_list_box_row_get_index (before)) : NULL;
  const char *text;
  GtkWidget *label;

  if (match == NULL || (previous && strcmp (previous->info.status, match->info.status) == 0))
    {
      gtk_list_box_row_set_header (row, NULL);
      return;
    }
  if (strcmp (match->info.status, "ambiguous") == 0)
    text = _("Ambiguous: not merged, for you to look at");
  else if (strcmp (match->info.status, "matched") == 0)
    text = _("Joined to a star by position");
  else
    text = _("Split: stars of their own again");
  label = gtk_label_new (text);
  gtk_label_set_xalign (GTK_LABEL (label), 0.0);
  gtk_widget_add_css_class (label, "heading");
  gtk_widget_add_css_class (label, "dim-label");
  gtk_widget_set_margin_start (label, 6);
  gtk_widget_set_margin_top (label, 8);
  gtk_widget_set_margin_bottom (label, 2);
  gtk_list_box_row_set_header (row, label);
}

static void
update_sensitivity (SlMatchesPanel *self)
{
  const SlMatchListRow *row = chosen_row (self);

  gtk_widget_set_sensitive (self->split_button, row != NULL && strcmp (row->info.status, "matched") == 0);
}

static void
show_counts (SlMatchesPanel *self, const SlMatchCounts *counts, gboolean more)
{
  g_autoptr (GString) text = g_string_new (NULL);

  if (counts->matched + counts->ambiguous + counts->split == 0)
    {
      gtk_label_set_text (self->counts, "");
      return;
    }
  g_string_append_printf (text, _("%" PRId64 " joined by position · %" PRId64 " ambiguous · %" PRId64 " split"),
                          counts->matched, counts->ambiguous, counts->split);
  if (more)
    {
      g_string_append_c (text, '\n');
      g_string_append_printf (text, _("Showing the first %u: search for a row's id or a star to find others."),
                              SL_MATCHES_PANEL_LIMIT);
    }
  gtk_label_set_text (self->counts, text->str);
}

/* What a reload reads, in a thread: at a million matches the counts and
 * a search take a second, which the window must not freeze for. */
typedef struct {
  char         *path;
  char         *search;
  guint         generation;
  SlMatchCounts counts;
  GArray       *found;
  gboolean      more;
} ReadJob;

static void
read_job_free (gpointer data)
{
  ReadJob *job = data;

  g_free (job->path);
  g_free (job->search);
  g_clear_pointer (&job->found, g_array_unref);
  g_free (job);
}

static void
read_thread (GTask *task, gpointer source, gpointer data, GCancellable *cancellable)
{
  ReadJob *job = data;
  g_autoptr (SlProject) project = NULL;
  GError *error = NULL;

  project = sl_project_open (job->path, &error);
  if (project && sl_match_counts (project, &job->counts, &error))
    job->found = sl_match_list (project, job->search, SL_MATCHES_PANEL_LIMIT, &job->more, &error);
  if (error)
    g_task_return_error (task, error);
  else
    g_task_return_boolean (task, TRUE);
}

static void
show_found (SlMatchesPanel *self, GArray *found, const SlMatchCounts *counts, gboolean more)
{
  GtkWidget *child;

  g_clear_pointer (&self->found, g_array_unref);
  self->found = found;
  self->updating = TRUE;
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->rows))))
    gtk_list_box_remove (self->rows, child);
  for (guint i = 0; self->found && i < self->found->len; i++)
    gtk_list_box_append (self->rows, match_row (row_at (self, i)));
  self->updating = FALSE;
  show_counts (self, counts, more);
  update_sensitivity (self);
}

static void
on_read (GObject *source, GAsyncResult *result, gpointer data)
{
  SlMatchesPanel *self = SL_MATCHES_PANEL (source);
  ReadJob *job = g_task_get_task_data (G_TASK (result));
  g_autoptr (GError) error = NULL;

  g_task_propagate_boolean (G_TASK (result), &error);
  /* Gone, or a newer read is on its way. */
  if (self->rows == NULL || job->generation != self->generation)
    return;
  self->loading = FALSE;
  if (error)
    {
      SlMatchCounts none = { 0 };

      sl_window_toast (self->window, error->message);
      show_found (self, NULL, &none, FALSE);
      return;
    }
  show_found (self, g_steal_pointer (&job->found), &job->counts, job->more);
}

void
sl_matches_panel_reload (SlMatchesPanel *self)
{
  const char *path;
  g_autoptr (GTask) task = NULL;
  ReadJob *job;

  g_return_if_fail (SL_IS_MATCHES_PANEL (self));

  /* Going away. */
  if (self->rows == NULL)
    return;
  self->generation++;
  path = sl_window_get_project_path (self->window);
  if (path == NULL)
    {
      SlMatchCounts none = { 0 };

      self->loading = FALSE;
      show_found (self, NULL, &none, FALSE);
      return;
    }
  job = g_new0 (ReadJob, 1);
  job->path = g_strdup (path);
  job->search = g_strdup (gtk_editable_get_text (GTK_EDITABLE (self->search)));
  job->generation = self->generation;
  self->loading = TRUE;
  task = g_task_new (self, NULL, on_read, NULL);
  g_task_set_task_data (task, job, read_job_free);
  g_task_run_in_thread (task, read_thread);
}

gboolean
sl_matches_panel_is_loading (SlMatchesPanel *self)
{
  return self->loading;
}

/* ------------------------------------------------------------------ */
/* Choosing                                                           */

/* The row's star, and for an ambiguous row its candidates, for the
 * user to compare; for a split row the star it left too. */
static void
on_row_selected (GtkListBox *box, GtkListBoxRow *selected, SlMatchesPanel *self)
{
  const SlMatchListRow *row;
  g_autoptr (GStrvBuilder) builder = NULL;
  g_auto (GStrv) designations = NULL;
  GtkWidget *notebook;

  if (self->updating)
    return;
  update_sensitivity (self);
  row = chosen_row (self);
  if (row == NULL)
    return;
  builder = g_strv_builder_new ();
  g_strv_builder_add (builder, row->info.star);
  if (strcmp (row->info.status, "ambiguous") == 0)
    g_strv_builder_addv (builder, (const char **) row->candidate_ids);
  else if (row->info.other_star)
    g_strv_builder_add (builder, row->info.other_star);
  designations = g_strv_builder_end (builder);
  sl_window_set_selection (self->window, (const char *const *) designations);
  /* Selecting shows the Trail; the user is working through this list. */
  notebook = gtk_widget_get_ancestor (GTK_WIDGET (self), GTK_TYPE_NOTEBOOK);
  if (notebook)
    gtk_notebook_set_current_page (GTK_NOTEBOOK (notebook),
                                   gtk_notebook_page_num (GTK_NOTEBOOK (notebook), GTK_WIDGET (self)));
}

static void
on_search_changed (SlMatchesPanel *self)
{
  /* Setting the text empties it first, which a search entry reports at
   * once: not a search of its own. */
  if (self->updating)
    return;
  sl_matches_panel_reload (self);
}

/* ------------------------------------------------------------------ */
/* Splitting                                                          */

static char *
row_ref (const SlMatchListRow *row)
{
  return g_strdup_printf ("%" PRId64 ":%u", row->info.source_id, row->info.line);
}

static void
on_split_clicked (SlMatchesPanel *self)
{
  const SlMatchListRow *row = chosen_row (self);
  g_autofree char *ref = NULL;

  if (row == NULL)
    return;
  ref = row_ref (row);
  gtk_widget_activate_action (GTK_WIDGET (self), "win.split-match", "s", ref);
}

/* ("SOURCE:LINE"): that row becomes a star of its own again. */
static void
split_match_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *window = SL_WINDOW (widget);
  const char *text = g_variant_get_string (parameter, NULL);
  const char *path = sl_window_get_project_path (window);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GPtrArray) designations = g_ptr_array_new_with_free_func (g_free);
  g_autoptr (GError) error = NULL;
  g_autofree char *message = NULL;
  SlRowRef ref = { 0 };

  if (path == NULL || sl_window_is_working (window))
    {
      if (path)
        sl_window_toast (window, _("Wait for the running job to finish, or cancel it"));
      return;
    }
  if (!sl_row_ref_parse (text, &ref, &error)
      || (project = sl_project_open (path, &error)) == NULL
      || !sl_match_split (project, &ref, 1, designations, &error))
    {
      sl_row_ref_clear (&ref);
      sl_window_toast (window, error->message);
      return;
    }
  sl_row_ref_clear (&ref);
  message = g_strdup_printf (_("Split row %s: it is star %s again; derive to update the star it left"), text,
                             designations->len ? (const char *) designations->pdata[0] : "?");
  sl_window_toast (window, message);
  sl_window_reload (window);
}

void
sl_matches_panel_install_actions (GtkWidgetClass *klass)
{
  gtk_widget_class_install_action (klass, "win.split-match", "s", split_match_action);
}

/* ------------------------------------------------------------------ */
/* For tests                                                          */

SlMatchesPanel *
sl_matches_panel_of (SlWindow *window)
{
  return g_object_get_data (G_OBJECT (window), PANEL_KEY);
}

void
sl_matches_panel_set_search (SlMatchesPanel *self, const char *text)
{
  g_return_if_fail (SL_IS_MATCHES_PANEL (self));
  /* Typing waits a moment before search-changed; a test does not. */
  self->updating = TRUE;
  gtk_editable_set_text (GTK_EDITABLE (self->search), text);
  self->updating = FALSE;
  sl_matches_panel_reload (self);
}

guint
sl_matches_panel_get_n_rows (SlMatchesPanel *self)
{
  return self->found ? self->found->len : 0;
}

const char *
sl_matches_panel_get_status (SlMatchesPanel *self, guint i)
{
  const SlMatchListRow *row = row_at (self, i);

  return row ? row->info.status : NULL;
}

char *
sl_matches_panel_get_ref (SlMatchesPanel *self, guint i)
{
  const SlMatchListRow *row = row_at (self, i);

  return row ? row_ref (row) : NULL;
}

char *
sl_matches_panel_get_text (SlMatchesPanel *self, guint i)
{
  const SlMatchListRow *row = row_at (self, i);
  g_autofree char *title = NULL;
  g_autofree char *details = NULL;

  if (row == NULL)
    return NULL;
  describe (row, &title, &details);
  return g_strconcat (title, "\n", details, NULL);
}

void
sl_matches_panel_choose (SlMatchesPanel *self, guint i)
{
  GtkListBoxRow *row = gtk_list_box_get_row_at_index (self->rows, (int) i);

  gtk_list_box_select_row (self->rows, row);
}

const char *
sl_matches_panel_get_counts (SlMatchesPanel *self)
{
  return gtk_label_get_text (self->counts);
}

/* ------------------------------------------------------------------ */
/* Construction                                                       */

static void
sl_matches_panel_dispose (GObject *object)
{
  SlMatchesPanel *self = SL_MATCHES_PANEL (object);

  self->updating = TRUE;
  self->rows = NULL;
  g_clear_pointer (&self->found, g_array_unref);
  G_OBJECT_CLASS (sl_matches_panel_parent_class)->dispose (object);
}

static void
sl_matches_panel_class_init (SlMatchesPanelClass *klass)
{
  G_OBJECT_CLASS (klass)->dispose = sl_matches_panel_dispose;
}

static void
sl_matches_panel_init (SlMatchesPanel *self)
{
  GtkWidget *top = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkWidget *scroll = gtk_scrolled_window_new ();
  GtkWidget *placeholder;

  gtk_orientable_set_orientation (GTK_ORIENTABLE (self), GTK_ORIENTATION_VERTICAL);

  gtk_widget_set_margin_start (top, 8);
  gtk_widget_set_margin_end (top, 6);
  gtk_widget_set_margin_top (top, 4);
  gtk_widget_set_margin_bottom (top, 4);
  self->search = GTK_SEARCH_ENTRY (gtk_search_entry_new ());
  gtk_widget_set_name (GTK_WIDGET (self->search), "match-search");
  g_object_set (self->search, "placeholder-text", _("Search a row's id or a star"), NULL);
  gtk_widget_set_hexpand (GTK_WIDGET (self->search), TRUE);
  g_signal_connect_swapped (self->search, "search-changed", G_CALLBACK (on_search_changed), self);
  self->split_button = gtk_button_new_with_mnemonic (_("_Split Row"));
  gtk_widget_set_tooltip_text (self->split_button,
                               _("Make the chosen row a star of its own again (as starledger-cli split); "
                                 "the star it leaves must be derived again"));
  gtk_widget_add_css_class (self->split_button, "destructive-action");
  g_signal_connect_swapped (self->split_button, "clicked", G_CALLBACK (on_split_clicked), self);
  gtk_box_append (GTK_BOX (top), GTK_WIDGET (self->search));
  gtk_box_append (GTK_BOX (top), self->split_button);
  gtk_box_append (GTK_BOX (self), top);

  self->counts = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_xalign (self->counts, 0.0);
  gtk_label_set_wrap (self->counts, TRUE);
  gtk_widget_add_css_class (GTK_WIDGET (self->counts), "caption");
  gtk_widget_set_margin_start (GTK_WIDGET (self->counts), 8);
  gtk_widget_set_margin_end (GTK_WIDGET (self->counts), 6);
  gtk_widget_set_margin_bottom (GTK_WIDGET (self->counts), 4);
  gtk_box_append (GTK_BOX (self), GTK_WIDGET (self->counts));

  self->rows = GTK_LIST_BOX (gtk_list_box_new ());
  gtk_widget_set_name (GTK_WIDGET (self->rows), "matches");
  gtk_list_box_set_selection_mode (self->rows, GTK_SELECTION_SINGLE);
  placeholder = gtk_label_new (_("No rows joined by position. Import a catalogue that names stars "
                                 "differently with a match radius (starledger-cli import --match-radius) "
                                 "and its matches show here."));
  gtk_label_set_wrap (GTK_LABEL (placeholder), TRUE);
  gtk_widget_add_css_class (placeholder, "dim-label");
  gtk_widget_set_margin_start (placeholder, 12);
  gtk_widget_set_margin_end (placeholder, 12);
  gtk_widget_set_margin_top (placeholder, 12);
  gtk_list_box_set_placeholder (self->rows, placeholder);
  gtk_list_box_set_header_func (self->rows, update_header, self, NULL);
  gtk_widget_add_css_class (GTK_WIDGET (self->rows), "navigation-sidebar");
  g_signal_connect (self->rows, "row-selected", G_CALLBACK (on_row_selected), self);
  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (scroll), GTK_WIDGET (self->rows));
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (scroll), GTK_POLICY_NEVER, GTK_POLICY_AUTOMATIC);
  gtk_widget_set_vexpand (scroll, TRUE);
  gtk_box_append (GTK_BOX (self), scroll);
}

SlMatchesPanel *
sl_matches_panel_new (SlWindow *window)
{
  SlMatchesPanel *self = g_object_new (SL_TYPE_MATCHES_PANEL, NULL);

  self->window = window;
  g_object_set_data (G_OBJECT (window), PANEL_KEY, self);
  sl_matches_panel_reload (self);
  return self;
}
