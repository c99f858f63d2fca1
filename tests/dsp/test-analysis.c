/* test-analysis.c: the whole pipeline: descriptors, stage chaining, threads, cancellation,
 * errors and silence.
 *
 * The descriptor definitions are the ones written at the top of src/dsp/fw-analysis.c. Known
 * answers come from the definitions applied to signals whose spectra are known exactly
 * (check-values.md §5.1: an on-bin cosine under a periodic Hann window has exactly three
 * nonzero bins with magnitudes N/4, N/2, N/4) or from textbook facts named beside each check. */
#include "fw-analysis-private.h"
#include "fw-fft.h"
#include "fw-test-dsp.h"

static double
descriptor (const FwAnalysisConfig *cfg, const float *x, size_t n, FwStage stage, size_t frame)
{
  FwMatrix *m = fw_test_run (cfg, x, n, stage, 1);
  double v;
  g_assert_cmpuint (m->n_bins, ==, 1);
  g_assert_cmpint (m->bin_kind, ==, FW_BIN_AXIS_SCALAR);
  g_assert_cmpint (m->stage, ==, stage);
  g_assert_cmpuint (frame, <, m->n_frames);
  v = fw_matrix_get (m, frame, 0);
  fw_matrix_unref (m);
  return v;
}

/* An on-bin cosine (bin 93 of 2048 at 22050 Hz = 1001.2939453125 Hz), periodic Hann:
 * power bins 92, 93, 94 = 256^2, 512^2, 256^2 = a, 4a, a (check-values.md §5.1).
 *   centroid  = f_93 (symmetric weights);
 *   bandwidth = sqrt((a df^2 + a df^2) / 6a) = df / sqrt(3);
 *   rolloff   = cumulative 1/6, 5/6 (< 0.85), 1 -> f_94;
 * with the magnitude spectrum the weights are b, 2b, b: rolloff 1/4, 3/4, 1 -> f_94. */
static void
test_spectral_descriptors_tone (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  const double df = 22050.0 / 2048.0;
  float *x = g_new (float, 8192);

  cfg.centered = false;
  fw_test_fill_bin_cosine (x, 8192, 1.0, 93, 2048);
  for (size_t t = 0; t < 13; t++)
    {
      fw_assert_close (descriptor (&cfg, x, 8192, FW_STAGE_CENTROID, t), 93 * df, 1e-3, 0);
      fw_assert_close (descriptor (&cfg, x, 8192, FW_STAGE_BANDWIDTH, t), df / sqrt (3.0), 1e-3, 0);
      fw_assert_close (descriptor (&cfg, x, 8192, FW_STAGE_ROLLOFF, t), 94 * df, 1e-9, 0);
    }
  cfg.spectrum = FW_SPECTRUM_MAGNITUDE;
  fw_assert_close (descriptor (&cfg, x, 8192, FW_STAGE_CENTROID, 3), 93 * df, 1e-2, 0);
  fw_assert_close (descriptor (&cfg, x, 8192, FW_STAGE_ROLLOFF, 3), 94 * df, 1e-9, 0);

  /* Magnitude weights are not squared, so the float32 rounding floor of the bins that are
   * exactly zero in theory (~1e-5) weighs on the second moment of a single tone. Two equal
   * on-bin tones at bins 93 and 300 make the answer large and exact by the definition:
   * clusters b, 2b, b at centre -/+ D, D = 103.5 df, so
   *   centroid = (f_93 + f_300) / 2,  bandwidth = sqrt(D^2 + df^2 / 2),
   *   rolloff: the cumulative share reaches 0.85 at bin 300 (1/2 + 1/8 + 1/4 = 0.875). */
  {
    float *y = g_new (float, 8192);
    double dd = 103.5 * df;
    fw_test_fill_bin_cosine (y, 8192, 1.0, 300, 2048);
    for (size_t i = 0; i < 8192; i++)
      y[i] += x[i];
    fw_assert_close (descriptor (&cfg, y, 8192, FW_STAGE_CENTROID, 3), (93 + 300) * df / 2, 0, 1e-5);
    fw_assert_close (descriptor (&cfg, y, 8192, FW_STAGE_BANDWIDTH, 3),
                     sqrt (dd * dd + df * df / 2.0), 0, 1e-4);
    fw_assert_close (descriptor (&cfg, y, 8192, FW_STAGE_ROLLOFF, 3), 300 * df, 1e-9, 0);
    g_free (y);
  }
  g_free (x);
}

/* Flatness (geometric over arithmetic mean of the floored power spectrum):
 * - a pure tone concentrates the power in three bins: flatness near 0;
 * - for white noise each periodogram bin is (approximately) exponentially distributed, for
 *   which E[ln P] = ln E[P] - gamma, so the ratio tends to exp(-gamma) = 0.5615 (Euler's
 *   constant; a textbook property of the exponential distribution). We allow 0.45..0.65
 *   for the finite 1025-bin average, then average over frames to 0.50..0.62.
 * - silence: every bin at the floor, flatness exactly 1 by the definition. */
static void
test_flatness (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  size_t n = 22050;
  float *x = g_new (float, n);
  FwMatrix *m;
  double mean = 0.0;

  cfg.centered = false;
  fw_test_fill_bin_cosine (x, n, 1.0, 93, 2048);
  g_assert_cmpfloat (descriptor (&cfg, x, n, FW_STAGE_FLATNESS, 2), <, 1e-3);

  fw_test_fill_noise (x, n, 77, 0.5);
  m = fw_test_run (&cfg, x, n, FW_STAGE_FLATNESS, 1);
  for (size_t t = 0; t < m->n_frames; t++)
    {
      double v = fw_matrix_get (m, t, 0);
      g_assert_cmpfloat (v, >, 0.45);
      g_assert_cmpfloat (v, <, 0.65);
      mean += v;
    }
  mean /= (double) m->n_frames;
  g_assert_cmpfloat (mean, >, 0.50);
  g_assert_cmpfloat (mean, <, 0.62);
  fw_matrix_unref (m);

  /* The magnitude configuration squares S back to power: the same flatness to float accuracy. */
  cfg.spectrum = FW_SPECTRUM_MAGNITUDE;
  {
    FwMatrix *mm = fw_test_run (&cfg, x, n, FW_STAGE_FLATNESS, 1);
    cfg.spectrum = FW_SPECTRUM_POWER;
    m = fw_test_run (&cfg, x, n, FW_STAGE_FLATNESS, 1);
    for (size_t t = 0; t < m->n_frames; t++)
      fw_assert_close (fw_matrix_get (mm, t, 0), fw_matrix_get (m, t, 0), 0, 1e-4);
    fw_matrix_unref (mm);
    fw_matrix_unref (m);
  }

  memset (x, 0, n * sizeof (float));
  g_assert_cmpfloat (descriptor (&cfg, x, n, FW_STAGE_FLATNESS, 0), ==, 1.0f);
  g_free (x);
}

/* rms: sqrt(mean x^2) over the window_length samples under the window, unwindowed.
 * check-values.md §8 (PUB✓): a sine of amplitude A has RMS A/sqrt(2); over a whole number of
 * periods (93 cycles in 2048 samples) the discrete mean of cos^2 is exactly 1/2. With centred
 * zero padding the first frame sees 1024 zeros and 1024 samples of the tone. */
static void
test_rms (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  size_t n = 8192;
  float *x = g_new (float, n);
  FwMatrix *m;

  fw_test_fill_bin_cosine (x, n, 1.0, 93, 2048);
  cfg.centered = false;
  m = fw_test_run (&cfg, x, n, FW_STAGE_RMS, 1);
  for (size_t t = 0; t < m->n_frames; t++)
    fw_assert_close (fw_matrix_get (m, t, 0), 1.0 / sqrt (2.0), 1e-6, 0);
  fw_matrix_unref (m);

  cfg.centered = true;
  m = fw_test_run (&cfg, x, n, FW_STAGE_RMS, 1);
  {
    double acc = 0.0;
    for (int i = 0; i < 1024; i++)
      acc += (double) x[i] * x[i];
    fw_assert_close (fw_matrix_get (m, 0, 0), sqrt (acc / 2048.0), 1e-6, 0);
  }
  fw_matrix_unref (m);

  /* Shorter window (512 of 2048) sits at offset 768: rms of those 512 samples only. */
  cfg.centered = false;
  cfg.window_length = 512;
  for (size_t i = 0; i < n; i++)
    x[i] = (i >= 768 && i < 1280) ? 0.5f : 0.0f;
  fw_assert_close (descriptor (&cfg, x, n, FW_STAGE_RMS, 0), 0.5, 1e-7, 0);
  g_free (x);
}

/* zcr: fraction of adjacent sample pairs with different signs (x >= 0 positive). A sine of
 * frequency f crosses zero 2f times per second, so zcr ~ 2 f / sr; over W - 1 pairs the count
 * can differ from 2f(W-1)/sr by at most one crossing (2 with the phase), hence the bound
 * 2/(W-1). A square wave of period 8 (4 high, 4 low) has exactly 1 crossing per 4 pairs. */
static void
test_zcr (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  size_t n = 22050;
  float *x = g_new (float, n);
  FwMatrix *m;

  cfg.centered = false;
  fw_test_fill_cosine (x, n, 1.0, 1000.0, 22050.0, 0.3);
  m = fw_test_run (&cfg, x, n, FW_STAGE_ZCR, 1);
  for (size_t t = 0; t < m->n_frames; t++)
    fw_assert_close (fw_matrix_get (m, t, 0), 2.0 * 1000.0 / 22050.0, 2.0 / 2047.0, 0);
  fw_matrix_unref (m);

  cfg.window_length = cfg.fft_length = 9; /* 8 pairs */
  cfg.hop_length = 8;
  for (size_t i = 0; i < n; i++)
    x[i] = ((i / 4) % 2) ? -1.0f : 1.0f;
  /* samples 0..8: + + + + - - - - + : 2 sign changes over 8 pairs */
  fw_assert_close (descriptor (&cfg, x, n, FW_STAGE_ZCR, 0), 2.0 / 8.0, 1e-7, 0);
  /* zero counts as positive: 0, 0, -1, ... has its first change between 0 and -1 */
  for (size_t i = 0; i < n; i++)
    x[i] = 0.0f;
  fw_assert_close (descriptor (&cfg, x, n, FW_STAGE_ZCR, 0), 0.0, 0, 0);
  x[2] = -1.0f;
  fw_assert_close (descriptor (&cfg, x, n, FW_STAGE_ZCR, 0), 2.0 / 8.0, 1e-7, 0);
  g_free (x);
}

/* A deterministic test signal: a rising chirp plus a hum with harmonics plus noise. */
static float *
make_signal (size_t n, double sr)
{
  float *x = g_new (float, n);
  uint64_t s = 12345;
  for (size_t i = 0; i < n; i++)
    {
      double t = (double) i / sr;
      double chirp = 0.3 * sin (2.0 * M_PI * (200.0 * t + 400.0 * t * t));
      double hum = 0.2 * sin (2.0 * M_PI * 230.0 * t) + 0.1 * sin (2.0 * M_PI * 460.0 * t);
      x[i] = (float) (chirp + hum + 0.05 * fw_test_noise (&s));
    }
  return x;
}

static void
assert_same_matrix (const FwMatrix *a, const FwMatrix *b)
{
  g_assert_cmpuint (a->n_frames, ==, b->n_frames);
  g_assert_cmpuint (a->n_bins, ==, b->n_bins);
  g_assert_cmpint (a->stage, ==, b->stage);
  g_assert_cmpint (a->bin_kind, ==, b->bin_kind);
  g_assert_cmpfloat (a->sample_rate, ==, b->sample_rate);
  g_assert_cmpfloat (a->hop_seconds, ==, b->hop_seconds);
  g_assert_cmpint (memcmp (a->data, b->data, a->n_frames * a->n_bins * sizeof (float)), ==, 0);
  g_assert_cmpint (memcmp (a->frame_times, b->frame_times, a->n_frames * sizeof (double)), ==, 0);
  g_assert_cmpint (memcmp (a->bin_value, b->bin_value, a->n_bins * sizeof (double)), ==, 0);
  g_assert_cmpint (memcmp (a->bin_low, b->bin_low, a->n_bins * sizeof (double)), ==, 0);
  g_assert_cmpint (memcmp (a->bin_high, b->bin_high, a->n_bins * sizeof (double)), ==, 0);
}

/* Several parameter variants covering each convention switch. */
static FwAnalysisConfig
variant (int i)
{
  FwAnalysisConfig c = fw_test_config ();
  c.window_length = 1024;
  c.fft_length = 1024;
  c.hop_length = 256;
  c.mel_bands = 40;
  switch (i)
    {
    case 0:
      break;
    case 1:
      c.spectrum = FW_SPECTRUM_MAGNITUDE;
      c.mel_scale = FW_MEL_SCALE_HTK;
      c.mel_weights = FW_MEL_WEIGHTS_UNIT;
      c.dct_norm = FW_DCT_NORM_NONE;
      c.lifter = 22.0;
      break;
    case 2:
      c.centered = false;
      c.window_length = 700;
      c.window = FW_WINDOW_HAMMING;
      c.window_symmetry = FW_WINDOW_SYMMETRIC;
      c.pre_emphasis = 0.97;
      c.db_reference_max = true;
      c.dynamic_range = 80.0;
      break;
    case 3:
      c.padding = FW_PADDING_REFLECT;
      c.window = FW_WINDOW_BLACKMAN;
      c.fmin = 100.0;
      c.fmax = 8000.0;
      c.delta_width = 3;
      c.cepstral_count = 20;
      break;
    default:
      c.padding = FW_PADDING_EDGE;
      c.window = FW_WINDOW_RECTANGULAR;
      c.hop_length = 333;
      break;
    }
  return c;
}

/* fw_analysis_run(stage) equals fw_analysis_run(spectrum) followed by fw_analysis_derive down
 * the parent chain, bit for bit (the same code computes each row either way). */
static void
test_run_equals_derive (void)
{
  size_t n = 3 * 22050;
  float *x = make_signal (n, 22050.0);

  for (int v = 0; v < 5; v++)
    {
      FwAnalysisConfig cfg = variant (v);
      FwMatrix *chain[FW_N_STAGES] = { NULL };

      g_assert_cmpint (fw_analysis_check (&cfg), ==, FW_DSP_OK);
      chain[FW_STAGE_SPECTRUM] = fw_test_run (&cfg, x, n, FW_STAGE_SPECTRUM, 1);
      for (int s = 0; s < FW_N_STAGES; s++)
        {
          FwStage parent = fw_stage_parent ((FwStage) s);
          FwMatrix *direct;
          if (parent == FW_STAGE_SIGNAL)
            continue;
          g_assert_nonnull (chain[parent]);
          g_assert_cmpint (fw_analysis_derive (&cfg, (FwStage) s, chain[parent], &chain[s]), ==,
                           FW_DSP_OK);
          direct = fw_test_run (&cfg, x, n, (FwStage) s, 1);
          assert_same_matrix (direct, chain[s]);
          fw_matrix_unref (direct);
        }
      for (int s = 0; s < FW_N_STAGES; s++)
        fw_matrix_unref (chain[s]);
    }
  g_free (x);
}

/* n_threads = 2 (and 3) gives bit-identical output to n_threads = 1 for every stage. */
static void
test_threads_identical (void)
{
  size_t n = 4 * 22050;
  float *x = make_signal (n, 22050.0);

  for (int v = 0; v < 3; v++)
    {
      FwAnalysisConfig cfg = variant (v);
      for (int s = 0; s < FW_N_STAGES; s++)
        {
          FwMatrix *one = fw_test_run (&cfg, x, n, (FwStage) s, 1);
          FwMatrix *two = fw_test_run (&cfg, x, n, (FwStage) s, 2);
          FwMatrix *three = fw_test_run (&cfg, x, n, (FwStage) s, 3);
          assert_same_matrix (one, two);
          assert_same_matrix (one, three);
          fw_matrix_unref (one);
          fw_matrix_unref (two);
          fw_matrix_unref (three);
        }
    }
  g_free (x);
}

/* Matrix metadata per stage (issue 2 / fw-matrix.h): mel bands carry their centre
 * (edges[m+1]) and edges; cepstra are coefficients; deltas keep the coefficient axis. */
static void
test_axes (void)
{
  FwAnalysisConfig cfg = variant (0);
  size_t n = 22050;
  float *x = make_signal (n, 22050.0);
  FwMelBank *bank = fw_mel_bank_new (cfg.mel_scale, cfg.mel_weights, cfg.mel_bands, cfg.fmin,
                                     cfg.fmax, cfg.sample_rate, cfg.fft_length, NULL);
  const double *e = fw_mel_bank_edges_hz (bank);
  FwMatrix *m;

  m = fw_test_run (&cfg, x, n, FW_STAGE_MEL_DB, 1);
  g_assert_cmpint (m->bin_kind, ==, FW_BIN_AXIS_MEL_BAND);
  g_assert_cmpint (m->stage, ==, FW_STAGE_MEL_DB);
  g_assert_cmpuint (m->n_bins, ==, 40);
  for (size_t b = 0; b < 40; b++)
    {
      g_assert_cmpfloat (m->bin_value[b], ==, e[b + 1]);
      g_assert_cmpfloat (m->bin_low[b], ==, e[b]);
      g_assert_cmpfloat (m->bin_high[b], ==, e[b + 2]);
    }
  g_assert_cmpuint (m->n_frames, ==, fw_frame_count (n, 1024, 256, true));
  fw_matrix_unref (m);

  m = fw_test_run (&cfg, x, n, FW_STAGE_DELTA2, 1);
  g_assert_cmpint (m->bin_kind, ==, FW_BIN_AXIS_COEFFICIENT);
  g_assert_cmpuint (m->n_bins, ==, 13);
  for (size_t b = 0; b < 13; b++)
    g_assert_cmpfloat (m->bin_value[b], ==, (double) b);
  fw_assert_close (m->frame_times[3], 3 * 256.0 / 22050.0, 1e-15, 0);
  g_assert_cmpfloat (m->hop_seconds, ==, 256.0 / 22050.0);
  fw_matrix_unref (m);
  fw_mel_bank_free (bank);
  g_free (x);
}

/* mfcc = DCT-II of each mel-db frame (first cepstral_count coefficients, lifter applied):
 * check one frame against fw_dct2 in double on the mel-db row. */
static void
test_mfcc_is_dct_of_mel_db (void)
{
  FwAnalysisConfig cfg = variant (1); /* none + lifter 22 */
  size_t n = 22050;
  float *x = make_signal (n, 22050.0);
  FwMatrix *meldb = fw_test_run (&cfg, x, n, FW_STAGE_MEL_DB, 1);
  FwMatrix *mfcc = fw_test_run (&cfg, x, n, FW_STAGE_MFCC, 1);
  double in[40], out[13], w[13];

  fw_lifter_weights (13, 22.0, w);
  for (size_t t = 0; t < meldb->n_frames; t += 7)
    {
      for (int b = 0; b < 40; b++)
        in[b] = fw_matrix_get (meldb, t, b);
      fw_dct2 (in, 40, out, 13, FW_DCT_NORM_NONE);
      for (int k = 0; k < 13; k++)
        fw_assert_close (fw_matrix_get (mfcc, t, k), out[k] * w[k], 1e-3, 1e-5);
    }
  fw_matrix_unref (meldb);
  fw_matrix_unref (mfcc);
  g_free (x);
}

typedef struct
{
  int calls;
  double last;
  double cancel_after;
  bool in_range;
} ProgressState;

static int
progress_cb (double fraction, void *data)
{
  ProgressState *p = data;
  p->calls++;
  if (fraction < 0.0 || fraction > 1.0)
    p->in_range = false;
  p->last = fraction;
  return fraction >= p->cancel_after;
}

/* Progress and cancellation: a callback that returns non-zero stops the job with
 * FW_DSP_ERROR_CANCELLED and no matrix; otherwise the last report is 1.0. */
static void
test_progress_cancel (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  size_t n = 20 * 22050;
  float *x = make_signal (n, 22050.0);
  FwMatrix *m = (FwMatrix *) 0x1;

  for (int threads = 1; threads <= 2; threads++)
    {
      ProgressState p = { .cancel_after = 2.0, .in_range = true };
      g_assert_cmpint (fw_analysis_run (&cfg, x, n, FW_STAGE_MFCC, threads, progress_cb, &p, &m),
                       ==, FW_DSP_OK);
      g_assert_nonnull (m);
      g_assert_cmpint (p.calls, >, 2);
      g_assert_true (p.in_range);
      g_assert_cmpfloat (p.last, ==, 1.0);
      fw_matrix_unref (m);

      /* cancel immediately */
      p = (ProgressState){ .cancel_after = 0.0, .in_range = true };
      m = (FwMatrix *) 0x1;
      g_assert_cmpint (fw_analysis_run (&cfg, x, n, FW_STAGE_MFCC, threads, progress_cb, &p, &m),
                       ==, FW_DSP_ERROR_CANCELLED);
      g_assert_null (m);

      /* cancel part-way through the frames */
      p = (ProgressState){ .cancel_after = 0.3, .in_range = true };
      m = (FwMatrix *) 0x1;
      g_assert_cmpint (fw_analysis_run (&cfg, x, n, FW_STAGE_SPECTRUM, threads, progress_cb, &p, &m),
                       ==, FW_DSP_ERROR_CANCELLED);
      g_assert_null (m);
      g_assert_cmpfloat (p.last, >=, 0.3);
      g_assert_cmpfloat (p.last, <, 1.0);
    }
  g_free (x);
}

/* Too-short signals: FW_DSP_ERROR_TOO_SHORT (fw-dsp-types.h) and no matrix. */
static void
test_too_short (void)
{
  FwAnalysisConfig cfg = fw_test_config ();
  float x[4096] = { 0 };
  FwMatrix *m = (FwMatrix *) 0x1;

  cfg.centered = false;
  g_assert_cmpint (fw_analysis_run (&cfg, x, 2047, FW_STAGE_SPECTRUM, 1, NULL, NULL, &m), ==,
                   FW_DSP_ERROR_TOO_SHORT);
  g_assert_null (m);
  g_assert_cmpint (fw_analysis_run (&cfg, x, 2048, FW_STAGE_RMS, 1, NULL, NULL, &m), ==, FW_DSP_OK);
  fw_matrix_unref (m);
  cfg.centered = true;
  g_assert_cmpint (fw_analysis_run (&cfg, x, 0, FW_STAGE_MFCC, 1, NULL, NULL, &m), ==,
                   FW_DSP_ERROR_TOO_SHORT);
  g_assert_null (m);
  g_assert_cmpstr (fw_dsp_status_describe (FW_DSP_ERROR_TOO_SHORT), ==,
                   "signal shorter than one frame");
  /* A one-sample clip with reflect padding is framed by repetition (never read out of
   * bounds; ASan build checks this). */
  cfg.padding = FW_PADDING_REFLECT;
  x[0] = 0.25f;
  g_assert_cmpint (fw_analysis_run (&cfg, x, 1, FW_STAGE_RMS, 1, NULL, NULL, &m), ==, FW_DSP_OK);
  g_assert_cmpuint (m->n_frames, ==, 1);
  fw_assert_close (fw_matrix_get (m, 0, 0), 0.25, 1e-7, 0);
  fw_matrix_unref (m);
}

/* Silence: the log floor keeps every stage finite (no NaN, no infinity), in both spectrum
 * kinds and with the reference at the matrix maximum (0 for silence). */
static void
test_silence_finite (void)
{
  size_t n = 22050;
  float *x = g_new0 (float, n);

  for (int v = 0; v < 5; v++)
    for (int refmax = 0; refmax < 2; refmax++)
      {
        FwAnalysisConfig cfg = variant (v);
        cfg.db_reference_max = refmax;
        for (int s = 0; s < FW_N_STAGES; s++)
          {
            FwMatrix *m = fw_test_run (&cfg, x, n, (FwStage) s, 2);
            for (size_t i = 0; i < m->n_frames * m->n_bins; i++)
              g_assert_true (isfinite (m->data[i]));
            fw_matrix_unref (m);
          }
      }
  g_free (x);
}

/* Parameters outside their documented ranges (fw-analysis.h) are refused. */
static void
test_invalid (void)
{
  float x[4096] = { 0 };
  FwMatrix *m = NULL;
  FwAnalysisConfig good = fw_test_config (), c;

  g_assert_cmpint (fw_analysis_check (&good), ==, FW_DSP_OK);
#define BAD(field, value)                                                              \
  c = good;                                                                            \
  c.field = value;                                                                     \
  g_assert_cmpint (fw_analysis_check (&c), ==, FW_DSP_ERROR_INVALID_ARGUMENT);         \
  g_assert_cmpint (fw_analysis_run (&c, x, 4096, FW_STAGE_MFCC, 1, NULL, NULL, &m), ==, \
                   FW_DSP_ERROR_INVALID_ARGUMENT);                                     \
  g_assert_null (m);
  BAD (sample_rate, 0.0);
  BAD (sample_rate, NAN);
  BAD (pre_emphasis, 1.0);
  BAD (pre_emphasis, -0.1);
  BAD (hop_length, 0);
  BAD (window_length, 0);
  BAD (fft_length, 1024); /* < window_length 2048 */
  BAD (fmax, 11025.5);
  BAD (fmin, 11025.0);
  BAD (fmin, -1.0);
  BAD (db_reference, 0.0);
  BAD (db_floor, 0.0);
  BAD (dynamic_range, -1.0);
  BAD (cepstral_count, 0);
  BAD (cepstral_count, 129);
  BAD (mel_bands, 0);
  BAD (lifter, -1.0);
  BAD (delta_width, 0);
  BAD (window, FW_N_WINDOWS);
#undef BAD
  g_assert_cmpint (fw_analysis_run (&good, x, 4096, FW_STAGE_SIGNAL, 1, NULL, NULL, &m), ==,
                   FW_DSP_ERROR_INVALID_ARGUMENT);
  g_assert_cmpint (fw_analysis_run (&good, x, 4096, FW_N_STAGES, 1, NULL, NULL, &m), ==,
                   FW_DSP_ERROR_INVALID_ARGUMENT);
  /* db_reference is unused (may be 0) when the reference is the matrix maximum */
  c = good;
  c.db_reference = 0.0;
  c.db_reference_max = true;
  g_assert_cmpint (fw_analysis_check (&c), ==, FW_DSP_OK);
}

static void
test_names (void)
{
  static const char *const names[] = { "power", "db", "mel", "mel-db", "mfcc", "delta",
                                       "delta2", "rms", "zcr", "centroid", "bandwidth",
                                       "rolloff", "flatness" };
  FwStage s;

  G_STATIC_ASSERT (G_N_ELEMENTS (names) == FW_N_STAGES);
  for (int i = 0; i < FW_N_STAGES; i++)
    {
      g_assert_cmpstr (fw_stage_name ((FwStage) i), ==, names[i]);
      g_assert_true (fw_stage_from_name (names[i], &s));
      g_assert_cmpint (s, ==, i);
    }
  g_assert_true (fw_stage_from_name ("magnitude", &s));
  g_assert_cmpint (s, ==, FW_STAGE_SPECTRUM);
  g_assert_false (fw_stage_from_name ("spectrum", &s));
  g_assert_cmpstr (fw_stage_display_name (FW_STAGE_SPECTRUM, FW_SPECTRUM_MAGNITUDE), ==, "magnitude");
  g_assert_cmpstr (fw_stage_display_name (FW_STAGE_MFCC, FW_SPECTRUM_MAGNITUDE), ==, "mfcc");
  g_assert_cmpint (fw_stage_parent (FW_STAGE_MFCC), ==, FW_STAGE_MEL_DB);
  g_assert_cmpint (fw_stage_parent (FW_STAGE_MEL_DB), ==, FW_STAGE_MEL);
  g_assert_cmpint (fw_stage_parent (FW_STAGE_DELTA2), ==, FW_STAGE_DELTA);
  g_assert_cmpint (fw_stage_parent (FW_STAGE_FLATNESS), ==, FW_STAGE_SPECTRUM);
  g_assert_cmpint (fw_stage_parent (FW_STAGE_RMS), ==, FW_STAGE_SIGNAL);
  g_assert_cmpint (fw_stage_parent (FW_STAGE_SPECTRUM), ==, FW_STAGE_SIGNAL);
  {
    FwPadding p;
    FwSpectrumKind k;
    g_assert_true (fw_padding_from_name ("reflect", &p));
    g_assert_cmpint (p, ==, FW_PADDING_REFLECT);
    g_assert_cmpstr (fw_padding_name (FW_PADDING_EDGE), ==, "edge");
    g_assert_false (fw_padding_from_name ("symmetric", &p));
    g_assert_true (fw_spectrum_kind_from_name ("magnitude", &k));
    g_assert_cmpint (k, ==, FW_SPECTRUM_MAGNITUDE);
    g_assert_false (fw_spectrum_kind_from_name ("amplitude", &k));
  }
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/dsp/analysis/descriptors-tone", test_spectral_descriptors_tone);
  g_test_add_func ("/fw/dsp/analysis/flatness", test_flatness);
  g_test_add_func ("/fw/dsp/analysis/rms", test_rms);
  g_test_add_func ("/fw/dsp/analysis/zcr", test_zcr);
  g_test_add_func ("/fw/dsp/analysis/run-equals-derive", test_run_equals_derive);
  g_test_add_func ("/fw/dsp/analysis/threads-identical", test_threads_identical);
  g_test_add_func ("/fw/dsp/analysis/axes", test_axes);
  g_test_add_func ("/fw/dsp/analysis/mfcc-is-dct-of-mel-db", test_mfcc_is_dct_of_mel_db);
  g_test_add_func ("/fw/dsp/analysis/progress-cancel", test_progress_cancel);
  g_test_add_func ("/fw/dsp/analysis/too-short", test_too_short);
  g_test_add_func ("/fw/dsp/analysis/silence-finite", test_silence_finite);
  g_test_add_func ("/fw/dsp/analysis/invalid", test_invalid);
  g_test_add_func ("/fw/dsp/analysis/names", test_names);
  {
    int rc = g_test_run ();
    fw_fft_cleanup ();
    return rc;
  }
}
