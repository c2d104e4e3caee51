/* condition.c: a hand-written recursive-descent parser for the condition
 * language (condition.h) that emits SQL as it goes.
 *
 * Contents:
 *   names ............ the inputs' measurement groups, resolve_name, known_names
 *   tokens ........... Token, next_token
 *   errors ........... fail_at, fail_expected
 *   the grammar ...... parse_or, parse_and, parse_not, parse_primary
 *   the compiled form  sl_condition_compile, sl_condition_bind
 *   for a builder .... sl_condition_names, sl_condition_quote
 *
 * Only names from the tables of quantities, fields and flags ever reach
 * the SQL text; every literal the user wrote is a bound parameter.
 */
#include "condition.h"

#include <glib/gi18n.h>
#include <string.h>

#include "derive/derive.h"
#include "inputs.h"
#include "sl-error.h"
#include "units.h"
#include "vocabulary.h"

/* Deep and long enough for any condition a person writes; small enough
 * that neither this parser's recursion nor SQLite's (its parser stack
 * holds 100 entries, its expression trees 1000 levels) can overflow on the
 * SQL it is compiled to: found by fuzzing (tests/fuzz/regressions). */
#define MAX_DEPTH 32
#define MAX_TERMS 256

/* ------------------------------------------------------------------ */
/* Names                                                              */

/* The measurements rows a derived row points to (derivation.c), one per
 * group of inputs chosen together (inputs.c), and the designation. */
typedef enum {
  JOIN_POSITION,
  JOIN_PARALLAX,
  JOIN_PM,
  JOIN_VMAG,
  JOIN_BMAG,
  JOIN_BV,
  JOIN_EBV,
  JOIN_VRAD,
  JOIN_SPTYPE,
  JOIN_STAR,
  N_JOINS
} Join;

static const char *const join_sql[N_JOINS] = {
  [JOIN_POSITION] = " LEFT JOIN measurements in_position ON in_position.id = d.m_position",
  [JOIN_PARALLAX] = " LEFT JOIN measurements in_parallax ON in_parallax.id = d.m_parallax",
  [JOIN_PM]       = " LEFT JOIN measurements in_pm ON in_pm.id = d.m_pm",
  [JOIN_VMAG]     = " LEFT JOIN measurements in_vmag ON in_vmag.id = d.m_vmag",
  [JOIN_BMAG]     = " LEFT JOIN measurements in_bmag ON in_bmag.id = d.m_bmag",
  [JOIN_BV]       = " LEFT JOIN measurements in_bv ON in_bv.id = d.m_bv",
  [JOIN_EBV]      = " LEFT JOIN measurements in_ebv ON in_ebv.id = d.m_ebv",
  [JOIN_VRAD]     = " LEFT JOIN measurements in_vrad ON in_vrad.id = d.m_vrad",
  [JOIN_SPTYPE]   = " LEFT JOIN measurements in_sptype ON in_sptype.id = d.m_sptype",
  [JOIN_STAR]     = " JOIN stars in_star ON in_star.id = d.star_id",
};

static const char *const join_alias[N_JOINS] = {
  "in_position", "in_parallax", "in_pm", "in_vmag", "in_bmag", "in_bv", "in_ebv", "in_vrad",
  "in_sptype", "in_star",
};

/* The join of each group of inputs (inputs.c), by the field that leads it. */
static Join
field_join (SlField field)
{
  switch (field == SL_FIELD_ID ? SL_FIELD_ID : sl_input_group_lead (field))
    {
    case SL_FIELD_ID:       return JOIN_STAR;
    case SL_FIELD_RA:       return JOIN_POSITION;
    case SL_FIELD_PARALLAX: return JOIN_PARALLAX;
    case SL_FIELD_PMRA:     return JOIN_PM;
    case SL_FIELD_VMAG:     return JOIN_VMAG;
    case SL_FIELD_BMAG:     return JOIN_BMAG;
    case SL_FIELD_BV:       return JOIN_BV;
    case SL_FIELD_EBV:      return JOIN_EBV;
    case SL_FIELD_VRAD:     return JOIN_VRAD;
    default:                return JOIN_SPTYPE;
    }
}

/* A name resolved to a column. */
typedef struct {
  char     sql[1024]; /* e.g. "d.teff_lo", "in_vmag.vmag", or a weighted mean (inputs.h) */
  gboolean is_text;
  Join     join;      /* N_JOINS: none (a column of derived) */
} Column;

/* POLICY NULL: each input as the row the derivation recorded (d.m_*);
 * otherwise, for a group POLICY averages, the mean (inputs.h). */
static gboolean
resolve_name (const char *name, const SlCombinePolicy *policy, Column *column)
{
  SlQuantity q;
  SlField f;

  column->join = N_JOINS;
  if (sl_quantity_from_name (name, &q))
    {
      column->is_text = sl_quantity_info (q)->is_text;
      g_snprintf (column->sql, sizeof column->sql, "d.%s", sl_quantity_info (q)->name);
      return TRUE;
    }
  if (sl_field_from_name (name, &f))
    {
      column->join = field_join (f);
      column->is_text = sl_field_info (f)->kind != SL_FIELD_KIND_VALUE
                        && sl_field_info (f)->kind != SL_FIELD_KIND_ERROR;
      if (policy != NULL && !column->is_text && f != SL_FIELD_ID)
        {
          g_autofree char *sql = sl_input_value_sql (policy, f, join_alias[column->join], "d.star_id");

          g_strlcpy (column->sql, sql, sizeof column->sql);
        }
      else
        g_snprintf (column->sql, sizeof column->sql, "%s.%s", join_alias[column->join],
                    f == SL_FIELD_ID ? "designation" : sl_field_info (f)->name);
      return TRUE;
    }
  /* NAME_lo and NAME_hi of a numeric derived quantity. */
  for (guint i = 0; i < 2; i++)
    {
      const char *suffix = i == 0 ? "_lo" : "_hi";
      gsize len = strlen (name);
      g_autofree char *base = NULL;

      if (len <= 3 || g_ascii_strcasecmp (name + len - 3, suffix) != 0)
        continue;
      base = g_strndup (name, len - 3);
      if (sl_quantity_from_name (base, &q) && !sl_quantity_info (q)->is_text)
        {
          column->is_text = FALSE;
          g_snprintf (column->sql, sizeof column->sql, "d.%s%s", sl_quantity_info (q)->name, suffix);
          return TRUE;
        }
    }
  return FALSE;
}

/* Every name in one line, for the message about an unknown one. */
static char *
known_names (void)
{
  GString *text = g_string_new (_("derived values"));

  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    g_string_append_printf (text, "%s%s", q == 0 ? " " : ", ", sl_quantity_info (q)->name);
  g_string_append (text, _(" (each number also as NAME_lo and NAME_hi); inputs"));
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    g_string_append_printf (text, "%s%s", f == 0 ? " " : ", ", sl_field_info (f)->name);
  g_string_append (text, _("; and flag:NAME"));
  return g_string_free (text, FALSE);
}

static char *
known_flags (void)
{
  GString *text = g_string_new (NULL);

  for (guint i = 0; i < SL_N_FLAGS; i++)
    g_string_append_printf (text, "%s, ", sl_flag_info (i)->name);
  g_string_append (text, "stale");
  return g_string_free (text, FALSE);
}

/* The edit distance between two short ASCII names, ignoring case. */
static guint
edit_distance (const char *a, const char *b)
{
  gsize la = strlen (a), lb = strlen (b);
  g_autofree guint *row = g_new (guint, lb + 1);

  for (gsize j = 0; j <= lb; j++)
    row[j] = (guint) j;
  for (gsize i = 1; i <= la; i++)
    {
      guint diagonal = row[0];

      row[0] = (guint) i;
      for (gsize j = 1; j <= lb; j++)
        {
          guint above = row[j];
          guint cost = g_ascii_tolower (a[i - 1]) != g_ascii_tolower (b[j - 1]);

          row[j] = MIN (MIN (row[j] + 1, row[j - 1] + 1), diagonal + cost);
          diagonal = above;
        }
    }
  return row[lb];
}

/* The known name closest to NAME if it is a likely slip, or NULL. */
static const char *
closest_name (const char *name)
{
  const char *best = NULL;
  guint best_distance = 3;   /* at most two edits */

  if (strlen (name) > 40)
    return NULL;
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      guint d = edit_distance (name, sl_quantity_info (q)->name);

      if (d < best_distance)
        best = sl_quantity_info (q)->name, best_distance = d;
    }
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      guint d = edit_distance (name, sl_field_info (f)->name);

      if (d < best_distance)
        best = sl_field_info (f)->name, best_distance = d;
    }
  return best;
}

/* ------------------------------------------------------------------ */
/* Tokens                                                             */

typedef enum {
  TOKEN_END,
  TOKEN_NAME,     /* a name or a keyword */
  TOKEN_FLAG,     /* flag:NAME; text is NAME */
  TOKEN_NUMBER,
  TOKEN_STRING,   /* text is unescaped */
  TOKEN_OP,
  TOKEN_OPEN,
  TOKEN_CLOSE,
} TokenKind;

typedef enum {
  OP_LT,
  OP_LE,
  OP_GT,
  OP_GE,
  OP_EQ,
  OP_NE,
  OP_CONTAINS,
} Op;

static const char *const op_sql[] = { "<", "<=", ">", ">=", "=", "<>", NULL };
static const char *const op_text[] = { "<", "<=", ">", ">=", "=", "!=", "~" };

typedef struct {
  TokenKind kind;
  gsize     start, end;   /* bytes of the condition's text */
  char     *text;
  double    number;
  Op        op;
} Token;

typedef struct {
  const char *text;
  gsize       pos;        /* bytes read */
  Token       token;      /* the current token */
  guint       depth;
  guint       n_terms;    /* comparisons and flags so far */
  GString    *where;
  GArray     *params;
  gboolean    joins[N_JOINS];
  const SlCombinePolicy *policy;
  GError    **error;
} Parser;

/* The column (characters from 1) of byte OFFSET. */
static glong
column_at (const Parser *p, gsize offset)
{
  return g_utf8_pointer_to_offset (p->text, p->text + offset) + 1;
}

static gboolean G_GNUC_PRINTF (3, 4)
fail_at (Parser *p, gsize offset, const char *format, ...)
{
  g_autofree char *message = NULL;
  va_list args;

  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  g_set_error (p->error, SL_ERROR, SL_ERROR_BAD_INPUT, _("at %ld: %s"), column_at (p, offset), message);
  return FALSE;
}

static gboolean
is_name_start (char c)
{
  return g_ascii_isalpha (c) || c == '_';
}

static gboolean
is_name_char (char c)
{
  return g_ascii_isalnum (c) || c == '_';
}

static gsize
scan_name (const char *text, gsize pos)
{
  while (is_name_char (text[pos]))
    pos++;
  return pos;
}

/* Reads the token at p->pos into p->token. */
static gboolean
next_token (Parser *p)
{
  const char *s = p->text;
  gsize i = p->pos;
  Token *t = &p->token;

  g_clear_pointer (&t->text, g_free);
  while (s[i] == ' ' || s[i] == '\t' || s[i] == '\n' || s[i] == '\r')
    i++;
  t->start = i;

  if (s[i] == '\0')
    t->kind = TOKEN_END;
  else if (s[i] == '(' || s[i] == ')')
    t->kind = s[i++] == '(' ? TOKEN_OPEN : TOKEN_CLOSE;
  else if (strchr ("<>=!~", s[i]))
    {
      t->kind = TOKEN_OP;
      if (s[i] == '<' || s[i] == '>')
        {
          gboolean equal = s[i + 1] == '=';

          t->op = s[i] == '<' ? (equal ? OP_LE : OP_LT) : (equal ? OP_GE : OP_GT);
          i += equal ? 2 : 1;
        }
      else if (s[i] == '=')
        t->op = OP_EQ, i++;
      else if (s[i] == '~')
        t->op = OP_CONTAINS, i++;
      else if (s[i + 1] == '=')
        t->op = OP_NE, i += 2;
      else
        return fail_at (p, i, _("'!' must be followed by '=': the negation is 'not'"));
    }
  else if (g_ascii_isdigit (s[i]) || s[i] == '.' || s[i] == '+' || s[i] == '-')
    {
      /* A number runs to the next blank, bracket or operator, so that a
       * slip such as '12.7.1' or '5000,5' is reported whole. */
      const char *reason;
      g_autofree char *lexeme = NULL;

      i++;
      while (g_ascii_isalnum (s[i]) || s[i] == '.' || s[i] == ',' || s[i] == '_'
             || ((s[i] == '+' || s[i] == '-') && (s[i - 1] == 'e' || s[i - 1] == 'E')))
        i++;
      lexeme = g_strndup (s + t->start, i - t->start);
      if (!sl_parse_number (lexeme, &t->number, &reason))
        return fail_at (p, t->start, _("'%s' is %s"), lexeme, _(reason));
      t->kind = TOKEN_NUMBER;
    }
  else if (s[i] == '"' || s[i] == '\'')
    {
      char quote = s[i++];
      GString *value = g_string_new (NULL);

      while (s[i] != quote)
        {
          if (s[i] == '\\' && s[i + 1] != '\0')
            i++;
          if (s[i] == '\0')
            {
              g_string_free (value, TRUE);
              return fail_at (p, t->start, _("the string that starts here has no closing %c"), quote);
            }
          g_string_append_c (value, s[i++]);
        }
      i++;
      t->kind = TOKEN_STRING;
      t->text = g_string_free (value, FALSE);
    }
  else if (is_name_start (s[i]))
    {
      i = scan_name (s, i);
      t->kind = TOKEN_NAME;
      t->text = g_strndup (s + t->start, i - t->start);
      if (g_ascii_strcasecmp (t->text, "flag") == 0 && s[i] == ':')
        {
          gsize name_start = i + 1;

          if (!is_name_start (s[name_start]))
            return fail_at (p, name_start, _("expected a flag's name after 'flag:'"));
          i = scan_name (s, name_start);
          g_free (t->text);
          t->text = g_strndup (s + name_start, i - name_start);
          t->kind = TOKEN_FLAG;
        }
    }
  else
    {
      gunichar c = g_utf8_get_char (s + i);
      char utf8[8] = { 0 };

      g_unichar_to_utf8 (c, utf8);
      return fail_at (p, i, _("unexpected character '%s'"), utf8);
    }
  t->end = i;
  p->pos = i;
  return TRUE;
}

static gboolean
is_keyword (const Token *t, const char *keyword)
{
  return t->kind == TOKEN_NAME && g_ascii_strcasecmp (t->text, keyword) == 0;
}

/* ------------------------------------------------------------------ */
/* Errors                                                             */

/* The current token as the user wrote it, for "got ...". */
static char *
describe_token (const Parser *p)
{
  g_autofree char *written = NULL;
  glong length;

  if (p->token.kind == TOKEN_END)
    return g_strdup (_("the end of the condition"));
  written = g_strndup (p->text + p->token.start, p->token.end - p->token.start);
  length = g_utf8_strlen (written, -1);
  if (length > 30)
    {
      g_autofree char *head = g_utf8_substring (written, 0, 27);

      return g_strdup_printf ("'%s...'", head);
    }
  return g_strdup_printf ("'%s'", written);
}

/* "at N: expected WHAT, got TOKEN" at the current token. */
static gboolean
fail_expected (Parser *p, const char *what)
{
  g_autofree char *got = describe_token (p);

  return fail_at (p, p->token.start, _("expected %s, got %s"), what, got);
}

/* ------------------------------------------------------------------ */
/* The grammar                                                        */

static gboolean parse_or (Parser *p);

static void
add_param (Parser *p, SlConditionParam param)
{
  g_array_append_val (p->params, param);
  g_string_append (p->where, "?");
}

/* NAME is missing | NAME is not missing | NAME OP literal; the current
 * token is the NAME. */
static gboolean
parse_comparison (Parser *p)
{
  g_autofree char *name = g_strdup (p->token.text);
  gsize name_start = p->token.start;
  Column column;
  Op op;

  if (!resolve_name (name, p->policy, &column))
    {
      g_autofree char *names = known_names ();
      const char *suggestion = closest_name (name);

      if (g_ascii_strcasecmp (name, "flag") == 0)
        return fail_at (p, name_start, _("a flag is tested as flag:NAME, e.g. flag:low_parallax_snr"));
      if (suggestion)
        return fail_at (p, name_start, _("unknown name '%s' (did you mean '%s'?); the names are: %s"),
                        name, suggestion, names);
      return fail_at (p, name_start, _("unknown name '%s'; the names are: %s"), name, names);
    }
  if (!next_token (p))
    return FALSE;
  if (column.join != N_JOINS)
    p->joins[column.join] = TRUE;

  if (is_keyword (&p->token, "is"))
    {
      gboolean negated = FALSE;

      if (!next_token (p))
        return FALSE;
      if (is_keyword (&p->token, "not"))
        {
          negated = TRUE;
          if (!next_token (p))
            return FALSE;
        }
      if (!is_keyword (&p->token, "missing"))
        {
          g_autofree char *what = g_strdup_printf (_("'missing' after '%s is%s'"), name,
                                                   negated ? " not" : "");

          return fail_expected (p, what);
        }
      g_string_append_printf (p->where, "%s IS %sNULL", column.sql, negated ? "NOT " : "");
      return next_token (p);
    }

  if (p->token.kind != TOKEN_OP)
    {
      g_autofree char *what = g_strdup_printf (_("a comparison after '%s'"), name);

      return fail_expected (p, what);
    }
  op = p->token.op;
  if (column.is_text && op != OP_EQ && op != OP_NE && op != OP_CONTAINS)
    return fail_at (p, p->token.start, _("'%s' is text: compare it with =, != or ~ (contains), not '%s'"),
                    name, op_text[op]);
  if (!column.is_text && op == OP_CONTAINS)
    return fail_at (p, p->token.start,
                    _("'~' (contains) applies to text (id, sptype, spclass), not to the number '%s'"), name);
  if (!next_token (p))
    return FALSE;

  if (column.is_text)
    {
      if (p->token.kind != TOKEN_STRING)
        {
          g_autofree char *what = g_strdup_printf (_("a quoted string after '%s %s'"), name, op_text[op]);

          return fail_expected (p, what);
        }
      if (op == OP_CONTAINS)
        {
          g_string_append_printf (p->where, "instr(lower(%s), lower(", column.sql);
          add_param (p, (SlConditionParam) { SL_CONDITION_PARAM_TEXT, 0, g_strdup (p->token.text), 0 });
          g_string_append (p->where, ")) > 0");
        }
      else
        {
          g_string_append_printf (p->where, "%s %s ", column.sql, op_sql[op]);
          add_param (p, (SlConditionParam) { SL_CONDITION_PARAM_TEXT, 0, g_strdup (p->token.text), 0 });
        }
    }
  else
    {
      if (p->token.kind != TOKEN_NUMBER)
        {
          g_autofree char *what = g_strdup_printf (_("a number after '%s %s'"), name, op_text[op]);

          return fail_expected (p, what);
        }
      g_string_append_printf (p->where, "%s %s ", column.sql, op_sql[op]);
      add_param (p, (SlConditionParam) { SL_CONDITION_PARAM_NUMBER, p->token.number, NULL, 0 });
    }
  return next_token (p);
}

static gboolean
parse_flag (Parser *p)
{
  if (g_ascii_strcasecmp (p->token.text, "stale") == 0)
    {
      g_string_append (p->where, "d.stale <> 0");
      return next_token (p);
    }
  for (guint i = 0; i < SL_N_FLAGS; i++)
    if (g_ascii_strcasecmp (p->token.text, sl_flag_info (i)->name) == 0)
      {
        g_string_append (p->where, "(d.flags & ");
        add_param (p, (SlConditionParam) { SL_CONDITION_PARAM_INTEGER, 0, NULL, sl_flag_info (i)->flag });
        g_string_append (p->where, ") <> 0");
        return next_token (p);
      }
  {
    g_autofree char *flags = known_flags ();

    return fail_at (p, p->token.start + strlen ("flag:"), _("unknown flag '%s'; the flags are: %s"),
                    p->token.text, flags);
  }
}

static gboolean
parse_primary (Parser *p)
{
  if (p->token.kind == TOKEN_OPEN)
    {
      gsize open = p->token.start;
      g_autofree char *what = NULL;

      if (!next_token (p) || !parse_or (p))
        return FALSE;
      if (p->token.kind == TOKEN_CLOSE)
        return next_token (p);
      what = g_strdup_printf (_("'and', 'or' or ')' to close the '(' at %ld"), column_at (p, open));
      return fail_expected (p, what);
    }
  if ((p->token.kind == TOKEN_FLAG || p->token.kind == TOKEN_NAME) && ++p->n_terms > MAX_TERMS)
    return fail_at (p, p->token.start, _("the condition has more than %d comparisons"), MAX_TERMS);
  if (p->token.kind == TOKEN_FLAG)
    return parse_flag (p);
  if (p->token.kind == TOKEN_NAME && !is_keyword (&p->token, "and") && !is_keyword (&p->token, "or")
      && !is_keyword (&p->token, "is") && !is_keyword (&p->token, "missing"))
    return parse_comparison (p);
  return fail_expected (p, _("a name, flag:NAME, 'not' or '('"));
}

static gboolean
parse_not (Parser *p)
{
  gboolean ok;

  if (++p->depth > MAX_DEPTH)
    return fail_at (p, p->token.start, _("the condition nests deeper than %d levels"), MAX_DEPTH);
  if (is_keyword (&p->token, "not"))
    {
      if (!next_token (p))
        return FALSE;
      g_string_append (p->where, "NOT (");
      ok = parse_not (p);
      g_string_append (p->where, ")");
    }
  else
    ok = parse_primary (p);
  p->depth--;
  return ok;
}

/* A chain of TERM joined by KEYWORD, emitted as (a OP b OP c) when it has
 * more than one term. */
static gboolean
parse_chain (Parser *p, gboolean (*term) (Parser *), const char *keyword, const char *sql)
{
  gsize start = p->where->len;
  gboolean chained = FALSE;

  if (!term (p))
    return FALSE;
  while (is_keyword (&p->token, keyword))
    {
      if (!chained)
        g_string_insert_c (p->where, start, '(');
      chained = TRUE;
      g_string_append (p->where, sql);
      if (!next_token (p) || !term (p))
        return FALSE;
    }
  if (chained)
    g_string_append_c (p->where, ')');
  return TRUE;
}

static gboolean
parse_and (Parser *p)
{
  return parse_chain (p, parse_not, "and", " AND ");
}

static gboolean
parse_or (Parser *p)
{
  return parse_chain (p, parse_and, "or", " OR ");
}

/* ------------------------------------------------------------------ */
/* The compiled form                                                  */

static void
param_clear (gpointer data)
{
  SlConditionParam *param = data;

  g_free (param->text);
}

SlCondition *
sl_condition_compile (const char *text, GError **error)
{
  return sl_condition_compile_for (text, NULL, error);
}

SlCondition *
sl_condition_compile_for (const char *text, const SlCombinePolicy *policy, GError **error)
{
  g_autoptr (SlCondition) condition = NULL;
  Parser p = { 0 };
  const char *invalid;
  gboolean ok;

  g_return_val_if_fail (text != NULL, NULL);

  if (!g_utf8_validate (text, -1, &invalid))
    {
      /* The valid text before the bad byte counts the column. */
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("at %ld: the condition is not valid UTF-8 here"),
                   g_utf8_pointer_to_offset (text, invalid) + 1);
      return NULL;
    }

  condition = g_new0 (SlCondition, 1);
  condition->text = g_strdup (text);
  condition->params = g_array_new (FALSE, TRUE, sizeof (SlConditionParam));
  g_array_set_clear_func (condition->params, param_clear);

  p.text = text;
  p.policy = policy;
  p.where = g_string_new (NULL);
  p.params = condition->params;
  p.error = error;
  ok = next_token (&p);
  if (ok && p.token.kind == TOKEN_END)
    ok = fail_at (&p, p.token.start, _("the condition is empty"));
  ok = ok && parse_or (&p);
  if (ok && p.token.kind != TOKEN_END)
    ok = fail_expected (&p, _("'and', 'or' or the end of the condition"));
  g_free (p.token.text);
  condition->where = g_string_free (p.where, !ok);
  if (!ok)
    return NULL;

  {
    GString *joins = g_string_new (NULL);

    for (Join j = 0; j < N_JOINS; j++)
      if (p.joins[j])
        g_string_append (joins, join_sql[j]);
    condition->joins = g_string_free (joins, FALSE);
  }
  return g_steal_pointer (&condition);
}

void
sl_condition_free (SlCondition *condition)
{
  if (condition == NULL)
    return;
  g_free (condition->text);
  g_free (condition->where);
  g_free (condition->joins);
  g_array_unref (condition->params);
  g_free (condition);
}

char *
sl_condition_select_sql (const SlCondition *condition)
{
  return g_strdup_printf ("SELECT d.star_id FROM derived d%s WHERE %s ORDER BY d.star_id",
                          condition->joins, condition->where);
}

void
sl_condition_bind (const SlCondition *condition, sqlite3_stmt *stmt, int first)
{
  for (guint i = 0; i < condition->params->len; i++)
    {
      const SlConditionParam *param = &g_array_index (condition->params, SlConditionParam, i);
      int index = first + (int) i;

      switch (param->kind)
        {
        case SL_CONDITION_PARAM_NUMBER:
          sqlite3_bind_double (stmt, index, param->number);
          break;
        case SL_CONDITION_PARAM_TEXT:
          sqlite3_bind_text (stmt, index, param->text, -1, SQLITE_TRANSIENT);
          break;
        default:
          sqlite3_bind_int64 (stmt, index, param->integer);
          break;
        }
    }
}

/* ------------------------------------------------------------------ */
/* For a builder                                                      */

static void
add_name (GArray *names, const char *name, SlConditionNameKind kind, const char *description, const char *unit,
          int bound)
{
  SlConditionName entry = { name, kind, description, unit ? unit : "", bound };

  g_array_append_val (names, entry);
}

GArray *
sl_condition_names (void)
{
  /* The interval bounds' names are built once: the array hands out
   * static strings. */
  static char *bounds[SL_N_QUANTITIES][2];
  static gsize made = 0;
  GArray *names = g_array_new (FALSE, FALSE, sizeof (SlConditionName));

  if (g_once_init_enter (&made))
    {
      for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
        if (!sl_quantity_info (q)->is_text)
          {
            bounds[q][0] = g_strconcat (sl_quantity_info (q)->name, "_lo", NULL);
            bounds[q][1] = g_strconcat (sl_quantity_info (q)->name, "_hi", NULL);
          }
      g_once_init_leave (&made, 1);
    }
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      Column column;

      const SlQuantityInfo *info = sl_quantity_info (q);

      if (!resolve_name (info->name, NULL, &column))
        continue;
      add_name (names, info->name, column.is_text ? SL_CONDITION_NAME_TEXT : SL_CONDITION_NAME_NUMBER,
                info->description, info->unit, 0);
      if (!column.is_text)
        {
          add_name (names, bounds[q][0], SL_CONDITION_NAME_NUMBER, info->description, info->unit, -1);
          add_name (names, bounds[q][1], SL_CONDITION_NAME_NUMBER, info->description, info->unit, +1);
        }
    }
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      Column column;

      /* A field that is also a quantity's name reaches the quantity. */
      const SlFieldInfo *info = sl_field_info (f);

      if (resolve_name (info->name, NULL, &column) && column.join != N_JOINS)
        add_name (names, info->name, column.is_text ? SL_CONDITION_NAME_TEXT : SL_CONDITION_NAME_NUMBER,
                  info->description, column.is_text ? "" : sl_unit_name (info->canonical), 0);
    }
  for (guint i = 0; i < SL_N_FLAGS; i++)
    add_name (names, sl_flag_info (i)->name, SL_CONDITION_NAME_FLAG, sl_flag_info (i)->explanation, "", 0);
  add_name (names, "stale", SL_CONDITION_NAME_FLAG,
            N_("The inputs or hand-set values changed since the star was derived."), "", 0);
  return names;
}

char *
sl_condition_quote (const char *text)
{
  GString *quoted = g_string_new ("'");

  g_return_val_if_fail (text != NULL, NULL);

  for (const char *p = text; *p; p++)
    {
      if (*p == '\\' || *p == '\'')
        g_string_append_c (quoted, '\\');
      g_string_append_c (quoted, *p);
    }
  g_string_append_c (quoted, '\'');
  return g_string_free (quoted, FALSE);
}
