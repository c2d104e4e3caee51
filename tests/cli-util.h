/* cli-util.h: running starledger-cli from a test program: its exit status
 * and output, the demo project as README makes it, and message checks.
 * Shared by test-cli.c and test-cli-derive.c. */
#pragma once

#include <glib.h>

typedef struct {
  int   status;   /* the exit status; 128 if killed by a signal */
  char *out;
  char *err;
} CliResult;

void cli_result_clear (CliResult *r);

G_DEFINE_AUTO_CLEANUP_CLEAR_FUNC (CliResult, cli_result_clear)

/* Runs starledger-cli ($STARLEDGER_CLI) with the NULL-terminated
 * arguments; LOCALE, if not NULL, becomes LC_ALL. */
void run_cli_in_locale (CliResult *r, const char *locale, const char *first, ...);

#define run_cli(r, ...) run_cli_in_locale (r, NULL, __VA_ARGS__)

/* The path of data/demo/NAME in the source tree. */
char *demo_file (const char *name);

/* Creates PROJECT and imports the demo data into it as README and
 * build-aux/dev do; the two imports' results go to ASTROMETRY and
 * PHOTOMETRY. */
void import_demo (const char *project, const char *locale, CliResult *astrometry, CliResult *photometry);

/* DESIGN.md: a user error is one line on stderr. */
void assert_one_line (const char *text);
