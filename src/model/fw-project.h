/* fw-project.h: the document. Clips with class labels, named parameter sets, saved
 * comparisons and project-wide settings; saved as a text file of our own (fw-project-file.c).
 */
#pragma once

#include <gio/gio.h>

#include "fw-analysis.h"
#include "fw-clip.h"
#include "fw-param-set.h"
#include "fw-types.h"

G_BEGIN_DECLS

#define FW_PROJECT_ERROR (fw_project_error_quark ())
GQuark fw_project_error_quark (void);

typedef enum {
  FW_PROJECT_ERROR_PARSE,        /* malformed text: names the line */
  FW_PROJECT_ERROR_INVALID,      /* bad key / type / duplicate name: names the group and key */
  FW_PROJECT_ERROR_NEWER_FORMAT, /* written by a newer Framewise */
  FW_PROJECT_ERROR_DUPLICATE,    /* a parameter set with that name exists */
  FW_PROJECT_ERROR_IO,
} FwProjectError;

#define FW_PROJECT_FORMAT_VERSION 1
#define FW_PROJECT_DEFAULT_CACHE_BUDGET ((guint64) 1 << 30)

/* One side of a saved comparison: a (clip, parameter set, stage) of the project, or an
 * imported feature file. */
typedef enum { FW_OPERAND_CLIP, FW_OPERAND_FILE } FwOperandKind;

#define FW_TYPE_COMPARISON (fw_comparison_get_type ())
G_DECLARE_FINAL_TYPE (FwComparison, fw_comparison, FW, COMPARISON, GObject)

/* Operand strings: for FW_OPERAND_CLIP `clip` is the clip path and `param_set` the set's name;
 * for FW_OPERAND_FILE `clip` is the feature file path and `options` free text the compare
 * code reads (axis order, hop, sample rate). `stage` is the stage name for both sides. */
FwComparison *fw_comparison_new (const char *name, const char *stage);
const char *fw_comparison_get_name (FwComparison *self);
const char *fw_comparison_get_stage (FwComparison *self);
void fw_comparison_set_operand (FwComparison *self, guint side, FwOperandKind kind,
                                const char *clip, const char *param_set, const char *options);
FwOperandKind fw_comparison_get_kind (FwComparison *self, guint side);
const char *fw_comparison_get_clip (FwComparison *self, guint side);
const char *fw_comparison_get_param_set (FwComparison *self, guint side);
const char *fw_comparison_get_options (FwComparison *self, guint side);

#define FW_TYPE_PROJECT (fw_project_get_type ())
G_DECLARE_FINAL_TYPE (FwProject, fw_project, FW, PROJECT, GObject)

FwProject *fw_project_new (void);

/* List models (item types FwClip, FwParamSet, FwComparison). Do not modify them directly. */
GListModel *fw_project_get_clips (FwProject *self);
GListModel *fw_project_get_param_sets (FwProject *self);
GListModel *fw_project_get_comparisons (FwProject *self);

void fw_project_add_clip (FwProject *self, FwClip *clip);
void fw_project_remove_clip (FwProject *self, FwClip *clip);
FwClip *fw_project_find_clip (FwProject *self, const char *path_or_name);  /* transfer none */
/* Fails with FW_PROJECT_ERROR_DUPLICATE when the name is taken. */
gboolean fw_project_add_param_set (FwProject *self, FwParamSet *set, GError **error);
void fw_project_remove_param_set (FwProject *self, FwParamSet *set);
gboolean fw_project_rename_param_set (FwProject *self, FwParamSet *set, const char *name,
                                      GError **error);
FwParamSet *fw_project_find_param_set (FwProject *self, const char *name); /* transfer none */
/* A name not yet used, from a base ("long-window copy", "long-window copy 2", ...). */
char *fw_project_unique_param_set_name (FwProject *self, const char *base);
void fw_project_add_comparison (FwProject *self, FwComparison *cmp);
void fw_project_remove_comparison (FwProject *self, FwComparison *cmp);

/* Properties: "path" (file it was loaded from / saved to, or NULL), "dirty",
 * "cache-budget" (bytes), "title". Signal "changed" on any change to the document
 * (clips, labels, sets, parameters, comparisons, settings). */
const char *fw_project_get_path (FwProject *self);
gboolean fw_project_get_dirty (FwProject *self);
void fw_project_mark_clean (FwProject *self);
guint64 fw_project_get_cache_budget (FwProject *self);
void fw_project_set_cache_budget (FwProject *self, guint64 bytes);
const char *fw_project_get_title (FwProject *self);
void fw_project_set_title (FwProject *self, const char *title);

/* The project's feature cache, created on first use with "cache-budget" (which it then
 * follows). Removing a clip or a set drops its entries; editing a set's parameters cancels
 * only the jobs keyed on the old value (when no other set shares it). Transfer none. */
FwFeatureCache *fw_project_get_feature_cache (FwProject *self);

/* Project file (text, our own format, see fw-project-file.c). Loading never half-loads:
 * on error NULL and a message that names the line or key. Saving is atomic and keeps the
 * previous file as PATH~ . */
FwProject *fw_project_load (const char *path, GError **error);
FwProject *fw_project_load_from_data (const char *data, gssize length, const char *path,
                                      GError **error);
gboolean fw_project_save (FwProject *self, const char *path, GError **error);
char *fw_project_to_data (FwProject *self, const char *path);

/* The built-in demo project (data/demo/), found next to the source tree or in the installed
 * data directory. */
char *fw_project_demo_path (void);
FwProject *fw_project_load_demo (GError **error);

G_END_DECLS
