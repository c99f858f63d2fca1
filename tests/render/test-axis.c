/* test-axis.c: axis mapping, Heckbert's nice numbers, tick sets and label layout. */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib.h>

#include "fw-test-render.h"

#include "fw-axis.h"
#include "fw-theme.h"

/* ---- Heckbert, "Nice numbers for graph labels", Graphics Gems (1990) ----
 * The method: nicenum(x, round) takes the fraction f = x / 10^floor(log10 x) and returns
 * 1, 2, 5 or 10 times 10^floor(log10 x): with rounding at the thresholds f < 1.5, < 3, < 7;
 * without rounding as the smallest of 1, 2, 5, 10 that is >= f. loose_label(min, max, n):
 * range = nicenum(max - min, false); d = nicenum(range / (n - 1), true);
 * graphmin = floor(min / d) d; graphmax = ceil(max / d) d; nfrac = max(-floor(log10 d), 0).
 * The expected values below follow from that description by hand. */

static void
test_nice_number (void)
{
  /* rounding: f = 1.25 -> 1; 2.5 -> 2; 4.38 -> 5; 8 -> 10 (Heckbert's thresholds) */
  g_assert_cmpfloat_with_epsilon (fw_nice_number (125.0, true), 100.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (fw_nice_number (0.25, true), 0.2, 1e-12);
  g_assert_cmpfloat_with_epsilon (fw_nice_number (4.38, true), 5.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (fw_nice_number (8.0, true), 10.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (fw_nice_number (1.49, true), 1.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (fw_nice_number (1.5, true), 2.0, 1e-12);
  /* ceiling: f = 4.38 -> 5; 1 -> 1; 1.01 -> 2; 5.01 -> 10 */
  g_assert_cmpfloat_with_epsilon (fw_nice_number (438.0, false), 500.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (fw_nice_number (1.0, false), 1.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (fw_nice_number (1.01, false), 2.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (fw_nice_number (0.0501, false), 0.1, 1e-12);
}

static void
test_loose_zero_one (void)
{
  FwNiceLabels nl;

  /* Heckbert's method on [0, 1] with 5 ticks: range = nicenum(1, false) = 1,
   * d = nicenum(0.25, true) = 0.2 -> labels 0, 0.2, ..., 1.0 with one decimal */
  fw_nice_loose_labels (0.0, 1.0, 5, &nl);
  g_assert_cmpfloat_with_epsilon (nl.step, 0.2, 1e-12);
  g_assert_cmpfloat_with_epsilon (nl.graph_min, 0.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (nl.graph_max, 1.0, 1e-12);
  g_assert_cmpint (nl.n_frac, ==, 1);
  g_assert_cmpint (nl.n_ticks, ==, 6);
}

static void
test_loose_gems_example (void)
{
  FwNiceLabels nl;

  /* The worked example in Graphics Gems, data 105 .. 543 with 5 ticks, labelled 100 .. 600
   * in steps of 100 (from memory; it also follows by hand from the method: range =
   * nicenum(438, false) = 500, d = nicenum(125, true) = 100). */
  fw_nice_loose_labels (105.0, 543.0, 5, &nl);
  g_assert_cmpfloat_with_epsilon (nl.step, 100.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (nl.graph_min, 100.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (nl.graph_max, 600.0, 1e-9);
  g_assert_cmpint (nl.n_frac, ==, 0);
  g_assert_cmpint (nl.n_ticks, ==, 6);
}

static gboolean
is_one_two_five (double step)
{
  double e = floor (log10 (step));
  double f = step / pow (10.0, e);
  return fabs (f - 1) < 1e-9 || fabs (f - 2) < 1e-9 || fabs (f - 5) < 1e-9
         || fabs (f - 10) < 1e-9;
}

static void
test_loose_properties (void)
{
  GRand *rand = g_rand_new_with_seed (20240611);

  /* Bounds on the count derived from the thresholds: nicenum(x, false) < 2.5 x and
   * nicenum(x, true) >= x / 1.5 and <= x * 10 / 7, hence with R = max - min and n requested
   * ticks: d >= R / (1.5 (n - 1)) and d <= 2.5 R (10/7) / (n - 1); the count
   * (graphmax - graphmin) / d + 1 lies in [R / d + 1, R / d + 3]. */
  for (int i = 0; i < 2000; i++)
    {
      double lo = g_rand_double_range (rand, -1e4, 1e4) * pow (10.0, g_rand_int_range (rand, -6, 4));
      double span = g_rand_double_range (rand, 1e-3, 10.0) * pow (10.0, g_rand_int_range (rand, -5, 5));
      double hi = lo + span;
      int n = g_rand_int_range (rand, 2, 13);
      FwNiceLabels nl;
      double min_count, max_count;

      fw_nice_loose_labels (lo, hi, n, &nl);
      g_assert_true (is_one_two_five (nl.step));
      g_assert_cmpfloat (nl.graph_min, <=, lo + 1e-9 * nl.step);
      g_assert_cmpfloat (nl.graph_max, >=, hi - 1e-9 * nl.step);
      g_assert_cmpfloat (nl.graph_min, >, lo - nl.step);
      g_assert_cmpfloat (nl.graph_max, <, hi + nl.step);
      min_count = 1.0 + (n - 1) * 0.7 / 2.5;
      max_count = 1.5 * (n - 1) + 3.0;
      g_assert_cmpfloat (nl.n_ticks, >=, floor (min_count));
      g_assert_cmpfloat (nl.n_ticks, <=, ceil (max_count));
      /* nfrac decimals show every label exactly */
      g_assert_cmpfloat (nl.step * pow (10.0, nl.n_frac), >=, 1.0 - 1e-9);
    }
  g_rand_free (rand);
}

static void
test_ticks_inside (void)
{
  FwTicks t;

  /* Ticks stay inside the data range: [0.13, 9.87] with about 5 ticks, Heckbert step 2
   * (range nicenum(9.74, false) = 10, d = nicenum(2.5, true) = 2) -> 2, 4, 6, 8 */
  fw_ticks_linear (0.13, 9.87, 5, FW_TICK_NUMBER, &t);
  g_assert_cmpuint (t.n, ==, 4);
  g_assert_cmpfloat_with_epsilon (t.ticks[0].value, 2.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (t.ticks[3].value, 8.0, 1e-12);
  g_assert_cmpstr (t.ticks[0].label, ==, "2");

  /* negative labels carry U+2212 MINUS SIGN, and zero is never "-0" */
  fw_ticks_linear (-1.0, 1.0, 3, FW_TICK_NUMBER, &t);
  g_assert_cmpuint (t.n, ==, 3);
  g_assert_cmpstr (t.ticks[0].label, ==, "\xe2\x88\x92" "1");
  g_assert_cmpstr (t.ticks[1].label, ==, "0");

  /* integer style never steps below 1 (coefficient axes) */
  fw_ticks_linear (-0.5, 3.5, 12, FW_TICK_INTEGER, &t);
  g_assert_cmpfloat (t.step, >=, 1.0);
  for (size_t i = 0; i < t.n; i++)
    g_assert_cmpfloat (t.ticks[i].value, ==, floor (t.ticks[i].value));
  g_assert_cmpuint (t.n, ==, 4); /* 0, 1, 2, 3 */

  /* frequencies: kHz once a tick reaches 1000 Hz. Heckbert on [0, 11025]: range
   * nicenum(11025, false) = 20000; 6 ticks: d = nicenum(4000, true) = 5000 -> 0, 5, 10 kHz;
   * 11 ticks: d = nicenum(2000, true) = 2000 -> 0, 2, ..., 10 kHz */
  fw_ticks_linear (0, 11025, 6, FW_TICK_FREQUENCY, &t);
  g_assert_cmpstr (t.unit, ==, "kHz");
  g_assert_cmpuint (t.n, ==, 3);
  g_assert_cmpstr (t.ticks[1].label, ==, "5");
  fw_ticks_linear (0, 11025, 11, FW_TICK_FREQUENCY, &t);
  g_assert_cmpuint (t.n, ==, 6);
  g_assert_cmpstr (t.ticks[1].label, ==, "2");
  fw_ticks_linear (0, 800, 5, FW_TICK_FREQUENCY, &t);
  g_assert_cmpstr (t.unit, ==, "Hz");
  g_assert_cmpstr (t.ticks[1].label, ==, "200");
}

static void
test_time_units (void)
{
  FwTicks t;
  char buf[32];

  /* the unit follows the span shown (thresholds of our own design, fw-axis.h) */
  g_assert_cmpint (fw_time_unit_for_span (0.0, 0.5), ==, FW_TIME_MS);
  g_assert_cmpint (fw_time_unit_for_span (0.0, 30.0), ==, FW_TIME_S);
  g_assert_cmpint (fw_time_unit_for_span (12.0, 12.5), ==, FW_TIME_S);
  g_assert_cmpint (fw_time_unit_for_span (0.0, 600.0), ==, FW_TIME_MIN_S);

  fw_time_format (90.0, FW_TIME_MIN_S, 0, buf, sizeof buf);
  g_assert_cmpstr (buf, ==, "1:30");
  fw_time_format (3725.0, FW_TIME_MIN_S, 0, buf, sizeof buf);
  g_assert_cmpstr (buf, ==, "1:02:05");
  fw_time_format (0.25, FW_TIME_MS, 0, buf, sizeof buf);
  g_assert_cmpstr (buf, ==, "250");

  /* a 10-minute span with about 6 ticks: clock steps (2 minutes), labelled m:ss */
  fw_ticks_linear (0, 600, 6, FW_TICK_TIME, &t);
  g_assert_cmpstr (t.unit, ==, "min:s");
  g_assert_cmpfloat_with_epsilon (t.step, 120.0, 1e-9);
  g_assert_cmpstr (t.ticks[1].label, ==, "2:00");
  g_assert_cmpstr (t.ticks[t.n - 1].label, ==, "10:00");

  /* half a second: milliseconds, Heckbert step 100 ms */
  fw_ticks_linear (0, 0.5, 6, FW_TICK_TIME, &t);
  g_assert_cmpstr (t.unit, ==, "ms");
  g_assert_cmpfloat_with_epsilon (t.step, 0.1, 1e-12);
  g_assert_cmpstr (t.ticks[1].label, ==, "100");
}

static void
check_round_trip (const FwAxis *axis, double v)
{
  double p = fw_axis_value_to_pixel (axis, v);
  double back = fw_axis_pixel_to_value (axis, p);
  g_assert_cmpfloat (fabs (back - v), <=, 1e-9 * MAX (1.0, fabs (v)));
}

static void
test_round_trips (void)
{
  FwAxis a;
  static const double band_hz[] = { 50, 120, 200, 310, 450, 640, 900, 1250, 1700, 2300 };

  fw_axis_init (&a, FW_AXIS_LINEAR, -3.0, 7.0, 400.0, 10.0); /* reversed pixels */
  for (double v = -3; v <= 7; v += 0.37)
    check_round_trip (&a, v);
  g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&a, -3.0), 400.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&a, 2.0), 205.0, 1e-9);

  fw_axis_init (&a, FW_AXIS_LOG, 20.0, 20000.0, 0.0, 300.0);
  for (double v = 20; v <= 20000; v *= 1.31)
    check_round_trip (&a, v);
  /* three decades over 300 px: 200 Hz one decade up */
  g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&a, 200.0), 100.0, 1e-9);

  fw_axis_init_mel (&a, FW_MEL_SCALE_SLANEY, 0.0, 8000.0, 0.0, 1000.0);
  for (double v = 0; v <= 8000; v += 97.3)
    check_round_trip (&a, v);
  /* check-values.md 2.1 (NUM): Slaney mel(1000) = 15, mel(8000) = 45.24564047 */
  g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&a, 1000.0),
                                  1000.0 * 15.0 / 45.24564047, 1e-4);

  fw_axis_init_mel (&a, FW_MEL_SCALE_HTK, 0.0, 11025.0, 0.0, 1000.0);
  for (double v = 0; v <= 11025; v += 131.1)
    check_round_trip (&a, v);
  /* check-values.md 2.1 (NUM): HTK mel(1000) = 999.985537, mel(11025) = 3176.318436 */
  g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&a, 1000.0),
                                  1000.0 * 999.985537 / 3176.318436, 1e-3);

  fw_axis_init_bands (&a, band_hz, G_N_ELEMENTS (band_hz), -0.5, 9.5, 100.0, 0.0);
  for (double v = 30; v <= 2500; v += 17.0)
    check_round_trip (&a, v);
  /* band k's centre sits at the middle of its equal-height cell (definition in fw-axis.h) */
  for (size_t k = 0; k < G_N_ELEMENTS (band_hz); k++)
    g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&a, band_hz[k]),
                                    100.0 - (k + 0.5) * 10.0, 1e-9);
}

/* ---- label layout: an independent measurement of the chosen labels ---- */

static cairo_t *
scratch_cr (void)
{
  cairo_surface_t *s = cairo_image_surface_create (CAIRO_FORMAT_ARGB32, 4, 4);
  cairo_t *cr = cairo_create (s);
  cairo_surface_destroy (s);
  return cr;
}

/* Box of a label centred on its tick, measured here with a fresh Pango layout in the theme's
 * tick font (not with fw_ticks_measure). */
static void
label_span (cairo_t *cr, const FwTheme *theme, const char *text, bool horizontal, double *ext)
{
  PangoLayout *layout = pango_cairo_create_layout (cr);
  PangoFontDescription *desc = pango_font_description_new ();
  PangoRectangle ink, logical;

  pango_font_description_set_family (desc, theme->font_family);
  pango_font_description_set_absolute_size (desc, theme->font_size[FW_TEXT_TICK] * PANGO_SCALE);
  pango_layout_set_font_description (layout, desc);
  pango_layout_set_text (layout, text, -1);
  pango_layout_get_extents (layout, &ink, &logical);
  *ext = (double) (horizontal ? ink.width : ink.height) / PANGO_SCALE;
  pango_font_description_free (desc);
  g_object_unref (layout);
}

static void
test_no_overlap (void)
{
  static const double sizes[] = { 5, 7, 9, 12, 16 };
  static const double lengths[] = { 30, 60, 110, 200, 420, 800 };
  static const struct { double lo, hi; FwTickStyle style; FwAxisScale scale; } ranges[] = {
    { 0, 4.18, FW_TICK_TIME, FW_AXIS_LINEAR },
    { 0, 612, FW_TICK_TIME, FW_AXIS_LINEAR },
    { 0, 11025, FW_TICK_FREQUENCY, FW_AXIS_LINEAR },
    { 21.5, 11025, FW_TICK_FREQUENCY, FW_AXIS_LOG },
    { 0, 11025, FW_TICK_FREQUENCY, FW_AXIS_MEL },
    { -123.4, 56.7, FW_TICK_NUMBER, FW_AXIS_LINEAR },
    { -0.5, 12.5, FW_TICK_INTEGER, FW_AXIS_LINEAR },
  };
  cairo_t *cr = scratch_cr ();
  FwTheme theme;
  size_t checked = 0;

  fw_theme_init (&theme, FW_THEME_LIGHT);
  for (size_t s = 0; s < G_N_ELEMENTS (sizes); s++)
    for (size_t l = 0; l < G_N_ELEMENTS (lengths); l++)
      for (size_t r = 0; r < G_N_ELEMENTS (ranges); r++)
        for (int horizontal = 0; horizontal <= 1; horizontal++)
          {
            FwAxis axis;
            FwTicks t;
            double prev_end = -HUGE_VAL;

            theme.font_size[FW_TEXT_TICK] = sizes[s];
            if (ranges[r].scale == FW_AXIS_MEL)
              fw_axis_init_mel (&axis, FW_MEL_SCALE_SLANEY, ranges[r].lo, ranges[r].hi, 0,
                                lengths[l]);
            else
              fw_axis_init (&axis, ranges[r].scale, ranges[r].lo, ranges[r].hi, 0, lengths[l]);
            fw_axis_choose_ticks (cr, &theme, &axis, ranges[r].style, horizontal, 1e9, &t);
            g_assert_cmpuint (t.n, >=, 1);
            for (size_t i = 0; i < t.n; i++)
              {
                double p = fw_axis_value_to_pixel (&axis, t.ticks[i].value);
                double ext;
                label_span (cr, &theme, t.ticks[i].label, horizontal, &ext);
                /* ticks are sorted; ink boxes must not touch */
                g_assert_cmpfloat (p - ext / 2, >, prev_end);
                prev_end = p + ext / 2;
                g_assert_cmpfloat (p, >=, -1e-6);
                g_assert_cmpfloat (p, <=, lengths[l] + 1e-6);
              }
            checked++;
          }
  g_assert_cmpuint (checked, ==, 5 * 6 * 7 * 2);
  cairo_destroy (cr);
}

static void
test_overhang (void)
{
  cairo_t *cr = scratch_cr ();
  FwTheme theme;
  FwAxis axis;
  FwTicks t;
  double ext[FW_TICKS_MAX];

  /* a short vertical amplitude axis of a stacked row: no label may reach more than 2 units
   * past the axis ends (where the neighbouring row's labels are) */
  fw_theme_init (&theme, FW_THEME_LIGHT);
  fw_axis_init (&axis, FW_AXIS_LINEAR, -1.0, 1.0, 40.0, 0.0);
  fw_axis_choose_ticks (cr, &theme, &axis, FW_TICK_NUMBER, false, 2.0, &t);
  g_assert_cmpuint (t.n, >=, 2);
  fw_ticks_measure (cr, &theme, &t, false, ext);
  for (size_t i = 0; i < t.n; i++)
    {
      double p = fw_axis_value_to_pixel (&axis, t.ticks[i].value);
      g_assert_cmpfloat (p - ext[i] / 2, >=, -2.0 - 1e-9);
      g_assert_cmpfloat (p + ext[i] / 2, <=, 42.0 + 1e-9);
    }
  cairo_destroy (cr);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/render/axis/heckbert-nice-number", test_nice_number);
  g_test_add_func ("/fw/render/axis/heckbert-loose-0-1", test_loose_zero_one);
  g_test_add_func ("/fw/render/axis/heckbert-gems-example", test_loose_gems_example);
  g_test_add_func ("/fw/render/axis/heckbert-properties", test_loose_properties);
  g_test_add_func ("/fw/render/axis/ticks-inside-range", test_ticks_inside);
  g_test_add_func ("/fw/render/axis/time-units", test_time_units);
  g_test_add_func ("/fw/render/axis/round-trips", test_round_trips);
  g_test_add_func ("/fw/render/axis/labels-do-not-overlap", test_no_overlap);
  g_test_add_func ("/fw/render/axis/labels-stay-in-row", test_overhang);
  return g_test_run ();
}
