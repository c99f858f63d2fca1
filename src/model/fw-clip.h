/* fw-clip.h: one audio clip of a project: its file, class label, channel policy and notes.
 *
 * Decoded audio is loaded lazily and shared (one decode per channel policy and rate, kept while
 * anyone holds it). A clip whose file is missing stays in the project, flagged "missing", and
 * can be relinked with fw_clip_set_path().
 */
#pragma once

#include <gio/gio.h>

#include "fw-audio.h"
#include "fw-params.h"
#include "fw-types.h"

G_BEGIN_DECLS

#define FW_TYPE_CLIP (fw_clip_get_type ())
G_DECLARE_FINAL_TYPE (FwClip, fw_clip, FW, CLIP, GObject)

/* Channel policy of a clip: follow the parameter set's `channel` key, or override it. */
#define FW_CLIP_CHANNEL_FROM_PARAMS (-1)

FwClip *fw_clip_new (const char *path);

/* Properties: "path" (absolute), "label", "notes", "channel", "missing" (read-only). */
const char *fw_clip_get_path (FwClip *self);
void fw_clip_set_path (FwClip *self, const char *path);     /* relink; rechecks "missing" */
const char *fw_clip_get_label (FwClip *self);               /* NULL or "" = no label */
void fw_clip_set_label (FwClip *self, const char *label);
const char *fw_clip_get_notes (FwClip *self);
void fw_clip_set_notes (FwClip *self, const char *notes);
int fw_clip_get_channel (FwClip *self);                     /* FW_CLIP_CHANNEL_FROM_PARAMS, 0 = mix, n */
void fw_clip_set_channel (FwClip *self, int channel);
gboolean fw_clip_get_missing (FwClip *self);
/* Re-stats the file; updates "missing" and drops decoded audio if the file changed. */
void fw_clip_refresh (FwClip *self);
/* Basename for display. */
const char *fw_clip_get_display_name (FwClip *self);

/* File facts, read on first use and kept (thread-safe). FALSE + error when unreadable. */
gboolean fw_clip_get_info (FwClip *self, FwAudioInfo *out, GError **error);
/* "path|size|mtime": identity for cache keys; changes when the file changes. */
char *fw_clip_dup_identity (FwClip *self);

/* Decoded audio for a channel policy (0 mix, n) and rate (0 = file rate). Shared: repeated
 * calls return the same FwAudio while it is alive. Thread-safe; may block while decoding. */
FwAudio *fw_clip_load_audio (FwClip *self, int channel, int sample_rate,
                             GCancellable *cancellable, GError **error);
/* Releases decoded audio that nobody but the clip holds any more. Thread-safe. */
void fw_clip_trim_audio (FwClip *self);
/* A copy of the path, safe to call from any thread (fw_clip_get_path is main-thread only). */
char *fw_clip_dup_path (FwClip *self);

/* The same off the calling thread, at the channel and rate a parameter set asks for (the clip's
 * own channel policy wins over the set's `channel` unless it is FW_CLIP_CHANNEL_FROM_PARAMS).
 * The callback runs in the caller's main context. */
void fw_clip_load_audio_async (FwClip *self, FwParams *params, GCancellable *cancellable,
                               GAsyncReadyCallback callback, gpointer user_data);
FwAudio *fw_clip_load_audio_finish (FwClip *self, GAsyncResult *result, GError **error);

G_END_DECLS
