/* fw-window-actions.c: the window's actions (win.*): files, sets, clips, view. */
#include "fw-config.h"

#include "fw-window-private.h"

#include <math.h>

#include <glib/gi18n.h>

#include "fw-export-dialog.h"
#include "fw-recent.h"

#define ZOOM_STEP 1.5
#define PAN_FRACTION 0.2

/* ---------------------------------------------------------------- file choosers */

G_GNUC_BEGIN_IGNORE_DEPRECATIONS   /* GtkFileChooserNative: the file dialog of GTK 4.8 */

static void
add_filter (GtkFileChooser *chooser, const char *name, const char *const *patterns,
            const char *const *mime_types)
{
  GtkFileFilter *filter = gtk_file_filter_new ();

  gtk_file_filter_set_name (filter, name);
  for (guint i = 0; patterns != NULL && patterns[i] != NULL; i++)
    gtk_file_filter_add_pattern (filter, patterns[i]);
  for (guint i = 0; mime_types != NULL && mime_types[i] != NULL; i++)
    gtk_file_filter_add_mime_type (filter, mime_types[i]);
  gtk_file_chooser_add_filter (chooser, filter);
  g_object_unref (filter);
}

static void
on_open_response (GtkNativeDialog *dialog, int response, FwWindow *self)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (dialog));
      g_autofree char *path = g_file_get_path (file);

      /* Opening never throws away unsaved work: a changed project stays in this window and
       * the other one opens in a new window. */
      if (self->project != NULL && fw_project_get_dirty (self->project))
        {
          FwWindow *win = fw_window_new (FW_APPLICATION (gtk_window_get_application (GTK_WINDOW (self))));
          fw_window_open_project (win, path);
          gtk_window_present (GTK_WINDOW (win));
        }
      else
        fw_window_open_project (self, path);
    }
  g_object_unref (dialog);
}

static void
action_open (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  GtkFileChooserNative *dialog =
    gtk_file_chooser_native_new (_("Open Project"), GTK_WINDOW (self),
                                 GTK_FILE_CHOOSER_ACTION_OPEN, _("_Open"), _("_Cancel"));
  const char *patterns[] = { "*.fwproj", NULL };
  const char *all[] = { "*", NULL };

  add_filter (GTK_FILE_CHOOSER (dialog), _("Framewise projects"), patterns, NULL);
  add_filter (GTK_FILE_CHOOSER (dialog), _("All files"), all, NULL);
  g_signal_connect (dialog, "response", G_CALLBACK (on_open_response), self);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (dialog));
}

static void
on_save_as_response (GtkNativeDialog *dialog, int response, FwWindow *self)
{
  gboolean close_after = g_object_get_data (G_OBJECT (self), "fw-close-after-save") != NULL;

  g_object_set_data (G_OBJECT (self), "fw-close-after-save", NULL);
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (dialog));
      g_autofree char *path = g_file_get_path (file);

      if (!g_str_has_suffix (path, ".fwproj"))
        {
          char *with_ext = g_strconcat (path, ".fwproj", NULL);
          g_free (path);
          path = with_ext;
        }
      if (fw_window_save (self, path) && close_after)
        fw_window_close_discarding (self);
    }
  g_object_unref (dialog);
}

static void
action_save_as (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  GtkFileChooserNative *dialog =
    gtk_file_chooser_native_new (_("Save Project As"), GTK_WINDOW (self),
                                 GTK_FILE_CHOOSER_ACTION_SAVE, _("_Save"), _("_Cancel"));
  const char *path = fw_project_get_path (self->project);
  g_autofree char *demo = fw_project_demo_path ();

  if (path != NULL && g_strcmp0 (path, demo) != 0)
    {
      g_autoptr (GFile) file = g_file_new_for_path (path);
      gtk_file_chooser_set_file (GTK_FILE_CHOOSER (dialog), file, NULL);
    }
  else
    gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (dialog), _("apiary.fwproj"));
  g_signal_connect (dialog, "response", G_CALLBACK (on_save_as_response), self);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (dialog));
}

static void
on_add_clips_response (GtkNativeDialog *dialog, int response, FwWindow *self)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GListModel) files = gtk_file_chooser_get_files (GTK_FILE_CHOOSER (dialog));
      g_autoptr (GPtrArray) array = g_ptr_array_new_with_free_func (g_object_unref);

      for (guint i = 0; i < g_list_model_get_n_items (files); i++)
        g_ptr_array_add (array, g_list_model_get_item (files, i));
      fw_window_add_clip_files (self, (GFile **) array->pdata, array->len);
    }
  g_object_unref (dialog);
}

static void
action_add_clips (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  GtkFileChooserNative *dialog =
    gtk_file_chooser_native_new (_("Add Audio Clips"), GTK_WINDOW (self),
                                 GTK_FILE_CHOOSER_ACTION_OPEN, _("_Add"), _("_Cancel"));
  const char *mimes[] = { "audio/*", NULL };
  const char *patterns[] = { "*.wav", "*.flac", "*.ogg", "*.opus", "*.mp3", "*.aiff", NULL };
  const char *all[] = { "*", NULL };

  gtk_file_chooser_set_select_multiple (GTK_FILE_CHOOSER (dialog), TRUE);
  add_filter (GTK_FILE_CHOOSER (dialog), _("Audio files"), patterns, mimes);
  add_filter (GTK_FILE_CHOOSER (dialog), _("All files"), all, NULL);
  g_signal_connect (dialog, "response", G_CALLBACK (on_add_clips_response), self);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (dialog));
}

typedef struct {
  FwWindow *window;
  FwClip *clip;
} RelinkData;

static void
on_relink_response (GtkNativeDialog *dialog, int response, RelinkData *data)
{
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr (GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (dialog));
      g_autofree char *path = g_file_get_path (file);
      FwAudioInfo info = { 0 };
      g_autoptr (GError) error = NULL;

      if (!fw_audio_read_info (path, &info, &error))
        {
          g_autofree char *msg = g_strdup_printf (_("Could not relink %s: %s"),
                                                  fw_clip_get_display_name (data->clip),
                                                  error->message);
          fw_window_show_error (data->window, msg);
        }
      else
        {
          fw_audio_info_clear (&info);
          fw_clip_set_path (data->clip, path);
        }
    }
  g_object_unref (data->clip);
  g_free (data);
  g_object_unref (dialog);
}

static void
action_relink_clip (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  FwClip *clip = _fw_window_find_clip (self, g_variant_get_string (param, NULL));
  g_autofree char *title = NULL;
  GtkFileChooserNative *dialog;
  RelinkData *data;

  if (clip == NULL)
    return;
  title = g_strdup_printf (_("Find the File for “%s”"), fw_clip_get_display_name (clip));
  dialog = gtk_file_chooser_native_new (title, GTK_WINDOW (self), GTK_FILE_CHOOSER_ACTION_OPEN,
                                        _("_Use This File"), _("_Cancel"));
  data = g_new0 (RelinkData, 1);
  data->window = self;
  data->clip = g_object_ref (clip);
  g_signal_connect (dialog, "response", G_CALLBACK (on_relink_response), data);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (dialog));
}

G_GNUC_END_IGNORE_DEPRECATIONS

/* ---------------------------------------------------------------- project */

static void
action_save (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  const char *path = fw_project_get_path (self->project);
  g_autofree char *demo = fw_project_demo_path ();

  /* The built-in demo is never overwritten: saving it asks for a place of its own. */
  if (path == NULL || g_strcmp0 (path, demo) == 0)
    action_save_as (NULL, NULL, self);
  else
    fw_window_save (self, NULL);
}

static void
action_open_recent (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  const char *path = g_variant_get_string (param, NULL);

  if (!g_file_test (path, G_FILE_TEST_EXISTS))
    {
      g_autofree char *msg = g_strdup_printf (_("The project %s no longer exists; it was "
                                                "removed from the recent list."), path);
      fw_recent_remove (path);
      _fw_window_rebuild_recent_menu (self);
      fw_window_show_error (self, msg);
      return;
    }
  if (self->project != NULL && fw_project_get_dirty (self->project))
    {
      FwWindow *win = fw_window_new (FW_APPLICATION (gtk_window_get_application (GTK_WINDOW (self))));
      fw_window_open_project (win, path);
      gtk_window_present (GTK_WINDOW (win));
    }
  else
    fw_window_open_project (self, path);
}

static void
action_open_demo (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;

  if (self->project != NULL && fw_project_get_dirty (self->project))
    {
      FwWindow *win = fw_window_new (FW_APPLICATION (gtk_window_get_application (GTK_WINDOW (self))));
      fw_window_open_demo (win);
      gtk_window_present (GTK_WINDOW (win));
    }
  else
    fw_window_open_demo (self);
}

static void
action_export_figure (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  GtkWidget *dialog;

  if (self->clip == NULL || self->set == NULL)
    {
      fw_window_show_error (self, _("Select a clip and a parameter set to export a figure."));
      return;
    }
  dialog = fw_export_dialog_new (GTK_WINDOW (self), self->cache, self->viewport, self->clip,
                                 self->set, (const FwPlotKind *) self->rows->data,
                                 self->rows->len);
  gtk_window_present (GTK_WINDOW (dialog));
}

/* ---------------------------------------------------------------- view */

static double
zoom_anchor (FwWindow *self)
{
  double s, e, c = fw_viewport_get_cursor (self->viewport);

  fw_viewport_get_visible (self->viewport, &s, &e);
  return (c >= s && c <= e) ? c : 0.5 * (s + e);
}

static void
action_zoom_in (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  fw_viewport_zoom (self->viewport, ZOOM_STEP, zoom_anchor (self));
}

static void
action_zoom_out (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  fw_viewport_zoom (self->viewport, 1.0 / ZOOM_STEP, zoom_anchor (self));
}

static void
action_zoom_fit (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  fw_viewport_fit (self->viewport);
}

static void
pan (FwWindow *self, double direction)
{
  double s, e;

  fw_viewport_get_visible (self->viewport, &s, &e);
  fw_viewport_pan (self->viewport, direction * PAN_FRACTION * (e - s));
}

static void
action_pan_left (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  pan (user_data, -1);
}

static void
action_pan_right (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  pan (user_data, +1);
}

/* Keyboard access to the cursor and the selection: a step is 1/100 of the view. The cursor
 * starts in the middle of the view; the selection grows from the cursor. */
static void
move_cursor (FwWindow *self, double direction, gboolean extend)
{
  double s, e, c = fw_viewport_get_cursor (self->viewport);
  double step, next, a, b;

  fw_viewport_get_visible (self->viewport, &s, &e);
  step = (e - s) / 100.0;
  if (c < s || c > e)
    c = 0.5 * (s + e);
  next = c + direction * step;
  if (extend)
    {
      if (fw_viewport_get_selection (self->viewport, &a, &b))
        {
          /* move the end that sits at the cursor */
          if (fabs (c - a) < fabs (c - b))
            a = next;
          else
            b = next;
        }
      else
        {
          a = c;
          b = next;
        }
      fw_viewport_set_selection (self->viewport, a, b);
    }
  fw_viewport_set_cursor (self->viewport, next);
  /* keep the cursor in view */
  if (next < s || next > e)
    fw_viewport_pan (self->viewport, next < s ? next - s : next - e);
}

static void
action_cursor_left (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  move_cursor (user_data, -1, FALSE);
}

static void
action_cursor_right (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  move_cursor (user_data, +1, FALSE);
}

static void
action_select_left (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  move_cursor (user_data, -1, TRUE);
}

static void
action_select_right (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  move_cursor (user_data, +1, TRUE);
}

static void
action_clear_selection (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  fw_viewport_clear_selection (self->viewport);
}

static void
action_cancel_work (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  fw_plot_stack_cancel (self->plot_stack);
  fw_compare_view_cancel (self->compare_view);
}

static void
action_recompute (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  fw_plot_stack_reload (self->plot_stack);
}

static void
change_toggle_sidebar (GSimpleAction *action, GVariant *value, gpointer user_data)
{
  FwWindow *self = user_data;

  g_simple_action_set_state (action, value);
  gtk_widget_set_visible (self->sidebar, g_variant_get_boolean (value));
}

static void
change_lock_ranges (GSimpleAction *action, GVariant *value, gpointer user_data)
{
  FwWindow *self = user_data;

  g_simple_action_set_state (action, value);
  fw_plot_stack_set_lock_ranges (self->plot_stack, g_variant_get_boolean (value));
}

/* ---------------------------------------------------------------- parameter sets */

static void
action_add_set (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  g_autofree char *name = fw_project_unique_param_set_name (self->project, _("new set"));
  g_autoptr (FwParams) params = fw_params_new_default ();
  g_autoptr (FwParamSet) set = fw_param_set_new (name, params);
  g_autoptr (GError) error = NULL;

  if (!fw_project_add_param_set (self->project, set, &error))
    {
      fw_window_show_error (self, error->message);
      return;
    }
  _fw_window_select (self, self->clip, set);
}

static void
action_duplicate_set (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  g_autofree char *base = NULL;
  g_autofree char *name = NULL;
  g_autoptr (FwParamSet) copy = NULL;
  g_autoptr (GError) error = NULL;

  if (self->set == NULL)
    return;
  /* TRANSLATORS: name of a duplicated parameter set, e.g. "long-window copy" */
  base = g_strdup_printf (_("%s copy"), fw_param_set_get_name (self->set));
  name = fw_project_unique_param_set_name (self->project, base);
  copy = fw_param_set_duplicate (self->set, name);
  if (!fw_project_add_param_set (self->project, copy, &error))
    {
      fw_window_show_error (self, error->message);
      return;
    }
  _fw_window_select (self, self->clip, copy);
}

static void
rename_done (FwWindow *self, const char *text, gpointer data)
{
  FwParamSet *set = data;
  g_autoptr (GError) error = NULL;
  g_autofree char *name = g_strstrip (g_strdup (text));

  if (*name == '\0')
    {
      fw_window_show_error (self, _("A parameter set needs a name; it was not renamed."));
      return;
    }
  if (!fw_project_rename_param_set (self->project, set, name, &error))
    fw_window_show_error (self, error->message);
}

static void
action_rename_set (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  g_autofree char *prompt = NULL;

  if (self->set == NULL)
    return;
  prompt = g_strdup_printf (_("New _name for the parameter set “%s”:"),
                            fw_param_set_get_name (self->set));
  _fw_window_ask_text (self, _("Rename Parameter Set"), prompt, fw_param_set_get_name (self->set),
                       _("_Rename"), rename_done, g_object_ref (self->set), g_object_unref);
}

static void
action_delete_set (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  g_autoptr (FwParamSet) set = NULL;

  if (self->set == NULL)
    return;
  set = g_object_ref (self->set);
  fw_project_remove_param_set (self->project, set);
}

static void
action_pin_selected_set (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;

  /* The current set stays in the second column; picking another set in the list then
   * changes the first column, so any two sets can be compared. */
  if (self->set != NULL)
    _fw_window_pin (self, NULL, self->set);
}

static void
action_pin_set (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  FwParamSet *set = fw_project_find_param_set (self->project, g_variant_get_string (param, NULL));

  if (set != NULL)
    _fw_window_pin (self, NULL, set);
}

static void
action_unpin (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  _fw_window_pin (user_data, NULL, NULL);
}

/* ---------------------------------------------------------------- clips */

static void
label_done (FwWindow *self, const char *text, gpointer data)
{
  FwClip *clip = data;
  g_autofree char *label = g_strstrip (g_strdup (text));

  fw_clip_set_label (clip, *label != '\0' ? label : NULL);
}

static void
action_set_clip_label (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  FwClip *clip = _fw_window_find_clip (self, g_variant_get_string (param, NULL));
  g_autofree char *prompt = NULL;

  if (clip == NULL)
    return;
  prompt = g_strdup_printf (_("Class _label for “%s” (leave empty for none):"),
                            fw_clip_get_display_name (clip));
  _fw_window_ask_text (self, _("Set Class Label"), prompt, fw_clip_get_label (clip),
                       _("_Set Label"), label_done, g_object_ref (clip), g_object_unref);
}

static void
action_remove_clip (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  FwClip *clip = _fw_window_find_clip (self, g_variant_get_string (param, NULL));

  if (clip != NULL)
    {
      g_autoptr (FwClip) keep = g_object_ref (clip);
      fw_project_remove_clip (self->project, keep);
    }
}

static void
action_pin_clip (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  FwClip *clip = _fw_window_find_clip (self, g_variant_get_string (param, NULL));

  if (clip != NULL)
    _fw_window_pin (self, clip, NULL);
}

/* ---------------------------------------------------------------- comparisons */

/* Another set than `set` for B: the pinned one when there is one, else the next in the list. */
static FwParamSet *
other_set (FwWindow *self, FwParamSet *set)
{
  GListModel *sets = fw_project_get_param_sets (self->project);
  guint n = g_list_model_get_n_items (sets);
  guint pos = 0;

  if (self->pinned_set != NULL && self->pinned_set != set)
    return self->pinned_set;
  if (n < 2)
    return set;
  if (set != NULL && g_list_store_find (G_LIST_STORE (sets), set, &pos))
    {
      g_autoptr (FwParamSet) next = g_list_model_get_item (sets, (pos + 1) % n);
      return next;   /* the project holds it */
    }
  {
    g_autoptr (FwParamSet) first = g_list_model_get_item (sets, 0);
    return first;
  }
}

static void
action_compare_new (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;

  /* A is what the plots show; B the same clip under another set, or the pinned clip */
  if (self->pinned_clip != NULL)
    _fw_window_ask_comparison (self, self->clip, self->set, self->pinned_clip, self->set);
  else
    _fw_window_ask_comparison (self, self->clip, self->set, self->clip,
                               other_set (self, self->set));
}

static void
action_compare_with (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  FwClip *clip = _fw_window_find_clip (self, g_variant_get_string (param, NULL));

  if (clip == NULL)
    return;
  /* A is the clip whose menu was used; B the clip shown in the plots when that is another
   * one (two clips, one set), else the same clip under another set */
  if (self->clip != NULL && self->clip != clip)
    _fw_window_ask_comparison (self, clip, self->set, self->clip, self->set);
  else
    _fw_window_ask_comparison (self, clip, self->set, clip, other_set (self, self->set));
}

static void
action_open_comparison (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  GListModel *cmps = fw_project_get_comparisons (self->project);
  guint i = g_variant_get_uint32 (param);

  if (i < g_list_model_get_n_items (cmps))
    {
      g_autoptr (FwComparison) cmp = g_list_model_get_item (cmps, i);
      _fw_window_open_comparison (self, cmp);
    }
}

static void
action_remove_comparison (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *self = user_data;
  GListModel *cmps = fw_project_get_comparisons (self->project);
  guint i = g_variant_get_uint32 (param);

  if (i < g_list_model_get_n_items (cmps))
    {
      g_autoptr (FwComparison) cmp = g_list_model_get_item (cmps, i);
      fw_project_remove_comparison (self->project, cmp);
    }
}

static void
action_close_compare (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  _fw_window_close_compare (user_data);
}

/* ---------------------------------------------------------------- setup */

static const GActionEntry win_actions[] = {
  { "open", action_open },
  { "open-recent", action_open_recent, "s" },
  { "open-demo", action_open_demo },
  { "save", action_save },
  { "save-as", action_save_as },
  { "add-clips", action_add_clips },
  { "export-figure", action_export_figure },
  { "zoom-in", action_zoom_in },
  { "zoom-out", action_zoom_out },
  { "zoom-fit", action_zoom_fit },
  { "pan-left", action_pan_left },
  { "pan-right", action_pan_right },
  { "clear-selection", action_clear_selection },
  { "cursor-left", action_cursor_left },
  { "cursor-right", action_cursor_right },
  { "select-left", action_select_left },
  { "select-right", action_select_right },
  { "cancel-work", action_cancel_work },
  { "recompute", action_recompute },
  { "toggle-sidebar", NULL, NULL, "true", change_toggle_sidebar },
  { "lock-ranges", NULL, NULL, "false", change_lock_ranges },
  { "add-set", action_add_set },
  { "duplicate-set", action_duplicate_set },
  { "rename-set", action_rename_set },
  { "delete-set", action_delete_set },
  { "pin-selected-set", action_pin_selected_set },
  { "pin-set", action_pin_set, "s" },
  { "unpin", action_unpin },
  { "set-clip-label", action_set_clip_label, "s" },
  { "relink-clip", action_relink_clip, "s" },
  { "remove-clip", action_remove_clip, "s" },
  { "pin-clip", action_pin_clip, "s" },
  { "compare-new", action_compare_new },
  { "compare-with", action_compare_with, "s" },
  { "open-comparison", action_open_comparison, "u" },
  { "remove-comparison", action_remove_comparison, "u" },
  { "close-compare", action_close_compare },
};

static void
set_enabled (FwWindow *self, const char *name, gboolean enabled)
{
  GAction *action = g_action_map_lookup_action (G_ACTION_MAP (self), name);

  if (action != NULL)
    g_simple_action_set_enabled (G_SIMPLE_ACTION (action), enabled);
}

void
_fw_window_update_action_states (FwWindow *self)
{
  gboolean have_project = self->project != NULL;
  guint n_sets = have_project ? g_list_model_get_n_items (fw_project_get_param_sets (self->project)) : 0;
  gboolean have_set = self->set != NULL;

  set_enabled (self, "save", have_project);
  set_enabled (self, "save-as", have_project);
  set_enabled (self, "add-set", have_project);
  set_enabled (self, "duplicate-set", have_set);
  set_enabled (self, "rename-set", have_set);
  set_enabled (self, "delete-set", have_set && n_sets > 1);
  set_enabled (self, "pin-selected-set", have_set);
  set_enabled (self, "unpin", self->pinned_clip != NULL || self->pinned_set != NULL);
  set_enabled (self, "export-figure", have_set && self->clip != NULL);
  set_enabled (self, "compare-new", have_set && self->clip != NULL);
  set_enabled (self, "close-compare", _fw_window_compare_shown (self));
}

void
_fw_window_rebuild_recent_menu (FwWindow *self)
{
  g_auto (GStrv) recent = fw_recent_list ();

  if (self->recent_section == NULL)
    return;
  g_menu_remove_all (self->recent_section);
  for (guint i = 0; recent[i] != NULL; i++)
    {
      g_autofree char *base = g_path_get_basename (recent[i]);
      g_autoptr (GMenuItem) item = g_menu_item_new (base, NULL);

      g_menu_item_set_action_and_target (item, "win.open-recent", "s", recent[i]);
      g_menu_append_item (self->recent_section, item);
    }
  if (recent[0] == NULL)
    {
      g_autoptr (GMenuItem) item = g_menu_item_new (_("No recent projects"), "win.none");
      g_menu_append_item (self->recent_section, item);
    }
}

void
_fw_window_install_actions (FwWindow *self)
{
  g_action_map_add_action_entries (G_ACTION_MAP (self), win_actions, G_N_ELEMENTS (win_actions),
                                   self);
  _fw_window_update_action_states (self);
}
