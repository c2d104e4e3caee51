/* sl-error.c: the SL_ERROR domain. */
#include "sl-error.h"

G_DEFINE_QUARK (starledger-error-quark, sl_error)
