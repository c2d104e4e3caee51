/* cmd-lists.c: starledger-cli lists PROJECT */
#include <inttypes.h>
#include <glib/gi18n.h>
#include <stdio.h>

#include "cli.h"
#include "lists.h"

int
sl_cli_lists (int argc, char **argv)
{
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("lists", _("PROJECT"), _("Show the project's target lists."),
                        _("For each list, by name: how many stars it holds, who made it and when "
                          "(UTC), the condition it was selected by (none for a list made by hand) and "
                          "its description. 'export --list NAME' writes its stars."),
                        NULL);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GPtrArray) infos = NULL;
  g_autoptr (GError) error = NULL;

  if (!sl_cli_parse (context, "lists", &argc, &argv, 1))
    return SL_EXIT_USAGE;
  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;

  infos = sl_list_infos (project, &error);
  if (infos == NULL)
    return sl_cli_fail (error);
  if (infos->len == 0)
    printf (_("no lists; 'starledger-cli select' makes one\n"));
  for (guint i = 0; i < infos->len; i++)
    {
      const SlListInfo *info = infos->pdata[i];

      printf (g_dngettext (GETTEXT_PACKAGE, "%s: %" PRId64 " star, made by %s at %s\n",
                           "%s: %" PRId64 " stars, made by %s at %s\n", info->n_stars),
              info->name, info->n_stars, info->created_by, info->created_at);
      if (info->condition)
        printf (_("  where %s\n"), g_strdelimit (info->condition, "\t\r\n", ' '));
      else
        printf (_("  no condition: made by hand\n"));
      if (info->description && *info->description)
        printf ("  %s\n", info->description);
      if (info->n_stale > 0)
        printf (g_dngettext (GETTEXT_PACKAGE, "  %" PRId64 " star with stale derived values\n",
                             "  %" PRId64 " stars with stale derived values\n", info->n_stale),
                info->n_stale);
    }
  return SL_EXIT_OK;
}
