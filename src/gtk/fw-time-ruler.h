/* fw-time-ruler.h: the time axis above a column of plot rows.
 *
 * Ticks come from src/render (fw_axis_choose_ticks with time labels that switch between
 * ms, s and min:s with the zoom level); the data area uses the rows' gutters, so each tick
 * sits exactly above the same time in every row. Click sets the cursor, drag selects.
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-viewport.h"

G_BEGIN_DECLS

#define FW_TYPE_TIME_RULER (fw_time_ruler_get_type ())
G_DECLARE_FINAL_TYPE (FwTimeRuler, fw_time_ruler, FW, TIME_RULER, GtkWidget)

GtkWidget *fw_time_ruler_new (FwViewport *viewport);
void fw_time_ruler_set_viewport (FwTimeRuler *self, FwViewport *viewport);
/* x of a time in the ruler's coordinates. */
double fw_time_ruler_time_to_x (FwTimeRuler *self, double time);

G_END_DECLS
