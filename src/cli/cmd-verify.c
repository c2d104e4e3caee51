/* cmd-verify.c: starledger-cli verify PROJECT */
#include <inttypes.h>
#include <glib/gi18n.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "derivation.h"

int
sl_cli_verify (int argc, char **argv)
{
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("verify", _("PROJECT"),
                        _("Recompute every derived value and compare it with the stored one."),
                        _("Each derived value is recomputed from the raw measurements with the parameters "
                          "and method versions recorded with its run, and compared bit for bit (Monte Carlo "
                          "values with their recorded seed). SQLite's integrity check runs too. Exit status "
                          "1 and a list of differences if anything differs."),
                        NULL);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (SlVerifyReport) report = NULL;
  g_autoptr (GError) error = NULL;
  gboolean intact;

  if (!sl_cli_parse (context, "verify", &argc, &argv, 1))
    return SL_EXIT_USAGE;
  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  report = sl_verify (project, NULL, &error);
  if (report == NULL)
    return sl_cli_fail (error);

  intact = strcmp (report->integrity, "ok") == 0;
  for (guint i = 0; i < report->mismatches->len; i++)
    fprintf (stderr, "%s: %s\n", argv[1], (const char *) report->mismatches->pdata[i]);
  if (!intact)
    fprintf (stderr, _("%s: SQLite integrity check: %s\n"), argv[1], report->integrity);
  printf (_("checked %" PRIu64 " stars: %u differences; %" PRIu64
            " stale (inputs changed since their run: run 'derive'); integrity %s\n"),
          report->checked, report->mismatches->len, report->stale, intact ? "ok" : _("FAILED"));
  return report->mismatches->len == 0 && intact ? SL_EXIT_OK : SL_EXIT_FAILURE;
}
