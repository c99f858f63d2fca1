/* fw-window-private.h: FwWindow's instance struct, shared by fw-window.c and
 * fw-window-actions.c, plus in-tree helpers for tests. */
#pragma once

#include "fw-window.h"

#include "fw-clip-list.h"
#include "fw-compare-view.h"
#include "fw-feature-cache.h"
#include "fw-params-editor.h"
#include "fw-plot-stack.h"
#include "fw-spectrum-panel.h"
#include "fw-viewport.h"

G_BEGIN_DECLS

struct _FwWindow {
  GtkApplicationWindow parent_instance;

  /* template children */
  GtkLabel *title_label;
  GtkLabel *subtitle_label;
  GtkWidget *banner_box;
  GtkImage *banner_icon;
  GtkLabel *banner_label;
  GtkButton *banner_close;
  GtkPaned *outer_paned;
  GtkWidget *sidebar;
  FwClipList *clip_list;
  GtkListBox *set_list;
  GtkListBox *comparison_list;
  GtkStack *main_stack;
  FwCompareView *compare_view;
  GtkMenuButton *rows_button;
  GtkPopover *rows_popover;
  GtkBox *rows_box;
  GtkLabel *view_label;
  FwPlotStack *plot_stack;
  FwSpectrumPanel *spectrum_panel;
  FwParamsEditor *params_editor;
  GtkLabel *readout_label;
  GtkWidget *progress_box;
  GtkLabel *progress_label;
  GtkProgressBar *progress_bar;
  GMenu *recent_section;

  /* document and view state */
  FwProject *project;
  FwFeatureCache *cache;
  FwViewport *viewport;
  FwClip *clip;            /* column 0 */
  FwParamSet *set;
  FwClip *pinned_clip;     /* column 1: a second clip with the same set, or */
  FwParamSet *pinned_set;  /* a second set with the same clip */
  GArray *rows;            /* FwPlotKind, in display order */
  gulong project_changed_id;
  gulong project_dirty_id;
  gulong cache_progress_id;
  gboolean updating_sets;
  gboolean updating_comparisons;
  gboolean close_confirmed;
  guint duration_idle;
  guint adding_clips;      /* files being checked before they join the project */
  char *clip_identity[2];  /* path|size|mtime of the clips shown, to notice relinks */
  FwClip *identity_clip[2];  /* (unowned, compared only) */
  char *default_readout;
};

/* fw-window-actions.c */
void _fw_window_install_actions (FwWindow *self);
void _fw_window_update_action_states (FwWindow *self);
void _fw_window_rebuild_recent_menu (FwWindow *self);

/* fw-window.c, used by the actions */
void _fw_window_select (FwWindow *self, FwClip *clip, FwParamSet *set);
void _fw_window_pin (FwWindow *self, FwClip *clip, FwParamSet *set);
void _fw_window_set_rows (FwWindow *self, const FwPlotKind *kinds, guint n, gboolean remember);
void _fw_window_rebuild_rows_popover (FwWindow *self);
FwClip *_fw_window_find_clip (FwWindow *self, const char *path);
void _fw_window_ask_text (FwWindow *self, const char *title, const char *prompt,
                          const char *initial, const char *accept_label,
                          void (*done) (FwWindow *self, const char *text, gpointer data),
                          gpointer data, GDestroyNotify destroy);

/* Comparisons (fw-window.c): the compare view in place of the plots. */
void _fw_window_open_comparison (FwWindow *self, FwComparison *cmp);
/* Adds a new comparison to the project and opens it. */
void _fw_window_start_comparison (FwWindow *self, FwComparison *cmp);
void _fw_window_close_compare (FwWindow *self);
gboolean _fw_window_compare_shown (FwWindow *self);
/* The compare dialog with A and B preset (any may be NULL). */
void _fw_window_ask_comparison (FwWindow *self, FwClip *a_clip, FwParamSet *a_set,
                                FwClip *b_clip, FwParamSet *b_set);

/* For tests: the parts of the window. */
FwCompareView *_fw_window_get_compare_view (FwWindow *self);
FwPlotStack *_fw_window_get_plot_stack (FwWindow *self);
FwParamsEditor *_fw_window_get_params_editor (FwWindow *self);
FwSpectrumPanel *_fw_window_get_spectrum_panel (FwWindow *self);
FwViewport *_fw_window_get_viewport (FwWindow *self);
FwFeatureCache *_fw_window_get_cache (FwWindow *self);
const char *_fw_window_get_banner_text (FwWindow *self);   /* NULL when hidden */
FwClip *_fw_window_get_clip (FwWindow *self);
FwParamSet *_fw_window_get_param_set (FwWindow *self);

G_END_DECLS
