/* bench-match-list.c: times what the window's Matches page reads
 * (match-list.c) on a project with many matches: the counts, the first
 * page of 200 rows, a search that finds one row and one that finds none.
 * Not a test; tests/bench/crossmatch runs it on the project its import
 * --match-radius made.
 *
 * Usage: bench-match-list PROJECT
 */
#include <stdio.h>

#include "match-list.h"

int
main (int argc, char **argv)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GArray) page = NULL;
  g_autoptr (GArray) one = NULL;
  g_autoptr (GArray) none = NULL;
  g_autofree char *search = NULL;
  SlMatchCounts counts;
  gboolean more;
  gint64 t0, t1, t2, t3, t4;

  if (argc != 2)
    {
      fprintf (stderr, "usage: bench-match-list PROJECT\n");
      return 2;
    }
  project = sl_project_open (argv[1], &error);
  if (project == NULL)
    {
      fprintf (stderr, "%s\n", error->message);
      return 1;
    }
  t0 = g_get_monotonic_time ();
  if (!sl_match_counts (project, &counts, &error))
    goto failed;
  t1 = g_get_monotonic_time ();
  page = sl_match_list (project, NULL, 200, &more, &error);
  if (page == NULL)
    goto failed;
  t2 = g_get_monotonic_time ();
  /* The last row of the page, by its star: found through the index. */
  search = g_strdup (page->len ? g_array_index (page, SlMatchListRow, page->len - 1).info.star : "x");
  one = sl_match_list (project, search, 200, &more, &error);
  if (one == NULL)
    goto failed;
  t3 = g_get_monotonic_time ();
  none = sl_match_list (project, "no such star", 200, &more, &error);
  if (none == NULL)
    goto failed;
  t4 = g_get_monotonic_time ();
  printf ("%" G_GINT64_FORMAT " matches (%" G_GINT64_FORMAT " ambiguous): counts %.2f s, first %u rows %.2f s, "
          "search '%s' (%u rows) %.2f s, search finding nothing %.2f s\n",
          counts.matched + counts.ambiguous + counts.split, counts.ambiguous, (t1 - t0) / 1e6, page->len,
          (t2 - t1) / 1e6, search, one->len, (t3 - t2) / 1e6, (t4 - t3) / 1e6);
  return one->len >= 1 && none->len == 0 ? 0 : 1;

failed:
  fprintf (stderr, "%s\n", error->message);
  return 1;
}
