/* fw-cepstrum.h: DCT-II along the mel axis and sinusoidal liftering.
 *
 *   none:  y_k = 2 sum_{n=0}^{N-1} x_n cos(pi k (2n+1) / (2N))   (unnormalised, as in common
 *          numeric libraries' dct type 2 with no normalisation)
 *   ortho: y_0 scaled by sqrt(1/(4N)), y_k (k>0) by sqrt(1/(2N))  (orthonormal)
 *   lifter L > 0: c_n *= 1 + (L/2) sin(pi n / L)   (Juang, Rabiner, Wilpon 1987; HTK)
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include "fw-dsp-types.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum { FW_DCT_NORM_ORTHO, FW_DCT_NORM_NONE } FwDctNorm;

const char *fw_dct_norm_name (FwDctNorm n);     /* "ortho", "none" */
bool fw_dct_norm_from_name (const char *name, FwDctNorm *out);

/* Direct double-precision DCT-II of in[0..n-1]; writes the first n_out coefficients. */
void fw_dct2 (const double *in, size_t n, double *out, size_t n_out, FwDctNorm norm);

/* Lifter weights w_0..w_{n-1}; all 1 when lifter <= 0. */
void fw_lifter_weights (size_t n, double lifter, double *out);

/* A precomputed n_out x n_in DCT matrix with the lifter folded in, applied per frame. */
typedef struct _FwDctPlan FwDctPlan;
FwDctPlan *fw_dct_plan_new (size_t n_in, size_t n_out, FwDctNorm norm, double lifter);
void fw_dct_plan_free (FwDctPlan *plan);
void fw_dct_plan_apply (const FwDctPlan *plan, const float *in, float *out);

#ifdef __cplusplus
}
#endif
