/* figure-job.h: one figure as starledger-cli figure and the window's
 * Export Figure dialog ask for it: the kind, the page style, the kind's
 * own options, the stars named and the list.  Both load the stars, draw
 * and write through these functions, so the same request gives the same
 * bytes from either.
 */
#pragma once

#include <gio/gio.h>

#include "figure.h"
#include "hrd.h"
#include "parallax-path.h"
#include "sky.h"
#include "starset.h"

G_BEGIN_DECLS

typedef enum {
  SL_FIGURE_KIND_HR,
  SL_FIGURE_KIND_SKY,
  SL_FIGURE_KIND_PARALLAX,
} SlFigureKind;

#define SL_FIGURE_N_KINDS 3

/* The kind's name on the command line ("hr", "sky", "parallax") and back. */
const char *sl_figure_kind_name (SlFigureKind kind);
gboolean    sl_figure_kind_from_name (const char *name, SlFigureKind *kind);
/* Its title (translated), the figure's metadata title. */
const char *sl_figure_kind_title (SlFigureKind kind);

typedef struct {
  SlFigureKind       kind;
  SlFigureStyle      style;
  SlHrdOptions       hrd;        /* for SL_FIGURE_KIND_HR; highlight is set from STARS */
  SlSkyOptions       sky;        /* for SL_FIGURE_KIND_SKY; highlight is set from STARS */
  SlParallaxOptions  parallax;   /* for SL_FIGURE_KIND_PARALLAX */
  char             **stars;      /* owned, NULL-terminated; NULL: none.  hr, sky: the stars
                                  * highlighted; parallax: the stars whose paths are drawn */
  char              *list;       /* owned; only the stars of this target list; NULL: every star */
} SlFigureJob;

/* A job of KIND with the defaults of starledger-cli figure: a single
 * column, every star, nothing highlighted. */
void sl_figure_job_init (SlFigureJob *job, SlFigureKind kind);
void sl_figure_job_clear (SlFigureJob *job);
G_DEFINE_AUTO_CLEANUP_CLEAR_FUNC (SlFigureJob, sl_figure_job_clear)
/* Replaces the stars named (copied; NULL or empty: none) or the list. */
void sl_figure_job_set_stars (SlFigureJob *job, const char *const *stars);
void sl_figure_job_set_list (SlFigureJob *job, const char *list);

/* The stars the figure draws, from PROJECT: every star, or the list's, for
 * hr and sky (the stars named must be among them); for parallax only the
 * stars named (which must be in the list, if one is given), none if none
 * is.  Cancelled: G_IO_ERROR_CANCELLED. */
/* The same stars from a set already loaded by sl_star_set_load_full (every
 * star, LOADED_LIST NULL) or sl_star_set_load_list_full (LOADED_LIST): a
 * new reference to LOADED when it is what sl_figure_job_load would load
 * (hr and sky, the same list, the stars named among them); NULL otherwise,
 * with ERROR set only when a star named is not there. */
SlStarSet *sl_figure_job_reuse (const SlFigureJob *job, SlStarSet *loaded, const char *loaded_list,
                                const char *project_path, GError **error);
SlStarSet *sl_figure_job_load (const SlFigureJob *job, SlProject *project, GCancellable *cancellable,
                               GError **error);

/* Draws the page onto CR, which is in points with the page's top left at
 * the origin (the page is job->style's width x height mm): a white page,
 * then the figure.  For a preview, scale CR first.  NOTES (may be NULL)
 * receives what the figure leaves out, as in sl_hrd_draw. */
gboolean sl_figure_job_draw (const SlFigureJob *job, const SlStarSet *stars, cairo_t *cr, GPtrArray *notes,
                             GError **error);

/* The metadata subject: the project (as PROJECT_PATH gives it), the list
 * and the derivation run of STARS. */
char *sl_figure_job_subject (const SlFigureJob *job, const SlStarSet *stars, const char *project_path);

/* Writes the figure of STARS into PATH in FORMAT (sl_figure_write: whole
 * or not at all). */
gboolean sl_figure_job_write (const SlFigureJob *job, const SlStarSet *stars, const char *project_path,
                              const char *path, SlFigureFormat format, GPtrArray *notes, GError **error);

/* Loads and writes: what starledger-cli figure and the window's export do. */
gboolean sl_figure_job_run (const SlFigureJob *job, SlProject *project, const char *path,
                            SlFigureFormat format, GCancellable *cancellable, GPtrArray *notes,
                            GError **error);

/* The command line that writes the same figure: "starledger-cli figure
 * PROJECT KIND -o OUTPUT" and the options that differ from the defaults,
 * each argument quoted for a POSIX shell where it needs it.  A
 * PROJECT_PATH that begins with "~/" is written for the shell to expand
 * (~/'My Stars/p.starledger'). */
char *sl_figure_job_command_line (const SlFigureJob *job, const char *project_path, const char *output);

G_END_DECLS
