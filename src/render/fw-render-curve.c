/* fw-render-curve.c: descriptor curves over time (see fw-render-curve.h). */
#include "fw-config.h"

#include "fw-render-curve.h"

#include <math.h>
#include <string.h>

FwTickStyle
fw_curve_tick_style (FwStage stage)
{
  switch (stage)
    {
    case FW_STAGE_CENTROID:
    case FW_STAGE_BANDWIDTH:
    case FW_STAGE_ROLLOFF:
      return FW_TICK_FREQUENCY;
    default:
      return FW_TICK_NUMBER;
    }
}

void
fw_curve_spec_init (FwCurveSpec *spec, FwStage stage, double t0, double t1)
{
  g_return_if_fail (spec != NULL);
  memset (spec, 0, sizeof *spec);
  spec->t0 = t0;
  spec->t1 = t1;
  spec->range.lo = 0.0;
  spec->range.hi = 1.0;
  spec->style = fw_curve_tick_style (stage);
  spec->unit = NULL;
  spec->n_columns = 0;
  spec->zero_line = false;
}

/* Index of the first frame whose time is >= t (strict = false) or > t (strict = true);
 * frame times increase. */
static size_t
frame_bound (const FwMatrix *m, double t, bool strict)
{
  size_t lo = 0, hi = m->n_frames;

  while (lo < hi)
    {
      size_t mid = lo + (hi - lo) / 2;
      double ft = m->frame_times[mid];
      if (strict ? ft <= t : ft < t)
        lo = mid + 1;
      else
        hi = mid;
    }
  return lo;
}

gboolean
fw_curve_auto_range (const FwMatrix *m, double t0, double t1, FwValueRange *out)
{
  double vmin = HUGE_VAL, vmax = -HUGE_VAL;
  FwNiceLabels nl;
  size_t end;

  g_return_val_if_fail (out != NULL, FALSE);
  out->lo = 0.0;
  out->hi = 1.0;
  g_return_val_if_fail (m != NULL, FALSE);
  if (m->n_bins < 1)
    return FALSE;
  end = frame_bound (m, t1, true);
  for (size_t t = frame_bound (m, t0, false); t < end; t++)
    {
      float v = m->data[t * m->n_bins];
      if (!isfinite (v))
        continue;
      vmin = MIN (vmin, v);
      vmax = MAX (vmax, v);
    }
  if (!(vmax >= vmin))
    return FALSE;
  fw_nice_loose_labels (vmin, vmax, 4, &nl);
  out->lo = nl.graph_min;
  out->hi = nl.graph_max;
  return TRUE;
}

void
fw_curve_value_axis (const FwCurveSpec *spec, double y_bottom, double y_top, FwAxis *axis)
{
  double lo, hi;

  g_return_if_fail (spec != NULL && axis != NULL);
  lo = spec->range.lo;
  hi = spec->range.hi;
  if (!isfinite (lo) || !isfinite (hi))
    {
      lo = 0.0;
      hi = 1.0;
    }
  else if (hi == lo)
    {
      double d = lo != 0 ? fabs (lo) * 0.1 : 1.0;
      lo -= d;
      hi += d;
    }
  fw_axis_init (axis, FW_AXIS_LINEAR, lo, hi, y_bottom, y_top);
}

/* The path being built: consecutive points join; a run of one point becomes a dot. */
typedef struct {
  cairo_t *cr;
  bool down;
  int run;
  double x, y;
} Pen;

static void
pen_point (Pen *pen, double x, double y)
{
  if (pen->down)
    cairo_line_to (pen->cr, x, y);
  else
    cairo_move_to (pen->cr, x, y);
  pen->down = true;
  pen->run++;
  pen->x = x;
  pen->y = y;
}

static void
pen_lift (Pen *pen)
{
  /* a sub-path of one point drawn to itself is stroked as a dot with round caps */
  if (pen->down && pen->run == 1)
    cairo_line_to (pen->cr, pen->x, pen->y);
  pen->down = false;
  pen->run = 0;
}

void
fw_curve_draw (cairo_t *cr, const FwTheme *theme, const FwCurveSpec *spec, const FwMatrix *m,
               double x, double y, double w, double h)
{
  FwAxis va;
  Pen pen = { cr, false, 0, 0, 0 };
  double span;
  size_t f0, f1;
  int n;

  g_return_if_fail (cr != NULL && theme != NULL && spec != NULL);
  span = spec->t1 - spec->t0;
  if (m == NULL || m->n_frames == 0 || m->n_bins < 1 || !(w > 0) || !(h > 0) || !(span > 0))
    return;
  n = spec->n_columns > 0 ? spec->n_columns : MAX (1, (int) ceil (w));
  fw_curve_value_axis (spec, y + h, y, &va);

  cairo_save (cr);
  cairo_rectangle (cr, x, y, w, h);
  cairo_clip (cr);
  cairo_new_path (cr);

  if (spec->zero_line)
    {
      double zy = fw_axis_value_to_pixel (&va, 0.0);
      fw_theme_set_source (cr, &theme->muted);
      cairo_set_line_width (cr, theme->line_width);
      cairo_move_to (cr, x, zy);
      cairo_line_to (cr, x + w, zy);
      cairo_stroke (cr);
    }

  fw_theme_set_source (cr, &theme->trace);
  cairo_set_line_width (cr, theme->trace_width);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  cairo_set_line_cap (cr, CAIRO_LINE_CAP_ROUND);

  f0 = frame_bound (m, spec->t0, false);
  f1 = frame_bound (m, spec->t1, true);
  if (f1 - f0 <= 2 * (size_t) n)
    {
      /* every frame, and one beyond each end so the line reaches the edges */
      size_t a = f0 > 0 ? f0 - 1 : 0, b = f1 < m->n_frames ? f1 + 1 : f1;
      for (size_t t = a; t < b; t++)
        {
          float v = m->data[t * m->n_bins];
          if (!isfinite (v))
            {
              pen_lift (&pen);
              continue;
            }
          pen_point (&pen, x + (m->frame_times[t] - spec->t0) / span * w,
                     fw_axis_value_to_pixel (&va, v));
        }
    }
  else
    {
      /* more frames than columns: each column's minimum and maximum, in time order */
      size_t t = f0;
      for (int c = 0; c < n; c++)
        {
          double lo = HUGE_VAL, hi = -HUGE_VAL;
          double px = x + w * (c + 0.5) / n;
          size_t t_lo = 0, t_hi = 0;
          bool any = false;

          while (t < f1)
            {
              int col = (int) floor ((m->frame_times[t] - spec->t0) / span * n);
              float v;
              if (MIN (col, n - 1) > c)
                break;
              any = true;
              v = m->data[t * m->n_bins];
              if (isfinite (v))
                {
                  if (v < lo)
                    {
                      lo = v;
                      t_lo = t;
                    }
                  if (v > hi)
                    {
                      hi = v;
                      t_hi = t;
                    }
                }
              t++;
            }
          if (!any)
            continue; /* no frame in this column: the line bridges it */
          if (!(hi >= lo))
            {
              pen_lift (&pen);
              continue;
            }
          if (t_lo <= t_hi)
            {
              pen_point (&pen, px, fw_axis_value_to_pixel (&va, lo));
              if (hi > lo)
                pen_point (&pen, px, fw_axis_value_to_pixel (&va, hi));
            }
          else
            {
              pen_point (&pen, px, fw_axis_value_to_pixel (&va, hi));
              pen_point (&pen, px, fw_axis_value_to_pixel (&va, lo));
            }
        }
    }
  pen_lift (&pen);
  cairo_stroke (cr);
  cairo_restore (cr);
}

void
fw_curve_draw_row (cairo_t *cr, const FwTheme *theme, const FwCurveSpec *spec,
                   const FwMatrix *m, double x, double y, double w, double h)
{
  FwAxis axis;
  FwTicks ticks;
  const char *unit;

  g_return_if_fail (cr != NULL && theme != NULL && spec != NULL);
  cairo_save (cr);
  fw_theme_set_source (cr, &theme->data_background);
  cairo_rectangle (cr, x, y, w, h);
  cairo_fill (cr);
  cairo_restore (cr);

  fw_curve_draw (cr, theme, spec, m, x, y, w, h);

  fw_curve_value_axis (spec, y + h, y, &axis);
  /* labels may reach a little above and below the data area, never into the next row */
  fw_axis_choose_ticks (cr, theme, &axis, spec->style, false,
                        0.5 * theme->font_size[FW_TEXT_TICK], &ticks);
  fw_axis_draw (cr, theme, &axis, &ticks, FW_EDGE_LEFT, x, true);
  unit = spec->unit != NULL && *spec->unit != '\0' ? spec->unit : ticks.unit;
  if (*unit != '\0')
    {
      cairo_save (cr);
      fw_theme_set_source (cr, &theme->muted);
      fw_theme_draw_text (cr, theme, FW_TEXT_TICK, unit, x - theme->tick_length - theme->pad,
                          MIN (axis.p0, axis.p1) - theme->pad - 1, FW_ALIGN_END, FW_ALIGN_END,
                          false);
      cairo_restore (cr);
    }
}
