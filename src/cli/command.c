/*
 * command.c - the table of commands and the dispatch shared by the
 * program (main.c) and in-process calls (deltak/command.h).
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "command_table.h"
#include "commands.h"
#include "deltak/command.h"

int (*cli_explore_fn)(int argc, char **argv);

/* `deltak explore` is the program's own (src/cli/explore.c and
 * src/explore/, with libmicrohttpd), so that the library needs no HTTP
 * server: main.c hands it over through cli_explore_fn. */
static int
explore_entry(int argc, char **argv)
{
    if (!cli_explore_fn)
        return cli_error("explore is served by the deltak program, not by "
                         "the library");
    return cli_explore_fn(argc, argv);
}

/* Sorted by name. in_process: callable through dk_command_run. */
const cli_cmd cli_commands[] = {
    {"angle", cmd_angle, 1,
     "birefringent phase-matching directions, walk-off and d_eff"},
    {"chip", cmd_chip, 1,
     "multi-grating and fan-out poling layouts covering a target range"},
    {"crystals", cmd_crystals, 1,
     "list the crystal database, or show one crystal's data and sources"},
    {"explore", explore_entry, 0,
     "a local page on 127.0.0.1: move sliders, watch the design follow"},
    {"gain", cmd_gain, 1,
     "conversion efficiency, parametric gain and bandwidth, focusing"},
    {"index", cmd_index, 1,
     "refractive index, group index, GVD and TOD of each axis"},
    {"period", cmd_period, 1,
     "QPM poling period; or, for a period, temperature or wavelengths"},
    {"pulse", cmd_pulse, 1,
     "group velocities, GVM, GVD, pulse-splitting and walk-off lengths"},
    {"run", cmd_run, 0,
     "carry out a design file: every step, figures and a report"},
    {"simulate", cmd_simulate, 1,
     "pulsed three-wave mixing: spectra, pulses, energies along z"},
    {"sweep", cmd_sweep, 1,
     "tuning curves (1-D) and phase-matching maps (2-D), with --plot"},
    {"tolerance", cmd_tolerance, 1,
     "spectral, thermal and angular acceptance (FWHM) and sinc^2 curves"},
};
const size_t cli_ncommands = sizeof cli_commands / sizeof cli_commands[0];

const cli_cmd *
cli_find_command(const char *name)
{
    for (size_t i = 0; i < cli_ncommands; i++)
        if (strcmp(cli_commands[i].name, name) == 0)
            return &cli_commands[i];
    return NULL;
}

const char *const *
dk_command_names(void)
{
    static const char *names[sizeof cli_commands / sizeof cli_commands[0] +
                             1];
    for (size_t i = 0; i < cli_ncommands; i++)
        names[i] = cli_commands[i].name;
    names[cli_ncommands] = NULL;
    return names;
}

int
dk_command_run(int argc, const char *const *argv, dk_command_result *res)
{
    memset(res, 0, sizeof *res);
    FILE *out = open_memstream(&res->out, &res->nout);
    FILE *err = open_memstream(&res->err, &res->nerr);
    if (!out || !err) {
        if (out)
            fclose(out);
        if (err)
            fclose(err);
        free(res->out), free(res->err);
        res->out = res->err = NULL;
        return res->exit_code = CLI_FAIL;
    }
    cli_set_streams(out, err);
    const cli_cmd *c = argc > 0 && argv[0] ? cli_find_command(argv[0]) : NULL;
    if (!c || !c->in_process) {
        cli_error("'%s' is not a command that can be called in-process "
                  "(all but run and explore can)",
                  argc > 0 && argv[0] ? argv[0] : "");
        res->exit_code = CLI_USAGE;
    } else {
        /* The commands take a mutable argv, as main() gives them. */
        char **copy = malloc(((size_t)argc + 1) * sizeof *copy);
        if (!copy) {
            res->exit_code = cli_error("out of memory");
        } else {
            for (int i = 0; i < argc; i++)
                copy[i] = (char *)argv[i];
            copy[argc] = NULL;
            res->exit_code = c->fn(argc, copy);
            free(copy);
            cli_warnings_flush();
        }
    }
    if (fflush(out) || ferror(out))
        res->exit_code = res->exit_code ? res->exit_code : CLI_FAIL;
    cli_set_streams(NULL, NULL);
    fclose(out);
    fclose(err);
    return res->exit_code;
}

void
dk_command_result_free(dk_command_result *res)
{
    if (!res)
        return;
    free(res->out);
    free(res->err);
    res->out = res->err = NULL;
    res->nout = res->nerr = 0;
}
