/* matching.h: rows joined to stars by position, in a project.
 *
 * The import's hook (SlRowMatcher): with --match-radius each incoming row
 * goes to the nearest existing star within the radius at a common epoch
 * (crossmatch.h), and the match is stored in the matches table with its
 * separation, the epoch and the radius.  A row with no star within the
 * radius becomes a new star named by its id.  A row with two or more
 * stars within the radius, or whose nearest star is also the nearest of
 * another row of the same file, is ambiguous: it is never merged; it
 * becomes a star of its own (named by its id) and is recorded as
 * ambiguous with every candidate and its separation, for the user to
 * look at.  The earlier row of such a pair, if it had been matched, is
 * taken back out of the star the same way.
 *
 * Split undoes a match: the row becomes a star of its own again, in one
 * transaction with a ledger entry; the star it leaves must be derived
 * again.
 */
#pragma once

#include "crossmatch.h"
#include "project.h"

G_BEGIN_DECLS

/* One ambiguous row, for the import's report. */
typedef struct {
  guint  line;
  char  *designation;   /* the star the row now is */
  char  *explanation;   /* "2 stars within 1 arcsec: A 3 at 0.21 arcsec, A 4 at 0.78 arcsec" */
} SlAmbiguousRow;

typedef struct SlRowMatcher SlRowMatcher;

/* A matcher for the rows of source SOURCE_ID, inside the import's
 * transaction.  EPOCH is the import's --epoch (NAN: none); the common
 * epoch is it, or else the first row's epoch. */
SlRowMatcher *sl_row_matcher_new (SlProject *project, gint64 source_id, double radius_arcsec,
                                  double epoch);
void          sl_row_matcher_free (SlRowMatcher *matcher);

/* The star for a row whose id is DESIGNATION at position ROW: an
 * existing star, or a new one (counted in *NEW_STARS).  Returns 0 on a
 * database error, -1 if the row has no position (then *REASON says so,
 * newly allocated). */
gint64 sl_row_matcher_find (SlRowMatcher *matcher, const char *designation, const SlAstrometry *row,
                            guint line, guint64 *new_stars, char **reason, GError **error);

/* Records the outcome of the last find once the row is stored as
 * MEASUREMENT_ID. */
gboolean sl_row_matcher_record (SlRowMatcher *matcher, gint64 measurement_id, GError **error);

/* Counts so far, and the ambiguous rows (SlAmbiguousRow, in the order
 * found; owned by the matcher). */
guint64 sl_row_matcher_matched   (const SlRowMatcher *matcher);
GArray *sl_row_matcher_ambiguous (const SlRowMatcher *matcher);
/* The common epoch used (NAN: none known, positions matched as given). */
double  sl_row_matcher_epoch     (const SlRowMatcher *matcher);
/* New stars whose id was taken already and got the source's number. */
guint64 sl_row_matcher_renamed   (const SlRowMatcher *matcher);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlRowMatcher, sl_row_matcher_free)

/* One row of a source: SOURCE is the source's number or its name,
 * LINE the row's first line in the file. */
typedef struct {
  char  *source;
  guint  line;
} SlRowRef;

/* Parses SOURCE:LINE (the last ':' separates, so a name may hold one). */
gboolean sl_row_ref_parse (const char *text, SlRowRef *ref, GError **error);
void     sl_row_ref_clear (SlRowRef *ref);

/* Undoes the matches of the N_ROWS rows: each becomes a star of its own
 * named by its id (with the source's number if that is taken).  All or
 * nothing, one ledger entry.  NEW_DESIGNATIONS, if not NULL, receives the
 * new stars' designations in order. */
gboolean sl_match_split (SlProject *project, const SlRowRef *rows, guint n_rows,
                         GPtrArray *new_designations, GError **error);

/* How a row of a star came to be joined to it, or left it. */
typedef struct {
  char   *status;           /* "matched", "ambiguous" or "split" */
  gint64  source_id;
  char   *source_name, *file_name;
  guint   line;
  char   *row_designation;  /* the row's id in its file */
  char   *star;             /* the star the row belongs to now */
  double  separation;       /* arcsec; NAN if none */
  double  epoch;            /* Julian year; NAN if none */
  double  radius;           /* arcsec */
  char   *candidates;       /* JSON array */
  char   *reason;
  char   *other_star;       /* split: the star it left; else NULL */
  char   *split_by, *split_at;
} SlMatchInfo;

/* Frees INFO's members. */
void sl_match_info_clear (SlMatchInfo *info);

/* The match records of STAR_ID's rows and of rows split from it
 * (SlMatchInfo, by source and line). */
GArray *sl_match_infos_for_star (SlProject *project, gint64 star_id, GError **error);

G_END_DECLS
