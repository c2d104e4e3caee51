/* cli.h: what the commands of starledger-cli share.
 *
 * Exit status (DESIGN.md): 0 on success, 1 on a user error with a one-line
 * message on stderr, 2 on bad usage.
 */
#pragma once

#include <glib.h>

#include "project.h"

G_BEGIN_DECLS

enum {
  SL_EXIT_OK = 0,
  SL_EXIT_FAILURE = 1,
  SL_EXIT_USAGE = 2,
};

typedef int (*SlCliCommandFunc) (int argc, char **argv);

typedef struct {
  const char       *name;
  SlCliCommandFunc  run;
  const char       *summary;  /* one line for the command list, marked N_() */
} SlCliCommand;

/* A command's option parser: "starledger-cli NAME PARAMETERS". */
GOptionContext *sl_cli_context_new (const char *command, const char *parameters,
                                    const char *summary, const char *description,
                                    const GOptionEntry *entries);

/* Parses ARGV with CONTEXT and checks that it leaves N_ARGS positional
 * arguments (N_ARGS < 0: at least -N_ARGS).  On failure prints a usage
 * message and returns FALSE: exit with SL_EXIT_USAGE. */
gboolean sl_cli_parse (GOptionContext *context, const char *command,
                       int *argc, char ***argv, int n_args);

/* Reads TEXT, an option's number, into *VALUE (as sl_parse_number does:
 * never by the locale) and checks MIN <= *VALUE <= MAX.  A NULL TEXT (the
 * option not given) passes and leaves *VALUE as it was, so a default set
 * beforehand stands.  FALSE: the caller reports a usage error.  MIN
 * DBL_TRUE_MIN asks for a number above 0. */
gboolean sl_cli_parse_number_option (const char *text, double *value, double min, double max);

/* Prints a usage error for COMMAND and returns SL_EXIT_USAGE. */
int sl_cli_usage_error (const char *command, const char *format, ...) G_GNUC_PRINTF (2, 3);

/* Prints ERROR's message and returns SL_EXIT_FAILURE. */
int sl_cli_fail (GError *error);

/* Opens the project or prints why not (NULL: exit with SL_EXIT_FAILURE). */
SlProject *sl_cli_open_project (const char *path);

int sl_cli_new     (int argc, char **argv);
int sl_cli_import  (int argc, char **argv);
int sl_cli_export  (int argc, char **argv);
int sl_cli_ledger  (int argc, char **argv);
int sl_cli_summary (int argc, char **argv);
int sl_cli_derive  (int argc, char **argv);
int sl_cli_override (int argc, char **argv);
int sl_cli_verify  (int argc, char **argv);
int sl_cli_explain (int argc, char **argv);
int sl_cli_figure  (int argc, char **argv);
int sl_cli_select  (int argc, char **argv);
int sl_cli_lists   (int argc, char **argv);
int sl_cli_methods (int argc, char **argv);
int sl_cli_split   (int argc, char **argv);
int sl_cli_combine (int argc, char **argv);

G_END_DECLS
