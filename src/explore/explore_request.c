/*
 * explore_request.c - a request of the page turned into the command line
 * that answers it (see explore.h).
 *
 * /api/period?crystal=MgO:LN&pump=1064nm&idler=3.4um&temp=40 becomes
 *   period --crystal=MgO:LN --pump=1064nm --idler=3.4um --temp=40 --json
 * and /figure/sweep.svg?... becomes sweep ... --plot=-.svg (the figure on
 * the command's standard output, deltak/plot.h). Options are passed as
 * "--name=value", so that a value starting with '-' (a temperature of
 * -10) stays a value; an empty value gives "--name" alone (a flag such
 * as --all-sets), placed after the others. What an option means, and
 * whether its value is good, is the command's business: it refuses an
 * unknown option or a bare number with its own message, which becomes
 * the answer. Only what the page sets itself (output format, figure
 * file) is refused here, and the amount of work is bounded.
 */
#include <ctype.h>
#include <errno.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "explore.h"

/* The points `deltak sweep` takes along --vary when no count is given
 * (DEFAULT_POINTS in src/cli/sweep.c). */
#define SWEEP_DEFAULT_POINTS 201

/* The commands the page may call: all but run and explore, which start
 * processes or servers. */
static const char *const api_commands[] = {
    "angle", "chip", "crystals", "gain", "index", "period", "pulse",
    "sweep", "tolerance"};
/* The commands that draw a figure with --plot and --plot=-.FMT. */
static const char *const figure_commands[] = {"sweep", "tolerance"};

/* Names the page sets itself, or that would write files or change the
 * output format; and the figure options it does not offer. */
static const char *const refused[] = {
    "json", "csv", "plot", "help", "xrange", "yrange", "log", "title",
    "legend", "font-size"};

static int fail(char *msg, size_t nmsg, int code, const char *fmt, ...)
    __attribute__((format(printf, 4, 5)));

static int
fail(char *msg, size_t nmsg, int code, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, nmsg, fmt, ap);
    va_end(ap);
    return code;
}

/* A copy of @n bytes of @s (NUL added) in the call's store, or NULL. */
static char *
keep(explore_call *c, const char *prefix, const char *s, size_t n,
     const char *middle, const char *s2, size_t n2)
{
    size_t lp = strlen(prefix), lm = middle ? strlen(middle) : 0;
    size_t need = lp + n + lm + n2 + 1;
    if (c->used + need > sizeof c->store)
        return NULL;
    char *p = c->store + c->used;
    memcpy(p, prefix, lp);
    memcpy(p + lp, s, n);
    if (middle)
        memcpy(p + lp + n, middle, lm);
    if (n2)
        memcpy(p + lp + n + lm, s2, n2);
    p[need - 1] = '\0';
    c->used += need;
    return p;
}

static int
in_list(const char *s, size_t n, const char *const *list, size_t nlist)
{
    for (size_t i = 0; i < nlist; i++)
        if (strlen(list[i]) == n && !strncmp(list[i], s, n))
            return 1;
    return 0;
}

#define NELEM(a) (sizeof(a) / sizeof((a)[0]))

int
explore_call_begin(explore_call *c, const char *path, char *msg, size_t nmsg)
{
    memset(c, 0, sizeof *c);
    const char *name;
    size_t len;
    if (!strncmp(path, "/api/", 5)) {
        c->kind = EXPLORE_JSON;
        name = path + 5;
        len = strlen(name);
        if (!in_list(name, len, api_commands, NELEM(api_commands)))
            return fail(msg, nmsg, 404,
                        "no command '%.40s' here: the API offers angle, "
                        "chip, crystals, gain, index, period, pulse, sweep "
                        "and tolerance",
                        name);
    } else if (!strncmp(path, "/figure/", 8)) {
        c->kind = EXPLORE_FIGURE;
        name = path + 8;
        const char *dot = strrchr(name, '.');
        len = dot ? (size_t)(dot - name) : strlen(name);
        if (!dot || (strcmp(dot, ".svg") && strcmp(dot, ".pdf") &&
                     strcmp(dot, ".png")) ||
            !in_list(name, len, figure_commands, NELEM(figure_commands)))
            return fail(msg, nmsg, 404,
                        "no figure '%.40s' here: figures are "
                        "/figure/sweep.FMT and /figure/tolerance.FMT with "
                        "FMT svg, pdf or png",
                        name);
        c->format = !strcmp(dot, ".svg") ? "svg"
                    : !strcmp(dot, ".pdf") ? "pdf" : "png";
    } else {
        return fail(msg, nmsg, 404, "nothing at '%.60s'", path);
    }
    c->argv[0] = keep(c, "", name, len, NULL, NULL, 0);
    c->argc = 1;
    return 0;
}

int
explore_call_param(explore_call *c, const char *key, const char *value,
                   size_t vlen, char *msg, size_t nmsg)
{
    size_t klen = strlen(key);
    if (c->nkeys >= EXPLORE_MAX_PARAMS)
        return fail(msg, nmsg, 400, "more than %s query parameters",
                    "24");
    if (klen == 0 || klen > EXPLORE_MAX_KEY)
        return fail(msg, nmsg, 400, "a parameter name must have 1 to 32 "
                                    "characters (got '%.40s')",
                    key);
    if (!islower((unsigned char)key[0]))
        return fail(msg, nmsg, 400, "parameter '%.40s' is not an option "
                                    "name (lower-case letters, digits and "
                                    "'-', as the options of the command "
                                    "without '--')",
                    key);
    for (size_t i = 0; i < klen; i++) {
        unsigned char ch = (unsigned char)key[i];
        if (!islower(ch) && !isdigit(ch) && ch != '-')
            return fail(msg, nmsg, 400,
                        "parameter '%.40s' is not an option name "
                        "(lower-case letters, digits and '-', as the "
                        "options of the command without '--')",
                        key);
    }
    if (!value)
        vlen = 0;
    if (vlen > EXPLORE_MAX_VALUE)
        return fail(msg, nmsg, 400, "the value of '%.40s' is longer than "
                                    "256 bytes",
                    key);
    for (size_t i = 0; i < vlen; i++) {
        unsigned char ch = (unsigned char)value[i];
        if (ch < 0x20 || ch == 0x7f)
            return fail(msg, nmsg, 400, "the value of '%.40s' holds a "
                                        "control character",
                        key);
    }
    if (in_list(key, klen, refused, NELEM(refused)))
        return fail(msg, nmsg, 400, "'%.40s' is set by the page itself "
                                    "(answers are JSON, figures come from "
                                    "/figure/); leave it out",
                    key);
    if (!strcmp(key, "size")) {
        if (c->kind != EXPLORE_FIGURE)
            return fail(msg, nmsg, 400, "'size' is for figures (%s)",
                        "/figure/sweep.svg, /figure/tolerance.svg");
        if (!in_list(value ? value : "", vlen,
                     (const char *const[]){"single", "double", "slide"}, 3))
            return fail(msg, nmsg, 400, "size must be single, double or "
                                        "slide here (got '%.40s')",
                        value ? value : "");
    }
    size_t total = 0;
    for (int i = 0; i < c->nkeys; i++) {
        if (!strcmp(c->key[i], key))
            return fail(msg, nmsg, 400, "'%.40s' is given twice; give it "
                                        "once",
                        key);
        total += strlen(c->key[i]);
    }
    if (total + c->used + vlen > EXPLORE_MAX_QUERY + 256)
        return fail(msg, nmsg, 400, "the query is longer than %s bytes",
                    "2048");
    char *k = keep(c, "", key, klen, NULL, NULL, 0);
    if (!k)
        return fail(msg, nmsg, 400, "the query is longer than %s bytes",
                    "2048");
    c->key[c->nkeys++] = k;
    char *arg;
    if (!strcmp(c->argv[0], "crystals") && !strcmp(key, "name")) {
        if (!vlen)
            return fail(msg, nmsg, 400, "'name' needs a crystal name, e.g. "
                                        "%s",
                        "name=BBO");
        if (!(c->positional = keep(c, "", value, vlen, NULL, NULL, 0)))
            return fail(msg, nmsg, 400, "the query is longer than %s bytes",
                        "2048");
        return 0;
    }
    if (vlen)
        arg = keep(c, "--", key, klen, "=", value, vlen);
    else
        arg = keep(c, "--", key, klen, NULL, NULL, 0);
    if (!arg)
        return fail(msg, nmsg, 400, "the query is longer than %s bytes",
                    "2048");
    if (vlen)
        c->argv[c->argc++] = arg;
    else
        c->flag[c->nflags++] = arg;
    return 0;
}

/* The value of option --@name in the call, or NULL. */
static const char *
option_value(const explore_call *c, const char *name)
{
    size_t n = strlen(name);
    for (int i = 1; i < c->argc; i++)
        if (!strncmp(c->argv[i], "--", 2) &&
            !strncmp(c->argv[i] + 2, name, n) && c->argv[i][2 + n] == '=')
            return c->argv[i] + 3 + n;
    return NULL;
}

/* Points of "name=lo:hi[:n]": n, the sweep's default without it, or -1
 * when the text does not parse (the command will say why). */
static long
range_points(const char *text)
{
    const char *eq = strchr(text, '=');
    const char *c1 = eq ? strchr(eq + 1, ':') : NULL;
    if (!c1)
        return -1;
    const char *c2 = strchr(c1 + 1, ':');
    if (!c2)
        return SWEEP_DEFAULT_POINTS;
    char *end;
    errno = 0;
    long n = strtol(c2 + 1, &end, 10);
    if (end == c2 + 1 || *end || errno)
        return -1;
    return n;
}

int
explore_call_finish(explore_call *c, char *msg, size_t nmsg)
{
    if (!strcmp(c->argv[0], "sweep")) {
        const char *vary = option_value(c, "vary");
        const char *map = option_value(c, "map");
        const char *family = option_value(c, "family");
        /* Counts beyond a million are refused by the command itself. */
        long nx = vary ? range_points(vary) : -1;
        if (nx > 1000000)
            nx = 1000000;
        long members = 1;
        if (family)
            for (const char *p = family; *p; p++)
                members += *p == ',';
        char num[48];
        if (map) {
            long ny = range_points(map);
            if (ny > 1000000)
                ny = 1000000;
            if (nx > 0 && ny > 0 && nx * ny > EXPLORE_MAX_CELLS) {
                snprintf(num, sizeof num, "%ld x %ld", nx, ny);
                return fail(msg, nmsg, 400,
                            "a map of %s cells is more than the 160000 "
                            "(400 x 400) drawn here; use fewer points (the "
                            "command line draws larger maps)",
                            num);
            }
        } else if (nx > 0 && nx * members > EXPLORE_MAX_POINTS) {
            snprintf(num, sizeof num, "%ld", nx * members);
            return fail(msg, nmsg, 400,
                        "a sweep of %s points (along --vary, times the "
                        "members of --family) is more than the 2000 drawn "
                        "here; use fewer points (the command line draws "
                        "more)",
                        num);
        }
    }
    for (int i = 0; i < c->nflags; i++)
        c->argv[c->argc++] = c->flag[i];
    if (c->kind == EXPLORE_JSON) {
        c->argv[c->argc++] = keep(c, "--json", "", 0, NULL, NULL, 0);
    } else {
        c->argv[c->argc++] =
            keep(c, "--plot=-.", c->format, strlen(c->format), NULL, NULL, 0);
    }
    if (c->positional) {
        /* After "--", so that a name starting with '-' stays a name. */
        c->argv[c->argc++] = keep(c, "--", "", 0, NULL, NULL, 0);
        c->argv[c->argc++] = c->positional;
    }
    c->argv[c->argc] = NULL;
    for (int i = 0; i < c->argc; i++)
        if (!c->argv[i])
            return fail(msg, nmsg, 400, "the query is longer than %s bytes",
                        "2048");
    return 0;
}
