/* zams.c: the zero-age main sequence, for the HR diagram's reference line.
 *
 * Computes: the luminosity [L_sun], radius [R_sun] and effective
 *   temperature [K] of a zero-age main-sequence star of a given mass and
 *   metallicity.
 * Method: the analytic fits of Tout, Pols, Eggleton & Han (1996, MNRAS 281,
 *   257, eqs. 1-2 with Tables 1 and 2) to the ZAMS models of Pols et al.:
 *     L = (alpha M^5.5 + beta M^11)
 *         / (gamma + M^3 + delta M^5 + epsilon M^7 + zeta M^8 + eta M^9.5)
 *     R = (theta M^2.5 + iota M^6.5 + kappa M^11 + lambda M^19 + mu M^19.5)
 *         / (nu + xi M^2 + o M^8.5 + M^18.5 + pi M^19.5)
 *   each coefficient a + b x + c x^2 + d x^3 + e x^4 with x = log10(Z/0.02)
 *   (coefficients as in REFERENCES.md 9).  Teff = 5772 K (L / R^2)^(1/4):
 *   the Stefan-Boltzmann law in ratio form with the IAU 2015 B3 nominal
 *   solar Teff.
 * Inputs: mass [M_sun]; z, the metal mass fraction Z (0.02 about solar).
 * Outputs: L [L_sun], R [R_sun], Teff [K].
 * Validity: 0.1 <= M <= 100 M_sun, 1e-4 <= Z <= 0.03 (the fits' range);
 *   outside it the functions return NAN rather than an extrapolation.
 * Notes: not a per-star derivation module; a published relation the HR
 *   diagram draws.  The L numerator is alpha M^5.5 (M^5 sqrt M), as in
 *   the paper; an M^2.5 seen in some copies is a misprint.
 */
#include <math.h>

#include "../constants.h"
#include "methods.h"

/* a, b, c, d, e of each coefficient: Tout et al. (1996), Table 1 (L). */
static const double lum_coef[7][5] = {
  { 0.39704170, -0.32913574, 0.34776688, 0.37470851, 0.09011915 },   /* alpha   M^5.5 */
  { 8.52762600, -24.41225973, 56.43597107, 37.06152575, 5.45624060 }, /* beta    M^11 */
  { 0.00025546, -0.00123461, -0.00023246, 0.00045519, 0.00016176 },   /* gamma   M^0 */
  { 5.43288900, -8.62157806, 13.44202049, 14.51584135, 3.39793084 },  /* delta   M^5 */
  { 5.56357900, -10.32345224, 19.44322980, 18.97361347, 4.16903097 }, /* epsilon M^7 */
  { 0.78866060, -2.90870942, 6.54713531, 4.05606657, 0.53287322 },    /* zeta    M^8 */
  { 0.00586685, -0.01704237, 0.03872348, 0.02570041, 0.00383376 },    /* eta     M^9.5 */
};

/* Tout et al. (1996), Table 2 (R). */
static const double rad_coef[9][5] = {
  { 1.71535900, 0.62246212, -0.92557761, -1.16996966, -0.30631491 },  /* theta  M^2.5 */
  { 6.59778800, -0.42450044, -12.13339427, -10.73509484, -2.51487077 }, /* iota M^6.5 */
  { 10.08855000, -7.11727086, -31.67119479, -24.24848322, -5.33608972 }, /* kappa M^11 */
  { 1.01249500, 0.32699690, -0.00923418, -0.03876858, -0.00412750 },  /* lambda M^19 */
  { 0.07490166, 0.02410413, 0.07233664, 0.03040467, 0.00197741 },     /* mu     M^19.5 */
  { 0.01077422, 0, 0, 0, 0 },                                          /* nu     M^0 */
  { 3.08223400, 0.94472050, -2.15200882, -2.49219496, -0.63848738 },  /* xi     M^2 */
  { 17.84778000, -7.45345690, -48.96066856, -40.05386135, -9.09331816 }, /* o   M^8.5 */
  { 0.00022582, -0.00186899, 0.00388783, 0.00142402, -0.00007671 },   /* pi     M^19.5 */
};

static gboolean
in_range (double mass, double z)
{
  return mass >= 0.1 && mass <= 100.0 && z >= 1e-4 && z <= 0.03;
}

/* a + b x + c x^2 + d x^3 + e x^4 by Horner's rule. */
static double
coefficient (const double c[5], double x)
{
  return c[0] + x * (c[1] + x * (c[2] + x * (c[3] + x * c[4])));
}

double
sl_zams_luminosity (double mass, double z)
{
  double x, c[7];

  if (!in_range (mass, z))
    return NAN;
  x = log10 (z / 0.02);
  for (int i = 0; i < 7; i++)
    c[i] = coefficient (lum_coef[i], x);
  return (c[0] * pow (mass, 5.5) + c[1] * pow (mass, 11.0))
         / (c[2] + pow (mass, 3.0) + c[3] * pow (mass, 5.0) + c[4] * pow (mass, 7.0)
            + c[5] * pow (mass, 8.0) + c[6] * pow (mass, 9.5));
}

double
sl_zams_radius (double mass, double z)
{
  double x, c[9];

  if (!in_range (mass, z))
    return NAN;
  x = log10 (z / 0.02);
  for (int i = 0; i < 9; i++)
    c[i] = coefficient (rad_coef[i], x);
  return (c[0] * pow (mass, 2.5) + c[1] * pow (mass, 6.5) + c[2] * pow (mass, 11.0)
          + c[3] * pow (mass, 19.0) + c[4] * pow (mass, 19.5))
         / (c[5] + c[6] * pow (mass, 2.0) + c[7] * pow (mass, 8.5) + pow (mass, 18.5)
            + c[8] * pow (mass, 19.5));
}

double
sl_zams_teff (double mass, double z)
{
  double lum = sl_zams_luminosity (mass, z), radius = sl_zams_radius (mass, z);

  return SL_NOMINAL_SUN_TEFF_K * pow (lum / (radius * radius), 0.25);
}
