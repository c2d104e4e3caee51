/* sky.c: star positions on the sky: the all-sky Hammer-Aitoff map in
 * equatorial or galactic coordinates and the gnomonic field view (sky.h).
 *
 * Contents:
 *   options, projections ..... sl_sky_options_init, sl_hammer_aitoff, sl_gnomonic
 *   the map .................. SkyMap: ICRS to page points, broken polylines
 *   text ..................... captions
 *   stars .................... marker size by magnitude, colour, ellipses, highlights
 *   keys ..................... marker sizes and the temperature colour bar
 *   all-sky .................. outline, graticule and its labels, reference lines
 *   field .................... standard coordinates, proper-motion arrows
 *   sl_sky_draw
 *
 * Positions are drawn as the catalogue gives them, ICRS at each star's own
 * epoch, never propagated; every figure says so in its caption.  The field
 * view is always equatorial (its centre is an RA and Dec); the choice of
 * coordinates applies to the all-sky map.
 */
#include "sky.h"

#include <erfa.h>
#include <erfam.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "sl-error.h"
#include "units.h"
#include "util.h"

/* The Hammer-Aitoff map's half extents: |x| <= 2 sqrt 2, |y| <= sqrt 2. */
#define HA_X (2.0 * G_SQRT2)
#define HA_Y G_SQRT2

#define MAS_PER_RAD (ERFA_DR2AS * 1000.0)

/* Grey levels (0 black, 1 white) of the map's furniture. */
#define GRID_GREY  0.78   /* graticule */
#define LABEL_GREY 0.35   /* graticule labels */
#define LINE_GREY  0.25   /* ecliptic, galactic plane, arrows */

/* The labels' white halo (sl_figure_halo_text) is opaque: nothing under
 * a label shows. */
#define HALO_ALPHA 1.0

/* Samples along a reference great circle: every half degree. */
#define CIRCLE_SAMPLES 721

/* ------------------------------------------------------------------ */
/* Options and projections                                            */

void
sl_sky_options_init (SlSkyOptions *options)
{
  g_return_if_fail (options != NULL);

  memset (options, 0, sizeof *options);
  options->coordinates = SL_SKY_EQUATORIAL;
  options->field = FALSE;
  options->centre_ra = 0.0;
  options->centre_dec = 0.0;
  options->field_deg = 10.0;
  options->pm_years = 0.0;
  options->ellipse_scale = 0.0;
  options->highlight = NULL;
}

void
sl_hammer_aitoff (double lon, double lat, double *x, double *y)
{
  /* Snyder (1987), p. 226: the denominator is at least 1 for |lon| <= pi. */
  double d = sqrt (1.0 + cos (lat) * cos (lon / 2.0));

  *x = 2.0 * G_SQRT2 * cos (lat) * sin (lon / 2.0) / d;
  *y = G_SQRT2 * sin (lat) / d;
}

gboolean
sl_gnomonic (double ra, double dec, double ra0, double dec0, double *xi, double *eta)
{
  double dra = ra - ra0;
  double cos_c = sin (dec0) * sin (dec) + cos (dec0) * cos (dec) * cos (dra);

  /* !(> 0) also turns a NAN away. */
  if (!(cos_c > 0.0))
    {
      *xi = *eta = NAN;
      return FALSE;
    }
  *xi = cos (dec) * sin (dra) / cos_c;
  *eta = (cos (dec0) * sin (dec) - sin (dec0) * cos (dec) * cos (dra)) / cos_c;
  return TRUE;
}

/* The inverse: the point at standard coordinates (XI, ETA) about (RA0,
 * DEC0), all rad (e.g. Calabretta & Greisen 2002, eq. 54 with 5). */
static void
gnomonic_inverse (double xi, double eta, double ra0, double dec0, double *ra, double *dec)
{
  double den = cos (dec0) - eta * sin (dec0);

  *ra = ra0 + atan2 (xi, den);
  *dec = atan2 (sin (dec0) + eta * cos (dec0), hypot (xi, den));
}

/* The point EAST, NORTH (rad, true angles on the sky) away from (RA, DEC). */
static void
offset_on_sky (double ra, double dec, double east, double north, double *ra1, double *dec1)
{
  double rho = hypot (east, north);
  double k = rho > 0.0 ? tan (MIN (rho, 1.4)) / rho : 1.0;

  gnomonic_inverse (east * k, north * k, ra, dec, ra1, dec1);
}

/* A longitude into [-pi, pi). */
static double
wrap_pi (double a)
{
  return a - 2.0 * G_PI * floor ((a + G_PI) / (2.0 * G_PI));
}

/* ------------------------------------------------------------------ */
/* The map                                                            */

typedef struct {
  SlFrame  frame;      /* all-sky: x from +HA_X (left) to -HA_X; field: axis units */
  gboolean field;
  gboolean galactic;   /* all-sky in galactic coordinates */
  double   ra0, dec0;  /* field centre, rad */
  double   unit;       /* field: axis units per radian of standard coordinate */
  double   limit;      /* field: |xi|, |eta| beyond this (rad) count as off the map */
} SkyMap;

/* Longitude and latitude of the map's own frame (rad, LON in [-pi, pi])
 * to page points. */
static void
map_native (const SkyMap *m, double lon, double lat, double *px, double *py)
{
  double hx, hy;

  sl_hammer_aitoff (lon, lat, &hx, &hy);
  *px = sl_frame_px (&m->frame, hx);
  *py = sl_frame_py (&m->frame, hy);
}

/* ICRS (rad) to page points; FALSE when the point is not on the map.  X
 * receives the longitude from the map's centre (all-sky, for the wrap
 * test) or xi (field). */
static gboolean
map_point (const SkyMap *m, double ra, double dec, double *px, double *py, double *x)
{
  double lon = ra, lat = dec;

  if (m->field)
    {
      double xi, eta;

      if (!sl_gnomonic (ra, dec, m->ra0, m->dec0, &xi, &eta) || fabs (xi) > m->limit
          || fabs (eta) > m->limit)
        return FALSE;
      *px = sl_frame_px (&m->frame, xi * m->unit);
      *py = sl_frame_py (&m->frame, eta * m->unit);
      if (x)
        *x = xi;
      return TRUE;
    }
  if (m->galactic)
    eraIcrs2g (ra, dec, &lon, &lat);
  lon = wrap_pi (lon);
  map_native (m, lon, lat, px, py);
  if (x)
    *x = lon;
  return TRUE;
}

/* Adds to the path the line through N points (ICRS, rad), broken where a
 * point is off the map and, all-sky, where the line wraps round the edge
 * of the map: consecutive points more than half a turn apart in
 * longitude.  (A jump in x of more than half the map's width is the same
 * test on the equator, but misses the wrap near the poles, where the
 * map is narrow.) */
static void
path_polyline (SlFigure *fig, const SkyMap *m, const double *ra, const double *dec, guint n)
{
  gboolean pen_down = FALSE;
  double last_x = 0.0;

  for (guint i = 0; i < n; i++)
    {
      double px, py, x;

      if (!map_point (m, ra[i], dec[i], &px, &py, &x))
        {
          pen_down = FALSE;
          continue;
        }
      if (pen_down && !m->field && fabs (x - last_x) > G_PI)
        pen_down = FALSE;
      if (pen_down)
        cairo_line_to (fig->cr, px, py);
      else
        cairo_move_to (fig->cr, px, py);
      pen_down = TRUE;
      last_x = x;
    }
}

/* Whether page point (PX, PY) lies inside the map, INSET pt from its edge. */
static gboolean
map_contains (const SkyMap *m, double px, double py, double inset)
{
  const SlFrame *f = &m->frame;
  double u, v;

  if (m->field)
    return px >= f->x + inset && px <= f->x + f->w - inset && py >= f->y + inset
           && py <= f->y + f->h - inset;
  u = (px - (f->x + f->w / 2)) / (f->w / 2 - inset);
  v = (py - (f->y + f->h / 2)) / (f->h / 2 - inset);
  return u * u + v * v <= 1.0;
}

typedef enum {
  LINE_ECLIPTIC,
  LINE_GALACTIC_PLANE,
  LINE_CELESTIAL_EQUATOR,
} SkyLine;

/* N points (ICRS, rad) along a reference great circle, closed. */
static void
line_points (SkyLine which, double *ra, double *dec, guint n)
{
  for (guint k = 0; k < n; k++)
    {
      double t = 2.0 * G_PI * k / (n - 1);

      switch (which)
        {
        case LINE_ECLIPTIC:
          /* The ecliptic of J2000 (IAU 2006 precession), to ICRS. */
          eraEceq06 (ERFA_DJ00, 0.0, t, 0.0, &ra[k], &dec[k]);
          break;
        case LINE_GALACTIC_PLANE:
          eraG2icrs (t, 0.0, &ra[k], &dec[k]);
          break;
        case LINE_CELESTIAL_EQUATOR:
          ra[k] = t;
          dec[k] = 0.0;
          break;
        }
    }
}

/* ------------------------------------------------------------------ */
/* Text                                                               */

/* "J2026.25" or "J2015.5 to J2026.25": the epochs of the stars drawn. */
static char *
epoch_span (double lo, double hi)
{
  char a[G_ASCII_DTOSTR_BUF_SIZE], b[G_ASCII_DTOSTR_BUF_SIZE];

  sl_format_double (a, round (lo * 1000.0) / 1000.0);
  sl_format_double (b, round (hi * 1000.0) / 1000.0);
  if (strcmp (a, b) == 0)
    return g_strdup_printf ("J%s", a);
  /* TRANSLATORS: a range of Julian epochs, e.g. "J2015.5 to J2026.25". */
  return g_strdup_printf (_("J%s to J%s"), a, b);
}

/* Lines of small text stacked downwards from Y, centred on X; returns
 * the height used. */
static double
draw_captions (SlFigure *fig, GPtrArray *lines, double x, double y, gboolean measure_only)
{
  double used = 0.0;

  for (guint i = 0; i < lines->len; i++)
    {
      double w, h;

      sl_figure_text_size (fig, 0.85, lines->pdata[i], &w, &h);
      if (!measure_only)
        {
          cairo_set_source_rgb (fig->cr, 0.15, 0.15, 0.15);
          sl_figure_text (fig, x, y + used, 0.5, 0, 0.85, 0, lines->pdata[i]);
        }
      used += h;
    }
  return used;
}

/* Adds TEXT (markup, taken) to LINES, broken at spaces into lines no
 * wider than MAX_W.  No tag in TEXT may contain or enclose a space. */
static void
add_caption (SlFigure *fig, GPtrArray *lines, char *text, double max_w)
{
  g_auto (GStrv) words = g_strsplit (text, " ", -1);
  GString *line = g_string_new (NULL);

  for (guint i = 0; words[i]; i++)
    {
      if (line->len > 0)
        {
          g_autofree char *trial = g_strconcat (line->str, " ", words[i], NULL);
          double w, h;

          sl_figure_text_size (fig, 0.85, trial, &w, &h);
          if (w > max_w)
            {
              g_ptr_array_add (lines, g_string_free (line, FALSE));
              line = g_string_new (words[i]);
              continue;
            }
          g_string_append_c (line, ' ');
        }
      g_string_append (line, words[i]);
    }
  g_ptr_array_add (lines, g_string_free (line, FALSE));
  g_free (text);
}

/* The magnification as markup: "10<sup>5</sup>" for a power of ten. */
static char *
scale_markup (double scale)
{
  double exponent = log10 (scale);
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  if (fabs (exponent - round (exponent)) < 1e-9 && fabs (exponent) >= 2)
    return g_strdup_printf ("10<sup>%d</sup>", (int) round (exponent));
  return g_strdup (sl_format_double (buf, scale));
}

/* ------------------------------------------------------------------ */
/* Stars                                                              */

/* A star on the map. */
typedef struct {
  guint  index;      /* in the star set */
  double px, py;     /* pt */
  double r;          /* marker radius, pt */
} Placed;

/* Marker area in proportion to flux, 10^(-0.4 (V - vref)), between
 * R_MIN and R_MAX: stars brighter than VREF all get R_MAX. */
typedef struct {
  double   vref;     /* mag */
  double   r_max, r_min;   /* pt */
  gboolean any_v;
} MagScale;

static double
mag_radius (const MagScale *s, double v)
{
  if (!isfinite (v))
    return s->r_min;
  return CLAMP (s->r_max * pow (10.0, -0.2 * (v - s->vref)), s->r_min, s->r_max);
}

/* The magnitude at which markers reach their smallest size. */
static double
mag_faint_limit (const MagScale *s)
{
  return s->vref + 5.0 * log10 (s->r_max / s->r_min);
}

static int
compare_double (gconstpointer a, gconstpointer b)
{
  double x = *(const double *) a, y = *(const double *) b;

  return (x > y) - (x < y);
}

static int
compare_radius_descending (gconstpointer a, gconstpointer b)
{
  double x = ((const Placed *) a)->r, y = ((const Placed *) b)->r;

  return (x < y) - (x > y);
}

/* VREF is the whole magnitude at or above the 5th percentile of the stars
 * drawn, so a few very bright stars do not shrink all the others. */
static void
mag_scale_init (MagScale *s, SlFigure *fig, const SlStarSet *stars, const GArray *placed)
{
  g_autoptr (GArray) v = g_array_new (FALSE, FALSE, sizeof (double));

  s->r_max = 0.45 * fig->style.font_pt;
  s->r_min = 0.05 * fig->style.font_pt;
  for (guint i = 0; i < placed->len; i++)
    {
      double vmag = sl_star_set_get (stars, g_array_index (placed, Placed, i).index)->vmag;

      if (isfinite (vmag))
        g_array_append_val (v, vmag);
    }
  s->any_v = v->len > 0;
  s->vref = 0.0;
  if (s->any_v)
    {
      g_array_sort (v, compare_double);
      s->vref = floor (g_array_index (v, double, (guint) (0.05 * (v->len - 1))));
    }
}

static void
star_colour (SlFigure *fig, const SlPlotStar *s, double rgb[3])
{
  sl_temperature_colour (s->teff, fig->style.grayscale, rgb);
}

/* The markers, largest first; TRUE if drawn as a density image. */
static gboolean
draw_stars (SlFigure *fig, const SkyMap *m, const SlStarSet *stars, GArray *placed)
{
  guint n = placed->len;
  g_autofree double *px = g_new (double, n);
  g_autofree double *py = g_new (double, n);
  g_autofree double *r = g_new (double, n);
  g_autofree float *rgb = g_new (float, 3 * (gsize) n);

  g_array_sort (placed, compare_radius_descending);
  for (guint i = 0; i < n; i++)
    {
      const Placed *p = &g_array_index (placed, Placed, i);
      double c[3];

      star_colour (fig, sl_star_set_get (stars, p->index), c);
      px[i] = p->px;
      py[i] = p->py;
      r[i] = p->r;
      sl_figure_record_position (fig, p->index, p->px, p->py);
      for (int k = 0; k < 3; k++)
        rgb[3 * i + k] = (float) c[k];
    }
  return sl_figure_scatter_sized (fig, &m->frame, px, py, rgb, r, n);
}

/* Each star's annual parallax ellipse, magnified SCALE times, drawn on
 * the sky around the star in its colour. */
static void
draw_ellipses (SlFigure *fig, const SkyMap *m, const SlStarSet *stars, const GArray *placed, double scale)
{
  enum { N = 73 };
  double ra[N], dec[N];
  cairo_t *cr = fig->cr;

  cairo_save (cr);
  cairo_rectangle (cr, m->frame.x, m->frame.y, m->frame.w, m->frame.h);
  cairo_clip (cr);
  cairo_set_line_width (cr, 0.7 * fig->style.line_pt);
  for (guint i = 0; i < placed->len; i++)
    {
      const SlPlotStar *s = sl_star_set_get (stars, g_array_index (placed, Placed, i).index);
      double a = s->ellipse_a * scale / MAS_PER_RAD, b = s->ellipse_b * scale / MAS_PER_RAD;
      double pa = s->ellipse_pa * ERFA_DD2R, rgb[3];

      if (!isfinite (a) || !isfinite (b) || !isfinite (pa) || a <= 0.0)
        continue;
      for (int k = 0; k < N; k++)
        {
          double t = 2.0 * G_PI * k / (N - 1);
          /* The major axis points to position angle PA (north through
           * east), the minor axis 90 deg on. */
          double east = a * cos (t) * sin (pa) + b * sin (t) * cos (pa);
          double north = a * cos (t) * cos (pa) - b * sin (t) * sin (pa);

          offset_on_sky (s->ra * ERFA_DD2R, s->dec * ERFA_DD2R, east, north, &ra[k], &dec[k]);
        }
      star_colour (fig, s, rgb);
      cairo_set_source_rgb (cr, rgb[0], rgb[1], rgb[2]);
      path_polyline (fig, m, ra, dec, N);
      cairo_stroke (cr);
    }
  cairo_restore (cr);
}

/* Rings and labels the highlighted stars, each label above and right of
 * its star unless that leaves BOUNDS; a note for each one missing. */
static void
draw_highlights (SlFigure *fig, const SlFrame *bounds, const SlStarSet *stars, const GArray *placed,
                 const char *const *highlight, GPtrArray *notes)
{
  cairo_t *cr = fig->cr;
  double em = fig->style.font_pt;

  for (guint h = 0; highlight && highlight[h]; h++)
    {
      gboolean in_set = FALSE, drawn = FALSE;

      for (guint i = 0; i < stars->stars->len && !in_set; i++)
        in_set = g_strcmp0 (sl_star_set_get (stars, i)->designation, highlight[h]) == 0;
      for (guint i = 0; i < placed->len; i++)
        {
          const Placed *p = &g_array_index (placed, Placed, i);
          const SlPlotStar *s = sl_star_set_get (stars, p->index);
          g_autofree char *label = NULL;
          double ring = p->r + 0.25 * em, tw, th, ax = 0, ay = 1, dx = 0.7 * ring, dy = -0.7 * ring;

          if (g_strcmp0 (s->designation, highlight[h]) != 0)
            continue;
          drawn = TRUE;
          cairo_save (cr);
          cairo_set_source_rgb (cr, 0, 0, 0);
          cairo_set_line_width (cr, fig->style.line_pt);
          cairo_new_sub_path (cr);
          cairo_arc (cr, p->px, p->py, ring, 0, 2 * G_PI);
          cairo_stroke (cr);
          cairo_restore (cr);
          label = g_markup_escape_text (s->designation, -1);
          sl_figure_text_size (fig, 0.85, label, &tw, &th);
          if (p->px + dx + tw > bounds->x + bounds->w)
            dx = -dx, ax = 1;
          if (p->py + dy - th < bounds->y)
            dy = -dy, ay = 0;
          sl_figure_halo_text (fig, p->px + dx, p->py + dy, ax, ay, 0.85, 0, label, 0.0, HALO_ALPHA);
        }
      if (!in_set)
        sl_figure_add_note (notes, g_strdup_printf (_("%s is not among the stars loaded, so it is not marked."),
                                          highlight[h]));
      else if (!drawn)
        sl_figure_add_note (notes, g_strdup_printf (_("%s is not on the map (no position, or outside the field)."),
                                          highlight[h]));
    }
}

/* The caution that goes with every position drawn. */
static char *
epoch_caption (const SlStarSet *stars, const GArray *placed, gboolean galactic)
{
  double lo = INFINITY, hi = -INFINITY;
  g_autofree char *span = NULL;

  for (guint i = 0; i < placed->len; i++)
    {
      double e = sl_star_set_get (stars, g_array_index (placed, Placed, i).index)->epoch;

      if (isfinite (e))
        lo = MIN (lo, e), hi = MAX (hi, e);
    }
  if (lo > hi)
    return g_strdup (galactic ? _("galactic coordinates (IAU 1958 via ICRS), positions at each star's catalogue epoch")
                              : _("ICRS, positions at each star's catalogue epoch"));
  span = epoch_span (lo, hi);
  /* TRANSLATORS: %s is an epoch or a range of epochs, e.g. "J2026.25". */
  return g_strdup_printf (galactic ? _("galactic coordinates (IAU 1958 via ICRS), positions at each star's catalogue epoch (%s)")
                                   : _("ICRS, positions at each star's catalogue epoch (%s)"),
                          span);
}

/* ------------------------------------------------------------------ */
/* Keys                                                               */

/* Ticks of the colour bar, its cool end included. */
static const double key_teff[] = { 30000, 10000, 5000, 2500 };

/* Position of T along the colour bar: 0 at 40 000 K, 1 at 2500 K, as
 * sl_temperature_colour spans them. */
static double
teff_fraction (double teff)
{
  return (log10 (40000.0) - log10 (teff)) / (log10 (40000.0) - log10 (2500.0));
}

static double
keys_height (SlFigure *fig, const MagScale *ms, gboolean any_teff)
{
  double w, h;

  if (!ms->any_v && !any_teff)
    return 0.0;
  sl_figure_text_size (fig, 0.8, "0", &w, &h);
  return MAX (2.0 * ms->r_max, 0.55 * fig->style.font_pt) + 0.15 * fig->style.font_pt + h;
}

/* The marker sizes (left, from X_LEFT) and the temperature colour bar
 * (right, ending at X_RIGHT), their top at Y. */
static void
draw_keys (SlFigure *fig, const MagScale *ms, gboolean any_teff, double x_left, double x_right, double y)
{
  cairo_t *cr = fig->cr;
  double em = fig->style.font_pt, band = MAX (2.0 * ms->r_max, 0.55 * em), mid = y + band / 2;
  double w, h;

  cairo_save (cr);
  if (ms->any_v)
    {
      int first = (int) ms->vref, last = (int) ceil (mag_faint_limit (ms) - 1e-9);
      double x = x_left;

      cairo_set_source_rgb (cr, 0, 0, 0);
      sl_figure_text (fig, x, mid, 0, 0.5, 0.9, 0, _("<i>V</i> (mag)"));
      sl_figure_text_size (fig, 0.9, _("<i>V</i> (mag)"), &w, &h);
      x += w + 0.6 * em;
      for (int v = first; v <= last; v++)
        {
          /* TRANSLATORS: magnitude key, "this bright or brighter" and "this faint or fainter". */
          g_autofree char *label = v == first ? g_strdup_printf (_("≤%d"), v)
                                   : v == last ? g_strdup_printf (_("≥%d"), v)
                                   : g_strdup_printf ("%d", v);
          double r = mag_radius (ms, v), step;

          sl_figure_text_size (fig, 0.8, label, &w, &h);
          step = MAX (2.0 * ms->r_max, w) + 0.5 * em;
          cairo_set_source_rgb (cr, 0.3, 0.3, 0.3);
          cairo_new_sub_path (cr);
          cairo_arc (cr, x + step / 2, mid, r, 0, 2 * G_PI);
          cairo_fill (cr);
          cairo_set_source_rgb (cr, 0, 0, 0);
          sl_figure_text (fig, x + step / 2, y + band + 0.15 * em, 0.5, 0, 0.8, 0, label);
          x += step;
        }
    }
  if (any_teff)
    {
      const char *title = _("<i>T</i><sub>eff</sub> (K)");
      double bar_h = 0.55 * em, top = mid - bar_h / 2, bar_w, x0, last_right = -INFINITY;
      const int stops = 48;
      cairo_pattern_t *gradient;

      /* As wide as the right half leaves beside the title, within reason. */
      sl_figure_text_size (fig, 0.9, title, &w, &h);
      bar_w = CLAMP ((x_right - x_left) / 2 - w - 1.0 * em, 7.0 * em, 14.0 * em);
      x0 = x_right - bar_w;
      /* One gradient with many stops: slices would show seams. */
      gradient = cairo_pattern_create_linear (x0, 0, x0 + bar_w, 0);
      for (int i = 0; i <= stops; i++)
        {
          double t = (double) i / stops, rgb[3];
          double teff = pow (10.0, log10 (40000.0) - t * (log10 (40000.0) - log10 (2500.0)));

          sl_temperature_colour (teff, fig->style.grayscale, rgb);
          cairo_pattern_add_color_stop_rgb (gradient, t, rgb[0], rgb[1], rgb[2]);
        }
      cairo_set_source (cr, gradient);
      cairo_rectangle (cr, x0, top, bar_w, bar_h);
      cairo_fill (cr);
      cairo_pattern_destroy (gradient);
      cairo_set_source_rgb (cr, 0, 0, 0);
      cairo_set_line_width (cr, 0.5 * fig->style.line_pt);
      cairo_rectangle (cr, x0, top, bar_w, bar_h);
      for (guint k = 0; k < G_N_ELEMENTS (key_teff); k++)
        {
          char label[16];
          double x = x0 + bar_w * teff_fraction (key_teff[k]);

          cairo_move_to (cr, x, top + bar_h);
          cairo_rel_line_to (cr, 0, 0.2 * em);
          g_snprintf (label, sizeof label, "%d", (int) key_teff[k]);
          sl_figure_text_size (fig, 0.8, label, &w, &h);
          /* A label that would touch the previous one is left out. */
          if (x - w / 2 < last_right + 0.3 * em)
            continue;
          sl_figure_text (fig, x, y + band + 0.15 * em, 0.5, 0, 0.8, 0, label);
          last_right = x + w / 2;
        }
      cairo_stroke (cr);
      sl_figure_text (fig, x0 - 0.5 * em, mid, 1, 0.5, 0.9, 0, title);
    }
  cairo_restore (cr);
}

/* ------------------------------------------------------------------ */
/* All-sky                                                            */

/* A reference line and its label along it, where the line runs well
 * inside the map, near the page point (TX, TY) and rather level (a
 * steep label reads badly). */
static void
draw_reference_line (SlFigure *fig, const SkyMap *m, SkyLine which, const double dash[2],
                     double tx, double ty, const char *label)
{
  double ra[CIRCLE_SAMPLES], dec[CIRCLE_SAMPLES], px[CIRCLE_SAMPLES], py[CIRCLE_SAMPLES];
  gboolean ok[CIRCLE_SAMPLES];
  double em = fig->style.font_pt, best = INFINITY;
  cairo_t *cr = fig->cr;
  int at = -1;

  line_points (which, ra, dec, CIRCLE_SAMPLES);
  cairo_save (cr);
  cairo_rectangle (cr, m->frame.x, m->frame.y, m->frame.w, m->frame.h);
  cairo_clip (cr);
  cairo_set_source_rgb (cr, LINE_GREY, LINE_GREY, LINE_GREY);
  cairo_set_line_width (cr, 1.2 * fig->style.line_pt);
  cairo_set_line_cap (cr, CAIRO_LINE_CAP_ROUND);
  cairo_set_dash (cr, dash, 2, 0);
  path_polyline (fig, m, ra, dec, CIRCLE_SAMPLES);
  cairo_stroke (cr);
  cairo_restore (cr);

  for (int i = 0; i < CIRCLE_SAMPLES; i++)
    ok[i] = map_point (m, ra[i], dec[i], &px[i], &py[i], NULL) && map_contains (m, px[i], py[i], 1.5 * em);
  for (int i = 4; i < CIRCLE_SAMPLES - 4; i++)
    {
      double dx = px[i + 4] - px[i - 4], dy = py[i + 4] - py[i - 4], chord = hypot (dx, dy);
      double cost = hypot (px[i] - tx, py[i] - ty) + 8.0 * em * fabs (dy) / MAX (chord, 1e-9);

      /* Both neighbours on the map and near: no wrap in between. */
      if (ok[i - 4] && ok[i] && ok[i + 4] && chord < 4.0 * em && chord > 0.0 && cost < best)
        best = cost, at = i;
    }
  if (at >= 0)
    {
      double angle = atan2 (-(py[at + 4] - py[at - 4]), px[at + 4] - px[at - 4]);

      /* Text reads left to right. */
      if (angle > G_PI / 2)
        angle -= G_PI;
      else if (angle < -G_PI / 2)
        angle += G_PI;
      sl_figure_halo_text (fig, px[at], py[at], 0.5, 1.05, 0.8, angle, label, LINE_GREY, HALO_ALPHA);
    }
}

/* The graticule every 30 deg, in the map's own frame, and the outline. */
static void
draw_graticule (SlFigure *fig, const SkyMap *m)
{
  cairo_t *cr = fig->cr;

  cairo_save (cr);
  cairo_set_source_rgb (cr, GRID_GREY, GRID_GREY, GRID_GREY);
  cairo_set_line_width (cr, 0.5 * fig->style.line_pt);
  for (int lon = -150; lon <= 150; lon += 30)
    for (int k = 0; k <= 180; k++)
      {
        double px, py;

        map_native (m, lon * ERFA_DD2R, (k - 90) * ERFA_DD2R, &px, &py);
        if (k == 0)
          cairo_move_to (cr, px, py);
        else
          cairo_line_to (cr, px, py);
      }
  for (int lat = -60; lat <= 60; lat += 30)
    for (int k = 0; k <= 360; k++)
      {
        double px, py;

        map_native (m, (k - 180) * ERFA_DD2R, lat * ERFA_DD2R, &px, &py);
        if (k == 0)
          cairo_move_to (cr, px, py);
        else
          cairo_line_to (cr, px, py);
      }
  cairo_stroke (cr);
  cairo_restore (cr);
}

static void
draw_outline (SlFigure *fig, const SkyMap *m)
{
  cairo_t *cr = fig->cr;
  const SlFrame *f = &m->frame;

  cairo_save (cr);
  cairo_translate (cr, f->x + f->w / 2, f->y + f->h / 2);
  cairo_scale (cr, f->w / 2, f->h / 2);
  cairo_new_path (cr);
  cairo_arc (cr, 0, 0, 1, 0, 2 * G_PI);
  cairo_restore (cr);
  cairo_set_source_rgb (cr, 0, 0, 0);
  cairo_set_line_width (cr, fig->style.line_pt);
  cairo_stroke (cr);
}

/* Longitude of meridian LON (deg, -180 .. 180 from the centre) as text:
 * hours of RA or degrees of galactic longitude. */
static char *
longitude_label (const SkyMap *m, int lon)
{
  int value = ((lon % 360) + 360) % 360;

  if (m->galactic)
    return g_strdup_printf ("%d°", value);
  /* TRANSLATORS: hours of right ascension on the map's graticule. */
  return g_strdup_printf (_("%dh"), value / 15);
}

static void
draw_graticule_labels (SlFigure *fig, const SkyMap *m)
{
  double em = fig->style.font_pt, px, py;
  const SlFrame *f = &m->frame;
  g_autofree char *edge = longitude_label (m, 180);

  /* Meridians along the equator, just below it. */
  for (int lon = -150; lon <= 150; lon += 30)
    {
      g_autofree char *label = longitude_label (m, lon);

      map_native (m, lon * ERFA_DD2R, 0.0, &px, &py);
      sl_figure_halo_text (fig, px, py + 0.2 * em, 0.5, 0, 0.8, 0, label, LABEL_GREY, HALO_ALPHA);
    }
  /* The meridian at 180 deg is both ends of the map. */
  cairo_set_source_rgb (fig->cr, LABEL_GREY, LABEL_GREY, LABEL_GREY);
  sl_figure_text (fig, f->x - 0.3 * em, f->y + f->h / 2, 1, 0.5, 0.8, 0, edge);
  sl_figure_text (fig, f->x + f->w + 0.3 * em, f->y + f->h / 2, 0, 0.5, 0.8, 0, edge);

  /* Parallels at the left edge. */
  for (int lat = -60; lat <= 60; lat += 30)
    {
      char label[16];

      if (lat == 0)
        continue;
      map_native (m, G_PI, lat * ERFA_DD2R, &px, &py);
      g_snprintf (label, sizeof label, "%s%d°", lat > 0 ? "+" : "−", abs (lat));
      sl_figure_text (fig, px - 0.3 * em, py, 1, 0.5, 0.8, 0, label);
    }
}

static gboolean
draw_all_sky (SlFigure *fig, const SlStarSet *stars, const SlSkyOptions *options, GPtrArray *notes)
{
  static const double dashed[2] = { 2.2, 1.4 }, dotted[2] = { 0.0, 1.3 };
  g_autoptr (GArray) placed = g_array_new (FALSE, FALSE, sizeof (Placed));
  g_autoptr (GPtrArray) captions = g_ptr_array_new_with_free_func (g_free);
  double em = fig->style.font_pt, w, h, side, key_h, caption_h, caption_w, block_h, map_w, top;
  gboolean any_teff = FALSE, density;
  SkyMap m = { 0 };
  MagScale ms;

  m.galactic = options->coordinates == SL_SKY_GALACTIC;

  /* Which stars have positions; their page positions follow the layout. */
  for (guint i = 0; i < stars->stars->len; i++)
    {
      const SlPlotStar *s = sl_star_set_get (stars, i);
      Placed p = { i, 0, 0, 0 };

      if (isfinite (s->ra) && isfinite (s->dec))
        {
          g_array_append_val (placed, p);
          any_teff |= isfinite (s->teff);
        }
    }
  if (placed->len == 0)
    {
      const char *message = _("No star has a position (right ascension and declination) to draw.");

      sl_figure_message (fig, message);
      sl_figure_add_note (notes, g_strdup (message));
      return TRUE;
    }
  mag_scale_init (&ms, fig, stars, placed);

  caption_w = fig->width - 2.0 * em;
  add_caption (fig, captions, epoch_caption (stars, placed, m.galactic), caption_w);
  if (options->ellipse_scale > 0)
    {
      g_autofree char *times = scale_markup (options->ellipse_scale);

      /* TRANSLATORS: %s is the magnification, e.g. "10<sup>5</sup>" (pango markup). */
      add_caption (fig, captions, g_strdup_printf (_("parallax ellipses magnified × %s"), times), caption_w);
    }
  if (placed->len > SL_DENSITY_THRESHOLD)
    add_caption (fig, captions, g_strdup_printf (_("%u stars, shaded by their number per cell"), placed->len),
                 caption_w);

  /* Layout: map, keys and captions as one block, centred on the page;
   * room at the sides for the labels at the map's edges. */
  {
    g_autofree char *edge = longitude_label (&m, 180);

    sl_figure_text_size (fig, 0.8, "−60°", &w, &h);
    side = w;
    sl_figure_text_size (fig, 0.8, edge, &w, &h);
    side = MAX (side, w) + 0.6 * em;
  }
  key_h = keys_height (fig, &ms, any_teff);
  caption_h = draw_captions (fig, captions, 0, 0, TRUE);
  map_w = MIN (fig->width - 2.0 * side, 2.0 * (fig->height - key_h - caption_h - 3.0 * em));
  if (map_w < 10.0 * em)
    map_w = fig->width - 2.0 * side;
  block_h = map_w / 2 + 0.9 * em + key_h + 0.6 * em + caption_h;
  top = MAX (0.4 * em, (fig->height - block_h) / 2);
  m.frame = (SlFrame) { (fig->width - map_w) / 2, top, map_w, map_w / 2, HA_X, -HA_X, -HA_Y, HA_Y };

  for (guint i = 0; i < placed->len; i++)
    {
      Placed *p = &g_array_index (placed, Placed, i);
      const SlPlotStar *s = sl_star_set_get (stars, p->index);

      map_point (&m, s->ra * ERFA_DD2R, s->dec * ERFA_DD2R, &p->px, &p->py, NULL);
      p->r = mag_radius (&ms, s->vmag);
    }

  draw_graticule (fig, &m);
  {
    const SlFrame *f = &m.frame;

    /* Places for the labels, apart from each other, found by eye. */
    if (m.galactic)
      {
        draw_reference_line (fig, &m, LINE_ECLIPTIC, dashed, f->x + 0.25 * f->w, f->y + 0.85 * f->h,
                             _("ecliptic"));
        draw_reference_line (fig, &m, LINE_CELESTIAL_EQUATOR, dotted, f->x + 0.80 * f->w,
                             f->y + 0.25 * f->h, _("celestial equator"));
      }
    else
      {
        draw_reference_line (fig, &m, LINE_ECLIPTIC, dashed, f->x + 0.30 * f->w, f->y + 0.25 * f->h,
                             _("ecliptic"));
        draw_reference_line (fig, &m, LINE_GALACTIC_PLANE, dotted, f->x + 0.5 * f->w, f->y + 0.1 * f->h,
                             _("galactic plane"));
      }
  }
  if (options->ellipse_scale > 0 && placed->len <= SL_DENSITY_THRESHOLD)
    draw_ellipses (fig, &m, stars, placed, options->ellipse_scale);
  density = draw_stars (fig, &m, stars, placed);
  draw_outline (fig, &m);
  draw_graticule_labels (fig, &m);
  draw_highlights (fig, &m.frame, stars, placed, options->highlight, notes);

  draw_keys (fig, &ms, any_teff, m.frame.x, m.frame.x + m.frame.w, m.frame.y + m.frame.h + 0.9 * em);
  draw_captions (fig, captions, fig->width / 2, m.frame.y + m.frame.h + 0.9 * em + key_h + 0.6 * em, FALSE);

  if (density)
    sl_figure_add_note (notes, g_strdup_printf (_("More than %d stars: the map shows how many fall in each small cell "
                                        "(more opaque where there are more), not single markers."),
                                      SL_DENSITY_THRESHOLD));
  if (options->ellipse_scale > 0 && placed->len > SL_DENSITY_THRESHOLD)
    sl_figure_add_note (notes, g_strdup (_("Too many stars to draw parallax ellipses; they are left out.")));
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Field                                                              */

/* Proper-motion arrows: from each star to where its motion takes it in
 * YEARS (on the sphere, then projected), with a head when long enough. */
static void
draw_pm_arrows (SlFigure *fig, const SkyMap *m, const SlStarSet *stars, const GArray *placed, double years)
{
  cairo_t *cr = fig->cr;
  double head = 0.45 * fig->style.font_pt;

  cairo_save (cr);
  cairo_rectangle (cr, m->frame.x, m->frame.y, m->frame.w, m->frame.h);
  cairo_clip (cr);
  cairo_set_source_rgb (cr, LINE_GREY, LINE_GREY, LINE_GREY);
  cairo_set_line_width (cr, 0.8 * fig->style.line_pt);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_MITER);
  for (guint i = 0; i < placed->len; i++)
    {
      const Placed *p = &g_array_index (placed, Placed, i);
      const SlPlotStar *s = sl_star_set_get (stars, p->index);
      double ra1, dec1, x1, y1, len, ux, uy;

      if (!isfinite (s->pmra) || !isfinite (s->pmdec))
        continue;
      offset_on_sky (s->ra * ERFA_DD2R, s->dec * ERFA_DD2R, s->pmra * years / MAS_PER_RAD,
                     s->pmdec * years / MAS_PER_RAD, &ra1, &dec1);
      if (!map_point (m, ra1, dec1, &x1, &y1, NULL))
        continue;
      len = hypot (x1 - p->px, y1 - p->py);
      if (len < 0.05)
        continue;
      cairo_move_to (cr, p->px, p->py);
      cairo_line_to (cr, x1, y1);
      cairo_stroke (cr);
      if (len < 1.5 * head)
        continue;
      ux = (x1 - p->px) / len, uy = (y1 - p->py) / len;
      cairo_move_to (cr, x1, y1);
      cairo_line_to (cr, x1 - head * ux + 0.35 * head * uy, y1 - head * uy - 0.35 * head * ux);
      cairo_line_to (cr, x1 - head * ux - 0.35 * head * uy, y1 - head * uy + 0.35 * head * ux);
      cairo_close_path (cr);
      cairo_fill (cr);
    }
  cairo_restore (cr);
}

/* The arrows' key, a line of its own centred on X with its top at Y:
 * what the arrows show, then an arrow for a round proper motion (about a
 * seventh of the frame's width over YEARS) and its value. */
static void
draw_pm_key (SlFigure *fig, const SkyMap *m, double years, double x, double y)
{
  cairo_t *cr = fig->cr;
  double em = fig->style.font_pt, head = 0.45 * em;
  double pt_per_rad = m->frame.w / fabs (m->frame.x1 - m->frame.x0) * m->unit;
  double pm = sl_nice_step (m->frame.w / 7.0 / pt_per_rad * MAS_PER_RAD / years, 1);
  double len = pm * years / MAS_PER_RAD * pt_per_rad, w1, w2, h, left, mid;
  char num[G_ASCII_DTOSTR_BUF_SIZE], span[G_ASCII_DTOSTR_BUF_SIZE];
  g_autofree char *text = NULL, *value = NULL;

  /* TRANSLATORS: followed by a drawn arrow and its length, e.g. "500 mas/yr". */
  text = g_strdup_printf (_("arrows: proper motion over %s years;"), sl_format_double (span, years));
  /* TRANSLATORS: the key arrow's length. */
  value = g_strdup_printf (_("%s mas/yr"), sl_format_double (num, pm));
  sl_figure_text_size (fig, 0.85, value, &w2, &h);
  sl_figure_text_size (fig, 0.85, text, &w1, &h);
  left = x - (w1 + len + w2 + 0.8 * em) / 2;
  mid = y + h / 2;

  cairo_save (cr);
  cairo_set_source_rgb (cr, 0.15, 0.15, 0.15);
  sl_figure_text (fig, left, y, 0, 0, 0.85, 0, text);
  sl_figure_text (fig, left + w1 + len + 0.8 * em, y, 0, 0, 0.85, 0, value);
  cairo_set_source_rgb (cr, LINE_GREY, LINE_GREY, LINE_GREY);
  cairo_set_line_width (cr, 0.8 * fig->style.line_pt);
  left += w1 + 0.4 * em;
  cairo_move_to (cr, left, mid);
  cairo_line_to (cr, left + len, mid);
  cairo_stroke (cr);
  cairo_move_to (cr, left + len, mid);
  cairo_line_to (cr, left + len - head, mid - 0.35 * head);
  cairo_line_to (cr, left + len - head, mid + 0.35 * head);
  cairo_close_path (cr);
  cairo_fill (cr);
  cairo_restore (cr);
}

static gboolean
draw_field (SlFigure *fig, const SlStarSet *stars, const SlSkyOptions *options, GPtrArray *notes,
            GError **error)
{
  static const double dashed[2] = { 2.2, 1.4 }, dotted[2] = { 0.0, 1.3 };
  g_autoptr (GArray) placed = g_array_new (FALSE, FALSE, sizeof (Placed));
  g_autoptr (GArray) positioned = g_array_new (FALSE, FALSE, sizeof (Placed));
  g_autoptr (GPtrArray) captions = g_ptr_array_new_with_free_func (g_free);
  g_autoptr (GPtrArray) extras = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *ra_text = sl_format_sexagesimal (options->centre_ra, TRUE, 1);
  g_autofree char *dec_text = sl_format_sexagesimal (options->centre_dec, FALSE, 0);
  g_autofree char *title = NULL, *x_title = NULL, *y_title = NULL;
  double em = fig->style.font_pt, half, caption_h, caption_w = fig->width - 2.0 * em, key_h, key_line_h = 0;
  gboolean any_teff = FALSE, any_key = FALSE, arrows, density;
  guint n_fixed;
  const char *unit_name;
  char width_text[G_ASCII_DTOSTR_BUF_SIZE];
  SkyMap m = { 0 };
  MagScale ms;

  if (!(options->field_deg > 0.0 && options->field_deg <= 120.0) || !isfinite (options->centre_ra)
      || !(fabs (options->centre_dec) <= 90.0))
    {
      g_set_error (error, SL_ERROR, SL_ERROR_BAD_INPUT,
                   _("The field must be centred at a declination between -90 and +90 degrees and be "
                     "wider than 0 and at most 120 degrees."));
      return FALSE;
    }

  m.field = TRUE;
  m.ra0 = options->centre_ra * ERFA_DD2R;
  m.dec0 = options->centre_dec * ERFA_DD2R;
  if (options->field_deg > 3.0)
    m.unit = ERFA_DR2D, unit_name = "deg";
  else if (options->field_deg > 3.0 / 60.0)
    m.unit = ERFA_DR2D * 60.0, unit_name = "arcmin";
  else
    m.unit = ERFA_DR2AS, unit_name = "arcsec";
  arrows = options->pm_years > 0.0;
  sl_format_double (width_text, options->field_deg);

  /* Captions first: their height shrinks the frame.  The epoch caption
   * of the stars in the field is not known yet; that of all stars with
   * positions is at least as long. */
  for (guint i = 0; i < stars->stars->len; i++)
    {
      const SlPlotStar *s = sl_star_set_get (stars, i);
      Placed p = { i, 0, 0, 0 };

      if (isfinite (s->ra) && isfinite (s->dec))
        g_array_append_val (positioned, p);
      any_key |= isfinite (s->vmag) || isfinite (s->teff);
    }
  if (options->ellipse_scale > 0)
    {
      g_autofree char *times = scale_markup (options->ellipse_scale);

      add_caption (fig, extras, g_strdup_printf (_("parallax ellipses magnified × %s"), times), caption_w);
    }
  n_fixed = extras->len;
  /* Room for the density line, should the field hold that many. */
  if (positioned->len > SL_DENSITY_THRESHOLD)
    add_caption (fig, extras, g_strdup_printf (_("%u stars, shaded by their number per cell"), positioned->len),
                 caption_w);
  add_caption (fig, captions, epoch_caption (stars, positioned, FALSE), caption_w);
  caption_h = draw_captions (fig, captions, 0, 0, TRUE) + draw_captions (fig, extras, 0, 0, TRUE);
  if (arrows)
    {
      double w;

      sl_figure_text_size (fig, 0.85, "0", &w, &key_line_h);
      caption_h += key_line_h;
    }
  g_ptr_array_set_size (captions, 0);

  /* The frame: standard coordinates, equal scales on both axes. */
  sl_figure_place_frame (fig, &m.frame, TRUE);
  ms.r_max = 0.45 * em, ms.r_min = 0.05 * em, ms.any_v = TRUE;
  key_h = any_key ? keys_height (fig, &ms, TRUE) + 0.4 * em : 0.0;
  /* Below the frame: tick labels and the axis title, keys, captions. */
  m.frame.h = fig->height - m.frame.y - (3.1 * em + key_h + caption_h + 0.3 * em);
  half = options->field_deg * ERFA_DD2R / 2.0;
  m.frame.x0 = half * m.unit, m.frame.x1 = -half * m.unit;
  m.frame.y0 = -half * m.unit * m.frame.h / m.frame.w, m.frame.y1 = half * m.unit * m.frame.h / m.frame.w;
  m.limit = MAX (5.0 * half * MAX (1.0, m.frame.h / m.frame.w), 0.1);

  for (guint i = 0; i < stars->stars->len; i++)
    {
      const SlPlotStar *s = sl_star_set_get (stars, i);
      Placed p = { i, 0, 0, 0 };

      if (isfinite (s->ra) && isfinite (s->dec)
          && map_point (&m, s->ra * ERFA_DD2R, s->dec * ERFA_DD2R, &p.px, &p.py, NULL)
          && map_contains (&m, p.px, p.py, 0.0))
        {
          g_array_append_val (placed, p);
          any_teff |= isfinite (s->teff);
        }
    }
  if (placed->len == 0)
    {
      g_autofree char *message = NULL;

      if (positioned->len == 0)
        message = g_strdup (_("No star has a position (right ascension and declination) to draw."));
      else
        /* TRANSLATORS: the field's width in degrees, then its centre's RA and Dec. */
        message = g_strdup_printf (_("No star lies in the %s° field around %s %s."), width_text, ra_text,
                                   dec_text);
      sl_figure_message (fig, message);
      sl_figure_add_note (notes, g_steal_pointer (&message));
      return TRUE;
    }
  mag_scale_init (&ms, fig, stars, placed);
  for (guint i = 0; i < placed->len; i++)
    {
      Placed *p = &g_array_index (placed, Placed, i);

      p->r = mag_radius (&ms, sl_star_set_get (stars, p->index)->vmag);
    }
  add_caption (fig, captions, epoch_caption (stars, placed, FALSE), caption_w);
  for (guint i = 0; i < n_fixed; i++)
    g_ptr_array_add (captions, g_strdup (extras->pdata[i]));
  if (placed->len > SL_DENSITY_THRESHOLD)
    add_caption (fig, captions, g_strdup_printf (_("%u stars, shaded by their number per cell"), placed->len),
                 caption_w);

  /* Reference lines that cross the field; they are straight here. */
  {
    const SlFrame *f = &m.frame;

    draw_reference_line (fig, &m, LINE_ECLIPTIC, dashed, f->x + 0.3 * f->w, f->y + 0.3 * f->h, _("ecliptic"));
    draw_reference_line (fig, &m, LINE_GALACTIC_PLANE, dotted, f->x + 0.7 * f->w, f->y + 0.7 * f->h,
                         _("galactic plane"));
  }
  if (options->ellipse_scale > 0 && placed->len <= SL_DENSITY_THRESHOLD)
    draw_ellipses (fig, &m, stars, placed, options->ellipse_scale);
  if (arrows && placed->len <= SL_DENSITY_THRESHOLD)
    draw_pm_arrows (fig, &m, stars, placed, options->pm_years);
  density = draw_stars (fig, &m, stars, placed);
  draw_highlights (fig, &m.frame, stars, placed, options->highlight, notes);

  /* TRANSLATORS: axis titles; %s is arcsec, arcmin or deg. */
  x_title = g_strdup_printf (_("<i>ξ</i>, east (%s)"), unit_name);
  y_title = g_strdup_printf (_("<i>η</i>, north (%s)"), unit_name);
  sl_figure_axes (fig, &m.frame, x_title, y_title);

  /* TRANSLATORS: the field's centre (RA in h m s, Dec in d m s) and width in degrees. */
  title = g_strdup_printf (_("centre <i>α</i> %s, <i>δ</i> %s; field %s° wide"), ra_text, dec_text, width_text);
  cairo_set_source_rgb (fig->cr, 0, 0, 0);
  sl_figure_text (fig, m.frame.x, m.frame.y - 0.9 * em, 0, 0.5, 1.0, 0, title);
  draw_keys (fig, &ms, any_teff, m.frame.x, m.frame.x + m.frame.w, m.frame.y + m.frame.h + 3.1 * em);
  {
    double y = fig->height - caption_h - 0.3 * em;

    y += draw_captions (fig, captions, fig->width / 2, y, FALSE);
    if (arrows && placed->len <= SL_DENSITY_THRESHOLD)
      draw_pm_key (fig, &m, options->pm_years, fig->width / 2, y);
  }

  if (density)
    sl_figure_add_note (notes, g_strdup_printf (_("More than %d stars: the map shows how many fall in each small cell "
                                        "(more opaque where there are more), not single markers."),
                                      SL_DENSITY_THRESHOLD));
  if ((arrows || options->ellipse_scale > 0) && placed->len > SL_DENSITY_THRESHOLD)
    sl_figure_add_note (notes, g_strdup (_("Too many stars in the field for proper-motion arrows or parallax "
                                 "ellipses; they are left out.")));
  return TRUE;
}

/* ------------------------------------------------------------------ */

gboolean
sl_sky_draw (SlFigure *fig, const SlStarSet *stars, const SlSkyOptions *options, GPtrArray *notes,
             GError **error)
{
  g_return_val_if_fail (fig != NULL, FALSE);
  g_return_val_if_fail (stars != NULL, FALSE);
  g_return_val_if_fail (options != NULL, FALSE);
  g_return_val_if_fail (error == NULL || *error == NULL, FALSE);

  if (options->field)
    return draw_field (fig, stars, options, notes, error);
  return draw_all_sky (fig, stars, options, notes);
}
