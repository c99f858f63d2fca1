/* fw-clip-list.h: the sidebar's clip list, grouped under class-label headings.
 *
 * Shows the clips of a project sorted by label (clips without a label last, under
 * "No label"), each with its rate, duration and channels, or a "file not found" flag.
 * Each row has a menu (set label, relink, show beside, remove) that activates window
 * actions with the clip's path as target. Files dropped on the list are offered through the
 * "files-dropped" signal.
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-project.h"

G_BEGIN_DECLS

#define FW_TYPE_CLIP_LIST (fw_clip_list_get_type ())
G_DECLARE_FINAL_TYPE (FwClipList, fw_clip_list, FW, CLIP_LIST, GtkWidget)

GtkWidget *fw_clip_list_new (void);

/* Shows the clips of `project` (NULL clears); rebuilds on the project's "changed". */
void fw_clip_list_set_project (FwClipList *self, FwProject *project);
/* Property "selected-clip" (FwClip*, may be NULL). */
FwClip *fw_clip_list_get_selected (FwClipList *self);
void fw_clip_list_select (FwClipList *self, FwClip *clip);

/* Signals: "files-dropped" (GdkFileList *files). */

G_END_DECLS
