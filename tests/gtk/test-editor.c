/* test-editor.c: the parameter editor recomputes what depends on an edit, shows derived facts,
 * and keeps the last good result when a value is bad. Needs a display. */
#include <math.h>
#include <string.h>

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

static void
type_into (FwParamsEditor *editor, const char *key, const char *text)
{
  GtkWidget *entry = fw_params_editor_get_field (editor, key);

  g_assert_nonnull (entry);
  g_assert_true (GTK_IS_ENTRY (entry));
  gtk_editable_set_text (GTK_EDITABLE (entry), text);
  /* Enter applies */
  g_signal_emit_by_name (entry, "activate");
}

static int
param_int (FwParams *params, const char *key)
{
  g_autofree char *v = fw_params_get_value (params, key);
  return atoi (v);
}

/* Halving hop_length in the editor recomputes the MFCC row, whose frame count follows
 * 1 + floor((L_padded - fft_length) / hop) (issue 2, stage 2). */
static void
test_hop_recomputes_mfcc (void)
{
  FwWindow *w = demo_window ();
  FwParamsEditor *editor = _fw_window_get_params_editor (w);
  FwPlotStack *stack = _fw_window_get_plot_stack (w);
  FwPlotRow *mfcc = fw_plot_stack_get_row (stack, 0, FW_PLOT_MFCC);
  FwPlotRow *wave = fw_plot_stack_get_row (stack, 0, FW_PLOT_WAVEFORM);
  FwParamSet *set = _fw_window_get_param_set (w);
  FwParams *before = fw_params_ref (fw_param_set_get_params (set));
  FwAudio *audio = fw_plot_row_get_audio (wave);
  int hop = param_int (before, "hop_length");
  int fft = param_int (before, "fft_length");
  g_autofree char *centered = fw_params_get_value (before, "centered");
  g_autofree char *text = NULL;
  gsize n_before, expected;

  g_assert_nonnull (mfcc);
  g_assert_nonnull (audio);
  g_assert_nonnull (fw_plot_row_get_matrix (mfcc));
  n_before = fw_plot_row_get_matrix (mfcc)->n_frames;
  g_assert_cmpuint (n_before, ==, fw_frame_count (audio->n_samples, fft, hop,
                                                  strcmp (centered, "true") == 0));

  text = g_strdup_printf ("%d", hop / 2);
  type_into (editor, "hop_length", text);
  g_assert_null (fw_params_editor_get_field_message (editor, "hop_length"));
  g_assert_false (fw_params_equal (before, fw_param_set_get_params (set)));
  g_assert_true (fw_test_wait_settled (w, 120));

  expected = fw_frame_count (audio->n_samples, fft, hop / 2, strcmp (centered, "true") == 0);
  g_test_message ("MFCC frames: %zu with hop %d, %zu with hop %d", n_before, hop,
                  fw_plot_row_get_matrix (mfcc)->n_frames, hop / 2);
  g_assert_cmpuint (fw_plot_row_get_matrix (mfcc)->n_frames, ==, expected);
  g_assert_cmpuint (expected, >, n_before);
  g_assert_cmpstr (fw_params_get_hash (fw_plot_row_get_params (mfcc)), ==,
                   fw_params_get_hash (fw_param_set_get_params (set)));

  /* the facts follow: frames per second = rate / hop */
  {
    const char *fps = fw_params_editor_get_fact (editor, "fps");
    g_autofree char *want = g_strdup_printf ("%.2f", audio->sample_rate / (hop / 2));
    g_test_message ("fps fact: %s", fps);
    g_assert_nonnull (strstr (fps, want));
  }

  /* back to the original value: the cache answers and the count returns */
  text = (g_free (text), g_strdup_printf ("%d", hop));
  type_into (editor, "hop_length", text);
  g_assert_true (fw_test_wait_settled (w, 120));
  g_assert_cmpuint (fw_plot_row_get_matrix (mfcc)->n_frames, ==, n_before);
  fw_params_unref (before);
}

/* A bad value shows its message at the field; the set and the plots keep the last good
 * result. */
static void
test_bad_value_keeps_last_good (void)
{
  FwWindow *w = demo_window ();
  FwParamsEditor *editor = _fw_window_get_params_editor (w);
  FwPlotStack *stack = _fw_window_get_plot_stack (w);
  FwPlotRow *mfcc = fw_plot_stack_get_row (stack, 0, FW_PLOT_MFCC);
  FwParamSet *set = _fw_window_get_param_set (w);
  g_autofree char *hash = g_strdup (fw_params_get_hash (fw_param_set_get_params (set)));
  FwMatrix *shown = fw_plot_row_get_matrix (mfcc);
  g_autofree char *hop = fw_params_get_value (fw_param_set_get_params (set), "hop_length");
  const char *message;

  type_into (editor, "hop_length", "0");
  message = fw_params_editor_get_field_message (editor, "hop_length");
  g_test_message ("hop_length=0: %s", message);
  g_assert_nonnull (message);
  g_assert_nonnull (strstr (message, "hop_length"));
  fw_test_spin (0.3);
  g_assert_cmpstr (fw_params_get_hash (fw_param_set_get_params (set)), ==, hash);
  g_assert_true (fw_plot_row_get_matrix (mfcc) == shown);
  g_assert_false (fw_plot_row_is_busy (mfcc));

  type_into (editor, "hop_length", "twelve");
  message = fw_params_editor_get_field_message (editor, "hop_length");
  g_assert_nonnull (message);
  g_assert_cmpstr (fw_params_get_hash (fw_param_set_get_params (set)), ==, hash);

  /* an fmax above Nyquist passes the key check but not the clip check: also not applied */
  type_into (editor, "hop_length", hop);
  g_assert_null (fw_params_editor_get_field_message (editor, "hop_length"));
  type_into (editor, "fmax", "1000000");
  message = fw_params_editor_get_field_message (editor, "fmax");
  g_test_message ("fmax=1e6: %s", message);
  g_assert_nonnull (message);
  g_assert_cmpstr (fw_params_get_hash (fw_param_set_get_params (set)), ==, hash);
  g_assert_true (fw_plot_row_get_matrix (mfcc) == shown);

  /* the original value clears the message */
  {
    g_autofree char *fmax = fw_params_get_value (fw_param_set_get_params (set), "fmax");
    type_into (editor, "fmax", fmax);
    g_assert_null (fw_params_editor_get_field_message (editor, "fmax"));
  }
}

/* Window length typed in milliseconds shows the exact sample count, and the facts give the
 * window's duration and its equivalent noise bandwidth. */
static void
test_ms_entry_and_facts (void)
{
  FwWindow *w = demo_window ();
  FwParamsEditor *editor = _fw_window_get_params_editor (w);
  FwPlotRow *wave = fw_plot_stack_get_row (_fw_window_get_plot_stack (w), 0, FW_PLOT_WAVEFORM);
  double rate = fw_plot_row_get_audio (wave)->sample_rate;
  GtkWidget *entry = fw_params_editor_get_field (editor, "window_length");
  GtkWidget *units = gtk_widget_get_next_sibling (entry);
  const char *facts;
  g_autofree char *want = NULL;

  g_assert_true (GTK_IS_DROP_DOWN (units));
  gtk_drop_down_set_selected (GTK_DROP_DOWN (units), 1);   /* ms */
  gtk_editable_set_text (GTK_EDITABLE (entry), "20");
  facts = fw_params_editor_get_fact (editor, "window");
  /* round(20 ms x rate) samples */
  want = g_strdup_printf ("%.0f", round (0.020 * rate));
  g_test_message ("window fact at 20 ms: %s (rate %.0f)", facts, rate);
  g_assert_true (g_str_has_prefix (facts, want));
  g_assert_nonnull (fw_params_editor_get_fact (editor, "enbw"));
  g_assert_nonnull (strstr (fw_params_editor_get_fact (editor, "enbw"), "Hz"));
  /* undo without applying: back to samples, then reload from the set */
  gtk_drop_down_set_selected (GTK_DROP_DOWN (units), 0);
  fw_params_editor_set_clip (editor, NULL);
  fw_params_editor_set_clip (editor, _fw_window_get_clip (w));
}

int
main (int argc, char **argv)
{
  int status;

  g_test_init (&argc, &argv, NULL);
  if (!fw_test_gtk_init ())
    {
      g_print ("1..0 # SKIP no display (run the GTK tests under xvfb-run -a)\n");
      return 0;
    }
  g_test_add_func ("/fw/gtk/editor/hop-recomputes-mfcc", test_hop_recomputes_mfcc);
  g_test_add_func ("/fw/gtk/editor/bad-value-keeps-last-good", test_bad_value_keeps_last_good);
  g_test_add_func ("/fw/gtk/editor/ms-entry-and-facts", test_ms_entry_and_facts);
  status = g_test_run ();
  if (win != NULL)
    fw_window_close_discarding (win);
  return status;
}
