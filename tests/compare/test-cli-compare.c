/* test-cli-compare.c: `framewise-cli compare` and `framewise-cli explain` as a training
 * pipeline's CI would call them: output, JSON fields, exit status 0 / 1 / 2, and messages
 * that name the file. The CLI is the one meson built (env FW_CLI). Planted perturbations
 * (a different mel scale, a missing file, a bad option) are named at each check. */
#include "fw-config.h"

#include <sndfile.h>
#include <sys/wait.h>

#include "fw-compare.h"
#include "fw-feature.h"
#include "fw-test-compare.h"
#include "fw-test-fixtures.h"

#define RATE 22050

static char *tmp_dir;
static char *clip_path;

typedef struct {
  int status;
  char *out;
  char *err;
} Run;

static void
run_clear (Run *r)
{
  g_free (r->out);
  g_free (r->err);
}

static Run
run_cli (const char *first, ...)
{
  const char *cli = g_getenv ("FW_CLI");
  g_autoptr (GPtrArray) argv = g_ptr_array_new ();
  g_autoptr (GError) error = NULL;
  Run r = { 0 };
  int wait = 0;
  va_list ap;

  g_assert_nonnull (cli);
  g_ptr_array_add (argv, (char *) cli);
  va_start (ap, first);
  for (const char *a = first; a; a = va_arg (ap, const char *))
    g_ptr_array_add (argv, (char *) a);
  va_end (ap);
  g_ptr_array_add (argv, NULL);
  g_assert_true (g_spawn_sync (tmp_dir, (char **) argv->pdata, NULL, G_SPAWN_DEFAULT, NULL, NULL,
                               &r.out, &r.err, &wait, &error));
  g_assert_no_error (error);
  g_assert_true (WIFEXITED (wait));
  r.status = WEXITSTATUS (wait);
  return r;
}

static char *
write_params (const char *name, const char *const *settings)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (FwParams) p = NULL;
  g_autoptr (GError) error = NULL;
  char *path = g_build_filename (tmp_dir, name, NULL);

  p = fw_params_with_settings (base, settings, &error);
  g_assert_no_error (error);
  g_assert_true (fw_params_save (p, path, &error));
  g_assert_no_error (error);
  return path;
}

static char *
write_dump (const char *name, const char *const *settings, FwStage stage)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (FwParams) p = fw_params_with_settings (base, settings, NULL);
  g_autoptr (GError) error = NULL;
  g_autoptr (FwAudio) audio = fw_feature_load_audio (clip_path, p, NULL, &error);
  g_autoptr (FwTestMatrix) m = NULL;
  char *path = g_build_filename (tmp_dir, name, NULL);

  g_assert_no_error (error);
  m = fw_feature_compute (audio, p, stage, 1, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_true (fw_feature_write (m, path, &error));
  g_assert_no_error (error);
  return path;
}

static void
test_compare_exit_status (void)
{
  const char *const none[] = { NULL };
  const char *const htk[] = { "mel_scale=htk", NULL };
  g_autofree char *p_default = write_params ("default.txt", none);
  g_autofree char *p_htk = write_params ("htk.txt", htk);
  g_autofree char *dump = write_dump ("ours.npy", none, FW_STAGE_MFCC);
  g_autofree char *same = g_strdup_printf ("%s@%s", clip_path, p_default);
  g_autofree char *other = g_strdup_printf ("%s@%s", clip_path, p_htk);
  Run r;

  /* the dump against the clip with the set it was made with: identical, exit 0 */
  r = run_cli ("compare", dump, same, "--stage", "mfcc", NULL);
  g_assert_cmpint (r.status, ==, 0);
  fw_cmp_assert_contains (r.out, "B = A exactly");
  fw_cmp_assert_contains (r.out, "Within tolerance");
  run_clear (&r);

  /* planted: B uses the HTK mel scale: beyond tolerance, exit 1 */
  r = run_cli ("compare", dump, other, "--stage", "mfcc", NULL);
  g_assert_cmpint (r.status, ==, 1);
  fw_cmp_assert_contains (r.out, "Explanation: ");
  fw_cmp_assert_contains (r.out, "Beyond tolerance");
  run_clear (&r);

  /* a loose tolerance accepts it */
  r = run_cli ("compare", dump, other, "--stage", "mfcc", "--tolerance", "1e6", NULL);
  g_assert_cmpint (r.status, ==, 0);
  run_clear (&r);

  /* bad input: exit 2 with a message naming the file / the option */
  r = run_cli ("compare", "no-such-dump.npy", same, "--stage", "mfcc", NULL);
  g_assert_cmpint (r.status, ==, 2);
  fw_cmp_assert_contains (r.err, "no-such-dump.npy");
  run_clear (&r);
  r = run_cli ("compare", dump, same, "--stage", "mfcc", "--tolerance", "loose", NULL);
  g_assert_cmpint (r.status, ==, 2);
  fw_cmp_assert_contains (r.err, "--tolerance loose");
  run_clear (&r);
  r = run_cli ("compare", dump, same, "--stage", "chroma", NULL);
  g_assert_cmpint (r.status, ==, 2);
  fw_cmp_assert_contains (r.err, "chroma");
  run_clear (&r);
  r = run_cli ("compare", dump, NULL);
  g_assert_cmpint (r.status, ==, 2);
  run_clear (&r);
}

static void
test_compare_json (void)
{
  const char *const none[] = { NULL };
  g_autofree char *dump = write_dump ("ours-mel-db.npy", none, FW_STAGE_MEL_DB);
  g_autofree char *json_path = g_build_filename (tmp_dir, "out.json", NULL);
  static const char *const keys[] = { "shape_a", "shape_b", "compared_frames", "max_abs_diff",
                                      "rms_diff", "mean_offset", "lag_frames",
                                      "residual_max_abs", "summary" };
  Run r;

  /* the dump against the clip analysed with --set db_reference=max: a constant offset */
  r = run_cli ("compare", dump, clip_path, "--stage", "mel-db", "--set", "db_reference=max",
               "--json", NULL);
  g_assert_cmpint (r.status, ==, 1);
  for (gsize i = 0; i < G_N_ELEMENTS (keys); i++)
    {
      g_autofree char *k = g_strdup_printf ("\"%s\": ", keys[i]);
      fw_cmp_assert_contains (r.out, k);
    }
  fw_cmp_assert_contains (r.out, "\"lag_frames\": 0,");
  fw_cmp_assert_contains (r.out, "everywhere");
  g_assert_true (g_file_set_contents (json_path, r.out, -1, NULL));
  if (fw_cmp_have_numpy ())
    {
      /* Python's json module parses it and the fields agree with each other */
      const char *args[] = {
        "-c",
        "import json, sys\n"
        "d = json.load(open(sys.argv[1]))\n"
        "assert d['shape_a'] == d['shape_b'], d\n"
        "assert d['compared_frames'] == d['shape_a'][0], d\n"
        "assert d['max_abs_diff'] >= d['rms_diff'] > 0, d\n"
        "assert abs(d['mean_offset'] - d['offset']) < 1e-3, d\n"
        "assert d['within_tolerance'] is False, d\n",
        json_path, NULL
      };
      fw_cmp_run_python (args);
    }
  run_clear (&r);
}

static void
test_compare_knobs (void)
{
  const char *const a_set[] = { NULL };
  const char *const b_set[] = { "mel_scale=htk", "delta_width=4", NULL };
  g_autofree char *pa = write_params ("a.txt", a_set);
  g_autofree char *pb = write_params ("b.txt", b_set);
  g_autofree char *oa = g_strdup_printf ("%s@%s", clip_path, pa);
  g_autofree char *ob = g_strdup_printf ("%s@%s", clip_path, pb);
  Run r;

  /* planted: B differs in mel_scale (matters) and delta_width (does not, for mel-db) */
  r = run_cli ("compare", oa, ob, "--stage", "mel-db", "--knobs", NULL);
  g_assert_cmpint (r.status, ==, 1);
  fw_cmp_assert_contains (r.out, "mel_scale (slaney -> htk) removes 100% of the difference");
  fw_cmp_assert_contains (r.out, "delta_width (2 -> 4) removes 0% of the difference");
  run_clear (&r);

  r = run_cli ("compare", oa, ob, "--stage", "mel-db", "--knobs", "--json", NULL);
  g_assert_cmpint (r.status, ==, 1);
  fw_cmp_assert_contains (r.out, "\"knobs\": [");
  fw_cmp_assert_contains (r.out, "{\"key\": \"mel_scale\", \"value_a\": \"slaney\", "
                                 "\"value_b\": \"htk\", \"removed\": 1,");
  if (fw_cmp_have_numpy ())
    {
      g_autofree char *path = g_build_filename (tmp_dir, "knobs.json", NULL);
      const char *args[] = { "-c",
                             "import json, sys\n"
                             "d = json.load(open(sys.argv[1]))\n"
                             "k = d['knobs']\n"
                             "assert [x['key'] for x in k] == ['mel_scale', 'delta_width'], k\n"
                             "assert k[0]['removed'] == 1 and k[1]['removed'] == 0, k\n",
                             path, NULL };
      g_assert_true (g_file_set_contents (path, r.out, -1, NULL));
      fw_cmp_run_python (args);
    }
  run_clear (&r);
}

static void
test_explain (void)
{
  const char *const made[] = { "spectrum=magnitude", "mel_scale=htk", "lifter=22", NULL };
  const char *const pre[] = { "pre_emphasis=0.97", NULL };
  g_autofree char *dump = write_dump ("their.npy", made, FW_STAGE_MFCC);
  g_autofree char *dump2 = write_dump ("their-preemph.npy", pre, FW_STAGE_MFCC);
  Run r;

  r = run_cli ("explain", dump, clip_path, "--stage", "mfcc", NULL);
  g_assert_cmpint (r.status, ==, 0);
  fw_cmp_assert_contains (r.out, "reproduces the dump");
  fw_cmp_assert_contains (r.out, "Keys changed from the starting set: spectrum=magnitude "
                                 "mel_scale=htk lifter=22");
  fw_cmp_assert_contains (r.out, "[framewise-parameters]");
  fw_cmp_assert_contains (r.out, "\nmel_scale=htk\n");
  run_clear (&r);

  r = run_cli ("explain", dump, clip_path, "--stage", "mfcc", "--json", NULL);
  g_assert_cmpint (r.status, ==, 0);
  fw_cmp_assert_contains (r.out, "\"exact\": true");
  fw_cmp_assert_contains (r.out, "\"changed\": {\"spectrum\": \"magnitude\", \"mel_scale\": "
                                 "\"htk\", \"lifter\": \"22\"}");
  run_clear (&r);

  /* planted: pre-emphasis is not searched by default: no exact match, exit 1; given as
   * candidates (in both accepted spellings) it is found, exit 0 */
  r = run_cli ("explain", dump2, clip_path, "--stage", "mfcc", "--only-candidates",
               "--candidates", "lifter=0,22", NULL);
  g_assert_cmpint (r.status, ==, 1);
  fw_cmp_assert_contains (r.out, "not an exact match");
  run_clear (&r);
  r = run_cli ("explain", dump2, clip_path, "--stage", "mfcc", "--only-candidates",
               "--candidates", "lifter=0,22", "pre_emphasis=0,0.97", NULL);
  g_assert_cmpint (r.status, ==, 0);
  fw_cmp_assert_contains (r.out, "Keys changed from the starting set: pre_emphasis=0.97");
  run_clear (&r);

  /* bad input */
  r = run_cli ("explain", dump, clip_path, NULL);
  g_assert_cmpint (r.status, ==, 2);
  fw_cmp_assert_contains (r.err, "--stage");
  run_clear (&r);
  r = run_cli ("explain", dump, clip_path, "--stage", "mfcc", "--candidates", "colour=1,2", NULL);
  g_assert_cmpint (r.status, ==, 2);
  fw_cmp_assert_contains (r.err, "unknown key 'colour'");
  run_clear (&r);
  r = run_cli ("explain", dump, "no-such-clip.wav", "--stage", "mfcc", NULL);
  g_assert_cmpint (r.status, ==, 2);
  fw_cmp_assert_contains (r.err, "no-such-clip.wav");
  run_clear (&r);
}

int
main (int argc, char **argv)
{
  int status;
  g_autofree float *x = NULL;
  gsize n = (gsize) (1.5 * RATE);

  g_test_init (&argc, &argv, NULL);
  if (g_getenv ("FW_CLI") == NULL)
    {
      g_printerr ("FW_CLI is not set (run through meson test)\n");
      return 77;
    }
  tmp_dir = fw_test_make_dir ();
  clip_path = g_build_filename (tmp_dir, "agitated.wav", NULL);
  x = fw_cmp_signal (n, RATE, 0.4, 23);
  fw_test_write_float (clip_path, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, RATE, x, n);

  g_test_add_func ("/fw/compare/cli/compare-exit-status", test_compare_exit_status);
  g_test_add_func ("/fw/compare/cli/compare-json", test_compare_json);
  g_test_add_func ("/fw/compare/cli/compare-knobs", test_compare_knobs);
  g_test_add_func ("/fw/compare/cli/explain", test_explain);
  status = g_test_run ();
  fw_test_remove_dir (tmp_dir);
  g_free (tmp_dir);
  g_free (clip_path);
  return status;
}
