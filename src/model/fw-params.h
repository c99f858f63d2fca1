/* fw-params.h: the analysis parameter set, an immutable reference-counted value.
 *
 * Keys (their text names are part of Framewise's interface):
 *   sample_rate channel pre_emphasis window_length hop_length fft_length window
 *   window_symmetry centered padding spectrum mel_bands mel_scale fmin fmax mel_weights
 *   db_reference db_floor dynamic_range cepstral_count dct_norm lifter delta_width
 *
 * Text form (our own, read with GKeyFile):
 *   [framewise-parameters]
 *   format=1
 *   sample_rate=22050
 *   ...
 * fw_params_to_text() writes every key in the order above with canonical number formatting,
 * so the same set always gives byte-identical text; fw_params_get_hash() is a hash of that text.
 * Reading accepts any subset of keys (missing keys take the defaults; an absent fft_length
 * follows window_length); unknown keys and bad values are errors naming key, value and what
 * is allowed. "Editing" a set makes a new value: the old one stays valid for work in flight.
 */
#pragma once

#include <glib-object.h>

#include "fw-analysis.h"

G_BEGIN_DECLS

#define FW_PARAMS_ERROR (fw_params_error_quark ())
GQuark fw_params_error_quark (void);

typedef enum {
  FW_PARAMS_ERROR_PARSE,        /* not a parameter file (syntax), names the line */
  FW_PARAMS_ERROR_UNKNOWN_KEY,  /* names the key and lists the known keys */
  FW_PARAMS_ERROR_BAD_VALUE,    /* names key, value and what is allowed */
  FW_PARAMS_ERROR_INVALID,      /* values that conflict (fmin >= fmax, fft_length < window_length) */
  FW_PARAMS_ERROR_CLIP,         /* does not fit a clip (fmax > Nyquist, empty mel bands, too short) */
  FW_PARAMS_ERROR_FORMAT,       /* a newer format version than this build reads */
} FwParamsError;

#define FW_PARAMS_GROUP "framewise-parameters"
#define FW_PARAMS_FORMAT 1

typedef struct _FwParams FwParams;

#define FW_TYPE_PARAMS (fw_params_get_type ())
GType fw_params_get_type (void) G_GNUC_CONST;

FwParams *fw_params_new_default (void);
FwParams *fw_params_new_from_text (const char *text, gssize length, GError **error);
FwParams *fw_params_new_from_file (const char *path, GError **error);
/* A copy of base with one key changed. value is the key's text form ("1024", "hann", "max").
 * Changing window_length also moves fft_length when fft_length was equal to the old
 * window_length and the same call (or settings list) does not set fft_length itself. */
FwParams *fw_params_with (const FwParams *base, const char *key, const char *value,
                          GError **error);
/* Applies "key=value" strings in order (as from --set). */
FwParams *fw_params_with_settings (const FwParams *base, const char *const *settings,
                                   GError **error);

FwParams *fw_params_ref (FwParams *params);
void fw_params_unref (FwParams *params);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwParams, fw_params_unref)

/* Canonical text (owned by params, valid while it lives). */
const char *fw_params_get_text (const FwParams *params);
/* Saves atomically (temporary file + rename). */
gboolean fw_params_save (const FwParams *params, const char *path, GError **error);
/* 16 lower-case hex digits: the first 64 bits of SHA-256 of the canonical text. */
const char *fw_params_get_hash (const FwParams *params);
gboolean fw_params_equal (const FwParams *a, const FwParams *b);

/* The keys in canonical order (NULL-terminated, static). */
const char *const *fw_params_keys (void);
gboolean fw_params_is_key (const char *key);
/* A key's canonical text value; NULL for an unknown key. */
char *fw_params_get_value (const FwParams *params, const char *key);
/* Human hint of what a key allows ("an integer >= 1", "one of hann, hamming, ..."). */
const char *fw_params_key_allowed (const char *key);
/* Unit of a key for display ("samples", "Hz", "dB", NULL). */
const char *fw_params_key_unit (const char *key);
/* Keys whose values differ, canonical order, NULL-terminated. */
GStrv fw_params_diff_keys (const FwParams *a, const FwParams *b);

/* Typed accessors for what the model needs before analysis. */
int fw_params_get_sample_rate (const FwParams *params);  /* 0 = keep the file's rate */
int fw_params_get_channel (const FwParams *params);      /* 0 = mix, else 1-based channel */

/* Fills cfg for analysis at `analysis_rate` (resolves fmax = 0 to Nyquist). */
void fw_params_fill_config (const FwParams *params, double analysis_rate, FwAnalysisConfig *cfg);

/* Validates against a clip analysed at analysis_rate with n_samples samples (after channel
 * policy and resampling). Errors (FW_PARAMS_ERROR_CLIP / _INVALID): fmax > Nyquist,
 * fmin >= fmax, mel bands covering no FFT bin (lists the indices), window not fitting the
 * clip. Legal but suspicious settings append translated sentences to `warnings` (may be
 * NULL). n_samples = 0 skips the length check. */
gboolean fw_params_check (const FwParams *params, double analysis_rate, gsize n_samples,
                          GPtrArray *warnings, GError **error);

/* One or two sentences describing the parameters in words, for a paper's methods section. */
char *fw_params_describe_methods (const FwParams *params, double analysis_rate);

/* Added by the model layer: */
/* Canonical number text: the shortest of %.15g/%.16g/%.17g (C locale) that reads back to the
 * same double; -0 becomes 0. buf must hold G_ASCII_DTOSTR_BUF_SIZE bytes; returns buf. */
const char *fw_params_format_double (double value, char *buf);
/* Sorted indices as a compact list, "0-5, 9, 12-13". Caller frees. */
char *fw_params_format_index_list (const gsize *indices, gsize n);

G_END_DECLS
