/* explain.h: how one value of one star was obtained, down to the raw
 * rows: each step's method, citation, formula and parameters, the values
 * it gave, and for every raw input its source file, SHA-256, line and
 * column, who imported it and when; values set by hand with who, when
 * and why.  As readable text or as JSON for scripts.
 */
#pragma once

#include "project.h"

G_BEGIN_DECLS

typedef enum {
  SL_EXPLAIN_TEXT,
  SL_EXPLAIN_JSON,
} SlExplainFormat;

/* Appends the explanation of QUANTITY (a derived quantity or an input
 * field name) of the star DESIGNATION to OUT. */
gboolean sl_explain (SlProject *project, const char *designation, const char *quantity,
                     SlExplainFormat format, GString *out, GError **error);

G_END_DECLS
