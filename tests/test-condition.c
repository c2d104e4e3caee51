/* test-condition.c: the condition language of target lists: its SQL for
 * every operator, the precedence of and/or/not, parentheses, strings with
 * escapes, each mistake's message and position, and (STYLE.md, habit 9)
 * random conditions on a synthetic project checked against a plain
 * three-valued evaluator written here over the rows themselves. */
#include <locale.h>
#include <string.h>

#include "condition.h"
#include "derivation.h"
#include "import.h"
#include "inputs.h"
#include "sl-error.h"
#include "test-util.h"

/* ------------------------------------------------------------------ */
/* The compiled SQL                                                   */

static SlCondition *
compile_ok (const char *text)
{
  g_autoptr (GError) error = NULL;
  SlCondition *condition = sl_condition_compile (text, &error);

  if (condition == NULL)
    g_error ("%s: %s", text, error->message);
  return condition;
}

static void
assert_where (const char *text, const char *want)
{
  g_autoptr (SlCondition) condition = compile_ok (text);

  if (strcmp (condition->where, want) != 0)
    g_error ("%s:\n want %s\n got  %s", text, want, condition->where);
}

static void
test_numeric_operators (void)
{
  static const struct {
    const char *text, *where;
  } cases[] = {
    { "teff < 5000", "d.teff < ?" },
    { "teff <= 5000", "d.teff <= ?" },
    { "teff > 5000", "d.teff > ?" },
    { "teff >= 5000", "d.teff >= ?" },
    { "teff = 5000", "d.teff = ?" },
    { "teff != 5000", "d.teff <> ?" },
    { "teff<5000", "d.teff < ?" },   /* no blanks needed */
    { "teff>=5000", "d.teff >= ?" },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr (SlCondition) condition = compile_ok (cases[i].text);
      const SlConditionParam *param;

      g_assert_cmpstr (condition->where, ==, cases[i].where);
      g_assert_cmpstr (condition->joins, ==, "");
      g_assert_cmpuint (condition->params->len, ==, 1);
      param = &g_array_index (condition->params, SlConditionParam, 0);
      g_assert_cmpint (param->kind, ==, SL_CONDITION_PARAM_NUMBER);
      g_assert_cmpfloat (param->number, ==, 5000.0);
    }
}

static void
test_text_operators (void)
{
  g_autoptr (SlCondition) contains = compile_ok ("sptype ~ 'iii'");
  g_autoptr (SlCondition) id = compile_ok ("id = \"LHO 0004\"");

  assert_where ("spclass = 'G2V'", "d.spclass = ?");
  assert_where ("spclass != 'G2V'", "d.spclass <> ?");
  assert_where ("spclass ~ 'G'", "instr(lower(d.spclass), lower(?)) > 0");
  g_assert_cmpstr (contains->where, ==, "instr(lower(in_sptype.sptype), lower(?)) > 0");
  g_assert_cmpstr (contains->joins, ==, " LEFT JOIN measurements in_sptype ON in_sptype.id = d.m_sptype");
  g_assert_cmpstr (g_array_index (contains->params, SlConditionParam, 0).text, ==, "iii");
  g_assert_cmpstr (id->where, ==, "in_star.designation = ?");
  g_assert_cmpstr (id->joins, ==, " JOIN stars in_star ON in_star.id = d.star_id");
  g_assert_cmpint (g_array_index (id->params, SlConditionParam, 0).kind, ==, SL_CONDITION_PARAM_TEXT);
  g_assert_cmpstr (g_array_index (id->params, SlConditionParam, 0).text, ==, "LHO 0004");
}

/* Inputs resolve through the derived row's pointer to the measurements
 * row of their group (inputs.c): one join per group, whatever the number
 * of fields used from it. */
static void
test_input_names (void)
{
  g_autoptr (SlCondition) condition =
    compile_ok ("vmag < 8 and vmag_err < 0.1 and ra > 10 and epoch = 2016 and parallax_err < 1 and pmdec > 0");

  g_assert_cmpstr (condition->where, ==,
                   "(in_vmag.vmag < ? AND in_vmag.vmag_err < ? AND in_position.ra > ? AND "
                   "in_position.epoch = ? AND in_parallax.parallax_err < ? AND in_pm.pmdec > ?)");
  g_assert_cmpstr (condition->joins, ==,
                   " LEFT JOIN measurements in_position ON in_position.id = d.m_position"
                   " LEFT JOIN measurements in_parallax ON in_parallax.id = d.m_parallax"
                   " LEFT JOIN measurements in_pm ON in_pm.id = d.m_pm"
                   " LEFT JOIN measurements in_vmag ON in_vmag.id = d.m_vmag");
  g_assert_cmpuint (condition->params->len, ==, 6);
}

static void
test_interval_names (void)
{
  assert_where ("teff_lo > 5000 and dist_hi < 100", "(d.teff_lo > ? AND d.dist_hi < ?)");
  assert_where ("plx_snr_lo >= 5", "d.plx_snr_lo >= ?");
}

static void
test_case_insensitive (void)
{
  assert_where ("TEFF > 5000 AND Dist < 10 oR NOT VMAG Is Not MISSING",
                "((d.teff > ? AND d.dist < ?) OR NOT (in_vmag.vmag IS NOT NULL))");
  assert_where ("Flag:Low_Parallax_SNR", "(d.flags & ?) <> 0");
}

static void
test_precedence (void)
{
  /* not binds tighter than and, and tighter than or. */
  assert_where ("teff > 1 or dist < 2 and vmag < 3", "(d.teff > ? OR (d.dist < ? AND in_vmag.vmag < ?))");
  assert_where ("teff > 1 and dist < 2 or vmag < 3", "((d.teff > ? AND d.dist < ?) OR in_vmag.vmag < ?)");
  assert_where ("not teff > 1 and dist < 2", "(NOT (d.teff > ?) AND d.dist < ?)");
  assert_where ("not teff > 1 or dist < 2", "(NOT (d.teff > ?) OR d.dist < ?)");
  assert_where ("not not teff > 1", "NOT (NOT (d.teff > ?))");
  assert_where ("teff > 1 or dist < 2 or vmag < 3 and lum > 4 and radius < 5",
                "(d.teff > ? OR d.dist < ? OR (in_vmag.vmag < ? AND d.lum > ? AND d.radius < ?))");
}

static void
test_parentheses (void)
{
  g_autoptr (SlCondition) condition = compile_ok ("(teff > 1 or dist < 2) and vmag < 3");

  g_assert_cmpstr (condition->where, ==, "((d.teff > ? OR d.dist < ?) AND in_vmag.vmag < ?)");
  /* Parameters in the order they were written. */
  g_assert_cmpfloat (g_array_index (condition->params, SlConditionParam, 0).number, ==, 1.0);
  g_assert_cmpfloat (g_array_index (condition->params, SlConditionParam, 1).number, ==, 2.0);
  g_assert_cmpfloat (g_array_index (condition->params, SlConditionParam, 2).number, ==, 3.0);
  assert_where ("not (teff > 1 and dist < 2)", "NOT ((d.teff > ? AND d.dist < ?))");
  assert_where ("((teff > 1))", "d.teff > ?");
  assert_where ("( ( teff > 1 ) or ( ( dist < 2 ) ) )", "(d.teff > ? OR d.dist < ?)");
}

static void
test_missing (void)
{
  assert_where ("ebv is missing", "in_ebv.ebv IS NULL");
  assert_where ("ebv is not missing", "in_ebv.ebv IS NOT NULL");
  assert_where ("teff_lo is missing and spclass is not missing", "(d.teff_lo IS NULL AND d.spclass IS NOT NULL)");
}

static void
test_flags (void)
{
  g_autoptr (SlCondition) condition = compile_ok ("flag:teff_out_of_range or not flag:stale");
  const SlConditionParam *param = &g_array_index (condition->params, SlConditionParam, 0);

  g_assert_cmpstr (condition->where, ==, "((d.flags & ?) <> 0 OR NOT (d.stale <> 0))");
  g_assert_cmpint (param->kind, ==, SL_CONDITION_PARAM_INTEGER);
  g_assert_cmpint (param->integer, ==, SL_FLAG_TEFF_OUT_OF_RANGE);
}

static void
test_strings (void)
{
  static const struct {
    const char *text, *value;
  } cases[] = {
    { "id = \"LHO 0004\"", "LHO 0004" },
    { "id = 'LHO 0004'", "LHO 0004" },
    { "id = \"say \\\"hi\\\"\"", "say \"hi\"" },
    { "id = 'O\\'Neil'", "O'Neil" },
    { "id = \"it's\"", "it's" },
    { "id = 'a \"b\"'", "a \"b\"" },
    { "id = 'back\\\\slash'", "back\\slash" },
    { "id = '\\x'", "x" },             /* any character after a backslash is itself */
    { "id = ''", "" },
    { "id = 'α Cen – A'", "α Cen – A" },
    { "id = 'a and b or (c)'", "a and b or (c)" },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr (SlCondition) condition = compile_ok (cases[i].text);

      g_assert_cmpuint (condition->params->len, ==, 1);
      g_assert_cmpstr (g_array_index (condition->params, SlConditionParam, 0).text, ==, cases[i].value);
      g_assert_cmpstr (condition->where, ==, "in_star.designation = ?");
    }
}

/* A literal never reaches the SQL text, however it is written. */
static void
test_literals_are_parameters (void)
{
  g_autoptr (SlCondition) condition =
    compile_ok ("id = \"x'; DROP TABLE stars; --\" or sptype ~ 'G2' or teff > 1e3");

  g_assert_null (strstr (condition->where, "DROP"));
  g_assert_null (strstr (condition->where, "G2"));
  g_assert_null (strstr (condition->where, "1e3"));
  g_assert_null (strstr (condition->where, "1000"));
  g_assert_cmpuint (condition->params->len, ==, 3);
  g_assert_cmpstr (g_array_index (condition->params, SlConditionParam, 0).text, ==, "x'; DROP TABLE stars; --");
}

static void
test_numbers (void)
{
  static const struct {
    const char *text;
    double      value;
  } cases[] = {
    { "dist < 100", 100.0 },
    { "dist < 1e2", 100.0 },
    { "dist < 2.5E-1", 0.25 },
    { "absmag > -1.5", -1.5 },
    { "absmag > +.5", 0.5 },
    { "absmag > 5.", 5.0 },
    { "elat >-30", -30.0 },
  };
  const char *saved = setlocale (LC_NUMERIC, NULL);
  g_autofree char *restore = g_strdup (saved);

  /* A comma-decimal locale must not change what a number means. */
  setlocale (LC_NUMERIC, "de_DE.UTF-8");
  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr (SlCondition) condition = compile_ok (cases[i].text);

      sl_assert_close (g_array_index (condition->params, SlConditionParam, 0).number, cases[i].value, 0.0,
                       cases[i].text);
    }
  setlocale (LC_NUMERIC, restore);
}

/* Each mistake: the message names the column (characters from 1) and
 * what was expected there. */
static void
test_errors (void)
{
  static const struct {
    const char *text, *message;
  } cases[] = {
    { "teff > 5000 and banana", "at 17: unknown name 'banana'" },
    { "teff banana", "at 6: expected a comparison after 'teff', got 'banana'" },
    { "teff > 5000 and dist banana", "at 22: expected a comparison after 'dist', got 'banana'" },
    { "teff", "at 5: expected a comparison after 'teff', got the end of the condition" },
    { "teff >", "at 7: expected a number after 'teff >', got the end of the condition" },
    { "teff > 'hot'", "at 8: expected a number after 'teff >', got ''hot''" },
    { "teff > abc", "at 8: expected a number after 'teff >', got 'abc'" },
    { "teff > 12.7.1", "at 8: '12.7.1' is not a number" },
    { "teff > 5000,5", "at 8: '5000,5' is not a number (a decimal comma? use '.')" },
    { "teff ~ 'G'", "at 6: '~' (contains) applies to text (id, sptype, spclass), not to the number 'teff'" },
    { "sptype < 'G'", "at 8: 'sptype' is text: compare it with =, != or ~ (contains), not '<'" },
    { "sptype = G2V", "at 10: expected a quoted string after 'sptype =', got 'G2V'" },
    { "spclass ~ 5", "at 11: expected a quoted string after 'spclass ~', got '5'" },
    { "id = 'LHO", "at 6: the string that starts here has no closing '" },
    { "id = \"LHO\\\"", "at 6: the string that starts here has no closing \"" },
    { "teff > 1 dist < 2", "at 10: expected 'and', 'or' or the end of the condition, got 'dist'" },
    { "(teff > 1", "at 10: expected 'and', 'or' or ')' to close the '(' at 1, got the end of the condition" },
    { "teff > 1)", "at 9: expected 'and', 'or' or the end of the condition, got ')'" },
    { "teff > 1 and", "at 13: expected a name, flag:NAME, 'not' or '(', got the end of the condition" },
    { "and teff > 1", "at 1: expected a name, flag:NAME, 'not' or '(', got 'and'" },
    { "not", "at 4: expected a name, flag:NAME, 'not' or '(', got the end of the condition" },
    { "()", "at 2: expected a name, flag:NAME, 'not' or '(', got ')'" },
    { "", "at 1: the condition is empty" },
    { "   ", "at 4: the condition is empty" },
    { "ebv is", "at 7: expected 'missing' after 'ebv is', got the end of the condition" },
    { "ebv is not there", "at 12: expected 'missing' after 'ebv is not', got 'there'" },
    { "teff == 5000", "at 7: expected a number after 'teff =', got '='" },
    { "teff ! 5000", "at 6: '!' must be followed by '=': the negation is 'not'" },
    { "teff > 5000 & dist < 3", "at 13: unexpected character '&'" },
    { "teff > 5000 ∧ dist < 3", "at 13: unexpected character '∧'" },
    { "flag:", "at 6: expected a flag's name after 'flag:'" },
    { "flag:shiny", "at 6: unknown flag 'shiny'; the flags are: no_parallax_error, " },
    { "flag", "at 1: a flag is tested as flag:NAME, e.g. flag:low_parallax_snr" },
    { "spclass_lo > 1", "at 1: unknown name 'spclass_lo'" },
    { "vmag_lo > 1", "at 1: unknown name 'vmag_lo'" },
    { "tef > 5000", "at 1: unknown name 'tef' (did you mean 'teff'?); the names are: derived values plx_snr, dist," },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr (GError) error = NULL;
      g_autoptr (SlCondition) condition = sl_condition_compile (cases[i].text, &error);

      g_assert_null (condition);
      g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
      if (!g_str_has_prefix (error->message, cases[i].message))
        g_error ("%s:\n want %s...\n got  %s", cases[i].text, cases[i].message, error->message);
      g_assert_null (strchr (error->message, '\n'));
    }
}

/* An unknown name's message lists every name there is. */
static void
test_error_lists_names (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlCondition) condition = sl_condition_compile ("banana > 1", &error);

  g_assert_null (condition);
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    g_assert_nonnull (strstr (error->message, sl_quantity_info (q)->name));
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    g_assert_nonnull (strstr (error->message, sl_field_info (f)->name));
  g_assert_nonnull (strstr (error->message, "_lo"));
  g_assert_nonnull (strstr (error->message, "flag:NAME"));
}

static void
test_error_not_utf8 (void)
{
  g_autoptr (GError) error = NULL;

  g_assert_null (sl_condition_compile ("id = '\xff'", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_cmpstr (error->message, ==, "at 7: the condition is not valid UTF-8 here");
}

/* Columns count characters, not bytes. */
static void
test_error_position_in_characters (void)
{
  g_autoptr (GError) error = NULL;

  g_assert_null (sl_condition_compile ("id = 'α–β' and banana", &error));
  g_assert_true (g_str_has_prefix (error->message, "at 16: unknown name 'banana'"));
}

/* Nesting is bounded, so no condition can exhaust the stack. */
static void
test_depth (void)
{
  g_autoptr (GString) deep = g_string_new (NULL);
  g_autoptr (GString) fine = g_string_new (NULL);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlCondition) ok = NULL;

  for (int i = 0; i < 5000; i++)
    g_string_append (deep, "(not ");
  g_string_append (deep, "teff > 1");
  g_assert_null (sl_condition_compile (deep->str, &error));
  g_assert_true (strstr (error->message, "nests deeper than 32 levels") != NULL);

  for (int i = 0; i < 30; i++)
    g_string_append (fine, "(");
  g_string_append (fine, "teff > 1");
  for (int i = 0; i < 30; i++)
    g_string_append (fine, ")");
  ok = compile_ok (fine->str);
  g_assert_cmpstr (ok->where, ==, "d.teff > ?");
}

/* ------------------------------------------------------------------ */
/* A synthetic project                                                */

static const char *const sptypes[] = {
  "G2V", "K0III", "M4.5V", "A0 V", "F5IV-V", "B9.5Vn", "dM3e", "k2 iii", "G8 III–IV", "sdB",
};

/* A random value in [LO, HI] written to 6 decimals. */
static void
append_value (GString *row, double lo, double hi, double missing_probability)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  g_string_append_c (row, ',');
  if (g_test_rand_double () < missing_probability)
    return;
  g_string_append (row, g_ascii_formatd (buf, sizeof buf, "%.6f", g_test_rand_double_range (lo, hi)));
}

/* A CSV of stars FIRST .. FIRST + N - 1, every value missing now and
 * then; ranges chosen so that some stars raise flags (negative and low
 * S/N parallaxes, colours beyond the calibration). */
static char *
synthetic_csv (SlTestProject *f, const char *name, guint first, guint n)
{
  g_autoptr (GString) csv = g_string_new ("id,ra,ra_err,dec,dec_err,epoch,parallax,parallax_err,pmra,pmra_err,"
                                          "pmdec,pmdec_err,vmag,vmag_err,bmag,bmag_err,bv,bv_err,ebv,ebv_err,"
                                          "vrad,vrad_err,sptype\n");

  for (guint i = first; i < first + n; i++)
    {
      g_string_append_printf (csv, "SL-%03u", i);
      append_value (csv, 0, 359.9, 0.05);
      append_value (csv, 0.1, 50, 0.2);
      append_value (csv, -89, 89, 0.05);
      append_value (csv, 0.1, 50, 0.2);
      g_string_append (csv, g_test_rand_bit () ? ",2016" : ",2000");
      append_value (csv, -3, 150, 0.15);
      append_value (csv, 0.05, 4, 0.15);
      append_value (csv, -500, 500, 0.2);
      append_value (csv, 0.1, 5, 0.2);
      append_value (csv, -500, 500, 0.2);
      append_value (csv, 0.1, 5, 0.2);
      append_value (csv, -1, 15, 0.15);
      append_value (csv, 0.005, 0.1, 0.2);
      append_value (csv, -1, 16, 0.3);
      append_value (csv, 0.005, 0.1, 0.2);
      append_value (csv, -0.4, 2.0, 0.15);
      append_value (csv, 0.005, 0.05, 0.2);
      append_value (csv, -0.05, 0.5, 0.4);
      append_value (csv, 0.005, 0.05, 0.2);
      append_value (csv, -100, 100, 0.4);
      append_value (csv, 0.1, 5, 0.2);
      g_string_append_c (csv, ',');
      if (g_test_rand_double () > 0.3)
        g_string_append (csv, sptypes[g_test_rand_int_range (0, G_N_ELEMENTS (sptypes))]);
      g_string_append_c (csv, '\n');
    }
  return sl_test_write_file (f->dir, name, csv->str, -1);
}

static void
import_file (SlTestProject *f, const char *path)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;

  sl_import_options_init (&options);
  report = sl_import_csv (f->project, path, &options, &error);
  g_assert_no_error (error);
  g_assert_nonnull (report);
}

static void
derive (SlTestProject *f)
{
  g_autoptr (GError) error = NULL;
  SlDeriveParams params;
  SlDeriveReport report;

  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &report, &error));
  g_assert_no_error (error);
}

/* 90 stars from two sources (the second measures half of them again, so
 * which row each group of inputs comes from matters), derived; then 10
 * more stars that are never derived. */
static void
synthetic_project (SlTestProject *f)
{
  g_autofree char *first = synthetic_csv (f, "first.csv", 1, 90);
  g_autofree char *second = synthetic_csv (f, "second.csv", 46, 45);
  g_autofree char *third = synthetic_csv (f, "third.csv", 91, 10);

  import_file (f, first);
  import_file (f, second);
  derive (f);
  import_file (f, third);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM derived"), ==, 90);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM stars"), ==, 100);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM derived WHERE stale"), ==, 0);
}

/* The stars a compiled condition selects. */
static GArray *
select_ids (SlTestProject *f, const SlCondition *condition)
{
  g_autofree char *sql = sl_condition_select_sql (condition);
  GArray *ids = g_array_new (FALSE, FALSE, sizeof (gint64));
  sqlite3_stmt *stmt;
  int rc;

  if (sqlite3_prepare_v2 (f->db, sql, -1, &stmt, NULL) != SQLITE_OK)
    g_error ("%s: %s", sql, sqlite3_errmsg (f->db));
  sl_condition_bind (condition, stmt, 1);
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      gint64 id = sqlite3_column_int64 (stmt, 0);

      g_array_append_val (ids, id);
    }
  g_assert_cmpint (rc, ==, SQLITE_DONE);
  sqlite3_finalize (stmt);
  return ids;
}

/* At the limits of nesting and length, the worst shapes the compiler
 * accepts still make SQL that SQLite prepares and runs (its parser stack
 * and expression depth are bounded); one step beyond, the compiler says
 * so.  Fuzzing found "(a or not (a or not ( ..." overflowing SQLite's
 * parser at 18 levels. */
static void
test_limits_make_runnable_sql (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) mixed = g_string_new (NULL);
  g_autoptr (GString) nots = g_string_new (NULL);
  g_autoptr (GString) long_or = g_string_new ("teff > 0");
  g_autoptr (GString) too_long = NULL;
  g_autoptr (GError) error = NULL;
  int levels = 15;   /* two nesting levels each: '(' and 'not' */

  for (int i = 0; i < levels; i++)
    g_string_append (mixed, "(flag:low_parallax_snr or not ");
  g_string_append (mixed, "flag:stale");
  for (int i = 0; i < levels; i++)
    g_string_append_c (mixed, ')');
  for (int i = 0; i < 31; i++)
    g_string_append (nots, "not ");
  g_string_append (nots, "teff > 1");
  for (int i = 1; i < 128; i++)
    g_string_append_printf (long_or, " or (teff > %d and not vmag < 3)", i);
  g_string_append (long_or, " or vmag > 1");   /* the 256th comparison */

  {
    g_autoptr (SlCondition) a = compile_ok (mixed->str);
    g_autoptr (SlCondition) b = compile_ok (nots->str);
    g_autoptr (SlCondition) c = compile_ok (long_or->str);
    g_autoptr (GArray) ids_a = select_ids (f, a);
    g_autoptr (GArray) ids_b = select_ids (f, b);
    g_autoptr (GArray) ids_c = select_ids (f, c);
  }

  too_long = g_string_new (long_or->str);
  g_string_append (too_long, " or teff > 9");
  g_assert_null (sl_condition_compile (too_long->str, &error));
  g_assert_true (strstr (error->message, "more than 256 comparisons") != NULL);
}

static guint
count_selected (SlTestProject *f, const char *text)
{
  g_autoptr (SlCondition) condition = compile_ok (text);
  g_autoptr (GArray) ids = select_ids (f, condition);

  return ids->len;
}

/* ------------------------------------------------------------------ */
/* The reference: every name's value per star, read from the rows, and a
 * three-valued evaluator                                              */

typedef struct {
  char    *name;
  gboolean is_text;
  gboolean derived;   /* a column of derived, else an input field */
  SlField  field;
  char    *column;    /* in derived */
} RefName;

typedef struct {
  gint64   id;
  gboolean derived;
  gboolean stale;
  guint32  flags;
  double  *number;   /* by RefName; NAN: missing */
  char   **text;     /* by RefName; NULL: missing */
} RefStar;

typedef struct {
  GPtrArray *names;  /* RefName */
  GArray    *stars;  /* RefStar, by id */
} Reference;

static void
ref_add_name (GPtrArray *names, const char *name, gboolean is_text, gboolean derived, SlField field)
{
  RefName *n = g_new0 (RefName, 1);

  n->name = g_strdup (name);
  n->is_text = is_text;
  n->derived = derived;
  n->field = field;
  n->column = g_strdup (name);
  g_ptr_array_add (names, n);
}

static void
ref_name_free (RefName *n)
{
  g_free (n->name);
  g_free (n->column);
  g_free (n);
}

static void
reference_free (Reference *ref)
{
  for (guint i = 0; i < ref->stars->len; i++)
    {
      RefStar *s = &g_array_index (ref->stars, RefStar, i);

      g_free (s->number);
      for (guint k = 0; k < ref->names->len; k++)
        g_free (s->text[k]);
      g_free (s->text);
    }
  g_array_unref (ref->stars);
  g_ptr_array_unref (ref->names);
  g_free (ref);
}

G_DEFINE_AUTOPTR_CLEANUP_FUNC (Reference, reference_free)

/* Inputs as inputs.c chooses them among each star's measurements (not
 * through the derived row's pointers, which is what the SQL uses), the
 * derived values as stored. */
static Reference *
reference_load (SlTestProject *f)
{
  Reference *ref = g_new0 (Reference, 1);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlInputCursor) cursor = NULL;
  g_autoptr (GHashTable) by_id = g_hash_table_new (g_int64_hash, g_int64_equal);
  SlStarInputs in;
  sqlite3_stmt *stmt;

  ref->names = g_ptr_array_new_with_free_func ((GDestroyNotify) ref_name_free);
  ref->stars = g_array_new (FALSE, TRUE, sizeof (RefStar));
  for (SlQuantity q = 0; q < SL_N_QUANTITIES; q++)
    {
      const char *name = sl_quantity_info (q)->name;

      ref_add_name (ref->names, name, sl_quantity_info (q)->is_text, TRUE, SL_FIELD_NONE);
      if (!sl_quantity_info (q)->is_text)
        {
          g_autofree char *lo = g_strconcat (name, "_lo", NULL);
          g_autofree char *hi = g_strconcat (name, "_hi", NULL);

          ref_add_name (ref->names, lo, FALSE, TRUE, SL_FIELD_NONE);
          ref_add_name (ref->names, hi, FALSE, TRUE, SL_FIELD_NONE);
        }
    }
  for (SlField fld = 0; fld < SL_N_FIELDS; fld++)
    {
      SlFieldKind kind = sl_field_info (fld)->kind;

      ref_add_name (ref->names, sl_field_info (fld)->name,
                    kind == SL_FIELD_KIND_TEXT || kind == SL_FIELD_KIND_IDENTIFIER, FALSE, fld);
    }

  cursor = sl_input_cursor_new (f->project, 0, &error);
  g_assert_no_error (error);
  while (sl_input_cursor_next (cursor, &in, &error))
    {
      RefStar s = { in.star_id, FALSE, FALSE, 0, NULL, NULL };

      s.number = g_new (double, ref->names->len);
      s.text = g_new0 (char *, ref->names->len);
      for (guint k = 0; k < ref->names->len; k++)
        {
          const RefName *n = ref->names->pdata[k];

          s.number[k] = NAN;
          if (n->derived)
            continue;
          if (n->field == SL_FIELD_ID)
            s.text[k] = g_strdup (in.designation);
          else if (n->field == SL_FIELD_SPTYPE)
            s.text[k] = g_strdup (in.sptype);
          else if (in.present[n->field])
            s.number[k] = in.value[n->field];
        }
      g_array_append_val (ref->stars, s);
    }
  g_assert_no_error (error);
  for (guint i = 0; i < ref->stars->len; i++)
    g_hash_table_insert (by_id, &g_array_index (ref->stars, RefStar, i).id,
                         &g_array_index (ref->stars, RefStar, i));

  g_assert_cmpint (sqlite3_prepare_v2 (f->db, "SELECT * FROM derived", -1, &stmt, NULL), ==, SQLITE_OK);
  while (sqlite3_step (stmt) == SQLITE_ROW)
    {
      gint64 id = sqlite3_column_int64 (stmt, 0);
      RefStar *s = g_hash_table_lookup (by_id, &id);

      g_assert_nonnull (s);
      s->derived = TRUE;
      for (int c = 0; c < sqlite3_column_count (stmt); c++)
        {
          const char *column = sqlite3_column_name (stmt, c);

          if (strcmp (column, "stale") == 0)
            s->stale = sqlite3_column_int (stmt, c) != 0;
          else if (strcmp (column, "flags") == 0)
            s->flags = (guint32) sqlite3_column_int64 (stmt, c);
          for (guint k = 0; k < ref->names->len; k++)
            {
              const RefName *n = ref->names->pdata[k];

              if (!n->derived || strcmp (n->column, column) != 0
                  || sqlite3_column_type (stmt, c) == SQLITE_NULL)
                continue;
              if (n->is_text)
                s->text[k] = g_strdup ((const char *) sqlite3_column_text (stmt, c));
              else
                s->number[k] = sqlite3_column_double (stmt, c);
            }
        }
    }
  sqlite3_finalize (stmt);
  return ref;
}

typedef enum {
  NODE_OR,
  NODE_AND,
  NODE_NOT,
  NODE_COMPARE,
  NODE_MISSING,
  NODE_FLAG,
} NodeKind;

typedef enum {
  OP_LT, OP_LE, OP_GT, OP_GE, OP_EQ, OP_NE, OP_CONTAINS,
} TestOp;

static const char *const test_op_text[] = { "<", "<=", ">", ">=", "=", "!=", "~" };

typedef struct Node {
  NodeKind     kind;
  struct Node *a, *b;
  guint        name;      /* RefName index */
  TestOp       op;
  double       number;
  char        *text;
  gboolean     negated;   /* is not missing */
  int          flag;      /* flag index, SL_N_FLAGS: stale */
} Node;

static void
node_free (Node *node)
{
  if (node == NULL)
    return;
  node_free (node->a);
  node_free (node->b);
  g_free (node->text);
  g_free (node);
}

G_DEFINE_AUTOPTR_CLEANUP_FUNC (Node, node_free)

/* Three-valued logic as SQL has it: UNKNOWN for a missing value. */
typedef enum { NO, YES, UNKNOWN } Truth;

static Truth
truth (gboolean b)
{
  return b ? YES : NO;
}

static Truth
evaluate (const Reference *ref, const Node *node, const RefStar *s)
{
  const RefName *n;
  Truth a, b;

  switch (node->kind)
    {
    case NODE_OR:
      a = evaluate (ref, node->a, s), b = evaluate (ref, node->b, s);
      return a == YES || b == YES ? YES : a == UNKNOWN || b == UNKNOWN ? UNKNOWN : NO;
    case NODE_AND:
      a = evaluate (ref, node->a, s), b = evaluate (ref, node->b, s);
      return a == NO || b == NO ? NO : a == UNKNOWN || b == UNKNOWN ? UNKNOWN : YES;
    case NODE_NOT:
      a = evaluate (ref, node->a, s);
      return a == UNKNOWN ? UNKNOWN : a == YES ? NO : YES;
    case NODE_FLAG:
      return truth (node->flag == SL_N_FLAGS ? s->stale : (s->flags & sl_flag_info (node->flag)->flag) != 0);
    case NODE_MISSING:
      n = ref->names->pdata[node->name];
      return truth ((n->is_text ? s->text[node->name] == NULL : isnan (s->number[node->name])) == !node->negated);
    default:
      break;
    }

  n = ref->names->pdata[node->name];
  if (n->is_text)
    {
      const char *value = s->text[node->name];

      if (value == NULL)
        return UNKNOWN;
      if (node->op == OP_CONTAINS)
        {
          g_autofree char *haystack = g_ascii_strdown (value, -1);
          g_autofree char *needle = g_ascii_strdown (node->text, -1);

          return truth (strstr (haystack, needle) != NULL);
        }
      return truth ((strcmp (value, node->text) == 0) == (node->op == OP_EQ));
    }
  else
    {
      double x = s->number[node->name], y = node->number;

      if (isnan (x))
        return UNKNOWN;
      switch (node->op)
        {
        case OP_LT: return truth (x < y);
        case OP_LE: return truth (x <= y);
        case OP_GT: return truth (x > y);
        case OP_GE: return truth (x >= y);
        case OP_EQ: return truth (x == y);
        default:    return truth (x != y);
        }
    }
}

/* A value of the name some star has (so that = and the bounds are hit),
 * or none. */
static const RefStar *
random_star (const Reference *ref)
{
  return &g_array_index (ref->stars, RefStar, g_test_rand_int_range (0, ref->stars->len));
}

static Node *
random_leaf (const Reference *ref)
{
  Node *node = g_new0 (Node, 1);
  const RefName *n;
  const RefStar *s;
  double r = g_test_rand_double ();

  node->name = g_test_rand_int_range (0, ref->names->len);
  n = ref->names->pdata[node->name];
  if (r < 0.1)
    {
      node->kind = NODE_FLAG;
      node->flag = g_test_rand_int_range (0, SL_N_FLAGS + 1);
      return node;
    }
  if (r < 0.2)
    {
      node->kind = NODE_MISSING;
      node->negated = g_test_rand_bit ();
      return node;
    }

  node->kind = NODE_COMPARE;
  s = random_star (ref);
  if (n->is_text)
    {
      const char *value = s->text[node->name];

      node->op = (TestOp[]) { OP_EQ, OP_NE, OP_CONTAINS }[g_test_rand_int_range (0, 3)];
      if (value == NULL)
        value = "G2";
      if (node->op == OP_CONTAINS)
        {
          /* A piece of the value, its letters' case shuffled. */
          glong length = g_utf8_strlen (value, -1);
          glong start = g_test_rand_int_range (0, length + 1);
          glong end = g_test_rand_int_range (start, length + 1);

          node->text = g_utf8_substring (value, start, end);
          for (char *p = node->text; *p; p++)
            if (g_test_rand_bit ())
              *p = g_ascii_isupper (*p) ? g_ascii_tolower (*p) : g_ascii_toupper (*p);
        }
      else
        node->text = g_strdup (g_test_rand_double () < 0.8 ? value : "no such value");
    }
  else
    {
      double value = s->number[node->name];

      node->op = g_test_rand_int_range (OP_LT, OP_NE + 1);
      if (isnan (value))
        value = g_test_rand_double_range (-10, 10);
      else if (g_test_rand_double () < 0.3)
        value += g_test_rand_double_range (-1, 1) * fabs (value) * 0.1;
      node->number = value;
    }
  return node;
}

static Node *
random_node (const Reference *ref, int depth)
{
  double r = g_test_rand_double ();
  Node *node;

  if (depth <= 0 || r < 0.3)
    return random_leaf (ref);
  node = g_new0 (Node, 1);
  if (r < 0.45)
    {
      node->kind = NODE_NOT;
      node->a = random_node (ref, depth - 1);
      return node;
    }
  node->kind = r < 0.72 ? NODE_AND : NODE_OR;
  node->a = random_node (ref, depth - 1);
  node->b = random_node (ref, depth - 1);
  return node;
}

static void
append_case_shuffled (GString *text, const char *word)
{
  for (const char *p = word; *p; p++)
    g_string_append_c (text, g_test_rand_int_range (0, 4) == 0 ? g_ascii_toupper (*p) : *p);
}

static void
append_blanks (GString *text, gboolean at_least_one)
{
  int n = g_test_rand_int_range (at_least_one ? 1 : 0, 3);

  for (int i = 0; i < n; i++)
    g_string_append_c (text, g_test_rand_int_range (0, 5) == 0 ? '\t' : ' ');
}

/* The binding strength of what a node renders as. */
static int
precedence (const Node *node)
{
  switch (node->kind)
    {
    case NODE_OR:  return 1;
    case NODE_AND: return 2;
    case NODE_NOT: return 3;
    default:       return 4;
    }
}

static void render (GString *text, const Node *node);

/* A child in parentheses when the grammar needs them, and now and then
 * when it does not. */
static void
render_child (GString *text, const Node *child, int parent_precedence)
{
  gboolean parens = precedence (child) < parent_precedence || g_test_rand_int_range (0, 8) == 0;

  if (parens)
    {
      g_string_append_c (text, '(');
      append_blanks (text, FALSE);
    }
  render (text, child);
  if (parens)
    {
      append_blanks (text, FALSE);
      g_string_append_c (text, ')');
    }
}

static void
render_string (GString *text, const char *value)
{
  char quote = g_test_rand_bit () ? '"' : '\'';

  g_string_append_c (text, quote);
  for (const char *p = value; *p; p++)
    {
      /* Escape what must be, and now and then a character that need not. */
      if (*p == quote || *p == '\\' || (g_ascii_isalpha (*p) && g_test_rand_int_range (0, 10) == 0))
        g_string_append_c (text, '\\');
      g_string_append_c (text, *p);
    }
  g_string_append_c (text, quote);
}

static const Reference *render_ref;

static void
render (GString *text, const Node *node)
{
  const RefName *n;
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  switch (node->kind)
    {
    case NODE_OR:
    case NODE_AND:
      render_child (text, node->a, precedence (node));
      append_blanks (text, TRUE);
      append_case_shuffled (text, node->kind == NODE_OR ? "or" : "and");
      append_blanks (text, TRUE);
      render_child (text, node->b, precedence (node) + 1);
      return;
    case NODE_NOT:
      append_case_shuffled (text, "not");
      append_blanks (text, TRUE);
      render_child (text, node->a, precedence (node));
      return;
    case NODE_FLAG:
      append_case_shuffled (text, "flag:");
      append_case_shuffled (text, node->flag == SL_N_FLAGS ? "stale" : sl_flag_info (node->flag)->name);
      return;
    default:
      break;
    }
  n = render_ref->names->pdata[node->name];
  append_case_shuffled (text, n->name);
  append_blanks (text, node->kind == NODE_MISSING);
  if (node->kind == NODE_MISSING)
    {
      append_case_shuffled (text, node->negated ? "is not" : "is");
      append_blanks (text, TRUE);
      append_case_shuffled (text, "missing");
      return;
    }
  g_string_append (text, test_op_text[node->op]);
  append_blanks (text, FALSE);
  if (n->is_text)
    render_string (text, node->text);
  else
    /* 17 digits: the number read back is the same double. */
    g_string_append (text, g_ascii_formatd (buf, sizeof buf, "%.17g", node->number));
}

static void
test_random_against_reference (SlTestProject *f, gconstpointer data)
{
  g_autoptr (Reference) ref = NULL;
  guint n_conditions = g_test_thorough () ? 20000 : 2000;
  guint selected_some = 0, selected_none = 0;

  synthetic_project (f);
  ref = reference_load (f);
  render_ref = ref;
  for (guint i = 0; i < n_conditions; i++)
    {
      g_autoptr (Node) tree = random_node (ref, g_test_rand_int_range (0, 5));
      g_autoptr (GString) text = g_string_new (NULL);
      g_autoptr (SlCondition) condition = NULL;
      g_autoptr (GArray) ids = NULL;
      guint k = 0;

      append_blanks (text, FALSE);
      render (text, tree);
      append_blanks (text, FALSE);
      condition = compile_ok (text->str);
      ids = select_ids (f, condition);
      for (guint j = 0; j < ref->stars->len; j++)
        {
          const RefStar *s = &g_array_index (ref->stars, RefStar, j);
          gboolean want = s->derived && evaluate (ref, tree, s) == YES;
          gboolean got = k < ids->len && g_array_index (ids, gint64, k) == s->id;

          if (got)
            k++;
          if (want != got)
            g_error ("condition %s\n  SQL %s%s\n  star %" G_GINT64_FORMAT ": reference %s, SQL %s",
                     text->str, condition->joins, condition->where, s->id, want ? "selects" : "leaves",
                     got ? "selects" : "leaves");
        }
      g_assert_cmpuint (k, ==, ids->len);
      if (ids->len > 0)
        selected_some++;
      else
        selected_none++;
    }
  /* The conditions were not all trivially empty or full. */
  g_assert_cmpuint (selected_some, >, n_conditions / 10);
  g_assert_cmpuint (selected_none, >, n_conditions / 20);
  render_ref = NULL;
}

/* Random token soup: the parser either compiles it into SQL that SQLite
 * accepts, or says where it went wrong; it never crashes. */
static void
test_random_garbage (SlTestProject *f, gconstpointer data)
{
  static const char *const pieces[] = {
    "teff", "dist_lo", "vmag", "sptype", "id", "flag:stale", "flag:overridden", "flag:", "and", "or", "not",
    "is", "missing", "(", ")", "<", "<=", ">", ">=", "=", "!=", "~", "!", "5000", "-1.5e3", "1.2.3",
    "'G2'", "\"a\\\"b\"", "'open", "banana", " ", " ", "  ", "é", "\t",
  };

  synthetic_project (f);
  for (guint i = 0; i < 3000; i++)
    {
      g_autoptr (GString) text = g_string_new (NULL);
      g_autoptr (GError) error = NULL;
      g_autoptr (SlCondition) condition = NULL;
      int n = g_test_rand_int_range (0, 12);

      for (int k = 0; k < n; k++)
        g_string_append (text, pieces[g_test_rand_int_range (0, G_N_ELEMENTS (pieces))]);
      condition = sl_condition_compile (text->str, &error);
      if (condition)
        {
          g_autoptr (GArray) ids = select_ids (f, condition);

          g_assert_cmpuint (ids->len, <=, 90);
        }
      else
        {
          const char *after = error->message + strlen ("at ");
          guint64 column;
          char *end;

          if (g_str_has_suffix (error->message, "not valid UTF-8 here"))
            continue;
          g_assert_true (g_str_has_prefix (error->message, "at "));
          column = g_ascii_strtoull (after, &end, 10);
          g_assert_true (*end == ':');
          g_assert_cmpuint (column, >=, 1);
          g_assert_cmpuint (column, <=, (guint64) g_utf8_strlen (text->str, -1) + 1);
        }
    }
}

/* ------------------------------------------------------------------ */
/* Which stars a condition sees                                       */

/* Never-derived stars have no values to test: even a condition on an
 * input they have does not select them. */
static void
test_underived_never_selected (SlTestProject *f, gconstpointer data)
{
  synthetic_project (f);
  g_assert_cmpuint (count_selected (f, "id ~ 'SL-'"), ==, 90);
  g_assert_cmpuint (count_selected (f, "id = 'SL-095'"), ==, 0);
  g_assert_cmpuint (count_selected (f, "id = 'SL-045'"), ==, 1);
  g_assert_cmpuint (count_selected (f, "dec is not missing or dec is missing"), ==, 90);
}

/* A missing value satisfies no comparison, and neither does its
 * negation; 'is missing' finds it. */
static void
test_missing_semantics (SlTestProject *f, gconstpointer data)
{
  g_autofree char *input = sl_test_write_file (f->dir, "in.csv",
                                               "id,parallax,parallax_err,vmag,vmag_err,bv,bv_err\n"
                                               "A,10,0.1,5,0.01,0.6,0.01\n"
                                               "B,10,0.1,,,0.6,0.01\n", -1);

  import_file (f, input);
  derive (f);
  g_assert_cmpuint (count_selected (f, "vmag < 100"), ==, 1);
  g_assert_cmpuint (count_selected (f, "vmag >= 100"), ==, 0);
  g_assert_cmpuint (count_selected (f, "not vmag >= 100"), ==, 1);
  g_assert_cmpuint (count_selected (f, "vmag != 3"), ==, 1);
  g_assert_cmpuint (count_selected (f, "vmag is missing"), ==, 1);
  g_assert_cmpuint (count_selected (f, "vmag is missing or vmag < 100"), ==, 2);
  g_assert_cmpuint (count_selected (f, "absmag is missing"), ==, 1);
  g_assert_cmpuint (count_selected (f, "dist = 100"), ==, 2);
  g_assert_cmpuint (count_selected (f, "id = 'B' and teff > 0 and lum is missing"), ==, 1);
}

/* A stale row is tested as stored: by the values and the measurements it
 * was derived from, and flag:stale finds it. */
static void
test_stale_as_stored (SlTestProject *f, gconstpointer data)
{
  g_autofree char *first = sl_test_write_file (f->dir, "first.csv",
                                               "id,parallax,parallax_err,vmag,vmag_err\nA,10,0.1,5,0.01\n", -1);
  g_autofree char *second = sl_test_write_file (f->dir, "second.csv",
                                                "id,parallax,parallax_err,vmag,vmag_err\nA,20,0.05,6,0.005\n", -1);

  import_file (f, first);
  derive (f);
  import_file (f, second);
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT stale FROM derived"), ==, 1);
  g_assert_cmpuint (count_selected (f, "flag:stale"), ==, 1);
  g_assert_cmpuint (count_selected (f, "parallax = 10 and vmag = 5 and dist = 100"), ==, 1);
  g_assert_cmpuint (count_selected (f, "parallax = 20"), ==, 0);
  derive (f);
  g_assert_cmpuint (count_selected (f, "flag:stale"), ==, 0);
  g_assert_cmpuint (count_selected (f, "parallax = 20 and vmag = 6 and dist = 50"), ==, 1);
}

/* Every name a builder offers compiles with the operators of its kind,
 * and with no other; each name is offered once; the tables' names are all
 * there (a quantity, its bounds, an input, id, a flag, stale). */
static void
test_builder_names (void)
{
  static const char *const wanted[] = { "teff", "teff_lo", "teff_hi", "dist", "vmag", "vmag_err", "ra",
                                        "sptype", "id", "low_parallax_snr", "stale", NULL };
  g_autoptr (GArray) names = sl_condition_names ();
  g_autoptr (GHashTable) seen = g_hash_table_new (g_str_hash, g_str_equal);

  g_assert_cmpuint (names->len, >, 30);
  for (guint i = 0; i < names->len; i++)
    {
      const SlConditionName *n = &g_array_index (names, SlConditionName, i);
      g_autofree char *good = NULL;
      g_autofree char *bad = NULL;
      g_autoptr (SlCondition) condition = NULL;
      g_autoptr (SlCondition) wrong = NULL;
      g_autoptr (GError) error = NULL;

      g_assert_false (g_hash_table_contains (seen, n->name));
      g_hash_table_add (seen, (gpointer) n->name);
      /* Each says what it is; a bound says which. */
      g_assert_nonnull (n->description);
      g_assert_cmpuint (strlen (n->description), >, 3);
      g_assert_nonnull (n->unit);
      g_assert_cmpint (n->bound, ==, g_str_has_suffix (n->name, "_lo") ? -1 : g_str_has_suffix (n->name, "_hi") ? 1 : 0);
      switch (n->kind)
        {
        case SL_CONDITION_NAME_NUMBER:
          good = g_strdup_printf ("%s >= 1.5 and %s is not missing", n->name, n->name);
          bad = g_strdup_printf ("%s ~ 'x'", n->name);
          break;
        case SL_CONDITION_NAME_TEXT:
          good = g_strdup_printf ("%s ~ 'V' or %s is missing", n->name, n->name);
          bad = g_strdup_printf ("%s < 3", n->name);
          break;
        default:
          good = g_strdup_printf ("not flag:%s", n->name);
          bad = g_strdup_printf ("%s < 3", n->name);
          break;
        }
      condition = sl_condition_compile (good, &error);
      if (condition == NULL)
        g_error ("%s: %s", good, error->message);
      wrong = sl_condition_compile (bad, &error);
      g_assert_null (wrong);
      g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
    }
  for (guint i = 0; wanted[i]; i++)
    if (!g_hash_table_contains (seen, wanted[i]))
      g_error ("the builder's names lack %s", wanted[i]);
  for (guint i = 0; i < names->len; i++)
    {
      const SlConditionName *n = &g_array_index (names, SlConditionName, i);

      if (strcmp (n->name, "dist") == 0)
        g_assert_cmpstr (n->unit, ==, "pc");
      if (strcmp (n->name, "vmag") == 0)
        g_assert_cmpstr (n->unit, ==, "mag");
    }
}

/* A quoted string reads back as the text, quotes and backslashes
 * included. */
static void
test_quote (void)
{
  static const char *const texts[] = { "G2V", "", "it's", "a\\b", "'\"'", "Ærø", NULL };

  for (guint i = 0; texts[i]; i++)
    {
      g_autofree char *quoted = sl_condition_quote (texts[i]);
      g_autofree char *text = g_strdup_printf ("sptype = %s", quoted);
      g_autoptr (SlCondition) condition = compile_ok (text);

      g_assert_cmpuint (condition->params->len, ==, 1);
      g_assert_cmpstr (g_array_index (condition->params, SlConditionParam, 0).text, ==, texts[i]);
    }
  {
    g_autofree char *quoted = sl_condition_quote ("it's");

    g_assert_cmpstr (quoted, ==, "'it\\'s'");
  }
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/condition/operators/numeric", test_numeric_operators);
  g_test_add_func ("/condition/operators/text", test_text_operators);
  g_test_add_func ("/condition/names/inputs", test_input_names);
  g_test_add_func ("/condition/names/intervals", test_interval_names);
  g_test_add_func ("/condition/names/case-insensitive", test_case_insensitive);
  g_test_add_func ("/condition/precedence", test_precedence);
  g_test_add_func ("/condition/parentheses", test_parentheses);
  g_test_add_func ("/condition/missing", test_missing);
  g_test_add_func ("/condition/flags", test_flags);
  g_test_add_func ("/condition/strings", test_strings);
  g_test_add_func ("/condition/builder/names", test_builder_names);
  g_test_add_func ("/condition/builder/quote", test_quote);
  g_test_add_func ("/condition/literals-are-parameters", test_literals_are_parameters);
  g_test_add_func ("/condition/numbers", test_numbers);
  g_test_add_func ("/condition/errors/messages", test_errors);
  g_test_add_func ("/condition/errors/lists-names", test_error_lists_names);
  g_test_add_func ("/condition/errors/not-utf8", test_error_not_utf8);
  g_test_add_func ("/condition/errors/position-in-characters", test_error_position_in_characters);
  g_test_add_func ("/condition/errors/depth", test_depth);
  g_test_add ("/condition/select/random-against-reference", SlTestProject, NULL, sl_test_project_set_up,
              test_random_against_reference, sl_test_project_tear_down);
  g_test_add ("/condition/select/random-garbage", SlTestProject, NULL, sl_test_project_set_up,
              test_random_garbage, sl_test_project_tear_down);
  g_test_add ("/condition/select/underived", SlTestProject, NULL, sl_test_project_set_up,
              test_underived_never_selected, sl_test_project_tear_down);
  g_test_add ("/condition/select/missing", SlTestProject, NULL, sl_test_project_set_up,
              test_missing_semantics, sl_test_project_tear_down);
  g_test_add ("/condition/select/stale-as-stored", SlTestProject, NULL, sl_test_project_set_up,
              test_stale_as_stored, sl_test_project_tear_down);
  g_test_add ("/condition/select/limits-make-runnable-sql", SlTestProject, NULL, sl_test_project_set_up,
              test_limits_make_runnable_sql, sl_test_project_tear_down);

  return g_test_run ();
}
