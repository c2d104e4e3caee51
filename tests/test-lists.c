/* test-lists.c: named target lists: made from a condition, replaced,
 * made by hand, stars added and removed, per-star priority, tags and
 * notes, deleted; each change with its ledger entry in the same
 * transaction; and the list filters of export and of the star sets the
 * figures draw. */
#include <string.h>

#include "derivation.h"
#include "export.h"
#include "import.h"
#include "ledger.h"
#include "lists.h"
#include "sl-error.h"
#include "starset.h"
#include "inputs.h"
#include "test-util.h"

/* Five derived stars: A (10 pc, B-V 0.3), B (20 pc, 0.65), C (50 pc,
 * 1.2), D (200 pc, 0.0), E (parallax S/N 2: no inverse distance). */
static void
fixture_set_up (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *input = NULL;
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;
  SlDeriveParams params;
  SlDeriveReport derived;

  sl_test_project_set_up (f, data);
  input = sl_test_write_file (f->dir, "in.csv",
                              "id,parallax,parallax_err,vmag,vmag_err,bv,bv_err,sptype\n"
                              "A,100,0.5,5,0.01,0.3,0.01,F0V\n"
                              "B,50,0.5,6,0.01,0.65,0.01,G2V\n"
                              "C,20,0.5,8,0.01,1.2,0.01,K5III\n"
                              "D,5,0.5,10,0.01,0.0,0.01,A0V\n"
                              "E,1,0.5,12,0.01,1.5,0.01,\n", -1);
  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);
  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &derived, &error));
  g_assert_no_error (error);
}

static gint64
ledger_count (SlTestProject *f)
{
  return sl_test_query_int (f->db, "SELECT count(*) FROM ledger");
}

static char *
last_ledger (SlTestProject *f, const char *column)
{
  g_autofree char *sql = g_strdup_printf ("SELECT %s FROM ledger ORDER BY id DESC LIMIT 1", column);

  return sl_test_query_text (f->db, sql);
}

/* The list's members as "A,B,...", by designation. */
static char *
members_of (SlTestProject *f, const char *name)
{
  g_autofree char *sql = g_strdup_printf ("SELECT coalesce(group_concat(designation, ','), '') FROM "
                                          "(SELECT s.designation FROM list_members m JOIN lists l ON l.id = m.list_id "
                                          "JOIN stars s ON s.id = m.star_id WHERE l.name = '%s' ORDER BY s.designation)",
                                          name);

  return sl_test_query_text (f->db, sql);
}

/* Everything the list functions write, as one string. */
static char *
snapshot (SlTestProject *f)
{
  return sl_test_query_text (f->db,
                             "SELECT (SELECT count(*) FROM ledger) || '|' || "
                             "coalesce((SELECT group_concat(name || ':' || description || ':' || coalesce(condition, '-') "
                             "|| ':' || created_at, ';') FROM lists), '') || '|' || "
                             "coalesce((SELECT group_concat(list_id || ':' || star_id || ':' || priority || ':' || tags "
                             "|| ':' || notes, ';') FROM list_members), '')");
}

static gint64
create_ok (SlTestProject *f, const char *name, const char *condition, gboolean replace)
{
  g_autoptr (GError) error = NULL;
  gint64 n = sl_list_create_from_condition (f->project, name, condition, NULL, replace, &error);

  g_assert_no_error (error);
  return n;
}

static void
test_create_from_condition (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *summary = NULL;
  g_autofree char *action = NULL;
  g_autofree char *who = NULL;
  g_autofree char *details = NULL;
  g_autofree char *members = NULL;
  g_autofree char *condition = NULL;
  g_autofree char *description = NULL;
  gint64 before = ledger_count (f);
  gint64 n;

  n = sl_list_create_from_condition (f->project, "warm nearby", "teff > 5000 and dist < 100",
                                     "for the spring run", FALSE, &error);
  g_assert_no_error (error);
  g_assert_cmpint (n, ==, 2);
  members = members_of (f, "warm nearby");
  g_assert_cmpstr (members, ==, "A,B");

  condition = sl_test_query_text (f->db, "SELECT condition FROM lists");
  description = sl_test_query_text (f->db, "SELECT description FROM lists");
  who = sl_test_query_text (f->db, "SELECT created_by FROM lists");
  g_assert_cmpstr (condition, ==, "teff > 5000 and dist < 100");
  g_assert_cmpstr (description, ==, "for the spring run");
  g_assert_cmpstr (who, ==, "test-user");

  g_assert_cmpint (ledger_count (f), ==, before + 1);
  action = last_ledger (f, "action");
  summary = last_ledger (f, "summary");
  details = last_ledger (f, "json_extract(details, '$.stars') || ' ' || json_extract(details, '$.condition')");
  g_assert_cmpstr (action, ==, "list");
  g_assert_cmpstr (summary, ==, "made list warm nearby: 2 stars where teff > 5000 and dist < 100");
  g_assert_cmpstr (details, ==, "2 teff > 5000 and dist < 100");
}

static void
test_create_empty_result (SlTestProject *f, gconstpointer data)
{
  g_autofree char *summary = NULL;

  g_assert_cmpint (create_ok (f, "none", "teff > 100000", FALSE), ==, 0);
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "made list none: 0 stars where teff > 100000");
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM lists"), ==, 1);
}

/* A condition written over several lines: the summary stays one line,
 * the list and the details keep the text as written. */
static void
test_create_multiline (SlTestProject *f, gconstpointer data)
{
  g_autofree char *summary = NULL;
  g_autofree char *condition = NULL;
  g_autofree char *details = NULL;

  g_assert_cmpint (create_ok (f, "two", "teff > 5000\n  and\tdist < 100", FALSE), ==, 2);
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "made list two: 2 stars where teff > 5000   and dist < 100");
  condition = sl_test_query_text (f->db, "SELECT condition FROM lists");
  g_assert_cmpstr (condition, ==, "teff > 5000\n  and\tdist < 100");
  details = last_ledger (f, "json_extract(details, '$.condition')");
  g_assert_cmpstr (details, ==, "teff > 5000\n  and\tdist < 100");
}

static void
test_create_duplicate (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *before = NULL;
  g_autofree char *after = NULL;

  create_ok (f, "warm", "teff > 5000", FALSE);
  before = snapshot (f);
  g_assert_cmpint (sl_list_create_from_condition (f->project, "warm", "teff > 1", NULL, FALSE, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_EXISTS);
  g_assert_nonnull (strstr (error->message, "there is already a list 'warm'"));
  g_clear_error (&error);
  g_assert_false (sl_list_create (f->project, "warm", NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_EXISTS);
  after = snapshot (f);
  g_assert_cmpstr (after, ==, before);
}

/* Replacing makes the list anew; stars that stay keep what was said about
 * them. */
static void
test_create_replace (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *members = NULL;
  g_autofree char *summary = NULL;
  g_autofree char *kept = NULL;
  g_autofree char *condition = NULL;
  g_autofree char *replaced = NULL;

  g_assert_cmpint (create_ok (f, "warm", "teff > 5000", FALSE), ==, 3);
  g_assert_true (sl_list_set_member (f->project, "warm", "B", 5, "solar", "twin?", &error));
  g_assert_no_error (error);
  g_assert_cmpint (create_ok (f, "warm", "teff > 5000 and teff < 7000", TRUE), ==, 1);
  members = members_of (f, "warm");
  g_assert_cmpstr (members, ==, "B");
  kept = sl_test_query_text (f->db, "SELECT priority || ' ' || tags || ' ' || notes FROM list_members");
  g_assert_cmpstr (kept, ==, "5 solar twin?");
  condition = sl_test_query_text (f->db, "SELECT condition FROM lists");
  g_assert_cmpstr (condition, ==, "teff > 5000 and teff < 7000");
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "remade list warm: 1 star where teff > 5000 and teff < 7000 (it had 3)");
  replaced = last_ledger (f, "json_extract(details, '$.replaced') || ' ' || json_extract(details, '$.stars_before')");
  g_assert_cmpstr (replaced, ==, "1 3");
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM lists"), ==, 1);

  /* Replace on a new name simply makes it. */
  g_assert_cmpint (create_ok (f, "other", "id = 'B'", TRUE), ==, 1);
}

static void
test_create_bad_condition (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *before = snapshot (f);
  g_autofree char *after = NULL;

  g_assert_cmpint (sl_list_create_from_condition (f->project, "x", "teff > hot", NULL, FALSE, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_cmpstr (error->message, ==, "at 8: expected a number after 'teff >', got 'hot'");
  after = snapshot (f);
  g_assert_cmpstr (after, ==, before);
}

static void
test_names (SlTestProject *f, gconstpointer data)
{
  static const char *const bad[] = { "", " warm", "warm ", "warm\nlist", "tab\there", "\xff\xfe", "\t" };
  static const char *const good[] = { "warm", "Ω Cen field", "2026-spring/run #1", "'quoted'; DROP TABLE lists" };
  g_auto (GStrv) names = NULL;

  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      g_autoptr (GError) error = NULL;

      g_assert_cmpint (sl_list_create_from_condition (f->project, bad[i], "teff > 1", NULL, FALSE, &error), ==, -1);
      g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
      g_clear_error (&error);
      g_assert_false (sl_list_create (f->project, bad[i], NULL, &error));
      g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
    }
  for (gsize i = 0; i < G_N_ELEMENTS (good); i++)
    create_ok (f, good[i], "teff > 1", FALSE);
  names = sl_list_names (f->project, NULL);
  g_assert_cmpuint (g_strv_length (names), ==, G_N_ELEMENTS (good));
  /* In byte order. */
  g_assert_cmpstr (names[0], ==, "'quoted'; DROP TABLE lists");
  g_assert_cmpstr (names[1], ==, "2026-spring/run #1");
  g_assert_cmpstr (names[2], ==, "warm");
  g_assert_cmpstr (names[3], ==, "Ω Cen field");
}

static void
test_add_remove (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  const char *const ab[] = { "A", "B", NULL };
  const char *const bc[] = { "B", "C", "C", NULL };
  const char *const a_unknown[] = { "A", "Z", NULL };
  const char *const a_e[] = { "A", "E", NULL };
  g_autofree char *summary = NULL;
  g_autofree char *added = NULL;
  g_autofree char *before = NULL;
  g_autofree char *after = NULL;
  g_autofree char *m1 = NULL;
  g_autofree char *m2 = NULL;
  g_autofree char *hand = NULL;
  gint64 entries;

  g_assert_true (sl_list_create (f->project, "picked", "from the HR diagram", &error));
  g_assert_no_error (error);
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "made list picked by hand (empty)");
  hand = sl_test_query_text (f->db, "SELECT coalesce(condition, 'none') FROM lists");
  g_assert_cmpstr (hand, ==, "none");

  g_assert_cmpint (sl_list_add_stars (f->project, "picked", ab, &error), ==, 2);
  g_assert_cmpint (sl_list_add_stars (f->project, "picked", bc, &error), ==, 1);
  g_assert_no_error (error);
  m1 = members_of (f, "picked");
  g_assert_cmpstr (m1, ==, "A,B,C");
  g_clear_pointer (&summary, g_free);
  summary = last_ledger (f, "summary");
  added = last_ledger (f, "json_extract(details, '$.added')");
  g_assert_cmpstr (summary, ==, "added 1 star to list picked");
  g_assert_cmpstr (added, ==, "[\"C\"]");

  /* Adding what is already there changes nothing and logs nothing. */
  entries = ledger_count (f);
  g_assert_cmpint (sl_list_add_stars (f->project, "picked", ab, &error), ==, 0);
  g_assert_cmpint (ledger_count (f), ==, entries);

  /* An unknown star: an error, and the known one is not removed either. */
  before = snapshot (f);
  g_assert_cmpint (sl_list_remove_stars (f->project, "picked", a_unknown, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_nonnull (strstr (error->message, "no star 'Z'"));
  g_clear_error (&error);
  g_assert_cmpint (sl_list_add_stars (f->project, "picked", a_unknown, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_clear_error (&error);
  after = snapshot (f);
  g_assert_cmpstr (after, ==, before);

  /* E is not in the list: passed over. */
  g_assert_cmpint (sl_list_remove_stars (f->project, "picked", a_e, &error), ==, 1);
  g_assert_no_error (error);
  m2 = members_of (f, "picked");
  g_assert_cmpstr (m2, ==, "B,C");
  g_clear_pointer (&summary, g_free);
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "removed 1 star from list picked");
}

static void
test_unknown_list (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  const char *const a[] = { "A", NULL };

  g_assert_cmpint (sl_list_add_stars (f->project, "nope", a, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_nonnull (strstr (error->message, "no list 'nope' in the project; it has no lists yet"));
  g_clear_error (&error);

  create_ok (f, "warm", "teff > 5000", FALSE);
  create_ok (f, "cool", "teff < 5000", FALSE);
  g_assert_null (sl_list_star_ids (f->project, "nope", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_true (g_str_has_suffix (error->message, "no list 'nope' in the project; the lists are: cool, warm"));
  g_clear_error (&error);
  g_assert_false (sl_list_delete (f->project, "nope", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_clear_error (&error);
  g_assert_false (sl_list_set_member (f->project, "nope", "A", 1, NULL, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_clear_error (&error);
  g_assert_null (sl_list_members (f->project, "nope", &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
}

static void
test_set_member (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (GPtrArray) members = NULL;
  g_autofree char *summary = NULL;
  g_autofree char *notes = NULL;
  const SlListMember *first;

  create_ok (f, "warm", "teff > 5000", FALSE);
  g_assert_true (sl_list_set_member (f->project, "warm", "D", 3, "hot,A-type", "needs a spectrum: \"soon\"", &error));
  g_assert_no_error (error);
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "set D in list warm: priority 3, tags 'hot,A-type', notes 'needs a spectrum: \"soon\"'");
  notes = last_ledger (f, "json_extract(details, '$.notes')");
  g_assert_cmpstr (notes, ==, "needs a spectrum: \"soon\"");

  members = sl_list_members (f->project, "warm", &error);
  g_assert_no_error (error);
  g_assert_cmpuint (members->len, ==, 3);
  first = members->pdata[0];
  g_assert_cmpstr (first->designation, ==, "D");
  g_assert_cmpint (first->priority, ==, 3);
  g_assert_cmpstr (first->tags, ==, "hot,A-type");
  g_assert_cmpstr (((SlListMember *) members->pdata[1])->designation, ==, "A");
  g_assert_cmpstr (((SlListMember *) members->pdata[1])->tags, ==, "");

  /* C is a star, but not in the list; Z is no star. */
  g_assert_false (sl_list_set_member (f->project, "warm", "C", 1, NULL, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_nonnull (strstr (error->message, "star 'C' is not in list 'warm'"));
  g_clear_error (&error);
  g_assert_false (sl_list_set_member (f->project, "warm", "Z", 1, NULL, NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_nonnull (strstr (error->message, "no star 'Z'"));
  g_clear_error (&error);
  g_assert_false (sl_list_set_member (f->project, "warm", "A", 1, "\xff", NULL, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
}

static void
test_delete (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *summary = NULL;
  g_auto (GStrv) names = NULL;

  create_ok (f, "warm", "teff > 5000", FALSE);
  create_ok (f, "cool", "teff < 5000", FALSE);
  g_assert_true (sl_list_delete (f->project, "warm", &error));
  g_assert_no_error (error);
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "deleted list warm (3 stars)");
  names = sl_list_names (f->project, &error);
  g_assert_cmpuint (g_strv_length (names), ==, 1);
  g_assert_cmpstr (names[0], ==, "cool");
  g_assert_cmpint (sl_test_query_int (f->db, "SELECT count(*) FROM list_members"), ==, 2);
  /* The name is free again. */
  g_assert_cmpint (create_ok (f, "warm", "teff > 9000", FALSE), ==, 1);
}

static void
test_star_ids_and_infos (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) ids = NULL;
  g_autoptr (GPtrArray) infos = NULL;
  g_autofree char *more = sl_test_write_file (f->dir, "more.csv", "id,bv,bv_err\nB,0.7,0.005\n", -1);
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;
  const SlListInfo *info;

  create_ok (f, "warm", "teff > 5000", FALSE);
  g_assert_true (sl_list_create (f->project, "empty", NULL, &error));
  ids = sl_list_star_ids (f->project, "warm", &error);
  g_assert_no_error (error);
  g_assert_cmpuint (ids->len, ==, 3);
  for (guint i = 1; i < ids->len; i++)
    g_assert_cmpint (g_array_index (ids, gint64, i - 1), <, g_array_index (ids, gint64, i));
  g_assert_cmpint (g_array_index (ids, gint64, 0), ==, sl_test_query_int (f->db, "SELECT id FROM stars WHERE designation = 'A'"));

  /* A new measurement of B makes its derived values stale. */
  sl_import_options_init (&options);
  report = sl_import_csv (f->project, more, &options, &error);
  g_assert_no_error (error);
  infos = sl_list_infos (f->project, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (infos->len, ==, 2);
  info = infos->pdata[0];
  g_assert_cmpstr (info->name, ==, "empty");
  g_assert_null (info->condition);
  g_assert_cmpint (info->n_stars, ==, 0);
  info = infos->pdata[1];
  g_assert_cmpstr (info->name, ==, "warm");
  g_assert_cmpstr (info->condition, ==, "teff > 5000");
  g_assert_cmpstr (info->created_by, ==, "test-user");
  g_assert_true (g_str_has_suffix (info->created_at, "Z"));
  g_assert_cmpint (info->n_stars, ==, 3);
  g_assert_cmpint (info->n_stale, ==, 1);
}

/* Each change and its ledger entry are one transaction: when the ledger
 * cannot be written, nothing of the change remains. */
static void
test_one_transaction (SlTestProject *f, gconstpointer data)
{
  const char *const c[] = { "C", NULL };
  const char *const a[] = { "A", NULL };
  g_autofree char *before = NULL;
  g_autofree char *after = NULL;
  GError *error = NULL;

  create_ok (f, "warm", "teff > 5000", FALSE);
  g_assert_true (sl_list_create (f->project, "hand", NULL, NULL));
  before = snapshot (f);
  g_assert_cmpint (sqlite3_exec (f->db, "CREATE TEMP TRIGGER ledger_refuses BEFORE INSERT ON main.ledger "
                                        "BEGIN SELECT RAISE(ABORT, 'the ledger refuses'); END", NULL, NULL, NULL),
                   ==, SQLITE_OK);

#define ASSERT_REFUSED(call)                                              \
  G_STMT_START {                                                          \
    g_assert_false ((call) > 0);                                          \
    g_assert_nonnull (error);                                             \
    g_assert_nonnull (strstr (error->message, "the ledger refuses"));    \
    g_clear_error (&error);                                               \
    g_clear_pointer (&after, g_free);                                     \
    after = snapshot (f);                                                 \
    g_assert_cmpstr (after, ==, before);                                  \
  } G_STMT_END

  ASSERT_REFUSED (sl_list_create_from_condition (f->project, "new", "teff > 5000", NULL, FALSE, &error) >= 0);
  ASSERT_REFUSED (sl_list_create_from_condition (f->project, "warm", "teff > 9000", NULL, TRUE, &error) >= 0);
  ASSERT_REFUSED (sl_list_create (f->project, "new", NULL, &error));
  ASSERT_REFUSED (sl_list_add_stars (f->project, "warm", c, &error) >= 0);
  ASSERT_REFUSED (sl_list_remove_stars (f->project, "warm", a, &error) >= 0);
  ASSERT_REFUSED (sl_list_set_member (f->project, "warm", "A", 9, "x", "y", &error));
  ASSERT_REFUSED (sl_list_delete (f->project, "warm", &error));
#undef ASSERT_REFUSED

  /* And once the ledger works again, so do the lists. */
  g_assert_cmpint (sqlite3_exec (f->db, "DROP TRIGGER temp.ledger_refuses", NULL, NULL, NULL), ==, SQLITE_OK);
  g_assert_true (sl_list_delete (f->project, "warm", &error));
  g_assert_no_error (error);
}

/* export --list: only the list's stars, in star order. */
static void
test_export_list (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *path = g_build_filename (f->dir, "out.csv", NULL);
  g_autofree char *contents = NULL;
  const char *const columns[] = { "teff", NULL };
  const char *const hand[] = { "D", "B", NULL };
  SlExportOptions options = { SL_EXPORT_CSV, columns, NULL, "picked" };
  g_auto (GStrv) lines = NULL;

  g_assert_true (sl_list_create (f->project, "picked", NULL, &error));
  g_assert_cmpint (sl_list_add_stars (f->project, "picked", hand, &error), ==, 2);
  g_assert_cmpint (sl_export (f->project, path, &options, &error), ==, 2);
  g_assert_no_error (error);
  g_assert_true (g_file_get_contents (path, &contents, NULL, NULL));
  lines = g_strsplit (contents, "\n", -1);
  g_assert_cmpuint (g_strv_length (lines), ==, 4);
  g_assert_cmpstr (lines[0], ==, "id,teff,teff_lo,teff_hi");
  g_assert_true (g_str_has_prefix (lines[1], "B,"));
  g_assert_true (g_str_has_prefix (lines[2], "D,"));
  g_assert_cmpstr (lines[3], ==, "");

  /* An empty list: the header alone. */
  g_assert_true (sl_list_create (f->project, "empty", NULL, &error));
  options.list = "empty";
  g_assert_cmpint (sl_export (f->project, path, &options, &error), ==, 0);

  /* An unknown list: an error, and no file. */
  g_assert_no_error (error);
  g_assert_cmpint (g_unlink (path), ==, 0);
  options.list = "nope";
  g_assert_cmpint (sl_export (f->project, path, &options, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_false (g_file_test (path, G_FILE_TEST_EXISTS));
}

/* The star set of a list, as figure --list draws it. */
static void
test_star_set_list (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (SlStarSet) set = NULL;
  g_autoptr (SlStarSet) none = NULL;

  create_ok (f, "warm", "teff > 5000", FALSE);
  set = sl_star_set_load_list (f->project, "warm", &error);
  g_assert_no_error (error);
  g_assert_cmpuint (set->stars->len, ==, 3);
  g_assert_cmpuint (set->n_derived, ==, 3);
  g_assert_cmpstr (sl_star_set_get (set, 0)->designation, ==, "A");
  g_assert_cmpstr (sl_star_set_get (set, 1)->designation, ==, "B");
  g_assert_cmpstr (sl_star_set_get (set, 2)->designation, ==, "D");
  g_assert_true (sl_star_set_get (set, 2)->teff > 5000);
  sl_assert_close (sl_star_set_get (set, 0)->parallax, 100.0, 0.0, "A's parallax");

  none = sl_star_set_load_list (f->project, "nope", &error);
  g_assert_null (none);
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
}

/* A condition and a selection make one list in one transaction with one
 * ledger entry; a star the condition already holds is not counted twice;
 * an unknown star changes nothing. */
static void
test_create_with_stars (SlTestProject *f, gconstpointer data)
{
  static const char *const chosen[] = { "A", "D", NULL };
  static const char *const unknown[] = { "C", "Nope", NULL };
  g_autoptr (GError) error = NULL;
  g_autofree char *members = NULL;
  g_autofree char *summary = NULL;
  g_autofree char *added = NULL;
  g_autofree char *before = NULL;
  g_autofree char *after = NULL;
  g_autofree char *hand = NULL;
  g_autofree char *condition = NULL;
  gint64 ledger = ledger_count (f);

  /* teff > 5000 and dist < 100 holds A and B; D comes by hand. */
  g_assert_cmpint (sl_list_create_with_stars (f->project, "both", "teff > 5000 and dist < 100", chosen,
                                              "spring", &error), ==, 3);
  g_assert_no_error (error);
  members = members_of (f, "both");
  g_assert_cmpstr (members, ==, "A,B,D");
  g_assert_cmpint (ledger_count (f), ==, ledger + 1);
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "made list both: 2 stars where teff > 5000 and dist < 100, and 1 more by hand");
  added = last_ledger (f, "json_extract(details, '$.added')");
  g_assert_cmpstr (added, ==, "[\"D\"]");
  condition = sl_test_query_text (f->db, "SELECT condition FROM lists WHERE name = 'both'");
  g_assert_cmpstr (condition, ==, "teff > 5000 and dist < 100");

  /* Only a selection: a list by hand, without a condition. */
  g_assert_cmpint (sl_list_create_with_stars (f->project, "picked", NULL, chosen, NULL, &error), ==, 2);
  g_assert_no_error (error);
  hand = sl_test_query_text (f->db, "SELECT coalesce(condition, 'none') FROM lists WHERE name = 'picked'");
  g_assert_cmpstr (hand, ==, "none");
  g_clear_pointer (&summary, g_free);
  summary = last_ledger (f, "summary");
  g_assert_cmpstr (summary, ==, "made list picked by hand: 2 stars");

  /* An unknown star, an existing name, a bad condition: nothing changes. */
  before = snapshot (f);
  g_assert_cmpint (sl_list_create_with_stars (f->project, "bad", "teff > 1", unknown, NULL, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
  g_assert_nonnull (strstr (error->message, "no star 'Nope'"));
  g_clear_error (&error);
  g_assert_cmpint (sl_list_create_with_stars (f->project, "both", NULL, chosen, NULL, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_EXISTS);
  g_clear_error (&error);
  g_assert_cmpint (sl_list_create_with_stars (f->project, "bad", "teff >", chosen, NULL, &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  after = snapshot (f);
  g_assert_cmpstr (after, ==, before);
}

/* The live count agrees with the list the same condition makes, and
 * writes nothing; a mistake comes back from the compiler with its column. */
static void
test_count_matching (SlTestProject *f, gconstpointer data)
{
  static const char *const conditions[] = {
    "teff > 5000", "teff > 5000 and dist < 100", "dist is missing", "sptype ~ 'v'", "teff > 100000", NULL
  };
  g_autoptr (GError) error = NULL;
  g_autofree char *before = snapshot (f);
  g_autofree char *after = NULL;

  for (guint i = 0; conditions[i]; i++)
    {
      g_autofree char *name = g_strdup_printf ("c%u", i);
      gint64 counted = sl_list_count_matching (f->project, conditions[i], &error);

      g_assert_no_error (error);
      g_assert_cmpint (sl_list_count_matching (f->project, conditions[i], &error), ==, counted);
      if (i == 0)
        {
          after = snapshot (f);
          g_assert_cmpstr (after, ==, before);
        }
      g_assert_cmpint (create_ok (f, name, conditions[i], FALSE), ==, counted);
    }
  g_assert_cmpint (sl_list_count_matching (f->project, "teff > 5000", NULL), ==, 3);
  g_assert_cmpint (sl_list_count_matching (f->project, "teff > 5000 and tef < 2", &error), ==, -1);
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  g_assert_true (g_str_has_prefix (error->message, "at 17: unknown name 'tef'"));
}

/* A condition on an input the project averages reads the mean, as the
 * derivation did, not the most precise row the derived values record:
 * B's parallaxes 50 +/- 0.5 and 51 +/- 0.5 average to 50.5. */
static void
test_condition_reads_the_mean (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *input = sl_test_write_file (f->dir, "more.csv", "id,parallax,parallax_err\nB,51,0.5\n", -1);
  g_autoptr (SlImportReport) report = NULL;
  g_autofree char *members = NULL;
  SlImportOptions options;
  SlCombinePolicy policy;
  SlDeriveParams params;
  SlDeriveReport derived;

  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);
  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &derived, &error));
  /* By the smallest uncertainty (a tie: the later source), B's is 51. */
  g_assert_cmpint (sl_list_count_matching (f->project, "parallax > 50.2 and parallax < 50.8", &error), ==, 0);
  sl_combine_policy_init (&policy);
  policy.rule[SL_FIELD_PARALLAX] = SL_COMBINE_WEIGHTED_MEAN;
  g_assert_true (sl_combine_policy_write (f->project, &policy, &error));
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &derived, &error));
  g_assert_no_error (error);
  g_assert_cmpint (create_ok (f, "mean", "parallax > 50.2 and parallax < 50.8", FALSE), ==, 1);
  members = members_of (f, "mean");
  g_assert_cmpstr (members, ==, "B");
  /* Its error too: 0.5 / sqrt 2 = 0.354. */
  g_assert_cmpint (sl_list_count_matching (f->project, "parallax_err < 0.36 and parallax_err > 0.35", &error),
                   ==, 1);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

#define ADD(path, func) \
  g_test_add (path, SlTestProject, NULL, fixture_set_up, func, sl_test_project_tear_down)

  ADD ("/lists/create/from-condition", test_create_from_condition);
  ADD ("/lists/create/empty-result", test_create_empty_result);
  ADD ("/lists/create/multiline", test_create_multiline);
  ADD ("/lists/create/duplicate", test_create_duplicate);
  ADD ("/lists/create/replace", test_create_replace);
  ADD ("/lists/create/bad-condition", test_create_bad_condition);
  ADD ("/lists/create/with-stars", test_create_with_stars);
  ADD ("/lists/count-matching", test_count_matching);
  ADD ("/lists/condition-reads-the-mean", test_condition_reads_the_mean);
  ADD ("/lists/names", test_names);
  ADD ("/lists/members/add-remove", test_add_remove);
  ADD ("/lists/members/set", test_set_member);
  ADD ("/lists/unknown-list", test_unknown_list);
  ADD ("/lists/delete", test_delete);
  ADD ("/lists/star-ids-and-infos", test_star_ids_and_infos);
  ADD ("/lists/one-transaction", test_one_transaction);
  ADD ("/lists/export", test_export_list);
  ADD ("/lists/star-set", test_star_set_list);
#undef ADD

  return g_test_run ();
}
