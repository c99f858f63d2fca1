/* fw-audio.h: decoded audio, loaded with libsndfile and (only when asked) resampled with soxr.
 *
 * Samples are float in [-1, 1), one channel after the channel policy: 0 = mix (mean of the
 * channels), c >= 1 = that channel. Audio files are only ever read.
 */
#pragma once

#include <gio/gio.h>

G_BEGIN_DECLS

#define FW_AUDIO_ERROR (fw_audio_error_quark ())
GQuark fw_audio_error_quark (void);

typedef enum {
  FW_AUDIO_ERROR_MISSING,      /* no such file */
  FW_AUDIO_ERROR_UNREADABLE,   /* permission, I/O error */
  FW_AUDIO_ERROR_NOT_AUDIO,    /* libsndfile does not recognise it */
  FW_AUDIO_ERROR_EMPTY,        /* zero samples */
  FW_AUDIO_ERROR_NON_FINITE,   /* NaN or infinite samples: says how many and where */
  FW_AUDIO_ERROR_CHANNEL,      /* channel number beyond the file's channels */
  FW_AUDIO_ERROR_RESAMPLE,     /* soxr failed */
} FwAudioError;

/* File facts, independent of the analysis parameters. */
typedef struct {
  char *path;
  char *format;          /* "FLAC", "WAV", "Ogg Vorbis", ... */
  char *encoding;        /* "16-bit integer", "32-bit float", "Vorbis", ... */
  int bit_depth;         /* 0 when not meaningful (lossy, float reported as 32) */
  int sample_rate;
  int channels;
  gint64 frames;         /* per channel */
  double duration;       /* seconds */
  double peak_dbfs;      /* max |x| over all channels, dB re full scale (1.0) */
  double rms_dbfs;       /* AES17: RMS in dB re 1.0 plus 3.0103 dB (full-scale sine = 0 dBFS) */
  gint64 mtime_us;       /* file modification time, for cache keys */
} FwAudioInfo;

void fw_audio_info_clear (FwAudioInfo *info);
gboolean fw_audio_read_info (const char *path, FwAudioInfo *info, GError **error);

typedef struct _FwAudio FwAudio;
struct _FwAudio {
  /*< private >*/
  gint ref_count;
  /*< public, read-only >*/
  FwAudioInfo info;      /* the file's facts */
  float *samples;        /* n_samples mono samples at sample_rate */
  gsize n_samples;
  double sample_rate;    /* analysis rate */
  int channel;           /* policy applied: 0 = mix, else 1-based */
  gboolean resampled;    /* TRUE when sample_rate != info.sample_rate */
};

/* Loads and decodes. target_rate 0 keeps the file's rate; otherwise soxr (high quality)
 * converts, and audio->resampled says so. Errors name the file and the cause. */
FwAudio *fw_audio_load (const char *path, int channel, int target_rate,
                        GCancellable *cancellable, GError **error);
/* Wraps samples already in memory (copied); info.path = name. For tests and generators. */
FwAudio *fw_audio_new_from_samples (const char *name, const float *samples, gsize n,
                                    double sample_rate);
FwAudio *fw_audio_ref (FwAudio *audio);
void fw_audio_unref (FwAudio *audio);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwAudio, fw_audio_unref)

/* "resampled from 44100 Hz to 22050 Hz" or NULL when not resampled. */
char *fw_audio_describe_resampling (const FwAudio *audio);

G_END_DECLS
