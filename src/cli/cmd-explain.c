/* cmd-explain.c: starledger-cli explain PROJECT ID QUANTITY [--json] */
#include <glib/gi18n.h>
#include <stdio.h>

#include "cli.h"
#include "explain.h"

int
sl_cli_explain (int argc, char **argv)
{
  gboolean json = FALSE;
  const GOptionEntry entries[] = {
    { "json", 0, 0, G_OPTION_ARG_NONE, &json, N_("Write JSON for scripts"), NULL },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("explain", _("PROJECT ID QUANTITY"),
                        _("Show how a value was obtained, down to the raw rows."),
                        _("QUANTITY is a derived quantity (dist, teff, lum, ...) or an input field (parallax, "
                          "vmag, ...). Each step gives its method and citation, formula, validity, parameters "
                          "and the values it gave; each raw input its source file, SHA-256, line and column, "
                          "who imported it and when."),
                        entries);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GString) out = g_string_new (NULL);

  if (!sl_cli_parse (context, "explain", &argc, &argv, 3))
    return SL_EXIT_USAGE;
  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  if (!sl_explain (project, argv[2], argv[3], json ? SL_EXPLAIN_JSON : SL_EXPLAIN_TEXT, out, &error))
    return sl_cli_fail (error);
  fputs (out->str, stdout);
  return SL_EXIT_OK;
}
