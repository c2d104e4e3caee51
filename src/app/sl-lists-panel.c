/* sl-lists-panel.c: the Lists page: target lists and their members.
 *
 * Contents:
 *   reading ........... reload: the lists (a GtkListBox: few) and the
 *                       chosen list's members (a GtkColumnView over
 *                       SlListMembersModel: a list made from a condition
 *                       may hold a million stars)
 *   the views ......... the "Show" chooser: win.show-list
 *   editing a member .. a small dialog: priority, tags, notes
 *   export ............ CSV or LaTeX through sl_export, in a thread
 *   actions ........... win.create-list and the others, for the buttons,
 *                       the New List dialog, keyboard users and tests
 *
 * Every change calls src/core/lists.c (one transaction with its ledger
 * entry, as `starledger-cli select` and `lists` do); the window then reads
 * the ledger again, and the table and the views if they show that list.
 */
#include "sl-lists-panel.h"

#include <inttypes.h>
#include <glib/gi18n.h>
#include <string.h>

#include "export.h"
#include "lists.h"
#include "sl-list-members-model.h"
#include "sl-new-list-dialog.h"
#include "sl-window.h"

struct _SlListsPanel {
  GtkBox            parent_instance;

  SlWindow         *window;        /* not owned: the window owns the panel */
  GtkDropDown      *show;          /* "All stars", then every list */
  GtkStringList    *show_names;    /* owned (the chooser holds its own reference) */
  GtkListBox       *lists;
  GtkLabel         *members_title;
  GtkColumnView    *members_view;
  GtkSingleSelection *member_selection;
  GtkWidget        *edit_button;
  GtkWidget        *export_button;
  GtkWidget        *delete_button;
  GtkWidget        *add_button, *remove_button;

  GPtrArray        *infos;         /* SlListInfo, by name, as last read */
  SlListMembersModel *members;     /* of CURRENT, in the core's order (owned; the selection holds its own reference) */
  char             *current;       /* the list whose members are shown, or NULL */
  gboolean          updating;      /* the panel is changing its own widgets, or going: no reactions */
};

G_DEFINE_FINAL_TYPE (SlListsPanel, sl_lists_panel, GTK_TYPE_BOX)

static SlListsPanel *panel_of (SlWindow *window);

/* ------------------------------------------------------------------ */
/* Reading                                                            */

static const SlListInfo *
find_info (SlListsPanel *self, const char *name)
{
  for (guint i = 0; self->infos && name && i < self->infos->len; i++)
    {
      const SlListInfo *info = self->infos->pdata[i];

      if (strcmp (info->name, name) == 0)
        return info;
    }
  return NULL;
}

/* A compact row (the page shares its height with the members): the name
 * and the count, then what the list is for and how it was made. */
static GtkWidget *
list_row (const SlListInfo *info)
{
  GtkWidget *row = gtk_list_box_row_new ();
  GtkWidget *grid = gtk_grid_new ();
  GtkWidget *name = gtk_label_new (info->name);
  g_autofree char *count = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%" PRId64 " star",
                                                         "%" PRId64 " stars", info->n_stars),
                                            info->n_stars);
  GtkWidget *size = gtk_label_new (count);
  g_autoptr (GString) subtitle = g_string_new (NULL);
  GtkWidget *about;

  /* What the list is for, then how it was made. */
  if (info->description && *info->description)
    g_string_append (subtitle, info->description);
  if (info->condition)
    g_string_append_printf (subtitle, "%s%s %s", subtitle->len ? " · " : "", _("where"), info->condition);
  else
    g_string_append_printf (subtitle, "%s%s", subtitle->len ? " · " : "", _("chosen by hand"));
  if (info->n_stale > 0)
    g_string_append_printf (subtitle, " · %s", _("some values are stale"));
  about = gtk_label_new (subtitle->str);

  gtk_label_set_xalign (GTK_LABEL (name), 0.0);
  gtk_label_set_ellipsize (GTK_LABEL (name), PANGO_ELLIPSIZE_END);
  gtk_widget_set_hexpand (name, TRUE);
  gtk_widget_add_css_class (name, "heading");
  gtk_widget_add_css_class (size, "dim-label");
  gtk_label_set_xalign (GTK_LABEL (about), 0.0);
  gtk_label_set_ellipsize (GTK_LABEL (about), PANGO_ELLIPSIZE_END);
  gtk_widget_add_css_class (about, "dim-label");
  gtk_widget_add_css_class (about, "caption");
  gtk_grid_set_column_spacing (GTK_GRID (grid), 12);
  gtk_grid_attach (GTK_GRID (grid), name, 0, 0, 1, 1);
  gtk_grid_attach (GTK_GRID (grid), size, 1, 0, 1, 1);
  gtk_grid_attach (GTK_GRID (grid), about, 0, 1, 2, 1);
  gtk_widget_set_margin_top (grid, 2);
  gtk_widget_set_margin_bottom (grid, 2);
  gtk_list_box_row_set_child (GTK_LIST_BOX_ROW (row), grid);
  gtk_widget_set_tooltip_text (row, subtitle->str);
  g_object_set_data_full (G_OBJECT (row), "list-name", g_strdup (info->name), g_free);
  return row;
}

/* The buttons that need a chosen list or a chosen member. */
static void
update_sensitivity (SlListsPanel *self)
{
  gboolean has_list = self->current != NULL;

  /* The selection changes elsewhere: Add and Remove say so if it is empty. */
  gtk_widget_set_sensitive (self->delete_button, has_list);
  gtk_widget_set_sensitive (self->export_button, has_list);
  gtk_widget_set_sensitive (self->add_button, has_list);
  gtk_widget_set_sensitive (self->remove_button, has_list);
  gtk_widget_set_sensitive (self->edit_button,
                            has_list && gtk_single_selection_get_selected_item (self->member_selection) != NULL);
}

/* The members of the current list, from the core. */
static void
show_members (SlListsPanel *self, SlProject *project)
{
  GPtrArray *members = NULL;
  g_autoptr (GError) error = NULL;

  if (self->current && project)
    {
      members = sl_list_members (project, self->current, &error);
      if (members == NULL)
        sl_window_toast (self->window, error->message);
    }
  self->updating = TRUE;
  sl_list_members_model_set (self->members, members);
  gtk_single_selection_set_selected (self->member_selection, GTK_INVALID_LIST_POSITION);
  self->updating = FALSE;

  if (self->current)
    {
      const SlListInfo *info = find_info (self, self->current);
      g_autofree char *title = g_strdup_printf (_("Stars in “%s”, highest priority first"), self->current);

      gtk_label_set_text (self->members_title, info ? title : "");
    }
  else
    gtk_label_set_text (self->members_title, _("Choose a list to see its stars."));
  update_sensitivity (self);
}

/* The "Show" chooser: All stars, then the lists; keeps what the window shows. */
static void
fill_show_chooser (SlListsPanel *self)
{
  const char *shown = sl_window_get_shown_list (self->window);
  guint old = g_list_model_get_n_items (G_LIST_MODEL (self->show_names));
  g_autoptr (GStrvBuilder) builder = g_strv_builder_new ();
  g_auto (GStrv) names = NULL;
  guint selected = 0;

  g_strv_builder_add (builder, _("All stars"));
  for (guint i = 0; self->infos && i < self->infos->len; i++)
    {
      const SlListInfo *info = self->infos->pdata[i];

      g_strv_builder_add (builder, info->name);
      if (g_strcmp0 (shown, info->name) == 0)
        selected = i + 1;
    }
  names = g_strv_builder_end (builder);
  self->updating = TRUE;
  gtk_string_list_splice (self->show_names, 0, old, (const char *const *) names);
  gtk_drop_down_set_selected (self->show, selected);
  self->updating = FALSE;
}

void
sl_lists_panel_reload (SlListsPanel *self)
{
  const char *path;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  GtkWidget *child;

  g_return_if_fail (SL_IS_LISTS_PANEL (self));

  /* Going away. */
  if (self->show_names == NULL)
    return;
  path = sl_window_get_project_path (self->window);
  g_clear_pointer (&self->infos, g_ptr_array_unref);
  if (path)
    {
      project = sl_project_open (path, &error);
      if (project)
        self->infos = sl_list_infos (project, &error);
      if (error)
        sl_window_toast (self->window, error->message);
    }
  /* A list that is gone is no longer shown. */
  if (self->current && find_info (self, self->current) == NULL)
    g_clear_pointer (&self->current, g_free);

  self->updating = TRUE;
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->lists))))
    gtk_list_box_remove (self->lists, child);
  for (guint i = 0; self->infos && i < self->infos->len; i++)
    {
      GtkWidget *row = list_row (self->infos->pdata[i]);

      gtk_list_box_append (self->lists, row);
      if (g_strcmp0 (self->current, ((SlListInfo *) self->infos->pdata[i])->name) == 0)
        gtk_list_box_select_row (self->lists, GTK_LIST_BOX_ROW (row));
    }
  self->updating = FALSE;
  fill_show_chooser (self);
  show_members (self, project);
}

const char *
sl_lists_panel_get_current (SlListsPanel *self)
{
  g_return_val_if_fail (SL_IS_LISTS_PANEL (self), NULL);
  return self->current;
}

gboolean
sl_lists_panel_set_current (SlListsPanel *self, const char *name)
{
  g_return_val_if_fail (SL_IS_LISTS_PANEL (self), FALSE);

  if (name && find_info (self, name) == NULL)
    return FALSE;
  g_free (self->current);
  self->current = g_strdup (name);
  sl_lists_panel_reload (self);
  return TRUE;
}

static void
on_list_selected (GtkListBox *box, GtkListBoxRow *row, SlListsPanel *self)
{
  if (self->updating)
    return;
  sl_lists_panel_set_current (self, row ? g_object_get_data (G_OBJECT (row), "list-name") : NULL);
}

/* A member chosen in the panel is chosen everywhere; the panel stays in
 * front (choosing a star shows its Trail otherwise). */
static void
on_member_selected (SlListsPanel *self)
{
  GtkStringObject *item = gtk_single_selection_get_selected_item (self->member_selection);
  GtkWidget *notebook = gtk_widget_get_ancestor (GTK_WIDGET (self), GTK_TYPE_NOTEBOOK);
  const char *designations[2] = { NULL, NULL };

  if (self->updating)
    return;
  update_sensitivity (self);
  if (item == NULL)
    return;
  designations[0] = gtk_string_object_get_string (item);
  sl_window_set_selection (self->window, designations);
  if (notebook)
    gtk_notebook_set_current_page (GTK_NOTEBOOK (notebook),
                                   gtk_notebook_page_num (GTK_NOTEBOOK (notebook), GTK_WIDGET (self)));
  update_sensitivity (self);
}

/* ------------------------------------------------------------------ */
/* The views                                                          */

static void
on_show_changed (SlListsPanel *self)
{
  guint selected = gtk_drop_down_get_selected (self->show);
  const char *name = "";

  if (self->updating || selected == GTK_INVALID_LIST_POSITION)
    return;
  if (selected > 0)
    name = gtk_string_list_get_string (self->show_names, selected);
  gtk_widget_activate_action (GTK_WIDGET (self->window), "win.show-list", "s", name);
}

/* ------------------------------------------------------------------ */
/* The members' columns                                               */

typedef enum {
  MEMBER_DESIGNATION,
  MEMBER_PRIORITY,
  MEMBER_TAGS,
  MEMBER_NOTES,
} MemberColumn;

static void
setup_member_cell (GtkSignalListItemFactory *factory, GtkListItem *item, gpointer data)
{
  GtkWidget *label = gtk_label_new (NULL);

  gtk_label_set_xalign (GTK_LABEL (label), GPOINTER_TO_INT (data) == MEMBER_PRIORITY ? 1.0 : 0.0);
  gtk_label_set_ellipsize (GTK_LABEL (label), PANGO_ELLIPSIZE_END);
  gtk_list_item_set_child (item, label);
}

static void
bind_member_cell (GtkSignalListItemFactory *factory, GtkListItem *item, gpointer data)
{
  SlListsPanel *self = g_object_get_data (G_OBJECT (factory), "panel");
  const SlListMember *member = self->members ? sl_list_members_model_get_member (self->members,
                                                                                  gtk_list_item_get_position (item))
                                             : NULL;
  GtkLabel *label = GTK_LABEL (gtk_list_item_get_child (item));
  g_autofree char *priority = NULL;

  if (member == NULL)
    {
      gtk_label_set_text (label, "");
      return;
    }
  switch (GPOINTER_TO_INT (data))
    {
    case MEMBER_DESIGNATION:
      gtk_label_set_text (label, member->designation);
      break;
    case MEMBER_PRIORITY:
      priority = g_strdup_printf ("%" PRId64, member->priority);
      gtk_label_set_text (label, priority);
      break;
    case MEMBER_TAGS:
      gtk_label_set_text (label, member->tags ? member->tags : "");
      break;
    default:
      gtk_label_set_text (label, member->notes ? member->notes : "");
      gtk_widget_set_tooltip_text (GTK_WIDGET (label), member->notes && *member->notes ? member->notes : NULL);
      break;
    }
}

static void
add_member_column (SlListsPanel *self, const char *title, MemberColumn which, gboolean expand)
{
  GtkListItemFactory *factory = gtk_signal_list_item_factory_new ();
  GtkColumnViewColumn *column;

  g_object_set_data (G_OBJECT (factory), "panel", self);
  g_signal_connect (factory, "setup", G_CALLBACK (setup_member_cell), GINT_TO_POINTER (which));
  g_signal_connect (factory, "bind", G_CALLBACK (bind_member_cell), GINT_TO_POINTER (which));
  column = gtk_column_view_column_new (title, factory);
  gtk_column_view_column_set_expand (column, expand);
  gtk_column_view_column_set_resizable (column, TRUE);
  gtk_column_view_append_column (self->members_view, column);
  g_object_unref (column);
}

/* ------------------------------------------------------------------ */
/* Editing a member                                                   */

typedef struct {
  SlWindow       *window;
  char           *list;
  char           *designation;
  GtkSpinButton  *priority;
  GtkEntry       *tags, *notes;
} MemberForm;

static void
member_form_free (gpointer data, GClosure *closure)
{
  MemberForm *form = data;

  g_free (form->list);
  g_free (form->designation);
  g_free (form);
}

static void
on_member_response (AdwMessageDialog *dialog, const char *response, MemberForm *form)
{
  if (g_strcmp0 (response, "save") != 0)
    return;
  gtk_widget_activate_action (GTK_WIDGET (form->window), "win.set-list-member", "(ssxss)", form->list,
                              form->designation, (gint64) gtk_spin_button_get_value_as_int (form->priority),
                              gtk_editable_get_text (GTK_EDITABLE (form->tags)),
                              gtk_editable_get_text (GTK_EDITABLE (form->notes)));
}

static GtkWidget *
form_label (const char *text)
{
  GtkWidget *label = gtk_label_new (text);

  gtk_label_set_xalign (GTK_LABEL (label), 1.0);
  return label;
}

static void
edit_member (SlListsPanel *self)
{
  const SlListMember *member;
  MemberForm *form;
  GtkGrid *grid;
  AdwMessageDialog *dialog;
  g_autofree char *heading = NULL;

  if (self->current == NULL)
    return;
  member = sl_list_members_model_get_member (self->members, gtk_single_selection_get_selected (self->member_selection));
  if (member == NULL)
    return;
  form = g_new0 (MemberForm, 1);
  form->window = self->window;
  form->list = g_strdup (self->current);
  form->designation = g_strdup (member->designation);
  grid = GTK_GRID (gtk_grid_new ());
  gtk_grid_set_row_spacing (grid, 6);
  gtk_grid_set_column_spacing (grid, 12);
  form->priority = GTK_SPIN_BUTTON (gtk_spin_button_new_with_range (-1000, 1000, 1));
  gtk_spin_button_set_value (form->priority, (double) member->priority);
  form->tags = GTK_ENTRY (gtk_entry_new ());
  gtk_editable_set_text (GTK_EDITABLE (form->tags), member->tags ? member->tags : "");
  gtk_entry_set_placeholder_text (form->tags, _("for example: binary, spring"));
  form->notes = GTK_ENTRY (gtk_entry_new ());
  gtk_editable_set_text (GTK_EDITABLE (form->notes), member->notes ? member->notes : "");
  gtk_entry_set_placeholder_text (form->notes, _("for example: check the companion"));
  gtk_widget_set_hexpand (GTK_WIDGET (form->notes), TRUE);
  gtk_grid_attach (grid, form_label (_("Priority")), 0, 0, 1, 1);
  gtk_grid_attach (grid, GTK_WIDGET (form->priority), 1, 0, 1, 1);
  gtk_grid_attach (grid, form_label (_("Tags")), 0, 1, 1, 1);
  gtk_grid_attach (grid, GTK_WIDGET (form->tags), 1, 1, 1, 1);
  gtk_grid_attach (grid, form_label (_("Notes")), 0, 2, 1, 1);
  gtk_grid_attach (grid, GTK_WIDGET (form->notes), 1, 2, 1, 1);

  heading = g_strdup_printf (_("%s in %s"), member->designation, self->current);
  dialog = ADW_MESSAGE_DIALOG (adw_message_dialog_new (GTK_WINDOW (self->window), heading,
                                                       _("A higher priority is observed sooner. The change "
                                                         "is recorded in the ledger.")));
  adw_message_dialog_set_extra_child (dialog, GTK_WIDGET (grid));
  adw_message_dialog_add_responses (dialog, "cancel", _("_Cancel"), "save", _("_Save"), NULL);
  adw_message_dialog_set_response_appearance (dialog, "save", ADW_RESPONSE_SUGGESTED);
  adw_message_dialog_set_default_response (dialog, "save");
  g_signal_connect_data (dialog, "response", G_CALLBACK (on_member_response), form, member_form_free, 0);
  gtk_window_present (GTK_WINDOW (dialog));
}

static void
on_member_activated (GtkColumnView *view, guint position, SlListsPanel *self)
{
  edit_member (self);
}

/* ------------------------------------------------------------------ */
/* The buttons                                                        */

static void
on_delete_response (AdwMessageDialog *dialog, const char *response, SlListsPanel *self)
{
  const char *name = g_object_get_data (G_OBJECT (dialog), "list-name");

  if (g_strcmp0 (response, "delete") == 0)
    gtk_widget_activate_action (GTK_WIDGET (self->window), "win.delete-list", "s", name);
}

static void
on_delete_clicked (SlListsPanel *self)
{
  const SlListInfo *info = find_info (self, self->current);
  g_autofree char *heading = NULL;
  g_autofree char *body = NULL;
  AdwMessageDialog *dialog;

  if (info == NULL)
    return;
  heading = g_strdup_printf (_("Delete List %s?"), info->name);
  body = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                       "The list of %" PRId64 " star, with its priorities, tags and "
                                       "notes, is deleted. The stars stay in the project.",
                                       "The list of %" PRId64 " stars, with their priorities, tags and "
                                       "notes, is deleted. The stars stay in the project.", info->n_stars),
                          info->n_stars);
  dialog = ADW_MESSAGE_DIALOG (adw_message_dialog_new (GTK_WINDOW (self->window), heading, body));
  adw_message_dialog_add_responses (dialog, "cancel", _("_Cancel"), "delete", _("_Delete"), NULL);
  adw_message_dialog_set_response_appearance (dialog, "delete", ADW_RESPONSE_DESTRUCTIVE);
  adw_message_dialog_set_default_response (dialog, "cancel");
  g_object_set_data_full (G_OBJECT (dialog), "list-name", g_strdup (info->name), g_free);
  g_signal_connect (dialog, "response", G_CALLBACK (on_delete_response), self);
  gtk_window_present (GTK_WINDOW (dialog));
}

static void
on_add_clicked (SlListsPanel *self)
{
  if (self->current)
    gtk_widget_activate_action (GTK_WIDGET (self->window), "win.add-to-list", "s", self->current);
}

static void
on_remove_clicked (SlListsPanel *self)
{
  if (self->current)
    gtk_widget_activate_action (GTK_WIDGET (self->window), "win.remove-from-list", "s", self->current);
}

static GtkWidget *
button (const char *label, const char *tooltip)
{
  GtkWidget *widget = gtk_button_new_with_mnemonic (label);

  gtk_widget_set_tooltip_text (widget, tooltip);
  return widget;
}

/* ------------------------------------------------------------------ */
/* Export                                                             */

typedef struct {
  char          *project;
  char          *list;
  char          *file;
  SlExportFormat format;
} ExportJob;

static void
export_job_free (gpointer data)
{
  ExportJob *job = data;

  g_free (job->project);
  g_free (job->list);
  g_free (job->file);
  g_free (job);
}

static void
export_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  ExportJob *job = task_data;
  g_autoptr (SlProject) project = NULL;
  SlExportOptions options = { 0 };
  GError *error = NULL;
  gint64 n = -1;

  options.format = job->format;
  options.cancellable = cancellable;
  options.list = job->list;
  project = sl_project_open (job->project, &error);
  if (project)
    n = sl_export (project, job->file, &options, &error);
  if (n >= 0)
    g_task_return_int (task, n);
  else
    g_task_return_error (task, error);
}

static void
on_exported (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlWindow *window = SL_WINDOW (source);
  ExportJob *job = g_task_get_task_data (G_TASK (result));
  g_autoptr (GError) error = NULL;
  gssize n = g_task_propagate_int (G_TASK (result), &error);
  g_autofree char *base = NULL;
  g_autofree char *message = NULL;

  if (n < 0)
    {
      sl_window_toast (window, g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED)
                                 ? _("Export cancelled: no file was written")
                                 : error->message);
      return;
    }
  base = g_path_get_basename (job->file);
  message = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "Wrote %zd star to %s",
                                          "Wrote %zd stars to %s", n),
                             n, base);
  sl_window_toast (window, message);
}

/* Writes list LIST to FILE, LaTeX if its name ends in .tex, CSV otherwise. */
static gboolean
export_list (SlWindow *window, const char *list, const char *file)
{
  ExportJob *job = g_new0 (ExportJob, 1);
  g_autofree char *what = g_strdup_printf (_("Exporting %s…"), list);

  job->project = g_strdup (sl_window_get_project_path (window));
  job->list = g_strdup (list);
  job->file = g_strdup (file);
  job->format = g_str_has_suffix (file, ".tex") ? SL_EXPORT_TEX : SL_EXPORT_CSV;
  return sl_window_run_work (window, what, export_thread, job, export_job_free, on_exported, NULL);
}

static void
on_export_response (GtkNativeDialog *dialog, int response, SlWindow *window)
{
  const char *list = g_object_get_data (G_OBJECT (dialog), "list-name");

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (dialog));
      g_autofree char *path = g_file_get_path (file);
      GtkFileFilter *filter = gtk_file_chooser_get_filter (GTK_FILE_CHOOSER (dialog));
      gboolean tex = filter && g_strcmp0 (g_object_get_data (G_OBJECT (filter), "suffix"), ".tex") == 0;

      /* The chosen kind of file adds its suffix if the name has none. */
      if (path && !g_str_has_suffix (path, ".tex") && !g_str_has_suffix (path, ".csv"))
        {
          char *named = g_strconcat (path, tex ? ".tex" : ".csv", NULL);

          g_free (path);
          path = named;
        }
      if (path)
        export_list (window, list, path);
    }
  g_object_unref (dialog);
}

static GtkFileFilter *
export_filter (const char *name, const char *pattern, const char *suffix)
{
  GtkFileFilter *filter = gtk_file_filter_new ();

  gtk_file_filter_set_name (filter, name);
  gtk_file_filter_add_pattern (filter, pattern);
  g_object_set_data (G_OBJECT (filter), "suffix", (gpointer) suffix);
  return filter;
}

/* ------------------------------------------------------------------ */
/* Actions                                                            */

/* The open project for an action; NULL (and a toast) if there is none. */
static SlProject *
open_project (SlWindow *window)
{
  const char *path = sl_window_get_project_path (window);
  g_autoptr (GError) error = NULL;
  SlProject *project;

  if (path == NULL)
    return NULL;
  project = sl_project_open (path, &error);
  if (project == NULL)
    sl_window_toast (window, error->message);
  return project;
}

/* (name, description, condition, with-selection): the list of the stars
 * that satisfy the condition ("": none) and, with-selection, the stars
 * selected; as `select --where CONDITION --into NAME` when only a
 * condition is given. */
static void
create_list_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *window = SL_WINDOW (widget);
  const char *name, *description, *condition;
  gboolean with_selection;
  g_autoptr (GError) error = NULL;

  g_variant_get (parameter, "(&s&s&sb)", &name, &description, &condition, &with_selection);
  if (!sl_lists_panel_create_list (window, name, description, condition, with_selection, &error))
    sl_window_toast (window, error->message);
}

gboolean
sl_lists_panel_create_list (SlWindow *window, const char *name, const char *description, const char *condition,
                            gboolean with_selection, GError **error)
{
  g_autoptr (SlProject) project = NULL;
  const char *const *selection = with_selection ? sl_window_get_selection (window) : NULL;
  const char *const none[] = { NULL };
  g_autofree char *message = NULL;
  gint64 n;

  g_return_val_if_fail (SL_IS_WINDOW (window), FALSE);

  if (sl_window_get_project_path (window) == NULL)
    {
      g_set_error_literal (error, G_IO_ERROR, G_IO_ERROR_NOT_FOUND, _("No project is open"));
      return FALSE;
    }
  project = sl_project_open (sl_window_get_project_path (window), error);
  if (project == NULL)
    return FALSE;
  if (condition && *condition == '\0')
    condition = NULL;
  if (condition == NULL && with_selection && (selection == NULL || selection[0] == NULL))
    {
      g_set_error_literal (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                           _("Give a condition, or select stars to make the list of"));
      return FALSE;
    }
  n = sl_list_create_with_stars (project, name, condition, selection ? selection : none,
                                 description && *description ? description : NULL, error);
  if (n < 0)
    return FALSE;
  message = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "Made list %s of %" PRId64 " star",
                                          "Made list %s of %" PRId64 " stars", n),
                             name, n);
  sl_window_toast (window, message);
  g_free (panel_of (window)->current);
  panel_of (window)->current = g_strdup (name);
  sl_window_lists_changed (window, name);
  return TRUE;
}

/* (name): the table and the views show only that list; "": every star. */
static void
show_list_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *window = SL_WINDOW (widget);
  const char *name = g_variant_get_string (parameter, NULL);

  sl_window_show_list (window, *name ? name : NULL);
}

static void
change_members (SlWindow *window, const char *name, gboolean add)
{
  g_autoptr (SlProject) project = open_project (window);
  const char *const *selection = sl_window_get_selection (window);
  g_autoptr (GError) error = NULL;
  g_autofree char *message = NULL;
  gint64 n;

  if (project == NULL)
    return;
  if (selection == NULL || selection[0] == NULL)
    {
      sl_window_toast (window, _("Select stars in the table or a view first"));
      return;
    }
  n = add ? sl_list_add_stars (project, name, selection, &error)
          : sl_list_remove_stars (project, name, selection, &error);
  if (n < 0)
    {
      sl_window_toast (window, error->message);
      return;
    }
  if (add)
    message = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "Added %" PRId64 " star to %s",
                                            "Added %" PRId64 " stars to %s", n),
                               n, name);
  else
    message = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "Removed %" PRId64 " star from %s",
                                            "Removed %" PRId64 " stars from %s", n),
                               n, name);
  sl_window_toast (window, message);
  sl_window_lists_changed (window, name);
}

/* (name): the selected stars join (leave) the list. */
static void
add_to_list_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  change_members (SL_WINDOW (widget), g_variant_get_string (parameter, NULL), TRUE);
}

static void
remove_from_list_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  change_members (SL_WINDOW (widget), g_variant_get_string (parameter, NULL), FALSE);
}

/* (name): deletes the list without asking (the Delete List button asks). */
static void
delete_list_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *window = SL_WINDOW (widget);
  const char *name = g_variant_get_string (parameter, NULL);
  g_autoptr (SlProject) project = open_project (window);
  g_autoptr (GError) error = NULL;
  g_autofree char *message = NULL;

  if (project == NULL)
    return;
  if (!sl_list_delete (project, name, &error))
    {
      sl_window_toast (window, error->message);
      return;
    }
  message = g_strdup_printf (_("Deleted list %s"), name);
  sl_window_toast (window, message);
  if (g_strcmp0 (sl_window_get_shown_list (window), name) == 0)
    sl_window_show_list (window, NULL);
  sl_window_lists_changed (window, name);
}

/* (list, star, priority, tags, notes). */
static void
set_list_member_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *window = SL_WINDOW (widget);
  const char *name, *designation, *tags, *notes;
  gint64 priority;
  g_autoptr (SlProject) project = open_project (window);
  g_autoptr (GError) error = NULL;

  g_variant_get (parameter, "(&s&sx&s&s)", &name, &designation, &priority, &tags, &notes);
  if (project == NULL)
    return;
  if (!sl_list_set_member (project, name, designation, priority, tags, notes, &error))
    {
      sl_window_toast (window, error->message);
      return;
    }
  sl_window_lists_changed (window, name);
}

static void
new_list_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *window = SL_WINDOW (widget);

  if (sl_window_get_project_path (window) == NULL)
    return;
  sl_new_list_dialog_present (window);
}

/* Export…: the list the panel shows, CSV or LaTeX. */
static void
export_list_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  SlWindow *window = SL_WINDOW (widget);
  SlListsPanel *self = panel_of (window);
  GtkFileChooserNative *dialog;
  g_autoptr (GtkFileFilter) csv = NULL;
  g_autoptr (GtkFileFilter) tex = NULL;
  g_autofree char *title = NULL;
  g_autofree char *file = NULL;

  if (self->current == NULL)
    return;
  title = g_strdup_printf (_("Export List %s"), self->current);
  dialog = gtk_file_chooser_native_new (title, GTK_WINDOW (window), GTK_FILE_CHOOSER_ACTION_SAVE, _("_Export"),
                                        _("_Cancel"));
  csv = export_filter (_("CSV table (values with their 68% bounds)"), "*.csv", ".csv");
  tex = export_filter (_("LaTeX table (rounded to the uncertainty)"), "*.tex", ".tex");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (dialog), csv);
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (dialog), tex);
  file = g_strconcat (self->current, ".csv", NULL);
  g_strdelimit (file, "/\\", '-');
  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (dialog), file);
  g_object_set_data_full (G_OBJECT (dialog), "list-name", g_strdup (self->current), g_free);
  g_signal_connect (dialog, "response", G_CALLBACK (on_export_response), window);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (dialog));
}

/* (list, file): as Export… without the file chooser. */
static void
export_list_to_action (GtkWidget *widget, const char *action, GVariant *parameter)
{
  const char *name, *file;

  g_variant_get (parameter, "(&s&s)", &name, &file);
  export_list (SL_WINDOW (widget), name, file);
}

void
sl_lists_panel_install_actions (GtkWidgetClass *klass)
{
  gtk_widget_class_install_action (klass, "win.create-list", "(sssb)", create_list_action);
  gtk_widget_class_install_action (klass, "win.show-list", "s", show_list_action);
  gtk_widget_class_install_action (klass, "win.add-to-list", "s", add_to_list_action);
  gtk_widget_class_install_action (klass, "win.remove-from-list", "s", remove_from_list_action);
  gtk_widget_class_install_action (klass, "win.delete-list", "s", delete_list_action);
  gtk_widget_class_install_action (klass, "win.set-list-member", "(ssxss)", set_list_member_action);
  gtk_widget_class_install_action (klass, "win.new-list", NULL, new_list_action);
  gtk_widget_class_install_action (klass, "win.export-list", NULL, export_list_action);
  gtk_widget_class_install_action (klass, "win.export-list-to", "(ss)", export_list_to_action);
  gtk_widget_class_add_binding_action (klass, GDK_KEY_l, GDK_CONTROL_MASK | GDK_SHIFT_MASK, "win.new-list", NULL);
}

/* ------------------------------------------------------------------ */
/* Construction                                                       */

static SlListsPanel *
panel_of (SlWindow *window)
{
  return sl_window_get_lists_panel (window);
}

static void
sl_lists_panel_dispose (GObject *object)
{
  SlListsPanel *self = SL_LISTS_PANEL (object);

  /* The children going away emit their selection signals: not ours to follow. */
  self->updating = TRUE;
  g_clear_pointer (&self->infos, g_ptr_array_unref);
  g_clear_object (&self->members);
  g_clear_pointer (&self->current, g_free);
  g_clear_object (&self->show_names);
  G_OBJECT_CLASS (sl_lists_panel_parent_class)->dispose (object);
}

static void
sl_lists_panel_class_init (SlListsPanelClass *klass)
{
  G_OBJECT_CLASS (klass)->dispose = sl_lists_panel_dispose;
}

static GtkWidget *
scrolled (GtkWidget *child, int min_height)
{
  GtkWidget *window = gtk_scrolled_window_new ();

  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (window), child);
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (window), GTK_POLICY_NEVER, GTK_POLICY_AUTOMATIC);
  gtk_scrolled_window_set_min_content_height (GTK_SCROLLED_WINDOW (window), min_height);
  return window;
}

static void
sl_lists_panel_init (SlListsPanel *self)
{
  GtkWidget *top = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkWidget *buttons = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkWidget *member_bar = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkWidget *paned = gtk_paned_new (GTK_ORIENTATION_VERTICAL);
  GtkWidget *members_box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  GtkWidget *show_label = gtk_label_new_with_mnemonic (_("_Table and views show"));
  GtkWidget *new_button;
  GtkExpression *expression;

  gtk_orientable_set_orientation (GTK_ORIENTABLE (self), GTK_ORIENTATION_VERTICAL);

  /* What the table and the views show. */
  gtk_widget_set_margin_start (top, 8);
  gtk_widget_set_margin_end (top, 6);
  gtk_widget_set_margin_top (top, 4);
  gtk_widget_set_margin_bottom (top, 4);
  self->show_names = gtk_string_list_new (NULL);
  expression = gtk_property_expression_new (GTK_TYPE_STRING_OBJECT, NULL, "string");
  self->show = GTK_DROP_DOWN (gtk_drop_down_new (G_LIST_MODEL (g_object_ref (self->show_names)), expression));
  gtk_widget_set_name (GTK_WIDGET (self->show), "show-list");
  gtk_widget_set_tooltip_text (GTK_WIDGET (self->show), _("Show only one list's stars in the table and the views"));
  gtk_widget_set_hexpand (GTK_WIDGET (self->show), TRUE);
  gtk_label_set_mnemonic_widget (GTK_LABEL (show_label), GTK_WIDGET (self->show));
  gtk_box_append (GTK_BOX (top), show_label);
  gtk_box_append (GTK_BOX (top), GTK_WIDGET (self->show));
  g_signal_connect_swapped (self->show, "notify::selected", G_CALLBACK (on_show_changed), self);
  gtk_box_append (GTK_BOX (self), top);

  /* The lists and what can be done with them. */
  gtk_widget_set_margin_start (buttons, 8);
  gtk_widget_set_margin_end (buttons, 6);
  gtk_widget_set_margin_bottom (buttons, 4);
  new_button = button (_("_New List…"), _("Make a list from conditions on any column, the selection, or both"));
  gtk_actionable_set_action_name (GTK_ACTIONABLE (new_button), "win.new-list");
  self->add_button = button (_("_Add Selected"), _("Add the stars selected in the table or a view to this list"));
  self->remove_button = button (_("_Remove Selected"), _("Remove the selected stars from this list"));
  self->delete_button = button (_("_Delete…"), _("Delete this list (the stars stay in the project)"));
  gtk_widget_add_css_class (self->delete_button, "destructive-action");
  self->export_button = button (_("_Export…"), _("Write this list's stars as a CSV or LaTeX table"));
  gtk_actionable_set_action_name (GTK_ACTIONABLE (self->export_button), "win.export-list");
  g_signal_connect_swapped (self->add_button, "clicked", G_CALLBACK (on_add_clicked), self);
  g_signal_connect_swapped (self->remove_button, "clicked", G_CALLBACK (on_remove_clicked), self);
  g_signal_connect_swapped (self->delete_button, "clicked", G_CALLBACK (on_delete_clicked), self);
  gtk_box_append (GTK_BOX (buttons), new_button);
  gtk_box_append (GTK_BOX (buttons), self->add_button);
  gtk_box_append (GTK_BOX (buttons), self->remove_button);
  gtk_box_append (GTK_BOX (buttons), self->export_button);
  gtk_box_append (GTK_BOX (buttons), self->delete_button);
  gtk_box_append (GTK_BOX (self), buttons);

  self->lists = GTK_LIST_BOX (gtk_list_box_new ());
  gtk_widget_set_name (GTK_WIDGET (self->lists), "lists");
  gtk_list_box_set_selection_mode (self->lists, GTK_SELECTION_SINGLE);
  gtk_list_box_set_placeholder (self->lists, gtk_label_new (_("No lists yet: New List… makes one.")));
  gtk_widget_add_css_class (GTK_WIDGET (self->lists), "navigation-sidebar");
  g_signal_connect (self->lists, "row-selected", G_CALLBACK (on_list_selected), self);
  gtk_paned_set_start_child (GTK_PANED (paned), scrolled (GTK_WIDGET (self->lists), 60));
  gtk_paned_set_shrink_start_child (GTK_PANED (paned), FALSE);

  /* The chosen list's members. */
  gtk_widget_set_margin_start (member_bar, 8);
  gtk_widget_set_margin_end (member_bar, 6);
  gtk_widget_set_margin_top (member_bar, 4);
  gtk_widget_set_margin_bottom (member_bar, 4);
  self->members_title = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_xalign (self->members_title, 0.0);
  gtk_label_set_ellipsize (self->members_title, PANGO_ELLIPSIZE_END);
  gtk_widget_set_hexpand (GTK_WIDGET (self->members_title), TRUE);
  gtk_widget_add_css_class (GTK_WIDGET (self->members_title), "heading");
  self->edit_button = button (_("Ed_it Star…"), _("Set the chosen star's priority, tags and notes in this list"));
  g_signal_connect_swapped (self->edit_button, "clicked", G_CALLBACK (edit_member), self);
  gtk_box_append (GTK_BOX (member_bar), GTK_WIDGET (self->members_title));
  gtk_box_append (GTK_BOX (member_bar), self->edit_button);
  gtk_box_append (GTK_BOX (members_box), member_bar);

  self->members = sl_list_members_model_new ();
  self->member_selection = gtk_single_selection_new (G_LIST_MODEL (g_object_ref (self->members)));
  gtk_single_selection_set_autoselect (self->member_selection, FALSE);
  gtk_single_selection_set_can_unselect (self->member_selection, TRUE);
  g_signal_connect_swapped (self->member_selection, "notify::selected", G_CALLBACK (on_member_selected), self);
  self->members_view = GTK_COLUMN_VIEW (gtk_column_view_new (GTK_SELECTION_MODEL (self->member_selection)));
  gtk_widget_set_name (GTK_WIDGET (self->members_view), "list-members");
  gtk_column_view_set_show_column_separators (self->members_view, TRUE);
  add_member_column (self, _("Star"), MEMBER_DESIGNATION, FALSE);
  add_member_column (self, _("Priority"), MEMBER_PRIORITY, FALSE);
  add_member_column (self, _("Tags"), MEMBER_TAGS, FALSE);
  add_member_column (self, _("Notes"), MEMBER_NOTES, TRUE);
  g_signal_connect (self->members_view, "activate", G_CALLBACK (on_member_activated), self);
  {
    GtkWidget *members_scroll = scrolled (GTK_WIDGET (self->members_view), 48);

    gtk_widget_set_vexpand (members_scroll, TRUE);
    gtk_box_append (GTK_BOX (members_box), members_scroll);
  }
  gtk_paned_set_end_child (GTK_PANED (paned), members_box);
  gtk_paned_set_shrink_end_child (GTK_PANED (paned), FALSE);
  gtk_paned_set_position (GTK_PANED (paned), 130);
  gtk_widget_set_vexpand (paned, TRUE);
  gtk_box_append (GTK_BOX (self), paned);
}

SlListsPanel *
sl_lists_panel_new (SlWindow *window)
{
  SlListsPanel *self = g_object_new (SL_TYPE_LISTS_PANEL, NULL);

  self->window = window;
  fill_show_chooser (self);
  show_members (self, NULL);
  return self;
}
