/*
 * options.c - the shared option loop (see options.h).
 *
 * A small parser of our own rather than getopt_long: getopt keeps its
 * state in globals (optind, optarg), and commands are also called
 * in-process, from several threads (the Python module, `deltak
 * explore`). Options are long only ("--name value" or "--name=value"),
 * matched exactly, plus "-h"; "--" ends the options.
 */
#include <string.h>

#include "options.h"

/* The option of @opts named @name (length @len), or NULL. */
static const struct option *
find(const struct option *opts, const char *name, size_t len)
{
    for (const struct option *o = opts; o->name; o++)
        if (strlen(o->name) == len && !strncmp(o->name, name, len))
            return o;
    return NULL;
}

/* "unknown option", with the nearest known name when one is close. */
static int
unknown(const struct option *opts, const char *arg,
        const char *const usage[])
{
    const char *best = NULL;
    int bestd = 3;
    const char *name = arg + 2;
    size_t len = strcspn(name, "=");
    char word[80];
    snprintf(word, sizeof word, "%.*s", (int)(len < 79 ? len : 79), name);
    for (const struct option *o = opts; o->name; o++) {
        int d = cli_edit_distance(word, o->name);
        if (d < bestd)
            bestd = d, best = o->name;
    }
    char esc[160];
    if (best)
        return cli_usage_error(usage, "unknown option '%s'; did you mean "
                                      "'--%s'?",
                               cli_escape(arg, esc, sizeof esc), best);
    return cli_usage_error(usage, "unknown option '%s'",
                           cli_escape(arg, esc, sizeof esc));
}

int
cli_parse_options(int argc, char **argv, const struct option *opts,
                  const char *const usage[], cli_common *cm,
                  cli_design_args *da, cli_plot_args *pa, cli_own_option own,
                  void *ctx, const char **positional, int *npos)
{
    int maxpos = npos ? *npos : 0, rc, only_positional = 0;
    char esc[160];
    if (npos)
        *npos = 0;
    for (int i = 1; i < argc; i++) {
        const char *a = argv[i];
        if (only_positional || a[0] != '-' || !a[1]) {
            if (!positional || *npos >= maxpos)
                return cli_usage_error(usage, "unexpected argument '%s'",
                                       cli_escape(a, esc, sizeof esc));
            positional[(*npos)++] = a;
            continue;
        }
        if (!strcmp(a, "--")) {
            only_positional = 1;
            continue;
        }
        if (!strcmp(a, "-h") || !strcmp(a, "--help")) {
            cli_print_usage(cli_stdout(), usage);
            return CLI_HELP;
        }
        if (a[1] != '-')
            return unknown(opts, a, usage);
        const char *name = a + 2, *eq = strchr(name, '=');
        const struct option *o =
            find(opts, name, eq ? (size_t)(eq - name) : strlen(name));
        if (!o)
            return unknown(opts, a, usage);
        const char *arg = NULL;
        if (o->has_arg == no_argument) {
            if (eq)
                return cli_usage_error(usage, "--%s takes no value", o->name);
        } else if (eq) {
            arg = eq + 1;
        } else if (i + 1 < argc) {
            arg = argv[++i];
        } else {
            return cli_usage_error(usage, "--%s needs a value", o->name);
        }
        int ch = o->val;
        rc = cm ? cli_common_option(ch, arg, cm, usage) : 0;
        if (!rc && da)
            rc = cli_design_option(ch, arg, opts, da, usage);
        if (!rc && pa)
            rc = cli_plot_option(ch, arg, pa, usage);
        if (rc == 1)
            continue;
        if (rc)
            return rc;
        if (own) {
            rc = own(ch, arg, ctx);
            if (rc == 0)
                continue;
            if (rc > 0)
                return rc;
        }
        return unknown(opts, a, usage);
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
