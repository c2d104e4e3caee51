/* inputs.h: one set of input values per star, chosen from its measurements.
 *
 * A star measured by several sources has several rows in measurements.
 * Fields that belong together are chosen together, from one row: the
 * position with its errors and epoch, the parallax with its error, the two
 * proper-motion components, each photometric quantity with its error.  How
 * is the project's combination policy (combine.h), per group:
 *   smallest-error: the row with the smallest uncertainty of the group's
 *     main field (for the position hypot (ra_err, dec_err)); a row with an
 *     uncertainty beats one without; ties go to the later source;
 *   priority: the row of the source that comes first in the policy's
 *     source order (unlisted sources after every listed one), then as
 *     smallest-error;
 *   weighted-mean: the inverse-variance weighted mean of every row with
 *     errors (each component on its own for the proper motion), where
 *     there are two or more; otherwise as smallest-error.
 * Whatever the rule, two or more rows with errors are tested for agreement
 * (chi-square; not the position, whose rows may be of different epochs).
 * The spectral type is the later source's.
 */
#pragma once

#include "combine.h"
#include "project.h"
#include "vocabulary.h"

G_BEGIN_DECLS

typedef struct {
  gint64      star_id;
  const char *designation;              /* valid until the next call */
  gboolean    present[SL_N_FIELDS];
  double      value[SL_N_FIELDS];       /* canonical units */
  const char *sptype;                   /* NULL if none; valid until the next call */
  gint64      measurement[SL_N_FIELDS]; /* the measurements row each field came from; for
                                         * a mean, the most precise of the rows averaged */
  guint       n_measurements;           /* rows the star has */
  /* By the group's lead field: */
  guint       n_combined[SL_N_FIELDS];  /* rows averaged; 0 where one row was chosen */
  guint       n_tested[SL_N_FIELDS];    /* rows with errors in the agreement test; 0, or 2 and more */
  double      chi2[SL_N_FIELDS];        /* the test's chi-square, NAN without a test */
  guint       dof[SL_N_FIELDS];         /* its degrees of freedom */
  double      p_value[SL_N_FIELDS];     /* its tail probability, NAN without a test */
  guint32     flags;                    /* SlFlag bits of the inputs: sources_disagree */
} SlStarInputs;

/* The field that leads FIELD's group (ra for dec and epoch, pmra for
 * pmdec, the value for its error, sptype for itself): the key of
 * SlStarInputs.measurement and of a derived row's measurement columns.
 * SL_FIELD_NONE for the id. */
SlField sl_input_group_lead (SlField field);

typedef struct _SlInputCursor SlInputCursor;

/* Walks every star in id order.  STAR_ID > 0 restricts it to that star.
 * Chooses by the project's current policy (sl_combine_policy_read). */
SlInputCursor *sl_input_cursor_new  (SlProject *project, gint64 star_id, GError **error);
/* The same with a given policy: a derivation run's. */
SlInputCursor *sl_input_cursor_new_with_policy (SlProject *project, gint64 star_id,
                                                const SlCombinePolicy *policy, GError **error);

/* Fills INPUTS with the next star; FALSE at the end, or on an error (then
 * ERROR is set). */
gboolean       sl_input_cursor_next (SlInputCursor *cursor, SlStarInputs *inputs, GError **error);

/* Chooses the current star's inputs again by POLICY (a run's, to verify
 * or explain it), into INPUTS; after a successful next. */
void           sl_input_cursor_choose (SlInputCursor *cursor, const SlCombinePolicy *policy,
                                       SlStarInputs *inputs);

void           sl_input_cursor_free (SlInputCursor *cursor);

/* The current star's rows that measured the group led by LEAD, in source
 * order: each row and whether it went into the chosen value (the chosen
 * row, or every row of a mean).  A new array of SlInputContribution. */
typedef struct {
  gint64   measurement;
  gint64   source_id;
  gboolean used;
  gboolean tested;   /* it has the errors the agreement test needs */
} SlInputContribution;

GArray        *sl_input_cursor_contributions (SlInputCursor *cursor, SlField lead);

/* The same rules in SQL, for what reads inputs through SQLite rather than
 * a cursor (the window's table, conditions).  Both take a star's
 * measurements rows as "m".
 * sl_input_order_sql: ORDER BY terms that put first the row POLICY takes
 * for the group led by LEAD (smallest-error, priority; for a mean, the
 * most precise row, the one recorded with the derived values).
 * sl_input_value_sql: FIELD's value or error as POLICY takes it: ROW.FIELD
 * (ROW: the alias of the chosen row), or where POLICY averages the group,
 * the weighted mean of the rows of the star whose id is the SQL STAR,
 * falling back to ROW.FIELD where fewer than two rows have errors.  SQLite
 * sums in row order, as the cursor does; the last bit may differ. */
char          *sl_input_order_sql (const SlCombinePolicy *policy, SlField lead);
char          *sl_input_value_sql (const SlCombinePolicy *policy, SlField field, const char *row,
                                   const char *star);

/* The project's combination policy (settings table, key "combine"): the
 * defaults when none was set. */
gboolean       sl_combine_policy_read  (SlProject *project, SlCombinePolicy *policy, GError **error);
/* The names of the project's sources, oldest first, each once: what a
 * source order may list.  A new array of strings. */
GPtrArray     *sl_combine_source_names (SlProject *project, GError **error);
/* Stores POLICY as the project's (checked first; every name in its
 * source order must be a source's), with a ledger entry
 * saying who changed it from what; the next derive re-derives what it
 * changes.  In one transaction. */
gboolean       sl_combine_policy_write (SlProject *project, const SlCombinePolicy *policy, GError **error);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlInputCursor, sl_input_cursor_free)

G_END_DECLS
