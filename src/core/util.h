/* util.h: small helpers shared by the core: who and when for the audit
 * trail, locale-independent number formatting, and JSON string building.
 */
#pragma once

#include <glib.h>
#include <stdio.h>

G_BEGIN_DECLS

/* The person recorded in the ledger: $STARLEDGER_USER if set (scripts and
 * shared accounts), otherwise the login name. */
const char *sl_current_user (void);

/* Now as an ISO 8601 UTC timestamp with seconds, e.g. 2026-12-02T10:11:12Z. */
char *sl_now_utc (void);

/* VALUE to 15 significant digits with a '.' whatever the locale.  BUF
 * must hold G_ASCII_DTOSTR_BUF_SIZE bytes. */
const char *sl_format_double (char *buf, double value);

/* Appends VALUE to STR as a JSON string literal (quotes and escapes). */
void sl_json_append_string (GString *str, const char *value);

/* Appends a JSON number, or null for a non-finite value. */
void sl_json_append_number (GString *str, double value);

/* Output files that appear whole or not at all: sl_output_open writes to
 * a temporary file beside PATH (or to stdout for "-"), sl_output_close
 * renames it into place if OK and nothing failed, else removes it. */
FILE    *sl_output_open  (const char *path, char **temp_path, GError **error);
gboolean sl_output_close (FILE *out, const char *path, char *temp_path, gboolean ok, GError **error);

G_END_DECLS
