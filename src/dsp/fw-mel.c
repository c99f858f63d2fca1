/* fw-mel.c: mel scales and sparse triangular filterbanks.
 *
 * Scales:
 *   htk    m = 2595 log10(1 + f/700),  f = 700 (10^(m/2595) - 1)
 *   slaney m = 3 f / 200 for f < 1000 Hz, 15 + 27 ln(f/1000) / ln(6.4) for f >= 1000 Hz;
 *          f = 200 m / 3 for m < 15, 1000 exp((m - 15) ln(6.4) / 27) for m >= 15.
 * Bank: edges f[0..n_bands+1] equally spaced in mel from fmin to fmax (converted back to Hz,
 * with f[0] = fmin and f[n_bands+1] = fmax exactly). Band m at bin frequency f_k = k sr / n_fft:
 *   w = max(0, min((f_k - f[m]) / (f[m+1] - f[m]), (f[m+2] - f_k) / (f[m+2] - f[m+1])))
 * times 2 / (f[m+2] - f[m]) for `area`. Each band stores only its run of nonzero weights, so
 * applying the bank costs about two multiply-adds per spectral bin.
 */
#include "fw-mel.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

struct _FwMelBank
{
  size_t n_bands;
  size_t n_bins;
  double *edges;    /* n_bands + 2 */
  size_t *first;    /* first bin with a nonzero weight, per band */
  size_t *count;    /* number of consecutive bins from first (0 = empty band) */
  size_t *offset;   /* start of the band's weights in `weights` */
  double *weights;  /* concatenated nonzero runs */
};

const char *
fw_mel_scale_name (FwMelScale s)
{
  switch (s)
    {
    case FW_MEL_SCALE_HTK:
      return "htk";
    case FW_MEL_SCALE_SLANEY:
      return "slaney";
    default:
      return NULL;
    }
}

bool
fw_mel_scale_from_name (const char *name, FwMelScale *out)
{
  if (name == NULL)
    return false;
  if (strcmp (name, "htk") == 0)
    {
      if (out)
        *out = FW_MEL_SCALE_HTK;
      return true;
    }
  if (strcmp (name, "slaney") == 0)
    {
      if (out)
        *out = FW_MEL_SCALE_SLANEY;
      return true;
    }
  return false;
}

const char *
fw_mel_weights_name (FwMelWeights w)
{
  switch (w)
    {
    case FW_MEL_WEIGHTS_AREA:
      return "area";
    case FW_MEL_WEIGHTS_UNIT:
      return "unit";
    default:
      return NULL;
    }
}

bool
fw_mel_weights_from_name (const char *name, FwMelWeights *out)
{
  if (name == NULL)
    return false;
  if (strcmp (name, "area") == 0)
    {
      if (out)
        *out = FW_MEL_WEIGHTS_AREA;
      return true;
    }
  if (strcmp (name, "unit") == 0)
    {
      if (out)
        *out = FW_MEL_WEIGHTS_UNIT;
      return true;
    }
  return false;
}

#define SLANEY_BREAK_HZ 1000.0
#define SLANEY_BREAK_MEL 15.0          /* 1000 Hz * 3 / 200 */
#define SLANEY_LOG_STEP (log (6.4) / 27.0)

double
fw_hz_to_mel (FwMelScale scale, double hz)
{
  if (scale == FW_MEL_SCALE_HTK)
    return 2595.0 * log10 (1.0 + hz / 700.0);
  if (hz < SLANEY_BREAK_HZ)
    return 3.0 * hz / 200.0;
  return SLANEY_BREAK_MEL + log (hz / SLANEY_BREAK_HZ) / SLANEY_LOG_STEP;
}

double
fw_mel_to_hz (FwMelScale scale, double mel)
{
  if (scale == FW_MEL_SCALE_HTK)
    return 700.0 * (pow (10.0, mel / 2595.0) - 1.0);
  if (mel < SLANEY_BREAK_MEL)
    return 200.0 * mel / 3.0;
  return SLANEY_BREAK_HZ * exp ((mel - SLANEY_BREAK_MEL) * SLANEY_LOG_STEP);
}

void
fw_mel_bank_free (FwMelBank *bank)
{
  if (bank == NULL)
    return;
  free (bank->edges);
  free (bank->first);
  free (bank->count);
  free (bank->offset);
  free (bank->weights);
  free (bank);
}

static double
triangle (const double *f, size_t m, double fk)
{
  double lo = f[m], mid = f[m + 1], hi = f[m + 2];
  double rise, fall, v;

  if (fk <= lo || fk >= hi)
    return 0.0;
  rise = (mid > lo) ? (fk - lo) / (mid - lo) : 1.0;
  fall = (hi > mid) ? (hi - fk) / (hi - mid) : 1.0;
  v = rise < fall ? rise : fall;
  return v > 0.0 ? v : 0.0;
}

FwMelBank *
fw_mel_bank_new (FwMelScale scale, FwMelWeights weights, size_t n_bands, double fmin,
                 double fmax, double sample_rate, size_t fft_length, FwDspStatus *status)
{
  FwMelBank *bank;
  double mel_lo, mel_hi;
  size_t total = 0, n_bins;

  if (status)
    *status = FW_DSP_ERROR_INVALID_ARGUMENT;
  if (n_bands == 0 || fft_length < 2 || !(sample_rate > 0.0) || !isfinite (sample_rate)
      || !(fmin >= 0.0) || !(fmax > fmin) || fmax > sample_rate / 2.0
      || (scale != FW_MEL_SCALE_HTK && scale != FW_MEL_SCALE_SLANEY)
      || (weights != FW_MEL_WEIGHTS_AREA && weights != FW_MEL_WEIGHTS_UNIT))
    return NULL;

  if (status)
    *status = FW_DSP_ERROR_NO_MEMORY;
  n_bins = fft_length / 2 + 1;
  bank = calloc (1, sizeof *bank);
  if (bank == NULL)
    return NULL;
  bank->n_bands = n_bands;
  bank->n_bins = n_bins;
  bank->edges = malloc ((n_bands + 2) * sizeof (double));
  bank->first = calloc (n_bands, sizeof (size_t));
  bank->count = calloc (n_bands, sizeof (size_t));
  bank->offset = calloc (n_bands, sizeof (size_t));
  if (!bank->edges || !bank->first || !bank->count || !bank->offset)
    goto oom;

  mel_lo = fw_hz_to_mel (scale, fmin);
  mel_hi = fw_hz_to_mel (scale, fmax);
  for (size_t i = 0; i < n_bands + 2; i++)
    {
      double mel = mel_lo + (mel_hi - mel_lo) * (double) i / (double) (n_bands + 1);
      bank->edges[i] = fw_mel_to_hz (scale, mel);
    }
  bank->edges[0] = fmin;
  bank->edges[n_bands + 1] = fmax;

  /* First pass: the run of nonzero bins of each band. Bin frequencies increase with k and
   * the triangle is positive exactly on the open interval (f[m], f[m+2]). */
  for (size_t m = 0; m < n_bands; m++)
    {
      size_t first = 0, count = 0;
      /* Start one bin below the lower edge (rounding margin); earlier bins weigh zero. */
      double k_lo = floor (bank->edges[m] * (double) fft_length / sample_rate) - 1.0;
      size_t k0 = k_lo > 0.0 ? (size_t) k_lo : 0;
      for (size_t k = k0; k < n_bins; k++)
        {
          double fk = (double) k * sample_rate / (double) fft_length;
          if (triangle (bank->edges, m, fk) > 0.0)
            {
              if (count == 0)
                first = k;
              count = k - first + 1;
            }
          else if (fk >= bank->edges[m + 2])
            break;
        }
      bank->first[m] = first;
      bank->count[m] = count;
      bank->offset[m] = total;
      total += count;
    }

  bank->weights = malloc ((total ? total : 1) * sizeof (double));
  if (bank->weights == NULL)
    goto oom;
  for (size_t m = 0; m < n_bands; m++)
    {
      double scale_m = 1.0;
      if (weights == FW_MEL_WEIGHTS_AREA)
        scale_m = 2.0 / (bank->edges[m + 2] - bank->edges[m]);
      for (size_t j = 0; j < bank->count[m]; j++)
        {
          double fk = (double) (bank->first[m] + j) * sample_rate / (double) fft_length;
          bank->weights[bank->offset[m] + j] = triangle (bank->edges, m, fk) * scale_m;
        }
    }

  if (status)
    *status = FW_DSP_OK;
  return bank;

oom:
  fw_mel_bank_free (bank);
  return NULL;
}

size_t
fw_mel_bank_n_bands (const FwMelBank *bank)
{
  return bank ? bank->n_bands : 0;
}

size_t
fw_mel_bank_n_bins (const FwMelBank *bank)
{
  return bank ? bank->n_bins : 0;
}

const double *
fw_mel_bank_edges_hz (const FwMelBank *bank)
{
  return bank ? bank->edges : NULL;
}

double
fw_mel_bank_weight (const FwMelBank *bank, size_t band, size_t bin)
{
  if (bank == NULL || band >= bank->n_bands || bin < bank->first[band]
      || bin >= bank->first[band] + bank->count[band])
    return 0.0;
  return bank->weights[bank->offset[band] + (bin - bank->first[band])];
}

size_t
fw_mel_bank_empty_bands (const FwMelBank *bank, size_t *out, size_t max)
{
  size_t n = 0;

  if (bank == NULL)
    return 0;
  for (size_t m = 0; m < bank->n_bands; m++)
    {
      bool empty = true;
      for (size_t j = 0; j < bank->count[m]; j++)
        if (bank->weights[bank->offset[m] + j] != 0.0)
          {
            empty = false;
            break;
          }
      if (empty)
        {
          if (out != NULL && n < max)
            out[n] = m;
          n++;
        }
    }
  return n;
}

void
fw_mel_bank_apply (const FwMelBank *bank, const float *spectrum, float *mel)
{
  for (size_t m = 0; m < bank->n_bands; m++)
    {
      const double *w = bank->weights + bank->offset[m];
      const float *s = spectrum + bank->first[m];
      size_t count = bank->count[m], j = 0;
      /* Four partial sums (a fixed order, so results are reproducible) hide the latency of
       * the dependent additions. */
      double a0 = 0.0, a1 = 0.0, a2 = 0.0, a3 = 0.0;

      for (; j + 4 <= count; j += 4)
        {
          a0 += w[j] * (double) s[j];
          a1 += w[j + 1] * (double) s[j + 1];
          a2 += w[j + 2] * (double) s[j + 2];
          a3 += w[j + 3] * (double) s[j + 3];
        }
      for (; j < count; j++)
        a0 += w[j] * (double) s[j];
      mel[m] = (float) ((a0 + a1) + (a2 + a3));
    }
}
