/* combine.c: the rules that turn several sources' measurements into one
 * input (combine.h), the inverse-variance weighted mean and the
 * chi-square consistency test (Taylor 1997, chapters 7 and 12). */
#include "combine.h"

#include <glib/gi18n.h>
#include <gsl/gsl_cdf.h>
#include <math.h>
#include <string.h>

#include "inputs.h"
#include "sl-error.h"
#include "util.h"

#define GROUP "combine"

static const struct {
  const char *name;
  const char *label;
} rules[SL_N_COMBINE_RULES] = {
  [SL_COMBINE_SMALLEST_ERROR] = { "smallest-error", N_("Most precise") },
  [SL_COMBINE_PRIORITY]       = { "priority", N_("Source order") },
  [SL_COMBINE_WEIGHTED_MEAN]  = { "weighted-mean", N_("Weighted mean") },
};

void
sl_combine_policy_init (SlCombinePolicy *policy)
{
  memset (policy, 0, sizeof *policy);
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    policy->rule[f] = SL_COMBINE_SMALLEST_ERROR;
  policy->level = SL_COMBINE_DEFAULT_LEVEL;
}

const char *
sl_combine_rule_name (SlCombineRule rule)
{
  g_return_val_if_fail (rule < SL_N_COMBINE_RULES, NULL);
  return rules[rule].name;
}

const char *
sl_combine_rule_label (SlCombineRule rule)
{
  g_return_val_if_fail (rule < SL_N_COMBINE_RULES, NULL);
  return _(rules[rule].label);
}

gboolean
sl_combine_rule_from_name (const char *name, SlCombineRule *rule)
{
  for (SlCombineRule r = 0; r < SL_N_COMBINE_RULES; r++)
    if (g_strcmp0 (name, rules[r].name) == 0)
      {
        *rule = r;
        return TRUE;
      }
  return FALSE;
}

gboolean
sl_combine_rule_allowed (SlField lead, SlCombineRule rule)
{
  if (lead >= SL_N_FIELDS || sl_input_group_lead (lead) != lead)
    return FALSE;
  /* A mean of positions taken at different epochs would smear the proper
   * motion into the position; a spectral type is text. */
  if (rule == SL_COMBINE_WEIGHTED_MEAN)
    return lead != SL_FIELD_RA && lead != SL_FIELD_SPTYPE;
  return lead != SL_FIELD_SPTYPE || rule == SL_COMBINE_SMALLEST_ERROR;
}

/* The groups that can be combined, in the vocabulary's order. */
static gboolean
is_lead (SlField f)
{
  return f != SL_FIELD_ID && f != SL_FIELD_SPTYPE && f < SL_N_FIELDS && sl_input_group_lead (f) == f;
}

const char *
sl_combine_group_name (SlField lead)
{
  if (!is_lead (lead))
    return NULL;
  /* The derived table's m_position and m_pm name the two groups of
   * several fields the same way. */
  if (lead == SL_FIELD_RA)
    return "position";
  if (lead == SL_FIELD_PMRA)
    return "pm";
  return sl_field_info (lead)->name;
}

gboolean
sl_combine_group_from_name (const char *name, SlField *lead)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (is_lead (f) && g_strcmp0 (name, sl_combine_group_name (f)) == 0)
      {
        *lead = f;
        return TRUE;
      }
  return FALSE;
}

guint
sl_combine_priority_rank (const SlCombinePolicy *policy, const char *name)
{
  const char *line = policy->priority;
  gsize length = strlen (name);
  guint rank = 1;

  if (*line == '\0')
    return 0;
  for (;;)
    {
      const char *end = strchr (line, '\n');
      gsize line_length = end ? (gsize) (end - line) : strlen (line);

      if (line_length == length && strncmp (line, name, length) == 0)
        return rank;
      if (end == NULL)
        return 0;
      line = end + 1;
      rank++;
    }
}

gboolean
sl_combine_policy_equal (const SlCombinePolicy *a, const SlCombinePolicy *b)
{
  return memcmp (a->rule, b->rule, sizeof a->rule) == 0 && strcmp (a->priority, b->priority) == 0
         && a->level == b->level;
}


char *
sl_combine_policy_describe (const SlCombinePolicy *policy)
{
  GString *text = g_string_new (NULL);
  char level[G_ASCII_DTOSTR_BUF_SIZE];

  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (is_lead (f) && policy->rule[f] != SL_COMBINE_SMALLEST_ERROR)
      g_string_append_printf (text, "%s%s %s", text->len ? ", " : "", sl_combine_group_name (f),
                              sl_combine_rule_name (policy->rule[f]));
  g_string_append_printf (text, "%s%s", text->len ? _(", others ") : "", "smallest-error");
  if (policy->priority[0] != '\0')
    {
      g_auto (GStrv) names = g_strsplit (policy->priority, "\n", -1);
      g_autofree char *joined = g_strjoinv (", ", names);

      g_string_append_printf (text, _("; source order %s"), joined);
    }
  if (policy->level > 0)
    g_string_append_printf (text, _("; sources disagree below P = %s"), sl_format_double (level, policy->level));
  else
    g_string_append (text, _("; no agreement test"));
  return g_string_free (text, FALSE);
}

double
sl_chi2_tail (double chi2, guint dof)
{
  if (dof == 0)
    return 1.0;
  return gsl_cdf_chisq_Q (chi2, (double) dof);
}

gboolean
sl_weighted_mean (const double *values, const double *errors, guint n, SlWeightedMean *out)
{
  double sum_w = 0.0, sum_wx = 0.0, chi2 = 0.0;

  out->mean = out->error = out->chi2 = out->p_value = NAN;
  out->dof = 0;
  if (n == 0)
    return FALSE;
  for (guint i = 0; i < n; i++)
    {
      double w;

      if (!(errors[i] > 0) || !isfinite (errors[i]) || !isfinite (values[i]))
        return FALSE;
      w = 1.0 / (errors[i] * errors[i]);
      sum_w += w;
      sum_wx += w * values[i];
    }
  out->mean = sum_wx / sum_w;
  out->error = 1.0 / sqrt (sum_w);
  if (n < 2)
    return TRUE;
  for (guint i = 0; i < n; i++)
    {
      double z = (values[i] - out->mean) / errors[i];

      chi2 += z * z;
    }
  out->chi2 = chi2;
  out->dof = n - 1;
  out->p_value = sl_chi2_tail (chi2, out->dof);
  return TRUE;
}

void
sl_combine_policy_save (const SlCombinePolicy *policy, GKeyFile *key_file)
{
  g_auto (GStrv) names = g_strsplit (policy->priority, "\n", -1);

  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (is_lead (f))
      g_key_file_set_string (key_file, GROUP, sl_combine_group_name (f), sl_combine_rule_name (policy->rule[f]));
  g_key_file_set_string_list (key_file, GROUP, "priority", (const char *const *) names,
                              policy->priority[0] ? g_strv_length (names) : 0);
  g_key_file_set_double (key_file, GROUP, "level", policy->level);
}

gboolean
sl_combine_policy_load (SlCombinePolicy *policy, GKeyFile *key_file, GError **error)
{
  SlCombinePolicy loaded;
  g_auto (GStrv) names = NULL;
  g_autofree char *joined = NULL;
  GError *local = NULL;

  if (!g_key_file_has_group (key_file, GROUP))
    return TRUE;
  sl_combine_policy_init (&loaded);
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    {
      g_autofree char *name = NULL;

      if (!is_lead (f))
        continue;
      name = g_key_file_get_string (key_file, GROUP, sl_combine_group_name (f), NULL);
      if (name == NULL)
        continue;
      if (!sl_combine_rule_from_name (name, &loaded.rule[f]) || !sl_combine_rule_allowed (f, loaded.rule[f]))
        {
          g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: '%s' is no rule for combining sources here"),
                       sl_combine_group_name (f), name);
          return FALSE;
        }
    }
  names = g_key_file_get_string_list (key_file, GROUP, "priority", NULL, NULL);
  joined = names ? g_strjoinv ("\n", names) : g_strdup ("");
  if (g_strlcpy (loaded.priority, joined, sizeof loaded.priority) >= sizeof loaded.priority)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("the source order is too long"));
      return FALSE;
    }
  if (g_key_file_has_key (key_file, GROUP, "level", NULL))
    loaded.level = g_key_file_get_double (key_file, GROUP, "level", &local);
  if (local != NULL)
    {
      g_propagate_error (error, local);
      return FALSE;
    }
  if (!sl_combine_policy_check (&loaded, error))
    return FALSE;
  *policy = loaded;
  return TRUE;
}

gboolean
sl_combine_policy_check (const SlCombinePolicy *policy, GError **error)
{
  if (!(policy->level >= 0.0 && policy->level < 1.0))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   _("the agreement test's level must lie in [0, 1): 0 for no test, 0.01 usually"));
      return FALSE;
    }
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (is_lead (f) && !sl_combine_rule_allowed (f, policy->rule[f]))
      {
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: sources cannot be combined by '%s'"),
                     sl_combine_group_name (f), sl_combine_rule_name (policy->rule[f]));
        return FALSE;
      }
  return TRUE;
}
