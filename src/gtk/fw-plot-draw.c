/* fw-plot-draw.c: a plot row's vector parts, drawn through src/render. */
#include "fw-config.h"

#include "fw-plot-draw.h"

#include <math.h>

#include <glib/gi18n.h>

#include "fw-feature.h"
#include "fw-render-colour-bar.h"
#include "fw-render-curve.h"

static void
draw_frame (cairo_t *cr, const FwTheme *theme, const FwPlotDrawInfo *info)
{
  cairo_save (cr);
  fw_theme_set_source (cr, &theme->foreground);
  cairo_set_line_width (cr, theme->line_width);
  cairo_rectangle (cr, info->x - 0.5 * theme->line_width, info->y - 0.5 * theme->line_width,
                   info->w + theme->line_width, info->h + theme->line_width);
  cairo_stroke (cr);
  cairo_restore (cr);
}

/* Ticks and labels on the left edge; the unit of the labels ("kHz", "Hz", ...) or the
 * given word sits above them, left of the row title. */
static void
draw_value_axis (cairo_t *cr, const FwTheme *theme, const FwAxis *axis, FwTickStyle style,
                 double x, const char *unit)
{
  FwTicks ticks;
  double top = MIN (axis->p0, axis->p1);

  /* labels may reach a little above and below the data area, never into the next row */
  fw_axis_choose_ticks (cr, theme, axis, style, false, 0.5 * theme->font_size[FW_TEXT_TICK],
                        &ticks);
  fw_axis_draw (cr, theme, axis, &ticks, FW_EDGE_LEFT, x, true);
  if (unit == NULL || *unit == '\0')
    unit = ticks.unit;
  if (unit != NULL && *unit != '\0')
    {
      cairo_save (cr);
      fw_theme_set_source (cr, &theme->muted);
      fw_theme_draw_text (cr, theme, FW_TEXT_TICK, unit, x - theme->tick_length - theme->pad,
                          top - theme->pad - 1, FW_ALIGN_END, FW_ALIGN_END, false);
      cairo_restore (cr);
    }
}

static void
draw_waveform (cairo_t *cr, const FwTheme *theme, const FwPlotDrawInfo *info)
{
  const FwAudio *audio = info->audio;
  FwWaveformSpec spec;
  FwAxis axis;
  int columns = MAX (1, (int) floor (info->w));
  FwWaveformEnvelope *env = *info->envelope;

  fw_waveform_spec_init (&spec, audio->n_samples / audio->sample_rate);
  spec.t0 = info->t0;
  spec.t1 = info->t1;
  if (env == NULL || env->n_columns != columns || env->t0 != info->t0 || env->t1 != info->t1)
    {
      g_clear_pointer (info->envelope, fw_waveform_envelope_free);
      env = fw_waveform_envelope_new (audio->samples, audio->n_samples, audio->sample_rate,
                                      info->t0, info->t1, columns, spec.rms_window);
      *info->envelope = env;
    }
  cairo_save (cr);
  fw_theme_set_source (cr, &theme->data_background);
  cairo_rectangle (cr, info->x, info->y, info->w, info->h);
  cairo_fill (cr);
  cairo_restore (cr);
  if (env != NULL)
    fw_waveform_draw (cr, theme, &spec, env, info->x, info->y, info->w, info->h);
  fw_waveform_axis (&spec, info->y + info->h, info->y, &axis);
  draw_value_axis (cr, theme, &axis, FW_TICK_NUMBER, info->x, NULL);
}

/* A descriptor row: one value per frame as a line over time (src/render/fw-render-curve). */
static void
draw_trace (cairo_t *cr, const FwTheme *theme, const FwPlotDrawInfo *info)
{
  FwCurveSpec spec;
  double pad;

  if (!info->have_trace_range)
    return;
  fw_curve_spec_init (&spec, info->stage, info->t0, info->t1);
  spec.range = info->trace_range;
  /* a little headroom so the line does not run along the frame */
  pad = 0.06 * (spec.range.hi - spec.range.lo);
  spec.range.lo -= pad;
  spec.range.hi += pad;
  spec.zero_line = info->zero_line;
  fw_curve_draw_row (cr, theme, &spec, info->matrix, info->x, info->y, info->w, info->h);
}

void
fw_plot_draw_row (cairo_t *cr, const FwTheme *theme, const FwPlotDrawInfo *info)
{
  g_autofree char *quantity = NULL;

  /* title above the data area, quantity in the colour-bar label or beside the title */
  if (info->quantity != NULL)
    quantity = g_strdup (info->quantity);
  else if (info->params != NULL && info->stage != FW_STAGE_SIGNAL)
    quantity = fw_feature_quantity_label (info->stage, info->params);

  fw_theme_set_source (cr, &theme->foreground);
  {
    double w = fw_theme_draw_text (cr, theme, FW_TEXT_TITLE, info->title, info->x,
                                   info->y - theme->pad - 1, FW_ALIGN_START, FW_ALIGN_END,
                                   false);
    if (quantity != NULL && !fw_plot_kind_is_heatmap (info->kind))
      {
        fw_theme_set_source (cr, &theme->muted);
        fw_theme_draw_text (cr, theme, FW_TEXT_AXIS, quantity, info->x + w + 8,
                            info->y - theme->pad - 1, FW_ALIGN_START, FW_ALIGN_END, false);
      }
  }

  if (info->kind == FW_PLOT_WAVEFORM)
    {
      if (info->audio != NULL)
        draw_waveform (cr, theme, info);
    }
  else if (info->matrix != NULL && fw_plot_kind_is_heatmap (info->kind))
    {
      FwAxis axis;
      FwTickStyle style;

      fw_heatmap_bin_axis (info->matrix, &info->heatmap, info->y + info->h, info->y, &axis,
                           &style);
      /* coefficient rows count from c0: say so where a frequency row gives its unit */
      draw_value_axis (cr, theme, &axis, style, info->x,
                       info->matrix->bin_kind == FW_BIN_AXIS_COEFFICIENT ? _("coef.") : NULL);
      if (info->have_range && info->scale != NULL)
        fw_colour_bar_draw (cr, theme, info->scale, &info->range, quantity, info->x + info->w,
                            info->y, info->h);
    }
  else if (info->matrix != NULL)
    {
      draw_trace (cr, theme, info);
    }
  draw_frame (cr, theme, info);
}
