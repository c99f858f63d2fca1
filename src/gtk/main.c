/* main.c: entry point of the `framewise` workbench. */
#include "fw-config.h"

#include <locale.h>

#include <glib/gi18n.h>

#include "fw-application.h"

int
main (int argc, char **argv)
{
  g_autoptr (FwApplication) app = NULL;

  setlocale (LC_ALL, "");
  /* FW_LOCALEDIR in the environment points at uninstalled translations (build/po). */
  bindtextdomain (GETTEXT_PACKAGE, g_getenv ("FW_LOCALEDIR") != NULL ? g_getenv ("FW_LOCALEDIR")
                                                                   : FW_LOCALEDIR);
  bind_textdomain_codeset (GETTEXT_PACKAGE, "UTF-8");
  textdomain (GETTEXT_PACKAGE);

  app = fw_application_new ();
  return g_application_run (G_APPLICATION (app), argc, argv);
}
