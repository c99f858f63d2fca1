/* fw-fft.h: real-to-complex FFTs (FFTW3 single precision) with a shared plan cache.
 *
 * FFTW's planner is not thread-safe: every planner call in Framewise goes through the one
 * lock in fw-fft.c (fw_fft_lock / fw_fft_unlock for code that must plan by itself).
 * Executing a plan with fw_fft_r2c() is thread-safe (new-array execute), so worker threads
 * share plans. Buffers must come from fw_fft_alloc_* (SIMD-aligned).
 */
#pragma once

#include <stddef.h>

#include <fftw3.h>

#ifdef __cplusplus
extern "C" {
#endif

typedef struct _FwFftPlan FwFftPlan;

/* The cached plan for an r2c transform of length n (n >= 1). Never freed before
 * fw_fft_cleanup(); NULL only when out of memory. Thread-safe. */
const FwFftPlan *fw_fft_plan_get (size_t n);
size_t fw_fft_plan_length (const FwFftPlan *plan);

/* out[k], k = 0..n/2, = sum_j in[j] exp(-2 pi i j k / n): the unscaled DFT. `in` is not
 * modified. Both arrays from fw_fft_alloc_*. */
void fw_fft_r2c (const FwFftPlan *plan, const float *in, fftwf_complex *out);

float *fw_fft_alloc_real (size_t n);
fftwf_complex *fw_fft_alloc_complex (size_t n);
void fw_fft_free (void *p);

void fw_fft_lock (void);
void fw_fft_unlock (void);
/* Destroys all cached plans; for leak checkers at exit. */
void fw_fft_cleanup (void);

#ifdef __cplusplus
}
#endif
