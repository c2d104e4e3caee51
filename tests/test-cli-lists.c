/* test-cli-lists.c: starledger-cli select and lists, and export --list
 * and figure --list, end to end on the demo project: the counts select
 * gives checked against the full export filtered here, the list's export
 * and figures, the ledger, the notes about stars a condition cannot see,
 * the same count under a comma-decimal locale, and every mistake as one
 * line with exit status 1 (2 for usage). */
#include <string.h>

#include "cli-util.h"
#include "test-util.h"

/* A scratch directory with the demo project, derived, shared by the tests. */
static char *scratch;
static char *project;

static void
make_demo_project (void)
{
  project = make_derived_demo_project (&scratch);
}

/* ------------------------------------------------------------------ */
/* The export, read back                                              */

/* One CSV line's cells (RFC 4180 quotes; the export writes no line
 * breaks inside a cell). */
static GStrv
split_csv_line (const char *line)
{
  g_autoptr (GStrvBuilder) cells = g_strv_builder_new ();
  g_autoptr (GString) cell = g_string_new (NULL);
  gboolean quoted = FALSE;

  for (const char *p = line;; p++)
    {
      if (quoted && *p == '"' && p[1] == '"')
        g_string_append_c (cell, '"'), p++;
      else if (*p == '"')
        quoted = !quoted;
      else if ((*p == ',' && !quoted) || *p == '\0')
        {
          g_strv_builder_add (cells, cell->str);
          g_string_truncate (cell, 0);
          if (*p == '\0')
            break;
        }
      else
        g_string_append_c (cell, *p);
    }
  return g_strv_builder_end (cells);
}

/* The export's rows as cells, header first. */
static GPtrArray *
export_rows (const char *columns, const char *list)
{
  g_auto (CliResult) r = { 0 };
  g_auto (GStrv) lines = NULL;
  GPtrArray *rows = g_ptr_array_new_with_free_func ((GDestroyNotify) g_strfreev);

  if (list)
    run_cli (&r, "export", project, "--columns", columns, "--list", list, NULL);
  else
    run_cli (&r, "export", project, "--columns", columns, NULL);
  g_assert_cmpint (r.status, ==, 0);
  lines = g_strsplit (r.out, "\n", -1);
  for (guint i = 0; lines[i] && *lines[i]; i++)
    g_ptr_array_add (rows, split_csv_line (lines[i]));
  return rows;
}

static int
column_of (GPtrArray *rows, const char *name)
{
  char **header = rows->pdata[0];

  for (int i = 0; header[i]; i++)
    if (strcmp (header[i], name) == 0)
      return i;
  g_error ("no column %s", name);
}

static double
number (char **cells, int column)
{
  return *cells[column] ? g_ascii_strtod (cells[column], NULL) : NAN;
}

/* "list NAME: N stars" from select, N returned. */
static gint64
select_count (const char *where, const char *into, const char *extra)
{
  g_auto (CliResult) r = { 0 };
  g_autofree char *want_prefix = g_strdup_printf ("list %s: ", into);
  gint64 n;

  run_cli (&r, "select", project, "--where", where, "--into", into, extra, NULL);
  if (r.status != 0)
    g_error ("select --where %s: exit %d: %s", where, r.status, r.err);
  assert_prefix (r.out, want_prefix);
  assert_one_line (r.out);
  n = g_ascii_strtoll (r.out + strlen (want_prefix), NULL, 10);
  assert_contains (r.out, n == 1 ? " star\n" : " stars\n");
  return n;
}

/* ------------------------------------------------------------------ */
/* Tests                                                              */

static void
test_usage (void)
{
  const char *const commands[] = { "select", "lists", NULL };
  g_auto (CliResult) no_where = { 0 };
  g_auto (CliResult) no_into = { 0 };

  assert_commands_usage (commands);
  run_cli (&no_where, "select", project, "--into", "x", NULL);
  g_assert_cmpint (no_where.status, ==, 2);
  assert_contains (no_where.err, "--where EXPR is required");
  run_cli (&no_into, "select", project, "--where", "teff > 1", NULL);
  g_assert_cmpint (no_into.status, ==, 2);
  assert_contains (no_into.err, "--into LIST is required");
}

/* README's example: the count select gives is the count of the full
 * export's rows that satisfy the condition, and export --list writes
 * exactly those stars. */
static void
test_select_derived_values (void)
{
  g_autoptr (GPtrArray) all = export_rows ("teff,dist", NULL);
  g_autoptr (GPtrArray) listed = NULL;
  g_autoptr (GHashTable) want = g_hash_table_new (g_str_hash, g_str_equal);
  int teff = column_of (all, "teff"), dist = column_of (all, "dist");
  gint64 n;

  for (guint i = 1; i < all->len; i++)
    {
      char **cells = all->pdata[i];

      if (number (cells, teff) > 5000 && number (cells, dist) < 100)
        g_hash_table_add (want, cells[0]);
    }
  g_assert_cmpuint (g_hash_table_size (want), >, 10);
  g_assert_cmpuint (g_hash_table_size (want), <, all->len - 11);

  n = select_count ("teff > 5000 and dist < 100", "warm-nearby", NULL);
  g_assert_cmpint (n, ==, g_hash_table_size (want));

  listed = export_rows ("teff,dist", "warm-nearby");
  g_assert_cmpuint (listed->len - 1, ==, n);
  for (guint i = 1; i < listed->len; i++)
    if (!g_hash_table_contains (want, ((char **) listed->pdata[i])[0]))
      g_error ("%s is in the list but not in the filtered export", ((char **) listed->pdata[i])[0]);
}

/* Input fields (through the rows the derivation used), text with '~' and
 * flags, against the export's inputs and flags column. */
static void
test_select_inputs_text_flags (void)
{
  g_autoptr (GPtrArray) all = export_rows ("vmag,sptype,flags", NULL);
  int vmag = column_of (all, "vmag"), sptype = column_of (all, "sptype"), flags = column_of (all, "flags");
  guint want_bright = 0, want_flagged = 0, want_no_ebv_giants = 0;

  for (guint i = 1; i < all->len; i++)
    {
      char **cells = all->pdata[i];
      g_autofree char *type = g_ascii_strdown (cells[sptype], -1);

      if (number (cells, vmag) <= 7.5 && strstr (type, "v") != NULL)
        want_bright++;
      if (strstr (cells[flags], "low_parallax_snr") != NULL || strstr (cells[flags], "teff_out_of_range") != NULL)
        want_flagged++;
      if (*cells[sptype] && strstr (type, "iii") && strstr (cells[flags], "extinction_assumed_zero"))
        want_no_ebv_giants++;
    }
  g_assert_cmpuint (want_bright, >, 0);
  g_assert_cmpuint (want_flagged, >, 0);

  g_assert_cmpint (select_count ("vmag <= 7.5 and sptype ~ \"V\"", "bright-dwarfish", NULL), ==, want_bright);
  g_assert_cmpint (select_count ("flag:low_parallax_snr or FLAG:teff_out_of_range", "flagged", NULL), ==,
                   want_flagged);
  g_assert_cmpint (select_count ("sptype ~ 'III' and ebv is missing", "giants-no-ebv", NULL), ==,
                   want_no_ebv_giants);
}

static void
test_lists_command (void)
{
  g_auto (CliResult) made = { 0 };
  g_auto (CliResult) r = { 0 };
  g_autofree char *want = NULL;
  gint64 n;

  run_cli (&made, "select", project, "--where", "lum > 10", "--into", "luminous", "--description",
           "for the spectrograph", NULL);
  g_assert_cmpint (made.status, ==, 0);
  n = g_ascii_strtoll (made.out + strlen ("list luminous: "), NULL, 10);

  run_cli (&r, "lists", project, NULL);
  g_assert_cmpint (r.status, ==, 0);
  want = g_strdup_printf ("luminous: %" G_GINT64_FORMAT " stars, made by test-user at 20", n);
  assert_contains (r.out, want);
  assert_contains (r.out, "\n  where lum > 10\n  for the spectrograph\n");
}

static void
test_lists_empty_project (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *empty = g_build_filename (dir, "empty.starledger", NULL);
  g_auto (CliResult) created = { 0 };
  g_auto (CliResult) r = { 0 };

  run_cli (&created, "new", empty, NULL);
  g_assert_cmpint (created.status, ==, 0);
  run_cli (&r, "lists", empty, NULL);
  g_assert_cmpint (r.status, ==, 0);
  g_assert_cmpstr (r.out, ==, "no lists; 'starledger-cli select' makes one\n");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

static void
test_replace_and_ledger (void)
{
  g_auto (CliResult) again = { 0 };
  g_auto (CliResult) ledger = { 0 };
  g_autofree char *made = NULL;
  g_autofree char *remade = NULL;
  gint64 first, second;

  first = select_count ("dist < 50", "near", NULL);
  run_cli (&again, "select", project, "--where", "dist < 25", "--into", "near", NULL);
  assert_user_error (&again, "there is already a list 'near' (--replace makes it anew)");
  second = select_count ("dist < 25", "near", "--replace");
  g_assert_cmpint (second, <, first);

  run_cli (&ledger, "ledger", project, NULL);
  made = g_strdup_printf ("list      made list near: %" G_GINT64_FORMAT " stars where dist < 50\n", first);
  remade = g_strdup_printf ("list      remade list near: %" G_GINT64_FORMAT " stars where dist < 25 (it had %"
                            G_GINT64_FORMAT ")\n", second, first);
  assert_contains (ledger.out, made);
  assert_contains (ledger.out, remade);
}

static gboolean
is_png (const char *path)
{
  g_autofree char *contents = NULL;
  gsize length;

  return g_file_get_contents (path, &contents, &length, NULL) && length > 8
         && memcmp (contents, "\x89PNG\r\n\x1a\n", 8) == 0;
}

static void
test_figure_list (void)
{
  const char *const kinds[] = { "hr", "sky", "parallax" };
  g_autofree char *pdf = g_build_filename (scratch, "list-hr.pdf", NULL);
  g_autofree char *info = NULL;
  g_auto (CliResult) not_in_list = { 0 };
  g_auto (CliResult) in_list = { 0 };
  g_auto (CliResult) with_pdf = { 0 };

  g_assert_cmpint (select_count ("id = 'LHO 0001' or id = 'LHO 0004'", "pair", NULL), ==, 2);
  for (gsize i = 0; i < G_N_ELEMENTS (kinds); i++)
    {
      g_autofree char *name = g_strdup_printf ("list-%s.png", kinds[i]);
      g_autofree char *path = g_build_filename (scratch, name, NULL);
      g_auto (CliResult) r = { 0 };

      run_cli (&r, "figure", project, kinds[i], "-o", path, "--list", "pair", NULL);
      if (r.status != 0)
        g_error ("figure %s --list pair: %s", kinds[i], r.err);
      g_assert_true (is_png (path));
    }

  /* The PDF names the list beside the project and run. */
  run_cli (&with_pdf, "figure", project, "hr", "-o", pdf, "--list", "pair", NULL);
  g_assert_cmpint (with_pdf.status, ==, 0);
  {
    const char *argv[] = { "pdfinfo", pdf, NULL };
    g_autoptr (GError) error = NULL;
    int wait_status;

    g_spawn_sync (NULL, (char **) argv, NULL, G_SPAWN_SEARCH_PATH | G_SPAWN_STDERR_TO_DEV_NULL, NULL, NULL,
                  &info, NULL, &wait_status, &error);
    g_assert_no_error (error);
    assert_contains (info, ", list pair, derivation run ");
  }

  /* --star chooses among the list's stars. */
  run_cli (&in_list, "figure", project, "parallax", "-o", pdf, "--list", "pair", "--star", "LHO 0004", NULL);
  g_assert_cmpint (in_list.status, ==, 0);
  run_cli (&not_in_list, "figure", project, "sky", "-o", pdf, "--list", "pair", "--star", "LHO 0010", NULL);
  assert_user_error (&not_in_list, "star 'LHO 0010' is not in list 'pair'");
}

static void
test_errors (void)
{
  g_auto (CliResult) banana = { 0 };
  g_auto (CliResult) unknown = { 0 };
  g_auto (CliResult) text_op = { 0 };
  g_auto (CliResult) export_nope = { 0 };
  g_auto (CliResult) figure_nope = { 0 };
  g_auto (CliResult) no_project = { 0 };
  g_auto (CliResult) bad_name = { 0 };
  g_autofree char *png = g_build_filename (scratch, "nope.png", NULL);
  g_autofree char *missing = g_build_filename (scratch, "missing.starledger", NULL);

  run_cli (&banana, "select", project, "--where", "teff > 5000 and dist banana", "--into", "x", NULL);
  assert_user_error (&banana, "starledger-cli: --where: at 22: expected a comparison after 'dist', got 'banana'");
  run_cli (&unknown, "select", project, "--where", "tef > 5000", "--into", "x", NULL);
  assert_user_error (&unknown, "--where: at 1: unknown name 'tef' (did you mean 'teff'?); the names are: ");
  run_cli (&text_op, "select", project, "--where", "sptype > 'G'", "--into", "x", NULL);
  assert_user_error (&text_op, "at 8: 'sptype' is text");

  run_cli (&export_nope, "export", project, "--list", "nope", NULL);
  assert_user_error (&export_nope, "no list 'nope' in the project");
  g_assert_cmpstr (export_nope.out, ==, "");
  run_cli (&figure_nope, "figure", project, "hr", "-o", png, "--list", "nope", NULL);
  assert_user_error (&figure_nope, "no list 'nope' in the project");
  g_assert_false (g_file_test (png, G_FILE_TEST_EXISTS));

  run_cli (&no_project, "select", missing, "--where", "teff > 1", "--into", "x", NULL);
  assert_user_error (&no_project, NULL);
  run_cli (&bad_name, "select", project, "--where", "teff > 1", "--into", " padded", NULL);
  assert_user_error (&bad_name, "a list's name must be");
}

/* What a condition cannot see is said on stderr: stars never derived, and
 * stars whose derived values went stale. */
static void
test_notes (void)
{
  g_autofree char *dir = sl_test_scratch_new ();
  g_autofree char *small = g_build_filename (dir, "small.starledger", NULL);
  g_autofree char *first = sl_test_write_file (dir, "first.csv", "id,parallax,parallax_err\nA,10,0.1\nB,20,0.1\n", -1);
  g_autofree char *second = sl_test_write_file (dir, "second.csv", "id,parallax,parallax_err\nA,11,0.05\nC,5,0.1\n", -1);
  g_auto (CliResult) created = { 0 }, i1 = { 0 }, i2 = { 0 }, derived = { 0 }, r = { 0 }, lists = { 0 };

  run_cli (&created, "new", small, NULL);
  run_cli (&i1, "import", small, first, NULL);
  run_cli (&derived, "derive", small, NULL);
  run_cli (&i2, "import", small, second, NULL);
  g_assert_cmpint (i2.status, ==, 0);
  run_cli (&r, "select", small, "--where", "dist > 0", "--into", "all", NULL);
  g_assert_cmpint (r.status, ==, 0);
  g_assert_cmpstr (r.out, ==, "list all: 2 stars\n");
  assert_contains (r.err, "note: 1 star has never been derived and cannot be selected; run 'derive'\n");
  assert_contains (r.err, "note: 1 star of the list has stale derived values (its inputs changed)");
  run_cli (&lists, "lists", small, NULL);
  assert_contains (lists.out, "  1 star with stale derived values\n");
  sl_test_scratch_free (g_steal_pointer (&dir));
}

/* A comma-decimal locale reads the condition's numbers the same. */
static void
test_locale_independent (void)
{
  g_auto (CliResult) c = { 0 };
  g_auto (CliResult) de = { 0 };

  if (!g_file_test ("/usr/lib/locale/locale-archive", G_FILE_TEST_EXISTS))
    {
      g_test_skip ("no compiled locales (build-aux/dev generates de_DE.UTF-8)");
      return;
    }
  run_cli_in_locale (&c, "C.UTF-8", "select", project, "--where", "dist < 87.5 and bv0 >= 0.25",
                     "--into", "c-locale", NULL);
  run_cli_in_locale (&de, "de_DE.UTF-8", "select", project, "--where", "dist < 87.5 and bv0 >= 0.25",
                     "--into", "de-locale", NULL);
  g_assert_cmpint (c.status, ==, 0);
  g_assert_cmpint (de.status, ==, 0);
  g_assert_cmpstr (c.out + strlen ("list c-locale"), ==, de.out + strlen ("list de-locale"));
}

int
main (int argc, char **argv)
{
  int status;

  cli_test_init (&argc, &argv);
  make_demo_project ();

  g_test_add_func ("/cli/lists/usage", test_usage);
  g_test_add_func ("/cli/lists/select/derived-values", test_select_derived_values);
  g_test_add_func ("/cli/lists/select/inputs-text-flags", test_select_inputs_text_flags);
  g_test_add_func ("/cli/lists/select/replace-and-ledger", test_replace_and_ledger);
  g_test_add_func ("/cli/lists/select/notes", test_notes);
  g_test_add_func ("/cli/lists/select/locale-independent", test_locale_independent);
  g_test_add_func ("/cli/lists/lists", test_lists_command);
  g_test_add_func ("/cli/lists/lists-empty", test_lists_empty_project);
  g_test_add_func ("/cli/lists/figure", test_figure_list);
  g_test_add_func ("/cli/lists/errors", test_errors);

  status = g_test_run ();
  sl_test_scratch_free (scratch);
  g_free (project);
  return status;
}
