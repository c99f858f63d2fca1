/* fw-cli-features.c: framewise-cli features, info and params.
 *
 *   framewise-cli features CLIP STAGE [--params FILE] [--set KEY=VALUE]... -o OUT
 *   framewise-cli info CLIP [--params FILE] [--set KEY=VALUE]...
 *   framewise-cli params [--params FILE] [--set KEY=VALUE]... [--methods]
 *
 * Exit status 0 on success, 2 with a message naming the file or key on any error.
 * Numbers meant for machines (sizes, rates, times, dB) are printed in the C locale.
 */
#include "fw-config.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include <glib/gi18n.h>
#include <glib/gprintf.h>

#include "fw-cli.h"
#include "fw-feature.h"
#include "fw-params.h"

/* ---- shared helpers --------------------------------------------------------------------- */

/* A number in the C locale; up to 16 results stay valid at once. */
static const char *
num (const char *format, double value)
{
  static char bufs[16][G_ASCII_DTOSTR_BUF_SIZE];
  static guint next;
  char *b = bufs[next++ % G_N_ELEMENTS (bufs)];

  if (isinf (value))
    return value < 0 ? "-inf" : "inf";
  if (isnan (value))
    return "nan";
  /* round first so that -0.001 prints as 0.00, not -0.00 */
  if (strcmp (format, "%.2f") == 0)
    {
      value = round (value * 100.0) / 100.0;
      if (value == 0.0)
        value = 0.0;
    }
  return g_ascii_formatd (b, G_ASCII_DTOSTR_BUF_SIZE, format, value);
}

/* A key's canonical value; up to 8 results stay valid at once. */
static const char *
value_of (const FwParams *params, const char *key)
{
  static char *values[8];
  static guint next;
  guint i = next++ % G_N_ELEMENTS (values);

  g_free (values[i]);
  values[i] = fw_params_get_value (params, key);
  return values[i];
}

static void
print_warnings (GPtrArray *warnings)
{
  for (guint i = 0; i < warnings->len; i++)
    fw_cli_error (_("warning: %s"), (const char *) g_ptr_array_index (warnings, i));
}

static void
usage_error (GOptionContext *ctx, const char *command, const char *message)
{
  g_autofree char *help = g_option_context_get_help (ctx, TRUE, NULL);

  fw_cli_error ("%s: %s", command, message);
  fprintf (stderr, "%s", help);
}

/* ---- features --------------------------------------------------------------------------- */

static int
relay_threads (void)
{
  return (int) MAX (1u, g_get_num_processors ());
}

int
fw_cli_features (int argc, char **argv)
{
  g_autofree char *params_file = NULL;
  g_autofree char *output = NULL;
  g_auto (GStrv) settings = NULL;
  int threads = 0;
  GOptionEntry entries[] = {
    { "params", 'p', 0, G_OPTION_ARG_FILENAME, &params_file,
      N_("Read the parameter set from FILE (default: the built-in defaults)"), N_("FILE") },
    { "set", 's', 0, G_OPTION_ARG_STRING_ARRAY, &settings,
      N_("Change one parameter, applied in order after --params (repeatable)"), N_("KEY=VALUE") },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output,
      N_("Write the matrix to OUT: NPY 1.0 (float32) if it ends in .npy, else CSV"), N_("OUT") },
    { "threads", 'j', 0, G_OPTION_ARG_INT, &threads,
      N_("Worker threads (default: the number of processors)"), N_("N") },
    { NULL }
  };
  g_autoptr (GOptionContext) ctx = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) params = NULL;
  g_autoptr (FwAudio) audio = NULL;
  g_autoptr (GPtrArray) warnings = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *names = g_strjoinv (", ", (char **) fw_feature_stage_names ());
  g_autofree char *summary = NULL;
  g_autofree char *label = NULL;
  FwStage stage;
  FwMatrix *m;
  const char *clip, *stage_name;

  summary = g_strdup_printf (_("Computes one stage of the analysis for a clip and writes it as a "
                               "frames x bins matrix.\nStages: %s.\nParameter keys: see "
                               "'framewise-cli params --help'."), names);
  ctx = fw_cli_option_context_new (_("CLIP STAGE"), summary, entries);
  if (!fw_cli_parse_options (ctx, argv[0], &argc, &argv))
    return FW_CLI_EXIT_ERROR;
  if (argc != 3)
    {
      usage_error (ctx, argv[0], argc < 3 ? _("a CLIP and a STAGE are needed")
                                          : _("too many arguments"));
      return FW_CLI_EXIT_ERROR;
    }
  if (output == NULL)
    {
      usage_error (ctx, argv[0], _("the output file is missing: add -o OUT"));
      return FW_CLI_EXIT_ERROR;
    }
  if (threads < 0)
    {
      fw_cli_error (_("%s: --threads must be 1 or more, not %d"), argv[0], threads);
      return FW_CLI_EXIT_ERROR;
    }
  clip = argv[1];
  stage_name = argv[2];

  if (!fw_feature_parse_stage (stage_name, &stage, &error))
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  params = fw_cli_load_params (params_file, settings, &error);
  if (params == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  if (stage == FW_STAGE_SPECTRUM &&
      g_ascii_strcasecmp (stage_name, fw_feature_stage_name (stage, params)) != 0)
    fw_cli_error (_("note: spectrum=%s, so stage '%s' gives %s values (add --set spectrum=%s "
                    "for %s)"),
                  fw_feature_stage_name (stage, params), stage_name,
                  fw_feature_stage_name (stage, params), stage_name, stage_name);

  audio = fw_feature_load_audio (clip, params, NULL, &error);
  if (audio == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  if (!fw_feature_check (audio, params, warnings, &error))
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  print_warnings (warnings);

  m = fw_feature_compute (audio, params, stage, threads > 0 ? threads : relay_threads (), NULL,
                          NULL, NULL, &error);
  if (m == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  if (!fw_feature_write (m, output, &error))
    {
      fw_cli_error ("%s", error->message);
      fw_matrix_unref (m);
      return FW_CLI_EXIT_ERROR;
    }

  label = fw_feature_quantity_label (stage, params);
  {
    g_autofree char *out_display = g_filename_display_name (output);
    g_autofree char *resampled = fw_audio_describe_resampling (audio);
    g_printf (_("%s: %s, %zu frames x %zu bins (%s), "
                "parameters %s%s%s\n"),
              out_display, fw_feature_stage_name (stage, params), m->n_frames, m->n_bins, label,
              fw_params_get_hash (params), resampled != NULL ? "; " : "",
              resampled != NULL ? resampled : "");
  }
  fw_matrix_unref (m);
  return FW_CLI_EXIT_OK;
}

/* ---- info ------------------------------------------------------------------------------- */

static void
print_sizes (const char *names, gsize frames, gsize bins, gboolean each)
{
  guint64 bytes = (guint64) frames * bins * 4;

  if (each)
    g_printf (_("    %s: %zu x %zu = %llu bytes each\n"), names, frames, bins,
              (unsigned long long) bytes);
  else
    g_printf (_("    %s: %zu x %zu = %llu bytes\n"), names, frames, bins,
              (unsigned long long) bytes);
}

int
fw_cli_info (int argc, char **argv)
{
  g_autofree char *params_file = NULL;
  g_auto (GStrv) settings = NULL;
  GOptionEntry entries[] = {
    { "params", 'p', 0, G_OPTION_ARG_FILENAME, &params_file,
      N_("Read the parameter set from FILE (default: the built-in defaults)"), N_("FILE") },
    { "set", 's', 0, G_OPTION_ARG_STRING_ARRAY, &settings,
      N_("Change one parameter, applied in order after --params (repeatable)"), N_("KEY=VALUE") },
    { NULL }
  };
  g_autoptr (GOptionContext) ctx = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) params = NULL;
  g_autoptr (FwAudio) audio = NULL;
  g_autoptr (GPtrArray) warnings = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *display = NULL;
  g_autofree char *resampled = NULL;
  FwAnalysisConfig cfg;
  FwWindowMerit merit;
  FwMelBank *bank;
  FwDspStatus status = FW_DSP_OK;
  const FwAudioInfo *fi;
  double rate, bin_hz;
  gsize frames;

  ctx = fw_cli_option_context_new (_("CLIP"), _("Prints a clip's file facts and the analysis facts that help "
                                   "to choose window and hop."), entries);
  if (!fw_cli_parse_options (ctx, argv[0], &argc, &argv))
    return FW_CLI_EXIT_ERROR;
  if (argc != 2)
    {
      usage_error (ctx, argv[0], argc < 2 ? _("a CLIP is needed") : _("too many arguments"));
      return FW_CLI_EXIT_ERROR;
    }

  params = fw_cli_load_params (params_file, settings, &error);
  if (params == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  audio = fw_feature_load_audio (argv[1], params, NULL, &error);
  if (audio == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }

  fi = &audio->info;
  display = g_filename_display_name (fi->path);
  g_printf (_("file: %s\n"), display);
  g_printf (_("  format: %s\n"), fi->format);
  g_printf (_("  encoding: %s\n"), fi->encoding);
  g_printf (_("  sample rate: %d Hz\n"), fi->sample_rate);
  g_printf (_("  channels: %d\n"), fi->channels);
  if (fi->bit_depth > 0)
    g_printf (_("  bit depth: %d\n"), fi->bit_depth);
  else
    g_printf (_("  bit depth: not applicable (%s)\n"), fi->encoding);
  g_printf (_("  duration: %s s (%lld samples per channel)\n"),
            num ("%.6f", fi->duration), (long long) fi->frames);
  g_printf (_("  peak: %s dBFS\n"), num ("%.2f", fi->peak_dbfs));
  g_printf (_("  RMS: %s dBFS (AES17: RMS in dB re full scale plus 3.01 dB, so a full-scale sine "
              "reads 0 dBFS)\n"), num ("%.2f", fi->rms_dbfs));

  if (!fw_feature_check (audio, params, warnings, &error))
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }

  rate = audio->sample_rate;
  fw_params_fill_config (params, rate, &cfg);
  bin_hz = rate / (double) cfg.fft_length;
  frames = fw_frame_count (audio->n_samples, cfg.fft_length, cfg.hop_length, cfg.centered);
  resampled = fw_audio_describe_resampling (audio);

  g_printf (_("analysis:\n"));
  if (audio->channel == 0)
    {
      if (fi->channels == 1)
        g_printf ("%s", _("  channel: mix (the file has one channel)\n"));
      else
        g_printf (_("  channel: mix (mean of %d channels)\n"), fi->channels);
    }
  else
    g_printf (_("  channel: %d of %d\n"), audio->channel, fi->channels);
  if (resampled != NULL)
    g_printf (_("  analysis rate: %s Hz (%s)\n"), num ("%.15g", rate), resampled);
  else
    g_printf (_("  analysis rate: %s Hz (the file's rate, not resampled)\n"), num ("%.15g", rate));
  g_printf (_("  samples analysed: %zu (%s s)\n"), audio->n_samples,
            num ("%.6f", audio->n_samples / rate));
  g_printf (_("  window: %s %s, %zu samples = %s ms\n"),
            value_of (params, "window_symmetry"), value_of (params, "window"),
            cfg.window_length, num ("%.2f", 1000.0 * cfg.window_length / rate));
  g_printf (_("  hop: %zu samples = %s ms, %s frames per second\n"),
            cfg.hop_length, num ("%.2f", 1000.0 * cfg.hop_length / rate),
            num ("%.2f", rate / cfg.hop_length));
  g_printf (_("  FFT: %zu points, %zu bins, %s Hz per bin\n"),
            cfg.fft_length, cfg.fft_length / 2 + 1, num ("%.4f", bin_hz));
  if (fw_window_merit (cfg.window, cfg.window_symmetry, cfg.window_length, &merit) == FW_DSP_OK)
    {
      double enbw_hz = merit.enbw_bins * rate / (double) cfg.window_length;
      g_printf (_("  equivalent noise bandwidth: %s bins = %s Hz\n"),
                num ("%.4f", enbw_hz / bin_hz), num ("%.2f", enbw_hz));
      g_printf (_("  highest sidelobe: %s dB\n"), num ("%.2f", merit.highest_sidelobe_db));
      if (cfg.fft_length == cfg.window_length)
        g_printf (_("  scalloping loss: %s dB\n"), num ("%.2f", merit.scalloping_loss_db));
      else
        g_printf (_("  scalloping loss: %s dB at half a bin of the unpadded window (%s Hz); "
                    "less at the padded FFT's bins\n"),
                  num ("%.2f", merit.scalloping_loss_db),
                  num ("%.2f", rate / (double) cfg.window_length / 2));
    }
  if (cfg.centered)
    g_printf (_("  frames: %zu (centred: %zu samples of %s "
                "padding at each end)\n"),
              frames, cfg.fft_length / 2,
              cfg.padding == FW_PADDING_ZEROS ? _("zero")
              : cfg.padding == FW_PADDING_REFLECT ? _("reflected") : _("edge-replicating"));
  else
    g_printf (_("  frames: %zu (not centred, no padding)\n"), frames);

  bank = fw_mel_bank_new (cfg.mel_scale, cfg.mel_weights, cfg.mel_bands, cfg.fmin, cfg.fmax,
                          rate, cfg.fft_length, &status);
  if (bank != NULL)
    {
      const double *edges = fw_mel_bank_edges_hz (bank);
      gsize n_edges = cfg.mel_bands + 2;
      g_printf (_("  mel bands: %zu (%s scale, %s weights) from %s to %s Hz; "
                  "band m spans edges m to m+2; edges in Hz:\n"),
                cfg.mel_bands, value_of (params, "mel_scale"),
                value_of (params, "mel_weights"), num ("%.15g", cfg.fmin),
                num ("%.15g", cfg.fmax));
      for (gsize i = 0; i < n_edges; i++)
        {
          if (i % 10 == 0)
            g_printf ("   ");
          g_printf (" %s%s", num ("%.1f", edges[i]), i + 1 < n_edges ? "," : "");
          if (i % 10 == 9 || i + 1 == n_edges)
            g_printf ("\n");
        }
      fw_mel_bank_free (bank);
    }

  g_printf (_("  feature matrix sizes (float32, frames x bins):\n"));
  print_sizes (fw_feature_stage_name (FW_STAGE_SPECTRUM, params), frames,
               fw_feature_n_bins (FW_STAGE_SPECTRUM, params), FALSE);
  print_sizes ("db", frames, fw_feature_n_bins (FW_STAGE_DB, params), FALSE);
  print_sizes ("mel, mel-db", frames, fw_feature_n_bins (FW_STAGE_MEL, params), TRUE);
  print_sizes ("mfcc, delta, delta2", frames, fw_feature_n_bins (FW_STAGE_MFCC, params), TRUE);
  print_sizes ("rms, zcr, centroid, bandwidth, rolloff, flatness", frames, 1, TRUE);

  if (warnings->len == 0)
    g_printf (_("warnings: none\n"));
  else
    {
      g_printf (_("warnings:\n"));
      for (guint i = 0; i < warnings->len; i++)
        g_printf ("  - %s\n", (const char *) g_ptr_array_index (warnings, i));
    }
  g_printf (_("parameter hash: %s\n"), fw_params_get_hash (params));
  return FW_CLI_EXIT_OK;
}

/* ---- params ----------------------------------------------------------------------------- */

int
fw_cli_params (int argc, char **argv)
{
  g_autofree char *params_file = NULL;
  g_auto (GStrv) settings = NULL;
  gboolean methods = FALSE;
  GOptionEntry entries[] = {
    { "params", 'p', 0, G_OPTION_ARG_FILENAME, &params_file,
      N_("Read the parameter set from FILE (default: the built-in defaults)"), N_("FILE") },
    { "set", 's', 0, G_OPTION_ARG_STRING_ARRAY, &settings,
      N_("Change one parameter, applied in order after --params (repeatable)"), N_("KEY=VALUE") },
    { "methods", 'm', 0, G_OPTION_ARG_NONE, &methods,
      N_("Also print a methods-section description of the parameters"), NULL },
    { NULL }
  };
  g_autoptr (GOptionContext) ctx = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) params = NULL;
  GString *keys = g_string_new (NULL);
  g_autofree char *summary = NULL;
  const char *const *names = fw_params_keys ();

  for (gsize i = 0; names[i] != NULL; i++)
    g_string_append_printf (keys, "  %-16s %s\n", names[i], fw_params_key_allowed (names[i]));
  summary = g_strdup_printf (_("Prints the canonical text of a parameter set and its hash.\n\n"
                               "Keys:\n%s"), keys->str);
  g_string_free (keys, TRUE);

  ctx = fw_cli_option_context_new ("", summary, entries);
  if (!fw_cli_parse_options (ctx, argv[0], &argc, &argv))
    return FW_CLI_EXIT_ERROR;
  if (argc != 1)
    {
      usage_error (ctx, argv[0], _("too many arguments"));
      return FW_CLI_EXIT_ERROR;
    }
  params = fw_cli_load_params (params_file, settings, &error);
  if (params == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  fputs (fw_params_get_text (params), stdout);
  g_printf ("hash: %s\n", fw_params_get_hash (params));
  if (methods)
    {
      g_autofree char *text = fw_params_describe_methods (params, 0);
      g_printf ("\n%s\n", text);
    }
  return FW_CLI_EXIT_OK;
}
