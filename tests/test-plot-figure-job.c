/* test-plot-figure-job.c: one figure request (src/plot/figure-job.c), as
 * starledger-cli figure and the window's Export Figure dialog use it.
 *
 * The job draws what the kind's own draw function draws with the same
 * options (pixel for pixel); it loads the stars by the command line's
 * rules (every star or a list's; the parallax figure only the stars
 * named); a star named that is not there is an error naming it; a
 * cancelled load stops with G_IO_ERROR_CANCELLED; the file it writes is
 * the same as its drawing; and the command line it spells out reads back
 * as the same options.
 */
#include <cairo.h>
#include <gio/gio.h>
#include <string.h>

#include "derivation.h"
#include "figure-job.h"
#include "import.h"
#include "lists.h"
#include "sl-error.h"
#include "test-util.h"

#define SCALE 2.0   /* image pixels per point */

static void
fixture_set_up (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *input = NULL;
  g_autoptr (SlImportReport) report = NULL;
  SlImportOptions options;
  SlDeriveParams params;
  SlDeriveReport derived;
  static const char *const members[] = { "B", "C", NULL };

  sl_test_project_set_up (f, data);
  input = sl_test_write_file (f->dir, "in.csv",
                              "id,ra,dec,parallax,parallax_err,pmra,pmdec,vmag,vmag_err,bv,bv_err,sptype\n"
                              "A,10.5,20.1,100,0.5,120,-40,5,0.01,0.3,0.01,F0V\n"
                              "B,100.2,-30.4,50,0.5,-10,5,6,0.01,0.65,0.01,G2V\n"
                              "C,200.7,5.5,20,0.5,3,3,8,0.01,1.2,0.01,K5III\n"
                              "D,300.1,60.2,5,0.5,1,-1,10,0.01,0.0,0.01,A0V\n"
                              "E,45.0,-70.0,1,0.5,0,0,12,0.01,1.5,0.01,\n", -1);
  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);
  sl_derive_params_init (&params);
  g_assert_true (sl_derivation_run (f->project, &params, FALSE, NULL, NULL, NULL, &derived, &error));
  g_assert_no_error (error);
  g_assert_true (sl_list_create (f->project, "near", NULL, &error));
  g_assert_cmpint (sl_list_add_stars (f->project, "near", members, &error), ==, 2);
}

static cairo_surface_t *
page_surface (const SlFigureStyle *style)
{
  int w = (int) round (style->width_mm / 25.4 * 72.0 * SCALE);
  int h = (int) round (style->height_mm / 25.4 * 72.0 * SCALE);

  return cairo_image_surface_create (CAIRO_FORMAT_ARGB32, w, h);
}

static void
assert_same_pixels (cairo_surface_t *a, cairo_surface_t *b, const char *what)
{
  int stride = cairo_image_surface_get_stride (a);
  int h = cairo_image_surface_get_height (a);
  guint differing = 0;

  cairo_surface_flush (a);
  cairo_surface_flush (b);
  g_assert_cmpint (stride, ==, cairo_image_surface_get_stride (b));
  g_assert_cmpint (h, ==, cairo_image_surface_get_height (b));
  for (int i = 0; i < stride * h; i++)
    differing += cairo_image_surface_get_data (a)[i] != cairo_image_surface_get_data (b)[i];
  if (differing)
    g_error ("%s: %u bytes differ", what, differing);
}

/* How many pixels are not white: the figure drew something. */
static guint
inked (cairo_surface_t *s)
{
  int stride = cairo_image_surface_get_stride (s);
  guint n = 0;

  cairo_surface_flush (s);
  for (int y = 0; y < cairo_image_surface_get_height (s); y++)
    for (int x = 0; x < cairo_image_surface_get_width (s); x++)
      n += *(guint32 *) (cairo_image_surface_get_data (s) + y * stride + 4 * x) != 0xffffffff;
  return n;
}

/* The job draws each kind exactly as the kind's own function with the same
 * options and highlighted stars (as starledger-cli figure drew before it
 * used the job), on the same white page. */
static void
test_draw_as_before (SlTestProject *f, gconstpointer data)
{
  static const char *const chosen[] = { "A", "C", NULL };

  for (SlFigureKind kind = 0; kind < SL_FIGURE_N_KINDS; kind++)
    {
      g_auto (SlFigureJob) job = { 0 };
      g_autoptr (GError) error = NULL;
      g_autoptr (SlStarSet) stars = NULL;
      cairo_surface_t *by_job, *direct;
      cairo_t *cr;
      SlFigure fig;
      gboolean ok;

      sl_figure_job_init (&job, kind);
      /* 360 x 216 pt: whole pixels, so the job's clip to the page cuts no
       * pixel in half. */
      job.style.width_mm = 127.0;
      job.style.height_mm = 76.2;
      job.style.grayscale = kind == SL_FIGURE_KIND_SKY;
      job.hrd.plane = SL_HRD_OBSERVATIONAL;
      job.sky.coordinates = SL_SKY_GALACTIC;
      job.parallax.proper_motion = TRUE;
      sl_figure_job_set_stars (&job, chosen);
      stars = sl_figure_job_load (&job, f->project, NULL, &error);
      g_assert_no_error (error);
      g_assert_cmpuint (stars->stars->len, ==, kind == SL_FIGURE_KIND_PARALLAX ? 2 : 5);

      by_job = page_surface (&job.style);
      cr = cairo_create (by_job);
      cairo_scale (cr, SCALE, SCALE);
      g_assert_true (sl_figure_job_draw (&job, stars, cr, NULL, &error));
      g_assert_no_error (error);
      cairo_destroy (cr);

      direct = page_surface (&job.style);
      cr = cairo_create (direct);
      cairo_scale (cr, SCALE, SCALE);
      cairo_set_source_rgb (cr, 1, 1, 1);
      cairo_paint (cr);
      cairo_set_source_rgb (cr, 0, 0, 0);
      sl_figure_init (&fig, cr, 127.0 / 25.4 * 72.0, 76.2 / 25.4 * 72.0, &job.style);
      if (kind == SL_FIGURE_KIND_HR)
        {
          SlHrdOptions o;

          sl_hrd_options_init (&o);
          o.plane = SL_HRD_OBSERVATIONAL;
          o.highlight = chosen;
          ok = sl_hrd_draw (&fig, stars, &o, NULL, NULL, &error);
        }
      else if (kind == SL_FIGURE_KIND_SKY)
        {
          SlSkyOptions o;

          sl_sky_options_init (&o);
          o.coordinates = SL_SKY_GALACTIC;
          o.highlight = chosen;
          ok = sl_sky_draw (&fig, stars, &o, NULL, &error);
        }
      else
        {
          SlParallaxOptions o;

          sl_parallax_options_init (&o);
          o.proper_motion = TRUE;
          ok = sl_parallax_draw (&fig, stars, &o, NULL, &error);
        }
      g_assert_true (ok);
      sl_figure_clear (&fig);
      cairo_destroy (cr);

      g_assert_cmpuint (inked (by_job), >, 1000);
      assert_same_pixels (by_job, direct, sl_figure_kind_name (kind));
      cairo_surface_destroy (by_job);
      cairo_surface_destroy (direct);
    }
}

static char *
designations (const SlStarSet *stars)
{
  g_autoptr (GStrvBuilder) b = g_strv_builder_new ();
  g_auto (GStrv) names = NULL;

  for (guint i = 0; i < stars->stars->len; i++)
    g_strv_builder_add (b, sl_star_set_get (stars, i)->designation);
  names = g_strv_builder_end (b);
  return g_strjoinv (",", names);
}

/* Which stars each kind draws, with and without a list and stars named. */
static void
test_load_rules (SlTestProject *f, gconstpointer data)
{
  static const char *const c_then_b[] = { "C", "B", NULL };
  static const char *const one[] = { "B", NULL };
  struct {
    SlFigureKind kind;
    const char *list;
    const char *const *stars;
    const char *want;
  } cases[] = {
    { SL_FIGURE_KIND_HR, NULL, NULL, "A,B,C,D,E" },
    { SL_FIGURE_KIND_HR, NULL, c_then_b, "A,B,C,D,E" },
    { SL_FIGURE_KIND_SKY, "near", NULL, "B,C" },
    { SL_FIGURE_KIND_SKY, "near", one, "B,C" },
    { SL_FIGURE_KIND_PARALLAX, NULL, NULL, "" },
    /* The paths in the order named. */
    { SL_FIGURE_KIND_PARALLAX, NULL, c_then_b, "C,B" },
    { SL_FIGURE_KIND_PARALLAX, "near", NULL, "B,C" },
    { SL_FIGURE_KIND_PARALLAX, "near", one, "B" },
  };

  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_auto (SlFigureJob) job = { 0 };
      g_autoptr (GError) error = NULL;
      g_autoptr (SlStarSet) stars = NULL;
      g_autofree char *got = NULL;

      sl_figure_job_init (&job, cases[i].kind);
      sl_figure_job_set_list (&job, cases[i].list);
      sl_figure_job_set_stars (&job, cases[i].stars);
      stars = sl_figure_job_load (&job, f->project, NULL, &error);
      g_assert_no_error (error);
      got = designations (stars);
      g_assert_cmpstr (got, ==, cases[i].want);
    }
}

/* A star named that is not there, or not in the list, is an error that
 * names the project, the star and the list. */
static void
test_load_unknown (SlTestProject *f, gconstpointer data)
{
  static const char *const nobody[] = { "Z", NULL };
  static const char *const outside[] = { "A", NULL };
  const char *path = sl_project_path (f->project);
  struct {
    SlFigureKind kind;
    const char *list;
    const char *const *stars;
    const char *message;
  } cases[] = {
    { SL_FIGURE_KIND_HR, NULL, nobody, "no star 'Z' in the project" },
    { SL_FIGURE_KIND_PARALLAX, NULL, nobody, "no star 'Z' in the project" },
    { SL_FIGURE_KIND_SKY, "near", outside, "star 'A' is not in list 'near'" },
    { SL_FIGURE_KIND_PARALLAX, "near", outside, "star 'A' is not in list 'near'" },
  };

  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_auto (SlFigureJob) job = { 0 };
      g_autoptr (GError) error = NULL;
      g_autoptr (SlStarSet) stars = NULL;
      g_autofree char *want = g_strdup_printf ("%s: %s", path, cases[i].message);

      sl_figure_job_init (&job, cases[i].kind);
      sl_figure_job_set_list (&job, cases[i].list);
      sl_figure_job_set_stars (&job, cases[i].stars);
      stars = sl_figure_job_load (&job, f->project, NULL, &error);
      g_assert_null (stars);
      g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
      g_assert_cmpstr (error->message, ==, want);
    }
}

/* Stars loaded already (the window's views) serve a figure that would
 * load the same: hr and sky of the same list; the parallax figure and
 * another list load their own; a star named that is not among them is
 * the same error as a load gives. */
static void
test_reuse (SlTestProject *f, gconstpointer data)
{
  static const char *const one[] = { "B", NULL };
  static const char *const outside[] = { "A", NULL };
  const char *path = sl_project_path (f->project);
  g_autoptr (GError) error = NULL;
  g_autoptr (SlStarSet) all = sl_star_set_load_full (f->project, NULL, NULL, &error);
  g_autoptr (SlStarSet) near = sl_star_set_load_list_full (f->project, "near", NULL, &error);
  struct {
    SlFigureKind       kind;
    const char        *list;
    const char *const *stars;
    SlStarSet         *loaded;
    const char        *loaded_list;
    gboolean           reused;
    const char        *message;
  } cases[] = {
    { SL_FIGURE_KIND_HR, NULL, NULL, all, NULL, TRUE, NULL },
    { SL_FIGURE_KIND_SKY, NULL, one, all, NULL, TRUE, NULL },
    { SL_FIGURE_KIND_SKY, "near", one, near, "near", TRUE, NULL },
    { SL_FIGURE_KIND_HR, "near", NULL, all, NULL, FALSE, NULL },
    { SL_FIGURE_KIND_HR, NULL, NULL, near, "near", FALSE, NULL },
    { SL_FIGURE_KIND_PARALLAX, NULL, one, all, NULL, FALSE, NULL },
    { SL_FIGURE_KIND_HR, NULL, NULL, NULL, NULL, FALSE, NULL },
    { SL_FIGURE_KIND_SKY, "near", outside, near, "near", FALSE, "star 'A' is not in list 'near'" },
  };

  g_assert_no_error (error);
  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_auto (SlFigureJob) job = { 0 };
      g_autoptr (SlStarSet) reused = NULL;

      sl_figure_job_init (&job, cases[i].kind);
      sl_figure_job_set_list (&job, cases[i].list);
      sl_figure_job_set_stars (&job, cases[i].stars);
      reused = sl_figure_job_reuse (&job, cases[i].loaded, cases[i].loaded_list, path, &error);
      g_assert_true (reused == (cases[i].reused ? cases[i].loaded : NULL));
      if (cases[i].message)
        {
          g_autofree char *want = g_strdup_printf ("%s: %s", path, cases[i].message);

          g_assert_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME);
          g_assert_cmpstr (error->message, ==, want);
          g_clear_error (&error);
        }
      else
        g_assert_no_error (error);
      /* What a load of the same job gives, star for star. */
      if (reused)
        {
          g_autoptr (SlStarSet) loaded = sl_figure_job_load (&job, f->project, NULL, &error);
          g_autofree char *want = designations (loaded);
          g_autofree char *got = designations (reused);

          g_assert_cmpstr (got, ==, want);
        }
    }
}

/* Cancelled before it starts, a load of more stars than one cancel
 * interval stops; a run writes no file.  With fewer stars than that the
 * load finishes, and the run still refuses to write. */
static void
test_load_cancelled (SlTestProject *f, gconstpointer data)
{
  g_autoptr (GString) csv = g_string_new ("id,ra,dec,parallax,parallax_err,vmag\n");
  g_autofree char *input = NULL;
  g_autofree char *out = g_build_filename (f->dir, "never.png", NULL);
  g_autoptr (GCancellable) cancellable = g_cancellable_new ();
  g_autoptr (SlImportReport) report = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (SlStarSet) stars = NULL;
  g_auto (SlFigureJob) job = { 0 };
  SlImportOptions options;

  for (guint i = 0; i < 10000; i++)
    g_string_append_printf (csv, "S%05u,%u.5,%d.25,%u.5,0.5,9.5\n", i, i % 360, (int) (i % 170) - 85, 1 + i % 50);
  input = sl_test_write_file (f->dir, "many.csv", csv->str, csv->len);
  sl_import_options_init (&options);
  report = sl_import_csv (f->project, input, &options, &error);
  g_assert_no_error (error);

  sl_figure_job_init (&job, SL_FIGURE_KIND_SKY);
  stars = sl_figure_job_load (&job, f->project, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (stars->stars->len, ==, 10005);
  g_clear_pointer (&stars, sl_star_set_free);

  g_cancellable_cancel (cancellable);
  stars = sl_figure_job_load (&job, f->project, cancellable, &error);
  g_assert_null (stars);
  g_assert_error (error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  g_clear_error (&error);

  g_assert_false (sl_figure_job_run (&job, f->project, out, SL_FIGURE_FORMAT_PNG, cancellable, NULL, &error));
  g_assert_error (error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  g_assert_false (g_file_test (out, G_FILE_TEST_EXISTS));
}

/* The PNG the job writes is its drawing at the file's resolution. */
static void
test_write_is_drawing (SlTestProject *f, gconstpointer data)
{
  static const char *const chosen[] = { "B", NULL };
  g_autofree char *out = g_build_filename (f->dir, "hr.png", NULL);
  g_auto (SlFigureJob) job = { 0 };
  g_autoptr (GError) error = NULL;
  g_autoptr (GPtrArray) notes = g_ptr_array_new_with_free_func (g_free);
  g_autoptr (SlStarSet) stars = NULL;
  cairo_surface_t *written, *drawn;
  cairo_t *cr;

  sl_figure_job_init (&job, SL_FIGURE_KIND_HR);
  job.style.dpi = 144.0;   /* 2 pixels per point, as SCALE */
  job.style.width_mm = 127.0;   /* whole pixels: the job's clip cuts none in half */
  job.style.height_mm = 76.2;
  sl_figure_job_set_stars (&job, chosen);
  g_assert_true (sl_figure_job_run (&job, f->project, out, SL_FIGURE_FORMAT_PNG, NULL, notes, &error));
  g_assert_no_error (error);

  written = cairo_image_surface_create_from_png (out);
  g_assert_cmpint (cairo_surface_status (written), ==, CAIRO_STATUS_SUCCESS);
  stars = sl_figure_job_load (&job, f->project, NULL, &error);
  drawn = page_surface (&job.style);
  cr = cairo_create (drawn);
  cairo_scale (cr, SCALE, SCALE);
  g_assert_true (sl_figure_job_draw (&job, stars, cr, NULL, &error));
  cairo_destroy (cr);
  g_assert_cmpint (cairo_image_surface_get_width (written), ==, cairo_image_surface_get_width (drawn));
  /* The PNG is RGB24 when it has no transparency: compare colours only. */
  {
    int stride_w = cairo_image_surface_get_stride (written), stride_d = cairo_image_surface_get_stride (drawn);
    guint differing = 0;

    cairo_surface_flush (written);
    for (int y = 0; y < cairo_image_surface_get_height (drawn); y++)
      for (int x = 0; x < cairo_image_surface_get_width (drawn); x++)
        {
          guint32 a = *(guint32 *) (cairo_image_surface_get_data (written) + y * stride_w + 4 * x);
          guint32 b = *(guint32 *) (cairo_image_surface_get_data (drawn) + y * stride_d + 4 * x);

          differing += (a & 0xffffff) != (b & 0xffffff);
        }
    g_assert_cmpuint (differing, ==, 0);
  }
  cairo_surface_destroy (written);
  cairo_surface_destroy (drawn);
}

/* The kinds' names and titles. */
static void
test_kinds (void)
{
  SlFigureKind kind;

  for (SlFigureKind k = 0; k < SL_FIGURE_N_KINDS; k++)
    {
      g_assert_true (sl_figure_kind_from_name (sl_figure_kind_name (k), &kind));
      g_assert_cmpint (kind, ==, k);
      g_assert_nonnull (sl_figure_kind_title (k));
    }
  g_assert_false (sl_figure_kind_from_name ("hrd", &kind));
  g_assert_false (sl_figure_kind_from_name (NULL, &kind));
  g_assert_cmpstr (sl_figure_kind_name (SL_FIGURE_KIND_SKY), ==, "sky");
}

/* The command line names only what differs from the defaults, quotes what
 * a shell would split, and picks the double-column preset by its name. */
static void
test_command_line (void)
{
  static const char *const chosen[] = { "LHO 0004", "B", NULL };
  g_auto (SlFigureJob) job = { 0 };
  g_autofree char *plain = NULL;
  g_autofree char *full = NULL;
  g_autofree char *custom = NULL;
  g_autofree char *sky = NULL;
  g_autofree char *home = NULL;
  g_autofree char *home_spaced = NULL;
  g_autofree char *tilde_list = NULL;

  sl_figure_job_init (&job, SL_FIGURE_KIND_HR);
  plain = sl_figure_job_command_line (&job, "/data/p.starledger", "hr.pdf");
  g_assert_cmpstr (plain, ==, "starledger-cli figure /data/p.starledger hr -o hr.pdf");

  /* A project in the home folder, as the window shows it: the shell
   * expands the "~/", so it stays outside the quotes. */
  home = sl_figure_job_command_line (&job, "~/Observing/p.starledger", "hr.pdf");
  g_assert_cmpstr (home, ==, "starledger-cli figure ~/Observing/p.starledger hr -o hr.pdf");
  home_spaced = sl_figure_job_command_line (&job, "~/My Stars/p.starledger", "hr.pdf");
  g_assert_cmpstr (home_spaced, ==, "starledger-cli figure ~/'My Stars/p.starledger' hr -o hr.pdf");
  /* Anything else that begins with "~" is quoted: it is a name, not a home. */
  sl_figure_job_set_list (&job, "~/list");
  tilde_list = sl_figure_job_command_line (&job, "p.starledger", "hr.pdf");
  g_assert_cmpstr (tilde_list, ==, "starledger-cli figure p.starledger hr -o hr.pdf --list '~/list'");
  sl_figure_job_set_list (&job, NULL);

  sl_figure_style_preset (&job.style, "double");
  job.style.dpi = 600;
  job.style.font_pt = 8.5;
  job.style.grayscale = TRUE;
  job.hrd.plane = SL_HRD_OBSERVATIONAL;
  job.hrd.errors = FALSE;
  sl_figure_job_set_list (&job, "winter run");
  sl_figure_job_set_stars (&job, chosen);
  full = sl_figure_job_command_line (&job, "/my data/p.starledger", "out/hr.png");
  g_assert_cmpstr (full, ==,
                   "starledger-cli figure '/my data/p.starledger' hr -o out/hr.png --size double --dpi 600 "
                   "--font-pt 8.5 --grayscale --list 'winter run' --star 'LHO 0004' --star B "
                   "--plane observational --no-errors");

  /* The resolution matters only for PNG. */
  job.style.width_mm = 120;
  custom = sl_figure_job_command_line (&job, "p.starledger", "hr.svg");
  g_assert_cmpstr (custom, ==,
                   "starledger-cli figure p.starledger hr -o hr.svg --width-mm 120 --height-mm 110 "
                   "--font-pt 8.5 --grayscale --list 'winter run' --star 'LHO 0004' --star B "
                   "--plane observational --no-errors");

  sl_figure_job_clear (&job);
  sl_figure_job_init (&job, SL_FIGURE_KIND_SKY);
  job.sky.coordinates = SL_SKY_GALACTIC;
  job.sky.ellipse_scale = 2000;
  sky = sl_figure_job_command_line (&job, "p.starledger", "sky.svg");
  g_assert_cmpstr (sky, ==, "starledger-cli figure p.starledger sky -o sky.svg --coordinates galactic --ellipses 2000");
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/plot/figure-job/kinds", test_kinds);
  g_test_add_func ("/plot/figure-job/command-line", test_command_line);
  g_test_add ("/plot/figure-job/draw-as-before", SlTestProject, NULL, fixture_set_up, test_draw_as_before,
              sl_test_project_tear_down);
  g_test_add ("/plot/figure-job/load/rules", SlTestProject, NULL, fixture_set_up, test_load_rules,
              sl_test_project_tear_down);
  g_test_add ("/plot/figure-job/load/unknown", SlTestProject, NULL, fixture_set_up, test_load_unknown,
              sl_test_project_tear_down);
  g_test_add ("/plot/figure-job/reuse", SlTestProject, NULL, fixture_set_up, test_reuse,
              sl_test_project_tear_down);
  g_test_add ("/plot/figure-job/load/cancelled", SlTestProject, NULL, fixture_set_up, test_load_cancelled,
              sl_test_project_tear_down);
  g_test_add ("/plot/figure-job/write-is-drawing", SlTestProject, NULL, fixture_set_up, test_write_is_drawing,
              sl_test_project_tear_down);
  return g_test_run ();
}
