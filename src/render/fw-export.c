/* fw-export.c: SVG, PDF and PNG export with the recipe embedded (see fw-export.h). */
#include "fw-config.h"

#include "fw-export.h"

#include <math.h>
#include <string.h>

#include <cairo-pdf.h>
#include <cairo-svg.h>
#include <glib/gi18n.h>
#include <zlib.h>

#include "fw-recipe.h"
#include "fw-render-error.h"

#define PT_PER_MM (72.0 / 25.4)

void
fw_export_settings_init (FwExportSettings *settings)
{
  g_return_if_fail (settings != NULL);
  memset (settings, 0, sizeof *settings);
  settings->format = FW_EXPORT_SVG;
  settings->width_mm = FW_FIGURE_WIDTH_DOUBLE_MM;
  settings->height_mm = 0;
  settings->dpi = 300;
  fw_theme_init (&settings->theme, FW_THEME_LIGHT);
}

static const char *const format_names[] = { "svg", "pdf", "png" };

const char *
fw_export_format_name (FwExportFormat format)
{
  g_return_val_if_fail ((unsigned) format < G_N_ELEMENTS (format_names), "svg");
  return format_names[format];
}

gboolean
fw_export_format_from_path (const char *path, FwExportFormat *out, GError **error)
{
  const char *dot = path ? strrchr (path, '.') : NULL;

  if (dot != NULL && strchr (dot, '/') == NULL)
    for (unsigned i = 0; i < G_N_ELEMENTS (format_names); i++)
      if (g_ascii_strcasecmp (dot + 1, format_names[i]) == 0)
        {
          *out = (FwExportFormat) i;
          return TRUE;
        }
  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_FORMAT,
               _("Output \"%s\": unknown format; the file name must end in .svg, .pdf or .png"),
               path ? path : "");
  return FALSE;
}

int
fw_export_pixels (double mm, double dpi)
{
  return (int) lround (mm / 25.4 * dpi);
}

/* A scratch context for measuring text before the real surface exists. */
static cairo_t *
measuring_context (void)
{
  cairo_surface_t *s = cairo_image_surface_create (CAIRO_FORMAT_ARGB32, 1, 1);
  cairo_t *cr = cairo_create (s);
  cairo_surface_destroy (s);
  return cr;
}

gboolean
fw_export_resolve (FwFigure *fig, FwExportSettings *s, GError **error)
{
  cairo_t *cr;
  double natural_pt, min_pt;

  if (!(s->width_mm >= FW_EXPORT_MIN_MM && s->width_mm <= FW_EXPORT_MAX_MM))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Width %g mm is outside %g to %g mm"), s->width_mm, FW_EXPORT_MIN_MM,
                   FW_EXPORT_MAX_MM);
      return FALSE;
    }
  if (s->height_mm != 0 && !(s->height_mm >= FW_EXPORT_MIN_MM && s->height_mm <= FW_EXPORT_MAX_MM))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Height %g mm is outside %g to %g mm"), s->height_mm, FW_EXPORT_MIN_MM,
                   FW_EXPORT_MAX_MM);
      return FALSE;
    }
  if (!(s->dpi >= FW_EXPORT_MIN_DPI && s->dpi <= FW_EXPORT_MAX_DPI))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Resolution %g dpi is outside %g to %g dpi"), s->dpi, FW_EXPORT_MIN_DPI,
                   FW_EXPORT_MAX_DPI);
      return FALSE;
    }
  if (fw_figure_get_n_rows (fig) == 0)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("The figure has no rows to draw"));
      return FALSE;
    }

  cr = measuring_context ();
  natural_pt = fw_figure_natural_height (fig, cr, &s->theme, s->width_mm * PT_PER_MM);
  min_pt = fw_figure_min_height (fig, cr, &s->theme, s->width_mm * PT_PER_MM);
  cairo_destroy (cr);
  if (s->height_mm == 0)
    s->height_mm = MIN (floor (natural_pt / PT_PER_MM + 0.5), FW_EXPORT_MAX_MM);
  if (s->height_mm * PT_PER_MM < min_pt)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Height %g mm is too small for %zu rows at this font size: use at least "
                     "%.0f mm, fewer rows or a smaller font"),
                   s->height_mm, fw_figure_get_n_rows (fig), ceil (min_pt / PT_PER_MM));
      return FALSE;
    }
  if (s->format == FW_EXPORT_PNG
      && (fw_export_pixels (s->width_mm, s->dpi) > FW_EXPORT_MAX_PIXELS
          || fw_export_pixels (s->height_mm, s->dpi) > FW_EXPORT_MAX_PIXELS))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("PNG of %g x %g mm at %g dpi would exceed %d pixels a side"), s->width_mm,
                   s->height_mm, s->dpi, FW_EXPORT_MAX_PIXELS);
      return FALSE;
    }
  return TRUE;
}

static cairo_status_t
append_bytes (void *closure, const unsigned char *data, unsigned int length)
{
  g_byte_array_append ((GByteArray *) closure, data, length);
  return CAIRO_STATUS_SUCCESS;
}

static gboolean
check_cairo (cairo_status_t status, const char *what, GError **error)
{
  if (status == CAIRO_STATUS_SUCCESS)
    return TRUE;
  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_CAIRO, _("Drawing the %s failed: %s"),
               what, cairo_status_to_string (status));
  return FALSE;
}

/* ---- SVG ---- */

static GByteArray *
svg_insert_metadata (GByteArray *svg, const char *recipe, const char *title, const char *desc)
{
  const char *text = (const char *) svg->data;
  const char *root = g_strstr_len (text, (gssize) svg->len, "<svg");
  const char *end;
  GString *ins;
  gsize at;
  g_autofree char *r = g_markup_escape_text (recipe, -1);

  if (root == NULL)
    return svg;
  end = memchr (root, '>', svg->len - (gsize) (root - text));
  if (end == NULL)
    return svg;
  at = (gsize) (end - text) + 1;

  ins = g_string_new ("\n");
  if (title && *title)
    {
      g_autofree char *t = g_markup_escape_text (title, -1);
      g_string_append_printf (ins, "<title>%s</title>\n", t);
    }
  if (desc && *desc)
    {
      g_autofree char *d = g_markup_escape_text (desc, -1);
      g_string_append_printf (ins, "<desc>%s</desc>\n", d);
    }
  g_string_append_printf (ins,
                          "<metadata id=\"framewise-recipe\"><fw:recipe xmlns:fw=\"%s\">%s"
                          "</fw:recipe></metadata>",
                          FW_RECIPE_XML_NS, r);
  /* g_byte_array has no insert: rebuild */
  {
    GByteArray *out = g_byte_array_sized_new (svg->len + ins->len);
    g_byte_array_append (out, svg->data, (guint) at);
    g_byte_array_append (out, (const guint8 *) ins->str, (guint) ins->len);
    g_byte_array_append (out, svg->data + at, (guint) (svg->len - at));
    g_byte_array_unref (svg);
    g_string_free (ins, TRUE);
    return out;
  }
}

/* Heatmap cells stay sharp when a viewer zooms in, as in PDF (drawn without interpolation):
 * SVG 1.1's image-rendering="optimizeSpeed" and CSS image-rendering: pixelated on every
 * <image> (cairo 1.16 writes neither). */
static GByteArray *
svg_crisp_images (GByteArray *svg)
{
  static const char tag[] = "<image ";
  static const char add[] = "<image image-rendering=\"optimizeSpeed\" "
                            "style=\"image-rendering:pixelated\" ";
  GByteArray *out = g_byte_array_sized_new (svg->len + 1024);
  gsize i = 0, tl = sizeof tag - 1;

  while (i < svg->len)
    {
      const guint8 *hit = memchr (svg->data + i, '<', svg->len - i);
      gsize at = hit ? (gsize) (hit - svg->data) : svg->len;
      g_byte_array_append (out, svg->data + i, (guint) (at - i));
      if (hit == NULL)
        break;
      if (svg->len - at >= tl && memcmp (hit, tag, tl) == 0)
        {
          g_byte_array_append (out, (const guint8 *) add, sizeof add - 1);
          i = at + tl;
        }
      else
        {
          g_byte_array_append (out, hit, 1);
          i = at + 1;
        }
    }
  g_byte_array_unref (svg);
  return out;
}

/* ---- PNG chunks ---- */

static void
put_be32 (guint8 *p, guint32 v)
{
  p[0] = (guint8) (v >> 24);
  p[1] = (guint8) (v >> 16);
  p[2] = (guint8) (v >> 8);
  p[3] = (guint8) v;
}

static guint32
get_be32 (const guint8 *p)
{
  return ((guint32) p[0] << 24) | ((guint32) p[1] << 16) | ((guint32) p[2] << 8) | p[3];
}

/* A complete chunk: length, type, data, CRC-32 (ISO 3309, over type and data; zlib crc32). */
static GByteArray *
png_chunk (const char type[4], const guint8 *data, gsize length)
{
  GByteArray *c = g_byte_array_sized_new ((guint) length + 12);
  guint8 head[8];
  guint8 tail[4];
  uLong crc;

  put_be32 (head, (guint32) length);
  memcpy (head + 4, type, 4);
  g_byte_array_append (c, head, 8);
  if (length)
    g_byte_array_append (c, data, (guint) length);
  crc = crc32 (0L, Z_NULL, 0);
  crc = crc32 (crc, (const Bytef *) type, 4);
  if (length)
    crc = crc32 (crc, data, (uInt) length);
  put_be32 (tail, (guint32) crc);
  g_byte_array_append (c, tail, 4);
  return c;
}

static GByteArray *
png_itxt (const char *keyword, const char *text)
{
  GByteArray *data = g_byte_array_new ();
  static const guint8 zeros[] = { 0, 0, 0, 0, 0 }; /* keyword NUL, flag, method, lang NUL,
                                                      translated keyword NUL */
  GByteArray *chunk;

  g_byte_array_append (data, (const guint8 *) keyword, (guint) strlen (keyword));
  g_byte_array_append (data, zeros, 5);
  g_byte_array_append (data, (const guint8 *) text, (guint) strlen (text));
  chunk = png_chunk ("iTXt", data->data, data->len);
  g_byte_array_unref (data);
  return chunk;
}

static GByteArray *
png_add_chunks (GByteArray *png, double dpi, const char *recipe, const char *methods)
{
  /* signature (8) + IHDR (8 + 13 + 4) = 33; IEND is the last 12 bytes */
  const gsize after_ihdr = 33;
  GByteArray *out, *phys, *rec, *desc = NULL, *soft;
  guint8 pd[9];
  guint32 ppm = (guint32) lround (dpi / 0.0254);
  g_autofree char *software = g_strdup_printf ("Framewise %s", FW_VERSION);

  if (png->len < after_ihdr + 12 || memcmp (png->data + 12, "IHDR", 4) != 0
      || memcmp (png->data + png->len - 8, "IEND", 4) != 0)
    return png;

  put_be32 (pd, ppm);
  put_be32 (pd + 4, ppm);
  pd[8] = 1; /* unit: metre */
  phys = png_chunk ("pHYs", pd, 9);
  rec = png_itxt (FW_RECIPE_PNG_KEYWORD, recipe);
  soft = png_itxt ("Software", software);
  if (methods && *methods)
    desc = png_itxt ("Description", methods);

  out = g_byte_array_sized_new (png->len + phys->len + rec->len + soft->len
                                + (desc ? desc->len : 0));
  g_byte_array_append (out, png->data, (guint) after_ihdr);
  g_byte_array_append (out, phys->data, phys->len);
  g_byte_array_append (out, png->data + after_ihdr, (guint) (png->len - after_ihdr - 12));
  g_byte_array_append (out, rec->data, rec->len);
  if (desc)
    g_byte_array_append (out, desc->data, desc->len);
  g_byte_array_append (out, soft->data, soft->len);
  g_byte_array_append (out, png->data + png->len - 12, 12);

  g_byte_array_unref (phys);
  g_byte_array_unref (rec);
  g_byte_array_unref (soft);
  if (desc)
    g_byte_array_unref (desc);
  g_byte_array_unref (png);
  return out;
}

/* ---- rendering ---- */

static char *
figure_title (FwFigure *fig, const char *recipe)
{
  g_autoptr (FwRecipe) r = fw_recipe_parse (recipe, -1, NULL);
  g_autofree char *base = NULL;

  if (r == NULL)
    return g_strdup ("Framewise figure");
  base = g_path_get_basename (r->clip && *r->clip ? r->clip : "figure");
  if (r->param_set)
    return g_strdup_printf ("%s, %s", base, r->param_set);
  return g_steal_pointer (&base);
}

GBytes *
fw_export_figure_to_bytes (FwFigure *fig, const FwExportSettings *settings, GError **error)
{
  GByteArray *buf = g_byte_array_new ();
  cairo_surface_t *surface = NULL;
  cairo_t *cr;
  g_autofree char *recipe = NULL;
  g_autofree char *methods = NULL;
  g_autofree char *title = NULL;
  double w_pt = settings->width_mm * PT_PER_MM;
  double h_pt = settings->height_mm * PT_PER_MM;
  double raster = settings->dpi / 72.0;
  double snap = 0;
  gboolean ok;
  cairo_status_t status;

  g_return_val_if_fail (fig != NULL && settings != NULL, NULL);
  if (!(settings->height_mm > 0))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Height not resolved; call fw_export_resolve first"));
      g_byte_array_unref (buf);
      return NULL;
    }

  recipe = fw_figure_dup_recipe (fig);
  methods = fw_figure_dup_methods (fig);
  title = figure_title (fig, recipe);

  switch (settings->format)
    {
    case FW_EXPORT_SVG:
      surface = cairo_svg_surface_create_for_stream (append_bytes, buf, settings->width_mm,
                                                     settings->height_mm);
      cairo_svg_surface_restrict_to_version (surface, CAIRO_SVG_VERSION_1_1);
      cairo_svg_surface_set_document_unit (surface, CAIRO_SVG_UNIT_MM);
      break;
    case FW_EXPORT_PDF:
      {
        g_autofree char *b64 = g_base64_encode ((const guchar *) recipe, strlen (recipe));
        g_autofree char *kw = NULL;
        g_autoptr (FwRecipe) r = fw_recipe_parse (recipe, -1, NULL);
        g_autofree char *creator = g_strdup_printf ("Framewise %s", FW_VERSION);

        surface = cairo_pdf_surface_create_for_stream (append_bytes, buf, w_pt, h_pt);
        kw = g_strdup_printf ("%s%s framewise-parameters-hash:%s", FW_RECIPE_PDF_TAG, b64,
                              r && r->params_hash ? r->params_hash : "");
        cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_TITLE, title);
        if (methods)
          cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_SUBJECT, methods);
        cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_KEYWORDS, kw);
        cairo_pdf_surface_set_metadata (surface, CAIRO_PDF_METADATA_CREATOR, creator);
      }
      break;
    case FW_EXPORT_PNG:
    default:
      {
        int pw = fw_export_pixels (settings->width_mm, settings->dpi);
        int ph = fw_export_pixels (settings->height_mm, settings->dpi);
        /* the layout is sized so that it covers the pixel grid exactly */
        w_pt = pw * 72.0 / settings->dpi;
        h_pt = ph * 72.0 / settings->dpi;
        snap = 72.0 / settings->dpi;
        surface = cairo_image_surface_create (settings->theme.background.a < 1
                                                ? CAIRO_FORMAT_ARGB32
                                                : CAIRO_FORMAT_RGB24,
                                              pw, ph);
      }
      break;
    }

  status = cairo_surface_status (surface);
  if (!check_cairo (status, fw_export_format_name (settings->format), error))
    {
      cairo_surface_destroy (surface);
      g_byte_array_unref (buf);
      return NULL;
    }

  cr = cairo_create (surface);
  if (settings->format == FW_EXPORT_SVG)
    cairo_scale (cr, 1.0 / PT_PER_MM, 1.0 / PT_PER_MM);
  else if (settings->format == FW_EXPORT_PNG)
    cairo_scale (cr, settings->dpi / 72.0, settings->dpi / 72.0);
  ok = fw_figure_draw (fig, cr, &settings->theme, w_pt, h_pt, raster, snap, error);
  status = cairo_status (cr);
  cairo_destroy (cr);
  if (ok && !check_cairo (status, fw_export_format_name (settings->format), error))
    ok = FALSE;

  if (ok && settings->format == FW_EXPORT_PNG)
    {
      status = cairo_surface_write_to_png_stream (surface, append_bytes, buf);
      ok = check_cairo (status, "PNG", error);
    }
  cairo_surface_finish (surface);
  if (ok)
    ok = check_cairo (cairo_surface_status (surface), fw_export_format_name (settings->format),
                      error);
  cairo_surface_destroy (surface);
  if (!ok)
    {
      g_byte_array_unref (buf);
      return NULL;
    }

  if (settings->format == FW_EXPORT_SVG)
    {
      buf = svg_crisp_images (buf);
      buf = svg_insert_metadata (buf, recipe, title, methods);
    }
  else if (settings->format == FW_EXPORT_PNG)
    buf = png_add_chunks (buf, settings->dpi, recipe, methods);
  return g_byte_array_free_to_bytes (buf);
}

gboolean
fw_export_figure (FwFigure *fig, const FwExportSettings *settings, const char *path,
                  GError **error)
{
  FwExportSettings s = *settings;
  g_autoptr (GBytes) bytes = NULL;
  g_autoptr (GError) local = NULL;
  gsize len;
  const char *data;

  if (!fw_export_resolve (fig, &s, error))
    return FALSE;
  bytes = fw_export_figure_to_bytes (fig, &s, error);
  if (bytes == NULL)
    return FALSE;
  data = g_bytes_get_data (bytes, &len);
  if (!g_file_set_contents (path, data, (gssize) len, &local))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_IO, _("Cannot write %s: %s"), path,
                   local->message);
      return FALSE;
    }
  return TRUE;
}

/* ---- reading recipes back ---- */

static char *
recipe_from_png (const guint8 *d, gsize n, GError **error)
{
  gsize pos = 8;

  while (pos + 12 <= n)
    {
      guint32 len = get_be32 (d + pos);
      const guint8 *type = d + pos + 4, *data = d + pos + 8;
      if (len > n - pos - 12)
        break;
      if (memcmp (type, "iTXt", 4) == 0 || memcmp (type, "tEXt", 4) == 0)
        {
          gsize klen = strlen (FW_RECIPE_PNG_KEYWORD);
          if (len > klen && memcmp (data, FW_RECIPE_PNG_KEYWORD, klen) == 0 && data[klen] == 0)
            {
              const guint8 *p = data + klen + 1, *end = data + len;
              if (memcmp (type, "tEXt", 4) == 0)
                return g_convert ((const char *) p, end - p, "UTF-8", "ISO-8859-1", NULL, NULL,
                                  error);
              if (end - p < 2 || p[0] != 0)
                {
                  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                               _("The PNG recipe chunk is compressed or malformed"));
                  return NULL;
                }
              p += 2; /* compression flag and method */
              p = memchr (p, 0, end - p); /* language tag */
              if (p)
                p = memchr (p + 1, 0, end - p - 1); /* translated keyword */
              if (p == NULL)
                {
                  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                               _("The PNG recipe chunk is malformed"));
                  return NULL;
                }
              p++;
              if (!g_utf8_validate ((const char *) p, end - p, NULL))
                {
                  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                               _("The PNG recipe chunk is not valid UTF-8"));
                  return NULL;
                }
              return g_strndup ((const char *) p, end - p);
            }
        }
      if (memcmp (type, "IEND", 4) == 0)
        break;
      pos += 12 + len;
    }
  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_NO_RECIPE,
               _("The PNG holds no Framewise recipe (no \"%s\" text chunk)"),
               FW_RECIPE_PNG_KEYWORD);
  return NULL;
}

static char *
recipe_from_pdf (const guint8 *d, gsize n, GError **error)
{
  gsize tl = strlen (FW_RECIPE_PDF_TAG);

  for (gsize i = 0; i + tl <= n; i++)
    if (d[i] == FW_RECIPE_PDF_TAG[0] && memcmp (d + i, FW_RECIPE_PDF_TAG, tl) == 0)
      {
        gsize j = i + tl, k = j;
        g_autofree char *b64 = NULL;
        guchar *raw;
        gsize raw_len;
        while (k < n && (g_ascii_isalnum (d[k]) || d[k] == '+' || d[k] == '/' || d[k] == '='))
          k++;
        b64 = g_strndup ((const char *) d + j, k - j);
        raw = g_base64_decode (b64, &raw_len);
        if (raw == NULL || raw_len == 0 || !g_utf8_validate ((const char *) raw, raw_len, NULL))
          {
            g_free (raw);
            g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                         _("The PDF recipe is not valid base64 UTF-8 text"));
            return NULL;
          }
        {
          char *text = g_strndup ((const char *) raw, raw_len);
          g_free (raw);
          return text;
        }
      }
  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_NO_RECIPE,
               _("The PDF holds no Framewise recipe (no \"%s\" in its keywords)"),
               FW_RECIPE_PDF_TAG);
  return NULL;
}

typedef struct {
  int metadata_depth;
  gboolean in_recipe;
  gboolean done;
  GString *text;
} SvgScan;

static const char *
local_name (const char *name)
{
  const char *colon = strrchr (name, ':');
  return colon ? colon + 1 : name;
}

static void
svg_start (GMarkupParseContext *ctx, const char *name, const char **an, const char **av,
           gpointer user_data, GError **error)
{
  SvgScan *s = user_data;
  if (g_strcmp0 (local_name (name), "metadata") == 0)
    s->metadata_depth++;
  else if (s->metadata_depth > 0 && g_strcmp0 (local_name (name), "recipe") == 0)
    s->in_recipe = TRUE;
}

static void
svg_end (GMarkupParseContext *ctx, const char *name, gpointer user_data, GError **error)
{
  SvgScan *s = user_data;
  if (s->in_recipe && g_strcmp0 (local_name (name), "recipe") == 0)
    {
      s->in_recipe = FALSE;
      s->done = TRUE;
      /* stop parsing: the rest of the document is not needed */
      g_set_error_literal (error, G_MARKUP_ERROR, G_MARKUP_ERROR_INVALID_CONTENT, "done");
    }
  else if (g_strcmp0 (local_name (name), "metadata") == 0 && s->metadata_depth > 0)
    s->metadata_depth--;
}

static void
svg_text (GMarkupParseContext *ctx, const char *text, gsize len, gpointer user_data,
          GError **error)
{
  SvgScan *s = user_data;
  if (s->in_recipe)
    g_string_append_len (s->text, text, (gssize) len);
}

static char *
recipe_from_svg (const guint8 *d, gsize n, GError **error)
{
  static const GMarkupParser parser = { svg_start, svg_end, svg_text, NULL, NULL };
  SvgScan scan = { 0, FALSE, FALSE, g_string_new (NULL) };
  GMarkupParseContext *ctx = g_markup_parse_context_new (&parser, 0, &scan, NULL);
  g_autoptr (GError) local = NULL;

  g_markup_parse_context_parse (ctx, (const char *) d, (gssize) n, &local);
  if (local == NULL)
    g_markup_parse_context_end_parse (ctx, &local);
  g_markup_parse_context_free (ctx);
  if (scan.done)
    return g_string_free (scan.text, FALSE);
  g_string_free (scan.text, TRUE);
  if (local != NULL && !scan.done)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_NO_RECIPE,
                   _("The SVG holds no Framewise recipe (%s)"), local->message);
      return NULL;
    }
  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_NO_RECIPE,
               _("The SVG holds no Framewise recipe (no <metadata> with a recipe element)"));
  return NULL;
}

char *
fw_export_read_recipe_from_data (const guint8 *data, gsize length, GError **error)
{
  static const guint8 png_sig[8] = { 0x89, 'P', 'N', 'G', '\r', '\n', 0x1a, '\n' };

  if (length >= 8 && memcmp (data, png_sig, 8) == 0)
    return recipe_from_png (data, length, error);
  if (length >= 5 && memcmp (data, "%PDF-", 5) == 0)
    return recipe_from_pdf (data, length, error);
  if (g_strstr_len ((const char *) data, (gssize) MIN (length, 4096), "<svg") != NULL)
    return recipe_from_svg (data, length, error);
  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_FORMAT,
               _("not an SVG, PDF or PNG file"));
  return NULL;
}

char *
fw_export_read_recipe (const char *path, GError **error)
{
  g_autofree char *data = NULL;
  gsize len;
  g_autoptr (GError) local = NULL;
  char *text;

  if (!g_file_get_contents (path, &data, &len, &local))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_IO, _("Cannot read %s: %s"), path,
                   local->message);
      return NULL;
    }
  text = fw_export_read_recipe_from_data ((const guint8 *) data, len, &local);
  if (text == NULL)
    {
      g_set_error (error, FW_RENDER_ERROR, local->code, "%s: %s", path, local->message);
      return NULL;
    }
  return text;
}
