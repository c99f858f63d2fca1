/* fw-render-error.c: the error domain of the drawing and export layer. */
#include "fw-render-error.h"

G_DEFINE_QUARK (fw-render-error-quark, fw_render_error)
