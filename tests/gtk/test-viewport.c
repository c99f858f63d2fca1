/* test-viewport.c: the shared time range of a window (FwViewport), headless.
 *
 * The checks are invariants that follow from the definitions in fw-viewport.h (mapping is
 * linear and exactly invertible, zoom keeps its anchor on screen, the visible range stays
 * inside the extent); no outside check values are needed. */
#include <math.h>

#include "fw-viewport.h"

static void
count_changes (FwViewport *vp, guint what, gpointer user_data)
{
  guint *n = user_data;
  (*n)++;
}

static void
test_fit_and_mapping (void)
{
  g_autoptr (FwViewport) vp = fw_viewport_new ();
  double s, e;

  fw_viewport_set_duration (vp, 4.0);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat (s, ==, 0.0);
  g_assert_cmpfloat (e, ==, 4.0);
  g_assert_true (fw_viewport_is_fit (vp));

  /* time 1 s in a 800 px wide area showing 0..4 s lies at 200 px */
  g_assert_cmpfloat_with_epsilon (fw_viewport_time_to_x (vp, 1.0, 800), 200.0, 1e-9);
  g_assert_cmpfloat_with_epsilon (fw_viewport_x_to_time (vp, 200.0, 800), 1.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (fw_viewport_seconds_per_pixel (vp, 800), 0.005, 1e-15);

  /* round trips at many points */
  for (int i = 0; i <= 100; i++)
    {
      double t = i * 0.04;
      double x = fw_viewport_time_to_x (vp, t, 777);
      g_assert_cmpfloat_with_epsilon (fw_viewport_x_to_time (vp, x, 777), t, 1e-12);
    }
}

static void
test_zoom_keeps_anchor (void)
{
  g_autoptr (FwViewport) vp = fw_viewport_new ();
  double s, e, x_before, x_after;

  fw_viewport_set_duration (vp, 10.0);
  x_before = fw_viewport_time_to_x (vp, 3.0, 1000);
  fw_viewport_zoom (vp, 2.0, 3.0);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat_with_epsilon (e - s, 5.0, 1e-12);
  x_after = fw_viewport_time_to_x (vp, 3.0, 1000);
  g_assert_cmpfloat_with_epsilon (x_after, x_before, 1e-9);
  g_assert_false (fw_viewport_is_fit (vp));

  /* zooming out past the extent shows everything, never more */
  fw_viewport_zoom (vp, 0.01, 3.0);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat (s, ==, 0.0);
  g_assert_cmpfloat (e, ==, 10.0);

  /* zooming in without bound stops at the minimum span */
  for (int i = 0; i < 60; i++)
    fw_viewport_zoom (vp, 2.0, 7.0);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat_with_epsilon (e - s, FW_VIEWPORT_MIN_SPAN, 1e-12);
  g_assert_cmpfloat (s, <=, 7.0);
  g_assert_cmpfloat (e, >=, 7.0);
}

static void
test_pan_stops_at_ends (void)
{
  g_autoptr (FwViewport) vp = fw_viewport_new ();
  double s, e;

  fw_viewport_set_duration (vp, 10.0);
  fw_viewport_set_visible (vp, 2.0, 4.0);
  fw_viewport_pan (vp, 1.5);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat_with_epsilon (s, 3.5, 1e-12);
  g_assert_cmpfloat_with_epsilon (e, 5.5, 1e-12);

  fw_viewport_pan (vp, 100.0);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat_with_epsilon (e, 10.0, 1e-12);
  g_assert_cmpfloat_with_epsilon (e - s, 2.0, 1e-12);   /* span kept */

  fw_viewport_pan (vp, -100.0);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat (s, ==, 0.0);
  g_assert_cmpfloat_with_epsilon (e, 2.0, 1e-12);

  /* swapped ends are ordered */
  fw_viewport_set_visible (vp, 6.0, 5.0);
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat (s, ==, 5.0);
  g_assert_cmpfloat (e, ==, 6.0);

  fw_viewport_fit (vp);
  g_assert_true (fw_viewport_is_fit (vp));
}

static void
test_cursor_and_selection (void)
{
  g_autoptr (FwViewport) vp = fw_viewport_new ();
  double s, e;
  guint changes = 0;

  fw_viewport_set_duration (vp, 3.0);
  g_signal_connect (vp, "changed", G_CALLBACK (count_changes), &changes);

  g_assert_false (fw_viewport_has_cursor (vp));
  fw_viewport_set_cursor (vp, 1.25);
  g_assert_true (fw_viewport_has_cursor (vp));
  g_assert_cmpfloat (fw_viewport_get_cursor (vp), ==, 1.25);
  g_assert_cmpuint (changes, ==, 1);
  fw_viewport_set_cursor (vp, 1.25);          /* no change, no signal */
  g_assert_cmpuint (changes, ==, 1);
  fw_viewport_set_cursor (vp, 9.0);           /* clamped into the extent */
  g_assert_cmpfloat (fw_viewport_get_cursor (vp), ==, 3.0);

  g_assert_false (fw_viewport_get_selection (vp, &s, &e));
  fw_viewport_set_selection (vp, 2.0, 0.5);   /* ordered */
  g_assert_true (fw_viewport_get_selection (vp, &s, &e));
  g_assert_cmpfloat (s, ==, 0.5);
  g_assert_cmpfloat (e, ==, 2.0);
  fw_viewport_set_selection (vp, -1.0, 7.0);  /* clamped */
  g_assert_true (fw_viewport_get_selection (vp, &s, &e));
  g_assert_cmpfloat (s, ==, 0.0);
  g_assert_cmpfloat (e, ==, 3.0);
  fw_viewport_clear_selection (vp);
  g_assert_false (fw_viewport_get_selection (vp, &s, &e));
  fw_viewport_set_selection (vp, 1.0, 1.0);   /* empty = none */
  g_assert_false (fw_viewport_get_selection (vp, NULL, NULL));
}

static void
test_duration_change (void)
{
  g_autoptr (FwViewport) vp = fw_viewport_new ();
  double s, e;

  fw_viewport_set_duration (vp, 5.0);
  fw_viewport_set_duration (vp, 8.0);         /* was fit: follows the extent */
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat (e, ==, 8.0);

  fw_viewport_set_visible (vp, 6.0, 7.5);
  fw_viewport_set_duration (vp, 4.0);         /* zoomed: shifted inside, span kept */
  fw_viewport_get_visible (vp, &s, &e);
  g_assert_cmpfloat_with_epsilon (s, 2.5, 1e-12);
  g_assert_cmpfloat_with_epsilon (e, 4.0, 1e-12);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/gtk/viewport/fit-and-mapping", test_fit_and_mapping);
  g_test_add_func ("/fw/gtk/viewport/zoom-keeps-anchor", test_zoom_keeps_anchor);
  g_test_add_func ("/fw/gtk/viewport/pan-stops-at-ends", test_pan_stops_at_ends);
  g_test_add_func ("/fw/gtk/viewport/cursor-and-selection", test_cursor_and_selection);
  g_test_add_func ("/fw/gtk/viewport/duration-change", test_duration_change);
  return g_test_run ();
}
