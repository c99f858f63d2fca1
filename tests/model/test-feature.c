/* test-feature.c: stage names, labels, computing through the model, cancellation, errors, and
 * the NPY/CSV writers.
 *
 * Sources named beside the checks:
 *   [cv§5.1] ../shared/docs/check-values.md §5.1 (NUM): N = 2048, sr = 22050, a unit cosine on
 *            bin 93 through a periodic Hann window: |X[93]| = 512 exactly, |X[92]| = |X[94]|
 *            = 256, other bins below 5e-13; 20 log10 512 = 54.1854 dB.
 *   [cv§8]   check-values.md §8: frame count for L = 22050, n = 2048, h = 512: 44 centred
 *            (1 + floor(L/h)), 40 not centred (1 + floor((L-n)/h)); bins n/2 + 1 = 1025;
 *            bin k at k*sr/n (10.7666015625 Hz spacing).
 *   [npy]    numpy's format documentation (numpy/lib/format.py, "Format Version 1.0"): magic
 *            "\x93NUMPY", major 1, minor 0, little-endian uint16 HEADER_LEN, a dict literal
 *            with descr, fortran_order and shape, padded with spaces and terminated by '\n' so
 *            that the whole preamble is divisible by 64 (16 in older numpy). Cross-checked by
 *            loading the file with Debian's numpy (/usr/bin/python3).
 *   [issue2] issue 2: stage names; frame-centre times; "never propagate NaN".
 */
#include "fw-config.h"

#include <locale.h>
#include <math.h>
#include <string.h>

#include <sndfile.h>

#include "fw-feature.h"
#include "fw-test-fixtures.h"

static char *tmp_dir;

static void
assert_mentions (const GError *error, const char *const *parts)
{
  g_assert_nonnull (error);
  for (guint i = 0; parts[i] != NULL; i++)
    if (strstr (error->message, parts[i]) == NULL)
      g_error ("message \"%s\" does not mention \"%s\"", error->message, parts[i]);
}

static FwParams *
with (const char *const *settings)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (d, settings, &error);

  g_assert_no_error (error);
  return p;
}

static void
test_stage_names (void)
{
  /* [issue2] the stage names */
  static const struct { const char *name; FwStage stage; } cases[] = {
    { "power", FW_STAGE_SPECTRUM }, { "magnitude", FW_STAGE_SPECTRUM }, { "db", FW_STAGE_DB },
    { "mel", FW_STAGE_MEL }, { "mel-db", FW_STAGE_MEL_DB }, { "mfcc", FW_STAGE_MFCC },
    { "delta", FW_STAGE_DELTA }, { "delta2", FW_STAGE_DELTA2 }, { "rms", FW_STAGE_RMS },
    { "zcr", FW_STAGE_ZCR }, { "centroid", FW_STAGE_CENTROID },
    { "bandwidth", FW_STAGE_BANDWIDTH }, { "rolloff", FW_STAGE_ROLLOFF },
    { "flatness", FW_STAGE_FLATNESS }, { "MFCC", FW_STAGE_MFCC },
  };
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (FwParams) mag = with ((const char *[]) { "spectrum=magnitude", NULL });
  FwStage s;

  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_assert_true (fw_feature_parse_stage (cases[i].name, &s, &error));
      g_assert_no_error (error);
      g_assert_cmpint (s, ==, cases[i].stage);
    }
  g_assert_cmpuint (g_strv_length ((char **) fw_feature_stage_names ()), ==, 14);

  g_assert_false (fw_feature_parse_stage ("spectrogram", &s, &error));
  g_assert_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_STAGE);
  assert_mentions (error, (const char *[]) { "spectrogram", "power, magnitude, db, mel, mel-db, "
                                             "mfcc, delta, delta2, rms, zcr, centroid, "
                                             "bandwidth, rolloff, flatness", NULL });

  g_assert_cmpstr (fw_feature_stage_name (FW_STAGE_SPECTRUM, d), ==, "power");
  g_assert_cmpstr (fw_feature_stage_name (FW_STAGE_SPECTRUM, mag), ==, "magnitude");
  g_assert_cmpstr (fw_feature_stage_name (FW_STAGE_MEL_DB, d), ==, "mel-db");

  /* [cv§8] n/2 + 1 bins */
  g_assert_cmpuint (fw_feature_n_bins (FW_STAGE_SPECTRUM, d), ==, 1025);
  g_assert_cmpuint (fw_feature_n_bins (FW_STAGE_DB, d), ==, 1025);
  g_assert_cmpuint (fw_feature_n_bins (FW_STAGE_MEL_DB, d), ==, 128);
  g_assert_cmpuint (fw_feature_n_bins (FW_STAGE_DELTA2, d), ==, 13);
  g_assert_cmpuint (fw_feature_n_bins (FW_STAGE_ROLLOFF, d), ==, 1);
}

static void
test_labels (void)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (FwParams) mx = with ((const char *[]) { "db_reference=max", NULL });
  g_autoptr (FwParams) mag = with ((const char *[]) { "spectrum=magnitude",
                                                      "db_reference=0.5", NULL });
  struct { FwStage stage; const FwParams *p; const char *label, *unit; } cases[] = {
    { FW_STAGE_SPECTRUM, d, "power", "" },
    { FW_STAGE_DB, d, "power, dB re 1.0", "dB" },
    { FW_STAGE_DB, mx, "power, dB re clip max", "dB" },
    { FW_STAGE_SPECTRUM, mag, "magnitude", "" },
    { FW_STAGE_DB, mag, "magnitude, dB re 0.5", "dB" },
    { FW_STAGE_MEL, d, "mel power", "" },
    { FW_STAGE_MEL_DB, d, "mel power, dB re 1.0", "dB" },
    { FW_STAGE_MFCC, d, "MFCC value", "" },
    { FW_STAGE_DELTA, d, "delta of MFCC (per frame)", "" },
    { FW_STAGE_CENTROID, d, "spectral centroid, Hz", "Hz" },
    { FW_STAGE_ROLLOFF, d, "85% rolloff frequency, Hz", "Hz" },
  };

  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autofree char *label = fw_feature_quantity_label (cases[i].stage, cases[i].p);
      g_assert_cmpstr (label, ==, cases[i].label);
      g_assert_cmpstr (fw_feature_value_unit (cases[i].stage, cases[i].p), ==, cases[i].unit);
    }
}

/* A unit cosine exactly on bin 93 of a 2048-point DFT at 22050 Hz, 1 s. [cv§5.1] */
static FwAudio *
on_bin_cosine (void)
{
  float *x = g_new (float, 22050);
  FwAudio *a;

  for (int n = 0; n < 22050; n++)
    x[n] = (float) cos (2 * G_PI * 93.0 * n / 2048.0);
  a = fw_audio_new_from_samples ("cosine-bin93", x, 22050, 22050);
  g_free (x);
  return a;
}

static void
test_compute_on_bin (void)
{
  g_autoptr (FwAudio) a = on_bin_cosine ();
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (FwParams) nc = with ((const char *[]) { "centered=false", NULL });
  g_autoptr (GError) error = NULL;
  FwMatrix *m;
  const gsize t = 10; /* an interior frame: samples 10*512-1024 .. +2048 lie inside the clip */

  m = fw_feature_compute (a, d, FW_STAGE_SPECTRUM, 1, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_nonnull (m);
  g_assert_cmpuint (m->n_frames, ==, 44);  /* [cv§8] centred */
  g_assert_cmpuint (m->n_bins, ==, 1025);  /* [cv§8] */
  /* [cv§5.1] |X[93]|^2 = 512^2, |X[92]|^2 = |X[94]|^2 = 256^2; float32: 1e-4 relative */
  g_assert_cmpfloat_with_epsilon (fw_matrix_get (m, t, 93), 262144.0, 262144.0 * 1e-4);
  g_assert_cmpfloat_with_epsilon (fw_matrix_get (m, t, 92), 65536.0, 65536.0 * 1e-4);
  g_assert_cmpfloat_with_epsilon (fw_matrix_get (m, t, 94), 65536.0, 65536.0 * 1e-4);
  for (gsize k = 0; k < m->n_bins; k++)
    if (k < 92 || k > 94)
      g_assert_cmpfloat (fw_matrix_get (m, t, k), <, 1e-2);
  /* [issue2] frame centre time: t*hop/sr when centred */
  g_assert_cmpfloat_with_epsilon (m->frame_times[t], t * 512.0 / 22050.0, 1e-12);
  /* [cv§8] bin k at k*sr/n */
  g_assert_cmpfloat_with_epsilon (m->bin_value[93], 93 * 22050.0 / 2048.0, 1e-9);
  fw_matrix_unref (m);

  m = fw_feature_compute (a, nc, FW_STAGE_SPECTRUM, 2, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (m->n_frames, ==, 40);  /* [cv§8] not centred */
  g_assert_cmpfloat_with_epsilon (fw_matrix_get (m, 0, 93), 262144.0, 262144.0 * 1e-4);
  fw_matrix_unref (m);

  /* dB re 1.0 of the same bin: 20 log10 512 = 54.1854 dB [cv§5.1] */
  m = fw_feature_compute (a, d, FW_STAGE_DB, 1, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpfloat_with_epsilon (fw_matrix_get (m, t, 93), 54.1854, 1e-3);
  fw_matrix_unref (m);

  /* the other stages have the documented shapes */
  {
    static const struct { FwStage stage; gsize bins; } shapes[] = {
      { FW_STAGE_MEL, 128 }, { FW_STAGE_MEL_DB, 128 }, { FW_STAGE_MFCC, 13 },
      { FW_STAGE_DELTA, 13 }, { FW_STAGE_DELTA2, 13 }, { FW_STAGE_RMS, 1 },
      { FW_STAGE_CENTROID, 1 },
    };
    for (guint i = 0; i < G_N_ELEMENTS (shapes); i++)
      {
        m = fw_feature_compute (a, d, shapes[i].stage, 2, NULL, NULL, NULL, &error);
        g_assert_no_error (error);
        g_assert_cmpuint (m->n_frames, ==, 44);
        g_assert_cmpuint (m->n_bins, ==, shapes[i].bins);
        fw_matrix_unref (m);
      }
  }
}

static int
cancel_at_first_call (double fraction, void *data)
{
  int *calls = data;
  (*calls)++;
  return 1;
}

static int
cancel_through_cancellable (double fraction, void *data)
{
  g_cancellable_cancel (data);
  return 0;
}

static void
test_cancel (void)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  g_autoptr (GCancellable) c = g_cancellable_new ();
  g_autofree float *x = fw_test_sine (22050 * 20, 22050, 440, 0.3, 0);
  g_autoptr (FwAudio) a = fw_audio_new_from_samples ("hive-20s", x, 22050 * 20, 22050);
  int calls = 0;

  /* already cancelled */
  g_cancellable_cancel (c);
  g_assert_null (fw_feature_compute (a, d, FW_STAGE_MFCC, 1, NULL, NULL, c, &error));
  g_assert_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_CANCELLED);
  g_clear_error (&error);

  /* the progress callback says stop */
  g_assert_null (fw_feature_compute (a, d, FW_STAGE_MFCC, 1, cancel_at_first_call, &calls,
                                     NULL, &error));
  g_assert_cmpint (calls, >=, 1);
  g_assert_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_CANCELLED);
  g_clear_error (&error);

  /* the cancellable is cancelled while running */
  g_cancellable_reset (c);
  g_assert_null (fw_feature_compute (a, d, FW_STAGE_MFCC, 1, cancel_through_cancellable, c, c,
                                     &error));
  g_assert_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_CANCELLED);
}

static void
test_errors (void)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  g_autofree float *x = fw_test_sine (1000, 22050, 440, 0.3, 0);
  g_autoptr (FwAudio) shorty = fw_audio_new_from_samples ("short-clip", x, 1000, 22050);
  g_autoptr (FwAudio) bad = NULL;

  /* [issue2] a clip shorter than one frame: 1000 / 22050 s = 45.4 ms */
  g_assert_null (fw_feature_compute (shorty, d, FW_STAGE_SPECTRUM, 1, NULL, NULL, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP);
  g_assert_cmpstr (error->message, ==, "short-clip: clip has 1000 samples at 22050 Hz (45.4 ms); "
                                       "one frame needs 2048 samples");
  g_clear_error (&error);

  /* [issue2] NaN never reaches the features */
  x[500] = NAN;
  bad = fw_audio_new_from_samples ("nan-clip", x, 1000, 22050);
  {
    g_autoptr (FwParams) p = with ((const char *[]) { "window_length=256", "mel_bands=20", NULL });
    g_assert_null (fw_feature_compute (bad, p, FW_STAGE_MFCC, 1, NULL, NULL, NULL, &error));
    g_assert_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_FAILED);
    assert_mentions (error, (const char *[]) { "nan-clip", "1 sample", NULL });
    g_clear_error (&error);
  }

  /* parameters that do not fit the audio name the clip */
  {
    g_autoptr (FwParams) p = with ((const char *[]) { "sample_rate=0", "fmax=16000", NULL });
    g_autofree float *y = fw_test_sine (22050, 22050, 440, 0.3, 0);
    g_autoptr (FwAudio) a = fw_audio_new_from_samples ("hum.wav", y, 22050, 22050);
    g_assert_null (fw_feature_compute (a, p, FW_STAGE_MEL, 1, NULL, NULL, NULL, &error));
    g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP);
    assert_mentions (error, (const char *[]) { "hum.wav", "fmax 16000", "11025", NULL });
  }
}

static void
test_load_and_check (void)
{
  g_autofree char *path = fw_test_path (tmp_dir, "hive-8k.wav");
  g_autofree float *x = fw_test_sine (16000, 8000, 250, 0.5, 0);
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (FwParams) keep = with ((const char *[]) { "sample_rate=0", "window_length=512",
                                                       "mel_bands=40", NULL });
  g_autoptr (GPtrArray) w = g_ptr_array_new_with_free_func (g_free);
  g_autoptr (GError) error = NULL;
  g_autoptr (FwAudio) up = NULL, native = NULL;
  gboolean found = FALSE;

  fw_test_write_float (path, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 8000, x, 16000);

  /* the default sample_rate (22050) upsamples an 8 kHz file, and that is warned about */
  up = fw_feature_load_audio (path, d, NULL, &error);
  g_assert_no_error (error);
  g_assert_true (up->resampled);
  g_assert_cmpfloat (up->sample_rate, ==, 22050);
  g_assert_true (fw_feature_check (up, d, w, &error));
  g_assert_no_error (error);
  for (guint i = 0; i < w->len; i++)
    if (strstr (g_ptr_array_index (w, i), "upsampling adds no information") != NULL &&
        strstr (g_ptr_array_index (w, i), "4000 Hz") != NULL)
      found = TRUE;
  g_assert_true (found);

  /* sample_rate=0 keeps the file's rate */
  native = fw_feature_load_audio (path, keep, NULL, &error);
  g_assert_no_error (error);
  g_assert_false (native->resampled);
  g_assert_cmpfloat (native->sample_rate, ==, 8000);
  g_assert_cmpuint (native->n_samples, ==, 16000);
}

static GBytes *
read_file (const char *path)
{
  g_autofree char *contents = NULL;
  gsize len = 0;

  g_assert_true (g_file_get_contents (path, &contents, &len, NULL));
  return g_bytes_new_take (g_steal_pointer (&contents), len);
}

static FwMatrix *
small_matrix (void)
{
  FwMatrix *m = fw_matrix_new (3, 4);

  for (gsize t = 0; t < 3; t++)
    {
      m->frame_times[t] = t * 512.0 / 22050.0;
      for (gsize k = 0; k < 4; k++)
        m->data[t * 4 + k] = (float) (t * 10 + k) + 0.25f * (k % 2 ? -1.0f : 1.0f);
    }
  for (gsize k = 0; k < 4; k++)
    {
      m->bin_value[k] = k * 22050.0 / 2048.0;
      m->bin_low[k] = m->bin_value[k];
      m->bin_high[k] = m->bin_value[k];
    }
  m->bin_kind = FW_BIN_AXIS_HZ;
  m->sample_rate = 22050;
  m->hop_seconds = 512.0 / 22050.0;
  m->stage = FW_STAGE_SPECTRUM;
  return m;
}

static void
test_write_npy (void)
{
  g_autofree char *path = fw_test_path (tmp_dir, "small.npy");
  g_autoptr (GError) error = NULL;
  g_autoptr (GBytes) bytes = NULL;
  FwMatrix *m = small_matrix ();
  const guint8 *b;
  gsize len, hlen;
  const char *dict = "{'descr': '<f4', 'fortran_order': False, 'shape': (3, 4), }";

  g_assert_true (fw_feature_write (m, path, &error));
  g_assert_no_error (error);
  bytes = read_file (path);
  b = g_bytes_get_data (bytes, &len);

  /* [npy] magic, version 1.0, header length */
  g_assert_cmpmem (b, 6, "\x93NUMPY", 6);
  g_assert_cmpint (b[6], ==, 1);
  g_assert_cmpint (b[7], ==, 0);
  hlen = (gsize) b[8] | ((gsize) b[9] << 8);
  g_assert_cmpuint ((10 + hlen) % 64, ==, 0);
  g_assert_cmpuint (len, ==, 10 + hlen + 3 * 4 * 4);
  g_assert_cmpmem (b + 10, strlen (dict), dict, strlen (dict));
  for (gsize i = 10 + strlen (dict); i < 10 + hlen - 1; i++)
    g_assert_cmpint (b[i], ==, ' ');
  g_assert_cmpint (b[10 + hlen - 1], ==, '\n');
  /* little-endian float32, C order */
  for (gsize i = 0; i < 12; i++)
    {
      const guint8 *p = b + 10 + hlen + 4 * i;
      guint32 bits = (guint32) p[0] | ((guint32) p[1] << 8) | ((guint32) p[2] << 16) |
                     ((guint32) p[3] << 24);
      float f;
      memcpy (&f, &bits, 4);
      g_assert_cmpfloat (f, ==, m->data[i]);
    }

  /* [npy] and numpy itself reads it */
  if (g_file_test ("/usr/bin/python3", G_FILE_TEST_IS_EXECUTABLE))
    {
      g_autofree char *out = NULL, *err = NULL;
      int status = 0;
      const char *argv[] = { "/usr/bin/python3", "-c",
                             "import sys, numpy; a = numpy.load(sys.argv[1]); "
                             "print(a.shape, a.dtype, a.flags['C_CONTIGUOUS'], repr(float(a[2, 1])))",
                             path, NULL };
      g_assert_true (g_spawn_sync (NULL, (char **) argv, NULL, 0, NULL, NULL, &out, &err,
                                   &status, &error));
      g_assert_no_error (error);
      if (g_spawn_check_wait_status (status, NULL))
        g_assert_cmpstr (out, ==, "(3, 4) float32 True 20.75\n");
      else if (strstr (err, "No module named") != NULL)
        g_test_message ("numpy is not installed: skipped the numpy cross-check");
      else
        g_error ("numpy could not load the file: %s", err);
    }

  /* header alone: big shapes stay a multiple of 64 */
  {
    g_autoptr (GBytes) h = fw_feature_npy_header (123456789, 1025);
    g_assert_cmpuint (g_bytes_get_size (h) % 64, ==, 0);
  }
  fw_matrix_unref (m);
}

static void
test_write_csv (void)
{
  g_autofree char *path = fw_test_path (tmp_dir, "small.csv");
  g_autofree char *bad = g_build_filename (tmp_dir, "no-such-folder", "x.csv", NULL);
  g_autoptr (GError) error = NULL;
  g_autoptr (GBytes) bytes = NULL;
  g_auto (GStrv) lines = NULL;
  FwMatrix *m = small_matrix ();

  g_assert_true (fw_feature_write (m, path, &error));
  g_assert_no_error (error);
  bytes = read_file (path);
  {
    g_autofree char *text = g_strndup (g_bytes_get_data (bytes, NULL), g_bytes_get_size (bytes));
    lines = g_strsplit (text, "\n", -1);
  }
  g_assert_cmpuint (g_strv_length (lines), ==, 5); /* header, 3 rows, "" after the last \n */
  /* [cv§8] bin k at k*22050/2048 Hz */
  g_assert_cmpstr (lines[0], ==, "time_s,hz_0,hz_10.7666015625,hz_21.533203125,hz_32.2998046875");
  g_assert_cmpstr (lines[1], ==, "0,0.25,0.75,2.25,2.75");
  /* 512/22050 s = 0.02321995465 (10 significant digits) */
  g_assert_cmpstr (lines[2], ==, "0.02321995465,10.25,10.75,12.25,12.75");
  g_assert_cmpstr (lines[4], ==, "");

  /* a write error names the path */
  g_assert_false (fw_feature_write (m, bad, &error));
  g_assert_nonnull (error);
  g_assert_nonnull (strstr (error->message, "no-such-folder"));
  fw_matrix_unref (m);
}

int
main (int argc, char **argv)
{
  int status;

  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);
  tmp_dir = fw_test_make_dir ();

  g_test_add_func ("/fw/model/feature/stage-names", test_stage_names);
  g_test_add_func ("/fw/model/feature/labels", test_labels);
  g_test_add_func ("/fw/model/feature/compute-on-bin-cosine", test_compute_on_bin);
  g_test_add_func ("/fw/model/feature/cancel", test_cancel);
  g_test_add_func ("/fw/model/feature/errors", test_errors);
  g_test_add_func ("/fw/model/feature/load-and-check", test_load_and_check);
  g_test_add_func ("/fw/model/feature/write-npy", test_write_npy);
  g_test_add_func ("/fw/model/feature/write-csv", test_write_csv);

  status = g_test_run ();
  fw_test_remove_dir (tmp_dir);
  g_free (tmp_dir);
  return status;
}
