/*
 * angle.c - `deltak angle`: birefringent phase-matching directions with
 * walk-off and d_eff; noncritical temperatures; noncollinear geometry.
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "commands.h"
#include "design_args.h"
#include "deltak/angle.h"
#include "deltak/units.h"

static const char *const angle_usage[] = {
    "deltak angle --crystal <name> (--fundamental <wl> | two of --pump/"
    "--signal/--idler)",
    "             [--temp <T>] [--type I|II] [--pol <sip>] [--phi <deg>]",
    "             [--noncollinear <deg> | --magic] [--ncpm] [--cut <deg>]",
    "             [--dispersion <set> | --all-sets] [--json]",
    "",
    "  --type I|II          only this type (default: every combination)",
    "  --pol <sip>          only these modes of signal, idler, pump: o/e "
    "(uniaxial) or s/f (biaxial slow/fast)",
    "  --phi <deg>          azimuth for uniaxial crystals (default: the one "
    "maximising d_eff)",
    "  --noncollinear <deg> internal pump-signal angle alpha",
    "  --magic              find alpha where signal and idler group "
    "velocities match (broadband OPA)",
    "  --ncpm               temperatures of noncritical phase matching along "
    "X, Y and Z",
    "  --temp-range <lo:hi> where --ncpm looks (default: the set's range)",
    "  --cut <deg>          crystal cut angle theta: also give external "
    "incidence angles",
    "  --curve              CSV of the phase-matching directions theta(phi), "
    "phi 0-90 deg",
    NULL};

#define DEG (M_PI / 180)

static json_object *
solution_json(const dk_angle_solution *s, double ext)
{
    json_object *o = json_object_new_object();
    json_object_object_add(o, "type", json_object_new_string(s->type));
    json_object_object_add(o, "pol", json_object_new_string(s->pol));
    if (s->plane[0])
        json_object_object_add(o, "plane", json_object_new_string(s->plane));
    json_object_object_add(o, "theta_deg", cli_json_num(s->theta_rad / DEG));
    json_object_object_add(o, "phi_deg", cli_json_num(s->phi_rad / DEG));
    if (isfinite(s->deff_pm_per_v))
        json_object_object_add(o, "deff_pm_per_V",
                               cli_json_num(s->deff_pm_per_v));
    json_object *w = json_object_new_object();
    json_object_object_add(w, "signal", cli_json_num(s->walkoff_rad[0] * 1e3));
    json_object_object_add(w, "idler", cli_json_num(s->walkoff_rad[1] * 1e3));
    json_object_object_add(w, "pump", cli_json_num(s->walkoff_rad[2] * 1e3));
    json_object_object_add(o, "walkoff_mrad", w);
    json_object *n = json_object_new_object();
    json_object_object_add(n, "signal", cli_json_num(s->n[0]));
    json_object_object_add(n, "idler", cli_json_num(s->n[1]));
    json_object_object_add(n, "pump", cli_json_num(s->n[2]));
    json_object_object_add(o, "n", n);
    if (isfinite(ext))
        json_object_object_add(o, "external_angle_deg",
                               cli_json_num(ext / DEG));
    return o;
}

static void
print_solution(FILE *f, const dk_angle_solution *s, int shg, double ext)
{
    char pol[8];
    if (shg)
        snprintf(pol, sizeof pol, "%c%c -> %c", s->pol[0], s->pol[1],
                 s->pol[2]);
    else
        snprintf(pol, sizeof pol, "%c %c %c", s->pol[0], s->pol[1], s->pol[2]);
    fprintf(f, "  %-4s %-8s %-4s %8.3f %8.3f %9.3f   %6.2f %6.2f %6.2f",
            s->type, pol, s->plane[0] ? s->plane : "-", s->theta_rad / DEG,
            s->phi_rad / DEG, s->deff_pm_per_v, s->walkoff_rad[0] * 1e3,
            s->walkoff_rad[1] * 1e3, s->walkoff_rad[2] * 1e3);
    if (isfinite(ext))
        fprintf(f, "  %7.2f", ext / DEG);
    fputc('\n', f);
}

/* Mode combinations not worth listing: all in one mode, the second
 * ordering of a type-II SHG pair (labels @l: slow/o first), or not the
 * one asked for. */
static int
skip_combo(const char p3[4], const char *l, int shg, const char *pol)
{
    if (p3[0] == p3[1] && p3[1] == p3[2])
        return 1;
    if (shg && p3[0] == l[1] && p3[1] == l[0])
        return 1;
    return pol && strcmp(pol, p3) != 0;
}

/* The input wave whose index sets the external angle. */
static double
input_index(const dk_angle_solution *s, int shg)
{
    return shg ? s->n[0] : s->n[2];
}

int
cmd_angle(int argc, char **argv)
{
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        {"temp-range", required_argument, NULL, 'R'},
        {"phi", required_argument, NULL, 'F'},
        {"noncollinear", required_argument, NULL, 'N'},
        {"magic", no_argument, NULL, 'M'},
        {"ncpm", no_argument, NULL, 'C'},
        {"curve", no_argument, NULL, 'K'},
        {"cut", required_argument, NULL, 'X'},
        {NULL, 0, NULL, 0}};
    cli_common cm = {0};
    cli_design_args da = {0};
    const char *phi_s = NULL, *alpha_s = NULL, *cut_s = NULL, *trange = NULL;
    int magic = 0, ncpm = 0, curve = 0, ch, rc;
    optind = 1;
    opterr = 0;
    while ((ch = getopt_long(argc, argv, "+h", opts, NULL)) != -1) {
        if (cli_common_option(ch, &cm) || cli_design_option(ch, &da))
            continue;
        switch (ch) {
        case 'R': trange = optarg; break;
        case 'F': phi_s = optarg; break;
        case 'N': alpha_s = optarg; break;
        case 'M': magic = 1; break;
        case 'C': ncpm = 1; break;
        case 'K': curve = 1; break;
        case 'X': cut_s = optarg; break;
        case 'h': cli_print_usage(stdout, angle_usage); return 0;
        default: return cli_bad_option(argv, angle_usage);
        }
    }
    if ((rc = cli_common_finish(&cm, argc, argv, 1, angle_usage)))
        return rc;
    if (cm.csv)
        return cli_usage_error(angle_usage, "--csv is not offered here; use "
                                            "--json");
    if (da.period || da.theta || da.order)
        return cli_usage_error(angle_usage, "--period, --order and --theta "
                                            "do not apply to 'angle' (it "
                                            "solves for the angle)");
    cli_design_spec sp;
    if ((rc = cli_design_parse(&da, &sp, 1, angle_usage)))
        return rc;
    dk_angle_problem pb = {0};
    dk_error err = {0};
    pb.waves = sp.waves;
    pb.shg = sp.shg;
    pb.temp_c = sp.temp_c;
    const char *temp = da.temp, *pol = sp.pol, *type = sp.type;
    double phi = NAN, cut = NAN, trg[2] = {NAN, NAN};
    char *end;
    if (trange && cli_parse_range(trange, 0, trg, &err))
        return cli_usage_error(angle_usage, "%s", err.msg);
    if (phi_s && (phi = strtod(phi_s, &end) * DEG, *end))
        return cli_usage_error(angle_usage, "--phi '%s' must be degrees, "
                                            "e.g. 90", phi_s);
    if (cut_s && (cut = strtod(cut_s, &end) * DEG, *end))
        return cli_usage_error(angle_usage, "--cut '%s' must be degrees, "
                                            "e.g. 29.2", cut_s);
    if (alpha_s && (pb.alpha_rad = strtod(alpha_s, &end) * DEG,
                    *end || fabs(pb.alpha_rad) >= M_PI / 4))
        return cli_usage_error(angle_usage, "--noncollinear '%s' must be "
                                            "degrees below 45",
                               alpha_s);
    if (pol && strlen(pol) != 3)
        return cli_usage_error(angle_usage, "--pol '%s' must have three "
                                            "letters (signal idler pump)",
                               pol);
    if (magic && alpha_s)
        return cli_usage_error(angle_usage, "choose one of --magic and "
                                            "--noncollinear");
    const char *want_type = type;

    dk_db *db = NULL;
    if (cli_load_db(&db))
        return CLI_FAIL;
    rc = CLI_FAIL;
    pb.crystal = cli_find_crystal(db, cm.crystal);
    const dk_dispersion_set *only = NULL;
    if (!pb.crystal || (!cm.all && !(only = cli_find_set(pb.crystal,
                                                          cm.set_name))))
        goto done;
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (curve) {
        pb.set = only ? only : &pb.crystal->sets[0];
        if (!temp && !dk_set_has_temperature(pb.set))
            pb.temp_c = pb.set->reference_temperature_c;
        const char *l = pb.crystal->optical_class == DK_BIAXIAL ? "sf" : "oe";
        enum { NPHI = 91, PER = 4 };
        double th[NPHI * PER];
        int cnt[NPHI];
        fprintf(out.f, "pol,phi_deg,theta_deg\n");
        for (int c3 = 0; c3 < 8; c3++) {
            char p3[4] = {l[(c3 >> 2) & 1], l[(c3 >> 1) & 1], l[c3 & 1], 0};
            if (skip_combo(p3, l, pb.shg, pol))
                continue;
            if (dk_angle_curve(&pb, p3, NPHI, PER, th, cnt, &err)) {
                cli_error("%s", err.msg);
                cli_out_discard(&out);
                goto done;
            }
            for (int k = 0; k < NPHI; k++)
                for (int j = 0; j < cnt[k]; j++)
                    fprintf(out.f, "%s,%.4f,%.6f\n", p3, 90.0 * k / (NPHI - 1),
                            th[k * PER + j] / DEG);
        }
        rc = cli_out_commit(&out);
        goto done;
    }
    json_object *root = json_object_new_object();
    json_object *sets_json = json_object_new_array();
    json_object_object_add(root, "crystal",
                           json_object_new_string(pb.crystal->id));
    json_object *wl = json_object_new_object();
    json_object_object_add(wl, "pump", cli_json_num(pb.waves.pump_um));
    json_object_object_add(wl, "signal", cli_json_num(pb.waves.signal_um));
    json_object_object_add(wl, "idler", cli_json_num(pb.waves.idler_um));
    json_object_object_add(root, "wavelengths_um", wl);
    json_object_object_add(root, "temperature_C", cli_json_num(pb.temp_c));
    int total = 0;
    char spread_pol[4] = "";
    double spread_lo = INFINITY, spread_hi = -INFINITY;
    int spread_n = 0;
    for (int si = 0; si < pb.crystal->nsets; si++) {
        pb.set = &pb.crystal->sets[si];
        if (only && pb.set != only)
            continue;
        /* Without --temp, a set with no T dependence is used at its own
         * reference temperature, silently. */
        if (!temp && !dk_set_has_temperature(pb.set))
            pb.temp_c = pb.set->reference_temperature_c;
        else if (!temp)
            pb.temp_c = 25;
        dk_angle_solution sol[DK_ANGLE_MAX_SOL];
        int n = 0;
        if (magic) {
            const char *mp = pol ? pol
                             : pb.crystal->optical_class == DK_UNIAXIAL ? "ooe"
                                                                        : "ssf";
            double a, th;
            if (dk_angle_magic_alpha(&pb, mp, isfinite(phi) ? phi : 0,
                                     20 * DEG, &a, &th, &err)) {
                if (!cm.all) {
                    cli_error("%s", err.msg);
                    json_object_put(root);
                    json_object_put(sets_json);
                    cli_out_discard(&out);
                    goto done;
                }
                cli_warn("data set '%s': %s", pb.set->name, err.msg);
                continue;
            }
            pb.alpha_rad = a;
            memcpy(sol[0].pol, mp, 3);
            sol[0].pol[3] = '\0';
            sol[0].plane[0] = '\0';
            sol[0].theta_rad = th;
            sol[0].phi_rad = isfinite(phi) ? phi : 0;
            if (!dk_angle_describe(&pb, &sol[0], &err)) {
                if (!isfinite(phi) &&
                    pb.crystal->optical_class == DK_UNIAXIAL)
                    dk_angle_best_phi(&pb, &sol[0]);
                n = 1;
            }
        } else if (ncpm) {
            /* Along X, Y, Z for every mode combination. */
            static const struct {
                const char *axis;
                double theta, phi;
            } dirs[] = {{"X", M_PI / 2, 0}, {"Y", M_PI / 2, M_PI / 2},
                        {"Z", 0, 0}};
            const char *l = pb.crystal->optical_class == DK_BIAXIAL ? "sf"
                                                                    : "oe";
            double lo = trg[0], hi = trg[1];
            if (!isfinite(lo)) {
                const double *r = pb.set->temp_form == DK_TEMP_NONE
                                      ? pb.set->thermo.temperature_range_c
                                      : pb.set->temperature_range_c;
                lo = r[0], hi = r[1];
            }
            for (size_t d = 0; d < 3; d++)
                for (int c = 0; c < 8; c++) {
                    char p3[4] = {l[(c >> 2) & 1], l[(c >> 1) & 1], l[c & 1],
                                  0};
                    if (skip_combo(p3, l, pb.shg, pol))
                        continue;
                    double t[8];
                    int nt;
                    if (dk_angle_ncpm_temperatures(&pb, p3, dirs[d].theta,
                                                   dirs[d].phi, lo, hi, t, 8,
                                                   &nt, &err)) {
                        cli_error("%s", err.msg);
                        json_object_put(root);
                        json_object_put(sets_json);
                        cli_out_discard(&out);
                        goto done;
                    }
                    for (int k = 0; k < nt && n < DK_ANGLE_MAX_SOL; k++) {
                        double keep = pb.temp_c;
                        pb.temp_c = t[k];
                        dk_angle_solution *o = &sol[n];
                        memset(o, 0, sizeof *o);
                        memcpy(o->pol, p3, 4);
                        snprintf(o->plane, sizeof o->plane, "%s",
                                 dirs[d].axis);
                        o->theta_rad = dirs[d].theta;
                        o->phi_rad = dirs[d].phi;
                        if (!dk_angle_describe(&pb, o, NULL)) {
                            o->n[0] = t[k]; /* reused below as temperature */
                            n++;
                        }
                        pb.temp_c = keep;
                    }
                }
        } else if (dk_angle_solve(&pb, phi, pol, sol, DK_ANGLE_MAX_SOL, &n,
                                  &err)) {
            cli_error("%s", err.msg);
            json_object_put(root);
            json_object_put(sets_json);
            cli_out_discard(&out);
            goto done;
        }
        json_object *sj = json_object_new_array();
        if (!cm.json) {
            fprintf(out.f, "%s%s, data set %s%s: ", total ? "\n" : "",
                    pb.crystal->id, pb.set->name,
                    pb.set->from_memory ? " [from memory]" : "");
            if (pb.shg)
                fprintf(out.f, "SHG of %.6g um at %.4g C",
                        pb.waves.signal_um, pb.temp_c);
            else
                fprintf(out.f, "pump %.6g, signal %.6g, idler %.6g um at "
                               "%.4g C",
                        pb.waves.pump_um, pb.waves.signal_um,
                        pb.waves.idler_um, pb.temp_c);
            if (magic || pb.alpha_rad != 0)
                fprintf(out.f, ", noncollinear alpha %.3f deg (internal)",
                        pb.alpha_rad / DEG);
            fputc('\n', out.f);
        }
        int shown = 0;
        for (int k = 0; k < n; k++) {
            if (want_type && strcmp(sol[k].type, want_type))
                continue;
            double ext = isfinite(cut)
                             ? dk_external_angle(sol[k].theta_rad, cut,
                                                 input_index(&sol[k], pb.shg))
                             : NAN;
            if (ncpm) {
                if (!cm.json) {
                    if (!shown)
                        fprintf(out.f, "  noncritical phase matching along a "
                                       "principal axis:\n  %-6s %-5s %10s "
                                       "%9s\n",
                                "modes", "axis", "T C", "d_eff");
                    fprintf(out.f, "  %-6s %-5s %10.2f %9.3f\n", sol[k].pol,
                            sol[k].plane, sol[k].n[0], sol[k].deff_pm_per_v);
                }
                json_object *o = json_object_new_object();
                json_object_object_add(o, "type",
                                       json_object_new_string(sol[k].type));
                json_object_object_add(o, "pol",
                                       json_object_new_string(sol[k].pol));
                json_object_object_add(o, "axis",
                                       json_object_new_string(sol[k].plane));
                json_object_object_add(o, "temperature_C",
                                       cli_json_num(sol[k].n[0]));
                if (isfinite(sol[k].deff_pm_per_v))
                    json_object_object_add(o, "deff_pm_per_V",
                                           cli_json_num(sol[k].deff_pm_per_v));
                json_object_array_add(sj, o);
            } else {
                if (!cm.json) {
                    if (!shown)
                        fprintf(out.f, "  %-4s %-8s %-4s %8s %8s %9s   %-20s%s\n",
                                "type", "modes", "plane", "theta", "phi",
                                "d_eff", "walk-off mrad s i p",
                                isfinite(cut) ? "  ext deg" : "");
                    print_solution(out.f, &sol[k], pb.shg, ext);
                }
                json_object *o = solution_json(&sol[k], ext);
                if (magic)
                    json_object_object_add(o, "alpha_deg",
                                           cli_json_num(pb.alpha_rad / DEG));
                json_object_array_add(sj, o);
            }
            if (!ncpm && !magic && (!spread_pol[0] ||
                                    !strcmp(spread_pol, sol[k].pol))) {
                double a = strcmp(sol[k].plane, "XY") ? sol[k].theta_rad
                                                      : sol[k].phi_rad;
                if (!spread_pol[0] || shown == 0) {
                    memcpy(spread_pol, sol[k].pol, 4);
                    spread_lo = fmin(spread_lo, a / DEG);
                    spread_hi = fmax(spread_hi, a / DEG);
                    spread_n++;
                }
            }
            shown++;
        }
        if (!shown && !cm.json)
            fprintf(out.f, "  no phase matching%s\n",
                    ncpm ? " along X, Y or Z in the temperature range"
                         : " in any direction");
        cli_warn_index(pb.set, pb.warnings, pb.waves.idler_um, pb.temp_c);
        pb.warnings = 0;
        json_object *so = json_object_new_object();
        json_object_object_add(so, "dispersion",
                               json_object_new_string(pb.set->name));
        json_object_object_add(so, "solutions", json_object_get(sj));
        json_object_array_add(sets_json, so);
        if (total == 0) {
            json_object_object_add(root, "dispersion",
                                   json_object_new_string(pb.set->name));
            json_object_object_add(root, "solutions", json_object_get(sj));
        }
        json_object_put(sj);
        total++;
        if (magic)
            pb.alpha_rad = 0;
    }
    if (!cm.json && cm.all && spread_n > 1)
        fprintf(out.f, "\nspread over %d data sets (modes %s, first "
                       "solution): %.3f deg\n",
                spread_n, spread_pol, spread_hi - spread_lo);
    if (cm.json && cm.all && spread_n > 1)
        json_object_object_add(root, "spread_deg",
                               cli_json_num(spread_hi - spread_lo));
    if (!cm.json && pb.crystal->has_nonlinear)
        fprintf(out.f, "\nangles internal, in degrees (theta from Z, phi from "
                       "X); d_eff in pm/V%s\n",
                pb.crystal->nl_from_memory
                    ? " from d typed from memory (see 'deltak crystals')"
                    : "");
    if (cm.json) {
        if (cm.all)
            json_object_object_add(root, "sets", json_object_get(sets_json));
        cli_warnings_to_json(root);
        cli_out_json(&out, root);
    } else {
        json_object_put(root);
    }
    json_object_put(sets_json);
    rc = cli_out_commit(&out);
done:
    dk_db_free(db);
    return rc;
}
