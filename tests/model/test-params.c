/* test-params.c: the parameter set: canonical text, hash, parsing errors, validation, warnings.
 *
 * Sources named beside the checks:
 *   [issue2]  issue 2 of this project, "Parameter set": the key names and the defaults.
 *   [cv§8]    ../shared/docs/check-values.md §8 (PUB): bin spacing sr/n_fft, hop time hop/sr.
 *   [repr]    Python's repr() of a float (shortest text that reads back exactly), run with
 *             Debian's /usr/bin/python3: repr(0.1+0.2) = '0.30000000000000004',
 *             repr(1/3) = '0.3333333333333333', repr(2/3) = '0.6666666666666666'.
 *   [NUM-mel] numpy 1.24.2 (/usr/bin/python3) from the written filterbank definition in
 *             src/dsp/fw-mel.h (n+2 points equally spaced in mel, triangles linear in Hz,
 *             evaluated at k*sr/N): the indices of bands with no bin of non-zero weight, and of
 *             bands with fewer than 3 such bins. The script is in the comment of each check.
 *   [SHA256]  FIPS 180-4 SHA-256 as computed by GLib's GChecksum and by coreutils sha256sum.
 */
#include "fw-config.h"

#include <locale.h>
#include <string.h>

#include <glib/gstdio.h>

#include "fw-params.h"
#include "fw-test-fixtures.h"


static void
test_defaults (void)
{
  g_autoptr (FwParams) p = fw_params_new_default ();
  const char *const *keys = fw_params_keys ();
  /* [issue2] the 23 keys, in the order */
  static const char *const expected_keys[] = {
    "sample_rate", "channel", "pre_emphasis", "window_length", "hop_length", "fft_length",
    "window", "window_symmetry", "centered", "padding", "spectrum", "mel_bands", "mel_scale",
    "fmin", "fmax", "mel_weights", "db_reference", "db_floor", "dynamic_range",
    "cepstral_count", "dct_norm", "lifter", "delta_width", NULL
  };

  g_assert_cmpstr (fw_params_get_text (p), ==, fw_test_default_params_text);
  g_assert_cmpuint (g_strv_length ((char **) keys), ==, 23);
  for (guint i = 0; expected_keys[i] != NULL; i++)
    g_assert_cmpstr (keys[i], ==, expected_keys[i]);
  g_assert_cmpint (fw_params_get_sample_rate (p), ==, 22050);
  g_assert_cmpint (fw_params_get_channel (p), ==, 0);
  g_assert_true (fw_params_is_key ("delta_width"));
  g_assert_false (fw_params_is_key ("format"));
  g_assert_false (fw_params_is_key ("fft_size"));
}

static void
test_canonical_roundtrip (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (FwParams) a = NULL, b = NULL, c = NULL;
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = fw_test_path (dir, "bees.fwparams");
  const char *settings[] = {
    "sample_rate=16000", "channel=2", "pre_emphasis=0.97", "window_length=400",
    "hop_length=160", "fft_length=512", "window=hamming", "window_symmetry=symmetric",
    "centered=false", "padding=reflect", "spectrum=magnitude", "mel_bands=40",
    "mel_scale=htk", "fmin=64", "fmax=8000", "mel_weights=unit", "db_reference=max",
    "db_floor=1e-05", "dynamic_range=80", "cepstral_count=13", "dct_norm=none",
    "lifter=22", "delta_width=3", NULL
  };

  /* Default text back to itself. */
  a = fw_params_new_from_text (fw_test_default_params_text, -1, &error);
  g_assert_no_error (error);
  g_assert_cmpstr (fw_params_get_text (a), ==, fw_test_default_params_text);
  g_assert_true (fw_params_equal (a, d));

  /* Every key changed, then text -> set -> text and file -> set -> text. */
  b = fw_params_with_settings (d, settings, &error);
  g_assert_no_error (error);
  c = fw_params_new_from_text (fw_params_get_text (b), -1, &error);
  g_assert_no_error (error);
  g_assert_cmpstr (fw_params_get_text (c), ==, fw_params_get_text (b));
  g_assert_true (fw_params_save (b, path, &error));
  g_assert_no_error (error);
  {
    g_autoptr (FwParams) e = fw_params_new_from_file (path, &error);
    g_assert_no_error (error);
    g_assert_cmpstr (fw_params_get_text (e), ==, fw_params_get_text (b));
    g_assert_cmpstr (fw_params_get_hash (e), ==, fw_params_get_hash (b));
  }
  for (guint i = 0; settings[i] != NULL; i++)
    {
      const char *eq = strchr (settings[i], '=');
      g_autofree char *key = g_strndup (settings[i], (gsize) (eq - settings[i]));
      g_autofree char *value = fw_params_get_value (c, key);
      g_assert_cmpstr (value, ==, eq + 1);
    }
  {
    g_auto (GStrv) diff = fw_params_diff_keys (d, b);
    /* cepstral_count is 13 in both; every other key differs */
    g_assert_cmpuint (g_strv_length (diff), ==, 22);
    g_assert_false (g_strv_contains ((const char *const *) diff, "cepstral_count"));
    g_assert_cmpstr (diff[0], ==, "sample_rate");
  }
  fw_test_remove_dir (dir);
}

static void
test_canonical_order_format (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) a = NULL, b = NULL, c = NULL;
  /* The same set written two ways: key order, number spelling, case, spaces, comments. */
  const char *text_a =
    "[framewise-parameters]\n"
    "format=1\n"
    "window_length=1024\n"
    "hop_length=256\n"
    "fmin=20\n"
    "db_floor=1e-8\n"
    "centered=false\n"
    "pre_emphasis=0.97\n"
    "db_reference=2.5\n";
  const char *text_b =
    "# written by hand\n"
    "[framewise-parameters]\n"
    "db_reference = 2.50\n"
    "pre_emphasis=9.7e-1\n"
    "centered=FALSE\n"
    "db_floor=0.00000001\n"
    "fmin=20.000\n"
    "hop_length=+256\n"
    "window_length=1024\n"
    "window=Hann\n";

  a = fw_params_new_from_text (text_a, -1, &error);
  g_assert_no_error (error);
  b = fw_params_new_from_text (text_b, -1, &error);
  g_assert_no_error (error);
  g_assert_cmpstr (fw_params_get_text (a), ==, fw_params_get_text (b));
  g_assert_cmpstr (fw_params_get_hash (a), ==, fw_params_get_hash (b));
  g_assert_true (fw_params_equal (a, b));
  /* absent fft_length followed window_length in both */
  g_assert_nonnull (strstr (fw_params_get_text (a), "\nfft_length=1024\n"));
  g_assert_nonnull (strstr (fw_params_get_text (a), "\npre_emphasis=0.97\n"));
  g_assert_nonnull (strstr (fw_params_get_text (a), "\ndb_floor=1e-08\n"));

  /* The same again through --set style settings, in yet another order. */
  {
    g_autoptr (FwParams) d = fw_params_new_default ();
    const char *s[] = { "centered=no", "db_reference=2.5", "hop_length=256", "fmin=2e1",
                        "window_length=1024", "db_floor=1E-8", "pre_emphasis=.97", NULL };
    c = fw_params_with_settings (d, s, &error);
    g_assert_no_error (error);
    g_assert_cmpstr (fw_params_get_text (c), ==, fw_params_get_text (a));
  }
}

static void
test_number_format (void)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  /* [repr] shortest round-trip text, as Python's repr gives it */
  g_assert_cmpstr (fw_params_format_double (0.1 + 0.2, buf), ==, "0.30000000000000004");
  g_assert_cmpstr (fw_params_format_double (1.0 / 3.0, buf), ==, "0.3333333333333333");
  g_assert_cmpstr (fw_params_format_double (2.0 / 3.0, buf), ==, "0.6666666666666666");
  g_assert_cmpstr (fw_params_format_double (0.97, buf), ==, "0.97");
  g_assert_cmpstr (fw_params_format_double (1e-10, buf), ==, "1e-10");
  g_assert_cmpstr (fw_params_format_double (22050.0, buf), ==, "22050");
  g_assert_cmpstr (fw_params_format_double (-0.0, buf), ==, "0");

  /* The C locale is used whatever LC_NUMERIC says (a decimal comma must not appear). */
  if (setlocale (LC_NUMERIC, "de_DE.UTF-8") != NULL)
    {
      g_assert_cmpstr (fw_params_format_double (0.97, buf), ==, "0.97");
      setlocale (LC_NUMERIC, "C");
    }

  {
    gsize idx[] = { 0, 1, 2, 3, 4, 5, 9, 12, 13 };
    g_autofree char *s = fw_params_format_index_list (idx, G_N_ELEMENTS (idx));
    g_assert_cmpstr (s, ==, "0-5, 9, 12-13");
  }
}

static void
test_hash (void)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  g_autofree char *sum = g_compute_checksum_for_string (G_CHECKSUM_SHA256, fw_test_default_params_text, -1);
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = fw_test_path (dir, "default.fwparams");
  g_autofree char *sha256sum = g_find_program_in_path ("sha256sum");
  const char *hash = fw_params_get_hash (d);

  /* [SHA256] first 16 hex digits of SHA-256 of the canonical text, by GLib's GChecksum */
  g_assert_cmpuint (strlen (hash), ==, 16);
  g_assert_true (strncmp (hash, sum, 16) == 0);
  for (const char *c = hash; *c; c++)
    g_assert_true (g_ascii_isxdigit (*c) && !g_ascii_isupper (*c));

  /* [SHA256] and by coreutils sha256sum over the saved file */
  g_assert_true (fw_params_save (d, path, &error));
  g_assert_no_error (error);
  if (sha256sum != NULL)
    {
      g_autofree char *out = NULL;
      int status = 0;
      const char *argv[] = { sha256sum, path, NULL };
      g_assert_true (g_spawn_sync (NULL, (char **) argv, NULL, G_SPAWN_STDERR_TO_DEV_NULL,
                                   NULL, NULL, &out, NULL, &status, &error));
      g_assert_no_error (error);
      g_assert_true (g_spawn_check_wait_status (status, NULL));
      g_assert_true (strncmp (out, hash, 16) == 0);
    }

  /* A changed value changes the hash; the same value again gives it back. */
  {
    g_autoptr (FwParams) a = fw_params_with (d, "hop_length", "256", &error);
    g_autoptr (FwParams) b = NULL;
    g_assert_no_error (error);
    g_assert_cmpstr (fw_params_get_hash (a), !=, hash);
    b = fw_params_with (a, "hop_length", "512", &error);
    g_assert_no_error (error);
    g_assert_cmpstr (fw_params_get_hash (b), ==, hash);
  }
  fw_test_remove_dir (dir);
}

static void
test_boxed (void)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  FwParams *copy = g_boxed_copy (FW_TYPE_PARAMS, d);

  g_assert_true (G_TYPE_IS_BOXED (FW_TYPE_PARAMS));
  g_assert_true (copy == d); /* immutable: a copy is a reference */
  g_boxed_free (FW_TYPE_PARAMS, copy);
  g_assert_cmpstr (fw_params_get_text (d), ==, fw_test_default_params_text);
}

/* Asserts that error mentions every string in `parts`. */
static void
assert_mentions (const GError *error, const char *const *parts)
{
  g_assert_nonnull (error);
  for (guint i = 0; parts[i] != NULL; i++)
    if (strstr (error->message, parts[i]) == NULL)
      g_error ("message \"%s\" does not mention \"%s\"", error->message, parts[i]);
}

static void
test_unknown_key (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) d = fw_params_new_default ();
  FwParams *p;

  p = fw_params_new_from_text ("[framewise-parameters]\nfft_size=1024\n", -1, &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_UNKNOWN_KEY);
  assert_mentions (error, (const char *[]) { "fft_size", "fft_length", "sample_rate",
                                             "delta_width", NULL });
  g_clear_error (&error);

  p = fw_params_with (d, "hann_window", "1", &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_UNKNOWN_KEY);
  assert_mentions (error, (const char *[]) { "hann_window", NULL });
}

static void
test_bad_values (void)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  struct { const char *key, *value, *allowed_part; } cases[] = {
    { "sample_rate", "fast", "keep the file's rate" },
    { "sample_rate", "-8000", "1000000" },
    { "channel", "0", "mix" },
    { "channel", "left", "mix" },
    { "pre_emphasis", "1", "not including 1" },
    { "pre_emphasis", "-0.1", "from 0" },
    { "window_length", "0", "from 1" },
    { "window_length", "20.5", "integer" },
    { "hop_length", "0", "from 1" },          /* hop_length < 1 */
    { "hop_length", "-512", "from 1" },
    { "fft_length", "0", "window_length" },
    { "window", "kaiser", "rectangular, hann, hamming, blackman" },
    { "window_symmetry", "even", "periodic or symmetric" },
    { "centered", "maybe", "true or false" },
    { "padding", "mirror", "zeros, reflect, edge" },
    { "spectrum", "energy", "power or magnitude" },
    { "mel_bands", "0", "from 1" },
    { "mel_scale", "bark", "htk or slaney" },
    { "fmin", "-20", "0 or more" },
    { "fmax", "nan", "Nyquist" },
    { "mel_weights", "peak", "area" },
    { "db_reference", "0", "max" },
    { "db_floor", "0", "above 0" },
    { "db_floor", "inf", "above 0" },
    { "dynamic_range", "-80", "0 (off)" },
    { "cepstral_count", "0", "mel_bands" },
    { "dct_norm", "htk", "ortho or none" },
    { "lifter", "-22", "0 (off)" },
    { "delta_width", "0", "from 1" },
  };

  for (guint i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr (GError) error = NULL;
      FwParams *p = fw_params_with (d, cases[i].key, cases[i].value, &error);
      g_autofree char *text = g_strdup_printf ("[framewise-parameters]\n%s=%s\n", cases[i].key,
                                               cases[i].value);

      g_assert_null (p);
      g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_BAD_VALUE);
      assert_mentions (error, (const char *[]) { cases[i].key, cases[i].value,
                                                 fw_params_key_allowed (cases[i].key),
                                                 cases[i].allowed_part, NULL });
      g_clear_error (&error);
      /* the same from a file's text */
      p = fw_params_new_from_text (text, -1, &error);
      g_assert_null (p);
      g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_BAD_VALUE);
      assert_mentions (error, (const char *[]) { cases[i].key, cases[i].value, NULL });
    }
}

static void
test_format_and_parse_errors (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = fw_test_path (dir, "future.fwparams");
  FwParams *p;

  /* A newer format version. */
  p = fw_params_new_from_text ("[framewise-parameters]\nformat=2\nwindow_shape=kaiser(8)\n", -1,
                               &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_FORMAT);
  assert_mentions (error, (const char *[]) { "format 2", "format 1", NULL });
  g_clear_error (&error);

  /* ... from a file: the message names the file. */
  g_assert_true (g_file_set_contents (path, "[framewise-parameters]\nformat=3\n", -1, NULL));
  p = fw_params_new_from_file (path, &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_FORMAT);
  assert_mentions (error, (const char *[]) { path, "format 3", NULL });
  g_clear_error (&error);

  /* Not a key file at all. */
  p = fw_params_new_from_text ("window_length 2048\n", -1, &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_PARSE);
  g_clear_error (&error);

  /* A key file without our group, and one with a stray group. */
  p = fw_params_new_from_text ("[parameters]\nwindow_length=2048\n", -1, &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_PARSE);
  assert_mentions (error, (const char *[]) { "[parameters]", "[framewise-parameters]", NULL });
  g_clear_error (&error);
  p = fw_params_new_from_text ("# nothing\n", -1, &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_PARSE);
  assert_mentions (error, (const char *[]) { "[framewise-parameters]", NULL });
  g_clear_error (&error);

  /* format itself must be an integer. */
  p = fw_params_new_from_text ("[framewise-parameters]\nformat=one\n", -1, &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_BAD_VALUE);
  assert_mentions (error, (const char *[]) { "format", "one", NULL });
  g_clear_error (&error);

  /* A setting that is not KEY=VALUE. */
  {
    const char *s[] = { "window_length", NULL };
    p = fw_params_with_settings (d, s, &error);
    g_assert_null (p);
    g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_PARSE);
    assert_mentions (error, (const char *[]) { "window_length", "KEY=VALUE", NULL });
    g_clear_error (&error);
  }

  /* A missing file names the file. */
  p = fw_params_new_from_file ("/nonexistent/framewise/none.fwparams", &error);
  g_assert_null (p);
  g_assert_nonnull (error);
  assert_mentions (error, (const char *[]) { "/nonexistent/framewise/none.fwparams", NULL });
  fw_test_remove_dir (dir);
}

static void
test_fft_follows_window (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) d = fw_params_new_default ();
  FwParams *p;
  char *v;

  /* Absent fft_length in a file follows window_length. */
  p = fw_params_new_from_text ("[framewise-parameters]\nwindow_length=1024\n", -1, &error);
  g_assert_no_error (error);
  v = fw_params_get_value (p, "fft_length");
  g_assert_cmpstr (v, ==, "1024");
  g_free (v);
  fw_params_unref (p);

  /* Editing window_length moves an fft_length that was equal to it. */
  p = fw_params_with (d, "window_length", "4096", &error);
  g_assert_no_error (error);
  v = fw_params_get_value (p, "fft_length");
  g_assert_cmpstr (v, ==, "4096");
  g_free (v);
  fw_params_unref (p);

  /* ... but not an explicitly longer one. */
  {
    const char *s1[] = { "fft_length=8192", NULL };
    const char *s2[] = { "window_length=4096", NULL };
    g_autoptr (FwParams) a = fw_params_with_settings (d, s1, &error);
    g_assert_no_error (error);
    p = fw_params_with_settings (a, s2, &error);
    g_assert_no_error (error);
    v = fw_params_get_value (p, "fft_length");
    g_assert_cmpstr (v, ==, "8192");
    g_free (v);
    fw_params_unref (p);
  }

  /* A list that sets both keeps the explicit fft_length, in either order. */
  {
    const char *s1[] = { "window_length=1024", "fft_length=2048", NULL };
    const char *s2[] = { "fft_length=2048", "window_length=1024", NULL };
    g_autoptr (FwParams) a = fw_params_with_settings (d, s1, &error);
    g_autoptr (FwParams) b = NULL;
    g_assert_no_error (error);
    b = fw_params_with_settings (d, s2, &error);
    g_assert_no_error (error);
    v = fw_params_get_value (a, "fft_length");
    g_assert_cmpstr (v, ==, "2048");
    g_free (v);
    g_assert_true (fw_params_equal (a, b));
  }

  /* fft_length < window_length is an error when parsing and when editing. */
  p = fw_params_new_from_text ("[framewise-parameters]\nwindow_length=2048\nfft_length=1024\n",
                               -1, &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID);
  assert_mentions (error, (const char *[]) { "fft_length 1024", "window_length 2048", NULL });
  g_clear_error (&error);
  p = fw_params_with (d, "fft_length", "1000", &error);
  g_assert_null (p);
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID);
  g_clear_error (&error);
  {
    const char *s[] = { "fft_length=4096", "window_length=8192", NULL };
    p = fw_params_with_settings (d, s, &error);
    g_assert_null (p);
    g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID);
  }
}

static FwParams *
with (const char *const *settings)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (d, settings, &error);

  g_assert_no_error (error);
  return p;
}

static void
test_check_errors (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) d = fw_params_new_default ();
  FwParams *p;

  /* Defaults at their own rate with 1 s of audio: no error. */
  g_assert_true (fw_params_check (d, 22050, 22050, NULL, &error));
  g_assert_no_error (error);

  /* fmax above Nyquist (the clip is analysed at 16 kHz). */
  p = with ((const char *[]) { "fmax=11025", NULL });
  g_assert_false (fw_params_check (p, 16000, 0, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP);
  assert_mentions (error, (const char *[]) { "fmax 11025", "8000", NULL });
  g_clear_error (&error);
  fw_params_unref (p);

  /* fmin >= fmax, both explicit and against the Nyquist frequency. */
  p = with ((const char *[]) { "fmin=4000", "fmax=4000", NULL });
  g_assert_false (fw_params_check (p, 22050, 0, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID);
  assert_mentions (error, (const char *[]) { "fmin 4000", "fmax 4000", NULL });
  g_clear_error (&error);
  fw_params_unref (p);
  p = with ((const char *[]) { "fmin=9000", NULL });
  g_assert_false (fw_params_check (p, 16000, 0, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID);
  assert_mentions (error, (const char *[]) { "fmin 9000", "8000", "Nyquist", NULL });
  g_clear_error (&error);
  fw_params_unref (p);

  /* cepstral_count > mel_bands. */
  p = with ((const char *[]) { "mel_bands=10", NULL });
  g_assert_false (fw_params_check (p, 22050, 0, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_INVALID);
  assert_mentions (error, (const char *[]) { "cepstral_count 13", "mel_bands 10", NULL });
  g_clear_error (&error);
  fw_params_unref (p);

  /* Empty mel bands, listed. [NUM-mel] slaney, 128 bands, 0..11025 Hz, sr 22050, N 256:
   *   W = max(0, min((fk-f[m])/(f[m+1]-f[m]), (f[m+2]-fk)/(f[m+2]-f[m+1]))), fk = k*sr/N;
   *   empty = bands with (W>0).sum() == 0 -> 0-1, 4, 7-8, 11, 14, 17-18, 21, 24, 27-28, 31,
   *   34, 37-38, 41, 46, 51 */
  p = with ((const char *[]) { "window_length=256", NULL });
  g_assert_false (fw_params_check (p, 22050, 0, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP);
  assert_mentions (error, (const char *[]) {
    "bands 0-1, 4, 7-8, 11, 14, 17-18, 21, 24, 27-28, 31, 34, 37-38, 41, 46, 51 of 128",
    "86.13" /* [cv§8] bin spacing sr/N = 22050/256 = 86.1328 Hz */, NULL });
  g_clear_error (&error);
  fw_params_unref (p);
  /* [NUM-mel] htk, same otherwise: 0-3, 6-8, 11-12, 15-16, 19, 22-23, 26, 29, 32, 37 */
  p = with ((const char *[]) { "window_length=256", "mel_scale=htk", NULL });
  g_assert_false (fw_params_check (p, 22050, 0, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP);
  assert_mentions (error, (const char *[]) {
    "bands 0-3, 6-8, 11-12, 15-16, 19, 22-23, 26, 29, 32, 37 of 128", NULL });
  g_clear_error (&error);
  fw_params_unref (p);

  /* A clip shorter than one frame. [cv§8] 1000 / 22050 s = 45.35 ms */
  g_assert_false (fw_params_check (d, 22050, 1000, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP);
  g_assert_cmpstr (error->message, ==,
                   "clip has 1000 samples at 22050 Hz (45.4 ms); one frame needs 2048 samples");
  g_clear_error (&error);
  /* Not centred, a zero-padded FFT needs fft_length samples per frame. */
  p = with ((const char *[]) { "window_length=1024", "fft_length=4096", "centered=false", NULL });
  g_assert_false (fw_params_check (p, 22050, 3000, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP);
  assert_mentions (error, (const char *[]) { "3000 samples", "needs 4096 samples", NULL });
  g_clear_error (&error);
  /* exactly one frame fits (frame count 1 + floor((4096-4096)/512) = 1, [cv§8] formula) */
  g_assert_true (fw_params_check (p, 22050, 4096, NULL, &error));
  g_assert_no_error (error);
  fw_params_unref (p);

  /* Reflect padding longer than the clip. */
  p = with ((const char *[]) { "window_length=256", "fft_length=4096", "padding=reflect",
                               "mel_bands=40", NULL });
  g_assert_false (fw_params_check (p, 22050, 1500, NULL, &error));
  g_assert_error (error, FW_PARAMS_ERROR, FW_PARAMS_ERROR_CLIP);
  assert_mentions (error, (const char *[]) { "reflect", "2048", NULL });
  g_clear_error (&error);
  fw_params_unref (p);
}

static gboolean
warnings_mention (GPtrArray *w, const char *part)
{
  for (guint i = 0; i < w->len; i++)
    if (strstr (g_ptr_array_index (w, i), part) != NULL)
      return TRUE;
  return FALSE;
}

static void
check_warns (const char *const *settings, double rate, gsize n, const char *part)
{
  g_autoptr (FwParams) p = with (settings);
  g_autoptr (GPtrArray) w = g_ptr_array_new_with_free_func (g_free);
  g_autoptr (GError) error = NULL;

  g_assert_true (fw_params_check (p, rate, n, w, &error));
  g_assert_no_error (error);
  if (!warnings_mention (w, part))
    g_error ("no warning mentioning \"%s\" for %s (%u warnings)", part, settings[0], w->len);
}

static void
test_check_warnings (void)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autoptr (GPtrArray) w = g_ptr_array_new_with_free_func (g_free);

  /* The defaults are not suspicious. [NUM-mel] slaney 128 bands at N 2048, sr 22050: every
   * band holds at least 4 bins of non-zero weight. */
  g_assert_true (fw_params_check (d, 22050, 22050 * 10, w, NULL));
  g_assert_cmpuint (w->len, ==, 0);

  check_warns ((const char *[]) { "hop_length=4096", NULL }, 22050, 0, "2048 samples between");
  check_warns ((const char *[]) { "window_symmetry=symmetric", NULL }, 22050, 0,
               "not constant overlap-add");
  check_warns ((const char *[]) { "fft_length=3000", NULL }, 22050, 0, "not a power of two");
  check_warns ((const char *[]) { "pre_emphasis=0.995", NULL }, 22050, 0, "pre_emphasis 0.995");
  /* power: 10 log10(0.01) = -20 dB */
  check_warns ((const char *[]) { "db_floor=0.01", NULL }, 22050, 0, "-20.0 dB");
  check_warns ((const char *[]) { "lifter=22", "dct_norm=none", NULL }, 22050, 0, "lifter 22");
  check_warns ((const char *[]) { "window=rectangular", NULL }, 22050, 0, "13 dB");
  /* [cv§8] 1 s at 22050 Hz, 2048/512 centred: 1 + floor(22050/512) = 44 frames < 2*30+1 */
  check_warns ((const char *[]) { "delta_width=30", NULL }, 22050, 22050, "only 44 frames");
  /* [NUM-mel] slaney, 64 bands, 0..11025 Hz, sr 22050, N 512: bands with fewer than 3 bins of
   * non-zero weight: 0-3, 6-8, 11-13, 16-18, 21 */
  check_warns ((const char *[]) { "window_length=512", "mel_bands=64", NULL }, 22050, 0,
               "mel bands 0-3, 6-8, 11-13, 16-18, 21 have fewer than 3");
  /* [NUM-mel] htk, 128 bands, N 2048: only band 0 (2 bins) */
  check_warns ((const char *[]) { "mel_scale=htk", NULL }, 22050, 0, "mel band 0 has fewer");
}

static void
test_fill_config (void)
{
  g_autoptr (FwParams) p = with ((const char *[]) {
    "pre_emphasis=0.97", "window=blackman", "centered=false", "padding=edge",
    "spectrum=magnitude", "mel_scale=htk", "mel_weights=unit", "db_reference=max",
    "dynamic_range=80", "dct_norm=none", "lifter=22", "delta_width=3", NULL });
  FwAnalysisConfig cfg;

  fw_params_fill_config (p, 16000, &cfg);
  g_assert_cmpfloat (cfg.sample_rate, ==, 16000);
  g_assert_cmpfloat (cfg.fmax, ==, 8000); /* fmax 0 = Nyquist [issue2] */
  g_assert_cmpfloat (cfg.pre_emphasis, ==, 0.97);
  g_assert_cmpuint (cfg.window_length, ==, 2048);
  g_assert_cmpuint (cfg.hop_length, ==, 512);
  g_assert_cmpuint (cfg.fft_length, ==, 2048);
  g_assert_cmpint (cfg.window, ==, FW_WINDOW_BLACKMAN);
  g_assert_cmpint (cfg.window_symmetry, ==, FW_WINDOW_PERIODIC);
  g_assert_false (cfg.centered);
  g_assert_cmpint (cfg.padding, ==, FW_PADDING_EDGE);
  g_assert_cmpint (cfg.spectrum, ==, FW_SPECTRUM_MAGNITUDE);
  g_assert_cmpint (cfg.mel_scale, ==, FW_MEL_SCALE_HTK);
  g_assert_cmpint (cfg.mel_weights, ==, FW_MEL_WEIGHTS_UNIT);
  g_assert_true (cfg.db_reference_max);
  g_assert_cmpfloat (cfg.db_floor, ==, 1e-10);
  g_assert_cmpfloat (cfg.dynamic_range, ==, 80);
  g_assert_cmpuint (cfg.cepstral_count, ==, 13);
  g_assert_cmpint (cfg.dct_norm, ==, FW_DCT_NORM_NONE);
  g_assert_cmpfloat (cfg.lifter, ==, 22);
  g_assert_cmpuint (cfg.delta_width, ==, 3);
  g_assert_cmpuint (cfg.mel_bands, ==, 128);

  g_assert_cmpstr (fw_params_key_unit ("fmax"), ==, "Hz");
  g_assert_cmpstr (fw_params_key_unit ("hop_length"), ==, "samples");
  g_assert_null (fw_params_key_unit ("window"));
  g_assert_null (fw_params_key_allowed ("fft_size"));
  g_assert_null (fw_params_get_value (p, "fft_size"));
}

static void
test_describe_methods (void)
{
  g_autoptr (FwParams) d = fw_params_new_default ();
  g_autofree char *text = fw_params_describe_methods (d, 22050);
  g_autofree char *t2 = NULL;
  const char *parts[] = {
    "22050 Hz",
    "frames of 2048 samples (92.9 ms)", /* [cv§8] 2048/22050 s = 92.88 ms */
    "periodic Hann window",
    "hop 512 samples (23.2 ms)",        /* [cv§8] 512/22050 s = 23.21995 ms */
    "centred with zero padding",
    "Power spectra",
    "128 mel bands (Slaney scale, equal-area weights) from 0 to 11025 Hz",
    "dB re 1.0", "floor of 1e-10",
    "13 MFCCs", "orthonormal DCT-II",
    NULL
  };

  for (guint i = 0; parts[i] != NULL; i++)
    if (strstr (text, parts[i]) == NULL)
      g_error ("methods text \"%s\" lacks \"%s\"", text, parts[i]);

  {
    g_autoptr (FwParams) p = with ((const char *[]) {
      "sample_rate=16000", "channel=2", "pre_emphasis=0.97", "window_length=400",
      "hop_length=160", "fft_length=512", "window=hamming", "window_symmetry=symmetric",
      "mel_scale=htk", "fmax=8000", "mel_bands=40", "lifter=22", "db_reference=max", NULL });
    const char *parts2[] = {
      "16000 Hz", "channel 2", "0.97", "400 samples (25.0 ms)", "hop 160 samples (10.0 ms)",
      "symmetric Hamming", "512-point DFT", "HTK scale", "from 0 to 8000 Hz", "L = 22",
      "maximum", NULL
    };
    t2 = fw_params_describe_methods (p, 0);
    for (guint i = 0; parts2[i] != NULL; i++)
      if (strstr (t2, parts2[i]) == NULL)
        g_error ("methods text \"%s\" lacks \"%s\"", t2, parts2[i]);
  }
}

int
main (int argc, char **argv)
{
  setlocale (LC_ALL, "C.UTF-8");
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/fw/model/params/defaults", test_defaults);
  g_test_add_func ("/fw/model/params/canonical-roundtrip", test_canonical_roundtrip);
  g_test_add_func ("/fw/model/params/canonical-order-format", test_canonical_order_format);
  g_test_add_func ("/fw/model/params/number-format", test_number_format);
  g_test_add_func ("/fw/model/params/hash", test_hash);
  g_test_add_func ("/fw/model/params/boxed", test_boxed);
  g_test_add_func ("/fw/model/params/unknown-key", test_unknown_key);
  g_test_add_func ("/fw/model/params/bad-values", test_bad_values);
  g_test_add_func ("/fw/model/params/format-and-parse-errors", test_format_and_parse_errors);
  g_test_add_func ("/fw/model/params/fft-follows-window", test_fft_follows_window);
  g_test_add_func ("/fw/model/params/check-errors", test_check_errors);
  g_test_add_func ("/fw/model/params/check-warnings", test_check_warnings);
  g_test_add_func ("/fw/model/params/fill-config", test_fill_config);
  g_test_add_func ("/fw/model/params/describe-methods", test_describe_methods);
  return g_test_run ();
}
