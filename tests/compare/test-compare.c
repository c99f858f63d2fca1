/* test-compare.c: comparisons with sentences (fw_compare_run), alignment of different hops
 * through the real pipeline, and the knob ranking. Differences are planted perturbations of
 * a known size on matrices from the core pipeline (fw_feature_compute); each check says
 * which. The clip is synthetic: hum + harmonics + fixed-seed noise + a piping tone that
 * starts at a known time. */
#include "fw-config.h"

#include <sndfile.h>

#include "fw-compare.h"
#include "fw-feature.h"
#include "fw-project.h"
#include "fw-test-compare.h"
#include "fw-test-fixtures.h"

#define RATE 22050.0

static FwAudio *
make_audio (double seconds, double onset)
{
  gsize n = (gsize) (seconds * RATE);
  g_autofree float *x = fw_cmp_signal (n, RATE, onset, 42);
  return fw_audio_new_from_samples ("calm-colony.wav", x, n, RATE);
}

static FwParams *
params_with (const char *const *settings)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (base, settings, &error);
  g_assert_no_error (error);
  return p;
}

static FwMatrix *
compute (FwAudio *audio, FwParams *p, FwStage stage)
{
  g_autoptr (GError) error = NULL;
  FwMatrix *m = fw_feature_compute (audio, p, stage, 1, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  return m;
}

static FwCompareResult *
compare_matrices (FwMatrix *a, FwMatrix *b, FwParams *p, FwStage stage)
{
  g_autoptr (FwCompareOperand) oa = fw_compare_operand_new_matrix ("A", a, p, stage);
  g_autoptr (FwCompareOperand) ob = fw_compare_operand_new_matrix ("B", b, p, stage);
  g_autoptr (GError) error = NULL;
  FwCompareResult *r = fw_compare_run (oa, ob, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_nonnull (r);
  return r;
}

static void
test_identical (void)
{
  g_autoptr (FwAudio) audio = make_audio (2.0, 1.0);
  g_autoptr (FwParams) p = fw_params_new_default ();
  g_autoptr (FwCompareOperand) a = fw_compare_operand_new_audio (audio, p, FW_STAGE_MEL_DB);
  g_autoptr (FwCompareOperand) b = fw_compare_operand_new_audio (audio, p, FW_STAGE_MEL_DB);
  g_autoptr (FwCompareResult) r = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *json = NULL;

  /* identical operands (same clip, same set): exactly zero, within a zero tolerance */
  r = fw_compare_run (a, b, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpfloat (r->diff->max_abs_diff, ==, 0.0);
  g_assert_cmpfloat (r->diff->rms_diff, ==, 0.0);
  g_assert_true (r->same_shape);
  g_assert_true (fw_compare_result_within (r, 0.0));
  fw_cmp_assert_contains (r->summary, "B = A exactly");
  g_assert_cmpuint (r->notes->len, ==, 0);
  json = fw_compare_result_to_json (r, 0.0);
  fw_cmp_assert_contains (json, "\"max_abs_diff\": 0,");
  fw_cmp_assert_contains (json, "\"within_tolerance\": true");
}

static void
test_planted_offset (void)
{
  g_autoptr (FwAudio) audio = make_audio (2.0, 1.0);
  g_autoptr (FwParams) p = fw_params_new_default ();
  FwMatrix *a = compute (audio, p, FW_STAGE_MEL_DB);
  FwMatrix *b = fw_matrix_copy (a);
  FwCompareResult *r;

  /* planted: + 10 log10(2) = 3.0103 dB on every value of the mel-db matrix */
  for (gsize i = 0; i < b->n_frames * b->n_bins; i++)
    b->data[i] += (float) (10.0 * log10 (2.0));
  r = compare_matrices (a, b, p, FW_STAGE_MEL_DB);
  g_assert_cmpstr (r->expl_unit, ==, "dB");
  fw_cmp_assert_contains (r->summary, "B = A + 3.01 dB everywhere; lag 0 frames; residual max");
  g_assert_cmpfloat_with_epsilon (r->diff->expl.offset, 10.0 * log10 (2.0), 2e-5);
  g_assert_false (fw_compare_result_within (r, 1.0));
  g_assert_true (fw_compare_result_within (r, 3.02));
  fw_compare_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);

  /* the same offset on the linear mel stage: B = 2 x mel power, explained in dB */
  a = compute (audio, p, FW_STAGE_MEL);
  b = fw_matrix_copy (a);
  for (gsize i = 0; i < b->n_frames * b->n_bins; i++)
    b->data[i] *= 2.0f;
  r = compare_matrices (a, b, p, FW_STAGE_MEL);
  fw_cmp_assert_contains (r->summary, "B = A + 3.01 dB everywhere; lag 0 frames");
  g_assert_nonnull (r->diff->ratio_db);
  g_assert_cmpfloat_with_epsilon (r->diff->ratio_db->data[100], 10.0 * log10 (2.0), 1e-5);
  fw_compare_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_planted_band_gain (void)
{
  g_autoptr (FwAudio) audio = make_audio (2.0, 1.0);
  g_autoptr (FwParams) p = fw_params_new_default ();
  FwMatrix *a = compute (audio, p, FW_STAGE_MEL_DB);
  FwMatrix *b = fw_matrix_copy (a);
  FwCompareResult *r;
  gsize nb = a->n_bins;

  /* planted: band k gains 6 dB * k / (bands - 1) (a tilt from 0 to +6 dB) */
  for (gsize t = 0; t < b->n_frames; t++)
    for (gsize k = 0; k < nb; k++)
      b->data[t * nb + k] += (float) (6.0 * (double) k / (double) (nb - 1));
  r = compare_matrices (a, b, p, FW_STAGE_MEL_DB);
  fw_cmp_assert_contains (r->summary, "B = A + a per-band offset from 0");
  fw_cmp_assert_contains (r->summary, "to 6.00 dB");
  fw_cmp_assert_contains (r->summary, "lag 0 frames");
  for (gsize k = 0; k < nb; k += 17)
    g_assert_cmpfloat_with_epsilon (r->diff->expl.offset + r->diff->expl.bin_offset[k],
                                    6.0 * (double) k / (double) (nb - 1), 2e-5);
  fw_compare_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_planted_lag (void)
{
  g_autoptr (FwAudio) audio = make_audio (2.0, 0.7);
  g_autoptr (FwParams) p = fw_params_new_default ();
  FwMatrix *a = compute (audio, p, FW_STAGE_MFCC);
  FwMatrix *b = fw_matrix_copy (a);
  FwCompareResult *r;
  gsize nb = a->n_bins;

  /* planted: B[t] = A[t - 1] (B one frame late; frame 0 repeated) */
  for (gsize t = b->n_frames; t-- > 1;)
    memcpy (b->data + t * nb, a->data + (t - 1) * nb, nb * sizeof (float));
  r = compare_matrices (a, b, p, FW_STAGE_MFCC);
  fw_cmp_assert_contains (r->summary, "lag 1 frame (B later than A)");
  g_assert_cmpint (r->diff->expl.lag_frames, ==, 1);
  g_assert_cmpfloat (r->diff->expl.residual_max_abs, ==, 0.0);
  fw_compare_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_planted_noise (void)
{
  g_autoptr (FwAudio) audio = make_audio (2.0, 1.0);
  g_autoptr (FwParams) p = fw_params_new_default ();
  FwMatrix *a = compute (audio, p, FW_STAGE_MEL);
  FwMatrix *b = fw_matrix_copy (a);
  FwCompareResult *r;
  uint64_t s = 7;

  /* planted: relative noise of 1e-6 on the mel power values; 10 log10(1 + 1e-6) = 4.3e-6 dB */
  for (gsize i = 0; i < b->n_frames * b->n_bins; i++)
    b->data[i] = (float) ((double) a->data[i] * (1.0 + 1e-6 * fw_cmp_noise (&s)));
  r = compare_matrices (a, b, p, FW_STAGE_MEL);
  g_assert_false (r->diff->expl.has_offset);
  g_assert_false (r->diff->expl.has_bin_offset);
  g_assert_cmpint (r->diff->expl.lag_frames, ==, 0);
  /* dB: the planted 4.34e-6, float32 rounding of both values (2 x 10 log10(1 + 2^-24)
   * = 5.2e-7) and the removed per-band means (a fraction of the planted size) */
  g_assert_cmpfloat (r->diff->expl.residual_max_abs, <, 6e-6);
  g_assert_cmpfloat (r->diff->expl.residual_max_abs, >, 1e-6);
  fw_cmp_assert_contains (r->summary, "lag 0 frames; residual max ");
  g_assert_null (strstr (r->summary, "everywhere"));
  g_assert_null (strstr (r->summary, "per-band"));
  fw_compare_result_free (r);
  fw_matrix_unref (a);
  fw_matrix_unref (b);
}

static void
test_shape_mismatch (void)
{
  /* fft 512, hop 128, centred: frames = 1 + n / 128, so 999*128 samples give 1000 frames and
   * 997*128 give 998 (a clip cut short by two hops, as another program might deliver it) */
  const char *const set[] = { "window_length=512", "hop_length=128", "mel_bands=40", NULL };
  g_autoptr (FwParams) p = params_with (set);
  g_autofree float *x = fw_cmp_signal (999 * 128, RATE, 2.0, 3);
  g_autoptr (FwAudio) full = fw_audio_new_from_samples ("full.wav", x, 999 * 128, RATE);
  g_autoptr (FwAudio) cut = fw_audio_new_from_samples ("cut.wav", x, 997 * 128, RATE);
  g_autoptr (FwCompareOperand) a = fw_compare_operand_new_audio (full, p, FW_STAGE_MEL_DB);
  g_autoptr (FwCompareOperand) b = fw_compare_operand_new_audio (cut, p, FW_STAGE_MEL_DB);
  g_autoptr (FwCompareResult) r = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *text = NULL;

  r = fw_compare_run (a, b, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (r->diff->align.a_frames, ==, 1000);
  g_assert_cmpuint (r->diff->align.b_frames, ==, 998);
  g_assert_cmpuint (r->diff->n_frames, ==, 998);
  g_assert_false (r->same_shape);
  g_assert_false (fw_compare_result_within (r, 1e9));
  text = fw_compare_result_to_text (r);
  fw_cmp_assert_contains (text, "A is 1000 x 40, B is 998 x 40");
  fw_cmp_assert_contains (text, "left out 2 frames of A");
}

/* First frame whose energy between 1400 and 1800 Hz exceeds half its largest value. */
static gsize
onset_frame (const FwMatrix *m)
{
  double best = 0;
  g_autofree double *e = g_new0 (double, m->n_frames);

  for (gsize t = 0; t < m->n_frames; t++)
    {
      for (gsize k = 0; k < m->n_bins; k++)
        if (m->bin_value[k] >= 1400 && m->bin_value[k] <= 1800)
          e[t] += m->data[t * m->n_bins + k];
      best = MAX (best, e[t]);
    }
  for (gsize t = 0; t < m->n_frames; t++)
    if (e[t] > 0.5 * best)
      return t;
  g_assert_not_reached ();
}

static void
test_different_hops_align (gconstpointer data)
{
  /* planted: the piping tone starts at 1.000 s; A uses hop 512, B a finer hop (same window):
   * 128 (B's frame centres include all of A's) or 300 (B is interpolated onto A's centres) */
  int hop_b = GPOINTER_TO_INT (data);
  const char *const sa[] = { "hop_length=512", NULL };
  g_autofree char *hb = g_strdup_printf ("hop_length=%d", hop_b);
  const char *const sb[] = { hb, NULL };
  g_autoptr (FwAudio) audio = make_audio (2.5, 1.0);
  g_autoptr (FwParams) pa = params_with (sa);
  g_autoptr (FwParams) pb = params_with (sb);
  g_autoptr (FwCompareOperand) a = fw_compare_operand_new_audio (audio, pa, FW_STAGE_SPECTRUM);
  g_autoptr (FwCompareOperand) b = fw_compare_operand_new_audio (audio, pb, FW_STAGE_SPECTRUM);
  g_autoptr (FwCompareResult) r = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwTestMatrix) ma = NULL;
  g_autoptr (FwTestMatrix) mb = NULL;
  g_autofree char *text = NULL;
  double hop_a = 512.0 / RATE, ta, tb, t_aligned_a, t_aligned_b;

  r = fw_compare_run (a, b, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpint (r->diff->align.time_reference, ==, 0);  /* the coarser hop */
  g_assert_false (r->same_shape);
  text = fw_compare_result_to_text (r);
  if (hop_b == 128)
    {
      g_assert_false (r->diff->align.time_resampled);
      fw_cmp_assert_contains (text, "B's frames (hop 5.805 ms) were taken at A's frame centres "
                                    "(hop 23.22 ms)");
    }
  else
    {
      g_assert_true (r->diff->align.time_resampled);
      fw_cmp_assert_contains (text, "B's frames (hop 13.61 ms) were linearly interpolated onto "
                                    "A's frame centres (hop 23.22 ms)");
    }

  /* on their own grids the onsets agree within a hop of A */
  ma = fw_compare_operand_get_matrix (a, NULL, NULL);
  mb = fw_compare_operand_get_matrix (b, NULL, NULL);
  ta = ma->frame_times[onset_frame (ma)];
  tb = mb->frame_times[onset_frame (mb)];
  g_assert_cmpfloat (fabs (ta - tb), <=, hop_a);
  /* and near the planted 1.000 s (the window is 2048 samples = 93 ms long) */
  g_assert_cmpfloat (fabs (ta - 1.0), <, 0.06);
  /* on the common grid both onsets land on the same time, within a hop */
  t_aligned_a = r->diff->a->frame_times[onset_frame (r->diff->a)];
  t_aligned_b = r->diff->b->frame_times[onset_frame (r->diff->b)];
  g_assert_cmpfloat (fabs (t_aligned_a - t_aligned_b), <=, hop_a + 1e-9);
  g_assert_cmpfloat (fabs (t_aligned_a - ta), <=, 1e-9);
}

static FwKnobRanking *
rank (FwAudio *audio, FwParams *pa, FwParams *pb, FwStage stage)
{
  g_autoptr (FwCompareOperand) a = fw_compare_operand_new_audio (audio, pa, stage);
  g_autoptr (FwCompareOperand) b = fw_compare_operand_new_audio (audio, pb, stage);
  g_autoptr (GError) error = NULL;
  FwKnobRanking *r = fw_compare_rank_knobs (a, b, NULL, &error);
  g_assert_no_error (error);
  g_assert_nonnull (r);
  return r;
}

static const FwKnob *
knob (const FwKnobRanking *r, guint i)
{
  g_assert_cmpuint (i, <, r->knobs->len);
  return r->knobs->pdata[i];
}

static void
test_knobs_single (void)
{
  /* planted: B's set differs from A's in one key that matters for mel-db plus three keys that
   * do not (lifter, cepstral_count, delta_width act after mel-db) */
  static const char *const planted[] = { "mel_scale=htk", "mel_weights=unit",
                                         "db_reference=max", "window=hamming", "fmin=300" };
  g_autoptr (FwAudio) audio = make_audio (1.5, 0.5);
  g_autoptr (FwParams) pa = fw_params_new_default ();

  for (gsize i = 0; i < G_N_ELEMENTS (planted); i++)
    {
      const char *const set[] = { planted[i], "lifter=22", "cepstral_count=20", "delta_width=3",
                                  NULL };
      g_autoptr (FwParams) pb = params_with (set);
      g_autoptr (FwKnobRanking) r = rank (audio, pa, pb, FW_STAGE_MEL_DB);
      g_autofree char *key = g_strndup (planted[i], strchr (planted[i], '=') - planted[i]);
      g_autofree char *text = fw_knob_ranking_to_text (r);

      g_assert_cmpuint (r->knobs->len, ==, 4);
      g_assert_cmpstr (knob (r, 0)->key, ==, key);
      g_assert_cmpfloat (r->rms_before, >, 0.0);
      /* the planted key alone turns A into B: everything removed */
      g_assert_cmpfloat (knob (r, 0)->removed, ==, 1.0);
      for (guint j = 1; j < 4; j++)
        g_assert_cmpfloat (knob (r, j)->removed, ==, 0.0);
      fw_cmp_assert_contains (text, "removes 100% of the difference");
    }
}

static void
test_knobs_two (void)
{
  /* planted: two keys that matter for mel-db (both change the band shapes by a few dB) and
   * one that does not */
  const char *const set[] = { "mel_scale=htk", "window=blackman", "lifter=22", NULL };
  g_autoptr (FwAudio) audio = make_audio (1.5, 0.5);
  g_autoptr (FwParams) pa = fw_params_new_default ();
  g_autoptr (FwParams) pb = params_with (set);
  g_autoptr (FwKnobRanking) r = rank (audio, pa, pb, FW_STAGE_MEL_DB);
  g_autofree char *text = fw_knob_ranking_to_text (r);

  g_test_message ("%s", text);
  g_assert_cmpuint (r->knobs->len, ==, 3);
  g_assert_true ((strcmp (knob (r, 0)->key, "mel_scale") == 0
                  && strcmp (knob (r, 1)->key, "window") == 0)
                 || (strcmp (knob (r, 0)->key, "window") == 0
                     && strcmp (knob (r, 1)->key, "mel_scale") == 0));
  g_assert_cmpfloat (knob (r, 0)->removed, >, 0.05);
  g_assert_cmpfloat (knob (r, 1)->removed, >, 0.05);
  g_assert_cmpfloat (knob (r, 0)->removed, <, 1.0);
  g_assert_cmpfloat (knob (r, 1)->removed, <, 1.0);
  g_assert_cmpstr (knob (r, 2)->key, ==, "lifter");
  g_assert_cmpfloat (knob (r, 2)->removed, ==, 0.0);
  /* the other way round: B's set with one planted key put back to A's value leaves part of
   * the difference; with lifter put back (no effect on mel-db) nothing is left */
  g_assert_cmpfloat (knob (r, 0)->left_without, >, 0.05);
  g_assert_cmpfloat (knob (r, 1)->left_without, >, 0.05);
  g_assert_cmpfloat (knob (r, 2)->left_without, ==, 0.0);
}

static void
test_knobs_cannot_apply (void)
{
  /* planted: B has window_length = fft_length = 1024, A 2048. B's fft_length alone on A would
   * be shorter than A's window (invalid): reported with the reason, ranked last, not fatal.
   * B's window_length alone carries fft_length along (they were equal), so it explains all. */
  const char *const set[] = { "window_length=1024", "fft_length=1024", NULL };
  g_autoptr (FwAudio) audio = make_audio (1.5, 0.5);
  g_autoptr (FwParams) pa = fw_params_new_default ();
  g_autoptr (FwParams) pb = params_with (set);
  g_autoptr (FwKnobRanking) r = rank (audio, pa, pb, FW_STAGE_MEL_DB);
  g_autofree char *text = fw_knob_ranking_to_text (r);

  g_assert_cmpuint (r->knobs->len, ==, 2);
  g_assert_cmpstr (knob (r, 0)->key, ==, "window_length");
  g_assert_cmpfloat (knob (r, 0)->removed, ==, 1.0);
  g_assert_cmpstr (knob (r, 1)->key, ==, "fft_length");
  g_assert_true (isnan (knob (r, 1)->removed));
  g_assert_nonnull (knob (r, 1)->problem);
  fw_cmp_assert_contains (text, "fft_length (2048 -> 1024) cannot be applied alone: ");
}

static void
test_saved_comparison (void)
{
  /* a comparison saved in a project: A = (clip, "long-window" set), B = a dump file on the
   * same grid, declared bins x frames in its options string */
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *wav = g_build_filename (dir, "hive-3.wav", NULL);
  g_autofree char *npy = g_build_filename (dir, "dump.npy", NULL);
  g_autofree float *x = fw_cmp_signal ((gsize) RATE, RATE, 0.5, 5);
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwClip) clip = NULL;
  g_autoptr (FwParamSet) set = NULL;
  g_autoptr (FwComparison) cmp = fw_comparison_new ("mine vs theirs", "mfcc");
  g_autoptr (FwCompareOperand) a = NULL;
  g_autoptr (FwCompareOperand) b = NULL;
  g_autoptr (FwCompareResult) r = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwTestMatrix) m = NULL;
  g_autoptr (FwTestMatrix) t = NULL;
  FwFeatureFileOptions fo;
  g_autofree char *options = NULL;
  const char *const long_window[] = { "window_length=4096", NULL };
  g_autoptr (FwParams) lw = NULL;

  fw_test_write_float (wav, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, (int) RATE, x, (gsize) RATE);
  clip = fw_clip_new (wav);
  fw_project_add_clip (project, clip);
  lw = params_with (long_window);
  set = fw_param_set_new ("long-window", lw);
  g_assert_true (fw_project_add_param_set (project, set, &error));
  g_assert_no_error (error);

  /* the dump: Framewise's own MFCC for that set, written transposed (bins x frames) */
  a = fw_compare_operand_new_clip (wav, fw_param_set_get_params (set), FW_STAGE_MFCC);
  m = fw_compare_operand_get_matrix (a, NULL, &error);
  g_assert_no_error (error);
  t = fw_matrix_new (m->n_bins, m->n_frames);
  for (gsize i = 0; i < m->n_frames; i++)
    for (gsize k = 0; k < m->n_bins; k++)
      t->data[k * m->n_frames + i] = m->data[i * m->n_bins + k];
  g_assert_true (fw_feature_write (t, npy, &error));
  g_clear_pointer (&a, fw_compare_operand_unref);

  fw_feature_file_options_init (&fo);
  fo.axes = FW_FEATURE_AXES_BINS_FRAMES;
  options = fw_feature_file_options_to_string (&fo);
  fw_comparison_set_operand (cmp, 0, FW_OPERAND_CLIP, wav, "long-window", NULL);
  fw_comparison_set_operand (cmp, 1, FW_OPERAND_FILE, npy, NULL, options);
  a = fw_compare_operand_new_from_comparison (project, cmp, 0, &error);
  g_assert_no_error (error);
  b = fw_compare_operand_new_from_comparison (project, cmp, 1, &error);
  g_assert_no_error (error);
  g_assert_true (fw_compare_operand_is_file (b));
  r = fw_compare_run (a, b, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_true (r->diff->expl.identical);

  /* a set name the project does not have is named in the error */
  fw_comparison_set_operand (cmp, 0, FW_OPERAND_CLIP, wav, "short-window", NULL);
  g_clear_pointer (&a, fw_compare_operand_unref);
  a = fw_compare_operand_new_from_comparison (project, cmp, 0, &error);
  g_assert_null (a);
  g_assert_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_OPERAND);
  fw_cmp_assert_contains (error->message, "\"short-window\"");
  fw_test_remove_dir (dir);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/compare/compare/identical-operands", test_identical);
  g_test_add_func ("/fw/compare/compare/planted-offset-3.01db", test_planted_offset);
  g_test_add_func ("/fw/compare/compare/planted-band-gain", test_planted_band_gain);
  g_test_add_func ("/fw/compare/compare/planted-lag-1-frame", test_planted_lag);
  g_test_add_func ("/fw/compare/compare/planted-noise-1e-6", test_planted_noise);
  g_test_add_func ("/fw/compare/compare/shape-1000-vs-998", test_shape_mismatch);
  g_test_add_data_func ("/fw/compare/compare/different-hops-align-onset/512-128",
                        GINT_TO_POINTER (128), test_different_hops_align);
  g_test_add_data_func ("/fw/compare/compare/different-hops-align-onset/512-300",
                        GINT_TO_POINTER (300), test_different_hops_align);
  g_test_add_func ("/fw/compare/knobs/single-planted-key", test_knobs_single);
  g_test_add_func ("/fw/compare/knobs/two-planted-keys", test_knobs_two);
  g_test_add_func ("/fw/compare/knobs/key-cannot-apply-alone", test_knobs_cannot_apply);
  g_test_add_func ("/fw/compare/compare/saved-in-project", test_saved_comparison);
  return g_test_run ();
}
