/* fw-plot-row.h: one time-aligned plot row (waveform, heatmap or descriptor curve).
 *
 * A row shows one stage of one clip under one parameter set. It gets its data from the
 * feature cache in the background (the waveform loads the clip's audio), maps time through
 * the window's FwViewport only, and draws with the src/render functions the exporter uses.
 * A heatmap is rendered once into a texture at the widget's scale factor and replayed; the
 * cursor, hover mark and selection are drawn over it.
 *
 * Every row's data area has the same left and right edges (fixed gutters for the value axis
 * and the colour bar), so the same time falls on the same x in every row of a column.
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-axis.h"
#include "fw-colour-scale.h"
#include "fw-feature-cache.h"
#include "fw-param-set.h"
#include "fw-viewport.h"

G_BEGIN_DECLS

typedef enum {
  FW_PLOT_WAVEFORM,
  FW_PLOT_SPECTROGRAM,  /* stage db */
  FW_PLOT_MEL,          /* stage mel-db */
  FW_PLOT_MFCC,
  FW_PLOT_DELTA,
  FW_PLOT_DELTA2,
  FW_PLOT_RMS,
  FW_PLOT_ZCR,
  FW_PLOT_CENTROID,
  FW_PLOT_BANDWIDTH,
  FW_PLOT_ROLLOFF,
  FW_PLOT_FLATNESS,
  FW_N_PLOT_KINDS
} FwPlotKind;

/* Stable ids ("waveform", "db", "mel-db", "mfcc", "delta", "delta2", "rms", ...), as used
 * by the exporter's row names and the state file. */
const char *fw_plot_kind_id (FwPlotKind kind);
gboolean fw_plot_kind_from_id (const char *id, FwPlotKind *out);
/* Translated title ("Spectrogram (dB)"). */
const char *fw_plot_kind_title (FwPlotKind kind);
/* The stage drawn; FW_STAGE_SIGNAL for the waveform. */
FwStage fw_plot_kind_stage (FwPlotKind kind);
gboolean fw_plot_kind_is_heatmap (FwPlotKind kind);

/* Gutters beside the data area, in pixels: value axis on the left, colour bar on the right
 * (kept even by rows without a colour bar). Shared with the time ruler. */
#define FW_PLOT_GUTTER_LEFT 60
#define FW_PLOT_GUTTER_RIGHT 96
#define FW_PLOT_TITLE_HEIGHT 20

#define FW_TYPE_PLOT_ROW (fw_plot_row_get_type ())
G_DECLARE_FINAL_TYPE (FwPlotRow, fw_plot_row, FW, PLOT_ROW, GtkWidget)

FwPlotRow *fw_plot_row_new (FwPlotKind kind, FwViewport *viewport);
FwPlotKind fw_plot_row_get_kind (FwPlotRow *self);

/* What to show. Restarts the computation; follows the set's later edits by itself. */
void fw_plot_row_set_source (FwPlotRow *self, FwFeatureCache *cache, FwClip *clip,
                             FwParamSet *set);
FwClip *fw_plot_row_get_clip (FwPlotRow *self);
FwParamSet *fw_plot_row_get_param_set (FwPlotRow *self);
/* The parameters of the data shown (may lag the set while recomputing). */
FwParams *fw_plot_row_get_params (FwPlotRow *self);

/* Data shown (transfer none): the matrix of heatmap/curve rows, the audio of the waveform. */
FwMatrix *fw_plot_row_get_matrix (FwPlotRow *self);
FwAudio *fw_plot_row_get_audio (FwPlotRow *self);
/* Seconds of data shown (0 until loaded). */
double fw_plot_row_get_duration (FwPlotRow *self);

gboolean fw_plot_row_is_busy (FwPlotRow *self);
/* Message shown instead of data (file missing, bad parameters, cancelled), or NULL. */
const char *fw_plot_row_get_message (FwPlotRow *self);
void fw_plot_row_reload (FwPlotRow *self);

/* Shows a matrix the caller computed (the compare view) instead of a clip's stage: the row
 * leaves the cache for good and draws `matrix` (NULL: nothing) as a heatmap or a curve after
 * its kind. stage says what the values are (colour scale, range rule, bin axis labels);
 * params (may be NULL) feed the quantity label unless `quantity` is given; title replaces
 * the kind's title; unit (may be NULL) is the readout's unit. signed_values: the values are
 * differences (diverging scale, range symmetric about zero, mean per pixel; curves keep zero
 * in view and draw a zero line). */
void fw_plot_row_set_data (FwPlotRow *self, FwMatrix *matrix, FwParams *params, FwStage stage,
                           const char *title, const char *quantity, const char *unit,
                           gboolean signed_values);
/* The title shown above the data. */
const char *fw_plot_row_get_title (FwPlotRow *self);
void fw_plot_row_cancel (FwPlotRow *self);

/* Appearance. */
void fw_plot_row_set_colour_scale (FwPlotRow *self, const char *name);
const char *fw_plot_row_get_colour_scale (FwPlotRow *self);
/* FW_RANGE_AUTO, FW_RANGE_FIXED (range given) or FW_RANGE_LOCKED (the stack supplies a
 * shared range with fw_plot_row_set_shared_range). */
void fw_plot_row_set_range_mode (FwPlotRow *self, FwRangeMode mode, const FwValueRange *fixed);
FwRangeMode fw_plot_row_get_range_mode (FwPlotRow *self);
void fw_plot_row_set_shared_range (FwPlotRow *self, const FwValueRange *range);
/* The row's automatic range (FALSE before data arrives). */
gboolean fw_plot_row_get_auto_range (FwPlotRow *self, FwValueRange *out);
/* The range the colours use now. */
gboolean fw_plot_row_get_shown_range (FwPlotRow *self, FwValueRange *out);
/* Frequency axis of spectrogram rows: linear, log or mel. */
void fw_plot_row_set_frequency_scale (FwPlotRow *self, FwAxisScale scale);
FwAxisScale fw_plot_row_get_frequency_scale (FwPlotRow *self);
/* A key grouping rows whose values may share one colour range ("db", "mfcc", ...). */
const char *fw_plot_row_get_range_group (FwPlotRow *self);

/* Geometry in the row's own coordinates. */
void fw_plot_row_get_data_area (FwPlotRow *self, graphene_rect_t *out);
double fw_plot_row_time_to_x (FwPlotRow *self, double time);

/* The readout text for a point in the row (time, frequency/band/coefficient, value with
 * unit and reference); NULL outside the data area. */
char *fw_plot_row_describe_point (FwPlotRow *self, double x, double y);

/* Signals: "state-changed" (busy/data/message changed), "readout" (const char *text or
 * NULL when the pointer leaves), "range-changed" (automatic range changed),
 * "settings-changed" (scale, range mode or axis changed by the user). */

G_END_DECLS
