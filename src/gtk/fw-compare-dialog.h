/* fw-compare-dialog.h: choosing the two sides of a new comparison.
 *
 * Side A is a clip of the project with a parameter set; side B another clip and set, or an
 * imported feature file (NPY or CSV) with its axis order and frame timing: on A's frame grid,
 * from a hop and sample rate (plus the centre time of its first frame), or from a CSV time
 * column. The stage says what both sides hold. Problems (same source twice, no file, a hop
 * of 0) are said inside the dialog, naming the field. On "Compare" the dialog emits
 * "compare" (FwComparison *, not yet in the project) and closes.
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-analysis.h"
#include "fw-project.h"

G_BEGIN_DECLS

#define FW_TYPE_COMPARE_DIALOG (fw_compare_dialog_get_type ())
G_DECLARE_FINAL_TYPE (FwCompareDialog, fw_compare_dialog, FW, COMPARE_DIALOG, GtkWindow)

/* Presets (any may be NULL): A's clip and set, B's clip and set. */
FwCompareDialog *fw_compare_dialog_new (GtkWindow *parent, FwProject *project, FwClip *a_clip,
                                        FwParamSet *a_set, FwClip *b_clip, FwParamSet *b_set,
                                        FwStage stage);

/* For tests: B from a feature file with these options instead of a clip. */
void fw_compare_dialog_set_file (FwCompareDialog *self, const char *path);
/* Builds the comparison from what the dialog shows; NULL with a message naming the field. */
FwComparison *fw_compare_dialog_build (FwCompareDialog *self, GError **error);

G_END_DECLS
