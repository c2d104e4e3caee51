/* cmd-split.c: starledger-cli split PROJECT SOURCE:LINE... */
#include <glib/gi18n.h>
#include <stdio.h>

#include "cli.h"
#include "matching.h"

int
sl_cli_split (int argc, char **argv)
{
  const GOptionEntry entries[] = {
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("split", _("PROJECT SOURCE:LINE…"),
                        _("Undo matches by position: each row becomes a star of its own again."),
                        _("SOURCE is the source's number or name (see 'starledger-cli summary'), LINE the "
                          "row's first line in its file; 'starledger-cli explain' shows both for every row "
                          "joined to a star by position. The new star is named by the row's id (with the "
                          "source's number if that name is taken). All the rows are split in one "
                          "transaction with one ledger entry; the stars they leave must be derived again."),
                        entries);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GArray) refs = g_array_new (FALSE, TRUE, sizeof (SlRowRef));
  g_autoptr (GPtrArray) names = g_ptr_array_new_with_free_func (g_free);

  g_array_set_clear_func (refs, (GDestroyNotify) sl_row_ref_clear);
  if (!sl_cli_parse (context, "split", &argc, &argv, -2))
    return SL_EXIT_USAGE;
  for (int i = 2; i < argc; i++)
    {
      SlRowRef ref;

      if (!sl_row_ref_parse (argv[i], &ref, &error))
        return sl_cli_usage_error ("split", "%s", error->message);
      g_array_append_val (refs, ref);
    }

  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  if (!sl_match_split (project, (const SlRowRef *) refs->data, refs->len, names, &error))
    return sl_cli_fail (error);
  for (guint i = 0; i < names->len; i++)
    printf (_("%s: now star '%s'\n"), argv[i + 2], (const char *) names->pdata[i]);
  return SL_EXIT_OK;
}
