/* fw-dsp-types.h: status codes shared by the signal-processing layer.
 *
 * src/dsp is plain C11 + FFTW3f + libm. No GLib or GTK in any header here.
 */
#pragma once

#include <stdbool.h>
#include <stddef.h>

#ifdef __cplusplus
extern "C" {
#endif

typedef enum {
  FW_DSP_OK = 0,
  FW_DSP_ERROR_INVALID_ARGUMENT, /* a parameter is out of range; see fw_analysis_check() */
  FW_DSP_ERROR_TOO_SHORT,        /* the signal is shorter than one analysis frame */
  FW_DSP_ERROR_NO_MEMORY,
  FW_DSP_ERROR_CANCELLED,        /* the progress callback asked to stop */
} FwDspStatus;

/* A short English description of a status, for messages ("signal shorter than one frame"). */
const char *fw_dsp_status_describe (FwDspStatus status);

#ifdef __cplusplus
}
#endif
