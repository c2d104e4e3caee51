/* hrd.h: the Hertzsprung-Russell diagram.
 *
 * Theoretical plane: log Teff on x, decreasing to the right as the trade
 * draws it, log L/L_sun on y; observer's plane: (B-V)0 on x, M_V on y
 * (brighter up).  Each star with its correlated 1-sigma error ellipse
 * where the covariance is known (else error bars), coloured by Teff;
 * lines of constant radius; the zero-age main sequence of Tout et al.
 * (1996); spectral classes along the top axis; highlighted stars labelled
 * without overlaps.
 */
#pragma once

#include "figure.h"
#include "starset.h"

G_BEGIN_DECLS

typedef enum {
  SL_HRD_THEORETICAL,     /* log Teff - log L */
  SL_HRD_OBSERVATIONAL,   /* (B-V)0 - M_V */
} SlHrdPlane;

typedef struct {
  SlHrdPlane         plane;
  gboolean           errors;        /* ellipses or bars */
  gboolean           radius_lines;  /* 0.001 ... 1000 R_sun (theoretical plane) */
  gboolean           zams;          /* Tout et al. 1996, Z = 0.02 */
  gboolean           class_ticks;   /* spectral classes along the top */
  const char *const *highlight;     /* designations to mark and label, NULL-terminated */
  double             view[4];       /* x0, x1, y0, y1 in data units; NAN: fit the stars */
  const char        *empty_message; /* shown when no star has the plotted values; NULL: how to
                                     * derive them on the command line */
} SlHrdOptions;

void     sl_hrd_options_init (SlHrdOptions *options);

/* Draws the diagram onto FIG.  FRAME, if not NULL, receives the plot area
 * and its data ranges (for a window's mouse).  NOTES (may be NULL)
 * receives sentences for stderr: nothing to draw, density shading used,
 * errors left out above SL_HRD_MAX_ERRORS stars, stars without the plotted
 * values, highlighted stars that could not be marked.  Nothing to draw is
 * not an error: the page then carries a message. */
gboolean sl_hrd_draw (SlFigure *fig, const SlStarSet *stars, const SlHrdOptions *options,
                      SlFrame *frame, GPtrArray *notes, GError **error);

/* The 1-sigma error ellipse of a pair with standard deviations SX, SY
 * and correlation RHO: semi-major and semi-minor axes A >= B (the square
 * roots of the covariance matrix's eigenvalues) and ANGLE, the major
 * axis's direction from the +x axis towards +y (radians, in (-pi/2,
 * pi/2]), all in the data's units. */
void     sl_error_ellipse_axes (double sx, double sy, double rho, double *a, double *b, double *angle);

/* Above this many stars drawn, error ellipses and bars are left out. */
#define SL_HRD_MAX_ERRORS 20000

G_END_DECLS
