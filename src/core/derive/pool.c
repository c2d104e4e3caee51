/* pool.c: deriving stars on worker threads, results handed back in order.
 *
 * Stars travel in batches so that a worker's hand-over costs nothing next
 * to the derivation; a few batches are in flight at once so that the
 * reading thread keeps every worker busy.  Each worker takes an engine
 * from a queue for the length of a batch: engines hold per-star scratch
 * and the random generator, and are never shared.
 */
#include "pool.h"

#include <stdlib.h>
#include <string.h>

#define BATCH_STARS 128

typedef struct {
  SlDeriveItem  items[BATCH_STARS];
  guint         n;
  guint         next_popped;
  GStringChunk *strings;     /* designations and spectral types of the items */
  gboolean      done;        /* under the pool's lock */
  SlDerivePool *pool;
} Batch;

struct _SlDerivePool {
  guint          threads;
  guint          max_in_flight;   /* batches submitted and not yet popped */
  GCancellable  *cancellable;
  GThreadPool   *workers;         /* NULL with one thread */
  GAsyncQueue   *engines;         /* SlEngine *, one per worker */
  SlEngine      *engine;          /* with one thread */
  GQueue         submitted;       /* Batch *, in push order */
  GPtrArray     *spare;           /* Batch * ready for reuse */
  Batch         *filling;
  Batch         *popping;         /* the batch the last pop came from */
  GMutex         lock;
  GCond          finished;
};

guint
sl_derive_threads (void)
{
  const char *text = g_getenv ("STARLEDGER_THREADS");

  if (text != NULL)
    {
      char *end;
      long n = strtol (text, &end, 10);

      if (*text != '\0' && *end == '\0' && n >= 1 && n <= 64)
        return (guint) n;
      g_warning ("STARLEDGER_THREADS=%s is not a count from 1 to 64; ignored", text);
    }
  return CLAMP (g_get_num_processors (), 1, 64);
}

static void
derive_batch (Batch *batch, SlEngine *engine, GCancellable *cancellable)
{
  for (guint i = 0; i < batch->n; i++)
    {
      SlDeriveItem *item = &batch->items[i];

      if (g_cancellable_is_cancelled (cancellable))
        break;
      sl_engine_derive (engine, &item->inputs, item->overrides, item->n_overrides, &item->values);
    }
}

static void
worker (gpointer data, gpointer user_data)
{
  Batch *batch = data;
  SlDerivePool *pool = user_data;
  SlEngine *engine = g_async_queue_pop (pool->engines);

  derive_batch (batch, engine, pool->cancellable);
  g_async_queue_push (pool->engines, engine);
  g_mutex_lock (&pool->lock);
  batch->done = TRUE;
  g_cond_broadcast (&pool->finished);
  g_mutex_unlock (&pool->lock);
}

SlDerivePool *
sl_derive_pool_new (const SlDeriveParams *params, guint threads, GCancellable *cancellable)
{
  SlDerivePool *pool = g_new0 (SlDerivePool, 1);

  pool->threads = MAX (threads, 1);
  pool->max_in_flight = 2 * pool->threads + 1;
  pool->cancellable = cancellable ? g_object_ref (cancellable) : NULL;
  pool->spare = g_ptr_array_new ();
  g_queue_init (&pool->submitted);
  g_mutex_init (&pool->lock);
  g_cond_init (&pool->finished);
  if (pool->threads == 1)
    pool->engine = sl_engine_new (params);
  else
    {
      pool->engines = g_async_queue_new_full ((GDestroyNotify) sl_engine_free);
      for (guint i = 0; i < pool->threads; i++)
        g_async_queue_push (pool->engines, sl_engine_new (params));
      /* Exclusive threads: a shared pool could run two batches on one
       * thread while a core idles.  Creating them cannot fail here (GLib
       * aborts when it runs out of threads). */
      pool->workers = g_thread_pool_new (worker, pool, (int) pool->threads, TRUE, NULL);
    }
  return pool;
}

static void
batch_free (gpointer data)
{
  Batch *batch = data;

  g_string_chunk_free (batch->strings);
  g_free (batch);
}

void
sl_derive_pool_free (SlDerivePool *pool)
{
  if (pool == NULL)
    return;
  if (pool->workers)
    g_thread_pool_free (pool->workers, FALSE, TRUE);   /* lets queued batches finish */
  g_queue_clear_full (&pool->submitted, batch_free);
  if (pool->filling)
    batch_free (pool->filling);
  if (pool->popping)
    batch_free (pool->popping);
  g_ptr_array_set_free_func (pool->spare, batch_free);
  g_ptr_array_unref (pool->spare);
  if (pool->engines)
    g_async_queue_unref (pool->engines);
  sl_engine_free (pool->engine);
  g_clear_object (&pool->cancellable);
  g_mutex_clear (&pool->lock);
  g_cond_clear (&pool->finished);
  g_free (pool);
}

gboolean
sl_derive_pool_full (SlDerivePool *pool)
{
  return g_queue_get_length (&pool->submitted) >= pool->max_in_flight;
}

static void
submit (SlDerivePool *pool)
{
  Batch *batch = g_steal_pointer (&pool->filling);

  g_queue_push_tail (&pool->submitted, batch);
  if (pool->workers)
    g_thread_pool_push (pool->workers, batch, NULL);
  else
    {
      derive_batch (batch, pool->engine, pool->cancellable);
      batch->done = TRUE;
    }
}

void
sl_derive_pool_push (SlDerivePool *pool, const SlStarInputs *inputs, const SlOverride *overrides,
                     guint n_overrides)
{
  SlDeriveItem *item;

  if (pool->filling == NULL)
    {
      if (pool->spare->len > 0)
        pool->filling = g_ptr_array_steal_index_fast (pool->spare, pool->spare->len - 1);
      else
        {
          pool->filling = g_new0 (Batch, 1);
          pool->filling->strings = g_string_chunk_new (4096);
          pool->filling->pool = pool;
        }
      pool->filling->n = pool->filling->next_popped = 0;
      pool->filling->done = FALSE;
      g_string_chunk_clear (pool->filling->strings);
    }

  item = &pool->filling->items[pool->filling->n++];
  item->inputs = *inputs;
  item->inputs.designation = g_string_chunk_insert (pool->filling->strings,
                                                    inputs->designation ? inputs->designation : "");
  if (inputs->sptype)
    item->inputs.sptype = g_string_chunk_insert (pool->filling->strings, inputs->sptype);
  item->overrides = overrides;
  item->n_overrides = n_overrides;
  if (pool->filling->n == BATCH_STARS)
    submit (pool);
}

const SlDeriveItem *
sl_derive_pool_pop (SlDerivePool *pool)
{
  Batch *batch;

  if (pool->popping && pool->popping->next_popped == pool->popping->n)
    g_ptr_array_add (pool->spare, g_steal_pointer (&pool->popping));
  if (pool->popping == NULL)
    {
      /* The last stars, or a caller that pops early: start them now. */
      if (pool->filling && pool->filling->n > 0 && !sl_derive_pool_full (pool))
        submit (pool);
      batch = g_queue_pop_head (&pool->submitted);
      if (batch == NULL)
        return NULL;
      g_mutex_lock (&pool->lock);
      while (!batch->done)
        g_cond_wait (&pool->finished, &pool->lock);
      g_mutex_unlock (&pool->lock);
      pool->popping = batch;
    }
  return &pool->popping->items[pool->popping->next_popped++];
}
