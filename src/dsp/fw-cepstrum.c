/* fw-cepstrum.c: DCT-II (unnormalised or orthonormal) and sinusoidal liftering.
 *
 *   none:  y_k = 2 sum_{n=0}^{N-1} x_n cos(pi k (2n+1) / (2N))
 *   ortho: y_0 * sqrt(1/(4N)), y_k * sqrt(1/(2N)) for k > 0
 *   lifter L > 0: w_n = 1 + (L/2) sin(pi n / L)
 * Cosines are evaluated with the angle reduced modulo 2 pi in integer arithmetic, so a
 * coefficient that is zero by symmetry comes out at rounding level.
 */
#include "fw-cepstrum.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#ifndef M_PI
#define M_PI 3.14159265358979323846
#endif

struct _FwDctPlan
{
  size_t n_in;
  size_t n_out;
  double *matrix; /* n_in x n_out (input-major), lifter and normalisation folded in */
};

const char *
fw_dct_norm_name (FwDctNorm n)
{
  switch (n)
    {
    case FW_DCT_NORM_ORTHO:
      return "ortho";
    case FW_DCT_NORM_NONE:
      return "none";
    default:
      return NULL;
    }
}

bool
fw_dct_norm_from_name (const char *name, FwDctNorm *out)
{
  if (name == NULL)
    return false;
  if (strcmp (name, "ortho") == 0)
    {
      if (out)
        *out = FW_DCT_NORM_ORTHO;
      return true;
    }
  if (strcmp (name, "none") == 0)
    {
      if (out)
        *out = FW_DCT_NORM_NONE;
      return true;
    }
  return false;
}

/* cos(pi k (2n+1) / (2N)) with the integer k(2n+1) reduced modulo 4N. */
static double
dct_cos (size_t k, size_t n, size_t big_n)
{
  unsigned long long period = 4ULL * big_n;
  unsigned long long r = ((unsigned long long) k % period) * ((2ULL * n + 1) % period) % period;
  return cos (M_PI * (double) r / (2.0 * (double) big_n));
}

static double
dct_scale (size_t k, size_t big_n, FwDctNorm norm)
{
  if (norm == FW_DCT_NORM_ORTHO)
    return 2.0 * (k == 0 ? sqrt (1.0 / (4.0 * (double) big_n)) : sqrt (1.0 / (2.0 * (double) big_n)));
  return 2.0;
}

void
fw_dct2 (const double *in, size_t n, double *out, size_t n_out, FwDctNorm norm)
{
  for (size_t k = 0; k < n_out; k++)
    {
      double acc = 0.0;
      for (size_t j = 0; j < n; j++)
        acc += in[j] * dct_cos (k, j, n);
      out[k] = acc * dct_scale (k, n, norm);
    }
}

void
fw_lifter_weights (size_t n, double lifter, double *out)
{
  for (size_t i = 0; i < n; i++)
    out[i] = (lifter > 0.0) ? 1.0 + 0.5 * lifter * sin (M_PI * (double) i / lifter) : 1.0;
}

FwDctPlan *
fw_dct_plan_new (size_t n_in, size_t n_out, FwDctNorm norm, double lifter)
{
  FwDctPlan *plan;
  double *lift;

  if (n_in == 0 || n_out == 0)
    return NULL;
  plan = calloc (1, sizeof *plan);
  lift = malloc (n_out * sizeof *lift);
  if (plan == NULL || lift == NULL)
    {
      free (plan);
      free (lift);
      return NULL;
    }
  plan->matrix = malloc (n_in * n_out * sizeof (double));
  if (plan->matrix == NULL)
    {
      free (plan);
      free (lift);
      return NULL;
    }
  plan->n_in = n_in;
  plan->n_out = n_out;
  fw_lifter_weights (n_out, lifter, lift);
  for (size_t k = 0; k < n_out; k++)
    {
      double s = dct_scale (k, n_in, norm) * lift[k];
      for (size_t j = 0; j < n_in; j++)
        plan->matrix[j * n_out + k] = s * dct_cos (k, j, n_in);
    }
  free (lift);
  return plan;
}

void
fw_dct_plan_free (FwDctPlan *plan)
{
  if (plan == NULL)
    return;
  free (plan->matrix);
  free (plan);
}

void
fw_dct_plan_apply (const FwDctPlan *plan, const float *in, float *out)
{
  /* Accumulate all outputs together, input by input: the inner loop over k has independent
   * lanes and vectorises; each output is still summed in the fixed order j = 0..n_in-1. */
  double acc_stack[64];
  double *acc = plan->n_out <= 64 ? acc_stack : malloc (plan->n_out * sizeof (double));
  const size_t n_out = plan->n_out;

  if (acc == NULL)
    {
      for (size_t k = 0; k < n_out; k++)
        {
          double a = 0.0;
          for (size_t j = 0; j < plan->n_in; j++)
            a += plan->matrix[j * n_out + k] * (double) in[j];
          out[k] = (float) a;
        }
      return;
    }
  for (size_t k = 0; k < n_out; k++)
    acc[k] = 0.0;
  for (size_t j = 0; j < plan->n_in; j++)
    {
      const double *restrict row = plan->matrix + j * n_out;
      double *restrict a = acc;
      const double x = (double) in[j];
      for (size_t k = 0; k < n_out; k++)
        a[k] += row[k] * x;
    }
  for (size_t k = 0; k < n_out; k++)
    out[k] = (float) acc[k];
  if (acc != acc_stack)
    free (acc);
}
