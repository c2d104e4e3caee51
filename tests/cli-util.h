/* cli-util.h: running starledger-cli from a test program: its exit status
 * and output, the demo project as README makes it, and message checks.
 * Shared by test-cli.c, test-cli-derive.c and test-cli-figure.c. */
#pragma once

#include <glib.h>
#include <stdarg.h>

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

/* The same with CHILD_SETUP run in the child before it starts (resource
 * limits, another user), the arguments as a va_list. */
void run_cli_va (CliResult *r, const char *locale, GSpawnChildSetupFunc child_setup, gpointer child_data,
                 const char *first, va_list args);

/* The path of data/demo/NAME in the source tree. */
char *demo_file (const char *name);

/* Creates PROJECT and imports the demo data into it as README and
 * build-aux/dev do; the first two imports' results go to ASTROMETRY and
 * PHOTOMETRY, the third (the second-epoch survey, by position) must
 * succeed. */
void import_demo (const char *project, const char *locale, CliResult *astrometry, CliResult *photometry);

/* g_test_init, then a clear error if meson did not say which
 * starledger-cli to run (run as a plain program, say). */
void cli_test_init (int *argc, char ***argv);

/* A scratch directory (new) with the demo project in it, imported and
 * derived; returns the project's path (free it), the directory in *DIR
 * (free it with sl_test_scratch_free). */
char *make_derived_demo_project (char **dir);

/* DESIGN.md: a user error is one line on stderr. */
void assert_one_line (const char *text);

/* Fail with the whole TEXT when it does not contain NEEDLE, contains it,
 * or does not start with PREFIX; a NULL TEXT fails the first and last. */
void assert_contains (const char *text, const char *needle);
void assert_lacks    (const char *text, const char *needle);
void assert_prefix   (const char *text, const char *prefix);

/* A user error as DESIGN.md has it: exit status 1 and one line on stderr,
 * which names NEEDLE (unless NEEDLE is NULL). */
void assert_user_error (const CliResult *r, const char *needle);

/* "starledger-cli --help" exits 0 and lists each of COMMANDS (NULL-
 * terminated); "COMMAND --help" prints its usage and exits 0; COMMAND
 * without its arguments, and with an option it does not know, exits 2
 * (a usage error). */
void assert_commands_usage (const char *const *commands);
