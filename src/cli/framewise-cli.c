/* framewise-cli: the command-line front end over src/model and src/render (no GTK). */
#include "fw-config.h"

#include <locale.h>
#include <stdio.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-cli.h"
#include "fw-fft.h"

typedef struct {
  const char *name;
  int (*run) (int argc, char **argv);
  const char *summary;
} FwCliCommand;

static const FwCliCommand commands[] = {
  { "features", fw_cli_features, N_("compute one stage for a clip and write NPY or CSV") },
  { "info", fw_cli_info, N_("file facts and the analysis facts for choosing window and hop") },
  { "params", fw_cli_params, N_("print the canonical parameter text and its hash") },
  { "project", fw_cli_project, N_("list a project's clips and parameter sets") },
  { "batch", fw_cli_batch, N_("compute one stage for every clip of a project") },
  { "render", fw_cli_render, N_("draw a publication figure (SVG, PDF or PNG)") },
  { "figure-recipe", fw_cli_figure_recipe, N_("print the parameters embedded in a figure") },
  { "compare", fw_cli_compare, N_("compare two feature matrices and explain the difference") },
  { "explain", fw_cli_explain, N_("find the conventions that reproduce a feature dump") },
};

void
fw_cli_error (const char *format, ...)
{
  va_list ap;
  g_autofree char *msg = NULL;

  va_start (ap, format);
  msg = g_strdup_vprintf (format, ap);
  va_end (ap);
  fprintf (stderr, "framewise-cli: %s\n", msg);
}

static void
usage (FILE *out)
{
  fprintf (out, "%s\n\n", _("Usage: framewise-cli COMMAND [OPTIONS...]"));
  fprintf (out, "%s\n", _("Commands:"));
  for (gsize i = 0; i < G_N_ELEMENTS (commands); i++)
    fprintf (out, "  %-14s %s\n", commands[i].name, _(commands[i].summary));
  fprintf (out, "\n%s\n", _("Run 'framewise-cli COMMAND --help' for a command's options."));
}

int
main (int argc, char **argv)
{
  int status;

  setlocale (LC_ALL, "");
  bindtextdomain (GETTEXT_PACKAGE, FW_LOCALEDIR);
  bind_textdomain_codeset (GETTEXT_PACKAGE, "UTF-8");
  textdomain (GETTEXT_PACKAGE);

  if (argc < 2 || strcmp (argv[1], "--help") == 0 || strcmp (argv[1], "-h") == 0)
    {
      usage (argc < 2 ? stderr : stdout);
      return argc < 2 ? FW_CLI_EXIT_ERROR : FW_CLI_EXIT_OK;
    }
  if (strcmp (argv[1], "--version") == 0)
    {
      printf ("framewise-cli %s\n", FW_VERSION);
      return FW_CLI_EXIT_OK;
    }

  for (gsize i = 0; i < G_N_ELEMENTS (commands); i++)
    if (strcmp (argv[1], commands[i].name) == 0)
      {
        status = commands[i].run (argc - 1, argv + 1);
        fw_fft_cleanup ();
        return status;
      }

  fw_cli_error (_("unknown command '%s'"), argv[1]);
  usage (stderr);
  return FW_CLI_EXIT_ERROR;
}
