/* fw-recipe.h: the provenance recipe embedded in every exported figure.
 *
 * Text of our own, two GKeyFile groups; the parameter group is the parameter set's canonical
 * text copied verbatim (fw_params_get_text), so its hash can be checked and the features
 * recomputed exactly:
 *
 *   [framewise-figure]
 *   format=1
 *   generator=Framewise 0.1.0
 *   clip=data/demo/calm-colony-1.flac
 *   parameter_set=long-window          (absent when the parameters came from a file or --set)
 *   parameters_hash=0123456789abcdef
 *   analysis_rate=22050
 *   rows=waveform;db;mel-db;mfcc
 *   start=0
 *   end=4.5
 *   frequency_scale=linear
 *   colour_scales=kiln;kiln;kiln    (one per heatmap row, in row order)
 *   spectrum=whole                     (or none, frame:T, range:T0:T1)
 *
 *   [framewise-parameters]
 *   format=1
 *   sample_rate=22050
 *   ...
 *
 * SVG carries it in <metadata> (element recipe in namespace FW_RECIPE_XML_NS), PDF in the
 * Keywords entry as FW_RECIPE_PDF_TAG followed by the recipe in base64, PNG in an iTXt chunk
 * with keyword FW_RECIPE_PNG_KEYWORD.
 */
#pragma once

#include <glib.h>

#include "fw-params.h"

G_BEGIN_DECLS

#define FW_RECIPE_GROUP "framewise-figure"
#define FW_RECIPE_FORMAT 1
#define FW_RECIPE_XML_NS "urn:x-framewise:figure-recipe:1"
#define FW_RECIPE_PDF_TAG "framewise-recipe-base64:"
#define FW_RECIPE_PNG_KEYWORD "framewise-recipe"

typedef struct {
  char *generator;
  char *clip;
  char *param_set;        /* NULL when none */
  char *params_text;      /* canonical parameter text, verbatim */
  char *params_hash;      /* the hash recorded when the figure was made */
  double analysis_rate;
  char **rows;            /* NULL-terminated row names */
  double start, end;      /* seconds */
  char *frequency_scale;
  char **colour_scales;   /* NULL-terminated */
  char *spectrum;         /* "none", "whole", "frame:T", "range:T0:T1" */
} FwRecipe;

FwRecipe *fw_recipe_new (void);
void fw_recipe_free (FwRecipe *recipe);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwRecipe, fw_recipe_free)

/* Serialises (numbers in C locale). Caller frees. */
char *fw_recipe_to_text (const FwRecipe *recipe);
/* Parses recipe text; errors (FW_RENDER_ERROR_BAD_RECIPE) name the missing or bad key. */
FwRecipe *fw_recipe_parse (const char *text, gssize length, GError **error);
/* Parses the embedded parameter text and checks it against the recorded hash: a mismatch is an
 * error naming both hashes. */
FwParams *fw_recipe_dup_params (const FwRecipe *recipe, GError **error);

G_END_DECLS
