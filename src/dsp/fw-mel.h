/* fw-mel.h: mel scales and triangular mel filterbanks.
 *
 *   htk:    m = 2595 log10(1 + f/700)            (HTK Book 5.4; O'Shaughnessy 1987)
 *   slaney: m = 3 f / 200 below 1000 Hz, 15 + 27 ln(f/1000)/ln(6.4) above
 *           (Slaney, Auditory Toolbox, 1998)
 * Filterbank: n_bands + 2 points equally spaced in mel from fmin to fmax, converted to Hz;
 * band m is a triangle linear in Hz rising from f[m] to f[m+1] and falling to f[m+2],
 * evaluated at the bin frequencies k sr / fft_length, k = 0..fft_length/2.
 * `area` scales band m by 2 / (f[m+2] - f[m]); `unit` leaves the peak at 1.
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include "fw-dsp-types.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum { FW_MEL_SCALE_HTK, FW_MEL_SCALE_SLANEY } FwMelScale;
typedef enum { FW_MEL_WEIGHTS_AREA, FW_MEL_WEIGHTS_UNIT } FwMelWeights;

const char *fw_mel_scale_name (FwMelScale s);           /* "htk", "slaney" */
bool fw_mel_scale_from_name (const char *name, FwMelScale *out);
const char *fw_mel_weights_name (FwMelWeights w);       /* "area", "unit" */
bool fw_mel_weights_from_name (const char *name, FwMelWeights *out);

double fw_hz_to_mel (FwMelScale scale, double hz);
double fw_mel_to_hz (FwMelScale scale, double mel);

typedef struct _FwMelBank FwMelBank;

/* NULL with *status set when the arguments are invalid (n_bands == 0, fmin < 0,
 * fmax <= fmin, fmax > sr/2, fft_length < 2). Bands covering no bin are NOT an error here:
 * ask fw_mel_bank_empty_bands(). */
FwMelBank *fw_mel_bank_new (FwMelScale scale, FwMelWeights weights, size_t n_bands,
                            double fmin, double fmax, double sample_rate, size_t fft_length,
                            FwDspStatus *status);
void fw_mel_bank_free (FwMelBank *bank);

size_t fw_mel_bank_n_bands (const FwMelBank *bank);
size_t fw_mel_bank_n_bins (const FwMelBank *bank);          /* fft_length/2 + 1 */
/* n_bands + 2 edge points in Hz (f[0] = fmin, f[n_bands+1] = fmax). */
const double *fw_mel_bank_edges_hz (const FwMelBank *bank);
/* Weight of bin k in band m (0 outside the triangle). */
double fw_mel_bank_weight (const FwMelBank *bank, size_t band, size_t bin);
/* Writes the indices of bands whose weights are all zero into out (up to max) and returns
 * how many such bands there are. */
size_t fw_mel_bank_empty_bands (const FwMelBank *bank, size_t *out, size_t max);
/* mel[m] = sum_k weight(m, k) * spectrum[k], accumulated in double. */
void fw_mel_bank_apply (const FwMelBank *bank, const float *spectrum, float *mel);

#ifdef __cplusplus
}
#endif
