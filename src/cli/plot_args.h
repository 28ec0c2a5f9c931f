/*
 * plot_args.h - the figure options shared by the commands that draw
 * (sweep, tolerance, gain): file, size, axis limits, log axes, title,
 * legend position and type size, read before any computing so that a bad
 * option fails early, then applied to a new figure.
 */
#ifndef DK_CLI_PLOT_ARGS_H
#define DK_CLI_PLOT_ARGS_H

#include <getopt.h>

#include "deltak/plot.h"

enum {
    OPT_PLOT = 400, OPT_SIZE, OPT_XRANGE, OPT_YRANGE, OPT_LOG, OPT_TITLE,
    OPT_LEGEND, OPT_FONT_SIZE, OPT_PLOT_END
};

#define CLI_PLOT_OPTIONS                                                     \
    {"plot", required_argument, NULL, OPT_PLOT},                             \
        {"size", required_argument, NULL, OPT_SIZE},                         \
        {"xrange", required_argument, NULL, OPT_XRANGE},                     \
        {"yrange", required_argument, NULL, OPT_YRANGE},                     \
        {"log", required_argument, NULL, OPT_LOG},                           \
        {"title", required_argument, NULL, OPT_TITLE},                       \
        {"legend", required_argument, NULL, OPT_LEGEND},                     \
        {"font-size", required_argument, NULL, OPT_FONT_SIZE}

/* The figure options after a command's own --plot line. */
#define CLI_PLOT_OPTIONS_USAGE                                               \
    "  --size single|double|slide|WxH (mm)  the figure's size",             \
        "  --xrange, --yrange <lo:hi>  axis limits in the axis units; "     \
        "--log x|y|xy; --title <text>",                                      \
        "  --legend auto|none|upper-left|upper-right|lower-left|lower-right|" \
        "outside; --font-size <pt>"

#define CLI_PLOT_USAGE                                                       \
    "  --plot <file>      draw a figure (.pdf, .svg, .png)",                \
        CLI_PLOT_OPTIONS_USAGE

/* The figure options as read. */
typedef struct cli_plot_args {
    const char *text[OPT_PLOT_END - OPT_PLOT];
    double width_mm, height_mm;
    double xrange[2], yrange[2];
    int xlog, ylog;
    dk_plot_legend legend;
    double font_pt;
} cli_plot_args;

/* Take a figure option: 1 if it was one, 0 if not, CLI_USAGE (after
 * printing) when it was given twice. */
int cli_plot_option(int ch, const char *arg, cli_plot_args *a,
                    const char *const usage[]);

/* The file to draw into, or NULL. */
const char *cli_plot_path(const cli_plot_args *a);

/*
 * `--plot -.svg` (or -.pdf, -.png): the figure goes to the command's
 * standard output instead of a file, so that it can be piped and so that
 * in-process callers (deltak/command.h: the page of `deltak explore`) get
 * it in memory. The command then prints nothing else on standard output
 * (its notes go to standard error, as with --csv).
 */

/* The format ("svg", "pdf", "png") when --plot names standard output,
 * else NULL. */
const char *cli_plot_stdout_format(const cli_plot_args *a);

/* Write @fig where --plot says: into the file, or, for -.FMT, into @out
 * (the command's output buffer, committed to standard output on
 * success). Returns DK_OK or the plot engine's error. */
dk_status cli_plot_write(const cli_plot_args *a, dk_plot *fig,
                         FILE *out, dk_error *err);

/* Check and read the options; options other than --plot without --plot
 * are refused. Returns 0 or CLI_USAGE after printing. */
int cli_plot_parse(cli_plot_args *a, const char *const usage[]);

/* A new figure with the options applied. Returns DK_OK or the plot
 * engine's error. */
dk_status cli_plot_new(const cli_plot_args *a, dk_plot **fig, dk_error *err);

#endif /* DK_CLI_PLOT_ARGS_H */
