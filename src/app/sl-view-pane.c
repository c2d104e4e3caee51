/* sl-view-pane.c: a plot view under a compact header strip (title, Export
 * Figure…, maximise / show all).  The strip only names actions of the
 * window; what they do lives there (sl-window.c). */
#include "sl-view-pane.h"

#include <glib/gi18n.h>

#include "figure-job.h"

struct _SlViewPane {
  GtkWidget   parent_instance;

  GtkWidget  *box;         /* the strip over the view */
  GtkWidget  *maximize;    /* its icon and tooltip follow MAXIMIZED */
  gboolean    maximized;
};

G_DEFINE_FINAL_TYPE (SlViewPane, sl_view_pane, GTK_TYPE_WIDGET)

/* A view's kind names its figure: the two enumerations agree. */
G_STATIC_ASSERT ((int) SL_PLOT_KIND_HRD == (int) SL_FIGURE_KIND_HR);
G_STATIC_ASSERT ((int) SL_PLOT_KIND_SKY == (int) SL_FIGURE_KIND_SKY);
G_STATIC_ASSERT ((int) SL_PLOT_KIND_PARALLAX == (int) SL_FIGURE_KIND_PARALLAX);

static void
update_maximize_button (SlViewPane *self)
{
  gtk_button_set_icon_name (GTK_BUTTON (self->maximize),
                            self->maximized ? "view-restore-symbolic" : "view-fullscreen-symbolic");
  gtk_widget_set_tooltip_text (self->maximize,
                               self->maximized ? _("Show every view again (Escape)") : _("Maximise this view"));
}

void
sl_view_pane_set_maximized (SlViewPane *self, gboolean maximized)
{
  g_return_if_fail (SL_IS_VIEW_PANE (self));
  self->maximized = maximized;
  update_maximize_button (self);
}

gboolean
sl_view_pane_get_maximized (SlViewPane *self)
{
  g_return_val_if_fail (SL_IS_VIEW_PANE (self), FALSE);
  return self->maximized;
}

static GtkWidget *
strip_button (const char *icon, const char *tooltip, const char *action, const char *kind)
{
  GtkWidget *button = gtk_button_new_from_icon_name (icon);

  gtk_widget_add_css_class (button, "flat");
  gtk_widget_set_valign (button, GTK_ALIGN_CENTER);
  gtk_widget_set_tooltip_text (button, tooltip);
  gtk_actionable_set_action_name (GTK_ACTIONABLE (button), action);
  gtk_actionable_set_action_target (GTK_ACTIONABLE (button), "s", kind);
  return button;
}

SlViewPane *
sl_view_pane_new (SlPlotView *view, const char *title)
{
  SlViewPane *self = g_object_new (SL_TYPE_VIEW_PANE, NULL);
  const char *kind = sl_figure_kind_name ((SlFigureKind) sl_plot_view_get_kind (view));
  GtkWidget *strip = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 0);
  GtkWidget *label = gtk_label_new (title);
  GtkWidget *export = strip_button ("document-save-as-symbolic", _("Export Figure…"), "win.export-figure", kind);

  g_return_val_if_fail (SL_IS_PLOT_VIEW (view), NULL);

  gtk_widget_set_margin_start (strip, 8);
  gtk_widget_set_margin_end (strip, 2);
  gtk_label_set_xalign (GTK_LABEL (label), 0.0);
  gtk_label_set_ellipsize (GTK_LABEL (label), PANGO_ELLIPSIZE_END);
  gtk_widget_set_hexpand (label, TRUE);
  gtk_widget_add_css_class (label, "dim-label");
  gtk_widget_add_css_class (label, "caption-heading");
  self->maximize = strip_button ("view-fullscreen-symbolic", NULL, "win.maximize-view", kind);
  update_maximize_button (self);
  gtk_box_append (GTK_BOX (strip), label);
  gtk_box_append (GTK_BOX (strip), export);
  gtk_box_append (GTK_BOX (strip), self->maximize);

  gtk_widget_set_vexpand (GTK_WIDGET (view), TRUE);
  gtk_widget_set_hexpand (GTK_WIDGET (view), TRUE);
  gtk_box_append (GTK_BOX (self->box), strip);
  gtk_box_append (GTK_BOX (self->box), gtk_separator_new (GTK_ORIENTATION_HORIZONTAL));
  gtk_box_append (GTK_BOX (self->box), GTK_WIDGET (view));
  return self;
}

static void
sl_view_pane_dispose (GObject *object)
{
  SlViewPane *self = SL_VIEW_PANE (object);

  g_clear_pointer (&self->box, gtk_widget_unparent);
  G_OBJECT_CLASS (sl_view_pane_parent_class)->dispose (object);
}

static void
sl_view_pane_class_init (SlViewPaneClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = sl_view_pane_dispose;
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "viewpane");
}

static void
sl_view_pane_init (SlViewPane *self)
{
  self->box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  gtk_widget_set_parent (self->box, GTK_WIDGET (self));
  gtk_widget_set_vexpand (GTK_WIDGET (self), TRUE);
  gtk_widget_set_hexpand (GTK_WIDGET (self), TRUE);
}
