/* fw-project-private.h: in-tree helpers shared by fw-project.c and fw-project-file.c. */
#pragma once

#include "fw-project.h"

G_BEGIN_DECLS

/* Sets "path" (NULL allowed) without touching "dirty". */
void _fw_project_set_path (FwProject *self, const char *path);

G_END_DECLS
