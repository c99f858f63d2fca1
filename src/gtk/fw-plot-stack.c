/* fw-plot-stack.c: columns of time-aligned plot rows sharing one viewport. */
#include "fw-config.h"

#include "fw-plot-stack.h"

#include <glib/gi18n.h>

#define MAX_COLUMNS 2

typedef struct {
  FwClip *clip;
  FwParamSet *set;
  GPtrArray *rows;       /* FwPlotRow*, display order */
  GtkWidget *header;     /* GtkBox */
  GtkWidget *title;      /* GtkLabel */
  GtkWidget *ruler;      /* FwTimeRuler */
} Column;

struct _FwPlotStack {
  GtkWidget parent_instance;

  GtkWidget *box;
  GtkGrid *header_grid;
  GtkGrid *rows_grid;
  GtkWidget *scrolled;

  FwFeatureCache *cache;
  FwViewport *viewport;
  Column columns[MAX_COLUMNS];
  guint n_columns;
  GArray *kinds;         /* FwPlotKind */
  gboolean lock_ranges;
  gboolean updating_ranges;
};

G_DEFINE_FINAL_TYPE (FwPlotStack, fw_plot_stack, GTK_TYPE_WIDGET)

enum { SIGNAL_READOUT, SIGNAL_STATE_CHANGED, SIGNAL_UNPIN, N_SIGNALS };
static guint signals[N_SIGNALS];

static void relayout (FwPlotStack *self);

/* ---------------------------------------------------------------- ranges */

static void
update_locked_ranges (FwPlotStack *self)
{
  g_autoptr (GHashTable) groups = g_hash_table_new_full (g_str_hash, g_str_equal, NULL, g_free);

  if (self->updating_ranges)
    return;
  self->updating_ranges = TRUE;
  for (guint c = 0; c < self->n_columns; c++)
    for (guint i = 0; i < self->columns[c].rows->len; i++)
      {
        FwPlotRow *row = g_ptr_array_index (self->columns[c].rows, i);
        FwValueRange r;
        FwValueRange *acc;

        if (!fw_plot_kind_is_heatmap (fw_plot_row_get_kind (row)))
          continue;
        if (!self->lock_ranges)
          {
            if (fw_plot_row_get_range_mode (row) == FW_RANGE_LOCKED)
              fw_plot_row_set_range_mode (row, FW_RANGE_AUTO, NULL);
            fw_plot_row_set_shared_range (row, NULL);
            continue;
          }
        if (fw_plot_row_get_range_mode (row) != FW_RANGE_LOCKED)
          fw_plot_row_set_range_mode (row, FW_RANGE_LOCKED, NULL);
        if (!fw_plot_row_get_auto_range (row, &r))
          continue;
        acc = g_hash_table_lookup (groups, fw_plot_row_get_range_group (row));
        if (acc == NULL)
          g_hash_table_insert (groups, (gpointer) fw_plot_row_get_range_group (row),
                               g_memdup2 (&r, sizeof r));
        else
          fw_value_range_union (acc, &r);
      }
  if (self->lock_ranges)
    for (guint c = 0; c < self->n_columns; c++)
      for (guint i = 0; i < self->columns[c].rows->len; i++)
        {
          FwPlotRow *row = g_ptr_array_index (self->columns[c].rows, i);
          FwValueRange *acc = g_hash_table_lookup (groups, fw_plot_row_get_range_group (row));
          if (acc != NULL)
            fw_plot_row_set_shared_range (row, acc);
        }
  self->updating_ranges = FALSE;
}

void
fw_plot_stack_set_lock_ranges (FwPlotStack *self, gboolean lock)
{
  g_return_if_fail (FW_IS_PLOT_STACK (self));
  self->lock_ranges = lock;
  update_locked_ranges (self);
}

gboolean
fw_plot_stack_get_lock_ranges (FwPlotStack *self)
{
  g_return_val_if_fail (FW_IS_PLOT_STACK (self), FALSE);
  return self->lock_ranges;
}

/* ---------------------------------------------------------------- rows */

static void
on_row_readout (FwPlotRow *row, const char *text, FwPlotStack *self)
{
  g_autofree char *full = NULL;

  if (text != NULL && self->n_columns > 1)
    {
      /* say which column the numbers come from */
      const char *which = NULL;
      for (guint c = 0; c < self->n_columns; c++)
        if (g_ptr_array_find (self->columns[c].rows, row, NULL))
          which = gtk_label_get_text (GTK_LABEL (self->columns[c].title));
      full = g_strdup_printf ("%s: %s", which != NULL ? which : "", text);
    }
  g_signal_emit (self, signals[SIGNAL_READOUT], 0, full != NULL ? full : text);
}

static void
on_row_state_changed (FwPlotRow *row, FwPlotStack *self)
{
  g_signal_emit (self, signals[SIGNAL_STATE_CHANGED], 0);
}

static void
on_row_range_changed (FwPlotRow *row, FwPlotStack *self)
{
  if (self->lock_ranges)
    update_locked_ranges (self);
}

static void
on_row_settings_changed (FwPlotRow *row, FwPlotStack *self)
{
  /* a colour scale chosen for one row applies to the same row of the other column, so the
   * two columns stay comparable */
  FwPlotKind kind = fw_plot_row_get_kind (row);

  for (guint c = 0; c < self->n_columns; c++)
    for (guint i = 0; i < self->columns[c].rows->len; i++)
      {
        FwPlotRow *other = g_ptr_array_index (self->columns[c].rows, i);
        if (other == row || fw_plot_row_get_kind (other) != kind)
          continue;
        g_signal_handlers_block_by_func (other, on_row_settings_changed, self);
        fw_plot_row_set_colour_scale (other, fw_plot_row_get_colour_scale (row));
        fw_plot_row_set_frequency_scale (other, fw_plot_row_get_frequency_scale (row));
        if (fw_plot_row_get_range_mode (row) != FW_RANGE_LOCKED)
          {
            FwValueRange r;
            if (fw_plot_row_get_range_mode (row) == FW_RANGE_FIXED &&
                fw_plot_row_get_shown_range (row, &r))
              fw_plot_row_set_range_mode (other, FW_RANGE_FIXED, &r);
            else
              fw_plot_row_set_range_mode (other, FW_RANGE_AUTO, NULL);
          }
        g_signal_handlers_unblock_by_func (other, on_row_settings_changed, self);
      }
}

static FwPlotRow *
make_row (FwPlotStack *self, FwPlotKind kind, guint column)
{
  FwPlotRow *row = fw_plot_row_new (kind, self->viewport);

  g_object_ref_sink (row);
  g_signal_connect (row, "readout", G_CALLBACK (on_row_readout), self);
  g_signal_connect (row, "state-changed", G_CALLBACK (on_row_state_changed), self);
  g_signal_connect (row, "range-changed", G_CALLBACK (on_row_range_changed), self);
  g_signal_connect (row, "settings-changed", G_CALLBACK (on_row_settings_changed), self);
  fw_plot_row_set_source (row, self->cache, self->columns[column].clip, self->columns[column].set);
  return row;
}

static void
release_row (FwPlotStack *self, FwPlotRow *row)
{
  g_signal_handlers_disconnect_by_data (row, self);
  fw_plot_row_cancel (row);
  g_object_unref (row);
}

/* Rebuilds each column's row list for self->kinds, keeping rows that stay. */
static void
sync_rows (FwPlotStack *self)
{
  for (guint c = 0; c < MAX_COLUMNS; c++)
    {
      Column *col = &self->columns[c];
      GPtrArray *old = col->rows;
      GPtrArray *rows = g_ptr_array_new ();

      /* the new list is the column's list while it is built: a new row's first state
       * change may ask the stack about its rows */
      col->rows = rows;

      if (c < self->n_columns && self->viewport != NULL)
        for (guint k = 0; k < self->kinds->len; k++)
          {
            FwPlotKind kind = g_array_index (self->kinds, FwPlotKind, k);
            FwPlotRow *found = NULL;

            for (guint i = 0; i < old->len; i++)
              {
                FwPlotRow *row = g_ptr_array_index (old, i);
                if (row != NULL && fw_plot_row_get_kind (row) == kind)
                  {
                    found = row;
                    old->pdata[i] = NULL;
                    break;
                  }
              }
            g_ptr_array_add (rows, found != NULL ? found : make_row (self, kind, c));
          }
      for (guint i = 0; i < old->len; i++)
        if (old->pdata[i] != NULL)
          {
            FwPlotRow *row = old->pdata[i];
            if (gtk_widget_get_parent (GTK_WIDGET (row)) != NULL)
              gtk_grid_remove (self->rows_grid, GTK_WIDGET (row));
            release_row (self, row);
          }
      g_ptr_array_unref (old);
    }
  relayout (self);
  update_locked_ranges (self);
  g_signal_emit (self, signals[SIGNAL_STATE_CHANGED], 0);
}

static void
relayout (FwPlotStack *self)
{
  GtkWidget *child;

  /* detach everything, then attach in grid order */
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->rows_grid))) != NULL)
    gtk_grid_remove (self->rows_grid, child);
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->header_grid))) != NULL)
    gtk_grid_remove (self->header_grid, child);

  for (guint c = 0; c < self->n_columns; c++)
    {
      Column *col = &self->columns[c];

      gtk_grid_attach (self->header_grid, col->header, (int) c, 0, 1, 1);
      gtk_grid_attach (self->header_grid, col->ruler, (int) c, 1, 1, 1);
      for (guint i = 0; i < col->rows->len; i++)
        gtk_grid_attach (self->rows_grid, g_ptr_array_index (col->rows, i), (int) c, (int) i, 1, 1);
    }
}

void
fw_plot_stack_set_rows (FwPlotStack *self, const FwPlotKind *kinds, guint n_kinds)
{
  g_return_if_fail (FW_IS_PLOT_STACK (self));
  g_array_set_size (self->kinds, 0);
  g_array_append_vals (self->kinds, kinds, n_kinds);
  sync_rows (self);
}

guint
fw_plot_stack_get_n_rows (FwPlotStack *self)
{
  g_return_val_if_fail (FW_IS_PLOT_STACK (self), 0);
  return self->kinds->len;
}

FwPlotKind
fw_plot_stack_get_row_kind (FwPlotStack *self, guint index)
{
  g_return_val_if_fail (FW_IS_PLOT_STACK (self), FW_PLOT_WAVEFORM);
  g_return_val_if_fail (index < self->kinds->len, FW_PLOT_WAVEFORM);
  return g_array_index (self->kinds, FwPlotKind, index);
}

FwPlotRow *
fw_plot_stack_get_row (FwPlotStack *self, guint column, FwPlotKind kind)
{
  g_return_val_if_fail (FW_IS_PLOT_STACK (self), NULL);
  if (column >= self->n_columns)
    return NULL;
  for (guint i = 0; i < self->columns[column].rows->len; i++)
    {
      FwPlotRow *row = g_ptr_array_index (self->columns[column].rows, i);
      if (fw_plot_row_get_kind (row) == kind)
        return row;
    }
  return NULL;
}

FwTimeRuler *
fw_plot_stack_get_ruler (FwPlotStack *self, guint column)
{
  g_return_val_if_fail (FW_IS_PLOT_STACK (self), NULL);
  return column < self->n_columns ? FW_TIME_RULER (self->columns[column].ruler) : NULL;
}

/* ---------------------------------------------------------------- columns */

void
fw_plot_stack_set_context (FwPlotStack *self, FwFeatureCache *cache, FwViewport *viewport)
{
  g_return_if_fail (FW_IS_PLOT_STACK (self));

  g_set_object (&self->cache, cache);
  if (viewport != self->viewport)
    {
      /* rows are bound to their viewport: make new ones */
      for (guint c = 0; c < MAX_COLUMNS; c++)
        {
          for (guint i = 0; i < self->columns[c].rows->len; i++)
            {
              FwPlotRow *row = g_ptr_array_index (self->columns[c].rows, i);
              if (gtk_widget_get_parent (GTK_WIDGET (row)) != NULL)
                gtk_grid_remove (self->rows_grid, GTK_WIDGET (row));
              release_row (self, row);
            }
          g_ptr_array_set_size (self->columns[c].rows, 0);
          fw_time_ruler_set_viewport (FW_TIME_RULER (self->columns[c].ruler), viewport);
        }
      g_set_object (&self->viewport, viewport);
      sync_rows (self);
      return;
    }
  for (guint c = 0; c < self->n_columns; c++)
    for (guint i = 0; i < self->columns[c].rows->len; i++)
      fw_plot_row_set_source (g_ptr_array_index (self->columns[c].rows, i), cache,
                              self->columns[c].clip, self->columns[c].set);
}

FwViewport *
fw_plot_stack_get_viewport (FwPlotStack *self)
{
  g_return_val_if_fail (FW_IS_PLOT_STACK (self), NULL);
  return self->viewport;
}

void
fw_plot_stack_set_column (FwPlotStack *self, guint column, FwClip *clip, FwParamSet *set)
{
  Column *col;
  guint n_columns;

  g_return_if_fail (FW_IS_PLOT_STACK (self));
  g_return_if_fail (column < MAX_COLUMNS);

  col = &self->columns[column];
  g_set_object (&col->clip, clip);
  g_set_object (&col->set, set);

  n_columns = (self->columns[1].clip != NULL && self->columns[1].set != NULL) ? 2 : 1;
  if (n_columns != self->n_columns)
    {
      self->n_columns = n_columns;
      sync_rows (self);
    }
  for (guint i = 0; i < col->rows->len; i++)
    fw_plot_row_set_source (g_ptr_array_index (col->rows, i), self->cache, clip, set);
}

guint
fw_plot_stack_get_n_columns (FwPlotStack *self)
{
  g_return_val_if_fail (FW_IS_PLOT_STACK (self), 0);
  return self->n_columns;
}

void
fw_plot_stack_set_column_title (FwPlotStack *self, guint column, const char *title)
{
  g_return_if_fail (FW_IS_PLOT_STACK (self));
  g_return_if_fail (column < MAX_COLUMNS);
  gtk_label_set_text (GTK_LABEL (self->columns[column].title), title != NULL ? title : "");
}

gboolean
fw_plot_stack_is_busy (FwPlotStack *self)
{
  g_return_val_if_fail (FW_IS_PLOT_STACK (self), FALSE);
  for (guint c = 0; c < self->n_columns; c++)
    for (guint i = 0; i < self->columns[c].rows->len; i++)
      if (fw_plot_row_is_busy (g_ptr_array_index (self->columns[c].rows, i)))
        return TRUE;
  return FALSE;
}

double
fw_plot_stack_get_duration (FwPlotStack *self)
{
  double d = 0;

  g_return_val_if_fail (FW_IS_PLOT_STACK (self), 0);
  for (guint c = 0; c < self->n_columns; c++)
    for (guint i = 0; i < self->columns[c].rows->len; i++)
      d = MAX (d, fw_plot_row_get_duration (g_ptr_array_index (self->columns[c].rows, i)));
  return d;
}

void
fw_plot_stack_reload (FwPlotStack *self)
{
  g_return_if_fail (FW_IS_PLOT_STACK (self));
  for (guint c = 0; c < self->n_columns; c++)
    for (guint i = 0; i < self->columns[c].rows->len; i++)
      fw_plot_row_reload (g_ptr_array_index (self->columns[c].rows, i));
}

void
fw_plot_stack_cancel (FwPlotStack *self)
{
  g_return_if_fail (FW_IS_PLOT_STACK (self));
  for (guint c = 0; c < self->n_columns; c++)
    for (guint i = 0; i < self->columns[c].rows->len; i++)
      fw_plot_row_cancel (g_ptr_array_index (self->columns[c].rows, i));
}

/* ---------------------------------------------------------------- class */

static void
on_unpin_clicked (GtkButton *button, FwPlotStack *self)
{
  g_signal_emit (self, signals[SIGNAL_UNPIN], 0);
}

static void
add_shortcut (GtkShortcutController *controller, guint keyval, GdkModifierType mods,
              const char *action)
{
  gtk_shortcut_controller_add_shortcut (controller,
    gtk_shortcut_new (gtk_keyval_trigger_new (keyval, mods), gtk_named_action_new (action)));
}

static void
fw_plot_stack_dispose (GObject *object)
{
  FwPlotStack *self = FW_PLOT_STACK (object);

  for (guint c = 0; c < MAX_COLUMNS; c++)
    {
      Column *col = &self->columns[c];
      if (col->rows != NULL)
        {
          for (guint i = 0; i < col->rows->len; i++)
            release_row (self, g_ptr_array_index (col->rows, i));
          g_clear_pointer (&col->rows, g_ptr_array_unref);
        }
      g_clear_object (&col->clip);
      g_clear_object (&col->set);
      g_clear_object (&col->header);
      g_clear_object (&col->ruler);
    }
  g_clear_pointer (&self->box, gtk_widget_unparent);
  g_clear_object (&self->cache);
  g_clear_object (&self->viewport);
  G_OBJECT_CLASS (fw_plot_stack_parent_class)->dispose (object);
}

static void
fw_plot_stack_finalize (GObject *object)
{
  FwPlotStack *self = FW_PLOT_STACK (object);

  g_array_unref (self->kinds);
  G_OBJECT_CLASS (fw_plot_stack_parent_class)->finalize (object);
}

static void
fw_plot_stack_class_init (FwPlotStackClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = fw_plot_stack_dispose;
  object_class->finalize = fw_plot_stack_finalize;

  signals[SIGNAL_READOUT] =
    g_signal_new ("readout", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL, NULL,
                  G_TYPE_NONE, 1, G_TYPE_STRING);
  signals[SIGNAL_STATE_CHANGED] =
    g_signal_new ("state-changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 0);
  signals[SIGNAL_UNPIN] =
    g_signal_new ("unpin", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL, NULL,
                  G_TYPE_NONE, 0);

  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "fwplotstack");
}

static void
fw_plot_stack_init (FwPlotStack *self)
{
  GtkEventController *keys = gtk_shortcut_controller_new ();

  self->kinds = g_array_new (FALSE, FALSE, sizeof (FwPlotKind));
  self->n_columns = 1;

  self->box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  gtk_widget_set_parent (self->box, GTK_WIDGET (self));
  self->header_grid = GTK_GRID (gtk_grid_new ());
  gtk_grid_set_column_homogeneous (self->header_grid, TRUE);
  gtk_grid_set_column_spacing (self->header_grid, 12);
  gtk_widget_add_css_class (GTK_WIDGET (self->header_grid), "fw-stack-header");
  self->rows_grid = GTK_GRID (gtk_grid_new ());
  gtk_grid_set_column_homogeneous (self->rows_grid, TRUE);
  gtk_grid_set_column_spacing (self->rows_grid, 12);
  gtk_grid_set_row_spacing (self->rows_grid, 4);
  self->scrolled = gtk_scrolled_window_new ();
  gtk_scrolled_window_set_policy (GTK_SCROLLED_WINDOW (self->scrolled), GTK_POLICY_NEVER,
                                  GTK_POLICY_AUTOMATIC);
  gtk_widget_set_vexpand (self->scrolled, TRUE);
  gtk_scrolled_window_set_child (GTK_SCROLLED_WINDOW (self->scrolled), GTK_WIDGET (self->rows_grid));
  gtk_box_append (GTK_BOX (self->box), GTK_WIDGET (self->header_grid));
  gtk_box_append (GTK_BOX (self->box), self->scrolled);

  for (guint c = 0; c < MAX_COLUMNS; c++)
    {
      Column *col = &self->columns[c];

      col->rows = g_ptr_array_new ();
      col->header = g_object_ref_sink (gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6));
      col->title = gtk_label_new (NULL);
      gtk_label_set_ellipsize (GTK_LABEL (col->title), PANGO_ELLIPSIZE_MIDDLE);
      gtk_widget_set_hexpand (col->title, TRUE);
      gtk_widget_add_css_class (col->title, "heading");
      gtk_box_append (GTK_BOX (col->header), col->title);
      if (c == 1)
        {
          GtkWidget *unpin = gtk_button_new_from_icon_name ("window-close-symbolic");
          gtk_widget_add_css_class (unpin, "flat");
          gtk_widget_set_tooltip_text (unpin, _("Close the second column"));
          gtk_accessible_update_property (GTK_ACCESSIBLE (unpin), GTK_ACCESSIBLE_PROPERTY_LABEL,
                                          _("Close the second column"), -1);
          g_signal_connect (unpin, "clicked", G_CALLBACK (on_unpin_clicked), self);
          gtk_box_append (GTK_BOX (col->header), unpin);
        }
      col->ruler = g_object_ref_sink (fw_time_ruler_new (NULL));
    }

  /* Keys that act on the plots when they have the focus. */
  gtk_shortcut_controller_set_scope (GTK_SHORTCUT_CONTROLLER (keys), GTK_SHORTCUT_SCOPE_LOCAL);
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_plus, 0, "win.zoom-in");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_plus, GDK_SHIFT_MASK, "win.zoom-in");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_equal, 0, "win.zoom-in");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_KP_Add, 0, "win.zoom-in");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_minus, 0, "win.zoom-out");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_KP_Subtract, 0, "win.zoom-out");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_0, 0, "win.zoom-fit");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_KP_0, 0, "win.zoom-fit");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_f, 0, "win.zoom-fit");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Left, 0, "win.pan-left");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Right, 0, "win.pan-right");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Escape, 0, "win.clear-selection");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Left, GDK_SHIFT_MASK, "win.cursor-left");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Right, GDK_SHIFT_MASK, "win.cursor-right");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Left, GDK_SHIFT_MASK | GDK_CONTROL_MASK,
                "win.select-left");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Right, GDK_SHIFT_MASK | GDK_CONTROL_MASK,
                "win.select-right");
  gtk_widget_add_controller (GTK_WIDGET (self), keys);
}

GtkWidget *
fw_plot_stack_new (void)
{
  return g_object_new (FW_TYPE_PLOT_STACK, NULL);
}
