/* fw-screen-theme.c: a render theme that matches the GTK style of the window. */
#include "fw-config.h"

#include "fw-screen-theme.h"

#include "fw-application.h"

/* Render sizes are in points for print; on screen they read best about 1.45 times larger
 * (a 7 pt tick label becomes about 10 px). */
#define SCREEN_SCALE 1.45

void
fw_screen_theme_for_widget (GtkWidget *widget, FwTheme *theme)
{
  GdkRGBA fg = { 0, 0, 0, 1 };
  double luminance;
  gboolean dark;
  g_autofree char *font = NULL;

  G_GNUC_BEGIN_IGNORE_DEPRECATIONS   /* the GTK 4.8 way to read a widget's colour */
  gtk_style_context_get_color (gtk_widget_get_style_context (widget), &fg);
  G_GNUC_END_IGNORE_DEPRECATIONS

  /* Light text means a dark style, whichever way it was chosen (system preference,
   * application setting or a dark theme). */
  luminance = 0.2126 * fg.red + 0.7152 * fg.green + 0.0722 * fg.blue;
  dark = luminance > 0.5 || (luminance > 0.35 && fw_application_is_dark ());

  fw_theme_init (theme, dark ? FW_THEME_DARK : FW_THEME_LIGHT);
  fw_theme_scale (theme, SCREEN_SCALE);
  theme->foreground = (FwRgba) { fg.red, fg.green, fg.blue, 1.0 };
  theme->muted = (FwRgba) { fg.red, fg.green, fg.blue, 0.62 };
  theme->background = (FwRgba) { 0, 0, 0, 0 };

  g_object_get (gtk_widget_get_settings (widget), "gtk-font-name", &font, NULL);
  if (font != NULL)
    {
      PangoFontDescription *desc = pango_font_description_from_string (font);
      const char *family = pango_font_description_get_family (desc);

      if (family != NULL && *family != '\0')
        g_strlcpy (theme->font_family, family, sizeof theme->font_family);
      pango_font_description_free (desc);
    }
}

GdkTexture *
fw_texture_from_surface (cairo_surface_t *surface)
{
  int width, height, stride;
  g_autoptr (GBytes) bytes = NULL;

  g_return_val_if_fail (cairo_image_surface_get_format (surface) == CAIRO_FORMAT_ARGB32, NULL);
  cairo_surface_flush (surface);
  width = cairo_image_surface_get_width (surface);
  height = cairo_image_surface_get_height (surface);
  stride = cairo_image_surface_get_stride (surface);
  bytes = g_bytes_new (cairo_image_surface_get_data (surface), (gsize) stride * height);
  /* GDK_MEMORY_DEFAULT is cairo's ARGB32 layout (premultiplied, native endian). */
  return gdk_memory_texture_new (width, height, GDK_MEMORY_DEFAULT, bytes, stride);
}
