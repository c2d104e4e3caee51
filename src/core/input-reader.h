/* input-reader.h: the stars' inputs read ahead on a thread of their own.
 *
 * A derivation run writes its rows on the thread that holds the project's
 * write transaction; reading the inputs there too made that one thread
 * the whole run's limit.  The reader walks the inputs cursor (inputs.h) on
 * a second connection to the same file, in a thread of its own, and hands
 * the stars over in chunks.  Its snapshot is the state the writer's
 * transaction started from: the writer holds the write lock before the
 * reader opens, and the run changes no measurements.
 *
 * Only a project in WAL mode lets a reader go on beside a writer; in any
 * other journal mode (a file system without shared memory) the cursor is
 * read on the caller's connection and thread, as before.
 */
#pragma once

#include "inputs.h"

G_BEGIN_DECLS

typedef struct _SlInputReader SlInputReader;

/* Starts reading the inputs of the stars whose ids are in IDS (gint64,
 * ascending; the reader keeps a reference) from PROJECT, which must be
 * inside a write transaction (sl_project_begin), chosen by POLICY (the
 * run's). */
SlInputReader *sl_input_reader_new  (SlProject *project, GArray *ids, const SlCombinePolicy *policy,
                                     GError **error);

/* The next of those stars, in id order; FALSE at the end, or on an error
 * (then ERROR is set).  Strings in INPUTS stay valid until the next call. */
gboolean       sl_input_reader_next (SlInputReader *reader, SlStarInputs *inputs, GError **error);

/* Stops the thread (at once, if the caller stopped early) and closes the
 * second connection. */
void           sl_input_reader_free (SlInputReader *reader);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlInputReader, sl_input_reader_free)

G_END_DECLS
