/* test-desktop-file.c: data/ files of the workbench: the desktop entry passes
 * desktop-file-validate (skipped when the tool is missing) and names our icon. */
#include "fw-config.h"

#include <string.h>

#include <glib.h>

static void
test_desktop_file_valid (void)
{
  g_autofree char *validator = g_find_program_in_path ("desktop-file-validate");
  g_autofree char *path = g_build_filename (FW_BUILD_DIR, "data", "org.framewise.Workbench.desktop", NULL);
  g_autofree char *out = NULL, *err = NULL;
  g_autoptr (GError) error = NULL;
  int status = -1;
  const char *argv[] = { NULL, NULL, NULL };

  if (validator == NULL)
    {
      g_test_skip ("desktop-file-validate is not installed (Debian: desktop-file-utils)");
      return;
    }
  g_assert_true (g_file_test (path, G_FILE_TEST_EXISTS));
  argv[0] = validator;
  argv[1] = path;
  g_assert_true (g_spawn_sync (NULL, (char **) argv, NULL, G_SPAWN_DEFAULT, NULL, NULL, &out,
                               &err, &status, &error));
  g_assert_no_error (error);
  g_test_message ("desktop-file-validate: %s%s", out, err);
  /* hints are fine; errors are not */
  g_assert_null (strstr (out, "error:"));
  g_assert_null (strstr (err, "error:"));
  g_assert_true (g_spawn_check_wait_status (status, &error));
  g_assert_no_error (error);
}

static void
test_desktop_file_names_icon (void)
{
  g_autofree char *path = g_build_filename (FW_BUILD_DIR, "data", "org.framewise.Workbench.desktop", NULL);
  g_autofree char *icon_path = g_build_filename (FW_SOURCE_DIR, "data", "icons", "hicolor",
                                                 "scalable", "apps", "org.framewise.Workbench.svg", NULL);
  g_autoptr (GKeyFile) kf = g_key_file_new ();
  g_autoptr (GError) error = NULL;
  g_autofree char *icon = NULL, *exec = NULL, *name_de = NULL, *svg = NULL;

  g_assert_true (g_key_file_load_from_file (kf, path, G_KEY_FILE_KEEP_TRANSLATIONS, &error));
  g_assert_no_error (error);
  icon = g_key_file_get_string (kf, "Desktop Entry", "Icon", &error);
  g_assert_no_error (error);
  g_assert_cmpstr (icon, ==, "org.framewise.Workbench");
  exec = g_key_file_get_string (kf, "Desktop Entry", "Exec", &error);
  g_assert_true (g_str_has_prefix (exec, "framewise "));
  /* the translation is merged in */
  name_de = g_key_file_get_locale_string (kf, "Desktop Entry", "Comment", "de", &error);
  g_assert_no_error (error);
  g_assert_cmpstr (name_de, !=, g_key_file_get_string (kf, "Desktop Entry", "Comment", NULL));
  g_assert_true (g_file_get_contents (icon_path, &svg, NULL, &error));
  g_assert_nonnull (strstr (svg, "<svg"));
}

/* The AppStream metadata passes appstreamcli (skipped when the tool is missing). */
static void
test_metainfo_valid (void)
{
  g_autofree char *tool = g_find_program_in_path ("appstreamcli");
  g_autofree char *path = g_build_filename (FW_BUILD_DIR, "data", "org.framewise.Workbench.metainfo.xml", NULL);
  g_autofree char *out = NULL, *err = NULL;
  g_autoptr (GError) error = NULL;
  int status = -1;
  const char *argv[] = { NULL, "validate", "--no-net", NULL, NULL };

  if (tool == NULL)
    {
      g_test_skip ("appstreamcli is not installed (Debian: appstream)");
      return;
    }
  g_assert_true (g_file_test (path, G_FILE_TEST_EXISTS));
  argv[0] = tool;
  argv[3] = path;
  g_assert_true (g_spawn_sync (NULL, (char **) argv, NULL, G_SPAWN_DEFAULT, NULL, NULL, &out,
                               &err, &status, &error));
  g_assert_no_error (error);
  g_test_message ("appstreamcli: %s%s", out, err);
  g_assert_true (g_spawn_check_wait_status (status, &error));
  g_assert_no_error (error);
}

int
main (int argc, char **argv)
{
  g_test_init (&argc, &argv, NULL);
  g_test_add_func ("/fw/gtk/data/desktop-file-valid", test_desktop_file_valid);
  g_test_add_func ("/fw/gtk/data/desktop-file-names-icon", test_desktop_file_names_icon);
  g_test_add_func ("/fw/gtk/data/metainfo-valid", test_metainfo_valid);
  return g_test_run ();
}
