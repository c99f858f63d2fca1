/* test-window.c: the demo opens and draws; rows stay time-aligned; a selection feeds the
 * spectrum panel. Needs a display (skips without one). */
#include <math.h>

#include <glib/gstdio.h>

#include "fw-analysis.h"
#include "fw-test-window.h"

static FwWindow *win;

static FwWindow *
demo_window (void)
{
  if (win == NULL)
    win = fw_test_demo_window (1400, 900);
  return win;
}

typedef struct {
  gboolean done;
  gboolean ok;
  GError *error;
} ShotResult;

static void
on_screenshot (GObject *source, GAsyncResult *result, gpointer user_data)
{
  ShotResult *r = user_data;

  r->ok = fw_window_screenshot_finish (FW_WINDOW (source), result, &r->error);
  r->done = TRUE;
}

static gboolean
shot_done (gpointer data)
{
  return ((ShotResult *) data)->done;
}

/* The demo draws: a screenshot through the --screenshot code path is not blank and every
 * row's data area holds many colours. */
static void
test_demo_draws (void)
{
  FwWindow *w = demo_window ();
  FwPlotStack *stack = _fw_window_get_plot_stack (w);
  g_autofree char *dir = fw_test_tmpdir ();
  g_autofree char *png = g_build_filename (dir, "shot.png", NULL);
  ShotResult r = { 0 };
  g_autoptr (GdkTexture) texture = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree guint32 *pixels = NULL;
  int width, height;
  graphene_rect_t whole;

  g_assert_cmpuint (fw_plot_stack_get_n_rows (stack), >=, 4);
  fw_window_screenshot_async (w, png, 0, 0, NULL, on_screenshot, &r);
  g_assert_true (fw_test_wait (shot_done, &r, 120));
  g_assert_no_error (r.error);
  g_assert_true (r.ok);

  texture = gdk_texture_new_from_filename (png, &error);
  g_assert_no_error (error);
  pixels = fw_test_texture_pixels (texture, &width, &height);
  g_assert_cmpint (width, ==, gtk_widget_get_width (GTK_WIDGET (w)));
  g_assert_cmpint (height, ==, gtk_widget_get_height (GTK_WIDGET (w)));
  graphene_rect_init (&whole, 0, 0, width, height);
  g_assert_cmpuint (fw_test_distinct_colours (pixels, width, height, &whole), >, 500);

  for (guint i = 0; i < fw_plot_stack_get_n_rows (stack); i++)
    {
      FwPlotKind kind = fw_plot_stack_get_row_kind (stack, i);
      FwPlotRow *row = fw_plot_stack_get_row (stack, 0, kind);
      graphene_rect_t area, bounds;
      guint colours;

      g_assert_nonnull (row);
      g_assert_null (fw_plot_row_get_message (row));
      fw_plot_row_get_data_area (row, &area);
      g_assert_true (fw_test_widget_bounds (GTK_WIDGET (row), GTK_WIDGET (w), &bounds));
      area.origin.x += bounds.origin.x;
      area.origin.y += bounds.origin.y;
      colours = fw_test_distinct_colours (pixels, width, height, &area);
      g_test_message ("row %s: %u colours in its data area", fw_plot_kind_id (kind), colours);
      /* a waveform has an envelope, an RMS band and background at least; heatmaps many more */
      g_assert_cmpuint (colours, >=, fw_plot_kind_is_heatmap (kind) ? 40 : 3);
    }
  g_unlink (png);
  g_rmdir (dir);
}

/* x of time t in window coordinates, for a row and for the ruler */
static double
row_x (FwWindow *w, FwPlotRow *row, double t)
{
  graphene_point_t p;

  g_assert_true (gtk_widget_compute_point (GTK_WIDGET (row), GTK_WIDGET (w),
                                           &GRAPHENE_POINT_INIT (fw_plot_row_time_to_x (row, t), 0),
                                           &p));
  return p.x;
}

/* Finds the cursor line (its colour) in a row's data area: the mean x of its pixels. */
static double
cursor_column (const guint32 *pixels, int width, int height, const graphene_rect_t *area)
{
  double sum = 0;
  int n = 0;
  int y = (int) (area->origin.y + area->size.height / 2);

  for (int x = (int) area->origin.x; x < (int) (area->origin.x + area->size.width) && x < width; x++)
    {
      guint32 p = pixels[(gsize) y * width + x];
      int r = (p >> 16) & 0xff, g = (p >> 8) & 0xff, b = p & 0xff;
      /* the cursor colour (0.95, 0.30, 0.20) at 95 % over anything */
      if (r > 200 && g < 110 && b < 90)
        {
          sum += x;
          n++;
        }
    }
  return n > 0 ? sum / n : -1;
}

static void
check_alignment (FwWindow *w, double t)
{
  FwPlotStack *stack = _fw_window_get_plot_stack (w);
  FwTimeRuler *ruler = fw_plot_stack_get_ruler (stack, 0);
  graphene_point_t rp;
  double x0 = -1;
  g_autoptr (GdkTexture) texture = NULL;
  g_autofree guint32 *pixels = NULL;
  int width, height;

  g_assert_true (gtk_widget_compute_point (GTK_WIDGET (ruler), GTK_WIDGET (w),
                                           &GRAPHENE_POINT_INIT (fw_time_ruler_time_to_x (ruler, t), 0),
                                           &rp));
  fw_viewport_set_cursor (_fw_window_get_viewport (w), t);
  fw_test_spin (0.2);
  texture = fw_window_render_texture (w);
  g_assert_nonnull (texture);
  pixels = fw_test_texture_pixels (texture, &width, &height);

  for (guint i = 0; i < fw_plot_stack_get_n_rows (stack); i++)
    {
      FwPlotRow *row = fw_plot_stack_get_row (stack, 0, fw_plot_stack_get_row_kind (stack, i));
      double x = row_x (w, row, t);
      graphene_rect_t area, bounds;
      double seen;

      if (x0 < 0)
        x0 = x;
      /* same x for the same time in every row and in the ruler */
      g_assert_cmpfloat_with_epsilon (x, x0, 1e-6);
      g_assert_cmpfloat_with_epsilon (rp.x, x0, 1e-6);
      /* and the drawn cursor line really is there in every row */
      fw_plot_row_get_data_area (row, &area);
      g_assert_true (fw_test_widget_bounds (GTK_WIDGET (row), GTK_WIDGET (w), &bounds));
      area.origin.x += bounds.origin.x;
      area.origin.y += bounds.origin.y;
      seen = cursor_column (pixels, width, height, &area);
      g_test_message ("t=%.3f row %u: computed x %.2f, drawn cursor at %.2f", t, i, x, seen);
      g_assert_cmpfloat (seen, >=, 0);
      g_assert_cmpfloat (fabs (seen - x), <=, 1.5);
    }
}

/* Zoom and pan keep every row on one time axis. */
static void
test_zoom_pan_alignment (void)
{
  FwWindow *w = demo_window ();
  FwViewport *vp = _fw_window_get_viewport (w);
  double d = fw_viewport_get_duration (vp);
  double s, e;

  g_assert_cmpfloat (d, >, 1.0);
  check_alignment (w, 0.37 * d);

  gtk_widget_activate_action (GTK_WIDGET (w), "win.zoom-in", NULL);
  gtk_widget_activate_action (GTK_WIDGET (w), "win.zoom-in", NULL);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat (e - s, <, 0.5 * d);
  check_alignment (w, 0.5 * (s + e) + 0.1 * (e - s));

  gtk_widget_activate_action (GTK_WIDGET (w), "win.pan-right", NULL);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat (s, >, 0);
  check_alignment (w, s + 0.25 * (e - s));

  gtk_widget_activate_action (GTK_WIDGET (w), "win.zoom-fit", NULL);
  g_assert_true (fw_viewport_is_fit (vp));
  fw_viewport_set_cursor (vp, -1);
}

/* A selected range feeds the spectrum panel: the mean over exactly the frames whose centres
 * lie in the range, averaged in the power domain (10^(dB/10)), as fw-render-spectrum.h says. */
static gboolean
panel_idle (gpointer data)
{
  return !fw_spectrum_panel_is_busy (data);
}

static void
test_selection_updates_spectrum (void)
{
  FwWindow *w = demo_window ();
  FwViewport *vp = _fw_window_get_viewport (w);
  FwSpectrumPanel *panel = _fw_window_get_spectrum_panel (w);
  FwFeatureCache *cache = _fw_window_get_cache (w);
  g_autoptr (GError) error = NULL;
  FwMatrix *db;
  double d = fw_viewport_get_duration (vp);
  double s = 0.25 * d, e = 0.5 * d;
  guint first = 0, n_frames, expected = 0, expected_first = G_MAXUINT;
  gsize n_bins = 0;
  const double *values;
  gsize k;

  fw_viewport_clear_selection (vp);
  fw_viewport_set_cursor (vp, 0.1 * d);
  fw_test_spin (0.1);
  g_assert_cmpuint (fw_spectrum_panel_get_frames (panel, NULL), ==, 1);

  fw_viewport_set_selection (vp, s, e);
  g_assert_true (fw_test_wait (panel_idle, panel, 30));
  db = fw_feature_cache_request_sync (cache, _fw_window_get_clip (w),
                                      fw_param_set_get_params (_fw_window_get_param_set (w)),
                                      FW_STAGE_DB, NULL, &error);
  g_assert_no_error (error);
  for (gsize t = 0; t < db->n_frames; t++)
    if (db->frame_times[t] >= s && db->frame_times[t] <= e)
      {
        expected++;
        expected_first = MIN (expected_first, (guint) t);
      }
  n_frames = fw_spectrum_panel_get_frames (panel, &first);
  g_assert_cmpuint (n_frames, ==, expected);
  g_assert_cmpuint (first, ==, expected_first);
  g_assert_nonnull (g_strstr_len (fw_spectrum_panel_get_title (panel), -1, "–"));

  values = fw_spectrum_panel_get_values (panel, &n_bins);
  g_assert_nonnull (values);
  g_assert_cmpuint (n_bins, ==, db->n_bins);
  for (k = 0; k < n_bins; k += n_bins / 7)
    {
      double sum = 0;
      for (gsize t = expected_first; t < expected_first + expected; t++)
        sum += pow (10.0, fw_matrix_get (db, t, k) / 10.0);
      g_assert_cmpfloat_with_epsilon (values[k], 10.0 * log10 (sum / expected), 1e-3);
    }

  /* a narrower selection changes what is shown */
  fw_viewport_set_selection (vp, s, s + 0.1 * (e - s));
  g_assert_true (fw_test_wait (panel_idle, panel, 30));
  g_assert_cmpuint (fw_spectrum_panel_get_frames (panel, NULL), <, n_frames);
  fw_viewport_clear_selection (vp);
  fw_matrix_unref (db);
}

/* Hovering a heatmap row gives a readout with time, band and value with its unit. */
static void
test_readout (void)
{
  FwWindow *w = demo_window ();
  FwPlotStack *stack = _fw_window_get_plot_stack (w);
  FwPlotRow *mel = fw_plot_stack_get_row (stack, 0, FW_PLOT_MEL);
  graphene_rect_t area;
  g_autofree char *text = NULL;

  g_assert_nonnull (mel);
  fw_plot_row_get_data_area (mel, &area);
  text = fw_plot_row_describe_point (mel, area.origin.x + area.size.width / 3,
                                     area.origin.y + area.size.height / 2);
  g_assert_nonnull (text);
  g_test_message ("readout: %s", text);
  g_assert_nonnull (strstr (text, " s"));
  g_assert_nonnull (strstr (text, "mel band"));
  g_assert_nonnull (strstr (text, "Hz"));
  g_assert_nonnull (strstr (text, "dB"));
  g_assert_null (fw_plot_row_describe_point (mel, 1, 1));   /* in the gutter: nothing */
}

int
main (int argc, char **argv)
{
  int status;

  g_test_init (&argc, &argv, NULL);
  if (!fw_test_gtk_init ())
    {
      /* TAP: the whole file is skipped, with the reason */
      g_print ("1..0 # SKIP no display (run the GTK tests under xvfb-run -a)\n");
      return 0;
    }
  g_test_add_func ("/fw/gtk/window/demo-draws", test_demo_draws);
  g_test_add_func ("/fw/gtk/window/zoom-pan-alignment", test_zoom_pan_alignment);
  g_test_add_func ("/fw/gtk/window/selection-updates-spectrum", test_selection_updates_spectrum);
  g_test_add_func ("/fw/gtk/window/readout", test_readout);
  status = g_test_run ();
  if (win != NULL)
    fw_window_close_discarding (win);
  return status;
}
