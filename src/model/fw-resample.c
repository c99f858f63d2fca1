/* fw-resample.c: sample-rate conversion with libsoxr, high quality (SOXR_HQ). */
#include "fw-config.h"

#include <math.h>

#include <glib/gi18n.h>
#include <soxr.h>

#include "fw-audio.h"
#include "fw-resample.h"

#define BLOCK 65536

gboolean
fw_resample (const float *in, gsize n, double in_rate, double out_rate, float **out,
             gsize *n_out, GCancellable *cancellable, GError **error)
{
  soxr_error_t err = NULL;
  soxr_io_spec_t io = soxr_io_spec (SOXR_FLOAT32_I, SOXR_FLOAT32_I);
  soxr_quality_spec_t q = soxr_quality_spec (SOXR_HQ, 0);
  soxr_t soxr;
  gsize cap, len = 0, pos = 0;
  float *buf;

  g_return_val_if_fail (in != NULL || n == 0, FALSE);
  g_return_val_if_fail (in_rate > 0 && out_rate > 0, FALSE);
  g_return_val_if_fail (out != NULL && n_out != NULL, FALSE);

  soxr = soxr_create (in_rate, out_rate, 1, &err, &io, &q, NULL);
  if (soxr == NULL || err != NULL)
    {
      g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_RESAMPLE,
                   _("cannot resample from %g Hz to %g Hz: %s"), in_rate, out_rate,
                   err != NULL ? err : "soxr_create failed");
      if (soxr != NULL)
        soxr_delete (soxr);
      return FALSE;
    }

  cap = (gsize) ceil ((double) n * out_rate / in_rate) + 1024;
  buf = g_new (float, cap);

  /* Feed blocks, then flush (in = NULL) until soxr has nothing left. */
  for (;;)
    {
      gsize ilen = MIN ((gsize) BLOCK, n - pos);
      gboolean flushing = pos >= n;
      size_t idone = 0, odone = 0;

      if (g_cancellable_set_error_if_cancelled (cancellable, error))
        {
          soxr_delete (soxr);
          g_free (buf);
          return FALSE;
        }
      if (cap - len < (gsize) BLOCK)
        {
          cap = cap * 2 + BLOCK;
          buf = g_renew (float, buf, cap);
        }
      err = soxr_process (soxr, flushing ? NULL : in + pos, flushing ? 0 : ilen, &idone,
                          buf + len, cap - len, &odone);
      if (err != NULL)
        {
          g_set_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_RESAMPLE,
                       _("cannot resample from %g Hz to %g Hz: %s"), in_rate, out_rate, err);
          soxr_delete (soxr);
          g_free (buf);
          return FALSE;
        }
      pos += idone;
      len += odone;
      if (flushing && odone == 0)
        break;
    }

  soxr_delete (soxr);
  *out = buf;
  *n_out = len;
  return TRUE;
}
