/* fw-plot-stack.h: time-aligned plot rows in one or two columns sharing one viewport.
 *
 * Column 0 shows the selected clip and parameter set; column 1 (optional) a pinned second
 * clip or set. Both columns use the same FwViewport, so a time has the same x in every row,
 * and rows locked together share one colour range across rows and columns.
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-plot-row.h"
#include "fw-time-ruler.h"

G_BEGIN_DECLS

#define FW_TYPE_PLOT_STACK (fw_plot_stack_get_type ())
G_DECLARE_FINAL_TYPE (FwPlotStack, fw_plot_stack, FW, PLOT_STACK, GtkWidget)

GtkWidget *fw_plot_stack_new (void);

void fw_plot_stack_set_context (FwPlotStack *self, FwFeatureCache *cache, FwViewport *viewport);
FwViewport *fw_plot_stack_get_viewport (FwPlotStack *self);

/* Column sources; clip or set NULL in column 1 removes the second column. */
void fw_plot_stack_set_column (FwPlotStack *self, guint column, FwClip *clip, FwParamSet *set);
guint fw_plot_stack_get_n_columns (FwPlotStack *self);
/* Title of a column header ("hive-03.flac · long-window"). */
void fw_plot_stack_set_column_title (FwPlotStack *self, guint column, const char *title);

/* Rows shown, top to bottom. */
void fw_plot_stack_set_rows (FwPlotStack *self, const FwPlotKind *kinds, guint n_kinds);
guint fw_plot_stack_get_n_rows (FwPlotStack *self);
FwPlotKind fw_plot_stack_get_row_kind (FwPlotStack *self, guint index);
/* The row of a kind in a column, or NULL. */
FwPlotRow *fw_plot_stack_get_row (FwPlotStack *self, guint column, FwPlotKind kind);
FwTimeRuler *fw_plot_stack_get_ruler (FwPlotStack *self, guint column);

/* Lock every row's colour range to its group's shared range (across columns). */
void fw_plot_stack_set_lock_ranges (FwPlotStack *self, gboolean lock);
gboolean fw_plot_stack_get_lock_ranges (FwPlotStack *self);

gboolean fw_plot_stack_is_busy (FwPlotStack *self);
/* The longest duration of the data shown (0 while nothing is loaded). */
double fw_plot_stack_get_duration (FwPlotStack *self);
void fw_plot_stack_reload (FwPlotStack *self);
void fw_plot_stack_cancel (FwPlotStack *self);

/* Signals: "readout" (const char *text or NULL), "state-changed" (busy or data changed),
 * "unpin" (the second column's close button). */

G_END_DECLS
