/* fuzz-project.c: opening a project file that may be hostile or damaged
 * (a mutated SQLite file).  Opening either refuses with a message or gives
 * a project on which reading the stars, the summary of what it holds and
 * the ledger either work or fail with a message; nothing may crash, and a
 * refused file is left byte for byte as it was. */
#include "fuzz-common.h"
#include "ledger.h"
#include "project.h"
#include "starset.h"
#include "summary.h"

int
LLVMFuzzerInitialize (int *argc, char ***argv)
{
  fuzz_init ();
  return 0;
}

static void
read_everything (SlProject *project)
{
  g_autoptr (GError) error = NULL;
  SlStarSet *stars = sl_star_set_load (project, NULL, &error);
  GPtrArray *entries;
  SlProjectSummary *summary;

  if (stars)
    sl_star_set_free (stars);
  g_clear_error (&error);
  entries = sl_ledger_read (project, &error);
  if (entries)
    g_ptr_array_unref (entries);
  g_clear_error (&error);
  summary = sl_project_summary (project, &error);
  if (summary)
    sl_project_summary_free (summary);
}

int
LLVMFuzzerTestOneInput (const uint8_t *data, size_t size)
{
  g_autofree char *path = g_build_filename (fuzz_dir, "mutated.starledger", NULL);
  g_autofree char *after = NULL;
  g_autoptr (GError) error = NULL;
  SlProject *project;
  gsize after_size;

  fuzz_remove_project (path);
  fuzz_write_file (path, data, size);
  project = sl_project_open (path, &error);
  if (project == NULL)
    {
      g_assert_nonnull (error);
      g_assert_true (g_file_get_contents (path, &after, &after_size, NULL));
      g_assert_true (after_size == size && memcmp (after, data, size) == 0);
      return 0;
    }
  read_everything (project);
  sl_project_close (project);
  return 0;
}
