/* fw-params.c: the analysis parameter set (immutable, reference counted, canonical text + hash).
 *
 * Defaults (issue 2; they follow common practice for music analysis at 22.05 kHz):
 *   sample_rate     22050     Hz; 0 = keep the file's rate
 *   channel         mix       mean of the channels; or a 1-based channel number
 *   pre_emphasis    0         y[n] = x[n] - a x[n-1]; 0 = off
 *   window_length   2048      samples
 *   hop_length      512       samples
 *   fft_length      = window_length (an absent fft_length follows window_length)
 *   window          hann
 *   window_symmetry periodic
 *   centered        true      pad floor(fft_length/2) samples at both ends
 *   padding         zeros
 *   spectrum        power     |X|^2 of the unscaled DFT (magnitude = |X|)
 *   mel_bands       128
 *   mel_scale       slaney
 *   fmin            0         Hz
 *   fmax            0         Hz; 0 = the Nyquist frequency of the analysis rate
 *   mel_weights     area      equal-area triangles (unit = peak 1)
 *   db_reference    1.0       or "max" (the maximum of the clip's matrix)
 *   db_floor        1e-10
 *   dynamic_range   0         dB; 0 = off
 *   cepstral_count  13        coefficients including c0
 *   dct_norm        ortho
 *   lifter          0         0 = off
 *   delta_width     2         frames each side (HTK regression)
 *
 * Canonical text: the group [framewise-parameters], then format=1, then every key in the order
 * above, one "key=value" per line, each line ending in "\n", no comments. Integers are written
 * as integers; other numbers as the shortest of printf %.15g, %.16g and %.17g (C locale) that
 * reads back to the same double; booleans as true/false; channel as mix or N; db_reference as a
 * number or max; names in lower case. The hash is the first 16 hex digits of SHA-256 of that text.
 *
 * Editing (fw_params_with, fw_params_with_settings): a new value is made, the old one stays.
 * When window_length changes and fft_length was equal to the old window_length, fft_length
 * moves with it, unless the same settings list also sets fft_length. That keeps "fft_length =
 * window_length" (the default relation) intact while an explicitly longer FFT stays put.
 */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-params.h"

G_DEFINE_QUARK (fw-params-error-quark, fw_params_error)

#define FW_PARAMS_MAX_LENGTH 1048576   /* window, hop and FFT lengths (2^20 samples) */
#define FW_PARAMS_MAX_RATE 1000000
#define FW_PARAMS_MAX_MEL_BANDS 4096
#define FW_PARAMS_MAX_DELTA_WIDTH 1000

typedef enum {
  KEY_SAMPLE_RATE,
  KEY_CHANNEL,
  KEY_PRE_EMPHASIS,
  KEY_WINDOW_LENGTH,
  KEY_HOP_LENGTH,
  KEY_FFT_LENGTH,
  KEY_WINDOW,
  KEY_WINDOW_SYMMETRY,
  KEY_CENTERED,
  KEY_PADDING,
  KEY_SPECTRUM,
  KEY_MEL_BANDS,
  KEY_MEL_SCALE,
  KEY_FMIN,
  KEY_FMAX,
  KEY_MEL_WEIGHTS,
  KEY_DB_REFERENCE,
  KEY_DB_FLOOR,
  KEY_DYNAMIC_RANGE,
  KEY_CEPSTRAL_COUNT,
  KEY_DCT_NORM,
  KEY_LIFTER,
  KEY_DELTA_WIDTH,
  N_KEYS
} FwParamsKey;

static const char *const key_names[N_KEYS + 1] = {
  "sample_rate", "channel", "pre_emphasis", "window_length", "hop_length", "fft_length",
  "window", "window_symmetry", "centered", "padding", "spectrum", "mel_bands", "mel_scale",
  "fmin", "fmax", "mel_weights", "db_reference", "db_floor", "dynamic_range",
  "cepstral_count", "dct_norm", "lifter", "delta_width", NULL
};

static const char *const key_allowed[N_KEYS] = {
  N_("0 (keep the file's rate) or an integer from 1 to 1000000 (Hz)"),
  N_("mix (the mean of the channels) or a channel number from 1"),
  N_("a number from 0 (off) up to but not including 1"),
  N_("an integer from 1 to 1048576 (samples)"),
  N_("an integer from 1 to 1048576 (samples)"),
  N_("an integer from window_length to 1048576 (samples); when absent it equals window_length"),
  N_("one of rectangular, hann, hamming, blackman"),
  N_("periodic or symmetric"),
  N_("true or false"),
  N_("one of zeros, reflect, edge"),
  N_("power or magnitude"),
  N_("an integer from 1 to 4096"),
  N_("htk or slaney"),
  N_("a number of Hz, 0 or more"),
  N_("a number of Hz above 0, or 0 for the Nyquist frequency"),
  N_("area (equal-area triangles) or unit (peak 1)"),
  N_("a number above 0, or max (the maximum of the clip's matrix)"),
  N_("a number above 0"),
  N_("a number of dB, 0 (off) or more"),
  N_("an integer from 1 to mel_bands"),
  N_("ortho or none"),
  N_("a number, 0 (off) or more"),
  N_("an integer from 1 to 1000 (frames)"),
};

/* Text names of the enumerated keys, indexed by the dsp enum values. */
static const char *const window_names[] = { "rectangular", "hann", "hamming", "blackman", NULL };
static const char *const symmetry_names[] = { "periodic", "symmetric", NULL };
static const char *const padding_names[] = { "zeros", "reflect", "edge", NULL };
static const char *const spectrum_names[] = { "power", "magnitude", NULL };
static const char *const mel_scale_names[] = { "htk", "slaney", NULL };
static const char *const mel_weights_names[] = { "area", "unit", NULL };
static const char *const dct_norm_names[] = { "ortho", "none", NULL };

G_STATIC_ASSERT (FW_WINDOW_RECTANGULAR == 0 && FW_WINDOW_HANN == 1 && FW_WINDOW_HAMMING == 2 &&
                 FW_WINDOW_BLACKMAN == 3);
G_STATIC_ASSERT (FW_WINDOW_PERIODIC == 0 && FW_WINDOW_SYMMETRIC == 1);
G_STATIC_ASSERT (FW_PADDING_ZEROS == 0 && FW_PADDING_REFLECT == 1 && FW_PADDING_EDGE == 2);
G_STATIC_ASSERT (FW_SPECTRUM_POWER == 0 && FW_SPECTRUM_MAGNITUDE == 1);
G_STATIC_ASSERT (FW_MEL_SCALE_HTK == 0 && FW_MEL_SCALE_SLANEY == 1);
G_STATIC_ASSERT (FW_MEL_WEIGHTS_AREA == 0 && FW_MEL_WEIGHTS_UNIT == 1);
G_STATIC_ASSERT (FW_DCT_NORM_ORTHO == 0 && FW_DCT_NORM_NONE == 1);

typedef struct {
  int sample_rate;
  int channel;               /* 0 = mix */
  double pre_emphasis;
  int window_length;
  int hop_length;
  int fft_length;
  int window;                /* FwWindowKind */
  int window_symmetry;       /* FwWindowSymmetry */
  gboolean centered;
  int padding;               /* FwPadding */
  int spectrum;              /* FwSpectrumKind */
  int mel_bands;
  int mel_scale;             /* FwMelScale */
  double fmin;
  double fmax;               /* 0 = Nyquist */
  int mel_weights;           /* FwMelWeights */
  gboolean db_reference_max;
  double db_reference;
  double db_floor;
  double dynamic_range;
  int cepstral_count;
  int dct_norm;              /* FwDctNorm */
  double lifter;
  int delta_width;
} FwParamsValues;

struct _FwParams {
  gint ref_count;
  FwParamsValues v;
  char *text;
  char hash[17];
};

G_DEFINE_BOXED_TYPE (FwParams, fw_params, fw_params_ref, fw_params_unref)

static void
values_set_defaults (FwParamsValues *v)
{
  memset (v, 0, sizeof *v);
  v->sample_rate = 22050;
  v->channel = 0;
  v->pre_emphasis = 0.0;
  v->window_length = 2048;
  v->hop_length = 512;
  v->fft_length = 2048;
  v->window = FW_WINDOW_HANN;
  v->window_symmetry = FW_WINDOW_PERIODIC;
  v->centered = TRUE;
  v->padding = FW_PADDING_ZEROS;
  v->spectrum = FW_SPECTRUM_POWER;
  v->mel_bands = 128;
  v->mel_scale = FW_MEL_SCALE_SLANEY;
  v->fmin = 0.0;
  v->fmax = 0.0;
  v->mel_weights = FW_MEL_WEIGHTS_AREA;
  v->db_reference_max = FALSE;
  v->db_reference = 1.0;
  v->db_floor = 1e-10;
  v->dynamic_range = 0.0;
  v->cepstral_count = 13;
  v->dct_norm = FW_DCT_NORM_ORTHO;
  v->lifter = 0.0;
  v->delta_width = 2;
}

/* ---- number formatting ------------------------------------------------------------------ */

/**
 * fw_params_format_double:
 * The canonical text of a double: the shortest of %.15g, %.16g and %.17g (C locale) that reads
 * back to the same value; -0 is written as 0. buf must hold G_ASCII_DTOSTR_BUF_SIZE bytes.
 */
const char *
fw_params_format_double (double value, char *buf)
{
  static const char *const formats[] = { "%.15g", "%.16g", "%.17g" };

  if (value == 0.0)
    value = 0.0; /* turns -0 into 0 */
  for (gsize i = 0; i < G_N_ELEMENTS (formats); i++)
    {
      g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, formats[i], value);
      if (g_ascii_strtod (buf, NULL) == value)
        break;
    }
  return buf;
}

static char *
value_text (const FwParamsValues *v, FwParamsKey key)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  switch (key)
    {
    case KEY_SAMPLE_RATE:
      return g_strdup_printf ("%d", v->sample_rate);
    case KEY_CHANNEL:
      return v->channel == 0 ? g_strdup ("mix") : g_strdup_printf ("%d", v->channel);
    case KEY_PRE_EMPHASIS:
      return g_strdup (fw_params_format_double (v->pre_emphasis, buf));
    case KEY_WINDOW_LENGTH:
      return g_strdup_printf ("%d", v->window_length);
    case KEY_HOP_LENGTH:
      return g_strdup_printf ("%d", v->hop_length);
    case KEY_FFT_LENGTH:
      return g_strdup_printf ("%d", v->fft_length);
    case KEY_WINDOW:
      return g_strdup (window_names[v->window]);
    case KEY_WINDOW_SYMMETRY:
      return g_strdup (symmetry_names[v->window_symmetry]);
    case KEY_CENTERED:
      return g_strdup (v->centered ? "true" : "false");
    case KEY_PADDING:
      return g_strdup (padding_names[v->padding]);
    case KEY_SPECTRUM:
      return g_strdup (spectrum_names[v->spectrum]);
    case KEY_MEL_BANDS:
      return g_strdup_printf ("%d", v->mel_bands);
    case KEY_MEL_SCALE:
      return g_strdup (mel_scale_names[v->mel_scale]);
    case KEY_FMIN:
      return g_strdup (fw_params_format_double (v->fmin, buf));
    case KEY_FMAX:
      return g_strdup (fw_params_format_double (v->fmax, buf));
    case KEY_MEL_WEIGHTS:
      return g_strdup (mel_weights_names[v->mel_weights]);
    case KEY_DB_REFERENCE:
      return v->db_reference_max ? g_strdup ("max")
                                 : g_strdup (fw_params_format_double (v->db_reference, buf));
    case KEY_DB_FLOOR:
      return g_strdup (fw_params_format_double (v->db_floor, buf));
    case KEY_DYNAMIC_RANGE:
      return g_strdup (fw_params_format_double (v->dynamic_range, buf));
    case KEY_CEPSTRAL_COUNT:
      return g_strdup_printf ("%d", v->cepstral_count);
    case KEY_DCT_NORM:
      return g_strdup (dct_norm_names[v->dct_norm]);
    case KEY_LIFTER:
      return g_strdup (fw_params_format_double (v->lifter, buf));
    case KEY_DELTA_WIDTH:
      return g_strdup_printf ("%d", v->delta_width);
    case N_KEYS:
    default:
      break;
    }
  g_assert_not_reached ();
  return NULL;
}

static FwParams *
params_new_take (const FwParamsValues *v)
{
  FwParams *p = g_new0 (FwParams, 1);
  GString *s = g_string_new ("[" FW_PARAMS_GROUP "]\n");
  g_autofree char *sum = NULL;

  p->ref_count = 1;
  p->v = *v;
  g_string_append_printf (s, "format=%d\n", FW_PARAMS_FORMAT);
  for (int k = 0; k < N_KEYS; k++)
    {
      g_autofree char *t = value_text (v, (FwParamsKey) k);
      g_string_append_printf (s, "%s=%s\n", key_names[k], t);
    }
  p->text = g_string_free (s, FALSE);
  sum = g_compute_checksum_for_string (G_CHECKSUM_SHA256, p->text, -1);
  memcpy (p->hash, sum, 16);
  p->hash[16] = '\0';
  return p;
}

/* ---- parsing values --------------------------------------------------------------------- */

static int
key_index (const char *key)
{
  for (int k = 0; k < N_KEYS; k++)
    if (strcmp (key, key_names[k]) == 0)
      return k;
  return -1;
}

static gboolean
parse_int (const char *text, gint64 min, gint64 max, int *out)
{
  gint64 v;

  if (!g_ascii_string_to_signed (text, 10, min, max, &v, NULL))
    return FALSE;
  *out = (int) v;
  return TRUE;
}

static gboolean
parse_double (const char *text, double *out)
{
  char *end = NULL;
  double v;

  if (*text == '\0' || g_ascii_isspace (*text))
    return FALSE;
  v = g_ascii_strtod (text, &end);
  if (end == text || *end != '\0' || !isfinite (v))
    return FALSE;
  *out = v == 0.0 ? 0.0 : v;
  return TRUE;
}

static gboolean
parse_name (const char *text, const char *const *names, int *out)
{
  for (int i = 0; names[i] != NULL; i++)
    if (g_ascii_strcasecmp (text, names[i]) == 0)
      {
        *out = i;
        return TRUE;
      }
  return FALSE;
}

static gboolean
parse_bool (const char *text, gboolean *out)
{
  static const char *const yes[] = { "true", "yes", "on", "1", NULL };
  static const char *const no[] = { "false", "no", "off", "0", NULL };
  int i;

  if (parse_name (text, yes, &i))
    *out = TRUE;
  else if (parse_name (text, no, &i))
    *out = FALSE;
  else
    return FALSE;
  return TRUE;
}

static gboolean
bad_value (const char *key, const char *value, GError **error)
{
  g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_BAD_VALUE,
               _("bad value '%s' for %s: allowed is %s"), value, key,
               fw_params_key_allowed (key));
  return FALSE;
}

/* Sets one key from its text; the value is stripped of surrounding white space first. */
static gboolean
values_set (FwParamsValues *v, FwParamsKey key, const char *raw, GError **error)
{
  g_autofree char *value = g_strstrip (g_strdup (raw));
  const char *name = key_names[key];
  double d = 0;
  int i = 0;
  gboolean ok = FALSE;

  switch (key)
    {
    case KEY_SAMPLE_RATE:
      ok = parse_int (value, 0, FW_PARAMS_MAX_RATE, &i);
      if (ok)
        v->sample_rate = i;
      break;
    case KEY_CHANNEL:
      if (g_ascii_strcasecmp (value, "mix") == 0)
        {
          v->channel = 0;
          ok = TRUE;
        }
      else if ((ok = parse_int (value, 1, 65535, &i)))
        v->channel = i;
      break;
    case KEY_PRE_EMPHASIS:
      ok = parse_double (value, &d) && d >= 0.0 && d < 1.0;
      if (ok)
        v->pre_emphasis = d;
      break;
    case KEY_WINDOW_LENGTH:
      ok = parse_int (value, 1, FW_PARAMS_MAX_LENGTH, &i);
      if (ok)
        v->window_length = i;
      break;
    case KEY_HOP_LENGTH:
      ok = parse_int (value, 1, FW_PARAMS_MAX_LENGTH, &i);
      if (ok)
        v->hop_length = i;
      break;
    case KEY_FFT_LENGTH:
      ok = parse_int (value, 1, FW_PARAMS_MAX_LENGTH, &i);
      if (ok)
        v->fft_length = i;
      break;
    case KEY_WINDOW:
      ok = parse_name (value, window_names, &v->window);
      break;
    case KEY_WINDOW_SYMMETRY:
      ok = parse_name (value, symmetry_names, &v->window_symmetry);
      break;
    case KEY_CENTERED:
      ok = parse_bool (value, &v->centered);
      break;
    case KEY_PADDING:
      ok = parse_name (value, padding_names, &v->padding);
      break;
    case KEY_SPECTRUM:
      ok = parse_name (value, spectrum_names, &v->spectrum);
      break;
    case KEY_MEL_BANDS:
      ok = parse_int (value, 1, FW_PARAMS_MAX_MEL_BANDS, &i);
      if (ok)
        v->mel_bands = i;
      break;
    case KEY_MEL_SCALE:
      ok = parse_name (value, mel_scale_names, &v->mel_scale);
      break;
    case KEY_FMIN:
      ok = parse_double (value, &d) && d >= 0.0;
      if (ok)
        v->fmin = d;
      break;
    case KEY_FMAX:
      ok = parse_double (value, &d) && d >= 0.0;
      if (ok)
        v->fmax = d;
      break;
    case KEY_MEL_WEIGHTS:
      ok = parse_name (value, mel_weights_names, &v->mel_weights);
      break;
    case KEY_DB_REFERENCE:
      if (g_ascii_strcasecmp (value, "max") == 0)
        {
          v->db_reference_max = TRUE;
          v->db_reference = 1.0;
          ok = TRUE;
        }
      else if ((ok = parse_double (value, &d) && d > 0.0))
        {
          v->db_reference_max = FALSE;
          v->db_reference = d;
        }
      break;
    case KEY_DB_FLOOR:
      ok = parse_double (value, &d) && d > 0.0;
      if (ok)
        v->db_floor = d;
      break;
    case KEY_DYNAMIC_RANGE:
      ok = parse_double (value, &d) && d >= 0.0;
      if (ok)
        v->dynamic_range = d;
      break;
    case KEY_CEPSTRAL_COUNT:
      ok = parse_int (value, 1, FW_PARAMS_MAX_MEL_BANDS, &i);
      if (ok)
        v->cepstral_count = i;
      break;
    case KEY_DCT_NORM:
      ok = parse_name (value, dct_norm_names, &v->dct_norm);
      break;
    case KEY_LIFTER:
      ok = parse_double (value, &d) && d >= 0.0;
      if (ok)
        v->lifter = d;
      break;
    case KEY_DELTA_WIDTH:
      ok = parse_int (value, 1, FW_PARAMS_MAX_DELTA_WIDTH, &i);
      if (ok)
        v->delta_width = i;
      break;
    case N_KEYS:
    default:
      g_assert_not_reached ();
    }

  if (!ok)
    return bad_value (name, value, error);
  return TRUE;
}

/* Relations between keys that hold whatever the clip: fft_length >= window_length. */
static gboolean
values_check_relations (const FwParamsValues *v, GError **error)
{
  if (v->fft_length < v->window_length)
    {
      g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID,
                   _("fft_length %d is shorter than window_length %d: the FFT must hold the "
                     "whole window; set fft_length to %d or more"),
                   v->fft_length, v->window_length, v->window_length);
      return FALSE;
    }
  return TRUE;
}

/* Levenshtein distance, for "did you mean" hints on unknown keys. */
static guint
edit_distance (const char *a, const char *b)
{
  gsize la = strlen (a), lb = strlen (b);
  g_autofree guint *row = g_new (guint, lb + 1);

  for (gsize j = 0; j <= lb; j++)
    row[j] = (guint) j;
  for (gsize i = 1; i <= la; i++)
    {
      guint diag = row[0];
      row[0] = (guint) i;
      for (gsize j = 1; j <= lb; j++)
        {
          guint up = row[j];
          guint cost = a[i - 1] == b[j - 1] ? 0 : 1;
          row[j] = MIN (MIN (row[j] + 1, row[j - 1] + 1), diag + cost);
          diag = up;
        }
    }
  return row[lb];
}

static void
unknown_key (const char *key, GError **error)
{
  g_autofree char *known = g_strjoinv (", ", (char **) key_names);
  const char *best = NULL;
  guint best_d = G_MAXUINT;

  for (int k = 0; k < N_KEYS; k++)
    {
      guint d = edit_distance (key, key_names[k]);
      if (d < best_d)
        {
          best_d = d;
          best = key_names[k];
        }
    }
  if (best != NULL && best_d <= 3)
    g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_UNKNOWN_KEY,
                 _("unknown key '%s' (did you mean %s?); the keys are %s"), key, best, known);
  else
    g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_UNKNOWN_KEY,
                 _("unknown key '%s'; the keys are %s"), key, known);
}

/* ---- construction ----------------------------------------------------------------------- */

FwParams *
fw_params_new_default (void)
{
  FwParamsValues v;

  values_set_defaults (&v);
  return params_new_take (&v);
}

FwParams *
fw_params_new_from_text (const char *text, gssize length, GError **error)
{
  g_autoptr (GKeyFile) kf = g_key_file_new ();
  g_autoptr (GError) local = NULL;
  g_auto (GStrv) groups = NULL;
  g_auto (GStrv) keys = NULL;
  g_autofree char *format = NULL;
  FwParamsValues v;
  gboolean has_fft = FALSE;

  g_return_val_if_fail (text != NULL, NULL);

  if (length < 0)
    length = (gssize) strlen (text);
  if (!g_key_file_load_from_data (kf, text, (gsize) length, G_KEY_FILE_NONE, &local))
    {
      g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_PARSE,
                   _("not a parameter file: %s"), local->message);
      return NULL;
    }

  groups = g_key_file_get_groups (kf, NULL);
  for (gsize i = 0; groups[i] != NULL; i++)
    if (strcmp (groups[i], FW_PARAMS_GROUP) != 0)
      {
        g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_PARSE,
                     _("unknown group [%s]: a parameter file has one group, [%s]"),
                     groups[i], FW_PARAMS_GROUP);
        return NULL;
      }
  if (!g_key_file_has_group (kf, FW_PARAMS_GROUP))
    {
      g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_PARSE,
                   _("not a parameter file: the group [%s] is missing"), FW_PARAMS_GROUP);
      return NULL;
    }

  /* The format version first: a newer file may use keys this build does not know. */
  format = g_key_file_get_value (kf, FW_PARAMS_GROUP, "format", NULL);
  if (format != NULL)
    {
      int f = 0;
      g_strstrip (format);
      if (!parse_int (format, 1, G_MAXINT, &f))
        {
          g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_BAD_VALUE,
                       _("bad value '%s' for format: allowed is an integer from 1"), format);
          return NULL;
        }
      if (f > FW_PARAMS_FORMAT)
        {
          g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_FORMAT,
                       _("parameter format %d is newer than this version of Framewise reads "
                         "(format %d); update Framewise to open it"),
                       f, FW_PARAMS_FORMAT);
          return NULL;
        }
    }

  keys = g_key_file_get_keys (kf, FW_PARAMS_GROUP, NULL, NULL);
  for (gsize i = 0; keys != NULL && keys[i] != NULL; i++)
    if (strcmp (keys[i], "format") != 0 && key_index (keys[i]) < 0)
      {
        unknown_key (keys[i], error);
        return NULL;
      }

  values_set_defaults (&v);
  for (int k = 0; k < N_KEYS; k++)
    {
      g_autofree char *value = g_key_file_get_value (kf, FW_PARAMS_GROUP, key_names[k], NULL);
      if (value == NULL)
        continue;
      if (!values_set (&v, (FwParamsKey) k, value, error))
        return NULL;
      if (k == KEY_FFT_LENGTH)
        has_fft = TRUE;
    }
  if (!has_fft)
    v.fft_length = v.window_length;
  if (!values_check_relations (&v, error))
    return NULL;

  return params_new_take (&v);
}

FwParams *
fw_params_new_from_file (const char *path, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length = 0;
  g_autoptr (GError) local = NULL;
  FwParams *p;

  g_return_val_if_fail (path != NULL, NULL);

  if (!g_file_get_contents (path, &contents, &length, &local))
    {
      g_set_error (error, local->domain, local->code, "%s", local->message);
      return NULL;
    }
  p = fw_params_new_from_text (contents, (gssize) length, &local);
  if (p == NULL)
    {
      g_set_error (error, local->domain, local->code, "%s: %s", path, local->message);
      return NULL;
    }
  return p;
}

static gboolean
apply_setting (FwParamsValues *v, const char *key, const char *value, gboolean fft_set_in_list,
               GError **error)
{
  int k = key_index (key);

  if (k < 0)
    {
      unknown_key (key, error);
      return FALSE;
    }
  if (k == KEY_WINDOW_LENGTH)
    {
      int old_window = v->window_length;
      if (!values_set (v, KEY_WINDOW_LENGTH, value, error))
        return FALSE;
      if (!fft_set_in_list && v->fft_length == old_window)
        v->fft_length = v->window_length;
      return TRUE;
    }
  return values_set (v, (FwParamsKey) k, value, error);
}

FwParams *
fw_params_with (const FwParams *base, const char *key, const char *value, GError **error)
{
  FwParamsValues v;

  g_return_val_if_fail (base != NULL, NULL);
  g_return_val_if_fail (key != NULL, NULL);
  g_return_val_if_fail (value != NULL, NULL);

  v = base->v;
  if (!apply_setting (&v, key, value, strcmp (key, "fft_length") == 0, error))
    return NULL;
  if (!values_check_relations (&v, error))
    return NULL;
  return params_new_take (&v);
}

FwParams *
fw_params_with_settings (const FwParams *base, const char *const *settings, GError **error)
{
  FwParamsValues v;
  gboolean fft_in_list = FALSE;

  g_return_val_if_fail (base != NULL, NULL);

  for (gsize i = 0; settings != NULL && settings[i] != NULL; i++)
    {
      const char *eq = strchr (settings[i], '=');
      if (eq != NULL)
        {
          g_autofree char *key = g_strstrip (g_strndup (settings[i], (gsize) (eq - settings[i])));
          if (strcmp (key, "fft_length") == 0)
            fft_in_list = TRUE;
        }
    }

  v = base->v;
  for (gsize i = 0; settings != NULL && settings[i] != NULL; i++)
    {
      const char *eq = strchr (settings[i], '=');
      g_autofree char *key = NULL;

      if (eq == NULL)
        {
          g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_PARSE,
                       _("setting '%s' is not of the form KEY=VALUE"), settings[i]);
          return NULL;
        }
      key = g_strstrip (g_strndup (settings[i], (gsize) (eq - settings[i])));
      if (!apply_setting (&v, key, eq + 1, fft_in_list, error))
        return NULL;
    }
  if (!values_check_relations (&v, error))
    return NULL;
  return params_new_take (&v);
}

FwParams *
fw_params_ref (FwParams *params)
{
  g_return_val_if_fail (params != NULL, NULL);
  g_atomic_int_inc (&params->ref_count);
  return params;
}

void
fw_params_unref (FwParams *params)
{
  if (params == NULL)
    return;
  if (g_atomic_int_dec_and_test (&params->ref_count))
    {
      g_free (params->text);
      g_free (params);
    }
}

const char *
fw_params_get_text (const FwParams *params)
{
  g_return_val_if_fail (params != NULL, NULL);
  return params->text;
}

gboolean
fw_params_save (const FwParams *params, const char *path, GError **error)
{
  g_return_val_if_fail (params != NULL, FALSE);
  g_return_val_if_fail (path != NULL, FALSE);
  /* g_file_set_contents writes a temporary file and renames it over path. */
  return g_file_set_contents (path, params->text, -1, error);
}

const char *
fw_params_get_hash (const FwParams *params)
{
  g_return_val_if_fail (params != NULL, NULL);
  return params->hash;
}

gboolean
fw_params_equal (const FwParams *a, const FwParams *b)
{
  if (a == b)
    return TRUE;
  if (a == NULL || b == NULL)
    return FALSE;
  return strcmp (a->text, b->text) == 0;
}

const char *const *
fw_params_keys (void)
{
  return key_names;
}

gboolean
fw_params_is_key (const char *key)
{
  return key != NULL && key_index (key) >= 0;
}

char *
fw_params_get_value (const FwParams *params, const char *key)
{
  int k;

  g_return_val_if_fail (params != NULL, NULL);
  g_return_val_if_fail (key != NULL, NULL);
  k = key_index (key);
  if (k < 0)
    return NULL;
  return value_text (&params->v, (FwParamsKey) k);
}

const char *
fw_params_key_allowed (const char *key)
{
  int k = key != NULL ? key_index (key) : -1;

  if (k < 0)
    return NULL;
  return _(key_allowed[k]);
}

const char *
fw_params_key_unit (const char *key)
{
  int k = key != NULL ? key_index (key) : -1;

  switch (k)
    {
    case KEY_SAMPLE_RATE:
    case KEY_FMIN:
    case KEY_FMAX:
      return "Hz";
    case KEY_WINDOW_LENGTH:
    case KEY_HOP_LENGTH:
    case KEY_FFT_LENGTH:
      return _("samples");
    case KEY_DYNAMIC_RANGE:
      return "dB";
    case KEY_DELTA_WIDTH:
      return _("frames");
    default:
      return NULL;
    }
}

GStrv
fw_params_diff_keys (const FwParams *a, const FwParams *b)
{
  GPtrArray *out = g_ptr_array_new ();

  g_return_val_if_fail (a != NULL && b != NULL, NULL);
  for (int k = 0; k < N_KEYS; k++)
    {
      g_autofree char *ta = value_text (&a->v, (FwParamsKey) k);
      g_autofree char *tb = value_text (&b->v, (FwParamsKey) k);
      if (strcmp (ta, tb) != 0)
        g_ptr_array_add (out, g_strdup (key_names[k]));
    }
  g_ptr_array_add (out, NULL);
  return (GStrv) g_ptr_array_free (out, FALSE);
}

int
fw_params_get_sample_rate (const FwParams *params)
{
  g_return_val_if_fail (params != NULL, 0);
  return params->v.sample_rate;
}

int
fw_params_get_channel (const FwParams *params)
{
  g_return_val_if_fail (params != NULL, 0);
  return params->v.channel;
}

void
fw_params_fill_config (const FwParams *params, double analysis_rate, FwAnalysisConfig *cfg)
{
  const FwParamsValues *v;

  g_return_if_fail (params != NULL);
  g_return_if_fail (cfg != NULL);
  v = &params->v;

  if (analysis_rate <= 0)
    analysis_rate = v->sample_rate;
  memset (cfg, 0, sizeof *cfg);
  cfg->sample_rate = analysis_rate;
  cfg->pre_emphasis = v->pre_emphasis;
  cfg->window_length = (size_t) v->window_length;
  cfg->hop_length = (size_t) v->hop_length;
  cfg->fft_length = (size_t) v->fft_length;
  cfg->window = (FwWindowKind) v->window;
  cfg->window_symmetry = (FwWindowSymmetry) v->window_symmetry;
  cfg->centered = v->centered;
  cfg->padding = (FwPadding) v->padding;
  cfg->spectrum = (FwSpectrumKind) v->spectrum;
  cfg->mel_bands = (size_t) v->mel_bands;
  cfg->mel_scale = (FwMelScale) v->mel_scale;
  cfg->fmin = v->fmin;
  cfg->fmax = v->fmax > 0 ? v->fmax : analysis_rate / 2.0;
  cfg->mel_weights = (FwMelWeights) v->mel_weights;
  cfg->db_reference_max = v->db_reference_max;
  cfg->db_reference = v->db_reference;
  cfg->db_floor = v->db_floor;
  cfg->dynamic_range = v->dynamic_range;
  cfg->cepstral_count = (size_t) v->cepstral_count;
  cfg->dct_norm = (FwDctNorm) v->dct_norm;
  cfg->lifter = v->lifter;
  cfg->delta_width = (size_t) v->delta_width;
}

/* ---- validation ------------------------------------------------------------------------- */

/**
 * fw_params_format_index_list:
 * "0-5, 9, 12-13" for sorted indices. Caller frees.
 */
char *
fw_params_format_index_list (const gsize *indices, gsize n)
{
  GString *s = g_string_new (NULL);
  gsize i = 0;

  while (i < n)
    {
      gsize j = i;
      while (j + 1 < n && indices[j + 1] == indices[j] + 1)
        j++;
      if (s->len > 0)
        g_string_append (s, ", ");
      if (j == i)
        g_string_append_printf (s, "%" G_GSIZE_FORMAT, indices[i]);
      else
        g_string_append_printf (s, "%" G_GSIZE_FORMAT "-%" G_GSIZE_FORMAT, indices[i], indices[j]);
      i = j + 1;
    }
  return g_string_free (s, FALSE);
}

static void
add_warning (GPtrArray *warnings, char *text)
{
  if (warnings != NULL)
    g_ptr_array_add (warnings, text);
  else
    g_free (text);
}

/* Bands whose triangles hold fewer than this many FFT bins with non-zero weight are "thin". */
#define FW_PARAMS_THIN_BAND_BINS 3

gboolean
fw_params_check (const FwParams *params, double analysis_rate, gsize n_samples,
                 GPtrArray *warnings, GError **error)
{
  const FwParamsValues *v;
  FwAnalysisConfig cfg;
  double nyquist, bin_hz;
  char b1[G_ASCII_DTOSTR_BUF_SIZE], b2[G_ASCII_DTOSTR_BUF_SIZE], b3[G_ASCII_DTOSTR_BUF_SIZE];
  FwMelBank *bank;
  FwDspStatus status = FW_DSP_OK;
  gsize n_bands, n_bins;

  g_return_val_if_fail (params != NULL, FALSE);
  v = &params->v;
  if (analysis_rate <= 0)
    analysis_rate = v->sample_rate;
  g_return_val_if_fail (analysis_rate > 0, FALSE);

  fw_params_fill_config (params, analysis_rate, &cfg);
  nyquist = analysis_rate / 2.0;
  bin_hz = analysis_rate / v->fft_length;

  /* Errors. */
  if (v->hop_length < 1)
    {
      g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID,
                   _("hop_length %d is not allowed: allowed is %s"), v->hop_length,
                   fw_params_key_allowed ("hop_length"));
      return FALSE;
    }
  if (!values_check_relations (v, error))
    return FALSE;
  if (v->fmax > nyquist)
    {
      g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP,
                   _("fmax %s Hz is above the Nyquist frequency %s Hz of the analysis rate %s Hz; "
                     "set fmax to at most %s, or 0 for the Nyquist frequency"),
                   fw_params_format_double (v->fmax, b1), fw_params_format_double (nyquist, b2),
                   fw_params_format_double (analysis_rate, b3), b2);
      return FALSE;
    }
  if (cfg.fmin >= cfg.fmax)
    {
      g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID,
                   _("fmin %s Hz is not below fmax %s Hz%s: the mel bands would cover nothing"),
                   fw_params_format_double (cfg.fmin, b1), fw_params_format_double (cfg.fmax, b2),
                   v->fmax > 0 ? "" : _(" (the Nyquist frequency)"));
      return FALSE;
    }
  if (v->cepstral_count > v->mel_bands)
    {
      g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID,
                   _("cepstral_count %d is more than mel_bands %d: a DCT of %d bands has at most "
                     "%d coefficients"),
                   v->cepstral_count, v->mel_bands, v->mel_bands, v->mel_bands);
      return FALSE;
    }

  bank = fw_mel_bank_new (cfg.mel_scale, cfg.mel_weights, cfg.mel_bands, cfg.fmin, cfg.fmax,
                          cfg.sample_rate, cfg.fft_length, &status);
  if (bank == NULL)
    {
      g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID,
                   _("the mel filterbank cannot be built from these parameters (%s)"),
                   fw_dsp_status_describe (status));
      return FALSE;
    }
  n_bands = fw_mel_bank_n_bands (bank);
  n_bins = fw_mel_bank_n_bins (bank);
  {
    g_autofree gsize *empty = g_new (gsize, n_bands);
    gsize n_empty = fw_mel_bank_empty_bands (bank, empty, n_bands);
    if (n_empty > 0)
      {
        g_autofree char *list = fw_params_format_index_list (empty, MIN (n_empty, n_bands));
        g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP,
                     ngettext ("mel band %s of %d covers no FFT bin (bins are %s Hz apart at "
                               "fft_length %d and %s Hz); use fewer mel_bands, a longer "
                               "fft_length or a higher fmin",
                               "mel bands %s of %d cover no FFT bin (bins are %s Hz apart at "
                               "fft_length %d and %s Hz); use fewer mel_bands, a longer "
                               "fft_length or a higher fmin",
                               n_empty),
                     list, v->mel_bands, g_ascii_formatd (b1, sizeof b1, "%.4g", bin_hz),
                     v->fft_length, fw_params_format_double (analysis_rate, b2));
        fw_mel_bank_free (bank);
        return FALSE;
      }
  }

  if (n_samples > 0)
    {
      double ms = 1000.0 * (double) n_samples / analysis_rate;
      gsize need = v->centered ? (gsize) v->window_length : (gsize) v->fft_length;
      gsize pad = v->centered ? (gsize) v->fft_length / 2 : 0;

      if (n_samples < need ||
          fw_frame_count (n_samples, cfg.fft_length, cfg.hop_length, cfg.centered) == 0)
        {
          g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP,
                       _("clip has %zu samples at %s Hz (%s ms); one frame needs "
                         "%zu samples"),
                       n_samples, fw_params_format_double (analysis_rate, b1),
                       g_ascii_formatd (b2, sizeof b2, "%.1f", ms), need);
          fw_mel_bank_free (bank);
          return FALSE;
        }
      if (v->centered && v->padding == FW_PADDING_REFLECT && n_samples <= pad)
        {
          g_set_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP,
                       _("clip has %zu samples; reflect padding of %zu samples (half of "
                         "fft_length) needs more than %zu samples; use padding=zeros or "
                         "padding=edge"),
                       n_samples, pad, pad);
          fw_mel_bank_free (bank);
          return FALSE;
        }
    }

  /* Warnings: legal but suspicious. */
  if (warnings != NULL)
    {
      if (v->hop_length > v->window_length)
        add_warning (warnings, g_strdup_printf (
          _("hop_length %d is longer than window_length %d: %d samples between frames are "
            "never analysed"),
          v->hop_length, v->window_length, v->hop_length - v->window_length));
      if (v->window_symmetry == FW_WINDOW_SYMMETRIC && v->window != FW_WINDOW_RECTANGULAR)
        add_warning (warnings, g_strdup (
          _("window_symmetry is symmetric: such a window is not constant overlap-add, so frames "
            "do not sum to a flat gain; periodic is the usual choice for spectral processing")));
      if ((v->fft_length & (v->fft_length - 1)) != 0)
        add_warning (warnings, g_strdup_printf (
          _("fft_length %d is not a power of two: the FFT is slower and the bins fall at "
            "unusual frequencies (%s Hz apart)"),
          v->fft_length, g_ascii_formatd (b1, sizeof b1, "%.4g", bin_hz)));
      if (v->window == FW_WINDOW_RECTANGULAR && v->window_length > 1)
        add_warning (warnings, g_strdup (
          _("window is rectangular: its highest sidelobe is only about 13 dB below the main "
            "lobe, so strong tones leak across the whole spectrum")));
      if (v->pre_emphasis > 0.99)
        add_warning (warnings, g_strdup_printf (
          _("pre_emphasis %s is above 0.99: the filter removes nearly all low-frequency "
            "content (the usual value is 0.97)"),
          fw_params_format_double (v->pre_emphasis, b1)));
      if (v->db_floor > 1e-3)
        {
          double floor_db = (v->spectrum == FW_SPECTRUM_POWER ? 10.0 : 20.0) * log10 (v->db_floor);
          add_warning (warnings, g_strdup_printf (
            _("db_floor %s is high: every value below %s dB re 1.0 is clipped to it, which "
              "flattens quiet passages"),
            fw_params_format_double (v->db_floor, b1),
            g_ascii_formatd (b2, sizeof b2, "%.1f", floor_db)));
        }
      if (v->lifter > 0 && v->dct_norm == FW_DCT_NORM_NONE)
        add_warning (warnings, g_strdup_printf (
          _("lifter %s is applied to unnormalised DCT coefficients (dct_norm none); liftered "
            "cepstra are usually computed from an orthonormal DCT (dct_norm ortho)"),
          fw_params_format_double (v->lifter, b1)));
      if (v->lifter > 0 && v->lifter < 2)
        add_warning (warnings, g_strdup_printf (
          _("lifter %s is below 2: the weights 1 + (L/2) sin(pi n / L) change sign between "
            "coefficients; the usual value is 22"),
          fw_params_format_double (v->lifter, b1)));

      /* Thin bands among the lowest: fewer than FW_PARAMS_THIN_BAND_BINS bins with weight. */
      {
        g_autofree gsize *thin = g_new (gsize, n_bands);
        const double *edges = fw_mel_bank_edges_hz (bank);
        gsize n_thin = 0;
        for (gsize m = 0; m < n_bands; m++)
          {
            /* only the bins between the band's outer edges can have weight */
            gsize k0 = (gsize) MAX (0.0, floor (edges[m] / bin_hz));
            gsize k1 = (gsize) MIN ((double) (n_bins - 1), ceil (edges[m + 2] / bin_hz));
            gsize count = 0;
            for (gsize k = k0; k <= k1 && count < FW_PARAMS_THIN_BAND_BINS; k++)
              if (fw_mel_bank_weight (bank, m, k) > 0)
                count++;
            if (count < FW_PARAMS_THIN_BAND_BINS)
              thin[n_thin++] = m;
          }
        if (n_thin > 0)
          {
            g_autofree char *list = fw_params_format_index_list (thin, n_thin);
            add_warning (warnings, g_strdup_printf (
              ngettext ("mel band %s has fewer than %d FFT bins with non-zero weight (bins are "
                        "%s Hz apart): it samples the spectrum rather than averaging it; a longer "
                        "fft_length or fewer mel_bands gives smoother bands",
                        "mel bands %s have fewer than %d FFT bins with non-zero weight (bins are "
                        "%s Hz apart): they sample the spectrum rather than averaging it; a longer "
                        "fft_length or fewer mel_bands gives smoother bands",
                        n_thin),
              list, FW_PARAMS_THIN_BAND_BINS, g_ascii_formatd (b1, sizeof b1, "%.4g", bin_hz)));
          }
      }

      if (n_samples > 0)
        {
          gsize frames = fw_frame_count (n_samples, cfg.fft_length, cfg.hop_length, cfg.centered);
          if (frames < (gsize) (2 * v->delta_width + 1))
            add_warning (warnings, g_strdup_printf (
              _("only %zu frames for delta_width %d: deltas of so few frames are "
                "dominated by the replicated edge frames"),
              frames, v->delta_width));
        }
    }

  fw_mel_bank_free (bank);
  return TRUE;
}

/* ---- methods text ----------------------------------------------------------------------- */

static const char *
window_words (int window)
{
  switch (window)
    {
    case FW_WINDOW_RECTANGULAR: return _("rectangular window");
    case FW_WINDOW_HANN: return _("Hann window");
    case FW_WINDOW_HAMMING: return _("Hamming window (0.54/0.46)");
    case FW_WINDOW_BLACKMAN: return _("Blackman window (0.42/0.5/0.08)");
    default: return "";
    }
}

char *
fw_params_describe_methods (const FwParams *params, double analysis_rate)
{
  const FwParamsValues *v;
  GString *s;
  char rate[G_ASCII_DTOSTR_BUF_SIZE], b1[G_ASCII_DTOSTR_BUF_SIZE], b2[G_ASCII_DTOSTR_BUF_SIZE];
  g_autofree char *where = NULL, *frames = NULL, *hop = NULL, *window = NULL, *pad = NULL;
  g_autofree char *mel = NULL, *db = NULL, *mfcc = NULL;

  g_return_val_if_fail (params != NULL, NULL);
  v = &params->v;
  if (analysis_rate <= 0)
    analysis_rate = v->sample_rate;
  s = g_string_new (NULL);

  if (analysis_rate > 0)
    where = g_strdup_printf (_("at %s Hz"), fw_params_format_double (analysis_rate, rate));
  else
    where = g_strdup (_("at the file's sample rate"));

  if (analysis_rate > 0)
    {
      frames = g_strdup_printf (_("frames of %d samples (%.1f ms)"), v->window_length,
                                1000.0 * v->window_length / analysis_rate);
      hop = g_strdup_printf (_("hop %d samples (%.1f ms)"), v->hop_length,
                             1000.0 * v->hop_length / analysis_rate);
    }
  else
    {
      frames = g_strdup_printf (_("frames of %d samples"), v->window_length);
      hop = g_strdup_printf (_("hop %d samples"), v->hop_length);
    }
  window = g_strdup_printf ("%s %s",
                            v->window == FW_WINDOW_RECTANGULAR ? ""
                            : v->window_symmetry == FW_WINDOW_PERIODIC ? _("periodic")
                                                                       : _("symmetric"),
                            window_words (v->window));
  g_strstrip (window);

  if (!v->centered)
    pad = g_strdup (_("the first frame starting at the first sample, without padding"));
  else if (v->padding == FW_PADDING_ZEROS)
    pad = g_strdup (_("centred with zero padding"));
  else if (v->padding == FW_PADDING_REFLECT)
    pad = g_strdup (_("centred with reflected padding"));
  else
    pad = g_strdup (_("centred with edge-replicating padding"));

  /* Sentence 1: signal and framing. */
  if (v->channel == 0)
    g_string_append_printf (s, _("Audio was analysed %s (the mean of the channels)"), where);
  else
    g_string_append_printf (s, _("Audio was analysed %s (channel %d)"), where, v->channel);
  if (v->pre_emphasis > 0)
    g_string_append_printf (s, _(" after pre-emphasis y[n] = x[n] - %s x[n-1]"),
                            fw_params_format_double (v->pre_emphasis, b1));
  g_string_append_printf (s, _(" in %s with a %s, %s, %s"), frames, window, hop, pad);
  if (v->fft_length > v->window_length)
    g_string_append_printf (s, _(", each window zero-padded to a %d-point DFT"), v->fft_length);
  g_string_append (s, ". ");

  /* Sentence 2: spectrum, mel, dB, cepstrum, deltas. */
  mel = g_strdup_printf (_("%d mel bands (%s scale, %s weights) from %s to %s Hz"),
                         v->mel_bands,
                         v->mel_scale == FW_MEL_SCALE_SLANEY ? _("Slaney") : _("HTK"),
                         v->mel_weights == FW_MEL_WEIGHTS_AREA ? _("equal-area") : _("unit-peak"),
                         fw_params_format_double (v->fmin, b1),
                         v->fmax > 0 ? fw_params_format_double (v->fmax, b2)
                         : analysis_rate > 0 ? fw_params_format_double (analysis_rate / 2, b2)
                                             : _("the Nyquist frequency in"));
  if (v->db_reference_max)
    db = g_strdup_printf (_("converted to dB re the clip's maximum (%s) with a floor of %s"),
                          v->spectrum == FW_SPECTRUM_POWER ? "10 log10" : "20 log10",
                          fw_params_format_double (v->db_floor, b1));
  else
    db = g_strdup_printf (_("converted to dB re %s (%s) with a floor of %s"),
                          g_ascii_formatd (b2, sizeof b2, v->db_reference == floor (v->db_reference)
                                                          ? "%.1f" : "%.15g", v->db_reference),
                          v->spectrum == FW_SPECTRUM_POWER ? "10 log10" : "20 log10",
                          fw_params_format_double (v->db_floor, b1));
  if (v->dynamic_range > 0)
    {
      char *t = g_strdup_printf (_("%s, limited to %s dB below the maximum"), db,
                                 fw_params_format_double (v->dynamic_range, b1));
      g_free (db);
      db = t;
    }
  mfcc = g_strdup_printf (_("%d MFCCs (including c0) were taken by %s along the mel axis"),
                          v->cepstral_count,
                          v->dct_norm == FW_DCT_NORM_ORTHO ? _("an orthonormal DCT-II")
                                                           : _("an unnormalised DCT-II (2 times the cosine sum)"));
  g_string_append_printf (s, _("%s spectra (%s of the unscaled DFT) were summed into %s, %s, and "
                               "%s"),
                          v->spectrum == FW_SPECTRUM_POWER ? _("Power") : _("Magnitude"),
                          v->spectrum == FW_SPECTRUM_POWER ? _("squared magnitude") : _("magnitude"),
                          mel, db, mfcc);
  if (v->lifter > 0)
    g_string_append_printf (s, _(", liftered by 1 + (L/2) sin(pi n / L) with L = %s"),
                            fw_params_format_double (v->lifter, b1));
  g_string_append_printf (s, _("; deltas are HTK regression over %d frames on each side with the "
                               "edge frames replicated."),
                          v->delta_width);
  return g_string_free (s, FALSE);
}
