/* fw-render-error.h: the error domain of the drawing and export layer. */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

#define FW_RENDER_ERROR (fw_render_error_quark ())
GQuark fw_render_error_quark (void);

typedef enum {
  FW_RENDER_ERROR_INVALID,    /* a setting is out of range: names it, its value and what is allowed */
  FW_RENDER_ERROR_FORMAT,     /* unknown output format (file extension) */
  FW_RENDER_ERROR_IO,         /* writing or reading a file failed: names the file and cause */
  FW_RENDER_ERROR_NO_RECIPE,  /* a figure file carries no Framewise recipe */
  FW_RENDER_ERROR_BAD_RECIPE, /* a recipe is malformed or its hash does not match */
  FW_RENDER_ERROR_CAIRO,      /* cairo reported an error (names it) */
} FwRenderError;

G_END_DECLS
