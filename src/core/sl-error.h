/* sl-error.h: the error domain of the Starledger core.
 *
 * Every failure the user can act on is reported as a GError in SL_ERROR
 * with a message that names the file, line and column where one applies.
 * The command line maps them all to exit status 1.
 */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

#define SL_ERROR (sl_error_quark ())

typedef enum {
  SL_ERROR_IO,               /* a file could not be read or written */
  SL_ERROR_NOT_A_PROJECT,    /* an SQLite file of some other program, or no SQLite file */
  SL_ERROR_SCHEMA_TOO_NEW,   /* written by a newer Starledger */
  SL_ERROR_EXISTS,           /* the project file already exists */
  SL_ERROR_DATABASE,         /* SQLite reported an error */
  SL_ERROR_BUSY,             /* another process holds the project */
  SL_ERROR_BAD_INPUT,        /* the input file cannot be imported at all */
  SL_ERROR_BAD_MAPPING,      /* a --map or unit that does not fit the file */
  SL_ERROR_ALREADY_IMPORTED, /* same SHA-256 as an earlier source */
  SL_ERROR_NOTHING_ACCEPTED, /* every row of the file was rejected */
  SL_ERROR_UNKNOWN_NAME,     /* a column, list or star that does not exist */
  SL_ERROR_UNTRUSTED,        /* a project file whose schema is not the one Starledger makes */
} SlError;

GQuark sl_error_quark (void);

G_END_DECLS
