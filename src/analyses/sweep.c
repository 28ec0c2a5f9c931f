/*
 * sweep.c - set design variables and solve at each point of a sweep (see
 * deltak/sweep.h). The solvers are those of deltak/qpm.h and
 * deltak/angle.h; this module only decides which one answers which
 * question and keeps the waves consistent.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/roots.h"
#include "deltak/sweep.h"

#define DEG (M_PI / 180)

static const struct {
    const char *name;
    const char *unit;
} vars[] = {
    [DK_VAR_PERIOD] = {"period", "um"},
    [DK_VAR_TEMP] = {"temp", "C"},
    [DK_VAR_PUMP] = {"pump", "um"},
    [DK_VAR_SIGNAL] = {"signal", "um"},
    [DK_VAR_IDLER] = {"idler", "um"},
    [DK_VAR_FUNDAMENTAL] = {"fundamental", "um"},
    [DK_VAR_THETA] = {"theta", "deg"},
    [DK_VAR_PHI] = {"phi", "deg"},
    [DK_VAR_WAVELENGTHS] = {"wavelengths", "um"},
};

dk_status
dk_var_parse(const char *name, dk_var *v, dk_error *err)
{
    for (size_t i = 0; i < sizeof vars / sizeof vars[0]; i++)
        if (strcmp(name, vars[i].name) == 0) {
            *v = (dk_var)i;
            return DK_OK;
        }
    if (strcmp(name, "temperature") == 0) {
        *v = DK_VAR_TEMP;
        return DK_OK;
    }
    return dk_error_set(err, DK_EINVAL,
                        "unknown variable '%s' (known: period, temp, pump, "
                        "signal, idler, fundamental, theta, phi; as a "
                        "target also wavelengths)",
                        name);
}

const char *
dk_var_name(dk_var v)
{
    return vars[v].name;
}

const char *
dk_var_unit(dk_var v)
{
    return vars[v].unit;
}

/* Energy conservation with the held wave fixed. */
static int
follow(dk_sweep *s)
{
    dk_waves *w = &s->d.waves;
    if (s->d.shg)
        return 1;
    if (s->held == 1 && w->signal_um > 0) {
        double inv = 1 / w->pump_um - 1 / w->signal_um;
        w->idler_um = inv > 0 ? 1 / inv : NAN;
    } else if (s->held == 2 && w->idler_um > 0) {
        double inv = 1 / w->pump_um - 1 / w->idler_um;
        w->signal_um = inv > 0 ? 1 / inv : NAN;
    }
    return isfinite(w->signal_um) && isfinite(w->idler_um);
}

dk_status
dk_sweep_set(dk_sweep *s, dk_var v, double value, dk_error *err)
{
    dk_design *d = &s->d;
    int qpm = d->kind == DK_DESIGN_QPM;
    if (!isfinite(value))
        return dk_error_set(err, DK_EINVAL, "%s must be finite",
                            vars[v].name);
    switch (v) {
    case DK_VAR_PERIOD:
        if (!qpm)
            return dk_error_set(err, DK_EINVAL, "a period only applies to "
                                                "QPM designs");
        d->period_um = value;
        return DK_OK;
    case DK_VAR_TEMP:
        d->temp_c = value;
        d->angle.temp_c = value;
        return DK_OK;
    case DK_VAR_THETA:
    case DK_VAR_PHI:
        if (qpm)
            return dk_error_set(err, DK_EINVAL, "angles only apply to "
                                                "birefringent designs");
        if (v == DK_VAR_THETA)
            d->theta_rad = value * DEG;
        else
            d->phi_rad = value * DEG;
        return DK_OK;
    case DK_VAR_FUNDAMENTAL:
        if (!d->shg)
            return dk_error_set(err, DK_EINVAL, "the fundamental only "
                                                "applies to SHG");
        d->waves = dk_waves_shg(value);
        break;
    case DK_VAR_PUMP:
        if (d->shg)
            return dk_error_set(err, DK_EINVAL, "for SHG vary the "
                                                "fundamental");
        d->waves.pump_um = value;
        break;
    case DK_VAR_SIGNAL:
    case DK_VAR_IDLER:
        if (d->shg)
            return dk_error_set(err, DK_EINVAL, "for SHG vary the "
                                                "fundamental");
        if (v == DK_VAR_SIGNAL)
            d->waves.signal_um = value, s->held = 1;
        else
            d->waves.idler_um = value, s->held = 2;
        break;
    default:
        return dk_error_set(err, DK_EINVAL, "'%s' cannot be set",
                            vars[v].name);
    }
    d->angle.waves = d->waves;
    if (s->held && !follow(s))
        return dk_error_set(err, DK_EINVAL, "the pump must be shorter than "
                                            "the signal and idler");
    d->angle.waves = d->waves;
    return DK_OK;
}

static int
cmp(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* Signal/idler share of the pump frequency for a birefringent design. */
typedef struct share_probe {
    dk_design *d;
    double pump;
} share_probe;

static double
angle_dk_of_share(double x, void *p)
{
    share_probe *sp = p;
    dk_angle_problem pb = sp->d->angle;
    pb.waves = (dk_waves){sp->pump, sp->pump / x, sp->pump / (1 - x)};
    pb.temp_c = sp->d->temp_c;
    return dk_angle_delta_k(&pb, sp->d->pol, sp->d->theta_rad,
                            sp->d->phi_rad);
}

typedef struct theta_probe {
    dk_design *d;
} theta_probe;

static double
angle_dk_of_theta(double th, void *p)
{
    theta_probe *tp = p;
    dk_angle_problem pb = tp->d->angle;
    pb.waves = tp->d->waves;
    pb.temp_c = tp->d->temp_c;
    return dk_angle_delta_k(&pb, tp->d->pol, th, tp->d->phi_rad);
}

static double
angle_dk_of_temp(double t, void *p)
{
    theta_probe *tp = p;
    dk_angle_problem pb = tp->d->angle;
    pb.waves = tp->d->waves;
    pb.temp_c = t;
    return dk_angle_delta_k(&pb, tp->d->pol, tp->d->theta_rad,
                            tp->d->phi_rad);
}

dk_status
dk_sweep_solve(dk_sweep *s, dk_var target, double *values, int max, int *n,
               dk_error *err)
{
    dk_design *d = &s->d;
    int qpm = d->kind == DK_DESIGN_QPM;
    *n = 0;
    dk_status st = DK_OK;
    switch (target) {
    case DK_VAR_PERIOD: {
        if (!qpm)
            return dk_error_set(err, DK_EINVAL, "only QPM designs have a "
                                                "period to solve for");
        double pw, pt;
        if (dk_qpm_period(&d->qpm, &d->waves, d->temp_c, &pw, &pt, NULL) ==
            DK_OK && max > 0)
            values[(*n)++] = pw;
        return DK_OK;
    }
    case DK_VAR_TEMP:
        if (qpm)
            st = dk_qpm_solve_temperature(&d->qpm, &d->waves, d->period_um,
                                          s->t_lo_c, s->t_hi_c, values, max,
                                          n, err);
        else {
            theta_probe tp = {d};
            st = dk_roots_all(angle_dk_of_temp, &tp, s->t_lo_c, s->t_hi_c,
                              400, 1e-7, values, max, n, err);
        }
        return st;
    case DK_VAR_THETA: {
        if (qpm)
            return dk_error_set(err, DK_EINVAL, "QPM designs have no angle "
                                                "to solve for");
        theta_probe tp = {d};
        double r[16];
        int nr;
        st = dk_roots_all(angle_dk_of_theta, &tp, 0, M_PI / 2, 900, 1e-10, r,
                          16, &nr, err);
        for (int i = 0; !st && i < nr && *n < max; i++)
            values[(*n)++] = r[i] / DEG;
        return st;
    }
    case DK_VAR_SIGNAL:
    case DK_VAR_IDLER:
    case DK_VAR_WAVELENGTHS: {
        if (d->shg)
            return dk_error_set(err, DK_EINVAL, "SHG has no signal or idler "
                                                "to solve for");
        dk_waves sol[32];
        int ns = 0;
        if (qpm) {
            st = dk_qpm_solve_wavelengths(&d->qpm, d->waves.pump_um,
                                          d->period_um, d->temp_c, sol, 32,
                                          &ns, err);
        } else {
            share_probe sp = {d, d->waves.pump_um};
            double hi = d->angle.crystal->transparency_um[1];
            double x[32];
            int nx;
            double xlo = d->waves.pump_um / hi, xhi = 1 - xlo;
            if (!(xlo < xhi))
                return DK_OK;
            st = dk_roots_all(angle_dk_of_share, &sp, xlo, xhi, 1000, 1e-12,
                              x, 32, &nx, err);
            for (int i = 0; !st && i < nx; i++) {
                /* Equal modes: x and 1 − x are one pair. */
                if (d->pol[0] == d->pol[1] && x[i] < 0.5 - 1e-9)
                    continue;
                sol[ns++] = (dk_waves){d->waves.pump_um,
                                       d->waves.pump_um / x[i],
                                       d->waves.pump_um / (1 - x[i])};
            }
        }
        for (int i = 0; !st && i < ns; i++) {
            if (target != DK_VAR_IDLER && *n < max)
                values[(*n)++] = sol[i].signal_um;
            if (target != DK_VAR_SIGNAL && *n < max)
                values[(*n)++] = sol[i].idler_um;
        }
        qsort(values, *n, sizeof(double), cmp);
        return st;
    }
    default:
        return dk_error_set(err, DK_EINVAL, "cannot solve for '%s'",
                            vars[target].name);
    }
}

double
dk_sweep_sinc2(dk_sweep *s)
{
    double dk = dk_design_delta_k(&s->d, DK_TOL_TEMPERATURE, s->d.temp_c);
    return isfinite(dk) ? dk_sinc2(dk, s->d.length_mm * 1e3) : NAN;
}

dk_status
dk_sweep_rephase(dk_sweep *s, int keep_period, dk_error *err)
{
    dk_design *d = &s->d;
    if (d->kind == DK_DESIGN_QPM) {
        if (keep_period)
            return DK_OK;
        double pt;
        return dk_qpm_period(&d->qpm, &d->waves, d->temp_c, &d->period_um,
                             &pt, err);
    }
    double th[16];
    int n;
    dk_status st = dk_sweep_solve(s, DK_VAR_THETA, th, 16, &n, err);
    if (st)
        return st;
    if (n == 0)
        return dk_error_set(err, DK_ENOROOT, "no phase-matching angle here");
    double best = th[0] * DEG;
    for (int i = 1; i < n; i++)
        if (fabs(th[i] * DEG - d->theta_rad) < fabs(best - d->theta_rad))
            best = th[i] * DEG;
    d->theta_rad = best;
    return DK_OK;
}
