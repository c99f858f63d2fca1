/* fw-render-colour-bar.h: colour bars drawn in a gutter column to the right of the data areas.
 *
 * Layout inside a gutter that starts at the data area's right edge, left to right:
 *   colour_bar_gap | bar (colour_bar_width) | tick marks and labels | pad | quantity label
 * The quantity label ("power, dB re 1.0", "MFCC value", "difference, dB") is set rotated,
 * reading upwards, centred on the bar, and wraps onto more lines when it is longer than the bar
 * is tall, so it is never clipped. The bar is a vector gradient (no raster image), so an
 * exported figure holds exactly one image per heatmap row.
 *
 * The figure reserves one gutter width for all rows (the largest any row needs), so every
 * row's data area has the same left and right edges whether or not it has a colour bar.
 */
#pragma once

#include <cairo.h>
#include <glib.h>

#include "fw-axis.h"
#include "fw-colour-scale.h"
#include "fw-theme.h"

G_BEGIN_DECLS

/* Ticks for a bar spanning [y + h, y] (values range->lo at the bottom). */
void fw_colour_bar_ticks (cairo_t *cr, const FwTheme *theme, const FwValueRange *range,
                          double y, double h, FwTicks *ticks);

/* Gutter width a bar of height h needs with these ticks and label. */
double fw_colour_bar_gutter_width (cairo_t *cr, const FwTheme *theme, const FwValueRange *range,
                                   const char *label, double h);

/* Draws the bar for the data area whose right edge is x_gutter, top y and height h; the label
 * block is placed right of the tick labels. */
void fw_colour_bar_draw (cairo_t *cr, const FwTheme *theme, const FwColourScale *scale,
                         const FwValueRange *range, const char *label, double x_gutter,
                         double y, double h);

G_END_DECLS
