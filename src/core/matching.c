/* matching.c: the import's cross-match hook, split, and the records
 * explain shows (see matching.h for the rules).
 *
 * Contents:
 *   designations ....... new_star (a star named by a row's id)
 *   the hook ........... SlRowMatcher: the index of the project's stars,
 *                        who claimed which star, the matches rows
 *   split .............. sl_row_ref_parse, sl_match_split
 *   explain ............ sl_match_infos_for_star
 */
#include "matching.h"

#include <inttypes.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "ledger.h"
#include "sl-error.h"
#include "util.h"

/* Candidates kept with an ambiguous row: enough to choose by hand. */
#define MAX_STORED_CANDIDATES 8

/* ------------------------------------------------------------------ */
/* Designations                                                       */

/* Inserts a star named BASE, or "BASE (source N)", "BASE (source N, 2)"
 * ... if that is taken (two catalogues may use one name for different
 * stars).  Returns its id, or 0 on a database error; *RENAMED is set if
 * BASE was taken.  INSERT is "INSERT INTO stars (designation,
 * first_source_id) VALUES (?, ?) ON CONFLICT DO NOTHING". */
static gint64
new_star (sqlite3_stmt *insert, const char *base, gint64 source_id, char **designation,
          gboolean *renamed)
{
  sqlite3 *db = sqlite3_db_handle (insert);

  *renamed = FALSE;
  for (guint attempt = 0; attempt < 1000; attempt++)
    {
      g_autofree char *name = attempt == 0 ? g_strdup (base)
                              : attempt == 1 ? g_strdup_printf (_("%s (source %" PRId64 ")"), base, source_id)
                              : g_strdup_printf (_("%s (source %" PRId64 ", %u)"), base, source_id, attempt);
      int rc;

      sqlite3_bind_text (insert, 1, name, -1, SQLITE_STATIC);
      sqlite3_bind_int64 (insert, 2, source_id);
      rc = sqlite3_step (insert);
      sqlite3_reset (insert);
      if (rc != SQLITE_DONE)
        return 0;
      if (sqlite3_changes (db) == 1)
        {
          *renamed = attempt > 0;
          if (designation)
            *designation = g_steal_pointer (&name);
          return sqlite3_last_insert_rowid (db);
        }
    }
  return 0;
}

/* ------------------------------------------------------------------ */
/* The hook                                                           */

typedef enum {
  PENDING_NONE,       /* a new star, nothing to record */
  PENDING_MATCHED,
  PENDING_AMBIGUOUS,
} PendingKind;

struct SlRowMatcher {
  SlProject  *project;
  gint64      source_id;
  double      radius;        /* arcsec */
  double      epoch;         /* common epoch, Julian year; NAN: none */
  gboolean    epoch_fixed;   /* --epoch given, or chosen from the first row */
  SlSkyIndex *index;         /* built at the first row; keys index star_ids */
  GArray     *star_ids;      /* gint64, the project's stars with a position */
  gint64     *claims;        /* per star: the measurement of its unique match, 0, or -1 if contested */
  GArray     *found;         /* SlSkyCandidate scratch */
  GArray     *ambiguous;     /* SlAmbiguousRow */
  guint64     matched, renamed;

  /* The last find, until recorded. */
  PendingKind kind;
  gint64      star_index;    /* into star_ids */
  double      separation;
  char       *row_designation;
  char       *candidates;    /* JSON */
  char       *reason;

  sqlite3_stmt *insert_star, *designation_of, *insert_match, *demote_load,
               *move_measurement, *demote_match;
};

static void
ambiguous_row_clear (gpointer data)
{
  SlAmbiguousRow *row = data;

  g_free (row->designation);
  g_free (row->explanation);
}

SlRowMatcher *
sl_row_matcher_new (SlProject *project, gint64 source_id, double radius_arcsec, double epoch)
{
  SlRowMatcher *matcher;

  g_return_val_if_fail (project != NULL && radius_arcsec > 0.0, NULL);

  matcher = g_new0 (SlRowMatcher, 1);
  matcher->project = project;
  matcher->source_id = source_id;
  matcher->radius = radius_arcsec;
  matcher->epoch = epoch;
  matcher->epoch_fixed = isfinite (epoch);
  matcher->star_ids = g_array_new (FALSE, FALSE, sizeof (gint64));
  matcher->found = g_array_new (FALSE, FALSE, sizeof (SlSkyCandidate));
  matcher->ambiguous = g_array_new (FALSE, FALSE, sizeof (SlAmbiguousRow));
  g_array_set_clear_func (matcher->ambiguous, ambiguous_row_clear);
  return matcher;
}

static void
clear_pending (SlRowMatcher *matcher)
{
  matcher->kind = PENDING_NONE;
  g_clear_pointer (&matcher->row_designation, g_free);
  g_clear_pointer (&matcher->candidates, g_free);
  g_clear_pointer (&matcher->reason, g_free);
}

void
sl_row_matcher_free (SlRowMatcher *matcher)
{
  if (matcher == NULL)
    return;
  clear_pending (matcher);
  sl_sky_index_free (matcher->index);
  g_array_unref (matcher->star_ids);
  g_free (matcher->claims);
  g_array_unref (matcher->found);
  g_array_unref (matcher->ambiguous);
  sqlite3_finalize (matcher->insert_star);
  sqlite3_finalize (matcher->designation_of);
  sqlite3_finalize (matcher->insert_match);
  sqlite3_finalize (matcher->demote_load);
  sqlite3_finalize (matcher->move_measurement);
  sqlite3_finalize (matcher->demote_match);
  g_free (matcher);
}

guint64
sl_row_matcher_matched (const SlRowMatcher *matcher)
{
  return matcher->matched;
}

GArray *
sl_row_matcher_ambiguous (const SlRowMatcher *matcher)
{
  return matcher->ambiguous;
}

double
sl_row_matcher_epoch (const SlRowMatcher *matcher)
{
  return matcher->epoch;
}

guint64
sl_row_matcher_renamed (const SlRowMatcher *matcher)
{
  return matcher->renamed;
}

static gboolean
prepare (SlRowMatcher *matcher, GError **error)
{
  SlProject *p = matcher->project;

  return (matcher->insert_star = sl_project_prepare (p,
            "INSERT INTO stars (designation, first_source_id) VALUES (?, ?) "
            "ON CONFLICT (designation) DO NOTHING", error))
      && (matcher->designation_of = sl_project_prepare (p,
            "SELECT designation FROM stars WHERE id = ?", error))
      && (matcher->insert_match = sl_project_prepare (p,
            "INSERT INTO matches (measurement_id, row_designation, status, separation_arcsec, "
            "epoch, radius_arcsec, candidates, reason) VALUES (?, ?, ?, ?, ?, ?, ?, ?)", error))
      && (matcher->demote_load = sl_project_prepare (p,
            "SELECT x.measurement_id, x.row_designation, m.line, x.candidates FROM matches x "
            "JOIN measurements m ON m.id = x.measurement_id WHERE x.measurement_id = ?", error))
      /* The star it had joined becomes its candidate: before the move. */
      && (matcher->demote_match = sl_project_prepare (p,
            "UPDATE matches SET status = 'ambiguous', reason = ?1, candidates = "
            "(SELECT json_array (json_object ('star_id', s.id, 'designation', s.designation, "
            "'separation_arcsec', matches.separation_arcsec)) FROM measurements m "
            "JOIN stars s ON s.id = m.star_id WHERE m.id = matches.measurement_id) WHERE measurement_id = ?2", error))
      && (matcher->move_measurement = sl_project_prepare (p,
            "UPDATE measurements SET star_id = ? WHERE id = ?", error));
}

/* Builds the index of every position the project's stars have (a star
 * may have several, one per source), moved to the common epoch. */
static gboolean
build_index (SlRowMatcher *matcher, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (matcher->project,
                                           "SELECT star_id, ra, dec, pmra, pmdec, parallax, vrad, epoch "
                                           "FROM measurements WHERE ra IS NOT NULL AND dec IS NOT NULL "
                                           "AND source_id != ? ORDER BY star_id", error);
  gint64 last = 0;
  int rc;

  if (stmt == NULL)
    return FALSE;
  matcher->index = sl_sky_index_new (matcher->radius);
  sqlite3_bind_int64 (stmt, 1, matcher->source_id);
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      gint64 star_id = sqlite3_column_int64 (stmt, 0);
      SlAstrometry a;
      double ra, dec;

      a.ra = sqlite3_column_double (stmt, 1);
      a.dec = sqlite3_column_double (stmt, 2);
      a.pmra = sl_column_double_or_nan (stmt, 3);
      a.pmdec = sl_column_double_or_nan (stmt, 4);
      a.parallax = sl_column_double_or_nan (stmt, 5);
      a.vrad = sl_column_double_or_nan (stmt, 6);
      a.epoch = sl_column_double_or_nan (stmt, 7);
      if (star_id != last)
        {
          g_array_append_val (matcher->star_ids, star_id);
          last = star_id;
        }
      sl_astrometry_propagate (&a, matcher->epoch, &ra, &dec);
      sl_sky_index_add (matcher->index, ra, dec, (gint64) matcher->star_ids->len - 1);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (matcher->project, error, "measurements");
      return FALSE;
    }
  sl_sky_index_build (matcher->index);
  matcher->claims = g_new0 (gint64, MAX (matcher->star_ids->len, 1));
  return TRUE;
}

static char *
designation_of (SlRowMatcher *matcher, gint64 star_id)
{
  char *name = NULL;

  sqlite3_bind_int64 (matcher->designation_of, 1, star_id);
  if (sqlite3_step (matcher->designation_of) == SQLITE_ROW)
    name = sl_column_text_dup (matcher->designation_of, 0);
  sqlite3_reset (matcher->designation_of);
  return name ? name : g_strdup ("?");
}

static const char *
format_arcsec (char *buf, double arcsec)
{
  return g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, "%.3f", arcsec);
}

/* The candidates of the last query as JSON, and in words. */
static void
describe_candidates (SlRowMatcher *matcher, char **json, char **words)
{
  GString *j = g_string_new ("[");
  GString *w = g_string_new (NULL);
  char r[G_ASCII_DTOSTR_BUF_SIZE], s[G_ASCII_DTOSTR_BUF_SIZE];

  g_string_printf (w, g_dngettext (GETTEXT_PACKAGE, "%u star within %s arcsec", "%u stars within %s arcsec",
                                   matcher->found->len),
                   matcher->found->len, sl_format_double (r, matcher->radius));
  for (guint i = 0; i < matcher->found->len && i < MAX_STORED_CANDIDATES; i++)
    {
      const SlSkyCandidate *c = &g_array_index (matcher->found, SlSkyCandidate, i);
      gint64 star_id = g_array_index (matcher->star_ids, gint64, c->key);
      g_autofree char *name = designation_of (matcher, star_id);

      g_string_append_printf (j, "%s{\"star_id\":%" PRId64 ",\"designation\":", i ? "," : "", star_id);
      sl_json_append_string (j, name);
      g_string_append (j, ",\"separation_arcsec\":");
      sl_json_append_number (j, c->separation);
      g_string_append_c (j, '}');
      g_string_append_printf (w, _("%s %s at %s arcsec"), i ? "," : ":", name, format_arcsec (s, c->separation));
    }
  if (matcher->found->len > MAX_STORED_CANDIDATES)
    g_string_append_printf (w, _(", and %u more"), matcher->found->len - MAX_STORED_CANDIDATES);
  g_string_append_c (j, ']');
  *json = g_string_free (j, FALSE);
  *words = g_string_free (w, FALSE);
}

static void
add_ambiguous (SlRowMatcher *matcher, guint line, char *designation, const char *explanation)
{
  SlAmbiguousRow row = { line, designation, g_strdup (explanation) };

  g_array_append_val (matcher->ambiguous, row);
}

/* An earlier row of this file, matched to a star that the current row
 * claims too, leaves that star: it becomes a star of its own and its
 * match is recorded as ambiguous. */
static gboolean
demote (SlRowMatcher *matcher, gint64 match_id, const char *star_name, guint line,
        guint *earlier, guint64 *new_stars, GError **error)
{
  g_autofree char *row_designation = NULL;
  g_autofree char *new_name = NULL;
  g_autofree char *reason = NULL;
  gint64 measurement_id = 0, star_id;
  guint earlier_line = 0;
  gboolean renamed;
  int rc;

  sqlite3_bind_int64 (matcher->demote_load, 1, match_id);
  if (sqlite3_step (matcher->demote_load) == SQLITE_ROW)
    {
      measurement_id = sqlite3_column_int64 (matcher->demote_load, 0);
      row_designation = sl_column_text_dup (matcher->demote_load, 1);
      earlier_line = (guint) sqlite3_column_int64 (matcher->demote_load, 2);
    }
  sqlite3_reset (matcher->demote_load);
  if (measurement_id == 0)
    {
      sl_project_set_db_error (matcher->project, error, "matches");
      return FALSE;
    }

  star_id = new_star (matcher->insert_star, row_designation, matcher->source_id, &new_name, &renamed);
  if (star_id == 0)
    {
      sl_project_set_db_error (matcher->project, error, "stars");
      return FALSE;
    }
  (*new_stars)++;
  matcher->renamed += renamed;
  reason = g_strdup_printf (_("%s is also the nearest star of line %u"), star_name, line);

  sqlite3_bind_text (matcher->demote_match, 1, reason, -1, SQLITE_STATIC);
  sqlite3_bind_int64 (matcher->demote_match, 2, match_id);
  rc = sqlite3_step (matcher->demote_match);
  sqlite3_reset (matcher->demote_match);
  if (rc == SQLITE_DONE)
    {
      sqlite3_bind_int64 (matcher->move_measurement, 1, star_id);
      sqlite3_bind_int64 (matcher->move_measurement, 2, measurement_id);
      rc = sqlite3_step (matcher->move_measurement);
      sqlite3_reset (matcher->move_measurement);
    }
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (matcher->project, error, "matches");
      return FALSE;
    }
  matcher->matched--;
  *earlier = earlier_line;
  add_ambiguous (matcher, earlier_line, g_steal_pointer (&new_name), reason);
  return TRUE;
}

gint64
sl_row_matcher_find (SlRowMatcher *matcher, const char *designation, const SlAstrometry *row,
                     guint line, guint64 *new_stars, char **reason, GError **error)
{
  g_autofree char *words = NULL;
  g_autofree char *star_name = NULL;
  g_autofree char *new_name = NULL;
  const SlSkyCandidate *nearest;
  double ra, dec;
  gint64 *claim;
  gint64 star_id;
  gboolean renamed;
  guint n;

  clear_pending (matcher);
  if (!isfinite (row->ra) || !isfinite (row->dec))
    {
      *reason = g_strdup (_("no position (ra and dec) to match by (--match-radius)"));
      return -1;
    }

  if (matcher->index == NULL)
    {
      if (!matcher->epoch_fixed)
        matcher->epoch = row->epoch;
      matcher->epoch_fixed = TRUE;
      if (!prepare (matcher, error) || !build_index (matcher, error))
        return 0;
    }

  sl_astrometry_propagate (row, matcher->epoch, &ra, &dec);
  n = sl_sky_index_query (matcher->index, ra, dec, matcher->found);
  matcher->row_designation = g_strdup (designation);
  if (n == 0)
    {
      star_id = new_star (matcher->insert_star, designation, matcher->source_id, NULL, &renamed);
      if (star_id == 0)
        sl_project_set_db_error (matcher->project, error, "stars");
      else
        {
          (*new_stars)++;
          matcher->renamed += renamed;
        }
      return star_id;
    }

  nearest = &g_array_index (matcher->found, SlSkyCandidate, 0);
  matcher->star_index = nearest->key;
  matcher->separation = nearest->separation;
  claim = &matcher->claims[nearest->key];
  if (n == 1 && *claim == 0)
    {
      matcher->kind = PENDING_MATCHED;
      return g_array_index (matcher->star_ids, gint64, nearest->key);
    }

  /* Ambiguous: never merged; a star of its own, with the candidates. */
  matcher->kind = PENDING_AMBIGUOUS;
  describe_candidates (matcher, &matcher->candidates, &words);
  star_name = designation_of (matcher, g_array_index (matcher->star_ids, gint64, nearest->key));
  if (*claim != 0)
    {
      g_autofree char *also = NULL;
      guint earlier = 0;

      if (*claim > 0 && !demote (matcher, *claim, star_name, line, &earlier, new_stars, error))
        return 0;
      also = earlier ? g_strdup_printf (_("%s is also the nearest star of line %u"), star_name, earlier)
                     : g_strdup_printf (_("%s is also the nearest star of earlier rows of this file"), star_name);
      matcher->reason = n > 1 ? g_strdup_printf ("%s; %s", words, also) : g_steal_pointer (&also);
    }
  else
    matcher->reason = g_steal_pointer (&words);
  *claim = -1;

  star_id = new_star (matcher->insert_star, designation, matcher->source_id, &new_name, &renamed);
  if (star_id == 0)
    {
      sl_project_set_db_error (matcher->project, error, "stars");
      return 0;
    }
  (*new_stars)++;
  matcher->renamed += renamed;
  add_ambiguous (matcher, line, g_steal_pointer (&new_name), matcher->reason);
  return star_id;
}

gboolean
sl_row_matcher_record (SlRowMatcher *matcher, gint64 measurement_id, GError **error)
{
  sqlite3_stmt *stmt = matcher->insert_match;
  gboolean matched = matcher->kind == PENDING_MATCHED;
  int rc;

  if (matcher->kind == PENDING_NONE)
    return TRUE;

  sqlite3_bind_int64 (stmt, 1, measurement_id);
  sqlite3_bind_text (stmt, 2, matcher->row_designation, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 3, matched ? "matched" : "ambiguous", -1, SQLITE_STATIC);
  sqlite3_bind_double (stmt, 4, matcher->separation);
  if (isfinite (matcher->epoch))
    sqlite3_bind_double (stmt, 5, matcher->epoch);
  else
    sqlite3_bind_null (stmt, 5);
  sqlite3_bind_double (stmt, 6, matcher->radius);
  sqlite3_bind_text (stmt, 7, matcher->candidates ? matcher->candidates : "[]", -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 8, matcher->reason ? matcher->reason : "", -1, SQLITE_STATIC);
  rc = sqlite3_step (stmt);
  sqlite3_reset (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (matcher->project, error, "matches");
      return FALSE;
    }
  if (matched)
    {
      matcher->claims[matcher->star_index] = sqlite3_last_insert_rowid (sqlite3_db_handle (stmt));
      matcher->matched++;
    }
  clear_pending (matcher);
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Split                                                              */

gboolean
sl_row_ref_parse (const char *text, SlRowRef *ref, GError **error)
{
  const char *colon = strrchr (text, ':');
  guint64 line;

  memset (ref, 0, sizeof *ref);
  if (colon == NULL || colon == text
      || !g_ascii_string_to_unsigned (colon + 1, 10, 1, G_MAXUINT, &line, NULL))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   _("'%s': expected SOURCE:LINE, the source's number or name and the row's line "
                     "in its file, e.g. 2:14"), text);
      return FALSE;
    }
  ref->source = g_strndup (text, colon - text);
  ref->line = (guint) line;
  return TRUE;
}

void
sl_row_ref_clear (SlRowRef *ref)
{
  g_clear_pointer (&ref->source, g_free);
}

/* The source a reference names: its number, else its name, else its
 * file's name; 0 with ERROR if none or several. */
static gint64
find_source (SlProject *project, const char *spec, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "SELECT id FROM sources WHERE CAST (id AS TEXT) = ?1 "
                                           "UNION SELECT id FROM sources WHERE name = ?1 AND NOT EXISTS "
                                           "(SELECT 1 FROM sources WHERE CAST (id AS TEXT) = ?1) "
                                           "UNION SELECT id FROM sources WHERE file_name = ?1 AND NOT EXISTS "
                                           "(SELECT 1 FROM sources WHERE CAST (id AS TEXT) = ?1 OR name = ?1)",
                                           error);
  gint64 id = 0;
  guint n = 0;

  if (stmt == NULL)
    return 0;
  sqlite3_bind_text (stmt, 1, spec, -1, SQLITE_STATIC);
  while (sqlite3_step (stmt) == SQLITE_ROW)
    {
      id = sqlite3_column_int64 (stmt, 0);
      n++;
    }
  sqlite3_finalize (stmt);
  if (n == 0)
    g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME,
                 _("%s: no source '%s' (give its number or name; 'starledger-cli summary' lists them)"),
                 sl_project_path (project), spec);
  else if (n > 1)
    g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME,
                 _("%s: %u sources are named '%s'; give the source's number"),
                 sl_project_path (project), n, spec);
  return n == 1 ? id : 0;
}

/* Splits one row inside the open transaction; appends to DETAILS (JSON)
 * and SUMMARY. */
static gboolean
split_one (SlProject *project, const SlRowRef *ref, GPtrArray *new_designations,
           GString *details, GString *summary, GError **error)
{
  g_autofree char *status = NULL;
  g_autofree char *row_designation = NULL;
  g_autofree char *old_name = NULL;
  g_autofree char *file_name = NULL;
  g_autofree char *new_name = NULL;
  g_autofree char *now = sl_now_utc ();
  g_autofree char *sql = NULL;
  gint64 source_id = find_source (project, ref->source, error);
  gint64 match_id = 0, measurement_id = 0, old_star = 0, new_star_id;
  sqlite3_stmt *stmt;
  gboolean renamed, ok;

  if (source_id == 0)
    return FALSE;
  stmt = sl_project_prepare (project,
                             "SELECT x.measurement_id, x.status, m.id, m.star_id, x.row_designation, s.designation, src.file_name "
                             "FROM measurements m JOIN sources src ON src.id = m.source_id "
                             "JOIN stars s ON s.id = m.star_id "
                             "LEFT JOIN matches x ON x.measurement_id = m.id "
                             "WHERE m.source_id = ? AND m.line = ?", error);
  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_int64 (stmt, 1, source_id);
  sqlite3_bind_int64 (stmt, 2, ref->line);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    {
      match_id = sqlite3_column_int64 (stmt, 0);
      measurement_id = sqlite3_column_int64 (stmt, 2);
      old_star = sqlite3_column_int64 (stmt, 3);
      sl_column_texts_dup (stmt, 1, &status, NULL);
      sl_column_texts_dup (stmt, 4, &row_designation, &old_name, &file_name, NULL);
    }
  sqlite3_finalize (stmt);

  if (measurement_id == 0)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME,
                   _("%s: source %" PRId64 " has no imported row at line %u"),
                   sl_project_path (project), source_id, ref->line);
      return FALSE;
    }
  if (match_id == 0 || g_strcmp0 (status, "matched") != 0)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   match_id == 0
                     ? _("%s:%u: this row was not matched by position; it is star %s's own row")
                     : g_strcmp0 (status, "split") == 0
                       ? _("%s:%u: this row was split already; it is star %s")
                       : _("%s:%u: this row was ambiguous and is a star of its own already (%s)"),
                   file_name, ref->line, old_name);
      return FALSE;
    }

  stmt = sl_project_prepare (project,
                             "INSERT INTO stars (designation, first_source_id) VALUES (?, ?) "
                             "ON CONFLICT (designation) DO NOTHING", error);
  if (stmt == NULL)
    return FALSE;
  new_star_id = new_star (stmt, row_designation, source_id, &new_name, &renamed);
  sqlite3_finalize (stmt);
  if (new_star_id == 0)
    {
      sl_project_set_db_error (project, error, "stars");
      return FALSE;
    }

  sql = g_strdup_printf ("UPDATE measurements SET star_id = %" PRId64 " WHERE id = %" PRId64 ";"
                         "UPDATE derived SET stale = 1 WHERE star_id = %" PRId64 ";",
                         new_star_id, measurement_id, old_star);
  if (!sl_project_exec (project, sql, error))
    return FALSE;
  stmt = sl_project_prepare (project,
                             "UPDATE matches SET status = 'split', split_from = ?, "
                             "split_by = ?, split_at = ? WHERE measurement_id = ?", error);
  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_int64 (stmt, 1, old_star);
  sqlite3_bind_text (stmt, 2, sl_current_user (), -1, SQLITE_TRANSIENT);
  sqlite3_bind_text (stmt, 3, now, -1, SQLITE_STATIC);
  sqlite3_bind_int64 (stmt, 4, match_id);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  sqlite3_finalize (stmt);
  if (!ok)
    {
      sl_project_set_db_error (project, error, "matches");
      return FALSE;
    }

  g_string_append_printf (summary, _("%s%s:%u (%s) from %s into %s"), summary->len ? "; " : "",
                          file_name, ref->line, row_designation, old_name, new_name);
  g_string_append_printf (details, "%s{\"source_id\":%" PRId64 ",\"line\":%u,\"measurement_id\":%"
                          PRId64 ",\"from_star\":", details->len > 1 ? "," : "",
                          source_id, ref->line, measurement_id);
  sl_json_append_string (details, old_name);
  g_string_append (details, ",\"new_star\":");
  sl_json_append_string (details, new_name);
  g_string_append_c (details, '}');
  if (new_designations)
    g_ptr_array_add (new_designations, g_steal_pointer (&new_name));
  return TRUE;
}

gboolean
sl_match_split (SlProject *project, const SlRowRef *rows, guint n_rows,
                GPtrArray *new_designations, GError **error)
{
  g_autoptr (GString) details = g_string_new ("[");
  g_autoptr (GString) summary = g_string_new (NULL);
  g_autofree char *entry = NULL;

  g_return_val_if_fail (project != NULL && (rows != NULL || n_rows == 0), FALSE);

  if (n_rows == 0)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("no row to split"));
      return FALSE;
    }
  if (!sl_project_begin (project, error))
    return FALSE;
  for (guint i = 0; i < n_rows; i++)
    if (!split_one (project, &rows[i], new_designations, details, summary, error))
      {
        sl_project_rollback (project);
        return FALSE;
      }
  g_string_append_c (details, ']');
  entry = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "split %u row from its star: %s",
                                        "split %u rows from their stars: %s", n_rows),
                           n_rows, summary->str);
  if (!sl_ledger_append (project, "split", entry, details->str, error)
      || !sl_project_commit (project, error))
    {
      sl_project_rollback (project);
      return FALSE;
    }
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Explain                                                            */

static void
match_info_clear (gpointer data)
{
  SlMatchInfo *info = data;

  g_free (info->status);
  g_free (info->source_name);
  g_free (info->file_name);
  g_free (info->row_designation);
  g_free (info->star);
  g_free (info->candidates);
  g_free (info->reason);
  g_free (info->other_star);
  g_free (info->split_by);
  g_free (info->split_at);
}

void
sl_match_info_clear (SlMatchInfo *info)
{
  match_info_clear (info);
}

GArray *
sl_match_infos_for_star (SlProject *project, gint64 star_id, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "SELECT x.status, src.id, src.name, src.file_name, m.line, x.row_designation, "
                                           "x.separation_arcsec, x.epoch, x.radius_arcsec, x.candidates, x.reason, "
                                           "old.designation, x.split_by, x.split_at, cur.designation "
                                           "FROM matches x JOIN measurements m ON m.id = x.measurement_id "
                                           "JOIN sources src ON src.id = m.source_id "
                                           "JOIN stars cur ON cur.id = m.star_id "
                                           "LEFT JOIN stars old ON old.id = x.split_from "
                                           "WHERE x.measurement_id IN (SELECT id FROM measurements WHERE star_id = ?1 "
                                           "UNION SELECT measurement_id FROM matches WHERE split_from = ?1) "
                                           "ORDER BY src.id, m.line", error);
  GArray *infos;
  int rc;

  if (stmt == NULL)
    return NULL;
  infos = g_array_new (FALSE, TRUE, sizeof (SlMatchInfo));
  g_array_set_clear_func (infos, match_info_clear);
  sqlite3_bind_int64 (stmt, 1, star_id);
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      SlMatchInfo info = { 0 };

      info.status = sl_column_text_dup (stmt, 0);
      info.source_id = sqlite3_column_int64 (stmt, 1);
      sl_column_texts_dup (stmt, 2, &info.source_name, &info.file_name, NULL);
      info.line = (guint) sqlite3_column_int64 (stmt, 4);
      info.row_designation = sl_column_text_dup (stmt, 5);
      info.separation = sl_column_double_or_nan (stmt, 6);
      info.epoch = sl_column_double_or_nan (stmt, 7);
      info.radius = sqlite3_column_double (stmt, 8);
      sl_column_texts_dup (stmt, 9, &info.candidates, &info.reason, &info.other_star,
                           &info.split_by, &info.split_at, &info.star, NULL);
      g_array_append_val (infos, info);
    }
  sqlite3_finalize (stmt);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (project, error, "matches");
      g_array_unref (infos);
      return NULL;
    }
  return infos;
}
