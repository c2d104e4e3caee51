/* fuzz-import.c: the CSV importer, mapping included, on any file.
 *
 * An input is one line of import options, then the file: the first line
 * holds '|'-separated --map specs (FIELD=COLUMN[:UNIT]), optionally a
 * "delimiter=;" item and a "missing=TOKEN" item.  Each input is imported
 * into a fresh copy of an empty project; afterwards the project must be
 * consistent: the accepted and rejected rows add up to the rows read, every
 * rejection names a line inside the file, and SQLite's integrity check
 * passes. */
#include "fuzz-common.h"
#include "import.h"
#include "project.h"

static char   *template_bytes;   /* an empty project, as created */
static gsize   template_size;

int
LLVMFuzzerInitialize (int *argc, char ***argv)
{
  g_autofree char *path = NULL;
  g_autoptr (GError) error = NULL;
  SlProject *project;

  fuzz_init ();
  path = g_build_filename (fuzz_dir, "template.starledger", NULL);
  project = sl_project_create (path, &error);
  g_assert_no_error (error);
  sl_project_close (project);
  g_assert_true (g_file_get_contents (path, &template_bytes, &template_size, NULL));
  return 0;
}

/* The options line: maps, delimiter, missing tokens.  Bad map specs are
 * skipped here: their own parser is fuzzed in fuzz-numbers. */
static void
parse_options (const char *line, GArray *maps, GPtrArray *missing, char *delimiter)
{
  g_auto (GStrv) items = g_strsplit (line, "|", 16);

  for (guint i = 0; items[i]; i++)
    {
      SlColumnMap map;

      if (g_str_has_prefix (items[i], "delimiter=") && strlen (items[i]) == 11)
        *delimiter = items[i][10];
      else if (g_str_has_prefix (items[i], "missing="))
        g_ptr_array_add (missing, g_strdup (items[i] + 8));
      else if (sl_column_map_parse (items[i], &map, NULL))
        g_array_append_val (maps, map);
    }
  g_ptr_array_add (missing, NULL);
}

static void
check_consistent (SlProject *project, const SlImportReport *report, guint64 lines)
{
  g_autoptr (GError) error = NULL;
  sqlite3_stmt *stmt;

  g_assert_cmpuint (report->rows_accepted + report->rejections->len, ==, report->rows_read);
  for (guint i = 0; i < report->rejections->len; i++)
    {
      const SlRejection *r = &g_array_index (report->rejections, SlRejection, i);

      g_assert_cmpuint (r->line, >=, 1);
      g_assert_cmpuint (r->line, <=, lines + 1);
      g_assert_nonnull (r->reason);
    }
  stmt = sl_project_prepare (project, "PRAGMA integrity_check", &error);
  g_assert_no_error (error);
  g_assert_cmpint (sqlite3_step (stmt), ==, SQLITE_ROW);
  g_assert_cmpstr ((const char *) sqlite3_column_text (stmt, 0), ==, "ok");
  sqlite3_finalize (stmt);
}

int
LLVMFuzzerTestOneInput (const uint8_t *data, size_t size)
{
  const uint8_t *newline = memchr (data, '\n', size);
  size_t options_size = newline ? (size_t) (newline - data) : 0;
  g_autofree char *options_line = fuzz_string (data, options_size);
  g_autofree char *project_path = g_build_filename (fuzz_dir, "fuzz.starledger", NULL);
  g_autofree char *csv_path = g_build_filename (fuzz_dir, "input.csv", NULL);
  g_autoptr (GArray) maps = g_array_new (FALSE, FALSE, sizeof (SlColumnMap));
  g_autoptr (GPtrArray) missing = g_ptr_array_new_with_free_func (g_free);
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  SlImportOptions options;
  const uint8_t *csv = newline ? newline + 1 : data;
  size_t csv_size = size - (size_t) (csv - data);
  char delimiter = 0;
  guint64 lines = 0;

  g_array_set_clear_func (maps, (GDestroyNotify) sl_column_map_clear);
  parse_options (options_line, maps, missing, &delimiter);
  for (size_t i = 0; i < csv_size; i++)
    lines += csv[i] == '\n';

  fuzz_remove_project (project_path);
  fuzz_write_file (project_path, (const uint8_t *) template_bytes, template_size);
  fuzz_write_file (csv_path, csv, csv_size);
  project = sl_project_open (project_path, &error);
  g_assert_no_error (error);

  sl_import_options_init (&options);
  options.maps = (const SlColumnMap *) maps->data;
  options.n_maps = maps->len;
  options.missing = (const char *const *) missing->pdata;
  options.delimiter = strchr (",;\t", delimiter) && delimiter ? delimiter : 0;
  report = sl_import_csv (project, csv_path, &options, &error);
  if (report)
    check_consistent (project, report, lines);
  else
    {
      /* A refused file names itself (bad options name the option). */
      g_assert_nonnull (error);
      if (strstr (error->message, "input.csv") == NULL && !g_str_has_prefix (error->message, "--"))
        g_error ("the message does not name the file: %s", error->message);
    }
  return 0;
}
