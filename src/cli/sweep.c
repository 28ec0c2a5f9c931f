/*
 * sweep.c - `deltak sweep`: tuning curves (one variable swept, another
 * solved, optionally a family over a third), analyses of the
 * phase-matched design against a variable (GVM, d_eff, sinc², acceptance)
 * and 2-D phase-matching maps; as CSV, JSON and/or a figure. Parse, call
 * the sweep engine (deltak/sweep.h), print or draw.
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
#include "deltak/plot.h"
#include "deltak/sweep.h"
#include "deltak/units.h"

static const char *const sweep_usage[] = {
    "deltak sweep --crystal <name> --vary <var>=<lo>:<hi>[:<n>] "
    "(--solve <target> | --map <var>=<lo>:<hi>[:<n>])",
    "             [--family <var>=<v1>,<v2>,...] [--pump/--signal/--idler/"
    "--fundamental <wl>]",
    "             [--temp <T>] [--period <P>] [--type I|II] [--pol <sip>] "
    "[--theta <deg>] [--length <L>]",
    "             [--noncollinear <deg>] [--plane XY|YZ|XZ] [--scheme "
    "qpm|birefringent]",
    "             [--dispersion <set>] [--csv | --json] [--plot "
    "<file.pdf|.svg|.png>] [figure options]",
    "",
    "  variables  period (um), temp (C), pump, signal, idler, fundamental "
    "(with unit), theta, phi, alpha (deg), length (mm)",
    "  targets    idler, signal, wavelengths (both), period, temp, theta, "
    "phi",
    "  analyses   gvm, deff, sinc2, accept-temp, accept-signal, "
    "accept-theta (of the phase-matched design at each point)",
    "  --map      sinc^2(dk L/2) over --vary (x) and this variable (y); "
    "needs --length",
    "  n          points along the range (default 201; curves up to 100000, "
    "maps up to 2048x2048 cells)",
    CLI_PLOT_USAGE,
    "examples:",
    "  deltak sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um "
    "--solve idler --family temp=30,100,170 --plot tuning.pdf",
    "  deltak sweep --crystal MgO:LN --signal 1550nm --period 30.5um --vary "
    "pump=1.05um:1.08um --map temp=20:200 --length 20mm --plot map.png",
    "  deltak sweep --crystal BBO --pump 400nm --vary theta=29:33 --solve "
    "signal --family alpha=0,2,3.8 --plot nopa.pdf",
    CLI_DESIGN_USAGE,
    NULL};

#define DEFAULT_POINTS 201

/* One value of variable @v from text, in its sweep unit. */
static dk_status
parse_value(dk_var v, const char *text, double *out, dk_error *err)
{
    dk_status s;
    switch (v) {
    case DK_VAR_PERIOD:
    case DK_VAR_LENGTH:
        s = dk_parse_length(text, out, err);
        if (!s && v == DK_VAR_PERIOD)
            *out *= 1e3;
        return s;
    case DK_VAR_TEMP:
        return dk_parse_temperature(text, out, err);
    case DK_VAR_THETA:
    case DK_VAR_PHI:
    case DK_VAR_ALPHA: {
        char *end;
        *out = strtod(text, &end);
        if (!*text || *end || !isfinite(*out) || strpbrk(text, "xXnN"))
            return dk_error_set(err, DK_EINVAL,
                                "'%s' must be an angle in degrees", text);
        return DK_OK;
    }
    default:
        return dk_parse_wavelength(text, out, err);
    }
}

/* Parse "name=lo:hi[:n]". */
static int
parse_range_var(const char *opt, const char *arg, dk_var *v, double r[2],
                int *n, int max_n)
{
    dk_error err = {0};
    char buf[160];
    if (strlen(arg) >= sizeof buf)
        return cli_usage_error(sweep_usage, "%s '%.40s...' is too long", opt,
                               arg);
    strcpy(buf, arg);
    char *eq = strchr(buf, '='), *c1 = eq ? strchr(eq + 1, ':') : NULL;
    if (!eq || !c1)
        return cli_usage_error(sweep_usage, "%s '%s' must look like "
                                            "period=28um:32um or "
                                            "temp=20:200:181",
                               opt, arg);
    *eq = *c1 = '\0';
    char *c2 = strchr(c1 + 1, ':');
    if (c2)
        *c2 = '\0';
    if (dk_var_parse(buf, v, &err))
        return cli_usage_error(sweep_usage, "%s", err.msg);
    if (*v == DK_VAR_WAVELENGTHS)
        return cli_usage_error(sweep_usage, "%s: 'wavelengths' is a target, "
                                            "not a variable",
                               opt);
    *n = DEFAULT_POINTS;
    if (c2 && cli_int(opt, c2 + 1, 2, max_n, n, sweep_usage))
        return CLI_USAGE;
    if (parse_value(*v, eq + 1, &r[0], &err) ||
        parse_value(*v, c1 + 1, &r[1], &err))
        return cli_usage_error(sweep_usage, "%s: %s", opt, err.msg);
    if (!(r[0] != r[1]))
        return cli_usage_error(sweep_usage, "%s '%s': the two ends must "
                                            "differ",
                               opt, arg);
    return 0;
}

/* Parse "name=v1,v2,...". */
static int
parse_family(const char *arg, dk_sweep_spec *sp)
{
    dk_error err = {0};
    char buf[256];
    if (strlen(arg) >= sizeof buf)
        return cli_usage_error(sweep_usage, "--family is too long");
    strcpy(buf, arg);
    char *eq = strchr(buf, '=');
    if (!eq)
        return cli_usage_error(sweep_usage, "--family '%s' must look like "
                                            "temp=30,100,170",
                               arg);
    *eq = '\0';
    if (dk_var_parse(buf, &sp->family, &err))
        return cli_usage_error(sweep_usage, "%s", err.msg);
    sp->nfamily = 0;
    char *save = NULL;
    for (char *t = strtok_r(eq + 1, ",", &save); t;
         t = strtok_r(NULL, ",", &save)) {
        if (sp->nfamily >= DK_SWEEP_MAX_FAMILY)
            return cli_usage_error(sweep_usage, "--family has at most %d "
                                                "members",
                                   DK_SWEEP_MAX_FAMILY);
        if (parse_value(sp->family, t, &sp->family_values[sp->nfamily++],
                        &err))
            return cli_usage_error(sweep_usage, "--family: %s", err.msg);
    }
    if (!sp->nfamily)
        return cli_usage_error(sweep_usage, "--family '%s' has no values",
                               arg);
    return 0;
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
    case DK_VAR_ALPHA: return "Noncollinear angle α (°)";
    case DK_VAR_LENGTH: return "Crystal length (mm)";
    case DK_VAR_WAVELENGTHS: return "Signal and idler wavelength (µm)";
    }
    return "";
}

static const char *
quantity_markup(dk_sweep_quantity q, dk_var target)
{
    switch (q) {
    case DK_SWEEP_GVM: return "Group-velocity mismatch (fs/mm)";
    case DK_SWEEP_DEFF: return "d<sub>eff</sub> (pm/V)";
    case DK_SWEEP_SINC2: return "sinc<sup>2</sup>(Δk L/2)";
    case DK_SWEEP_ACCEPT_TEMP: return "Temperature acceptance FWHM (°C)";
    case DK_SWEEP_ACCEPT_SIGNAL: return "Spectral acceptance FWHM (nm)";
    case DK_SWEEP_ACCEPT_THETA: return "Angular acceptance FWHM (mrad)";
    case DK_SWEEP_SOLVE: break;
    }
    return axis_markup(target);
}

static const char *
branch_name(const dk_series *s, char *buf, size_t n)
{
    if (s->wave >= 0)
        snprintf(buf, n, "%s%s", s->wave ? "idler" : "signal",
                 s->branch ? (s->branch == 1 ? "-2" : "-n") : "");
    else
        snprintf(buf, n, "%d", s->branch + 1);
    return buf;
}

/* CSV of curves: one row per point with a value, grouped by series. */
static void
curves_csv(FILE *f, const dk_design *d, const dk_sweep_spec *sp,
           const dk_sweep_result *res)
{
    char flags[256], br[16];
    int gvm = sp->quantity == DK_SWEEP_GVM;
    fprintf(f, "%s_%s,", dk_var_name(sp->x), dk_var_unit(sp->x));
    if (sp->nfamily)
        fprintf(f, "%s_%s,", dk_var_name(sp->family),
                dk_var_unit(sp->family));
    if (gvm) {
        fprintf(f, "gvm_signal_pump_fs_per_mm,gvm_idler_pump_fs_per_mm,"
                   "gvm_signal_idler_fs_per_mm,flags\n");
        /* Three series per family member: one row per point. */
        for (int s = 0; s + 2 < res->nseries; s += 3)
            for (size_t i = 0; i < res->series[s].n; i++) {
                const dk_series *a = &res->series[s];
                if (!isfinite(a->y[i]))
                    continue;
                fprintf(f, "%.8g,", a->x[i]);
                if (sp->nfamily)
                    fprintf(f, "%.8g,", sp->family_values[a->family]);
                fprintf(f, "%.6g,%.6g,%.6g,%s\n", a->y[i],
                        res->series[s + 1].y[i], res->series[s + 2].y[i],
                        cli_csv_flags(a->flags[i], d->shg, flags,
                                      sizeof flags));
            }
        return;
    }
    fprintf(f, "%s_%s,branch,flags\n",
            dk_sweep_quantity_name(sp->quantity, sp->target),
            dk_sweep_quantity_unit(sp->quantity, sp->target));
    for (int s = 0; s < res->nseries; s++) {
        const dk_series *a = &res->series[s];
        for (size_t i = 0; i < a->n; i++) {
            if (!isfinite(a->y[i]))
                continue;
            fprintf(f, "%.8g,", a->x[i]);
            if (sp->nfamily)
                fprintf(f, "%.8g,", sp->family_values[a->family]);
            fprintf(f, "%.10g,%s,%s\n", a->y[i],
                    branch_name(a, br, sizeof br),
                    cli_csv_flags(a->flags[i], d->shg, flags, sizeof flags));
        }
    }
}

static json_object *
curves_json(const dk_design *d, const dk_sweep_spec *sp,
            const dk_sweep_result *res)
{
    json_object *o = json_object_new_object();
    char br[16], flags[160];
    json_object_object_add(o, "crystal", json_object_new_string(d->crystal->id));
    json_object_object_add(o, "dispersion",
                           json_object_new_string(d->set->name));
    json_object_object_add(o, "x", json_object_new_string(dk_var_name(sp->x)));
    json_object_object_add(o, "x_unit",
                           json_object_new_string(dk_var_unit(sp->x)));
    json_object_object_add(o, "y",
                           json_object_new_string(dk_sweep_quantity_name(
                               sp->quantity, sp->target)));
    json_object_object_add(o, "y_unit",
                           json_object_new_string(dk_sweep_quantity_unit(
                               sp->quantity, sp->target)));
    json_object *arr = json_object_new_array();
    for (int s = 0; s < res->nseries; s++) {
        const dk_series *a = &res->series[s];
        json_object *so = json_object_new_object();
        json_object_object_add(so, "label", json_object_new_string(a->label));
        if (sp->nfamily)
            json_object_object_add(so, "family",
                                   cli_json_num(
                                       sp->family_values[a->family]));
        json_object_object_add(so, "branch",
                               json_object_new_string(
                                   branch_name(a, br, sizeof br)));
        json_object *xs = json_object_new_array(), *ys = json_object_new_array(),
                    *fl = json_object_new_array();
        for (size_t i = 0; i < a->n; i++) {
            json_object_array_add(xs, cli_json_num(a->x[i]));
            json_object_array_add(ys, cli_json_num(a->y[i]));
            json_object_array_add(
                fl, json_object_new_string(
                        dk_range_codes(a->flags[i], d->shg, flags,
                                       sizeof flags)));
        }
        json_object_object_add(so, "x", xs);
        json_object_object_add(so, "y", ys);
        json_object_object_add(so, "flags", fl);
        json_object_array_add(arr, so);
    }
    json_object_object_add(o, "series", arr);
    return o;
}

static void
map_csv(FILE *f, const dk_design *d, const dk_map_spec *mp,
        const dk_map_result *m)
{
    char flags[256];
    fprintf(f, "%s_%s,%s_%s,sinc2,flags\n", dk_var_name(mp->x),
            dk_var_unit(mp->x), dk_var_name(mp->y), dk_var_unit(mp->y));
    for (int j = 0; j < m->ny; j++)
        for (int i = 0; i < m->nx; i++) {
            size_t c = (size_t)j * m->nx + i;
            /* An empty cell where the model is undefined. */
            if (m->cell[c] == DK_CELL_UNDEFINED)
                fprintf(f, "%.8g,%.8g,,undefined\n", m->x[i], m->y[j]);
            else
                fprintf(f, "%.8g,%.8g,%.6g,%s\n", m->x[i], m->y[j], m->z[c],
                        cli_csv_flags(m->cell[c] == DK_CELL_EXTRAPOLATED
                                          ? m->flags
                                          : 0,
                                      d->shg, flags, sizeof flags));
        }
}

/* Grey bands where @axis leaves the crystal's transparency. */
static dk_status
transparency_regions(dk_plot *fig, dk_plot_axis axis, const dk_crystal *c,
                     dk_error *err)
{
    dk_status ps = dk_plot_add_region(fig, axis, -INFINITY,
                                      c->transparency_um[0],
                                      "not transparent", err);
    if (!ps)
        ps = dk_plot_add_region(fig, axis, c->transparency_um[1], INFINITY,
                                NULL, err);
    return ps;
}

/* Series that belong on one line of a figure: the root branches of one
 * family member (the same wave, or the same GVM pair), joined with NaN
 * breaks under one legend entry, so that a member keeps one colour, dash
 * and marker however many branches its curve has. */
static int
same_line(const dk_sweep_spec *sp, const dk_series *a, const dk_series *b)
{
    if (a->family != b->family)
        return 0;
    /* Signal and idler of one member are the two halves of one curve
     * that meet at degeneracy: one line, with the halves labelled. */
    if (sp->quantity == DK_SWEEP_SOLVE)
        return 1;
    return a->wave == b->wave && a->branch == b->branch;
}

/* Pieces (runs of finite points) of @y[0..n). */
static int
pieces(const double *y, size_t n)
{
    int k = 0, in = 0;
    for (size_t i = 0; i < n; i++) {
        if (isfinite(y[i]) && !in)
            k++;
        in = isfinite(y[i]);
    }
    return k;
}

static dk_status
plot_curves(dk_plot *fig, const dk_design *d, const dk_sweep_spec *sp,
            const cli_plot_args *pa, const dk_sweep_result *res,
            dk_error *err)
{
    dk_status ps = dk_plot_set_ylabel(fig,
                                      quantity_markup(sp->quantity,
                                                      sp->target),
                                      err);
    size_t total = 0;
    for (int s = 0; s < res->nseries; s++)
        total += res->series[s].n + 1;
    double *x = malloc(total * sizeof *x), *y = malloc(total * sizeof *y);
    unsigned char *fl = malloc(total);
    char *done = calloc((size_t)res->nseries + 1, 1);
    if (!x || !y || !fl || !done) {
        free(x), free(y), free(fl), free(done);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    for (int s = 0; !ps && s < res->nseries; s++) {
        if (done[s])
            continue;
        const dk_series *a = &res->series[s];
        size_t m = 0;
        int any = 0, signal_pieces = -1;
        /* Signal series first, then idler (then anything else). */
        for (int pass = 0; pass < 2; pass++)
            for (int t = s; t < res->nseries; t++) {
                const dk_series *b = &res->series[t];
                if (done[t] || !same_line(sp, a, b) ||
                    (pass == 0 && b->wave == 1))
                    continue;
                if (pass == 1 && signal_pieces < 0)
                    signal_pieces = pieces(y, m);
                done[t] = 1;
                for (size_t i = 0; i < b->n; i++) {
                    x[m] = b->x[i], y[m] = b->y[i];
                    fl[m++] = b->flags[i] ? DK_PLOT_FLAG_OUTSIDE_FIT : 0;
                    any |= isfinite(b->y[i]);
                }
                x[m] = NAN, y[m] = NAN, fl[m++] = 0;
            }
        /* The label of the member, without wave or pair. */
        char label[96];
        snprintf(label, sizeof label, "%s", a->label);
        const char *const tails[] = {", signal", ", idler", " (1st pair)",
                                     "signal", "idler"};
        for (size_t k = 0; k < sizeof tails / sizeof tails[0]; k++) {
            char *cut = strstr(label, tails[k]);
            if (cut)
                *cut = '\0';
        }
        if (!any)
            continue;
        ps = dk_plot_add_line_flagged(fig, x, y, fl, m,
                                      label[0] ? label : NULL, err);
        /* Say which half is which, once: on the first member's line. */
        if (!ps && a->wave == 0 && (a->family <= 0) && signal_pieces > 0) {
            size_t line = dk_plot_series_count(fig) - 1;
            ps = dk_plot_label_branch(fig, line, 0, "signal", err);
            if (!ps)
                ps = dk_plot_label_branch(fig, line, signal_pieces, "idler",
                                          err);
        }
    }
    free(x), free(y), free(fl), free(done);
    if (!ps && sp->quantity == DK_SWEEP_SINC2 && !isfinite(pa->yrange[0]))
        ps = dk_plot_set_yrange(fig, 0, 1.05, err);
    if (!ps && sp->quantity == DK_SWEEP_SOLVE &&
        dk_var_is_wavelength(sp->target)) {
        /* Only where the curves come near the edges: a region out of
         * view would still take a legend entry. */
        double lo = INFINITY, hi = -INFINITY;
        for (int s = 0; s < res->nseries; s++)
            for (size_t i = 0; i < res->series[s].n; i++)
                if (isfinite(res->series[s].y[i])) {
                    lo = fmin(lo, res->series[s].y[i]);
                    hi = fmax(hi, res->series[s].y[i]);
                }
        const double *t = d->crystal->transparency_um;
        if (hi > t[1] - 0.1 * (t[1] - t[0]) || lo < 1.1 * t[0])
            ps = transparency_regions(fig, DK_PLOT_Y_AXIS, d->crystal, err);
    }
    return ps;
}

static dk_status
plot_map(dk_plot *fig, const dk_map_spec *mp, const dk_map_result *m,
         dk_error *err)
{
    dk_status ps = dk_plot_set_ylabel(fig, axis_markup(mp->y), err);
    if (!ps)
        ps = dk_plot_set_map(fig, m->z, m->nx, m->ny, mp->x_lo, mp->x_hi,
                             mp->y_lo, mp->y_hi, "sinc<sup>2</sup>(Δk L/2)",
                             err);
    if (!ps && m->flags) {
        size_t cells = (size_t)m->nx * m->ny;
        unsigned char *fl = malloc(cells);
        if (!fl)
            return dk_error_set(err, DK_ENOMEM, "out of memory");
        for (size_t c = 0; c < cells; c++)
            fl[c] = m->cell[c] == DK_CELL_EXTRAPOLATED
                        ? DK_PLOT_FLAG_OUTSIDE_FIT
                        : 0;
        ps = dk_plot_set_map_flags(fig, fl, "undefined (opaque)", err);
        free(fl);
    }
    if (!ps)
        ps = dk_plot_add_contour(fig, 0.5, "half maximum", err);
    if (!ps)
        ps = dk_plot_set_zrange(fig, 0, 1, err);
    if (!ps && m->ridge.n > 0) {
        int any = 0;
        for (size_t i = 0; i < m->ridge.n && !any; i++)
            any = isfinite(m->ridge.y[i]);
        if (any)
            ps = dk_plot_add_line(fig, m->ridge.x, m->ridge.y, m->ridge.n,
                                  m->ridge.label, err);
    }
    return ps;
}

/* The design a sweep starts from: solved when its waves are complete.
 * When the sweep sets the temperature itself (@temp_swept), the 25 C the
 * base falls back on is no choice made for the user and is not noted. */
static int
base_design(const cli_design_args *da, const cli_common *cm,
            const dk_crystal *c, int angular, int temp_swept, dk_design *d)
{
    dk_design_request rq;
    int rc = cli_design_request(da, CLI_D_ALL, 0, c, cm->crystal,
                                cm->set_name, &rq, sweep_usage);
    if (rc)
        return rc;
    if (angular && rq.scheme == DK_SCHEME_AUTO)
        rq.scheme = DK_SCHEME_ANGLE;
    int complete = rq.shg || dk_waves_given(&rq.waves) == 3;
    /* A QPM sweep needs no solution when the grating is given or swept;
     * a birefringent one needs its modes: from --pol, or solved. */
    if ((rc = cli_design_make(&rq, d, 0)))
        return rc;
    if (temp_swept && dk_set_has_temperature(d->set)) {
        dk_notes_remove(&d->notes, "default-temperature");
        cli_drop_note("default-temperature");
    }
    if (complete && !(d->scheme == DK_SCHEME_QPM && rq.period_um > 0)) {
        dk_error err = {0};
        if (dk_design_solve(d, &err))
            return cli_error("%s", err.msg);
        cli_take_notes(&d->notes);
    } else if (d->scheme == DK_SCHEME_ANGLE && !d->pol[0]) {
        return cli_error("give --pol (modes of signal, idler, pump) or two "
                         "waves, so that the modes can be chosen");
    }
    return 0;
}

int
cmd_sweep(int argc, char **argv)
{
    enum { O_VARY = 500, O_SOLVE, O_FAMILY, O_MAP, O_END };
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        CLI_PLOT_OPTIONS,
        {"vary", required_argument, NULL, O_VARY},
        {"solve", required_argument, NULL, O_SOLVE},
        {"family", required_argument, NULL, O_FAMILY},
        {"map", required_argument, NULL, O_MAP},
        {NULL, 0, NULL, 0}};
    const char *v[O_END - O_VARY] = {0};
    cli_slots sl = {O_VARY, O_END - O_VARY, v, opts, sweep_usage};
    cli_common cm = {0};
    cli_design_args da = {0};
    cli_plot_args pa = {0};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, sweep_usage, &cm, &da, &pa,
                                cli_slot_option, &sl, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    const char *vary = v[0], *solve = v[1], *family = v[2], *map = v[3];
    if ((rc = cli_common_finish(&cm, argc, argv, 0, sweep_usage)))
        return rc;
    if (!vary)
        return cli_usage_error(sweep_usage, "--vary is required");
    if (!!solve == !!map)
        return cli_usage_error(sweep_usage, "give one of --solve and --map");
    if (map && family)
        return cli_usage_error(sweep_usage, "--family does not combine with "
                                            "--map");
    dk_error err = {0};
    dk_sweep_spec sp = {0};
    dk_map_spec mp = {0};
    double xr[2];
    int nx;
    if (parse_range_var("--vary", vary, &sp.x, xr, &nx,
                        map ? DK_MAP_MAX_SIDE : DK_SWEEP_MAX_POINTS))
        return CLI_USAGE;
    sp.x_lo = mp.x_lo = xr[0], sp.x_hi = mp.x_hi = xr[1];
    sp.nx = mp.nx = nx;
    mp.x = sp.x;
    if (map) {
        double yr[2];
        if (parse_range_var("--map", map, &mp.y, yr, &mp.ny, DK_MAP_MAX_SIDE))
            return CLI_USAGE;
        mp.y_lo = yr[0], mp.y_hi = yr[1];
        if ((long long)mp.nx * mp.ny > DK_MAP_MAX_CELLS)
            return cli_usage_error(sweep_usage, "a map of %d x %d cells is "
                                                "more than the %d allowed "
                                                "(about 9 bytes a cell); use "
                                                "fewer points",
                                   mp.nx, mp.ny, DK_MAP_MAX_CELLS);
    }
    if (family && parse_family(family, &sp))
        return CLI_USAGE;
    if (cli_plot_parse(&pa, sweep_usage))
        return CLI_USAGE;
    const char *plot = cli_plot_path(&pa);
    if (solve && dk_sweep_quantity_parse(solve, &sp.quantity, &sp.target,
                                         &err))
        return cli_usage_error(sweep_usage, "%s", err.msg);
    if ((map || sp.quantity == DK_SWEEP_SINC2) &&
        !cli_design_given(&da, OPT_LENGTH) && sp.x != DK_VAR_LENGTH)
        return cli_usage_error(sweep_usage, "sinc^2 needs --length");
    if (map && cm.json)
        return cli_usage_error(sweep_usage, "a map is written as --csv or "
                                            "--plot");
    if (cli_plot_stdout_format(&pa) && (cm.csv || cm.json))
        return cli_usage_error(sweep_usage, "--plot %s puts the figure on "
                                            "standard output; drop --csv "
                                            "and --json",
                               plot);
    int angular = sp.x == DK_VAR_THETA || sp.x == DK_VAR_PHI ||
                  sp.x == DK_VAR_ALPHA ||
                  (family && (sp.family == DK_VAR_THETA ||
                              sp.family == DK_VAR_PHI ||
                              sp.family == DK_VAR_ALPHA)) ||
                  (solve && sp.quantity == DK_SWEEP_SOLVE &&
                   (sp.target == DK_VAR_THETA || sp.target == DK_VAR_PHI)) ||
                  (map && (mp.y == DK_VAR_THETA || mp.y == DK_VAR_PHI ||
                           mp.y == DK_VAR_ALPHA));

    dk_db *db = NULL;
    if (cli_load_db(&db, cm.crystal))
        return CLI_FAIL;
    rc = CLI_FAIL;
    dk_plot *fig = NULL;
    dk_sweep_result res = {0};
    dk_map_result mres = {0};
    dk_design *d = malloc(sizeof *d);
    const dk_crystal *c = cli_find_crystal(db, cm.crystal);
    if (!c || !d)
        goto done;
    int temp_swept =
        sp.x == DK_VAR_TEMP || (family && sp.family == DK_VAR_TEMP) ||
        (map && mp.y == DK_VAR_TEMP) ||
        (solve && sp.quantity == DK_SWEEP_SOLVE && sp.target == DK_VAR_TEMP);
    if ((rc = base_design(&da, &cm, c, angular, temp_swept, d)))
        goto done;
    rc = CLI_FAIL;
    dk_status st = map ? dk_sweep_map(d, &mp, &mres, &err)
                       : dk_sweep_curves(d, &sp, &res, &err);
    if (st) {
        cli_error("%s", err.msg);
        if (st == DK_EINVAL)
            rc = CLI_USAGE;
        goto done;
    }
    cli_take_notes(map ? &mres.notes : &res.notes);
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (cm.json) {
        json_object *o = curves_json(d, &sp, &res);
        cli_notes_to_json(o);
        cli_out_json(&out, o);
    } else if (cm.csv || !plot) {
        cli_set_output_mode(CLI_CSV);
        if (map)
            map_csv(out.f, d, &mp, &mres);
        else
            curves_csv(out.f, d, &sp, &res);
    }
    if (plot) {
        dk_status ps = cli_plot_new(&pa, &fig, &err);
        if (!ps)
            ps = dk_plot_set_xlabel(fig, axis_markup(sp.x), &err);
        if (!ps && dk_var_is_wavelength(sp.x))
            ps = dk_plot_set_top_axis(fig, dk_plot_um_to_per_cm,
                                      dk_plot_per_cm_to_um, NULL,
                                      "Wavenumber (cm<sup>−1</sup>)", &err);
        if (!ps)
            ps = map ? plot_map(fig, &mp, &mres, &err)
                     : plot_curves(fig, d, &sp, &pa, &res, &err);
        /* Only a range that reaches the transparency edge shows the
         * region (one out of view would still take a legend entry). */
        const double *tr = d->crystal->transparency_um;
        if (!ps && dk_var_is_wavelength(sp.x) &&
            (fmin(sp.x_lo, sp.x_hi) < tr[0] || fmax(sp.x_lo, sp.x_hi) > tr[1]))
            ps = transparency_regions(fig, DK_PLOT_X_AXIS, d->crystal, &err);
        if (!ps)
            ps = cli_plot_write(&pa, fig, out.f, &err);
        if (ps) {
            cli_error("%s", err.msg);
            cli_out_discard(&out);
            goto done;
        }
        if (!cm.csv && !cm.json && !cli_plot_stdout_format(&pa))
            fprintf(out.f, "wrote %s\n", plot);
    }
    rc = cli_out_commit(&out);
done:
    dk_plot_free(fig);
    dk_sweep_result_free(&res);
    dk_map_result_free(&mres);
    free(d);
    dk_db_free(db);
    return rc;
}
