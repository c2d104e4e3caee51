/* test-plot-hrd.c: the HR diagram (src/plot/hrd.h) and the ZAMS it draws
 * (src/core/derive/zams.c).
 *
 * The ZAMS is checked against the values of REFERENCES.md 9
 * (../shared/REFERENCES.md, tagged [V-calc]: Tout et al. 1996 evaluated
 * independently), to half a unit in the last digit printed.  The error
 * ellipse is checked against the closed-form eigen decomposition of the
 * 2 x 2 covariance matrix, written out here.  The drawing is checked on
 * an image surface: where a star must appear, which way the axes run,
 * that a highlighted star gets a label, and the notes it leaves.
 */
#include <math.h>
#include <string.h>

#include "derive/methods.h"
#include "hrd.h"
#include "test-util.h"

/* ------------------------------------------------------------------ */
/* ZAMS: Tout, Pols, Eggleton & Han (1996)                             */

static void
test_zams_solar (void)
{
  /* REFERENCES.md 9, "Test values at Z = 0.02" [V-calc]: M, L, R, Teff
   * with half a unit in each printed last digit. */
  static const struct {
    double m, l, l_tol, r, r_tol, t;
  } rows[] = {
    { 0.1, 9.58247e-4, 0.5e-9, 0.130456, 0.5e-6, 2812 },
    { 0.5, 0.0378742, 0.5e-7, 0.458758, 0.5e-6, 3759 },
    { 1.0, 0.697717, 0.5e-6, 0.888249, 0.5e-6, 5597 },
    { 2.0, 15.8913, 0.5e-4, 1.61021, 0.5e-5, 9082 },
    { 5.0, 530.13, 0.5e-2, 2.63559, 0.5e-5, 17060 },
    { 10, 5551.89, 0.5e-2, 3.94191, 0.5e-5, 25095 },
    { 100, 1.27067e6, 0.5e1, 17.2261, 0.5e-4, 46692 },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (rows); i++)
    {
      g_autofree char *what_l = g_strdup_printf ("L(%g Msun, Z = 0.02)", rows[i].m);
      g_autofree char *what_r = g_strdup_printf ("R(%g Msun, Z = 0.02)", rows[i].m);
      g_autofree char *what_t = g_strdup_printf ("Teff(%g Msun, Z = 0.02)", rows[i].m);

      sl_assert_close (sl_zams_luminosity (rows[i].m, 0.02), rows[i].l, rows[i].l_tol, what_l);
      sl_assert_close (sl_zams_radius (rows[i].m, 0.02), rows[i].r, rows[i].r_tol, what_r);
      sl_assert_close (sl_zams_teff (rows[i].m, 0.02), rows[i].t, 0.5, what_t);
    }
}

static void
test_zams_metal_poor (void)
{
  /* REFERENCES.md 9: Z = 0.001, M = 1: L = 1.45620, R = 0.89454 [V-calc]. */
  sl_assert_close (sl_zams_luminosity (1.0, 0.001), 1.45620, 0.5e-5, "L(1 Msun, Z = 0.001)");
  sl_assert_close (sl_zams_radius (1.0, 0.001), 0.89454, 0.5e-5, "R(1 Msun, Z = 0.001)");
  /* Teff from the same L and R by the Stefan-Boltzmann ratio form. */
  sl_assert_close (sl_zams_teff (1.0, 0.001), 5772.0 * pow (1.45620 / (0.89454 * 0.89454), 0.25), 0.1,
                   "Teff(1 Msun, Z = 0.001)");
}

static void
test_zams_validity (void)
{
  /* Valid 0.1-100 Msun, 1e-4 <= Z <= 0.03 (REFERENCES.md 9): no extrapolation. */
  g_assert_true (isnan (sl_zams_luminosity (0.09, 0.02)));
  g_assert_true (isnan (sl_zams_radius (101.0, 0.02)));
  g_assert_true (isnan (sl_zams_teff (1.0, 0.04)));
  g_assert_true (isnan (sl_zams_luminosity (1.0, 5e-5)));
  g_assert_true (isfinite (sl_zams_teff (0.1, 1e-4)));
  g_assert_true (isfinite (sl_zams_teff (100.0, 0.03)));
}

/* ------------------------------------------------------------------ */
/* The error ellipse                                                   */

/* The eigen decomposition of [[sx^2, c], [c, sy^2]], c = rho sx sy, in
 * closed form: lambda = m +- sqrt(d^2 + c^2), m the mean and d the half
 * difference of the diagonal; the major axis's eigenvector is
 * (c, lambda+ - sx^2) (or along x when c = 0 and sx >= sy). */
static void
ref_ellipse (double sx, double sy, double rho, double *a, double *b, double *angle)
{
  double c = rho * sx * sy, m = (sx * sx + sy * sy) / 2, d = (sx * sx - sy * sy) / 2;
  double lp = m + sqrt (d * d + c * c), lm = m - sqrt (d * d + c * c);

  *a = sqrt (lp);
  *b = sqrt (lm);
  if (c == 0.0)
    *angle = sx >= sy ? 0.0 : G_PI / 2;
  else
    *angle = atan ((lp - sx * sx) / c);
}

static void
test_ellipse_axes (void)
{
  static const double cases[][3] = {
    { 0.02, 0.10, 0.9 }, { 0.02, 0.10, -0.9 }, { 0.05, 0.05, 0.5 }, { 0.10, 0.02, 0.3 },
    { 0.03, 0.01, 0.0 }, { 0.01, 0.03, 0.0 }, { 0.04, 0.07, -0.2 },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      double sx = cases[i][0], sy = cases[i][1], rho = cases[i][2];
      double a, b, angle, ra, rb, rangle;
      g_autofree char *what = g_strdup_printf ("ellipse sx %g sy %g rho %g", sx, sy, rho);

      sl_error_ellipse_axes (sx, sy, rho, &a, &b, &angle);
      ref_ellipse (sx, sy, rho, &ra, &rb, &rangle);
      sl_assert_close (a, ra, 1e-12, what);
      sl_assert_close (b, rb, 1e-12, what);
      /* The same axis, whichever way it points. */
      sl_assert_close (remainder (angle - rangle, G_PI), 0.0, 1e-12, what);
      g_assert_cmpfloat (a, >=, b);
      /* The area is pi sx sy sqrt(1 - rho^2): the determinant's root. */
      sl_assert_close (a * b, sx * sy * sqrt (1 - rho * rho), 1e-12, what);
    }
}

static void
test_ellipse_tilt (void)
{
  double a, b, angle;

  /* rho = +0.9: the major axis rises to the right (x and y grow together),
   * and lies nearer the larger sigma's axis (y here). */
  sl_error_ellipse_axes (0.02, 0.1, 0.9, &a, &b, &angle);
  g_assert_cmpfloat (angle, >, G_PI / 4);
  g_assert_cmpfloat (angle, <, G_PI / 2);
  sl_error_ellipse_axes (0.1, 0.1, 0.9, &a, &b, &angle);
  sl_assert_close (angle, G_PI / 4, 1e-12, "equal sigmas, rho = +0.9: 45 degrees");
  sl_error_ellipse_axes (0.02, 0.1, -0.9, &a, &b, &angle);
  g_assert_cmpfloat (angle, <, -G_PI / 4);
  g_assert_cmpfloat (angle, >, -G_PI / 2);
}

/* ------------------------------------------------------------------ */
/* Drawing on an image                                                 */

#define SCALE 3.0   /* pixels per point: 216 dpi */

static SlStarSet *
set_new (void)
{
  SlStarSet *set = g_new0 (SlStarSet, 1);

  set->stars = g_array_new (FALSE, TRUE, sizeof (SlPlotStar));
  set->strings = g_string_chunk_new (256);
  return set;
}

/* A star with Teff [K] and L [L_sun] and nothing else. */
static SlPlotStar *
add_star (SlStarSet *set, const char *name, double teff, double lum)
{
  SlPlotStar s;

  memset (&s, 0, sizeof s);
  s.designation = g_string_chunk_insert (set->strings, name);
  s.ra = s.dec = s.epoch = s.parallax = s.parallax_err = s.pmra = s.pmdec = s.vmag = NAN;
  s.bv0 = s.bv0_lo = s.bv0_hi = s.absmag = s.absmag_lo = s.absmag_hi = NAN;
  s.teff_lo = s.teff_hi = s.lum_lo = s.lum_hi = NAN;
  s.logt_sigma = s.logl_sigma = s.logt_logl_corr = NAN;
  s.elat = s.ellipse_a = s.ellipse_b = s.ellipse_pa = NAN;
  s.teff = teff;
  s.lum = lum;
  g_array_append_val (set->stars, s);
  return &g_array_index (set->stars, SlPlotStar, set->stars->len - 1);
}

typedef struct {
  cairo_surface_t *surface;
  SlFrame          frame;
  GPtrArray       *notes;
  gboolean         ok;
} Render;

/* Draws the diagram on a white single-column page (88 x 70 mm). */
static void
render (Render *out, const SlStarSet *set, const SlHrdOptions *options)
{
  SlFigureStyle style;
  SlFigure fig;
  double width, height;
  cairo_t *cr;

  sl_figure_style_init (&style);
  width = style.width_mm / 25.4 * 72, height = style.height_mm / 25.4 * 72;
  out->surface = cairo_image_surface_create (CAIRO_FORMAT_RGB24, (int) ceil (width * SCALE),
                                             (int) ceil (height * SCALE));
  out->notes = g_ptr_array_new_with_free_func (g_free);
  cr = cairo_create (out->surface);
  cairo_scale (cr, SCALE, SCALE);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  cairo_set_source_rgb (cr, 0, 0, 0);
  sl_figure_init (&fig, cr, width, height, &style);
  out->ok = sl_hrd_draw (&fig, set, options, &out->frame, out->notes, NULL);
  sl_figure_clear (&fig);
  g_assert_cmpint (cairo_status (cr), ==, CAIRO_STATUS_SUCCESS);
  cairo_destroy (cr);
  cairo_surface_flush (out->surface);
  if (g_getenv ("SL_TEST_HRD_PNG"))
    cairo_surface_write_to_png (out->surface, g_getenv ("SL_TEST_HRD_PNG"));
}

static void
render_clear (Render *out)
{
  cairo_surface_destroy (out->surface);
  g_ptr_array_unref (out->notes);
}

/* The pixel at page point (X, Y): 0 black ... 255 white, the darkest channel. */
static int
pixel_value (const Render *r, double x, double y)
{
  int px = (int) floor (x * SCALE), py = (int) floor (y * SCALE);
  const unsigned char *data = cairo_image_surface_get_data (r->surface);
  guint32 pixel;
  int v;

  g_assert_cmpint (px, >=, 0);
  g_assert_cmpint (py, >=, 0);
  g_assert_cmpint (px, <, cairo_image_surface_get_width (r->surface));
  g_assert_cmpint (py, <, cairo_image_surface_get_height (r->surface));
  pixel = *(const guint32 *) (data + py * cairo_image_surface_get_stride (r->surface) + 4 * px);
  v = MIN ((pixel >> 16) & 0xff, MIN ((pixel >> 8) & 0xff, pixel & 0xff));
  return v;
}

static gboolean
is_white (const Render *r, double x, double y)
{
  return pixel_value (r, x, y) >= 250;
}

/* Pixels darker than mid-grey in the page rectangle X0..X1, Y0..Y1 (pt). */
static guint
dark_pixels (const Render *r, double x0, double y0, double x1, double y1)
{
  guint count = 0;

  for (double y = y0; y < y1; y += 1.0 / SCALE)
    for (double x = x0; x < x1; x += 1.0 / SCALE)
      count += pixel_value (r, x, y) < 128;
  return count;
}

static gboolean
has_note (const Render *r, const char *start)
{
  for (guint i = 0; i < r->notes->len; i++)
    if (g_str_has_prefix (r->notes->pdata[i], start))
      return TRUE;
  return FALSE;
}

static void
plain_options (SlHrdOptions *o)
{
  sl_hrd_options_init (o);
  o->radius_lines = FALSE;
  o->zams = FALSE;
  o->class_ticks = FALSE;
  o->errors = FALSE;
}

static void
test_options_init (void)
{
  SlHrdOptions o;

  sl_hrd_options_init (&o);
  g_assert_cmpint (o.plane, ==, SL_HRD_THEORETICAL);
  g_assert_true (o.errors && o.radius_lines && o.zams && o.class_ticks);
  g_assert_null (o.highlight);
  for (int i = 0; i < 4; i++)
    g_assert_true (isnan (o.view[i]));
}

static void
test_star_pixels (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  static const double stars[][2] = { { 5772, 1.0 }, { 9700, 40 }, { 3500, 0.02 }, { 25000, 8000 }, { 4500, 80 } };
  SlHrdOptions o;
  Render r;

  for (gsize i = 0; i < G_N_ELEMENTS (stars); i++)
    add_star (set, "star", stars[i][0], stars[i][1]);
  sl_hrd_options_init (&o);
  render (&r, set, &o);
  g_assert_true (r.ok);
  /* Hotter is left: the temperature axis runs backwards. */
  g_assert_cmpfloat (r.frame.x0, >, r.frame.x1);
  g_assert_cmpfloat (r.frame.y0, <, r.frame.y1);
  g_assert_cmpfloat (sl_frame_px (&r.frame, log10 (25000)), <, sl_frame_px (&r.frame, log10 (3500)));
  g_assert_cmpfloat (sl_frame_py (&r.frame, log10 (8000)), <, sl_frame_py (&r.frame, log10 (0.02)));
  for (gsize i = 0; i < G_N_ELEMENTS (stars); i++)
    {
      double x = sl_frame_px (&r.frame, log10 (stars[i][0])), y = sl_frame_py (&r.frame, log10 (stars[i][1]));

      g_assert_true (x > r.frame.x && x < r.frame.x + r.frame.w);
      g_assert_true (y > r.frame.y && y < r.frame.y + r.frame.h);
      if (is_white (&r, x, y))
        g_error ("star %" G_GSIZE_FORMAT " (%g K, %g Lsun) at (%.1f, %.1f) pt is not drawn", i, stars[i][0],
                 stars[i][1], x, y);
    }
  g_assert_cmpuint (r.notes->len, ==, 0);
  render_clear (&r);

  /* Without reference lines, only the stars mark the inside of the frame. */
  plain_options (&o);
  render (&r, set, &o);
  g_assert_true (is_white (&r, sl_frame_px (&r.frame, log10 (25000)), sl_frame_py (&r.frame, log10 (0.02))));
  render_clear (&r);
}

static void
test_observational_plane (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  SlPlotStar *bright, *faint;
  SlHrdOptions o;
  Render r;

  add_star (set, "bright", NAN, NAN);
  add_star (set, "faint", NAN, NAN);
  bright = sl_star_set_get (set, 0), faint = sl_star_set_get (set, 1);

  bright->bv0 = 0.0, bright->absmag = -1.0;
  faint->bv0 = 1.5, faint->absmag = 10.0;
  faint->bv0_lo = 1.4, faint->bv0_hi = 1.6, faint->absmag_lo = 9.5, faint->absmag_hi = 10.5;
  sl_hrd_options_init (&o);
  o.plane = SL_HRD_OBSERVATIONAL;
  render (&r, set, &o);
  g_assert_true (r.ok);
  /* Bright up, blue left. */
  g_assert_cmpfloat (sl_frame_py (&r.frame, -1.0), <, sl_frame_py (&r.frame, 10.0));
  g_assert_cmpfloat (sl_frame_px (&r.frame, 0.0), <, sl_frame_px (&r.frame, 1.5));
  g_assert_false (is_white (&r, sl_frame_px (&r.frame, 0.0), sl_frame_py (&r.frame, -1.0)));
  g_assert_false (is_white (&r, sl_frame_px (&r.frame, 1.5), sl_frame_py (&r.frame, 10.0)));
  /* The colour bar's end, well away from the marker. */
  g_assert_false (is_white (&r, sl_frame_px (&r.frame, 1.58), sl_frame_py (&r.frame, 10.0)));
  render_clear (&r);
}

static void
test_view (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  SlHrdOptions o;
  Render r;

  /* One star: the fit is degenerate, so the default ranges. */
  add_star (set, "Sun", 5772, 1.0);
  plain_options (&o);
  render (&r, set, &o);
  sl_assert_close (r.frame.x0, 4.7, 1e-12, "default log Teff, left");
  sl_assert_close (r.frame.x1, 3.4, 1e-12, "default log Teff, right");
  sl_assert_close (r.frame.y0, -4.0, 1e-12, "default log L, bottom");
  sl_assert_close (r.frame.y1, 6.0, 1e-12, "default log L, top");
  render_clear (&r);

  /* A view given is kept as it is. */
  o.view[0] = 4.0, o.view[1] = 3.5, o.view[2] = -1.0, o.view[3] = 2.0;
  render (&r, set, &o);
  sl_assert_close (r.frame.x0, 4.0, 0, "view x0");
  sl_assert_close (r.frame.x1, 3.5, 0, "view x1");
  sl_assert_close (r.frame.y0, -1.0, 0, "view y0");
  sl_assert_close (r.frame.y1, 2.0, 0, "view y1");
  render_clear (&r);

  /* Stars spread out: the range is theirs, padded. */
  add_star (set, "B star", 15000, 1000);
  add_star (set, "M dwarf", 3200, 0.005);
  plain_options (&o);
  render (&r, set, &o);
  g_assert_cmpfloat (r.frame.x0, >, log10 (15000));
  g_assert_cmpfloat (r.frame.x0, <, log10 (15000) + 0.2);
  g_assert_cmpfloat (r.frame.x1, <, log10 (3200));
  g_assert_cmpfloat (r.frame.y1, >, 3.0);
  g_assert_cmpfloat (r.frame.y0, <, log10 (0.005));
  render_clear (&r);
}

static void
test_highlight_label (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  const char *const highlight[] = { "HD 12345", NULL };
  const char *const missing[] = { "nowhere", NULL };
  SlHrdOptions o;
  Render plain, marked;
  double x, y;
  guint before, after;

  add_star (set, "HD 12345", 5772, 1.0);
  add_star (set, "other", 9000, 30.0);
  add_star (set, "third", 4000, 0.1);
  plain_options (&o);
  render (&plain, set, &o);
  o.highlight = highlight;
  render (&marked, set, &o);
  g_assert_true (marked.ok);
  x = sl_frame_px (&marked.frame, log10 (5772)), y = sl_frame_py (&marked.frame, log10 (1.0));
  /* The label stands next to the ring, within a few em of the star. */
  before = dark_pixels (&plain, x - 50, y - 20, x + 50, y + 20);
  after = dark_pixels (&marked, x - 50, y - 20, x + 50, y + 20);
  if (after < before + 100)
    g_error ("no label near the highlighted star: %u dark pixels, %u without it", after, before);
  g_assert_cmpuint (marked.notes->len, ==, 0);
  render_clear (&plain);
  render_clear (&marked);

  /* A name with no point is noted, not an error. */
  o.highlight = missing;
  render (&marked, set, &o);
  g_assert_true (marked.ok);
  g_assert_true (has_note (&marked, "HR diagram: nowhere"));
  render_clear (&marked);
}

static void
test_highlight_crowd (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  const char *names[9];
  SlHrdOptions o;
  Render r;

  /* Eight highlighted stars close together: every one still drawn. */
  for (int i = 0; i < 8; i++)
    {
      names[i] = g_string_chunk_insert (set->strings, (char[]) { 'A' + i, 0 });
      add_star (set, names[i], 5772 * (1 + 0.004 * i), 1.0 + 0.03 * i);
    }
  names[8] = NULL;
  add_star (set, "far", 30000, 1e5);
  add_star (set, "far2", 3000, 1e-3);
  plain_options (&o);
  o.highlight = names;
  render (&r, set, &o);
  g_assert_true (r.ok);
  g_assert_cmpuint (r.notes->len, ==, 0);
  render_clear (&r);
}

static void
test_empty (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  SlHrdOptions o;
  Render r;

  /* No star at all, then stars without luminosity: a message, a note, no error. */
  sl_hrd_options_init (&o);
  render (&r, set, &o);
  g_assert_true (r.ok);
  g_assert_cmpuint (r.notes->len, ==, 1);
  g_assert_cmpstr (r.notes->pdata[0], ==,
                   "No star has a derived temperature and luminosity yet: run 'starledger-cli derive'.");
  /* The message is drawn in the middle of the page. */
  g_assert_cmpuint (dark_pixels (&r, 10, 10, 240, 190), >, 0);
  render_clear (&r);

  add_star (set, "no L", 5000, NAN);
  add_star (set, "no T", NAN, 2.0);
  render (&r, set, &o);
  g_assert_true (r.ok);
  g_assert_true (has_note (&r, "No star has a derived temperature and luminosity yet"));
  render_clear (&r);

  /* The window says it in its own words. */
  o.empty_message = "Nothing derived yet: Derive… derives it.";
  render (&r, set, &o);
  g_assert_true (r.ok);
  g_assert_true (has_note (&r, "Nothing derived yet: Derive… derives it."));
  g_assert_false (has_note (&r, "No star has a derived temperature"));
  render_clear (&r);
}

static void
test_errors (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  SlPlotStar *s;
  SlHrdOptions o;
  Render r;
  double cx, cy, a, b, angle;
  double ux, uy, vx, vy;

  /* One star with a large ellipse, rho = +0.9: hotter goes with brighter,
   * so on the page (hot to the left) the ellipse runs up to the LEFT. */
  s = add_star (set, "tilted", 6000, 1.0);
  s->logt_sigma = 0.03, s->logl_sigma = 0.3, s->logt_logl_corr = 0.9;
  add_star (set, "corner1", 12000, 100);
  add_star (set, "corner2", 3000, 0.01);
  plain_options (&o);
  o.errors = TRUE;
  render (&r, set, &o);
  cx = sl_frame_px (&r.frame, log10 (6000)), cy = sl_frame_py (&r.frame, 0.0);
  sl_error_ellipse_axes (0.03, 0.3, 0.9, &a, &b, &angle);
  /* The ends of the major axis and of the minor axis, on the page. */
  ux = sl_frame_px (&r.frame, log10 (6000) + a * cos (angle)) - cx;
  uy = sl_frame_py (&r.frame, a * sin (angle)) - cy;
  vx = sl_frame_px (&r.frame, log10 (6000) - b * sin (angle)) - cx;
  vy = sl_frame_py (&r.frame, b * cos (angle)) - cy;
  g_assert_cmpfloat (ux, <, 0);   /* up and to the left */
  g_assert_cmpfloat (uy, <, 0);
  g_assert_false (is_white (&r, cx + ux, cy + uy) && is_white (&r, cx + 0.98 * ux, cy + 0.98 * uy));
  g_assert_false (is_white (&r, cx - ux, cy - uy) && is_white (&r, cx - 0.98 * ux, cy - 0.98 * uy));
  /* Half-way out along the major axis the inside is empty... */
  g_assert_true (is_white (&r, cx + 0.5 * ux, cy + 0.5 * uy));
  /* ...and the mirror image (up and to the right) lies outside it. */
  g_assert_true (is_white (&r, cx - 0.9 * ux, cy + 0.9 * uy));
  (void) vx, (void) vy;
  render_clear (&r);
}

static void
test_density_note (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  GRand *rand = g_rand_new_with_seed (7);
  SlHrdOptions o;
  Render r;

  for (int i = 0; i < SL_DENSITY_THRESHOLD + 10; i++)
    add_star (set, "s", g_rand_double_range (rand, 3000, 20000), pow (10, g_rand_double_range (rand, -3, 4)));
  g_rand_free (rand);
  sl_hrd_options_init (&o);
  render (&r, set, &o);
  g_assert_true (r.ok);
  g_assert_true (has_note (&r, "HR diagram: 50010 stars drawn as a density image"));
  g_assert_true (has_note (&r, "HR diagram: error ellipses and bars left out"));
  render_clear (&r);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/plot/hrd/zams/tout-solar", test_zams_solar);
  g_test_add_func ("/plot/hrd/zams/tout-metal-poor", test_zams_metal_poor);
  g_test_add_func ("/plot/hrd/zams/validity", test_zams_validity);
  g_test_add_func ("/plot/hrd/ellipse/eigen", test_ellipse_axes);
  g_test_add_func ("/plot/hrd/ellipse/tilt", test_ellipse_tilt);
  g_test_add_func ("/plot/hrd/options/init", test_options_init);
  g_test_add_func ("/plot/hrd/draw/star-pixels", test_star_pixels);
  g_test_add_func ("/plot/hrd/draw/observational", test_observational_plane);
  g_test_add_func ("/plot/hrd/draw/view", test_view);
  g_test_add_func ("/plot/hrd/draw/error-ellipse-on-page", test_errors);
  g_test_add_func ("/plot/hrd/highlight/label", test_highlight_label);
  g_test_add_func ("/plot/hrd/highlight/crowd", test_highlight_crowd);
  g_test_add_func ("/plot/hrd/empty/message-note", test_empty);
  g_test_add_func ("/plot/hrd/density/note", test_density_note);

  return g_test_run ();
}
