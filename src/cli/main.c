/* main.c: starledger-cli, the whole job without a display.
 *
 * Dispatches "starledger-cli COMMAND ..." to one function per command; each
 * command parses its own options (cmd-*.c).
 */
#include <glib/gi18n.h>
#include <locale.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"

static const SlCliCommand commands[] = {
  { "new",     sl_cli_new,     N_("Create an empty project file") },
  { "import",  sl_cli_import,  N_("Import a CSV file of measurements as a new source") },
  { "split",   sl_cli_split,   N_("Undo matches by position: rows become stars of their own") },
  { "combine", sl_cli_combine, N_("Show or set how several sources' measurements are combined") },
  { "derive",  sl_cli_derive,  N_("Derive physical quantities with their uncertainties") },
  { "explain", sl_cli_explain, N_("Show how a value was obtained, down to the raw rows") },
  { "override", sl_cli_override, N_("Set a derived value by hand, or clear it") },
  { "verify",  sl_cli_verify,  N_("Recompute every derived value and compare") },
  { "figure",  sl_cli_figure,  N_("Draw an HR diagram, a sky map or parallax paths for a paper") },
  { "export",  sl_cli_export,  N_("Write the stars' values as a CSV or LaTeX table") },
  { "select",  sl_cli_select,  N_("Make a target list of the stars that satisfy a condition") },
  { "lists",   sl_cli_lists,   N_("Show the project's target lists") },
  { "summary", sl_cli_summary, N_("Show what a project holds") },
  { "ledger",  sl_cli_ledger,  N_("Show the project's audit log") },
  { "methods", sl_cli_methods, N_("List every derivation method with its source and validity") },
};

static void
print_commands (FILE *out)
{
  fprintf (out, _("Usage:\n  starledger-cli COMMAND [OPTION…]\n\n"));
  fprintf (out, _("Keep a star catalogue's measurements, derived values and their provenance "
                  "in one project file.\n\nCommands:\n"));
  for (gsize i = 0; i < G_N_ELEMENTS (commands); i++)
    fprintf (out, "  %-9s %s\n", commands[i].name, _(commands[i].summary));
  fprintf (out, _("\nRun 'starledger-cli COMMAND --help' for a command's options.\n"));
}

int
main (int argc, char **argv)
{
  setlocale (LC_ALL, "");
  bindtextdomain (GETTEXT_PACKAGE, LOCALEDIR);
  bind_textdomain_codeset (GETTEXT_PACKAGE, "UTF-8");
  textdomain (GETTEXT_PACKAGE);
  g_set_prgname ("starledger-cli");

  if (argc < 2)
    {
      print_commands (stderr);
      return SL_EXIT_USAGE;
    }
  if (strcmp (argv[1], "--help") == 0 || strcmp (argv[1], "-h") == 0
      || strcmp (argv[1], "help") == 0)
    {
      print_commands (stdout);
      return SL_EXIT_OK;
    }
  if (strcmp (argv[1], "--version") == 0)
    {
      printf ("starledger-cli %s\n", PACKAGE_VERSION);
      return SL_EXIT_OK;
    }

  for (gsize i = 0; i < G_N_ELEMENTS (commands); i++)
    if (strcmp (argv[1], commands[i].name) == 0)
      {
        g_autofree char *prgname = g_strdup_printf ("starledger-cli %s", commands[i].name);

        g_set_prgname (prgname);
        return commands[i].run (argc - 1, argv + 1);
      }

  fprintf (stderr, _("starledger-cli: '%s' is not a command.\n\n"), argv[1]);
  print_commands (stderr);
  return SL_EXIT_USAGE;
}
