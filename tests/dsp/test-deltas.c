/* test-deltas.c: HTK regression deltas with replicated edges.
 *
 * Source: check-values.md §4 (HTK Book eq. 5.16, PUB✓; edge replication PUB✓; the vectors are
 * NUM exact rationals, equal to scipy savgol_filter(c, 5, 2, deriv=1, mode='nearest')).
 * The doc asks for 1e-12; fw_deltas works in float (double accumulation, float storage), so
 * we assert 1e-5 absolute x max(1, |expected|), about 80 float ulps: ample for rounding,
 * far below the 0.1-sized differences between edge policies. */
#include "fw-deltas.h"
#include "fw-test-dsp.h"

#define FLOAT_TOL(v) (1e-5 * fmax (1.0, fabs (v)))

static void
check_vector (const float *in, size_t n, size_t width, const double *expect)
{
  float out[64];
  g_assert_cmpuint (n, <=, G_N_ELEMENTS (out));
  fw_deltas (in, n, 1, width, out);
  for (size_t t = 0; t < n; t++)
    fw_assert_close (out[t], expect[t], FLOAT_TOL (expect[t]), 0);
}

/* §4: c = [1, 2, 4, 7, 11] -> [0.7, 1.5, 2.5, 2.5, 1.8]. */
static void
test_vector_1 (void)
{
  const float c[] = { 1, 2, 4, 7, 11 };
  const double d[] = { 0.7, 1.5, 2.5, 2.5, 1.8 };
  check_vector (c, 5, 2, d);
}

/* §4: c_t = 3t + 1, t = 1..8 -> [1.5, 2.4, 3, 3, 3, 3, 2.4, 1.5]. */
static void
test_vector_linear (void)
{
  float c[8];
  const double d[] = { 1.5, 2.4, 3, 3, 3, 3, 2.4, 1.5 };
  for (int t = 1; t <= 8; t++)
    c[t - 1] = 3.0f * t + 1.0f;
  check_vector (c, 8, 2, d);
}

/* §4: c_t = t^2, t = 1..8 -> [1.9, 3.8, 6, 8, 10, 12, 10.6, 7.1]. */
static void
test_vector_square (void)
{
  float c[8];
  const double d[] = { 1.9, 3.8, 6, 8, 10, 12, 10.6, 7.1 };
  for (int t = 1; t <= 8; t++)
    c[t - 1] = (float) (t * t);
  check_vector (c, 8, 2, d);
}

/* §4: acceleration (delta of delta) of t^2, t = 1..16: frames >= 4 from either edge equal 2;
 * edges [1.01, 1.63, 2.04, 2.04, ..., 0.68, -2.04, -3.47, -3.41]. */
static void
test_vector_acceleration (void)
{
  float c[16], d[16], a[16];
  const double expect[16] = { 1.01, 1.63, 2.04, 2.04, 2, 2, 2, 2, 2, 2, 2, 2,
                              0.68, -2.04, -3.47, -3.41 };
  for (int t = 1; t <= 16; t++)
    c[t - 1] = (float) (t * t);
  fw_deltas (c, 16, 1, 2, d);
  fw_deltas (d, 16, 1, 2, a);
  for (int t = 0; t < 16; t++)
    fw_assert_close (a[t], expect[t], FLOAT_TOL (expect[t]), 0);
}

/* §4: the equivalent 9-tap acceleration kernel (width 2 twice) is
 * [0.04, 0.04, 0.01, -0.04, -0.10, -0.04, 0.01, 0.04, 0.04]: the response to an impulse far
 * from the edges. */
static void
test_vector_kernel (void)
{
  float c[21] = { 0 }, d[21], a[21];
  const double kernel[9] = { 0.04, 0.04, 0.01, -0.04, -0.10, -0.04, 0.01, 0.04, 0.04 };

  c[10] = 1.0f;
  fw_deltas (c, 21, 1, 2, d);
  fw_deltas (d, 21, 1, 2, a);
  for (int t = 0; t < 21; t++)
    {
      double e = (t >= 6 && t <= 14) ? kernel[t - 6] : 0.0;
      fw_assert_close (a[t], e, FLOAT_TOL (e), 0);
    }
}

/* Width 1 by hand from eq. 5.16: d_t = (c_{t+1} - c_{t-1}) / 2 with replicated edges, so
 * [1, 2, 4, 7, 11] -> [(2-1)/2, (4-1)/2, (7-2)/2, (11-4)/2, (11-7)/2] = [0.5, 1.5, 2.5, 3.5, 2]. */
static void
test_width_1 (void)
{
  const float c[] = { 1, 2, 4, 7, 11 };
  const double d[] = { 0.5, 1.5, 2.5, 3.5, 2.0 };
  check_vector (c, 5, 1, d);
}

/* Columns are independent; frames are rows (frame-major layout of fw-deltas.h). A single
 * frame has zero delta (every neighbour is itself). */
static void
test_columns (void)
{
  float in[5 * 3], out[5 * 3];
  const double d1[] = { 0.7, 1.5, 2.5, 2.5, 1.8 };
  const float c[] = { 1, 2, 4, 7, 11 };

  for (int t = 0; t < 5; t++)
    {
      in[t * 3 + 0] = c[t];
      in[t * 3 + 1] = -2.0f * c[t];
      in[t * 3 + 2] = 5.0f;
    }
  fw_deltas (in, 5, 3, 2, out);
  for (int t = 0; t < 5; t++)
    {
      fw_assert_close (out[t * 3 + 0], d1[t], FLOAT_TOL (d1[t]), 0);
      fw_assert_close (out[t * 3 + 1], -2.0 * d1[t], FLOAT_TOL (d1[t]), 0);
      g_assert_cmpfloat (out[t * 3 + 2], ==, 0.0f);
    }
  fw_deltas (in, 1, 3, 2, out);
  for (int k = 0; k < 3; k++)
    g_assert_cmpfloat (out[k], ==, 0.0f);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/dsp/deltas/vector-1-2-4-7-11", test_vector_1);
  g_test_add_func ("/fw/dsp/deltas/vector-linear", test_vector_linear);
  g_test_add_func ("/fw/dsp/deltas/vector-square", test_vector_square);
  g_test_add_func ("/fw/dsp/deltas/acceleration", test_vector_acceleration);
  g_test_add_func ("/fw/dsp/deltas/acceleration-kernel", test_vector_kernel);
  g_test_add_func ("/fw/dsp/deltas/width-1", test_width_1);
  g_test_add_func ("/fw/dsp/deltas/columns", test_columns);
  return g_test_run ();
}
