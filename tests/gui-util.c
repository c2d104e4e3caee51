/* gui-util.c: finding widgets and waiting for frames (gui-util.h). */
#include "gui-util.h"

GtkWidget *
sl_gui_find_widget (GtkWidget *root, SlWidgetTest test, gconstpointer data)
{
  if (test (root, data))
    return root;
  for (GtkWidget *child = gtk_widget_get_first_child (root); child; child = gtk_widget_get_next_sibling (child))
    {
      GtkWidget *found = sl_gui_find_widget (child, test, data);

      if (found)
        return found;
    }
  return NULL;
}

gboolean
sl_gui_is_named (GtkWidget *widget, gconstpointer name)
{
  return g_strcmp0 (gtk_widget_get_name (widget), name) == 0;
}

gboolean
sl_gui_is_of_type (GtkWidget *widget, gconstpointer type)
{
  return G_TYPE_CHECK_INSTANCE_TYPE (widget, GPOINTER_TO_SIZE (type));
}

GtkWidget *
sl_gui_find_named (GtkWidget *root, const char *name)
{
  return sl_gui_find_widget (root, sl_gui_is_named, name);
}

GtkWidget *
sl_gui_find_descendant (GtkWidget *root, GType type)
{
  return sl_gui_find_widget (root, sl_gui_is_of_type, GSIZE_TO_POINTER (type));
}

GtkWindow *
sl_gui_find_toplevel (GType type)
{
  GListModel *toplevels = gtk_window_get_toplevels ();   /* not ours */

  for (guint i = 0; i < g_list_model_get_n_items (toplevels); i++)
    {
      g_autoptr (GObject) window = g_list_model_get_item (toplevels, i);

      if (G_TYPE_CHECK_INSTANCE_TYPE (window, type) && gtk_widget_get_visible (GTK_WIDGET (window)))
        return GTK_WINDOW (window);
    }
  return NULL;
}

gboolean
sl_gui_choose (GtkDropDown *chooser, const char *text)
{
  GListModel *model = gtk_drop_down_get_model (chooser);

  for (guint i = 0; i < g_list_model_get_n_items (model); i++)
    if (g_strcmp0 (gtk_string_list_get_string (GTK_STRING_LIST (model), i), text) == 0)
      {
        gtk_drop_down_set_selected (chooser, i);
        return TRUE;
      }
  return FALSE;
}

static gboolean
wake (gpointer data)
{
  return G_SOURCE_CONTINUE;
}

void
sl_gui_wake_loop_every (guint ms)
{
  g_timeout_add (ms, wake, NULL);
}

static void
count_paint (GdkFrameClock *clock, guint *painted)
{
  (*painted)++;
}

const char *
sl_gui_paint (GtkWidget *toplevel, double timeout_s)
{
  gint64 end = g_get_monotonic_time () + (gint64) (timeout_s * G_USEC_PER_SEC);
  GdkFrameClock *clock;
  guint painted = 0;
  gulong handler;

  while (!gtk_widget_get_mapped (toplevel) || gtk_widget_get_frame_clock (toplevel) == NULL)
    {
      if (g_get_monotonic_time () > end)
        return "was never mapped";
      g_main_context_iteration (NULL, TRUE);
    }
  clock = gtk_widget_get_frame_clock (toplevel);
  handler = g_signal_connect (clock, "after-paint", G_CALLBACK (count_paint), &painted);
  gtk_widget_queue_draw (toplevel);
  while (painted == 0 && g_get_monotonic_time () <= end)
    g_main_context_iteration (NULL, TRUE);
  g_signal_handler_disconnect (clock, handler);
  return painted > 0 ? NULL : "painted no frame";
}
