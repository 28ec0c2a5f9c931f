/*
 * tolerance.c - `deltak tolerance`: spectral, thermal and angular
 * acceptance (FWHM of sinc²) of a QPM or birefringent design, and the
 * acceptance curves as CSV.
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "options.h"
#include "commands.h"
#include "design_args.h"
#include "plot_args.h"
#include "deltak/bandwidth.h"
#include "deltak/plot.h"
#include "deltak/tolerance.h"
#include "deltak/constants.h"
#include "deltak/units.h"

static const char *const tolerance_usage[] = {
    "deltak tolerance --crystal <name> (--fundamental <wl> | two of --pump/"
    "--signal/--idler)",
    "                 --length <L> [--temp <T>] [--period <P> | --type I|II "
    "[--pol <sip>] [--theta <deg>]]",
    "                 [--phi <deg>] [--plane XY|YZ|XZ] [--solution <n>] "
    "[--noncollinear <deg> | --broadband]",
    "                 [--dispersion <set>] [--json | --csv] [--curve "
    "<param>]",
    "",
    "  --length <L>      crystal length, e.g. 20mm",
    "  --period <P>      QPM period as written: the design is phase-matched "
    "in temperature",
    "  --temp <T>        operating temperature (with --period: the nearest "
    "phase-matching one)",
    "  --type, --pol     birefringent design: which solution of 'deltak "
    "angle' to use",
    "  --theta <deg>     birefringent design: the solution nearest this "
    "angle (default: largest d_eff)",
    "  --solution, --phi, --plane, --noncollinear, --broadband  as for "
    "'deltak angle'",
    "  --curve <param>   print sinc^2 against temperature, signal, pump, "
    "theta, phi, period or tilt",
    "  --plot <file>     with --curve: draw it (.pdf, .svg, .png), the FWHM "
    "shaded",
    CLI_PLOT_OPTIONS_USAGE,
    "",
    "Poled crystals get a QPM design unless --type or an angle option is "
    "given (--scheme overrides).",
    CLI_DESIGN_USAGE,
    NULL};

#define DEG DK_RAD_PER_DEG
#define ALLOWED (CLI_D_ALL)

typedef struct item {
    dk_tol_param p;
    const char *name;   /* for humans */
    const char *key;    /* for --curve */
    const char *unit;
    double scale;       /* x units → display units */
} item;

static const item items[] = {
    {DK_TOL_TEMPERATURE, "temperature", "temperature", "C", 1},
    {DK_TOL_SIGNAL, "signal, pump fixed", "signal", "nm", 1e3},
    {DK_TOL_PUMP, "pump, signal fixed", "pump", "nm", 1e3},
    {DK_TOL_THETA, "angle theta (internal)", "theta", "mrad", 1e3},
    {DK_TOL_PHI, "angle phi (internal)", "phi", "mrad", 1e3},
    {DK_TOL_PERIOD, "period (fabrication)", "period", "nm", 1e3},
    {DK_TOL_TILT, "beam tilt (internal)", "tilt", "mrad", 1e3},
};
#define NITEMS (sizeof items / sizeof items[0])

static const char *
curve_xlabel(dk_tol_param p)
{
    switch (p) {
    case DK_TOL_TEMPERATURE: return "Temperature (°C)";
    case DK_TOL_SIGNAL: return "Signal (fundamental) wavelength (nm)";
    case DK_TOL_PUMP: return "Pump wavelength (nm)";
    case DK_TOL_THETA: return "Internal angle θ (mrad)";
    case DK_TOL_PHI: return "Internal angle φ (mrad)";
    case DK_TOL_PERIOD: return "Poling period Λ (nm)";
    case DK_TOL_TILT: return "Beam tilt, internal (mrad)";
    }
    return "";
}

static int
print_curve(FILE *f, dk_design *d, const item *it,
            const cli_plot_args *pa)
{
    dk_acceptance a;
    dk_error err = {0};
    enum { NC = 401 };
    double xs[NC], ys[NC];
    const char *plot = cli_plot_path(pa);
    if (dk_design_acceptance_curve(d, it->p, 2, NC, xs, ys, &a, &err))
        return cli_error("%s acceptance: %s", it->name, err.msg);
    double w = a.fwhm, x0 = a.peak;
    for (int k = 0; k < NC; k++)
        xs[k] *= it->scale;
    if (!plot) {
        char flags[256];
        unsigned rf = dk_design_range_flags(d, &d->waves, d->temp_c);
        fprintf(f, "%s_%s,sinc2,flags\n", it->key, it->unit);
        for (int k = 0; k < NC; k++)
            fprintf(f, "%.10g,%.8f,%s\n", xs[k], ys[k],
                    cli_csv_flags(rf, d->shg, flags, sizeof flags));
        return 0;
    }
    dk_plot *fig = NULL;
    char band[64];
    snprintf(band, sizeof band, "FWHM %.3g %s", w * it->scale,
             !strcmp(it->unit, "C") ? "°C" : it->unit);
    dk_status s = cli_plot_new(pa, &fig, &err);
    if (!s)
        s = dk_plot_set_xlabel(fig, curve_xlabel(it->p), &err);
    if (!s)
        s = dk_plot_set_ylabel(fig, "sinc<sup>2</sup>(Δk L/2)", &err);
    if (!s)
        s = dk_plot_add_band(fig, a.lo * it->scale, a.hi * it->scale, band,
                             &err);
    if (!s)
        s = dk_plot_add_line(fig, xs, ys, NC, NULL, &err);
    if (!s)
        s = dk_plot_add_marker(fig, x0 * it->scale, 1, "operating point",
                               &err);
    if (!s)
        s = dk_plot_set_yrange(fig, 0, 1.08, &err);
    if (!s)
        s = cli_plot_write(pa, fig, f, &err);
    dk_plot_free(fig);
    if (s)
        return cli_error("%s", err.msg);
    if (!cli_plot_stdout_format(pa))
        fprintf(f, "wrote %s\n", plot);
    return 0;
}

int
cmd_tolerance(int argc, char **argv)
{
    enum { O_CURVE = 500, O_END };
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        CLI_PLOT_OPTIONS,
        {"curve", required_argument, NULL, O_CURVE},
        {NULL, 0, NULL, 0}};
    const char *slot[O_END - O_CURVE] = {0};
    cli_slots sl = {O_CURVE, O_END - O_CURVE, slot, opts, tolerance_usage};
    cli_common cm = {0};
    cli_design_args da = {0};
    cli_plot_args pa = {0};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, tolerance_usage, &cm, &da,
                                &pa, cli_slot_option, &sl, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    const char *curve = slot[0];
    if ((rc = cli_common_finish(&cm, argc, argv, 0, tolerance_usage)))
        return rc;
    dk_error err = {0};
    if (!cli_design_given(&da, OPT_LENGTH))
        return cli_usage_error(tolerance_usage, "--length is required, e.g. "
                                                "--length 20mm");
    const item *want = NULL;
    for (size_t i = 0; curve && i < NITEMS; i++)
        if (!strcmp(curve, items[i].key))
            want = &items[i];
    if (cli_plot_path(&pa) && !curve)
        return cli_usage_error(tolerance_usage, "--plot draws a --curve; "
                                                "give --curve too");
    if (cli_plot_parse(&pa, tolerance_usage))
        return CLI_USAGE;
    if (curve && !want)
        return cli_usage_error(tolerance_usage, "--curve '%s' must be one of "
                                                "temperature, signal, pump, "
                                                "theta, phi, period, tilt",
                               curve);

    dk_db *db;
    dk_design *dp;
    if ((rc = cli_design_open(&cm, &da, ALLOWED, 1, 1, tolerance_usage, &db, &dp)))
        return rc;
    rc = CLI_FAIL;
    const dk_crystal *c = dp->crystal;
#define d (*dp)
    const dk_dispersion_set *set = d.set;
    int qpm = d.scheme == DK_SCHEME_QPM;

    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (want) {
        if (print_curve(out.f, &d, want, &pa)) {
            cli_out_discard(&out);
            goto done;
        }
        rc = cli_out_commit(&out);
        goto done;
    }
    dk_acceptance acc[NITEMS];
    dk_acceptance_lobes lobes[NITEMS];
    double dom[NITEMS][2];
    int have[NITEMS] = {0};
    int no_tdep = !dk_set_has_temperature(d.set);
    for (size_t i = 0; i < NITEMS; i++) {
        if (!dk_design_applies(&d, items[i].p))
            continue;
        /* A set with no temperature dependence has no thermal width. */
        if (items[i].p == DK_TOL_TEMPERATURE && no_tdep) {
            have[i] = 2;
            continue;
        }
        if (dk_design_acceptance_lobes(&d, items[i].p, &acc[i], &lobes[i],
                                       dom[i], &err)) {
            cli_error("%s", err.msg);
            cli_out_discard(&out);
            goto done;
        }
        have[i] = 1;
    }
    /* The acceptance edges may reach beyond the fitted ranges. */
    for (size_t i = 0; i < NITEMS; i++) {
        if (have[i] != 1 || !acc[i].bounded)
            continue;
        if (items[i].p == DK_TOL_TEMPERATURE) {
            double e[2] = {acc[i].lo, acc[i].hi};
            for (int k = 0; k < 2; k++) {
                unsigned f = dk_design_range_flags(&d, &d.waves, e[k]);
                dk_notes n;
                dk_notes_clear(&n);
                dk_design_note_range(&d, f & DK_RANGE_TEMP, &d.waves, e[k],
                                     &n);
                cli_take_notes(&n);
            }
        }
    }
    double lcm = d.length_mm / 10;
    double nin = dk_design_input_index(&d);
    /* Idler width from the signal edges (energy conservation). */
    double idl_nm = NAN, sig_cm = NAN;
    if (have[1] && isfinite(acc[1].fwhm) && !d.shg) {
        double il = dk_third_wave_um(d.waves.pump_um, acc[1].lo);
        double ih = dk_third_wave_um(d.waves.pump_um, acc[1].hi);
        idl_nm = fabs(il - ih) * 1e3;
    }
    if (no_tdep)
        cli_warn("no temperature acceptance: data set '%s' has no "
                 "temperature dependence (pick another with --dispersion)",
                 set->name);
    if (have[1] && isfinite(acc[1].fwhm))
        sig_cm = 1e4 * fabs(1 / acc[1].lo - 1 / acc[1].hi);
    /* The spectral widths in frequency and the pulses they support. */
    double thz[NITEMS];
    for (size_t i = 0; i < NITEMS; i++) {
        thz[i] = NAN;
        if (have[i] == 1 && isfinite(acc[i].fwhm) &&
            (items[i].p == DK_TOL_SIGNAL || items[i].p == DK_TOL_PUMP))
            thz[i] = dk_interval_thz(acc[i].lo, acc[i].hi);
    }
    if (cm.json) {
        json_object *o = cli_design_json(&d);
        json_object_object_add(o, "length_mm", cli_json_num(d.length_mm));
        json_object_object_add(o, "temperature_C", cli_json_num(d.temp_c));
        if (qpm)
            json_object_object_add(o, "period_um", cli_json_num(d.period_um));
        else {
            json_object_object_add(o, "pol", json_object_new_string(d.pol));
            json_object_object_add(o, "theta_deg",
                                   cli_json_num(d.theta_rad / DEG));
            json_object_object_add(o, "phi_deg",
                                   cli_json_num(d.phi_rad / DEG));
            if (d.angle.alpha_rad != 0)
                json_object_object_add(o, "alpha_deg",
                                       cli_json_num(d.angle.alpha_rad / DEG));
        }
        json_object *spec = json_object_new_object(),
                    *ang = json_object_new_object(),
                    *lin = json_object_new_object();
        for (size_t i = 0; i < NITEMS; i++) {
            if (have[i] != 1)
                continue;
            double v = isfinite(acc[i].fwhm) ? acc[i].fwhm * items[i].scale
                                             : NAN;
            double l = acc[i].linear_fwhm * items[i].scale;
            json_object_object_add(lin, items[i].key, cli_json_num(l));
            switch (items[i].p) {
            case DK_TOL_TEMPERATURE:
                json_object_object_add(o, "temperature_fwhm_C",
                                       cli_json_num(v));
                break;
            case DK_TOL_SIGNAL:
            case DK_TOL_PUMP:
                json_object_object_add(spec, items[i].key, cli_json_num(v));
                break;
            case DK_TOL_THETA:
            case DK_TOL_PHI:
            case DK_TOL_TILT:
                json_object_object_add(ang, items[i].key, cli_json_num(v));
                break;
            case DK_TOL_PERIOD:
                json_object_object_add(o, "period_fwhm_nm", cli_json_num(v));
                break;
            }
        }
        if (isfinite(idl_nm))
            json_object_object_add(spec, "idler", cli_json_num(idl_nm));
        if (d.shg)
            json_object_object_add(spec, "fundamental",
                                   cli_json_num(acc[1].fwhm * 1e3));
        json_object_object_add(o, "spectral_fwhm_nm", spec);
        if (isfinite(sig_cm))
            json_object_object_add(o, "signal_fwhm_cm-1",
                                   cli_json_num(sig_cm));
        json_object_object_add(o, "angular_fwhm_mrad", ang);
        json_object *ext = json_object_new_object();
        for (size_t i = 0; i < NITEMS; i++)
            if (have[i] == 1 && !strcmp(items[i].unit, "mrad") &&
                isfinite(acc[i].fwhm))
                json_object_object_add(ext, items[i].key,
                                       cli_json_num(acc[i].fwhm * 1e3 * nin));
        json_object_object_add(o, "external_angular_fwhm_mrad", ext);
        json_object_object_add(o, "linear_estimates", lin);
        json_object *fq = json_object_new_object(),
                    *tg = json_object_new_object(),
                    *ts = json_object_new_object(),
                    *open = json_object_new_object(),
                    *outer = json_object_new_object(),
                    *lob = json_object_new_object();
        for (size_t i = 0; i < NITEMS; i++) {
            if (have[i] != 1)
                continue;
            const char *key = d.shg && items[i].p == DK_TOL_SIGNAL
                                  ? "fundamental" : items[i].key;
            if (isfinite(thz[i])) {
                json_object_object_add(fq, key, cli_json_num(thz[i]));
                json_object_object_add(
                    tg, key,
                    cli_json_num(dk_transform_limit_fs(thz[i],
                                                       DK_SHAPE_GAUSSIAN)));
                json_object_object_add(
                    ts, key,
                    cli_json_num(dk_transform_limit_fs(thz[i],
                                                       DK_SHAPE_SECH2)));
            }
            if (acc[i].open_lo || acc[i].open_hi) {
                json_object *sides = json_object_new_array();
                if (acc[i].open_lo)
                    json_object_array_add(sides,
                                          json_object_new_string("low"));
                if (acc[i].open_hi)
                    json_object_array_add(sides,
                                          json_object_new_string("high"));
                json_object_object_add(open, key, sides);
            }
            const dk_acceptance_lobes *lb = &lobes[i];
            if (lb->n > 0) {
                json_object_object_add(outer, key,
                                       cli_json_num(lb->outer_fwhm *
                                                    items[i].scale));
                json_object *arr = json_object_new_array();
                for (int k = 0; k < lb->n; k++) {
                    json_object *pr = json_object_new_array();
                    json_object_array_add(pr, cli_json_num(lb->lo[k] *
                                                           items[i].scale));
                    json_object_array_add(pr, cli_json_num(lb->hi[k] *
                                                           items[i].scale));
                    json_object_array_add(arr, pr);
                }
                json_object_object_add(lob, key, arr);
            }
        }
        json_object_object_add(o, "spectral_fwhm_THz", fq);
        json_object *tl = json_object_new_object();
        json_object_object_add(tl, "gaussian", tg);
        json_object_object_add(tl, "sech2", ts);
        json_object_object_add(o, "transform_limit_fs", tl);
        json_object_object_add(o, "open_sides", open);
        json_object_object_add(o, "outer_fwhm", outer);
        json_object_object_add(o, "half_maximum_intervals", lob);
        cli_flags_json(o, dk_design_range_flags(&d, &d.waves, d.temp_c),
                       d.shg);
        cli_notes_to_json(o);
        cli_out_json(&out, o);
    } else if (cm.csv) {
        char flags[256];
        unsigned rf = dk_design_range_flags(&d, &d.waves, d.temp_c);
        cli_csv_flags(rf, d.shg, flags, sizeof flags);
        fprintf(out.f, "parameter,unit,fwhm,first_order_fwhm,per_length,"
                       "per_length_unit,fwhm_THz,transform_limit_gaussian_fs,"
                       "transform_limit_sech2_fs,outer_fwhm,flags\n");
        for (size_t i = 0; i < NITEMS; i++) {
            if (have[i] == 2)
                fprintf(out.f, "%s,%s,,,,,,,,,%s%sno-temperature-dependence\n",
                        items[i].key, items[i].unit, flags,
                        flags[0] ? ";" : "");
            if (have[i] != 1)
                continue;
            int root;
            double pl = dk_acceptance_per_length(&acc[i], lcm, &root);
            char extra[160] = "", fq[120] = "";
            if (acc[i].open_lo || acc[i].open_hi)
                snprintf(extra, sizeof extra, "%s%s%s", flags[0] ? ";" : "",
                         acc[i].open_lo ? "open-low" : "",
                         acc[i].open_lo && acc[i].open_hi ? ";open-high"
                         : acc[i].open_hi                 ? "open-high"
                                                          : "");
            if (isfinite(thz[i]))
                snprintf(fq, sizeof fq, "%.8g,%.8g,%.8g", thz[i],
                         dk_transform_limit_fs(thz[i], DK_SHAPE_GAUSSIAN),
                         dk_transform_limit_fs(thz[i], DK_SHAPE_SECH2));
            else
                snprintf(fq, sizeof fq, ",,");
            fprintf(out.f, "%s,%s,%.8g,%.8g,%.8g,%s*%s,%s,%.8g,%s%s\n",
                    items[i].key, items[i].unit, acc[i].fwhm * items[i].scale,
                    acc[i].linear_fwhm * items[i].scale, pl * items[i].scale,
                    items[i].unit, root ? "cm^0.5" : "cm", fq,
                    lobes[i].outer_fwhm * items[i].scale, flags, extra);
        }
    } else {
        char head[512];
        int hn = snprintf(head, sizeof head,
                          "%s (data set %s), %s design, %.4g mm long, ", c->id,
                          set->name, qpm ? "QPM" : "birefringent",
                          d.length_mm);
        size_t room = hn > 0 && (size_t)hn < sizeof head
                          ? sizeof head - (size_t)hn : 0;
        if (qpm)
            snprintf(head + hn, room, "period %.4f um, phase-matched at "
                                      "%.2f C",
                     d.period_um, d.temp_c);
        else if (d.angle.alpha_rad != 0)
            snprintf(head + hn, room, "modes %s, theta %.3f deg, phi %.2f "
                                      "deg, noncollinear alpha %+.3f deg, "
                                      "%.4g C",
                     d.pol, d.theta_rad / DEG, d.phi_rad / DEG,
                     d.angle.alpha_rad / DEG, d.temp_c);
        else
            snprintf(head + hn, room, "modes %s, theta %.3f deg, phi %.2f "
                                      "deg, %.4g C",
                     d.pol, d.theta_rad / DEG, d.phi_rad / DEG, d.temp_c);
        cli_wrap(out.f, "", "    ", head);
        if (d.shg)
            fprintf(out.f, "  SHG of %.6g um\n", d.waves.signal_um);
        else
            fprintf(out.f, "  pump %.6g um, signal %.6g um, idler %.6g um\n",
                    d.waves.pump_um, d.waves.signal_um, d.waves.idler_um);
        cli_flags_text(out.f, dk_design_range_flags(&d, &d.waves, d.temp_c),
                       d.shg);
        fputc('\n', out.f);
        fprintf(out.f, "  %-24s %14s %14s %19s\n", "acceptance (FWHM)",
                "exact", "first-order", "per length");
        for (size_t i = 0; i < NITEMS; i++) {
            if (!have[i])
                continue;
            const char *name = items[i].name;
            if (d.shg && items[i].p == DK_TOL_SIGNAL)
                name = "fundamental";
            if (have[i] == 2) {
                fprintf(out.f, "  %-24s %14s\n", name,
                        "n/a (set has no T dependence)");
                continue;
            }
            int root;
            double pl = dk_acceptance_per_length(&acc[i], lcm, &root);
            char ex[40], li[32], pls[40];
            snprintf(ex, sizeof ex, "%s%.4g %s",
                     acc[i].open_lo || acc[i].open_hi ? "> " : "",
                     acc[i].fwhm * items[i].scale, items[i].unit);
            /* A first-order width 100 times the exact one means the slope
             * vanishes at the operating point: the estimate says nothing
             * (JSON keeps the number). */
            if (isfinite(acc[i].linear_fwhm) &&
                !(acc[i].linear_fwhm > 100 * acc[i].fwhm))
                snprintf(li, sizeof li, "%.4g %s",
                         acc[i].linear_fwhm * items[i].scale, items[i].unit);
            else
                snprintf(li, sizeof li, "(noncritical)");
            snprintf(pls, sizeof pls, "%.4g %s*%s", pl * items[i].scale,
                     items[i].unit, root ? "cm^1/2" : "cm");
            fprintf(out.f, "  %-24s %14s %14s %19s\n", name, ex, li,
                    acc[i].open_lo || acc[i].open_hi ? "" : pls);
        }
        /* What a single number does not say: open sides, more lobes. */
        for (size_t i = 0; i < NITEMS; i++) {
            if (have[i] != 1)
                continue;
            const char *name = d.shg && items[i].p == DK_TOL_SIGNAL
                                   ? "fundamental" : items[i].key;
            double sc = items[i].scale;
            const char *u = items[i].unit;
            if (acc[i].open_lo || acc[i].open_hi)
                fprintf(out.f, "\n  %s: sinc^2 stays above 1/2 %s%s%s of "
                               "the range searched (%.6g to %.6g %s%s)",
                        name, acc[i].open_lo ? "to the low end" : "",
                        acc[i].open_lo && acc[i].open_hi ? " and " : "",
                        acc[i].open_hi ? "to the high end" : "",
                        dom[i][0] * sc, dom[i][1] * sc, u,
                        items[i].p == DK_TOL_SIGNAL ||
                                items[i].p == DK_TOL_PUMP
                            ? ", every wave inside the transparency"
                            : "");
            const dk_acceptance_lobes *lb = &lobes[i];
            if (lb->central >= 0 && !lb->contiguous) {
                fprintf(out.f, "\n  %s: double-humped band, sinc^2 >= 1/2 "
                               "on",
                        name);
                for (int k = lb->group_first; k <= lb->group_last; k++)
                    fprintf(out.f, "%s %.6g-%.6g", k > lb->group_first ? ","
                                                                       : "",
                            lb->lo[k] * sc, lb->hi[k] * sc);
                fprintf(out.f, " %s; outer FWHM %.4g %s", u,
                        lb->outer_fwhm * sc, u);
            }
            int others = 0;
            for (int k = 0; k < lb->n; k++) {
                if (k >= lb->group_first && k <= lb->group_last)
                    continue;
                fprintf(out.f, "%s %.6g-%.6g",
                        others++ ? ","
                                 : (fprintf(out.f, "\n  %s: phase-matched "
                                                   "again (not counted in "
                                                   "the width) at",
                                            name),
                                    ""),
                        lb->lo[k] * sc, lb->hi[k] * sc);
            }
            if (others)
                fprintf(out.f, " %s", u);
        }
        int any_thz = 0;
        for (size_t i = 0; i < NITEMS; i++)
            any_thz |= isfinite(thz[i]);
        if (any_thz)
            fprintf(out.f, "\n\n  %-26s %12s %26s\n", "spectral width",
                    "THz", "transform limit: Gaussian, sech2");
        for (size_t i = 0; i < NITEMS; i++) {
            if (!isfinite(thz[i]))
                continue;
            char tl[64];
            snprintf(tl, sizeof tl, "%s%.4g fs, %.4g fs",
                     acc[i].open_lo || acc[i].open_hi ? "< " : "",
                     dk_transform_limit_fs(thz[i], DK_SHAPE_GAUSSIAN),
                     dk_transform_limit_fs(thz[i], DK_SHAPE_SECH2));
            fprintf(out.f, "  %-26s %12.4g %26s\n",
                    d.shg && items[i].p == DK_TOL_SIGNAL ? "fundamental"
                                                          : items[i].name,
                    thz[i], tl);
        }
        if (isfinite(sig_cm))
            fprintf(out.f, "\n  %s width %.4g cm-1", d.shg ? "fundamental"
                                                           : "signal",
                    sig_cm);
        if (isfinite(idl_nm))
            fprintf(out.f, "; idler width %.4g nm (pump fixed)", idl_nm);
        for (size_t i = 0; i < NITEMS; i++)
            if (have[i] == 1 && !strcmp(items[i].unit, "mrad") &&
                acc[i].bounded && isfinite(nin))
                fprintf(out.f, "\n  %s outside the crystal: about %.4g mrad "
                               "(x n = %.4f, normal incidence)",
                        items[i].key, acc[i].fwhm * 1e3 * nin, nin);
        fputs("\n\n", out.f);
        cli_wrap(out.f, "  ", "  ",
                 "exact: where sinc^2(dk L/2) falls to 1/2; first-order: "
                 "2x2.783/(L |d dk/dx|); per length: x L (critical) or "
                 "x sqrt(L) (noncritical)");
        cli_wrap(out.f, "  ", "  ",
                 "transform limit: the duration of a pulse whose intensity "
                 "spectrum has this FWHM (Gaussian 0.441/dnu, sech2 "
                 "0.315/dnu)");
    }
    rc = cli_out_commit(&out);
#undef d
done:
    free(dp);
    dk_db_free(db);
    return rc;
}
