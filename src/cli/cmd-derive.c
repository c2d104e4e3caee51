/* cmd-derive.c: starledger-cli derive PROJECT [options] */
#include <inttypes.h>
#include <glib/gi18n.h>
#include <inttypes.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "derivation.h"

/* A number option within the range the core accepts for PARAM
 * (derive.h: the window's derive dialog checks the same); TEXT NULL: not
 * given. */
static gboolean
parse_number_param (const char *text, SlDeriveParams *params, SlParam param)
{
  return text == NULL || sl_param_from_text (params, param, text, NULL);
}

/* The end of --help: each method with its citation and each parameter's
 * default with its source, from the table the window's Derive dialog
 * shows (derive.h, SlParamInfo). */
static char *
methods_text (void)
{
  GString *text = g_string_new (_("Methods, defaults and their sources:"));
  SlDeriveParams defaults;

  sl_derive_params_init (&defaults);
  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    {
      const SlParamInfo *info = sl_param_info (p);
      g_autofree char *value = sl_param_to_text (&defaults, p);

      if (info->kind == SL_PARAM_KIND_CHOICE)
        for (guint c = 0; c < info->n_choices; c++)
          g_string_append_printf (text, "\n  %s %s%s: %s", _(info->label), info->choices[c].name,
                                  c == sl_param_get_choice (&defaults, p) ? _(" (default)") : "",
                                  info->choices[c].citation);
      else
        {
          g_string_append_printf (text, "\n  %s, %s %s%s%s", _(info->label), _("default"), value,
                                  *info->unit ? " " : "", info->unit);
          if (*info->citation)
            g_string_append_printf (text, ": %s", info->citation);
        }
    }
  return g_string_free (text, FALSE);
}

/* --distance inverse | edsd[:L=PC] */
static gboolean
parse_distance (const char *text, SlDeriveParams *params)
{
  if (strcmp (text, "inverse") == 0)
    {
      params->distance = SL_DISTANCE_INVERSE;
      return TRUE;
    }
  if (strcmp (text, "edsd") == 0)
    {
      params->distance = SL_DISTANCE_EDSD;
      return TRUE;
    }
  if (g_str_has_prefix (text, "edsd:L="))
    {
      params->distance = SL_DISTANCE_EDSD;
      return parse_number_param (text + strlen ("edsd:L="), params, SL_PARAM_LENGTH_SCALE);
    }
  return FALSE;
}

/* --errors linear | mc[:N] */
static gboolean
parse_errors (const char *text, SlDeriveParams *params)
{
  if (strcmp (text, "linear") == 0)
    {
      params->errors = SL_ERRORS_LINEAR;
      return TRUE;
    }
  if (strcmp (text, "mc") == 0)
    {
      params->errors = SL_ERRORS_MONTE_CARLO;
      return TRUE;
    }
  if (g_str_has_prefix (text, "mc:"))
    {
      params->errors = SL_ERRORS_MONTE_CARLO;
      return sl_param_from_text (params, SL_PARAM_DRAWS, text + 3, NULL);
    }
  return FALSE;
}

int
sl_cli_derive (int argc, char **argv)
{
  g_autofree char *distance = NULL;
  g_autofree char *errors = NULL;
  g_autofree char *seed = NULL;
  g_autofree char *rv = NULL;
  g_autofree char *rv_err = NULL;
  g_autofree char *zero_point = NULL;
  g_autofree char *teff = NULL;
  g_autofree char *mc_below = NULL;
  gboolean all = FALSE;
  const GOptionEntry entries[] = {
    { "distance", 0, 0, G_OPTION_ARG_STRING, &distance,
      N_("Distance method: inverse (default; parallax S/N >= 5 only) or edsd[:L=PC] "
         "(exponentially decreasing space density prior, L = 1350 pc by default)"), N_("METHOD") },
    { "errors", 0, 0, G_OPTION_ARG_STRING, &errors,
      N_("Uncertainties: linear (default; Monte Carlo below parallax S/N 5) or mc[:N] (N draws, 1000 by default)"),
      N_("METHOD") },
    { "seed", 0, 0, G_OPTION_ARG_STRING, &seed, N_("Seed of the Monte Carlo draws (default 1)"), N_("N") },
    { "extinction-ratio", 0, 0, G_OPTION_ARG_STRING, &rv, N_("R_V = A_V / E(B-V) (default 3.1)"), N_("R") },
    { "extinction-ratio-error", 0, 0, G_OPTION_ARG_STRING, &rv_err, N_("The 1-sigma error of R_V (default 0)"),
      N_("S") },
    { "parallax-zero-point", 0, 0, G_OPTION_ARG_STRING, &zero_point,
      N_("Subtract MAS from every parallax before use (default 0)"), N_("MAS") },
    { "teff", 0, 0, G_OPTION_ARG_STRING, &teff,
      N_("Temperature calibration: flower (default; Flower 1996 with Torres 2010) or ballesteros"), N_("METHOD") },
    { "monte-carlo-below-snr", 0, 0, G_OPTION_ARG_STRING, &mc_below,
      N_("With --errors linear, draw instead for stars whose parallax S/N is below S (default 5)"),
      N_("S") },
    { "all", 0, 0, G_OPTION_ARG_NONE, &all, N_("Derive every star, not only those that need it"), NULL },
    { NULL }
  };
  g_autofree char *methods = methods_text ();
  g_autofree char *description =
    g_strdup_printf ("%s\n\n%s",
                     _("Derives every star that has no derived values yet, whose inputs or hand-set values "
                       "changed, or that was derived with other parameters (--all: every star). Each run "
                       "is recorded with its parameters and method versions; 'explain' shows how any value "
                       "was obtained and 'verify' recomputes them."),
                     methods);
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("derive", _("PROJECT"), _("Derive physical quantities with their uncertainties."),
                        description, entries);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *described = NULL;
  SlDeriveParams params;
  SlDeriveReport report;
  char seconds[G_ASCII_DTOSTR_BUF_SIZE];

  if (!sl_cli_parse (context, "derive", &argc, &argv, 1))
    return SL_EXIT_USAGE;
  sl_derive_params_init (&params);
  if (distance && !parse_distance (distance, &params))
    return sl_cli_usage_error ("derive", _("--distance %s: expected inverse, edsd or edsd:L=PC"), distance);
  if (errors && !parse_errors (errors, &params))
    return sl_cli_usage_error ("derive", _("--errors %s: expected linear, mc or mc:N"), errors);
  if (seed && !sl_param_from_text (&params, SL_PARAM_SEED, seed, NULL))
    return sl_cli_usage_error ("derive", _("--seed %s: expected a whole number"), seed);
  if (!parse_number_param (rv, &params, SL_PARAM_RV))
    return sl_cli_usage_error ("derive", _("--extinction-ratio %s: expected a positive number"), rv);
  if (!parse_number_param (rv_err, &params, SL_PARAM_RV_ERR))
    return sl_cli_usage_error ("derive", _("--extinction-ratio-error %s: expected a number >= 0"), rv_err);
  if (!parse_number_param (zero_point, &params, SL_PARAM_PARALLAX_ZERO_POINT))
    return sl_cli_usage_error ("derive", _("--parallax-zero-point %s: expected a number"), zero_point);
  if (!parse_number_param (mc_below, &params, SL_PARAM_MC_BELOW_SNR))
    return sl_cli_usage_error ("derive", _("--monte-carlo-below-snr %s: expected a number >= 0"), mc_below);
  if (teff && !sl_param_from_text (&params, SL_PARAM_TEFF, teff, NULL))
    return sl_cli_usage_error ("derive", _("--teff %s: expected flower or ballesteros"), teff);

  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  if (!sl_derivation_run (project, &params, all, NULL, NULL, NULL, &report, &error))
    return sl_cli_fail (error);
  described = sl_derive_params_describe (&report.params);
  /* g_ascii_formatd: a '.' decimal point whatever the locale (README). */
  printf (_("derived %" PRIu64 " stars, %" PRIu64 " already up to date (run %"
            PRId64 ", %s s)\n"),
          report.computed, report.up_to_date, report.run_id,
          g_ascii_formatd (seconds, sizeof seconds, "%.2f", report.seconds));
  printf (_("parameters: %s\n"), described);
  return SL_EXIT_OK;
}
