/*
 * angle.c - `deltak angle`: birefringent phase-matching directions with
 * walk-off and d_eff, every solution listed and the design's choice
 * marked; noncritical temperatures; noncollinear and broadband geometry;
 * the θ(φ) curve of a biaxial crystal. Parse, call the design layer,
 * print.
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "options.h"
#include "commands.h"
#include "design_args.h"
#include "deltak/constants.h"

static const char *const angle_usage[] = {
    "deltak angle --crystal <name> (--fundamental <wl> | two of --pump/"
    "--signal/--idler)",
    "             [--temp <T>] [--type I|II] [--pol <sip>] [--phi <deg>] "
    "[--plane XY|YZ|XZ]",
    "             [--noncollinear <deg> | --broadband] [--ncpm] [--cut <deg>] "
    "[--curve]",
    "             [--dispersion <set> | --all-sets] [--json | --csv]",
    "",
    "  --type I|II          only this type (default: every combination)",
    "  --pol <sip>          only these modes of signal, idler, pump: o/e "
    "(uniaxial) or s/f (biaxial slow/fast)",
    "  --phi <deg>          uniaxial: azimuth for d_eff (default: the one "
    "maximising d_eff); biaxial: solve theta at this phi",
    "  --plane XY|YZ|XZ     biaxial: only this principal plane",
    "  --theta <deg>, --solution <n>  which listed solution is the design "
    "(default: largest d_eff)",
    "  --noncollinear <deg> internal pump-signal angle alpha (> 0: signal "
    "farther from Z than the pump)",
    "  --broadband          the alpha where signal and idler group "
    "velocities match (noncollinear OPA); also --magic",
    "  --ncpm               temperatures of noncritical phase matching along "
    "X, Y and Z (uniaxial: XY, theta 90)",
    "  --temp-range <lo:hi> where --ncpm looks (default: the set's range)",
    "  --cut <deg>          crystal cut angle theta: also give external "
    "incidence angles",
    "  --curve              CSV of the phase-matching directions theta(phi), "
    "phi 0-90 deg",
    CLI_DESIGN_USAGE,
    NULL};

#define ALLOWED (CLI_D_COMMON | CLI_D_ANGLE)
#define DEG DK_RAD_PER_DEG
#define MAX_SETS 32


static json_object *
solution_json(const dk_design *d, const dk_solution *s, double ext)
{
    json_object *o = json_object_new_object();
    json_object_object_add(o, "type", json_object_new_string(s->type));
    json_object_object_add(o, "pol", json_object_new_string(s->pol));
    if (s->plane[0])
        json_object_object_add(o, d->solved == DK_SOLVED_NCPM ? "axis"
                                                              : "plane",
                               json_object_new_string(s->plane));
    json_object_object_add(o, "theta_deg", cli_json_num(s->theta_rad / DEG));
    json_object_object_add(o, "phi_deg", cli_json_num(s->phi_rad / DEG));
    if (d->solved == DK_SOLVED_NCPM)
        json_object_object_add(o, "temperature_C", cli_json_num(s->temp_c));
    if (s->alpha_rad != 0)
        json_object_object_add(o, "alpha_deg",
                               cli_json_num(s->alpha_rad / DEG));
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
    cli_flags_json(o, s->range, d->shg);
    return o;
}

static double
external(const dk_design *d, const dk_solution *s, double cut)
{
    if (!isfinite(cut))
        return NAN;
    return dk_external_angle(s->theta_rad, cut, s->n[d->shg ? 0 : 2]);
}

static void
print_header(FILE *f, const dk_design *d, int first)
{
    char head[512], t[32] = "";
    if (d->solved != DK_SOLVED_NCPM)
        snprintf(t, sizeof t, " at %.4g C", d->temp_c);
    if (d->shg)
        snprintf(head, sizeof head, "%s, data set %s%s: SHG of %.6g um%s",
                 d->crystal->id, d->set->name,
                 d->set->from_memory ? " [from memory]" : "",
                 d->waves.signal_um, t);
    else
        snprintf(head, sizeof head,
                 "%s, data set %s%s: pump %.6g, signal %.6g, idler %.6g um%s",
                 d->crystal->id, d->set->name,
                 d->set->from_memory ? " [from memory]" : "",
                 d->waves.pump_um, d->waves.signal_um, d->waves.idler_um, t);
    if (!first)
        fputc('\n', f);
    cli_wrap(f, "", "    ", head);
}

static void
print_table(FILE *f, const dk_design *d, double cut)
{
    int nc = d->solved == DK_SOLVED_NCPM;
    int noncol = 0;
    for (int k = 0; k < d->nsol; k++)
        noncol |= d->sol[k].alpha_rad != 0;
    if (nc)
        fprintf(f, "  noncritical phase matching along a principal axis:\n"
                   "    %-6s %-5s %10s %9s %8s\n",
                "modes", "axis", "T C", "d_eff", "phi");
    else
        /* 78 columns (86 with both alpha and ext) */
        fprintf(f, "    %-4s %-8s %-5s %7s %7s %s%7s  %-19s%s\n", "type",
                "modes", "plane", "theta", "phi", noncol ? "   alpha" : "",
                "d_eff", "walk-off mrad s i p",
                isfinite(cut) ? "  ext deg" : "");
    for (int k = 0; k < d->nsol; k++) {
        const dk_solution *s = &d->sol[k];
        const char *mark = k == d->chosen ? "*" : " ";
        char deff[16];
        int dw = nc ? 9 : 7;
        if (isfinite(s->deff_pm_per_v))
            snprintf(deff, sizeof deff, "%*.3f", dw, s->deff_pm_per_v);
        else
            snprintf(deff, sizeof deff, "%*s", dw, "n/a");
        if (nc) {
            fprintf(f, "  %s %-6s %-5s %10.2f %s %8.2f", mark, s->pol,
                    s->plane, s->temp_c, deff, s->phi_rad / DEG);
        } else {
            char pol[12];
            if (d->shg)
                snprintf(pol, sizeof pol, "%c%c -> %c", s->pol[0], s->pol[1],
                         s->pol[2]);
            else
                snprintf(pol, sizeof pol, "%c %c %c", s->pol[0], s->pol[1],
                         s->pol[2]);
            char alpha[16] = "";
            if (noncol)
                snprintf(alpha, sizeof alpha, " %+7.3f", s->alpha_rad / DEG);
            fprintf(f, "  %s %-4s %-8s %-5s %7.3f %7.3f%s %s  %6.2f %6.2f "
                       "%6.2f",
                    mark, s->type, pol, s->plane[0] ? s->plane : "-",
                    s->theta_rad / DEG, s->phi_rad / DEG, alpha, deff,
                    s->walkoff_rad[0] * 1e3, s->walkoff_rad[1] * 1e3,
                    s->walkoff_rad[2] * 1e3);
            double ext = external(d, s, cut);
            if (isfinite(ext))
                fprintf(f, "  %7.2f", ext / DEG);
        }
        if (s->range) {
            char buf[160];
            fprintf(f, "  [extrapolated: %s]",
                    dk_range_words(s->range, d->shg, buf, sizeof buf));
        }
        fputc('\n', f);
    }
    if (d->nsol > 1 && d->chosen >= 0)
        fprintf(f, "  * the design other commands use (solution %d)\n",
                d->chosen + 1);
    for (int k = 0; nc && k < d->nsol; k++)
        if (!strcmp(d->sol[k].plane, "XY")) {
            fprintf(f, "  XY: any direction at theta 90 deg (X and Y alike "
                       "in a uniaxial crystal); phi %s\n",
                    isfinite(d->rq.phi_rad) ? "as given by --phi"
                                            : "of the largest |d_eff| "
                                              "(--phi picks another)");
            break;
        }
    if (noncol)
        cli_wrap(f, "  ", "  ",
                 "alpha: internal signal-pump angle; > 0: the signal lies "
                 "farther from Z than the pump, < 0: nearer to Z");
}

static void
print_csv(FILE *f, const dk_design *d, int header)
{
    char flags[256];
    if (header)
        fprintf(f, "dispersion,type,pol,plane,theta_deg,phi_deg,alpha_deg,"
                   "temperature_C,deff_pm_per_V,walkoff_signal_mrad,"
                   "walkoff_idler_mrad,walkoff_pump_mrad,chosen,flags\n");
    for (int k = 0; k < d->nsol; k++) {
        const dk_solution *s = &d->sol[k];
        char q[160];
        fprintf(f, "%s,%s,%s,%s,%.8g,%.8g,%.8g,%.8g,%.6g,%.6g,%.6g,%.6g,%d,%s\n",
                cli_csv(d->set->name, q, sizeof q), s->type, s->pol, s->plane,
                s->theta_rad / DEG, s->phi_rad / DEG, s->alpha_rad / DEG,
                s->temp_c, s->deff_pm_per_v, s->walkoff_rad[0] * 1e3,
                s->walkoff_rad[1] * 1e3, s->walkoff_rad[2] * 1e3,
                k == d->chosen,
                cli_csv_flags(s->range, d->shg, flags, sizeof flags));
    }
}

/* The θ(φ) curve of every mode combination, as CSV. */
static int
print_curve(FILE *f, dk_design *d)
{
    const char *l = d->crystal->optical_class == DK_BIAXIAL ? "sf" : "oe";
    enum { NPHI = 91, PER = 4 };
    double th[NPHI * PER];
    int cnt[NPHI];
    dk_error err = {0};
    fprintf(f, "pol,phi_deg,theta_deg\n");
    for (int c3 = 0; c3 < 8; c3++) {
        char p3[4] = {l[(c3 >> 2) & 1], l[(c3 >> 1) & 1], l[c3 & 1], 0};
        if ((p3[0] == p3[1] && p3[1] == p3[2]) ||
            (d->shg && p3[0] == l[1] && p3[1] == l[0]) ||
            (d->pol[0] && strcmp(d->pol, p3)))
            continue;
        dk_angle_problem pb = d->angle;
        pb.waves = d->waves;
        pb.temp_c = d->temp_c;
        if (dk_angle_curve(&pb, p3, NPHI, PER, th, cnt, &err))
            return cli_error("%s", err.msg);
        for (int k = 0; k < NPHI; k++)
            for (int j = 0; j < cnt[k]; j++)
                fprintf(f, "%s,%.4f,%.6f\n", p3, 90.0 * k / (NPHI - 1),
                        th[k * PER + j] / DEG);
    }
    return 0;
}

/* Solve one set's design as the mode asks. Returns 0 or an exit code. */
static int
solve(const dk_design_request *rq, dk_design *d, int ncpm, int curve)
{
    int rc = cli_design_make(rq, d, !ncpm && !curve);
    if (rc || !ncpm)
        return rc;
    dk_error err = {0};
    if (dk_design_ncpm(d, &err))
        return cli_error("%s", err.msg);
    /* the temperature is the answer here, not an assumption */
    cli_drop_note("default-temperature");
    cli_take_notes(&d->notes);
    if (d->nsol == 0)
        return cli_error("no noncritical phase matching along X, Y or Z "
                         "between the temperatures searched (see "
                         "--temp-range)");
    return 0;
}

typedef struct angle_opts {
    int ncpm, curve;
    const char *cut;
} angle_opts;

static int
angle_option(int ch, const char *arg, void *ctx)
{
    angle_opts *o = ctx;
    switch (ch) {
    case 'C': o->ncpm = 1; return 0;
    case 'K': o->curve = 1; return 0;
    case 'X': o->cut = arg; return 0;
    }
    return -1;
}

int
cmd_angle(int argc, char **argv)
{
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        {"ncpm", no_argument, NULL, 'C'},
        {"curve", no_argument, NULL, 'K'},
        {"cut", required_argument, NULL, 'X'},
        {NULL, 0, NULL, 0}};
    cli_common cm = {0};
    cli_design_args da = {0};
    angle_opts ao = {0, 0, NULL};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, angle_usage, &cm, &da, NULL,
                                angle_option, &ao, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    int ncpm = ao.ncpm, curve = ao.curve;
    const char *cut_s = ao.cut;
    if ((rc = cli_common_finish(&cm, argc, argv, 1, angle_usage)))
        return rc;
    double cut = NAN;
    if (cut_s && cli_angle("--cut", cut_s, -180, 180, &cut, angle_usage))
        return CLI_USAGE;
    if (ncpm + curve + cli_design_given(&da, OPT_BROADBAND) > 1)
        return cli_usage_error(angle_usage, "choose one of --ncpm, --curve "
                                            "and --broadband");

    dk_db *db = NULL;
    if (cli_load_db(&db, cm.crystal))
        return CLI_FAIL;
    rc = CLI_FAIL;
    dk_design *d = malloc(sizeof *d);
    dk_set_outcome *sets = cm.all ? malloc(MAX_SETS * sizeof *sets) : NULL;
    json_object *root = NULL, *sets_json = NULL;
    const dk_crystal *c = cli_find_crystal(db, cm.crystal);
    dk_design_request rq;
    if (!c || !d || (cm.all && !sets))
        goto done;
    if ((rc = cli_design_request(&da, ALLOWED, 1, c, cm.crystal, cm.set_name,
                                 &rq, angle_usage)))
        goto done;
    rq.scheme = DK_SCHEME_ANGLE;
    cli_out out;
    if ((rc = cli_out_open(&out)) != 0) {
        rc = CLI_FAIL;
        goto done;
    }
    dk_spread spread = {0};
    int nsets = 0;
    if (cm.all && !ncpm && !curve) {
        dk_error err = {0};
        if (dk_design_across_sets(&rq, sets, MAX_SETS, &nsets, &spread,
                                  &err)) {
            rc = cli_error("%s", err.msg);
            cli_out_discard(&out);
            goto done;
        }
    }
    root = json_object_new_object();
    sets_json = json_object_new_array();
    int shown = 0;
    for (int si = 0; si < c->nsets; si++) {
        dk_design_request r = rq;
        if (cm.all)
            r.set_name = c->sets[si].name;
        else if (si > 0)
            break;
        if ((rc = solve(&r, d, ncpm, curve))) {
            if (!cm.all) {
                cli_out_discard(&out);
                goto done;
            }
            rc = CLI_FAIL;
            continue;
        }
        if (curve) {
            cli_set_output_mode(CLI_CSV);
            if ((rc = print_curve(out.f, d))) {
                cli_out_discard(&out);
                goto done;
            }
            shown = 1;
            break;
        }
        json_object *sj = json_object_new_array();
        for (int k = 0; k < d->nsol; k++)
            json_object_array_add(sj, solution_json(d, &d->sol[k],
                                                    external(d, &d->sol[k],
                                                             cut)));
        if (cm.csv) {
            print_csv(out.f, d, shown == 0);
        } else if (!cm.json) {
            print_header(out.f, d, shown == 0);
            print_table(out.f, d, cut);
        }
        json_object *so = json_object_new_object();
        json_object_object_add(so, "dispersion",
                               json_object_new_string(d->set->name));
        json_object_object_add(so, "solutions", json_object_get(sj));
        json_object_object_add(so, "chosen", json_object_new_int(d->chosen));
        json_object_array_add(sets_json, so);
        if (shown == 0) {
            json_object_object_add(root, "crystal",
                                   json_object_new_string(c->id));
            json_object_object_add(root, "dispersion",
                                   json_object_new_string(d->set->name));
            json_object *wl = json_object_new_object();
            json_object_object_add(wl, "pump", cli_json_num(d->waves.pump_um));
            json_object_object_add(wl, "signal",
                                   cli_json_num(d->waves.signal_um));
            json_object_object_add(wl, "idler",
                                   cli_json_num(d->waves.idler_um));
            json_object_object_add(root, "wavelengths_um", wl);
            if (!ncpm)
                json_object_object_add(root, "temperature_C",
                                       cli_json_num(d->temp_c));
            json_object_object_add(root, "solutions", json_object_get(sj));
            json_object_object_add(root, "chosen",
                                   json_object_new_int(d->chosen));
        }
        json_object_put(sj);
        shown++;
    }
    if (!shown) {
        cli_out_discard(&out);
        rc = CLI_FAIL;
        goto done;
    }
    rc = 0;
    if (curve) {
        rc = cli_out_commit(&out);
        goto done;
    }
    for (int i = 0; i < nsets; i++)
        cli_take_notes(&sets[i].notes);
    if (!cm.json && !cm.csv && cm.all && spread.n > 1)
        fprintf(out.f, "\nspread over %d data sets (%s, the solution each "
                       "set chooses): %.3f deg\n",
                spread.n, spread.quantity, spread.spread);
    if (!cm.json && !cm.csv && c->has_nonlinear)
        fprintf(out.f, "\nangles internal, in degrees (theta from Z, phi "
                       "from X); d_eff in pm/V%s\n",
                c->nl_from_memory
                    ? " from d typed from memory (see 'deltak crystals')"
                    : "");
    if (cm.json) {
        if (cm.all) {
            json_object_object_add(root, "sets", json_object_get(sets_json));
            if (spread.n > 1)
                json_object_object_add(root, "spread_deg",
                                       cli_json_num(spread.spread));
        }
        cli_notes_to_json(root);
        cli_out_json(&out, json_object_get(root));
    }
    rc = cli_out_commit(&out);
done:
    json_object_put(root);
    json_object_put(sets_json);
    free(d);
    free(sets);
    dk_db_free(db);
    return rc;
}
