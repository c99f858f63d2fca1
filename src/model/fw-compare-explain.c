/* fw-compare-explain.c: the convention finder (fw_compare_explain in fw-compare.h).
 *
 * Search plan (keeps the work small):
 *  1. Dimensions: for each key that affects the dump's stage, the base set's value plus the
 *     usual variants (spectrum power/magnitude, mel_scale, mel_weights, db_reference 1.0/max,
 *     dct_norm, centered, window_symmetry, lifter 0/22) and the user's candidates.
 *     Keys are grouped by where they enter the pipeline: framing (signal level), spectrum,
 *     mel, dB, cepstrum, deltas.
 *  2. Coarse pass: every combination of the framing keys (one FFT pass each; magnitude is the
 *     square root of the power spectrum), the spectrum kind and the mel keys except
 *     mel_weights, with the later keys at the base's values. These are scored by a measure
 *     that ignores per-bin gains and offsets (fw_diff_distance's affine fraction), which is
 *     exactly what mel_weights, db_reference, dct_norm and lifter change, so a wrong guess
 *     for those keys does not hide the right framing.
 *  3. Fine pass: for the best few coarse combinations, every combination of the remaining
 *     keys (mel_weights, dB keys, cepstral keys, delta_width) when there are at most 256, else
 *     coordinate-wise descent; scored by RMS(dump - candidate) / RMS(dump). Stages are derived
 *     from cached parents (fw_analysis_derive), so a dB or DCT variant costs one cheap pass.
 *  4. The best score wins; among sets that score the same (within 1% + 1e-6) the one that
 *     changes the fewest keys of the base is reported, the others are listed as equivalent.
 * Framing combinations run in parallel threads, each with its own stage cache.
 */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-compare-private.h"
#include "fw-feature.h"

typedef enum {
  LV_SIGNAL,
  LV_SPECTRUM,
  LV_MEL,
  LV_DB,
  LV_CEPSTRUM,
  LV_DELTA,
} Level;

static const struct {
  const char *key;
  Level level;
} key_levels[] = {
  { "sample_rate", LV_SIGNAL },   { "channel", LV_SIGNAL },       { "pre_emphasis", LV_SIGNAL },
  { "window_length", LV_SIGNAL }, { "hop_length", LV_SIGNAL },    { "fft_length", LV_SIGNAL },
  { "window", LV_SIGNAL },        { "window_symmetry", LV_SIGNAL }, { "centered", LV_SIGNAL },
  { "padding", LV_SIGNAL },       { "spectrum", LV_SPECTRUM },    { "mel_bands", LV_MEL },
  { "mel_scale", LV_MEL },        { "fmin", LV_MEL },             { "fmax", LV_MEL },
  { "mel_weights", LV_MEL },      { "db_reference", LV_DB },      { "db_floor", LV_DB },
  { "dynamic_range", LV_DB },     { "cepstral_count", LV_CEPSTRUM }, { "dct_norm", LV_CEPSTRUM },
  { "lifter", LV_CEPSTRUM },      { "delta_width", LV_DELTA },
};

static int
key_level (const char *key)
{
  for (gsize i = 0; i < G_N_ELEMENTS (key_levels); i++)
    if (strcmp (key_levels[i].key, key) == 0)
      return (int) key_levels[i].level;
  return -1;
}

static gboolean
stage_uses (FwStage stage, Level lv)
{
  switch (stage)
    {
    case FW_STAGE_SPECTRUM:
    case FW_STAGE_CENTROID:
    case FW_STAGE_BANDWIDTH:
    case FW_STAGE_ROLLOFF:
    case FW_STAGE_FLATNESS:
      return lv <= LV_SPECTRUM;
    case FW_STAGE_DB:
      return lv <= LV_SPECTRUM || lv == LV_DB;
    case FW_STAGE_MEL:
      return lv <= LV_MEL;
    case FW_STAGE_MEL_DB:
      return lv <= LV_DB;
    case FW_STAGE_MFCC:
      return lv <= LV_CEPSTRUM;
    case FW_STAGE_DELTA:
    case FW_STAGE_DELTA2:
      return TRUE;
    case FW_STAGE_RMS:
    case FW_STAGE_ZCR:
      return lv == LV_SIGNAL;
    default:
      return FALSE;
    }
}

/* Coarse keys are scored with the gain/offset-blind measure; fine keys change exactly the
 * things that measure ignores. */
static gboolean
level_is_coarse (Level lv, const char *key)
{
  if (lv == LV_MEL)
    return strcmp (key, "mel_weights") != 0;
  return lv <= LV_SPECTRUM;
}

typedef struct {
  char *key;
  GPtrArray *values; /* canonical value texts; [0] is the base's */
  Level level;
  gboolean coarse;
} Dim;

static void
dim_free (Dim *d)
{
  g_free (d->key);
  g_ptr_array_unref (d->values);
  g_free (d);
}

typedef struct {
  FwParams *params;
  double affine;     /* NaN when not measured */
  double relative;
  gboolean bins_match;
  guint n_changed;
  gboolean from_coarse;
} Scored;

static void
scored_free (Scored *s)
{
  fw_params_unref (s->params);
  g_free (s);
}

typedef struct {
  FwCompareOperand *clip_op;
  FwMatrix *dump;
  const FwFeatureFile *dump_file;
  FwStage stage;
  FwParams *base;
  GPtrArray *dims;            /* Dim * */
  GHashTable *audio;          /* "rate|channel" -> FwAudio * (filled before threads start) */
  GMutex lock;
  GPtrArray *scored;          /* Scored * */
  GHashTable *seen;           /* params hash -> Scored * (in `scored`) */
  guint n_evaluated, n_spectra, n_invalid, expected;
  char *first_problem;
  GCancellable *cancellable;
  FwProgressFunc progress;
  void *user_data;
  gint cancelled;
  gboolean looks_transposed;
} Search;

/* ---- parameter sets ---------------------------------------------------------------------- */

/* "key=value" settings for one dim value; fft_length carries window_length along when the
 * base has window_length = fft_length or the window would not fit. */
static void
add_setting (GPtrArray *settings, const FwParams *base, const char *key, const char *value)
{
  if (strcmp (key, "fft_length") == 0)
    {
      g_autofree char *w = fw_params_get_value (base, "window_length");
      g_autofree char *f = fw_params_get_value (base, "fft_length");
      if (strcmp (w, f) == 0 || g_ascii_strtoll (value, NULL, 10) < g_ascii_strtoll (w, NULL, 10))
        g_ptr_array_add (settings, g_strdup_printf ("window_length=%s", value));
    }
  g_ptr_array_add (settings, g_strdup_printf ("%s=%s", key, value));
}

static guint
count_changed (const FwParams *base, const FwParams *p)
{
  g_auto (GStrv) keys = fw_params_diff_keys (base, p);
  return g_strv_length (keys);
}

static FwAudio *
audio_for (Search *s, FwParams *p)
{
  g_autofree char *key = g_strdup_printf ("%d|%d", fw_params_get_sample_rate (p),
                                          fw_params_get_channel (p));
  return g_hash_table_lookup (s->audio, key);
}

static void
note_invalid (Search *s, const char *message)
{
  g_mutex_lock (&s->lock);
  s->n_invalid++;
  if (s->first_problem == NULL)
    s->first_problem = g_strdup (message);
  g_mutex_unlock (&s->lock);
}

/* ---- stage cache (one per worker) ----------------------------------------------------------- */

typedef struct {
  GHashTable *memo;   /* key -> FwMatrix * */
  FwMatrix *power;    /* the framing's power spectrum */
} StageCache;

static void
stage_cache_init (StageCache *c)
{
  c->memo = g_hash_table_new_full (g_str_hash, g_str_equal, g_free,
                                   (GDestroyNotify) fw_matrix_unref);
  c->power = NULL;
}

static void
stage_cache_clear (StageCache *c)
{
  g_hash_table_remove_all (c->memo);
  if (c->power)
    fw_matrix_unref (c->power);
  c->power = NULL;
}

static void
stage_cache_free (StageCache *c)
{
  stage_cache_clear (c);
  g_hash_table_unref (c->memo);
}

static char *
memo_key (const FwParams *p, FwStage stage)
{
  GString *s = g_string_new (fw_stage_name (stage));

  for (gsize i = 0; i < G_N_ELEMENTS (key_levels); i++)
    if (key_levels[i].level != LV_SIGNAL && stage_uses (stage, key_levels[i].level))
      {
        g_autofree char *v = fw_params_get_value (p, key_levels[i].key);
        g_string_append_printf (s, "|%s", v);
      }
  return g_string_free (s, FALSE);
}

/* The matrix of `stage` for params p whose framing is the cache's (power already computed). */
static FwMatrix *
cached_stage (StageCache *c, const FwParams *p, const FwAnalysisConfig *cfg, FwStage stage)
{
  g_autofree char *key = NULL;
  FwMatrix *m, *parent;
  FwStage ps;

  if (stage == FW_STAGE_SPECTRUM && cfg->spectrum == FW_SPECTRUM_POWER)
    return fw_matrix_ref (c->power);
  key = memo_key (p, stage);
  m = g_hash_table_lookup (c->memo, key);
  if (m)
    return fw_matrix_ref (m);
  if (stage == FW_STAGE_SPECTRUM)
    {
      m = fw_matrix_copy (c->power);
      if (m == NULL)
        return NULL;
      for (gsize i = 0; i < m->n_frames * m->n_bins; i++)
        m->data[i] = sqrtf (m->data[i]);
    }
  else
    {
      ps = fw_stage_parent (stage);
      if (ps == FW_STAGE_SIGNAL)
        return NULL;
      parent = cached_stage (c, p, cfg, ps);
      if (parent == NULL)
        return NULL;
      if (fw_analysis_derive (cfg, stage, parent, &m) != FW_DSP_OK)
        m = NULL;
      fw_matrix_unref (parent);
      if (m == NULL)
        return NULL;
    }
  g_hash_table_insert (c->memo, g_steal_pointer (&key), m);
  return fw_matrix_ref (m);
}

/* ---- scoring --------------------------------------------------------------------------------- */

static gboolean
report_progress (Search *s)
{
  gboolean stop = FALSE;

  if (g_cancellable_is_cancelled (s->cancellable))
    stop = TRUE;
  else if (s->progress)
    {
      double f = s->expected ? MIN (1.0, (double) s->n_evaluated / s->expected) : 0.0;
      stop = s->progress (f, s->user_data) != 0;
    }
  if (stop)
    g_atomic_int_set (&s->cancelled, 1);
  return !stop;
}

/* Scores candidate matrix m for params p; returns the stored entry (owned by s->scored). */
static Scored *
score (Search *s, FwParams *p, FwMatrix *m, gboolean coarse)
{
  g_autoptr (FwCmpMatrix) dump = NULL;
  FwDiffOptions opt;
  double rms = NAN, b_rms = NAN, affine = NAN;
  Scored *e;

  if (s->dump_file)
    dump = fw_feature_file_adopt_grid (s->dump_file, m, NULL, NULL);
  else
    dump = fw_matrix_ref (s->dump);
  fw_diff_options_init (&opt);
  opt.max_lag = 0;
  opt.time_reference = 1; /* the dump's grid */
  opt.bin_reference = 1;
  if (fw_diff_distance (m, dump, &opt, &rms, NULL, &b_rms, coarse ? &affine : NULL, NULL, NULL)
      != FW_DSP_OK)
    {
      note_invalid (s, _("no time span in common with the dump"));
      return NULL;
    }
  e = g_new0 (Scored, 1);
  e->params = fw_params_ref (p);
  e->affine = affine;
  e->relative = b_rms > 0 ? rms / b_rms : (rms > 0 ? INFINITY : 0.0);
  e->bins_match = m->n_bins == s->dump->n_bins;
  e->n_changed = count_changed (s->base, p);
  e->from_coarse = coarse;
  g_mutex_lock (&s->lock);
  g_ptr_array_add (s->scored, e);
  s->n_evaluated++;
  report_progress (s);
  g_mutex_unlock (&s->lock);
  return e;
}

/* Claims a parameter set for evaluation; FALSE when it was done already. */
static gboolean
claim (Search *s, FwParams *p)
{
  gboolean fresh;

  g_mutex_lock (&s->lock);
  fresh = !g_hash_table_contains (s->seen, fw_params_get_hash (p));
  if (fresh)
    g_hash_table_add (s->seen, g_strdup (fw_params_get_hash (p)));
  g_mutex_unlock (&s->lock);
  return fresh;
}

/* Builds the set, checks it against its audio and the framing, computes and scores it. */
static Scored *
evaluate (Search *s, StageCache *c, FwParams *p, gboolean coarse)
{
  FwAudio *audio = audio_for (s, p);
  FwAnalysisConfig cfg;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwCmpMatrix) m = NULL;

  if (audio == NULL || g_atomic_int_get (&s->cancelled))
    return NULL;
  if (!fw_params_check (p, audio->sample_rate, audio->n_samples, NULL, &error))
    {
      note_invalid (s, error->message);
      return NULL;
    }
  fw_params_fill_config (p, audio->sample_rate, &cfg);
  if (s->stage == FW_STAGE_RMS || s->stage == FW_STAGE_ZCR)
    {
      if (fw_analysis_run (&cfg, audio->samples, audio->n_samples, s->stage, 1, NULL, NULL, &m)
          != FW_DSP_OK)
        m = NULL;
    }
  else
    m = cached_stage (c, p, &cfg, s->stage);
  if (m == NULL)
    {
      note_invalid (s, _("the stage could not be computed"));
      return NULL;
    }
  return score (s, p, m, coarse);
}

/* Computes the power spectrum of p's framing into the cache. */
static gboolean
prepare_framing (Search *s, StageCache *c, FwParams *p)
{
  FwAudio *audio = audio_for (s, p);
  FwAnalysisConfig cfg;
  g_autoptr (GError) error = NULL;

  stage_cache_clear (c);
  if (audio == NULL)
    return FALSE;
  if (s->stage == FW_STAGE_RMS || s->stage == FW_STAGE_ZCR)
    return TRUE;
  if (!fw_params_check (p, audio->sample_rate, audio->n_samples, NULL, &error))
    {
      note_invalid (s, error->message);
      return FALSE;
    }
  fw_params_fill_config (p, audio->sample_rate, &cfg);
  cfg.spectrum = FW_SPECTRUM_POWER;
  if (fw_analysis_run (&cfg, audio->samples, audio->n_samples, FW_STAGE_SPECTRUM, 1, NULL, NULL,
                       &c->power)
      != FW_DSP_OK)
    {
      c->power = NULL;
      note_invalid (s, _("the spectrum could not be computed"));
      return FALSE;
    }
  g_mutex_lock (&s->lock);
  s->n_spectra++;
  g_mutex_unlock (&s->lock);
  return TRUE;
}

/* Mixed-radix counter over a subset of dims. */
static gboolean
next_combo (guint *idx, Dim **dims, guint n)
{
  for (guint i = 0; i < n; i++)
    {
      if (++idx[i] < dims[i]->values->len)
        return TRUE;
      idx[i] = 0;
    }
  return FALSE;
}

static FwParams *
params_for (const FwParams *from, Dim **dims, const guint *idx, guint n, GError **error)
{
  g_autoptr (GPtrArray) settings = g_ptr_array_new_with_free_func (g_free);

  for (guint i = 0; i < n; i++)
    add_setting (settings, from, dims[i]->key, dims[i]->values->pdata[idx[i]]);
  g_ptr_array_add (settings, NULL);
  return fw_params_with_settings (from, (const char *const *) settings->pdata, error);
}

/* ---- the passes ------------------------------------------------------------------------------ */

typedef struct {
  Search *s;
  GPtrArray *jobs;    /* FwParams *: framing variants (coarse) or coarse winners (fine) */
  gint next;
  Dim **inner;        /* dims enumerated inside a job */
  guint n_inner;
  gboolean coarse;
} Pass;

static void
run_job_coarse (Pass *pass, StageCache *c, FwParams *framing)
{
  Search *s = pass->s;
  g_autofree guint *idx = g_new0 (guint, MAX (pass->n_inner, 1));

  if (!prepare_framing (s, c, framing))
    return;
  do
    {
      g_autoptr (GError) error = NULL;
      g_autoptr (FwParams) p = params_for (framing, pass->inner, idx, pass->n_inner, &error);
      if (g_atomic_int_get (&s->cancelled))
        return;
      if (p == NULL)
        {
          note_invalid (s, error->message);
          continue;
        }
      if (claim (s, p))
        evaluate (s, c, p, TRUE);
    }
  while (next_combo (idx, pass->inner, pass->n_inner));
}

static double
relative_of (Scored *e)
{
  return e ? e->relative : INFINITY;
}

static void
run_job_fine (Pass *pass, StageCache *c, FwParams *start)
{
  Search *s = pass->s;
  guint n = pass->n_inner;
  g_autofree guint *idx = g_new0 (guint, MAX (n, 1));
  guint64 combos = 1;

  if (!prepare_framing (s, c, start))
    return;
  for (guint i = 0; i < n; i++)
    combos *= pass->inner[i]->values->len;

  if (combos <= 256)
    {
      do
        {
          g_autoptr (GError) error = NULL;
          g_autoptr (FwParams) p = params_for (start, pass->inner, idx, n, &error);
          if (g_atomic_int_get (&s->cancelled))
            return;
          if (p == NULL)
            {
              note_invalid (s, error->message);
              continue;
            }
          if (claim (s, p))
            evaluate (s, c, p, FALSE);
        }
      while (next_combo (idx, pass->inner, n));
      return;
    }

  /* coordinate-wise descent from the start set */
  {
    g_autoptr (FwParams) best = fw_params_ref (start);
    double best_rel = INFINITY;
    gboolean changed = TRUE;

    for (int round = 0; round < 3 && changed; round++)
      {
        changed = FALSE;
        for (guint i = 0; i < n; i++)
          for (guint v = 0; v < pass->inner[i]->values->len; v++)
            {
              g_autoptr (GPtrArray) settings = g_ptr_array_new_with_free_func (g_free);
              g_autoptr (FwParams) p = NULL;
              Scored *e;

              if (g_atomic_int_get (&s->cancelled))
                return;
              add_setting (settings, best, pass->inner[i]->key, pass->inner[i]->values->pdata[v]);
              g_ptr_array_add (settings, NULL);
              p = fw_params_with_settings (best, (const char *const *) settings->pdata, NULL);
              if (p == NULL || !claim (s, p))
                continue;
              e = evaluate (s, c, p, FALSE);
              if (relative_of (e) < best_rel)
                {
                  best_rel = e->relative;
                  g_clear_pointer (&best, fw_params_unref);
                  best = fw_params_ref (p);
                  changed = TRUE;
                }
            }
      }
  }
}

static gpointer
pass_worker (gpointer data)
{
  Pass *pass = data;
  StageCache cache;

  stage_cache_init (&cache);
  for (;;)
    {
      gint i = g_atomic_int_add (&pass->next, 1);
      if (i >= (gint) pass->jobs->len || g_atomic_int_get (&pass->s->cancelled))
        break;
      if (pass->coarse)
        run_job_coarse (pass, &cache, pass->jobs->pdata[i]);
      else
        run_job_fine (pass, &cache, pass->jobs->pdata[i]);
      stage_cache_clear (&cache);
    }
  stage_cache_free (&cache);
  return NULL;
}

static void
run_pass (Pass *pass, int n_threads)
{
  guint n = (guint) MAX (1, MIN ((gint) pass->jobs->len, n_threads));
  GThread **threads = g_new0 (GThread *, n);

  pass->next = 0;
  for (guint i = 1; i < n; i++)
    threads[i] = g_thread_new ("fw-explain", pass_worker, pass);
  pass_worker (pass);
  for (guint i = 1; i < n; i++)
    g_thread_join (threads[i]);
  g_free (threads);
}

/* ---- setting up ------------------------------------------------------------------------------ */

void
fw_explain_options_init (FwExplainOptions *options)
{
  memset (options, 0, sizeof *options);
  options->default_variants = TRUE;
}

static Dim *
find_dim (GPtrArray *dims, const char *key)
{
  for (guint i = 0; i < dims->len; i++)
    if (strcmp (((Dim *) dims->pdata[i])->key, key) == 0)
      return dims->pdata[i];
  return NULL;
}

/* Adds value (any accepted text) to key's dim, in canonical form; errors name key and value. */
static gboolean
dim_add (GPtrArray *dims, const FwParams *base, const char *key, const char *value,
         GError **error)
{
  g_autoptr (GError) local = NULL;
  g_autoptr (FwParams) p = NULL;
  g_autofree char *canon = NULL;
  Dim *d;

  p = fw_params_with (base, key, value, &local);
  if (p == NULL)
    {
      /* a value may need its companion key (fft_length below window_length) */
      g_autoptr (GPtrArray) settings = g_ptr_array_new_with_free_func (g_free);
      add_setting (settings, base, key, value);
      g_ptr_array_add (settings, NULL);
      p = fw_params_with_settings (base, (const char *const *) settings->pdata, NULL);
    }
  if (p == NULL)
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_SEARCH,
                   _("Candidate %s=%s: %s"), key, value, local ? local->message : "");
      return FALSE;
    }
  canon = fw_params_get_value (p, key);
  d = find_dim (dims, key);
  if (d == NULL)
    {
      d = g_new0 (Dim, 1);
      d->key = g_strdup (key);
      d->values = g_ptr_array_new_with_free_func (g_free);
      d->level = (Level) key_level (key);
      d->coarse = level_is_coarse (d->level, key);
      g_ptr_array_add (d->values, fw_params_get_value (base, key));
      g_ptr_array_add (dims, d);
    }
  for (guint i = 0; i < d->values->len; i++)
    if (strcmp (d->values->pdata[i], canon) == 0)
      return TRUE;
  g_ptr_array_add (d->values, g_steal_pointer (&canon));
  return TRUE;
}

static gboolean
build_dims (Search *s, const FwExplainOptions *opt, GPtrArray *notes, GError **error)
{
  static const char *const defaults[][4] = {
    { "spectrum", "power", "magnitude", NULL },
    { "mel_scale", "htk", "slaney", NULL },
    { "mel_weights", "area", "unit", NULL },
    { "db_reference", "1.0", "max", NULL },
    { "dct_norm", "ortho", "none", NULL },
    { "centered", "true", "false", NULL },
    { "window_symmetry", "periodic", "symmetric", NULL },
    { "lifter", "0", "22", NULL },
  };

  if (opt->default_variants)
    for (gsize i = 0; i < G_N_ELEMENTS (defaults); i++)
      {
        if (!stage_uses (s->stage, (Level) key_level (defaults[i][0])))
          continue;
        for (int j = 1; defaults[i][j]; j++)
          if (!dim_add (s->dims, s->base, defaults[i][0], defaults[i][j], error))
            return FALSE;
      }
  for (gsize i = 0; opt->candidates && opt->candidates[i]; i++)
    {
      const char *item = opt->candidates[i];
      const char *eq = strchr (item, '=');
      g_autofree char *key = NULL;
      g_auto (GStrv) values = NULL;

      if (eq == NULL || eq == item || eq[1] == '\0')
        {
          g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_SEARCH,
                       _("Candidate list '%s' is not of the form KEY=VALUE,VALUE,..."), item);
          return FALSE;
        }
      key = g_strstrip (g_strndup (item, eq - item));
      if (!fw_params_is_key (key))
        {
          g_autofree char *known = g_strjoinv (", ", (char **) fw_params_keys ());
          g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_SEARCH,
                       _("Candidate list '%s': unknown key '%s' (the keys are %s)"), item, key,
                       known);
          return FALSE;
        }
      if (!stage_uses (s->stage, (Level) key_level (key)))
        {
          g_ptr_array_add (notes,
                           g_strdup_printf (_("%s does not affect %s; its candidates were "
                                              "ignored."),
                                            key, fw_feature_stage_name (s->stage, s->base)));
          continue;
        }
      values = g_strsplit (eq + 1, ",", -1);
      for (char **v = values; *v; v++)
        {
          g_strstrip (*v);
          if (**v && !dim_add (s->dims, s->base, key, *v, error))
            return FALSE;
        }
    }
  /* dims with only the base's value add nothing */
  for (guint i = s->dims->len; i-- > 0;)
    if (((Dim *) s->dims->pdata[i])->values->len < 2)
      g_ptr_array_remove_index (s->dims, i);
  return TRUE;
}

/* Adapts the base to the dump's column count where only one key can explain it. */
static FwParams *
shape_adapted_base (Search *s, FwParams *base, GPtrArray *notes)
{
  gsize want = s->dump->n_bins, have = fw_feature_n_bins (s->stage, base);
  const char *key = NULL;
  g_autofree char *value = NULL;
  g_autoptr (GPtrArray) settings = NULL;
  FwParams *p;

  if (want == have)
    return fw_params_ref (base);
  switch (s->stage)
    {
    case FW_STAGE_MEL:
    case FW_STAGE_MEL_DB:
      key = "mel_bands";
      value = g_strdup_printf ("%" G_GSIZE_FORMAT, want);
      break;
    case FW_STAGE_MFCC:
    case FW_STAGE_DELTA:
    case FW_STAGE_DELTA2:
      key = "cepstral_count";
      value = g_strdup_printf ("%" G_GSIZE_FORMAT, want);
      break;
    case FW_STAGE_SPECTRUM:
    case FW_STAGE_DB:
      if (want >= 2)
        {
          key = "fft_length";
          value = g_strdup_printf ("%" G_GSIZE_FORMAT, 2 * (want - 1));
        }
      break;
    default:
      break;
    }
  if (s->dump_file && s->dump->n_frames == have && s->dump->n_bins != have)
    {
      /* looks transposed: adapting keys to it would only mislead */
      s->looks_transposed = TRUE;
      g_ptr_array_add (notes, g_strdup_printf (_("The dump has %zu frames, the "
                                                 "number of bins expected here: is its axis "
                                                 "order the other way round? Then declare it "
                                                 "(frames-bins or bins-frames)."),
                                               s->dump->n_frames));
      return fw_params_ref (base);
    }
  if (key == NULL)
    return fw_params_ref (base);
  settings = g_ptr_array_new_with_free_func (g_free);
  add_setting (settings, base, key, value);
  g_ptr_array_add (settings, NULL);
  p = fw_params_with_settings (base, (const char *const *) settings->pdata, NULL);
  if (p == NULL)
    return fw_params_ref (base);
  g_ptr_array_add (notes, g_strdup_printf (_("The dump has %zu columns where the "
                                             "base set gives %zu: searched with "
                                             "%s=%s."),
                                           want, have, key, value));
  return p;
}

/* When the dump has no frame times and a very different frame count, also try the hop that
 * would give it. */
static void
add_hop_guess (Search *s, GPtrArray *notes)
{
  FwAudio *audio = audio_for (s, s->base);
  g_autofree char *hop_text = fw_params_get_value (s->base, "hop_length");
  g_autofree char *fft_text = fw_params_get_value (s->base, "fft_length");
  gsize hop = (gsize) g_ascii_strtoull (hop_text, NULL, 10);
  gsize fft = (gsize) g_ascii_strtoull (fft_text, NULL, 10);
  gsize frames, guess;
  g_autofree char *value = NULL;

  if (audio == NULL || s->looks_transposed || (s->dump_file && s->dump_file->has_times)
      || find_dim (s->dims, "hop_length")
      || s->dump->n_frames < 2 || hop == 0)
    return;
  frames = fw_frame_count (audio->n_samples, fft, hop, TRUE);
  if ((gsize) labs ((long) frames - (long) s->dump->n_frames) <= 2 + fft / hop)
    return;
  guess = (gsize) lround ((double) audio->n_samples / (double) (s->dump->n_frames - 1));
  if (guess < 1)
    return;
  value = g_strdup_printf ("%" G_GSIZE_FORMAT, guess);
  if (dim_add (s->dims, s->base, "hop_length", value, NULL))
    {
      /* a power of two near the guess too, the most common choice */
      gsize p2 = 1;
      while (p2 * 2 <= guess)
        p2 *= 2;
      if (guess - p2 > p2 * 2 - guess)
        p2 *= 2;
      if (p2 != guess)
        {
          g_autofree char *v2 = g_strdup_printf ("%" G_GSIZE_FORMAT, p2);
          dim_add (s->dims, s->base, "hop_length", v2, NULL);
        }
      g_ptr_array_add (notes, g_strdup_printf (_("The dump has %zu frames where "
                                                 "the base set gives %zu: also "
                                                 "tried hop_length near %s."),
                                               s->dump->n_frames, frames, value));
    }
}

static gboolean
load_audio_variants (Search *s, GError **error)
{
  Dim *rate = find_dim (s->dims, "sample_rate"), *chan = find_dim (s->dims, "channel");
  guint nr = rate ? rate->values->len : 1, nc = chan ? chan->values->len : 1;

  for (guint i = 0; i < nr; i++)
    for (guint j = 0; j < nc; j++)
      {
        g_autoptr (GPtrArray) settings = g_ptr_array_new_with_free_func (g_free);
        g_autoptr (FwParams) p = NULL;
        FwAudio *audio;
        g_autoptr (GError) local = NULL;
        char *key;

        if (rate)
          g_ptr_array_add (settings, g_strdup_printf ("sample_rate=%s",
                                                      (char *) rate->values->pdata[i]));
        if (chan)
          g_ptr_array_add (settings, g_strdup_printf ("channel=%s",
                                                      (char *) chan->values->pdata[j]));
        g_ptr_array_add (settings, NULL);
        p = fw_params_with_settings (s->base, (const char *const *) settings->pdata, NULL);
        if (p == NULL)
          continue;
        key = g_strdup_printf ("%d|%d", fw_params_get_sample_rate (p), fw_params_get_channel (p));
        if (g_hash_table_contains (s->audio, key))
          {
            g_free (key);
            continue;
          }
        audio = _fw_compare_operand_audio_for (s->clip_op, p, s->cancellable, &local);
        if (audio == NULL)
          {
            g_free (key);
            if (i == 0 && j == 0)
              {
                g_propagate_error (error, g_steal_pointer (&local));
                return FALSE;
              }
            note_invalid (s, local->message);
            continue;
          }
        g_hash_table_insert (s->audio, key, audio);
      }
  return TRUE;
}

/* ---- results --------------------------------------------------------------------------------- */

static void
candidate_free (FwExplainCandidate *c)
{
  fw_params_unref (c->params);
  g_strfreev (c->changed_keys);
  g_free (c);
}

static FwExplainCandidate *
candidate_new (const FwParams *base, Scored *e)
{
  FwExplainCandidate *c = g_new0 (FwExplainCandidate, 1);
  c->params = fw_params_ref (e->params);
  c->relative_rms = e->relative;
  c->changed_keys = fw_params_diff_keys (base, e->params);
  return c;
}

void
fw_explain_result_free (FwExplainResult *r)
{
  if (r == NULL)
    return;
  if (r->base)
    fw_params_unref (r->base);
  if (r->params)
    fw_params_unref (r->params);
  g_strfreev (r->changed_keys);
  if (r->equivalent)
    g_ptr_array_unref (r->equivalent);
  if (r->runners_up)
    g_ptr_array_unref (r->runners_up);
  if (r->notes)
    g_ptr_array_unref (r->notes);
  fw_compare_result_free (r->comparison);
  g_free (r);
}

static int
scored_cmp (gconstpointer pa, gconstpointer pb)
{
  const Scored *a = *(Scored *const *) pa, *b = *(Scored *const *) pb;

  if (a->bins_match != b->bins_match)
    return a->bins_match ? -1 : 1;
  if (a->relative != b->relative)
    return a->relative < b->relative ? -1 : 1;
  if (a->n_changed != b->n_changed)
    return a->n_changed < b->n_changed ? -1 : 1;
  return strcmp (fw_params_get_hash (a->params), fw_params_get_hash (b->params));
}

static int
coarse_cmp (gconstpointer pa, gconstpointer pb)
{
  const Scored *a = *(Scored *const *) pa, *b = *(Scored *const *) pb;

  if (a->bins_match != b->bins_match)
    return a->bins_match ? -1 : 1;
  if (a->affine != b->affine)
    return a->affine < b->affine ? -1 : 1;
  return scored_cmp (pa, pb);
}

#define FINE_STARTS 3

FwExplainResult *
fw_compare_explain (FwCompareOperand *dump_op, FwCompareOperand *clip_op,
                    const FwExplainOptions *options, GCancellable *cancellable, GError **error)
{
  FwExplainOptions defaults;
  g_autoptr (FwExplainResult) r = NULL;
  g_autoptr (GPtrArray) dims = g_ptr_array_new_with_free_func ((GDestroyNotify) dim_free);
  g_autoptr (GPtrArray) jobs = g_ptr_array_new_with_free_func ((GDestroyNotify) fw_params_unref);
  g_autoptr (FwCmpMatrix) dump = NULL;
  g_autoptr (FwCmpMatrix) best_m = NULL;
  g_autoptr (FwAudio) best_audio = NULL;
  g_autofree guint *idx = NULL;
  Dim **framing_dims, **coarse_dims, **fine_dims;
  guint n_framing = 0, n_coarse = 0, n_fine = 0;
  Search s;
  Pass pass;
  gint64 t0 = g_get_monotonic_time ();
  int n_threads;
  Scored *best;

  g_return_val_if_fail (dump_op != NULL && clip_op != NULL, NULL);
  if (options == NULL)
    {
      fw_explain_options_init (&defaults);
      options = &defaults;
    }
  if (clip_op->params == NULL
      || (clip_op->kind != FW_COMPARE_OP_CLIP && clip_op->kind != FW_COMPARE_OP_AUDIO))
    {
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_OPERAND,
                   _("The convention finder needs a clip with a parameter set (%s)"),
                   clip_op->label);
      return NULL;
    }
  dump = fw_compare_operand_get_matrix (dump_op, cancellable, error);
  if (dump == NULL)
    return NULL;

  r = g_new0 (FwExplainResult, 1);
  r->notes = g_ptr_array_new_with_free_func (g_free);
  r->equivalent = g_ptr_array_new_with_free_func ((GDestroyNotify) candidate_free);
  r->runners_up = g_ptr_array_new_with_free_func ((GDestroyNotify) candidate_free);
  r->base = fw_params_ref (clip_op->params);

  memset (&s, 0, sizeof s);
  s.clip_op = clip_op;
  s.dump = dump;
  s.dump_file = _fw_compare_operand_file (dump_op);
  s.stage = clip_op->stage;
  s.dims = dims;
  s.audio = g_hash_table_new_full (g_str_hash, g_str_equal, g_free,
                                   (GDestroyNotify) fw_audio_unref);
  s.scored = g_ptr_array_new_with_free_func ((GDestroyNotify) scored_free);
  s.seen = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);
  s.cancellable = cancellable;
  s.progress = options->progress;
  s.user_data = options->user_data;
  g_mutex_init (&s.lock);
  s.base = shape_adapted_base (&s, clip_op->params, r->notes);

  if (!build_dims (&s, options, r->notes, error) || !load_audio_variants (&s, error))
    goto fail;
  add_hop_guess (&s, r->notes);

  /* split the dims */
  framing_dims = g_newa (Dim *, dims->len + 1);
  coarse_dims = g_newa (Dim *, dims->len + 1);
  fine_dims = g_newa (Dim *, dims->len + 1);
  for (guint i = 0; i < dims->len; i++)
    {
      Dim *d = dims->pdata[i];
      if (d->level == LV_SIGNAL)
        framing_dims[n_framing++] = d;
      else if (d->coarse)
        coarse_dims[n_coarse++] = d;
      else
        fine_dims[n_fine++] = d;
    }

  /* framing variants */
  idx = g_new0 (guint, n_framing + 1);
  do
    {
      FwParams *p = params_for (s.base, framing_dims, idx, n_framing, NULL);
      if (p)
        g_ptr_array_add (jobs, p);
    }
  while (next_combo (idx, framing_dims, n_framing));
  {
    guint64 inner = 1, fine = 1;
    for (guint i = 0; i < n_coarse; i++)
      inner *= coarse_dims[i]->values->len;
    for (guint i = 0; i < n_fine; i++)
      fine *= fine_dims[i]->values->len;
    s.expected = (guint) MIN ((guint64) G_MAXUINT,
                              jobs->len * inner + FINE_STARTS * MIN (fine, (guint64) 256));
  }
  n_threads = options->n_threads > 0 ? options->n_threads : _fw_compare_n_workers ();

  /* coarse pass */
  memset (&pass, 0, sizeof pass);
  pass.s = &s;
  pass.jobs = jobs;
  pass.inner = coarse_dims;
  pass.n_inner = n_coarse;
  pass.coarse = TRUE;
  run_pass (&pass, n_threads);
  if (g_atomic_int_get (&s.cancelled))
    goto cancelled;
  if (s.scored->len == 0)
    {
      g_autofree char *hints = NULL;
      g_ptr_array_add (r->notes, NULL);
      hints = g_strjoinv (" ", (char **) r->notes->pdata);
      g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_SEARCH,
                   _("No candidate parameter set could be computed for %s: %s %s"),
                   clip_op->label, s.first_problem ? s.first_problem : _("nothing to search"),
                   hints);
      goto fail;
    }

  /* fine pass from the best coarse combinations */
  if (n_fine > 0)
    {
      g_autoptr (GPtrArray) order = g_ptr_array_new ();
      g_autoptr (GPtrArray) starts =
        g_ptr_array_new_with_free_func ((GDestroyNotify) fw_params_unref);
      for (guint i = 0; i < s.scored->len; i++)
        g_ptr_array_add (order, s.scored->pdata[i]);
      g_ptr_array_sort (order, coarse_cmp);
      for (guint i = 0; i < order->len && starts->len < FINE_STARTS; i++)
        g_ptr_array_add (starts, fw_params_ref (((Scored *) order->pdata[i])->params));
      memset (&pass, 0, sizeof pass);
      pass.s = &s;
      pass.jobs = starts;
      pass.inner = fine_dims;
      pass.n_inner = n_fine;
      pass.coarse = FALSE;
      run_pass (&pass, n_threads);
      if (g_atomic_int_get (&s.cancelled))
        goto cancelled;
    }

  /* choose */
  g_ptr_array_sort (s.scored, scored_cmp);
  best = s.scored->pdata[0];
  {
    double limit = best->relative * 1.01 + 1e-6;
    guint best_i = 0;
    for (guint i = 1; i < s.scored->len; i++)
      {
        Scored *e = s.scored->pdata[i];
        if (e->bins_match != best->bins_match || e->relative > limit)
          break;
        if (e->n_changed < ((Scored *) s.scored->pdata[best_i])->n_changed)
          best_i = i;
      }
    best = s.scored->pdata[best_i];
    for (guint i = 0; i < s.scored->len; i++)
      {
        Scored *e = s.scored->pdata[i];
        if (i == best_i)
          continue;
        if (e->bins_match == best->bins_match && e->relative <= limit)
          {
            if (r->equivalent->len < 8)
              g_ptr_array_add (r->equivalent, candidate_new (r->base, e));
          }
        else if (r->runners_up->len < 5)
          g_ptr_array_add (r->runners_up, candidate_new (r->base, e));
      }
  }
  r->params = fw_params_ref (best->params);
  r->changed_keys = fw_params_diff_keys (r->base, best->params);
  r->relative_rms = best->relative;
  r->base_relative_rms = NAN;
  for (guint i = 0; i < s.scored->len; i++)
    if (fw_params_equal (((Scored *) s.scored->pdata[i])->params, s.base))
      r->base_relative_rms = ((Scored *) s.scored->pdata[i])->relative;
  r->n_evaluated = s.n_evaluated;
  r->n_spectra = s.n_spectra;
  if (s.n_invalid > 0)
    g_ptr_array_add (r->notes,
                     g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                                   "%u candidate set was skipped "
                                                   "(for example: %s).",
                                                   "%u candidate sets were skipped "
                                                   "(for example: %s).",
                                                   s.n_invalid),
                                      s.n_invalid, s.first_problem));

  /* the full comparison with the winner, computed as the pipeline computes it */
  best_audio = _fw_compare_operand_audio_for (clip_op, r->params, cancellable, error);
  if (best_audio == NULL)
    goto fail;
  best_m = fw_feature_compute (best_audio, r->params, s.stage, _fw_compare_n_workers (), NULL,
                               NULL, cancellable, error);
  if (best_m == NULL)
    goto fail;
  {
    g_autofree char *label = g_strdup_printf (_("%s with the best match"), clip_op->label);
    r->comparison = _fw_compare_matrices (dump, best_m, s.dump_file, NULL, dump_op->label, label,
                                          s.stage, r->params, NULL, error);
  }
  if (r->comparison == NULL)
    goto fail;
  r->residual_rms = r->comparison->diff->rms_diff;
  r->residual_max_abs = r->comparison->diff->max_abs_diff;
  r->seconds = (double) (g_get_monotonic_time () - t0) / 1e6;

  g_hash_table_unref (s.audio);
  g_hash_table_unref (s.seen);
  g_ptr_array_unref (s.scored);
  fw_params_unref (s.base);
  g_free (s.first_problem);
  g_mutex_clear (&s.lock);
  return g_steal_pointer (&r);

cancelled:
  g_set_error (error, FW_COMPARE_ERROR, FW_COMPARE_ERROR_CANCELLED, _("The search was cancelled"));
fail:
  g_hash_table_unref (s.audio);
  g_hash_table_unref (s.seen);
  g_ptr_array_unref (s.scored);
  fw_params_unref (s.base);
  g_free (s.first_problem);
  g_mutex_clear (&s.lock);
  return NULL;
}

/* ---- text and JSON --------------------------------------------------------------------------- */

static char *
changed_settings (const FwParams *p, char *const *keys)
{
  GString *s = g_string_new (NULL);

  for (gsize i = 0; keys && keys[i]; i++)
    {
      g_autofree char *v = fw_params_get_value (p, keys[i]);
      g_string_append_printf (s, "%s%s=%s", i ? " " : "", keys[i], v);
    }
  if (s->len == 0)
    g_string_append (s, _("(none)"));
  return g_string_free (s, FALSE);
}

char *
fw_explain_result_to_text (const FwExplainResult *r)
{
  GString *s = g_string_new (NULL);
  g_autofree char *rel = _fw_compare_fmt_g (r->relative_rms);
  g_autofree char *base_rel = _fw_compare_fmt_g (r->base_relative_rms);
  g_autofree char *rmax = _fw_compare_fmt_g (r->residual_max_abs);
  g_autofree char *changed = changed_settings (r->params, r->changed_keys);

  g_string_append_printf (s, _("Best match: relative RMS difference %s (%s), max |difference| "
                               "%s; the starting set gave %s.\n"),
                          rel,
                          r->relative_rms < FW_EXPLAIN_EXACT_RELATIVE ? _("reproduces the dump")
                                                                      : _("not an exact match"),
                          rmax, base_rel);
  g_string_append_printf (s, _("Keys changed from the starting set: %s\n"), changed);
  for (guint i = 0; i < r->equivalent->len; i++)
    {
      const FwExplainCandidate *c = r->equivalent->pdata[i];
      g_autofree char *cs = changed_settings (c->params, c->changed_keys);
      g_string_append_printf (s, _("  fits equally well: %s\n"), cs);
    }
  for (guint i = 0; i < MIN (r->runners_up->len, 3); i++)
    {
      const FwExplainCandidate *c = r->runners_up->pdata[i];
      g_autofree char *cs = changed_settings (c->params, c->changed_keys);
      g_autofree char *cr = _fw_compare_fmt_g (c->relative_rms);
      g_string_append_printf (s, _("  next: %s (relative RMS %s)\n"), cs, cr);
    }
  g_string_append_printf (s, _("Explanation (A = the dump, B = Framewise): %s\n"),
                          r->comparison->summary);
  for (guint i = 0; i < r->notes->len; i++)
    g_string_append_printf (s, "  %s\n", (const char *) r->notes->pdata[i]);
  for (guint i = 0; i < r->comparison->notes->len; i++)
    g_string_append_printf (s, "  %s\n", (const char *) r->comparison->notes->pdata[i]);
  g_string_append_printf (s, _("Searched %u parameter sets (%u spectra) in %.2f s.\n\n"),
                          r->n_evaluated, r->n_spectra, r->seconds);
  g_string_append (s, fw_params_get_text (r->params));
  return g_string_free (s, FALSE);
}

static void
json_candidates (GString *s, GPtrArray *cands)
{
  g_string_append_c (s, '[');
  for (guint i = 0; i < cands->len; i++)
    {
      const FwExplainCandidate *c = cands->pdata[i];
      g_string_append (s, i ? ", {" : "{");
      _fw_json_str (s, "relative_rms");
      g_string_append (s, ": ");
      _fw_json_num (s, c->relative_rms);
      g_string_append (s, ", ");
      _fw_json_str (s, "changed");
      g_string_append (s, ": {");
      for (gsize k = 0; c->changed_keys[k]; k++)
        {
          g_autofree char *v = fw_params_get_value (c->params, c->changed_keys[k]);
          if (k)
            g_string_append (s, ", ");
          _fw_json_str (s, c->changed_keys[k]);
          g_string_append (s, ": ");
          _fw_json_str (s, v);
        }
      g_string_append (s, "}}");
    }
  g_string_append_c (s, ']');
}

char *
fw_explain_result_to_json (const FwExplainResult *r)
{
  GString *s = g_string_new ("{\n  ");
  gboolean first = TRUE;

  _fw_json_key (s, "relative_rms", &first);
  _fw_json_num (s, r->relative_rms);
  _fw_json_key (s, "exact", &first);
  g_string_append (s, r->relative_rms < FW_EXPLAIN_EXACT_RELATIVE ? "true" : "false");
  _fw_json_key (s, "base_relative_rms", &first);
  _fw_json_num (s, r->base_relative_rms);
  _fw_json_key (s, "residual_rms", &first);
  _fw_json_num (s, r->residual_rms);
  _fw_json_key (s, "residual_max_abs", &first);
  _fw_json_num (s, r->residual_max_abs);
  _fw_json_key (s, "changed", &first);
  g_string_append_c (s, '{');
  for (gsize k = 0; r->changed_keys[k]; k++)
    {
      g_autofree char *v = fw_params_get_value (r->params, r->changed_keys[k]);
      if (k)
        g_string_append (s, ", ");
      _fw_json_str (s, r->changed_keys[k]);
      g_string_append (s, ": ");
      _fw_json_str (s, v);
    }
  g_string_append_c (s, '}');
  _fw_json_key (s, "params_text", &first);
  _fw_json_str (s, fw_params_get_text (r->params));
  _fw_json_key (s, "params_hash", &first);
  _fw_json_str (s, fw_params_get_hash (r->params));
  _fw_json_key (s, "equivalent", &first);
  json_candidates (s, r->equivalent);
  _fw_json_key (s, "runners_up", &first);
  json_candidates (s, r->runners_up);
  _fw_json_key (s, "evaluated", &first);
  g_string_append_printf (s, "%u", r->n_evaluated);
  _fw_json_key (s, "spectra", &first);
  g_string_append_printf (s, "%u", r->n_spectra);
  _fw_json_key (s, "seconds", &first);
  _fw_json_num (s, r->seconds);
  _fw_json_key (s, "search_notes", &first);
  _fw_json_strv (s, (char *const *) r->notes->pdata, r->notes->len);
  _fw_json_key (s, "comparison", &first);
  {
    gboolean f2 = TRUE;
    g_string_append (s, "{\n  ");
    _fw_compare_json_body (s, r->comparison, -1, &f2);
    g_string_append (s, "\n  }");
  }
  g_string_append (s, "\n}\n");
  return g_string_free (s, FALSE);
}
