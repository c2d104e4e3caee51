/* bench-crossmatch.c: times the cross-match alone, in memory, on the
 * benchmark's catalogues: sl_crossmatch (propagation of both sides to
 * J2016.0, the zone index, one query per row, the ambiguity rule), without
 * reading a project or writing one.  Not a test; tests/bench/crossmatch
 * runs it beside starledger-cli import --match-radius and astropy.
 *
 * Usage: bench-crossmatch FIRST.csv SECOND.csv RADIUS_ARCSEC [PAIRS.txt]
 *
 * FIRST.csv is gen-catalogue.py's (id,ra,dec,parallax,parallax_err,pmra,
 * pmdec,..., taken as epoch J2000.0), SECOND.csv gen-second-epoch.py's
 * (id,ra,dec,epoch,...).  Prints the seconds of each stage and the counts;
 * PAIRS.txt, if given, receives one line per row of SECOND.csv: the FIRST
 * id of its nearest star within the radius, or "-".
 */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "crossmatch.h"
#include "units.h"

/* The numbers of columns COLUMNS (indexes, ascending) of each data line;
 * the first column's text into IDS if not NULL. */
static GArray *
read_csv (const char *path, const int *columns, guint n_columns, GPtrArray *ids)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (GMappedFile) file = g_mapped_file_new (path, FALSE, &error);
  GArray *values = g_array_new (FALSE, FALSE, sizeof (double));
  const char *p, *end;

  if (file == NULL)
    g_error ("%s", error->message);
  p = g_mapped_file_get_contents (file);
  end = p + g_mapped_file_get_length (file);
  p = memchr (p, '\n', end - p) + 1;   /* the header */
  while (p < end)
    {
      const char *eol = memchr (p, '\n', end - p);
      int column = 0;
      guint want = 0;

      if (eol == NULL)
        eol = end;
      while (p < eol)
        {
          const char *comma = memchr (p, ',', eol - p);
          char cell[64];
          gsize len;

          if (comma == NULL)
            comma = eol;
          len = MIN ((gsize) (comma - p), sizeof cell - 1);
          memcpy (cell, p, len);
          cell[len] = '\0';
          if (column == 0 && ids)
            g_ptr_array_add (ids, g_strdup (cell));
          if (want < n_columns && column == columns[want])
            {
              double v;
              const char *problem;

              if (!sl_parse_number (cell, &v, &problem))
                v = NAN;
              g_array_append_val (values, v);
              want++;
            }
          column++;
          p = comma + 1;
        }
      p = eol + 1;
    }
  return values;
}

int
main (int argc, char **argv)
{
  static const int first_columns[] = { 1, 2, 3, 5, 6 };   /* ra, dec, parallax, pmra, pmdec */
  static const int second_columns[] = { 1, 2, 3 };        /* ra, dec, epoch */
  g_autoptr (GPtrArray) ids = g_ptr_array_new_with_free_func (g_free);
  g_autoptr (GArray) first = NULL;
  g_autoptr (GArray) second = NULL;
  g_autofree SlAstrometry *stars = NULL;
  g_autofree SlAstrometry *rows = NULL;
  g_autofree SlMatch *out = NULL;
  gsize n_stars, n_rows, counts[3] = { 0, 0, 0 };
  double radius, t0, t1, t2;
  const char *problem;

  if (argc < 4 || !sl_parse_number (argv[3], &radius, &problem) || radius <= 0)
    {
      fprintf (stderr, "usage: bench-crossmatch FIRST.csv SECOND.csv RADIUS_ARCSEC [PAIRS.txt]\n");
      return 2;
    }

  t0 = g_get_monotonic_time () / 1e6;
  first = read_csv (argv[1], first_columns, G_N_ELEMENTS (first_columns), ids);
  second = read_csv (argv[2], second_columns, G_N_ELEMENTS (second_columns), NULL);
  n_stars = first->len / G_N_ELEMENTS (first_columns);
  n_rows = second->len / G_N_ELEMENTS (second_columns);
  stars = g_new (SlAstrometry, n_stars);
  rows = g_new (SlAstrometry, n_rows);
  for (gsize i = 0; i < n_stars; i++)
    {
      const double *v = &g_array_index (first, double, i * G_N_ELEMENTS (first_columns));

      sl_astrometry_init (&stars[i]);
      stars[i].ra = v[0];
      stars[i].dec = v[1];
      stars[i].parallax = v[2];
      stars[i].pmra = v[3];
      stars[i].pmdec = v[4];
      stars[i].epoch = 2000.0;
    }
  for (gsize j = 0; j < n_rows; j++)
    {
      const double *v = &g_array_index (second, double, j * G_N_ELEMENTS (second_columns));

      sl_astrometry_init (&rows[j]);
      rows[j].ra = v[0];
      rows[j].dec = v[1];
      rows[j].epoch = v[2];
    }
  out = g_new (SlMatch, n_rows);

  t1 = g_get_monotonic_time () / 1e6;
  sl_crossmatch (stars, n_stars, rows, n_rows, radius, 2016.0, out);
  t2 = g_get_monotonic_time () / 1e6;

  for (gsize j = 0; j < n_rows; j++)
    counts[out[j].status]++;
  printf ("read %.2f s, cross-match %.2f s: %" G_GSIZE_FORMAT " rows against %" G_GSIZE_FORMAT
          " stars; %" G_GSIZE_FORMAT " unique, %" G_GSIZE_FORMAT " ambiguous, %" G_GSIZE_FORMAT " new\n",
          t1 - t0, t2 - t1, n_rows, n_stars, counts[SL_MATCH_UNIQUE], counts[SL_MATCH_AMBIGUOUS],
          counts[SL_MATCH_NONE]);

  if (argc > 4)
    {
      FILE *pairs = fopen (argv[4], "w");

      if (pairs == NULL)
        g_error ("%s: cannot write", argv[4]);
      for (gsize j = 0; j < n_rows; j++)
        fprintf (pairs, "%s\n", out[j].star >= 0 ? (const char *) ids->pdata[out[j].star] : "-");
      fclose (pairs);
    }
  return 0;
}
