/* constants.h: every physical and astronomical constant Starledger uses,
 * each with its source.  Nothing else in the code writes a constant of
 * nature as a literal.
 */
#pragma once

#include <erfam.h>
#include <math.h>

/* IAU 2012 Resolution B2: the astronomical unit, exactly, in metres. */
#define SL_AU_M 149597870700.0

/* IAU 2015 Resolution B2 (note on the parsec): 1 pc = 648000/pi au. */
#define SL_PC_AU (648000.0 / ERFA_DPI)

/* IAU 2015 Resolution B2: the zero point of the absolute bolometric
 * magnitude scale, L0 = 3.0128e28 W (M_bol = 0). */
#define SL_L0_W 3.0128e28

/* IAU 2015 Resolution B3: nominal solar values, conversion constants.
 * (Prsa et al. 2016, AJ 152, 41) */
#define SL_NOMINAL_SUN_RADIUS_M     6.957e8
#define SL_NOMINAL_SUN_LUMINOSITY_W 3.828e26
#define SL_NOMINAL_SUN_TEFF_K       5772.0
#define SL_NOMINAL_SUN_IRRADIANCE_W_M2 1361.0

/* Apparent V magnitude of the Sun, V = -26.76 +/- 0.03, with which Torres
 * (2010, AJ 140, 1158) fixes M_bol,sun for the Flower BC scale. */
#define SL_SUN_V_MAG (-26.76)

/* 5 log10(10 pc / 1 au) = 31.572126: the distance modulus that takes the
 * Sun's apparent magnitude to its absolute one (follows from the parsec). */
#define SL_DISTMOD_AU_AT_10PC (5.0 * log10 (10.0 * SL_PC_AU))

/* Julian year in days (IAU; ERFA_DJY) and the day in seconds. */
#define SL_JULIAN_YEAR_D ERFA_DJY
#define SL_DAY_S         ERFA_DAYSEC

/* 1 au per Julian year in km/s: 149597870.7 km / (365.25 x 86400 s)
 * = 4.740470463533... (exact with the IAU 2012 au).  The Hipparcos
 * Catalogue's 4.740470446 differs by 3.7e-9 relative (REFERENCES.md 6). */
#define SL_AU_PER_YEAR_KM_S (SL_AU_M / 1000.0 / (SL_JULIAN_YEAR_D * SL_DAY_S))

/* J2000.0 as a Julian Date (ERFA_DJ00). */
#define SL_J2000_JD ERFA_DJ00
