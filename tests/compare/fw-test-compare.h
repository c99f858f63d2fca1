/* fw-test-compare.h: helpers for the compare tests: deterministic test signals, running
 * Debian's numpy (/usr/bin/python3) when it is there, and string checks. Test-only. */
#pragma once

#include <glib.h>
#include <math.h>
#include <stdint.h>
#include <string.h>

#include "fw-matrix.h"

/* g_autoptr for the plain-C matrix in tests */
typedef FwMatrix FwTestMatrix;
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwTestMatrix, fw_matrix_unref)

#ifndef M_PI
#define M_PI 3.14159265358979323846
#endif

#define FW_TEST_PYTHON "/usr/bin/python3"

/* Deterministic uniform noise in [-1, 1) (xorshift64*, fixed seed). */
static inline double
fw_cmp_noise (uint64_t *s)
{
  *s ^= *s >> 12;
  *s ^= *s << 25;
  *s ^= *s >> 27;
  return (double) ((*s * 2685821657736338717ULL) >> 11) / 9007199254740992.0 * 2.0 - 1.0;
}

/* A beehive-like test clip: a 220 Hz hum with harmonics, fixed-seed noise ("rain"), and a
 * 440 -> 520 Hz "piping" tone that starts at onset_s. Amplitudes keep |x| < 0.9. */
static inline float *
fw_cmp_signal (size_t n, double rate, double onset_s, uint64_t seed)
{
  float *x = g_new (float, n);
  uint64_t s = seed;

  for (size_t i = 0; i < n; i++)
    {
      double t = (double) i / rate;
      double v = 0.2 * sin (2 * M_PI * 220.0 * t) + 0.08 * sin (2 * M_PI * 440.0 * t + 0.3)
                 + 0.04 * sin (2 * M_PI * 660.0 * t + 1.1) + 0.05 * fw_cmp_noise (&s);
      if (t >= onset_s)
        v += 0.3 * sin (2 * M_PI * (1500.0 * t + 40.0 * (t - onset_s) * (t - onset_s)));
      x[i] = (float) v;
    }
  return x;
}

/* TRUE when /usr/bin/python3 exists and imports numpy (cached). */
static inline gboolean
fw_cmp_have_numpy (void)
{
  static int have = -1;

  if (have < 0)
    {
      const char *argv[] = { FW_TEST_PYTHON, "-c", "import numpy", NULL };
      int status = 1;
      have = g_file_test (FW_TEST_PYTHON, G_FILE_TEST_IS_EXECUTABLE)
             && g_spawn_sync (NULL, (char **) argv, NULL, G_SPAWN_STDOUT_TO_DEV_NULL
                              | G_SPAWN_STDERR_TO_DEV_NULL, NULL, NULL, NULL, NULL, &status, NULL)
             && g_spawn_check_wait_status (status, NULL);
    }
  return have == 1;
}

/* Runs /usr/bin/python3 with the arguments (NULL-terminated); fails the test with its stderr
 * when the program fails. */
static inline void
fw_cmp_run_python (const char *const *args)
{
  g_autoptr (GPtrArray) argv = g_ptr_array_new ();
  g_autofree char *out = NULL, *err = NULL;
  g_autoptr (GError) error = NULL;
  int status = 0;

  g_ptr_array_add (argv, (char *) FW_TEST_PYTHON);
  for (const char *const *a = args; *a; a++)
    g_ptr_array_add (argv, (char *) *a);
  g_ptr_array_add (argv, NULL);
  g_assert_true (g_spawn_sync (NULL, (char **) argv->pdata, NULL, G_SPAWN_DEFAULT, NULL, NULL,
                               &out, &err, &status, &error));
  if (!g_spawn_check_wait_status (status, NULL))
    g_error ("python failed: %s\n%s", err, out);
}

/* Asserts that haystack contains needle, printing both otherwise. */
#define fw_cmp_assert_contains(haystack, needle)                                         \
  G_STMT_START                                                                           \
  {                                                                                      \
    const char *h_ = (haystack), *n_ = (needle);                                         \
    if (h_ == NULL || strstr (h_, n_) == NULL)                                           \
      g_error ("expected \"%s\" in \"%s\"", n_, h_ ? h_ : "(null)");                     \
  }                                                                                      \
  G_STMT_END
