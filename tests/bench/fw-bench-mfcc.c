/* fw-bench-mfcc.c: throughput of the full MFCC chain (run by hand; not a test).
 *
 * Generates 10 minutes of deterministic 22.05 kHz audio (an apiary-like mix: a 230 Hz hive hum
 * with harmonics, repeating rising "piping" chirps, a slow falling chirp and seeded noise),
 * then times, best of several runs:
 *   - Framewise: fw_analysis_run(FW_STAGE_MFCC), defaults 2048/512, 128 Slaney mel bands,
 *     13 coefficients, with 1 and with 2 threads;
 *   - the FFTW-only floor: window multiply, fftwf r2c, |X|^2 into a scratch row and nothing
 *     else, on the same padded frames, with 1 and with 2 threads;
 *   - the same chain in numpy/scipy (tests/bench/bench_mfcc_numpy.py, run with
 *     /usr/bin/python3 on the same samples written to a temporary raw float32 file).
 * Prints throughput as multiples of real time and the ratios Framewise vs numpy and
 * Framewise vs the floor, plus the largest MFCC difference between the two implementations.
 *
 * Usage: fw-bench-mfcc [PATH/TO/bench_mfcc_numpy.py]
 */
#include <errno.h>
#include <math.h>
#include <pthread.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

#include "fw-analysis.h"
#include "fw-analysis-private.h"
#include "fw-fft.h"

#ifndef M_PI
#define M_PI 3.14159265358979323846
#endif

#ifndef FW_BENCH_NUMPY_SCRIPT
#define FW_BENCH_NUMPY_SCRIPT "tests/bench/bench_mfcc_numpy.py"
#endif

#define SAMPLE_RATE 22050.0
#define SECONDS 600
#define REPEATS 5

static double
now (void)
{
  struct timespec ts;
  clock_gettime (CLOCK_MONOTONIC, &ts);
  return (double) ts.tv_sec + 1e-9 * (double) ts.tv_nsec;
}

/* CPU time of the whole process (all threads): less sensitive than wall time to other jobs
 * sharing the machine. */
static double
cpu_now (void)
{
  struct timespec ts;
  clock_gettime (CLOCK_PROCESS_CPUTIME_ID, &ts);
  return (double) ts.tv_sec + 1e-9 * (double) ts.tv_nsec;
}

static FwAnalysisConfig
bench_config (void)
{
  FwAnalysisConfig c = {
    .sample_rate = SAMPLE_RATE,
    .pre_emphasis = 0.0,
    .window_length = 2048,
    .hop_length = 512,
    .fft_length = 2048,
    .window = FW_WINDOW_HANN,
    .window_symmetry = FW_WINDOW_PERIODIC,
    .centered = true,
    .padding = FW_PADDING_ZEROS,
    .spectrum = FW_SPECTRUM_POWER,
    .mel_bands = 128,
    .mel_scale = FW_MEL_SCALE_SLANEY,
    .fmin = 0.0,
    .fmax = SAMPLE_RATE / 2.0,
    .mel_weights = FW_MEL_WEIGHTS_AREA,
    .db_reference_max = false,
    .db_reference = 1.0,
    .db_floor = 1e-10,
    .dynamic_range = 0.0,
    .cepstral_count = 13,
    .dct_norm = FW_DCT_NORM_ORTHO,
    .lifter = 0.0,
    .delta_width = 2,
  };
  return c;
}

static float *
make_audio (size_t n)
{
  float *x = malloc (n * sizeof *x);
  uint64_t s = 0x9E3779B97F4A7C15ULL;

  if (x == NULL)
    return NULL;
  for (size_t i = 0; i < n; i++)
    {
      double t = (double) i / SAMPLE_RATE;
      double tp = fmod (t, 1.5);     /* piping: a 1.5 s rising chirp, repeated */
      double tf = fmod (t, 40.0);    /* a 40 s falling chirp, repeated */
      double v = 0.25 * sin (2 * M_PI * 230.0 * t) + 0.08 * sin (2 * M_PI * 460.0 * t)
                 + 0.04 * sin (2 * M_PI * 690.0 * t);
      v += 0.15 * sin (2 * M_PI * (400.0 * tp + 300.0 * tp * tp));
      v += 0.10 * sin (2 * M_PI * (6000.0 * tf - 70.0 * tf * tf));
      s ^= s >> 12;
      s ^= s << 25;
      s ^= s >> 27;
      v += 0.05 * ((double) ((s * 0x2545F4914F6CDD1DULL) >> 11) / 4503599627370496.0 - 1.0);
      x[i] = (float) v;
    }
  return x;
}

/* ------------------------------------------------------------ the FFTW-only floor */

typedef struct
{
  const float *padded;
  const float *window;
  const FwFftPlan *plan;
  size_t first, last;
  double checksum;
} FloorJob;

static void *
floor_worker (void *data)
{
  FloorJob *job = data;
  float *in = fw_fft_alloc_real (2048);
  fftwf_complex *out = fw_fft_alloc_complex (1025);
  float *row = malloc (1025 * sizeof (float));
  double check = 0.0;

  for (size_t t = job->first; t < job->last; t++)
    {
      const float *src = job->padded + t * 512;
      for (size_t i = 0; i < 2048; i++)
        in[i] = src[i] * job->window[i];
      fw_fft_r2c (job->plan, in, out);
      for (size_t k = 0; k < 1025; k++)
        row[k] = out[k][0] * out[k][0] + out[k][1] * out[k][1];
      check += row[t % 1025];
    }
  job->checksum = check;
  fw_fft_free (in);
  fw_fft_free (out);
  free (row);
  return NULL;
}

static double
run_floor (const float *padded, const float *window, size_t n_frames, int threads, double *cpu)
{
  FloorJob jobs[2];
  pthread_t th;
  const FwFftPlan *plan = fw_fft_plan_get (2048);
  double c0 = cpu_now (), t0 = now (), dt;

  for (int j = 0; j < threads; j++)
    {
      jobs[j].padded = padded;
      jobs[j].window = window;
      jobs[j].plan = plan;
      jobs[j].first = n_frames * (size_t) j / (size_t) threads;
      jobs[j].last = n_frames * (size_t) (j + 1) / (size_t) threads;
    }
  if (threads == 2)
    pthread_create (&th, NULL, floor_worker, &jobs[1]);
  floor_worker (&jobs[0]);
  if (threads == 2)
    pthread_join (th, NULL);
  dt = now () - t0;
  *cpu = cpu_now () - c0;
  return dt;
}

/* ------------------------------------------------------------ numpy/scipy */

static int
run_numpy (const char *script, const char *samples_path, const char *out_path, double *seconds,
           double *cpu)
{
  int fds[2];
  pid_t pid;
  char buf[512];
  ssize_t got, total = 0;
  int status;

  if (pipe (fds) != 0)
    return -1;
  pid = fork ();
  if (pid < 0)
    return -1;
  if (pid == 0)
    {
      char sr[32];
      snprintf (sr, sizeof sr, "%.1f", SAMPLE_RATE);
      dup2 (fds[1], STDOUT_FILENO);
      close (fds[0]);
      close (fds[1]);
      /* For this child only: let OpenBLAS pick its own kernels and cache sizes. */
      unsetenv ("OPENBLAS_CORETYPE");
      unsetenv ("OPENBLAS_L2_SIZE");
      execl ("/usr/bin/python3", "python3", script, samples_path, sr, out_path, "2", (char *) NULL);
      fprintf (stderr, "cannot run /usr/bin/python3: %s\n", strerror (errno));
      _exit (127);
    }
  close (fds[1]);
  while ((got = read (fds[0], buf + total, sizeof buf - 1 - (size_t) total)) > 0)
    total += got;
  buf[total] = '\0';
  close (fds[0]);
  waitpid (pid, &status, 0);
  if (!WIFEXITED (status) || WEXITSTATUS (status) != 0)
    return -1;
  {
    const char *p = strstr (buf, "seconds=");
    if (p == NULL)
      return -1;
    *seconds = strtod (p + 8, NULL);
    p = strstr (buf, "cpu=");
    *cpu = p != NULL ? strtod (p + 4, NULL) : -1.0;
  }
  return 0;
}

/* ------------------------------------------------------------ main */

int
main (int argc, char **argv)
{
  const char *script = argc > 1 ? argv[1] : FW_BENCH_NUMPY_SCRIPT;
  FwAnalysisConfig cfg = bench_config ();
  size_t n = (size_t) (SECONDS * SAMPLE_RATE);
  size_t n_frames = fw_frame_count (n, 2048, 512, true);
  float *x = make_audio (n), *padded, window[2048];
  double wd[2048], t_fw[3] = { INFINITY, INFINITY, INFINITY }, t_floor[3] = { INFINITY, INFINITY, INFINITY };
  double c_fw[3] = { INFINITY, INFINITY, INFINITY }, c_floor[3] = { INFINITY, INFINITY, INFINITY };
  double t_np = -1.0, c_np = -1.0;
  FwMatrix *m = NULL;
  size_t padded_len = 0;
  char samples_path[] = "/tmp/fw-bench-samples-XXXXXX";
  char out_path[] = "/tmp/fw-bench-mfcc-XXXXXX";
  int fd;

  if (x == NULL)
    return 1;
  printf ("Framewise MFCC benchmark: %d s of 22050 Hz audio (%zu samples, %zu frames), "
          "2048/512, periodic Hann, 128 Slaney mel bands, 13 coefficients\n",
          SECONDS, n, n_frames);

  /* Warm-up (plans, page faults), then best of REPEATS. */
  fw_analysis_run (&cfg, x, n, FW_STAGE_MFCC, 1, NULL, NULL, &m);
  fw_matrix_unref (m);
  for (int threads = 1; threads <= 2; threads++)
    for (int r = 0; r < REPEATS; r++)
      {
        double c0 = cpu_now (), t0 = now (), dt, dc;
        if (fw_analysis_run (&cfg, x, n, FW_STAGE_MFCC, threads, NULL, NULL, &m) != FW_DSP_OK)
          {
            fprintf (stderr, "fw_analysis_run failed\n");
            return 1;
          }
        dt = now () - t0;
        dc = cpu_now () - c0;
        if (dt < t_fw[threads])
          t_fw[threads] = dt;
        if (dc < c_fw[threads])
          c_fw[threads] = dc;
        if (!(threads == 2 && r == REPEATS - 1))
          {
            fw_matrix_unref (m);
            m = NULL;
          }
      }

  padded = _fw_analysis_prepare_signal (&cfg, x, n, &padded_len);
  fw_window_fill (FW_WINDOW_HANN, FW_WINDOW_PERIODIC, 2048, wd);
  for (int i = 0; i < 2048; i++)
    window[i] = (float) wd[i];
  for (int threads = 1; threads <= 2; threads++)
    for (int r = 0; r < REPEATS; r++)
      {
        double dc, dt = run_floor (padded, window, n_frames, threads, &dc);
        if (dt < t_floor[threads])
          t_floor[threads] = dt;
        if (dc < c_floor[threads])
          c_floor[threads] = dc;
      }
  free (padded);

  /* numpy/scipy on the same samples. */
  fd = mkstemp (samples_path);
  if (fd >= 0)
    {
      FILE *f = fdopen (fd, "wb");
      size_t written = fwrite (x, sizeof (float), n, f); /* little-endian hosts only */
      fclose (f);
      close (mkstemp (out_path));
      if (written == n && run_numpy (script, samples_path, out_path, &t_np, &c_np) != 0)
        t_np = -1.0;
    }

  printf ("\n%-46s %9s %12s %9s\n", "run (best of several)", "wall s", "x real time", "CPU s");
  printf ("%-46s %9.3f %12.1f %9.3f\n", "Framewise MFCC chain, 1 thread", t_fw[1], SECONDS / t_fw[1], c_fw[1]);
  printf ("%-46s %9.3f %12.1f %9.3f\n", "Framewise MFCC chain, 2 threads", t_fw[2], SECONDS / t_fw[2], c_fw[2]);
  printf ("%-46s %9.3f %12.1f %9.3f\n", "FFTW-only floor (win, r2c, |X|^2), 1 thread", t_floor[1],
          SECONDS / t_floor[1], c_floor[1]);
  printf ("%-46s %9.3f %12.1f %9.3f\n", "FFTW-only floor (win, r2c, |X|^2), 2 threads", t_floor[2],
          SECONDS / t_floor[2], c_floor[2]);
  if (t_np > 0)
    printf ("%-46s %9.3f %12.1f %9.3f\n", "numpy/scipy chain (best of 2)", t_np, SECONDS / t_np, c_np);
  else
    printf ("%-46s %9s\n", "numpy/scipy chain", "FAILED (see stderr)");

  {
    double best = t_fw[1] < t_fw[2] ? t_fw[1] : t_fw[2];
    int best_threads = t_fw[1] < t_fw[2] ? 1 : 2;
    printf ("\nratios, wall time (Framewise best = %d thread%s, %.3f s):\n", best_threads,
            best_threads > 1 ? "s" : "", best);
    if (t_np > 0)
      printf ("  Framewise vs numpy/scipy:     %.1fx faster (target >= 20x)\n", t_np / best);
    printf ("  Framewise vs FFTW-only floor: %.2fx the floor's time at the same thread count "
            "(1 thread %.2fx, 2 threads %.2fx; target <= 2x)\n",
            best / t_floor[best_threads], t_fw[1] / t_floor[1], t_fw[2] / t_floor[2]);
    printf ("ratios, CPU time (insensitive to other jobs on the machine):\n");
    if (c_np > 0)
      printf ("  numpy/scipy CPU / Framewise 1-thread CPU: %.1fx\n", c_np / c_fw[1]);
    printf ("  Framewise 1-thread CPU / floor 1-thread CPU: %.2fx\n", c_fw[1] / c_floor[1]);
  }

  /* The two implementations must agree, or the comparison means nothing. */
  if (t_np > 0 && m != NULL)
    {
      FILE *f = fopen (out_path, "rb");
      float *c = malloc (m->n_frames * 13 * sizeof (float));
      if (f != NULL && c != NULL && fread (c, sizeof (float), m->n_frames * 13, f) == m->n_frames * 13)
        {
          double worst = 0.0, worst_c0 = 0.0;
          for (size_t i = 0; i < m->n_frames * 13; i++)
            {
              double d = fabs ((double) c[i] - (double) m->data[i]);
              if (i % 13 == 0)
                worst_c0 = fmax (worst_c0, d);
              else
                worst = fmax (worst, d);
            }
          printf ("  agreement: max |MFCC difference| c0 %.2e, c1..c12 %.2e (same frames: %zu)\n",
                  worst_c0, worst, m->n_frames);
        }
      if (f != NULL)
        fclose (f);
      free (c);
    }
  unlink (samples_path);
  unlink (out_path);
  fw_matrix_unref (m);
  free (x);
  fw_fft_cleanup ();
  return 0;
}
