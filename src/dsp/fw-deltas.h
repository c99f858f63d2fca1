/* fw-deltas.h: regression deltas (HTK Book eq. 5.16; Furui 1986).
 *
 *   d_t = sum_{k=1..N} k (c_{t+k} - c_{t-k}) / (2 sum_{k=1..N} k^2),  N = width,
 * with frames before the first and after the last replaced by the first / last frame.
 */
#pragma once

#include <stddef.h>

#ifdef __cplusplus
extern "C" {
#endif

/* in and out are n_frames x n_cols, frame-major; they must not overlap. width >= 1. */
void fw_deltas (const float *in, size_t n_frames, size_t n_cols, size_t width, float *out);

#ifdef __cplusplus
}
#endif
