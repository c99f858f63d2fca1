/* fw-compare-view.h: the compare view: A, B and their difference on the window's time axis.
 *
 * Shows one saved comparison of the project (FwComparison): rows for A and B (as each was
 * computed, or on the grid they were compared on), a difference row drawn with the diverging
 * scale symmetric about zero (B - A, or for linear stages the ratio in dB or the relative
 * difference, or what the explanation leaves), and a per-frame curve of the difference; all
 * rows use the window's FwViewport, so a time has the same x everywhere. Beside them: the
 * explanation sentence, the measures, what alignment did, the per-bin curves and the knob
 * ranking ("which key explains it") with an action per key that adds A's parameter set with
 * that key at B's value. For a feature file against a clip the view offers the convention
 * finder instead. Every computation runs in a worker with progress and can be cancelled;
 * errors appear inside the view naming the file or field and the cause.
 *
 * Swapping the sides or choosing another stage replaces the comparison in the project by
 * the new one (so what is saved is what is shown).
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-compare.h"
#include "fw-plot-row.h"
#include "fw-project.h"
#include "fw-viewport.h"

G_BEGIN_DECLS

typedef enum {
  FW_COMPARE_ROW_A,
  FW_COMPARE_ROW_B,
  FW_COMPARE_ROW_DIFF,
  FW_COMPARE_ROW_FRAMES,   /* the difference per frame (RMS over bins) */
  FW_N_COMPARE_ROWS
} FwCompareRowId;

typedef enum {
  FW_COMPARE_SHOW_DIFF,      /* B - A in the stage's units */
  FW_COMPARE_SHOW_RATIO_DB,  /* linear stages: B / A in dB */
  FW_COMPARE_SHOW_RELATIVE,  /* linear stages: (B - A) / |A| */
  FW_COMPARE_SHOW_RESIDUAL,  /* what the explanation leaves */
} FwCompareShow;

#define FW_TYPE_COMPARE_VIEW (fw_compare_view_get_type ())
G_DECLARE_FINAL_TYPE (FwCompareView, fw_compare_view, FW, COMPARE_VIEW, GtkWidget)

GtkWidget *fw_compare_view_new (void);

/* The project whose comparisons are shown and the window's viewport (rows are made for it). */
void fw_compare_view_set_context (FwCompareView *self, FwProject *project, FwViewport *viewport);

/* Shows a comparison of the project (NULL: nothing) and starts computing it. */
void fw_compare_view_set_comparison (FwCompareView *self, FwComparison *cmp);
FwComparison *fw_compare_view_get_comparison (FwCompareView *self);

/* Stops the work in progress (the rows keep what they show). */
void fw_compare_view_cancel (FwCompareView *self);
/* Computing, ranking, searching or drawing. */
gboolean fw_compare_view_is_busy (FwCompareView *self);
/* Seconds covered by the rows (0 before data arrives). */
double fw_compare_view_get_duration (FwCompareView *self);

/* User actions (also reachable from the view's own controls). */
void fw_compare_view_swap (FwCompareView *self);
void fw_compare_view_set_stage (FwCompareView *self, FwStage stage);
FwStage fw_compare_view_get_stage (FwCompareView *self);
void fw_compare_view_set_lock_ranges (FwCompareView *self, gboolean lock);
gboolean fw_compare_view_get_lock_ranges (FwCompareView *self);
void fw_compare_view_set_show (FwCompareView *self, FwCompareShow show);
FwCompareShow fw_compare_view_get_show (FwCompareView *self);
/* Adds a parameter set to the project: A's set with `key` at B's value, named
 * "<A's set> + key=value" (made unique). Returns it (transfer none), or NULL with an error
 * naming the key and the cause. */
FwParamSet *fw_compare_view_adopt_knob (FwCompareView *self, const char *key, GError **error);

/* What is shown (transfer none; NULL while computing or after an error). */
const FwCompareResult *fw_compare_view_get_result (FwCompareView *self);
const FwKnobRanking *fw_compare_view_get_ranking (FwCompareView *self);
const FwExplainResult *fw_compare_view_get_finder_result (FwCompareView *self);
/* The matrix in the difference row, and the error shown in the view (or NULL). */
FwMatrix *fw_compare_view_get_shown_difference (FwCompareView *self);
const char *fw_compare_view_get_message (FwCompareView *self);
const char *fw_compare_view_get_summary_text (FwCompareView *self);
FwPlotRow *fw_compare_view_get_row (FwCompareView *self, FwCompareRowId which);
/* Adds the finder's best match as a parameter set ("<set> as in <file>"); NULL with an error
 * before the finder has a result. */
FwParamSet *fw_compare_view_adopt_finder_match (FwCompareView *self, GError **error);
/* Starts the convention finder (a file against a clip); FALSE when this comparison has no
 * such pair. */
gboolean fw_compare_view_start_finder (FwCompareView *self);

/* A name for a comparison from its operands: "calm-colony-01: short-window vs long-window",
 * "calm-colony-01 vs agitated-colony-02 (long-window)", "calm-colony-01 · defaults vs
 * dump.npy". Caller frees. */
char *fw_compare_view_name_for (FwComparison *cmp);

/* The stages a comparison can show, with their titles (for choosers). */
guint fw_compare_view_n_stages (void);
FwStage fw_compare_view_stage_at (guint index);
const char *fw_compare_view_stage_title (FwStage stage);

/* Signals: "state-changed" (busy or data changed), "readout" (const char *text or NULL),
 * "set-added" (FwParamSet *: a set made by adopt_knob or the finder). */

G_END_DECLS
