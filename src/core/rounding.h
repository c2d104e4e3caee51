/* rounding.h: printing a value with its uncertainty to the digits the
 * uncertainty allows.
 *
 * The Particle Data Group's rule (Review of Particle Physics,
 * "Introduction: rounding"): take the three leading digits of the
 * uncertainty; 100-354: two significant digits; 355-949: one; 950-999:
 * round up to 1000 and keep two.  The value is rounded to the same decimal
 * place.  With an asymmetric interval the smaller side decides.
 */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

typedef struct {
  char value[G_ASCII_DTOSTR_BUF_SIZE];
  char plus[G_ASCII_DTOSTR_BUF_SIZE];    /* hi - value */
  char minus[G_ASCII_DTOSTR_BUF_SIZE];   /* value - lo */
  int  decimals;                         /* digits after the point; may be negative */
} SlRounded;

/* Rounds VALUE with the 68% interval [LO, HI].  FALSE (and the value to
 * 4 significant digits in r->value) if the interval is not usable. */
gboolean sl_round_with_interval (double value, double lo, double hi, SlRounded *r);

G_END_DECLS
