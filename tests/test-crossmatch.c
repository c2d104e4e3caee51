/* test-crossmatch.c: propagation to a common epoch against ERFA itself,
 * the declination-zone index against a brute-force search on random
 * sets (RA 0/360, the poles, several positions per star), and synthetic
 * two-catalogue scenarios with known truth: offsets below the radius,
 * different epochs, fast-moving stars, close pairs. */
#include <erfa.h>
#include <erfam.h>
#include <string.h>

#include "crossmatch.h"
#include "test-util.h"

/* ------------------------------------------------------------------ */
/* Propagation                                                        */

/* eraStarpm called by hand with the units it documents (radians, dRA/dt
 * without cos dec, arcsec, two-part Julian dates): the check that
 * sl_astrometry_propagate converts every unit right. */
static void
erfa_reference (const SlAstrometry *a, double epoch, double *ra, double *dec)
{
  double d1, d2, e1, e2, r, d, pr, pd, px, rv;
  double dec1 = a->dec * ERFA_DD2R;
  int status;

  eraEpj2jd (a->epoch, &d1, &d2);
  eraEpj2jd (epoch, &e1, &e2);
  status = eraStarpm (a->ra * ERFA_DD2R, dec1, a->pmra / 1000.0 * ERFA_DAS2R / cos (dec1),
                      a->pmdec / 1000.0 * ERFA_DAS2R, a->parallax / 1000.0, a->vrad,
                      d1, d2, e1, e2, &r, &d, &pr, &pd, &px, &rv);
  g_assert_cmpint (status, ==, 0);
  *ra = eraAnp (r) * ERFA_DR2D;
  *dec = d * ERFA_DR2D;
}

static void
test_propagate_erfa (void)
{
  g_autoptr (GRand) rand = g_rand_new_with_seed (20261202);

  for (int i = 0; i < 2000; i++)
    {
      SlAstrometry a;
      double ra, dec, want_ra, want_dec;
      gboolean moved;

      a.ra = g_rand_double_range (rand, 0, 360);
      a.dec = asin (g_rand_double_range (rand, -0.999, 0.999)) * ERFA_DR2D;
      a.parallax = g_rand_double_range (rand, 1, 800);
      /* Up to a few arcsec a year, within what eraPmsafe leaves alone for
       * this parallax, so both routines must agree to rounding. */
      a.pmra = g_rand_double_range (rand, -1, 1) * a.parallax * 5;
      a.pmdec = g_rand_double_range (rand, -1, 1) * a.parallax * 5;
      a.vrad = g_rand_double_range (rand, -300, 300);
      a.epoch = g_rand_double_range (rand, 1950, 2020);
      moved = sl_astrometry_propagate (&a, 2016.0, &ra, &dec);
      erfa_reference (&a, 2016.0, &want_ra, &want_dec);
      g_assert_true (moved);
      /* 1e-6 arcsec: both are ERFA; only the unit conversions differ. */
      sl_assert_close (sl_sky_separation (ra, dec, want_ra, want_dec), 0, 1e-6,
                       "separation (arcsec) from eraStarpm");
    }
}

/* Barnard's star moves 10.36 arcsec a year and comes towards us at 110
 * km/s, so its proper motion grows (perspective acceleration, d mu/dt =
 * -2 mu v_r / d): over 25 years it moves 25 mu plus half that
 * acceleration times 25^2, by eraStarpm's amount exactly. */
static void
test_propagate_fast_star (void)
{
  SlAstrometry a;
  double ra, dec, want_ra, want_dec;

  sl_astrometry_init (&a);
  a.ra = 269.452075;      /* deg, ICRS at J2000 (rounded) */
  a.dec = 4.693391;
  a.pmra = -798.58;       /* mas/yr */
  a.pmdec = 10328.12;
  a.parallax = 548.31;    /* mas */
  a.vrad = -110.6;        /* km/s */
  a.epoch = 2000.0;
  g_assert_true (sl_astrometry_propagate (&a, 2025.0, &ra, &dec));
  erfa_reference (&a, 2025.0, &want_ra, &want_dec);
  sl_assert_close (sl_sky_separation (ra, dec, want_ra, want_dec), 0, 1e-6, "against eraStarpm (arcsec)");
  {
    double mu = hypot (a.pmra, a.pmdec) / 1000;                  /* arcsec/yr */
    double d_km = 1000.0 / a.parallax * ERFA_DAU / 1000 / ERFA_DAS2R; /* pc -> km */
    double accel = -2 * mu * a.vrad / d_km * ERFA_DJY * ERFA_DAYSEC; /* arcsec/yr^2 */

    sl_assert_close (sl_sky_separation (a.ra, a.dec, ra, dec), 25 * mu + 0.5 * accel * 25 * 25, 0.01,
                     "distance moved (arcsec)");
  }
}

static void
test_propagate_unmoved (void)
{
  SlAstrometry a;
  double ra, dec;

  sl_astrometry_init (&a);
  a.ra = 12.5;
  a.dec = -40.0;
  a.epoch = 2000.0;
  /* No proper motion: stays. */
  g_assert_false (sl_astrometry_propagate (&a, 2016.0, &ra, &dec));
  g_assert_cmpfloat (ra, ==, 12.5);
  g_assert_cmpfloat (dec, ==, -40.0);
  /* No epoch: cannot be moved, even with a proper motion. */
  a.pmra = 100;
  a.pmdec = 100;
  a.epoch = NAN;
  g_assert_false (sl_astrometry_propagate (&a, 2016.0, &ra, &dec));
  g_assert_cmpfloat (ra, ==, 12.5);
  /* The same epoch: nothing to do. */
  a.epoch = 2016.0;
  g_assert_false (sl_astrometry_propagate (&a, 2016.0, &ra, &dec));
  g_assert_cmpfloat (dec, ==, -40.0);
}

/* Without a parallax the motion is a straight line on the sky: 16 years
 * at (30, -40) mas/yr is 16 * 50 mas, in that direction. */
static void
test_propagate_no_parallax (void)
{
  SlAstrometry a;
  double ra, dec;

  sl_astrometry_init (&a);
  a.ra = 150.0;
  a.dec = 60.0;
  a.pmra = 30.0;
  a.pmdec = -40.0;
  a.epoch = 2000.0;
  g_assert_true (sl_astrometry_propagate (&a, 2016.0, &ra, &dec));
  sl_assert_close (sl_sky_separation (a.ra, a.dec, ra, dec), 16 * 50e-3, 1e-6, "distance moved (arcsec)");
  /* Componentwise to 0.01 mas: the track is a great circle, not a line
   * of constant RA rate, and cos dec changes along it. */
  sl_assert_close ((ra - a.ra) * 3600e3 * cos (60 * ERFA_DD2R), 16 * 30.0, 0.01, "moved in RA (mas)");
  sl_assert_close ((dec - a.dec) * 3600e3, 16 * -40.0, 0.01, "moved in dec (mas)");
}

static void
test_separation (void)
{
  sl_assert_close (sl_sky_separation (10, 20, 10, 21), 3600, 1e-9, "one degree of dec");
  sl_assert_close (sl_sky_separation (359.999, 0, 0.001, 0), 7.2, 1e-9, "across RA 0");
  sl_assert_close (sl_sky_separation (0, 89.999, 180, 89.999), 7.2, 1e-6, "across the pole");
  sl_assert_close (sl_sky_separation (0, 0, 180, 0), 180 * 3600, 1e-6, "antipodes");
}

/* ------------------------------------------------------------------ */
/* The index against brute force                                      */

typedef struct {
  double ra, dec;
  gint64 key;
} TestPoint;

/* Every key within RADIUS of (RA, DEC), at its nearest point, sorted as
 * the index sorts: the trivially correct reference. */
static GArray *
brute_force (const TestPoint *points, guint n, double ra, double dec, double radius)
{
  g_autoptr (GHashTable) best = g_hash_table_new_full (g_int64_hash, g_int64_equal, g_free, g_free);
  GArray *found = g_array_new (FALSE, FALSE, sizeof (SlSkyCandidate));
  GHashTableIter iter;
  gpointer k, v;

  for (guint i = 0; i < n; i++)
    {
      double s = sl_sky_separation (ra, dec, points[i].ra, points[i].dec);
      double *old = g_hash_table_lookup (best, &points[i].key);

      if (s > radius)
        continue;
      if (old == NULL)
        g_hash_table_insert (best, g_memdup2 (&points[i].key, sizeof (gint64)), g_memdup2 (&s, sizeof s));
      else if (s < *old)
        *old = s;
    }
  g_hash_table_iter_init (&iter, best);
  while (g_hash_table_iter_next (&iter, &k, &v))
    {
      SlSkyCandidate c = { *(gint64 *) k, *(double *) v };

      g_array_append_val (found, c);
    }
  return found;
}

static int
by_key (const void *a, const void *b)
{
  const SlSkyCandidate *p = a, *q = b;

  return (p->key > q->key) - (p->key < q->key);
}

/* Points uniform on the sphere, a cluster around RA 0 and a cluster at
 * each pole; some keys have two points (a star seen by two sources). */
static GArray *
random_points (GRand *rand, guint n, double cluster_deg)
{
  GArray *points = g_array_new (FALSE, FALSE, sizeof (TestPoint));

  for (guint i = 0; i < n; i++)
    {
      TestPoint p;
      int kind = g_rand_int_range (rand, 0, 4);

      if (kind == 0)
        {
          p.ra = g_rand_double_range (rand, 0, 360);
          p.dec = asin (g_rand_double_range (rand, -1, 1)) * ERFA_DR2D;
        }
      else if (kind == 1)
        {
          p.ra = fmod (360 + g_rand_double_range (rand, -cluster_deg, cluster_deg), 360);
          p.dec = g_rand_double_range (rand, -cluster_deg, cluster_deg);
        }
      else
        {
          p.ra = g_rand_double_range (rand, 0, 360);
          p.dec = (kind == 2 ? 1 : -1) * (90 - g_rand_double_range (rand, 0, cluster_deg));
        }
      p.key = g_rand_int_range (rand, 0, 4) == 0 && i > 0 ? g_rand_int_range (rand, 0, (int) i) : (gint64) i;
      g_array_append_val (points, p);
    }
  return points;
}

static void
check_against_brute_force (guint seed, guint n, double radius, double cluster_deg)
{
  g_autoptr (GRand) rand = g_rand_new_with_seed (seed);
  g_autoptr (GArray) points = random_points (rand, n, cluster_deg);
  g_autoptr (GArray) queries = random_points (rand, n / 2, cluster_deg);
  g_autoptr (SlSkyIndex) index = sl_sky_index_new (radius);
  g_autoptr (GArray) found = g_array_new (FALSE, FALSE, sizeof (SlSkyCandidate));
  guint nonempty = 0, several = 0;

  for (guint i = 0; i < points->len; i++)
    {
      const TestPoint *p = &g_array_index (points, TestPoint, i);

      sl_sky_index_add (index, p->ra, p->dec, p->key);
    }
  sl_sky_index_build (index);
  g_assert_cmpuint (sl_sky_index_size (index), ==, n);

  for (guint q = 0; q < queries->len; q++)
    {
      const TestPoint *p = &g_array_index (queries, TestPoint, q);
      g_autoptr (GArray) want = brute_force ((const TestPoint *) points->data, points->len, p->ra, p->dec, radius);
      guint got = sl_sky_index_query (index, p->ra, p->dec, found);

      if (got != want->len)
        g_error ("query %u at (%.9f, %.9f), radius %g arcsec: brute force finds %u keys, the index %u",
                 q, p->ra, p->dec, radius, want->len, got);
      /* Nearest first. */
      for (guint i = 1; i < found->len; i++)
        g_assert_cmpfloat (g_array_index (found, SlSkyCandidate, i - 1).separation, <=,
                           g_array_index (found, SlSkyCandidate, i).separation);
      /* (An empty array has no data to sort: qsort must not see NULL.) */
      if (want->len > 0)
        qsort (want->data, want->len, sizeof (SlSkyCandidate), by_key);
      if (found->len > 0)
        qsort (found->data, found->len, sizeof (SlSkyCandidate), by_key);
      for (guint i = 0; i < want->len; i++)
        {
          const SlSkyCandidate *w = &g_array_index (want, SlSkyCandidate, i);
          const SlSkyCandidate *g = &g_array_index (found, SlSkyCandidate, i);

          g_assert_cmpint (g->key, ==, w->key);
          sl_assert_close (g->separation, w->separation, 1e-6 * MAX (1.0, radius / 3600), "separation (arcsec)");
        }
      nonempty += want->len > 0;
      several += want->len > 1;
    }
  /* The sets are dense enough that the comparison means something. */
  g_assert_cmpuint (nonempty, >, queries->len / 10);
  g_assert_cmpuint (several, >, 0);
}

static void
test_index_random_small_radius (void)
{
  /* 2 arcsec in clusters of 30 arcsec: zones of the minimum height. */
  check_against_brute_force (1, 4000, 2.0, 30.0 / 3600);
}

static void
test_index_random_large_radius (void)
{
  /* 20 arcmin in clusters of 3 degrees: zones as tall as the radius. */
  check_against_brute_force (2, 4000, 1200.0, 3.0);
}

static void
test_index_random_huge_radius (void)
{
  /* 10 degrees: windows wider than a zone's neighbours at high dec. */
  check_against_brute_force (3, 1500, 36000.0, 15.0);
}

/* A star just west of RA 0 is found from just east of it, and the other
 * way round; the other end of the zone is not searched for nothing. */
static void
test_index_ra_wrap (void)
{
  g_autoptr (SlSkyIndex) index = sl_sky_index_new (1.0);
  g_autoptr (GArray) found = g_array_new (FALSE, FALSE, sizeof (SlSkyCandidate));

  sl_sky_index_add (index, 359.99990, 10.0, 1);
  sl_sky_index_add (index, 0.00005, -10.0, 2);
  sl_sky_index_add (index, 180.0, 10.0, 3);
  sl_sky_index_build (index);

  g_assert_cmpuint (sl_sky_index_query (index, 0.0001, 10.0, found), ==, 1);
  g_assert_cmpint (g_array_index (found, SlSkyCandidate, 0).key, ==, 1);
  sl_assert_close (g_array_index (found, SlSkyCandidate, 0).separation, 0.0002 * 3600 * cos (10 * ERFA_DD2R),
                   1e-6, "across RA 0 (arcsec)");
  g_assert_cmpuint (sl_sky_index_query (index, 359.9999, -10.0, found), ==, 1);
  g_assert_cmpint (g_array_index (found, SlSkyCandidate, 0).key, ==, 2);
  /* A position given as 360 is RA 0. */
  g_assert_cmpuint (sl_sky_index_query (index, 360.0, 10.0, found), ==, 1);
}

/* Near a pole a small circle spans every RA: stars on the far side of
 * the pole are found. */
static void
test_index_poles (void)
{
  g_autoptr (SlSkyIndex) index = sl_sky_index_new (2.0);
  g_autoptr (GArray) found = g_array_new (FALSE, FALSE, sizeof (SlSkyCandidate));

  sl_sky_index_add (index, 0.0, 89.9998, 1);      /* 0.72 arcsec from the pole */
  sl_sky_index_add (index, 180.0, 89.9998, 2);    /* across the pole from 1 */
  sl_sky_index_add (index, 90.0, 90.0, 3);        /* the pole itself */
  sl_sky_index_add (index, 45.0, -89.9999, 4);
  sl_sky_index_add (index, 225.0, -89.9999, 5);
  sl_sky_index_build (index);

  g_assert_cmpuint (sl_sky_index_query (index, 0.0, 89.9998, found), ==, 3);
  g_assert_cmpint (g_array_index (found, SlSkyCandidate, 0).key, ==, 1);
  g_assert_cmpint (g_array_index (found, SlSkyCandidate, 1).key, ==, 3);
  g_assert_cmpint (g_array_index (found, SlSkyCandidate, 2).key, ==, 2);
  sl_assert_close (g_array_index (found, SlSkyCandidate, 2).separation, 1.44, 1e-6, "over the pole (arcsec)");
  g_assert_cmpuint (sl_sky_index_query (index, 300.0, 90.0, found), ==, 3);
  g_assert_cmpuint (sl_sky_index_query (index, 135.0, -89.9999, found), ==, 2);
  g_assert_cmpuint (sl_sky_index_query (index, 135.0, -89.9990, found), ==, 0);
}

/* ------------------------------------------------------------------ */
/* Two catalogues with known truth                                    */

/* N stars spread over the sky, none within 20 arcsec of another, at
 * epoch 2000 with proper motions up to PM_MAX mas/yr. */
static GArray *
true_stars (GRand *rand, guint n, double pm_max)
{
  GArray *stars = g_array_new (FALSE, FALSE, sizeof (SlAstrometry));

  while (stars->len < n)
    {
      SlAstrometry a;
      gboolean crowded = FALSE;

      sl_astrometry_init (&a);
      a.ra = g_rand_double_range (rand, 0, 360);
      a.dec = asin (g_rand_double_range (rand, -1, 1)) * ERFA_DR2D;
      /* A band of stars straddling RA 0 and a cap at each pole. */
      if (stars->len % 5 == 1)
        a.ra = fmod (360 + g_rand_double_range (rand, -0.01, 0.01), 360);
      if (stars->len % 5 == 2)
        a.dec = (g_rand_boolean (rand) ? 1 : -1) * (90 - g_rand_double_range (rand, 0, 0.05));
      a.pmra = g_rand_double_range (rand, -pm_max, pm_max);
      a.pmdec = g_rand_double_range (rand, -pm_max, pm_max);
      a.parallax = g_rand_double_range (rand, 2, 500);
      a.epoch = 2000.0;
      for (guint i = 0; i < stars->len && !crowded; i++)
        crowded = sl_sky_separation (a.ra, a.dec, g_array_index (stars, SlAstrometry, i).ra,
                                     g_array_index (stars, SlAstrometry, i).dec) < 20.0;
      if (!crowded)
        g_array_append_val (stars, a);
    }
  return stars;
}

/* The second catalogue: each star observed at EPOCH (where it truly is)
 * with an error below MAX_OFFSET arcsec, in another order; TRUTH[j] is
 * the star of row j. */
static GArray *
observe (GRand *rand, GArray *stars, double epoch, double max_offset, guint *truth)
{
  GArray *rows = g_array_new (FALSE, FALSE, sizeof (SlAstrometry));

  for (guint i = 0; i < stars->len; i++)
    {
      const SlAstrometry *s = &g_array_index (stars, SlAstrometry, i);
      SlAstrometry r = *s;
      double offset = g_rand_double_range (rand, 0, max_offset) / 3600 * ERFA_DD2R;
      double angle = g_rand_double_range (rand, 0, 2 * G_PI);
      double ra, dec;

      sl_astrometry_propagate (s, epoch, &ra, &dec);
      /* Offset by a true angular distance, also near the poles. */
      {
        double v[3], p[3], north[3], east[3], t;
        double a0 = ra * ERFA_DD2R, d0 = dec * ERFA_DD2R;

        eraS2c (a0, d0, p);
        east[0] = -sin (a0); east[1] = cos (a0); east[2] = 0;
        north[0] = -sin (d0) * cos (a0); north[1] = -sin (d0) * sin (a0); north[2] = cos (d0);
        for (int k = 0; k < 3; k++)
          v[k] = cos (offset) * p[k] + sin (offset) * (cos (angle) * north[k] + sin (angle) * east[k]);
        eraC2s (v, &t, &d0);
        ra = eraAnp (t) * ERFA_DR2D;
        dec = d0 * ERFA_DR2D;
      }
      r.ra = ra;
      r.dec = dec;
      r.epoch = epoch;
      /* A catalogue measures the motion at its own epoch: perspective
       * acceleration changes it over decades for fast, near stars. */
      if (isfinite (s->pmra))
        {
          double d1, d2, e1, e2, r2, d, pr, pd, px, rv;
          double dec1 = s->dec * ERFA_DD2R;

          eraEpj2jd (s->epoch, &d1, &d2);
          eraEpj2jd (epoch, &e1, &e2);
          g_assert_cmpint (eraStarpm (s->ra * ERFA_DD2R, dec1, s->pmra / 1000.0 * ERFA_DAS2R / cos (dec1),
                                      s->pmdec / 1000.0 * ERFA_DAS2R, s->parallax / 1000.0,
                                      isfinite (s->vrad) ? s->vrad : 0.0, d1, d2, e1, e2,
                                      &r2, &d, &pr, &pd, &px, &rv), ==, 0);
          r.pmra = pr * cos (d) / ERFA_DAS2R * 1000.0;
          r.pmdec = pd / ERFA_DAS2R * 1000.0;
          r.parallax = px * 1000.0;
          r.vrad = rv;
        }
      g_array_append_val (rows, r);
    }
  /* Shuffle, keeping the truth. */
  for (guint j = 0; j < rows->len; j++)
    truth[j] = j;
  for (guint j = rows->len; j > 1; j--)
    {
      guint k = g_rand_int_range (rand, 0, (gint32) j);
      SlAstrometry t = g_array_index (rows, SlAstrometry, j - 1);
      guint tt = truth[j - 1];

      g_array_index (rows, SlAstrometry, j - 1) = g_array_index (rows, SlAstrometry, k);
      g_array_index (rows, SlAstrometry, k) = t;
      truth[j - 1] = truth[k];
      truth[k] = tt;
    }
  return rows;
}

/* Offsets below the radius, 16 years apart, ordinary proper motions:
 * every row finds its own star, each once. */
static void
test_scenario_offsets (void)
{
  g_autoptr (GRand) rand = g_rand_new_with_seed (7);
  g_autoptr (GArray) stars = true_stars (rand, 600, 200);
  g_autofree guint *truth = g_new (guint, stars->len);
  g_autoptr (GArray) rows = observe (rand, stars, 2016.0, 0.8, truth);
  g_autofree SlMatch *out = g_new (SlMatch, rows->len);

  sl_crossmatch ((const SlAstrometry *) stars->data, stars->len,
                 (const SlAstrometry *) rows->data, rows->len, 1.0, 2016.0, out);
  for (guint j = 0; j < rows->len; j++)
    {
      g_assert_cmpint (out[j].status, ==, SL_MATCH_UNIQUE);
      g_assert_cmpint (out[j].star, ==, truth[j]);
      g_assert_cmpuint (out[j].n_candidates, ==, 1);
      g_assert_cmpfloat (out[j].separation, <, 0.8 + 1e-6);
    }
}

/* Stars moving 2-5 arcsec a year, 40 years apart: 80-200 arcsec, far
 * beyond the 1 arcsec radius.  Carried to the common epoch they all
 * match; left where they were measured, none does (so the propagation is
 * what makes the match). */
static void
test_scenario_high_proper_motion (void)
{
  g_autoptr (GRand) rand = g_rand_new_with_seed (8);
  g_autoptr (GArray) stars = true_stars (rand, 300, 0);
  g_autofree guint *truth = g_new (guint, stars->len);
  g_autoptr (GArray) rows = NULL;
  g_autofree SlMatch *out = g_new (SlMatch, stars->len);

  for (guint i = 0; i < stars->len; i++)
    {
      SlAstrometry *s = &g_array_index (stars, SlAstrometry, i);
      double speed = g_rand_double_range (rand, 2000, 5000), angle = g_rand_double_range (rand, 0, 2 * G_PI);

      s->pmra = speed * cos (angle);
      s->pmdec = speed * sin (angle);
      s->parallax = g_rand_double_range (rand, 100, 800);   /* nearby, as fast stars are */
      s->vrad = g_rand_double_range (rand, -100, 100);
    }
  rows = observe (rand, stars, 2040.0, 0.5, truth);

  /* At the rows' epoch, and at a third epoch: both sides move. */
  sl_crossmatch ((const SlAstrometry *) stars->data, stars->len,
                 (const SlAstrometry *) rows->data, rows->len, 1.0, 2040.0, out);
  for (guint j = 0; j < rows->len; j++)
    {
      g_assert_cmpint (out[j].status, ==, SL_MATCH_UNIQUE);
      g_assert_cmpint (out[j].star, ==, truth[j]);
    }
  sl_crossmatch ((const SlAstrometry *) stars->data, stars->len,
                 (const SlAstrometry *) rows->data, rows->len, 1.0, 2016.0, out);
  for (guint j = 0; j < rows->len; j++)
    g_assert_cmpint (out[j].star, ==, truth[j]);

  /* Without epochs nothing moves, and nothing is within the radius. */
  for (guint j = 0; j < rows->len; j++)
    g_array_index (rows, SlAstrometry, j).epoch = NAN;
  for (guint i = 0; i < stars->len; i++)
    g_array_index (stars, SlAstrometry, i).epoch = NAN;
  sl_crossmatch ((const SlAstrometry *) stars->data, stars->len,
                 (const SlAstrometry *) rows->data, rows->len, 1.0, 2040.0, out);
  for (guint j = 0; j < rows->len; j++)
    g_assert_cmpint (out[j].status, ==, SL_MATCH_NONE);
}

/* Close pairs and doubled rows come out ambiguous, everything else as
 * the truth says; rows with no star are new. */
static void
test_scenario_ambiguous (void)
{
  g_autoptr (GRand) rand = g_rand_new_with_seed (9);
  g_autoptr (GArray) stars = true_stars (rand, 400, 100);
  g_autofree guint *truth = g_new (guint, stars->len);
  g_autoptr (GArray) rows = observe (rand, stars, 2010.0, 0.4, truth);
  guint n_true = stars->len, n_rows = rows->len;
  g_autofree SlMatch *out = NULL;
  guint n_pairs = 20, n_doubled = 15, n_lonely = 10;

  /* A companion 1.2 arcsec from each of the first stars (within 2 arcsec
   * of their row as well), in the star catalogue only. */
  for (guint i = 0; i < n_pairs; i++)
    {
      SlAstrometry c = g_array_index (stars, SlAstrometry, i);

      c.dec += (c.dec > 0 ? -1.2 : 1.2) / 3600;
      g_array_append_val (stars, c);
    }
  /* A second row on top of the row of each of the next stars. */
  for (guint i = 0; i < n_doubled; i++)
    for (guint j = 0; j < n_rows; j++)
      if (truth[j] == n_pairs + i)
        {
          SlAstrometry again = g_array_index (rows, SlAstrometry, j);

          again.ra = fmod (again.ra + 0.3 / 3600, 360);
          g_array_append_val (rows, again);
        }
  /* Rows far from every star. */
  for (guint i = 0; i < n_lonely; i++)
    {
      SlAstrometry lonely = g_array_index (stars, SlAstrometry, n_pairs + n_doubled + i);

      lonely.dec += lonely.dec > 0 ? -0.01 : 0.01;
      lonely.epoch = NAN;
      g_array_append_val (rows, lonely);
    }

  out = g_new (SlMatch, rows->len);
  sl_crossmatch ((const SlAstrometry *) stars->data, stars->len,
                 (const SlAstrometry *) rows->data, rows->len, 2.0, 2010.0, out);
  for (guint j = 0; j < rows->len; j++)
    {
      if (j >= n_rows + n_doubled)
        {
          g_assert_cmpint (out[j].status, ==, SL_MATCH_NONE);
          g_assert_cmpint (out[j].star, ==, -1);
          continue;
        }
      if (j >= n_rows)
        {
          g_assert_cmpint (out[j].status, ==, SL_MATCH_AMBIGUOUS);
          g_assert_cmpint (out[j].star, ==, n_pairs + (j - n_rows));
          g_assert_cmpuint (out[j].n_candidates, ==, 1);
          continue;
        }
      if (truth[j] < n_pairs)
        {
          /* The row itself is nearer its own star than the companion. */
          g_assert_cmpint (out[j].status, ==, SL_MATCH_AMBIGUOUS);
          g_assert_cmpuint (out[j].n_candidates, ==, 2);
        }
      else if (truth[j] < n_pairs + n_doubled)
        {
          /* Claimed by its doubled row too. */
          g_assert_cmpint (out[j].status, ==, SL_MATCH_AMBIGUOUS);
          g_assert_cmpuint (out[j].n_candidates, ==, 1);
        }
      else
        g_assert_cmpint (out[j].status, ==, SL_MATCH_UNIQUE);
      g_assert_cmpint (out[j].star, ==, truth[j]);
    }
  (void) n_true;
}

/* The cross-match works on both cores (STARLEDGER_THREADS, or the
 * processors): the outcome must not depend on how many. */
static void
test_threads_same_result (void)
{
  g_autoptr (GRand) rand = g_rand_new_with_seed (11);
  const guint n = 40000;
  g_autofree SlAstrometry *stars = g_new (SlAstrometry, n);
  g_autofree SlAstrometry *rows = g_new (SlAstrometry, n);
  g_autofree SlMatch *one = g_new0 (SlMatch, n);   /* zeroed: memcmp sees the padding too */
  g_autofree SlMatch *more = g_new0 (SlMatch, n);
  guint unique = 0, ambiguous = 0;

  for (guint i = 0; i < n; i++)
    {
      sl_astrometry_init (&stars[i]);
      stars[i].ra = g_rand_double_range (rand, 0, 360);
      stars[i].dec = asin (g_rand_double_range (rand, -1, 1)) * ERFA_DR2D;
      stars[i].pmra = g_rand_double_range (rand, -500, 500);
      stars[i].pmdec = g_rand_double_range (rand, -500, 500);
      stars[i].epoch = 2000.0;
      /* Rows: a star seen again 16 years on, some twice, some nowhere
       * near (ambiguous and new rows), some without a position. */
      rows[i] = stars[g_rand_int_range (rand, 0, (gint32) n)];
      sl_astrometry_propagate (&rows[i], 2016.0, &rows[i].ra, &rows[i].dec);
      rows[i].ra = fmod (rows[i].ra + g_rand_double_range (rand, -0.002, 0.002) + 360.0, 360.0);
      rows[i].epoch = 2016.0;
      if (i % 97 == 0)
        rows[i].dec = NAN;
    }
  g_setenv ("STARLEDGER_THREADS", "1", TRUE);
  sl_crossmatch (stars, n, rows, n, 20.0, 2016.0, one);
  for (const char *const *threads = (const char *const[]) { "2", "3", "7", NULL }; *threads; threads++)
    {
      g_setenv ("STARLEDGER_THREADS", *threads, TRUE);
      sl_crossmatch (stars, n, rows, n, 20.0, 2016.0, more);
      g_assert_cmpmem (one, n * sizeof (SlMatch), more, n * sizeof (SlMatch));
    }
  g_unsetenv ("STARLEDGER_THREADS");
  for (guint j = 0; j < n; j++)
    {
      unique += one[j].status == SL_MATCH_UNIQUE;
      ambiguous += one[j].status == SL_MATCH_AMBIGUOUS;
    }
  /* Both outcomes occur, so the comparison covers them. */
  g_assert_cmpuint (unique, >, n / 4);
  g_assert_cmpuint (ambiguous, >, n / 10);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/crossmatch/propagate/against-erfa", test_propagate_erfa);
  g_test_add_func ("/crossmatch/propagate/fast-star", test_propagate_fast_star);
  g_test_add_func ("/crossmatch/propagate/unmoved", test_propagate_unmoved);
  g_test_add_func ("/crossmatch/propagate/no-parallax", test_propagate_no_parallax);
  g_test_add_func ("/crossmatch/separation", test_separation);
  g_test_add_func ("/crossmatch/threads-same-result", test_threads_same_result);
  g_test_add_func ("/crossmatch/index/random-small-radius", test_index_random_small_radius);
  g_test_add_func ("/crossmatch/index/random-large-radius", test_index_random_large_radius);
  g_test_add_func ("/crossmatch/index/random-huge-radius", test_index_random_huge_radius);
  g_test_add_func ("/crossmatch/index/ra-wrap", test_index_ra_wrap);
  g_test_add_func ("/crossmatch/index/poles", test_index_poles);
  g_test_add_func ("/crossmatch/scenario/offsets", test_scenario_offsets);
  g_test_add_func ("/crossmatch/scenario/high-proper-motion", test_scenario_high_proper_motion);
  g_test_add_func ("/crossmatch/scenario/ambiguous", test_scenario_ambiguous);

  return g_test_run ();
}
