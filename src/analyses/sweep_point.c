/*
 * sweep_point.c - one point of a sweep: set design variables and solve
 * (see deltak/sweep.h). The solvers are those of deltak/qpm.h and
 * deltak/angle.h; this module only decides which one answers which
 * question and keeps the waves consistent with energy conservation.
 *
 * Signal and idler of a birefringent design are found as roots of Δk over
 * the signal's share x = ν_s/ν_p of the pump frequency, where Δk is
 * smooth; with both in one mode and collinear, x and 1 − x are one pair.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/constants.h"
#include "deltak/roots.h"
#include "deltak/sweep.h"

#define TEMP_MARGIN_C 50
#define ANGLE_SCAN 900
#define SHARE_SCAN 1000

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
    [DK_VAR_ALPHA] = {"alpha", "deg"},
    [DK_VAR_LENGTH] = {"length", "mm"},
    [DK_VAR_WAVELENGTHS] = {"wavelengths", "um"},
};

dk_status
dk_var_parse(const char *name, dk_var *v, dk_error *err)
{
    for (size_t i = 0; name && i < sizeof vars / sizeof vars[0]; i++)
        if (strcmp(name, vars[i].name) == 0) {
            *v = (dk_var)i;
            return DK_OK;
        }
    if (name && strcmp(name, "temperature") == 0) {
        *v = DK_VAR_TEMP;
        return DK_OK;
    }
    return dk_error_set(err, DK_EINVAL,
                        "unknown variable '%s' (known: period, temp, pump, "
                        "signal, idler, fundamental, theta, phi, alpha, "
                        "length; as a target also wavelengths)",
                        name ? name : "");
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

int
dk_var_is_wavelength(dk_var v)
{
    return v == DK_VAR_PUMP || v == DK_VAR_SIGNAL || v == DK_VAR_IDLER ||
           v == DK_VAR_FUNDAMENTAL || v == DK_VAR_WAVELENGTHS;
}

dk_status
dk_var_check(dk_var v, double value, dk_error *err)
{
    static const struct {
        double lo, hi;
    } lim[] = {
        [DK_VAR_PERIOD] = {1e-3, 1e4},     [DK_VAR_TEMP] = {-273.15, 1000},
        [DK_VAR_PUMP] = {1e-3, 1e3},       [DK_VAR_SIGNAL] = {1e-3, 1e3},
        [DK_VAR_IDLER] = {1e-3, 1e3},      [DK_VAR_FUNDAMENTAL] = {1e-3, 1e3},
        [DK_VAR_THETA] = {-360, 360},      [DK_VAR_PHI] = {-360, 360},
        [DK_VAR_ALPHA] = {-44.99, 44.99},  [DK_VAR_LENGTH] = {1e-6, 1e4},
        [DK_VAR_WAVELENGTHS] = {1e-3, 1e3},
    };
    if (!(value >= lim[v].lo && value <= lim[v].hi))
        return dk_error_set(err, DK_EINVAL,
                            "%s = %g %s is outside what a sweep takes: %g to "
                            "%g %s",
                            vars[v].name, value, vars[v].unit, lim[v].lo,
                            lim[v].hi, vars[v].unit);
    return DK_OK;
}

void
dk_sweep_init(dk_sweep *s, const dk_design *base)
{
    s->d = *base;
    if (isfinite(base->rq.temp_range_c[0])) {
        s->t_lo_c = base->rq.temp_range_c[0];
        s->t_hi_c = base->rq.temp_range_c[1];
        return;
    }
    const dk_dispersion_set *set = base->set;
    const double *tr = set->temp_form == DK_TEMP_NONE
                           ? set->thermo.temperature_range_c
                           : set->temperature_range_c;
    s->t_lo_c = fmax(tr[0] - TEMP_MARGIN_C, -270);
    s->t_hi_c = tr[1] + TEMP_MARGIN_C;
}

/* Energy conservation with the held wave fixed. */
static int
follow(dk_design *d)
{
    dk_waves *w = &d->waves;
    if (d->shg)
        return 1;
    if (d->held == 1 && w->signal_um > 0)
        w->idler_um = dk_third_wave_um(w->pump_um, w->signal_um);
    else if (d->held == 2 && w->idler_um > 0)
        w->signal_um = dk_third_wave_um(w->pump_um, w->idler_um);
    return isfinite(w->signal_um) && isfinite(w->idler_um);
}

dk_status
dk_sweep_set(dk_sweep *s, dk_var v, double value, dk_error *err)
{
    dk_design *d = &s->d;
    int qpm = d->scheme == DK_SCHEME_QPM;
    if (!isfinite(value))
        return dk_error_set(err, DK_EINVAL, "%s must be finite",
                            vars[v].name);
    switch (v) {
    case DK_VAR_PERIOD:
        if (!qpm)
            return dk_error_set(err, DK_EINVAL, "a period only applies to "
                                                "QPM designs");
        if (!(value > 0))
            return dk_error_set(err, DK_EINVAL, "a period must be "
                                                "positive");
        d->period_um = value;
        return DK_OK;
    case DK_VAR_TEMP:
        if (value < DK_ABSOLUTE_ZERO_C)
            return dk_error_set(err, DK_EINVAL, "%g C is below absolute "
                                                "zero", value);
        d->temp_c = value;
        d->angle.temp_c = value;
        return DK_OK;
    case DK_VAR_LENGTH:
        if (!(value > 0))
            return dk_error_set(err, DK_EINVAL, "a length must be "
                                                "positive");
        d->length_mm = value;
        return DK_OK;
    case DK_VAR_THETA:
    case DK_VAR_PHI:
    case DK_VAR_ALPHA:
        if (qpm)
            return dk_error_set(err, DK_EINVAL, "angles only apply to "
                                                "birefringent designs");
        if (v == DK_VAR_THETA)
            d->theta_rad = value * DK_RAD_PER_DEG;
        else if (v == DK_VAR_PHI)
            d->phi_rad = value * DK_RAD_PER_DEG;
        else if (fabs(value) < 45)
            d->angle.alpha_rad = value * DK_RAD_PER_DEG;
        else
            return dk_error_set(err, DK_EINVAL, "a noncollinear angle must "
                                                "be below 45 deg");
        return DK_OK;
    case DK_VAR_FUNDAMENTAL:
        if (!d->shg)
            return dk_error_set(err, DK_EINVAL, "the fundamental only "
                                                "applies to SHG");
        if (!(value > 0))
            return dk_error_set(err, DK_EINVAL, "a wavelength must be "
                                                "positive");
        d->waves = dk_waves_shg(value);
        break;
    case DK_VAR_PUMP:
    case DK_VAR_SIGNAL:
    case DK_VAR_IDLER:
        if (d->shg)
            return dk_error_set(err, DK_EINVAL, "for SHG vary the "
                                                "fundamental");
        if (!(value > 0))
            return dk_error_set(err, DK_EINVAL, "a wavelength must be "
                                                "positive");
        if (v == DK_VAR_PUMP)
            d->waves.pump_um = value;
        else if (v == DK_VAR_SIGNAL)
            d->waves.signal_um = value, d->held = 1;
        else
            d->waves.idler_um = value, d->held = 2;
        break;
    default:
        return dk_error_set(err, DK_EINVAL, "'%s' cannot be set",
                            vars[v].name);
    }
    if (d->held && !follow(d))
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

/* Δk of the birefringent design @d with one thing changed. */
typedef struct angle_probe {
    dk_design *d;
    dk_var what;      /* DK_VAR_THETA, DK_VAR_PHI, DK_VAR_TEMP or the
                       * signal share (DK_VAR_WAVELENGTHS) */
} angle_probe;

static double
angle_dk(double x, void *p)
{
    angle_probe *ap = p;
    dk_design *d = ap->d;
    dk_angle_problem pb = d->angle;
    pb.waves = d->waves;
    pb.temp_c = d->temp_c;
    double th = d->theta_rad, ph = d->phi_rad;
    switch (ap->what) {
    case DK_VAR_THETA: th = x; break;
    case DK_VAR_PHI: ph = x; break;
    case DK_VAR_TEMP: pb.temp_c = x; break;
    default: pb.waves = dk_waves_of_share(d->waves.pump_um, x);
    }
    return dk_angle_delta_k(&pb, d->pol, th, ph);
}

/* Every pair (signal, idler) of pump @d->waves.pump_um. */
static dk_status
solve_pairs(dk_sweep *s, dk_waves *sol, int max, int *ns, dk_error *err)
{
    dk_design *d = &s->d;
    *ns = 0;
    if (d->scheme == DK_SCHEME_QPM)
        return dk_qpm_solve_wavelengths(&d->qpm, d->waves.pump_um,
                                        d->period_um, d->temp_c, sol, max,
                                        ns, err);
    angle_probe ap = {d, DK_VAR_WAVELENGTHS};
    double hi = d->crystal->transparency_um[1];
    double xlo = d->waves.pump_um / hi, xhi = 1 - xlo, x[32];
    int nx;
    if (!(xlo < xhi))
        return DK_OK;
    dk_status st = dk_roots_all(angle_dk, &ap, xlo, xhi, SHARE_SCAN, 1e-12,
                                x, 32, &nx, err);
    /* One mode and collinear: x and 1 − x are one pair. */
    int twin = d->pol[0] == d->pol[1] && d->angle.alpha_rad == 0;
    for (int i = 0; !st && i < nx && *ns < max; i++) {
        if (twin && x[i] < 0.5 - 1e-9)
            continue;
        sol[(*ns)++] = dk_waves_of_share(d->waves.pump_um, x[i]);
    }
    return st;
}

dk_status
dk_sweep_solve(dk_sweep *s, dk_var target, double *values, int max, int *n,
               dk_error *err)
{
    dk_design *d = &s->d;
    int qpm = d->scheme == DK_SCHEME_QPM;
    *n = 0;
    dk_status st = DK_OK;
    switch (target) {
    case DK_VAR_PERIOD: {
        if (!qpm)
            return dk_error_set(err, DK_EINVAL, "only QPM designs have a "
                                                "period to solve for");
        double pw, pt;
        if (dk_qpm_period(&d->qpm, &d->waves, d->temp_c, &pw, &pt, NULL) ==
                DK_OK &&
            max > 0)
            values[(*n)++] = pw;
        return DK_OK;
    }
    case DK_VAR_TEMP:
        if (qpm)
            return dk_qpm_solve_temperature(&d->qpm, &d->waves, d->period_um,
                                            s->t_lo_c, s->t_hi_c, values,
                                            max, n, err);
        {
            angle_probe ap = {d, DK_VAR_TEMP};
            return dk_roots_all(angle_dk, &ap, s->t_lo_c, s->t_hi_c, 400,
                                1e-7, values, max, n, err);
        }
    case DK_VAR_THETA:
    case DK_VAR_PHI: {
        if (qpm)
            return dk_error_set(err, DK_EINVAL, "QPM designs have no angle "
                                                "to solve for");
        angle_probe ap = {d, target};
        double r[DK_SWEEP_MAX_ROOTS];
        int nr;
        /* Collinear Δk is symmetric about 90°: search the half that holds
         * the design's angle (θ and 180° − θ are different cuts of one
         * tuning curve); noncollinear designs need the whole range. */
        double lo = 0, hi = DK_PI * (1 - 1e-12);
        int nscan = 2 * ANGLE_SCAN;
        if (d->angle.alpha_rad == 0) {
            double now = target == DK_VAR_THETA ? d->theta_rad : d->phi_rad;
            if (now > DK_PI / 2)
                lo = DK_PI / 2;
            else
                hi = DK_PI / 2;
            nscan = ANGLE_SCAN;
        }
        st = dk_roots_all(angle_dk, &ap, lo, hi, nscan, 1e-10, r,
                          DK_SWEEP_MAX_ROOTS, &nr, err);
        for (int i = 0; !st && i < nr && *n < max; i++)
            values[(*n)++] = r[i] / DK_RAD_PER_DEG;
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
        st = solve_pairs(s, sol, 32, &ns, err);
        for (int i = 0; !st && i < ns; i++) {
            if (target != DK_VAR_IDLER && *n < max)
                values[(*n)++] = sol[i].signal_um;
            if (target != DK_VAR_SIGNAL && *n < max)
                values[(*n)++] = sol[i].idler_um;
        }
        if (target != DK_VAR_WAVELENGTHS)
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
    if (!(s->d.length_mm > 0))
        return NAN;
    double dk = dk_design_delta_k(&s->d, DK_TOL_TEMPERATURE, s->d.temp_c);
    return isfinite(dk) ? dk_sinc2(dk, s->d.length_mm * 1e3) : NAN;
}

dk_status
dk_sweep_rephase(dk_sweep *s, int keep_period, dk_error *err)
{
    dk_design *d = &s->d;
    if (d->scheme == DK_SCHEME_QPM) {
        if (keep_period)
            return DK_OK;
        double pt;
        return dk_qpm_period(&d->qpm, &d->waves, d->temp_c, &d->period_um,
                             &pt, err);
    }
    int xy = strcmp(d->plane, "XY") == 0;
    double now = xy ? d->phi_rad : d->theta_rad;
    double r[DK_SWEEP_MAX_ROOTS];
    int n;
    dk_status st = dk_sweep_solve(s, xy ? DK_VAR_PHI : DK_VAR_THETA, r,
                                  DK_SWEEP_MAX_ROOTS, &n, err);
    if (st)
        return st;
    if (n == 0)
        return dk_error_set(err, DK_ENOROOT, "no phase-matching angle here");
    double best = r[0] * DK_RAD_PER_DEG;
    for (int i = 1; i < n; i++)
        if (fabs(r[i] * DK_RAD_PER_DEG - now) < fabs(best - now))
            best = r[i] * DK_RAD_PER_DEG;
    if (xy)
        d->phi_rad = best;
    else
        d->theta_rad = best;
    return DK_OK;
}
