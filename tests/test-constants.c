/* test-constants.c: constants.h against the IAU resolutions that define
 * them (values quoted in REFERENCES.md 1, checked there against the
 * resolutions' texts and astropy's iau2015 module). */
#include <math.h>

#include "constants.h"
#include "test-util.h"

static void
test_astronomical_unit (void)
{
  /* IAU 2012 Resolution B2: 1 au = 149 597 870 700 m exactly. */
  g_assert_cmpfloat (SL_AU_M, ==, 149597870700.0);
  g_assert_cmpfloat (SL_AU_M, ==, ERFA_DAU);
}

static void
test_parsec (void)
{
  /* IAU 2015 Resolution B2, note on the parsec: 1 pc = 648000/pi au
   * = 206 264.806 247 096... au = 3.085 677 581 491 367e16 m. */
  sl_assert_close (SL_PC_AU, 206264.806247096, 1e-9, "1 pc in au");
  sl_assert_close (SL_PC_AU * SL_AU_M / 3.085677581491367e16, 1.0, 1e-15, "1 pc in m");
}

static void
test_bolometric_zero_points (void)
{
  const double pc_m = SL_PC_AU * SL_AU_M;
  double f0 = SL_L0_W / (4.0 * G_PI * (10.0 * pc_m) * (10.0 * pc_m));

  /* IAU 2015 Resolution B2: L0 = 3.0128e28 W, f0 = 2.518 021 002e-8 W m^-2. */
  g_assert_cmpfloat (SL_L0_W, ==, 3.0128e28);
  sl_assert_close (f0 / 2.518021002e-8, 1.0, 1e-9, "f0 = L0 / 4 pi (10 pc)^2");
  /* M_bol of the nominal Sun on the IAU scale: 4.739 996 ("4.74"), and
   * L0 / L_sun = 78.704 284 222 (REFERENCES.md 1, [V-calc]). */
  sl_assert_close (-2.5 * log10 (SL_NOMINAL_SUN_LUMINOSITY_W / SL_L0_W), 4.739996, 1e-6, "M_bol,sun IAU");
  sl_assert_close (SL_L0_W / SL_NOMINAL_SUN_LUMINOSITY_W, 78.704284222, 1e-9, "L0 / L_sun");
}

static void
test_nominal_sun (void)
{
  /* IAU 2015 Resolution B3 (Prsa et al. 2016). */
  g_assert_cmpfloat (SL_NOMINAL_SUN_RADIUS_M, ==, 6.957e8);
  g_assert_cmpfloat (SL_NOMINAL_SUN_LUMINOSITY_W, ==, 3.828e26);
  g_assert_cmpfloat (SL_NOMINAL_SUN_TEFF_K, ==, 5772.0);
  g_assert_cmpfloat (SL_NOMINAL_SUN_IRRADIANCE_W_M2, ==, 1361.0);
  /* The IAU's own consistency note: 4 pi R^2 sigma T^4 = 0.999 997 6 L
   * with CODATA 2018 sigma = 5.670 374 419e-8 (REFERENCES.md 1 and 10):
   * why radius.c uses the ratio form. */
  sl_assert_close (4.0 * G_PI * pow (SL_NOMINAL_SUN_RADIUS_M, 2) * 5.670374419e-8
                     * pow (SL_NOMINAL_SUN_TEFF_K, 4) / SL_NOMINAL_SUN_LUMINOSITY_W,
                   0.9999976, 2e-7, "nominal Sun through Stefan-Boltzmann");
}

static void
test_distance_modulus_of_the_sun (void)
{
  /* 5 log10(10 pc / 1 au) = 31.572 126 (REFERENCES.md 3.4, [V-calc]). */
  sl_assert_close (SL_DISTMOD_AU_AT_10PC, 31.572126, 1e-6, "5 log10(10 pc / au)");
}

static void
test_tangential_velocity_constant (void)
{
  /* 1 au per Julian year in km/s: 149 597 870.7 km / (365.25 x 86 400 s)
   * = 4.740 470 463 533...; the Hipparcos Catalogue (ESA 1997, Vol. 1)
   * used 4.740 470 446, 3.7e-9 smaller (REFERENCES.md 6). */
  g_assert_cmpfloat (SL_JULIAN_YEAR_D, ==, 365.25);
  sl_assert_close (SL_AU_PER_YEAR_KM_S, 4.740470463533, 1e-12, "A (IAU au)");
  sl_assert_close ((SL_AU_PER_YEAR_KM_S - 4.740470446) / 4.740470446, 3.7e-9, 0.05e-9,
                   "difference from the Hipparcos value");
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/constants/iau2012/astronomical-unit", test_astronomical_unit);
  g_test_add_func ("/constants/iau2015/parsec", test_parsec);
  g_test_add_func ("/constants/iau2015/bolometric-zero-points", test_bolometric_zero_points);
  g_test_add_func ("/constants/iau2015/nominal-sun", test_nominal_sun);
  g_test_add_func ("/constants/distance-modulus-of-the-sun", test_distance_modulus_of_the_sun);
  g_test_add_func ("/constants/tangential-velocity", test_tangential_velocity_constant);
  return g_test_run ();
}
