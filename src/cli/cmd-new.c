/* cmd-new.c: starledger-cli new PROJECT */
#include <glib/gi18n.h>
#include <stdio.h>

#include "cli.h"

int
sl_cli_new (int argc, char **argv)
{
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("new", _("PROJECT"), _("Create an empty project file."),
                        _("Project files conventionally end in .starledger. The file must "
                          "not exist yet."), NULL);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlProject) project = NULL;

  if (!sl_cli_parse (context, "new", &argc, &argv, 1))
    return SL_EXIT_USAGE;

  project = sl_project_create (argv[1], &error);
  if (project == NULL)
    return sl_cli_fail (error);
  printf (_("created %s\n"), argv[1]);
  return SL_EXIT_OK;
}
