/* match-list.h: the project's match records for browsing: how many rows
 * were joined to stars by position, left ambiguous or split, and a
 * bounded page of them, ambiguous first, with a search.
 *
 * Bounded on purpose: a project may hold a million matches, and nobody
 * reads a million; the count says how many there are and the search
 * (a row's own id or its star's designation) finds the one wanted.
 */
#pragma once

#include "matching.h"

G_BEGIN_DECLS

typedef struct {
  gint64 matched, ambiguous, split;
} SlMatchCounts;

/* Counts the match records by status. */
gboolean sl_match_counts (SlProject *project, SlMatchCounts *counts, GError **error);

/* One match record with what a list shows. */
typedef struct {
  SlMatchInfo info;
  gint64      star_id;       /* the star the row belongs to now */
  char       *candidates;    /* "LHO 0124 at 0.350 arcsec, …", nearest first; "" if none */
  GStrv       candidate_ids; /* their designations, nearest first */
} SlMatchListRow;

/* Up to LIMIT records: the ambiguous rows, then the matched, then the
 * split ones, each in import order (source, line).  SEARCH (NULL or "":
 * every record) keeps those whose row id, current star or (split) former
 * star contains it,
 * ignoring ASCII case.  *MORE is set when records beyond LIMIT satisfy
 * it.  Returns SlMatchListRow, or NULL on a database error. */
GArray *sl_match_list (SlProject *project, const char *search, guint limit, gboolean *more,
                       GError **error);

G_END_DECLS
