/* test-cli-features.c: framewise-cli features, info and params, run as a program ($FW_CLI).
 *
 * Sources named beside the checks:
 *   [issue2] issue 2: CLI behaviour, exit status, the defaults of the parameter set.
 *   [cv§1]   ../shared/docs/check-values.md §1.1 (NUM/closed form): periodic Hann ENBW = 1.5
 *            bins exactly, highest sidelobe -31.4673 dB, scalloping loss 1.4236 dB.
 *   [cv§5]   check-values.md §5 (PUB): AES17, a full-scale sine's RMS reads 0 dB FS.
 *   [cv§8]   check-values.md §8 (PUB/CP): sr/n_fft = 10.7666015625 Hz, hop 512 at 22050 Hz
 *            = 23.21995 ms, frame count 44 (centred) and 40 (not centred) for L = 22050,
 *            n = 2048, h = 512; n/2 + 1 = 1025 bins.
 *   [npy]    numpy format.py, "Format Version 1.0" (see tests/model/test-feature.c).
 *   [SHA256] GLib's GChecksum SHA-256.
 */
#include <locale.h>
#include <math.h>
#include <string.h>
#include <sys/wait.h>

#include <glib/gstdio.h>
#include <sndfile.h>

#include "fw-test-fixtures.h"

static char *tmp_dir;
static const char *cli;


typedef struct {
  int exit_code;
  char *out;
  char *err;
} Run;

static void
run_clear (Run *r)
{
  g_free (r->out);
  g_free (r->err);
}
G_DEFINE_AUTO_CLEANUP_CLEAR_FUNC (Run, run_clear)

/* Runs framewise-cli with the NULL-terminated arguments. */
static void
run (Run *r, const char *first, ...)
{
  GPtrArray *argv = g_ptr_array_new ();
  g_autoptr (GError) error = NULL;
  int status = 0;
  va_list ap;

  g_ptr_array_add (argv, (char *) cli);
  va_start (ap, first);
  for (const char *a = first; a != NULL; a = va_arg (ap, const char *))
    g_ptr_array_add (argv, (char *) a);
  va_end (ap);
  g_ptr_array_add (argv, NULL);

  memset (r, 0, sizeof *r);
  g_assert_true (g_spawn_sync (NULL, (char **) argv->pdata, NULL, 0, NULL, NULL, &r->out,
                               &r->err, &status, &error));
  g_assert_no_error (error);
  g_assert_true (WIFEXITED (status));
  r->exit_code = WEXITSTATUS (status);
  g_ptr_array_free (argv, TRUE);
}

static void
assert_contains (const char *haystack, const char *needle)
{
  if (strstr (haystack, needle) == NULL)
    g_error ("expected \"%s\" in:\n%s", needle, haystack);
}

static void
expect_error (Run *r, const char *const *parts)
{
  g_assert_cmpint (r->exit_code, ==, 2);
  g_assert_true (g_str_has_prefix (r->err, "framewise-cli: "));
  for (guint i = 0; parts[i] != NULL; i++)
    assert_contains (r->err, parts[i]);
}

static char *
write_sine (const char *name, int format, int rate, gsize n, double freq, double amp)
{
  char *path = fw_test_path (tmp_dir, name);
  g_autofree float *x = fw_test_sine (n, rate, freq, amp, 0);

  fw_test_write_float (path, format, 1, rate, x, n);
  return path;
}

/* ---- params ---- */

static void
test_params_default (void)
{
  g_auto (Run) a = { 0 }, b = { 0 };
  g_autofree char *sum = g_compute_checksum_for_string (G_CHECKSUM_SHA256, fw_test_default_params_text, -1);
  g_autofree char *expected = g_strdup_printf ("%shash: %.16s\n", fw_test_default_params_text, sum);

  run (&a, "params", NULL);
  g_assert_cmpint (a.exit_code, ==, 0);
  g_assert_cmpstr (a.out, ==, expected); /* [issue2] defaults, [SHA256] hash */
  g_assert_cmpstr (a.err, ==, "");
  run (&b, "params", NULL);
  g_assert_cmpstr (b.out, ==, a.out); /* stable */
}

static void
test_params_set_and_file (void)
{
  g_auto (Run) a = { 0 }, b = { 0 }, c = { 0 };
  g_autofree char *file = fw_test_path (tmp_dir, "speech.fwparams");

  run (&a, "params", "--set", "window_length=1024", "--set", "hop_length=256",
       "-s", "mel_scale=HTK", "--set", "fmin=20.0", NULL);
  g_assert_cmpint (a.exit_code, ==, 0);
  /* fft_length follows window_length; names lower-cased; numbers canonical */
  assert_contains (a.out, "\nwindow_length=1024\nhop_length=256\nfft_length=1024\n");
  assert_contains (a.out, "\nmel_scale=htk\nfmin=20\n");

  /* the same set from a file written in another order */
  g_assert_true (g_file_set_contents (file,
                                      "[framewise-parameters]\n"
                                      "fmin = 2e1\n"
                                      "mel_scale=htk\n"
                                      "hop_length=256\n"
                                      "window_length=1024\n", -1, NULL));
  run (&b, "params", "--params", file, NULL);
  g_assert_cmpint (b.exit_code, ==, 0);
  g_assert_cmpstr (b.out, ==, a.out);

  /* --methods adds the description after the hash line */
  run (&c, "params", "--methods", NULL);
  g_assert_cmpint (c.exit_code, ==, 0);
  assert_contains (c.out, "hash: ");
  assert_contains (c.out, "periodic Hann window");
}

static void
test_params_errors (void)
{
  g_autofree char *future = fw_test_path (tmp_dir, "future.fwparams");
  g_autofree char *missing = fw_test_path (tmp_dir, "missing.fwparams");

  {
    g_auto (Run) r = { 0 };
    run (&r, "params", "--set", "fft_size=1024", NULL);
    expect_error (&r, (const char *[]) { "fft_size", "fft_length", NULL });
    g_assert_cmpstr (r.out, ==, "");
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "params", "--set", "window=kaiser", NULL);
    expect_error (&r, (const char *[]) { "window", "kaiser", "rectangular, hann, hamming, blackman",
                                         NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "params", "--set", "window_length=2048", "--set", "fft_length=1024", NULL);
    expect_error (&r, (const char *[]) { "fft_length 1024", "window_length 2048", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "params", "--params", missing, NULL);
    expect_error (&r, (const char *[]) { missing, NULL });
  }
  {
    g_auto (Run) r = { 0 };
    g_assert_true (g_file_set_contents (future, "[framewise-parameters]\nformat=2\n", -1, NULL));
    run (&r, "params", "--params", future, NULL);
    expect_error (&r, (const char *[]) { future, "format 2", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "params", "extra", NULL);
    expect_error (&r, (const char *[]) { "too many arguments", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "params", "--no-such-option", NULL);
    expect_error (&r, (const char *[]) { "--no-such-option", NULL });
  }
}

/* ---- features ---- */

/* [npy] reads the header of an NPY file: returns the dict text, *data_offset its end */
static char *
npy_dict (const char *path, gsize *file_size, gsize *data_offset)
{
  g_autofree char *contents = NULL;
  gsize len = 0, hlen;

  g_assert_true (g_file_get_contents (path, &contents, &len, NULL));
  g_assert_cmpuint (len, >=, 10);
  g_assert_cmpmem (contents, 8, "\x93NUMPY\x01\x00", 8);
  hlen = (gsize) (guint8) contents[8] | ((gsize) (guint8) contents[9] << 8);
  g_assert_cmpuint ((10 + hlen) % 64, ==, 0);
  *file_size = len;
  *data_offset = 10 + hlen;
  return g_strstrip (g_strndup (contents + 10, hlen));
}

static void
test_features_npy (void)
{
  g_autofree char *clip = write_sine ("hum-1s.wav", SF_FORMAT_WAV | SF_FORMAT_PCM_16, 22050,
                                      22050, 220, 0.5);
  g_autofree char *out = fw_test_path (tmp_dir, "hum-power.npy");
  g_autofree char *out2 = fw_test_path (tmp_dir, "hum-mel.NPY");
  g_autofree char *dict = NULL;
  gsize size = 0, offset = 0;
  /* [cv§8] frame count, centred: 1 + floor(L / hop) */
  const gsize frames = 1 + 22050 / 512;
  /* [cv§8] not centred: 1 + floor((L - n) / hop) */
  const gsize frames_nc = 1 + (22050 - 2048) / 512;

  {
    g_auto (Run) r = { 0 };
    run (&r, "features", clip, "power", "-o", out, NULL);
    g_assert_cmpint (r.exit_code, ==, 0);
    assert_contains (r.out, "44 frames x 1025 bins");
  }
  dict = npy_dict (out, &size, &offset);
  g_assert_cmpuint (frames, ==, 44);
  g_assert_cmpstr (dict, ==, "{'descr': '<f4', 'fortran_order': False, 'shape': (44, 1025), }");
  g_assert_cmpuint (size, ==, offset + frames * 1025 * 4);
  g_clear_pointer (&dict, g_free);

  {
    g_auto (Run) r = { 0 };
    run (&r, "features", clip, "mel", "--set", "centered=false", "-o", out2, NULL);
    g_assert_cmpint (r.exit_code, ==, 0);
  }
  dict = npy_dict (out2, &size, &offset);
  g_assert_cmpuint (frames_nc, ==, 40);
  g_assert_cmpstr (dict, ==, "{'descr': '<f4', 'fortran_order': False, 'shape': (40, 128), }");
  g_assert_cmpuint (size, ==, offset + frames_nc * 128 * 4);
}

static void
test_features_csv (void)
{
  g_autofree char *clip = write_sine ("hum-csv.flac", SF_FORMAT_FLAC | SF_FORMAT_PCM_16, 22050,
                                      22050, 220, 0.5);
  g_autofree char *out = fw_test_path (tmp_dir, "hum-mfcc.csv");
  g_autofree char *text = NULL;
  g_auto (GStrv) lines = NULL;
  g_auto (Run) r = { 0 };

  run (&r, "features", clip, "mfcc", "-o", out, NULL);
  g_assert_cmpint (r.exit_code, ==, 0);
  g_assert_true (g_file_get_contents (out, &text, NULL, NULL));
  lines = g_strsplit (text, "\n", -1);
  g_assert_cmpstr (lines[0], ==, "time_s,c0,c1,c2,c3,c4,c5,c6,c7,c8,c9,c10,c11,c12");
  g_assert_cmpuint (g_strv_length (lines), ==, 1 + 44 + 1); /* [cv§8] 44 frames */
  /* each row: a time and 13 finite numbers; the first frame is centred on t = 0 */
  for (guint i = 1; i <= 44; i++)
    {
      g_auto (GStrv) cells = g_strsplit (lines[i], ",", -1);
      g_assert_cmpuint (g_strv_length (cells), ==, 14);
      for (guint k = 0; k < 14; k++)
        {
          char *end = NULL;
          double v = g_ascii_strtod (cells[k], &end);
          g_assert_true (*end == '\0' && isfinite (v));
        }
      /* [cv§8] hop 512/22050 s */
      g_assert_cmpfloat_with_epsilon (g_ascii_strtod (cells[0], NULL), (i - 1) * 512.0 / 22050.0,
                                      1e-9);
    }
}

static void
test_features_errors (void)
{
  g_autofree char *clip = write_sine ("ok.wav", SF_FORMAT_WAV | SF_FORMAT_FLOAT, 22050, 22050,
                                      220, 0.5);
  g_autofree char *shorty = write_sine ("short.wav", SF_FORMAT_WAV | SF_FORMAT_FLOAT, 22050, 1000,
                                        220, 0.5);
  g_autofree char *text = fw_test_path (tmp_dir, "readme.wav");
  g_autofree char *missing = fw_test_path (tmp_dir, "gone.wav");
  g_autofree char *out = fw_test_path (tmp_dir, "never.npy");
  g_autofree char *stereo = fw_test_path (tmp_dir, "stereo.wav");
  float st[8] = { 0.1f, 0.2f, 0.3f, 0.4f, 0.5f, 0.6f, 0.7f, 0.8f };

  g_assert_true (g_file_set_contents (text, "not audio\n", -1, NULL));
  fw_test_write_float (stereo, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 2, 22050, st, 4);

  {
    g_auto (Run) r = { 0 };
    run (&r, "features", missing, "power", "-o", out, NULL);
    expect_error (&r, (const char *[]) { missing, "no such file", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "features", text, "power", "-o", out, NULL);
    expect_error (&r, (const char *[]) { text, "not an audio file", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "features", clip, "spectrogram", "-o", out, NULL);
    expect_error (&r, (const char *[]) { "spectrogram", "mel-db", "delta2", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "features", clip, "power", NULL);
    expect_error (&r, (const char *[]) { "-o", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "features", clip, "-o", out, NULL);
    expect_error (&r, (const char *[]) { "CLIP and a STAGE", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "features", shorty, "power", "-o", out, NULL);
    expect_error (&r, (const char *[]) { shorty, "clip has 1000 samples at 22050 Hz (45.4 ms); "
                                                 "one frame needs 2048 samples", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "features", stereo, "power", "--set", "channel=3", "-o", out, NULL);
    expect_error (&r, (const char *[]) { stereo, "channel 3", "2 channels", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "features", clip, "mel", "--set", "mel_bands=abc", "-o", out, NULL);
    expect_error (&r, (const char *[]) { "mel_bands", "abc", "integer", NULL });
  }
  g_assert_false (g_file_test (out, G_FILE_TEST_EXISTS)); /* nothing written on error */
}

/* ---- info ---- */

static void
test_info_full_scale_sine (void)
{
  /* 997 Hz at 48 kHz, 1 s, amplitude 1.0 (AES17's test tone) */
  g_autofree char *clip = write_sine ("fullscale.wav", SF_FORMAT_WAV | SF_FORMAT_FLOAT, 48000,
                                      48000, 997, 1.0);
  g_autofree char *clip16 = fw_test_path (tmp_dir, "fullscale16.wav");
  g_autofree int *xi = g_new (int, 48000);
  g_auto (Run) r = { 0 }, r16 = { 0 }, p = { 0 };
  g_autofree char *hash_line = NULL;

  for (int i = 0; i < 48000; i++)
    xi[i] = (int) lrint (32767.0 * sin (2 * G_PI * 997 * i / 48000.0)) * 65536;
  fw_test_write_int (clip16, SF_FORMAT_WAV | SF_FORMAT_PCM_16, 1, 48000, xi, 48000);

  run (&r, "info", clip, "--set", "sample_rate=0", NULL);
  g_assert_cmpint (r.exit_code, ==, 0);
  assert_contains (r.out, "  format: WAV\n");
  assert_contains (r.out, "  encoding: 32-bit float\n");
  assert_contains (r.out, "  sample rate: 48000 Hz\n");
  assert_contains (r.out, "  channels: 1\n");
  assert_contains (r.out, "  bit depth: 32\n");
  assert_contains (r.out, "  duration: 1.000000 s (48000 samples per channel)\n");
  /* [cv§5] AES17: a full-scale sine reads 0 dBFS RMS, and the output says it is AES17 */
  assert_contains (r.out, "  peak: 0.00 dBFS\n");
  assert_contains (r.out, "  RMS: 0.00 dBFS (AES17");
  assert_contains (r.out, "  analysis rate: 48000 Hz (the file's rate, not resampled)\n");

  /* the parameter hash shown is the one `params` prints for the same settings */
  run (&p, "params", "--set", "sample_rate=0", NULL);
  hash_line = g_strdup_printf ("parameter hash: %s", strstr (p.out, "hash: ") + 6);
  assert_contains (r.out, hash_line);

  /* 16-bit full scale (32767/32768) reads 0.00 dBFS to two decimals, not -0.00 */
  run (&r16, "info", clip16, "--set", "sample_rate=0", NULL);
  g_assert_cmpint (r16.exit_code, ==, 0);
  assert_contains (r16.out, "  bit depth: 16\n");
  assert_contains (r16.out, "  RMS: 0.00 dBFS (AES17");
  assert_contains (r16.out, "  peak: 0.00 dBFS\n");
}

static void
test_info_analysis_facts (void)
{
  g_autofree char *clip = write_sine ("tone-22050.wav", SF_FORMAT_WAV | SF_FORMAT_FLOAT, 22050,
                                      22050, 440, 0.5);
  g_autofree char *clip44 = write_sine ("tone-44100.wav", SF_FORMAT_WAV | SF_FORMAT_FLOAT, 44100,
                                        44100, 440, 0.5);
  g_auto (Run) r = { 0 }, r44 = { 0 }, rw = { 0 };

  run (&r, "info", clip, NULL);
  g_assert_cmpint (r.exit_code, ==, 0);
  assert_contains (r.out, "  analysis rate: 22050 Hz (the file's rate, not resampled)\n");
  /* [cv§8] 2048/22050 s = 92.88 ms; 512/22050 s = 23.22 ms; 22050/512 = 43.07 frames/s */
  assert_contains (r.out, "  window: periodic hann, 2048 samples = 92.88 ms\n");
  assert_contains (r.out, "  hop: 512 samples = 23.22 ms, 43.07 frames per second\n");
  /* [cv§8] 1025 bins, 10.7666 Hz apart */
  assert_contains (r.out, "  FFT: 2048 points, 1025 bins, 10.7666 Hz per bin\n");
  /* [cv§1] Hann ENBW 1.5 bins = 1.5 * 10.7666 Hz = 16.15 Hz; HSL -31.47 dB; SL 1.42 dB */
  assert_contains (r.out, "  equivalent noise bandwidth: 1.5000 bins = 16.15 Hz\n");
  assert_contains (r.out, "  highest sidelobe: -31.47 dB\n");
  assert_contains (r.out, "  scalloping loss: 1.42 dB\n");
  /* [cv§8] 44 frames, centred */
  assert_contains (r.out, "  frames: 44 (centred");
  /* mel edges run from fmin to fmax */
  assert_contains (r.out, "edges in Hz:\n    0.0,");
  assert_contains (r.out, " 11025.0\n");
  /* sizes: frames x bins x 4 bytes */
  assert_contains (r.out, "    power: 44 x 1025 = 180400 bytes\n");
  assert_contains (r.out, "    mel, mel-db: 44 x 128 = 22528 bytes each\n");
  assert_contains (r.out, "    mfcc, delta, delta2: 44 x 13 = 2288 bytes each\n");
  assert_contains (r.out, "warnings: none\n");

  /* resampling is reported, never silent */
  run (&r44, "info", clip44, NULL);
  g_assert_cmpint (r44.exit_code, ==, 0);
  assert_contains (r44.out, "  sample rate: 44100 Hz\n");
  assert_contains (r44.out, "  analysis rate: 22050 Hz (resampled from 44100 Hz to 22050 Hz)\n");

  /* warnings are listed */
  run (&rw, "info", clip, "--set", "hop_length=4096", "--set", "window_symmetry=symmetric", NULL);
  g_assert_cmpint (rw.exit_code, ==, 0);
  assert_contains (rw.out, "warnings:\n  - hop_length 4096");
  assert_contains (rw.out, "not constant overlap-add");
  assert_contains (rw.out, "  window: symmetric hann");
}

static void
test_info_errors (void)
{
  g_autofree char *missing = fw_test_path (tmp_dir, "absent.flac");
  g_autofree char *clip = write_sine ("tone-16k.wav", SF_FORMAT_WAV | SF_FORMAT_FLOAT, 16000,
                                      16000, 440, 0.5);
  {
    g_auto (Run) r = { 0 };
    run (&r, "info", missing, NULL);
    expect_error (&r, (const char *[]) { missing, "no such file", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "info", NULL);
    expect_error (&r, (const char *[]) { "CLIP", NULL });
  }
  {
    g_auto (Run) r = { 0 };
    run (&r, "info", clip, "--set", "sample_rate=0", "--set", "fmax=11025", NULL);
    expect_error (&r, (const char *[]) { clip, "fmax 11025", "8000", NULL });
  }
}

int
main (int argc, char **argv)
{
  int status;

  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);
  cli = g_getenv ("FW_CLI");
  if (cli == NULL || !g_file_test (cli, G_FILE_TEST_IS_EXECUTABLE))
    {
      g_printerr ("FW_CLI must name the built framewise-cli\n");
      return 1;
    }
  tmp_dir = fw_test_make_dir ();

  g_test_add_func ("/fw/cli/params/default", test_params_default);
  g_test_add_func ("/fw/cli/params/set-and-file", test_params_set_and_file);
  g_test_add_func ("/fw/cli/params/errors", test_params_errors);
  g_test_add_func ("/fw/cli/features/npy", test_features_npy);
  g_test_add_func ("/fw/cli/features/csv", test_features_csv);
  g_test_add_func ("/fw/cli/features/errors", test_features_errors);
  g_test_add_func ("/fw/cli/info/full-scale-sine", test_info_full_scale_sine);
  g_test_add_func ("/fw/cli/info/analysis-facts", test_info_analysis_facts);
  g_test_add_func ("/fw/cli/info/errors", test_info_errors);

  status = g_test_run ();
  fw_test_remove_dir (tmp_dir);
  g_free (tmp_dir);
  return status;
}
