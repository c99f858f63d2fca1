/* fw-theme.h: fonts, sizes, line widths and colours for every plot Framewise draws.
 *
 * A plain value (no allocation, copy it freely). All lengths are in the user-space units of
 * the cairo context the drawing functions receive: points (1/72 inch) for exported figures,
 * device-independent pixels on screen. Font sizes are absolute sizes in the same units, so a
 * theme that says 7 draws 7 pt text in a PDF and 7 px text on screen, whatever the Pango
 * resolution is.
 *
 * The exporter fills a theme from its settings (fw_theme_init + fw_theme_set_font); the window
 * fills one from the GTK style on screen (colours, font) and keeps the layout sizes.
 */
#pragma once

#include <stdbool.h>

#include <cairo.h>
#include <glib.h>
#include <pango/pangocairo.h>

G_BEGIN_DECLS

typedef enum {
  FW_THEME_LIGHT,
  FW_THEME_DARK,
} FwThemeVariant;

/* An RGBA colour, components 0..1 (sRGB, not premultiplied). */
typedef struct {
  double r, g, b, a;
} FwRgba;

/* The text roles; each has its own size (and weight for letters and titles). */
typedef enum {
  FW_TEXT_TICK,      /* tick labels on axes and colour bars */
  FW_TEXT_AXIS,      /* axis titles ("Time (s)", "Frequency (Hz)") and colour-bar quantities */
  FW_TEXT_TITLE,     /* the figure title */
  FW_TEXT_LETTER,    /* panel letters (a), (b), ... (bold) */
  FW_TEXT_CAPTION,   /* the caption line: clip, parameter set and hash */
  FW_N_TEXT_ROLES
} FwTextRole;

#define FW_THEME_FONT_FAMILY_MAX 96

typedef struct {
  FwThemeVariant variant;
  char font_family[FW_THEME_FONT_FAMILY_MAX]; /* Pango family list, e.g. "Sans" */
  double font_size[FW_N_TEXT_ROLES];          /* absolute sizes in user units */

  double line_width;      /* axis frames and tick marks */
  double trace_width;     /* line plots (descriptors, spectrum panel) */
  double tick_length;     /* outward tick marks */
  double pad;             /* small gap between a tick and its label, label and title */
  double row_gap;         /* vertical space between stacked rows */
  double colour_bar_width;/* width of the colour bar itself */
  double colour_bar_gap;  /* space between a data area and its colour bar */
  double margin;          /* outer margin of a figure */

  FwRgba background;      /* figure background (alpha 0 = transparent) */
  FwRgba foreground;      /* text, frames, ticks */
  FwRgba muted;           /* caption text, zero lines */
  FwRgba data_background; /* inside data areas (behind waveforms and line plots) */
  FwRgba waveform;        /* min/max envelope */
  FwRgba waveform_rms;    /* RMS band inside the envelope */
  FwRgba trace;           /* descriptor and spectrum lines */
  FwRgba missing;         /* heatmap pixels with no finite value */
} FwTheme;

/* Default layout sizes for an exported figure in points, with the colours of `variant`:
 * font "Sans", 7 pt ticks and titles, 8 pt figure title and letters, 6 pt caption,
 * 0.5 pt lines. */
void fw_theme_init (FwTheme *theme, FwThemeVariant variant);

/* Multiplies every length and font size by `factor` (e.g. 96/72 for screen pixels). */
void fw_theme_scale (FwTheme *theme, double factor);

/* Parses a Pango font string such as "DejaVu Serif 8" or "Sans 7": sets the family and, if a
 * size is given, the tick/axis size to it (title and letter one point larger, caption one point
 * smaller). Returns FALSE with an error naming the string when it has no family or a size
 * outside 3..72. */
gboolean fw_theme_set_font (FwTheme *theme, const char *font, GError **error);

/* Parses "light" or "dark". */
gboolean fw_theme_variant_from_name (const char *name, FwThemeVariant *out);

/* A new font description for a role (caller frees with pango_font_description_free). */
PangoFontDescription *fw_theme_font (const FwTheme *theme, FwTextRole role);

/* A new layout on cr's context with the role's font and `text` (caller unrefs). */
PangoLayout *fw_theme_layout (cairo_t *cr, const FwTheme *theme, FwTextRole role,
                              const char *text);

/* Ink-independent logical size of text in a role, in user units. */
void fw_theme_text_size (cairo_t *cr, const FwTheme *theme, FwTextRole role,
                         const char *text, double *width, double *height);

static inline void
fw_theme_set_source (cairo_t *cr, const FwRgba *c)
{
  cairo_set_source_rgba (cr, c->r, c->g, c->b, c->a);
}

/* Horizontal and vertical anchors for fw_theme_draw_text. */
typedef enum { FW_ALIGN_START, FW_ALIGN_CENTER, FW_ALIGN_END } FwAlign;

/* Draws text so that the anchor point (x, y) sits at the given alignment of its logical box;
 * `rotate_ccw` turns it 90 degrees counter-clockwise (reading upwards) about the anchor, with
 * halign/valign still referring to the text's own reading direction. Uses the foreground
 * colour of the current source. Returns the text's logical width (along the reading
 * direction). */
double fw_theme_draw_text (cairo_t *cr, const FwTheme *theme, FwTextRole role,
                           const char *text, double x, double y, FwAlign halign,
                           FwAlign valign, bool rotate_ccw);

/* Text wrapped (at words, else anywhere) to max_length and centred line by line, for labels
 * set along a row's side. The thickness is the height of the stacked lines. */
PangoLayout *fw_theme_layout_wrapped (cairo_t *cr, const FwTheme *theme, FwTextRole role,
                                      const char *text, double max_length);
double fw_theme_wrapped_thickness (cairo_t *cr, const FwTheme *theme, FwTextRole role,
                                   const char *text, double max_length);
/* Draws text wrapped to max_length, rotated 90 degrees counter-clockwise (reading upwards),
 * centred on y_center; the block of lines starts at x_left and extends to the right by its
 * thickness. */
void fw_theme_draw_rotated_block (cairo_t *cr, const FwTheme *theme, FwTextRole role,
                                  const char *text, double max_length, double x_left,
                                  double y_center);

G_END_DECLS
