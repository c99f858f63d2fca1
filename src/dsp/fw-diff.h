/* fw-diff.h: aligning two feature matrices and explaining how they differ.
 *
 * Alignment (fw_diff_align):
 *   time  - both sides are put on one side's frame-centre times (the reference side: the
 *           coarser hop, A on a tie, unless options say otherwise) over the span where both
 *           have frames. Equal hops whose origins differ by whole frames are matched by index
 *           (no interpolation); anything else is linear interpolation of the other side
 *           between its two neighbouring frame centres.
 *   bins  - equal bin axes are kept; two spectral axes (FW_BIN_AXIS_HZ or _MEL_BAND) are
 *           mapped onto the reference side's bin centres in Hz (the side with fewer bins, A on
 *           a tie) by linear interpolation over the common frequency span; coefficient axes
 *           compare the common leading coefficients; anything else compares the common
 *           leading columns by index. FwDiffAlignment says what was done.
 *
 * Measures (fw_diff_compute): the difference D = B - A, for linear kinds also the ratio in dB
 * and the relative difference (B - A) / |A|; per-bin and per-frame curves; max |D|, RMS(D),
 * mean(D) and the correlation of A and B.
 *
 * Explanation: D is decomposed (in dB for linear kinds, as is otherwise) into
 *   B[t, k] = A[t - lag, k] + offset + bin_offset[k] + residual[t, k]
 * where lag is the integer frame shift within +-max_lag that minimises the RMS of what is
 * left after removing the per-bin means (least squares; a lag is only named when it at least
 * halves that RMS against no shift), offset is the mean of the shifted difference and
 * bin_offset[k] its per-bin mean minus offset. A component is "named" (has_*) when it is
 * larger than the largest residual and than the float32 precision of the data.
 * For plain kinds a per-bin factor B[t, k] ~ g[k] A[t - lag, k] is also fitted and named when
 * it leaves less than half the RMS the offsets leave (DCT scaling, liftering).
 *
 * Plain C11, no GLib: messages are built from these numbers by the model layer (fw-compare).
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include "fw-dsp-types.h"
#include "fw-matrix.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum {
  FW_DIFF_VALUES_PLAIN,     /* signed or logarithmic values (dB, MFCC, Hz, ...): differences */
  FW_DIFF_VALUES_POWER,     /* linear power-like values: ratio in dB = 10 log10(B / A) */
  FW_DIFF_VALUES_AMPLITUDE, /* linear amplitude-like values: ratio in dB = 20 log10(B / A) */
} FwDiffValueKind;

typedef enum {
  FW_DIFF_BINS_SAME,     /* identical bin axes */
  FW_DIFF_BINS_COMMON,   /* coefficient/scalar axes: the common leading bins by index */
  FW_DIFF_BINS_HZ,       /* the other side interpolated onto the reference's centres in Hz */
  FW_DIFF_BINS_BY_INDEX, /* axes of different kinds: the common leading columns by index */
} FwDiffBinMapping;

#define FW_DIFF_DEFAULT_MAX_LAG 8
#define FW_DIFF_DEFAULT_LOG_RANGE_DB 120.0

typedef struct {
  FwDiffValueKind value_kind;
  int max_lag;           /* frames searched each way; 0 = no lag search */
  int time_reference;    /* -1 automatic (coarser hop, A on a tie), 0 = A, 1 = B */
  int bin_reference;     /* -1 automatic (fewer bins, A on a tie), 0 = A, 1 = B */
  double log_range_db;   /* linear kinds: values more than this below the larger side's
                            maximum are floored before taking dB (default 120) */
} FwDiffOptions;

void fw_diff_options_init (FwDiffOptions *options);

typedef struct {
  size_t a_frames, a_bins, b_frames, b_bins;  /* input shapes */
  double a_hop, b_hop;             /* seconds (from hop_seconds, else from the frame times) */
  double a_start, a_end;           /* first / last frame centre of A, seconds */
  double b_start, b_end;
  double start, end;               /* compared span: first / last compared frame centre */
  int time_reference;              /* 0 = A's frame times, 1 = B's */
  bool time_resampled;             /* the other side was interpolated in time */
  long index_shift;                /* not resampled: B frame = A frame + index_shift */
  size_t a_unused_frames;          /* frames of A outside the compared span */
  size_t b_unused_frames;
  FwDiffBinMapping bin_mapping;
  int bin_reference;               /* side whose bin axis the result carries */
  size_t a_unused_bins;            /* bins of A not compared (outside the common span/count) */
  size_t b_unused_bins;
  double freq_low, freq_high;      /* FW_DIFF_BINS_HZ: compared span of bin centres, Hz */
} FwDiffAlignment;

/* Overlap of the two sides' frame-centre spans, in seconds, with a tolerance of a millionth
 * of a hop. Returns false (and leaves start/end untouched) when they do not overlap. */
bool fw_diff_time_overlap (const FwMatrix *a, const FwMatrix *b, double *start, double *end);

/* Puts A and B on a common grid. On success *a_out and *b_out are new matrices of equal
 * shape carrying the reference sides' frame times and bin axis. Errors:
 * FW_DSP_ERROR_INVALID_ARGUMENT for empty matrices, frame times that are not increasing or
 * not finite, or no overlap in time or frequency (check with fw_diff_time_overlap first to
 * say which). */
FwDspStatus fw_diff_align (const FwMatrix *a, const FwMatrix *b, const FwDiffOptions *options,
                           FwDiffAlignment *alignment, FwMatrix **a_out, FwMatrix **b_out);

typedef struct {
  bool in_db;                 /* decomposed in dB (linear kinds) */
  double db_factor;           /* 10 or 20 when in_db, else 0 */
  int max_lag;                /* as searched (may be smaller than asked for short inputs) */
  int lag_frames;             /* B[t] ~ A[t - lag]: > 0 means B is later than A */
  double *lag_rms;            /* 2 * max_lag + 1 values: RMS left for shifts -max_lag..max_lag */
  double total_rms;           /* RMS of B - A before decomposition (decomposition units) */
  double total_max_abs;
  size_t frames_used;         /* frames left after the lag shift */
  double offset;              /* constant part */
  double *bin_offset;         /* n_bins: per-bin part beyond the constant */
  double bin_offset_max_abs;
  size_t bin_offset_argmax;
  double residual_rms;        /* what is left */
  double residual_max_abs;
  size_t residual_argmax_frame, residual_argmax_bin;
  double precision;           /* float32 resolution of the data, decomposition units */
  double value_rms;           /* RMS of A's values in decomposition units (for scale) */
  bool has_offset, has_bin_offset, has_lag;
  /* Plain kinds only: a per-bin factor B ~ g[k] A (after the lag). */
  double *bin_scale;          /* n_bins, or NULL */
  double scale;               /* a single factor B ~ g A */
  double scale_residual_rms;  /* RMS left by the per-bin factors */
  bool has_bin_scale;         /* the factors explain clearly more than the offsets */
  bool identical;             /* every compared value is bit-for-bit equal */
} FwDiffExplanation;

typedef struct {
  FwDiffAlignment align;
  FwDiffValueKind value_kind;
  FwMatrix *a, *b;            /* aligned operands (common grid) */
  FwMatrix *diff;             /* B - A */
  FwMatrix *ratio_db;         /* linear kinds: db_factor log10(B / A) with the floor; else NULL */
  FwMatrix *relative;         /* linear kinds: (B - A) / max(|A|, floor); else NULL */
  FwMatrix *residual;         /* the explanation's residual, decomposition units; frames
                                 outside the lag-shifted overlap hold 0 */
  size_t n_frames, n_bins;    /* compared shape */
  double *bin_mean, *bin_rms, *bin_max_abs;        /* n_bins: curves of D over frames */
  double *frame_mean, *frame_rms, *frame_max_abs;  /* n_frames: curves of D over bins */
  double max_abs_diff;
  size_t max_frame, max_bin;  /* where |D| is largest (aligned indices) */
  double rms_diff, mean_diff;
  double correlation;         /* Pearson of A and B over all cells; NaN when one is constant */
  double a_rms, a_max_abs, b_rms, b_max_abs;
  double floor;               /* linear kinds: the floor used for dB and relative values */
  FwDiffExplanation expl;
} FwDiffResult;

/* Aligns, measures and explains. *out is a new result. Errors as fw_diff_align, and
 * FW_DSP_ERROR_NO_MEMORY. */
FwDspStatus fw_diff_compute (const FwMatrix *a, const FwMatrix *b, const FwDiffOptions *options,
                             FwDiffResult **out);
void fw_diff_result_free (FwDiffResult *result);

/* Just the scalar measures, for searches (values as they are, no dB): RMS and max |B - A|
 * after alignment, B's RMS, and `affine_fraction`: the RMS left after fitting
 * B[., k] ~ g[k] A[., k] + o[k] in each bin by least squares, as a fraction of B's RMS about
 * its per-bin means (0 = B is exactly a per-bin gain and offset of A; a measure blind to
 * per-bin gains and offsets). Any output pointer may be NULL. Returns
 * FW_DSP_ERROR_INVALID_ARGUMENT when the sides cannot be aligned. */
FwDspStatus fw_diff_distance (const FwMatrix *a, const FwMatrix *b, const FwDiffOptions *options,
                              double *rms, double *max_abs, double *b_rms,
                              double *affine_fraction, size_t *n_frames, size_t *n_bins);

#ifdef __cplusplus
}
#endif
