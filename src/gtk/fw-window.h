/* fw-window.h: the workbench window: sidebar, linked plot rows, parameter editor. */
#pragma once

#include <gtk/gtk.h>

#include "fw-application.h"
#include "fw-project.h"

G_BEGIN_DECLS

#define FW_TYPE_WINDOW (fw_window_get_type ())
G_DECLARE_FINAL_TYPE (FwWindow, fw_window, FW, WINDOW, GtkApplicationWindow)

FwWindow *fw_window_new (FwApplication *app);

/* Shows `project` (the window takes a reference). */
void fw_window_set_project (FwWindow *self, FwProject *project);
FwProject *fw_window_get_project (FwWindow *self);

/* Opens a project file; on failure shows the error in the window (naming the file and
 * the cause) and returns FALSE, keeping what was shown. */
gboolean fw_window_open_project (FwWindow *self, const char *path);
/* Opens the built-in demo project (a failure is shown in the window). */
void fw_window_open_demo (FwWindow *self);
/* A new unsaved project holding these audio files (unreadable ones are reported). */
void fw_window_new_project_with_clips (FwWindow *self, GFile **files, guint n_files);
/* Adds audio files to the project; each unreadable one gets a message. */
void fw_window_add_clip_files (FwWindow *self, GFile **files, guint n_files);
/* TRUE when `file` looks like a project rather than audio. */
gboolean fw_window_file_is_project (GFile *file);

/* Opens the compare view on a new comparison, saved in the project. A side is "CLIP@SET" (a
 * clip of the project by path or file name, a parameter set by name) or the path of a feature
 * file (.npy or .csv, taken to be on the other side's frame grid). stage: a stage name
 * ("db", "mel-db", "mfcc", ...; NULL for "db"). Errors name the side and the cause. */
gboolean fw_window_compare (FwWindow *self, const char *a, const char *b, const char *stage,
                            GError **error);
/* Opens a saved comparison by its name or its 1-based number in the project. */
gboolean fw_window_open_comparison_by_name (FwWindow *self, const char *name, GError **error);

/* Saves to the project's path (or `path` when not NULL). Errors are shown in the window. */
gboolean fw_window_save (FwWindow *self, const char *path);

/* A message inside the window (no dialog). */
void fw_window_show_error (FwWindow *self, const char *message);
void fw_window_show_info (FwWindow *self, const char *message);

/* TRUE when no computation is pending and every row shows its result (or its error). */
gboolean fw_window_is_settled (FwWindow *self);

/* Waits until the window is settled and a frame has been drawn, then writes a PNG of the
 * window. width, height > 0: first resizes the window to exactly that size (as far as the
 * screen allows; a smaller result is reported on stderr). */
void fw_window_screenshot_async (FwWindow *self, const char *png_path, int width, int height,
                                 GCancellable *cancellable, GAsyncReadyCallback callback,
                                 gpointer user_data);
gboolean fw_window_screenshot_finish (FwWindow *self, GAsyncResult *result, GError **error);

/* Renders the window now into a texture (for tests and screenshots). */
GdkTexture *fw_window_render_texture (FwWindow *self);

/* Closes without asking about unsaved changes. */
void fw_window_close_discarding (FwWindow *self);

G_END_DECLS
