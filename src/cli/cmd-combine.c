/* cmd-combine.c: starledger-cli combine PROJECT [--rule GROUP=RULE]...
 *                [--source-order NAME]... [--level P]
 *
 * Shows or sets the project's combination policy: how the rows of several
 * sources that measured one quantity of a star become the value the
 * derivation uses (core: combine.h, inputs.h). */
#include <glib/gi18n.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "inputs.h"
#include "util.h"

/* GROUP=RULE into POLICY; FALSE with a usage message. */
static gboolean
parse_rule (const char *text, SlCombinePolicy *policy)
{
  g_auto (GStrv) parts = g_strsplit (text, "=", 2);
  SlCombineRule rule;
  SlField lead;

  if (g_strv_length (parts) != 2 || !sl_combine_rule_from_name (parts[1], &rule))
    {
      sl_cli_usage_error ("combine", _("--rule %s: expected GROUP=RULE, RULE one of smallest-error, priority, "
                                       "weighted-mean"), text);
      return FALSE;
    }
  if (strcmp (parts[0], "all") == 0)
    {
      for (SlField f = 0; f < SL_N_FIELDS; f++)
        if (sl_combine_group_name (f) != NULL && sl_combine_rule_allowed (f, rule))
          policy->rule[f] = rule;
      return TRUE;
    }
  if (!sl_combine_group_from_name (parts[0], &lead))
    {
      sl_cli_usage_error ("combine", _("--rule %s: '%s' is no group; expected position, parallax, pm, vmag, "
                                       "bmag, bv, ebv, vrad or all"), text, parts[0]);
      return FALSE;
    }
  if (!sl_combine_rule_allowed (lead, rule))
    {
      sl_cli_usage_error ("combine", _("--rule %s: positions are not averaged (rows of different epochs "
                                       "differ by the proper motion)"), text);
      return FALSE;
    }
  policy->rule[lead] = rule;
  return TRUE;
}

static void
print_policy (const SlCombinePolicy *policy)
{
  char level[G_ASCII_DTOSTR_BUF_SIZE];

  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (sl_combine_group_name (f) != NULL)
      printf ("%-9s %s\n", sl_combine_group_name (f), sl_combine_rule_name (policy->rule[f]));
  if (policy->priority[0] != '\0')
    {
      g_auto (GStrv) names = g_strsplit (policy->priority, "\n", -1);

      printf (_("source order:\n"));
      for (guint i = 0; names[i] != NULL; i++)
        printf ("  %u. %s\n", i + 1, names[i]);
    }
  else
    printf (_("source order: none (the priority rule then takes the smallest uncertainty)\n"));
  if (policy->level > 0)
    printf (_("agreement test: sources disagree when the chi-square probability is below %s\n"),
            sl_format_double (level, policy->level));
  else
    printf (_("agreement test: off\n"));
}

int
sl_cli_combine (int argc, char **argv)
{
  g_auto (GStrv) rules = NULL;
  g_auto (GStrv) order = NULL;
  g_autofree char *level = NULL;
  gboolean clear_order = FALSE;
  const GOptionEntry entries[] = {
    { "rule", 0, 0, G_OPTION_ARG_STRING_ARRAY, &rules,
      N_("How GROUP's rows are combined: smallest-error, priority or weighted-mean (GROUP all for every group)"),
      N_("GROUP=RULE") },
    { "source-order", 0, 0, G_OPTION_ARG_STRING_ARRAY, &order,
      N_("The sources the priority rule prefers, most preferred first (repeat; replaces the order)"),
      N_("NAME") },
    { "clear-source-order", 0, 0, G_OPTION_ARG_NONE, &clear_order, N_("Forget the source order"), NULL },
    { "level", 0, 0, G_OPTION_ARG_STRING, &level,
      N_("Flag a star when its sources' chi-square probability is below P (default 0.01; 0: no test)"),
      N_("P") },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("combine", _("PROJECT"),
                        _("Show or set how several sources' measurements of a star are combined."),
                        _("Groups: position (with its errors and epoch), parallax, pm (both components), "
                          "vmag, bmag, bv, ebv, vrad, each with its error. Rules: smallest-error takes the "
                          "row with the smallest uncertainty (the default); priority takes the row of the "
                          "source listed first by --source-order, then the smallest uncertainty; "
                          "weighted-mean takes the inverse-variance weighted mean of every row with an error "
                          "and its error (Taylor 1997, ch. 7; positions are not averaged). Whatever the rule, "
                          "two or more rows with errors are tested for agreement (chi-square, ch. 12) and a "
                          "star whose sources disagree is flagged sources_disagree. The policy is a project "
                          "setting: changing it marks derived values stale, and each derivation run records "
                          "the policy it used. Without options, prints the policy."),
                        entries);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  SlCombinePolicy policy;
  gboolean change;

  if (!sl_cli_parse (context, "combine", &argc, &argv, 1))
    return SL_EXIT_USAGE;
  change = rules != NULL || order != NULL || clear_order || level != NULL;
  if (order != NULL && clear_order)
    return sl_cli_usage_error ("combine", _("--source-order and --clear-source-order exclude each other"));

  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  if (!sl_combine_policy_read (project, &policy, &error))
    return sl_cli_fail (error);
  if (!change)
    {
      print_policy (&policy);
      return SL_EXIT_OK;
    }

  for (guint i = 0; rules != NULL && rules[i] != NULL; i++)
    if (!parse_rule (rules[i], &policy))
      return SL_EXIT_USAGE;
  if (clear_order)
    policy.priority[0] = '\0';
  if (order != NULL)
    {
      g_autofree char *joined = NULL;

      for (guint i = 0; order[i] != NULL; i++)
        if (order[i][0] == '\0' || strchr (order[i], '\n') != NULL)
          return sl_cli_usage_error ("combine", _("--source-order: a source's name, on one line"));
      joined = g_strjoinv ("\n", order);
      if (g_strlcpy (policy.priority, joined, sizeof policy.priority) >= sizeof policy.priority)
        return sl_cli_usage_error ("combine", _("--source-order: too many or too long names"));
    }
  if (level != NULL && !sl_cli_parse_number_option (level, &policy.level, 0.0, 1.0))
    return sl_cli_usage_error ("combine", _("--level %s: expected a probability in [0, 1)"), level);
  if (!sl_combine_policy_write (project, &policy, &error))
    return sl_cli_fail (error);
  print_policy (&policy);
  return SL_EXIT_OK;
}
