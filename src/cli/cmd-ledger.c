/* cmd-ledger.c: starledger-cli ledger PROJECT */
#include <glib/gi18n.h>
#include <stdio.h>

#include "cli.h"
#include "ledger.h"

int
sl_cli_ledger (int argc, char **argv)
{
  gboolean details = FALSE;
  const GOptionEntry entries[] = {
    { "details", 'd', 0, G_OPTION_ARG_NONE, &details,
      N_("Also print each entry's details (JSON)"), NULL },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("ledger", _("PROJECT"), _("Show the project's audit log, oldest first."),
                        _("Every change to a project is recorded: when (UTC), who, what kind of "
                          "change, and a summary."), entries);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GPtrArray) entries_read = NULL;
  g_autoptr (GError) error = NULL;

  if (!sl_cli_parse (context, "ledger", &argc, &argv, 1))
    return SL_EXIT_USAGE;
  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;

  entries_read = sl_ledger_read (project, &error);
  if (entries_read == NULL)
    return sl_cli_fail (error);
  for (guint i = 0; i < entries_read->len; i++)
    {
      const SlLedgerEntry *entry = entries_read->pdata[i];

      printf ("%s  %-12s  %-8s  %s\n", entry->at, entry->who, entry->action, entry->summary);
      if (details)
        printf ("    %s\n", entry->details);
    }
  return SL_EXIT_OK;
}
