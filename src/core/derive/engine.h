/* engine.h: running the derivation modules for one star.
 *
 * The engine orders the registered modules by what they need and give,
 * runs them once with first-order propagation (SlDual), and, where the
 * run asks for it or first order fails (parallax S/N below the
 * threshold), again for each of N Monte Carlo draws of the inputs.  It
 * knows nothing of the database: engine-run.c feeds it and stores what
 * it gives.
 */
#pragma once

#include "../inputs.h"
#include "derive.h"

G_BEGIN_DECLS

/* A value set by hand (override command). */
typedef struct {
  SlQuantity quantity;
  double     value;
  double     lo, hi;     /* its 68% interval, NAN if none given */
} SlOverride;

/* What the engine gives for one star. */
typedef struct {
  gboolean has[SL_N_QUANTITIES];
  double   value[SL_N_QUANTITIES];
  double   lo[SL_N_QUANTITIES];      /* NAN: no interval */
  double   hi[SL_N_QUANTITIES];
  char     text[SL_N_QUANTITIES][32];
  guint32  flags;
  gboolean monte_carlo;              /* intervals are draw percentiles */
  /* The 1-sigma error ellipse in the log Teff - log L plane (HR diagram). */
  double   logt_sigma, logl_sigma, logt_logl_corr;   /* NAN if unknown */
} SlDerivedValues;

typedef struct _SlEngine SlEngine;

SlEngine *sl_engine_new (const SlDeriveParams *params);
/* The parameters it derives with. */
const SlDeriveParams *sl_engine_params (const SlEngine *engine);
void      sl_engine_free (SlEngine *engine);

/* Derives everything for one star.  OVERRIDES may be NULL. */
void      sl_engine_derive (SlEngine *engine, const SlStarInputs *inputs,
                            const SlOverride *overrides, guint n_overrides,
                            SlDerivedValues *out);

/* SKIP (the default) runs a module whose results cannot differ between
 * the draws of a star once per star; FALSE runs every module in every
 * draw.  The numbers are the same: tests compare the two. */
void      sl_engine_set_skip_constant (SlEngine *engine, gboolean skip);

/* The median and the 15.87th and 84.13th percentiles of DATA[0..N) (N > 0,
 * finite): linear between the order statistics K = floor (P (N - 1)) and
 * K + 1, below + fraction (above - below); DATA is reordered.  What Monte
 * Carlo intervals are made of. */
void      sl_draw_quantiles (double *data, gsize n, double *median, double *p16, double *p84);

/* The modules in evaluation order. */
const SlModule *const *sl_engine_modules (SlEngine *engine, guint *n_modules);

/* The modules in evaluation order without an engine (explain). */
GPtrArray *sl_modules_in_order (void);

/* The module that gives Q. */
const SlModule *sl_module_for_quantity (SlQuantity q);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlEngine, sl_engine_free)

G_END_DECLS
