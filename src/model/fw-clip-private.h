/* fw-clip-private.h: in-tree helpers of FwClip (tests and the feature cache). */
#pragma once

#include "fw-clip.h"

G_BEGIN_DECLS

/* Number of decoded audio entries the clip holds now (alive or not yet swept). */
guint _fw_clip_get_n_decoded (FwClip *self);

G_END_DECLS
