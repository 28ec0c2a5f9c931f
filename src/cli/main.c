/*
 * main.c - the deltak program: find the subcommand in the table and run it.
 */
#include <errno.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "command_table.h"

#define NCOMMANDS cli_ncommands
#define commands cli_commands

static void
print_help(FILE *f)
{
    fprintf(f, "deltak %s - phase-matching designer for nonlinear frequency "
               "conversion\n\n"
               "usage: deltak <command> [options]\n"
               "       deltak <command> --help\n"
               "       deltak --version\n\ncommands:\n",
            DK_VERSION);
    for (size_t i = 0; i < NCOMMANDS; i++)
        fprintf(f, "  %-10s %s\n", commands[i].name, commands[i].summary);
    fprintf(f, "\nWavelengths carry a unit: %s.\n"
               "Temperatures are in C (a K suffix is accepted).\n"
               "\nLaser safety: these are Class 3B/4 systems and mid-infrared "
               "beams are invisible;\nlocal laser-safety rules and your laser "
               "safety officer take precedence.\n",
            "1064nm, 1.064um, 9398cm-1, 281.8THz");
}

/* Whatever went to standard output must have arrived: a full disk or a
 * closed pipe is a failure, not a success with nothing written. */
static int
finish(int rc)
{
    if (fflush(stdout) != 0 || ferror(stdout)) {
        fprintf(stderr, "error: cannot write the output: %s\n",
                strerror(errno ? errno : EIO));
        return rc ? rc : CLI_FAIL;
    }
    return rc;
}

/* The closest command name to @name, or NULL (edit distance ≤ 2). */
static const char *
closest(const char *name)
{
    const char *best = NULL;
    int bestd = 3;
    for (size_t i = 0; i < NCOMMANDS; i++) {
        int d = cli_edit_distance(name, commands[i].name);
        if (d < bestd)
            bestd = d, best = commands[i].name;
    }
    return best;
}

int
main(int argc, char **argv)
{
    if (argc < 2) {
        print_help(stderr);
        return CLI_USAGE;
    }
    const char *name = argv[1];
    if (strcmp(name, "--version") == 0 || strcmp(name, "version") == 0) {
        printf("deltak %s\n", DK_VERSION);
        return finish(0);
    }
    if (strcmp(name, "--help") == 0 || strcmp(name, "-h") == 0 ||
        strcmp(name, "help") == 0) {
        print_help(stdout);
        return finish(0);
    }
    for (size_t i = 0; i < NCOMMANDS; i++)
        if (strcmp(commands[i].name, name) == 0) {
            int rc = commands[i].fn(argc - 1, argv + 1);
            cli_warnings_flush();
            return finish(rc);
        }
    char esc[128];
    const char *near = closest(name);
    fprintf(stderr, "error: unknown command '%s'%s%s%s\n\n",
            cli_escape(name, esc, sizeof esc), near ? "; did you mean '" : "",
            near ? near : "", near ? "'?" : "");
    print_help(stderr);
    return CLI_USAGE;
}
