/* cmd-figure.c: starledger-cli figure PROJECT hr|sky|parallax -o FILE [options]
 *
 * Only the options are read here: the figure itself (which stars, the
 * drawing, the file) is src/plot/figure-job.c, which the window's Export
 * Figure dialog uses too. */
#include <glib/gi18n.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "figure-job.h"
#include "sl-error.h"
#include "units.h"

/* --field RA,DEC,WIDTH with RA and DEC in degrees or sexagesimal. */
static gboolean
parse_field (const char *text, SlSkyOptions *sky)
{
  g_auto (GStrv) parts = g_strsplit (text, ",", -1);
  const char *problem;

  if (g_strv_length (parts) != 3)
    return FALSE;
  if (!sl_parse_number (parts[0], &sky->centre_ra, &problem))
    {
      if (!sl_parse_sexagesimal (parts[0], TRUE, &sky->centre_ra, &problem))
        return FALSE;
      sky->centre_ra *= 15.0;
    }
  if (!sl_parse_number (parts[1], &sky->centre_dec, &problem)
      && !sl_parse_sexagesimal (parts[1], FALSE, &sky->centre_dec, &problem))
    return FALSE;
  sky->field = TRUE;
  return sl_parse_number (parts[2], &sky->field_deg, &problem) && sky->field_deg > 0 && sky->field_deg < 90
         && fabs (sky->centre_dec) <= 90.0;
}

int
sl_cli_figure (int argc, char **argv)
{
  g_autofree char *output = NULL;
  g_autofree char *size = NULL;
  g_autofree char *width = NULL;
  g_autofree char *height = NULL;
  g_autofree char *dpi = NULL;
  g_autofree char *font = NULL;
  g_autofree char *plane = NULL;
  g_autofree char *coordinates = NULL;
  g_autofree char *field = NULL;
  g_autofree char *pm_years = NULL;
  g_autofree char *ellipses = NULL;
  g_autofree char *start = NULL;
  g_autofree char *years = NULL;
  g_autofree char *list = NULL;
  g_auto (GStrv) stars_wanted = NULL;
  gboolean grayscale = FALSE, proper_motion = FALSE, common_scale = FALSE, no_errors = FALSE;
  const GOptionEntry entries[] = {
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, N_("Write to FILE.pdf, FILE.svg or FILE.png ('-': PNG on standard output)"), N_("FILE") },
    { "size", 0, 0, G_OPTION_ARG_STRING, &size, N_("A journal's column: single (88 x 70 mm, default) or double (180 x 110 mm)"), N_("PRESET") },
    { "width-mm", 0, 0, G_OPTION_ARG_STRING, &width, N_("Page width in millimetres"), N_("W") },
    { "height-mm", 0, 0, G_OPTION_ARG_STRING, &height, N_("Page height in millimetres"), N_("H") },
    { "dpi", 0, 0, G_OPTION_ARG_STRING, &dpi, N_("PNG resolution (default 300)"), N_("D") },
    { "font-pt", 0, 0, G_OPTION_ARG_STRING, &font, N_("Body text size in points (default 7)"), N_("P") },
    { "grayscale", 0, 0, G_OPTION_ARG_NONE, &grayscale, N_("Grey instead of the colour scale, for print"), NULL },
    { "star", 0, 0, G_OPTION_ARG_STRING_ARRAY, &stars_wanted, N_("Highlight this star (hr, sky), draw its path (parallax); repeatable"), N_("ID") },
    { "list", 0, 0, G_OPTION_ARG_STRING, &list, N_("Only the stars of this target list (parallax: their paths, or those of --star among them)"), N_("NAME") },
    { "plane", 0, 0, G_OPTION_ARG_STRING, &plane, N_("hr: theoretical (log Teff, log L; default) or observational ((B-V)0, M_V)"), N_("PLANE") },
    { "no-errors", 0, 0, G_OPTION_ARG_NONE, &no_errors, N_("hr: no error ellipses or bars"), NULL },
    { "coordinates", 0, 0, G_OPTION_ARG_STRING, &coordinates, N_("sky: equatorial (default) or galactic"), N_("SYSTEM") },
    { "field", 0, 0, G_OPTION_ARG_STRING, &field, N_("sky: a gnomonic field around RA,DEC (deg or sexagesimal), WIDTH deg wide"), N_("RA,DEC,WIDTH") },
    { "pm-years", 0, 0, G_OPTION_ARG_STRING, &pm_years, N_("sky field: proper-motion arrows over N years"), N_("N") },
    { "ellipses", 0, 0, G_OPTION_ARG_STRING, &ellipses, N_("sky: draw parallax ellipses magnified by FACTOR"), N_("FACTOR") },
    { "start", 0, 0, G_OPTION_ARG_STRING, &start, N_("parallax: start of the path (Julian year, default 2026.0)"), N_("JYEAR") },
    { "years", 0, 0, G_OPTION_ARG_STRING, &years, N_("parallax: length of the path in years (default 1)"), N_("N") },
    { "proper-motion", 0, 0, G_OPTION_ARG_NONE, &proper_motion, N_("parallax: add the proper motion"), NULL },
    { "common-scale", 0, 0, G_OPTION_ARG_NONE, &common_scale, N_("parallax: one scale for every star"), NULL },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("figure", _("PROJECT hr|sky|parallax"), _("Draw a figure for a paper."),
                        _("hr: the Hertzsprung-Russell diagram; sky: positions (Hammer-Aitoff, or a field); "
                          "parallax: the annual parallax paths of the stars given with --star.\n"
                          "The format follows the file name's extension. Sizes are in millimetres, text "
                          "and lines in points; PDF and SVG carry the project and derivation run."),
                        entries);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GPtrArray) notes = g_ptr_array_new_with_free_func (g_free);
  SlFigureFormat format;
  SlFigureKind kind;
  g_auto (SlFigureJob) job = { 0 };

  if (!sl_cli_parse (context, "figure", &argc, &argv, 2))
    return SL_EXIT_USAGE;
  if (!sl_figure_kind_from_name (argv[2], &kind))
    return sl_cli_usage_error ("figure", _("'%s' is no figure: hr, sky or parallax"), argv[2]);
  if (output == NULL)
    return sl_cli_usage_error ("figure", _("-o FILE is required"));
  if (strcmp (output, "-") == 0)
    format = SL_FIGURE_FORMAT_PNG;
  else if (!sl_figure_format_from_path (output, &format))
    return sl_cli_usage_error ("figure", _("%s: the file name must end in .pdf, .svg or .png"), output);

  sl_figure_job_init (&job, kind);
  if (size && !sl_figure_style_preset (&job.style, size))
    return sl_cli_usage_error ("figure", _("--size %s: expected single or double"), size);
  if (!sl_cli_parse_number_option (width, &job.style.width_mm, 10, 1000)
      || !sl_cli_parse_number_option (height, &job.style.height_mm, 10, 1000)
      || !sl_cli_parse_number_option (dpi, &job.style.dpi, 10, 2400)
      || !sl_cli_parse_number_option (font, &job.style.font_pt, 3, 30))
    return sl_cli_usage_error ("figure", _("sizes: width and height 10-1000 mm, dpi 10-2400, font 3-30 pt"));
  job.style.grayscale = grayscale;

  if (plane && strcmp (plane, "theoretical") != 0 && strcmp (plane, "observational") != 0)
    return sl_cli_usage_error ("figure", _("--plane %s: expected theoretical or observational"), plane);
  if (plane && strcmp (plane, "observational") == 0)
    job.hrd.plane = SL_HRD_OBSERVATIONAL;
  job.hrd.errors = !no_errors;
  if (coordinates && strcmp (coordinates, "equatorial") != 0 && strcmp (coordinates, "galactic") != 0)
    return sl_cli_usage_error ("figure", _("--coordinates %s: expected equatorial or galactic"), coordinates);
  if (coordinates && strcmp (coordinates, "galactic") == 0)
    job.sky.coordinates = SL_SKY_GALACTIC;
  if (field && !parse_field (field, &job.sky))
    return sl_cli_usage_error ("figure", _("--field %s: expected RA,DEC,WIDTH (degrees or sexagesimal)"), field);
  if (!sl_cli_parse_number_option (pm_years, &job.sky.pm_years, 0, 100000)
      || !sl_cli_parse_number_option (ellipses, &job.sky.ellipse_scale, 0, 1e12)
      || !sl_cli_parse_number_option (start, &job.parallax.start_jyear, 1000, 3000)
      || !sl_cli_parse_number_option (years, &job.parallax.years, 0.01, 1000))
    return sl_cli_usage_error ("figure", _("a number option is out of range"));
  job.parallax.proper_motion = proper_motion;
  job.parallax.common_scale = common_scale;
  sl_figure_job_set_stars (&job, (const char *const *) stars_wanted);
  sl_figure_job_set_list (&job, list);

  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  if (!sl_figure_job_run (&job, project, output, format, NULL, notes, &error))
    return sl_cli_fail (error);
  for (guint i = 0; i < notes->len; i++)
    fprintf (stderr, "starledger-cli figure: %s\n", (const char *) notes->pdata[i]);
  return SL_EXIT_OK;
}
