/* registry.c: the tables of derived quantities, flags and modules, and
 * the parameters of a run.  Adding a module: one file, one line in
 * module_list below. */
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
  g_string_append_printf (json, ",\"teff\":\"%s\",\"errors\":\"%s\",\"draws\":%u,\"seed\":%" G_GUINT64_FORMAT
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
  GString *text = g_string_new (NULL);

  if (p->distance == SL_DISTANCE_EDSD)
    g_string_append_printf (text, "distance edsd (L = %s pc)", sl_format_double (buf[0], p->length_scale_pc));
  else
    g_string_append (text, "distance inverse");
  g_string_append_printf (text, ", parallax zero point %s mas, R_V %s", sl_format_double (buf[1], p->parallax_zero_point),
                          sl_format_double (buf[2], p->rv));
  if (p->rv_err > 0)
    g_string_append_printf (text, " +/- %s", sl_format_double (buf[3], p->rv_err));
  g_string_append_printf (text, ", teff %s", p->teff == SL_TEFF_BALLESTEROS ? "ballesteros" : "flower");
  if (p->errors == SL_ERRORS_MONTE_CARLO)
    g_string_append_printf (text, ", errors mc:%u (seed %" G_GUINT64_FORMAT ")", p->draws, p->seed);
  else
    g_string_append_printf (text, ", errors linear (Monte Carlo, %u draws, seed %" G_GUINT64_FORMAT
                            ", below parallax S/N %s)", p->draws, p->seed, sl_format_double (buf[3], p->mc_below_snr));
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
