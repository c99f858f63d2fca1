/* fw-colour-scale.h: colour scales for heatmaps, and value ranges for mapping data onto them.
 *
 * Every scale is designed in CIELAB (CIE 1976 L*a*b*, D65 white) as a path in lightness, chroma
 * and hue, converted to sRGB (IEC 61966-2-1) and stored as a 256-entry lookup table:
 *   kiln       sequential: dark umber -> brick -> amber -> pale cream (hue 20 -> 95 deg)
 *   tidewater  sequential: deep navy -> teal -> pale aqua (hue 265 -> 180 deg)
 *   lichen     sequential: dark spruce -> moss -> pale straw (hue 150 -> 95 deg)
 *   graphite   sequential greyscale (a* = b* = 0)
 *   seesaw     diverging, for signed values and differences: blue (negative) -> neutral
 *              light grey (zero) -> rust (positive)
 * Sequential scales rise in L* strictly monotonically from entry 0 to 255 (L* runs linearly in
 * the design; colours outside the sRGB gamut lose chroma at constant L* and hue, and the 8-bit
 * table is nudged by at most one or two code values wherever rounding would break strict
 * monotonicity). The diverging scale has equal L* at symmetric entries (i and 255 - i) and a
 * neutral (a* = b* = 0 by design) midpoint. There is deliberately no rainbow scale: hue
 * changes that carry no data invent features.
 *
 * Value ranges (FwValueRange) map data values onto a scale; lo -> entry 0, hi -> entry 255,
 * values outside clamp. A row's range is automatic, fixed, or locked (shared by several rows
 * and columns; the caller computes the union of the rows' automatic ranges). Automatic rules:
 *   FW_RANGE_RULE_DB          dB rows: [max(max - 80 dB, 1st percentile), max] over the shown
 *                             time range: peaks at the top, the floor no lower than 80 dB
 *                             below them, and no colours spent below almost all of the data
 *   FW_RANGE_RULE_PERCENTILE  other non-negative or offset data: [1st, 99th] percentile
 *   FW_RANGE_RULE_SYMMETRIC   signed data and differences: [-a, a] with a the 99th percentile
 *                             of |x| (diverging scales put zero at the neutral midpoint)
 *   FW_RANGE_RULE_CEPSTRAL    MFCC: as SYMMETRIC but over coefficients 1 and above; c0 (the
 *                             log energy) is an order of magnitude larger and would leave every
 *                             other coefficient at the neutral midpoint, so it clamps instead
 * Non-finite values are ignored. Percentiles are taken on at most 2^20 evenly strided values.
 */
#pragma once

#include <stdbool.h>
#include <stdint.h>

#include <cairo.h>
#include <glib.h>

#include "fw-analysis.h"
#include "fw-matrix.h"

G_BEGIN_DECLS

typedef enum {
  FW_COLOUR_SCALE_SEQUENTIAL,
  FW_COLOUR_SCALE_DIVERGING,
} FwColourScaleKind;

#define FW_COLOUR_SCALE_SIZE 256

typedef struct _FwColourScale FwColourScale;

/* A scale by name (case-sensitive); NULL when there is none. */
const FwColourScale *fw_colour_scale_get (const char *name);
/* All scales in display order; *n receives the count. */
const FwColourScale *const *fw_colour_scale_list (size_t *n);
/* The default sequential ("kiln") or diverging ("seesaw") scale. */
const FwColourScale *fw_colour_scale_default (FwColourScaleKind kind);
/* Comma-separated names, for error messages and help ("kiln, tidewater, ..."). Caller frees. */
char *fw_colour_scale_names (void);

const char *fw_colour_scale_get_name (const FwColourScale *scale);
/* A translated one-line description. */
const char *fw_colour_scale_get_description (const FwColourScale *scale);
FwColourScaleKind fw_colour_scale_get_kind (const FwColourScale *scale);
/* 256 x {r, g, b} bytes (sRGB). */
const uint8_t *fw_colour_scale_get_lut (const FwColourScale *scale);

/* Colour at position t in [0, 1] (clamped; entry round(t * 255)). */
void fw_colour_scale_rgb (const FwColourScale *scale, double t, double *r, double *g, double *b);
/* The same as an opaque CAIRO_FORMAT_ARGB32/RGB24 pixel. */
static inline uint32_t
fw_colour_scale_pixel (const uint8_t *lut, double t)
{
  int i;
  if (!(t > 0))
    t = 0;
  if (t > 1)
    t = 1;
  i = (int) (t * (FW_COLOUR_SCALE_SIZE - 1) + 0.5);
  return 0xff000000u | ((uint32_t) lut[3 * i] << 16) | ((uint32_t) lut[3 * i + 1] << 8)
         | (uint32_t) lut[3 * i + 2];
}

/* A vertical or horizontal linear gradient with the scale's colours as stops, from (x0, y0)
 * (entry 0) to (x1, y1) (entry 255), for colour bars drawn as vectors. Caller destroys. */
cairo_pattern_t *fw_colour_scale_gradient (const FwColourScale *scale, double x0, double y0,
                                           double x1, double y1);

/* ---- value ranges ---- */

typedef enum { FW_RANGE_AUTO, FW_RANGE_FIXED, FW_RANGE_LOCKED } FwRangeMode;
typedef enum {
  FW_RANGE_RULE_DB,
  FW_RANGE_RULE_PERCENTILE,
  FW_RANGE_RULE_SYMMETRIC,
  FW_RANGE_RULE_CEPSTRAL,
} FwRangeRule;

#define FW_RANGE_DB_SPAN 80.0

typedef struct {
  double lo, hi;
} FwValueRange;

/* The automatic rule and default scale kind for a stage: db and mel-db -> DB; mfcc ->
 * CEPSTRAL, delta and delta2 -> SYMMETRIC (both diverging); others -> PERCENTILE
 * (sequential). */
FwRangeRule fw_range_rule_for_stage (FwStage stage);
FwColourScaleKind fw_colour_scale_kind_for_stage (FwStage stage);

/* Automatic range of a matrix over the frames whose centre time is in [t0, t1] (all frames
 * when t1 <= t0). FALSE when there is no finite value. The result always has hi > lo. */
gboolean fw_value_range_auto (const FwMatrix *m, FwRangeRule rule, double t0, double t1,
                              FwValueRange *out);
/* acc becomes the union of acc and r. */
void fw_value_range_union (FwValueRange *acc, const FwValueRange *r);
/* Position of v in the range, 0..1 unclamped. */
static inline double
fw_value_range_position (const FwValueRange *r, double v)
{
  return (v - r->lo) / (r->hi - r->lo);
}
/* Parses "MIN:MAX" (numbers in C locale, MIN < MAX). The error names the text. */
gboolean fw_value_range_parse (const char *text, FwValueRange *out, GError **error);

G_END_DECLS
