/* sl-new-list-dialog.c: the New List dialog (sl-new-list-dialog.h).
 *
 * Contents:
 *   comparisons ...... what each kind of name (condition.h) can be compared with
 *   the builder ...... rows of column, comparison and value; their text
 *   the count ........ sl_list_count_matching in a thread, shortly after each change
 *   creating ......... sl_lists_panel_create_list
 *
 * The rows write the condition's text; the text is what is counted and
 * what the list is made from, so a person may also edit it by hand for
 * what rows cannot say (a mix of and, or and not, parentheses).  The
 * names come from the core (sl_condition_names), never from a list here.
 * Widgets tests look for carry names: list-name, condition-combine,
 * condition-column, condition-op, condition-value, add-condition,
 * condition-text, match-count, with-selection, create-list.
 */
#include "sl-new-list-dialog.h"

#include <glib/gi18n.h>
#include <string.h>

#include "condition.h"
#include "lists.h"
#include "sl-lists-panel.h"
#include "sl-window.h"

/* Long enough to wait for a pause in typing, short enough to feel live. */
#define COUNT_DELAY_MS 200

/* ------------------------------------------------------------------ */
/* Comparisons                                                        */

typedef struct {
  const char *label;    /* shown, translated */
  const char *syntax;   /* in the condition language */
} Comparison;

static const Comparison number_comparisons[] = {
  { "<", "<" }, { "≤", "<=" }, { "=", "=" }, { "≥", ">=" }, { ">", ">" }, { "≠", "!=" },
  { N_("is missing"), "is missing" }, { N_("is not missing"), "is not missing" },
};

static const Comparison text_comparisons[] = {
  { N_("is"), "=" }, { N_("is not"), "!=" }, { N_("contains"), "~" },
  { N_("is missing"), "is missing" }, { N_("is not missing"), "is not missing" },
};

static const Comparison flag_comparisons[] = {
  { N_("is raised"), "" }, { N_("is not raised"), "not" },
};

static const Comparison *
comparisons (SlConditionNameKind kind, guint *n)
{
  switch (kind)
    {
    case SL_CONDITION_NAME_NUMBER:
      *n = G_N_ELEMENTS (number_comparisons);
      return number_comparisons;
    case SL_CONDITION_NAME_TEXT:
      *n = G_N_ELEMENTS (text_comparisons);
      return text_comparisons;
    default:
      *n = G_N_ELEMENTS (flag_comparisons);
      return flag_comparisons;
    }
}

/* ------------------------------------------------------------------ */
/* The dialog's state                                                 */

typedef struct {
  SlWindow       *window;
  GtkWindow      *dialog;
  AdwEntryRow    *name, *description;
  GtkDropDown    *combine;          /* 0: all of, 1: any of */
  GtkBox         *rows;             /* one GtkBox per condition row */
  GtkEntry       *condition;
  GtkLabel       *status;
  GtkCheckButton *with_selection;
  GtkWidget      *create;
  GArray         *names;            /* SlConditionName */
  GtkStringList  *name_list;        /* their names, for the column choosers */
  guint           count_source;
  guint           generation;       /* of the text, for the counts in flight */
  gboolean        closed;           /* the widgets are gone; a count in flight keeps the state */
  gboolean        writing;          /* the rows are writing the text */
  gboolean        condition_ok;     /* the text compiled at the last count */
} NewList;

static void
new_list_free (gpointer data)
{
  NewList *self = data;

  if (self->count_source)
    g_source_remove (self->count_source);
  g_clear_pointer (&self->names, g_array_unref);
  g_clear_object (&self->name_list);
  g_free (self);
}

static const SlConditionName *
name_at (NewList *self, guint position)
{
  if (position >= self->names->len)
    return NULL;
  return &g_array_index (self->names, SlConditionName, position);
}

/* ------------------------------------------------------------------ */
/* The builder                                                        */

/* One row's text in the condition language, or NULL if it says nothing yet. */
static char *
row_text (NewList *self, GtkWidget *row)
{
  GtkDropDown *column = g_object_get_data (G_OBJECT (row), "column");
  GtkDropDown *op = g_object_get_data (G_OBJECT (row), "op");
  GtkEditable *value = g_object_get_data (G_OBJECT (row), "value");
  const SlConditionName *name = name_at (self, gtk_drop_down_get_selected (column));
  const Comparison *table;
  const char *syntax;
  g_autofree char *written = NULL;
  guint n, which = gtk_drop_down_get_selected (op);

  if (name == NULL)
    return NULL;
  table = comparisons (name->kind, &n);
  if (which >= n)
    return NULL;
  syntax = table[which].syntax;
  if (name->kind == SL_CONDITION_NAME_FLAG)
    return g_strdup_printf ("%s%sflag:%s", syntax, *syntax ? " " : "", name->name);
  if (g_str_has_prefix (syntax, "is "))
    return g_strdup_printf ("%s %s", name->name, syntax);
  written = g_strstrip (g_strdup (gtk_editable_get_text (value)));
  if (*written == '\0')
    return NULL;
  if (name->kind == SL_CONDITION_NAME_TEXT)
    {
      g_autofree char *quoted = sl_condition_quote (written);

      return g_strdup_printf ("%s %s %s", name->name, syntax, quoted);
    }
  /* A number as written: the compiler says what is wrong with it. */
  return g_strdup_printf ("%s %s %s", name->name, syntax, written);
}

/* Writes the rows' condition into the text. */
static void
write_condition (NewList *self)
{
  g_autoptr (GString) text = g_string_new (NULL);
  const char *join = gtk_drop_down_get_selected (self->combine) == 1 ? " or " : " and ";

  for (GtkWidget *row = gtk_widget_get_first_child (GTK_WIDGET (self->rows)); row;
       row = gtk_widget_get_next_sibling (row))
    {
      g_autofree char *part = row_text (self, row);

      if (part == NULL)
        continue;
      if (text->len)
        g_string_append (text, join);
      g_string_append (text, part);
    }
  self->writing = TRUE;
  gtk_editable_set_text (GTK_EDITABLE (self->condition), text->str);
  self->writing = FALSE;
}

/* The comparisons of the column's kind; the value entry only where one is read. */
static void
update_row (NewList *self, GtkWidget *row, gboolean kind_changed)
{
  GtkDropDown *column = g_object_get_data (G_OBJECT (row), "column");
  GtkDropDown *op = g_object_get_data (G_OBJECT (row), "op");
  GtkWidget *value = g_object_get_data (G_OBJECT (row), "value");
  const SlConditionName *name = name_at (self, gtk_drop_down_get_selected (column));
  const Comparison *table;
  guint n, which;

  if (name == NULL)
    return;
  table = comparisons (name->kind, &n);
  if (kind_changed)
    {
      g_autoptr (GtkStringList) labels = gtk_string_list_new (NULL);

      for (guint i = 0; i < n; i++)
        gtk_string_list_append (labels, _(table[i].label));
      gtk_drop_down_set_model (op, G_LIST_MODEL (labels));
      gtk_drop_down_set_selected (op, 0);
      gtk_editable_set_text (GTK_EDITABLE (value), "");
      gtk_entry_set_placeholder_text (GTK_ENTRY (value), name->kind == SL_CONDITION_NAME_TEXT ? _("text")
                                                                                              : _("number"));
    }
  which = gtk_drop_down_get_selected (op);
  gtk_widget_set_visible (value, name->kind != SL_CONDITION_NAME_FLAG && which < n
                                   && !g_str_has_prefix (table[which].syntax, "is "));
}

static void
on_column_changed (GtkDropDown *column, GParamSpec *pspec, NewList *self)
{
  GtkWidget *row = gtk_widget_get_parent (GTK_WIDGET (column));
  SlConditionNameKind before = GPOINTER_TO_UINT (g_object_get_data (G_OBJECT (row), "kind"));
  const SlConditionName *name = name_at (self, gtk_drop_down_get_selected (column));

  if (name == NULL)
    return;
  g_object_set_data (G_OBJECT (row), "kind", GUINT_TO_POINTER (name->kind));
  update_row (self, row, name->kind != before);
  write_condition (self);
}

static void
on_row_changed (GtkWidget *widget, GParamSpec *pspec, NewList *self)
{
  update_row (self, gtk_widget_get_parent (widget), FALSE);
  write_condition (self);
}

static void
on_value_changed (GtkEditable *value, NewList *self)
{
  write_condition (self);
}

static void
on_remove_row (GtkButton *button, NewList *self)
{
  gtk_box_remove (self->rows, gtk_widget_get_parent (GTK_WIDGET (button)));
  write_condition (self);
}

static guint
find_name (NewList *self, const char *wanted)
{
  for (guint i = 0; i < self->names->len; i++)
    if (strcmp (name_at (self, i)->name, wanted) == 0)
      return i;
  return 0;
}

/* In the open chooser each name comes with what it is, so that "plx_snr"
 * or "ebv" need not be known by heart; the button shows the name only. */
static void
setup_name_item (GtkSignalListItemFactory *factory, GtkListItem *item, gpointer data)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  GtkWidget *name = gtk_label_new (NULL);
  GtkWidget *about = gtk_label_new (NULL);

  gtk_label_set_xalign (GTK_LABEL (name), 0.0);
  gtk_label_set_xalign (GTK_LABEL (about), 0.0);
  gtk_label_set_wrap (GTK_LABEL (about), TRUE);
  gtk_label_set_max_width_chars (GTK_LABEL (about), 48);
  gtk_widget_set_size_request (box, 300, -1);
  gtk_widget_add_css_class (about, "dim-label");
  gtk_widget_add_css_class (about, "caption");
  gtk_box_append (GTK_BOX (box), name);
  gtk_box_append (GTK_BOX (box), about);
  gtk_list_item_set_child (item, box);
}

static void
bind_name_item (GtkSignalListItemFactory *factory, GtkListItem *item, NewList *self)
{
  GtkWidget *box = gtk_list_item_get_child (item);
  GtkLabel *name = GTK_LABEL (gtk_widget_get_first_child (box));
  GtkLabel *about = GTK_LABEL (gtk_widget_get_last_child (box));
  /* By name: while searching, positions are those of the matches. */
  const char *wanted = gtk_string_object_get_string (gtk_list_item_get_item (item));
  const SlConditionName *entry = name_at (self, find_name (self, wanted));
  g_autoptr (GString) text = g_string_new (NULL);

  if (entry == NULL)
    return;
  gtk_label_set_text (name, entry->name);
  if (entry->bound < 0)
    g_string_append (text, _("lower bound (68%) of: "));
  else if (entry->bound > 0)
    g_string_append (text, _("upper bound (68%) of: "));
  if (entry->description)
    g_string_append (text, _(entry->description));
  if (*entry->unit)
    g_string_append_printf (text, " [%s]", entry->unit);
  if (entry->kind == SL_CONDITION_NAME_FLAG)
    g_string_prepend (text, _("flag: "));
  gtk_label_set_text (about, text->str);
}


static void
add_row (NewList *self)
{
  GtkWidget *row = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkExpression *expression = gtk_property_expression_new (GTK_TYPE_STRING_OBJECT, NULL, "string");
  GtkWidget *column = gtk_drop_down_new (G_LIST_MODEL (g_object_ref (self->name_list)), expression);
  GtkWidget *op = gtk_drop_down_new (NULL, NULL);
  GtkWidget *value = gtk_entry_new ();
  GtkWidget *remove = gtk_button_new_from_icon_name ("list-remove-symbolic");

  gtk_widget_set_name (column, "condition-column");
  gtk_widget_set_name (op, "condition-op");
  gtk_widget_set_name (value, "condition-value");
  gtk_drop_down_set_enable_search (GTK_DROP_DOWN (column), TRUE);
  {
    g_autoptr (GtkListItemFactory) factory = gtk_signal_list_item_factory_new ();

    g_signal_connect (factory, "setup", G_CALLBACK (setup_name_item), NULL);
    g_signal_connect (factory, "bind", G_CALLBACK (bind_name_item), self);
    gtk_drop_down_set_list_factory (GTK_DROP_DOWN (column), factory);
  }
  /* The same widths in every row: the rows read as a table. */
  gtk_widget_set_size_request (column, 150, -1);
  gtk_widget_set_size_request (op, 130, -1);
  gtk_widget_set_tooltip_text (column, _("A derived value, its _lo or _hi bound, an input, or a flag"));
  gtk_widget_set_hexpand (value, TRUE);
  gtk_editable_set_width_chars (GTK_EDITABLE (value), 8);
  gtk_widget_set_tooltip_text (remove, _("Remove this condition"));
  gtk_widget_add_css_class (remove, "flat");
  g_object_set_data (G_OBJECT (row), "column", column);
  g_object_set_data (G_OBJECT (row), "op", op);
  g_object_set_data (G_OBJECT (row), "value", value);
  /* A kind no name has: the first update fills the comparisons. */
  g_object_set_data (G_OBJECT (row), "kind", GUINT_TO_POINTER (G_MAXUINT));
  gtk_box_append (GTK_BOX (row), column);
  gtk_box_append (GTK_BOX (row), op);
  gtk_box_append (GTK_BOX (row), value);
  gtk_box_append (GTK_BOX (row), remove);
  gtk_box_append (self->rows, row);

  /* A useful first choice: the effective temperature. */
  gtk_drop_down_set_selected (GTK_DROP_DOWN (column), find_name (self, "teff"));
  on_column_changed (GTK_DROP_DOWN (column), NULL, self);
  g_signal_connect (column, "notify::selected", G_CALLBACK (on_column_changed), self);
  g_signal_connect (op, "notify::selected", G_CALLBACK (on_row_changed), self);
  g_signal_connect (value, "changed", G_CALLBACK (on_value_changed), self);
  g_signal_connect (remove, "clicked", G_CALLBACK (on_remove_row), self);
  gtk_widget_grab_focus (value);
}

/* ------------------------------------------------------------------ */
/* The count                                                          */

static void
set_status (NewList *self, const char *text, gboolean is_error)
{
  gtk_label_set_text (self->status, text);
  if (is_error)
    gtk_widget_add_css_class (GTK_WIDGET (self->status), "error");
  else
    gtk_widget_remove_css_class (GTK_WIDGET (self->status), "error");
}

static void
update_create (NewList *self)
{
  const char *name = gtk_editable_get_text (GTK_EDITABLE (self->name));
  const char *condition = gtk_editable_get_text (GTK_EDITABLE (self->condition));
  gboolean has_condition = *condition != '\0';

  /* Without a condition the list holds the selection, or starts empty. */
  gtk_widget_set_sensitive (self->create, *name != '\0' && (!has_condition || self->condition_ok));
}

/* The count runs in a thread (at a million stars it takes a moment); a
 * result that arrives after the text changed again is dropped. */
typedef struct {
  char  *path;
  char  *text;
  guint  generation;
} CountJob;

static void
count_job_free (gpointer data)
{
  CountJob *job = data;

  g_free (job->path);
  g_free (job->text);
  g_free (job);
}

static void
count_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  CountJob *job = task_data;
  g_autoptr (SlProject) project = NULL;
  GError *error = NULL;
  gint64 n = -1;

  project = sl_project_open (job->path, &error);
  if (project)
    n = sl_list_count_matching (project, job->text, &error);
  if (n >= 0)
    g_task_return_int (task, n);
  else
    g_task_return_error (task, error);
}

static void
on_counted (GObject *source, GAsyncResult *result, gpointer user_data)
{
  NewList *self = g_object_get_data (source, "new-list");
  CountJob *job = g_task_get_task_data (G_TASK (result));
  g_autoptr (GError) error = NULL;
  gssize n = g_task_propagate_int (G_TASK (result), &error);
  g_autofree char *message = NULL;

  if (self == NULL || self->closed || job->generation != self->generation)
    return;
  if (n < 0)
    {
      set_status (self, error->message, TRUE);
      update_create (self);
      return;
    }
  self->condition_ok = TRUE;
  message = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%zd derived star matches now.",
                                          "%zd derived stars match now.", n),
                             n);
  set_status (self, message, FALSE);
  update_create (self);
}

static gboolean
count_now (gpointer data)
{
  NewList *self = data;
  const char *text = gtk_editable_get_text (GTK_EDITABLE (self->condition));
  g_autoptr (GTask) task = NULL;
  CountJob *job;

  self->count_source = 0;
  self->condition_ok = FALSE;
  self->generation++;
  if (*text == '\0')
    {
      set_status (self, _("No condition: the list holds the selected stars if they are added, or starts empty."),
                  FALSE);
      update_create (self);
      return G_SOURCE_REMOVE;
    }
  set_status (self, _("Counting…"), FALSE);
  job = g_new0 (CountJob, 1);
  job->path = g_strdup (sl_window_get_project_path (self->window));
  job->text = g_strdup (text);
  job->generation = self->generation;
  /* The task holds the dialog, and so the state, until it is done. */
  task = g_task_new (self->dialog, NULL, on_counted, NULL);
  g_task_set_task_data (task, job, count_job_free);
  g_task_run_in_thread (task, count_thread);
  return G_SOURCE_REMOVE;
}

static void
on_condition_changed (GtkEditable *condition, NewList *self)
{
  if (self->closed)
    return;
  if (self->count_source)
    g_source_remove (self->count_source);
  self->condition_ok = FALSE;
  update_create (self);
  self->count_source = g_timeout_add (COUNT_DELAY_MS, count_now, self);
}

/* ------------------------------------------------------------------ */
/* Creating                                                           */

static void
on_create (NewList *self)
{
  g_autofree char *name = g_strstrip (g_strdup (gtk_editable_get_text (GTK_EDITABLE (self->name))));
  const char *description = gtk_editable_get_text (GTK_EDITABLE (self->description));
  g_autofree char *condition = g_strstrip (g_strdup (gtk_editable_get_text (GTK_EDITABLE (self->condition))));
  g_autoptr (GError) error = NULL;

  if (!sl_lists_panel_create_list (self->window, name, description, condition,
                                   gtk_check_button_get_active (self->with_selection), &error))
    {
      /* The dialog stays, with what went wrong. */
      set_status (self, error->message, TRUE);
      return;
    }
  gtk_window_destroy (self->dialog);
}

/* The widgets go now; the state stays until no count holds the dialog. */
static void
on_destroy (NewList *self)
{
  self->closed = TRUE;
  if (self->count_source)
    g_source_remove (self->count_source);
  self->count_source = 0;
}

static void
on_cancel (NewList *self)
{
  gtk_window_destroy (self->dialog);
}

static void
on_entry_changed (NewList *self)
{
  update_create (self);
}

/* ------------------------------------------------------------------ */
/* Construction                                                       */

static GtkWidget *
caption (const char *text, gboolean dim)
{
  GtkWidget *label = gtk_label_new (text);

  gtk_label_set_xalign (GTK_LABEL (label), 0.0);
  gtk_label_set_wrap (GTK_LABEL (label), TRUE);
  gtk_widget_add_css_class (label, dim ? "dim-label" : "heading");
  return label;
}

GtkWindow *
sl_new_list_dialog_present (SlWindow *window)
{
  NewList *self = g_new0 (NewList, 1);
  GtkWidget *dialog = adw_window_new ();
  GtkWidget *content = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  GtkWidget *header = adw_header_bar_new ();
  GtkWidget *cancel = gtk_button_new_with_mnemonic (_("_Cancel"));
  GtkWidget *body = gtk_box_new (GTK_ORIENTATION_VERTICAL, 12);
  GtkWidget *scroll = gtk_scrolled_window_new ();
  GtkWidget *names_group = adw_preferences_group_new ();
  GtkWidget *where = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkWidget *add = gtk_button_new_with_mnemonic (_("_Add a Condition"));
  const char *const *selection = sl_window_get_selection (window);
  guint n_selected = selection ? g_strv_length ((char **) selection) : 0;
  g_autofree char *with_label = NULL;

  g_return_val_if_fail (SL_IS_WINDOW (window), NULL);

  self->window = window;
  self->dialog = GTK_WINDOW (dialog);
  self->names = sl_condition_names ();
  self->name_list = gtk_string_list_new (NULL);
  for (guint i = 0; i < self->names->len; i++)
    gtk_string_list_append (self->name_list, name_at (self, i)->name);
  g_object_set_data_full (G_OBJECT (dialog), "new-list", self, new_list_free);
  g_signal_connect_swapped (dialog, "destroy", G_CALLBACK (on_destroy), self);

  gtk_window_set_title (GTK_WINDOW (dialog), _("New List"));
  gtk_window_set_modal (GTK_WINDOW (dialog), TRUE);
  gtk_window_set_transient_for (GTK_WINDOW (dialog), GTK_WINDOW (window));
  gtk_window_set_default_size (GTK_WINDOW (dialog), 620, 600);

  /* Cancel and Create in the header, as GNOME dialogs have them. */
  adw_header_bar_set_show_end_title_buttons (ADW_HEADER_BAR (header), FALSE);
  adw_header_bar_set_title_widget (ADW_HEADER_BAR (header), adw_window_title_new (_("New List"), NULL));
  self->create = gtk_button_new_with_mnemonic (_("C_reate"));
  gtk_widget_set_name (self->create, "create-list");
  gtk_widget_add_css_class (self->create, "suggested-action");
  adw_header_bar_pack_start (ADW_HEADER_BAR (header), cancel);
  adw_header_bar_pack_end (ADW_HEADER_BAR (header), self->create);
  g_signal_connect_swapped (cancel, "clicked", G_CALLBACK (on_cancel), self);
  g_signal_connect_swapped (self->create, "clicked", G_CALLBACK (on_create), self);
  gtk_box_append (GTK_BOX (content), header);

  gtk_widget_set_margin_start (body, 18);
  gtk_widget_set_margin_end (body, 18);
  gtk_widget_set_margin_top (body, 12);
  gtk_widget_set_margin_bottom (body, 18);

  /* Name and description. */
  self->name = ADW_ENTRY_ROW (adw_entry_row_new ());
  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (self->name), _("Name"));
  gtk_widget_set_name (GTK_WIDGET (self->name), "list-name");
  self->description = ADW_ENTRY_ROW (adw_entry_row_new ());
  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (self->description), _("Description (optional)"));
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (names_group), GTK_WIDGET (self->name));
  adw_preferences_group_add (ADW_PREFERENCES_GROUP (names_group), GTK_WIDGET (self->description));
  g_signal_connect_swapped (self->name, "changed", G_CALLBACK (on_entry_changed), self);
  gtk_box_append (GTK_BOX (body), names_group);

  /* The rows. */
  {
    const char *const combine[] = { _("all of these hold"), _("any of these holds"), NULL };

    self->combine = GTK_DROP_DOWN (gtk_drop_down_new_from_strings (combine));
    gtk_widget_set_name (GTK_WIDGET (self->combine), "condition-combine");
    gtk_box_append (GTK_BOX (where), caption (_("Stars for which"), FALSE));
    gtk_box_append (GTK_BOX (where), GTK_WIDGET (self->combine));
    g_signal_connect_swapped (self->combine, "notify::selected", G_CALLBACK (write_condition), self);
    gtk_box_append (GTK_BOX (body), where);
  }
  self->rows = GTK_BOX (gtk_box_new (GTK_ORIENTATION_VERTICAL, 6));
  gtk_box_append (GTK_BOX (body), GTK_WIDGET (self->rows));
  gtk_widget_set_name (add, "add-condition");
  gtk_widget_set_halign (add, GTK_ALIGN_START);
  g_signal_connect_swapped (add, "clicked", G_CALLBACK (add_row), self);
  gtk_box_append (GTK_BOX (body), add);

  /* The text, which is what counts. */
  gtk_box_append (GTK_BOX (body), caption (_("Condition"), FALSE));
  self->condition = GTK_ENTRY (gtk_entry_new ());
  gtk_widget_set_name (GTK_WIDGET (self->condition), "condition-text");
  gtk_entry_set_placeholder_text (self->condition, _("for example: teff > 5000 and dist < 100"));
  gtk_widget_add_css_class (GTK_WIDGET (self->condition), "monospace");
  g_signal_connect (self->condition, "changed", G_CALLBACK (on_condition_changed), self);
  gtk_box_append (GTK_BOX (body), GTK_WIDGET (self->condition));
  gtk_box_append (GTK_BOX (body),
                  caption (_("The rows above write this text. Edit it to say what rows cannot: a mix of "
                             "'and', 'or' and 'not', with parentheses. Only derived stars are tested; a "
                             "missing value satisfies no comparison."), TRUE));
  self->status = GTK_LABEL (caption ("", FALSE));
  gtk_widget_remove_css_class (GTK_WIDGET (self->status), "heading");
  gtk_widget_set_name (GTK_WIDGET (self->status), "match-count");
  gtk_label_set_selectable (self->status, TRUE);
  gtk_box_append (GTK_BOX (body), GTK_WIDGET (self->status));

  with_label = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "Also add the selected star (%u)",
                                             "Also add the selected stars (%u)", n_selected),
                                n_selected);
  self->with_selection = GTK_CHECK_BUTTON (gtk_check_button_new_with_label (with_label));
  gtk_widget_set_name (GTK_WIDGET (self->with_selection), "with-selection");
  gtk_widget_set_sensitive (GTK_WIDGET (self->with_selection), n_selected > 0);
  g_signal_connect_swapped (self->with_selection, "toggled", G_CALLBACK (on_entry_changed), self);
  gtk_box_append (GTK_BOX (body), GTK_WIDGET (self->with_selection));

  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (scroll), body);
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (scroll), GTK_POLICY_NEVER, GTK_POLICY_AUTOMATIC);
  gtk_widget_set_vexpand (scroll, TRUE);
  gtk_box_append (GTK_BOX (content), scroll);
  adw_window_set_content (ADW_WINDOW (dialog), content);

  /* Escape closes, as in every dialog. */
  {
    GtkEventController *keys = gtk_shortcut_controller_new ();

    gtk_shortcut_controller_add_shortcut (GTK_SHORTCUT_CONTROLLER (keys),
                                          gtk_shortcut_new (gtk_keyval_trigger_new (GDK_KEY_Escape, 0),
                                                            gtk_named_action_new ("window.close")));
    gtk_widget_add_controller (dialog, keys);
  }

  add_row (self);
  count_now (self);
  gtk_widget_grab_focus (GTK_WIDGET (self->name));
  gtk_window_present (GTK_WINDOW (dialog));
  return GTK_WINDOW (dialog);
}
