/*
 * design_args.c - the shared design options (see design_args.h): parse,
 * refuse what does not apply, fill a dk_design_request. No choices are
 * made here; the design layer makes them.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "design_args.h"
#include "deltak/units.h"

#define IDX(opt) ((opt) - OPT_PUMP)

int
cli_design_option(int ch, const char *arg, const struct option *opts,
                  cli_design_args *a, const char *const usage[])
{
    if (ch < OPT_PUMP || ch >= OPT_DESIGN_END)
        return 0;
    const char *name = "";
    for (const struct option *o = opts; o->name; o++)
        if (o->val == ch) {
            name = o->name;
            break;
        }
    if (a->text[IDX(ch)])
        return cli_usage_error(usage, "--%s is given twice; give it once",
                               name);
    a->text[IDX(ch)] = arg ? arg : "";
    a->name[IDX(ch)] = name;
    return 1;
}

int
cli_design_given(const cli_design_args *a, int opt)
{
    return a->text[IDX(opt)] != NULL;
}

#define GIVEN(opt) (a->text[IDX(opt)])

/* A wavelength option, or 0 when not given. */
static int
wave(const cli_design_args *a, int opt, double *um, const char *const usage[])
{
    dk_error err = {0};
    *um = 0;
    if (!GIVEN(opt))
        return 0;
    if (dk_parse_wavelength(GIVEN(opt), um, &err))
        return cli_usage_error(usage, "--%s: %s", a->name[IDX(opt)],
                               err.msg);
    return 0;
}

static int
read_waves(const cli_design_args *a, int need, dk_design_request *rq,
           const char *const usage[])
{
    dk_error err = {0};
    int given = !!GIVEN(OPT_PUMP) + !!GIVEN(OPT_SIGNAL) + !!GIVEN(OPT_IDLER);
    if (GIVEN(OPT_FUNDAMENTAL)) {
        if (given)
            return cli_usage_error(usage, "--fundamental (SHG) excludes "
                                          "--pump, --signal and --idler");
        double f;
        if (wave(a, OPT_FUNDAMENTAL, &f, usage))
            return CLI_USAGE;
        rq->waves = dk_waves_shg(f);
        rq->shg = 1;
        return 0;
    }
    if (wave(a, OPT_PUMP, &rq->waves.pump_um, usage) ||
        wave(a, OPT_SIGNAL, &rq->waves.signal_um, usage) ||
        wave(a, OPT_IDLER, &rq->waves.idler_um, usage))
        return CLI_USAGE;
    rq->held = GIVEN(OPT_SIGNAL) ? 1 : GIVEN(OPT_IDLER) ? 2 : 0;
    if (given > 2)
        return cli_usage_error(usage, "give at most two of --pump, --signal "
                                      "and --idler (the third follows from "
                                      "energy conservation)");
    if (given == 2 && dk_waves_complete(&rq->waves, &err))
        return cli_usage_error(usage, "%s", err.msg);
    if (need && given < 2)
        return cli_usage_error(usage, "give exactly two of pump, signal and "
                                      "idler (the third follows from energy "
                                      "conservation), or --fundamental");
    return 0;
}

int
cli_design_request(const cli_design_args *a, unsigned allowed, int need_waves,
                   const dk_crystal *c, const char *name,
                   const char *set_name, dk_design_request *rq,
                   const char *const usage[])
{
    dk_error err = {0};
    dk_design_request_init(rq);
    rq->crystal = c;
    rq->crystal_name = name;
    rq->set_name = set_name;
    for (int i = 0; i < CLI_NDESIGN; i++)
        if (a->text[i] && !(allowed & (1u << i)))
            return cli_usage_error(usage, "--%s does not apply to this "
                                          "command",
                                   a->name[i]);
    if (read_waves(a, need_waves, rq, usage))
        return CLI_USAGE;
    if (GIVEN(OPT_TEMP) &&
        dk_parse_temperature(GIVEN(OPT_TEMP), &rq->temp_c, &err))
        return cli_usage_error(usage, "--temp: %s", err.msg);
    if (GIVEN(OPT_TEMP_RANGE) &&
        cli_parse_range(GIVEN(OPT_TEMP_RANGE), 0, rq->temp_range_c, &err))
        return cli_usage_error(usage, "--temp-range: %s", err.msg);
    if (GIVEN(OPT_WRITTEN) &&
        dk_parse_temperature(GIVEN(OPT_WRITTEN), &rq->written_temp_c, &err))
        return cli_usage_error(usage, "--written-temp: %s", err.msg);
    if (GIVEN(OPT_PERIOD)) {
        if (dk_parse_length(GIVEN(OPT_PERIOD), &rq->period_um, &err))
            return cli_usage_error(usage, "--period: %s", err.msg);
        rq->period_um *= 1e3;   /* mm → µm */
    }
    if (GIVEN(OPT_LENGTH) &&
        dk_parse_length(GIVEN(OPT_LENGTH), &rq->length_mm, &err))
        return cli_usage_error(usage, "--length: %s", err.msg);
    if ((GIVEN(OPT_ORDER) &&
         cli_int("--order", GIVEN(OPT_ORDER), 1, 99, &rq->order, usage)) ||
        (GIVEN(OPT_DUTY) &&
         cli_real("--duty", GIVEN(OPT_DUTY), 0.01, 0.99, &rq->duty, usage)) ||
        (GIVEN(OPT_THETA) &&
         cli_angle("--theta", GIVEN(OPT_THETA), 0, 180, &rq->theta_rad,
                   usage)) ||
        (GIVEN(OPT_PHI) &&
         cli_angle("--phi", GIVEN(OPT_PHI), -360, 360, &rq->phi_rad,
                   usage)) ||
        (GIVEN(OPT_NONCOLLINEAR) &&
         cli_angle("--noncollinear", GIVEN(OPT_NONCOLLINEAR), -44.99, 44.99,
                   &rq->alpha_rad, usage)) ||
        (GIVEN(OPT_SOLUTION) &&
         cli_int("--solution", GIVEN(OPT_SOLUTION), 1, DK_DESIGN_MAX_SOL,
                 &rq->solution, usage)))
        return CLI_USAGE;
    rq->broadband = GIVEN(OPT_BROADBAND) != NULL;
    rq->pol = GIVEN(OPT_POL);
    rq->type = GIVEN(OPT_TYPE);
    rq->plane = GIVEN(OPT_PLANE);
    if ((GIVEN(OPT_SCHEME) &&
         dk_scheme_parse(GIVEN(OPT_SCHEME), &rq->scheme, &err)) ||
        (GIVEN(OPT_PROCESS) &&
         dk_process_parse(GIVEN(OPT_PROCESS), &rq->process, &err)))
        return cli_usage_error(usage, "%s", err.msg);
    return 0;
}

int
cli_design_make(const dk_design_request *rq, dk_design *d, int solve)
{
    dk_error err = {0};
    dk_status s = dk_design_setup(rq, d, &err);
    if (!s && solve)
        s = dk_design_solve(d, &err);
    if (s) {
        /* An inconsistent request is bad input (exit 2); no solution or a
         * failed computation is exit 1. An unknown data set gets the
         * nearest names. */
        if (rq->set_name && rq->crystal &&
            !dk_crystal_find_set(rq->crystal, rq->set_name))
            cli_unknown_set(rq->crystal, rq->set_name);
        else
            cli_error("%s", err.msg);
        return s == DK_EINVAL ? CLI_USAGE : CLI_FAIL;
    }
    cli_take_notes(&d->notes);
    return 0;
}

json_object *
cli_design_json(const dk_design *d)
{
    json_object *o = json_object_new_object();
    json_object_object_add(o, "crystal", json_object_new_string(d->crystal->id));
    json_object_object_add(o, "dispersion",
                           json_object_new_string(d->set->name));
    json_object_object_add(o, "design",
                           json_object_new_string(d->scheme == DK_SCHEME_QPM
                                                      ? "qpm"
                                                      : "birefringent"));
    return o;
}

int
cli_design_open(const cli_common *cm, const cli_design_args *a,
                unsigned allowed, int need_waves, int solve,
                const char *const usage[], dk_db **db, dk_design **d)
{
    *db = NULL;
    *d = NULL;
    if (cli_load_db(db, cm->crystal))
        return CLI_FAIL;
    int rc = CLI_FAIL;
    dk_design_request rq;
    const dk_crystal *c = cli_find_crystal(*db, cm->crystal);
    if (c && !(*d = malloc(sizeof **d)))
        cli_error("out of memory");
    if (c && *d &&
        !(rc = cli_design_request(a, allowed, need_waves, c, cm->crystal,
                                  cm->set_name, &rq, usage)))
        rc = cli_design_make(&rq, *d, solve);
    if (rc) {
        free(*d);
        dk_db_free(*db);
        *d = NULL;
        *db = NULL;
    }
    return rc;
}
