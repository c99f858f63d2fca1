/* test-stft.c: framing, padding, windowing, the spectrum stage and the dB conventions.
 *
 * Sources: check-values.md §5 (dB conventions, STFT bin values NUM from numpy rfft), §6
 * (Parseval), §7 (pre-emphasis response, NUM), §8 (frame count, resolution, PUB✓/CP/NUM),
 * numpy.pad documentation examples (PUB✓) and the written conventions of issue 2. */
#include "fw-analysis-private.h"
#include "fw-fft.h"
#include "fw-test-dsp.h"

/* One frame of 2048 samples, uncentred, magnitude spectrum, Hann in the given symmetry. */
static FwMatrix *
one_frame_magnitude (const float *x, FwWindowSymmetry sym)
{
  FwAnalysisConfig cfg = fw_test_config ();
  cfg.centered = false;
  cfg.spectrum = FW_SPECTRUM_MAGNITUDE;
  cfg.window_symmetry = sym;
  return fw_test_run (&cfg, x, 2048, FW_STAGE_SPECTRUM, 1);
}

/* check-values.md §5.1 NUM (numpy rfft, float64): N = 2048, sr = 22050, A = 1 cosine,
 * periodic Hann. On-bin (bin 93, 1001.2939453125 Hz): |X[93]| = 512, |X[92]| = |X[94]| = 256,
 * other bins < 5e-13. Off-bin (1000 Hz): bins 91..95 = 12.614369, 302.268655, 507.248430,
 * 210.494526, 8.107704. Half-bin (1006.6772461 Hz): |X[93]| = 434.599123.
 * Tolerances: the doc asks 1e-9 relative on-bin in double; our spectrum is float32, so on-bin
 * 1e-6 relative, elsewhere 1e-6 relative + 2e-4 absolute (float FFT rounding of a 2048-point
 * transform of unit-amplitude data is ~1e-4 absolute). */
static void
test_hann_bin_periodic (void)
{
  float x[2048];
  FwMatrix *m;

  fw_test_fill_bin_cosine (x, 2048, 1.0, 93, 2048);
  m = one_frame_magnitude (x, FW_WINDOW_PERIODIC);
  g_assert_cmpuint (m->n_frames, ==, 1);
  g_assert_cmpuint (m->n_bins, ==, 1025);
  fw_assert_close (fw_matrix_get (m, 0, 93), 512.0, 0, 1e-6);
  fw_assert_close (fw_matrix_get (m, 0, 92), 256.0, 0, 1e-6);
  fw_assert_close (fw_matrix_get (m, 0, 94), 256.0, 0, 1e-6);
  for (size_t k = 0; k < 1025; k++)
    if (k < 92 || k > 94)
      g_assert_cmpfloat (fw_matrix_get (m, 0, k), <, 2e-4);
  /* Amplitude-corrected (x 2 / sum w, sum w = 1024) reads 0.000 dB re A = 1 (§5.1). */
  fw_assert_close (20.0 * log10 (2.0 * fw_matrix_get (m, 0, 93) / 1024.0), 0.0, 1e-5, 0);
  /* §5.1 density scaling, on-bin: 2|X|^2 / (sr sum w^2) = 3.09599395e-2 per Hz at bin 93
   * (sum w^2 = 768); summed over the bins times df it gives A^2/2 = 0.5. The periodogram
   * "spectrum" scaling 2|X|^2/(sum w)^2 sums to (A^2/2) ENBW = 0.75. */
  {
    double density_sum = 0.0, spectrum_sum = 0.0;
    double x93 = fw_matrix_get (m, 0, 93);
    fw_assert_close (2.0 * x93 * x93 / (22050.0 * 768.0), 3.09599395e-2, 5e-11, 1e-6);
    for (size_t k = 0; k < 1025; k++)
      {
        double p = (double) fw_matrix_get (m, 0, k) * fw_matrix_get (m, 0, k);
        density_sum += 2.0 * p / (22050.0 * 768.0) * (22050.0 / 2048.0);
        spectrum_sum += 2.0 * p / (1024.0 * 1024.0);
      }
    fw_assert_close (density_sum, 0.5, 0, 1e-6);
    fw_assert_close (spectrum_sum, 0.75, 0, 1e-6);
  }
  fw_matrix_unref (m);

  fw_test_fill_cosine (x, 2048, 1.0, 1000.0, 22050.0, 0.0);
  m = one_frame_magnitude (x, FW_WINDOW_PERIODIC);
  {
    const double off[5] = { 12.614369, 302.268655, 507.248430, 210.494526, 8.107704 };
    for (int i = 0; i < 5; i++)
      fw_assert_close (fw_matrix_get (m, 0, 91 + i), off[i], 2e-4, 1e-6);
    /* §5.1: amplitude-corrected -0.0810 dB at 1 kHz. */
    fw_assert_close (20.0 * log10 (2.0 * fw_matrix_get (m, 0, 93) / 1024.0), -0.0810, 5e-5, 0);
  }
  fw_matrix_unref (m);

  fw_test_fill_cosine (x, 2048, 1.0, 93.5 * 22050.0 / 2048.0, 22050.0, 0.0);
  m = one_frame_magnitude (x, FW_WINDOW_PERIODIC);
  fw_assert_close (fw_matrix_get (m, 0, 93), 434.599123, 2e-4, 1e-6);
  /* §5.1: half-bin amplitude-corrected -1.4236 dB, the Hann scalloping loss. */
  fw_assert_close (20.0 * log10 (2.0 * fw_matrix_get (m, 0, 93) / 1024.0), -1.4236, 5e-5, 0);
  fw_matrix_unref (m);
}

/* check-values.md §5.1 NUM, symmetric Hann column: on-bin 511.750007, off-bin 507.005371,
 * half-bin 434.457603; on-bin neighbours 256.0624 (4 decimals); the bins beyond them
 * "about 0.083" (not zero, unlike the periodic window). */
static void
test_hann_bin_symmetric (void)
{
  float x[2048];
  FwMatrix *m;

  fw_test_fill_bin_cosine (x, 2048, 1.0, 93, 2048);
  m = one_frame_magnitude (x, FW_WINDOW_SYMMETRIC);
  fw_assert_close (fw_matrix_get (m, 0, 93), 511.750007, 2e-4, 1e-6);
  fw_assert_close (fw_matrix_get (m, 0, 92), 256.0624, 5e-5, 0);
  fw_assert_close (fw_matrix_get (m, 0, 94), 256.0624, 5e-5, 0);
  /* "about 0.083" (2 significant digits): the next bins out, 91 and 95, which are exactly
   * zero for the periodic window. */
  fw_assert_close (fw_matrix_get (m, 0, 91), 0.083, 1e-3, 0);
  fw_assert_close (fw_matrix_get (m, 0, 95), 0.083, 1e-3, 0);
  fw_matrix_unref (m);

  fw_test_fill_cosine (x, 2048, 1.0, 1000.0, 22050.0, 0.0);
  m = one_frame_magnitude (x, FW_WINDOW_SYMMETRIC);
  fw_assert_close (fw_matrix_get (m, 0, 93), 507.005371, 2e-4, 1e-6);
  fw_matrix_unref (m);

  fw_test_fill_cosine (x, 2048, 1.0, 93.5 * 22050.0 / 2048.0, 22050.0, 0.0);
  m = one_frame_magnitude (x, FW_WINDOW_SYMMETRIC);
  fw_assert_close (fw_matrix_get (m, 0, 93), 434.457603, 2e-4, 1e-6);
  fw_matrix_unref (m);
}

/* The power spectrum is the square of the magnitude spectrum (issue 2 stage 4). §6: DC input
 * ones(N) gives X_0 = N; an impulse gives |X_k| = 1 for all k (rectangular window). */
static void
test_power_and_impulse (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  float x[256];
  FwMatrix *p, *mag;

  cfg.centered = false;
  cfg.window = FW_WINDOW_RECTANGULAR;
  cfg.window_length = cfg.fft_length = 256;
  cfg.hop_length = 256;
  for (int i = 0; i < 256; i++)
    x[i] = 1.0f;
  p = fw_test_run (&cfg, x, 256, FW_STAGE_SPECTRUM, 1);
  fw_assert_close (fw_matrix_get (p, 0, 0), 256.0 * 256.0, 0, 1e-6);
  for (int k = 1; k < 129; k++)
    g_assert_cmpfloat (fw_matrix_get (p, 0, k), <, 1e-6);
  fw_matrix_unref (p);

  memset (x, 0, sizeof x);
  x[0] = 1.0f;
  cfg.spectrum = FW_SPECTRUM_MAGNITUDE;
  mag = fw_test_run (&cfg, x, 256, FW_STAGE_SPECTRUM, 1);
  for (int k = 0; k < 129; k++)
    fw_assert_close (fw_matrix_get (mag, 0, k), 1.0, 0, 1e-6);
  fw_matrix_unref (mag);

  fw_test_fill_noise (x, 256, 3, 1.0);
  cfg.spectrum = FW_SPECTRUM_POWER;
  p = fw_test_run (&cfg, x, 256, FW_STAGE_SPECTRUM, 1);
  cfg.spectrum = FW_SPECTRUM_MAGNITUDE;
  mag = fw_test_run (&cfg, x, 256, FW_STAGE_SPECTRUM, 1);
  for (int k = 0; k < 129; k++)
    fw_assert_close (fw_matrix_get (p, 0, k),
                     (double) fw_matrix_get (mag, 0, k) * fw_matrix_get (mag, 0, k), 1e-9, 1e-6);
  fw_matrix_unref (p);
  fw_matrix_unref (mag);
}

/* check-values.md §6 (PUB✓, any DSP text): one-sided Parseval per frame,
 * sum x^2 = (1/N)(|X_0|^2 + 2 sum_{k=1}^{N/2-1} |X_k|^2 + |X_{N/2}|^2) for even N; for odd N no
 * Nyquist term. Random frames, rectangular window, float32 tolerance 1e-5 relative (§6). */
static void
test_parseval (void)
{
  static const size_t sizes[] = { 2048, 2047, 512, 1000 };

  for (size_t s = 0; s < G_N_ELEMENTS (sizes); s++)
    {
      size_t n = sizes[s], frames = 6;
      FwAnalysisConfig cfg = fw_test_config ();
      float *x = g_new (float, n * frames);
      FwMatrix *p;

      cfg.centered = false;
      cfg.window = FW_WINDOW_RECTANGULAR;
      cfg.window_length = cfg.fft_length = cfg.hop_length = n;
      fw_test_fill_noise (x, n * frames, 1000 + n, 0.7);
      p = fw_test_run (&cfg, x, n * frames, FW_STAGE_SPECTRUM, 1);
      g_assert_cmpuint (p->n_frames, ==, frames);
      for (size_t t = 0; t < frames; t++)
        {
          double time = 0.0, freq = 0.0;
          for (size_t i = 0; i < n; i++)
            time += (double) x[t * n + i] * x[t * n + i];
          for (size_t k = 0; k <= n / 2; k++)
            {
              bool single = (k == 0) || (n % 2 == 0 && k == n / 2);
              freq += (single ? 1.0 : 2.0) * fw_matrix_get (p, t, k);
            }
          fw_assert_close (freq / (double) n, time, 0, 1e-5);
        }
      fw_matrix_unref (p);
      g_free (x);
    }
}

/* check-values.md §8 (PUB✓ Heinzel 2002, ENBW relation): white noise of variance sigma^2
 * through a window gives E|X_k|^2 = sigma^2 sum w^2; a statistical test, +-3 % with >= 1000
 * frames. Uniform noise on [-1, 1) has sigma^2 = 1/3; periodic Hann N = 1024 has
 * sum w^2 = 3N/8 = 384, so the mean power per bin is 128 (bins away from DC and Nyquist). */
static void
test_white_noise_level (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  size_t n = 1024 * 1000;
  float *x = g_new (float, n);
  FwMatrix *p;
  double mean = 0.0;
  size_t count = 0;

  cfg.centered = false;
  cfg.window_length = cfg.fft_length = cfg.hop_length = 1024;
  fw_test_fill_noise (x, n, 2024, 1.0);
  p = fw_test_run (&cfg, x, n, FW_STAGE_SPECTRUM, 2);
  g_assert_cmpuint (p->n_frames, ==, 1000);
  for (size_t t = 0; t < p->n_frames; t++)
    for (size_t k = 2; k < 511; k++)
      {
        mean += fw_matrix_get (p, t, k);
        count++;
      }
  mean /= (double) count;
  fw_assert_close (mean, 128.0, 0, 0.03);
  fw_matrix_unref (p);
  g_free (x);
}

/* Frame count by brute force: step a frame of fft_length through the padded signal
 * (issue 2 stage 2: pad floor(fft_length/2) at both ends when centered) and count the starts
 * t*hop with t*hop + fft_length <= L_padded. */
static void
test_frame_count_brute_force (void)
{
  static const size_t ffts[] = { 1, 2, 3, 4, 7, 8, 16, 31, 64, 100 };
  static const size_t hops[] = { 1, 2, 3, 5, 8, 16, 33, 64, 101 };

  for (size_t n = 0; n <= 400; n++)
    for (size_t a = 0; a < G_N_ELEMENTS (ffts); a++)
      for (size_t b = 0; b < G_N_ELEMENTS (hops); b++)
        for (int c = 0; c < 2; c++)
          {
            size_t pad = c ? ffts[a] / 2 : 0, padded = n + 2 * pad, count = 0;
            for (size_t start = 0; start + ffts[a] <= padded; start += hops[b])
              count++;
            g_assert_cmpuint (fw_frame_count (n, ffts[a], hops[b], c), ==, count);
          }

  /* check-values.md §8 (CP/NUM): L = 22050, n = 2048, h = 512: 40 frames uncentred,
   * 1 + floor(L/h) = 44 centred. */
  g_assert_cmpuint (fw_frame_count (22050, 2048, 512, false), ==, 40);
  g_assert_cmpuint (fw_frame_count (22050, 2048, 512, true), ==, 44);
}

/* The matrix from fw_analysis_run has fw_frame_count rows, in both centring modes. */
static void
test_frame_count_run (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  float *x = g_new0 (float, 22050);
  static const size_t lengths[] = { 2048, 2049, 2559, 2560, 22050 };

  fw_test_fill_noise (x, 22050, 5, 0.1);
  for (size_t i = 0; i < G_N_ELEMENTS (lengths); i++)
    for (int c = 0; c < 2; c++)
      {
        FwMatrix *m;
        cfg.centered = c;
        m = fw_test_run (&cfg, x, lengths[i], FW_STAGE_RMS, 1);
        g_assert_cmpuint (m->n_frames, ==, fw_frame_count (lengths[i], 2048, 512, c));
        fw_matrix_unref (m);
      }
  g_free (x);
}

/* Frame times and axes. Issue 2 stage 2 / fw-analysis.h: centre time (t*hop + fft/2 - pad)/sr;
 * §8 PUB✓: hop 512 at 22050 Hz = 23.21995 ms; 1025 bins for 2048; bin 93 at 1001.2939453125 Hz;
 * resolution 22050/2048 = 10.7666015625 Hz. */
static void
test_times_and_axes (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  float *x = g_new0 (float, 22050);
  FwMatrix *m;

  fw_test_fill_noise (x, 22050, 9, 0.5);
  m = fw_test_run (&cfg, x, 22050, FW_STAGE_SPECTRUM, 1);
  g_assert_cmpuint (m->n_frames, ==, 44);
  g_assert_cmpint (m->stage, ==, FW_STAGE_SPECTRUM);
  g_assert_cmpint (m->bin_kind, ==, FW_BIN_AXIS_HZ);
  g_assert_cmpfloat (m->sample_rate, ==, 22050.0);
  fw_assert_close (m->hop_seconds * 1000.0, 23.21995, 5e-6, 0);
  g_assert_cmpuint (m->n_bins, ==, 1025);
  g_assert_cmpfloat (m->bin_value[93], ==, 1001.2939453125);
  g_assert_cmpfloat (m->bin_value[1] - m->bin_value[0], ==, 10.7666015625);
  g_assert_cmpfloat (m->bin_low[93], ==, 1001.2939453125 - 10.7666015625 / 2);
  g_assert_cmpfloat (m->bin_high[93], ==, 1001.2939453125 + 10.7666015625 / 2);
  for (size_t t = 0; t < 44; t++)
    {
      /* centred: frame t's centre is sample t*hop of the original signal */
      fw_assert_close (m->frame_times[t], t * 512.0 / 22050.0, 1e-15, 0);
      fw_assert_close (fw_frame_time (&cfg, t), t * 512.0 / 22050.0, 1e-15, 0);
    }
  fw_matrix_unref (m);

  cfg.centered = false;
  m = fw_test_run (&cfg, x, 22050, FW_STAGE_SPECTRUM, 1);
  g_assert_cmpuint (m->n_frames, ==, 40);
  for (size_t t = 0; t < 40; t++)
    fw_assert_close (m->frame_times[t], (t * 512.0 + 1024.0) / 22050.0, 1e-15, 0);
  fw_matrix_unref (m);
  g_free (x);
}

static void
assert_padded (const FwAnalysisConfig *cfg, const float *x, size_t n, const float *expect,
               size_t expect_len)
{
  size_t len = 0;
  float *p = _fw_analysis_prepare_signal (cfg, x, n, &len);
  g_assert_nonnull (p);
  g_assert_cmpuint (len, ==, expect_len);
  for (size_t i = 0; i < len; i++)
    fw_assert_close (p[i], expect[i], 1e-7, 0);
  free (p);
}

/* Padding modes (issue 2 stage 2). numpy.pad documentation examples (PUB✓):
 *   np.pad([1,2,3,4,5], (2,3), 'reflect') -> [3,2,1,2,3,4,5,4,3,2]
 *   np.pad([1,2,3,4,5], (2,3), 'edge')    -> [1,1,1,2,3,4,5,5,5,5]
 * (we pad 2 at both ends, so the first nine values apply). Repeated reflection for pads
 * longer than the signal, computed here with numpy 1.24.2 (/usr/bin/python3, NUM):
 *   np.pad([1,2,3], 5, 'reflect') -> [2,1,2,3,2, 1,2,3, 2,1,2,3,2]
 *   np.pad([1,2], 4, 'reflect')   -> [1,2,1,2, 1,2, 1,2,1,2]
 *   np.pad([7], 3, 'reflect')     -> [7,7,7, 7, 7,7,7] */
static void
test_padding (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  const float x5[] = { 1, 2, 3, 4, 5 };

  cfg.fft_length = cfg.window_length = 4; /* pad 2 */
  cfg.padding = FW_PADDING_REFLECT;
  assert_padded (&cfg, x5, 5, (const float[]){ 3, 2, 1, 2, 3, 4, 5, 4, 3 }, 9);
  cfg.padding = FW_PADDING_EDGE;
  assert_padded (&cfg, x5, 5, (const float[]){ 1, 1, 1, 2, 3, 4, 5, 5, 5 }, 9);
  cfg.padding = FW_PADDING_ZEROS;
  assert_padded (&cfg, x5, 5, (const float[]){ 0, 0, 1, 2, 3, 4, 5, 0, 0 }, 9);
  cfg.centered = false;
  assert_padded (&cfg, x5, 5, x5, 5);
  cfg.centered = true;

  cfg.padding = FW_PADDING_REFLECT;
  cfg.fft_length = cfg.window_length = 11; /* pad 5 */
  assert_padded (&cfg, (const float[]){ 1, 2, 3 }, 3,
                 (const float[]){ 2, 1, 2, 3, 2, 1, 2, 3, 2, 1, 2, 3, 2 }, 13);
  cfg.fft_length = cfg.window_length = 8; /* pad 4 */
  assert_padded (&cfg, (const float[]){ 1, 2 }, 2,
                 (const float[]){ 1, 2, 1, 2, 1, 2, 1, 2, 1, 2 }, 10);
  cfg.fft_length = cfg.window_length = 6; /* pad 3 */
  assert_padded (&cfg, (const float[]){ 7 }, 1, (const float[]){ 7, 7, 7, 7, 7, 7, 7 }, 7);
  cfg.padding = FW_PADDING_EDGE;
  assert_padded (&cfg, (const float[]){ 7, 8 }, 2, (const float[]){ 7, 7, 7, 7, 8, 8, 8, 8 }, 8);
}

/* The padding reaches the spectrum: with a rectangular window the DC bin of frame 0 is the
 * sum of the first fft_length padded samples. Ramp 1..16, fft 8 (pad 4):
 *   zeros   0+0+0+0+1+2+3+4 = 10
 *   reflect 5+4+3+2+1+2+3+4 = 24
 *   edge    1+1+1+1+1+2+3+4 = 14 */
static void
test_padding_in_spectrum (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  float x[16];
  static const struct { FwPadding p; double dc; } cases[] = {
    { FW_PADDING_ZEROS, 10 }, { FW_PADDING_REFLECT, 24 }, { FW_PADDING_EDGE, 14 },
  };

  for (int i = 0; i < 16; i++)
    x[i] = (float) (i + 1);
  cfg.window = FW_WINDOW_RECTANGULAR;
  cfg.window_length = cfg.fft_length = 8;
  cfg.hop_length = 4;
  cfg.spectrum = FW_SPECTRUM_MAGNITUDE;
  for (size_t c = 0; c < G_N_ELEMENTS (cases); c++)
    {
      FwMatrix *m;
      cfg.padding = cases[c].p;
      m = fw_test_run (&cfg, x, 16, FW_STAGE_SPECTRUM, 1);
      g_assert_cmpuint (m->n_frames, ==, 5);
      fw_assert_close (fw_matrix_get (m, 0, 0), cases[c].dc, 1e-5, 0);
      fw_matrix_unref (m);
    }
}

/* Pre-emphasis (issue 2 stage 1): y[0] = x[0], y[n] = x[n] - a x[n-1], applied to the whole
 * signal before padding. check-values.md §7 NUM: with a = 0.97 the response is 0.03 at DC and
 * 1.97 at fs/2. */
static void
test_pre_emphasis (void)
{
  float dc[64], alt[64];
  FwAnalysisConfig cfg = fw_test_config ();

  for (int i = 0; i < 64; i++)
    {
      dc[i] = 1.0f;
      alt[i] = (i % 2) ? -1.0f : 1.0f;
    }
  fw_pre_emphasis (dc, 64, 0.97);
  fw_pre_emphasis (alt, 64, 0.97);
  g_assert_cmpfloat (dc[0], ==, 1.0f);
  g_assert_cmpfloat (alt[0], ==, 1.0f);
  for (int i = 1; i < 64; i++)
    {
      fw_assert_close (dc[i], 0.03, 1e-7, 0);
      fw_assert_close (fabs (alt[i]), 1.97, 1e-7, 0);
    }
  /* a = 0 leaves the signal unchanged. */
  fw_pre_emphasis (alt, 64, 0.0);
  fw_assert_close (fabs (alt[5]), 1.97, 1e-7, 0);

  /* Whole signal first, then padding: [1,2,3,4,5] with a = 0.5 -> [1, 1.5, 2, 2.5, 3], then
   * reflect by 2 -> [2, 1.5, 1, 1.5, 2, 2.5, 3, 2.5, 2]. */
  cfg.pre_emphasis = 0.5;
  cfg.padding = FW_PADDING_REFLECT;
  cfg.fft_length = cfg.window_length = 4;
  assert_padded (&cfg, (const float[]){ 1, 2, 3, 4, 5 }, 5,
                 (const float[]){ 2, 1.5f, 1, 1.5f, 2, 2.5f, 3, 2.5f, 2 }, 9);
}

/* A window shorter than fft_length sits centred (issue 2 stage 3): offset
 * floor((fft - win)/2). Rectangular window over a ramp x[n] = n, uncentred, fft 8:
 *   win 4 -> offset 2, frame 0 DC = 2+3+4+5 = 14, frame 1 (hop 1) = 3+4+5+6 = 18;
 *   win 3 -> offset 2 (floor(5/2)), DC = 2+3+4 = 9;  win 8 -> 0+...+7 = 28. */
static void
test_window_centred (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  float x[32];
  static const struct { size_t win; double dc0, dc1; } cases[] = {
    { 4, 14, 18 }, { 3, 9, 12 }, { 8, 28, 36 }, { 7, 21, 28 },
  };

  for (int i = 0; i < 32; i++)
    x[i] = (float) i;
  cfg.centered = false;
  cfg.window = FW_WINDOW_RECTANGULAR;
  cfg.fft_length = 8;
  cfg.hop_length = 1;
  cfg.spectrum = FW_SPECTRUM_MAGNITUDE;
  for (size_t c = 0; c < G_N_ELEMENTS (cases); c++)
    {
      FwMatrix *m;
      cfg.window_length = cases[c].win;
      g_assert_cmpuint (_fw_analysis_window_offset (&cfg), ==, (8 - cases[c].win) / 2);
      m = fw_test_run (&cfg, x, 32, FW_STAGE_SPECTRUM, 1);
      fw_assert_close (fw_matrix_get (m, 0, 0), cases[c].dc0, 1e-5, 0);
      fw_assert_close (fw_matrix_get (m, 1, 0), cases[c].dc1, 1e-5, 0);
      fw_matrix_unref (m);
    }
}

static FwMatrix *
spectrum_matrix (const FwAnalysisConfig *cfg, const float *values, size_t frames)
{
  size_t bins = cfg->fft_length / 2 + 1;
  FwMatrix *m = fw_matrix_new (frames, bins);
  memcpy (m->data, values, frames * bins * sizeof (float));
  m->stage = FW_STAGE_SPECTRUM;
  m->bin_kind = FW_BIN_AXIS_HZ;
  return m;
}

/* dB conventions (issue 2 stage 5; check-values.md §5: 10 log10 for power ratios, 20 log10
 * for amplitude ratios, PUB✓ definitions; -100 dB floor for 1e-10, CP). */
static void
test_db_conventions (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  const float s[] = { 1, 10, 100, 0, 1e-12f, 0.5f };
  FwMatrix *spec, *db;

  cfg.fft_length = cfg.window_length = 10; /* 6 bins */
  spec = spectrum_matrix (&cfg, s, 1);

  /* power, reference 1, floor 1e-10 */
  g_assert_cmpint (fw_analysis_derive (&cfg, FW_STAGE_DB, spec, &db), ==, FW_DSP_OK);
  {
    const double e[] = { 0, 10, 20, -100, -100, -3.0103 };
    for (int k = 0; k < 6; k++)
      fw_assert_close (fw_matrix_get (db, 0, k), e[k], 1e-4, 0);
    g_assert_cmpint (db->stage, ==, FW_STAGE_DB);
    g_assert_cmpint (db->bin_kind, ==, FW_BIN_AXIS_HZ);
  }
  fw_matrix_unref (db);

  /* magnitude: 20 log10, floor 1e-10 -> -200 dB */
  cfg.spectrum = FW_SPECTRUM_MAGNITUDE;
  fw_analysis_derive (&cfg, FW_STAGE_DB, spec, &db);
  {
    const double e[] = { 0, 20, 40, -200, -200, -6.0206 };
    for (int k = 0; k < 6; k++)
      fw_assert_close (fw_matrix_get (db, 0, k), e[k], 1e-4, 0);
  }
  fw_matrix_unref (db);

  /* reference = matrix max (100): power -> 10 log10(S/100) */
  cfg.spectrum = FW_SPECTRUM_POWER;
  cfg.db_reference_max = true;
  fw_analysis_derive (&cfg, FW_STAGE_DB, spec, &db);
  {
    const double e[] = { -20, -10, 0, -120, -120, -23.0103 };
    for (int k = 0; k < 6; k++)
      fw_assert_close (fw_matrix_get (db, 0, k), e[k], 1e-4, 0);
  }
  fw_matrix_unref (db);

  /* numeric reference 2: -10 log10(2) = -3.0103 dB everywhere above the floor */
  cfg.db_reference_max = false;
  cfg.db_reference = 2.0;
  fw_analysis_derive (&cfg, FW_STAGE_DB, spec, &db);
  fw_assert_close (fw_matrix_get (db, 0, 0), -3.0103, 1e-4, 0);
  fw_assert_close (fw_matrix_get (db, 0, 3), -103.0103, 1e-4, 0);
  fw_matrix_unref (db);

  /* dynamic range 80 dB: the max is 20 dB, values below -60 are raised to -60 */
  cfg.db_reference = 1.0;
  cfg.dynamic_range = 80.0;
  fw_analysis_derive (&cfg, FW_STAGE_DB, spec, &db);
  {
    const double e[] = { 0, 10, 20, -60, -60, -3.0103 };
    for (int k = 0; k < 6; k++)
      fw_assert_close (fw_matrix_get (db, 0, k), e[k], 1e-4, 0);
  }
  fw_matrix_unref (db);

  /* a floor of 1e-6 gives -60 dB for zero power */
  cfg.dynamic_range = 0.0;
  cfg.db_floor = 1e-6;
  fw_analysis_derive (&cfg, FW_STAGE_DB, spec, &db);
  fw_assert_close (fw_matrix_get (db, 0, 3), -60.0, 1e-4, 0);
  fw_matrix_unref (db);

  /* derive refuses a parent from the wrong stage or with the wrong bin count */
  spec->stage = FW_STAGE_MEL;
  g_assert_cmpint (fw_analysis_derive (&cfg, FW_STAGE_DB, spec, &db), ==,
                   FW_DSP_ERROR_INVALID_ARGUMENT);
  g_assert_null (db);
  spec->stage = FW_STAGE_SPECTRUM;
  cfg.fft_length = cfg.window_length = 12;
  g_assert_cmpint (fw_analysis_derive (&cfg, FW_STAGE_DB, spec, &db), ==,
                   FW_DSP_ERROR_INVALID_ARGUMENT);
  fw_matrix_unref (spec);
}

/* Matrix reference counting and copies (fw-matrix.h). */
static void
test_matrix (void)
{
  FwMatrix *m = fw_matrix_new (3, 4), *c;

  g_assert_nonnull (m);
  g_assert_cmpint (m->ref_count, ==, 1);
  for (int i = 0; i < 12; i++)
    g_assert_cmpfloat (m->data[i], ==, 0.0f);
  m->data[5] = 2.5f;
  m->frame_times[2] = 0.75;
  m->bin_value[3] = 9.0;
  m->stage = FW_STAGE_MFCC;
  g_assert_true (fw_matrix_ref (m) == m);
  g_assert_cmpint (m->ref_count, ==, 2);
  fw_matrix_unref (m);
  g_assert_cmpint (m->ref_count, ==, 1);
  c = fw_matrix_copy (m);
  g_assert_cmpint (c->ref_count, ==, 1);
  g_assert_cmpfloat (fw_matrix_get (c, 1, 1), ==, 2.5f);
  g_assert_cmpfloat (c->frame_times[2], ==, 0.75);
  g_assert_cmpfloat (c->bin_value[3], ==, 9.0);
  g_assert_cmpint (c->stage, ==, FW_STAGE_MFCC);
  g_assert_true (c->data != m->data);
  g_assert_cmpuint (fw_matrix_bytes (m), >=, 12 * sizeof (float));
  fw_matrix_unref (m);
  fw_matrix_unref (c);
  fw_matrix_unref (NULL);
}

/* The FFT wrapper: unscaled DFT (fw-fft.h), input untouched, plans cached. */
static void
test_fft (void)
{
  const FwFftPlan *p = fw_fft_plan_get (8);
  float *in = fw_fft_alloc_real (8);
  fftwf_complex *out = fw_fft_alloc_complex (5);

  g_assert_nonnull (p);
  g_assert_true (fw_fft_plan_get (8) == p);
  g_assert_cmpuint (fw_fft_plan_length (p), ==, 8);
  /* §6 (PUB✓): cos(2 pi 2 n / 8) gives X_2 = N/2 = 4. */
  for (int i = 0; i < 8; i++)
    in[i] = (float) cos (2.0 * M_PI * 2.0 * i / 8.0);
  fw_fft_r2c (p, in, out);
  fw_assert_close (out[2][0], 4.0, 1e-6, 0);
  fw_assert_close (out[2][1], 0.0, 1e-6, 0);
  fw_assert_close (out[0][0], 0.0, 1e-6, 0);
  fw_assert_close (in[0], 1.0, 0, 0);
  fw_assert_close (in[2], cos (M_PI), 1e-7, 0);
  fw_fft_free (in);
  fw_fft_free (out);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/dsp/stft/hann-bin-periodic", test_hann_bin_periodic);
  g_test_add_func ("/fw/dsp/stft/hann-bin-symmetric", test_hann_bin_symmetric);
  g_test_add_func ("/fw/dsp/stft/power-and-impulse", test_power_and_impulse);
  g_test_add_func ("/fw/dsp/stft/parseval", test_parseval);
  g_test_add_func ("/fw/dsp/stft/white-noise-level", test_white_noise_level);
  g_test_add_func ("/fw/dsp/stft/frame-count-brute-force", test_frame_count_brute_force);
  g_test_add_func ("/fw/dsp/stft/frame-count-run", test_frame_count_run);
  g_test_add_func ("/fw/dsp/stft/times-and-axes", test_times_and_axes);
  g_test_add_func ("/fw/dsp/stft/padding", test_padding);
  g_test_add_func ("/fw/dsp/stft/padding-in-spectrum", test_padding_in_spectrum);
  g_test_add_func ("/fw/dsp/stft/pre-emphasis", test_pre_emphasis);
  g_test_add_func ("/fw/dsp/stft/window-centred", test_window_centred);
  g_test_add_func ("/fw/dsp/stft/db-conventions", test_db_conventions);
  g_test_add_func ("/fw/dsp/stft/matrix", test_matrix);
  g_test_add_func ("/fw/dsp/stft/fft", test_fft);
  {
    int rc = g_test_run ();
    fw_fft_cleanup ();
    return rc;
  }
}
