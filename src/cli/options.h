/*
 * options.h - the option loop every command shares: the common options,
 * the design options (design_args.h) and the figure options
 * (plot_args.h) are taken here; a command's own options go to its
 * handler. One loop, so that repeated options, unknown options and
 * --help behave alike in every command.
 */
#ifndef DK_CLI_OPTIONS_H
#define DK_CLI_OPTIONS_H

#include <getopt.h>   /* struct option, for the option tables */

#include "cli.h"
#include "design_args.h"
#include "plot_args.h"

/* Returned by cli_parse_options after --help: the command returns 0. */
#define CLI_HELP 3

/*
 * A command's own option: @ch its getopt code, @arg its argument (NULL
 * for flags). Returns 0 when taken, CLI_USAGE after printing an error,
 * -1 when it is not the command's.
 */
typedef int (*cli_own_option)(int ch, const char *arg, void *ctx);

/*
 * A command's own options as text slots: options with getopt codes
 * @first … @first + @n − 1 land in slot[code − first] (flags get ""),
 * a repeated one is refused with its name. Use cli_slot_option as the
 * own handler with a cli_slots as its context.
 */
typedef struct cli_slots {
    int first, n;
    const char **slot;
    const struct option *opts;
    const char *const *usage;
} cli_slots;

int cli_slot_option(int ch, const char *arg, void *ctx);

/*
 * cli_parse_options:
 * @da, @pa: where design and figure options go; NULL when the command
 *   takes none
 * @own, @ctx: the command's own options; NULL when it has none
 * @positional, @npos: where arguments that are not options go (up to
 *   @npos); NULL: none allowed
 * Returns: 0; CLI_USAGE (printed); CLI_HELP (usage printed on stdout).
 */
int cli_parse_options(int argc, char **argv, const struct option *opts,
                      const char *const usage[], cli_common *cm,
                      cli_design_args *da, cli_plot_args *pa,
                      cli_own_option own, void *ctx, const char **positional,
                      int *npos);

#endif /* DK_CLI_OPTIONS_H */
