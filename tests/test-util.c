/* test-util.c: scratch directories and files for the tests. */
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
