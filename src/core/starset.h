/* starset.h: the stars of a project with the values figures and views
 * draw, loaded once.  Missing values are NAN.  Positions are ICRS at each
 * star's own epoch.
 */
#pragma once

#include <gio/gio.h>

#include "project.h"

G_BEGIN_DECLS

typedef struct {
  gint64      star_id;
  const char *designation;         /* owned by the set */
  double      ra, dec;             /* deg */
  double      epoch;               /* Julian year */
  double      parallax, parallax_err;  /* mas, as measured */
  double      pmra, pmdec;         /* mas/yr, pmra times cos Dec */
  double      vmag;                /* mag */
  double      bv0, bv0_lo, bv0_hi; /* mag, derived */
  double      absmag, absmag_lo, absmag_hi;
  double      teff, teff_lo, teff_hi;
  double      lum, lum_lo, lum_hi;
  double      logt_sigma, logl_sigma, logt_logl_corr;
  double      elat;                /* deg */
  double      ellipse_a, ellipse_b, ellipse_pa;
} SlPlotStar;

typedef struct {
  GArray       *stars;       /* SlPlotStar */
  gint64        run_id;      /* the newest derivation run among the stars, 0 if none */
  const char   *run_finished_at;  /* when it finished, ISO 8601 UTC (in strings); NULL if none */
  guint         n_derived;   /* stars with a derived row */
  GStringChunk *strings;
  int           extra_refs;  /* sl_star_set_ref's, atomic; 0 for a set made once */
} SlStarSet;

/* Loads every star, or only those named in DESIGNATIONS (NULL-terminated,
 * in that order; an unknown name is an error). */
SlStarSet *sl_star_set_load (SlProject *project, const char *const *designations, GError **error);
/* Loads the stars of list NAME (lists.h), in star order; an unknown list
 * is an error naming the lists there are. */
SlStarSet *sl_star_set_load_list (SlProject *project, const char *name, GError **error);
/* The same, stopping with G_IO_ERROR_CANCELLED when CANCELLABLE (may be
 * NULL) is cancelled: the window's long work checks it every few thousand
 * rows, so Cancel answers at once even at a million stars. */
SlStarSet *sl_star_set_load_full (SlProject *project, const char *const *designations,
                                  GCancellable *cancellable, GError **error);
SlStarSet *sl_star_set_load_list_full (SlProject *project, const char *name, GCancellable *cancellable,
                                       GError **error);
/* A set is read-only once loaded, so threads may share it: each
 * sl_star_set_ref (a window's drawing thread, say) is matched by one more
 * sl_star_set_free; the last free frees it. */
SlStarSet *sl_star_set_ref  (SlStarSet *set);
void       sl_star_set_free (SlStarSet *set);

static inline SlPlotStar *
sl_star_set_get (const SlStarSet *set, guint i)
{
  return &g_array_index (set->stars, SlPlotStar, i);
}

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlStarSet, sl_star_set_free)

G_END_DECLS
