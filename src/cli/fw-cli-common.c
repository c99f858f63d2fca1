/* fw-cli-common.c: option parsing and parameter loading shared by the subcommands. */
#include "fw-config.h"

#include <glib/gi18n.h>

#include "fw-cli.h"
#include "fw-params.h"

FwParams *
fw_cli_load_params (const char *file, char **settings, GError **error)
{
  g_autoptr (FwParams) base = NULL;
  g_autoptr (GError) local = NULL;
  FwParams *p;

  base = file != NULL ? fw_params_new_from_file (file, error) : fw_params_new_default ();
  if (base == NULL)
    return NULL;
  if (settings == NULL || settings[0] == NULL)
    return g_steal_pointer (&base);
  p = fw_params_with_settings (base, (const char *const *) settings, &local);
  if (p == NULL)
    g_set_error (error, local->domain, local->code, "--set: %s", local->message);
  return p;
}

GOptionContext *
fw_cli_option_context_new (const char *parameter_string, const char *summary,
                           GOptionEntry *entries)
{
  GOptionContext *ctx = g_option_context_new (parameter_string);

  g_option_context_set_summary (ctx, summary);
  g_option_context_add_main_entries (ctx, entries, GETTEXT_PACKAGE);
  g_option_context_set_translation_domain (ctx, GETTEXT_PACKAGE);
  return ctx;
}

gboolean
fw_cli_parse_options (GOptionContext *ctx, const char *command, int *argc, char ***argv)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *prgname = g_strdup_printf ("framewise-cli %s", command);

  /* so that --help and usage messages read "framewise-cli features [OPTION...]" */
  g_set_prgname (prgname);
  if (!g_option_context_parse (ctx, argc, argv, &error))
    {
      fw_cli_error ("%s: %s", command, error->message);
      return FALSE;
    }
  return TRUE;
}
