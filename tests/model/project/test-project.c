/* test-project.c: the document model: FwProject, FwClip, FwParamSet, FwComparison.
 *
 * Fixtures are synthetic WAV files (sines) written into each test's own temporary folder.
 */
#include "fw-config.h"

#include <string.h>

#include <glib/gstdio.h>
#include <sndfile.h>

#include "../fw-test-fixtures.h"
#include "fw-clip-private.h"
#include "fw-project.h"

/* A 16-bit mono or stereo WAV of a 440 Hz sine, n frames. */
static char *
write_sine (const char *dir, const char *name, int rate, int channels, gsize n)
{
  g_autofree float *mono = fw_test_sine (n, rate, 440.0, 0.5, 0.0);
  g_autofree float *frames = g_new (float, n * channels);
  char *path = fw_test_path (dir, name);

  for (gsize i = 0; i < n; i++)
    for (int c = 0; c < channels; c++)
      frames[i * channels + c] = mono[i] * (c == 0 ? 1.0f : 0.5f);
  fw_test_write_float (path, SF_FORMAT_WAV | SF_FORMAT_PCM_16, channels, rate, frames, n);
  return path;
}

typedef struct
{
  guint changed;
  guint dirty_notifies;
} Counter;

static void
on_changed (FwProject *project, Counter *c)
{
  c->changed++;
}

static void
on_dirty (GObject *obj, GParamSpec *pspec, Counter *c)
{
  c->dirty_notifies++;
}

static void
test_changed_and_dirty (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_sine (dir, "a.wav", 16000, 1, 1600);
  g_autofree char *absent = fw_test_path (dir, "later.wav");
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwClip) clip = fw_clip_new (path);
  g_autoptr (FwClip) missing = fw_clip_new (absent);
  Counter c = { 0 };

  g_signal_connect (project, "changed", G_CALLBACK (on_changed), &c);
  g_signal_connect (project, "notify::dirty", G_CALLBACK (on_dirty), &c);

  g_assert_false (fw_project_get_dirty (project));
  fw_project_add_clip (project, clip);
  g_assert_true (fw_project_get_dirty (project));
  g_assert_cmpuint (c.changed, ==, 1);
  g_assert_cmpuint (c.dirty_notifies, ==, 1);
  fw_project_add_clip (project, clip);            /* already there: no change */
  g_assert_cmpuint (c.changed, ==, 1);
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_clips (project)), ==, 1);

  fw_project_mark_clean (project);
  g_assert_false (fw_project_get_dirty (project));
  g_assert_cmpuint (c.dirty_notifies, ==, 2);

  /* Edits on the clip itself count. */
  fw_clip_set_label (clip, "calm-colony");
  g_assert_true (fw_project_get_dirty (project));
  g_assert_cmpuint (c.changed, ==, 2);
  fw_clip_set_label (clip, "calm-colony");        /* same value: nothing */
  g_assert_cmpuint (c.changed, ==, 2);
  fw_clip_set_notes (clip, "hive 3");
  fw_clip_set_channel (clip, 0);
  g_assert_cmpuint (c.changed, ==, 4);

  /* Settings count. */
  fw_project_mark_clean (project);
  fw_project_set_title (project, "Hives");
  g_assert_true (fw_project_get_dirty (project));
  fw_project_mark_clean (project);
  fw_project_set_cache_budget (project, 1024);
  g_assert_true (fw_project_get_dirty (project));
  g_assert_cmpuint (fw_project_get_cache_budget (project), ==, 1024);
  g_assert_cmpuint (c.changed, ==, 6);

  /* The file appearing is not an edit of the document. */
  fw_project_add_clip (project, missing);
  g_assert_true (fw_clip_get_missing (missing));
  fw_project_mark_clean (project);
  g_free (write_sine (dir, "later.wav", 16000, 1, 1600));
  fw_clip_refresh (missing);
  g_assert_false (fw_clip_get_missing (missing));
  g_assert_false (fw_project_get_dirty (project));

  /* Removing counts; the removed clip no longer drives the project. */
  fw_project_remove_clip (project, clip);
  g_assert_true (fw_project_get_dirty (project));
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_clips (project)), ==, 1);
  fw_project_mark_clean (project);
  fw_clip_set_label (clip, "other");
  g_assert_false (fw_project_get_dirty (project));

  fw_test_remove_dir (dir);
}

static void
test_param_set_names (void)
{
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwParams) defaults = fw_params_new_default ();
  g_autoptr (FwParamSet) a = fw_param_set_new ("long-window", defaults);
  g_autoptr (FwParamSet) b = fw_param_set_new ("long-window", defaults);
  g_autoptr (FwParamSet) c = NULL;
  g_autoptr (FwParamSet) empty = fw_param_set_new ("", defaults);
  g_autoptr (GError) error = NULL;
  g_autofree char *u1 = NULL;
  g_autofree char *u2 = NULL;
  g_autofree char *u3 = NULL;

  g_assert_true (fw_project_add_param_set (project, a, &error));
  g_assert_no_error (error);
  g_assert_false (fw_project_add_param_set (project, b, &error));
  g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_DUPLICATE);
  g_assert_nonnull (strstr (error->message, "long-window"));
  g_clear_error (&error);
  g_assert_false (fw_project_add_param_set (project, empty, &error));
  g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_INVALID);
  g_clear_error (&error);
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_param_sets (project)), ==, 1);

  u1 = fw_project_unique_param_set_name (project, "long-window");
  g_assert_cmpstr (u1, ==, "long-window 2");
  u2 = fw_project_unique_param_set_name (project, "short-window");
  g_assert_cmpstr (u2, ==, "short-window");

  fw_param_set_set_name (b, u1);
  g_assert_true (fw_project_add_param_set (project, b, &error));
  g_assert_no_error (error);
  u3 = fw_project_unique_param_set_name (project, "long-window");
  g_assert_cmpstr (u3, ==, "long-window 3");

  /* Renaming onto a taken name fails and changes nothing. */
  g_assert_false (fw_project_rename_param_set (project, b, "long-window", &error));
  g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_DUPLICATE);
  g_clear_error (&error);
  g_assert_cmpstr (fw_param_set_get_name (b), ==, "long-window 2");
  g_assert_true (fw_project_rename_param_set (project, b, "short-window", &error));
  g_assert_no_error (error);
  g_assert_true (fw_project_find_param_set (project, "short-window") == b);
  g_assert_null (fw_project_find_param_set (project, "long-window 2"));
  /* Renaming a set to its own name is fine. */
  g_assert_true (fw_project_rename_param_set (project, b, "short-window", &error));

  c = fw_param_set_duplicate (a, "copy");
  g_assert_cmpstr (fw_param_set_get_name (c), ==, "copy");
  g_assert_true (fw_param_set_get_params (c) == fw_param_set_get_params (a));

  fw_project_remove_param_set (project, a);
  g_assert_null (fw_project_find_param_set (project, "long-window"));
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_param_sets (project)), ==, 1);
}

static void
on_notify_count (GObject *obj, GParamSpec *pspec, guint *count)
{
  (*count)++;
}

static void
test_param_set_edit (void)
{
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwParams) defaults = fw_params_new_default ();
  g_autoptr (FwParams) same = fw_params_new_default ();
  g_autoptr (FwParams) edited = NULL;
  g_autoptr (FwParamSet) set = fw_param_set_new ("s", defaults);
  g_autoptr (GError) error = NULL;
  FwParams *before;
  guint notifies = 0;
  Counter c = { 0 };

  g_assert_true (fw_project_add_param_set (project, set, NULL));
  fw_project_mark_clean (project);
  g_signal_connect (project, "changed", G_CALLBACK (on_changed), &c);
  g_signal_connect (set, "notify::params", G_CALLBACK (on_notify_count), &notifies);

  before = fw_params_ref (fw_param_set_get_params (set));
  fw_param_set_set_params (set, same);          /* equal value: no notify */
  g_assert_cmpuint (notifies, ==, 0);
  g_assert_false (fw_project_get_dirty (project));

  edited = fw_params_with (defaults, "hop_length", "256", &error);
  g_assert_no_error (error);
  fw_param_set_set_params (set, edited);
  g_assert_cmpuint (notifies, ==, 1);
  g_assert_cmpuint (c.changed, ==, 1);
  g_assert_true (fw_project_get_dirty (project));
  /* The old value, held by "work in flight", is unchanged. */
  g_assert_cmpstr (fw_params_get_hash (before), ==, fw_params_get_hash (defaults));
  g_assert_cmpstr (fw_params_get_hash (fw_param_set_get_params (set)), !=,
                   fw_params_get_hash (before));
  fw_params_unref (before);
}

static void
test_comparisons_follow (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_sine (dir, "a.wav", 16000, 1, 1600);
  g_autofree char *path2 = write_sine (dir, "b.wav", 16000, 1, 1600);
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwClip) clip = fw_clip_new (path);
  g_autoptr (FwParams) defaults = fw_params_new_default ();
  g_autoptr (FwParamSet) set = fw_param_set_new ("long-window", defaults);
  g_autoptr (FwComparison) cmp = fw_comparison_new ("mine vs theirs", "mfcc");
  Counter c = { 0 };

  fw_project_add_clip (project, clip);
  g_assert_true (fw_project_add_param_set (project, set, NULL));
  fw_comparison_set_operand (cmp, 0, FW_OPERAND_CLIP, path, "long-window", NULL);
  fw_comparison_set_operand (cmp, 1, FW_OPERAND_FILE, "/data/dump.npy", NULL, "hop=512");
  fw_project_add_comparison (project, cmp);
  fw_project_mark_clean (project);
  g_signal_connect (project, "changed", G_CALLBACK (on_changed), &c);

  g_assert_cmpint (fw_comparison_get_kind (cmp, 1), ==, FW_OPERAND_FILE);
  g_assert_cmpstr (fw_comparison_get_options (cmp, 1), ==, "hop=512");
  g_assert_cmpstr (fw_comparison_get_param_set (cmp, 1), ==, "");

  g_assert_true (fw_project_rename_param_set (project, set, "wide", NULL));
  g_assert_cmpstr (fw_comparison_get_param_set (cmp, 0), ==, "wide");

  fw_clip_set_path (clip, path2);                 /* relink */
  g_assert_cmpstr (fw_comparison_get_clip (cmp, 0), ==, path2);
  g_assert_cmpstr (fw_comparison_get_clip (cmp, 1), ==, "/data/dump.npy");
  g_assert_true (fw_project_get_dirty (project));
  g_assert_cmpuint (c.changed, >=, 2);

  fw_project_mark_clean (project);
  fw_comparison_set_operand (cmp, 1, FW_OPERAND_FILE, "/data/dump.npy", NULL, "hop=256");
  g_assert_true (fw_project_get_dirty (project));
  fw_project_mark_clean (project);
  fw_project_remove_comparison (project, cmp);
  g_assert_true (fw_project_get_dirty (project));
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_comparisons (project)), ==, 0);

  fw_test_remove_dir (dir);
}

static void
test_find_clip (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_sine (dir, "hive-03.wav", 16000, 1, 1600);
  g_autofree char *cwd = g_get_current_dir ();
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwClip) clip = NULL;
  g_autofree char *dotted = g_build_filename (dir, ".", "hive-03.wav", NULL);

  clip = fw_clip_new (dotted);
  /* Paths are kept absolute and canonical. */
  g_assert_cmpstr (fw_clip_get_path (clip), ==, path);
  g_assert_cmpstr (fw_clip_get_display_name (clip), ==, "hive-03.wav");
  fw_project_add_clip (project, clip);

  g_assert_true (fw_project_find_clip (project, path) == clip);
  g_assert_true (fw_project_find_clip (project, dotted) == clip);
  g_assert_true (fw_project_find_clip (project, "hive-03.wav") == clip);
  g_assert_null (fw_project_find_clip (project, "hive-04.wav"));

  /* A relative path is taken relative to the working directory. */
  g_assert_no_errno (g_chdir (dir));
  {
    g_autoptr (FwClip) rel = fw_clip_new ("hive-03.wav");
    g_assert_cmpstr (fw_clip_get_path (rel), ==, path);
  }
  g_assert_no_errno (g_chdir (cwd));
  fw_test_remove_dir (dir);
}

typedef struct
{
  FwClip *clip;
  FwAudio *audio;
} LoadArgs;

static gpointer
load_thread (gpointer data)
{
  LoadArgs *args = data;
  g_autoptr (GError) error = NULL;

  args->audio = fw_clip_load_audio (args->clip, 0, 0, NULL, &error);
  g_assert_no_error (error);
  return NULL;
}

static void
test_clip_file_facts (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = write_sine (dir, "stereo.wav", 22050, 2, 22050);
  g_autoptr (FwClip) clip = fw_clip_new (path);
  g_autoptr (GError) error = NULL;
  g_autofree char *id1 = NULL;
  g_autofree char *id2 = NULL;
  FwAudioInfo info = { 0 };
  LoadArgs args[4];
  GThread *threads[4];
  FwAudio *ch2;
  guint missing_notifies = 0;

  g_assert_false (fw_clip_get_missing (clip));
  g_assert_cmpint (fw_clip_get_channel (clip), ==, FW_CLIP_CHANNEL_FROM_PARAMS);
  g_assert_true (fw_clip_get_info (clip, &info, &error));
  g_assert_no_error (error);
  g_assert_cmpint (info.sample_rate, ==, 22050);
  g_assert_cmpint (info.channels, ==, 2);
  g_assert_cmpint (info.frames, ==, 22050);
  g_assert_cmpfloat_with_epsilon (info.duration, 1.0, 1e-9);
  fw_audio_info_clear (&info);

  /* Identity: "path|size|mtime". */
  id1 = fw_clip_dup_identity (clip);
  g_assert_true (g_str_has_prefix (id1, path));
  {
    g_auto (GStrv) parts = g_strsplit (id1, "|", -1);
    g_assert_cmpuint (g_strv_length (parts), ==, 3);
  }

  /* Four threads at once share one decode. */
  for (guint i = 0; i < 4; i++)
    {
      args[i].clip = clip;
      args[i].audio = NULL;
      threads[i] = g_thread_new ("load", load_thread, &args[i]);
    }
  for (guint i = 0; i < 4; i++)
    g_thread_join (threads[i]);
  for (guint i = 1; i < 4; i++)
    g_assert_true (args[i].audio == args[0].audio);
  g_assert_cmpuint (args[0].audio->n_samples, ==, 22050);
  g_assert_cmpint (args[0].audio->channel, ==, 0);

  /* Another channel policy is another decode. */
  ch2 = fw_clip_load_audio (clip, 2, 0, NULL, &error);
  g_assert_no_error (error);
  g_assert_true (ch2 != args[0].audio);
  g_assert_cmpuint (_fw_clip_get_n_decoded (clip), ==, 2);
  /* Channel 2 is the first at half amplitude (see write_sine). */
  g_assert_cmpfloat_with_epsilon (ch2->samples[100], args[0].audio->samples[100] / 0.75f * 0.5f,
                                  2e-4);

  /* Weak sharing: once nobody holds them, trimming releases them. */
  fw_audio_unref (ch2);
  fw_clip_trim_audio (clip);
  g_assert_cmpuint (_fw_clip_get_n_decoded (clip), ==, 1);
  for (guint i = 0; i < 4; i++)
    fw_audio_unref (args[i].audio);
  fw_clip_trim_audio (clip);
  g_assert_cmpuint (_fw_clip_get_n_decoded (clip), ==, 0);

  /* A channel beyond the file's is an error naming the file. */
  g_assert_null (fw_clip_load_audio (clip, 3, 0, NULL, &error));
  g_assert_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_CHANNEL);
  g_clear_error (&error);

  /* Rewriting the file changes the identity. */
  g_usleep (20000);
  g_free (write_sine (dir, "stereo.wav", 22050, 2, 11025));
  id2 = fw_clip_dup_identity (clip);
  g_assert_cmpstr (id1, !=, id2);
  fw_clip_refresh (clip);
  g_assert_true (fw_clip_get_info (clip, &info, &error));
  g_assert_cmpint (info.frames, ==, 11025);
  fw_audio_info_clear (&info);

  /* Relinking to a missing file flags it, and back. */
  g_signal_connect (clip, "notify::missing", G_CALLBACK (on_notify_count), &missing_notifies);
  {
    g_autofree char *gone = fw_test_path (dir, "gone.wav");
    fw_clip_set_path (clip, gone);
  }
  g_assert_true (fw_clip_get_missing (clip));
  g_assert_false (fw_clip_get_info (clip, &info, &error));
  g_assert_error (error, FW_AUDIO_ERROR, FW_AUDIO_ERROR_MISSING);
  g_clear_error (&error);
  fw_clip_set_path (clip, path);
  g_assert_false (fw_clip_get_missing (clip));
  g_assert_cmpuint (missing_notifies, ==, 2);

  fw_test_remove_dir (dir);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/fw/project/model/changed-and-dirty", test_changed_and_dirty);
  g_test_add_func ("/fw/project/model/param-set-names", test_param_set_names);
  g_test_add_func ("/fw/project/model/param-set-edit", test_param_set_edit);
  g_test_add_func ("/fw/project/model/comparisons-follow", test_comparisons_follow);
  g_test_add_func ("/fw/project/model/find-clip", test_find_clip);
  g_test_add_func ("/fw/project/model/clip-file-facts", test_clip_file_facts);
  return g_test_run ();
}
