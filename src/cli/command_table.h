/*
 * command_table.h - the commands of deltak, one row each (command.c),
 * shared by the program and in-process calls.
 */
#ifndef DK_CLI_COMMAND_TABLE_H
#define DK_CLI_COMMAND_TABLE_H

#include <stddef.h>

typedef struct cli_cmd {
    const char *name;
    int (*fn)(int argc, char **argv);
    int in_process;        /* 1: callable through dk_command_run */
    const char *summary;
} cli_cmd;

extern const cli_cmd cli_commands[];
extern const size_t cli_ncommands;

/* The command named @name, or NULL. */
const cli_cmd *cli_find_command(const char *name);

#endif /* DK_CLI_COMMAND_TABLE_H */
