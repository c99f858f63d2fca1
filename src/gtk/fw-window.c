/* fw-window.c: the workbench window. Actions live in fw-window-actions.c. */
#include "fw-config.h"

#include "fw-window-private.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-compare-dialog.h"
#include "fw-feature.h"
#include "fw-recent.h"

G_DEFINE_FINAL_TYPE (FwWindow, fw_window, GTK_TYPE_APPLICATION_WINDOW)

static const FwPlotKind default_rows[] = {
  FW_PLOT_WAVEFORM, FW_PLOT_SPECTROGRAM, FW_PLOT_MEL, FW_PLOT_MFCC,
};

/* ---------------------------------------------------------------- messages */

static void
show_banner (FwWindow *self, const char *icon, const char *css, const char *message)
{
  gtk_image_set_from_icon_name (self->banner_icon, icon);
  gtk_label_set_text (self->banner_label, message);
  gtk_widget_remove_css_class (self->banner_box, "error");
  gtk_widget_remove_css_class (self->banner_box, "info");
  gtk_widget_add_css_class (self->banner_box, css);
  gtk_widget_set_visible (self->banner_box, TRUE);
}

void
fw_window_show_error (FwWindow *self, const char *message)
{
  g_return_if_fail (FW_IS_WINDOW (self));
  g_message ("%s", message);
  show_banner (self, "dialog-warning-symbolic", "error", message);
}

void
fw_window_show_info (FwWindow *self, const char *message)
{
  g_return_if_fail (FW_IS_WINDOW (self));
  show_banner (self, "dialog-information-symbolic", "info", message);
}

static void
on_banner_close (GtkButton *button, FwWindow *self)
{
  gtk_widget_set_visible (self->banner_box, FALSE);
}

const char *
_fw_window_get_banner_text (FwWindow *self)
{
  if (!gtk_widget_get_visible (self->banner_box))
    return NULL;
  return gtk_label_get_text (self->banner_label);
}

/* ---------------------------------------------------------------- titles */

static gboolean
project_is_demo (FwWindow *self)
{
  g_autofree char *demo = fw_project_demo_path ();
  const char *path = self->project != NULL ? fw_project_get_path (self->project) : NULL;

  return path != NULL && demo != NULL && strcmp (path, demo) == 0;
}

static void
update_title (FwWindow *self)
{
  const char *path = self->project != NULL ? fw_project_get_path (self->project) : NULL;
  const char *title = self->project != NULL ? fw_project_get_title (self->project) : NULL;
  gboolean dirty = self->project != NULL && fw_project_get_dirty (self->project);
  g_autofree char *basename = path != NULL ? g_path_get_basename (path) : NULL;
  g_autofree char *shown = NULL;
  g_autofree char *subtitle = NULL;

  if (title == NULL || *title == '\0')
    title = basename != NULL ? basename : _("Untitled project");
  shown = g_strdup_printf ("%s%s", dirty ? "• " : "", title);
  gtk_label_set_text (self->title_label, shown);
  if (project_is_demo (self))
    subtitle = g_strdup (_("Built-in demo — Save As to keep your changes"));
  else if (path != NULL)
    subtitle = g_strdup (path);
  else
    subtitle = g_strdup (_("Not saved yet"));
  gtk_label_set_text (self->subtitle_label, subtitle);
  gtk_window_set_title (GTK_WINDOW (self), shown);
}

static void
update_view_label (FwWindow *self)
{
  GString *s = g_string_new (NULL);
  double a, b;

  if (fw_viewport_has_cursor (self->viewport))
    g_string_append_printf (s, _("Cursor %.3f s"), fw_viewport_get_cursor (self->viewport));
  if (fw_viewport_get_selection (self->viewport, &a, &b))
    {
      if (s->len > 0)
        g_string_append (s, "  ·  ");
      g_string_append_printf (s, _("Selection %.3f–%.3f s (%.3f s)"), a, b, b - a);
    }
  if (s->len == 0)
    {
      fw_viewport_get_visible (self->viewport, &a, &b);
      g_string_append_printf (s, _("Showing %.3f–%.3f s"), a, b);
    }
  gtk_label_set_text (self->view_label, s->str);
  g_string_free (s, TRUE);
}

static void
on_viewport_changed (FwViewport *viewport, guint what, FwWindow *self)
{
  update_view_label (self);
}

/* ---------------------------------------------------------------- sets list */

static FwParamSet *
row_set (GtkListBoxRow *row)
{
  return row != NULL ? g_object_get_data (G_OBJECT (row), "fw-set") : NULL;
}

static void
rebuild_set_list (FwWindow *self)
{
  GtkWidget *child;
  GListModel *sets;

  self->updating_sets = TRUE;
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->set_list))) != NULL)
    gtk_list_box_remove (self->set_list, child);
  if (self->project == NULL)
    {
      self->updating_sets = FALSE;
      return;
    }
  sets = fw_project_get_param_sets (self->project);
  for (guint i = 0; i < g_list_model_get_n_items (sets); i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (sets, i);
      FwParams *params = fw_param_set_get_params (set);
      GtkWidget *row = gtk_list_box_row_new ();
      GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
      GtkWidget *name = gtk_label_new (fw_param_set_get_name (set));
      g_autofree char *window_length = fw_params_get_value (params, "window_length");
      g_autofree char *hop = fw_params_get_value (params, "hop_length");
      g_autofree char *bands = fw_params_get_value (params, "mel_bands");
      g_autofree char *text = g_strdup_printf (_("window %s · hop %s · %s mel bands"),
                                               window_length, hop, bands);
      GtkWidget *detail = gtk_label_new (text);
      g_autofree char *pinned = NULL;

      gtk_label_set_xalign (GTK_LABEL (name), 0);
      gtk_label_set_ellipsize (GTK_LABEL (name), PANGO_ELLIPSIZE_END);
      gtk_label_set_xalign (GTK_LABEL (detail), 0);
      gtk_label_set_ellipsize (GTK_LABEL (detail), PANGO_ELLIPSIZE_END);
      gtk_widget_add_css_class (detail, "caption");
      gtk_widget_add_css_class (detail, "dim-label");
      gtk_box_append (GTK_BOX (box), name);
      gtk_box_append (GTK_BOX (box), detail);
      gtk_widget_add_css_class (box, "fw-set-row");
      gtk_list_box_row_set_child (GTK_LIST_BOX_ROW (row), box);
      gtk_widget_set_tooltip_text (row, fw_params_get_text (params));
      g_object_set_data_full (G_OBJECT (row), "fw-set", g_object_ref (set), g_object_unref);
      gtk_list_box_append (self->set_list, row);
      if (set == self->set)
        gtk_list_box_select_row (self->set_list, GTK_LIST_BOX_ROW (row));
    }
  self->updating_sets = FALSE;
}

static void
on_set_selected (GtkListBox *list, GtkListBoxRow *row, FwWindow *self)
{
  FwParamSet *set = row_set (row);

  if (self->updating_sets || set == NULL || set == self->set)
    return;
  _fw_window_select (self, self->clip, set);
}

/* ---------------------------------------------------------------- comparisons */

static FwComparison *
row_comparison (GtkListBoxRow *row)
{
  return row != NULL ? g_object_get_data (G_OBJECT (row), "fw-comparison") : NULL;
}

static void
select_comparison_row (FwWindow *self)
{
  FwComparison *shown = _fw_window_compare_shown (self)
                          ? fw_compare_view_get_comparison (self->compare_view) : NULL;

  self->updating_comparisons = TRUE;
  gtk_list_box_unselect_all (self->comparison_list);
  for (GtkWidget *child = gtk_widget_get_first_child (GTK_WIDGET (self->comparison_list));
       child != NULL; child = gtk_widget_get_next_sibling (child))
    if (shown != NULL && row_comparison (GTK_LIST_BOX_ROW (child)) == shown)
      gtk_list_box_select_row (self->comparison_list, GTK_LIST_BOX_ROW (child));
  self->updating_comparisons = FALSE;
}

static void
rebuild_comparison_list (FwWindow *self)
{
  GtkWidget *child;
  GListModel *cmps;
  guint n;

  self->updating_comparisons = TRUE;
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->comparison_list))) != NULL)
    gtk_list_box_remove (self->comparison_list, child);
  self->updating_comparisons = FALSE;
  if (self->project == NULL)
    return;
  cmps = fw_project_get_comparisons (self->project);
  n = g_list_model_get_n_items (cmps);
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwComparison) cmp = g_list_model_get_item (cmps, i);
      GtkWidget *row = gtk_list_box_row_new ();
      GtkWidget *hbox = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 4);
      GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
      GtkWidget *name = gtk_label_new (fw_comparison_get_name (cmp));
      GtkWidget *remove = gtk_button_new_from_icon_name ("user-trash-symbolic");
      FwStage stage = FW_STAGE_DB;
      const char *stage_title;
      GtkWidget *detail;
      g_autofree char *tip = NULL;

      if (fw_stage_from_name (fw_comparison_get_stage (cmp), &stage))
        stage_title = fw_compare_view_stage_title (stage);
      else
        stage_title = fw_comparison_get_stage (cmp);
      detail = gtk_label_new (stage_title);
      gtk_label_set_xalign (GTK_LABEL (name), 0);
      gtk_label_set_ellipsize (GTK_LABEL (name), PANGO_ELLIPSIZE_END);
      gtk_label_set_xalign (GTK_LABEL (detail), 0);
      gtk_label_set_ellipsize (GTK_LABEL (detail), PANGO_ELLIPSIZE_END);
      gtk_widget_add_css_class (detail, "caption");
      gtk_widget_add_css_class (detail, "dim-label");
      gtk_widget_set_hexpand (box, TRUE);
      gtk_box_append (GTK_BOX (box), name);
      gtk_box_append (GTK_BOX (box), detail);
      gtk_widget_add_css_class (remove, "flat");
      gtk_widget_set_valign (remove, GTK_ALIGN_CENTER);
      tip = g_strdup_printf (_("Remove the comparison “%s” from the project"),
                             fw_comparison_get_name (cmp));
      gtk_widget_set_tooltip_text (remove, tip);
      gtk_accessible_update_property (GTK_ACCESSIBLE (remove), GTK_ACCESSIBLE_PROPERTY_LABEL,
                                      tip, -1);
      gtk_actionable_set_action_name (GTK_ACTIONABLE (remove), "win.remove-comparison");
      gtk_actionable_set_action_target (GTK_ACTIONABLE (remove), "u", i);
      gtk_box_append (GTK_BOX (hbox), box);
      gtk_box_append (GTK_BOX (hbox), remove);
      gtk_widget_add_css_class (hbox, "fw-set-row");
      gtk_list_box_row_set_child (GTK_LIST_BOX_ROW (row), hbox);
      gtk_widget_set_tooltip_text (row, fw_comparison_get_name (cmp));
      g_object_set_data_full (G_OBJECT (row), "fw-comparison", g_object_ref (cmp),
                              g_object_unref);
      gtk_list_box_append (self->comparison_list, row);
    }
  if (n == 0)
    {
      GtkWidget *row = gtk_list_box_row_new ();
      GtkWidget *hint = gtk_label_new (_("None yet: use “Compare With…” in a clip's or set's "
                                         "menu, or the + button."));
      gtk_label_set_wrap (GTK_LABEL (hint), TRUE);
      gtk_label_set_xalign (GTK_LABEL (hint), 0);
      gtk_widget_add_css_class (hint, "dim-label");
      gtk_widget_add_css_class (hint, "caption");
      gtk_list_box_row_set_child (GTK_LIST_BOX_ROW (row), hint);
      gtk_list_box_row_set_activatable (GTK_LIST_BOX_ROW (row), FALSE);
      gtk_list_box_row_set_selectable (GTK_LIST_BOX_ROW (row), FALSE);
      gtk_list_box_append (self->comparison_list, row);
    }
  select_comparison_row (self);
}

static void
on_comparison_activated (GtkListBox *list, GtkListBoxRow *row, FwWindow *self)
{
  FwComparison *cmp = row_comparison (row);

  if (!self->updating_comparisons && cmp != NULL)
    _fw_window_open_comparison (self, cmp);
}

gboolean
_fw_window_compare_shown (FwWindow *self)
{
  return g_strcmp0 (gtk_stack_get_visible_child_name (self->main_stack), "compare") == 0;
}

static void
update_duration (FwWindow *self)
{
  double duration = _fw_window_compare_shown (self)
                      ? fw_compare_view_get_duration (self->compare_view)
                      : fw_plot_stack_get_duration (self->plot_stack);

  if (duration > 0 && duration != fw_viewport_get_duration (self->viewport))
    fw_viewport_set_duration (self->viewport, duration);
}

void
_fw_window_open_comparison (FwWindow *self, FwComparison *cmp)
{
  g_return_if_fail (FW_IS_COMPARISON (cmp));
  fw_compare_view_set_comparison (self->compare_view, cmp);
  gtk_stack_set_visible_child_name (self->main_stack, "compare");
  update_duration (self);
  fw_viewport_fit (self->viewport);
  select_comparison_row (self);
  _fw_window_update_action_states (self);
}

void
_fw_window_start_comparison (FwWindow *self, FwComparison *cmp)
{
  g_return_if_fail (FW_IS_COMPARISON (cmp));
  fw_project_add_comparison (self->project, cmp);
  _fw_window_open_comparison (self, cmp);
}

void
_fw_window_close_compare (FwWindow *self)
{
  if (!_fw_window_compare_shown (self))
    return;
  fw_compare_view_cancel (self->compare_view);
  gtk_stack_set_visible_child_name (self->main_stack, "plots");
  update_duration (self);
  select_comparison_row (self);
  _fw_window_update_action_states (self);
}

static void
on_compare_state_changed (FwCompareView *view, FwWindow *self)
{
  if (_fw_window_compare_shown (self))
    update_duration (self);
}

static void
on_compare_set_added (FwCompareView *view, FwParamSet *set, FwWindow *self)
{
  /* the plots behind the compare view show the new set, ready for "Plots" */
  _fw_window_select (self, self->clip, set);
}

static void
on_dialog_compare (FwCompareDialog *dialog, FwComparison *cmp, FwWindow *self)
{
  _fw_window_start_comparison (self, cmp);
}

void
_fw_window_ask_comparison (FwWindow *self, FwClip *a_clip, FwParamSet *a_set, FwClip *b_clip,
                           FwParamSet *b_set)
{
  FwCompareDialog *dialog;
  FwStage stage = _fw_window_compare_shown (self)
                    ? fw_compare_view_get_stage (self->compare_view) : FW_STAGE_DB;

  if (self->project == NULL)
    return;
  dialog = fw_compare_dialog_new (GTK_WINDOW (self), self->project, a_clip, a_set, b_clip,
                                  b_set, stage);
  g_signal_connect_object (dialog, "compare", G_CALLBACK (on_dialog_compare), self, 0);
  gtk_window_present (GTK_WINDOW (dialog));
}

/* "CLIP@SET" or a feature file path. */
static gboolean
parse_side (FwWindow *self, const char *spec, const char *side, FwOperandKind *kind,
            char **clip_path, char **set_name, GError **error)
{
  const char *at = strrchr (spec, '@');

  if (at == NULL)
    {
      if (!g_file_test (spec, G_FILE_TEST_IS_REGULAR))
        {
          g_set_error (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                       _("Side %s “%s”: give CLIP@SET (a clip and a parameter set of the "
                         "project) or an existing feature file (.npy, .csv)"), side, spec);
          return FALSE;
        }
      *kind = FW_OPERAND_FILE;
      *clip_path = g_canonicalize_filename (spec, NULL);
      *set_name = g_strdup ("");
      return TRUE;
    }
  {
    g_autofree char *clip_part = g_strndup (spec, (gsize) (at - spec));
    FwClip *clip = fw_project_find_clip (self->project, clip_part);
    FwParamSet *set = fw_project_find_param_set (self->project, at + 1);

    if (clip == NULL)
      {
        g_set_error (error, G_IO_ERROR, G_IO_ERROR_NOT_FOUND,
                     _("Side %s: the project has no clip “%s”"), side, clip_part);
        return FALSE;
      }
    if (set == NULL)
      {
        g_set_error (error, G_IO_ERROR, G_IO_ERROR_NOT_FOUND,
                     _("Side %s: the project has no parameter set “%s”"), side, at + 1);
        return FALSE;
      }
    *kind = FW_OPERAND_CLIP;
    *clip_path = g_strdup (fw_clip_get_path (clip));
    *set_name = g_strdup (fw_param_set_get_name (set));
  }
  return TRUE;
}

gboolean
fw_window_compare (FwWindow *self, const char *a, const char *b, const char *stage,
                   GError **error)
{
  FwOperandKind kind[2];
  g_autofree char *clip_a = NULL, *clip_b = NULL, *set_a = NULL, *set_b = NULL;
  char **clip[2] = { &clip_a, &clip_b };
  char **set[2] = { &set_a, &set_b };
  const char *specs[2] = { a, b };
  FwStage parsed = FW_STAGE_DB;
  g_autoptr (FwComparison) draft = NULL;
  g_autoptr (FwComparison) cmp = NULL;
  g_autofree char *name = NULL;

  g_return_val_if_fail (FW_IS_WINDOW (self), FALSE);
  g_return_val_if_fail (a != NULL && b != NULL, FALSE);
  if (self->project == NULL)
    return FALSE;
  if (stage != NULL && !fw_feature_parse_stage (stage, &parsed, error))
    return FALSE;
  for (guint s = 0; s < 2; s++)
    if (!parse_side (self, specs[s], s == 0 ? "A" : "B", &kind[s], clip[s], set[s], error))
      return FALSE;
  for (guint pass = 0; pass < 2; pass++)
    {
      FwComparison *c = fw_comparison_new (pass == 0 ? "" : name, fw_stage_name (parsed));
      for (guint s = 0; s < 2; s++)
        fw_comparison_set_operand (c, s, kind[s], *clip[s], *set[s], "");
      if (pass == 0)
        {
          draft = c;
          name = fw_compare_view_name_for (draft);
        }
      else
        cmp = c;
    }
  _fw_window_start_comparison (self, cmp);
  return TRUE;
}

gboolean
fw_window_open_comparison_by_name (FwWindow *self, const char *name, GError **error)
{
  GListModel *cmps;
  guint n;
  char *end = NULL;
  guint64 number;

  g_return_val_if_fail (FW_IS_WINDOW (self), FALSE);
  if (self->project == NULL)
    return FALSE;
  cmps = fw_project_get_comparisons (self->project);
  n = g_list_model_get_n_items (cmps);
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwComparison) cmp = g_list_model_get_item (cmps, i);
      if (g_strcmp0 (fw_comparison_get_name (cmp), name) == 0)
        {
          _fw_window_open_comparison (self, cmp);
          return TRUE;
        }
    }
  number = g_ascii_strtoull (name, &end, 10);
  if (end != name && *end == '\0' && number >= 1 && number <= n)
    {
      g_autoptr (FwComparison) cmp = g_list_model_get_item (cmps, (guint) number - 1);
      _fw_window_open_comparison (self, cmp);
      return TRUE;
    }
  g_set_error (error, G_IO_ERROR, G_IO_ERROR_NOT_FOUND,
               g_dngettext (GETTEXT_PACKAGE,
                            "The project has no comparison “%s” (it has %u saved comparison)",
                            "The project has no comparison “%s” (it has %u saved comparisons)",
                            n),
               name, n);
  return FALSE;
}

/* ---------------------------------------------------------------- selection */

static void
update_columns (FwWindow *self)
{
  g_autofree char *title0 = NULL;
  g_autofree char *title1 = NULL;
  FwClip *clip1 = NULL;
  FwParamSet *set1 = NULL;

  if (self->pinned_clip != NULL || self->pinned_set != NULL)
    {
      clip1 = self->pinned_clip != NULL ? self->pinned_clip : self->clip;
      set1 = self->pinned_set != NULL ? self->pinned_set : self->set;
    }
  fw_plot_stack_set_column (self->plot_stack, 0, self->clip, self->set);
  fw_plot_stack_set_column (self->plot_stack, 1, clip1, set1);

  if (self->clip != NULL && self->set != NULL)
    title0 = g_strdup_printf ("%s · %s", fw_clip_get_display_name (self->clip),
                              fw_param_set_get_name (self->set));
  fw_plot_stack_set_column_title (self->plot_stack, 0, title0);
  if (clip1 != NULL && set1 != NULL)
    {
      title1 = g_strdup_printf (_("%s · %s (pinned)"), fw_clip_get_display_name (clip1),
                                fw_param_set_get_name (set1));
      fw_plot_stack_set_column_title (self->plot_stack, 1, title1);
    }

  fw_spectrum_panel_set_source (self->spectrum_panel, self->clip, self->set);
  fw_params_editor_set_param_set (self->params_editor, self->set);
  fw_params_editor_set_clip (self->params_editor, self->clip);
  _fw_window_update_action_states (self);
}

void
_fw_window_select (FwWindow *self, FwClip *clip, FwParamSet *set)
{
  gboolean clip_changed = clip != self->clip;

  g_set_object (&self->clip, clip);
  g_set_object (&self->set, set);
  if (clip_changed)
    {
      fw_viewport_clear_selection (self->viewport);
      fw_viewport_set_cursor (self->viewport, -1);
    }
  if (fw_clip_list_get_selected (self->clip_list) != clip)
    fw_clip_list_select (self->clip_list, clip);
  for (GtkWidget *child = gtk_widget_get_first_child (GTK_WIDGET (self->set_list));
       child != NULL; child = gtk_widget_get_next_sibling (child))
    if (row_set (GTK_LIST_BOX_ROW (child)) == set)
      {
        self->updating_sets = TRUE;
        gtk_list_box_select_row (self->set_list, GTK_LIST_BOX_ROW (child));
        self->updating_sets = FALSE;
      }
  update_columns (self);
}

void
_fw_window_pin (FwWindow *self, FwClip *clip, FwParamSet *set)
{
  g_set_object (&self->pinned_clip, clip);
  g_set_object (&self->pinned_set, set);
  update_columns (self);
}

static void
on_clip_selected (FwClipList *list, GParamSpec *pspec, FwWindow *self)
{
  FwClip *clip = fw_clip_list_get_selected (list);

  if (clip != NULL && clip != self->clip)
    _fw_window_select (self, clip, self->set);
}

static void
on_unpin (FwPlotStack *stack, FwWindow *self)
{
  _fw_window_pin (self, NULL, NULL);
}

FwClip *
_fw_window_find_clip (FwWindow *self, const char *path)
{
  GListModel *clips;

  if (self->project == NULL)
    return NULL;
  clips = fw_project_get_clips (self->project);
  for (guint i = 0; i < g_list_model_get_n_items (clips); i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (clips, i);
      if (g_strcmp0 (fw_clip_get_path (clip), path) == 0)
        return clip;   /* the project keeps it alive */
    }
  return NULL;
}

/* A relinked or rewritten file: the rows showing it compute again. */
static void
reload_if_files_changed (FwWindow *self)
{
  FwClip *clip1 = self->pinned_clip != NULL ? self->pinned_clip : self->clip;
  g_autofree char *id0 = self->clip != NULL ? fw_clip_dup_identity (self->clip) : NULL;
  g_autofree char *id1 = clip1 != NULL ? fw_clip_dup_identity (clip1) : NULL;
  gboolean changed = FALSE;

  /* the same clip objects as before, but their files changed (relinked, rewritten, gone) */
  if (self->clip != NULL && self->identity_clip[0] == self->clip &&
      g_strcmp0 (id0, self->clip_identity[0]) != 0)
    changed = TRUE;
  if (clip1 != NULL && self->identity_clip[1] == clip1 &&
      g_strcmp0 (id1, self->clip_identity[1]) != 0)
    changed = TRUE;
  g_free (self->clip_identity[0]);
  g_free (self->clip_identity[1]);
  self->clip_identity[0] = g_steal_pointer (&id0);
  self->clip_identity[1] = g_steal_pointer (&id1);
  self->identity_clip[0] = self->clip;
  self->identity_clip[1] = clip1;
  if (changed)
    {
      /* the rows follow their clips' path and "missing" themselves; a file rewritten in
       * place (same path, new contents) needs this */
      fw_plot_stack_reload (self->plot_stack);
    }
}

/* Keeps the selection valid after the document changed (clip or set removed). */
static void
on_project_changed (FwProject *project, FwWindow *self)
{
  GListModel *clips = fw_project_get_clips (project);
  GListModel *sets = fw_project_get_param_sets (project);
  FwClip *clip = self->clip;
  FwParamSet *set = self->set;
  guint pos;

  if (clip != NULL && !g_list_store_find (G_LIST_STORE (clips), clip, &pos))
    clip = NULL;
  if (clip == NULL && g_list_model_get_n_items (clips) > 0)
    {
      g_autoptr (FwClip) first = g_list_model_get_item (clips, 0);
      clip = first;
    }
  if (set != NULL && !g_list_store_find (G_LIST_STORE (sets), set, &pos))
    set = NULL;
  if (set == NULL && g_list_model_get_n_items (sets) > 0)
    {
      g_autoptr (FwParamSet) first = g_list_model_get_item (sets, 0);
      set = first;
    }
  if (self->pinned_clip != NULL &&
      !g_list_store_find (G_LIST_STORE (clips), self->pinned_clip, &pos))
    g_clear_object (&self->pinned_clip);
  if (self->pinned_set != NULL &&
      !g_list_store_find (G_LIST_STORE (sets), self->pinned_set, &pos))
    g_clear_object (&self->pinned_set);

  rebuild_set_list (self);
  rebuild_comparison_list (self);
  if (_fw_window_compare_shown (self))
    {
      FwComparison *shown = fw_compare_view_get_comparison (self->compare_view);
      if (shown == NULL ||
          !g_list_store_find (G_LIST_STORE (fw_project_get_comparisons (project)), shown, &pos))
        _fw_window_close_compare (self);
    }
  if (clip != self->clip || set != self->set)
    _fw_window_select (self, clip, set);
  else
    update_columns (self);
  reload_if_files_changed (self);
  update_title (self);
}

static void
on_project_dirty (FwProject *project, GParamSpec *pspec, FwWindow *self)
{
  update_title (self);
  _fw_window_update_action_states (self);
}

static void on_cache_progress (FwFeatureCache *cache, guint pending, double fraction,
                               FwWindow *self);

/* The project's feature cache serves every row, the spectrum panel and the exporter; the
 * project drops entries of removed clips and sets from it. */
static void
set_cache (FwWindow *self, FwFeatureCache *cache)
{
  if (cache == self->cache)
    return;
  if (self->cache != NULL)
    g_clear_signal_handler (&self->cache_progress_id, self->cache);
  g_set_object (&self->cache, cache);
  if (cache != NULL)
    self->cache_progress_id = g_signal_connect (cache, "progress",
                                                G_CALLBACK (on_cache_progress), self);
  fw_plot_stack_set_context (self->plot_stack, cache, self->viewport);
  fw_spectrum_panel_set_context (self->spectrum_panel, cache, self->viewport);
}

FwCompareView *_fw_window_get_compare_view (FwWindow *self) { return self->compare_view; }

void
fw_window_set_project (FwWindow *self, FwProject *project)
{
  GListModel *clips, *sets;
  g_autoptr (FwClip) first_clip = NULL;
  g_autoptr (FwParamSet) first_set = NULL;

  g_return_if_fail (FW_IS_WINDOW (self));
  g_return_if_fail (FW_IS_PROJECT (project));

  if (self->project != NULL)
    {
      g_clear_signal_handler (&self->project_changed_id, self->project);
      g_clear_signal_handler (&self->project_dirty_id, self->project);
    }
  /* Work for the old document is of no use any more. */
  fw_plot_stack_cancel (self->plot_stack);
  gtk_stack_set_visible_child_name (self->main_stack, "plots");
  fw_compare_view_set_context (self->compare_view, project, self->viewport);
  fw_plot_stack_set_column (self->plot_stack, 1, NULL, NULL);
  fw_plot_stack_set_column (self->plot_stack, 0, NULL, NULL);
  fw_spectrum_panel_set_source (self->spectrum_panel, NULL, NULL);
  g_set_object (&self->project, project);
  set_cache (self, fw_project_get_feature_cache (project));
  self->project_changed_id = g_signal_connect (project, "changed",
                                               G_CALLBACK (on_project_changed), self);
  self->project_dirty_id = g_signal_connect (project, "notify::dirty",
                                             G_CALLBACK (on_project_dirty), self);
  g_clear_object (&self->pinned_clip);
  g_clear_object (&self->pinned_set);
  g_clear_object (&self->clip);
  g_clear_object (&self->set);

  clips = fw_project_get_clips (project);
  sets = fw_project_get_param_sets (project);
  if (g_list_model_get_n_items (clips) > 0)
    first_clip = g_list_model_get_item (clips, 0);
  if (g_list_model_get_n_items (sets) > 0)
    first_set = g_list_model_get_item (sets, 0);

  fw_clip_list_set_project (self->clip_list, project);
  self->set = first_set != NULL ? g_object_ref (first_set) : NULL;
  rebuild_set_list (self);
  rebuild_comparison_list (self);
  fw_viewport_clear_selection (self->viewport);
  fw_viewport_set_cursor (self->viewport, -1);
  _fw_window_select (self, first_clip, first_set);
  fw_viewport_fit (self->viewport);
  update_title (self);
  gtk_widget_set_visible (self->banner_box, FALSE);
}

FwProject *
fw_window_get_project (FwWindow *self)
{
  g_return_val_if_fail (FW_IS_WINDOW (self), NULL);
  return self->project;
}

/* ---------------------------------------------------------------- opening */

gboolean
fw_window_file_is_project (GFile *file)
{
  g_autofree char *path = g_file_get_path (file);
  char buf[512];
  FILE *fp;
  size_t n;
  gboolean text = TRUE;
  const char *p;

  if (path == NULL || (fp = fopen (path, "rb")) == NULL)
    return FALSE;
  n = fread (buf, 1, sizeof buf - 1, fp);
  fclose (fp);
  buf[n] = '\0';
  for (size_t i = 0; i < n; i++)
    if (buf[i] == '\0')
      text = FALSE;
  if (!text)
    return FALSE;
  /* A text key file: its first line that is not blank or a comment opens a [group]. */
  p = buf;
  while (*p != '\0')
    {
      while (*p == ' ' || *p == '\t' || *p == '\r' || *p == '\n')
        p++;
      if (*p == '#')
        {
          while (*p != '\0' && *p != '\n')
            p++;
          continue;
        }
      return *p == '[';
    }
  return FALSE;
}

gboolean
fw_window_open_project (FwWindow *self, const char *path)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwProject) project = NULL;

  g_return_val_if_fail (FW_IS_WINDOW (self), FALSE);

  project = fw_project_load (path, &error);
  if (project == NULL)
    {
      g_autofree char *msg = g_strdup_printf (_("Could not open the project %s: %s"), path,
                                              error->message);
      fw_window_show_error (self, msg);
      return FALSE;
    }
  fw_window_set_project (self, project);
  fw_recent_add (path);
  _fw_window_rebuild_recent_menu (self);
  return TRUE;
}

void
fw_window_open_demo (FwWindow *self)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwProject) project = NULL;

  g_return_if_fail (FW_IS_WINDOW (self));

  project = fw_project_load_demo (&error);
  if (project == NULL)
    {
      g_autofree char *msg = g_strdup_printf (_("Could not open the built-in demo project: %s"),
                                              error->message);
      g_autoptr (FwProject) empty = fw_project_new ();
      fw_window_set_project (self, empty);
      fw_window_show_error (self, msg);
      return;
    }
  fw_window_set_project (self, project);
}

/* Adding clips: every file is read in a worker thread first (a long file takes a moment to
 * scan for its peak and RMS), then the readable ones join the project and the others are
 * reported by name and cause. */
typedef struct {
  GPtrArray *paths;      /* char*: files to check */
  GPtrArray *ok;         /* char*: readable audio */
  GString *problems;
  GPtrArray *infos;      /* FwAudioInfo*, parallel to ok: the facts just read */
} AddJob;

static void
add_job_free (AddJob *job)
{
  g_ptr_array_unref (job->paths);
  g_ptr_array_unref (job->ok);
  g_ptr_array_unref (job->infos);
  g_string_free (job->problems, TRUE);
  g_free (job);
}

static void
info_free (FwAudioInfo *info)
{
  fw_audio_info_clear (info);
  g_free (info);
}

static void
add_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  AddJob *job = task_data;

  for (guint i = 0; i < job->paths->len; i++)
    {
      const char *path = g_ptr_array_index (job->paths, i);
      FwAudioInfo *info = g_new0 (FwAudioInfo, 1);
      g_autoptr (GError) error = NULL;

      if (fw_audio_read_info (path, info, &error))
        {
          g_ptr_array_add (job->ok, g_strdup (path));
          g_ptr_array_add (job->infos, info);
        }
      else
        {
          g_string_append_printf (job->problems, "%s%s", job->problems->len > 0 ? "; " : "",
                                  error->message);
          g_free (info);
        }
    }
  g_task_return_boolean (task, TRUE);
}

static void
on_clips_checked (GObject *source, GAsyncResult *result, gpointer user_data)
{
  FwWindow *self = FW_WINDOW (source);
  AddJob *job = g_task_get_task_data (G_TASK (result));
  FwClip *last = NULL;

  self->adding_clips--;
  if (self->project == NULL || g_task_get_task_data (G_TASK (result)) == NULL)
    return;
  for (guint i = 0; i < job->ok->len; i++)
    {
      const char *path = g_ptr_array_index (job->ok, i);
      g_autoptr (FwClip) clip = NULL;

      if (_fw_window_find_clip (self, path) != NULL)
        {
          if (job->problems->len > 0)
            g_string_append (job->problems, "; ");
          g_string_append_printf (job->problems, _("%s: already in the project"), path);
          continue;
        }
      clip = fw_clip_new (path);
      fw_project_add_clip (self->project, clip);
      last = clip;
    }
  if (last != NULL)
    _fw_window_select (self, last, self->set);
  if (job->problems->len > 0)
    {
      g_autofree char *msg = NULL;
      msg = g_strdup_printf (_("Some files were not added: %s"), job->problems->str);
      fw_window_show_error (self, msg);
    }
  g_signal_emit_by_name (self->plot_stack, "state-changed");
}

void
fw_window_add_clip_files (FwWindow *self, GFile **files, guint n_files)
{
  AddJob *job;
  g_autoptr (GTask) task = NULL;

  g_return_if_fail (FW_IS_WINDOW (self));
  if (self->project == NULL)
    {
      g_autoptr (FwProject) project = fw_project_new ();
      fw_window_set_project (self, project);
    }
  job = g_new0 (AddJob, 1);
  job->paths = g_ptr_array_new_with_free_func (g_free);
  job->ok = g_ptr_array_new_with_free_func (g_free);
  job->infos = g_ptr_array_new_with_free_func ((GDestroyNotify) info_free);
  job->problems = g_string_new (NULL);
  for (guint i = 0; i < n_files; i++)
    {
      char *path = g_file_get_path (files[i]);
      if (path == NULL)
        {
          g_autofree char *uri = g_file_get_uri (files[i]);
          if (job->problems->len > 0)
            g_string_append (job->problems, "; ");
          g_string_append_printf (job->problems, _("%s: not a local file"), uri);
        }
      else
        g_ptr_array_add (job->paths, path);
    }
  self->adding_clips++;
  task = g_task_new (self, NULL, on_clips_checked, NULL);
  g_task_set_source_tag (task, fw_window_add_clip_files);
  g_task_set_task_data (task, job, (GDestroyNotify) add_job_free);
  g_task_run_in_thread (task, add_thread);
}

void
fw_window_new_project_with_clips (FwWindow *self, GFile **files, guint n_files)
{
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwParamSet) set = fw_param_set_new ("default", fw_params_new_default ());

  g_return_if_fail (FW_IS_WINDOW (self));
  fw_project_add_param_set (project, set, NULL);
  fw_window_set_project (self, project);
  fw_window_add_clip_files (self, files, n_files);
}

gboolean
fw_window_save (FwWindow *self, const char *path)
{
  g_autoptr (GError) error = NULL;
  const char *target;

  g_return_val_if_fail (FW_IS_WINDOW (self), FALSE);
  target = path != NULL ? path : fw_project_get_path (self->project);
  g_return_val_if_fail (target != NULL, FALSE);

  if (!fw_project_save (self->project, target, &error))
    {
      g_autofree char *msg = g_strdup_printf (_("Could not save the project to %s: %s. "
                                                "Nothing was lost: the window still holds "
                                                "every change."), target, error->message);
      fw_window_show_error (self, msg);
      return FALSE;
    }
  fw_recent_add (target);
  _fw_window_rebuild_recent_menu (self);
  update_title (self);
  return TRUE;
}

static void
on_files_dropped (FwClipList *list, GdkFileList *files, FwWindow *self)
{
  GSList *l = gdk_file_list_get_files (files);
  g_autoptr (GPtrArray) array = g_ptr_array_new ();

  for (GSList *i = l; i != NULL; i = i->next)
    g_ptr_array_add (array, i->data);
  fw_window_add_clip_files (self, (GFile **) array->pdata, array->len);
  g_slist_free (l);
}

static gboolean
on_window_drop (GtkDropTarget *target, const GValue *value, double x, double y,
                FwWindow *self)
{
  GSList *l;
  g_autoptr (GPtrArray) clips = g_ptr_array_new ();

  if (!G_VALUE_HOLDS (value, GDK_TYPE_FILE_LIST))
    return FALSE;
  l = gdk_file_list_get_files (g_value_get_boxed (value));
  for (GSList *i = l; i != NULL; i = i->next)
    {
      if (fw_window_file_is_project (i->data))
        {
          /* A dropped project opens in its own window; nothing here is replaced. */
          FwWindow *win = fw_window_new (FW_APPLICATION (gtk_window_get_application (GTK_WINDOW (self))));
          g_autofree char *path = g_file_get_path (i->data);
          fw_window_open_project (win, path);
          gtk_window_present (GTK_WINDOW (win));
        }
      else
        g_ptr_array_add (clips, i->data);
    }
  if (clips->len > 0)
    fw_window_add_clip_files (self, (GFile **) clips->pdata, clips->len);
  g_slist_free (l);
  return TRUE;
}

/* ---------------------------------------------------------------- rows */

void
_fw_window_set_rows (FwWindow *self, const FwPlotKind *kinds, guint n, gboolean remember)
{
  g_array_set_size (self->rows, 0);
  g_array_append_vals (self->rows, kinds, n);
  fw_plot_stack_set_rows (self->plot_stack, kinds, n);
  _fw_window_rebuild_rows_popover (self);
  if (remember)
    {
      g_autoptr (GPtrArray) ids = g_ptr_array_new ();
      for (guint i = 0; i < n; i++)
        g_ptr_array_add (ids, (gpointer) fw_plot_kind_id (kinds[i]));
      g_ptr_array_add (ids, NULL);
      fw_recent_set_rows ((const char *const *) ids->pdata);
    }
}

static gboolean
row_shown (FwWindow *self, FwPlotKind kind, guint *index)
{
  for (guint i = 0; i < self->rows->len; i++)
    if (g_array_index (self->rows, FwPlotKind, i) == kind)
      {
        if (index != NULL)
          *index = i;
        return TRUE;
      }
  return FALSE;
}

static void
on_row_toggled (GtkCheckButton *check, FwWindow *self)
{
  FwPlotKind kind = GPOINTER_TO_INT (g_object_get_data (G_OBJECT (check), "fw-kind"));
  g_autoptr (GArray) rows = g_array_copy (self->rows);
  guint index;

  if (gtk_check_button_get_active (check) && !row_shown (self, kind, NULL))
    g_array_append_val (rows, kind);
  else if (!gtk_check_button_get_active (check) && row_shown (self, kind, &index))
    g_array_remove_index (rows, index);
  else
    return;
  _fw_window_set_rows (self, (FwPlotKind *) rows->data, rows->len, TRUE);
}

static void
move_row (FwWindow *self, FwPlotKind kind, int delta)
{
  g_autoptr (GArray) rows = g_array_copy (self->rows);
  guint index;
  FwPlotKind tmp;
  int other;

  if (!row_shown (self, kind, &index))
    return;
  other = (int) index + delta;
  if (other < 0 || other >= (int) rows->len)
    return;
  tmp = g_array_index (rows, FwPlotKind, other);
  g_array_index (rows, FwPlotKind, other) = kind;
  g_array_index (rows, FwPlotKind, index) = tmp;
  _fw_window_set_rows (self, (FwPlotKind *) rows->data, rows->len, TRUE);
}

static void
on_row_up (GtkButton *button, FwWindow *self)
{
  move_row (self, GPOINTER_TO_INT (g_object_get_data (G_OBJECT (button), "fw-kind")), -1);
}

static void
on_row_down (GtkButton *button, FwWindow *self)
{
  move_row (self, GPOINTER_TO_INT (g_object_get_data (G_OBJECT (button), "fw-kind")), +1);
}

static void
append_row_line (FwWindow *self, FwPlotKind kind, gboolean shown, guint index)
{
  GtkWidget *line = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 4);
  GtkWidget *check = gtk_check_button_new_with_label (fw_plot_kind_title (kind));
  GtkWidget *up = gtk_button_new_from_icon_name ("go-up-symbolic");
  GtkWidget *down = gtk_button_new_from_icon_name ("go-down-symbolic");
  g_autofree char *up_tip = g_strdup_printf (_("Move “%s” up"), fw_plot_kind_title (kind));
  g_autofree char *down_tip = g_strdup_printf (_("Move “%s” down"), fw_plot_kind_title (kind));

  gtk_check_button_set_active (GTK_CHECK_BUTTON (check), shown);
  gtk_widget_set_hexpand (check, TRUE);
  g_object_set_data (G_OBJECT (check), "fw-kind", GINT_TO_POINTER (kind));
  g_object_set_data (G_OBJECT (up), "fw-kind", GINT_TO_POINTER (kind));
  g_object_set_data (G_OBJECT (down), "fw-kind", GINT_TO_POINTER (kind));
  g_signal_connect (check, "toggled", G_CALLBACK (on_row_toggled), self);
  g_signal_connect (up, "clicked", G_CALLBACK (on_row_up), self);
  g_signal_connect (down, "clicked", G_CALLBACK (on_row_down), self);
  gtk_widget_set_sensitive (up, shown && index > 0);
  gtk_widget_set_sensitive (down, shown && index + 1 < self->rows->len);
  gtk_widget_set_tooltip_text (up, up_tip);
  gtk_widget_set_tooltip_text (down, down_tip);
  gtk_accessible_update_property (GTK_ACCESSIBLE (up), GTK_ACCESSIBLE_PROPERTY_LABEL, up_tip, -1);
  gtk_accessible_update_property (GTK_ACCESSIBLE (down), GTK_ACCESSIBLE_PROPERTY_LABEL, down_tip, -1);
  gtk_widget_add_css_class (up, "flat");
  gtk_widget_add_css_class (down, "flat");
  gtk_box_append (GTK_BOX (line), check);
  gtk_box_append (GTK_BOX (line), up);
  gtk_box_append (GTK_BOX (line), down);
  gtk_box_append (self->rows_box, line);
}

void
_fw_window_rebuild_rows_popover (FwWindow *self)
{
  GtkWidget *child;
  GtkWidget *heading;

  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->rows_box))) != NULL)
    gtk_box_remove (self->rows_box, child);
  heading = gtk_label_new (_("Rows shown, top to bottom"));
  gtk_label_set_xalign (GTK_LABEL (heading), 0);
  gtk_widget_add_css_class (heading, "heading");
  gtk_box_append (self->rows_box, heading);
  for (guint i = 0; i < self->rows->len; i++)
    append_row_line (self, g_array_index (self->rows, FwPlotKind, i), TRUE, i);
  for (int k = 0; k < FW_N_PLOT_KINDS; k++)
    if (!row_shown (self, (FwPlotKind) k, NULL))
      append_row_line (self, (FwPlotKind) k, FALSE, 0);
}

/* ---------------------------------------------------------------- progress, readout */

static void
on_cache_progress (FwFeatureCache *cache, guint pending, double fraction, FwWindow *self)
{
  gboolean busy = pending > 0;   /* drawing a new picture is quick: no progress for it */

  gtk_widget_set_visible (self->progress_box, busy);
  if (busy)
    {
      g_autofree char *text = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                                            "Computing %u feature…",
                                                            "Computing %u features…",
                                                            MAX (pending, 1)),
                                               MAX (pending, 1));
      gtk_label_set_text (self->progress_label, text);
      gtk_progress_bar_set_fraction (self->progress_bar, CLAMP (fraction, 0, 1));
    }
}

static void
on_stack_state_changed (FwPlotStack *stack, FwWindow *self)
{
  if (!_fw_window_compare_shown (self))
    update_duration (self);
  if (self->cache != NULL)
    on_cache_progress (self->cache, fw_feature_cache_get_pending (self->cache), 0, self);
}

static void
on_stack_readout (FwPlotStack *stack, const char *text, FwWindow *self)
{
  gtk_label_set_text (self->readout_label, text != NULL ? text : self->default_readout);
}

/* ---------------------------------------------------------------- text prompt */

typedef struct {
  FwWindow *window;
  GtkWidget *dialog;
  GtkWidget *entry;
  void (*done) (FwWindow *self, const char *text, gpointer data);
  gpointer data;
  GDestroyNotify destroy;
} AskText;

static void
ask_text_free (AskText *ask)
{
  if (ask->destroy != NULL)
    ask->destroy (ask->data);
  g_free (ask);
}

static void
on_ask_accept (GtkWidget *widget, AskText *ask)
{
  const char *text = gtk_editable_get_text (GTK_EDITABLE (ask->entry));

  ask->done (ask->window, text, ask->data);
  gtk_window_destroy (GTK_WINDOW (ask->dialog));
}

static void
on_ask_cancel (GtkWidget *widget, AskText *ask)
{
  gtk_window_destroy (GTK_WINDOW (ask->dialog));
}

void
_fw_window_ask_text (FwWindow *self, const char *title, const char *prompt, const char *initial,
                     const char *accept_label,
                     void (*done) (FwWindow *self, const char *text, gpointer data),
                     gpointer data, GDestroyNotify destroy)
{
  AskText *ask = g_new0 (AskText, 1);
  GtkWidget *dialog = gtk_window_new ();
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 12);
  GtkWidget *label = gtk_label_new (prompt);
  GtkWidget *entry = gtk_entry_new ();
  GtkWidget *buttons = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkWidget *cancel = gtk_button_new_with_mnemonic (_("_Cancel"));
  GtkWidget *accept = gtk_button_new_with_mnemonic (accept_label);
  GtkEventController *keys = gtk_shortcut_controller_new ();

  ask->window = self;
  ask->dialog = dialog;
  ask->entry = entry;
  ask->done = done;
  ask->data = data;
  ask->destroy = destroy;
  g_object_set_data_full (G_OBJECT (dialog), "fw-ask", ask, (GDestroyNotify) ask_text_free);

  gtk_window_set_title (GTK_WINDOW (dialog), title);
  gtk_window_set_transient_for (GTK_WINDOW (dialog), GTK_WINDOW (self));
  gtk_window_set_modal (GTK_WINDOW (dialog), TRUE);
  gtk_window_set_resizable (GTK_WINDOW (dialog), FALSE);
  gtk_window_set_default_size (GTK_WINDOW (dialog), 360, -1);
  gtk_widget_set_margin_top (box, 18);
  gtk_widget_set_margin_bottom (box, 18);
  gtk_widget_set_margin_start (box, 18);
  gtk_widget_set_margin_end (box, 18);
  gtk_label_set_xalign (GTK_LABEL (label), 0);
  gtk_label_set_wrap (GTK_LABEL (label), TRUE);
  gtk_label_set_mnemonic_widget (GTK_LABEL (label), entry);
  gtk_editable_set_text (GTK_EDITABLE (entry), initial != NULL ? initial : "");
  gtk_widget_set_halign (buttons, GTK_ALIGN_END);
  gtk_widget_add_css_class (accept, "suggested-action");
  gtk_box_append (GTK_BOX (buttons), cancel);
  gtk_box_append (GTK_BOX (buttons), accept);
  gtk_box_append (GTK_BOX (box), label);
  gtk_box_append (GTK_BOX (box), entry);
  gtk_box_append (GTK_BOX (box), buttons);
  gtk_window_set_child (GTK_WINDOW (dialog), box);

  g_signal_connect (entry, "activate", G_CALLBACK (on_ask_accept), ask);
  g_signal_connect (accept, "clicked", G_CALLBACK (on_ask_accept), ask);
  g_signal_connect (cancel, "clicked", G_CALLBACK (on_ask_cancel), ask);
  gtk_shortcut_controller_add_shortcut (GTK_SHORTCUT_CONTROLLER (keys),
    gtk_shortcut_new (gtk_keyval_trigger_new (GDK_KEY_Escape, 0),
                      gtk_named_action_new ("window.close")));
  gtk_widget_add_controller (dialog, keys);
  gtk_window_present (GTK_WINDOW (dialog));
  gtk_widget_grab_focus (entry);
}

/* ---------------------------------------------------------------- closing */

static void
on_close_response (GtkDialog *dialog, int response, FwWindow *self)
{
  gtk_window_destroy (GTK_WINDOW (dialog));
  if (response == GTK_RESPONSE_REJECT)        /* discard */
    {
      fw_window_close_discarding (self);
    }
  else if (response == GTK_RESPONSE_ACCEPT)   /* save */
    {
      if (fw_project_get_path (self->project) != NULL && !project_is_demo (self))
        {
          if (fw_window_save (self, NULL))
            fw_window_close_discarding (self);
        }
      else
        {
          g_object_set_data (G_OBJECT (self), "fw-close-after-save", GINT_TO_POINTER (1));
          gtk_widget_activate_action (GTK_WIDGET (self), "win.save-as", NULL);
        }
    }
}

static gboolean
fw_window_close_request (GtkWindow *window)
{
  FwWindow *self = FW_WINDOW (window);
  GtkWidget *dialog;
  const char *title;

  if (self->close_confirmed || self->project == NULL || !fw_project_get_dirty (self->project))
    {
      fw_plot_stack_cancel (self->plot_stack);
      return GTK_WINDOW_CLASS (fw_window_parent_class)->close_request (window);
    }

  title = gtk_label_get_text (self->title_label);
  G_GNUC_BEGIN_IGNORE_DEPRECATIONS
  dialog = gtk_message_dialog_new (window, GTK_DIALOG_MODAL | GTK_DIALOG_DESTROY_WITH_PARENT,
                                   GTK_MESSAGE_QUESTION, GTK_BUTTONS_NONE,
                                   _("Save changes to “%s” before closing?"),
                                   g_str_has_prefix (title, "• ") ? title + strlen ("• ") : title);
  gtk_message_dialog_format_secondary_text (GTK_MESSAGE_DIALOG (dialog),
    _("Clips, labels or parameter sets changed since the project was last saved. "
      "Closing without saving loses those changes."));
  gtk_dialog_add_buttons (GTK_DIALOG (dialog),
                          _("_Cancel"), GTK_RESPONSE_CANCEL,
                          _("_Discard Changes"), GTK_RESPONSE_REJECT,
                          _("_Save"), GTK_RESPONSE_ACCEPT,
                          NULL);
  gtk_dialog_set_default_response (GTK_DIALOG (dialog), GTK_RESPONSE_ACCEPT);
  {
    GtkWidget *discard = gtk_dialog_get_widget_for_response (GTK_DIALOG (dialog),
                                                             GTK_RESPONSE_REJECT);
    gtk_widget_add_css_class (discard, "destructive-action");
  }
  G_GNUC_END_IGNORE_DEPRECATIONS
  g_signal_connect (dialog, "response", G_CALLBACK (on_close_response), self);
  gtk_window_present (GTK_WINDOW (dialog));
  return TRUE;
}

void
fw_window_close_discarding (FwWindow *self)
{
  g_return_if_fail (FW_IS_WINDOW (self));
  self->close_confirmed = TRUE;
  gtk_window_close (GTK_WINDOW (self));
}

/* ---------------------------------------------------------------- screenshots */

gboolean
fw_window_is_settled (FwWindow *self)
{
  g_return_val_if_fail (FW_IS_WINDOW (self), FALSE);
  return self->adding_clips == 0 &&
         (self->cache == NULL || fw_feature_cache_get_pending (self->cache) == 0) &&
         !fw_plot_stack_is_busy (self->plot_stack) &&
         !fw_spectrum_panel_is_busy (self->spectrum_panel) &&
         !fw_params_editor_is_busy (self->params_editor) &&
         !fw_compare_view_is_busy (self->compare_view);
}

GdkTexture *
fw_window_render_texture (FwWindow *self)
{
  GtkWidget *widget = GTK_WIDGET (self);
  int width = gtk_widget_get_width (widget);
  int height = gtk_widget_get_height (widget);
  g_autoptr (GdkPaintable) paintable = NULL;
  GtkSnapshot *snapshot;
  g_autoptr (GskRenderNode) node = NULL;
  GskRenderer *renderer;
  graphene_rect_t bounds;

  g_return_val_if_fail (FW_IS_WINDOW (self), NULL);
  if (width <= 0 || height <= 0 || gtk_native_get_renderer (GTK_NATIVE (self)) == NULL)
    return NULL;
  /* The paintable covers the window's bounds, which include the frame margin around the
   * window proper; draw it at its own size and cut out the window itself, unscaled. */
  paintable = gtk_widget_paintable_new (widget);
  if (!gtk_widget_compute_bounds (widget, widget, &bounds))
    return NULL;
  snapshot = gtk_snapshot_new ();
  gdk_paintable_snapshot (paintable, GDK_SNAPSHOT (snapshot),
                          gdk_paintable_get_intrinsic_width (paintable),
                          gdk_paintable_get_intrinsic_height (paintable));
  node = gtk_snapshot_free_to_node (snapshot);
  if (node == NULL)
    return NULL;
  renderer = gtk_native_get_renderer (GTK_NATIVE (self));
  return gsk_renderer_render_texture (renderer, node,
                                      &GRAPHENE_RECT_INIT (-bounds.origin.x, -bounds.origin.y,
                                                           width, height));
}

typedef struct {
  char *path;
  int want_width, want_height;   /* the size asked for (default size), to reach exactly */
  guint resize_attempts;
  guint polls_since_resize;
  int last_width, last_height;
  gboolean size_done;
  guint poll_id;
  guint frames_after_settled;
  gulong paint_id;
  gint64 started;
} ShotTask;

static void
shot_task_free (ShotTask *st)
{
  g_free (st->path);
  g_free (st);
}

static void shot_write (GTask *task);

static void
on_after_paint (GdkFrameClock *clock, GTask *task)
{
  ShotTask *st = g_task_get_task_data (task);
  FwWindow *self = g_task_get_source_object (task);

  if (!fw_window_is_settled (self) || (st->want_width > 0 && !st->size_done))
    {
      st->frames_after_settled = 0;
      return;
    }
  /* Two painted frames after everything settled: the textures of the last results are
   * on screen. */
  if (++st->frames_after_settled < 2)
    {
      gtk_widget_queue_draw (GTK_WIDGET (self));
      return;
    }
  g_clear_signal_handler (&st->paint_id, clock);
  shot_write (task);
}

static gboolean
shot_poll (gpointer user_data)
{
  GTask *task = user_data;
  ShotTask *st = g_task_get_task_data (task);
  FwWindow *self = g_task_get_source_object (task);

  if (g_get_monotonic_time () - st->started > 300 * G_USEC_PER_SEC)
    {
      st->poll_id = 0;
      if (st->paint_id != 0)
        g_clear_signal_handler (&st->paint_id, gtk_widget_get_frame_clock (GTK_WIDGET (self)));
      g_task_return_new_error (task, G_IO_ERROR, G_IO_ERROR_TIMED_OUT,
                               _("Gave up waiting for the plots after 300 s"));
      g_object_unref (task);
      return G_SOURCE_REMOVE;
    }
  /* The default size counts the window frame; adjust until the window itself has the size
   * asked for (the screen may be too small: then say so and take what there is). A new
   * request goes out when the last one was answered or after half a second. */
  if (gtk_widget_get_mapped (GTK_WIDGET (self)) && st->want_width > 0 && !st->size_done)
    {
      int w = gtk_widget_get_width (GTK_WIDGET (self));
      int h = gtk_widget_get_height (GTK_WIDGET (self));
      int dw, dh;

      if (w <= 0 || h <= 0)
        return G_SOURCE_CONTINUE;
      if (w == st->want_width && h == st->want_height)
        {
          st->size_done = TRUE;
        }
      else if (st->resize_attempts >= 5)
        {
          g_printerr (_("framewise: the window is %d×%d pixels, not %d×%d: the screen may be "
                        "too small (with xvfb-run, add -s \"-screen 0 1920x1200x24\")\n"),
                      w, h, st->want_width, st->want_height);
          st->size_done = TRUE;
        }
      else
        {
          if (w != st->last_width || h != st->last_height || ++st->polls_since_resize >= 10)
            {
              gtk_window_get_default_size (GTK_WINDOW (self), &dw, &dh);
              gtk_window_set_default_size (GTK_WINDOW (self), dw + st->want_width - w,
                                           dh + st->want_height - h);
              st->resize_attempts++;
              st->polls_since_resize = 0;
              st->last_width = w;
              st->last_height = h;
            }
          return G_SOURCE_CONTINUE;
        }
    }
  if (st->paint_id == 0 && gtk_widget_get_mapped (GTK_WIDGET (self)))
    {
      GdkFrameClock *clock = gtk_widget_get_frame_clock (GTK_WIDGET (self));
      if (clock != NULL)
        st->paint_id = g_signal_connect (clock, "after-paint", G_CALLBACK (on_after_paint), task);
    }
  if (fw_window_is_settled (self))
    gtk_widget_queue_draw (GTK_WIDGET (self));
  return G_SOURCE_CONTINUE;
}

static gboolean
shot_write_idle (gpointer user_data)
{
  GTask *task = user_data;
  ShotTask *st = g_task_get_task_data (task);
  FwWindow *self = g_task_get_source_object (task);
  g_autoptr (GdkTexture) texture = fw_window_render_texture (self);

  if (texture == NULL)
    g_task_return_new_error (task, G_IO_ERROR, G_IO_ERROR_FAILED,
                             _("Could not render the window (it has no size yet)"));
  else if (!gdk_texture_save_to_png (texture, st->path))
    g_task_return_new_error (task, G_IO_ERROR, G_IO_ERROR_FAILED,
                             _("Could not write the screenshot %s"), st->path);
  else
    g_task_return_boolean (task, TRUE);
  g_object_unref (task);
  return G_SOURCE_REMOVE;
}

static void
shot_write (GTask *task)
{
  ShotTask *st = g_task_get_task_data (task);

  g_clear_handle_id (&st->poll_id, g_source_remove);
  g_idle_add (shot_write_idle, task);
}

void
fw_window_screenshot_async (FwWindow *self, const char *png_path, int width, int height,
                            GCancellable *cancellable, GAsyncReadyCallback callback,
                            gpointer user_data)
{
  GTask *task;
  ShotTask *st = g_new0 (ShotTask, 1);

  g_return_if_fail (FW_IS_WINDOW (self));
  task = g_task_new (self, cancellable, callback, user_data);
  g_task_set_source_tag (task, fw_window_screenshot_async);
  st->path = g_strdup (png_path);
  st->want_width = width;
  st->want_height = height;
  st->started = g_get_monotonic_time ();
  g_task_set_task_data (task, st, (GDestroyNotify) shot_task_free);
  st->poll_id = g_timeout_add (50, shot_poll, task);
}

gboolean
fw_window_screenshot_finish (FwWindow *self, GAsyncResult *result, GError **error)
{
  g_return_val_if_fail (g_task_is_valid (result, self), FALSE);
  return g_task_propagate_boolean (G_TASK (result), error);
}

/* ---------------------------------------------------------------- accessors */

FwPlotStack *_fw_window_get_plot_stack (FwWindow *self) { return self->plot_stack; }
FwParamsEditor *_fw_window_get_params_editor (FwWindow *self) { return self->params_editor; }
FwSpectrumPanel *_fw_window_get_spectrum_panel (FwWindow *self) { return self->spectrum_panel; }
FwViewport *_fw_window_get_viewport (FwWindow *self) { return self->viewport; }
FwFeatureCache *_fw_window_get_cache (FwWindow *self) { return self->cache; }
FwClip *_fw_window_get_clip (FwWindow *self) { return self->clip; }
FwParamSet *_fw_window_get_param_set (FwWindow *self) { return self->set; }

/* ---------------------------------------------------------------- class */

static void
fw_window_dispose (GObject *object)
{
  FwWindow *self = FW_WINDOW (object);

  if (self->project != NULL)
    {
      g_clear_signal_handler (&self->project_changed_id, self->project);
      g_clear_signal_handler (&self->project_dirty_id, self->project);
    }
  if (self->cache != NULL)
    g_clear_signal_handler (&self->cache_progress_id, self->cache);
  if (self->viewport != NULL)
    g_signal_handlers_disconnect_by_data (self->viewport, self);
  gtk_widget_dispose_template (GTK_WIDGET (self), FW_TYPE_WINDOW);
  g_clear_object (&self->clip);
  g_clear_object (&self->set);
  g_clear_object (&self->pinned_clip);
  g_clear_object (&self->pinned_set);
  g_clear_object (&self->project);
  g_clear_object (&self->cache);
  g_clear_object (&self->viewport);
  G_OBJECT_CLASS (fw_window_parent_class)->dispose (object);
}

static void
fw_window_finalize (GObject *object)
{
  FwWindow *self = FW_WINDOW (object);

  g_array_unref (self->rows);
  g_free (self->default_readout);
  g_free (self->clip_identity[0]);
  g_free (self->clip_identity[1]);
  G_OBJECT_CLASS (fw_window_parent_class)->finalize (object);
}

static void
fw_window_class_init (FwWindowClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);
  GtkWindowClass *window_class = GTK_WINDOW_CLASS (klass);

  object_class->dispose = fw_window_dispose;
  object_class->finalize = fw_window_finalize;
  window_class->close_request = fw_window_close_request;

  g_type_ensure (FW_TYPE_CLIP_LIST);
  g_type_ensure (FW_TYPE_PLOT_STACK);
  g_type_ensure (FW_TYPE_SPECTRUM_PANEL);
  g_type_ensure (FW_TYPE_PARAMS_EDITOR);
  g_type_ensure (FW_TYPE_COMPARE_VIEW);

  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/framewise/Workbench/fw-window.ui");
  gtk_widget_class_bind_template_child (widget_class, FwWindow, title_label);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, subtitle_label);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, banner_box);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, banner_icon);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, banner_label);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, banner_close);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, outer_paned);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, sidebar);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, clip_list);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, set_list);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, comparison_list);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, main_stack);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, compare_view);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, rows_button);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, rows_popover);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, rows_box);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, view_label);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, plot_stack);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, spectrum_panel);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, params_editor);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, readout_label);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, progress_box);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, progress_label);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, progress_bar);
  gtk_widget_class_bind_template_child (widget_class, FwWindow, recent_section);
}

static void
fw_window_init (FwWindow *self)
{
  g_auto (GStrv) saved_rows = NULL;
  g_autoptr (GArray) rows = g_array_new (FALSE, FALSE, sizeof (FwPlotKind));
  GtkDropTarget *drop;

  self->rows = g_array_new (FALSE, FALSE, sizeof (FwPlotKind));
  gtk_widget_init_template (GTK_WIDGET (self));

  self->default_readout = g_strdup (gtk_label_get_text (self->readout_label));
  self->viewport = fw_viewport_new ();
  fw_plot_stack_set_context (self->plot_stack, NULL, self->viewport);
  fw_spectrum_panel_set_context (self->spectrum_panel, NULL, self->viewport);
  fw_compare_view_set_context (self->compare_view, NULL, self->viewport);

  g_signal_connect (self->comparison_list, "row-activated", G_CALLBACK (on_comparison_activated),
                    self);
  g_signal_connect (self->compare_view, "state-changed", G_CALLBACK (on_compare_state_changed),
                    self);
  g_signal_connect (self->compare_view, "set-added", G_CALLBACK (on_compare_set_added), self);
  g_signal_connect (self->banner_close, "clicked", G_CALLBACK (on_banner_close), self);
  g_signal_connect (self->clip_list, "notify::selected-clip", G_CALLBACK (on_clip_selected), self);
  g_signal_connect (self->clip_list, "files-dropped", G_CALLBACK (on_files_dropped), self);
  g_signal_connect (self->set_list, "row-selected", G_CALLBACK (on_set_selected), self);
  g_signal_connect (self->plot_stack, "state-changed", G_CALLBACK (on_stack_state_changed), self);
  g_signal_connect (self->plot_stack, "readout", G_CALLBACK (on_stack_readout), self);
  g_signal_connect (self->plot_stack, "unpin", G_CALLBACK (on_unpin), self);
  g_signal_connect (self->viewport, "changed", G_CALLBACK (on_viewport_changed), self);

  drop = gtk_drop_target_new (GDK_TYPE_FILE_LIST, GDK_ACTION_COPY);
  g_signal_connect (drop, "drop", G_CALLBACK (on_window_drop), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (drop));

  _fw_window_install_actions (self);

  saved_rows = fw_recent_get_rows ();
  for (guint i = 0; saved_rows != NULL && saved_rows[i] != NULL; i++)
    {
      FwPlotKind kind;
      if (fw_plot_kind_from_id (saved_rows[i], &kind))
        g_array_append_val (rows, kind);
    }
  if (rows->len == 0)
    g_array_append_vals (rows, default_rows, G_N_ELEMENTS (default_rows));
  _fw_window_set_rows (self, (FwPlotKind *) rows->data, rows->len, FALSE);
  _fw_window_rebuild_recent_menu (self);
  update_view_label (self);
  update_title (self);
}

FwWindow *
fw_window_new (FwApplication *app)
{
  return g_object_new (FW_TYPE_WINDOW, "application", app, NULL);
}
