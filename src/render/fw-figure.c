/* fw-figure.c: stacks of time-aligned rows, their layout and drawing (see fw-figure.h). */
#include "fw-config.h"

#include "fw-figure.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-feature.h"
#include "fw-recipe.h"
#include "fw-render-colour-bar.h"
#include "fw-render-curve.h"
#include "fw-render-error.h"

#define WEIGHT_HEATMAP 1.0
#define WEIGHT_SMALL 0.6
#define WEIGHT_SPECTRUM 1.0

typedef struct {
  FwRowKind kind;
  FwStage stage;
  FwMatrix *matrix;       /* NULL for the waveform */
  char *quantity;         /* colour-bar / trace label */
  bool quantity_given;    /* from the caller; otherwise derived from the figure's params */
  FwHeatmapSpec spec;
  FwRangeMode range_mode;
  FwValueRange fixed;
} Row;

struct _FwFigure {
  Row rows[FW_FIGURE_MAX_ROWS];
  size_t n_rows;

  FwAudio *audio;
  FwWaveformSpec wave;

  char *clip;
  char *param_set;
  FwParams *params;
  double analysis_rate;
  char *title;
  bool letters;
  bool caption;
  double t0, t1;          /* t1 <= t0: whole clip */
  FwAxisScale freq_scale;
  bool band_index;

  bool has_spectrum;
  FwStage spectrum_stage;
  FwMatrix *spectrum_matrix;
  FwSpectrumSpec spectrum_spec;
  char *spectrum_quantity;
};

/* Per-row axes worked out with the layout (private). */
typedef struct {
  FwAxis y_axis;
  FwTicks y_ticks;
  FwTickStyle y_style;
  char y_title[128];
  FwValueRange range;     /* heatmap: the resolved range */
  FwCurveSpec curve;      /* trace: the curve's time and value ranges and label style */
} RowAxes;

typedef struct {
  FwAxis time_axis;
  FwTicks time_ticks;
  RowAxes rows[FW_FIGURE_MAX_ROWS];
  /* spectrum panel */
  double *spectrum_values;
  FwAxis spectrum_x, spectrum_y;
  FwTicks spectrum_x_ticks, spectrum_y_ticks;
  char spectrum_x_title[64];
} Axes;

FwFigure *
fw_figure_new (void)
{
  FwFigure *fig = g_new0 (FwFigure, 1);
  fig->letters = true;
  fig->caption = true;
  fig->freq_scale = FW_AXIS_LINEAR;
  fw_waveform_spec_init (&fig->wave, 1.0);
  return fig;
}

void
fw_figure_free (FwFigure *fig)
{
  if (fig == NULL)
    return;
  for (size_t i = 0; i < fig->n_rows; i++)
    {
      if (fig->rows[i].matrix)
        fw_matrix_unref (fig->rows[i].matrix);
      g_free (fig->rows[i].quantity);
    }
  g_clear_pointer (&fig->audio, fw_audio_unref);
  g_clear_pointer (&fig->params, fw_params_unref);
  g_clear_pointer (&fig->spectrum_matrix, fw_matrix_unref);
  g_free (fig->spectrum_quantity);
  g_free (fig->clip);
  g_free (fig->param_set);
  g_free (fig->title);
  g_free (fig);
}

void
fw_figure_set_source (FwFigure *fig, const char *clip, const char *param_set_name,
                      FwParams *params, double analysis_rate)
{
  g_return_if_fail (fig != NULL);
  g_free (fig->clip);
  fig->clip = g_strdup (clip);
  g_free (fig->param_set);
  fig->param_set = g_strdup (param_set_name);
  if (params)
    fw_params_ref (params);
  g_clear_pointer (&fig->params, fw_params_unref);
  fig->params = params;
  fig->analysis_rate = analysis_rate;

  /* labels that were derived from the parameters follow them */
  for (size_t i = 0; i < fig->n_rows; i++)
    {
      Row *row = &fig->rows[i];
      if (row->quantity_given || row->kind == FW_ROW_WAVEFORM)
        continue;
      g_free (row->quantity);
      row->quantity = params && (int) row->stage >= 0
                        ? fw_feature_quantity_label (row->stage, params)
                        : g_strdup ("");
    }
  if (fig->has_spectrum)
    {
      g_free (fig->spectrum_quantity);
      fig->spectrum_quantity = params && (int) fig->spectrum_stage >= 0
                                 ? fw_feature_quantity_label (fig->spectrum_stage, params)
                                 : g_strdup ("");
    }
}

void
fw_figure_set_title (FwFigure *fig, const char *title)
{
  g_free (fig->title);
  fig->title = title && *title ? g_strdup (title) : NULL;
}

void
fw_figure_set_letters (FwFigure *fig, bool letters)
{
  fig->letters = letters;
}

void
fw_figure_set_caption (FwFigure *fig, bool caption)
{
  fig->caption = caption;
}

void
fw_figure_set_time_range (FwFigure *fig, double t0, double t1)
{
  fig->t0 = t0;
  fig->t1 = t1;
}

static double
matrix_end_time (const FwMatrix *m)
{
  double hop;
  if (m->n_frames == 0)
    return 0;
  hop = m->hop_seconds > 0 ? m->hop_seconds : 0;
  return m->frame_times[m->n_frames - 1] + hop / 2;
}

void
fw_figure_get_time_range (FwFigure *fig, double *t0, double *t1)
{
  double a = fig->t0, b = fig->t1;

  if (!(b > a))
    {
      a = 0;
      b = 0;
      if (fig->audio && fig->audio->sample_rate > 0)
        b = (double) fig->audio->n_samples / fig->audio->sample_rate;
      for (size_t i = 0; i < fig->n_rows; i++)
        if (fig->rows[i].matrix && b <= 0)
          b = MAX (b, matrix_end_time (fig->rows[i].matrix));
      if (!(b > a))
        b = 1.0;
    }
  *t0 = a;
  *t1 = b;
}

int
fw_figure_add_waveform (FwFigure *fig, FwAudio *audio)
{
  Row *row;

  g_return_val_if_fail (fig != NULL && audio != NULL, -1);
  if (fig->n_rows >= FW_FIGURE_MAX_ROWS)
    return -1;
  if (fig->audio != audio)
    {
      fw_audio_ref (audio);
      g_clear_pointer (&fig->audio, fw_audio_unref);
      fig->audio = audio;
    }
  row = &fig->rows[fig->n_rows];
  memset (row, 0, sizeof *row);
  row->kind = FW_ROW_WAVEFORM;
  row->stage = FW_STAGE_SIGNAL;
  return (int) fig->n_rows++;
}

int
fw_figure_add_matrix (FwFigure *fig, FwStage stage, FwMatrix *m, const char *quantity_label)
{
  Row *row;

  g_return_val_if_fail (fig != NULL && m != NULL, -1);
  if (fig->n_rows >= FW_FIGURE_MAX_ROWS)
    return -1;
  row = &fig->rows[fig->n_rows];
  memset (row, 0, sizeof *row);
  row->stage = stage;
  row->matrix = fw_matrix_ref (m);
  row->kind = m->bin_kind == FW_BIN_AXIS_SCALAR ? FW_ROW_TRACE : FW_ROW_HEATMAP;
  row->quantity_given = quantity_label != NULL;
  if (quantity_label)
    row->quantity = g_strdup (quantity_label);
  else if (fig->params && (int) stage >= 0)
    row->quantity = fw_feature_quantity_label (stage, fig->params);
  else
    row->quantity = g_strdup ("");
  fw_heatmap_spec_init (&row->spec, m, stage);
  row->spec.freq_scale = fig->freq_scale;
  row->spec.band_index = fig->band_index;
  if (fig->params)
    {
      g_autofree char *ms = fw_params_get_value (fig->params, "mel_scale");
      FwMelScale mel;
      if (ms && fw_mel_scale_from_name (ms, &mel))
        row->spec.mel_scale = mel;
    }
  row->range_mode = FW_RANGE_AUTO;
  return (int) fig->n_rows++;
}

size_t
fw_figure_get_n_rows (FwFigure *fig)
{
  return fig->n_rows;
}

FwRowKind
fw_figure_row_kind (FwFigure *fig, size_t row)
{
  g_return_val_if_fail (row < fig->n_rows, FW_ROW_HEATMAP);
  return fig->rows[row].kind;
}

FwStage
fw_figure_row_stage (FwFigure *fig, size_t row)
{
  g_return_val_if_fail (row < fig->n_rows, FW_STAGE_SIGNAL);
  return fig->rows[row].stage;
}

FwMatrix *
fw_figure_row_matrix (FwFigure *fig, size_t row)
{
  g_return_val_if_fail (row < fig->n_rows, NULL);
  return fig->rows[row].matrix;
}

FwHeatmapSpec *
fw_figure_row_heatmap_spec (FwFigure *fig, size_t row)
{
  g_return_val_if_fail (row < fig->n_rows, NULL);
  return &fig->rows[row].spec;
}

FwWaveformSpec *
fw_figure_waveform_spec (FwFigure *fig)
{
  return &fig->wave;
}

void
fw_figure_row_set_range (FwFigure *fig, size_t row, FwRangeMode mode, const FwValueRange *fixed)
{
  g_return_if_fail (row < fig->n_rows);
  fig->rows[row].range_mode = mode;
  if (fixed)
    fig->rows[row].fixed = *fixed;
}

void
fw_figure_set_colour_scale (FwFigure *fig, const FwColourScale *scale)
{
  g_return_if_fail (scale != NULL);
  for (size_t i = 0; i < fig->n_rows; i++)
    if (fig->rows[i].kind == FW_ROW_HEATMAP
        && fw_colour_scale_get_kind (fig->rows[i].spec.scale) == fw_colour_scale_get_kind (scale))
      fig->rows[i].spec.scale = scale;
}

void
fw_figure_set_range (FwFigure *fig, FwRangeMode mode, const FwValueRange *fixed)
{
  for (size_t i = 0; i < fig->n_rows; i++)
    if (fig->rows[i].kind == FW_ROW_HEATMAP)
      fw_figure_row_set_range (fig, i, mode, fixed);
}

void
fw_figure_set_freq_scale (FwFigure *fig, FwAxisScale scale)
{
  fig->freq_scale = scale;
  for (size_t i = 0; i < fig->n_rows; i++)
    fig->rows[i].spec.freq_scale = scale;
  fig->spectrum_spec.freq_scale = scale;
}

void
fw_figure_set_band_index (FwFigure *fig, bool band_index)
{
  fig->band_index = band_index;
  for (size_t i = 0; i < fig->n_rows; i++)
    fig->rows[i].spec.band_index = band_index;
  fig->spectrum_spec.band_index = band_index;
}

void
fw_figure_set_spectrum (FwFigure *fig, FwStage stage, FwMatrix *m, FwSpectrumPanelMode mode,
                        double t0, double t1)
{
  g_return_if_fail (fig != NULL);
  g_clear_pointer (&fig->spectrum_matrix, fw_matrix_unref);
  g_clear_pointer (&fig->spectrum_quantity, g_free);
  fig->has_spectrum = m != NULL;
  if (m == NULL)
    return;
  fig->spectrum_matrix = fw_matrix_ref (m);
  fig->spectrum_stage = stage;
  fw_spectrum_spec_init (&fig->spectrum_spec, stage);
  fig->spectrum_spec.mode = mode;
  fig->spectrum_spec.t0 = t0;
  fig->spectrum_spec.t1 = t1;
  fig->spectrum_spec.freq_scale = fig->freq_scale;
  fig->spectrum_spec.band_index = fig->band_index;
  fig->spectrum_quantity = fig->params && (int) stage >= 0
                             ? fw_feature_quantity_label (stage, fig->params)
                             : g_strdup ("");
}

gboolean
fw_figure_add_rows (FwFigure *fig, const char *rows, FwAudio *audio, FwParams *params,
                    GCancellable *cancellable, GError **error)
{
  g_auto (GStrv) names = NULL;

  g_return_val_if_fail (fig != NULL && rows != NULL && audio != NULL && params != NULL, FALSE);

  if (fig->params == NULL)
    fw_figure_set_source (fig, audio->info.path, NULL, params, audio->sample_rate);
  names = g_strsplit (rows, ",", -1);
  if (names[0] == NULL)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Rows \"%s\": no row named; use waveform or a stage name"), rows);
      return FALSE;
    }
  for (size_t i = 0; names[i]; i++)
    {
      const char *name = g_strstrip (names[i]);
      FwStage stage;
      g_autoptr (GError) local = NULL;
      FwMatrix *m;

      if (fig->n_rows >= FW_FIGURE_MAX_ROWS)
        {
          g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                       _("Rows \"%s\": at most %d rows fit in one figure"), rows,
                       FW_FIGURE_MAX_ROWS);
          return FALSE;
        }
      if (g_strcmp0 (name, "waveform") == 0)
        {
          fw_figure_add_waveform (fig, audio);
          continue;
        }
      if (!fw_feature_parse_stage (name, &stage, &local))
        {
          g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                       _("Row \"%s\": %s (or \"waveform\")"), name, local->message);
          return FALSE;
        }
      m = fw_feature_compute (audio, params, stage, (int) MIN (g_get_num_processors (), 4), NULL,
                              NULL, cancellable, &local);
      if (m == NULL)
        {
          g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID, _("Row \"%s\": %s"),
                       name, local->message);
          return FALSE;
        }
      fw_figure_add_matrix (fig, stage, m, NULL);
      fw_matrix_unref (m);
    }
  return TRUE;
}

/* ---- layout ---- */

static double
row_weight (const Row *row)
{
  return row->kind == FW_ROW_HEATMAP ? WEIGHT_HEATMAP : WEIGHT_SMALL;
}

static double
snap_to (double v, double snap)
{
  return snap > 0 ? floor (v / snap + 0.5) * snap : v;
}

static double
text_height (cairo_t *cr, const FwTheme *theme, FwTextRole role)
{
  double h;
  fw_theme_text_size (cr, theme, role, "0(g)", NULL, &h);
  return h;
}

/* The caption wraps (at word boundaries) to the figure's width inside the margins. */
static PangoLayout *
caption_layout (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width)
{
  g_autofree char *caption = fw_figure_dup_caption (fig);
  PangoLayout *layout = fw_theme_layout (cr, theme, FW_TEXT_CAPTION, caption);

  pango_layout_set_width (layout, (int) (MAX (width - 2 * theme->margin, 1.0) * PANGO_SCALE));
  pango_layout_set_wrap (layout, PANGO_WRAP_WORD_CHAR);
  return layout;
}

static double
caption_height (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width)
{
  PangoLayout *layout = caption_layout (fig, cr, theme, width);
  PangoRectangle logical;

  pango_layout_get_extents (layout, NULL, &logical);
  g_object_unref (layout);
  return (double) logical.height / PANGO_SCALE;
}

/* Fixed vertical parts: above the rows, below the rows. */
static void
vertical_fixed (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width, double *above,
                double *below,
                double *spectrum_axis)
{
  double th = text_height (cr, theme, FW_TEXT_TICK);
  double ah = text_height (cr, theme, FW_TEXT_AXIS);
  double axis_block = theme->tick_length + theme->pad + th + theme->pad + ah;

  *above = theme->margin + th / 2;
  if (fig->title)
    *above += text_height (cr, theme, FW_TEXT_TITLE) + 2 * theme->pad;
  *below = axis_block + theme->margin;
  if (fig->caption)
    *below += 2 * theme->pad + caption_height (fig, cr, theme, width);
  *spectrum_axis = axis_block + 2 * theme->row_gap;
  if (fig->has_spectrum)
    *below += *spectrum_axis;
}

static double
total_weight (FwFigure *fig)
{
  double w = 0;
  for (size_t i = 0; i < fig->n_rows; i++)
    w += row_weight (&fig->rows[i]);
  if (fig->has_spectrum)
    w += WEIGHT_SPECTRUM;
  return w;
}

double
fw_figure_natural_height (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width)
{
  double above, below, spectrum_axis;
  double unit = 0.12 * width + 36.0;

  vertical_fixed (fig, cr, theme, width, &above, &below, &spectrum_axis);
  return above + below + total_weight (fig) * unit
         + (fig->n_rows > 1 ? (double) (fig->n_rows - 1) * theme->row_gap : 0);
}

double
fw_figure_min_height (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width)
{
  double above, below, spectrum_axis;
  double small = 3.0 * theme->font_size[FW_TEXT_TICK] / WEIGHT_SMALL;

  vertical_fixed (fig, cr, theme, width, &above, &below, &spectrum_axis);
  return above + below + total_weight (fig) * small
         + (fig->n_rows > 1 ? (double) (fig->n_rows - 1) * theme->row_gap : 0);
}

static void
resolve_ranges (FwFigure *fig, double t0, double t1, FwValueRange *ranges)
{
  for (size_t i = 0; i < fig->n_rows; i++)
    {
      Row *row = &fig->rows[i];
      if (row->kind != FW_ROW_HEATMAP)
        continue;
      if (row->range_mode == FW_RANGE_FIXED)
        ranges[i] = row->fixed;
      else if (!fw_value_range_auto (row->matrix, fw_range_rule_for_stage (row->stage), t0, t1,
                                     &ranges[i]))
        ranges[i] = row->spec.range;
    }
  /* locked rows with the same quantity share the union of their automatic ranges */
  for (size_t i = 0; i < fig->n_rows; i++)
    {
      FwValueRange u;
      if (fig->rows[i].kind != FW_ROW_HEATMAP || fig->rows[i].range_mode != FW_RANGE_LOCKED)
        continue;
      u = ranges[i];
      for (size_t j = 0; j < fig->n_rows; j++)
        if (fig->rows[j].kind == FW_ROW_HEATMAP && fig->rows[j].range_mode == FW_RANGE_LOCKED
            && g_strcmp0 (fig->rows[j].quantity, fig->rows[i].quantity) == 0)
          fw_value_range_union (&u, &ranges[j]);
      ranges[i] = u;
    }
}

static const char *
trace_title (const Row *row)
{
  switch (row->stage)
    {
    case FW_STAGE_RMS:
      return _("RMS");
    case FW_STAGE_ZCR:
      /* TRANSLATORS: axis title, zero-crossing rate */
      return _("ZCR");
    case FW_STAGE_CENTROID:
      return _("Centroid (Hz)");
    case FW_STAGE_BANDWIDTH:
      return _("Bandwidth (Hz)");
    case FW_STAGE_ROLLOFF:
      return _("Rolloff (Hz)");
    case FW_STAGE_FLATNESS:
      return _("Flatness");
    default:
      return row->quantity ? row->quantity : "";
    }
}

/* Width of a trace row's gutter: the quantity label set like a colour bar's, without a bar. */
static double
trace_gutter_width (cairo_t *cr, const FwTheme *theme, const Row *row, double h)
{
  if (row->quantity == NULL || *row->quantity == '\0')
    return 0;
  return theme->colour_bar_gap + fw_theme_wrapped_thickness (cr, theme, FW_TEXT_AXIS,
                                                             row->quantity, h);
}

static void
row_y_title (FwFigure *fig, Row *row, RowAxes *ax)
{
  switch (row->kind)
    {
    case FW_ROW_WAVEFORM:
      g_strlcpy (ax->y_title, fw_waveform_axis_title (&fig->wave), sizeof ax->y_title);
      break;
    case FW_ROW_TRACE:
      /* a short title here; the full quantity goes into the gutter, as for heatmaps */
      g_strlcpy (ax->y_title, trace_title (row), sizeof ax->y_title);
      break;
    case FW_ROW_HEATMAP:
    default:
      if (ax->y_style == FW_TICK_FREQUENCY)
        g_snprintf (ax->y_title, sizeof ax->y_title, _("Frequency (%s)"), ax->y_ticks.unit);
      else if (row->matrix->bin_kind == FW_BIN_AXIS_MEL_BAND)
        g_strlcpy (ax->y_title, _("Mel band"), sizeof ax->y_title);
      else
        g_strlcpy (ax->y_title, _("Coefficient"), sizeof ax->y_title);
      break;
    }
}

/* Vertical axes and ticks of every row for the given data rectangles. */
static void
row_axes (FwFigure *fig, cairo_t *cr, const FwTheme *theme, const FwFigureLayout *lay,
          double t0, double t1, Axes *axes)
{
  FwValueRange ranges[FW_FIGURE_MAX_ROWS];
  double overhang = theme->row_gap / 2 - 0.25;

  resolve_ranges (fig, t0, t1, ranges);
  for (size_t i = 0; i < fig->n_rows; i++)
    {
      Row *row = &fig->rows[i];
      RowAxes *ax = &axes->rows[i];
      const FwRect *r = &lay->data[i];

      switch (row->kind)
        {
        case FW_ROW_WAVEFORM:
          fw_waveform_axis (&fig->wave, r->y + r->h, r->y, &ax->y_axis);
          ax->y_style = FW_TICK_NUMBER;
          break;
        case FW_ROW_TRACE:
          fw_curve_spec_init (&ax->curve, row->stage, t0, t1);
          /* plain numbers: the row's title gives the unit ("Centroid (Hz)"), and the
           * quantity label in the gutter says Hz too */
          ax->curve.style = FW_TICK_NUMBER;
          fw_curve_auto_range (row->matrix, t0, t1, &ax->curve.range);
          fw_curve_value_axis (&ax->curve, r->y + r->h, r->y, &ax->y_axis);
          ax->y_style = ax->curve.style;
          break;
        case FW_ROW_HEATMAP:
        default:
          ax->range = ranges[i];
          fw_heatmap_bin_axis (row->matrix, &row->spec, r->y + r->h, r->y, &ax->y_axis,
                               &ax->y_style);
          break;
        }
      fw_axis_choose_ticks (cr, theme, &ax->y_axis, ax->y_style, false, overhang, &ax->y_ticks);
      row_y_title (fig, row, ax);
    }
}

static void
compute_layout (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width, double height,
                double snap, FwFigureLayout *lay, Axes *axes)
{
  double above, below, spectrum_axis, avail, unit, y;
  double th = text_height (cr, theme, FW_TEXT_TICK);
  double letter_w = 0, title_w = 0, tick_w = 0, gutter_w = 0, left, right;
  double t0, t1;
  size_t n = fig->n_rows;

  memset (lay, 0, sizeof *lay);
  lay->width = width;
  lay->height = height;
  lay->n_rows = n;
  fw_figure_get_time_range (fig, &t0, &t1);

  /* ---- vertical ---- */
  vertical_fixed (fig, cr, theme, width, &above, &below, &spectrum_axis);
  if (fig->title)
    {
      lay->title.x = theme->margin;
      lay->title.y = theme->margin;
      lay->title.w = width - 2 * theme->margin;
      lay->title.h = text_height (cr, theme, FW_TEXT_TITLE);
    }
  avail = height - above - below - (n > 1 ? (double) (n - 1) * theme->row_gap : 0);
  unit = total_weight (fig) > 0 ? MAX (avail, 0.0) / total_weight (fig) : 0;
  y = above;
  for (size_t i = 0; i < n; i++)
    {
      double h = row_weight (&fig->rows[i]) * unit;
      double top = snap_to (y, snap), bottom = snap_to (y + h, snap);
      lay->data[i].y = top;
      lay->data[i].h = MAX (bottom - top, snap > 0 ? snap : 1e-3);
      y += h + theme->row_gap;
    }
  lay->time_axis_y = n > 0 ? lay->data[n - 1].y + lay->data[n - 1].h : above;
  if (fig->has_spectrum)
    {
      double top = lay->time_axis_y + spectrum_axis;
      double h = WEIGHT_SPECTRUM * unit;
      lay->has_spectrum = true;
      lay->spectrum.y = snap_to (top, snap);
      lay->spectrum.h = MAX (snap_to (top + h, snap) - lay->spectrum.y, 1e-3);
    }
  if (fig->caption)
    {
      lay->caption.h = caption_height (fig, cr, theme, width);
      lay->caption.y = height - theme->margin - lay->caption.h;
      lay->caption.x = theme->margin;
      lay->caption.w = width - 2 * theme->margin;
    }

  /* ---- per-row vertical axes (need only the vertical geometry) ---- */
  row_axes (fig, cr, theme, lay, t0, t1, axes);
  if (fig->has_spectrum)
    {
      size_t used = 0;
      double lo, hi;
      g_clear_pointer (&axes->spectrum_values, g_free);
      axes->spectrum_values = fw_spectrum_panel_values (fig->spectrum_matrix, &fig->spectrum_spec,
                                                        &used);
      if (axes->spectrum_values)
        fw_spectrum_panel_y_range (fig->spectrum_matrix, axes->spectrum_values,
                                   fig->spectrum_spec.values_db, &lo, &hi);
      else
        {
          lo = 0;
          hi = 1;
        }
      fw_axis_init (&axes->spectrum_y, FW_AXIS_LINEAR, lo, hi,
                    lay->spectrum.y + lay->spectrum.h, lay->spectrum.y);
      fw_axis_choose_ticks (cr, theme, &axes->spectrum_y, FW_TICK_NUMBER, false,
                            theme->row_gap / 2, &axes->spectrum_y_ticks);
    }

  /* ---- horizontal: the columns are the maxima over all rows ---- */
  if (fig->letters && (n > 1 || fig->has_spectrum))
    {
      fw_theme_text_size (cr, theme, FW_TEXT_LETTER, "(m)", &letter_w, NULL);
      letter_w += theme->pad;
    }
  for (size_t i = 0; i < n; i++)
    {
      double w;
      title_w = MAX (title_w, fw_theme_wrapped_thickness (cr, theme, FW_TEXT_AXIS,
                                                          axes->rows[i].y_title,
                                                          lay->data[i].h));
      fw_ticks_max_label_size (cr, theme, &axes->rows[i].y_ticks, &w, NULL);
      tick_w = MAX (tick_w, w);
    }
  if (fig->has_spectrum)
    {
      double w;
      title_w = MAX (title_w, fw_theme_wrapped_thickness (cr, theme, FW_TEXT_AXIS,
                                                          fig->spectrum_quantity,
                                                          lay->spectrum.h));
      fw_ticks_max_label_size (cr, theme, &axes->spectrum_y_ticks, &w, NULL);
      tick_w = MAX (tick_w, w);
    }
  for (size_t i = 0; i < n; i++)
    if (fig->rows[i].kind == FW_ROW_HEATMAP)
      {
        double g = fw_colour_bar_gutter_width (cr, theme, &axes->rows[i].range,
                                               fig->rows[i].quantity, lay->data[i].h);
        gutter_w = MAX (gutter_w, g);
        lay->has_colour_bar[i] = true;
      }
    else if (fig->rows[i].kind == FW_ROW_TRACE)
      gutter_w = MAX (gutter_w, trace_gutter_width (cr, theme, &fig->rows[i], lay->data[i].h));
  lay->gutter_w = gutter_w;

  lay->letter_x = theme->margin;
  lay->title_x = lay->letter_x + letter_w;
  lay->title_w = title_w;
  left = lay->title_x + title_w + (title_w > 0 ? theme->pad : 0) + tick_w + theme->pad
         + theme->tick_length;
  /* the last time label is centred on the right edge: keep room for half of it */
  right = width - theme->margin - MAX (gutter_w, 1.5 * th);
  lay->data_left = snap_to (left, snap);
  lay->data_right = snap_to (MAX (right, left + 1.0), snap);

  for (size_t i = 0; i < n; i++)
    {
      lay->data[i].x = lay->data_left;
      lay->data[i].w = lay->data_right - lay->data_left;
      lay->gutter[i].x = lay->data_right;
      lay->gutter[i].y = lay->data[i].y;
      lay->gutter[i].w = gutter_w;
      lay->gutter[i].h = lay->data[i].h;
    }
  if (fig->has_spectrum)
    {
      FwTickStyle style;
      lay->spectrum.x = lay->data_left;
      lay->spectrum.w = lay->data_right - lay->data_left;
      fw_spectrum_panel_x_axis (fig->spectrum_matrix, &fig->spectrum_spec, lay->data_left,
                                lay->data_right, &axes->spectrum_x, &style);
      fw_axis_choose_ticks (cr, theme, &axes->spectrum_x, style, true, theme->margin + gutter_w,
                            &axes->spectrum_x_ticks);
      if (style == FW_TICK_FREQUENCY)
        g_snprintf (axes->spectrum_x_title, sizeof axes->spectrum_x_title, _("Frequency (%s)"),
                    axes->spectrum_x_ticks.unit);
      else if (fig->spectrum_matrix->bin_kind == FW_BIN_AXIS_MEL_BAND)
        g_strlcpy (axes->spectrum_x_title, _("Mel band"), sizeof axes->spectrum_x_title);
      else
        g_strlcpy (axes->spectrum_x_title, _("Coefficient"), sizeof axes->spectrum_x_title);
    }

  /* time axis shared by every row */
  fw_axis_init (&axes->time_axis, FW_AXIS_LINEAR, t0, t1, lay->data_left, lay->data_right);
  fw_axis_choose_ticks (cr, theme, &axes->time_axis, FW_TICK_TIME, true,
                        MIN (lay->data_left, width - lay->data_right) - theme->margin / 2,
                        &axes->time_ticks);
}

void
fw_figure_layout (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width, double height,
                  double snap, FwFigureLayout *out)
{
  Axes *axes = g_new0 (Axes, 1);

  g_return_if_fail (fig != NULL && cr != NULL && theme != NULL && out != NULL);
  compute_layout (fig, cr, theme, width, height, snap, out, axes);
  g_free (axes->spectrum_values);
  g_free (axes);
}

/* ---- drawing ---- */

static void
frame_rect (cairo_t *cr, const FwTheme *theme, const FwRect *r)
{
  double lw = theme->line_width;
  cairo_save (cr);
  fw_theme_set_source (cr, &theme->foreground);
  cairo_set_line_width (cr, lw);
  /* the frame sits just outside the data area so it never covers data pixels */
  cairo_rectangle (cr, r->x - lw / 2, r->y - lw / 2, r->w + lw, r->h + lw);
  cairo_stroke (cr);
  cairo_restore (cr);
}

static void
draw_letter (cairo_t *cr, const FwTheme *theme, double x, double y, size_t index)
{
  char text[16];
  /* (a) .. (z), then (aa) ... (never reached: at most 16 rows + 1 panel) */
  g_snprintf (text, sizeof text, "(%c)", (char) ('a' + (int) (index % 26)));
  fw_theme_set_source (cr, &theme->foreground);
  fw_theme_draw_text (cr, theme, FW_TEXT_LETTER, text, x, y, FW_ALIGN_START, FW_ALIGN_START,
                      false);
}

gboolean
fw_figure_draw (FwFigure *fig, cairo_t *cr, const FwTheme *theme, double width, double height,
                double raster_scale, double snap, GError **error)
{
  FwFigureLayout lay;
  Axes *axes;
  double t0, t1;
  gboolean ok = TRUE;
  size_t n;

  g_return_val_if_fail (fig != NULL && cr != NULL && theme != NULL, FALSE);
  if (!(raster_scale > 0))
    raster_scale = 1.0;

  axes = g_new0 (Axes, 1);
  compute_layout (fig, cr, theme, width, height, snap, &lay, axes);
  fw_figure_get_time_range (fig, &t0, &t1);
  n = fig->n_rows;

  cairo_save (cr);
  if (theme->background.a > 0)
    {
      fw_theme_set_source (cr, &theme->background);
      cairo_rectangle (cr, 0, 0, width, height);
      cairo_fill (cr);
    }

  if (fig->title)
    {
      fw_theme_set_source (cr, &theme->foreground);
      fw_theme_draw_text (cr, theme, FW_TEXT_TITLE, fig->title,
                          (lay.data_left + lay.data_right) / 2, lay.title.y, FW_ALIGN_CENTER,
                          FW_ALIGN_START, false);
    }

  for (size_t i = 0; i < n && ok; i++)
    {
      Row *row = &fig->rows[i];
      RowAxes *ax = &axes->rows[i];
      const FwRect *r = &lay.data[i];
      int cols = MAX (1, (int) lround (r->w * raster_scale));

      if (row->kind != FW_ROW_HEATMAP)
        {
          fw_theme_set_source (cr, &theme->data_background);
          cairo_rectangle (cr, r->x, r->y, r->w, r->h);
          cairo_fill (cr);
        }

      switch (row->kind)
        {
        case FW_ROW_WAVEFORM:
          {
            FwWaveformSpec ws = fig->wave;
            g_autoptr (FwWaveformEnvelope) env = NULL;
            ws.t0 = t0;
            ws.t1 = t1;
            env = fw_waveform_envelope_new (fig->audio->samples, fig->audio->n_samples,
                                            fig->audio->sample_rate, t0, t1, cols,
                                            ws.rms_window);
            /* zero line under the envelope */
            if (ws.amplitude == FW_AMPLITUDE_LINEAR)
              {
                double zy = fw_axis_value_to_pixel (&ax->y_axis, 0.0);
                fw_theme_set_source (cr, &theme->muted);
                cairo_set_line_width (cr, theme->line_width / 2);
                cairo_move_to (cr, r->x, zy);
                cairo_line_to (cr, r->x + r->w, zy);
                cairo_stroke (cr);
              }
            fw_waveform_draw (cr, theme, &ws, env, r->x, r->y, r->w, r->h);
          }
          break;
        case FW_ROW_TRACE:
          {
            FwCurveSpec cs = ax->curve;
            cs.n_columns = cols;
            fw_curve_draw (cr, theme, &cs, row->matrix, r->x, r->y, r->w, r->h);
            fw_theme_set_source (cr, &theme->foreground);
            fw_theme_draw_rotated_block (cr, theme, FW_TEXT_AXIS, row->quantity, r->h,
                                         lay.data_right + theme->colour_bar_gap, r->y + r->h / 2);
          }
          break;
        case FW_ROW_HEATMAP:
        default:
          {
            FwHeatmapSpec spec = row->spec;
            int rows_px = MAX (1, (int) lround (r->h * raster_scale));
            cairo_surface_t *img;
            spec.t0 = t0;
            spec.t1 = t1;
            spec.range = ax->range;
            fw_theme_set_source (cr, &theme->missing);
            cairo_rectangle (cr, r->x, r->y, r->w, r->h);
            cairo_fill (cr);
            img = fw_heatmap_render (row->matrix, &spec, cols, rows_px, error);
            if (img == NULL)
              {
                ok = FALSE;
                break;
              }
            fw_heatmap_paint (cr, img, r->x, r->y, r->w, r->h);
            cairo_surface_destroy (img);
            fw_colour_bar_draw (cr, theme, spec.scale, &ax->range, row->quantity, lay.data_right,
                                r->y, r->h);
          }
          break;
        }
      if (!ok)
        break;

      frame_rect (cr, theme, r);
      fw_axis_draw (cr, theme, &ax->y_axis, &ax->y_ticks, FW_EDGE_LEFT,
                    r->x - theme->line_width, true);
      fw_axis_draw (cr, theme, &axes->time_axis, &axes->time_ticks, FW_EDGE_BOTTOM,
                    r->y + r->h + theme->line_width, i == n - 1);
      fw_theme_set_source (cr, &theme->foreground);
      fw_theme_draw_rotated_block (cr, theme, FW_TEXT_AXIS, ax->y_title, r->h, lay.title_x,
                                   r->y + r->h / 2);
      if (fig->letters && (n > 1 || fig->has_spectrum))
        draw_letter (cr, theme, lay.letter_x, r->y, i);
    }

  if (ok && n > 0)
    {
      double th = text_height (cr, theme, FW_TEXT_TICK);
      fw_theme_set_source (cr, &theme->foreground);
      fw_theme_draw_text (cr, theme, FW_TEXT_AXIS,
                          fw_time_unit_axis_title (fw_time_unit_for_span (t0, t1)),
                          (lay.data_left + lay.data_right) / 2,
                          lay.time_axis_y + theme->line_width + theme->tick_length
                              + theme->pad + th + theme->pad,
                          FW_ALIGN_CENTER, FW_ALIGN_START, false);
    }

  if (ok && fig->has_spectrum)
    {
      const FwRect *r = &lay.spectrum;
      double th = text_height (cr, theme, FW_TEXT_TICK);

      fw_theme_set_source (cr, &theme->data_background);
      cairo_rectangle (cr, r->x, r->y, r->w, r->h);
      cairo_fill (cr);
      fw_spectrum_panel_draw (cr, theme, fig->spectrum_matrix, axes->spectrum_values,
                              &axes->spectrum_x, &axes->spectrum_y, r->x, r->y, r->w, r->h);
      {
        char a[32], b[32];
        g_autofree char *what = NULL;
        switch (fig->spectrum_spec.mode)
          {
          case FW_SPECTRUM_PANEL_FRAME:
            g_snprintf (a, sizeof a, "%.4g", fig->spectrum_spec.t0);
            what = g_strdup_printf (_("frame at %s s"), a);
            break;
          case FW_SPECTRUM_PANEL_RANGE:
            g_snprintf (a, sizeof a, "%.4g", fig->spectrum_spec.t0);
            g_snprintf (b, sizeof b, "%.4g", fig->spectrum_spec.t1);
            what = g_strdup_printf (_("mean over %s–%s s"), a, b);
            break;
          case FW_SPECTRUM_PANEL_WHOLE:
          default:
            what = g_strdup (_("mean over the clip"));
            break;
          }
        fw_theme_set_source (cr, &theme->muted);
        fw_theme_draw_text (cr, theme, FW_TEXT_TICK, what, r->x + r->w - theme->pad,
                            r->y + theme->pad, FW_ALIGN_END, FW_ALIGN_START, false);
      }
      frame_rect (cr, theme, r);
      fw_axis_draw (cr, theme, &axes->spectrum_y, &axes->spectrum_y_ticks, FW_EDGE_LEFT,
                    r->x - theme->line_width, true);
      fw_axis_draw (cr, theme, &axes->spectrum_x, &axes->spectrum_x_ticks, FW_EDGE_BOTTOM,
                    r->y + r->h + theme->line_width, true);
      fw_theme_set_source (cr, &theme->foreground);
      fw_theme_draw_rotated_block (cr, theme, FW_TEXT_AXIS, fig->spectrum_quantity, r->h,
                                   lay.title_x, r->y + r->h / 2);
      fw_theme_draw_text (cr, theme, FW_TEXT_AXIS, axes->spectrum_x_title, r->x + r->w / 2,
                          r->y + r->h + theme->line_width + theme->tick_length + theme->pad
                              + th + theme->pad,
                          FW_ALIGN_CENTER, FW_ALIGN_START, false);
      if (fig->letters)
        draw_letter (cr, theme, lay.letter_x, r->y, n);
    }

  if (ok && fig->caption)
    {
      PangoLayout *layout = caption_layout (fig, cr, theme, width);
      PangoRectangle logical;

      pango_layout_get_extents (layout, NULL, &logical);
      fw_theme_set_source (cr, &theme->muted);
      cairo_move_to (cr, lay.caption.x, lay.caption.y - (double) logical.y / PANGO_SCALE);
      pango_cairo_update_layout (cr, layout);
      pango_cairo_show_layout (cr, layout);
      g_object_unref (layout);
    }
  cairo_restore (cr);

  g_free (axes->spectrum_values);
  g_free (axes);
  return ok;
}

/* ---- provenance ---- */

static const char *
row_name (FwFigure *fig, const Row *row)
{
  if (row->kind == FW_ROW_WAVEFORM)
    return "waveform";
  if (row->stage == FW_STAGE_SPECTRUM && fig->params)
    {
      g_autofree char *kind = fw_params_get_value (fig->params, "spectrum");
      return g_strcmp0 (kind, "magnitude") == 0 ? "magnitude" : "power";
    }
  return (int) row->stage >= 0 ? fw_stage_name (row->stage) : "matrix";
}

char *
fw_figure_dup_recipe (FwFigure *fig)
{
  g_autoptr (FwRecipe) r = fw_recipe_new ();
  GPtrArray *rows = g_ptr_array_new ();
  GPtrArray *scales = g_ptr_array_new ();
  double t0, t1;

  fw_figure_get_time_range (fig, &t0, &t1);
  r->generator = g_strdup_printf ("Framewise %s", FW_VERSION);
  r->clip = g_strdup (fig->clip ? fig->clip : "");
  r->param_set = g_strdup (fig->param_set);
  r->params_text = g_strdup (fig->params ? fw_params_get_text (fig->params) : "");
  r->params_hash = g_strdup (fig->params ? fw_params_get_hash (fig->params) : "");
  r->analysis_rate = fig->analysis_rate;
  for (size_t i = 0; i < fig->n_rows; i++)
    {
      g_ptr_array_add (rows, g_strdup (row_name (fig, &fig->rows[i])));
      if (fig->rows[i].kind == FW_ROW_HEATMAP)
        g_ptr_array_add (scales, g_strdup (fw_colour_scale_get_name (fig->rows[i].spec.scale)));
    }
  g_ptr_array_add (rows, NULL);
  g_ptr_array_add (scales, NULL);
  r->rows = (char **) g_ptr_array_free (rows, FALSE);
  r->colour_scales = (char **) g_ptr_array_free (scales, FALSE);
  r->start = t0;
  r->end = t1;
  r->frequency_scale = g_strdup (fw_axis_scale_name (fig->freq_scale));
  if (!fig->has_spectrum)
    r->spectrum = g_strdup ("none");
  else
    {
      char a[G_ASCII_DTOSTR_BUF_SIZE], b[G_ASCII_DTOSTR_BUF_SIZE];
      switch (fig->spectrum_spec.mode)
        {
        case FW_SPECTRUM_PANEL_FRAME:
          r->spectrum = g_strdup_printf ("frame:%s",
                                         g_ascii_dtostr (a, sizeof a, fig->spectrum_spec.t0));
          break;
        case FW_SPECTRUM_PANEL_RANGE:
          r->spectrum = g_strdup_printf ("range:%s:%s",
                                         g_ascii_dtostr (a, sizeof a, fig->spectrum_spec.t0),
                                         g_ascii_dtostr (b, sizeof b, fig->spectrum_spec.t1));
          break;
        case FW_SPECTRUM_PANEL_WHOLE:
        default:
          r->spectrum = g_strdup ("whole");
          break;
        }
    }
  return fw_recipe_to_text (r);
}

char *
fw_figure_dup_caption (FwFigure *fig)
{
  g_autofree char *clip = fig->clip ? g_path_get_basename (fig->clip) : g_strdup ("");
  const char *hash = fig->params ? fw_params_get_hash (fig->params) : "";

  if (fig->param_set)
    /* TRANSLATORS: caption under an exported figure: clip file, parameter set name, hash */
    return g_strdup_printf (_("Clip %s  ·  parameter set “%s”  ·  parameter hash %s"),
                            clip, fig->param_set, hash);
  /* TRANSLATORS: caption under an exported figure: clip file, parameter hash */
  return g_strdup_printf (_("Clip %s  ·  parameter hash %s"), clip, hash);
}

char *
fw_figure_dup_methods (FwFigure *fig)
{
  if (fig->params == NULL)
    return NULL;
  return fw_params_describe_methods (fig->params, fig->analysis_rate);
}
