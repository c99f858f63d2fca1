/* fw-compare.c: operands, comparisons with sentences, knob ranking and the convention finder.
 * See fw-compare.h. The numbers come from fw-diff.c; this file adds parameter sets, audio,
 * imported files and words. */
#include "fw-config.h"

#include "fw-compare.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-compare-private.h"
#include "fw-feature.h"
#include "fw-project.h"

G_DEFINE_QUARK (fw-compare-error-quark, fw_compare_error)

/* ---- operands ---------------------------------------------------------------------------- */

static FwCompareOperand *
operand_new (FwCompareOpKind kind, const char *path, FwParams *params, FwStage stage)
{
  FwCompareOperand *op = g_new0 (FwCompareOperand, 1);

  op->ref_count = 1;
  op->kind = kind;
  op->path = g_strdup (path);
  op->params = params ? fw_params_ref (params) : NULL;
  op->stage = stage;
  fw_feature_file_options_init (&op->file_options);
  g_mutex_init (&op->lock);
  return op;
}

static char *
clip_label (const char *path, FwParams *params, FwStage stage)
{
  g_autofree char *base = g_path_get_basename (path ? path : "?");
  g_autofree char *display = g_filename_display_name (base);

  if (params == NULL || stage < 0)
    return g_steal_pointer (&display);
  return g_strdup_printf ("%s, %s (%.8s)", display, fw_feature_stage_name (stage, params),
                          fw_params_get_hash (params));
}

FwCompareOperand *
fw_compare_operand_new_clip (const char *clip_path, FwParams *params, FwStage stage)
{
  FwCompareOperand *op;

  g_return_val_if_fail (clip_path != NULL && params != NULL, NULL);
  g_return_val_if_fail (stage >= 0 && stage < FW_N_STAGES, NULL);
  op = operand_new (FW_COMPARE_OP_CLIP, clip_path, params, stage);
  op->label = clip_label (clip_path, params, stage);
  return op;
}

FwCompareOperand *
fw_compare_operand_new_audio (FwAudio *audio, FwParams *params, FwStage stage)
{
  FwCompareOperand *op;

  g_return_val_if_fail (audio != NULL && params != NULL, NULL);
  g_return_val_if_fail (stage >= 0 && stage < FW_N_STAGES, NULL);
  op = operand_new (FW_COMPARE_OP_AUDIO, audio->info.path, params, stage);
  op->audio = fw_audio_ref (audio);
  op->label = clip_label (audio->info.path, params, stage);
  return op;
}

FwCompareOperand *
fw_compare_operand_new_file (const char *path, const FwFeatureFileOptions *options,
                             FwStage stage)
{
  FwCompareOperand *op;
  g_autofree char *base = NULL;

  g_return_val_if_fail (path != NULL, NULL);
  op = operand_new (FW_COMPARE_OP_FILE, path, NULL, stage);
  if (options)
    op->file_options = *options;
  base = g_path_get_basename (path);
  op->label = g_filename_display_name (base);
  return op;
}

FwCompareOperand *
fw_compare_operand_new_matrix (const char *label, FwMatrix *matrix, FwParams *params,
                               FwStage stage)
{
  FwCompareOperand *op;

  g_return_val_if_fail (matrix != NULL, NULL);
  op = operand_new (FW_COMPARE_OP_MATRIX, NULL, params, stage);
  op->matrix = fw_matrix_ref (matrix);
  op->label = g_strdup (label ? label : "?");
  return op;
}

FwCompareOperand *
fw_compare_operand_new_from_comparison (FwProject *project, FwComparison *cmp, guint side,
                                        GError **error)
{
  const char *stage_name, *clip_name, *set_name;
  FwStage stage = FW_STAGE_SIGNAL;
  FwClip *clip;
  FwParamSet *set;
  g_autoptr (FwParams) params = NULL;

  g_return_val_if_fail (FW_IS_PROJECT (project), NULL);
  g_return_val_if_fail (FW_IS_COMPARISON (cmp), NULL);
  g_return_val_if_fail (side < 2, NULL);

  stage_name = fw_comparison_get_stage (cmp);
  clip_name = fw_comparison_get_clip (cmp, side);
  if (!fw_feature_parse_stage (stage_name, &stage, error))
    return NULL;
  if (fw_comparison_get_kind (cmp, side) == FW_OPERAND_FILE)
    {
      FwFeatureFileOptions opt;
      if (!fw_feature_file_options_parse (fw_comparison_get_options (cmp, side), &opt, error))
        return NULL;
      return fw_compare_operand_new_file (clip_name, &opt, stage);
    }
  clip = fw_project_find_clip (project, clip_name);
  if (clip == NULL)
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_OPERAND,
                   _("Comparison \"%s\": the project has no clip \"%s\""),
                   fw_comparison_get_name (cmp), clip_name);
      return NULL;
    }
  set_name = fw_comparison_get_param_set (cmp, side);
  set = fw_project_find_param_set (project, set_name);
  if (set == NULL)
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_OPERAND,
                   _("Comparison \"%s\": the project has no parameter set \"%s\""),
                   fw_comparison_get_name (cmp), set_name);
      return NULL;
    }
  params = fw_params_ref (fw_param_set_get_params (set));
  if (fw_clip_get_channel (clip) != FW_CLIP_CHANNEL_FROM_PARAMS)
    {
      g_autofree char *ch = fw_clip_get_channel (clip) == 0
                              ? g_strdup ("mix")
                              : g_strdup_printf ("%d", fw_clip_get_channel (clip));
      FwParams *with = fw_params_with (params, "channel", ch, error);
      if (with == NULL)
        return NULL;
      g_clear_pointer (&params, fw_params_unref);
      params = with;
    }
  return fw_compare_operand_new_clip (fw_clip_get_path (clip), params, stage);
}

FwCompareOperand *
fw_compare_operand_ref (FwCompareOperand *op)
{
  g_return_val_if_fail (op != NULL, NULL);
  g_atomic_int_inc (&op->ref_count);
  return op;
}

void
fw_compare_operand_unref (FwCompareOperand *op)
{
  if (op == NULL || !g_atomic_int_dec_and_test (&op->ref_count))
    return;
  g_free (op->path);
  g_free (op->label);
  if (op->params)
    fw_params_unref (op->params);
  if (op->audio)
    fw_audio_unref (op->audio);
  fw_feature_file_free (op->file);
  if (op->matrix)
    fw_matrix_unref (op->matrix);
  g_mutex_clear (&op->lock);
  g_free (op);
}

gboolean
fw_compare_operand_is_file (FwCompareOperand *op)
{
  return op->kind == FW_COMPARE_OP_FILE;
}

const char *
fw_compare_operand_get_label (FwCompareOperand *op)
{
  return op->label;
}

FwParams *
fw_compare_operand_get_params (FwCompareOperand *op)
{
  return op->params;
}

FwStage
fw_compare_operand_get_stage (FwCompareOperand *op)
{
  return op->stage;
}

const char *
fw_compare_operand_get_path (FwCompareOperand *op)
{
  return op->path;
}

int
_fw_compare_n_workers (void)
{
  guint n = g_get_num_processors ();
  return (int) CLAMP (n, 1, 8);
}

/* Audio of a clip/audio operand at the rate and channel `params` ask for. */
FwAudio *
_fw_compare_operand_audio_for (FwCompareOperand *op, FwParams *params, GCancellable *cancellable,
                   GError **error)
{
  int rate = fw_params_get_sample_rate (params);
  int channel = fw_params_get_channel (params);

  if (op->audio != NULL)
    {
      gboolean rate_ok = rate == 0 ? !op->audio->resampled
                                   : fabs (op->audio->sample_rate - rate) < 0.5;
      if (rate_ok && op->audio->channel == channel)
        return fw_audio_ref (op->audio);
      if (op->path == NULL || !g_file_test (op->path, G_FILE_TEST_EXISTS))
        {
          g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_OPERAND,
                       _("%s: the audio is only in memory; it cannot be loaded again at "
                         "sample_rate=%d, channel=%d"),
                       op->label, rate, channel);
          return NULL;
        }
    }
  if (op->path == NULL)
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_OPERAND,
                   _("%s has no clip to compute from"), op->label);
      return NULL;
    }
  return fw_feature_load_audio (op->path, params, cancellable, error);
}

FwMatrix *
fw_compare_operand_get_matrix (FwCompareOperand *op, GCancellable *cancellable, GError **error)
{
  FwMatrix *m = NULL;

  g_return_val_if_fail (op != NULL, NULL);
  g_mutex_lock (&op->lock);
  if (op->matrix == NULL)
    {
      if (op->kind == FW_COMPARE_OP_FILE)
        {
          op->file = fw_feature_file_read (op->path, &op->file_options, error);
          if (op->file)
            op->matrix = fw_matrix_ref (op->file->matrix);
        }
      else
        {
          g_autoptr (FwAudio) audio = _fw_compare_operand_audio_for (op, op->params,
                                                                     cancellable, error);
          if (audio)
            op->matrix = fw_feature_compute (audio, op->params, op->stage,
                                             _fw_compare_n_workers (), NULL,
                                             NULL, cancellable, error);
        }
    }
  if (op->matrix)
    m = fw_matrix_ref (op->matrix);
  g_mutex_unlock (&op->lock);
  return m;
}

/* The file behind a file operand (after get_matrix), else NULL. */
const FwFeatureFile *
_fw_compare_operand_file (FwCompareOperand *op)
{
  return op->kind == FW_COMPARE_OP_FILE ? op->file : NULL;
}

FwDiffValueKind
fw_compare_value_kind (FwStage stage, const FwParams *params)
{
  gboolean magnitude = FALSE;

  if (params)
    {
      g_autofree char *kind = fw_params_get_value (params, "spectrum");
      magnitude = g_strcmp0 (kind, "magnitude") == 0;
    }
  switch (stage)
    {
    case FW_STAGE_SPECTRUM:
    case FW_STAGE_MEL:
      return magnitude ? FW_DIFF_VALUES_AMPLITUDE : FW_DIFF_VALUES_POWER;
    case FW_STAGE_RMS:
      return FW_DIFF_VALUES_AMPLITUDE;
    default:
      return FW_DIFF_VALUES_PLAIN;
    }
}

/* ---- words ------------------------------------------------------------------------------- */

/* Numbers for sentences: two decimals in the usual range, else three significant digits. */
static char *
fmt_num (double v)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  double a = fabs (v);

  if (v == 0)
    return g_strdup ("0");
  if (a >= 0.01 && a < 1000)
    g_ascii_formatd (buf, sizeof buf, "%.2f", v);
  else
    g_ascii_formatd (buf, sizeof buf, "%.3g", v);
  return g_strdup (buf);
}

char *
_fw_compare_fmt_g (double v)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  if (!isfinite (v))
    return g_strdup (isnan (v) ? "n/a" : v > 0 ? "inf" : "-inf");
  g_ascii_formatd (buf, sizeof buf, "%.3g", v);
  return g_strdup (buf);
}

static char *
with_unit (double v, const char *unit)
{
  g_autofree char *n = fmt_num (v);
  return unit && *unit ? g_strdup_printf ("%s %s", n, unit) : g_steal_pointer (&n);
}

/* "1.5 kHz" / "440 Hz" */
static char *
fmt_hz (double hz)
{
  if (hz >= 1000)
    return g_strdup_printf ("%.3g kHz", hz / 1000.0);
  return g_strdup_printf ("%.4g Hz", hz);
}

static char *
bin_words (const FwMatrix *m, gsize k)
{
  if (m->bin_kind == FW_BIN_AXIS_HZ)
    {
      g_autofree char *hz = fmt_hz (m->bin_value[k]);
      return g_strdup_printf (_("bin %zu (%s)"), k, hz);
    }
  if (m->bin_kind == FW_BIN_AXIS_MEL_BAND)
    {
      g_autofree char *hz = fmt_hz (m->bin_value[k]);
      return g_strdup_printf (_("band %zu (%s)"), k, hz);
    }
  if (m->bin_kind == FW_BIN_AXIS_COEFFICIENT)
    return g_strdup_printf (_("coefficient %zu"), k);
  return g_strdup_printf (_("column %zu"), k);
}

static const char *
per_bin_word (const FwMatrix *m)
{
  switch (m->bin_kind)
    {
    case FW_BIN_AXIS_MEL_BAND:
      return _("per-band");
    case FW_BIN_AXIS_HZ:
      return _("per-bin");
    case FW_BIN_AXIS_COEFFICIENT:
      return _("per-coefficient");
    default:
      return _("per-column");
    }
}

static char *
build_summary (const FwCompareResult *r)
{
  const FwDiffResult *d = r->diff;
  const FwDiffExplanation *e = &d->expl;
  const char *u = r->expl_unit;
  GPtrArray *parts = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *res = NULL;
  char *out;

  if (e->identical)
    {
      char *s = g_strdup_printf (_("B = A exactly (all %zu x %zu compared values are equal)"),
                                 d->n_frames, d->n_bins);
      g_ptr_array_unref (parts);
      return s;
    }

  if (e->has_bin_offset)
    {
      double lo = G_MAXDOUBLE, hi = -G_MAXDOUBLE;
      g_autofree char *where = bin_words (d->a, e->bin_offset_argmax);
      g_autofree char *slo = NULL, *shi = NULL, *smean = NULL;
      for (gsize k = 0; k < d->n_bins; k++)
        {
          lo = MIN (lo, e->offset + e->bin_offset[k]);
          hi = MAX (hi, e->offset + e->bin_offset[k]);
        }
      slo = with_unit (lo, u);
      shi = with_unit (hi, u);
      smean = with_unit (e->offset, u);
      /* TRANSLATORS: "B = A + a per-band offset from -2.00 dB to 6.00 dB (mean 1.00 dB,
       * largest at band 12 (1.5 kHz))" */
      g_ptr_array_add (parts, g_strdup_printf (_("B = A + a %s offset from %s to %s (mean %s, "
                                                 "largest at %s)"),
                                               per_bin_word (d->a), slo, shi, smean, where));
    }
  else if (e->has_offset)
    {
      g_autofree char *v = with_unit (fabs (e->offset), u);
      g_ptr_array_add (parts, g_strdup_printf (e->offset >= 0 ? _("B = A + %s everywhere")
                                                              : _("B = A - %s everywhere"),
                                               v));
    }
  else if (e->has_bin_scale)
    {
      double lo = G_MAXDOUBLE, hi = -G_MAXDOUBLE;
      for (gsize k = 0; k < d->n_bins; k++)
        {
          lo = MIN (lo, e->bin_scale[k]);
          hi = MAX (hi, e->bin_scale[k]);
        }
      if (hi - lo <= 1e-3 * MAX (fabs (hi), fabs (lo)))
        {
          g_autofree char *g = _fw_compare_fmt_g (e->scale);
          g_ptr_array_add (parts, g_strdup_printf (_("B = %s x A everywhere"), g));
        }
      else
        {
          g_autofree char *slo = _fw_compare_fmt_g (lo), *shi = _fw_compare_fmt_g (hi);
          g_ptr_array_add (parts, g_strdup_printf (_("B = A x a %s factor from %s to %s"),
                                                   per_bin_word (d->a), slo, shi));
        }
    }
  else if (e->residual_max_abs <= e->precision)
    g_ptr_array_add (parts, g_strdup (_("B = A within float32 precision")));
  else if (e->residual_rms <= FW_COMPARE_ROUNDING_LEVEL * e->value_rms)
    {
      g_autofree char *ratio = _fw_compare_fmt_g (e->residual_rms / e->value_rms);
      g_ptr_array_add (parts, g_strdup_printf (_("B = A up to rounding (difference RMS %s x "
                                                 "A's RMS)"),
                                               ratio));
    }
  else
    g_ptr_array_add (parts, g_strdup (_("B and A differ, but not by a constant or per-bin "
                                        "offset")));

  if (e->lag_frames == 0)
    g_ptr_array_add (parts, g_strdup (_("lag 0 frames")));
  else if (e->lag_frames > 0)
    g_ptr_array_add (parts, g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                                          "lag %d frame (B later than A)",
                                                          "lag %d frames (B later than A)",
                                                          e->lag_frames),
                                             e->lag_frames));
  else
    g_ptr_array_add (parts, g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                                          "lag %d frame (B earlier than A)",
                                                          "lag %d frames (B earlier than A)",
                                                          -e->lag_frames),
                                             e->lag_frames));

  if (e->has_bin_scale && (e->has_offset || e->has_bin_offset))
    {
      g_autofree char *g = _fw_compare_fmt_g (e->scale_residual_rms);
      g_ptr_array_add (parts, g_strdup_printf (_("a per-bin factor would leave RMS %s"), g));
    }
  {
    double rmax = e->has_bin_scale && !e->has_offset && !e->has_bin_offset
                    ? e->scale_residual_rms : e->residual_max_abs;
    g_autofree char *num = _fw_compare_fmt_g (rmax);
    res = *u ? g_strdup_printf ("%s %s", num, u) : g_strdup (num);
    if (e->has_bin_scale && !e->has_offset && !e->has_bin_offset)
      g_ptr_array_add (parts, g_strdup_printf (_("residual RMS %s"), res));
    else if ((e->has_offset || e->has_bin_offset || e->has_lag) && e->total_rms > 0
             && e->residual_rms > 0.01 * e->total_rms)
      {
        /* the named parts leave a real residual: say how much they explain */
        g_autofree char *rrms = _fw_compare_fmt_g (e->residual_rms);
        double share = 1.0 - e->residual_rms / e->total_rms;
        g_ptr_array_add (parts,
                         g_strdup_printf (_("residual max %s, RMS %s%s%s (the parts named "
                                            "explain %.0f%% of the RMS difference)"),
                                          res, rrms, *u ? " " : "", u, 100.0 * MAX (share, 0.0)));
      }
    else
      g_ptr_array_add (parts, g_strdup_printf (_("residual max %s"), res));
  }
  g_ptr_array_add (parts, NULL);
  out = g_strjoinv ("; ", (char **) parts->pdata);
  g_ptr_array_unref (parts);
  return out;
}

static char *
fmt_ms (double seconds)
{
  return g_strdup_printf ("%.4g ms", seconds * 1000.0);
}

static void
add_alignment_notes (FwCompareResult *r)
{
  const FwDiffAlignment *al = &r->diff->align;
  const char *ref = al->time_reference == 0 ? "A" : "B";
  const char *oth = al->time_reference == 0 ? "B" : "A";

  if (al->a_frames != al->b_frames || al->a_bins != al->b_bins)
    g_ptr_array_add (r->notes,
                     g_strdup_printf (_("The shapes differ: A is %zu x %zu, B is %zu x %zu "
                                        "(frames x bins)."),
                                      al->a_frames, al->a_bins, al->b_frames, al->b_bins));
  if (al->time_resampled)
    {
      g_autofree char *ho = fmt_ms (al->time_reference == 0 ? al->b_hop : al->a_hop);
      g_autofree char *hr = fmt_ms (al->time_reference == 0 ? al->a_hop : al->b_hop);
      g_ptr_array_add (r->notes,
                       g_strdup_printf (_("%s's frames (hop %s) were linearly interpolated onto "
                                          "%s's frame centres (hop %s) over %.3f-%.3f s."),
                                        oth, ho, ref, hr, al->start, al->end));
    }
  else if (fabs (al->a_hop - al->b_hop) > 1e-6 * MAX (al->a_hop, al->b_hop))
    {
      g_autofree char *ho = fmt_ms (al->time_reference == 0 ? al->b_hop : al->a_hop);
      g_autofree char *hr = fmt_ms (al->time_reference == 0 ? al->a_hop : al->b_hop);
      g_ptr_array_add (r->notes,
                       g_strdup_printf (_("%s's frames (hop %s) were taken at %s's frame centres "
                                          "(hop %s), which coincide with some of %s's; no "
                                          "interpolation was needed."),
                                        oth, ho, ref, hr, oth));
    }
  else if (al->index_shift != 0)
    g_ptr_array_add (r->notes,
                     g_strdup_printf (_("The frame grids are offset by whole frames: A's frame "
                                        "%ld is at the time of B's frame %ld."),
                                      al->index_shift > 0 ? 0L : -al->index_shift,
                                      al->index_shift > 0 ? al->index_shift : 0L));
  if (al->a_unused_frames > 0 || al->b_unused_frames > 0)
    g_ptr_array_add (r->notes,
                     g_strdup_printf (_("Compared the %zu frames both sides "
                                        "cover (%.3f-%.3f s); left out %zu frames of A and "
                                        "%zu of B."),
                                      r->diff->n_frames, al->start, al->end,
                                      al->a_unused_frames, al->b_unused_frames));
  switch (al->bin_mapping)
    {
    case FW_DIFF_BINS_SAME:
      break;
    case FW_DIFF_BINS_HZ:
      {
        const char *bref = al->bin_reference == 0 ? "A" : "B";
        const char *both = al->bin_reference == 0 ? "B" : "A";
        g_autofree char *lo = fmt_hz (al->freq_low), *hi = fmt_hz (al->freq_high);
        g_ptr_array_add (r->notes,
                         g_strdup_printf (_("The frequency axes differ: %s's %zu bins were "
                                            "interpolated in Hz onto %s's %zu bin centres "
                                            "from %s to %s."),
                                          both, al->bin_reference == 0 ? al->b_bins : al->a_bins,
                                          bref, r->diff->n_bins, lo, hi));
        if (al->a_unused_bins || al->b_unused_bins)
          g_ptr_array_add (r->notes,
                           g_strdup_printf (_("Bins outside the common frequency span were left "
                                              "out: %zu of A, %zu of B."),
                                            al->a_unused_bins, al->b_unused_bins));
        break;
      }
    case FW_DIFF_BINS_COMMON:
      if (al->a_bins != al->b_bins)
        g_ptr_array_add (r->notes,
                         g_strdup_printf (_("Compared the %zu leading columns "
                                            "both sides have (A has %zu, B %zu)."),
                                          r->diff->n_bins, al->a_bins, al->b_bins));
      else
        g_ptr_array_add (r->notes, g_strdup (_("The column labels differ; columns were "
                                               "compared by index.")));
      break;
    case FW_DIFF_BINS_BY_INDEX:
      g_ptr_array_add (r->notes,
                       g_strdup_printf (_("The bin axes are of different kinds; compared the "
                                          "first %zu columns by index."),
                                        r->diff->n_bins));
      break;
    }
}

void
fw_compare_result_free (FwCompareResult *r)
{
  if (r == NULL)
    return;
  fw_diff_result_free (r->diff);
  g_free (r->label_a);
  g_free (r->label_b);
  g_free (r->unit);
  g_free (r->expl_unit);
  g_free (r->summary);
  if (r->notes)
    g_ptr_array_unref (r->notes);
  g_free (r);
}

/* Gives file operands the other side's grid where the file says nothing. */
static FwMatrix *
adopt_for (const FwFeatureFile *file, FwMatrix *m, const FwMatrix *other, const char *side,
           const char *other_side, gboolean say_times, GPtrArray *notes)
{
  gboolean times = FALSE, bins = FALSE;
  FwMatrix *out;

  if (file == NULL)
    return fw_matrix_ref (m);
  out = fw_feature_file_adopt_grid (file, other, &times, &bins);
  if (notes && times && say_times)
    {
      g_autofree char *hop = fmt_ms (out->hop_seconds);
      g_ptr_array_add (notes,
                       g_strdup_printf (_("%s (%s) gives no frame times: taken to be on %s's "
                                          "grid (hop %s, frame 0 at %.4g s)."),
                                        side, file->path, other_side, hop,
                                        out->frame_times[0]));
    }
  if (notes && !bins && other->bin_kind != FW_BIN_AXIS_COEFFICIENT
      && other->bin_kind != FW_BIN_AXIS_SCALAR)
    g_ptr_array_add (notes,
                     g_strdup_printf (_("%s has %zu columns and %s %zu bins; without "
                                        "frequencies in the file the columns are compared by "
                                        "index."),
                                      side, out->n_bins, other_side, other->n_bins));
  return out;
}

FwCompareResult *
_fw_compare_matrices (FwMatrix *ma, FwMatrix *mb, const FwFeatureFile *fa, const FwFeatureFile *fb,
                  const char *label_a, const char *label_b, FwStage stage,
                  const FwParams *params, const FwDiffOptions *options, GError **error)
{
  g_autoptr (FwCompareResult) r = g_new0 (FwCompareResult, 1);
  g_autoptr (FwCmpMatrix) a = NULL;
  g_autoptr (FwCmpMatrix) b = NULL;
  FwDiffOptions opt;
  FwDspStatus st;

  r->notes = g_ptr_array_new_with_free_func (g_free);
  r->label_a = g_strdup (label_a);
  r->label_b = g_strdup (label_b);
  r->stage = stage;

  /* A file without times takes the other side's; two such files share the index grid. */
  r->frames_by_index = fa && !fa->has_times && fb && !fb->has_times;
  if (r->frames_by_index)
    g_ptr_array_add (r->notes, g_strdup (_("Neither side gives frame times: frame t of A is "
                                           "compared with frame t of B.")));
  b = adopt_for (fb, mb, ma, "B", "A", !r->frames_by_index, r->notes);
  a = adopt_for (fa, ma, b, "A", "B", !r->frames_by_index, r->notes);

  if (options)
    opt = *options;
  else
    {
      fw_diff_options_init (&opt);
      opt.value_kind = fw_compare_value_kind (stage, params);
    }
  r->unit = g_strdup (fw_feature_value_unit (stage, NULL));
  r->expl_unit = g_strdup (opt.value_kind != FW_DIFF_VALUES_PLAIN ? "dB" : r->unit);

  if (!fw_diff_time_overlap (a, b, NULL, NULL))
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_ALIGN,
                   _("%s (frames at %.3f-%.3f s) and %s (%.3f-%.3f s) share no time span"),
                   label_a, a->frame_times[0], a->frame_times[a->n_frames - 1], label_b,
                   b->frame_times[0], b->frame_times[b->n_frames - 1]);
      return NULL;
    }
  st = fw_diff_compute (a, b, &opt, &r->diff);
  if (st != FW_DSP_OK)
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_ALIGN,
                   st == FW_DSP_ERROR_NO_MEMORY
                     ? _("Not enough memory to compare %s with %s")
                     : _("%s and %s cannot be aligned (no common frequencies, or frame times "
                         "that do not increase)"),
                   label_a, label_b);
      return NULL;
    }
  add_alignment_notes (r);
  r->same_shape = r->diff->align.a_frames == r->diff->align.b_frames
                  && r->diff->align.a_bins == r->diff->align.b_bins
                  && !r->diff->align.time_resampled
                  && r->diff->align.bin_mapping != FW_DIFF_BINS_HZ
                  && r->diff->align.index_shift == 0;
  r->summary = build_summary (r);
  return g_steal_pointer (&r);
}

/* A clip analysed at another rate than its file's says so: a clip upsampled from a lower rate
 * holds nothing above its file's Nyquist frequency, which can be the whole difference. */
static void
add_resampling_note (FwCompareResult *r, FwCompareOperand *op, const char *side)
{
  FwAudioInfo info = { 0 };
  int rate;

  if (op->kind != FW_COMPARE_OP_CLIP || op->path == NULL || op->params == NULL)
    return;
  rate = fw_params_get_sample_rate (op->params);
  if (rate == 0 || !fw_audio_read_info (op->path, &info, NULL))
    {
      fw_audio_info_clear (&info);
      return;
    }
  if (info.sample_rate < rate)
    g_ptr_array_add (r->notes,
                     g_strdup_printf (_("%s (%s) was resampled from %d Hz to %d Hz: it holds "
                                        "nothing above %d Hz, the Nyquist frequency of its file."),
                                      side, op->label, info.sample_rate, rate,
                                      info.sample_rate / 2));
  else if (info.sample_rate > rate)
    g_ptr_array_add (r->notes,
                     g_strdup_printf (_("%s (%s) was resampled from %d Hz to %d Hz."), side,
                                      op->label, info.sample_rate, rate));
  fw_audio_info_clear (&info);
}

FwCompareResult *
fw_compare_run (FwCompareOperand *a, FwCompareOperand *b, const FwDiffOptions *options,
                GCancellable *cancellable, GError **error)
{
  g_autoptr (FwCmpMatrix) ma = NULL;
  g_autoptr (FwCmpMatrix) mb = NULL;
  FwCompareResult *r;
  FwStage stage;
  FwParams *params;

  g_return_val_if_fail (a != NULL && b != NULL, NULL);
  ma = fw_compare_operand_get_matrix (a, cancellable, error);
  if (ma == NULL)
    return NULL;
  mb = fw_compare_operand_get_matrix (b, cancellable, error);
  if (mb == NULL)
    return NULL;
  stage = a->stage >= 0 ? a->stage : b->stage;
  params = a->params ? a->params : b->params;
  r = _fw_compare_matrices (ma, mb, _fw_compare_operand_file (a), _fw_compare_operand_file (b),
                            a->label, b->label, stage, params, options, error);
  if (r != NULL)
    {
      add_resampling_note (r, a, "A");
      add_resampling_note (r, b, "B");
    }
  return r;
}

typedef struct {
  FwCompareOperand *a, *b;
} RunData;

static void
run_data_free (RunData *d)
{
  fw_compare_operand_unref (d->a);
  fw_compare_operand_unref (d->b);
  g_free (d);
}

static void
run_thread (GTask *task, gpointer source, gpointer data, GCancellable *cancellable)
{
  RunData *d = data;
  GError *error = NULL;
  FwCompareResult *r = fw_compare_run (d->a, d->b, NULL, cancellable, &error);

  if (r)
    g_task_return_pointer (task, r, (GDestroyNotify) fw_compare_result_free);
  else
    g_task_return_error (task, error);
}

void
fw_compare_run_async (FwCompareOperand *a, FwCompareOperand *b, GCancellable *cancellable,
                      GAsyncReadyCallback callback, gpointer user_data)
{
  g_autoptr (GTask) task = g_task_new (NULL, cancellable, callback, user_data);
  RunData *d = g_new0 (RunData, 1);

  d->a = fw_compare_operand_ref (a);
  d->b = fw_compare_operand_ref (b);
  g_task_set_source_tag (task, fw_compare_run_async);
  g_task_set_task_data (task, d, (GDestroyNotify) run_data_free);
  g_task_run_in_thread (task, run_thread);
}

FwCompareResult *
fw_compare_run_finish (GAsyncResult *result, GError **error)
{
  g_return_val_if_fail (g_task_is_valid (result, NULL), NULL);
  return g_task_propagate_pointer (G_TASK (result), error);
}

gboolean
fw_compare_result_within (const FwCompareResult *r, double tolerance)
{
  return r->same_shape && r->diff->max_abs_diff <= tolerance;
}

char *
fw_compare_result_to_text (const FwCompareResult *r)
{
  const FwDiffResult *d = r->diff;
  const FwDiffAlignment *al = &d->align;
  GString *s = g_string_new (NULL);
  g_autofree char *mx = _fw_compare_fmt_g (d->max_abs_diff), *rms = _fw_compare_fmt_g (d->rms_diff);
  g_autofree char *mean = _fw_compare_fmt_g (d->mean_diff), *corr = NULL;
  g_autofree char *where = bin_words (d->a, d->max_bin);

  corr = isnan (d->correlation) ? g_strdup ("n/a")
                                : g_strdup_printf ("%.6f", d->correlation);
  g_string_append_printf (s, _("A: %s (%zu frames x %zu bins)\n"),
                          r->label_a, al->a_frames, al->a_bins);
  g_string_append_printf (s, _("B: %s (%zu frames x %zu bins)\n"),
                          r->label_b, al->b_frames, al->b_bins);
  if (r->frames_by_index)
    g_string_append_printf (s, _("Compared: %zu frames x %zu bins, frames %.0f-%.0f\n"),
                            d->n_frames, d->n_bins, al->start, al->end);
  else
    g_string_append_printf (s, _("Compared: %zu frames x %zu bins, %.3f-%.3f s\n"),
                            d->n_frames, d->n_bins, al->start, al->end);
  for (guint i = 0; i < r->notes->len; i++)
    g_string_append_printf (s, "  %s\n", (const char *) r->notes->pdata[i]);
  if (r->frames_by_index)
    g_string_append_printf (s, _("max |B-A| %s%s%s at frame %zu, %s; RMS %s; "
                                 "mean %s; correlation %s\n"),
                            mx, *r->unit ? " " : "", r->unit, d->max_frame, where, rms, mean,
                            corr);
  else
    g_string_append_printf (s, _("max |B-A| %s%s%s at frame %zu (%.3f s), %s; "
                                 "RMS %s; mean %s; correlation %s\n"),
                            mx, *r->unit ? " " : "", r->unit, d->max_frame,
                            d->a->frame_times[d->max_frame], where, rms, mean, corr);
  g_string_append_printf (s, _("Explanation: %s\n"), r->summary);
  return g_string_free (s, FALSE);
}

/* ---- JSON (small, by hand) ----------------------------------------------------------------- */

void
_fw_json_str (GString *s, const char *v)
{
  g_string_append_c (s, '"');
  for (const unsigned char *p = (const unsigned char *) (v ? v : ""); *p; p++)
    {
      switch (*p)
        {
        case '"':
          g_string_append (s, "\\\"");
          break;
        case '\\':
          g_string_append (s, "\\\\");
          break;
        case '\n':
          g_string_append (s, "\\n");
          break;
        case '\r':
          g_string_append (s, "\\r");
          break;
        case '\t':
          g_string_append (s, "\\t");
          break;
        default:
          if (*p < 0x20)
            g_string_append_printf (s, "\\u%04x", *p);
          else
            g_string_append_c (s, (char) *p);
        }
    }
  g_string_append_c (s, '"');
}

void
_fw_json_num (GString *s, double v)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  if (!isfinite (v))
    g_string_append (s, "null");
  else
    g_string_append (s, g_ascii_formatd (buf, sizeof buf, "%.9g", v));
}

void
_fw_json_key (GString *s, const char *key, gboolean *first)
{
  if (!*first)
    g_string_append (s, ",\n  ");
  *first = FALSE;
  _fw_json_str (s, key);
  g_string_append (s, ": ");
}

void
_fw_json_strv (GString *s, char *const *v, guint n)
{
  g_string_append_c (s, '[');
  for (guint i = 0; i < n; i++)
    {
      if (i)
        g_string_append (s, ", ");
      _fw_json_str (s, v[i]);
    }
  g_string_append_c (s, ']');
}

void
_fw_compare_json_body (GString *s, const FwCompareResult *r, double tolerance, gboolean *first)
{
  const FwDiffResult *d = r->diff;
  const FwDiffAlignment *al = &d->align;

  _fw_json_key (s, "a", first);
  _fw_json_str (s, r->label_a);
  _fw_json_key (s, "b", first);
  _fw_json_str (s, r->label_b);
  _fw_json_key (s, "shape_a", first);
  g_string_append_printf (s, "[%" G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT "]", al->a_frames,
                          al->a_bins);
  _fw_json_key (s, "shape_b", first);
  g_string_append_printf (s, "[%" G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT "]", al->b_frames,
                          al->b_bins);
  _fw_json_key (s, "compared_frames", first);
  g_string_append_printf (s, "%" G_GSIZE_FORMAT, d->n_frames);
  _fw_json_key (s, "compared_bins", first);
  g_string_append_printf (s, "%" G_GSIZE_FORMAT, d->n_bins);
  _fw_json_key (s, "compared_start_s", first);
  _fw_json_num (s, al->start);
  _fw_json_key (s, "compared_end_s", first);
  _fw_json_num (s, al->end);
  _fw_json_key (s, "time_resampled", first);
  g_string_append (s, al->time_resampled ? "true" : "false");
  _fw_json_key (s, "unit", first);
  _fw_json_str (s, r->unit);
  _fw_json_key (s, "max_abs_diff", first);
  _fw_json_num (s, d->max_abs_diff);
  _fw_json_key (s, "max_abs_diff_frame", first);
  g_string_append_printf (s, "%" G_GSIZE_FORMAT, d->max_frame);
  _fw_json_key (s, "max_abs_diff_bin", first);
  g_string_append_printf (s, "%" G_GSIZE_FORMAT, d->max_bin);
  _fw_json_key (s, "rms_diff", first);
  _fw_json_num (s, d->rms_diff);
  _fw_json_key (s, "mean_offset", first);
  _fw_json_num (s, d->mean_diff);
  _fw_json_key (s, "correlation", first);
  _fw_json_num (s, d->correlation);
  _fw_json_key (s, "explanation_unit", first);
  _fw_json_str (s, r->expl_unit);
  _fw_json_key (s, "offset", first);
  _fw_json_num (s, d->expl.offset);
  _fw_json_key (s, "bin_offset_max_abs", first);
  _fw_json_num (s, d->expl.bin_offset_max_abs);
  _fw_json_key (s, "lag_frames", first);
  g_string_append_printf (s, "%d", d->expl.lag_frames);
  _fw_json_key (s, "residual_max_abs", first);
  _fw_json_num (s, d->expl.residual_max_abs);
  _fw_json_key (s, "residual_rms", first);
  _fw_json_num (s, d->expl.residual_rms);
  _fw_json_key (s, "identical", first);
  g_string_append (s, d->expl.identical ? "true" : "false");
  _fw_json_key (s, "same_shape", first);
  g_string_append (s, r->same_shape ? "true" : "false");
  if (tolerance >= 0)
    {
      _fw_json_key (s, "tolerance", first);
      _fw_json_num (s, tolerance);
      _fw_json_key (s, "within_tolerance", first);
      g_string_append (s, fw_compare_result_within (r, tolerance) ? "true" : "false");
    }
  _fw_json_key (s, "summary", first);
  _fw_json_str (s, r->summary);
  _fw_json_key (s, "notes", first);
  _fw_json_strv (s, (char *const *) r->notes->pdata, r->notes->len);
}

char *
fw_compare_result_to_json (const FwCompareResult *r, double tolerance)
{
  GString *s = g_string_new ("{\n  ");
  gboolean first = TRUE;

  _fw_compare_json_body (s, r, tolerance, &first);
  g_string_append (s, "\n}\n");
  return g_string_free (s, FALSE);
}

/* ---- knob ranking ---------------------------------------------------------------------------- */

static void
knob_free (FwKnob *k)
{
  g_free (k->key);
  g_free (k->value_a);
  g_free (k->value_b);
  g_free (k->problem);
  g_free (k);
}

void
fw_knob_ranking_free (FwKnobRanking *r)
{
  if (r == NULL)
    return;
  g_free (r->unit);
  if (r->knobs)
    g_ptr_array_unref (r->knobs);
  g_free (r);
}

/* RMS of B - A on the aligned grid, in dB for linear kinds (no lag search). */
static gboolean
difference_rms (FwMatrix *a, FwMatrix *b, FwDiffValueKind kind, double *rms)
{
  FwDiffOptions opt;
  FwDiffResult *d = NULL;

  fw_diff_options_init (&opt);
  opt.value_kind = kind;
  opt.max_lag = 0;
  if (fw_diff_compute (a, b, &opt, &d) != FW_DSP_OK)
    return FALSE;
  *rms = d->expl.total_rms;
  fw_diff_result_free (d);
  return TRUE;
}

static int
knob_cmp (gconstpointer pa, gconstpointer pb)
{
  const FwKnob *a = *(FwKnob *const *) pa, *b = *(FwKnob *const *) pb;
  gboolean na = isnan (a->removed), nb = isnan (b->removed);

  if (na != nb)
    return na ? 1 : -1;
  if (!na && a->removed != b->removed)
    return a->removed > b->removed ? -1 : 1;
  return g_strcmp0 (a->key, b->key);
}

FwKnobRanking *
fw_compare_rank_knobs (FwCompareOperand *a, FwCompareOperand *b, GCancellable *cancellable,
                       GError **error)
{
  g_autoptr (FwCmpMatrix) ma = NULL;
  g_autoptr (FwCmpMatrix) mb = NULL;
  g_auto (GStrv) keys = NULL;
  g_autoptr (FwKnobRanking) r = NULL;
  FwDiffValueKind kind;

  g_return_val_if_fail (a != NULL && b != NULL, NULL);
  if (a->params == NULL || b->params == NULL
      || (a->kind != FW_COMPARE_OP_CLIP && a->kind != FW_COMPARE_OP_AUDIO))
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_KNOBS,
                   _("Ranking the keys needs A to be a clip with a parameter set and B to have "
                     "a parameter set (%s, %s)"),
                   a->label, b->label);
      return NULL;
    }
  ma = fw_compare_operand_get_matrix (a, cancellable, error);
  if (ma == NULL)
    return NULL;
  mb = fw_compare_operand_get_matrix (b, cancellable, error);
  if (mb == NULL)
    return NULL;

  r = g_new0 (FwKnobRanking, 1);
  r->knobs = g_ptr_array_new_with_free_func ((GDestroyNotify) knob_free);
  kind = fw_compare_value_kind (a->stage, a->params);
  r->unit = g_strdup (kind != FW_DIFF_VALUES_PLAIN ? "dB" : fw_feature_value_unit (a->stage, NULL));
  if (!difference_rms (ma, mb, kind, &r->rms_before))
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_ALIGN,
                   _("%s and %s share no time span or frequencies"), a->label, b->label);
      return NULL;
    }

  keys = fw_params_diff_keys (a->params, b->params);
  for (char **k = keys; *k; k++)
    {
      FwKnob *knob = g_new0 (FwKnob, 1);
      g_autoptr (FwParams) p = NULL;
      g_autoptr (FwAudio) audio = NULL;
      g_autoptr (FwCmpMatrix) m = NULL;
      g_autoptr (GError) local = NULL;

      knob->key = g_strdup (*k);
      knob->value_a = fw_params_get_value (a->params, *k);
      knob->value_b = fw_params_get_value (b->params, *k);
      knob->removed = NAN;
      knob->rms_after = NAN;
      knob->left_without = NAN;
      g_ptr_array_add (r->knobs, knob);

      if (g_cancellable_set_error_if_cancelled (cancellable, error))
        return NULL;
      p = fw_params_with (a->params, *k, knob->value_b, &local);
      if (p)
        audio = _fw_compare_operand_audio_for (a, p, cancellable, &local);
      if (audio)
        m = fw_feature_compute (audio, p, a->stage, _fw_compare_n_workers (), NULL, NULL,
                                cancellable,
                                &local);
      if (m == NULL)
        knob->problem = g_strdup (local ? local->message : _("cannot be applied alone"));
      else if (!difference_rms (m, mb, kind, &knob->rms_after))
        knob->problem = g_strdup (_("the result shares no frames with B"));
      else
        knob->removed = r->rms_before > 0 ? 1.0 - knob->rms_after / r->rms_before : 0.0;

      /* and the other way round: every other key of B applied, this one left at A's value */
      {
        g_autoptr (FwParams) q = fw_params_with (b->params, *k, knob->value_a, NULL);
        g_autoptr (FwAudio) qa = q ? _fw_compare_operand_audio_for (a, q, cancellable, NULL)
                                   : NULL;
        g_autoptr (FwCmpMatrix) qm = NULL;
        double left = NAN;

        if (qa)
          qm = fw_feature_compute (qa, q, a->stage, _fw_compare_n_workers (), NULL, NULL,
                                   cancellable, NULL);
        if (qm && difference_rms (qm, mb, kind, &left) && r->rms_before > 0)
          knob->left_without = left / r->rms_before;
      }
    }
  g_ptr_array_sort (r->knobs, knob_cmp);
  return g_steal_pointer (&r);
}

char *
fw_knob_ranking_to_text (const FwKnobRanking *r)
{
  GString *s = g_string_new (NULL);
  g_autofree char *before = _fw_compare_fmt_g (r->rms_before);

  g_string_append_printf (s, _("RMS difference before: %s%s%s\n"), before,
                          *r->unit ? " " : "", r->unit);
  for (guint i = 0; i < r->knobs->len; i++)
    {
      const FwKnob *k = r->knobs->pdata[i];
      g_autofree char *after = _fw_compare_fmt_g (k->rms_after);
      g_autofree char *without = NULL;

      if (!isnan (k->left_without) && k->left_without > 0.005)
        without = g_strdup_printf (_("; with every other key of B applied, %.0f%% remains"),
                                   100.0 * k->left_without);
      else if (!isnan (k->left_without))
        without = g_strdup (_("; the other keys of B alone already explain it"));
      if (k->problem)
        g_string_append_printf (s, _("  %s (%s -> %s) cannot be applied alone: %s%s\n"), k->key,
                                k->value_a, k->value_b, k->problem, without ? without : "");
      else if (k->removed >= 0)
        g_string_append_printf (s, _("  %s (%s -> %s) removes %.0f%% of the difference "
                                     "(RMS %s%s%s left)%s\n"),
                                k->key, k->value_a, k->value_b, 100.0 * k->removed, after,
                                *r->unit ? " " : "", r->unit, without ? without : "");
      else
        g_string_append_printf (s, _("  %s (%s -> %s) alone makes the difference %.0f%% "
                                     "larger (RMS %s%s%s)%s\n"),
                                k->key, k->value_a, k->value_b, -100.0 * k->removed, after,
                                *r->unit ? " " : "", r->unit, without ? without : "");
    }
  return g_string_free (s, FALSE);
}

char *
fw_compare_result_to_json_with_knobs (const FwCompareResult *r, double tolerance,
                                      const FwKnobRanking *ranking)
{
  GString *s = g_string_new ("{\n  ");
  gboolean first = TRUE;

  _fw_compare_json_body (s, r, tolerance, &first);
  if (ranking)
    {
      _fw_json_key (s, "knobs_rms_before", &first);
      _fw_json_num (s, ranking->rms_before);
      _fw_json_key (s, "knobs", &first);
      g_string_append_c (s, '[');
      for (guint i = 0; i < ranking->knobs->len; i++)
        {
          const FwKnob *k = ranking->knobs->pdata[i];
          g_string_append (s, i ? ",\n    {" : "\n    {");
          _fw_json_str (s, "key");
          g_string_append (s, ": ");
          _fw_json_str (s, k->key);
          g_string_append (s, ", \"value_a\": ");
          _fw_json_str (s, k->value_a);
          g_string_append (s, ", \"value_b\": ");
          _fw_json_str (s, k->value_b);
          g_string_append (s, ", \"removed\": ");
          _fw_json_num (s, k->removed);
          g_string_append (s, ", \"rms_after\": ");
          _fw_json_num (s, k->rms_after);
          g_string_append (s, ", \"left_without\": ");
          _fw_json_num (s, k->left_without);
          g_string_append (s, ", \"problem\": ");
          if (k->problem)
            _fw_json_str (s, k->problem);
          else
            g_string_append (s, "null");
          g_string_append_c (s, '}');
        }
      g_string_append (s, "]");
    }
  g_string_append (s, "\n}\n");
  return g_string_free (s, FALSE);
}
