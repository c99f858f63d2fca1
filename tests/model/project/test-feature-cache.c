/* test-feature-cache.c: the feature cache: shared computations, intermediate stages,
 * cancellation, LRU eviction, invalidation by parameter hash and by clip, signals on the
 * main context, and the project's reaction to an edited parameter set.
 *
 * Fixture audio: noise from a fixed-seed generator written as WAV into a temporary folder.
 * "Long" jobs use a tiny hop (4 samples) so that a full computation would take seconds:
 * cancelling them must stop the work before it completes (compute count stays 0).
 */
#include "fw-config.h"

#include <string.h>

#include <sndfile.h>

#include "../fw-test-fixtures.h"
#include "fw-feature-cache.h"
#include "fw-feature.h"
#include "fw-project.h"

static char *
write_noise (const char *dir, const char *name, int rate, double seconds, guint32 seed)
{
  gsize n = (gsize) (seconds * rate);
  g_autofree float *x = g_new (float, n);
  char *path = fw_test_path (dir, name);
  guint32 s = seed;

  for (gsize i = 0; i < n; i++)
    {
      s = s * 1664525u + 1013904223u;   /* Numerical Recipes LCG */
      x[i] = (float) (((double) (s >> 8) / 16777216.0 - 0.5) * 0.5);
    }
  fw_test_write_float (path, SF_FORMAT_WAV | SF_FORMAT_FLOAT, 1, rate, x, n);
  return path;
}

static FwParams *
params_from (const char *const *settings)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (base, settings, &error);

  g_assert_no_error (error);
  return p;
}

static const char *const small_settings[] = {
  "sample_rate=0", "window_length=512", "fft_length=512", "hop_length=256", "mel_bands=40", NULL
};
static const char *const small_settings_b[] = {
  "sample_rate=0", "window_length=512", "fft_length=512", "hop_length=128", "mel_bands=40", NULL
};
static const char *const medium_settings[] = {
  "sample_rate=0", "window_length=2048", "fft_length=2048", "hop_length=32", "mel_bands=40", NULL
};
static const char *const long_settings[] = {
  "sample_rate=0", "window_length=2048", "fft_length=2048", "hop_length=4", "mel_bands=64", NULL
};

/* Main-loop helpers. */
static void
iterate_until (gboolean *flag, double seconds)
{
  gint64 deadline = g_get_monotonic_time () + (gint64) (seconds * G_USEC_PER_SEC);

  while (!*flag && g_get_monotonic_time () < deadline)
    g_main_context_iteration (NULL, FALSE), g_usleep (1000);
  g_assert_true (*flag);
}

static void
wait_idle (FwFeatureCache *cache, double seconds)
{
  gint64 deadline = g_get_monotonic_time () + (gint64) (seconds * G_USEC_PER_SEC);

  while (fw_feature_cache_get_pending (cache) > 0 && g_get_monotonic_time () < deadline)
    {
      g_main_context_iteration (NULL, FALSE);
      g_usleep (2000);
    }
  g_assert_cmpuint (fw_feature_cache_get_pending (cache), ==, 0);
}

typedef struct
{
  gboolean done;
  FwMatrix *result;
  GError *error;
  GThread *thread;
} AsyncResult;

static void
on_request_done (GObject *source, GAsyncResult *res, gpointer data)
{
  AsyncResult *r = data;

  r->result = fw_feature_cache_request_finish (FW_FEATURE_CACHE (source), res, &r->error);
  r->thread = g_thread_self ();
  r->done = TRUE;
}

static void
async_result_clear (AsyncResult *r)
{
  g_clear_pointer (&r->result, fw_matrix_unref);
  g_clear_error (&r->error);
  r->done = FALSE;
  r->thread = NULL;
}

typedef struct
{
  FwFeatureCache *cache;
  FwClip *clip;
  FwParams *params;
  FwStage stage;
  GCancellable *cancellable;
  gint *go;
  FwMatrix *result;
  GError *error;
} SyncReq;

static gpointer
sync_thread (gpointer data)
{
  SyncReq *r = data;

  while (r->go != NULL && !g_atomic_int_get (r->go))
    g_usleep (100);
  r->result = fw_feature_cache_request_sync (r->cache, r->clip, r->params, r->stage,
                                             r->cancellable, &r->error);
  return NULL;
}

/* Eight threads and two async requests for one key: one computation per stage of the chain,
 * everyone gets the same matrix, equal to a direct computation. */
static void
test_shared_once (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_noise (dir, "a.wav", 16000, 2.0, 1);
  g_autoptr (FwClip) clip = fw_clip_new (path);
  g_autoptr (FwParams) params = params_from (small_settings);
  g_autoptr (FwFeatureCache) cache = fw_feature_cache_new (G_GUINT64_CONSTANT (1) << 30, 2);
  g_autoptr (FwAudio) audio = NULL;
  g_autoptr (GError) error = NULL;
  FwMatrix *direct;
  SyncReq reqs[8];
  GThread *threads[8];
  AsyncResult ar[2] = { { 0 } };
  gint go = 0;
  FwMatrix *m;

  for (guint i = 0; i < 8; i++)
    {
      reqs[i] = (SyncReq) { cache, clip, params, FW_STAGE_MFCC, NULL, &go, NULL, NULL };
      threads[i] = g_thread_new ("req", sync_thread, &reqs[i]);
    }
  fw_feature_cache_request_async (cache, clip, params, FW_STAGE_MFCC, NULL, on_request_done, &ar[0]);
  g_atomic_int_set (&go, 1);
  fw_feature_cache_request_async (cache, clip, params, FW_STAGE_MFCC, NULL, on_request_done, &ar[1]);
  iterate_until (&ar[0].done, 60);
  iterate_until (&ar[1].done, 60);
  for (guint i = 0; i < 8; i++)
    g_thread_join (threads[i]);

  g_assert_no_error (ar[0].error);
  g_assert_no_error (ar[1].error);
  g_assert_true (ar[0].thread == g_thread_self ());   /* delivered in our main context */
  for (guint i = 0; i < 8; i++)
    {
      g_assert_no_error (reqs[i].error);
      g_assert_true (reqs[i].result == ar[0].result);
    }
  g_assert_true (ar[1].result == ar[0].result);
  /* spectrum, mel, mel-db and mfcc: each computed exactly once. */
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, 4);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 4);

  /* Identical to the direct computation (the cache derives stage by stage). */
  audio = fw_feature_load_audio (path, params, NULL, &error);
  g_assert_no_error (error);
  direct = fw_feature_compute (audio, params, FW_STAGE_MFCC, 1, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (direct->n_frames, ==, ar[0].result->n_frames);
  g_assert_cmpuint (direct->n_bins, ==, ar[0].result->n_bins);
  g_assert_cmpmem (direct->data, direct->n_frames * direct->n_bins * sizeof (float),
                   ar[0].result->data, ar[0].result->n_frames * ar[0].result->n_bins * sizeof (float));
  fw_matrix_unref (direct);

  /* Intermediate stages are cached: mel-db is there already, delta costs one derivation. */
  m = fw_feature_cache_lookup (cache, clip, params, FW_STAGE_MEL_DB);
  g_assert_nonnull (m);
  fw_matrix_unref (m);
  m = fw_feature_cache_request_sync (cache, clip, params, FW_STAGE_MFCC, NULL, &error);
  g_assert_true (m == ar[0].result);
  fw_matrix_unref (m);
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, 4);
  m = fw_feature_cache_request_sync (cache, clip, params, FW_STAGE_DELTA, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (m->n_bins, ==, 13);
  fw_matrix_unref (m);
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, 5);
  /* db shares the cached spectrum. */
  m = fw_feature_cache_request_sync (cache, clip, params, FW_STAGE_DB, NULL, &error);
  g_assert_no_error (error);
  fw_matrix_unref (m);
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, 6);

  /* The clip's channel override is part of the key. */
  fw_clip_set_channel (clip, 1);
  g_assert_null (fw_feature_cache_lookup (cache, clip, params, FW_STAGE_MFCC));
  fw_clip_set_channel (clip, FW_CLIP_CHANNEL_FROM_PARAMS);
  m = fw_feature_cache_lookup (cache, clip, params, FW_STAGE_MFCC);
  g_assert_true (m == ar[0].result);
  fw_matrix_unref (m);

  for (guint i = 0; i < 8; i++)
    fw_matrix_unref (reqs[i].result);
  async_result_clear (&ar[0]);
  async_result_clear (&ar[1]);
  fw_test_remove_dir (dir);
}

typedef struct
{
  double max_fraction;
  guint max_pending;
  guint events;
  gboolean wrong_thread;
  GThread *main_thread;
} Progress;

static void
on_progress (FwFeatureCache *cache, guint pending, double fraction, Progress *p)
{
  p->events++;
  p->max_fraction = MAX (p->max_fraction, fraction);
  p->max_pending = MAX (p->max_pending, pending);
  if (g_thread_self () != p->main_thread)
    p->wrong_thread = TRUE;
}

static void
test_cancel_stops_work (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_noise (dir, "long.wav", 22050, 12.0, 2);
  g_autoptr (FwClip) clip = fw_clip_new (path);
  g_autoptr (FwParams) params = params_from (long_settings);
  g_autoptr (FwFeatureCache) cache = fw_feature_cache_new (G_GUINT64_CONSTANT (1) << 32, 2);
  g_autoptr (GCancellable) cancellable = g_cancellable_new ();
  AsyncResult ar = { 0 };
  Progress p = { 0 };
  gint64 deadline;

  p.main_thread = g_thread_self ();
  g_signal_connect (cache, "progress", G_CALLBACK (on_progress), &p);
  fw_feature_cache_request_async (cache, clip, params, FW_STAGE_MFCC, cancellable,
                                  on_request_done, &ar);
  g_assert_cmpuint (fw_feature_cache_get_pending (cache), ==, 4);

  /* Wait until the spectrum is being computed, then cancel. */
  deadline = g_get_monotonic_time () + 60 * G_USEC_PER_SEC;
  while (p.max_fraction <= 0.0 && g_get_monotonic_time () < deadline)
    {
      g_main_context_iteration (NULL, FALSE);
      g_usleep (1000);
    }
  g_assert_cmpfloat (p.max_fraction, >, 0.0);
  g_assert_cmpfloat (p.max_fraction, <, 1.0);
  g_cancellable_cancel (cancellable);
  iterate_until (&ar.done, 30);
  g_assert_null (ar.result);
  g_assert_error (ar.error, G_IO_ERROR, G_IO_ERROR_CANCELLED);

  /* The work stops: nothing pending, and no stage was ever completed. */
  wait_idle (cache, 60);
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, 0);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 0);
  g_assert_false (p.wrong_thread);
  g_assert_cmpuint (p.max_pending, >=, 1);
  async_result_clear (&ar);

  /* A blocking request is cancelled from another thread the same way. */
  {
    g_autoptr (GCancellable) c2 = g_cancellable_new ();
    SyncReq req = { cache, clip, params, FW_STAGE_SPECTRUM, c2, NULL, NULL, NULL };
    GThread *t = g_thread_new ("sync", sync_thread, &req);

    deadline = g_get_monotonic_time () + 60 * G_USEC_PER_SEC;
    while (fw_feature_cache_get_pending (cache) == 0 && g_get_monotonic_time () < deadline)
      g_usleep (1000);
    g_usleep (50000);
    g_cancellable_cancel (c2);
    g_thread_join (t);
    g_assert_null (req.result);
    g_assert_error (req.error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
    g_clear_error (&req.error);
    wait_idle (cache, 60);
    g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, 0);
  }

  /* An already cancelled request fails at once. */
  {
    g_autoptr (GError) error = NULL;
    g_assert_null (fw_feature_cache_request_sync (cache, clip, params, FW_STAGE_MFCC,
                                                  cancellable, &error));
    g_assert_error (error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  }
  fw_test_remove_dir (dir);
}

/* Two requests share a job; cancelling one leaves the other's result coming. */
static void
test_cancel_one_of_two (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_noise (dir, "a.wav", 16000, 3.0, 3);
  g_autoptr (FwClip) clip = fw_clip_new (path);
  g_autoptr (FwParams) params = params_from (small_settings);
  g_autoptr (FwFeatureCache) cache = fw_feature_cache_new (G_GUINT64_CONSTANT (1) << 30, 1);
  g_autoptr (GCancellable) c1 = g_cancellable_new ();
  g_autoptr (GCancellable) c2 = g_cancellable_new ();
  AsyncResult r1 = { 0 }, r2 = { 0 };

  fw_feature_cache_request_async (cache, clip, params, FW_STAGE_MEL_DB, c1, on_request_done, &r1);
  fw_feature_cache_request_async (cache, clip, params, FW_STAGE_MEL_DB, c2, on_request_done, &r2);
  g_cancellable_cancel (c1);
  iterate_until (&r1.done, 30);
  iterate_until (&r2.done, 60);
  g_assert_error (r1.error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  g_assert_no_error (r2.error);
  g_assert_nonnull (r2.result);
  g_assert_cmpuint (r2.result->n_bins, ==, 40);
  wait_idle (cache, 30);
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, 3);
  async_result_clear (&r1);
  async_result_clear (&r2);
  fw_test_remove_dir (dir);
}

static void
test_budget_evicts_lru (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *pa = write_noise (dir, "a.wav", 16000, 1.0, 4);
  g_autofree char *pb = write_noise (dir, "b.wav", 16000, 1.0, 5);
  g_autofree char *pc = write_noise (dir, "c.wav", 16000, 1.0, 6);
  g_autoptr (FwClip) a = fw_clip_new (pa);
  g_autoptr (FwClip) b = fw_clip_new (pb);
  g_autoptr (FwClip) c = fw_clip_new (pc);
  g_autoptr (FwParams) params = params_from (small_settings);
  g_autoptr (FwFeatureCache) cache = fw_feature_cache_new (G_GUINT64_CONSTANT (1) << 30, 1);
  g_autoptr (GError) error = NULL;
  FwMatrix *m;
  guint64 one;

  m = fw_feature_cache_request_sync (cache, a, params, FW_STAGE_SPECTRUM, NULL, &error);
  g_assert_no_error (error);
  one = fw_feature_cache_get_bytes (cache);
  g_assert_cmpuint (one, ==, fw_matrix_bytes (m));
  g_assert_cmpuint (one, >, 16000);
  fw_matrix_unref (m);

  fw_feature_cache_set_budget (cache, one * 5 / 2);
  fw_matrix_unref (fw_feature_cache_request_sync (cache, b, params, FW_STAGE_SPECTRUM, NULL, &error));
  g_assert_cmpuint (fw_feature_cache_get_bytes (cache), ==, 2 * one);
  /* Touch a: b becomes the least recently used. */
  m = fw_feature_cache_lookup (cache, a, params, FW_STAGE_SPECTRUM);
  g_assert_nonnull (m);
  fw_matrix_unref (m);
  fw_matrix_unref (fw_feature_cache_request_sync (cache, c, params, FW_STAGE_SPECTRUM, NULL, &error));
  g_assert_no_error (error);
  g_assert_cmpuint (fw_feature_cache_get_bytes (cache), <=, one * 5 / 2);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 2);
  g_assert_null (fw_feature_cache_lookup (cache, b, params, FW_STAGE_SPECTRUM));
  m = fw_feature_cache_lookup (cache, a, params, FW_STAGE_SPECTRUM);
  g_assert_nonnull (m);
  fw_matrix_unref (m);
  m = fw_feature_cache_lookup (cache, c, params, FW_STAGE_SPECTRUM);
  g_assert_nonnull (m);
  fw_matrix_unref (m);

  /* Shrinking the budget evicts at once, oldest first (a was used before c). */
  fw_feature_cache_set_budget (cache, one);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 1);
  g_assert_null (fw_feature_cache_lookup (cache, a, params, FW_STAGE_SPECTRUM));
  /* An entry larger than the whole budget is still returned (and kept alone). */
  fw_feature_cache_set_budget (cache, 10);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 0);
  m = fw_feature_cache_request_sync (cache, b, params, FW_STAGE_SPECTRUM, NULL, &error);
  g_assert_no_error (error);
  g_assert_nonnull (m);
  fw_matrix_unref (m);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 1);
  fw_test_remove_dir (dir);
}

static void
test_invalidate (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *pa = write_noise (dir, "a.wav", 16000, 1.0, 7);
  g_autofree char *pb = write_noise (dir, "b.wav", 16000, 1.0, 8);
  g_autofree char *plong = write_noise (dir, "long.wav", 22050, 12.0, 9);
  g_autoptr (FwClip) a = fw_clip_new (pa);
  g_autoptr (FwClip) b = fw_clip_new (pb);
  g_autoptr (FwClip) lc = fw_clip_new (plong);
  g_autoptr (FwParams) p1 = params_from (small_settings);
  g_autoptr (FwParams) p2 = params_from (small_settings_b);
  g_autoptr (FwParams) pmedium = params_from (medium_settings);
  g_autoptr (FwParams) plong_params = params_from (long_settings);
  g_autoptr (FwFeatureCache) cache = fw_feature_cache_new (G_GUINT64_CONSTANT (1) << 32, 2);
  g_autoptr (GError) error = NULL;
  AsyncResult r1 = { 0 }, r2 = { 0 };
  FwMatrix *m;
  guint before;

  /* Finished entries: only the invalidated hash goes. */
  fw_matrix_unref (fw_feature_cache_request_sync (cache, a, p1, FW_STAGE_MEL, NULL, &error));
  fw_matrix_unref (fw_feature_cache_request_sync (cache, a, p2, FW_STAGE_MEL, NULL, &error));
  fw_matrix_unref (fw_feature_cache_request_sync (cache, b, p2, FW_STAGE_SPECTRUM, NULL, &error));
  g_assert_no_error (error);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 5);
  fw_feature_cache_invalidate_params (cache, fw_params_get_hash (p1));
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 3);
  g_assert_null (fw_feature_cache_lookup (cache, a, p1, FW_STAGE_MEL));
  g_assert_null (fw_feature_cache_lookup (cache, a, p1, FW_STAGE_SPECTRUM));
  m = fw_feature_cache_lookup (cache, a, p2, FW_STAGE_MEL);
  g_assert_nonnull (m);
  fw_matrix_unref (m);

  /* By clip: a's entries go, b's stay. */
  fw_feature_cache_invalidate_clip (cache, a);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 1);
  m = fw_feature_cache_lookup (cache, b, p2, FW_STAGE_SPECTRUM);
  g_assert_nonnull (m);
  fw_matrix_unref (m);

  /* Jobs in flight: invalidating one hash cancels its job and leaves the other running. */
  before = fw_feature_cache_get_compute_count (cache);
  fw_feature_cache_request_async (cache, lc, plong_params, FW_STAGE_SPECTRUM, NULL, on_request_done, &r1);
  fw_feature_cache_request_async (cache, lc, pmedium, FW_STAGE_MEL_DB, NULL, on_request_done, &r2);
  /* Both are in flight when the first hash is invalidated. */
  g_assert_null (fw_feature_cache_lookup (cache, lc, pmedium, FW_STAGE_MEL_DB));
  g_assert_cmpuint (fw_feature_cache_get_pending (cache), >=, 2);
  fw_feature_cache_invalidate_params (cache, fw_params_get_hash (plong_params));
  iterate_until (&r1.done, 30);
  iterate_until (&r2.done, 120);
  g_assert_error (r1.error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  g_assert_no_error (r2.error);
  g_assert_nonnull (r2.result);
  wait_idle (cache, 60);
  /* The other hash's three stages were computed; the cancelled spectrum never completed. */
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, before + 3);
  g_assert_null (fw_feature_cache_lookup (cache, lc, plong_params, FW_STAGE_SPECTRUM));
  async_result_clear (&r1);
  async_result_clear (&r2);

  /* A changed file is a new key. */
  before = fw_feature_cache_get_compute_count (cache);
  g_usleep (20000);
  g_free (write_noise (dir, "b.wav", 16000, 1.5, 10));
  g_assert_null (fw_feature_cache_lookup (cache, b, p2, FW_STAGE_SPECTRUM));
  m = fw_feature_cache_request_sync (cache, b, p2, FW_STAGE_SPECTRUM, NULL, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (m->n_frames, ==, 1 + 24000 / 128);
  fw_matrix_unref (m);
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, before + 1);

  fw_feature_cache_clear (cache);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 0);
  g_assert_cmpuint (fw_feature_cache_get_bytes (cache), ==, 0);
  fw_test_remove_dir (dir);
}

typedef struct
{
  guint count;
  guint stages;   /* bit mask of stages seen */
  gboolean wrong_thread;
  GThread *main_thread;
} Computed;

static void
on_computed (FwFeatureCache *cache, FwClip *clip, const char *hash, int stage, Computed *c)
{
  c->count++;
  c->stages |= 1u << stage;
  if (g_thread_self () != c->main_thread)
    c->wrong_thread = TRUE;
}

static void
test_signals_and_errors (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_noise (dir, "a.wav", 16000, 1.0, 11);
  g_autofree char *gone = fw_test_path (dir, "gone.wav");
  g_autoptr (FwClip) clip = fw_clip_new (path);
  g_autoptr (FwClip) missing = fw_clip_new (gone);
  g_autoptr (FwParams) params = params_from (small_settings);
  g_autoptr (FwFeatureCache) cache = fw_feature_cache_new (G_GUINT64_CONSTANT (1) << 30, 0);
  g_autoptr (GError) error = NULL;
  Computed c = { 0 };
  AsyncResult r = { 0 };
  gboolean four = FALSE;
  gint64 deadline;

  c.main_thread = g_thread_self ();
  g_signal_connect (cache, "computed", G_CALLBACK (on_computed), &c);
  fw_feature_cache_request_async (cache, clip, params, FW_STAGE_MFCC, NULL, on_request_done, &r);
  iterate_until (&r.done, 60);
  g_assert_no_error (r.error);
  deadline = g_get_monotonic_time () + 10 * G_USEC_PER_SEC;
  while (c.count < 4 && g_get_monotonic_time () < deadline)
    g_main_context_iteration (NULL, FALSE), g_usleep (1000);
  four = c.count == 4;
  g_assert_true (four);
  g_assert_false (c.wrong_thread);
  g_assert_cmpuint (c.stages, ==, (1u << FW_STAGE_SPECTRUM) | (1u << FW_STAGE_MEL)
                                  | (1u << FW_STAGE_MEL_DB) | (1u << FW_STAGE_MFCC));
  async_result_clear (&r);

  /* A cached answer to an async request still arrives through the main loop. */
  fw_feature_cache_request_async (cache, clip, params, FW_STAGE_MFCC, NULL, on_request_done, &r);
  g_assert_false (r.done);
  iterate_until (&r.done, 5);
  g_assert_nonnull (r.result);
  async_result_clear (&r);

  /* Errors come through, naming the file, and are not cached. */
  g_assert_null (fw_feature_cache_request_sync (cache, missing, params, FW_STAGE_MEL, NULL, &error));
  g_assert_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_MISSING);
  g_assert_nonnull (strstr (error->message, "gone.wav"));
  g_clear_error (&error);
  wait_idle (cache, 10);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), ==, 4);

  /* A window that does not fit the clip: the parameter error reaches the requester. */
  {
    static const char *const huge[] = { "sample_rate=0", "window_length=65536", "fft_length=65536",
                                       "centered=false", NULL };
    g_autoptr (FwParams) hp = params_from (huge);

    g_assert_null (fw_feature_cache_request_sync (cache, clip, hp, FW_STAGE_MEL_DB, NULL, &error));
    g_assert_nonnull (error);
    g_test_message ("too-long window: %s", error->message);
    g_clear_error (&error);
  }
  fw_test_remove_dir (dir);
}

static void
weak_notify (gpointer data, GObject *where)
{
  *(gboolean *) data = TRUE;
}

/* Dropping the cache while a job runs: the request ends (cancelled), nothing crashes. */
static void
test_drop_while_running (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_noise (dir, "long.wav", 22050, 12.0, 12);
  g_autoptr (FwClip) clip = fw_clip_new (path);
  g_autoptr (FwParams) params = params_from (long_settings);
  g_autoptr (GCancellable) cancellable = g_cancellable_new ();
  FwFeatureCache *cache = fw_feature_cache_new (G_GUINT64_CONSTANT (1) << 32, 1);
  gboolean finalized = FALSE;
  AsyncResult r = { 0 };

  g_object_weak_ref (G_OBJECT (cache), weak_notify, &finalized);
  fw_feature_cache_request_async (cache, clip, params, FW_STAGE_MEL_DB, cancellable,
                                  on_request_done, &r);
  g_object_unref (cache);               /* the pending request keeps it alive */
  g_assert_false (finalized);
  g_usleep (100000);
  g_cancellable_cancel (cancellable);
  iterate_until (&r.done, 30);
  g_assert_error (r.error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  async_result_clear (&r);
  iterate_until (&finalized, 10);
  /* The worker may still be stopping; give it time to drop the shared state. */
  g_usleep (300000);
  fw_test_remove_dir (dir);
}

/* The project's cache: editing one set's parameters cancels only that set's jobs. */
static void
test_project_edit_cancels_only_its_jobs (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *plong = write_noise (dir, "long.wav", 22050, 12.0, 13);
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwClip) clip = fw_clip_new (plong);
  g_autoptr (FwParams) slow = params_from (long_settings);
  g_autoptr (FwParams) quick = params_from (medium_settings);
  g_autoptr (FwParams) edited = NULL;
  g_autoptr (FwParamSet) set_slow = fw_param_set_new ("slow", slow);
  g_autoptr (FwParamSet) set_quick = fw_param_set_new ("quick", quick);
  g_autoptr (GError) error = NULL;
  FwFeatureCache *cache;
  AsyncResult r1 = { 0 }, r2 = { 0 };

  fw_project_add_clip (project, clip);
  g_assert_true (fw_project_add_param_set (project, set_slow, NULL));
  g_assert_true (fw_project_add_param_set (project, set_quick, NULL));
  cache = fw_project_get_feature_cache (project);
  g_assert_true (cache == fw_project_get_feature_cache (project));

  fw_feature_cache_request_async (cache, clip, fw_param_set_get_params (set_slow),
                                  FW_STAGE_SPECTRUM, NULL, on_request_done, &r1);
  fw_feature_cache_request_async (cache, clip, fw_param_set_get_params (set_quick),
                                  FW_STAGE_MEL, NULL, on_request_done, &r2);
  g_assert_null (fw_feature_cache_lookup (cache, clip, quick, FW_STAGE_MEL));
  edited = fw_params_with (slow, "hop_length", "8", &error);
  g_assert_no_error (error);
  fw_param_set_set_params (set_slow, edited);

  iterate_until (&r1.done, 30);
  iterate_until (&r2.done, 120);
  g_assert_error (r1.error, G_IO_ERROR, G_IO_ERROR_CANCELLED);
  g_assert_no_error (r2.error);
  g_assert_nonnull (r2.result);
  wait_idle (cache, 60);
  g_assert_cmpuint (fw_feature_cache_get_compute_count (cache), ==, 2);

  /* The budget follows the project's setting. */
  fw_project_set_cache_budget (project, 1);
  g_assert_cmpuint (fw_feature_cache_get_n_entries (cache), <=, 1);
  async_result_clear (&r1);
  async_result_clear (&r2);
  fw_test_remove_dir (dir);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/fw/project/cache/shared-once", test_shared_once);
  g_test_add_func ("/fw/project/cache/cancel-stops-work", test_cancel_stops_work);
  g_test_add_func ("/fw/project/cache/cancel-one-of-two", test_cancel_one_of_two);
  g_test_add_func ("/fw/project/cache/budget-evicts-lru", test_budget_evicts_lru);
  g_test_add_func ("/fw/project/cache/invalidate", test_invalidate);
  g_test_add_func ("/fw/project/cache/signals-and-errors", test_signals_and_errors);
  g_test_add_func ("/fw/project/cache/drop-while-running", test_drop_while_running);
  g_test_add_func ("/fw/project/cache/project-edit", test_project_edit_cancels_only_its_jobs);
  return g_test_run ();
}
