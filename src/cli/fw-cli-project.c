/* fw-cli-project.c: placeholder until this subcommand group is written. */
#include "fw-cli.h"

int
fw_cli_project (int argc, char **argv)
{
  fw_cli_error ("'%s' is not available in this build yet", argv[0]);
  return FW_CLI_EXIT_ERROR;
}

int
fw_cli_batch (int argc, char **argv)
{
  fw_cli_error ("'%s' is not available in this build yet", argv[0]);
  return FW_CLI_EXIT_ERROR;
}

