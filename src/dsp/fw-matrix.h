/* fw-matrix.h: a feature matrix (frames x bins) with its frame times and bin axis.
 *
 * Every stage of the pipeline produces one of these. Row-major: data[t * n_bins + k] is
 * frame t, bin k. Each frame carries its centre time in seconds, so rows computed with
 * different hops line up on a shared time axis without per-widget arithmetic.
 * Reference counted (atomic), so caches and worker threads can share one matrix.
 */
#pragma once

#include <stddef.h>

#include "fw-dsp-types.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum {
  FW_BIN_AXIS_HZ,          /* bin_value = k * sr / fft_length (linear spectral bins) */
  FW_BIN_AXIS_MEL_BAND,    /* bin_value = band centre in Hz; bin_low/high = band edges in Hz */
  FW_BIN_AXIS_COEFFICIENT, /* bin_value = coefficient index (0 = c0) */
  FW_BIN_AXIS_SCALAR,      /* one column: a per-frame descriptor */
} FwBinAxisKind;

typedef struct {
  int ref_count;          /* atomic; use fw_matrix_ref/unref */
  size_t n_frames;
  size_t n_bins;
  float *data;            /* n_frames * n_bins, frame-major */
  double *frame_times;    /* n_frames: frame centre time in seconds */
  double *bin_value;      /* n_bins: see FwBinAxisKind */
  double *bin_low;        /* n_bins: lower edge in Hz (HZ: value - df/2; MEL_BAND: edge), else = value */
  double *bin_high;       /* n_bins: upper edge in Hz (as above) */
  FwBinAxisKind bin_kind;
  double sample_rate;     /* analysis rate the matrix was computed at */
  double hop_seconds;     /* hop_length / sample_rate */
  int stage;              /* an FwStage (fw-analysis.h) or -1 when not from the pipeline */
} FwMatrix;

/* Allocates a zeroed matrix with reference count 1; NULL when out of memory. */
FwMatrix *fw_matrix_new (size_t n_frames, size_t n_bins);
FwMatrix *fw_matrix_ref (FwMatrix *m);
void fw_matrix_unref (FwMatrix *m);
/* Deep copy with reference count 1. */
FwMatrix *fw_matrix_copy (const FwMatrix *m);
/* Approximate heap size in bytes (for cache budgets). */
size_t fw_matrix_bytes (const FwMatrix *m);

static inline float
fw_matrix_get (const FwMatrix *m, size_t frame, size_t bin)
{
  return m->data[frame * m->n_bins + bin];
}

static inline float *
fw_matrix_row (FwMatrix *m, size_t frame)
{
  return m->data + frame * m->n_bins;
}

#ifdef __cplusplus
}
#endif
