/* inputs.c: choosing a star's inputs among its measurements. */
#include "inputs.h"

#include <math.h>
#include <string.h>

#include "sl-error.h"

/* The groups of fields chosen together, each led by the field whose
 * uncertainty decides. */
typedef struct {
  SlField lead;
  SlField members[5];
  guint   n_members;
} FieldGroup;

static const FieldGroup groups[] = {
  { SL_FIELD_RA, { SL_FIELD_RA, SL_FIELD_RA_ERR, SL_FIELD_DEC, SL_FIELD_DEC_ERR, SL_FIELD_EPOCH }, 5 },
  { SL_FIELD_PARALLAX, { SL_FIELD_PARALLAX, SL_FIELD_PARALLAX_ERR }, 2 },
  { SL_FIELD_PMRA, { SL_FIELD_PMRA, SL_FIELD_PMRA_ERR, SL_FIELD_PMDEC, SL_FIELD_PMDEC_ERR }, 4 },
  { SL_FIELD_VMAG, { SL_FIELD_VMAG, SL_FIELD_VMAG_ERR }, 2 },
  { SL_FIELD_BMAG, { SL_FIELD_BMAG, SL_FIELD_BMAG_ERR }, 2 },
  { SL_FIELD_BV, { SL_FIELD_BV, SL_FIELD_BV_ERR }, 2 },
  { SL_FIELD_EBV, { SL_FIELD_EBV, SL_FIELD_EBV_ERR }, 2 },
  { SL_FIELD_VRAD, { SL_FIELD_VRAD, SL_FIELD_VRAD_ERR }, 2 },
};

SlField
sl_input_group_lead (SlField field)
{
  g_return_val_if_fail (field < SL_N_FIELDS, SL_FIELD_NONE);
  if (field == SL_FIELD_SPTYPE)
    return SL_FIELD_SPTYPE;   /* alone: the later source's */
  for (gsize g = 0; g < G_N_ELEMENTS (groups); g++)
    for (guint m = 0; m < groups[g].n_members; m++)
      if (groups[g].members[m] == field)
        return groups[g].lead;
  return SL_FIELD_NONE;
}

/* One measurements row as read. */
typedef struct {
  gint64   id;
  gboolean present[SL_N_FIELDS];
  double   value[SL_N_FIELDS];
  char    *sptype;   /* in the cursor's string chunk */
} MeasurementRow;

struct _SlInputCursor {
  sqlite3_stmt *stmt;
  gboolean      has_pending;  /* stmt holds a stepped row of the next star */
  gboolean      finished;     /* stepped to the end, or failed */
  GArray       *rows;         /* MeasurementRow of the current star */
  GStringChunk *strings;      /* designation and spectral types of the current star */
};

/* Result columns: star_id, designation, id, then the fields from ra on. */
#define FIRST_FIELD_COLUMN 3

SlInputCursor *
sl_input_cursor_new (SlProject *project, gint64 star_id, GError **error)
{
  g_autoptr (GString) sql = g_string_new ("SELECT m.star_id, s.designation, m.id");
  SlInputCursor *cursor;
  sqlite3_stmt *stmt;

  for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
    g_string_append_printf (sql, ", m.%s", sl_field_info (f)->name);
  g_string_append (sql, " FROM measurements m JOIN stars s ON s.id = m.star_id");
  if (star_id > 0)
    g_string_append (sql, " WHERE m.star_id = ?1");
  g_string_append (sql, " ORDER BY m.star_id, m.source_id");

  stmt = sl_project_prepare (project, sql->str, error);
  if (stmt == NULL)
    return NULL;
  if (star_id > 0)
    sqlite3_bind_int64 (stmt, 1, star_id);

  cursor = g_new0 (SlInputCursor, 1);
  cursor->stmt = stmt;
  cursor->rows = g_array_new (FALSE, FALSE, sizeof (MeasurementRow));
  cursor->strings = g_string_chunk_new (256);
  return cursor;
}

static void
read_row (SlInputCursor *cursor, MeasurementRow *row)
{
  row->id = sqlite3_column_int64 (cursor->stmt, 2);
  row->sptype = NULL;
  for (SlField f = SL_FIELD_ID + 1; f < SL_N_FIELDS; f++)
    {
      int column = FIRST_FIELD_COLUMN + (f - (SL_FIELD_ID + 1));

      row->present[f] = sqlite3_column_type (cursor->stmt, column) != SQLITE_NULL;
      row->value[f] = row->present[f] ? sqlite3_column_double (cursor->stmt, column) : NAN;
      if (f == SL_FIELD_SPTYPE && row->present[f])
        row->sptype = g_string_chunk_insert (cursor->strings,
                                             (const char *) sqlite3_column_text (cursor->stmt, column));
    }
}

/* Whether row A beats row B for a group led by LEAD (B came earlier). */
static gboolean
better_for_group (const MeasurementRow *a, const MeasurementRow *b, SlField lead)
{
  SlField error = sl_field_info (lead)->error;
  double ea, eb;

  if (!b->present[lead])
    return TRUE;
  if (error == SL_FIELD_NONE)
    return TRUE;
  if (a->present[error] != b->present[error])
    return a->present[error];
  if (!a->present[error])
    return TRUE;
  ea = a->value[error];
  eb = b->value[error];
  if (lead == SL_FIELD_RA && a->present[SL_FIELD_DEC_ERR] && b->present[SL_FIELD_DEC_ERR])
    {
      ea = hypot (ea, a->value[SL_FIELD_DEC_ERR]);
      eb = hypot (eb, b->value[SL_FIELD_DEC_ERR]);
    }
  return ea <= eb;
}

static void
choose_inputs (SlInputCursor *cursor, SlStarInputs *inputs)
{
  memset (inputs->present, 0, sizeof inputs->present);
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      inputs->value[f] = NAN;
      inputs->measurement[f] = 0;
    }
  inputs->sptype = NULL;
  inputs->n_measurements = cursor->rows->len;

  for (gsize g = 0; g < G_N_ELEMENTS (groups); g++)
    {
      const MeasurementRow *best = NULL;

      for (guint r = 0; r < cursor->rows->len; r++)
        {
          const MeasurementRow *row = &g_array_index (cursor->rows, MeasurementRow, r);

          if (row->present[groups[g].lead] && (best == NULL || better_for_group (row, best, groups[g].lead)))
            best = row;
        }
      if (best == NULL)
        continue;
      for (guint m = 0; m < groups[g].n_members; m++)
        {
          SlField f = groups[g].members[m];

          inputs->present[f] = best->present[f];
          inputs->value[f] = best->value[f];
          inputs->measurement[f] = best->present[f] ? best->id : 0;
        }
    }

  for (guint r = 0; r < cursor->rows->len; r++)
    {
      const MeasurementRow *row = &g_array_index (cursor->rows, MeasurementRow, r);

      if (row->sptype != NULL)
        {
          inputs->sptype = row->sptype;
          inputs->present[SL_FIELD_SPTYPE] = TRUE;
          inputs->measurement[SL_FIELD_SPTYPE] = row->id;
        }
    }
}

gboolean
sl_input_cursor_next (SlInputCursor *cursor, SlStarInputs *inputs, GError **error)
{
  int rc = SQLITE_ROW;

  if (cursor->finished)
    return FALSE;

  g_array_set_size (cursor->rows, 0);
  g_string_chunk_clear (cursor->strings);

  if (!cursor->has_pending)
    {
      rc = sqlite3_step (cursor->stmt);
      if (rc != SQLITE_ROW)
        goto finished;
    }

  inputs->star_id = sqlite3_column_int64 (cursor->stmt, 0);
  inputs->designation = g_string_chunk_insert (cursor->strings,
                                               (const char *) sqlite3_column_text (cursor->stmt, 1));
  do
    {
      MeasurementRow row;

      read_row (cursor, &row);
      g_array_append_val (cursor->rows, row);
      rc = sqlite3_step (cursor->stmt);
    }
  while (rc == SQLITE_ROW && sqlite3_column_int64 (cursor->stmt, 0) == inputs->star_id);

  cursor->has_pending = rc == SQLITE_ROW;
  /* Stepping a finished statement again would restart it. */
  cursor->finished = rc != SQLITE_ROW;
  if (rc != SQLITE_ROW && rc != SQLITE_DONE)
    goto finished;
  choose_inputs (cursor, inputs);
  return TRUE;

finished:
  cursor->has_pending = FALSE;
  cursor->finished = TRUE;
  if (rc != SQLITE_DONE)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, "%s",
                   sqlite3_errmsg (sqlite3_db_handle (cursor->stmt)));
    }
  return FALSE;
}

void
sl_input_cursor_free (SlInputCursor *cursor)
{
  if (cursor == NULL)
    return;
  sqlite3_finalize (cursor->stmt);
  g_array_unref (cursor->rows);
  g_string_chunk_free (cursor->strings);
  g_free (cursor);
}
