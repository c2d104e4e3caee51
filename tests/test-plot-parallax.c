/* test-plot-parallax.c: the annual parallax path (src/plot/parallax-path.c).
 *
 * The displacement is checked against the ecliptic formulas of
 * REFERENCES.md 7 (a circle of radius p at the ecliptic pole, a line of
 * half-length p on the ecliptic, the ellipse of the parallax-ellipse
 * module, the star moved towards the Sun), and the drawing for equal scale
 * in both directions on a rendered image.
 */
#include <cairo.h>
#include <erfa.h>
#include <erfam.h>
#include <math.h>

#include "derive/methods.h"
#include "parallax-path.h"
#include "test-util.h"

#define PLX 100.0            /* mas: round numbers for the checks */
#define SAMPLES 731          /* two a day over 2026 */

/* The extremes of the 2026 path of (RA, DEC) projected on the unit vector
 * (UE, UN) in (east, north). */
static void
projection_range (double ra, double dec, double ue, double un, double *lo, double *hi)
{
  *lo = G_MAXDOUBLE, *hi = -G_MAXDOUBLE;
  for (int i = 0; i < SAMPLES; i++)
    {
      double e, n, s;

      sl_parallax_offset (ra, dec, PLX, 2026.0 + (double) i / (SAMPLES - 1), &e, &n);
      s = e * ue + n * un;
      *lo = MIN (*lo, s), *hi = MAX (*hi, s);
    }
}

/* ICRS (deg) of the point at ecliptic (LON, LAT) deg, J2000 (ERFA). */
static void
icrs_from_ecliptic (double lon, double lat, double *ra, double *dec)
{
  eraEceq06 (ERFA_DJ00, 0.0, lon * ERFA_DD2R, lat * ERFA_DD2R, ra, dec);
  *ra = eraAnp (*ra) * ERFA_DR2D;
  *dec *= ERFA_DR2D;
}

static void
test_options_default (void)
{
  SlParallaxOptions o;

  sl_parallax_options_init (&o);
  g_assert_cmpfloat (o.start_jyear, ==, 2026.0);
  g_assert_cmpfloat (o.years, ==, 1.0);
  g_assert_false (o.proper_motion);
  g_assert_false (o.common_scale);
  g_assert_true (o.band);
}

/* REFERENCES.md 7 and 14.11: at the ecliptic pole the path is a circle of
 * radius p.  About the star's catalogue (barycentric) position its radius
 * follows the Earth's distance from the barycentre: the orbit's
 * eccentricity 0.0167 plus the Sun's offset from the barycentre (up to
 * ~0.01 au, mostly Jupiter's pull), so within 3 per cent (2.2 in 2026).
 * About its own centre the offset drops out and the orbit's ellipse
 * (axis ratio sqrt(1 - e^2) = 0.99986) leaves it round to 0.5 per cent. */
static void
test_pole_circle (void)
{
  double e[SAMPLES], n[SAMPLES], ra, dec, rmin = G_MAXDOUBLE, rmax = 0, cmin = G_MAXDOUBLE, cmax = 0;
  double e_lo = G_MAXDOUBLE, e_hi = -G_MAXDOUBLE, n_lo = G_MAXDOUBLE, n_hi = -G_MAXDOUBLE, ce, cn;

  icrs_from_ecliptic (0.0, 90.0, &ra, &dec);
  sl_assert_close (ra, 270.0, 1e-4, "north ecliptic pole RA (deg)");
  sl_assert_close (dec, 66.56, 0.01, "north ecliptic pole Dec (deg)");
  for (int i = 0; i < SAMPLES; i++)
    {
      sl_parallax_offset (ra, dec, PLX, 2026.0 + (double) i / (SAMPLES - 1), &e[i], &n[i]);
      rmin = MIN (rmin, hypot (e[i], n[i])), rmax = MAX (rmax, hypot (e[i], n[i]));
      e_lo = MIN (e_lo, e[i]), e_hi = MAX (e_hi, e[i]), n_lo = MIN (n_lo, n[i]), n_hi = MAX (n_hi, n[i]);
    }
  ce = (e_lo + e_hi) / 2, cn = (n_lo + n_hi) / 2;
  for (int i = 0; i < SAMPLES; i++)
    {
      double r = hypot (e[i] - ce, n[i] - cn);

      cmin = MIN (cmin, r), cmax = MAX (cmax, r);
    }
  g_test_message ("pole: radius %.4f..%.4f mas about the star, %.4f..%.4f about the centre "
                  "(%.4f, %.4f) for p = %.1f mas", rmin, rmax, cmin, cmax, ce, cn, PLX);
  sl_assert_close (rmin, PLX, 0.03 * PLX, "smallest radius at the pole (mas)");
  sl_assert_close (rmax, PLX, 0.03 * PLX, "largest radius at the pole (mas)");
  sl_assert_close (cmin, PLX, 0.005 * PLX, "smallest radius about the path's centre (mas)");
  sl_assert_close (cmax, PLX, 0.005 * PLX, "largest radius about the path's centre (mas)");
}

/* On the ecliptic: a line of half-length p, no width to speak of. */
static void
test_ecliptic_line (void)
{
  double ra, dec, far = 0, ue = 0, un = 0, lo, hi;

  icrs_from_ecliptic (100.0, 0.0, &ra, &dec);
  for (int i = 0; i < SAMPLES; i++)
    {
      double e, n;

      sl_parallax_offset (ra, dec, PLX, 2026.0 + (double) i / (SAMPLES - 1), &e, &n);
      if (hypot (e, n) > far)
        far = hypot (e, n), ue = e / far, un = n / far;
    }
  sl_assert_close (far, PLX, 0.02 * PLX, "half-length on the ecliptic (mas)");
  /* Across the line. */
  projection_range (ra, dec, -un, ue, &lo, &hi);
  g_test_message ("ecliptic: half-length %.4f mas, half-width %.4f mas", far, (hi - lo) / 2);
  g_assert_cmpfloat ((hi - lo) / 2, <, 0.03 * PLX);
}

/* The path's extent along and across the major axis is the parallax
 * ellipse of src/core/derive/ellipse.c: a = p, b = p |sin beta|, major
 * axis at PA = PA(ecliptic north) + 90 deg.  Half the peak-to-peak extent
 * is used, which the Sun's offset from the barycentre does not shift. */
static void
test_ellipse_axes (void)
{
  static const struct { double ra, dec; } stars[] = {
    { 258.351955719, -11.700598023 },   /* the demo's LHO 0001 */
    { 232.152583772, 44.896254165 },    /* LHO 0004 */
    { 49.475861951, -62.643878674 },    /* LHO 0010 */
    { 10.0, 20.0 },
    { 200.0, -45.0 },
    { 120.0, 35.0 },
  };
  double eps = sl_obliquity_j2000 ();

  for (guint k = 0; k < G_N_ELEMENTS (stars); k++)
    {
      double lon, lat, a, b, pa, ra = stars[k].ra * ERFA_DD2R, dec = stars[k].dec * ERFA_DD2R;
      double lo, hi;
      char what[96];

      sl_ecliptic_from_icrs (stars[k].ra, stars[k].dec, &lon, &lat);
      a = PLX;
      b = PLX * fabs (sin (lat * ERFA_DD2R));
      pa = atan2 (-sin (eps) * cos (ra), cos (eps) * cos (dec) + sin (eps) * sin (dec) * sin (ra)) + G_PI / 2;

      projection_range (stars[k].ra, stars[k].dec, sin (pa), cos (pa), &lo, &hi);
      g_snprintf (what, sizeof what, "star %u (beta %.1f deg): semi-major axis (mas)", k, lat);
      sl_assert_close ((hi - lo) / 2, a, 0.02 * a, what);
      projection_range (stars[k].ra, stars[k].dec, cos (pa), -sin (pa), &lo, &hi);
      g_snprintf (what, sizeof what, "star %u (beta %.1f deg): semi-minor axis (mas)", k, lat);
      sl_assert_close ((hi - lo) / 2, b, 0.02 * b, what);
    }
}

/* The Sun's apparent ecliptic longitude (deg in (-180, 180], of date) and
 * distance (au), low precision (Astronomical Almanac, Sec. C; REFERENCES.md 7). */
static void
sun_low_precision (double jyear, double *lon, double *dist)
{
  double n = (jyear - 2000.0) * 365.25;
  double g = (357.528 + 0.9856003 * n) * ERFA_DD2R;

  *lon = remainder (280.460 + 0.9856474 * n + 1.915 * sin (g) + 0.020 * sin (2 * g), 360.0);
  *dist = 1.00014 - 0.01671 * cos (g) - 0.00014 * cos (2 * g);
}

/* East and north offsets to ecliptic ones, with the position angle theta
 * of ecliptic north (REFERENCES.md 7): ecliptic north lies at
 * (sin theta, cos theta) in (east, north), increasing longitude at
 * theta + 90 deg, i.e. (cos theta, -sin theta). */
static void
to_ecliptic (double ra_deg, double dec_deg, double east, double north, double *dlon_cosb, double *dlat)
{
  double eps = sl_obliquity_j2000 (), ra = ra_deg * ERFA_DD2R, dec = dec_deg * ERFA_DD2R;
  double theta = atan2 (-sin (eps) * cos (ra), cos (eps) * cos (dec) + sin (eps) * sin (dec) * sin (ra));

  *dlon_cosb = east * cos (theta) - north * sin (theta);
  *dlat = east * sin (theta) + north * cos (theta);
}

/* The classic sign error (REFERENCES.md 14.11): at the March equinox the
 * Sun is at longitude 0, so a star at longitude 90 on the ecliptic is
 * displaced towards the Sun, towards smaller longitude:
 * dl cos b = p R sin(l_sun - l) < 0. */
static void
test_sign_towards_sun (void)
{
  double t = 2026.215, lon_sun, dist, ra, dec, e, n, dl, db, want;

  sun_low_precision (t, &lon_sun, &dist);
  lon_sun -= 0.01397 * 26.0;   /* of date to the J2000 equinox (precession 1.397 deg/century) */
  g_assert_cmpfloat (fabs (lon_sun), <, 1.0);   /* it is the equinox */

  icrs_from_ecliptic (90.0, 0.0, &ra, &dec);
  sl_parallax_offset (ra, dec, PLX, t, &e, &n);
  to_ecliptic (ra, dec, e, n, &dl, &db);
  want = PLX * dist * sin ((lon_sun - 90.0) * ERFA_DD2R);
  g_test_message ("equinox: dl cos b = %.3f mas (want %.3f), db = %.3f mas", dl, want, db);
  g_assert_cmpfloat (dl, <, 0.0);
  sl_assert_close (dl, want, 0.02 * PLX, "dl cos b at the equinox (mas)");
  sl_assert_close (db, 0.0, 0.02 * PLX, "db at the equinox on the ecliptic (mas)");
}

/* Both ecliptic components against the formulas at an ordinary date and
 * latitude. */
static void
test_ecliptic_formulas (void)
{
  static const double dates[] = { 2026.1, 2026.37, 2026.6, 2026.93 };
  double ra, dec, lon = 200.0, lat = 30.0;

  icrs_from_ecliptic (lon, lat, &ra, &dec);
  for (guint k = 0; k < G_N_ELEMENTS (dates); k++)
    {
      double lon_sun, dist, e, n, dl, db, d;

      sun_low_precision (dates[k], &lon_sun, &dist);
      lon_sun -= 0.01397 * (dates[k] - 2000.0);
      d = (lon_sun - lon) * ERFA_DD2R;
      sl_parallax_offset (ra, dec, PLX, dates[k], &e, &n);
      to_ecliptic (ra, dec, e, n, &dl, &db);
      sl_assert_close (dl, PLX * dist * sin (d), 0.02 * PLX, "dl cos b (mas)");
      sl_assert_close (db, -PLX * dist * sin (lat * ERFA_DD2R) * cos (d), 0.02 * PLX, "db (mas)");
    }
}

/* A star set made by hand: missing values NAN, as the loader leaves them. */
static SlStarSet *
star_set_new (void)
{
  SlStarSet *set = g_new0 (SlStarSet, 1);

  set->stars = g_array_new (FALSE, FALSE, sizeof (SlPlotStar));
  set->strings = g_string_chunk_new (256);
  return set;
}

static void
star_set_add (SlStarSet *set, const char *name, double ra, double dec, double plx, double plx_err)
{
  SlPlotStar s;
  double lon;

  memset (&s, 0, sizeof s);
  s.epoch = 2026.25;
  s.vmag = s.bv0 = s.bv0_lo = s.bv0_hi = NAN;
  s.absmag = s.absmag_lo = s.absmag_hi = s.teff = s.teff_lo = s.teff_hi = NAN;
  s.lum = s.lum_lo = s.lum_hi = s.logt_sigma = s.logl_sigma = s.logt_logl_corr = NAN;
  s.ellipse_a = s.ellipse_b = s.ellipse_pa = NAN;
  s.star_id = set->stars->len + 1;
  s.designation = g_string_chunk_insert (set->strings, name);
  s.ra = ra, s.dec = dec;
  s.parallax = plx, s.parallax_err = plx_err;
  s.pmra = 150.0, s.pmdec = -80.0;
  sl_ecliptic_from_icrs (ra, dec, &lon, &s.elat);
  g_array_append_val (set->stars, s);
}

static void
star_set_free (SlStarSet *set)
{
  g_array_unref (set->stars);
  g_string_chunk_free (set->strings);
  g_free (set);
}

/* Renders onto an image of W x H mm at DPI; returns the surface. */
static cairo_surface_t *
render (const SlStarSet *set, const SlParallaxOptions *options, double w_mm, double h_mm, double dpi,
        GPtrArray *notes)
{
  double w_pt = w_mm / 25.4 * 72.0, h_pt = h_mm / 25.4 * 72.0;
  cairo_surface_t *surface = cairo_image_surface_create (CAIRO_FORMAT_RGB24, (int) lround (w_pt / 72.0 * dpi),
                                                         (int) lround (h_pt / 72.0 * dpi));
  cairo_t *cr = cairo_create (surface);
  SlFigureStyle style;
  SlFigure fig;

  sl_figure_style_init (&style);
  style.width_mm = w_mm, style.height_mm = h_mm, style.dpi = dpi;
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  cairo_scale (cr, dpi / 72.0, dpi / 72.0);
  sl_figure_init (&fig, cr, w_pt, h_pt, &style);
  g_assert_true (sl_parallax_draw (&fig, set, options, notes, NULL));
  sl_figure_clear (&fig);
  g_assert_cmpint (cairo_status (cr), ==, CAIRO_STATUS_SUCCESS);
  cairo_destroy (cr);
  cairo_surface_flush (surface);
  return surface;
}

/* The path is the only strongly blue ink on the page (axes and text are
 * black or grey): its pixels' bounding box. */
static gboolean
path_pixels_box (cairo_surface_t *surface, int *x0, int *x1, int *y0, int *y1)
{
  const unsigned char *data = cairo_image_surface_get_data (surface);
  int stride = cairo_image_surface_get_stride (surface);
  int w = cairo_image_surface_get_width (surface), h = cairo_image_surface_get_height (surface);

  *x0 = *y0 = G_MAXINT, *x1 = *y1 = -1;
  for (int y = 0; y < h; y++)
    for (int x = 0; x < w; x++)
      {
        guint32 p = ((const guint32 *) (data + y * stride))[x];
        int r = (p >> 16) & 0xff, g = (p >> 8) & 0xff, b = p & 0xff;

        if (b - r > 60 && b - g > 40)
          *x0 = MIN (*x0, x), *x1 = MAX (*x1, x), *y0 = MIN (*y0, y), *y1 = MAX (*y1, y);
      }
  return *x1 >= 0;
}

/* One pole star alone: its circle must be as wide as it is tall on the
 * page (1 mas the same length both ways), on a page that is not square. */
static void
test_draw_equal_aspect (void)
{
  SlStarSet *set = star_set_new ();
  g_autoptr (GPtrArray) notes = g_ptr_array_new_with_free_func (g_free);
  SlParallaxOptions options;
  cairo_surface_t *surface;
  double ra, dec;
  int x0, x1, y0, y1;

  icrs_from_ecliptic (0.0, 90.0, &ra, &dec);
  star_set_add (set, "Pole", ra, dec, 12.0, 0.3);
  sl_parallax_options_init (&options);
  options.band = FALSE;

  for (int page = 0; page < 2; page++)
    {
      double w_mm = page == 0 ? 88.0 : 180.0, h_mm = page == 0 ? 70.0 : 110.0;

      surface = render (set, &options, w_mm, h_mm, 300.0, notes);
      g_assert_true (path_pixels_box (surface, &x0, &x1, &y0, &y1));
      g_test_message ("%.0f x %.0f mm: circle %d x %d px", w_mm, h_mm, x1 - x0 + 1, y1 - y0 + 1);
      g_assert_cmpint (x1 - x0, >, 200);
      g_assert_cmpint (abs ((x1 - x0) - (y1 - y0)), <=, 2);
      cairo_surface_destroy (surface);
    }
  star_set_free (set);
}

/* No stars: a message on the page and a note saying how to choose them. */
static void
test_draw_empty (void)
{
  SlStarSet *set = star_set_new ();
  g_autoptr (GPtrArray) notes = g_ptr_array_new_with_free_func (g_free);
  SlParallaxOptions options;

  sl_parallax_options_init (&options);
  cairo_surface_destroy (render (set, &options, 88, 70, 72, notes));
  g_assert_cmpuint (notes->len, ==, 1);
  g_assert_nonnull (strstr (notes->pdata[0], "--star"));
  star_set_free (set);
}

/* More stars than panels, one without a positive parallax, proper motion
 * and a common scale, a band reaching below zero: drawn, with notes. */
static void
test_draw_many (void)
{
  SlStarSet *set = star_set_new ();
  g_autoptr (GPtrArray) notes = g_ptr_array_new_with_free_func (g_free);
  SlParallaxOptions options;
  gboolean first = FALSE, no_parallax = FALSE;
  cairo_surface_t *surface;
  int x0, x1, y0, y1;

  for (int i = 0; i < 30; i++)
    {
      char name[32];

      g_snprintf (name, sizeof name, "Star %02d", i + 1);
      star_set_add (set, name, 12.0 * i, -70.0 + 5.0 * i, i == 3 ? -0.4 : 5.0 + i, i == 5 ? 8.0 : 0.2);
    }
  sl_parallax_options_init (&options);
  options.proper_motion = TRUE;
  options.common_scale = TRUE;
  options.years = 3.0;
  surface = render (set, &options, 180, 110, 150, notes);
  g_assert_true (path_pixels_box (surface, &x0, &x1, &y0, &y1));
  cairo_surface_destroy (surface);
  for (guint i = 0; i < notes->len; i++)
    {
      first |= strstr (notes->pdata[i], "24 of 30") != NULL;
      no_parallax |= strstr (notes->pdata[i], "Star 04") != NULL;
    }
  g_assert_true (first);
  g_assert_true (no_parallax);
  star_set_free (set);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/plot/parallax/options/default", test_options_default);
  g_test_add_func ("/plot/parallax/offset/pole-circle", test_pole_circle);
  g_test_add_func ("/plot/parallax/offset/ecliptic-line", test_ecliptic_line);
  g_test_add_func ("/plot/parallax/offset/ellipse-axes", test_ellipse_axes);
  g_test_add_func ("/plot/parallax/offset/towards-sun", test_sign_towards_sun);
  g_test_add_func ("/plot/parallax/offset/ecliptic-formulas", test_ecliptic_formulas);
  g_test_add_func ("/plot/parallax/draw/equal-aspect", test_draw_equal_aspect);
  g_test_add_func ("/plot/parallax/draw/empty", test_draw_empty);
  g_test_add_func ("/plot/parallax/draw/many", test_draw_many);
  return g_test_run ();
}
