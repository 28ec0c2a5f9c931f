/*
 * period.c - `deltak period`: the quasi-phase-matching period for given
 * wavelengths and temperature; or, given a fabricated period, the
 * phase-matching temperature(s) or the signal/idler pair(s).
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "commands.h"
#include "deltak/material.h"
#include "deltak/qpm.h"
#include "deltak/units.h"

static const char *const period_usage[] = {
    "deltak period --crystal <name> (two of --pump/--signal/--idler | "
    "--fundamental <wl>)",
    "              [--temp <T>] [--pol <sip>] [--order <m>] [--duty <D>]",
    "              [--written-temp <T>] [--dispersion <set> | --all-sets] "
    "[--json | --csv]",
    "   or: deltak period ... --period <L> (two wavelengths)  -> phase-"
    "matching temperature(s)",
    "   or: deltak period ... --period <L> --pump <wl> --temp <T> -> signal "
    "and idler",
    "",
    "  --pump, --signal, --idler <wl>  vacuum wavelengths with unit; any two "
    "give the third",
    "  --fundamental <wl>   SHG of this wavelength",
    "  --temp <T>           crystal temperature in C (default 25)",
    "  --period <L>         the grating period as written, e.g. 30.5um",
    "  --temp-range <lo:hi> where to look for a temperature (default: the "
    "data set's range)",
    "  --pol <sip>          polarisation of signal, idler, pump, e.g. zzz "
    "(default: all along the polar axis)",
    "  --order <m>          QPM order (default 1); --duty <D> duty cycle "
    "(default 0.5)",
    "  --written-temp <T>   temperature at which the period is as written "
    "(default 25)",
    "  --dispersion <set>, --all-sets, --json, --csv  as for 'deltak index'",
    NULL};

#define MAX_SOL 16

enum mode { MODE_PERIOD, MODE_TEMPERATURE, MODE_WAVELENGTHS };

typedef struct result {
    const dk_dispersion_set *set;
    int ok;
    double period_w, period_t;   /* MODE_PERIOD */
    int n;                       /* solutions of the inverse modes */
    double temps[MAX_SOL];
    dk_waves waves[MAX_SOL];
    double deff;                 /* pm/V; NAN when unknown */
    char pol[4];                 /* axis labels used: signal idler pump */
} result;

typedef struct request {
    const dk_crystal *c;
    enum mode mode;
    const char *pol;
    int order;
    double duty, written_c, temp_c, period_um;
    int have_trange;
    double trange[2];
    dk_waves w;
    int shg;
} request;

/* Solve for one data set; on failure print or warn per @strict. */
static int
solve_set(const request *rq, const dk_dispersion_set *set, result *r,
          int strict)
{
    dk_error err = {0};
    dk_qpm q;
    r->set = set;
    r->ok = 0;
    r->deff = NAN;
    dk_status s = dk_qpm_init(&q, rq->c, set, rq->pol, rq->order, rq->duty,
                              rq->written_c, &err);
    if (!s) {
        double d;
        memcpy(r->pol, q.pol, 3);
        r->pol[3] = '\0';
        if (!dk_qpm_deff(&q, &d, NULL))
            r->deff = d;
        switch (rq->mode) {
        case MODE_PERIOD:
            s = dk_qpm_period(&q, &rq->w, rq->temp_c, &r->period_w,
                              &r->period_t, &err);
            break;
        case MODE_TEMPERATURE: {
            double lo = rq->trange[0], hi = rq->trange[1];
            if (!rq->have_trange) {
                if (!dk_set_has_temperature(set)) {
                    s = dk_error_set(&err, DK_EINVAL,
                                     "data set '%s' has no temperature "
                                     "dependence, so it cannot give a "
                                     "phase-matching temperature; pick a "
                                     "temperature-dependent set",
                                     set->name);
                    break;
                }
                const double *tr =
                    set->temp_form == DK_TEMP_NONE
                        ? set->thermo.temperature_range_c
                        : set->temperature_range_c;
                lo = tr[0], hi = tr[1];
            }
            s = dk_qpm_solve_temperature(&q, &rq->w, rq->period_um, lo, hi,
                                         r->temps, MAX_SOL, &r->n, &err);
            if (!s && r->n == 0)
                s = dk_error_set(&err, DK_ENOROOT,
                                 "no phase-matching temperature between "
                                 "%.4g and %.4g C for a %.6g um period with "
                                 "data set '%s' (widen --temp-range or check "
                                 "the period)",
                                 lo, hi, rq->period_um, set->name);
            break;
        }
        case MODE_WAVELENGTHS:
            s = dk_qpm_solve_wavelengths(&q, rq->w.pump_um, rq->period_um,
                                         rq->temp_c, r->waves, MAX_SOL, &r->n,
                                         &err);
            if (!s && r->n == 0)
                s = dk_error_set(&err, DK_ENOROOT,
                                 "a %.6g um period phase-matches no signal/"
                                 "idler pair of a %.6g um pump at %.4g C "
                                 "with data set '%s'",
                                 rq->period_um, rq->w.pump_um, rq->temp_c,
                                 set->name);
            break;
        }
    }
    if (s) {
        if (strict)
            return cli_error("%s", err.msg);
        cli_warn("skipped data set '%s': %s", set->name, err.msg);
        return 0;
    }
    cli_warn_index(set, q.warnings,
                       q.warn_lambda_um > 0 ? q.warn_lambda_um
                                            : rq->w.pump_um,
                       q.warn_temp_c);
    r->ok = 1;
    return 0;
}

static json_object *
waves_json(const dk_waves *w, int shg)
{
    json_object *o = json_object_new_object();
    json_object_object_add(o, "pump", cli_json_num(w->pump_um));
    json_object_object_add(o, "signal", cli_json_num(w->signal_um));
    json_object_object_add(o, "idler", cli_json_num(w->idler_um));
    if (shg)
        json_object_object_add(o, "fundamental", cli_json_num(w->signal_um));
    return o;
}

static void
print_json(cli_out *out, const request *rq, const result *res, int nres,
           int all)
{
    const result *r0 = NULL;
    for (int i = 0; i < nres && !r0; i++)
        if (res[i].ok)
            r0 = &res[i];
    json_object *o = json_object_new_object();
    json_object_object_add(o, "crystal", json_object_new_string(rq->c->id));
    json_object_object_add(o, "dispersion",
                           json_object_new_string(r0->set->name));
    json_object_object_add(o, "process",
                           json_object_new_string(rq->shg ? "SHG"
                                                          : "three-wave"));
    switch (rq->mode) {
    case MODE_PERIOD:
        json_object_object_add(o, "temperature_C", cli_json_num(rq->temp_c));
        json_object_object_add(o, "wavelengths_um", waves_json(&rq->w,
                                                                 rq->shg));
        json_object_object_add(o, "period_um", cli_json_num(r0->period_w));
        json_object_object_add(o, "period_at_temperature_um",
                               cli_json_num(r0->period_t));
        break;
    case MODE_TEMPERATURE: {
        json_object_object_add(o, "temperature_C",
                               cli_json_num(r0->temps[0]));
        json_object_object_add(o, "wavelengths_um", waves_json(&rq->w,
                                                                 rq->shg));
        json_object_object_add(o, "period_um", cli_json_num(rq->period_um));
        json_object *sol = json_object_new_array();
        for (int i = 0; i < r0->n; i++) {
            json_object *s = json_object_new_object();
            json_object_object_add(s, "temperature_C",
                                   cli_json_num(r0->temps[i]));
            json_object_array_add(sol, s);
        }
        json_object_object_add(o, "solutions", sol);
        break;
    }
    case MODE_WAVELENGTHS: {
        json_object_object_add(o, "temperature_C", cli_json_num(rq->temp_c));
        json_object_object_add(o, "wavelengths_um",
                               waves_json(&r0->waves[0], 0));
        json_object_object_add(o, "period_um", cli_json_num(rq->period_um));
        json_object *sol = json_object_new_array();
        for (int i = 0; i < r0->n; i++) {
            json_object *s = json_object_new_object();
            json_object_object_add(s, "wavelengths_um",
                                   waves_json(&r0->waves[i], 0));
            json_object_array_add(sol, s);
        }
        json_object_object_add(o, "solutions", sol);
        break;
    }
    }
    json_object_object_add(o, "order", json_object_new_int(rq->order));
    json_object_object_add(o, "pol", json_object_new_string(r0->pol));
    json_object_object_add(o, "duty_cycle", cli_json_num(rq->duty));
    json_object_object_add(o, "written_temperature_C",
                           cli_json_num(rq->written_c));
    if (isfinite(r0->deff))
        json_object_object_add(o, "deff_pm_per_V", cli_json_num(r0->deff));
    if (all) {
        json_object *sets = json_object_new_array();
        double lo = INFINITY, hi = -INFINITY;
        for (int i = 0; i < nres; i++) {
            if (!res[i].ok)
                continue;
            json_object *s = json_object_new_object();
            json_object_object_add(s, "dispersion",
                                   json_object_new_string(res[i].set->name));
            double v = rq->mode == MODE_PERIOD ? res[i].period_w
                       : rq->mode == MODE_TEMPERATURE ? res[i].temps[0]
                                                      : res[i].waves[0].idler_um;
            const char *key = rq->mode == MODE_PERIOD ? "period_um"
                              : rq->mode == MODE_TEMPERATURE
                                  ? "temperature_C"
                                  : "idler_um";
            json_object_object_add(s, key, cli_json_num(v));
            json_object_array_add(sets, s);
            lo = fmin(lo, v), hi = fmax(hi, v);
        }
        json_object_object_add(o, "sets", sets);
        json_object_object_add(o, "spread", cli_json_num(hi - lo));
    }
    cli_warnings_to_json(o);
    cli_out_json(out, o);
}

static void
print_waves(FILE *f, const dk_waves *w, int shg)
{
    if (shg)
        fprintf(f, "fundamental %.6g um -> second harmonic %.6g um",
                w->signal_um, w->pump_um);
    else
        fprintf(f, "pump %.6g um, signal %.6g um, idler %.6g um (%.2f cm-1)",
                w->pump_um, w->signal_um, w->idler_um, 1e4 / w->idler_um);
}

static void
print_table(FILE *f, const request *rq, const result *res, int nres)
{
    const result *r0 = NULL;
    for (int i = 0; i < nres && !r0; i++)
        if (res[i].ok)
            r0 = &res[i];
    fprintf(f, "%s, QPM order %d, duty cycle %.2g, polarisations %c %c %c "
               "(signal idler pump), beam along %c\n",
            rq->c->id, rq->order, rq->duty, r0->pol[0], r0->pol[1],
            r0->pol[2], "XYZ"[rq->c->grating_axis]);
    for (int i = 0; i < nres; i++) {
        const result *r = &res[i];
        if (!r->ok)
            continue;
        fprintf(f, "\ndata set %s%s\n", r->set->name,
                r->set->from_memory ? " [from memory]" : "");
        switch (rq->mode) {
        case MODE_PERIOD:
            fprintf(f, "  ");
            print_waves(f, &rq->w, rq->shg);
            fprintf(f, "\n  at %.4g C: period %.4f um as written at %.4g C "
                       "(%.4f um at %.4g C)\n",
                    rq->temp_c, r->period_w, rq->written_c, r->period_t,
                    rq->temp_c);
            break;
        case MODE_TEMPERATURE:
            fprintf(f, "  ");
            print_waves(f, &rq->w, rq->shg);
            fprintf(f, "\n  period %.4f um phase-matches at", rq->period_um);
            for (int k = 0; k < r->n; k++)
                fprintf(f, "%s %.2f C", k ? "," : "", r->temps[k]);
            fputc('\n', f);
            break;
        case MODE_WAVELENGTHS:
            fprintf(f, "  period %.4f um at %.4g C phase-matches %d "
                       "solution%s:\n",
                    rq->period_um, rq->temp_c, r->n, r->n == 1 ? "" : "s");
            for (int k = 0; k < r->n; k++) {
                fprintf(f, "    ");
                print_waves(f, &r->waves[k], 0);
                fputc('\n', f);
            }
            break;
        }
    }
    if (nres > 1) {
        double lo = INFINITY, hi = -INFINITY;
        int k = 0;
        for (int i = 0; i < nres; i++) {
            const result *r = &res[i];
            if (!r->ok)
                continue;
            double v = rq->mode == MODE_PERIOD ? r->period_w
                       : rq->mode == MODE_TEMPERATURE ? r->temps[0]
                                                      : r->waves[0].idler_um;
            lo = fmin(lo, v), hi = fmax(hi, v), k++;
        }
        fprintf(f, "\nspread over %d data sets: %.4g %s\n", k, hi - lo,
                rq->mode == MODE_PERIOD        ? "um in period"
                : rq->mode == MODE_TEMPERATURE ? "C in temperature"
                                               : "um in idler wavelength");
    }
    if (isfinite(r0->deff))
        fprintf(f, "\nd_eff %.3g pm/V, including the grating factor "
                   "(2/pi m) sin(pi m D)%s\n",
                r0->deff, rq->c->nl_from_memory
                              ? " (d typed from memory; see 'deltak crystals')"
                              : "");
}

static void
print_csv(FILE *f, const request *rq, const result *res, int nres)
{
    fprintf(f, "crystal,dispersion,pump_um,signal_um,idler_um,"
               "temperature_C,period_um,order,deff_pm_per_V\n");
    for (int i = 0; i < nres; i++) {
        const result *r = &res[i];
        if (!r->ok)
            continue;
        int n = rq->mode == MODE_PERIOD ? 1 : r->n;
        for (int k = 0; k < n; k++) {
            const dk_waves *w =
                rq->mode == MODE_WAVELENGTHS ? &r->waves[k] : &rq->w;
            double t = rq->mode == MODE_TEMPERATURE ? r->temps[k] : rq->temp_c;
            double p = rq->mode == MODE_PERIOD ? r->period_w : rq->period_um;
            fprintf(f, "%s,%s,%.10g,%.10g,%.10g,%.8g,%.8g,%d,%.6g\n",
                    rq->c->id, r->set->name, w->pump_um, w->signal_um,
                    w->idler_um, t, p, rq->order, r->deff);
        }
    }
}

int
cmd_period(int argc, char **argv)
{
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        {"pump", required_argument, NULL, 'p'},
        {"signal", required_argument, NULL, 's'},
        {"idler", required_argument, NULL, 'i'},
        {"fundamental", required_argument, NULL, 'f'},
        {"temp", required_argument, NULL, 't'},
        {"temp-range", required_argument, NULL, 'R'},
        {"period", required_argument, NULL, 'L'},
        {"pol", required_argument, NULL, 'P'},
        {"order", required_argument, NULL, 'm'},
        {"duty", required_argument, NULL, 'D'},
        {"written-temp", required_argument, NULL, 'W'},
        {NULL, 0, NULL, 0}};
    const char *temp = NULL, *period = NULL, *trange = NULL, *order = NULL,
               *duty = NULL, *written = NULL;
    cli_common cm = {0};
    cli_wave_args wa = {0};
    request rq = {0};
    int ch, rc;
    optind = 1;
    opterr = 0;
    while ((ch = getopt_long(argc, argv, "+h", opts, NULL)) != -1) {
        if (cli_common_option(ch, &cm))
            continue;
        switch (ch) {
        case 'p': wa.pump = optarg; break;
        case 's': wa.signal = optarg; break;
        case 'i': wa.idler = optarg; break;
        case 'f': wa.fundamental = optarg; break;
        case 't': temp = optarg; break;
        case 'R': trange = optarg; break;
        case 'L': period = optarg; break;
        case 'P': rq.pol = optarg; break;
        case 'm': order = optarg; break;
        case 'D': duty = optarg; break;
        case 'W': written = optarg; break;
        case 'h': cli_print_usage(stdout, period_usage); return 0;
        default: return cli_bad_option(argv, period_usage);
        }
    }
    if ((rc = cli_common_finish(&cm, argc, argv, 1, period_usage)))
        return rc;
    int all = cm.all, json = cm.json, csv = cm.csv;
    dk_error err = {0};
    rq.order = 1;
    rq.duty = 0.5;
    rq.written_c = 25;
    rq.temp_c = 25;
    char *end;
    if (order && ((rq.order = (int)strtol(order, &end, 10)) < 1 || *end))
        return cli_usage_error(period_usage, "--order '%s' must be a "
                                             "positive whole number",
                               order);
    if (duty && (!(rq.duty = strtod(duty, &end)) || *end || rq.duty <= 0 ||
                 rq.duty >= 1))
        return cli_usage_error(period_usage, "--duty '%s' must be a number "
                                             "between 0 and 1, e.g. 0.5",
                               duty);
    if ((written && dk_parse_temperature(written, &rq.written_c, &err)) ||
        (temp && dk_parse_temperature(temp, &rq.temp_c, &err)) ||
        (trange && cli_parse_range(trange, 0, rq.trange, &err)))
        return cli_usage_error(period_usage, "%s", err.msg);
    rq.have_trange = trange != NULL;
    if (period) {
        if (dk_parse_length(period, &rq.period_um, &err))
            return cli_usage_error(period_usage, "--period: %s", err.msg);
        rq.period_um *= 1e3; /* mm → µm */
    }
    int given = !!wa.pump + !!wa.signal + !!wa.idler;
    if (period && wa.pump && given == 1 && !wa.fundamental) {
        if (!temp)
            return cli_usage_error(period_usage, "to find signal and idler "
                                                 "for a period, give --temp");
        rq.mode = MODE_WAVELENGTHS;
        if (cli_parse_waves(&wa, 0, &rq.w, &rq.shg, period_usage))
            return CLI_USAGE;
    } else {
        if (cli_parse_waves(&wa, 1, &rq.w, &rq.shg, period_usage))
            return CLI_USAGE;
        rq.mode = MODE_PERIOD;
        if (period) {
            if (temp)
                return cli_usage_error(
                    period_usage,
                    "with --period and two wavelengths the temperature is "
                    "the unknown: drop --temp (or drop a wavelength to "
                    "solve for signal and idler)");
            rq.mode = MODE_TEMPERATURE;
        }
    }

    dk_db *db = NULL;
    if (cli_load_db(&db))
        return CLI_FAIL;
    rc = CLI_FAIL;
    result res[32];
    int nres = 0;
    rq.c = cli_find_crystal(db, cm.crystal);
    const dk_dispersion_set *only = NULL;
    if (!rq.c || (!all && !(only = cli_find_set(rq.c, cm.set_name))))
        goto done;
    for (int s = 0; s < rq.c->nsets && nres < 32; s++) {
        if (only && &rq.c->sets[s] != only)
            continue;
        if (solve_set(&rq, &rq.c->sets[s], &res[nres], !all))
            goto done;
        nres++;
    }
    int nok = 0;
    for (int i = 0; i < nres; i++)
        nok += res[i].ok;
    if (!nok) {
        cli_error("no data set of %s could answer (see the warnings)",
                  rq.c->id);
        goto done;
    }
    if (rq.mode == MODE_TEMPERATURE) {
        for (int i = 0; i < nres; i++)
            for (int k = 0; res[i].ok && k < res[i].n; k++)
                cli_warn_caution(rq.c, res[i].temps[k]);
    } else {
        cli_warn_caution(rq.c, rq.temp_c);
    }
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (json)
        print_json(&out, &rq, res, nres, all);
    else if (csv)
        print_csv(out.f, &rq, res, nres);
    else
        print_table(out.f, &rq, res, nres);
    rc = cli_out_commit(&out);
done:
    dk_db_free(db);
    return rc;
}
