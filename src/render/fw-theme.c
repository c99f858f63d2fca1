/* fw-theme.c: fonts, sizes and colours for plots (see fw-theme.h). */
#include "fw-config.h"

#include "fw-theme.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-render-error.h"

static const FwRgba light_colours[] = {
  { 1.0, 1.0, 1.0, 1.0 },       /* background */
  { 0.10, 0.10, 0.12, 1.0 },    /* foreground */
  { 0.40, 0.40, 0.43, 1.0 },    /* muted */
  { 1.0, 1.0, 1.0, 1.0 },       /* data background */
  { 0.16, 0.27, 0.42, 1.0 },    /* waveform envelope: dark slate blue */
  { 0.50, 0.66, 0.85, 1.0 },    /* waveform RMS band: lighter */
  { 0.62, 0.20, 0.10, 1.0 },    /* trace: brick */
  { 0.85, 0.85, 0.85, 1.0 },    /* missing */
};

static const FwRgba dark_colours[] = {
  { 0.12, 0.12, 0.13, 1.0 },
  { 0.90, 0.90, 0.90, 1.0 },
  { 0.62, 0.62, 0.64, 1.0 },
  { 0.08, 0.08, 0.09, 1.0 },
  { 0.62, 0.76, 0.95, 1.0 },
  { 0.30, 0.42, 0.60, 1.0 },
  { 0.98, 0.62, 0.40, 1.0 },
  { 0.25, 0.25, 0.27, 1.0 },
};

void
fw_theme_init (FwTheme *theme, FwThemeVariant variant)
{
  const FwRgba *c = variant == FW_THEME_DARK ? dark_colours : light_colours;

  g_return_if_fail (theme != NULL);

  memset (theme, 0, sizeof *theme);
  theme->variant = variant;
  g_strlcpy (theme->font_family, "Sans", sizeof theme->font_family);
  theme->font_size[FW_TEXT_TICK] = 7.0;
  theme->font_size[FW_TEXT_AXIS] = 7.0;
  theme->font_size[FW_TEXT_TITLE] = 8.0;
  theme->font_size[FW_TEXT_LETTER] = 8.0;
  theme->font_size[FW_TEXT_CAPTION] = 6.0;

  theme->line_width = 0.5;
  theme->trace_width = 0.75;
  theme->tick_length = 2.5;
  theme->pad = 2.0;
  theme->row_gap = 5.0;
  theme->colour_bar_width = 6.0;
  theme->colour_bar_gap = 4.0;
  theme->margin = 3.0;

  theme->background = c[0];
  theme->foreground = c[1];
  theme->muted = c[2];
  theme->data_background = c[3];
  theme->waveform = c[4];
  theme->waveform_rms = c[5];
  theme->trace = c[6];
  theme->missing = c[7];
}

void
fw_theme_scale (FwTheme *theme, double factor)
{
  g_return_if_fail (theme != NULL);
  g_return_if_fail (factor > 0);

  for (int i = 0; i < FW_N_TEXT_ROLES; i++)
    theme->font_size[i] *= factor;
  theme->line_width *= factor;
  theme->trace_width *= factor;
  theme->tick_length *= factor;
  theme->pad *= factor;
  theme->row_gap *= factor;
  theme->colour_bar_width *= factor;
  theme->colour_bar_gap *= factor;
  theme->margin *= factor;
}

gboolean
fw_theme_set_font (FwTheme *theme, const char *font, GError **error)
{
  PangoFontDescription *desc;
  const char *family;
  double size;

  g_return_val_if_fail (theme != NULL, FALSE);

  if (font == NULL || *font == '\0')
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Font \"%s\": empty; give a family and a size, e.g. \"Sans 7\""),
                   font ? font : "");
      return FALSE;
    }
  desc = pango_font_description_from_string (font);
  family = pango_font_description_get_family (desc);
  if (family == NULL || *family == '\0')
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Font \"%s\": no font family; give a family and a size, e.g. \"Sans 7\""),
                   font);
      pango_font_description_free (desc);
      return FALSE;
    }
  size = (double) pango_font_description_get_size (desc) / PANGO_SCALE;
  if ((pango_font_description_get_set_fields (desc) & PANGO_FONT_MASK_SIZE) != 0
      && (size < 3.0 || size > 72.0))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Font \"%s\": size %g is outside 3 to 72 points"), font, size);
      pango_font_description_free (desc);
      return FALSE;
    }
  if (strlen (family) >= sizeof theme->font_family)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Font \"%s\": family name too long"), font);
      pango_font_description_free (desc);
      return FALSE;
    }
  g_strlcpy (theme->font_family, family, sizeof theme->font_family);
  if ((pango_font_description_get_set_fields (desc) & PANGO_FONT_MASK_SIZE) != 0)
    {
      theme->font_size[FW_TEXT_TICK] = size;
      theme->font_size[FW_TEXT_AXIS] = size;
      theme->font_size[FW_TEXT_TITLE] = size + 1.0;
      theme->font_size[FW_TEXT_LETTER] = size + 1.0;
      theme->font_size[FW_TEXT_CAPTION] = MAX (size - 1.0, 3.0);
    }
  pango_font_description_free (desc);
  return TRUE;
}

gboolean
fw_theme_variant_from_name (const char *name, FwThemeVariant *out)
{
  if (g_strcmp0 (name, "light") == 0)
    *out = FW_THEME_LIGHT;
  else if (g_strcmp0 (name, "dark") == 0)
    *out = FW_THEME_DARK;
  else
    return FALSE;
  return TRUE;
}

PangoFontDescription *
fw_theme_font (const FwTheme *theme, FwTextRole role)
{
  PangoFontDescription *desc = pango_font_description_new ();

  g_return_val_if_fail (role < FW_N_TEXT_ROLES, desc);
  pango_font_description_set_family (desc, theme->font_family);
  pango_font_description_set_absolute_size (desc, theme->font_size[role] * PANGO_SCALE);
  pango_font_description_set_weight (desc, role == FW_TEXT_LETTER ? PANGO_WEIGHT_BOLD
                                                                  : PANGO_WEIGHT_NORMAL);
  return desc;
}

PangoLayout *
fw_theme_layout (cairo_t *cr, const FwTheme *theme, FwTextRole role, const char *text)
{
  PangoLayout *layout = pango_cairo_create_layout (cr);
  PangoContext *context = pango_layout_get_context (layout);
  cairo_font_options_t *options = cairo_font_options_create ();
  PangoFontDescription *desc = fw_theme_font (theme, role);

  /* Unhinted metrics: the same layout on screen, in PNG and in vector files. */
  cairo_font_options_set_hint_metrics (options, CAIRO_HINT_METRICS_OFF);
  cairo_font_options_set_hint_style (options, CAIRO_HINT_STYLE_NONE);
  pango_cairo_context_set_font_options (context, options);
  pango_context_set_round_glyph_positions (context, FALSE);
  cairo_font_options_destroy (options);
  pango_layout_context_changed (layout);

  pango_layout_set_font_description (layout, desc);
  pango_font_description_free (desc);
  pango_layout_set_text (layout, text ? text : "", -1);
  return layout;
}

void
fw_theme_text_size (cairo_t *cr, const FwTheme *theme, FwTextRole role, const char *text,
                    double *width, double *height)
{
  PangoLayout *layout = fw_theme_layout (cr, theme, role, text);
  PangoRectangle logical;

  pango_layout_get_extents (layout, NULL, &logical);
  if (width)
    *width = (double) logical.width / PANGO_SCALE;
  if (height)
    *height = (double) logical.height / PANGO_SCALE;
  g_object_unref (layout);
}

double
fw_theme_draw_text (cairo_t *cr, const FwTheme *theme, FwTextRole role, const char *text,
                    double x, double y, FwAlign halign, FwAlign valign, bool rotate_ccw)
{
  PangoLayout *layout;
  PangoRectangle logical;
  double w, h, dx, dy;

  if (text == NULL || *text == '\0')
    return 0.0;
  layout = fw_theme_layout (cr, theme, role, text);
  pango_layout_get_extents (layout, NULL, &logical);
  w = (double) logical.width / PANGO_SCALE;
  h = (double) logical.height / PANGO_SCALE;
  dx = halign == FW_ALIGN_START ? 0.0 : halign == FW_ALIGN_CENTER ? -w / 2 : -w;
  dy = valign == FW_ALIGN_START ? 0.0 : valign == FW_ALIGN_CENTER ? -h / 2 : -h;
  dx -= (double) logical.x / PANGO_SCALE;
  dy -= (double) logical.y / PANGO_SCALE;

  cairo_save (cr);
  cairo_translate (cr, x, y);
  if (rotate_ccw)
    cairo_rotate (cr, -G_PI / 2);
  cairo_move_to (cr, dx, dy);
  pango_cairo_update_layout (cr, layout);
  pango_cairo_show_layout (cr, layout);
  cairo_restore (cr);
  g_object_unref (layout);
  return w;
}

PangoLayout *
fw_theme_layout_wrapped (cairo_t *cr, const FwTheme *theme, FwTextRole role, const char *text,
                         double max_length)
{
  PangoLayout *layout = fw_theme_layout (cr, theme, role, text);

  if (max_length > 0 && text != NULL)
    {
      PangoRectangle logical;
      const char *comma = strstr (text, ", ");
      pango_layout_get_extents (layout, NULL, &logical);
      /* Labels read "quantity, reference": when one line is too long, break after the first
       * comma rather than wherever the words happen to run out. */
      if ((double) logical.width / PANGO_SCALE > max_length && comma != NULL)
        {
          g_autofree char *head = g_strndup (text, (gsize) (comma - text) + 1);
          g_autofree char *broken = g_strconcat (head, "\n", comma + 2, NULL);
          pango_layout_set_text (layout, broken, -1);
        }
      pango_layout_set_width (layout, (int) floor (max_length * PANGO_SCALE));
      pango_layout_set_wrap (layout, PANGO_WRAP_WORD_CHAR);
    }
  pango_layout_set_alignment (layout, PANGO_ALIGN_CENTER);
  return layout;
}

double
fw_theme_wrapped_thickness (cairo_t *cr, const FwTheme *theme, FwTextRole role,
                            const char *text, double max_length)
{
  PangoLayout *layout;
  PangoRectangle logical;

  if (text == NULL || *text == '\0')
    return 0.0;
  layout = fw_theme_layout_wrapped (cr, theme, role, text, max_length);
  pango_layout_get_extents (layout, NULL, &logical);
  g_object_unref (layout);
  return (double) logical.height / PANGO_SCALE;
}

void
fw_theme_draw_rotated_block (cairo_t *cr, const FwTheme *theme, FwTextRole role,
                             const char *text, double max_length, double x_left,
                             double y_center)
{
  PangoLayout *layout;
  PangoRectangle logical;
  double lw, lh;

  if (text == NULL || *text == '\0')
    return;
  layout = fw_theme_layout_wrapped (cr, theme, role, text, max_length);
  pango_layout_get_extents (layout, NULL, &logical);
  lw = (double) (pango_layout_get_width (layout) > 0 ? pango_layout_get_width (layout)
                                                      : logical.width) / PANGO_SCALE;
  lh = (double) logical.height / PANGO_SCALE;
  (void) lh;

  cairo_save (cr);
  /* After rotating by -90 degrees the reading direction points up the page and successive
   * lines go right: the block's top edge (in reading terms) is the page's left edge. */
  cairo_translate (cr, x_left, y_center);
  cairo_rotate (cr, -G_PI / 2);
  cairo_move_to (cr, -lw / 2 - (pango_layout_get_width (layout) > 0 ? 0.0
                                 : (double) logical.x / PANGO_SCALE),
                 -(double) logical.y / PANGO_SCALE);
  pango_cairo_update_layout (cr, layout);
  pango_cairo_show_layout (cr, layout);
  cairo_restore (cr);
  g_object_unref (layout);
}
