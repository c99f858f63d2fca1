/* fw-render-heatmap.h: a feature matrix (spectrogram, dB, mel, MFCC, deltas, differences) as
 * one raster image at the target resolution.
 *
 * Each output pixel covers a time interval (its column) and an interval of the bin axis (its
 * row). Its value aggregates every cell whose frame centre time and bin position fall inside
 * that pixel:
 *   FW_AGGREGATE_MAX   the largest value: used for magnitudes, powers and their dB and mel
 *                      forms, so a narrow tone or a one-frame click never vanishes when many
 *                      cells share one pixel (zoomed-out views of long clips);
 *   FW_AGGREGATE_MEAN  the arithmetic mean in the value domain: used for signed values (MFCC,
 *                      deltas, differences), where a maximum would bias the picture.
 * When a pixel is smaller than a cell (zoomed in) it takes the cell under its centre, so cells
 * show as sharp blocks, never interpolated. Pixels outside every cell (before the first frame,
 * after the last) are transparent. Aggregation runs separably: over time per column, then over
 * bins per pixel row, both exact for rectangular blocks.
 *
 * Bin axes (see FwAxis): linear-frequency matrices (FW_BIN_AXIS_HZ) map their rows through a
 * linear, logarithmic or mel frequency axis; mel-band matrices are drawn one equal-height cell
 * per band (FW_AXIS_BANDS, labelled in Hz, or by band index); coefficient matrices one cell per
 * coefficient with integer ticks; scalar matrices one cell.
 */
#pragma once

#include <stdbool.h>

#include <cairo.h>
#include <glib.h>

#include "fw-analysis.h"
#include "fw-axis.h"
#include "fw-colour-scale.h"
#include "fw-matrix.h"

G_BEGIN_DECLS

typedef enum { FW_AGGREGATE_MAX, FW_AGGREGATE_MEAN } FwAggregate;

/* MAX for spectrum, db, mel and mel-db; MEAN for everything else. */
FwAggregate fw_aggregate_for_stage (FwStage stage);

typedef struct {
  const FwColourScale *scale;
  FwValueRange range;       /* data value -> colour: lo is entry 0, hi entry 255 */
  FwAggregate aggregate;
  double t0, t1;            /* time shown, seconds (t1 > t0) */
  FwAxisScale freq_scale;   /* FW_BIN_AXIS_HZ matrices: linear, log or mel */
  FwMelScale mel_scale;     /* the mel formula for freq_scale == FW_AXIS_MEL */
  double f_lo, f_hi;        /* Hz range for FW_BIN_AXIS_HZ (f_hi <= 0: up to the last bin
                             * edge; a log axis starts at max(f_lo, first non-zero bin)) */
  bool band_index;          /* mel-band matrices: y axis in band index rather than Hz */
} FwHeatmapSpec;

/* Defaults for a matrix and its stage: the stage's default colour scale kind, automatic range
 * (fw_value_range_auto with the stage's rule over the whole matrix), aggregation, the time range
 * from the first to the last frame cell edge, linear frequency axis, slaney mel formula. */
void fw_heatmap_spec_init (FwHeatmapSpec *spec, const FwMatrix *m, FwStage stage);

/* The bin (vertical) axis a matrix is drawn with, spanning y_bottom (low bins) to y_top, and
 * the tick style its labels use. axis->band_hz borrows m->bin_value for mel-band matrices. */
void fw_heatmap_bin_axis (const FwMatrix *m, const FwHeatmapSpec *spec, double y_bottom,
                          double y_top, FwAxis *axis, FwTickStyle *style);

/* Renders m into a new ARGB32 image of width x height pixels (the data area at the target
 * resolution). Returns NULL (with a message in *error when asked) when the size is not
 * positive or above 16384, or the spec is invalid. */
cairo_surface_t *fw_heatmap_render (const FwMatrix *m, const FwHeatmapSpec *spec, int width,
                                    int height, GError **error);

/* Paints an image from fw_heatmap_render into the rectangle (x, y, w, h) as one raster: in SVG
 * and PDF this becomes a single embedded image, drawn without interpolation. */
void fw_heatmap_paint (cairo_t *cr, cairo_surface_t *image, double x, double y, double w,
                       double h);

G_END_DECLS
