/* test-diff.c: alignment, measures and the offset/lag/residual explanation of fw-diff.c on
 * synthetic matrices. Every difference here is a planted perturbation of a known size; each
 * check says which. Closed forms are named where a number is derived (10 log10 2 etc.). */
#include <glib.h>
#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "fw-diff.h"

/* Deterministic uniform noise in [-1, 1) (xorshift64*, fixed seed). */
static double
noise (uint64_t *s)
{
  *s ^= *s >> 12;
  *s ^= *s << 25;
  *s ^= *s >> 27;
  return (double) ((*s * 2685821657736338717ULL) >> 11) / 9007199254740992.0 * 2.0 - 1.0;
}

/* A "dB-like" matrix: a slowly moving spectral shape plus fixed-seed noise; frames at
 * hop seconds from t0, bins as mel bands at 100 Hz steps. */
static FwMatrix *
make_matrix (size_t n_frames, size_t n_bins, double hop, double t0, uint64_t seed)
{
  FwMatrix *m = fw_matrix_new (n_frames, n_bins);
  uint64_t s = seed;

  g_assert_nonnull (m);
  for (size_t t = 0; t < n_frames; t++)
    {
      m->frame_times[t] = t0 + (double) t * hop;
      for (size_t k = 0; k < n_bins; k++)
        m->data[t * n_bins + k] = (float) (-40.0 + 10.0 * sin (0.05 * (double) t + 0.3 * (double) k)
                                           + 6.0 * noise (&s));
    }
  for (size_t k = 0; k < n_bins; k++)
    {
      m->bin_value[k] = 100.0 * (double) (k + 1);
      m->bin_low[k] = m->bin_value[k] - 50.0;
      m->bin_high[k] = m->bin_value[k] + 50.0;
    }
  m->bin_kind = FW_BIN_AXIS_MEL_BAND;
  m->hop_seconds = hop;
  m->sample_rate = 22050;
  m->stage = -1;
  return m;
}

static FwDiffResult *
diff (const FwMatrix *a, const FwMatrix *b, FwDiffValueKind kind)
{
  FwDiffOptions opt;
  FwDiffResult *r = NULL;

  fw_diff_options_init (&opt);
  opt.value_kind = kind;
  g_assert_cmpint (fw_diff_compute (a, b, &opt, &r), ==, FW_DSP_OK);
  g_assert_nonnull (r);
  return r;
}

static void
test_identical (void)
{
  FwMatrix *a = make_matrix (200, 40, 0.01, 0.0, 1);
  FwMatrix *b = fw_matrix_copy (a);
  FwDiffResult *r = diff (a, b, FW_DIFF_VALUES_PLAIN);

  /* identical operands: every measure exactly zero (no tolerance) */
  g_assert_true (r->expl.identical);
  g_assert_cmpfloat (r->max_abs_diff, ==, 0.0);
  g_assert_cmpfloat (r->rms_diff, ==, 0.0);
  g_assert_cmpfloat (r->mean_diff, ==, 0.0);
  g_assert_cmpfloat (r->expl.residual_max_abs, ==, 0.0);
  g_assert_cmpfloat (r->expl.offset, ==, 0.0);
  g_assert_cmpint (r->expl.lag_frames, ==, 0);
  g_assert_cmpfloat_with_epsilon (r->correlation, 1.0, 1e-12);
  g_assert_cmpint (r->align.bin_mapping, ==, FW_DIFF_BINS_SAME);
  g_assert_false (r->align.time_resampled);
  g_assert_cmpuint (r->n_frames, ==, 200);
  g_assert_cmpuint (r->n_bins, ==, 40);
  for (size_t i = 0; i < r->n_frames * r->n_bins; i++)
    g_assert_cmpfloat (r->diff->data[i], ==, 0.0f);
  fw_diff_result_free (r);

  /* linear kinds too: ratio 0 dB, relative 0 */
  for (size_t i = 0; i < a->n_frames * a->n_bins; i++)
    a->data[i] = b->data[i] = (float) pow (10.0, a->data[i] / 10.0);
  r = diff (a, b, FW_DIFF_VALUES_POWER);
  g_assert_true (r->expl.identical);
  for (size_t i = 0; i < r->n_frames * r->n_bins; i++)
    {
      g_assert_cmpfloat (r->ratio_db->data[i], ==, 0.0f);
      g_assert_cmpfloat (r->relative->data[i], ==, 0.0f);
    }
  fw_diff_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_constant_offset (void)
{
  /* planted perturbation: B = A + 10 log10(2) dB = A + 3.0103 dB (closed form) */
  const double off = 10.0 * log10 (2.0);
  FwMatrix *a = make_matrix (300, 64, 0.01, 0.0, 2);
  FwMatrix *b = fw_matrix_copy (a);
  FwDiffResult *r;

  for (size_t i = 0; i < b->n_frames * b->n_bins; i++)
    b->data[i] = (float) (a->data[i] + off);
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_true (r->expl.has_offset);
  g_assert_false (r->expl.has_bin_offset);
  g_assert_false (r->expl.has_lag);
  g_assert_cmpfloat_with_epsilon (r->expl.offset, off, 1e-5);  /* float32 rounding of ~40 dB */
  g_assert_cmpfloat_with_epsilon (r->mean_diff, off, 1e-5);
  g_assert_cmpfloat (r->expl.residual_max_abs, <, 1e-5);
  fw_diff_result_free (r);

  /* the same offset seen in linear power values: B = 2 A, explained in dB */
  for (size_t i = 0; i < a->n_frames * a->n_bins; i++)
    {
      a->data[i] = (float) pow (10.0, a->data[i] / 10.0);
      b->data[i] = 2.0f * a->data[i];
    }
  r = diff (a, b, FW_DIFF_VALUES_POWER);
  g_assert_true (r->expl.in_db);
  g_assert_true (r->expl.has_offset);
  g_assert_false (r->expl.has_bin_offset);
  g_assert_cmpfloat_with_epsilon (r->expl.offset, off, 1e-6);
  g_assert_cmpfloat_with_epsilon (r->ratio_db->data[17], off, 1e-5);
  g_assert_cmpfloat_with_epsilon (r->relative->data[17], 1.0, 1e-6);  /* (2A - A) / A */
  fw_diff_result_free (r);

  /* amplitude values: B = 2 A is 20 log10 2 = 6.0206 dB (closed form) */
  r = diff (a, b, FW_DIFF_VALUES_AMPLITUDE);
  g_assert_cmpfloat_with_epsilon (r->expl.offset, 20.0 * log10 (2.0), 1e-6);
  fw_diff_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_per_band_gain (void)
{
  /* planted perturbation: a gain of g_k = 0.25 k - 2 dB in band k */
  FwMatrix *a = make_matrix (250, 32, 0.01, 0.0, 3);
  FwMatrix *b = fw_matrix_copy (a);
  FwDiffResult *r;
  double mean_g = 0;

  for (size_t k = 0; k < 32; k++)
    mean_g += (0.25 * (double) k - 2.0) / 32.0;
  for (size_t t = 0; t < 250; t++)
    for (size_t k = 0; k < 32; k++)
      b->data[t * 32 + k] = (float) (a->data[t * 32 + k] + 0.25 * (double) k - 2.0);
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_true (r->expl.has_bin_offset);
  g_assert_false (r->expl.has_lag);
  g_assert_cmpfloat_with_epsilon (r->expl.offset, mean_g, 1e-5);
  for (size_t k = 0; k < 32; k++)
    g_assert_cmpfloat_with_epsilon (r->expl.offset + r->expl.bin_offset[k],
                                    0.25 * (double) k - 2.0, 1e-5);
  /* the largest per-band part is at the top band: 0.25*31 - 2 - mean */
  g_assert_cmpuint (r->expl.bin_offset_argmax, ==, 31);
  g_assert_cmpfloat (r->expl.residual_max_abs, <, 1e-5);
  /* the per-bin curve of B - A is the gain itself */
  g_assert_cmpfloat_with_epsilon (r->bin_mean[10], 0.5, 1e-5);
  fw_diff_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_lag (gconstpointer data)
{
  /* planted perturbation: B[t] = A[t - lag] (first frames replicated), with a 1.5 dB offset */
  int lag = GPOINTER_TO_INT (data);
  FwMatrix *a = make_matrix (300, 24, 0.01, 0.0, 4);
  FwMatrix *b = fw_matrix_copy (a);
  FwDiffResult *r;

  for (int t = 0; t < 300; t++)
    {
      int src = CLAMP (t - lag, 0, 299);
      for (size_t k = 0; k < 24; k++)
        b->data[(size_t) t * 24 + k] = (float) (a->data[(size_t) src * 24 + k] + 1.5);
    }
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_cmpint (r->expl.lag_frames, ==, lag);
  g_assert_true (r->expl.has_lag);
  g_assert_true (r->expl.has_offset);
  g_assert_cmpfloat_with_epsilon (r->expl.offset, 1.5, 1e-5);
  g_assert_cmpuint (r->expl.frames_used, ==, 300 - (size_t) abs (lag));
  g_assert_cmpfloat (r->expl.residual_max_abs, <, 1e-5);
  /* without the shift the difference is large (noise of +-6 dB between frames) */
  g_assert_cmpfloat (r->expl.lag_rms[r->expl.max_lag], >, 1.0);
  fw_diff_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_tiny_noise (void)
{
  /* planted perturbation: uniform noise of amplitude 1e-6 on values of order 1 (MFCC-like) */
  FwMatrix *a = make_matrix (400, 13, 0.01, 0.0, 5);
  FwMatrix *b;
  FwDiffResult *r;
  uint64_t s = 99;

  for (size_t i = 0; i < a->n_frames * a->n_bins; i++)
    a->data[i] = a->data[i] / 40.0f;
  b = fw_matrix_copy (a);
  for (size_t i = 0; i < b->n_frames * b->n_bins; i++)
    b->data[i] = (float) ((double) a->data[i] + 1e-6 * noise (&s));
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_false (r->expl.identical);
  g_assert_false (r->expl.has_offset);
  g_assert_false (r->expl.has_bin_offset);
  g_assert_cmpint (r->expl.lag_frames, ==, 0);
  /* 1e-6 planted plus float32 rounding of values below 2 (ulp 1.2e-7) */
  g_assert_cmpfloat (r->expl.residual_max_abs, <, 1.5e-6);
  g_assert_cmpfloat (r->expl.residual_max_abs, >, 5e-7);
  g_assert_cmpfloat (r->max_abs_diff, <, 1.5e-6);
  fw_diff_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_per_bin_factor (void)
{
  /* planted perturbation: B = g_k A with g_0 = 4, g_k = 0.5 (DCT scaling-like), values signed */
  FwMatrix *a = make_matrix (200, 13, 0.01, 0.0, 6);
  FwMatrix *b = fw_matrix_copy (a);
  FwDiffResult *r;

  for (size_t t = 0; t < 200; t++)
    for (size_t k = 0; k < 13; k++)
      {
        a->data[t * 13 + k] += 40.0f;
        b->data[t * 13 + k] = (k == 0 ? 4.0f : 0.5f) * a->data[t * 13 + k];
      }
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_true (r->expl.has_bin_scale);
  g_assert_cmpfloat_with_epsilon (r->expl.bin_scale[0], 4.0, 1e-6);
  g_assert_cmpfloat_with_epsilon (r->expl.bin_scale[5], 0.5, 1e-6);
  g_assert_cmpfloat (r->expl.scale_residual_rms, <, 1e-5);
  fw_diff_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_shape_mismatch (void)
{
  /* planted: B is A without its last 2 frames (998 against 1000, same hop) */
  FwMatrix *a = make_matrix (1000, 20, 512.0 / 22050.0, 0.0, 7);
  FwMatrix *b = fw_matrix_new (998, 20);
  FwDiffResult *r;

  memcpy (b->data, a->data, sizeof (float) * 998 * 20);
  memcpy (b->frame_times, a->frame_times, sizeof (double) * 998);
  memcpy (b->bin_value, a->bin_value, sizeof (double) * 20);
  memcpy (b->bin_low, a->bin_low, sizeof (double) * 20);
  memcpy (b->bin_high, a->bin_high, sizeof (double) * 20);
  b->bin_kind = a->bin_kind;
  b->hop_seconds = a->hop_seconds;
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_cmpuint (r->align.a_frames, ==, 1000);
  g_assert_cmpuint (r->align.b_frames, ==, 998);
  g_assert_cmpuint (r->n_frames, ==, 998);
  g_assert_cmpuint (r->align.a_unused_frames, ==, 2);
  g_assert_cmpuint (r->align.b_unused_frames, ==, 0);
  g_assert_false (r->align.time_resampled);
  g_assert_true (r->expl.identical);
  fw_diff_result_free (r);

  /* B starting 3 frames later than A (frame origins a whole number of hops apart) */
  for (size_t t = 0; t < 998; t++)
    {
      b->frame_times[t] = a->frame_times[t + 2];
      memcpy (b->data + t * 20, a->data + (t + 2) * 20, sizeof (float) * 20);
    }
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_false (r->align.time_resampled);
  g_assert_cmpint (r->align.index_shift, ==, -2);  /* B frame = A frame - 2 */
  g_assert_cmpuint (r->n_frames, ==, 998);
  g_assert_true (r->expl.identical);
  fw_diff_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_time_interpolation (void)
{
  /* A at hop 20 ms, B at hop 10 ms starting 5 ms later; values linear in time, so linear
   * interpolation onto A's frame centres is exact (up to float32 rounding) */
  FwMatrix *a = fw_matrix_new (100, 3), *b = fw_matrix_new (205, 3);
  FwDiffResult *r;

  for (size_t t = 0; t < 100; t++)
    {
      a->frame_times[t] = 0.02 * (double) t;
      for (size_t k = 0; k < 3; k++)
        a->data[t * 3 + k] = (float) (10.0 * a->frame_times[t] + (double) k);
    }
  for (size_t t = 0; t < 205; t++)
    {
      b->frame_times[t] = 0.005 + 0.01 * (double) t;
      for (size_t k = 0; k < 3; k++)
        b->data[t * 3 + k] = (float) (10.0 * b->frame_times[t] + (double) k);
    }
  a->hop_seconds = 0.02;
  b->hop_seconds = 0.01;
  a->bin_kind = b->bin_kind = FW_BIN_AXIS_COEFFICIENT;
  for (size_t k = 0; k < 3; k++)
    a->bin_value[k] = b->bin_value[k] = (double) k;
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_true (r->align.time_resampled);
  g_assert_cmpint (r->align.time_reference, ==, 0);       /* the coarser hop */
  g_assert_cmpfloat_with_epsilon (r->align.start, 0.02, 1e-12); /* A's first frame in B's span */
  g_assert_cmpfloat_with_epsilon (r->align.end, 1.98, 1e-12);
  g_assert_cmpuint (r->n_frames, ==, 99);
  g_assert_cmpfloat (r->max_abs_diff, <, 1e-5);
  fw_diff_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_frequency_mapping (void)
{
  /* A: 101 bins at 0..1000 Hz (10 Hz apart); B: 201 bins 5 Hz apart; values linear in Hz,
   * so interpolation onto A's bin centres is exact (up to float32 rounding) */
  FwMatrix *a = fw_matrix_new (10, 101), *b = fw_matrix_new (10, 201);
  FwDiffResult *r;

  for (size_t t = 0; t < 10; t++)
    {
      a->frame_times[t] = b->frame_times[t] = 0.01 * (double) t;
      for (size_t k = 0; k < 101; k++)
        a->data[t * 101 + k] = (float) (0.01 * 10.0 * (double) k + (double) t);
      for (size_t k = 0; k < 201; k++)
        b->data[t * 201 + k] = (float) (0.01 * 5.0 * (double) k + (double) t);
    }
  for (size_t k = 0; k < 101; k++)
    a->bin_value[k] = 10.0 * (double) k;
  for (size_t k = 0; k < 201; k++)
    b->bin_value[k] = 5.0 * (double) k;
  a->bin_kind = b->bin_kind = FW_BIN_AXIS_HZ;
  a->hop_seconds = b->hop_seconds = 0.01;
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_cmpint (r->align.bin_mapping, ==, FW_DIFF_BINS_HZ);
  g_assert_cmpint (r->align.bin_reference, ==, 0);
  g_assert_cmpuint (r->n_bins, ==, 101);
  g_assert_cmpfloat (r->max_abs_diff, <, 1e-5);
  g_assert_cmpfloat_with_epsilon (r->align.freq_high, 1000.0, 1e-9);
  fw_diff_result_free (r);

  /* C only up to 500 Hz: the common span is 0..500 Hz, 51 of A's bins */
  {
    FwMatrix *c = fw_matrix_new (10, 101);
    for (size_t t = 0; t < 10; t++)
      {
        c->frame_times[t] = 0.01 * (double) t;
        for (size_t k = 0; k < 101; k++)
          c->data[t * 101 + k] = (float) (0.01 * 5.0 * (double) k + (double) t);
      }
    for (size_t k = 0; k < 101; k++)
      c->bin_value[k] = 5.0 * (double) k;
    c->bin_kind = FW_BIN_AXIS_HZ;
    c->hop_seconds = 0.01;
    r = diff (a, c, FW_DIFF_VALUES_PLAIN);
    g_assert_cmpuint (r->n_bins, ==, 51);
    g_assert_cmpuint (r->align.a_unused_bins, ==, 50);
    g_assert_cmpfloat_with_epsilon (r->align.freq_high, 500.0, 1e-9);
    g_assert_cmpfloat (r->max_abs_diff, <, 1e-5);
    fw_diff_result_free (r);
    fw_matrix_unref (c);
  }
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_coefficients_and_no_overlap (void)
{
  FwMatrix *a = make_matrix (50, 13, 0.01, 0.0, 8);
  FwMatrix *b = make_matrix (50, 20, 0.01, 0.0, 8);
  FwMatrix *c = make_matrix (50, 13, 0.01, 10.0, 8);
  FwDiffResult *r = NULL;
  FwDiffOptions opt;

  a->bin_kind = b->bin_kind = FW_BIN_AXIS_COEFFICIENT;
  r = diff (a, b, FW_DIFF_VALUES_PLAIN);
  g_assert_cmpint (r->align.bin_mapping, ==, FW_DIFF_BINS_COMMON);
  g_assert_cmpuint (r->n_bins, ==, 13);
  g_assert_cmpuint (r->align.b_unused_bins, ==, 7);
  fw_diff_result_free (r);

  /* no common time span: an error, not a crash */
  fw_diff_options_init (&opt);
  g_assert_false (fw_diff_time_overlap (a, c, NULL, NULL));
  r = NULL;
  g_assert_cmpint (fw_diff_compute (a, c, &opt, &r), ==, FW_DSP_ERROR_INVALID_ARGUMENT);
  g_assert_null (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
  fw_matrix_unref (c);
}

static void
test_distance (void)
{
  FwMatrix *a = make_matrix (120, 16, 0.01, 0.0, 9);
  FwMatrix *b = fw_matrix_copy (a);
  FwMatrix *c = make_matrix (120, 16, 0.01, 0.0, 10);
  double rms, mx, brms, aff;

  /* planted: B = 2 A + 3 in every bin: blind to gains and offsets, so affine fraction 0 */
  for (size_t i = 0; i < b->n_frames * b->n_bins; i++)
    b->data[i] = 2.0f * a->data[i] + 3.0f;
  g_assert_cmpint (fw_diff_distance (a, b, NULL, &rms, &mx, &brms, &aff, NULL, NULL), ==,
                   FW_DSP_OK);
  g_assert_cmpfloat (aff, <, 1e-6);
  g_assert_cmpfloat (rms, >, 10.0);
  /* unrelated noise (different seed): most of the variance is left */
  g_assert_cmpint (fw_diff_distance (a, c, NULL, &rms, &mx, &brms, &aff, NULL, NULL), ==,
                   FW_DSP_OK);
  g_assert_cmpfloat (aff, >, 0.5);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
  fw_matrix_unref (c);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/compare/diff/identical-exactly-zero", test_identical);
  g_test_add_func ("/fw/compare/diff/constant-offset-3.01db", test_constant_offset);
  g_test_add_func ("/fw/compare/diff/per-band-gain", test_per_band_gain);
  g_test_add_data_func ("/fw/compare/diff/lag-plus-1", GINT_TO_POINTER (1), test_lag);
  g_test_add_data_func ("/fw/compare/diff/lag-minus-3", GINT_TO_POINTER (-3), test_lag);
  g_test_add_func ("/fw/compare/diff/noise-1e-6", test_tiny_noise);
  g_test_add_func ("/fw/compare/diff/per-bin-factor", test_per_bin_factor);
  g_test_add_func ("/fw/compare/diff/shape-998-vs-1000", test_shape_mismatch);
  g_test_add_func ("/fw/compare/diff/time-interpolation", test_time_interpolation);
  g_test_add_func ("/fw/compare/diff/frequency-mapping", test_frequency_mapping);
  g_test_add_func ("/fw/compare/diff/coefficients-and-no-overlap",
                   test_coefficients_and_no_overlap);
  g_test_add_func ("/fw/compare/diff/distance", test_distance);
  return g_test_run ();
}
