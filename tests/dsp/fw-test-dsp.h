/* fw-test-dsp.h: shared helpers for the dsp tests: a default configuration, deterministic
 * synthetic signals and tolerance assertions. Test-only; GLib is allowed here. */
#pragma once

#include <glib.h>
#include <math.h>
#include <stdint.h>

#include "fw-analysis.h"

#ifndef M_PI
#define M_PI 3.14159265358979323846
#endif

/* The documented defaults of the parameter set (issue 2, "Defaults"), fmax resolved to
 * Nyquist. */
static inline FwAnalysisConfig
fw_test_config (void)
{
  FwAnalysisConfig c = {
    .sample_rate = 22050.0,
    .pre_emphasis = 0.0,
    .window_length = 2048,
    .hop_length = 512,
    .fft_length = 2048,
    .window = FW_WINDOW_HANN,
    .window_symmetry = FW_WINDOW_PERIODIC,
    .centered = true,
    .padding = FW_PADDING_ZEROS,
    .spectrum = FW_SPECTRUM_POWER,
    .mel_bands = 128,
    .mel_scale = FW_MEL_SCALE_SLANEY,
    .fmin = 0.0,
    .fmax = 11025.0,
    .mel_weights = FW_MEL_WEIGHTS_AREA,
    .db_reference_max = false,
    .db_reference = 1.0,
    .db_floor = 1e-10,
    .dynamic_range = 0.0,
    .cepstral_count = 13,
    .dct_norm = FW_DCT_NORM_ORTHO,
    .lifter = 0.0,
    .delta_width = 2,
  };
  return c;
}

/* Deterministic uniform noise in [-1, 1) (xorshift64*, fixed seed). */
static inline double
fw_test_noise (uint64_t *state)
{
  uint64_t x = *state;
  x ^= x >> 12;
  x ^= x << 25;
  x ^= x >> 27;
  *state = x;
  return (double) ((x * 0x2545F4914F6CDD1DULL) >> 11) / 4503599627370496.0 - 1.0;
}

static inline void
fw_test_fill_noise (float *x, size_t n, uint64_t seed, double amplitude)
{
  uint64_t s = seed ? seed : 1;
  for (size_t i = 0; i < n; i++)
    x[i] = (float) (amplitude * fw_test_noise (&s));
}

/* A cos(2 pi f n / sr + phase), evaluated in double. */
static inline void
fw_test_fill_cosine (float *x, size_t n, double amplitude, double f, double sr, double phase)
{
  for (size_t i = 0; i < n; i++)
    x[i] = (float) (amplitude * cos (2.0 * M_PI * f * (double) i / sr + phase));
}

/* An on-bin cosine A cos(2 pi k n / N) with the angle reduced exactly in integers. */
static inline void
fw_test_fill_bin_cosine (float *x, size_t n, double amplitude, size_t k, size_t big_n)
{
  for (size_t i = 0; i < n; i++)
    x[i] = (float) (amplitude * cos (2.0 * M_PI * (double) ((k * i) % big_n) / (double) big_n));
}

/* |a - b| <= abs_tol + rel_tol |b|, with a message naming both values. */
#define fw_assert_close(a, b, abs_tol, rel_tol)                                                  \
  G_STMT_START                                                                                  \
  {                                                                                             \
    double fw_a_ = (double) (a), fw_b_ = (double) (b);                                          \
    double fw_t_ = (abs_tol) + (rel_tol) * fabs (fw_b_);                                        \
    if (!(fabs (fw_a_ - fw_b_) <= fw_t_))                                                       \
      {                                                                                         \
        g_autofree char *fw_m_ = g_strdup_printf ("%s = %.12g, expected %.12g (tolerance %.3g)", \
                                                  #a, fw_a_, fw_b_, fw_t_);                      \
        g_assertion_message (G_LOG_DOMAIN, __FILE__, __LINE__, G_STRFUNC, fw_m_);                \
      }                                                                                         \
  }                                                                                             \
  G_STMT_END

static inline FwMatrix *
fw_test_run (const FwAnalysisConfig *cfg, const float *x, size_t n, FwStage stage, int threads)
{
  FwMatrix *m = NULL;
  FwDspStatus st = fw_analysis_run (cfg, x, n, stage, threads, NULL, NULL, &m);
  g_assert_cmpint (st, ==, FW_DSP_OK);
  g_assert_nonnull (m);
  return m;
}
