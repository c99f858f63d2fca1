/* test-compare.c: the compare view on the demo: two parameter sets of one clip, two clips
 * under one set, swapping sides, a new set from B's knob, saving and reopening, a feature
 * file with the convention finder, and errors shown in the view. Needs a display. */
#include <math.h>
#include <string.h>

#include <glib/gstdio.h>

#include "fw-compare-dialog.h"
#include "fw-feature.h"
#include "fw-test-window.h"

static FwWindow *win;

static FwWindow *
demo_window (void)
{
  if (win == NULL)
    win = fw_test_demo_window (1400, 900);
  return win;
}

static FwParams *
set_params (FwWindow *w, const char *name)
{
  FwParamSet *set = fw_project_find_param_set (fw_window_get_project (w), name);

  g_assert_nonnull (set);
  return fw_param_set_get_params (set);
}

/* Distinct colours in a row's data area, from a picture of the whole window. */
static guint
row_colours (FwWindow *w, const guint32 *pixels, int width, int height, FwPlotRow *row)
{
  graphene_rect_t area, bounds;

  fw_plot_row_get_data_area (row, &area);
  g_assert_true (fw_test_widget_bounds (GTK_WIDGET (row), GTK_WIDGET (w), &bounds));
  area.origin.x += bounds.origin.x;
  area.origin.y += bounds.origin.y;
  return fw_test_distinct_colours (pixels, width, height, &area);
}

static void
assert_rows_draw (FwWindow *w, FwCompareView *view)
{
  g_autoptr (GdkTexture) texture = NULL;
  g_autofree guint32 *pixels = NULL;
  int width, height;

  /* the window's picture exists once a frame has been drawn since the last change */
  for (guint tries = 0; texture == NULL && tries < 100; tries++)
    {
      gtk_widget_queue_draw (GTK_WIDGET (w));
      fw_test_spin (0.05);
      texture = fw_window_render_texture (w);
    }
  g_assert_nonnull (texture);
  pixels = fw_test_texture_pixels (texture, &width, &height);
  for (guint i = 0; i < FW_N_COMPARE_ROWS; i++)
    {
      FwPlotRow *row = fw_compare_view_get_row (view, i);
      guint colours;

      g_assert_nonnull (row);
      g_assert_true (gtk_widget_get_mapped (GTK_WIDGET (row)));
      g_assert_null (fw_plot_row_get_message (row));
      g_assert_nonnull (fw_plot_row_get_matrix (row));
      colours = row_colours (w, pixels, width, height, row);
      g_test_message ("row %s: %u colours", fw_plot_row_get_title (row), colours);
      /* heatmaps have many colours; the per-frame curve at least its line and background */
      g_assert_cmpuint (colours, >=, i == FW_COMPARE_ROW_FRAMES ? 3 : 40);
    }
  /* one time axis: the same time lands on the same x in every row */
  {
    double x0 = fw_plot_row_time_to_x (fw_compare_view_get_row (view, 0), 1.25);
    for (guint i = 1; i < FW_N_COMPARE_ROWS; i++)
      g_assert_cmpfloat_with_epsilon (fw_plot_row_time_to_x (fw_compare_view_get_row (view, i),
                                                             1.25), x0, 1e-9);
  }
}

static gboolean
strv_has (char **v, const char *s)
{
  for (guint i = 0; v != NULL && v[i] != NULL; i++)
    if (g_strcmp0 (v[i], s) == 0)
      return TRUE;
  return FALSE;
}

/* Short and long window on one clip: the view opens, draws, explains, and ranks exactly the
 * keys in which the two sets differ. */
static void
test_two_sets (void)
{
  FwWindow *w = demo_window ();
  FwCompareView *view = _fw_window_get_compare_view (w);
  g_autoptr (GError) error = NULL;
  g_auto (GStrv) differing = fw_params_diff_keys (set_params (w, "short-window"),
                                                  set_params (w, "long-window"));
  const FwKnobRanking *ranking;
  guint n_before = g_list_model_get_n_items (fw_project_get_comparisons (fw_window_get_project (w)));

  g_assert_true (fw_window_compare (w, "calm-colony-01.flac@short-window",
                                    "calm-colony-01.flac@long-window", "db", &error));
  g_assert_no_error (error);
  g_assert_true (_fw_window_compare_shown (w));
  g_assert_true (fw_test_wait_settled (w, 240));
  g_assert_null (fw_compare_view_get_message (view));
  g_assert_nonnull (fw_compare_view_get_result (view));
  g_assert_cmpuint (strlen (fw_compare_view_get_summary_text (view)), >, 20);
  g_assert_cmpstr (fw_compare_view_get_summary_text (view), ==,
                   fw_compare_view_get_result (view)->summary);
  assert_rows_draw (w, view);

  /* the knob ranking names every differing key once, and nothing else */
  ranking = fw_compare_view_get_ranking (view);
  g_assert_nonnull (ranking);
  g_assert_cmpuint (g_strv_length (differing), >=, 2);
  g_assert_cmpuint (ranking->knobs->len, ==, g_strv_length (differing));
  for (guint i = 0; i < ranking->knobs->len; i++)
    {
      const FwKnob *k = ranking->knobs->pdata[i];
      g_test_message ("knob %s: %s -> %s removes %g", k->key, k->value_a, k->value_b, k->removed);
      g_assert_true (strv_has (differing, k->key));
    }

  /* saved in the project and listed in the sidebar */
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_comparisons (fw_window_get_project (w))),
                    ==, n_before + 1);
  {
    guint rows = 0;
    for (GtkWidget *c = gtk_widget_get_first_child (GTK_WIDGET (w->comparison_list)); c != NULL;
         c = gtk_widget_get_next_sibling (c))
      rows++;
    g_assert_cmpuint (rows, ==, n_before + 1);
  }
}

/* "Make B's knob my parameter set": a new set whose parameters differ from A's in exactly
 * that key, at B's value. */
static void
test_adopt_knob (void)
{
  FwWindow *w = demo_window ();
  FwCompareView *view = _fw_window_get_compare_view (w);
  FwProject *project = fw_window_get_project (w);
  guint n_sets = g_list_model_get_n_items (fw_project_get_param_sets (project));
  g_autoptr (GError) error = NULL;
  FwParamSet *added;
  g_auto (GStrv) keys = NULL;
  g_autofree char *hop_b = fw_params_get_value (set_params (w, "long-window"), "hop_length");
  g_autofree char *hop_new = NULL;

  if (fw_compare_view_get_ranking (view) == NULL)
    test_two_sets ();
  added = fw_compare_view_adopt_knob (view, "hop_length", &error);
  g_assert_no_error (error);
  g_assert_nonnull (added);
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_param_sets (project)), ==, n_sets + 1);
  g_assert_true (fw_project_find_param_set (project, fw_param_set_get_name (added)) == added);
  g_assert_true (g_str_has_prefix (fw_param_set_get_name (added), "short-window + hop_length="));
  keys = fw_params_diff_keys (set_params (w, "short-window"), fw_param_set_get_params (added));
  g_assert_cmpuint (g_strv_length (keys), ==, 1);
  g_assert_cmpstr (keys[0], ==, "hop_length");
  hop_new = fw_params_get_value (fw_param_set_get_params (added), "hop_length");
  g_assert_cmpstr (hop_new, ==, hop_b);

  /* a key that is no parameter is refused with its name in the message */
  g_assert_null (fw_compare_view_adopt_knob (view, "hop_lenght", &error));
  g_assert_nonnull (error);
  g_assert_nonnull (strstr (error->message, "hop_lenght"));
  g_assert_true (fw_test_wait_settled (w, 240));
}

/* A calm and an agitated colony with one set: a difference row, and swapping negates it. */
static void
test_two_clips_and_swap (void)
{
  FwWindow *w = demo_window ();
  FwCompareView *view = _fw_window_get_compare_view (w);
  FwProject *project = fw_window_get_project (w);
  g_autoptr (GError) error = NULL;
  const FwCompareResult *r;
  const FwDiffResult *d;
  gsize cell = 0, frame, bin;
  double t, f, v = 0;
  guint n_cmp;
  FwComparison *cmp;

  g_assert_true (fw_window_compare (w, "calm-colony-01.flac@long-window",
                                    "agitated-colony-02.flac@long-window", "mel-db", &error));
  g_assert_no_error (error);
  g_assert_true (fw_test_wait_settled (w, 240));
  g_assert_null (fw_compare_view_get_message (view));
  r = fw_compare_view_get_result (view);
  g_assert_nonnull (r);
  d = r->diff;
  g_assert_nonnull (d->diff);
  g_assert_true (fw_compare_view_get_shown_difference (view) == d->diff);
  g_assert_cmpuint (d->n_frames, >, 10);
  g_assert_cmpuint (d->n_bins, ==, 128);
  assert_rows_draw (w, view);
  /* one set: no key to rank */
  g_assert_null (fw_compare_view_get_ranking (view));

  /* the difference row is B - A cell by cell; pick a clearly non-zero cell */
  for (gsize i = 0; i < d->n_frames * d->n_bins; i++)
    {
      g_assert_cmpfloat (d->diff->data[i], ==, d->b->data[i] - d->a->data[i]);
      if (fabs (d->diff->data[i]) > fabs (v))
        {
          v = d->diff->data[i];
          cell = i;
        }
    }
  g_assert_cmpfloat (fabs (v), >, 1.0);
  frame = cell / d->n_bins;
  bin = cell % d->n_bins;
  t = d->diff->frame_times[frame];
  f = d->diff->bin_value[bin];

  n_cmp = g_list_model_get_n_items (fw_project_get_comparisons (project));
  fw_compare_view_swap (view);
  g_assert_true (fw_test_wait_settled (w, 240));
  r = fw_compare_view_get_result (view);
  g_assert_nonnull (r);
  d = r->diff;
  /* same grid (equal hops, both from 0 s), so the same cell holds the negated value:
   * IEEE 754 subtraction is exactly antisymmetric, a - b == -(b - a) */
  g_assert_cmpfloat (d->diff->frame_times[frame], ==, t);
  g_assert_cmpfloat (d->diff->bin_value[bin], ==, f);
  g_assert_cmpfloat (d->diff->data[cell], ==, -v);

  /* the project holds the swapped comparison instead of the old one */
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_comparisons (project)), ==, n_cmp);
  cmp = fw_compare_view_get_comparison (view);
  g_assert_nonnull (strstr (fw_comparison_get_clip (cmp, 0), "agitated-colony-02"));
  g_assert_nonnull (strstr (fw_comparison_get_clip (cmp, 1), "calm-colony-01"));
  g_assert_nonnull (strstr (fw_comparison_get_name (cmp), "agitated-colony-02 vs calm-colony-01"));
}

/* Saved comparisons survive save and reopen, and compute the same explanation. */
static void
test_save_reopen (void)
{
  FwWindow *w = demo_window ();
  FwCompareView *view = _fw_window_get_compare_view (w);
  g_autofree char *dir = fw_test_tmpdir ();
  g_autofree char *path = g_build_filename (dir, "compared.fwproj", NULL);
  g_autofree char *summary = NULL;
  g_autofree char *name = NULL;
  g_autofree char *stage = NULL;
  g_autoptr (GError) error = NULL;
  GListModel *before, *after;
  FwWindow *again;

  if (fw_compare_view_get_result (view) == NULL)
    test_two_clips_and_swap ();
  summary = g_strdup (fw_compare_view_get_result (view)->summary);
  name = g_strdup (fw_comparison_get_name (fw_compare_view_get_comparison (view)));
  stage = g_strdup (fw_comparison_get_stage (fw_compare_view_get_comparison (view)));
  before = fw_project_get_comparisons (fw_window_get_project (w));
  g_assert_cmpuint (g_list_model_get_n_items (before), >=, 1);
  g_assert_true (fw_window_save (w, path));

  again = fw_window_new (FW_APPLICATION (g_application_get_default ()));
  gtk_window_set_default_size (GTK_WINDOW (again), 1400, 900);
  g_assert_true (fw_window_open_project (again, path));
  gtk_window_present (GTK_WINDOW (again));
  after = fw_project_get_comparisons (fw_window_get_project (again));
  g_assert_cmpuint (g_list_model_get_n_items (after), ==, g_list_model_get_n_items (before));
  for (guint i = 0; i < g_list_model_get_n_items (after); i++)
    {
      g_autoptr (FwComparison) x = g_list_model_get_item (before, i);
      g_autoptr (FwComparison) y = g_list_model_get_item (after, i);
      g_assert_cmpstr (fw_comparison_get_name (x), ==, fw_comparison_get_name (y));
      g_assert_cmpstr (fw_comparison_get_stage (x), ==, fw_comparison_get_stage (y));
      for (guint s = 0; s < 2; s++)
        {
          g_assert_cmpint (fw_comparison_get_kind (x, s), ==, fw_comparison_get_kind (y, s));
          g_assert_cmpstr (fw_comparison_get_clip (x, s), ==, fw_comparison_get_clip (y, s));
          g_assert_cmpstr (fw_comparison_get_param_set (x, s), ==,
                           fw_comparison_get_param_set (y, s));
        }
    }
  g_assert_false (_fw_window_compare_shown (again));
  g_assert_true (fw_window_open_comparison_by_name (again, name, &error));
  g_assert_no_error (error);
  g_assert_true (_fw_window_compare_shown (again));
  g_assert_true (fw_test_wait_settled (again, 240));
  g_assert_cmpstr (fw_comparison_get_stage (fw_compare_view_get_comparison (_fw_window_get_compare_view (again))),
                   ==, stage);
  g_assert_nonnull (fw_compare_view_get_result (_fw_window_get_compare_view (again)));
  g_assert_cmpstr (fw_compare_view_get_result (_fw_window_get_compare_view (again))->summary, ==,
                   summary);
  g_assert_false (fw_window_open_comparison_by_name (again, "no such comparison", &error));
  g_assert_nonnull (strstr (error->message, "no such comparison"));
  fw_window_close_discarding (again);
  fw_test_spin (0.2);
  fw_test_rm_rf (dir);
}

/* A feature file made with mel_scale=htk against the clip with the default (slaney) set: the
 * comparison runs on A's grid and the convention finder names mel_scale. */
static void
test_feature_file_finder (void)
{
  FwWindow *w = demo_window ();
  FwCompareView *view = _fw_window_get_compare_view (w);
  FwProject *project = fw_window_get_project (w);
  FwClip *clip = fw_project_find_clip (project, "calm-colony-01.flac");
  FwParams *base = set_params (w, "defaults");
  g_autoptr (FwParams) htk = NULL;
  g_autoptr (FwAudio) audio = NULL;
  FwMatrix *dump;
  g_autofree char *dir = fw_test_tmpdir ();
  g_autofree char *npy = g_build_filename (dir, "pipeline-mel.npy", NULL);
  g_autoptr (GError) error = NULL;
  g_autoptr (FwComparison) cmp = NULL;
  const FwExplainResult *found;
  FwParamSet *added;
  g_autofree char *mel = NULL;
  guint n_sets;

  g_assert_nonnull (clip);
  {
    g_autofree char *scale = fw_params_get_value (base, "mel_scale");
    g_assert_cmpstr (scale, ==, "slaney");
  }
  htk = fw_params_with (base, "mel_scale", "htk", &error);
  g_assert_no_error (error);
  audio = fw_feature_load_audio (fw_clip_get_path (clip), htk, NULL, &error);
  g_assert_no_error (error);
  dump = fw_feature_compute (audio, htk, FW_STAGE_MEL_DB, 1, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_true (fw_feature_write (dump, npy, &error));
  fw_matrix_unref (dump);

  cmp = fw_comparison_new ("calm-colony-01 vs pipeline dump", "mel-db");
  fw_comparison_set_operand (cmp, 0, FW_OPERAND_CLIP, fw_clip_get_path (clip), "defaults", "");
  fw_comparison_set_operand (cmp, 1, FW_OPERAND_FILE, npy, "", "axes=frames-bins");
  _fw_window_start_comparison (w, cmp);
  g_assert_true (fw_test_wait_settled (w, 240));
  g_assert_null (fw_compare_view_get_message (view));
  g_assert_nonnull (fw_compare_view_get_result (view));
  g_assert_null (fw_compare_view_get_ranking (view));
  assert_rows_draw (w, view);

  /* the finder starts by itself for a file against a clip, and again on request */
  found = fw_compare_view_get_finder_result (view);
  g_assert_nonnull (found);
  g_assert_true (strv_has (found->changed_keys, "mel_scale"));
  g_assert_true (fw_compare_view_start_finder (view));
  g_assert_true (fw_compare_view_is_busy (view));
  g_assert_true (fw_test_wait_settled (w, 240));
  found = fw_compare_view_get_finder_result (view);
  g_assert_nonnull (found);
  g_assert_true (strv_has (found->changed_keys, "mel_scale"));
  g_assert_cmpfloat (found->relative_rms, <, FW_EXPLAIN_EXACT_RELATIVE);

  /* the match can become a parameter set of the project */
  n_sets = g_list_model_get_n_items (fw_project_get_param_sets (project));
  added = fw_compare_view_adopt_finder_match (view, &error);
  g_assert_no_error (error);
  g_assert_nonnull (added);
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_param_sets (project)), ==, n_sets + 1);
  g_assert_true (fw_params_equal (fw_param_set_get_params (added), found->params));
  mel = fw_params_get_value (fw_param_set_get_params (added), "mel_scale");
  g_assert_cmpstr (mel, ==, "htk");
  fw_test_rm_rf (dir);
}

/* Errors appear in the view and name what is wrong. */
static void
test_errors_in_view (void)
{
  FwWindow *w = demo_window ();
  FwCompareView *view = _fw_window_get_compare_view (w);
  FwProject *project = fw_window_get_project (w);
  FwClip *clip = fw_project_find_clip (project, "calm-colony-01.flac");
  g_autoptr (FwComparison) missing_set = fw_comparison_new ("missing set", "db");
  g_autoptr (FwComparison) bad_file = fw_comparison_new ("bad file", "mfcc");
  g_autofree char *dir = fw_test_tmpdir ();
  g_autofree char *csv = g_build_filename (dir, "broken.csv", NULL);
  g_autoptr (GError) error = NULL;

  fw_comparison_set_operand (missing_set, 0, FW_OPERAND_CLIP, fw_clip_get_path (clip), "defaults", "");
  fw_comparison_set_operand (missing_set, 1, FW_OPERAND_CLIP, fw_clip_get_path (clip),
                             "no-such-set", "");
  _fw_window_start_comparison (w, missing_set);
  g_assert_true (fw_test_wait_settled (w, 60));
  g_assert_nonnull (fw_compare_view_get_message (view));
  g_assert_nonnull (strstr (fw_compare_view_get_message (view), "no-such-set"));
  g_assert_null (fw_compare_view_get_result (view));

  g_assert_true (g_file_set_contents (csv, "1.0,2.0,3.0\n4.0,oops,6.0\n", -1, &error));
  fw_comparison_set_operand (bad_file, 0, FW_OPERAND_CLIP, fw_clip_get_path (clip), "defaults", "");
  fw_comparison_set_operand (bad_file, 1, FW_OPERAND_FILE, csv, "", "");
  _fw_window_start_comparison (w, bad_file);
  g_assert_true (fw_test_wait_settled (w, 60));
  g_test_message ("%s", fw_compare_view_get_message (view));
  g_assert_nonnull (fw_compare_view_get_message (view));
  g_assert_nonnull (strstr (fw_compare_view_get_message (view), "broken.csv"));
  g_assert_null (fw_compare_view_get_result (view));

  /* removing the comparison shown takes the window back to the plots */
  fw_project_remove_comparison (project, bad_file);
  g_assert_false (_fw_window_compare_shown (w));
  fw_project_remove_comparison (project, missing_set);
  fw_test_rm_rf (dir);
}

/* Work can be stopped: the view settles, says so, and works again afterwards. */
static void
test_cancel (void)
{
  FwWindow *w = demo_window ();
  FwCompareView *view = _fw_window_get_compare_view (w);
  g_autoptr (GError) error = NULL;

  g_assert_true (fw_window_compare (w, "queen-piping-01.flac@short-window",
                                    "queen-piping-01.flac@defaults", "mel-db", &error));
  g_assert_no_error (error);
  g_assert_true (fw_compare_view_is_busy (view));
  gtk_widget_activate_action (GTK_WIDGET (w), "win.cancel-work", NULL);
  g_assert_true (fw_test_wait_settled (w, 120));
  g_assert_false (fw_compare_view_is_busy (view));
  g_test_message ("after cancel: %s", fw_compare_view_get_summary_text (view));
  /* stopped before the end, or (on a fast machine) already done: never stuck or in error */
  g_assert_null (fw_compare_view_get_message (view));
  if (fw_compare_view_get_result (view) == NULL)
    g_assert_nonnull (strstr (fw_compare_view_get_summary_text (view), "Stopped"));

  /* choosing it again computes it */
  gtk_widget_activate_action (GTK_WIDGET (w), "win.close-compare", NULL);
  g_assert_false (_fw_window_compare_shown (w));
  _fw_window_open_comparison (w, fw_compare_view_get_comparison (view));
  g_assert_true (fw_test_wait_settled (w, 240));
  g_assert_nonnull (fw_compare_view_get_result (view));
  g_assert_nonnull (fw_compare_view_get_ranking (view));
}

/* The compare dialog builds the comparison from its choices and refuses nonsense. */
static void
test_dialog (void)
{
  FwWindow *w = demo_window ();
  FwProject *project = fw_window_get_project (w);
  FwClip *calm = fw_project_find_clip (project, "calm-colony-01.flac");
  FwClip *agitated = fw_project_find_clip (project, "agitated-colony-02.flac");
  FwParamSet *set = fw_project_find_param_set (project, "defaults");
  FwCompareDialog *dialog;
  g_autoptr (FwComparison) cmp = NULL;
  g_autoptr (GError) error = NULL;

  dialog = fw_compare_dialog_new (GTK_WINDOW (w), project, calm, set, agitated, set,
                                  FW_STAGE_MFCC);
  cmp = fw_compare_dialog_build (dialog, &error);
  g_assert_no_error (error);
  g_assert_cmpstr (fw_comparison_get_stage (cmp), ==, "mfcc");
  g_assert_cmpstr (fw_comparison_get_clip (cmp, 0), ==, fw_clip_get_path (calm));
  g_assert_cmpstr (fw_comparison_get_clip (cmp, 1), ==, fw_clip_get_path (agitated));
  g_assert_cmpstr (fw_comparison_get_param_set (cmp, 1), ==, "defaults");
  g_assert_cmpstr (fw_comparison_get_name (cmp), ==, "calm-colony-01 vs agitated-colony-02 (defaults)");
  gtk_window_destroy (GTK_WINDOW (dialog));

  dialog = fw_compare_dialog_new (GTK_WINDOW (w), project, calm, set, calm, set, FW_STAGE_DB);
  g_assert_null (fw_compare_dialog_build (dialog, &error));
  g_assert_nonnull (error);
  g_assert_nonnull (strstr (error->message, "same clip"));
  g_clear_error (&error);
  fw_compare_dialog_set_file (dialog, "/nonexistent/dump.npy");
  g_assert_null (fw_compare_dialog_build (dialog, &error));
  g_assert_nonnull (strstr (error->message, "/nonexistent/dump.npy"));
  g_clear_error (&error);
  gtk_window_destroy (GTK_WINDOW (dialog));

  /* from the sidebar: the dialog opens for the selected clip and set, and what it builds
   * becomes a saved comparison shown in the view */
  {
    GListModel *tops = gtk_window_get_toplevels ();
    FwCompareDialog *found = NULL;
    g_autoptr (FwComparison) built = NULL;
    guint n_cmp = g_list_model_get_n_items (fw_project_get_comparisons (project));

    gtk_widget_activate_action (GTK_WIDGET (w), "win.close-compare", NULL);
    gtk_widget_activate_action (GTK_WIDGET (w), "win.compare-new", NULL);
    fw_test_spin (0.2);
    for (guint i = 0; i < g_list_model_get_n_items (tops); i++)
      {
        g_autoptr (GtkWindow) top = g_list_model_get_item (tops, i);
        if (FW_IS_COMPARE_DIALOG (top))
          found = FW_COMPARE_DIALOG (top);
      }
    g_assert_nonnull (found);
    built = fw_compare_dialog_build (found, &error);
    g_assert_no_error (error);
    g_assert_cmpstr (fw_comparison_get_clip (built, 0), ==,
                     fw_clip_get_path (_fw_window_get_clip (w)));
    g_assert_cmpstr (fw_comparison_get_param_set (built, 0), ==,
                     fw_param_set_get_name (_fw_window_get_param_set (w)));
    g_signal_emit_by_name (found, "compare", built);
    gtk_window_destroy (GTK_WINDOW (found));
    g_assert_true (_fw_window_compare_shown (w));
    g_assert_true (fw_compare_view_get_comparison (_fw_window_get_compare_view (w)) == built);
    g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_comparisons (project)), ==,
                      n_cmp + 1);
    g_assert_true (fw_test_wait_settled (w, 240));
    g_assert_nonnull (fw_compare_view_get_result (_fw_window_get_compare_view (w)));
  }
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
  g_test_add_func ("/fw/gtk/compare/two-sets", test_two_sets);
  g_test_add_func ("/fw/gtk/compare/adopt-knob", test_adopt_knob);
  g_test_add_func ("/fw/gtk/compare/two-clips-and-swap", test_two_clips_and_swap);
  g_test_add_func ("/fw/gtk/compare/save-reopen", test_save_reopen);
  g_test_add_func ("/fw/gtk/compare/feature-file-finder", test_feature_file_finder);
  g_test_add_func ("/fw/gtk/compare/errors-in-view", test_errors_in_view);
  g_test_add_func ("/fw/gtk/compare/cancel", test_cancel);
  g_test_add_func ("/fw/gtk/compare/dialog", test_dialog);
  status = g_test_run ();
  if (win != NULL)
    fw_window_close_discarding (win);
  return status;
}
