/* test-audio.c: loading audio: formats, sample values, channel policy, levels, resampling,
 * and every loading error.
 *
 * Sources named beside the checks:
 *   [issue2]  issue 2, "Loading audio": samples as float in [-1, 1), i.e. an integer sample v
 *             of a B-bit file reads as v / 2^(B-1); mix = mean of the channels.
 *   [sf-faq]  libsndfile FAQ (Q12, from memory): reading PCM as normalised float divides by
 *             0x8000 (16-bit), i.e. by 2^(B-1); float files pass through unchanged.
 *   [cv§5]    ../shared/docs/check-values.md §5 (PUB): AES17, the RMS of a full-scale sine is
 *             0 dB FS; a full-scale square wave is +3.01 dB FS; an amplitude ratio in dB is
 *             20 log10 (halving the amplitude = -6.0206 dB).
 *   [cv§8]    check-values.md §8: a sine's RMS is A/sqrt(2).
 *   [dft]     the DFT of a sine with an integer number of periods in the block: the single-
 *             sided amplitude 2|X(f)|/N equals A exactly (any DSP text, e.g. Oppenheim &
 *             Schafer); frequency = cycles / time between first and last upward zero crossing.
 *   [soxr]    libsoxr documentation (soxr.h): SOXR_HQ is "high quality", 20-bit precision;
 *             a tone above the output Nyquist frequency is removed (stop band, from memory
 *             below -100 dB; asserted loosely at -50 dB).
 */
#include "fw-config.h"

#include <locale.h>
#include <math.h>
#include <string.h>
#include <unistd.h>

#include <glib/gstdio.h>
#include <sndfile.h>

#include "fw-audio.h"
#include "fw-test-fixtures.h"

static char *tmp_dir;

static FwAudio *
load_ok (const char *path, int channel, int rate)
{
  g_autoptr (GError) error = NULL;
  FwAudio *a = fw_audio_load (path, channel, rate, NULL, &error);

  g_assert_no_error (error);
  g_assert_nonnull (a);
  return a;
}

static void
test_wav_int16 (void)
{
  g_autofree char *path = fw_test_path (tmp_dir, "int16.wav");
  const int v16[] = { -32768, -32767, -1, 0, 1, 12345, 32767 };
  int frames[G_N_ELEMENTS (v16)];
  g_autoptr (FwAudio) a = NULL;

  for (guint i = 0; i < G_N_ELEMENTS (v16); i++)
    frames[i] = v16[i] * 65536; /* left-justified for sf_writef_int */
  fw_test_write_int (path, SF_FORMAT_WAV | SF_FORMAT_PCM_16, 1, 8000, frames, G_N_ELEMENTS (v16));

  a = load_ok (path, 0, 0);
  g_assert_cmpstr (a->info.format, ==, "WAV");
  g_assert_cmpstr (a->info.encoding, ==, "16-bit integer");
  g_assert_cmpint (a->info.bit_depth, ==, 16);
  g_assert_cmpint (a->info.sample_rate, ==, 8000);
  g_assert_cmpint (a->info.channels, ==, 1);
  g_assert_cmpint (a->info.frames, ==, G_N_ELEMENTS (v16));
  g_assert_cmpfloat_with_epsilon (a->info.duration, 7.0 / 8000.0, 1e-15);
  g_assert_cmpuint (a->n_samples, ==, G_N_ELEMENTS (v16));
  g_assert_cmpfloat (a->sample_rate, ==, 8000);
  g_assert_false (a->resampled);
  g_assert_null (fw_audio_describe_resampling (a));
  /* [issue2][sf-faq] v / 32768, exact in float */
  for (guint i = 0; i < G_N_ELEMENTS (v16); i++)
    g_assert_cmpfloat (a->samples[i], ==, (float) (v16[i] / 32768.0));
  g_assert_cmpfloat (a->samples[0], ==, -1.0f);
  g_assert_cmpfloat (a->samples[6], <, 1.0f);
  /* peak = 1.0 from the -32768 sample: 0 dBFS */
  g_assert_cmpfloat_with_epsilon (a->info.peak_dbfs, 0.0, 1e-12);
}

static void
test_wav_int24_int32 (void)
{
  g_autofree char *p24 = fw_test_path (tmp_dir, "int24.wav");
  g_autofree char *p32 = fw_test_path (tmp_dir, "int32.wav");
  const int v24[] = { -8388608, -4194304, -1, 0, 1, 3000001, 8388607 };
  const int v32[] = { G_MININT32, -123456789, -1, 0, 1, 987654321, G_MAXINT32 };
  int frames[G_N_ELEMENTS (v24)];
  g_autoptr (FwAudio) a = NULL, b = NULL;

  for (guint i = 0; i < G_N_ELEMENTS (v24); i++)
    frames[i] = v24[i] * 256;
  fw_test_write_int (p24, SF_FORMAT_WAV | SF_FORMAT_PCM_24, 1, 44100, frames, G_N_ELEMENTS (v24));
  fw_test_write_int (p32, SF_FORMAT_WAV | SF_FORMAT_PCM_32, 1, 44100, v32, G_N_ELEMENTS (v32));

  a = load_ok (p24, 0, 0);
  g_assert_cmpstr (a->info.encoding, ==, "24-bit integer");
  g_assert_cmpint (a->info.bit_depth, ==, 24);
  /* [issue2][sf-faq] v / 2^23: exact in float (24-bit mantissa) */
  for (guint i = 0; i < G_N_ELEMENTS (v24); i++)
    g_assert_cmpfloat (a->samples[i], ==, (float) (v24[i] / 8388608.0));

  b = load_ok (p32, 0, 0);
  g_assert_cmpstr (b->info.encoding, ==, "32-bit integer");
  g_assert_cmpint (b->info.bit_depth, ==, 32);
  /* [issue2] v / 2^31, to float precision (2^-24 relative) */
  for (guint i = 0; i < G_N_ELEMENTS (v32); i++)
    g_assert_cmpfloat_with_epsilon (b->samples[i], v32[i] / 2147483648.0, 1.2e-7);
}

static void
test_wav_float (void)
{
  g_autofree char *path = fw_test_path (tmp_dir, "float.wav");
  g_autofree char *pathx = fw_test_path (tmp_dir, "float-ext.wav");
  const float v[] = { -1.0f, -0.75f, -1e-6f, 0.0f, 0.25f, 0.5f, 0.999f };
  g_autoptr (FwAudio) a = NULL, b = NULL;

  fw_test_write_float (path, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 48000, v, G_N_ELEMENTS (v));
  fw_test_write_float (pathx, SF_FORMAT_WAVEX | SF_FORMAT_FLOAT, 1, 48000, v, G_N_ELEMENTS (v));
  a = load_ok (path, 0, 0);
  g_assert_cmpstr (a->info.encoding, ==, "32-bit float");
  g_assert_cmpint (a->info.bit_depth, ==, 32);
  for (guint i = 0; i < G_N_ELEMENTS (v); i++)
    g_assert_cmpfloat (a->samples[i], ==, v[i]); /* [sf-faq] float passes through */

  /* WAVE_FORMAT_EXTENSIBLE reads the same, and says so */
  b = load_ok (pathx, 0, 0);
  g_assert_cmpstr (b->info.format, ==, "WAV (extensible)");
  for (guint i = 0; i < G_N_ELEMENTS (v); i++)
    g_assert_cmpfloat (b->samples[i], ==, v[i]);
}

static void
test_flac_stereo_channels (void)
{
  g_autofree char *p16 = fw_test_path (tmp_dir, "stereo16.flac");
  g_autofree char *p24 = fw_test_path (tmp_dir, "stereo24.flac");
  enum { N = 4096 };
  g_autofree int *frames16 = g_new (int, 2 * N);
  g_autofree int *frames24 = g_new (int, 2 * N);
  int left[N], right[N];

  /* distinct channels: left a ramp, right a slower alternating pattern */
  for (int i = 0; i < N; i++)
    {
      left[i] = (i * 37) % 20000 - 10000;
      right[i] = (i % 2 ? 1 : -1) * (i % 3000);
      frames16[2 * i] = left[i] * 65536;
      frames16[2 * i + 1] = right[i] * 65536;
      frames24[2 * i] = left[i] * 256 * 256;  /* the same 16-bit values scaled into 24 bits */
      frames24[2 * i + 1] = right[i] * 256 * 256;
    }
  fw_test_write_int (p16, SF_FORMAT_FLAC | SF_FORMAT_PCM_16, 2, 22050, frames16, N);
  fw_test_write_int (p24, SF_FORMAT_FLAC | SF_FORMAT_PCM_24, 2, 22050, frames24, N);

  for (int which = 0; which < 2; which++)
    {
      const char *path = which == 0 ? p16 : p24;
      g_autoptr (FwAudio) mix = load_ok (path, 0, 0);
      g_autoptr (FwAudio) c1 = load_ok (path, 1, 0);
      g_autoptr (FwAudio) c2 = load_ok (path, 2, 0);

      g_assert_cmpstr (mix->info.format, ==, "FLAC");
      g_assert_cmpint (mix->info.bit_depth, ==, which == 0 ? 16 : 24);
      g_assert_cmpint (mix->info.channels, ==, 2);
      g_assert_cmpint (mix->info.frames, ==, N);
      g_assert_cmpint (c1->channel, ==, 1);
      g_assert_cmpint (c2->channel, ==, 2);
      for (int i = 0; i < N; i++)
        {
          /* [issue2][sf-faq] channel c = v_c / 32768; mix = mean of the two, exact in float */
          g_assert_cmpfloat (c1->samples[i], ==, (float) (left[i] / 32768.0));
          g_assert_cmpfloat (c2->samples[i], ==, (float) (right[i] / 32768.0));
          g_assert_cmpfloat_with_epsilon (mix->samples[i], (left[i] + right[i]) / 65536.0, 1e-7);
        }
    }
}

static void
test_ogg_vorbis (void)
{
  g_autofree char *path = fw_test_path (tmp_dir, "tone.ogg");
  const int fmt = SF_FORMAT_OGG | SF_FORMAT_VORBIS;
  g_autofree float *x = NULL;
  g_autoptr (FwAudio) a = NULL;

  if (!fw_test_format_ok (fmt, 1, 44100))
    {
      g_test_skip ("this libsndfile cannot write Ogg Vorbis");
      return;
    }
  x = fw_test_sine (44100, 44100, 1000, 0.5, 0);
  fw_test_write_float (path, fmt, 1, 44100, x, 44100);
  a = load_ok (path, 0, 0);
  g_assert_cmpstr (a->info.format, ==, "Ogg Vorbis");
  g_assert_cmpstr (a->info.encoding, ==, "Vorbis");
  g_assert_cmpint (a->info.bit_depth, ==, 0);
  g_assert_cmpint (a->info.sample_rate, ==, 44100);
  g_assert_cmpint (a->info.frames, ==, 44100);
  /* [cv§5] a sine of amplitude 0.5 reads 20 log10(0.5) = -6.02 dBFS (AES17); lossy coding
   * leaves it within 0.1 dB (tolerance: common practice for a perceptual codec at a pure tone) */
  g_assert_cmpfloat_with_epsilon (a->info.rms_dbfs, -6.0206, 0.1);
}

static void
test_aes17_levels (void)
{
  g_autofree char *pf = fw_test_path (tmp_dir, "fullscale-float.wav");
  g_autofree char *pi = fw_test_path (tmp_dir, "fullscale-16.wav");
  g_autofree char *ps = fw_test_path (tmp_dir, "square.wav");
  g_autofree char *ph = fw_test_path (tmp_dir, "half.wav");
  /* 997 Hz at 48 kHz for 1 s: 997 whole periods (AES17's test frequency) */
  g_autofree float *x = fw_test_sine (48000, 48000, 997, 1.0, 0);
  g_autofree float *h = fw_test_sine (48000, 48000, 997, 0.5, 0);
  g_autofree float *sq = g_new (float, 48000);
  g_autofree int *xi = g_new (int, 48000);
  FwAudioInfo info = { 0 };
  g_autoptr (GError) error = NULL;

  for (int i = 0; i < 48000; i++)
    {
      sq[i] = (i / 24) % 2 ? -1.0f : 1.0f; /* 1 kHz square, full scale */
      xi[i] = (int) lrint (32767.0 * sin (2 * G_PI * 997 * i / 48000.0)) * 65536;
    }
  fw_test_write_float (pf, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 48000, x, 48000);
  fw_test_write_int (pi, SF_FORMAT_WAV | SF_FORMAT_PCM_16, 1, 48000, xi, 48000);
  fw_test_write_float (ps, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 48000, sq, 48000);
  fw_test_write_float (ph, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 48000, h, 48000);

  /* [cv§5] AES17: a full-scale sine's RMS reads 0 dB FS; its peak is 0 dBFS too (997 and
   * 48000 are coprime, so one sample falls on the crest) */
  g_assert_true (fw_audio_read_info (pf, &info, &error));
  g_assert_no_error (error);
  g_assert_cmpfloat_with_epsilon (info.rms_dbfs, 0.0, 1e-4);
  g_assert_cmpfloat_with_epsilon (info.peak_dbfs, 0.0, 1e-4);
  g_assert_cmpint (info.frames, ==, 48000);
  fw_audio_info_clear (&info);

  /* 16-bit full scale is 32767/32768: 20 log10(32767/32768) = -0.000265 dB (quantisation) */
  g_assert_true (fw_audio_read_info (pi, &info, &error));
  g_assert_cmpfloat_with_epsilon (info.rms_dbfs, 20 * log10 (32767.0 / 32768.0), 1e-3);
  g_assert_cmpfloat_with_epsilon (info.peak_dbfs, 20 * log10 (32767.0 / 32768.0), 1e-6);
  fw_audio_info_clear (&info);

  /* [cv§5] a full-scale square wave reads +3.01 dB FS; its peak is 0 dBFS */
  g_assert_true (fw_audio_read_info (ps, &info, &error));
  g_assert_cmpfloat_with_epsilon (info.rms_dbfs, 3.0103, 1e-4);
  g_assert_cmpfloat_with_epsilon (info.peak_dbfs, 0.0, 1e-12);
  fw_audio_info_clear (&info);

  /* [cv§5] half the amplitude: -6.0206 dB in both readings */
  g_assert_true (fw_audio_read_info (ph, &info, &error));
  g_assert_cmpfloat_with_epsilon (info.rms_dbfs, -6.0206, 1e-4);
  g_assert_cmpfloat_with_epsilon (info.peak_dbfs, -6.0206, 1e-4);
  fw_audio_info_clear (&info);
}

/* [dft] single-sided amplitude of the component at freq over x[0..n-1] */
static double
dft_amplitude (const float *x, gsize n, double rate, double freq)
{
  double re = 0, im = 0;

  for (gsize i = 0; i < n; i++)
    {
      re += x[i] * cos (2 * G_PI * freq * (double) i / rate);
      im -= x[i] * sin (2 * G_PI * freq * (double) i / rate);
    }
  return 2.0 * sqrt (re * re + im * im) / (double) n;
}

/* [dft] frequency from upward zero crossings (linear interpolation) */
static double
zero_crossing_frequency (const float *x, gsize n, double rate)
{
  double first = -1, last = -1;
  int count = 0;

  for (gsize i = 1; i < n; i++)
    if (x[i - 1] < 0 && x[i] >= 0)
      {
        double t = ((double) (i - 1) + x[i - 1] / (x[i - 1] - x[i])) / rate;
        if (first < 0)
          first = t;
        last = t;
        count++;
      }
  g_assert_cmpint (count, >, 2);
  return (count - 1) / (last - first);
}

static void
test_resample (void)
{
  g_autofree char *path = fw_test_path (tmp_dir, "tone-44100.wav");
  g_autofree char *phigh = fw_test_path (tmp_dir, "high-44100.wav");
  g_autofree float *x = fw_test_sine (44100, 44100, 1000, 0.5, 0);
  g_autofree float *y = fw_test_sine (44100, 44100, 15000, 0.5, 0);
  g_autoptr (FwAudio) a = NULL, same = NULL, keep = NULL, hi = NULL;
  g_autofree char *note = NULL;
  double amp, freq;

  fw_test_write_float (path, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 44100, x, 44100);
  fw_test_write_float (phigh, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 44100, y, 44100);

  a = load_ok (path, 0, 22050);
  g_assert_true (a->resampled);
  g_assert_cmpfloat (a->sample_rate, ==, 22050);
  g_assert_cmpint (a->info.sample_rate, ==, 44100); /* the file's facts stay */
  /* 1 s stays 1 s: 22050 samples (one either way for the filter's rounding) */
  g_assert_cmpint ((int) a->n_samples, >=, 22049);
  g_assert_cmpint ((int) a->n_samples, <=, 22051);
  note = fw_audio_describe_resampling (a);
  g_assert_cmpstr (note, ==, "resampled from 44100 Hz to 22050 Hz");

  /* Away from the edges (filter transients): 17640 samples = 800 whole periods at 22050 Hz.
   * [dft] amplitude 0.5 and frequency 1000 Hz survive; [soxr] HQ pass band is flat at 1 kHz. */
  amp = dft_amplitude (a->samples + 2205, 17640, 22050, 1000);
  g_assert_cmpfloat_with_epsilon (amp, 0.5, 0.5e-3);
  freq = zero_crossing_frequency (a->samples + 2205, 17640, 22050);
  g_assert_cmpfloat_with_epsilon (freq, 1000.0, 0.01);
  /* and the signal is not delayed: phase at the segment start matches sin(2 pi f t) */
  {
    double re = 0, im = 0, phase;
    for (gsize i = 0; i < 17640; i++)
      {
        double t = (double) (i + 2205) / 22050.0;
        re += a->samples[i + 2205] * sin (2 * G_PI * 1000 * t);
        im += a->samples[i + 2205] * cos (2 * G_PI * 1000 * t);
      }
    phase = atan2 (im, re); /* 0 for an undelayed sine */
    g_assert_cmpfloat (fabs (phase), <, 0.01);
  }

  /* [soxr] a 15 kHz tone is above the new Nyquist (11025 Hz) and is removed */
  hi = load_ok (phigh, 0, 22050);
  {
    double rms = 0;
    for (gsize i = 2205; i < hi->n_samples - 2205; i++)
      rms += hi->samples[i] * hi->samples[i];
    rms = sqrt (rms / (double) (hi->n_samples - 4410));
    g_assert_cmpfloat (20 * log10 (rms / (0.5 / G_SQRT2)), <, -50.0);
  }

  /* No resampling when the rate matches or is 0. */
  same = load_ok (path, 0, 44100);
  g_assert_false (same->resampled);
  g_assert_null (fw_audio_describe_resampling (same));
  g_assert_cmpuint (same->n_samples, ==, 44100);
  keep = load_ok (path, 0, 0);
  g_assert_false (keep->resampled);
  g_assert_cmpfloat (keep->sample_rate, ==, 44100);
}

static void
assert_mentions (const GError *error, const char *const *parts)
{
  g_assert_nonnull (error);
  for (guint i = 0; parts[i] != NULL; i++)
    if (strstr (error->message, parts[i]) == NULL)
      g_error ("message \"%s\" does not mention \"%s\"", error->message, parts[i]);
}

static void
expect_load_error (const char *path, int channel, int code, const char *const *parts)
{
  g_autoptr (GError) error = NULL;
  FwAudio *a = fw_audio_load (path, channel, 0, NULL, &error);

  g_assert_null (a);
  g_assert_error (error, FW_AUDIO_ERROR, code);
  assert_mentions (error, parts);
}

static void
test_errors (void)
{
  g_autofree char *missing = fw_test_path (tmp_dir, "no-such-hive.wav");
  g_autofree char *text = fw_test_path (tmp_dir, "notes.wav");
  g_autofree char *zero_bytes = fw_test_path (tmp_dir, "zero-bytes.wav");
  g_autofree char *empty = fw_test_path (tmp_dir, "empty.wav");
  g_autofree char *nan = fw_test_path (tmp_dir, "nan.wav");
  g_autofree char *nan2 = fw_test_path (tmp_dir, "nan-stereo.wav");
  g_autofree char *stereo = fw_test_path (tmp_dir, "stereo.wav");
  g_autofree char *folder = fw_test_path (tmp_dir, "folder.wav");
  float v[1000];
  float st[8] = { 0.1f, 0.2f, 0.3f, 0.4f, 0.5f, 0.6f, 0.7f, 0.8f };

  /* missing */
  expect_load_error (missing, 0, FW_AUDIO_ERROR_MISSING,
                     (const char *[]) { missing, "no such file", NULL });
  /* a text file named .wav */
  g_assert_true (g_file_set_contents (text, "hive 3: queen piping at dusk\n", -1, NULL));
  expect_load_error (text, 0, FW_AUDIO_ERROR_NOT_AUDIO,
                     (const char *[]) { text, "not an audio file", NULL });
  /* zero bytes */
  g_assert_true (g_file_set_contents (zero_bytes, "", 0, NULL));
  expect_load_error (zero_bytes, 0, FW_AUDIO_ERROR_NOT_AUDIO, (const char *[]) { zero_bytes, NULL });
  /* a valid WAV with no samples */
  fw_test_write_float (empty, SF_FORMAT_WAV | SF_FORMAT_PCM_16, 1, 22050, NULL, 0);
  expect_load_error (empty, 0, FW_AUDIO_ERROR_EMPTY, (const char *[]) { empty, "no samples", NULL });
  /* a folder */
  g_assert_cmpint (g_mkdir (folder, 0700), ==, 0);
  expect_load_error (folder, 0, FW_AUDIO_ERROR_NOT_AUDIO, (const char *[]) { folder, "folder", NULL });

  /* NaN and infinity: counted, the first positions named in samples and seconds */
  for (int i = 0; i < 1000; i++)
    v[i] = 0.1f * (float) sin (i * 0.1);
  v[100] = NAN;
  v[101] = NAN;
  v[500] = INFINITY;
  v[900] = -INFINITY;
  fw_test_write_float (nan, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 22050, v, 1000);
  /* 100 / 22050 s = 0.004535 s; 101 -> 0.004580 s; 500 -> 0.022676 s */
  expect_load_error (nan, 0, FW_AUDIO_ERROR_NON_FINITE,
                     (const char *[]) { nan, "4 samples", "sample 100 (0.004535 s)",
                                        "sample 101 (0.004580 s)", "sample 500 (0.022676 s)",
                                        NULL });
  {
    FwAudioInfo info = { 0 };
    g_autoptr (GError) error = NULL;
    g_assert_false (fw_audio_read_info (nan, &info, &error));
    g_assert_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_NON_FINITE);
  }
  /* in a stereo file the channel is named too */
  st[5] = NAN;
  fw_test_write_float (nan2, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 2, 22050, st, 4);
  expect_load_error (nan2, 1, FW_AUDIO_ERROR_NON_FINITE,
                     (const char *[]) { "1 sample ", "sample 2 ", "channel 2", NULL });

  /* channel 3 of a stereo file */
  st[5] = 0.6f;
  fw_test_write_float (stereo, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 2, 22050, st, 4);
  expect_load_error (stereo, 3, FW_AUDIO_ERROR_CHANNEL,
                     (const char *[]) { stereo, "channel 3", "2 channels", NULL });

  /* unreadable: permission (root reads anything, so only as a normal user) */
  if (geteuid () != 0)
    {
      g_autofree char *locked = fw_test_path (tmp_dir, "locked.wav");
      fw_test_write_float (locked, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 2, 22050, st, 4);
      g_assert_cmpint (g_chmod (locked, 0), ==, 0);
      expect_load_error (locked, 0, FW_AUDIO_ERROR_UNREADABLE,
                         (const char *[]) { locked, "ermission", NULL });
      g_chmod (locked, 0600);
    }
  else
    g_test_message ("running as root: the permission case cannot be provoked");

  /* cancelled before it starts */
  {
    g_autoptr (GCancellable) c = g_cancellable_new ();
    g_autoptr (GError) error = NULL;
    g_cancellable_cancel (c);
    g_assert_null (fw_audio_load (stereo, 0, 0, c, &error));
    g_assert_error (error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  }
}

static void
test_mtime_and_memory (void)
{
  g_autofree char *path = fw_test_path (tmp_dir, "mtime.wav");
  const float v[4] = { 0.5f, -0.5f, 0.5f, -0.5f };
  g_autoptr (FwAudio) a = NULL, m = NULL;
  GStatBuf st;

  fw_test_write_float (path, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, 8000, v, 4);
  g_assert_cmpint (g_stat (path, &st), ==, 0);
  a = load_ok (path, 0, 0);
  g_assert_cmpint (a->info.mtime_us / G_USEC_PER_SEC, ==, (gint64) st.st_mtime);
  g_assert_cmpstr (a->info.path, ==, path);

  m = fw_audio_new_from_samples ("generated", v, 4, 8000);
  g_assert_cmpstr (m->info.path, ==, "generated");
  g_assert_cmpuint (m->n_samples, ==, 4);
  g_assert_cmpfloat (m->samples[1], ==, -0.5f);
  g_assert_cmpfloat (m->sample_rate, ==, 8000);
  /* [cv§5] square wave of amplitude 0.5: RMS 0.5 -> 20 log10(0.5) + 3.0103 = -3.0103 dBFS */
  g_assert_cmpfloat_with_epsilon (m->info.rms_dbfs, -3.0103, 1e-4);
  g_assert_cmpfloat_with_epsilon (m->info.peak_dbfs, -6.0206, 1e-4);
  fw_audio_ref (m);
  fw_audio_unref (m);
  g_assert_cmpint (m->ref_count, ==, 1);
}

int
main (int argc, char **argv)
{
  int status;

  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);
  tmp_dir = fw_test_make_dir ();

  g_test_add_func ("/fw/model/audio/wav-int16", test_wav_int16);
  g_test_add_func ("/fw/model/audio/wav-int24-int32", test_wav_int24_int32);
  g_test_add_func ("/fw/model/audio/wav-float-extensible", test_wav_float);
  g_test_add_func ("/fw/model/audio/flac-stereo-channels", test_flac_stereo_channels);
  g_test_add_func ("/fw/model/audio/ogg-vorbis", test_ogg_vorbis);
  g_test_add_func ("/fw/model/audio/aes17-levels", test_aes17_levels);
  g_test_add_func ("/fw/model/audio/resample-44100-22050", test_resample);
  g_test_add_func ("/fw/model/audio/errors", test_errors);
  g_test_add_func ("/fw/model/audio/mtime-and-memory", test_mtime_and_memory);

  status = g_test_run ();
  fw_test_remove_dir (tmp_dir);
  g_free (tmp_dir);
  return status;
}
