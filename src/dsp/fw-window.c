/* fw-window.c: cosine-sum analysis windows and their figures of merit.
 *
 * Figures of merit follow the definitions of F. J. Harris, "On the use of windows for
 * harmonic analysis with the discrete Fourier transform", Proc. IEEE 66(1), 1978:
 *   CG  = sum w / N,   ENBW = N sum w^2 / (sum w)^2,
 *   SL  = -20 log10(|W(1/2 bin)| / W(0)) with W(1/2) = |sum w[n] exp(-i pi n / N)|,
 *   WCPL = SL + 10 log10(ENBW),
 *   HSL = the largest |W| beyond the first null of the main lobe, re W(0),
 *   BW3 / BW6 = full main-lobe width where |W|/W(0) = 1/sqrt(2) (-3.0103 dB) / 1/2 (-6.0206 dB).
 * Sums are accumulated in long double. The DTFT used for the searches is evaluated in closed
 * form: a cosine-sum window is a sum of shifted Dirichlet kernels, so W(theta) costs O(terms)
 * instead of O(N), and a fine scan of the whole band [0, N/2] bins is cheap.
 */
#include "fw-window.h"

#include <complex.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#ifndef M_PI
#define M_PI 3.14159265358979323846
#endif

static const char *const window_names[FW_N_WINDOWS] = {
  [FW_WINDOW_RECTANGULAR] = "rectangular",
  [FW_WINDOW_HANN] = "hann",
  [FW_WINDOW_HAMMING] = "hamming",
  [FW_WINDOW_BLACKMAN] = "blackman",
};

const char *
fw_window_kind_name (FwWindowKind kind)
{
  if ((int) kind < 0 || kind >= FW_N_WINDOWS)
    return NULL;
  return window_names[kind];
}

bool
fw_window_kind_from_name (const char *name, FwWindowKind *out)
{
  if (name == NULL)
    return false;
  for (int k = 0; k < FW_N_WINDOWS; k++)
    if (strcmp (name, window_names[k]) == 0)
      {
        if (out)
          *out = (FwWindowKind) k;
        return true;
      }
  return false;
}

const char *
fw_window_symmetry_name (FwWindowSymmetry sym)
{
  switch (sym)
    {
    case FW_WINDOW_PERIODIC:
      return "periodic";
    case FW_WINDOW_SYMMETRIC:
      return "symmetric";
    default:
      return NULL;
    }
}

bool
fw_window_symmetry_from_name (const char *name, FwWindowSymmetry *out)
{
  if (name == NULL)
    return false;
  if (strcmp (name, "periodic") == 0)
    {
      if (out)
        *out = FW_WINDOW_PERIODIC;
      return true;
    }
  if (strcmp (name, "symmetric") == 0)
    {
      if (out)
        *out = FW_WINDOW_SYMMETRIC;
      return true;
    }
  return false;
}

/* Coefficients a0..a2 of w[n] = a0 - a1 cos(2 pi n/D) + a2 cos(4 pi n/D). */
static int
window_coefficients (FwWindowKind kind, double a[3])
{
  a[0] = 1.0;
  a[1] = 0.0;
  a[2] = 0.0;
  switch (kind)
    {
    case FW_WINDOW_HANN:
      a[0] = 0.5;
      a[1] = 0.5;
      return 2;
    case FW_WINDOW_HAMMING:
      a[0] = 0.54;
      a[1] = 0.46;
      return 2;
    case FW_WINDOW_BLACKMAN:
      a[0] = 0.42;
      a[1] = 0.5;
      a[2] = 0.08;
      return 3;
    case FW_WINDOW_RECTANGULAR:
    default:
      return 1;
    }
}

void
fw_window_fill (FwWindowKind kind, FwWindowSymmetry sym, size_t n, double *out)
{
  double a[3];
  double d;

  if (n == 0 || out == NULL)
    return;
  if (n == 1)
    {
      out[0] = 1.0;
      return;
    }
  window_coefficients (kind, a);
  d = (sym == FW_WINDOW_SYMMETRIC) ? (double) (n - 1) : (double) n;
  for (size_t i = 0; i < n; i++)
    {
      double x = 2.0 * M_PI * (double) i / d;
      out[i] = a[0] - a[1] * cos (x) + a[2] * cos (2.0 * x);
    }
}

/* G(x) = sum_{n=0}^{N-1} exp(-i x n) = exp(-i x (N-1)/2) sin(N x/2) / sin(x/2). */
static double complex
dirichlet (double x, size_t n)
{
  double nn = (double) n;
  double s;

  /* G is 2 pi periodic; bring x into [-pi, pi) so the only singular point is x = 0. */
  x = fmod (x, 2.0 * M_PI);
  if (x >= M_PI)
    x -= 2.0 * M_PI;
  else if (x < -M_PI)
    x += 2.0 * M_PI;
  s = sin (0.5 * x);
  if (fabs (x) < 1e-13)
    return nn;
  return cexp (-I * x * 0.5 * (nn - 1.0)) * (sin (0.5 * nn * x) / s);
}

typedef struct
{
  size_t n;
  int terms;
  double a[3];
  double d;
} Dtft;

/* |W| at delta bins (theta = 2 pi delta / N). */
static double
dtft_abs (const Dtft *w, double delta)
{
  double theta = 2.0 * M_PI * delta / (double) w->n;
  double complex acc = w->a[0] * dirichlet (theta, w->n);
  double sign = -1.0;

  for (int k = 1; k < w->terms; k++, sign = -sign)
    {
      double phi = 2.0 * M_PI * (double) k / w->d;
      acc += sign * 0.5 * w->a[k] * (dirichlet (theta - phi, w->n) + dirichlet (theta + phi, w->n));
    }
  return cabs (acc);
}

/* Golden-section search for an extremum of |W| in [lo, hi]; maximise when want_max. */
static double
golden_search (const Dtft *w, double lo, double hi, bool want_max, double *value)
{
  const double g = 0.5 * (sqrt (5.0) - 1.0);
  double x1 = hi - g * (hi - lo), x2 = lo + g * (hi - lo);
  double f1 = dtft_abs (w, x1), f2 = dtft_abs (w, x2);

  for (int it = 0; it < 200 && hi - lo > 1e-12; it++)
    {
      bool keep_left = want_max ? (f1 > f2) : (f1 < f2);
      if (keep_left)
        {
          hi = x2;
          x2 = x1;
          f2 = f1;
          x1 = hi - g * (hi - lo);
          f1 = dtft_abs (w, x1);
        }
      else
        {
          lo = x1;
          x1 = x2;
          f1 = f2;
          x2 = lo + g * (hi - lo);
          f2 = dtft_abs (w, x2);
        }
    }
  *value = dtft_abs (w, 0.5 * (lo + hi));
  return 0.5 * (lo + hi);
}

/* Half-width (bins) where |W|/W0 falls to `level` inside the main lobe [0, null]. */
static double
half_width (const Dtft *w, double w0, double level, double null_bins)
{
  double lo = 0.0, hi = null_bins;

  if (dtft_abs (w, hi) / w0 > level)
    return hi;
  for (int it = 0; it < 200 && hi - lo > 1e-13; it++)
    {
      double mid = 0.5 * (lo + hi);
      if (dtft_abs (w, mid) / w0 > level)
        lo = mid;
      else
        hi = mid;
    }
  return 0.5 * (lo + hi);
}

FwDspStatus
fw_window_merit (FwWindowKind kind, FwWindowSymmetry sym, size_t n, FwWindowMerit *out)
{
  double *w;
  long double sum = 0.0L, sum2 = 0.0L, re = 0.0L, im = 0.0L;
  Dtft dt;
  double w0, step, null_bins = -1.0, hsl = -INFINITY;
  size_t n_steps, null_index = 0;
  double prev, cur, next;

  if (out == NULL || n < 2 || (int) kind < 0 || kind >= FW_N_WINDOWS
      || (sym != FW_WINDOW_PERIODIC && sym != FW_WINDOW_SYMMETRIC))
    return FW_DSP_ERROR_INVALID_ARGUMENT;

  w = malloc (n * sizeof *w);
  if (w == NULL)
    return FW_DSP_ERROR_NO_MEMORY;
  fw_window_fill (kind, sym, n, w);
  for (size_t i = 0; i < n; i++)
    {
      long double ang = (long double) M_PI * (long double) i / (long double) n;
      sum += w[i];
      sum2 += (long double) w[i] * w[i];
      re += w[i] * cosl (ang);
      im -= w[i] * sinl (ang);
    }
  free (w);

  memset (out, 0, sizeof *out);
  out->coherent_gain = (double) (sum / (long double) n);
  out->enbw_bins = (double) ((long double) n * sum2 / (sum * sum));
  out->scalloping_loss_db = -20.0 * log10 ((double) (sqrtl (re * re + im * im) / fabsl (sum)));
  out->worst_case_loss_db = out->scalloping_loss_db + 10.0 * log10 (out->enbw_bins);

  /* Closed-form DTFT for the searches. */
  dt.n = n;
  dt.terms = window_coefficients (kind, dt.a);
  dt.d = (sym == FW_WINDOW_SYMMETRIC) ? (double) (n - 1) : (double) n;
  w0 = dtft_abs (&dt, 0.0);

  /* Scan [0, min(N/2, 1024)] bins in steps of 1/32 bin: the first local minimum is the first
   * null, the highest local maximum beyond it the highest sidelobe. The sidelobe envelopes of
   * these windows decay away from the main lobe, so the cap (which bounds the cost for very
   * long windows) never hides the highest sidelobe. */
  {
    double span = (double) (n / 2 < 1024 ? n / 2 : 1024);
    n_steps = (size_t) ceil (span * 32.0);
    if (n_steps < 2)
      n_steps = 2;
    step = span / (double) n_steps;
    if (step <= 0.0)
      step = 1.0 / 32.0;
  }

  prev = dtft_abs (&dt, 0.0);
  cur = dtft_abs (&dt, step);
  for (size_t i = 1; i < n_steps; i++)
    {
      next = dtft_abs (&dt, (double) (i + 1) * step);
      if (cur < prev && cur <= next)
        {
          double v;
          null_bins = golden_search (&dt, (double) (i - 1) * step, (double) (i + 1) * step,
                                     false, &v);
          null_index = i;
          break;
        }
      prev = cur;
      cur = next;
    }

  if (null_bins > 0.0)
    {
      /* Keep the three highest sampled local maxima beyond the null, then refine each. */
      double best_v[3] = { -1.0, -1.0, -1.0 };
      size_t best_i[3] = { 0, 0, 0 };

      prev = dtft_abs (&dt, (double) null_index * step);
      cur = dtft_abs (&dt, (double) (null_index + 1) * step);
      for (size_t i = null_index + 1; i <= n_steps; i++)
        {
          bool is_max;
          next = (i < n_steps) ? dtft_abs (&dt, (double) (i + 1) * step) : -1.0;
          is_max = cur >= prev && cur >= next;
          if (is_max && cur > best_v[2])
            {
              int slot = 2;
              while (slot > 0 && cur > best_v[slot - 1])
                {
                  best_v[slot] = best_v[slot - 1];
                  best_i[slot] = best_i[slot - 1];
                  slot--;
                }
              best_v[slot] = cur;
              best_i[slot] = i;
            }
          prev = cur;
          cur = next;
        }
      for (int j = 0; j < 3; j++)
        {
          double v = best_v[j];
          if (v < 0.0)
            continue;
          if (best_i[j] < n_steps)
            {
              double lo = (double) (best_i[j] - 1) * step;
              double hi = (double) (best_i[j] + 1) * step;
              golden_search (&dt, lo, hi, true, &v);
              if (v < best_v[j])
                v = best_v[j];
            }
          if (v > 0.0)
            {
              double db = 20.0 * log10 (v / w0);
              if (db > hsl)
                hsl = db;
            }
        }
      out->bw3_bins = 2.0 * half_width (&dt, w0, sqrt (0.5), null_bins);
      out->bw6_bins = 2.0 * half_width (&dt, w0, 0.5, null_bins);
    }
  else
    {
      /* No null inside the band (tiny windows): the main lobe fills it. */
      double band = (double) (n / 2);
      out->bw3_bins = 2.0 * half_width (&dt, w0, sqrt (0.5), band);
      out->bw6_bins = 2.0 * half_width (&dt, w0, 0.5, band);
    }
  out->highest_sidelobe_db = hsl;
  return FW_DSP_OK;
}
