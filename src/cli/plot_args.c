/*
 * plot_args.c - the shared figure options (see plot_args.h).
 */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>

#include "cli.h"
#include "plot_args.h"

#define T(opt) (a->text[(opt) - OPT_PLOT])

int
cli_plot_option(int ch, const char *arg, cli_plot_args *a,
                const char *const usage[])
{
    static const char *const names[] = {"plot",  "size",  "xrange",
                                         "yrange", "log",  "title",
                                         "legend", "font-size"};
    if (ch < OPT_PLOT || ch >= OPT_PLOT_END)
        return 0;
    if (T(ch))
        return cli_usage_error(usage, "--%s is given twice; give it once",
                               names[ch - OPT_PLOT]);
    T(ch) = arg ? arg : "";
    return 1;
}

const char *
cli_plot_path(const cli_plot_args *a)
{
    return T(OPT_PLOT);
}

const char *
cli_plot_stdout_format(const cli_plot_args *a)
{
    const char *p = T(OPT_PLOT);
    if (!p || p[0] != '-' || p[1] != '.')
        return NULL;
    static const char *const formats[] = {"svg", "pdf", "png"};
    for (size_t i = 0; i < sizeof formats / sizeof formats[0]; i++)
        if (strcasecmp(p + 2, formats[i]) == 0)
            return formats[i];
    return NULL;
}

dk_status
cli_plot_write(const cli_plot_args *a, dk_plot *fig, FILE *out,
               dk_error *err)
{
    dk_status s = cli_plot_add_notes(fig, err);
    if (s)
        return s;
    const char *format = cli_plot_stdout_format(a);
    if (!format)
        return dk_plot_write(fig, T(OPT_PLOT), err);
    /* Notes go to stderr, not after the figure. */
    cli_set_output_mode(CLI_CSV);
    return dk_plot_write_stream(fig, out, format, err);
}

static int
range(const char *opt, const char *text, double r[2],
      const char *const usage[])
{
    char buf[96];
    const char *colon = text ? strchr(text, ':') : NULL;
    if (!colon || strlen(text) >= sizeof buf)
        return cli_usage_error(usage, "%s '%s' must look like lo:hi, e.g. "
                                      "2.5:4",
                               opt, text ? text : "");
    memcpy(buf, text, colon - text);
    buf[colon - text] = '\0';
    if (cli_real(opt, buf, -1e300, 1e300, &r[0], usage) ||
        cli_real(opt, colon + 1, -1e300, 1e300, &r[1], usage))
        return CLI_USAGE;
    if (!(r[0] < r[1]))
        return cli_usage_error(usage, "%s '%s' must have lo < hi", opt, text);
    return 0;
}

int
cli_plot_parse(cli_plot_args *a, const char *const usage[])
{
    dk_error err = {0};
    a->xrange[0] = a->xrange[1] = a->yrange[0] = a->yrange[1] = NAN;
    a->font_pt = NAN;
    a->legend = DK_PLOT_LEGEND_AUTO;
    if (!T(OPT_PLOT))
        for (int o = OPT_SIZE; o < OPT_PLOT_END; o++)
            if (T(o))
                return cli_usage_error(usage, "figure options need --plot "
                                              "FILE");
    if (dk_plot_size_parse(T(OPT_SIZE) ? T(OPT_SIZE) : "single",
                           &a->width_mm, &a->height_mm, &err))
        return cli_usage_error(usage, "--size: %s", err.msg);
    if ((T(OPT_XRANGE) && range("--xrange", T(OPT_XRANGE), a->xrange, usage)) ||
        (T(OPT_YRANGE) && range("--yrange", T(OPT_YRANGE), a->yrange, usage)))
        return CLI_USAGE;
    if (T(OPT_LOG)) {
        const char *l = T(OPT_LOG);
        if (strcmp(l, "x") && strcmp(l, "y") && strcmp(l, "xy"))
            return cli_usage_error(usage, "--log '%s' must be x, y or xy", l);
        a->xlog = strchr(l, 'x') != NULL;
        a->ylog = strchr(l, 'y') != NULL;
    }
    if (T(OPT_LEGEND)) {
        static const struct {
            const char *name;
            dk_plot_legend where;
        } legends[] = {{"auto", DK_PLOT_LEGEND_AUTO},
                       {"none", DK_PLOT_LEGEND_NONE},
                       {"upper-right", DK_PLOT_LEGEND_UPPER_RIGHT},
                       {"upper-left", DK_PLOT_LEGEND_UPPER_LEFT},
                       {"lower-right", DK_PLOT_LEGEND_LOWER_RIGHT},
                       {"lower-left", DK_PLOT_LEGEND_LOWER_LEFT},
                       {"outside", DK_PLOT_LEGEND_OUTSIDE}};
        size_t i = 0;
        while (i < sizeof legends / sizeof legends[0] &&
               strcmp(legends[i].name, T(OPT_LEGEND)))
            i++;
        if (i == sizeof legends / sizeof legends[0])
            return cli_usage_error(usage, "--legend '%s' must be auto, none, "
                                          "upper-left, upper-right, "
                                          "lower-left, lower-right or "
                                          "outside",
                                   T(OPT_LEGEND));
        a->legend = legends[i].where;
    }
    if (T(OPT_FONT_SIZE) &&
        cli_real("--font-size", T(OPT_FONT_SIZE), 4, 48, &a->font_pt, usage))
        return CLI_USAGE;
    if (T(OPT_TITLE) && strlen(T(OPT_TITLE)) > 200)
        return cli_usage_error(usage, "--title is longer than 200 "
                                      "characters");
    return 0;
}

/* Escape &, < and > so that a title is text, not markup. */
static void
escape_markup(const char *in, char *out, size_t n)
{
    size_t k = 0;
    for (; *in && k + 6 < n; in++) {
        const char *rep = *in == '&' ? "&amp;" : *in == '<' ? "&lt;"
                          : *in == '>' ? "&gt;" : NULL;
        if (rep) {
            memcpy(out + k, rep, strlen(rep));
            k += strlen(rep);
        } else if ((unsigned char)*in >= 0x20) {
            out[k++] = *in;
        }
    }
    out[k] = '\0';
}

dk_status
cli_plot_new(const cli_plot_args *a, dk_plot **fig, dk_error *err)
{
    dk_status s = dk_plot_new(a->width_mm, a->height_mm, fig, err);
    if (!s && isfinite(a->xrange[0]))
        s = dk_plot_set_xrange(*fig, a->xrange[0], a->xrange[1], err);
    if (!s && isfinite(a->yrange[0]))
        s = dk_plot_set_yrange(*fig, a->yrange[0], a->yrange[1], err);
    if (!s && (a->xlog || a->ylog))
        s = dk_plot_set_log(*fig, a->xlog, a->ylog, err);
    if (!s && isfinite(a->font_pt))
        s = dk_plot_set_font_size_pt(*fig, a->font_pt, err);
    if (!s && T(OPT_TITLE)) {
        char esc[1400];
        escape_markup(T(OPT_TITLE), esc, sizeof esc);
        s = dk_plot_set_title(*fig, esc, err);
    }
    if (!s)
        dk_plot_set_legend(*fig, a->legend);
    return s;
}
