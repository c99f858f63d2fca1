/* fw-feature-cache.h: computed feature matrices, shared and computed in the background.
 *
 * Key = (clip identity incl. file modification stamp, parameter hash, stage). Values are
 * FwMatrix (with frame times and bin axis). Work runs in a pool of at most the number of cores
 * (GTask), is cancellable, reports progress; two requests for one key share one computation;
 * a memory budget evicts least recently used entries. Intermediate stages are cached too, so
 * mfcc after mel-db reuses the mel matrix.
 */
#pragma once

#include <gio/gio.h>

#include "fw-analysis.h"
#include "fw-clip.h"
#include "fw-params.h"
#include "fw-types.h"

G_BEGIN_DECLS

#define FW_TYPE_FEATURE_CACHE (fw_feature_cache_get_type ())
G_DECLARE_FINAL_TYPE (FwFeatureCache, fw_feature_cache, FW, FEATURE_CACHE, GObject)

/* max_workers 0 = g_get_num_processors(). Signals are emitted on the thread-default main
 * context of the caller of _new. */
FwFeatureCache *fw_feature_cache_new (guint64 budget_bytes, guint max_workers);
void fw_feature_cache_set_budget (FwFeatureCache *self, guint64 budget_bytes);
guint64 fw_feature_cache_get_bytes (FwFeatureCache *self);   /* bytes held now */

/* Completed entry or NULL; never blocks, never starts work. Caller unrefs. */
FwMatrix *fw_feature_cache_lookup (FwFeatureCache *self, FwClip *clip, FwParams *params,
                                   FwStage stage);

/* Starts (or joins) the computation; callback runs in the caller's main context.
 * Cancelling `cancellable` detaches this request; the shared computation stops when no
 * request wants it any more. */
void fw_feature_cache_request_async (FwFeatureCache *self, FwClip *clip, FwParams *params,
                                     FwStage stage, GCancellable *cancellable,
                                     GAsyncReadyCallback callback, gpointer user_data);
FwMatrix *fw_feature_cache_request_finish (FwFeatureCache *self, GAsyncResult *result,
                                           GError **error);
/* Blocking variant (for the CLI and tests); shares computations with async requests. */
FwMatrix *fw_feature_cache_request_sync (FwFeatureCache *self, FwClip *clip, FwParams *params,
                                         FwStage stage, GCancellable *cancellable,
                                         GError **error);

/* Drops entries and cancels work for one parameter hash / one clip. */
void fw_feature_cache_invalidate_params (FwFeatureCache *self, const char *params_hash);
void fw_feature_cache_invalidate_clip (FwFeatureCache *self, FwClip *clip);
/* Cancels the jobs for one parameter hash but keeps its finished entries. */
void fw_feature_cache_cancel_params (FwFeatureCache *self, const char *params_hash);
void fw_feature_cache_clear (FwFeatureCache *self);

/* Signal "progress" (guint pending_jobs, gdouble fraction_of_running_jobs), emitted on the
 * main context; "computed" (FwClip*, gchar *params_hash, gint stage) when an entry lands
 * (intermediate stages included). Both are coalesced (at most one dispatch per 40 ms) and
 * only produced for handlers connected before the request that started the work.
 * Counters for tests: */
guint fw_feature_cache_get_compute_count (FwFeatureCache *self);  /* stage computations run */
guint fw_feature_cache_get_pending (FwFeatureCache *self);
guint fw_feature_cache_get_n_entries (FwFeatureCache *self);     /* entries held now */

G_END_DECLS
