/* fw-render-colour-bar.c: colour bars in the gutter column (see fw-render-colour-bar.h). */
#include "fw-config.h"

#include "fw-render-colour-bar.h"

#include <math.h>

void
fw_colour_bar_ticks (cairo_t *cr, const FwTheme *theme, const FwValueRange *range, double y,
                     double h, FwTicks *ticks)
{
  FwAxis axis;

  fw_axis_init (&axis, FW_AXIS_LINEAR, range->lo, range->hi, y + h, y);
  /* labels may reach half the row gap beyond the bar, never into the next row's labels */
  fw_axis_choose_ticks (cr, theme, &axis, FW_TICK_NUMBER, false, theme->row_gap / 2 - 0.25,
                        ticks);
}

static double
tick_label_width (cairo_t *cr, const FwTheme *theme, const FwTicks *ticks)
{
  double w = 0;
  fw_ticks_max_label_size (cr, theme, ticks, &w, NULL);
  return w;
}

double
fw_colour_bar_gutter_width (cairo_t *cr, const FwTheme *theme, const FwValueRange *range,
                            const char *label, double h)
{
  FwTicks ticks;
  double w;

  fw_colour_bar_ticks (cr, theme, range, 0, h, &ticks);
  w = theme->colour_bar_gap + theme->colour_bar_width + theme->tick_length + theme->pad
      + tick_label_width (cr, theme, &ticks);
  if (label && *label)
    w += theme->pad + fw_theme_wrapped_thickness (cr, theme, FW_TEXT_AXIS, label, h);
  return w;
}

void
fw_colour_bar_draw (cairo_t *cr, const FwTheme *theme, const FwColourScale *scale,
                    const FwValueRange *range, const char *label, double x_gutter, double y,
                    double h)
{
  FwTicks ticks;
  FwAxis axis;
  cairo_pattern_t *gradient;
  double bx = x_gutter + theme->colour_bar_gap;
  double bw = theme->colour_bar_width;

  fw_colour_bar_ticks (cr, theme, range, y, h, &ticks);
  fw_axis_init (&axis, FW_AXIS_LINEAR, range->lo, range->hi, y + h, y);

  cairo_save (cr);
  gradient = fw_colour_scale_gradient (scale, 0, y + h, 0, y);
  cairo_rectangle (cr, bx, y, bw, h);
  cairo_set_source (cr, gradient);
  cairo_fill (cr);
  cairo_pattern_destroy (gradient);

  /* frame */
  fw_theme_set_source (cr, &theme->foreground);
  cairo_set_line_width (cr, theme->line_width);
  cairo_rectangle (cr, bx, y, bw, h);
  cairo_stroke (cr);

  fw_axis_draw (cr, theme, &axis, &ticks, FW_EDGE_RIGHT, bx + bw, true);

  if (label && *label)
    {
      double lx = bx + bw + theme->tick_length + theme->pad + tick_label_width (cr, theme, &ticks)
                  + theme->pad;
      fw_theme_set_source (cr, &theme->foreground);
      fw_theme_draw_rotated_block (cr, theme, FW_TEXT_AXIS, label, h, lx, y + h / 2);
    }
  cairo_restore (cr);
}
