/* test-export.c: the export dialog writes SVG, PDF and PNG figures through the render
 * layer's exporter. Needs a display. */
#include <math.h>
#include <string.h>

#include <glib/gstdio.h>

#include "fw-export-dialog.h"
#include "fw-export.h"
#include "fw-test-window.h"

static gboolean
starts_with_file (const char *path, const char *magic, gsize n)
{
  g_autofree char *data = NULL;
  gsize len = 0;

  if (!g_file_get_contents (path, &data, &len, NULL) || len < n)
    return FALSE;
  return memcmp (data, magic, n) == 0;
}

static void
test_export_writes_files (void)
{
  FwWindow *w = fw_test_demo_window (1200, 800);
  g_autofree char *dir = fw_test_tmpdir ();
  g_autofree char *svg = g_build_filename (dir, "figure.svg", NULL);
  g_autofree char *pdf = g_build_filename (dir, "figure.pdf", NULL);
  g_autofree char *png = g_build_filename (dir, "figure.png", NULL);
  FwPlotKind rows[] = { FW_PLOT_WAVEFORM, FW_PLOT_SPECTROGRAM, FW_PLOT_MFCC };
  GtkWidget *dialog;
  g_autoptr (GError) error = NULL;
  g_autoptr (GdkTexture) texture = NULL;
  g_autofree char *recipe = NULL;
  FwViewport *vp = _fw_window_get_viewport (w);

  dialog = fw_export_dialog_new (GTK_WINDOW (w), _fw_window_get_cache (w), vp,
                                 _fw_window_get_clip (w), _fw_window_get_param_set (w),
                                 rows, G_N_ELEMENTS (rows));
  gtk_window_present (GTK_WINDOW (dialog));
  fw_test_spin (0.5);

  g_assert_true (fw_export_dialog_export_to_file (FW_EXPORT_DIALOG (dialog), svg, &error));
  g_assert_no_error (error);
  g_assert_true (starts_with_file (svg, "<?xml", 5));
  g_assert_true (fw_export_dialog_export_to_file (FW_EXPORT_DIALOG (dialog), pdf, &error));
  g_assert_no_error (error);
  g_assert_true (starts_with_file (pdf, "%PDF", 4));

  /* a selection exported as PNG: exact pixel width for 175 mm at 300 dpi (the defaults) */
  fw_viewport_set_selection (vp, 0.5, 1.5);
  fw_export_dialog_set_time_range (FW_EXPORT_DIALOG (dialog), "selection");
  g_assert_true (fw_export_dialog_export_to_file (FW_EXPORT_DIALOG (dialog), png, &error));
  g_assert_no_error (error);
  g_assert_true (starts_with_file (png, "\x89PNG", 4));
  texture = gdk_texture_new_from_filename (png, &error);
  g_assert_no_error (error);
  /* round(175 / 25.4 * 300) = 2067 */
  g_assert_cmpint (gdk_texture_get_width (texture), ==, fw_export_pixels (175.0, 300.0));
  g_assert_cmpint (gdk_texture_get_width (texture), ==, 2067);

  /* the figure carries its parameters */
  recipe = fw_export_read_recipe (png, &error);
  g_assert_no_error (error);
  g_assert_nonnull (strstr (recipe, fw_params_get_hash (fw_param_set_get_params (_fw_window_get_param_set (w)))));

  gtk_window_destroy (GTK_WINDOW (dialog));
  fw_viewport_clear_selection (vp);
  g_unlink (svg);
  g_unlink (pdf);
  g_unlink (png);
  g_rmdir (dir);
  fw_window_close_discarding (w);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  if (!fw_test_gtk_init ())
    {
      g_print ("1..0 # SKIP no display (run the GTK tests under xvfb-run -a)\n");
      return 0;
    }
  g_test_add_func ("/fw/gtk/export/writes-files", test_export_writes_files);
  return g_test_run ();
}
