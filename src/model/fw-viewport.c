/* fw-viewport.c: the visible / selected time range shared by every plot row of a window. */
#include "fw-viewport.h"

#include <math.h>

struct _FwViewport {
  GObject parent_instance;

  double duration;
  double start;
  double end;
  double cursor;     /* < 0: none */
  double sel_start;
  double sel_end;    /* == sel_start: none */
  gboolean duration_set;
};

G_DEFINE_FINAL_TYPE (FwViewport, fw_viewport, G_TYPE_OBJECT)

enum {
  PROP_0,
  PROP_DURATION,
  PROP_VISIBLE_START,
  PROP_VISIBLE_END,
  PROP_CURSOR,
  PROP_SELECTION_START,
  PROP_SELECTION_END,
  N_PROPS
};

enum { SIGNAL_CHANGED, N_SIGNALS };

static GParamSpec *properties[N_PROPS];
static guint signals[N_SIGNALS];

static void
fw_viewport_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  FwViewport *self = FW_VIEWPORT (object);

  switch (prop_id)
    {
    case PROP_DURATION:        g_value_set_double (value, self->duration); break;
    case PROP_VISIBLE_START:   g_value_set_double (value, self->start); break;
    case PROP_VISIBLE_END:     g_value_set_double (value, self->end); break;
    case PROP_CURSOR:          g_value_set_double (value, self->cursor); break;
    case PROP_SELECTION_START: g_value_set_double (value, self->sel_start); break;
    case PROP_SELECTION_END:   g_value_set_double (value, self->sel_end); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_viewport_set_property (GObject *object, guint prop_id, const GValue *value,
                          GParamSpec *pspec)
{
  FwViewport *self = FW_VIEWPORT (object);

  switch (prop_id)
    {
    case PROP_DURATION:
      fw_viewport_set_duration (self, g_value_get_double (value));
      break;
    case PROP_VISIBLE_START:
      fw_viewport_set_visible (self, g_value_get_double (value), self->end);
      break;
    case PROP_VISIBLE_END:
      fw_viewport_set_visible (self, self->start, g_value_get_double (value));
      break;
    case PROP_CURSOR:
      fw_viewport_set_cursor (self, g_value_get_double (value));
      break;
    case PROP_SELECTION_START:
      fw_viewport_set_selection (self, g_value_get_double (value), self->sel_end);
      break;
    case PROP_SELECTION_END:
      fw_viewport_set_selection (self, self->sel_start, g_value_get_double (value));
      break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_viewport_class_init (FwViewportClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  const GParamFlags flags = G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS;

  object_class->get_property = fw_viewport_get_property;
  object_class->set_property = fw_viewport_set_property;

  properties[PROP_DURATION] =
    g_param_spec_double ("duration", NULL, NULL, 0, G_MAXDOUBLE, 0, flags);
  properties[PROP_VISIBLE_START] =
    g_param_spec_double ("visible-start", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, 0, flags);
  properties[PROP_VISIBLE_END] =
    g_param_spec_double ("visible-end", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, 1, flags);
  properties[PROP_CURSOR] =
    g_param_spec_double ("cursor", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, -1, flags);
  properties[PROP_SELECTION_START] =
    g_param_spec_double ("selection-start", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, 0, flags);
  properties[PROP_SELECTION_END] =
    g_param_spec_double ("selection-end", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, 0, flags);
  g_object_class_install_properties (object_class, N_PROPS, properties);

  signals[SIGNAL_CHANGED] =
    g_signal_new ("changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 1, G_TYPE_UINT);
}

static void
fw_viewport_init (FwViewport *self)
{
  self->start = 0;
  self->end = 1;
  self->cursor = -1;
}

FwViewport *
fw_viewport_new (void)
{
  return g_object_new (FW_TYPE_VIEWPORT, NULL);
}

/* Applies new values, notifies what changed and emits "changed" once. */
static void
apply (FwViewport *self, double start, double end, double cursor, double sel_start,
       double sel_end, double duration)
{
  guint what = 0;

  g_object_freeze_notify (G_OBJECT (self));
  if (duration != self->duration)
    {
      self->duration = duration;
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_DURATION]);
      what |= FW_VIEWPORT_CHANGED_DURATION;
    }
  if (start != self->start)
    {
      self->start = start;
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_VISIBLE_START]);
      what |= FW_VIEWPORT_CHANGED_VISIBLE;
    }
  if (end != self->end)
    {
      self->end = end;
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_VISIBLE_END]);
      what |= FW_VIEWPORT_CHANGED_VISIBLE;
    }
  if (cursor != self->cursor)
    {
      self->cursor = cursor;
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_CURSOR]);
      what |= FW_VIEWPORT_CHANGED_CURSOR;
    }
  if (sel_start != self->sel_start)
    {
      self->sel_start = sel_start;
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_SELECTION_START]);
      what |= FW_VIEWPORT_CHANGED_SELECTION;
    }
  if (sel_end != self->sel_end)
    {
      self->sel_end = sel_end;
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_SELECTION_END]);
      what |= FW_VIEWPORT_CHANGED_SELECTION;
    }
  g_object_thaw_notify (G_OBJECT (self));

  if (what != 0)
    g_signal_emit (self, signals[SIGNAL_CHANGED], 0, what);
}

/* The visible range [start, end] made valid for an extent of `duration` seconds. */
static void
normalise_visible (double duration, double *start, double *end)
{
  double s = *start, e = *end;

  if (!isfinite (s) || !isfinite (e))
    {
      s = 0;
      e = duration > 0 ? duration : 1;
    }
  if (e < s)
    {
      double t = s;
      s = e;
      e = t;
    }
  if (e - s < FW_VIEWPORT_MIN_SPAN)
    {
      double c = 0.5 * (s + e);
      s = c - 0.5 * FW_VIEWPORT_MIN_SPAN;
      e = c + 0.5 * FW_VIEWPORT_MIN_SPAN;
    }
  if (duration > 0)
    {
      double span = e - s;
      double limit = MAX (duration, FW_VIEWPORT_MIN_SPAN);

      if (span >= limit)
        {
          s = 0;
          e = limit;
        }
      else if (s < 0)
        {
          s = 0;
          e = span;
        }
      else if (e > limit)
        {
          e = limit;
          s = limit - span;
        }
    }
  *start = s;
  *end = e;
}

static double
clamp_time (FwViewport *self, double t)
{
  if (!isfinite (t))
    return 0;
  if (self->duration > 0)
    return CLAMP (t, 0, self->duration);
  return MAX (t, 0);
}

void
fw_viewport_set_duration (FwViewport *self, double seconds)
{
  gboolean was_fit;
  double s, e, cursor, ss, se;

  g_return_if_fail (FW_IS_VIEWPORT (self));

  if (!isfinite (seconds) || seconds < 0)
    seconds = 0;
  was_fit = !self->duration_set || fw_viewport_is_fit (self);
  self->duration_set = TRUE;

  if (was_fit && seconds > 0)
    {
      s = 0;
      e = MAX (seconds, FW_VIEWPORT_MIN_SPAN);
    }
  else
    {
      s = self->start;
      e = self->end;
    }
  normalise_visible (seconds, &s, &e);

  cursor = self->cursor;
  if (cursor >= 0 && seconds > 0)
    cursor = MIN (cursor, seconds);
  ss = self->sel_start;
  se = self->sel_end;
  if (seconds > 0)
    {
      ss = MIN (ss, seconds);
      se = MIN (se, seconds);
    }
  if (ss == se)
    ss = se = 0;

  apply (self, s, e, cursor, ss, se, seconds);
}

double
fw_viewport_get_duration (FwViewport *self)
{
  g_return_val_if_fail (FW_IS_VIEWPORT (self), 0);
  return self->duration;
}

void
fw_viewport_get_visible (FwViewport *self, double *start, double *end)
{
  g_return_if_fail (FW_IS_VIEWPORT (self));
  if (start)
    *start = self->start;
  if (end)
    *end = self->end;
}

double
fw_viewport_get_visible_start (FwViewport *self)
{
  g_return_val_if_fail (FW_IS_VIEWPORT (self), 0);
  return self->start;
}

double
fw_viewport_get_visible_end (FwViewport *self)
{
  g_return_val_if_fail (FW_IS_VIEWPORT (self), 1);
  return self->end;
}

void
fw_viewport_set_visible (FwViewport *self, double start, double end)
{
  g_return_if_fail (FW_IS_VIEWPORT (self));
  normalise_visible (self->duration, &start, &end);
  apply (self, start, end, self->cursor, self->sel_start, self->sel_end, self->duration);
}

void
fw_viewport_zoom (FwViewport *self, double factor, double anchor)
{
  double span, rel, new_span, s;

  g_return_if_fail (FW_IS_VIEWPORT (self));
  if (!(factor > 0) || !isfinite (factor))
    return;
  span = self->end - self->start;
  if (!isfinite (anchor))
    anchor = 0.5 * (self->start + self->end);
  rel = (anchor - self->start) / span;
  new_span = span / factor;
  s = anchor - rel * new_span;
  fw_viewport_set_visible (self, s, s + new_span);
}

void
fw_viewport_pan (FwViewport *self, double seconds)
{
  g_return_if_fail (FW_IS_VIEWPORT (self));
  if (!isfinite (seconds))
    return;
  fw_viewport_set_visible (self, self->start + seconds, self->end + seconds);
}

void
fw_viewport_fit (FwViewport *self)
{
  g_return_if_fail (FW_IS_VIEWPORT (self));
  fw_viewport_set_visible (self, 0, self->duration > 0 ? self->duration : 1);
}

gboolean
fw_viewport_is_fit (FwViewport *self)
{
  double limit;

  g_return_val_if_fail (FW_IS_VIEWPORT (self), FALSE);
  limit = MAX (self->duration, FW_VIEWPORT_MIN_SPAN);
  return self->start <= 0 && self->end >= limit;
}

double
fw_viewport_time_to_x (FwViewport *self, double time, double width)
{
  g_return_val_if_fail (FW_IS_VIEWPORT (self), 0);
  return (time - self->start) / (self->end - self->start) * width;
}

double
fw_viewport_x_to_time (FwViewport *self, double x, double width)
{
  g_return_val_if_fail (FW_IS_VIEWPORT (self), 0);
  if (!(width > 0))
    return self->start;
  return self->start + x / width * (self->end - self->start);
}

double
fw_viewport_seconds_per_pixel (FwViewport *self, double width)
{
  g_return_val_if_fail (FW_IS_VIEWPORT (self), 0);
  if (!(width > 0))
    return 0;
  return (self->end - self->start) / width;
}

void
fw_viewport_set_cursor (FwViewport *self, double time)
{
  g_return_if_fail (FW_IS_VIEWPORT (self));
  if (!isfinite (time) || time < 0)
    time = -1;
  else
    time = clamp_time (self, time);
  apply (self, self->start, self->end, time, self->sel_start, self->sel_end, self->duration);
}

double
fw_viewport_get_cursor (FwViewport *self)
{
  g_return_val_if_fail (FW_IS_VIEWPORT (self), -1);
  return self->cursor;
}

gboolean
fw_viewport_has_cursor (FwViewport *self)
{
  g_return_val_if_fail (FW_IS_VIEWPORT (self), FALSE);
  return self->cursor >= 0;
}

void
fw_viewport_set_selection (FwViewport *self, double start, double end)
{
  g_return_if_fail (FW_IS_VIEWPORT (self));
  start = clamp_time (self, start);
  end = clamp_time (self, end);
  if (end < start)
    {
      double t = start;
      start = end;
      end = t;
    }
  if (start == end)
    start = end = 0;
  apply (self, self->start, self->end, self->cursor, start, end, self->duration);
}

void
fw_viewport_clear_selection (FwViewport *self)
{
  g_return_if_fail (FW_IS_VIEWPORT (self));
  apply (self, self->start, self->end, self->cursor, 0, 0, self->duration);
}

gboolean
fw_viewport_get_selection (FwViewport *self, double *start, double *end)
{
  gboolean has;

  g_return_val_if_fail (FW_IS_VIEWPORT (self), FALSE);
  has = self->sel_end > self->sel_start;
  if (start)
    *start = has ? self->sel_start : 0;
  if (end)
    *end = has ? self->sel_end : 0;
  return has;
}
