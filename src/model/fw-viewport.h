/* fw-viewport.h: the time ranges every plot row of a window shares.
 *
 * One FwViewport per window: the extent (0 .. duration seconds of the longest clip shown),
 * the visible range, an optional selected range and an optional cursor time. Plot rows map
 * time to pixels only through fw_viewport_time_to_x() / fw_viewport_x_to_time(), so rows
 * with different hops (each matrix carries its own frame-centre times) line up exactly.
 *
 * The visible range always lies inside the extent when the extent is wider than the
 * minimum span, and is never narrower than FW_VIEWPORT_MIN_SPAN seconds.
 */
#pragma once

#include <glib-object.h>

#include "fw-types.h"

G_BEGIN_DECLS

/* The narrowest visible range in seconds (a few samples at common rates). */
#define FW_VIEWPORT_MIN_SPAN 1e-3

#define FW_TYPE_VIEWPORT (fw_viewport_get_type ())
G_DECLARE_FINAL_TYPE (FwViewport, fw_viewport, FW, VIEWPORT, GObject)

FwViewport *fw_viewport_new (void);

/* Properties: "duration", "visible-start", "visible-end", "cursor" (seconds, < 0 = none),
 * "selection-start", "selection-end" (equal = no selection).
 * Signal "changed" (guint what: FwViewportChange flags) once per call that changed anything,
 * after the property notifications. */
typedef enum {
  FW_VIEWPORT_CHANGED_VISIBLE   = 1 << 0,
  FW_VIEWPORT_CHANGED_CURSOR    = 1 << 1,
  FW_VIEWPORT_CHANGED_SELECTION = 1 << 2,
  FW_VIEWPORT_CHANGED_DURATION  = 1 << 3,
} FwViewportChange;

/* Sets the extent. When the view showed everything before (or was never set) it shows
 * everything again; otherwise the visible range is clamped into the new extent. */
void fw_viewport_set_duration (FwViewport *self, double seconds);
double fw_viewport_get_duration (FwViewport *self);

void fw_viewport_get_visible (FwViewport *self, double *start, double *end);
double fw_viewport_get_visible_start (FwViewport *self);
double fw_viewport_get_visible_end (FwViewport *self);
/* Shows [start, end]; swapped ends are ordered, a too narrow span is widened about its
 * centre, and the range is shifted (not shrunk) back inside the extent. */
void fw_viewport_set_visible (FwViewport *self, double start, double end);
/* Multiplies the visible span by 1/factor (factor > 1 zooms in) keeping `anchor` (seconds)
 * at the same relative position on screen. */
void fw_viewport_zoom (FwViewport *self, double factor, double anchor);
/* Moves the visible range by `seconds` (positive = later), stopping at the extent's ends. */
void fw_viewport_pan (FwViewport *self, double seconds);
/* Shows the whole extent. */
void fw_viewport_fit (FwViewport *self);
/* TRUE when the whole extent is visible. */
gboolean fw_viewport_is_fit (FwViewport *self);

/* Mapping between time and a pixel position in a data area `width` pixels wide whose left
 * edge is x = 0. Pure functions of the visible range; exact inverses of each other. */
double fw_viewport_time_to_x (FwViewport *self, double time, double width);
double fw_viewport_x_to_time (FwViewport *self, double x, double width);
/* Seconds per pixel at that width. */
double fw_viewport_seconds_per_pixel (FwViewport *self, double width);

/* Cursor: a time, or < 0 for none. Clamped into the extent. */
void fw_viewport_set_cursor (FwViewport *self, double time);
double fw_viewport_get_cursor (FwViewport *self);
gboolean fw_viewport_has_cursor (FwViewport *self);

/* Selection: [start, end], ordered and clamped into the extent; equal ends clear it. */
void fw_viewport_set_selection (FwViewport *self, double start, double end);
void fw_viewport_clear_selection (FwViewport *self);
/* FALSE (and 0, 0) when nothing is selected. */
gboolean fw_viewport_get_selection (FwViewport *self, double *start, double *end);

G_END_DECLS
