/* dual.h: first-order uncertainty propagation by forward differentiation.
 *
 * An SlDual is a value with its partial derivatives with respect to the
 * star's independent inputs (parallax, V, B-V, ...).  Every derivation
 * module computes with SlDual, so the linear propagation of errors carries
 * the full Jacobian down the chain, and with it the covariance of any two
 * results: cov(a, b) = sum_k a.d[k] b.d[k] sigma_k^2.  That is what makes
 * Teff, BC, L and R (all from one colour) correlated as they should be.
 *
 * In a Monte Carlo draw the inputs carry no partials (n = 0), and every
 * operation costs what the plain double operation costs.
 */
#pragma once

#include <glib.h>
#include <math.h>

G_BEGIN_DECLS

/* The independent inputs a partial derivative can be taken against. */
typedef enum {
  SL_PARTIAL_PARALLAX,
  SL_PARTIAL_VMAG,
  SL_PARTIAL_BMAG,
  SL_PARTIAL_BV,
  SL_PARTIAL_EBV,
  SL_PARTIAL_RV,       /* the extinction ratio, when given an uncertainty */
  SL_PARTIAL_PMRA,
  SL_PARTIAL_PMDEC,
  SL_PARTIAL_RA,
  SL_PARTIAL_DEC,
  SL_PARTIAL_VRAD,
  SL_PARTIAL_OVERRIDE, /* a value set by hand with an interval */
  SL_N_PARTIALS
} SlPartial;

typedef struct {
  double v;                  /* the value */
  double d[SL_N_PARTIALS];   /* d value / d input; only the first n are meaningful */
  guint8 n;                  /* 0 in Monte Carlo draws and for constants */
} SlDual;

static inline SlDual
sl_dual_const (double v)
{
  SlDual r;

  r.v = v;
  r.n = 0;
  return r;
}

/* An independent input: derivative 1 against itself (if TRACK). */
static inline SlDual
sl_dual_input (double v, SlPartial which, gboolean track)
{
  SlDual r = sl_dual_const (v);

  if (track)
    {
      r.n = SL_N_PARTIALS;
      for (int k = 0; k < SL_N_PARTIALS; k++)
        r.d[k] = 0.0;
      r.d[which] = 1.0;
    }
  return r;
}

/* The result of f(a) with f'(a) = DF. */
static inline SlDual
sl_dual_chain1 (double value, double df, SlDual a)
{
  SlDual r;

  r.v = value;
  r.n = a.n;
  for (int k = 0; k < a.n; k++)
    r.d[k] = df * a.d[k];
  return r;
}

/* The result of f(a, b) with partials DFA and DFB. */
static inline SlDual
sl_dual_chain2 (double value, double dfa, SlDual a, double dfb, SlDual b)
{
  SlDual r;
  int n = MAX (a.n, b.n);

  r.v = value;
  r.n = (guint8) n;
  for (int k = 0; k < n; k++)
    r.d[k] = (k < a.n ? dfa * a.d[k] : 0.0) + (k < b.n ? dfb * b.d[k] : 0.0);
  return r;
}

static inline SlDual sl_dual_add (SlDual a, SlDual b) { return sl_dual_chain2 (a.v + b.v, 1.0, a, 1.0, b); }
static inline SlDual sl_dual_sub (SlDual a, SlDual b) { return sl_dual_chain2 (a.v - b.v, 1.0, a, -1.0, b); }
static inline SlDual sl_dual_mul (SlDual a, SlDual b) { return sl_dual_chain2 (a.v * b.v, b.v, a, a.v, b); }

static inline SlDual
sl_dual_div (SlDual a, SlDual b)
{
  return sl_dual_chain2 (a.v / b.v, 1.0 / b.v, a, -a.v / (b.v * b.v), b);
}

static inline SlDual sl_dual_scale (SlDual a, double c)   { return sl_dual_chain1 (c * a.v, c, a); }
static inline SlDual sl_dual_offset (SlDual a, double c)  { return sl_dual_chain1 (a.v + c, 1.0, a); }
static inline SlDual sl_dual_log10 (SlDual a)  { return sl_dual_chain1 (log10 (a.v), 1.0 / (a.v * G_LN10), a); }

/* 10^a */
static inline SlDual
sl_dual_exp10 (SlDual a)
{
  double v = pow (10.0, a.v);

  return sl_dual_chain1 (v, v * G_LN10, a);
}

static inline SlDual sl_dual_sqrt (SlDual a)   { double v = sqrt (a.v); return sl_dual_chain1 (v, 0.5 / v, a); }
static inline SlDual sl_dual_pow (SlDual a, double p) { return sl_dual_chain1 (pow (a.v, p), p * pow (a.v, p - 1.0), a); }
static inline SlDual sl_dual_sin (SlDual a)    { return sl_dual_chain1 (sin (a.v), cos (a.v), a); }
static inline SlDual sl_dual_cos (SlDual a)    { return sl_dual_chain1 (cos (a.v), -sin (a.v), a); }
static inline SlDual sl_dual_fabs (SlDual a)   { return sl_dual_chain1 (fabs (a.v), a.v < 0 ? -1.0 : 1.0, a); }

static inline SlDual
sl_dual_hypot (SlDual a, SlDual b)
{
  double h = hypot (a.v, b.v);

  return sl_dual_chain2 (h, h > 0 ? a.v / h : 0.0, a, h > 0 ? b.v / h : 0.0, b);
}

/* atan2 (y, x) */
static inline SlDual
sl_dual_atan2 (SlDual y, SlDual x)
{
  double r2 = x.v * x.v + y.v * y.v;

  return sl_dual_chain2 (atan2 (y.v, x.v), x.v / r2, y, -y.v / r2, x);
}

/* sum_i c[i] x^i by Horner's rule. */
static inline SlDual
sl_dual_poly (const double *c, int n_coeffs, SlDual x)
{
  double v = 0.0, dv = 0.0;

  for (int i = n_coeffs - 1; i >= 0; i--)
    {
      dv = dv * x.v + v;
      v = v * x.v + c[i];
    }
  return sl_dual_chain1 (v, dv, x);
}

/* The 1-sigma error of A given the inputs' sigmas (NAN if a partial that
 * matters has no sigma). */
static inline double
sl_dual_sigma (SlDual a, const double *sigma)
{
  double var = 0.0;

  for (int k = 0; k < a.n; k++)
    if (a.d[k] != 0.0)
      var += a.d[k] * a.d[k] * sigma[k] * sigma[k];
  return sqrt (var);
}

static inline double
sl_dual_covariance (SlDual a, SlDual b, const double *sigma)
{
  double cov = 0.0;
  int n = MIN (a.n, b.n);

  for (int k = 0; k < n; k++)
    if (a.d[k] != 0.0 && b.d[k] != 0.0)
      cov += a.d[k] * b.d[k] * sigma[k] * sigma[k];
  return cov;
}

G_END_DECLS
