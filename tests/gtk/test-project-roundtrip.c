/* test-project-roundtrip.c: edits in the window, save, close, reopen: the same project comes
 * back; closing with unsaved changes asks first. Needs a display. */
#include <string.h>

#include <glib/gstdio.h>

#include "fw-recent.h"
#include "fw-test-window.h"

static gboolean
has_transient_dialog (GtkWindow *parent)
{
  GListModel *tops = gtk_window_get_toplevels ();   /* transfer none */

  for (guint i = 0; i < g_list_model_get_n_items (tops); i++)
    {
      g_autoptr (GtkWindow) top = g_list_model_get_item (tops, i);
      if (top != parent && gtk_window_get_transient_for (top) == parent &&
          gtk_widget_get_visible (GTK_WIDGET (top)))
        return TRUE;
    }
  return FALSE;
}

static void
test_save_close_reopen (void)
{
  FwWindow *w = fw_test_demo_window (1200, 800);
  FwProject *project = fw_window_get_project (w);
  g_autofree char *dir = fw_test_tmpdir ();
  g_autofree char *path = g_build_filename (dir, "hives.fwproj", NULL);
  g_autofree char *saved_text = NULL;
  g_autofree char *reopened_text = NULL;
  g_autofree char *first_label = NULL;
  g_autoptr (FwClip) clip = NULL;
  GtkWidget *entry;
  FwWindow *again;
  g_auto (GStrv) recent = NULL;

  /* edits through the window: a duplicated set, a new label, a parameter */
  gtk_widget_activate_action (GTK_WIDGET (w), "win.duplicate-set", NULL);
  g_assert_nonnull (strstr (fw_param_set_get_name (_fw_window_get_param_set (w)), "copy"));
  entry = fw_params_editor_get_field (_fw_window_get_params_editor (w), "mel_bands");
  gtk_editable_set_text (GTK_EDITABLE (entry), "40");
  g_signal_emit_by_name (entry, "activate");
  clip = g_list_model_get_item (fw_project_get_clips (project), 0);
  fw_clip_set_label (clip, "swarm-warning");
  g_assert_true (fw_project_get_dirty (project));

  /* closing with unsaved changes asks and keeps the window */
  gtk_window_close (GTK_WINDOW (w));
  fw_test_spin (0.2);
  g_assert_true (gtk_widget_get_visible (GTK_WIDGET (w)));
  g_assert_true (has_transient_dialog (GTK_WINDOW (w)));

  g_assert_true (fw_window_save (w, path));
  g_assert_false (fw_project_get_dirty (project));
  g_assert_cmpstr (fw_project_get_path (project), ==, path);
  saved_text = fw_project_to_data (project, path);
  recent = fw_recent_list ();
  g_assert_cmpstr (recent[0], ==, path);
  fw_window_close_discarding (w);
  fw_test_spin (0.2);

  again = fw_window_new (FW_APPLICATION (g_application_get_default ()));
  g_assert_true (fw_window_open_project (again, path));
  gtk_window_present (GTK_WINDOW (again));
  reopened_text = fw_project_to_data (fw_window_get_project (again), path);
  g_assert_cmpstr (reopened_text, ==, saved_text);
  g_assert_false (fw_project_get_dirty (fw_window_get_project (again)));
  {
    FwProject *p = fw_window_get_project (again);
    FwParamSet *copy = NULL;
    GListModel *sets = fw_project_get_param_sets (p);
    g_autofree char *bands = NULL;

    for (guint i = 0; i < g_list_model_get_n_items (sets); i++)
      {
        g_autoptr (FwParamSet) s = g_list_model_get_item (sets, i);
        if (strstr (fw_param_set_get_name (s), "copy") != NULL)
          copy = s;
      }
    g_assert_nonnull (copy);
    bands = fw_params_get_value (fw_param_set_get_params (copy), "mel_bands");
    g_assert_cmpstr (bands, ==, "40");
    g_assert_nonnull (fw_project_find_clip (p, fw_clip_get_path (clip)));
    g_assert_cmpstr (fw_clip_get_label (fw_project_find_clip (p, fw_clip_get_path (clip))), ==,
                     "swarm-warning");
  }
  g_assert_true (fw_test_wait_settled (again, 120));
  fw_window_close_discarding (again);

  /* a failed open names the file and keeps what is shown */
  {
    FwWindow *third = fw_test_demo_window (800, 600);
    g_autofree char *bad = g_build_filename (dir, "broken.fwproj", NULL);
    const char *banner;

    g_assert_true (g_file_set_contents (bad, "[framewise-project\nthis is not a project", -1, NULL));
    g_assert_false (fw_window_open_project (third, bad));
    banner = _fw_window_get_banner_text (third);
    g_test_message ("banner: %s", banner);
    g_assert_nonnull (banner);
    g_assert_nonnull (strstr (banner, bad));
    g_assert_nonnull (_fw_window_get_clip (third));
    fw_window_close_discarding (third);
    g_unlink (bad);
  }
  fw_test_rm_rf (dir);
}

/* A clip whose file is missing is flagged in its rows; relinking it computes them. */
static void
test_missing_and_relink (void)
{
  g_autofree char *dir = fw_test_tmpdir ();
  g_autofree char *path = g_build_filename (dir, "gone.fwproj", NULL);
  g_autofree char *gone = g_build_filename (dir, "hive-that-moved.flac", NULL);
  g_autofree char *demo = fw_project_demo_path ();
  g_autofree char *demo_dir = g_path_get_dirname (demo);
  g_autofree char *real = g_build_filename (demo_dir, "calm-colony-01.flac", NULL);
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwParamSet) set = fw_param_set_new ("default", fw_params_new_default ());
  g_autoptr (FwClip) clip = fw_clip_new (gone);
  g_autoptr (GError) error = NULL;
  FwWindow *w;
  FwPlotRow *mfcc;
  FwClip *shown;

  g_assert_true (fw_project_add_param_set (project, set, &error));
  fw_project_add_clip (project, clip);
  g_assert_true (fw_project_save (project, path, &error));
  g_assert_no_error (error);

  w = fw_window_new (FW_APPLICATION (g_application_get_default ()));
  g_assert_true (fw_window_open_project (w, path));
  gtk_window_present (GTK_WINDOW (w));
  g_assert_true (fw_test_wait_settled (w, 60));
  shown = _fw_window_get_clip (w);
  g_assert_true (fw_clip_get_missing (shown));
  mfcc = fw_plot_stack_get_row (_fw_window_get_plot_stack (w), 0, FW_PLOT_MFCC);
  g_assert_nonnull (fw_plot_row_get_message (mfcc));
  g_test_message ("missing: %s", fw_plot_row_get_message (mfcc));
  g_assert_nonnull (strstr (fw_plot_row_get_message (mfcc), "hive-that-moved.flac"));
  g_assert_null (fw_plot_row_get_matrix (mfcc));

  fw_clip_set_path (shown, real);
  g_assert_false (fw_clip_get_missing (shown));
  g_assert_true (fw_test_wait_settled (w, 120));
  g_assert_null (fw_plot_row_get_message (mfcc));
  g_assert_nonnull (fw_plot_row_get_matrix (mfcc));
  g_assert_cmpuint (fw_spectrum_panel_get_frames (_fw_window_get_spectrum_panel (w), NULL), ==,
                    fw_plot_row_get_matrix (mfcc)->n_frames);
  g_assert_true (fw_project_get_dirty (fw_window_get_project (w)));
  fw_window_close_discarding (w);
  fw_test_rm_rf (dir);
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
  g_test_add_func ("/fw/gtk/project/save-close-reopen", test_save_close_reopen);
  g_test_add_func ("/fw/gtk/project/missing-and-relink", test_missing_and_relink);
  return g_test_run ();
}
