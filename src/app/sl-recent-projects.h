/* sl-recent-projects.h: the Starledger projects opened lately (from
 * GtkRecentManager), and the welcome page's list of them: name, folder and
 * when each was last opened; a click opens it. */
#pragma once

#include <adwaita.h>

G_BEGIN_DECLS

/* Records that the project at PATH was opened, in the recent-files store
 * every desktop program shares (GtkRecentManager), in our group. */
void       sl_recent_projects_add (const char *path);

/* The paths (a NULL-terminated array, newest first, at most MAX) of the
 * Starledger projects opened lately that still exist, without the demo
 * project (it has its own button).  Free with g_strfreev. */
GStrv      sl_recent_projects_paths (guint max);

/* PATH as the window shows it: under the home folder as "~/...", to keep
 * it short; any other path as it is.  Not for a command line. */
char      *sl_path_for_display (const char *path);

#define SL_TYPE_RECENT_PROJECTS (sl_recent_projects_get_type ())
G_DECLARE_FINAL_TYPE (SlRecentProjects, sl_recent_projects, SL, RECENT_PROJECTS, AdwBin)

/* The list; hidden while there is nothing to show.  Emits
 * "project-activated" (the path) when a row is clicked. */
GtkWidget *sl_recent_projects_new (void);

G_END_DECLS
