/* test-mel.c: mel scales and triangular filterbanks.
 *
 * Sources: check-values.md §2 (HTK Book §5.4 / O'Shaughnessy 1987 formula, Slaney 1998
 * Auditory Toolbox parameters; NUM values computed with numpy in double precision) and §8
 * (filterbank normalisations). */
#include "fw-mel.h"
#include "fw-test-dsp.h"

typedef struct
{
  double hz, htk, slaney;
} MelRow;

/* check-values.md §2.1 NUM: 2595 log10 column (6 decimals) and Slaney column (8 decimals). */
static const MelRow forward_table[] = {
  { 0.0, 0.000000, 0.00000000 },
  { 64.0, 98.597852, 0.96000000 },
  { 400.0 / 3.0, 196.495253, 2.00000000 },
  { 700.0, 781.172839, 10.50000000 },
  { 1000.0, 999.985537, 15.00000000 },
  { 2000.0, 1521.359554, 25.08188016 },
  { 4000.0, 2146.064528, 35.16376031 },
  { 6400.0, 2610.986001, 42.00000000 },
  { 8000.0, 2840.023047, 45.24564047 },
  { 11025.0, 3176.318436, 49.91059448 },
  { 16000.0, 3574.919829, 55.32752063 },
  { 22050.0, 3923.337322, 59.99247464 },
};

static void
test_forward (void)
{
  for (size_t i = 0; i < G_N_ELEMENTS (forward_table); i++)
    {
      const MelRow *r = &forward_table[i];
      /* Tolerance: half a unit of the printed last digit plus double rounding. */
      fw_assert_close (fw_hz_to_mel (FW_MEL_SCALE_HTK, r->hz), r->htk, 5e-7, 1e-12);
      fw_assert_close (fw_hz_to_mel (FW_MEL_SCALE_SLANEY, r->hz), r->slaney, 5e-9, 1e-12);
    }
}

/* check-values.md §2.1/§10.5: under the HTK formula 1000 Hz is 999.985537 mel, not 1000;
 * the natural-log variant 1127 ln(1 + f/700) gives 999.990701, 0.005164 mel more. A silent
 * swap of the two forms would move the value by that much. */
static void
test_htk_1000 (void)
{
  double m = fw_hz_to_mel (FW_MEL_SCALE_HTK, 1000.0);
  fw_assert_close (m, 999.985537, 5e-7, 0);
  fw_assert_close (1127.0 * log (1.0 + 1000.0 / 700.0) - m, 0.005164, 5e-7, 0);
}

/* check-values.md §2 "Test use": Slaney mel(1000) = 15 exactly, and the scale is continuous
 * at the 1000 Hz break (linear 3f/200 below, logarithmic above). */
static void
test_slaney_1000 (void)
{
  g_assert_cmpfloat (fw_hz_to_mel (FW_MEL_SCALE_SLANEY, 1000.0), ==, 15.0);
  g_assert_cmpfloat (fw_mel_to_hz (FW_MEL_SCALE_SLANEY, 15.0), ==, 1000.0);
  /* Just below the break the linear branch applies: 3 * 999.999 / 200. */
  fw_assert_close (fw_hz_to_mel (FW_MEL_SCALE_SLANEY, 999.999), 3.0 * 999.999 / 200.0, 0, 1e-15);
  /* Just above: 15 + 27 ln(1.000001)/ln(6.4), continuous with the linear branch to 1e-8. */
  fw_assert_close (fw_hz_to_mel (FW_MEL_SCALE_SLANEY, 1000.001), 15.0, 2e-5, 0);
  fw_assert_close (fw_hz_to_mel (FW_MEL_SCALE_SLANEY, 1000.001),
                   15.0 + 27.0 * log (1.000001) / log (6.4), 0, 1e-14);
}

/* check-values.md §2.2 NUM inverses (6 decimals). */
static void
test_inverse (void)
{
  static const double htk[][2] = {
    { 500, 390.878211 }, { 1000, 1000.021816 }, { 1500, 1949.309654 },
    { 2000, 3428.677395 }, { 3000, 9326.916635 },
  };
  static const double slaney[][2] = {
    { 10.5, 700.000000 }, { 15, 1000.000000 }, { 20, 1410.238568 },
    { 30, 2804.644131 }, { 40, 5577.800012 }, { 42, 6400.000000 },
  };

  for (size_t i = 0; i < G_N_ELEMENTS (htk); i++)
    fw_assert_close (fw_mel_to_hz (FW_MEL_SCALE_HTK, htk[i][0]), htk[i][1], 5e-7, 1e-12);
  for (size_t i = 0; i < G_N_ELEMENTS (slaney); i++)
    fw_assert_close (fw_mel_to_hz (FW_MEL_SCALE_SLANEY, slaney[i][0]), slaney[i][1], 5e-7, 1e-12);
}

/* check-values.md §2.2 NUM: forward then inverse over 0..22050 Hz returns within 7e-12 Hz
 * (HTK) and 1.8e-11 Hz (Slaney) in numpy; we allow 1e-9 Hz. */
static void
test_round_trip (void)
{
  for (int s = 0; s < 2; s++)
    {
      double worst = 0.0;
      for (int i = 0; i <= 22050 * 4; i++)
        {
          double f = i * 0.25;
          double back = fw_mel_to_hz ((FwMelScale) s, fw_hz_to_mel ((FwMelScale) s, f));
          worst = fmax (worst, fabs (back - f));
        }
      g_assert_cmpfloat (worst, <, 1e-9);
    }
}

static double
triangle_ref (const double *f, size_t m, double fk)
{
  /* Issue 2, stage 6: triangle linear in Hz from f[m] up to f[m+1] and down to f[m+2]. */
  double up = (fk - f[m]) / (f[m + 1] - f[m]);
  double down = (f[m + 2] - fk) / (f[m + 2] - f[m + 1]);
  return fmax (0.0, fmin (up, down));
}

/* The bank against the written definition (issue 2 stage 6; fw-mel.h): edges equally spaced
 * in mel, triangle weights at k sr / n_fft, `area` = unit x 2/(f[m+2] - f[m]). */
static void
test_bank_definition (void)
{
  for (int s = 0; s < 2; s++)
    for (int w = 0; w < 2; w++)
      {
        FwDspStatus st;
        FwMelBank *bank = fw_mel_bank_new ((FwMelScale) s, (FwMelWeights) w, 40, 30.0, 8000.0,
                                           16000.0, 512, &st);
        const double *e;
        double mlo, mhi;

        g_assert_nonnull (bank);
        g_assert_cmpint (st, ==, FW_DSP_OK);
        g_assert_cmpuint (fw_mel_bank_n_bands (bank), ==, 40);
        g_assert_cmpuint (fw_mel_bank_n_bins (bank), ==, 257);
        e = fw_mel_bank_edges_hz (bank);
        g_assert_cmpfloat (e[0], ==, 30.0);
        g_assert_cmpfloat (e[41], ==, 8000.0);
        mlo = fw_hz_to_mel ((FwMelScale) s, 30.0);
        mhi = fw_hz_to_mel ((FwMelScale) s, 8000.0);
        for (size_t i = 1; i < 41; i++)
          fw_assert_close (e[i], fw_mel_to_hz ((FwMelScale) s, mlo + (mhi - mlo) * i / 41.0), 0, 1e-12);
        for (size_t m = 0; m < 40; m++)
          for (size_t k = 0; k < 257; k++)
            {
              double ref = triangle_ref (e, m, k * 16000.0 / 512.0);
              if (w == FW_MEL_WEIGHTS_AREA)
                ref *= 2.0 / (e[m + 2] - e[m]);
              fw_assert_close (fw_mel_bank_weight (bank, m, k), ref, 1e-15, 1e-12);
            }
        fw_mel_bank_free (bank);
      }
}

/* check-values.md §8 (PUB✓ / CP): Slaney-style area-normalised triangles integrate to 1 in Hz;
 * HTK-style unit triangles peak at 1, and neighbours on a shared edge grid sum to 1 between
 * the first and last centres (partition of unity, a derivation). A fine FFT grid (n_fft = 2^18
 * at 22050 Hz, 0.084 Hz per bin) makes the Riemann sum of the area-normalised triangles
 * exact to O(df^2 / width^2). */
static void
test_bank_normalisation (void)
{
  const double sr = 22050.0;
  const size_t nfft = 1 << 18;
  const double df = sr / nfft;
  FwMelBank *area = fw_mel_bank_new (FW_MEL_SCALE_HTK, FW_MEL_WEIGHTS_AREA, 40, 0.0, 11025.0,
                                     sr, nfft, NULL);
  FwMelBank *unit = fw_mel_bank_new (FW_MEL_SCALE_HTK, FW_MEL_WEIGHTS_UNIT, 40, 0.0, 11025.0,
                                     sr, nfft, NULL);
  const double *e = fw_mel_bank_edges_hz (unit);
  size_t nbins = fw_mel_bank_n_bins (unit);

  g_assert_nonnull (area);
  g_assert_nonnull (unit);
  for (size_t m = 0; m < 40; m++)
    {
      double integral = 0.0, peak = 0.0;
      for (size_t k = 0; k < nbins; k++)
        {
          integral += fw_mel_bank_weight (area, m, k) * df;
          peak = fmax (peak, fw_mel_bank_weight (unit, m, k));
        }
      fw_assert_close (integral, 1.0, 1e-6, 0);
      /* The bin nearest the centre is at most df/2 away: the peak is within
       * (df/2) / (shorter half-width) of 1, and never above 1. */
      g_assert_cmpfloat (peak, <=, 1.0);
      g_assert_cmpfloat (1.0 - peak, <=, 0.5 * df / fmin (e[m + 1] - e[m], e[m + 2] - e[m + 1]));
    }
  /* Partition of unity between the first and last centres (unit weights). */
  for (size_t k = 0; k < nbins; k++)
    {
      double f = k * df, sum = 0.0;
      if (f < e[1] || f > e[40])
        continue;
      for (size_t m = 0; m < 40; m++)
        sum += fw_mel_bank_weight (unit, m, k);
      fw_assert_close (sum, 1.0, 1e-12, 0);
    }
  fw_mel_bank_free (area);
  fw_mel_bank_free (unit);
}

/* Empty bands: with 128 Slaney bands from 0 to 11025 Hz the lowest bands are about 26 Hz
 * apart (linear part: 0.387 mel = 25.8 Hz); an FFT of 256 at 22050 Hz has 86.1 Hz bins, so
 * some low bands contain no bin inside their open support (f[m], f[m+2]). Band 0 spans
 * (0, 51.7 Hz), which holds no bin (bin 0 sits on the open edge). With n_fft = 2048
 * (10.8 Hz bins) no band is empty. The reported list must equal a brute-force search. */
static void
test_empty_bands (void)
{
  FwMelBank *bank = fw_mel_bank_new (FW_MEL_SCALE_SLANEY, FW_MEL_WEIGHTS_AREA, 128, 0.0,
                                     11025.0, 22050.0, 256, NULL);
  const double *e = fw_mel_bank_edges_hz (bank);
  size_t idx[128], n, expect = 0;

  g_assert_nonnull (bank);
  n = fw_mel_bank_empty_bands (bank, idx, G_N_ELEMENTS (idx));
  g_assert_cmpuint (n, >, 0);
  g_assert_cmpuint (idx[0], ==, 0);
  for (size_t m = 0; m < 128; m++)
    {
      bool has_bin = false;
      for (size_t k = 0; k <= 128; k++)
        {
          double f = k * 22050.0 / 256.0;
          if (f > e[m] && f < e[m + 2])
            has_bin = true;
        }
      if (!has_bin)
        {
          g_assert_cmpuint (expect, <, n);
          g_assert_cmpuint (idx[expect], ==, m);
          for (size_t k = 0; k <= 128; k++)
            g_assert_cmpfloat (fw_mel_bank_weight (bank, m, k), ==, 0.0);
          expect++;
        }
    }
  g_assert_cmpuint (expect, ==, n);
  /* A short output array still gets the full count. */
  g_assert_cmpuint (fw_mel_bank_empty_bands (bank, idx, 1), ==, n);
  fw_mel_bank_free (bank);

  bank = fw_mel_bank_new (FW_MEL_SCALE_SLANEY, FW_MEL_WEIGHTS_AREA, 128, 0.0, 11025.0, 22050.0,
                          2048, NULL);
  g_assert_cmpuint (fw_mel_bank_empty_bands (bank, NULL, 0), ==, 0);
  fw_mel_bank_free (bank);
}

/* Applying the bank: mel[m] = sum_k weight(m, k) S[k] (double accumulation, float output). */
static void
test_bank_apply (void)
{
  FwMelBank *bank = fw_mel_bank_new (FW_MEL_SCALE_SLANEY, FW_MEL_WEIGHTS_AREA, 128, 20.0,
                                     11025.0, 22050.0, 2048, NULL);
  float spec[1025], mel[128];

  fw_test_fill_noise (spec, 1025, 42, 1.0);
  for (size_t k = 0; k < 1025; k++)
    spec[k] = spec[k] * spec[k] * 1000.0f;
  fw_mel_bank_apply (bank, spec, mel);
  for (size_t m = 0; m < 128; m++)
    {
      double ref = 0.0;
      for (size_t k = 0; k < 1025; k++)
        ref += fw_mel_bank_weight (bank, m, k) * spec[k];
      fw_assert_close (mel[m], ref, 1e-30, 1e-6);
    }
  fw_mel_bank_free (bank);
}

static void
test_bank_invalid (void)
{
  FwDspStatus st = FW_DSP_OK;

  g_assert_null (fw_mel_bank_new (FW_MEL_SCALE_HTK, FW_MEL_WEIGHTS_AREA, 0, 0, 8000, 16000, 512, &st));
  g_assert_cmpint (st, ==, FW_DSP_ERROR_INVALID_ARGUMENT);
  g_assert_null (fw_mel_bank_new (FW_MEL_SCALE_HTK, FW_MEL_WEIGHTS_AREA, 40, 0, 8001, 16000, 512, &st));
  g_assert_null (fw_mel_bank_new (FW_MEL_SCALE_HTK, FW_MEL_WEIGHTS_AREA, 40, 500, 500, 16000, 512, &st));
  g_assert_null (fw_mel_bank_new (FW_MEL_SCALE_HTK, FW_MEL_WEIGHTS_AREA, 40, -1, 500, 16000, 512, &st));
  g_assert_null (fw_mel_bank_new (FW_MEL_SCALE_HTK, FW_MEL_WEIGHTS_AREA, 40, 0, 500, 16000, 1, &st));
  g_assert_cmpint (st, ==, FW_DSP_ERROR_INVALID_ARGUMENT);
}

static void
test_names (void)
{
  FwMelScale s;
  FwMelWeights w;

  g_assert_cmpstr (fw_mel_scale_name (FW_MEL_SCALE_HTK), ==, "htk");
  g_assert_cmpstr (fw_mel_scale_name (FW_MEL_SCALE_SLANEY), ==, "slaney");
  g_assert_true (fw_mel_scale_from_name ("slaney", &s));
  g_assert_cmpint (s, ==, FW_MEL_SCALE_SLANEY);
  g_assert_false (fw_mel_scale_from_name ("mel", &s));
  g_assert_cmpstr (fw_mel_weights_name (FW_MEL_WEIGHTS_UNIT), ==, "unit");
  g_assert_true (fw_mel_weights_from_name ("area", &w));
  g_assert_cmpint (w, ==, FW_MEL_WEIGHTS_AREA);
  g_assert_false (fw_mel_weights_from_name ("slaney", &w));
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/dsp/mel/forward", test_forward);
  g_test_add_func ("/fw/dsp/mel/htk-1000hz", test_htk_1000);
  g_test_add_func ("/fw/dsp/mel/slaney-1000hz", test_slaney_1000);
  g_test_add_func ("/fw/dsp/mel/inverse", test_inverse);
  g_test_add_func ("/fw/dsp/mel/round-trip", test_round_trip);
  g_test_add_func ("/fw/dsp/mel/bank-definition", test_bank_definition);
  g_test_add_func ("/fw/dsp/mel/bank-normalisation", test_bank_normalisation);
  g_test_add_func ("/fw/dsp/mel/empty-bands", test_empty_bands);
  g_test_add_func ("/fw/dsp/mel/bank-apply", test_bank_apply);
  g_test_add_func ("/fw/dsp/mel/bank-invalid", test_bank_invalid);
  g_test_add_func ("/fw/dsp/mel/names", test_names);
  return g_test_run ();
}
