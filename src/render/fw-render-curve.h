/* fw-render-curve.h: descriptor rows: one value per frame drawn as a line over time.
 *
 * A curve is column 0 of a matrix (the per-frame descriptors rms, zcr, centroid, bandwidth,
 * rolloff and flatness have exactly one; differences of them too), drawn over the time range
 * [t0, t1] that every row shares: a frame's centre time t sits at
 *     x + (t - t0) / (t1 - t0) * w,
 * its value v at the value axis' pixel (fw_curve_value_axis: range.lo at the bottom edge,
 * range.hi at the top edge). The same mapping is used by the figure exporter and on screen.
 *
 * Zoomed in (at most two shown frames per column) the line joins the frames themselves, from
 * one frame before t0 to one frame after t1, so it runs to both edges. Zoomed out it reduces
 * the frames inside [t0, t1] to their minimum and maximum in each of n_columns equal columns:
 * the line visits both at the column's centre, in the order they occur in time, so a one-frame
 * peak keeps its full height at any zoom. Non-finite values break the line (a column whose
 * frames are all non-finite breaks it too); a lone finite frame between breaks shows as a dot.
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include <cairo.h>
#include <glib.h>

#include "fw-analysis.h"
#include "fw-axis.h"
#include "fw-colour-scale.h"
#include "fw-matrix.h"
#include "fw-theme.h"

G_BEGIN_DECLS

typedef struct {
  double t0, t1;          /* time shown, seconds (t1 > t0) */
  FwValueRange range;     /* values at the bottom (lo) and top (hi) edge of the data area */
  FwTickStyle style;      /* value-axis labels (FW_TICK_FREQUENCY: Hz or kHz) */
  const char *unit;       /* unit set above the value labels; NULL: the ticks' own ("kHz") */
  int n_columns;          /* min/max columns across the width; <= 0: one per user unit */
  bool zero_line;         /* a muted line at value 0 under the curve (differences) */
} FwCurveSpec;

/* The value-axis style for a descriptor stage: frequencies (centroid, bandwidth, rolloff) as
 * Hz/kHz, anything else as plain numbers. */
FwTickStyle fw_curve_tick_style (FwStage stage);

/* Defaults: the stage's tick style, range 0..1 (set a real one, e.g. fw_curve_auto_range),
 * no unit override, one column per user unit, no zero line. */
void fw_curve_spec_init (FwCurveSpec *spec, FwStage stage, double t0, double t1);

/* The smallest and largest finite value of the frames whose times lie in [t0, t1], widened to
 * Heckbert's loose labels for about four ticks (fw_nice_loose_labels). FALSE (and 0..1) when
 * there is no such value. */
gboolean fw_curve_auto_range (const FwMatrix *m, double t0, double t1, FwValueRange *out);

/* The value (vertical) axis: spec->range.lo at y_bottom, spec->range.hi at y_top; an empty or
 * non-finite range is widened so the mapping stays defined. */
void fw_curve_value_axis (const FwCurveSpec *spec, double y_bottom, double y_top, FwAxis *axis);

/* Draws the curve (and the zero line) into the data area (x, y, w, h), clipped to it, with the
 * theme's trace colour and width. Nothing else: no background, frame or axis. */
void fw_curve_draw (cairo_t *cr, const FwTheme *theme, const FwCurveSpec *spec,
                    const FwMatrix *m, double x, double y, double w, double h);

/* A whole descriptor row's data area: the data background, the curve, and the value axis on
 * its left edge (ticks thinned to fit, labels left of x) with the unit (spec->unit or the
 * ticks' unit, e.g. "kHz") set above the labels. The caller draws the frame and title. */
void fw_curve_draw_row (cairo_t *cr, const FwTheme *theme, const FwCurveSpec *spec,
                        const FwMatrix *m, double x, double y, double w, double h);

G_END_DECLS
