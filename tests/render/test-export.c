/* test-export.c: figure layout and SVG / PDF / PNG export with the recipe embedded.
 *
 * The SVG is parsed with a real XML parser (libxml2) when the build found it
 * (FW_HAVE_LIBXML2); otherwise that one test is skipped with a message.
 */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib.h>

#include "fw-test-render.h"
#include <glib/gstdio.h>
#include <zlib.h>

#ifdef FW_HAVE_LIBXML2
#include <libxml/parser.h>
#include <libxml/tree.h>
#endif

#include "fw-export.h"
#include "fw-feature.h"
#include "fw-figure.h"
#include "fw-recipe.h"
#include "fw-render-error.h"

#define RATE 16000.0

/* ---- fixtures ---- */

/* 3 s of a 330 Hz tone with three harmonics, a 1.5 s chirp 2 -> 5 kHz, and noise (seed 11). */
static FwAudio *
make_audio (double seconds)
{
  size_t n = (size_t) (seconds * RATE);
  float *x = g_new (float, n);
  GRand *rand = g_rand_new_with_seed (11);
  FwAudio *audio;

  for (size_t i = 0; i < n; i++)
    {
      double t = (double) i / RATE;
      double v = 0.3 * sin (2 * G_PI * 330 * t) + 0.15 * sin (2 * G_PI * 660 * t)
                 + 0.08 * sin (2 * G_PI * 990 * t);
      if (t > 1.0 && t < 2.5)
        v += 0.2 * sin (2 * G_PI * (2000 * (t - 1.0) + 1000 * (t - 1.0) * (t - 1.0)));
      v += 0.01 * (g_rand_double (rand) * 2 - 1);
      x[i] = (float) v;
    }
  audio = fw_audio_new_from_samples ("synthetic-hive.wav", x, n, RATE);
  g_rand_free (rand);
  g_free (x);
  return audio;
}

static FwParams *
make_params (void)
{
  static const char *const settings[] = { "sample_rate=16000", "window_length=512",
                                          "hop_length=128", "mel_bands=40", NULL };
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (base, settings, &error);
  g_assert_no_error (error);
  return p;
}

static FwFigure *
make_figure (FwAudio *audio, FwParams *params, const char *rows)
{
  g_autoptr (GError) error = NULL;
  FwFigure *fig = fw_figure_new ();

  fw_figure_set_source (fig, "fixtures/synthetic-hive.wav", "test-set", params, RATE);
  g_assert_true (fw_figure_add_rows (fig, rows, audio, params, NULL, &error));
  g_assert_no_error (error);
  return fig;
}

static GBytes *
export_bytes (FwFigure *fig, FwExportFormat format, double w_mm, double h_mm, double dpi)
{
  FwExportSettings s;
  g_autoptr (GError) error = NULL;
  GBytes *bytes;

  fw_export_settings_init (&s);
  s.format = format;
  s.width_mm = w_mm;
  s.height_mm = h_mm;
  s.dpi = dpi;
  g_assert_true (fw_export_resolve (fig, &s, &error));
  g_assert_no_error (error);
  bytes = fw_export_figure_to_bytes (fig, &s, &error);
  g_assert_no_error (error);
  g_assert_nonnull (bytes);
  return bytes;
}

/* ---- layout: the data areas share their edges ---- */

typedef struct {
  const guint8 *data;
  gsize len;
  gsize pos;
} ReadState;

static cairo_status_t
read_bytes (void *closure, unsigned char *out, unsigned int length)
{
  ReadState *s = closure;
  if (s->pos + length > s->len)
    return CAIRO_STATUS_READ_ERROR;
  memcpy (out, s->data + s->pos, length);
  s->pos += length;
  return CAIRO_STATUS_SUCCESS;
}

static cairo_surface_t *
png_surface (GBytes *bytes)
{
  ReadState s = { g_bytes_get_data (bytes, &s.len), 0, 0 };
  s.data = g_bytes_get_data (bytes, &s.len);
  return cairo_image_surface_create_from_png_stream (read_bytes, &s);
}

static gboolean
is_foreground (uint32_t px, const FwRgba *fg)
{
  int r = (px >> 16) & 0xff, g = (px >> 8) & 0xff, b = px & 0xff;
  return abs (r - (int) lround (fg->r * 255)) <= 12 && abs (g - (int) lround (fg->g * 255)) <= 12
         && abs (b - (int) lround (fg->b * 255)) <= 12;
}

/* The column of an axis frame's vertical line: the column nearest to `from` (scanning in
 * direction dir) where at least 90 % of the row's pixels have the foreground colour. */
static int
frame_column (cairo_surface_t *s, int y0, int y1, int from, int dir, const FwRgba *fg)
{
  const uint8_t *data = cairo_image_surface_get_data (s);
  int stride = cairo_image_surface_get_stride (s);
  int width = cairo_image_surface_get_width (s);

  for (int x = from; x >= 0 && x < width; x += dir)
    {
      int hits = 0;
      for (int y = y0; y < y1; y++)
        hits += is_foreground (((const uint32_t *) (data + (size_t) y * stride))[x], fg);
      if (hits >= (y1 - y0) * 9 / 10)
        return x;
    }
  return -1;
}

static void
test_shared_edges (void)
{
  g_autoptr (FwAudio) audio = make_audio (3.0);
  g_autoptr (FwParams) params = make_params ();
  g_autoptr (FwFigure) fig = make_figure (audio, params, "waveform,db,mfcc,centroid,mel-db");
  static const double sizes[][2] = { { 85, 100 }, { 175, 120 }, { 60, 140 } };
  FwTheme theme;

  fw_theme_init (&theme, FW_THEME_LIGHT);
  for (size_t k = 0; k < G_N_ELEMENTS (sizes); k++)
    {
      const double dpi = 300;
      int pw = fw_export_pixels (sizes[k][0], dpi), ph = fw_export_pixels (sizes[k][1], dpi);
      double snap = 72.0 / dpi;
      cairo_surface_t *scratch = cairo_image_surface_create (CAIRO_FORMAT_RGB24, 1, 1);
      cairo_t *cr = cairo_create (scratch);
      FwFigureLayout lay;
      g_autoptr (GBytes) png = NULL;
      cairo_surface_t *img;
      int left0 = -1, right0 = -1;
      gboolean with_bar = FALSE, without_bar = FALSE;

      fw_figure_layout (fig, cr, &theme, pw * snap, ph * snap, snap, &lay);
      cairo_destroy (cr);
      cairo_surface_destroy (scratch);
      g_assert_cmpuint (lay.n_rows, ==, 5);
      for (size_t i = 0; i < lay.n_rows; i++)
        {
          /* identical edges for every row, with or without a colour bar */
          g_assert_cmpfloat (lay.data[i].x, ==, lay.data_left);
          g_assert_cmpfloat (fabs (lay.data[i].x + lay.data[i].w - lay.data_right), <, 1e-9);
          with_bar |= lay.has_colour_bar[i];
          without_bar |= !lay.has_colour_bar[i];
          /* edges on the pixel grid */
          g_assert_cmpfloat (fabs (lay.data_left / snap - round (lay.data_left / snap)), <, 1e-6);
          g_assert_cmpfloat (fabs (lay.data_right / snap - round (lay.data_right / snap)), <, 1e-6);
        }
      g_assert_true (with_bar && without_bar);

      /* and the pixels agree: find each row's frame lines in the exported PNG */
      png = export_bytes (fig, FW_EXPORT_PNG, sizes[k][0], sizes[k][1], dpi);
      img = png_surface (png);
      g_assert_cmpint (cairo_surface_status (img), ==, CAIRO_STATUS_SUCCESS);
      cairo_surface_flush (img);
      for (size_t i = 0; i < lay.n_rows; i++)
        {
          int y0 = (int) ceil (lay.data[i].y / snap) + 2;
          int y1 = (int) floor ((lay.data[i].y + lay.data[i].h) / snap) - 2;
          int xl = (int) lround (lay.data_left / snap), xr = (int) lround (lay.data_right / snap);
          int left = frame_column (img, y0, y1, xl - 1, -1, &theme.foreground);
          int right = frame_column (img, y0, y1, xr, +1, &theme.foreground);
          /* the frame line sits just outside the data area: first column left of it, first
           * column right of it */
          g_assert_cmpint (left, ==, xl - 1);
          g_assert_cmpint (right, ==, xr);
          if (i == 0)
            {
              left0 = left;
              right0 = right;
            }
          g_assert_cmpint (left, ==, left0);
          g_assert_cmpint (right, ==, right0);
        }
      cairo_surface_destroy (img);
    }
}

/* ---- PNG ---- */

static guint32
be32 (const guint8 *p)
{
  return ((guint32) p[0] << 24) | ((guint32) p[1] << 16) | ((guint32) p[2] << 8) | p[3];
}

static void
test_png (void)
{
  g_autoptr (FwAudio) audio = make_audio (3.0);
  g_autoptr (FwParams) params = make_params ();
  g_autoptr (FwFigure) fig = make_figure (audio, params, "waveform,db");
  g_autoptr (GBytes) png = export_bytes (fig, FW_EXPORT_PNG, 85.0, 60.0, 300.0);
  g_autoptr (GError) error = NULL;
  g_autofree char *recipe = NULL;
  gsize len;
  const guint8 *d = g_bytes_get_data (png, &len);
  gsize pos = 8;
  int chunks = 0, texts = 0;
  gboolean phys = FALSE;
  cairo_surface_t *img;

  /* exact size: round(85 / 25.4 * 300) = round(1003.94) = 1004, round(708.66) = 709 */
  g_assert_cmpuint (len, >, 33);
  g_assert_cmpuint (be32 (d + 16), ==, 1004);
  g_assert_cmpuint (be32 (d + 20), ==, 709);

  /* every chunk's CRC (PNG spec: CRC-32 of ISO 3309 over type and data) */
  while (pos + 12 <= len)
    {
      guint32 n = be32 (d + pos);
      uLong crc = crc32 (crc32 (0, Z_NULL, 0), d + pos + 4, n + 4);
      g_assert_cmpuint (crc, ==, be32 (d + pos + 8 + n));
      if (memcmp (d + pos + 4, "pHYs", 4) == 0)
        {
          /* 300 dpi = 300 / 0.0254 = 11811.02 pixels per metre, unit byte 1 (metre) */
          g_assert_cmpuint (be32 (d + pos + 8), ==, 11811);
          g_assert_cmpuint (d[pos + 16], ==, 1);
          phys = TRUE;
        }
      if (memcmp (d + pos + 4, "iTXt", 4) == 0)
        texts++;
      chunks++;
      pos += 12 + n;
    }
  g_assert_cmpuint (pos, ==, len);
  g_assert_true (phys);
  g_assert_cmpint (texts, >=, 2);

  /* a real decoder reads it */
  img = png_surface (png);
  g_assert_cmpint (cairo_surface_status (img), ==, CAIRO_STATUS_SUCCESS);
  g_assert_cmpint (cairo_image_surface_get_width (img), ==, 1004);
  g_assert_cmpint (cairo_image_surface_get_height (img), ==, 709);
  cairo_surface_destroy (img);

  recipe = fw_export_read_recipe_from_data (d, len, &error);
  g_assert_no_error (error);
  g_assert_nonnull (strstr (recipe, fw_params_get_text (params)));
  g_assert_nonnull (strstr (recipe, fw_params_get_hash (params)));
}

/* ---- SVG ---- */

#ifdef FW_HAVE_LIBXML2
static void
count_nodes (xmlNode *node, int *images, int *texts, int *glyph_uses, int *elements,
             xmlNode **recipe)
{
  for (xmlNode *n = node; n; n = n->next)
    {
      if (n->type != XML_ELEMENT_NODE)
        continue;
      (*elements)++;
      if (xmlStrcmp (n->name, BAD_CAST "image") == 0)
        (*images)++;
      else if (xmlStrcmp (n->name, BAD_CAST "text") == 0)
        (*texts)++;
      else if (xmlStrcmp (n->name, BAD_CAST "use") == 0)
        {
          xmlChar *href = xmlGetNsProp (n, BAD_CAST "href", BAD_CAST "http://www.w3.org/1999/xlink");
          if (href == NULL)
            href = xmlGetProp (n, BAD_CAST "href");
          if (href && xmlStrncmp (href, BAD_CAST "#glyph", 6) == 0)
            (*glyph_uses)++;
          xmlFree (href);
        }
      else if (xmlStrcmp (n->name, BAD_CAST "recipe") == 0 && n->ns
               && xmlStrcmp (n->ns->href, BAD_CAST FW_RECIPE_XML_NS) == 0)
        *recipe = n;
      count_nodes (n->children, images, texts, glyph_uses, elements, recipe);
    }
}

static double
length_mm (xmlNode *root, const char *attr)
{
  xmlChar *v = xmlGetProp (root, BAD_CAST attr);
  char *end = NULL;
  double x;

  g_assert_nonnull (v);
  x = g_ascii_strtod ((const char *) v, &end);
  /* the unit must be millimetres */
  g_assert_cmpstr (end, ==, "mm");
  xmlFree (v);
  return x;
}
#endif

static void
test_svg (void)
{
#ifdef FW_HAVE_LIBXML2
  g_autoptr (FwAudio) audio = make_audio (3.0);
  g_autoptr (FwParams) params = make_params ();
  g_autoptr (FwFigure) fig = make_figure (audio, params, "waveform,db,mel-db,centroid");
  g_autoptr (GBytes) svg = export_bytes (fig, FW_EXPORT_SVG, 85.0, 90.0, 300.0);
  gsize len;
  const char *data = g_bytes_get_data (svg, &len);
  xmlDoc *doc = xmlReadMemory (data, (int) len, "figure.svg", NULL, XML_PARSE_NONET | XML_PARSE_HUGE);
  xmlNode *root;
  int images = 0, texts = 0, glyph_uses = 0, elements = 0;
  xmlNode *recipe = NULL;
  xmlChar *content;
  size_t cells = 0;

  g_assert_nonnull (doc);
  root = xmlDocGetRootElement (doc);
  g_assert_cmpstr ((const char *) root->name, ==, "svg");
  /* the requested physical size, in mm, exactly */
  g_assert_cmpfloat_with_epsilon (length_mm (root, "width"), 85.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (length_mm (root, "height"), 90.0, 1e-9);

  count_nodes (root, &images, &texts, &glyph_uses, &elements, &recipe);
  /* exactly one image per heatmap row: db and mel-db */
  g_assert_cmpint (images, ==, 2);
  /* text present, as <text> or as glyph outlines used from <symbol>s */
  g_assert_cmpint (texts + glyph_uses, >, 40);
  /* heatmaps as images, not cells: far fewer elements than matrix cells */
  for (size_t i = 0; i < fw_figure_get_n_rows (fig); i++)
    if (fw_figure_row_matrix (fig, i))
      cells += fw_figure_row_matrix (fig, i)->n_frames * fw_figure_row_matrix (fig, i)->n_bins;
  g_assert_cmpuint ((size_t) elements, <, cells / 20);

  /* the metadata holds the canonical parameter text and its hash */
  g_assert_nonnull (recipe);
  g_assert_cmpstr ((const char *) recipe->parent->name, ==, "metadata");
  content = xmlNodeGetContent (recipe);
  g_assert_nonnull (strstr ((const char *) content, fw_params_get_text (params)));
  g_assert_nonnull (strstr ((const char *) content, fw_params_get_hash (params)));
  xmlFree (content);
  xmlFreeDoc (doc);
#else
  g_test_skip ("libxml2 (libxml2-dev) was not found when configuring: SVG not parsed");
#endif
}

/* ---- PDF ---- */

static void
test_pdf (void)
{
  g_autofree char *pdfinfo = g_find_program_in_path ("pdfinfo");
  g_autoptr (FwAudio) audio = make_audio (3.0);
  g_autoptr (FwParams) params = make_params ();
  g_autoptr (FwFigure) fig = make_figure (audio, params, "waveform,mel-db");
  g_autoptr (GError) error = NULL;
  g_autofree char *dir = NULL, *path = NULL, *out = NULL, *err = NULL;
  g_autofree char *recipe = NULL;
  FwExportSettings s;
  const char *line;
  double w, h;
  int status;

  fw_export_settings_init (&s);
  s.format = FW_EXPORT_PDF;
  s.width_mm = 175.0;
  s.height_mm = 100.0;
  dir = g_dir_make_tmp ("fw-render-XXXXXX", &error);
  g_assert_no_error (error);
  path = g_build_filename (dir, "figure.pdf", NULL);
  g_assert_true (fw_export_figure (fig, &s, path, &error));
  g_assert_no_error (error);

  recipe = fw_export_read_recipe (path, &error);
  g_assert_no_error (error);
  g_assert_nonnull (strstr (recipe, fw_params_get_text (params)));

  if (pdfinfo == NULL)
    {
      g_test_skip ("pdfinfo (poppler-utils) not installed: PDF page size not checked");
    }
  else
    {
      char *argv[] = { pdfinfo, path, NULL };
      g_assert_true (g_spawn_sync (NULL, argv, NULL, G_SPAWN_DEFAULT, NULL, NULL, &out, &err,
                                   &status, &error));
      g_assert_no_error (error);
      g_assert_true (g_spawn_check_wait_status (status, NULL));
      line = strstr (out, "Page size:");
      g_assert_nonnull (line);
      g_assert_cmpint (sscanf (line, "Page size: %lf x %lf pts", &w, &h), ==, 2);
      /* 175 mm = 175 / 25.4 * 72 = 496.063 pt; 100 mm = 283.465 pt (pdfinfo prints 3 decimals) */
      g_assert_cmpfloat_with_epsilon (w, 175.0 / 25.4 * 72.0, 0.002);
      g_assert_cmpfloat_with_epsilon (h, 100.0 / 25.4 * 72.0, 0.002);
      /* the hash is in the keywords, the methods sentence in the subject */
      g_assert_nonnull (strstr (out, fw_params_get_hash (params)));
      g_assert_nonnull (strstr (out, "Subject:"));
    }
  g_unlink (path);
  g_rmdir (dir);
}

/* ---- the recipe recomputes the same matrix ---- */

static void
test_recipe_recomputes (void)
{
  g_autoptr (FwAudio) audio = make_audio (2.0);
  g_autoptr (FwParams) params = make_params ();
  g_autoptr (FwFigure) fig = make_figure (audio, params, "waveform,mel-db,mfcc");
  FwMatrix *original = fw_figure_row_matrix (fig, 1);
  static const FwExportFormat formats[] = { FW_EXPORT_SVG, FW_EXPORT_PDF, FW_EXPORT_PNG };

  fw_figure_set_time_range (fig, 0.25, 1.75);
  for (size_t f = 0; f < G_N_ELEMENTS (formats); f++)
    {
      g_autoptr (GBytes) bytes = export_bytes (fig, formats[f], 85.0, 70.0, 150.0);
      g_autoptr (GError) error = NULL;
      g_autofree char *text = NULL;
      g_autoptr (FwRecipe) recipe = NULL;
      g_autoptr (FwParams) back = NULL;
      FwMatrix *again;
      gsize len;
      const guint8 *d = g_bytes_get_data (bytes, &len);

      text = fw_export_read_recipe_from_data (d, len, &error);
      g_assert_no_error (error);
      recipe = fw_recipe_parse (text, -1, &error);
      g_assert_no_error (error);
      g_assert_cmpstr (recipe->clip, ==, "fixtures/synthetic-hive.wav");
      g_assert_cmpstr (recipe->param_set, ==, "test-set");
      g_assert_cmpstr (recipe->params_hash, ==, fw_params_get_hash (params));
      g_assert_cmpfloat (recipe->analysis_rate, ==, RATE);
      g_assert_cmpfloat (recipe->start, ==, 0.25);
      g_assert_cmpfloat (recipe->end, ==, 1.75);
      g_assert_cmpuint (g_strv_length (recipe->rows), ==, 3);
      g_assert_cmpstr (recipe->rows[1], ==, "mel-db");

      back = fw_recipe_dup_params (recipe, &error);
      g_assert_no_error (error);
      g_assert_true (fw_params_equal (back, params));
      again = fw_feature_compute (audio, back, FW_STAGE_MEL_DB, 1, NULL, NULL, NULL, &error);
      g_assert_no_error (error);
      g_assert_cmpuint (again->n_frames, ==, original->n_frames);
      g_assert_cmpuint (again->n_bins, ==, original->n_bins);
      g_assert_cmpint (memcmp (again->data, original->data,
                               original->n_frames * original->n_bins * sizeof (float)), ==, 0);
      fw_matrix_unref (again);
    }
}

static void
test_tampered_recipe (void)
{
  g_autoptr (FwAudio) audio = make_audio (1.0);
  g_autoptr (FwParams) params = make_params ();
  g_autoptr (FwFigure) fig = make_figure (audio, params, "db");
  g_autofree char *text = fw_figure_dup_recipe (fig);
  g_autoptr (GError) error = NULL;
  g_autoptr (FwRecipe) recipe = NULL;
  g_autoptr (FwParams) back = NULL;
  char *hop = strstr (text, "hop_length=128");

  /* an edited parameter no longer matches the recorded hash: the error names both */
  g_assert_nonnull (hop);
  hop[strlen ("hop_length=1")] = '9';
  recipe = fw_recipe_parse (text, -1, &error);
  g_assert_no_error (error);
  back = fw_recipe_dup_params (recipe, &error);
  g_assert_null (back);
  g_assert_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE);
  g_assert_nonnull (strstr (error->message, fw_params_get_hash (params)));
}

static void
test_errors (void)
{
  g_autoptr (FwAudio) audio = make_audio (1.0);
  g_autoptr (FwParams) params = make_params ();
  g_autoptr (FwFigure) fig = make_figure (audio, params, "waveform,db,mfcc");
  g_autoptr (GError) error = NULL;
  FwExportSettings s;
  FwExportFormat format;
  static const guint8 not_a_figure[] = "just some text";
  GByteArray *png = g_byte_array_new ();

  g_assert_false (fw_export_format_from_path ("figure.tiff", &format, &error));
  g_assert_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_FORMAT);
  g_assert_nonnull (strstr (error->message, "figure.tiff"));
  g_clear_error (&error);
  g_assert_true (fw_export_format_from_path ("a/b/Figure.PDF", &format, &error));
  g_assert_cmpint (format, ==, FW_EXPORT_PDF);

  fw_export_settings_init (&s);
  s.width_mm = 5.0;
  g_assert_false (fw_export_resolve (fig, &s, &error));
  g_assert_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID);
  g_assert_nonnull (strstr (error->message, "Width 5 mm"));
  g_clear_error (&error);

  fw_export_settings_init (&s);
  s.width_mm = 85.0;
  s.height_mm = 21.0; /* three rows and their axes do not fit */
  g_assert_false (fw_export_resolve (fig, &s, &error));
  g_assert_nonnull (strstr (error->message, "Height 21 mm"));
  g_clear_error (&error);

  fw_export_settings_init (&s);
  s.dpi = 10;
  g_assert_false (fw_export_resolve (fig, &s, &error));
  g_assert_nonnull (strstr (error->message, "10 dpi"));
  g_clear_error (&error);

  g_assert_null (fw_export_read_recipe_from_data (not_a_figure, sizeof not_a_figure, &error));
  g_assert_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_FORMAT);
  g_clear_error (&error);

  /* a PNG that Framewise did not write (signature and IEND only) */
  {
    static const guint8 sig[] = { 0x89, 'P', 'N', 'G', '\r', '\n', 0x1a, '\n', 0, 0, 0, 0,
                                  'I', 'E', 'N', 'D', 0xae, 0x42, 0x60, 0x82 };
    g_byte_array_append (png, sig, sizeof sig);
    g_assert_null (fw_export_read_recipe_from_data (png->data, png->len, &error));
    g_assert_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_NO_RECIPE);
    g_clear_error (&error);
  }
  g_byte_array_unref (png);

  g_assert_null (fw_export_read_recipe ("/nonexistent/figure.svg", &error));
  g_assert_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_IO);
  g_assert_nonnull (strstr (error->message, "/nonexistent/figure.svg"));
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/render/export/shared-edges", test_shared_edges);
  g_test_add_func ("/fw/render/export/png-size-and-chunks", test_png);
  g_test_add_func ("/fw/render/export/svg-structure", test_svg);
  g_test_add_func ("/fw/render/export/pdf-page-size", test_pdf);
  g_test_add_func ("/fw/render/export/recipe-recomputes", test_recipe_recomputes);
  g_test_add_func ("/fw/render/export/recipe-hash-mismatch", test_tampered_recipe);
  g_test_add_func ("/fw/render/export/errors", test_errors);
  return g_test_run ();
}
