/* derivation.h: derivation runs on a project: which stars to (re)compute,
 * storing each star's derived row with its provenance, values set by hand,
 * and verification by recomputation.
 */
#pragma once

#include <gio/gio.h>

#include "derive/derive.h"
#include "derive/engine.h"
#include "import.h"
#include "project.h"

G_BEGIN_DECLS

typedef struct {
  gint64  run_id;
  guint64 computed;     /* stars derived in this run */
  guint64 up_to_date;   /* stars left as they were */
  double  seconds;
  SlDeriveParams params;  /* as recorded with the run: PARAMS with the project's policy */
} SlDeriveReport;

/* Derives every star that has no derived row, is stale, or was derived
 * with other parameters; ALL derives every star.  One transaction.
 * PARAMS->combine is not used: a run combines sources by the project's
 * policy (sl_combine_policy_read) and records it. */
gboolean sl_derivation_run (SlProject *project, const SlDeriveParams *params, gboolean all,
                            GCancellable *cancellable, SlProgressFunc progress,
                            gpointer progress_data, SlDeriveReport *report, GError **error);

/* The parameters of the project's most recent finished derivation run,
 * so that the next run can start from the team's last choices, and that
 * run's id in *RUN_ID (may be NULL); with no run yet, the defaults
 * (sl_derive_params_init) and 0.  FALSE with ERROR if the record cannot
 * be read. */
gboolean sl_derivation_latest_params (SlProject *project, SlDeriveParams *params, gint64 *run_id,
                                      GError **error);

/* Sets (or with CLEAR removes) a value by hand for a star; its derived row
 * becomes stale.  LO and HI may be NAN. */
gboolean sl_override_set (SlProject *project, const char *designation, SlQuantity quantity,
                          double value, double lo, double hi, const char *reason, GError **error);
gboolean sl_override_clear (SlProject *project, const char *designation, SlQuantity quantity,
                            const char *reason, GError **error);

/* The star's id, or 0 and an error naming the designation. */
gint64   sl_star_lookup (SlProject *project, const char *designation, GError **error);

/* Loads a star's active overrides. */
GArray  *sl_overrides_for_star (SlProject *project, gint64 star_id, GError **error);

typedef struct {
  guint64    checked;
  guint64    stale;        /* rows whose inputs changed since: not comparable */
  GPtrArray *mismatches;   /* one line each: "LHO 0001: teff: stored 6633, recomputed 6641" */
  char      *integrity;    /* "ok", or SQLite's integrity_check report */
} SlVerifyReport;

/* Recomputes every derived row from the raw rows and its run's recorded
 * parameters and compares, bit for bit; runs SQLite's integrity check. */
SlVerifyReport *sl_verify (SlProject *project, GCancellable *cancellable, GError **error);
void            sl_verify_report_free (SlVerifyReport *report);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlVerifyReport, sl_verify_report_free)

/* A stored derived row. */
typedef struct {
  gint64          star_id;
  gint64          run_id;
  gboolean        stale;
  gint64          measurement[SL_N_FIELDS];  /* by the field leading each group; 0: none */
  SlDerivedValues values;
} SlDerivedRow;

/* "SELECT star_id, run_id, ... FROM derived" with WHERE_AND_ORDER appended,
 * for sl_derived_row_read. */
char    *sl_derived_select_sql (const char *where_and_order);
void     sl_derived_row_read (sqlite3_stmt *stmt, SlDerivedRow *row);

/* Reads one star's row; FALSE with no error if it has none. */
gboolean sl_derived_row_load (SlProject *project, gint64 star_id, SlDerivedRow *row, GError **error);

G_END_DECLS
