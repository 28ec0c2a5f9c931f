/*
 * design_args.h - the options that describe a design (waves, temperature,
 * QPM period or birefringent type/modes/angle), shared by the commands
 * that analyse one design: tolerance, pulse, gain, sweep.
 */
#ifndef DK_CLI_DESIGN_ARGS_H
#define DK_CLI_DESIGN_ARGS_H

#include <getopt.h>

#include "cli.h"
#include "deltak/tolerance.h"

#define CLI_DESIGN_OPTIONS                                                   \
    {"pump", required_argument, NULL, 'p'},                                  \
        {"signal", required_argument, NULL, 's'},                            \
        {"idler", required_argument, NULL, 'i'},                             \
        {"fundamental", required_argument, NULL, 'f'},                       \
        {"temp", required_argument, NULL, 't'},                              \
        {"period", required_argument, NULL, 'P'},                            \
        {"pol", required_argument, NULL, 'o'},                               \
        {"type", required_argument, NULL, 'T'},                              \
        {"theta", required_argument, NULL, 'Q'},                             \
        {"order", required_argument, NULL, 'm'}

/* The design options as given. */
typedef struct cli_design_args {
    cli_wave_args waves;
    const char *temp, *period, *pol, *type, *theta, *order;
} cli_design_args;

/* The design options read. */
typedef struct cli_design_spec {
    dk_waves waves;
    int shg;
    int have_temp;
    double temp_c;       /* 25 when not given */
    double period_um;    /* 0 when not given */
    double theta_rad;    /* NAN when not given */
    int order;           /* QPM order, 1 when not given */
    const char *pol, *type;
    int held;            /* 1: --signal given, 2: --idler given, 0: neither */
} cli_design_spec;

/* Take a design option (getopt code @ch); returns 1 if it was one. */
int cli_design_option(int ch, cli_design_args *a);

/*
 * Read the design options into @sp. With @need_waves two waves (or
 * --fundamental) are required and the third is filled in; without, any
 * of them may be given (two are still completed). Returns 0, or
 * CLI_USAGE after printing the error and usage.
 */
int cli_design_parse(const cli_design_args *a, cli_design_spec *sp,
                     int need_waves, const char *const usage[]);

/*
 * Put @d (length set by the caller) at its operating point for crystal
 * @c and set @set: QPM for a poled crystal unless a type or angle is
 * given. *qpm tells which. Returns 0, or CLI_FAIL after printing.
 */
int cli_design_setup(const cli_design_spec *sp, const dk_crystal *c,
                     const dk_dispersion_set *set, dk_design *d, int *qpm);

#endif /* DK_CLI_DESIGN_ARGS_H */
