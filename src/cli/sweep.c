/*
 * sweep.c - `deltak sweep`: tuning curves (one variable swept, another
 * solved, optionally a family over a third), analyses against a variable
 * (GVM, d_eff, sinc², thermal acceptance) and 2-D phase-matching maps;
 * as CSV and/or a figure.
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "commands.h"
#include "design_args.h"
#include "deltak/plot.h"
#include "deltak/pulse.h"
#include "deltak/sweep.h"
#include "deltak/units.h"

static const char *const sweep_usage[] = {
    "deltak sweep --crystal <name> --vary <var>=<lo>:<hi>[:<n>] "
    "(--solve <target> | --map <var>=<lo>:<hi>[:<n>])",
    "             [--family <var>=<v1>,<v2>,...] [--pump/--signal/--idler/"
    "--fundamental <wl>]",
    "             [--temp <T>] [--period <P>] [--type I|II] [--pol <sip>] "
    "[--theta <deg>] [--length <L>]",
    "             [--dispersion <set>] [--csv] [--plot <file.pdf|.svg|.png>] "
    "[--size single|double|slide|WxH]",
    "",
    "  variables  period (um), temp (C), pump, signal, idler, fundamental "
    "(with unit), theta, phi (deg)",
    "  targets    idler, signal, wavelengths (both), period, temp, theta; "
    "analyses: gvm, deff, sinc2, accept-temp",
    "  --map      sinc^2(dk L/2) over --vary (x) and this variable (y); "
    "needs --length",
    "examples:",
    "  deltak sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um "
    "--solve idler --family temp=30,100,170 --plot tuning.pdf",
    "  deltak sweep --crystal MgO:LN --signal 1550nm --period 30.5um --vary "
    "pump=1.05um:1.08um --map temp=20:200 --length 20mm --plot map.png",
    NULL};

#define DEG (M_PI / 180)
#define MAX_ROOTS 16
#define MAX_FAMILY 8
#define MAX_N 2001

/* Parse "name=lo:hi[:n]" with values in the variable's unit. */
static int
parse_range_var(const char *arg, dk_var *v, double r[2], int *n,
                dk_error *err)
{
    char name[32], a[64], b[64];
    const char *eq = strchr(arg, '=');
    if (!eq || (size_t)(eq - arg) >= sizeof name)
        return dk_error_set(err, DK_EINVAL, "'%s' must look like "
                                            "period=28um:32um", arg);
    memcpy(name, arg, eq - arg);
    name[eq - arg] = '\0';
    if (dk_var_parse(name, v, err))
        return DK_EINVAL;
    const char *p = eq + 1, *c1 = strchr(p, ':');
    if (!c1 || (size_t)(c1 - p) >= sizeof a)
        return dk_error_set(err, DK_EINVAL, "'%s': expected lo:hi after '='",
                            arg);
    memcpy(a, p, c1 - p);
    a[c1 - p] = '\0';
    const char *c2 = strchr(c1 + 1, ':');
    size_t lb = c2 ? (size_t)(c2 - c1 - 1) : strlen(c1 + 1);
    if (lb >= sizeof b)
        return dk_error_set(err, DK_EINVAL, "'%s' is too long", arg);
    memcpy(b, c1 + 1, lb);
    b[lb] = '\0';
    *n = 201;
    if (c2) {
        char *end;
        *n = (int)strtol(c2 + 1, &end, 10);
        if (*end || *n < 2 || *n > MAX_N)
            return dk_error_set(err, DK_EINVAL, "'%s': the number of points "
                                                "must be 2 to %d",
                                arg, MAX_N);
    }
    const char *vals[2] = {a, b};
    for (int i = 0; i < 2; i++) {
        dk_status s;
        switch (*v) {
        case DK_VAR_PERIOD:
            s = dk_parse_length(vals[i], &r[i], err);
            r[i] *= 1e3;
            break;
        case DK_VAR_TEMP:
            s = dk_parse_temperature(vals[i], &r[i], err);
            break;
        case DK_VAR_THETA:
        case DK_VAR_PHI: {
            char *end;
            r[i] = strtod(vals[i], &end);
            s = *end || end == vals[i]
                    ? dk_error_set(err, DK_EINVAL, "'%s' must be degrees",
                                   vals[i])
                    : DK_OK;
            break;
        }
        default:
            s = dk_parse_wavelength(vals[i], &r[i], err);
        }
        if (s)
            return s;
    }
    if (!(r[0] != r[1]))
        return dk_error_set(err, DK_EINVAL, "'%s': lo and hi must differ",
                            arg);
    return DK_OK;
}

/* Parse "name=v1,v2,..." (family). */
static int
parse_family(const char *arg, dk_var *v, double *vals, int *n, dk_error *err)
{
    char name[32], buf[256];
    const char *eq = strchr(arg, '=');
    if (!eq || (size_t)(eq - arg) >= sizeof name ||
        strlen(eq + 1) >= sizeof buf)
        return dk_error_set(err, DK_EINVAL, "'%s' must look like "
                                            "temp=30,100,170", arg);
    memcpy(name, arg, eq - arg);
    name[eq - arg] = '\0';
    if (dk_var_parse(name, v, err))
        return DK_EINVAL;
    strcpy(buf, eq + 1);
    *n = 0;
    for (char *t = strtok(buf, ","); t; t = strtok(NULL, ",")) {
        if (*n >= MAX_FAMILY)
            return dk_error_set(err, DK_EINVAL, "at most %d family members",
                                MAX_FAMILY);
        char full[128];
        snprintf(full, sizeof full, "%s=%s:%s:2", name, t, t);
        double r[2];
        int dummy;
        /* Reuse the range parser for the units; equal ends are refused
         * there, so parse the single value by hand instead. */
        (void)full;
        (void)dummy;
        dk_status s;
        switch (*v) {
        case DK_VAR_PERIOD:
            s = dk_parse_length(t, &r[0], err);
            r[0] *= 1e3;
            break;
        case DK_VAR_TEMP:
            s = dk_parse_temperature(t, &r[0], err);
            break;
        case DK_VAR_THETA:
        case DK_VAR_PHI: {
            char *end;
            r[0] = strtod(t, &end);
            s = *end || end == t ? dk_error_set(err, DK_EINVAL, "'%s' must "
                                                                "be degrees",
                                                t)
                                 : DK_OK;
            break;
        }
        default:
            s = dk_parse_wavelength(t, &r[0], err);
        }
        if (s)
            return s;
        vals[(*n)++] = r[0];
    }
    return *n ? DK_OK : dk_error_set(err, DK_EINVAL, "empty family '%s'", arg);
}

static const char *
axis_markup(dk_var v)
{
    switch (v) {
    case DK_VAR_PERIOD: return "Poling period Λ (µm)";
    case DK_VAR_TEMP: return "Temperature (°C)";
    case DK_VAR_PUMP: return "Pump wavelength λ<sub>p</sub> (µm)";
    case DK_VAR_SIGNAL: return "Signal wavelength λ<sub>s</sub> (µm)";
    case DK_VAR_IDLER: return "Idler wavelength λ<sub>i</sub> (µm)";
    case DK_VAR_FUNDAMENTAL: return "Fundamental wavelength (µm)";
    case DK_VAR_THETA: return "Phase-matching angle θ (°)";
    case DK_VAR_PHI: return "Azimuth φ (°)";
    case DK_VAR_WAVELENGTHS: return "Signal and idler wavelength (µm)";
    }
    return "";
}

static int
is_wavelength(dk_var v)
{
    return v == DK_VAR_PUMP || v == DK_VAR_SIGNAL || v == DK_VAR_IDLER ||
           v == DK_VAR_FUNDAMENTAL || v == DK_VAR_WAVELENGTHS;
}

static void
family_label(dk_var v, double val, char *buf, size_t n)
{
    switch (v) {
    case DK_VAR_PERIOD: snprintf(buf, n, "Λ = %.4g µm", val); break;
    case DK_VAR_TEMP: snprintf(buf, n, "%.4g °C", val); break;
    case DK_VAR_THETA: snprintf(buf, n, "θ = %.4g°", val); break;
    case DK_VAR_PHI: snprintf(buf, n, "φ = %.4g°", val); break;
    default: snprintf(buf, n, "%s %.5g µm", dk_var_name(v), val);
    }
}

enum analysis { AN_NONE, AN_GVM, AN_DEFF, AN_SINC2, AN_ACCEPT_TEMP };

/* One computed point of a 1-D sweep: up to MAX_ROOTS values. */
typedef struct point {
    int n;
    double y[MAX_ROOTS];
} point;

/* Evaluate one x of a 1-D sweep. Returns 0, or -1 to skip the point. */
static int
eval_point(dk_sweep *s, enum analysis an, dk_var target, int keep_period,
           point *pt)
{
    dk_error err = {0};
    pt->n = 0;
    switch (an) {
    case AN_NONE:
        if (dk_sweep_solve(s, target, pt->y, MAX_ROOTS, &pt->n, &err))
            return -1;
        return 0;
    case AN_SINC2:
        pt->y[0] = dk_sweep_sinc2(s);
        pt->n = isfinite(pt->y[0]);
        return 0;
    case AN_DEFF:
        if (s->d.kind != DK_DESIGN_ANGLE)
            return -1;
        pt->y[0] = dk_design_deff(&s->d);
        pt->n = isfinite(pt->y[0]);
        return 0;
    case AN_GVM: {
        dk_pulse_props pp;
        if (dk_sweep_rephase(s, keep_period, NULL) ||
            dk_pulse_props_of(&s->d, &pp, NULL))
            return -1;
        for (int k = 0; k < 3; k++)
            pt->y[k] = pp.gvm_fs_per_mm[k];
        pt->n = 3;
        return 0;
    }
    case AN_ACCEPT_TEMP: {
        dk_acceptance a;
        if (dk_sweep_rephase(s, keep_period, NULL) ||
            dk_design_tolerance(&s->d, DK_TOL_TEMPERATURE, &a, NULL) ||
            !a.bounded)
            return -1;
        pt->y[0] = a.fwhm;
        pt->n = 1;
        return 0;
    }
    }
    return -1;
}

int
cmd_sweep(int argc, char **argv)
{
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        {"length", required_argument, NULL, 'L'},
        {"vary", required_argument, NULL, 'V'},
        {"solve", required_argument, NULL, 'S'},
        {"family", required_argument, NULL, 'F'},
        {"map", required_argument, NULL, 'M'},
        {"plot", required_argument, NULL, 'G'},
        {"size", required_argument, NULL, 'Z'},
        {NULL, 0, NULL, 0}};
    cli_common cm = {0};
    cli_design_args da = {0};
    const char *len = NULL, *vary = NULL, *solve = NULL, *family = NULL,
               *map = NULL, *plot = NULL, *size = "single";
    int ch, rc;
    optind = 1;
    opterr = 0;
    while ((ch = getopt_long(argc, argv, "+h", opts, NULL)) != -1) {
        if (cli_common_option(ch, &cm) || cli_design_option(ch, &da))
            continue;
        switch (ch) {
        case 'L': len = optarg; break;
        case 'V': vary = optarg; break;
        case 'S': solve = optarg; break;
        case 'F': family = optarg; break;
        case 'M': map = optarg; break;
        case 'G': plot = optarg; break;
        case 'Z': size = optarg; break;
        case 'h': cli_print_usage(stdout, sweep_usage); return 0;
        default: return cli_bad_option(argv, sweep_usage);
        }
    }
    if ((rc = cli_common_finish(&cm, argc, argv, 0, sweep_usage)))
        return rc;
    if (cm.json)
        return cli_usage_error(sweep_usage, "sweep writes --csv and/or "
                                            "--plot, not --json");
    if (!vary)
        return cli_usage_error(sweep_usage, "--vary is required");
    if (!!solve == !!map)
        return cli_usage_error(sweep_usage, "give one of --solve and --map");
    if (map && family)
        return cli_usage_error(sweep_usage, "--family does not combine with "
                                            "--map");
    dk_error err = {0};
    dk_var xv, yv = DK_VAR_TEMP, fv = DK_VAR_TEMP, target = DK_VAR_IDLER;
    double xr[2], yr[2], fam[MAX_FAMILY], wmm = 0, hmm = 0;
    int nx, ny = 0, nf = 0;
    enum analysis an = AN_NONE;
    if (parse_range_var(vary, &xv, xr, &nx, &err) ||
        (map && parse_range_var(map, &yv, yr, &ny, &err)) ||
        (family && parse_family(family, &fv, fam, &nf, &err)) ||
        dk_plot_size_parse(size, &wmm, &hmm, &err))
        return cli_usage_error(sweep_usage, "%s", err.msg);
    if (map && ny > 401)
        ny = 401;
    if (solve) {
        if (!strcmp(solve, "gvm"))
            an = AN_GVM;
        else if (!strcmp(solve, "deff"))
            an = AN_DEFF;
        else if (!strcmp(solve, "sinc2"))
            an = AN_SINC2;
        else if (!strcmp(solve, "accept-temp"))
            an = AN_ACCEPT_TEMP;
        else if (dk_var_parse(solve, &target, &err))
            return cli_usage_error(sweep_usage, "%s", err.msg);
    }
    dk_sweep sw = {0};
    cli_design_spec sp;
    if ((rc = cli_design_parse(&da, &sp, 0, sweep_usage)))
        return rc;
    sw.d.waves = sp.waves;
    sw.d.shg = sp.shg;
    sw.held = sp.held;
    sw.d.temp_c = sp.temp_c;
    sw.d.length_mm = 10;
    if (len && dk_parse_length(len, &sw.d.length_mm, &err))
        return cli_usage_error(sweep_usage, "%s", err.msg);
    if ((map || an == AN_SINC2) && !len)
        return cli_usage_error(sweep_usage, "sinc^2 needs --length");

    dk_db *db = NULL;
    if (cli_load_db(&db))
        return CLI_FAIL;
    rc = CLI_FAIL;
    dk_plot *fig = NULL;
    double *xs = NULL, *ys = NULL, *zs = NULL;
    point *pts = NULL;
    const dk_crystal *c = cli_find_crystal(db, cm.crystal);
    const dk_dispersion_set *set = c ? cli_find_set(c, cm.set_name) : NULL;
    if (!set)
        goto done;
    int angular = xv == DK_VAR_THETA || xv == DK_VAR_PHI ||
                  target == DK_VAR_THETA || an == AN_DEFF ||
                  (map && (yv == DK_VAR_THETA || yv == DK_VAR_PHI));
    int qpm = c->poling != DK_POLING_NONE && !sp.type &&
              !isfinite(sp.theta_rad) && !angular;
    if (!sp.have_temp && !dk_set_has_temperature(set))
        sw.d.temp_c = set->reference_temperature_c;
    const double *tr = set->temp_form == DK_TEMP_NONE
                           ? set->thermo.temperature_range_c
                           : set->temperature_range_c;
    sw.t_lo_c = tr[0] - 50;
    sw.t_hi_c = tr[1] + 50;
    int complete = sw.d.shg || (sw.d.waves.signal_um > 0 &&
                                sw.d.waves.idler_um > 0 &&
                                sw.d.waves.pump_um > 0);
    if (qpm) {
        sw.d.kind = DK_DESIGN_QPM;
        if (dk_qpm_init(&sw.d.qpm, c, set, sp.pol, sp.order, 0.5, 25,
                        &err)) {
            cli_error("%s", err.msg);
            goto done;
        }
        sw.d.period_um = sp.period_um;
        if (!(sp.period_um > 0) && complete &&
            dk_sweep_rephase(&sw, 0, &err)) {
            cli_error("%s", err.msg);
            goto done;
        }
    } else {
        if (complete) {
            if (dk_design_setup_angle(&sw.d, c, set, sp.pol, sp.type,
                                      sp.theta_rad, &err)) {
                cli_error("%s", err.msg);
                goto done;
            }
        } else {
            if (!sp.pol) {
                cli_error("give --pol (modes of signal, idler, pump) or both "
                          "of two waves, so the modes can be chosen");
                goto done;
            }
            sw.d.kind = DK_DESIGN_ANGLE;
            sw.d.angle = (dk_angle_problem){c, set, sw.d.waves, sw.d.shg,
                                            sw.d.temp_c, 0, 0};
            snprintf(sw.d.pol, sizeof sw.d.pol, "%s", sp.pol);
            sw.d.theta_rad = isfinite(sp.theta_rad) ? sp.theta_rad : 0;
        }
    }
    int keep_period = sp.period_um > 0 || xv == DK_VAR_PERIOD ||
                      (family && fv == DK_VAR_PERIOD);

    xs = calloc(nx, sizeof *xs);
    if (!xs)
        goto oom;
    for (int i = 0; i < nx; i++)
        xs[i] = xr[0] + (xr[1] - xr[0]) * i / (nx - 1);

    cli_out out;
    if (cli_out_open(&out))
        goto done;
    const char *xu = dk_var_unit(xv);
    if (map) {
        zs = calloc((size_t)nx * ny, sizeof *zs);
        ys = calloc(ny, sizeof *ys);
        if (!zs || !ys) {
            cli_out_discard(&out);
            goto oom;
        }
        for (int j = 0; j < ny; j++)
            ys[j] = yr[0] + (yr[1] - yr[0]) * j / (ny - 1);
        if (cm.csv || !plot)
            fprintf(out.f, "%s_%s,%s_%s,sinc2\n", dk_var_name(xv), xu,
                    dk_var_name(yv), dk_var_unit(yv));
        for (int j = 0; j < ny; j++)
            for (int i = 0; i < nx; i++) {
                dk_sweep p = sw;
                double z = NAN;
                if (!dk_sweep_set(&p, xv, xs[i], NULL) &&
                    !dk_sweep_set(&p, yv, ys[j], NULL))
                    z = dk_sweep_sinc2(&p);
                zs[(size_t)j * nx + i] = z;
                if (cm.csv || !plot)
                {
                    /* An empty cell where the model is undefined. */
                    if (isfinite(z))
                        fprintf(out.f, "%.8g,%.8g,%.6g\n", xs[i], ys[j], z);
                    else
                        fprintf(out.f, "%.8g,%.8g,\n", xs[i], ys[j]);
                }
            }
    } else {
        int nfam = family ? nf : 1;
        pts = calloc((size_t)nfam * nx, sizeof *pts);
        if (!pts) {
            cli_out_discard(&out);
            goto oom;
        }
        const char *yname = an == AN_GVM ? "gvm" : an == AN_DEFF ? "deff"
                            : an == AN_SINC2 ? "sinc2"
                            : an == AN_ACCEPT_TEMP ? "temperature_fwhm"
                                                   : dk_var_name(target);
        const char *yunit = an == AN_GVM ? "fs_per_mm"
                            : an == AN_DEFF ? "pm_per_V"
                            : an == AN_SINC2 ? "1"
                            : an == AN_ACCEPT_TEMP ? "C"
                                                   : dk_var_unit(target);
        if (cm.csv || !plot) {
            fprintf(out.f, "%s_%s,", dk_var_name(xv), xu);
            if (family)
                fprintf(out.f, "%s_%s,", dk_var_name(fv), dk_var_unit(fv));
            if (an == AN_GVM)
                fprintf(out.f, "gvm_signal_pump_fs_per_mm,"
                               "gvm_idler_pump_fs_per_mm,"
                               "gvm_signal_idler_fs_per_mm\n");
            else
                fprintf(out.f, "%s_%s\n", yname, yunit);
        }
        for (int f = 0; f < nfam; f++)
            for (int i = 0; i < nx; i++) {
                dk_sweep p = sw;
                point *pt = &pts[(size_t)f * nx + i];
                pt->n = 0;
                if ((family && dk_sweep_set(&p, fv, fam[f], NULL)) ||
                    dk_sweep_set(&p, xv, xs[i], NULL) ||
                    eval_point(&p, an, target, keep_period, pt))
                    pt->n = 0;
                if (!(cm.csv || !plot))
                    continue;
                if (an == AN_GVM && pt->n == 3) {
                    fprintf(out.f, "%.8g,", xs[i]);
                    if (family)
                        fprintf(out.f, "%.8g,", fam[f]);
                    fprintf(out.f, "%.6g,%.6g,%.6g\n", pt->y[0], pt->y[1],
                            pt->y[2]);
                    continue;
                }
                for (int k = 0; k < pt->n; k++) {
                    fprintf(out.f, "%.8g,", xs[i]);
                    if (family)
                        fprintf(out.f, "%.8g,", fam[f]);
                    fprintf(out.f, "%.10g\n", pt->y[k]);
                }
            }
    }
    if (plot) {
        if (dk_plot_new(wmm, hmm, &fig, &err) ||
            dk_plot_set_xlabel(fig, axis_markup(xv), &err)) {
            cli_error("%s", err.msg);
            cli_out_discard(&out);
            goto done;
        }
        if (is_wavelength(xv))
            dk_plot_set_top_axis(fig, dk_plot_um_to_per_cm,
                                 dk_plot_per_cm_to_um, NULL,
                                 "Wavenumber (cm<sup>−1</sup>)", NULL);
        dk_status ps = DK_OK;
        if (map) {
            ps = dk_plot_set_ylabel(fig, axis_markup(yv), &err);
            if (!ps)
                ps = dk_plot_set_map(fig, zs, nx, ny, xr[0], xr[1], yr[0],
                                     yr[1], "sinc<sup>2</sup>(Δk L/2)", &err);
            if (!ps)
                ps = dk_plot_add_contour(fig, 0.5, "half maximum", &err);
            if (!ps)
                ps = dk_plot_set_zrange(fig, 0, 1, &err);
            /* The Δk = 0 ridge, where the y variable can be solved for. */
            if (!ps && yv != DK_VAR_PHI) {
                double *rx = calloc((size_t)nx * (MAX_ROOTS + 1), sizeof *rx);
                double *ry = calloc((size_t)nx * (MAX_ROOTS + 1), sizeof *ry);
                size_t m = 0;
                for (int i = 0; rx && ry && i < nx; i++) {
                    dk_sweep p = sw;
                    double v[MAX_ROOTS];
                    int nv = 0;
                    if (dk_sweep_set(&p, xv, xs[i], NULL) ||
                        dk_sweep_solve(&p, yv, v, MAX_ROOTS, &nv, NULL))
                        nv = 0;
                    for (int k = 0; k < nv; k++)
                        if ((v[k] - yr[0]) * (v[k] - yr[1]) <= 0)
                            rx[m] = xs[i], ry[m++] = v[k];
                }
                if (m > 0)
                    ps = dk_plot_add_line(fig, rx, ry, m, "Δk = 0", &err);
                free(rx);
                free(ry);
            }
        } else {
            const char *ylab =
                an == AN_GVM ? "Group-velocity mismatch (fs/mm)"
                : an == AN_DEFF ? "d<sub>eff</sub> (pm/V)"
                : an == AN_SINC2 ? "sinc<sup>2</sup>(Δk L/2)"
                : an == AN_ACCEPT_TEMP ? "Temperature acceptance FWHM (°C)"
                                       : axis_markup(target);
            ps = dk_plot_set_ylabel(fig, ylab, &err);
            int nfam = family ? nf : 1;
            int nser = an == AN_GVM ? 3 : 1;
            size_t cap = (size_t)nx * (MAX_ROOTS + 1) + 1;
            double *lx = malloc(cap * sizeof *lx), *ly = malloc(cap * sizeof *ly);
            if (!lx || !ly)
                ps = dk_error_set(&err, DK_ENOMEM, "out of memory");
            for (int f = 0; !ps && f < nfam; f++)
                for (int sidx = 0; !ps && sidx < nser; sidx++) {
                    /* Branch k of the roots, joined; NaN between branches. */
                    size_t m = 0;
                    int maxk = 0;
                    for (int i = 0; i < nx; i++)
                        maxk = pts[(size_t)f * nx + i].n > maxk
                                   ? pts[(size_t)f * nx + i].n
                                   : maxk;
                    if (an == AN_GVM)
                        maxk = 1;
                    for (int k = 0; k < maxk; k++) {
                        for (int i = 0; i < nx; i++) {
                            const point *pt = &pts[(size_t)f * nx + i];
                            int idx = an == AN_GVM ? sidx : k;
                            lx[m] = xs[i];
                            ly[m++] = idx < pt->n ? pt->y[idx] : NAN;
                        }
                        lx[m] = NAN, ly[m++] = NAN;
                    }
                    char lab[64] = "";
                    if (an == AN_GVM) {
                        static const char *const g[3] = {
                            "signal − pump", "idler − pump", "signal − idler"};
                        snprintf(lab, sizeof lab, "%s", g[sidx]);
                    } else if (family) {
                        family_label(fv, fam[f], lab, sizeof lab);
                    }
                    int any = 0;
                    for (size_t q = 0; q < m; q++)
                        any |= isfinite(ly[q]);
                    if (any)
                        ps = dk_plot_add_line(fig, lx, ly, m,
                                              lab[0] ? lab : NULL, &err);
                }
            free(lx);
            free(ly);
            if (!ps && an == AN_SINC2)
                ps = dk_plot_set_yrange(fig, 0, 1.05, &err);
        }
        if (!ps)
            ps = dk_plot_write(fig, plot, &err);
        if (ps) {
            cli_error("%s", err.msg);
            cli_out_discard(&out);
            goto done;
        }
        if (!cm.csv)
            fprintf(out.f, "wrote %s\n", plot);
    }
    rc = cli_out_commit(&out);
    goto done;
oom:
    cli_error("out of memory");
done:
    dk_plot_free(fig);
    free(xs);
    free(ys);
    free(zs);
    free(pts);
    dk_db_free(db);
    return rc;
}
