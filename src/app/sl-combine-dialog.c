/* sl-combine-dialog.c: the Combining Sources dialog.
 *
 * One rule per group of inputs, the order of preferred sources for the
 * priority rule, and the level of the agreement test: the project's
 * policy, read and written by the core (sl_combine_policy_read / _write:
 * the same checks and the same ledger entry as 'starledger-cli combine').
 * Saving marks derived values stale; the window then offers to derive.
 */
#include "sl-combine-dialog.h"

#include <glib/gi18n.h>

#include "inputs.h"
#include "units.h"
#include "util.h"

/* One source in the order shown: listed ones first, in the policy's order. */
typedef struct {
  char    *name;
  gboolean listed;
} SourceItem;

static void
source_item_clear (SourceItem *item)
{
  g_free (item->name);
}

struct _SlCombineDialog {
  AdwWindow        parent_instance;

  SlWindow        *window;              /* weak: the dialog dies with it */
  SlCombinePolicy  policy;              /* as read; rules and level edited in place */
  GArray          *sources;             /* SourceItem */
  AdwComboRow     *rules[SL_N_FIELDS];  /* by the group's lead field */
  SlCombineRule    choices[SL_N_FIELDS][SL_N_COMBINE_RULES];  /* each row's rules, in its model's order */
  AdwPreferencesGroup *order_group;
  GPtrArray       *order_rows;          /* the rows in order_group, rebuilt on a move */
  GtkEntry        *level;
  AdwActionRow    *level_row;
  GtkLabel        *problem;
  GtkWidget       *save;
};

G_DEFINE_FINAL_TYPE (SlCombineDialog, sl_combine_dialog, ADW_TYPE_WINDOW)

/* The groups for people, in the vocabulary's order. */
static const struct {
  SlField     lead;
  const char *label;
} group_labels[] = {
  { SL_FIELD_RA, N_("Position") },
  { SL_FIELD_PARALLAX, N_("Parallax") },
  { SL_FIELD_PMRA, N_("Proper motion") },
  { SL_FIELD_VMAG, N_("V magnitude") },
  { SL_FIELD_BMAG, N_("B magnitude") },
  { SL_FIELD_BV, N_("Colour index B-V") },
  { SL_FIELD_EBV, N_("Colour excess E(B-V)") },
  { SL_FIELD_VRAD, N_("Radial velocity") },
};

static const char *
rule_help (SlCombineRule rule)
{
  switch (rule)
    {
    case SL_COMBINE_PRIORITY:
      return _("The first source in the order below.");
    case SL_COMBINE_WEIGHTED_MEAN:
      return _("Inverse-variance weighted mean of the rows with errors (Taylor 1997, ch. 7).");
    case SL_COMBINE_SMALLEST_ERROR:
    default:
      return _("The row with the smallest uncertainty.");
    }
}

static void
on_rule_selected (AdwComboRow *row, GParamSpec *pspec, SlCombineDialog *self)
{
  SlField lead = GPOINTER_TO_UINT (g_object_get_data (G_OBJECT (row), "sl-lead"));
  guint selected = adw_combo_row_get_selected (row);

  if (selected == GTK_INVALID_LIST_POSITION)
    return;
  self->policy.rule[lead] = self->choices[lead][selected];
  adw_action_row_set_subtitle (ADW_ACTION_ROW (row), rule_help (self->policy.rule[lead]));
}

static AdwComboRow *
rule_row (SlCombineDialog *self, SlField lead, const char *label)
{
  g_autoptr (GtkStringList) model = gtk_string_list_new (NULL);
  AdwComboRow *row = ADW_COMBO_ROW (adw_combo_row_new ());
  guint n = 0, selected = 0;

  for (SlCombineRule rule = 0; rule < SL_N_COMBINE_RULES; rule++)
    {
      if (!sl_combine_rule_allowed (lead, rule))
        continue;
      if (rule == self->policy.rule[lead])
        selected = n;
      self->choices[lead][n++] = rule;
      gtk_string_list_append (model, sl_combine_rule_label (rule));
    }
  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), label);
  adw_action_row_set_subtitle_lines (ADW_ACTION_ROW (row), 0);
  adw_combo_row_set_model (row, G_LIST_MODEL (model));
  adw_combo_row_set_selected (row, selected);
  adw_action_row_set_subtitle (ADW_ACTION_ROW (row), rule_help (self->policy.rule[lead]));
  gtk_widget_set_name (GTK_WIDGET (row), sl_combine_group_name (lead));
  g_object_set_data (G_OBJECT (row), "sl-lead", GUINT_TO_POINTER (lead));
  g_signal_connect (row, "notify::selected", G_CALLBACK (on_rule_selected), self);
  return row;
}

/* ------------------------------------------------------------------ */
/* The source order                                                   */

static void rebuild_order_rows (SlCombineDialog *self);

static guint
source_index (SlCombineDialog *self, const char *name)
{
  for (guint i = 0; i < self->sources->len; i++)
    if (g_strcmp0 (g_array_index (self->sources, SourceItem, i).name, name) == 0)
      return i;
  return G_MAXUINT;
}

/* The listed sources stay ahead of the others: a move never crosses
 * that line, and ticking or unticking moves a source to it. */
static guint
n_listed (SlCombineDialog *self)
{
  guint n = 0;

  while (n < self->sources->len && g_array_index (self->sources, SourceItem, n).listed)
    n++;
  return n;
}

static void
swap_sources (SlCombineDialog *self, guint a, guint b)
{
  SourceItem t = g_array_index (self->sources, SourceItem, a);

  g_array_index (self->sources, SourceItem, a) = g_array_index (self->sources, SourceItem, b);
  g_array_index (self->sources, SourceItem, b) = t;
}

static void
on_move (GtkButton *button, SlCombineDialog *self)
{
  const char *name = g_object_get_data (G_OBJECT (button), "sl-source");
  int step = GPOINTER_TO_INT (g_object_get_data (G_OBJECT (button), "sl-step"));
  guint i = source_index (self, name);

  if (i == G_MAXUINT || (step < 0 && i == 0) || (step > 0 && i + 1 >= n_listed (self)))
    return;
  swap_sources (self, i, (guint) ((int) i + step));
  rebuild_order_rows (self);
}

static void
on_listed_toggled (GtkCheckButton *check, SlCombineDialog *self)
{
  const char *name = g_object_get_data (G_OBJECT (check), "sl-source");
  guint i = source_index (self, name), listed = n_listed (self);
  gboolean active = gtk_check_button_get_active (check);

  if (i == G_MAXUINT || g_array_index (self->sources, SourceItem, i).listed == active)
    return;
  /* Ticked: last of the listed; unticked: first of the others. */
  g_array_index (self->sources, SourceItem, i).listed = active;
  if (active)
    for (guint j = i; j > listed; j--)
      swap_sources (self, j, j - 1);
  else
    for (guint j = i; j + 1 < listed; j++)
      swap_sources (self, j, j + 1);
  rebuild_order_rows (self);
}

static GtkWidget *
named_button (const char *icon, const char *tooltip, const char *prefix, const char *source, int step,
              gboolean sensitive, SlCombineDialog *self)
{
  GtkWidget *button = gtk_button_new_from_icon_name (icon);
  g_autofree char *name = g_strdup_printf ("%s:%s", prefix, source);

  gtk_widget_set_tooltip_text (button, tooltip);
  gtk_widget_set_valign (button, GTK_ALIGN_CENTER);
  gtk_widget_add_css_class (button, "flat");
  gtk_widget_set_name (button, name);
  gtk_widget_set_sensitive (button, sensitive);
  g_object_set_data_full (G_OBJECT (button), "sl-source", g_strdup (source), g_free);
  g_object_set_data (G_OBJECT (button), "sl-step", GINT_TO_POINTER (step));
  g_signal_connect (button, "clicked", G_CALLBACK (on_move), self);
  return button;
}

static void
rebuild_order_rows (SlCombineDialog *self)
{
  guint listed = n_listed (self);

  for (guint i = 0; i < self->order_rows->len; i++)
    adw_preferences_group_remove (self->order_group, self->order_rows->pdata[i]);
  g_ptr_array_set_size (self->order_rows, 0);
  for (guint i = 0; i < self->sources->len; i++)
    {
      const SourceItem *item = &g_array_index (self->sources, SourceItem, i);
      GtkWidget *row = adw_action_row_new ();
      GtkWidget *check = gtk_check_button_new ();
      g_autofree char *row_name = g_strdup_printf ("source:%s", item->name);
      g_autofree char *check_name = g_strdup_printf ("listed:%s", item->name);
      g_autofree char *place = item->listed ? g_strdup_printf (_("Preferred, place %u"), i + 1) : NULL;

      adw_preferences_row_set_use_markup (ADW_PREFERENCES_ROW (row), FALSE);
      adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), item->name);
      adw_action_row_set_subtitle (ADW_ACTION_ROW (row), item->listed ? place : _("Not in the order"));
      gtk_widget_set_name (row, row_name);
      gtk_widget_set_name (check, check_name);
      gtk_widget_set_valign (check, GTK_ALIGN_CENTER);
      gtk_check_button_set_active (GTK_CHECK_BUTTON (check), item->listed);
      g_object_set_data_full (G_OBJECT (check), "sl-source", g_strdup (item->name), g_free);
      g_signal_connect (check, "toggled", G_CALLBACK (on_listed_toggled), self);
      adw_action_row_add_prefix (ADW_ACTION_ROW (row), check);
      adw_action_row_set_activatable_widget (ADW_ACTION_ROW (row), check);
      adw_action_row_add_suffix (ADW_ACTION_ROW (row),
                                 named_button ("go-up-symbolic", _("Prefer this source to the one above"), "up",
                                               item->name, -1, item->listed && i > 0, self));
      adw_action_row_add_suffix (ADW_ACTION_ROW (row),
                                 named_button ("go-down-symbolic", _("Prefer the source below to this one"), "down",
                                               item->name, +1, item->listed && i + 1 < listed, self));
      adw_preferences_group_add (self->order_group, row);
      g_ptr_array_add (self->order_rows, row);
    }
  if (self->sources->len == 0)
    {
      GtkWidget *row = adw_action_row_new ();

      adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), _("The project has no sources yet"));
      adw_preferences_group_add (self->order_group, row);
      g_ptr_array_add (self->order_rows, row);
    }
}

/* The policy's order, then every other source of the project. */
static void
load_sources (SlCombineDialog *self, SlProject *project)
{
  g_autoptr (GPtrArray) names = project ? sl_combine_source_names (project, NULL) : NULL;
  g_auto (GStrv) order = g_strsplit (self->policy.priority, "\n", -1);

  for (guint i = 0; order[i] != NULL; i++)
    if (*order[i] != '\0')
      {
        SourceItem item = { g_strdup (order[i]), TRUE };

        g_array_append_val (self->sources, item);
      }
  for (guint i = 0; names != NULL && i < names->len; i++)
    if (source_index (self, names->pdata[i]) == G_MAXUINT)
      {
        SourceItem item = { g_strdup (names->pdata[i]), FALSE };

        g_array_append_val (self->sources, item);
      }
}

/* ------------------------------------------------------------------ */
/* The test level and saving                                          */

/* Reads the level entry into the policy; FALSE (and the row says why)
 * if the text is no level. */
static gboolean
read_level (SlCombineDialog *self)
{
  const char *text = gtk_editable_get_text (GTK_EDITABLE (self->level));
  const char *reason = NULL;
  double level;
  gboolean ok = sl_parse_number (text, &level, &reason) && level >= 0.0 && level < 1.0;

  if (ok)
    self->policy.level = level;
  if (ok)
    gtk_widget_remove_css_class (GTK_WIDGET (self->level), "error");
  else
    gtk_widget_add_css_class (GTK_WIDGET (self->level), "error");
  adw_action_row_set_subtitle (self->level_row,
                               ok ? _("A star is flagged when its sources' chi-square probability falls below "
                                      "this level (Taylor 1997, ch. 12); 0 turns the test off.")
                                  : _("Expected a probability from 0 up to, not including, 1 (0.01 usually)."));
  gtk_widget_set_sensitive (self->save, ok);
  return ok;
}

static void
on_level_changed (GtkEditable *editable, SlCombineDialog *self)
{
  read_level (self);
}

static void
on_save (GtkButton *button, SlCombineDialog *self)
{
  const char *path = self->window ? sl_window_get_project_path (self->window) : NULL;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GString) order = g_string_new (NULL);

  if (!read_level (self) || path == NULL)
    return;
  for (guint i = 0; i < self->sources->len; i++)
    {
      const SourceItem *item = &g_array_index (self->sources, SourceItem, i);

      if (item->listed)
        g_string_append_printf (order, "%s%s", order->len ? "\n" : "", item->name);
    }
  if (g_strlcpy (self->policy.priority, order->str, sizeof self->policy.priority) >= sizeof self->policy.priority)
    {
      gtk_label_set_text (self->problem, _("The source order is too long to keep."));
      gtk_widget_set_visible (GTK_WIDGET (self->problem), TRUE);
      return;
    }
  project = sl_project_open (path, &error);
  if (project == NULL || !sl_combine_policy_write (project, &self->policy, &error))
    {
      gtk_label_set_text (self->problem, error->message);
      gtk_widget_set_visible (GTK_WIDGET (self->problem), TRUE);
      return;
    }
  g_clear_pointer (&project, sl_project_close);
  if (self->window)
    {
      sl_window_reload (self->window);
      sl_window_toast (self->window, _("Combining sources: saved. Derive again to apply it."));
    }
  gtk_window_close (GTK_WINDOW (self));
}

/* ------------------------------------------------------------------ */

static void
build (SlCombineDialog *self)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  GtkWidget *header = adw_header_bar_new ();
  GtkWidget *cancel = gtk_button_new_with_mnemonic (_("_Cancel"));
  GtkWidget *page = adw_preferences_page_new ();
  AdwPreferencesGroup *group;
  GtkWidget *intro;
  char level[G_ASCII_DTOSTR_BUF_SIZE];

  gtk_window_set_title (GTK_WINDOW (self), _("Combining Sources"));
  adw_header_bar_set_show_end_title_buttons (ADW_HEADER_BAR (header), FALSE);
  adw_header_bar_set_show_start_title_buttons (ADW_HEADER_BAR (header), FALSE);
  g_signal_connect_swapped (cancel, "clicked", G_CALLBACK (gtk_window_close), self);
  adw_header_bar_pack_start (ADW_HEADER_BAR (header), cancel);
  self->save = gtk_button_new_with_mnemonic (_("_Save"));
  gtk_widget_set_name (self->save, "save");
  gtk_widget_add_css_class (self->save, "suggested-action");
  g_signal_connect (self->save, "clicked", G_CALLBACK (on_save), self);
  adw_header_bar_pack_end (ADW_HEADER_BAR (header), self->save);
  gtk_box_append (GTK_BOX (box), header);

  group = ADW_PREFERENCES_GROUP (adw_preferences_group_new ());
  intro = gtk_label_new (_("When several sources measured the same quantity of a star, these rules choose the "
                           "value that derivations use. Saving marks derived values stale; each derivation run "
                           "records the rules it used."));
  gtk_label_set_wrap (GTK_LABEL (intro), TRUE);
  gtk_label_set_xalign (GTK_LABEL (intro), 0.0);
  gtk_widget_add_css_class (intro, "dim-label");
  adw_preferences_group_add (group, intro);
  self->problem = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_wrap (self->problem, TRUE);
  gtk_label_set_xalign (self->problem, 0.0);
  gtk_widget_add_css_class (GTK_WIDGET (self->problem), "error");
  gtk_widget_set_name (GTK_WIDGET (self->problem), "problem");
  gtk_widget_set_visible (GTK_WIDGET (self->problem), FALSE);
  adw_preferences_group_add (group, GTK_WIDGET (self->problem));
  adw_preferences_page_add (ADW_PREFERENCES_PAGE (page), group);

  group = ADW_PREFERENCES_GROUP (adw_preferences_group_new ());
  adw_preferences_group_set_title (group, _("Rules"));
  adw_preferences_group_set_description (group, _("Positions are never averaged: rows of different epochs "
                                                  "differ by the proper motion."));
  for (guint g = 0; g < G_N_ELEMENTS (group_labels); g++)
    {
      self->rules[group_labels[g].lead] = rule_row (self, group_labels[g].lead, _(group_labels[g].label));
      adw_preferences_group_add (group, GTK_WIDGET (self->rules[group_labels[g].lead]));
    }
  adw_preferences_page_add (ADW_PREFERENCES_PAGE (page), group);

  self->order_group = ADW_PREFERENCES_GROUP (adw_preferences_group_new ());
  adw_preferences_group_set_title (self->order_group, _("Source Order"));
  adw_preferences_group_set_description (self->order_group,
                                         _("For the Source order rule: ticked sources are preferred, the first "
                                           "most; the others follow by smallest uncertainty."));
  rebuild_order_rows (self);
  adw_preferences_page_add (ADW_PREFERENCES_PAGE (page), self->order_group);

  group = ADW_PREFERENCES_GROUP (adw_preferences_group_new ());
  adw_preferences_group_set_title (group, _("Agreement Test"));
  self->level_row = ADW_ACTION_ROW (adw_action_row_new ());
  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (self->level_row), _("Level"));
  adw_action_row_set_subtitle_lines (self->level_row, 0);
  self->level = GTK_ENTRY (gtk_entry_new ());
  gtk_widget_set_name (GTK_WIDGET (self->level), "level");
  gtk_widget_set_valign (GTK_WIDGET (self->level), GTK_ALIGN_CENTER);
  gtk_editable_set_width_chars (GTK_EDITABLE (self->level), 8);
  gtk_editable_set_text (GTK_EDITABLE (self->level), sl_format_double (level, self->policy.level));
  g_signal_connect (self->level, "changed", G_CALLBACK (on_level_changed), self);
  adw_action_row_add_suffix (self->level_row, GTK_WIDGET (self->level));
  adw_preferences_group_add (group, GTK_WIDGET (self->level_row));
  adw_preferences_page_add (ADW_PREFERENCES_PAGE (page), group);

  gtk_widget_set_vexpand (page, TRUE);
  gtk_box_append (GTK_BOX (box), page);
  adw_window_set_content (ADW_WINDOW (self), box);
  gtk_window_set_default_widget (GTK_WINDOW (self), self->save);
  read_level (self);
}

static void
sl_combine_dialog_dispose (GObject *object)
{
  SlCombineDialog *self = SL_COMBINE_DIALOG (object);

  if (self->window)
    g_object_remove_weak_pointer (G_OBJECT (self->window), (gpointer *) &self->window);
  self->window = NULL;
  g_clear_pointer (&self->sources, g_array_unref);
  g_clear_pointer (&self->order_rows, g_ptr_array_unref);
  G_OBJECT_CLASS (sl_combine_dialog_parent_class)->dispose (object);
}

static void
sl_combine_dialog_class_init (SlCombineDialogClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = sl_combine_dialog_dispose;
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "window.close", NULL);
}

static void
sl_combine_dialog_init (SlCombineDialog *self)
{
  self->sources = g_array_new (FALSE, TRUE, sizeof (SourceItem));
  g_array_set_clear_func (self->sources, (GDestroyNotify) source_item_clear);
  self->order_rows = g_ptr_array_new ();
  gtk_window_set_default_size (GTK_WINDOW (self), 560, 720);
}

SlCombineDialog *
sl_combine_dialog_new (SlWindow *window)
{
  const char *path;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  SlCombineDialog *self;

  g_return_val_if_fail (SL_IS_WINDOW (window), NULL);
  self = g_object_new (SL_TYPE_COMBINE_DIALOG, "modal", TRUE, "transient-for", window, "destroy-with-parent",
                       TRUE, NULL);
  self->window = window;
  g_object_add_weak_pointer (G_OBJECT (window), (gpointer *) &self->window);
  path = sl_window_get_project_path (window);
  project = path ? sl_project_open (path, &error) : NULL;
  if (project == NULL || !sl_combine_policy_read (project, &self->policy, &error))
    sl_combine_policy_init (&self->policy);
  load_sources (self, project);
  build (self);
  if (error != NULL)
    {
      gtk_label_set_text (self->problem, error->message);
      gtk_widget_set_visible (GTK_WIDGET (self->problem), TRUE);
    }
  return self;
}
