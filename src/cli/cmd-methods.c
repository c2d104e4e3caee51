/* cmd-methods.c: starledger-cli methods [--markdown]
 *
 * Every derivation method of this version, from the module registry
 * (src/core/derive/registry.c): what each step computes, from what, by
 * which published relation, where it is valid, and every run parameter
 * with its default, range and source.  --markdown writes the README's
 * Methods section, which tests/check-readme-methods.py keeps identical to
 * it, so the two cannot drift. */
#include <inttypes.h>
#include <float.h>
#include <glib/gi18n.h>
#include <stdio.h>

#include "cli.h"
#include "combine.h"
#include "derive/engine.h"
#include "vocabulary.h"

/* "parallax, parallax_err; derived: plx_snr" */
static char *
module_inputs (const SlModule *m)
{
  g_autoptr (GString) text = g_string_new (NULL);

  for (guint i = 0; m->inputs[i] != SL_FIELD_NONE; i++)
    g_string_append_printf (text, "%s%s", i ? ", " : "", sl_field_info (m->inputs[i])->name);
  for (guint i = 0; m->needs[i] != SL_Q_NONE; i++)
    g_string_append_printf (text, "%s%s", text->len ? ", " : "", sl_quantity_info (m->needs[i])->name);
  return g_string_free (g_steal_pointer (&text), FALSE);
}

static char *
module_outputs (const SlModule *m, gboolean markdown)
{
  g_autoptr (GString) text = g_string_new (NULL);

  for (guint i = 0; m->gives[i] != SL_Q_NONE; i++)
    {
      const SlQuantityInfo *q = sl_quantity_info (m->gives[i]);

      g_string_append_printf (text, markdown ? "%s`%s`" : "%s%s", i ? ", " : "", q->name);
      if (q->unit[0])
        g_string_append_printf (text, " [%s]", q->unit);
    }
  return g_string_free (g_steal_pointer (&text), FALSE);
}

/* A number's range in words: open ends (the largest double) are not
 * written out, and DBL_TRUE_MIN stands for "above 0". */
static void
append_number_range (GString *text, const SlParamInfo *p)
{
  char lo[G_ASCII_DTOSTR_BUF_SIZE], hi[G_ASCII_DTOSTR_BUF_SIZE];
  gboolean open_below = p->min <= -DBL_MAX, open_above = p->max >= DBL_MAX;

  g_ascii_formatd (lo, sizeof lo, "%g", p->min);
  g_ascii_formatd (hi, sizeof hi, "%g", p->max);
  if (open_below && open_above)
    g_string_append (text, _("any number"));
  else if (p->min == DBL_TRUE_MIN && open_above)
    g_string_append (text, _("above 0"));
  else if (open_above)
    g_string_append_printf (text, _("%s or more"), lo);
  else if (open_below)
    g_string_append_printf (text, _("up to %s"), hi);
  else
    g_string_append_printf (text, _("%s to %s"), lo, hi);
  if (p->unit[0] && !(open_below && open_above))
    g_string_append_printf (text, " %s", p->unit);
}

/* Choices "inverse or edsd", a number's range with its unit, a count's. */
static char *
param_range (const SlParamInfo *p)
{
  g_autoptr (GString) text = g_string_new (NULL);

  switch (p->kind)
    {
    case SL_PARAM_KIND_CHOICE:
      for (guint i = 0; i < p->n_choices; i++)
        g_string_append_printf (text, "%s%s", i == 0 ? "" : i + 1 == p->n_choices ? _(" or ") : ", ",
                                p->choices[i].name);
      break;
    case SL_PARAM_KIND_NUMBER:
      append_number_range (text, p);
      break;
    default:
      g_string_append_printf (text, "%" PRIu64 " to %" PRIu64, p->count_min, p->count_max);
      break;
    }
  return g_string_free (g_steal_pointer (&text), FALSE);
}

static char *
param_sources (const SlParamInfo *p)
{
  g_autoptr (GString) text = g_string_new (p->citation);

  for (guint i = 0; i < p->n_choices; i++)
    if (p->choices[i].citation[0])
      g_string_append_printf (text, "%s%s: %s", text->len ? "; " : "", p->choices[i].name, p->choices[i].citation);
  return g_string_free (g_steal_pointer (&text), FALSE);
}

/* What each rule for combining sources takes, and its source. */
static const char *
rule_takes (SlCombineRule rule)
{
  switch (rule)
    {
    case SL_COMBINE_PRIORITY:
      return N_("the row of the source listed first in the project's source order, then the smallest uncertainty");
    case SL_COMBINE_WEIGHTED_MEAN:
      return N_("the inverse-variance weighted mean of every row with an error, and its error "
                "(not for positions; fewer than two such rows: the smallest uncertainty)");
    case SL_COMBINE_SMALLEST_ERROR:
    default:
      return N_("the row with the smallest uncertainty; a row with an error beats one without; "
                "ties go to the later source");
    }
}

static const char *
rule_source (SlCombineRule rule)
{
  return rule == SL_COMBINE_WEIGHTED_MEAN ? "Taylor 1997, An Introduction to Error Analysis, ch. 7"
                                          : "common practice";
}

#define AGREEMENT_SOURCE "Taylor 1997, An Introduction to Error Analysis, ch. 12"

static void
print_markdown (GPtrArray *modules, const SlDeriveParams *defaults)
{
  printf ("The steps in the order the engine runs them (`starledger-cli methods` prints this list; "
          "`explain` shows each step for one value).\n\n");
  for (guint i = 0; i < modules->len; i++)
    {
      const SlModule *m = modules->pdata[i];
      g_autofree char *inputs = module_inputs (m);
      g_autofree char *outputs = module_outputs (m, TRUE);

      printf ("- **%s** (version %d): %s → %s. %s.\n", m->name, m->version, inputs, outputs, m->method);
      printf ("  Formula: %s. Valid: %s. Source: %s.\n", m->formula, m->validity, m->citation);
    }
  printf ("\n| Parameter | Default | Accepted | Source |\n|---|---|---|---|\n");
  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    {
      const SlParamInfo *info = sl_param_info (p);
      g_autofree char *value = sl_param_to_text (defaults, p);
      g_autofree char *range = param_range (info);
      g_autofree char *sources = param_sources (info);

      printf ("| `%s`: %s | %s%s%s | %s | %s |\n", info->name, info->label, value, info->unit[0] ? " " : "",
              info->unit, range, sources[0] ? sources : "common practice");
    }
  printf ("\nWhere several sources measured one input of a star, the project's combination policy "
          "(`starledger-cli combine`, the window's Combining Sources dialog; recorded with each run) "
          "chooses per group of inputs (position, parallax, pm, vmag, bmag, bv, ebv, vrad):\n\n"
          "| Rule | Takes | Source |\n|---|---|---|\n");
  for (SlCombineRule r = 0; r < SL_N_COMBINE_RULES; r++)
    printf ("| `%s`%s | %s | %s |\n", sl_combine_rule_name (r), r == SL_COMBINE_SMALLEST_ERROR ? " (default)" : "",
            rule_takes (r), rule_source (r));
  printf ("\nWhatever the rule, two or more rows with errors are tested for agreement: chi-square "
          "of the rows about their weighted mean with n - 1 degrees of freedom (2 (n - 1) for the "
          "proper motion), its tail probability by GSL's `gsl_cdf_chisq_Q`; below the level "
          "(default 0.01, common practice) the star is flagged `sources_disagree`. Positions are not "
          "tested (rows of different epochs differ by the proper motion). Source: %s.\n", AGREEMENT_SOURCE);
}

static void
print_text (GPtrArray *modules, const SlDeriveParams *defaults)
{
  printf (_("Derivation steps, in the order they run:\n"));
  for (guint i = 0; i < modules->len; i++)
    {
      const SlModule *m = modules->pdata[i];
      g_autofree char *inputs = module_inputs (m);
      g_autofree char *outputs = module_outputs (m, FALSE);

      printf ("\n%s (%s %d)\n", m->name, _("version"), m->version);
      printf ("  %s -> %s\n", inputs, outputs);
      printf ("  %s\n", _(m->method));
      printf (_("  formula: %s\n"), _(m->formula));
      printf (_("  valid: %s\n"), _(m->validity));
      printf (_("  source: %s\n"), m->citation);
    }
  printf (_("\nRun parameters (derive's options; the window's Derive dialog):\n"));
  for (SlParam p = 0; p < SL_N_PARAMS; p++)
    {
      const SlParamInfo *info = sl_param_info (p);
      g_autofree char *value = sl_param_to_text (defaults, p);
      g_autofree char *range = param_range (info);
      g_autofree char *sources = param_sources (info);

      printf (_("  %-20s default %s%s%s; %s\n"), info->name, value, info->unit[0] ? " " : "", info->unit, range);
      if (sources[0])
        printf (_("  %-20s source: %s\n"), "", sources);
    }
  printf (_("\nCombining several sources' rows of one input (the project's policy: 'starledger-cli combine'):\n"));
  for (SlCombineRule r = 0; r < SL_N_COMBINE_RULES; r++)
    {
      printf ("  %-20s %s%s\n", sl_combine_rule_name (r), _(rule_takes (r)),
              r == SL_COMBINE_SMALLEST_ERROR ? _(" (default)") : "");
      printf (_("  %-20s source: %s\n"), "", rule_source (r));
    }
  printf (_("  agreement test: chi-square of two or more rows with errors; a star is flagged "
            "sources_disagree below the level (default 0.01)\n"));
  printf (_("  %-20s source: %s\n"), "", AGREEMENT_SOURCE);
}

int
sl_cli_methods (int argc, char **argv)
{
  gboolean markdown = FALSE;
  const GOptionEntry entries[] = {
    { "markdown", 0, 0, G_OPTION_ARG_NONE, &markdown, N_("Write the README's Methods section (English, Markdown)"), NULL },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("methods", "", _("List every derivation method with its source and validity."),
                        _("The steps of the derivation in the order they run, each with its inputs and "
                          "outputs, formula, validity range and published source; then the run "
                          "parameters with their defaults and accepted ranges. This is what this "
                          "version of Starledger computes; each run records the versions it used."),
                        entries);
  g_autoptr (GPtrArray) modules = NULL;
  SlDeriveParams defaults;

  if (!sl_cli_parse (context, "methods", &argc, &argv, 0))
    return SL_EXIT_USAGE;
  modules = sl_modules_in_order ();
  sl_derive_params_init (&defaults);
  if (markdown)
    print_markdown (modules, &defaults);
  else
    print_text (modules, &defaults);
  return SL_EXIT_OK;
}
