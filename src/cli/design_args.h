/*
 * design_args.h - the options that describe a design, shared by the
 * commands that make one (period, chip, angle, tolerance, pulse, gain,
 * sweep): waves, temperature, scheme and process, QPM grating, modes and
 * type, angles, plane, solution, noncollinear geometry, length. They are
 * read into a dk_design_request (deltak/design.h); the design layer makes
 * every choice, this file only parses.
 */
#ifndef DK_CLI_DESIGN_ARGS_H
#define DK_CLI_DESIGN_ARGS_H

#include <getopt.h>

#include "cli.h"
#include "deltak/design.h"

/* getopt codes of the design options (above any short option). */
enum {
    OPT_PUMP = 300, OPT_SIGNAL, OPT_IDLER, OPT_FUNDAMENTAL, OPT_TEMP,
    OPT_TEMP_RANGE, OPT_PERIOD, OPT_POL, OPT_TYPE, OPT_THETA, OPT_PHI,
    OPT_PLANE, OPT_SOLUTION, OPT_NONCOLLINEAR, OPT_BROADBAND, OPT_ORDER,
    OPT_DUTY, OPT_WRITTEN, OPT_SCHEME, OPT_PROCESS, OPT_LENGTH,
    OPT_DESIGN_END
};

#define CLI_NDESIGN (OPT_DESIGN_END - OPT_PUMP)

/* Bit of an option in an "allowed" mask. */
#define CLI_D(opt) (1u << ((opt) - OPT_PUMP))

/* The options of every design command, and groups of them. */
#define CLI_D_WAVES (CLI_D(OPT_PUMP) | CLI_D(OPT_SIGNAL) | CLI_D(OPT_IDLER) | \
                     CLI_D(OPT_FUNDAMENTAL))
#define CLI_D_QPM (CLI_D(OPT_PERIOD) | CLI_D(OPT_ORDER) | CLI_D(OPT_DUTY) |  \
                   CLI_D(OPT_WRITTEN))
#define CLI_D_ANGLE (CLI_D(OPT_THETA) | CLI_D(OPT_PHI) | CLI_D(OPT_PLANE) |  \
                     CLI_D(OPT_SOLUTION) | CLI_D(OPT_NONCOLLINEAR) |         \
                     CLI_D(OPT_BROADBAND))
#define CLI_D_COMMON (CLI_D_WAVES | CLI_D(OPT_TEMP) | CLI_D(OPT_TEMP_RANGE) | \
                      CLI_D(OPT_POL) | CLI_D(OPT_TYPE) | CLI_D(OPT_SCHEME) | \
                      CLI_D(OPT_PROCESS))
#define CLI_D_ALL ((1u << CLI_NDESIGN) - 1)

/* The usage line of the options every design command shares. */
#define CLI_DESIGN_USAGE                                                     \
    "  --scheme qpm|birefringent, --process shg|sfg|dfg|opa|opo  the "       \
    "design's scheme and process (default: chosen by rule and noted)"

#define CLI_DESIGN_OPTIONS                                                   \
    {"pump", required_argument, NULL, OPT_PUMP},                             \
        {"signal", required_argument, NULL, OPT_SIGNAL},                     \
        {"idler", required_argument, NULL, OPT_IDLER},                       \
        {"fundamental", required_argument, NULL, OPT_FUNDAMENTAL},           \
        {"temp", required_argument, NULL, OPT_TEMP},                         \
        {"temp-range", required_argument, NULL, OPT_TEMP_RANGE},             \
        {"period", required_argument, NULL, OPT_PERIOD},                     \
        {"pol", required_argument, NULL, OPT_POL},                           \
        {"type", required_argument, NULL, OPT_TYPE},                         \
        {"theta", required_argument, NULL, OPT_THETA},                       \
        {"phi", required_argument, NULL, OPT_PHI},                           \
        {"plane", required_argument, NULL, OPT_PLANE},                       \
        {"solution", required_argument, NULL, OPT_SOLUTION},                 \
        {"noncollinear", required_argument, NULL, OPT_NONCOLLINEAR},         \
        {"broadband", no_argument, NULL, OPT_BROADBAND},                     \
        {"magic", no_argument, NULL, OPT_BROADBAND},                         \
        {"order", required_argument, NULL, OPT_ORDER},                       \
        {"duty", required_argument, NULL, OPT_DUTY},                         \
        {"written-temp", required_argument, NULL, OPT_WRITTEN},              \
        {"scheme", required_argument, NULL, OPT_SCHEME},                     \
        {"process", required_argument, NULL, OPT_PROCESS},                   \
        {"length", required_argument, NULL, OPT_LENGTH}

/* The design options as given (NULL: not given). */
typedef struct cli_design_args {
    const char *text[CLI_NDESIGN];
    const char *name[CLI_NDESIGN];   /* the option name, for messages */
} cli_design_args;

/*
 * Take a design option (getopt code @ch, long option table @opts):
 * returns 1 if it was one, 0 if not, CLI_USAGE (after printing) when it
 * was given twice.
 */
int cli_design_option(int ch, const char *arg, const struct option *opts,
                      cli_design_args *a, const char *const usage[]);

/*
 * Read the design options into @rq for crystal @c (named @name as typed).
 * Options outside @allowed are refused with their name. @need_waves: 1
 * when two waves (or --fundamental) are required. Returns 0, or
 * CLI_USAGE after printing the error and usage.
 */
int cli_design_request(const cli_design_args *a, unsigned allowed,
                       int need_waves, const dk_crystal *c, const char *name,
                       const char *set_name, dk_design_request *rq,
                       const char *const usage[]);

/*
 * Set up and solve the design of @rq into @d (solve only when @solve);
 * the notes go to the command's output. Returns 0, or after printing the
 * error CLI_USAGE for an inconsistent request and CLI_FAIL for no
 * solution or a failed computation.
 */
int cli_design_make(const dk_design_request *rq, dk_design *d, int solve);

/* A new JSON object opening as every design command's answer does:
 * "crystal", "dispersion" and "design" (qpm or birefringent). */
json_object *cli_design_json(const dk_design *d);

/*
 * The start every design command shares: load the database, find the
 * crystal of --crystal, read the design options (@allowed, @need_waves as
 * for cli_design_request) and make the design (solved when @solve) on the
 * heap. On success *db and *d are the caller's to free (dk_db_free,
 * free); on failure both are NULL and the exit code is returned.
 */
int cli_design_open(const cli_common *cm, const cli_design_args *a,
                    unsigned allowed, int need_waves, int solve,
                    const char *const usage[], dk_db **db, dk_design **d);

/* 1 when design option @opt was given. */
int cli_design_given(const cli_design_args *a, int opt);

#endif /* DK_CLI_DESIGN_ARGS_H */
