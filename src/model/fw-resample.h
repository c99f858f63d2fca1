/* fw-resample.h: sample-rate conversion of one channel with libsoxr (the only user of soxr).
 *
 * Quality is soxr's "high quality" recipe (SOXR_HQ: 20-bit precision, linear phase), the
 * setting issue 2 asks for. Input and output are float32 mono.
 */
#pragma once

#include <gio/gio.h>

G_BEGIN_DECLS

/* Converts n samples at in_rate to out_rate. On success *out (g_free) holds *n_out samples,
 * about n * out_rate / in_rate. Checks `cancellable` between blocks. Errors are
 * FW_AUDIO_ERROR_RESAMPLE (soxr's message) or G_IO_ERROR_CANCELLED. */
gboolean fw_resample (const float *in, gsize n, double in_rate, double out_rate,
                      float **out, gsize *n_out, GCancellable *cancellable, GError **error);

G_END_DECLS
