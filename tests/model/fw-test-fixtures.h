/* fw-test-fixtures.h: synthetic audio fixtures written with libsndfile into a test's own
 * temporary folder (tests never depend on files outside the repository). */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

/* A fresh folder under g_dir_make_tmp; remove it with fw_test_remove_dir. */
char *fw_test_make_dir (void);
void fw_test_remove_dir (const char *dir);

/* Write interleaved frames. `format` is an SF_FORMAT_* major|subtype combination.
 * _float writes with sf_writef_float (exact for float subtypes; for integer subtypes
 * libsndfile scales by its own rule), _int writes left-justified 32-bit integers with
 * sf_writef_int (exact for every integer subtype). Abort the test on failure. */
void fw_test_write_float (const char *path, int format, int channels, int rate,
                          const float *frames, gsize n_frames);
void fw_test_write_int (const char *path, int format, int channels, int rate,
                        const int *frames, gsize n_frames);
/* TRUE when this libsndfile build can write `format` with these channels and rate. */
gboolean fw_test_format_ok (int format, int channels, int rate);

/* amplitude * sin(2 pi f n / rate + phase), n = 0..n-1, in double, stored as float. */
float *fw_test_sine (gsize n, double rate, double freq, double amplitude, double phase);

/* A path inside dir (g_build_filename). Caller frees. */
char *fw_test_path (const char *dir, const char *name);

/* The defaults listed in issue 2, written out in canonical form by hand (the oracle for
 * fw_params_to_text and `framewise-cli params`). */
extern const char fw_test_default_params_text[];

G_END_DECLS
