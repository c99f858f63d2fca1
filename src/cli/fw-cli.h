/* fw-cli.h: framewise-cli subcommands. One file per subcommand group, fw-cli-*.c. */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

/* Exit codes shared by every subcommand. */
enum {
  FW_CLI_EXIT_OK = 0,
  FW_CLI_EXIT_FAILURE = 1, /* the command ran, the answer is "no" (e.g. compare beyond tolerance) */
  FW_CLI_EXIT_ERROR = 2,   /* bad input: a message on stderr names the file/parameter and cause */
};

/* Each takes argv with argv[0] = the subcommand name. */
int fw_cli_features (int argc, char **argv);
int fw_cli_info (int argc, char **argv);
int fw_cli_params (int argc, char **argv);
int fw_cli_project (int argc, char **argv);
int fw_cli_batch (int argc, char **argv);
int fw_cli_render (int argc, char **argv);
int fw_cli_figure_recipe (int argc, char **argv);
int fw_cli_compare (int argc, char **argv);
int fw_cli_explain (int argc, char **argv);

/* Shared by the subcommands (fw-cli-common.c). */
typedef struct _FwParams FwParams;
/* The parameter set from FILE (NULL = the defaults) with the "KEY=VALUE" settings of --set
 * applied in order; errors name the file or the --set value. */
FwParams *fw_cli_load_params (const char *file, char **settings, GError **error);
/* A GOptionContext in the framewise domain with a summary and main entries. */
GOptionContext *fw_cli_option_context_new (const char *parameter_string, const char *summary,
                                           GOptionEntry *entries);
/* Parses; usage messages read "framewise-cli COMMAND ...". FALSE after printing the error. */
gboolean fw_cli_parse_options (GOptionContext *ctx, const char *command, int *argc,
                               char ***argv);

/* Prints "framewise-cli: " + message to stderr. */
void fw_cli_error (const char *format, ...) G_GNUC_PRINTF (1, 2);

G_END_DECLS
