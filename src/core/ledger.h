/* ledger.h: the project's audit log.
 *
 * Every change to a project (creation, schema upgrade, import, derivation,
 * override, list change) appends one entry in the same transaction as the
 * change itself, so the log and the data can never disagree.
 */
#pragma once

#include <glib.h>

#include "project.h"

G_BEGIN_DECLS

typedef struct {
  gint64  id;
  char   *at;        /* ISO 8601 UTC */
  char   *who;
  char   *action;    /* short machine word: create, upgrade, import, ... */
  char   *summary;   /* one human sentence */
  char   *details;   /* JSON object */
} SlLedgerEntry;

/* Appends an entry stamped with the current user and time.  DETAILS is a
 * JSON object (text). */
gboolean sl_ledger_append (SlProject *project, const char *action,
                           const char *summary, const char *details,
                           GError **error);

/* Reads the whole ledger, oldest first, as SlLedgerEntry pointers. */
GPtrArray *sl_ledger_read (SlProject *project, GError **error);

void sl_ledger_entry_free (SlLedgerEntry *entry);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlLedgerEntry, sl_ledger_entry_free)

G_END_DECLS
