/*
 * pulse.c - `deltak pulse`: group index, GVM, GVD and TOD of the three
 * waves of a design, and the lengths at which pulses and beams part.
 */
#include <getopt.h>
#include <stddef.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "commands.h"
#include "design_args.h"
#include "deltak/pulse.h"
#include "deltak/units.h"

static const char *const pulse_usage[] = {
    "deltak pulse --crystal <name> (--fundamental <wl> | two of --pump/"
    "--signal/--idler)",
    "             [--temp <T>] [--period <P> | --type I|II [--pol <sip>] "
    "[--theta <deg>]]",
    "             [--duration <tau>] [--waist <w0>] [--length <L>] "
    "[--dispersion <set>] [--json]",
    "",
    "  --duration <tau>  pulse duration (e.g. 30fs): pulse-splitting "
    "lengths tau/|GVM|",
    "  --waist <w0>      beam waist radius (e.g. 100um): walk-off aperture "
    "lengths",
    "  --length <L>      crystal length: delay accumulated over it",
    "Poled crystals get the QPM design unless --type or --theta is given.",
    NULL};

#define DEG (M_PI / 180)

static const char *const wave_names[3] = {"signal", "idler", "pump"};
static const char *const pair_names[3] = {"signal_pump", "idler_pump",
                                          "signal_idler"};

static json_object *
triple(const dk_pulse_props *p, size_t offset)
{
    json_object *o = json_object_new_object();
    for (int k = 0; k < 3; k++)
        json_object_object_add(
            o, wave_names[k],
            cli_json_num(*(const double *)((const char *)&p->w[k] + offset)));
    return o;
}

int
cmd_pulse(int argc, char **argv)
{
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        {"duration", required_argument, NULL, 'D'},
        {"waist", required_argument, NULL, 'W'},
        {"length", required_argument, NULL, 'L'},
        {NULL, 0, NULL, 0}};
    cli_common cm = {0};
    cli_design_args da = {0};
    const char *dur_s = NULL, *waist_s = NULL, *len_s = NULL;
    int ch, rc;
    optind = 1;
    opterr = 0;
    while ((ch = getopt_long(argc, argv, "+h", opts, NULL)) != -1) {
        if (cli_common_option(ch, &cm) || cli_design_option(ch, &da))
            continue;
        switch (ch) {
        case 'D': dur_s = optarg; break;
        case 'W': waist_s = optarg; break;
        case 'L': len_s = optarg; break;
        case 'h': cli_print_usage(stdout, pulse_usage); return 0;
        default: return cli_bad_option(argv, pulse_usage);
        }
    }
    if ((rc = cli_common_finish(&cm, argc, argv, 0, pulse_usage)))
        return rc;
    if (cm.csv)
        return cli_usage_error(pulse_usage, "--csv is not offered here; use "
                                            "--json");
    cli_design_spec sp;
    dk_error err = {0};
    double tau = NAN, waist_mm = NAN, len_mm = NAN;
    if ((rc = cli_design_parse(&da, &sp, 1, pulse_usage)))
        return rc;
    if ((dur_s && dk_parse_duration(dur_s, &tau, &err)) ||
        (waist_s && dk_parse_length(waist_s, &waist_mm, &err)) ||
        (len_s && dk_parse_length(len_s, &len_mm, &err)))
        return cli_usage_error(pulse_usage, "%s", err.msg);

    dk_db *db = NULL;
    if (cli_load_db(&db))
        return CLI_FAIL;
    rc = CLI_FAIL;
    dk_design d = {0};
    d.length_mm = 1;
    int qpm;
    const dk_crystal *c = cli_find_crystal(db, cm.crystal);
    const dk_dispersion_set *set = c ? cli_find_set(c, cm.set_name) : NULL;
    dk_pulse_props pp;
    if (!set || cli_design_setup(&sp, c, set, &d, &qpm))
        goto done;
    if (dk_pulse_props_of(&d, &pp, &err)) {
        cli_error("%s", err.msg);
        goto done;
    }
    cli_warn_caution(c, d.temp_c);
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (cm.json) {
        json_object *o = json_object_new_object();
        json_object_object_add(o, "crystal", json_object_new_string(c->id));
        json_object_object_add(o, "dispersion",
                               json_object_new_string(set->name));
        json_object_object_add(o, "design",
                               json_object_new_string(qpm ? "qpm"
                                                          : "birefringent"));
        json_object_object_add(o, "temperature_C", cli_json_num(d.temp_c));
        json_object *wl = json_object_new_object();
        json_object_object_add(wl, "signal", cli_json_num(d.waves.signal_um));
        json_object_object_add(wl, "idler", cli_json_num(d.waves.idler_um));
        json_object_object_add(wl, "pump", cli_json_num(d.waves.pump_um));
        json_object_object_add(o, "wavelengths_um", wl);
        if (!qpm) {
            json_object_object_add(o, "pol", json_object_new_string(d.pol));
            json_object_object_add(o, "theta_deg",
                                   cli_json_num(d.theta_rad / DEG));
            json_object_object_add(o, "phi_deg",
                                   cli_json_num(d.phi_rad / DEG));
        }
        json_object_object_add(o, "n", triple(&pp, offsetof(dk_wave_props,
                                                             n)));
        json_object_object_add(
            o, "group_index",
            triple(&pp, offsetof(dk_wave_props, group_index)));
        json_object_object_add(
            o, "gvd_fs2_per_mm",
            triple(&pp, offsetof(dk_wave_props, gvd_fs2_per_mm)));
        json_object_object_add(
            o, "tod_fs3_per_mm",
            triple(&pp, offsetof(dk_wave_props, tod_fs3_per_mm)));
        json_object *g = json_object_new_object(), *wo = json_object_new_object();
        json_object *ls = json_object_new_object(), *la = json_object_new_object();
        for (int k = 0; k < 3; k++) {
            json_object_object_add(g, pair_names[k],
                                   cli_json_num(pp.gvm_fs_per_mm[k]));
            json_object_object_add(wo, pair_names[k],
                                   cli_json_num(pp.walkoff_rad[k] * 1e3));
            if (isfinite(tau))
                json_object_object_add(
                    ls, pair_names[k],
                    cli_json_num(dk_splitting_length_mm(
                        tau, pp.gvm_fs_per_mm[k])));
            if (isfinite(waist_mm))
                json_object_object_add(
                    la, pair_names[k],
                    cli_json_num(dk_aperture_length_mm(waist_mm * 1e3,
                                                       pp.walkoff_rad[k])));
        }
        json_object_object_add(o, "gvm_fs_per_mm", g);
        json_object_object_add(o, "walkoff_mrad", wo);
        if (isfinite(tau)) {
            json_object_object_add(o, "duration_fs", cli_json_num(tau));
            json_object_object_add(o, "splitting_length_mm", ls);
        } else
            json_object_put(ls);
        if (isfinite(waist_mm)) {
            json_object_object_add(o, "waist_um", cli_json_num(waist_mm * 1e3));
            json_object_object_add(o, "aperture_length_mm", la);
        } else
            json_object_put(la);
        cli_warnings_to_json(o);
        cli_out_json(&out, o);
    } else {
        fprintf(out.f, "%s (data set %s), %s design at %.4g C", c->id,
                set->name, qpm ? "QPM" : "birefringent", d.temp_c);
        if (!qpm)
            fprintf(out.f, ", modes %s, theta %.3f deg, phi %.2f deg", d.pol,
                    d.theta_rad / DEG, d.phi_rad / DEG);
        fprintf(out.f, "\n\n  %-7s %10s %10s %12s %13s %13s %10s\n", "wave",
                "um", "n", "group index", "GVD fs2/mm", "TOD fs3/mm",
                "walk-off");
        static const char *const shg_names[3] = {"fund.", "", "harm."};
        for (int k = 0; k < 3; k++) {
            if (d.shg && k == 1)
                continue;   /* signal and idler are the same wave */
            fprintf(out.f, "  %-7s %10.5g %10.6f %12.6f %13.2f %13.2f %5.2f "
                           "mrad\n",
                    d.shg ? shg_names[k] : wave_names[k], pp.w[k].lambda_um,
                    pp.w[k].n,
                    pp.w[k].group_index, pp.w[k].gvd_fs2_per_mm,
                    pp.w[k].tod_fs3_per_mm, pp.w[k].walkoff_rad * 1e3);
        }
        fprintf(out.f, "\n  %-14s %12s %14s", "pair", "GVM fs/mm",
                "walk-off mrad");
        if (isfinite(tau))
            fprintf(out.f, " %16s", "split length mm");
        if (isfinite(waist_mm))
            fprintf(out.f, " %16s", "aperture len mm");
        if (isfinite(len_mm))
            fprintf(out.f, " %14s", "delay fs");
        fputc('\n', out.f);
        static const char *const pn[3] = {"signal-pump", "idler-pump",
                                          "signal-idler"};
        for (int k = 0; k < 3; k++) {
            if (d.shg && k > 0)
                break;
            fprintf(out.f, "  %-14s %12.2f %14.2f",
                    d.shg ? "fund.-harmonic" : pn[k], pp.gvm_fs_per_mm[k],
                    pp.walkoff_rad[k] * 1e3);
            if (isfinite(tau))
                fprintf(out.f, " %16.4g",
                        dk_splitting_length_mm(tau, pp.gvm_fs_per_mm[k]));
            if (isfinite(waist_mm))
                fprintf(out.f, " %16.4g",
                        dk_aperture_length_mm(waist_mm * 1e3,
                                              pp.walkoff_rad[k]));
            if (isfinite(len_mm))
                fprintf(out.f, " %14.1f", pp.gvm_fs_per_mm[k] * len_mm);
            fputc('\n', out.f);
        }
        fprintf(out.f, "\n  GVM = 1/v_g(first) - 1/v_g(second); split length "
                       "= duration/|GVM|; aperture length = sqrt(pi) w0 / "
                       "walk-off\n");
    }
    rc = cli_out_commit(&out);
done:
    dk_db_free(db);
    return rc;
}
