/* combine.h: how several sources' measurements of one quantity of a star
 * become the one value the derivation uses.
 *
 * Rules, chosen per group of inputs (inputs.c) as a project setting and
 * recorded with each derivation run:
 *   smallest-error  the row with the smallest uncertainty (the default);
 *   priority        the row of the source listed first in the project's
 *                   source order, then the smallest uncertainty;
 *   weighted-mean   the inverse-variance weighted mean of every row with
 *                   an error, with the error of the mean.
 * Whatever the rule, where two or more rows have errors a chi-square test
 * says whether they agree within those errors; a probability below the
 * policy's level flags the star (sources_disagree).
 *
 * Method: the weighted average and its uncertainty, and the chi-square
 * test of consistency: J. R. Taylor, An Introduction to Error Analysis,
 * 2nd ed. (1997), chapter 7 (eqs. 7.10 and 7.12) and chapter 12 (section
 * numbers from memory).  The tail probability of chi-square is GSL's
 * gsl_cdf_chisq_Q.
 * Validity: the errors must be independent Gaussian 1-sigma errors; a
 * systematic offset between catalogues is what the test detects, not
 * something the mean corrects.
 */
#pragma once

#include <glib.h>

#include "vocabulary.h"

G_BEGIN_DECLS

typedef enum {
  SL_COMBINE_SMALLEST_ERROR,
  SL_COMBINE_PRIORITY,
  SL_COMBINE_WEIGHTED_MEAN,
  SL_N_COMBINE_RULES
} SlCombineRule;

/* Room for the source order: names separated by newlines. */
#define SL_COMBINE_PRIORITY_BYTES 1024

/* The 0.01 default is common practice for a consistency test. */
#define SL_COMBINE_DEFAULT_LEVEL 0.01

typedef struct {
  SlCombineRule rule[SL_N_FIELDS];                 /* by the group's lead field (inputs.h) */
  char          priority[SL_COMBINE_PRIORITY_BYTES]; /* source names, first preferred, '\n' between */
  double        level;   /* sources disagree when P(chi-square) < level; 0: no test */
} SlCombinePolicy;

void        sl_combine_policy_init      (SlCombinePolicy *policy);
const char *sl_combine_rule_name        (SlCombineRule rule);   /* "weighted-mean" */
const char *sl_combine_rule_label       (SlCombineRule rule);   /* for people, translated */
gboolean    sl_combine_rule_from_name   (const char *name, SlCombineRule *rule);
/* Whether RULE may be used for the group led by LEAD: positions measured
 * at different epochs are not averaged, nor are spectral types. */
gboolean    sl_combine_rule_allowed     (SlField lead, SlCombineRule rule);
/* The name of the group led by LEAD, as the command line, the settings
 * and the recorded runs write it: "position", "parallax", "pm", "vmag",
 * "bmag", "bv", "ebv", "vrad"; NULL for a field that leads no group that
 * can be combined. */
const char *sl_combine_group_name       (SlField lead);
gboolean    sl_combine_group_from_name  (const char *name, SlField *lead);
/* The 1-based place of NAME in the source order; 0 when not listed. */
guint       sl_combine_priority_rank    (const SlCombinePolicy *policy, const char *name);
/* Whether the two policies choose the same inputs. */
gboolean    sl_combine_policy_equal     (const SlCombinePolicy *a, const SlCombinePolicy *b);
/* One line for people: "parallax weighted-mean, others smallest-error, ...". */
char       *sl_combine_policy_describe  (const SlCombinePolicy *policy);

/* The inverse-variance weighted mean of N values with 1-sigma ERRORS
 * (all > 0), its error, and the consistency test's chi-square with N - 1
 * degrees of freedom and its tail probability (NAN for one value). */
typedef struct {
  double mean;
  double error;
  double chi2;
  guint  dof;
  double p_value;
} SlWeightedMean;

gboolean    sl_weighted_mean            (const double *values, const double *errors, guint n,
                                         SlWeightedMean *out);
/* The tail probability of CHI2 with DOF degrees of freedom (1 for DOF 0). */
double      sl_chi2_tail                (double chi2, guint dof);

/* The policy in the group "combine" of a GLib key file: the project's
 * settings (key "combine" of the settings table) and each run's recorded
 * parameters.  Loading leaves POLICY as it was when the group is absent,
 * and refuses an unknown rule or a rule a group does not allow. */
void        sl_combine_policy_save      (const SlCombinePolicy *policy, GKeyFile *key_file);
gboolean    sl_combine_policy_load      (SlCombinePolicy *policy, GKeyFile *key_file, GError **error);
/* Checks the level and the source order (names without newlines, which
 * fit); the first problem is named in an SL_ERROR_BAD_INPUT error. */
gboolean    sl_combine_policy_check     (const SlCombinePolicy *policy, GError **error);

G_END_DECLS
