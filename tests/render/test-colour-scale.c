/* test-colour-scale.c: lightness, neutrality and symmetry of the colour scales, value ranges.
 *
 * CIELAB from 8-bit sRGB, written here independently of src/render:
 *   sRGB decoding: IEC 61966-2-1:1999, V <= 0.04045 ? V / 12.92 : ((V + 0.055) / 1.055)^2.4
 *   linear sRGB -> XYZ: the IEC 61966-2-1 matrix (rows 0.4124 0.3576 0.1805 /
 *                       0.2126 0.7152 0.0722 / 0.0193 0.1192 0.9505)
 *   XYZ -> L*a*b*: CIE 15:2004 (CIE 1976 L*a*b*), reference white D65 Xn = 0.95047, Yn = 1,
 *                  Zn = 1.08883; f(t) = t^(1/3) for t > (6/29)^3, else t / (3 (6/29)^2) + 4/29;
 *                  L* = 116 f(Y/Yn) - 16, a* = 500 (f(X/Xn) - f(Y/Yn)), b* = 200 (f(Y/Yn) - f(Z/Zn))
 */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib.h>

#include "fw-test-render.h"

#include "fw-colour-scale.h"

static double
decode (double v)
{
  return v <= 0.04045 ? v / 12.92 : pow ((v + 0.055) / 1.055, 2.4);
}

static double
cie_f (double t)
{
  const double d = 6.0 / 29.0;
  return t > d * d * d ? cbrt (t) : t / (3 * d * d) + 4.0 / 29.0;
}

static void
srgb8_to_lab (const uint8_t *c, double lab[3])
{
  double r = decode (c[0] / 255.0), g = decode (c[1] / 255.0), b = decode (c[2] / 255.0);
  double x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  double y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  double z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  double fx = cie_f (x / 0.95047), fy = cie_f (y / 1.0), fz = cie_f (z / 1.08883);

  lab[0] = 116 * fy - 16;
  lab[1] = 500 * (fx - fy);
  lab[2] = 200 * (fy - fz);
}

static void
test_lab_conversion (void)
{
  static const uint8_t white[3] = { 255, 255, 255 }, red[3] = { 255, 0, 0 };
  double lab[3];

  /* The test's own conversion against common reference values: sRGB white -> L* 100,
   * a* = b* = 0 (by the definition of the white point, to the matrix' 4-digit rounding);
   * sRGB red -> L* 53.24, a* 80.09, b* 67.20 (from memory, widely tabulated with the
   * full-precision matrix; the formulas above with the standard's 4-digit matrix give 53.2329,
   * 80.1093, 67.2201, recomputed with /usr/bin/python3, hence the 0.05 tolerance). */
  srgb8_to_lab (white, lab);
  g_assert_cmpfloat_with_epsilon (lab[0], 100.0, 0.01);
  g_assert_cmpfloat_with_epsilon (lab[1], 0.0, 0.05);
  g_assert_cmpfloat_with_epsilon (lab[2], 0.0, 0.05);
  srgb8_to_lab (red, lab);
  g_assert_cmpfloat_with_epsilon (lab[0], 53.24, 0.05);
  g_assert_cmpfloat_with_epsilon (lab[1], 80.09, 0.05);
  g_assert_cmpfloat_with_epsilon (lab[2], 67.20, 0.05);
}

static void
test_inventory (void)
{
  size_t n, n_seq = 0, n_div = 0, n_grey = 0;
  const FwColourScale *const *list = fw_colour_scale_list (&n);
  /* names of colour maps shipped by other software; ours must be our own */
  static const char *const foreign[] = { "viridis", "magma", "inferno", "plasma", "cividis",
                                         "jet", "turbo", "hot", "cool", "parula", "rainbow",
                                         "gray", "grey", "coolwarm", "RdBu", "spectral" };

  for (size_t i = 0; i < n; i++)
    {
      const uint8_t *lut = fw_colour_scale_get_lut (list[i]);
      gboolean grey = TRUE;
      double max_chroma = 0;
      for (size_t f = 0; f < G_N_ELEMENTS (foreign); f++)
        g_assert_cmpint (g_ascii_strcasecmp (fw_colour_scale_get_name (list[i]), foreign[f]), !=, 0);
      g_assert_true (fw_colour_scale_get (fw_colour_scale_get_name (list[i])) == list[i]);
      /* a greyscale: every entry neutral to within one 8-bit step (256 strictly rising
       * lightness steps need more than the 8-bit greys alone, so some entries are nudged by
       * one code value in one channel; such a nudge moves a* or b* by well under 1.5) */
      for (int k = 0; k < FW_COLOUR_SCALE_SIZE; k++)
        {
          double lab[3];
          srgb8_to_lab (&lut[3 * k], lab);
          max_chroma = MAX (max_chroma, hypot (lab[1], lab[2]));
        }
      grey = max_chroma < 1.5;
      if (fw_colour_scale_get_kind (list[i]) == FW_COLOUR_SCALE_SEQUENTIAL)
        {
          n_seq++;
          n_grey += grey;
        }
      else
        n_div++;
    }
  /* the issue asks for at least three sequential colour scales, a greyscale and a diverging one */
  g_assert_cmpuint (n_seq - n_grey, >=, 3);
  g_assert_cmpuint (n_grey, >=, 1);
  g_assert_cmpuint (n_div, >=, 1);
  g_assert_null (fw_colour_scale_get ("viridis"));
}

static void
test_sequential_lightness (void)
{
  size_t n;
  const FwColourScale *const *list = fw_colour_scale_list (&n);

  for (size_t i = 0; i < n; i++)
    {
      const uint8_t *lut = fw_colour_scale_get_lut (list[i]);
      double prev = -1, first, hue_min = HUGE_VAL, hue_max = -HUGE_VAL;

      if (fw_colour_scale_get_kind (list[i]) != FW_COLOUR_SCALE_SEQUENTIAL)
        continue;
      for (int k = 0; k < FW_COLOUR_SCALE_SIZE; k++)
        {
          double lab[3];
          srgb8_to_lab (&lut[3 * k], lab);
          if (k == 0)
            first = lab[0];
          /* strictly rising L* (the requirement for sequential scales) */
          if (!(lab[0] > prev))
            g_error ("%s: L* at entry %d (%.3f) does not exceed entry %d (%.3f)",
                     fw_colour_scale_get_name (list[i]), k, lab[0], k - 1, prev);
          prev = lab[0];
          /* hue span among clearly coloured entries: a rainbow sweeps 250 degrees or more */
          if (hypot (lab[1], lab[2]) > 10)
            {
              double h = atan2 (lab[2], lab[1]) * 180 / G_PI;
              if (h < -60)
                h += 360; /* keep reds continuous */
              hue_min = MIN (hue_min, h);
              hue_max = MAX (hue_max, h);
            }
        }
      /* a usable lightness span: at least 70 L* units (common practice for sequential maps) */
      g_assert_cmpfloat (prev - first, >=, 70.0);
      if (hue_max > hue_min)
        g_assert_cmpfloat (hue_max - hue_min, <, 150.0);
    }
}

static void
test_diverging (void)
{
  size_t n;
  const FwColourScale *const *list = fw_colour_scale_list (&n);
  gboolean seen = FALSE;

  for (size_t i = 0; i < n; i++)
    {
      const uint8_t *lut = fw_colour_scale_get_lut (list[i]);
      double mid_a[3], mid_b[3], lo[3], hi[3];

      if (fw_colour_scale_get_kind (list[i]) != FW_COLOUR_SCALE_DIVERGING)
        continue;
      seen = TRUE;
      /* neutral midpoint: entries 127 and 128 straddle zero (value 0 -> entry round(127.5)) */
      srgb8_to_lab (&lut[3 * 127], mid_a);
      srgb8_to_lab (&lut[3 * 128], mid_b);
      g_assert_cmpfloat (fabs (mid_a[1]), <, 1.5);
      g_assert_cmpfloat (fabs (mid_a[2]), <, 1.5);
      g_assert_cmpfloat (fabs (mid_b[1]), <, 1.5);
      g_assert_cmpfloat (fabs (mid_b[2]), <, 1.5);
      /* symmetric lightness: L*(i) = L*(255 - i) to within 8-bit rounding (0.5 L*), and
       * falling away from the middle towards both ends */
      for (int k = 0; k < FW_COLOUR_SCALE_SIZE / 2; k++)
        {
          double a[3], b[3], a_next[3];
          srgb8_to_lab (&lut[3 * k], a);
          srgb8_to_lab (&lut[3 * (FW_COLOUR_SCALE_SIZE - 1 - k)], b);
          g_assert_cmpfloat (fabs (a[0] - b[0]), <, 0.5);
          srgb8_to_lab (&lut[3 * (k + 1)], a_next);
          g_assert_cmpfloat (a_next[0], >, a[0]);
        }
      /* the two sides are told apart by hue, not lightness: opposite signs of b* at the ends */
      srgb8_to_lab (&lut[0], lo);
      srgb8_to_lab (&lut[3 * 255], hi);
      g_assert_cmpfloat (lo[2] * hi[2], <, 0.0);
      g_assert_cmpfloat (hypot (lo[1], lo[2]), >, 30.0);
      g_assert_cmpfloat (hypot (hi[1], hi[2]), >, 30.0);
    }
  g_assert_true (seen);
}

static FwMatrix *
ramp_matrix (size_t frames, size_t bins, double lo, double hi)
{
  FwMatrix *m = fw_matrix_new (frames, bins);
  size_t n = frames * bins;
  for (size_t i = 0; i < n; i++)
    m->data[i] = (float) (lo + (hi - lo) * (double) i / (double) (n - 1));
  for (size_t t = 0; t < frames; t++)
    m->frame_times[t] = 0.01 * (double) t;
  for (size_t k = 0; k < bins; k++)
    m->bin_value[k] = (double) k;
  m->bin_kind = FW_BIN_AXIS_COEFFICIENT;
  m->hop_seconds = 0.01;
  return m;
}

static void
test_value_ranges (void)
{
  FwMatrix *m = ramp_matrix (100, 101, -120.0, 0.0); /* 10100 values evenly from -120 to 0 */
  FwValueRange r;
  g_autoptr (GError) error = NULL;

  /* dB rule (fw-colour-scale.h): hi = max = 0; lo = max(max - 80, 1st percentile);
   * the 1st percentile of an even ramp over [-120, 0] is -120 + 0.01 * 120 = -118.8 (linear
   * interpolation between order statistics, as numpy.percentile's default), so lo = -80 */
  g_assert_true (fw_value_range_auto (m, FW_RANGE_RULE_DB, 0, 0, &r));
  g_assert_cmpfloat_with_epsilon (r.hi, 0.0, 1e-4);
  g_assert_cmpfloat_with_epsilon (r.lo, -80.0, 1e-4);

  /* percentile rule: [p1, p99] = [-118.8, -1.2] */
  g_assert_true (fw_value_range_auto (m, FW_RANGE_RULE_PERCENTILE, 0, 0, &r));
  g_assert_cmpfloat_with_epsilon (r.lo, -118.8, 1e-3);
  g_assert_cmpfloat_with_epsilon (r.hi, -1.2, 1e-3);

  /* symmetric rule: +-p99(|x|) = +-(120 - 0.01 * 120) = +-118.8 */
  g_assert_true (fw_value_range_auto (m, FW_RANGE_RULE_SYMMETRIC, 0, 0, &r));
  g_assert_cmpfloat_with_epsilon (r.hi, 118.8, 1e-3);
  g_assert_cmpfloat_with_epsilon (r.lo, -118.8, 1e-3);

  /* the time range restricts the frames: frames 50..99 hold values from about -60.6 to 0 */
  g_assert_true (fw_value_range_auto (m, FW_RANGE_RULE_DB, 0.495, 1.0, &r));
  g_assert_cmpfloat (r.lo, >, -61.0);
  fw_matrix_unref (m);

  /* cepstral rule ignores c0: c0 = -500 everywhere, other coefficients in [-2, 2] */
  m = ramp_matrix (50, 13, -2.0, 2.0);
  for (size_t t = 0; t < 50; t++)
    m->data[t * 13] = -500.0f;
  g_assert_true (fw_value_range_auto (m, FW_RANGE_RULE_CEPSTRAL, 0, 0, &r));
  g_assert_cmpfloat (r.hi, <=, 2.0);
  g_assert_cmpfloat (r.hi, >, 1.9);
  g_assert_cmpfloat_with_epsilon (r.lo, -r.hi, 1e-12);
  fw_matrix_unref (m);

  g_assert_true (fw_value_range_parse ("-80:0", &r, &error));
  g_assert_cmpfloat (r.lo, ==, -80.0);
  g_assert_cmpfloat (r.hi, ==, 0.0);
  g_assert_false (fw_value_range_parse ("0:-80", &r, &error));
  g_assert_nonnull (strstr (error->message, "0:-80"));
  g_clear_error (&error);
  g_assert_false (fw_value_range_parse ("loud", &r, &error));
  g_assert_nonnull (strstr (error->message, "loud"));
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/render/colour/lab-conversion", test_lab_conversion);
  g_test_add_func ("/fw/render/colour/inventory", test_inventory);
  g_test_add_func ("/fw/render/colour/sequential-lightness", test_sequential_lightness);
  g_test_add_func ("/fw/render/colour/diverging", test_diverging);
  g_test_add_func ("/fw/render/colour/value-ranges", test_value_ranges);
  return g_test_run ();
}
