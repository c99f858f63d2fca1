/* test-window.c: window construction and figures of merit.
 *
 * Sources: check-values.md §1 (NUM values recomputed with numpy/scipy from Harris's
 * definitions; closed forms; MathWorks enbw examples; Heinzel et al. 2002 and Harris 1978
 * Table 1 as coarse checks only where §1.3 says they agree with the definitions). The
 * 3-dB / 6-dB widths are measured at -3.0103 / -6.0206 dB (half power / half amplitude),
 * the BW3 and BW6 columns of §1.1. */
#include "fw-test-dsp.h"
#include "fw-window.h"

typedef struct
{
  FwWindowKind kind;
  FwWindowSymmetry sym;
  double hsl, cg, enbw, bw3, sl, wcpl, bw6;
} MeritRow;

/* check-values.md §1.1 NUM (periodic, N = 2048) and §1.2 NUM (symmetric, N = 2048).
 * The printed values have 4 decimals (CG/ENBW of §1.2: 6 decimals). */
static const MeritRow merit_table[] = {
  { FW_WINDOW_RECTANGULAR, FW_WINDOW_PERIODIC, -13.2615, 1.0000, 1.0000, 0.8859, 3.9224, 3.9224, 1.2067 },
  { FW_WINDOW_HANN, FW_WINDOW_PERIODIC, -31.4673, 0.5000, 1.5000, 1.4406, 1.4236, 3.1845, 2.0000 },
  { FW_WINDOW_HAMMING, FW_WINDOW_PERIODIC, -42.6748, 0.5400, 1.3628, 1.3030, 1.7514, 3.0958, 1.8152 },
  { FW_WINDOW_BLACKMAN, FW_WINDOW_PERIODIC, -58.1088, 0.4200, 1.7268, 1.6437, 1.0989, 3.4712, 2.2988 },
  { FW_WINDOW_HANN, FW_WINDOW_SYMMETRIC, -31.4673, 0.499756, 1.500733, 1.4413, 1.4222, 3.1852, 2.0010 },
  { FW_WINDOW_HAMMING, FW_WINDOW_SYMMETRIC, -42.6748, 0.539775, 1.363305, 1.3034, 1.7503, 3.0963, 1.8159 },
  { FW_WINDOW_BLACKMAN, FW_WINDOW_SYMMETRIC, -58.1088, 0.419795, 1.727601, 1.6445, 1.0978, 3.4722, 2.2999 },
};

static void
test_merit_table (void)
{
  for (size_t i = 0; i < G_N_ELEMENTS (merit_table); i++)
    {
      const MeritRow *r = &merit_table[i];
      FwWindowMerit m;

      g_test_message ("%s %s", fw_window_kind_name (r->kind), fw_window_symmetry_name (r->sym));
      g_assert_cmpint (fw_window_merit (r->kind, r->sym, 2048, &m), ==, FW_DSP_OK);
      /* check-values.md §1.1/§1.2 NUM, printed to 4 (CG/ENBW symmetric: 6) decimals: the
       * tolerance is the printing half-unit plus numerical slack. */
      fw_assert_close (m.coherent_gain, r->cg, r->sym == FW_WINDOW_PERIODIC ? 5e-5 : 5e-7, 0);
      fw_assert_close (m.enbw_bins, r->enbw, r->sym == FW_WINDOW_PERIODIC ? 5e-5 : 5e-7, 0);
      /* §1.3 tolerances against NUM: SL, WCPL 1e-4 dB; BW 1e-4 bins; HSL 0.01 dB. */
      fw_assert_close (m.scalloping_loss_db, r->sl, 1e-4, 0);
      fw_assert_close (m.worst_case_loss_db, r->wcpl, 1e-4, 0);
      fw_assert_close (m.bw3_bins, r->bw3, 1e-4, 0);
      fw_assert_close (m.bw6_bins, r->bw6, 1e-4, 0);
      fw_assert_close (m.highest_sidelobe_db, r->hsl, 0.01, 0);
    }
}

/* check-values.md §1.1 "Exact closed forms for periodic cosine-sum windows": CG = a0 and
 * ENBW = 1 + sum_k a_k^2 / (2 a0^2), for every N > 2K; 1e-12 relative (§1.3). */
static void
test_periodic_closed_forms (void)
{
  static const struct { FwWindowKind kind; double a[3]; } w[] = {
    { FW_WINDOW_RECTANGULAR, { 1.0, 0.0, 0.0 } },
    { FW_WINDOW_HANN, { 0.5, 0.5, 0.0 } },
    { FW_WINDOW_HAMMING, { 0.54, 0.46, 0.0 } },
    { FW_WINDOW_BLACKMAN, { 0.42, 0.5, 0.08 } },
  };
  static const size_t sizes[] = { 64, 1000, 2048, 4096 };

  for (size_t i = 0; i < G_N_ELEMENTS (w); i++)
    for (size_t j = 0; j < G_N_ELEMENTS (sizes); j++)
      {
        FwWindowMerit m;
        double enbw = 1.0 + (w[i].a[1] * w[i].a[1] + w[i].a[2] * w[i].a[2])
                              / (2.0 * w[i].a[0] * w[i].a[0]);
        g_assert_cmpint (fw_window_merit (w[i].kind, FW_WINDOW_PERIODIC, sizes[j], &m), ==, FW_DSP_OK);
        fw_assert_close (m.coherent_gain, w[i].a[0], 0, 1e-12);
        fw_assert_close (m.enbw_bins, enbw, 0, 1e-12);
      }

  /* §1.1 NUM: Hamming 1.3628257888, Blackman 1.7267573696 (10 decimals). */
  {
    FwWindowMerit m;
    fw_window_merit (FW_WINDOW_HAMMING, FW_WINDOW_PERIODIC, 1000, &m);
    fw_assert_close (m.enbw_bins, 1.3628257888, 1e-10, 0);
    fw_window_merit (FW_WINDOW_BLACKMAN, FW_WINDOW_PERIODIC, 1000, &m);
    fw_assert_close (m.enbw_bins, 1.7267573696, 1e-10, 0);
  }
}

/* check-values.md §1.2 closed forms for symmetric windows: sum w = a0 N - a1 + a2, so
 * Hann CG = (N-1)/(2N), Hamming CG = 0.54 - 0.46/N, Blackman CG = 0.42 (1 - 1/N);
 * symmetric Hann ENBW = 1.5 N/(N-1). 1e-12 relative. */
static void
test_symmetric_closed_forms (void)
{
  static const size_t sizes[] = { 64, 1000, 2048 };

  for (size_t j = 0; j < G_N_ELEMENTS (sizes); j++)
    {
      double n = (double) sizes[j];
      FwWindowMerit m;

      fw_window_merit (FW_WINDOW_HANN, FW_WINDOW_SYMMETRIC, sizes[j], &m);
      fw_assert_close (m.coherent_gain, (n - 1.0) / (2.0 * n), 0, 1e-12);
      fw_assert_close (m.enbw_bins, 1.5 * n / (n - 1.0), 0, 1e-12);
      fw_window_merit (FW_WINDOW_HAMMING, FW_WINDOW_SYMMETRIC, sizes[j], &m);
      fw_assert_close (m.coherent_gain, 0.54 - 0.46 / n, 0, 1e-12);
      fw_window_merit (FW_WINDOW_BLACKMAN, FW_WINDOW_SYMMETRIC, sizes[j], &m);
      fw_assert_close (m.coherent_gain, 0.42 * (1.0 - 1.0 / n), 0, 1e-12);
    }

  /* §1.2 NUM: symmetric Hann N = 2048, CG = 0.499755859375, ENBW = 1.500732779678. */
  {
    FwWindowMerit m;
    fw_window_merit (FW_WINDOW_HANN, FW_WINDOW_SYMMETRIC, 2048, &m);
    fw_assert_close (m.coherent_gain, 0.499755859375, 0, 1e-12);
    fw_assert_close (m.enbw_bins, 1.500732779678, 1e-12, 0);
    /* §1.2 NUM: at N = 64 the symmetric Hann has ENBW 1.5238 and SL 1.3788 dB. */
    fw_window_merit (FW_WINDOW_HANN, FW_WINDOW_SYMMETRIC, 64, &m);
    fw_assert_close (m.enbw_bins, 1.5238, 5e-5, 0);
    fw_assert_close (m.scalloping_loss_db, 1.3788, 1e-4, 0);
  }
}

/* check-values.md §1.1: rectangular SL = -20 log10(2/pi) = 3.9223975 dB and Hann SL =
 * -20 log10(8/(3 pi)) = 1.4236228 dB are the N -> infinity limits; at N = 4096 the
 * periodic windows agree with them to far better than the 1e-4 dB tolerance. */
static void
test_scalloping_limits (void)
{
  FwWindowMerit m;

  fw_window_merit (FW_WINDOW_RECTANGULAR, FW_WINDOW_PERIODIC, 4096, &m);
  fw_assert_close (m.scalloping_loss_db, -20.0 * log10 (2.0 / M_PI), 1e-4, 0);
  fw_window_merit (FW_WINDOW_HANN, FW_WINDOW_PERIODIC, 4096, &m);
  fw_assert_close (m.scalloping_loss_db, -20.0 * log10 (8.0 / (3.0 * M_PI)), 1e-4, 0);
}

/* check-values.md §1.2 "External numeric cross-checks", MathWorks enbw documentation
 * (PUB✓; MATLAB's hamming()/hann() are symmetric):
 *   enbw(hamming(1000)) = 1.3638 (NUM 1.3638074),
 *   enbw(hann(1000), 10000) = 15.0150 Hz (NUM 15.015015),
 *   enbw(hann(128), 1000) = 11.8110 Hz (NUM 11.811024). */
static void
test_mathworks_enbw (void)
{
  FwWindowMerit m;

  fw_window_merit (FW_WINDOW_HAMMING, FW_WINDOW_SYMMETRIC, 1000, &m);
  fw_assert_close (m.enbw_bins, 1.3638, 5e-5, 0);
  fw_assert_close (m.enbw_bins, 1.3638074, 5e-8, 0);
  fw_window_merit (FW_WINDOW_HANN, FW_WINDOW_SYMMETRIC, 1000, &m);
  fw_assert_close (m.enbw_bins * 10000.0 / 1000.0, 15.0150, 5e-5, 0);
  fw_assert_close (m.enbw_bins * 10000.0 / 1000.0, 15.015015, 5e-7, 0);
  fw_window_merit (FW_WINDOW_HANN, FW_WINDOW_SYMMETRIC, 128, &m);
  fw_assert_close (m.enbw_bins * 1000.0 / 128.0, 11.8110, 5e-5, 0);
  fw_assert_close (m.enbw_bins * 1000.0 / 128.0, 11.811024, 5e-7, 0);
}

/* Coarse checks against published tables, only where check-values.md §1.3 says they agree
 * with the definitions. Harris 1978 Table 1 values are PUB(m) (from memory); Heinzel 2002
 * values are PUB✓. Tolerances from §1.3: CG/ENBW ±0.005, SL/WCPL ±0.005 dB, HSL ±0.5 dB
 * (±0.6 dB for Hann against Harris's -32). Deliberately NOT asserted (§10.1): Harris's
 * Hamming SL 1.78, Blackman 3-dB/6-dB widths 1.68/2.35, Hamming 6-dB width 1.81. */
static void
test_published_coarse (void)
{
  FwWindowMerit rect, hann, hamming, blackman;

  fw_window_merit (FW_WINDOW_RECTANGULAR, FW_WINDOW_PERIODIC, 2048, &rect);
  fw_window_merit (FW_WINDOW_HANN, FW_WINDOW_PERIODIC, 2048, &hann);
  fw_window_merit (FW_WINDOW_HAMMING, FW_WINDOW_PERIODIC, 2048, &hamming);
  fw_window_merit (FW_WINDOW_BLACKMAN, FW_WINDOW_PERIODIC, 2048, &blackman);

  /* Harris Table 1, rectangular (PUB(m)): -13, 1.00, 1.00, 0.89, 3.92, 3.92, 1.21. */
  fw_assert_close (rect.highest_sidelobe_db, -13.0, 0.5, 0);
  fw_assert_close (rect.coherent_gain, 1.00, 0.005, 0);
  fw_assert_close (rect.enbw_bins, 1.00, 0.005, 0);
  fw_assert_close (rect.bw3_bins, 0.89, 0.005, 0);
  fw_assert_close (rect.scalloping_loss_db, 3.92, 0.005, 0);
  fw_assert_close (rect.worst_case_loss_db, 3.92, 0.005, 0);
  fw_assert_close (rect.bw6_bins, 1.21, 0.005, 0);

  /* Harris Table 1, Hann (PUB(m)): -32 (±0.6), 0.50, 1.50, 1.44, 1.42, 3.18, 2.00. */
  fw_assert_close (hann.highest_sidelobe_db, -32.0, 0.6, 0);
  fw_assert_close (hann.coherent_gain, 0.50, 0.005, 0);
  fw_assert_close (hann.enbw_bins, 1.50, 0.005, 0);
  fw_assert_close (hann.bw3_bins, 1.44, 0.005, 0);
  fw_assert_close (hann.scalloping_loss_db, 1.42, 0.005, 0);
  fw_assert_close (hann.worst_case_loss_db, 3.18, 0.005, 0);
  fw_assert_close (hann.bw6_bins, 2.00, 0.005, 0);
  /* Heinzel 2002, Hann (PUB✓): PSLL 31.5 dB, NENBW 1.5 bins, flatness -1.4236 dB. */
  fw_assert_close (hann.highest_sidelobe_db, -31.5, 0.5, 0);
  fw_assert_close (hann.enbw_bins, 1.5, 0.005, 0);
  fw_assert_close (hann.scalloping_loss_db, 1.4236, 0.005, 0);
  /* Tektronix manual (PUB✓, §1.3): "Hanning scallop loss is 1.42 dB". */
  fw_assert_close (hann.scalloping_loss_db, 1.42, 0.005, 0);

  /* Harris Table 1, Hamming (PUB(m)): -43, 0.54, 1.36, 1.30, 3.10 (SL 1.78 not asserted). */
  fw_assert_close (hamming.highest_sidelobe_db, -43.0, 0.5, 0);
  fw_assert_close (hamming.coherent_gain, 0.54, 0.005, 0);
  fw_assert_close (hamming.enbw_bins, 1.36, 0.005, 0);
  fw_assert_close (hamming.bw3_bins, 1.30, 0.005, 0);
  fw_assert_close (hamming.worst_case_loss_db, 3.10, 0.005, 0);
  /* Heinzel 2002, Hamming (PUB✓): PSLL 42.7 dB, NENBW 1.3628, emax -1.7514 dB. */
  fw_assert_close (hamming.highest_sidelobe_db, -42.7, 0.5, 0);
  fw_assert_close (hamming.enbw_bins, 1.3628, 0.005, 0);
  fw_assert_close (hamming.scalloping_loss_db, 1.7514, 0.005, 0);

  /* Harris Table 1, Blackman (PUB(m)): -58, 0.42, 1.73, 1.10, 3.47 (widths not asserted). */
  fw_assert_close (blackman.highest_sidelobe_db, -58.0, 0.5, 0);
  fw_assert_close (blackman.coherent_gain, 0.42, 0.005, 0);
  fw_assert_close (blackman.enbw_bins, 1.73, 0.005, 0);
  fw_assert_close (blackman.scalloping_loss_db, 1.10, 0.005, 0);
  fw_assert_close (blackman.worst_case_loss_db, 3.47, 0.005, 0);
}

/* §1.1: N = 512 gives the same figures as N = 2048 "to all printed digits, except HSL,
 * which moves by less than 0.02 dB". */
static void
test_merit_size_independence (void)
{
  for (int k = 0; k < FW_N_WINDOWS; k++)
    {
      FwWindowMerit a, b;
      fw_window_merit ((FwWindowKind) k, FW_WINDOW_PERIODIC, 512, &a);
      fw_window_merit ((FwWindowKind) k, FW_WINDOW_PERIODIC, 2048, &b);
      fw_assert_close (a.scalloping_loss_db, b.scalloping_loss_db, 1e-4, 0);
      fw_assert_close (a.bw3_bins, b.bw3_bins, 1e-4, 0);
      fw_assert_close (a.highest_sidelobe_db, b.highest_sidelobe_db, 0.02, 0);
    }
}

/* Window samples. check-values.md §1 formula w[n] = a0 - a1 cos(2 pi n/D) + a2 cos(4 pi n/D);
 * §7 derived check (NUM): the symmetric Hamming has w[0] = w[N-1] = 0.08 and
 * sum w = 0.54 N - 0.46 (107.54 for N = 200). */
static void
test_window_samples (void)
{
  double w[2048];

  fw_window_fill (FW_WINDOW_HAMMING, FW_WINDOW_SYMMETRIC, 200, w);
  fw_assert_close (w[0], 0.08, 1e-15, 0);
  fw_assert_close (w[199], 0.08, 1e-15, 0);
  {
    double s = 0.0;
    for (int i = 0; i < 200; i++)
      s += w[i];
    fw_assert_close (s, 107.54, 1e-11, 0);
  }

  /* Periodic Hann (DFT-even, Harris): w[0] = 0, w[N/2] = 1, w[N/4] = 0.5, and w[n] = w[N-n]. */
  fw_window_fill (FW_WINDOW_HANN, FW_WINDOW_PERIODIC, 2048, w);
  fw_assert_close (w[0], 0.0, 1e-15, 0);
  fw_assert_close (w[1024], 1.0, 1e-15, 0);
  fw_assert_close (w[512], 0.5, 1e-15, 0);
  for (int i = 1; i < 2048; i++)
    fw_assert_close (w[i], w[2048 - i], 1e-15, 0);

  /* Symmetric windows: w[n] = w[N-1-n]; symmetric Blackman ends at 0.42 - 0.5 + 0.08 = 0. */
  fw_window_fill (FW_WINDOW_BLACKMAN, FW_WINDOW_SYMMETRIC, 101, w);
  fw_assert_close (w[0], 0.0, 1e-15, 0);
  fw_assert_close (w[50], 1.0, 1e-15, 0);
  for (int i = 0; i < 101; i++)
    fw_assert_close (w[i], w[100 - i], 1e-15, 0);

  /* Rectangular is all ones in both forms; n = 1 gives { 1 } (header contract). */
  fw_window_fill (FW_WINDOW_RECTANGULAR, FW_WINDOW_SYMMETRIC, 16, w);
  for (int i = 0; i < 16; i++)
    g_assert_cmpfloat (w[i], ==, 1.0);
  fw_window_fill (FW_WINDOW_HANN, FW_WINDOW_PERIODIC, 1, w);
  g_assert_cmpfloat (w[0], ==, 1.0);
}

/* check-values.md §6 COLA (NUM / closed form): periodic Hann overlap-added at hop N/4 sums to
 * N/(2H) = 2 and at hop N/2 to 1 (ripple ~1e-15); the symmetric Hann at hop N/4 is not COLA
 * (min 1.998915, max 1.999232). */
static void
test_cola (void)
{
  enum { N = 2048 };
  double w[N];
  static const struct { FwWindowSymmetry sym; size_t hop; double lo, hi; } cases[] = {
    { FW_WINDOW_PERIODIC, N / 4, 2.0 - 1e-12, 2.0 + 1e-12 },
    { FW_WINDOW_PERIODIC, N / 2, 1.0 - 1e-12, 1.0 + 1e-12 },
  };

  for (size_t c = 0; c < G_N_ELEMENTS (cases); c++)
    {
      fw_window_fill (FW_WINDOW_HANN, cases[c].sym, N, w);
      for (size_t n = 0; n < cases[c].hop; n++)
        {
          double s = 0.0;
          for (size_t j = n; j < N; j += cases[c].hop)
            s += w[j];
          g_assert_cmpfloat (s, >=, cases[c].lo);
          g_assert_cmpfloat (s, <=, cases[c].hi);
        }
    }

  fw_window_fill (FW_WINDOW_HANN, FW_WINDOW_SYMMETRIC, N, w);
  {
    double mn = INFINITY, mx = -INFINITY;
    for (size_t n = 0; n < N / 4; n++)
      {
        double s = 0.0;
        for (size_t j = n; j < N; j += N / 4)
          s += w[j];
        mn = fmin (mn, s);
        mx = fmax (mx, s);
      }
    fw_assert_close (mn, 1.998915, 5e-7, 0);
    fw_assert_close (mx, 1.999232, 5e-7, 0);
  }
}

static void
test_names (void)
{
  for (int k = 0; k < FW_N_WINDOWS; k++)
    {
      FwWindowKind back;
      const char *name = fw_window_kind_name ((FwWindowKind) k);
      g_assert_nonnull (name);
      g_assert_true (fw_window_kind_from_name (name, &back));
      g_assert_cmpint (back, ==, k);
    }
  g_assert_cmpstr (fw_window_kind_name (FW_WINDOW_HANN), ==, "hann");
  g_assert_cmpstr (fw_window_kind_name (FW_WINDOW_RECTANGULAR), ==, "rectangular");
  g_assert_false (fw_window_kind_from_name ("hanning", NULL));
  g_assert_cmpstr (fw_window_symmetry_name (FW_WINDOW_SYMMETRIC), ==, "symmetric");
  {
    FwWindowSymmetry s;
    g_assert_true (fw_window_symmetry_from_name ("periodic", &s));
    g_assert_cmpint (s, ==, FW_WINDOW_PERIODIC);
    g_assert_false (fw_window_symmetry_from_name ("Periodic", &s));
  }
  {
    FwWindowMerit m;
    g_assert_cmpint (fw_window_merit (FW_WINDOW_HANN, FW_WINDOW_PERIODIC, 1, &m), ==,
                     FW_DSP_ERROR_INVALID_ARGUMENT);
  }
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/dsp/window/merit-table-2048", test_merit_table);
  g_test_add_func ("/fw/dsp/window/periodic-closed-forms", test_periodic_closed_forms);
  g_test_add_func ("/fw/dsp/window/symmetric-closed-forms", test_symmetric_closed_forms);
  g_test_add_func ("/fw/dsp/window/scalloping-limits", test_scalloping_limits);
  g_test_add_func ("/fw/dsp/window/mathworks-enbw", test_mathworks_enbw);
  g_test_add_func ("/fw/dsp/window/published-coarse", test_published_coarse);
  g_test_add_func ("/fw/dsp/window/size-independence", test_merit_size_independence);
  g_test_add_func ("/fw/dsp/window/samples", test_window_samples);
  g_test_add_func ("/fw/dsp/window/cola", test_cola);
  g_test_add_func ("/fw/dsp/window/names", test_names);
  return g_test_run ();
}
