/* fw-render-waveform.c: min/max envelope and RMS band (see fw-render-waveform.h). */
#include "fw-config.h"

#include "fw-render-waveform.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

/* AES17: a full-scale sine reads 0 dBFS, i.e. RMS in dB re 1.0 plus 10 log10(2). */
#define AES17_OFFSET_DB 3.0102999566398120

const char *
fw_amplitude_scale_name (FwAmplitudeScale scale)
{
  return scale == FW_AMPLITUDE_DBFS ? "dbfs" : "linear";
}

gboolean
fw_amplitude_scale_from_name (const char *name, FwAmplitudeScale *out)
{
  if (g_strcmp0 (name, "linear") == 0)
    *out = FW_AMPLITUDE_LINEAR;
  else if (g_strcmp0 (name, "dbfs") == 0)
    *out = FW_AMPLITUDE_DBFS;
  else
    return FALSE;
  return TRUE;
}

void
fw_waveform_spec_init (FwWaveformSpec *spec, double duration)
{
  g_return_if_fail (spec != NULL);
  memset (spec, 0, sizeof *spec);
  spec->amplitude = FW_AMPLITUDE_LINEAR;
  spec->t0 = 0;
  spec->t1 = duration > 0 ? duration : 1.0;
  spec->linear_limit = 1.0;
  spec->dbfs_floor = -60.0;
  spec->show_rms = true;
  spec->rms_window = 0.02;
}

static double
interp (const float *x, size_t n, double pos)
{
  size_t i;
  double f;

  if (pos <= 0)
    return x[0];
  if (pos >= (double) (n - 1))
    return x[n - 1];
  i = (size_t) floor (pos);
  f = pos - (double) i;
  return x[i] + f * (x[i + 1] - x[i]);
}

FwWaveformEnvelope *
fw_waveform_envelope_new (const float *samples, size_t n_samples, double sample_rate, double t0,
                          double t1, int n_columns, double rms_window)
{
  FwWaveformEnvelope *env;
  double span = t1 - t0;
  double last = (double) n_samples - 1;

  g_return_val_if_fail (samples != NULL || n_samples == 0, NULL);
  if (n_columns < 1 || !(span > 0) || !(sample_rate > 0))
    return NULL;

  env = g_new0 (FwWaveformEnvelope, 1);
  env->n_columns = n_columns;
  env->t0 = t0;
  env->t1 = t1;
  env->min = g_new (float, n_columns);
  env->max = g_new (float, n_columns);
  env->rms = g_new (float, n_columns);

  for (int c = 0; c < n_columns; c++)
    {
      double sa = (t0 + span * c / n_columns) * sample_rate;
      double sb = (t0 + span * (c + 1) / n_columns) * sample_rate;
      double lo, hi, half, sc, sum = 0;
      size_t i0, i1, count = 0;

      if (n_samples == 0 || sb < 0 || sa > last)
        {
          env->min[c] = env->max[c] = env->rms[c] = NAN;
          continue;
        }
      sa = MAX (sa, 0.0);
      sb = MIN (sb, last);
      lo = hi = interp (samples, n_samples, sa);
      {
        double vb = interp (samples, n_samples, sb);
        lo = MIN (lo, vb);
        hi = MAX (hi, vb);
      }
      i0 = (size_t) ceil (sa);
      i1 = (size_t) floor (sb);
      for (size_t i = i0; i <= i1 && i < n_samples; i++)
        {
          lo = MIN (lo, samples[i]);
          hi = MAX (hi, samples[i]);
        }
      env->min[c] = (float) lo;
      env->max[c] = (float) hi;

      /* RMS over max(column span, rms_window) centred on the column */
      sc = (sa + sb) / 2;
      half = MAX (sb - sa, rms_window * sample_rate) / 2;
      i0 = (size_t) MAX (0.0, ceil (sc - half));
      i1 = (size_t) MIN (last, floor (sc + half));
      for (size_t i = i0; i <= i1 && i < n_samples; i++)
        {
          sum += (double) samples[i] * samples[i];
          count++;
        }
      env->rms[c] = count > 0 ? (float) sqrt (sum / (double) count)
                              : (float) fabs (interp (samples, n_samples, sc));
    }
  return env;
}

void
fw_waveform_envelope_free (FwWaveformEnvelope *env)
{
  if (env == NULL)
    return;
  g_free (env->min);
  g_free (env->max);
  g_free (env->rms);
  g_free (env);
}

void
fw_waveform_axis (const FwWaveformSpec *spec, double y_bottom, double y_top, FwAxis *axis)
{
  if (spec->amplitude == FW_AMPLITUDE_DBFS)
    fw_axis_init (axis, FW_AXIS_LINEAR, spec->dbfs_floor, 0.0, y_bottom, y_top);
  else
    fw_axis_init (axis, FW_AXIS_LINEAR, -spec->linear_limit, spec->linear_limit, y_bottom,
                  y_top);
}

const char *
fw_waveform_axis_title (const FwWaveformSpec *spec)
{
  return spec->amplitude == FW_AMPLITUDE_DBFS ? _("Level (dBFS)") : _("Amplitude");
}

static double
to_dbfs (double a, double floor_db)
{
  double db = a > 0 ? 20.0 * log10 (a) : -HUGE_VAL;
  return MAX (db, floor_db);
}

/* Appends a stair-step band (top[c] above bottom[c] per column) for columns [c0, c1). */
static void
band_path (cairo_t *cr, const double *top, const double *bottom, int c0, int c1, double x,
           double w, int n)
{
  for (int c = c0; c < c1; c++)
    {
      double xa = x + w * c / n, xb = x + w * (c + 1) / n;
      if (c == c0)
        cairo_move_to (cr, xa, top[c]);
      else
        cairo_line_to (cr, xa, top[c]);
      cairo_line_to (cr, xb, top[c]);
    }
  for (int c = c1 - 1; c >= c0; c--)
    {
      double xa = x + w * c / n, xb = x + w * (c + 1) / n;
      cairo_line_to (cr, xb, bottom[c]);
      cairo_line_to (cr, xa, bottom[c]);
    }
  cairo_close_path (cr);
}

static void
fill_bands (cairo_t *cr, const double *top, const double *bottom, const gboolean *valid,
            double x, double w, int n)
{
  int c = 0;
  while (c < n)
    {
      int c1;
      if (!valid[c])
        {
          c++;
          continue;
        }
      c1 = c;
      while (c1 < n && valid[c1])
        c1++;
      band_path (cr, top, bottom, c, c1, x, w, n);
      c = c1;
    }
  cairo_fill (cr);
}

void
fw_waveform_draw (cairo_t *cr, const FwTheme *theme, const FwWaveformSpec *spec,
                  const FwWaveformEnvelope *env, double x, double y, double w, double h)
{
  int n;
  FwAxis axis;
  double *top, *bottom;
  gboolean *valid;
  double min_thick;

  g_return_if_fail (cr != NULL && theme != NULL && spec != NULL);
  if (env == NULL || env->n_columns < 1 || w <= 0 || h <= 0)
    return;
  n = env->n_columns;
  fw_waveform_axis (spec, y + h, y, &axis);
  top = g_new (double, n);
  bottom = g_new (double, n);
  valid = g_new (gboolean, n);
  min_thick = MAX (theme->trace_width, w / n); /* at least a line, and a column wide */

  cairo_save (cr);
  cairo_rectangle (cr, x, y, w, h);
  cairo_clip (cr);

  /* envelope */
  for (int c = 0; c < n; c++)
    {
      valid[c] = isfinite (env->min[c]) && isfinite (env->max[c]);
      if (!valid[c])
        continue;
      if (spec->amplitude == FW_AMPLITUDE_DBFS)
        {
          double peak = MAX (fabs (env->min[c]), fabs (env->max[c]));
          top[c] = fw_axis_value_to_pixel (&axis, to_dbfs (peak, spec->dbfs_floor));
          bottom[c] = y + h;
        }
      else
        {
          top[c] = fw_axis_value_to_pixel (&axis, env->max[c]);
          bottom[c] = fw_axis_value_to_pixel (&axis, env->min[c]);
        }
      if (bottom[c] - top[c] < min_thick)
        {
          double mid = (top[c] + bottom[c]) / 2;
          if (spec->amplitude == FW_AMPLITUDE_DBFS)
            top[c] = bottom[c] - min_thick;
          else
            {
              top[c] = mid - min_thick / 2;
              bottom[c] = mid + min_thick / 2;
            }
        }
    }
  fw_theme_set_source (cr, &theme->waveform);
  fill_bands (cr, top, bottom, valid, x, w, n);

  /* RMS band */
  if (spec->show_rms)
    {
      for (int c = 0; c < n; c++)
        {
          valid[c] = valid[c] && isfinite (env->rms[c]);
          if (!valid[c])
            continue;
          if (spec->amplitude == FW_AMPLITUDE_DBFS)
            {
              double level = env->rms[c] > 0
                               ? 20.0 * log10 (env->rms[c]) + AES17_OFFSET_DB
                               : spec->dbfs_floor;
              /* stays inside the peak envelope (a sine's RMS level equals its peak level) */
              double t = fw_axis_value_to_pixel (&axis, MAX (level, spec->dbfs_floor));
              top[c] = MAX (t, top[c]);
              bottom[c] = y + h;
            }
          else
            {
              double r = env->rms[c];
              double t = fw_axis_value_to_pixel (&axis, MIN (r, env->max[c]));
              double b = fw_axis_value_to_pixel (&axis, MAX (-r, env->min[c]));
              top[c] = t;
              bottom[c] = b;
            }
        }
      fw_theme_set_source (cr, &theme->waveform_rms);
      fill_bands (cr, top, bottom, valid, x, w, n);
    }
  cairo_restore (cr);

  g_free (top);
  g_free (bottom);
  g_free (valid);
}
