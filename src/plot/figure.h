/* figure.h: what every Starledger figure shares: a page measured in
 * millimetres and drawn in points on any cairo surface (a widget, PDF, SVG
 * or PNG), text through pango, axes with ticks, the temperature colour
 * scale, and scatter drawing that stays fast at a million stars.
 *
 * Coordinates: points (1/72 inch), origin at the top left, y down.
 */
#pragma once

#include <cairo.h>
#include <glib.h>
#include <pango/pangocairo.h>

G_BEGIN_DECLS

typedef enum {
  SL_FIGURE_FORMAT_PDF,
  SL_FIGURE_FORMAT_SVG,
  SL_FIGURE_FORMAT_PNG,
} SlFigureFormat;

/* From a file name's extension (.pdf, .svg, .png). */
gboolean sl_figure_format_from_path (const char *path, SlFigureFormat *format);

typedef struct {
  double   width_mm, height_mm;  /* the page */
  double   dpi;                  /* PNG resolution */
  double   font_pt;              /* body text; labels scale from it */
  double   line_pt;              /* axis line width */
  gboolean grayscale;            /* for print in black and white */
} SlFigureStyle;

/* A journal's single column: 88 mm wide (A&A, MNRAS and AAS columns are
 * 84-89 mm; common practice), 7 pt type, 0.5 pt lines, 300 dpi. */
void sl_figure_style_init (SlFigureStyle *style);
/* Presets by name: "single" (88 x 70 mm) or "double" (180 x 110 mm). */
gboolean sl_figure_style_preset (SlFigureStyle *style, const char *name);

typedef struct {
  const char *title;     /* e.g. "HR diagram" */
  const char *subject;   /* the project and run, so a figure found on a disk can be traced */
  const char *keywords;
  const char *date;      /* ISO 8601, the PDF's creation date; NULL: now.  The
                          * derivation run's time makes the PDF reproducible */
} SlFigureMetadata;

typedef struct {
  cairo_t      *cr;
  double        width, height;   /* pt */
  SlFigureStyle style;
  PangoLayout  *layout;
  GArray       *positions;       /* SlPlotPosition: where each star was drawn, for a
                                  * window's mouse; NULL (the default): not recorded */
} SlFigure;

/* A star of the drawn set (its index in the SlStarSet) and where it went. */
typedef struct {
  guint  index;
  double x, y;   /* pt, page coordinates */
} SlPlotPosition;

static inline void
sl_figure_record_position (SlFigure *fig, guint index, double x, double y)
{
  if (fig->positions != NULL)
    {
      SlPlotPosition p = { index, x, y };

      g_array_append_val (fig->positions, p);
    }
}

/* Sets up drawing onto CR, an area WIDTH x HEIGHT points. */
void sl_figure_init (SlFigure *fig, cairo_t *cr, double width, double height, const SlFigureStyle *style);
void sl_figure_clear (SlFigure *fig);

typedef gboolean (*SlFigureDrawFunc) (SlFigure *fig, gpointer data, GError **error);

/* Draws a figure into PATH ("-" for standard output) in FORMAT; the file
 * appears whole or not at all. */
gboolean sl_figure_write (const char *path, SlFigureFormat format, const SlFigureStyle *style,
                          const SlFigureMetadata *meta, SlFigureDrawFunc draw, gpointer data,
                          GError **error);

/* Text: MARKUP (pango markup) at (X, Y) with the anchor at fractions
 * AX, AY of its extent (0, 0: top left; 0.5, 0.5: centre), turned by
 * ANGLE (radians, counter-clockwise).  SCALE multiplies the body size. */
void sl_figure_text (SlFigure *fig, double x, double y, double ax, double ay, double scale,
                     double angle, const char *markup);
void sl_figure_text_size (SlFigure *fig, double scale, const char *markup, double *w, double *h);

/* As sl_figure_text, in grey level GREY (0 black, 1 white), over a white
 * halo of opacity HALO_ALPHA that keeps it legible across lines and
 * markers.  The glyphs stay text (searchable in a PDF); only the halo is
 * a path. */
void sl_figure_halo_text (SlFigure *fig, double x, double y, double ax, double ay, double scale,
                          double angle, const char *markup, double grey, double halo_alpha);

/* A message in the middle of the page, for "nothing to draw". */
void sl_figure_message (SlFigure *fig, const char *message);

/* Adds NOTE (taken) to NOTES, the drawing functions' list of what the
 * figure leaves out or changes; a caller that wants no notes passes NULL
 * and the note is freed. */
void sl_figure_add_note (GPtrArray *notes, char *note);

/* Numbers as journals set them: TEXT with a minus sign (U+2212) for a
 * leading hyphen; VALUE with DECIMALS decimals that way, and never "-0"
 * for a value that rounds to zero. */
char *sl_figure_with_minus (const char *text);
char *sl_figure_format_fixed (double value, int decimals);

/* A plot area and the data values at its edges (x1 < x0 reverses an
 * axis, as the HR diagram's temperature axis is). */
typedef struct {
  double x, y, w, h;          /* pt */
  double x0, x1;              /* data at the left and right edges */
  double y0, y1;              /* data at the bottom and top edges */
} SlFrame;

static inline double sl_frame_px (const SlFrame *f, double x) { return f->x + (x - f->x0) / (f->x1 - f->x0) * f->w; }
static inline double sl_frame_py (const SlFrame *f, double y) { return f->y + f->h - (y - f->y0) / (f->y1 - f->y0) * f->h; }

/* Places a frame in the page, leaving room for tick labels and axis
 * titles (and a band on top if TOP_AXIS). */
void sl_figure_place_frame (SlFigure *fig, SlFrame *frame, gboolean top_axis);

/* Draws the frame's box, ticks, tick labels and axis titles. */
void sl_figure_axes (SlFigure *fig, const SlFrame *frame, const char *x_title, const char *y_title);

/* A round step of about RANGE / TARGET (1, 2 or 5 times a power of ten). */
double sl_nice_step (double range, int target);

/* The number of decimals a tick label needs at STEP. */
int sl_figure_step_decimals (double step);

/* One tick at data value V, drawn inward TICK long on both sides of the
 * frame (the x axis: bottom and top; the y axis: left and right), with
 * LABEL at SCALE outside the bottom or left edge, GAP away.  The ticks
 * are added to the current path for the caller to stroke. */
void sl_figure_tick (SlFigure *fig, const SlFrame *frame, gboolean x_axis, double v, double tick,
                     double gap, double scale, const char *label);

/* The temperature colour scale: hot stars dark blue, cool stars light
 * orange, along a path in CIELAB of steadily rising lightness through no
 * red-green contrast (so readable with the common colour-vision
 * deficiencies and in grey).  T in K; RGB out in [0, 1]. */
void sl_temperature_colour (double teff, gboolean grayscale, double rgb[3]);

/* Scatter: N markers of radius R_PT at (PX, PY) in page points, each of
 * colour RGB[3 i .. 3 i + 2].  Beyond DENSITY_THRESHOLD markers the area
 * is drawn as a density image (one cell per device pixel for PNG, 0.5 pt
 * otherwise): returns TRUE when it did. */
#define SL_DENSITY_THRESHOLD 50000
gboolean sl_figure_scatter (SlFigure *fig, const SlFrame *clip, const double *px, const double *py,
                            const float *rgb, guint n, double r_pt);

/* The same with a radius per marker, R_PT[i] (pt).  Markers are drawn in
 * the order given: pass the largest first so small ones stay visible. */
gboolean sl_figure_scatter_sized (SlFigure *fig, const SlFrame *clip, const double *px, const double *py,
                                  const float *rgb, const double *r_pt, guint n);

G_END_DECLS
