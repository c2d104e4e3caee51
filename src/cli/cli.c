/* cli.c: option parsing and error reporting shared by the commands. */
#include "cli.h"

#include <glib/gi18n.h>
#include <stdio.h>

#include "units.h"

GOptionContext *
sl_cli_context_new (const char *command, const char *parameters, const char *summary,
                    const char *description, const GOptionEntry *entries)
{
  GOptionContext *context = g_option_context_new (parameters);

  g_option_context_set_summary (context, summary);
  if (description)
    g_option_context_set_description (context, description);
  if (entries)
    g_option_context_add_main_entries (context, entries, GETTEXT_PACKAGE);
  g_option_context_set_translation_domain (context, GETTEXT_PACKAGE);
  return context;
}

gboolean
sl_cli_parse_number_option (const char *text, double *value, double min, double max)
{
  const char *problem;
  double parsed;

  if (text == NULL)
    return TRUE;
  if (!sl_parse_number (text, &parsed, &problem))
    return FALSE;
  *value = parsed;
  return parsed >= min && parsed <= max;
}

int
sl_cli_usage_error (const char *command, const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;

  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  fprintf (stderr, "starledger-cli %s: %s\n", command, message);
  fprintf (stderr, _("Try 'starledger-cli %s --help'.\n"), command);
  return SL_EXIT_USAGE;
}

gboolean
sl_cli_parse (GOptionContext *context, const char *command, int *argc, char ***argv,
              int n_args)
{
  g_autoptr (GError) error = NULL;
  int positional;

  if (!g_option_context_parse (context, argc, argv, &error))
    {
      sl_cli_usage_error (command, "%s", error->message);
      return FALSE;
    }
  positional = *argc - 1;
  if ((n_args >= 0 && positional != n_args) || (n_args < 0 && positional < -n_args))
    {
      sl_cli_usage_error (command,
                          positional < ABS (n_args) ? _("missing arguments")
                                                    : _("too many arguments"));
      return FALSE;
    }
  return TRUE;
}

int
sl_cli_fail (GError *error)
{
  fprintf (stderr, "starledger-cli: %s\n", error->message);
  return SL_EXIT_FAILURE;
}

SlProject *
sl_cli_open_project (const char *path)
{
  g_autoptr (GError) error = NULL;
  SlProject *project = sl_project_open (path, &error);

  if (project == NULL)
    sl_cli_fail (error);
  return project;
}
