/* fw-cli-compare.c: `framewise-cli compare` and `framewise-cli explain`.
 *
 *   compare A B [--stage STAGE] [--json] [--tolerance T] [--params FILE] [--set KEY=VALUE]...
 *               [--axis frames-bins|bins-frames] [--hop N --sample-rate SR] [--origin S]
 *               [--knobs]
 *   explain DUMP CLIP --stage STAGE [--params FILE] [--set KEY=VALUE]...
 *               [--candidates KEY=V1,V2 [KEY=V1,V2 ...]]... [--only-candidates] [--json]
 *               [--axis ...] [--hop N --sample-rate SR] [--threads N]
 *
 * An operand is a feature file (.npy or .csv) or CLIP@PARAMS_FILE (a clip analysed with the
 * parameter text file) or a plain CLIP (analysed with --params / --set, or the defaults).
 * Exit status: 0 within tolerance (compare) / an exact match found (explain), 1 beyond
 * tolerance / no exact match, 2 on bad input.
 */
#include "fw-config.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-cli.h"
#include "fw-compare.h"
#include "fw-feature.h"

typedef struct {
  char *stage_name;
  char *params_path;
  char **settings;
  char *axis;
  double hop;
  double sample_rate;
  double origin;
  gboolean json;
  char *tolerance;
  gboolean knobs;
  char **candidates;
  gboolean only_candidates;
  int threads;
} CliOptions;

static void
cli_options_clear (CliOptions *o)
{
  g_free (o->stage_name);
  g_free (o->params_path);
  g_strfreev (o->settings);
  g_free (o->axis);
  g_free (o->tolerance);
  g_strfreev (o->candidates);
}

static gboolean
is_feature_file (const char *arg)
{
  g_autofree char *low = g_ascii_strdown (arg, -1);
  return g_str_has_suffix (low, ".npy") || g_str_has_suffix (low, ".csv");
}

static gboolean
file_options (const CliOptions *o, FwFeatureFileOptions *fo, GError **error)
{
  fw_feature_file_options_init (fo);
  if (o->axis && !fw_feature_axes_from_name (o->axis, &fo->axes))
    {
      g_set_error (error, G_OPTION_ERROR, G_OPTION_ERROR_BAD_VALUE,
                   _("--axis %s: expected frames-bins or bins-frames"), o->axis);
      return FALSE;
    }
  if ((o->hop > 0) != (o->sample_rate > 0))
    {
      g_set_error (error, G_OPTION_ERROR, G_OPTION_ERROR_BAD_VALUE,
                   _("--hop and --sample-rate go together (the frame rate of a feature file); "
                     "give both, or neither for \"same grid as the other side\""));
      return FALSE;
    }
  if (o->hop < 0 || o->sample_rate < 0 || !isfinite (o->origin))
    {
      g_set_error (error, G_OPTION_ERROR, G_OPTION_ERROR_BAD_VALUE,
                   _("--hop and --sample-rate must be positive"));
      return FALSE;
    }
  fo->hop_length = o->hop;
  fo->sample_rate = o->sample_rate;
  fo->time_origin = o->origin;
  return TRUE;
}

static FwCompareOperand *
parse_operand (const char *arg, const CliOptions *o, FwStage stage, GError **error)
{
  const char *at;
  g_autofree char *clip = NULL;
  g_autoptr (FwParams) params = NULL;

  if (is_feature_file (arg))
    {
      FwFeatureFileOptions fo;
      if (!file_options (o, &fo, error))
        return NULL;
      return fw_compare_operand_new_file (arg, &fo, stage);
    }
  at = strrchr (arg, '@');
  if (at != NULL && !g_file_test (arg, G_FILE_TEST_EXISTS))
    {
      clip = g_strndup (arg, at - arg);
      if (at[1] == '\0' || clip[0] == '\0')
        {
          g_set_error (error, G_OPTION_ERROR, G_OPTION_ERROR_BAD_VALUE,
                       _("Operand '%s': expected CLIP@PARAMS_FILE"), arg);
          return NULL;
        }
      params = fw_cli_load_params (at + 1, o->settings, error);
    }
  else
    {
      clip = g_strdup (arg);
      params = fw_cli_load_params (o->params_path, o->settings, error);
    }
  if (params == NULL)
    return NULL;
  if (stage < 0)
    {
      g_set_error (error, G_OPTION_ERROR, G_OPTION_ERROR_BAD_VALUE,
                   _("Operand '%s' is a clip: say which stage to compute with --stage"), arg);
      return NULL;
    }
  return fw_compare_operand_new_clip (clip, params, stage);
}

static GOptionEntry *
common_entries (CliOptions *o, gboolean explain)
{
  GOptionEntry common[] = {
    { "stage", 's', 0, G_OPTION_ARG_STRING, &o->stage_name,
      N_("Stage (power, magnitude, db, mel, mel-db, mfcc, delta, delta2, rms, zcr, centroid, "
         "bandwidth, rolloff, flatness); compare defaults to mfcc"),
      N_("STAGE") },
    { "params", 'p', 0, G_OPTION_ARG_FILENAME, &o->params_path,
      N_("Parameter file for clip operands given without @PARAMS_FILE"), N_("FILE") },
    { "set", 0, 0, G_OPTION_ARG_STRING_ARRAY, &o->settings,
      N_("Change one parameter of the clip operands (repeatable)"), N_("KEY=VALUE") },
    { "axis", 0, 0, G_OPTION_ARG_STRING, &o->axis,
      N_("Axis order of feature files: frames-bins (rows are frames, the default) or "
         "bins-frames"),
      N_("ORDER") },
    { "hop", 0, 0, G_OPTION_ARG_DOUBLE, &o->hop,
      N_("Hop of feature files in samples (with --sample-rate); without both, a file is on the "
         "other side's frame grid"),
      N_("N") },
    { "sample-rate", 0, 0, G_OPTION_ARG_DOUBLE, &o->sample_rate,
      N_("Sample rate of feature files in Hz (with --hop)"), N_("SR") },
    { "origin", 0, 0, G_OPTION_ARG_DOUBLE, &o->origin,
      N_("Centre time of a feature file's first frame in seconds (default 0)"), N_("S") },
    { "json", 0, 0, G_OPTION_ARG_NONE, &o->json, N_("Print a JSON object"), NULL },
    { NULL },
  };
  GOptionEntry compare_only[] = {
    { "tolerance", 't', 0, G_OPTION_ARG_STRING, &o->tolerance,
      N_("Largest |B-A| still accepted (default: 1e-5 of the largest |A|)"), N_("T") },
    { "knobs", 0, 0, G_OPTION_ARG_NONE, &o->knobs,
      N_("Also rank the parameter keys by how much of the difference each explains"), NULL },
    { NULL },
  };
  GOptionEntry explain_only[] = {
    { "candidates", 'c', 0, G_OPTION_ARG_STRING_ARRAY, &o->candidates,
      N_("Values to try for a key (repeatable; further KEY=V1,V2 arguments count too)"),
      N_("KEY=V1,V2") },
    { "only-candidates", 0, 0, G_OPTION_ARG_NONE, &o->only_candidates,
      N_("Search only the given candidates, not the usual convention variants"), NULL },
    { "threads", 0, 0, G_OPTION_ARG_INT, &o->threads,
      N_("Worker threads (default: one per processor)"), N_("N") },
    { NULL },
  };
  GArray *all = g_array_new (TRUE, TRUE, sizeof (GOptionEntry));
  g_array_append_vals (all, common, G_N_ELEMENTS (common) - 1);
  if (explain)
    g_array_append_vals (all, explain_only, G_N_ELEMENTS (explain_only) - 1);
  else
    g_array_append_vals (all, compare_only, G_N_ELEMENTS (compare_only) - 1);
  return (GOptionEntry *) g_array_free (all, FALSE);
}

static gboolean
parse_args (int *argc, char ***argv, CliOptions *o, gboolean explain, const char *synopsis,
            const char *summary)
{
  g_autoptr (GOptionContext) ctx = g_option_context_new (synopsis);
  g_autofree GOptionEntry *entries = common_entries (o, explain);
  g_autoptr (GError) error = NULL;

  g_option_context_set_summary (ctx, summary);
  g_option_context_add_main_entries (ctx, entries, GETTEXT_PACKAGE);
  g_option_context_set_translation_domain (ctx, GETTEXT_PACKAGE);
  if (!g_option_context_parse (ctx, argc, argv, &error))
    {
      fw_cli_error ("%s", error->message);
      return FALSE;
    }
  return TRUE;
}

static gboolean
parse_stage (const CliOptions *o, FwStage *stage, gboolean required)
{
  g_autoptr (GError) error = NULL;

  *stage = FW_STAGE_SIGNAL;
  if (o->stage_name == NULL)
    {
      if (required)
        {
          fw_cli_error (_("--stage is required (for example --stage mfcc)"));
          return FALSE;
        }
      return TRUE;
    }
  if (!fw_feature_parse_stage (o->stage_name, stage, &error))
    {
      fw_cli_error ("%s", error->message);
      return FALSE;
    }
  return TRUE;
}

int
fw_cli_compare (int argc, char **argv)
{
  CliOptions o = { 0 };
  FwStage stage;
  g_autoptr (FwCompareOperand) a = NULL;
  g_autoptr (FwCompareOperand) b = NULL;
  g_autoptr (FwCompareResult) r = NULL;
  g_autoptr (FwKnobRanking) knobs = NULL;
  g_autoptr (GError) error = NULL;
  double tolerance;
  gboolean within;
  int status = FW_CLI_EXIT_ERROR;

  if (!parse_args (&argc, &argv, &o, FALSE, _("A B - compare two feature matrices"),
                   _("An operand is a feature file (.npy or .csv) or CLIP@PARAMS_FILE.\n"
                     "Exit status: 0 within tolerance, 1 beyond, 2 on error.")))
    goto out;
  if (argc != 3)
    {
      fw_cli_error (_("compare needs two operands, A and B (got %d)"), argc - 1);
      goto out;
    }
  if (!parse_stage (&o, &stage, FALSE))
    goto out;
  if (stage < 0 && (!is_feature_file (argv[1]) || !is_feature_file (argv[2])))
    stage = FW_STAGE_MFCC;
  a = parse_operand (argv[1], &o, stage, &error);
  if (a)
    b = parse_operand (argv[2], &o, stage, &error);
  if (a == NULL || b == NULL)
    {
      fw_cli_error ("%s", error->message);
      goto out;
    }
  r = fw_compare_run (a, b, NULL, NULL, &error);
  if (r == NULL)
    {
      fw_cli_error ("%s", error->message);
      goto out;
    }
  if (o.tolerance)
    {
      char *end = NULL;
      tolerance = g_ascii_strtod (o.tolerance, &end);
      if (end == o.tolerance || *end != '\0' || !(tolerance >= 0))
        {
          fw_cli_error (_("--tolerance %s: expected a number >= 0"), o.tolerance);
          goto out;
        }
    }
  else
    tolerance = 1e-5 * r->diff->a_max_abs;
  if (o.knobs)
    {
      knobs = fw_compare_rank_knobs (a, b, NULL, &error);
      if (knobs == NULL)
        {
          fw_cli_error ("%s", error->message);
          goto out;
        }
    }

  within = fw_compare_result_within (r, tolerance);
  if (o.json)
    {
      g_autofree char *json = fw_compare_result_to_json_with_knobs (r, tolerance, knobs);
      fputs (json, stdout);
    }
  else
    {
      g_autofree char *text = fw_compare_result_to_text (r);
      g_autofree char *tol = g_strdup_printf ("%.3g", tolerance);
      fputs (text, stdout);
      if (knobs)
        {
          g_autofree char *kt = fw_knob_ranking_to_text (knobs);
          printf ("%s\n%s", _("Which key explains it (each of B's values applied alone to A):"),
                  kt);
        }
      if (within)
        printf (_("Within tolerance %s.\n"), tol);
      else if (!r->same_shape)
        printf (_("Beyond tolerance: the shapes or grids differ.\n"));
      else
        printf (_("Beyond tolerance %s.\n"), tol);
    }
  status = within ? FW_CLI_EXIT_OK : FW_CLI_EXIT_FAILURE;

out:
  cli_options_clear (&o);
  return status;
}

int
fw_cli_explain (int argc, char **argv)
{
  CliOptions o = { 0 };
  FwStage stage;
  FwFeatureFileOptions fo;
  FwExplainOptions eo;
  g_autoptr (FwCompareOperand) dump = NULL;
  g_autoptr (FwCompareOperand) clip = NULL;
  g_autoptr (FwParams) params = NULL;
  g_autoptr (FwExplainResult) r = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GPtrArray) cands = g_ptr_array_new ();
  int status = FW_CLI_EXIT_ERROR;

  if (!parse_args (&argc, &argv, &o, TRUE,
                   _("DUMP CLIP [KEY=V1,V2 ...] - find the conventions that reproduce a dump"),
                   _("Searches the usual convention variants (spectrum power/magnitude, mel "
                     "scale and weights, dB reference, DCT norm, centring, window symmetry, "
                     "lifter) and the given candidates for the parameter set whose output for "
                     "CLIP is closest to DUMP (.npy or .csv).\n"
                     "Exit status: 0 when a set reproduces the dump, 1 when none does, 2 on "
                     "error.")))
    goto out;
  if (argc < 3)
    {
      fw_cli_error (_("explain needs a feature dump and a clip"));
      goto out;
    }
  if (!parse_stage (&o, &stage, TRUE))
    goto out;
  if (!is_feature_file (argv[1]))
    {
      fw_cli_error (_("%s: the dump must be an .npy or .csv file"), argv[1]);
      goto out;
    }
  for (char **c = o.candidates; c && *c; c++)
    g_ptr_array_add (cands, *c);
  for (int i = 3; i < argc; i++)
    {
      if (strchr (argv[i], '=') == NULL)
        {
          fw_cli_error (_("Unexpected argument '%s' (candidates are KEY=V1,V2)"), argv[i]);
          goto out;
        }
      g_ptr_array_add (cands, argv[i]);
    }
  g_ptr_array_add (cands, NULL);
  if (!file_options (&o, &fo, &error))
    {
      fw_cli_error ("%s", error->message);
      goto out;
    }
  dump = fw_compare_operand_new_file (argv[1], &fo, stage);
  params = fw_cli_load_params (o.params_path, o.settings, &error);
  if (params == NULL)
    {
      fw_cli_error ("%s", error->message);
      goto out;
    }
  clip = fw_compare_operand_new_clip (argv[2], params, stage);

  fw_explain_options_init (&eo);
  eo.default_variants = !o.only_candidates;
  eo.candidates = (const char *const *) cands->pdata;
  eo.n_threads = o.threads;
  r = fw_compare_explain (dump, clip, &eo, NULL, &error);
  if (r == NULL)
    {
      fw_cli_error ("%s", error->message);
      goto out;
    }
  if (o.json)
    {
      g_autofree char *json = fw_explain_result_to_json (r);
      fputs (json, stdout);
    }
  else
    {
      g_autofree char *text = fw_explain_result_to_text (r);
      fputs (text, stdout);
    }
  status = r->relative_rms < FW_EXPLAIN_EXACT_RELATIVE ? FW_CLI_EXIT_OK : FW_CLI_EXIT_FAILURE;

out:
  cli_options_clear (&o);
  return status;
}
