/*
 * options.c - the shared option loop (see options.h).
 */
#include <string.h>

#include "options.h"

int
cli_parse_options(int argc, char **argv, const struct option *opts,
                  const char *const usage[], cli_common *cm,
                  cli_design_args *da, cli_plot_args *pa, cli_own_option own,
                  void *ctx, const char **positional, int *npos)
{
    int ch, rc, maxpos = npos ? *npos : 0;
    if (npos)
        *npos = 0;
    optind = 1;
    opterr = 0;
    /* "-" first: arguments that are not options come back in order, so
     * that "crystals BBO --json" and "run FILE --report X" both work. */
    while ((ch = getopt_long(argc, argv, "-h", opts, NULL)) != -1) {
        if (ch == 1) {
            if (!positional || *npos >= maxpos)
                return cli_usage_error(usage, "unexpected argument '%s'",
                                       optarg);
            positional[(*npos)++] = optarg;
            continue;
        }
        if (ch == 'h') {
            cli_print_usage(stdout, usage);
            return CLI_HELP;
        }
        rc = cm ? cli_common_option(ch, cm, usage) : 0;
        if (!rc && da)
            rc = cli_design_option(ch, opts, da, usage);
        if (!rc && pa)
            rc = cli_plot_option(ch, pa, usage);
        if (rc == 1)
            continue;
        if (rc)
            return rc;
        if (own && ch != '?' && ch != ':') {
            rc = own(ch, optarg, ctx);
            if (rc == 0)
                continue;
            if (rc > 0)
                return rc;
        }
        return cli_bad_option(argv, usage);
    }
    return 0;
}

int
cli_slot_option(int ch, const char *arg, void *ctx)
{
    cli_slots *sl = ctx;
    if (ch < sl->first || ch >= sl->first + sl->n)
        return -1;
    if (sl->slot[ch - sl->first]) {
        const char *name = "?";
        for (const struct option *o = sl->opts; o->name; o++)
            if (o->val == ch)
                name = o->name;
        return cli_usage_error(sl->usage, "--%s is given twice; give it "
                                          "once",
                               name);
    }
    sl->slot[ch - sl->first] = arg ? arg : "";
    return 0;
}
