/* fw-export-dialog.c: figure export settings with a live preview, written by src/render. */
#include "fw-config.h"

#include "fw-export-dialog.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-export.h"
#include "fw-feature.h"
#include "fw-figure.h"

#define PREVIEW_WIDTH_PX 620.0

struct _FwExportDialog {
  GtkWindow parent_instance;

  /* template */
  GtkButton *cancel_button;
  GtkButton *export_button;
  GtkFlowBox *rows_box;
  GtkDropDown *size_choice;
  GtkSpinButton *width_spin;
  GtkCheckButton *auto_height_check;
  GtkSpinButton *height_spin;
  GtkSpinButton *dpi_spin;
  GtkLabel *dpi_note;
  GtkEntry *font_entry;
  GtkDropDown *scale_choice;
  GtkDropDown *format_choice;
  GtkCheckButton *range_whole;
  GtkCheckButton *range_visible;
  GtkCheckButton *range_selection;
  GtkEntry *title_entry;
  GtkCheckButton *letters_check;
  GtkCheckButton *caption_check;
  GtkCheckButton *spectrum_check;
  GtkLabel *status_label;
  GtkPicture *preview;

  FwFeatureCache *cache;
  FwViewport *viewport;
  FwClip *clip;
  FwParamSet *set;
  FwParams *params;
  GArray *order;                    /* FwPlotKind, display order of the check buttons */
  GtkWidget *checks[FW_N_PLOT_KINDS];

  FwAudio *audio;
  FwMatrix *matrices[FW_N_STAGES];
  guint pending;
  char *load_error;
  GCancellable *cancellable;
  guint preview_idle;
  gboolean updating;
};

G_DEFINE_FINAL_TYPE (FwExportDialog, fw_export_dialog, GTK_TYPE_WINDOW)

static void schedule_preview (FwExportDialog *self);

static gboolean
loaded (FwExportDialog *self)
{
  return self->pending == 0 && self->load_error == NULL;
}

/* ---------------------------------------------------------------- loading */

static void
one_done (FwExportDialog *self)
{
  g_assert (self->pending > 0);
  if (--self->pending == 0)
    {
      gtk_widget_set_sensitive (GTK_WIDGET (self->export_button), self->load_error == NULL);
      schedule_preview (self);
    }
}

typedef struct {
  FwExportDialog *dialog;
  FwStage stage;
} StageRequest;

static void
on_stage_ready (GObject *source, GAsyncResult *result, gpointer user_data)
{
  StageRequest *req = user_data;
  FwExportDialog *self = req->dialog;
  g_autoptr (GError) error = NULL;
  FwMatrix *m = fw_feature_cache_request_finish (FW_FEATURE_CACHE (source), result, &error);

  if (m != NULL)
    self->matrices[req->stage] = m;
  else if (self->load_error == NULL)
    self->load_error = g_strdup (error->message);
  one_done (self);
  g_object_unref (self);
  g_free (req);
}

static void
on_audio_ready (GObject *source, GAsyncResult *result, gpointer user_data)
{
  g_autoptr (FwExportDialog) self = user_data;   /* the reference start_loading took */
  g_autoptr (GError) error = NULL;

  self->audio = fw_clip_load_audio_finish (FW_CLIP (source), result, &error);
  if (self->audio == NULL && self->load_error == NULL)
    self->load_error = g_strdup (error->message);
  one_done (self);
}

/* Every stage a row or the spectrum panel can show, from the window's feature cache (already
 * computed ones return at once), and the decoded audio for the waveform. */
static void
start_loading (FwExportDialog *self)
{
  gboolean wanted[FW_N_STAGES] = { FALSE };

  for (int k = 0; k < FW_N_PLOT_KINDS; k++)
    if (k != FW_PLOT_WAVEFORM)
      wanted[fw_plot_kind_stage ((FwPlotKind) k)] = TRUE;
  wanted[FW_STAGE_DB] = TRUE;

  self->pending = 1;
  for (int s = 0; s < FW_N_STAGES; s++)
    if (wanted[s])
      {
        StageRequest *req = g_new0 (StageRequest, 1);
        req->dialog = g_object_ref (self);
        req->stage = (FwStage) s;
        self->pending++;
        fw_feature_cache_request_async (self->cache, self->clip, self->params, (FwStage) s,
                                        self->cancellable, on_stage_ready, req);
      }

  fw_clip_load_audio_async (self->clip, self->params, self->cancellable, on_audio_ready,
                            g_object_ref (self));
  gtk_label_set_text (self->status_label, _("Computing the features for the figure…"));
}

/* ---------------------------------------------------------------- settings */

static FwExportFormat
chosen_format (FwExportDialog *self)
{
  switch (gtk_drop_down_get_selected (self->format_choice))
    {
    case 1: return FW_EXPORT_PDF;
    case 2: return FW_EXPORT_PNG;
    default: return FW_EXPORT_SVG;
    }
}

static gboolean
read_settings (FwExportDialog *self, FwExportSettings *settings, GError **error)
{
  const char *font = gtk_editable_get_text (GTK_EDITABLE (self->font_entry));

  fw_export_settings_init (settings);
  settings->format = chosen_format (self);
  settings->width_mm = gtk_spin_button_get_value (self->width_spin);
  settings->height_mm = gtk_check_button_get_active (self->auto_height_check)
                          ? 0 : gtk_spin_button_get_value (self->height_spin);
  settings->dpi = gtk_spin_button_get_value (self->dpi_spin);
  if (font != NULL && *font != '\0' && !fw_theme_set_font (&settings->theme, font, error))
    return FALSE;
  return TRUE;
}

static const FwColourScale *
chosen_scale (FwExportDialog *self)
{
  size_t n = 0;
  const FwColourScale *const *scales = fw_colour_scale_list (&n);
  guint i = gtk_drop_down_get_selected (self->scale_choice);

  return i < n ? scales[i] : NULL;
}

/* The figure as the dialog says now, from the loaded data. */
static FwFigure *
build_figure (FwExportDialog *self, GError **error)
{
  g_autoptr (FwFigure) fig = fw_figure_new ();
  const char *title = gtk_editable_get_text (GTK_EDITABLE (self->title_entry));
  double rate = self->audio != NULL ? self->audio->sample_rate : 0;
  double s = 0, e = 0;
  const FwColourScale *scale;
  guint n_rows = 0;

  if (!loaded (self))
    {
      g_set_error (error, G_IO_ERROR, G_IO_ERROR_PENDING, "%s",
                   self->load_error != NULL ? self->load_error
                                            : _("The features are still being computed."));
      return NULL;
    }
  fw_figure_set_source (fig, fw_clip_get_path (self->clip), fw_param_set_get_name (self->set),
                        self->params, rate);
  fw_figure_set_title (fig, title);
  fw_figure_set_letters (fig, gtk_check_button_get_active (self->letters_check));
  fw_figure_set_caption (fig, gtk_check_button_get_active (self->caption_check));

  if (gtk_check_button_get_active (self->range_visible))
    fw_viewport_get_visible (self->viewport, &s, &e);
  else if (gtk_check_button_get_active (self->range_selection))
    fw_viewport_get_selection (self->viewport, &s, &e);
  fw_figure_set_time_range (fig, s, e);

  for (guint i = 0; i < self->order->len; i++)
    {
      FwPlotKind kind = g_array_index (self->order, FwPlotKind, i);

      if (!gtk_check_button_get_active (GTK_CHECK_BUTTON (self->checks[kind])))
        continue;
      if (kind == FW_PLOT_WAVEFORM)
        fw_figure_add_waveform (fig, self->audio);
      else
        fw_figure_add_matrix (fig, fw_plot_kind_stage (kind),
                              self->matrices[fw_plot_kind_stage (kind)], NULL);
      n_rows++;
    }
  if (n_rows == 0)
    {
      g_set_error_literal (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                           _("Choose at least one row for the figure."));
      return NULL;
    }
  scale = chosen_scale (self);
  if (scale != NULL)
    fw_figure_set_colour_scale (fig, scale);
  if (gtk_check_button_get_active (self->spectrum_check))
    {
      FwSpectrumPanelMode mode = FW_SPECTRUM_PANEL_WHOLE;
      double t0 = 0, t1 = 0;

      if (fw_viewport_get_selection (self->viewport, &t0, &t1))
        mode = FW_SPECTRUM_PANEL_RANGE;
      else if (fw_viewport_has_cursor (self->viewport))
        {
          mode = FW_SPECTRUM_PANEL_FRAME;
          t0 = t1 = fw_viewport_get_cursor (self->viewport);
        }
      fw_figure_set_spectrum (fig, FW_STAGE_DB, self->matrices[FW_STAGE_DB], mode, t0, t1);
    }
  return g_steal_pointer (&fig);
}

/* ---------------------------------------------------------------- preview */

static void
update_preview (FwExportDialog *self)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwFigure) fig = NULL;
  FwExportSettings settings;
  g_autoptr (GBytes) png = NULL;
  g_autoptr (GdkTexture) texture = NULL;
  g_autofree char *summary = NULL;

  if (!loaded (self))
    {
      if (self->load_error != NULL)
        {
          g_autofree char *msg = g_strdup_printf (_("Cannot export: %s"), self->load_error);
          gtk_label_set_text (self->status_label, msg);
          gtk_widget_add_css_class (GTK_WIDGET (self->status_label), "error");
        }
      return;
    }
  if (!read_settings (self, &settings, &error) ||
      (fig = build_figure (self, &error)) == NULL ||
      !fw_export_resolve (fig, &settings, &error))
    {
      gtk_label_set_text (self->status_label, error->message);
      gtk_widget_add_css_class (GTK_WIDGET (self->status_label), "error");
      gtk_widget_set_sensitive (GTK_WIDGET (self->export_button), FALSE);
      return;
    }
  gtk_widget_remove_css_class (GTK_WIDGET (self->status_label), "error");
  gtk_widget_set_sensitive (GTK_WIDGET (self->export_button), TRUE);

  if (settings.format == FW_EXPORT_PNG)
    summary = g_strdup_printf (_("%.1f × %.1f mm at %.0f dpi: %d × %d pixels. The parameter "
                                 "text and its hash are embedded in the file."),
                               settings.width_mm, settings.height_mm, settings.dpi,
                               fw_export_pixels (settings.width_mm, settings.dpi),
                               fw_export_pixels (settings.height_mm, settings.dpi));
  else
    summary = g_strdup_printf (_("%.1f × %.1f mm; text and axes as vectors, each heatmap one "
                                 "image at %.0f dpi. The parameter text and its hash are "
                                 "embedded in the file."),
                               settings.width_mm, settings.height_mm, settings.dpi);
  gtk_label_set_text (self->status_label, summary);

  /* The preview is the same figure written as a small PNG. */
  settings.format = FW_EXPORT_PNG;
  settings.dpi = CLAMP (PREVIEW_WIDTH_PX / (settings.width_mm / 25.4), FW_EXPORT_MIN_DPI,
                        FW_EXPORT_MAX_DPI);
  png = fw_export_figure_to_bytes (fig, &settings, &error);
  if (png == NULL)
    {
      gtk_label_set_text (self->status_label, error->message);
      gtk_widget_add_css_class (GTK_WIDGET (self->status_label), "error");
      return;
    }
  texture = gdk_texture_new_from_bytes (png, &error);
  if (texture != NULL)
    gtk_picture_set_paintable (self->preview, GDK_PAINTABLE (texture));
}

static gboolean
preview_idle_cb (gpointer user_data)
{
  FwExportDialog *self = user_data;

  self->preview_idle = 0;
  update_preview (self);
  return G_SOURCE_REMOVE;
}

static void
schedule_preview (FwExportDialog *self)
{
  if (self->preview_idle == 0)
    self->preview_idle = g_timeout_add (120, preview_idle_cb, self);
}

static void
on_setting_changed (FwExportDialog *self)
{
  if (!self->updating)
    schedule_preview (self);
}

static void
on_size_choice (GtkDropDown *dropdown, GParamSpec *pspec, FwExportDialog *self)
{
  guint i = gtk_drop_down_get_selected (dropdown);

  self->updating = TRUE;
  if (i == 0)
    gtk_spin_button_set_value (self->width_spin, FW_FIGURE_WIDTH_SINGLE_MM);
  else if (i == 1)
    gtk_spin_button_set_value (self->width_spin, FW_FIGURE_WIDTH_DOUBLE_MM);
  gtk_widget_set_sensitive (GTK_WIDGET (self->width_spin), i == 2);
  self->updating = FALSE;
  schedule_preview (self);
}

static void
on_auto_height (GtkCheckButton *check, GParamSpec *pspec, FwExportDialog *self)
{
  gtk_widget_set_sensitive (GTK_WIDGET (self->height_spin), !gtk_check_button_get_active (check));
  schedule_preview (self);
}

/* ---------------------------------------------------------------- export */

gboolean
fw_export_dialog_export_to_file (FwExportDialog *self, const char *path, GError **error)
{
  g_autoptr (FwFigure) fig = NULL;
  FwExportSettings settings;
  FwExportFormat by_name;

  g_return_val_if_fail (FW_IS_EXPORT_DIALOG (self), FALSE);

  /* wait for the data (the features come from the cache, usually at once) */
  while (self->pending > 0)
    g_main_context_iteration (NULL, TRUE);
  if (!read_settings (self, &settings, error))
    return FALSE;
  /* a file name with a known extension decides the format */
  if (fw_export_format_from_path (path, &by_name, NULL))
    settings.format = by_name;
  fig = build_figure (self, error);
  if (fig == NULL)
    return FALSE;
  return fw_export_figure (fig, &settings, path, error);
}

G_GNUC_BEGIN_IGNORE_DEPRECATIONS   /* GtkFileChooserNative: the file dialog of GTK 4.8 */

static void
on_save_response (GtkNativeDialog *chooser, int response, FwExportDialog *self)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = g_file_get_path (file);
      const char *ext = fw_export_format_name (chosen_format (self));
      g_autoptr (GError) error = NULL;

      if (!g_str_has_suffix (path, ext))
        {
          char *with_ext = g_strconcat (path, ".", ext, NULL);
          g_free (path);
          path = with_ext;
        }
      if (fw_export_dialog_export_to_file (self, path, &error))
        {
          gtk_window_destroy (GTK_WINDOW (self));
        }
      else
        {
          g_autofree char *msg = g_strdup_printf (_("Could not export %s: %s"), path,
                                                  error->message);
          gtk_label_set_text (self->status_label, msg);
          gtk_widget_add_css_class (GTK_WIDGET (self->status_label), "error");
        }
    }
  g_object_unref (chooser);
}

static void
on_export_clicked (GtkButton *button, FwExportDialog *self)
{
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Export Figure"), GTK_WINDOW (self),
                                 GTK_FILE_CHOOSER_ACTION_SAVE, _("_Export"), _("_Cancel"));
  g_autofree char *base = g_path_get_basename (fw_clip_get_path (self->clip));
  char *dot = strrchr (base, '.');
  g_autofree char *name = NULL;

  if (dot != NULL)
    *dot = '\0';
  name = g_strdup_printf ("%s-%s.%s", base, fw_param_set_get_name (self->set),
                          fw_export_format_name (chosen_format (self)));
  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (chooser), name);
  g_signal_connect (chooser, "response", G_CALLBACK (on_save_response), self);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

G_GNUC_END_IGNORE_DEPRECATIONS

static void
on_cancel_clicked (GtkButton *button, FwExportDialog *self)
{
  gtk_window_destroy (GTK_WINDOW (self));
}

void
fw_export_dialog_set_format (FwExportDialog *self, const char *format)
{
  g_return_if_fail (FW_IS_EXPORT_DIALOG (self));
  gtk_drop_down_set_selected (self->format_choice,
                              g_strcmp0 (format, "pdf") == 0 ? 1
                              : g_strcmp0 (format, "png") == 0 ? 2 : 0);
}

void
fw_export_dialog_set_time_range (FwExportDialog *self, const char *which)
{
  g_return_if_fail (FW_IS_EXPORT_DIALOG (self));
  if (g_strcmp0 (which, "visible") == 0)
    gtk_check_button_set_active (self->range_visible, TRUE);
  else if (g_strcmp0 (which, "selection") == 0)
    gtk_check_button_set_active (self->range_selection, TRUE);
  else
    gtk_check_button_set_active (self->range_whole, TRUE);
}

/* ---------------------------------------------------------------- class */

static void
fw_export_dialog_dispose (GObject *object)
{
  FwExportDialog *self = FW_EXPORT_DIALOG (object);

  if (self->cancellable != NULL)
    g_cancellable_cancel (self->cancellable);
  g_clear_object (&self->cancellable);
  g_clear_handle_id (&self->preview_idle, g_source_remove);
  g_clear_object (&self->cache);
  g_clear_object (&self->viewport);
  g_clear_object (&self->clip);
  g_clear_object (&self->set);
  g_clear_pointer (&self->params, fw_params_unref);
  g_clear_pointer (&self->audio, fw_audio_unref);
  for (int s = 0; s < FW_N_STAGES; s++)
    g_clear_pointer (&self->matrices[s], fw_matrix_unref);
  gtk_widget_dispose_template (GTK_WIDGET (self), FW_TYPE_EXPORT_DIALOG);
  G_OBJECT_CLASS (fw_export_dialog_parent_class)->dispose (object);
}

static void
fw_export_dialog_finalize (GObject *object)
{
  FwExportDialog *self = FW_EXPORT_DIALOG (object);

  g_array_unref (self->order);
  g_free (self->load_error);
  G_OBJECT_CLASS (fw_export_dialog_parent_class)->finalize (object);
}

static void
fw_export_dialog_class_init (FwExportDialogClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = fw_export_dialog_dispose;
  object_class->finalize = fw_export_dialog_finalize;

  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/framewise/Workbench/fw-export-dialog.ui");
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, cancel_button);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, export_button);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, rows_box);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, size_choice);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, width_spin);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, auto_height_check);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, height_spin);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, dpi_spin);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, dpi_note);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, font_entry);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, scale_choice);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, format_choice);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, range_whole);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, range_visible);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, range_selection);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, title_entry);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, letters_check);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, caption_check);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, spectrum_check);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, status_label);
  gtk_widget_class_bind_template_child (widget_class, FwExportDialog, preview);
}

static void
fw_export_dialog_init (FwExportDialog *self)
{
  GtkStringList *names = gtk_string_list_new (NULL);
  size_t n = 0;
  const FwColourScale *const *scales = fw_colour_scale_list (&n);
  const FwColourScale *def = fw_colour_scale_default (FW_COLOUR_SCALE_SEQUENTIAL);
  GtkEventController *keys = gtk_shortcut_controller_new ();

  self->order = g_array_new (FALSE, FALSE, sizeof (FwPlotKind));
  gtk_widget_init_template (GTK_WIDGET (self));

  for (size_t i = 0; i < n; i++)
    gtk_string_list_append (names, fw_colour_scale_get_name (scales[i]));
  gtk_drop_down_set_model (self->scale_choice, G_LIST_MODEL (names));
  g_object_unref (names);
  for (size_t i = 0; i < n; i++)
    if (scales[i] == def)
      gtk_drop_down_set_selected (self->scale_choice, (guint) i);
  gtk_drop_down_set_selected (self->size_choice, 1);
  gtk_widget_set_sensitive (GTK_WIDGET (self->width_spin), FALSE);

  g_signal_connect (self->cancel_button, "clicked", G_CALLBACK (on_cancel_clicked), self);
  g_signal_connect (self->export_button, "clicked", G_CALLBACK (on_export_clicked), self);
  g_signal_connect (self->size_choice, "notify::selected", G_CALLBACK (on_size_choice), self);
  g_signal_connect (self->auto_height_check, "notify::active", G_CALLBACK (on_auto_height), self);
  g_signal_connect_swapped (self->width_spin, "value-changed", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->height_spin, "value-changed", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->dpi_spin, "value-changed", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->font_entry, "changed", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->title_entry, "changed", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->scale_choice, "notify::selected", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->format_choice, "notify::selected", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->range_whole, "toggled", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->range_visible, "toggled", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->range_selection, "toggled", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->letters_check, "toggled", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->caption_check, "toggled", G_CALLBACK (on_setting_changed), self);
  g_signal_connect_swapped (self->spectrum_check, "toggled", G_CALLBACK (on_setting_changed), self);

  gtk_shortcut_controller_add_shortcut (GTK_SHORTCUT_CONTROLLER (keys),
    gtk_shortcut_new (gtk_keyval_trigger_new (GDK_KEY_Escape, 0),
                      gtk_named_action_new ("window.close")));
  gtk_widget_add_controller (GTK_WIDGET (self), keys);
}

GtkWidget *
fw_export_dialog_new (GtkWindow *parent, FwFeatureCache *cache, FwViewport *viewport,
                      FwClip *clip, FwParamSet *set, const FwPlotKind *rows, guint n_rows)
{
  FwExportDialog *self;
  gboolean shown[FW_N_PLOT_KINDS] = { FALSE };
  double s, e;

  g_return_val_if_fail (FW_IS_FEATURE_CACHE (cache), NULL);
  g_return_val_if_fail (FW_IS_CLIP (clip), NULL);
  g_return_val_if_fail (FW_IS_PARAM_SET (set), NULL);

  self = g_object_new (FW_TYPE_EXPORT_DIALOG, "transient-for", parent,
                       "destroy-with-parent", TRUE, NULL);
  self->cache = g_object_ref (cache);
  self->viewport = g_object_ref (viewport);
  self->clip = g_object_ref (clip);
  self->set = g_object_ref (set);
  self->params = fw_params_ref (fw_param_set_get_params (set));
  self->cancellable = g_cancellable_new ();

  /* the window's rows first, in its order and ticked; the others after them */
  for (guint i = 0; i < n_rows; i++)
    {
      g_array_append_val (self->order, rows[i]);
      shown[rows[i]] = TRUE;
    }
  for (int k = 0; k < FW_N_PLOT_KINDS; k++)
    if (!shown[k])
      {
        FwPlotKind kind = (FwPlotKind) k;
        g_array_append_val (self->order, kind);
      }
  for (guint i = 0; i < self->order->len; i++)
    {
      FwPlotKind kind = g_array_index (self->order, FwPlotKind, i);
      GtkWidget *check = gtk_check_button_new_with_label (fw_plot_kind_title (kind));

      gtk_check_button_set_active (GTK_CHECK_BUTTON (check), shown[kind]);
      g_signal_connect_swapped (check, "toggled", G_CALLBACK (on_setting_changed), self);
      gtk_flow_box_append (self->rows_box, check);
      self->checks[kind] = check;
    }

  if (!fw_viewport_get_selection (viewport, &s, &e))
    gtk_widget_set_sensitive (GTK_WIDGET (self->range_selection), FALSE);
  if (fw_viewport_is_fit (viewport))
    gtk_widget_set_sensitive (GTK_WIDGET (self->range_visible), FALSE);

  start_loading (self);
  return GTK_WIDGET (self);
}
