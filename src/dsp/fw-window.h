/* fw-window.h: analysis windows and their figures of merit.
 *
 * Cosine-sum windows w[n] = a0 - a1 cos(2 pi n / D) + a2 cos(4 pi n / D), n = 0..N-1,
 * with D = N (periodic, "DFT-even", Harris 1978) or D = N - 1 (symmetric).
 * hann 0.5/0.5, hamming 0.54/0.46, blackman 0.42/0.5/0.08, rectangular all ones.
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include "fw-dsp-types.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum {
  FW_WINDOW_RECTANGULAR,
  FW_WINDOW_HANN,
  FW_WINDOW_HAMMING,
  FW_WINDOW_BLACKMAN,
  FW_N_WINDOWS
} FwWindowKind;

typedef enum {
  FW_WINDOW_PERIODIC,
  FW_WINDOW_SYMMETRIC,
} FwWindowSymmetry;

/* Text names used in parameter files: "rectangular", "hann", "hamming", "blackman". */
const char *fw_window_kind_name (FwWindowKind kind);
bool fw_window_kind_from_name (const char *name, FwWindowKind *out);
/* "periodic", "symmetric" */
const char *fw_window_symmetry_name (FwWindowSymmetry sym);
bool fw_window_symmetry_from_name (const char *name, FwWindowSymmetry *out);

/* Fills out[0..n-1]. n == 1 gives { 1.0 }. */
void fw_window_fill (FwWindowKind kind, FwWindowSymmetry sym, size_t n, double *out);

/* Figures of merit, definitions as in F. J. Harris, Proc. IEEE 66(1), 1978:
 *   coherent_gain       = sum(w) / N
 *   enbw_bins           = N sum(w^2) / sum(w)^2
 *   scalloping_loss_db  = -20 log10(|W(1/2 bin)| / W(0))          (positive number)
 *   worst_case_loss_db  = scalloping_loss_db + 10 log10(enbw_bins)
 *   highest_sidelobe_db = max |W| beyond the first null, re W(0)   (negative number)
 *   bw3_bins / bw6_bins = full main-lobe width at -3.0103 dB / -6.0206 dB (half power /
 *                         half amplitude)
 * W is the DTFT of w evaluated in double precision. */
typedef struct {
  double coherent_gain;
  double enbw_bins;
  double scalloping_loss_db;
  double worst_case_loss_db;
  double highest_sidelobe_db;
  double bw3_bins;
  double bw6_bins;
} FwWindowMerit;

FwDspStatus fw_window_merit (FwWindowKind kind, FwWindowSymmetry sym, size_t n,
                             FwWindowMerit *out);

#ifdef __cplusplus
}
#endif
