/* input-reader.c: the stars' inputs read ahead on a thread and a
 * connection of their own (input-reader.h).
 *
 * The thread fills chunks of stars and queues them; the caller takes them
 * in order and gives each back once it has moved past it.  A fixed number
 * of chunks keeps the thread at most that far ahead, so memory stays
 * bounded however fast it reads.
 */
#include "input-reader.h"

#include <string.h>

#define CHUNK_STARS 256
#define N_CHUNKS    4

typedef struct {
  SlStarInputs  items[CHUNK_STARS];
  guint         n;
  GStringChunk *strings;   /* the items' designations and spectral types */
  GError       *error;     /* the read that ended the chunk failed */
  gboolean      last;      /* no chunk follows */
} Chunk;

struct _SlInputReader {
  GArray        *ids;          /* gint64, ascending: the stars wanted */
  guint          next_id;      /* index in ids of the next star wanted */
  SlInputCursor *cursor;       /* on the caller's connection, or on connection */
  SlProject     *connection;   /* the reader's own; NULL: no thread */
  GThread       *thread;
  GPtrArray     *chunks;       /* every Chunk, for freeing */
  GAsyncQueue   *empty;        /* Chunk * for the thread to fill */
  GAsyncQueue   *full;         /* Chunk * filled, in order */
  Chunk         *current;      /* the chunk being handed out */
  guint          next_item;
  gint           stop;         /* atomic: the caller is done */
};

/* Pushed to wake a thread waiting for an empty chunk when it must stop. */
static Chunk wake_up;

/* The cursor's next star among the wanted ones.  A wanted star without
 * measurements is passed over rather than holding up the stars after it. */
static gboolean
next_wanted (SlInputReader *reader, SlStarInputs *inputs, GError **error)
{
  while (reader->next_id < reader->ids->len)
    {
      if (!sl_input_cursor_next (reader->cursor, inputs, error))
        return FALSE;
      while (reader->next_id < reader->ids->len
             && g_array_index (reader->ids, gint64, reader->next_id) < inputs->star_id)
        reader->next_id++;
      if (reader->next_id < reader->ids->len
          && g_array_index (reader->ids, gint64, reader->next_id) == inputs->star_id)
        {
          reader->next_id++;
          return TRUE;
        }
    }
  return FALSE;
}

static gpointer
read_ahead (gpointer data)
{
  SlInputReader *reader = data;
  gboolean last = FALSE;

  while (!last)
    {
      Chunk *chunk = g_async_queue_pop (reader->empty);

      if (g_atomic_int_get (&reader->stop))
        break;
      chunk->n = 0;
      g_string_chunk_clear (chunk->strings);
      while (chunk->n < CHUNK_STARS && !g_atomic_int_get (&reader->stop))
        {
          SlStarInputs *in = &chunk->items[chunk->n];

          if (!next_wanted (reader, in, &chunk->error))
            {
              chunk->last = TRUE;
              break;
            }
          /* The cursor's strings last until its next star. */
          in->designation = g_string_chunk_insert (chunk->strings, in->designation ? in->designation : "");
          if (in->sptype)
            in->sptype = g_string_chunk_insert (chunk->strings, in->sptype);
          chunk->n++;
        }
      last = chunk->last;
      g_async_queue_push (reader->full, chunk);
    }
  return NULL;
}

static gboolean
in_wal_mode (SlProject *project)
{
  sqlite3_stmt *stmt = sl_project_prepare (project, "PRAGMA journal_mode", NULL);
  gboolean wal = FALSE;

  if (stmt == NULL)
    return FALSE;
  if (sqlite3_step (stmt) == SQLITE_ROW)
    wal = g_ascii_strcasecmp ((const char *) sqlite3_column_text (stmt, 0), "wal") == 0;
  sqlite3_finalize (stmt);
  return wal;
}

SlInputReader *
sl_input_reader_new (SlProject *project, GArray *ids, const SlCombinePolicy *policy, GError **error)
{
  g_autoptr (SlInputReader) reader = g_new0 (SlInputReader, 1);

  g_return_val_if_fail (project != NULL, NULL);
  g_return_val_if_fail (ids != NULL, NULL);

  reader->ids = g_array_ref (ids);
  if (!in_wal_mode (project))
    {
      reader->cursor = sl_input_cursor_new_with_policy (project, 0, policy, error);
      return reader->cursor ? g_steal_pointer (&reader) : NULL;
    }

  reader->connection = sl_project_open (sl_project_path (project), error);
  /* It reads each page once, in order: a big cache would only hold memory. */
  if (reader->connection == NULL
      || !sl_project_exec (reader->connection, "PRAGMA cache_size = -2048", error))
    return NULL;
  reader->cursor = sl_input_cursor_new_with_policy (reader->connection, 0, policy, error);
  if (reader->cursor == NULL)
    return NULL;

  reader->chunks = g_ptr_array_new ();
  reader->empty = g_async_queue_new ();
  reader->full = g_async_queue_new ();
  for (int i = 0; i < N_CHUNKS; i++)
    {
      Chunk *chunk = g_new0 (Chunk, 1);

      chunk->strings = g_string_chunk_new (4096);
      g_ptr_array_add (reader->chunks, chunk);
      g_async_queue_push (reader->empty, chunk);
    }
  /* From here on only the thread uses the connection, until it is joined. */
  reader->thread = g_thread_new ("sl-input-reader", read_ahead, reader);
  return g_steal_pointer (&reader);
}

gboolean
sl_input_reader_next (SlInputReader *reader, SlStarInputs *inputs, GError **error)
{
  if (reader->thread == NULL)
    return next_wanted (reader, inputs, error);

  for (;;)
    {
      Chunk *chunk = reader->current;

      if (chunk != NULL && reader->next_item < chunk->n)
        {
          *inputs = chunk->items[reader->next_item++];
          return TRUE;
        }
      if (chunk != NULL && chunk->last)
        {
          if (chunk->error != NULL)
            g_propagate_error (error, g_steal_pointer (&chunk->error));
          return FALSE;
        }
      /* The caller is past every star of this chunk: the thread may
       * fill it again. */
      if (chunk != NULL)
        g_async_queue_push (reader->empty, chunk);
      reader->current = g_async_queue_pop (reader->full);
      reader->next_item = 0;
    }
}

void
sl_input_reader_free (SlInputReader *reader)
{
  if (reader == NULL)
    return;
  if (reader->thread != NULL)
    {
      g_atomic_int_set (&reader->stop, 1);
      g_async_queue_push (reader->empty, &wake_up);
      g_thread_join (reader->thread);
    }
  sl_input_cursor_free (reader->cursor);
  sl_project_close (reader->connection);
  if (reader->chunks != NULL)
    {
      for (guint i = 0; i < reader->chunks->len; i++)
        {
          Chunk *chunk = g_ptr_array_index (reader->chunks, i);

          g_clear_error (&chunk->error);
          g_string_chunk_free (chunk->strings);
          g_free (chunk);
        }
      g_ptr_array_unref (reader->chunks);
    }
  if (reader->empty != NULL)
    g_async_queue_unref (reader->empty);
  if (reader->full != NULL)
    g_async_queue_unref (reader->full);
  if (reader->ids != NULL)
    g_array_unref (reader->ids);
  g_free (reader);
}
