/* fw-analysis-private.h: in-tree helpers of fw-analysis.c exposed for tests and tools.
 * Not part of the public contract; no GLib here either. */
#pragma once

#include <stddef.h>

#include "fw-analysis.h"

#ifdef __cplusplus
extern "C" {
#endif

/* The signal exactly as the framer sees it: pre-emphasis applied to the whole signal, then
 * (when cfg->centered) floor(fft_length/2) samples of padding at both ends. Returns a
 * malloc'd buffer of *padded_len samples (free with free()), or NULL when out of memory or
 * n_samples == 0. */
float *_fw_analysis_prepare_signal (const FwAnalysisConfig *cfg, const float *signal,
                                    size_t n_samples, size_t *padded_len);

/* Offset of the window inside each fft_length frame: floor((fft_length - window_length)/2). */
size_t _fw_analysis_window_offset (const FwAnalysisConfig *cfg);

#ifdef __cplusplus
}
#endif
