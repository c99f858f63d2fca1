/* fw-feature.h: computing a stage for audio + parameters, with user-facing errors.
 *
 * This is the one place where FwParams meets the dsp pipeline; the feature cache, the CLI,
 * the exporter and the window all go through it.
 */
#pragma once

#include <gio/gio.h>

#include "fw-analysis.h"
#include "fw-audio.h"
#include "fw-params.h"

G_BEGIN_DECLS

#define FW_FEATURE_ERROR (fw_feature_error_quark ())
GQuark fw_feature_error_quark (void);

typedef enum {
  FW_FEATURE_ERROR_STAGE,      /* unknown stage name: lists the names */
  FW_FEATURE_ERROR_FAILED,
  FW_FEATURE_ERROR_CANCELLED,
} FwFeatureError;

/* Parses a stage name (error names the value and lists the stages). */
gboolean fw_feature_parse_stage (const char *name, FwStage *out, GError **error);
/* The stage names, NULL-terminated, for help texts. */
const char *const *fw_feature_stage_names (void);

/* Checks params against the audio (fw_params_check) and computes the stage. The audio must
 * have been loaded at the params' sample_rate / channel (fw_feature_load_audio does that).
 * Progress and cancellation through `cancellable` and the optional callback. */
FwMatrix *fw_feature_compute (FwAudio *audio, const FwParams *params, FwStage stage,
                              int n_threads, FwProgressFunc progress, void *user_data,
                              GCancellable *cancellable, GError **error);
/* Loads path with the params' channel policy and sample_rate. */
FwAudio *fw_feature_load_audio (const char *path, const FwParams *params,
                                GCancellable *cancellable, GError **error);

/* Label of a stage's values for colour bars and readouts: "power, dB re 1.0",
 * "dB re clip max", "MFCC value", "magnitude", "Hz", ... Caller frees. */
char *fw_feature_quantity_label (FwStage stage, const FwParams *params);
/* Unit of the values ("dB", "Hz", "" ...). */
const char *fw_feature_value_unit (FwStage stage, const FwParams *params);

/* Writes a matrix as NPY 1.0 (little-endian float32, C order, shape (frames, bins)) or, for
 * any other extension, CSV with a header row. Atomic. */
gboolean fw_feature_write (const FwMatrix *m, const char *path, GError **error);

/* Added by the model layer: */
/* "power" or "magnitude" for the spectrum stage (per params' spectrum; params may be NULL),
 * else the stage's name ("mel-db", ...). Static string. */
const char *fw_feature_stage_name (FwStage stage, const FwParams *params);
/* Columns of a stage's matrix: fft_length/2+1 (spectrum, db), mel_bands (mel, mel-db),
 * cepstral_count (mfcc, delta, delta2), 1 (descriptors). */
gsize fw_feature_n_bins (FwStage stage, const FwParams *params);
/* fw_params_check() against this audio (rate and length after loading), errors prefixed with
 * the file name, plus warnings about resampling (upsampling adds nothing; strong downsampling
 * removes content). warnings may be NULL. fw_feature_compute() calls this first. */
gboolean fw_feature_check (FwAudio *audio, const FwParams *params, GPtrArray *warnings,
                           GError **error);
/* The NPY 1.0 preamble (magic, version, length, padded dict) for a float32 (frames, bins)
 * C-order array; its size is a multiple of 64 bytes. */
GBytes *fw_feature_npy_header (gsize n_frames, gsize n_bins);

G_END_DECLS
