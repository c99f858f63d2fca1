/* fw-params-editor.h: editor for the selected parameter set, with live derived facts.
 *
 * Fields are grouped (framing, window, spectrum, mel, log, cepstrum, deltas) and carry units;
 * window and hop can be typed in samples or milliseconds (the exact sample count is shown).
 * Facts (window and hop in ms, frames per second, Hz per bin, equivalent noise bandwidth,
 * sidelobe level, mel band edges, feature size) and the core's validation messages follow
 * every keystroke. A valid edit is applied to the set (a new FwParams value) when the user
 * presses Enter, leaves the field, or changes a choice; an invalid one shows its message
 * beside the field and is not applied, so the plots keep the last good result.
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-project.h"

G_BEGIN_DECLS

#define FW_TYPE_PARAMS_EDITOR (fw_params_editor_get_type ())
G_DECLARE_FINAL_TYPE (FwParamsEditor, fw_params_editor, FW, PARAMS_EDITOR, GtkWidget)

GtkWidget *fw_params_editor_new (void);

/* The set edited (NULL: nothing to edit). */
void fw_params_editor_set_param_set (FwParamsEditor *self, FwParamSet *set);
FwParamSet *fw_params_editor_get_param_set (FwParamsEditor *self);
/* The clip whose rate and length the facts and checks use (NULL: none). */
void fw_params_editor_set_clip (FwParamsEditor *self, FwClip *clip);

/* TRUE while the clip's facts (rate, length) are being read. */
gboolean fw_params_editor_is_busy (FwParamsEditor *self);

/* Applies the fields now if they are valid; FALSE (nothing applied) otherwise. */
gboolean fw_params_editor_commit (FwParamsEditor *self);

/* For tests and keyboard navigation: the entry or choice widget of a key. */
GtkWidget *fw_params_editor_get_field (FwParamsEditor *self, const char *key);
/* The message shown beside a key's field, or NULL when it has none. */
const char *fw_params_editor_get_field_message (FwParamsEditor *self, const char *key);
/* Text of a derived fact by id: "window", "hop", "fps", "bin", "enbw", "sidelobe",
 * "mel", "frames", "size", "rate", "hash"; NULL if unknown. */
const char *fw_params_editor_get_fact (FwParamsEditor *self, const char *id);

G_END_DECLS
