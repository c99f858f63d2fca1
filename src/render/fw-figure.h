/* fw-figure.h: a figure = a stack of time-aligned rows for one clip and parameter set.
 *
 * Rows (top to bottom in the order added): a waveform, heatmaps of any matrix (spectrogram,
 * db, mel, mel-db, mfcc, delta, delta2, differences) and traces of per-frame descriptors (rms,
 * zcr, centroid, bandwidth, rolloff, flatness). Optionally a spectrum panel below the rows, a
 * title above, panel letters (a), (b), ... and a caption line naming the clip, the parameter
 * set and its hash.
 *
 * Layout (fw_figure_layout), left to right for every row:
 *   margin | letter column | y-axis title (rotated, wrapped) | tick labels | ticks |
 *   DATA AREA | gutter (colour bars and quantity labels) | margin
 * Heatmap rows put a colour bar with the quantity label in the gutter, trace rows just the
 * quantity label (their y-axis title is short: "Centroid (Hz)"), the waveform nothing.
 * The column widths are the maxima over all rows, so every row's data area has exactly the same
 * left and right edges (FwFigureLayout.data_left / data_right), with or without a colour bar.
 * Time maps linearly onto [data_left, data_right] for every row, from each matrix' own frame
 * times, so rows computed with different hops line up. Row heights share the space left after
 * the fixed parts by weight (heatmaps 1, waveform and traces 0.6, spectrum panel 1). With a
 * snap grid (e.g. one device pixel) all edges land on the grid.
 *
 * Ranges: each heatmap row has a range mode: automatic (its own FwHeatmapSpec range, from
 * fw_value_range_auto over the shown time range), fixed, or locked (all locked rows with the same
 * quantity label share the union of their automatic ranges).
 *
 * The figure keeps references to the matrices and audio it is given; it never computes on its
 * own except in fw_figure_add_rows, the convenience used by the exporter and the CLI.
 */
#pragma once

#include <stdbool.h>

#include <cairo.h>
#include <glib.h>

#include "fw-audio.h"
#include "fw-axis.h"
#include "fw-colour-scale.h"
#include "fw-params.h"
#include "fw-render-heatmap.h"
#include "fw-render-spectrum.h"
#include "fw-render-waveform.h"
#include "fw-theme.h"

G_BEGIN_DECLS

#define FW_FIGURE_MAX_ROWS 16

/* Physical size presets (mm): single and double journal columns. */
#define FW_FIGURE_WIDTH_SINGLE_MM 85.0
#define FW_FIGURE_WIDTH_DOUBLE_MM 175.0

typedef enum {
  FW_ROW_WAVEFORM,
  FW_ROW_HEATMAP,
  FW_ROW_TRACE,
} FwRowKind;

typedef struct {
  double x, y, w, h;
} FwRect;

typedef struct {
  double width, height;            /* the figure, user units */
  double data_left, data_right;    /* shared by every row and the spectrum panel */
  size_t n_rows;
  FwRect data[FW_FIGURE_MAX_ROWS];   /* each row's data area */
  FwRect gutter[FW_FIGURE_MAX_ROWS]; /* each row's gutter (colour bar column) */
  bool has_colour_bar[FW_FIGURE_MAX_ROWS];
  double letter_x;                 /* left edge of the letter column */
  double title_x;                  /* left edge of the y-axis title column */
  double title_w;                  /* width of the y-axis title column */
  double gutter_w;                 /* width of the gutter column (0 when no row has a bar) */
  double time_axis_y;              /* bottom edge of the last row (time labels below) */
  bool has_spectrum;
  FwRect spectrum;                 /* the spectrum panel's data area */
  FwRect title;                    /* the title line (h = 0 when none) */
  FwRect caption;                  /* the caption line (h = 0 when none) */
} FwFigureLayout;

typedef struct _FwFigure FwFigure;

FwFigure *fw_figure_new (void);
void fw_figure_free (FwFigure *fig);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwFigure, fw_figure_free)

/* Provenance and caption: clip (path or name as given), the parameter set's name (NULL for a
 * file or defaults) and the parameters (referenced); analysis_rate is the rate the features
 * were computed at (recorded in the recipe). */
void fw_figure_set_source (FwFigure *fig, const char *clip, const char *param_set_name,
                           FwParams *params, double analysis_rate);
void fw_figure_set_title (FwFigure *fig, const char *title);   /* NULL or "" = none */
void fw_figure_set_letters (FwFigure *fig, bool letters);       /* default true */
void fw_figure_set_caption (FwFigure *fig, bool caption);       /* default true */
/* Time shown by every row, seconds; t1 <= t0 means "the whole clip" (default). */
void fw_figure_set_time_range (FwFigure *fig, double t0, double t1);
void fw_figure_get_time_range (FwFigure *fig, double *t0, double *t1);

/* Rows. Each returns the new row's index, or -1 when FW_FIGURE_MAX_ROWS rows exist.
 * quantity_label NULL takes fw_feature_quantity_label (stage, params) of the figure's
 * parameters (and follows later fw_figure_set_source calls). */
int fw_figure_add_waveform (FwFigure *fig, FwAudio *audio);
int fw_figure_add_matrix (FwFigure *fig, FwStage stage, FwMatrix *m, const char *quantity_label);
size_t fw_figure_get_n_rows (FwFigure *fig);
FwRowKind fw_figure_row_kind (FwFigure *fig, size_t row);
/* The stage a row shows (FW_STAGE_SIGNAL for the waveform). */
FwStage fw_figure_row_stage (FwFigure *fig, size_t row);
FwMatrix *fw_figure_row_matrix (FwFigure *fig, size_t row);   /* transfer none; NULL for waveform */

/* Per-row settings (for heatmap rows; the spec's t0/t1 are overridden by the figure's range). */
FwHeatmapSpec *fw_figure_row_heatmap_spec (FwFigure *fig, size_t row);
FwWaveformSpec *fw_figure_waveform_spec (FwFigure *fig);
void fw_figure_row_set_range (FwFigure *fig, size_t row, FwRangeMode mode,
                              const FwValueRange *fixed);
/* Settings for every heatmap row at once: the colour scale replaces the scale of rows of the
 * same kind (a sequential scale for sequential rows, a diverging one for diverging rows); the
 * frequency scale applies to linear-frequency rows and the spectrum panel. */
void fw_figure_set_colour_scale (FwFigure *fig, const FwColourScale *scale);
void fw_figure_set_range (FwFigure *fig, FwRangeMode mode, const FwValueRange *fixed);
void fw_figure_set_freq_scale (FwFigure *fig, FwAxisScale scale);
void fw_figure_set_band_index (FwFigure *fig, bool band_index);

/* Spectrum panel below the rows from a spectral matrix (referenced). */
void fw_figure_set_spectrum (FwFigure *fig, FwStage stage, FwMatrix *m, FwSpectrumPanelMode mode,
                             double t0, double t1);

/* Parses a comma-separated row list ("waveform,db,mel-db,mfcc": "waveform" or any stage name of
 * fw_feature_stage_names()), computes the stages of `audio` with `params` (fw_feature_compute)
 * and adds the rows. The error names the row and the cause. */
gboolean fw_figure_add_rows (FwFigure *fig, const char *rows, FwAudio *audio, FwParams *params,
                             GCancellable *cancellable, GError **error);

/* The height (user units) at which rows get their natural heights for a figure `width` wide:
 * heatmap rows 0.12 width + 36 (about 23 mm at 85 mm, 34 mm at 175 mm when units are pt),
 * waveform and trace rows 0.6 of that, plus the fixed parts. */
double fw_figure_natural_height (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width);
/* The smallest height at which every row keeps at least 3 tick-font sizes of data area. */
double fw_figure_min_height (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width);

/* Computes the layout for a figure of width x height user units (cr only measures text).
 * snap > 0 rounds every data-area edge to a multiple of snap (one device pixel for PNG). */
void fw_figure_layout (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width,
                       double height, double snap, FwFigureLayout *out);

/* Draws the figure at (0, 0) in user units. raster_scale is heatmap pixels per user unit
 * (e.g. dpi / 72 for exports measured in points); snap as for fw_figure_layout. FALSE with an
 * error when a heatmap cannot be rendered (too large). */
gboolean fw_figure_draw (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width,
                         double height, double raster_scale, double snap, GError **error);

/* The provenance recipe (see fw-recipe.h), caller frees. */
char *fw_figure_dup_recipe (FwFigure *fig);
/* The caption line ("clip.flac · parameters default · hash 0123456789abcdef"), caller frees. */
char *fw_figure_dup_caption (FwFigure *fig);
/* The methods sentence for the figure's parameters (fw_params_describe_methods), or NULL. */
char *fw_figure_dup_methods (FwFigure *fig);

G_END_DECLS
