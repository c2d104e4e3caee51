/* fuzz-condition.c: the target-list condition language on any text.  A
 * text the compiler accepts must become SQL that SQLite prepares and runs
 * against a project with derived stars, its literals bound (never pasted
 * into the SQL); a text it refuses must say where ("at COLUMN:"). */
#include "condition.h"
#include "derivation.h"
#include "fuzz-common.h"
#include "import.h"
#include "project.h"

static SlProject *project;

int
LLVMFuzzerInitialize (int *argc, char ***argv)
{
  static const char csv[] =
    "id,ra,ra_err,dec,dec_err,parallax,parallax_err,vmag,vmag_err,bv,bv_err,sptype\n"
    "A,10,1,20,1,100,0.5,5.0,0.01,0.65,0.01,G2 V\n"
    "B,200,1,-40,1,2,1.5,12.0,0.02,1.4,0.02,K5 III\n"
    "C,300,1,60,1,,,,,,,\n";
  g_autofree char *path = NULL;
  g_autofree char *input = NULL;
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GError) error = NULL;
  SlImportOptions options;
  SlDeriveParams params;
  SlDeriveReport derived;

  fuzz_init ();
  path = g_build_filename (fuzz_dir, "condition.starledger", NULL);
  input = g_build_filename (fuzz_dir, "stars.csv", NULL);
  fuzz_write_file (input, (const uint8_t *) csv, sizeof csv - 1);
  project = sl_project_create (path, &error);
  g_assert_no_error (error);
  sl_import_options_init (&options);
  report = sl_import_csv (project, input, &options, &error);
  g_assert_no_error (error);
  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (project, &params, FALSE, NULL, NULL, NULL, &derived, &error));
  return 0;
}

int
LLVMFuzzerTestOneInput (const uint8_t *data, size_t size)
{
  g_autofree char *text = fuzz_string (data, size);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlCondition) condition = sl_condition_compile (text, &error);
  g_autofree char *sql = NULL;
  sqlite3_stmt *stmt;
  int rc;

  if (condition == NULL)
    {
      if (!g_str_has_prefix (error->message, "at "))
        g_error ("'%s': the message does not say where: %s", text, error->message);
      return 0;
    }
  sql = sl_condition_select_sql (condition);
  stmt = sl_project_prepare (project, sql, &error);
  if (stmt == NULL)
    g_error ("'%s' compiled to SQL SQLite refuses: %s\n%s", text, error->message, sql);
  sl_condition_bind (condition, stmt, 1);
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    ;
  if (rc != SQLITE_DONE)
    g_error ("'%s': %s", text, sqlite3_errmsg (sl_project_db (project)));
  sqlite3_finalize (stmt);
  return 0;
}
