/* test-waveform.c: min/max envelopes, a single-sample spike in a long clip, dBFS levels. */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib.h>

#include "fw-test-render.h"

#include "fw-render-waveform.h"

static gboolean
is_dark (uint32_t px)
{
  /* the light theme's envelope colour is dark slate blue; background white */
  int r = (px >> 16) & 0xff, g = (px >> 8) & 0xff, b = px & 0xff;
  return r + g + b < 3 * 128;
}

static void
test_spike_ten_minutes (void)
{
  /* 10 minutes at 16 kHz of quiet noise (amplitude 0.01, fixed seed) with one sample at 0.9:
   * drawn 600 pixels wide (16000 samples a column) the spike's column must reach near the top
   * of the row; every other column stays near the middle. */
  const double rate = 16000.0;
  const size_t n = (size_t) (600 * rate);
  const size_t spike = 4567891; /* 285.49 s -> column 285 */
  float *x = g_new (float, n);
  GRand *rand = g_rand_new_with_seed (7);
  FwWaveformSpec spec;
  FwTheme theme;
  g_autoptr (FwWaveformEnvelope) env = NULL;
  cairo_surface_t *surface;
  cairo_t *cr;
  const int width = 600, height = 100;
  int spike_col = -1, tall_cols = 0;
  const uint8_t *data;
  int stride;

  for (size_t i = 0; i < n; i++)
    x[i] = (float) (0.01 * (g_rand_double (rand) * 2.0 - 1.0));
  x[spike] = 0.9f;

  fw_theme_init (&theme, FW_THEME_LIGHT);
  fw_waveform_spec_init (&spec, (double) n / rate);
  env = fw_waveform_envelope_new (x, n, rate, 0.0, (double) n / rate, width, spec.rms_window);
  g_assert_nonnull (env);
  g_assert_cmpfloat_with_epsilon (env->max[285], 0.9, 1e-6);

  surface = cairo_image_surface_create (CAIRO_FORMAT_RGB24, width, height);
  cr = cairo_create (surface);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  fw_waveform_draw (cr, &theme, &spec, env, 0, 0, width, height);
  cairo_destroy (cr);
  cairo_surface_flush (surface);

  /* row 10 is amplitude 0.8 on the +-1 axis (y = 50 - 0.8 * 50) */
  data = cairo_image_surface_get_data (surface);
  stride = cairo_image_surface_get_stride (surface);
  for (int c = 0; c < width; c++)
    if (is_dark (((const uint32_t *) (data + 10 * stride))[c]))
      {
        spike_col = c;
        tall_cols++;
      }
  g_assert_cmpint (tall_cols, ==, 1);
  g_assert_cmpint (spike_col, ==, (int) (spike / rate * width / 600.0));
  /* the quiet part still shows as a line at the middle: at least one pixel-row's worth of ink
   * spread over rows 49 and 50 (antialiased), i.e. their summed darkening reaches one full
   * envelope pixel's */
  {
    uint32_t a = ((const uint32_t *) (data + 49 * stride))[100];
    uint32_t b = ((const uint32_t *) (data + 50 * stride))[100];
    int ink = (255 - (int) ((a >> 8) & 0xff)) + (255 - (int) ((b >> 8) & 0xff));
    int full = 255 - (int) (theme.waveform.g * 255.0 + 0.5);
    g_assert_cmpint (ink, >=, full * 9 / 10);
  }

  cairo_surface_destroy (surface);
  g_rand_free (rand);
  g_free (x);
}

static void
test_envelope_values (void)
{
  /* a 100 Hz sine at 8 kHz over 1 s in 10 columns: each column (0.1 s = 10 periods) has
   * min -1 and max +1 within the sampling of the peak (the sine is sampled at 80 points a
   * period; the largest sample is cos(pi / 80) = 0.99923 or better of the peak), and RMS
   * 1 / sqrt(2) (a sine's RMS, textbook) */
  const double rate = 8000.0;
  float x[8000];
  g_autoptr (FwWaveformEnvelope) env = NULL;

  for (int i = 0; i < 8000; i++)
    x[i] = (float) sin (2 * G_PI * 100.0 * i / rate + 0.3);
  env = fw_waveform_envelope_new (x, 8000, rate, 0.0, 1.0, 10, 0.0);
  for (int c = 0; c < 10; c++)
    {
      g_assert_cmpfloat (env->max[c], >=, 0.9992);
      g_assert_cmpfloat (env->min[c], <=, -0.9992);
      g_assert_cmpfloat_with_epsilon (env->rms[c], 1.0 / sqrt (2.0), 2e-3);
    }

  /* zoomed in beyond one sample per column: columns interpolate between samples */
  fw_waveform_envelope_free (g_steal_pointer (&env));
  x[100] = 0.0f;
  x[101] = 1.0f;
  env = fw_waveform_envelope_new (x, 8000, rate, 100.0 / rate, 101.0 / rate, 4, 0.0);
  g_assert_cmpfloat_with_epsilon (env->min[0], 0.0, 1e-6);
  g_assert_cmpfloat_with_epsilon (env->max[0], 0.25, 1e-6);
  g_assert_cmpfloat_with_epsilon (env->max[3], 1.0, 1e-6);

  /* columns outside the signal are empty (NaN) */
  fw_waveform_envelope_free (g_steal_pointer (&env));
  env = fw_waveform_envelope_new (x, 8000, rate, 0.5, 1.5, 10, 0.0);
  g_assert_true (isfinite (env->max[0]));
  g_assert_true (isnan (env->max[9]));
}

static void
test_dbfs_axis (void)
{
  /* dBFS: a full-scale sine's RMS band reaches 0 dBFS (AES17: RMS in dB re 1.0 + 3.01 dB),
   * a -20 dBFS-peak sine's envelope reaches -20 on the axis */
  const double rate = 8000.0;
  float x[8000];
  FwWaveformSpec spec;
  FwTheme theme;
  FwAxis axis;
  g_autoptr (FwWaveformEnvelope) env = NULL;
  cairo_surface_t *surface;
  cairo_t *cr;
  const uint8_t *data;
  int stride, top = -1;

  for (int i = 0; i < 8000; i++)
    x[i] = (float) (0.1 * sin (2 * G_PI * 125.0 * i / rate));
  fw_theme_init (&theme, FW_THEME_LIGHT);
  fw_waveform_spec_init (&spec, 1.0);
  spec.amplitude = FW_AMPLITUDE_DBFS;
  spec.show_rms = false;
  env = fw_waveform_envelope_new (x, 8000, rate, 0.0, 1.0, 50, 0.02);
  surface = cairo_image_surface_create (CAIRO_FORMAT_RGB24, 50, 120);
  cr = cairo_create (surface);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  fw_waveform_draw (cr, &theme, &spec, env, 0, 0, 50, 120);
  cairo_destroy (cr);
  cairo_surface_flush (surface);
  data = cairo_image_surface_get_data (surface);
  stride = cairo_image_surface_get_stride (surface);
  for (int y = 0; y < 120 && top < 0; y++)
    if (is_dark (((const uint32_t *) (data + y * stride))[25]))
      top = y;
  /* axis -60 .. 0 dBFS over 120 px: -20 dBFS at y = 40 */
  fw_waveform_axis (&spec, 120, 0, &axis);
  g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&axis, -20.0), 40.0, 1e-9);
  g_assert_cmpint (top, >=, 39);
  g_assert_cmpint (top, <=, 41);
  cairo_surface_destroy (surface);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/render/waveform/spike-in-ten-minutes", test_spike_ten_minutes);
  g_test_add_func ("/fw/render/waveform/envelope-values", test_envelope_values);
  g_test_add_func ("/fw/render/waveform/dbfs-axis", test_dbfs_axis);
  return g_test_run ();
}
