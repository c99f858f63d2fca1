/* test-heatmap.c: matrices to one raster image: exact cells, aggregation, frequency axes. */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib.h>

#include "fw-test-render.h"

#include "fw-render-error.h"
#include "fw-render-heatmap.h"

/* A matrix with frame t centred at (t + 0.5) * hop, so frame cells tile [0, frames * hop). */
static FwMatrix *
make_matrix (size_t frames, size_t bins, FwBinAxisKind kind, double hop)
{
  FwMatrix *m = fw_matrix_new (frames, bins);
  for (size_t t = 0; t < frames; t++)
    m->frame_times[t] = ((double) t + 0.5) * hop;
  for (size_t k = 0; k < bins; k++)
    {
      m->bin_value[k] = kind == FW_BIN_AXIS_HZ ? 10.0 * (double) k : (double) k;
      m->bin_low[k] = m->bin_value[k] - (kind == FW_BIN_AXIS_HZ ? 5.0 : 0.0);
      m->bin_high[k] = m->bin_value[k] + (kind == FW_BIN_AXIS_HZ ? 5.0 : 0.0);
    }
  m->bin_kind = kind;
  m->hop_seconds = hop;
  m->sample_rate = 1000;
  return m;
}

static uint32_t
pixel_at (cairo_surface_t *s, int x, int y)
{
  const uint8_t *data = cairo_image_surface_get_data (s);
  int stride = cairo_image_surface_get_stride (s);
  return ((const uint32_t *) (data + (size_t) y * stride))[x];
}

static void
spec_for (FwHeatmapSpec *spec, const FwMatrix *m, double lo, double hi, FwAggregate agg)
{
  fw_heatmap_spec_init (spec, m, FW_STAGE_MFCC);
  spec->scale = fw_colour_scale_get ("graphite");
  spec->range.lo = lo;
  spec->range.hi = hi;
  spec->aggregate = agg;
  spec->t0 = 0;
  spec->t1 = (double) m->n_frames * m->hop_seconds;
}

static void
test_one_to_one (void)
{
  /* 8 frames x 5 coefficients drawn at 8 x 5 pixels: pixel (x, y) shows cell (x, 4 - y),
   * with the colour the scale gives its value (bins grow upwards) */
  g_autoptr (GError) error = NULL;
  FwMatrix *m = make_matrix (8, 5, FW_BIN_AXIS_COEFFICIENT, 0.01);
  const uint8_t *lut = fw_colour_scale_get_lut (fw_colour_scale_get ("graphite"));
  FwHeatmapSpec spec;
  cairo_surface_t *img;

  for (size_t i = 0; i < 40; i++)
    m->data[i] = (float) i;
  spec_for (&spec, m, 0.0, 39.0, FW_AGGREGATE_MEAN);
  img = fw_heatmap_render (m, &spec, 8, 5, &error);
  g_assert_no_error (error);
  for (int x = 0; x < 8; x++)
    for (int y = 0; y < 5; y++)
      {
        double v = fw_matrix_get (m, (size_t) x, (size_t) (4 - y));
        g_assert_cmphex (pixel_at (img, x, y), ==, fw_colour_scale_pixel (lut, v / 39.0));
      }
  cairo_surface_destroy (img);
  fw_matrix_unref (m);
}

static void
test_zoomed_in_blocks (void)
{
  /* 4 frames x 2 bins into 400 x 100 pixels: each cell a sharp 100 x 50 block, no blending */
  g_autoptr (GError) error = NULL;
  FwMatrix *m = make_matrix (4, 2, FW_BIN_AXIS_COEFFICIENT, 0.25);
  const uint8_t *lut = fw_colour_scale_get_lut (fw_colour_scale_get ("graphite"));
  FwHeatmapSpec spec;
  cairo_surface_t *img;

  for (size_t i = 0; i < 8; i++)
    m->data[i] = (float) (i % 2 ? 1.0 : 0.0);
  spec_for (&spec, m, 0.0, 1.0, FW_AGGREGATE_MEAN);
  img = fw_heatmap_render (m, &spec, 400, 100, &error);
  g_assert_no_error (error);
  for (int x = 0; x < 400; x += 7)
    {
      g_assert_cmphex (pixel_at (img, x, 10), ==, fw_colour_scale_pixel (lut, 1.0)); /* bin 1 */
      g_assert_cmphex (pixel_at (img, x, 90), ==, fw_colour_scale_pixel (lut, 0.0)); /* bin 0 */
    }
  cairo_surface_destroy (img);
  fw_matrix_unref (m);
}

static void
test_aggregation (void)
{
  /* 10000 frames of zeros with one frame at 1, drawn 100 pixels wide (100 frames a column):
   * MAX keeps the click at full value in its column; MEAN shows the column mean 1/100 */
  g_autoptr (GError) error = NULL;
  FwMatrix *m = make_matrix (10000, 1, FW_BIN_AXIS_COEFFICIENT, 0.001);
  const uint8_t *lut = fw_colour_scale_get_lut (fw_colour_scale_get ("graphite"));
  FwHeatmapSpec spec;
  cairo_surface_t *img;
  size_t click = 4321; /* column 43 */

  m->data[click] = 1.0f;
  spec_for (&spec, m, 0.0, 1.0, FW_AGGREGATE_MAX);
  img = fw_heatmap_render (m, &spec, 100, 4, &error);
  g_assert_no_error (error);
  g_assert_cmphex (pixel_at (img, 43, 2), ==, fw_colour_scale_pixel (lut, 1.0));
  g_assert_cmphex (pixel_at (img, 42, 2), ==, fw_colour_scale_pixel (lut, 0.0));
  g_assert_cmphex (pixel_at (img, 44, 2), ==, fw_colour_scale_pixel (lut, 0.0));
  cairo_surface_destroy (img);

  spec.aggregate = FW_AGGREGATE_MEAN;
  spec.range.hi = 0.01; /* the mean 1/100 maps to the top of this range */
  img = fw_heatmap_render (m, &spec, 100, 4, &error);
  g_assert_no_error (error);
  g_assert_cmphex (pixel_at (img, 43, 2), ==, fw_colour_scale_pixel (lut, 1.0));
  g_assert_cmphex (pixel_at (img, 42, 2), ==, fw_colour_scale_pixel (lut, 0.0));
  cairo_surface_destroy (img);
  fw_matrix_unref (m);

  /* a one-bin tone among 1000 bins drawn 50 pixels tall stays visible with MAX */
  m = make_matrix (10, 1000, FW_BIN_AXIS_HZ, 0.01);
  for (size_t t = 0; t < 10; t++)
    m->data[t * 1000 + 617] = 1.0f; /* 6170 Hz */
  spec_for (&spec, m, 0.0, 1.0, FW_AGGREGATE_MAX);
  img = fw_heatmap_render (m, &spec, 10, 50, &error);
  g_assert_no_error (error);
  {
    /* linear axis 0 .. 9990 Hz over 50 rows, row 0 at the top */
    FwAxis axis;
    int row;
    int lit = 0;
    fw_heatmap_bin_axis (m, &spec, 50.0, 0.0, &axis, NULL);
    row = (int) floor (fw_axis_value_to_pixel (&axis, 6170.0));
    for (int y = 0; y < 50; y++)
      if (pixel_at (img, 5, y) == fw_colour_scale_pixel (lut, 1.0))
        {
          lit++;
          g_assert_cmpint (y, ==, row);
        }
    g_assert_cmpint (lit, ==, 1);
  }
  cairo_surface_destroy (img);
  fw_matrix_unref (m);
}

static void
test_log_and_mel_rows (void)
{
  /* On a log axis from 100 Hz to 10 kHz over 200 pixel rows, a tone in the bin at 1000 Hz lands
   * half way up (one of two decades), i.e. around row 100 */
  g_autoptr (GError) error = NULL;
  FwMatrix *m = make_matrix (4, 1001, FW_BIN_AXIS_HZ, 0.01); /* bins every 10 Hz to 10 kHz */
  const uint8_t *lut = fw_colour_scale_get_lut (fw_colour_scale_get ("graphite"));
  FwHeatmapSpec spec;
  cairo_surface_t *img;
  int first = -1, last = -1;

  for (size_t t = 0; t < 4; t++)
    m->data[t * 1001 + 100] = 1.0f;
  spec_for (&spec, m, 0.0, 1.0, FW_AGGREGATE_MAX);
  spec.freq_scale = FW_AXIS_LOG;
  spec.f_lo = 100.0;
  spec.f_hi = 10000.0;
  img = fw_heatmap_render (m, &spec, 4, 200, &error);
  g_assert_no_error (error);
  for (int y = 0; y < 200; y++)
    if (pixel_at (img, 1, y) == fw_colour_scale_pixel (lut, 1.0))
      {
        if (first < 0)
          first = y;
        last = y;
      }
  /* the bin's cell spans 995 .. 1005 Hz: log10 from 2.99782 to 3.00217, rows 99.78 .. 100.22 */
  g_assert_cmpint (first, >=, 99);
  g_assert_cmpint (last, <=, 100);
  cairo_surface_destroy (img);
  fw_matrix_unref (m);

  /* mel-band matrices: equal-height cells per band, whatever their centre frequencies */
  m = make_matrix (3, 10, FW_BIN_AXIS_MEL_BAND, 0.01);
  for (size_t k = 0; k < 10; k++)
    {
      m->bin_value[k] = 100.0 * pow (1.5, (double) k);
      m->bin_low[k] = m->bin_value[k] / 1.5;
      m->bin_high[k] = m->bin_value[k] * 1.5;
      for (size_t t = 0; t < 3; t++)
        m->data[t * 10 + k] = (float) k;
    }
  spec_for (&spec, m, 0.0, 9.0, FW_AGGREGATE_MAX);
  img = fw_heatmap_render (m, &spec, 3, 100, &error);
  g_assert_no_error (error);
  for (int y = 0; y < 100; y++)
    g_assert_cmphex (pixel_at (img, 1, y), ==, fw_colour_scale_pixel (lut, (9 - y / 10) / 9.0));
  cairo_surface_destroy (img);
  fw_matrix_unref (m);
}

static void
test_outside_frames_transparent (void)
{
  /* time range wider than the matrix: pixels beyond the last frame cell stay transparent */
  g_autoptr (GError) error = NULL;
  FwMatrix *m = make_matrix (10, 2, FW_BIN_AXIS_COEFFICIENT, 0.1); /* cells cover 0 .. 1 s */
  FwHeatmapSpec spec;
  cairo_surface_t *img;

  spec_for (&spec, m, 0.0, 1.0, FW_AGGREGATE_MEAN);
  spec.t1 = 2.0;
  img = fw_heatmap_render (m, &spec, 20, 2, &error);
  g_assert_no_error (error);
  g_assert_cmphex (pixel_at (img, 5, 0) >> 24, ==, 0xff);
  g_assert_cmphex (pixel_at (img, 15, 0), ==, 0);
  cairo_surface_destroy (img);

  /* and bad sizes are refused with a message */
  img = fw_heatmap_render (m, &spec, 0, 10, &error);
  g_assert_null (img);
  g_assert_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID);
  fw_matrix_unref (m);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/render/heatmap/one-to-one", test_one_to_one);
  g_test_add_func ("/fw/render/heatmap/zoomed-in-blocks", test_zoomed_in_blocks);
  g_test_add_func ("/fw/render/heatmap/aggregation", test_aggregation);
  g_test_add_func ("/fw/render/heatmap/log-and-mel-rows", test_log_and_mel_rows);
  g_test_add_func ("/fw/render/heatmap/outside-frames", test_outside_frames_transparent);
  return g_test_run ();
}
