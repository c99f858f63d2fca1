/* fw-plot-draw.h: the one place where a plot row's vector parts are drawn.
 *
 * Everything here calls src/render (axes and ticks, waveform envelope, colour bar, text), the
 * same functions the figure exporter uses; the row widget only adds the heatmap texture
 * (rendered by fw_heatmap_render) and its cheap overlays.
 */
#pragma once

#include <cairo.h>

#include "fw-audio.h"
#include "fw-colour-scale.h"
#include "fw-params.h"
#include "fw-plot-row.h"
#include "fw-render-heatmap.h"
#include "fw-render-waveform.h"
#include "fw-theme.h"

G_BEGIN_DECLS

typedef struct {
  FwPlotKind kind;
  FwStage stage;
  const FwMatrix *matrix;          /* heatmap and curve rows */
  const FwAudio *audio;            /* waveform rows */
  FwParams *params;                /* of the data (quantity labels) */
  double t0, t1;                   /* visible time range */
  const FwColourScale *scale;
  FwValueRange range;
  gboolean have_range;
  FwAxisScale freq_scale;
  FwHeatmapSpec heatmap;           /* heatmap rows: the spec the texture was made with */
  FwValueRange trace_range;        /* curve rows: value range (percentiles) */
  gboolean have_trace_range;
  double x, y, w, h;               /* data area */
  FwWaveformEnvelope **envelope;   /* waveform rows: cache (reused while it fits) */
  const char *title;
  const char *quantity;            /* replaces the stage's quantity label when not NULL */
  gboolean zero_line;              /* curve rows: a line at zero (differences) */
} FwPlotDrawInfo;

/* Title, frame, value axis, colour bar (heatmaps), waveform envelope or descriptor trace. */
void fw_plot_draw_row (cairo_t *cr, const FwTheme *theme, const FwPlotDrawInfo *info);

G_END_DECLS
