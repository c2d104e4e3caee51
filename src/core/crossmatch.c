/* crossmatch.c: propagation to a common epoch, the declination-zone sky
 * index and the matching rule (see crossmatch.h for the method, units
 * and validity).
 *
 * Contents:
 *   propagation ........ sl_astrometry_propagate (eraPmsafe)
 *   separations ........ sl_sky_separation, chord lengths
 *   the index .......... SlSkyIndex: zones of declination, sorted by RA
 *   the rule ........... sl_crossmatch
 */
#include "crossmatch.h"

#include <erfa.h>
#include <erfam.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "derive/pool.h"

/* Zones are at least this tall (deg) even for tiny radii: below it the
 * zone table grows while a query saves nothing, each zone being nearly
 * empty already at a million stars on the sky. */
#define MIN_ZONE_HEIGHT_DEG (30.0 / 3600.0)

/* ------------------------------------------------------------------ */
/* Work on both cores                                                 */

/* FUNC (DATA, FIRST, LAST) on contiguous slices of [0, N), one per thread
 * (sl_derive_threads: STARLEDGER_THREADS or the cores), the last on the
 * calling thread.  Slices write disjoint results, so the outcome does not
 * depend on the thread count. */
typedef void (*SliceFunc) (gpointer data, gsize first, gsize last);

typedef struct {
  SliceFunc func;
  gpointer  data;
  gsize     first, last;
} Slice;

static gpointer
run_slice (gpointer data)
{
  Slice *slice = data;

  slice->func (slice->data, slice->first, slice->last);
  return NULL;
}

/* Below this many items a thread costs more than it saves. */
#define MIN_ITEMS_PER_THREAD 4096

static void
parallel_for (gsize n, SliceFunc func, gpointer data)
{
  guint n_threads = (guint) MIN ((gsize) sl_derive_threads (), MAX (n / MIN_ITEMS_PER_THREAD, 1));
  g_autofree Slice *slices = g_new (Slice, n_threads);
  g_autofree GThread **threads = g_new0 (GThread *, n_threads);

  for (guint t = 0; t < n_threads; t++)
    slices[t] = (Slice) { func, data, n * t / n_threads, n * (t + 1) / n_threads };
  for (guint t = 0; t + 1 < n_threads; t++)
    threads[t] = g_thread_new ("sl-crossmatch", run_slice, &slices[t]);
  run_slice (&slices[n_threads - 1]);
  for (guint t = 0; t + 1 < n_threads; t++)
    g_thread_join (threads[t]);
}

void
sl_astrometry_init (SlAstrometry *a)
{
  a->ra = a->dec = a->pmra = a->pmdec = a->parallax = a->vrad = a->epoch = NAN;
}

/* ------------------------------------------------------------------ */
/* Propagation                                                        */

gboolean
sl_astrometry_propagate (const SlAstrometry *a, double epoch, double *ra, double *dec)
{
  double ra1, dec1, pmr, pmd, px, rv;
  double ep1a, ep1b, ep2a, ep2b;
  double ra2, dec2, pmr2, pmd2, px2, rv2;
  int status;

  *ra = a->ra;
  *dec = a->dec;
  if (!isfinite (a->epoch) || !isfinite (epoch) || a->epoch == epoch
      || !isfinite (a->pmra) || !isfinite (a->pmdec))
    return FALSE;

  ra1 = a->ra * ERFA_DD2R;
  dec1 = a->dec * ERFA_DD2R;
  /* ERFA wants dRA/dt, not dRA/dt cos dec: at the pole itself the proper
   * motion in RA has no meaning, so it is taken as zero there. */
  pmr = cos (dec1) > 0.0 ? a->pmra * ERFA_DMAS2R / cos (dec1) : 0.0;
  pmd = a->pmdec * ERFA_DMAS2R;
  /* eraPmsafe wants arcsec; an unknown or unphysical parallax becomes
   * zero, which ERFA replaces by a great distance (and raises a small
   * parallax if the proper motion would otherwise need light speed). */
  px = isfinite (a->parallax) && a->parallax > 0.0 ? a->parallax / 1000.0 : 0.0;
  rv = isfinite (a->vrad) ? a->vrad : 0.0;

  eraEpj2jd (a->epoch, &ep1a, &ep1b);
  eraEpj2jd (epoch, &ep2a, &ep2b);
  status = eraPmsafe (ra1, dec1, pmr, pmd, px, rv, ep1a, ep1b, ep2a, ep2b,
                      &ra2, &dec2, &pmr2, &pmd2, &px2, &rv2);
  /* Status 1 and 2 are warnings (distance or speed adjusted); -1 and 4
   * mean no solution. */
  if (status < 0 || status >= 4)
    return FALSE;

  *ra = eraAnp (ra2) * ERFA_DR2D;
  if (*ra >= 360.0)
    *ra = 0.0;
  *dec = dec2 * ERFA_DR2D;
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Separations                                                        */

double
sl_sky_separation (double ra1, double dec1, double ra2, double dec2)
{
  return eraSeps (ra1 * ERFA_DD2R, dec1 * ERFA_DD2R, ra2 * ERFA_DD2R, dec2 * ERFA_DD2R)
         * ERFA_DR2AS;
}

static inline void
unit_vector (double ra, double dec, double v[3])
{
  double a = ra * ERFA_DD2R, d = dec * ERFA_DD2R;
  double cd = cos (d);

  v[0] = cd * cos (a);
  v[1] = cd * sin (a);
  v[2] = sin (d);
}

/* The separation (arcsec) of two unit vectors from their chord, exact at
 * every distance and without the cancellation of acos near zero. */
static inline double
chord_to_arcsec (double chord2)
{
  return 2.0 * asin (MIN (1.0, sqrt (chord2) / 2.0)) * ERFA_DR2AS;
}

/* ------------------------------------------------------------------ */
/* The index                                                          */

typedef struct {
  double ra;        /* deg, the sort key within a zone */
  double v[3];      /* unit vector */
  gint64 key;
  guint  zone;
} Point;

struct SlSkyIndex {
  double  radius;        /* arcsec */
  double  radius_deg;
  double  chord2;        /* squared chord of the radius on the unit sphere */
  double  zone_height;   /* deg */
  guint   n_zones;
  GArray *points;        /* Point, sorted by (zone, ra) once built */
  gsize  *zone_start;    /* n_zones + 1 offsets into points */
  gboolean built;
};

static guint
zone_of (const SlSkyIndex *index, double dec)
{
  double z = floor ((dec + 90.0) / index->zone_height);

  if (z < 0)
    return 0;
  if (z >= index->n_zones)
    return index->n_zones - 1;
  return (guint) z;
}

SlSkyIndex *
sl_sky_index_new (double radius_arcsec)
{
  SlSkyIndex *index;
  double chord;

  g_return_val_if_fail (radius_arcsec > 0.0 && radius_arcsec < 180.0 * 3600.0, NULL);

  index = g_new0 (SlSkyIndex, 1);
  index->radius = radius_arcsec;
  index->radius_deg = radius_arcsec / 3600.0;
  chord = 2.0 * sin (radius_arcsec * ERFA_DAS2R / 2.0);
  index->chord2 = chord * chord;
  index->zone_height = MAX (index->radius_deg, MIN_ZONE_HEIGHT_DEG);
  index->n_zones = (guint) ceil (180.0 / index->zone_height);
  index->points = g_array_new (FALSE, FALSE, sizeof (Point));
  return index;
}

/* KEY at (RA, DEC) as the index keeps it. */
static void
make_point (const SlSkyIndex *index, double ra, double dec, gint64 key, Point *p)
{
  p->ra = fmod (ra, 360.0);
  if (p->ra < 0)
    p->ra += 360.0;
  unit_vector (p->ra, dec, p->v);
  p->key = key;
  p->zone = zone_of (index, dec);
}

void
sl_sky_index_add (SlSkyIndex *index, double ra, double dec, gint64 key)
{
  Point p;

  g_return_if_fail (index != NULL && !index->built);
  g_return_if_fail (isfinite (ra) && isfinite (dec));

  make_point (index, ra, dec, key, &p);
  g_array_append_val (index->points, p);
}

static int
compare_points (const void *a, const void *b)
{
  const Point *p = a, *q = b;

  if (p->zone != q->zone)
    return p->zone < q->zone ? -1 : 1;
  if (p->ra != q->ra)
    return p->ra < q->ra ? -1 : 1;
  return (p->key > q->key) - (p->key < q->key);
}

/* Sorts zones [FIRST, LAST) of the bucketed points by RA. */
static void
sort_zones (gpointer data, gsize first, gsize last)
{
  SlSkyIndex *index = data;
  Point *points = (Point *) index->points->data;

  for (gsize z = first; z < last; z++)
    {
      gsize start = index->zone_start[z], n = index->zone_start[z + 1] - start;

      if (n > 1)
        qsort (points + start, n, sizeof (Point), compare_points);
    }
}

void
sl_sky_index_build (SlSkyIndex *index)
{
  const Point *unsorted;
  g_autofree gsize *next = NULL;
  GArray *bucketed;
  gsize n;

  g_return_if_fail (index != NULL && !index->built);

  /* By zone first, in one counting pass (a zone holds a few dozen points
   * at a million stars), then each zone by RA: far cheaper than one sort
   * of every point, and the zones sort on both cores. */
  n = index->points->len;
  unsorted = (const Point *) index->points->data;
  index->zone_start = g_new0 (gsize, index->n_zones + 1);
  for (gsize i = 0; i < n; i++)
    index->zone_start[unsorted[i].zone + 1]++;
  for (guint z = 0; z < index->n_zones; z++)
    index->zone_start[z + 1] += index->zone_start[z];
  next = g_memdup2 (index->zone_start, (index->n_zones + 1) * sizeof (gsize));
  bucketed = g_array_sized_new (FALSE, FALSE, sizeof (Point), (guint) n);
  g_array_set_size (bucketed, (guint) n);
  for (gsize i = 0; i < n; i++)
    g_array_index (bucketed, Point, next[unsorted[i].zone]++) = unsorted[i];
  g_array_unref (index->points);
  index->points = bucketed;
  parallel_for (index->n_zones, sort_zones, index);
  index->built = TRUE;
}

gsize
sl_sky_index_size (const SlSkyIndex *index)
{
  return index->points->len;
}

double
sl_sky_index_radius (const SlSkyIndex *index)
{
  return index->radius;
}

void
sl_sky_index_free (SlSkyIndex *index)
{
  if (index == NULL)
    return;
  g_array_unref (index->points);
  g_free (index->zone_start);
  g_free (index);
}

/* The first point of [FIRST, LAST) whose RA is >= RA. */
static gsize
lower_bound (const Point *points, gsize first, gsize last, double ra)
{
  while (first < last)
    {
      gsize mid = first + (last - first) / 2;

      if (points[mid].ra < ra)
        first = mid + 1;
      else
        last = mid;
    }
  return first;
}

/* Adds KEY at SEPARATION to FOUND, or lowers its separation if it is
 * there already (a star may have several positions in the index). */
static void
add_candidate (GArray *found, gint64 key, double separation)
{
  SlSkyCandidate c = { key, separation };

  for (guint i = 0; i < found->len; i++)
    {
      SlSkyCandidate *other = &g_array_index (found, SlSkyCandidate, i);

      if (other->key == key)
        {
          other->separation = MIN (other->separation, separation);
          return;
        }
    }
  g_array_append_val (found, c);
}

static void
scan (const SlSkyIndex *index, gsize first, gsize last, double ra_lo, double ra_hi,
      const double v[3], GArray *found)
{
  const Point *points = (const Point *) index->points->data;

  for (gsize i = lower_bound (points, first, last, ra_lo); i < last && points[i].ra <= ra_hi; i++)
    {
      const Point *p = &points[i];
      double dx = p->v[0] - v[0], dy = p->v[1] - v[1], dz = p->v[2] - v[2];
      double chord2 = dx * dx + dy * dy + dz * dz;

      if (chord2 <= index->chord2)
        add_candidate (found, p->key, chord_to_arcsec (chord2));
    }
}

static int
compare_candidates (const void *a, const void *b)
{
  const SlSkyCandidate *p = a, *q = b;

  if (p->separation != q->separation)
    return p->separation < q->separation ? -1 : 1;
  return (p->key > q->key) - (p->key < q->key);
}

guint
sl_sky_index_query (const SlSkyIndex *index, double ra, double dec, GArray *found)
{
  double v[3];
  double half_width;   /* deg of RA either side */
  guint z_lo, z_hi;

  g_return_val_if_fail (index != NULL && index->built && found != NULL, 0);

  g_array_set_size (found, 0);
  if (!isfinite (ra) || !isfinite (dec))
    return 0;
  ra = fmod (ra, 360.0);
  if (ra < 0)
    ra += 360.0;
  unit_vector (ra, dec, v);
  z_lo = zone_of (index, dec - index->radius_deg);
  z_hi = zone_of (index, dec + index->radius_deg);

  /* The small circle's extent in RA: asin (sin r / cos dec), exact while
   * the circle does not reach a pole; a little wider against rounding. */
  if (fabs (dec) + index->radius_deg >= 90.0)
    half_width = 180.0;
  else
    {
      double s = sin (index->radius_deg * ERFA_DD2R) / cos (dec * ERFA_DD2R);

      half_width = s >= 1.0 ? 180.0 : asin (s) * ERFA_DR2D * (1.0 + 1e-9) + 1e-12;
    }

  for (guint z = z_lo; z <= z_hi; z++)
    {
      gsize first = index->zone_start[z], last = index->zone_start[z + 1];

      if (first == last)
        continue;
      if (half_width >= 180.0)
        scan (index, first, last, -1.0, 361.0, v, found);
      else
        {
          double lo = ra - half_width, hi = ra + half_width;

          scan (index, first, last, MAX (lo, 0.0), MIN (hi, 360.0), v, found);
          /* The window crosses RA 0/360: the other end of the zone too. */
          if (lo < 0.0)
            scan (index, first, last, lo + 360.0, 360.0, v, found);
          if (hi > 360.0)
            scan (index, first, last, 0.0, hi - 360.0, v, found);
        }
    }

  if (found->len > 1)
    qsort (found->data, found->len, sizeof (SlSkyCandidate), compare_candidates);
  return found->len;
}

/* ------------------------------------------------------------------ */
/* The rule                                                           */

/* The stars moved to the common epoch, as index points (a star without a
 * position: zone G_MAXUINT, left out). */
typedef struct {
  const SlSkyIndex   *index;
  const SlAstrometry *stars;
  Point              *points;
  double              epoch;
} PropagateJob;

static void
propagate_stars (gpointer data, gsize first, gsize last)
{
  PropagateJob *job = data;

  for (gsize i = first; i < last; i++)
    {
      Point *p = &job->points[i];
      double ra, dec;

      p->zone = G_MAXUINT;
      if (!isfinite (job->stars[i].ra) || !isfinite (job->stars[i].dec))
        continue;
      sl_astrometry_propagate (&job->stars[i], job->epoch, &ra, &dec);
      make_point (job->index, ra, dec, (gint64) i, p);
    }
}

typedef struct {
  const SlSkyIndex   *index;
  const SlAstrometry *rows;
  SlMatch            *out;
  double              epoch;
} QueryJob;

static void
query_rows (gpointer data, gsize first, gsize last)
{
  QueryJob *job = data;
  g_autoptr (GArray) found = g_array_new (FALSE, FALSE, sizeof (SlSkyCandidate));

  for (gsize j = first; j < last; j++)
    {
      double ra, dec;
      SlMatch *m = &job->out[j];

      m->status = SL_MATCH_NONE;
      m->star = -1;
      m->separation = NAN;
      m->n_candidates = 0;
      if (!isfinite (job->rows[j].ra) || !isfinite (job->rows[j].dec))
        continue;
      sl_astrometry_propagate (&job->rows[j], job->epoch, &ra, &dec);
      m->n_candidates = sl_sky_index_query (job->index, ra, dec, found);
      if (m->n_candidates == 0)
        continue;
      m->star = g_array_index (found, SlSkyCandidate, 0).key;
      m->separation = g_array_index (found, SlSkyCandidate, 0).separation;
    }
}

void
sl_crossmatch (const SlAstrometry *stars, gsize n_stars,
               const SlAstrometry *rows, gsize n_rows,
               double radius_arcsec, double epoch, SlMatch *out)
{
  g_autoptr (SlSkyIndex) index = sl_sky_index_new (radius_arcsec);
  g_autofree guint8 *claims = g_new0 (guint8, n_stars);
  g_autofree Point *moved = g_new (Point, n_stars);
  PropagateJob propagate = { index, stars, moved, epoch };
  QueryJob query = { index, rows, out, epoch };

  /* Both sides move on both cores; the index keeps the stars' order. */
  parallel_for (n_stars, propagate_stars, &propagate);
  for (gsize i = 0; i < n_stars; i++)
    if (moved[i].zone != G_MAXUINT)
      g_array_append_val (index->points, moved[i]);
  sl_sky_index_build (index);
  parallel_for (n_rows, query_rows, &query);

  /* Which rows claim the same star: after every query, in row order. */
  for (gsize j = 0; j < n_rows; j++)
    if (out[j].star >= 0 && claims[out[j].star] < 2)
      claims[out[j].star]++;
  for (gsize j = 0; j < n_rows; j++)
    {
      SlMatch *m = &out[j];

      if (m->star < 0)
        continue;
      m->status = m->n_candidates == 1 && claims[m->star] == 1 ? SL_MATCH_UNIQUE : SL_MATCH_AMBIGUOUS;
    }
}
