/* fw-param-set.h: a named parameter set of a project: a name plus an immutable FwParams.
 *
 * Editing replaces the FwParams value ("params" notifies); renaming changes "name". Work in
 * flight keeps the FwParams it started with, which stays valid.
 */
#pragma once

#include <glib-object.h>

#include "fw-params.h"
#include "fw-types.h"

G_BEGIN_DECLS

#define FW_TYPE_PARAM_SET (fw_param_set_get_type ())
G_DECLARE_FINAL_TYPE (FwParamSet, fw_param_set, FW, PARAM_SET, GObject)

FwParamSet *fw_param_set_new (const char *name, FwParams *params);
const char *fw_param_set_get_name (FwParamSet *self);
void fw_param_set_set_name (FwParamSet *self, const char *name);
FwParams *fw_param_set_get_params (FwParamSet *self);      /* transfer none */
void fw_param_set_set_params (FwParamSet *self, FwParams *params);
/* A new set with the same params and the given name. */
FwParamSet *fw_param_set_duplicate (FwParamSet *self, const char *new_name);

G_END_DECLS
