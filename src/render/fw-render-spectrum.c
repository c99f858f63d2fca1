/* fw-render-spectrum.c: spectrum panels (see fw-render-spectrum.h). */
#include "fw-config.h"

#include "fw-render-spectrum.h"

#include <math.h>
#include <string.h>

#include "fw-colour-scale.h"

void
fw_spectrum_spec_init (FwSpectrumSpec *spec, FwStage stage)
{
  g_return_if_fail (spec != NULL);
  memset (spec, 0, sizeof *spec);
  spec->mode = FW_SPECTRUM_PANEL_WHOLE;
  spec->values_db = stage == FW_STAGE_DB || stage == FW_STAGE_MEL_DB;
  spec->freq_scale = FW_AXIS_LINEAR;
  spec->mel_scale = FW_MEL_SCALE_SLANEY;
}

double *
fw_spectrum_panel_values (const FwMatrix *m, const FwSpectrumSpec *spec, size_t *n_frames_used)
{
  size_t f0 = 0, f1 = 0;
  double *acc;
  size_t *count;

  g_return_val_if_fail (m != NULL && spec != NULL, NULL);
  if (n_frames_used)
    *n_frames_used = 0;
  if (m->n_frames == 0 || m->n_bins == 0)
    return NULL;

  switch (spec->mode)
    {
    case FW_SPECTRUM_PANEL_FRAME:
      {
        size_t best = 0;
        for (size_t t = 1; t < m->n_frames; t++)
          if (fabs (m->frame_times[t] - spec->t0) < fabs (m->frame_times[best] - spec->t0))
            best = t;
        f0 = best;
        f1 = best + 1;
      }
      break;
    case FW_SPECTRUM_PANEL_RANGE:
      f0 = 0;
      while (f0 < m->n_frames && m->frame_times[f0] < spec->t0)
        f0++;
      f1 = f0;
      while (f1 < m->n_frames && m->frame_times[f1] <= spec->t1)
        f1++;
      break;
    case FW_SPECTRUM_PANEL_WHOLE:
    default:
      f0 = 0;
      f1 = m->n_frames;
      break;
    }
  if (f1 <= f0)
    return NULL;

  acc = g_new0 (double, m->n_bins);
  count = g_new0 (size_t, m->n_bins);
  for (size_t t = f0; t < f1; t++)
    for (size_t k = 0; k < m->n_bins; k++)
      {
        float v = m->data[t * m->n_bins + k];
        if (!isfinite (v))
          continue;
        acc[k] += spec->values_db ? pow (10.0, v / 10.0) : v;
        count[k]++;
      }
  for (size_t k = 0; k < m->n_bins; k++)
    {
      if (count[k] == 0)
        acc[k] = NAN;
      else
        {
          acc[k] /= (double) count[k];
          if (spec->values_db)
            acc[k] = acc[k] > 0 ? 10.0 * log10 (acc[k]) : -HUGE_VAL;
        }
    }
  g_free (count);
  if (n_frames_used)
    *n_frames_used = f1 - f0;
  return acc;
}

static void
heatmap_spec_from (const FwSpectrumSpec *spec, FwHeatmapSpec *hs)
{
  memset (hs, 0, sizeof *hs);
  hs->freq_scale = spec->freq_scale;
  hs->mel_scale = spec->mel_scale;
  hs->f_lo = spec->f_lo;
  hs->f_hi = spec->f_hi;
  hs->band_index = spec->band_index;
}

void
fw_spectrum_panel_x_axis (const FwMatrix *m, const FwSpectrumSpec *spec, double x_left,
                          double x_right, FwAxis *axis, FwTickStyle *style)
{
  FwHeatmapSpec hs;

  heatmap_spec_from (spec, &hs);
  fw_heatmap_bin_axis (m, &hs, x_left, x_right, axis, style);
}

void
fw_spectrum_panel_y_range (const FwMatrix *m, const double *values, bool values_db, double *lo,
                           double *hi)
{
  double vmin = HUGE_VAL, vmax = -HUGE_VAL;
  FwNiceLabels nl;

  for (size_t k = 0; k < m->n_bins; k++)
    if (isfinite (values[k]))
      {
        vmin = MIN (vmin, values[k]);
        vmax = MAX (vmax, values[k]);
      }
  if (!(vmax >= vmin))
    {
      *lo = 0;
      *hi = 1;
      return;
    }
  if (values_db)
    vmin = MAX (vmin, vmax - FW_RANGE_DB_SPAN);
  fw_nice_loose_labels (vmin, vmax, 5, &nl);
  *lo = nl.graph_min;
  *hi = nl.graph_max;
}

/* Pixel position of bin k along an axis made by fw_heatmap_bin_axis. */
static double
bin_pixel (const FwMatrix *m, const FwAxis *axis, size_t k)
{
  double u = m->bin_kind == FW_BIN_AXIS_HZ ? fw_axis_forward (axis, m->bin_value[k])
                                           : (double) k;
  if (axis->u1 == axis->u0)
    return axis->p0;
  return axis->p0 + (u - axis->u0) / (axis->u1 - axis->u0) * (axis->p1 - axis->p0);
}

void
fw_spectrum_panel_draw (cairo_t *cr, const FwTheme *theme, const FwMatrix *m,
                        const double *values, const FwAxis *x_axis, const FwAxis *y_axis,
                        double x, double y, double w, double h)
{
  gboolean pen_down = FALSE;
  double ylo = MIN (y_axis->v0, y_axis->v1);

  g_return_if_fail (cr != NULL && m != NULL);
  if (values == NULL)
    return;

  cairo_save (cr);
  cairo_rectangle (cr, x, y, w, h);
  cairo_clip (cr);
  cairo_set_line_width (cr, theme->trace_width);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  fw_theme_set_source (cr, &theme->trace);
  for (size_t k = 0; k < m->n_bins; k++)
    {
      double px = bin_pixel (m, x_axis, k);
      double v = values[k];
      double py;
      if (!isfinite (px) || isnan (v))
        {
          pen_down = FALSE;
          continue;
        }
      if (!isfinite (v) || v < ylo)
        v = ylo; /* -inf dB and values below the axis sit on the floor */
      py = fw_axis_value_to_pixel (y_axis, v);
      if (pen_down)
        cairo_line_to (cr, px, py);
      else
        cairo_move_to (cr, px, py);
      pen_down = TRUE;
    }
  cairo_stroke (cr);
  cairo_restore (cr);
}
