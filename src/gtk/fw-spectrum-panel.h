/* fw-spectrum-panel.h: the spectrum at the cursor frame, or averaged over the selection.
 *
 * Frequency on the x axis, the dB spectrum (the parameter set's db stage) on the y axis,
 * drawn by the render layer's spectrum plot. Without cursor or selection it shows the mean
 * over the whole clip. Averages are taken over power (or magnitude) values, then shown in dB.
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-feature-cache.h"
#include "fw-param-set.h"
#include "fw-viewport.h"

G_BEGIN_DECLS

#define FW_TYPE_SPECTRUM_PANEL (fw_spectrum_panel_get_type ())
G_DECLARE_FINAL_TYPE (FwSpectrumPanel, fw_spectrum_panel, FW, SPECTRUM_PANEL, GtkWidget)

GtkWidget *fw_spectrum_panel_new (void);

void fw_spectrum_panel_set_context (FwSpectrumPanel *self, FwFeatureCache *cache,
                                    FwViewport *viewport);
void fw_spectrum_panel_set_source (FwSpectrumPanel *self, FwClip *clip, FwParamSet *set);
gboolean fw_spectrum_panel_is_busy (FwSpectrumPanel *self);

/* What is shown: the frames used (first, count), their time span and the values (dB). */
guint fw_spectrum_panel_get_frames (FwSpectrumPanel *self, guint *first);
void fw_spectrum_panel_get_span (FwSpectrumPanel *self, double *t0, double *t1);
const double *fw_spectrum_panel_get_values (FwSpectrumPanel *self, gsize *n_bins);
/* The heading ("Spectrum at 1.250 s (frame 54)"). */
const char *fw_spectrum_panel_get_title (FwSpectrumPanel *self);

G_END_DECLS
