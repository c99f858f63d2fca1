/* test-explain.c: the convention finder (fw_compare_explain) recovers the conventions a dump
 * was made with, starting from the default parameter set.
 *
 * Dumps come from two sources:
 *  - the core pipeline itself (fw_feature_compute + fw_feature_write), and
 *  - for independence, tests/compare/make_dump.py: numpy code written from the textbook
 *    definitions, run at test time with Debian's /usr/bin/python3 on the same WAV file
 *    (skipped with a message when numpy is missing).
 * The clip is synthetic (hum, noise with a fixed seed, a piping tone), 1.5 s at 22050 Hz,
 * written as a float WAV into the test's own temporary folder. A match counts as a recovery
 * when the reported set equals the set the dump was made with (or that set is listed as
 * fitting equally well, for conventions that give identical numbers) and its relative RMS
 * difference is below FW_EXPLAIN_EXACT_RELATIVE (float32 rounding of the dump). */
#include "fw-config.h"

#include <sndfile.h>

#include "fw-compare.h"
#include "fw-feature.h"
#include "fw-test-compare.h"
#include "fw-test-fixtures.h"

#define RATE 22050

static char *tmp_dir;
static char *clip_path;

static FwParams *
params_with (const char *const *settings)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (base, settings, &error);
  g_assert_no_error (error);
  return p;
}

/* Runs the finder on dump_path (as a file operand) against the clip and checks it found
 * `want` (the set the dump was made with). */
static FwExplainResult *
explain_and_check (const char *dump_path, const FwFeatureFileOptions *fo, FwStage stage,
                   FwParams *want, const char *const *candidates)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (FwCompareOperand) dump = fw_compare_operand_new_file (dump_path, fo, stage);
  g_autoptr (FwCompareOperand) clip = fw_compare_operand_new_clip (clip_path, base, stage);
  g_autoptr (GError) error = NULL;
  g_auto (GStrv) wrong = NULL;
  g_auto (GStrv) expected_changes = NULL;
  g_autofree char *text = NULL;
  FwExplainOptions opt;
  FwExplainResult *r;
  gboolean found;

  fw_explain_options_init (&opt);
  opt.candidates = candidates;
  r = fw_compare_explain (dump, clip, &opt, NULL, &error);
  g_assert_no_error (error);
  g_assert_nonnull (r);
  text = fw_explain_result_to_text (r);
  g_test_message ("%s", text);

  g_assert_cmpfloat (r->relative_rms, <, FW_EXPLAIN_EXACT_RELATIVE);
  wrong = fw_params_diff_keys (r->params, want);
  found = wrong[0] == NULL;
  for (guint i = 0; !found && i < r->equivalent->len; i++)
    found = fw_params_equal (((FwExplainCandidate *) r->equivalent->pdata[i])->params, want);
  if (!found)
    g_error ("the finder did not recover the dump's set; differing keys start with %s\n%s",
             wrong[0], text);
  if (wrong[0] == NULL)
    {
      /* the keys it reports as changed are exactly those the dump changed */
      expected_changes = fw_params_diff_keys (base, want);
      g_assert_cmpuint (g_strv_length (r->changed_keys), ==, g_strv_length (expected_changes));
      for (guint i = 0; expected_changes[i]; i++)
        g_assert_cmpstr (r->changed_keys[i], ==, expected_changes[i]);
    }
  g_assert_cmpuint (r->n_evaluated, >, 1);
  return r;
}

typedef struct {
  const char *name;
  const char *stage;
  const char *settings[8];
  const char *candidates[3];
} CoreCase;

static const CoreCase core_cases[] = {
  { "mfcc-magnitude-htk-max-none-lifter-uncentred", "mfcc",
    { "spectrum=magnitude", "mel_scale=htk", "db_reference=max", "dct_norm=none", "lifter=22",
      "centered=false", NULL } },
  { "mel-db-unit-symmetric", "mel-db", { "mel_weights=unit", "window_symmetry=symmetric", NULL } },
  { "mfcc-htk-unit-lifter-none", "mfcc",
    { "mel_scale=htk", "mel_weights=unit", "lifter=22", "dct_norm=none", NULL } },
  { "magnitude-uncentred-symmetric", "magnitude",
    { "spectrum=magnitude", "centered=false", "window_symmetry=symmetric", NULL } },
  { "mel-db-fft1024-hop256-max", "mel-db",
    { "window_length=1024", "hop_length=256", "db_reference=max", "mel_bands=64", NULL },
    { "fft_length=1024,2048", "hop_length=256,512", NULL } },
  { "delta-htk-lifter", "delta", { "mel_scale=htk", "lifter=22", NULL } },
};

static void
test_core_dump (gconstpointer data)
{
  const CoreCase *c = data;
  g_autoptr (FwParams) want = params_with (c->settings);
  g_autoptr (GError) error = NULL;
  g_autoptr (FwAudio) audio = NULL;
  g_autoptr (FwTestMatrix) m = NULL;
  g_autoptr (FwExplainResult) r = NULL;
  g_autofree char *name = g_strdup_printf ("core-%s.npy", c->name);
  g_autofree char *path = g_build_filename (tmp_dir, name, NULL);
  FwStage stage;

  g_assert_true (fw_feature_parse_stage (c->stage, &stage, NULL));
  audio = fw_feature_load_audio (clip_path, want, NULL, &error);
  g_assert_no_error (error);
  m = fw_feature_compute (audio, want, stage, 1, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_true (fw_feature_write (m, path, &error));
  g_assert_no_error (error);
  r = explain_and_check (path, NULL, stage, want, c->candidates[0] ? c->candidates : NULL);
}

static void
test_core_unreachable (void)
{
  /* a dump made with pre-emphasis (not among the searched keys) is not matched exactly; the
   * finder says so rather than claiming a match */
  const char *const set[] = { "pre_emphasis=0.97", "mel_scale=htk", NULL };
  g_autoptr (FwParams) made = params_with (set);
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  g_autoptr (FwAudio) audio = fw_feature_load_audio (clip_path, made, NULL, &error);
  g_autoptr (FwTestMatrix) m = NULL;
  g_autofree char *path = g_build_filename (tmp_dir, "core-preemph.npy", NULL);
  g_autoptr (FwCompareOperand) dump = NULL;
  g_autoptr (FwCompareOperand) clip = NULL;
  g_autoptr (FwExplainResult) r = NULL;

  g_assert_no_error (error);
  m = fw_feature_compute (audio, made, FW_STAGE_MEL_DB, 1, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_true (fw_feature_write (m, path, &error));
  dump = fw_compare_operand_new_file (path, NULL, FW_STAGE_MEL_DB);
  clip = fw_compare_operand_new_clip (clip_path, base, FW_STAGE_MEL_DB);
  r = fw_compare_explain (dump, clip, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpfloat (r->relative_rms, >, 1e-3);
  /* with pre_emphasis among the candidates it is found */
  {
    const char *const cands[] = { "pre_emphasis=0,0.97", NULL };
    g_autoptr (FwExplainResult) r2 = explain_and_check (path, NULL, FW_STAGE_MEL_DB, made, cands);
  }
}

typedef struct {
  const char *name;
  const char *stage;
  const char *script_args[12]; /* make_dump.py options */
  const char *settings[8];     /* the same conventions as a Framewise parameter set */
  const char *candidates[3];
  FwFeatureAxes axes;
} NumpyCase;

static const NumpyCase numpy_cases[] = {
  { "mfcc-magnitude-htk-max-none-lifter-uncentred-symmetric", "mfcc",
    { "--spectrum", "magnitude", "--mel-scale", "htk", "--db-reference", "max", "--dct-norm",
      "none", "--lifter", "22", "--centered", "false" },
    { "spectrum=magnitude", "mel_scale=htk", "db_reference=max", "dct_norm=none", "lifter=22",
      "centered=false", NULL } },
  { "mel-db-unit-f8-fortran-bins-frames", "mel-db",
    { "--mel-weights", "unit", "--dtype", "f8", "--order", "F", "--layout", "bins-frames",
      "--window-symmetry", "symmetric" },
    { "mel_weights=unit", "window_symmetry=symmetric", NULL }, { NULL },
    FW_FEATURE_AXES_BINS_FRAMES },
  { "mfcc-htk-unit-fft1024-hop256", "mfcc",
    { "--mel-scale", "htk", "--mel-weights", "unit", "--n-fft", "1024", "--hop", "256", NULL },
    { "window_length=1024", "hop_length=256", "mel_scale=htk", "mel_weights=unit", NULL },
    { "fft_length=1024,2048", "hop_length=256,512", NULL } },
  { "magnitude-uncentred", "magnitude", { "--centered", "false", NULL },
    { "spectrum=magnitude", "centered=false", NULL } },
  { "db-max-symmetric", "db", { "--db-reference", "max", "--window-symmetry", "symmetric", NULL },
    { "db_reference=max", "window_symmetry=symmetric", NULL } },
};

static void
test_numpy_dump (gconstpointer data)
{
  const NumpyCase *c = data;
  g_autoptr (FwParams) want = params_with (c->settings);
  g_autofree char *name = g_strdup_printf ("numpy-%s.npy", c->name);
  g_autofree char *path = g_build_filename (tmp_dir, name, NULL);
  g_autofree char *script = NULL;
  g_autoptr (GPtrArray) args = g_ptr_array_new ();
  g_autoptr (FwExplainResult) r = NULL;
  FwFeatureFileOptions fo;
  FwStage stage;
  const char *srcdir = g_getenv ("G_TEST_SRCDIR");

  if (!fw_cmp_have_numpy ())
    {
      g_test_skip ("/usr/bin/python3 with numpy is not available: the independent dumps of "
                   "make_dump.py are not tested");
      return;
    }
  script = srcdir ? g_build_filename (srcdir, "compare", "make_dump.py", NULL)
                  : g_build_filename (FW_SOURCE_DIR, "tests", "compare", "make_dump.py", NULL);
  g_ptr_array_add (args, script);
  g_ptr_array_add (args, clip_path);
  g_ptr_array_add (args, path);
  g_ptr_array_add (args, (char *) "--stage");
  g_ptr_array_add (args, (char *) c->stage);
  for (int i = 0; i < 12 && c->script_args[i]; i++)
    g_ptr_array_add (args, (char *) c->script_args[i]);
  g_ptr_array_add (args, NULL);
  fw_cmp_run_python ((const char *const *) args->pdata);

  g_assert_true (fw_feature_parse_stage (c->stage, &stage, NULL));
  fw_feature_file_options_init (&fo);
  fo.axes = c->axes;
  r = explain_and_check (path, &fo, stage, want, c->candidates[0] ? c->candidates : NULL);
  if (strcmp (c->stage, "db") == 0)
    {
      /* dB of power and of magnitude are the same numbers with db_reference max (10 log10 |X|^2
       * = 20 log10 |X|): the other spectrum kind is listed as fitting equally well */
      gboolean listed = FALSE;
      for (guint i = 0; i < r->equivalent->len; i++)
        {
          g_autofree char *v = fw_params_get_value (
            ((FwExplainCandidate *) r->equivalent->pdata[i])->params, "spectrum");
          listed |= strcmp (v, "magnitude") == 0;
        }
      g_assert_true (listed);
    }
}

int
main (int argc, char **argv)
{
  int status;
  g_autoptr (GError) error = NULL;
  g_autofree float *x = NULL;
  gsize n = (gsize) (1.5 * RATE);

  g_test_init (&argc, &argv, NULL);
  tmp_dir = fw_test_make_dir ();
  clip_path = g_build_filename (tmp_dir, "piping.wav", NULL);
  x = fw_cmp_signal (n, RATE, 0.6, 11);
  fw_test_write_float (clip_path, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, RATE, x, n);

  for (gsize i = 0; i < G_N_ELEMENTS (core_cases); i++)
    {
      g_autofree char *p = g_strdup_printf ("/fw/compare/explain/core-dump/%s", core_cases[i].name);
      g_test_add_data_func (p, &core_cases[i], test_core_dump);
    }
  g_test_add_func ("/fw/compare/explain/core-dump/unreachable-then-candidate",
                   test_core_unreachable);
  for (gsize i = 0; i < G_N_ELEMENTS (numpy_cases); i++)
    {
      g_autofree char *p = g_strdup_printf ("/fw/compare/explain/numpy-dump/%s",
                                            numpy_cases[i].name);
      g_test_add_data_func (p, &numpy_cases[i], test_numpy_dump);
    }
  status = g_test_run ();
  fw_test_remove_dir (tmp_dir);
  g_free (tmp_dir);
  g_free (clip_path);
  return status;
}
