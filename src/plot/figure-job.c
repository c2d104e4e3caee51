/* figure-job.c: one figure request, from the command line or the window:
 * which stars it draws, its page drawn onto any cairo context, the file
 * written, and the command line that writes the same file.
 *
 * Contents:
 *   kinds .................. sl_figure_kind_name, _from_name, _title
 *   the request ............ sl_figure_job_init, _clear, _set_stars, _set_list
 *   stars .................. sl_figure_job_load (the CLI's rules, cancellable)
 *   drawing and writing .... sl_figure_job_draw, _subject, _write, _run
 *   reproducing ............ sl_figure_job_command_line
 */
#include "figure-job.h"

#include <inttypes.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "sl-error.h"

#define MM_PER_INCH 25.4
#define PT_PER_INCH 72.0

/* ------------------------------------------------------------------ */
/* Kinds                                                              */

static const char *const kind_names[SL_FIGURE_N_KINDS] = { "hr", "sky", "parallax" };

const char *
sl_figure_kind_name (SlFigureKind kind)
{
  g_return_val_if_fail (kind < SL_FIGURE_N_KINDS, NULL);
  return kind_names[kind];
}

gboolean
sl_figure_kind_from_name (const char *name, SlFigureKind *kind)
{
  for (guint i = 0; i < SL_FIGURE_N_KINDS; i++)
    if (g_strcmp0 (name, kind_names[i]) == 0)
      {
        *kind = i;
        return TRUE;
      }
  return FALSE;
}

const char *
sl_figure_kind_title (SlFigureKind kind)
{
  switch (kind)
    {
    case SL_FIGURE_KIND_HR:
      return _("Hertzsprung-Russell diagram");
    case SL_FIGURE_KIND_SKY:
      return _("Sky positions");
    default:
      return _("Annual parallax paths");
    }
}

/* ------------------------------------------------------------------ */
/* The request                                                        */

void
sl_figure_job_init (SlFigureJob *job, SlFigureKind kind)
{
  g_return_if_fail (job != NULL && kind < SL_FIGURE_N_KINDS);

  memset (job, 0, sizeof *job);
  job->kind = kind;
  sl_figure_style_init (&job->style);
  sl_hrd_options_init (&job->hrd);
  sl_sky_options_init (&job->sky);
  sl_parallax_options_init (&job->parallax);
}

void
sl_figure_job_clear (SlFigureJob *job)
{
  g_clear_pointer (&job->stars, g_strfreev);
  g_clear_pointer (&job->list, g_free);
}

void
sl_figure_job_set_stars (SlFigureJob *job, const char *const *stars)
{
  g_strfreev (job->stars);
  job->stars = stars && stars[0] ? g_strdupv ((char **) stars) : NULL;
}

void
sl_figure_job_set_list (SlFigureJob *job, const char *list)
{
  char *copy = g_strdup (list);

  g_free (job->list);
  job->list = copy;
}

/* ------------------------------------------------------------------ */
/* Stars                                                              */

/* An unknown star named (or, with a list, one not in the list) is an
 * error, not a silent no-op. */
static gboolean
check_stars_exist (const SlStarSet *stars, char **wanted, const char *project, const char *list,
                   GError **error)
{
  g_autoptr (GHashTable) missing = NULL;

  if (wanted == NULL || wanted[0] == NULL)
    return TRUE;
  /* The few stars named, looked for in one pass over the set (which may
   * hold a million), stopping once all are found. */
  missing = g_hash_table_new (g_str_hash, g_str_equal);
  for (guint i = 0; wanted[i]; i++)
    g_hash_table_add (missing, wanted[i]);
  for (guint i = 0; i < stars->stars->len && g_hash_table_size (missing) > 0; i++)
    g_hash_table_remove (missing, sl_star_set_get (stars, i)->designation);
  if (g_hash_table_size (missing) == 0)
    return TRUE;
  /* Name the first one asked for that is missing. */
  for (guint i = 0; wanted[i]; i++)
    if (g_hash_table_contains (missing, wanted[i]))
      {
        if (list)
          g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: star '%s' is not in list '%s'"), project,
                       wanted[i], list);
        else
          g_set_error (error, SL_ERROR, SL_ERROR_UNKNOWN_NAME, _("%s: no star '%s' in the project"), project,
                       wanted[i]);
        break;
      }
  return FALSE;
}

SlStarSet *
sl_figure_job_load (const SlFigureJob *job, SlProject *project, GCancellable *cancellable, GError **error)
{
  static const char *const none[] = { NULL };
  const char *path = sl_project_path (project);
  const char *const *wanted = (const char *const *) job->stars;
  g_autoptr (SlStarSet) stars = NULL;

  g_return_val_if_fail (job != NULL && project != NULL, NULL);

  /* The parallax figure draws only the chosen stars (none: it says how to
   * choose them); the others draw every star and highlight the chosen.
   * A list stands for every star, and the chosen must be in it. */
  if (job->list != NULL)
    {
      stars = sl_star_set_load_list_full (project, job->list, cancellable, error);
      if (stars == NULL || !check_stars_exist (stars, job->stars, path, job->list, error))
        return NULL;
      if (job->kind == SL_FIGURE_KIND_PARALLAX && wanted != NULL)
        {
          g_clear_pointer (&stars, sl_star_set_free);
          stars = sl_star_set_load_full (project, wanted, cancellable, error);
        }
    }
  else if (job->kind == SL_FIGURE_KIND_PARALLAX)
    stars = sl_star_set_load_full (project, wanted ? wanted : none, cancellable, error);
  else
    {
      stars = sl_star_set_load_full (project, NULL, cancellable, error);
      if (stars && !check_stars_exist (stars, job->stars, path, NULL, error))
        return NULL;
    }
  return g_steal_pointer (&stars);
}

SlStarSet *
sl_figure_job_reuse (const SlFigureJob *job, SlStarSet *loaded, const char *loaded_list, const char *project_path,
                     GError **error)
{
  g_return_val_if_fail (job != NULL, NULL);

  if (loaded == NULL || job->kind == SL_FIGURE_KIND_PARALLAX || g_strcmp0 (job->list, loaded_list) != 0)
    return NULL;
  if (!check_stars_exist (loaded, job->stars, project_path, job->list, error))
    return NULL;
  return sl_star_set_ref (loaded);
}

/* ------------------------------------------------------------------ */
/* Drawing and writing                                                */

typedef struct {
  const SlFigureJob *job;
  const SlStarSet   *stars;
  GPtrArray         *notes;
} DrawData;

static gboolean
draw_figure (SlFigure *fig, gpointer data, GError **error)
{
  DrawData *d = data;
  SlHrdOptions hrd = d->job->hrd;
  SlSkyOptions sky = d->job->sky;

  hrd.highlight = sky.highlight = (const char *const *) d->job->stars;
  switch (d->job->kind)
    {
    case SL_FIGURE_KIND_HR:
      return sl_hrd_draw (fig, d->stars, &hrd, NULL, d->notes, error);
    case SL_FIGURE_KIND_SKY:
      return sl_sky_draw (fig, d->stars, &sky, d->notes, error);
    default:
      return sl_parallax_draw (fig, d->stars, &d->job->parallax, d->notes, error);
    }
}

gboolean
sl_figure_job_draw (const SlFigureJob *job, const SlStarSet *stars, cairo_t *cr, GPtrArray *notes,
                    GError **error)
{
  double width = job->style.width_mm / MM_PER_INCH * PT_PER_INCH;
  double height = job->style.height_mm / MM_PER_INCH * PT_PER_INCH;
  DrawData data = { job, stars, notes };
  SlFigure fig;
  gboolean ok;

  g_return_val_if_fail (job != NULL && stars != NULL && cr != NULL, FALSE);

  /* As sl_figure_write: a white page, black ink. */
  cairo_save (cr);
  cairo_rectangle (cr, 0, 0, width, height);
  cairo_clip (cr);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  cairo_set_source_rgb (cr, 0, 0, 0);
  sl_figure_init (&fig, cr, width, height, &job->style);
  ok = draw_figure (&fig, &data, error);
  sl_figure_clear (&fig);
  cairo_restore (cr);
  return ok;
}

char *
sl_figure_job_subject (const SlFigureJob *job, const SlStarSet *stars, const char *project_path)
{
  if (job->list != NULL)
    return g_strdup_printf (_("project %s, list %s, derivation run %" PRId64), project_path, job->list,
                            stars->run_id);
  return g_strdup_printf (_("project %s, derivation run %" PRId64), project_path, stars->run_id);
}

gboolean
sl_figure_job_write (const SlFigureJob *job, const SlStarSet *stars, const char *project_path,
                     const char *path, SlFigureFormat format, GPtrArray *notes, GError **error)
{
  g_autofree char *subject = NULL;
  SlFigureMetadata meta = { NULL, NULL, "Starledger", NULL };
  DrawData data = { job, stars, notes };

  g_return_val_if_fail (job != NULL && stars != NULL && path != NULL, FALSE);

  subject = sl_figure_job_subject (job, stars, project_path);
  meta.title = sl_figure_kind_title (job->kind);
  meta.subject = subject;
  meta.date = stars->run_finished_at;
  return sl_figure_write (path, format, &job->style, &meta, draw_figure, &data, error);
}

gboolean
sl_figure_job_run (const SlFigureJob *job, SlProject *project, const char *path, SlFigureFormat format,
                   GCancellable *cancellable, GPtrArray *notes, GError **error)
{
  g_autoptr (SlStarSet) stars = sl_figure_job_load (job, project, cancellable, error);

  if (stars == NULL)
    return FALSE;
  /* Drawing is not interrupted; a Cancel that came while loading the
   * last rows still leaves no file. */
  if (g_cancellable_set_error_if_cancelled (cancellable, error))
    return FALSE;
  return sl_figure_job_write (job, stars, sl_project_path (project), path, format, notes, error);
}

/* ------------------------------------------------------------------ */
/* Reproducing                                                        */

/* ARG as a POSIX shell reads it back: bare when it is only safe
 * characters, else in single quotes. */
static void
append_arg (GString *line, const char *arg)
{
  gboolean bare = *arg != '\0';

  for (const char *p = arg; *p && bare; p++)
    bare = g_ascii_isalnum (*p) || strchr ("-_./,:+=@%", *p) != NULL;
  g_string_append_c (line, ' ');
  if (bare)
    g_string_append (line, arg);
  else
    {
      g_autofree char *quoted = g_shell_quote (arg);

      g_string_append (line, quoted);
    }
}

/* PATH as append_arg writes it, except that a leading "~/" (the user's
 * home folder, as the window shows it) stays outside the quotes, where
 * the shell expands it. */
static void
append_path (GString *line, const char *path)
{
  if (g_str_has_prefix (path, "~/") && path[2] != '\0')
    {
      gsize at = line->len;

      append_arg (line, path + 2);
      g_string_insert (line, at + 1, "~/");
    }
  else
    append_arg (line, path);
}

static void
append_number (GString *line, const char *option, double value)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  append_arg (line, option);
  append_arg (line, g_ascii_formatd (buf, sizeof buf, "%.10g", value));
}

char *
sl_figure_job_command_line (const SlFigureJob *job, const char *project_path, const char *output)
{
  GString *line = g_string_new ("starledger-cli figure");
  SlFigureStyle defaults, dbl;
  SlHrdOptions hrd;
  SlSkyOptions sky;
  SlParallaxOptions parallax;
  SlFigureFormat format = SL_FIGURE_FORMAT_PDF;

  g_return_val_if_fail (job != NULL && project_path != NULL && output != NULL, NULL);

  sl_figure_style_init (&defaults);
  sl_figure_style_init (&dbl);
  sl_figure_style_preset (&dbl, "double");
  sl_hrd_options_init (&hrd);
  sl_sky_options_init (&sky);
  sl_parallax_options_init (&parallax);
  sl_figure_format_from_path (output, &format);

  append_path (line, project_path);
  append_arg (line, sl_figure_kind_name (job->kind));
  append_arg (line, "-o");
  append_arg (line, output);

  if (job->style.width_mm == dbl.width_mm && job->style.height_mm == dbl.height_mm)
    append_arg (line, "--size"), append_arg (line, "double");
  else
    {
      if (job->style.width_mm != defaults.width_mm)
        append_number (line, "--width-mm", job->style.width_mm);
      if (job->style.height_mm != defaults.height_mm)
        append_number (line, "--height-mm", job->style.height_mm);
    }
  if (format == SL_FIGURE_FORMAT_PNG && job->style.dpi != defaults.dpi)
    append_number (line, "--dpi", job->style.dpi);
  if (job->style.font_pt != defaults.font_pt)
    append_number (line, "--font-pt", job->style.font_pt);
  if (job->style.grayscale)
    append_arg (line, "--grayscale");
  if (job->list)
    append_arg (line, "--list"), append_arg (line, job->list);
  for (guint i = 0; job->stars && job->stars[i]; i++)
    append_arg (line, "--star"), append_arg (line, job->stars[i]);

  switch (job->kind)
    {
    case SL_FIGURE_KIND_HR:
      if (job->hrd.plane == SL_HRD_OBSERVATIONAL)
        append_arg (line, "--plane"), append_arg (line, "observational");
      if (!job->hrd.errors)
        append_arg (line, "--no-errors");
      break;
    case SL_FIGURE_KIND_SKY:
      if (job->sky.coordinates == SL_SKY_GALACTIC)
        append_arg (line, "--coordinates"), append_arg (line, "galactic");
      if (job->sky.field)
        {
          char ra[G_ASCII_DTOSTR_BUF_SIZE], dec[G_ASCII_DTOSTR_BUF_SIZE], width[G_ASCII_DTOSTR_BUF_SIZE];
          g_autofree char *field = g_strdup_printf ("%s,%s,%s",
                                                    g_ascii_formatd (ra, sizeof ra, "%.10g", job->sky.centre_ra),
                                                    g_ascii_formatd (dec, sizeof dec, "%.10g", job->sky.centre_dec),
                                                    g_ascii_formatd (width, sizeof width, "%.10g", job->sky.field_deg));

          append_arg (line, "--field"), append_arg (line, field);
          if (job->sky.pm_years != sky.pm_years)
            append_number (line, "--pm-years", job->sky.pm_years);
        }
      if (job->sky.ellipse_scale != sky.ellipse_scale)
        append_number (line, "--ellipses", job->sky.ellipse_scale);
      break;
    default:
      if (job->parallax.start_jyear != parallax.start_jyear)
        append_number (line, "--start", job->parallax.start_jyear);
      if (job->parallax.years != parallax.years)
        append_number (line, "--years", job->parallax.years);
      if (job->parallax.proper_motion)
        append_arg (line, "--proper-motion");
      if (job->parallax.common_scale)
        append_arg (line, "--common-scale");
      break;
    }
  return g_string_free (line, FALSE);
}
