/* test-util.c: scratch directories, files and projects for the tests. */
#include "test-util.h"

#include <gio/gio.h>

char *
sl_test_scratch_new (void)
{
  g_autoptr (GError) error = NULL;
  char *dir = g_dir_make_tmp ("starledger-test-XXXXXX", &error);

  g_assert_no_error (error);
  return dir;
}

static void
remove_tree (GFile *file)
{
  g_autoptr (GFileEnumerator) children =
    g_file_enumerate_children (file, G_FILE_ATTRIBUTE_STANDARD_NAME,
                               G_FILE_QUERY_INFO_NOFOLLOW_SYMLINKS, NULL, NULL);

  if (children != NULL)
    {
      GFileInfo *info;

      while ((info = g_file_enumerator_next_file (children, NULL, NULL)) != NULL)
        {
          g_autoptr (GFile) child = g_file_get_child (file, g_file_info_get_name (info));

          remove_tree (child);
          g_object_unref (info);
        }
    }
  g_file_delete (file, NULL, NULL);
}

void
sl_test_scratch_free (char *dir)
{
  g_autoptr (GFile) file = NULL;

  if (dir == NULL)
    return;
  file = g_file_new_for_path (dir);
  remove_tree (file);
  g_free (dir);
}

char *
sl_test_write_file (const char *dir, const char *name, const char *contents, gssize length)
{
  g_autoptr (GError) error = NULL;
  char *path = g_build_filename (dir, name, NULL);

  g_file_set_contents (path, contents, length, &error);
  g_assert_no_error (error);
  return path;
}

void
sl_test_project_set_up (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *path = NULL;

  f->dir = sl_test_scratch_new ();
  path = g_build_filename (f->dir, "test.starledger", NULL);
  f->project = sl_project_create (path, &error);
  g_assert_no_error (error);
  f->db = sl_project_db (f->project);
}

void
sl_test_project_tear_down (SlTestProject *f, gconstpointer data)
{
  sl_project_close (f->project);
  sl_test_scratch_free (f->dir);
}

/* Prepares SQL and steps to its first row; the caller finalizes. */
static sqlite3_stmt *
query_first_row (sqlite3 *db, const char *sql)
{
  sqlite3_stmt *stmt;

  if (sqlite3_prepare_v2 (db, sql, -1, &stmt, NULL) != SQLITE_OK)
    g_error ("%s: %s", sql, sqlite3_errmsg (db));
  g_assert_cmpint (sqlite3_step (stmt), ==, SQLITE_ROW);
  return stmt;
}

gint64
sl_test_query_int (sqlite3 *db, const char *sql)
{
  sqlite3_stmt *stmt = query_first_row (db, sql);
  gint64 value = sqlite3_column_int64 (stmt, 0);

  sqlite3_finalize (stmt);
  return value;
}

char *
sl_test_query_text (sqlite3 *db, const char *sql)
{
  sqlite3_stmt *stmt = query_first_row (db, sql);
  char *value = g_strdup ((const char *) sqlite3_column_text (stmt, 0));

  sqlite3_finalize (stmt);
  return value;
}
