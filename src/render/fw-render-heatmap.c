/* fw-render-heatmap.c: matrix -> one raster image (see fw-render-heatmap.h). */
#include "fw-config.h"

#include "fw-render-heatmap.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-render-error.h"

#define MAX_IMAGE_SIDE 16384

FwAggregate
fw_aggregate_for_stage (FwStage stage)
{
  switch (stage)
    {
    case FW_STAGE_SPECTRUM:
    case FW_STAGE_DB:
    case FW_STAGE_MEL:
    case FW_STAGE_MEL_DB:
      return FW_AGGREGATE_MAX;
    default:
      return FW_AGGREGATE_MEAN;
    }
}

static double
frame_spacing (const FwMatrix *m)
{
  if (m->hop_seconds > 0)
    return m->hop_seconds;
  if (m->n_frames > 1 && m->frame_times)
    return (m->frame_times[m->n_frames - 1] - m->frame_times[0]) / (double) (m->n_frames - 1);
  return 1.0;
}

void
fw_heatmap_spec_init (FwHeatmapSpec *spec, const FwMatrix *m, FwStage stage)
{
  double hop;

  g_return_if_fail (spec != NULL && m != NULL);
  memset (spec, 0, sizeof *spec);
  spec->scale = fw_colour_scale_default (fw_colour_scale_kind_for_stage (stage));
  if (!fw_value_range_auto (m, fw_range_rule_for_stage (stage), 0, 0, &spec->range))
    {
      spec->range.lo = 0;
      spec->range.hi = 1;
    }
  spec->aggregate = fw_aggregate_for_stage (stage);
  hop = frame_spacing (m);
  if (m->n_frames > 0 && m->frame_times)
    {
      spec->t0 = m->frame_times[0] - hop / 2;
      spec->t1 = m->frame_times[m->n_frames - 1] + hop / 2;
    }
  else
    {
      spec->t0 = 0;
      spec->t1 = 1;
    }
  spec->freq_scale = FW_AXIS_LINEAR;
  spec->mel_scale = FW_MEL_SCALE_SLANEY;
  spec->f_lo = 0;
  spec->f_hi = 0;
  spec->band_index = false;
}

static double
bin_low (const FwMatrix *m, size_t k)
{
  double df;
  if (m->bin_low)
    return m->bin_low[k];
  df = m->n_bins > 1 ? m->bin_value[1] - m->bin_value[0] : 1.0;
  return m->bin_value[k] - df / 2;
}

static double
bin_high (const FwMatrix *m, size_t k)
{
  double df;
  if (m->bin_high)
    return m->bin_high[k];
  df = m->n_bins > 1 ? m->bin_value[1] - m->bin_value[0] : 1.0;
  return m->bin_value[k] + df / 2;
}

void
fw_heatmap_bin_axis (const FwMatrix *m, const FwHeatmapSpec *spec, double y_bottom,
                     double y_top, FwAxis *axis, FwTickStyle *style)
{
  FwTickStyle st = FW_TICK_NUMBER;
  double n = (double) m->n_bins;

  switch (m->bin_kind)
    {
    case FW_BIN_AXIS_HZ:
      {
        double lo = MAX (spec->f_lo, 0.0);
        double hi = spec->f_hi > 0 ? spec->f_hi : m->bin_value[m->n_bins - 1];
        if (spec->freq_scale == FW_AXIS_LOG)
          {
            double first = m->n_bins > 1 ? m->bin_value[1] : 1.0;
            lo = MAX (lo, first);
            if (!(hi > lo))
              hi = lo * 10;
            fw_axis_init (axis, FW_AXIS_LOG, lo, hi, y_bottom, y_top);
          }
        else if (spec->freq_scale == FW_AXIS_MEL)
          fw_axis_init_mel (axis, spec->mel_scale, lo, hi > lo ? hi : lo + 1, y_bottom, y_top);
        else
          fw_axis_init (axis, FW_AXIS_LINEAR, lo, hi > lo ? hi : lo + 1, y_bottom, y_top);
        st = FW_TICK_FREQUENCY;
      }
      break;
    case FW_BIN_AXIS_MEL_BAND:
      if (spec->band_index || m->n_bins < 2)
        {
          fw_axis_init (axis, FW_AXIS_LINEAR, -0.5, n - 0.5, y_bottom, y_top);
          st = FW_TICK_INTEGER;
        }
      else
        {
          fw_axis_init_bands (axis, m->bin_value, m->n_bins, -0.5, n - 0.5, y_bottom, y_top);
          st = FW_TICK_FREQUENCY;
        }
      break;
    case FW_BIN_AXIS_COEFFICIENT:
      fw_axis_init (axis, FW_AXIS_LINEAR, -0.5, n - 0.5, y_bottom, y_top);
      st = FW_TICK_INTEGER;
      break;
    case FW_BIN_AXIS_SCALAR:
    default:
      fw_axis_init (axis, FW_AXIS_LINEAR, -0.5, n - 0.5, y_bottom, y_top);
      st = FW_TICK_INTEGER;
      break;
    }
  if (style)
    *style = st;
}

/* Position of bin k (centre and cell edges) in the axis' internal coordinate. */
static void
bin_positions (const FwMatrix *m, const FwAxis *axis, double *cen, double *lo, double *hi)
{
  for (size_t k = 0; k < m->n_bins; k++)
    {
      if (m->bin_kind == FW_BIN_AXIS_HZ)
        {
          cen[k] = fw_axis_forward (axis, m->bin_value[k]);
          lo[k] = fw_axis_forward (axis, MAX (bin_low (m, k), 0.0));
          hi[k] = fw_axis_forward (axis, bin_high (m, k));
        }
      else
        {
          cen[k] = (double) k;
          lo[k] = (double) k - 0.5;
          hi[k] = (double) k + 0.5;
        }
    }
}

/* First index i in sorted v[0..n) with v[i] >= x. */
static size_t
lower_bound (const double *v, size_t n, double x)
{
  size_t lo = 0, hi = n;
  while (lo < hi)
    {
      size_t mid = (lo + hi) / 2;
      if (v[mid] < x)
        lo = mid + 1;
      else
        hi = mid;
    }
  return lo;
}

/* Cells [start, end) whose centre lies in [a, b); or the one cell containing c; or none. */
static void
cover (const double *cen, const double *clo, const double *chi, size_t n, double a, double b,
       double c, size_t *start, size_t *end)
{
  size_t i = lower_bound (cen, n, a);
  size_t j = i;

  while (j < n && cen[j] < b)
    j++;
  if (j > i)
    {
      *start = i;
      *end = j;
      return;
    }
  /* no centre inside: the cell under c, if any (check the neighbours of the insertion point) */
  for (size_t k = i > 0 ? i - 1 : 0; k < MIN (i + 1, n); k++)
    if (c >= clo[k] && c < chi[k])
      {
        *start = k;
        *end = k + 1;
        return;
      }
  *start = *end = 0;
}

cairo_surface_t *
fw_heatmap_render (const FwMatrix *m, const FwHeatmapSpec *spec, int width, int height,
                   GError **error)
{
  cairo_surface_t *surface;
  FwAxis axis;
  const uint8_t *lut;
  double *cen = NULL, *clo = NULL, *chi = NULL, *tlo = NULL, *thi = NULL;
  size_t *col_start = NULL, *col_end = NULL, *row_start = NULL, *row_end = NULL;
  float *colbuf = NULL;
  size_t kmin = G_MAXSIZE, kmax = 0;
  double hop, span;
  unsigned char *data;
  int stride;

  g_return_val_if_fail (m != NULL && spec != NULL, NULL);

  if (width <= 0 || height <= 0 || width > MAX_IMAGE_SIDE || height > MAX_IMAGE_SIDE)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Heatmap size %d x %d pixels: each side must be 1 to %d"), width, height,
                   MAX_IMAGE_SIDE);
      return NULL;
    }
  if (!(spec->t1 > spec->t0) || !(spec->range.hi > spec->range.lo) || spec->scale == NULL)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Heatmap: the time range and value range must each have end > start"));
      return NULL;
    }
  if (m->n_frames == 0 || m->n_bins == 0)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Heatmap: the matrix is empty (%zu frames x %zu bins)"), m->n_frames,
                   m->n_bins);
      return NULL;
    }

  surface = cairo_image_surface_create (CAIRO_FORMAT_ARGB32, width, height);
  if (cairo_surface_status (surface) != CAIRO_STATUS_SUCCESS)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_CAIRO, _("Heatmap: %s"),
                   cairo_status_to_string (cairo_surface_status (surface)));
      cairo_surface_destroy (surface);
      return NULL;
    }
  lut = fw_colour_scale_get_lut (spec->scale);

  /* Time: frame cells centred on their times. */
  hop = frame_spacing (m);
  tlo = g_new (double, m->n_frames);
  thi = g_new (double, m->n_frames);
  for (size_t t = 0; t < m->n_frames; t++)
    {
      tlo[t] = m->frame_times[t] - hop / 2;
      thi[t] = m->frame_times[t] + hop / 2;
    }
  col_start = g_new (size_t, width);
  col_end = g_new (size_t, width);
  span = spec->t1 - spec->t0;
  for (int x = 0; x < width; x++)
    {
      double a = spec->t0 + span * x / width;
      double b = spec->t0 + span * (x + 1) / width;
      cover (m->frame_times, tlo, thi, m->n_frames, a, b, (a + b) / 2, &col_start[x],
             &col_end[x]);
    }

  /* Bins: through the axis' internal coordinate (linear, log10, mel or index). */
  fw_heatmap_bin_axis (m, spec, (double) height, 0.0, &axis, NULL);
  cen = g_new (double, m->n_bins);
  clo = g_new (double, m->n_bins);
  chi = g_new (double, m->n_bins);
  bin_positions (m, &axis, cen, clo, chi);
  row_start = g_new (size_t, height);
  row_end = g_new (size_t, height);
  for (int y = 0; y < height; y++)
    {
      /* pixel row y spans u from its bottom edge (y + 1) to its top edge (y) */
      double ua = axis.u0 + ((double) (y + 1) - axis.p0) / (axis.p1 - axis.p0) * (axis.u1 - axis.u0);
      double ub = axis.u0 + ((double) y - axis.p0) / (axis.p1 - axis.p0) * (axis.u1 - axis.u0);
      cover (cen, clo, chi, m->n_bins, ua, ub, (ua + ub) / 2, &row_start[y], &row_end[y]);
      if (row_end[y] > row_start[y])
        {
          kmin = MIN (kmin, row_start[y]);
          kmax = MAX (kmax, row_end[y]);
        }
    }

  cairo_surface_flush (surface);
  data = cairo_image_surface_get_data (surface);
  stride = cairo_image_surface_get_stride (surface);
  memset (data, 0, (size_t) stride * (size_t) height);

  if (kmax > kmin)
    {
      size_t nk = kmax - kmin;
      double *acc;
      size_t *count;

      /* Pass 1: aggregate over the frames of each column (frame-major reads). */
      colbuf = g_new (float, (size_t) width * nk);
      acc = g_new (double, nk);
      count = g_new (size_t, nk);
      for (int x = 0; x < width; x++)
        {
          float *out = colbuf + (size_t) x * nk;
          for (size_t k = 0; k < nk; k++)
            {
              acc[k] = spec->aggregate == FW_AGGREGATE_MAX ? -HUGE_VAL : 0.0;
              count[k] = 0;
            }
          for (size_t t = col_start[x]; t < col_end[x]; t++)
            {
              const float *src = m->data + t * m->n_bins + kmin;
              for (size_t k = 0; k < nk; k++)
                {
                  float v = src[k];
                  if (!isfinite (v))
                    continue;
                  if (spec->aggregate == FW_AGGREGATE_MAX)
                    acc[k] = MAX (acc[k], (double) v);
                  else
                    acc[k] += v;
                  count[k]++;
                }
            }
          for (size_t k = 0; k < nk; k++)
            out[k] = count[k] == 0 ? NAN
                     : spec->aggregate == FW_AGGREGATE_MAX ? (float) acc[k]
                                                           : (float) (acc[k] / (double) count[k]);
        }
      g_free (acc);
      g_free (count);

      /* Pass 2: aggregate over the bins of each pixel row, then colour. */
      for (int y = 0; y < height; y++)
        {
          uint32_t *row = (uint32_t *) (data + (size_t) y * stride);
          if (row_end[y] == row_start[y])
            continue;
          for (int x = 0; x < width; x++)
            {
              const float *col = colbuf + (size_t) x * nk;
              double a = spec->aggregate == FW_AGGREGATE_MAX ? -HUGE_VAL : 0.0;
              size_t c = 0;
              for (size_t k = row_start[y]; k < row_end[y]; k++)
                {
                  float v = col[k - kmin];
                  if (!isfinite (v))
                    continue;
                  if (spec->aggregate == FW_AGGREGATE_MAX)
                    a = MAX (a, (double) v);
                  else
                    a += v;
                  c++;
                }
              if (c == 0)
                continue;
              if (spec->aggregate == FW_AGGREGATE_MEAN)
                a /= (double) c;
              row[x] = fw_colour_scale_pixel (lut, fw_value_range_position (&spec->range, a));
            }
        }
    }
  cairo_surface_mark_dirty (surface);

  g_free (colbuf);
  g_free (cen);
  g_free (clo);
  g_free (chi);
  g_free (tlo);
  g_free (thi);
  g_free (col_start);
  g_free (col_end);
  g_free (row_start);
  g_free (row_end);
  return surface;
}

void
fw_heatmap_paint (cairo_t *cr, cairo_surface_t *image, double x, double y, double w, double h)
{
  int iw = cairo_image_surface_get_width (image);
  int ih = cairo_image_surface_get_height (image);

  if (iw <= 0 || ih <= 0 || w <= 0 || h <= 0)
    return;
  cairo_save (cr);
  cairo_rectangle (cr, x, y, w, h);
  cairo_clip (cr);
  cairo_translate (cr, x, y);
  cairo_scale (cr, w / iw, h / ih);
  cairo_set_source_surface (cr, image, 0, 0);
  cairo_pattern_set_filter (cairo_get_source (cr), CAIRO_FILTER_NEAREST);
  cairo_paint (cr);
  cairo_restore (cr);
}
