/* fw-spectrum-panel.c: the spectrum at the cursor, over the selection, or of the whole clip. */
#include "fw-config.h"

#include "fw-spectrum-panel.h"

#include <math.h>

#include <glib/gi18n.h>

#include "fw-feature.h"
#include "fw-plot-row.h"
#include "fw-render-spectrum.h"
#include "fw-screen-theme.h"

#define TOP 24
#define BOTTOM 34
#define RIGHT 24

struct _FwSpectrumPanel {
  GtkWidget parent_instance;

  FwFeatureCache *cache;
  FwViewport *viewport;
  FwClip *clip;
  FwParamSet *set;
  FwParams *params;        /* of the matrix */
  FwMatrix *matrix;        /* db stage */
  GCancellable *cancellable;
  guint generation;
  gboolean busy;
  char *message;

  FwSpectrumSpec spec;
  double *values;
  gsize n_values;
  guint n_frames;
  guint first_frame;
  double span_t0, span_t1;
  char *title;

  guint values_generation;
  gboolean averaging;
  guint reload_idle;

  gboolean hovering;
  double hover_x, hover_y;
};

G_DEFINE_FINAL_TYPE (FwSpectrumPanel, fw_spectrum_panel, GTK_TYPE_WIDGET)

static void
data_area (FwSpectrumPanel *self, graphene_rect_t *out)
{
  int w = gtk_widget_get_width (GTK_WIDGET (self));
  int h = gtk_widget_get_height (GTK_WIDGET (self));

  graphene_rect_init (out, FW_PLOT_GUTTER_LEFT, TOP, MAX (1, w - FW_PLOT_GUTTER_LEFT - RIGHT),
                      MAX (1, h - TOP - BOTTOM));
}

static gsize
nearest_frame (const FwMatrix *m, double t)
{
  gsize best = 0;
  double best_d = INFINITY;

  for (gsize i = 0; i < m->n_frames; i++)
    {
      double d = fabs (m->frame_times[i] - t);
      if (d < best_d)
        {
          best_d = d;
          best = i;
        }
    }
  return best;
}

/* Takes computed values (owned) for a spec and sets the heading. */
static void
apply_values (FwSpectrumPanel *self, const FwSpectrumSpec *spec, double *values, size_t used)
{
  double s = spec->t0, e = spec->t1;

  g_clear_pointer (&self->values, g_free);
  g_clear_pointer (&self->title, g_free);
  self->spec = *spec;
  self->values = values;
  self->n_values = values != NULL ? self->matrix->n_bins : 0;
  self->n_frames = (guint) used;
  self->first_frame = 0;

  switch (spec->mode)
    {
    case FW_SPECTRUM_PANEL_FRAME:
      self->first_frame = (guint) nearest_frame (self->matrix, spec->t0);
      self->span_t0 = self->span_t1 = self->matrix->frame_times[self->first_frame];
      self->title = g_strdup_printf (_("Spectrum of frame %u at %.3f s"), self->first_frame,
                                     self->span_t0);
      break;
    case FW_SPECTRUM_PANEL_RANGE:
      for (gsize i = 0; i < self->matrix->n_frames; i++)
        if (self->matrix->frame_times[i] >= s)
          {
            self->first_frame = (guint) i;
            break;
          }
      self->span_t0 = s;
      self->span_t1 = e;
      if (used == 0)
        self->title = g_strdup_printf (_("No frame centre lies in the selection %.3f–%.3f s: "
                                         "select a wider range"), s, e);
      else
        self->title = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                                    "Mean spectrum over %.3f–%.3f s (%u frame)",
                                                    "Mean spectrum over %.3f–%.3f s (%u frames)",
                                                    self->n_frames),
                                       s, e, self->n_frames);
      break;
    case FW_SPECTRUM_PANEL_WHOLE:
    default:
      self->span_t0 = self->matrix->frame_times[0];
      self->span_t1 = self->matrix->frame_times[self->matrix->n_frames - 1];
      self->title = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                                  "Mean spectrum of the whole clip (%u frame)",
                                                  "Mean spectrum of the whole clip (%u frames)",
                                                  self->n_frames),
                                     self->n_frames);
      break;
    }
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

typedef struct {
  FwMatrix *matrix;
  FwSpectrumSpec spec;
  double *values;
  size_t used;
  guint generation;
} Average;

static void
average_free (Average *a)
{
  fw_matrix_unref (a->matrix);
  g_free (a->values);
  g_free (a);
}

static void
average_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  Average *a = task_data;

  a->values = fw_spectrum_panel_values (a->matrix, &a->spec, &a->used);
  g_task_return_boolean (task, TRUE);
}

static void
on_average_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  FwSpectrumPanel *self = FW_SPECTRUM_PANEL (source);
  Average *a = g_task_get_task_data (G_TASK (result));

  if (g_task_propagate_boolean (G_TASK (result), NULL) && a->generation == self->values_generation &&
      a->matrix == self->matrix)
    {
      self->averaging = FALSE;
      apply_values (self, &a->spec, g_steal_pointer (&a->values), a->used);
    }
}

/* Recomputes the values shown from the matrix and the viewport's cursor / selection: one
 * frame at once; averages over many frames (the whole of a long clip) in a worker thread,
 * keeping the previous curve on screen meanwhile. */
static void
update_values (FwSpectrumPanel *self)
{
  FwSpectrumSpec spec;
  double s = 0, e = 0;

  self->values_generation++;
  self->averaging = FALSE;
  if (self->matrix == NULL || self->matrix->n_frames == 0)
    {
      g_clear_pointer (&self->values, g_free);
      g_clear_pointer (&self->title, g_free);
      self->n_values = 0;
      self->n_frames = 0;
      self->first_frame = 0;
      self->span_t0 = self->span_t1 = 0;
      gtk_widget_queue_draw (GTK_WIDGET (self));
      return;
    }
  fw_spectrum_spec_init (&spec, FW_STAGE_DB);
  if (self->viewport != NULL && fw_viewport_get_selection (self->viewport, &s, &e))
    {
      spec.mode = FW_SPECTRUM_PANEL_RANGE;
      spec.t0 = s;
      spec.t1 = e;
    }
  else if (self->viewport != NULL && fw_viewport_has_cursor (self->viewport))
    {
      spec.mode = FW_SPECTRUM_PANEL_FRAME;
      spec.t0 = spec.t1 = fw_viewport_get_cursor (self->viewport);
    }
  else
    spec.mode = FW_SPECTRUM_PANEL_WHOLE;

  if (spec.mode == FW_SPECTRUM_PANEL_FRAME)
    {
      size_t used = 0;
      double *values = fw_spectrum_panel_values (self->matrix, &spec, &used);
      apply_values (self, &spec, values, used);
    }
  else
    {
      Average *a = g_new0 (Average, 1);
      GTask *task = g_task_new (self, NULL, on_average_done, NULL);

      a->matrix = fw_matrix_ref (self->matrix);
      a->spec = spec;
      a->generation = self->values_generation;
      self->averaging = TRUE;
      g_task_set_source_tag (task, update_values);
      g_task_set_task_data (task, a, (GDestroyNotify) average_free);
      g_task_run_in_thread (task, average_thread);
      g_object_unref (task);
    }
}

typedef struct {
  FwSpectrumPanel *panel;
  guint generation;
  FwParams *params;
} Request;

static void
on_matrix_ready (GObject *source, GAsyncResult *result, gpointer user_data)
{
  Request *req = user_data;
  FwSpectrumPanel *self = req->panel;
  g_autoptr (GError) error = NULL;
  FwMatrix *m = fw_feature_cache_request_finish (FW_FEATURE_CACHE (source), result, &error);

  if (req->generation == self->generation)
    {
      self->busy = FALSE;
      g_clear_pointer (&self->message, g_free);
      if (m != NULL)
        {
          g_clear_pointer (&self->matrix, fw_matrix_unref);
          g_clear_pointer (&self->params, fw_params_unref);
          self->matrix = fw_matrix_ref (m);
          self->params = fw_params_ref (req->params);
        }
      else if (!g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED) &&
               !g_error_matches (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_CANCELLED))
        self->message = g_strdup (error->message);
      update_values (self);
    }
  if (m != NULL)
    fw_matrix_unref (m);
  g_object_unref (req->panel);
  fw_params_unref (req->params);
  g_free (req);
}

static void
start_request (FwSpectrumPanel *self)
{
  Request *req;
  FwParams *params;

  if (self->cancellable != NULL)
    g_cancellable_cancel (self->cancellable);
  g_clear_object (&self->cancellable);
  self->generation++;
  self->busy = FALSE;
  if (self->cache == NULL || self->clip == NULL || self->set == NULL ||
      fw_clip_get_missing (self->clip))
    {
      g_clear_pointer (&self->matrix, fw_matrix_unref);
      update_values (self);
      return;
    }
  params = fw_param_set_get_params (self->set);
  if (self->params != NULL && self->matrix != NULL && fw_params_equal (params, self->params))
    return;
  self->busy = TRUE;
  self->cancellable = g_cancellable_new ();
  req = g_new0 (Request, 1);
  req->panel = g_object_ref (self);
  req->generation = self->generation;
  req->params = fw_params_ref (params);
  fw_feature_cache_request_async (self->cache, self->clip, params, FW_STAGE_DB,
                                  self->cancellable, on_matrix_ready, req);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
on_set_params_changed (FwParamSet *set, GParamSpec *pspec, FwSpectrumPanel *self)
{
  start_request (self);
}

static void
on_viewport_changed (FwViewport *viewport, guint what, FwSpectrumPanel *self)
{
  if (what & (FW_VIEWPORT_CHANGED_CURSOR | FW_VIEWPORT_CHANGED_SELECTION))
    update_values (self);
}

void
fw_spectrum_panel_set_context (FwSpectrumPanel *self, FwFeatureCache *cache,
                               FwViewport *viewport)
{
  g_return_if_fail (FW_IS_SPECTRUM_PANEL (self));

  if (self->viewport != NULL)
    g_signal_handlers_disconnect_by_func (self->viewport, on_viewport_changed, self);
  g_set_object (&self->viewport, viewport);
  if (viewport != NULL)
    g_signal_connect (viewport, "changed", G_CALLBACK (on_viewport_changed), self);
  if (cache != self->cache)
    {
      g_set_object (&self->cache, cache);
      g_clear_pointer (&self->matrix, fw_matrix_unref);
      g_clear_pointer (&self->params, fw_params_unref);
    }
  start_request (self);
}

static gboolean
reload_idle_cb (gpointer user_data)
{
  FwSpectrumPanel *self = user_data;

  self->reload_idle = 0;
  g_clear_pointer (&self->matrix, fw_matrix_unref);
  g_clear_pointer (&self->params, fw_params_unref);
  start_request (self);
  return G_SOURCE_REMOVE;
}

/* Relinked, or the file appeared or vanished: ask again once the clip has updated. */
static void
on_clip_file_changed (FwClip *clip, GParamSpec *pspec, FwSpectrumPanel *self)
{
  if (self->reload_idle == 0)
    self->reload_idle = g_idle_add (reload_idle_cb, self);
}

void
fw_spectrum_panel_set_source (FwSpectrumPanel *self, FwClip *clip, FwParamSet *set)
{
  g_return_if_fail (FW_IS_SPECTRUM_PANEL (self));

  if (clip == self->clip && set == self->set)
    return;
  if (self->set != NULL)
    g_signal_handlers_disconnect_by_func (self->set, on_set_params_changed, self);
  if (self->clip != NULL)
    g_signal_handlers_disconnect_by_func (self->clip, on_clip_file_changed, self);
  if (clip != self->clip)
    {
      g_clear_pointer (&self->matrix, fw_matrix_unref);
      g_clear_pointer (&self->params, fw_params_unref);
    }
  g_set_object (&self->clip, clip);
  g_set_object (&self->set, set);
  if (set != NULL)
    g_signal_connect (set, "notify::params", G_CALLBACK (on_set_params_changed), self);
  if (clip != NULL)
    {
      g_signal_connect (clip, "notify::path", G_CALLBACK (on_clip_file_changed), self);
      g_signal_connect (clip, "notify::missing", G_CALLBACK (on_clip_file_changed), self);
    }
  start_request (self);
}

gboolean
fw_spectrum_panel_is_busy (FwSpectrumPanel *self)
{
  g_return_val_if_fail (FW_IS_SPECTRUM_PANEL (self), FALSE);
  return self->busy || self->averaging || self->reload_idle != 0;
}

guint
fw_spectrum_panel_get_frames (FwSpectrumPanel *self, guint *first)
{
  g_return_val_if_fail (FW_IS_SPECTRUM_PANEL (self), 0);
  if (first != NULL)
    *first = self->first_frame;
  return self->n_frames;
}

void
fw_spectrum_panel_get_span (FwSpectrumPanel *self, double *t0, double *t1)
{
  g_return_if_fail (FW_IS_SPECTRUM_PANEL (self));
  if (t0 != NULL)
    *t0 = self->span_t0;
  if (t1 != NULL)
    *t1 = self->span_t1;
}

const double *
fw_spectrum_panel_get_values (FwSpectrumPanel *self, gsize *n_bins)
{
  g_return_val_if_fail (FW_IS_SPECTRUM_PANEL (self), NULL);
  if (n_bins != NULL)
    *n_bins = self->n_values;
  return self->values;
}

const char *
fw_spectrum_panel_get_title (FwSpectrumPanel *self)
{
  g_return_val_if_fail (FW_IS_SPECTRUM_PANEL (self), NULL);
  return self->title;
}

/* ---------------------------------------------------------------- drawing */

static void
fw_spectrum_panel_snapshot (GtkWidget *widget, GtkSnapshot *snapshot)
{
  FwSpectrumPanel *self = FW_SPECTRUM_PANEL (widget);
  int width = gtk_widget_get_width (widget);
  int height = gtk_widget_get_height (widget);
  graphene_rect_t area;
  FwTheme theme;
  cairo_t *cr;

  if (width < FW_PLOT_GUTTER_LEFT + RIGHT + 20 || height < TOP + BOTTOM + 20)
    return;
  data_area (self, &area);
  fw_screen_theme_for_widget (widget, &theme);
  cr = gtk_snapshot_append_cairo (snapshot, &GRAPHENE_RECT_INIT (0, 0, width, height));

  fw_theme_set_source (cr, &theme.foreground);
  if (self->values != NULL && self->matrix != NULL)
    {
      FwAxis x_axis, y_axis;
      FwTickStyle x_style;
      FwTicks ticks;
      double lo, hi;
      char x_unit[16] = "";
      g_autofree char *quantity = fw_feature_quantity_label (FW_STAGE_DB, self->params);

      fw_spectrum_panel_x_axis (self->matrix, &self->spec, area.origin.x,
                                area.origin.x + area.size.width, &x_axis, &x_style);
      fw_spectrum_panel_y_range (self->matrix, self->values, true, &lo, &hi);
      fw_axis_init (&y_axis, FW_AXIS_LINEAR, lo, hi, area.origin.y + area.size.height,
                    area.origin.y);
      fw_theme_set_source (cr, &theme.data_background);
      cairo_rectangle (cr, area.origin.x, area.origin.y, area.size.width, area.size.height);
      cairo_fill (cr);
      fw_spectrum_panel_draw (cr, &theme, self->matrix, self->values, &x_axis, &y_axis,
                              area.origin.x, area.origin.y, area.size.width, area.size.height);
      fw_axis_choose_ticks (cr, &theme, &x_axis, x_style, true, RIGHT, &ticks);
      fw_axis_draw (cr, &theme, &x_axis, &ticks, FW_EDGE_BOTTOM,
                    area.origin.y + area.size.height, true);
      g_strlcpy (x_unit, ticks.unit, sizeof x_unit);
      fw_axis_choose_ticks (cr, &theme, &y_axis, FW_TICK_NUMBER, false,
                            0.5 * theme.font_size[FW_TEXT_TICK], &ticks);
      fw_axis_draw (cr, &theme, &y_axis, &ticks, FW_EDGE_LEFT, area.origin.x, true);
      fw_theme_set_source (cr, &theme.foreground);
      cairo_set_line_width (cr, theme.line_width);
      cairo_rectangle (cr, area.origin.x, area.origin.y, area.size.width, area.size.height);
      cairo_stroke (cr);

      {
        double title_w = fw_theme_draw_text (cr, &theme, FW_TEXT_TITLE, self->title,
                                             area.origin.x, area.origin.y - theme.pad - 1,
                                             FW_ALIGN_START, FW_ALIGN_END, false);
        double qw, qh;

        /* the quantity at the right end, when it does not run into the heading */
        fw_theme_text_size (cr, &theme, FW_TEXT_AXIS, quantity, &qw, &qh);
        fw_theme_set_source (cr, &theme.muted);
        if (title_w + qw + 16 < area.size.width)
          fw_theme_draw_text (cr, &theme, FW_TEXT_AXIS, quantity, area.origin.x + area.size.width,
                              area.origin.y - theme.pad - 1, FW_ALIGN_END, FW_ALIGN_END, false);
      }
      {
        /* TRANSLATORS: axis title, %s is the unit (Hz or kHz) */
        g_autofree char *axis_title = g_strdup_printf (_("Frequency (%s)"), x_unit);
        fw_theme_draw_text (cr, &theme, FW_TEXT_AXIS, axis_title,
                            area.origin.x + area.size.width / 2, height - 2, FW_ALIGN_CENTER,
                            FW_ALIGN_END, false);
      }
      fw_theme_draw_text (cr, &theme, FW_TEXT_TICK, _("dB"), area.origin.x - theme.tick_length - theme.pad,
                          area.origin.y - theme.pad - 1, FW_ALIGN_END, FW_ALIGN_END, false);

      if (self->hovering && graphene_rect_contains_point (&area, &GRAPHENE_POINT_INIT (self->hover_x, self->hover_y)))
        {
          double f = fw_axis_pixel_to_value (&x_axis, self->hover_x);
          double best = INFINITY;
          gsize k = 0;
          g_autofree char *text = NULL;

          for (gsize i = 0; i < self->n_values; i++)
            if (fabs (self->matrix->bin_value[i] - f) < best)
              {
                best = fabs (self->matrix->bin_value[i] - f);
                k = i;
              }
          text = g_strdup_printf (_("%.1f Hz (bin %zu): %.1f dB"), self->matrix->bin_value[k], k,
                                  self->values[k]);
          fw_theme_set_source (cr, &theme.foreground);
          fw_theme_draw_text (cr, &theme, FW_TEXT_AXIS, text, area.origin.x + area.size.width - 4,
                              area.origin.y + 4, FW_ALIGN_END, FW_ALIGN_START, false);
          cairo_set_source_rgba (cr, 0.95, 0.30, 0.20, 0.7);
          cairo_set_line_width (cr, 1);
          cairo_move_to (cr, round (self->hover_x) + 0.5, area.origin.y);
          cairo_line_to (cr, round (self->hover_x) + 0.5, area.origin.y + area.size.height);
          cairo_stroke (cr);
        }
    }
  else
    {
      const char *text = self->message != NULL ? self->message
                       : self->busy ? _("Computing the spectrum…")
                       : self->title != NULL ? self->title
                       : _("The spectrum at the cursor, or averaged over a selection, appears here.");
      fw_theme_set_source (cr, self->message != NULL ? &(FwRgba) { 0.85, 0.2, 0.15, 1 } : &theme.muted);
      fw_theme_draw_text (cr, &theme, FW_TEXT_TITLE, text, area.origin.x + area.size.width / 2,
                          area.origin.y + area.size.height / 2, FW_ALIGN_CENTER, FW_ALIGN_CENTER,
                          false);
    }
  cairo_destroy (cr);
}

static void
fw_spectrum_panel_measure (GtkWidget *widget, GtkOrientation orientation, int for_size,
                           int *minimum, int *natural, int *minimum_baseline,
                           int *natural_baseline)
{
  if (orientation == GTK_ORIENTATION_VERTICAL)
    {
      *minimum = TOP + BOTTOM + 40;
      *natural = 190;
    }
  else
    {
      *minimum = FW_PLOT_GUTTER_LEFT + RIGHT + 100;
      *natural = 600;
    }
}

static void
on_motion (GtkEventControllerMotion *motion, double x, double y, FwSpectrumPanel *self)
{
  self->hovering = TRUE;
  self->hover_x = x;
  self->hover_y = y;
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
on_leave (GtkEventControllerMotion *motion, FwSpectrumPanel *self)
{
  self->hovering = FALSE;
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
fw_spectrum_panel_dispose (GObject *object)
{
  FwSpectrumPanel *self = FW_SPECTRUM_PANEL (object);

  if (self->cancellable != NULL)
    g_cancellable_cancel (self->cancellable);
  g_clear_object (&self->cancellable);
  if (self->set != NULL)
    g_signal_handlers_disconnect_by_func (self->set, on_set_params_changed, self);
  if (self->clip != NULL)
    g_signal_handlers_disconnect_by_func (self->clip, on_clip_file_changed, self);
  g_clear_handle_id (&self->reload_idle, g_source_remove);
  if (self->viewport != NULL)
    g_signal_handlers_disconnect_by_func (self->viewport, on_viewport_changed, self);
  g_clear_object (&self->set);
  g_clear_object (&self->clip);
  g_clear_object (&self->cache);
  g_clear_object (&self->viewport);
  g_clear_pointer (&self->matrix, fw_matrix_unref);
  g_clear_pointer (&self->params, fw_params_unref);
  G_OBJECT_CLASS (fw_spectrum_panel_parent_class)->dispose (object);
}

static void
fw_spectrum_panel_finalize (GObject *object)
{
  FwSpectrumPanel *self = FW_SPECTRUM_PANEL (object);

  g_free (self->values);
  g_free (self->title);
  g_free (self->message);
  G_OBJECT_CLASS (fw_spectrum_panel_parent_class)->finalize (object);
}

static void
fw_spectrum_panel_class_init (FwSpectrumPanelClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = fw_spectrum_panel_dispose;
  object_class->finalize = fw_spectrum_panel_finalize;
  widget_class->snapshot = fw_spectrum_panel_snapshot;
  widget_class->measure = fw_spectrum_panel_measure;
  gtk_widget_class_set_css_name (widget_class, "fwspectrumpanel");
  gtk_widget_class_set_accessible_role (widget_class, GTK_ACCESSIBLE_ROLE_IMG);
}

static void
fw_spectrum_panel_init (FwSpectrumPanel *self)
{
  GtkEventController *motion = gtk_event_controller_motion_new ();

  g_signal_connect (motion, "motion", G_CALLBACK (on_motion), self);
  g_signal_connect (motion, "leave", G_CALLBACK (on_leave), self);
  gtk_widget_add_controller (GTK_WIDGET (self), motion);
  gtk_accessible_update_property (GTK_ACCESSIBLE (self), GTK_ACCESSIBLE_PROPERTY_LABEL,
                                  _("Spectrum at the cursor or over the selection"), -1);
}

GtkWidget *
fw_spectrum_panel_new (void)
{
  return g_object_new (FW_TYPE_SPECTRUM_PANEL, NULL);
}
