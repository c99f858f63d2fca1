/* fw-compare-dialog.c: choosing the two sides of a new comparison (see fw-compare-dialog.h). */
#include "fw-config.h"

#include "fw-compare-dialog.h"

#include <glib/gi18n.h>

#include "fw-compare-view.h"
#include "fw-feature-file.h"

typedef enum { TIMES_SAME_GRID, TIMES_HOP, TIMES_COLUMN } TimesMode;

struct _FwCompareDialog {
  GtkWindow parent_instance;

  FwProject *project;
  GtkWidget *stage;
  GtkWidget *a_clip, *a_set;
  GtkWidget *b_is_clip, *b_is_file;
  GtkWidget *b_clip, *b_set;
  GtkWidget *file_button, *file_label;
  GtkWidget *axes, *times, *hop, *rate, *origin;
  GtkWidget *file_widgets[10];
  guint n_file_widgets;
  GtkWidget *clip_widgets[4];
  guint n_clip_widgets;
  GtkWidget *error_label;
  char *file_path;
};

G_DEFINE_FINAL_TYPE (FwCompareDialog, fw_compare_dialog, GTK_TYPE_WINDOW)

enum { SIGNAL_COMPARE, N_SIGNALS };
static guint signals[N_SIGNALS];

/* ---------------------------------------------------------------- choosers */

static GtkWidget *
clip_dropdown (FwProject *project, FwClip *preset)
{
  GListModel *clips = fw_project_get_clips (project);
  g_autoptr (GtkStringList) names = gtk_string_list_new (NULL);
  GtkWidget *dropdown;
  guint selected = 0;

  for (guint i = 0; i < g_list_model_get_n_items (clips); i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (clips, i);
      const char *label = fw_clip_get_label (clip);
      g_autofree char *text = label != NULL && *label != '\0'
        ? g_strdup_printf ("%s  (%s)", fw_clip_get_display_name (clip), label)
        : g_strdup (fw_clip_get_display_name (clip));
      gtk_string_list_append (names, text);
      if (clip == preset)
        selected = i;
    }
  dropdown = gtk_drop_down_new (G_LIST_MODEL (g_steal_pointer (&names)), NULL);
  gtk_drop_down_set_enable_search (GTK_DROP_DOWN (dropdown), TRUE);
  gtk_drop_down_set_selected (GTK_DROP_DOWN (dropdown), selected);
  gtk_widget_set_hexpand (dropdown, TRUE);
  return dropdown;
}

static GtkWidget *
set_dropdown (FwProject *project, FwParamSet *preset)
{
  GListModel *sets = fw_project_get_param_sets (project);
  g_autoptr (GtkStringList) names = gtk_string_list_new (NULL);
  GtkWidget *dropdown;
  guint selected = 0;

  for (guint i = 0; i < g_list_model_get_n_items (sets); i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (sets, i);
      gtk_string_list_append (names, fw_param_set_get_name (set));
      if (set == preset)
        selected = i;
    }
  dropdown = gtk_drop_down_new (G_LIST_MODEL (g_steal_pointer (&names)), NULL);
  gtk_drop_down_set_selected (GTK_DROP_DOWN (dropdown), selected);
  gtk_widget_set_hexpand (dropdown, TRUE);
  return dropdown;
}

static FwClip *
selected_clip (FwCompareDialog *self, GtkWidget *dropdown)
{
  guint i = gtk_drop_down_get_selected (GTK_DROP_DOWN (dropdown));
  GListModel *clips = fw_project_get_clips (self->project);
  g_autoptr (FwClip) clip = NULL;

  if (i >= g_list_model_get_n_items (clips))
    return NULL;
  clip = g_list_model_get_item (clips, i);
  return clip;   /* the project holds it */
}

static FwParamSet *
selected_set (FwCompareDialog *self, GtkWidget *dropdown)
{
  guint i = gtk_drop_down_get_selected (GTK_DROP_DOWN (dropdown));
  GListModel *sets = fw_project_get_param_sets (self->project);
  g_autoptr (FwParamSet) set = NULL;

  if (i >= g_list_model_get_n_items (sets))
    return NULL;
  set = g_list_model_get_item (sets, i);
  return set;
}

/* ---------------------------------------------------------------- sensitivity */

static void
update_sensitivity (FwCompareDialog *self)
{
  gboolean file = gtk_check_button_get_active (GTK_CHECK_BUTTON (self->b_is_file));
  gboolean hop = gtk_drop_down_get_selected (GTK_DROP_DOWN (self->times)) == TIMES_HOP;

  for (guint i = 0; i < self->n_clip_widgets; i++)
    gtk_widget_set_sensitive (self->clip_widgets[i], !file);
  for (guint i = 0; i < self->n_file_widgets; i++)
    gtk_widget_set_sensitive (self->file_widgets[i], file);
  gtk_widget_set_sensitive (self->hop, file && hop);
  gtk_widget_set_sensitive (self->rate, file && hop);
  gtk_widget_set_sensitive (self->origin, file && hop);
}

static void
on_toggled (GtkCheckButton *button, FwCompareDialog *self)
{
  update_sensitivity (self);
}

static void
on_times_selected (GtkDropDown *dropdown, GParamSpec *pspec, FwCompareDialog *self)
{
  update_sensitivity (self);
}

void
fw_compare_dialog_set_file (FwCompareDialog *self, const char *path)
{
  g_autofree char *base = NULL;

  g_return_if_fail (FW_IS_COMPARE_DIALOG (self));
  g_free (self->file_path);
  self->file_path = g_strdup (path);
  base = path != NULL ? g_path_get_basename (path) : NULL;
  gtk_label_set_text (GTK_LABEL (self->file_label), base != NULL ? base : _("No file chosen"));
  gtk_widget_set_tooltip_text (self->file_label, path);
  if (path != NULL)
    gtk_check_button_set_active (GTK_CHECK_BUTTON (self->b_is_file), TRUE);
}

G_GNUC_BEGIN_IGNORE_DEPRECATIONS   /* GtkFileChooserNative: the file dialog of GTK 4.8 */

static void
on_file_response (GtkNativeDialog *chooser, int response, FwCompareDialog *self)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = g_file_get_path (file);
      fw_compare_dialog_set_file (self, path);
    }
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
on_file_clicked (GtkButton *button, FwCompareDialog *self)
{
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Choose a Feature File"), GTK_WINDOW (self),
                                 GTK_FILE_CHOOSER_ACTION_OPEN, _("_Choose"), _("_Cancel"));
  GtkFileFilter *filter = gtk_file_filter_new ();
  GtkFileFilter *all = gtk_file_filter_new ();

  gtk_file_filter_set_name (filter, _("Feature arrays (NPY, CSV)"));
  gtk_file_filter_add_pattern (filter, "*.npy");
  gtk_file_filter_add_pattern (filter, "*.csv");
  gtk_file_filter_add_pattern (filter, "*.tsv");
  gtk_file_filter_add_pattern (filter, "*.txt");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (chooser), filter);
  gtk_file_filter_set_name (all, _("All files"));
  gtk_file_filter_add_pattern (all, "*");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (chooser), all);
  g_object_unref (filter);
  g_object_unref (all);
  g_signal_connect (chooser, "response", G_CALLBACK (on_file_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

G_GNUC_END_IGNORE_DEPRECATIONS

/* ---------------------------------------------------------------- result */

static FwStage
selected_stage (FwCompareDialog *self)
{
  return fw_compare_view_stage_at (gtk_drop_down_get_selected (GTK_DROP_DOWN (self->stage)));
}

FwComparison *
fw_compare_dialog_build (FwCompareDialog *self, GError **error)
{
  FwClip *a_clip = selected_clip (self, self->a_clip);
  FwParamSet *a_set = selected_set (self, self->a_set);
  g_autoptr (FwComparison) draft = NULL;
  g_autofree char *name = NULL;
  FwComparison *cmp;
  const char *stage = fw_stage_name (selected_stage (self));
  gboolean file = gtk_check_button_get_active (GTK_CHECK_BUTTON (self->b_is_file));
  g_autofree char *options = NULL;

  g_return_val_if_fail (FW_IS_COMPARE_DIALOG (self), NULL);
  if (a_clip == NULL || a_set == NULL)
    {
      g_set_error (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                   _("A: the project needs a clip and a parameter set to compare."));
      return NULL;
    }
  if (file)
    {
      FwFeatureFileOptions opt;
      guint times = gtk_drop_down_get_selected (GTK_DROP_DOWN (self->times));

      if (self->file_path == NULL)
        {
          g_set_error (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                       _("B: choose the feature file (NPY or CSV) to compare with."));
          return NULL;
        }
      if (!g_file_test (self->file_path, G_FILE_TEST_IS_REGULAR))
        {
          g_set_error (error, G_IO_ERROR, G_IO_ERROR_NOT_FOUND,
                       _("B: the file %s does not exist or is not a regular file."),
                       self->file_path);
          return NULL;
        }
      fw_feature_file_options_init (&opt);
      opt.axes = gtk_drop_down_get_selected (GTK_DROP_DOWN (self->axes)) == 1
                   ? FW_FEATURE_AXES_BINS_FRAMES : FW_FEATURE_AXES_FRAMES_BINS;
      opt.time_column = times == TIMES_COLUMN ? FW_FEATURE_TIME_COLUMN_YES
                                              : FW_FEATURE_TIME_COLUMN_NO;
      if (times == TIMES_HOP)
        {
          opt.hop_length = gtk_spin_button_get_value (GTK_SPIN_BUTTON (self->hop));
          opt.sample_rate = gtk_spin_button_get_value (GTK_SPIN_BUTTON (self->rate));
          opt.time_origin = gtk_spin_button_get_value (GTK_SPIN_BUTTON (self->origin));
          if (!(opt.hop_length > 0))
            {
              g_set_error (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                           _("B, hop: give the file's hop in samples (more than 0)."));
              return NULL;
            }
          if (!(opt.sample_rate > 0))
            {
              g_set_error (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                           _("B, sample rate: give the rate the file was computed at, in Hz "
                             "(more than 0)."));
              return NULL;
            }
        }
      options = fw_feature_file_options_to_string (&opt);
    }
  else
    {
      FwClip *b_clip = selected_clip (self, self->b_clip);
      FwParamSet *b_set = selected_set (self, self->b_set);

      if (b_clip == NULL || b_set == NULL)
        {
          g_set_error (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                       _("B: choose a clip and a parameter set."));
          return NULL;
        }
      if (b_clip == a_clip && b_set == a_set)
        {
          g_set_error (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                       _("B is the same clip with the same parameter set as A: the difference "
                         "would be zero everywhere. Choose another clip or set for B."));
          return NULL;
        }
    }

  for (guint pass = 0; pass < 2; pass++)
    {
      cmp = fw_comparison_new (pass == 0 ? "" : name, stage);
      fw_comparison_set_operand (cmp, 0, FW_OPERAND_CLIP, fw_clip_get_path (a_clip),
                                 fw_param_set_get_name (a_set), "");
      if (file)
        fw_comparison_set_operand (cmp, 1, FW_OPERAND_FILE, self->file_path, "", options);
      else
        fw_comparison_set_operand (cmp, 1, FW_OPERAND_CLIP,
                                   fw_clip_get_path (selected_clip (self, self->b_clip)),
                                   fw_param_set_get_name (selected_set (self, self->b_set)), "");
      if (pass == 0)
        {
          draft = cmp;
          name = fw_compare_view_name_for (draft);
        }
    }
  return cmp;
}

static void
on_compare_clicked (GtkButton *button, FwCompareDialog *self)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwComparison) cmp = fw_compare_dialog_build (self, &error);

  if (cmp == NULL)
    {
      gtk_label_set_text (GTK_LABEL (self->error_label), error->message);
      gtk_widget_set_visible (self->error_label, TRUE);
      return;
    }
  g_signal_emit (self, signals[SIGNAL_COMPARE], 0, cmp);
  gtk_window_destroy (GTK_WINDOW (self));
}

static void
on_cancel_clicked (GtkButton *button, FwCompareDialog *self)
{
  gtk_window_destroy (GTK_WINDOW (self));
}

/* ---------------------------------------------------------------- construction */

static void
attach (GtkGrid *grid, int row, const char *mnemonic, GtkWidget *widget, GtkWidget **label_out)
{
  GtkWidget *label = gtk_label_new_with_mnemonic (mnemonic);

  gtk_label_set_xalign (GTK_LABEL (label), 1);
  gtk_label_set_mnemonic_widget (GTK_LABEL (label), widget);
  gtk_widget_add_css_class (label, "dim-label");
  gtk_grid_attach (grid, label, 0, row, 1, 1);
  gtk_grid_attach (grid, widget, 1, row, 1, 1);
  if (label_out != NULL)
    *label_out = label;
}

static GtkWidget *
heading (const char *text)
{
  GtkWidget *label = gtk_label_new (text);

  gtk_label_set_xalign (GTK_LABEL (label), 0);
  gtk_widget_add_css_class (label, "heading");
  gtk_widget_set_margin_top (label, 8);
  return label;
}

static GtkWidget *
spin_with_unit (GtkWidget *spin, const char *unit)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkWidget *label = gtk_label_new (unit);

  gtk_widget_set_hexpand (spin, TRUE);
  gtk_widget_add_css_class (label, "dim-label");
  gtk_box_append (GTK_BOX (box), spin);
  gtk_box_append (GTK_BOX (box), label);
  return box;
}

FwCompareDialog *
fw_compare_dialog_new (GtkWindow *parent, FwProject *project, FwClip *a_clip,
                       FwParamSet *a_set, FwClip *b_clip, FwParamSet *b_set, FwStage stage)
{
  FwCompareDialog *self;
  GtkWidget *box, *grid, *intro, *buttons, *cancel, *compare, *lbl;
  g_autoptr (GtkStringList) stages = gtk_string_list_new (NULL);
  const char *axes[] = { N_("Rows are frames (frames × bins)"),
                         N_("Rows are bins (bins × frames)"), NULL };
  const char *times[] = { N_("Same grid as A (frame t is A's frame t)"),
                          N_("From hop and sample rate"),
                          N_("From the file's first column (CSV, seconds)"), NULL };
  const char *translated_axes[3], *translated_times[4];
  GtkEventController *keys;
  int row = 0;

  g_return_val_if_fail (FW_IS_PROJECT (project), NULL);
  self = g_object_new (FW_TYPE_COMPARE_DIALOG, NULL);
  self->project = g_object_ref (project);
  gtk_window_set_title (GTK_WINDOW (self), _("Compare Two Sources"));
  gtk_window_set_transient_for (GTK_WINDOW (self), parent);
  gtk_window_set_modal (GTK_WINDOW (self), TRUE);
  gtk_window_set_default_size (GTK_WINDOW (self), 520, -1);

  box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 10);
  gtk_widget_set_margin_top (box, 18);
  gtk_widget_set_margin_bottom (box, 18);
  gtk_widget_set_margin_start (box, 18);
  gtk_widget_set_margin_end (box, 18);
  intro = gtk_label_new (_("Both sides are computed up to the chosen stage and put on one grid; "
                           "the difference is B − A. B can be another clip, another parameter "
                           "set, or a feature file from your own code."));
  gtk_label_set_wrap (GTK_LABEL (intro), TRUE);
  gtk_label_set_max_width_chars (GTK_LABEL (intro), 60);
  gtk_label_set_xalign (GTK_LABEL (intro), 0);
  gtk_widget_add_css_class (intro, "dim-label");
  gtk_box_append (GTK_BOX (box), intro);

  grid = gtk_grid_new ();
  gtk_grid_set_column_spacing (GTK_GRID (grid), 12);
  gtk_grid_set_row_spacing (GTK_GRID (grid), 6);
  gtk_box_append (GTK_BOX (box), grid);

  for (guint i = 0; i < fw_compare_view_n_stages (); i++)
    gtk_string_list_append (stages, fw_compare_view_stage_title (fw_compare_view_stage_at (i)));
  self->stage = gtk_drop_down_new (G_LIST_MODEL (g_steal_pointer (&stages)), NULL);
  for (guint i = 0; i < fw_compare_view_n_stages (); i++)
    if (fw_compare_view_stage_at (i) == stage)
      gtk_drop_down_set_selected (GTK_DROP_DOWN (self->stage), i);
  gtk_widget_set_hexpand (self->stage, TRUE);
  attach (GTK_GRID (grid), row++, _("_Stage"), self->stage, NULL);

  gtk_grid_attach (GTK_GRID (grid), heading (_("A (drawn first)")), 0, row++, 2, 1);
  self->a_clip = clip_dropdown (project, a_clip);
  attach (GTK_GRID (grid), row++, _("C_lip"), self->a_clip, NULL);
  self->a_set = set_dropdown (project, a_set);
  attach (GTK_GRID (grid), row++, _("_Parameter set"), self->a_set, NULL);

  gtk_grid_attach (GTK_GRID (grid), heading (_("B (compared with A)")), 0, row++, 2, 1);
  self->b_is_clip = gtk_check_button_new_with_mnemonic (_("A clip of the _project"));
  self->b_is_file = gtk_check_button_new_with_mnemonic (_("A _feature file (NPY or CSV)"));
  gtk_check_button_set_group (GTK_CHECK_BUTTON (self->b_is_file),
                              GTK_CHECK_BUTTON (self->b_is_clip));
  gtk_check_button_set_active (GTK_CHECK_BUTTON (self->b_is_clip), TRUE);
  {
    GtkWidget *choice = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 12);
    gtk_box_append (GTK_BOX (choice), self->b_is_clip);
    gtk_box_append (GTK_BOX (choice), self->b_is_file);
    gtk_grid_attach (GTK_GRID (grid), choice, 1, row++, 1, 1);
  }
  self->b_clip = clip_dropdown (project, b_clip != NULL ? b_clip : a_clip);
  attach (GTK_GRID (grid), row++, _("Cl_ip"), self->b_clip, &lbl);
  self->clip_widgets[self->n_clip_widgets++] = self->b_clip;
  self->clip_widgets[self->n_clip_widgets++] = lbl;
  self->b_set = set_dropdown (project, b_set != NULL ? b_set : a_set);
  attach (GTK_GRID (grid), row++, _("Parameter s_et"), self->b_set, &lbl);
  self->clip_widgets[self->n_clip_widgets++] = self->b_set;
  self->clip_widgets[self->n_clip_widgets++] = lbl;

  {
    GtkWidget *file_box = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 8);
    self->file_button = gtk_button_new_with_mnemonic (_("C_hoose…"));
    self->file_label = gtk_label_new (_("No file chosen"));
    gtk_label_set_ellipsize (GTK_LABEL (self->file_label), PANGO_ELLIPSIZE_MIDDLE);
    gtk_label_set_xalign (GTK_LABEL (self->file_label), 0);
    gtk_widget_set_hexpand (self->file_label, TRUE);
    gtk_box_append (GTK_BOX (file_box), self->file_button);
    gtk_box_append (GTK_BOX (file_box), self->file_label);
    g_signal_connect (self->file_button, "clicked", G_CALLBACK (on_file_clicked), self);
    attach (GTK_GRID (grid), row++, _("Fi_le"), file_box, &lbl);
    self->file_widgets[self->n_file_widgets++] = file_box;
    self->file_widgets[self->n_file_widgets++] = lbl;
  }
  for (guint i = 0; axes[i] != NULL; i++)
    translated_axes[i] = _(axes[i]);
  translated_axes[2] = NULL;
  self->axes = gtk_drop_down_new_from_strings (translated_axes);
  attach (GTK_GRID (grid), row++, _("_Axis order"), self->axes, &lbl);
  self->file_widgets[self->n_file_widgets++] = self->axes;
  self->file_widgets[self->n_file_widgets++] = lbl;
  for (guint i = 0; times[i] != NULL; i++)
    translated_times[i] = _(times[i]);
  translated_times[3] = NULL;
  self->times = gtk_drop_down_new_from_strings (translated_times);
  g_signal_connect (self->times, "notify::selected", G_CALLBACK (on_times_selected), self);
  attach (GTK_GRID (grid), row++, _("Frame _times"), self->times, &lbl);
  self->file_widgets[self->n_file_widgets++] = self->times;
  self->file_widgets[self->n_file_widgets++] = lbl;

  self->hop = gtk_spin_button_new_with_range (0, 1 << 20, 1);
  gtk_spin_button_set_value (GTK_SPIN_BUTTON (self->hop), 512);
  attach (GTK_GRID (grid), row++, _("H_op"), spin_with_unit (self->hop, _("samples")), &lbl);
  self->file_widgets[self->n_file_widgets++] = lbl;
  self->rate = gtk_spin_button_new_with_range (0, 768000, 1);
  gtk_spin_button_set_value (GTK_SPIN_BUTTON (self->rate), 22050);
  attach (GTK_GRID (grid), row++, _("Sample _rate"), spin_with_unit (self->rate, _("Hz")), &lbl);
  self->file_widgets[self->n_file_widgets++] = lbl;
  self->origin = gtk_spin_button_new_with_range (-3600, 3600, 0.001);
  gtk_spin_button_set_digits (GTK_SPIN_BUTTON (self->origin), 4);
  gtk_spin_button_set_value (GTK_SPIN_BUTTON (self->origin), 0);
  attach (GTK_GRID (grid), row++, _("First frame _centre"), spin_with_unit (self->origin, _("s")),
          &lbl);
  self->file_widgets[self->n_file_widgets++] = lbl;

  self->error_label = gtk_label_new (NULL);
  gtk_label_set_wrap (GTK_LABEL (self->error_label), TRUE);
  gtk_label_set_max_width_chars (GTK_LABEL (self->error_label), 60);
  gtk_label_set_xalign (GTK_LABEL (self->error_label), 0);
  gtk_widget_add_css_class (self->error_label, "error");
  gtk_widget_set_visible (self->error_label, FALSE);
  gtk_box_append (GTK_BOX (box), self->error_label);

  buttons = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  gtk_widget_set_halign (buttons, GTK_ALIGN_END);
  cancel = gtk_button_new_with_mnemonic (_("_Cancel"));
  compare = gtk_button_new_with_mnemonic (_("C_ompare"));
  gtk_widget_add_css_class (compare, "suggested-action");
  gtk_box_append (GTK_BOX (buttons), cancel);
  gtk_box_append (GTK_BOX (buttons), compare);
  gtk_box_append (GTK_BOX (box), buttons);
  g_signal_connect (cancel, "clicked", G_CALLBACK (on_cancel_clicked), self);
  g_signal_connect (compare, "clicked", G_CALLBACK (on_compare_clicked), self);
  g_signal_connect (self->b_is_clip, "toggled", G_CALLBACK (on_toggled), self);
  g_signal_connect (self->b_is_file, "toggled", G_CALLBACK (on_toggled), self);
  gtk_window_set_child (GTK_WINDOW (self), box);
  gtk_window_set_default_widget (GTK_WINDOW (self), compare);

  keys = gtk_shortcut_controller_new ();
  gtk_shortcut_controller_add_shortcut (GTK_SHORTCUT_CONTROLLER (keys),
    gtk_shortcut_new (gtk_keyval_trigger_new (GDK_KEY_Escape, 0),
                      gtk_named_action_new ("window.close")));
  gtk_widget_add_controller (GTK_WIDGET (self), keys);
  update_sensitivity (self);
  return self;
}

static void
fw_compare_dialog_dispose (GObject *object)
{
  FwCompareDialog *self = FW_COMPARE_DIALOG (object);

  g_clear_object (&self->project);
  G_OBJECT_CLASS (fw_compare_dialog_parent_class)->dispose (object);
}

static void
fw_compare_dialog_finalize (GObject *object)
{
  FwCompareDialog *self = FW_COMPARE_DIALOG (object);

  g_free (self->file_path);
  G_OBJECT_CLASS (fw_compare_dialog_parent_class)->finalize (object);
}

static void
fw_compare_dialog_class_init (FwCompareDialogClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->dispose = fw_compare_dialog_dispose;
  object_class->finalize = fw_compare_dialog_finalize;
  signals[SIGNAL_COMPARE] =
    g_signal_new ("compare", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL, NULL,
                  G_TYPE_NONE, 1, FW_TYPE_COMPARISON);
}

static void
fw_compare_dialog_init (FwCompareDialog *self)
{
}
