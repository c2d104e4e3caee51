/* export.h: writing a project's stars as a table, CSV or LaTeX.
 *
 * CSV (RFC 4180): every numeric quantity q is three columns, q, q_lo and
 * q_hi: the value and the bounds of its 68% interval (DESIGN.md); an empty
 * cell is no value; the flags column lists flags separated by '|'.  LaTeX:
 * a tabular with each value and its (asymmetric) uncertainty rounded to
 * the uncertainty's significant digits.  A file is written to a temporary
 * name and renamed into place, so a failed export never leaves half a file.
 *
 * Positions at an epoch (at_epoch): ra and dec are carried from each
 * star's catalogue epoch to EPOCH with its proper motion, parallax and
 * radial velocity (crossmatch.h's propagation, eraPmsafe), and their
 * errors grow with the proper-motion errors to first order, per
 * coordinate: sigma^2 = sigma_0^2 + (dt sigma_mu)^2 (the linear
 * propagation of ESA 1997, The Hipparcos and Tycho Catalogues, Vol. 1,
 * Sect. 1.5.5, without the correlations we do not store).  The epoch
 * column then says the epoch of each row's position: EPOCH where the
 * star was moved, its catalogue epoch where it could not be (no proper
 * motion or no epoch), and such a star carries the flag
 * position_not_propagated.  With a proper motion but no proper-motion
 * error, the position moves but its interval is unknown (empty bounds).
 * Choosing ra or dec brings the epoch column with it.  The LaTeX table
 * states the frame and epoch in its leading comment.
 */
#pragma once

#include <gio/gio.h>

#include "inputs.h"
#include "project.h"

G_BEGIN_DECLS

typedef enum {
  SL_EXPORT_CSV,
  SL_EXPORT_TEX,
} SlExportFormat;

typedef struct {
  SlExportFormat     format;
  const char *const *columns;  /* names, NULL-terminated; NULL: every input, derived value and flags */
  GCancellable      *cancellable;
  const char        *list;     /* only the stars of this list (lists.h); NULL: every star */
  gboolean           at_epoch; /* FALSE: positions at each star's catalogue epoch */
  double             epoch;    /* Julian year the positions are carried to, if at_epoch */
} SlExportOptions;

/* The flag of a star whose position could not be carried to the epoch. */
#define SL_EXPORT_FLAG_NOT_PROPAGATED "position_not_propagated"

/* The position and its 1-sigma errors of IN (inputs.h) at Julian year
 * EPOCH, as the export with at_epoch writes them: on return IN's ra, dec,
 * their errors (mas, on the sky) and epoch are those at EPOCH.  Returns
 * FALSE, leaving IN unchanged, if the star has no position, no epoch or
 * no proper motion. */
gboolean sl_export_position_at_epoch (SlStarInputs *in, double epoch);

/* Writes the table to PATH, or to standard output when PATH is "-".
 * Returns the number of stars written, or -1 on error. */
gint64 sl_export (SlProject *project, const char *path, const SlExportOptions *options,
                  GError **error);

/* The names --columns accepts, in table order. */
GPtrArray *sl_export_column_names (void);

G_END_DECLS
