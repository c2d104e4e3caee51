/* figure.c: pages, text, axes, the colour scale and scatter drawing.
 *
 * Contents:
 *   styles and formats ..... sl_figure_style_init, sl_figure_format_from_path
 *   writing files .......... sl_figure_write (PDF, SVG with metadata, PNG)
 *   text ................... sl_figure_text, sl_figure_halo_text, sl_figure_message,
 *                            sl_figure_add_note, numbers with a minus sign
 *   axes ................... sl_nice_step, sl_figure_place_frame, sl_figure_tick,
 *                            sl_figure_axes
 *   colour ................. sl_temperature_colour (a CIELAB path)
 *   scatter ................ sl_figure_scatter, sl_figure_scatter_sized (markers or a
 *                            density image)
 */
#include "figure.h"

#include <cairo-pdf.h>
#include <cairo-svg.h>
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "sl-error.h"
#include "util.h"

#define MM_PER_INCH 25.4
#define PT_PER_INCH 72.0

/* ------------------------------------------------------------------ */
/* Styles and formats                                                 */

void
sl_figure_style_init (SlFigureStyle *style)
{
  style->width_mm = 88.0;
  style->height_mm = 70.0;
  style->dpi = 300.0;
  style->font_pt = 7.0;
  style->line_pt = 0.5;
  style->grayscale = FALSE;
}

gboolean
sl_figure_style_preset (SlFigureStyle *style, const char *name)
{
  if (g_strcmp0 (name, "single") == 0)
    style->width_mm = 88.0, style->height_mm = 70.0;
  else if (g_strcmp0 (name, "double") == 0)
    style->width_mm = 180.0, style->height_mm = 110.0;
  else
    return FALSE;
  return TRUE;
}

gboolean
sl_figure_format_from_path (const char *path, SlFigureFormat *format)
{
  g_autofree char *lower = g_ascii_strdown (path, -1);

  if (g_str_has_suffix (lower, ".pdf"))
    *format = SL_FIGURE_FORMAT_PDF;
  else if (g_str_has_suffix (lower, ".svg"))
    *format = SL_FIGURE_FORMAT_SVG;
  else if (g_str_has_suffix (lower, ".png"))
    *format = SL_FIGURE_FORMAT_PNG;
  else
    return FALSE;
  return TRUE;
}

void
sl_figure_init (SlFigure *fig, cairo_t *cr, double width, double height, const SlFigureStyle *style)
{
  fig->cr = cr;
  fig->width = width;
  fig->height = height;
  fig->style = *style;
  fig->layout = pango_cairo_create_layout (cr);
  fig->positions = NULL;
}

void
sl_figure_clear (SlFigure *fig)
{
  g_clear_object (&fig->layout);
}

/* ------------------------------------------------------------------ */
/* Writing files                                                      */

static cairo_status_t
write_to_file (void *closure, const unsigned char *data, unsigned int length)
{
  return fwrite (data, 1, length, closure) == length ? CAIRO_STATUS_SUCCESS : CAIRO_STATUS_WRITE_ERROR;
}

static cairo_status_t
write_to_string (void *closure, const unsigned char *data, unsigned int length)
{
  g_string_append_len (closure, (const char *) data, length);
  return CAIRO_STATUS_SUCCESS;
}

static void
xml_escape_into (GString *out, const char *text)
{
  g_autofree char *escaped = g_markup_escape_text (text ? text : "", -1);

  g_string_append (out, escaped);
}

/* cairo writes no SVG metadata: put a <title> and a <desc> right after the
 * opening <svg> element, where SVG 1.1 (section 5.4) wants them. */
static void
add_svg_metadata (GString *svg, const SlFigureMetadata *meta)
{
  const char *open = strstr (svg->str, "<svg");
  const char *end = open ? strchr (open, '>') : NULL;
  GString *insert = g_string_new ("\n<title>");

  if (end == NULL)
    {
      g_string_free (insert, TRUE);
      return;
    }
  xml_escape_into (insert, meta->title);
  g_string_append (insert, "</title>\n<desc>");
  xml_escape_into (insert, "Starledger " PACKAGE_VERSION);
  if (meta->subject)
    {
      g_string_append (insert, "; ");
      xml_escape_into (insert, meta->subject);
    }
  g_string_append (insert, "</desc>");
  g_string_insert (svg, end - svg->str + 1, insert->str);
  g_string_free (insert, TRUE);
}

/* Cairo names the SVG groups and images of surfaces "surfaceN" and
 * "imageN" after a counter of every surface the process ever made: the
 * same figure came out with other names from the window (which draws on
 * surfaces all the time) than from starledger-cli.  The names are
 * renumbered 1, 2, ... in the counter's order, so the same figure gives
 * the same bytes from any program. */
#define SVG_SURFACE_NAME "(id=\"|href=\"#|url\\(#)(surface|image)([0-9]+)"

static int
compare_ids (gconstpointer a, gconstpointer b)
{
  guint64 x = *(const guint64 *) a, y = *(const guint64 *) b;

  return x < y ? -1 : x > y;
}

static gboolean
renumber_one (const GMatchInfo *match, GString *out, gpointer data)
{
  GArray *ids = data;
  g_autofree char *prefix = g_match_info_fetch (match, 1);
  g_autofree char *kind = g_match_info_fetch (match, 2);
  g_autofree char *number = g_match_info_fetch (match, 3);
  guint64 id = g_ascii_strtoull (number, NULL, 10);
  guint rank = 0;

  g_array_binary_search (ids, &id, compare_ids, &rank);
  g_string_append_printf (out, "%s%s%u", prefix, kind, rank + 1);
  return FALSE;
}

static void
renumber_svg_surfaces (GString *svg)
{
  g_autoptr (GRegex) regex = g_regex_new (SVG_SURFACE_NAME, G_REGEX_OPTIMIZE, 0, NULL);
  g_autoptr (GArray) ids = g_array_new (FALSE, FALSE, sizeof (guint64));
  g_autoptr (GMatchInfo) match = NULL;
  g_autofree char *renumbered = NULL;
  guint distinct = 0;

  g_regex_match (regex, svg->str, 0, &match);
  while (g_match_info_matches (match))
    {
      g_autofree char *number = g_match_info_fetch (match, 3);
      guint64 id = g_ascii_strtoull (number, NULL, 10);

      g_array_append_val (ids, id);
      g_match_info_next (match, NULL);
    }
  g_array_sort (ids, compare_ids);
  for (guint i = 0; i < ids->len; i++)
    if (distinct == 0 || g_array_index (ids, guint64, i) != g_array_index (ids, guint64, distinct - 1))
      g_array_index (ids, guint64, distinct++) = g_array_index (ids, guint64, i);
  g_array_set_size (ids, distinct);
  renumbered = g_regex_replace_eval (regex, svg->str, svg->len, 0, 0, renumber_one, ids, NULL);
  if (renumbered)
    g_string_assign (svg, renumbered);
}

static cairo_surface_t *
create_surface (SlFigureFormat format, const SlFigureStyle *style, double width_pt, double height_pt,
                FILE *out, GString *svg)
{
  switch (format)
    {
    case SL_FIGURE_FORMAT_PDF:
      return cairo_pdf_surface_create_for_stream (write_to_file, out, width_pt, height_pt);
    case SL_FIGURE_FORMAT_SVG:
      {
        cairo_surface_t *surface = cairo_svg_surface_create_for_stream (write_to_string, svg, width_pt, height_pt);

        cairo_svg_surface_set_document_unit (surface, CAIRO_SVG_UNIT_PT);
        return surface;
      }
    default:
      return cairo_image_surface_create (CAIRO_FORMAT_ARGB32,
                                         (int) lround (width_pt / PT_PER_INCH * style->dpi),
                                         (int) lround (height_pt / PT_PER_INCH * style->dpi));
    }
}

static void
set_pdf_metadata (cairo_surface_t *surface, const SlFigureMetadata *meta)
{
  cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_TITLE, meta->title ? meta->title : "");
  cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_CREATOR, "Starledger " PACKAGE_VERSION);
  if (meta->subject)
    cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_SUBJECT, meta->subject);
  if (meta->keywords)
    cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_KEYWORDS, meta->keywords);
  if (meta->date)
    {
      cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_CREATE_DATE, meta->date);
      cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_MOD_DATE, meta->date);
    }
}

gboolean
sl_figure_write (const char *path, SlFigureFormat format, const SlFigureStyle *style,
                 const SlFigureMetadata *meta, SlFigureDrawFunc draw, gpointer data, GError **error)
{
  double width_pt = style->width_mm / MM_PER_INCH * PT_PER_INCH;
  double height_pt = style->height_mm / MM_PER_INCH * PT_PER_INCH;
  g_autoptr (GString) svg = g_string_new (NULL);
  cairo_surface_t *surface;
  cairo_status_t status;
  char *temp_path = NULL;
  SlFigure fig;
  cairo_t *cr;
  gboolean ok;
  FILE *out;

  out = sl_output_open (path, &temp_path, error);
  if (out == NULL)
    return FALSE;

  surface = create_surface (format, style, width_pt, height_pt, out, svg);
  if (format == SL_FIGURE_FORMAT_PDF)
    set_pdf_metadata (surface, meta);
  cr = cairo_create (surface);
  if (format == SL_FIGURE_FORMAT_PNG)
    cairo_scale (cr, style->dpi / PT_PER_INCH, style->dpi / PT_PER_INCH);

  /* A white page: transparent PNGs print as black on some systems. */
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  cairo_set_source_rgb (cr, 0, 0, 0);

  sl_figure_init (&fig, cr, width_pt, height_pt, style);
  ok = draw (&fig, data, error);
  sl_figure_clear (&fig);
  cairo_destroy (cr);

  if (ok && format == SL_FIGURE_FORMAT_PNG)
    status = cairo_surface_write_to_png_stream (surface, write_to_file, out);
  else
    {
      cairo_surface_finish (surface);
      status = cairo_surface_status (surface);
    }
  cairo_surface_destroy (surface);
  if (ok && format == SL_FIGURE_FORMAT_SVG && status == CAIRO_STATUS_SUCCESS)
    {
      renumber_svg_surfaces (svg);
      add_svg_metadata (svg, meta);
      fwrite (svg->str, 1, svg->len, out);
    }
  if (ok && status != CAIRO_STATUS_SUCCESS)
    {
      g_set_error (error, SL_ERROR, SL_ERROR_IO, _("%s: cannot draw the figure: %s"), path,
                   cairo_status_to_string (status));
      ok = FALSE;
    }
  return sl_output_close (out, path, temp_path, ok, error) && ok;
}

/* ------------------------------------------------------------------ */
/* Text                                                               */

/* Pango 1.50 sizes <sub> and <sup> (its font_scale) wrongly under a
 * scaled cairo matrix, as a PNG page has: the script came out about four
 * times too large.  Spelled as spans of 70 % of the size, lowered or
 * raised by a fraction of the body size SIZE_PT, they come out right. */
static char *
expand_scripts (const char *markup, double size_pt)
{
  GString *out = g_string_new (markup);
  g_autofree char *sub = NULL, *sup = NULL;

  if (strstr (markup, "<su") == NULL)
    return g_string_free (out, FALSE);
  sub = g_strdup_printf ("<span size=\"70%%\" rise=\"%ld\">", lround (-0.15 * size_pt * PANGO_SCALE));
  sup = g_strdup_printf ("<span size=\"70%%\" rise=\"%ld\">", lround (0.4 * size_pt * PANGO_SCALE));
  g_string_replace (out, "<sub>", sub, 0);
  g_string_replace (out, "<sup>", sup, 0);
  g_string_replace (out, "</sub>", "</span>", 0);
  g_string_replace (out, "</sup>", "</span>", 0);
  return g_string_free (out, FALSE);
}

static void
set_markup (SlFigure *fig, double scale, const char *markup)
{
  PangoFontDescription *font = pango_font_description_from_string ("Sans");
  g_autofree char *expanded = expand_scripts (markup, fig->style.font_pt * scale);

  pango_font_description_set_absolute_size (font, fig->style.font_pt * scale * PANGO_SCALE);
  pango_layout_set_font_description (fig->layout, font);
  pango_font_description_free (font);
  pango_layout_set_markup (fig->layout, expanded, -1);
}

void
sl_figure_text_size (SlFigure *fig, double scale, const char *markup, double *w, double *h)
{
  int pw, ph;

  set_markup (fig, scale, markup);
  pango_layout_get_size (fig->layout, &pw, &ph);
  *w = (double) pw / PANGO_SCALE;
  *h = (double) ph / PANGO_SCALE;
}

void
sl_figure_text (SlFigure *fig, double x, double y, double ax, double ay, double scale, double angle,
                const char *markup)
{
  double w, h;

  sl_figure_text_size (fig, scale, markup, &w, &h);
  cairo_save (fig->cr);
  cairo_translate (fig->cr, x, y);
  cairo_rotate (fig->cr, -angle);
  cairo_move_to (fig->cr, -ax * w, -ay * h);
  pango_cairo_update_layout (fig->cr, fig->layout);
  pango_cairo_show_layout (fig->cr, fig->layout);
  cairo_restore (fig->cr);
}

void
sl_figure_halo_text (SlFigure *fig, double x, double y, double ax, double ay, double scale, double angle,
                     const char *markup, double grey, double halo_alpha)
{
  cairo_t *cr = fig->cr;
  double w, h;

  sl_figure_text_size (fig, scale, markup, &w, &h);
  cairo_save (cr);
  cairo_translate (cr, x, y);
  cairo_rotate (cr, -angle);
  pango_cairo_update_layout (cr, fig->layout);
  cairo_move_to (cr, -ax * w, -ay * h);
  pango_cairo_layout_path (cr, fig->layout);
  cairo_set_source_rgba (cr, 1, 1, 1, halo_alpha);
  cairo_set_line_width (cr, 0.3 * fig->style.font_pt * scale);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  cairo_stroke (cr);
  cairo_set_source_rgb (cr, grey, grey, grey);
  cairo_move_to (cr, -ax * w, -ay * h);
  pango_cairo_show_layout (cr, fig->layout);
  cairo_restore (cr);
}

void
sl_figure_message (SlFigure *fig, const char *message)
{
  g_autofree char *escaped = g_markup_escape_text (message, -1);

  /* Wrapped to the page, centred: a narrow pane must show it all. */
  pango_layout_set_width (fig->layout, (int) (MAX (fig->width - 4 * fig->style.font_pt, 40) * PANGO_SCALE));
  pango_layout_set_wrap (fig->layout, PANGO_WRAP_WORD);
  pango_layout_set_alignment (fig->layout, PANGO_ALIGN_CENTER);
  cairo_set_source_rgb (fig->cr, 0.25, 0.25, 0.25);
  sl_figure_text (fig, fig->width / 2, fig->height / 2, 0.5, 0.5, 1.3, 0, escaped);
  pango_layout_set_width (fig->layout, -1);
  pango_layout_set_alignment (fig->layout, PANGO_ALIGN_LEFT);
}

void
sl_figure_add_note (GPtrArray *notes, char *note)
{
  if (notes)
    g_ptr_array_add (notes, note);
  else
    g_free (note);
}

char *
sl_figure_with_minus (const char *text)
{
  return text[0] == '-' ? g_strconcat ("\u2212", text + 1, NULL) : g_strdup (text);
}

char *
sl_figure_format_fixed (double value, int decimals)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE], format[16];

  if (fabs (value) < 0.5 * pow (10.0, -decimals))
    value = 0.0;   /* no "-0" */
  g_snprintf (format, sizeof format, "%%.%df", MAX (decimals, 0));
  g_ascii_formatd (buf, sizeof buf, format, value);
  return sl_figure_with_minus (buf);
}

/* ------------------------------------------------------------------ */
/* Axes                                                               */

double
sl_nice_step (double range, int target)
{
  double raw = fabs (range) / MAX (target, 1);
  double power = pow (10.0, floor (log10 (raw)));
  double fraction = raw / power;

  if (fraction < 1.5)
    return power;
  if (fraction < 3.5)
    return 2.0 * power;
  if (fraction < 7.5)
    return 5.0 * power;
  return 10.0 * power;
}

void
sl_figure_place_frame (SlFigure *fig, SlFrame *frame, gboolean top_axis)
{
  double em = fig->style.font_pt;
  double left = 4.2 * em, right = 1.2 * em, bottom = 3.4 * em, top = top_axis ? 2.6 * em : 1.0 * em;

  frame->x = left;
  frame->y = top;
  frame->w = fig->width - left - right;
  frame->h = fig->height - top - bottom;
}

int
sl_figure_step_decimals (double step)
{
  return MAX (0, (int) -floor (log10 (step) + 1e-9));
}

void
sl_figure_tick (SlFigure *fig, const SlFrame *f, gboolean x_axis, double v, double tick, double gap,
                double scale, const char *label)
{
  cairo_t *cr = fig->cr;

  if (x_axis)
    {
      double x = sl_frame_px (f, v);

      cairo_move_to (cr, x, f->y + f->h);
      cairo_rel_line_to (cr, 0, -tick);
      cairo_move_to (cr, x, f->y);
      cairo_rel_line_to (cr, 0, tick);
      sl_figure_text (fig, x, f->y + f->h + gap, 0.5, 0, scale, 0, label);
    }
  else
    {
      double y = sl_frame_py (f, v);

      cairo_move_to (cr, f->x, y);
      cairo_rel_line_to (cr, tick, 0);
      cairo_move_to (cr, f->x + f->w, y);
      cairo_rel_line_to (cr, -tick, 0);
      sl_figure_text (fig, f->x - gap, y, 1, 0.5, scale, 0, label);
    }
}

static void
draw_ticks (SlFigure *fig, const SlFrame *f, gboolean x_axis)
{
  double lo = x_axis ? MIN (f->x0, f->x1) : MIN (f->y0, f->y1);
  double hi = x_axis ? MAX (f->x0, f->x1) : MAX (f->y0, f->y1);
  double step = sl_nice_step (hi - lo, x_axis ? (f->w > 200 ? 8 : 5) : 5);
  double em = fig->style.font_pt;
  int decimals = sl_figure_step_decimals (step);

  for (double v = ceil (lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step)
    {
      g_autofree char *label = sl_figure_format_fixed (v, decimals);

      sl_figure_tick (fig, f, x_axis, v, 0.35 * em, x_axis ? 0.3 * em : 0.4 * em, 1.0, label);
    }
  cairo_stroke (fig->cr);
}

void
sl_figure_axes (SlFigure *fig, const SlFrame *f, const char *x_title, const char *y_title)
{
  cairo_t *cr = fig->cr;
  double em = fig->style.font_pt;

  cairo_save (cr);
  cairo_set_source_rgb (cr, 0, 0, 0);
  cairo_set_line_width (cr, fig->style.line_pt);
  cairo_rectangle (cr, f->x, f->y, f->w, f->h);
  cairo_stroke (cr);
  draw_ticks (fig, f, TRUE);
  draw_ticks (fig, f, FALSE);
  if (x_title)
    sl_figure_text (fig, f->x + f->w / 2, f->y + f->h + 1.7 * em, 0.5, 0, 1.1, 0, x_title);
  if (y_title)
    sl_figure_text (fig, f->x - 3.3 * em, f->y + f->h / 2, 0.5, 0, 1.1, G_PI / 2, y_title);
  cairo_restore (cr);
}

/* ------------------------------------------------------------------ */
/* Colour                                                             */

/* CIELAB (D65 white) to gamma-encoded sRGB (IEC 61966-2-1). */
static void
lab_to_srgb (double L, double a, double b, double rgb[3])
{
  double fy = (L + 16.0) / 116.0, fx = fy + a / 500.0, fz = fy - b / 200.0;
  double e = 6.0 / 29.0;
  double xyz[3] = { fx, fy, fz };
  static const double white[3] = { 0.95047, 1.0, 1.08883 };
  static const double m[3][3] = {
    { 3.2404542, -1.5371385, -0.4985314 },
    { -0.9692660, 1.8760108, 0.0415560 },
    { 0.0556434, -0.2040259, 1.0572252 },
  };

  for (int i = 0; i < 3; i++)
    xyz[i] = white[i] * (xyz[i] > e ? xyz[i] * xyz[i] * xyz[i] : 3.0 * e * e * (xyz[i] - 4.0 / 29.0));
  for (int i = 0; i < 3; i++)
    {
      double c = m[i][0] * xyz[0] + m[i][1] * xyz[1] + m[i][2] * xyz[2];

      c = c <= 0.0031308 ? 12.92 * c : 1.055 * pow (c, 1.0 / 2.4) - 0.055;
      rgb[i] = CLAMP (c, 0.0, 1.0);
    }
}

void
sl_temperature_colour (double teff, gboolean grayscale, double rgb[3])
{
  /* t = 0 at 40 000 K (hot), 1 at 2500 K (cool), in log T. */
  double t = (log10 (40000.0) - log10 (CLAMP (teff, 2500.0, 40000.0))) / (log10 (40000.0) - log10 (2500.0));
  double L, hue, chroma;

  if (!isfinite (teff))
    {
      rgb[0] = rgb[1] = rgb[2] = 0.5;
      return;
    }
  if (grayscale)
    {
      L = 15.0 + 55.0 * t;
      rgb[0] = rgb[1] = rgb[2] = 0.0;
      lab_to_srgb (L, 0, 0, rgb);
      return;
    }
  /* Lightness rises steadily 30 -> 78; hue turns from blue (285 deg)
   * through teal and olive to amber (65 deg), never across red-green. */
  L = 30.0 + 48.0 * t;
  hue = (285.0 - 220.0 * t) * G_PI / 180.0;
  chroma = 38.0 + 12.0 * sin (G_PI * t);
  lab_to_srgb (L, chroma * cos (hue), chroma * sin (hue), rgb);
}

/* ------------------------------------------------------------------ */
/* Scatter                                                            */

/* R_PT, if not NULL, gives each marker's radius; else all have R. */
static void
scatter_markers (SlFigure *fig, const double *px, const double *py, const float *rgb, guint n,
                 const double *r_pt, double r)
{
  cairo_t *cr = fig->cr;

  for (guint i = 0; i < n; i++)
    {
      if (!isfinite (px[i]) || !isfinite (py[i]))
        continue;
      cairo_set_source_rgb (cr, rgb[3 * i], rgb[3 * i + 1], rgb[3 * i + 2]);
      cairo_new_sub_path (cr);
      cairo_arc (cr, px[i], py[i], r_pt ? r_pt[i] : r, 0, 2 * G_PI);
      cairo_fill (cr);
    }
}

/* Counts per cell with the mean colour, painted as one image: cells with
 * more stars are more opaque (logarithmically). */
static void
scatter_density (SlFigure *fig, const SlFrame *clip, const double *px, const double *py,
                 const float *rgb, guint n)
{
  cairo_t *cr = fig->cr;
  double dx = 1.0, dy = 0.0, cell;
  int cols, rows;
  g_autofree float *sums = NULL;
  g_autofree guint *counts = NULL;
  cairo_surface_t *image;
  guint max_count = 0;
  unsigned char *data;
  int stride;

  /* One cell per device pixel (a raster page), else half a point. */
  cairo_user_to_device_distance (cr, &dx, &dy);
  cell = dx > 1.5 ? 1.0 / dx : 0.5;
  cols = MAX (1, (int) ceil (clip->w / cell));
  rows = MAX (1, (int) ceil (clip->h / cell));
  sums = g_new0 (float, (gsize) cols * rows * 3);
  counts = g_new0 (guint, (gsize) cols * rows);

  for (guint i = 0; i < n; i++)
    {
      int c = (int) floor ((px[i] - clip->x) / cell), r = (int) floor ((py[i] - clip->y) / cell);
      gsize k;

      if (!isfinite (px[i]) || !isfinite (py[i]) || c < 0 || r < 0 || c >= cols || r >= rows)
        continue;
      k = (gsize) r * cols + c;
      counts[k]++;
      sums[3 * k] += rgb[3 * i];
      sums[3 * k + 1] += rgb[3 * i + 1];
      sums[3 * k + 2] += rgb[3 * i + 2];
      max_count = MAX (max_count, counts[k]);
    }

  image = cairo_image_surface_create (CAIRO_FORMAT_ARGB32, cols, rows);
  data = cairo_image_surface_get_data (image);
  stride = cairo_image_surface_get_stride (image);
  for (int r = 0; r < rows; r++)
    for (int c = 0; c < cols; c++)
      {
        gsize k = (gsize) r * cols + c;
        guint32 *pixel = (guint32 *) (data + r * stride) + c;
        double alpha, red, green, blue;

        if (counts[k] == 0)
          {
            *pixel = 0;
            continue;
          }
        alpha = 0.35 + 0.65 * log1p (counts[k]) / log1p (max_count);
        red = sums[3 * k] / counts[k], green = sums[3 * k + 1] / counts[k], blue = sums[3 * k + 2] / counts[k];
        /* Premultiplied ARGB, as cairo stores it. */
        *pixel = ((guint32) lround (alpha * 255) << 24) | ((guint32) lround (alpha * red * 255) << 16)
                 | ((guint32) lround (alpha * green * 255) << 8) | (guint32) lround (alpha * blue * 255);
      }
  cairo_surface_mark_dirty (image);

  cairo_save (cr);
  cairo_translate (cr, clip->x, clip->y);
  cairo_scale (cr, cell, cell);
  cairo_set_source_surface (cr, image, 0, 0);
  cairo_pattern_set_filter (cairo_get_source (cr), CAIRO_FILTER_NEAREST);
  cairo_rectangle (cr, 0, 0, cols, rows);
  cairo_fill (cr);
  cairo_restore (cr);
  cairo_surface_destroy (image);
}

static gboolean
scatter (SlFigure *fig, const SlFrame *clip, const double *px, const double *py, const float *rgb,
         guint n, const double *radii, double r_pt)
{
  cairo_save (fig->cr);
  cairo_rectangle (fig->cr, clip->x, clip->y, clip->w, clip->h);
  cairo_clip (fig->cr);
  if (n > SL_DENSITY_THRESHOLD)
    scatter_density (fig, clip, px, py, rgb, n);
  else
    scatter_markers (fig, px, py, rgb, n, radii, r_pt);
  cairo_restore (fig->cr);
  return n > SL_DENSITY_THRESHOLD;
}

gboolean
sl_figure_scatter (SlFigure *fig, const SlFrame *clip, const double *px, const double *py,
                   const float *rgb, guint n, double r_pt)
{
  return scatter (fig, clip, px, py, rgb, n, NULL, r_pt);
}

gboolean
sl_figure_scatter_sized (SlFigure *fig, const SlFrame *clip, const double *px, const double *py,
                         const float *rgb, const double *r_pt, guint n)
{
  return scatter (fig, clip, px, py, rgb, n, r_pt, 0.0);
}
