/* test-mime.c: the project file type (data/org.starledger.Starledger.mime.xml)
 * as a file manager sees it: shared-mime-info's update-mime-database
 * compiles it into a scratch data directory, and GIO's content-type
 * sniffing (the freedesktop.org shared MIME-info specification's magic
 * and globs) must tell a Starledger project from any other SQLite file. */
#include <gio/gio.h>
#include <glib/gstdio.h>
#include <sqlite3.h>
#include <string.h>

#include "project.h"
#include "test-util.h"

#define PROJECT_TYPE "application/x-starledger-project"

static char *data_dir;   /* the scratch XDG data directory with our type */

static char *
guess_from_contents (const char *path)
{
  g_autofree char *contents = NULL;
  gsize length;

  g_assert_true (g_file_get_contents (path, &contents, &length, NULL));
  return g_content_type_guess (NULL, (const guchar *) contents, MIN (length, 4096), NULL);
}

/* A project, named anything, is recognised by its header alone: SQLite's
 * magic string and the application id "SLGR" at byte 68. */
static void
test_project_by_contents (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *path = g_build_filename (dir, "renamed.db", NULL);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = sl_project_create (path, &error);
  g_autofree char *type = NULL;

  g_assert_no_error (error);
  g_clear_pointer (&project, sl_project_close);
  type = guess_from_contents (path);
  g_assert_cmpstr (type, ==, PROJECT_TYPE);
  g_assert_true (g_content_type_is_a (type, "application/vnd.sqlite3"));
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* Any other SQLite database is not a project. */
static void
test_other_sqlite_file (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *path = g_build_filename (dir, "other.db", NULL);
  g_autofree char *type = NULL;
  sqlite3 *db;

  g_assert_cmpint (sqlite3_open (path, &db), ==, SQLITE_OK);
  g_assert_cmpint (sqlite3_exec (db, "PRAGMA application_id = 1; CREATE TABLE t (x)", NULL, NULL, NULL), ==,
                   SQLITE_OK);
  sqlite3_close (db);
  type = guess_from_contents (path);
  g_assert_cmpstr (type, !=, PROJECT_TYPE);
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* By name alone (a file not yet read, or empty): the .starledger glob. */
static void
test_project_by_name (void)
{
  g_autofree char *type = g_content_type_guess ("targets.starledger", NULL, 0, NULL);

  g_assert_cmpstr (type, ==, PROJECT_TYPE);
}

/* update-mime-database on a data directory holding only our package. */
static gboolean
install_mime_package (const char *xml)
{
  g_autofree char *packages = NULL;
  g_autofree char *mime = NULL;
  g_autofree char *target = NULL;
  g_autofree char *contents = NULL;
  g_autoptr (GError) error = NULL;
  const char *argv[] = { "update-mime-database", NULL, NULL };
  int status;

  data_dir = sl_test_scratch_new ();
  mime = g_build_filename (data_dir, "mime", NULL);
  packages = g_build_filename (mime, "packages", NULL);
  target = g_build_filename (packages, "org.starledger.Starledger.xml", NULL);
  g_assert_cmpint (g_mkdir_with_parents (packages, 0700), ==, 0);
  g_assert_true (g_file_get_contents (xml, &contents, NULL, NULL));
  g_assert_true (g_file_set_contents (target, contents, -1, NULL));
  argv[1] = mime;
  if (!g_spawn_sync (NULL, (char **) argv, NULL, G_SPAWN_SEARCH_PATH, NULL, NULL, NULL, NULL, &status, &error))
    return FALSE;
  g_assert_true (g_spawn_check_wait_status (status, NULL));
  return TRUE;
}

int
main (int argc, char **argv)
{
  const char *xml = g_getenv ("STARLEDGER_MIME_XML");
  g_autofree char *dirs = NULL;
  int result;

  g_test_init (&argc, &argv, NULL);
  g_assert_nonnull (xml);
  if (!install_mime_package (xml))
    {
      g_test_skip ("update-mime-database (shared-mime-info) is not installed");
      return g_test_run ();
    }
  /* Ours first, then the system's (for application/vnd.sqlite3); GIO reads
   * the variable at its first content-type call, below. */
  dirs = g_strconcat (data_dir, ":/usr/local/share:/usr/share", NULL);
  g_setenv ("XDG_DATA_DIRS", dirs, TRUE);
  g_setenv ("XDG_DATA_HOME", data_dir, TRUE);

  g_test_add_func ("/mime/project-by-contents", test_project_by_contents);
  g_test_add_func ("/mime/other-sqlite-file", test_other_sqlite_file);
  g_test_add_func ("/mime/project-by-name", test_project_by_name);
  result = g_test_run ();
  sl_test_scratch_free (g_steal_pointer (&data_dir));
  return result;
}
