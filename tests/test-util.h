/* test-util.h: helpers the test programs share: scratch directories,
 * files from strings, a scratch project as a g_test_add fixture, one-value
 * SQL queries, and floating-point checks that print what was wanted and
 * what came out. */
#pragma once

#include <glib.h>
#include <glib/gstdio.h>
#include <math.h>
#include <sqlite3.h>

#include "project.h"

/* A fresh directory under the system's temporary directory; removed with
 * its files by sl_test_scratch_free. */
char *sl_test_scratch_new (void);
void  sl_test_scratch_free (char *dir);

/* Writes LENGTH bytes of CONTENTS (-1: a string) to DIR/NAME and returns
 * the path. */
char *sl_test_write_file (const char *dir, const char *name, const char *contents,
                          gssize length);

/* A new, empty project in a scratch directory: the fixture of the tests
 * that work on one project.  Use as
 *   g_test_add (path, SlTestProject, data, sl_test_project_set_up, func,
 *               sl_test_project_tear_down);
 * DB is the project's own connection (sl_project_db), for the queries
 * below: they see what the code under test wrote through it. */
typedef struct {
  char      *dir;
  SlProject *project;
  sqlite3   *db;
} SlTestProject;

void sl_test_project_set_up    (SlTestProject *f, gconstpointer data);
void sl_test_project_tear_down (SlTestProject *f, gconstpointer data);

/* The first column of the one row SQL returns, as an integer or as a new
 * string (NULL for SQL NULL); fails if SQL does not prepare or returns no
 * row. */
gint64 sl_test_query_int  (sqlite3 *db, const char *sql);
char  *sl_test_query_text (sqlite3 *db, const char *sql);

/* Fails with what was wanted and what came out when |GOT - WANT| exceeds
 * TOLERANCE. */
#define sl_assert_close(got, want, tolerance, what)                              \
  G_STMT_START {                                                                 \
    double sl_got_ = (got), sl_want_ = (want), sl_tol_ = (tolerance);            \
    if (!(fabs (sl_got_ - sl_want_) <= sl_tol_))                                 \
      g_error ("%s: want %.17g, got %.17g (difference %.3g, tolerance %.3g)",    \
               (what), sl_want_, sl_got_, sl_got_ - sl_want_, sl_tol_);          \
  } G_STMT_END
