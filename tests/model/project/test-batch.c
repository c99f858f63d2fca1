/* test-batch.c: `framewise-cli project` and `framewise-cli batch` over the built-in demo.
 *
 * The batch output must equal, byte for byte, what `framewise-cli features` writes for each
 * clip with the same parameter set; shards must split the work without changing any file;
 * existing files are never overwritten without --force; missing clips are reported and
 * skipped with a non-zero exit status.
 */
#include "fw-config.h"

#include <string.h>
#include <sys/wait.h>

#include <glib/gstdio.h>

#include "../fw-test-fixtures.h"
#include "fw-project.h"

typedef struct
{
  int status;      /* exit status */
  char *out;
  char *err;
} Run;

static void
run_clear (Run *r)
{
  g_free (r->out);
  g_free (r->err);
}

/* Runs $FW_CLI with the given arguments (NULL-terminated). */
static Run
cli (const char *first, ...)
{
  g_autoptr (GPtrArray) argv = g_ptr_array_new ();
  g_autoptr (GError) error = NULL;
  const char *exe = g_getenv ("FW_CLI");
  Run r = { 0 };
  int wait_status = 0;
  va_list ap;

  g_assert_nonnull (exe);
  g_ptr_array_add (argv, (gpointer) exe);
  va_start (ap, first);
  for (const char *a = first; a != NULL; a = va_arg (ap, const char *))
    g_ptr_array_add (argv, (gpointer) a);
  va_end (ap);
  g_ptr_array_add (argv, NULL);

  g_assert_true (g_spawn_sync (NULL, (char **) argv->pdata, NULL, G_SPAWN_DEFAULT, NULL, NULL,
                               &r.out, &r.err, &wait_status, &error));
  g_assert_no_error (error);
  if (WIFEXITED (wait_status))
    r.status = WEXITSTATUS (wait_status);
  else
    r.status = -1;
  return r;
}

static char *
demo_project_path (void)
{
  return g_build_filename (g_getenv ("FW_SOURCE_DIR"), "data", "demo", "demo.fwproj", NULL);
}

static GBytes *
read_bytes (const char *path)
{
  g_autoptr (GError) error = NULL;
  char *data = NULL;
  gsize len = 0;

  g_assert_true (g_file_get_contents (path, &data, &len, &error));
  g_assert_no_error (error);
  return g_bytes_new_take (data, len);
}

/* Rows of the NPY shape (frames, bins) written in its header. */
static void
npy_shape (const char *path, gsize *frames, gsize *bins)
{
  g_autoptr (GBytes) b = read_bytes (path);
  gsize len;
  const char *data = g_bytes_get_data (b, &len);
  g_autofree char *head = NULL;
  const char *shape;

  /* Magic, version 1.0, 2-byte header length, then the header dict (text). */
  g_assert_true (len > 10 && memcmp (data, "\x93NUMPY\x01\x00", 8) == 0);
  head = g_strndup (data + 10, MIN (len - 10, 256));
  shape = strstr (head, "'shape': (");
  g_assert_nonnull (shape);
  g_assert_cmpint (sscanf (shape, "'shape': (%" G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT ")", frames, bins), ==, 2);
}

static GPtrArray *
split_lines (const char *text)
{
  g_auto (GStrv) lines = g_strsplit (text, "\n", -1);
  GPtrArray *out = g_ptr_array_new_with_free_func (g_free);

  for (guint i = 0; lines[i] != NULL; i++)
    if (*lines[i] != '\0')
      g_ptr_array_add (out, g_strdup (lines[i]));
  return out;
}

/* Batch for one set and stage, then `features` per clip, compared byte for byte. */
static void
check_batch_equals_features (const char *set_name, const char *stage, const char *jobs)
{
  g_autofree char *project_path = demo_project_path ();
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *out_dir = g_build_filename (dir, "out", NULL);
  g_autofree char *params_path = g_build_filename (dir, "set.fwparams", NULL);
  g_autofree char *manifest = g_build_filename (out_dir, "manifest.csv", NULL);
  g_autofree char *manifest_text = NULL;
  g_autoptr (FwProject) project = NULL;
  g_autoptr (GError) error = NULL;
  g_autoptr (GPtrArray) rows = NULL;
  FwParamSet *set;
  GListModel *clips;
  Run r;

  project = fw_project_load (project_path, &error);
  g_assert_no_error (error);
  set = fw_project_find_param_set (project, set_name);
  g_assert_nonnull (set);
  g_assert_true (fw_params_save (fw_param_set_get_params (set), params_path, &error));
  g_assert_no_error (error);

  r = cli ("batch", project_path, "--params", set_name, "--stage", stage, "--out-dir", out_dir,
           "--jobs", jobs, NULL);
  g_test_message ("batch: %s%s", r.out, r.err);
  g_assert_cmpint (r.status, ==, 0);
  g_assert_nonnull (strstr (r.out, "20 files written"));
  run_clear (&r);

  g_assert_true (g_file_get_contents (manifest, &manifest_text, NULL, NULL));
  rows = split_lines (manifest_text);
  g_assert_cmpuint (rows->len, ==, 21);
  g_assert_cmpstr (g_ptr_array_index (rows, 0), ==, "clip,label,frames,file,params_hash");

  clips = fw_project_get_clips (project);
  g_assert_cmpuint (g_list_model_get_n_items (clips), ==, 20);
  for (guint i = 0; i < 20; i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (clips, i);
      g_auto (GStrv) cols = g_strsplit (g_ptr_array_index (rows, i + 1), ",", -1);
      g_autofree char *batch_file = NULL;
      g_autofree char *single = NULL;
      g_autoptr (GBytes) a = NULL;
      g_autoptr (GBytes) b = NULL;
      gsize frames = 0, bins = 0;

      g_assert_cmpuint (g_strv_length (cols), ==, 5);
      g_assert_cmpstr (cols[0], ==, fw_clip_get_display_name (clip));  /* relative path */
      g_assert_cmpstr (cols[1], ==, fw_clip_get_label (clip));
      g_assert_cmpstr (cols[4], ==, fw_params_get_hash (fw_param_set_get_params (set)));
      g_assert_true (g_str_has_suffix (cols[3], ".npy"));
      batch_file = g_build_filename (out_dir, cols[3], NULL);
      npy_shape (batch_file, &frames, &bins);
      {
        g_autofree char *frames_text = g_strdup_printf ("%" G_GSIZE_FORMAT, frames);
        g_assert_cmpstr (cols[2], ==, frames_text);
      }

      single = g_build_filename (dir, "single.npy", NULL);
      r = cli ("features", fw_clip_get_path (clip), stage, "--params", params_path, "-o", single,
               NULL);
      g_assert_cmpint (r.status, ==, 0);
      run_clear (&r);
      a = read_bytes (batch_file);
      b = read_bytes (single);
      g_assert_true (g_bytes_equal (a, b));
    }
  fw_test_remove_dir (dir);
}

static void
test_batch_equals_features_mel_db (void)
{
  check_batch_equals_features ("long-window", "mel-db", "2");
}

static void
test_batch_equals_features_mfcc (void)
{
  check_batch_equals_features ("defaults", "mfcc", "1");
}

static void
test_overwrite_and_shards (void)
{
  g_autofree char *project_path = demo_project_path ();
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *full = g_build_filename (dir, "full", NULL);
  g_autofree char *sharded = g_build_filename (dir, "sharded", NULL);
  g_autofree char *first = g_build_filename (full, "calm-colony-01.delta.npy", NULL);
  g_autoptr (GBytes) before = NULL;
  guint total = 0;
  Run r;

  r = cli ("batch", project_path, "-p", "short-window", "-s", "delta", "-o", full, NULL);
  g_assert_cmpint (r.status, ==, 0);
  run_clear (&r);
  before = read_bytes (first);

  /* A second run refuses, naming the file, and writes nothing. */
  r = cli ("batch", project_path, "-p", "short-window", "-s", "delta", "-o", full, NULL);
  g_assert_cmpint (r.status, ==, 2);
  g_assert_nonnull (strstr (r.err, "exists; add --force"));
  g_assert_nonnull (strstr (r.err, ".delta.npy"));
  run_clear (&r);
  r = cli ("batch", project_path, "-p", "short-window", "-s", "delta", "-o", full, "--force", NULL);
  g_assert_cmpint (r.status, ==, 0);
  run_clear (&r);
  {
    g_autoptr (GBytes) after = read_bytes (first);
    g_assert_true (g_bytes_equal (before, after));
  }

  /* Three shards: every 3rd clip from K; together the same 20 files, same bytes. */
  for (guint k = 1; k <= 3; k++)
    {
      g_autofree char *shard = g_strdup_printf ("%u/3", k);
      g_autofree char *manifest = g_strdup_printf ("manifest-%u-of-3.csv", k);
      g_autofree char *mpath = g_build_filename (sharded, manifest, NULL);
      g_autofree char *text = NULL;
      g_autoptr (GPtrArray) rows = NULL;

      r = cli ("batch", project_path, "-p", "short-window", "-s", "delta", "-o", sharded,
               "--shard", shard, "--jobs", "2", NULL);
      g_assert_cmpint (r.status, ==, 0);
      run_clear (&r);
      g_assert_true (g_file_get_contents (mpath, &text, NULL, NULL));
      rows = split_lines (text);
      g_assert_cmpuint (rows->len - 1, ==, k < 3 ? 7 : 6);
      total += rows->len - 1;
      /* Shard 1 starts with clip 1, shard 2 with clip 2 (1-based K). */
      g_assert_true (g_str_has_prefix (g_ptr_array_index (rows, 1),
                                       k == 1 ? "calm-colony-01.flac," :
                                       k == 2 ? "calm-colony-02.flac," : "calm-colony-03.flac,"));
      for (guint i = 1; i < rows->len; i++)
        {
          g_auto (GStrv) cols = g_strsplit (g_ptr_array_index (rows, i), ",", -1);
          g_autofree char *a_path = g_build_filename (full, cols[3], NULL);
          g_autofree char *b_path = g_build_filename (sharded, cols[3], NULL);
          g_autoptr (GBytes) a = read_bytes (a_path);
          g_autoptr (GBytes) b = read_bytes (b_path);

          g_assert_true (g_bytes_equal (a, b));
        }
    }
  g_assert_cmpuint (total, ==, 20);

  /* Bad arguments: clear messages, status 2. */
  {
    const char *bad_shards[] = { "0/3", "4/3", "2", "a/b", "1/0" };

    for (guint i = 0; i < G_N_ELEMENTS (bad_shards); i++)
      {
        r = cli ("batch", project_path, "-p", "short-window", "-s", "delta", "-o", sharded,
                 "--shard", bad_shards[i], NULL);
        g_assert_cmpint (r.status, ==, 2);
        g_assert_nonnull (strstr (r.err, "--shard"));
        run_clear (&r);
      }
  }
  r = cli ("batch", project_path, "-p", "medium-window", "-s", "delta", "-o", sharded, NULL);
  g_assert_cmpint (r.status, ==, 2);
  g_assert_nonnull (strstr (r.err, "no parameter set named “medium-window”"));
  g_assert_nonnull (strstr (r.err, "short-window"));
  run_clear (&r);
  r = cli ("batch", project_path, "-p", "short-window", "-s", "chroma", "-o", sharded, NULL);
  g_assert_cmpint (r.status, ==, 2);
  g_assert_nonnull (strstr (r.err, "chroma"));
  run_clear (&r);
  r = cli ("batch", project_path, "-p", "short-window", "-s", "delta", NULL);
  g_assert_cmpint (r.status, ==, 2);
  run_clear (&r);

  fw_test_remove_dir (dir);
}

static void
test_missing_clips (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *demo_dir = g_build_filename (g_getenv ("FW_SOURCE_DIR"), "data", "demo", NULL);
  g_autofree char *a = g_build_filename (demo_dir, "rain-on-lid-01.flac", NULL);
  g_autofree char *b = g_build_filename (demo_dir, "queen-piping-02.flac", NULL);
  g_autofree char *gone = g_build_filename (dir, "lost", "hive-09.flac", NULL);
  g_autofree char *project_path = g_build_filename (dir, "p.fwproj", NULL);
  g_autofree char *out_dir = g_build_filename (dir, "out", NULL);
  g_autofree char *manifest = g_build_filename (out_dir, "manifest.csv", NULL);
  g_autofree char *text = NULL;
  g_autoptr (GPtrArray) rows = NULL;
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwParams) defaults = fw_params_new_default ();
  g_autoptr (FwParamSet) set = fw_param_set_new ("defaults", defaults);
  g_autoptr (GError) error = NULL;
  const char *paths[] = { a, gone, b };
  Run r;

  for (guint i = 0; i < G_N_ELEMENTS (paths); i++)
    {
      g_autoptr (FwClip) clip = fw_clip_new (paths[i]);
      fw_clip_set_label (clip, i == 1 ? "calm-colony" : "x");
      fw_project_add_clip (project, clip);
    }
  g_assert_true (fw_project_add_param_set (project, set, NULL));
  g_assert_true (fw_project_save (project, project_path, &error));
  g_assert_no_error (error);

  r = cli ("project", project_path, NULL);
  g_assert_cmpint (r.status, ==, 0);
  g_assert_nonnull (strstr (r.out, "missing"));
  g_assert_nonnull (strstr (r.out, "lost/hive-09.flac"));
  g_assert_nonnull (strstr (r.out, "1 of 3 clips are missing"));
  run_clear (&r);

  r = cli ("batch", project_path, "--params", "defaults", "--stage", "rms", "--out-dir", out_dir,
           NULL);
  g_assert_cmpint (r.status, ==, 2);
  g_assert_nonnull (strstr (r.err, "lost/hive-09.flac is missing; skipped"));
  g_assert_nonnull (strstr (r.err, "1 clips missing"));
  run_clear (&r);
  g_assert_true (g_file_get_contents (manifest, &text, NULL, NULL));
  rows = split_lines (text);
  g_assert_cmpuint (rows->len, ==, 3);
  g_assert_true (g_str_has_prefix (g_ptr_array_index (rows, 1), a));
  g_assert_true (g_str_has_prefix (g_ptr_array_index (rows, 2), b));

  fw_test_remove_dir (dir);
}

static void
test_project_listing (void)
{
  g_autofree char *project_path = demo_project_path ();
  g_autoptr (FwProject) project = NULL;
  g_autoptr (GError) error = NULL;
  GListModel *sets;
  Run r;

  project = fw_project_load (project_path, &error);
  g_assert_no_error (error);
  r = cli ("project", project_path, NULL);
  g_assert_cmpint (r.status, ==, 0);
  g_assert_nonnull (strstr (r.out, "Clips (20):"));
  g_assert_nonnull (strstr (r.out, "Parameter sets (3):"));
  g_assert_null (strstr (r.out, "missing"));
  sets = fw_project_get_param_sets (project);
  for (guint i = 0; i < g_list_model_get_n_items (sets); i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (sets, i);
      g_autofree char *row = g_strdup_printf ("%-20s %-16s", fw_param_set_get_name (set),
                                              fw_params_get_hash (fw_param_set_get_params (set)));
      g_assert_nonnull (strstr (r.out, row));
    }
  /* One row per clip: index, label, rate, channels, duration, status, path. */
  g_assert_nonnull (strstr (r.out, "passing-vehicle       22050   2      5.000  ok       passing-vehicle-01.flac"));
  g_assert_nonnull (strstr (r.out, "calm-colony           44100   1      3.000  ok       calm-colony-03.flac"));
  run_clear (&r);

  r = cli ("project", "/nonexistent/p.fwproj", NULL);
  g_assert_cmpint (r.status, ==, 2);
  g_assert_nonnull (strstr (r.err, "/nonexistent/p.fwproj"));
  run_clear (&r);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/fw/project/batch/equals-features-mel-db", test_batch_equals_features_mel_db);
  g_test_add_func ("/fw/project/batch/equals-features-mfcc", test_batch_equals_features_mfcc);
  g_test_add_func ("/fw/project/batch/overwrite-and-shards", test_overwrite_and_shards);
  g_test_add_func ("/fw/project/batch/missing-clips", test_missing_clips);
  g_test_add_func ("/fw/project/batch/project-listing", test_project_listing);
  return g_test_run ();
}
