/* fw-compare-private.h: what fw-compare.c shares with fw-compare-explain.c. */
#pragma once

#include "fw-compare.h"

G_BEGIN_DECLS

/* FwMatrix is plain C (src/dsp); a local alias gives it g_autoptr here without clashing with
 * a cleanup declared elsewhere for FwMatrix itself. */
typedef FwMatrix FwCmpMatrix;
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwCmpMatrix, fw_matrix_unref)

typedef enum {
  FW_COMPARE_OP_CLIP,
  FW_COMPARE_OP_AUDIO,
  FW_COMPARE_OP_FILE,
  FW_COMPARE_OP_MATRIX,
} FwCompareOpKind;

struct _FwCompareOperand {
  gint ref_count;
  FwCompareOpKind kind;
  char *path;
  char *label;
  FwParams *params;
  FwStage stage;
  FwAudio *audio;
  FwFeatureFileOptions file_options;
  FwFeatureFile *file;
  FwMatrix *matrix;
  GMutex lock;
};

FwAudio *_fw_compare_operand_audio_for (FwCompareOperand *op, FwParams *params,
                                        GCancellable *cancellable, GError **error);
const FwFeatureFile *_fw_compare_operand_file (FwCompareOperand *op);
int _fw_compare_n_workers (void);
char *_fw_compare_fmt_g (double v);
FwCompareResult *_fw_compare_matrices (FwMatrix *ma, FwMatrix *mb, const FwFeatureFile *fa,
                                       const FwFeatureFile *fb, const char *label_a,
                                       const char *label_b, FwStage stage,
                                       const FwParams *params, const FwDiffOptions *options,
                                       GError **error);
void _fw_json_str (GString *s, const char *v);
void _fw_json_num (GString *s, double v);
void _fw_json_key (GString *s, const char *key, gboolean *first);
void _fw_json_strv (GString *s, char *const *v, guint n);
void _fw_compare_json_body (GString *s, const FwCompareResult *r, double tolerance,
                            gboolean *first);

G_END_DECLS
