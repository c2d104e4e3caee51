/* sl-recent-projects.c: the projects opened lately, and the welcome page's
 * list of them.
 *
 * Opened projects go into the desktop's shared recent-files store
 * (GtkRecentManager, $XDG_DATA_HOME/recently-used.xbel) in the group
 * "Starledger", so file choosers show them too; the list shows the items of
 * that group (and files named *.starledger that others put there) that
 * still exist, newest first, and follows the store as it changes (any
 * program's opening a file changes it).
 */
#include "sl-recent-projects.h"

#include <glib/gi18n.h>
#include <string.h>

#define RECENT_GROUP "Starledger"
#define MAX_SHOWN 8

void
sl_recent_projects_add (const char *path)
{
  g_autofree char *uri = NULL;
  const char *groups[] = { RECENT_GROUP, NULL };
  GtkRecentData data = {
    .display_name = NULL,
    .description = NULL,
    .mime_type = (char *) "application/vnd.sqlite3",
    .app_name = (char *) "Starledger",
    .app_exec = (char *) "starledger %u",
    .groups = (char **) groups,
    .is_private = FALSE,
  };

  g_return_if_fail (path != NULL);
  uri = g_filename_to_uri (path, NULL, NULL);
  if (uri)
    gtk_recent_manager_add_full (gtk_recent_manager_get_default (), uri, &data);
}

static char *
demo_path (void)
{
  return g_build_filename (g_get_user_cache_dir (), "starledger", "demo.starledger", NULL);
}

typedef struct {
  char      *path;
  GDateTime *when;
} Recent;

static void
recent_free (gpointer data)
{
  Recent *recent = data;

  g_free (recent->path);
  g_date_time_unref (recent->when);
  g_free (recent);
}

static int
newest_first (gconstpointer a, gconstpointer b)
{
  const Recent *ra = *(const Recent *const *) a, *rb = *(const Recent *const *) b;

  return g_date_time_compare (rb->when, ra->when);
}

/* The items to show, newest first, each with when it was last opened. */
static GPtrArray *
recent_projects (guint max)
{
  GtkRecentManager *manager = gtk_recent_manager_get_default ();
  GList *items = gtk_recent_manager_get_items (manager);
  GPtrArray *found = g_ptr_array_new_with_free_func (recent_free);
  g_autofree char *demo = demo_path ();

  for (GList *l = items; l; l = l->next)
    {
      GtkRecentInfo *info = l->data;
      g_autofree char *path = g_filename_from_uri (gtk_recent_info_get_uri (info), NULL, NULL);
      Recent *recent;

      if (path == NULL || strcmp (path, demo) == 0
          || !(gtk_recent_info_has_group (info, RECENT_GROUP) || g_str_has_suffix (path, ".starledger"))
          || !g_file_test (path, G_FILE_TEST_IS_REGULAR))
        continue;
      recent = g_new (Recent, 1);
      recent->path = g_steal_pointer (&path);
      recent->when = g_date_time_ref (gtk_recent_info_get_modified (info));
      g_ptr_array_add (found, recent);
    }
  g_list_free_full (items, (GDestroyNotify) gtk_recent_info_unref);
  g_ptr_array_sort (found, newest_first);
  if (found->len > max)
    g_ptr_array_set_size (found, max);
  return found;
}

GStrv
sl_recent_projects_paths (guint max)
{
  g_autoptr (GPtrArray) found = recent_projects (max);
  GStrv paths = g_new0 (char *, found->len + 1);

  for (guint i = 0; i < found->len; i++)
    paths[i] = g_strdup (((Recent *) found->pdata[i])->path);
  return paths;
}

/* ------------------------------------------------------------------ */
/* The list                                                           */

struct _SlRecentProjects {
  AdwBin            parent_instance;

  GtkListBox       *list;
  GtkRecentManager *manager;    /* the default one, not ours */
  gulong            changed;
};

G_DEFINE_FINAL_TYPE (SlRecentProjects, sl_recent_projects, ADW_TYPE_BIN)

enum { PROJECT_ACTIVATED, N_SIGNALS };
static guint signals[N_SIGNALS];

/* "today at 14:02", "yesterday at 09:15", "28 November 2026" */
static char *
when_text (GDateTime *when)
{
  g_autoptr (GDateTime) local = g_date_time_to_local (when);
  g_autoptr (GDateTime) now = g_date_time_new_now_local ();
  g_autoptr (GDateTime) yesterday = g_date_time_add_days (now, -1);
  g_autofree char *clock = g_date_time_format (local, "%H:%M");

#define SAME_DAY(a, b) (g_date_time_get_year (a) == g_date_time_get_year (b) \
                        && g_date_time_get_day_of_year (a) == g_date_time_get_day_of_year (b))
  if (SAME_DAY (local, now))
    return g_strdup_printf (_("today at %s"), clock);
  if (SAME_DAY (local, yesterday))
    return g_strdup_printf (_("yesterday at %s"), clock);
#undef SAME_DAY
  /* TRANSLATORS: a date as g_date_time_format writes it. */
  return g_date_time_format (local, _("%-d %B %Y"));
}

char *
sl_path_for_display (const char *path)
{
  const char *home = g_get_home_dir ();
  gsize n = strlen (home);

  g_return_val_if_fail (path != NULL, NULL);
  if (n > 1 && g_str_has_prefix (path, home) && (path[n] == '\0' || path[n] == G_DIR_SEPARATOR))
    return g_strconcat ("~", path + n, NULL);
  return g_strdup (path);
}

/* The folder, with the home folder as "~" to keep it short. */
static char *
folder_text (const char *path)
{
  g_autofree char *folder = g_path_get_dirname (path);

  return sl_path_for_display (folder);
}

static void
rebuild (SlRecentProjects *self)
{
  g_autoptr (GPtrArray) found = recent_projects (MAX_SHOWN);
  GtkWidget *child;

  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->list))) != NULL)
    gtk_list_box_remove (self->list, child);
  for (guint i = 0; i < found->len; i++)
    {
      Recent *recent = found->pdata[i];
      GtkWidget *row = adw_action_row_new ();
      g_autofree char *name = g_path_get_basename (recent->path);
      g_autofree char *folder = folder_text (recent->path);
      g_autofree char *when = when_text (recent->when);
      g_autofree char *subtitle = NULL;

      /* TRANSLATORS: a project's folder, then when it was last opened. */
      subtitle = g_strdup_printf (_("%s · opened %s"), folder, when);
      adw_preferences_row_set_use_markup (ADW_PREFERENCES_ROW (row), FALSE);
      adw_preferences_row_set_title (ADW_PREFERENCES_ROW (row), name);
      adw_action_row_set_subtitle (ADW_ACTION_ROW (row), subtitle);
      adw_action_row_add_suffix (ADW_ACTION_ROW (row), gtk_image_new_from_icon_name ("go-next-symbolic"));
      gtk_list_box_row_set_activatable (GTK_LIST_BOX_ROW (row), TRUE);
      gtk_widget_set_tooltip_text (row, recent->path);
      g_object_set_data_full (G_OBJECT (row), "sl-path", g_strdup (recent->path), g_free);
      gtk_list_box_append (self->list, row);
    }
  gtk_widget_set_visible (GTK_WIDGET (self), found->len > 0);
}

static void
on_row_activated (GtkListBox *list, GtkListBoxRow *row, SlRecentProjects *self)
{
  const char *path = g_object_get_data (G_OBJECT (row), "sl-path");

  if (path)
    g_signal_emit (self, signals[PROJECT_ACTIVATED], 0, path);
}

static void
sl_recent_projects_dispose (GObject *object)
{
  SlRecentProjects *self = SL_RECENT_PROJECTS (object);

  g_clear_signal_handler (&self->changed, self->manager);
  self->manager = NULL;
  G_OBJECT_CLASS (sl_recent_projects_parent_class)->dispose (object);
}

static void
sl_recent_projects_class_init (SlRecentProjectsClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->dispose = sl_recent_projects_dispose;
  signals[PROJECT_ACTIVATED] = g_signal_new ("project-activated", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0,
                                             NULL, NULL, NULL, G_TYPE_NONE, 1, G_TYPE_STRING);
}

static void
sl_recent_projects_init (SlRecentProjects *self)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 12);
  GtkWidget *heading = gtk_label_new (_("Recent Projects"));

  gtk_label_set_xalign (GTK_LABEL (heading), 0.0);
  gtk_widget_add_css_class (heading, "heading");
  gtk_box_append (GTK_BOX (box), heading);
  self->list = GTK_LIST_BOX (gtk_list_box_new ());
  gtk_list_box_set_selection_mode (self->list, GTK_SELECTION_NONE);
  gtk_widget_add_css_class (GTK_WIDGET (self->list), "boxed-list");
  g_signal_connect (self->list, "row-activated", G_CALLBACK (on_row_activated), self);
  gtk_box_append (GTK_BOX (box), GTK_WIDGET (self->list));
  gtk_widget_set_size_request (box, 460, -1);
  adw_bin_set_child (ADW_BIN (self), box);

  self->manager = gtk_recent_manager_get_default ();
  self->changed = g_signal_connect_swapped (self->manager, "changed", G_CALLBACK (rebuild), self);
  rebuild (self);
}

GtkWidget *
sl_recent_projects_new (void)
{
  return g_object_new (SL_TYPE_RECENT_PROJECTS, NULL);
}
