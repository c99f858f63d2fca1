/* fw-test-window.c: helpers for the window tests. */
#include "fw-test-window.h"

#include <glib/gstdio.h>

static char *state_dir;

gboolean
fw_test_gtk_init (void)
{
  if (state_dir == NULL)
    {
      state_dir = g_dir_make_tmp ("fw-gtk-state-XXXXXX", NULL);
      g_setenv ("FW_STATE_DIR", state_dir, TRUE);
    }
  /* GtkSettings on a bare X server: no animations, so tests need no waiting for them */
  g_setenv ("GTK_A11Y", "none", FALSE);
  if (!gtk_init_check ())
    return FALSE;
  g_object_set (gtk_settings_get_default (), "gtk-enable-animations", FALSE, NULL);
  return TRUE;
}

static FwApplication *app;

FwWindow *
fw_test_demo_window (int width, int height)
{
  FwWindow *win;
  g_autoptr (GError) error = NULL;

  if (app == NULL)
    {
      app = fw_application_new ();
      g_application_set_flags (G_APPLICATION (app), G_APPLICATION_NON_UNIQUE);
      g_assert_true (g_application_register (G_APPLICATION (app), NULL, &error));
      g_assert_no_error (error);
    }
  win = fw_window_new (app);
  gtk_window_set_default_size (GTK_WINDOW (win), width, height);
  fw_window_open_demo (win);
  gtk_window_present (GTK_WINDOW (win));
  g_assert_null (_fw_window_get_banner_text (win));
  g_assert_true (fw_test_wait_settled (win, 240));
  return win;
}

gboolean
fw_test_wait (gboolean (*cond) (gpointer data), gpointer data, double timeout)
{
  gint64 end = g_get_monotonic_time () + (gint64) (timeout * G_USEC_PER_SEC);

  while (!cond (data))
    {
      if (g_get_monotonic_time () > end)
        return cond (data);
      if (!g_main_context_iteration (NULL, FALSE))
        g_usleep (2000);
    }
  return TRUE;
}

void
fw_test_spin (double seconds)
{
  gint64 end = g_get_monotonic_time () + (gint64) (seconds * G_USEC_PER_SEC);

  while (g_get_monotonic_time () < end)
    if (!g_main_context_iteration (NULL, FALSE))
      g_usleep (2000);
}

static gboolean
settled (gpointer data)
{
  return fw_window_is_settled (FW_WINDOW (data));
}

gboolean
fw_test_wait_settled (FwWindow *win, double timeout)
{
  gint64 end = g_get_monotonic_time () + (gint64) (timeout * G_USEC_PER_SEC);

  /* settled, and still settled after the results were laid out and drawn (drawing a new
   * result starts its heatmap rendering, which unsettles the window for a moment) */
  while (g_get_monotonic_time () < end)
    {
      if (!fw_test_wait (settled, win, (end - g_get_monotonic_time ()) / (double) G_USEC_PER_SEC))
        return FALSE;
      fw_test_spin (0.3);
      if (fw_window_is_settled (win))
        return TRUE;
    }
  return fw_window_is_settled (win);
}

guint32 *
fw_test_texture_pixels (GdkTexture *texture, int *width, int *height)
{
  int w = gdk_texture_get_width (texture);
  int h = gdk_texture_get_height (texture);
  guint32 *pixels = g_new (guint32, (gsize) w * h);

  /* GDK_MEMORY_DEFAULT layout: one native-endian 0xAARRGGBB word per pixel */
  gdk_texture_download (texture, (guchar *) pixels, (gsize) w * 4);
  *width = w;
  *height = h;
  return pixels;
}

guint
fw_test_distinct_colours (const guint32 *pixels, int width, int height,
                          const graphene_rect_t *rect)
{
  g_autoptr (GHashTable) seen = g_hash_table_new (g_direct_hash, g_direct_equal);
  int x0 = MAX (0, (int) rect->origin.x), y0 = MAX (0, (int) rect->origin.y);
  int x1 = MIN (width, (int) (rect->origin.x + rect->size.width));
  int y1 = MIN (height, (int) (rect->origin.y + rect->size.height));

  for (int y = y0; y < y1; y++)
    for (int x = x0; x < x1; x++)
      g_hash_table_add (seen, GUINT_TO_POINTER (pixels[(gsize) y * width + x] | 1u));
  return g_hash_table_size (seen);
}

gboolean
fw_test_widget_bounds (GtkWidget *widget, GtkWidget *window, graphene_rect_t *out)
{
  return gtk_widget_compute_bounds (widget, window, out);
}

char *
fw_test_tmpdir (void)
{
  g_autoptr (GError) error = NULL;
  char *dir = g_dir_make_tmp ("fw-gtk-test-XXXXXX", &error);

  g_assert_no_error (error);
  return dir;
}

void
fw_test_rm_rf (const char *path)
{
  g_autoptr (GDir) dir = g_dir_open (path, 0, NULL);
  const char *name;

  while (dir != NULL && (name = g_dir_read_name (dir)) != NULL)
    {
      g_autofree char *child = g_build_filename (path, name, NULL);
      if (g_file_test (child, G_FILE_TEST_IS_DIR))
        fw_test_rm_rf (child);
      else
        g_unlink (child);
    }
  g_rmdir (path);
}
