/* spectral.c: a spectral class estimate from the effective temperature.
 *
 * Computes: spclass, e.g. "G2V", the dwarf spectral type whose Teff is
 *   nearest, interpolated in log Teff between the anchor points below.
 * Method: the mean dwarf sequence of Pecaut & Mamajek (2013, ApJS 208, 9,
 *   Table 5) as maintained by E. Mamajek, version 2019.3.22: the Teff of
 *   each class's 0 and 5 subtypes, the last subtype before the next class,
 *   and G2V = 5770 K.  Types count O0 = 0, B0 = 10, ..., M0 = 60, L0 = 70;
 *   the subtype is rounded to the half.
 * Inputs: teff [K]; sptype (only to flag a catalogued giant or dwarf).
 * Outputs: spclass (text).  It is an estimate on the dwarf scale and says
 *   so: giants of a type are cooler than dwarfs (a K1.5 III giant comes out
 *   near K5.5V), hence the flag sptype_not_dwarf when the catalogued type
 *   has another luminosity class.
 * Validity: 2250 K (L0V) to 46 000 K (O3V); outside, no value and the flag
 *   teff_out_of_range.
 */
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "derive.h"
#include "methods.h"

typedef struct {
  double type;   /* O0 = 0, B0 = 10, ... */
  double teff;   /* K */
} ClassAnchor;

/* Pecaut & Mamajek (2013) / Mamajek 2019.3.22, dwarfs; hot to cool. */
static const ClassAnchor anchors[] = {
  { 3.0, 46000 }, { 5.0, 41500 }, { 9.5, 32000 },
  { 10.0, 31500 }, { 15.0, 15700 }, { 19.5, 10400 },
  { 20.0, 9700 }, { 25.0, 8080 }, { 29.0, 7440 },
  { 30.0, 7220 }, { 35.0, 6510 }, { 39.5, 6000 },
  { 40.0, 5920 }, { 42.0, 5770 }, { 45.0, 5660 }, { 49.0, 5340 },
  { 50.0, 5280 }, { 55.0, 4410 }, { 59.0, 3940 },
  { 60.0, 3870 }, { 65.0, 3030 }, { 69.5, 2320 },
  { 70.0, 2250 },
};

gboolean
sl_spectral_class_from_teff (double teff, char *buf, gsize size)
{
  static const char letters[] = "OBAFGKML";
  double log_t = log10 (teff), type = NAN, subtype;
  int letter;

  if (!(teff <= anchors[0].teff && teff >= anchors[G_N_ELEMENTS (anchors) - 1].teff))
    return FALSE;
  for (gsize i = 1; i < G_N_ELEMENTS (anchors); i++)
    if (teff >= anchors[i].teff)
      {
        double t0 = log10 (anchors[i - 1].teff), t1 = log10 (anchors[i].teff);

        type = anchors[i - 1].type + (anchors[i].type - anchors[i - 1].type) * (log_t - t0) / (t1 - t0);
        break;
      }

  type = round (type * 2.0) / 2.0;
  letter = (int) (type / 10.0);
  subtype = type - 10.0 * letter;
  if (fmod (subtype, 1.0) == 0.0)
    g_snprintf (buf, size, "%c%dV", letters[letter], (int) subtype);
  else
    g_snprintf (buf, size, "%c%d.5V", letters[letter], (int) subtype);
  return TRUE;
}

/* Whether a catalogued type names a luminosity class other than V (or a
 * white dwarf). */
static gboolean
names_other_class (const char *sptype)
{
  static const char *const others[] = { "III", "II", "IV", "Ia", "Ib", "I " };
  g_autofree char *padded = NULL;

  if (sptype == NULL)
    return FALSE;
  if (sptype[0] == 'D' || g_str_has_prefix (sptype, "sd"))
    return TRUE;
  padded = g_strconcat (sptype, " ", NULL);
  for (gsize i = 0; i < G_N_ELEMENTS (others); i++)
    if (strstr (padded, others[i]) != NULL)
      return TRUE;
  return FALSE;
}

static void
compute_class (SlEval *ev)
{
  if (!ev->has[SL_Q_TEFF])
    return;
  if (!sl_spectral_class_from_teff (ev->q[SL_Q_TEFF].v, ev->text_buffer, sizeof ev->text_buffer))
    {
      ev->flags |= SL_FLAG_TEFF_OUT_OF_RANGE;
      return;
    }
  if (names_other_class (ev->sptype))
    ev->flags |= SL_FLAG_SPTYPE_NOT_DWARF;
  ev->has[SL_Q_SPCLASS] = TRUE;
  ev->text[SL_Q_SPCLASS] = ev->text_buffer;
}

const SlModule sl_module_spectral = {
  .name = "spectral-class",
  .version = 1,
  .method = N_("nearest dwarf spectral type, interpolated in log Teff (an estimate on the dwarf scale)"),
  .citation = "Pecaut & Mamajek 2013, ApJS 208, 9 (Table 5; Mamajek's version 2019.3.22)",
  .formula = N_("spclass = the dwarf type whose Teff matches teff, interpolated in log10 teff"),
  .validity = N_("2250 K (L0V) to 46 000 K (O3V); luminosity class V"),
  .inputs = { SL_FIELD_SPTYPE, SL_FIELD_NONE },
  .needs = { SL_Q_TEFF, SL_Q_NONE },
  .gives = { SL_Q_SPCLASS, SL_Q_NONE },
  .parameters = "",
  .compute = compute_class,
};
