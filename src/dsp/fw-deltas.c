/* fw-deltas.c: HTK regression deltas with replicated edge frames.
 *
 *   d_t = sum_{k=1..N} k (c_{min(t+k, T-1)} - c_{max(t-k, 0)}) / (2 sum_{k=1..N} k^2)
 * accumulated in double per cell (k in increasing order), stored as float.
 */
#include "fw-deltas.h"

void
fw_deltas (const float *in, size_t n_frames, size_t n_cols, size_t width, float *out)
{
  double denom = 0.0;

  if (n_frames == 0 || n_cols == 0 || width == 0)
    return;
  for (size_t k = 1; k <= width; k++)
    denom += (double) k * (double) k;
  denom *= 2.0;

  for (size_t t = 0; t < n_frames; t++)
    for (size_t c = 0; c < n_cols; c++)
      {
        double s = 0.0;
        for (size_t k = 1; k <= width; k++)
          {
            size_t hi = (k < n_frames - t) ? t + k : n_frames - 1;
            size_t lo = (t >= k) ? t - k : 0;
            s += (double) k * ((double) in[hi * n_cols + c] - (double) in[lo * n_cols + c]);
          }
        out[t * n_cols + c] = (float) (s / denom);
      }
}
