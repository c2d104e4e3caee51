/* parallax-path.c: the apparent annual paths of chosen stars.
 *
 * The displacement is the projection of the Earth's barycentric position
 * (ERFA eraEpv00) on the tangent plane at the star, so a path carries the
 * orbit's eccentricity and the Sun's motion about the barycentre instead
 * of an idealised ellipse.  One panel per star (small multiples), each at
 * the same length per mas in both directions, so a circle stays round;
 * east to the left, as the sky is seen.
 *
 * Contents:
 *   the displacement ...... sl_parallax_offset, the Earth's track
 *   one star .............. displacement per mas of parallax, extent
 *   one panel ............. axes, band, path, month ticks, title
 *   the page .............. grid, scale, axis titles, caption, sl_parallax_draw
 */
#include "parallax-path.h"

#include <erfa.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "constants.h"
#include "rounding.h"

#define MAX_PANELS       24
#define SAMPLES_PER_YEAR 400
#define MAX_SAMPLES      40001   /* a long span is sampled more coarsely */
#define MINUS            "\u2212"

/* Sizes in units of the body text (em). */
#define TICK_LABEL_SCALE 0.8
#define TITLE_SCALE      0.85
#define MONTH_SCALE      0.68
#define CAPTION_SCALE    0.8

/* Colours: the path dark blue, the band a pale tint of it (grey for print). */
static const double path_rgb[3] = { 0.08, 0.20, 0.50 };
static const double band_rgb[3] = { 0.83, 0.87, 0.95 };
static const double band_edge_rgb[3] = { 0.58, 0.67, 0.84 };
static const double path_grey[3] = { 0.0, 0.0, 0.0 };
static const double band_grey[3] = { 0.86, 0.86, 0.86 };
static const double band_edge_grey[3] = { 0.62, 0.62, 0.62 };

void
sl_parallax_options_init (SlParallaxOptions *options)
{
  g_return_if_fail (options != NULL);

  options->start_jyear = 2026.0;
  options->years = 1.0;
  options->proper_motion = FALSE;
  options->common_scale = FALSE;
  options->band = TRUE;
  options->empty_message = NULL;
}

/* ------------------------------------------------------------------ */
/* The displacement                                                   */

/* Julian year (TT) to Julian Date: J2000.0 is JD 2451545.0 TT and a
 * Julian year 365.25 days (IAU 1976, Resolution 10). */
static double
jyear_to_jd (double jyear)
{
  return SL_J2000_JD + (jyear - 2000.0) * SL_JULIAN_YEAR_D;
}

static double
jd_to_jyear (double jd)
{
  return 2000.0 + (jd - SL_J2000_JD) / SL_JULIAN_YEAR_D;
}

/* The Earth's barycentric position in au on ICRS axes (BCRS).  FALSE
 * outside 1900-2100, where eraEpv00 is less accurate (it still answers). */
static gboolean
earth_position (double jyear, double xyz[3])
{
  double pvh[2][3], pvb[2][3];
  int status = eraEpv00 (jyear_to_jd (jyear), 0.0, pvh, pvb);

  memcpy (xyz, pvb[0], sizeof pvb[0]);
  return status == 0;
}

/* The star's direction, as the parallax factors need it. */
typedef struct {
  double sin_ra, cos_ra, sin_dec, cos_dec;
} Direction;

static void
direction_init (Direction *d, double ra_deg, double dec_deg)
{
  d->sin_ra = sin (ra_deg * ERFA_DD2R);
  d->cos_ra = cos (ra_deg * ERFA_DD2R);
  d->sin_dec = sin (dec_deg * ERFA_DD2R);
  d->cos_dec = cos (dec_deg * ERFA_DD2R);
}

/* The displacement for a parallax of 1 (in the unit of the parallax) when
 * the Earth is at XYZ au.  Seen from the Earth at E, a star at distance
 * 1/p in direction u appears along u - p E: moved by -p (E - (E.u) u),
 * away from the Earth and so towards the Sun.  East (-sin a, cos a, 0) and
 * north (-sin d cos a, -sin d sin a, cos d) components of that: */
static void
parallax_factors (const Direction *d, const double xyz[3], double *east, double *north)
{
  *east = xyz[0] * d->sin_ra - xyz[1] * d->cos_ra;
  *north = (xyz[0] * d->cos_ra + xyz[1] * d->sin_ra) * d->sin_dec - xyz[2] * d->cos_dec;
}

void
sl_parallax_offset (double ra, double dec, double parallax, double jyear, double *east, double *north)
{
  double xyz[3], fe, fn;
  Direction d;

  g_return_if_fail (east != NULL && north != NULL);

  earth_position (jyear, xyz);
  direction_init (&d, ra, dec);
  parallax_factors (&d, xyz, &fe, &fn);
  *east = parallax * fe;
  *north = parallax * fn;
}

/* The Earth's positions at the sample times, shared by every star. */
typedef struct {
  guint    n;
  double  *t;          /* Julian year */
  double  *xyz;        /* au, three per sample */
  gboolean accurate;   /* every sample within eraEpv00's 1900-2100 */
} EarthTrack;

static void
earth_track_init (EarthTrack *track, double start, double years)
{
  double wanted = ceil (SAMPLES_PER_YEAR * years) + 1.0;

  track->n = (guint) CLAMP (wanted, 2.0, (double) MAX_SAMPLES);
  track->t = g_new (double, track->n);
  track->xyz = g_new (double, 3 * track->n);
  track->accurate = TRUE;
  for (guint i = 0; i < track->n; i++)
    {
      track->t[i] = start + years * i / (track->n - 1);
      if (!earth_position (track->t[i], track->xyz + 3 * i))
        track->accurate = FALSE;
    }
}

static void
earth_track_clear (EarthTrack *track)
{
  g_free (track->t);
  g_free (track->xyz);
}

/* ------------------------------------------------------------------ */
/* One star                                                           */

typedef struct {
  const SlPlotStar *star;
  gboolean  drawable;        /* a positive parallax */
  gboolean  band;            /* draw parallax -/+ error */
  Direction dir;
  double    plx, plx_lo, plx_hi;   /* mas; lo clipped at zero */
  double    pm_east, pm_north;     /* mas/yr; zero without proper motion */
  double   *fe, *fn;         /* displacement per mas of parallax at each sample */
  double    cx, cy;          /* the view's centre, mas (east, north) */
  double    half_e, half_n;  /* half the extent of what is drawn about it, mas */
} Panel;

/* The offset at sample I for a parallax PLX: from the star's position at
 * the start of the span (with proper motion, its catalogue position
 * carried there along a straight line, a shift the figure leaves out). */
static void
panel_offset (const Panel *p, const EarthTrack *track, guint i, double plx, double *east, double *north)
{
  double dt = track->t[i] - track->t[0];

  *east = plx * p->fe[i] + p->pm_east * dt;
  *north = plx * p->fn[i] + p->pm_north * dt;
}

static void
panel_init (Panel *p, const SlPlotStar *star, const EarthTrack *track, const SlParallaxOptions *options)
{
  double lo_e = 0, hi_e = 0, lo_n = 0, hi_n = 0;   /* the origin is always in view */
  double plx_list[3];
  guint n_plx = 1;

  memset (p, 0, sizeof *p);
  p->star = star;
  p->drawable = isfinite (star->parallax) && star->parallax > 0 && isfinite (star->ra)
                && isfinite (star->dec);
  if (!p->drawable)
    return;

  direction_init (&p->dir, star->ra, star->dec);
  p->plx = star->parallax;
  p->band = options->band && isfinite (star->parallax_err) && star->parallax_err > 0;
  if (p->band)
    {
      p->plx_lo = MAX (0.0, star->parallax - star->parallax_err);
      p->plx_hi = star->parallax + star->parallax_err;
      plx_list[n_plx++] = p->plx_lo;
      plx_list[n_plx++] = p->plx_hi;
    }
  plx_list[0] = p->plx;
  if (options->proper_motion)
    {
      p->pm_east = isfinite (star->pmra) ? star->pmra : 0.0;
      p->pm_north = isfinite (star->pmdec) ? star->pmdec : 0.0;
    }

  p->fe = g_new (double, track->n);
  p->fn = g_new (double, track->n);
  for (guint i = 0; i < track->n; i++)
    {
      parallax_factors (&p->dir, track->xyz + 3 * i, &p->fe[i], &p->fn[i]);
      for (guint k = 0; k < n_plx; k++)
        {
          double e, n;

          panel_offset (p, track, i, plx_list[k], &e, &n);
          lo_e = MIN (lo_e, e), hi_e = MAX (hi_e, e);
          lo_n = MIN (lo_n, n), hi_n = MAX (hi_n, n);
        }
    }

  /* Without proper motion the star's position sits in the middle, so the
   * path reads as a displacement about it; with it, the loops do. */
  if (options->proper_motion)
    {
      p->cx = 0.5 * (lo_e + hi_e), p->cy = 0.5 * (lo_n + hi_n);
      p->half_e = 0.5 * (hi_e - lo_e), p->half_n = 0.5 * (hi_n - lo_n);
    }
  else
    {
      p->half_e = MAX (-lo_e, hi_e);
      p->half_n = MAX (-lo_n, hi_n);
    }
}

static void
panel_clear (Panel *p)
{
  g_clear_pointer (&p->fe, g_free);
  g_clear_pointer (&p->fn, g_free);
}

/* ------------------------------------------------------------------ */
/* One panel                                                          */

/* What the page's layout decided, the same for every panel. */
typedef struct {
  double em;                /* body text size, pt */
  double cell_w, cell_h;    /* one grid cell, pt */
  double left, right;       /* cell edges to the plot area, pt */
  double top, bottom;
  double pw, ph;            /* the plot area, pt */
  double title_scale;       /* one size for every panel's title */
  guint  title_lines;       /* 2: the values share a line; 3: they do not */
} Layout;

static void
set_colour (cairo_t *cr, const double rgb[3])
{
  cairo_set_source_rgb (cr, rgb[0], rgb[1], rgb[2]);
}

/* The smallest step of 1, 2 or 5 times a power of ten that is at least MIN. */
static double
step_at_least (double min)
{
  double power = pow (10.0, floor (log10 (min)));

  for (int k = 0; k < 4; k++)
    {
      static const double mantissa[] = { 1.0, 2.0, 5.0, 10.0 };

      if (mantissa[k] * power >= min * (1 - 1e-9))
        return mantissa[k] * power;
    }
  return 10.0 * power;
}

/* The next smaller step of 1, 2 or 5 times a power of ten. */
static double
step_below (double step)
{
  double power = pow (10.0, floor (log10 (step) + 1e-9)), mantissa = step / power;

  return mantissa > 4.5 ? 2.0 * power : mantissa > 1.5 ? power : 0.5 * power;
}

static int
tick_count (double lo, double hi, double step)
{
  return (int) (floor (hi / step + 1e-9) - ceil (lo / step - 1e-9)) + 1;
}

/* The widest tick label at STEP over [LO, HI], pt. */
static double
widest_label (SlFigure *fig, double lo, double hi, double step)
{
  double widest = 0;

  for (double v = ceil (lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step)
    {
      g_autofree char *label = sl_figure_format_fixed (v, sl_figure_step_decimals (step));
      double w, h;

      sl_figure_text_size (fig, TICK_LABEL_SCALE, label, &w, &h);
      widest = MAX (widest, w);
    }
  return widest;
}

/* The box, ticks inward on all four sides, labels left and below.  One
 * step for both axes (the scale is the same): the finest at which the x
 * labels keep a space between them.  An axis that this leaves with fewer
 * than three ticks goes finer while its labels stay apart (x: a narrower
 * space). */
static void
panel_axes (SlFigure *fig, const SlFrame *f, double mas_per_pt)
{
  cairo_t *cr = fig->cr;
  double em = fig->style.font_pt, tick = 0.3 * em;
  double x_lo = MIN (f->x0, f->x1), x_hi = MAX (f->x0, f->x1);
  double y_closest = 1.4 * em * TICK_LABEL_SCALE * mas_per_pt;
  double shared = step_at_least (MAX (2.0 * em * TICK_LABEL_SCALE * mas_per_pt, y_closest));

  for (int k = 0; k < 12 && widest_label (fig, x_lo, x_hi, shared) + 0.6 * em > shared / mas_per_pt; k++)
    shared = step_at_least (shared * 1.01);

  cairo_save (cr);
  cairo_set_source_rgb (cr, 0, 0, 0);
  cairo_set_line_width (cr, fig->style.line_pt);
  cairo_rectangle (cr, f->x, f->y, f->w, f->h);
  cairo_stroke (cr);

  for (int axis = 0; axis < 2; axis++)
    {
      double lo = axis == 0 ? x_lo : MIN (f->y0, f->y1);
      double hi = axis == 0 ? x_hi : MAX (f->y0, f->y1);
      double step = shared;
      int decimals;

      for (int k = 0; k < 6 && tick_count (lo, hi, step) < 3; k++)
        {
          double finer = step_below (step);

          if (axis == 1 ? finer < y_closest
                        : widest_label (fig, lo, hi, finer) + 0.25 * em > finer / mas_per_pt)
            break;
          step = finer;
        }
      decimals = sl_figure_step_decimals (step);

      for (double v = ceil (lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step)
        {
          g_autofree char *label = sl_figure_format_fixed (v, decimals);

          sl_figure_tick (fig, f, axis == 0, v, tick, axis == 0 ? 0.25 * em : 0.3 * em, TICK_LABEL_SCALE,
                          label);
        }
      cairo_stroke (cr);
    }
  cairo_restore (cr);
}

/* The region between the paths for parallax - and + its error: the union
 * of the quadrilaterals between corresponding points, all added with the
 * same orientation so that the winding rule fills their union in one
 * pass (no seams, and it holds for the loops proper motion makes). */
static void
draw_band (SlFigure *fig, const SlFrame *f, const Panel *p, const EarthTrack *track)
{
  cairo_t *cr = fig->cr;
  const double *fill = fig->style.grayscale ? band_grey : band_rgb;
  const double *edge = fig->style.grayscale ? band_edge_grey : band_edge_rgb;
  double prev[4] = { 0 };

  for (guint i = 0; i < track->n; i++)
    {
      double e, n, q[4];

      panel_offset (p, track, i, p->plx_lo, &e, &n);
      q[0] = sl_frame_px (f, e), q[1] = sl_frame_py (f, n);
      panel_offset (p, track, i, p->plx_hi, &e, &n);
      q[2] = sl_frame_px (f, e), q[3] = sl_frame_py (f, n);
      if (i > 0)
        {
          double x[4] = { prev[0], q[0], q[2], prev[2] }, y[4] = { prev[1], q[1], q[3], prev[3] };
          double area = 0;

          for (int k = 0; k < 4; k++)
            area += x[k] * y[(k + 1) % 4] - x[(k + 1) % 4] * y[k];
          if (fabs (area) > 1e-9)
            {
              cairo_move_to (cr, x[0], y[0]);
              for (int k = 1; k < 4; k++)
                {
                  int j = area > 0 ? k : 4 - k;

                  cairo_line_to (cr, x[j], y[j]);
                }
              cairo_close_path (cr);
            }
        }
      memcpy (prev, q, sizeof q);
    }
  set_colour (cr, fill);
  cairo_set_fill_rule (cr, CAIRO_FILL_RULE_WINDING);
  cairo_fill (cr);

  /* Its two edges, thin, so the band reads even where it is narrow; not
   * with proper motion, where the loops of the edges would cross it. */
  if (p->pm_east != 0 || p->pm_north != 0)
    return;
  for (int side = 0; side < 2; side++)
    {
      for (guint i = 0; i < track->n; i++)
        {
          double e, n;

          panel_offset (p, track, i, side == 0 ? p->plx_lo : p->plx_hi, &e, &n);
          cairo_line_to (cr, sl_frame_px (f, e), sl_frame_py (f, n));
        }
      cairo_new_sub_path (cr);
    }
  set_colour (cr, edge);
  cairo_set_line_width (cr, 0.7 * fig->style.line_pt);
  cairo_stroke (cr);
}

static void
draw_path (SlFigure *fig, const SlFrame *f, const Panel *p, const EarthTrack *track)
{
  cairo_t *cr = fig->cr;

  for (guint i = 0; i < track->n; i++)
    {
      double e, n;

      panel_offset (p, track, i, p->plx, &e, &n);
      cairo_line_to (cr, sl_frame_px (f, e), sl_frame_py (f, n));
    }
  set_colour (cr, fig->style.grayscale ? path_grey : path_rgb);
  cairo_set_line_width (cr, 1.4 * fig->style.line_pt);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  cairo_set_line_cap (cr, CAIRO_LINE_CAP_ROUND);
  cairo_stroke (cr);
}

/* The star's position at the start (the origin of the offsets), and with
 * proper motion its straight barycentric track, dashed. */
static void
draw_origin (SlFigure *fig, const SlFrame *f, const Panel *p, double years)
{
  cairo_t *cr = fig->cr;
  double x = sl_frame_px (f, 0), y = sl_frame_py (f, 0), r = 0.3 * fig->style.font_pt;

  cairo_save (cr);
  cairo_set_source_rgb (cr, 0.35, 0.35, 0.35);
  cairo_set_line_width (cr, 0.8 * fig->style.line_pt);
  if (p->pm_east != 0 || p->pm_north != 0)
    {
      double dash[] = { 1.5, 1.5 };

      cairo_set_dash (cr, dash, 2, 0);
      cairo_move_to (cr, x, y);
      cairo_line_to (cr, sl_frame_px (f, p->pm_east * years), sl_frame_py (f, p->pm_north * years));
      cairo_stroke (cr);
      cairo_set_dash (cr, NULL, 0, 0);
    }
  cairo_move_to (cr, x - r, y);
  cairo_line_to (cr, x + r, y);
  cairo_move_to (cr, x, y - r);
  cairo_line_to (cr, x, y + r);
  cairo_stroke (cr);
  cairo_restore (cr);
}

/* With proper motion over more than a year: a dot at the start and at
 * every whole year after it. */
static void
draw_year_dots (SlFigure *fig, const SlFrame *f, const Panel *p, double start, double years)
{
  cairo_t *cr = fig->cr;

  for (int k = 0; k <= (int) floor (years + 1e-9); k++)
    {
      double xyz[3], fe, fn, t = start + k;

      earth_position (t, xyz);
      parallax_factors (&p->dir, xyz, &fe, &fn);
      cairo_new_sub_path (cr);
      cairo_arc (cr, sl_frame_px (f, p->plx * fe + p->pm_east * k),
                 sl_frame_py (f, p->plx * fn + p->pm_north * k), 0.22 * fig->style.font_pt, 0, 2 * G_PI);
    }
  set_colour (cr, fig->style.grayscale ? path_grey : path_rgb);
  cairo_fill (cr);
}

/* The months' initials; the context tells translators which month. */
static const struct {
  const char *context, *initial;
} month_initials[12] = {
  { "January", NC_ ("January", "J") },   { "February", NC_ ("February", "F") },
  { "March", NC_ ("March", "M") },       { "April", NC_ ("April", "A") },
  { "May", NC_ ("May", "M") },           { "June", NC_ ("June", "J") },
  { "July", NC_ ("July", "J") },         { "August", NC_ ("August", "A") },
  { "September", NC_ ("September", "S") }, { "October", NC_ ("October", "O") },
  { "November", NC_ ("November", "N") }, { "December", NC_ ("December", "D") },
};

/* A short mark across the path at the 1st of each month of the first
 * year, with the month's initial on the outer side of the parallax
 * ellipse (so the outgoing and returning halves of a flat ellipse label
 * on opposite sides).  RADIUS: the parallax on the page, pt; a small
 * ellipse gets the letters of every third month, or none, or no marks. */
static void
draw_month_ticks (SlFigure *fig, const SlFrame *f, const Panel *p, double start, double years,
                  double radius)
{
  cairo_t *cr = fig->cr;
  double em = fig->style.font_pt, half_tick = 0.32 * em;
  double last = start + MIN (1.0, years);
  gboolean all_letters = radius >= 2.4 * em, some_letters = radius >= 1.6 * em;
  int iy, im, id;
  double fd;

  if (radius < 1.2 * em)
    return;
  if (eraJd2cal (jyear_to_jd (start), 0.0, &iy, &im, &id, &fd) != 0)
    return;
  if (id != 1 || fd > 1e-9)
    im++;
  cairo_save (cr);
  cairo_set_source_rgb (cr, 0.15, 0.15, 0.15);
  cairo_set_line_width (cr, 0.9 * fig->style.line_pt);
  for (int k = 0; k < 12; k++, im++)
    {
      double djm0, djm, t, xyz[3], fe, fn, e, n, dx, dy, ux, uy, len;

      if (im > 12)
        im = 1, iy++;
      if (eraCal2jd (iy, im, 1, &djm0, &djm) != 0)
        break;
      t = jd_to_jyear (djm0 + djm);
      /* A year later the path is back where it began: one mark there. */
      if (t >= last - 1e-6)
        break;

      earth_position (t, xyz);
      parallax_factors (&p->dir, xyz, &fe, &fn);
      e = p->plx * fe + p->pm_east * (t - start);
      n = p->plx * fn + p->pm_north * (t - start);

      /* The parallax ellipse's tangent from a day either side, its normal
       * turned outward (away from the star's mean position). */
      {
        double a[3], b[3], ae, an, be, bn;

        earth_position (t - 0.5 / SL_JULIAN_YEAR_D, a);
        earth_position (t + 0.5 / SL_JULIAN_YEAR_D, b);
        parallax_factors (&p->dir, a, &ae, &an);
        parallax_factors (&p->dir, b, &be, &bn);
        /* In page directions: east to the left, north up. */
        dx = -(bn - an), dy = be - ae;   /* the tangent (-(be-ae), -(bn-an)) turned by 90 deg */
        if (dx * -fe + dy * -fn < 0)
          dx = -dx, dy = -dy;
      }
      len = hypot (dx, dy);
      if (!(len > 0))
        continue;
      ux = dx / len, uy = dy / len;

      {
        double x = sl_frame_px (f, e), y = sl_frame_py (f, n);
        int month = im - 1;
        gboolean quarter = month % 3 == 0;

        cairo_move_to (cr, x - half_tick * ux, y - half_tick * uy);
        cairo_line_to (cr, x + half_tick * ux, y + half_tick * uy);
        cairo_stroke (cr);
        if (all_letters || (some_letters && quarter))
          {
            double off = half_tick + 0.5 * em * MONTH_SCALE + 0.12 * em;
            const char *initial = g_dpgettext2 (NULL, month_initials[month].context,
                                                month_initials[month].initial);

            sl_figure_text (fig, x + off * ux, y + off * uy, 0.5, 0.5, MONTH_SCALE, 0, initial);
          }
      }
    }
  cairo_restore (cr);
}

/* The title (pango markup): the designation; the parallax with its error
 * to the digits the error allows (rounding.h); the ecliptic latitude.
 * The last two share a line where the panel is wide enough. */
typedef struct {
  char *name, *parallax, *latitude;   /* "" when unknown */
} Title;

static void
title_init (Title *t, const Panel *p)
{
  const SlPlotStar *star = p->star;

  t->name = g_markup_printf_escaped ("<b>%s</b>", star->designation ? star->designation : "");
  t->parallax = g_strdup ("");
  t->latitude = g_strdup ("");
  if (isfinite (star->parallax))
    {
      SlRounded r;

      g_free (t->parallax);
      if (isfinite (star->parallax_err) && star->parallax_err > 0
          && sl_round_with_interval (star->parallax, star->parallax - star->parallax_err,
                                     star->parallax + star->parallax_err, &r))
        {
          g_autofree char *value = sl_figure_with_minus (r.value);

          t->parallax = g_strdup_printf (_("<i>ϖ</i> = %s ± %s mas"), value, r.plus);
        }
      else
        {
          g_autofree char *value = sl_figure_format_fixed (star->parallax, 2);

          t->parallax = g_strdup_printf (_("<i>ϖ</i> = %s mas"), value);
        }
    }
  if (isfinite (star->elat))
    {
      g_autofree char *value = sl_figure_format_fixed (star->elat, 1);

      g_free (t->latitude);
      t->latitude = g_strdup_printf (_("<i>β</i> = %s°"), value);
    }
}

/* The two values on one line. */
static char *
title_joined (const Title *t)
{
  return g_strjoin (t->parallax[0] && t->latitude[0] ? ", " : "", t->parallax, t->latitude, NULL);
}

static void
title_clear (Title *t)
{
  g_free (t->name);
  g_free (t->parallax);
  g_free (t->latitude);
}

/* The widest title lines among the panels at TITLE_SCALE, pt: with the
 * values on one line (JOINED) or on two (APART). */
static void
widest_titles (SlFigure *fig, const Panel *panels, guint n, double *joined, double *apart)
{
  *joined = *apart = 0;
  for (guint i = 0; i < n; i++)
    {
      Title t;
      g_autofree char *both = NULL;
      double wn, wj, wp, wl, h;

      title_init (&t, &panels[i]);
      both = title_joined (&t);
      sl_figure_text_size (fig, TITLE_SCALE, t.name, &wn, &h);
      sl_figure_text_size (fig, TITLE_SCALE, both, &wj, &h);
      sl_figure_text_size (fig, TITLE_SCALE, t.parallax, &wp, &h);
      sl_figure_text_size (fig, TITLE_SCALE, t.latitude, &wl, &h);
      *joined = MAX (*joined, MAX (wn, wj));
      *apart = MAX (*apart, MAX (wn, MAX (wp, wl)));
      title_clear (&t);
    }
}

static void
panel_title (SlFigure *fig, const Layout *lay, const SlFrame *f, const Panel *p)
{
  g_autofree char *both = NULL;
  const char *lines[3];
  double w, h, centre = f->x + f->w / 2;
  guint n = 0;
  Title t;

  title_init (&t, p);
  both = title_joined (&t);
  lines[n++] = t.name;
  if (lay->title_lines == 2)
    lines[n++] = both;
  else
    lines[n++] = t.parallax, lines[n++] = t.latitude;
  sl_figure_text_size (fig, lay->title_scale, "Ag", &w, &h);
  cairo_set_source_rgb (fig->cr, 0, 0, 0);
  for (guint i = 0; i < n; i++)
    if (lines[i][0])
      sl_figure_text (fig, centre, f->y - 0.25 * lay->em - (n - 1 - i) * h, 0.5, 1, lay->title_scale, 0,
                      lines[i]);
  title_clear (&t);
}

static void
draw_empty_panel (SlFigure *fig, const SlFrame *f, const char *message)
{
  g_autofree char *escaped = g_markup_escape_text (message, -1);
  double w, h, scale;

  sl_figure_text_size (fig, TICK_LABEL_SCALE, escaped, &w, &h);
  scale = TICK_LABEL_SCALE * MIN (1.0, 0.9 * f->w / MAX (w, 1e-9));
  cairo_save (fig->cr);
  cairo_set_source_rgb (fig->cr, 0.6, 0.6, 0.6);
  cairo_set_line_width (fig->cr, fig->style.line_pt);
  cairo_rectangle (fig->cr, f->x, f->y, f->w, f->h);
  cairo_stroke (fig->cr);
  cairo_set_source_rgb (fig->cr, 0.3, 0.3, 0.3);
  sl_figure_text (fig, f->x + f->w / 2, f->y + f->h / 2, 0.5, 0.5, scale, 0, escaped);
  cairo_restore (fig->cr);
}

/* Room in pt around a path for the month marks and letters. */
static double
path_margin (const Layout *lay)
{
  return 0.32 * lay->em + 1.0 * lay->em * MONTH_SCALE + 0.3 * lay->em;
}

/* The mas per pt a panel needs to show all of its path. */
static double
panel_scale (const Panel *p, const Layout *lay)
{
  double m = path_margin (lay);
  double room_e = MAX (lay->pw / 2 - m, lay->pw / 4), room_n = MAX (lay->ph / 2 - m, lay->ph / 4);

  return MAX (p->half_e / room_e, p->half_n / room_n);
}

static void
draw_panel (SlFigure *fig, const Layout *lay, double cell_x, double cell_y, const Panel *p,
            const EarthTrack *track, const SlParallaxOptions *options, double mas_per_pt)
{
  SlFrame f = { cell_x + lay->left, cell_y + lay->top, lay->pw, lay->ph, 0, 0, 0, 0 };

  if (!p->drawable)
    {
      draw_empty_panel (fig, &f, _("no positive parallax"));
      panel_title (fig, lay, &f, p);
      return;
    }

  /* The same mas per pt both ways: east to the left (x0 > x1), north up. */
  f.x0 = p->cx + mas_per_pt * f.w / 2, f.x1 = p->cx - mas_per_pt * f.w / 2;
  f.y0 = p->cy - mas_per_pt * f.h / 2, f.y1 = p->cy + mas_per_pt * f.h / 2;

  cairo_save (fig->cr);
  cairo_rectangle (fig->cr, f.x, f.y, f.w, f.h);
  cairo_clip (fig->cr);
  if (p->band)
    draw_band (fig, &f, p, track);
  draw_origin (fig, &f, p, options->years);
  draw_path (fig, &f, p, track);
  if (options->proper_motion && options->years >= 2.0)
    draw_year_dots (fig, &f, p, options->start_jyear, options->years);
  draw_month_ticks (fig, &f, p, options->start_jyear, options->years, p->plx / mas_per_pt);
  cairo_restore (fig->cr);

  panel_axes (fig, &f, mas_per_pt);
  panel_title (fig, lay, &f, p);
}

/* ------------------------------------------------------------------ */
/* The page                                                           */

/* The caption's phrases, joined with "; " into as many lines as the page
 * width needs. */
static GPtrArray *
caption_lines (SlFigure *fig, const SlParallaxOptions *options, gboolean any_band, double width)
{
  g_autoptr (GPtrArray) phrases = g_ptr_array_new_with_free_func (g_free);
  GPtrArray *lines = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *from = sl_figure_format_fixed (options->start_jyear, 2);
  g_autofree char *to = sl_figure_format_fixed (options->start_jyear + options->years, 2);
  GString *current = NULL;

  g_ptr_array_add (phrases, g_strdup (_("offsets in the tangent plane, east to the left")));
  g_ptr_array_add (phrases, g_strdup (_("Earth's position from ERFA (eraEpv00)")));
  g_ptr_array_add (phrases, g_strdup_printf (_("epoch %s–%s"), from, to));
  g_ptr_array_add (phrases, g_strdup (_("marks on the 1st of each month")));
  if (any_band)
    g_ptr_array_add (phrases, g_strdup (_("shaded: parallax ± its error")));
  if (options->proper_motion)
    g_ptr_array_add (phrases, g_strdup (_("with proper motion (dashed: its straight track)")));
  if (options->proper_motion && options->years >= 2.0)
    g_ptr_array_add (phrases, g_strdup (_("dots a year apart")));

  for (guint i = 0; i < phrases->len; i++)
    {
      g_autofree char *escaped = g_markup_escape_text (phrases->pdata[i], -1);
      double w, h;

      if (current)
        {
          g_autofree char *trial = g_strconcat (current->str, "; ", escaped, NULL);

          sl_figure_text_size (fig, CAPTION_SCALE, trial, &w, &h);
          if (w <= width)
            {
              g_string_assign (current, trial);
              continue;
            }
          g_ptr_array_add (lines, g_string_free (current, FALSE));
        }
      current = g_string_new (escaped);
    }
  if (current)
    g_ptr_array_add (lines, g_string_free (current, FALSE));
  return lines;
}

/* The grid of COLS columns and the cells' metrics for it.  TITLE_JOINED
 * and TITLE_APART: the widest titles (widest_titles). */
static void
layout_for (SlFigure *fig, Layout *lay, double grid_w, double grid_h, guint n, guint cols,
            double title_joined, double title_apart)
{
  guint rows = (n + cols - 1) / cols;
  double em = fig->style.font_pt, w, h, room;

  lay->em = em;
  sl_figure_text_size (fig, TICK_LABEL_SCALE, MINUS "00.0", &w, &h);
  lay->left = w + 0.45 * em;
  lay->bottom = h + 0.4 * em;
  lay->right = 0.8 * em;
  lay->cell_w = grid_w / cols;
  lay->cell_h = grid_h / rows;
  lay->pw = lay->cell_w - lay->left - lay->right;

  /* The title: values on one line if they fit, else on two, shrunk only
   * if even that is too wide. */
  room = lay->pw + lay->right;
  lay->title_lines = title_joined <= room ? 2 : 3;
  lay->title_scale = TITLE_SCALE;
  if (lay->title_lines == 3 && title_apart > room)
    lay->title_scale = MAX (0.5, TITLE_SCALE * room / title_apart);
  sl_figure_text_size (fig, lay->title_scale, "Ag", &w, &h);
  lay->top = lay->title_lines * h + 0.4 * em;
  lay->ph = lay->cell_h - lay->top - lay->bottom;
}

/* Columns for N panels: the arrangement that draws the paths largest (the
 * geometric mean of their sizes; the smallest with a common scale), or
 * with no path the one with the largest square plot areas; fewer empty
 * cells on a tie. */
static guint
choose_columns (SlFigure *fig, double grid_w, double grid_h, const Panel *panels, guint n,
                gboolean common_scale, double title_joined, double title_apart)
{
  double best = -G_MAXDOUBLE;
  guint best_cols = 1;

  for (guint cols = 1; cols <= n; cols++)
    {
      Layout lay;
      double score = 0, worst = 0;
      guint drawn = 0;

      layout_for (fig, &lay, grid_w, grid_h, n, cols, title_joined, title_apart);
      if (lay.pw <= 0 || lay.ph <= 0)
        continue;
      for (guint i = 0; i < n; i++)
        if (panels[i].drawable)
          {
            double scale = panel_scale (&panels[i], &lay);

            score -= log (scale), worst = MAX (worst, scale), drawn++;
          }
      if (drawn == 0)
        score = log (MIN (lay.pw, lay.ph));
      else
        score = common_scale ? -log (worst) : score / drawn;
      if (score > best + 1e-9)
        best = score, best_cols = cols;
    }
  return best_cols;
}

gboolean
sl_parallax_draw (SlFigure *fig, const SlStarSet *stars, const SlParallaxOptions *options,
                  GPtrArray *notes, GError **error)
{
  cairo_t *cr;
  double em, grid_x, grid_y, grid_w, grid_h, caption_h = 0, line_h, w, common = 0;
  double title_joined, title_apart;
  g_autoptr (GPtrArray) caption = NULL;
  g_autofree Panel *panels = NULL;
  gboolean any_band = FALSE;
  EarthTrack track;
  Layout lay;
  guint n_all, n, cols;

  g_return_val_if_fail (fig != NULL && stars != NULL && options != NULL, FALSE);
  g_return_val_if_fail (error == NULL || *error == NULL, FALSE);
  g_return_val_if_fail (options->years > 0 && isfinite (options->start_jyear), FALSE);

  cr = fig->cr;
  em = fig->style.font_pt;
  n_all = stars->stars->len;
  if (n_all == 0)
    {
      sl_figure_message (fig, options->empty_message ? options->empty_message
                                                     : _("Choose stars with --star to draw their parallax paths."));
      sl_figure_add_note (notes, g_strdup (_("no stars chosen: give them with --star")));
      return TRUE;
    }
  n = MIN (n_all, MAX_PANELS);
  if (n < n_all)
    sl_figure_add_note (notes, g_strdup_printf (_("showing the first %u of %u stars"), n, n_all));

  earth_track_init (&track, options->start_jyear, options->years);
  if (!track.accurate)
    sl_figure_add_note (notes, g_strdup (_("the span reaches outside 1900-2100, where the Earth's position "
                                 "(eraEpv00) is less accurate")));
  panels = g_new0 (Panel, n);
  for (guint i = 0; i < n; i++)
    {
      panel_init (&panels[i], sl_star_set_get (stars, i), &track, options);
      any_band |= panels[i].band;
      if (!panels[i].drawable)
        sl_figure_add_note (notes, g_strdup_printf (_("%s: no positive parallax, no path drawn"),
                                          panels[i].star->designation));
    }

  /* The page: the y title down the left, the grid, the x title, the caption. */
  caption = caption_lines (fig, options, any_band, fig->width - 0.6 * em);
  sl_figure_text_size (fig, CAPTION_SCALE, "Ag", &w, &line_h);
  caption_h = caption->len * line_h;
  grid_x = 1.5 * em;
  grid_y = 0.3 * em;
  grid_w = fig->width - grid_x - 0.2 * em;
  grid_h = fig->height - grid_y - 1.6 * em - caption_h - 0.3 * em;

  widest_titles (fig, panels, n, &title_joined, &title_apart);
  cols = choose_columns (fig, grid_w, grid_h, panels, n, options->common_scale, title_joined, title_apart);
  layout_for (fig, &lay, grid_w, grid_h, n, cols, title_joined, title_apart);
  if (MIN (lay.pw, lay.ph) < 4.0 * em)
    sl_figure_add_note (notes, g_strdup (_("the panels are very small: choose fewer stars or a larger page "
                                 "(--size double)")));
  if (lay.pw <= 0 || lay.ph <= 0)
    {
      sl_figure_message (fig, _("The page is too small for these panels."));
      goto done;
    }

  for (guint i = 0; i < n; i++)
    if (panels[i].drawable)
      common = MAX (common, panel_scale (&panels[i], &lay));
  for (guint i = 0; i < n; i++)
    {
      double scale = options->common_scale ? common : panel_scale (&panels[i], &lay);

      if (!(scale > 0))
        scale = 1.0;
      draw_panel (fig, &lay, grid_x + (i % cols) * lay.cell_w, grid_y + (i / cols) * lay.cell_h,
                  &panels[i], &track, options, scale);
      /* A click anywhere near the middle of a panel picks its star. */
      sl_figure_record_position (fig, i, grid_x + (i % cols) * lay.cell_w + lay.left + lay.pw / 2,
                                 grid_y + (i / cols) * lay.cell_h + lay.top + lay.ph / 2);
    }

  /* Axis titles once for the page. */
  {
    guint rows = (n + cols - 1) / cols;
    double plot_left = grid_x + lay.left, plot_right = grid_x + (cols - 1) * lay.cell_w + lay.left + lay.pw;
    double plot_top = grid_y + lay.top, plot_bottom = grid_y + (rows - 1) * lay.cell_h + lay.top + lay.ph;

    cairo_set_source_rgb (cr, 0, 0, 0);
    sl_figure_text (fig, (plot_left + plot_right) / 2, grid_y + grid_h + 0.1 * em, 0.5, 0, 1.0, 0,
                    _("Δ<i>α</i> cos <i>δ</i> (mas)"));
    sl_figure_text (fig, 0.2 * em, (plot_top + plot_bottom) / 2, 0.5, 0, 1.0, G_PI / 2,
                    _("Δ<i>δ</i> (mas)"));
  }

  cairo_set_source_rgb (cr, 0.3, 0.3, 0.3);
  for (guint i = 0; i < caption->len; i++)
    sl_figure_text (fig, 0.3 * em, fig->height - 0.3 * em - (caption->len - i) * line_h, 0, 0,
                    CAPTION_SCALE, 0, caption->pdata[i]);

done:
  for (guint i = 0; i < n; i++)
    panel_clear (&panels[i]);
  earth_track_clear (&track);
  return TRUE;
}
