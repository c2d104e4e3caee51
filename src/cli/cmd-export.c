/* cmd-export.c: starledger-cli export PROJECT [-o FILE] [--format csv|tex] [--list NAME]
 *                                     [--columns A,B,...] [--epoch JYEAR] */
#include <glib/gi18n.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "export.h"
#include "units.h"
#include "vocabulary.h"

int
sl_cli_export (int argc, char **argv)
{
  g_autofree char *output = NULL;
  g_autofree char *format = NULL;
  g_autofree char *columns_text = NULL;
  g_autofree char *list = NULL;
  g_autofree char *epoch_text = NULL;
  const GOptionEntry entries[] = {
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output,
      N_("Write to FILE (default and '-': standard output)"), N_("FILE") },
    { "format", 0, 0, G_OPTION_ARG_STRING, &format,
      N_("Table format: csv (default) or tex (a LaTeX tabular)"), N_("FORMAT") },
    { "columns", 0, 0, G_OPTION_ARG_STRING, &columns_text,
      N_("Only these quantities, comma-separated (id always comes first)"), N_("A,B,…") },
    { "list", 0, 0, G_OPTION_ARG_STRING, &list,
      N_("Only the stars of this target list (see 'lists')"), N_("NAME") },
    { "epoch", 0, 0, G_OPTION_ARG_STRING, &epoch_text,
      N_("Positions carried to this epoch (Julian year, e.g. 2030 or J2030.0) with each star's "
         "proper motion"), N_("JYEAR") },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("export", _("PROJECT"), _("Write the stars' values as a CSV or LaTeX table."),
                        /* xgettext:no-c-format */
                        _("One row per star. Each number q is written as three columns: q, q_lo "
                          "and q_hi, the value and the bounds of its 68% interval; an empty cell "
                          "means no value.\nRight ascension and declination are ICRS, in degrees, "
                          "at the epoch in the epoch column: each star's catalogue epoch, or with --epoch the "
                          "epoch asked for. --epoch carries each position with its proper motion "
                          "(and parallax and radial velocity where known) and widens its interval by "
                          "the proper-motion error times the years between; a star without a proper "
                          "motion or an epoch keeps its catalogue position and epoch and is flagged "
                          "position_not_propagated.\nWhere several sources measured a "
                          "star, each group of values (position, parallax, proper motion, each "
                          "magnitude) comes from the measurement with the smallest uncertainty.\n"
                          "Derived values follow the inputs, then flags ('|'-separated; 'stale' when the "
                          "inputs changed since the run, 'not_derived' before any run). The LaTeX table "
                          "gives value^{+plus}_{-minus}, rounded to the uncertainty's significant digits."),
                        entries);
  g_auto (GStrv) columns = NULL;
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  SlExportOptions options = { SL_EXPORT_CSV, NULL, NULL, NULL };

  if (!sl_cli_parse (context, "export", &argc, &argv, 1))
    return SL_EXIT_USAGE;
  if (format != NULL && strcmp (format, "csv") != 0 && strcmp (format, "tex") != 0)
    return sl_cli_usage_error ("export", _("--format %s: the formats are: csv, tex"), format);
  if (format != NULL && strcmp (format, "tex") == 0)
    options.format = SL_EXPORT_TEX;
  if (columns_text != NULL)
    {
      columns = g_strsplit (columns_text, ",", -1);
      for (guint i = 0; columns[i]; i++)
        g_strstrip (columns[i]);
      options.columns = (const char *const *) columns;
    }
  options.list = list;
  if (epoch_text != NULL)
    {
      const char *text = epoch_text + (epoch_text[0] == 'J' || epoch_text[0] == 'j');
      const char *problem;
      char *reason = NULL;

      if (!sl_parse_number (text, &options.epoch, &problem))
        return sl_cli_usage_error ("export", "--epoch %s: %s", epoch_text, _(problem));
      if (!sl_field_check_value (SL_FIELD_EPOCH, options.epoch, &reason))
        {
          sl_cli_usage_error ("export", "--epoch: %s", reason);
          g_free (reason);
          return SL_EXIT_USAGE;
        }
      options.at_epoch = TRUE;
    }

  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  if (sl_export (project, output ? output : "-", &options, &error) < 0)
    return sl_cli_fail (error);
  return SL_EXIT_OK;
}
