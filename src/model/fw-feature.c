/* fw-feature.c: where a parameter set meets the dsp pipeline, with user-facing errors.
 *
 * Files written here:
 *   NPY (name ends in .npy, any case): format version 1.0 as specified in numpy's
 *     "format.py" documentation: the magic "\x93NUMPY", bytes 1 and 0, a little-endian
 *     uint16 header length, then the header dict
 *       {'descr': '<f4', 'fortran_order': False, 'shape': (F, B), }
 *     padded with spaces and ended by "\n" so that magic + length + header is a multiple of 64
 *     bytes (64 also satisfies the 16-byte alignment of older numpy versions), then F*B
 *     little-endian float32 values in C (row-major) order: frame after frame.
 *   CSV otherwise: a header row "time_s,<bin labels>", then one row per frame: the frame's
 *     centre time in seconds and its values (%.9g, enough to give back each float32 exactly).
 *     Bin labels: hz_<bin frequency, shortest exact text> for spectral bins, mel_<band index> for mel bands,
 *     c<index> for cepstral coefficients, and the stage name for one-column descriptors.
 * Both are written atomically (temporary file, then rename).
 */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-feature.h"

G_DEFINE_QUARK (fw-feature-error-quark, fw_feature_error)

typedef struct {
  const char *name;
  FwStage stage;
} StageName;

static const StageName stage_table[] = {
  { "power", FW_STAGE_SPECTRUM },
  { "magnitude", FW_STAGE_SPECTRUM },
  { "db", FW_STAGE_DB },
  { "mel", FW_STAGE_MEL },
  { "mel-db", FW_STAGE_MEL_DB },
  { "mfcc", FW_STAGE_MFCC },
  { "delta", FW_STAGE_DELTA },
  { "delta2", FW_STAGE_DELTA2 },
  { "rms", FW_STAGE_RMS },
  { "zcr", FW_STAGE_ZCR },
  { "centroid", FW_STAGE_CENTROID },
  { "bandwidth", FW_STAGE_BANDWIDTH },
  { "rolloff", FW_STAGE_ROLLOFF },
  { "flatness", FW_STAGE_FLATNESS },
};

static const char *const stage_names[] = {
  "power", "magnitude", "db", "mel", "mel-db", "mfcc", "delta", "delta2",
  "rms", "zcr", "centroid", "bandwidth", "rolloff", "flatness", NULL
};

G_STATIC_ASSERT (G_N_ELEMENTS (stage_table) + 1 == G_N_ELEMENTS (stage_names));

const char *const *
fw_feature_stage_names (void)
{
  return stage_names;
}

gboolean
fw_feature_parse_stage (const char *name, FwStage *out, GError **error)
{
  g_autofree char *list = NULL;

  if (name != NULL)
    for (gsize i = 0; i < G_N_ELEMENTS (stage_table); i++)
      if (g_ascii_strcasecmp (name, stage_table[i].name) == 0)
        {
          if (out != NULL)
            *out = stage_table[i].stage;
          return TRUE;
        }
  list = g_strjoinv (", ", (char **) stage_names);
  g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_STAGE,
               _("unknown stage '%s'; the stages are %s"), name != NULL ? name : "", list);
  return FALSE;
}

/**
 * fw_feature_stage_name:
 * The name of a stage for files and messages: "power" or "magnitude" for the spectrum stage
 * according to params' spectrum key (params may be NULL: "power"), else the stage's name.
 */
const char *
fw_feature_stage_name (FwStage stage, const FwParams *params)
{
  if (stage == FW_STAGE_SPECTRUM)
    {
      g_autofree char *kind = params != NULL ? fw_params_get_value (params, "spectrum") : NULL;
      return kind != NULL && strcmp (kind, "magnitude") == 0 ? "magnitude" : "power";
    }
  for (gsize i = 0; i < G_N_ELEMENTS (stage_table); i++)
    if (stage_table[i].stage == stage)
      return stage_table[i].name;
  return "?";
}

/**
 * fw_feature_n_bins:
 * Number of columns of a stage's matrix for params: fft_length/2 + 1 for the spectrum and dB
 * stages, mel_bands for mel and mel-db, cepstral_count for mfcc and the deltas, 1 for the
 * per-frame descriptors.
 */
gsize
fw_feature_n_bins (FwStage stage, const FwParams *params)
{
  FwAnalysisConfig cfg;

  fw_params_fill_config (params, 1.0, &cfg);
  switch (stage)
    {
    case FW_STAGE_SPECTRUM:
    case FW_STAGE_DB:
      return cfg.fft_length / 2 + 1;
    case FW_STAGE_MEL:
    case FW_STAGE_MEL_DB:
      return cfg.mel_bands;
    case FW_STAGE_MFCC:
    case FW_STAGE_DELTA:
    case FW_STAGE_DELTA2:
      return cfg.cepstral_count;
    case FW_STAGE_RMS:
    case FW_STAGE_ZCR:
    case FW_STAGE_CENTROID:
    case FW_STAGE_BANDWIDTH:
    case FW_STAGE_ROLLOFF:
    case FW_STAGE_FLATNESS:
      return 1;
    case FW_STAGE_SIGNAL:
    case FW_N_STAGES:
    default:
      return 0;
    }
}

FwAudio *
fw_feature_load_audio (const char *path, const FwParams *params, GCancellable *cancellable,
                       GError **error)
{
  g_return_val_if_fail (path != NULL, NULL);
  g_return_val_if_fail (params != NULL, NULL);

  return fw_audio_load (path, fw_params_get_channel (params), fw_params_get_sample_rate (params),
                        cancellable, error);
}

/**
 * fw_feature_check:
 * fw_params_check() for this audio (its analysis rate and length), with the file name in the
 * message, plus warnings about the resampling the parameters asked for (upsampling adds no
 * information; strong downsampling removes content). warnings may be NULL.
 */
gboolean
fw_feature_check (FwAudio *audio, const FwParams *params, GPtrArray *warnings, GError **error)
{
  g_autoptr (GError) local = NULL;
  g_autofree char *display = NULL;

  g_return_val_if_fail (audio != NULL, FALSE);
  g_return_val_if_fail (params != NULL, FALSE);

  display = g_filename_display_name (audio->info.path != NULL ? audio->info.path : "");
  if (!fw_params_check (params, audio->sample_rate, audio->n_samples, warnings, &local))
    {
      g_set_error (error, local->domain, local->code, "%s: %s", display, local->message);
      return FALSE;
    }
  if (warnings != NULL && audio->resampled && audio->info.sample_rate > 0)
    {
      double from = audio->info.sample_rate, to = audio->sample_rate;
      char b1[G_ASCII_DTOSTR_BUF_SIZE], b2[G_ASCII_DTOSTR_BUF_SIZE], b3[G_ASCII_DTOSTR_BUF_SIZE];

      g_ascii_formatd (b1, sizeof b1, "%.15g", from);
      g_ascii_formatd (b2, sizeof b2, "%.15g", to);
      if (to > from)
        g_ptr_array_add (warnings, g_strdup_printf (
          _("%s was recorded at %s Hz and is upsampled to %s Hz: upsampling adds no information, "
            "so everything above %s Hz is empty"),
          display, b1, b2, g_ascii_formatd (b3, sizeof b3, "%.15g", from / 2)));
      else if (from / to > 2.0)
        g_ptr_array_add (warnings, g_strdup_printf (
          _("%s was recorded at %s Hz and is downsampled to %s Hz: everything above %s Hz is "
            "removed; set sample_rate=0 to analyse at the file's rate"),
          display, b1, b2, g_ascii_formatd (b3, sizeof b3, "%.15g", to / 2)));
    }
  return TRUE;
}

typedef struct {
  FwProgressFunc progress;
  void *user_data;
  GCancellable *cancellable;
} ProgressRelay;

static int
relay_progress (double fraction, void *data)
{
  ProgressRelay *r = data;

  if (g_cancellable_is_cancelled (r->cancellable))
    return 1;
  if (r->progress != NULL)
    return r->progress (fraction, r->user_data);
  return 0;
}

FwMatrix *
fw_feature_compute (FwAudio *audio, const FwParams *params, FwStage stage, int n_threads,
                    FwProgressFunc progress, void *user_data, GCancellable *cancellable,
                    GError **error)
{
  FwAnalysisConfig cfg;
  FwMatrix *m = NULL;
  FwDspStatus status;
  ProgressRelay relay = { progress, user_data, cancellable };
  g_autofree char *display = NULL;
  gsize n_bad = 0;

  g_return_val_if_fail (audio != NULL, NULL);
  g_return_val_if_fail (params != NULL, NULL);
  g_return_val_if_fail (stage >= 0 && stage < FW_N_STAGES, NULL);

  display = g_filename_display_name (audio->info.path != NULL ? audio->info.path : "");

  if (g_cancellable_is_cancelled (cancellable))
    {
      g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_CANCELLED, _("cancelled"));
      return NULL;
    }
  if (!fw_feature_check (audio, params, NULL, error))
    return NULL;

  /* The loader refuses non-finite samples; audio made in memory is checked here. */
  for (gsize i = 0; i < audio->n_samples; i++)
    if (!isfinite (audio->samples[i]))
      n_bad++;
  if (n_bad > 0)
    {
      g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_FAILED,
                   ngettext ("%s: %zu sample is not a finite number",
                             "%s: %zu samples are not finite numbers", n_bad),
                   display, n_bad);
      return NULL;
    }

  fw_params_fill_config (params, audio->sample_rate, &cfg);
  status = fw_analysis_run (&cfg, audio->samples, audio->n_samples, stage, n_threads,
                            relay_progress, &relay, &m);
  if (status == FW_DSP_ERROR_CANCELLED || (status == FW_DSP_OK && g_cancellable_is_cancelled (cancellable)))
    {
      if (m != NULL)
        fw_matrix_unref (m);
      g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_CANCELLED, _("cancelled"));
      return NULL;
    }
  if (status != FW_DSP_OK || m == NULL)
    {
      g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_FAILED,
                   _("%s: computing %s failed: %s"), display,
                   fw_feature_stage_name (stage, params), fw_dsp_status_describe (status));
      if (m != NULL)
        fw_matrix_unref (m);
      return NULL;
    }

  /* Never hand out NaN: a non-finite value here is a bug, reported rather than passed on. */
  n_bad = 0;
  for (gsize i = 0; i < m->n_frames * m->n_bins; i++)
    if (!isfinite (m->data[i]))
      n_bad++;
  if (n_bad > 0)
    {
      g_set_error (error, FW_FEATURE_ERROR, FW_FEATURE_ERROR_FAILED,
                   _("%s: computing %s gave %zu values that are not finite "
                     "numbers (an internal error; please report it with the parameters)"),
                   display, fw_feature_stage_name (stage, params), n_bad);
      fw_matrix_unref (m);
      return NULL;
    }
  return m;
}

/* ---- labels ----------------------------------------------------------------------------- */

static char *
db_reference_words (const FwParams *params)
{
  g_autofree char *ref = fw_params_get_value (params, "db_reference");

  if (strcmp (ref, "max") == 0)
    return g_strdup (_("dB re clip max"));
  if (strchr (ref, '.') == NULL && strchr (ref, 'e') == NULL)
    return g_strdup_printf (_("dB re %s.0"), ref);
  return g_strdup_printf (_("dB re %s"), ref);
}

char *
fw_feature_quantity_label (FwStage stage, const FwParams *params)
{
  g_autofree char *kind = NULL;
  gboolean power;

  g_return_val_if_fail (params != NULL, NULL);
  kind = fw_params_get_value (params, "spectrum");
  power = strcmp (kind, "power") == 0;

  switch (stage)
    {
    case FW_STAGE_SPECTRUM:
      return g_strdup (power ? _("power") : _("magnitude"));
    case FW_STAGE_DB:
      {
        g_autofree char *ref = db_reference_words (params);
        return g_strdup_printf ("%s, %s", power ? _("power") : _("magnitude"), ref);
      }
    case FW_STAGE_MEL:
      return g_strdup (power ? _("mel power") : _("mel magnitude"));
    case FW_STAGE_MEL_DB:
      {
        g_autofree char *ref = db_reference_words (params);
        return g_strdup_printf ("%s, %s", power ? _("mel power") : _("mel magnitude"), ref);
      }
    case FW_STAGE_MFCC:
      return g_strdup (_("MFCC value"));
    case FW_STAGE_DELTA:
      return g_strdup (_("delta of MFCC (per frame)"));
    case FW_STAGE_DELTA2:
      return g_strdup (_("delta-delta of MFCC (per frame squared)"));
    case FW_STAGE_RMS:
      return g_strdup (_("RMS amplitude (re full scale 1.0)"));
    case FW_STAGE_ZCR:
      return g_strdup (_("zero-crossing rate"));
    case FW_STAGE_CENTROID:
      return g_strdup (_("spectral centroid, Hz"));
    case FW_STAGE_BANDWIDTH:
      return g_strdup (_("spectral bandwidth, Hz"));
    case FW_STAGE_ROLLOFF:
      return g_strdup_printf (_("%d%% rolloff frequency, Hz"), (int) lround (FW_ROLLOFF_FRACTION * 100));
    case FW_STAGE_FLATNESS:
      return g_strdup (_("spectral flatness (0 to 1)"));
    case FW_STAGE_SIGNAL:
      return g_strdup (_("amplitude (re full scale 1.0)"));
    case FW_N_STAGES:
    default:
      return g_strdup ("");
    }
}

const char *
fw_feature_value_unit (FwStage stage, const FwParams *params)
{
  switch (stage)
    {
    case FW_STAGE_DB:
    case FW_STAGE_MEL_DB:
      return "dB";
    case FW_STAGE_CENTROID:
    case FW_STAGE_BANDWIDTH:
    case FW_STAGE_ROLLOFF:
      return "Hz";
    default:
      return "";
    }
}

/* ---- writing ---------------------------------------------------------------------------- */

/**
 * fw_feature_npy_header:
 * The NPY 1.0 preamble for a float32 (n_frames, n_bins) C-order array: magic, version,
 * header length and the padded header dict; a multiple of 64 bytes long. Caller frees.
 */
GBytes *
fw_feature_npy_header (gsize n_frames, gsize n_bins)
{
  g_autofree char *dict = g_strdup_printf ("{'descr': '<f4', 'fortran_order': False, "
                                           "'shape': (%" G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT "), }",
                                           n_frames, n_bins);
  gsize dict_len = strlen (dict);
  gsize total = 10 + dict_len + 1;  /* magic(6) + version(2) + length(2) + dict + '\n' */
  gsize padded = (total + 63) / 64 * 64;
  gsize header_len = padded - 10;
  guint8 *buf = g_malloc (padded);

  g_assert (header_len <= G_MAXUINT16);
  memcpy (buf, "\x93NUMPY", 6);
  buf[6] = 1;
  buf[7] = 0;
  buf[8] = (guint8) (header_len & 0xff);
  buf[9] = (guint8) (header_len >> 8);
  memcpy (buf + 10, dict, dict_len);
  memset (buf + 10 + dict_len, ' ', padded - 10 - dict_len - 1);
  buf[padded - 1] = '\n';
  return g_bytes_new_take (buf, padded);
}

static gboolean
has_suffix_ci (const char *s, const char *suffix)
{
  gsize ls = strlen (s), lx = strlen (suffix);
  return ls >= lx && g_ascii_strcasecmp (s + ls - lx, suffix) == 0;
}

static char *
bin_label (const FwMatrix *m, gsize k)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  switch (m->bin_kind)
    {
    case FW_BIN_AXIS_HZ:
      return g_strdup_printf ("hz_%s", fw_params_format_double (m->bin_value != NULL
                                                                ? m->bin_value[k] : 0, buf));
    case FW_BIN_AXIS_MEL_BAND:
      return g_strdup_printf ("mel_%" G_GSIZE_FORMAT, k);
    case FW_BIN_AXIS_COEFFICIENT:
      return g_strdup_printf ("c%" G_GSIZE_FORMAT, k);
    case FW_BIN_AXIS_SCALAR:
    default:
      if (m->n_bins == 1 && m->stage >= 0 && m->stage < FW_N_STAGES)
        return g_strdup (fw_feature_stage_name ((FwStage) m->stage, NULL));
      return g_strdup_printf ("v%" G_GSIZE_FORMAT, k);
    }
}

gboolean
fw_feature_write (const FwMatrix *m, const char *path, GError **error)
{
  g_return_val_if_fail (m != NULL, FALSE);
  g_return_val_if_fail (path != NULL, FALSE);

  if (has_suffix_ci (path, ".npy"))
    {
      g_autoptr (GBytes) header = fw_feature_npy_header (m->n_frames, m->n_bins);
      gsize hlen = g_bytes_get_size (header);
      gsize n = m->n_frames * m->n_bins;
      gsize total = hlen + n * 4;
      g_autofree guint8 *buf = g_try_malloc (MAX (total, 1));

      if (buf == NULL)
        {
          g_set_error (error, G_IO_ERROR, G_IO_ERROR_FAILED,
                       _("%s: not enough memory for %zu bytes"), path, total);
          return FALSE;
        }
      memcpy (buf, g_bytes_get_data (header, NULL), hlen);
      for (gsize i = 0; i < n; i++)
        {
          guint32 bits;
          memcpy (&bits, &m->data[i], 4);
          bits = GUINT32_TO_LE (bits);
          memcpy (buf + hlen + i * 4, &bits, 4);
        }
      return g_file_set_contents (path, (const char *) buf, (gssize) total, error);
    }
  else
    {
      GString *s = g_string_sized_new (64 + m->n_frames * (m->n_bins + 1) * 12);
      char buf[G_ASCII_DTOSTR_BUF_SIZE];
      gboolean ok;

      g_string_append (s, "time_s");
      for (gsize k = 0; k < m->n_bins; k++)
        {
          g_autofree char *label = bin_label (m, k);
          g_string_append_c (s, ',');
          g_string_append (s, label);
        }
      g_string_append_c (s, '\n');
      for (gsize t = 0; t < m->n_frames; t++)
        {
          g_string_append (s, g_ascii_formatd (buf, sizeof buf, "%.10g",
                                               m->frame_times != NULL ? m->frame_times[t] : 0));
          for (gsize k = 0; k < m->n_bins; k++)
            {
              g_string_append_c (s, ',');
              g_string_append (s, g_ascii_formatd (buf, sizeof buf, "%.9g",
                                                   (double) m->data[t * m->n_bins + k]));
            }
          g_string_append_c (s, '\n');
        }
      ok = g_file_set_contents (path, s->str, (gssize) s->len, error);
      g_string_free (s, TRUE);
      return ok;
    }
}
