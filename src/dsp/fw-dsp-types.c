/* fw-dsp-types.c: status descriptions for the signal-processing layer. */
#include "fw-dsp-types.h"

const char *
fw_dsp_status_describe (FwDspStatus status)
{
  switch (status)
    {
    case FW_DSP_OK:
      return "success";
    case FW_DSP_ERROR_INVALID_ARGUMENT:
      return "invalid analysis parameter";
    case FW_DSP_ERROR_TOO_SHORT:
      return "signal shorter than one frame";
    case FW_DSP_ERROR_NO_MEMORY:
      return "out of memory";
    case FW_DSP_ERROR_CANCELLED:
      return "cancelled";
    default:
      return "unknown status";
    }
}
