/* test-util.h: helpers the test programs share: scratch directories,
 * files from strings, and floating-point checks that print what was wanted
 * and what came out. */
#pragma once

#include <glib.h>
#include <glib/gstdio.h>
#include <math.h>

/* A fresh directory under the system's temporary directory; removed with
 * its files by sl_test_scratch_free. */
char *sl_test_scratch_new (void);
void  sl_test_scratch_free (char *dir);

/* Writes LENGTH bytes of CONTENTS (-1: a string) to DIR/NAME and returns
 * the path. */
char *sl_test_write_file (const char *dir, const char *name, const char *contents,
                          gssize length);

/* Fails with what was wanted and what came out when |GOT - WANT| exceeds
 * TOLERANCE. */
#define sl_assert_close(got, want, tolerance, what)                              \
  G_STMT_START {                                                                 \
    double sl_got_ = (got), sl_want_ = (want), sl_tol_ = (tolerance);            \
    if (!(fabs (sl_got_ - sl_want_) <= sl_tol_))                                 \
      g_error ("%s: want %.17g, got %.17g (difference %.3g, tolerance %.3g)",    \
               (what), sl_want_, sl_got_, sl_got_ - sl_want_, sl_tol_);          \
  } G_STMT_END
