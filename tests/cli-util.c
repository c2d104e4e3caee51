/* cli-util.c: running starledger-cli from a test program (cli-util.h). */
#include "cli-util.h"
#include "test-util.h"

#include <stdarg.h>
#include <string.h>
#include <sys/wait.h>

void
cli_result_clear (CliResult *r)
{
  g_free (r->out);
  g_free (r->err);
}

void
run_cli_va (CliResult *r, const char *locale, GSpawnChildSetupFunc child_setup, gpointer child_data,
            const char *first, va_list args)
{
  g_autoptr (GPtrArray) argv = g_ptr_array_new ();
  g_auto (GStrv) envp = g_get_environ ();
  g_autoptr (GError) error = NULL;

  g_ptr_array_add (argv, (gpointer) g_getenv ("STARLEDGER_CLI"));
  for (const char *arg = first; arg != NULL; arg = va_arg (args, const char *))
    g_ptr_array_add (argv, (gpointer) arg);
  g_ptr_array_add (argv, NULL);
  if (locale)
    envp = g_environ_setenv (envp, "LC_ALL", locale, TRUE);

  g_spawn_sync (NULL, (char **) argv->pdata, envp, G_SPAWN_DEFAULT, child_setup, child_data,
                &r->out, &r->err, &r->status, &error);
  g_assert_no_error (error);
  r->status = WIFEXITED (r->status) ? WEXITSTATUS (r->status) : 128;
}

void
run_cli_in_locale (CliResult *r, const char *locale, const char *first, ...)
{
  va_list args;

  va_start (args, first);
  run_cli_va (r, locale, NULL, NULL, first, args);
  va_end (args);
}

char *
demo_file (const char *name)
{
  return g_build_filename (g_getenv ("STARLEDGER_SOURCE_DIR"), "data", "demo", name, NULL);
}

void
import_demo (const char *project, const char *locale, CliResult *astrometry, CliResult *photometry)
{
  g_autofree char *a = demo_file ("astrometry.csv");
  g_autofree char *p = demo_file ("photometry.csv");
  g_auto (CliResult) created = { 0 };

  run_cli_in_locale (&created, locale, "new", project, NULL);
  g_assert_cmpint (created.status, ==, 0);
  run_cli_in_locale (astrometry, locale, "import", project, a, NULL);
  run_cli_in_locale (photometry, locale, "import", project, p,
                     "--map", "id=star", "--map", "ra=ra_sexa:hms", "--map", "dec=dec_sexa:dms",
                     "--map", "vmag=v", "--map", "vmag_err=v_sigma", "--map", "bv=b_minus_v",
                     "--map", "bv_err=b_minus_v_sigma", "--map", "ebv=reddening", "--map", "ebv_err=reddening_sigma",
                     "--map", "sptype=spectral_type", "--missing", "99.99", "--epoch", "2000.0", NULL);
  /* The second-epoch survey joins by position (data/demo/README.md). */
  {
    g_autofree char *second = demo_file ("second-epoch.csv");
    g_auto (CliResult) matched = { 0 };

    run_cli_in_locale (&matched, locale, "import", project, second, "--source-name", "Tarn Ridge second epoch 2016",
                       "--map", "id=trs_id", "--map", "ra=ra_deg", "--map", "ra_err=ra_err_mas",
                       "--map", "dec=dec_deg", "--map", "dec_err=dec_err_mas", "--match-radius", "1", NULL);
    g_assert_cmpint (matched.status, ==, 0);
  }
}

void
assert_one_line (const char *text)
{
  const char *newline = strchr (text, '\n');

  if (newline == NULL || newline[1] != '\0')
    g_error ("want one line of message, got \"%s\"", text);
}

void
cli_test_init (int *argc, char ***argv)
{
  g_test_init (argc, argv, NULL);

  if (g_getenv ("STARLEDGER_CLI") == NULL)
    g_error ("STARLEDGER_CLI must name the starledger-cli binary (meson test sets it)");
}

void
assert_contains (const char *text, const char *needle)
{
  if (text == NULL || strstr (text, needle) == NULL)
    g_error ("want \"%s\" in:\n%s", needle, text ? text : "(null)");
}

void
assert_lacks (const char *text, const char *needle)
{
  if (text != NULL && strstr (text, needle) != NULL)
    g_error ("want no \"%s\" in:\n%s", needle, text);
}

void
assert_prefix (const char *text, const char *prefix)
{
  if (text == NULL || !g_str_has_prefix (text, prefix))
    g_error ("want a text starting \"%s\", got:\n%s", prefix, text ? text : "(null)");
}

void
assert_user_error (const CliResult *r, const char *needle)
{
  if (r->status != 1)
    g_error ("want exit status 1 (a user error), got %d; stderr:\n%s", r->status, r->err);
  assert_one_line (r->err);
  if (needle != NULL)
    assert_contains (r->err, needle);
}

static void
assert_command_usage (const char *command)
{
  g_auto (CliResult) help = { 0 };
  g_auto (CliResult) missing = { 0 };
  g_auto (CliResult) bad_option = { 0 };

  run_cli (&help, command, "--help", NULL);
  g_assert_cmpint (help.status, ==, 0);
  assert_contains (help.out, "Usage:");
  run_cli (&missing, command, NULL);
  g_assert_cmpint (missing.status, ==, 2);
  run_cli (&bad_option, command, "x", "--no-such-option", NULL);
  g_assert_cmpint (bad_option.status, ==, 2);
}

void
assert_commands_usage (const char *const *commands)
{
  g_auto (CliResult) help = { 0 };

  run_cli (&help, "--help", NULL);
  g_assert_cmpint (help.status, ==, 0);
  for (gsize i = 0; commands[i]; i++)
    {
      assert_contains (help.out, commands[i]);
      assert_command_usage (commands[i]);
    }
}

char *
make_derived_demo_project (char **dir)
{
  g_auto (CliResult) a = { 0 };
  g_auto (CliResult) p = { 0 };
  g_auto (CliResult) derived = { 0 };
  char *project;

  *dir = sl_test_scratch_new ();
  project = g_build_filename (*dir, "demo.starledger", NULL);
  import_demo (project, NULL, &a, &p);
  run_cli (&derived, "derive", project, NULL);
  g_assert_cmpint (derived.status, ==, 0);
  return project;
}
