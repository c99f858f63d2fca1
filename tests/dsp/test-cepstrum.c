/* test-cepstrum.c: DCT-II in both normalisations and the sinusoidal lifter.
 *
 * Sources: check-values.md §3 (scipy dct conventions, PUB✓ scipy docs; NUM values computed
 * with scipy 1.10.1) and §3.2 (HTK lifter formula, PUB✓; L = 22 table NUM). */
#include "fw-cepstrum.h"
#include "fw-test-dsp.h"

/* check-values.md §3.1 NUM, x = [1, 2, 3, 4] (10 decimals printed), plus the closed forms
 * y1(None) = -(6 cos(pi/8) + 2 cos(3pi/8)), y3(None) = 2 cos(pi/8) - 6 cos(3pi/8), y2 = 0. */
static void
test_ramp (void)
{
  const double x[4] = { 1, 2, 3, 4 };
  double none[4], ortho[4];

  fw_dct2 (x, 4, none, 4, FW_DCT_NORM_NONE);
  fw_dct2 (x, 4, ortho, 4, FW_DCT_NORM_ORTHO);
  fw_assert_close (none[0], 20.0, 1e-12, 0);
  fw_assert_close (none[1], -6.3086440598, 5e-11, 0);
  fw_assert_close (none[2], 0.0, 1e-12, 0);
  fw_assert_close (none[3], -0.4483415292, 5e-11, 0);
  fw_assert_close (ortho[0], 5.0, 1e-12, 0);
  fw_assert_close (ortho[1], -2.2304424974, 5e-11, 0);
  fw_assert_close (ortho[2], 0.0, 1e-12, 0);
  fw_assert_close (ortho[3], -0.1585126678, 5e-11, 0);
  fw_assert_close (none[1], -(6.0 * cos (M_PI / 8) + 2.0 * cos (3 * M_PI / 8)), 1e-12, 0);
  fw_assert_close (none[3], 2.0 * cos (M_PI / 8) - 6.0 * cos (3 * M_PI / 8), 1e-12, 0);

  /* Fewer outputs than inputs: the first n_out coefficients (cepstral_count). */
  {
    double two[2];
    fw_dct2 (x, 4, two, 2, FW_DCT_NORM_ORTHO);
    fw_assert_close (two[0], 5.0, 1e-12, 0);
    fw_assert_close (two[1], ortho[1], 1e-15, 0);
  }
}

/* check-values.md §3.1 NUM: 23 channels all -3.0 give ortho c0 = -3 sqrt(23) = -14.38749457,
 * scipy-None c0 = -138; every other coefficient below 6e-16 (we allow 1e-12). */
static void
test_constant (void)
{
  double x[23], none[23], ortho[23];

  for (int i = 0; i < 23; i++)
    x[i] = -3.0;
  fw_dct2 (x, 23, none, 23, FW_DCT_NORM_NONE);
  fw_dct2 (x, 23, ortho, 23, FW_DCT_NORM_ORTHO);
  fw_assert_close (ortho[0], -3.0 * sqrt (23.0), 1e-12, 0);
  fw_assert_close (ortho[0], -14.38749457, 5e-9, 0);
  fw_assert_close (none[0], -138.0, 1e-12, 0);
  for (int k = 1; k < 23; k++)
    {
      fw_assert_close (none[k], 0.0, 1e-12, 0);
      fw_assert_close (ortho[k], 0.0, 1e-12, 0);
    }
}

/* check-values.md §3.1 NUM: x_j = cos(3 pi (j - 0.5)/M), j = 1..M, M = 26 gives ortho
 * y3 = sqrt(M/2) = 3.605551275464 and everything else below 1.2e-15 (we allow 1e-12). */
static void
test_cosine_basis (void)
{
  double x[26], y[26];

  for (int j = 0; j < 26; j++)
    x[j] = cos (3.0 * M_PI * (j + 0.5) / 26.0);
  fw_dct2 (x, 26, y, 26, FW_DCT_NORM_ORTHO);
  for (int k = 0; k < 26; k++)
    fw_assert_close (y[k], k == 3 ? 3.605551275464 : 0.0, 1e-12, 0);
}

/* check-values.md §3 NUM: the ortho matrix C satisfies max |C C^T - I| = 2.2e-16 (we allow
 * 1e-13); the rows of the unnormalised matrix have squared norms 4N (k = 0) and 2N. */
static void
test_orthonormal (void)
{
  enum { N = 40 };
  static double c[N][N], u[N][N];
  double e[N];

  for (int j = 0; j < N; j++)
    {
      double col[N];
      for (int i = 0; i < N; i++)
        e[i] = (i == j);
      fw_dct2 (e, N, col, N, FW_DCT_NORM_ORTHO);
      for (int k = 0; k < N; k++)
        c[k][j] = col[k];
      fw_dct2 (e, N, col, N, FW_DCT_NORM_NONE);
      for (int k = 0; k < N; k++)
        u[k][j] = col[k];
    }
  for (int a = 0; a < N; a++)
    for (int b = 0; b < N; b++)
      {
        double dot = 0.0, udot = 0.0;
        for (int j = 0; j < N; j++)
          {
            dot += c[a][j] * c[b][j];
            udot += u[a][j] * u[b][j];
          }
        fw_assert_close (dot, a == b ? 1.0 : 0.0, 1e-13, 0);
        fw_assert_close (udot, a != b ? 0.0 : (a == 0 ? 4.0 * N : 2.0 * N), 1e-10, 0);
      }
}

/* check-values.md §3.2 NUM: lifter weights for L = 22 (10 decimals), maximum 1 + L/2 = 12 at
 * n = 11, symmetric about it. */
static void
test_lifter (void)
{
  static const double table[13] = {
    1.0000000000, 2.5654632210, 4.0990581253, 5.5695651430, 6.9470489920, 8.2034680734,
    9.3132453179, 10.2537888611, 11.0059519489, 11.5544227098, 11.8880358607, 12.0000000000,
    11.8880358607,
  };
  double w[23];

  fw_lifter_weights (13, 22.0, w);
  for (int n = 0; n < 13; n++)
    fw_assert_close (w[n], table[n], 5e-11, 0);
  fw_lifter_weights (23, 22.0, w);
  for (int n = 0; n <= 11; n++)
    fw_assert_close (w[11 - n], w[11 + n], 1e-12, 0);
  fw_assert_close (w[11], 12.0, 1e-12, 0);
  /* Lifter off (L = 0): all weights 1 (fw-cepstrum.h). */
  fw_lifter_weights (13, 0.0, w);
  for (int n = 0; n < 13; n++)
    g_assert_cmpfloat (w[n], ==, 1.0);
}

/* The per-frame plan (float in/out, double accumulation) equals the double DCT times the
 * lifter weights to float precision, and unliftering (dividing by w_n) restores the plain
 * coefficients (check-values.md §3 "Test use"). */
static void
test_plan (void)
{
  enum { NIN = 128, NOUT = 20 };
  float in[NIN], out[NOUT], plain[NOUT];
  double din[NIN], ref[NOUT], w[NOUT];

  fw_test_fill_noise (in, NIN, 7, 40.0);
  for (int i = 0; i < NIN; i++)
    din[i] = in[i];
  fw_lifter_weights (NOUT, 22.0, w);
  for (int norm = 0; norm < 2; norm++)
    {
      FwDctPlan *p = fw_dct_plan_new (NIN, NOUT, (FwDctNorm) norm, 22.0);
      FwDctPlan *q = fw_dct_plan_new (NIN, NOUT, (FwDctNorm) norm, 0.0);
      double scale = 0.0;

      fw_dct2 (din, NIN, ref, NOUT, (FwDctNorm) norm);
      for (int k = 0; k < NOUT; k++)
        scale = fmax (scale, fabs (ref[k]));
      fw_dct_plan_apply (p, in, out);
      fw_dct_plan_apply (q, in, plain);
      for (int k = 0; k < NOUT; k++)
        {
          /* float output: relative 1e-6 of the largest coefficient */
          fw_assert_close (out[k], ref[k] * w[k], 1e-6 * scale * w[k], 0);
          fw_assert_close (out[k] / w[k], plain[k], 1e-6 * scale, 0);
        }
      fw_dct_plan_free (p);
      fw_dct_plan_free (q);
    }
}

static void
test_names (void)
{
  FwDctNorm n;
  g_assert_cmpstr (fw_dct_norm_name (FW_DCT_NORM_ORTHO), ==, "ortho");
  g_assert_cmpstr (fw_dct_norm_name (FW_DCT_NORM_NONE), ==, "none");
  g_assert_true (fw_dct_norm_from_name ("none", &n));
  g_assert_cmpint (n, ==, FW_DCT_NORM_NONE);
  g_assert_false (fw_dct_norm_from_name ("ortho2", &n));
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/dsp/cepstrum/ramp-1234", test_ramp);
  g_test_add_func ("/fw/dsp/cepstrum/constant", test_constant);
  g_test_add_func ("/fw/dsp/cepstrum/cosine-basis", test_cosine_basis);
  g_test_add_func ("/fw/dsp/cepstrum/orthonormal", test_orthonormal);
  g_test_add_func ("/fw/dsp/cepstrum/lifter-22", test_lifter);
  g_test_add_func ("/fw/dsp/cepstrum/plan", test_plan);
  g_test_add_func ("/fw/dsp/cepstrum/names", test_names);
  return g_test_run ();
}
