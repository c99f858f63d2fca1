/* fw-types.h: forward declarations for the model layer, to avoid include cycles. */
#pragma once

#include <glib-object.h>

G_BEGIN_DECLS

typedef struct _FwClip FwClip;
typedef struct _FwParamSet FwParamSet;
typedef struct _FwComparison FwComparison;
typedef struct _FwProject FwProject;
typedef struct _FwFeatureCache FwFeatureCache;
typedef struct _FwViewport FwViewport;

G_END_DECLS
