/* reference-relations.h: the published Teff and BC polynomials as the
 * tests transcribe them from REFERENCES.md (Flower 1996 with the
 * coefficients of Torres 2010, Tables 1 and 2), independently of src/,
 * so a test can compute what the code should give.  Shared by
 * test-derive-methods.c and test-derive-engine.c. */
#pragma once

/* Flower (1996) log Teff(B-V), Torres (2010) Table 2 as in REFERENCES 3.2. */
static const double ref_logt[] = {
  3.979145106714099, -0.654992268598245, 1.740690042385095, -4.608815154057166,
  6.792599779944473, -5.396909891322525, 2.192970376522490, -0.359495739295671,
};

/* Flower (1996) BC_V(log Teff), Torres (2010) Table 1 as in REFERENCES 3.3. */
static const double ref_bc_cool[] = {
  -0.190537291496456e+05, 0.155144866764412e+05, -0.421278819301717e+04, 0.381476328422343e+03,
};
static const double ref_bc_middle[] = {
  -0.370510203809015e+05, 0.385672629965804e+05, -0.150651486316025e+05, 0.261724637119416e+04,
  -0.170623810323864e+03,
};
static const double ref_bc_hot[] = {
  -0.118115450538963e+06, 0.137145973583929e+06, -0.636233812100225e+05, 0.147412923562646e+05,
  -0.170587278406872e+04, 0.788731721804990e+02,
};

/* sum_i c[i] x^i, written the plain way (not Horner, as src/ does). */
static inline double
ref_poly (const double *c, int n, double x)
{
  double sum = 0.0, power = 1.0;

  for (int i = 0; i < n; i++, power *= x)
    sum += c[i] * power;
  return sum;
}
