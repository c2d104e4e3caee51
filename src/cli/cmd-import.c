/* cmd-import.c: starledger-cli import PROJECT FILE [options], and with --dry-run
 * the same report of an import that writes nothing. */
#include <inttypes.h>
#include <glib/gi18n.h>
#include <inttypes.h>
#include <float.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "csv-reader.h"
#include "import.h"
#include "units.h"
#include "vocabulary.h"

static gboolean
parse_delimiter (const char *text, char *delimiter)
{
  if (strcmp (text, ",") == 0 || strcmp (text, "comma") == 0)
    *delimiter = ',';
  else if (strcmp (text, ";") == 0 || strcmp (text, "semicolon") == 0)
    *delimiter = ';';
  else if (strcmp (text, "\t") == 0 || strcmp (text, "\\t") == 0 || strcmp (text, "tab") == 0)
    *delimiter = '\t';
  else
    return FALSE;
  return TRUE;
}

static char *
fields_help (void)
{
  GString *help = g_string_new (_("Fields (stored unit; units a column may be declared in):\n"));

  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      const SlFieldInfo *info = sl_field_info (f);

      g_string_append_printf (help, "  %-13s %s", info->name, _(info->description));
      if (info->canonical != SL_UNIT_NONE)
        g_string_append_printf (help, " [%s]", sl_unit_name (info->canonical));
      g_string_append_c (help, '\n');
    }
  g_string_append (help,
                   _("\nUnits: deg, rad, hms (RA only), dms, mas, arcsec, mas/yr, arcsec/yr, mag, "
                     "K, km/s, yr (Julian years, for the epoch).\nSexagesimal values may be written 14 29 42.9, 14:29:42.9 or "
                     "14h29m42.9s.\n\nWithout --map, a header equal to a field name (any case) "
                     "maps to it in the stored unit.\nEmpty cells and NaN are missing values, as "
                     "is every --missing token.\nA row with a bad value is rejected and reported "
                     "as FILE:LINE: COLUMN: reason on stderr;\nthe rest of the file is imported "
                     "in one transaction.\n\nWith --match-radius, each row joins the nearest existing star within the radius, "
                     "both moved to one epoch\n(the --epoch, else the first row's) with their proper motions; "
                     "a row with no star within the\nradius is a new star named by its id.  A row with two or "
                     "more stars within the radius, or whose\nstar is also the nearest of another row, is "
                     "ambiguous: it is not merged but kept as a star of its own,\nreported, and recorded with "
                     "its candidates.  'starledger-cli split' undoes a match."));
  return g_string_free (help, FALSE);
}

/* Ambiguous rows past this many are counted, not listed: each is in the
 * project, where explain shows it. */
#define MAX_AMBIGUOUS_LISTED 100

static void
print_matches (const SlImportReport *report, const char *path)
{
  char epoch[G_ASCII_DTOSTR_BUF_SIZE];

  if (report->ambiguous->len == 0 && report->matched == 0 && !isfinite (report->match_epoch))
    return;
  if (isfinite (report->match_epoch))
    printf (_("matched by position at epoch J%s: %" PRIu64 " rows joined existing stars, "
              "%u ambiguous\n"),
            g_ascii_formatd (epoch, sizeof epoch, "%.3f", report->match_epoch), report->matched,
            report->ambiguous->len);
  else
    printf (_("matched by position as given (no epoch known): %" PRIu64 " rows joined existing "
              "stars, %u ambiguous\n"),
            report->matched, report->ambiguous->len);
  for (guint i = 0; i < report->ambiguous->len && i < MAX_AMBIGUOUS_LISTED; i++)
    {
      const SlAmbiguousRow *a = &g_array_index (report->ambiguous, SlAmbiguousRow, i);

      printf (_("%s:%u: ambiguous, not merged: %s; kept as star '%s'\n"), path, a->line,
              a->explanation, a->designation);
    }
  if (report->ambiguous->len > MAX_AMBIGUOUS_LISTED)
    printf (_("… and %u more ambiguous rows, each kept as a star of its own\n"),
            report->ambiguous->len - MAX_AMBIGUOUS_LISTED);
}

static void
print_report (const SlImportReport *report, const char *path, gboolean dry_run)
{
  if (dry_run)
    {
      /* The same report, worded as what would happen: nothing was written. */
      printf (_("dry run: would import %" PRIu64 " rows, reject %u; nothing was written\n"),
              report->rows_accepted, report->rejections->len);
      printf (_("file %s, %s-delimited, SHA-256 %.16s…, %" PRIu64 " new stars\n"),
              report->file_name, sl_csv_delimiter_name (report->delimiter), report->sha256,
              report->new_stars);
    }
  else
    {
      printf (_("imported %" PRIu64 " rows, rejected %u\n"),
              report->rows_accepted, report->rejections->len);
      printf (_("source %" PRId64 ": %s, %s-delimited, SHA-256 %.16s…, %" PRIu64
                " new stars\n"),
              report->source_id, report->file_name, sl_csv_delimiter_name (report->delimiter),
              report->sha256, report->new_stars);
    }
  if (report->ignored_columns->len > 0)
    {
      g_autofree char *names = NULL;

      g_ptr_array_add (report->ignored_columns, NULL);
      names = g_strjoinv ("', '", (char **) report->ignored_columns->pdata);
      g_ptr_array_set_size (report->ignored_columns, report->ignored_columns->len - 1);
      printf (_("columns not imported (no field of that name; use --map): '%s'\n"), names);
    }
  for (guint i = 0; i < report->notes->len; i++)
    printf (_("note: %s\n"), (const char *) report->notes->pdata[i]);
  print_matches (report, path);
  for (guint i = 0; i < report->warnings->len; i++)
    printf (_("WARNING: %s\n"), (const char *) report->warnings->pdata[i]);

  for (guint i = 0; i < report->rejections->len; i++)
    {
      const SlRejection *r = &g_array_index (report->rejections, SlRejection, i);

      if (r->column)
        fprintf (stderr, "%s:%u: %s: %s\n", path, r->line, r->column, r->reason);
      else
        fprintf (stderr, "%s:%u: %s\n", path, r->line, r->reason);
    }
}

int
sl_cli_import (int argc, char **argv)
{
  g_auto (GStrv) map_specs = NULL;
  g_auto (GStrv) missing = NULL;
  g_autofree char *delimiter_text = NULL;
  g_autofree char *epoch_text = NULL;
  g_autofree char *source_name = NULL;
  g_autofree char *radius_text = NULL;
  gboolean again = FALSE;
  gboolean dry_run = FALSE;
  const GOptionEntry entries[] = {
    { "map", 'm', 0, G_OPTION_ARG_STRING_ARRAY, &map_specs,
      N_("Take FIELD from COLUMN, written in UNIT (repeatable)"), N_("FIELD=COLUMN[:UNIT]") },
    { "delimiter", 'd', 0, G_OPTION_ARG_STRING, &delimiter_text,
      N_("Field delimiter: comma, semicolon or tab (default: detected)"), N_("C") },
    { "missing", 0, 0, G_OPTION_ARG_STRING_ARRAY, &missing,
      N_("Treat TOKEN as a missing value (repeatable)"), N_("TOKEN") },
    { "epoch", 0, 0, G_OPTION_ARG_STRING, &epoch_text,
      N_("Epoch of the positions for rows without an epoch column"), N_("JYEAR") },
    { "source-name", 0, 0, G_OPTION_ARG_STRING, &source_name,
      N_("Name of the source (default: the file's name)"), N_("NAME") },
    { "again", 0, 0, G_OPTION_ARG_NONE, &again,
      N_("Import a file even if the same file was imported before"), NULL },
    { "dry-run", 'n', 0, G_OPTION_ARG_NONE, &dry_run,
      N_("Check the whole file and report as an import would, but write nothing"), NULL },
    { "match-radius", 0, 0, G_OPTION_ARG_STRING, &radius_text,
      N_("Join rows to existing stars by position, within ARCSEC at a common epoch, instead of by id"),
      N_("ARCSEC") },
    { NULL }
  };
  g_autofree char *description = fields_help ();
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("import", _("PROJECT FILE"),
                        _("Import a CSV file of measurements as a new source."),
                        description, entries);
  g_autoptr (GArray) maps = g_array_new (FALSE, FALSE, sizeof (SlColumnMap));
  g_autoptr (SlProject) project = NULL;
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GError) error = NULL;
  SlImportOptions options;

  g_array_set_clear_func (maps, (GDestroyNotify) sl_column_map_clear);
  if (!sl_cli_parse (context, "import", &argc, &argv, 2))
    return SL_EXIT_USAGE;

  sl_import_options_init (&options);
  if (delimiter_text && !parse_delimiter (delimiter_text, &options.delimiter))
    return sl_cli_usage_error ("import", _("--delimiter %s: expected comma, semicolon or tab"),
                               delimiter_text);
  if (epoch_text)
    {
      const char *problem;
      char *reason = NULL;

      if (!sl_parse_number (epoch_text, &options.epoch, &problem))
        return sl_cli_usage_error ("import", "--epoch %s: %s", epoch_text, _(problem));
      if (!sl_field_check_value (SL_FIELD_EPOCH, options.epoch, &reason))
        {
          sl_cli_usage_error ("import", "--epoch: %s", reason);
          g_free (reason);
          return SL_EXIT_USAGE;
        }
    }
  /* Up to a degree: beyond it "the same star" means little, and the
   * index would gain nothing. */
  if (!sl_cli_parse_number_option (radius_text, &options.match_radius, DBL_TRUE_MIN, 3600.0))
    return sl_cli_usage_error ("import", _("--match-radius %s: expected a number of arcseconds above 0 "
                                           "and at most 3600"), radius_text);
  for (guint i = 0; map_specs && map_specs[i]; i++)
    {
      SlColumnMap map;

      if (!sl_column_map_parse (map_specs[i], &map, &error))
        return sl_cli_usage_error ("import", "%s", error->message);
      g_array_append_val (maps, map);
    }
  options.maps = (const SlColumnMap *) maps->data;
  options.n_maps = maps->len;
  options.missing = (const char *const *) missing;
  options.source_name = source_name;
  options.again = again;
  options.dry_run = dry_run;

  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  report = sl_import_csv (project, argv[2], &options, &error);
  if (report == NULL)
    return sl_cli_fail (error);
  print_report (report, argv[2], dry_run);
  return SL_EXIT_OK;
}
