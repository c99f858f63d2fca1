/* fw-recent.c: recent projects and remembered view choices in a small keyfile. */
#include "fw-recent.h"

#include <errno.h>

#include <gio/gio.h>

#define GROUP_RECENT "recent"
#define GROUP_VIEW "view"

char *
fw_recent_state_path (void)
{
  const char *dir = g_getenv ("FW_STATE_DIR");

  if (dir != NULL && *dir != '\0')
    return g_build_filename (dir, "state.ini", NULL);
  return g_build_filename (g_get_user_config_dir (), "framewise", "state.ini", NULL);
}

static GKeyFile *
load (void)
{
  g_autofree char *path = fw_recent_state_path ();
  GKeyFile *kf = g_key_file_new ();

  /* A missing or damaged state file is the same as a first start. */
  g_key_file_load_from_file (kf, path, G_KEY_FILE_NONE, NULL);
  return kf;
}

static void
save (GKeyFile *kf)
{
  g_autofree char *path = fw_recent_state_path ();
  g_autofree char *dir = g_path_get_dirname (path);
  g_autoptr (GError) error = NULL;
  gsize len = 0;
  g_autofree char *data = g_key_file_to_data (kf, &len, NULL);

  if (g_mkdir_with_parents (dir, 0700) != 0 ||
      !g_file_set_contents (path, data, (gssize) len, &error))
    g_warning ("Could not save %s: %s", path,
               error != NULL ? error->message : g_strerror (errno));
}

GStrv
fw_recent_list (void)
{
  g_autoptr (GKeyFile) kf = load ();
  GStrv list = g_key_file_get_string_list (kf, GROUP_RECENT, "projects", NULL, NULL);

  return list != NULL ? list : g_new0 (char *, 1);
}

static void
store_list (GKeyFile *kf, GPtrArray *items)
{
  g_key_file_set_string_list (kf, GROUP_RECENT, "projects",
                              (const char *const *) items->pdata, items->len);
}

void
fw_recent_add (const char *path)
{
  g_autoptr (GKeyFile) kf = NULL;
  g_auto (GStrv) old = NULL;
  g_autoptr (GPtrArray) items = g_ptr_array_new ();
  g_autoptr (GFile) file = NULL;
  g_autofree char *abs = NULL;

  g_return_if_fail (path != NULL);
  file = g_file_new_for_path (path);
  abs = g_file_get_path (file);
  kf = load ();
  old = g_key_file_get_string_list (kf, GROUP_RECENT, "projects", NULL, NULL);
  g_ptr_array_add (items, abs);
  for (guint i = 0; old != NULL && old[i] != NULL && items->len < FW_RECENT_MAX; i++)
    if (g_strcmp0 (old[i], abs) != 0)
      g_ptr_array_add (items, old[i]);
  store_list (kf, items);
  save (kf);
}

void
fw_recent_remove (const char *path)
{
  g_autoptr (GKeyFile) kf = load ();
  g_auto (GStrv) old = g_key_file_get_string_list (kf, GROUP_RECENT, "projects", NULL, NULL);
  g_autoptr (GPtrArray) items = g_ptr_array_new ();

  for (guint i = 0; old != NULL && old[i] != NULL; i++)
    if (g_strcmp0 (old[i], path) != 0)
      g_ptr_array_add (items, old[i]);
  store_list (kf, items);
  save (kf);
}

GStrv
fw_recent_get_rows (void)
{
  g_autoptr (GKeyFile) kf = load ();
  return g_key_file_get_string_list (kf, GROUP_VIEW, "rows", NULL, NULL);
}

void
fw_recent_set_rows (const char *const *ids)
{
  g_autoptr (GKeyFile) kf = load ();

  g_key_file_set_string_list (kf, GROUP_VIEW, "rows", ids, g_strv_length ((GStrv) ids));
  save (kf);
}
