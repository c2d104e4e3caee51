/* inputs.h: one set of input values per star, chosen from its measurements.
 *
 * A star measured by several sources has several rows in measurements.
 * Fields that belong together are chosen together, from one row: the
 * position with its errors and epoch, the parallax with its error, the two
 * proper-motion components, each photometric quantity with its error.  The
 * rule: the row with the smallest uncertainty of the group's main field; a
 * row with an uncertainty beats one without; ties go to the later source.
 * The spectral type is the later source's.
 */
#pragma once

#include "project.h"
#include "vocabulary.h"

G_BEGIN_DECLS

typedef struct {
  gint64      star_id;
  const char *designation;              /* valid until the next call */
  gboolean    present[SL_N_FIELDS];
  double      value[SL_N_FIELDS];       /* canonical units */
  const char *sptype;                   /* NULL if none; valid until the next call */
  gint64      measurement[SL_N_FIELDS]; /* the measurements row each field came from */
  guint       n_measurements;           /* rows the star has */
} SlStarInputs;

/* The field that leads FIELD's group (ra for dec and epoch, pmra for
 * pmdec, the value for its error, sptype for itself): the key of
 * SlStarInputs.measurement and of a derived row's measurement columns.
 * SL_FIELD_NONE for the id. */
SlField sl_input_group_lead (SlField field);

typedef struct _SlInputCursor SlInputCursor;

/* Walks every star in id order.  STAR_ID > 0 restricts it to that star. */
SlInputCursor *sl_input_cursor_new  (SlProject *project, gint64 star_id, GError **error);

/* Fills INPUTS with the next star; FALSE at the end, or on an error (then
 * ERROR is set). */
gboolean       sl_input_cursor_next (SlInputCursor *cursor, SlStarInputs *inputs, GError **error);

void           sl_input_cursor_free (SlInputCursor *cursor);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlInputCursor, sl_input_cursor_free)

G_END_DECLS
