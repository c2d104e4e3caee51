/* test-plot-sky.c: the sky map (src/plot/sky.c).
 *
 * The Hammer-Aitoff projection against values worked by hand from Snyder
 * (1987, "Map Projections - A Working Manual", USGS PP 1395, p. 226) and
 * against Hammer's own construction from the Lambert azimuthal equal-area
 * projection (Snyder p. 185), its equal-area property through the
 * Jacobian; the gnomonic projection against the textbook standard
 * coordinates; and the drawing: a star lands on the pixel the projection
 * predicts, right ascension increases to the left, the Galactic Centre is
 * the centre of the galactic map, and the notes say why nothing was drawn.
 */
#include <cairo.h>
#include <erfa.h>
#include <erfam.h>
#include <math.h>
#include <string.h>

#include "sky.h"
#include "sl-error.h"
#include "test-util.h"

#define SCALE 8.0      /* image pixels per point */
#define HA_X (2.0 * G_SQRT2)
#define HA_Y G_SQRT2

/* ------------------------------------------------------------------ */
/* Projections                                                        */

static void
test_options_default (void)
{
  SlSkyOptions o;

  sl_sky_options_init (&o);
  g_assert_cmpint (o.coordinates, ==, SL_SKY_EQUATORIAL);
  g_assert_false (o.field);
  g_assert_cmpfloat (o.centre_ra, ==, 0.0);
  g_assert_cmpfloat (o.centre_dec, ==, 0.0);
  g_assert_cmpfloat (o.field_deg, ==, 10.0);
  g_assert_cmpfloat (o.pm_years, ==, 0.0);
  g_assert_cmpfloat (o.ellipse_scale, ==, 0.0);
  g_assert_null (o.highlight);
}

/* Worked by hand from x = 2 sqrt2 cos(phi) sin(lam/2) / D,
 * y = sqrt2 sin(phi) / D, D = sqrt(1 + cos(phi) cos(lam/2)). */
static void
test_hammer_worked (void)
{
  struct { double lon, lat, x, y; const char *what; } cases[] = {
    /* D = sqrt 2: the centre. */
    { 0, 0, 0, 0, "centre" },
    /* cos(pi/2) = 0, so D = 1: the ends of the equator, x = +-2 sqrt 2. */
    { G_PI, 0, 2 * G_SQRT2, 0, "equator at +180" },
    { -G_PI, 0, -2 * G_SQRT2, 0, "equator at -180" },
    /* cos(phi) = 0, D = 1: the poles, y = +-sqrt 2, whatever the longitude. */
    { 0, G_PI / 2, 0, G_SQRT2, "north pole" },
    { 2.0, -G_PI / 2, 0, -G_SQRT2, "south pole" },
    /* lam = 90, phi = 0: D = sqrt(1 + sqrt2/2), x = 2 sqrt2 (sqrt2/2) / D = 2 / D. */
    { G_PI / 2, 0, 2.0 / sqrt (1.0 + G_SQRT2 / 2.0), 0, "equator at 90" },
    /* lam = 60, phi = 45: D = sqrt(1 + (sqrt2/2)(sqrt3/2)) = sqrt(1 + sqrt6/4);
     * x = 2 sqrt2 (sqrt2/2)(1/2) / D = 1/D, y = sqrt2 (sqrt2/2) / D = 1/D. */
    { G_PI / 3, G_PI / 4, 1.0 / sqrt (1.0 + sqrt (6.0) / 4.0), 1.0 / sqrt (1.0 + sqrt (6.0) / 4.0),
      "lam 60, phi 45" },
    /* The same mirrored: x is odd in lam, y odd in phi. */
    { -G_PI / 3, -G_PI / 4, -1.0 / sqrt (1.0 + sqrt (6.0) / 4.0), -1.0 / sqrt (1.0 + sqrt (6.0) / 4.0),
      "lam -60, phi -45" },
  };

  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      double x, y;

      sl_hammer_aitoff (cases[i].lon, cases[i].lat, &x, &y);
      sl_assert_close (x, cases[i].x, 1e-14, cases[i].what);
      sl_assert_close (y, cases[i].y, 1e-14, cases[i].what);
    }
}

/* Hammer's construction (Snyder p. 231): the Lambert azimuthal
 * equal-area projection of (lam/2, phi), doubled in x.  Lambert (Snyder
 * eq. 24-2 to 24-4, unit sphere, centre 0,0): k = sqrt(2 / (1 + cos phi
 * cos l)), X = k cos phi sin l, Y = k sin phi. */
static void
test_hammer_lambert (void)
{
  for (int i = 0; i < 2000; i++)
    {
      double lon = g_test_rand_double_range (-G_PI, G_PI);
      double lat = g_test_rand_double_range (-G_PI / 2, G_PI / 2);
      double l = lon / 2.0, k = sqrt (2.0 / (1.0 + cos (lat) * cos (l)));
      double x, y;

      sl_hammer_aitoff (lon, lat, &x, &y);
      sl_assert_close (x, 2.0 * k * cos (lat) * sin (l), 1e-12, "x from Lambert");
      sl_assert_close (y, k * sin (lat), 1e-12, "y from Lambert");
    }
}

/* Equal area: a small cell dlam x dphi covers cos(phi) dlam dphi of the
 * unit sphere and |J| dlam dphi of the map.  |J| / cos(phi) must be the
 * same everywhere, and 1, since the map's ellipse (pi 2 sqrt2 sqrt2 =
 * 4 pi) has the sphere's area. */
static void
test_hammer_equal_area (void)
{
  const double h = 1e-5;

  sl_assert_close (G_PI * HA_X * HA_Y, 4.0 * G_PI, 1e-12, "map area = sphere area");
  for (int lon = -170; lon <= 170; lon += 17)
    for (int lat = -80; lat <= 80; lat += 8)
      {
        double l = lon * ERFA_DD2R, p = lat * ERFA_DD2R;
        double xa, ya, xb, yb, xc, yc, xd, yd, det;
        char what[64];

        sl_hammer_aitoff (l + h, p, &xa, &ya);
        sl_hammer_aitoff (l - h, p, &xb, &yb);
        sl_hammer_aitoff (l, p + h, &xc, &yc);
        sl_hammer_aitoff (l, p - h, &xd, &yd);
        det = ((xa - xb) * (yc - yd) - (xc - xd) * (ya - yb)) / (4.0 * h * h);
        g_snprintf (what, sizeof what, "|J| / cos(phi) at lam %d, phi %d", lon, lat);
        sl_assert_close (fabs (det) / cos (p), 1.0, 1e-7, what);
      }
}

/* Standard coordinates (e.g. Calabretta & Greisen 2002; Smart, Textbook
 * on Spherical Astronomy): along the central meridian a point d north is
 * at eta = tan d; along the equator about an equatorial centre, d east is
 * at xi = tan d. */
static void
test_gnomonic (void)
{
  double ra0 = 1.2, dec0 = 0.5, d = ERFA_DD2R, xi, eta;

  g_assert_true (sl_gnomonic (ra0, dec0, ra0, dec0, &xi, &eta));
  sl_assert_close (xi, 0.0, 1e-15, "centre xi");
  sl_assert_close (eta, 0.0, 1e-15, "centre eta");

  g_assert_true (sl_gnomonic (ra0, dec0 + d, ra0, dec0, &xi, &eta));
  sl_assert_close (xi, 0.0, 1e-15, "1 deg north: xi");
  sl_assert_close (eta, tan (d), 1e-15, "1 deg north: eta = tan 1 deg");

  g_assert_true (sl_gnomonic (ra0 + d, 0.0, ra0, 0.0, &xi, &eta));
  sl_assert_close (xi, tan (d), 1e-15, "1 deg east on the equator: xi = tan 1 deg");
  sl_assert_close (eta, 0.0, 1e-15, "1 deg east on the equator: eta");

  /* East is +xi wherever the centre is. */
  g_assert_true (sl_gnomonic (ra0 + d, dec0, ra0, dec0, &xi, &eta));
  g_assert_cmpfloat (xi, >, 0.0);

  /* The far side: the antipode and a point 100 deg away. */
  g_assert_false (sl_gnomonic (ra0 + G_PI, -dec0, ra0, dec0, &xi, &eta));
  g_assert_false (sl_gnomonic (ra0, dec0 - 100.0 * d, ra0, dec0, &xi, &eta));
}

/* ------------------------------------------------------------------ */
/* Drawing                                                            */

/* A star set made by hand: missing values NAN, as the loader leaves them. */
static SlStarSet *
set_new (void)
{
  SlStarSet *set = g_new0 (SlStarSet, 1);

  set->stars = g_array_new (FALSE, FALSE, sizeof (SlPlotStar));
  set->strings = g_string_chunk_new (256);
  return set;
}

/* A star with only a position (deg): no V and no Teff, so it is drawn
 * grey at the smallest size and the map has no keys. */
static SlPlotStar *
add_star (SlStarSet *set, const char *name, double ra, double dec)
{
  SlPlotStar s;

  memset (&s, 0, sizeof s);
  s.star_id = set->stars->len + 1;
  s.designation = g_string_chunk_insert (set->strings, name);
  s.ra = ra, s.dec = dec, s.epoch = 2026.25;
  s.parallax = s.parallax_err = s.pmra = s.pmdec = s.vmag = NAN;
  s.bv0 = s.bv0_lo = s.bv0_hi = s.absmag = s.absmag_lo = s.absmag_hi = NAN;
  s.teff = s.teff_lo = s.teff_hi = s.lum = s.lum_lo = s.lum_hi = NAN;
  s.logt_sigma = s.logl_sigma = s.logt_logl_corr = s.elat = NAN;
  s.ellipse_a = s.ellipse_b = s.ellipse_pa = NAN;
  g_array_append_val (set->stars, s);
  return &g_array_index (set->stars, SlPlotStar, set->stars->len - 1);
}

typedef struct {
  cairo_surface_t *surface;
  GPtrArray       *notes;
} Render;

static void
render_clear (Render *r)
{
  g_clear_pointer (&r->surface, cairo_surface_destroy);
  g_clear_pointer (&r->notes, g_ptr_array_unref);
}

/* Draws SET onto a single-column page at SCALE pixels per point. */
static gboolean
render (Render *out, const SlStarSet *set, const SlSkyOptions *options, GError **error)
{
  SlFigureStyle style;
  SlFigure fig;
  double w, h;
  cairo_t *cr;
  gboolean ok;

  sl_figure_style_init (&style);
  w = style.width_mm / 25.4 * 72.0, h = style.height_mm / 25.4 * 72.0;
  out->notes = g_ptr_array_new_with_free_func (g_free);
  out->surface = cairo_image_surface_create (CAIRO_FORMAT_RGB24, (int) ceil (w * SCALE), (int) ceil (h * SCALE));
  cr = cairo_create (out->surface);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  cairo_scale (cr, SCALE, SCALE);
  sl_figure_init (&fig, cr, w, h, &style);
  ok = sl_sky_draw (&fig, set, options, out->notes, error);
  sl_figure_clear (&fig);
  g_assert_cmpint (cairo_status (cr), ==, CAIRO_STATUS_SUCCESS);
  cairo_destroy (cr);
  cairo_surface_flush (out->surface);
  return ok;
}

static void
pixel (cairo_surface_t *surface, int x, int y, int rgb[3])
{
  const unsigned char *data = cairo_image_surface_get_data (surface);
  guint32 p = ((const guint32 *) (data + y * cairo_image_surface_get_stride (surface)))[x];

  rgb[0] = (p >> 16) & 0xff, rgb[1] = (p >> 8) & 0xff, rgb[2] = p & 0xff;
}

/* The map's outline is the only black ink on a page without keys (labels
 * and lines are grey): from its bounding box the centre and semi-axes
 * (pixels) of the ellipse, the outline's half width taken off. */
static void
find_outline (cairo_surface_t *surface, double *cx, double *cy, double *a, double *b)
{
  int w = cairo_image_surface_get_width (surface), h = cairo_image_surface_get_height (surface);
  int x0 = G_MAXINT, x1 = -1, y0 = G_MAXINT, y1 = -1;
  SlFigureStyle style;
  double half_line;

  sl_figure_style_init (&style);
  half_line = style.line_pt / 2.0 * SCALE;
  for (int y = 0; y < h; y++)
    for (int x = 0; x < w; x++)
      {
        int c[3];

        pixel (surface, x, y, c);
        if (c[0] <= 20 && c[1] <= 20 && c[2] <= 20)
          x0 = MIN (x0, x), x1 = MAX (x1, x), y0 = MIN (y0, y), y1 = MAX (y1, y);
      }
  g_assert_cmpint (x1, >, x0);
  *cx = (x0 + x1 + 1) / 2.0;
  *cy = (y0 + y1 + 1) / 2.0;
  *a = (x1 - x0 + 1) / 2.0 - half_line;
  *b = (y1 - y0 + 1) / 2.0 - half_line;
  /* The map is twice as wide as it is tall. */
  sl_assert_close (*a / *b, 2.0, 0.01, "outline aspect");
}

/* Where the projection puts (LON, LAT) (rad, from the map's centre,
 * east = +LON to the left) on the rendered page. */
static void
predict (double cx, double cy, double a, double b, double lon, double lat, int *px, int *py)
{
  double x, y;

  sl_hammer_aitoff (lon, lat, &x, &y);
  *px = (int) floor (cx - x / HA_X * a);
  *py = (int) floor (cy - y / HA_Y * b);
}

/* Grey star ink is 128; the lightest ink near it, the graticule, 199. */
static gboolean
is_star_ink (cairo_surface_t *surface, int x, int y)
{
  int c[3];

  pixel (surface, x, y, c);
  return c[0] < 170 && c[1] < 170 && c[2] < 170;
}

static gboolean
is_blank (cairo_surface_t *surface, int x, int y)
{
  int c[3];

  pixel (surface, x, y, c);
  return c[0] > 240 && c[1] > 240 && c[2] > 240;
}

/* A star at RA 40, Dec +40 is drawn where the projection puts
 * lon = +40 deg, on the left of the centre; the mirror point (RA 320)
 * stays blank.  (Away from the graticule, the ecliptic and the galactic
 * plane, which at RA 320 lies near Dec +50.) */
static void
test_draw_star_pixel (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  Render r = { 0 };
  SlSkyOptions options;
  double cx, cy, a, b;
  int px, py, mx, my;

  add_star (set, "LHO 9001", 40.0, 40.0);
  sl_sky_options_init (&options);
  g_assert_true (render (&r, set, &options, NULL));
  find_outline (r.surface, &cx, &cy, &a, &b);

  predict (cx, cy, a, b, 40.0 * ERFA_DD2R, 40.0 * ERFA_DD2R, &px, &py);
  g_assert_cmpfloat (px, <, cx);    /* east, increasing RA, to the left */
  g_assert_cmpfloat (py, <, cy);    /* north up */
  g_assert_true (is_star_ink (r.surface, px, py));

  predict (cx, cy, a, b, -40.0 * ERFA_DD2R, 40.0 * ERFA_DD2R, &mx, &my);
  g_assert_true (is_blank (r.surface, mx, my));
  g_assert_cmpuint (r.notes->len, ==, 0);
  render_clear (&r);
}

/* The same star at RA 320 lands on the mirror point, on the right. */
static void
test_draw_ra_left (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  Render r = { 0 };
  SlSkyOptions options;
  double cx, cy, a, b;
  int px, py, mx, my;

  add_star (set, "LHO 9002", 320.0, 40.0);
  sl_sky_options_init (&options);
  g_assert_true (render (&r, set, &options, NULL));
  find_outline (r.surface, &cx, &cy, &a, &b);
  predict (cx, cy, a, b, -40.0 * ERFA_DD2R, 40.0 * ERFA_DD2R, &px, &py);
  predict (cx, cy, a, b, 40.0 * ERFA_DD2R, 40.0 * ERFA_DD2R, &mx, &my);
  g_assert_cmpfloat (px, >, cx);
  g_assert_true (is_star_ink (r.surface, px, py));
  g_assert_true (is_blank (r.surface, mx, my));
  render_clear (&r);
}

/* The Galactic Centre, l = b = 0, at ICRS RA 266.405, Dec -28.936 (ERFA
 * eraG2icrs, the inverse of eraIcrs2g), is the middle of the galactic
 * map: star ink there, and only graticule ink without the star. */
static void
test_draw_galactic_centre (void)
{
  g_autoptr (SlStarSet) with = set_new ();
  g_autoptr (SlStarSet) without = set_new ();
  Render r = { 0 };
  SlSkyOptions options;
  double ra, dec, l, bb, cx, cy, a, b;

  eraG2icrs (0.0, 0.0, &ra, &dec);
  sl_assert_close (ra * ERFA_DR2D, 266.405, 1e-3, "Galactic Centre RA");
  sl_assert_close (dec * ERFA_DR2D, -28.936, 1e-3, "Galactic Centre Dec");
  eraIcrs2g (ra, dec, &l, &bb);
  sl_assert_close (eraAnpm (l), 0.0, 1e-12, "round trip l");
  sl_assert_close (bb, 0.0, 1e-12, "round trip b");

  add_star (with, "LHO 9003", ra * ERFA_DR2D, dec * ERFA_DR2D);
  /* The control has a star too, far away, so the layout is the same. */
  add_star (without, "LHO 9004", 100.0, 80.0);
  sl_sky_options_init (&options);
  options.coordinates = SL_SKY_GALACTIC;

  g_assert_true (render (&r, with, &options, NULL));
  find_outline (r.surface, &cx, &cy, &a, &b);
  g_assert_true (is_star_ink (r.surface, (int) floor (cx), (int) floor (cy)));
  render_clear (&r);

  g_assert_true (render (&r, without, &options, NULL));
  find_outline (r.surface, &cx, &cy, &a, &b);
  g_assert_false (is_star_ink (r.surface, (int) floor (cx), (int) floor (cy)));
  render_clear (&r);
}

/* Centre of the pixels darker in A than in B (the ink only A has). */
static void
ink_only_in (cairo_surface_t *a, cairo_surface_t *b, double *x, double *y)
{
  int w = cairo_image_surface_get_width (a), h = cairo_image_surface_get_height (a);
  double sx = 0, sy = 0, n = 0;

  for (int j = 0; j < h; j++)
    for (int i = 0; i < w; i++)
      {
        int ca[3], cb[3];

        pixel (a, i, j, ca);
        pixel (b, i, j, cb);
        if (ca[0] + ca[1] + ca[2] + 60 < cb[0] + cb[1] + cb[2])
          sx += i, sy += j, n++;
      }
  g_assert_cmpfloat (n, >, 0);
  *x = sx / n, *y = sy / n;
}

/* In the field, east is to the left and north up: a star 2 deg east of
 * the centre is left of one 2 deg west, one 2 deg north above one south. */
static void
test_draw_field_orientation (void)
{
  const double ra0 = 150.0, dec0 = 20.0;
  struct { double dra, ddec; } offsets[4] = { { 2, 0 }, { -2, 0 }, { 0, 2 }, { 0, -2 } };
  Render r[4] = { { 0 } };
  SlSkyOptions options;
  double ex, ey, wx, wy, nx, ny, sx, sy;

  sl_sky_options_init (&options);
  options.field = TRUE;
  options.centre_ra = ra0, options.centre_dec = dec0, options.field_deg = 10.0;
  for (int i = 0; i < 4; i++)
    {
      g_autoptr (SlStarSet) set = set_new ();

      add_star (set, "LHO 9005", ra0 + offsets[i].dra / cos (dec0 * ERFA_DD2R), dec0 + offsets[i].ddec);
      g_assert_true (render (&r[i], set, &options, NULL));
      g_assert_cmpuint (r[i].notes->len, ==, 0);
    }
  ink_only_in (r[0].surface, r[1].surface, &ex, &ey);
  ink_only_in (r[1].surface, r[0].surface, &wx, &wy);
  ink_only_in (r[2].surface, r[3].surface, &nx, &ny);
  ink_only_in (r[3].surface, r[2].surface, &sx, &sy);
  g_assert_cmpfloat (ex, <, wx);
  sl_assert_close (ey, wy, 2.0, "east and west stars at the same height");
  g_assert_cmpfloat (ny, <, sy);
  sl_assert_close (nx, sx, 2.0, "north and south stars at the same x");
  /* Equal scales: 4 deg east-west as long as 4 deg north-south (the
   * offsets are symmetric, tan 2 deg both ways). */
  sl_assert_close (wx - ex, sy - ny, 2.0, "equal scales");
  for (int i = 0; i < 4; i++)
    render_clear (&r[i]);
}

static gboolean
notes_contain (GPtrArray *notes, const char *text)
{
  for (guint i = 0; i < notes->len; i++)
    if (strstr (notes->pdata[i], text))
      return TRUE;
  return FALSE;
}

static void
test_notes_empty (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  Render r = { 0 };
  SlSkyOptions options;

  sl_sky_options_init (&options);
  g_assert_true (render (&r, set, &options, NULL));
  g_assert_cmpuint (r.notes->len, ==, 1);
  g_assert_true (notes_contain (r.notes, "No star has a position"));
  render_clear (&r);

  /* A star without a position is no better. */
  add_star (set, "LHO 9006", NAN, NAN);
  g_assert_true (render (&r, set, &options, NULL));
  g_assert_true (notes_contain (r.notes, "No star has a position"));
  render_clear (&r);

  options.field = TRUE;
  g_assert_true (render (&r, set, &options, NULL));
  g_assert_true (notes_contain (r.notes, "No star has a position"));
  render_clear (&r);
}

static void
test_notes_outside_field (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  Render r = { 0 };
  SlSkyOptions options;

  add_star (set, "LHO 9007", 0.0, 0.0);
  sl_sky_options_init (&options);
  options.field = TRUE;
  options.centre_ra = 180.0, options.centre_dec = 10.0, options.field_deg = 5.0;
  g_assert_true (render (&r, set, &options, NULL));
  g_assert_cmpuint (r.notes->len, ==, 1);
  g_assert_true (notes_contain (r.notes, "No star lies in the 5° field around 12 00 00.0 +10 00 00"));
  render_clear (&r);
}

static void
test_notes_highlight (void)
{
  const char *const highlight[] = { "LHO 9008", "LHO 9009", "LHO 0000", NULL };
  g_autoptr (SlStarSet) set = set_new ();
  Render r = { 0 };
  SlSkyOptions options;

  add_star (set, "LHO 9008", 10.0, 10.0);
  add_star (set, "LHO 9009", NAN, NAN);
  sl_sky_options_init (&options);
  options.highlight = highlight;
  g_assert_true (render (&r, set, &options, NULL));
  g_assert_cmpuint (r.notes->len, ==, 2);
  g_assert_true (notes_contain (r.notes, "LHO 9009 is not on the map"));
  g_assert_true (notes_contain (r.notes, "LHO 0000 is not among the stars"));
  render_clear (&r);
}

/* Beyond the threshold the stars are a density image, and a note says so. */
static void
test_notes_density (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  Render r = { 0 };
  SlSkyOptions options;

  for (int i = 0; i <= SL_DENSITY_THRESHOLD; i++)
    add_star (set, "LHO", g_test_rand_double_range (0, 360), g_test_rand_double_range (-89, 89));
  sl_sky_options_init (&options);
  g_assert_true (render (&r, set, &options, NULL));
  g_assert_true (notes_contain (r.notes, "More than 50000 stars"));
  render_clear (&r);
}

static void
test_field_bad_width (void)
{
  g_autoptr (SlStarSet) set = set_new ();
  g_autoptr (GError) error = NULL;
  Render r = { 0 };
  SlSkyOptions options;

  add_star (set, "LHO 9010", 0.0, 0.0);
  sl_sky_options_init (&options);
  options.field = TRUE;
  options.field_deg = 0.0;
  g_assert_false (render (&r, set, &options, &error));
  g_assert_error (error, SL_ERROR, SL_ERROR_BAD_INPUT);
  render_clear (&r);
}

/* Arrows, ellipses, highlights and keys together draw without trouble,
 * near the pole and across the map's edge too. */
static void
test_draw_everything (void)
{
  const char *const highlight[] = { "LHO 9011", NULL };
  g_autoptr (SlStarSet) set = set_new ();
  Render r = { 0 };
  SlSkyOptions options;
  SlPlotStar *s;

  s = add_star (set, "LHO 9011", 179.9, 89.0);
  s->vmag = 3.0, s->teff = 5800.0, s->pmra = 500.0, s->pmdec = -300.0;
  s->ellipse_a = 100.0, s->ellipse_b = 40.0, s->ellipse_pa = 30.0;
  s = add_star (set, "LHO 9012", 180.1, -20.0);
  s->vmag = 9.0, s->teff = 3200.0, s->pmra = -50.0, s->pmdec = 20.0;
  s->ellipse_a = 50.0, s->ellipse_b = 50.0, s->ellipse_pa = 0.0;
  sl_sky_options_init (&options);
  options.highlight = highlight;
  options.ellipse_scale = 1e5;
  for (int c = 0; c < 2; c++)
    {
      options.coordinates = c ? SL_SKY_GALACTIC : SL_SKY_EQUATORIAL;
      g_assert_true (render (&r, set, &options, NULL));
      g_assert_cmpuint (r.notes->len, ==, 0);
      render_clear (&r);
    }
  options.field = TRUE;
  options.centre_ra = 180.0, options.centre_dec = 85.0, options.field_deg = 20.0;
  options.pm_years = 10000.0;
  g_assert_true (render (&r, set, &options, NULL));
  g_assert_cmpuint (r.notes->len, ==, 0);
  render_clear (&r);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/plot/sky/options/default", test_options_default);
  g_test_add_func ("/plot/sky/hammer-aitoff/worked-values", test_hammer_worked);
  g_test_add_func ("/plot/sky/hammer-aitoff/lambert-construction", test_hammer_lambert);
  g_test_add_func ("/plot/sky/hammer-aitoff/equal-area", test_hammer_equal_area);
  g_test_add_func ("/plot/sky/gnomonic/standard-coordinates", test_gnomonic);
  g_test_add_func ("/plot/sky/draw/star-on-predicted-pixel", test_draw_star_pixel);
  g_test_add_func ("/plot/sky/draw/ra-increases-left", test_draw_ra_left);
  g_test_add_func ("/plot/sky/draw/galactic-centre", test_draw_galactic_centre);
  g_test_add_func ("/plot/sky/draw/field-east-left", test_draw_field_orientation);
  g_test_add_func ("/plot/sky/draw/everything", test_draw_everything);
  g_test_add_func ("/plot/sky/notes/empty", test_notes_empty);
  g_test_add_func ("/plot/sky/notes/outside-field", test_notes_outside_field);
  g_test_add_func ("/plot/sky/notes/highlight-missing", test_notes_highlight);
  g_test_add_func ("/plot/sky/notes/density", test_notes_density);
  g_test_add_func ("/plot/sky/field/bad-width", test_field_bad_width);
  return g_test_run ();
}
