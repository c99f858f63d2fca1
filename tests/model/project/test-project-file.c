/* test-project-file.c: the project file: round trip, paths, missing clips, atomic saves with
 * a backup, a kill during save, the malformed-file corpus (tests/model/project/malformed/),
 * newer formats, and the built-in demo project.
 */
#include "fw-config.h"

#include <string.h>
#include <unistd.h>

#include <glib/gstdio.h>
#include <sndfile.h>

#include "../fw-test-fixtures.h"
#include "fw-project.h"

static char *
write_sine (const char *path, int rate, gsize n)
{
  g_autofree float *x = fw_test_sine (n, rate, 440.0, 0.5, 0.0);
  g_autofree char *dir = g_path_get_dirname (path);

  g_assert_no_errno (g_mkdir_with_parents (dir, 0755));
  fw_test_write_float (path, SF_FORMAT_WAV | SF_FORMAT_PCM_16, 1, rate, x, n);
  return g_strdup (path);
}

static char *
read_text (const char *path)
{
  g_autoptr (GError) error = NULL;
  char *text = NULL;

  g_assert_true (g_file_get_contents (path, &text, NULL, &error));
  g_assert_no_error (error);
  return text;
}

static FwParams *
params_with (const char *const *settings)
{
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (GError) error = NULL;
  FwParams *p = fw_params_with_settings (base, settings, &error);

  g_assert_no_error (error);
  return p;
}

/* A project with every kind of field, clips in `inside` and `outside`. */
static FwProject *
make_full_project (const char *inside_clip, const char *outside_clip, const char *missing_clip)
{
  static const char *const long_window[] = {
    "sample_rate=16000", "window_length=4096", "fft_length=8192", "hop_length=1024",
    "mel_bands=96", "mel_scale=htk", "db_reference=max", "lifter=22", NULL
  };
  FwProject *project = fw_project_new ();
  g_autoptr (FwClip) a = fw_clip_new (inside_clip);
  g_autoptr (FwClip) b = fw_clip_new (outside_clip);
  g_autoptr (FwClip) c = fw_clip_new (missing_clip);
  g_autoptr (FwParams) defaults = fw_params_new_default ();
  g_autoptr (FwParams) lw = params_with (long_window);
  g_autoptr (FwParamSet) s1 = fw_param_set_new ("defaults", defaults);
  g_autoptr (FwParamSet) s2 = fw_param_set_new ("long window, ✓ 128", lw);
  g_autoptr (FwComparison) cmp1 = fw_comparison_new ("short vs long", "mel-db");
  g_autoptr (FwComparison) cmp2 = fw_comparison_new ("ours vs dump", "mfcc");

  fw_project_set_title (project, "Ruches — printemps; “hive” #3");
  fw_project_set_cache_budget (project, G_GUINT64_CONSTANT (123456789012));

  fw_clip_set_label (a, "calm-colony");
  fw_clip_set_notes (a, "two lines:\nsecond = line # not a comment\n  indented");
  fw_clip_set_channel (a, FW_CLIP_CHANNEL_FROM_PARAMS);
  fw_clip_set_label (b, "reine / piping ✓");
  fw_clip_set_channel (b, 2);
  fw_clip_set_label (c, "");
  fw_clip_set_notes (c, "");
  fw_clip_set_channel (c, 0);
  fw_project_add_clip (project, a);
  fw_project_add_clip (project, b);
  fw_project_add_clip (project, c);

  g_assert_true (fw_project_add_param_set (project, s1, NULL));
  g_assert_true (fw_project_add_param_set (project, s2, NULL));

  fw_comparison_set_operand (cmp1, 0, FW_OPERAND_CLIP, inside_clip, "defaults", NULL);
  fw_comparison_set_operand (cmp1, 1, FW_OPERAND_CLIP, inside_clip, "long window, ✓ 128", NULL);
  fw_comparison_set_operand (cmp2, 0, FW_OPERAND_CLIP, outside_clip, "defaults", NULL);
  fw_comparison_set_operand (cmp2, 1, FW_OPERAND_FILE, "/data/their dump.npy", NULL,
                             "axis=bins,frames\nhop=512");
  fw_project_add_comparison (project, cmp1);
  fw_project_add_comparison (project, cmp2);
  return project;
}

static void
assert_same_projects (FwProject *x, FwProject *y)
{
  GListModel *cx = fw_project_get_clips (x), *cy = fw_project_get_clips (y);
  GListModel *sx = fw_project_get_param_sets (x), *sy = fw_project_get_param_sets (y);
  GListModel *mx = fw_project_get_comparisons (x), *my = fw_project_get_comparisons (y);

  g_assert_cmpstr (fw_project_get_title (x), ==, fw_project_get_title (y));
  g_assert_cmpuint (fw_project_get_cache_budget (x), ==, fw_project_get_cache_budget (y));

  g_assert_cmpuint (g_list_model_get_n_items (cx), ==, g_list_model_get_n_items (cy));
  for (guint i = 0; i < g_list_model_get_n_items (cx); i++)
    {
      g_autoptr (FwClip) a = g_list_model_get_item (cx, i);
      g_autoptr (FwClip) b = g_list_model_get_item (cy, i);

      g_assert_cmpstr (fw_clip_get_path (a), ==, fw_clip_get_path (b));
      g_assert_cmpstr (fw_clip_get_label (a), ==, fw_clip_get_label (b));
      g_assert_cmpstr (fw_clip_get_notes (a), ==, fw_clip_get_notes (b));
      g_assert_cmpint (fw_clip_get_channel (a), ==, fw_clip_get_channel (b));
      g_assert_cmpint (fw_clip_get_missing (a), ==, fw_clip_get_missing (b));
    }

  g_assert_cmpuint (g_list_model_get_n_items (sx), ==, g_list_model_get_n_items (sy));
  for (guint i = 0; i < g_list_model_get_n_items (sx); i++)
    {
      g_autoptr (FwParamSet) a = g_list_model_get_item (sx, i);
      g_autoptr (FwParamSet) b = g_list_model_get_item (sy, i);

      g_assert_cmpstr (fw_param_set_get_name (a), ==, fw_param_set_get_name (b));
      g_assert_true (fw_params_equal (fw_param_set_get_params (a), fw_param_set_get_params (b)));
      g_assert_cmpstr (fw_params_get_hash (fw_param_set_get_params (a)), ==,
                       fw_params_get_hash (fw_param_set_get_params (b)));
      g_assert_cmpstr (fw_params_get_text (fw_param_set_get_params (a)), ==,
                       fw_params_get_text (fw_param_set_get_params (b)));
    }

  g_assert_cmpuint (g_list_model_get_n_items (mx), ==, g_list_model_get_n_items (my));
  for (guint i = 0; i < g_list_model_get_n_items (mx); i++)
    {
      g_autoptr (FwComparison) a = g_list_model_get_item (mx, i);
      g_autoptr (FwComparison) b = g_list_model_get_item (my, i);

      g_assert_cmpstr (fw_comparison_get_name (a), ==, fw_comparison_get_name (b));
      g_assert_cmpstr (fw_comparison_get_stage (a), ==, fw_comparison_get_stage (b));
      for (guint side = 0; side < 2; side++)
        {
          g_assert_cmpint (fw_comparison_get_kind (a, side), ==, fw_comparison_get_kind (b, side));
          g_assert_cmpstr (fw_comparison_get_clip (a, side), ==, fw_comparison_get_clip (b, side));
          g_assert_cmpstr (fw_comparison_get_param_set (a, side), ==,
                           fw_comparison_get_param_set (b, side));
          g_assert_cmpstr (fw_comparison_get_options (a, side), ==,
                           fw_comparison_get_options (b, side));
        }
    }
}

static void
test_round_trip (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *other = fw_test_make_dir ();
  g_autofree char *proj_dir = g_build_filename (dir, "hives", NULL);
  g_autofree char *inside = g_build_filename (proj_dir, "audio", "hive 03.wav", NULL);
  g_autofree char *outside = g_build_filename (other, "queen.wav", NULL);
  g_autofree char *missing = g_build_filename (proj_dir, "gone.wav", NULL);
  g_autofree char *path = g_build_filename (proj_dir, "spring.fwproj", NULL);
  g_autofree char *path2 = g_build_filename (proj_dir, "copy.fwproj", NULL);
  g_autoptr (FwProject) project = NULL;
  g_autoptr (FwProject) loaded = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *text = NULL;
  g_autofree char *text2 = NULL;
  g_autofree char *expect_outside = NULL;

  g_free (write_sine (inside, 16000, 8000));
  g_free (write_sine (outside, 22050, 8000));
  project = make_full_project (inside, outside, missing);
  g_assert_true (fw_project_get_dirty (project));

  g_assert_true (fw_project_save (project, path, &error));
  g_assert_no_error (error);
  g_assert_false (fw_project_get_dirty (project));
  g_assert_cmpstr (fw_project_get_path (project), ==, path);

  /* Paths inside the project's folder are stored relative, others absolute. */
  text = read_text (path);
  g_assert_nonnull (strstr (text, "\npath=audio/hive 03.wav\n"));
  expect_outside = g_strdup_printf ("\npath=%s\n", outside);
  g_assert_nonnull (strstr (text, expect_outside));
  g_assert_nonnull (strstr (text, "\npath=gone.wav\n"));
  g_assert_nonnull (strstr (text, "\nformat=1\n"));
  g_assert_true (g_str_has_suffix (text, "\n[end]\n"));

  loaded = fw_project_load (path, &error);
  g_assert_no_error (error);
  g_assert_nonnull (loaded);
  g_assert_false (fw_project_get_dirty (loaded));
  g_assert_cmpstr (fw_project_get_path (loaded), ==, path);
  assert_same_projects (project, loaded);
  {
    g_autoptr (FwClip) gone = g_list_model_get_item (fw_project_get_clips (loaded), 2);
    g_assert_true (fw_clip_get_missing (gone));
  }

  /* Saving the loaded project again writes the same bytes. */
  g_assert_true (fw_project_save (loaded, path2, &error));
  g_assert_no_error (error);
  text2 = read_text (path2);
  g_assert_cmpstr (text, ==, text2);

  fw_test_remove_dir (dir);
  fw_test_remove_dir (other);
}

static void
test_moved_folder (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *other = fw_test_make_dir ();
  g_autofree char *proj_dir = g_build_filename (dir, "hives", NULL);
  g_autofree char *moved_dir = g_build_filename (dir, "hives-2024", NULL);
  g_autofree char *inside = g_build_filename (proj_dir, "audio", "a.wav", NULL);
  g_autofree char *outside = g_build_filename (other, "b.wav", NULL);
  g_autofree char *path = g_build_filename (proj_dir, "p.fwproj", NULL);
  g_autofree char *moved = g_build_filename (moved_dir, "p.fwproj", NULL);
  g_autofree char *moved_clip = g_build_filename (moved_dir, "audio", "a.wav", NULL);
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwProject) loaded = NULL;
  g_autoptr (FwClip) a = NULL;
  g_autoptr (FwClip) b = NULL;
  g_autoptr (GError) error = NULL;

  g_free (write_sine (inside, 16000, 4000));
  g_free (write_sine (outside, 16000, 4000));
  a = fw_clip_new (inside);
  b = fw_clip_new (outside);
  fw_project_add_clip (project, a);
  fw_project_add_clip (project, b);
  g_assert_true (fw_project_save (project, path, &error));
  g_assert_no_error (error);

  /* Moving the project's folder keeps the relative clip; the absolute one stays put. */
  g_assert_no_errno (g_rename (proj_dir, moved_dir));
  loaded = fw_project_load (moved, &error);
  g_assert_no_error (error);
  {
    g_autoptr (FwClip) la = g_list_model_get_item (fw_project_get_clips (loaded), 0);
    g_autoptr (FwClip) lb = g_list_model_get_item (fw_project_get_clips (loaded), 1);

    g_assert_cmpstr (fw_clip_get_path (la), ==, moved_clip);
    g_assert_false (fw_clip_get_missing (la));
    g_assert_cmpstr (fw_clip_get_path (lb), ==, outside);
    g_assert_false (fw_clip_get_missing (lb));
  }

  /* Loading from text without a path resolves relative paths against the working folder. */
  {
    g_autofree char *cwd = g_get_current_dir ();
    g_autofree char *text = read_text (moved);
    g_autoptr (FwProject) p = NULL;
    g_autoptr (FwClip) first = NULL;

    g_assert_no_errno (g_chdir (moved_dir));
    p = fw_project_load_from_data (text, -1, NULL, &error);
    g_assert_no_errno (g_chdir (cwd));
    g_assert_no_error (error);
    first = g_list_model_get_item (fw_project_get_clips (p), 0);
    g_assert_cmpstr (fw_clip_get_path (first), ==, moved_clip);
    g_assert_null (fw_project_get_path (p));
  }

  fw_test_remove_dir (dir);
  fw_test_remove_dir (other);
}

static void
test_missing_and_relink (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = g_build_filename (dir, "p.fwproj", NULL);
  g_autofree char *found = g_build_filename (dir, "found", "hive-07.wav", NULL);
  g_autofree char *expected_missing = g_build_filename (dir, "lost", "hive-07.wav", NULL);
  g_autoptr (FwProject) project = NULL;
  g_autoptr (FwProject) again = NULL;
  g_autoptr (FwClip) clip = NULL;
  g_autoptr (GError) error = NULL;
  const char *text =
    "[framewise-project]\nformat=1\n\n"
    "[clip 1]\npath=lost/hive-07.wav\nlabel=queen-piping\n\n"
    "[parameter-set 1]\nname=defaults\n\n"
    "[comparison 1]\nname=c\nstage=mfcc\na=clip\na_clip=lost/hive-07.wav\na_param_set=defaults\n"
    "b=file\nb_clip=dump.npy\n\n"
    "[end]\n";

  g_assert_true (g_file_set_contents (path, text, -1, NULL));
  project = fw_project_load (path, &error);
  g_assert_no_error (error);

  /* Kept, flagged, nothing dropped. */
  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_clips (project)), ==, 1);
  clip = g_list_model_get_item (fw_project_get_clips (project), 0);
  g_assert_true (fw_clip_get_missing (clip));
  g_assert_cmpstr (fw_clip_get_path (clip), ==, expected_missing);
  g_assert_cmpstr (fw_clip_get_label (clip), ==, "queen-piping");

  /* Relink: no longer missing; the document (and the comparison) follow. */
  g_free (write_sine (found, 16000, 4000));
  fw_clip_set_path (clip, found);
  g_assert_false (fw_clip_get_missing (clip));
  g_assert_true (fw_project_get_dirty (project));
  {
    g_autoptr (FwComparison) cmp = g_list_model_get_item (fw_project_get_comparisons (project), 0);
    g_assert_cmpstr (fw_comparison_get_clip (cmp, 0), ==, found);
  }
  g_assert_true (fw_project_save (project, path, &error));
  g_assert_no_error (error);

  again = fw_project_load (path, &error);
  g_assert_no_error (error);
  {
    g_autoptr (FwClip) c = g_list_model_get_item (fw_project_get_clips (again), 0);
    g_assert_cmpstr (fw_clip_get_path (c), ==, found);
    g_assert_false (fw_clip_get_missing (c));
  }
  fw_test_remove_dir (dir);
}

static guint
count_entries (const char *dir)
{
  GDir *d = g_dir_open (dir, 0, NULL);
  guint n = 0;

  g_assert_nonnull (d);
  while (g_dir_read_name (d) != NULL)
    n++;
  g_dir_close (d);
  return n;
}

static void
test_atomic_save_and_backup (void)
{
  g_autofree char *dir = fw_test_make_dir ();
  g_autofree char *path = g_build_filename (dir, "p.fwproj", NULL);
  g_autofree char *backup = g_build_filename (dir, "p.fwproj~", NULL);
  g_autofree char *v1 = NULL;
  g_autofree char *v2 = NULL;
  g_autofree char *now = NULL;
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (GError) error = NULL;

  fw_project_set_title (project, "version 1");
  g_assert_true (fw_project_save (project, path, &error));
  g_assert_no_error (error);
  v1 = read_text (path);
  g_assert_false (g_file_test (backup, G_FILE_TEST_EXISTS));

  fw_project_set_title (project, "version 2");
  g_assert_true (fw_project_save (project, path, &error));
  g_assert_no_error (error);
  v2 = read_text (path);
  g_assert_cmpstr (v1, !=, v2);
  {
    /* The previous version is kept as PATH~. */
    g_autofree char *kept = read_text (backup);
    g_assert_cmpstr (kept, ==, v1);
  }

  /* A save that fails half-way (here: the backup cannot be made because PATH~ is a folder
   * with a file in it) leaves the old file intact and names the file. Works as root too. */
  g_assert_no_errno (g_unlink (backup));
  g_assert_no_errno (g_mkdir (backup, 0755));
  {
    g_autofree char *inner = g_build_filename (backup, "keep", NULL);
    g_assert_true (g_file_set_contents (inner, "x", -1, NULL));
  }
  fw_project_set_title (project, "version 3");
  g_assert_false (fw_project_save (project, path, &error));
  g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_IO);
  g_assert_nonnull (strstr (error->message, "p.fwproj"));
  g_test_message ("failed save: %s", error->message);
  g_clear_error (&error);
  now = read_text (path);
  g_assert_cmpstr (now, ==, v2);
  g_assert_true (fw_project_get_dirty (project));
  /* No temporary file is left next to it: p.fwproj and the p.fwproj~ folder only. */
  g_assert_cmpuint (count_entries (dir), ==, 2);

  /* A folder without write permission (only meaningful when not root). */
  if (geteuid () != 0)
    {
      g_autofree char *ro_dir = g_build_filename (dir, "ro", NULL);
      g_autofree char *ro_path = g_build_filename (ro_dir, "q.fwproj", NULL);
      g_autofree char *before = NULL;
      g_autofree char *after = NULL;

      g_assert_no_errno (g_mkdir (ro_dir, 0755));
      g_assert_true (fw_project_save (project, ro_path, &error));
      before = read_text (ro_path);
      g_assert_no_errno (g_chmod (ro_dir, 0555));
      fw_project_set_title (project, "version 4");
      g_assert_false (fw_project_save (project, ro_path, &error));
      g_assert_nonnull (strstr (error->message, "q.fwproj"));
      g_clear_error (&error);
      after = read_text (ro_path);
      g_assert_cmpstr (before, ==, after);
      g_assert_no_errno (g_chmod (ro_dir, 0755));
    }
  else
    g_test_message ("running as root: the read-only folder case is not observable");

  /* Duplicate set names (made behind the project's back) are refused, not written. */
  {
    g_autoptr (FwParams) d = fw_params_new_default ();
    g_autoptr (FwParamSet) a = fw_param_set_new ("a", d);
    g_autoptr (FwParamSet) b = fw_param_set_new ("b", d);
    g_autofree char *path3 = g_build_filename (dir, "dup.fwproj", NULL);

    g_assert_true (fw_project_add_param_set (project, a, NULL));
    g_assert_true (fw_project_add_param_set (project, b, NULL));
    fw_param_set_set_name (b, "a");
    g_assert_false (fw_project_save (project, path3, &error));
    g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_DUPLICATE);
    g_clear_error (&error);
    g_assert_false (g_file_test (path3, G_FILE_TEST_EXISTS));
  }

  fw_test_remove_dir (dir);
}

/* A kill in the middle of saving never leaves a broken file: a child process saves a big
 * project in a loop and is killed after a while; the file must then load. */
static FwProject *
busy_project (const char *title)
{
  FwProject *project = fw_project_new ();

  for (guint i = 0; i < 3000; i++)
    {
      g_autofree char *p = g_strdup_printf ("/nowhere/clip-%05u.flac", i);
      g_autoptr (FwClip) clip = fw_clip_new (p);
      fw_clip_set_notes (clip, "a note long enough to make the file take a while to write");
      fw_project_add_clip (project, clip);
    }
  fw_project_set_title (project, title);
  return project;
}

static void
test_kill_during_save (void)
{
  const char *child_path = g_getenv ("FW_TEST_KILL_SAVE_PATH");

  if (g_test_subprocess ())
    {
      g_autoptr (FwProject) project = busy_project ("even");

      g_assert_nonnull (child_path);
      for (guint i = 0;; i++)
        {
          fw_project_set_title (project, i % 2 == 0 ? "even" : "odd");
          g_assert_true (fw_project_save (project, child_path, NULL));
        }
    }
  else
    {
      g_autofree char *dir = fw_test_make_dir ();
      g_autofree char *path = g_build_filename (dir, "busy.fwproj", NULL);
      g_autoptr (FwProject) initial = busy_project ("initial");
      guint timeouts_ms[] = { 400, 650, 900, 1150 };
      guint rewritten = 0;

      g_assert_true (fw_project_save (initial, path, NULL));
      g_setenv ("FW_TEST_KILL_SAVE_PATH", path, TRUE);
      for (guint i = 0; i < G_N_ELEMENTS (timeouts_ms); i++)
        {
          g_autoptr (FwProject) loaded = NULL;
          g_autoptr (GError) error = NULL;
          const char *title;

          g_test_trap_subprocess (NULL, (guint64) timeouts_ms[i] * 1000,
                                  G_TEST_SUBPROCESS_DEFAULT);
          g_test_trap_assert_failed ();   /* it was killed, it never ends by itself */
          loaded = fw_project_load (path, &error);
          g_assert_no_error (error);
          g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_clips (loaded)), ==, 3000);
          title = fw_project_get_title (loaded);
          g_assert_true (g_str_equal (title, "initial") || g_str_equal (title, "even")
                         || g_str_equal (title, "odd"));
          rewritten += !g_str_equal (title, "initial");
        }
      /* The child did get to save (otherwise the check above proves nothing). */
      g_assert_cmpuint (rewritten, >, 0);
      g_unsetenv ("FW_TEST_KILL_SAVE_PATH");
      fw_test_remove_dir (dir);
    }
}

/* The corpus: each file, the line its error must name, and a fragment of the message. */
typedef struct
{
  const char *file;
  int line;             /* 0: no line expected */
  int code;             /* an FwProjectError */
  const char *fragment;
} Malformed;

static const Malformed corpus[] = {
  { "syntax-not-key-value", 5, FW_PROJECT_ERROR_PARSE, "neither a group header nor key=value" },
  { "unknown-clip-key", 7, FW_PROJECT_ERROR_INVALID, "unknown key “colour”" },
  { "budget-not-number", 3, FW_PROJECT_ERROR_INVALID, "“lots” is not a whole number" },
  { "channel-bad", 7, FW_PROJECT_ERROR_INVALID, "“left” is not allowed" },
  { "duplicate-set-name", 9, FW_PROJECT_ERROR_INVALID, "named “defaults” already exists" },
  { "duplicate-group", 8, FW_PROJECT_ERROR_INVALID, "group [clip 1] appears twice (first on line 5)" },
  { "duplicate-key", 8, FW_PROJECT_ERROR_INVALID, "key “label” appears twice (first on line 7)" },
  { "truncated-no-end", 11, FW_PROJECT_ERROR_PARSE, "cut short" },
  { "truncated-group-line", 8, FW_PROJECT_ERROR_PARSE, "is not a group header" },
  { "param-bad-value", 8, FW_PROJECT_ERROR_INVALID, "triangle" },
  { "param-unknown-key", 7, FW_PROJECT_ERROR_INVALID, "unknown key “windw”" },
  { "param-conflict", 5, FW_PROJECT_ERROR_INVALID, "[parameter-set 1] (“odd”)" },
  { "clip-no-path", 5, FW_PROJECT_ERROR_INVALID, "lacks the required key “path”" },
  { "unknown-group", 5, FW_PROJECT_ERROR_INVALID, "unknown group [layers]" },
  { "not-a-project", 1, FW_PROJECT_ERROR_INVALID, "not a Framewise project" },
  { "no-format", 1, FW_PROJECT_ERROR_INVALID, "lacks a valid “format”" },
  { "format-zero", 2, FW_PROJECT_ERROR_INVALID, "0 is not a format version" },
  { "format-not-number", 1, FW_PROJECT_ERROR_INVALID, "lacks a valid “format”" },
  { "comparison-bad-stage", 7, FW_PROJECT_ERROR_INVALID, "“chroma” is not a stage name" },
  { "comparison-clip-without-set", 5, FW_PROJECT_ERROR_INVALID, "has no “a_param_set”" },
  { "empty-path", 6, FW_PROJECT_ERROR_INVALID, "key “path” is empty" },
  { "end-not-last", 8, FW_PROJECT_ERROR_INVALID, "[end] must be the last line" },
  { "duplicate-clip-path", 9, FW_PROJECT_ERROR_INVALID, "is already in the project" },
  { "key-before-group", 1, FW_PROJECT_ERROR_PARSE, "comes before any group header" },
  { "newer-format", 0, FW_PROJECT_ERROR_NEWER_FORMAT,
    "was written by a newer Framewise (format 7; this build reads up to 1)" },
};

static void
test_malformed_corpus (void)
{
  for (guint i = 0; i < G_N_ELEMENTS (corpus); i++)
    {
      const Malformed *m = &corpus[i];
      g_autofree char *name = g_strconcat (m->file, ".fwproj", NULL);
      g_autofree char *path = g_test_build_filename (G_TEST_DIST, "model", "project",
                                                     "malformed", name, NULL);
      g_autoptr (GError) error = NULL;
      g_autoptr (FwProject) project = NULL;

      g_assert_true (g_file_test (path, G_FILE_TEST_IS_REGULAR));
      project = fw_project_load (path, &error);
      g_test_message ("%s -> %s", name, error != NULL ? error->message : "(loaded!)");
      g_assert_null (project);
      g_assert_error (error, FW_PROJECT_ERROR, m->code);
      g_assert_nonnull (strstr (error->message, m->fragment));
      g_assert_nonnull (strstr (error->message, name));       /* names the file */
      if (m->line > 0)
        {
          g_autofree char *at = g_strdup_printf ("%s:%d: ", name, m->line);
          g_assert_nonnull (strstr (error->message, at));
        }
    }
}

static void
test_malformed_bytes (void)
{
  g_autoptr (GError) error = NULL;
  static const char with_nul[] = "[framewise-project]\nformat=1\nti\0tle=x\n[end]\n";
  static const char not_utf8[] = "[framewise-project]\nformat=1\ntitle=\xff\xfe\n\n[end]\n";

  g_assert_null (fw_project_load_from_data ("", 0, "empty.fwproj", &error));
  g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_PARSE);
  g_assert_nonnull (strstr (error->message, "empty.fwproj: the file is empty"));
  g_clear_error (&error);

  g_assert_null (fw_project_load_from_data (with_nul, sizeof with_nul - 1, "nul.fwproj", &error));
  g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_PARSE);
  g_assert_nonnull (strstr (error->message, "nul.fwproj:3: "));
  g_clear_error (&error);

  g_assert_null (fw_project_load_from_data (not_utf8, -1, "latin.fwproj", &error));
  g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_PARSE);
  g_assert_nonnull (strstr (error->message, "latin.fwproj:3: "));
  g_clear_error (&error);

  /* Every prefix of a valid file that loses its last line fails cleanly (never half-loads). */
  {
    g_autoptr (FwProject) p = fw_project_new ();
    g_autoptr (FwClip) c = fw_clip_new ("/nowhere/a.flac");
    g_autoptr (FwParams) d = fw_params_new_default ();
    g_autoptr (FwParamSet) s = fw_param_set_new ("defaults", d);
    g_autofree char *text = NULL;
    gsize len;
    guint failures = 0;

    fw_project_add_clip (p, c);
    g_assert_true (fw_project_add_param_set (p, s, NULL));
    text = fw_project_to_data (p, NULL);
    len = strlen (text);
    for (gsize cut = 0; cut + 6 < len; cut++)
      {
        g_autoptr (GError) e = NULL;
        g_autoptr (FwProject) q = fw_project_load_from_data (text, (gssize) cut, "cut.fwproj", &e);
        g_assert_null (q);
        g_assert_nonnull (e);
        g_assert_true (g_str_has_prefix (e->message, "cut.fwproj"));
        failures++;
      }
    g_assert_cmpuint (failures, >, 100);
    {
      g_autoptr (FwProject) whole = fw_project_load_from_data (text, (gssize) len, "w.fwproj", &error);
      g_assert_no_error (error);
      g_assert_nonnull (whole);
    }
  }
}

static void
test_newer_format (void)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *text = g_strdup_printf ("[framewise-project]\nformat=%d\n\n"
                                           "this would be a syntax error in format 1\n",
                                           FW_PROJECT_FORMAT_VERSION + 1);
  g_autofree char *expected = g_strdup_printf ("format %d; this build reads up to %d",
                                               FW_PROJECT_FORMAT_VERSION + 1,
                                               FW_PROJECT_FORMAT_VERSION);

  g_assert_null (fw_project_load_from_data (text, -1, "future.fwproj", &error));
  g_assert_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_NEWER_FORMAT);
  g_assert_nonnull (strstr (error->message, "future.fwproj was written by a newer Framewise"));
  g_assert_nonnull (strstr (error->message, expected));
}

static void
test_demo_project (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwProject) demo = NULL;
  g_autofree char *path = NULL;
  g_autofree char *expected = g_build_filename (g_getenv ("FW_SOURCE_DIR"), "data", "demo",
                                                "demo.fwproj", NULL);
  g_autoptr (GHashTable) per_label = g_hash_table_new (g_str_hash, g_str_equal);
  GListModel *clips;
  static const char *const set_names[] = { "defaults", "short-window", "long-window" };
  gboolean stereo = FALSE;
  GHashTable *rates = g_hash_table_new (NULL, NULL);

  g_unsetenv ("FRAMEWISE_DATA_DIR");
  path = fw_project_demo_path ();
  g_assert_cmpstr (path, ==, expected);
  demo = fw_project_load_demo (&error);
  g_assert_no_error (error);

  clips = fw_project_get_clips (demo);
  g_assert_cmpuint (g_list_model_get_n_items (clips), ==, 20);
  for (guint i = 0; i < 20; i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (clips, i);
      FwAudioInfo info = { 0 };
      const char *label = fw_clip_get_label (clip);

      g_assert_false (fw_clip_get_missing (clip));
      g_assert_true (fw_clip_get_info (clip, &info, &error));
      g_assert_no_error (error);
      g_assert_cmpstr (info.format, ==, "FLAC");
      g_assert_cmpint (info.bit_depth, ==, 16);
      g_assert_cmpfloat (info.duration, >=, 3.0);
      g_assert_cmpfloat (info.duration, <=, 5.0);
      g_hash_table_add (rates, GINT_TO_POINTER (info.sample_rate));
      stereo |= info.channels == 2;
      g_hash_table_insert (per_label, (gpointer) label,
                           GUINT_TO_POINTER (GPOINTER_TO_UINT (g_hash_table_lookup (per_label, label)) + 1));
      fw_audio_info_clear (&info);
    }
  g_assert_true (stereo);
  g_assert_cmpuint (g_hash_table_size (rates), ==, 3);
  g_assert_true (g_hash_table_contains (rates, GINT_TO_POINTER (16000)));
  g_assert_true (g_hash_table_contains (rates, GINT_TO_POINTER (22050)));
  g_assert_true (g_hash_table_contains (rates, GINT_TO_POINTER (44100)));
  g_hash_table_unref (rates);
  g_assert_cmpuint (g_hash_table_size (per_label), ==, 5);
  g_assert_cmpuint (GPOINTER_TO_UINT (g_hash_table_lookup (per_label, "calm-colony")), ==, 4);
  g_assert_cmpuint (GPOINTER_TO_UINT (g_hash_table_lookup (per_label, "agitated-colony")), ==, 4);
  g_assert_cmpuint (GPOINTER_TO_UINT (g_hash_table_lookup (per_label, "queen-piping")), ==, 4);
  g_assert_cmpuint (GPOINTER_TO_UINT (g_hash_table_lookup (per_label, "rain-on-lid")), ==, 4);
  g_assert_cmpuint (GPOINTER_TO_UINT (g_hash_table_lookup (per_label, "passing-vehicle")), ==, 4);

  g_assert_cmpuint (g_list_model_get_n_items (fw_project_get_param_sets (demo)), ==, 3);
  for (guint i = 0; i < 3; i++)
    g_assert_nonnull (fw_project_find_param_set (demo, set_names[i]));
  {
    g_autoptr (FwParams) d = fw_params_new_default ();
    g_assert_true (fw_params_equal (fw_param_set_get_params (fw_project_find_param_set (demo, "defaults")), d));
  }

  /* FRAMEWISE_DATA_DIR wins. */
  {
    g_autofree char *dir = fw_test_make_dir ();
    g_autofree char *demo_dir = g_build_filename (dir, "demo", NULL);
    g_autofree char *copy = g_build_filename (demo_dir, "demo.fwproj", NULL);
    g_autofree char *found = NULL;

    g_assert_no_errno (g_mkdir (demo_dir, 0755));
    g_assert_true (g_file_set_contents (copy, "[framewise-project]\nformat=1\n[end]\n", -1, NULL));
    g_setenv ("FRAMEWISE_DATA_DIR", dir, TRUE);
    found = fw_project_demo_path ();
    g_unsetenv ("FRAMEWISE_DATA_DIR");
    g_assert_cmpstr (found, ==, copy);
    fw_test_remove_dir (dir);
  }
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);

  g_test_add_func ("/fw/project/file/round-trip", test_round_trip);
  g_test_add_func ("/fw/project/file/moved-folder", test_moved_folder);
  g_test_add_func ("/fw/project/file/missing-and-relink", test_missing_and_relink);
  g_test_add_func ("/fw/project/file/atomic-save-and-backup", test_atomic_save_and_backup);
  g_test_add_func ("/fw/project/file/kill-during-save", test_kill_during_save);
  g_test_add_func ("/fw/project/file/malformed-corpus", test_malformed_corpus);
  g_test_add_func ("/fw/project/file/malformed-bytes", test_malformed_bytes);
  g_test_add_func ("/fw/project/file/newer-format", test_newer_format);
  g_test_add_func ("/fw/project/file/demo-project", test_demo_project);
  return g_test_run ();
}
