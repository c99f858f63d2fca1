/* fw-application.h: the Framewise workbench application (command line, windows, about). */
#pragma once

#include <gtk/gtk.h>

G_BEGIN_DECLS

#define FW_TYPE_APPLICATION (fw_application_get_type ())
G_DECLARE_FINAL_TYPE (FwApplication, fw_application, FW, APPLICATION, GtkApplication)

FwApplication *fw_application_new (void);

/* Whether the GTK style asks for dark colours (system preference or dark theme). */
gboolean fw_application_is_dark (void);

G_END_DECLS
