/* fw-analysis.c: the analysis pipeline.
 *
 * Conventions (each one is a field of FwAnalysisConfig; DEVELOPERS.md quotes this block):
 *
 *  1. Pre-emphasis on the whole signal first: y[0] = x[0], y[n] = x[n] - a x[n-1].
 *  2. Framing. centered: pad = floor(fft_length/2) samples at both ends, filled by `padding`:
 *       zeros   0;
 *       edge    the first / last sample repeated;
 *       reflect mirror about the first / last sample, excluding that sample (as numpy's
 *               'reflect'): x[-1] = x[1], x[n] = x[n-2]. When the pad is longer than the
 *               signal the mirroring repeats (the signal is extended with period 2(n-1));
 *               a one-sample signal is repeated. Nothing outside the signal is ever read.
 *     Not centered: pad = 0. Frame t starts at t*hop in the padded signal;
 *     n_frames = 1 + floor((L + 2 pad - fft_length) / hop). Frame centre time in seconds:
 *     (t*hop + floor(fft_length/2) - pad) / sample_rate, i.e. t*hop/sr when centered.
 *  3. Window: window_length samples of the cosine-sum window (fw-window.h), placed at offset
 *     floor((fft_length - window_length)/2) in the frame, zeros elsewhere.
 *  4. Spectrum: unscaled DFT X[k], k = 0..fft_length/2; power |X|^2 or magnitude |X|.
 *  5. dB: factor log10(max(S, floor)) - factor log10(max(ref, floor)), factor 10 for power
 *     and 20 for magnitude (and for the mel matrix of a magnitude spectrum); ref =
 *     db_reference, or the maximum of the matrix being converted when db_reference_max.
 *     dynamic_range > 0 then raises every value below (max dB - dynamic_range) to that level.
 *  6. mel: the sparse triangular bank (fw-mel.h) applied to the spectrum (power or magnitude);
 *     mel-db: rule 5 applied to the mel matrix.
 *  7. mfcc: DCT-II (fw-cepstrum.h) of each mel-db frame, first cepstral_count coefficients
 *     (c0 included), then the lifter.
 *  8. delta / delta2: regression deltas (fw-deltas.h) of mfcc / of delta, replicated edges.
 *
 * Per-frame descriptors (one value per frame, bin axis SCALAR). Let s_0..s_{W-1} be the
 * window_length samples of the pre-emphasised, padded signal that lie under the window of the
 * frame (not multiplied by the window), S_k the stage-0 spectrum row (power or magnitude as
 * configured), f_k = k sample_rate / fft_length, k = 0..fft_length/2:
 *   rms       = sqrt( (1/W) sum_i s_i^2 ).
 *   zcr       = (number of i in 0..W-2 with sign(s_i) != sign(s_{i+1})) / (W - 1), where
 *               s >= 0 counts as positive; 0 when W = 1. A fraction of sample pairs, not a rate
 *               per second: a sine of frequency f gives about 2 f / sample_rate.
 *   centroid  = sum_k f_k S_k / sum_k S_k, in Hz; 0 when sum_k S_k = 0.
 *   bandwidth = sqrt( sum_k S_k (f_k - centroid)^2 / sum_k S_k ), in Hz; 0 when the sum is 0.
 *   rolloff   = the smallest f_k such that sum_{j<=k} S_j >= FW_ROLLOFF_FRACTION (0.85)
 *               sum_j S_j, in Hz; 0 when the sum is 0.
 *   flatness  = exp( mean_k ln P'_k ) / mean_k P'_k with P'_k = max(P_k, db_floor), P_k the
 *               POWER spectrum |X_k|^2 whatever `spectrum` says (S_k^2 when the stage-0
 *               spectrum is magnitude), means over all fft_length/2 + 1 bins. Between 0 and 1;
 *               exactly 1 for a silent frame (every bin at the floor).
 * All sums are accumulated in double. (|X_k|^2 itself is formed in float from FFTW's
 * single-precision output; the DCT and the mel bank accumulate in double.)
 *
 * Execution: the signal is never copied; each frame reads its samples through the padding
 * and pre-emphasis rules above. fw_analysis_run fuses into one pass over the frames every step
 * that needs only its own frame (spectrum, mel, dB with a fixed reference and no dynamic
 * range, DCT, spectral descriptors), so the MFCC chain stores only the final matrix; a dB
 * conversion whose reference or clamp depends on the whole matrix, and the deltas, run as
 * passes over the previous matrix afterwards. Frames are handed out in blocks of FRAME_BLOCK
 * through an atomic counter; every row is computed by the same code whichever thread runs it,
 * and the fused pass and fw_analysis_derive call the same row kernels, so the result is
 * bit-identical for any n_threads and for run versus a chain of derive calls.
 */
#include "fw-analysis.h"
#include "fw-analysis-private.h"

#include <math.h>
#include <pthread.h>
#include <stdatomic.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "fw-deltas.h"
#include "fw-fft.h"

#ifndef M_LN10
#define M_LN10 2.30258509299404568402
#endif

#define FRAME_BLOCK 64
#define MAX_THREADS 64

/* ---------------------------------------------------------------- names */

const char *
fw_padding_name (FwPadding p)
{
  switch (p)
    {
    case FW_PADDING_ZEROS:
      return "zeros";
    case FW_PADDING_REFLECT:
      return "reflect";
    case FW_PADDING_EDGE:
      return "edge";
    default:
      return NULL;
    }
}

bool
fw_padding_from_name (const char *name, FwPadding *out)
{
  for (int p = FW_PADDING_ZEROS; p <= FW_PADDING_EDGE; p++)
    if (name != NULL && strcmp (name, fw_padding_name ((FwPadding) p)) == 0)
      {
        if (out)
          *out = (FwPadding) p;
        return true;
      }
  return false;
}

const char *
fw_spectrum_kind_name (FwSpectrumKind s)
{
  switch (s)
    {
    case FW_SPECTRUM_POWER:
      return "power";
    case FW_SPECTRUM_MAGNITUDE:
      return "magnitude";
    default:
      return NULL;
    }
}

bool
fw_spectrum_kind_from_name (const char *name, FwSpectrumKind *out)
{
  for (int s = FW_SPECTRUM_POWER; s <= FW_SPECTRUM_MAGNITUDE; s++)
    if (name != NULL && strcmp (name, fw_spectrum_kind_name ((FwSpectrumKind) s)) == 0)
      {
        if (out)
          *out = (FwSpectrumKind) s;
        return true;
      }
  return false;
}

static const char *const stage_names[FW_N_STAGES] = {
  [FW_STAGE_SPECTRUM] = "power",
  [FW_STAGE_DB] = "db",
  [FW_STAGE_MEL] = "mel",
  [FW_STAGE_MEL_DB] = "mel-db",
  [FW_STAGE_MFCC] = "mfcc",
  [FW_STAGE_DELTA] = "delta",
  [FW_STAGE_DELTA2] = "delta2",
  [FW_STAGE_RMS] = "rms",
  [FW_STAGE_ZCR] = "zcr",
  [FW_STAGE_CENTROID] = "centroid",
  [FW_STAGE_BANDWIDTH] = "bandwidth",
  [FW_STAGE_ROLLOFF] = "rolloff",
  [FW_STAGE_FLATNESS] = "flatness",
};

static bool
stage_valid (FwStage stage)
{
  return (int) stage >= 0 && stage < FW_N_STAGES;
}

const char *
fw_stage_name (FwStage stage)
{
  return stage_valid (stage) ? stage_names[stage] : NULL;
}

const char *
fw_stage_display_name (FwStage stage, FwSpectrumKind kind)
{
  if (stage == FW_STAGE_SPECTRUM)
    return fw_spectrum_kind_name (kind);
  return fw_stage_name (stage);
}

bool
fw_stage_from_name (const char *name, FwStage *out)
{
  if (name == NULL)
    return false;
  if (strcmp (name, "magnitude") == 0)
    {
      if (out)
        *out = FW_STAGE_SPECTRUM;
      return true;
    }
  for (int s = 0; s < FW_N_STAGES; s++)
    if (strcmp (name, stage_names[s]) == 0)
      {
        if (out)
          *out = (FwStage) s;
        return true;
      }
  return false;
}

FwStage
fw_stage_parent (FwStage stage)
{
  switch (stage)
    {
    case FW_STAGE_DB:
    case FW_STAGE_MEL:
    case FW_STAGE_CENTROID:
    case FW_STAGE_BANDWIDTH:
    case FW_STAGE_ROLLOFF:
    case FW_STAGE_FLATNESS:
      return FW_STAGE_SPECTRUM;
    case FW_STAGE_MEL_DB:
      return FW_STAGE_MEL;
    case FW_STAGE_MFCC:
      return FW_STAGE_MEL_DB;
    case FW_STAGE_DELTA:
      return FW_STAGE_MFCC;
    case FW_STAGE_DELTA2:
      return FW_STAGE_DELTA;
    case FW_STAGE_SPECTRUM:
    case FW_STAGE_RMS:
    case FW_STAGE_ZCR:
    default:
      return FW_STAGE_SIGNAL;
    }
}

/* ---------------------------------------------------------------- framing */

static size_t
pad_length (size_t fft_length, bool centered)
{
  return centered ? fft_length / 2 : 0;
}

size_t
fw_frame_count (size_t n_samples, size_t fft_length, size_t hop_length, bool centered)
{
  size_t pad = pad_length (fft_length, centered);
  size_t padded;

  if (hop_length == 0 || fft_length == 0 || n_samples > SIZE_MAX - 2 * pad)
    return 0;
  padded = n_samples + 2 * pad;
  if (padded < fft_length)
    return 0;
  return 1 + (padded - fft_length) / hop_length;
}

double
fw_frame_time (const FwAnalysisConfig *cfg, size_t t)
{
  double pad = (double) pad_length (cfg->fft_length, cfg->centered);
  return ((double) t * (double) cfg->hop_length + (double) (cfg->fft_length / 2) - pad)
         / cfg->sample_rate;
}

size_t
_fw_analysis_window_offset (const FwAnalysisConfig *cfg)
{
  return (cfg->fft_length - cfg->window_length) / 2;
}

void
fw_pre_emphasis (float *x, size_t n, double a)
{
  if (a == 0.0 || n < 2)
    return;
  /* Backwards, so x[n-1] is still the original sample when x[n] is updated. */
  for (size_t i = n - 1; i > 0; i--)
    x[i] = (float) ((double) x[i] - a * (double) x[i - 1]);
}

/* Index into a signal of n samples for position j (may be outside 0..n-1) under `padding`;
 * returns -1 for a zero sample. */
static ptrdiff_t
padded_index (ptrdiff_t j, size_t n, FwPadding padding)
{
  ptrdiff_t nn = (ptrdiff_t) n;

  if (j >= 0 && j < nn)
    return j;
  switch (padding)
    {
    case FW_PADDING_EDGE:
      return j < 0 ? 0 : nn - 1;
    case FW_PADDING_REFLECT:
      {
        ptrdiff_t period, r;
        if (nn == 1)
          return 0;
        period = 2 * (nn - 1);
        r = j % period;
        if (r < 0)
          r += period;
        return r < nn ? r : period - r;
      }
    case FW_PADDING_ZEROS:
    default:
      return -1;
    }
}

/* The analysed signal seen through pre-emphasis and padding, without materialising it:
 * long clips would otherwise need a padded copy as large as the clip. */
typedef struct
{
  const float *x;
  size_t n;
  double a;      /* pre-emphasis */
  size_t pad;    /* samples of padding before the signal */
  FwPadding padding;
} SignalView;

static void
signal_view_init (SignalView *v, const FwAnalysisConfig *cfg, const float *x, size_t n)
{
  v->x = x;
  v->n = n;
  v->a = cfg->pre_emphasis;
  v->pad = pad_length (cfg->fft_length, cfg->centered);
  v->padding = cfg->padding;
}

/* Pre-emphasised sample j (0 <= j < n); the same arithmetic as fw_pre_emphasis(). */
static inline float
emphasised (const SignalView *v, size_t j)
{
  if (v->a == 0.0 || j == 0)
    return v->x[j];
  return (float) ((double) v->x[j] - v->a * (double) v->x[j - 1]);
}

/* The count samples from padded position p0 as a pointer into the signal itself when they
 * are plain signal samples (inside the signal, no pre-emphasis), else NULL. */
static inline const float *
signal_view_direct (const SignalView *v, size_t p0, size_t count)
{
  if (v->a == 0.0 && p0 >= v->pad && p0 - v->pad <= v->n && count <= v->n - (p0 - v->pad))
    return v->x + (p0 - v->pad);
  return NULL;
}

/* count samples of the padded signal starting at padded position p0. */
static void
signal_view_read (const SignalView *v, size_t p0, size_t count, float *dst)
{
  if (p0 >= v->pad && p0 - v->pad <= v->n && count <= v->n - (p0 - v->pad))
    {
      size_t j0 = p0 - v->pad;
      if (v->a == 0.0)
        memcpy (dst, v->x + j0, count * sizeof (float));
      else
        for (size_t i = 0; i < count; i++)
          dst[i] = emphasised (v, j0 + i);
      return;
    }
  for (size_t i = 0; i < count; i++)
    {
      ptrdiff_t j = (ptrdiff_t) (p0 + i) - (ptrdiff_t) v->pad;
      ptrdiff_t idx = padded_index (j, v->n, v->padding);
      dst[i] = idx < 0 ? 0.0f : emphasised (v, (size_t) idx);
    }
}

float *
_fw_analysis_prepare_signal (const FwAnalysisConfig *cfg, const float *signal,
                             size_t n_samples, size_t *padded_len)
{
  SignalView v;
  size_t len;
  float *buf;

  signal_view_init (&v, cfg, signal, n_samples);
  if (n_samples == 0 || n_samples > (SIZE_MAX / sizeof (float)) - 2 * v.pad)
    return NULL;
  len = n_samples + 2 * v.pad;
  buf = malloc (len * sizeof (float));
  if (buf == NULL)
    return NULL;
  signal_view_read (&v, 0, len, buf);
  if (padded_len)
    *padded_len = len;
  return buf;
}

/* ---------------------------------------------------------------- checking */

static bool
finite_nonneg (double v)
{
  return isfinite (v) && v >= 0.0;
}

FwDspStatus
fw_analysis_check (const FwAnalysisConfig *cfg)
{
  if (cfg == NULL)
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (!(isfinite (cfg->sample_rate) && cfg->sample_rate > 0.0))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (!(finite_nonneg (cfg->pre_emphasis) && cfg->pre_emphasis < 1.0))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (cfg->window_length < 1 || cfg->hop_length < 1 || cfg->fft_length < cfg->window_length
      || cfg->fft_length < 2 || cfg->fft_length > (size_t) 0x7fffffff)
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if ((int) cfg->window < 0 || cfg->window >= FW_N_WINDOWS
      || (cfg->window_symmetry != FW_WINDOW_PERIODIC && cfg->window_symmetry != FW_WINDOW_SYMMETRIC)
      || fw_padding_name (cfg->padding) == NULL || fw_spectrum_kind_name (cfg->spectrum) == NULL)
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (cfg->mel_bands < 1 || fw_mel_scale_name (cfg->mel_scale) == NULL
      || fw_mel_weights_name (cfg->mel_weights) == NULL)
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (!finite_nonneg (cfg->fmin) || !isfinite (cfg->fmax) || !(cfg->fmax > cfg->fmin)
      || cfg->fmax > cfg->sample_rate / 2.0)
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (!cfg->db_reference_max && !(isfinite (cfg->db_reference) && cfg->db_reference > 0.0))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (!(isfinite (cfg->db_floor) && cfg->db_floor > 0.0) || !finite_nonneg (cfg->dynamic_range))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (cfg->cepstral_count < 1 || cfg->cepstral_count > cfg->mel_bands
      || fw_dct_norm_name (cfg->dct_norm) == NULL || !finite_nonneg (cfg->lifter))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  if (cfg->delta_width < 1)
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  return FW_DSP_OK;
}

/* ---------------------------------------------------------------- matrix metadata */

static void
set_time_axis (FwMatrix *m, const FwAnalysisConfig *cfg, FwStage stage)
{
  for (size_t t = 0; t < m->n_frames; t++)
    m->frame_times[t] = fw_frame_time (cfg, t);
  m->sample_rate = cfg->sample_rate;
  m->hop_seconds = (double) cfg->hop_length / cfg->sample_rate;
  m->stage = (int) stage;
}

static void
set_hz_axis (FwMatrix *m, const FwAnalysisConfig *cfg)
{
  double df = cfg->sample_rate / (double) cfg->fft_length;
  m->bin_kind = FW_BIN_AXIS_HZ;
  for (size_t k = 0; k < m->n_bins; k++)
    {
      m->bin_value[k] = (double) k * df;
      m->bin_low[k] = m->bin_value[k] - 0.5 * df;
      m->bin_high[k] = m->bin_value[k] + 0.5 * df;
    }
}

static void
set_mel_axis (FwMatrix *m, const FwMelBank *bank)
{
  const double *e = fw_mel_bank_edges_hz (bank);
  m->bin_kind = FW_BIN_AXIS_MEL_BAND;
  for (size_t b = 0; b < m->n_bins; b++)
    {
      m->bin_low[b] = e[b];
      m->bin_value[b] = e[b + 1];
      m->bin_high[b] = e[b + 2];
    }
}

static void
set_coefficient_axis (FwMatrix *m)
{
  m->bin_kind = FW_BIN_AXIS_COEFFICIENT;
  for (size_t b = 0; b < m->n_bins; b++)
    m->bin_value[b] = m->bin_low[b] = m->bin_high[b] = (double) b;
}

static void
set_scalar_axis (FwMatrix *m)
{
  m->bin_kind = FW_BIN_AXIS_SCALAR;
  m->bin_value[0] = m->bin_low[0] = m->bin_high[0] = 0.0;
}

/* Copies time axis and bin axis of `from` into `to` (same shape in bins). */
static void
copy_axes (FwMatrix *to, const FwMatrix *from, FwStage stage)
{
  memcpy (to->frame_times, from->frame_times, from->n_frames * sizeof (double));
  memcpy (to->bin_value, from->bin_value, from->n_bins * sizeof (double));
  memcpy (to->bin_low, from->bin_low, from->n_bins * sizeof (double));
  memcpy (to->bin_high, from->bin_high, from->n_bins * sizeof (double));
  to->bin_kind = from->bin_kind;
  to->sample_rate = from->sample_rate;
  to->hop_seconds = from->hop_seconds;
  to->stage = (int) stage;
}

static void
copy_time_axis (FwMatrix *to, const FwMatrix *from, FwStage stage)
{
  memcpy (to->frame_times, from->frame_times, from->n_frames * sizeof (double));
  to->sample_rate = from->sample_rate;
  to->hop_seconds = from->hop_seconds;
  to->stage = (int) stage;
}

/* ---------------------------------------------------------------- parallel rows */

typedef struct _RowJob RowJob;
typedef void *(*ScratchNew) (RowJob *job);
typedef void (*ScratchFree) (void *scratch);
typedef void (*RowFunc) (RowJob *job, void *scratch, size_t row);

struct _RowJob
{
  size_t n_rows;
  ScratchNew scratch_new;
  ScratchFree scratch_free;
  RowFunc row;
  void *ctx;

  FwProgressFunc progress;
  void *user_data;
  double p0, p1;

  atomic_size_t next_block;
  atomic_size_t rows_done;
  atomic_int cancelled;
  atomic_int failed;
  pthread_mutex_t progress_lock;
};

static void
row_job_report (RowJob *job)
{
  double frac;

  if (job->progress == NULL || pthread_mutex_trylock (&job->progress_lock) != 0)
    return;
  frac = job->p0 + (job->p1 - job->p0)
                   * ((double) atomic_load (&job->rows_done) / (double) job->n_rows);
  if (job->progress (frac, job->user_data) != 0)
    atomic_store (&job->cancelled, 1);
  pthread_mutex_unlock (&job->progress_lock);
}

static void *
row_job_worker (void *data)
{
  RowJob *job = data;
  void *scratch = NULL;

  if (job->scratch_new != NULL)
    {
      scratch = job->scratch_new (job);
      if (scratch == NULL)
        {
          atomic_store (&job->failed, 1);
          return NULL;
        }
    }
  for (;;)
    {
      size_t start, end;

      if (atomic_load_explicit (&job->cancelled, memory_order_relaxed)
          || atomic_load_explicit (&job->failed, memory_order_relaxed))
        break;
      start = atomic_fetch_add (&job->next_block, 1) * FRAME_BLOCK;
      if (start >= job->n_rows)
        break;
      end = start + FRAME_BLOCK < job->n_rows ? start + FRAME_BLOCK : job->n_rows;
      for (size_t r = start; r < end; r++)
        job->row (job, scratch, r);
      atomic_fetch_add (&job->rows_done, end - start);
      row_job_report (job);
    }
  if (job->scratch_free != NULL && scratch != NULL)
    job->scratch_free (scratch);
  return NULL;
}

/* Runs job->row for every row on up to n_threads threads (the calling thread included). */
static FwDspStatus
row_job_run (RowJob *job, int n_threads)
{
  pthread_t threads[MAX_THREADS];
  int started = 0;
  size_t n_blocks = (job->n_rows + FRAME_BLOCK - 1) / FRAME_BLOCK;

  atomic_init (&job->next_block, 0);
  atomic_init (&job->rows_done, 0);
  atomic_init (&job->cancelled, 0);
  atomic_init (&job->failed, 0);
  pthread_mutex_init (&job->progress_lock, NULL);

  if (n_threads > MAX_THREADS)
    n_threads = MAX_THREADS;
  if ((size_t) n_threads > n_blocks)
    n_threads = (int) n_blocks;
  for (int i = 1; i < n_threads; i++)
    {
      if (pthread_create (&threads[started], NULL, row_job_worker, job) != 0)
        break; /* run with the threads we have */
      started++;
    }
  row_job_worker (job);
  for (int i = 0; i < started; i++)
    pthread_join (threads[i], NULL);
  pthread_mutex_destroy (&job->progress_lock);

  if (atomic_load (&job->failed))
    return FW_DSP_ERROR_NO_MEMORY;
  if (atomic_load (&job->cancelled))
    return FW_DSP_ERROR_CANCELLED;
  return FW_DSP_OK;
}

/* ---------------------------------------------------------------- row kernels
 * Each kernel is the single implementation of its step; the per-frame (fused) path and the
 * matrix-to-matrix (derive) path both call it, which keeps their results bit-identical. */

/* One spectral descriptor of a stage-0 spectrum row (definitions at the top of this file). */
static double
spectral_descriptor (const FwAnalysisConfig *cfg, FwStage stage, const float *s, size_t n)
{
  double df = cfg->sample_rate / (double) cfg->fft_length;
  double total = 0.0;

  if (stage == FW_STAGE_FLATNESS)
    {
      double sum_ln = 0.0, sum = 0.0;
      for (size_t k = 0; k < n; k++)
        {
          double p = (cfg->spectrum == FW_SPECTRUM_POWER) ? (double) s[k]
                                                           : (double) s[k] * (double) s[k];
          if (!(p >= cfg->db_floor))
            p = cfg->db_floor;
          sum_ln += log (p);
          sum += p;
        }
      return exp (sum_ln / (double) n) / (sum / (double) n);
    }

  for (size_t k = 0; k < n; k++)
    total += (double) s[k];
  if (!(total > 0.0))
    return 0.0;

  switch (stage)
    {
    case FW_STAGE_CENTROID:
    case FW_STAGE_BANDWIDTH:
      {
        double c = 0.0, v = 0.0;
        for (size_t k = 0; k < n; k++)
          c += (double) k * df * (double) s[k];
        c /= total;
        if (stage == FW_STAGE_CENTROID)
          return c;
        for (size_t k = 0; k < n; k++)
          {
            double d = (double) k * df - c;
            v += (double) s[k] * d * d;
          }
        return sqrt (v / total);
      }
    case FW_STAGE_ROLLOFF:
      {
        double threshold = FW_ROLLOFF_FRACTION * total, cum = 0.0;
        for (size_t k = 0; k < n; k++)
          {
            cum += (double) s[k];
            if (cum >= threshold)
              return (double) k * df;
          }
        return (double) (n - 1) * df;
      }
    default:
      return 0.0;
    }
}

typedef struct
{
  double factor;  /* (10 for power, 20 for magnitude) / ln(10): dB = factor * ln(S) */
  double ref_db;  /* factor ln(max(ref, floor)) */
  double floor;
} DbParams;

static DbParams
db_params (const FwAnalysisConfig *cfg, double matrix_max)
{
  DbParams p;
  double ref = cfg->db_reference_max ? matrix_max : cfg->db_reference;

  /* 10 log10(x) = (10 / ln 10) ln(x); glibc's log10 is itself ln times a constant, so this
   * only skips a call. */
  p.factor = ((cfg->spectrum == FW_SPECTRUM_MAGNITUDE) ? 20.0 : 10.0) / M_LN10;
  p.floor = cfg->db_floor;
  if (!(ref >= cfg->db_floor))
    ref = cfg->db_floor;
  p.ref_db = p.factor * log (ref);
  return p;
}

/* factor ln(max(S, floor)) - ref_db, per value. */
static void
db_row_values (const DbParams *p, const float *in, float *out, size_t n)
{
  for (size_t k = 0; k < n; k++)
    {
      double v = (double) in[k];
      if (!(v >= p->floor))
        v = p->floor;
      out[k] = (float) (p->factor * log (v) - p->ref_db);
    }
}

/* ---------------------------------------------------------------- per-frame work */

typedef struct
{
  const FwAnalysisConfig *cfg;
  SignalView signal;
  size_t win_offset;
  size_t n_spec;        /* fft_length/2 + 1 */
  float *window;        /* window_length samples */
  const FwFftPlan *plan;
  /* The steps fused into the frame pass, in order. */
  FwStage root;         /* FW_STAGE_SPECTRUM, FW_STAGE_RMS or FW_STAGE_ZCR */
  FwStage descriptor;   /* a spectral descriptor computed from the spectrum, or SIGNAL */
  const FwMelBank *bank;/* apply the mel bank (NULL: no) */
  bool db;              /* convert the current row to dB */
  DbParams dbp;
  const FwDctPlan *dct; /* DCT of the current row (NULL: no) */
  FwMatrix *out;
} FrameCtx;

typedef struct
{
  float *frame;         /* window_length samples under the window */
  float *in;            /* fft_length windowed frame */
  fftwf_complex *spec;
  float *a, *b;         /* row buffers, max(n_spec, mel_bands) */
} FrameScratch;

static void
frame_scratch_free (void *data)
{
  FrameScratch *s = data;
  free (s->frame);
  fw_fft_free (s->in);
  fw_fft_free (s->spec);
  free (s->a);
  free (s->b);
  free (s);
}

static void *
frame_scratch_new (RowJob *job)
{
  FrameCtx *ctx = job->ctx;
  FrameScratch *s = calloc (1, sizeof *s);
  size_t row = ctx->n_spec > ctx->cfg->mel_bands ? ctx->n_spec : ctx->cfg->mel_bands;

  if (s == NULL)
    return NULL;
  s->frame = malloc (ctx->cfg->window_length * sizeof (float));
  if (s->frame == NULL)
    goto fail;
  if (ctx->root != FW_STAGE_SPECTRUM)
    return s;
  s->in = fw_fft_alloc_real (ctx->cfg->fft_length);
  s->spec = fw_fft_alloc_complex (ctx->n_spec);
  s->a = malloc (row * sizeof (float));
  s->b = malloc (row * sizeof (float));
  if (s->in == NULL || s->spec == NULL || s->a == NULL || s->b == NULL)
    goto fail;
  /* Outside the window the frame stays zero for every frame. */
  memset (s->in, 0, ctx->cfg->fft_length * sizeof (float));
  return s;

fail:
  frame_scratch_free (s);
  return NULL;
}

/* The stage-0 spectrum row of the frame whose samples are at `frame`. Power is computed
 * in float (re^2 + im^2, relative error ~1e-7) so the loop vectorises. */
static void
frame_spectrum (const FrameCtx *ctx, FrameScratch *s, const float *frame, float *restrict row)
{
  const size_t wl = ctx->cfg->window_length, nspec = ctx->n_spec;
  float *restrict dst = s->in + ctx->win_offset;
  const float *restrict src = frame;
  const float *restrict w = ctx->window;
  const fftwf_complex *restrict spec = s->spec;

  for (size_t i = 0; i < wl; i++)
    dst[i] = src[i] * w[i];
  fw_fft_r2c (ctx->plan, s->in, s->spec);
  if (ctx->cfg->spectrum == FW_SPECTRUM_POWER)
    for (size_t k = 0; k < nspec; k++)
      row[k] = spec[k][0] * spec[k][0] + spec[k][1] * spec[k][1];
  else
    for (size_t k = 0; k < nspec; k++)
      row[k] = sqrtf (spec[k][0] * spec[k][0] + spec[k][1] * spec[k][1]);
}

static void
frame_row (RowJob *job, void *scratch, size_t t)
{
  FrameCtx *ctx = job->ctx;
  FrameScratch *s = scratch;
  const FwAnalysisConfig *cfg = ctx->cfg;
  size_t wl = cfg->window_length;
  size_t p0 = t * cfg->hop_length + ctx->win_offset;
  const float *frame = signal_view_direct (&ctx->signal, p0, wl);
  float *cur, *other;
  size_t n;

  if (frame == NULL)
    {
      signal_view_read (&ctx->signal, p0, wl, s->frame);
      frame = s->frame;
    }

  if (ctx->root == FW_STAGE_RMS)
    {
      double acc = 0.0;
      for (size_t i = 0; i < wl; i++)
        acc += (double) frame[i] * (double) frame[i];
      ctx->out->data[t] = (float) sqrt (acc / (double) wl);
      return;
    }
  if (ctx->root == FW_STAGE_ZCR)
    {
      size_t crossings = 0;
      for (size_t i = 0; i + 1 < wl; i++)
        crossings += (frame[i] >= 0.0f) != (frame[i + 1] >= 0.0f);
      ctx->out->data[t] = wl > 1 ? (float) ((double) crossings / (double) (wl - 1)) : 0.0f;
      return;
    }

  cur = s->a;
  other = s->b;
  frame_spectrum (ctx, s, frame, cur);
  n = ctx->n_spec;
  if (ctx->descriptor != FW_STAGE_SIGNAL)
    {
      ctx->out->data[t] = (float) spectral_descriptor (cfg, ctx->descriptor, cur, n);
      return;
    }
  if (ctx->bank != NULL)
    {
      fw_mel_bank_apply (ctx->bank, cur, other);
      n = cfg->mel_bands;
      cur = other;
      other = (cur == s->a) ? s->b : s->a;
    }
  if (ctx->db)
    {
      db_row_values (&ctx->dbp, cur, other, n);
      cur = other;
      other = (cur == s->a) ? s->b : s->a;
    }
  if (ctx->dct != NULL)
    {
      fw_dct_plan_apply (ctx->dct, cur, fw_matrix_row (ctx->out, t));
      return;
    }
  memcpy (fw_matrix_row (ctx->out, t), cur, n * sizeof (float));
}

/* ---------------------------------------------------------------- derived stages */

typedef struct
{
  const FwAnalysisConfig *cfg;
  FwStage stage;
  const FwMatrix *in;
  FwMatrix *out;
  DbParams dbp;
  const FwMelBank *bank;
  const FwDctPlan *dct;
} DeriveCtx;

static void
db_row (RowJob *job, void *scratch, size_t t)
{
  DeriveCtx *d = job->ctx;
  db_row_values (&d->dbp, d->in->data + t * d->in->n_bins, fw_matrix_row (d->out, t),
                 d->in->n_bins);
}

static void
mel_row (RowJob *job, void *scratch, size_t t)
{
  DeriveCtx *d = job->ctx;
  fw_mel_bank_apply (d->bank, d->in->data + t * d->in->n_bins, fw_matrix_row (d->out, t));
}

static void
mfcc_row (RowJob *job, void *scratch, size_t t)
{
  DeriveCtx *d = job->ctx;
  fw_dct_plan_apply (d->dct, d->in->data + t * d->in->n_bins, fw_matrix_row (d->out, t));
}

static void
descriptor_row (RowJob *job, void *scratch, size_t t)
{
  DeriveCtx *d = job->ctx;
  d->out->data[t] = (float) spectral_descriptor (d->cfg, d->stage,
                                                 d->in->data + t * d->in->n_bins, d->in->n_bins);
}

static FwDspStatus
run_rows (DeriveCtx *d, RowFunc fn, int n_threads)
{
  RowJob job;

  memset (&job, 0, sizeof job);
  job.n_rows = d->in->n_frames;
  job.row = fn;
  job.ctx = d;
  if (job.n_rows == 0)
    return FW_DSP_OK;
  return row_job_run (&job, n_threads);
}

static float
matrix_max (const float *data, size_t n)
{
  float m = -INFINITY;
  for (size_t i = 0; i < n; i++)
    if (data[i] > m)
      m = data[i];
  return m;
}

/* Rule 5 on `in` (a spectrum or a mel matrix); `stage` is FW_STAGE_DB or FW_STAGE_MEL_DB. */
static FwDspStatus
derive_db (const FwAnalysisConfig *cfg, FwStage stage, const FwMatrix *in, int n_threads,
           FwMatrix **out)
{
  DeriveCtx d = { .cfg = cfg, .stage = stage, .in = in };
  FwDspStatus st;
  size_t n = in->n_frames * in->n_bins;

  d.out = fw_matrix_new (in->n_frames, in->n_bins);
  if (d.out == NULL)
    return FW_DSP_ERROR_NO_MEMORY;
  copy_axes (d.out, in, stage);
  d.dbp = db_params (cfg, cfg->db_reference_max ? (double) matrix_max (in->data, n) : 0.0);

  st = run_rows (&d, db_row, n_threads);
  if (st != FW_DSP_OK)
    {
      fw_matrix_unref (d.out);
      return st;
    }
  if (cfg->dynamic_range > 0.0 && n > 0)
    {
      float lowest = (float) ((double) matrix_max (d.out->data, n) - cfg->dynamic_range);
      for (size_t i = 0; i < n; i++)
        if (d.out->data[i] < lowest)
          d.out->data[i] = lowest;
    }
  *out = d.out;
  return FW_DSP_OK;
}

static FwMelBank *
bank_for (const FwAnalysisConfig *cfg, FwDspStatus *status)
{
  return fw_mel_bank_new (cfg->mel_scale, cfg->mel_weights, cfg->mel_bands, cfg->fmin,
                          cfg->fmax, cfg->sample_rate, cfg->fft_length, status);
}

static FwDctPlan *
dct_for (const FwAnalysisConfig *cfg)
{
  return fw_dct_plan_new (cfg->mel_bands, cfg->cepstral_count, cfg->dct_norm, cfg->lifter);
}

static FwDspStatus
derive_one (const FwAnalysisConfig *cfg, FwStage stage, const FwMatrix *in, int n_threads,
            FwMatrix **out)
{
  DeriveCtx d = { .cfg = cfg, .stage = stage, .in = in };
  FwDspStatus st = FW_DSP_OK;
  FwMelBank *bank = NULL;
  FwDctPlan *dct = NULL;

  switch (stage)
    {
    case FW_STAGE_DB:
    case FW_STAGE_MEL_DB:
      return derive_db (cfg, stage, in, n_threads, out);

    case FW_STAGE_MEL:
      bank = bank_for (cfg, &st);
      if (bank == NULL)
        return st;
      d.bank = bank;
      d.out = fw_matrix_new (in->n_frames, cfg->mel_bands);
      if (d.out == NULL)
        {
          fw_mel_bank_free (bank);
          return FW_DSP_ERROR_NO_MEMORY;
        }
      copy_time_axis (d.out, in, stage);
      set_mel_axis (d.out, bank);
      st = run_rows (&d, mel_row, n_threads);
      fw_mel_bank_free (bank);
      break;

    case FW_STAGE_MFCC:
      dct = dct_for (cfg);
      if (dct == NULL)
        return FW_DSP_ERROR_NO_MEMORY;
      d.dct = dct;
      d.out = fw_matrix_new (in->n_frames, cfg->cepstral_count);
      if (d.out == NULL)
        {
          fw_dct_plan_free (dct);
          return FW_DSP_ERROR_NO_MEMORY;
        }
      copy_time_axis (d.out, in, stage);
      set_coefficient_axis (d.out);
      st = run_rows (&d, mfcc_row, n_threads);
      fw_dct_plan_free (dct);
      break;

    case FW_STAGE_DELTA:
    case FW_STAGE_DELTA2:
      d.out = fw_matrix_new (in->n_frames, in->n_bins);
      if (d.out == NULL)
        return FW_DSP_ERROR_NO_MEMORY;
      copy_axes (d.out, in, stage);
      fw_deltas (in->data, in->n_frames, in->n_bins, cfg->delta_width, d.out->data);
      break;

    case FW_STAGE_CENTROID:
    case FW_STAGE_BANDWIDTH:
    case FW_STAGE_ROLLOFF:
    case FW_STAGE_FLATNESS:
      d.out = fw_matrix_new (in->n_frames, 1);
      if (d.out == NULL)
        return FW_DSP_ERROR_NO_MEMORY;
      copy_time_axis (d.out, in, stage);
      set_scalar_axis (d.out);
      st = run_rows (&d, descriptor_row, n_threads);
      break;

    default:
      return FW_DSP_ERROR_INVALID_ARGUMENT;
    }

  if (st != FW_DSP_OK)
    {
      fw_matrix_unref (d.out);
      return st;
    }
  *out = d.out;
  return FW_DSP_OK;
}

static size_t
expected_bins (const FwAnalysisConfig *cfg, FwStage stage)
{
  switch (stage)
    {
    case FW_STAGE_SPECTRUM:
    case FW_STAGE_DB:
      return cfg->fft_length / 2 + 1;
    case FW_STAGE_MEL:
    case FW_STAGE_MEL_DB:
      return cfg->mel_bands;
    case FW_STAGE_MFCC:
    case FW_STAGE_DELTA:
    case FW_STAGE_DELTA2:
      return cfg->cepstral_count;
    default:
      return 1;
    }
}

FwDspStatus
fw_analysis_derive (const FwAnalysisConfig *cfg, FwStage stage, const FwMatrix *parent,
                    FwMatrix **out)
{
  FwStage want;
  FwDspStatus st;

  if (out != NULL)
    *out = NULL;
  if (out == NULL || parent == NULL || !stage_valid (stage))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  st = fw_analysis_check (cfg);
  if (st != FW_DSP_OK)
    return st;
  want = fw_stage_parent (stage);
  if (want == FW_STAGE_SIGNAL || parent->stage != (int) want
      || parent->n_bins != expected_bins (cfg, want))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  return derive_one (cfg, stage, parent, 1, out);
}

/* ---------------------------------------------------------------- the whole chain */

static bool
is_descriptor (FwStage s)
{
  return s == FW_STAGE_CENTROID || s == FW_STAGE_BANDWIDTH || s == FW_STAGE_ROLLOFF
         || s == FW_STAGE_FLATNESS;
}

FwDspStatus
fw_analysis_run (const FwAnalysisConfig *cfg, const float *signal, size_t n_samples,
                 FwStage stage, int n_threads, FwProgressFunc progress, void *user_data,
                 FwMatrix **out)
{
  FrameCtx ctx;
  RowJob job;
  FwDspStatus st;
  FwMatrix *m = NULL;
  FwMelBank *bank = NULL;
  FwDctPlan *dct = NULL;
  double *wd = NULL;
  size_t n_frames, n_cols;
  FwStage chain[FW_N_STAGES];  /* root first, `stage` last */
  int n_chain = 0, n_fused, i;
  FwStage last_fused;
  bool global_db;
  double frame_share;

  if (out != NULL)
    *out = NULL;
  if (out == NULL || (signal == NULL && n_samples > 0) || !stage_valid (stage))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  st = fw_analysis_check (cfg);
  if (st != FW_DSP_OK)
    return st;
  n_frames = fw_frame_count (n_samples, cfg->fft_length, cfg->hop_length, cfg->centered);
  if (n_samples == 0 || n_frames == 0)
    return FW_DSP_ERROR_TOO_SHORT;
  if (n_threads < 1)
    n_threads = 1;

  if (progress != NULL && progress (0.0, user_data) != 0)
    return FW_DSP_ERROR_CANCELLED;

  /* The chain from the root stage down to `stage`. */
  for (FwStage s = stage; s != FW_STAGE_SIGNAL; s = fw_stage_parent (s))
    n_chain++;
  i = n_chain;
  for (FwStage s = stage; s != FW_STAGE_SIGNAL; s = fw_stage_parent (s))
    chain[--i] = s;

  /* Steps that only need their own frame run inside the frame pass; a dB conversion whose
   * reference or clamp depends on the whole matrix, and the deltas, run as passes after. */
  memset (&ctx, 0, sizeof ctx);
  ctx.cfg = cfg;
  ctx.root = chain[0];
  ctx.descriptor = FW_STAGE_SIGNAL;
  global_db = cfg->db_reference_max || cfg->dynamic_range > 0.0;
  n_fused = 1;
  while (n_fused < n_chain)
    {
      FwStage s = chain[n_fused];
      if (s == FW_STAGE_MEL || s == FW_STAGE_MFCC || is_descriptor (s)
          || ((s == FW_STAGE_DB || s == FW_STAGE_MEL_DB) && !global_db))
        n_fused++;
      else
        break;
    }
  last_fused = chain[n_fused - 1];

  st = FW_DSP_ERROR_NO_MEMORY;
  signal_view_init (&ctx.signal, cfg, signal, n_samples);
  ctx.win_offset = _fw_analysis_window_offset (cfg);
  ctx.n_spec = cfg->fft_length / 2 + 1;
  if (ctx.root == FW_STAGE_SPECTRUM)
    {
      wd = malloc (cfg->window_length * sizeof (double));
      ctx.window = malloc (cfg->window_length * sizeof (float));
      ctx.plan = fw_fft_plan_get (cfg->fft_length);
      if (wd == NULL || ctx.window == NULL || ctx.plan == NULL)
        goto out;
      fw_window_fill (cfg->window, cfg->window_symmetry, cfg->window_length, wd);
      for (size_t k = 0; k < cfg->window_length; k++)
        ctx.window[k] = (float) wd[k];
    }
  for (i = 1; i < n_fused; i++)
    switch (chain[i])
      {
      case FW_STAGE_MEL:
        bank = bank_for (cfg, &st);
        if (bank == NULL)
          goto out;
        ctx.bank = bank;
        break;
      case FW_STAGE_DB:
      case FW_STAGE_MEL_DB:
        ctx.db = true;
        ctx.dbp = db_params (cfg, 0.0);
        break;
      case FW_STAGE_MFCC:
        dct = dct_for (cfg);
        if (dct == NULL)
          {
            st = FW_DSP_ERROR_NO_MEMORY;
            goto out;
          }
        ctx.dct = dct;
        break;
      default:
        ctx.descriptor = chain[i];
        break;
      }

  n_cols = is_descriptor (last_fused) ? 1 : expected_bins (cfg, last_fused);
  m = fw_matrix_new (n_frames, n_cols);
  if (m == NULL)
    {
      st = FW_DSP_ERROR_NO_MEMORY;
      goto out;
    }
  set_time_axis (m, cfg, last_fused);
  switch (last_fused)
    {
    case FW_STAGE_SPECTRUM:
    case FW_STAGE_DB:
      set_hz_axis (m, cfg);
      break;
    case FW_STAGE_MEL:
    case FW_STAGE_MEL_DB:
      set_mel_axis (m, bank);
      break;
    case FW_STAGE_MFCC:
      set_coefficient_axis (m);
      break;
    default:
      set_scalar_axis (m);
      break;
    }
  ctx.out = m;

  memset (&job, 0, sizeof job);
  job.n_rows = n_frames;
  job.scratch_new = frame_scratch_new;
  job.scratch_free = frame_scratch_free;
  job.row = frame_row;
  job.ctx = &ctx;
  job.progress = progress;
  job.user_data = user_data;
  frame_share = n_fused < n_chain ? 0.85 : 1.0;
  job.p0 = 0.0;
  job.p1 = frame_share;
  st = row_job_run (&job, n_threads);
  if (st != FW_DSP_OK)
    goto out;

  /* The remaining stages, each a pass over the previous matrix. */
  for (i = n_fused; i < n_chain; i++)
    {
      FwMatrix *next = NULL;
      st = derive_one (cfg, chain[i], m, n_threads, &next);
      if (st != FW_DSP_OK)
        goto out;
      fw_matrix_unref (m);
      m = next;
      if (progress != NULL && i + 1 < n_chain
          && progress (frame_share + (1.0 - frame_share) * (double) (i + 1 - n_fused)
                                       / (double) (n_chain - n_fused),
                       user_data) != 0)
        {
          st = FW_DSP_ERROR_CANCELLED;
          goto out;
        }
    }
  st = FW_DSP_OK;
  if (progress != NULL)
    progress (1.0, user_data); /* done: a request to cancel now has nothing left to stop */
  *out = m;
  m = NULL;

out:
  fw_matrix_unref (m);
  fw_mel_bank_free (bank);
  fw_dct_plan_free (dct);
  free (wd);
  free (ctx.window);
  return st;
}
