/* fw-analysis.h: the analysis pipeline, every convention an explicit field.
 *
 * Stages and their parents (a stage is computed from its parent's matrix):
 *   signal -> spectrum (power or magnitude) -> db
 *                                           -> mel -> mel-db -> mfcc -> delta -> delta2
 *                                           -> centroid, bandwidth, rolloff, flatness
 *   signal -> rms, zcr
 * The exact definitions are in DEVELOPERS.md ("Stages and conventions"); each function here
 * implements one of them and nothing else. The model layer (src/model/fw-params.h) turns a
 * named, validated parameter set into an FwAnalysisConfig.
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include "fw-cepstrum.h"
#include "fw-dsp-types.h"
#include "fw-matrix.h"
#include "fw-mel.h"
#include "fw-window.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum { FW_PADDING_ZEROS, FW_PADDING_REFLECT, FW_PADDING_EDGE } FwPadding;
typedef enum { FW_SPECTRUM_POWER, FW_SPECTRUM_MAGNITUDE } FwSpectrumKind;

const char *fw_padding_name (FwPadding p);              /* "zeros", "reflect", "edge" */
bool fw_padding_from_name (const char *name, FwPadding *out);
const char *fw_spectrum_kind_name (FwSpectrumKind s);   /* "power", "magnitude" */
bool fw_spectrum_kind_from_name (const char *name, FwSpectrumKind *out);

typedef enum {
  FW_STAGE_SIGNAL = -1,   /* not a stage: the parent of the root stages */
  FW_STAGE_SPECTRUM = 0,  /* named "power" or "magnitude" after FwAnalysisConfig.spectrum */
  FW_STAGE_DB,
  FW_STAGE_MEL,
  FW_STAGE_MEL_DB,
  FW_STAGE_MFCC,
  FW_STAGE_DELTA,
  FW_STAGE_DELTA2,
  FW_STAGE_RMS,
  FW_STAGE_ZCR,
  FW_STAGE_CENTROID,
  FW_STAGE_BANDWIDTH,
  FW_STAGE_ROLLOFF,
  FW_STAGE_FLATNESS,
  FW_N_STAGES
} FwStage;

/* "power" for FW_STAGE_SPECTRUM (use fw_stage_display_name for the config-aware name), "db",
 * "mel", "mel-db", "mfcc", "delta", "delta2", "rms", "zcr", "centroid", "bandwidth",
 * "rolloff", "flatness". */
const char *fw_stage_name (FwStage stage);
/* "power" or "magnitude" for the spectrum stage according to kind, else fw_stage_name. */
const char *fw_stage_display_name (FwStage stage, FwSpectrumKind kind);
/* Accepts every name above; both "power" and "magnitude" map to FW_STAGE_SPECTRUM. */
bool fw_stage_from_name (const char *name, FwStage *out);
FwStage fw_stage_parent (FwStage stage);

/* Rolloff fraction used by the rolloff descriptor (common practice). */
#define FW_ROLLOFF_FRACTION 0.85

typedef struct {
  double sample_rate;        /* analysis rate in Hz (after any resampling), > 0 */
  double pre_emphasis;       /* a in y[n] = x[n] - a x[n-1]; 0 = off; 0 <= a < 1 */
  size_t window_length;      /* samples, >= 1 */
  size_t hop_length;         /* samples, >= 1 */
  size_t fft_length;         /* samples, >= window_length */
  FwWindowKind window;
  FwWindowSymmetry window_symmetry;
  bool centered;             /* pad floor(fft_length/2) at both ends */
  FwPadding padding;
  FwSpectrumKind spectrum;
  size_t mel_bands;          /* >= 1 */
  FwMelScale mel_scale;
  double fmin;               /* Hz, >= 0 */
  double fmax;               /* Hz, resolved (never 0 here), fmin < fmax <= sample_rate/2 */
  FwMelWeights mel_weights;
  bool db_reference_max;     /* true: reference = max of the matrix being converted */
  double db_reference;       /* used when !db_reference_max; > 0 */
  double db_floor;           /* > 0 */
  double dynamic_range;      /* dB; 0 = off; > 0 clamps values below max - dynamic_range */
  size_t cepstral_count;     /* 1..mel_bands, includes c0 */
  FwDctNorm dct_norm;
  double lifter;             /* 0 = off */
  size_t delta_width;        /* >= 1 */
} FwAnalysisConfig;

/* Frame count for a signal of n_samples: centered pads floor(fft_length/2) at both ends;
 * count = 1 + floor((L_padded - fft_length) / hop). Returns 0 when L_padded < fft_length. */
size_t fw_frame_count (size_t n_samples, size_t fft_length, size_t hop_length, bool centered);
/* Centre time in seconds of frame t: (t*hop + fft_length/2 - pad) / sample_rate, where
 * pad = floor(fft_length/2) when centered, else 0. */
double fw_frame_time (const FwAnalysisConfig *cfg, size_t t);

/* Checks the configuration on its own (no signal): FW_DSP_OK or
 * FW_DSP_ERROR_INVALID_ARGUMENT. The model layer gives the user-facing messages. */
FwDspStatus fw_analysis_check (const FwAnalysisConfig *cfg);

/* Return non-zero to cancel. `fraction` runs from 0 to 1. May be called from any thread. */
typedef int (*FwProgressFunc) (double fraction, void *user_data);

/* Pre-emphasis y[0] = x[0], y[n] = x[n] - a x[n-1], in place; a = 0 leaves x unchanged. */
void fw_pre_emphasis (float *x, size_t n, double a);

/* Computes `stage` from the signal through every intermediate stage. n_threads <= 1 runs on
 * the calling thread; more splits the frames across threads. On success *out holds a new
 * matrix (reference count 1). The signal must be finite. */
FwDspStatus fw_analysis_run (const FwAnalysisConfig *cfg, const float *signal, size_t n_samples,
                             FwStage stage, int n_threads, FwProgressFunc progress,
                             void *user_data, FwMatrix **out);

/* Computes `stage` from its parent's matrix (for caches that keep intermediate stages).
 * For the root stages (spectrum, rms, zcr) use fw_analysis_run. */
FwDspStatus fw_analysis_derive (const FwAnalysisConfig *cfg, FwStage stage,
                                const FwMatrix *parent, FwMatrix **out);

#ifdef __cplusplus
}
#endif
