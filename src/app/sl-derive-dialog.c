/* sl-derive-dialog.c: the Derive dialog.
 *
 * The rows come from the core's table of run parameters (derive.h,
 * SlParamInfo; registry.c): their labels, help, ranges and the citation of
 * each method, so the dialog, starledger-cli derive and explain say the
 * same and accept the same.  That is why the dialog is built in code rather
 * than from a .ui file: only the grouping below is the dialog's own.
 *
 * It starts from the parameters of the project's most recent run
 * (sl_derivation_latest_params), so that deriving again keeps the team's
 * choices; Reset to Defaults goes back to sl_derive_params_init.  A number
 * the core refuses marks its entry and replaces the row's help with the
 * reason, and Derive waits until every entry is accepted.
 */
#include "sl-derive-dialog.h"

#include <inttypes.h>
#include <glib/gi18n.h>

#include "derivation.h"

struct _SlDeriveDialog {
  AdwWindow       parent_instance;

  SlWindow       *window;                 /* weak: the dialog dies with it */
  SlDeriveParams  params;                 /* what the widgets show (the last accepted text of each entry) */
  AdwActionRow   *rows[SL_N_PARAMS];      /* AdwComboRow for choices */
  GtkEntry       *entries[SL_N_PARAMS];   /* numbers and counts; NULL for choices */
  char           *problems[SL_N_PARAMS];  /* why an entry's text is refused; NULL: accepted */
  GtkLabel       *origin;                 /* which run the values come from */
  GtkSwitch      *all;
  GtkWidget      *derive;
  gboolean        syncing;                /* widgets being set from params: not the user */
};

G_DEFINE_FINAL_TYPE (SlDeriveDialog, sl_derive_dialog, ADW_TYPE_WINDOW)

/* The dialog's own part: which parameters go together. */
static const struct {
  const char *title;
  SlParam     params[5];   /* SL_N_PARAMS-terminated */
} groups[] = {
  { N_("Distance"), { SL_PARAM_DISTANCE, SL_PARAM_LENGTH_SCALE, SL_PARAM_PARALLAX_ZERO_POINT, SL_N_PARAMS } },
  { N_("Extinction"), { SL_PARAM_RV, SL_PARAM_RV_ERR, SL_N_PARAMS } },
  { N_("Temperature"), { SL_PARAM_TEFF, SL_N_PARAMS } },
  { N_("Uncertainties"), { SL_PARAM_ERRORS, SL_PARAM_DRAWS, SL_PARAM_SEED, SL_PARAM_MC_BELOW_SNR, SL_N_PARAMS } },
};

/* "Astraatmadja & Bailer-Jones 2016, ApJ 833, 119\nDefault: 1350 pc" */
static char *
default_and_citation (SlParam param, const char *citation)
{
  const SlParamInfo *info = sl_param_info (param);
  SlDeriveParams defaults;
  g_autofree char *value = NULL;
  g_autofree char *with_unit = NULL;
  g_autofree char *line = NULL;

  sl_derive_params_init (&defaults);
  if (info->kind == SL_PARAM_KIND_CHOICE)
    value = g_strdup (_(info->choices[sl_param_get_choice (&defaults, param)].label));
  else
    value = sl_param_to_text (&defaults, param);
  with_unit = *info->unit ? g_strdup_printf ("%s %s", value, info->unit) : g_strdup (value);
  /* TRANSLATORS: the default value of a parameter, with its unit. */
  line = g_strdup_printf (_("Default: %s"), with_unit);
  if (*citation)
    return g_strdup_printf ("%s\n%s", citation, line);
  return g_steal_pointer (&line);
}

/* A row's subtitle: what the parameter or the chosen method does, its
 * default and citation; or, for an entry the core refused, why. */
static void
update_row (SlDeriveDialog *self, SlParam param)
{
  const SlParamInfo *info = sl_param_info (param);
  g_autofree char *tail = default_and_citation (param, sl_param_citation (&self->params, param));
  g_autofree char *subtitle = NULL;
  const char *what;

  if (self->problems[param])
    {
      adw_action_row_set_subtitle (self->rows[param], self->problems[param]);
      return;
    }
  if (info->kind == SL_PARAM_KIND_CHOICE)
    what = _(info->choices[sl_param_get_choice (&self->params, param)].summary);
  else
    what = _(info->help);
  subtitle = g_strdup_printf ("%s\n%s", what, tail);
  adw_action_row_set_subtitle (self->rows[param], subtitle);
}

/* What only one method reads is off while the other is chosen; Derive
 * waits for every entry to be accepted. */
static void
update_sensitivity (SlDeriveDialog *self)
{
  gboolean ok = TRUE;

  gtk_widget_set_sensitive (GTK_WIDGET (self->rows[SL_PARAM_LENGTH_SCALE]),
                            self->params.distance == SL_DISTANCE_EDSD);
  gtk_widget_set_sensitive (GTK_WIDGET (self->rows[SL_PARAM_MC_BELOW_SNR]),
                            self->params.errors == SL_ERRORS_LINEAR);
  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    ok = ok && self->problems[p] == NULL;
  gtk_widget_set_sensitive (self->derive, ok);
}

/* Every widget from self->params. */
static void
sync_widgets (SlDeriveDialog *self)
{
  self->syncing = TRUE;
  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    {
      g_clear_pointer (&self->problems[p], g_free);
      if (self->entries[p])
        {
          g_autofree char *text = sl_param_to_text (&self->params, p);

          gtk_editable_set_text (GTK_EDITABLE (self->entries[p]), text);
          gtk_widget_remove_css_class (GTK_WIDGET (self->entries[p]), "error");
        }
      else
        adw_combo_row_set_selected (ADW_COMBO_ROW (self->rows[p]), sl_param_get_choice (&self->params, p));
      update_row (self, p);
    }
  self->syncing = FALSE;
  update_sensitivity (self);
}

static void
on_entry_changed (GtkEditable *entry, SlDeriveDialog *self)
{
  SlParam param = GPOINTER_TO_UINT (g_object_get_data (G_OBJECT (entry), "sl-param"));
  g_autoptr (GError) error = NULL;

  if (self->syncing)
    return;
  g_clear_pointer (&self->problems[param], g_free);
  if (sl_param_from_text (&self->params, param, gtk_editable_get_text (entry), &error))
    gtk_widget_remove_css_class (GTK_WIDGET (entry), "error");
  else
    {
      self->problems[param] = g_strdup (error->message);
      gtk_widget_add_css_class (GTK_WIDGET (entry), "error");
    }
  update_row (self, param);
  update_sensitivity (self);
}

static void
on_choice_changed (AdwComboRow *row, GParamSpec *pspec, SlDeriveDialog *self)
{
  SlParam param = GPOINTER_TO_UINT (g_object_get_data (G_OBJECT (row), "sl-param"));
  guint selected = adw_combo_row_get_selected (row);

  if (self->syncing || selected >= sl_param_info (param)->n_choices)
    return;
  sl_param_set_choice (&self->params, param, selected);
  update_row (self, param);
  update_sensitivity (self);
}

/* The chosen method's name in full: the default factory ellipsizes it
 * beside a long subtitle. */
static void
setup_choice_label (GtkSignalListItemFactory *factory, GtkListItem *item)
{
  GtkWidget *label = gtk_label_new (NULL);

  gtk_label_set_xalign (GTK_LABEL (label), 0.0);
  gtk_list_item_set_child (item, label);
}

static void
bind_choice_label (GtkSignalListItemFactory *factory, GtkListItem *item)
{
  GtkStringObject *label = gtk_list_item_get_item (item);

  gtk_label_set_text (GTK_LABEL (gtk_list_item_get_child (item)), gtk_string_object_get_string (label));
}

static AdwActionRow *
choice_row (SlDeriveDialog *self, SlParam param)
{
  const SlParamInfo *info = sl_param_info (param);
  g_autoptr (GtkStringList) labels = gtk_string_list_new (NULL);
  g_autoptr (GtkListItemFactory) factory = gtk_signal_list_item_factory_new ();
  AdwComboRow *row = ADW_COMBO_ROW (adw_combo_row_new ());

  for (guint c = 0; c < info->n_choices; c++)
    gtk_string_list_append (labels, _(info->choices[c].label));
  g_signal_connect (factory, "setup", G_CALLBACK (setup_choice_label), NULL);
  g_signal_connect (factory, "bind", G_CALLBACK (bind_choice_label), NULL);
  adw_combo_row_set_factory (row, factory);
  adw_combo_row_set_model (row, G_LIST_MODEL (labels));
  adw_combo_row_set_use_subtitle (row, FALSE);
  g_signal_connect (row, "notify::selected", G_CALLBACK (on_choice_changed), self);
  return ADW_ACTION_ROW (row);
}

static AdwActionRow *
entry_row (SlDeriveDialog *self, SlParam param)
{
  const SlParamInfo *info = sl_param_info (param);
  AdwActionRow *row = ADW_ACTION_ROW (adw_action_row_new ());
  GtkWidget *entry = gtk_entry_new ();

  gtk_widget_set_valign (entry, GTK_ALIGN_CENTER);
  /* One width whatever the row's text: the numbers line up. */
  gtk_editable_set_width_chars (GTK_EDITABLE (entry), info->kind == SL_PARAM_KIND_COUNT ? 12 : 8);
  gtk_editable_set_max_width_chars (GTK_EDITABLE (entry), info->kind == SL_PARAM_KIND_COUNT ? 12 : 8);
  gtk_editable_set_alignment (GTK_EDITABLE (entry), 1.0);
  gtk_entry_set_input_purpose (GTK_ENTRY (entry), info->kind == SL_PARAM_KIND_COUNT ? GTK_INPUT_PURPOSE_DIGITS
                                                                                    : GTK_INPUT_PURPOSE_NUMBER);
  gtk_entry_set_activates_default (GTK_ENTRY (entry), TRUE);
  gtk_widget_set_name (entry, info->name);
  g_object_set_data (G_OBJECT (entry), "sl-param", GUINT_TO_POINTER (param));
  g_signal_connect (entry, "changed", G_CALLBACK (on_entry_changed), self);
  adw_action_row_add_suffix (row, entry);
  if (*info->unit)
    {
      GtkWidget *unit = gtk_label_new (info->unit);

      gtk_widget_add_css_class (unit, "dim-label");
      adw_action_row_add_suffix (row, unit);
    }
  adw_action_row_set_activatable_widget (row, entry);
  self->entries[param] = GTK_ENTRY (entry);
  return row;
}

static void
on_reset (GtkButton *button, SlDeriveDialog *self)
{
  sl_derive_params_init (&self->params);
  gtk_switch_set_active (self->all, FALSE);
  sync_widgets (self);
}

static void
on_derive (GtkButton *button, SlDeriveDialog *self)
{
  SlDeriveParams params = self->params;
  g_autoptr (GError) error = NULL;

  /* The button is off while an entry is refused; the core checks again. */
  if (self->window == NULL)
    return;
  if (!sl_derive_params_check (&params, &error))
    {
      sl_window_toast (self->window, error->message);
      return;
    }
  sl_window_derive (self->window, &params, gtk_switch_get_active (self->all));
  gtk_window_close (GTK_WINDOW (self));
}

/* Where the values come from: the latest run, or the defaults. */
static void
load_latest (SlDeriveDialog *self)
{
  const char *path = self->window ? sl_window_get_project_path (self->window) : NULL;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *origin = NULL;
  gint64 run_id = 0;

  sl_derive_params_init (&self->params);
  project = path ? sl_project_open (path, &error) : NULL;
  if (project && sl_derivation_latest_params (project, &self->params, &run_id, &error) && run_id > 0)
    {
      g_autofree char *run = g_strdup_printf ("%" PRId64, run_id);

      origin = g_strdup_printf (_("As in run %s, the project's latest. Stars derived with other parameters are "
                                  "derived again."), run);
    }
  else if (error)
    origin = g_strdup_printf (_("The latest run's parameters cannot be read (%s); these are the defaults."),
                              error->message);
  else
    origin = g_strdup (_("The project has no derivation yet; these are the defaults."));
  gtk_label_set_text (self->origin, origin);
}

static void
build (SlDeriveDialog *self)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  GtkWidget *header = adw_header_bar_new ();
  GtkWidget *cancel = gtk_button_new_with_mnemonic (_("_Cancel"));
  GtkWidget *page = adw_preferences_page_new ();
  AdwPreferencesGroup *group;
  GtkWidget *reset, *all_row, *all;

  gtk_window_set_title (GTK_WINDOW (self), _("Derive"));
  adw_header_bar_set_show_end_title_buttons (ADW_HEADER_BAR (header), FALSE);
  adw_header_bar_set_show_start_title_buttons (ADW_HEADER_BAR (header), FALSE);
  g_signal_connect_swapped (cancel, "clicked", G_CALLBACK (gtk_window_close), self);
  adw_header_bar_pack_start (ADW_HEADER_BAR (header), cancel);
  self->derive = gtk_button_new_with_mnemonic (_("_Derive"));
  gtk_widget_set_name (self->derive, "derive");
  gtk_widget_add_css_class (self->derive, "suggested-action");
  g_signal_connect (self->derive, "clicked", G_CALLBACK (on_derive), self);
  adw_header_bar_pack_end (ADW_HEADER_BAR (header), self->derive);
  gtk_box_append (GTK_BOX (box), header);

  group = ADW_PREFERENCES_GROUP (adw_preferences_group_new ());
  self->origin = GTK_LABEL (gtk_label_new (NULL));
  gtk_label_set_wrap (self->origin, TRUE);
  gtk_label_set_xalign (self->origin, 0.0);
  gtk_widget_add_css_class (GTK_WIDGET (self->origin), "dim-label");
  adw_preferences_group_add (group, GTK_WIDGET (self->origin));
  adw_preferences_page_add (ADW_PREFERENCES_PAGE (page), group);

  for (guint g = 0; g < G_N_ELEMENTS (groups); g++)
    {
      group = ADW_PREFERENCES_GROUP (adw_preferences_group_new ());
      adw_preferences_group_set_title (group, _(groups[g].title));
      for (guint i = 0; groups[g].params[i] != SL_N_PARAMS; i++)
        {
          SlParam param = groups[g].params[i];
          const SlParamInfo *info = sl_param_info (param);
          AdwActionRow *row = info->kind == SL_PARAM_KIND_CHOICE ? choice_row (self, param)
                                                                 : entry_row (self, param);

          /* Citations hold '&': plain text, not markup. */
          adw_preferences_row_set_use_markup (ADW_PREFERENCES_ROW (row), FALSE);
          adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), _(info->label));
          adw_action_row_set_subtitle_lines (row, 0);
          if (info->kind == SL_PARAM_KIND_CHOICE)
            gtk_widget_set_name (GTK_WIDGET (row), info->name);   /* numbers: their entry */
          g_object_set_data (G_OBJECT (row), "sl-param", GUINT_TO_POINTER (param));
          self->rows[param] = row;
          adw_preferences_group_add (group, GTK_WIDGET (row));
        }
      adw_preferences_page_add (ADW_PREFERENCES_PAGE (page), group);
    }

  group = ADW_PREFERENCES_GROUP (adw_preferences_group_new ());
  adw_preferences_group_set_title (group, _("Stars"));
  all_row = adw_action_row_new ();
  adw_preferences_row_set_title (ADW_PREFERENCES_ROW (all_row), _("Derive every star"));
  adw_action_row_set_subtitle (ADW_ACTION_ROW (all_row),
                               _("Otherwise only the stars with no derived values, with changed inputs or values "
                                 "set by hand, or derived with other parameters."));
  all = gtk_switch_new ();
  gtk_widget_set_valign (all, GTK_ALIGN_CENTER);
  gtk_widget_set_name (all, "all");
  adw_action_row_add_suffix (ADW_ACTION_ROW (all_row), all);
  adw_action_row_set_activatable_widget (ADW_ACTION_ROW (all_row), all);
  self->all = GTK_SWITCH (all);
  adw_preferences_group_add (group, all_row);
  adw_preferences_page_add (ADW_PREFERENCES_PAGE (page), group);

  group = ADW_PREFERENCES_GROUP (adw_preferences_group_new ());
  reset = gtk_button_new_with_mnemonic (_("_Reset to Defaults"));
  gtk_widget_set_name (reset, "reset");
  gtk_widget_set_halign (reset, GTK_ALIGN_CENTER);
  gtk_widget_add_css_class (reset, "pill");
  g_signal_connect (reset, "clicked", G_CALLBACK (on_reset), self);
  adw_preferences_group_add (group, reset);
  adw_preferences_page_add (ADW_PREFERENCES_PAGE (page), group);

  gtk_widget_set_vexpand (page, TRUE);
  gtk_box_append (GTK_BOX (box), page);
  adw_window_set_content (ADW_WINDOW (self), box);
  gtk_window_set_default_widget (GTK_WINDOW (self), self->derive);
}

static void
sl_derive_dialog_dispose (GObject *object)
{
  SlDeriveDialog *self = SL_DERIVE_DIALOG (object);

  if (self->window)
    g_object_remove_weak_pointer (G_OBJECT (self->window), (gpointer *) &self->window);
  self->window = NULL;
  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    g_clear_pointer (&self->problems[p], g_free);
  G_OBJECT_CLASS (sl_derive_dialog_parent_class)->dispose (object);
}

static void
sl_derive_dialog_class_init (SlDeriveDialogClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = sl_derive_dialog_dispose;
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "window.close", NULL);
}

static void
sl_derive_dialog_init (SlDeriveDialog *self)
{
  build (self);
  gtk_window_set_default_size (GTK_WINDOW (self), 600, 760);
}

SlDeriveDialog *
sl_derive_dialog_new (SlWindow *window)
{
  SlDeriveDialog *self;

  g_return_val_if_fail (SL_IS_WINDOW (window), NULL);
  self = g_object_new (SL_TYPE_DERIVE_DIALOG, "modal", TRUE, "transient-for", window, "destroy-with-parent",
                       TRUE, NULL);
  self->window = window;
  g_object_add_weak_pointer (G_OBJECT (window), (gpointer *) &self->window);
  load_latest (self);
  sync_widgets (self);
  return self;
}
