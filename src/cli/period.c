/*
 * period.c - `deltak period`: the quasi-phase-matching period for given
 * wavelengths and temperature; or, given a fabricated period, the
 * phase-matching temperature(s) or the signal/idler pair(s). Parse, call
 * the design layer, print.
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "commands.h"
#include "design_args.h"
#include "options.h"

static const char *const period_usage[] = {
    "deltak period --crystal <name> (two of --pump/--signal/--idler | "
    "--fundamental <wl>)",
    "              [--temp <T>] [--pol <sip> | --type 0|I|II] [--order <m>] "
    "[--duty <D>]",
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
    "data set's range +-50 C)",
    "  --pol <sip>          polarisation of signal, idler, pump, e.g. zzz "
    "(default: all along the polar axis)",
    "  --type 0|I|II        a QPM type instead of --pol, where it is "
    "unambiguous",
    "  --order <m>          QPM order (default 1); --duty <D> duty cycle "
    "(default 0.5)",
    "  --written-temp <T>   temperature at which the period is as written "
    "(default 25)",
    "  --solution <n>       with several answers, which one is the design",
    "  --dispersion <set>, --all-sets, --json, --csv  as for 'deltak index'",
    NULL};

#define ALLOWED                                                              \
    (CLI_D_COMMON | CLI_D_QPM | CLI_D(OPT_SOLUTION))

#define MAX_SETS 32

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


static json_object *
design_json(const dk_design *d, const dk_set_outcome *sets, int nsets,
            const dk_spread *spread)
{
    const dk_solution *c = &d->sol[d->chosen];
    json_object *o = json_object_new_object();
    json_object_object_add(o, "crystal", json_object_new_string(d->crystal->id));
    json_object_object_add(o, "dispersion",
                           json_object_new_string(d->set->name));
    json_object_object_add(o, "process",
                           json_object_new_string(d->shg ? "SHG"
                                                         : "three-wave"));
    json_object_object_add(o, "temperature_C", cli_json_num(c->temp_c));
    json_object_object_add(o, "wavelengths_um", waves_json(&c->waves, d->shg));
    json_object_object_add(o, "period_um", cli_json_num(c->period_um));
    if (d->solved == DK_SOLVED_PERIOD) {
        double at_t = c->period_um * dk_crystal_expansion_factor(
                                         d->crystal, d->crystal->grating_axis,
                                         c->temp_c) /
                      dk_crystal_expansion_factor(d->crystal,
                                                  d->crystal->grating_axis,
                                                  d->qpm.written_temp_c);
        json_object_object_add(o, "period_at_temperature_um",
                               cli_json_num(at_t));
    } else {
        json_object *sol = json_object_new_array();
        for (int i = 0; i < d->nsol; i++) {
            json_object *s = json_object_new_object();
            if (d->solved == DK_SOLVED_TEMPERATURE)
                json_object_object_add(s, "temperature_C",
                                       cli_json_num(d->sol[i].temp_c));
            else
                json_object_object_add(s, "wavelengths_um",
                                       waves_json(&d->sol[i].waves, 0));
            cli_flags_json(s, d->sol[i].range, d->shg);
            json_object_array_add(sol, s);
        }
        json_object_object_add(o, "solutions", sol);
        json_object_object_add(o, "chosen", json_object_new_int(d->chosen));
    }
    json_object_object_add(o, "order", json_object_new_int(d->qpm.order));
    json_object_object_add(o, "pol", json_object_new_string(d->pol));
    json_object_object_add(o, "type", json_object_new_string(c->type));
    json_object_object_add(o, "duty_cycle", cli_json_num(d->qpm.duty));
    json_object_object_add(o, "written_temperature_C",
                           cli_json_num(d->qpm.written_temp_c));
    if (isfinite(c->deff_pm_per_v))
        json_object_object_add(o, "deff_pm_per_V",
                               cli_json_num(c->deff_pm_per_v));
    cli_flags_json(o, c->range, d->shg);
    if (sets) {
        json_object *arr = json_object_new_array();
        for (int i = 0; i < nsets; i++) {
            if (sets[i].status)
                continue;
            json_object *s = json_object_new_object();
            json_object_object_add(s, "dispersion",
                                   json_object_new_string(sets[i].set->name));
            json_object_object_add(s, spread->quantity,
                                   cli_json_num(sets[i].value));
            json_object_object_add(s, "in_spread",
                                   json_object_new_boolean(sets[i].in_spread));
            cli_flags_json(s, sets[i].sol.range, d->shg);
            json_object_array_add(arr, s);
        }
        json_object_object_add(o, "sets", arr);
        json_object_object_add(o, "spread", cli_json_num(spread->spread));
    }
    cli_notes_to_json(o);
    return o;
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

/* " [extrapolated: idler]" after a value that rests on one. */
static void
print_range(FILE *f, unsigned range, int shg)
{
    char buf[160];
    if (range)
        fprintf(f, "  [extrapolated: %s]",
                dk_range_words(range, shg, buf, sizeof buf));
}

static void
print_design(FILE *f, const dk_design *d)
{
    const dk_solution *c = &d->sol[d->chosen];
    fprintf(f, "\ndata set %s%s\n", d->set->name,
            d->set->from_memory ? " [from memory]" : "");
    switch (d->solved) {
    case DK_SOLVED_PERIOD: {
        double at_t = c->period_um * dk_crystal_expansion_factor(
                                         d->crystal, d->crystal->grating_axis,
                                         c->temp_c) /
                      dk_crystal_expansion_factor(d->crystal,
                                                  d->crystal->grating_axis,
                                                  d->qpm.written_temp_c);
        fprintf(f, "  ");
        print_waves(f, &c->waves, d->shg);
        fprintf(f, "\n  at %.4g C: period %.4f um as written at %.4g C "
                   "(%.4f um at %.4g C)",
                c->temp_c, c->period_um, d->qpm.written_temp_c, at_t,
                c->temp_c);
        print_range(f, c->range, d->shg);
        fputc('\n', f);
        break;
    }
    case DK_SOLVED_TEMPERATURE:
        fprintf(f, "  ");
        print_waves(f, &c->waves, d->shg);
        fprintf(f, "\n  period %.4f um phase-matches at", c->period_um);
        for (int k = 0; k < d->nsol; k++)
            fprintf(f, "%s %.2f C%s", k ? "," : "", d->sol[k].temp_c,
                    d->sol[k].range ? "*" : "");
        fputc('\n', f);
        for (int k = 0; k < d->nsol; k++)
            if (d->sol[k].range) {
                fprintf(f, "  * ");
                print_range(f, d->sol[k].range, d->shg);
                fputc('\n', f);
                break;
            }
        break;
    default:
        fprintf(f, "  period %.4f um at %.4g C phase-matches %d "
                   "solution%s:\n",
                c->period_um, c->temp_c, d->nsol, d->nsol == 1 ? "" : "s");
        for (int k = 0; k < d->nsol; k++) {
            fprintf(f, "    ");
            print_waves(f, &d->sol[k].waves, 0);
            print_range(f, d->sol[k].range, 0);
            fputc('\n', f);
        }
    }
}

static void
print_text(FILE *f, const dk_design *d, const dk_set_outcome *sets,
           int nsets, const dk_spread *spread)
{
    const dk_solution *c = &d->sol[d->chosen];
    cli_wrapf(f, "", "    ",
              "%s, QPM order %d, duty cycle %.2g, polarisations %c %c %c "
              "(signal idler pump, type %s), beam along %c",
            d->crystal->id, d->qpm.order, d->qpm.duty, d->pol[0], d->pol[1],
            d->pol[2], c->type, "XYZ"[d->crystal->grating_axis]);
    if (!sets) {
        print_design(f, d);
    } else {
        for (int i = 0; i < nsets; i++) {
            const dk_set_outcome *o = &sets[i];
            if (o->status) {
                fprintf(f, "\ndata set %s: no answer (%s)\n", o->set->name,
                        o->message);
                continue;
            }
            fprintf(f, "\ndata set %s%s: %s %.6g%s\n", o->set->name,
                    o->set->from_memory ? " [from memory]" : "",
                    spread->quantity, o->value,
                    o->in_spread ? "" : " (left out of the spread)");
        }
        if (spread->n > 1)
            fprintf(f, "\nspread over %d data sets: %.4g %s\n", spread->n,
                    spread->spread,
                    !strcmp(spread->quantity, "period_um") ? "um in period"
                    : !strcmp(spread->quantity, "temperature_C")
                        ? "C in temperature"
                        : "um in idler wavelength");
    }
    if (isfinite(c->deff_pm_per_v))
        fprintf(f, "\nd_eff %.3g pm/V, including the grating factor "
                   "(2/pi m) sin(pi m D)%s\n",
                c->deff_pm_per_v,
                d->crystal->nl_from_memory
                    ? " (d typed from memory; see 'deltak crystals')"
                    : "");
}

static void
print_csv(FILE *f, const dk_design *d)
{
    char flags[256];
    fprintf(f, "crystal,dispersion,pump_um,signal_um,idler_um,"
               "temperature_C,period_um,order,deff_pm_per_V,flags\n");
    for (int k = 0; k < d->nsol; k++) {
        const dk_solution *o = &d->sol[k];
        char q1[160], q2[160];
        fprintf(f, "%s,%s,%.10g,%.10g,%.10g,%.8g,%.8g,%d,%.6g,%s\n",
                cli_csv(d->crystal->id, q1, sizeof q1),
                cli_csv(d->set->name, q2, sizeof q2), o->waves.pump_um,
                o->waves.signal_um, o->waves.idler_um, o->temp_c,
                o->period_um, d->qpm.order, o->deff_pm_per_v,
                cli_csv_flags(o->range, d->shg, flags, sizeof flags));
    }
}

int
cmd_period(int argc, char **argv)
{
    static const struct option opts[] = {CLI_COMMON_OPTIONS,
                                         CLI_DESIGN_OPTIONS,
                                         {NULL, 0, NULL, 0}};
    cli_common cm = {0};
    cli_design_args da = {0};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, period_usage, &cm, &da, NULL,
                                NULL, NULL, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    if ((rc = cli_common_finish(&cm, argc, argv, 1, period_usage)))
        return rc;
    int given = cli_design_given(&da, OPT_PUMP) +
                cli_design_given(&da, OPT_SIGNAL) +
                cli_design_given(&da, OPT_IDLER);
    int period = cli_design_given(&da, OPT_PERIOD);
    int temp = cli_design_given(&da, OPT_TEMP);
    if (!cli_design_given(&da, OPT_FUNDAMENTAL) && given < 2) {
        if (!(period && given == 1 && cli_design_given(&da, OPT_PUMP)))
            return cli_usage_error(period_usage,
                                   "give exactly two of pump, signal and "
                                   "idler (the third follows from energy "
                                   "conservation), or --fundamental");
        if (!temp)
            return cli_usage_error(period_usage, "to find signal and idler "
                                                 "for a period, give --temp");
    } else if (period && temp) {
        return cli_usage_error(period_usage,
                               "with --period and two wavelengths the "
                               "temperature is the unknown: drop --temp (or "
                               "drop a wavelength to solve for signal and "
                               "idler)");
    }

    dk_db *db = NULL;
    if (cli_load_db(&db, cm.crystal))
        return CLI_FAIL;
    rc = CLI_FAIL;
    dk_design *d = NULL;
    dk_set_outcome *sets = NULL;
    const dk_crystal *c = cli_find_crystal(db, cm.crystal);
    dk_design_request rq;
    if (!c)
        goto done;
    if ((rc = cli_design_request(&da, ALLOWED, 0, c, cm.crystal, cm.set_name,
                                 &rq, period_usage)))
        goto done;
    rc = CLI_FAIL;
    rq.scheme = DK_SCHEME_QPM;
    d = malloc(sizeof *d);
    if (!d) {
        cli_error("out of memory");
        goto done;
    }
    dk_spread spread;
    int nsets = 0;
    if (cm.all) {
        dk_error err = {0};
        sets = malloc(MAX_SETS * sizeof *sets);
        if (!sets) {
            cli_error("out of memory");
            goto done;
        }
        if (dk_design_across_sets(&rq, sets, MAX_SETS, &nsets, &spread,
                                  &err)) {
            cli_error("%s", err.msg);
            goto done;
        }
        for (int i = 0; i < nsets; i++) {
            cli_take_notes(&sets[i].notes);
            if (sets[i].status)
                cli_warn("skipped data set '%s': %s", sets[i].set->name,
                         sets[i].message);
        }
        /* The first answering set is shown in full. */
        for (int i = 0; i < nsets; i++)
            if (!sets[i].status) {
                rq.set_name = sets[i].set->name;
                break;
            }
    }
    if ((rc = cli_design_make(&rq, d, 1)))
        goto done;
    rc = CLI_FAIL;
    for (int k = 0; k < d->nsol; k++) {
        const char *t = dk_crystal_caution_at(c, d->sol[k].temp_c);
        if (t)
            cli_warn("%s at %.4g C: %s", c->id, d->sol[k].temp_c, t);
    }
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (cm.json)
        cli_out_json(&out, design_json(d, sets, nsets, &spread));
    else if (cm.csv)
        print_csv(out.f, d);
    else
        print_text(out.f, d, sets, nsets, &spread);
    rc = cli_out_commit(&out);
done:
    free(d);
    free(sets);
    dk_db_free(db);
    return rc;
}
