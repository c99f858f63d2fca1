/* fw-recent.h: the workbench's small state file (recent projects, chosen rows).
 *
 * A GKeyFile at g_get_user_config_dir()/framewise/state.ini, written atomically. Nothing in
 * it is essential: a missing or unreadable file means "first start".
 */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

#define FW_RECENT_MAX 10

/* Path of the state file (caller frees). FW_STATE_DIR in the environment overrides the
 * directory (tests use it). */
char *fw_recent_state_path (void);

/* Recent projects, most recent first; NULL-terminated, caller frees with g_strfreev. */
GStrv fw_recent_list (void);
/* Moves (or adds) path to the front and saves. Errors are only logged. */
void fw_recent_add (const char *path);
void fw_recent_remove (const char *path);

/* Row choice for new windows: ids such as "waveform;db;mel-db;mfcc". NULL if never saved. */
GStrv fw_recent_get_rows (void);
void fw_recent_set_rows (const char *const *ids);

G_END_DECLS
