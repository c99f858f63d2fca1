/* fw-cli-project.c: framewise-cli project and batch.
 *
 *   framewise-cli project PROJECT
 *   framewise-cli batch PROJECT --params NAME --stage STAGE --out-dir DIR
 *                       [--shard K/N] [--jobs J] [--force]
 *
 * `batch` computes one stage for every clip of a project (or one shard of them) through the
 * feature cache's blocking path, J clips at a time, and writes one NPY file per clip plus a
 * CSV manifest. It never overwrites a file unless --force; it checks every target before
 * computing anything. Missing or failing clips are reported and skipped, and the exit status
 * is then 2.
 */
#include "fw-config.h"

#include <errno.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include <glib/gi18n.h>
#include <glib/gprintf.h>
#include <glib/gstdio.h>

#include "fw-cli.h"
#include "fw-feature-cache.h"
#include "fw-feature.h"
#include "fw-project.h"

static gboolean
cli_parse (GOptionContext *ctx, const char *command, int *argc, char ***argv)
{
  g_autoptr (GError) error = NULL;

  if (!g_option_context_parse (ctx, argc, argv, &error))
    {
      fw_cli_error ("%s: %s", command, error->message);
      return FALSE;
    }
  return TRUE;
}

static void
cli_usage_error (GOptionContext *ctx, const char *command, const char *message)
{
  g_autofree char *help = g_option_context_get_help (ctx, TRUE, NULL);

  fw_cli_error ("%s: %s", command, message);
  fprintf (stderr, "%s", help);
}

static GOptionContext *
cli_context (const char *parameter_string, const char *summary, GOptionEntry *entries)
{
  GOptionContext *ctx = g_option_context_new (parameter_string);

  g_option_context_set_summary (ctx, summary);
  g_option_context_add_main_entries (ctx, entries, GETTEXT_PACKAGE);
  g_option_context_set_translation_domain (ctx, GETTEXT_PACKAGE);
  return ctx;
}

/* The clip path as shown to users: relative to the project's folder when inside it. */
static char *
shown_path (FwProject *project, FwClip *clip)
{
  const char *path = fw_clip_get_path (clip);
  const char *project_path = fw_project_get_path (project);
  g_autofree char *dir = NULL;
  g_autofree char *prefix = NULL;

  if (project_path == NULL)
    return g_strdup (path);
  dir = g_path_get_dirname (project_path);
  prefix = g_strconcat (dir, G_DIR_SEPARATOR_S, NULL);
  if (g_str_has_prefix (path, prefix))
    return g_strdup (path + strlen (prefix));
  return g_strdup (path);
}

static const char *
value_or_dash (const char *s)
{
  return s != NULL && *s != '\0' ? s : "-";
}

/* ---- project ---------------------------------------------------------------------------- */

int
fw_cli_project (int argc, char **argv)
{
  GOptionEntry entries[] = { { NULL } };
  g_autoptr (GOptionContext) ctx = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwProject) project = NULL;
  GListModel *clips, *sets, *cmps;
  guint n_clips, n_sets, n_cmps, n_missing = 0;

  ctx = cli_context (_("PROJECT"),
                     _("Lists a project's clips (label, rate, channels, duration, whether the "
                       "file is missing) and its parameter sets (name and hash)."),
                     entries);
  if (!cli_parse (ctx, argv[0], &argc, &argv))
    return FW_CLI_EXIT_ERROR;
  if (argc != 2)
    {
      cli_usage_error (ctx, argv[0], argc < 2 ? _("a PROJECT file is needed")
                                              : _("too many arguments"));
      return FW_CLI_EXIT_ERROR;
    }

  project = fw_project_load (argv[1], &error);
  if (project == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }

  clips = fw_project_get_clips (project);
  sets = fw_project_get_param_sets (project);
  cmps = fw_project_get_comparisons (project);
  n_clips = g_list_model_get_n_items (clips);
  n_sets = g_list_model_get_n_items (sets);
  n_cmps = g_list_model_get_n_items (cmps);

  {
    g_autofree char *display = g_filename_display_name (fw_project_get_path (project));
    g_printf (_("Project: %s\n"), display);
  }
  if (*fw_project_get_title (project) != '\0')
    g_printf (_("Title: %s\n"), fw_project_get_title (project));

  g_printf (_("\nClips (%u):\n"), n_clips);
  g_printf ("  %-4s %-18s %8s %3s %10s  %-8s %s\n", _("#"), _("label"), _("rate/Hz"), _("ch"),
            _("duration/s"), _("status"), _("path"));
  for (guint i = 0; i < n_clips; i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (clips, i);
      g_autofree char *path = shown_path (project, clip);
      FwAudioInfo info = { 0 };
      g_autoptr (GError) info_error = NULL;

      if (fw_clip_get_missing (clip))
        {
          n_missing++;
          g_printf ("  %-4u %-18s %8s %3s %10s  %-8s %s\n", i + 1,
                    value_or_dash (fw_clip_get_label (clip)), "-", "-", "-", _("missing"), path);
        }
      else if (!fw_clip_get_info (clip, &info, &info_error))
        {
          g_printf ("  %-4u %-18s %8s %3s %10s  %-8s %s\n", i + 1,
                    value_or_dash (fw_clip_get_label (clip)), "-", "-", "-", _("unreadable"),
                    path);
          fw_cli_error ("%s", info_error->message);
        }
      else
        {
          char duration[G_ASCII_DTOSTR_BUF_SIZE];

          g_ascii_formatd (duration, sizeof duration, "%.3f", info.duration);
          g_printf ("  %-4u %-18s %8d %3d %10s  %-8s %s\n", i + 1,
                    value_or_dash (fw_clip_get_label (clip)), info.sample_rate, info.channels,
                    duration, _("ok"), path);
          fw_audio_info_clear (&info);
        }
    }

  g_printf (_("\nParameter sets (%u):\n"), n_sets);
  g_printf ("  %-20s %-16s  %s\n", _("name"), _("hash"), _("summary"));
  for (guint i = 0; i < n_sets; i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (sets, i);
      FwParams *params = fw_param_set_get_params (set);
      g_autofree char *rate = fw_params_get_value (params, "sample_rate");
      g_autofree char *window = fw_params_get_value (params, "window_length");
      g_autofree char *hop = fw_params_get_value (params, "hop_length");
      g_autofree char *mel = fw_params_get_value (params, "mel_bands");
      g_autofree char *summary = NULL;

      if (g_strcmp0 (rate, "0") == 0)
        summary = g_strdup_printf (_("file rate, window %s, hop %s, %s mel bands"), window, hop,
                                   mel);
      else
        summary = g_strdup_printf (_("%s Hz, window %s, hop %s, %s mel bands"), rate, window,
                                   hop, mel);
      g_printf ("  %-20s %-16s  %s\n", fw_param_set_get_name (set), fw_params_get_hash (params),
                summary);
    }

  if (n_cmps > 0)
    {
      g_printf (_("\nComparisons (%u):\n"), n_cmps);
      for (guint i = 0; i < n_cmps; i++)
        {
          g_autoptr (FwComparison) cmp = g_list_model_get_item (cmps, i);
          g_autofree char *a = g_path_get_basename (fw_comparison_get_clip (cmp, 0));
          g_autofree char *b = g_path_get_basename (fw_comparison_get_clip (cmp, 1));

          g_printf ("  %-20s %-8s %s [%s]  vs  %s [%s]\n", value_or_dash (fw_comparison_get_name (cmp)),
                    fw_comparison_get_stage (cmp), a,
                    fw_comparison_get_kind (cmp, 0) == FW_OPERAND_CLIP
                      ? fw_comparison_get_param_set (cmp, 0) : _("file"),
                    b,
                    fw_comparison_get_kind (cmp, 1) == FW_OPERAND_CLIP
                      ? fw_comparison_get_param_set (cmp, 1) : _("file"));
        }
    }

  if (n_missing > 0)
    g_printf (_("\n%u of %u clips are missing; relink them in the workbench or fix their "
                "paths.\n"), n_missing, n_clips);
  return FW_CLI_EXIT_OK;
}

/* ---- batch ------------------------------------------------------------------------------ */

typedef struct
{
  FwClip *clip;            /* borrowed from the project */
  char *shown;             /* path as written in the manifest */
  char *file_name;         /* output file name inside out_dir */
  char *out_path;
  gsize frames;
  gboolean ok;
  char *error;
} BatchItem;

typedef struct
{
  FwFeatureCache *cache;
  FwParams *params;
  FwStage stage;
  GMutex lock;
  guint done;
  guint total;
  gboolean progress;       /* stderr is a terminal */
  guint progress_width;
} Batch;

static void
batch_item_clear (BatchItem *item)
{
  g_free (item->shown);
  g_free (item->file_name);
  g_free (item->out_path);
  g_free (item->error);
}

static void
batch_progress (Batch *b, const BatchItem *item)
{
  g_autofree char *line = NULL;
  g_autofree char *name = NULL;
  glong width;

  if (!b->progress)
    return;
  name = g_path_get_basename (item->shown);
  line = g_strdup_printf (_("[%u/%u] %s"), b->done, b->total, name);
  width = g_utf8_strlen (line, -1);
  fprintf (stderr, "\r%s%*s", line, (int) MAX (0, (glong) b->progress_width - width), "");
  b->progress_width = (guint) MAX (width, (glong) b->progress_width);
  fflush (stderr);
}

static void
batch_run_one (gpointer data, gpointer user_data)
{
  BatchItem *item = data;
  Batch *b = user_data;
  g_autoptr (GError) error = NULL;
  FwMatrix *m;

  m = fw_feature_cache_request_sync (b->cache, item->clip, b->params, b->stage, NULL, &error);
  if (m != NULL)
    {
      if (fw_feature_write (m, item->out_path, &error))
        {
          item->ok = TRUE;
          item->frames = m->n_frames;
        }
      fw_matrix_unref (m);
    }
  if (!item->ok)
    item->error = g_strdup (error->message);
  /* Written: the cached matrices of this clip are not needed any more. */
  fw_feature_cache_invalidate_clip (b->cache, item->clip);

  g_mutex_lock (&b->lock);
  b->done++;
  batch_progress (b, item);
  g_mutex_unlock (&b->lock);
}

/* "K/N" with 1 <= K <= N. */
static gboolean
parse_shard (const char *text, guint *k, guint *n)
{
  g_auto (GStrv) parts = NULL;
  guint64 vk, vn;

  if (text == NULL)
    {
      *k = 1;
      *n = 1;
      return TRUE;
    }
  parts = g_strsplit (text, "/", -1);
  if (g_strv_length (parts) != 2
      || !g_ascii_string_to_unsigned (parts[0], 10, 1, G_MAXUINT, &vk, NULL)
      || !g_ascii_string_to_unsigned (parts[1], 10, 1, G_MAXUINT, &vn, NULL)
      || vk > vn)
    return FALSE;
  *k = (guint) vk;
  *n = (guint) vn;
  return TRUE;
}

static void
csv_field (GString *out, const char *s)
{
  if (strpbrk (s, ",\"\r\n") == NULL)
    {
      g_string_append (out, s);
      return;
    }
  g_string_append_c (out, '"');
  for (const char *p = s; *p != '\0'; p++)
    {
      if (*p == '"')
        g_string_append_c (out, '"');
      g_string_append_c (out, *p);
    }
  g_string_append_c (out, '"');
}

/* File names for every clip of the project (not only this shard's), so that the name of a
 * clip's output does not depend on how the work was split: BASENAME.STAGE.npy, with -2, -3
 * ... added when two clips share a base name. */
static char **
output_names (GListModel *clips, const char *stage_name)
{
  guint n = g_list_model_get_n_items (clips);
  char **names = g_new0 (char *, n + 1);
  g_autoptr (GHashTable) used = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);

  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (clips, i);
      g_autofree char *base = g_strdup (fw_clip_get_display_name (clip));
      char *dot = strrchr (base, '.');
      char *name;

      if (dot != NULL && dot != base)
        *dot = '\0';
      name = g_strdup_printf ("%s.%s.npy", base, stage_name);
      for (guint k = 2; g_hash_table_contains (used, name); k++)
        {
          g_free (name);
          name = g_strdup_printf ("%s-%u.%s.npy", base, k, stage_name);
        }
      g_hash_table_add (used, g_strdup (name));
      names[i] = name;
    }
  return names;
}

int
fw_cli_batch (int argc, char **argv)
{
  g_autofree char *set_name = NULL;
  g_autofree char *stage_text = NULL;
  g_autofree char *out_dir = NULL;
  g_autofree char *shard_text = NULL;
  gboolean force = FALSE;
  int jobs = 0;
  GOptionEntry entries[] = {
    { "params", 'p', 0, G_OPTION_ARG_STRING, &set_name,
      N_("Name of the project's parameter set to use (required)"), N_("NAME") },
    { "stage", 's', 0, G_OPTION_ARG_STRING, &stage_text,
      N_("Stage to compute (required), e.g. mel-db or mfcc"), N_("STAGE") },
    { "out-dir", 'o', 0, G_OPTION_ARG_FILENAME, &out_dir,
      N_("Folder for the NPY files and the manifest (created when missing)"), N_("DIR") },
    { "shard", 0, 0, G_OPTION_ARG_STRING, &shard_text,
      N_("Process only clips K, K+N, K+2N, ... of the project (1-based K from 1 to N), so N "
         "machines can share the work"), N_("K/N") },
    { "jobs", 'j', 0, G_OPTION_ARG_INT, &jobs,
      N_("Clips computed at once (default: the number of processors)"), N_("J") },
    { "force", 'f', 0, G_OPTION_ARG_NONE, &force,
      N_("Overwrite existing output files"), NULL },
    { NULL }
  };
  g_autoptr (GOptionContext) ctx = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (FwProject) project = NULL;
  g_autoptr (FwFeatureCache) cache = NULL;
  g_autoptr (GArray) items = NULL;
  g_autoptr (GString) manifest = NULL;
  g_auto (GStrv) names = NULL;
  g_autofree char *manifest_name = NULL;
  g_autofree char *manifest_path = NULL;
  g_autofree char *stage_list = g_strjoinv (", ", (char **) fw_feature_stage_names ());
  g_autofree char *summary = NULL;
  GListModel *clips;
  FwParamSet *set;
  FwParams *params;
  FwStage stage;
  guint shard_k, shard_n, n_clips, n_failed = 0, n_missing = 0, n_written = 0;
  Batch b = { 0 };

  summary = g_strdup_printf (
    _("Computes one stage for every clip of a project with one of its parameter sets and "
      "writes CLIP.STAGE.npy per clip (NPY 1.0, float32, frames x bins) plus a manifest: "
      "manifest.csv, or manifest-K-of-N.csv with --shard, with the columns clip (path "
      "relative to the project's folder when inside it), label, frames, file, params_hash.\n"
      "Existing files are never overwritten unless --force. Missing clips are reported and "
      "skipped; the exit status is then 2.\nStages: %s."), stage_list);
  ctx = cli_context (_("PROJECT"), summary, entries);
  if (!cli_parse (ctx, argv[0], &argc, &argv))
    return FW_CLI_EXIT_ERROR;
  if (argc != 2)
    {
      cli_usage_error (ctx, argv[0], argc < 2 ? _("a PROJECT file is needed")
                                              : _("too many arguments"));
      return FW_CLI_EXIT_ERROR;
    }
  if (set_name == NULL || stage_text == NULL || out_dir == NULL)
    {
      cli_usage_error (ctx, argv[0], _("--params, --stage and --out-dir are required"));
      return FW_CLI_EXIT_ERROR;
    }
  if (!parse_shard (shard_text, &shard_k, &shard_n))
    {
      fw_cli_error (_("%s: --shard “%s” is not K/N with 1 <= K <= N (for example 2/4)"),
                    argv[0], shard_text);
      return FW_CLI_EXIT_ERROR;
    }
  if (jobs < 0)
    {
      fw_cli_error (_("%s: --jobs must be 1 or more, not %d"), argv[0], jobs);
      return FW_CLI_EXIT_ERROR;
    }
  if (jobs == 0)
    jobs = (int) MAX (1u, g_get_num_processors ());
  if (!fw_feature_parse_stage (stage_text, &stage, &error))
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }

  project = fw_project_load (argv[1], &error);
  if (project == NULL)
    {
      fw_cli_error ("%s", error->message);
      return FW_CLI_EXIT_ERROR;
    }
  set = fw_project_find_param_set (project, set_name);
  if (set == NULL)
    {
      GListModel *sets = fw_project_get_param_sets (project);
      g_autoptr (GString) list = g_string_new (NULL);

      for (guint i = 0; i < g_list_model_get_n_items (sets); i++)
        {
          g_autoptr (FwParamSet) s = g_list_model_get_item (sets, i);
          if (list->len > 0)
            g_string_append (list, ", ");
          g_string_append (list, fw_param_set_get_name (s));
        }
      fw_cli_error (_("%s: the project has no parameter set named “%s” (it has: %s)"), argv[0],
                    set_name, list->len > 0 ? list->str : _("none"));
      return FW_CLI_EXIT_ERROR;
    }
  params = fw_param_set_get_params (set);

  if (g_mkdir_with_parents (out_dir, 0755) != 0)
    {
      g_autofree char *display = g_filename_display_name (out_dir);
      fw_cli_error (_("%s: cannot create the output folder %s: %s"), argv[0], display,
                    g_strerror (errno));
      return FW_CLI_EXIT_ERROR;
    }

  clips = fw_project_get_clips (project);
  n_clips = g_list_model_get_n_items (clips);
  names = output_names (clips, fw_feature_stage_name (stage, params));
  manifest_name = shard_n == 1 ? g_strdup ("manifest.csv")
                               : g_strdup_printf ("manifest-%u-of-%u.csv", shard_k, shard_n);
  manifest_path = g_build_filename (out_dir, manifest_name, NULL);

  /* This shard's clips; refuse before computing anything when a target exists. */
  items = g_array_new (FALSE, TRUE, sizeof (BatchItem));
  g_array_set_clear_func (items, (GDestroyNotify) batch_item_clear);
  for (guint i = shard_k - 1; i < n_clips; i += shard_n)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (clips, i);
      BatchItem item = { 0 };

      item.clip = clip;   /* the project keeps it alive */
      item.shown = shown_path (project, clip);
      item.file_name = g_strdup (names[i]);
      item.out_path = g_build_filename (out_dir, names[i], NULL);
      g_array_append_val (items, item);
    }
  if (!force)
    {
      for (guint i = 0; i <= items->len; i++)
        {
          const char *path = i < items->len ? g_array_index (items, BatchItem, i).out_path
                                            : manifest_path;

          if (g_file_test (path, G_FILE_TEST_EXISTS))
            {
              g_autofree char *display = g_filename_display_name (path);
              fw_cli_error (_("%s: %s exists; add --force to overwrite it"), argv[0], display);
              return FW_CLI_EXIT_ERROR;
            }
        }
    }

  cache = fw_feature_cache_new (fw_project_get_cache_budget (project), (guint) jobs);
  b.cache = cache;
  b.params = params;
  b.stage = stage;
  g_mutex_init (&b.lock);
  b.progress = isatty (STDERR_FILENO);

  {
    g_autoptr (GPtrArray) work = g_ptr_array_new ();
    GThreadPool *pool;

    for (guint i = 0; i < items->len; i++)
      {
        BatchItem *item = &g_array_index (items, BatchItem, i);

        if (fw_clip_get_missing (item->clip))
          {
            n_missing++;
            fw_cli_error (_("%s: clip %s is missing; skipped"), argv[0], item->shown);
            continue;
          }
        g_ptr_array_add (work, item);
      }
    b.total = work->len;
    pool = g_thread_pool_new (batch_run_one, &b, jobs, TRUE, &error);
    if (pool == NULL)
      {
        fw_cli_error ("%s", error->message);
        g_mutex_clear (&b.lock);
        return FW_CLI_EXIT_ERROR;
      }
    for (guint i = 0; i < work->len; i++)
      g_thread_pool_push (pool, g_ptr_array_index (work, i), NULL);
    g_thread_pool_free (pool, FALSE, TRUE);
    if (b.progress && b.total > 0)
      fprintf (stderr, "\n");
  }
  g_mutex_clear (&b.lock);

  manifest = g_string_new ("clip,label,frames,file,params_hash\n");
  for (guint i = 0; i < items->len; i++)
    {
      BatchItem *item = &g_array_index (items, BatchItem, i);

      if (!item->ok)
        {
          if (item->error != NULL)
            {
              n_failed++;
              fw_cli_error (_("%s: clip %s: %s"), argv[0], item->shown, item->error);
            }
          continue;
        }
      n_written++;
      csv_field (manifest, item->shown);
      g_string_append_c (manifest, ',');
      csv_field (manifest, fw_clip_get_label (item->clip));
      g_string_append_printf (manifest, ",%" G_GSIZE_FORMAT ",", item->frames);
      csv_field (manifest, item->file_name);
      g_string_append_printf (manifest, ",%s\n", fw_params_get_hash (params));
    }
  if (!g_file_set_contents (manifest_path, manifest->str, (gssize) manifest->len, &error))
    {
      fw_cli_error (_("%s: cannot write the manifest: %s"), argv[0], error->message);
      return FW_CLI_EXIT_ERROR;
    }

  {
    g_autofree char *display = g_filename_display_name (out_dir);
    g_printf (_("%u files written to %s (stage %s, parameter set “%s”, hash %s); manifest %s\n"),
              n_written, display, fw_feature_stage_name (stage, params), set_name,
              fw_params_get_hash (params), manifest_name);
  }
  if (n_missing > 0 || n_failed > 0)
    {
      fw_cli_error (_("%s: %u clips missing and %u failed; see the messages above"), argv[0],
                    n_missing, n_failed);
      return FW_CLI_EXIT_ERROR;
    }
  return FW_CLI_EXIT_OK;
}
