/* fw-axis.h: value <-> pixel mapping for plot axes, "nice" tick values and tick labels.
 *
 * Mapping (FwAxis, a plain value):
 *   linear  p = p0 + (v - v0) / (v1 - v0) * (p1 - p0)
 *   log     the same in log10(v) (v > 0)
 *   mel     the same in mel(v) for a mel scale (htk or slaney, fw-mel.h); v in Hz
 *   bands   v in Hz, positions linear in fractional band index: band k's centre frequency sits
 *           at index k, frequencies between centres are interpolated linearly and the ends are
 *           extrapolated from the outer two centres. This is how mel-band matrices are drawn
 *           (one equal-height cell per band), still labelled in Hz.
 * p0 may be larger than p1 (a y axis growing upwards has p0 at the bottom).
 *
 * Tick values:
 *   fw_nice_number / fw_nice_loose_labels follow P. S. Heckbert, "Nice numbers for graph
 *   labels", Graphics Gems (1990), pp. 61-63, 657-659: a step rounded to 1, 2 or 5 x 10^k and
 *   "loose" labels that extend the range to multiples of the step.
 *   fw_ticks_* pick ticks inside a range (plots do not stretch their data range to a nice
 *   value); logarithmic, mel and band axes take candidates 1, 2, 5 x 10^k (and their other
 *   multiples when room allows) in order of roundness and keep those that fit.
 *   fw_axis_choose_ticks measures each label with Pango in the theme's tick font and thins the
 *   ticks until neighbouring labels keep a gap; it is what the drawing code and tests use.
 *
 * Labels: numbers in the current locale's decimal format, minus as U+2212; frequencies in Hz,
 * or kHz when the largest tick is at least 1000 Hz (the FwTicks.unit says which); time in ms,
 * s or min:s depending on the span shown (fw_time_unit_for_span).
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#include <cairo.h>
#include <glib.h>

#include "fw-mel.h"
#include "fw-theme.h"

G_BEGIN_DECLS

typedef enum {
  FW_AXIS_LINEAR,
  FW_AXIS_LOG,
  FW_AXIS_MEL,
  FW_AXIS_BANDS,
} FwAxisScale;

#define FW_AXIS_BANDS_MAX 1024

typedef struct {
  FwAxisScale scale;
  FwMelScale mel_scale;   /* FW_AXIS_MEL only */
  double v0, v1;          /* values at p0 and p1 (Hz for log/mel/bands; index range for bands
                           * is derived from them) */
  double p0, p1;          /* pixel (user-space) positions */
  double u0, u1;          /* v0, v1 in the mapping's internal coordinate (read-only) */
  size_t n_bands;         /* FW_AXIS_BANDS: number of band centres */
  const double *band_hz;  /* FW_AXIS_BANDS: n_bands increasing centre frequencies (borrowed;
                           * must outlive the axis) */
} FwAxis;

/* "linear", "log", "mel" (the frequency-axis choices offered to users). */
const char *fw_axis_scale_name (FwAxisScale scale);
gboolean fw_axis_scale_from_name (const char *name, FwAxisScale *out);

/* Linear, log or mel axis (mel uses FW_MEL_SCALE_SLANEY unless fw_axis_init_mel is used).
 * Log axes need v0, v1 > 0. */
void fw_axis_init (FwAxis *axis, FwAxisScale scale, double v0, double v1, double p0, double p1);
void fw_axis_init_mel (FwAxis *axis, FwMelScale mel_scale, double v0, double v1,
                       double p0, double p1);
/* Band axis: band index i0 at p0 and i1 at p1 (fractional; a full matrix is -0.5 .. n-0.5). */
void fw_axis_init_bands (FwAxis *axis, const double *band_hz, size_t n_bands,
                         double i0, double i1, double p0, double p1);

double fw_axis_value_to_pixel (const FwAxis *axis, double value);
double fw_axis_pixel_to_value (const FwAxis *axis, double pixel);
/* The mapping's internal coordinate (value, log10, mel or band index) and its inverse. */
double fw_axis_forward (const FwAxis *axis, double value);
double fw_axis_inverse (const FwAxis *axis, double u);

/* ---- Heckbert's nice numbers (pure functions) ---- */

/* A "nice" number close to x > 0: 1, 2, 5 or 10 times a power of ten. round = true rounds to
 * the nearest (thresholds 1.5, 3, 7), round = false takes the smallest nice number >= x. */
double fw_nice_number (double x, bool round);

typedef struct {
  double graph_min;   /* floor(min / step) * step */
  double graph_max;   /* ceil(max / step) * step */
  double step;        /* nice step */
  int n_frac;         /* decimals needed to show the labels: max(-floor(log10 step), 0) */
  int n_ticks;        /* (graph_max - graph_min) / step + 1 */
} FwNiceLabels;

/* Heckbert's loose labelling for about n_ticks (>= 2) ticks over [min, max]. */
void fw_nice_loose_labels (double min, double max, int n_ticks, FwNiceLabels *out);

/* ---- Tick sets ---- */

#define FW_TICKS_MAX 64
#define FW_TICK_LABEL_MAX 32

typedef struct {
  double value;                    /* in axis values (Hz for frequency axes, seconds for time) */
  char label[FW_TICK_LABEL_MAX];   /* UTF-8 */
} FwTick;

typedef struct {
  size_t n;
  double step;                     /* spacing for linear ticks; 0 for candidate-based ticks */
  int n_frac;
  char unit[16];                   /* "Hz", "kHz", "ms", "s", "min:s" or "" */
  FwTick ticks[FW_TICKS_MAX];
} FwTicks;

typedef enum {
  FW_TICK_NUMBER,     /* plain numbers */
  FW_TICK_INTEGER,    /* integers only, step >= 1 (coefficient and band indices) */
  FW_TICK_FREQUENCY,  /* Hz / kHz */
  FW_TICK_TIME,       /* ms, s or min:s by span */
} FwTickStyle;

typedef enum { FW_TIME_MS, FW_TIME_S, FW_TIME_MIN_S } FwTimeUnit;

/* Unit for labelling a shown span [t0, t1] (seconds): min:s when the span is at least 120 s,
 * ms when it is under 1 s and t1 is under 10 s, seconds otherwise. */
FwTimeUnit fw_time_unit_for_span (double t0, double t1);
/* Formats t seconds in a unit with n_frac decimals ("1:05", "250", "1.25"). */
void fw_time_format (double t, FwTimeUnit unit, int n_frac, char *buf, size_t size);
/* "Time (s)", "Time (ms)", "Time (min:s)" (translated). */
const char *fw_time_unit_axis_title (FwTimeUnit unit);

/* Ticks at Heckbert's step for about `target` (>= 2) ticks, only those inside [lo, hi]
 * (with a tolerance of 1e-9 step). Labels per style; FW_TICK_TIME chooses its unit from the
 * span and, for min:s, steps from 1-2-5-10-15-30 s / 1-2-5-10-15-30 min. */
void fw_ticks_linear (double lo, double hi, int target, FwTickStyle style, FwTicks *out);
/* Candidate ticks for log, mel and band axes: values c x 10^k in [lo, hi] with c in 1, 5, 2
 * (then 3, 4, 6, 7, 8, 9 when dense = true), taken in that order of roundness and kept when
 * at least min_gap pixels from every kept tick on `axis`. Sorted by value. */
void fw_ticks_candidates (const FwAxis *axis, double min_gap, bool dense, FwTickStyle style,
                          FwTicks *out);
/* Re-labels ticks in a style (chooses Hz or kHz, time unit etc.). */
void fw_ticks_format (FwTicks *ticks, FwTickStyle style, double span_lo, double span_hi);

/* ---- Layout with real text measurements ---- */

/* Extent of each label along the axis measured in the theme's tick font: the logical (advance)
 * width along horizontal axes, the ink height along vertical ones; out[i] for ticks->ticks[i]. */
void fw_ticks_measure (cairo_t *cr, const FwTheme *theme, const FwTicks *ticks,
                       bool horizontal, double *out);
/* The largest label width and height in the tick font (for margins). */
void fw_ticks_max_label_size (cairo_t *cr, const FwTheme *theme, const FwTicks *ticks,
                              double *width, double *height);
/* TRUE when two neighbouring labels, centred on their ticks, come closer than min_gap. */
gboolean fw_ticks_overlap (cairo_t *cr, const FwTheme *theme, const FwAxis *axis,
                           const FwTicks *ticks, bool horizontal, double min_gap);
/* Minimum gap between neighbouring labels used by fw_axis_choose_ticks: one font size along a
 * horizontal axis, 0.4 font size along a vertical one. */
double fw_axis_label_gap (const FwTheme *theme, bool horizontal);

/* Chooses ticks for a drawn axis: as many as fit with a comfortable spacing (about 5 em along
 * horizontal axes, 3.5 em along vertical ones), thinned until labels do not overlap (gap from
 * fw_axis_label_gap). Linear axes use Heckbert steps, other scales candidates. Labels may
 * reach at most `overhang` beyond the axis' pixel range (ticks whose centred label would reach
 * further are dropped; stacked rows pass half their gap so neighbours' labels never touch;
 * pass a large value for no limit). */
void fw_axis_choose_ticks (cairo_t *cr, const FwTheme *theme, const FwAxis *axis,
                           FwTickStyle style, bool horizontal, double overhang,
                           FwTicks *out);

typedef enum { FW_EDGE_LEFT, FW_EDGE_RIGHT, FW_EDGE_BOTTOM, FW_EDGE_TOP } FwEdge;

/* Draws outward tick marks at `ticks` along a line at `edge_pos` (x for left/right edges,
 * y for top/bottom) and, when labels is true, their labels beyond the marks. Ticks whose
 * position falls outside the axis' pixel range are skipped. Colour: theme foreground. */
void fw_axis_draw (cairo_t *cr, const FwTheme *theme, const FwAxis *axis, const FwTicks *ticks,
                   FwEdge edge, double edge_pos, bool labels);

G_END_DECLS
