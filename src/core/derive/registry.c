/* registry.c: the tables of derived quantities, flags and modules, and
 * the parameters of a run.  Adding a module: one file, one line in
 * module_list below. */
#include <inttypes.h>
#include <float.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "../sl-error.h"
#include "../units.h"
#include "../util.h"
#include "derive.h"

extern const SlModule sl_module_parallax;
extern const SlModule sl_module_distance;
extern const SlModule sl_module_extinction;
extern const SlModule sl_module_absmag;
extern const SlModule sl_module_temperature;
extern const SlModule sl_module_bolometric;
extern const SlModule sl_module_luminosity;
extern const SlModule sl_module_radius;
extern const SlModule sl_module_kinematics;
extern const SlModule sl_module_ecliptic;
extern const SlModule sl_module_ellipse;
extern const SlModule sl_module_spectral;

static const SlModule *const module_list[] = {
  &sl_module_parallax,
  &sl_module_distance,
  &sl_module_extinction,
  &sl_module_absmag,
  &sl_module_temperature,
  &sl_module_bolometric,
  &sl_module_luminosity,
  &sl_module_radius,
  &sl_module_kinematics,
  &sl_module_ecliptic,
  &sl_module_ellipse,
  &sl_module_spectral,
};

const SlModule *const *
sl_modules (guint *n_modules)
{
  *n_modules = G_N_ELEMENTS (module_list);
  return module_list;
}

static const SlQuantityInfo quantity_table[SL_N_QUANTITIES] = {
  [SL_Q_PLX_SNR]    = { "plx_snr", "", FALSE, N_("parallax signal-to-noise ratio") },
  [SL_Q_DIST]       = { "dist", "pc", FALSE, N_("distance") },
  [SL_Q_DISTMOD]    = { "distmod", "mag", FALSE, N_("distance modulus") },
  [SL_Q_AV]         = { "av", "mag", FALSE, N_("visual extinction A_V") },
  [SL_Q_BV0]        = { "bv0", "mag", FALSE, N_("intrinsic colour (B-V)0") },
  [SL_Q_ABSMAG]     = { "absmag", "mag", FALSE, N_("absolute visual magnitude M_V") },
  [SL_Q_TEFF]       = { "teff", "K", FALSE, N_("effective temperature") },
  [SL_Q_BC]         = { "bc", "mag", FALSE, N_("bolometric correction BC_V") },
  [SL_Q_MBOL]       = { "mbol", "mag", FALSE, N_("absolute bolometric magnitude") },
  [SL_Q_LUM]        = { "lum", "L_sun", FALSE, N_("luminosity (nominal solar units)") },
  [SL_Q_RADIUS]     = { "radius", "R_sun", FALSE, N_("radius (nominal solar units)") },
  [SL_Q_VTAN]       = { "vtan", "km/s", FALSE, N_("tangential velocity") },
  [SL_Q_ELON]       = { "elon", "deg", FALSE, N_("ecliptic longitude (J2000)") },
  [SL_Q_ELAT]       = { "elat", "deg", FALSE, N_("ecliptic latitude (J2000)") },
  [SL_Q_ELLIPSE_A]  = { "ellipse_a", "mas", FALSE, N_("parallax ellipse semi-major axis") },
  [SL_Q_ELLIPSE_B]  = { "ellipse_b", "mas", FALSE, N_("parallax ellipse semi-minor axis") },
  [SL_Q_ELLIPSE_PA] = { "ellipse_pa", "deg", FALSE, N_("parallax ellipse position angle of the major axis") },
  [SL_Q_SPCLASS]    = { "spclass", "", TRUE, N_("spectral class estimated from teff (dwarf scale)") },
};

const SlQuantityInfo *
sl_quantity_info (SlQuantity q)
{
  g_return_val_if_fail (q < SL_N_QUANTITIES, NULL);
  return &quantity_table[q];
}

gboolean
sl_quantity_from_name (const char *name, SlQuantity *q)
{
  for (SlQuantity i = 0; i < SL_N_QUANTITIES; i++)
    if (g_ascii_strcasecmp (name, quantity_table[i].name) == 0)
      {
        *q = i;
        return TRUE;
      }
  return FALSE;
}

static const SlFlagInfo flag_table[SL_N_FLAGS] = {
  { SL_FLAG_NO_PARALLAX_ERROR, "no_parallax_error",
    N_("The parallax has no error: no signal-to-noise ratio and no intervals for what depends on it.") },
  { SL_FLAG_NONPOSITIVE_PARALLAX, "nonpositive_parallax",
    N_("The parallax is zero or negative: it is a measurement, but 1/parallax is no distance.") },
  { SL_FLAG_LOW_PARALLAX_SNR, "low_parallax_snr",
    N_("Parallax signal-to-noise ratio below 5: 1/parallax is biased, so the inverse method gives no distance.") },
  { SL_FLAG_PRIOR_DOMINATED, "prior_dominated",
    N_("The distance posterior is dominated by the prior (error over a half of the parallax): the distance mostly reflects the length scale L.") },
  { SL_FLAG_MONTE_CARLO_AUTO, "monte_carlo_auto",
    N_("Intervals come from Monte Carlo draws because first-order propagation fails at this parallax signal-to-noise ratio.") },
  { SL_FLAG_EXTINCTION_ASSUMED_ZERO, "extinction_assumed_zero",
    N_("No E(B-V) was measured: no extinction was assumed (A_V = 0).") },
  { SL_FLAG_COLOUR_OUT_OF_RANGE, "colour_out_of_range",
    N_("The intrinsic colour lies outside the temperature calibration's range: no temperature.") },
  { SL_FLAG_TEFF_OUT_OF_RANGE, "teff_out_of_range",
    N_("The temperature lies outside a calibration's range (bolometric correction or spectral class).") },
  { SL_FLAG_MISSING_ERROR, "missing_error",
    N_("An input has no error: values that depend on it have no interval.") },
  { SL_FLAG_OVERRIDDEN, "overridden",
    N_("A value of this star was set by hand; the values derived from it follow it.") },
  { SL_FLAG_SPTYPE_NOT_DWARF, "sptype_not_dwarf",
    N_("The catalogued type is not a dwarf's: the class estimate is on the dwarf scale and may be several subtypes off.") },
  { SL_FLAG_SOURCES_DISAGREE, "sources_disagree",
    N_("Two or more sources measured an input and differ by more than their errors allow (chi-square test at the run's level).") },
};

const SlFlagInfo *
sl_flag_info (guint index)
{
  g_return_val_if_fail (index < SL_N_FLAGS, NULL);
  return &flag_table[index];
}

char *
sl_flags_to_string (guint32 flags)
{
  GString *text = g_string_new (NULL);

  for (guint i = 0; i < SL_N_FLAGS; i++)
    if (flags & flag_table[i].flag)
      g_string_append_printf (text, "%s%s", text->len ? "|" : "", flag_table[i].name);
  return g_string_free (text, FALSE);
}

/* ------------------------------------------------------------------ */
/* Parameters                                                         */

void
sl_derive_params_init (SlDeriveParams *params)
{
  memset (params, 0, sizeof *params);
  params->distance = SL_DISTANCE_INVERSE;
  /* Astraatmadja & Bailer-Jones (2016, ApJ 833, 119) used 1.35 kpc. */
  params->length_scale_pc = 1350.0;
  params->parallax_zero_point = 0.0;
  params->rv = 3.1;               /* diffuse ISM (Cardelli et al. 1989) */
  params->rv_err = 0.0;
  params->teff = SL_TEFF_FLOWER_TORRES;
  params->errors = SL_ERRORS_LINEAR;
  params->draws = 1000;
  params->seed = 1;
  params->mc_below_snr = 5.0;
  sl_combine_policy_init (&params->combine);
}

char *
sl_derive_params_to_json (const SlDeriveParams *p)
{
  GString *json = g_string_new ("{");

  g_string_append_printf (json, "\"distance\":\"%s\",\"length_scale_pc\":",
                          p->distance == SL_DISTANCE_EDSD ? "edsd" : "inverse");
  sl_json_append_number (json, p->length_scale_pc);
  g_string_append (json, ",\"parallax_zero_point\":");
  sl_json_append_number (json, p->parallax_zero_point);
  g_string_append (json, ",\"rv\":");
  sl_json_append_number (json, p->rv);
  g_string_append (json, ",\"rv_err\":");
  sl_json_append_number (json, p->rv_err);
  g_string_append_printf (json, ",\"teff\":\"%s\",\"errors\":\"%s\",\"draws\":%u,\"seed\":%" PRIu64
                          ",\"mc_below_snr\":",
                          p->teff == SL_TEFF_BALLESTEROS ? "ballesteros" : "flower",
                          p->errors == SL_ERRORS_MONTE_CARLO ? "mc" : "linear", p->draws, p->seed);
  sl_json_append_number (json, p->mc_below_snr);
  g_string_append_c (json, '}');
  return g_string_free (json, FALSE);
}

char *
sl_derive_params_describe (const SlDeriveParams *p)
{
  char buf[4][G_ASCII_DTOSTR_BUF_SIZE];
  g_autofree char *combine = NULL;
  GString *text = g_string_new (NULL);

  if (p->distance == SL_DISTANCE_EDSD)
    g_string_append_printf (text, _("distance edsd (L = %s pc)"), sl_format_double (buf[0], p->length_scale_pc));
  else
    g_string_append (text, _("distance inverse"));
  g_string_append_printf (text, _(", parallax zero point %s mas, R_V %s"),
                          sl_format_double (buf[1], p->parallax_zero_point), sl_format_double (buf[2], p->rv));
  if (p->rv_err > 0)
    g_string_append_printf (text, " +/- %s", sl_format_double (buf[3], p->rv_err));
  g_string_append_printf (text, ", teff %s", p->teff == SL_TEFF_BALLESTEROS ? "ballesteros" : "flower");
  if (p->errors == SL_ERRORS_MONTE_CARLO)
    g_string_append_printf (text, _(", errors mc:%u (seed %" PRIu64 ")"), p->draws, p->seed);
  else
    g_string_append_printf (text, _(", errors linear (Monte Carlo, %u draws, seed %" PRIu64
                                   ", below parallax S/N %s)"),
                            p->draws, p->seed, sl_format_double (buf[3], p->mc_below_snr));
  combine = sl_combine_policy_describe (&p->combine);
  g_string_append_printf (text, _(", sources combined: %s"), combine);
  return g_string_free (text, FALSE);
}

/* Parameters are recorded with each run as GLib key-file text: readable,
 * locale-independent, and parsed by GLib. */
#define PARAMS_GROUP "derive"

char *
sl_derive_params_to_keyfile (const SlDeriveParams *p)
{
  g_autoptr (GKeyFile) kf = g_key_file_new ();

  g_key_file_set_string (kf, PARAMS_GROUP, "distance", p->distance == SL_DISTANCE_EDSD ? "edsd" : "inverse");
  g_key_file_set_double (kf, PARAMS_GROUP, "length_scale_pc", p->length_scale_pc);
  g_key_file_set_double (kf, PARAMS_GROUP, "parallax_zero_point", p->parallax_zero_point);
  g_key_file_set_double (kf, PARAMS_GROUP, "rv", p->rv);
  g_key_file_set_double (kf, PARAMS_GROUP, "rv_err", p->rv_err);
  g_key_file_set_string (kf, PARAMS_GROUP, "teff", p->teff == SL_TEFF_BALLESTEROS ? "ballesteros" : "flower");
  g_key_file_set_string (kf, PARAMS_GROUP, "errors", p->errors == SL_ERRORS_MONTE_CARLO ? "mc" : "linear");
  g_key_file_set_uint64 (kf, PARAMS_GROUP, "draws", p->draws);
  g_key_file_set_uint64 (kf, PARAMS_GROUP, "seed", p->seed);
  g_key_file_set_double (kf, PARAMS_GROUP, "mc_below_snr", p->mc_below_snr);
  sl_combine_policy_save (&p->combine, kf);
  return g_key_file_to_data (kf, NULL, NULL);
}

gboolean
sl_derive_params_from_keyfile (SlDeriveParams *p, const char *text, GError **error)
{
  g_autoptr (GKeyFile) kf = g_key_file_new ();
  g_autofree char *distance = NULL;
  g_autofree char *teff = NULL;
  g_autofree char *errors = NULL;
  GError *local = NULL;

  sl_derive_params_init (p);
  if (!g_key_file_load_from_data (kf, text, -1, G_KEY_FILE_NONE, error))
    return FALSE;
  distance = g_key_file_get_string (kf, PARAMS_GROUP, "distance", &local);
  if (!local) p->length_scale_pc = g_key_file_get_double (kf, PARAMS_GROUP, "length_scale_pc", &local);
  if (!local) p->parallax_zero_point = g_key_file_get_double (kf, PARAMS_GROUP, "parallax_zero_point", &local);
  if (!local) p->rv = g_key_file_get_double (kf, PARAMS_GROUP, "rv", &local);
  if (!local) p->rv_err = g_key_file_get_double (kf, PARAMS_GROUP, "rv_err", &local);
  if (!local) teff = g_key_file_get_string (kf, PARAMS_GROUP, "teff", &local);
  if (!local) errors = g_key_file_get_string (kf, PARAMS_GROUP, "errors", &local);
  if (!local) p->draws = (guint) g_key_file_get_uint64 (kf, PARAMS_GROUP, "draws", &local);
  if (!local) p->seed = g_key_file_get_uint64 (kf, PARAMS_GROUP, "seed", &local);
  if (!local) p->mc_below_snr = g_key_file_get_double (kf, PARAMS_GROUP, "mc_below_snr", &local);
  /* A run recorded before combination policies chose the smallest
   * uncertainty and tested nothing. */
  p->combine.level = 0.0;
  if (!local)
    sl_combine_policy_load (&p->combine, kf, &local);
  if (local)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_DATABASE, _("the run's recorded parameters are damaged: %s"),
                   local->message);
      g_error_free (local);
      return FALSE;
    }
  p->distance = g_strcmp0 (distance, "edsd") == 0 ? SL_DISTANCE_EDSD : SL_DISTANCE_INVERSE;
  p->teff = g_strcmp0 (teff, "ballesteros") == 0 ? SL_TEFF_BALLESTEROS : SL_TEFF_FLOWER_TORRES;
  p->errors = g_strcmp0 (errors, "mc") == 0 ? SL_ERRORS_MONTE_CARLO : SL_ERRORS_LINEAR;
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* The parameters one by one: labels, ranges and citations            */

/* The ranges are what the engine can work with, not what is plausible:
 * an unusual R_V or L is the astronomer's call.  The citations name the
 * published method a choice selects (a module's citation holds those of
 * all its methods) or the source of a parameter's default. */
static const SlParamInfo param_table[SL_N_PARAMS] = {
  [SL_PARAM_DISTANCE] = {
    "distance", SL_PARAM_KIND_CHOICE, N_("Distance method"), "",
    N_("How a parallax becomes a distance."), "",
    .n_choices = 2,
    .choices = {
      [SL_DISTANCE_INVERSE] = { "inverse", N_("Inverse parallax"),
                                N_("1000 / parallax; only where the parallax signal-to-noise ratio is 5 or more."),
                                "Bailer-Jones 2015, PASP 127, 994" },
      [SL_DISTANCE_EDSD] = { "edsd", N_("Space density prior"),
                             /* xgettext:no-c-format */
                             N_("An exponentially decreasing space density prior: the posterior's mode with its "
                                "68% highest-density interval; any parallax with an error."),
                             "Bailer-Jones 2015, PASP 127, 994; Bailer-Jones et al. 2018, AJ 156, 58" },
    } },
  [SL_PARAM_LENGTH_SCALE] = {
    "length_scale_pc", SL_PARAM_KIND_NUMBER, N_("Prior length scale L"), "pc",
    N_("The space density prior falls off as exp(-r/L); only the prior method uses it."),
    "Astraatmadja & Bailer-Jones 2016, ApJ 833, 119",
    .min = DBL_TRUE_MIN, .max = DBL_MAX },
  [SL_PARAM_PARALLAX_ZERO_POINT] = {
    "parallax_zero_point", SL_PARAM_KIND_NUMBER, N_("Parallax zero point"), "mas",
    N_("Subtracted from every parallax before use."),
    "Lindegren et al. 2021, A&A 649, A4",
    .min = -DBL_MAX, .max = DBL_MAX },
  [SL_PARAM_RV] = {
    "rv", SL_PARAM_KIND_NUMBER, N_("Extinction ratio R_V"), "",
    N_("A_V = R_V E(B-V); 3.1 for the diffuse interstellar medium."),
    "Cardelli, Clayton & Mathis 1989, ApJ 345, 245",
    .min = DBL_TRUE_MIN, .max = DBL_MAX },
  [SL_PARAM_RV_ERR] = {
    "rv_err", SL_PARAM_KIND_NUMBER, N_("Error of R_V"), "",
    N_("Its 1-sigma error, carried into A_V; 0 for none."),
    "Cardelli, Clayton & Mathis 1989, ApJ 345, 245",
    .min = 0.0, .max = DBL_MAX },
  [SL_PARAM_TEFF] = {
    "teff", SL_PARAM_KIND_CHOICE, N_("Temperature calibration"), "",
    N_("How the intrinsic colour (B-V)0 becomes an effective temperature."), "",
    .n_choices = 2,
    .choices = {
      [SL_TEFF_FLOWER_TORRES] = { "flower", N_("Flower–Torres"),
                                  N_("Flower (1996) as corrected by Torres (2010): a polynomial in (B-V)0 for -0.343 "
                                     "to 1.805 (about 2900 to 52 500 K)."),
                                  "Flower 1996, ApJ 469, 355; Torres 2010, AJ 140, 1158 (Table 2)" },
      [SL_TEFF_BALLESTEROS] = { "ballesteros", N_("Ballesteros"),
                                N_("Ballesteros (2012), from black-body colours: (B-V)0 of 0.103 to 1.370 (about "
                                   "9000 to 4000 K)."),
                                "Ballesteros 2012, EPL 97, 34008" },
    } },
  [SL_PARAM_ERRORS] = {
    "errors", SL_PARAM_KIND_CHOICE, N_("Error propagation"), "",
    N_("How the measurement errors are carried to the derived values."), "",
    .n_choices = 2,
    .choices = {
      [SL_ERRORS_LINEAR] = { "linear", N_("First order"),
                             N_("Linear propagation with the correlations carried along the chain; Monte Carlo "
                                "where it fails."),
                             "JCGM 100:2008 (GUM), section 5" },
      [SL_ERRORS_MONTE_CARLO] = { "mc", N_("Monte Carlo"),
                                  N_("Every star's inputs drawn many times; medians with 15.87 and 84.13 "
                                     "percentiles."),
                                  "JCGM 101:2008 (GUM Supplement 1)" },
    } },
  [SL_PARAM_DRAWS] = {
    "draws", SL_PARAM_KIND_COUNT, N_("Monte Carlo draws"), "",
    N_("Draws per star; more give steadier intervals and take longer."),
    "JCGM 101:2008 (GUM Supplement 1)",
    .count_min = 10, .count_max = 10000000 },
  [SL_PARAM_SEED] = {
    "seed", SL_PARAM_KIND_COUNT, N_("Random seed"), "",
    N_("The same seed gives the same draws, so a run can be repeated exactly."),
    "Matsumoto & Nishimura 1998, ACM TOMACS 8, 3",
    .count_min = 0, .count_max = G_MAXUINT64 },
  [SL_PARAM_MC_BELOW_SNR] = {
    "mc_below_snr", SL_PARAM_KIND_NUMBER, N_("Monte Carlo below parallax S/N"), "",
    N_("First-order runs use Monte Carlo draws for stars whose parallax signal-to-noise ratio is below this."),
    "Bailer-Jones 2015, PASP 127, 994",
    .min = 0.0, .max = DBL_MAX },
};

const SlParamInfo *
sl_param_info (SlParam param)
{
  g_return_val_if_fail (param < SL_N_PARAMS, NULL);
  return &param_table[param];
}

gboolean
sl_param_from_name (const char *name, SlParam *param)
{
  for (SlParam i = 0; i < SL_N_PARAMS; i++)
    if (g_strcmp0 (name, param_table[i].name) == 0)
      {
        *param = i;
        return TRUE;
      }
  return FALSE;
}

static double *
number_field (SlDeriveParams *p, SlParam param)
{
  switch (param)
    {
    case SL_PARAM_LENGTH_SCALE:        return &p->length_scale_pc;
    case SL_PARAM_PARALLAX_ZERO_POINT: return &p->parallax_zero_point;
    case SL_PARAM_RV:                  return &p->rv;
    case SL_PARAM_RV_ERR:              return &p->rv_err;
    case SL_PARAM_MC_BELOW_SNR:        return &p->mc_below_snr;
    default:                           g_return_val_if_reached (NULL);
    }
}

static guint64
get_count (const SlDeriveParams *p, SlParam param)
{
  return param == SL_PARAM_DRAWS ? p->draws : p->seed;
}

guint
sl_param_get_choice (const SlDeriveParams *p, SlParam param)
{
  switch (param)
    {
    case SL_PARAM_DISTANCE: return p->distance;
    case SL_PARAM_TEFF:     return p->teff;
    case SL_PARAM_ERRORS:   return p->errors;
    default:                g_return_val_if_reached (0);
    }
}

void
sl_param_set_choice (SlDeriveParams *p, SlParam param, guint choice)
{
  g_return_if_fail (param < SL_N_PARAMS && param_table[param].kind == SL_PARAM_KIND_CHOICE);
  g_return_if_fail (choice < param_table[param].n_choices);
  switch (param)
    {
    case SL_PARAM_DISTANCE: p->distance = choice; break;
    case SL_PARAM_TEFF:     p->teff = choice; break;
    case SL_PARAM_ERRORS:   p->errors = choice; break;
    default:                g_return_if_reached ();
    }
}

char *
sl_param_to_text (const SlDeriveParams *p, SlParam param)
{
  const SlParamInfo *info;
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  g_return_val_if_fail (param < SL_N_PARAMS, NULL);
  info = &param_table[param];
  switch (info->kind)
    {
    case SL_PARAM_KIND_CHOICE:
      {
        guint choice = sl_param_get_choice (p, param);

        /* A damaged record may hold any number. */
        return choice < info->n_choices ? g_strdup (info->choices[choice].name) : g_strdup_printf ("%u", choice);
      }
    case SL_PARAM_KIND_NUMBER:
      return g_strdup (sl_format_double (buf, *number_field ((SlDeriveParams *) p, param)));
    case SL_PARAM_KIND_COUNT:
    default:
      return g_strdup_printf ("%" PRIu64, get_count (p, param));
    }
}

/* "LABEL: expected ..., not “TEXT”", the accepted range in words. */
static void
set_range_error (GError **error, SlParam param, const char *text)
{
  const SlParamInfo *info = &param_table[param];
  const char *label = _(info->label);

  switch (info->kind)
    {
    case SL_PARAM_KIND_CHOICE:
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: expected %s or %s, not “%s”"), label,
                   info->choices[0].name, info->choices[1].name, text);
      break;
    case SL_PARAM_KIND_COUNT:
      if (info->count_min == 0 && info->count_max == G_MAXUINT64)
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: expected a whole number, not “%s”"), label, text);
      else
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                     _("%s: expected a whole number from %" PRIu64 " to %" PRIu64 ", not “%s”"),
                     label, info->count_min, info->count_max, text);
      break;
    case SL_PARAM_KIND_NUMBER:
    default:
      if (info->min == -DBL_MAX)
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: expected a number, not “%s”"), label, text);
      else if (info->min == DBL_TRUE_MIN)
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: expected a number greater than 0, not “%s”"),
                     label, text);
      else
        g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT, _("%s: expected a number of 0 or more, not “%s”"),
                     label, text);
      break;
    }
}

static gboolean
number_in_range (const SlParamInfo *info, double value)
{
  return isfinite (value) && value >= info->min && value <= info->max;
}

gboolean
sl_param_from_text (SlDeriveParams *p, SlParam param, const char *text, GError **error)
{
  const SlParamInfo *info;
  g_autofree char *stripped = NULL;

  g_return_val_if_fail (param < SL_N_PARAMS, FALSE);
  g_return_val_if_fail (text != NULL, FALSE);
  info = &param_table[param];
  stripped = g_strstrip (g_strdup (text));
  switch (info->kind)
    {
    case SL_PARAM_KIND_CHOICE:
      for (guint i = 0; i < info->n_choices; i++)
        if (strcmp (stripped, info->choices[i].name) == 0)
          {
            sl_param_set_choice (p, param, i);
            return TRUE;
          }
      break;
    case SL_PARAM_KIND_NUMBER:
      {
        const char *problem;
        double value;

        if (sl_parse_number (stripped, &value, &problem) && number_in_range (info, value))
          {
            *number_field (p, param) = value;
            return TRUE;
          }
      }
      break;
    case SL_PARAM_KIND_COUNT:
      {
        guint64 value;

        if (g_ascii_string_to_unsigned (stripped, 10, info->count_min, info->count_max, &value, NULL))
          {
            if (param == SL_PARAM_DRAWS)
              p->draws = (guint) value;
            else
              p->seed = value;
            return TRUE;
          }
      }
      break;
    }
  set_range_error (error, param, text);
  return FALSE;
}

const char *
sl_param_citation (const SlDeriveParams *p, SlParam param)
{
  const SlParamInfo *info;

  g_return_val_if_fail (param < SL_N_PARAMS, "");
  info = &param_table[param];
  if (info->kind == SL_PARAM_KIND_CHOICE)
    {
      guint choice = sl_param_get_choice (p, param);

      return choice < info->n_choices ? info->choices[choice].citation : "";
    }
  return info->citation;
}

gboolean
sl_derive_params_check (const SlDeriveParams *p, GError **error)
{
  for (SlParam param = 0; param < SL_N_PARAMS; param++)
    {
      const SlParamInfo *info = &param_table[param];
      gboolean ok;

      switch (info->kind)
        {
        case SL_PARAM_KIND_CHOICE:
          ok = sl_param_get_choice (p, param) < info->n_choices;
          break;
        case SL_PARAM_KIND_NUMBER:
          ok = number_in_range (info, *number_field ((SlDeriveParams *) p, param));
          break;
        case SL_PARAM_KIND_COUNT:
        default:
          ok = get_count (p, param) >= info->count_min && get_count (p, param) <= info->count_max;
          break;
        }
      if (!ok)
        {
          g_autofree char *text = sl_param_to_text (p, param);

          set_range_error (error, param, text);
          return FALSE;
        }
    }
  return TRUE;
}
