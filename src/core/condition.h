/* condition.h: the condition language of target lists and its compiler
 * to SQL.
 *
 *   expr       := or
 *   or         := and ('or' and)*
 *   and        := not ('and' not)*
 *   not        := 'not' not | primary
 *   primary    := '(' expr ')' | 'flag:' FLAG | NAME 'is' ['not'] 'missing'
 *               | NAME OP NUMBER          (a numeric NAME; OP one of < <= > >= = !=)
 *               | NAME TEXTOP STRING      (id, sptype, spclass; TEXTOP one of = != ~)
 *
 * NAME is a derived quantity (teff, dist, ..., each number also as
 * NAME_lo and NAME_hi, the bounds of its 68% interval), an input field
 * of the vocabulary (parallax, vmag, ra, pmra_err, sptype, ...: the value
 * the star's derivation used, through the derived row's m_* pointers to
 * its measurements rows), or id (the designation).  FLAG is a flag's name
 * (sl_flag_info) or 'stale'.  Keywords and names are case-insensitive;
 * numbers are read by sl_parse_number (never the locale); strings are in
 * '...' or "..." with a backslash taking the next character literally.
 * '=' on text is exact; '~' is "contains", ignoring the case of ASCII
 * letters.
 *
 * A condition selects among the stars that have a derived row (stars
 * never derived have no values to test, and their inputs have not been
 * chosen among their measurements yet); a stale row is tested as stored.
 * A missing value satisfies no comparison, and 'not' of a comparison on a
 * missing value is not satisfied either (SQL's three-valued logic): say
 * 'teff is missing or teff < 5000' to include stars without a teff.
 */
#pragma once

#include <glib.h>
#include <sqlite3.h>

#include "combine.h"

G_BEGIN_DECLS

typedef enum {
  SL_CONDITION_PARAM_NUMBER,   /* a NUMBER of the text */
  SL_CONDITION_PARAM_TEXT,     /* a STRING of the text, unescaped */
  SL_CONDITION_PARAM_INTEGER,  /* a flag's bit */
} SlConditionParamKind;

typedef struct {
  SlConditionParamKind kind;
  double               number;
  char                *text;
  gint64               integer;
} SlConditionParam;

typedef struct {
  char   *text;    /* the condition as written */
  char   *where;   /* an SQL boolean expression over "derived d" and JOINS; every
                    * literal is an anonymous '?' parameter, in PARAMS' order */
  char   *joins;   /* "" or " LEFT JOIN measurements in_vmag ON in_vmag.id = d.m_vmag ..." */
  GArray *params;  /* SlConditionParam */
} SlCondition;

/* Compiles TEXT; on a mistake sets an SL_ERROR whose message starts with
 * "at COLUMN:" (characters from 1) and says what was expected there. */
SlCondition *sl_condition_compile (const char *text, GError **error);
/* The same for a project whose combination POLICY averages some inputs:
 * a name of such an input stands for the mean (inputs.h), not for the
 * most precise row the derived values record.  POLICY NULL: as above. */
SlCondition *sl_condition_compile_for (const char *text, const SlCombinePolicy *policy, GError **error);
void         sl_condition_free    (SlCondition *condition);

/* "SELECT d.star_id FROM derived d JOINS WHERE WHERE ORDER BY d.star_id". */
char        *sl_condition_select_sql (const SlCondition *condition);

/* Binds the parameters to STMT's '?' from number FIRST on. */
void         sl_condition_bind (const SlCondition *condition, sqlite3_stmt *stmt, int first);

/* What a name of the language stands for, for a condition builder. */
typedef enum {
  SL_CONDITION_NAME_NUMBER,  /* compared with < <= = >= > != and a NUMBER */
  SL_CONDITION_NAME_TEXT,    /* compared with = != ~ and a STRING */
  SL_CONDITION_NAME_FLAG,    /* written flag:NAME, true or false */
} SlConditionNameKind;

typedef struct {
  const char         *name;         /* static: "teff", "teff_lo", "vmag", "id", "stale" ... */
  SlConditionNameKind kind;
  const char         *description;  /* what it is, English, marked N_(): translate with _() */
  const char         *unit;         /* its unit's name, "" for none */
  int                 bound;        /* -1 for NAME_lo, +1 for NAME_hi (68% interval), else 0 */
} SlConditionName;

/* Every name the language accepts, in the order a chooser shows them:
 * the derived quantities (each number followed by its _lo and _hi), the
 * inputs of the vocabulary (id first), then the flags and 'stale'.  A
 * GArray of SlConditionName. */
GArray      *sl_condition_names (void);

/* TEXT as a STRING of the language: in '...', a backslash before every
 * quote and backslash inside. */
char        *sl_condition_quote (const char *text);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlCondition, sl_condition_free)

G_END_DECLS
