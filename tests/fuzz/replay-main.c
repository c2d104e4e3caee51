/* replay-main.c: runs a fuzz target once on each file given (or each file
 * in each directory given), without libFuzzer: the ordinary build replays
 * the seed corpus and every input that once crashed (regressions/) on
 * every test run, with or without clang.  Prints TAP, one line a file. */
#include <glib.h>
#include <stdint.h>
#include <stdio.h>

int LLVMFuzzerTestOneInput (const uint8_t *data, size_t size);
int LLVMFuzzerInitialize (int *argc, char ***argv);

static guint n_run;

static void
replay_file (const char *path)
{
  g_autofree char *contents = NULL;
  gsize length;

  if (!g_file_get_contents (path, &contents, &length, NULL))
    g_error ("cannot read %s", path);
  LLVMFuzzerTestOneInput ((const uint8_t *) contents, length);
  printf ("ok %u %s\n", ++n_run, path);
}

static int
compare_names (gconstpointer a, gconstpointer b)
{
  return g_strcmp0 (*(const char *const *) a, *(const char *const *) b);
}

static void
replay (const char *path)
{
  g_autoptr (GDir) dir = g_dir_open (path, 0, NULL);
  g_autoptr (GPtrArray) names = g_ptr_array_new_with_free_func (g_free);
  const char *name;

  if (dir == NULL)
    {
      replay_file (path);
      return;
    }
  while ((name = g_dir_read_name (dir)))
    g_ptr_array_add (names, g_build_filename (path, name, NULL));
  g_ptr_array_sort (names, compare_names);
  for (guint i = 0; i < names->len; i++)
    replay_file (names->pdata[i]);
}

int
main (int argc, char **argv)
{
  LLVMFuzzerInitialize (&argc, &argv);
  for (int i = 1; i < argc; i++)
    replay (argv[i]);
  printf ("1..%u\n", n_run);
  return n_run > 0 ? 0 : 1;
}
