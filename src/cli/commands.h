/*
 * commands.h - the subcommands of deltak.
 *
 * Adding a subcommand:
 *  1. write src/cli/<name>.c exporting only `int cmd_<name>(int, char **)`;
 *     it parses its options (getopt_long table beside a usage array),
 *     calls the engine, prints through cli_out, and returns 0, CLI_FAIL
 *     or CLI_USAGE;
 *  2. declare it below;
 *  3. add a row to the sorted commands[] table in src/cli/main.c;
 *  4. add command-line tests to tests/cli/run.sh and a line to README.md.
 * No numerical code belongs in src/cli/.
 */
#ifndef DK_CLI_COMMANDS_H
#define DK_CLI_COMMANDS_H

int cmd_angle(int argc, char **argv);
int cmd_chip(int argc, char **argv);
int cmd_crystals(int argc, char **argv);
/* The program's own (src/cli/explore.c, not in the library). */
int cmd_explore(int argc, char **argv);
int cmd_gain(int argc, char **argv);
int cmd_index(int argc, char **argv);
int cmd_period(int argc, char **argv);
int cmd_pulse(int argc, char **argv);
int cmd_run(int argc, char **argv);
int cmd_simulate(int argc, char **argv);
int cmd_sweep(int argc, char **argv);
int cmd_tolerance(int argc, char **argv);

#endif /* DK_CLI_COMMANDS_H */
