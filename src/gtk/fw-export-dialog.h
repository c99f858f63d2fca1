/* fw-export-dialog.h: export the rows of a clip and parameter set as a figure for a paper.
 *
 * Rows, size in mm (single column 85 mm, double column 175 mm, or custom), DPI, font, colour
 * scale, format (SVG, PDF, PNG) and time range (whole clip, visible, selection), with a
 * preview drawn by the same figure code that writes the file (src/render).
 */
#pragma once

#include <gtk/gtk.h>

#include "fw-feature-cache.h"
#include "fw-param-set.h"
#include "fw-plot-row.h"
#include "fw-viewport.h"

G_BEGIN_DECLS

#define FW_TYPE_EXPORT_DIALOG (fw_export_dialog_get_type ())
G_DECLARE_FINAL_TYPE (FwExportDialog, fw_export_dialog, FW, EXPORT_DIALOG, GtkWindow)

GtkWidget *fw_export_dialog_new (GtkWindow *parent, FwFeatureCache *cache, FwViewport *viewport,
                                 FwClip *clip, FwParamSet *set, const FwPlotKind *rows,
                                 guint n_rows);

/* Writes the figure as the dialog is set up now (format from the extension unless the format
 * choice says otherwise). Blocks until the features are computed. */
gboolean fw_export_dialog_export_to_file (FwExportDialog *self, const char *path,
                                          GError **error);

/* For tests: choose a format ("svg", "pdf", "png") and time range ("whole", "visible",
 * "selection"). */
void fw_export_dialog_set_format (FwExportDialog *self, const char *format);
void fw_export_dialog_set_time_range (FwExportDialog *self, const char *which);

G_END_DECLS
