/* fw-audio.c: decoding audio files with libsndfile (the only user of libsndfile).
 *
 * Samples are read as float with libsndfile's normalisation (SFC_SET_NORM_FLOAT): integer
 * formats map to [-1, 1) by dividing by 2^(bits-1); float files pass through unchanged.
 * The channel policy is applied while reading (0 = mean of the channels, c = channel c).
 * Peak and RMS are taken over every sample of every channel, in double precision:
 *   peak_dbfs = 20 log10(max |x|)
 *   rms_dbfs  = 10 log10(mean x^2) + 20 log10(sqrt 2)      (AES17: a full-scale sine = 0 dBFS)
 * Non-finite samples (NaN, infinity) are counted and reported; they never reach the analysis.
 */
#include "fw-config.h"

#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <string.h>

#include <glib/gi18n.h>
#include <glib/gstdio.h>
#include <sndfile.h>

#include "fw-audio.h"
#include "fw-resample.h"

G_DEFINE_QUARK (fw-audio-error-quark, fw_audio_error)

/* 20 log10(sqrt(2)): the AES17 offset between RMS re 1.0 and dB FS. */
#define FW_AES17_OFFSET_DB 3.0102999566398120

#define READ_BLOCK 16384     /* frames per sf_readf_float call */
#define MAX_REPORTED 3       /* non-finite positions named in the message */

void
fw_audio_info_clear (FwAudioInfo *info)
{
  if (info == NULL)
    return;
  g_free (info->path);
  g_free (info->format);
  g_free (info->encoding);
  memset (info, 0, sizeof *info);
}

static double
to_db (double ratio, double scale)
{
  return ratio > 0 ? scale * log10 (ratio) : -INFINITY;
}

static char *
format_name (int format)
{
  int major = format & SF_FORMAT_TYPEMASK;
  int sub = format & SF_FORMAT_SUBMASK;
  SF_FORMAT_INFO fi = { 0 };

  switch (major)
    {
    case SF_FORMAT_WAV: return g_strdup ("WAV");
    case SF_FORMAT_WAVEX: return g_strdup (_("WAV (extensible)"));
    case SF_FORMAT_RF64: return g_strdup ("RF64");
    case SF_FORMAT_W64: return g_strdup ("Wave64");
    case SF_FORMAT_AIFF: return g_strdup ("AIFF");
    case SF_FORMAT_AU: return g_strdup ("AU");
    case SF_FORMAT_CAF: return g_strdup ("CAF");
    case SF_FORMAT_FLAC: return g_strdup ("FLAC");
    case SF_FORMAT_MPEG: return g_strdup ("MP3");
    case SF_FORMAT_OGG:
      if (sub == SF_FORMAT_VORBIS)
        return g_strdup ("Ogg Vorbis");
      if (sub == SF_FORMAT_OPUS)
        return g_strdup ("Ogg Opus");
      if (sub == SF_FORMAT_FLAC)
        return g_strdup ("Ogg FLAC");
      return g_strdup ("Ogg");
    default:
      break;
    }
  fi.format = major;
  if (sf_command (NULL, SFC_GET_FORMAT_INFO, &fi, sizeof fi) == 0 && fi.name != NULL)
    return g_strdup (fi.name);
  return g_strdup_printf (_("format 0x%06x"), (unsigned) major);
}

static char *
encoding_name (int format, int *bit_depth)
{
  int sub = format & SF_FORMAT_SUBMASK;
  SF_FORMAT_INFO fi = { 0 };

  *bit_depth = 0;
  switch (sub)
    {
    case SF_FORMAT_PCM_S8: *bit_depth = 8; return g_strdup (_("8-bit integer"));
    case SF_FORMAT_PCM_U8: *bit_depth = 8; return g_strdup (_("8-bit unsigned integer"));
    case SF_FORMAT_PCM_16: *bit_depth = 16; return g_strdup (_("16-bit integer"));
    case SF_FORMAT_PCM_24: *bit_depth = 24; return g_strdup (_("24-bit integer"));
    case SF_FORMAT_PCM_32: *bit_depth = 32; return g_strdup (_("32-bit integer"));
    case SF_FORMAT_FLOAT: *bit_depth = 32; return g_strdup (_("32-bit float"));
    case SF_FORMAT_DOUBLE: *bit_depth = 64; return g_strdup (_("64-bit float"));
    case SF_FORMAT_ULAW: *bit_depth = 8; return g_strdup (_("8-bit mu-law"));
    case SF_FORMAT_ALAW: *bit_depth = 8; return g_strdup (_("8-bit A-law"));
    case SF_FORMAT_VORBIS: return g_strdup ("Vorbis");
    case SF_FORMAT_OPUS: return g_strdup ("Opus");
    case SF_FORMAT_MPEG_LAYER_I: return g_strdup ("MPEG-1 Layer I");
    case SF_FORMAT_MPEG_LAYER_II: return g_strdup ("MPEG-1 Layer II");
    case SF_FORMAT_MPEG_LAYER_III: return g_strdup ("MPEG Layer III");
    default:
      break;
    }
  fi.format = sub;
  if (sf_command (NULL, SFC_GET_FORMAT_SUBTYPE, &fi, sizeof fi) == 0 && fi.name != NULL)
    return g_strdup (fi.name);
  return g_strdup_printf (_("encoding 0x%04x"), (unsigned) sub);
}

/* Decodes path. With want_samples, *samples receives the mono signal after the channel
 * policy (channel 0 = mix). Fills info (including peak and RMS). */
static gboolean
decode (const char *path, int channel, gboolean want_samples, FwAudioInfo *info,
        float **samples, gsize *n_samples, GCancellable *cancellable, GError **error)
{
  GStatBuf st;
  SF_INFO sfi = { 0 };
  SNDFILE *sf;
  int fd;
  g_autofree float *block = NULL;
  float *mono = NULL;
  gsize cap = 0, n = 0;
  double peak = 0.0, sum_sq = 0.0;
  gsize n_values = 0, n_bad = 0;
  gint64 bad_frame[MAX_REPORTED];
  int bad_channel[MAX_REPORTED];
  g_autofree char *display = g_filename_display_name (path);

  memset (info, 0, sizeof *info);

  if (g_stat (path, &st) != 0)
    {
      int e = errno;
      if (e == ENOENT || e == ENOTDIR)
        g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_MISSING,
                     _("%s: no such file"), display);
      else
        g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_UNREADABLE,
                     _("%s: cannot read the file: %s"), display, g_strerror (e));
      return FALSE;
    }
  if (S_ISDIR (st.st_mode))
    {
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_NOT_AUDIO,
                   _("%s: is a folder, not an audio file"), display);
      return FALSE;
    }

  fd = g_open (path, O_RDONLY, 0);
  if (fd < 0)
    {
      int e = errno;
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_UNREADABLE,
                   _("%s: cannot read the file: %s"), display, g_strerror (e));
      return FALSE;
    }
  sf = sf_open_fd (fd, SFM_READ, &sfi, SF_TRUE);
  if (sf == NULL)
    {
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_NOT_AUDIO,
                   _("%s: not an audio file that libsndfile can read (%s)"), display,
                   sf_strerror (NULL));
      return FALSE;
    }

  info->path = g_strdup (path);
  info->format = format_name (sfi.format);
  info->encoding = encoding_name (sfi.format, &info->bit_depth);
  info->sample_rate = sfi.samplerate;
  info->channels = sfi.channels;
  info->mtime_us = (gint64) st.st_mtim.tv_sec * G_USEC_PER_SEC + st.st_mtim.tv_nsec / 1000;

  if (sfi.channels < 1 || sfi.samplerate < 1)
    {
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_NOT_AUDIO,
                   _("%s: the file declares %d channels at %d Hz"), display, sfi.channels,
                   sfi.samplerate);
      sf_close (sf);
      fw_audio_info_clear (info);
      return FALSE;
    }
  if (channel < 0 || channel > sfi.channels)
    {
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_CHANNEL,
                   ngettext ("%s: channel %d asked for, but the file has %d channel; use "
                             "channel=mix or channel=1",
                             "%s: channel %d asked for, but the file has %d channels; use "
                             "channel=mix or a channel from 1 to %d",
                             sfi.channels),
                   display, channel, sfi.channels, sfi.channels);
      sf_close (sf);
      fw_audio_info_clear (info);
      return FALSE;
    }

  sf_command (sf, SFC_SET_NORM_FLOAT, NULL, SF_TRUE);
  block = g_new (float, (gsize) READ_BLOCK * (gsize) sfi.channels);
  if (want_samples)
    {
      cap = sfi.frames > 0 && sfi.frames < G_MAXINT32 ? (gsize) sfi.frames : READ_BLOCK;
      mono = g_new (float, MAX (cap, 1));
    }

  for (;;)
    {
      sf_count_t got;

      if (g_cancellable_set_error_if_cancelled (cancellable, error))
        {
          g_free (mono);
          sf_close (sf);
          fw_audio_info_clear (info);
          return FALSE;
        }
      got = sf_readf_float (sf, block, READ_BLOCK);
      if (got <= 0)
        break;

      if (want_samples && n + (gsize) got > cap)
        {
          cap = MAX (cap * 2, n + (gsize) got);
          mono = g_renew (float, mono, cap);
        }
      for (sf_count_t f = 0; f < got; f++)
        {
          const float *frame = block + (gsize) f * (gsize) sfi.channels;
          double acc = 0.0;
          for (int c = 0; c < sfi.channels; c++)
            {
              double x = frame[c];
              if (!isfinite (x))
                {
                  if (n_bad < MAX_REPORTED)
                    {
                      bad_frame[n_bad] = (gint64) (n + (gsize) f);
                      bad_channel[n_bad] = c + 1;
                    }
                  n_bad++;
                  continue;
                }
              if (fabs (x) > peak)
                peak = fabs (x);
              sum_sq += x * x;
              acc += x;
            }
          n_values += (gsize) sfi.channels;
          if (want_samples)
            mono[n + (gsize) f] = channel == 0 ? (float) (acc / sfi.channels)
                                               : frame[channel - 1];
        }
      n += (gsize) got;
    }

  if (sf_error (sf) != SF_ERR_NO_ERROR)
    {
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_UNREADABLE,
                   _("%s: read error after %zu frames: %s"), display, n,
                   sf_strerror (sf));
      g_free (mono);
      sf_close (sf);
      fw_audio_info_clear (info);
      return FALSE;
    }
  sf_close (sf);

  info->frames = (gint64) n;
  info->duration = (double) n / sfi.samplerate;

  if (n == 0)
    {
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_EMPTY,
                   _("%s: the file contains no samples"), display);
      g_free (mono);
      fw_audio_info_clear (info);
      return FALSE;
    }
  if (n_bad > 0)
    {
      GString *where = g_string_new (NULL);
      for (gsize i = 0; i < MIN (n_bad, (gsize) MAX_REPORTED); i++)
        {
          char secs[G_ASCII_DTOSTR_BUF_SIZE];
          g_ascii_formatd (secs, sizeof secs, "%.6f", (double) bad_frame[i] / sfi.samplerate);
          if (where->len > 0)
            g_string_append (where, ", ");
          if (sfi.channels > 1)
            g_string_append_printf (where, _("sample %lld (%s s) of channel %d"),
                                    (long long) bad_frame[i], secs, bad_channel[i]);
          else
            g_string_append_printf (where, _("sample %lld (%s s)"),
                                    (long long) bad_frame[i], secs);
        }
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_NON_FINITE,
                   ngettext ("%s: %zu sample is not a finite number (NaN or "
                             "infinity), at %s",
                             "%s: %zu samples are not finite numbers (NaN or "
                             "infinity), first at %s",
                             n_bad),
                   display, n_bad, where->str);
      g_string_free (where, TRUE);
      g_free (mono);
      fw_audio_info_clear (info);
      return FALSE;
    }

  info->peak_dbfs = to_db (peak, 20.0);
  info->rms_dbfs = n_values > 0 && sum_sq > 0
                     ? 10.0 * log10 (sum_sq / (double) n_values) + FW_AES17_OFFSET_DB
                     : -INFINITY;

  if (want_samples)
    {
      *samples = mono;
      *n_samples = n;
    }
  return TRUE;
}

gboolean
fw_audio_read_info (const char *path, FwAudioInfo *info, GError **error)
{
  g_return_val_if_fail (path != NULL, FALSE);
  g_return_val_if_fail (info != NULL, FALSE);

  return decode (path, 0, FALSE, info, NULL, NULL, NULL, error);
}

FwAudio *
fw_audio_load (const char *path, int channel, int target_rate, GCancellable *cancellable,
               GError **error)
{
  FwAudio *audio;
  float *samples = NULL;
  gsize n = 0;

  g_return_val_if_fail (path != NULL, NULL);
  g_return_val_if_fail (target_rate >= 0, NULL);

  audio = g_new0 (FwAudio, 1);
  audio->ref_count = 1;
  if (!decode (path, channel, TRUE, &audio->info, &samples, &n, cancellable, error))
    {
      g_free (audio);
      return NULL;
    }
  audio->channel = channel;
  audio->sample_rate = audio->info.sample_rate;

  if (target_rate != 0 && target_rate != audio->info.sample_rate)
    {
      float *out = NULL;
      gsize n_out = 0;
      g_autoptr (GError) local = NULL;

      if (!fw_resample (samples, n, audio->info.sample_rate, target_rate, &out, &n_out,
                        cancellable, &local))
        {
          if (g_error_matches (local, G_IO_ERROR, G_IO_ERROR_CANCELLED))
            g_propagate_error (error, g_steal_pointer (&local));
          else
            {
              g_autofree char *display = g_filename_display_name (path);
              g_set_error (error, local->domain, local->code, "%s: %s", display, local->message);
            }
          g_free (samples);
          fw_audio_info_clear (&audio->info);
          g_free (audio);
          return NULL;
        }
      g_free (samples);
      samples = out;
      n = n_out;
      audio->sample_rate = target_rate;
      audio->resampled = TRUE;
    }
  audio->samples = samples;
  audio->n_samples = n;
  return audio;
}

FwAudio *
fw_audio_new_from_samples (const char *name, const float *samples, gsize n, double sample_rate)
{
  FwAudio *audio;
  double peak = 0.0, sum_sq = 0.0;

  g_return_val_if_fail (samples != NULL || n == 0, NULL);
  g_return_val_if_fail (sample_rate > 0, NULL);

  audio = g_new0 (FwAudio, 1);
  audio->ref_count = 1;
  audio->samples = g_new (float, MAX (n, 1));
  if (n > 0)
    memcpy (audio->samples, samples, n * sizeof (float));
  audio->n_samples = n;
  audio->sample_rate = sample_rate;
  audio->channel = 0;
  audio->resampled = FALSE;

  for (gsize i = 0; i < n; i++)
    {
      double x = samples[i];
      if (!isfinite (x))
        continue;
      if (fabs (x) > peak)
        peak = fabs (x);
      sum_sq += x * x;
    }
  audio->info.path = g_strdup (name != NULL ? name : _("(in memory)"));
  audio->info.format = g_strdup (_("in memory"));
  audio->info.encoding = g_strdup (_("32-bit float"));
  audio->info.bit_depth = 32;
  audio->info.sample_rate = (int) lround (sample_rate);
  audio->info.channels = 1;
  audio->info.frames = (gint64) n;
  audio->info.duration = (double) n / sample_rate;
  audio->info.peak_dbfs = to_db (peak, 20.0);
  audio->info.rms_dbfs = n > 0 && sum_sq > 0
                           ? 10.0 * log10 (sum_sq / (double) n) + FW_AES17_OFFSET_DB
                           : -INFINITY;
  audio->info.mtime_us = 0;
  return audio;
}

FwAudio *
fw_audio_ref (FwAudio *audio)
{
  g_return_val_if_fail (audio != NULL, NULL);
  g_atomic_int_inc (&audio->ref_count);
  return audio;
}

void
fw_audio_unref (FwAudio *audio)
{
  if (audio == NULL)
    return;
  if (g_atomic_int_dec_and_test (&audio->ref_count))
    {
      fw_audio_info_clear (&audio->info);
      g_free (audio->samples);
      g_free (audio);
    }
}

char *
fw_audio_describe_resampling (const FwAudio *audio)
{
  char rate[G_ASCII_DTOSTR_BUF_SIZE];

  g_return_val_if_fail (audio != NULL, NULL);
  if (!audio->resampled)
    return NULL;
  g_ascii_formatd (rate, sizeof rate, "%.15g", audio->sample_rate);
  return g_strdup_printf (_("resampled from %d Hz to %s Hz"), audio->info.sample_rate, rate);
}
