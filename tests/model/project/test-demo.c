/* test-demo.c: the built-in demo (data/demo/).
 *
 * 1. The generator is deterministic: two runs give the same bytes, equal to the committed
 *    files; the demo is under 3 MB.
 * 2. Each class has the property it was designed with, measured from the audio with the
 *    analysis pipeline. The thresholds are the demo's own design targets (stated in
 *    src/cli/fw-demo-generate.c), not published values; where a textbook fact is used it is
 *    named beside the check.
 * 3. The colony story: calm and agitated hums are confusable with the "short-window" set and
 *    separable with the "long-window" set of the demo project.
 */
#include "fw-config.h"

#include <math.h>
#include <string.h>
#include <sys/wait.h>

#include <glib/gstdio.h>

#include "fw-feature.h"
#include "fw-project.h"

static char *
make_tmp (void)
{
  g_autoptr (GError) error = NULL;
  char *dir = g_dir_make_tmp ("framewise-demo-XXXXXX", &error);

  g_assert_no_error (error);
  return dir;
}

static void
remove_tree (const char *dir)
{
  GDir *d = g_dir_open (dir, 0, NULL);
  const char *name;

  if (d == NULL)
    return;
  while ((name = g_dir_read_name (d)) != NULL)
    {
      g_autofree char *p = g_build_filename (dir, name, NULL);
      g_unlink (p);
    }
  g_dir_close (d);
  g_rmdir (dir);
}

static void
run_generator (const char *out_dir)
{
  g_autofree char *exe = g_build_filename (FW_BUILD_DIR, "src", "cli", "framewise-demo-generate",
                                           NULL);
  char *argv[] = { exe, (char *) out_dir, NULL };
  g_autoptr (GError) error = NULL;
  g_autofree char *out = NULL;
  g_autofree char *err = NULL;
  int status = 0;

  g_assert_true (g_spawn_sync (NULL, argv, NULL, G_SPAWN_DEFAULT, NULL, NULL, &out, &err,
                               &status, &error));
  g_assert_no_error (error);
  g_assert_true (WIFEXITED (status));
  g_assert_cmpint (WEXITSTATUS (status), ==, 0);
}

static int
compare_names (gconstpointer a, gconstpointer b)
{
  return g_strcmp0 (*(char *const *) a, *(char *const *) b);
}

static GPtrArray *
sorted_names (const char *dir)
{
  GPtrArray *names = g_ptr_array_new_with_free_func (g_free);
  GDir *d = g_dir_open (dir, 0, NULL);
  const char *name;

  g_assert_nonnull (d);
  while ((name = g_dir_read_name (d)) != NULL)
    if (!g_str_has_suffix (name, "~"))
      g_ptr_array_add (names, g_strdup (name));
  g_dir_close (d);
  g_ptr_array_sort (names, compare_names);
  return names;
}

static GBytes *
read_bytes (const char *path)
{
  char *data = NULL;
  gsize len = 0;

  g_assert_true (g_file_get_contents (path, &data, &len, NULL));
  return g_bytes_new_take (data, len);
}

static void
test_deterministic (void)
{
  g_autofree char *a = make_tmp ();
  g_autofree char *b = make_tmp ();
  g_autofree char *committed = g_build_filename (g_getenv ("FW_SOURCE_DIR"), "data", "demo", NULL);
  g_autoptr (GPtrArray) na = NULL;
  g_autoptr (GPtrArray) nb = NULL;
  g_autoptr (GPtrArray) nc = NULL;
  guint64 total = 0;

  run_generator (a);
  run_generator (b);
  na = sorted_names (a);
  nb = sorted_names (b);
  nc = sorted_names (committed);
  g_assert_cmpuint (na->len, ==, 21);   /* 20 clips + demo.fwproj */
  g_assert_cmpuint (nb->len, ==, na->len);
  g_assert_cmpuint (nc->len, ==, na->len);
  for (guint i = 0; i < na->len; i++)
    {
      const char *name = g_ptr_array_index (na, i);
      g_autofree char *pa = g_build_filename (a, name, NULL);
      g_autofree char *pb = g_build_filename (b, name, NULL);
      g_autofree char *pc = g_build_filename (committed, name, NULL);
      g_autoptr (GBytes) ba = read_bytes (pa);
      g_autoptr (GBytes) bb = read_bytes (pb);
      g_autoptr (GBytes) bc = read_bytes (pc);

      g_assert_cmpstr (name, ==, g_ptr_array_index (nb, i));
      g_assert_cmpstr (name, ==, g_ptr_array_index (nc, i));
      if (!g_bytes_equal (ba, bb))
        g_error ("%s differs between two runs of the generator", name);
      if (!g_bytes_equal (ba, bc))
        g_error ("%s differs from the committed data/demo/%s: regenerate with "
                 "framewise-demo-generate data/demo", name, name);
      total += g_bytes_get_size (bc);
    }
  g_test_message ("demo size: %" G_GUINT64_FORMAT " bytes", total);
  g_assert_cmpuint (total, <, 3000000);
  remove_tree (a);
  remove_tree (b);
}

/* ---- measuring ------------------------------------------------------------------------- */

static char *
demo_clip (const char *name)
{
  return g_build_filename (g_getenv ("FW_SOURCE_DIR"), "data", "demo", name, NULL);
}

static FwParams *
params_from (const char *const *settings)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (base, settings, &error);

  g_assert_no_error (error);
  return p;
}

static FwMatrix *
compute (const char *path, FwParams *params, FwStage stage, FwAudio **audio_out)
{
  g_autoptr (GError) error = NULL;
  FwAudio *audio = fw_feature_load_audio (path, params, NULL, &error);
  FwMatrix *m;

  g_assert_no_error (error);
  m = fw_feature_compute (audio, params, stage, 2, NULL, NULL, NULL, &error);
  g_assert_no_error (error);
  if (audio_out != NULL)
    *audio_out = audio;
  else
    fw_audio_unref (audio);
  return m;
}

/* Mean of the rows [from, to) of a spectrum matrix. */
static double *
mean_rows (const FwMatrix *m, gsize from, gsize to)
{
  double *mean = g_new0 (double, m->n_bins);

  for (gsize t = from; t < to; t++)
    for (gsize k = 0; k < m->n_bins; k++)
      mean[k] += fw_matrix_get (m, t, k);
  for (gsize k = 0; k < m->n_bins; k++)
    mean[k] /= (double) (to - from);
  return mean;
}

/* Frequency of the strongest bin of `power` between lo and hi Hz, refined by a parabola
 * through the log power of the peak and its neighbours (a standard interpolation; e.g.
 * J. O. Smith, "Spectral Audio Signal Processing", quadratic interpolation of spectral
 * peaks). */
static double
peak_hz (const double *power, const FwMatrix *m, double lo, double hi)
{
  double df = m->bin_value[1] - m->bin_value[0];
  gsize best = 0;
  double a, b, c, p;

  for (gsize k = 1; k + 1 < m->n_bins; k++)
    if (m->bin_value[k] >= lo && m->bin_value[k] <= hi && (best == 0 || power[k] > power[best]))
      best = k;
  g_assert_cmpuint (best, >, 0);
  a = log (power[best - 1]);
  b = log (power[best]);
  c = log (power[best + 1]);
  p = 0.5 * (a - c) / (a - 2.0 * b + c);
  return m->bin_value[best] + p * df;
}

static const char *const fine_spectrum[] = {
  "sample_rate=0", "window_length=16384", "fft_length=16384", "hop_length=2048", NULL
};

typedef struct
{
  const char *file;
  double design_f0;
} Hum;

/* Design values from src/cli/fw-demo-generate.c. */
static const Hum calm[] = {
  { "calm-colony-01.flac", 239.0 }, { "calm-colony-02.flac", 240.0 },
  { "calm-colony-03.flac", 240.5 }, { "calm-colony-04.flac", 241.5 },
};
static const Hum agitated[] = {
  { "agitated-colony-01.flac", 261.0 }, { "agitated-colony-02.flac", 262.0 },
  { "agitated-colony-03.flac", 262.5 }, { "agitated-colony-04.flac", 263.5 },
};

static void
test_hum_fundamentals (void)
{
  g_autoptr (FwParams) params = params_from (fine_spectrum);

  for (guint c = 0; c < 2; c++)
    for (guint i = 0; i < 4; i++)
      {
        const Hum *h = c == 0 ? &calm[i] : &agitated[i];
        g_autofree char *path = demo_clip (h->file);
        FwMatrix *m = compute (path, params, FW_STAGE_SPECTRUM, NULL);
        g_autofree double *mean = mean_rows (m, 0, m->n_frames);
        /* The fundamental region only (the second harmonic is above 460 Hz). */
        double f0 = peak_hz (mean, m, 150.0, 400.0);

        g_test_message ("%s: strongest low peak %.2f Hz (designed %.1f Hz)", h->file, f0,
                        h->design_f0);
        if (c == 0)
          {
            g_assert_cmpfloat (f0, >=, 230.0);
            g_assert_cmpfloat (f0, <=, 250.0);
          }
        else
          {
            g_assert_cmpfloat (f0, >=, 255.0);
            g_assert_cmpfloat (f0, <=, 280.0);
          }
        /* Within a third of a bin of the design (bins are 1 to 2.7 Hz here). */
        g_assert_cmpfloat (fabs (f0 - h->design_f0), <, 1.0);
        fw_matrix_unref (m);
      }
}

static void
test_queen_piping (void)
{
  g_autoptr (FwParams) spec = params_from (fine_spectrum);
  static const char *const rms_settings[] = {
    "sample_rate=0", "window_length=1024", "fft_length=1024", "hop_length=256", NULL
  };
  g_autoptr (FwParams) rms_params = params_from (rms_settings);

  for (guint i = 1; i <= 4; i++)
    {
      g_autofree char *name = g_strdup_printf ("queen-piping-%02u.flac", i);
      g_autofree char *path = demo_clip (name);
      FwMatrix *m = compute (path, spec, FW_STAGE_SPECTRUM, NULL);
      FwMatrix *rms = compute (path, rms_params, FW_STAGE_RMS, NULL);
      g_autofree double *mean = mean_rows (m, 0, m->n_frames);
      double f = peak_hz (mean, m, 100.0, 2000.0);
      double max = 0.0, hop = rms->hop_seconds;
      guint pulses = 0, full = 0;
      double full_seconds = 0.0;
      gssize start = -1;

      /* Pulses: runs of frames whose RMS is above half the clip's maximum. */
      for (gsize t = 0; t < rms->n_frames; t++)
        max = MAX (max, fw_matrix_get (rms, t, 0));
      for (gsize t = 0; t <= rms->n_frames; t++)
        {
          gboolean on = t < rms->n_frames && fw_matrix_get (rms, t, 0) > 0.5 * max;

          if (on && start < 0)
            {
              start = (gssize) t;
              pulses++;
            }
          else if (!on && start >= 0)
            {
              /* A pulse cut by the clip's start or end is not a whole pulse. */
              if (start > 0 && t < rms->n_frames)
                {
                  full++;
                  full_seconds += (double) (t - (gsize) start) * hop;
                }
              start = -1;
            }
        }
      g_test_message ("%s: strongest peak %.1f Hz, %u pulses, whole ones %.2f s on average",
                      name, f, pulses, full > 0 ? full_seconds / full : 0.0);
      g_assert_cmpfloat (f, >=, 400.0);
      g_assert_cmpfloat (f, <=, 500.0);
      g_assert_cmpuint (pulses, >=, 2);
      g_assert_cmpuint (full, >=, 1);
      g_assert_cmpfloat (full_seconds / full, >=, 0.6);
      g_assert_cmpfloat (full_seconds / full, <=, 1.4);
      fw_matrix_unref (m);
      fw_matrix_unref (rms);
    }
}

static double
mean_flatness (const char *name)
{
  static const char *const settings[] = { "sample_rate=0", NULL };
  g_autoptr (FwParams) params = params_from (settings);
  g_autofree char *path = demo_clip (name);
  FwMatrix *m = compute (path, params, FW_STAGE_FLATNESS, NULL);
  double sum = 0.0;

  for (gsize t = 0; t < m->n_frames; t++)
    sum += fw_matrix_get (m, t, 0);
  sum /= (double) m->n_frames;
  fw_matrix_unref (m);
  return sum;
}

static void
test_rain_on_lid (void)
{
  static const char *const settings[] = { "sample_rate=0", NULL };
  g_autoptr (FwParams) params = params_from (settings);
  double hum_max = 0.0;

  for (guint i = 0; i < 4; i++)
    {
      hum_max = MAX (hum_max, mean_flatness (calm[i].file));
      hum_max = MAX (hum_max, mean_flatness (agitated[i].file));
    }
  for (guint i = 1; i <= 4; i++)
    {
      g_autofree char *name = g_strdup_printf ("rain-on-lid-%02u.flac", i);
      g_autofree char *path = demo_clip (name);
      g_autoptr (GError) error = NULL;
      g_autoptr (FwAudio) audio = fw_feature_load_audio (path, params, NULL, &error);
      double flat = mean_flatness (name);
      double m2 = 0.0, m4 = 0.0, mean = 0.0, kurtosis;

      g_assert_no_error (error);
      for (gsize k = 0; k < audio->n_samples; k++)
        mean += audio->samples[k];
      mean /= (double) audio->n_samples;
      for (gsize k = 0; k < audio->n_samples; k++)
        {
          double d = audio->samples[k] - mean;
          m2 += d * d;
          m4 += d * d * d * d;
        }
      m2 /= (double) audio->n_samples;
      m4 /= (double) audio->n_samples;
      kurtosis = m4 / (m2 * m2);
      g_test_message ("%s: mean spectral flatness %.3f (hums at most %.4f), kurtosis %.1f",
                      name, flat, hum_max, kurtosis);
      /* Broadband: flat spectra, ten times flatter than any hum (design target). */
      g_assert_cmpfloat (flat, >, 0.2);
      g_assert_cmpfloat (flat, >, 10.0 * hum_max);
      /* Impulsive: a Gaussian has kurtosis 3 (any statistics textbook); clicks make the
       * distribution heavy-tailed. Design target: above 6. */
      g_assert_cmpfloat (kurtosis, >, 6.0);
    }
}

static void
test_passing_vehicle (void)
{
  g_autoptr (FwParams) params = params_from (fine_spectrum);

  for (guint i = 1; i <= 4; i++)
    {
      g_autofree char *name = g_strdup_printf ("passing-vehicle-%02u.flac", i);
      g_autofree char *path = demo_clip (name);
      FwMatrix *m = compute (path, params, FW_STAGE_SPECTRUM, NULL);
      g_autofree double *all = mean_rows (m, 0, m->n_frames);
      g_autofree double *head = mean_rows (m, 0, m->n_frames / 4);
      g_autofree double *tail = mean_rows (m, m->n_frames - m->n_frames / 4, m->n_frames);
      double low = 0.0, total = 0.0, f_head, f_tail;

      for (gsize k = 0; k < m->n_bins; k++)
        {
          total += all[k];
          if (m->bin_value[k] < 200.0)
            low += all[k];
        }
      f_head = peak_hz (head, m, 20.0, 100.0);
      f_tail = peak_hz (tail, m, 20.0, 100.0);
      g_test_message ("%s: %.1f %% of the power below 200 Hz; engine %.1f Hz -> %.1f Hz",
                      name, 100.0 * low / total, f_head, f_tail);
      /* Design targets: a low rumble (>= 80 % of the power below 200 Hz) whose pitch falls
       * by at least 5 Hz as the vehicle passes. */
      g_assert_cmpfloat (low / total, >=, 0.8);
      g_assert_cmpfloat (f_head - f_tail, >=, 5.0);
      fw_matrix_unref (m);
    }
}

/* The colony story. Measure: for each hum clip, the time-mean of its mel-db matrix over the
 * mel bands whose centre lies below 1 kHz (where the hum's first harmonics are), minus that
 * vector's own mean (so recording level does not count). Between = Euclidean distance of the
 * two class means; within = RMS distance of the clips to their class mean (pooled over the
 * eight clips). Ratio = between / within: below 1 the classes overlap (confusable), well
 * above 1 they are apart (separable). */
static double
separation (FwProject *demo, const char *set_name, double *between_out, double *within_out)
{
  FwParamSet *set = fw_project_find_param_set (demo, set_name);
  FwParams *params;
  double *vec[8] = { NULL };
  double mean_c[256] = { 0 }, mean_a[256] = { 0 };
  double between = 0.0, within = 0.0;
  gsize nb = 0;

  g_assert_nonnull (set);
  params = fw_param_set_get_params (set);
  for (guint i = 0; i < 8; i++)
    {
      const Hum *h = i < 4 ? &calm[i] : &agitated[i - 4];
      g_autofree char *path = demo_clip (h->file);
      FwMatrix *m = compute (path, params, FW_STAGE_MEL_DB, NULL);
      g_autofree double *mean = mean_rows (m, 0, m->n_frames);
      double level = 0.0;
      gsize n = 0;

      g_assert_cmpint (m->bin_kind, ==, FW_BIN_AXIS_MEL_BAND);
      vec[i] = g_new0 (double, m->n_bins);
      for (gsize k = 0; k < m->n_bins; k++)
        if (m->bin_value[k] < 1000.0)
          vec[i][n++] = mean[k];
      g_assert_cmpuint (n, <=, G_N_ELEMENTS (mean_c));
      g_assert_true (nb == 0 || nb == n);
      nb = n;
      for (gsize k = 0; k < n; k++)
        level += vec[i][k];
      level /= (double) n;
      for (gsize k = 0; k < n; k++)
        vec[i][k] -= level;
      for (gsize k = 0; k < n; k++)
        (i < 4 ? mean_c : mean_a)[k] += vec[i][k] / 4.0;
      fw_matrix_unref (m);
    }
  for (gsize k = 0; k < nb; k++)
    between += (mean_c[k] - mean_a[k]) * (mean_c[k] - mean_a[k]);
  for (guint i = 0; i < 8; i++)
    {
      for (gsize k = 0; k < nb; k++)
        {
          double d = vec[i][k] - (i < 4 ? mean_c : mean_a)[k];
          within += d * d;
        }
      g_free (vec[i]);
    }
  *between_out = sqrt (between);
  *within_out = sqrt (within / 8.0);
  g_test_message ("%s: %" G_GSIZE_FORMAT " bands below 1 kHz, between %.3f dB, within %.3f dB, "
                  "ratio %.3f", set_name, nb, *between_out, *within_out,
                  *between_out / *within_out);
  return *between_out / *within_out;
}

static void
test_colony_story (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwProject) demo = fw_project_load_demo (&error);
  double b, w, short_ratio, long_ratio;

  g_assert_no_error (error);
  short_ratio = separation (demo, "short-window", &b, &w);
  long_ratio = separation (demo, "long-window", &b, &w);
  /* Design targets: confusable (< 1) with 16 ms windows and 20 bands, clearly separable
   * (> 4) with 256 ms windows and 128 bands. */
  g_assert_cmpfloat (short_ratio, <, 1.0);
  g_assert_cmpfloat (long_ratio, >, 4.0);
  g_assert_cmpfloat (long_ratio, >, 4.0 * short_ratio);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/fw/project/demo/deterministic", test_deterministic);
  g_test_add_func ("/fw/project/demo/hum-fundamentals", test_hum_fundamentals);
  g_test_add_func ("/fw/project/demo/queen-piping", test_queen_piping);
  g_test_add_func ("/fw/project/demo/rain-on-lid", test_rain_on_lid);
  g_test_add_func ("/fw/project/demo/passing-vehicle", test_passing_vehicle);
  g_test_add_func ("/fw/project/demo/colony-story", test_colony_story);
  return g_test_run ();
}
