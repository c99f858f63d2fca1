/* test-curve.c: descriptor curves (fw-render-curve): a step drawn at the axis mapping's pixels,
 * one-frame peaks kept when zoomed out, breaks at non-finite values, automatic ranges, and the
 * figure's trace rows drawn by the same function. */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib.h>

#include "fw-test-render.h"

#include "fw-figure.h"
#include "fw-render-curve.h"

/* ---- helpers ---- */

/* A scalar matrix of n frames centred at (i + 0.5) * hop with values v[i]. */
static FwMatrix *
make_curve (const float *v, size_t n, double hop, FwStage stage)
{
  FwMatrix *m = fw_matrix_new (n, 1);

  g_assert_nonnull (m);
  for (size_t i = 0; i < n; i++)
    {
      m->data[i] = v[i];
      m->frame_times[i] = ((double) i + 0.5) * hop;
    }
  m->bin_kind = FW_BIN_AXIS_SCALAR;
  m->hop_seconds = hop;
  m->sample_rate = 16000.0;
  m->stage = stage;
  return m;
}

typedef struct {
  cairo_surface_t *surface;
  const uint8_t *data;
  int stride, width, height;
} Image;

static cairo_t *
image_begin (Image *img, int width, int height)
{
  cairo_t *cr;

  img->width = width;
  img->height = height;
  img->surface = cairo_image_surface_create (CAIRO_FORMAT_RGB24, width, height);
  cr = cairo_create (img->surface);
  cairo_set_source_rgb (cr, 1, 1, 1);
  cairo_paint (cr);
  return cr;
}

static void
image_end (Image *img, cairo_t *cr)
{
  cairo_destroy (cr);
  cairo_surface_flush (img->surface);
  img->data = cairo_image_surface_get_data (img->surface);
  img->stride = cairo_image_surface_get_stride (img->surface);
}

/* Coverage of the light theme's trace colour (brick, sRGB 0.62 0.20 0.10) over white: a
 * pixel a * trace + (1 - a) * white has R - G = a * (0.62 - 0.20) * 255. Greys (frame, ticks,
 * text, zero line) have R = G and count as nothing. */
static double
trace_ink (const Image *img, int x, int y)
{
  uint32_t px = ((const uint32_t *) (img->data + y * img->stride))[x];
  int r = (px >> 16) & 0xff, g = (px >> 8) & 0xff;
  return MAX (0, r - g) / ((0.62 - 0.20) * 255.0);
}

/* Grey ink (255 - green) for a pixel with no trace colour. */
static double
grey_ink (const Image *img, int x, int y)
{
  uint32_t px = ((const uint32_t *) (img->data + y * img->stride))[x];
  return (255 - (int) ((px >> 8) & 0xff)) / 255.0;
}

/* Ink-weighted centre (pixel centres at y + 0.5) of the trace in column x over rows
 * [y0, y1); NAN when the column has (almost) no ink. */
static double
ink_centre (const Image *img, int x, int y0, int y1, double *total)
{
  double sum = 0, moment = 0;

  for (int y = y0; y < y1; y++)
    {
      double a = trace_ink (img, x, y);
      sum += a;
      moment += a * (y + 0.5);
    }
  if (total)
    *total = sum;
  return sum > 0.5 ? moment / sum : NAN;
}

/* Ink-weighted centre (pixel centres at x + 0.5) of the trace along row y over columns
 * [x0, x1). */
static double
ink_centre_x (const Image *img, int y, int x0, int x1)
{
  double sum = 0, moment = 0;

  for (int x = x0; x < x1; x++)
    {
      double a = trace_ink (img, x, y);
      sum += a;
      moment += a * (x + 0.5);
    }
  return sum > 0.5 ? moment / sum : NAN;
}

/* ---- tests ---- */

static void
test_step_pixels (void)
{
  /* 100 frames, hop 10 ms, frame centres 5 ms .. 995 ms; 0 before 0.5 s, 1 after. Drawn over
   * 0..1 s into a 200 x 100 data area at (20, 10) with the value range -1 .. 3:
   * the axis mapping puts 0 at y = 10 + 100 - (0 + 1) / 4 * 100 = 85 and 1 at y = 60, and the
   * time mapping puts frame i at x = 20 + (i + 0.5) * 0.01 * 200 = 21 + 2 i. */
  float v[100];
  FwMatrix *m;
  FwCurveSpec spec;
  FwTheme theme;
  FwAxis axis;
  Image img;
  cairo_t *cr;

  for (int i = 0; i < 100; i++)
    v[i] = i < 50 ? 0.0f : 1.0f;
  m = make_curve (v, 100, 0.01, FW_STAGE_RMS);
  fw_theme_init (&theme, FW_THEME_LIGHT);
  theme.trace_width = 2.0;
  fw_curve_spec_init (&spec, FW_STAGE_RMS, 0.0, 1.0);
  spec.range.lo = -1.0;
  spec.range.hi = 3.0;

  /* the documented mapping, independently: y = bottom - (v - lo) / (hi - lo) * h */
  fw_curve_value_axis (&spec, 110, 10, &axis);
  g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&axis, 0.0), 85.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (fw_axis_value_to_pixel (&axis, 1.0), 60.0, 1e-9);

  cr = image_begin (&img, 240, 120);
  fw_curve_draw (cr, &theme, &spec, m, 20, 10, 200, 100);
  image_end (&img, cr);

  /* left of the step (frames 0..49 at x 21..119) the 2-unit-wide line is centred on y = 85,
   * right of it (frames 50..99 at x 121..219) on y = 60 */
  for (int x = 24; x <= 116; x += 4)
    {
      double total;
      double c = ink_centre (&img, x, 0, 120, &total);
      g_assert_cmpfloat (fabs (c - 85.0), <, 0.1);
      g_assert_cmpfloat (fabs (total - 2.0), <, 0.1);   /* the line's width, in coverage */
    }
  for (int x = 124; x <= 216; x += 4)
    {
      double total;
      double c = ink_centre (&img, x, 0, 120, &total);
      g_assert_cmpfloat (fabs (c - 60.0), <, 0.1);
      g_assert_cmpfloat (fabs (total - 2.0), <, 0.1);
    }
  /* the rise joins frame 49 (119, 85) to frame 50 (121, 60): it crosses row 72 (centre
   * y = 72.5) at x = 119 + 12.5 / 25 * 2 = 120 */
  g_assert_cmpfloat (fabs (ink_centre_x (&img, 72, 100, 140) - 120.0), <, 0.1);
  g_assert_cmpfloat (trace_ink (&img, 116, 72), <, 0.01);
  g_assert_cmpfloat (trace_ink (&img, 124, 72), <, 0.01);
  cairo_surface_destroy (img.surface);

  /* shifting the shown time range moves the step by the time mapping: over 0.25 .. 0.75 s
   * the step (between 0.495 and 0.505 s) lands at x = 20 + 0.25 / 0.5 * 200 = 120 again,
   * with frames 4 units apart */
  spec.t0 = 0.25;
  spec.t1 = 0.75;
  cr = image_begin (&img, 240, 120);
  fw_curve_draw (cr, &theme, &spec, m, 20, 10, 200, 100);
  image_end (&img, cr);
  g_assert_cmpfloat (fabs (ink_centre (&img, 110, 0, 120, NULL) - 85.0), <, 0.1);
  g_assert_cmpfloat (fabs (ink_centre (&img, 130, 0, 120, NULL) - 60.0), <, 0.1);
  /* frames 49 and 50 now at x = 118 and 122: the rise crosses y = 72.5 at x = 120 */
  g_assert_cmpfloat (fabs (ink_centre_x (&img, 72, 100, 140) - 120.0), <, 0.1);
  /* and the line still runs to both edges (frames 24 at x = 18 and 75 at x = 222, one
   * beyond each end, are joined in), clipped to the data area */
  g_assert_cmpfloat (fabs (ink_centre (&img, 20, 0, 120, NULL) - 85.0), <, 0.1);
  g_assert_cmpfloat (fabs (ink_centre (&img, 219, 0, 120, NULL) - 60.0), <, 0.1);
  for (int y = 0; y < 120; y++)
    {
      g_assert_cmpfloat (trace_ink (&img, 19, y), <, 0.01);
      g_assert_cmpfloat (trace_ink (&img, 220, y), <, 0.01);
    }
  cairo_surface_destroy (img.surface);
  fw_matrix_unref (m);
}

static void
test_peak_zoomed_out (void)
{
  /* 100 000 frames (hop 1 ms, 100 s) of noise in 0 .. 0.1 (fixed seed) with one frame at 1.0,
   * drawn 200 columns wide: 500 frames a column, so the min/max reduction is used. The spike
   * (frame 61234, centre 61.2345 s) is in column floor(61.2345 / 100 * 200) = 122; its column
   * must reach the value 1.0 (y = 0 on a 0 .. 1 axis 100 high) and no other column may get
   * above 0.1 (y = 90). */
  const size_t n = 100000, spike = 61234;
  float *v = g_new (float, n);
  GRand *rand = g_rand_new_with_seed (11);
  FwMatrix *m;
  FwCurveSpec spec;
  FwTheme theme;
  Image img;
  cairo_t *cr;
  int spike_col = (int) floor (((double) spike + 0.5) * 0.001 / 100.0 * 200.0);
  int top_y = -1, top_x = -1;

  for (size_t i = 0; i < n; i++)
    v[i] = (float) (0.1 * g_rand_double (rand));
  v[spike] = 1.0f;
  m = make_curve (v, n, 0.001, FW_STAGE_FLATNESS);
  fw_theme_init (&theme, FW_THEME_LIGHT);
  theme.trace_width = 1.0;
  fw_curve_spec_init (&spec, FW_STAGE_FLATNESS, 0.0, 100.0);
  spec.range.lo = 0.0;
  spec.range.hi = 1.0;
  spec.n_columns = 200;
  g_assert_cmpint (spike_col, ==, 122);

  /* the data area starts 10 units down: nothing may be drawn above it (clip) */
  cr = image_begin (&img, 200, 110);
  fw_curve_draw (cr, &theme, &spec, m, 0, 10, 200, 100);
  image_end (&img, cr);

  for (int y = 0; y < 110 && top_y < 0; y++)
    for (int x = 0; x < 200; x++)
      if (trace_ink (&img, x, y) > 0.3)
        {
          top_y = y;
          top_x = x;
          break;
        }
  /* value 1.0 maps to y = 10 (the top edge); the column's vertical stroke runs at
   * x = 122.5. Subsampling one frame per column would have missed the spike (top near
   * y = 100). */
  g_assert_cmpint (top_y, ==, 10);
  g_assert_cmpint (top_x, >=, spike_col - 1);
  g_assert_cmpint (top_x, <=, spike_col + 1);
  /* above value 0.15 (y = 95) only the spike's neighbourhood is inked: every other column
   * stays in the noise band 0 .. 0.1 (y 100 .. 110) */
  for (int y = 11; y < 94; y++)
    for (int x = 0; x < 200; x++)
      if (abs (x - spike_col) > 1)
        g_assert_cmpfloat (trace_ink (&img, x, y), <, 0.05);

  /* zoomed in to two frames a column the same spike is drawn frame by frame, at its own
   * time */
  cairo_surface_destroy (img.surface);
  spec.t0 = 61.0;
  spec.t1 = 61.5;            /* 500 frames in 250 columns: drawn frame by frame */
  spec.n_columns = 250;
  cr = image_begin (&img, 250, 110);
  fw_curve_draw (cr, &theme, &spec, m, 0, 10, 250, 100);
  image_end (&img, cr);
  /* frame 61234 at x = (61.2345 - 61) / 0.5 * 250 = 117.25 reaches y = 10 */
  g_assert_cmpfloat (trace_ink (&img, 117, 10), >, 0.2);
  cairo_surface_destroy (img.surface);

  fw_matrix_unref (m);
  g_rand_free (rand);
  g_free (v);
}

static void
test_minmax_time_order (void)
{
  /* 2000 frames (hop 1 ms, 2 s) in 100 columns 4 units wide (20 frames a column: reduced).
   * All 0 except column 50 (frames 1000 .. 1019): 0.5, then 1.0 at frame 1005, then 0 again.
   * Its maximum comes before its minimum, so the line rises from column 49's centre
   * (x = 198) to the peak at column 50's centre (x = 202, y = 0 on a 0 .. 1 axis 100 high),
   * drops straight down there and runs flat to column 51 (x = 206). At mid height (row 50)
   * the rise is at x = 200 and nothing lies right of the drop; visiting minimum then maximum
   * would instead put a falling line at x = 204. */
  float v[2000];
  FwMatrix *m;
  FwCurveSpec spec;
  FwTheme theme;
  Image img;
  cairo_t *cr;

  for (int i = 0; i < 2000; i++)
    v[i] = 0.0f;
  for (int i = 1000; i < 1005; i++)
    v[i] = 0.5f;
  v[1005] = 1.0f;
  m = make_curve (v, 2000, 0.001, FW_STAGE_RMS);
  fw_theme_init (&theme, FW_THEME_LIGHT);
  theme.trace_width = 1.0;
  fw_curve_spec_init (&spec, FW_STAGE_RMS, 0.0, 2.0);
  spec.n_columns = 100;

  cr = image_begin (&img, 400, 100);
  fw_curve_draw (cr, &theme, &spec, m, 0, 0, 400, 100);
  image_end (&img, cr);
  g_assert_cmpfloat (trace_ink (&img, 199, 50) + trace_ink (&img, 200, 50), >, 0.5);
  g_assert_cmpfloat (trace_ink (&img, 201, 50) + trace_ink (&img, 202, 50), >, 0.5);
  for (int x = 203; x <= 206; x++)
    g_assert_cmpfloat (trace_ink (&img, x, 50), <, 0.05);
  /* the flat parts at value 0 (y = 100, half inside the area) on both sides */
  g_assert_cmpfloat (trace_ink (&img, 100, 99), >, 0.4);
  g_assert_cmpfloat (trace_ink (&img, 300, 99), >, 0.4);
  cairo_surface_destroy (img.surface);
  fw_matrix_unref (m);
}

static void
test_breaks_and_dots (void)
{
  /* 20 frames 10 units apart (hop 0.05 s over 0 .. 1 s, 200 wide: frame i at x = 5 + 10 i),
   * all 0.5 on a 0 .. 1 axis (y = 50), except frame 10 (NaN) and frames 14 and 16 (NaN and
   * +inf): the line breaks at x 95 .. 115, and frame 15 stands alone at x = 155 as a dot. */
  float v[20];
  FwMatrix *m;
  FwCurveSpec spec;
  FwTheme theme;
  Image img;
  cairo_t *cr;

  for (int i = 0; i < 20; i++)
    v[i] = 0.5f;
  v[10] = NAN;
  v[14] = NAN;
  v[16] = INFINITY;
  m = make_curve (v, 20, 0.05, FW_STAGE_ZCR);
  fw_theme_init (&theme, FW_THEME_LIGHT);
  theme.trace_width = 2.0;
  fw_curve_spec_init (&spec, FW_STAGE_ZCR, 0.0, 1.0);
  spec.range.lo = 0.0;
  spec.range.hi = 1.0;

  cr = image_begin (&img, 200, 100);
  fw_curve_draw (cr, &theme, &spec, m, 0, 0, 200, 100);
  image_end (&img, cr);

  g_assert_cmpfloat (fabs (ink_centre (&img, 50, 0, 100, NULL) - 50.0), <, 0.1);
  g_assert_cmpfloat (fabs (ink_centre (&img, 125, 0, 100, NULL) - 50.0), <, 0.1);
  /* the gap: frames 9 (x 95) and 11 (x 115) end with round caps of radius 1 */
  for (int x = 97; x <= 112; x++)
    g_assert_true (isnan (ink_centre (&img, x, 0, 100, NULL)));
  /* frame 15 alone: a dot of diameter 2 around (155, 50), nothing between it and its
   * neighbours 13 (x 135) and 17 (x 175) */
  g_assert_cmpfloat (trace_ink (&img, 154, 49) + trace_ink (&img, 155, 49)
                     + trace_ink (&img, 154, 50) + trace_ink (&img, 155, 50), >, 2.0);
  for (int x = 138; x <= 152; x++)
    g_assert_true (isnan (ink_centre (&img, x, 0, 100, NULL)));
  for (int x = 158; x <= 172; x++)
    g_assert_true (isnan (ink_centre (&img, x, 0, 100, NULL)));
  cairo_surface_destroy (img.surface);
  fw_matrix_unref (m);
}

static void
test_zero_line_and_row (void)
{
  /* a difference curve with a zero line: on the range -2 .. 2 over 100 units, 0 is at
   * y = 50; the curve (constant 1, y = 25) is drawn over it. The row variant also fills the
   * data background and draws the value axis left of the data area. */
  float v[10];
  FwMatrix *m;
  FwCurveSpec spec;
  FwTheme theme;
  Image img;
  cairo_t *cr;
  double axis_ink = 0;

  for (int i = 0; i < 10; i++)
    v[i] = 1.0f;
  m = make_curve (v, 10, 0.1, FW_STAGE_CENTROID);
  fw_theme_init (&theme, FW_THEME_LIGHT);
  theme.line_width = 2.0;
  theme.trace_width = 2.0;
  /* a data background that is neither white nor a grey, to see it filled */
  theme.data_background = (FwRgba) { 0.8, 0.9, 1.0, 1.0 };
  fw_curve_spec_init (&spec, FW_STAGE_CENTROID, 0.0, 1.0);
  g_assert_cmpint (spec.style, ==, FW_TICK_FREQUENCY);
  g_assert_cmpint (fw_curve_tick_style (FW_STAGE_ZCR), ==, FW_TICK_NUMBER);
  spec.range.lo = -2.0;
  spec.range.hi = 2.0;
  spec.zero_line = true;

  cr = image_begin (&img, 240, 120);
  fw_curve_draw (cr, &theme, &spec, m, 40, 10, 200, 100);
  image_end (&img, cr);
  /* zero line at y = 10 + 50 = 60: rows 59 and 60 in the muted grey, no trace colour */
  g_assert_cmpfloat (trace_ink (&img, 100, 59), <, 0.01);
  g_assert_cmpfloat (grey_ink (&img, 100, 59), >, 0.5);
  g_assert_cmpfloat (grey_ink (&img, 100, 60), >, 0.5);
  g_assert_cmpfloat (grey_ink (&img, 100, 57), <, 0.01);
  g_assert_cmpfloat (fabs (ink_centre (&img, 100, 0, 120, NULL) - 35.0), <, 0.1);
  cairo_surface_destroy (img.surface);

  cr = image_begin (&img, 240, 120);
  fw_curve_draw_row (cr, &theme, &spec, m, 40, 10, 200, 100);
  image_end (&img, cr);
  {
    uint32_t px = ((const uint32_t *) (img.data + 90 * img.stride))[200];
    g_assert_cmpint (abs ((int) ((px >> 16) & 0xff) - 204), <=, 1);   /* 0.8 * 255 */
    g_assert_cmpint (px & 0xff, ==, 255);
  }
  g_assert_cmpfloat (fabs (ink_centre (&img, 100, 0, 120, NULL) - 35.0), <, 0.3);
  /* tick marks and labels left of x = 40 */
  for (int y = 0; y < 120; y++)
    for (int x = 0; x < 38; x++)
      axis_ink += grey_ink (&img, x, y);
  g_assert_cmpfloat (axis_ink, >, 10.0);
  cairo_surface_destroy (img.surface);
  fw_matrix_unref (m);
}

static void
test_auto_range (void)
{
  /* values 0.13 .. 0.87 inside the shown time, 5.0 outside it and a NaN inside:
   * Heckbert's loose labels for 4 ticks (P. S. Heckbert, "Nice numbers for graph labels",
   * Graphics Gems, 1990): range = nice(0.74, ceil) = 1, step = nice(1 / 3, round) = 0.5,
   * graph 0 .. 1 (worked by hand from the published algorithm). */
  float v[12] = { 5.0f, 0.13f, 0.5f, NAN, 0.87f, 0.2f, 0.3f, 0.4f, 0.6f, 0.7f, 0.8f, 5.0f };
  FwMatrix *m = make_curve (v, 12, 0.1, FW_STAGE_FLATNESS);
  FwValueRange r;

  /* frames at 0.05, 0.15, ..., 1.15 s: [0.1, 1.1] holds frames 1 .. 10 */
  g_assert_true (fw_curve_auto_range (m, 0.1, 1.1, &r));
  g_assert_cmpfloat_with_epsilon (r.lo, 0.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (r.hi, 1.0, 1e-12);
  /* with frame 0 (5.0) inside: range 4.87 -> nice 5, step nice(5/3) = 2, graph 0 .. 6 */
  g_assert_true (fw_curve_auto_range (m, 0.0, 1.1, &r));
  g_assert_cmpfloat_with_epsilon (r.lo, 0.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (r.hi, 6.0, 1e-12);
  /* only the NaN frame: no range */
  g_assert_false (fw_curve_auto_range (m, 0.3, 0.4, &r));
  g_assert_cmpfloat (r.lo, ==, 0.0);
  g_assert_cmpfloat (r.hi, ==, 1.0);
  fw_matrix_unref (m);
}

static void
test_figure_trace_row (void)
{
  /* A figure with one trace row draws it through fw_curve_draw: the step 200 -> 600 (Hz)
   * at 0.5 s lands on the row's data area at the heights of the axis the figure shows
   * (fw_curve_auto_range: Heckbert's loose labels over 200 .. 600, range nice(400) = 500 and
   * step nice(500 / 3) = 200, give the same 200 .. 600), and at the middle of the row's
   * width. */
  float v[100];
  FwMatrix *m;
  g_autoptr (FwFigure) fig = fw_figure_new ();
  g_autoptr (GError) error = NULL;
  FwFigureLayout lay;
  FwCurveSpec spec;
  FwValueRange r;
  FwTheme theme;
  FwAxis axis;
  Image img;
  cairo_t *cr;
  const FwRect *d;
  int xl, xr;

  for (int i = 0; i < 100; i++)
    v[i] = i < 50 ? 200.0f : 600.0f;
  m = make_curve (v, 100, 0.01, FW_STAGE_CENTROID);
  g_assert_true (fw_curve_auto_range (m, 0.0, 1.0, &r));
  g_assert_cmpfloat_with_epsilon (r.lo, 200.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (r.hi, 600.0, 1e-9);

  fw_theme_init (&theme, FW_THEME_LIGHT);
  theme.trace_width = 2.0;
  fw_figure_add_matrix (fig, FW_STAGE_CENTROID, m, "spectral centroid, Hz");
  fw_figure_set_time_range (fig, 0.0, 1.0);
  fw_figure_set_letters (fig, false);
  fw_figure_set_caption (fig, false);

  cr = image_begin (&img, 400, 160);
  fw_figure_layout (fig, cr, &theme, 400, 160, 1.0, &lay);
  g_assert_true (fw_figure_draw (fig, cr, &theme, 400, 160, 1.0, 1.0, &error));
  g_assert_no_error (error);
  image_end (&img, cr);

  d = &lay.data[0];
  g_assert_cmpfloat (d->w, >, 100);
  g_assert_cmpfloat (d->h, >, 40);
  fw_curve_spec_init (&spec, FW_STAGE_CENTROID, 0.0, 1.0);
  spec.range = r;
  fw_curve_value_axis (&spec, d->y + d->h, d->y, &axis);
  /* the step's halves at a quarter and three quarters of the width; the plateaus sit on the
   * range's ends, so only the inner half of the 2-unit line is inside the clip */
  xl = (int) (d->x + d->w / 4);
  xr = (int) (d->x + 3 * d->w / 4);
  g_assert_cmpfloat (fabs (ink_centre (&img, xl, (int) d->y, (int) (d->y + d->h), NULL)
                           - (fw_axis_value_to_pixel (&axis, 200.0) - 0.5)), <, 0.15);
  g_assert_cmpfloat (fabs (ink_centre (&img, xr, (int) d->y, (int) (d->y + d->h), NULL)
                           - (fw_axis_value_to_pixel (&axis, 600.0) + 0.5)), <, 0.15);
  /* the rise at t = 0.5 s: x = data left + half the width */
  g_assert_cmpfloat (trace_ink (&img, (int) floor (d->x + d->w / 2), (int) (d->y + d->h / 2)),
                     >, 0.3);
  cairo_surface_destroy (img.surface);
  fw_matrix_unref (m);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/render/curve/step-pixels", test_step_pixels);
  g_test_add_func ("/fw/render/curve/peak-zoomed-out", test_peak_zoomed_out);
  g_test_add_func ("/fw/render/curve/minmax-time-order", test_minmax_time_order);
  g_test_add_func ("/fw/render/curve/breaks-and-dots", test_breaks_and_dots);
  g_test_add_func ("/fw/render/curve/zero-line-and-row", test_zero_line_and_row);
  g_test_add_func ("/fw/render/curve/auto-range", test_auto_range);
  g_test_add_func ("/fw/render/curve/figure-trace-row", test_figure_trace_row);
  return g_test_run ();
}
