/* fw-compare-view.c: the compare view (see fw-compare-view.h). */
#include "fw-config.h"

#include "fw-compare-view.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-feature.h"
#include "fw-render-spectrum.h"
#include "fw-screen-theme.h"
#include "fw-time-ruler.h"

/* ---------------------------------------------------------------- stages */

static const struct {
  FwStage stage;
  const char *title;
} compare_stages[] = {
  { FW_STAGE_DB,       N_("Spectrogram (dB)") },
  { FW_STAGE_MEL_DB,   N_("Mel spectrogram (dB)") },
  { FW_STAGE_MFCC,     N_("MFCC") },
  { FW_STAGE_DELTA,    N_("MFCC deltas") },
  { FW_STAGE_DELTA2,   N_("MFCC delta-deltas") },
  { FW_STAGE_SPECTRUM, N_("Spectrum (linear)") },
  { FW_STAGE_MEL,      N_("Mel spectrogram (linear)") },
};

guint
fw_compare_view_n_stages (void)
{
  return G_N_ELEMENTS (compare_stages);
}

FwStage
fw_compare_view_stage_at (guint index)
{
  g_return_val_if_fail (index < G_N_ELEMENTS (compare_stages), FW_STAGE_DB);
  return compare_stages[index].stage;
}

const char *
fw_compare_view_stage_title (FwStage stage)
{
  for (guint i = 0; i < G_N_ELEMENTS (compare_stages); i++)
    if (compare_stages[i].stage == stage)
      return _(compare_stages[i].title);
  return fw_stage_name (stage);
}

static guint
stage_index (FwStage stage)
{
  for (guint i = 0; i < G_N_ELEMENTS (compare_stages); i++)
    if (compare_stages[i].stage == stage)
      return i;
  return 0;
}

/* The plot kind whose drawing suits a stage (heatmap rows). */
static FwPlotKind
kind_for_stage (FwStage stage)
{
  switch (stage)
    {
    case FW_STAGE_MEL:
    case FW_STAGE_MEL_DB:
      return FW_PLOT_MEL;
    case FW_STAGE_MFCC:
      return FW_PLOT_MFCC;
    case FW_STAGE_DELTA:
      return FW_PLOT_DELTA;
    case FW_STAGE_DELTA2:
      return FW_PLOT_DELTA2;
    default:
      return FW_PLOT_SPECTROGRAM;
    }
}

/* ---------------------------------------------------------------- names */

static char *
clip_stem (const char *path)
{
  g_autofree char *base = g_path_get_basename (path != NULL && *path != '\0' ? path : "?");
  char *dot = strrchr (base, '.');

  if (dot != NULL && dot != base)
    *dot = '\0';
  return g_filename_display_name (base);
}

static char *
file_name (const char *path)
{
  g_autofree char *base = g_path_get_basename (path != NULL && *path != '\0' ? path : "?");
  return g_filename_display_name (base);
}

char *
fw_compare_view_name_for (FwComparison *cmp)
{
  gboolean file[2];
  g_autofree char *a = NULL;
  g_autofree char *b = NULL;

  g_return_val_if_fail (FW_IS_COMPARISON (cmp), NULL);
  for (guint s = 0; s < 2; s++)
    file[s] = fw_comparison_get_kind (cmp, s) == FW_OPERAND_FILE;
  if (!file[0] && !file[1])
    {
      const char *ca = fw_comparison_get_clip (cmp, 0), *cb = fw_comparison_get_clip (cmp, 1);
      const char *sa = fw_comparison_get_param_set (cmp, 0);
      const char *sb = fw_comparison_get_param_set (cmp, 1);
      g_autofree char *stem_a = clip_stem (ca);
      g_autofree char *stem_b = clip_stem (cb);

      if (g_strcmp0 (ca, cb) == 0)
        /* TRANSLATORS: comparison name: clip, then the two parameter sets */
        return g_strdup_printf (_("%s: %s vs %s"), stem_a, sa, sb);
      if (g_strcmp0 (sa, sb) == 0)
        /* TRANSLATORS: comparison name: two clips, then the parameter set both use */
        return g_strdup_printf (_("%s vs %s (%s)"), stem_a, stem_b, sa);
    }
  for (guint s = 0; s < 2; s++)
    {
      char *text;
      if (file[s])
        text = file_name (fw_comparison_get_clip (cmp, s));
      else
        {
          g_autofree char *stem = clip_stem (fw_comparison_get_clip (cmp, s));
          text = g_strdup_printf ("%s · %s", stem, fw_comparison_get_param_set (cmp, s));
        }
      if (s == 0)
        a = text;
      else
        b = text;
    }
  /* TRANSLATORS: comparison name: side A vs side B */
  return g_strdup_printf (_("%s vs %s"), a, b);
}

/* "calm-colony-01.flac · short-window" or "dump.npy" */
static char *
side_name (FwComparison *cmp, guint side)
{
  g_autofree char *base = file_name (fw_comparison_get_clip (cmp, side));

  if (fw_comparison_get_kind (cmp, side) == FW_OPERAND_FILE)
    return g_steal_pointer (&base);
  return g_strdup_printf ("%s · %s", base, fw_comparison_get_param_set (cmp, side));
}

/* ---------------------------------------------------------------- instance */

struct _FwCompareView {
  GtkWidget parent_instance;

  /* template children */
  GtkWidget *paned;
  GtkDropDown *stage_dropdown;
  GtkDropDown *diff_dropdown;
  GtkButton *swap_button;
  GtkToggleButton *lock_button;
  GtkToggleButton *grid_button;
  GtkWidget *error_box;
  GtkLabel *error_label;
  GtkLabel *title_label;
  GtkBox *ruler_box;
  GtkBox *rows_box;
  GtkLabel *readout_label;
  GtkWidget *progress_box;
  GtkLabel *progress_label;
  GtkProgressBar *progress_bar;
  GtkButton *cancel_button;
  GtkLabel *sides_label;
  GtkLabel *headline_label;
  GtkLabel *summary_label;
  GtkGrid *measures_grid;
  GtkDrawingArea *curves_area;
  GtkLabel *notes_label;
  GtkLabel *knobs_heading;
  GtkLabel *knobs_label;
  GtkListBox *knob_list;
  GtkButton *finder_button;
  GtkLabel *finder_label;
  GtkButton *finder_adopt_button;
  GtkLabel *info_label;

  FwProject *project;
  FwViewport *viewport;
  GtkWidget *ruler;
  FwPlotRow *rows[FW_N_COMPARE_ROWS];
  char *default_readout;

  FwComparison *cmp;
  FwCompareOperand *op[2];
  char *signature;          /* what the operands were built from, to notice edits */
  FwStage stage;

  GCancellable *cancellable;
  guint generation;
  gboolean running;         /* the comparison itself */
  gboolean ranking_running;
  gboolean finder_running;
  gint finder_permille;     /* progress of the finder, written by its worker (atomic) */
  gboolean replacing;       /* the view itself is replacing its comparison in the project */
  guint pulse_id;

  FwCompareResult *result;
  FwKnobRanking *ranking;
  FwExplainResult *finder;
  FwCompareShow show;
  FwCompareShow shows[4];
  guint n_shows;
  FwMatrix *shown;          /* the difference row's matrix */
  FwMatrix *frame_curve;    /* n_frames x 1: RMS over bins of `shown` */
  double *bin_mean;         /* per bin of `shown` over frames */
  double *bin_rms;
  char *message;
  gboolean updating;
};

G_DEFINE_FINAL_TYPE (FwCompareView, fw_compare_view, GTK_TYPE_WIDGET)

enum { SIGNAL_STATE_CHANGED, SIGNAL_READOUT, SIGNAL_SET_ADDED, N_SIGNALS };
static guint signals[N_SIGNALS];

static void start (FwCompareView *self);
static void update_progress (FwCompareView *self);
static gboolean finder_sides (FwCompareView *self, guint *dump, guint *clip);

static void
emit_state (FwCompareView *self)
{
  update_progress (self);
  g_signal_emit (self, signals[SIGNAL_STATE_CHANGED], 0);
}

static void
show_error (FwCompareView *self, const char *message)
{
  g_free (self->message);
  self->message = g_strdup (message);
  if (message != NULL)
    g_message ("%s", message);
  gtk_label_set_text (self->error_label, message != NULL ? message : "");
  gtk_widget_set_visible (self->error_box, message != NULL);
}

static void
show_info (FwCompareView *self, const char *text)
{
  gtk_label_set_text (self->info_label, text != NULL ? text : "");
  gtk_widget_set_visible (GTK_WIDGET (self->info_label), text != NULL);
}

/* ---------------------------------------------------------------- progress */

static gboolean
pulse_cb (gpointer user_data)
{
  FwCompareView *self = user_data;

  if (self->finder_running)
    gtk_progress_bar_set_fraction (self->progress_bar,
                                   CLAMP (g_atomic_int_get (&self->finder_permille), 0, 1000) / 1000.0);
  else
    gtk_progress_bar_pulse (self->progress_bar);
  return G_SOURCE_CONTINUE;
}

static void
update_progress (FwCompareView *self)
{
  gboolean busy = self->running || self->ranking_running || self->finder_running;

  gtk_widget_set_visible (self->progress_box, busy);
  if (busy)
    {
      const char *text;
      if (self->running)
        text = _("Computing both sides and their difference…");
      else if (self->ranking_running)
        text = _("Trying each differing key of B on A…");
      else
        text = _("Searching the conventions…");
      gtk_label_set_text (self->progress_label, text);
      if (self->pulse_id == 0)
        self->pulse_id = g_timeout_add (120, pulse_cb, self);
    }
  else
    g_clear_handle_id (&self->pulse_id, g_source_remove);
}

/* ---------------------------------------------------------------- rows */

static void
on_row_readout (FwPlotRow *row, const char *text, FwCompareView *self)
{
  g_autofree char *full = NULL;

  if (text != NULL)
    full = g_strdup_printf ("%s: %s", fw_plot_row_get_title (row), text);
  gtk_label_set_text (self->readout_label, full != NULL ? full : self->default_readout);
  g_signal_emit (self, signals[SIGNAL_READOUT], 0, full);
}

static void
update_locked_ranges (FwCompareView *self)
{
  FwPlotRow *a = self->rows[FW_COMPARE_ROW_A], *b = self->rows[FW_COMPARE_ROW_B];
  FwValueRange ra, rb;
  gboolean have_a, have_b;

  if (a == NULL || b == NULL)
    return;
  if (!gtk_toggle_button_get_active (self->lock_button))
    {
      for (guint i = 0; i < 2; i++)
        {
          FwPlotRow *row = i == 0 ? a : b;
          if (fw_plot_row_get_range_mode (row) == FW_RANGE_LOCKED)
            fw_plot_row_set_range_mode (row, FW_RANGE_AUTO, NULL);
          fw_plot_row_set_shared_range (row, NULL);
        }
      return;
    }
  have_a = fw_plot_row_get_auto_range (a, &ra);
  have_b = fw_plot_row_get_auto_range (b, &rb);
  if (have_a && have_b)
    fw_value_range_union (&ra, &rb);
  else if (have_b)
    ra = rb;
  for (guint i = 0; i < 2; i++)
    {
      FwPlotRow *row = i == 0 ? a : b;
      if (fw_plot_row_get_range_mode (row) != FW_RANGE_LOCKED)
        fw_plot_row_set_range_mode (row, FW_RANGE_LOCKED, NULL);
      if (have_a || have_b)
        fw_plot_row_set_shared_range (row, &ra);
    }
}

static void
on_row_range_changed (FwPlotRow *row, FwCompareView *self)
{
  update_locked_ranges (self);
}

static void
on_row_state_changed (FwPlotRow *row, FwCompareView *self)
{
  emit_state (self);
}

static void
on_row_settings_changed (FwPlotRow *row, FwCompareView *self)
{
  /* A and B keep one colour scale and frequency axis, so equal colours mean equal values */
  FwPlotRow *a = self->rows[FW_COMPARE_ROW_A], *b = self->rows[FW_COMPARE_ROW_B];
  FwPlotRow *other = row == a ? b : row == b ? a : NULL;

  if (other == NULL)
    return;
  g_signal_handlers_block_by_func (other, on_row_settings_changed, self);
  fw_plot_row_set_colour_scale (other, fw_plot_row_get_colour_scale (row));
  fw_plot_row_set_frequency_scale (other, fw_plot_row_get_frequency_scale (row));
  g_signal_handlers_unblock_by_func (other, on_row_settings_changed, self);
}

static void
release_rows (FwCompareView *self)
{
  for (guint i = 0; i < FW_N_COMPARE_ROWS; i++)
    if (self->rows[i] != NULL)
      {
        g_signal_handlers_disconnect_by_data (self->rows[i], self);
        fw_plot_row_cancel (self->rows[i]);
        gtk_box_remove (self->rows_box, GTK_WIDGET (self->rows[i]));
        g_clear_object (&self->rows[i]);
      }
}

/* Rows are made for the stage's kind of drawing (heatmap rows of that kind, a curve for the
 * per-frame difference). */
static void
make_rows (FwCompareView *self)
{
  FwPlotKind kind = kind_for_stage (self->stage);

  release_rows (self);
  if (self->viewport == NULL)
    return;
  for (guint i = 0; i < FW_N_COMPARE_ROWS; i++)
    {
      FwPlotRow *row = fw_plot_row_new (i == FW_COMPARE_ROW_FRAMES ? FW_PLOT_RMS : kind,
                                        self->viewport);
      self->rows[i] = g_object_ref_sink (row);
      fw_plot_row_set_data (row, NULL, NULL, self->stage, NULL, NULL, NULL,
                            i >= FW_COMPARE_ROW_DIFF);
      if (i == FW_COMPARE_ROW_FRAMES)
        gtk_widget_set_size_request (GTK_WIDGET (row), -1, 110);
      g_signal_connect (row, "readout", G_CALLBACK (on_row_readout), self);
      g_signal_connect (row, "state-changed", G_CALLBACK (on_row_state_changed), self);
      g_signal_connect (row, "range-changed", G_CALLBACK (on_row_range_changed), self);
      g_signal_connect (row, "settings-changed", G_CALLBACK (on_row_settings_changed), self);
      gtk_box_append (self->rows_box, GTK_WIDGET (row));
    }
  update_locked_ranges (self);
}

/* ---------------------------------------------------------------- words */

static char *
with_unit (double v, const char *unit, const char *format)
{
  g_autofree char *n = g_strdup_printf (format, v);

  if (unit == NULL || *unit == '\0')
    return g_steal_pointer (&n);
  return g_strdup_printf ("%s %s", n, unit);
}

static char *
hz_words (double hz)
{
  if (fabs (hz) >= 1000)
    return g_strdup_printf (_("%.2f kHz"), hz / 1000.0);
  return g_strdup_printf (_("%.0f Hz"), hz);
}

static char *
bin_words (const FwMatrix *m, gsize k)
{
  g_autofree char *hz = NULL;

  if (k >= m->n_bins)
    return g_strdup ("?");
  switch (m->bin_kind)
    {
    case FW_BIN_AXIS_HZ:
      hz = hz_words (m->bin_value[k]);
      return g_strdup_printf (_("bin %zu (%s)"), k, hz);
    case FW_BIN_AXIS_MEL_BAND:
      hz = hz_words (m->bin_value[k]);
      return g_strdup_printf (_("band %zu (%s)"), k, hz);
    case FW_BIN_AXIS_COEFFICIENT:
      return g_strdup_printf (_("coefficient c%zu"), k);
    case FW_BIN_AXIS_SCALAR:
    default:
      return g_strdup_printf (_("column %zu"), k);
    }
}

static const char *
bins_word (const FwMatrix *m)
{
  switch (m->bin_kind)
    {
    case FW_BIN_AXIS_MEL_BAND:
      return _("bands");
    case FW_BIN_AXIS_COEFFICIENT:
      return _("coefficients");
    case FW_BIN_AXIS_HZ:
      return _("bins");
    default:
      return _("columns");
    }
}

/* ---------------------------------------------------------------- measures and curves */

static void
clear_grid (GtkGrid *grid)
{
  GtkWidget *child;

  while ((child = gtk_widget_get_first_child (GTK_WIDGET (grid))) != NULL)
    gtk_grid_remove (grid, child);
}

static void
add_measure (FwCompareView *self, int row, const char *name, const char *value)
{
  GtkWidget *n = gtk_label_new (name);
  GtkWidget *v = gtk_label_new (value);

  gtk_label_set_xalign (GTK_LABEL (n), 0);
  gtk_label_set_yalign (GTK_LABEL (n), 0);
  gtk_widget_add_css_class (n, "dim-label");
  gtk_label_set_xalign (GTK_LABEL (v), 0);
  gtk_label_set_wrap (GTK_LABEL (v), TRUE);
  gtk_label_set_selectable (GTK_LABEL (v), TRUE);
  gtk_widget_set_hexpand (v, TRUE);
  gtk_widget_add_css_class (v, "fw-fact");
  gtk_grid_attach (self->measures_grid, n, 0, row, 1, 1);
  gtk_grid_attach (self->measures_grid, v, 1, row, 1, 1);
}

static void
fill_measures (FwCompareView *self)
{
  const FwCompareResult *r = self->result;
  const FwDiffResult *d;
  const FwDiffExplanation *e;
  const char *unit, *eunit;
  int row = 0;

  clear_grid (self->measures_grid);
  if (r == NULL)
    return;
  d = r->diff;
  e = &d->expl;
  unit = r->unit;
  eunit = r->expl_unit;
  {
    g_autofree char *v = NULL;
    if (r->frames_by_index)
      v = g_strdup_printf (_("%zu frames × %zu %s (frame by frame)"), d->n_frames, d->n_bins,
                           bins_word (d->a));
    else
      v = g_strdup_printf (_("%zu frames × %zu %s, %.3f–%.3f s"), d->n_frames, d->n_bins,
                           bins_word (d->a), d->align.start, d->align.end);
    add_measure (self, row++, _("Compared"), v);
  }
  {
    g_autofree char *amount = with_unit (d->max_abs_diff, unit, "%.3g");
    g_autofree char *where = bin_words (d->a, d->max_bin);
    double t = d->max_frame < d->a->n_frames ? d->a->frame_times[d->max_frame] : 0;
    g_autofree char *v = r->frames_by_index
      ? g_strdup_printf (_("%s at frame %zu, %s"), amount, d->max_frame, where)
      : g_strdup_printf (_("%s at %.3f s, %s"), amount, t, where);
    add_measure (self, row++, _("Largest |B − A|"), v);
  }
  {
    g_autofree char *rms = with_unit (d->rms_diff, unit, "%.3g");
    g_autofree char *mean = with_unit (d->mean_diff, unit, "%.3g");
    add_measure (self, row++, _("RMS of B − A"), rms);
    add_measure (self, row++, _("Mean of B − A"), mean);
  }
  {
    g_autofree char *v = isnan (d->correlation) ? g_strdup (_("undefined (one side is constant)"))
                                                : g_strdup_printf ("%.3f", d->correlation);
    add_measure (self, row++, _("Correlation of A and B"), v);
  }
  {
    g_autofree char *v = NULL;
    if (e->lag_frames == 0)
      v = g_strdup (_("none (B is not shifted against A)"));
    else if (e->lag_frames > 0)
      v = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "B is %d frame later than A",
                                        "B is %d frames later than A", e->lag_frames),
                           e->lag_frames);
    else
      v = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "B is %d frame earlier than A",
                                        "B is %d frames earlier than A", -e->lag_frames),
                           -e->lag_frames);
    add_measure (self, row++, _("Time shift"), v);
  }
  {
    g_autofree char *offset = with_unit (e->offset, eunit, "%+.3g");
    add_measure (self, row++, _("Constant offset"), offset);
  }
  {
    g_autofree char *rms = with_unit (e->residual_rms, eunit, "%.3g");
    g_autofree char *share = e->total_rms > 0
      ? g_strdup_printf (_("%s (%.0f %% of the RMS difference explained)"), rms,
                         100.0 * MAX (0.0, 1.0 - e->residual_rms / e->total_rms))
      : g_strdup (rms);
    add_measure (self, row++, _("Left unexplained (RMS)"), share);
  }
}

/* The per-bin curves of the difference row's matrix: mean and RMS over frames. */
static void
compute_curves (FwCompareView *self)
{
  const FwMatrix *m = self->shown;
  double *sum2;
  gsize *count;

  g_clear_pointer (&self->bin_mean, g_free);
  g_clear_pointer (&self->bin_rms, g_free);
  g_clear_pointer (&self->frame_curve, fw_matrix_unref);
  if (m == NULL || m->n_frames == 0 || m->n_bins == 0)
    return;
  self->bin_mean = g_new0 (double, m->n_bins);
  self->bin_rms = g_new0 (double, m->n_bins);
  sum2 = g_new0 (double, m->n_bins);
  count = g_new0 (gsize, m->n_bins);
  self->frame_curve = fw_matrix_new (m->n_frames, 1);
  self->frame_curve->bin_kind = FW_BIN_AXIS_SCALAR;
  self->frame_curve->sample_rate = m->sample_rate;
  self->frame_curve->hop_seconds = m->hop_seconds;
  self->frame_curve->stage = m->stage;
  for (gsize t = 0; t < m->n_frames; t++)
    {
      double fs = 0;
      gsize fn = 0;
      self->frame_curve->frame_times[t] = m->frame_times[t];
      for (gsize k = 0; k < m->n_bins; k++)
        {
          double v = m->data[t * m->n_bins + k];
          if (!isfinite (v))
            continue;
          self->bin_mean[k] += v;
          sum2[k] += v * v;
          count[k]++;
          fs += v * v;
          fn++;
        }
      self->frame_curve->data[t] = fn > 0 ? (float) sqrt (fs / fn) : NAN;
    }
  self->frame_curve->bin_value[0] = 0;
  self->frame_curve->bin_low[0] = 0;
  self->frame_curve->bin_high[0] = 0;
  for (gsize k = 0; k < m->n_bins; k++)
    {
      self->bin_mean[k] = count[k] > 0 ? self->bin_mean[k] / count[k] : NAN;
      self->bin_rms[k] = count[k] > 0 ? sqrt (sum2[k] / count[k]) : NAN;
    }
  g_free (sum2);
  g_free (count);
}

static const char *
show_unit (FwCompareView *self)
{
  if (self->result == NULL)
    return "";
  switch (self->show)
    {
    case FW_COMPARE_SHOW_RATIO_DB:
    case FW_COMPARE_SHOW_RESIDUAL:
      return self->result->expl_unit;
    case FW_COMPARE_SHOW_RELATIVE:
      return "";
    case FW_COMPARE_SHOW_DIFF:
    default:
      return self->result->unit;
    }
}

static char *
show_quantity (FwCompareView *self)
{
  const char *u = show_unit (self);

  switch (self->show)
    {
    case FW_COMPARE_SHOW_RATIO_DB:
      return g_strdup (_("B / A, dB"));
    case FW_COMPARE_SHOW_RELATIVE:
      return g_strdup (_("(B − A) / |A|"));
    case FW_COMPARE_SHOW_RESIDUAL:
      return *u ? g_strdup_printf (_("left over, %s"), u) : g_strdup (_("left over"));
    case FW_COMPARE_SHOW_DIFF:
    default:
      return *u ? g_strdup_printf (_("B − A, %s"), u) : g_strdup (_("B − A"));
    }
}

/* The short name in the chooser. */
static const char *
show_choice (FwCompareShow show)
{
  switch (show)
    {
    case FW_COMPARE_SHOW_RATIO_DB:
      return _("B / A in dB");
    case FW_COMPARE_SHOW_RELATIVE:
      return _("(B − A) / |A|");
    case FW_COMPARE_SHOW_RESIDUAL:
      return _("Left unexplained");
    case FW_COMPARE_SHOW_DIFF:
    default:
      return _("B − A");
    }
}

static const char *
show_title (FwCompareShow show)
{
  switch (show)
    {
    case FW_COMPARE_SHOW_RATIO_DB:
      return _("Ratio B / A in dB");
    case FW_COMPARE_SHOW_RELATIVE:
      return _("Relative difference (B − A) / |A|");
    case FW_COMPARE_SHOW_RESIDUAL:
      return _("What the explanation leaves (B − A without offsets and shift)");
    case FW_COMPARE_SHOW_DIFF:
    default:
      return _("Difference B − A");
    }
}

static FwMatrix *
matrix_for_show (FwCompareView *self, FwCompareShow show)
{
  const FwDiffResult *d = self->result != NULL ? self->result->diff : NULL;

  if (d == NULL)
    return NULL;
  switch (show)
    {
    case FW_COMPARE_SHOW_RATIO_DB:
      return d->ratio_db;
    case FW_COMPARE_SHOW_RELATIVE:
      return d->relative;
    case FW_COMPARE_SHOW_RESIDUAL:
      return d->residual;
    case FW_COMPARE_SHOW_DIFF:
    default:
      return d->diff;
    }
}

static void
apply_difference (FwCompareView *self)
{
  g_autofree char *quantity = NULL;
  g_autofree char *frames_quantity = NULL;
  const char *unit = show_unit (self);
  FwMatrix *m = matrix_for_show (self, self->show);

  g_clear_pointer (&self->shown, fw_matrix_unref);
  if (m != NULL)
    self->shown = fw_matrix_ref (m);
  compute_curves (self);
  quantity = show_quantity (self);
  frames_quantity = g_strdup_printf (_("RMS of %s"), quantity);
  if (self->rows[FW_COMPARE_ROW_DIFF] != NULL)
    {
      fw_plot_row_set_data (self->rows[FW_COMPARE_ROW_DIFF], self->shown, NULL, self->stage,
                            show_title (self->show), quantity, unit, TRUE);
      fw_plot_row_set_data (self->rows[FW_COMPARE_ROW_FRAMES], self->frame_curve, NULL,
                            self->stage, _("Difference per frame (RMS over all bins)"),
                            frames_quantity, unit, TRUE);
    }
  gtk_widget_queue_draw (GTK_WIDGET (self->curves_area));
}

/* The per-bin curves beside the rows, drawn with the render layer's axis and line code. */
static void
draw_curves (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer user_data)
{
  FwCompareView *self = user_data;
  const FwMatrix *m = self->shown;
  FwTheme theme, second;
  FwSpectrumSpec spec;
  FwAxis x_axis, y_axis;
  FwTickStyle x_style;
  FwTicks ticks;
  double lo = HUGE_VAL, hi = -HUGE_VAL;
  double x = 54, y = 24, w = width - 54 - 12, h = height - 24 - 38;
  FwNiceLabels nl;
  g_autofree char *quantity = NULL;
  char x_unit[16] = "";

  if (w < 40 || h < 30)
    return;
  fw_screen_theme_for_widget (GTK_WIDGET (area), &theme);
  fw_theme_set_source (cr, &theme.foreground);
  fw_theme_draw_text (cr, &theme, FW_TEXT_TITLE, _("Difference per bin, over all frames"), 0,
                      14, FW_ALIGN_START, FW_ALIGN_END, false);
  if (m == NULL || self->bin_mean == NULL)
    {
      fw_theme_set_source (cr, &theme.muted);
      fw_theme_draw_text (cr, &theme, FW_TEXT_AXIS, _("Appears when the comparison is done."),
                          x + w / 2, y + h / 2, FW_ALIGN_CENTER, FW_ALIGN_CENTER, false);
      return;
    }
  for (gsize k = 0; k < m->n_bins; k++)
    {
      if (isfinite (self->bin_mean[k]))
        {
          lo = MIN (lo, self->bin_mean[k]);
          hi = MAX (hi, self->bin_mean[k]);
        }
      if (isfinite (self->bin_rms[k]))
        hi = MAX (hi, self->bin_rms[k]);
    }
  if (!(hi >= lo))
    lo = 0, hi = 1;
  lo = MIN (lo, 0);
  hi = MAX (hi, 0);
  if (hi - lo < 1e-12)
    hi = lo + 1;
  fw_nice_loose_labels (lo, hi, 5, &nl);
  fw_spectrum_spec_init (&spec, self->stage);
  fw_spectrum_panel_x_axis (m, &spec, x, x + w, &x_axis, &x_style);
  fw_axis_init (&y_axis, FW_AXIS_LINEAR, nl.graph_min, nl.graph_max, y + h, y);

  fw_theme_set_source (cr, &theme.data_background);
  cairo_rectangle (cr, x, y, w, h);
  cairo_fill (cr);
  {
    double zy = round (fw_axis_value_to_pixel (&y_axis, 0)) + 0.5;
    cairo_save (cr);
    fw_theme_set_source (cr, &theme.muted);
    cairo_set_line_width (cr, 1);
    cairo_move_to (cr, x, zy);
    cairo_line_to (cr, x + w, zy);
    cairo_stroke (cr);
    cairo_restore (cr);
  }
  /* RMS in a light tone under the mean */
  second = theme;
  second.trace = (FwRgba) { 0.55, 0.62, 0.75, 1 };
  fw_spectrum_panel_draw (cr, &second, m, self->bin_rms, &x_axis, &y_axis, x, y, w, h);
  fw_spectrum_panel_draw (cr, &theme, m, self->bin_mean, &x_axis, &y_axis, x, y, w, h);

  fw_axis_choose_ticks (cr, &theme, &x_axis, x_style, true, 12, &ticks);
  fw_axis_draw (cr, &theme, &x_axis, &ticks, FW_EDGE_BOTTOM, y + h, true);
  g_strlcpy (x_unit, ticks.unit, sizeof x_unit);
  fw_axis_choose_ticks (cr, &theme, &y_axis, FW_TICK_NUMBER, false,
                        0.5 * theme.font_size[FW_TEXT_TICK], &ticks);
  fw_axis_draw (cr, &theme, &y_axis, &ticks, FW_EDGE_LEFT, x, true);
  fw_theme_set_source (cr, &theme.foreground);
  cairo_set_line_width (cr, theme.line_width);
  cairo_rectangle (cr, x, y, w, h);
  cairo_stroke (cr);

  /* unit above the value axis, axis title below, legend at the top right */
  quantity = show_quantity (self);
  fw_theme_set_source (cr, &theme.muted);
  fw_theme_draw_text (cr, &theme, FW_TEXT_TICK, show_unit (self),
                      x - theme.tick_length - theme.pad, y - theme.pad - 1, FW_ALIGN_END,
                      FW_ALIGN_END, false);
  {
    g_autofree char *axis_title = NULL;
    if (m->bin_kind == FW_BIN_AXIS_COEFFICIENT || m->bin_kind == FW_BIN_AXIS_SCALAR)
      axis_title = g_strdup (_("Coefficient"));
    else
      /* TRANSLATORS: axis title, %s is the unit (Hz or kHz) */
      axis_title = g_strdup_printf (_("Frequency (%s)"), x_unit);
    fw_theme_set_source (cr, &theme.foreground);
    fw_theme_draw_text (cr, &theme, FW_TEXT_AXIS, axis_title, x + w / 2, height - 2,
                        FW_ALIGN_CENTER, FW_ALIGN_END, false);
  }
  {
    double lx = x + w - 4, ly = y + 4, tw;
    g_autofree char *mean_text = g_strdup_printf (_("mean of %s"), quantity);
    g_autofree char *rms_text = g_strdup (_("RMS"));

    fw_theme_set_source (cr, &second.trace);
    tw = fw_theme_draw_text (cr, &theme, FW_TEXT_TICK, rms_text, lx, ly, FW_ALIGN_END,
                             FW_ALIGN_START, false);
    cairo_rectangle (cr, lx - tw - 16, ly + 5, 12, 2);
    cairo_fill (cr);
    lx -= tw + 24;
    fw_theme_set_source (cr, &theme.trace);
    tw = fw_theme_draw_text (cr, &theme, FW_TEXT_TICK, mean_text, lx, ly, FW_ALIGN_END,
                             FW_ALIGN_START, false);
    cairo_rectangle (cr, lx - tw - 16, ly + 5, 12, 2);
    cairo_fill (cr);
  }
}

/* ---------------------------------------------------------------- headline */

static gboolean
same_settings (FwCompareView *self)
{
  FwParams *pa, *pb;

  if (self->op[0] == NULL || self->op[1] == NULL || fw_compare_operand_is_file (self->op[0]) ||
      fw_compare_operand_is_file (self->op[1]))
    return FALSE;
  pa = fw_compare_operand_get_params (self->op[0]);
  pb = fw_compare_operand_get_params (self->op[1]);
  return pa != NULL && pb != NULL && fw_params_equal (pa, pb);
}

/* One or two plain sentences above the engine's explanation: which setting is behind the
 * difference (from the ranking), and where in frequency B lies above or below A. */
static void
update_headline (FwCompareView *self)
{
  const FwCompareResult *r = self->result;
  const FwDiffResult *d;
  const FwDiffExplanation *e;
  GString *s;

  if (r == NULL)
    {
      gtk_widget_set_visible (GTK_WIDGET (self->headline_label), FALSE);
      return;
    }
  d = r->diff;
  e = &d->expl;
  s = g_string_new (NULL);
  if (e->identical)
    g_string_append (s, _("A and B are identical."));
  else
    {
      if (self->finder != NULL && self->finder->changed_keys != NULL &&
          self->finder->changed_keys[0] != NULL)
        {
          GString *keys = g_string_new (NULL);
          for (guint i = 0; self->finder->changed_keys[i] != NULL; i++)
            {
              g_autofree char *v = fw_params_get_value (self->finder->params,
                                                        self->finder->changed_keys[i]);
              g_string_append_printf (keys, "%s%s=%s", i > 0 ? ", " : "",
                                      self->finder->changed_keys[i], v);
            }
          guint dump = 1, clip = 0;
          g_autofree char *source = NULL;

          finder_sides (self, &dump, &clip);
          source = side_name (self->cmp, clip);
          if (self->finder->relative_rms < FW_EXPLAIN_EXACT_RELATIVE)
            /* TRANSLATORS: first %s is "clip · parameter set", the second "key=value, ..." */
            g_string_append_printf (s, _("The file is %s with %s: with those settings the two "
                                         "agree to float32 rounding."),
                                    source, keys->str);
          else
            g_string_append_printf (s, _("The closest settings for the file are %s; they leave "
                                         "%.2g of its RMS unexplained."),
                                    keys->str, self->finder->relative_rms);
          g_string_free (keys, TRUE);
        }
      else if (same_settings (self))
        g_string_append (s, _("Both sides use the same settings, so the difference is in the "
                              "sound itself."));
      else if (self->ranking != NULL && self->ranking->knobs->len > 0)
        {
          const FwKnob *best = self->ranking->knobs->pdata[0];

          if (!isnan (best->removed) && best->removed >= 0.9)
            g_string_append_printf (s, _("It is %s: computing A with B's value (%s instead of "
                                         "%s) removes %.0f %% of the difference."),
                                    best->key, best->value_b, best->value_a,
                                    100.0 * best->removed);
          else if (!isnan (best->removed) && best->removed >= 0.3)
            g_string_append_printf (s, _("Mostly %s: B's value alone (%s instead of %s) removes "
                                         "%.0f %% of the difference; the other keys add the "
                                         "rest."),
                                    best->key, best->value_b, best->value_a,
                                    100.0 * best->removed);
          else if (!isnan (best->removed))
            g_string_append_printf (s, _("No single key explains it: the best, %s, removes "
                                         "%.0f %% of the difference alone; the keys act "
                                         "together."),
                                    best->key, 100.0 * MAX (best->removed, 0.0));
          else
            g_string_append (s, _("No differing key can be applied to A alone: the keys act "
                                  "together."));
        }
      if (e->bin_offset != NULL && d->n_bins > 1)
        {
          gsize kmax = 0, kmin = 0;
          const char *u = r->expl_unit;
          for (gsize k = 1; k < d->n_bins; k++)
            {
              if (e->bin_offset[k] > e->bin_offset[kmax])
                kmax = k;
              if (e->bin_offset[k] < e->bin_offset[kmin])
                kmin = k;
            }
          {
            double hi = e->offset + e->bin_offset[kmax], lo = e->offset + e->bin_offset[kmin];
            g_autofree char *hi_v = with_unit (fabs (hi), u, "%.1f");
            g_autofree char *lo_v = with_unit (fabs (lo), u, "%.1f");
            g_autofree char *hi_w = bin_words (d->a, kmax);
            g_autofree char *lo_w = bin_words (d->a, kmin);

            if (s->len > 0)
              g_string_append_c (s, ' ');
            if (hi > 0 && lo < 0)
              g_string_append_printf (s, _("Averaged over time, B lies up to %s above A, at %s, "
                                           "and up to %s below it, at %s."),
                                      hi_v, hi_w, lo_v, lo_w);
            else if (hi > 0)
              g_string_append_printf (s, _("Averaged over time, B lies above A everywhere, by "
                                           "%s to %s, most at %s."),
                                      lo_v, hi_v, hi_w);
            else
              g_string_append_printf (s, _("Averaged over time, B lies below A everywhere, by "
                                           "%s to %s, most at %s."),
                                      hi_v, lo_v, lo_w);
          }
        }
    }
  gtk_label_set_text (self->headline_label, s->str);
  gtk_widget_set_visible (GTK_WIDGET (self->headline_label), s->len > 0);
  g_string_free (s, TRUE);
}

/* ---------------------------------------------------------------- knob ranking */

static void
on_adopt_clicked (GtkButton *button, FwCompareView *self)
{
  const char *key = g_object_get_data (G_OBJECT (button), "fw-key");
  g_autoptr (GError) error = NULL;

  if (fw_compare_view_adopt_knob (self, key, &error) == NULL)
    show_error (self, error->message);
}

static GtkWidget *
knob_row (FwCompareView *self, const FwKnob *k, const char *unit)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 4);
  GtkWidget *top = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 8);
  GtkWidget *name = gtk_label_new (NULL);
  GtkWidget *detail = gtk_label_new (NULL);
  GtkWidget *button = gtk_button_new_with_mnemonic (_("_New Set"));
  const char *set_name = fw_comparison_get_param_set (self->cmp, 0);
  g_autofree char *markup = g_markup_printf_escaped ("<b>%s</b>  %s → %s", k->key, k->value_a,
                                                     k->value_b);
  g_autofree char *tip = g_strdup_printf (_("Add a parameter set: “%s” with %s=%s"), set_name,
                                          k->key, k->value_b);
  g_autofree char *after = with_unit (k->rms_after, unit, "%.3g");
  GString *text = g_string_new (NULL);

  gtk_label_set_markup (GTK_LABEL (name), markup);
  gtk_label_set_xalign (GTK_LABEL (name), 0);
  gtk_label_set_wrap (GTK_LABEL (name), TRUE);
  gtk_label_set_wrap_mode (GTK_LABEL (name), PANGO_WRAP_WORD_CHAR);
  gtk_widget_set_hexpand (name, TRUE);
  gtk_widget_set_valign (button, GTK_ALIGN_CENTER);
  gtk_widget_set_tooltip_text (button, tip);
  gtk_accessible_update_property (GTK_ACCESSIBLE (button), GTK_ACCESSIBLE_PROPERTY_LABEL, tip,
                                  -1);
  g_object_set_data_full (G_OBJECT (button), "fw-key", g_strdup (k->key), g_free);
  g_signal_connect (button, "clicked", G_CALLBACK (on_adopt_clicked), self);
  gtk_box_append (GTK_BOX (top), name);
  gtk_box_append (GTK_BOX (top), button);
  gtk_box_append (GTK_BOX (box), top);

  if (k->problem != NULL)
    g_string_append_printf (text, _("Cannot be applied alone: %s"), k->problem);
  else if (k->removed >= 0)
    {
      GtkWidget *bar = gtk_level_bar_new_for_interval (0, 1);
      g_autofree char *bar_label = g_strdup_printf (_("%s removes %.0f %% of the difference"),
                                                    k->key, 100.0 * k->removed);
      gtk_level_bar_set_value (GTK_LEVEL_BAR (bar), CLAMP (k->removed, 0, 1));
      gtk_accessible_update_property (GTK_ACCESSIBLE (bar), GTK_ACCESSIBLE_PROPERTY_LABEL,
                                      bar_label, -1);
      gtk_box_append (GTK_BOX (box), bar);
      g_string_append_printf (text, _("Alone, it removes %.0f %% of the difference (RMS %s "
                                      "left)."),
                              100.0 * k->removed, after);
    }
  else
    g_string_append_printf (text, _("Alone, it makes the difference %.0f %% larger (RMS %s)."),
                            -100.0 * k->removed, after);
  if (!isnan (k->left_without))
    {
      g_string_append_c (text, ' ');
      if (k->left_without > 0.005)
        g_string_append_printf (text, _("With every other key of B applied, %.0f %% of the "
                                        "difference remains."),
                                100.0 * k->left_without);
      else
        g_string_append (text, _("The other keys of B alone already explain the difference."));
    }
  gtk_label_set_text (GTK_LABEL (detail), text->str);
  g_string_free (text, TRUE);
  gtk_label_set_xalign (GTK_LABEL (detail), 0);
  gtk_label_set_wrap (GTK_LABEL (detail), TRUE);
  gtk_label_set_wrap_mode (GTK_LABEL (detail), PANGO_WRAP_WORD_CHAR);
  gtk_widget_add_css_class (detail, "dim-label");
  gtk_widget_add_css_class (detail, "caption");
  gtk_box_append (GTK_BOX (box), detail);
  gtk_widget_add_css_class (box, "fw-knob-row");
  return box;
}

static void
clear_knobs (FwCompareView *self)
{
  GtkWidget *child;

  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->knob_list))) != NULL)
    gtk_list_box_remove (self->knob_list, child);
  gtk_widget_set_visible (GTK_WIDGET (self->knob_list), FALSE);
}

static void
fill_knobs (FwCompareView *self)
{
  const FwKnobRanking *r = self->ranking;
  g_autofree char *before = NULL;
  g_autofree char *text = NULL;

  clear_knobs (self);
  if (r == NULL)
    return;
  before = with_unit (r->rms_before, r->unit, "%.3g");
  text = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                       "%u key differs. The RMS difference is %s; the row below "
                                       "says how much of it goes away when A takes B's value "
                                       "for that key alone.",
                                       "%u keys differ. The RMS difference is %s; each row says "
                                       "how much of it goes away when A takes B's value for "
                                       "that key alone (best first).",
                                       r->knobs->len),
                          r->knobs->len, before);
  gtk_label_set_text (self->knobs_label, text);
  for (guint i = 0; i < r->knobs->len; i++)
    gtk_list_box_append (self->knob_list, knob_row (self, r->knobs->pdata[i], r->unit));
  gtk_widget_set_visible (GTK_WIDGET (self->knob_list), r->knobs->len > 0);
}

typedef struct {
  FwCompareView *view;
  guint generation;
} Pending;

static Pending *
pending_new (FwCompareView *self)
{
  Pending *p = g_new0 (Pending, 1);

  p->view = g_object_ref (self);
  p->generation = self->generation;
  return p;
}

static void
pending_free (Pending *p)
{
  g_object_unref (p->view);
  g_free (p);
}

static gboolean
is_cancel (const GError *error)
{
  return g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED) ||
         g_error_matches (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_CANCELLED) ||
         g_error_matches (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_CANCELLED);
}

typedef struct {
  FwCompareOperand *a, *b;
} RankJob;

static void
rank_job_free (RankJob *job)
{
  fw_compare_operand_unref (job->a);
  fw_compare_operand_unref (job->b);
  g_free (job);
}

static void
rank_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  RankJob *job = task_data;
  GError *error = NULL;
  FwKnobRanking *r = fw_compare_rank_knobs (job->a, job->b, cancellable, &error);

  if (r == NULL)
    g_task_return_error (task, error);
  else
    g_task_return_pointer (task, r, (GDestroyNotify) fw_knob_ranking_free);
}

static void
on_rank_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  Pending *p = user_data;
  FwCompareView *self = p->view;
  g_autoptr (GError) error = NULL;
  FwKnobRanking *r = g_task_propagate_pointer (G_TASK (result), &error);

  if (p->generation != self->generation)
    {
      g_clear_pointer (&r, fw_knob_ranking_free);
      pending_free (p);
      return;
    }
  self->ranking_running = FALSE;
  if (r == NULL)
    {
      if (is_cancel (error))
        gtk_label_set_text (self->knobs_label, _("Stopped before every key was tried."));
      else
        {
          g_autofree char *msg = g_strdup_printf (_("The keys could not be ranked: %s"),
                                                  error->message);
          gtk_label_set_text (self->knobs_label, msg);
        }
    }
  else
    {
      g_clear_pointer (&self->ranking, fw_knob_ranking_free);
      self->ranking = r;
      fill_knobs (self);
      update_headline (self);
    }
  emit_state (self);
  pending_free (p);
}

static void
start_ranking (FwCompareView *self)
{
  GTask *task;
  RankJob *job;

  job = g_new0 (RankJob, 1);
  job->a = fw_compare_operand_ref (self->op[0]);
  job->b = fw_compare_operand_ref (self->op[1]);
  self->ranking_running = TRUE;
  gtk_label_set_text (self->knobs_label, _("Trying each differing key of B on A…"));
  task = g_task_new (NULL, self->cancellable, on_rank_done, pending_new (self));
  g_task_set_source_tag (task, start_ranking);
  g_task_set_task_data (task, job, (GDestroyNotify) rank_job_free);
  g_task_run_in_thread (task, rank_thread);
  g_object_unref (task);
  emit_state (self);
}

/* ---------------------------------------------------------------- convention finder */

typedef struct {
  FwCompareOperand *dump, *clip;
  FwCompareView *view;      /* only its finder_permille is written */
  GCancellable *cancellable;
} FinderJob;

static void
finder_job_free (FinderJob *job)
{
  fw_compare_operand_unref (job->dump);
  fw_compare_operand_unref (job->clip);
  g_object_unref (job->view);
  g_clear_object (&job->cancellable);
  g_free (job);
}

static int
finder_progress (double fraction, void *user_data)
{
  FinderJob *job = user_data;

  g_atomic_int_set (&job->view->finder_permille, (gint) (CLAMP (fraction, 0, 1) * 1000));
  return g_cancellable_is_cancelled (job->cancellable) ? 1 : 0;
}

static void
finder_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  FinderJob *job = task_data;
  FwExplainOptions options;
  GError *error = NULL;
  FwExplainResult *r;

  fw_explain_options_init (&options);
  options.progress = finder_progress;
  options.user_data = job;
  r = fw_compare_explain (job->dump, job->clip, &options, cancellable, &error);
  if (r == NULL)
    g_task_return_error (task, error);
  else
    g_task_return_pointer (task, r, (GDestroyNotify) fw_explain_result_free);
}

/* Which side is the file and which the clip, or FALSE. */
static gboolean
finder_sides (FwCompareView *self, guint *dump, guint *clip)
{
  if (self->op[0] == NULL || self->op[1] == NULL)
    return FALSE;
  for (guint s = 0; s < 2; s++)
    if (fw_compare_operand_is_file (self->op[s]) && !fw_compare_operand_is_file (self->op[1 - s]))
      {
        *dump = s;
        *clip = 1 - s;
        return TRUE;
      }
  return FALSE;
}

static void
fill_finder (FwCompareView *self)
{
  const FwExplainResult *r = self->finder;
  GString *s;
  gboolean exact;

  if (r == NULL)
    return;
  s = g_string_new (NULL);
  exact = r->relative_rms < FW_EXPLAIN_EXACT_RELATIVE;
  if (r->changed_keys == NULL || r->changed_keys[0] == NULL)
    g_string_append (s, _("The set the comparison used is already the closest match."));
  else
    {
      g_string_append (s, exact ? _("The file was made with these changes to the set:")
                                : _("The closest match changes these keys:"));
      for (guint i = 0; r->changed_keys[i] != NULL; i++)
        {
          g_autofree char *from = fw_params_get_value (r->base, r->changed_keys[i]);
          g_autofree char *to = fw_params_get_value (r->params, r->changed_keys[i]);
          g_string_append_printf (s, "\n  • %s: %s → %s", r->changed_keys[i], from, to);
        }
    }
  g_string_append_c (s, '\n');
  g_string_append_printf (s, _("Relative RMS left: %.3g (the set the comparison used leaves "
                               "%.3g); %u parameter sets tried in %.1f s."),
                          r->relative_rms, r->base_relative_rms, r->n_evaluated, r->seconds);
  if (exact)
    {
      g_string_append_c (s, ' ');
      g_string_append (s, _("That is a match up to float32 rounding."));
    }
  for (guint i = 0; r->notes != NULL && i < r->notes->len; i++)
    g_string_append_printf (s, "\n%s", (const char *) r->notes->pdata[i]);
  gtk_label_set_text (self->finder_label, s->str);
  gtk_widget_set_visible (GTK_WIDGET (self->finder_label), TRUE);
  gtk_widget_set_visible (GTK_WIDGET (self->finder_adopt_button),
                          r->changed_keys != NULL && r->changed_keys[0] != NULL);
  g_string_free (s, TRUE);
}

static void
on_finder_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  Pending *p = user_data;
  FwCompareView *self = p->view;
  g_autoptr (GError) error = NULL;
  FwExplainResult *r = g_task_propagate_pointer (G_TASK (result), &error);

  if (p->generation != self->generation)
    {
      g_clear_pointer (&r, fw_explain_result_free);
      pending_free (p);
      return;
    }
  self->finder_running = FALSE;
  gtk_widget_set_sensitive (GTK_WIDGET (self->finder_button), TRUE);
  if (r == NULL)
    {
      g_autofree char *msg = is_cancel (error)
        ? g_strdup (_("The search was stopped."))
        : g_strdup_printf (_("The search failed: %s"), error->message);
      gtk_label_set_text (self->finder_label, msg);
      gtk_widget_set_visible (GTK_WIDGET (self->finder_label), TRUE);
    }
  else
    {
      g_clear_pointer (&self->finder, fw_explain_result_free);
      self->finder = r;
      fill_finder (self);
      update_headline (self);
    }
  emit_state (self);
  pending_free (p);
}

gboolean
fw_compare_view_start_finder (FwCompareView *self)
{
  guint dump, clip;
  FinderJob *job;
  GTask *task;

  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), FALSE);
  if (self->finder_running || !finder_sides (self, &dump, &clip))
    return FALSE;
  job = g_new0 (FinderJob, 1);
  job->dump = fw_compare_operand_ref (self->op[dump]);
  job->clip = fw_compare_operand_ref (self->op[clip]);
  job->view = g_object_ref (self);
  job->cancellable = g_object_ref (self->cancellable);
  g_atomic_int_set (&self->finder_permille, 0);
  self->finder_running = TRUE;
  gtk_widget_set_sensitive (GTK_WIDGET (self->finder_button), FALSE);
  gtk_widget_set_visible (GTK_WIDGET (self->finder_adopt_button), FALSE);
  task = g_task_new (NULL, self->cancellable, on_finder_done, pending_new (self));
  g_task_set_source_tag (task, fw_compare_view_start_finder);
  g_task_set_task_data (task, job, (GDestroyNotify) finder_job_free);
  g_task_run_in_thread (task, finder_thread);
  g_object_unref (task);
  emit_state (self);
  return TRUE;
}

static void
on_finder_clicked (GtkButton *button, FwCompareView *self)
{
  fw_compare_view_start_finder (self);
}

FwParamSet *
fw_compare_view_adopt_finder_match (FwCompareView *self, GError **error)
{
  const FwExplainResult *r;
  guint dump, clip;
  g_autofree char *base = NULL;
  g_autofree char *name = NULL;
  g_autofree char *file = NULL;
  g_autoptr (FwParamSet) set = NULL;

  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  r = self->finder;
  if (r == NULL || !finder_sides (self, &dump, &clip))
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_SEARCH,
                   _("Run the convention finder first: there is no match to add yet"));
      return NULL;
    }
  file = file_name (fw_comparison_get_clip (self->cmp, dump));
  /* TRANSLATORS: name of a parameter set found by the convention finder: the set it started
   * from, then the feature file it matches */
  base = g_strdup_printf (_("%s as in %s"), fw_comparison_get_param_set (self->cmp, clip), file);
  name = fw_project_unique_param_set_name (self->project, base);
  set = fw_param_set_new (name, r->params);
  if (!fw_project_add_param_set (self->project, set, error))
    return NULL;
  {
    g_autofree char *msg = g_strdup_printf (_("Added the parameter set “%s”. Pick it in the "
                                              "sidebar to see its plots."), name);
    show_info (self, msg);
  }
  g_signal_emit (self, signals[SIGNAL_SET_ADDED], 0, set);
  return set;   /* the project holds it */
}

static void
on_finder_adopt_clicked (GtkButton *button, FwCompareView *self)
{
  g_autoptr (GError) error = NULL;

  if (fw_compare_view_adopt_finder_match (self, &error) == NULL)
    show_error (self, error->message);
}

/* ---------------------------------------------------------------- results */

static void
fill_diff_dropdown (FwCompareView *self)
{
  const FwDiffResult *d = self->result != NULL ? self->result->diff : NULL;
  g_autoptr (GtkStringList) list = gtk_string_list_new (NULL);
  gboolean linear = d != NULL && d->ratio_db != NULL;
  guint selected = 0;

  self->n_shows = 0;
  self->shows[self->n_shows++] = FW_COMPARE_SHOW_DIFF;
  if (linear)
    {
      self->shows[self->n_shows++] = FW_COMPARE_SHOW_RATIO_DB;
      if (d->relative != NULL)
        self->shows[self->n_shows++] = FW_COMPARE_SHOW_RELATIVE;
    }
  self->shows[self->n_shows++] = FW_COMPARE_SHOW_RESIDUAL;
  /* linear values differ over decades: the ratio in dB reads better than B - A */
  if (self->show != FW_COMPARE_SHOW_DIFF && self->show != FW_COMPARE_SHOW_RESIDUAL && !linear)
    self->show = FW_COMPARE_SHOW_DIFF;
  for (guint i = 0; i < self->n_shows; i++)
    {
      gtk_string_list_append (list, show_choice (self->shows[i]));
      if (self->shows[i] == self->show)
        selected = i;
    }
  self->updating = TRUE;
  gtk_drop_down_set_model (self->diff_dropdown, G_LIST_MODEL (list));
  gtk_drop_down_set_selected (self->diff_dropdown, selected);
  self->updating = FALSE;
}

static char *
side_quantity (FwCompareView *self, guint side)
{
  FwParams *params = self->op[side] != NULL ? fw_compare_operand_get_params (self->op[side])
                                            : NULL;
  FwParams *other = self->op[1 - side] != NULL
                      ? fw_compare_operand_get_params (self->op[1 - side]) : NULL;

  if (params != NULL)
    return fw_feature_quantity_label (self->stage, params);
  if (other != NULL)
    return fw_feature_quantity_label (self->stage, other);
  return g_strdup (fw_stage_name (self->stage));
}

static void
apply_sides (FwCompareView *self)
{
  const FwDiffResult *d = self->result != NULL ? self->result->diff : NULL;
  gboolean aligned = gtk_toggle_button_get_active (self->grid_button);

  if (self->rows[0] == NULL)
    return;
  for (guint s = 0; s < 2; s++)
    {
      g_autofree char *name = side_name (self->cmp, s);
      g_autofree char *title = g_strdup_printf (s == 0 ? _("A · %s") : _("B · %s"), name);
      g_autofree char *quantity = side_quantity (self, s);
      FwMatrix *m = NULL;
      g_autoptr (GError) error = NULL;
      FwMatrix *own = NULL;

      if (d == NULL)
        m = NULL;
      else if (aligned || fw_compare_operand_is_file (self->op[s]))
        /* a file may give no frame times of its own: its times are the compared ones */
        m = s == 0 ? d->a : d->b;
      else
        {
          /* computed once already: the operand returns the same matrix */
          own = fw_compare_operand_get_matrix (self->op[s], NULL, &error);
          m = own != NULL ? own : (s == 0 ? d->a : d->b);
        }
      fw_plot_row_set_data (self->rows[s], m, fw_compare_operand_get_params (self->op[s]),
                            self->stage, title, quantity,
                            self->result != NULL ? self->result->unit : NULL, FALSE);
      if (own != NULL)
        fw_matrix_unref (own);
    }
  update_locked_ranges (self);
}

static void
apply_result (FwCompareView *self)
{
  const FwCompareResult *r = self->result;
  GString *notes = g_string_new (NULL);

  fill_diff_dropdown (self);
  apply_sides (self);
  apply_difference (self);
  fill_measures (self);
  update_headline (self);
  gtk_label_set_text (self->summary_label, r->summary);
  for (guint i = 0; r->notes != NULL && i < r->notes->len; i++)
    g_string_append_printf (notes, "%s• %s", notes->len > 0 ? "\n" : "",
                            (const char *) r->notes->pdata[i]);
  if (notes->len == 0)
    g_string_append (notes, _("Both sides have the same frames and bins: compared value by "
                              "value, nothing was moved or interpolated."));
  gtk_label_set_text (self->notes_label, notes->str);
  g_string_free (notes, TRUE);
}

static void
prepare_knob_section (FwCompareView *self)
{
  guint dump, clip;
  FwParams *pa, *pb;

  clear_knobs (self);
  gtk_widget_set_visible (GTK_WIDGET (self->finder_button), FALSE);
  gtk_widget_set_visible (GTK_WIDGET (self->finder_label), FALSE);
  gtk_widget_set_visible (GTK_WIDGET (self->finder_adopt_button), FALSE);
  if (finder_sides (self, &dump, &clip))
    {
      g_autofree char *text = g_strdup_printf (_("%s is a feature file: there are no keys to "
                                                 "rank. The convention finder tries the usual "
                                                 "variants of %s's parameter set for the one "
                                                 "that reproduces the file."),
                                               dump == 0 ? "A" : "B", clip == 0 ? "A" : "B");
      gtk_label_set_text (self->knobs_heading, _("Which Conventions Made the File"));
      gtk_label_set_text (self->knobs_label, text);
      gtk_widget_set_visible (GTK_WIDGET (self->finder_button), TRUE);
      /* the question the user came with: answer it at once (it can be stopped) */
      fw_compare_view_start_finder (self);
      return;
    }
  gtk_label_set_text (self->knobs_heading, _("Which Key Explains It"));
  if (self->op[0] == NULL || fw_compare_operand_is_file (self->op[0]) ||
      fw_compare_operand_is_file (self->op[1]))
    {
      gtk_label_set_text (self->knobs_label, _("Both sides are feature files: there are no "
                                               "parameter keys to rank."));
      return;
    }
  pa = fw_compare_operand_get_params (self->op[0]);
  pb = fw_compare_operand_get_params (self->op[1]);
  if (fw_params_equal (pa, pb))
    {
      gtk_label_set_text (self->knobs_label, _("Both sides use the same parameter values, so "
                                               "no setting explains the difference: it comes "
                                               "from the audio itself."));
      return;
    }
  start_ranking (self);
}

static void
on_run_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  Pending *p = user_data;
  FwCompareView *self = p->view;
  g_autoptr (GError) error = NULL;
  FwCompareResult *r = fw_compare_run_finish (result, &error);

  if (p->generation != self->generation)
    {
      g_clear_pointer (&r, fw_compare_result_free);
      pending_free (p);
      return;
    }
  self->running = FALSE;
  if (r == NULL)
    {
      if (is_cancel (error))
        gtk_label_set_text (self->summary_label, _("Stopped before the comparison was done. "
                                                   "Choose the comparison again to restart."));
      else
        {
          g_autofree char *msg = g_strdup_printf (_("Could not compare %s: %s"),
                                                  fw_comparison_get_name (self->cmp),
                                                  error->message);
          show_error (self, msg);
          gtk_label_set_text (self->summary_label, "");
        }
      emit_state (self);
      pending_free (p);
      return;
    }
  g_clear_pointer (&self->result, fw_compare_result_free);
  self->result = r;
  apply_result (self);
  prepare_knob_section (self);
  emit_state (self);
  pending_free (p);
}

/* ---------------------------------------------------------------- starting */

static char *
operands_signature (FwCompareOperand *a, FwCompareOperand *b, FwComparison *cmp)
{
  GString *s = g_string_new (fw_comparison_get_stage (cmp));

  for (guint i = 0; i < 2; i++)
    {
      FwCompareOperand *op = i == 0 ? a : b;
      FwParams *params = fw_compare_operand_get_params (op);
      g_string_append_printf (s, "|%d|%s|%s|%s", fw_compare_operand_is_file (op),
                              fw_compare_operand_get_path (op) ? fw_compare_operand_get_path (op) : "",
                              params != NULL ? fw_params_get_hash (params) : "",
                              fw_comparison_get_options (cmp, i));
    }
  return g_string_free (s, FALSE);
}

static void
reset_results (FwCompareView *self)
{
  g_clear_pointer (&self->result, fw_compare_result_free);
  g_clear_pointer (&self->ranking, fw_knob_ranking_free);
  g_clear_pointer (&self->finder, fw_explain_result_free);
  g_clear_pointer (&self->shown, fw_matrix_unref);
  g_clear_pointer (&self->frame_curve, fw_matrix_unref);
  g_clear_pointer (&self->bin_mean, g_free);
  g_clear_pointer (&self->bin_rms, g_free);
  clear_grid (self->measures_grid);
  clear_knobs (self);
  update_headline (self);
  gtk_label_set_text (self->notes_label, "");
  gtk_label_set_text (self->knobs_label, "");
  gtk_widget_set_visible (GTK_WIDGET (self->finder_label), FALSE);
  gtk_widget_set_visible (GTK_WIDGET (self->finder_adopt_button), FALSE);
  gtk_widget_set_visible (GTK_WIDGET (self->finder_button), FALSE);
  gtk_widget_queue_draw (GTK_WIDGET (self->curves_area));
}

static void
stop_work (FwCompareView *self)
{
  self->generation++;
  if (self->cancellable != NULL)
    g_cancellable_cancel (self->cancellable);
  g_clear_object (&self->cancellable);
  self->running = FALSE;
  self->ranking_running = FALSE;
  self->finder_running = FALSE;
  gtk_widget_set_sensitive (GTK_WIDGET (self->finder_button), TRUE);
}

static void
update_titles (FwCompareView *self)
{
  g_autofree char *a = NULL;
  g_autofree char *b = NULL;
  g_autofree char *markup = NULL;
  g_autofree char *title = NULL;

  if (self->cmp == NULL)
    {
      gtk_label_set_text (self->title_label, "");
      gtk_label_set_text (self->sides_label, "");
      return;
    }
  a = side_name (self->cmp, 0);
  b = side_name (self->cmp, 1);
  title = g_strdup_printf (_("%s — %s"), fw_comparison_get_name (self->cmp),
                           fw_compare_view_stage_title (self->stage));
  gtk_label_set_text (self->title_label, title);
  markup = g_markup_printf_escaped (_("<b>A</b>  %s\n<b>B</b>  %s\n<b>Stage</b>  %s"), a, b,
                                    fw_compare_view_stage_title (self->stage));
  gtk_label_set_markup (self->sides_label, markup);
}

static void
start (FwCompareView *self)
{
  g_autoptr (GError) error = NULL;
  FwCompareOperand *a = NULL, *b = NULL;

  stop_work (self);
  reset_results (self);
  show_error (self, NULL);
  show_info (self, NULL);
  g_clear_pointer (&self->op[0], fw_compare_operand_unref);
  g_clear_pointer (&self->op[1], fw_compare_operand_unref);
  g_clear_pointer (&self->signature, g_free);
  update_titles (self);
  if (self->cmp == NULL || self->project == NULL)
    {
      gtk_label_set_text (self->summary_label, "");
      for (guint i = 0; i < FW_N_COMPARE_ROWS; i++)
        if (self->rows[i] != NULL)
          fw_plot_row_set_data (self->rows[i], NULL, NULL, self->stage, NULL, NULL, NULL,
                                i >= FW_COMPARE_ROW_DIFF);
      emit_state (self);
      return;
    }
  a = fw_compare_operand_new_from_comparison (self->project, self->cmp, 0, &error);
  if (a != NULL)
    b = fw_compare_operand_new_from_comparison (self->project, self->cmp, 1, &error);
  if (b == NULL)
    {
      g_autofree char *msg = g_strdup_printf (_("Cannot compute side %s: %s"), a == NULL ? "A" : "B",
                                              error->message);
      g_clear_pointer (&a, fw_compare_operand_unref);
      show_error (self, msg);
      gtk_label_set_text (self->summary_label, "");
      emit_state (self);
      return;
    }
  self->op[0] = a;
  self->op[1] = b;
  self->signature = operands_signature (a, b, self->cmp);
  self->cancellable = g_cancellable_new ();
  self->running = TRUE;
  gtk_label_set_text (self->summary_label, _("Comparing…"));
  fw_compare_run_async (a, b, self->cancellable, on_run_done, pending_new (self));
  emit_state (self);
}

/* ---------------------------------------------------------------- project */

/* A saved comparison follows the project: an edited parameter set or a relinked clip makes
 * it compute again. */
static void
on_project_changed (FwProject *project, FwCompareView *self)
{
  g_autoptr (FwCompareOperand) a = NULL;
  g_autoptr (FwCompareOperand) b = NULL;
  g_autofree char *signature = NULL;
  guint pos;

  if (self->cmp == NULL || self->replacing ||
      !g_list_store_find (G_LIST_STORE (fw_project_get_comparisons (project)), self->cmp, &pos))
    return;
  a = fw_compare_operand_new_from_comparison (project, self->cmp, 0, NULL);
  b = a != NULL ? fw_compare_operand_new_from_comparison (project, self->cmp, 1, NULL) : NULL;
  if (a == NULL || b == NULL)
    {
      if (self->op[0] != NULL)
        start (self);   /* says what is missing */
      return;
    }
  signature = operands_signature (a, b, self->cmp);
  if (g_strcmp0 (signature, self->signature) != 0)
    start (self);
}

void
fw_compare_view_set_context (FwCompareView *self, FwProject *project, FwViewport *viewport)
{
  g_return_if_fail (FW_IS_COMPARE_VIEW (self));

  if (project != self->project)
    {
      if (self->project != NULL)
        g_signal_handlers_disconnect_by_func (self->project, on_project_changed, self);
      g_set_object (&self->project, project);
      if (project != NULL)
        g_signal_connect (project, "changed", G_CALLBACK (on_project_changed), self);
      g_clear_object (&self->cmp);
      start (self);
    }
  if (viewport != self->viewport)
    {
      g_set_object (&self->viewport, viewport);
      if (self->ruler != NULL)
        gtk_box_remove (self->ruler_box, self->ruler);
      self->ruler = NULL;
      if (viewport != NULL)
        {
          self->ruler = fw_time_ruler_new (viewport);
          gtk_box_append (self->ruler_box, self->ruler);
        }
      make_rows (self);
      if (self->result != NULL)
        {
          apply_sides (self);
          apply_difference (self);
        }
    }
}

void
fw_compare_view_set_comparison (FwCompareView *self, FwComparison *cmp)
{
  g_return_if_fail (FW_IS_COMPARE_VIEW (self));

  if (cmp == self->cmp && self->message == NULL && (self->result != NULL || self->running))
    return;
  g_set_object (&self->cmp, cmp);
  if (cmp != NULL)
    {
      FwStage stage = FW_STAGE_DB;
      if (!fw_stage_from_name (fw_comparison_get_stage (cmp), &stage))
        stage = FW_STAGE_DB;
      if (stage != self->stage || self->rows[0] == NULL)
        {
          self->stage = stage;
          make_rows (self);
        }
      self->updating = TRUE;
      gtk_drop_down_set_selected (self->stage_dropdown, stage_index (stage));
      self->updating = FALSE;
      self->show = (stage == FW_STAGE_SPECTRUM || stage == FW_STAGE_MEL)
                     ? FW_COMPARE_SHOW_RATIO_DB : FW_COMPARE_SHOW_DIFF;
    }
  start (self);
}

FwComparison *
fw_compare_view_get_comparison (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  return self->cmp;
}

/* Puts `replacement` where the shown comparison was (the old one leaves the project). */
static void
replace_comparison (FwCompareView *self, FwComparison *replacement)
{
  g_autoptr (FwComparison) old = self->cmp != NULL ? g_object_ref (self->cmp) : NULL;

  g_set_object (&self->cmp, replacement);
  if (self->project != NULL)
    {
      /* add first: the window closes the view when its comparison leaves the project */
      self->replacing = TRUE;
      fw_project_add_comparison (self->project, replacement);
      if (old != NULL)
        fw_project_remove_comparison (self->project, old);
      self->replacing = FALSE;
    }
}

void
fw_compare_view_swap (FwCompareView *self)
{
  g_autoptr (FwComparison) draft = NULL;
  g_autoptr (FwComparison) swapped = NULL;
  g_autofree char *name = NULL;
  FwCompareOperand *tmp;

  g_return_if_fail (FW_IS_COMPARE_VIEW (self));
  if (self->cmp == NULL)
    return;
  /* the name is made from the operands, so the new comparison is made twice */
  for (guint pass = 0; pass < 2; pass++)
    {
      FwComparison *c = fw_comparison_new (pass == 0 ? "" : name,
                                           fw_comparison_get_stage (self->cmp));
      for (guint s = 0; s < 2; s++)
        fw_comparison_set_operand (c, s, fw_comparison_get_kind (self->cmp, 1 - s),
                                   fw_comparison_get_clip (self->cmp, 1 - s),
                                   fw_comparison_get_param_set (self->cmp, 1 - s),
                                   fw_comparison_get_options (self->cmp, 1 - s));
      if (pass == 0)
        {
          draft = c;
          name = fw_compare_view_name_for (draft);
        }
      else
        swapped = c;
    }

  /* the operands keep their computed matrices: only the difference is worked out again */
  tmp = self->op[0];
  self->op[0] = self->op[1];
  self->op[1] = tmp;
  replace_comparison (self, swapped);
  if (self->op[0] == NULL || self->op[1] == NULL)
    {
      start (self);
      return;
    }
  stop_work (self);
  reset_results (self);
  show_error (self, NULL);
  show_info (self, NULL);
  update_titles (self);
  g_free (self->signature);
  self->signature = operands_signature (self->op[0], self->op[1], self->cmp);
  self->cancellable = g_cancellable_new ();
  self->running = TRUE;
  gtk_label_set_text (self->summary_label, _("Comparing…"));
  fw_compare_run_async (self->op[0], self->op[1], self->cancellable, on_run_done,
                        pending_new (self));
  emit_state (self);
}

void
fw_compare_view_set_stage (FwCompareView *self, FwStage stage)
{
  g_autoptr (FwComparison) replacement = NULL;

  g_return_if_fail (FW_IS_COMPARE_VIEW (self));
  if (self->cmp == NULL || stage == self->stage)
    return;
  replacement = fw_comparison_new (fw_comparison_get_name (self->cmp), fw_stage_name (stage));
  for (guint s = 0; s < 2; s++)
    fw_comparison_set_operand (replacement, s, fw_comparison_get_kind (self->cmp, s),
                               fw_comparison_get_clip (self->cmp, s),
                               fw_comparison_get_param_set (self->cmp, s),
                               fw_comparison_get_options (self->cmp, s));
  replace_comparison (self, replacement);
  self->stage = stage;
  self->show = (stage == FW_STAGE_SPECTRUM || stage == FW_STAGE_MEL) ? FW_COMPARE_SHOW_RATIO_DB
                                                                      : FW_COMPARE_SHOW_DIFF;
  self->updating = TRUE;
  gtk_drop_down_set_selected (self->stage_dropdown, stage_index (stage));
  self->updating = FALSE;
  make_rows (self);
  start (self);
}

FwStage
fw_compare_view_get_stage (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), FW_STAGE_DB);
  return self->stage;
}

void
fw_compare_view_set_lock_ranges (FwCompareView *self, gboolean lock)
{
  g_return_if_fail (FW_IS_COMPARE_VIEW (self));
  gtk_toggle_button_set_active (self->lock_button, lock);
}

gboolean
fw_compare_view_get_lock_ranges (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), FALSE);
  return gtk_toggle_button_get_active (self->lock_button);
}

void
fw_compare_view_set_show (FwCompareView *self, FwCompareShow show)
{
  g_return_if_fail (FW_IS_COMPARE_VIEW (self));
  for (guint i = 0; i < self->n_shows; i++)
    if (self->shows[i] == show)
      {
        gtk_drop_down_set_selected (self->diff_dropdown, i);
        return;
      }
}

FwCompareShow
fw_compare_view_get_show (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), FW_COMPARE_SHOW_DIFF);
  return self->show;
}

FwParamSet *
fw_compare_view_adopt_knob (FwCompareView *self, const char *key, GError **error)
{
  const char *name_a, *name_b;
  FwParamSet *set_a, *set_b;
  g_autofree char *value_a = NULL;
  g_autofree char *value_b = NULL;
  g_autofree char *base = NULL;
  g_autofree char *name = NULL;
  g_autoptr (FwParams) params = NULL;
  g_autoptr (FwParamSet) set = NULL;
  g_auto (GStrv) changed = NULL;
  GString *changes;

  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  g_return_val_if_fail (key != NULL, NULL);
  if (self->cmp == NULL || fw_comparison_get_kind (self->cmp, 0) != FW_OPERAND_CLIP ||
      fw_comparison_get_kind (self->cmp, 1) != FW_OPERAND_CLIP)
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_KNOBS,
                   _("A new set from B's %s needs parameter sets on both sides"), key);
      return NULL;
    }
  name_a = fw_comparison_get_param_set (self->cmp, 0);
  name_b = fw_comparison_get_param_set (self->cmp, 1);
  set_a = fw_project_find_param_set (self->project, name_a);
  set_b = fw_project_find_param_set (self->project, name_b);
  if (set_a == NULL || set_b == NULL)
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_OPERAND,
                   _("The project has no parameter set “%s” any more"),
                   set_a == NULL ? name_a : name_b);
      return NULL;
    }
  value_a = fw_params_get_value (fw_param_set_get_params (set_a), key);
  value_b = fw_params_get_value (fw_param_set_get_params (set_b), key);
  if (value_b == NULL)
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_KNOBS,
                   _("“%s” is not a parameter key"), key);
      return NULL;
    }
  params = fw_params_with (fw_param_set_get_params (set_a), key, value_b, error);
  if (params == NULL)
    {
      g_prefix_error (error, _("“%s” with %s=%s: "), name_a, key, value_b);
      return NULL;
    }
  /* TRANSLATORS: name of a new parameter set: A's set, then the key and B's value */
  base = g_strdup_printf (_("%s + %s=%s"), name_a, key, value_b);
  name = fw_project_unique_param_set_name (self->project, base);
  set = fw_param_set_new (name, params);
  if (!fw_project_add_param_set (self->project, set, error))
    return NULL;

  changed = fw_params_diff_keys (fw_param_set_get_params (set_a), params);
  changes = g_string_new (NULL);
  for (guint i = 0; changed[i] != NULL; i++)
    {
      g_autofree char *from = fw_params_get_value (fw_param_set_get_params (set_a), changed[i]);
      g_autofree char *to = fw_params_get_value (params, changed[i]);
      g_string_append_printf (changes, "%s%s %s → %s", i > 0 ? ", " : "", changed[i], from, to);
    }
  {
    g_autofree char *msg = g_strdup_printf (_("Added the parameter set “%s” (%s). Pick it in "
                                              "the sidebar to see its plots."),
                                            name, changes->str);
    show_info (self, msg);
  }
  g_string_free (changes, TRUE);
  g_signal_emit (self, signals[SIGNAL_SET_ADDED], 0, set);
  return set;   /* the project holds it */
}

/* ---------------------------------------------------------------- state */

void
fw_compare_view_cancel (FwCompareView *self)
{
  g_return_if_fail (FW_IS_COMPARE_VIEW (self));
  if (self->cancellable != NULL)
    g_cancellable_cancel (self->cancellable);
}

gboolean
fw_compare_view_is_busy (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), FALSE);
  if (self->running || self->ranking_running || self->finder_running)
    return TRUE;
  for (guint i = 0; i < FW_N_COMPARE_ROWS; i++)
    if (self->rows[i] != NULL && fw_plot_row_is_busy (self->rows[i]))
      return TRUE;
  return FALSE;
}

double
fw_compare_view_get_duration (FwCompareView *self)
{
  double d = 0;

  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), 0);
  for (guint i = 0; i < FW_N_COMPARE_ROWS; i++)
    if (self->rows[i] != NULL)
      d = MAX (d, fw_plot_row_get_duration (self->rows[i]));
  return d;
}

const FwCompareResult *
fw_compare_view_get_result (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  return self->result;
}

const FwKnobRanking *
fw_compare_view_get_ranking (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  return self->ranking;
}

const FwExplainResult *
fw_compare_view_get_finder_result (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  return self->finder;
}

FwMatrix *
fw_compare_view_get_shown_difference (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  return self->shown;
}

const char *
fw_compare_view_get_message (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  return self->message;
}

const char *
fw_compare_view_get_summary_text (FwCompareView *self)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  return gtk_label_get_text (self->summary_label);
}

FwPlotRow *
fw_compare_view_get_row (FwCompareView *self, FwCompareRowId which)
{
  g_return_val_if_fail (FW_IS_COMPARE_VIEW (self), NULL);
  g_return_val_if_fail (which < FW_N_COMPARE_ROWS, NULL);
  return self->rows[which];
}

/* ---------------------------------------------------------------- controls */

static void
on_stage_selected (GtkDropDown *dropdown, GParamSpec *pspec, FwCompareView *self)
{
  guint i = gtk_drop_down_get_selected (dropdown);

  if (self->updating || i >= G_N_ELEMENTS (compare_stages))
    return;
  fw_compare_view_set_stage (self, compare_stages[i].stage);
}

static void
on_diff_selected (GtkDropDown *dropdown, GParamSpec *pspec, FwCompareView *self)
{
  guint i = gtk_drop_down_get_selected (dropdown);

  if (self->updating || i >= self->n_shows || self->shows[i] == self->show)
    return;
  self->show = self->shows[i];
  apply_difference (self);
  emit_state (self);
}

static void
on_swap_clicked (GtkButton *button, FwCompareView *self)
{
  fw_compare_view_swap (self);
}

static void
on_lock_toggled (GtkToggleButton *button, FwCompareView *self)
{
  update_locked_ranges (self);
}

static void
on_grid_toggled (GtkToggleButton *button, FwCompareView *self)
{
  apply_sides (self);
  emit_state (self);
}

static void
on_cancel_clicked (GtkButton *button, FwCompareView *self)
{
  fw_compare_view_cancel (self);
}

/* ---------------------------------------------------------------- class */

static void
add_shortcut (GtkShortcutController *controller, guint keyval, GdkModifierType mods,
              const char *action)
{
  gtk_shortcut_controller_add_shortcut (controller,
    gtk_shortcut_new (gtk_keyval_trigger_new (keyval, mods), gtk_named_action_new (action)));
}

static void
fw_compare_view_dispose (GObject *object)
{
  FwCompareView *self = FW_COMPARE_VIEW (object);

  stop_work (self);
  g_clear_handle_id (&self->pulse_id, g_source_remove);
  if (self->project != NULL)
    g_signal_handlers_disconnect_by_func (self->project, on_project_changed, self);
  for (guint i = 0; i < FW_N_COMPARE_ROWS; i++)
    if (self->rows[i] != NULL)
      {
        g_signal_handlers_disconnect_by_data (self->rows[i], self);
        g_clear_object (&self->rows[i]);
      }
  gtk_widget_dispose_template (GTK_WIDGET (self), FW_TYPE_COMPARE_VIEW);
  g_clear_object (&self->project);
  g_clear_object (&self->viewport);
  g_clear_object (&self->cmp);
  g_clear_pointer (&self->op[0], fw_compare_operand_unref);
  g_clear_pointer (&self->op[1], fw_compare_operand_unref);
  g_clear_pointer (&self->result, fw_compare_result_free);
  g_clear_pointer (&self->ranking, fw_knob_ranking_free);
  g_clear_pointer (&self->finder, fw_explain_result_free);
  g_clear_pointer (&self->shown, fw_matrix_unref);
  g_clear_pointer (&self->frame_curve, fw_matrix_unref);
  G_OBJECT_CLASS (fw_compare_view_parent_class)->dispose (object);
}

static void
fw_compare_view_finalize (GObject *object)
{
  FwCompareView *self = FW_COMPARE_VIEW (object);

  g_free (self->bin_mean);
  g_free (self->bin_rms);
  g_free (self->message);
  g_free (self->signature);
  g_free (self->default_readout);
  G_OBJECT_CLASS (fw_compare_view_parent_class)->finalize (object);
}

static void
fw_compare_view_class_init (FwCompareViewClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = fw_compare_view_dispose;
  object_class->finalize = fw_compare_view_finalize;

  signals[SIGNAL_STATE_CHANGED] =
    g_signal_new ("state-changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 0);
  signals[SIGNAL_READOUT] =
    g_signal_new ("readout", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL, NULL,
                  G_TYPE_NONE, 1, G_TYPE_STRING);
  signals[SIGNAL_SET_ADDED] =
    g_signal_new ("set-added", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL, NULL,
                  G_TYPE_NONE, 1, FW_TYPE_PARAM_SET);

  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/framewise/Workbench/fw-compare-view.ui");
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, paned);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, stage_dropdown);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, diff_dropdown);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, swap_button);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, lock_button);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, grid_button);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, error_box);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, error_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, title_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, ruler_box);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, rows_box);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, readout_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, progress_box);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, progress_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, progress_bar);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, cancel_button);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, sides_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, headline_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, summary_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, measures_grid);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, curves_area);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, notes_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, knobs_heading);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, knobs_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, knob_list);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, finder_button);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, finder_label);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, finder_adopt_button);
  gtk_widget_class_bind_template_child (widget_class, FwCompareView, info_label);

  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "fwcompareview");
}

static void
fw_compare_view_init (FwCompareView *self)
{
  g_autoptr (GtkStringList) stages = gtk_string_list_new (NULL);
  GtkEventController *keys = gtk_shortcut_controller_new ();

  gtk_widget_init_template (GTK_WIDGET (self));
  self->stage = FW_STAGE_DB;
  self->show = FW_COMPARE_SHOW_DIFF;
  self->default_readout = g_strdup (gtk_label_get_text (self->readout_label));

  for (guint i = 0; i < G_N_ELEMENTS (compare_stages); i++)
    gtk_string_list_append (stages, _(compare_stages[i].title));
  gtk_drop_down_set_model (self->stage_dropdown, G_LIST_MODEL (stages));
  fill_diff_dropdown (self);

  gtk_drawing_area_set_draw_func (self->curves_area, draw_curves, self, NULL);
  g_signal_connect (self->stage_dropdown, "notify::selected", G_CALLBACK (on_stage_selected), self);
  g_signal_connect (self->diff_dropdown, "notify::selected", G_CALLBACK (on_diff_selected), self);
  g_signal_connect (self->swap_button, "clicked", G_CALLBACK (on_swap_clicked), self);
  g_signal_connect (self->lock_button, "toggled", G_CALLBACK (on_lock_toggled), self);
  g_signal_connect (self->grid_button, "toggled", G_CALLBACK (on_grid_toggled), self);
  g_signal_connect (self->cancel_button, "clicked", G_CALLBACK (on_cancel_clicked), self);
  g_signal_connect (self->finder_button, "clicked", G_CALLBACK (on_finder_clicked), self);
  g_signal_connect (self->finder_adopt_button, "clicked", G_CALLBACK (on_finder_adopt_clicked),
                    self);

  /* the plots' keys, and Escape back to the plots */
  gtk_shortcut_controller_set_scope (GTK_SHORTCUT_CONTROLLER (keys), GTK_SHORTCUT_SCOPE_LOCAL);
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_plus, 0, "win.zoom-in");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_equal, 0, "win.zoom-in");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_KP_Add, 0, "win.zoom-in");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_minus, 0, "win.zoom-out");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_KP_Subtract, 0, "win.zoom-out");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_0, 0, "win.zoom-fit");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Left, 0, "win.pan-left");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Right, 0, "win.pan-right");
  add_shortcut (GTK_SHORTCUT_CONTROLLER (keys), GDK_KEY_Escape, 0, "win.close-compare");
  gtk_widget_add_controller (GTK_WIDGET (self), keys);
}

GtkWidget *
fw_compare_view_new (void)
{
  return g_object_new (FW_TYPE_COMPARE_VIEW, NULL);
}
