/* fw-export.h: figures to SVG, PDF and PNG files, with their recipe embedded.
 *
 *   SVG  cairo SVG surface in millimetres: width="Wmm" height="Hmm" exactly; user units are mm.
 *        Text is set by Pango (cairo writes glyph outlines as <symbol>/<use>); each heatmap is
 *        one <image> at `dpi`; lines and axes are paths. A <title>, a <desc> (the methods
 *        sentence) and a <metadata> element holding the recipe (XML-escaped, in element
 *        "recipe" of namespace FW_RECIPE_XML_NS) are inserted after the root element's start tag.
 *   PDF  page of W x H mm (in points: mm / 25.4 * 72). Info dictionary: Title, Subject (the
 *        methods sentence), Keywords (FW_RECIPE_PDF_TAG + the recipe in base64, then the hash),
 *        Creator. Heatmaps are one image each at `dpi`.
 *   PNG  exactly round(W / 25.4 * dpi) x round(H / 25.4 * dpi) pixels; a pHYs chunk records the
 *        density, iTXt chunks hold the recipe (keyword FW_RECIPE_PNG_KEYWORD), the methods
 *        sentence ("Description") and the software ("Software").
 * Files are written atomically (temporary file + rename).
 */
#pragma once

#include <glib.h>

#include "fw-figure.h"
#include "fw-theme.h"

G_BEGIN_DECLS

typedef enum { FW_EXPORT_SVG, FW_EXPORT_PDF, FW_EXPORT_PNG } FwExportFormat;

#define FW_EXPORT_MIN_MM 20.0
#define FW_EXPORT_MAX_MM 1000.0
#define FW_EXPORT_MIN_DPI 50.0
#define FW_EXPORT_MAX_DPI 2400.0
#define FW_EXPORT_MAX_PIXELS 20000

typedef struct {
  FwExportFormat format;
  double width_mm;     /* default FW_FIGURE_WIDTH_DOUBLE_MM */
  double height_mm;    /* 0 = the figure's natural height for the width */
  double dpi;          /* PNG pixel density; heatmap raster density in SVG/PDF (default 300) */
  FwTheme theme;       /* fonts, sizes (in points), colours */
} FwExportSettings;

void fw_export_settings_init (FwExportSettings *settings);

/* "svg", "pdf", "png" from a file name's extension (case-insensitive); the error names the
 * file and lists the choices. */
gboolean fw_export_format_from_path (const char *path, FwExportFormat *out, GError **error);
const char *fw_export_format_name (FwExportFormat format);

/* round(mm / 25.4 * dpi) */
int fw_export_pixels (double mm, double dpi);

/* Checks sizes and density (errors name the setting, value and allowed range) and resolves a
 * zero height to the natural height (in mm). */
gboolean fw_export_resolve (FwFigure *fig, FwExportSettings *settings, GError **error);

/* Renders to bytes in the settings' format. */
GBytes *fw_export_figure_to_bytes (FwFigure *fig, const FwExportSettings *settings,
                                   GError **error);
/* Resolves, renders and writes atomically. */
gboolean fw_export_figure (FwFigure *fig, const FwExportSettings *settings, const char *path,
                           GError **error);

/* The recipe text embedded in an SVG, PDF or PNG written by Framewise (format by content).
 * FW_RENDER_ERROR_NO_RECIPE when the file carries none; IO errors name the file. */
char *fw_export_read_recipe (const char *path, GError **error);
char *fw_export_read_recipe_from_data (const guint8 *data, gsize length, GError **error);

G_END_DECLS
