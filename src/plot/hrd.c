/* hrd.c: the Hertzsprung-Russell diagram (hrd.h).
 *
 * Contents:
 *   error ellipses ......... sl_error_ellipse_axes
 *   the stars' points ...... star_xy, fit_axis, choose_view
 *   occupancy .............. where markers lie, so labels can avoid them
 *   labels ................. rotated boxes (the text on a halo: sl_figure_halo_text)
 *   reference lines ........ constant radius, the ZAMS of Tout et al. (1996)
 *   errors ................. 1-sigma ellipses or bars
 *   highlights ............. rings, labels placed without overlaps
 *   spectral classes ....... letters along the top axis
 *   drawing ................ sl_hrd_options_init, sl_hrd_draw
 *
 * Everything is drawn in page points through the frame's linear mapping,
 * so a reversed axis (hot stars on the left) needs no special case.
 */
#include "hrd.h"

#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "constants.h"
#include "derive/methods.h"

/* A subscript in pango markup.  Spelled out because pango 1.50's <sub>
 * scales by font_scale, which comes out several times too big with the
 * figures' absolute font sizes. */
#define SUB(text) "<span size=\"70%\" baseline_shift=\"subscript\">" text "</span>"

/* The opacity of the labels' white halo: most of what lies under a label
 * is hidden, a trace of it still shows. */
#define LABEL_HALO_ALPHA 0.85

/* ------------------------------------------------------------------ */
/* Error ellipses                                                     */

void
sl_error_ellipse_axes (double sx, double sy, double rho, double *a, double *b, double *angle)
{
  /* Eigen decomposition of [[sx^2, c], [c, sy^2]], c = rho sx sy. */
  double c = rho * sx * sy, mean = 0.5 * (sx * sx + sy * sy), half = 0.5 * (sx * sx - sy * sy);
  double root = hypot (half, c);

  *a = sqrt (mean + root);
  *b = sqrt (MAX (0.0, mean - root));
  *angle = 0.5 * atan2 (2.0 * c, sx * sx - sy * sy);
}

/* ------------------------------------------------------------------ */
/* The stars' points                                                  */

/* A star's place in PLANE, in data units; FALSE if a value is missing. */
static gboolean
star_xy (const SlPlotStar *s, SlHrdPlane plane, double *x, double *y)
{
  if (plane == SL_HRD_THEORETICAL)
    {
      if (!(s->teff > 0.0 && s->lum > 0.0 && isfinite (s->teff) && isfinite (s->lum)))
        return FALSE;
      *x = log10 (s->teff);
      *y = log10 (s->lum);
      return TRUE;
    }
  if (!isfinite (s->bv0) || !isfinite (s->absmag))
    return FALSE;
  *x = s->bv0;
  *y = s->absmag;
  return TRUE;
}

/* The data range of one axis: the stars' extent padded by 8 % on each
 * side; the default range (widened to take the stars in) when there are
 * none or they span less than MIN_SPAN. */
static void
fit_axis (double lo, double hi, guint n, double default_lo, double default_hi, double min_span,
          double *out_lo, double *out_hi)
{
  double pad;

  if (n == 0 || !(hi - lo >= min_span))
    {
      *out_lo = default_lo;
      *out_hi = default_hi;
      if (n > 0)
        {
          pad = 0.1 * min_span;
          *out_lo = MIN (*out_lo, lo - pad);
          *out_hi = MAX (*out_hi, hi + pad);
        }
      return;
    }
  pad = 0.08 * (hi - lo);
  *out_lo = lo - pad;
  *out_hi = hi + pad;
}

/* Sets the frame's data ranges: the option's view where given (each of
 * its four numbers may be NAN), else fitted to the stars.  Hot stars and
 * bright stars go left and up. */
static void
choose_view (SlFrame *f, const SlHrdOptions *o, const double *xs, const double *ys, guint n)
{
  gboolean theoretical = o->plane == SL_HRD_THEORETICAL;
  double xlo = INFINITY, xhi = -INFINITY, ylo = INFINITY, yhi = -INFINITY;
  double x_lo, x_hi, y_lo, y_hi;

  for (guint i = 0; i < n; i++)
    {
      xlo = MIN (xlo, xs[i]), xhi = MAX (xhi, xs[i]);
      ylo = MIN (ylo, ys[i]), yhi = MAX (yhi, ys[i]);
    }
  if (theoretical)
    {
      fit_axis (xlo, xhi, n, 3.4, 4.7, 0.05, &x_lo, &x_hi);
      fit_axis (ylo, yhi, n, -4.0, 6.0, 0.5, &y_lo, &y_hi);
      f->x0 = x_hi, f->x1 = x_lo;   /* log Teff falls to the right */
      f->y0 = y_lo, f->y1 = y_hi;
    }
  else
    {
      fit_axis (xlo, xhi, n, -0.4, 2.0, 0.1, &x_lo, &x_hi);
      fit_axis (ylo, yhi, n, -6.0, 16.0, 1.0, &y_lo, &y_hi);
      f->x0 = x_lo, f->x1 = x_hi;
      f->y0 = y_hi, f->y1 = y_lo;   /* magnitudes: bright up */
    }
  if (isfinite (o->view[0]))
    f->x0 = o->view[0];
  if (isfinite (o->view[1]))
    f->x1 = o->view[1];
  if (isfinite (o->view[2]))
    f->y0 = o->view[2];
  if (isfinite (o->view[3]))
    f->y1 = o->view[3];
  /* A view of no width would divide by zero in sl_frame_px. */
  if (f->x0 == f->x1)
    f->x1 = f->x0 + (theoretical ? -0.1 : 0.1);
  if (f->y0 == f->y1)
    f->y1 = f->y0 + (theoretical ? 1.0 : -1.0);
}

static gboolean
in_frame (const SlFrame *f, double px, double py)
{
  return px >= f->x && px <= f->x + f->w && py >= f->y && py <= f->y + f->h;
}

/* ------------------------------------------------------------------ */
/* Occupancy                                                          */

/* Marker counts per 1 pt cell of the frame as a summed-area table, so
 * the markers under any rectangle are counted in constant time. */
typedef struct {
  double  x, y;        /* the frame's top left, pt */
  int     cols, rows;
  guint32 *sum;        /* (cols + 1) x (rows + 1) */
} Occupancy;

typedef struct {
  double x0, y0, x1, y1;   /* pt */
} Rect;

static void
occupancy_init (Occupancy *occ, const SlFrame *f, const double *px, const double *py, guint n, double r)
{
  int stride;

  occ->x = f->x, occ->y = f->y;
  occ->cols = MAX (1, (int) ceil (f->w));
  occ->rows = MAX (1, (int) ceil (f->h));
  stride = occ->cols + 1;
  occ->sum = g_new0 (guint32, (gsize) stride * (occ->rows + 1));
  for (guint i = 0; i < n; i++)
    {
      int c0 = (int) floor (px[i] - r - f->x), c1 = (int) floor (px[i] + r - f->x);
      int r0 = (int) floor (py[i] - r - f->y), r1 = (int) floor (py[i] + r - f->y);

      if (!isfinite (px[i]) || !isfinite (py[i]) || c1 < 0 || r1 < 0 || c0 >= occ->cols || r0 >= occ->rows)
        continue;
      c0 = MAX (c0, 0), r0 = MAX (r0, 0);
      c1 = MIN (c1, occ->cols - 1), r1 = MIN (r1, occ->rows - 1);
      for (int rr = r0; rr <= r1; rr++)
        for (int cc = c0; cc <= c1; cc++)
          occ->sum[(gsize) (rr + 1) * stride + cc + 1]++;
    }
  for (int rr = 1; rr <= occ->rows; rr++)
    for (int cc = 1; cc <= occ->cols; cc++)
      occ->sum[(gsize) rr * stride + cc] += occ->sum[(gsize) (rr - 1) * stride + cc]
                                            + occ->sum[(gsize) rr * stride + cc - 1]
                                            - occ->sum[(gsize) (rr - 1) * stride + cc - 1];
}

/* Marker cells under R. */
static guint32
occupancy_count (const Occupancy *occ, const Rect *r)
{
  int stride = occ->cols + 1;
  int c0 = CLAMP ((int) floor (r->x0 - occ->x), 0, occ->cols), c1 = CLAMP ((int) ceil (r->x1 - occ->x), 0, occ->cols);
  int r0 = CLAMP ((int) floor (r->y0 - occ->y), 0, occ->rows), r1 = CLAMP ((int) ceil (r->y1 - occ->y), 0, occ->rows);

  return occ->sum[(gsize) r1 * stride + c1] - occ->sum[(gsize) r0 * stride + c1]
         - occ->sum[(gsize) r1 * stride + c0] + occ->sum[(gsize) r0 * stride + c0];
}

/* ------------------------------------------------------------------ */
/* Labels                                                             */

static gboolean
rects_overlap (const Rect *a, const Rect *b)
{
  return a->x0 < b->x1 && b->x0 < a->x1 && a->y0 < b->y1 && b->y0 < a->y1;
}

/* Labels keep clear of the frame's ticks (0.35 em long, figure.c). */
#define LABEL_MARGIN(fig) (0.45 * (fig)->style.font_pt)

static gboolean
rect_inside (const Rect *r, const SlFrame *f, double margin)
{
  return r->x0 >= f->x + margin && r->x1 <= f->x + f->w - margin && r->y0 >= f->y + margin
         && r->y1 <= f->y + f->h - margin;
}

static guint
overlaps_any (const Rect *r, const GArray *rects)
{
  guint count = 0;

  for (guint i = 0; i < rects->len; i++)
    count += rects_overlap (r, &g_array_index (rects, Rect, i));
  return count;
}

/* The bounding box of a W x H text anchored at (X, Y) at fractions AX, AY
 * and turned by ANGLE (as sl_figure_text draws it). */
static Rect
text_box (double x, double y, double ax, double ay, double w, double h, double angle)
{
  double ux = cos (angle), uy = -sin (angle);   /* along the text, page coordinates */
  double dx = -uy, dy = ux;                      /* down the text */
  Rect r = { INFINITY, INFINITY, -INFINITY, -INFINITY };

  for (int k = 0; k < 4; k++)
    {
      double tx = (k & 1 ? 1.0 - ax : -ax) * w, ty = (k & 2 ? 1.0 - ay : -ay) * h;
      double px = x + tx * ux + ty * dx, py = y + tx * uy + ty * dy;

      r.x0 = MIN (r.x0, px), r.x1 = MAX (r.x1, px);
      r.y0 = MIN (r.y0, py), r.y1 = MAX (r.y1, py);
    }
  return r;
}

/* ------------------------------------------------------------------ */
/* Reference lines                                                    */

/* What the drawing steps share. */
typedef struct {
  SlFigure           *fig;
  const SlHrdOptions *options;
  SlFrame             f;
  Occupancy           occ;
  GArray             *labels;   /* Rect: every label placed so far */
  double              r;        /* marker radius, pt */
} Hrd;

/* The page length of a segment. */
static double
page_length (double ax, double ay, double bx, double by)
{
  return hypot (bx - ax, by - ay);
}

/* Labels the segment from (AX, AY) to (BX, BY) (page points, the part of
 * a line inside the frame) along its direction, just above it, near
 * whichever end has fewer markers and labels about it: as close to the
 * edge as the turned text fits inside the frame. */
static void
label_segment (Hrd *h, double ax, double ay, double bx, double by, const char *markup)
{
  SlFigure *fig = h->fig;
  double scale = 0.85, em = fig->style.font_pt, w, th, ux, uy, len, angle;
  double gap = 0.15 * em;
  double best_score = INFINITY, best_x = 0, best_y = 0, best_ax = 0;
  Rect best_rect = { 0 };

  if (bx < ax)
    {
      double t;

      t = ax, ax = bx, bx = t;
      t = ay, ay = by, by = t;
    }
  len = page_length (ax, ay, bx, by);
  sl_figure_text_size (fig, scale, markup, &w, &th);
  ux = (bx - ax) / len, uy = (by - ay) / len;
  angle = atan2 (-uy, ux);

  /* The right (cool, faint) end first: it wins ties. */
  for (int end = 0; end < 2; end++)
    for (double inset = 0.4 * em; inset + w <= len - 0.4 * em; inset += 0.2 * em)
      {
        double text_ax = end == 0 ? 1.0 : 0.0;
        double x = end == 0 ? bx - ux * inset : ax + ux * inset;
        double y = end == 0 ? by - uy * inset : ay + uy * inset;
        Rect r;
        double score;

        /* Up the text is (uy, -ux). */
        x += uy * gap, y -= ux * gap;
        r = text_box (x, y, text_ax, 1.0, w, th, angle);
        if (!rect_inside (&r, &h->f, LABEL_MARGIN (h->fig)))
          continue;
        score = occupancy_count (&h->occ, &r) + 1e6 * overlaps_any (&r, h->labels);
        if (score < best_score)
          best_score = score, best_x = x, best_y = y, best_ax = text_ax, best_rect = r;
        break;   /* the first inset that fits */
      }
  if (!isfinite (best_score))
    return;
  g_array_append_val (h->labels, best_rect);
  sl_figure_halo_text (fig, best_x, best_y, best_ax, 1.0, scale, angle, markup, 0.35,
                       LABEL_HALO_ALPHA);
}

/* log L = 2 log R + 4 log (Teff / 5772 K): the Stefan-Boltzmann law in
 * the nominal solar units of IAU 2015 B3, a straight line of slope 4. */
static void
draw_radius_lines (Hrd *h)
{
  static const struct {
    double      radius;   /* R_sun */
    const char *text;
  } lines[] = {
    { 0.001, "0.001" }, { 0.01, "0.01" }, { 0.1, "0.1" }, { 1, "1" },
    { 10, "10" }, { 100, "100" }, { 1000, "1000" },
  };
  const SlFrame *f = &h->f;
  cairo_t *cr = h->fig->cr;
  double xmin = MIN (f->x0, f->x1), xmax = MAX (f->x0, f->x1);
  double ymin = MIN (f->y0, f->y1), ymax = MAX (f->y0, f->y1);
  double log_tsun = log10 (SL_NOMINAL_SUN_TEFF_K);
  double dash[] = { 4.0 * h->fig->style.line_pt, 3.0 * h->fig->style.line_pt };   /* 2 pt on, 1.5 off */

  for (gsize i = 0; i < G_N_ELEMENTS (lines); i++)
    {
      double offset = 2.0 * log10 (lines[i].radius) - 4.0 * log_tsun;
      /* log Teff where the line meets the bottom and top edges. */
      double xa = MAX (xmin, (ymin - offset) / 4.0), xb = MIN (xmax, (ymax - offset) / 4.0);
      double pax, pay, pbx, pby;
      g_autofree char *markup = NULL;

      if (!(xa < xb))
        continue;
      pax = sl_frame_px (f, xa), pay = sl_frame_py (f, offset + 4.0 * xa);
      pbx = sl_frame_px (f, xb), pby = sl_frame_py (f, offset + 4.0 * xb);
      cairo_save (cr);
      cairo_set_source_rgb (cr, 0.55, 0.55, 0.55);
      cairo_set_line_width (cr, 0.6 * h->fig->style.line_pt);
      cairo_set_dash (cr, dash, 2, 0);
      cairo_move_to (cr, pax, pay);
      cairo_line_to (cr, pbx, pby);
      cairo_stroke (cr);
      cairo_restore (cr);
      markup = g_strconcat (lines[i].text, " <i>R</i>" SUB ("⊙"), NULL);
      label_segment (h, pax, pay, pbx, pby, markup);
    }
}

/* The (B-V)0 that Flower's relation (as the derivation uses it) turns
 * into LOG_T, by bisection: the polynomial falls monotonically over its
 * range, -0.343 to 1.805 (52 200 to 2900 K). */
static gboolean
flower_colour_for (double log_t, double *bv)
{
  double lo = -0.343, hi = 1.805;

  if (log_t > sl_flower_log_teff (lo, NULL) || log_t < sl_flower_log_teff (hi, NULL))
    return FALSE;
  for (int k = 0; k < 60; k++)
    {
      double mid = 0.5 * (lo + hi);

      if (sl_flower_log_teff (mid, NULL) > log_t)
        lo = mid;
      else
        hi = mid;
    }
  *bv = 0.5 * (lo + hi);
  return TRUE;
}

/* A ZAMS star of MASS in the diagram's plane: in the observer's plane
 * through the derivation's own relations backwards (Flower's colour and
 * bolometric correction, M_bol,sun on the same scale), so the line and the
 * stars share a calibration. */
static gboolean
zams_point (SlHrdPlane plane, double mass, double *x, double *y)
{
  double lum = sl_zams_luminosity (mass, 0.02), teff = sl_zams_teff (mass, 0.02);

  if (!isfinite (lum) || !isfinite (teff))
    return FALSE;
  if (plane == SL_HRD_THEORETICAL)
    {
      *x = log10 (teff);
      *y = log10 (lum);
      return TRUE;
    }
  if (!sl_flower_bc_in_range (teff) || !flower_colour_for (log10 (teff), x))
    return FALSE;
  *y = sl_mbol_sun_flower () - 2.5 * log10 (lum) - sl_flower_bc (log10 (teff), NULL);
  return TRUE;
}

#define ZAMS_POINTS 240

static void
draw_zams (Hrd *h)
{
  const SlFrame *f = &h->f;
  SlFigure *fig = h->fig;
  cairo_t *cr = fig->cr;
  double px[ZAMS_POINTS], py[ZAMS_POINTS];
  gboolean ok[ZAMS_POINTS], pen_down = FALSE;
  int visible[ZAMS_POINTS], n_visible = 0;
  static const double fractions[] = { 0.5, 0.35, 0.65, 0.2, 0.8 };
  const char *text = "ZAMS";
  double best_score = INFINITY, best_x = 0, best_y = 0, best_angle = 0, w, th;
  Rect best_rect = { 0 };

  cairo_save (cr);
  cairo_rectangle (cr, f->x, f->y, f->w, f->h);
  cairo_clip (cr);
  cairo_set_source_rgb (cr, 0.2, 0.2, 0.2);
  cairo_set_line_width (cr, 1.4 * fig->style.line_pt);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  for (int i = 0; i < ZAMS_POINTS; i++)
    {
      /* 0.1 to 100 M_sun, evenly in log M. */
      double mass = pow (10.0, -1.0 + 3.0 * i / (ZAMS_POINTS - 1.0)), x, y;

      ok[i] = zams_point (h->options->plane, mass, &x, &y);
      if (!ok[i])
        {
          pen_down = FALSE;
          continue;
        }
      px[i] = sl_frame_px (f, x), py[i] = sl_frame_py (f, y);
      if (pen_down)
        cairo_line_to (cr, px[i], py[i]);
      else
        cairo_move_to (cr, px[i], py[i]);
      pen_down = TRUE;
      if (in_frame (f, px[i], py[i]))
        visible[n_visible++] = i;
    }
  cairo_stroke (cr);
  cairo_restore (cr);

  /* Its name beside it, on the lower side, where the fewest markers are. */
  sl_figure_text_size (fig, 0.85, text, &w, &th);
  for (gsize k = 0; k < G_N_ELEMENTS (fractions) && n_visible >= 3; k++)
    {
      int j = CLAMP ((int) lround (fractions[k] * (n_visible - 1)), 1, n_visible - 2);
      int i = visible[j], prev = visible[j - 1], next = visible[j + 1];
      double len, ux, uy, angle, x, y, score;
      Rect r;

      if (!ok[prev] || !ok[next] || (len = page_length (px[prev], py[prev], px[next], py[next])) <= 0)
        continue;
      ux = (px[next] - px[prev]) / len, uy = (py[next] - py[prev]) / len;
      if (ux < 0)
        ux = -ux, uy = -uy;
      angle = atan2 (-uy, ux);
      /* Down the text is (-uy, ux). */
      x = px[i] - uy * 0.35 * fig->style.font_pt, y = py[i] + ux * 0.35 * fig->style.font_pt;
      r = text_box (x, y, 0.5, 0.0, w, th, angle);
      if (!rect_inside (&r, f, LABEL_MARGIN (fig)))
        continue;
      score = occupancy_count (&h->occ, &r) + 1e6 * overlaps_any (&r, h->labels);
      if (score < best_score)
        best_score = score, best_x = x, best_y = y, best_angle = angle, best_rect = r;
    }
  if (!isfinite (best_score))
    return;
  g_array_append_val (h->labels, best_rect);
  sl_figure_halo_text (fig, best_x, best_y, 0.5, 0.0, 0.85, best_angle, text, 0.2,
                       LABEL_HALO_ALPHA);
}

/* ------------------------------------------------------------------ */
/* Errors                                                             */

#define ELLIPSE_POINTS 40

/* The 1-sigma ellipse of log Teff and log L; FALSE if the star has no
 * covariance.  Small ellipses hidden under the marker are not drawn. */
static gboolean
draw_ellipse (Hrd *h, const SlPlotStar *s, double x, double y, double cx, double cy)
{
  const SlFrame *f = &h->f;
  cairo_t *cr = h->fig->cr;
  double a, b, angle, extent = 0.0;
  double px[ELLIPSE_POINTS], py[ELLIPSE_POINTS];

  if (!(s->logt_sigma > 0.0 && s->logl_sigma > 0.0 && isfinite (s->logt_logl_corr)))
    return FALSE;
  sl_error_ellipse_axes (s->logt_sigma, s->logl_sigma, CLAMP (s->logt_logl_corr, -1.0, 1.0), &a, &b, &angle);
  for (int k = 0; k < ELLIPSE_POINTS; k++)
    {
      double t = 2.0 * G_PI * k / ELLIPSE_POINTS;
      double dx = a * cos (t) * cos (angle) - b * sin (t) * sin (angle);
      double dy = a * cos (t) * sin (angle) + b * sin (t) * cos (angle);

      px[k] = sl_frame_px (f, x + dx), py[k] = sl_frame_py (f, y + dy);
      extent = MAX (extent, page_length (cx, cy, px[k], py[k]));
    }
  if (extent <= h->r)
    return TRUE;
  cairo_move_to (cr, px[0], py[0]);
  for (int k = 1; k < ELLIPSE_POINTS; k++)
    cairo_line_to (cr, px[k], py[k]);
  cairo_close_path (cr);
  cairo_stroke (cr);
  return TRUE;
}

/* A bar from LO to HI along x (or y), in data units; nothing if either is
 * missing or the bar would hide under the marker. */
static void
draw_bar (Hrd *h, gboolean along_x, double lo, double hi, double x, double y)
{
  const SlFrame *f = &h->f;
  double ax, ay, bx, by;

  if (!isfinite (lo) || !isfinite (hi))
    return;
  ax = sl_frame_px (f, along_x ? lo : x), ay = sl_frame_py (f, along_x ? y : lo);
  bx = sl_frame_px (f, along_x ? hi : x), by = sl_frame_py (f, along_x ? y : hi);
  if (page_length (ax, ay, bx, by) <= 2.0 * h->r)
    return;
  cairo_move_to (h->fig->cr, ax, ay);
  cairo_line_to (h->fig->cr, bx, by);
  cairo_stroke (h->fig->cr);
}

static double
log10_or_nan (double v)
{
  return v > 0.0 ? log10 (v) : NAN;
}

static void
draw_errors (Hrd *h, const SlStarSet *stars, const guint *index, const double *xs, const double *ys,
             const double *px, const double *py, const float *rgb, guint n)
{
  const SlFrame *f = &h->f;
  cairo_t *cr = h->fig->cr;

  cairo_save (cr);
  cairo_rectangle (cr, f->x, f->y, f->w, f->h);
  cairo_clip (cr);
  cairo_set_line_width (cr, 0.7 * h->fig->style.line_pt);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  for (guint i = 0; i < n; i++)
    {
      const SlPlotStar *s = sl_star_set_get (stars, index[i]);

      cairo_set_source_rgba (cr, rgb[3 * i], rgb[3 * i + 1], rgb[3 * i + 2], 0.7);
      if (h->options->plane == SL_HRD_OBSERVATIONAL)
        {
          draw_bar (h, TRUE, s->bv0_lo, s->bv0_hi, xs[i], ys[i]);
          draw_bar (h, FALSE, s->absmag_lo, s->absmag_hi, xs[i], ys[i]);
        }
      else if (!draw_ellipse (h, s, xs[i], ys[i], px[i], py[i]))
        {
          draw_bar (h, TRUE, log10_or_nan (s->teff_lo), log10_or_nan (s->teff_hi), xs[i], ys[i]);
          draw_bar (h, FALSE, log10_or_nan (s->lum_lo), log10_or_nan (s->lum_hi), xs[i], ys[i]);
        }
    }
  cairo_restore (cr);
}

/* ------------------------------------------------------------------ */
/* Highlights                                                         */

typedef struct {
  double      px, py;    /* pt */
  float       rgb[3];
  const char *name;
  Rect        ring;
} Mark;

/* The label's box at candidate DIR (0-7: NE, E, SE, NW, W, SW, N, S) at
 * distance DIST from the mark's centre; its anchor in *X, *Y, *AX, *AY. */
static Rect
candidate_box (const Mark *m, int dir, double dist, double w, double th, double *x, double *y, double *ax,
               double *ay)
{
  static const int dirs[8][2] = {
    { 1, -1 }, { 1, 0 }, { 1, 1 }, { -1, -1 }, { -1, 0 }, { -1, 1 }, { 0, -1 }, { 0, 1 },
  };
  int dx = dirs[dir][0], dy = dirs[dir][1];
  double k = dx != 0 && dy != 0 ? G_SQRT2 / 2 : 1.0;

  *x = m->px + dx * k * dist, *y = m->py + dy * k * dist;
  *ax = (1.0 - dx) / 2.0, *ay = (1.0 - dy) / 2.0;
  return text_box (*x, *y, *ax, *ay, w, th, 0.0);
}

/* Whether a label box R would touch another highlighted star's ring (with
 * a clearance of CLEAR pt) or stand nearer to another star than to its
 * own, so that a reader could take it for that star's. */
static gboolean
hits_other_mark (const Rect *r, const Mark *marks, guint n, guint self, double clear)
{
  double cx = 0.5 * (r->x0 + r->x1), cy = 0.5 * (r->y0 + r->y1);
  double own = page_length (cx, cy, marks[self].px, marks[self].py);

  for (guint j = 0; j < n; j++)
    {
      Rect ring = marks[j].ring;

      if (j == self)
        continue;
      ring.x0 -= clear, ring.y0 -= clear, ring.x1 += clear, ring.y1 += clear;
      if (rects_overlap (r, &ring) || page_length (cx, cy, marks[j].px, marks[j].py) < own)
        return TRUE;
    }
  return FALSE;
}

/* Places the label of MARKS[SELF]: the first of the eight positions next
 * to the ring whose box stays in the frame and overlaps no other label and
 * no other ring, preferring one that covers no marker either; then the
 * same further out, with a leader line; as a last resort the first
 * position inside the frame. */
static void
place_label (Hrd *h, const Mark *marks, guint n, guint self, const char *markup)
{
  SlFigure *fig = h->fig;
  const Mark *m = &marks[self];
  double ring = (m->ring.x1 - m->ring.x0) / 2, em = fig->style.font_pt, w, th;
  double distances[] = { ring + 0.25 * em, ring + 1.6 * em, ring + 3.0 * em };
  double x = 0, y = 0, ax = 0, ay = 0;
  gboolean found = FALSE, leader = FALSE;
  Rect r = { 0 };

  sl_figure_text_size (fig, 0.9, markup, &w, &th);
  for (int pass = 0; pass < 4 && !found; pass++)
    {
      double dist = distances[MAX (0, pass - 1)];

      for (int dir = 0; dir < 8 && !found; dir++)
        {
          r = candidate_box (m, dir, dist, w, th, &x, &y, &ax, &ay);
          found = rect_inside (&r, &h->f, LABEL_MARGIN (h->fig)) && overlaps_any (&r, h->labels) == 0
                  && !hits_other_mark (&r, marks, n, self, 0.5 * em)
                  && (pass > 0 || occupancy_count (&h->occ, &r) == 0);
        }
      leader = pass >= 2;
    }
  if (!found)
    {
      leader = FALSE;
      for (int dir = 0; dir < 8; dir++)
        {
          r = candidate_box (m, dir, distances[0], w, th, &x, &y, &ax, &ay);
          if ((found = rect_inside (&r, &h->f, 0.0)))
            break;
        }
      if (!found)
        r = candidate_box (m, 0, distances[0], w, th, &x, &y, &ax, &ay);
    }
  g_array_append_val (h->labels, r);

  if (leader)
    {
      /* From the ring towards the nearest point of the label's box. */
      double tx = CLAMP (m->px, r.x0, r.x1), ty = CLAMP (m->py, r.y0, r.y1);
      double len = page_length (m->px, m->py, tx, ty);

      cairo_save (fig->cr);
      cairo_set_source_rgb (fig->cr, 0.15, 0.15, 0.15);
      cairo_set_line_width (fig->cr, 0.6 * fig->style.line_pt);
      cairo_move_to (fig->cr, m->px + (tx - m->px) * ring / len, m->py + (ty - m->py) * ring / len);
      cairo_line_to (fig->cr, tx, ty);
      cairo_stroke (fig->cr);
      cairo_restore (fig->cr);
    }
  sl_figure_halo_text (fig, x, y, ax, ay, 0.9, 0.0, markup, 0.0, LABEL_HALO_ALPHA);
}

static void
draw_highlights (Hrd *h, const SlStarSet *stars, const guint *index, const double *px, const double *py,
                 const float *rgb, guint n, GPtrArray *notes)
{
  const char *const *names = h->options->highlight;
  SlFigure *fig = h->fig;
  cairo_t *cr = fig->cr;
  g_autoptr (GHashTable) where = g_hash_table_new (g_str_hash, g_str_equal);
  g_autoptr (GArray) marks = g_array_new (FALSE, FALSE, sizeof (Mark));
  double ring = MAX (2.2 * h->r, h->r + 0.3 * fig->style.font_pt);

  for (guint i = 0; i < n; i++)
    g_hash_table_insert (where, (gpointer) sl_star_set_get (stars, index[i])->designation, GUINT_TO_POINTER (i + 1));
  for (gsize k = 0; names[k]; k++)
    {
      guint i = GPOINTER_TO_UINT (g_hash_table_lookup (where, names[k]));
      Mark m;

      if (i == 0)
        {
          sl_figure_add_note (notes, g_strdup_printf (h->options->plane == SL_HRD_THEORETICAL
                                                      ? _("HR diagram: %s has no derived temperature and luminosity and is not marked.")
                                                      : _("HR diagram: %s has no derived colour and absolute magnitude and is not marked."),
                                                      names[k]));
          continue;
        }
      i--;
      if (!in_frame (&h->f, px[i], py[i]))
        {
          sl_figure_add_note (notes, g_strdup_printf (_("HR diagram: %s lies outside the plotted range and is not marked."),
                                                      names[k]));
          continue;
        }
      m.px = px[i], m.py = py[i], m.name = names[k];
      memcpy (m.rgb, &rgb[3 * i], sizeof m.rgb);
      m.ring = (Rect) { m.px - ring, m.py - ring, m.px + ring, m.py + ring };
      g_array_append_val (marks, m);
    }

  /* The star again on top (it may lie in a density image), and its ring. */
  cairo_save (cr);
  for (guint k = 0; k < marks->len; k++)
    {
      const Mark *m = &g_array_index (marks, Mark, k);

      cairo_set_source_rgb (cr, m->rgb[0], m->rgb[1], m->rgb[2]);
      cairo_new_sub_path (cr);
      cairo_arc (cr, m->px, m->py, MAX (h->r, 1.0), 0, 2 * G_PI);
      cairo_fill (cr);
      cairo_set_source_rgb (cr, 0, 0, 0);
      cairo_set_line_width (cr, 1.2 * fig->style.line_pt);
      cairo_new_sub_path (cr);
      cairo_arc (cr, m->px, m->py, ring, 0, 2 * G_PI);
      cairo_stroke (cr);
    }
  cairo_restore (cr);

  for (guint k = 0; k < marks->len; k++)
    {
      g_autofree char *markup = g_markup_escape_text (g_array_index (marks, Mark, k).name, -1);

      place_label (h, (const Mark *) marks->data, marks->len, k, markup);
    }
}

/* ------------------------------------------------------------------ */
/* Spectral classes                                                   */

/* Where each dwarf class begins (its x0 type; O has no O0, so O3), from
 * the anchors of spectral.c: Pecaut & Mamajek (2013), Mamajek's table
 * 2019.3.22.  The last entry, L0, closes M. */
static const struct {
  const char *letter;
  double      teff;   /* K */
} class_starts[] = {
  { "O", 46000 }, { "B", 31500 }, { "A", 9700 }, { "F", 7220 },
  { "G", 5920 }, { "K", 5280 }, { "M", 3870 }, { NULL, 2250 },
};

/* Ticks outward from the top edge where a class begins, each class's
 * letter centred over the part of it in view. */
static void
draw_class_ticks (Hrd *h)
{
  const SlFrame *f = &h->f;
  SlFigure *fig = h->fig;
  cairo_t *cr = fig->cr;
  double em = fig->style.font_pt, left = f->x, right = f->x + f->w;

  cairo_save (cr);
  cairo_set_source_rgb (cr, 0, 0, 0);
  cairo_set_line_width (cr, fig->style.line_pt);
  for (gsize i = 1; i < G_N_ELEMENTS (class_starts); i++)
    {
      double x = sl_frame_px (f, log10 (class_starts[i].teff));

      if (x > left + 0.5 && x < right - 0.5)
        {
          cairo_move_to (cr, x, f->y);
          cairo_rel_line_to (cr, 0, -0.45 * em);
        }
    }
  cairo_stroke (cr);
  for (gsize i = 0; class_starts[i].letter; i++)
    {
      double xa = sl_frame_px (f, log10 (class_starts[i].teff));
      double xb = sl_frame_px (f, log10 (class_starts[i + 1].teff));
      double lo = CLAMP (MIN (xa, xb), left, right), hi = CLAMP (MAX (xa, xb), left, right), w, th;

      sl_figure_text_size (fig, 1.0, class_starts[i].letter, &w, &th);
      if (hi - lo < 1.2 * w)
        continue;
      sl_figure_text (fig, 0.5 * (lo + hi), f->y - 0.3 * em, 0.5, 1.0, 1.0, 0, class_starts[i].letter);
    }
  cairo_restore (cr);
}

/* ------------------------------------------------------------------ */
/* Drawing                                                            */

void
sl_hrd_options_init (SlHrdOptions *options)
{
  g_return_if_fail (options != NULL);

  memset (options, 0, sizeof *options);
  options->plane = SL_HRD_THEORETICAL;
  options->errors = TRUE;
  options->radius_lines = TRUE;
  options->zams = TRUE;
  options->class_ticks = TRUE;
  options->highlight = NULL;
  for (int i = 0; i < 4; i++)
    options->view[i] = NAN;
}

/* The marker radius: smaller as the stars grow many, so a crowd stays a
 * shape rather than a blot. */
static double
marker_radius (const SlFigure *fig, guint n)
{
  double em = fig->style.font_pt;

  if (n <= 100)
    return 0.2 * em;
  if (n <= 1000)
    return 0.14 * em;
  if (n <= 10000)
    return 0.09 * em;
  return 0.06 * em;
}

gboolean
sl_hrd_draw (SlFigure *fig, const SlStarSet *stars, const SlHrdOptions *options, SlFrame *frame,
             GPtrArray *notes, GError **error)
{
  gboolean theoretical;
  guint n_all, n = 0;
  g_autofree guint *index = NULL;
  g_autofree double *xs = NULL, *ys = NULL, *px = NULL, *py = NULL;
  g_autofree float *rgb = NULL;
  Hrd h = { 0 };

  g_return_val_if_fail (fig != NULL && stars != NULL && options != NULL, FALSE);
  g_return_val_if_fail (error == NULL || *error == NULL, FALSE);

  theoretical = options->plane == SL_HRD_THEORETICAL;
  n_all = stars->stars->len;
  index = g_new (guint, MAX (n_all, 1));
  xs = g_new (double, MAX (n_all, 1));
  ys = g_new (double, MAX (n_all, 1));
  for (guint i = 0; i < n_all; i++)
    if (star_xy (sl_star_set_get (stars, i), options->plane, &xs[n], &ys[n]))
      index[n++] = i;

  h.fig = fig;
  h.options = options;
  sl_figure_place_frame (fig, &h.f, options->class_ticks && theoretical);
  choose_view (&h.f, options, xs, ys, n);
  if (frame)
    *frame = h.f;

  if (n == 0)
    {
      const char *message = options->empty_message ? options->empty_message
                            : theoretical
                              ? _("No star has a derived temperature and luminosity yet: run 'starledger-cli derive'.")
                              : _("No star has a derived colour and absolute magnitude yet: run 'starledger-cli derive'.");

      sl_figure_message (fig, message);
      sl_figure_add_note (notes, g_strdup (message));
      return TRUE;
    }

  px = g_new (double, n);
  py = g_new (double, n);
  rgb = g_new (float, 3 * (gsize) n);
  for (guint i = 0; i < n; i++)
    {
      double colour[3];

      px[i] = sl_frame_px (&h.f, xs[i]);
      py[i] = sl_frame_py (&h.f, ys[i]);
      sl_figure_record_position (fig, index[i], px[i], py[i]);
      sl_temperature_colour (sl_star_set_get (stars, index[i])->teff, fig->style.grayscale, colour);
      rgb[3 * i] = colour[0], rgb[3 * i + 1] = colour[1], rgb[3 * i + 2] = colour[2];
    }
  h.r = marker_radius (fig, n);
  occupancy_init (&h.occ, &h.f, px, py, n, h.r);
  h.labels = g_array_new (FALSE, FALSE, sizeof (Rect));

  if (options->radius_lines && theoretical)
    draw_radius_lines (&h);
  if (options->zams)
    draw_zams (&h);
  if (options->errors && n <= SL_HRD_MAX_ERRORS)
    draw_errors (&h, stars, index, xs, ys, px, py, rgb, n);
  else if (options->errors)
    sl_figure_add_note (notes, g_strdup_printf (_("HR diagram: error ellipses and bars left out above %d stars (%u drawn)."),
                                                SL_HRD_MAX_ERRORS, n));
  if (sl_figure_scatter (fig, &h.f, px, py, rgb, n, h.r))
    sl_figure_add_note (notes, g_strdup_printf (ngettext ("HR diagram: %u star drawn as a density image.",
                                                          "HR diagram: %u stars drawn as a density image.", n),
                                                n));
  if (options->highlight)
    draw_highlights (&h, stars, index, px, py, rgb, n, notes);
  if (options->class_ticks && theoretical)
    draw_class_ticks (&h);
  if (n < n_all)
    sl_figure_add_note (notes, g_strdup_printf (theoretical
                                                  ? ngettext ("HR diagram: %u star has no derived temperature and luminosity and is left out.",
                                                              "HR diagram: %u stars have no derived temperature and luminosity and are left out.",
                                                              n_all - n)
                                                  : ngettext ("HR diagram: %u star has no derived colour and absolute magnitude and is left out.",
                                                              "HR diagram: %u stars have no derived colour and absolute magnitude and are left out.",
                                                              n_all - n),
                                                n_all - n));
  sl_figure_axes (fig, &h.f,
                  theoretical ? "log <i>T</i>" SUB ("eff") " (K)" : "(<i>B</i>−<i>V</i>)" SUB ("0"),
                  theoretical ? "log <i>L</i>/<i>L</i>" SUB ("⊙") : "<i>M</i>" SUB ("<i>V</i>"));

  g_free (h.occ.sum);
  g_array_unref (h.labels);
  return TRUE;
}
