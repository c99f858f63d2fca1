/* fw-compare.h: comparing two feature matrices, explaining the difference, ranking the
 * parameter keys that cause it, and finding the conventions that reproduce a feature dump.
 *
 * An operand is (clip, parameter set, stage) or an imported feature file (fw-feature-file.h)
 * or a matrix already computed (the window's feature cache). fw_compare_run aligns the two
 * sides (fw-diff.h), measures and explains the difference and says in words what alignment
 * did. fw_compare_rank_knobs applies each single differing key of B's parameter set to A and
 * ranks the keys by how much of the difference each removes. fw_compare_explain searches the
 * usual convention variants for the parameter set whose output is closest to a dump.
 *
 * Everything here blocks; the window runs it in a worker (the _async variants do that with
 * GTask). Every user-visible sentence is translated.
 */
#pragma once

#include <gio/gio.h>

#include "fw-analysis.h"
#include "fw-audio.h"
#include "fw-diff.h"
#include "fw-feature-file.h"
#include "fw-params.h"
#include "fw-types.h"

G_BEGIN_DECLS

#define FW_COMPARE_ERROR (fw_compare_error_quark ())
GQuark fw_compare_error_quark (void);

typedef enum {
  FW_COMPARE_ERROR_OPERAND,   /* an operand cannot be loaded or computed (message says why) */
  FW_COMPARE_ERROR_ALIGN,     /* the sides share no frames or no frequencies */
  FW_COMPARE_ERROR_KNOBS,     /* ranking needs two parameter sets */
  FW_COMPARE_ERROR_SEARCH,    /* bad candidate list, nothing to search */
  FW_COMPARE_ERROR_CANCELLED,
} FwCompareError;

/* ---- operands ---------------------------------------------------------------------------- */

typedef struct _FwCompareOperand FwCompareOperand;

/* A clip file analysed with params up to stage (loaded on first use). */
FwCompareOperand *fw_compare_operand_new_clip (const char *clip_path, FwParams *params,
                                               FwStage stage);
/* Audio already loaded at the params' sample_rate/channel. Keys that need the file again
 * (sample_rate, channel) work only when audio->info.path names a readable file. */
FwCompareOperand *fw_compare_operand_new_audio (FwAudio *audio, FwParams *params,
                                                FwStage stage);
/* An imported feature file; stage says what it holds (used for units and for linear/dB
 * handling; FW_STAGE_SIGNAL when unknown). options may be NULL. */
FwCompareOperand *fw_compare_operand_new_file (const char *path,
                                               const FwFeatureFileOptions *options,
                                               FwStage stage);
/* A matrix computed elsewhere (the feature cache). params may be NULL. */
FwCompareOperand *fw_compare_operand_new_matrix (const char *label, FwMatrix *matrix,
                                                 FwParams *params, FwStage stage);
/* One side (0 = A, 1 = B) of a comparison saved in a project (FwComparison, fw-project.h):
 * the clip is found by path or name and the parameter set by name (a clip's channel
 * override is applied to the set); a file side reads its options string with
 * fw_feature_file_options_parse. Errors name the missing clip, set or option. Main thread. */
FwCompareOperand *fw_compare_operand_new_from_comparison (FwProject *project,
                                                          FwComparison *comparison, guint side,
                                                          GError **error);
FwCompareOperand *fw_compare_operand_ref (FwCompareOperand *op);
void fw_compare_operand_unref (FwCompareOperand *op);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwCompareOperand, fw_compare_operand_unref)

gboolean fw_compare_operand_is_file (FwCompareOperand *op);
/* "calm.wav, mel-db" / "dump.npy"; the window shows it beside each row. */
const char *fw_compare_operand_get_label (FwCompareOperand *op);
FwParams *fw_compare_operand_get_params (FwCompareOperand *op);   /* transfer none, may be NULL */
FwStage fw_compare_operand_get_stage (FwCompareOperand *op);
/* The clip path (clip/audio operands) or the file path; NULL for matrix operands. */
const char *fw_compare_operand_get_path (FwCompareOperand *op);
/* Loads or computes the matrix once (later calls return the same one). Transfer full. */
FwMatrix *fw_compare_operand_get_matrix (FwCompareOperand *op, GCancellable *cancellable,
                                         GError **error);

/* How the values of a stage are compared (linear power / amplitude values get dB ratios and
 * are explained in dB). params may be NULL (then power-like for spectrum and mel). */
FwDiffValueKind fw_compare_value_kind (FwStage stage, const FwParams *params);

/* ---- one comparison ---------------------------------------------------------------------- */

typedef struct {
  FwDiffResult *diff;   /* aligned matrices, difference matrices, curves, measures, explanation */
  char *label_a;
  char *label_b;
  FwStage stage;
  char *unit;           /* unit of the compared values ("dB", "Hz", "" ...) */
  char *expl_unit;      /* unit of the explanation's offsets ("dB" for linear stages) */
  char *summary;        /* "B = A + 3.01 dB everywhere; lag 0 frames; residual max 2e-05" */
  GPtrArray *notes;     /* char *: what alignment did, shape mismatches, imports adopted */
  gboolean same_shape;  /* both sides had the same frames x bins and nothing was resampled */
  gboolean frames_by_index; /* neither side had frame times (two files): frame t with frame t;
                               the aligned frame_times are then frame indices */
} FwCompareResult;

void fw_compare_result_free (FwCompareResult *result);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwCompareResult, fw_compare_result_free)

/* The summary calls a difference "rounding" when the RMS left after the explanation is at
 * most this fraction of A's RMS (float32 round-off of two pipelines is ~1e-7). */
#define FW_COMPARE_ROUNDING_LEVEL 1e-5

/* options may be NULL (defaults; value_kind is then taken from the stage). */
FwCompareResult *fw_compare_run (FwCompareOperand *a, FwCompareOperand *b,
                                 const FwDiffOptions *options, GCancellable *cancellable,
                                 GError **error);
void fw_compare_run_async (FwCompareOperand *a, FwCompareOperand *b,
                           GCancellable *cancellable, GAsyncReadyCallback callback,
                           gpointer user_data);
FwCompareResult *fw_compare_run_finish (GAsyncResult *result, GError **error);

/* Within tolerance: same shape and max |B - A| <= tolerance. */
gboolean fw_compare_result_within (const FwCompareResult *result, double tolerance);
/* Multi-line human report (labels, shapes, notes, measures, the summary sentence). */
char *fw_compare_result_to_text (const FwCompareResult *result);
/* JSON object: shape_a, shape_b, compared_frames, compared_bins, max_abs_diff, rms_diff,
 * mean_offset, correlation, lag_frames, offset, bin_offset_max_abs, residual_max_abs,
 * residual_rms, explanation_unit, summary, notes, within_tolerance (when tolerance >= 0). */
char *fw_compare_result_to_json (const FwCompareResult *result, double tolerance);

/* ---- which knob ---------------------------------------------------------------------------- */

typedef struct {
  char *key;
  char *value_a;
  char *value_b;
  double rms_after;    /* RMS of B - A' where A' = A's set with this key of B */
  double removed;      /* fraction of the RMS difference removed: 1 - rms_after / rms_before;
                          NaN when the key could not be applied alone */
  char *problem;       /* why the key cannot be applied alone, or NULL */
  double left_without; /* the other way round: RMS of B - A'' over rms_before, where A'' =
                          B's set with this key at A's value (what this key alone leaves when
                          every other key is B's); NaN when that set is invalid */
} FwKnob;

typedef struct {
  double rms_before;   /* RMS of B - A (dB for linear stages, else the stage's units) */
  char *unit;
  GPtrArray *knobs;    /* FwKnob *, most removed first, unusable keys last */
} FwKnobRanking;

void fw_knob_ranking_free (FwKnobRanking *ranking);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwKnobRanking, fw_knob_ranking_free)

/* Both operands need parameter sets (clip or audio operands; matrix operands with params
 * whose audio is given by a clip path). A' is always computed from A's clip. */
FwKnobRanking *fw_compare_rank_knobs (FwCompareOperand *a, FwCompareOperand *b,
                                      GCancellable *cancellable, GError **error);
/* "mel_scale (htk -> slaney) removes 97% of the difference; ..." one line per key. */
char *fw_knob_ranking_to_text (const FwKnobRanking *ranking);
/* The comparison's JSON object (as fw_compare_result_to_json) with "knobs": [{"key",
 * "value_a", "value_b", "removed", "rms_after", "left_without", "problem"}, ...] and
 * "knobs_rms_before" added. */
char *fw_compare_result_to_json_with_knobs (const FwCompareResult *result, double tolerance,
                                            const FwKnobRanking *ranking);

/* ---- which conventions made this dump -------------------------------------------------------- */

typedef struct {
  gboolean default_variants;        /* search the usual conventions (TRUE by default): spectrum
                                       power/magnitude, mel_scale, mel_weights, db_reference
                                       1.0/max, dct_norm, centered, window_symmetry, lifter
                                       0/22/the base's value; only keys that affect the stage */
  const char *const *candidates;    /* extra "key=v1,v2,..." lists (any key), NULL-terminated */
  int n_threads;                    /* 0 = the number of processors */
  FwProgressFunc progress;          /* may be NULL; return non-zero to cancel */
  void *user_data;
} FwExplainOptions;

void fw_explain_options_init (FwExplainOptions *options);

typedef struct {
  FwParams *params;
  double relative_rms;  /* RMS(dump - candidate) / RMS(dump) */
  GStrv changed_keys;   /* against the base set */
} FwExplainCandidate;

typedef struct {
  FwParams *base;              /* the set the search started from */
  FwParams *params;            /* the best match */
  GStrv changed_keys;          /* keys of the best match that differ from base */
  double relative_rms;         /* of the best match */
  double residual_rms;         /* RMS(dump - best), stage units */
  double residual_max_abs;
  double base_relative_rms;    /* what the base set gave */
  GPtrArray *equivalent;       /* FwExplainCandidate *: other sets that fit as well */
  GPtrArray *runners_up;       /* FwExplainCandidate *: the next best distinct fits */
  GPtrArray *notes;            /* char *: shape-derived keys, hints */
  FwCompareResult *comparison; /* A = the dump, B = Framewise with the best match */
  guint n_evaluated;           /* parameter sets scored */
  guint n_spectra;             /* spectra computed (framing variants) */
  double seconds;              /* wall-clock time of the search */
} FwExplainResult;

void fw_explain_result_free (FwExplainResult *result);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwExplainResult, fw_explain_result_free)

/* dump: a file or matrix operand; clip: a clip or audio operand whose params are the base
 * and whose stage is the dump's stage. options may be NULL. */
FwExplainResult *fw_compare_explain (FwCompareOperand *dump, FwCompareOperand *clip,
                                     const FwExplainOptions *options,
                                     GCancellable *cancellable, GError **error);
/* A match is "exact" when its relative RMS is below this (float32 rounding of a dump). */
#define FW_EXPLAIN_EXACT_RELATIVE 1e-4
char *fw_explain_result_to_text (const FwExplainResult *result);
char *fw_explain_result_to_json (const FwExplainResult *result);

G_END_DECLS
