/* fw-time-ruler.c: the time axis above a column of rows, drawn with src/render's ticks. */
#include "fw-config.h"

#include "fw-time-ruler.h"

#include <math.h>

#include <glib/gi18n.h>

#include "fw-axis.h"
#include "fw-plot-row.h"
#include "fw-screen-theme.h"

#define RULER_HEIGHT 26

struct _FwTimeRuler {
  GtkWidget parent_instance;

  FwViewport *viewport;
  double drag_start_time;
  double drag_start_x;
};

G_DEFINE_FINAL_TYPE (FwTimeRuler, fw_time_ruler, GTK_TYPE_WIDGET)

static double
data_width (FwTimeRuler *self)
{
  return MAX (1, gtk_widget_get_width (GTK_WIDGET (self)) - FW_PLOT_GUTTER_LEFT - FW_PLOT_GUTTER_RIGHT);
}

double
fw_time_ruler_time_to_x (FwTimeRuler *self, double time)
{
  g_return_val_if_fail (FW_IS_TIME_RULER (self), 0);
  return FW_PLOT_GUTTER_LEFT + fw_viewport_time_to_x (self->viewport, time, data_width (self));
}

static double
x_to_time (FwTimeRuler *self, double x)
{
  return fw_viewport_x_to_time (self->viewport, x - FW_PLOT_GUTTER_LEFT, data_width (self));
}

static void
fw_time_ruler_snapshot (GtkWidget *widget, GtkSnapshot *snapshot)
{
  FwTimeRuler *self = FW_TIME_RULER (widget);
  int width = gtk_widget_get_width (widget);
  int height = gtk_widget_get_height (widget);
  double left = FW_PLOT_GUTTER_LEFT, right = width - FW_PLOT_GUTTER_RIGHT;
  double t0, t1, s, e;
  FwTheme theme;
  FwAxis axis;
  FwTicks ticks;
  cairo_t *cr;

  if (self->viewport == NULL || right <= left + 4)
    return;
  fw_viewport_get_visible (self->viewport, &t0, &t1);
  fw_screen_theme_for_widget (widget, &theme);

  if (fw_viewport_get_selection (self->viewport, &s, &e))
    {
      GdkRGBA sel = { 0.35, 0.55, 0.95, 0.35 };
      double xs = MAX (left, fw_time_ruler_time_to_x (self, s));
      double xe = MIN (right, fw_time_ruler_time_to_x (self, e));
      if (xe > xs)
        gtk_snapshot_append_color (snapshot, &sel, &GRAPHENE_RECT_INIT (xs, 0, xe - xs, height));
    }

  cr = gtk_snapshot_append_cairo (snapshot, &GRAPHENE_RECT_INIT (0, 0, width, height));
  fw_axis_init (&axis, FW_AXIS_LINEAR, t0, t1, left, right);
  fw_axis_choose_ticks (cr, &theme, &axis, FW_TICK_TIME, true, FW_PLOT_GUTTER_RIGHT - 4, &ticks);
  fw_axis_draw (cr, &theme, &axis, &ticks, FW_EDGE_TOP, height - 1, true);
  fw_theme_set_source (cr, &theme.foreground);
  cairo_set_line_width (cr, theme.line_width);
  cairo_move_to (cr, left, height - 0.5 * theme.line_width - 1);
  cairo_line_to (cr, right, height - 0.5 * theme.line_width - 1);
  cairo_stroke (cr);
  /* the unit of the labels ("s", "ms", "min:s") sits in the left gutter, level with them */
  fw_theme_set_source (cr, &theme.muted);
  fw_theme_draw_text (cr, &theme, FW_TEXT_AXIS, ticks.unit, left - 16,
                      height - theme.tick_length - theme.pad - 1, FW_ALIGN_END, FW_ALIGN_END,
                      false);

  cairo_destroy (cr);

  if (fw_viewport_has_cursor (self->viewport))
    {
      double xc = floor (fw_time_ruler_time_to_x (self, fw_viewport_get_cursor (self->viewport)));
      GdkRGBA cursor = { 0.95, 0.30, 0.20, 0.95 };
      if (xc >= left && xc <= right)
        gtk_snapshot_append_color (snapshot, &cursor,
                                   &GRAPHENE_RECT_INIT (xc, height - 8, 1, 8));
    }
}

static void
fw_time_ruler_measure (GtkWidget *widget, GtkOrientation orientation, int for_size,
                       int *minimum, int *natural, int *minimum_baseline, int *natural_baseline)
{
  if (orientation == GTK_ORIENTATION_VERTICAL)
    *minimum = *natural = RULER_HEIGHT;
  else
    *minimum = *natural = FW_PLOT_GUTTER_LEFT + FW_PLOT_GUTTER_RIGHT + 80;
}

static void
on_viewport_changed (FwViewport *viewport, guint what, FwTimeRuler *self)
{
  double t0, t1;

  fw_viewport_get_visible (viewport, &t0, &t1);
  gtk_accessible_update_property (GTK_ACCESSIBLE (self), GTK_ACCESSIBLE_PROPERTY_DESCRIPTION,
                                  fw_time_unit_axis_title (fw_time_unit_for_span (t0, t1)), -1);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
on_drag_begin (GtkGestureDrag *gesture, double x, double y, FwTimeRuler *self)
{
  self->drag_start_x = x;
  self->drag_start_time = x_to_time (self, x);
}

static void
on_drag_update (GtkGestureDrag *gesture, double dx, double dy, FwTimeRuler *self)
{
  if (fabs (dx) >= 3)
    fw_viewport_set_selection (self->viewport, self->drag_start_time,
                               x_to_time (self, self->drag_start_x + dx));
}

static void
on_drag_end (GtkGestureDrag *gesture, double dx, double dy, FwTimeRuler *self)
{
  if (fabs (dx) < 3)
    {
      fw_viewport_clear_selection (self->viewport);
      fw_viewport_set_cursor (self->viewport, self->drag_start_time);
    }
}

void
fw_time_ruler_set_viewport (FwTimeRuler *self, FwViewport *viewport)
{
  g_return_if_fail (FW_IS_TIME_RULER (self));

  if (self->viewport != NULL)
    g_signal_handlers_disconnect_by_func (self->viewport, on_viewport_changed, self);
  g_set_object (&self->viewport, viewport);
  if (viewport != NULL)
    g_signal_connect (viewport, "changed", G_CALLBACK (on_viewport_changed), self);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
fw_time_ruler_dispose (GObject *object)
{
  FwTimeRuler *self = FW_TIME_RULER (object);

  fw_time_ruler_set_viewport (self, NULL);
  G_OBJECT_CLASS (fw_time_ruler_parent_class)->dispose (object);
}

static void
fw_time_ruler_class_init (FwTimeRulerClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = fw_time_ruler_dispose;
  widget_class->snapshot = fw_time_ruler_snapshot;
  widget_class->measure = fw_time_ruler_measure;
  gtk_widget_class_set_css_name (widget_class, "fwtimeruler");
  gtk_widget_class_set_accessible_role (widget_class, GTK_ACCESSIBLE_ROLE_IMG);
}

static void
fw_time_ruler_init (FwTimeRuler *self)
{
  GtkGesture *drag = gtk_gesture_drag_new ();

  g_signal_connect (drag, "drag-begin", G_CALLBACK (on_drag_begin), self);
  g_signal_connect (drag, "drag-update", G_CALLBACK (on_drag_update), self);
  g_signal_connect (drag, "drag-end", G_CALLBACK (on_drag_end), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (drag));
  gtk_widget_set_hexpand (GTK_WIDGET (self), TRUE);
  gtk_accessible_update_property (GTK_ACCESSIBLE (self), GTK_ACCESSIBLE_PROPERTY_LABEL,
                                  _("Time axis"), -1);
}

GtkWidget *
fw_time_ruler_new (FwViewport *viewport)
{
  FwTimeRuler *self = g_object_new (FW_TYPE_TIME_RULER, NULL);

  fw_time_ruler_set_viewport (self, viewport);
  return GTK_WIDGET (self);
}
