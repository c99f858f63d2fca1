/* fw-clip-list.c: clips of a project grouped by class label, for the sidebar. */
#include "fw-config.h"

#include "fw-clip-list.h"

#include <glib/gi18n.h>

struct _FwClipList {
  GtkWidget parent_instance;

  GtkWidget *box;
  GtkListBox *list;
  GtkWidget *placeholder;

  FwProject *project;
  FwClip *selected;
  gulong changed_id;
  gboolean rebuilding;
  guint rebuild_idle;
  GCancellable *info_cancellable;
};

G_DEFINE_FINAL_TYPE (FwClipList, fw_clip_list, GTK_TYPE_WIDGET)

enum { PROP_0, PROP_SELECTED_CLIP, N_PROPS };
enum { SIGNAL_FILES_DROPPED, N_SIGNALS };

static GParamSpec *properties[N_PROPS];
static guint signals[N_SIGNALS];

static void rebuild (FwClipList *self);

static const char *
clip_label (FwClip *clip)
{
  const char *label = fw_clip_get_label (clip);
  return (label != NULL && *label != '\0') ? label : NULL;
}

static int
compare_clips (gconstpointer a, gconstpointer b)
{
  FwClip *ca = *(FwClip **) a, *cb = *(FwClip **) b;
  const char *la = clip_label (ca), *lb = clip_label (cb);
  int c;

  if (la == NULL && lb != NULL)
    return 1;
  if (la != NULL && lb == NULL)
    return -1;
  if (la != NULL && (c = g_utf8_collate (la, lb)) != 0)
    return c;
  return g_utf8_collate (fw_clip_get_display_name (ca), fw_clip_get_display_name (cb));
}

static FwClip *
row_clip (GtkListBoxRow *row)
{
  return row != NULL ? g_object_get_data (G_OBJECT (row), "fw-clip") : NULL;
}

static void
header_func (GtkListBoxRow *row, GtkListBoxRow *before, gpointer user_data)
{
  FwClip *clip = row_clip (row);
  const char *label = clip_label (clip);
  const char *prev = before != NULL ? clip_label (row_clip (before)) : NULL;
  GtkWidget *header;

  if (before != NULL && g_strcmp0 (label, prev) == 0)
    {
      gtk_list_box_row_set_header (row, NULL);
      return;
    }
  header = gtk_label_new (label != NULL ? label : _("No label"));
  gtk_label_set_xalign (GTK_LABEL (header), 0);
  gtk_label_set_ellipsize (GTK_LABEL (header), PANGO_ELLIPSIZE_END);
  gtk_widget_add_css_class (header, "fw-group-heading");
  gtk_list_box_row_set_header (row, header);
}

/* "22.05 kHz · 4.0 s · stereo" in the user's number format. */
static char *
describe_clip (FwClip *clip)
{
  FwAudioInfo info = { 0 };
  g_autoptr (GError) error = NULL;
  g_autofree char *rate = NULL;
  g_autofree char *channels = NULL;
  char *text;

  if (fw_clip_get_missing (clip))
    return g_strdup (_("File not found — relink it"));
  if (!fw_clip_get_info (clip, &info, &error))
    return g_strdup (error->message);
  rate = g_strdup_printf (_("%.4g kHz"), info.sample_rate / 1000.0);
  channels = info.channels == 1 ? g_strdup (_("mono"))
           : info.channels == 2 ? g_strdup (_("stereo"))
           : g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%d channel", "%d channels",
                                           info.channels), info.channels);
  /* TRANSLATORS: clip facts in the sidebar: rate, duration, channels */
  text = g_strdup_printf (_("%s · %.1f s · %s"), rate, info.duration, channels);
  fw_audio_info_clear (&info);
  return text;
}

static GMenuModel *
clip_menu (FwClip *clip)
{
  GMenu *menu = g_menu_new ();
  GMenu *section = g_menu_new ();
  const char *path = fw_clip_get_path (clip);
  GMenuItem *item;

  item = g_menu_item_new (_("Set Class Label…"), NULL);
  g_menu_item_set_action_and_target (item, "win.set-clip-label", "s", path);
  g_menu_append_item (section, item);
  g_object_unref (item);
  item = g_menu_item_new (fw_clip_get_missing (clip) ? _("Relink Missing File…")
                                                     : _("Replace File…"), NULL);
  g_menu_item_set_action_and_target (item, "win.relink-clip", "s", path);
  g_menu_append_item (section, item);
  g_object_unref (item);
  item = g_menu_item_new (_("Pin to Second Column"), NULL);
  g_menu_item_set_action_and_target (item, "win.pin-clip", "s", path);
  g_menu_append_item (section, item);
  g_object_unref (item);

  item = g_menu_item_new (_("Compare With…"), NULL);
  g_menu_item_set_action_and_target (item, "win.compare-with", "s", path);
  g_menu_append_item (section, item);
  g_object_unref (item);
  g_menu_append_section (menu, NULL, G_MENU_MODEL (section));
  g_object_unref (section);

  section = g_menu_new ();
  item = g_menu_item_new (_("Remove from Project"), NULL);
  g_menu_item_set_action_and_target (item, "win.remove-clip", "s", path);
  g_menu_append_item (section, item);
  g_object_unref (item);
  g_menu_append_section (menu, NULL, G_MENU_MODEL (section));
  g_object_unref (section);
  return G_MENU_MODEL (menu);
}

static void
on_row_pressed (GtkGestureClick *gesture, int n_press, double x, double y, gpointer user_data)
{
  GtkMenuButton *button = user_data;

  gtk_gesture_set_state (GTK_GESTURE (gesture), GTK_EVENT_SEQUENCE_CLAIMED);
  gtk_menu_button_popup (button);
}

static GtkWidget *
make_row (FwClip *clip, gboolean info_ready)
{
  GtkWidget *row = gtk_list_box_row_new ();
  GtkWidget *hbox = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 8);
  GtkWidget *vbox = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  gboolean missing = fw_clip_get_missing (clip);
  GtkWidget *icon = gtk_image_new_from_icon_name (missing ? "dialog-warning-symbolic"
                                                          : "audio-x-generic-symbolic");
  GtkWidget *name = gtk_label_new (fw_clip_get_display_name (clip));
  g_autofree char *detail_text = info_ready || missing ? describe_clip (clip) : g_strdup ("…");
  GtkWidget *detail = gtk_label_new (detail_text);
  GtkWidget *menu_button = gtk_menu_button_new ();
  g_autoptr (GMenuModel) menu = clip_menu (clip);
  GtkGesture *click = gtk_gesture_click_new ();
  g_autofree char *tooltip = NULL;
  g_autofree char *a11y = NULL;

  gtk_label_set_xalign (GTK_LABEL (name), 0);
  gtk_label_set_ellipsize (GTK_LABEL (name), PANGO_ELLIPSIZE_MIDDLE);
  gtk_label_set_xalign (GTK_LABEL (detail), 0);
  gtk_label_set_ellipsize (GTK_LABEL (detail), PANGO_ELLIPSIZE_END);
  gtk_widget_add_css_class (detail, "caption");
  gtk_widget_add_css_class (detail, missing ? "error" : "dim-label");
  if (missing)
    gtk_widget_add_css_class (icon, "error");
  gtk_box_append (GTK_BOX (vbox), name);
  gtk_box_append (GTK_BOX (vbox), detail);
  gtk_widget_set_hexpand (vbox, TRUE);

  gtk_menu_button_set_icon_name (GTK_MENU_BUTTON (menu_button), "view-more-symbolic");
  gtk_menu_button_set_menu_model (GTK_MENU_BUTTON (menu_button), menu);
  gtk_menu_button_set_has_frame (GTK_MENU_BUTTON (menu_button), FALSE);
  gtk_widget_set_valign (menu_button, GTK_ALIGN_CENTER);
  gtk_widget_set_tooltip_text (menu_button, _("Clip actions"));

  gtk_box_append (GTK_BOX (hbox), icon);
  gtk_box_append (GTK_BOX (hbox), vbox);
  gtk_box_append (GTK_BOX (hbox), menu_button);
  gtk_widget_add_css_class (hbox, "fw-clip-row");
  gtk_list_box_row_set_child (GTK_LIST_BOX_ROW (row), hbox);

  tooltip = g_strdup (fw_clip_get_path (clip));
  gtk_widget_set_tooltip_text (row, tooltip);
  a11y = g_strdup_printf (_("%s, class %s, %s"), fw_clip_get_display_name (clip),
                          clip_label (clip) != NULL ? clip_label (clip) : _("no label"),
                          detail_text);
  gtk_accessible_update_property (GTK_ACCESSIBLE (row), GTK_ACCESSIBLE_PROPERTY_LABEL, a11y, -1);

  gtk_gesture_single_set_button (GTK_GESTURE_SINGLE (click), GDK_BUTTON_SECONDARY);
  g_signal_connect (click, "pressed", G_CALLBACK (on_row_pressed), menu_button);
  gtk_widget_add_controller (row, GTK_EVENT_CONTROLLER (click));

  g_object_set_data_full (G_OBJECT (row), "fw-clip", g_object_ref (clip), g_object_unref);
  return row;
}

static void
set_selected (FwClipList *self, FwClip *clip)
{
  if (self->selected == clip)
    return;
  g_set_object (&self->selected, clip);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_SELECTED_CLIP]);
}

static void
on_row_selected (GtkListBox *list, GtkListBoxRow *row, gpointer user_data)
{
  FwClipList *self = user_data;

  if (self->rebuilding || row == NULL)
    return;
  set_selected (self, row_clip (row));
}

/* Reads every clip's file facts in a worker thread (a long clip's peak and RMS take a
 * moment), then rebuilds with the facts shown. */
static void
infos_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  GPtrArray *clips = task_data;

  for (guint i = 0; i < clips->len && !g_cancellable_is_cancelled (cancellable); i++)
    {
      FwAudioInfo info = { 0 };
      if (fw_clip_get_info (g_ptr_array_index (clips, i), &info, NULL))
        fw_audio_info_clear (&info);
    }
  g_task_return_boolean (task, TRUE);
}

static void
infos_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  FwClipList *self = FW_CLIP_LIST (source);

  if (g_task_propagate_boolean (G_TASK (result), NULL) &&
      !g_cancellable_is_cancelled (g_task_get_cancellable (G_TASK (result))))
    {
      g_object_set_data (G_OBJECT (self), "fw-infos-ready", GINT_TO_POINTER (1));
      rebuild (self);
    }
}

static void
start_infos (FwClipList *self)
{
  GListModel *clips = fw_project_get_clips (self->project);
  GPtrArray *array = g_ptr_array_new_with_free_func (g_object_unref);
  g_autoptr (GTask) task = NULL;

  for (guint i = 0; i < g_list_model_get_n_items (clips); i++)
    g_ptr_array_add (array, g_list_model_get_item (clips, i));
  g_cancellable_cancel (self->info_cancellable);
  g_clear_object (&self->info_cancellable);
  self->info_cancellable = g_cancellable_new ();
  task = g_task_new (self, self->info_cancellable, infos_done, NULL);
  g_task_set_source_tag (task, start_infos);
  g_task_set_task_data (task, array, (GDestroyNotify) g_ptr_array_unref);
  g_task_run_in_thread (task, infos_thread);
}

static void
rebuild (FwClipList *self)
{
  GtkWidget *child;
  g_autoptr (GPtrArray) clips = g_ptr_array_new_with_free_func (g_object_unref);
  gboolean info_ready = g_object_get_data (G_OBJECT (self), "fw-infos-ready") != NULL;
  GtkListBoxRow *to_select = NULL;

  self->rebuilding = TRUE;
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->list))) != NULL)
    gtk_list_box_remove (self->list, child);

  if (self->project != NULL)
    {
      GListModel *model = fw_project_get_clips (self->project);
      for (guint i = 0; i < g_list_model_get_n_items (model); i++)
        g_ptr_array_add (clips, g_list_model_get_item (model, i));
    }
  g_ptr_array_sort (clips, compare_clips);
  for (guint i = 0; i < clips->len; i++)
    {
      FwClip *clip = g_ptr_array_index (clips, i);
      GtkWidget *row = make_row (clip, info_ready);

      gtk_list_box_append (self->list, row);
      if (clip == self->selected)
        to_select = GTK_LIST_BOX_ROW (row);
    }
  if (to_select != NULL)
    gtk_list_box_select_row (self->list, to_select);
  self->rebuilding = FALSE;

  /* The selected clip left the project: select nothing. */
  if (to_select == NULL)
    set_selected (self, NULL);
}

static gboolean
rebuild_idle_cb (gpointer user_data)
{
  FwClipList *self = user_data;

  self->rebuild_idle = 0;
  g_object_set_data (G_OBJECT (self), "fw-infos-ready", NULL);
  rebuild (self);
  if (self->project != NULL)
    start_infos (self);
  return G_SOURCE_REMOVE;
}

static void
on_project_changed (FwProject *project, gpointer user_data)
{
  FwClipList *self = user_data;

  /* Coalesce bursts of changes (loading, batch edits) into one rebuild. */
  if (self->rebuild_idle == 0)
    self->rebuild_idle = g_idle_add (rebuild_idle_cb, self);
}

void
fw_clip_list_set_project (FwClipList *self, FwProject *project)
{
  g_return_if_fail (FW_IS_CLIP_LIST (self));

  if (self->project != NULL)
    g_clear_signal_handler (&self->changed_id, self->project);
  g_set_object (&self->project, project);
  if (project != NULL)
    self->changed_id = g_signal_connect (project, "changed", G_CALLBACK (on_project_changed),
                                         self);
  g_clear_handle_id (&self->rebuild_idle, g_source_remove);
  rebuild_idle_cb (self);
}

FwClip *
fw_clip_list_get_selected (FwClipList *self)
{
  g_return_val_if_fail (FW_IS_CLIP_LIST (self), NULL);
  return self->selected;
}

void
fw_clip_list_select (FwClipList *self, FwClip *clip)
{
  g_return_if_fail (FW_IS_CLIP_LIST (self));

  for (GtkWidget *child = gtk_widget_get_first_child (GTK_WIDGET (self->list)); child != NULL;
       child = gtk_widget_get_next_sibling (child))
    if (GTK_IS_LIST_BOX_ROW (child) && row_clip (GTK_LIST_BOX_ROW (child)) == clip)
      {
        gtk_list_box_select_row (self->list, GTK_LIST_BOX_ROW (child));
        break;
      }
  set_selected (self, clip);
}

static gboolean
on_drop (GtkDropTarget *target, const GValue *value, double x, double y, gpointer user_data)
{
  FwClipList *self = user_data;

  if (!G_VALUE_HOLDS (value, GDK_TYPE_FILE_LIST))
    return FALSE;
  g_signal_emit (self, signals[SIGNAL_FILES_DROPPED], 0, g_value_get_boxed (value));
  return TRUE;
}

static void
fw_clip_list_dispose (GObject *object)
{
  FwClipList *self = FW_CLIP_LIST (object);

  g_clear_handle_id (&self->rebuild_idle, g_source_remove);
  if (self->info_cancellable != NULL)
    g_cancellable_cancel (self->info_cancellable);
  g_clear_object (&self->info_cancellable);
  if (self->project != NULL)
    g_clear_signal_handler (&self->changed_id, self->project);
  g_clear_object (&self->project);
  g_clear_object (&self->selected);
  g_clear_pointer (&self->box, gtk_widget_unparent);
  G_OBJECT_CLASS (fw_clip_list_parent_class)->dispose (object);
}

static void
fw_clip_list_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  FwClipList *self = FW_CLIP_LIST (object);

  switch (prop_id)
    {
    case PROP_SELECTED_CLIP: g_value_set_object (value, self->selected); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_clip_list_class_init (FwClipListClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = fw_clip_list_dispose;
  object_class->get_property = fw_clip_list_get_property;

  properties[PROP_SELECTED_CLIP] =
    g_param_spec_object ("selected-clip", NULL, NULL, FW_TYPE_CLIP,
                         G_PARAM_READABLE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  g_object_class_install_properties (object_class, N_PROPS, properties);

  signals[SIGNAL_FILES_DROPPED] =
    g_signal_new ("files-dropped", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL,
                  NULL, NULL, G_TYPE_NONE, 1, GDK_TYPE_FILE_LIST);

  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "fwcliplist");
}

static void
fw_clip_list_init (FwClipList *self)
{
  GtkWidget *scrolled = gtk_scrolled_window_new ();
  GtkWidget *placeholder = gtk_label_new (_("No clips yet.\nAdd audio files with the + "
                                            "button or drop them here."));
  GtkDropTarget *drop = gtk_drop_target_new (GDK_TYPE_FILE_LIST, GDK_ACTION_COPY);

  self->box = scrolled;
  gtk_widget_set_parent (scrolled, GTK_WIDGET (self));
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (scrolled), GTK_POLICY_NEVER,
                                  GTK_POLICY_AUTOMATIC);
  gtk_widget_set_vexpand (scrolled, TRUE);

  self->list = GTK_LIST_BOX (gtk_list_box_new ());
  gtk_list_box_set_selection_mode (self->list, GTK_SELECTION_SINGLE);
  gtk_list_box_set_header_func (self->list, header_func, NULL, NULL);
  gtk_widget_add_css_class (GTK_WIDGET (self->list), "navigation-sidebar");
  gtk_accessible_update_property (GTK_ACCESSIBLE (self->list), GTK_ACCESSIBLE_PROPERTY_LABEL,
                                  _("Clips by class label"), -1);
  gtk_label_set_justify (GTK_LABEL (placeholder), GTK_JUSTIFY_CENTER);
  gtk_label_set_wrap (GTK_LABEL (placeholder), TRUE);
  gtk_widget_add_css_class (placeholder, "dim-label");
  gtk_widget_set_margin_top (placeholder, 24);
  gtk_widget_set_margin_start (placeholder, 12);
  gtk_widget_set_margin_end (placeholder, 12);
  gtk_list_box_set_placeholder (self->list, placeholder);
  self->placeholder = placeholder;
  g_signal_connect (self->list, "row-selected", G_CALLBACK (on_row_selected), self);
  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (scrolled), GTK_WIDGET (self->list));

  g_signal_connect (drop, "drop", G_CALLBACK (on_drop), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (drop));
}

GtkWidget *
fw_clip_list_new (void)
{
  return g_object_new (FW_TYPE_CLIP_LIST, NULL);
}
