/* fw-render-spectrum.h: spectrum panels (frequency on the x axis, value on the y axis).
 *
 * A panel shows one spectrum taken from a spectral matrix (power, magnitude, db, mel, mel-db):
 *   FW_SPECTRUM_PANEL_WHOLE  the average over every frame of the clip,
 *   FW_SPECTRUM_PANEL_FRAME  the frame whose centre is nearest to time t0,
 *   FW_SPECTRUM_PANEL_RANGE  the average over the frames whose centres lie in [t0, t1].
 * Averages of dB values are taken in the power domain (10^(v/10), averaged, back to dB), so a
 * loud frame counts by its energy; other values are averaged arithmetically.
 * The x axis is the matrix' bin axis laid horizontally (linear, log or mel frequency for linear
 * bins; equal-width bands labelled in Hz for mel bands; index for coefficients). The y axis
 * is linear in the matrix' values with Heckbert's loose labels over the shown values (dB
 * panels at most FW_RANGE_DB_SPAN below the peak).
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include <cairo.h>
#include <glib.h>

#include "fw-axis.h"
#include "fw-matrix.h"
#include "fw-render-heatmap.h"
#include "fw-theme.h"

G_BEGIN_DECLS

typedef enum {
  FW_SPECTRUM_PANEL_WHOLE,
  FW_SPECTRUM_PANEL_FRAME,
  FW_SPECTRUM_PANEL_RANGE,
} FwSpectrumPanelMode;

typedef struct {
  FwSpectrumPanelMode mode;
  double t0, t1;            /* FRAME: t0 is the time; RANGE: [t0, t1] */
  bool values_db;           /* the matrix holds dB values (average in the power domain) */
  FwAxisScale freq_scale;   /* as FwHeatmapSpec */
  FwMelScale mel_scale;
  double f_lo, f_hi;
  bool band_index;
} FwSpectrumSpec;

void fw_spectrum_spec_init (FwSpectrumSpec *spec, FwStage stage);

/* The spectrum: a new array of m->n_bins values; *n_frames_used says how many frames went in
 * (0 when none: NULL returned). */
double *fw_spectrum_panel_values (const FwMatrix *m, const FwSpectrumSpec *spec,
                                  size_t *n_frames_used);

/* The frequency axis from x_left to x_right (a heatmap spec with the same frequency settings
 * is used internally) and its tick style. */
void fw_spectrum_panel_x_axis (const FwMatrix *m, const FwSpectrumSpec *spec, double x_left,
                               double x_right, FwAxis *axis, FwTickStyle *style);
/* Loose y range for values (Heckbert): *lo, *hi. */
void fw_spectrum_panel_y_range (const FwMatrix *m, const double *values, bool values_db,
                                double *lo, double *hi);

/* Draws the spectrum line into the data area (x, y, w, h) with x_axis (from
 * fw_spectrum_panel_x_axis over [x, x + w]) and y_axis (values, bottom to top). Clipped. */
void fw_spectrum_panel_draw (cairo_t *cr, const FwTheme *theme, const FwMatrix *m,
                             const double *values, const FwAxis *x_axis, const FwAxis *y_axis,
                             double x, double y, double w, double h);

G_END_DECLS
