/* sl-application.h: the Starledger application: one window per project,
 * app-wide actions (about, quit), opening files given on the command line. */
#pragma once

#include <adwaita.h>

G_BEGIN_DECLS

#define SL_APPLICATION_ID "org.starledger.Starledger"

#define SL_TYPE_APPLICATION (sl_application_get_type ())
G_DECLARE_FINAL_TYPE (SlApplication, sl_application, SL, APPLICATION, AdwApplication)

SlApplication *sl_application_new (void);

/* Where the demo data lives: the source tree when run from the build
 * directory ($STARLEDGER_DEMO_DIR), else the installed copy. */
const char *sl_application_demo_dir (void);

G_END_DECLS
