/*
 * sweep_problem.c - the solve problem of one sweep point (see
 * sweep_internal.h): the function dk_sweep_solve() finds the roots of, on
 * the same grid, with the same tolerance, and the same order of values.
 *
 * The functions are those of the solvers, evaluated through the compiled
 * forms (qpm_fast.h, angle_fast.h) where the temperature is fixed along
 * the search, so that they give the solvers' bits:
 *   QPM, signal share x     dk_qpm_fast_dk_share(): |Δk_material| − K, with
 *                           its exact derivative 2π(n_g,i − n_g,s)/λp
 *   QPM, temperature        dk_qpm_delta_k() (formulas recompiled per T)
 *   birefringent, share     dk_angle_fast_dk() at the design's direction
 *   birefringent, T         dk_angle_delta_k()
 *   birefringent, θ or φ    dk_angle_fast_dk() at the design's waves
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/constants.h"
#include "sweep_internal.h"

/* The angle problem of the design, as sweep_point.c's angle_dk builds it. */
static dk_angle_problem
angle_problem(const dk_design *d)
{
    dk_angle_problem pb = d->angle;
    pb.waves = d->waves;
    pb.temp_c = d->temp_c;
    return pb;
}

/* Compile the design's formulas at its temperature unless they are. */
static void
compile(sweep_problem *p, const dk_design *d)
{
    if (p->fast && p->fast_temp_c == d->temp_c) {
        if (d->scheme == DK_SCHEME_QPM)
            p->qf.grating_k = d->period_um > 0
                                  ? dk_qpm_grating_k(&d->qpm, d->period_um,
                                                     d->temp_c)
                                  : 0;
        else
            p->af.pb = angle_problem(d);
        return;
    }
    p->fast_temp_c = d->temp_c;
    if (d->scheme == DK_SCHEME_QPM)
        p->fast = dk_qpm_fast_init(&d->qpm, d->temp_c, d->period_um,
                                   &p->qf) == DK_OK;
    else {
        dk_angle_problem pb = angle_problem(d);
        p->fast = dk_angle_fast_init(&pb, d->pol, &p->af) == DK_OK;
    }
}

int
sweep_problem_setup(sweep_problem *p, dk_sweep *s, dk_var target)
{
    dk_design *d = &s->d;
    int qpm = d->scheme == DK_SCHEME_QPM;
    /* Keep the compiled forms of the previous point of the same kind. */
    int keep = p->s == s && p->target == target && p->fast;
    if (!keep)
        p->fast = 0;
    p->s = s;
    p->target = target;
    p->symmetric = p->half = p->vary_phi = 0;
    switch (target) {
    case DK_VAR_TEMP:
        p->kind = qpm ? SP_QPM_TEMP : SP_ANGLE_TEMP;
        if (qpm && !(d->period_um > 0))
            return 0;
        p->lo = s->t_lo_c;
        p->hi = s->t_hi_c;
        p->nscan = qpm ? DK_QPM_TEMP_SCAN : DK_SWEEP_TEMP_SCAN;
        p->xtol = qpm ? DK_QPM_TEMP_TOL_C : DK_SWEEP_TEMP_TOL;
        p->maxroots = DK_SWEEP_MAX_ROOTS;
        break;
    case DK_VAR_THETA:
    case DK_VAR_PHI:
        if (qpm)
            return 0;
        p->kind = SP_ANGLE_DIR;
        p->vary_phi = target == DK_VAR_PHI;
        p->lo = 0;
        p->hi = DK_PI * (1 - 1e-12);
        p->nscan = 2 * DK_SWEEP_ANGLE_SCAN;
        if (d->angle.alpha_rad == 0) {
            double now = p->vary_phi ? d->phi_rad : d->theta_rad;
            if (now > DK_PI / 2)
                p->lo = DK_PI / 2;
            else
                p->hi = DK_PI / 2;
            p->nscan = DK_SWEEP_ANGLE_SCAN;
        }
        p->xtol = DK_SWEEP_ANGLE_TOL;
        p->maxroots = DK_SWEEP_MAX_ROOTS;
        compile(p, d);
        break;
    case DK_VAR_SIGNAL:
    case DK_VAR_IDLER:
    case DK_VAR_WAVELENGTHS: {
        if (d->shg)
            return 0;
        double pump = d->waves.pump_um, top = d->crystal->transparency_um[1];
        double xlo = pump / top, xhi = 1 - pump / top;
        if (!(xlo < xhi))
            return 0;
        p->pump_um = pump;
        p->xtol = DK_SWEEP_SHARE_TOL;
        if (qpm) {
            if (!(d->period_um > 0) || !(pump > 0))
                return 0;
            p->kind = SP_QPM_SHARE;
            p->symmetric = d->qpm.pol[0] == d->qpm.pol[1];
            p->half = p->symmetric;
            p->lo = p->half ? 0.5 : xlo;
            p->hi = xhi;
            p->nscan = p->half ? DK_QPM_FREQ_SCAN / 2 : DK_QPM_FREQ_SCAN;
            p->xtol = DK_QPM_FREQ_TOL;
            p->maxroots = 64;
            compile(p, d);
            if (p->fast)
                p->np = dk_nfast_n(dk_qpm_fast_axis(&p->qf, 2), pump);
            break;
        } else {
            p->kind = SP_ANGLE_SHARE;
            p->symmetric = d->pol[0] == d->pol[1] && d->angle.alpha_rad == 0;
            p->lo = xlo;
            p->hi = xhi;
            p->nscan = DK_SWEEP_SHARE_SCAN;
            p->maxroots = 32;
        }
        compile(p, d);
        break;
    }
    default:
        return 0;   /* the period is explicit; others are errors */
    }
    return isfinite(p->lo) && isfinite(p->hi) && p->lo < p->hi;
}

double
sweep_problem_eval(sweep_problem *p, double y, double *dfdy)
{
    dk_design *d = &p->s->d;
    if (dfdy)
        *dfdy = NAN;
    switch (p->kind) {
    case SP_QPM_SHARE:
        if (p->fast)
            return dk_qpm_fast_dk_share_np(&p->qf, p->pump_um, p->np, y,
                                           dfdy);
        {
            dk_waves w = dk_waves_of_share(p->pump_um, y);
            return dk_qpm_delta_k(&d->qpm, &w, d->temp_c, d->period_um);
        }
    case SP_QPM_TEMP:
        return dk_qpm_delta_k(&d->qpm, &d->waves, y, d->period_um);
    case SP_ANGLE_TEMP: {
        dk_angle_problem pb = angle_problem(d);
        pb.temp_c = y;
        return dk_angle_delta_k(&pb, d->pol, d->theta_rad, d->phi_rad);
    }
    case SP_ANGLE_SHARE: {
        dk_waves w = dk_waves_of_share(d->waves.pump_um, y);
        if (p->fast)
            return dk_angle_fast_dk(&p->af, &w, d->theta_rad, d->phi_rad);
        dk_angle_problem pb = angle_problem(d);
        pb.waves = w;
        return dk_angle_delta_k(&pb, d->pol, d->theta_rad, d->phi_rad);
    }
    case SP_ANGLE_DIR: {
        double th = p->vary_phi ? d->theta_rad : y;
        double ph = p->vary_phi ? y : d->phi_rad;
        if (p->fast)
            return dk_angle_fast_dk(&p->af, &d->waves, th, ph);
        dk_angle_problem pb = angle_problem(d);
        return dk_angle_delta_k(&pb, d->pol, th, ph);
    }
    }
    return NAN;
}

double
sweep_problem_fn(double y, void *p)
{
    return sweep_problem_eval(p, y, NULL);
}

double
sweep_problem_value(const sweep_problem *p, double y, int wave)
{
    switch (p->kind) {
    case SP_QPM_SHARE:
    case SP_ANGLE_SHARE:
        return wave == SP_WAVE_IDLER ? p->pump_um / (1 - y) : p->pump_um / y;
    case SP_ANGLE_DIR:
        return y / DK_RAD_PER_DEG;
    default:
        return y;
    }
}

typedef struct tagged {
    double v;
    int src, wave;
} tagged;

static int
by_value(const void *a, const void *b)
{
    double x = ((const tagged *)a)->v, y = ((const tagged *)b)->v;
    return (x > y) - (x < y);
}

int
sweep_problem_values(const sweep_problem *p, const double *roots, int nr,
                     double *values, int *src, int *wave, int max)
{
    int n = 0;
    if (p->kind != SP_QPM_SHARE && p->kind != SP_ANGLE_SHARE) {
        for (int i = 0; i < nr && n < max; i++) {
            values[n] = sweep_problem_value(p, roots[i], SP_WAVE_SELF);
            src[n] = i, wave[n] = SP_WAVE_SELF;
            n++;
        }
        return n;
    }
    /* The pairs in the solver's order: QPM from the largest share down
     * (shortest signal first), birefringent upwards; one of each twin. */
    int order[64], npairs = 0;
    int qpm = p->kind == SP_QPM_SHARE;
    for (int k = 0; k < nr && npairs < DK_SWEEP_PAIRS; k++) {
        int i = qpm ? nr - 1 - k : k;
        if (p->symmetric && roots[i] < 0.5 - 1e-9)
            continue;
        order[npairs++] = i;
    }
    tagged t[DK_SWEEP_MAX_ROOTS];
    for (int k = 0; k < npairs; k++) {
        int i = order[k];
        if (p->target != DK_VAR_IDLER && n < max)
            t[n++] = (tagged){sweep_problem_value(p, roots[i], SP_WAVE_SIGNAL),
                              i, SP_WAVE_SIGNAL};
        if (p->target != DK_VAR_SIGNAL && n < max)
            t[n++] = (tagged){sweep_problem_value(p, roots[i], SP_WAVE_IDLER),
                              i, SP_WAVE_IDLER};
    }
    /* Single targets come sorted (a stable sort keeps equal values in
     * the solver's order). */
    if (p->target != DK_VAR_WAVELENGTHS)
        for (int a = 1; a < n; a++)
            for (int b = a; b > 0 && by_value(&t[b - 1], &t[b]) > 0; b--) {
                tagged x = t[b];
                t[b] = t[b - 1];
                t[b - 1] = x;
            }
    for (int k = 0; k < n; k++)
        values[k] = t[k].v, src[k] = t[k].src, wave[k] = t[k].wave;
    return n;
}
