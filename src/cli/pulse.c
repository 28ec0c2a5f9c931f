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
#include "options.h"
#include "deltak/bandwidth.h"
#include "deltak/pulse.h"
#include "deltak/constants.h"
#include "deltak/units.h"

static const char *const pulse_usage[] = {
    "deltak pulse --crystal <name> (--fundamental <wl> | two of --pump/"
    "--signal/--idler)",
    "             [--temp <T>] [--period <P> | --type I|II [--pol <sip>] "
    "[--theta <deg>] [--solution <n>]]",
    "             [--noncollinear <deg> | --broadband] [--phi <deg>] "
    "[--plane XY|YZ|XZ]",
    "             [--duration <tau> [--shape gaussian|sech2]] [--waist <w0>] "
    "[--length <L>]",
    "             [--dispersion <set>] [--json]",
    "",
    "  --duration <tau>  pulse duration (e.g. 30fs): pulse-splitting "
    "lengths tau/|GVM|",
    "  --waist <w0>      beam waist radius (e.g. 100um): walk-off aperture "
    "lengths",
    "  --length <L>      crystal length: delay accumulated over it, the "
    "acceptance of each wave pair in",
    "                    THz and the pulse it supports, each wave's "
    "duration after the crystal",
    "  --shape <s>       gaussian (default) or sech2: the pulse shape of "
    "--duration",
    "  --candidates <list>  more crystals (comma-separated) to rank with "
    "--crystal for --duration: each",
    "                    one's design, longest crystal and relative "
    "efficiency there",
    "With --duration: the longest crystal whose acceptance along each wave "
    "pair supports that pulse.",
    "Noncollinear designs project the GVM as for noncollinear OPAs: pairs "
    "with the pump along the pump,",
    "signal-idler along the signal (zero at the broadband angle).",
    "Poled crystals get the QPM design unless --type or an angle option is "
    "given (--scheme overrides).",
    CLI_DESIGN_USAGE,
    NULL};

#define DEG DK_RAD_PER_DEG
#define ALLOWED CLI_D_ALL

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

typedef struct pulse_opts {
    const char *duration, *waist, *shape, *candidates;
} pulse_opts;

/* One candidate crystal of a ranking. */
typedef struct candidate {
    char name[64];
    int ok;
    char why[DK_ERROR_MSG_MAX];
    char pol[4];
    double theta_deg, phi_deg, deff, n[3], walkoff_mrad;
    double lmax_mm;
    int limiting;          /* the pair that sets lmax */
    double merit;          /* (d_eff L_max)² / (n_s n_i n_p) */
    unsigned range;
    int qpm;
    double period_um;
} candidate;

static int
by_merit(const void *a, const void *b)
{
    const candidate *x = a, *y = b;
    if (x->ok != y->ok)
        return y->ok - x->ok;
    return (y->merit > x->merit) - (y->merit < x->merit);
}

/* Rank the crystal of --crystal and the --candidates for pulses of
 * @tau: each one's design (the same options), the longest crystal over
 * every wave pair, and the low-conversion figure of merit there. */
static int
rank_candidates(const cli_common *cm, const cli_design_args *da,
                const char *list, double tau, dk_pulse_shape shape,
                int json, const char *const usage[])
{
    enum { MAXC = 24 };
    char buf[1024], names_buf[1024];
    snprintf(buf, sizeof buf, "%s,%s", cm->crystal, list);
    /* the named crystals alone (a name the files do not show, or more
     * names than allowed, loads every file: the errors below then come
     * out as before) */
    const char *names[MAXC + 1];
    int nn = 0;
    snprintf(names_buf, sizeof names_buf, "%s", buf);
    for (char *sp = names_buf, *tok; (tok = strsep(&sp, ","));)
        if (*tok && nn <= MAXC)
            names[nn++] = tok;
    dk_db *db;
    if (cli_load_db_names(&db, names, nn > MAXC ? 0 : nn))
        return CLI_FAIL;
    candidate cand[MAXC];
    int nc = 0, rc = CLI_FAIL;
    for (char *sp = buf, *tok; (tok = strsep(&sp, ","));) {
        if (!*tok)
            continue;
        if (nc == MAXC) {
            rc = cli_usage_error(usage, "--candidates: at most %d crystals",
                                 MAXC - 1);
            goto done;
        }
        candidate *k = &cand[nc++];
        memset(k, 0, sizeof *k);
        snprintf(k->name, sizeof k->name, "%s", tok);
        const dk_crystal *c = cli_find_crystal(db, tok);
        if (!c) {
            rc = CLI_USAGE;
            goto done;
        }
        dk_design_request rq;
        if ((rc = cli_design_request(da, ALLOWED, 1, c, tok, NULL, &rq,
                                     usage)))
            goto done;
        dk_design *d = malloc(sizeof *d);
        dk_error err = {0};
        if (!d) {
            rc = cli_error("out of memory");
            goto done;
        }
        if (dk_design_resolve(&rq, d, &err)) {
            snprintf(k->why, sizeof k->why, "%s", err.msg);
            free(d);
            continue;
        }
        snprintf(k->name, sizeof k->name, "%s", c->id);
        k->qpm = d->scheme == DK_SCHEME_QPM;
        k->period_um = d->period_um;
        dk_pulse_props pp;
        if (dk_pulse_props_of(d, &pp, &err)) {
            snprintf(k->why, sizeof k->why, "%s", err.msg);
            free(d);
            continue;
        }
        k->deff = dk_design_deff(d);
        snprintf(k->pol, sizeof k->pol, "%s", d->pol);
        k->theta_deg = d->theta_rad / DEG;
        k->phi_deg = d->phi_rad / DEG;
        for (int j = 0; j < 3; j++) {
            k->n[j] = pp.w[j].n;
            k->walkoff_mrad = fmax(k->walkoff_mrad, pp.walkoff_rad[j] * 1e3);
        }
        k->range = dk_design_range_flags(d, &d->waves, d->temp_c);
        int bad = dk_design_pulse_limit(d, tau, shape, &k->lmax_mm,
                                        &k->limiting, &err) != DK_OK;
        if (bad)
            snprintf(k->why, sizeof k->why, "%s", err.msg);
        if (!bad && isfinite(k->deff) && k->deff > 1e-6) {
            k->ok = 1;
            k->merit = dk_low_conversion_merit(
                k->deff, isfinite(k->lmax_mm) ? k->lmax_mm : 1e4, k->n);
        } else if (!bad) {
            snprintf(k->why, sizeof k->why, "no usable d_eff");
        }
        free(d);
    }
    qsort(cand, (size_t)nc, sizeof cand[0], by_merit);
    double best = cand[0].ok ? cand[0].merit : NAN;
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (json) {
        json_object *o = json_object_new_object(), *a = json_object_new_array();
        json_object_object_add(o, "duration_fs", cli_json_num(tau));
        json_object_object_add(o, "shape", json_object_new_string(
                                               dk_pulse_shape_str(shape)));
        for (int i = 0; i < nc; i++) {
            candidate *k = &cand[i];
            json_object *e = json_object_new_object();
            json_object_object_add(e, "crystal", json_object_new_string(k->name));
            if (!k->ok) {
                json_object_object_add(e, "error", json_object_new_string(k->why));
                json_object_array_add(a, e);
                continue;
            }
            json_object_object_add(e, "pol", json_object_new_string(k->pol));
            if (k->qpm)
                json_object_object_add(e, "period_um",
                                       cli_json_num(k->period_um));
            else
                json_object_object_add(e, "theta_deg",
                                       cli_json_num(k->theta_deg));
            json_object_object_add(e, "deff_pm_per_V", cli_json_num(k->deff));
            json_object_object_add(e, "longest_crystal_mm",
                                   cli_json_num(k->lmax_mm));
            if (k->limiting >= 0)
                json_object_object_add(
                    e, "limiting_pair",
                    json_object_new_string(dk_pair_str((dk_pair)k->limiting,
                                                       0)));
            json_object_object_add(e, "walkoff_mrad",
                                   cli_json_num(k->walkoff_mrad));
            json_object_object_add(e, "merit_relative",
                                   cli_json_num(k->merit / best));
            cli_flags_json(e, k->range, 0);
            json_object_array_add(a, e);
        }
        json_object_object_add(o, "ranking", a);
        cli_notes_to_json(o);
        cli_out_json(&out, o);
    } else {
        fprintf(out.f, "candidates for %.4g fs %s pulses, ranked by (d_eff "
                       "L_max)^2 / (n_s n_i n_p)\nat the longest crystal "
                       "that supports them\n\n",
                tau, dk_pulse_shape_str(shape));
        /* 78 columns: a terminal's width */
        fprintf(out.f, "  %-2s %-10s %-5s %12s %5s %8s %-12s %8s %6s\n", "#",
                "crystal", "modes", "theta/period", "d_eff", "L_max mm",
                "limited by", "walk-off", "merit");
        for (int i = 0; i < nc; i++) {
            candidate *k = &cand[i];
            if (!k->ok) {
                fprintf(out.f, "  %-2s %-10s no design: %s\n", "-", k->name,
                        k->why);
                continue;
            }
            char lm[24], where[32];
            if (isfinite(k->lmax_mm))
                snprintf(lm, sizeof lm, "%.3g", k->lmax_mm);
            else
                snprintf(lm, sizeof lm, "any");
            snprintf(where, sizeof where, k->qpm ? "%.3f um" : "%.3f",
                     k->qpm ? k->period_um : k->theta_deg);
            fprintf(out.f, "  %-2d %-10s %-5s %12s %5.3g %8s %-12s %8.3g "
                           "%6.3f%s\n",
                    i + 1, k->name, k->pol, where, k->deff, lm,
                    k->limiting >= 0 ? dk_pair_str((dk_pair)k->limiting, 0)
                                     : "-",
                    k->walkoff_mrad, k->merit / best,
                    k->range ? "  [extrapolated]" : "");
        }
        fprintf(out.f, "\n  theta in deg, period in um; L_max: the shortest "
                       "over the wave pairs of the\n"
                       "  length whose acceptance equals the pulse's spectral "
                       "FWHM; limited by: the\n"
                       "  pair that sets it; walk-off: the largest, mrad; "
                       "merit: relative\n"
                       "  low-conversion efficiency at L_max (plane waves; "
                       "walk-off, absorption and\n"
                       "  damage not included)\n");
    }
    rc = cli_out_commit(&out);
done:
    dk_db_free(db);
    return rc;
}

static int
pulse_option(int ch, const char *arg, void *ctx)
{
    pulse_opts *po = ctx;
    switch (ch) {
    case 'D': po->duration = arg; return 0;
    case 'W': po->waist = arg; return 0;
    case 'S': po->shape = arg; return 0;
    case 'R': po->candidates = arg; return 0;
    }
    return -1;
}

int
cmd_pulse(int argc, char **argv)
{
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        {"duration", required_argument, NULL, 'D'},
        {"waist", required_argument, NULL, 'W'},
        {"shape", required_argument, NULL, 'S'},
        {"candidates", required_argument, NULL, 'R'},
        {NULL, 0, NULL, 0}};
    cli_common cm = {0};
    cli_design_args da = {0};
    int rc;
    pulse_opts po = {NULL, NULL, NULL, NULL};
    if ((rc = cli_parse_options(argc, argv, opts, pulse_usage, &cm, &da, NULL,
                                pulse_option, &po, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    const char *dur_s = po.duration, *waist_s = po.waist;
    if ((rc = cli_common_finish(&cm, argc, argv, 0, pulse_usage)))
        return rc;
    if (cm.csv)
        return cli_usage_error(pulse_usage, "--csv is not offered here; use "
                                            "--json");
    dk_error err = {0};
    double tau = NAN, waist_mm = NAN;
    if ((dur_s && dk_parse_duration(dur_s, &tau, &err)) ||
        (waist_s && dk_parse_length(waist_s, &waist_mm, &err)))
        return cli_usage_error(pulse_usage, "%s", err.msg);
    dk_pulse_shape shape = DK_SHAPE_GAUSSIAN;
    if (po.shape && !strcmp(po.shape, "sech2"))
        shape = DK_SHAPE_SECH2;
    else if (po.shape && strcmp(po.shape, "gaussian"))
        return cli_usage_error(pulse_usage, "--shape '%s' must be gaussian "
                                            "or sech2", po.shape);
    if (po.shape && !dur_s)
        return cli_usage_error(pulse_usage, "--shape describes --duration; "
                                            "give --duration too");
    if (po.candidates && !dur_s)
        return cli_usage_error(pulse_usage, "--candidates ranks crystals for "
                                            "a pulse: give --duration too");
    if (po.candidates)
        return rank_candidates(&cm, &da, po.candidates, tau, shape, cm.json,
                               pulse_usage);

    dk_db *db;
    dk_design *dp;
    if ((rc = cli_design_open(&cm, &da, ALLOWED, 1, 1, pulse_usage, &db, &dp)))
        return rc;
    rc = CLI_FAIL;
    const dk_crystal *c = dp->crystal;
    dk_pulse_props pp;
#define d (*dp)
    const dk_dispersion_set *set = d.set;
    int qpm = d.scheme == DK_SCHEME_QPM;
    double len_mm = d.length_mm;
    if (dk_pulse_props_of(&d, &pp, &err)) {
        cli_error("%s", err.msg);
        goto done;
    }
    /* Bandwidth as time: pair acceptances at the length, the longest
     * crystal for the pulse, each wave after the crystal. */
    dk_acceptance pacc[DK_NPAIRS];
    int have_acc[DK_NPAIRS] = {0};
    double lmax[DK_NPAIRS];
    int have_lmax[DK_NPAIRS] = {0};
    dk_dispersed disp[3];
    int have_disp[3] = {0};
    for (int k = 0; k < DK_NPAIRS; k++) {
        if (!dk_pair_applies(&d, (dk_pair)k))
            continue;
        if (isfinite(len_mm) &&
            dk_design_pair_acceptance(&d, (dk_pair)k, &pacc[k], NULL,
                                      &err) == DK_OK)
            have_acc[k] = 1;
        if (isfinite(tau)) {
            dk_status st = dk_design_longest_crystal(&d, (dk_pair)k, tau,
                                                     shape, &lmax[k], &err);
            if (st == DK_OK)
                have_lmax[k] = 1;
            else if (st == DK_ENOROOT)
                have_lmax[k] = 2, lmax[k] = 0;
        }
    }
    for (int k = 0; isfinite(tau) && isfinite(len_mm) && k < 3; k++) {
        if (d.shg && k == 1)
            continue;
        if (dk_design_dispersed(&d, k, tau, shape, len_mm, &disp[k],
                                &err) == DK_OK)
            have_disp[k] = 1;
        else
            cli_warn("%s after the crystal: %s", wave_names[k], err.msg);
    }
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (cm.json) {
        json_object *o = cli_design_json(&d);
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
        if (pp.noncollinear) {
            json_object *an = json_object_new_object();
            for (int k = 0; k < 3; k++)
                json_object_object_add(an, pair_names[k],
                                       cli_json_num(pp.angle_rad[k] / DEG));
            json_object_object_add(o, "angle_deg", an);
            json_object_object_add(o, "gvm_projection",
                                   json_object_new_string(
                                       "pump pairs along the pump, "
                                       "signal-idler along the signal"));
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
        json_object *pairs = json_object_new_array();
        for (int k = 0; k < DK_NPAIRS; k++) {
            if (!have_acc[k] && !have_lmax[k])
                continue;
            json_object *e = json_object_new_object();
            json_object_object_add(
                e, "pair", json_object_new_string(dk_pair_str((dk_pair)k,
                                                              d.shg)));
            if (have_acc[k]) {
                json_object_object_add(e, "acceptance_THz",
                                       cli_json_num(pacc[k].fwhm));
                json_object_object_add(e, "first_order_THz",
                                       cli_json_num(pacc[k].linear_fwhm));
                json_object_object_add(
                    e, "transform_limit_fs",
                    cli_json_num(dk_transform_limit_fs(pacc[k].fwhm, shape)));
                if (pacc[k].open_lo || pacc[k].open_hi)
                    json_object_object_add(e, "open",
                                           json_object_new_boolean(1));
            }
            if (have_lmax[k])
                json_object_object_add(e, "longest_crystal_mm",
                                       cli_json_num(lmax[k]));
            json_object_array_add(pairs, e);
        }
        json_object_object_add(o, "pairs", pairs);
        if (isfinite(tau))
            json_object_object_add(o, "shape",
                                   json_object_new_string(
                                       dk_pulse_shape_str(shape)));
        json_object *dj = json_object_new_object();
        for (int k = 0; k < 3; k++) {
            if (!have_disp[k])
                continue;
            json_object *e = json_object_new_object();
            json_object_object_add(e, "gdd_fs2", cli_json_num(disp[k].gdd_fs2));
            json_object_object_add(e, "fwhm_fs",
                                   cli_json_num(disp[k].fwhm_out_fs));
            json_object_object_add(e, "gdd_only_fwhm_fs",
                                   cli_json_num(disp[k].gdd_only_fs));
            json_object_object_add(dj, wave_names[k], e);
        }
        json_object_object_add(o, "after_crystal", dj);
        cli_flags_json(o, dk_design_range_flags(&d, &d.waves, d.temp_c),
                       d.shg);
        cli_notes_to_json(o);
        cli_out_json(&out, o);
    } else {
        char head[512];
        int hn = snprintf(head, sizeof head, "%s (data set %s), %s design "
                                             "at %.4g C",
                          c->id, set->name, qpm ? "QPM" : "birefringent",
                          d.temp_c);
        if (!qpm && hn > 0 && (size_t)hn < sizeof head)
            snprintf(head + hn, sizeof head - (size_t)hn,
                     ", modes %s, theta %.3f deg, phi %.2f deg", d.pol,
                     d.theta_rad / DEG, d.phi_rad / DEG);
        cli_wrap(out.f, "", "    ", head);
        if (pp.noncollinear) {
            snprintf(head, sizeof head, "noncollinear: signal at %+.3f deg, "
                                        "idler at %.3f deg from the pump "
                                        "(internal)",
                     d.angle.alpha_rad / DEG, pp.angle_rad[1] / DEG);
            cli_wrap(out.f, "  ", "    ", head);
        }
        cli_flags_text(out.f, dk_design_range_flags(&d, &d.waves, d.temp_c),
                       d.shg);
        fprintf(out.f, "\n  %-7s %8s %9s %11s %11s %11s %13s\n", "wave",
                "um", "n", "group index", "GVD fs2/mm", "TOD fs3/mm",
                "walk-off mrad");
        static const char *const shg_names[3] = {"fund.", "", "harm."};
        for (int k = 0; k < 3; k++) {
            if (d.shg && k == 1)
                continue;   /* signal and idler are the same wave */
            fprintf(out.f, "  %-7s %8.5g %9.6f %11.6f %11.2f %11.2f %13.2f"
                           "\n",
                    d.shg ? shg_names[k] : wave_names[k], pp.w[k].lambda_um,
                    pp.w[k].n,
                    pp.w[k].group_index, pp.w[k].gvd_fs2_per_mm,
                    pp.w[k].tod_fs3_per_mm, pp.w[k].walkoff_rad * 1e3);
        }
        /* at most 71 columns with every optional column */
        fprintf(out.f, "\n  %-14s %9s %13s", "pair", "GVM fs/mm",
                "walk-off mrad");
        if (isfinite(tau))
            fprintf(out.f, " %9s", "split mm");
        if (isfinite(waist_mm))
            fprintf(out.f, " %11s", "aperture mm");
        if (isfinite(len_mm))
            fprintf(out.f, " %9s", "delay fs");
        fputc('\n', out.f);
        static const char *const pn[3] = {"signal-pump", "idler-pump",
                                          "signal-idler"};
        for (int k = 0; k < 3; k++) {
            if (d.shg && k > 0)
                break;
            fprintf(out.f, "  %-14s %9.2f %13.2f",
                    d.shg ? "fund.-harmonic" : pn[k], pp.gvm_fs_per_mm[k],
                    pp.walkoff_rad[k] * 1e3);
            if (isfinite(tau))
                fprintf(out.f, " %9.4g",
                        dk_splitting_length_mm(tau, pp.gvm_fs_per_mm[k]));
            if (isfinite(waist_mm))
                fprintf(out.f, " %11.4g",
                        dk_aperture_length_mm(waist_mm * 1e3,
                                              pp.walkoff_rad[k]));
            if (isfinite(len_mm))
                fprintf(out.f, " %9.1f", pp.gvm_fs_per_mm[k] * len_mm);
            fputc('\n', out.f);
        }
        fprintf(out.f, "\n  GVM = 1/v_g(first) - 1/v_g(second); split: the "
                       "length where pulses part,\n"
                       "  duration/|GVM|; aperture: where beams part, "
                       "sqrt(pi) w0 / walk-off;\n"
                       "  delay: GVM times the crystal length\n");
        if (pp.noncollinear)
            fprintf(out.f, "  noncollinear: pairs with the pump projected on "
                           "the pump direction,\n"
                           "  signal-idler on the signal direction\n");
        int any = 0;
        for (int k = 0; k < DK_NPAIRS; k++)
            any |= have_acc[k] || have_lmax[k];
        if (any) {
            fprintf(out.f, "\n  bandwidth as time");
            if (isfinite(tau))
                fprintf(out.f, " (%.4g fs %s; %.4g THz FWHM when "
                               "transform-limited)",
                        tau, dk_pulse_shape_str(shape),
                        dk_pulse_bandwidth_thz(tau, shape));
            fprintf(out.f, "\n  %-22s", "pair (wave held)");
            if (isfinite(len_mm))
                fprintf(out.f, " %16s %16s", "acceptance THz",
                        "supports fs");
            if (isfinite(tau))
                fprintf(out.f, " %20s", "longest crystal mm");
            fputc('\n', out.f);
            static const char *const held[3] = {"pump", "signal", "idler"};
            for (int k = 0; k < DK_NPAIRS; k++) {
                if (!have_acc[k] && !have_lmax[k])
                    continue;
                char name[48];
                snprintf(name, sizeof name, "%s (%s)",
                         dk_pair_str((dk_pair)k, d.shg),
                         d.shg ? "-" : held[k]);
                fprintf(out.f, "  %-22s", name);
                if (isfinite(len_mm)) {
                    if (have_acc[k]) {
                        int open = pacc[k].open_lo || pacc[k].open_hi;
                        char a[32], b[32];
                        snprintf(a, sizeof a, "%s%.4g", open ? "> " : "",
                                 pacc[k].fwhm);
                        snprintf(b, sizeof b, "%s%.4g", open ? "< " : "",
                                 dk_transform_limit_fs(pacc[k].fwhm, shape));
                        fprintf(out.f, " %16s %16s", a, b);
                    } else {
                        fprintf(out.f, " %16s %16s", "-", "-");
                    }
                }
                if (have_lmax[k] == 1 && isfinite(lmax[k]))
                    fprintf(out.f, " %20.4g", lmax[k]);
                else if (have_lmax[k] == 1)
                    fprintf(out.f, " %20s", "any (> 10 m)");
                if (have_lmax[k] == 2)
                    fprintf(out.f, " %20s", "< 0.001");
                fputc('\n', out.f);
            }
            fprintf(out.f, "  acceptance: FWHM of sinc^2 in the frequency of "
                           "the moving waves (exact);\n"
                           "  supports: the transform-limited %s pulse with "
                           "that spectral FWHM\n",
                    dk_pulse_shape_str(shape));
            if (isfinite(tau))
                fprintf(out.f, "  longest crystal: where the acceptance "
                               "equals the pulse's spectral FWHM\n"
                               "  (about twice tau/|GVM| where GVM rules)\n");
        }
        int anyd = have_disp[0] || have_disp[1] || have_disp[2];
        if (anyd) {
            fprintf(out.f, "\n  a transform-limited %.4g fs %s pulse after "
                           "%.4g mm\n  (each wave in its own mode, exact k(w)):\n"
                           "  %-7s %12s %14s %18s\n",
                    tau, dk_pulse_shape_str(shape), len_mm, "wave",
                    "GDD fs2", "duration fs", "GDD alone fs");
            static const char *const shg_short[3] = {"fund.", "", "harm."};
            for (int k = 0; k < 3; k++) {
                if (!have_disp[k])
                    continue;
                char g[32];
                if (isfinite(disp[k].gdd_only_fs))
                    snprintf(g, sizeof g, "%.4g", disp[k].gdd_only_fs);
                else
                    snprintf(g, sizeof g, "-");
                fprintf(out.f, "  %-7s %12.4g %14.4g %18s\n",
                        d.shg ? shg_short[k] : wave_names[k], disp[k].gdd_fs2,
                        disp[k].fwhm_out_fs, g);
            }
        }
    }
    rc = cli_out_commit(&out);
#undef d
done:
    free(dp);
    dk_db_free(db);
    return rc;
}
