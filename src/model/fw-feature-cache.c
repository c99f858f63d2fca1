/* fw-feature-cache.c: computed feature matrices, shared and computed in the background.
 *
 * Design
 * ------
 * Key: "identity \x1f channel \x1f params hash \x1f stage", where identity is the clip's
 * "path|size|mtime" (fw_clip_dup_identity) and channel the effective channel policy (the
 * clip's override, else the parameter set's), so an edited file or a changed channel never
 * hits an old entry.
 *
 * Jobs form a small graph: a job computes ONE stage. A root stage (spectrum, rms, zcr) is
 * computed from the decoded audio; any other stage is derived from its parent's matrix
 * (fw_analysis_derive). A request for mfcc with nothing cached creates jobs for spectrum,
 * mel, mel-db and mfcc; each child waits on its parent as an internal waiter. Every finished
 * stage is stored, so intermediate stages are shared too, and two requests for any key in the
 * chain join the job already in flight (the `jobs` table).
 *
 * Waiters: async requests (a GTask, completed in the caller's main context), sync requests
 * (a condition variable) and child jobs. A request's GCancellable detaches only that waiter;
 * a job whose last waiter left is cancelled (its own GCancellable, which the computation
 * polls through the progress callback), and that propagates up to parents nobody else wants.
 * Invalidating a parameter hash or a clip cancels only the matching jobs (their waiters get
 * G_IO_ERROR_CANCELLED) and drops the matching entries; other jobs keep running.
 *
 * Threads: one GMutex (core->lock) guards every table. Nothing that can call back into us
 * (GTask completion, cancelling a GCancellable, user callbacks) runs with the lock held:
 * such work is collected in an Outbox and done after unlocking. Jobs run in a GThreadPool of
 * at most max_workers threads. State lives in a reference-counted Core shared by the
 * FwFeatureCache object and its jobs, so dropping the object while jobs run is safe: dispose
 * cancels everything and the last job frees the core. Signals ("progress", "computed") are
 * emitted on the main context the cache was created in, from one coalesced source.
 *
 * Memory: entries sit in an LRU list; after each insertion the least recently used ones are
 * evicted until the total fw_matrix_bytes() fits the budget (the newest entry is kept even
 * when it alone exceeds the budget, so a request always gets its answer once).
 */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-clip-private.h"
#include "fw-feature-cache.h"
#include "fw-feature.h"

typedef struct _Core Core;
typedef struct _Job Job;
typedef struct _Waiter Waiter;
typedef struct _Entry Entry;

typedef enum { WAITER_ASYNC, WAITER_SYNC, WAITER_CHILD } WaiterKind;
typedef enum { JOB_WAITING_PARENT, JOB_QUEUED, JOB_RUNNING, JOB_DONE } JobState;

struct _Waiter
{
  gint ref_count;
  WaiterKind kind;
  Core *core;              /* not a ref: waiters never outlive their request */
  Job *job;                /* the job it is attached to, NULL once detached (under lock) */
  /* WAITER_ASYNC */
  GTask *task;
  GSource *cancel_source;
  /* WAITER_SYNC and WAITER_ASYNC: the outcome */
  gboolean finished;
  FwMatrix *result;
  GError *error;
  /* WAITER_CHILD */
  Job *child;
};

struct _Job
{
  gint ref_count;
  Core *core;              /* a ref */
  char *key;
  char *identity;
  char *path;
  char *hash;
  FwClip *clip;
  FwParams *params;
  FwStage stage;
  int channel;
  JobState state;
  gboolean invalidated;    /* the result must not be stored */
  GCancellable *cancellable;
  GList *waiters;          /* Waiter*, one reference each */
  Waiter *parent_link;     /* our child waiter in the parent's list while WAITING_PARENT */
  FwMatrix *parent_matrix;
  gint permille;           /* progress, atomic */
};

struct _Entry
{
  char *key;
  char *path;
  char *hash;
  FwClip *clip;
  FwStage stage;
  FwMatrix *matrix;
  guint64 bytes;
  GList link;
};

typedef struct
{
  FwClip *clip;
  char *hash;
  FwStage stage;
} Computed;

struct _Core
{
  gint ref_count;
  GMutex lock;
  GCond cond;

  GHashTable *entries;     /* key -> Entry* (owned) */
  GQueue lru;              /* Entry*, head = most recently used */
  guint64 bytes;
  guint64 budget;

  GHashTable *jobs;        /* key -> Job* (a ref): jobs a new request may join */
  GHashTable *live;        /* Job* -> Job* (a ref): every job not yet finished executing */
  GThreadPool *pool;
  gboolean shut_down;
  gint compute_count;      /* atomic */

  GMainContext *context;
  GWeakRef owner;          /* the FwFeatureCache, read only on `context` */
  gboolean want_progress;
  gboolean want_computed;
  gboolean notify_scheduled;
  GQueue computed;         /* Computed* waiting for the notify source */
};

struct _FwFeatureCache
{
  GObject parent_instance;

  Core *core;
  guint max_workers;
};

G_DEFINE_FINAL_TYPE (FwFeatureCache, fw_feature_cache, G_TYPE_OBJECT)

enum {
  PROGRESS,
  COMPUTED,
  N_SIGNALS
};

static guint signals[N_SIGNALS];

/* Work collected under the lock, done after unlocking. */
typedef struct
{
  GPtrArray *deliver;      /* Waiter* (a ref): async waiters to complete */
  GPtrArray *cancel;       /* GCancellable* (a ref) */
  GPtrArray *sources;      /* GSource* (a ref) to destroy */
  gboolean notify;
} Outbox;

static void job_finish_locked (Core *core, Job *job, FwMatrix *result, const GError *error,
                               Outbox *out);
static void job_cancel_locked (Core *core, Job *job, Outbox *out);

/* ---------------------------------------------------------------------------------------- */
/* Small helpers                                                                            */

static void
outbox_init (Outbox *out)
{
  out->deliver = g_ptr_array_new ();
  out->cancel = g_ptr_array_new ();
  out->sources = g_ptr_array_new ();
  out->notify = FALSE;
}

static char *
make_key (const char *identity, int channel, const char *hash, FwStage stage)
{
  return g_strdup_printf ("%s\x1f%d\x1f%s\x1f%d", identity, channel, hash, (int) stage);
}

static int
effective_channel (FwClip *clip, FwParams *params)
{
  int channel = fw_clip_get_channel (clip);

  return channel >= 0 ? channel : fw_params_get_channel (params);
}

static gboolean
is_root_stage (FwStage stage)
{
  return fw_stage_parent (stage) == FW_STAGE_SIGNAL;
}

static GError *
cancelled_error (const Job *job)
{
  g_autofree char *name = g_path_get_basename (job->path);

  return g_error_new (G_IO_ERROR, G_IO_ERROR_CANCELLED,
                      _("Computing “%s” for %s was cancelled"),
                      fw_stage_name (job->stage), name);
}

static Core *
core_ref (Core *core)
{
  g_atomic_int_inc (&core->ref_count);
  return core;
}

static void
entry_free (gpointer data)
{
  Entry *e = data;

  g_free (e->key);
  g_free (e->path);
  g_free (e->hash);
  g_clear_object (&e->clip);
  g_clear_pointer (&e->matrix, fw_matrix_unref);
  g_free (e);
}

static void
computed_free (gpointer data)
{
  Computed *c = data;

  g_clear_object (&c->clip);
  g_free (c->hash);
  g_free (c);
}

static void
core_unref (Core *core)
{
  if (!g_atomic_int_dec_and_test (&core->ref_count))
    return;

  g_assert (g_hash_table_size (core->live) == 0);
  g_hash_table_unref (core->jobs);
  g_hash_table_unref (core->live);
  g_queue_init (&core->lru);   /* links live inside the entries, freed with them */
  g_hash_table_unref (core->entries);
  g_queue_clear_full (&core->computed, computed_free);
  g_weak_ref_clear (&core->owner);
  g_main_context_unref (core->context);
  g_mutex_clear (&core->lock);
  g_cond_clear (&core->cond);
  g_free (core);
}

static Waiter *
waiter_new (Core *core, WaiterKind kind)
{
  Waiter *w = g_new0 (Waiter, 1);

  w->ref_count = 1;
  w->kind = kind;
  w->core = core;
  return w;
}

static Waiter *
waiter_ref (Waiter *w)
{
  g_atomic_int_inc (&w->ref_count);
  return w;
}

static void job_unref (Job *job);

static void
waiter_unref (gpointer data)
{
  Waiter *w = data;

  if (!g_atomic_int_dec_and_test (&w->ref_count))
    return;
  g_assert (w->job == NULL);
  g_clear_object (&w->task);
  if (w->cancel_source != NULL)
    g_source_unref (w->cancel_source);
  g_clear_pointer (&w->result, fw_matrix_unref);
  g_clear_error (&w->error);
  if (w->child != NULL)
    job_unref (w->child);
  g_free (w);
}

static Job *
job_ref (Job *job)
{
  g_atomic_int_inc (&job->ref_count);
  return job;
}

static void
job_unref (Job *job)
{
  if (!g_atomic_int_dec_and_test (&job->ref_count))
    return;
  g_assert (job->waiters == NULL);
  g_assert (job->parent_link == NULL);
  g_free (job->key);
  g_free (job->identity);
  g_free (job->path);
  g_free (job->hash);
  g_clear_object (&job->clip);
  g_clear_pointer (&job->params, fw_params_unref);
  g_clear_object (&job->cancellable);
  g_clear_pointer (&job->parent_matrix, fw_matrix_unref);
  core_unref (job->core);
  g_free (job);
}

/* ---------------------------------------------------------------------------------------- */
/* Notifications on the main context                                                        */

static gboolean
notify_dispatch (gpointer data)
{
  Core *core = data;
  g_autoptr (FwFeatureCache) self = g_weak_ref_get (&core->owner);
  GQueue computed = G_QUEUE_INIT;
  guint pending;
  double fraction = 0.0;
  guint running = 0;

  g_mutex_lock (&core->lock);
  core->notify_scheduled = FALSE;
  computed = core->computed;
  g_queue_init (&core->computed);
  pending = g_hash_table_size (core->live);
  {
    GHashTableIter iter;
    gpointer key;

    g_hash_table_iter_init (&iter, core->live);
    while (g_hash_table_iter_next (&iter, &key, NULL))
      {
        Job *job = key;

        if (job->state == JOB_RUNNING)
          {
            fraction += g_atomic_int_get (&job->permille) / 1000.0;
            running++;
          }
      }
  }
  g_mutex_unlock (&core->lock);

  if (self != NULL)
    {
      for (GList *l = computed.head; l != NULL; l = l->next)
        {
          Computed *c = l->data;
          g_signal_emit (self, signals[COMPUTED], 0, c->clip, c->hash, (int) c->stage);
        }
      g_signal_emit (self, signals[PROGRESS], 0, pending, running > 0 ? fraction / running : 0.0);
    }
  g_queue_clear_full (&computed, computed_free);
  return G_SOURCE_REMOVE;
}

static void
notify_destroy (gpointer data)
{
  core_unref (data);
}

/* Lock held. */
static void
schedule_notify_locked (Core *core, Outbox *out)
{
  if (core->shut_down || core->notify_scheduled)
    return;
  if (!core->want_progress && core->computed.length == 0)
    return;
  core->notify_scheduled = TRUE;
  out->notify = TRUE;
}

/* ---------------------------------------------------------------------------------------- */
/* Outbox: the work done after unlocking                                                    */

static void
outbox_flush (Core *core, Outbox *out)
{
  for (guint i = 0; i < out->cancel->len; i++)
    {
      GCancellable *c = g_ptr_array_index (out->cancel, i);
      g_cancellable_cancel (c);
      g_object_unref (c);
    }
  for (guint i = 0; i < out->sources->len; i++)
    {
      GSource *s = g_ptr_array_index (out->sources, i);
      g_source_destroy (s);
      g_source_unref (s);
    }
  for (guint i = 0; i < out->deliver->len; i++)
    {
      Waiter *w = g_ptr_array_index (out->deliver, i);
      GTask *task = g_steal_pointer (&w->task);

      if (w->result != NULL)
        g_task_return_pointer (task, g_steal_pointer (&w->result),
                               (GDestroyNotify) fw_matrix_unref);
      else if (w->error != NULL)
        g_task_return_error (task, g_steal_pointer (&w->error));
      else
        g_task_return_new_error (task, FW_FEATURE_ERROR, FW_FEATURE_ERROR_FAILED,
                                 "%s", _("The computation ended without a result"));
      g_object_unref (task);
      waiter_unref (w);
    }
  if (out->notify)
    {
      GSource *source = g_timeout_source_new (40);

      g_source_set_priority (source, G_PRIORITY_DEFAULT_IDLE);
      g_source_set_callback (source, notify_dispatch, core_ref (core), notify_destroy);
      g_source_set_static_name (source, "[framewise] feature cache notify");
      g_source_attach (source, core->context);
      g_source_unref (source);
    }
  g_ptr_array_unref (out->deliver);
  g_ptr_array_unref (out->cancel);
  g_ptr_array_unref (out->sources);
}

/* ---------------------------------------------------------------------------------------- */
/* Entries and eviction (lock held)                                                         */

static void
entry_remove_locked (Core *core, Entry *e)
{
  g_queue_unlink (&core->lru, &e->link);
  core->bytes -= e->bytes;
  g_hash_table_remove (core->entries, e->key);   /* frees e */
}

static void
evict_locked (Core *core, Entry *keep)
{
  GList *l = core->lru.tail;

  /* Oldest first; the entry just stored stays even when it alone exceeds the budget. */
  while (core->bytes > core->budget && l != NULL)
    {
      GList *prev = l->prev;
      Entry *victim = l->data;

      if (victim != keep)
        entry_remove_locked (core, victim);
      l = prev;
    }
}

static void
entry_touch_locked (Core *core, Entry *e)
{
  g_queue_unlink (&core->lru, &e->link);
  g_queue_push_head_link (&core->lru, &e->link);
}

static void
store_locked (Core *core, Job *job, FwMatrix *m, Outbox *out)
{
  Entry *e;

  if (job->invalidated || g_hash_table_contains (core->entries, job->key))
    return;

  e = g_new0 (Entry, 1);
  e->key = g_strdup (job->key);
  e->path = g_strdup (job->path);
  e->hash = g_strdup (job->hash);
  e->clip = g_object_ref (job->clip);
  e->stage = job->stage;
  e->matrix = fw_matrix_ref (m);
  e->bytes = fw_matrix_bytes (m);
  e->link.data = e;
  g_hash_table_insert (core->entries, e->key, e);
  g_queue_push_head_link (&core->lru, &e->link);
  core->bytes += e->bytes;
  evict_locked (core, e);

  if (core->want_computed && !core->shut_down)
    {
      Computed *c = g_new0 (Computed, 1);

      c->clip = g_object_ref (job->clip);
      c->hash = g_strdup (job->hash);
      c->stage = job->stage;
      g_queue_push_tail (&core->computed, c);
      schedule_notify_locked (core, out);
    }
}

/* ---------------------------------------------------------------------------------------- */
/* Jobs (lock held unless noted)                                                            */

static void
push_locked (Core *core, Job *job, Outbox *out)
{
  g_autoptr (GError) error = NULL;

  if (core->shut_down)
    {
      /* Only reachable while the cache is being disposed. */
      g_autoptr (GError) cancelled = cancelled_error (job);
      job_finish_locked (core, job, NULL, cancelled, out);
      return;
    }
  job->state = JOB_QUEUED;
  /* On failure to start a new thread GLib still queues the job for the existing ones. */
  if (!g_thread_pool_push (core->pool, job_ref (job), &error))
    g_warning ("Feature cache: %s", error->message);
}

static void
live_remove_locked (Core *core, Job *job, Outbox *out)
{
  g_hash_table_remove (core->live, job);   /* drops the live ref; caller holds another */
  schedule_notify_locked (core, out);
}

static void
attach_locked (Job *job, Waiter *w)
{
  g_assert (w->job == NULL);
  w->job = job;
  job->waiters = g_list_append (job->waiters, w);   /* the list owns the caller's ref */
}

/* Removes w from its job. Returns TRUE when it was attached (the caller then owns the
 * outcome). A job left with no waiter is cancelled. */
static gboolean
waiter_detach_locked (Core *core, Waiter *w, Outbox *out)
{
  Job *job = w->job;

  if (job == NULL)
    return FALSE;
  job->waiters = g_list_remove (job->waiters, w);
  w->job = NULL;
  waiter_unref (w);                                  /* the list's ref */
  if (job->waiters == NULL && job->state != JOB_DONE)
    job_cancel_locked (core, job, out);
  return TRUE;
}

static void
job_cancel_locked (Core *core, Job *job, Outbox *out)
{
  g_autoptr (GError) error = NULL;

  if (job->state == JOB_DONE)
    return;
  g_ptr_array_add (out->cancel, g_object_ref (job->cancellable));
  error = cancelled_error (job);
  job_finish_locked (core, job, NULL, error, out);
}

/* Marks the job done and hands result or error to every waiter. For a job that is queued or
 * running, the worker still holds it and drops it when it gets there. */
static void
job_finish_locked (Core *core, Job *job, FwMatrix *result, const GError *error, Outbox *out)
{
  JobState previous = job->state;
  GList *waiters;
  gboolean wake = FALSE;

  if (previous == JOB_DONE)
    return;
  job_ref (job);
  job->state = JOB_DONE;

  if (g_hash_table_lookup (core->jobs, job->key) == job)
    g_hash_table_remove (core->jobs, job->key);

  if (job->parent_link != NULL)
    {
      Waiter *link = g_steal_pointer (&job->parent_link);

      waiter_detach_locked (core, link, out);
    }

  waiters = g_steal_pointer (&job->waiters);
  for (GList *l = waiters; l != NULL; l = l->next)
    {
      Waiter *w = l->data;

      w->job = NULL;
      switch (w->kind)
        {
        case WAITER_ASYNC:
          if (result != NULL)
            w->result = fw_matrix_ref (result);
          else
            w->error = error != NULL ? g_error_copy (error) : NULL;
          w->finished = TRUE;
          if (w->cancel_source != NULL)
            g_ptr_array_add (out->sources, g_steal_pointer (&w->cancel_source));
          g_ptr_array_add (out->deliver, w);               /* takes the list's ref */
          break;

        case WAITER_SYNC:
          if (result != NULL)
            w->result = fw_matrix_ref (result);
          else
            w->error = error != NULL ? g_error_copy (error) : NULL;
          w->finished = TRUE;
          wake = TRUE;
          waiter_unref (w);
          break;

        case WAITER_CHILD:
          {
            Job *child = w->child;

            child->parent_link = NULL;
            if (child->state == JOB_WAITING_PARENT)
              {
                if (result != NULL)
                  {
                    child->parent_matrix = fw_matrix_ref (result);
                    push_locked (core, child, out);
                  }
                else
                  {
                    job_finish_locked (core, child, NULL, error, out);
                  }
              }
            waiter_unref (w);
          }
          break;

        default:
          g_assert_not_reached ();
        }
    }
  g_list_free (waiters);
  if (wake)
    g_cond_broadcast (&core->cond);

  /* A job that never reached the pool ends here; queued and running ones end in job_run. */
  if (previous == JOB_WAITING_PARENT)
    live_remove_locked (core, job, out);
  job_unref (job);
}

/* The job computing (clip, params, stage), or NULL with *cached set when the entry exists. */
static Job *
ensure_job_locked (Core *core, FwClip *clip, const char *identity, const char *path,
                   FwParams *params, FwStage stage, int channel, FwMatrix **cached, Outbox *out)
{
  g_autofree char *key = make_key (identity, channel, fw_params_get_hash (params), stage);
  Entry *e;
  Job *job;

  e = g_hash_table_lookup (core->entries, key);
  if (e != NULL)
    {
      entry_touch_locked (core, e);
      *cached = fw_matrix_ref (e->matrix);
      return NULL;
    }
  job = g_hash_table_lookup (core->jobs, key);
  if (job != NULL)
    return job;

  job = g_new0 (Job, 1);
  job->ref_count = 1;
  job->core = core_ref (core);
  job->key = g_steal_pointer (&key);
  job->identity = g_strdup (identity);
  job->path = g_strdup (path);
  job->hash = g_strdup (fw_params_get_hash (params));
  job->clip = g_object_ref (clip);
  job->params = fw_params_ref (params);
  job->stage = stage;
  job->channel = channel;
  job->cancellable = g_cancellable_new ();
  job->state = JOB_WAITING_PARENT;

  g_hash_table_insert (core->jobs, job->key, job);          /* the table's ref */
  g_hash_table_insert (core->live, job, job_ref (job));     /* the live set's ref */
  schedule_notify_locked (core, out);

  if (is_root_stage (stage))
    {
      push_locked (core, job, out);
    }
  else
    {
      FwMatrix *parent_matrix = NULL;
      Job *parent = ensure_job_locked (core, clip, identity, path, params,
                                       fw_stage_parent (stage), channel, &parent_matrix, out);

      if (parent == NULL)
        {
          job->parent_matrix = parent_matrix;
          push_locked (core, job, out);
        }
      else
        {
          Waiter *w = waiter_new (core, WAITER_CHILD);

          w->child = job_ref (job);
          attach_locked (parent, w);
          job->parent_link = w;
        }
    }
  return job;
}

/* ---------------------------------------------------------------------------------------- */
/* Worker                                                                                   */

static int
job_progress (double fraction, void *user_data)
{
  Job *job = user_data;
  Core *core = job->core;
  Outbox out;
  int permille = (int) CLAMP (fraction * 1000.0, 0.0, 1000.0);

  if (g_atomic_int_get (&job->permille) != permille)
    {
      g_atomic_int_set (&job->permille, permille);
      if (core->want_progress)
        {
          outbox_init (&out);
          g_mutex_lock (&core->lock);
          schedule_notify_locked (core, &out);
          g_mutex_unlock (&core->lock);
          outbox_flush (core, &out);
        }
    }
  return g_cancellable_is_cancelled (job->cancellable) ? 1 : 0;
}

static FwMatrix *
job_compute (Job *job, FwMatrix *parent, GError **error)
{
  FwMatrix *result = NULL;

  if (parent == NULL)
    {
      g_autoptr (FwAudio) audio = NULL;

      audio = fw_clip_load_audio (job->clip, job->channel, fw_params_get_sample_rate (job->params),
                                  job->cancellable, error);
      if (audio != NULL)
        result = fw_feature_compute (audio, job->params, job->stage, 1, job_progress, job,
                                     job->cancellable, error);
      g_clear_pointer (&audio, fw_audio_unref);
      fw_clip_trim_audio (job->clip);
    }
  else
    {
      FwAnalysisConfig cfg;
      FwDspStatus status;

      fw_params_fill_config (job->params, parent->sample_rate, &cfg);
      status = fw_analysis_derive (&cfg, job->stage, parent, &result);
      if (status != FW_DSP_OK)
        {
          g_autofree char *name = g_path_get_basename (job->path);

          result = NULL;
          g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_FAILED,
                       _("Computing “%s” for %s failed: %s"), fw_stage_name (job->stage), name,
                       fw_dsp_status_describe (status));
        }
      else
        {
          gsize n_bad = 0;

          /* As fw_feature_compute does: never hand out a non-finite value. */
          for (gsize i = 0; i < result->n_frames * result->n_bins; i++)
            if (!isfinite (result->data[i]))
              n_bad++;
          if (n_bad > 0)
            {
              g_autofree char *name = g_path_get_basename (job->path);

              g_clear_pointer (&result, fw_matrix_unref);
              g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_FAILED,
                           _("Computing “%s” for %s gave %zu values that are "
                             "not finite numbers (an internal error; please report it)"),
                           fw_stage_name (job->stage), name, n_bad);
            }
          g_atomic_int_set (&job->permille, 1000);
        }
    }
  return result;
}

static void
job_run (gpointer data, gpointer user_data)
{
  Job *job = data;
  Core *core = job->core;
  g_autoptr (GError) error = NULL;
  FwMatrix *parent = NULL;
  FwMatrix *result = NULL;
  Outbox out;

  outbox_init (&out);
  g_mutex_lock (&core->lock);
  if (job->state != JOB_DONE && g_cancellable_is_cancelled (job->cancellable))
    job_cancel_locked (core, job, &out);
  if (job->state == JOB_DONE)
    {
      live_remove_locked (core, job, &out);
      g_mutex_unlock (&core->lock);
      outbox_flush (core, &out);
      job_unref (job);
      return;
    }
  job->state = JOB_RUNNING;
  if (job->parent_matrix != NULL)
    parent = fw_matrix_ref (job->parent_matrix);
  schedule_notify_locked (core, &out);
  g_mutex_unlock (&core->lock);
  outbox_flush (core, &out);

  result = job_compute (job, parent, &error);
  g_clear_pointer (&parent, fw_matrix_unref);
  if (result != NULL)
    g_atomic_int_inc (&core->compute_count);
  else if (g_cancellable_is_cancelled (job->cancellable))
    {
      g_clear_error (&error);
      error = cancelled_error (job);
    }

  outbox_init (&out);
  g_mutex_lock (&core->lock);
  if (result != NULL)
    store_locked (core, job, result, &out);
  if (job->state != JOB_DONE)
    job_finish_locked (core, job, result, error, &out);
  live_remove_locked (core, job, &out);
  g_mutex_unlock (&core->lock);
  outbox_flush (core, &out);

  g_clear_pointer (&result, fw_matrix_unref);
  job_unref (job);
}

/* ---------------------------------------------------------------------------------------- */
/* GObject                                                                                  */

static void
fw_feature_cache_dispose (GObject *object)
{
  FwFeatureCache *self = FW_FEATURE_CACHE (object);
  Core *core = self->core;

  if (core != NULL && !core->shut_down)
    {
      Outbox out;
      g_autoptr (GPtrArray) jobs = g_ptr_array_new_with_free_func ((GDestroyNotify) job_unref);
      GHashTableIter iter;
      gpointer key;
      GThreadPool *pool;

      outbox_init (&out);
      g_mutex_lock (&core->lock);
      g_hash_table_iter_init (&iter, core->live);
      while (g_hash_table_iter_next (&iter, &key, NULL))
        g_ptr_array_add (jobs, job_ref (key));
      for (guint i = 0; i < jobs->len; i++)
        {
          Job *job = g_ptr_array_index (jobs, i);

          job->invalidated = TRUE;
          job_cancel_locked (core, job, &out);
        }
      core->shut_down = TRUE;
      pool = g_steal_pointer (&core->pool);
      g_mutex_unlock (&core->lock);
      outbox_flush (core, &out);

      /* Queued jobs are all done by now; each worker drops its job quickly. Do not wait:
       * dispose may run on any thread, and jobs hold the core alive by themselves. */
      g_thread_pool_free (pool, FALSE, FALSE);
    }

  G_OBJECT_CLASS (fw_feature_cache_parent_class)->dispose (object);
}

static void
fw_feature_cache_finalize (GObject *object)
{
  FwFeatureCache *self = FW_FEATURE_CACHE (object);

  g_clear_pointer (&self->core, core_unref);

  G_OBJECT_CLASS (fw_feature_cache_parent_class)->finalize (object);
}

static void
fw_feature_cache_class_init (FwFeatureCacheClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->dispose = fw_feature_cache_dispose;
  object_class->finalize = fw_feature_cache_finalize;

  /* (guint pending_jobs, gdouble mean fraction done of the running jobs) */
  signals[PROGRESS] =
    g_signal_new ("progress", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 2, G_TYPE_UINT, G_TYPE_DOUBLE);
  /* (FwClip *clip, gchar *params_hash, gint stage): an entry landed in the cache. */
  signals[COMPUTED] =
    g_signal_new ("computed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 3, FW_TYPE_CLIP, G_TYPE_STRING, G_TYPE_INT);
}

static void
fw_feature_cache_init (FwFeatureCache *self)
{
}

FwFeatureCache *
fw_feature_cache_new (guint64 budget_bytes, guint max_workers)
{
  FwFeatureCache *self = g_object_new (FW_TYPE_FEATURE_CACHE, NULL);
  Core *core = g_new0 (Core, 1);

  if (max_workers == 0)
    max_workers = MAX (1, g_get_num_processors ());
  self->max_workers = max_workers;

  core->ref_count = 1;
  g_mutex_init (&core->lock);
  g_cond_init (&core->cond);
  core->entries = g_hash_table_new_full (g_str_hash, g_str_equal, NULL, entry_free);
  g_queue_init (&core->lru);
  core->budget = budget_bytes;
  core->jobs = g_hash_table_new_full (g_str_hash, g_str_equal, NULL, (GDestroyNotify) job_unref);
  core->live = g_hash_table_new_full (NULL, NULL, NULL, (GDestroyNotify) job_unref);
  core->pool = g_thread_pool_new (job_run, NULL, (int) max_workers, FALSE, NULL);
  core->context = g_main_context_ref_thread_default ();
  g_weak_ref_init (&core->owner, self);
  g_queue_init (&core->computed);
  self->core = core;
  return self;
}

void
fw_feature_cache_set_budget (FwFeatureCache *self, guint64 budget_bytes)
{
  Core *core;

  g_return_if_fail (FW_IS_FEATURE_CACHE (self));

  core = self->core;
  g_mutex_lock (&core->lock);
  core->budget = budget_bytes;
  evict_locked (core, NULL);
  g_mutex_unlock (&core->lock);
}

guint64
fw_feature_cache_get_bytes (FwFeatureCache *self)
{
  guint64 bytes;

  g_return_val_if_fail (FW_IS_FEATURE_CACHE (self), 0);

  g_mutex_lock (&self->core->lock);
  bytes = self->core->bytes;
  g_mutex_unlock (&self->core->lock);
  return bytes;
}

FwMatrix *
fw_feature_cache_lookup (FwFeatureCache *self, FwClip *clip, FwParams *params, FwStage stage)
{
  g_autofree char *identity = NULL;
  g_autofree char *key = NULL;
  FwMatrix *m = NULL;
  Entry *e;

  g_return_val_if_fail (FW_IS_FEATURE_CACHE (self), NULL);
  g_return_val_if_fail (FW_IS_CLIP (clip), NULL);
  g_return_val_if_fail (params != NULL, NULL);

  identity = fw_clip_dup_identity (clip);
  key = make_key (identity, effective_channel (clip, params), fw_params_get_hash (params), stage);
  g_mutex_lock (&self->core->lock);
  e = g_hash_table_lookup (self->core->entries, key);
  if (e != NULL)
    {
      entry_touch_locked (self->core, e);
      m = fw_matrix_ref (e->matrix);
    }
  g_mutex_unlock (&self->core->lock);
  return m;
}

/* Refreshes whether anyone listens, so workers only schedule notifications when useful.
 * Handlers connected later take effect from the next request on. */
static void
refresh_wants_locked (FwFeatureCache *self)
{
  self->core->want_progress = g_signal_has_handler_pending (self, signals[PROGRESS], 0, TRUE);
  self->core->want_computed = g_signal_has_handler_pending (self, signals[COMPUTED], 0, TRUE);
}

static gboolean
on_async_cancelled (GCancellable *cancellable, gpointer data)
{
  Waiter *w = data;
  Core *core = w->core;
  Outbox out;

  outbox_init (&out);
  g_mutex_lock (&core->lock);
  if (waiter_detach_locked (core, w, &out))
    {
      w->finished = TRUE;
      w->error = g_error_new_literal (G_IO_ERROR, G_IO_ERROR_CANCELLED,
                                      _("The request was cancelled"));
      g_ptr_array_add (out.deliver, waiter_ref (w));
    }
  if (w->cancel_source != NULL)
    g_ptr_array_add (out.sources, g_steal_pointer (&w->cancel_source));
  g_mutex_unlock (&core->lock);
  outbox_flush (core, &out);
  return G_SOURCE_REMOVE;
}

static gboolean
check_arguments (FwClip *clip, FwParams *params, FwStage stage, GError **error)
{
  if (stage < 0 || stage >= FW_N_STAGES)
    {
      g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_STAGE,
                   _("Unknown stage number %d"), (int) stage);
      return FALSE;
    }
  return TRUE;
}

void
fw_feature_cache_request_async (FwFeatureCache *self, FwClip *clip, FwParams *params,
                                FwStage stage, GCancellable *cancellable,
                                GAsyncReadyCallback callback, gpointer user_data)
{
  g_autoptr (GTask) task = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *identity = NULL;
  g_autofree char *path = NULL;
  Core *core;
  FwMatrix *cached = NULL;
  Job *job;
  Outbox out;

  g_return_if_fail (FW_IS_FEATURE_CACHE (self));
  g_return_if_fail (FW_IS_CLIP (clip));
  g_return_if_fail (params != NULL);
  g_return_if_fail (cancellable == NULL || G_IS_CANCELLABLE (cancellable));

  core = self->core;
  task = g_task_new (self, cancellable, callback, user_data);
  g_task_set_source_tag (task, fw_feature_cache_request_async);
  g_task_set_name (task, "[framewise] feature cache request");

  if (!check_arguments (clip, params, stage, &error))
    {
      g_task_return_error (task, g_steal_pointer (&error));
      return;
    }
  if (g_task_return_error_if_cancelled (task))
    return;

  identity = fw_clip_dup_identity (clip);
  path = fw_clip_dup_path (clip);

  outbox_init (&out);
  g_mutex_lock (&core->lock);
  refresh_wants_locked (self);
  job = ensure_job_locked (core, clip, identity, path, params, stage,
                           effective_channel (clip, params), &cached, &out);
  if (job != NULL)
    {
      Waiter *w = waiter_new (core, WAITER_ASYNC);

      w->task = g_object_ref (task);
      attach_locked (job, w);
      if (cancellable != NULL)
        {
          w->cancel_source = g_cancellable_source_new (cancellable);
          g_source_set_callback (w->cancel_source, G_SOURCE_FUNC (on_async_cancelled),
                                 waiter_ref (w), waiter_unref);
          g_source_set_static_name (w->cancel_source, "[framewise] feature request cancel");
          g_source_attach (w->cancel_source, g_task_get_context (task));
        }
    }
  g_mutex_unlock (&core->lock);
  outbox_flush (core, &out);

  if (job == NULL)
    g_task_return_pointer (task, cached, (GDestroyNotify) fw_matrix_unref);
}

FwMatrix *
fw_feature_cache_request_finish (FwFeatureCache *self, GAsyncResult *result, GError **error)
{
  g_return_val_if_fail (FW_IS_FEATURE_CACHE (self), NULL);
  g_return_val_if_fail (g_task_is_valid (result, self), NULL);
  g_return_val_if_fail (g_task_get_source_tag (G_TASK (result)) == fw_feature_cache_request_async,
                        NULL);

  return g_task_propagate_pointer (G_TASK (result), error);
}

static void
on_sync_cancelled (GCancellable *cancellable, gpointer data)
{
  Waiter *w = data;
  Core *core = w->core;
  Outbox out;

  outbox_init (&out);
  g_mutex_lock (&core->lock);
  if (waiter_detach_locked (core, w, &out))
    {
      w->finished = TRUE;
      w->error = g_error_new_literal (G_IO_ERROR, G_IO_ERROR_CANCELLED,
                                      _("The request was cancelled"));
      g_cond_broadcast (&core->cond);
    }
  g_mutex_unlock (&core->lock);
  outbox_flush (core, &out);
}

FwMatrix *
fw_feature_cache_request_sync (FwFeatureCache *self, FwClip *clip, FwParams *params,
                               FwStage stage, GCancellable *cancellable, GError **error)
{
  g_autofree char *identity = NULL;
  g_autofree char *path = NULL;
  Core *core;
  FwMatrix *cached = NULL;
  FwMatrix *result = NULL;
  Waiter *w = NULL;
  Job *job;
  gulong handler = 0;
  Outbox out;

  g_return_val_if_fail (FW_IS_FEATURE_CACHE (self), NULL);
  g_return_val_if_fail (FW_IS_CLIP (clip), NULL);
  g_return_val_if_fail (params != NULL, NULL);
  g_return_val_if_fail (error == NULL || *error == NULL, NULL);

  if (!check_arguments (clip, params, stage, error))
    return NULL;
  if (g_cancellable_set_error_if_cancelled (cancellable, error))
    return NULL;

  core = self->core;
  identity = fw_clip_dup_identity (clip);
  path = fw_clip_dup_path (clip);

  outbox_init (&out);
  g_mutex_lock (&core->lock);
  refresh_wants_locked (self);
  job = ensure_job_locked (core, clip, identity, path, params, stage,
                           effective_channel (clip, params), &cached, &out);
  if (job != NULL)
    {
      w = waiter_new (core, WAITER_SYNC);
      attach_locked (job, waiter_ref (w));   /* one ref for the list, one for us */
    }
  g_mutex_unlock (&core->lock);
  outbox_flush (core, &out);

  if (job == NULL)
    return cached;

  /* May run on_sync_cancelled right here when already cancelled (lock not held). */
  if (cancellable != NULL)
    handler = g_cancellable_connect (cancellable, G_CALLBACK (on_sync_cancelled), w, NULL);

  g_mutex_lock (&core->lock);
  while (!w->finished)
    g_cond_wait (&core->cond, &core->lock);
  result = g_steal_pointer (&w->result);
  if (result == NULL)
    {
      if (w->error != NULL)
        g_propagate_error (error, g_steal_pointer (&w->error));
      else
        g_set_error_literal (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_FAILED,
                             _("The computation ended without a result"));
    }
  g_mutex_unlock (&core->lock);

  /* Waits for a handler running in another thread; it finds w detached and returns. */
  if (handler != 0)
    g_cancellable_disconnect (cancellable, handler);
  waiter_unref (w);
  return result;
}

/* Jobs and entries matching a predicate. */
typedef gboolean (*MatchFunc) (const char *path, const char *hash, FwClip *clip,
                               gconstpointer data);

static gboolean
match_hash (const char *path, const char *hash, FwClip *clip, gconstpointer data)
{
  return g_strcmp0 (hash, data) == 0;
}

typedef struct
{
  FwClip *clip;
  const char *path;
} ClipMatch;

static gboolean
match_clip (const char *path, const char *hash, FwClip *clip, gconstpointer data)
{
  const ClipMatch *m = data;

  return clip == m->clip || g_strcmp0 (path, m->path) == 0;
}

static gboolean
match_all (const char *path, const char *hash, FwClip *clip, gconstpointer data)
{
  return TRUE;
}

static void
drop_matching (FwFeatureCache *self, MatchFunc match, gconstpointer data,
               gboolean drop_entries)
{
  Core *core = self->core;
  g_autoptr (GPtrArray) jobs = g_ptr_array_new_with_free_func ((GDestroyNotify) job_unref);
  GHashTableIter iter;
  gpointer key, value;
  Outbox out;

  outbox_init (&out);
  g_mutex_lock (&core->lock);
  if (drop_entries)
    {
      g_hash_table_iter_init (&iter, core->entries);
      while (g_hash_table_iter_next (&iter, &key, &value))
        {
          Entry *e = value;

          if (match (e->path, e->hash, e->clip, data))
            {
              g_queue_unlink (&core->lru, &e->link);
              core->bytes -= e->bytes;
              g_hash_table_iter_remove (&iter);
            }
        }
    }
  g_hash_table_iter_init (&iter, core->live);
  while (g_hash_table_iter_next (&iter, &key, NULL))
    {
      Job *job = key;

      if (match (job->path, job->hash, job->clip, data))
        g_ptr_array_add (jobs, job_ref (job));
    }
  for (guint i = 0; i < jobs->len; i++)
    {
      Job *job = g_ptr_array_index (jobs, i);

      if (drop_entries)
        job->invalidated = TRUE;
      job_cancel_locked (core, job, &out);
    }
  g_mutex_unlock (&core->lock);
  outbox_flush (core, &out);
}

void
fw_feature_cache_invalidate_params (FwFeatureCache *self, const char *params_hash)
{
  g_return_if_fail (FW_IS_FEATURE_CACHE (self));
  g_return_if_fail (params_hash != NULL);

  drop_matching (self, match_hash, params_hash, TRUE);
}

void
fw_feature_cache_cancel_params (FwFeatureCache *self, const char *params_hash)
{
  g_return_if_fail (FW_IS_FEATURE_CACHE (self));
  g_return_if_fail (params_hash != NULL);

  drop_matching (self, match_hash, params_hash, FALSE);
}

void
fw_feature_cache_invalidate_clip (FwFeatureCache *self, FwClip *clip)
{
  g_autofree char *path = NULL;
  ClipMatch m;

  g_return_if_fail (FW_IS_FEATURE_CACHE (self));
  g_return_if_fail (FW_IS_CLIP (clip));

  path = fw_clip_dup_path (clip);
  m.clip = clip;
  m.path = path;
  drop_matching (self, match_clip, &m, TRUE);
}

void
fw_feature_cache_clear (FwFeatureCache *self)
{
  g_return_if_fail (FW_IS_FEATURE_CACHE (self));

  drop_matching (self, match_all, NULL, TRUE);
}

guint
fw_feature_cache_get_compute_count (FwFeatureCache *self)
{
  g_return_val_if_fail (FW_IS_FEATURE_CACHE (self), 0);
  return (guint) g_atomic_int_get (&self->core->compute_count);
}

guint
fw_feature_cache_get_pending (FwFeatureCache *self)
{
  guint n;

  g_return_val_if_fail (FW_IS_FEATURE_CACHE (self), 0);

  g_mutex_lock (&self->core->lock);
  n = g_hash_table_size (self->core->live);
  g_mutex_unlock (&self->core->lock);
  return n;
}

guint
fw_feature_cache_get_n_entries (FwFeatureCache *self)
{
  guint n;

  g_return_val_if_fail (FW_IS_FEATURE_CACHE (self), 0);

  g_mutex_lock (&self->core->lock);
  n = g_hash_table_size (self->core->entries);
  g_mutex_unlock (&self->core->lock);
  return n;
}
