/* fw-render-waveform.h: waveform rows: a min/max envelope per pixel column with an RMS band.
 *
 * Each column of the data area covers a time interval; its envelope is the minimum and maximum
 * of the signal over that interval (the samples inside plus the linearly interpolated values
 * at both interval ends, so neighbouring columns connect when zoomed in). A single-sample spike
 * therefore reaches its full height in its column at every zoom level, and each column is drawn
 * at least one line width tall so silence still shows as a line. The RMS band is the
 * root-mean-square over a window of max(column span, rms_window) centred on the column.
 *
 * Amplitude axes: linear (+-linear_limit; 1.0 is full scale) or dBFS. In dBFS the envelope is
 * the peak level 20 log10(max |x|) from the axis floor up, and the RMS band the RMS level in
 * dBFS by the AES17 convention used elsewhere in Framewise (RMS in dB re 1.0 plus 3.01 dB, so a
 * full-scale sine reads 0 dBFS).
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include <cairo.h>
#include <glib.h>

#include "fw-axis.h"
#include "fw-theme.h"

G_BEGIN_DECLS

typedef enum { FW_AMPLITUDE_LINEAR, FW_AMPLITUDE_DBFS } FwAmplitudeScale;

/* "linear", "dbfs" */
const char *fw_amplitude_scale_name (FwAmplitudeScale scale);
gboolean fw_amplitude_scale_from_name (const char *name, FwAmplitudeScale *out);

typedef struct {
  FwAmplitudeScale amplitude;
  double t0, t1;          /* time shown, seconds */
  double linear_limit;    /* linear axis spans -limit .. +limit (default 1.0 = full scale) */
  double dbfs_floor;      /* bottom of the dBFS axis (default -60) */
  bool show_rms;          /* default true */
  double rms_window;      /* seconds (default 0.02) */
} FwWaveformSpec;

/* Defaults for a clip of `duration` seconds (t0 = 0, t1 = duration). */
void fw_waveform_spec_init (FwWaveformSpec *spec, double duration);

typedef struct {
  int n_columns;
  double t0, t1;
  float *min;     /* per column; NaN where the column lies outside the signal */
  float *max;
  float *rms;
} FwWaveformEnvelope;

/* Envelope of `samples` (sample i at time i / sample_rate) over [t0, t1] in n_columns columns.
 * NULL when n_columns < 1 or t1 <= t0. */
FwWaveformEnvelope *fw_waveform_envelope_new (const float *samples, size_t n_samples,
                                              double sample_rate, double t0, double t1,
                                              int n_columns, double rms_window);
void fw_waveform_envelope_free (FwWaveformEnvelope *env);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwWaveformEnvelope, fw_waveform_envelope_free)

/* The amplitude (vertical) axis from y_bottom to y_top and its tick style. */
void fw_waveform_axis (const FwWaveformSpec *spec, double y_bottom, double y_top, FwAxis *axis);
/* "Amplitude" or "Level (dBFS)" (translated). */
const char *fw_waveform_axis_title (const FwWaveformSpec *spec);

/* Draws the envelope (and RMS band) into the data area (x, y, w, h); env->n_columns columns
 * span the width. Colours from the theme. Clipped to the rectangle. */
void fw_waveform_draw (cairo_t *cr, const FwTheme *theme, const FwWaveformSpec *spec,
                       const FwWaveformEnvelope *env, double x, double y, double w, double h);

G_END_DECLS
