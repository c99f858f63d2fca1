/* fw-cli-render.c: framewise-cli render and figure-recipe.
 *
 *   framewise-cli render CLIP [--params FILE] [--set KEY=VALUE]... [--rows LIST]
 *                 [--width-mm W] [--height-mm H] [--dpi D] [--font "Family Size"]
 *                 [--colour-scale NAME] [--range auto|locked|MIN:MAX] [--start S] [--end S]
 *                 [--freq-scale linear|log|mel] [--spectrum whole|T|S:E] ... -o OUT
 *   framewise-cli render --project PROJECT --clip N --params NAME [...] -o OUT
 *   framewise-cli render --list-colour-scales
 *   framewise-cli render CLIP [--params FILE] --methods
 *   framewise-cli figure-recipe FILE [--raw]
 *
 * Exit status 0 on success, 2 with a message naming the file or setting on any error.
 */
#include "fw-config.h"

#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-cli.h"
#include "fw-colour-scale.h"
#include "fw-export.h"
#include "fw-feature.h"
#include "fw-figure.h"
#include "fw-params.h"
#include "fw-project.h"
#include "fw-recipe.h"

#define DEFAULT_ROWS "waveform,db,mel-db,mfcc"

/* LeakSanitizer: fontconfig (under Pango) keeps its caches for the life of the process by
 * design; in the -Db_sanitize=address build they would be reported at exit. The sanitizer's
 * documented hook for built-in suppressions; never called in other builds. */
const char *__lsan_default_suppressions (void);
const char *
__lsan_default_suppressions (void)
{
  return "leak:libfontconfig.so\n";
}

/* A number option given as text (so that errors can name it); C locale. */
static gboolean
parse_number (const char *option, const char *text, double *out)
{
  char *end = NULL;
  double v;

  errno = 0;
  v = g_ascii_strtod (text, &end);
  if (end == text || *end != '\0' || errno != 0 || !isfinite (v))
    {
      fw_cli_error (_("%s \"%s\": not a number"), option, text);
      return FALSE;
    }
  *out = v;
  return TRUE;
}

static void
list_colour_scales (void)
{
  size_t n;
  const FwColourScale *const *list = fw_colour_scale_list (&n);

  for (size_t i = 0; i < n; i++)
    printf ("%-10s %-11s %s\n", fw_colour_scale_get_name (list[i]),
            fw_colour_scale_get_kind (list[i]) == FW_COLOUR_SCALE_DIVERGING ? _("diverging")
                                                                             : _("sequential"),
            fw_colour_scale_get_description (list[i]));
}

/* Width: a number of mm or a preset name. */
static gboolean
parse_width (const char *text, double *out)
{
  if (text == NULL)
    {
      *out = FW_FIGURE_WIDTH_SINGLE_MM;
      return TRUE;
    }
  if (g_strcmp0 (text, "single") == 0)
    {
      *out = FW_FIGURE_WIDTH_SINGLE_MM;
      return TRUE;
    }
  if (g_strcmp0 (text, "double") == 0)
    {
      *out = FW_FIGURE_WIDTH_DOUBLE_MM;
      return TRUE;
    }
  if (!parse_number ("--width-mm", text, out))
    {
      fw_cli_error (_("--width-mm takes millimetres or a preset: single (%g mm), double (%g mm)"),
                    FW_FIGURE_WIDTH_SINGLE_MM, FW_FIGURE_WIDTH_DOUBLE_MM);
      return FALSE;
    }
  return TRUE;
}

/* Adds the spectrum panel: from the first spectral row, or a db matrix computed for it. */
static gboolean
add_spectrum (FwFigure *fig, const char *spec, FwAudio *audio, FwParams *params,
              double duration, GError **error)
{
  FwSpectrumPanelMode mode;
  double t0 = 0, t1 = 0;
  FwMatrix *m = NULL;
  FwStage stage = FW_STAGE_DB;
  g_auto (GStrv) parts = NULL;

  if (g_strcmp0 (spec, "whole") == 0)
    mode = FW_SPECTRUM_PANEL_WHOLE;
  else
    {
      char *end = NULL;
      parts = g_strsplit (spec, ":", 3);
      t0 = g_ascii_strtod (parts[0], &end);
      if (end == parts[0] || *end != '\0')
        goto bad;
      if (parts[1] == NULL)
        mode = FW_SPECTRUM_PANEL_FRAME;
      else
        {
          if (parts[2] != NULL)
            goto bad;
          t1 = g_ascii_strtod (parts[1], &end);
          if (end == parts[1] || *end != '\0' || !(t1 > t0))
            goto bad;
          mode = FW_SPECTRUM_PANEL_RANGE;
        }
      if (t0 < 0 || t0 > duration)
        {
          g_set_error (error, G_OPTION_ERROR, G_OPTION_ERROR_BAD_VALUE,
                       _("--spectrum \"%s\": time %g s is outside the clip (0 to %g s)"), spec, t0,
                       duration);
          return FALSE;
        }
    }

  for (size_t i = 0; i < fw_figure_get_n_rows (fig); i++)
    {
      FwStage s = fw_figure_row_stage (fig, i);
      if (s == FW_STAGE_SPECTRUM || s == FW_STAGE_DB || s == FW_STAGE_MEL || s == FW_STAGE_MEL_DB)
        {
          m = fw_matrix_ref (fw_figure_row_matrix (fig, i));
          stage = s;
          break;
        }
    }
  if (m == NULL)
    {
      m = fw_feature_compute (audio, params, FW_STAGE_DB, (int) MIN (g_get_num_processors (), 4),
                              NULL, NULL, NULL, error);
      if (m == NULL)
        return FALSE;
    }
  fw_figure_set_spectrum (fig, stage, m, mode, t0, t1);
  fw_matrix_unref (m);
  return TRUE;

bad:
  g_set_error (error, G_OPTION_ERROR, G_OPTION_ERROR_BAD_VALUE,
               _("--spectrum \"%s\": expected whole, a time T (one frame) or S:E (a time range, "
                 "S < E), in seconds"),
               spec);
  return FALSE;
}

int
fw_cli_render (int argc, char **argv)
{
  g_autofree char *params_opt = NULL, *project_path = NULL, *clip_opt = NULL;
  g_autofree char *rows = NULL, *width_opt = NULL, *height_opt = NULL, *dpi_opt = NULL;
  g_autofree char *font = NULL, *scale_name = NULL, *range_opt = NULL;
  g_autofree char *start_opt = NULL, *end_opt = NULL, *output = NULL, *title = NULL;
  g_autofree char *freq_opt = NULL, *spectrum_opt = NULL, *theme_opt = NULL;
  g_autofree char *mel_labels = NULL, *amplitude_opt = NULL;
  g_auto (GStrv) settings = NULL;
  gboolean list_scales = FALSE, methods = FALSE, no_letters = FALSE, no_caption = FALSE;
  /* formatted here, not concatenated inside N_(): xgettext would cut the message at the macro */
  g_autofree char *rows_help =
    g_strdup_printf (_("Rows from top to bottom, comma-separated: waveform and stage names "
                       "(default %s)"), DEFAULT_ROWS);
  GOptionEntry entries[] = {
    { "params", 'p', 0, G_OPTION_ARG_STRING, &params_opt,
      N_("Parameter file (with a CLIP), or a parameter set's name (with --project)"),
      N_("FILE|NAME") },
    { "set", 's', 0, G_OPTION_ARG_STRING_ARRAY, &settings,
      N_("Change one parameter, applied in order after --params (repeatable)"), N_("KEY=VALUE") },
    { "project", 0, 0, G_OPTION_ARG_FILENAME, &project_path,
      N_("Take the clip and parameter set from a project file"), N_("PROJECT") },
    { "clip", 'c', 0, G_OPTION_ARG_STRING, &clip_opt,
      N_("With --project: the clip, by 1-based number, file name or path"), N_("N") },
    { "rows", 'r', 0, G_OPTION_ARG_STRING, &rows,
      rows_help, N_("LIST") },
    { "width-mm", 'w', 0, G_OPTION_ARG_STRING, &width_opt,
      N_("Figure width in mm, or single (85 mm) or double (175 mm); default single"), N_("W") },
    { "height-mm", 'H', 0, G_OPTION_ARG_STRING, &height_opt,
      N_("Figure height in mm (default: natural height for the rows)"), N_("H") },
    { "dpi", 'd', 0, G_OPTION_ARG_STRING, &dpi_opt,
      N_("Pixels per inch: PNG size, and the heatmap images inside SVG and PDF (default 300)"),
      N_("D") },
    { "font", 'f', 0, G_OPTION_ARG_STRING, &font,
      N_("Font family and size in points, e.g. \"DejaVu Serif 8\" (default \"Sans 7\")"),
      N_("FONT") },
    { "colour-scale", 0, 0, G_OPTION_ARG_STRING, &scale_name,
      N_("Colour scale for heatmaps (see --list-colour-scales)"), N_("NAME") },
    { "range", 0, 0, G_OPTION_ARG_STRING, &range_opt,
      N_("Heatmap value range: auto (per row), locked (shared by rows of one quantity) or "
         "MIN:MAX"),
      N_("RANGE") },
    { "start", 0, 0, G_OPTION_ARG_STRING, &start_opt, N_("Start time in seconds (default 0)"),
      N_("S") },
    { "end", 0, 0, G_OPTION_ARG_STRING, &end_opt,
      N_("End time in seconds (default: the clip's end)"), N_("S") },
    { "freq-scale", 0, 0, G_OPTION_ARG_STRING, &freq_opt,
      N_("Frequency axis of linear-frequency rows: linear, log or mel (default linear)"),
      N_("SCALE") },
    { "mel-labels", 0, 0, G_OPTION_ARG_STRING, &mel_labels,
      N_("Label mel-band rows in hz (default) or by band index"), N_("hz|band") },
    { "amplitude", 0, 0, G_OPTION_ARG_STRING, &amplitude_opt,
      N_("Waveform amplitude axis: linear (default) or dbfs"), N_("SCALE") },
    { "spectrum", 0, 0, G_OPTION_ARG_STRING, &spectrum_opt,
      N_("Add a spectrum panel: whole (clip average), T (one frame) or S:E (time range)"),
      N_("WHICH") },
    { "title", 't', 0, G_OPTION_ARG_STRING, &title, N_("Title above the rows"), N_("TEXT") },
    { "theme", 0, 0, G_OPTION_ARG_STRING, &theme_opt, N_("light (default) or dark"),
      N_("THEME") },
    { "no-letters", 0, 0, G_OPTION_ARG_NONE, &no_letters, N_("No panel letters (a), (b), ..."),
      NULL },
    { "no-caption", 0, 0, G_OPTION_ARG_NONE, &no_caption,
      N_("No caption line (clip, parameter set, hash)"), NULL },
    { "methods", 0, 0, G_OPTION_ARG_NONE, &methods,
      N_("Print a methods sentence describing the parameters"), NULL },
    { "list-colour-scales", 0, 0, G_OPTION_ARG_NONE, &list_scales,
      N_("List the colour scales and exit"), NULL },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output,
      N_("Write the figure to OUT (.svg, .pdf or .png)"), N_("OUT") },
    { NULL }
  };
  g_autoptr (GOptionContext) ctx = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwParams) params = NULL;
  g_autoptr (FwAudio) audio = NULL;
  g_autoptr (FwProject) project = NULL;
  g_autoptr (FwFigure) fig = NULL;
  g_autofree char *set_name = NULL;
  g_autofree char *clip_path = NULL;
  const char *command = argv[0];
  FwExportSettings es;
  double duration, t0 = 0, t1 = 0;

  ctx = fw_cli_option_context_new (_("[CLIP]"),
                      _("Draws a publication figure: time-aligned rows (waveform, spectrograms, "
                        "MFCC, deltas, descriptors) with colour bars, as SVG, PDF or PNG with the "
                        "parameters embedded (read them back with figure-recipe)."),
                      entries);
  if (!fw_cli_parse_options (ctx, command, &argc, &argv))
    return FW_CLI_EXIT_ERROR;

  if (list_scales)
    {
      list_colour_scales ();
      return FW_CLI_EXIT_OK;
    }

  fw_export_settings_init (&es);
  es.width_mm = FW_FIGURE_WIDTH_SINGLE_MM;

  /* ---- check every option before any work ---- */
  if (!parse_width (width_opt, &es.width_mm))
    return FW_CLI_EXIT_ERROR;
  if (height_opt && !parse_number ("--height-mm", height_opt, &es.height_mm))
    return FW_CLI_EXIT_ERROR;
  if (height_opt && es.height_mm <= 0)
    {
      fw_cli_error (_("--height-mm \"%s\": must be positive"), height_opt);
      return FW_CLI_EXIT_ERROR;
    }
  if (dpi_opt && !parse_number ("--dpi", dpi_opt, &es.dpi))
    return FW_CLI_EXIT_ERROR;
  if (theme_opt)
    {
      FwThemeVariant v;
      if (!fw_theme_variant_from_name (theme_opt, &v))
        {
          fw_cli_error (_("--theme \"%s\": expected light or dark"), theme_opt);
          return FW_CLI_EXIT_ERROR;
        }
      fw_theme_init (&es.theme, v);
    }
  if (font && !fw_theme_set_font (&es.theme, font, &error))
    {
      fw_cli_error ("--font: %s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  if (scale_name && fw_colour_scale_get (scale_name) == NULL)
    {
      g_autofree char *names = fw_colour_scale_names ();
      fw_cli_error (_("--colour-scale \"%s\": unknown; choose one of %s"), scale_name, names);
      return FW_CLI_EXIT_ERROR;
    }
  if (range_opt && g_strcmp0 (range_opt, "auto") != 0 && g_strcmp0 (range_opt, "locked") != 0)
    {
      FwValueRange r;
      if (!fw_value_range_parse (range_opt, &r, &error))
        {
          fw_cli_error (_("--range: %s (or auto, locked)"), error->message);
          return FW_CLI_EXIT_ERROR;
        }
    }
  if (freq_opt)
    {
      FwAxisScale s;
      if (!fw_axis_scale_from_name (freq_opt, &s))
        {
          fw_cli_error (_("--freq-scale \"%s\": expected linear, log or mel"), freq_opt);
          return FW_CLI_EXIT_ERROR;
        }
    }
  if (mel_labels && g_strcmp0 (mel_labels, "hz") != 0 && g_strcmp0 (mel_labels, "band") != 0)
    {
      fw_cli_error (_("--mel-labels \"%s\": expected hz or band"), mel_labels);
      return FW_CLI_EXIT_ERROR;
    }
  if (amplitude_opt)
    {
      FwAmplitudeScale a;
      if (!fw_amplitude_scale_from_name (amplitude_opt, &a))
        {
          fw_cli_error (_("--amplitude \"%s\": expected linear or dbfs"), amplitude_opt);
          return FW_CLI_EXIT_ERROR;
        }
    }
  if (start_opt && !parse_number ("--start", start_opt, &t0))
    return FW_CLI_EXIT_ERROR;
  if (end_opt && !parse_number ("--end", end_opt, &t1))
    return FW_CLI_EXIT_ERROR;
  if (t0 < 0)
    {
      fw_cli_error (_("--start %s: must be 0 or later"), start_opt);
      return FW_CLI_EXIT_ERROR;
    }
  if (end_opt && !(t1 > t0))
    {
      fw_cli_error (_("--end %s: must be later than --start (%g s)"), end_opt, t0);
      return FW_CLI_EXIT_ERROR;
    }
  if (output)
    {
      if (!fw_export_format_from_path (output, &es.format, &error))
        {
          fw_cli_error ("-o: %s", error->message);
          return FW_CLI_EXIT_ERROR;
        }
    }
  else if (!methods)
    {
      g_autofree char *help = g_option_context_get_help (ctx, TRUE, NULL);
      fw_cli_error (_("%s: the output file is missing: add -o OUT.svg, OUT.pdf or OUT.png"),
                    command);
      fprintf (stderr, "%s", help);
      return FW_CLI_EXIT_ERROR;
    }

  /* ---- clip and parameters ---- */
  if (project_path)
    {
      FwClip *clip;
      FwParamSet *set;
      int channel;

      if (argc > 1)
        {
          fw_cli_error (_("%s: give the clip with --clip when using --project, not as \"%s\""),
                        command, argv[1]);
          return FW_CLI_EXIT_ERROR;
        }
      if (clip_opt == NULL || params_opt == NULL)
        {
          fw_cli_error (_("%s: --project needs --clip N and --params NAME"), command);
          return FW_CLI_EXIT_ERROR;
        }
      project = fw_project_load (project_path, &error);
      if (project == NULL)
        {
          fw_cli_error ("%s", error->message);
          return FW_CLI_EXIT_ERROR;
        }
      clip = NULL;
      {
        char *end = NULL;
        long idx = strtol (clip_opt, &end, 10);
        GListModel *clips = fw_project_get_clips (project);
        if (end != clip_opt && *end == '\0')
          {
            if (idx < 1 || (guint) idx > g_list_model_get_n_items (clips))
              {
                fw_cli_error (_("--clip %s: %s has clips 1 to %u"), clip_opt, project_path,
                              g_list_model_get_n_items (clips));
                return FW_CLI_EXIT_ERROR;
              }
            clip = g_list_model_get_item (clips, (guint) idx - 1);
            g_object_unref (clip); /* the project keeps it */
          }
        else
          clip = fw_project_find_clip (project, clip_opt);
      }
      if (clip == NULL)
        {
          fw_cli_error (_("--clip \"%s\": no such clip in %s"), clip_opt, project_path);
          return FW_CLI_EXIT_ERROR;
        }
      set = fw_project_find_param_set (project, params_opt);
      if (set == NULL)
        {
          GListModel *sets = fw_project_get_param_sets (project);
          GString *names = g_string_new (NULL);
          for (guint i = 0; i < g_list_model_get_n_items (sets); i++)
            {
              g_autoptr (FwParamSet) s = g_list_model_get_item (sets, i);
              g_string_append_printf (names, "%s\"%s\"", i ? ", " : "", fw_param_set_get_name (s));
            }
          fw_cli_error (_("--params \"%s\": no such parameter set in %s (it has %s)"), params_opt,
                        project_path, names->str);
          g_string_free (names, TRUE);
          return FW_CLI_EXIT_ERROR;
        }
      params = fw_params_ref (fw_param_set_get_params (set));
      if (settings && settings[0])
        {
          FwParams *p = fw_params_with_settings (params, (const char *const *) settings, &error);
          if (p == NULL)
            {
              fw_cli_error ("--set: %s", error->message);
              return FW_CLI_EXIT_ERROR;
            }
          fw_params_unref (params);
          params = p;
          set_name = g_strdup_printf (_("%s, changed by --set"), fw_param_set_get_name (set));
        }
      else
        set_name = g_strdup (fw_param_set_get_name (set));
      channel = fw_clip_get_channel (clip);
      if (channel == FW_CLIP_CHANNEL_FROM_PARAMS)
        channel = fw_params_get_channel (params);
      clip_path = g_strdup (fw_clip_get_path (clip));
      audio = fw_clip_load_audio (clip, channel, fw_params_get_sample_rate (params), NULL, &error);
      if (audio == NULL)
        {
          fw_cli_error ("%s", error->message);
          return FW_CLI_EXIT_ERROR;
        }
    }
  else
    {
      if (clip_opt)
        {
          fw_cli_error (_("%s: --clip needs --project; give a clip file as the argument"),
                        command);
          return FW_CLI_EXIT_ERROR;
        }
      if (argc > 2)
        {
          fw_cli_error (_("%s: one CLIP only (got \"%s\" as well)"), command, argv[2]);
          return FW_CLI_EXIT_ERROR;
        }
      params = fw_cli_load_params (params_opt, settings, &error);
      if (params == NULL)
        {
          fw_cli_error ("%s", error->message);
          return FW_CLI_EXIT_ERROR;
        }
      if (argc < 2)
        {
          if (methods && output == NULL && fw_params_get_sample_rate (params) > 0)
            {
              g_autofree char *text =
                fw_params_describe_methods (params, fw_params_get_sample_rate (params));
              printf ("%s\n", text);
              return FW_CLI_EXIT_OK;
            }
          fw_cli_error (methods && output == NULL
                          ? _("%s: --methods needs a CLIP (the parameters keep the file's "
                              "sample rate) or parameters with sample_rate set")
                          : _("%s: a CLIP is needed (or --project with --clip and --params)"),
                        command);
          return FW_CLI_EXIT_ERROR;
        }
      clip_path = g_strdup (argv[1]);
      audio = fw_feature_load_audio (clip_path, params, NULL, &error);
      if (audio == NULL)
        {
          fw_cli_error ("%s", error->message);
          return FW_CLI_EXIT_ERROR;
        }
    }

  if (methods)
    {
      g_autofree char *text = fw_params_describe_methods (params, audio->sample_rate);
      printf ("%s\n", text);
      if (output == NULL)
        return FW_CLI_EXIT_OK;
    }

  duration = (double) audio->n_samples / audio->sample_rate;
  if (t0 >= duration)
    {
      fw_cli_error (_("--start %s: the clip %s lasts only %.3f s"), start_opt, clip_path, duration);
      return FW_CLI_EXIT_ERROR;
    }
  if (!end_opt)
    t1 = duration;
  else if (t1 > duration + 1e-9)
    {
      fw_cli_error (_("--end %s: the clip %s lasts only %.3f s"), end_opt, clip_path, duration);
      return FW_CLI_EXIT_ERROR;
    }

  /* ---- the figure ---- */
  fig = fw_figure_new ();
  fw_figure_set_source (fig, clip_path, set_name, params, audio->sample_rate);
  fw_figure_set_title (fig, title);
  fw_figure_set_letters (fig, !no_letters);
  fw_figure_set_caption (fig, !no_caption);
  fw_figure_set_time_range (fig, t0, t1);
  if (!fw_figure_add_rows (fig, rows ? rows : DEFAULT_ROWS, audio, params, NULL, &error))
    {
      fw_cli_error ("--rows: %s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  if (freq_opt)
    {
      FwAxisScale s;
      fw_axis_scale_from_name (freq_opt, &s);
      fw_figure_set_freq_scale (fig, s);
    }
  if (mel_labels)
    fw_figure_set_band_index (fig, g_strcmp0 (mel_labels, "band") == 0);
  if (amplitude_opt)
    fw_amplitude_scale_from_name (amplitude_opt, &fw_figure_waveform_spec (fig)->amplitude);
  if (scale_name)
    {
      const FwColourScale *s = fw_colour_scale_get (scale_name);
      /* a sequential choice applies to sequential rows; a diverging one to every heatmap row */
      if (fw_colour_scale_get_kind (s) == FW_COLOUR_SCALE_DIVERGING)
        for (size_t i = 0; i < fw_figure_get_n_rows (fig); i++)
          {
            FwHeatmapSpec *hs = fw_figure_row_heatmap_spec (fig, i);
            if (fw_figure_row_kind (fig, i) == FW_ROW_HEATMAP)
              hs->scale = s;
          }
      else
        fw_figure_set_colour_scale (fig, s);
    }
  if (range_opt && g_strcmp0 (range_opt, "locked") == 0)
    fw_figure_set_range (fig, FW_RANGE_LOCKED, NULL);
  else if (range_opt && g_strcmp0 (range_opt, "auto") != 0)
    {
      FwValueRange r;
      fw_value_range_parse (range_opt, &r, NULL);
      fw_figure_set_range (fig, FW_RANGE_FIXED, &r);
    }
  if (spectrum_opt && !add_spectrum (fig, spectrum_opt, audio, params, duration, &error))
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }

  if (!fw_export_resolve (fig, &es, &error))
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  if (!fw_export_figure (fig, &es, output, &error))
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  if (es.format == FW_EXPORT_PNG)
    printf (_("Wrote %s: %g x %g mm, %d x %d pixels at %g dpi, %zu rows, parameter hash %s\n"),
            output, es.width_mm, es.height_mm, fw_export_pixels (es.width_mm, es.dpi),
            fw_export_pixels (es.height_mm, es.dpi), es.dpi, fw_figure_get_n_rows (fig),
            fw_params_get_hash (params));
  else
    printf (_("Wrote %s: %g x %g mm, %zu rows, parameter hash %s\n"), output, es.width_mm,
            es.height_mm, fw_figure_get_n_rows (fig), fw_params_get_hash (params));
  return FW_CLI_EXIT_OK;
}

int
fw_cli_figure_recipe (int argc, char **argv)
{
  gboolean raw = FALSE;
  GOptionEntry entries[] = {
    { "raw", 0, 0, G_OPTION_ARG_NONE, &raw, N_("Print the embedded recipe text unchanged"),
      NULL },
    { NULL }
  };
  g_autoptr (GOptionContext) ctx = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwRecipe) recipe = NULL;
  g_autoptr (FwParams) params = NULL;
  g_autofree char *text = NULL;
  g_autofree char *rows = NULL;
  const char *command = argv[0];

  ctx = fw_cli_option_context_new (_("FILE"),
                      _("Prints the parameters embedded in a figure written by 'framewise-cli "
                        "render' (SVG, PDF or PNG): clip, parameter set, hash and rows as "
                        "comments, then the parameter text, which --params reads back."),
                      entries);
  if (!fw_cli_parse_options (ctx, command, &argc, &argv))
    return FW_CLI_EXIT_ERROR;
  if (argc != 2)
    {
      g_autofree char *help = g_option_context_get_help (ctx, TRUE, NULL);
      fw_cli_error (argc < 2 ? _("%s: a figure FILE is needed") : _("%s: one FILE only"),
                    command);
      fprintf (stderr, "%s", help);
      return FW_CLI_EXIT_ERROR;
    }

  text = fw_export_read_recipe (argv[1], &error);
  if (text == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  if (raw)
    {
      fputs (text, stdout);
      return FW_CLI_EXIT_OK;
    }
  recipe = fw_recipe_parse (text, -1, &error);
  if (recipe == NULL)
    {
      fw_cli_error ("%s: %s", argv[1], error->message);
      return FW_CLI_EXIT_ERROR;
    }
  params = fw_recipe_dup_params (recipe, &error);
  if (params == NULL)
    {
      fw_cli_error ("%s: %s", argv[1], error->message);
      return FW_CLI_EXIT_ERROR;
    }
  rows = g_strjoinv (", ", recipe->rows);
  {
    char a[G_ASCII_DTOSTR_BUF_SIZE], b[G_ASCII_DTOSTR_BUF_SIZE], r[G_ASCII_DTOSTR_BUF_SIZE];
    /* comment lines ('#') keep the output readable by --params */
    printf ("# %s %s\n", _("Figure recipe from"), argv[1]);
    printf ("# clip: %s\n", recipe->clip ? recipe->clip : "");
    if (recipe->param_set)
      printf ("# parameter_set: %s\n", recipe->param_set);
    printf ("# parameters_hash: %s (%s)\n", recipe->params_hash, _("verified"));
    printf ("# analysis_rate: %s Hz\n", g_ascii_dtostr (r, sizeof r, recipe->analysis_rate));
    printf ("# rows: %s\n", rows);
    printf ("# time: %s to %s s\n", g_ascii_dtostr (a, sizeof a, recipe->start),
            g_ascii_dtostr (b, sizeof b, recipe->end));
    if (recipe->generator)
      printf ("# generator: %s\n", recipe->generator);
  }
  fputs (fw_params_get_text (params), stdout);
  return FW_CLI_EXIT_OK;
}
