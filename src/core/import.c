/* import.c: CSV file -> source, measurements and rejected rows.
 *
 * Contents:
 *   column mappings ........ sl_column_map_parse, resolve_columns
 *   cell conversion ........ convert_cell
 *   database writes ........ ImportStatements, store_measurement, store_rejection
 *   parsing ahead .......... ParseAhead: records split and converted on a thread
 *   storing a record ....... store_record
 *   the import ............. sl_import_csv (a dry run rolls back at the end)
 *   the preview ............ sl_import_preview
 */
#include "import.h"

#include <errno.h>
#include <fcntl.h>
#include <glib/gi18n.h>
#include <inttypes.h>
#include <glib/gstdio.h>
#include <math.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "csv-reader.h"
#include "ledger.h"
#include "sl-error.h"
#include "util.h"

/* How many rows between progress reports and cancellation checks. */
#define ROWS_PER_CHECK 4096

void
sl_import_options_init (SlImportOptions *options)
{
  memset (options, 0, sizeof *options);
  options->epoch = NAN;
}

/* ------------------------------------------------------------------ */
/* Column mappings                                                    */

gboolean
sl_column_map_parse (const char *spec, SlColumnMap *map, GError **error)
{
  const char *equals = strchr (spec, '=');
  const char *colon;
  g_autofree char *field_name = NULL;

  memset (map, 0, sizeof *map);
  if (equals == NULL || equals == spec || equals[1] == '\0')
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                   _("--map %s: expected FIELD=COLUMN or FIELD=COLUMN:UNIT"), spec);
      return FALSE;
    }
  field_name = g_strndup (spec, equals - spec);
  if (!sl_field_from_name (field_name, &map->field))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                   _("--map %s: '%s' is not a field; see 'starledger-cli import --help'"),
                   spec, field_name);
      return FALSE;
    }

  colon = strrchr (equals + 1, ':');
  if (colon != NULL && colon > equals + 1 && sl_unit_from_name (colon + 1, &map->unit))
    map->column = g_strndup (equals + 1, colon - (equals + 1));
  else
    {
      map->column = g_strdup (equals + 1);
      map->unit = SL_UNIT_NONE;
    }

  if (!sl_field_accepts_unit (map->field, map->unit))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                   _("--map %s: unit %s does not apply to %s (stored in %s)"),
                   spec, sl_unit_name (map->unit), sl_field_info (map->field)->name,
                   sl_unit_name (sl_field_info (map->field)->canonical));
      g_clear_pointer (&map->column, g_free);
      return FALSE;
    }
  return TRUE;
}

void
sl_column_map_clear (SlColumnMap *map)
{
  g_clear_pointer (&map->column, g_free);
}

/* Where each field comes from in this file. */
typedef struct {
  int    column[SL_N_FIELDS];  /* index into the record, or -1 */
  SlUnit unit[SL_N_FIELDS];    /* unit of the column as written */
  guint  n_columns;            /* fields in the header */
  guint  header_line;
} ColumnPlan;

static int
find_header_column (const SlCsvRecord *header, const char *name)
{
  int found = -1;

  for (guint i = 0; i < header->n_fields; i++)
    if (strcmp (header->fields[i], name) == 0)
      return (int) i;
  /* Fall back to a case-insensitive match if it is unique. */
  for (guint i = 0; i < header->n_fields; i++)
    if (g_ascii_strcasecmp (header->fields[i], name) == 0)
      {
        if (found >= 0)
          return -2;
        found = (int) i;
      }
  return found;
}

static gboolean
check_header_unique (const SlCsvRecord *header, int column, const char *file_name,
                     GError **error)
{
  for (guint i = 0; i < header->n_fields; i++)
    if ((int) i != column && strcmp (header->fields[i], header->fields[column]) == 0)
      {
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                     _("%s:%u: the header has two columns named '%s' (columns %d and %u)"),
                     file_name, header->line, header->fields[column],
                     MIN (column, (int) i) + 1, MAX ((guint) column, i) + 1);
        return FALSE;
      }
  return TRUE;
}

static char *
list_header (const SlCsvRecord *header)
{
  GString *names = g_string_new (NULL);

  for (guint i = 0; i < header->n_fields; i++)
    g_string_append_printf (names, "%s'%s'", i ? ", " : "", header->fields[i]);
  return g_string_free (names, FALSE);
}

static gboolean
assign_column (ColumnPlan *plan, SlField field, int column, SlUnit unit,
               const SlCsvRecord *header, const char *file_name, GError **error)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (plan->column[f] == column)
      {
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                     _("%s:%u: column '%s' is mapped to both %s and %s"),
                     file_name, header->line, header->fields[column],
                     sl_field_info (f)->name, sl_field_info (field)->name);
        return FALSE;
      }
  if (!check_header_unique (header, column, file_name, error))
    return FALSE;
  plan->column[field] = column;
  plan->unit[field] = unit == SL_UNIT_NONE ? sl_field_info (field)->canonical : unit;
  return TRUE;
}

/* Explicit mappings first, then (unless explicit_only) header names equal
 * to vocabulary names.  The one mapping rule: the import and the preview
 * both come here.  REPORT, if not NULL, gets the columns left out. */
static gboolean
map_columns (ColumnPlan *plan, const SlCsvRecord *header,
             const SlImportOptions *options, const char *file_name,
             SlImportReport *report, GError **error)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    plan->column[f] = -1;
  plan->n_columns = header->n_fields;
  plan->header_line = header->line;

  for (guint i = 0; i < header->n_fields; i++)
    if (!g_utf8_validate (header->fields[i], -1, NULL))
      {
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                     _("%s:%u: column %u of the header is not valid UTF-8"),
                     file_name, header->line, i + 1);
        return FALSE;
      }

  for (guint m = 0; m < options->n_maps; m++)
    {
      const SlColumnMap *map = &options->maps[m];
      int column = find_header_column (header, map->column);

      if (plan->column[map->field] >= 0)
        {
          g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                       _("--map: %s is mapped twice"), sl_field_info (map->field)->name);
          return FALSE;
        }
      if (column < 0)
        {
          g_autofree char *names = list_header (header);

          g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                       column == -2
                         ? _("%s:%u: several columns are named '%s' in different case; the header has %s")
                         : _("%s:%u: no column named '%s'; the header has %s"),
                       file_name, header->line, map->column, names);
          return FALSE;
        }
      if (!assign_column (plan, map->field, column, map->unit, header, file_name, error))
        return FALSE;
    }

  for (guint i = 0; i < header->n_fields; i++)
    {
      SlField field;
      gboolean used = FALSE;

      for (SlField f = 0; f < SL_N_FIELDS; f++)
        used |= plan->column[f] == (int) i;
      if (used)
        continue;
      if (!options->explicit_only && sl_field_from_name (header->fields[i], &field)
          && plan->column[field] < 0)
        {
          if (!assign_column (plan, field, (int) i, SL_UNIT_NONE, header, file_name, error))
            return FALSE;
        }
      else if (report)
        g_ptr_array_add (report->ignored_columns, g_strdup (header->fields[i]));
    }
  return TRUE;
}

/* Rows join stars by designation: without an id column nothing can be
 * imported. */
static gboolean
require_id_column (const ColumnPlan *plan, const SlCsvRecord *header, const char *file_name,
                   GError **error)
{
  if (plan->column[SL_FIELD_ID] < 0)
    {
      g_autofree char *names = list_header (header);
      const char *other = header->n_fields == 1 ? strpbrk (header->fields[0], ",;\t|") : NULL;

      /* One column whose name holds a separator: the file is split by
       * something else than the reader used. */
      if (other != NULL)
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                     _("%s:%u: the header is one column, %s, holding a %s: is the file "
                       "separated by another delimiter? Name it with --delimiter"),
                     file_name, header->line, names, sl_csv_delimiter_name (*other));
      else
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_MAPPING,
                     _("%s:%u: no id column: no column is named 'id'; name the designation "
                       "column with --map id=COLUMN (the header has %s)"),
                     file_name, header->line, names);
      return FALSE;
    }
  return TRUE;
}

static gboolean
resolve_columns (ColumnPlan *plan, const SlCsvRecord *header,
                 const SlImportOptions *options, const char *file_name,
                 SlImportReport *report, GError **error)
{
  return map_columns (plan, header, options, file_name, report, error)
         && require_id_column (plan, header, file_name, error);
}

/* The mapping as recorded with the source: JSON [{field, column, unit}]. */
static char *
mapping_json (const ColumnPlan *plan, const SlCsvRecord *header)
{
  GString *json = g_string_new ("[");
  gboolean first = TRUE;

  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      if (plan->column[f] < 0)
        continue;
      g_string_append (json, first ? "{\"field\":" : ",{\"field\":");
      sl_json_append_string (json, sl_field_info (f)->name);
      g_string_append (json, ",\"column\":");
      sl_json_append_string (json, header->fields[plan->column[f]]);
      g_string_append (json, ",\"unit\":");
      sl_json_append_string (json, sl_unit_name (plan->unit[f]));
      g_string_append_c (json, '}');
      first = FALSE;
    }
  g_string_append_c (json, ']');
  return g_string_free (json, FALSE);
}

static char *
missing_json (const SlImportOptions *options)
{
  GString *json = g_string_new ("[\"\",\"NaN\"");

  for (guint i = 0; options->missing && options->missing[i]; i++)
    {
      g_string_append_c (json, ',');
      sl_json_append_string (json, options->missing[i]);
    }
  g_string_append_c (json, ']');
  return g_string_free (json, FALSE);
}

/* ------------------------------------------------------------------ */
/* Cell conversion                                                    */

/* One row's values on their way to the database. */
typedef struct {
  gboolean    present[SL_N_FIELDS];
  double      number[SL_N_FIELDS];   /* canonical units */
  const char *text[SL_N_FIELDS];     /* for id and sptype; points into the record */
} RowValues;

static gboolean
is_missing (const char *cell, const char *const *missing)
{
  if (*cell == '\0' || g_ascii_strcasecmp (cell, "nan") == 0)
    return TRUE;
  for (guint i = 0; missing && missing[i]; i++)
    if (strcmp (cell, missing[i]) == 0)
      return TRUE;
  return FALSE;
}

/* Converts one cell into ROW; on failure sets *REASON (newly allocated). */
static gboolean
convert_cell (SlField field, SlUnit unit, char *cell, const char *const *missing,
              RowValues *row, char **reason)
{
  const SlFieldInfo *info = sl_field_info (field);
  const char *problem = NULL;
  double value;

  g_strstrip (cell);
  if (is_missing (cell, missing))
    {
      if (field == SL_FIELD_ID)
        {
          *reason = g_strdup (_("the id is empty"));
          return FALSE;
        }
      return TRUE;
    }

  if (info->kind == SL_FIELD_KIND_IDENTIFIER || info->kind == SL_FIELD_KIND_TEXT)
    {
      if (!g_utf8_validate (cell, -1, NULL))
        {
          *reason = g_strdup (_("not valid UTF-8 text"));
          return FALSE;
        }
      row->text[field] = cell;
      row->present[field] = TRUE;
      return TRUE;
    }

  if (sl_unit_is_sexagesimal (unit))
    {
      if (!sl_parse_sexagesimal (cell, unit == SL_UNIT_HMS, &value, &problem))
        {
          *reason = g_strdup_printf ("%s: '%s'", _(problem), cell);
          return FALSE;
        }
    }
  else if (!sl_parse_number (cell, &value, &problem))
    {
      if (g_utf8_validate (cell, -1, NULL))
        *reason = g_strdup_printf ("%s: '%s'", _(problem), cell);
      else
        *reason = g_strdup (_(problem));
      return FALSE;
    }

  value *= sl_unit_factor (unit, info->canonical);
  if (!sl_field_check_value (field, value, reason))
    return FALSE;

  row->number[field] = value;
  row->present[field] = TRUE;
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Database writes                                                    */

typedef struct {
  sqlite3_stmt *find_star;
  sqlite3_stmt *insert_star;
  sqlite3_stmt *insert_measurement;
  sqlite3_stmt *insert_rejection;
  sqlite3_stmt *first_line;
} ImportStatements;

static void
finalize_statements (ImportStatements *st)
{
  sqlite3_finalize (st->find_star);
  sqlite3_finalize (st->insert_star);
  sqlite3_finalize (st->insert_measurement);
  sqlite3_finalize (st->insert_rejection);
  sqlite3_finalize (st->first_line);
  memset (st, 0, sizeof *st);
}

static char *
measurement_insert_sql (void)
{
  GString *sql = g_string_new ("INSERT INTO measurements (star_id, source_id, line");
  GString *params = g_string_new ("?, ?, ?");

  for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
    {
      g_string_append_printf (sql, ", %s", sl_field_info (f)->name);
      g_string_append (params, ", ?");
    }
  g_string_append_printf (sql, ") VALUES (%s)", params->str);
  g_string_free (params, TRUE);
  return g_string_free (sql, FALSE);
}

static gboolean
prepare_statements (SlProject *project, ImportStatements *st, GError **error)
{
  g_autofree char *insert_sql = measurement_insert_sql ();

  st->find_star = sl_project_prepare (project, "SELECT id FROM stars WHERE designation = ?", error);
  if (st->find_star)
    st->insert_star = sl_project_prepare (project,
                                          "INSERT INTO stars (designation, first_source_id) VALUES (?, ?) "
                                          "ON CONFLICT (designation) DO NOTHING",
                                          error);
  if (st->insert_star)
    st->insert_measurement = sl_project_prepare (project, insert_sql, error);
  if (st->insert_measurement)
    st->insert_rejection = sl_project_prepare (project,
                                               "INSERT INTO rejected_rows (source_id, line, column_name, reason, raw) "
                                               "VALUES (?, ?, ?, ?, ?)", error);
  if (st->insert_rejection)
    st->first_line = sl_project_prepare (project,
                                         "SELECT line FROM measurements WHERE star_id = ?2 AND source_id = ?1",
                                         error);
  if (st->first_line == NULL)
    {
      finalize_statements (st);
      return FALSE;
    }
  return TRUE;
}

/* Finds or creates the star; returns its id, or 0 on a database error.
 * Trying the insert first costs one statement for a new star, the usual
 * case of a first import. */
static gint64
star_for_designation (ImportStatements *st, const char *designation, gint64 source_id,
                      guint64 *new_stars)
{
  sqlite3 *db = sqlite3_db_handle (st->insert_star);
  gint64 star_id = 0;
  int rc;

  sqlite3_bind_text (st->insert_star, 1, designation, -1, SQLITE_STATIC);
  sqlite3_bind_int64 (st->insert_star, 2, source_id);
  rc = sqlite3_step (st->insert_star);
  sqlite3_reset (st->insert_star);
  if (rc != SQLITE_DONE)
    return 0;
  if (sqlite3_changes (db) == 1)
    {
      (*new_stars)++;
      return sqlite3_last_insert_rowid (db);
    }

  sqlite3_bind_text (st->find_star, 1, designation, -1, SQLITE_STATIC);
  if (sqlite3_step (st->find_star) == SQLITE_ROW)
    star_id = sqlite3_column_int64 (st->find_star, 0);
  sqlite3_reset (st->find_star);
  return star_id;
}

/* Returns SQLITE_DONE, SQLITE_CONSTRAINT (the star already has a row from
 * this source) or another SQLite error code. */
static int
store_measurement (ImportStatements *st, gint64 star_id, gint64 source_id, guint line,
                   const RowValues *row)
{
  sqlite3_stmt *stmt = st->insert_measurement;
  int rc;

  sqlite3_bind_int64 (stmt, 1, star_id);
  sqlite3_bind_int64 (stmt, 2, source_id);
  sqlite3_bind_int64 (stmt, 3, line);
  for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
    {
      int index = 4 + (f - (SL_FIELD_ID + 1));

      if (!row->present[f])
        sqlite3_bind_null (stmt, index);
      else if (sl_field_info (f)->kind == SL_FIELD_KIND_TEXT)
        sqlite3_bind_text (stmt, index, row->text[f], -1, SQLITE_STATIC);
      else
        sqlite3_bind_double (stmt, index, row->number[f]);
    }
  rc = sqlite3_step (stmt) & 0xff;   /* the primary code of an extended one */
  sqlite3_reset (stmt);
  return rc;
}

static guint
first_line_of (ImportStatements *st, gint64 source_id, gint64 star_id)
{
  guint line = 0;

  sqlite3_bind_int64 (st->first_line, 1, source_id);
  sqlite3_bind_int64 (st->first_line, 2, star_id);
  if (sqlite3_step (st->first_line) == SQLITE_ROW)
    line = (guint) sqlite3_column_int64 (st->first_line, 0);
  sqlite3_reset (st->first_line);
  return line;
}

static gboolean
store_rejection (ImportStatements *st, gint64 source_id, const SlCsvRecord *record,
                 const char *column, char *reason, SlImportReport *report)
{
  SlRejection rejection = { record->line, g_strdup (column), reason };
  int rc;

  g_array_append_val (report->rejections, rejection);

  sqlite3_bind_int64 (st->insert_rejection, 1, source_id);
  sqlite3_bind_int64 (st->insert_rejection, 2, record->line);
  if (column)
    sqlite3_bind_text (st->insert_rejection, 3, column, -1, SQLITE_STATIC);
  else
    sqlite3_bind_null (st->insert_rejection, 3);
  sqlite3_bind_text (st->insert_rejection, 4, reason, -1, SQLITE_STATIC);
  sqlite3_bind_blob (st->insert_rejection, 5, record->raw, (int) record->raw_len, SQLITE_STATIC);
  rc = sqlite3_step (st->insert_rejection);
  sqlite3_reset (st->insert_rejection);
  sqlite3_clear_bindings (st->insert_rejection);
  return rc == SQLITE_DONE;
}

/* ------------------------------------------------------------------ */
/* The import                                                         */

/* Everything one import carries from row to row. */
typedef struct {
  SlProject             *project;
  const SlImportOptions *options;
  SlImportReport        *report;
  ColumnPlan             plan;
  ImportStatements       st;
  const SlCsvRecord     *header;
  SlRowMatcher          *matcher;   /* with --match-radius: rows join stars by position */
  guint64                parallax_rows;        /* rows with a parallax and its error */
  guint64                parallax_small_rows;  /* ... of which both look like arcseconds */
} Import;

/* The hook that decides which star a row belongs to: by its id, or with
 * a match radius by position (matching.h).  Returns the star's id, 0 on a
 * database error, or -1 when the row cannot be matched (*REASON says
 * why). */
static gint64
star_for_row (Import *im, const RowValues *row, guint line, char **reason, GError **error)
{
  SlAstrometry a;
  gint64 star_id;

  if (im->matcher == NULL)
    {
      star_id = star_for_designation (&im->st, row->text[SL_FIELD_ID], im->report->source_id,
                                      &im->report->new_stars);
      if (star_id == 0)
        sl_project_set_db_error (im->project, error, "stars");
      return star_id;
    }
  a.ra = row->present[SL_FIELD_RA] ? row->number[SL_FIELD_RA] : NAN;
  a.dec = row->present[SL_FIELD_DEC] ? row->number[SL_FIELD_DEC] : NAN;
  a.pmra = row->present[SL_FIELD_PMRA] ? row->number[SL_FIELD_PMRA] : NAN;
  a.pmdec = row->present[SL_FIELD_PMDEC] ? row->number[SL_FIELD_PMDEC] : NAN;
  a.parallax = row->present[SL_FIELD_PARALLAX] ? row->number[SL_FIELD_PARALLAX] : NAN;
  a.vrad = row->present[SL_FIELD_VRAD] ? row->number[SL_FIELD_VRAD] : NAN;
  a.epoch = row->present[SL_FIELD_EPOCH] ? row->number[SL_FIELD_EPOCH] : NAN;
  return sl_row_matcher_find (im->matcher, row->text[SL_FIELD_ID], &a, line,
                              &im->report->new_stars, reason, error);
}

/* Starts matching by position once the source exists. */
static gboolean
start_matcher (Import *im, GError **error)
{
  if (im->options->match_radius > 0.0)
    im->matcher = sl_row_matcher_new (im->project, im->report->source_id,
                                      im->options->match_radius, im->options->epoch);
  return TRUE;
}

/* Copies the matcher's outcome into the report, before the ledger entry. */
static gboolean
finish_matcher (Import *im, GError **error)
{
  SlImportReport *report = im->report;
  GArray *ambiguous;

  if (im->matcher == NULL)
    return TRUE;
  ambiguous = sl_row_matcher_ambiguous (im->matcher);
  report->matched = sl_row_matcher_matched (im->matcher);
  report->match_epoch = sl_row_matcher_epoch (im->matcher);
  for (guint i = 0; i < ambiguous->len; i++)
    {
      SlAmbiguousRow *a = &g_array_index (ambiguous, SlAmbiguousRow, i);
      SlAmbiguousRow copy = { a->line, g_strdup (a->designation), g_strdup (a->explanation) };

      g_array_append_val (report->ambiguous, copy);
    }
  if (sl_row_matcher_renamed (im->matcher) > 0)
    g_ptr_array_add (report->notes,
                     g_strdup_printf (_("%" PRIu64 " new stars were named with the source's "
                                        "number because their id is taken by another star"),
                                      sl_row_matcher_renamed (im->matcher)));
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Parsing ahead                                                      */

/* One data record split and converted, everything the database side
 * needs of it: a thread of its own parses the records ahead of the one
 * that writes them, and the two halves of an import take about as long. */
typedef struct {
  guint       line;
  const char *raw;          /* in the file's data, which outlives the import */
  gsize       raw_len;
  const char *malformed;    /* as SlCsvRecord */
  gboolean    too_long;
  guint       n_fields;
  RowValues   row;          /* texts in the chunk's strings */
  int         bad_column;   /* the column of the first cell refused, or -1 */
  char       *reason;       /* why it was refused (owned until stored) */
  gsize       offset;       /* how far the reader had got, for progress */
} ParsedRecord;

#define PARSED_PER_CHUNK 512
#define PARSE_CHUNKS     4

typedef struct {
  ParsedRecord  records[PARSED_PER_CHUNK];
  guint         n;
  GStringChunk *strings;
  gboolean      last;       /* no chunk follows */
} ParsedChunk;

typedef struct {
  SlCsvReader           *reader;
  const ColumnPlan      *plan;
  const char *const     *missing;
  GThread               *thread;
  GPtrArray             *chunks;    /* every ParsedChunk, for freeing */
  GAsyncQueue           *empty;
  GAsyncQueue           *full;
  ParsedChunk           *current;
  guint                  next;
  gint                   stop;      /* atomic: the writer is done */
} ParseAhead;

/* Pushed to wake the parsing thread when it must stop. */
static ParsedChunk parse_wake_up;

/* Splits and converts RECORD into P; the conversion stops at the first
 * cell refused. */
static void
parse_record (const ColumnPlan *plan, const char *const *missing, SlCsvRecord *record,
              GStringChunk *strings, ParsedRecord *p)
{
  p->line = record->line;
  p->raw = record->raw;
  p->raw_len = record->raw_len;
  p->malformed = record->malformed;
  p->too_long = record->too_long;
  p->n_fields = record->n_fields;
  p->bad_column = -1;
  p->reason = NULL;
  memset (p->row.present, 0, sizeof p->row.present);
  if (record->too_long || record->malformed || record->n_fields != plan->n_columns)
    return;
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      int column = plan->column[f];

      if (column < 0)
        continue;
      if (!convert_cell (f, plan->unit[f], record->fields[column], missing, &p->row, &p->reason))
        {
          p->bad_column = column;
          return;
        }
      /* The record's texts last until the reader's next record. */
      if (p->row.present[f] && (sl_field_info (f)->kind == SL_FIELD_KIND_IDENTIFIER
                                 || sl_field_info (f)->kind == SL_FIELD_KIND_TEXT))
        p->row.text[f] = g_string_chunk_insert (strings, p->row.text[f]);
    }
}

static gpointer
parse_ahead_thread (gpointer data)
{
  ParseAhead *ahead = data;
  gboolean last = FALSE;

  while (!last)
    {
      ParsedChunk *chunk = g_async_queue_pop (ahead->empty);

      if (g_atomic_int_get (&ahead->stop))
        break;
      chunk->n = 0;
      g_string_chunk_clear (chunk->strings);
      while (chunk->n < PARSED_PER_CHUNK && !g_atomic_int_get (&ahead->stop))
        {
          ParsedRecord *p = &chunk->records[chunk->n];
          SlCsvRecord record;

          if (!sl_csv_reader_next (ahead->reader, &record))
            {
              chunk->last = TRUE;
              break;
            }
          parse_record (ahead->plan, ahead->missing, &record, chunk->strings, p);
          p->offset = sl_csv_reader_get_offset (ahead->reader);
          chunk->n++;
          if (record.too_long)   /* the import stops there */
            {
              chunk->last = TRUE;
              break;
            }
        }
      last = chunk->last;
      g_async_queue_push (ahead->full, chunk);
    }
  return NULL;
}

static void
parse_ahead_start (ParseAhead *ahead, SlCsvReader *reader, const ColumnPlan *plan,
                   const char *const *missing)
{
  memset (ahead, 0, sizeof *ahead);
  ahead->reader = reader;
  ahead->plan = plan;
  ahead->missing = missing;
  ahead->chunks = g_ptr_array_new ();
  ahead->empty = g_async_queue_new ();
  ahead->full = g_async_queue_new ();
  for (int i = 0; i < PARSE_CHUNKS; i++)
    {
      ParsedChunk *chunk = g_new0 (ParsedChunk, 1);

      chunk->strings = g_string_chunk_new (4096);
      g_ptr_array_add (ahead->chunks, chunk);
      g_async_queue_push (ahead->empty, chunk);
    }
  /* From here on only the thread uses the reader, until it is joined. */
  ahead->thread = g_thread_new ("sl-parse-ahead", parse_ahead_thread, ahead);
}

/* The next record parsed, NULL at the end.  Valid until the next call. */
static ParsedRecord *
parse_ahead_next (ParseAhead *ahead)
{
  for (;;)
    {
      ParsedChunk *chunk = ahead->current;

      if (chunk != NULL && ahead->next < chunk->n)
        return &chunk->records[ahead->next++];
      if (chunk != NULL && chunk->last)
        return NULL;
      if (chunk != NULL)
        g_async_queue_push (ahead->empty, chunk);
      ahead->current = g_async_queue_pop (ahead->full);
      ahead->next = 0;
    }
}

static void
parse_ahead_stop (ParseAhead *ahead)
{
  g_atomic_int_set (&ahead->stop, 1);
  g_async_queue_push (ahead->empty, &parse_wake_up);
  g_thread_join (ahead->thread);
  for (guint i = 0; i < ahead->chunks->len; i++)
    {
      ParsedChunk *chunk = g_ptr_array_index (ahead->chunks, i);

      /* Reasons of records parsed but never stored. */
      for (guint r = 0; r < chunk->n; r++)
        g_free (chunk->records[r].reason);
      g_string_chunk_free (chunk->strings);
      g_free (chunk);
    }
  g_ptr_array_unref (ahead->chunks);
  g_async_queue_unref (ahead->empty);
  g_async_queue_unref (ahead->full);
}

/* Stores one parsed data record; FALSE only on a database error. */
static gboolean
store_record (Import *im, ParsedRecord *p, GError **error)
{
  SlImportReport *report = im->report;
  const ColumnPlan *plan = &im->plan;
  SlCsvRecord record = { .line = p->line, .raw = p->raw, .raw_len = p->raw_len };
  RowValues *row = &p->row;
  gint64 star_id;
  int rc;

  report->rows_read++;

  if (p->malformed)
    return store_rejection (&im->st, report->source_id, &record, NULL,
                            g_strdup (_(p->malformed)), report)
           || (sl_project_set_db_error (im->project, error, "rejected_rows"), FALSE);

  if (p->n_fields != plan->n_columns)
    return store_rejection (&im->st, report->source_id, &record, NULL,
                            g_strdup_printf (_("the row has %u fields, the header has %u"),
                                             p->n_fields, plan->n_columns),
                            report)
           || (sl_project_set_db_error (im->project, error, "rejected_rows"), FALSE);

  if (p->bad_column >= 0)
    return store_rejection (&im->st, report->source_id, &record,
                            im->header->fields[p->bad_column], g_steal_pointer (&p->reason), report)
           || (sl_project_set_db_error (im->project, error, "rejected_rows"), FALSE);

  /* A parallax below 1 with an error below 0.01 is a fine measurement
   * in arcseconds and an impossible one in mas (no survey measures to
   * 10 microarcseconds): counted for unit_warnings. */
  if (row->present[SL_FIELD_PARALLAX] && row->present[SL_FIELD_PARALLAX_ERR])
    {
      im->parallax_rows++;
      if (fabs (row->number[SL_FIELD_PARALLAX]) < 1.0 && row->number[SL_FIELD_PARALLAX_ERR] < 0.01)
        im->parallax_small_rows++;
    }

  if (!row->present[SL_FIELD_EPOCH] && isfinite (im->options->epoch))
    {
      row->number[SL_FIELD_EPOCH] = im->options->epoch;
      row->present[SL_FIELD_EPOCH] = TRUE;
    }

  {
    char *reason = NULL;

    star_id = star_for_row (im, row, p->line, &reason, error);
    if (star_id < 0)
      return store_rejection (&im->st, report->source_id, &record, NULL, reason, report)
             || (sl_project_set_db_error (im->project, error, "rejected_rows"), FALSE);
    if (star_id == 0)
      return FALSE;
  }

  rc = store_measurement (&im->st, star_id, report->source_id, p->line, row);
  if (rc == SQLITE_CONSTRAINT)
    return store_rejection (&im->st, report->source_id, &record,
                            im->header->fields[plan->column[SL_FIELD_ID]],
                            g_strdup_printf (_("id '%s' appears twice in this file (first on line %u)"),
                                             row->text[SL_FIELD_ID],
                                             first_line_of (&im->st, report->source_id, star_id)),
                            report)
           || (sl_project_set_db_error (im->project, error, "rejected_rows"), FALSE);
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (im->project, error, "measurements");
      return FALSE;
    }
  if (im->matcher
      && !sl_row_matcher_record (im->matcher, sqlite3_last_insert_rowid (sl_project_db (im->project)), error))
    return FALSE;
  report->rows_accepted++;
  return TRUE;
}

static char *
compute_sha256 (const char *data, gsize length)
{
  return g_compute_checksum_for_data (G_CHECKSUM_SHA256, (const guchar *) data, length);
}

/* Refuses a file already imported, unless --again. */
static gboolean
check_not_imported (SlProject *project, const char *sha256, const char *file_name,
                    gboolean again, SlImportReport *report, GError **error)
{
  sqlite3_stmt *stmt = sl_project_prepare (project,
                                           "SELECT id, file_name, imported_at FROM sources "
                                           "WHERE sha256 = ? ORDER BY id LIMIT 1", error);
  gboolean ok = TRUE;

  if (stmt == NULL)
    return FALSE;
  sqlite3_bind_text (stmt, 1, sha256, -1, SQLITE_STATIC);
  if (sqlite3_step (stmt) == SQLITE_ROW)
    {
      const char *earlier = (const char *) sqlite3_column_text (stmt, 1);
      const char *when = (const char *) sqlite3_column_text (stmt, 2);
      gint64 id = sqlite3_column_int64 (stmt, 0);

      if (again)
        g_ptr_array_add (report->notes,
                         g_strdup_printf (_("the same file (SHA-256) was imported before as source %"
                                            PRId64 " (%s, %s); imported again as asked"),
                                          id, earlier, when));
      else
        {
          g_set_error (error, SL_ERROR, SL_ERROR_ALREADY_IMPORTED,
                       _("%s: this file (same SHA-256) was already imported as source %"
                         PRId64 " (%s, %s); use --again to import it again"),
                       file_name, id, earlier, when);
          ok = FALSE;
        }
    }
  sqlite3_finalize (stmt);
  return ok;
}

static gint64
insert_source (SlProject *project, const char *path, const char *file_name,
               const SlImportOptions *options, const SlImportReport *report,
               const char *mapping, gsize size, GError **error)
{
  g_autofree char *now = sl_now_utc ();
  g_autofree char *missing = missing_json (options);
  char delimiter[2] = { report->delimiter, '\0' };
  sqlite3_stmt *stmt;
  gint64 id = 0;

  stmt = sl_project_prepare (project,
                             "INSERT INTO sources (name, file_name, file_path, sha256, size_bytes, "
                             "imported_by, imported_at, delimiter, mapping, missing_tokens, epoch) "
                             "VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)", error);
  if (stmt == NULL)
    return 0;
  sqlite3_bind_text (stmt, 1, options->source_name ? options->source_name : file_name, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 2, file_name, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 3, path, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 4, report->sha256, -1, SQLITE_STATIC);
  sqlite3_bind_int64 (stmt, 5, (gint64) size);
  sqlite3_bind_text (stmt, 6, sl_current_user (), -1, SQLITE_TRANSIENT);
  sqlite3_bind_text (stmt, 7, now, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 8, delimiter, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 9, mapping, -1, SQLITE_STATIC);
  sqlite3_bind_text (stmt, 10, missing, -1, SQLITE_STATIC);
  if (isfinite (options->epoch))
    sqlite3_bind_double (stmt, 11, options->epoch);
  else
    sqlite3_bind_null (stmt, 11);
  if (sqlite3_step (stmt) == SQLITE_DONE)
    id = sqlite3_last_insert_rowid (sl_project_db (project));
  else
    sl_project_set_db_error (project, error, "sources");
  sqlite3_finalize (stmt);
  return id;
}

static gboolean
finish_source (Import *im, GError **error)
{
  SlImportReport *report = im->report;
  sqlite3_stmt *stmt;
  g_autofree char *summary = NULL;
  GString *details = g_string_new (NULL);
  gboolean ok;

  stmt = sl_project_prepare (im->project,
                             "UPDATE sources SET rows_read = ?, rows_accepted = ?, rows_rejected = ? "
                             "WHERE id = ?", error);
  if (stmt == NULL)
    {
      g_string_free (details, TRUE);
      return FALSE;
    }
  sqlite3_bind_int64 (stmt, 1, (gint64) report->rows_read);
  sqlite3_bind_int64 (stmt, 2, (gint64) report->rows_accepted);
  sqlite3_bind_int64 (stmt, 3, (gint64) report->rejections->len);
  sqlite3_bind_int64 (stmt, 4, report->source_id);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  sqlite3_finalize (stmt);
  if (!ok)
    {
      sl_project_set_db_error (im->project, error, "sources");
      g_string_free (details, TRUE);
      return FALSE;
    }

  /* Stars that gained a measurement must be derived again. */
  stmt = sl_project_prepare (im->project,
                             "UPDATE derived SET stale = 1 WHERE star_id IN "
                             "(SELECT star_id FROM measurements WHERE source_id = ?)", error);
  if (stmt == NULL)
    {
      g_string_free (details, TRUE);
      return FALSE;
    }
  sqlite3_bind_int64 (stmt, 1, report->source_id);
  ok = sqlite3_step (stmt) == SQLITE_DONE;
  sqlite3_finalize (stmt);
  if (!ok)
    {
      sl_project_set_db_error (im->project, error, "derived");
      g_string_free (details, TRUE);
      return FALSE;
    }

  {
    /* Each count in its own plural form; numbers formatted first, since
     * gettext cannot carry the 64-bit format macros. */
    g_autofree char *n_accepted = g_strdup_printf ("%" G_GUINT64_FORMAT, report->rows_accepted);
    g_autofree char *n_new = g_strdup_printf ("%" G_GUINT64_FORMAT, report->new_stars);
    g_autofree char *accepted = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%s row accepted", "%s rows accepted",
                                                              report->rows_accepted), n_accepted);
    g_autofree char *new_stars = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%s new star", "%s new stars",
                                                               report->new_stars), n_new);

    summary = g_strdup_printf (_("imported %s: %s, %u rejected, %s"), report->file_name, accepted,
                               report->rejections->len, new_stars);
    if (im->matcher)
      {
        g_autofree char *n_matched = g_strdup_printf ("%" G_GUINT64_FORMAT, report->matched);
        char *with_matches = g_strdup_printf (_("%s, %s matched by position, %u ambiguous"), summary,
                                              n_matched, report->ambiguous->len);

        g_free (summary);
        summary = with_matches;
      }
  }
  g_string_append_printf (details, "{\"source_id\":%" G_GINT64_FORMAT ",\"file\":", report->source_id);
  sl_json_append_string (details, report->file_name);
  g_string_append (details, ",\"sha256\":");
  sl_json_append_string (details, report->sha256);
  g_string_append_printf (details, ",\"rows_read\":%" G_GUINT64_FORMAT ",\"accepted\":%" G_GUINT64_FORMAT
                          ",\"rejected\":%u,\"new_stars\":%" G_GUINT64_FORMAT "}",
                          report->rows_read, report->rows_accepted, report->rejections->len,
                          report->new_stars);
  if (im->matcher)
    {
      g_string_truncate (details, details->len - 1);
      g_string_append (details, ",\"match_radius_arcsec\":");
      sl_json_append_number (details, im->options->match_radius);
      g_string_append (details, ",\"match_epoch\":");
      sl_json_append_number (details, report->match_epoch);
      g_string_append_printf (details, ",\"matched\":%" G_GUINT64_FORMAT ",\"ambiguous\":%u}",
                              report->matched, report->ambiguous->len);
    }
  ok = sl_ledger_append (im->project, "import", summary, details->str, error);
  g_string_free (details, TRUE);
  return ok;
}

static void
rejection_clear (gpointer data)
{
  SlRejection *rejection = data;

  g_free (rejection->column);
  g_free (rejection->reason);
}

static void
ambiguous_row_clear (gpointer data)
{
  SlAmbiguousRow *row = data;

  g_free (row->designation);
  g_free (row->explanation);
}

static SlImportReport *
report_new (const char *file_name)
{
  SlImportReport *report = g_new0 (SlImportReport, 1);

  report->file_name = g_strdup (file_name);
  report->rejections = g_array_new (FALSE, FALSE, sizeof (SlRejection));
  g_array_set_clear_func (report->rejections, rejection_clear);
  report->ignored_columns = g_ptr_array_new_with_free_func (g_free);
  report->notes = g_ptr_array_new_with_free_func (g_free);
  report->ambiguous = g_array_new (FALSE, FALSE, sizeof (SlAmbiguousRow));
  g_array_set_clear_func (report->ambiguous, ambiguous_row_clear);
  report->match_epoch = NAN;
  report->warnings = g_ptr_array_new_with_free_func (g_free);
  return report;
}

void
sl_import_report_free (SlImportReport *report)
{
  if (report == NULL)
    return;
  g_free (report->file_name);
  g_free (report->sha256);
  g_array_unref (report->rejections);
  g_ptr_array_unref (report->ignored_columns);
  g_ptr_array_unref (report->notes);
  g_array_unref (report->ambiguous);
  g_ptr_array_unref (report->warnings);
  g_free (report);
}

/* Values that are all valid but look like another unit than the one the
 * column was read in: a warning, not a rejection (the numbers may be
 * right, and only the user knows). */
static void
unit_warnings (const Import *im)
{
  if (im->plan.unit[SL_FIELD_PARALLAX] == SL_UNIT_MAS && im->parallax_rows > 0
      && im->parallax_small_rows == im->parallax_rows)
    {
      g_autofree char *count = g_strdup_printf ("%" G_GUINT64_FORMAT, im->parallax_rows);

      g_ptr_array_add (im->report->warnings,
                       g_strdup_printf (_("%s: column '%s' was read as parallax in mas, but all %s "
                                          "values are below 1 with errors below 0.01: they look like "
                                          "arcseconds; if they are, read columns '%s' and '%s' in arcsec"),
                                        im->report->file_name,
                                        im->header->fields[im->plan.column[SL_FIELD_PARALLAX]], count,
                                        im->header->fields[im->plan.column[SL_FIELD_PARALLAX]],
                                        im->header->fields[im->plan.column[SL_FIELD_PARALLAX_ERR]]));
    }
}

static void
note_missing_epoch (const ColumnPlan *plan, const SlImportOptions *options,
                    SlImportReport *report)
{
  if (plan->column[SL_FIELD_RA] >= 0 && plan->column[SL_FIELD_EPOCH] < 0
      && !isfinite (options->epoch))
    g_ptr_array_add (report->notes,
                     g_strdup (_("the positions have no epoch (no epoch column and no --epoch); "
                                 "they cannot be moved to another epoch")));
}

/* Reads records to the end, storing each; FALSE on a database error or a
 * cancel.  The records are parsed on a thread of their own. */
static gboolean
import_records (Import *im, SlCsvReader *reader, gsize length, GError **error)
{
  ParseAhead ahead;
  ParsedRecord *p;
  guint64 count = 0;
  gboolean ok = TRUE;

  parse_ahead_start (&ahead, reader, &im->plan, im->options->missing);
  while (ok && (p = parse_ahead_next (&ahead)) != NULL)
    {
      if (p->too_long)
        {
          g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                       _("%s:%u: line longer than %d MiB; not a table of measurements"),
                       im->report->file_name, p->line, SL_CSV_MAX_RECORD_MIB);
          ok = FALSE;
        }
      else if (!store_record (im, p, error))
        ok = FALSE;
      else if (++count % ROWS_PER_CHECK == 0)
        {
          if (g_cancellable_set_error_if_cancelled (im->options->cancellable, error))
            ok = FALSE;
          else if (im->options->progress)
            im->options->progress ((double) p->offset / length, im->options->progress_data);
        }
    }
  parse_ahead_stop (&ahead);
  return ok;
}

static gboolean
fail_if_nothing_accepted (Import *im, GError **error)
{
  SlImportReport *report = im->report;
  const SlRejection *first;

  if (report->rows_accepted > 0)
    return TRUE;
  if (report->rows_read == 0)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_NOTHING_ACCEPTED,
                   _("%s: no data rows after the header (line %u)"),
                   report->file_name, im->plan.header_line);
      return FALSE;
    }
  first = &g_array_index (report->rejections, SlRejection, 0);
  g_set_error (error, SL_ERROR, SL_ERROR_NOTHING_ACCEPTED,
               _("%s: no row could be imported; all %" PRIu64 " were rejected, "
                 "the first at line %u: %s%s%s"),
               report->file_name, report->rows_read, first->line,
               first->column ? first->column : "", first->column ? ": " : "", first->reason);
  return FALSE;
}

/* What fstat says of an input file, to see whether it changed. */
typedef struct {
  gint64 size;
  gint64 mtime_s, mtime_ns;
  gint64 ctime_s, ctime_ns;
} FileStamp;

static void
stamp_file (int fd, FileStamp *stamp)
{
  struct stat st;

  memset (stamp, 0, sizeof *stamp);
  if (fstat (fd, &st) == 0)
    {
      stamp->size = st.st_size;
      stamp->mtime_s = st.st_mtim.tv_sec;
      stamp->mtime_ns = st.st_mtim.tv_nsec;
      stamp->ctime_s = st.st_ctim.tv_sec;
      stamp->ctime_ns = st.st_ctim.tv_nsec;
    }
}

static void
set_changed_error (const char *file_name, GError **error)
{
  g_set_error (error, SL_ERROR, SL_ERROR_IO,
               _("%s: the file changed while it was read (another program is writing to it); "
                 "nothing was imported: import it again once it is complete"),
               file_name);
}

/* A file another program writes while we import it is not complete yet:
 * checked before the commit, so such an import writes nothing. */
static gboolean
check_unchanged (int fd, const FileStamp *before, const char *file_name, GError **error)
{
  FileStamp after;

  stamp_file (fd, &after);
  if (memcmp (&after, before, sizeof after) != 0)
    {
      set_changed_error (file_name, error);
      return FALSE;
    }
  return TRUE;
}

/* The whole file, read once from FD into memory: the bytes hashed are the
 * bytes parsed.  Not mapped: a mapped file that another program truncates
 * ends the process with SIGBUS.  EXPECTED is its size when the import
 * began; fewer or more bytes mean it changed while being read. */
static char *
read_whole_file (int fd, gint64 expected, const char *path, const char *file_name, gsize *length,
                 GError **error)
{
  g_autofree char *data = NULL;
  gsize got = 0;
  char extra;

  if (expected < 0 || (guint64) expected >= G_MAXSIZE)
    {
      set_changed_error (file_name, error);
      return NULL;
    }
  data = g_malloc ((gsize) expected + 1);
  if (lseek (fd, 0, SEEK_SET) != 0)
    goto io_error;
  while (got < (gsize) expected)
    {
      ssize_t n = read (fd, data + got, (gsize) expected - got);

      if (n < 0 && errno == EINTR)
        continue;
      if (n < 0)
        goto io_error;
      if (n == 0)
        break;
      got += (gsize) n;
    }
  if (got != (gsize) expected || read (fd, &extra, 1) > 0)
    {
      set_changed_error (file_name, error);
      return NULL;
    }
  data[got] = '\0';
  *length = got;
  return g_steal_pointer (&data);

io_error:
  g_set_error (error, SL_ERROR, SL_ERROR_IO, _("%s: cannot read: %s"), path, g_strerror (errno));
  return NULL;
}

/* Commits, or for a dry run rolls back what was done in the transaction. */
static gboolean
end_import (SlProject *project, const SlImportOptions *options, GError **error)
{
  if (!options->dry_run)
    return sl_project_commit (project, error);
  sl_project_rollback (project);
  return TRUE;
}

/* The import of the open file FD (at PATH), as it was when STAMP was taken. */
static SlImportReport *
import_file (SlProject *project, const char *path, int fd, const FileStamp *stamp,
             const SlImportOptions *options, GError **error)
{
  g_autofree char *data = NULL;   /* first: the reader below borrows it */
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (SlCsvReader) reader = NULL;
  g_autofree char *file_name = NULL;
  g_autofree char *mapping = NULL;
  SlCsvRecord header;
  gsize length = 0;
  Import im = { project, options, NULL, .matcher = NULL };

  file_name = g_path_get_basename (path);
  data = read_whole_file (fd, stamp->size, path, file_name, &length, error);
  if (data == NULL)
    return NULL;
  if (length == 0)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: the file is empty"), file_name);
      return NULL;
    }

  report = report_new (file_name);
  im.report = report;
  report->sha256 = compute_sha256 (data, length);

  reader = sl_csv_reader_new (data, length, options->delimiter, file_name, error);
  if (reader == NULL)
    return NULL;
  report->delimiter = sl_csv_reader_get_delimiter (reader);

  if (!sl_csv_reader_next (reader, &header))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   _("%s: no header row (the file holds only comments or blank lines)"), file_name);
      return NULL;
    }
  if (header.too_long)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   _("%s:%u: line longer than %d MiB; not a table of measurements"),
                   file_name, header.line, SL_CSV_MAX_RECORD_MIB);
      return NULL;
    }
  if (header.malformed)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s:%u: the header row: %s"),
                   file_name, header.line, _(header.malformed));
      return NULL;
    }
  /* The header's texts live in the reader's buffer until the next record:
   * keep a copy. */
  {
    g_auto (GStrv) names = g_new0 (char *, header.n_fields + 1);
    SlCsvRecord header_copy = header;

    for (guint i = 0; i < header.n_fields; i++)
      names[i] = g_strdup (g_strstrip (header.fields[i]));
    header_copy.fields = names;
    if (!resolve_columns (&im.plan, &header_copy, options, file_name, report, error))
      return NULL;
    mapping = mapping_json (&im.plan, &header_copy);
    note_missing_epoch (&im.plan, options, report);

    if (!sl_project_begin (project, error))
      return NULL;
    im.header = &header_copy;
    if (!check_not_imported (project, report->sha256, file_name, options->again, report, error)
        || (report->source_id = insert_source (project, path, file_name, options, report,
                                               mapping, length, error)) == 0
        || !prepare_statements (project, &im.st, error)
        || !start_matcher (&im, error)
        || !import_records (&im, reader, length, error)
        || !fail_if_nothing_accepted (&im, error)
        || !finish_matcher (&im, error)
        || !finish_source (&im, error)
        || !check_unchanged (fd, stamp, file_name, error)
        || !end_import (project, options, error))
      {
        finalize_statements (&im.st);
        g_clear_pointer (&im.matcher, sl_row_matcher_free);
        sl_project_rollback (project);
        return NULL;
      }
    finalize_statements (&im.st);
    g_clear_pointer (&im.matcher, sl_row_matcher_free);
    unit_warnings (&im);
  }
  return g_steal_pointer (&report);
}

SlImportReport *
sl_import_csv (SlProject *project, const char *path, const SlImportOptions *options,
               GError **error)
{
  SlImportReport *report;
  FileStamp stamp;
  int fd;

  g_return_val_if_fail (project != NULL && path != NULL && options != NULL, NULL);

  /* One descriptor for the mapping and both looks at the file's state. */
  fd = g_open (path, O_RDONLY | O_CLOEXEC, 0);
  if (fd < 0)
    {
      int saved_errno = errno;

      g_set_error (error, SL_ERROR, SL_ERROR_IO, _("%s: cannot read: %s"), path,
                   g_strerror (saved_errno));
      return NULL;
    }
  stamp_file (fd, &stamp);
  /* Every reference an import writes is to a row it wrote or found in
   * its own transaction (its source, each row's star, each match's
   * measurement): checking them again for each row cost a tenth of the
   * import's time.  The setting holds for whole transactions, so it
   * changes outside one, as for a derivation run. */
  if (!sl_project_exec (project, "PRAGMA foreign_keys = OFF", error))
    {
      close (fd);
      return NULL;
    }
  report = import_file (project, path, fd, &stamp, options, error);
  close (fd);
  if (!sl_project_exec (project, "PRAGMA foreign_keys = ON", report ? error : NULL))
    g_clear_pointer (&report, sl_import_report_free);
  return report;
}

/* ------------------------------------------------------------------ */
/* The preview                                                        */

static void
preview_row_free (gpointer data)
{
  SlPreviewRow *row = data;

  g_strfreev (row->cells);
  g_free (row->malformed);
  g_free (row);
}

static void
preview_column_clear (gpointer data)
{
  SlPreviewColumn *column = data;

  g_free (column->name);
}

void
sl_import_preview_free (SlImportPreview *preview)
{
  if (preview == NULL)
    return;
  g_free (preview->file_name);
  g_array_unref (preview->columns);
  g_ptr_array_unref (preview->rows);
  g_free (preview->mapping_problem);
  g_free (preview);
}

/* The columns as OPTIONS map them, and as the names alone would. */
static void
preview_mapping (SlImportPreview *preview, const SlCsvRecord *header,
                 const SlImportOptions *options)
{
  SlImportOptions automatic_options = *options;
  g_autoptr (GError) error = NULL;
  ColumnPlan plan, automatic;

  /* The names alone: the import with no maps.  A failure there (say, two
   * columns named alike) leaves the columns it did not reach unmapped; the
   * mapping as asked reports it. */
  automatic_options.maps = NULL;
  automatic_options.n_maps = 0;
  automatic_options.explicit_only = FALSE;
  map_columns (&automatic, header, &automatic_options, preview->file_name, NULL, NULL);

  if (!resolve_columns (&plan, header, options, preview->file_name, NULL, &error))
    preview->mapping_problem = g_strdup (error->message);

  for (guint i = 0; i < header->n_fields; i++)
    {
      SlPreviewColumn column = { g_strdup (header->fields[i]), SL_FIELD_NONE, SL_UNIT_NONE,
                                 FALSE, SL_FIELD_NONE };

      for (SlField f = 0; f < SL_N_FIELDS; f++)
        {
          if (automatic.column[f] == (int) i)
            column.automatic = f;
          if (preview->mapping_problem == NULL && plan.column[f] == (int) i)
            {
              column.field = f;
              column.unit = plan.unit[f];
            }
        }
      if (column.field != SL_FIELD_NONE)
        for (guint m = 0; m < options->n_maps; m++)
          column.explicit_map |= options->maps[m].field == column.field;
      g_array_append_val (preview->columns, column);
    }
}

/* How much of the file the preview reads first; it reads more (twice as
 * much each time) only while the header and the rows it wants are not
 * all complete in what it has. */
#define PREVIEW_FIRST_READ ((gsize) 64 << 10)

/* What one parse of the file's start came to. */
typedef enum {
  PREVIEW_DONE,       /* the preview is complete */
  PREVIEW_NEED_MORE,  /* a record it needs runs past the bytes read so far */
  PREVIEW_FAILED      /* the file cannot be previewed; error set */
} PreviewStep;

static SlImportPreview *
preview_new (const char *path)
{
  SlImportPreview *preview = g_new0 (SlImportPreview, 1);

  preview->file_name = g_path_get_basename (path);
  preview->columns = g_array_new (FALSE, FALSE, sizeof (SlPreviewColumn));
  g_array_set_clear_func (preview->columns, preview_column_clear);
  preview->rows = g_ptr_array_new_with_free_func (preview_row_free);
  return preview;
}

/* The bytes of the file's start read so far. */
typedef struct {
  char     *data;
  gsize     length;
  gboolean  at_end;   /* DATA is the whole file */
} PreviewBuffer;

/* Reads from FD until BUFFER holds WANT bytes or the file ends.  Ordinary
 * reads, never a mapping: a mapped file that another program truncates
 * ends the process with SIGBUS. */
static gboolean
preview_read_more (int fd, PreviewBuffer *buffer, gsize want, const char *path, GError **error)
{
  buffer->data = g_realloc (buffer->data, want);
  while (buffer->length < want && !buffer->at_end)
    {
      ssize_t n = read (fd, buffer->data + buffer->length, want - buffer->length);

      if (n < 0 && errno == EINTR)
        continue;
      if (n < 0)
        {
          int saved_errno = errno;

          g_set_error (error, SL_ERROR, SL_ERROR_IO, _("%s: cannot read: %s"), path,
                       g_strerror (saved_errno));
          return FALSE;
        }
      buffer->length += (gsize) n;
      buffer->at_end = n == 0;
    }
  return TRUE;
}

static void
set_too_long_error (const char *file_name, guint line, GError **error)
{
  g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
               _("%s:%u: line longer than %d MiB; not a table of measurements"),
               file_name, line, SL_CSV_MAX_RECORD_MIB);
}

/* Fills PREVIEW from the file's first LENGTH bytes, DATA; AT_END: they are
 * the whole file.  A record is taken only when it ends before the bytes
 * read do (its line end is followed by something), or at the file's end;
 * otherwise the caller reads more and starts again on a fresh preview. */
static PreviewStep
preview_parse (SlImportPreview *preview, const char *data, gsize length, gboolean at_end,
               const SlImportOptions *options, guint max_rows, GError **error)
{
  g_autoptr (SlCsvReader) reader = NULL;
  g_auto (GStrv) names = NULL;
  SlCsvRecord header, record;

  if (length == 0 && at_end)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: the file is empty"),
                   preview->file_name);
      return PREVIEW_FAILED;
    }
  /* No LF yet: the header is not complete (unless it is already too long,
   * which the reader says), and a CRLF cut after its CR must not look like
   * an old Mac line end to the reader. */
  if (!at_end && memchr (data, '\n', length) == NULL && length <= SL_CSV_MAX_RECORD_BYTES)
    return PREVIEW_NEED_MORE;
  reader = sl_csv_reader_new (data, length, options->delimiter, preview->file_name, error);
  if (reader == NULL)
    return PREVIEW_FAILED;
  preview->delimiter = sl_csv_reader_get_delimiter (reader);
  preview->delimiter_given = options->delimiter != 0;

  if (!sl_csv_reader_next (reader, &header))
    {
      if (!at_end)
        return PREVIEW_NEED_MORE;
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   _("%s: no header row (the file holds only comments or blank lines)"),
                   preview->file_name);
      return PREVIEW_FAILED;
    }
  if (header.too_long)
    {
      set_too_long_error (preview->file_name, header.line, error);
      return PREVIEW_FAILED;
    }
  if (!at_end && sl_csv_reader_get_offset (reader) >= length)
    return PREVIEW_NEED_MORE;
  if (header.malformed)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s:%u: the header row: %s"),
                   preview->file_name, header.line, _(header.malformed));
      return PREVIEW_FAILED;
    }
  preview->header_line = header.line;
  /* As the import does: a stripped copy outlives the reader's buffer. */
  names = g_new0 (char *, header.n_fields + 1);
  for (guint i = 0; i < header.n_fields; i++)
    names[i] = g_strdup (g_strstrip (header.fields[i]));
  header.fields = names;
  preview_mapping (preview, &header, options);

  while (sl_csv_reader_next (reader, &record))
    {
      SlPreviewRow *row;

      /* Any record after the ones wanted, complete or not, is more. */
      if (preview->rows->len == max_rows)
        {
          preview->more_rows = TRUE;
          return PREVIEW_DONE;
        }
      if (record.too_long)
        {
          set_too_long_error (preview->file_name, record.line, error);
          return PREVIEW_FAILED;
        }
      if (!at_end && sl_csv_reader_get_offset (reader) >= length)
        return PREVIEW_NEED_MORE;
      row = g_new0 (SlPreviewRow, 1);
      row->line = record.line;
      row->cells = g_new0 (char *, record.n_fields + 1);
      for (guint i = 0; i < record.n_fields; i++)
        row->cells[i] = g_utf8_make_valid (record.fields[i], -1);
      row->malformed = record.malformed ? g_strdup (_(record.malformed)) : NULL;
      g_ptr_array_add (preview->rows, row);
    }
  return at_end ? PREVIEW_DONE : PREVIEW_NEED_MORE;
}

SlImportPreview *
sl_import_preview (const char *path, const SlImportOptions *options, guint max_rows,
                   GError **error)
{
  PreviewBuffer buffer = { NULL, 0, FALSE };
  gsize want = PREVIEW_FIRST_READ;
  struct stat st;
  int fd;

  g_return_val_if_fail (path != NULL && options != NULL, NULL);

  /* Not blocking: opening a named pipe would otherwise wait for a writer. */
  fd = g_open (path, O_RDONLY | O_CLOEXEC | O_NONBLOCK, 0);
  if (fd < 0)
    {
      int saved_errno = errno;

      g_set_error (error, SL_ERROR, SL_ERROR_IO, _("%s: cannot read: %s"), path,
                   g_strerror (saved_errno));
      return NULL;
    }
  if (fstat (fd, &st) != 0 || !S_ISREG (st.st_mode))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_IO,
                   _("%s: not a regular file (a folder, a pipe or a device); "
                     "save the table as a file and import that"), path);
      close (fd);
      return NULL;
    }

  for (;;)
    {
      g_autoptr (SlImportPreview) preview = preview_new (path);
      PreviewStep step;

      if (!preview_read_more (fd, &buffer, want, path, error))
        break;
      step = preview_parse (preview, buffer.data, buffer.length, buffer.at_end, options,
                            max_rows, error);
      if (step == PREVIEW_FAILED)
        break;
      if (step == PREVIEW_DONE)
        {
          preview->bytes_read = buffer.length;
          g_free (buffer.data);
          close (fd);
          return g_steal_pointer (&preview);
        }
      want *= 2;
    }
  g_free (buffer.data);
  close (fd);
  return NULL;
}
