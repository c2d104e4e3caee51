/* methods.h: the published relations behind the derivation modules, as
 * plain functions of plain numbers, so tests can check each against its
 * source without a project or the engine.  Each is documented in the
 * module file that implements it.
 */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

/* temperature.c: Flower (1996) as corrected by Torres (2010, Table 2). */
double   sl_flower_log_teff (double bv0, double *dlogt_dbv);
gboolean sl_flower_colour_in_range (double bv0);
/* temperature.c: Ballesteros (2012, EPL 97, 34008). */
double   sl_ballesteros_teff (double bv0, double *dt_dbv);
gboolean sl_ballesteros_colour_in_range (double bv0);

/* bolometric.c: Flower (1996) BC_V(log Teff), coefficients corrected by
 * Torres (2010, Table 1). */
double   sl_flower_bc (double log_teff, double *dbc_dlogt);
gboolean sl_flower_bc_in_range (double teff);
/* M_bol of the Sun on the same BC scale (Torres 2010): V_sun + 31.572 + BC(5772 K). */
double   sl_mbol_sun_flower (void);

/* distance.c: the EDSD prior of Bailer-Jones (2015, PASP 127, 994). */
double   sl_edsd_mode (double parallax_mas, double sigma_mas, double length_pc);

typedef struct _SlEdsdPosterior SlEdsdPosterior;
SlEdsdPosterior *sl_edsd_posterior_new (double parallax_mas, double sigma_mas, double length_pc);
double   sl_edsd_posterior_quantile (const SlEdsdPosterior *posterior, double p);
/* The 68% highest-density interval (Bailer-Jones et al. 2018 convention). */
void     sl_edsd_posterior_hdi (const SlEdsdPosterior *posterior, double mass,
                                double *lo, double *hi);
void     sl_edsd_posterior_free (SlEdsdPosterior *posterior);

/* spectral.c: Pecaut & Mamajek (2013) dwarf sequence, interpolated. */
gboolean sl_spectral_class_from_teff (double teff, char *buf, gsize size);

/* ecliptic.c: ICRS to the IAU 2006 mean ecliptic of J2000 (as ERFA eraEqec06). */
void     sl_ecliptic_from_icrs (double ra_deg, double dec_deg, double *lon_deg, double *lat_deg);
/* The IAU 2006 obliquity of the ecliptic at J2000 (ERFA eraObl06), rad. */
double   sl_obliquity_j2000 (void);

/* zams.c: the zero-age main sequence of Tout, Pols, Eggleton & Han (1996,
 * MNRAS 281, 257): L [L_sun], R [R_sun] and Teff [K] of mass [M_sun] at
 * metal fraction Z; NAN outside 0.1-100 M_sun, 1e-4 <= Z <= 0.03. */
double   sl_zams_luminosity (double mass, double z);
double   sl_zams_radius (double mass, double z);
double   sl_zams_teff (double mass, double z);

G_END_DECLS
