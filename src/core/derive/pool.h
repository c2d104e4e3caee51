/* pool.h: deriving stars on worker threads, results handed back in order.
 *
 * The caller reads stars (SQLite, one thread) and pushes them; workers,
 * each with an engine of its own, derive them a batch at a time; the
 * caller pops the results in the order it pushed them and writes them.
 * A star's numbers do not depend on the thread that derives it or on the
 * stars derived before it (each Monte Carlo star seeds its own generator
 * from the run's seed and its id), so the results are the same for any
 * number of threads.
 */
#pragma once

#include <gio/gio.h>

#include "engine.h"

G_BEGIN_DECLS

/* One star in the pool: what was pushed, and what the engine gave. */
typedef struct {
  SlStarInputs      inputs;      /* designation and sptype: copies owned by the pool */
  const SlOverride *overrides;   /* the caller's; valid until popped */
  guint             n_overrides;
  SlDerivedValues   values;
} SlDeriveItem;

typedef struct _SlDerivePool SlDerivePool;

/* THREADS workers (1: the stars are derived in the caller's thread, when
 * a batch fills or is popped).  CANCELLABLE (may be NULL) stops workers
 * early; what they skipped is then garbage the caller must not write. */
SlDerivePool *sl_derive_pool_new  (const SlDeriveParams *params, guint threads,
                                   GCancellable *cancellable);
/* Waits for the workers; pending results are dropped. */
void          sl_derive_pool_free (SlDerivePool *pool);

/* Whether enough stars are in flight: pop before pushing more. */
gboolean      sl_derive_pool_full (SlDerivePool *pool);
/* Queues a star; INPUTS is copied, OVERRIDES must stay valid until popped. */
void          sl_derive_pool_push (SlDerivePool *pool, const SlStarInputs *inputs,
                                   const SlOverride *overrides, guint n_overrides);
/* The oldest star not yet popped, derived (waits for it), or NULL when
 * none is left.  Valid until the next call. */
const SlDeriveItem *sl_derive_pool_pop (SlDerivePool *pool);

/* The number of worker threads a run uses: $STARLEDGER_THREADS if set (a
 * count from 1 to 64; for measurements and tests), else the processors. */
guint         sl_derive_threads (void);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlDerivePool, sl_derive_pool_free)

G_END_DECLS
