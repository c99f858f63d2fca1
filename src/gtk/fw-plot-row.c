/* fw-plot-row.c: one time-aligned plot row, drawn with the src/render functions. */
#include "fw-config.h"

#include "fw-plot-row.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-feature.h"
#include "fw-render-heatmap.h"
#include "fw-render-waveform.h"
#include "fw-screen-theme.h"
#include "fw-plot-draw.h"

#define DATA_BOTTOM_PAD 6
#define DRAG_THRESHOLD 3.0

/* ---------------------------------------------------------------- row kinds */

static const struct {
  const char *id;
  const char *title;
  FwStage stage;
} plot_kinds[FW_N_PLOT_KINDS] = {
  [FW_PLOT_WAVEFORM]    = { "waveform",  N_("Waveform"),                FW_STAGE_SIGNAL },
  [FW_PLOT_SPECTROGRAM] = { "db",        N_("Spectrogram (dB)"),        FW_STAGE_DB },
  [FW_PLOT_MEL]         = { "mel-db",    N_("Mel spectrogram (dB)"),    FW_STAGE_MEL_DB },
  [FW_PLOT_MFCC]        = { "mfcc",      N_("MFCC"),                    FW_STAGE_MFCC },
  [FW_PLOT_DELTA]       = { "delta",     N_("MFCC deltas"),             FW_STAGE_DELTA },
  [FW_PLOT_DELTA2]      = { "delta2",    N_("MFCC delta-deltas"),       FW_STAGE_DELTA2 },
  [FW_PLOT_RMS]         = { "rms",       N_("RMS level"),               FW_STAGE_RMS },
  [FW_PLOT_ZCR]         = { "zcr",       N_("Zero-crossing rate"),      FW_STAGE_ZCR },
  [FW_PLOT_CENTROID]    = { "centroid",  N_("Spectral centroid"),       FW_STAGE_CENTROID },
  [FW_PLOT_BANDWIDTH]   = { "bandwidth", N_("Spectral bandwidth"),      FW_STAGE_BANDWIDTH },
  [FW_PLOT_ROLLOFF]     = { "rolloff",   N_("Spectral rolloff (85 %)"), FW_STAGE_ROLLOFF },
  [FW_PLOT_FLATNESS]    = { "flatness",  N_("Spectral flatness"),       FW_STAGE_FLATNESS },
};

const char *
fw_plot_kind_id (FwPlotKind kind)
{
  g_return_val_if_fail (kind < FW_N_PLOT_KINDS, NULL);
  return plot_kinds[kind].id;
}

gboolean
fw_plot_kind_from_id (const char *id, FwPlotKind *out)
{
  for (int i = 0; i < FW_N_PLOT_KINDS; i++)
    if (g_strcmp0 (plot_kinds[i].id, id) == 0)
      {
        *out = (FwPlotKind) i;
        return TRUE;
      }
  return FALSE;
}

const char *
fw_plot_kind_title (FwPlotKind kind)
{
  g_return_val_if_fail (kind < FW_N_PLOT_KINDS, NULL);
  return _(plot_kinds[kind].title);
}

FwStage
fw_plot_kind_stage (FwPlotKind kind)
{
  g_return_val_if_fail (kind < FW_N_PLOT_KINDS, FW_STAGE_SIGNAL);
  return plot_kinds[kind].stage;
}

gboolean
fw_plot_kind_is_heatmap (FwPlotKind kind)
{
  return kind == FW_PLOT_SPECTROGRAM || kind == FW_PLOT_MEL || kind == FW_PLOT_MFCC ||
         kind == FW_PLOT_DELTA || kind == FW_PLOT_DELTA2;
}

/* ---------------------------------------------------------------- instance */

typedef enum { DRAG_NONE, DRAG_PAN, DRAG_SELECT } DragMode;

typedef struct {
  const FwMatrix *matrix;
  const FwColourScale *scale;
  FwValueRange range;
  FwAxisScale freq_scale;
  double t0, t1;
  int width, height;
  int variant;
} TextureKey;

struct _FwPlotRow {
  GtkWidget parent_instance;

  FwPlotKind kind;
  FwViewport *viewport;
  FwFeatureCache *cache;
  FwClip *clip;
  FwParamSet *set;
  FwParams *params;        /* of the data shown */
  FwParams *pending;       /* of the work in flight */
  FwMatrix *matrix;
  FwAudio *audio;
  GCancellable *cancellable;
  guint generation;
  gboolean busy;
  char *message;

  const FwColourScale *scale;
  FwRangeMode range_mode;
  FwValueRange fixed_range;
  FwValueRange shared_range;
  gboolean have_shared;
  FwValueRange auto_range;
  gboolean have_auto;
  FwHeatmapSpec base_spec;     /* defaults for the matrix (computed off the main thread) */
  gboolean have_base_spec;
  FwValueRange trace_range;    /* curve rows: percentile range of the values */
  gboolean have_trace_range;
  FwAxisScale freq_scale;

  GdkTexture *texture;
  TextureKey texture_key;
  gboolean render_running;
  FwWaveformEnvelope *envelope;

  gboolean hovering;
  double hover_x, hover_y;
  DragMode drag_mode;
  double drag_start_x;
  double drag_start_time;
  double drag_visible_start, drag_visible_end;

  GtkWidget *menu_button;
  GtkWidget *popover_box;
  guint reload_idle;

  /* Rows whose data the caller gives (fw_plot_row_set_data): no clip, set or cache. */
  gboolean external;
  FwStage data_stage;
  gboolean signed_values;  /* differences: diverging scale, symmetric range, mean aggregation */
  char *title;             /* replaces the kind's title */
  char *quantity;          /* replaces the stage's quantity label */
  char *unit;              /* replaces the stage's value unit */
};

G_DEFINE_FINAL_TYPE (FwPlotRow, fw_plot_row, GTK_TYPE_WIDGET)

enum {
  SIGNAL_STATE_CHANGED,
  SIGNAL_READOUT,
  SIGNAL_RANGE_CHANGED,
  SIGNAL_SETTINGS_CHANGED,
  N_SIGNALS
};
static guint signals[N_SIGNALS];

static void start_load (FwPlotRow *self);
static void update_accessible (FwPlotRow *self);

FwPlotKind
fw_plot_row_get_kind (FwPlotRow *self)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), FW_PLOT_WAVEFORM);
  return self->kind;
}

static FwStage
row_stage (FwPlotRow *self)
{
  return self->external ? self->data_stage : fw_plot_kind_stage (self->kind);
}

static const char *
row_title (FwPlotRow *self)
{
  return self->title != NULL ? self->title : fw_plot_kind_title (self->kind);
}

/* The label of the values shown; caller frees. */
static char *
row_quantity (FwPlotRow *self)
{
  if (self->quantity != NULL)
    return g_strdup (self->quantity);
  if (self->params == NULL)
    return g_strdup ("");
  return fw_feature_quantity_label (row_stage (self), self->params);
}

static const char *
row_unit (FwPlotRow *self)
{
  if (self->unit != NULL)
    return self->unit;
  if (self->params == NULL)
    return "";
  return fw_feature_value_unit (row_stage (self), self->params);
}

static gboolean
is_curve (FwPlotRow *self)
{
  return self->kind >= FW_PLOT_RMS;
}

/* ---------------------------------------------------------------- geometry */

void
fw_plot_row_get_data_area (FwPlotRow *self, graphene_rect_t *out)
{
  int w = gtk_widget_get_width (GTK_WIDGET (self));
  int h = gtk_widget_get_height (GTK_WIDGET (self));

  g_return_if_fail (FW_IS_PLOT_ROW (self));
  graphene_rect_init (out, FW_PLOT_GUTTER_LEFT, FW_PLOT_TITLE_HEIGHT,
                      MAX (1, w - FW_PLOT_GUTTER_LEFT - FW_PLOT_GUTTER_RIGHT),
                      MAX (1, h - FW_PLOT_TITLE_HEIGHT - DATA_BOTTOM_PAD));
}

double
fw_plot_row_time_to_x (FwPlotRow *self, double time)
{
  graphene_rect_t area;

  g_return_val_if_fail (FW_IS_PLOT_ROW (self), 0);
  fw_plot_row_get_data_area (self, &area);
  return area.origin.x + fw_viewport_time_to_x (self->viewport, time, area.size.width);
}

static double
x_to_time (FwPlotRow *self, double x)
{
  graphene_rect_t area;

  fw_plot_row_get_data_area (self, &area);
  return fw_viewport_x_to_time (self->viewport, x - area.origin.x, area.size.width);
}

/* ---------------------------------------------------------------- state */

static void
drop_caches (FwPlotRow *self)
{
  /* the heatmap texture stays until its replacement is ready (its key names the matrix) */
  g_clear_pointer (&self->envelope, fw_waveform_envelope_free);
}

static void
emit_state (FwPlotRow *self)
{
  update_accessible (self);
  g_signal_emit (self, signals[SIGNAL_STATE_CHANGED], 0);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
set_message (FwPlotRow *self, const char *message)
{
  g_free (self->message);
  self->message = g_strdup (message);
}

/* What a matrix needs before it can be drawn: the heatmap defaults with the automatic
 * range (a percentile sort over up to 2^20 values) or a curve's value range. Computed in a
 * worker thread: for a long clip this takes a noticeable moment. */
typedef struct {
  FwMatrix *matrix;
  FwStage stage;
  gboolean heatmap;
  gboolean signed_values;
  FwHeatmapSpec spec;
  gboolean have_spec;
  FwValueRange range;
  gboolean have_range;
} Prepared;

static void
prepared_free (Prepared *p)
{
  fw_matrix_unref (p->matrix);
  g_free (p);
}

static void
prepare_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  Prepared *p = task_data;

  if (p->heatmap)
    {
      fw_heatmap_spec_init (&p->spec, p->matrix, p->stage);
      if (p->signed_values)
        {
          /* differences: zero at the diverging scale's neutral midpoint, means per pixel */
          FwValueRange r;
          p->spec.scale = fw_colour_scale_default (FW_COLOUR_SCALE_DIVERGING);
          p->spec.aggregate = FW_AGGREGATE_MEAN;
          if (fw_value_range_auto (p->matrix, FW_RANGE_RULE_SYMMETRIC, 0, 0, &r))
            p->spec.range = r;
        }
      p->have_spec = TRUE;
      p->range = p->spec.range;
      p->have_range = TRUE;
    }
  else
    {
      p->have_range = fw_value_range_auto (p->matrix, FW_RANGE_RULE_PERCENTILE, 0, 0, &p->range);
      if (p->have_range && p->signed_values)
        {
          /* curves of differences keep zero in view */
          p->range.lo = MIN (p->range.lo, 0);
          p->range.hi = MAX (p->range.hi, 0);
          if (!(p->range.hi > p->range.lo))
            p->range.hi = p->range.lo + 1;
        }
    }
  g_task_return_boolean (task, TRUE);
}

typedef struct {
  FwPlotRow *row;
  guint generation;
  FwParams *params;
} LoadData;

static void
load_data_free (LoadData *data)
{
  g_object_unref (data->row);
  g_clear_pointer (&data->params, fw_params_unref);
  g_free (data);
}

static gboolean
is_cancel (const GError *error)
{
  return g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED) ||
         g_error_matches (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_CANCELLED);
}

static void on_prepared (GObject *source, GAsyncResult *result, gpointer user_data);

/* Applies a finished load; FALSE when `data` was handed on (to the preparation step). */
static gboolean
finish_load (FwPlotRow *self, LoadData *data, FwMatrix *matrix, FwAudio *audio, GError *error)
{
  if (data->generation != self->generation)
    return TRUE;   /* a newer request replaced this one */

  self->busy = FALSE;
  g_clear_pointer (&self->pending, fw_params_unref);
  if (error != NULL)
    {
      if (is_cancel (error))
        set_message (self, self->matrix != NULL || self->audio != NULL
                     ? _("Stopped; showing the previous result. Recompute from the row menu.")
                     : _("Stopped. Recompute from the row menu."));
      else if (self->matrix != NULL || self->audio != NULL)
        {
          g_autofree char *msg = g_strdup_printf (_("Not updated: %s"), error->message);
          set_message (self, msg);
        }
      else
        set_message (self, error->message);
      emit_state (self);
      return TRUE;
    }

  if (matrix != NULL)
    {
      /* stay busy until the matrix is prepared for drawing */
      Prepared *p = g_new0 (Prepared, 1);
      GTask *task = g_task_new (self, self->cancellable, on_prepared, data);

      self->busy = TRUE;
      p->matrix = fw_matrix_ref (matrix);
      p->stage = row_stage (self);
      p->heatmap = fw_plot_kind_is_heatmap (self->kind);
      p->signed_values = self->signed_values;
      g_task_set_source_tag (task, finish_load);
      g_task_set_task_data (task, p, (GDestroyNotify) prepared_free);
      g_task_run_in_thread (task, prepare_thread);
      g_object_unref (task);
      return FALSE;   /* data now belongs to the preparation */
    }

  set_message (self, NULL);
  g_clear_pointer (&self->params, fw_params_unref);
  self->params = fw_params_ref (data->params);
  drop_caches (self);
  if (audio != NULL)
    {
      g_clear_pointer (&self->audio, fw_audio_unref);
      self->audio = fw_audio_ref (audio);
    }
  emit_state (self);
  return TRUE;
}

static void
on_prepared (GObject *source, GAsyncResult *result, gpointer user_data)
{
  FwPlotRow *self = FW_PLOT_ROW (source);
  LoadData *data = user_data;
  Prepared *p = g_task_get_task_data (G_TASK (result));

  if (g_task_propagate_boolean (G_TASK (result), NULL) && data->generation == self->generation)
    {
      self->busy = FALSE;
      set_message (self, NULL);
      g_clear_pointer (&self->params, fw_params_unref);
      self->params = data->params != NULL ? fw_params_ref (data->params) : NULL;
      drop_caches (self);
      g_clear_pointer (&self->matrix, fw_matrix_unref);
      self->matrix = fw_matrix_ref (p->matrix);
      self->have_base_spec = p->have_spec;
      if (p->have_spec)
        self->base_spec = p->spec;
      self->have_auto = p->heatmap && p->have_range;
      if (self->have_auto)
        self->auto_range = p->range;
      self->have_trace_range = !p->heatmap && p->have_range;
      if (self->have_trace_range)
        self->trace_range = p->range;
      g_signal_emit (self, signals[SIGNAL_RANGE_CHANGED], 0);
      emit_state (self);
    }
  load_data_free (data);
}

static void
on_matrix_ready (GObject *source, GAsyncResult *result, gpointer user_data)
{
  LoadData *data = user_data;
  g_autoptr (GError) error = NULL;
  FwMatrix *m = fw_feature_cache_request_finish (FW_FEATURE_CACHE (source), result, &error);
  FwPlotRow *row = g_object_ref (data->row);

  if (finish_load (row, data, m, NULL, error))
    load_data_free (data);
  if (m != NULL)
    fw_matrix_unref (m);
  g_object_unref (row);
}

static void
on_audio_ready (GObject *source, GAsyncResult *result, gpointer user_data)
{
  LoadData *data = user_data;
  g_autoptr (GError) error = NULL;
  FwAudio *audio = fw_clip_load_audio_finish (FW_CLIP (source), result, &error);

  if (finish_load (data->row, data, NULL, audio, error))
    load_data_free (data);
  if (audio != NULL)
    fw_audio_unref (audio);
}

static void
start_load (FwPlotRow *self)
{
  FwParams *params;
  LoadData *data;

  if (self->external)
    return;   /* the caller gives the data */
  if (self->cancellable != NULL)
    g_cancellable_cancel (self->cancellable);
  g_clear_object (&self->cancellable);
  g_clear_pointer (&self->pending, fw_params_unref);
  self->generation++;
  set_message (self, NULL);

  if (self->clip == NULL || self->set == NULL || self->cache == NULL)
    {
      self->busy = FALSE;
      emit_state (self);
      return;
    }
  params = fw_param_set_get_params (self->set);
  if (fw_clip_get_missing (self->clip))
    {
      g_autofree char *msg = g_strdup_printf (_("%s: file not found. Relink it from the clip's "
                                                "menu in the sidebar."),
                                              fw_clip_get_path (self->clip));
      self->busy = FALSE;
      g_clear_pointer (&self->matrix, fw_matrix_unref);
      g_clear_pointer (&self->audio, fw_audio_unref);
      drop_caches (self);
      set_message (self, msg);
      emit_state (self);
      return;
    }

  self->busy = TRUE;
  self->pending = fw_params_ref (params);
  self->cancellable = g_cancellable_new ();
  data = g_new0 (LoadData, 1);
  data->row = g_object_ref (self);
  data->generation = self->generation;
  data->params = fw_params_ref (params);

  if (self->kind == FW_PLOT_WAVEFORM)
    {
      fw_clip_load_audio_async (self->clip, params, self->cancellable, on_audio_ready, data);
    }
  else
    {
      fw_feature_cache_request_async (self->cache, self->clip, params, row_stage (self),
                                      self->cancellable, on_matrix_ready, data);
    }
  emit_state (self);
}

static void
on_set_params_changed (FwParamSet *set, GParamSpec *pspec, FwPlotRow *self)
{
  FwParams *now = fw_param_set_get_params (set);

  /* Only what depends on the change recomputes: a row whose stage gives the same
   * result keeps it (the cache answers at once for unchanged keys of other stages). */
  if ((self->pending != NULL && fw_params_equal (now, self->pending)) ||
      (self->pending == NULL && self->params != NULL && fw_params_equal (now, self->params)))
    return;
  start_load (self);
}

static gboolean
reload_idle_cb (gpointer user_data)
{
  FwPlotRow *self = user_data;

  self->reload_idle = 0;
  start_load (self);
  return G_SOURCE_REMOVE;
}

/* The clip was relinked or its file appeared or vanished: compute again once the clip has
 * finished updating itself. */
static void
on_clip_file_changed (FwClip *clip, GParamSpec *pspec, FwPlotRow *self)
{
  if (self->reload_idle == 0)
    self->reload_idle = g_idle_add (reload_idle_cb, self);
}

void
fw_plot_row_set_source (FwPlotRow *self, FwFeatureCache *cache, FwClip *clip, FwParamSet *set)
{
  gboolean changed;

  g_return_if_fail (FW_IS_PLOT_ROW (self));

  changed = cache != self->cache || clip != self->clip || set != self->set;
  if (!changed)
    return;
  if (self->set != NULL)
    g_signal_handlers_disconnect_by_func (self->set, on_set_params_changed, self);
  if (self->clip != NULL)
    g_signal_handlers_disconnect_by_func (self->clip, on_clip_file_changed, self);
  if (clip != self->clip)
    {
      g_clear_pointer (&self->matrix, fw_matrix_unref);
      g_clear_pointer (&self->audio, fw_audio_unref);
      g_clear_pointer (&self->params, fw_params_unref);
      self->have_auto = FALSE;
      self->have_base_spec = FALSE;
      self->have_trace_range = FALSE;
      drop_caches (self);
      g_clear_object (&self->texture);   /* another clip's picture would mislead */
    }
  g_set_object (&self->cache, cache);
  g_set_object (&self->clip, clip);
  g_set_object (&self->set, set);
  if (set != NULL)
    g_signal_connect (set, "notify::params", G_CALLBACK (on_set_params_changed), self);
  if (clip != NULL)
    {
      g_signal_connect (clip, "notify::path", G_CALLBACK (on_clip_file_changed), self);
      g_signal_connect (clip, "notify::missing", G_CALLBACK (on_clip_file_changed), self);
    }
  start_load (self);
}

FwClip *fw_plot_row_get_clip (FwPlotRow *self) { return self->clip; }
FwParamSet *fw_plot_row_get_param_set (FwPlotRow *self) { return self->set; }
FwParams *fw_plot_row_get_params (FwPlotRow *self) { return self->params; }
FwMatrix *fw_plot_row_get_matrix (FwPlotRow *self) { return self->matrix; }
FwAudio *fw_plot_row_get_audio (FwPlotRow *self) { return self->audio; }
static gboolean texture_outdated (FwPlotRow *self);

/* Busy: computing, rendering a heatmap, or showing a heatmap made for another view. */
gboolean
fw_plot_row_is_busy (FwPlotRow *self)
{
  return self->busy || self->render_running || self->reload_idle != 0 || texture_outdated (self);
}
const char *fw_plot_row_get_message (FwPlotRow *self) { return self->message; }

double
fw_plot_row_get_duration (FwPlotRow *self)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), 0);
  if (self->audio != NULL && self->audio->sample_rate > 0)
    return self->audio->n_samples / self->audio->sample_rate;
  if (self->matrix != NULL && self->matrix->n_frames > 0)
    return self->matrix->frame_times[self->matrix->n_frames - 1] + 0.5 * self->matrix->hop_seconds;
  return 0;
}

void
fw_plot_row_reload (FwPlotRow *self)
{
  g_return_if_fail (FW_IS_PLOT_ROW (self));
  start_load (self);
}

void
fw_plot_row_set_data (FwPlotRow *self, FwMatrix *matrix, FwParams *params, FwStage stage,
                      const char *title, const char *quantity, const char *unit,
                      gboolean signed_values)
{
  LoadData *data;
  Prepared *p;
  GTask *task;

  g_return_if_fail (FW_IS_PLOT_ROW (self));

  /* leave the cache-driven mode for good */
  if (self->cancellable != NULL)
    g_cancellable_cancel (self->cancellable);
  g_clear_object (&self->cancellable);
  g_clear_pointer (&self->pending, fw_params_unref);
  if (self->set != NULL)
    g_signal_handlers_disconnect_by_func (self->set, on_set_params_changed, self);
  if (self->clip != NULL)
    g_signal_handlers_disconnect_by_func (self->clip, on_clip_file_changed, self);
  g_clear_handle_id (&self->reload_idle, g_source_remove);
  g_clear_object (&self->clip);
  g_clear_object (&self->set);
  g_clear_object (&self->cache);

  if (!self->external || self->signed_values != signed_values)
    self->scale = fw_colour_scale_default (signed_values ? FW_COLOUR_SCALE_DIVERGING
                                                         : fw_colour_scale_kind_for_stage (stage));
  self->external = TRUE;
  self->data_stage = stage;
  self->signed_values = signed_values;
  g_free (self->title);
  self->title = g_strdup (title);
  g_free (self->quantity);
  self->quantity = g_strdup (quantity);
  g_free (self->unit);
  self->unit = g_strdup (unit);
  self->generation++;
  set_message (self, NULL);

  if (matrix == NULL)
    {
      self->busy = FALSE;
      g_clear_pointer (&self->matrix, fw_matrix_unref);
      g_clear_pointer (&self->params, fw_params_unref);
      self->have_auto = FALSE;
      self->have_base_spec = FALSE;
      self->have_trace_range = FALSE;
      drop_caches (self);
      g_clear_object (&self->texture);
      emit_state (self);
      return;
    }

  /* prepared for drawing in a worker, as computed rows are */
  self->busy = TRUE;
  self->cancellable = g_cancellable_new ();
  data = g_new0 (LoadData, 1);
  data->row = g_object_ref (self);
  data->generation = self->generation;
  data->params = params != NULL ? fw_params_ref (params) : NULL;
  p = g_new0 (Prepared, 1);
  p->matrix = fw_matrix_ref (matrix);
  p->stage = stage;
  p->heatmap = fw_plot_kind_is_heatmap (self->kind);
  p->signed_values = signed_values;
  task = g_task_new (self, self->cancellable, on_prepared, data);
  g_task_set_source_tag (task, fw_plot_row_set_data);
  g_task_set_task_data (task, p, (GDestroyNotify) prepared_free);
  g_task_run_in_thread (task, prepare_thread);
  g_object_unref (task);
  emit_state (self);
}

const char *
fw_plot_row_get_title (FwPlotRow *self)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), NULL);
  return row_title (self);
}

void
fw_plot_row_cancel (FwPlotRow *self)
{
  g_return_if_fail (FW_IS_PLOT_ROW (self));
  if (self->busy && self->cancellable != NULL)
    g_cancellable_cancel (self->cancellable);
}

/* ---------------------------------------------------------------- appearance */

void
fw_plot_row_set_colour_scale (FwPlotRow *self, const char *name)
{
  const FwColourScale *scale = fw_colour_scale_get (name);

  g_return_if_fail (FW_IS_PLOT_ROW (self));
  if (scale == NULL || scale == self->scale)
    return;
  self->scale = scale;
  gtk_widget_queue_draw (GTK_WIDGET (self));
  g_signal_emit (self, signals[SIGNAL_SETTINGS_CHANGED], 0);
}

const char *
fw_plot_row_get_colour_scale (FwPlotRow *self)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), NULL);
  return fw_colour_scale_get_name (self->scale);
}

void
fw_plot_row_set_range_mode (FwPlotRow *self, FwRangeMode mode, const FwValueRange *fixed)
{
  g_return_if_fail (FW_IS_PLOT_ROW (self));
  self->range_mode = mode;
  if (fixed != NULL && fixed->hi > fixed->lo)
    self->fixed_range = *fixed;
  gtk_widget_queue_draw (GTK_WIDGET (self));
  g_signal_emit (self, signals[SIGNAL_SETTINGS_CHANGED], 0);
}

FwRangeMode
fw_plot_row_get_range_mode (FwPlotRow *self)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), FW_RANGE_AUTO);
  return self->range_mode;
}

void
fw_plot_row_set_shared_range (FwPlotRow *self, const FwValueRange *range)
{
  g_return_if_fail (FW_IS_PLOT_ROW (self));
  if (range == NULL)
    {
      if (!self->have_shared)
        return;
      self->have_shared = FALSE;
    }
  else
    {
      if (self->have_shared && self->shared_range.lo == range->lo &&
          self->shared_range.hi == range->hi)
        return;
      self->have_shared = TRUE;
      self->shared_range = *range;
    }
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

gboolean
fw_plot_row_get_auto_range (FwPlotRow *self, FwValueRange *out)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), FALSE);
  if (self->have_auto && out != NULL)
    *out = self->auto_range;
  return self->have_auto;
}

gboolean
fw_plot_row_get_shown_range (FwPlotRow *self, FwValueRange *out)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), FALSE);
  switch (self->range_mode)
    {
    case FW_RANGE_FIXED:
      *out = self->fixed_range;
      return TRUE;
    case FW_RANGE_LOCKED:
      if (self->have_shared)
        {
          *out = self->shared_range;
          return TRUE;
        }
      G_GNUC_FALLTHROUGH;
    case FW_RANGE_AUTO:
    default:
      if (self->have_auto)
        *out = self->auto_range;
      return self->have_auto;
    }
}

void
fw_plot_row_set_frequency_scale (FwPlotRow *self, FwAxisScale scale)
{
  g_return_if_fail (FW_IS_PLOT_ROW (self));
  if (scale == self->freq_scale)
    return;
  self->freq_scale = scale;
  gtk_widget_queue_draw (GTK_WIDGET (self));
  g_signal_emit (self, signals[SIGNAL_SETTINGS_CHANGED], 0);
}

FwAxisScale
fw_plot_row_get_frequency_scale (FwPlotRow *self)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), FW_AXIS_LINEAR);
  return self->freq_scale;
}

const char *
fw_plot_row_get_range_group (FwPlotRow *self)
{
  g_return_val_if_fail (FW_IS_PLOT_ROW (self), NULL);
  /* dB spectrogram and mel dB both hold levels in dB: one range serves both. */
  if (self->kind == FW_PLOT_SPECTROGRAM || self->kind == FW_PLOT_MEL)
    return "db";
  return fw_plot_kind_id (self->kind);
}

/* ---------------------------------------------------------------- accessibility */

static void
update_accessible (FwPlotRow *self)
{
  g_autofree char *label = NULL;
  g_autofree char *description = NULL;
  const char *clip = self->clip != NULL ? fw_clip_get_display_name (self->clip) : _("no clip");
  const char *set = self->set != NULL ? fw_param_set_get_name (self->set) : _("no set");

  if (self->external)
    label = g_strdup (row_title (self));
  else
    /* TRANSLATORS: accessible name of a plot row: row title, clip, parameter set */
    label = g_strdup_printf (_("%s of %s with parameter set %s"), fw_plot_kind_title (self->kind),
                             clip, set);
  if (self->message != NULL)
    description = g_strdup (self->message);
  else if (self->busy)
    description = g_strdup (_("Computing…"));
  else if (self->matrix != NULL && (self->params != NULL || self->external))
    {
      g_autofree char *quantity = row_quantity (self);
      description = g_strdup_printf (_("%zu frames × %zu bins over %.2f s; values: %s"),
                                     self->matrix->n_frames, self->matrix->n_bins,
                                     fw_plot_row_get_duration (self), quantity);
    }
  else if (self->audio != NULL)
    description = g_strdup_printf (_("%zu samples at %.0f Hz, %.2f s"), self->audio->n_samples,
                                   self->audio->sample_rate, fw_plot_row_get_duration (self));
  else
    description = g_strdup (_("No data"));
  gtk_accessible_update_property (GTK_ACCESSIBLE (self),
                                  GTK_ACCESSIBLE_PROPERTY_LABEL, label,
                                  GTK_ACCESSIBLE_PROPERTY_DESCRIPTION, description,
                                  -1);
}

/* ---------------------------------------------------------------- readout */

static gsize
nearest_frame (const FwMatrix *m, double t)
{
  gsize lo = 0, hi = m->n_frames;

  /* first frame whose centre is >= t, then the nearer of it and its predecessor */
  while (lo < hi)
    {
      gsize mid = lo + (hi - lo) / 2;
      if (m->frame_times[mid] < t)
        lo = mid + 1;
      else
        hi = mid;
    }
  if (lo >= m->n_frames)
    return m->n_frames - 1;
  if (lo > 0 && t - m->frame_times[lo - 1] < m->frame_times[lo] - t)
    return lo - 1;
  return lo;
}

static void
heatmap_spec (FwPlotRow *self, FwHeatmapSpec *spec, double t0, double t1)
{
  FwValueRange range;

  if (self->have_base_spec)
    *spec = self->base_spec;
  else
    fw_heatmap_spec_init (spec, self->matrix, row_stage (self));
  spec->scale = self->scale != NULL ? self->scale : spec->scale;
  if (fw_plot_row_get_shown_range (self, &range))
    spec->range = range;
  spec->t0 = t0;
  spec->t1 = t1;
  spec->freq_scale = self->freq_scale;
  if (self->params != NULL)
    {
      g_autofree char *mel = fw_params_get_value (self->params, "mel_scale");
      FwMelScale ms;
      if (mel != NULL && fw_mel_scale_from_name (mel, &ms))
        spec->mel_scale = ms;
    }
}

static char *
format_hz (double hz)
{
  if (fabs (hz) >= 1000)
    return g_strdup_printf (_("%.3f kHz"), hz / 1000.0);
  return g_strdup_printf (_("%.1f Hz"), hz);
}

char *
fw_plot_row_describe_point (FwPlotRow *self, double x, double y)
{
  graphene_rect_t area;
  double t;
  GString *s;

  g_return_val_if_fail (FW_IS_PLOT_ROW (self), NULL);
  fw_plot_row_get_data_area (self, &area);
  if (!graphene_rect_contains_point (&area, &GRAPHENE_POINT_INIT (x, y)))
    return NULL;
  t = x_to_time (self, x);
  s = g_string_new (NULL);
  g_string_append_printf (s, _("%.4f s"), t);

  if (self->kind == FW_PLOT_WAVEFORM && self->audio != NULL)
    {
      double pos = t * self->audio->sample_rate;
      if (pos >= 0 && pos < self->audio->n_samples)
        {
          gsize n = (gsize) pos;
          double v = self->audio->samples[n];
          g_string_append_printf (s, _(" · sample %zu · amplitude %.4f (%.1f dBFS)"), n, v,
                                  v != 0 ? 20 * log10 (fabs (v)) : -INFINITY);
        }
    }
  else if (self->matrix != NULL && self->matrix->n_frames > 0 &&
           (self->params != NULL || self->external))
    {
      const FwMatrix *m = self->matrix;
      gsize frame = nearest_frame (m, t);
      gsize bin = 0;
      g_autofree char *quantity = row_quantity (self);
      const char *unit = row_unit (self);
      float v;

      g_string_append_printf (s, _(" (frame %zu at %.4f s)"), frame, m->frame_times[frame]);
      if (fw_plot_kind_is_heatmap (self->kind))
        {
          FwHeatmapSpec spec;
          FwAxis axis;
          FwTickStyle style;
          double value;

          heatmap_spec (self, &spec, 0, 1);
          fw_heatmap_bin_axis (m, &spec, area.origin.y + area.size.height, area.origin.y,
                               &axis, &style);
          value = fw_axis_pixel_to_value (&axis, y);
          switch (m->bin_kind)
            {
            case FW_BIN_AXIS_HZ:
              {
                double df = m->n_bins > 1 ? m->bin_value[1] - m->bin_value[0] : 1;
                double k = round (value / df);
                g_autofree char *f = NULL, *lo = NULL, *hi = NULL;
                bin = (gsize) CLAMP (k, 0, (double) m->n_bins - 1);
                f = format_hz (m->bin_value[bin]);
                lo = format_hz (m->bin_low[bin]);
                hi = format_hz (m->bin_high[bin]);
                g_string_append_printf (s, _(" · bin %zu: %s (%s–%s)"), bin, f, lo, hi);
                break;
              }
            case FW_BIN_AXIS_MEL_BAND:
              {
                double u = round (fw_axis_forward (&axis, value));
                g_autofree char *lo = NULL, *hi = NULL;
                bin = (gsize) CLAMP (u, 0, (double) m->n_bins - 1);
                lo = format_hz (m->bin_low[bin]);
                hi = format_hz (m->bin_high[bin]);
                g_string_append_printf (s, _(" · mel band %zu (%s–%s)"), bin, lo, hi);
                break;
              }
            case FW_BIN_AXIS_COEFFICIENT:
            case FW_BIN_AXIS_SCALAR:
            default:
              bin = (gsize) CLAMP (round (value), 0, (double) m->n_bins - 1);
              g_string_append_printf (s, _(" · coefficient c%zu"), bin);
              break;
            }
        }
      v = fw_matrix_get (m, frame, bin);
      if (*unit != '\0')
        g_string_append_printf (s, _(" · %.2f %s (%s)"), v, unit, quantity);
      else
        g_string_append_printf (s, _(" · %.4g (%s)"), v, quantity);
    }
  return g_string_free (s, FALSE);
}

/* ---------------------------------------------------------------- drawing */

static void
draw_message (GtkSnapshot *snapshot, GtkWidget *widget, const graphene_rect_t *area,
              const char *text, gboolean error)
{
  PangoLayout *layout = gtk_widget_create_pango_layout (widget, text);
  int lw, lh;
  GdkRGBA colour;

  G_GNUC_BEGIN_IGNORE_DEPRECATIONS
  gtk_style_context_get_color (gtk_widget_get_style_context (widget), &colour);
  G_GNUC_END_IGNORE_DEPRECATIONS
  if (error)
    colour = (GdkRGBA) { 0.85, 0.2, 0.15, 1 };
  else
    colour.alpha *= 0.7;
  pango_layout_set_width (layout, (int) (area->size.width - 24) * PANGO_SCALE);
  pango_layout_set_alignment (layout, PANGO_ALIGN_CENTER);
  pango_layout_set_wrap (layout, PANGO_WRAP_WORD_CHAR);
  pango_layout_get_pixel_size (layout, &lw, &lh);
  gtk_snapshot_save (snapshot);
  gtk_snapshot_translate (snapshot, &GRAPHENE_POINT_INIT (area->origin.x + 12,
                                                          area->origin.y + (area->size.height - lh) / 2));
  gtk_snapshot_append_layout (snapshot, layout, &colour);
  gtk_snapshot_restore (snapshot);
  g_object_unref (layout);
}

static gboolean
texture_key_equal (const TextureKey *a, const TextureKey *b)
{
  return a->matrix == b->matrix && a->scale == b->scale && a->range.lo == b->range.lo &&
         a->range.hi == b->range.hi && a->freq_scale == b->freq_scale && a->t0 == b->t0 &&
         a->t1 == b->t1 && a->width == b->width && a->height == b->height &&
         a->variant == b->variant;
}

/* Heatmap images are rendered in a worker thread (a zoomed-out view of a long clip reads
 * every cell); meanwhile the previous texture stays on screen, placed by its own time range.
 * At most one job runs per row; a newer view starts when it finishes. */
typedef struct {
  FwMatrix *matrix;
  FwHeatmapSpec spec;
  TextureKey key;
  cairo_surface_t *image;
  char *error;
} RenderJob;

static void
render_job_free (RenderJob *job)
{
  fw_matrix_unref (job->matrix);
  g_clear_pointer (&job->image, cairo_surface_destroy);
  g_free (job->error);
  g_free (job);
}

static void
render_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  RenderJob *job = task_data;
  g_autoptr (GError) error = NULL;

  job->image = fw_heatmap_render (job->matrix, &job->spec, job->key.width, job->key.height,
                                  &error);
  if (job->image == NULL)
    job->error = g_strdup (error != NULL ? error->message : _("Could not draw this row"));
  g_task_return_boolean (task, TRUE);
}

static void
on_render_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  FwPlotRow *self = FW_PLOT_ROW (source);
  RenderJob *job = g_task_get_task_data (G_TASK (result));

  self->render_running = FALSE;
  if (job->matrix == self->matrix)
    {
      if (job->image != NULL)
        {
          g_clear_object (&self->texture);
          self->texture = fw_texture_from_surface (job->image);
          self->texture_key = job->key;
        }
      else
        set_message (self, job->error);
    }
  gtk_widget_queue_draw (GTK_WIDGET (self));
  g_signal_emit (self, signals[SIGNAL_STATE_CHANGED], 0);
}

/* The texture to show for the current view, starting its rendering when it is missing;
 * *exact says whether the texture returned is the one for this view. */
static void
current_texture_key (FwPlotRow *self, const graphene_rect_t *area, double t0, double t1,
                     FwHeatmapSpec *spec, TextureKey *key)
{
  int scale = gtk_widget_get_scale_factor (GTK_WIDGET (self));

  heatmap_spec (self, spec, t0, t1);
  memset (key, 0, sizeof *key);
  key->matrix = self->matrix;
  key->scale = spec->scale;
  key->range = spec->range;
  key->freq_scale = spec->freq_scale;
  key->t0 = t0;
  key->t1 = t1;
  key->width = (int) ceil (area->size.width * scale);
  key->height = (int) ceil (area->size.height * scale);
}

/* TRUE when the heatmap on screen is not the one for the current view yet. */
static gboolean
texture_outdated (FwPlotRow *self)
{
  graphene_rect_t area;
  FwHeatmapSpec spec;
  TextureKey key;
  double t0, t1;

  if (self->matrix == NULL || !fw_plot_kind_is_heatmap (self->kind) ||
      !gtk_widget_get_mapped (GTK_WIDGET (self)))
    return FALSE;
  fw_plot_row_get_data_area (self, &area);
  fw_viewport_get_visible (self->viewport, &t0, &t1);
  current_texture_key (self, &area, t0, t1, &spec, &key);
  return self->texture == NULL || !texture_key_equal (&key, &self->texture_key);
}

static GdkTexture *
heatmap_texture (FwPlotRow *self, const graphene_rect_t *area, double t0, double t1,
                 gboolean *exact)
{
  FwHeatmapSpec spec;
  TextureKey key;

  current_texture_key (self, area, t0, t1, &spec, &key);
  *exact = self->texture != NULL && texture_key_equal (&key, &self->texture_key);
  if (!*exact && !self->render_running)
    {
      RenderJob *job = g_new0 (RenderJob, 1);
      GTask *task = g_task_new (self, NULL, on_render_done, NULL);

      job->matrix = fw_matrix_ref (self->matrix);
      job->spec = spec;
      job->key = key;
      self->render_running = TRUE;
      g_task_set_source_tag (task, heatmap_texture);
      g_task_set_task_data (task, job, (GDestroyNotify) render_job_free);
      g_task_run_in_thread (task, render_thread);
      g_object_unref (task);
    }
  return self->texture;
}

static void
fw_plot_row_snapshot (GtkWidget *widget, GtkSnapshot *snapshot)
{
  FwPlotRow *self = FW_PLOT_ROW (widget);
  int width = gtk_widget_get_width (widget);
  int height = gtk_widget_get_height (widget);
  graphene_rect_t area;
  double t0, t1;
  FwTheme theme;
  cairo_t *cr;
  g_autofree char *title = NULL;
  gboolean have_data = self->matrix != NULL || self->audio != NULL;
  FwPlotDrawInfo info = { 0 };

  if (width <= FW_PLOT_GUTTER_LEFT + FW_PLOT_GUTTER_RIGHT + 4 || height <= FW_PLOT_TITLE_HEIGHT + 8)
    return;
  fw_plot_row_get_data_area (self, &area);
  fw_viewport_get_visible (self->viewport, &t0, &t1);
  fw_screen_theme_for_widget (widget, &theme);

  /* heatmap image, replayed from the texture */
  if (self->matrix != NULL && fw_plot_kind_is_heatmap (self->kind))
    {
      gboolean exact = FALSE;
      GdkTexture *texture = heatmap_texture (self, &area, t0, t1, &exact);

      if (texture != NULL && exact)
        gtk_snapshot_append_texture (snapshot, texture, &area);
      else if (texture != NULL)
        {
          /* the previous image where its times fall now, until the new one is ready */
          double x0 = fw_plot_row_time_to_x (self, self->texture_key.t0);
          double x1 = fw_plot_row_time_to_x (self, self->texture_key.t1);
          gtk_snapshot_push_clip (snapshot, &area);
          gtk_snapshot_append_texture (snapshot, texture,
                                       &GRAPHENE_RECT_INIT (x0, area.origin.y, MAX (1, x1 - x0),
                                                            area.size.height));
          gtk_snapshot_pop (snapshot);
        }
    }

  /* axes, titles, colour bar, waveform and curves through the render layer */
  cr = gtk_snapshot_append_cairo (snapshot, &GRAPHENE_RECT_INIT (0, 0, width, height));
  info.kind = self->kind;
  info.stage = row_stage (self);
  info.matrix = self->matrix;
  info.audio = self->audio;
  info.params = self->params;
  info.t0 = t0;
  info.t1 = t1;
  info.scale = self->scale;
  info.have_range = fw_plot_row_get_shown_range (self, &info.range);
  info.freq_scale = self->freq_scale;
  info.x = area.origin.x;
  info.y = area.origin.y;
  info.w = area.size.width;
  info.h = area.size.height;
  info.envelope = &self->envelope;
  info.have_trace_range = self->have_trace_range;
  info.trace_range = self->trace_range;
  if (self->matrix != NULL && fw_plot_kind_is_heatmap (self->kind))
    heatmap_spec (self, &info.heatmap, t0, t1);
  title = g_strdup (row_title (self));
  info.title = title;
  info.quantity = self->quantity;
  info.zero_line = self->signed_values;
  fw_plot_draw_row (cr, &theme, &info);
  cairo_destroy (cr);

  /* overlays: selection, cursor, hover */
  {
    double s, e;
    GdkRGBA sel = { 0.35, 0.55, 0.95, 0.25 };
    GdkRGBA cursor = { 0.95, 0.30, 0.20, 0.95 };
    GdkRGBA hover = { theme.foreground.r, theme.foreground.g, theme.foreground.b, 0.35 };

    gtk_snapshot_push_clip (snapshot, &area);
    if (fw_viewport_get_selection (self->viewport, &s, &e))
      {
        double xs = fw_plot_row_time_to_x (self, s);
        double xe = fw_plot_row_time_to_x (self, e);
        gtk_snapshot_append_color (snapshot, &sel,
                                   &GRAPHENE_RECT_INIT (xs, area.origin.y, MAX (1, xe - xs),
                                                        area.size.height));
      }
    if (fw_viewport_has_cursor (self->viewport))
      {
        /* a crisp line on the pixel that holds the cursor time */
        double xc = floor (fw_plot_row_time_to_x (self, fw_viewport_get_cursor (self->viewport)));
        gtk_snapshot_append_color (snapshot, &cursor,
                                   &GRAPHENE_RECT_INIT (xc, area.origin.y, 1, area.size.height));
      }
    if (self->hovering && self->drag_mode == DRAG_NONE)
      gtk_snapshot_append_color (snapshot, &hover,
                                 &GRAPHENE_RECT_INIT (round (self->hover_x), area.origin.y, 1,
                                                      area.size.height));
    gtk_snapshot_pop (snapshot);
  }

  /* state */
  if (!have_data && self->busy)
    draw_message (snapshot, widget, &area, _("Computing…"), FALSE);
  else if (!have_data && self->message != NULL)
    draw_message (snapshot, widget, &area, self->message, TRUE);
  else if (!have_data && self->clip == NULL && !self->external)
    draw_message (snapshot, widget, &area, _("Select a clip in the sidebar."), FALSE);
  else if (have_data && self->message != NULL)
    draw_message (snapshot, widget, &GRAPHENE_RECT_INIT (area.origin.x, 0, area.size.width,
                                                         FW_PLOT_TITLE_HEIGHT),
                  self->message, TRUE);
  else if (have_data && self->busy)
    {
      GdkRGBA veil = { 0.5, 0.5, 0.5, 0.12 };
      gtk_snapshot_append_color (snapshot, &veil, &area);
    }

  if (gtk_widget_has_visible_focus (widget))
    {
      GdkRGBA focus = { 0.21, 0.52, 0.89, 0.8 };
      GskRoundedRect outline;
      float widths[4] = { 2, 2, 2, 2 };
      GdkRGBA colours[4] = { focus, focus, focus, focus };
      gsk_rounded_rect_init_from_rect (&outline, &area, 0);
      gtk_snapshot_append_border (snapshot, &outline, widths, colours);
    }

  gtk_widget_snapshot_child (widget, self->menu_button, snapshot);
}

/* ---------------------------------------------------------------- layout */

static void
fw_plot_row_measure (GtkWidget *widget, GtkOrientation orientation, int for_size, int *minimum,
                     int *natural, int *minimum_baseline, int *natural_baseline)
{
  FwPlotRow *self = FW_PLOT_ROW (widget);
  int child_min = 0, child_nat = 0;

  gtk_widget_measure (self->menu_button, orientation, -1, &child_min, &child_nat, NULL, NULL);
  if (orientation == GTK_ORIENTATION_HORIZONTAL)
    {
      *minimum = FW_PLOT_GUTTER_LEFT + FW_PLOT_GUTTER_RIGHT + 80;
      *natural = *minimum + 400;
    }
  else
    {
      *minimum = is_curve (self) || self->kind == FW_PLOT_WAVEFORM ? 70 : 90;
      *natural = is_curve (self) || self->kind == FW_PLOT_WAVEFORM ? 110 : 170;
    }
}

static void
fw_plot_row_size_allocate (GtkWidget *widget, int width, int height, int baseline)
{
  FwPlotRow *self = FW_PLOT_ROW (widget);
  int bw, bh;

  gtk_widget_measure (self->menu_button, GTK_ORIENTATION_HORIZONTAL, -1, &bw, NULL, NULL, NULL);
  gtk_widget_measure (self->menu_button, GTK_ORIENTATION_VERTICAL, -1, &bh, NULL, NULL, NULL);
  gtk_widget_size_allocate (self->menu_button,
                            &(GtkAllocation) { width - bw - 2, 0, bw, bh }, -1);
  /* the envelope follows the data area's width */
  if (self->envelope != NULL && self->envelope->n_columns != width - FW_PLOT_GUTTER_LEFT - FW_PLOT_GUTTER_RIGHT)
    g_clear_pointer (&self->envelope, fw_waveform_envelope_free);
}

static void
fw_plot_row_css_changed (GtkWidget *widget, GtkCssStyleChange *change)
{
  GTK_WIDGET_CLASS (fw_plot_row_parent_class)->css_changed (widget, change);
  gtk_widget_queue_draw (widget);   /* axes and text follow a light/dark switch */
}

/* ---------------------------------------------------------------- interaction */

static void
emit_readout (FwPlotRow *self)
{
  g_autofree char *text = self->hovering ? fw_plot_row_describe_point (self, self->hover_x,
                                                                        self->hover_y) : NULL;
  g_signal_emit (self, signals[SIGNAL_READOUT], 0, text);
}

static void
on_motion (GtkEventControllerMotion *motion, double x, double y, FwPlotRow *self)
{
  self->hovering = TRUE;
  self->hover_x = x;
  self->hover_y = y;
  emit_readout (self);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
on_leave (GtkEventControllerMotion *motion, FwPlotRow *self)
{
  self->hovering = FALSE;
  g_signal_emit (self, signals[SIGNAL_READOUT], 0, NULL);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static void
on_drag_begin (GtkGestureDrag *gesture, double x, double y, FwPlotRow *self)
{
  GdkModifierType state = gtk_event_controller_get_current_event_state (GTK_EVENT_CONTROLLER (gesture));
  graphene_rect_t area;

  fw_plot_row_get_data_area (self, &area);
  if (x < area.origin.x || x > area.origin.x + area.size.width)
    {
      gtk_gesture_set_state (GTK_GESTURE (gesture), GTK_EVENT_SEQUENCE_DENIED);
      return;
    }
  gtk_widget_grab_focus (GTK_WIDGET (self));
  self->drag_mode = (state & GDK_SHIFT_MASK) ? DRAG_SELECT : DRAG_PAN;
  self->drag_start_x = x;
  self->drag_start_time = x_to_time (self, x);
  fw_viewport_get_visible (self->viewport, &self->drag_visible_start, &self->drag_visible_end);
}

static void
on_drag_update (GtkGestureDrag *gesture, double dx, double dy, FwPlotRow *self)
{
  graphene_rect_t area;

  if (self->drag_mode == DRAG_NONE || fabs (dx) < DRAG_THRESHOLD)
    return;
  fw_plot_row_get_data_area (self, &area);
  if (self->drag_mode == DRAG_PAN)
    {
      double spp = (self->drag_visible_end - self->drag_visible_start) / area.size.width;
      fw_viewport_set_visible (self->viewport, self->drag_visible_start - dx * spp,
                               self->drag_visible_end - dx * spp);
    }
  else
    {
      double t = x_to_time (self, self->drag_start_x + dx);
      fw_viewport_set_selection (self->viewport, self->drag_start_time, t);
    }
}

static void
on_drag_end (GtkGestureDrag *gesture, double dx, double dy, FwPlotRow *self)
{
  if (self->drag_mode != DRAG_NONE && fabs (dx) < DRAG_THRESHOLD)
    {
      /* a click: the cursor goes there; a plain click also ends a selection */
      if (self->drag_mode == DRAG_PAN)
        fw_viewport_clear_selection (self->viewport);
      fw_viewport_set_cursor (self->viewport, self->drag_start_time);
    }
  self->drag_mode = DRAG_NONE;
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

static gboolean
on_scroll (GtkEventControllerScroll *controller, double dx, double dy, FwPlotRow *self)
{
  GdkModifierType state = gtk_event_controller_get_current_event_state (GTK_EVENT_CONTROLLER (controller));
  GdkScrollUnit unit = gtk_event_controller_scroll_get_unit (controller);
  graphene_rect_t area;
  double s, e;

  fw_plot_row_get_data_area (self, &area);
  fw_viewport_get_visible (self->viewport, &s, &e);
  if (state & GDK_CONTROL_MASK)
    {
      double anchor = self->hovering ? x_to_time (self, self->hover_x) : 0.5 * (s + e);
      double steps = unit == GDK_SCROLL_UNIT_WHEEL ? dy : dy / 20.0;
      fw_viewport_zoom (self->viewport, pow (1.25, -steps), anchor);
      return TRUE;
    }
  if (unit == GDK_SCROLL_UNIT_WHEEL)
    fw_viewport_pan (self->viewport, (dx + dy) * 0.1 * (e - s));
  else
    fw_viewport_pan (self->viewport, (dx + dy) * (e - s) / area.size.width);
  return TRUE;
}

static void
on_viewport_changed (FwViewport *viewport, guint what, FwPlotRow *self)
{
  if (what & (FW_VIEWPORT_CHANGED_VISIBLE | FW_VIEWPORT_CHANGED_DURATION))
    g_clear_pointer (&self->envelope, fw_waveform_envelope_free);
  gtk_widget_queue_draw (GTK_WIDGET (self));
  if (self->hovering)
    emit_readout (self);
}

/* ---------------------------------------------------------------- row menu */

static void
on_scale_selected (GtkDropDown *dropdown, GParamSpec *pspec, FwPlotRow *self)
{
  size_t n = 0;
  const FwColourScale *const *scales = fw_colour_scale_list (&n);
  guint i = gtk_drop_down_get_selected (dropdown);

  if (i < n)
    fw_plot_row_set_colour_scale (self, fw_colour_scale_get_name (scales[i]));
}

static void
on_axis_selected (GtkDropDown *dropdown, GParamSpec *pspec, FwPlotRow *self)
{
  static const FwAxisScale scales[] = { FW_AXIS_LINEAR, FW_AXIS_LOG, FW_AXIS_MEL };
  guint i = gtk_drop_down_get_selected (dropdown);

  if (i < G_N_ELEMENTS (scales))
    fw_plot_row_set_frequency_scale (self, scales[i]);
}

static void
apply_fixed_range (FwPlotRow *self)
{
  GtkSpinButton *lo = g_object_get_data (G_OBJECT (self->popover_box), "fw-lo");
  GtkSpinButton *hi = g_object_get_data (G_OBJECT (self->popover_box), "fw-hi");
  GtkCheckButton *fixed = g_object_get_data (G_OBJECT (self->popover_box), "fw-fixed");
  FwValueRange r = { gtk_spin_button_get_value (lo), gtk_spin_button_get_value (hi) };

  if (!gtk_check_button_get_active (fixed))
    return;
  if (!(r.hi > r.lo))
    {
      gtk_widget_add_css_class (GTK_WIDGET (hi), "error");
      return;
    }
  gtk_widget_remove_css_class (GTK_WIDGET (hi), "error");
  fw_plot_row_set_range_mode (self, FW_RANGE_FIXED, &r);
}

static void
on_range_spin_changed (GtkSpinButton *spin, FwPlotRow *self)
{
  apply_fixed_range (self);
}

static void
on_range_mode_toggled (GtkCheckButton *check, FwPlotRow *self)
{
  GtkWidget *lo = g_object_get_data (G_OBJECT (self->popover_box), "fw-lo");
  GtkWidget *hi = g_object_get_data (G_OBJECT (self->popover_box), "fw-hi");
  gboolean fixed = gtk_check_button_get_active (g_object_get_data (G_OBJECT (self->popover_box), "fw-fixed"));

  gtk_widget_set_sensitive (lo, fixed);
  gtk_widget_set_sensitive (hi, fixed);
  if (fixed)
    apply_fixed_range (self);
  else if (self->range_mode == FW_RANGE_FIXED)
    fw_plot_row_set_range_mode (self, FW_RANGE_AUTO, NULL);
}

static void
on_recompute_clicked (GtkButton *button, FwPlotRow *self)
{
  gtk_popover_popdown (GTK_POPOVER (gtk_widget_get_ancestor (GTK_WIDGET (button), GTK_TYPE_POPOVER)));
  fw_plot_row_reload (self);
}

static GtkWidget *
labelled (const char *text, GtkWidget *widget)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 8);
  GtkWidget *label = gtk_label_new_with_mnemonic (text);

  gtk_label_set_xalign (GTK_LABEL (label), 0);
  gtk_widget_set_hexpand (label, TRUE);
  gtk_label_set_mnemonic_widget (GTK_LABEL (label), widget);
  gtk_box_append (GTK_BOX (box), label);
  gtk_box_append (GTK_BOX (box), widget);
  return box;
}

/* The row's settings, built fresh each time it opens so it shows the current state. */
static void
on_menu_activate (GtkMenuButton *button, gpointer user_data)
{
  FwPlotRow *self = user_data;
  GtkWidget *popover = gtk_popover_new ();
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 8);
  GtkWidget *heading = gtk_label_new (row_title (self));
  FwValueRange shown = { 0, 1 };

  self->popover_box = box;
  gtk_label_set_xalign (GTK_LABEL (heading), 0);
  gtk_widget_add_css_class (heading, "heading");
  gtk_box_append (GTK_BOX (box), heading);

  if (fw_plot_kind_is_heatmap (self->kind))
    {
      size_t n = 0;
      const FwColourScale *const *scales = fw_colour_scale_list (&n);
      GtkStringList *names = gtk_string_list_new (NULL);
      GtkWidget *dropdown;
      GtkWidget *automatic = gtk_check_button_new_with_mnemonic (_("_Automatic range"));
      GtkWidget *fixed = gtk_check_button_new_with_mnemonic (_("_Fixed range"));
      GtkWidget *lo = gtk_spin_button_new_with_range (-1e6, 1e6, 1);
      GtkWidget *hi = gtk_spin_button_new_with_range (-1e6, 1e6, 1);
      GtkWidget *range_box = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
      guint selected = 0;

      for (size_t i = 0; i < n; i++)
        {
          gtk_string_list_append (names, fw_colour_scale_get_name (scales[i]));
          if (scales[i] == self->scale)
            selected = (guint) i;
        }
      dropdown = gtk_drop_down_new (G_LIST_MODEL (names), NULL);
      gtk_drop_down_set_selected (GTK_DROP_DOWN (dropdown), selected);
      g_signal_connect (dropdown, "notify::selected", G_CALLBACK (on_scale_selected), self);
      gtk_box_append (GTK_BOX (box), labelled (_("Colour _scale"), dropdown));

      fw_plot_row_get_shown_range (self, &shown);
      gtk_spin_button_set_digits (GTK_SPIN_BUTTON (lo), 2);
      gtk_spin_button_set_digits (GTK_SPIN_BUTTON (hi), 2);
      gtk_spin_button_set_value (GTK_SPIN_BUTTON (lo), shown.lo);
      gtk_spin_button_set_value (GTK_SPIN_BUTTON (hi), shown.hi);
      gtk_accessible_update_property (GTK_ACCESSIBLE (lo), GTK_ACCESSIBLE_PROPERTY_LABEL,
                                      _("Lowest value of the colour range"), -1);
      gtk_accessible_update_property (GTK_ACCESSIBLE (hi), GTK_ACCESSIBLE_PROPERTY_LABEL,
                                      _("Highest value of the colour range"), -1);
      gtk_check_button_set_group (GTK_CHECK_BUTTON (fixed), GTK_CHECK_BUTTON (automatic));
      gtk_check_button_set_active (GTK_CHECK_BUTTON (self->range_mode == FW_RANGE_FIXED ? fixed : automatic), TRUE);
      gtk_widget_set_sensitive (lo, self->range_mode == FW_RANGE_FIXED);
      gtk_widget_set_sensitive (hi, self->range_mode == FW_RANGE_FIXED);
      g_object_set_data (G_OBJECT (box), "fw-lo", lo);
      g_object_set_data (G_OBJECT (box), "fw-hi", hi);
      g_object_set_data (G_OBJECT (box), "fw-fixed", fixed);
      g_signal_connect (fixed, "toggled", G_CALLBACK (on_range_mode_toggled), self);
      g_signal_connect (lo, "value-changed", G_CALLBACK (on_range_spin_changed), self);
      g_signal_connect (hi, "value-changed", G_CALLBACK (on_range_spin_changed), self);
      gtk_box_append (GTK_BOX (box), automatic);
      gtk_box_append (GTK_BOX (box), fixed);
      gtk_box_append (GTK_BOX (range_box), lo);
      gtk_box_append (GTK_BOX (range_box), gtk_label_new ("–"));
      gtk_box_append (GTK_BOX (range_box), hi);
      gtk_box_append (GTK_BOX (box), range_box);
      if (self->range_mode == FW_RANGE_LOCKED)
        {
          GtkWidget *note = gtk_label_new (_("Colour ranges are locked across rows: "
                                             "turn off “Lock Colour Ranges” to set this row's own."));
          gtk_label_set_wrap (GTK_LABEL (note), TRUE);
          gtk_label_set_max_width_chars (GTK_LABEL (note), 32);
          gtk_widget_add_css_class (note, "dim-label");
          gtk_box_append (GTK_BOX (box), note);
          gtk_widget_set_sensitive (fixed, FALSE);
          gtk_widget_set_sensitive (automatic, FALSE);
        }
    }
  if (self->kind == FW_PLOT_SPECTROGRAM)
    {
      const char *axes[] = { _("linear"), _("logarithmic"), _("mel"), NULL };
      GtkWidget *dropdown = gtk_drop_down_new_from_strings (axes);
      gtk_drop_down_set_selected (GTK_DROP_DOWN (dropdown),
                                  self->freq_scale == FW_AXIS_LOG ? 1
                                  : self->freq_scale == FW_AXIS_MEL ? 2 : 0);
      g_signal_connect (dropdown, "notify::selected", G_CALLBACK (on_axis_selected), self);
      gtk_box_append (GTK_BOX (box), labelled (_("_Frequency axis"), dropdown));
    }
  if (!self->external)
    {
      GtkWidget *recompute = gtk_button_new_with_mnemonic (_("_Recompute"));
      g_signal_connect (recompute, "clicked", G_CALLBACK (on_recompute_clicked), self);
      gtk_box_append (GTK_BOX (box), recompute);
    }
  gtk_popover_set_child (GTK_POPOVER (popover), box);
  gtk_menu_button_set_popover (button, popover);
}

/* ---------------------------------------------------------------- class */

static void
fw_plot_row_dispose (GObject *object)
{
  FwPlotRow *self = FW_PLOT_ROW (object);

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
  g_clear_object (&self->viewport);
  g_clear_object (&self->cache);
  g_clear_object (&self->clip);
  g_clear_object (&self->set);
  g_clear_pointer (&self->params, fw_params_unref);
  g_clear_pointer (&self->pending, fw_params_unref);
  g_clear_pointer (&self->matrix, fw_matrix_unref);
  g_clear_pointer (&self->audio, fw_audio_unref);
  drop_caches (self);
  g_clear_object (&self->texture);
  g_clear_pointer (&self->menu_button, gtk_widget_unparent);
  G_OBJECT_CLASS (fw_plot_row_parent_class)->dispose (object);
}

static void
fw_plot_row_finalize (GObject *object)
{
  FwPlotRow *self = FW_PLOT_ROW (object);

  g_free (self->message);
  g_free (self->title);
  g_free (self->quantity);
  g_free (self->unit);
  G_OBJECT_CLASS (fw_plot_row_parent_class)->finalize (object);
}

static void
fw_plot_row_class_init (FwPlotRowClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = fw_plot_row_dispose;
  object_class->finalize = fw_plot_row_finalize;
  widget_class->snapshot = fw_plot_row_snapshot;
  widget_class->measure = fw_plot_row_measure;
  widget_class->size_allocate = fw_plot_row_size_allocate;
  widget_class->css_changed = fw_plot_row_css_changed;

  signals[SIGNAL_STATE_CHANGED] =
    g_signal_new ("state-changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 0);
  signals[SIGNAL_READOUT] =
    g_signal_new ("readout", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 1, G_TYPE_STRING);
  signals[SIGNAL_RANGE_CHANGED] =
    g_signal_new ("range-changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 0);
  signals[SIGNAL_SETTINGS_CHANGED] =
    g_signal_new ("settings-changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL,
                  NULL, NULL, G_TYPE_NONE, 0);

  gtk_widget_class_set_css_name (widget_class, "fwplotrow");
  gtk_widget_class_set_accessible_role (widget_class, GTK_ACCESSIBLE_ROLE_IMG);
}

static void
fw_plot_row_init (FwPlotRow *self)
{
  GtkGesture *drag = gtk_gesture_drag_new ();
  GtkEventController *motion = gtk_event_controller_motion_new ();
  GtkEventController *scroll = gtk_event_controller_scroll_new (GTK_EVENT_CONTROLLER_SCROLL_BOTH_AXES);

  self->range_mode = FW_RANGE_AUTO;
  self->freq_scale = FW_AXIS_LINEAR;
  gtk_widget_set_focusable (GTK_WIDGET (self), TRUE);
  gtk_widget_set_hexpand (GTK_WIDGET (self), TRUE);
  gtk_widget_set_vexpand (GTK_WIDGET (self), TRUE);

  gtk_gesture_single_set_button (GTK_GESTURE_SINGLE (drag), GDK_BUTTON_PRIMARY);
  g_signal_connect (drag, "drag-begin", G_CALLBACK (on_drag_begin), self);
  g_signal_connect (drag, "drag-update", G_CALLBACK (on_drag_update), self);
  g_signal_connect (drag, "drag-end", G_CALLBACK (on_drag_end), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (drag));
  g_signal_connect (motion, "motion", G_CALLBACK (on_motion), self);
  g_signal_connect (motion, "leave", G_CALLBACK (on_leave), self);
  gtk_widget_add_controller (GTK_WIDGET (self), motion);
  g_signal_connect (scroll, "scroll", G_CALLBACK (on_scroll), self);
  gtk_widget_add_controller (GTK_WIDGET (self), scroll);

  self->menu_button = gtk_menu_button_new ();
  gtk_menu_button_set_icon_name (GTK_MENU_BUTTON (self->menu_button), "view-more-symbolic");
  gtk_menu_button_set_has_frame (GTK_MENU_BUTTON (self->menu_button), FALSE);
  gtk_widget_add_css_class (self->menu_button, "fw-row-menu");
  gtk_widget_set_tooltip_text (self->menu_button, _("Row settings: colour scale, range, axis"));
  gtk_menu_button_set_create_popup_func (GTK_MENU_BUTTON (self->menu_button), on_menu_activate,
                                         self, NULL);
  gtk_widget_set_parent (self->menu_button, GTK_WIDGET (self));
}

FwPlotRow *
fw_plot_row_new (FwPlotKind kind, FwViewport *viewport)
{
  FwPlotRow *self;

  g_return_val_if_fail (kind < FW_N_PLOT_KINDS, NULL);
  g_return_val_if_fail (FW_IS_VIEWPORT (viewport), NULL);

  self = g_object_new (FW_TYPE_PLOT_ROW, NULL);
  self->kind = kind;
  self->viewport = g_object_ref (viewport);
  self->scale = fw_colour_scale_default (fw_colour_scale_kind_for_stage (row_stage (self)));
  g_signal_connect (viewport, "changed", G_CALLBACK (on_viewport_changed), self);
  update_accessible (self);
  return self;
}
