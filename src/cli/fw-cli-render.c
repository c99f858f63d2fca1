/* fw-cli-render.c: placeholder until this subcommand group is written. */
#include "fw-cli.h"

int
fw_cli_render (int argc, char **argv)
{
  fw_cli_error ("'%s' is not available in this build yet", argv[0]);
  return FW_CLI_EXIT_ERROR;
}

int
fw_cli_figure_recipe (int argc, char **argv)
{
  fw_cli_error ("'%s' is not available in this build yet", argv[0]);
  return FW_CLI_EXIT_ERROR;
}

