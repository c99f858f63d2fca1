/* fw-demo-generate.c: writes Framewise's built-in demo (data/demo/).
 *
 *   framewise-demo-generate OUTDIR
 *
 * The scenario: an apiary co-operative monitors its hives with cheap recorders and wants to
 * train a classifier on hive sounds. Five classes, four clips each, 3-5 s, recorded at a mix
 * of 16000, 22050 and 44100 Hz (one clip stereo), written as 16-bit FLAC, plus demo.fwproj
 * holding the clips with their labels and three parameter sets.
 *
 *   calm-colony      harmonic hum, f0 239-241.5 Hz, slow amplitude modulation (0.3-0.5 Hz)
 *   agitated-colony  the same hum at f0 261-263.5 Hz with faster modulation (2.4-3.5 Hz)
 *   queen-piping     tonal pulses of about 1 s, f0 420-470 Hz with harmonics, over a faint hum
 *   rain-on-lid      random decaying broadband clicks over broadband hiss
 *   passing-vehicle  engine rumble, f0 sweeping down from about 54 to 41 Hz as it passes,
 *                    harmonics falling off as k^-1.5, low-passed tyre noise
 *
 * The two colony classes differ by about 22 Hz in f0, about a third of a bin of a 256-sample
 * window at 16 kHz (62.5 Hz bins), and each clip has its own harmonic colouring (+-6 dB per
 * harmonic, a spectral tilt: the "cheap recorder"). With short windows and 20 mel bands the
 * class difference is smaller than that colouring; with 4096-sample windows (3.9 Hz bins) and
 * 128 mel bands the harmonics are resolved and the classes separate. The "short-window" and
 * "long-window" sets of the demo project tell that story (tests/model/project checks it).
 *
 * Determinism: the output bytes must not depend on the machine. Randomness comes from our own
 * splitmix64 generator with fixed seeds, and the synthesis uses only +, -, *, / and floor
 * (exact in IEEE 754 arithmetic) with our own sine series, never libm's sin/exp/pow, whose
 * last bits differ between implementations. The build turns off floating-point contraction
 * (-ffp-contract=off) so no fused multiply-add changes a rounding. FLAC encoding of identical
 * samples is deterministic.
 */
#include "fw-config.h"

#include <locale.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <glib/gi18n.h>
#include <glib/gstdio.h>
#include <sndfile.h>

#include "fw-project.h"

#define TWO_PI 6.283185307179586476925286766559
#define PI 3.141592653589793238462643383279
#define HALF_PI 1.570796326794896619231321691640

/* ---- deterministic arithmetic ----------------------------------------------------------- */

typedef struct
{
  guint64 state;
} Rng;

/* splitmix64 (Steele, Lea and Flood 2014). */
static guint64
rng_next (Rng *r)
{
  guint64 z = (r->state += G_GUINT64_CONSTANT (0x9E3779B97F4A7C15));

  z = (z ^ (z >> 30)) * G_GUINT64_CONSTANT (0xBF58476D1CE4E5B9);
  z = (z ^ (z >> 27)) * G_GUINT64_CONSTANT (0x94D049BB133111EB);
  return z ^ (z >> 31);
}

/* Uniform in [0, 1), 53 bits. */
static double
rng_uniform (Rng *r)
{
  return (double) (rng_next (r) >> 11) * (1.0 / 9007199254740992.0);
}

static double
rng_range (Rng *r, double lo, double hi)
{
  return lo + (hi - lo) * rng_uniform (r);
}

/* Approximately normal, unit variance: sum of four uniforms (Irwin-Hall), centred, times
 * sqrt(3). Enough for noise; no libm. */
static double
rng_noise (Rng *r)
{
  double s = rng_uniform (r) + rng_uniform (r) + rng_uniform (r) + rng_uniform (r);

  return (s - 2.0) * 1.7320508075688772;
}

/* sin(x) by range reduction and the Taylor series to x^17 (error < 1e-12 on [-pi/2, pi/2]). */
static double
det_sin (double x)
{
  double k = floor (x / TWO_PI + 0.5);
  double x2, term, sum;

  x = x - k * TWO_PI;
  if (x > HALF_PI)
    x = PI - x;
  else if (x < -HALF_PI)
    x = -PI - x;
  x2 = x * x;
  term = x;
  sum = x;
  for (int n = 1; n <= 8; n++)
    {
      term = term * (-x2) / (double) ((2 * n) * (2 * n + 1));
      sum += term;
    }
  return sum;
}

static double
wrap_phase (double phase)
{
  while (phase >= TWO_PI)
    phase -= TWO_PI;
  return phase;
}

/* Smooth step 3u^2 - 2u^3 on [0, 1]. */
static double
smooth_step (double u)
{
  if (u <= 0.0)
    return 0.0;
  if (u >= 1.0)
    return 1.0;
  return u * u * (3.0 - 2.0 * u);
}

/* Raised-cosine fade of `ramp` seconds at both ends of a pulse of `len` seconds. */
static double
pulse_envelope (double t, double len, double ramp)
{
  if (t < 0.0 || t > len)
    return 0.0;
  if (t < ramp)
    return 0.5 - 0.5 * det_sin (HALF_PI + PI * t / ramp);
  if (t > len - ramp)
    return 0.5 - 0.5 * det_sin (HALF_PI + PI * (len - t) / ramp);
  return 1.0;
}

/* ---- clips ------------------------------------------------------------------------------ */

typedef enum { CALM, AGITATED, PIPING, RAIN, VEHICLE } ClipClass;

static const char *const class_names[] = {
  "calm-colony", "agitated-colony", "queen-piping", "rain-on-lid", "passing-vehicle",
};

typedef struct
{
  ClipClass klass;
  int index;          /* 1..4 within the class */
  int rate;
  double seconds;
  int channels;
  double f0;          /* hums, piping: fundamental; vehicle: start frequency */
  double f1;          /* vehicle: end frequency */
  double mod_rate;    /* hums: AM rate in Hz; rain: clicks per second */
} ClipSpec;

static const ClipSpec specs[] = {
  { CALM, 1, 16000, 4.0, 1, 239.0, 0, 0.30 },
  { CALM, 2, 22050, 3.5, 1, 240.0, 0, 0.45 },
  { CALM, 3, 44100, 3.0, 1, 240.5, 0, 0.35 },
  { CALM, 4, 16000, 5.0, 1, 241.5, 0, 0.50 },
  { AGITATED, 1, 22050, 4.0, 1, 261.0, 0, 3.0 },
  { AGITATED, 2, 16000, 3.5, 1, 262.0, 0, 2.4 },
  { AGITATED, 3, 16000, 4.5, 1, 262.5, 0, 3.5 },
  { AGITATED, 4, 44100, 3.0, 1, 263.5, 0, 2.8 },
  { PIPING, 1, 22050, 4.0, 1, 420.0, 0, 0 },
  { PIPING, 2, 16000, 5.0, 1, 440.0, 0, 0 },
  { PIPING, 3, 44100, 3.5, 1, 455.0, 0, 0 },
  { PIPING, 4, 22050, 4.5, 1, 470.0, 0, 0 },
  { RAIN, 1, 16000, 3.0, 1, 0, 0, 18.0 },
  { RAIN, 2, 22050, 3.0, 1, 0, 0, 30.0 },
  { RAIN, 3, 16000, 4.0, 1, 0, 0, 42.0 },
  { RAIN, 4, 22050, 3.5, 1, 0, 0, 55.0 },
  { VEHICLE, 1, 22050, 5.0, 2, 54.0, 41.0, 0 },
  { VEHICLE, 2, 16000, 4.5, 1, 52.0, 40.0, 0 },
  { VEHICLE, 3, 44100, 4.0, 1, 55.0, 42.0, 0 },
  { VEHICLE, 4, 22050, 5.0, 1, 50.0, 38.0, 0 },
};

#define HUM_HARMONICS 12

/* A bee hum: 12 harmonics with this clip's colouring, a slow f0 drift of +-0.2 %, and an
 * amplitude modulation of `depth` at `mod_rate`; peak-normalised to 1. */
static void
synth_hum (Rng *r, double *x, gsize n, int rate, double f0, double mod_rate, double depth)
{
  double amp[HUM_HARMONICS], phase0[HUM_HARMONICS];
  double tilt = rng_range (r, -0.5, 0.5);
  double drift_phase = rng_range (r, 0.0, TWO_PI);
  double am_phase = rng_range (r, 0.0, TWO_PI);
  double theta = 0.0, peak = 0.0;

  for (int k = 0; k < HUM_HARMONICS; k++)
    {
      /* 1/k roll-off, +-6 dB colouring (a gain from 0.5 to 2.0), and a linear tilt. */
      amp[k] = (1.0 / (k + 1)) * rng_range (r, 0.5, 2.0)
               * (1.0 + tilt * (double) k / (HUM_HARMONICS - 1));
      phase0[k] = rng_range (r, 0.0, TWO_PI);
    }
  for (gsize i = 0; i < n; i++)
    {
      double t = (double) i / rate;
      double f = f0 * (1.0 + 0.002 * det_sin (TWO_PI * 0.13 * t + drift_phase));
      double env = 1.0 - depth * 0.5 * (1.0 + det_sin (TWO_PI * mod_rate * t + am_phase));
      double s = 0.0;

      for (int k = 0; k < HUM_HARMONICS; k++)
        s += amp[k] * det_sin ((k + 1) * theta + phase0[k]);
      x[i] = s * env;
      theta = wrap_phase (theta + TWO_PI * f / rate);
    }
  for (gsize i = 0; i < n; i++)
    peak = MAX (peak, fabs (x[i]));
  for (gsize i = 0; i < n; i++)
    x[i] /= peak;
}

static void
synth_colony (Rng *r, const ClipSpec *s, double *x, gsize n)
{
  double depth = s->klass == CALM ? 0.3 : 0.5;

  synth_hum (r, x, n, s->rate, s->f0, s->mod_rate, depth);
  for (gsize i = 0; i < n; i++)
    x[i] = 0.3 * x[i] + 0.003 * rng_noise (r);
}

/* Piping: pulses of 0.8-1.1 s separated by 0.2-0.35 s, each gliding up 2 % in pitch,
 * six harmonics, over a hum 26 dB down and faint noise. */
static void
synth_piping (Rng *r, const ClipSpec *s, double *x, gsize n)
{
  g_autofree double *hum = g_new (double, n);
  double amp[6];
  double start = rng_range (r, 0.15, 0.3);
  double len = rng_range (r, 0.8, 1.1);
  double theta = 0.0;

  synth_hum (r, hum, n, s->rate, rng_range (r, 232.0, 246.0), 0.4, 0.3);
  for (int k = 0; k < 6; k++)
    amp[k] = (1.0 / (k + 1)) * rng_range (r, 0.7, 1.3);

  for (gsize i = 0; i < n; i++)
    {
      double t = (double) i / s->rate;
      double local, env, f, v = 0.0;

      while (t > start + len + 0.05)
        {
          start = start + len + rng_range (r, 0.2, 0.35);
          len = rng_range (r, 0.8, 1.1);
        }
      local = t - start;
      env = pulse_envelope (local, len, 0.03);
      f = s->f0 * (1.0 + 0.02 * CLAMP (local / len, 0.0, 1.0));
      if (env > 0.0)
        for (int k = 0; k < 6; k++)
          v += amp[k] * det_sin ((k + 1) * theta);
      theta = wrap_phase (theta + TWO_PI * f / s->rate);
      x[i] = 0.5 * env * v + 0.025 * hum[i] + 0.002 * rng_noise (r);
    }
}

/* Rain: Poisson clicks (probability rate/sr per sample), each a burst of noise decaying with
 * a time constant of 1-4 ms, over broadband hiss and a faint hum. */
static void
synth_rain (Rng *r, const ClipSpec *s, double *x, gsize n)
{
  g_autofree double *hum = g_new (double, n);
  double p = s->mod_rate / s->rate;
  double env = 0.0, decay = 1.0;

  synth_hum (r, hum, n, s->rate, rng_range (r, 235.0, 245.0), 0.4, 0.3);
  for (gsize i = 0; i < n; i++)
    {
      if (rng_uniform (r) < p)
        {
          double tau = rng_range (r, 0.001, 0.004);

          env += rng_range (r, 0.15, 0.8);
          decay = 1.0 - 1.0 / (tau * s->rate);
        }
      x[i] = env * rng_noise (r) * 0.35 + 0.02 * rng_noise (r) + 0.01 * hum[i];
      env *= decay;
    }
}

/* Vehicle: an engine whose f0 slides from f0 to f1 as it passes (smooth step centred on the
 * clip), 12 harmonics at k^-1.5, loudest when nearest, plus low-passed tyre noise. For a
 * stereo clip the vehicle moves from left to right. */
static void
synth_vehicle (Rng *r, const ClipSpec *s, double *left, double *right, gsize n)
{
  double amp[12];
  double theta = 0.0, lp = 0.0;
  double alpha = TWO_PI * 120.0 / s->rate;   /* one-pole low-pass near 120 Hz */
  double centre = rng_range (r, 0.45, 0.55);

  for (int k = 0; k < 12; k++)
    amp[k] = rng_range (r, 0.8, 1.2) / ((k + 1) * sqrt ((double) (k + 1)));
  for (gsize i = 0; i < n; i++)
    {
      double u = (double) i / (double) n;
      double d = (u - centre) / 0.2;
      double near = 0.15 + 0.85 / (1.0 + d * d);
      double f = s->f0 + (s->f1 - s->f0) * smooth_step ((u - centre) / 0.5 + 0.5);
      double v = 0.0, sample;

      for (int k = 0; k < 12; k++)
        v += amp[k] * det_sin ((k + 1) * theta);
      theta = wrap_phase (theta + TWO_PI * f / s->rate);
      lp += alpha * (rng_noise (r) - lp);
      sample = near * (0.45 * v + 1.2 * lp) + 0.002 * rng_noise (r);
      if (right != NULL)
        {
          left[i] = sample * (1.0 - 0.7 * u);
          right[i] = sample * (0.3 + 0.7 * u);
        }
      else
        left[i] = sample;
    }
}

/* Scales to a peak of `peak`, rounds to 16 bits (half away from zero) and interleaves. */
static short *
to_pcm16 (double *const *ch, int channels, gsize n, double peak)
{
  short *pcm = g_new (short, n * channels);
  double max = 0.0;

  for (int c = 0; c < channels; c++)
    for (gsize i = 0; i < n; i++)
      max = MAX (max, fabs (ch[c][i]));
  for (int c = 0; c < channels; c++)
    for (gsize i = 0; i < n; i++)
      {
        double v = ch[c][i] / max * peak * 32767.0;
        double q = v >= 0.0 ? floor (v + 0.5) : -floor (-v + 0.5);

        pcm[i * channels + c] = (short) CLAMP (q, -32768.0, 32767.0);
      }
  return pcm;
}

static gboolean
write_flac (const char *path, const short *pcm, int channels, int rate, gsize n, GError **error)
{
  SF_INFO info = { 0 };
  SNDFILE *sf;
  sf_count_t written;

  info.samplerate = rate;
  info.channels = channels;
  info.format = SF_FORMAT_FLAC | SF_FORMAT_PCM_16;
  sf = sf_open (path, SFM_WRITE, &info);
  if (sf == NULL)
    {
      g_set_error (error, G_IO_ERROR, G_IO_ERROR_FAILED, _("Cannot write %s: %s"), path,
                   sf_strerror (NULL));
      return FALSE;
    }
  written = sf_writef_short (sf, pcm, (sf_count_t) n);
  if (written != (sf_count_t) n)
    {
      g_set_error (error, G_IO_ERROR, G_IO_ERROR_FAILED, _("Cannot write %s: %s"), path,
                   sf_strerror (sf));
      sf_close (sf);
      return FALSE;
    }
  if (sf_close (sf) != 0)
    {
      g_set_error (error, G_IO_ERROR, G_IO_ERROR_FAILED, _("Cannot finish %s"), path);
      return FALSE;
    }
  return TRUE;
}

/* Clip notes are data of the demo, in English and not translated (see main). */
static char *
clip_notes (const ClipSpec *s)
{
  const char *ch = s->channels == 2 ? "stereo" : "mono";

  switch (s->klass)
    {
    case CALM:
    case AGITATED:
      return g_strdup_printf ("Synthetic hive hum: f0 %.1f Hz, amplitude modulation at %.2f Hz. "
                              "Recorder: %d Hz, %s.", s->f0, s->mod_rate, s->rate, ch);
    case PIPING:
      return g_strdup_printf ("Synthetic queen piping: pulses of about 1 s at %.0f Hz with "
                              "harmonics, over a faint hum. Recorder: %d Hz, %s.",
                              s->f0, s->rate, ch);
    case RAIN:
      return g_strdup_printf ("Synthetic rain on the hive lid: about %.0f clicks per second "
                              "over broadband hiss. Recorder: %d Hz, %s.",
                              s->mod_rate, s->rate, ch);
    case VEHICLE:
      return g_strdup_printf ("Synthetic passing vehicle: engine f0 sliding from %.0f to "
                              "%.0f Hz with harmonics%s. Recorder: %d Hz, %s.",
                              s->f0, s->f1,
                              s->channels == 2 ? ", moving from left to right" : "",
                              s->rate, ch);
    default:
      g_assert_not_reached ();
    }
}

static gboolean
generate_clip (const char *dir, guint number, const ClipSpec *s, char **out_path, GError **error)
{
  gsize n = (gsize) (s->seconds * s->rate);
  g_autofree double *left = g_new0 (double, n);
  g_autofree double *right = s->channels == 2 ? g_new0 (double, n) : NULL;
  g_autofree short *pcm = NULL;
  g_autofree char *name = NULL;
  double *ch[2] = { left, right };
  double peak = 0.5;
  Rng r;

  /* One fixed seed per clip. */
  r.state = G_GUINT64_CONSTANT (0x46574465) * 1000003u + number;

  switch (s->klass)
    {
    case CALM:
    case AGITATED:
      synth_colony (&r, s, left, n);
      peak = 0.35;
      break;
    case PIPING:
      synth_piping (&r, s, left, n);
      peak = 0.5;
      break;
    case RAIN:
      synth_rain (&r, s, left, n);
      peak = 0.6;
      break;
    case VEHICLE:
      synth_vehicle (&r, s, left, right, n);
      peak = 0.7;
      break;
    }

  pcm = to_pcm16 (ch, s->channels, n, peak);
  name = g_strdup_printf ("%s-%02d.flac", class_names[s->klass], s->index);
  *out_path = g_build_filename (dir, name, NULL);
  return write_flac (*out_path, pcm, s->channels, s->rate, n, error);
}

static FwParams *
params_with (const char *const *settings)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (base, settings, &error);

  if (p == NULL)
    g_error ("demo parameters: %s", error->message);
  return p;
}

int
main (int argc, char **argv)
{
  g_autoptr (FwProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *dir = NULL;
  g_autofree char *project_path = NULL;
  g_autofree char *text = NULL;
  /* 16 kHz analysis for both demo sets, so every clip (16, 22.05 or 44.1 kHz) shares one
   * band layout. short-window: 16 ms windows (256 samples, 62.5 Hz bins), hop 8 ms, 20 mel
   * bands: a compact speech-style front end that blurs the two colony hums. long-window:
   * 256 ms windows (4096 samples, 3.9 Hz bins), hop 64 ms, 128 mel bands: resolves the hum
   * harmonics, so the colonies separate. */
  static const char *const short_window[] = {
    "sample_rate=16000", "window_length=256", "fft_length=256", "hop_length=128",
    "mel_bands=20", NULL
  };
  static const char *const long_window[] = {
    "sample_rate=16000", "window_length=4096", "fft_length=4096", "hop_length=1024",
    "mel_bands=128", NULL
  };
  struct { const char *name; FwParams *params; } sets[3];

  setlocale (LC_ALL, "");
  /* The demo's files are data, identical everywhere: numbers in the C locale, and the title
   * and clip notes in plain English (not translated), so the bytes never depend on the
   * user's language. Only this program's own messages are translated. */
  setlocale (LC_NUMERIC, "C");
  bindtextdomain (GETTEXT_PACKAGE, FW_LOCALEDIR);
  bind_textdomain_codeset (GETTEXT_PACKAGE, "UTF-8");
  textdomain (GETTEXT_PACKAGE);

  if (argc != 2 || g_str_equal (argv[1], "--help") || g_str_equal (argv[1], "-h"))
    {
      fprintf (argc == 2 ? stdout : stderr, "%s\n%s\n",
               _("Usage: framewise-demo-generate OUTDIR"),
               _("Writes the built-in demo (20 FLAC clips and demo.fwproj) into OUTDIR."));
      return argc == 2 ? 0 : 2;
    }
  dir = g_canonicalize_filename (argv[1], NULL);
  if (g_mkdir_with_parents (dir, 0755) != 0)
    {
      fprintf (stderr, _("framewise-demo-generate: cannot create %s\n"), dir);
      return 2;
    }

  project = fw_project_new ();
  fw_project_set_title (project, "Apiary co-operative: hive sounds (synthetic demo)");
  for (guint i = 0; i < G_N_ELEMENTS (specs); i++)
    {
      g_autofree char *path = NULL;
      g_autofree char *notes = NULL;
      g_autoptr (FwClip) clip = NULL;

      if (!generate_clip (dir, i, &specs[i], &path, &error))
        {
          fprintf (stderr, "framewise-demo-generate: %s\n", error->message);
          return 2;
        }
      clip = fw_clip_new (path);
      fw_clip_set_label (clip, class_names[specs[i].klass]);
      notes = clip_notes (&specs[i]);
      fw_clip_set_notes (clip, notes);
      fw_project_add_clip (project, clip);
    }

  sets[0].name = "defaults";
  sets[0].params = fw_params_new_default ();
  sets[1].name = "short-window";
  sets[1].params = params_with (short_window);
  sets[2].name = "long-window";
  sets[2].params = params_with (long_window);
  for (guint i = 0; i < G_N_ELEMENTS (sets); i++)
    {
      g_autoptr (FwParamSet) set = fw_param_set_new (sets[i].name, sets[i].params);

      fw_params_unref (sets[i].params);
      if (!fw_project_add_param_set (project, set, &error))
        {
          fprintf (stderr, "framewise-demo-generate: %s\n", error->message);
          return 2;
        }
    }

  project_path = g_build_filename (dir, "demo.fwproj", NULL);
  text = fw_project_to_data (project, project_path);
  if (!g_file_set_contents (project_path, text, -1, &error))
    {
      fprintf (stderr, "framewise-demo-generate: %s\n", error->message);
      return 2;
    }
  printf (_("Wrote %u clips and %s\n"), (guint) G_N_ELEMENTS (specs), project_path);
  return 0;
}
