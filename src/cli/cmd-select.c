/* cmd-select.c: starledger-cli select PROJECT --where EXPR --into LIST
 *               [--replace] [--description TEXT] */
#include <inttypes.h>
#include <glib/gi18n.h>
#include <stdio.h>

#include "cli.h"
#include "condition.h"
#include "lists.h"
#include "summary.h"

int
sl_cli_select (int argc, char **argv)
{
  g_autofree char *where = NULL;
  g_autofree char *into = NULL;
  g_autofree char *description = NULL;
  gboolean replace = FALSE;
  const GOptionEntry entries[] = {
    { "where", 'w', 0, G_OPTION_ARG_STRING, &where,
      N_("The condition the stars must satisfy (required; see below)"), N_("EXPR") },
    { "into", 0, 0, G_OPTION_ARG_STRING, &into, N_("The list to make (required)"), N_("LIST") },
    { "replace", 0, 0, G_OPTION_ARG_NONE, &replace,
      N_("Make the list anew if it exists (stars that stay keep their priority, tags and notes)"), NULL },
    { "description", 0, 0, G_OPTION_ARG_STRING, &description, N_("What the list is for"), N_("TEXT") },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("select", _("PROJECT"), _("Make a named target list of the stars that satisfy a condition."),
                        /* xgettext:no-c-format */
                        _("A condition compares names with numbers or text and joins the comparisons with "
                          "and, or, not and parentheses:\n"
                          "  teff > 5000 and dist < 100\n"
                          "  (vmag <= 8 or plx_snr >= 20) and not flag:low_parallax_snr\n"
                          "  sptype ~ \"V\" and spclass != 'M5V' and radius_hi < 2\n"
                          "  ebv is missing\n"
                          "Numbers: < <= > >= = !=. Text (id, sptype, spclass): = and != (exact), ~ (contains, "
                          "ignoring case), in '...' or \"...\" with \\ before a quote inside.\n"
                          "Names: every derived value (each number also as NAME_lo and NAME_hi, the bounds of its "
                          "68% interval), every input field (the value the derivation used), id, and flag:NAME "
                          "(a flag, or flag:stale).\n"
                          "Only derived stars are selected; a missing value satisfies no comparison, "
                          "negated or not ('X is missing' tests for it). The list, the condition and the "
                          "count go to the ledger."),
                        entries);
  g_autoptr (SlCondition) condition = NULL;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (SlProjectSummary) summary = NULL;
  g_autoptr (GPtrArray) infos = NULL;
  g_autoptr (GError) error = NULL;
  gint64 n;

  if (!sl_cli_parse (context, "select", &argc, &argv, 1))
    return SL_EXIT_USAGE;
  if (where == NULL)
    return sl_cli_usage_error ("select", _("--where EXPR is required"));
  if (into == NULL)
    return sl_cli_usage_error ("select", _("--into LIST is required"));

  /* The condition's mistakes are the user's to fix: one line, exit 1,
   * before the project is touched. */
  condition = sl_condition_compile (where, &error);
  if (condition == NULL)
    {
      g_prefix_error (&error, "--where: ");
      return sl_cli_fail (error);
    }

  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  n = sl_list_create_from_condition (project, into, where, description, replace, &error);
  if (n < 0)
    return sl_cli_fail (error);
  printf (g_dngettext (GETTEXT_PACKAGE, "list %s: %" PRId64 " star\n",
                       "list %s: %" PRId64 " stars\n", n), into, n);

  /* What the user should know about the stars the condition could not see. */
  summary = sl_project_summary (project, NULL);
  infos = sl_list_infos (project, NULL);
  if (summary && summary->n_stars > summary->n_derived)
    fprintf (stderr, g_dngettext (GETTEXT_PACKAGE,
                                  "starledger-cli select: note: %" PRId64 " star has never been derived "
                                  "and cannot be selected; run 'derive'\n",
                                  "starledger-cli select: note: %" PRId64 " stars have never been derived "
                                  "and cannot be selected; run 'derive'\n",
                                  summary->n_stars - summary->n_derived),
             summary->n_stars - summary->n_derived);
  for (guint i = 0; infos && i < infos->len; i++)
    {
      const SlListInfo *info = infos->pdata[i];

      if (g_strcmp0 (info->name, into) == 0 && info->n_stale > 0)
        fprintf (stderr, g_dngettext (GETTEXT_PACKAGE,
                                      "starledger-cli select: note: %" PRId64 " star of the list has "
                                      "stale derived values (its inputs changed); run 'derive' and select again\n",
                                      "starledger-cli select: note: %" PRId64 " stars of the list have "
                                      "stale derived values (their inputs changed); run 'derive' and select again\n",
                                      info->n_stale),
                 info->n_stale);
    }
  return SL_EXIT_OK;
}
