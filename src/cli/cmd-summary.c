/* cmd-summary.c: starledger-cli summary PROJECT [--stars N] */
#include <inttypes.h>
#include <glib/gi18n.h>
#include <math.h>
#include <stdio.h>

#include "cli.h"
#include "derivation.h"
#include "inputs.h"
#include "summary.h"
#include "units.h"

static void
print_sources (const SlProjectSummary *summary)
{
  printf (_("Sources:\n"));
  for (guint i = 0; i < summary->sources->len; i++)
    {
      const SlSourceInfo *s = summary->sources->pdata[i];

      printf (_("  %" PRId64 "  %s (%s), imported %s by %s: %" PRId64
                " rows accepted, %" PRId64 " rejected\n"),
              s->id, s->name, s->file_name, s->imported_at, s->imported_by,
              s->rows_accepted, s->rows_rejected);
    }
}

static void
print_value (double value, gboolean present, int decimals, int width)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_autofree char *format = g_strdup_printf ("%%.%df", decimals);

  if (present)
    printf (" %*s", width, g_ascii_formatd (buf, sizeof buf, format, value));
  else
    printf (" %*s", width, "");
}

/* Distance, temperature, luminosity and class, if derived. */
static void
print_derived (SlProject *project, gint64 star_id)
{
  SlDerivedRow row;
  const SlDerivedValues *v = &row.values;

  if (!sl_derived_row_load (project, star_id, &row, NULL))
    {
      printf (" %8s %7s %9s %-7s", "", "", "", "");
      return;
    }
  print_value (v->value[SL_Q_DIST], v->has[SL_Q_DIST], 1, 8);
  print_value (v->value[SL_Q_TEFF], v->has[SL_Q_TEFF], 0, 7);
  if (v->has[SL_Q_LUM])
    {
      char buf[G_ASCII_DTOSTR_BUF_SIZE];

      printf (" %9s", g_ascii_formatd (buf, sizeof buf, "%.3g", v->value[SL_Q_LUM]));
    }
  else
    printf (" %9s", "");
  printf (" %-7s", v->has[SL_Q_SPCLASS] ? v->text[SL_Q_SPCLASS] : "");
}

static gboolean
print_stars (SlProject *project, gint64 n_stars, int limit, GError **error)
{
  g_autoptr (SlInputCursor) cursor = sl_input_cursor_new (project, 0, error);
  SlStarInputs in;
  int shown = 0;

  if (cursor == NULL)
    return FALSE;
  printf (_("Stars (the first %d of %" PRId64 "; positions ICRS at the epoch shown):\n"),
          (int) MIN (limit, n_stars), n_stars);
  printf ("  %-10s %-14s %-13s %7s %9s %7s %6s %6s %8s %7s %9s %-7s %s\n", _("id"), _("RA (h m s)"),
          _("Dec (d m s)"), _("epoch"), _("parallax"), "±", "V", "B-V", _("dist/pc"), _("Teff/K"),
          _("L/Lsun"), _("class"), _("catalogued type"));
  while (shown < limit && sl_input_cursor_next (cursor, &in, error))
    {
      g_autofree char *ra = sl_format_sexagesimal (in.value[SL_FIELD_RA], TRUE, 3);
      g_autofree char *dec = sl_format_sexagesimal (in.value[SL_FIELD_DEC], FALSE, 2);

      printf ("  %-10s %-14s %-13s", in.designation, ra, dec);
      print_value (in.value[SL_FIELD_EPOCH], in.present[SL_FIELD_EPOCH], 2, 7);
      print_value (in.value[SL_FIELD_PARALLAX], in.present[SL_FIELD_PARALLAX], 3, 9);
      print_value (in.value[SL_FIELD_PARALLAX_ERR], in.present[SL_FIELD_PARALLAX_ERR], 3, 7);
      print_value (in.value[SL_FIELD_VMAG], in.present[SL_FIELD_VMAG], 2, 6);
      print_value (in.value[SL_FIELD_BV], in.present[SL_FIELD_BV], 2, 6);
      print_derived (project, in.star_id);
      printf (" %s\n", in.sptype ? in.sptype : "");
      shown++;
    }
  return error == NULL || *error == NULL;
}

int
sl_cli_summary (int argc, char **argv)
{
  int limit = 10;
  const GOptionEntry entries[] = {
    { "stars", 'n', 0, G_OPTION_ARG_INT, &limit, N_("Show the first N stars (default 10)"), N_("N") },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("summary", _("PROJECT"), _("Show what a project holds."), NULL, entries);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (SlProjectSummary) summary = NULL;
  g_autoptr (GError) error = NULL;

  if (!sl_cli_parse (context, "summary", &argc, &argv, 1))
    return SL_EXIT_USAGE;
  if (limit < 0)
    return sl_cli_usage_error ("summary", _("--stars must not be negative"));
  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  summary = sl_project_summary (project, &error);
  if (summary == NULL)
    return sl_cli_fail (error);

  printf (_("Project %s (schema version %d)\n"), argv[1], summary->schema_version);
  printf ("  ");
  printf (g_dngettext (GETTEXT_PACKAGE, "%" PRId64 " star", "%" PRId64 " stars",
                       summary->n_stars), summary->n_stars);
  printf (", ");
  printf (g_dngettext (GETTEXT_PACKAGE, "%" PRId64 " measurement", "%" PRId64 " measurements",
                       summary->n_measurements), summary->n_measurements);
  printf (g_dngettext (GETTEXT_PACKAGE, " from %u source", " from %u sources", summary->sources->len),
          summary->sources->len);
  printf (", ");
  printf (g_dngettext (GETTEXT_PACKAGE, "%" PRId64 " rejected row", "%" PRId64 " rejected rows",
                       summary->n_rejected), summary->n_rejected);
  printf (", ");
  printf (g_dngettext (GETTEXT_PACKAGE, "%" PRId64 " ledger entry", "%" PRId64 " ledger entries",
                       summary->n_ledger), summary->n_ledger);
  printf ("\n");
  if (summary->n_runs == 0)
    printf (_("  not derived yet: run 'starledger-cli derive'\n"));
  else
    {
      g_autofree char *runs = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%" PRId64 " run",
                                                            "%" PRId64 " runs", summary->n_runs),
                                               summary->n_runs);

      printf (_("  %" PRId64 " of %" PRId64 " stars derived (%s), %" PRId64
                " stale (run 'derive' to update them)\n"),
              summary->n_derived, summary->n_stars, runs, summary->n_stale);
    }
  print_sources (summary);
  if (limit > 0 && summary->n_stars > 0 && !print_stars (project, summary->n_stars, limit, &error))
    return sl_cli_fail (error);
  return SL_EXIT_OK;
}
