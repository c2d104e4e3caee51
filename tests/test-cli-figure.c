/* test-cli-figure.c: starledger-cli figure end to end on the demo
 * project: every kind in every format, the files read back with outside
 * tools (pdftotext and pdfinfo from poppler, xmllint from libxml2, cairo's
 * PNG reader), sizes from millimetres and DPI, metadata, determinism, the
 * "nothing to draw" path, and each figure against its reference image. */
#include <cairo.h>
#include <math.h>
#include <string.h>
#include <sys/wait.h>

#include "cli-util.h"
#include "test-util.h"

/* A scratch directory with the demo project, derived, shared by the tests. */
static char *scratch;
static char *project;

static void
make_demo_project (void)
{
  project = make_derived_demo_project (&scratch);
}

static char *
output_path (const char *name)
{
  return g_build_filename (scratch, name, NULL);
}

/* Runs an outside program and returns its standard output. */
static char *
run_tool (const char *const *argv)
{
  g_autoptr (GError) error = NULL;
  char *out = NULL;
  int status;

  g_spawn_sync (NULL, (char **) argv, NULL, G_SPAWN_SEARCH_PATH | G_SPAWN_STDERR_TO_DEV_NULL, NULL, NULL,
                &out, NULL, &status, &error);
  g_assert_no_error (error);
  if (!g_spawn_check_wait_status (status, NULL))
    g_error ("%s failed", argv[0]);
  return out;
}

static void
figure (const char *kind, const char *file, const char *const *extra)
{
  g_autoptr (GPtrArray) args = g_ptr_array_new ();
  g_autoptr (GError) error = NULL;
  g_auto (GStrv) envp = g_get_environ ();
  g_autofree char *out = NULL;
  g_autofree char *err = NULL;
  int status;

  g_ptr_array_add (args, (gpointer) g_getenv ("STARLEDGER_CLI"));
  g_ptr_array_add (args, "figure");
  g_ptr_array_add (args, project);
  g_ptr_array_add (args, (gpointer) kind);
  g_ptr_array_add (args, "-o");
  g_ptr_array_add (args, (gpointer) file);
  for (guint i = 0; extra && extra[i]; i++)
    g_ptr_array_add (args, (gpointer) extra[i]);
  g_ptr_array_add (args, NULL);
  g_spawn_sync (NULL, (char **) args->pdata, envp, G_SPAWN_DEFAULT, NULL, NULL, &out, &err, &status, &error);
  g_assert_no_error (error);
  if (!WIFEXITED (status) || WEXITSTATUS (status) != 0)
    g_error ("figure %s -o %s failed: %s", kind, file, err);
}

static const char *const parallax_stars[] = { "--star", "LHO 0001", "--star", "LHO 0004", "--star", "LHO 0010", NULL };

static const char *const *
extra_for (const char *kind)
{
  return strcmp (kind, "parallax") == 0 ? parallax_stars : NULL;
}

/* The PNG's pixel size is the page in millimetres at the DPI. */
static void
test_png_size (void)
{
  const char *kinds[] = { "hr", "sky", "parallax" };

  for (gsize i = 0; i < G_N_ELEMENTS (kinds); i++)
    {
      g_autofree char *name = g_strdup_printf ("%s.png", kinds[i]);
      g_autofree char *path = output_path (name);
      cairo_surface_t *png;

      figure (kinds[i], path, extra_for (kinds[i]));
      png = cairo_image_surface_create_from_png (path);
      g_assert_cmpint (cairo_surface_status (png), ==, CAIRO_STATUS_SUCCESS);
      /* 88 x 70 mm at 300 dpi (the single-column default). */
      g_assert_cmpint (cairo_image_surface_get_width (png), ==, (int) lround (88.0 / 25.4 * 300));
      g_assert_cmpint (cairo_image_surface_get_height (png), ==, (int) lround (70.0 / 25.4 * 300));
      cairo_surface_destroy (png);
    }
}

static void
test_png_custom_size (void)
{
  g_autofree char *path = output_path ("hr-wide.png");
  const char *extra[] = { "--width-mm", "120", "--height-mm", "80", "--dpi", "150", NULL };
  cairo_surface_t *png;

  figure ("hr", path, extra);
  png = cairo_image_surface_create_from_png (path);
  g_assert_cmpint (cairo_image_surface_get_width (png), ==, (int) lround (120.0 / 25.4 * 150));
  g_assert_cmpint (cairo_image_surface_get_height (png), ==, (int) lround (80.0 / 25.4 * 150));
  cairo_surface_destroy (png);
}

/* pdftotext finds the axis titles; pdfinfo the metadata. */
static void
test_pdf_text_and_metadata (void)
{
  g_autofree char *path = output_path ("hr.pdf");
  g_autofree char *text = NULL;
  g_autofree char *info = NULL;

  figure ("hr", path, NULL);
  text = run_tool ((const char *const[]) { "pdftotext", path, "-", NULL });
  g_assert_nonnull (strstr (text, "log"));
  g_assert_nonnull (strstr (text, "eff"));
  info = run_tool ((const char *const[]) { "pdfinfo", path, NULL });
  g_assert_nonnull (strstr (info, "Hertzsprung-Russell diagram"));
  g_assert_nonnull (strstr (info, "Starledger " PACKAGE_VERSION));
  g_assert_nonnull (strstr (info, "derivation run 1"));
  /* 88 x 70 mm in points. */
  g_assert_nonnull (strstr (info, "249.449 x 198.425 pts"));
}

/* Each SVG is well-formed XML and names where it came from. */
static void
test_svg_xml_and_metadata (void)
{
  const char *kinds[] = { "hr", "sky", "parallax" };

  for (gsize i = 0; i < G_N_ELEMENTS (kinds); i++)
    {
      g_autofree char *name = g_strdup_printf ("%s.svg", kinds[i]);
      g_autofree char *path = output_path (name);
      g_autofree char *contents = NULL;
      g_autofree char *lint = NULL;

      figure (kinds[i], path, extra_for (kinds[i]));
      lint = run_tool ((const char *const[]) { "xmllint", "--noout", path, NULL });
      g_assert_true (g_file_get_contents (path, &contents, NULL, NULL));
      g_assert_nonnull (strstr (contents, "<title>"));
      g_assert_nonnull (strstr (contents, "derivation run 1"));
    }
}

/* The same project and options give the same file, a PDF too: its
 * creation date is the derivation run's (a second apart, "now" would
 * differ). */
static void
test_deterministic (void)
{
  const char *formats[] = { "png", "svg", "pdf" };

  for (gsize i = 0; i < G_N_ELEMENTS (formats); i++)
    {
      g_autofree char *one_name = g_strdup_printf ("sky-1.%s", formats[i]);
      g_autofree char *two_name = g_strdup_printf ("sky-2.%s", formats[i]);
      g_autofree char *one = output_path (one_name);
      g_autofree char *two = output_path (two_name);
      g_autofree char *a = NULL;
      g_autofree char *b = NULL;
      gsize la, lb;

      figure ("sky", one, NULL);
      if (g_str_equal (formats[i], "pdf"))
        g_usleep (G_USEC_PER_SEC * 11 / 10);
      figure ("sky", two, NULL);
      g_assert_true (g_file_get_contents (one, &a, &la, NULL));
      g_assert_true (g_file_get_contents (two, &b, &lb, NULL));
      g_assert_cmpmem (a, la, b, lb);
    }
}

/* Nothing derived yet: a message in the figure and on stderr, exit 0. */
static void
test_nothing_to_draw (void)
{
  g_autofree char *empty = output_path ("empty.starledger");
  g_autofree char *csv = sl_test_write_file (scratch, "one.csv", "id,ra,dec\nA,10,20\n", -1);
  g_autofree char *png = output_path ("empty-hr.png");
  g_auto (CliResult) created = { 0 };
  g_auto (CliResult) imported = { 0 };
  g_auto (CliResult) drawn = { 0 };

  run_cli (&created, "new", empty, NULL);
  run_cli (&imported, "import", empty, csv, NULL);
  run_cli (&drawn, "figure", empty, "hr", "-o", png, NULL);
  g_assert_cmpint (drawn.status, ==, 0);
  g_assert_nonnull (strstr (drawn.err, "derive"));
  g_assert_true (g_file_test (png, G_FILE_TEST_EXISTS));
}

static void
test_usage_errors (void)
{
  g_autofree char *png = output_path ("x.png");
  g_autofree char *jpg = output_path ("x.jpg");
  g_auto (CliResult) kind = { 0 };
  g_auto (CliResult) extension = { 0 };
  g_auto (CliResult) missing_output = { 0 };
  g_auto (CliResult) unknown_star = { 0 };

  run_cli (&kind, "figure", project, "pie", "-o", png, NULL);
  g_assert_cmpint (kind.status, ==, 2);
  run_cli (&extension, "figure", project, "hr", "-o", jpg, NULL);
  g_assert_cmpint (extension.status, ==, 2);
  run_cli (&missing_output, "figure", project, "hr", NULL);
  g_assert_cmpint (missing_output.status, ==, 2);
  run_cli (&unknown_star, "figure", project, "hr", "-o", png, "--star", "LHO 9999", NULL);
  assert_user_error (&unknown_star, NULL);
  g_assert_false (g_file_test (jpg, G_FILE_TEST_EXISTS));
}

/* Each figure against its reference image (tests/data/figures), at
 * 100 dpi: at most 1% of the pixels may differ by more than 10%.  After
 * an intended change, regenerate them with
 *   STARLEDGER_REFRESH_FIGURES=1 meson test -C _build test-cli-figure */
static void
compare_with_reference (const char *kind)
{
  g_autofree char *name = g_strdup_printf ("%s.png", kind);
  g_autofree char *reference = g_build_filename (g_getenv ("STARLEDGER_SOURCE_DIR"), "tests", "data",
                                                 "figures", name, NULL);
  g_autofree char *path = output_path (name);
  const char *parallax_extra[] = { "--dpi", "100", "--star", "LHO 0001", "--star", "LHO 0004", "--star",
                                   "LHO 0010", NULL };
  const char *extra[] = { "--dpi", "100", NULL };
  cairo_surface_t *got, *want;
  guint differing = 0, total;
  unsigned char *g, *w;
  int width, height, stride;

  figure (kind, path, strcmp (kind, "parallax") == 0 ? parallax_extra : extra);
  if (g_getenv ("STARLEDGER_REFRESH_FIGURES"))
    {
      g_autofree char *contents = NULL;
      gsize length;

      g_assert_true (g_file_get_contents (path, &contents, &length, NULL));
      g_assert_true (g_file_set_contents (reference, contents, length, NULL));
      g_test_message ("refreshed %s", reference);
      return;
    }

  got = cairo_image_surface_create_from_png (path);
  want = cairo_image_surface_create_from_png (reference);
  g_assert_cmpint (cairo_surface_status (want), ==, CAIRO_STATUS_SUCCESS);
  width = cairo_image_surface_get_width (got);
  height = cairo_image_surface_get_height (got);
  g_assert_cmpint (width, ==, cairo_image_surface_get_width (want));
  g_assert_cmpint (height, ==, cairo_image_surface_get_height (want));
  stride = cairo_image_surface_get_stride (got);
  g = cairo_image_surface_get_data (got);
  w = cairo_image_surface_get_data (want);
  for (int y = 0; y < height; y++)
    for (int x = 0; x < width; x++)
      for (int c = 0; c < 3; c++)
        if (abs (g[y * stride + 4 * x + c] - w[y * stride + 4 * x + c]) > 25)
          {
            differing++;
            break;
          }
  total = (guint) (width * height);
  cairo_surface_destroy (got);
  cairo_surface_destroy (want);
  if (differing > total / 100)
    g_error ("%s: %u of %u pixels differ from the reference image", kind, differing, total);
}

static void
test_reference_hr (void)
{
  compare_with_reference ("hr");
}

static void
test_reference_sky (void)
{
  compare_with_reference ("sky");
}

static void
test_reference_parallax (void)
{
  compare_with_reference ("parallax");
}

int
main (int argc, char **argv)
{
  int status;

  g_test_init (&argc, &argv, NULL);
  make_demo_project ();

  g_test_add_func ("/cli/figure/png-size", test_png_size);
  g_test_add_func ("/cli/figure/png-custom-size", test_png_custom_size);
  g_test_add_func ("/cli/figure/pdf-text-and-metadata", test_pdf_text_and_metadata);
  g_test_add_func ("/cli/figure/svg-xml-and-metadata", test_svg_xml_and_metadata);
  g_test_add_func ("/cli/figure/deterministic", test_deterministic);
  g_test_add_func ("/cli/figure/nothing-to-draw", test_nothing_to_draw);
  g_test_add_func ("/cli/figure/usage-errors", test_usage_errors);
  g_test_add_func ("/cli/figure/reference/hr", test_reference_hr);
  g_test_add_func ("/cli/figure/reference/sky", test_reference_sky);
  g_test_add_func ("/cli/figure/reference/parallax", test_reference_parallax);

  status = g_test_run ();
  sl_test_scratch_free (scratch);
  g_free (project);
  return status;
}
