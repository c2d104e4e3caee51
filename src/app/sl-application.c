/* sl-application.c: application start-up, app actions and file opening. */
#include "sl-application.h"

#include <glib/gi18n.h>
#include <stdlib.h>

#include "sl-window.h"

struct _SlApplication {
  AdwApplication parent_instance;
  gboolean       exit_after_startup;   /* for the smoke test: draw once, then quit */
  gboolean       demo;                 /* open the demo project at start */
  GStrv          select;               /* --select: stars to select once a project is open */
};

G_DEFINE_FINAL_TYPE (SlApplication, sl_application, ADW_TYPE_APPLICATION)

const char *
sl_application_demo_dir (void)
{
  const char *dir = g_getenv ("STARLEDGER_DEMO_DIR");

  return dir && *dir ? dir : PKGDATADIR "/demo";
}

static void
show_about (GSimpleAction *action, GVariant *parameter, gpointer user_data)
{
  GtkApplication *app = GTK_APPLICATION (user_data);
  const char *developers[] = { _("The Starledger team"), NULL };

  adw_show_about_window (gtk_application_get_active_window (app),
                         "application-name", "Starledger",
                         "application-icon", SL_APPLICATION_ID,
                         "version", PACKAGE_VERSION,
                         "comments", _("Curate a target list of stars: measurements, derived quantities "
                                       "with honest uncertainties, figures for papers, and the trail of "
                                       "every number."),
                         "developers", developers,
                         "license-type", GTK_LICENSE_GPL_3_0,
                         NULL);
}

static void
quit (GSimpleAction *action, GVariant *parameter, gpointer user_data)
{
  g_application_quit (G_APPLICATION (user_data));
}

static const GActionEntry app_actions[] = {
  { "about", show_about },
  { "quit", quit },
};

static void
sl_application_startup (GApplication *app)
{
  static const char *quit_accels[] = { "<Control>q", NULL };

  G_APPLICATION_CLASS (sl_application_parent_class)->startup (app);
  g_action_map_add_action_entries (G_ACTION_MAP (app), app_actions, G_N_ELEMENTS (app_actions), app);
  gtk_application_set_accels_for_action (GTK_APPLICATION (app), "app.quit", quit_accels);
}

/* Quits once the window has drawn: the smoke test's proof that the
 * application starts, loads a project and draws. */
static gboolean
quit_after_first_frame (GtkWidget *widget, GdkFrameClock *clock, gpointer user_data)
{
  g_print ("starledger: started and drew the first frame\n");
  g_application_quit (G_APPLICATION (user_data));
  return G_SOURCE_REMOVE;
}

static SlWindow *
present_window (SlApplication *self)
{
  SlWindow *window = sl_window_new (GTK_APPLICATION (self));

  if (self->exit_after_startup)
    gtk_widget_add_tick_callback (GTK_WIDGET (window), quit_after_first_frame, self, NULL);
  gtk_window_present (GTK_WINDOW (window));
  return window;
}

static void
sl_application_activate (GApplication *app)
{
  SlApplication *self = SL_APPLICATION (app);
  GtkWindow *active = gtk_application_get_active_window (GTK_APPLICATION (app));
  g_autoptr (GError) error = NULL;
  SlWindow *window;

  if (active)
    {
      gtk_window_present (active);
      return;
    }
  window = present_window (self);
  if (self->demo && sl_window_open_demo (window, &error))
    sl_window_set_selection (window, (const char *const *) self->select);
  else if (self->demo)
    {
      g_printerr ("starledger: %s\n", error->message);
      /* The smoke test must fail, not draw an empty window. */
      if (self->exit_after_startup)
        exit (1);
    }
}

static void
sl_application_open (GApplication *app, GFile **files, int n_files, const char *hint)
{
  SlApplication *self = SL_APPLICATION (app);

  for (int i = 0; i < n_files; i++)
    {
      g_autoptr (GError) error = NULL;
      g_autofree char *path = g_file_get_path (files[i]);
      SlWindow *window = present_window (self);

      if (path == NULL || !sl_window_open_project (window, path, &error))
        g_printerr ("starledger: %s\n", error ? error->message : _("not a local file"));
      else
        sl_window_set_selection (window, (const char *const *) self->select);
    }
}

static int
sl_application_handle_local_options (GApplication *app, GVariantDict *options)
{
  SlApplication *self = SL_APPLICATION (app);

  self->exit_after_startup = g_variant_dict_contains (options, "exit-after-startup");
  self->demo = g_variant_dict_contains (options, "demo");
  g_clear_pointer (&self->select, g_strfreev);
  g_variant_dict_lookup (options, "select", "^as", &self->select);
  return -1;
}

static void
sl_application_finalize (GObject *object)
{
  g_strfreev (SL_APPLICATION (object)->select);
  G_OBJECT_CLASS (sl_application_parent_class)->finalize (object);
}

static void
sl_application_class_init (SlApplicationClass *klass)
{
  GApplicationClass *app_class = G_APPLICATION_CLASS (klass);

  G_OBJECT_CLASS (klass)->finalize = sl_application_finalize;

  app_class->startup = sl_application_startup;
  app_class->activate = sl_application_activate;
  app_class->open = sl_application_open;
  app_class->handle_local_options = sl_application_handle_local_options;
}

static void
sl_application_init (SlApplication *self)
{
  const GOptionEntry options[] = {
    { "demo", 0, 0, G_OPTION_ARG_NONE, NULL, N_("Open the demo project"), NULL },
    { "exit-after-startup", 0, 0, G_OPTION_ARG_NONE, NULL, N_("Quit once the window has drawn (for tests)"), NULL },
    { "select", 0, 0, G_OPTION_ARG_STRING_ARRAY, NULL, N_("Select this star once the project is open (repeatable)"), N_("ID") },
    { NULL }
  };

  g_application_add_main_option_entries (G_APPLICATION (self), options);
}

SlApplication *
sl_application_new (void)
{
  return g_object_new (SL_TYPE_APPLICATION,
                       "application-id", SL_APPLICATION_ID,
                       "flags", G_APPLICATION_HANDLES_OPEN | G_APPLICATION_NON_UNIQUE,
                       "resource-base-path", "/org/starledger/Starledger",
                       NULL);
}
