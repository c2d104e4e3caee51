/* util.h: small helpers shared by the core: who and when for the audit
 * trail, locale-independent number formatting, and JSON string building.
 */
#pragma once

#include <glib.h>

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

G_END_DECLS
