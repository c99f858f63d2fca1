/* fw-screen-theme.h: the render layer's FwTheme filled from the GTK style on screen. */
#pragma once

#include <gtk/gtk.h>

#include "fw-theme.h"

G_BEGIN_DECLS

/* Light or dark variant, text colour and font family from the widget's style and GtkSettings;
 * layout sizes are the render defaults scaled for screen pixels. */
void fw_screen_theme_for_widget (GtkWidget *widget, FwTheme *theme);

/* A GdkTexture from an ARGB32 cairo image surface (premultiplied, native endian). */
GdkTexture *fw_texture_from_surface (cairo_surface_t *surface);

G_END_DECLS
