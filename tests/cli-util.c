/* cli-util.c: running starledger-cli from a test program (cli-util.h). */
#include "cli-util.h"

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
run_cli_in_locale (CliResult *r, const char *locale, const char *first, ...)
{
  g_autoptr (GPtrArray) argv = g_ptr_array_new ();
  g_auto (GStrv) envp = g_get_environ ();
  g_autoptr (GError) error = NULL;
  const char *arg;
  va_list args;

  g_ptr_array_add (argv, (gpointer) g_getenv ("STARLEDGER_CLI"));
  va_start (args, first);
  for (arg = first; arg != NULL; arg = va_arg (args, const char *))
    g_ptr_array_add (argv, (gpointer) arg);
  va_end (args);
  g_ptr_array_add (argv, NULL);
  if (locale)
    envp = g_environ_setenv (envp, "LC_ALL", locale, TRUE);

  g_spawn_sync (NULL, (char **) argv->pdata, envp, G_SPAWN_DEFAULT, NULL, NULL,
                &r->out, &r->err, &r->status, &error);
  g_assert_no_error (error);
  r->status = WIFEXITED (r->status) ? WEXITSTATUS (r->status) : 128;
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
}

void
assert_one_line (const char *text)
{
  const char *newline = strchr (text, '\n');

  if (newline == NULL || newline[1] != '\0')
    g_error ("want one line of message, got \"%s\"", text);
}
