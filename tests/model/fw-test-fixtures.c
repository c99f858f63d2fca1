/* fw-test-fixtures.c: synthetic audio fixtures for the model and CLI tests. */
#include <math.h>
#include <string.h>

#include <glib/gstdio.h>
#include <sndfile.h>

#include "fw-test-fixtures.h"

char *
fw_test_make_dir (void)
{
  g_autoptr (GError) error = NULL;
  char *dir = g_dir_make_tmp ("framewise-test-XXXXXX", &error);

  g_assert_no_error (error);
  return dir;
}

void
fw_test_remove_dir (const char *dir)
{
  GDir *d = g_dir_open (dir, 0, NULL);
  const char *name;

  if (d == NULL)
    return;
  while ((name = g_dir_read_name (d)) != NULL)
    {
      g_autofree char *p = g_build_filename (dir, name, NULL);
      if (g_file_test (p, G_FILE_TEST_IS_DIR))
        fw_test_remove_dir (p);
      else
        g_unlink (p);
    }
  g_dir_close (d);
  g_rmdir (dir);
}

gboolean
fw_test_format_ok (int format, int channels, int rate)
{
  SF_INFO info = { 0 };

  info.format = format;
  info.channels = channels;
  info.samplerate = rate;
  return sf_format_check (&info) != 0;
}

static SNDFILE *
open_for_write (const char *path, int format, int channels, int rate)
{
  SF_INFO info = { 0 };
  SNDFILE *sf;

  info.format = format;
  info.channels = channels;
  info.samplerate = rate;
  sf = sf_open (path, SFM_WRITE, &info);
  if (sf == NULL)
    g_error ("cannot write fixture %s: %s", path, sf_strerror (NULL));
  return sf;
}

void
fw_test_write_float (const char *path, int format, int channels, int rate, const float *frames,
                     gsize n_frames)
{
  SNDFILE *sf = open_for_write (path, format, channels, rate);

  if (n_frames > 0)
    g_assert_cmpint (sf_writef_float (sf, frames, (sf_count_t) n_frames), ==, (sf_count_t) n_frames);
  g_assert_cmpint (sf_close (sf), ==, 0);
}

void
fw_test_write_int (const char *path, int format, int channels, int rate, const int *frames,
                   gsize n_frames)
{
  SNDFILE *sf = open_for_write (path, format, channels, rate);

  if (n_frames > 0)
    g_assert_cmpint (sf_writef_int (sf, frames, (sf_count_t) n_frames), ==, (sf_count_t) n_frames);
  g_assert_cmpint (sf_close (sf), ==, 0);
}

float *
fw_test_sine (gsize n, double rate, double freq, double amplitude, double phase)
{
  float *x = g_new (float, MAX (n, 1));

  for (gsize i = 0; i < n; i++)
    x[i] = (float) (amplitude * sin (2.0 * G_PI * freq * (double) i / rate + phase));
  return x;
}

char *
fw_test_path (const char *dir, const char *name)
{
  return g_build_filename (dir, name, NULL);
}

/* [issue2] The defaults listed in issue 2, written out in the canonical form by hand. */
const char fw_test_default_params_text[] =
  "[framewise-parameters]\n"
  "format=1\n"
  "sample_rate=22050\n"
  "channel=mix\n"
  "pre_emphasis=0\n"
  "window_length=2048\n"
  "hop_length=512\n"
  "fft_length=2048\n"
  "window=hann\n"
  "window_symmetry=periodic\n"
  "centered=true\n"
  "padding=zeros\n"
  "spectrum=power\n"
  "mel_bands=128\n"
  "mel_scale=slaney\n"
  "fmin=0\n"
  "fmax=0\n"
  "mel_weights=area\n"
  "db_reference=1\n"
  "db_floor=1e-10\n"
  "dynamic_range=0\n"
  "cepstral_count=13\n"
  "dct_norm=ortho\n"
  "lifter=0\n"
  "delta_width=2\n";
