/* test-window.c: the demo opens and draws; rows stay time-aligned; a selection feeds the
 * spectrum panel. Needs a display (skips without one). */
#include <math.h>
#include <string.h>

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

/* Marks the columns of a row's data area that differ between a picture without and one with
 * the cursor. */
static void
changed_columns (const guint32 *without, const guint32 *with, int width, int height,
                 const graphene_rect_t *area, gboolean *changed)
{
  int y0 = (int) area->origin.y + 1, y1 = MIN (height, (int) (area->origin.y + area->size.height) - 1);

  for (int x = (int) area->origin.x; x < (int) (area->origin.x + area->size.width) && x < width; x++)
    for (int y = y0; y < y1; y++)
      if (without[(gsize) y * width + x] != with[(gsize) y * width + x])
        {
          changed[x] = TRUE;
          break;
        }
}

static void
check_alignment (FwWindow *w, double t)
{
  FwPlotStack *stack = _fw_window_get_plot_stack (w);
  FwTimeRuler *ruler = fw_plot_stack_get_ruler (stack, 0);
  graphene_point_t rp;
  double x0 = -1;
  g_autoptr (GdkTexture) before = NULL;
  g_autoptr (GdkTexture) after = NULL;
  g_autofree guint32 *without = NULL;
  g_autofree guint32 *with = NULL;
  g_autofree gboolean *in_all = NULL;
  int width, height, n_common = 0;
  double common = 0;

  g_assert_true (gtk_widget_compute_point (GTK_WIDGET (ruler), GTK_WIDGET (w),
                                           &GRAPHENE_POINT_INIT (fw_time_ruler_time_to_x (ruler, t), 0),
                                           &rp));
  fw_viewport_set_cursor (_fw_window_get_viewport (w), -1);
  g_assert_true (fw_test_wait_settled (w, 60));
  before = fw_window_render_texture (w);
  fw_viewport_set_cursor (_fw_window_get_viewport (w), t);
  g_assert_true (fw_test_wait_settled (w, 60));
  after = fw_window_render_texture (w);
  g_assert_nonnull (before);
  g_assert_nonnull (after);
  without = fw_test_texture_pixels (before, &width, &height);
  with = fw_test_texture_pixels (after, &width, &height);
  in_all = g_new (gboolean, width);
  for (int x = 0; x < width; x++)
    in_all[x] = TRUE;

  for (guint i = 0; i < fw_plot_stack_get_n_rows (stack); i++)
    {
      FwPlotRow *row = fw_plot_stack_get_row (stack, 0, fw_plot_stack_get_row_kind (stack, i));
      double x = row_x (w, row, t);
      graphene_rect_t area, bounds;
      g_autofree gboolean *changed = g_new0 (gboolean, width);

      if (x0 < 0)
        x0 = x;
      /* same x for the same time in every row and in the ruler */
      g_assert_cmpfloat_with_epsilon (x, x0, 1e-6);
      g_assert_cmpfloat_with_epsilon (rp.x, x0, 1e-6);
      fw_plot_row_get_data_area (row, &area);
      g_assert_true (fw_test_widget_bounds (GTK_WIDGET (row), GTK_WIDGET (w), &bounds));
      area.origin.x += bounds.origin.x;
      area.origin.y += bounds.origin.y;
      changed_columns (without, with, width, height, &area, changed);
      for (int c = 0; c < width; c++)
        in_all[c] = in_all[c] && changed[c];
    }
  /* The drawn cursor line is the change common to every row (a hover mark under the pointer
   * would show in one row only); it covers the pixel holding x (floor; x may land a hair
   * below an integer). */
  for (int c = 0; c < width; c++)
    if (in_all[c])
      {
        common += c;
        n_common++;
      }
  g_test_message ("t=%.3f: computed x %.2f, drawn cursor in every row at %.2f (%d columns)", t,
                  x0, n_common > 0 ? common / n_common : -1.0, n_common);
  g_assert_cmpint (n_common, >=, 1);
  g_assert_cmpint (n_common, <=, 2);
  g_assert_cmpfloat (fabs (common / n_common - floor (x0)), <=, 1.0);
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
  /* from the keyboard: ten steps of 1/100 of the view from the cursor */
  fw_viewport_clear_selection (vp);
  fw_viewport_fit (vp);
  fw_viewport_set_cursor (vp, 0.5 * d);
  for (int i = 0; i < 10; i++)
    g_assert_true (gtk_widget_activate_action (GTK_WIDGET (w), "win.select-right", NULL));
  {
    double a, b;
    g_assert_true (fw_viewport_get_selection (vp, &a, &b));
    g_assert_cmpfloat_with_epsilon (a, 0.5 * d, 1e-9);
    g_assert_cmpfloat_with_epsilon (b - a, 10 * d / 100.0, 1e-9);
    g_assert_cmpfloat_with_epsilon (fw_viewport_get_cursor (vp), b, 1e-9);
  }
  g_assert_true (fw_test_wait (panel_idle, panel, 30));
  g_assert_cmpuint (fw_spectrum_panel_get_frames (panel, NULL), >, 1);
  fw_viewport_clear_selection (vp);
  fw_viewport_set_cursor (vp, -1);
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

/* The keyboard shortcuts window and the about dialog open from their actions. */
static gboolean
toplevel_of_type (GType type)
{
  GListModel *tops = gtk_window_get_toplevels ();   /* transfer none */

  for (guint i = 0; i < g_list_model_get_n_items (tops); i++)
    {
      g_autoptr (GtkWindow) top = g_list_model_get_item (tops, i);
      if (G_TYPE_CHECK_INSTANCE_TYPE (top, type) && gtk_widget_get_visible (GTK_WIDGET (top)))
        return TRUE;
    }
  return FALSE;
}

static void
test_shortcuts_and_about (void)
{
  FwWindow *w = demo_window ();
  GListModel *tops = gtk_window_get_toplevels ();
  GLogLevelFlags fatal;

  /* GTK 4.8's shortcuts window measures one of its own labels at a negative width and warns
   * ("reported min width -4"); that warning is GTK's, so only criticals stay fatal here. */
  fatal = g_log_set_always_fatal (G_LOG_FATAL_MASK | G_LOG_LEVEL_CRITICAL);
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (w), "win.show-help-overlay", NULL));
  fw_test_spin (0.2);
  g_assert_true (toplevel_of_type (GTK_TYPE_SHORTCUTS_WINDOW));
  g_assert_true (gtk_widget_activate_action (GTK_WIDGET (w), "app.about", NULL));
  fw_test_spin (0.2);
  g_assert_true (toplevel_of_type (GTK_TYPE_ABOUT_DIALOG));
  for (guint i = g_list_model_get_n_items (tops); i > 0; i--)
    {
      g_autoptr (GtkWindow) top = g_list_model_get_item (tops, i - 1);
      if (GTK_IS_SHORTCUTS_WINDOW (top) || GTK_IS_ABOUT_DIALOG (top))
        gtk_window_close (top);
    }
  fw_test_spin (0.1);
  g_log_set_always_fatal (fatal);
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
  g_test_add_func ("/fw/gtk/window/shortcuts-and-about", test_shortcuts_and_about);
  status = g_test_run ();
  if (win != NULL)
    fw_window_close_discarding (win);
  return status;
}
