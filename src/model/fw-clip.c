/* fw-clip.c: one audio clip of a project.
 *
 * Thread-safety: the properties (path, label, notes, channel, missing) belong to the main
 * thread. The file facts and the decoded audio are shared with worker threads: they sit
 * behind `lock`, and decoding is serialised per clip by `decode_lock`, so two threads asking
 * for the same (channel, rate) get one decode and the same FwAudio.
 *
 * Decoded audio is kept "weakly": the clip holds one reference per (channel, rate), and an
 * entry that nobody else holds any more (reference count 1) is dropped by the next load, by
 * fw_clip_trim_audio() and whenever the file changes.
 */
#include "fw-config.h"

#include <errno.h>
#include <string.h>

#include <glib/gi18n.h>
#include <glib/gstdio.h>

#include "fw-clip-private.h"
#include "fw-clip.h"

typedef struct
{
  int channel;
  int sample_rate;
  char *identity;
  FwAudio *audio;
} Decoded;

struct _FwClip
{
  GObject parent_instance;

  /* Main-thread state. */
  char *label;
  char *notes;
  int channel;
  gboolean missing;
  char *last_identity;

  /* Shared with workers (under lock). */
  GMutex lock;
  GMutex decode_lock;
  char *path;
  char *display_name;
  gboolean have_info;
  FwAudioInfo info;
  char *info_identity;
  GPtrArray *decoded; /* Decoded* */
};

G_DEFINE_FINAL_TYPE (FwClip, fw_clip, G_TYPE_OBJECT)

enum {
  PROP_0,
  PROP_PATH,
  PROP_DISPLAY_NAME,
  PROP_LABEL,
  PROP_NOTES,
  PROP_CHANNEL,
  PROP_MISSING,
  N_PROPS
};

static GParamSpec *properties[N_PROPS];

static void
decoded_free (gpointer data)
{
  Decoded *d = data;

  g_free (d->identity);
  g_clear_pointer (&d->audio, fw_audio_unref);
  g_free (d);
}

static void
info_copy (const FwAudioInfo *src, FwAudioInfo *dst)
{
  *dst = *src;
  dst->path = g_strdup (src->path);
  dst->format = g_strdup (src->format);
  dst->encoding = g_strdup (src->encoding);
}

/* "path|size|mtime" of a file, or "path|missing" when it cannot be stat'ed. */
static char *
identity_for_path (const char *path)
{
  GStatBuf st;
  gint64 mtime_ns;

  if (g_stat (path, &st) != 0)
    return g_strdup_printf ("%s|missing", path);
  mtime_ns = (gint64) st.st_mtim.tv_sec * G_GINT64_CONSTANT (1000000000) + st.st_mtim.tv_nsec;
  return g_strdup_printf ("%s|%" G_GINT64_FORMAT "|%" G_GINT64_FORMAT, path,
                          (gint64) st.st_size, mtime_ns);
}

static gboolean
path_is_missing (const char *path)
{
  GStatBuf st;

  return g_stat (path, &st) != 0 || !S_ISREG (st.st_mode);
}

/* Drops cached facts and decoded audio; call with lock held. */
static void
drop_file_state_locked (FwClip *self)
{
  if (self->have_info)
    fw_audio_info_clear (&self->info);
  self->have_info = FALSE;
  g_clear_pointer (&self->info_identity, g_free);
  g_ptr_array_set_size (self->decoded, 0);
}

static void
fw_clip_finalize (GObject *object)
{
  FwClip *self = FW_CLIP (object);

  g_mutex_lock (&self->lock);
  drop_file_state_locked (self);
  g_mutex_unlock (&self->lock);
  g_clear_pointer (&self->decoded, g_ptr_array_unref);
  g_clear_pointer (&self->path, g_free);
  g_clear_pointer (&self->display_name, g_free);
  g_clear_pointer (&self->label, g_free);
  g_clear_pointer (&self->notes, g_free);
  g_clear_pointer (&self->last_identity, g_free);
  g_mutex_clear (&self->lock);
  g_mutex_clear (&self->decode_lock);

  G_OBJECT_CLASS (fw_clip_parent_class)->finalize (object);
}

static void
fw_clip_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  FwClip *self = FW_CLIP (object);

  switch (prop_id)
    {
    case PROP_PATH:
      g_value_set_string (value, self->path);
      break;
    case PROP_DISPLAY_NAME:
      g_value_set_string (value, self->display_name);
      break;
    case PROP_LABEL:
      g_value_set_string (value, self->label);
      break;
    case PROP_NOTES:
      g_value_set_string (value, self->notes);
      break;
    case PROP_CHANNEL:
      g_value_set_int (value, self->channel);
      break;
    case PROP_MISSING:
      g_value_set_boolean (value, self->missing);
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_clip_set_property (GObject *object, guint prop_id, const GValue *value, GParamSpec *pspec)
{
  FwClip *self = FW_CLIP (object);

  switch (prop_id)
    {
    case PROP_PATH:
      if (g_value_get_string (value) != NULL)
        fw_clip_set_path (self, g_value_get_string (value));
      break;
    case PROP_LABEL:
      fw_clip_set_label (self, g_value_get_string (value));
      break;
    case PROP_NOTES:
      fw_clip_set_notes (self, g_value_get_string (value));
      break;
    case PROP_CHANNEL:
      fw_clip_set_channel (self, g_value_get_int (value));
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_clip_class_init (FwClipClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->finalize = fw_clip_finalize;
  object_class->get_property = fw_clip_get_property;
  object_class->set_property = fw_clip_set_property;

  properties[PROP_PATH] =
    g_param_spec_string ("path", NULL, NULL, NULL,
                         G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_DISPLAY_NAME] =
    g_param_spec_string ("display-name", NULL, NULL, NULL,
                         G_PARAM_READABLE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_LABEL] =
    g_param_spec_string ("label", NULL, NULL, NULL,
                         G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_NOTES] =
    g_param_spec_string ("notes", NULL, NULL, NULL,
                         G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_CHANNEL] =
    g_param_spec_int ("channel", NULL, NULL, FW_CLIP_CHANNEL_FROM_PARAMS, G_MAXINT,
                      FW_CLIP_CHANNEL_FROM_PARAMS,
                      G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_MISSING] =
    g_param_spec_boolean ("missing", NULL, NULL, FALSE,
                          G_PARAM_READABLE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);

  g_object_class_install_properties (object_class, N_PROPS, properties);
}

static void
fw_clip_init (FwClip *self)
{
  g_mutex_init (&self->lock);
  g_mutex_init (&self->decode_lock);
  self->decoded = g_ptr_array_new_with_free_func (decoded_free);
  self->channel = FW_CLIP_CHANNEL_FROM_PARAMS;
  self->label = g_strdup ("");
  self->notes = g_strdup ("");
}

FwClip *
fw_clip_new (const char *path)
{
  g_return_val_if_fail (path != NULL && *path != '\0', NULL);

  return g_object_new (FW_TYPE_CLIP, "path", path, NULL);
}

const char *
fw_clip_get_path (FwClip *self)
{
  g_return_val_if_fail (FW_IS_CLIP (self), NULL);
  return self->path;
}

char *
fw_clip_dup_path (FwClip *self)
{
  char *copy;

  g_return_val_if_fail (FW_IS_CLIP (self), NULL);
  g_mutex_lock (&self->lock);
  copy = g_strdup (self->path);
  g_mutex_unlock (&self->lock);
  return copy;
}

static void
set_missing (FwClip *self, gboolean missing)
{
  if (self->missing == missing)
    return;
  self->missing = missing;
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_MISSING]);
}

void
fw_clip_set_path (FwClip *self, const char *path)
{
  g_autofree char *absolute = NULL;
  g_autofree char *identity = NULL;
  gboolean changed;

  g_return_if_fail (FW_IS_CLIP (self));
  g_return_if_fail (path != NULL && *path != '\0');

  absolute = g_canonicalize_filename (path, NULL);
  identity = identity_for_path (absolute);

  g_mutex_lock (&self->lock);
  changed = g_strcmp0 (self->path, absolute) != 0;
  if (changed || g_strcmp0 (self->last_identity, identity) != 0)
    drop_file_state_locked (self);
  if (changed)
    {
      g_free (self->path);
      self->path = g_strdup (absolute);
      g_free (self->display_name);
      self->display_name = g_path_get_basename (absolute);
    }
  g_mutex_unlock (&self->lock);

  g_free (self->last_identity);
  self->last_identity = g_steal_pointer (&identity);

  g_object_freeze_notify (G_OBJECT (self));
  if (changed)
    {
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_PATH]);
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_DISPLAY_NAME]);
    }
  set_missing (self, path_is_missing (absolute));
  g_object_thaw_notify (G_OBJECT (self));
}

const char *
fw_clip_get_label (FwClip *self)
{
  g_return_val_if_fail (FW_IS_CLIP (self), NULL);
  return self->label;
}

void
fw_clip_set_label (FwClip *self, const char *label)
{
  g_return_if_fail (FW_IS_CLIP (self));

  if (label == NULL)
    label = "";
  if (g_strcmp0 (self->label, label) == 0)
    return;
  g_free (self->label);
  self->label = g_strdup (label);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_LABEL]);
}

const char *
fw_clip_get_notes (FwClip *self)
{
  g_return_val_if_fail (FW_IS_CLIP (self), NULL);
  return self->notes;
}

void
fw_clip_set_notes (FwClip *self, const char *notes)
{
  g_return_if_fail (FW_IS_CLIP (self));

  if (notes == NULL)
    notes = "";
  if (g_strcmp0 (self->notes, notes) == 0)
    return;
  g_free (self->notes);
  self->notes = g_strdup (notes);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_NOTES]);
}

int
fw_clip_get_channel (FwClip *self)
{
  g_return_val_if_fail (FW_IS_CLIP (self), FW_CLIP_CHANNEL_FROM_PARAMS);
  return self->channel;
}

void
fw_clip_set_channel (FwClip *self, int channel)
{
  g_return_if_fail (FW_IS_CLIP (self));
  g_return_if_fail (channel >= FW_CLIP_CHANNEL_FROM_PARAMS);

  if (self->channel == channel)
    return;
  self->channel = channel;
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_CHANNEL]);
}

gboolean
fw_clip_get_missing (FwClip *self)
{
  g_return_val_if_fail (FW_IS_CLIP (self), TRUE);
  return self->missing;
}

void
fw_clip_refresh (FwClip *self)
{
  g_autofree char *path = NULL;
  g_autofree char *identity = NULL;

  g_return_if_fail (FW_IS_CLIP (self));

  path = fw_clip_dup_path (self);
  identity = identity_for_path (path);
  if (g_strcmp0 (identity, self->last_identity) != 0)
    {
      g_mutex_lock (&self->lock);
      drop_file_state_locked (self);
      g_mutex_unlock (&self->lock);
      g_free (self->last_identity);
      self->last_identity = g_steal_pointer (&identity);
    }
  set_missing (self, path_is_missing (path));
}

const char *
fw_clip_get_display_name (FwClip *self)
{
  g_return_val_if_fail (FW_IS_CLIP (self), NULL);
  return self->display_name;
}

gboolean
fw_clip_get_info (FwClip *self, FwAudioInfo *out, GError **error)
{
  g_autofree char *path = NULL;
  g_autofree char *identity = NULL;
  FwAudioInfo info = { 0 };

  g_return_val_if_fail (FW_IS_CLIP (self), FALSE);
  g_return_val_if_fail (out != NULL, FALSE);

  g_mutex_lock (&self->lock);
  path = g_strdup (self->path);
  g_mutex_unlock (&self->lock);
  identity = identity_for_path (path);

  g_mutex_lock (&self->lock);
  if (self->have_info && g_strcmp0 (self->info_identity, identity) == 0)
    {
      info_copy (&self->info, out);
      g_mutex_unlock (&self->lock);
      return TRUE;
    }
  g_mutex_unlock (&self->lock);

  /* Read without the lock (it may take a while); the first to finish stores it. */
  if (!fw_audio_read_info (path, &info, error))
    return FALSE;

  g_mutex_lock (&self->lock);
  if (g_strcmp0 (self->path, path) == 0)
    {
      if (self->have_info)
        fw_audio_info_clear (&self->info);
      info_copy (&info, &self->info);
      self->have_info = TRUE;
      g_free (self->info_identity);
      self->info_identity = g_strdup (identity);
    }
  g_mutex_unlock (&self->lock);

  *out = info;
  return TRUE;
}

char *
fw_clip_dup_identity (FwClip *self)
{
  g_autofree char *path = NULL;

  g_return_val_if_fail (FW_IS_CLIP (self), NULL);

  path = fw_clip_dup_path (self);
  return identity_for_path (path);
}

/* Drops entries only the clip holds, and those of an older file version. Lock held. */
static void
sweep_decoded_locked (FwClip *self, const char *identity)
{
  for (guint i = self->decoded->len; i > 0; i--)
    {
      Decoded *d = g_ptr_array_index (self->decoded, i - 1);

      if (g_atomic_int_get (&d->audio->ref_count) <= 1
          || (identity != NULL && g_strcmp0 (d->identity, identity) != 0))
        g_ptr_array_remove_index_fast (self->decoded, i - 1);
    }
}

FwAudio *
fw_clip_load_audio (FwClip *self, int channel, int sample_rate, GCancellable *cancellable,
                    GError **error)
{
  g_autofree char *path = NULL;
  g_autofree char *identity = NULL;
  FwAudio *audio = NULL;

  g_return_val_if_fail (FW_IS_CLIP (self), NULL);
  g_return_val_if_fail (channel >= 0, NULL);
  g_return_val_if_fail (sample_rate >= 0, NULL);

  g_mutex_lock (&self->decode_lock);

  g_mutex_lock (&self->lock);
  path = g_strdup (self->path);
  g_mutex_unlock (&self->lock);
  identity = identity_for_path (path);

  g_mutex_lock (&self->lock);
  for (guint i = 0; i < self->decoded->len; i++)
    {
      Decoded *d = g_ptr_array_index (self->decoded, i);

      if (d->channel == channel && d->sample_rate == sample_rate
          && g_strcmp0 (d->identity, identity) == 0)
        {
          audio = fw_audio_ref (d->audio);
          break;
        }
    }
  if (audio == NULL)
    sweep_decoded_locked (self, identity);
  g_mutex_unlock (&self->lock);

  if (audio == NULL)
    {
      audio = fw_audio_load (path, channel, sample_rate, cancellable, error);
      if (audio != NULL)
        {
          Decoded *d = g_new0 (Decoded, 1);

          d->channel = channel;
          d->sample_rate = sample_rate;
          d->identity = g_strdup (identity);
          d->audio = fw_audio_ref (audio);
          g_mutex_lock (&self->lock);
          g_ptr_array_add (self->decoded, d);
          g_mutex_unlock (&self->lock);
        }
    }

  g_mutex_unlock (&self->decode_lock);
  return audio;
}

void
fw_clip_trim_audio (FwClip *self)
{
  g_return_if_fail (FW_IS_CLIP (self));

  g_mutex_lock (&self->lock);
  sweep_decoded_locked (self, NULL);
  g_mutex_unlock (&self->lock);
}

guint
_fw_clip_get_n_decoded (FwClip *self)
{
  guint n;

  g_return_val_if_fail (FW_IS_CLIP (self), 0);
  g_mutex_lock (&self->lock);
  n = self->decoded->len;
  g_mutex_unlock (&self->lock);
  return n;
}

typedef struct {
  int channel;
  int rate;
} AudioRequest;

static void
load_audio_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  AudioRequest *req = task_data;
  GError *error = NULL;
  FwAudio *audio = fw_clip_load_audio (FW_CLIP (source), req->channel, req->rate, cancellable,
                                       &error);

  if (audio == NULL)
    g_task_return_error (task, error);
  else
    g_task_return_pointer (task, audio, (GDestroyNotify) fw_audio_unref);
}

void
fw_clip_load_audio_async (FwClip *self, FwParams *params, GCancellable *cancellable,
                          GAsyncReadyCallback callback, gpointer user_data)
{
  g_autoptr (GTask) task = NULL;
  AudioRequest *req;
  int channel;

  g_return_if_fail (FW_IS_CLIP (self));
  g_return_if_fail (params != NULL);

  channel = fw_clip_get_channel (self);
  req = g_new0 (AudioRequest, 1);
  req->channel = channel == FW_CLIP_CHANNEL_FROM_PARAMS ? fw_params_get_channel (params) : channel;
  req->rate = fw_params_get_sample_rate (params);
  task = g_task_new (self, cancellable, callback, user_data);
  g_task_set_source_tag (task, fw_clip_load_audio_async);
  g_task_set_task_data (task, req, g_free);
  g_task_run_in_thread (task, load_audio_thread);
}

FwAudio *
fw_clip_load_audio_finish (FwClip *self, GAsyncResult *result, GError **error)
{
  g_return_val_if_fail (g_task_is_valid (result, self), NULL);
  return g_task_propagate_pointer (G_TASK (result), error);
}
