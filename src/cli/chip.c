/*
 * chip.c - `deltak chip`: a multi-grating poling layout whose oven-tuning
 * ranges cover a target signal or idler range, and optionally a fan-out
 * grating for the same range.
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "options.h"
#include "design_args.h"
#include "commands.h"
#include "deltak/chip.h"
#include "deltak/units.h"

static const char *const chip_usage[] = {
    "deltak chip --crystal <name> --pump <wl> (--idler-range <lo:hi> | "
    "--signal-range <lo:hi>)",
    "            [--oven <lo:hi>] [--overlap <f>] [--fanout-width <w> "
    "[--temp <T>] [--positions <n>]]",
    "            [--pol <sip>] [--order <m>] [--written-temp <T>] "
    "[--dispersion <set>] [--json | --csv]",
    "",
    "  --idler-range <lo:hi>   target idler range, e.g. 2.8um:4.2um (or "
    "--signal-range)",
    "  --oven <lo:hi>          oven temperature range in C (default 30:200)",
    "  --overlap <f>           fraction by which neighbouring gratings "
    "overlap (default 0.1)",
    "  --fanout-width <w>      also lay out a fan-out grating this wide, "
    "e.g. 10mm",
    "  --temp <T>              oven temperature of the fan-out (default: "
    "middle of the oven range)",
    "  --positions <n>         fan-out positions listed (default 11)",
    NULL};

#define MAX_GRATINGS 64
#define MAX_POSITIONS 101

typedef struct fan_point {
    double x_mm, period_um, target_um;
} fan_point;

int
cmd_chip(int argc, char **argv)
{
    enum { O_PUMP = 500, O_IRANGE, O_SRANGE, O_OVEN, O_OVERLAP, O_FAN,
           O_TEMP, O_NPOS, O_POL, O_ORDER, O_WRITTEN, O_END };
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        {"pump", required_argument, NULL, O_PUMP},
        {"idler-range", required_argument, NULL, O_IRANGE},
        {"signal-range", required_argument, NULL, O_SRANGE},
        {"oven", required_argument, NULL, O_OVEN},
        {"overlap", required_argument, NULL, O_OVERLAP},
        {"fanout-width", required_argument, NULL, O_FAN},
        {"temp", required_argument, NULL, O_TEMP},
        {"positions", required_argument, NULL, O_NPOS},
        {"pol", required_argument, NULL, O_POL},
        {"order", required_argument, NULL, O_ORDER},
        {"written-temp", required_argument, NULL, O_WRITTEN},
        {NULL, 0, NULL, 0}};
    const char *v[O_END - O_PUMP] = {0};
    cli_slots sl = {O_PUMP, O_END - O_PUMP, v, opts, chip_usage};
    cli_common cm = {0};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, chip_usage, &cm, NULL, NULL,
                                cli_slot_option, &sl, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    const char *pump = v[O_PUMP - O_PUMP], *irange = v[O_IRANGE - O_PUMP],
               *srange = v[O_SRANGE - O_PUMP], *oven = v[O_OVEN - O_PUMP],
               *overlap_s = v[O_OVERLAP - O_PUMP], *fan = v[O_FAN - O_PUMP],
               *temp = v[O_TEMP - O_PUMP], *npos_s = v[O_NPOS - O_PUMP],
               *pol = v[O_POL - O_PUMP], *order_s = v[O_ORDER - O_PUMP],
               *written = v[O_WRITTEN - O_PUMP];
    if ((rc = cli_common_finish(&cm, argc, argv, 0, chip_usage)))
        return rc;
    int json = cm.json, csv = cm.csv;
    if (!pump)
        return cli_usage_error(chip_usage, "--pump is required");
    if (!!irange == !!srange)
        return cli_usage_error(chip_usage, "give one of --idler-range and "
                                           "--signal-range");
    dk_error err = {0};
    double pump_um, range[2], oven_c[2] = {30, 200}, written_c = 25;
    double overlap = 0.1, width_mm = 0, fan_t;
    int order = 1, npos = 11;
    if (dk_parse_wavelength(pump, &pump_um, &err) ||
        cli_parse_range(irange ? irange : srange, 1, range, &err) ||
        (oven && cli_parse_range(oven, 0, oven_c, &err)) ||
        (written && dk_parse_temperature(written, &written_c, &err)) ||
        (fan && dk_parse_length(fan, &width_mm, &err)))
        return cli_usage_error(chip_usage, "%s", err.msg);
    fan_t = 0.5 * (oven_c[0] + oven_c[1]);
    if (temp && dk_parse_temperature(temp, &fan_t, &err))
        return cli_usage_error(chip_usage, "%s", err.msg);
    if ((overlap_s &&
         cli_real("--overlap", overlap_s, 0, 0.89, &overlap, chip_usage)) ||
        (order_s && cli_int("--order", order_s, 1, 99, &order, chip_usage)) ||
        (npos_s &&
         cli_int("--positions", npos_s, 2, MAX_POSITIONS, &npos, chip_usage)))
        return CLI_USAGE;
    int signal = srange != NULL;
    const char *target = signal ? "signal" : "idler";

    dk_db *db = NULL;
    if (cli_load_db(&db, cm.crystal))
        return CLI_FAIL;
    rc = CLI_FAIL;
    const dk_crystal *c = cli_find_crystal(db, cm.crystal);
    dk_design *d = malloc(sizeof *d);
    dk_grating g[MAX_GRATINGS];
    unsigned gflags[MAX_GRATINGS];
    fan_point fp[MAX_POSITIONS];
    int ng = 0;
    if (!c || !d)
        goto done;
    /* The design layer picks the set (the crystal's QPM default) and the
     * polarisations; the chip is laid out on its grating. */
    dk_design_request rq;
    dk_design_request_init(&rq);
    rq.crystal = c;
    rq.crystal_name = cm.crystal;
    rq.set_name = cm.set_name;
    rq.scheme = DK_SCHEME_QPM;
    rq.waves.pump_um = pump_um;
    rq.pol = pol;
    rq.order = order;
    rq.written_temp_c = written_c;
    rq.temp_c = fan_t;
    if ((rc = cli_design_make(&rq, d, 0)))
        goto done;
    rc = CLI_FAIL;
    const dk_dispersion_set *set = d->set;
    dk_qpm q = d->qpm;
    if (!dk_set_has_temperature(set)) {
        cli_error("data set '%s' has no temperature dependence, so it cannot "
                  "model oven tuning; pick a temperature-dependent set",
                  set->name);
        goto done;
    }
    if (dk_chip_gratings(&q, pump_um, signal, range[0], range[1], oven_c,
                         overlap, g, MAX_GRATINGS, &ng, &err)) {
        cli_error("%s", err.msg);
        goto done;
    }
    /* Range flags at both ends of every grating's tuning range. */
    dk_range_span span;
    dk_range_span_init(&span);
    for (int i = 0; i < ng; i++) {
        gflags[i] = 0;
        const double t[2] = {g[i].t_lo_c, g[i].t_hi_c};
        const double x[2] = {g[i].lo_um, g[i].hi_um};
        for (int k = 0; k < 2; k++) {
            dk_waves w = {pump_um, 0, 0};
            if (signal)
                w.signal_um = x[k],
                w.idler_um = dk_third_wave_um(pump_um, x[k]);
            else
                w.idler_um = x[k],
                w.signal_um = dk_third_wave_um(pump_um, x[k]);
            unsigned f = dk_design_range_flags(d, &w, t[k]);
            dk_range_span_add(&span, f, &w, t[k]);
            gflags[i] |= f;
        }
    }
    dk_notes spn;
    dk_notes_clear(&spn);
    dk_design_note_span(d, &span, &spn);
    cli_take_notes(&spn);
    cli_warn_caution(c, oven_c[0]);
    cli_warn_caution(c, oven_c[1]);
    if (fan) {
        double p0, p1;
        if (dk_chip_period_for(&q, pump_um, signal, range[0], fan_t, &p0,
                               &err) ||
            dk_chip_period_for(&q, pump_um, signal, range[1], fan_t, &p1,
                               &err)) {
            cli_error("%s", err.msg);
            goto done;
        }
        double guess = range[0];
        for (int k = 0; k < npos; k++) {
            fp[k].x_mm = width_mm * k / (npos - 1);
            fp[k].period_um = p0 + (p1 - p0) * k / (npos - 1);
            fp[k].target_um = dk_chip_target_at(&q, pump_um, signal,
                                                fp[k].period_um, fan_t, guess);
            if (isfinite(fp[k].target_um))
                guess = fp[k].target_um;
        }
        cli_warn_caution(c, fan_t);
    }

    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (json) {
        json_object *o = json_object_new_object();
        json_object_object_add(o, "crystal", json_object_new_string(c->id));
        json_object_object_add(o, "dispersion",
                               json_object_new_string(set->name));
        json_object_object_add(o, "pump_um", cli_json_num(pump_um));
        json_object_object_add(o, "target", json_object_new_string(target));
        json_object_object_add(o, "target_range_um", cli_json_range(range));
        json_object_object_add(o, "oven_C", cli_json_range(oven_c));
        json_object_object_add(o, "written_temperature_C",
                               cli_json_num(written_c));
        json_object *arr = json_object_new_array();
        for (int i = 0; i < ng; i++) {
            json_object *e = json_object_new_object();
            json_object_object_add(e, "period_um", cli_json_num(g[i].period_um));
            json_object_object_add(e, "lo_um", cli_json_num(g[i].lo_um));
            json_object_object_add(e, "hi_um", cli_json_num(g[i].hi_um));
            json_object_object_add(e, "temperature_at_lo_C",
                                   cli_json_num(g[i].t_lo_c));
            json_object_object_add(e, "temperature_at_hi_C",
                                   cli_json_num(g[i].t_hi_c));
            if (gflags[i]) {
                char buf[160];
                json_object *fl = json_object_new_array();
                dk_range_codes(gflags[i], 0, buf, sizeof buf);
                for (char *sv = NULL, *t = strtok_r(buf, ";", &sv); t;
         t = strtok_r(NULL, ";", &sv))
                    json_object_array_add(fl, json_object_new_string(t));
                json_object_object_add(e, "flags", fl);
            }
            json_object_array_add(arr, e);
        }
        json_object_object_add(o, "gratings", arr);
        if (fan) {
            json_object *fa = json_object_new_object();
            json_object_object_add(fa, "width_mm", cli_json_num(width_mm));
            json_object_object_add(fa, "temperature_C", cli_json_num(fan_t));
            json_object *pts = json_object_new_array();
            for (int k = 0; k < npos; k++) {
                json_object *e = json_object_new_object();
                json_object_object_add(e, "x_mm", cli_json_num(fp[k].x_mm));
                json_object_object_add(e, "period_um",
                                       cli_json_num(fp[k].period_um));
                json_object_object_add(e, "target_um",
                                       cli_json_num(fp[k].target_um));
                json_object_array_add(pts, e);
            }
            json_object_object_add(fa, "positions", pts);
            json_object_object_add(o, "fanout", fa);
        }
        cli_notes_to_json(o);
        cli_out_json(&out, o);
    } else if (csv) {
        char flags[256];
        fprintf(out.f, "grating,period_um,%s_lo_um,%s_hi_um,"
                       "temperature_at_lo_C,temperature_at_hi_C,flags\n",
                target, target);
        for (int i = 0; i < ng; i++)
            fprintf(out.f, "%d,%.6f,%.6f,%.6f,%.3f,%.3f,%s\n", i + 1,
                    g[i].period_um, g[i].lo_um, g[i].hi_um, g[i].t_lo_c,
                    g[i].t_hi_c,
                    cli_csv_flags(gflags[i], 0, flags, sizeof flags));
    } else {
        fprintf(out.f, "%s (data set %s), pump %.6g um:\n", c->id,
                set->name, pump_um);
        cli_wrapf(out.f, "  ", "  ",
                  "%d gratings cover the %s from %.4g to %.4g um with the "
                  "oven at %.4g-%.4g C (neighbours overlap by %.0f %%; "
                  "periods as written at %.4g C)",
                  ng, target, range[0], range[1], oven_c[0], oven_c[1],
                  overlap * 100, written_c);
        fputc('\n', out.f);
        fprintf(out.f, "  %-2s %9s   %-19s %s\n", "#", "period um",
                signal ? "signal range um" : "idler range um",
                "oven C at low, high end");
        for (int i = 0; i < ng; i++) {
            char buf[96];
            fprintf(out.f, "  %-2d %9.4f   %7.4f - %-9.4f %6.1f, %6.1f%s%s%s\n",
                    i + 1, g[i].period_um, g[i].lo_um, g[i].hi_um,
                    g[i].t_lo_c, g[i].t_hi_c,
                    gflags[i] ? "  [extrapolated: " : "",
                    gflags[i] ? dk_range_words(gflags[i], 0, buf, sizeof buf)
                              : "",
                    gflags[i] ? "]" : "");
        }
        if (fan) {
            fprintf(out.f, "\nfan-out, %.4g mm wide, oven at %.4g C: period "
                           "linear across the width\n  %8s %12s %12s\n",
                    width_mm, fan_t, "x mm", "period um", target);
            for (int k = 0; k < npos; k++) {
                if (isfinite(fp[k].target_um))
                    fprintf(out.f, "  %8.3f %12.4f %12.4f\n", fp[k].x_mm,
                            fp[k].period_um, fp[k].target_um);
                else
                    fprintf(out.f, "  %8.3f %12.4f %12s\n", fp[k].x_mm,
                            fp[k].period_um, "(none)");
            }
        }
    }
    rc = cli_out_commit(&out);
done:
    free(d);
    dk_db_free(db);
    return rc;
}
