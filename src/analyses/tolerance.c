/*
 * tolerance.c - acceptance widths of a design (see deltak/tolerance.h).
 *
 * Each parameter gets a natural step for the outward search (0.01 °C,
 * relative 1e-5 in wavelength, 1e-5 rad, 1e-4 of the period) and the
 * whole domain where the model is defined as its search range (see
 * domain_of), so that broad, noncritical and turning-over acceptances
 * get a width, or an open side at the domain's end, never a failure.
 */
#include <math.h>
#include <string.h>

#define LOBE_SAMPLES 4001   /* samples of the whole domain */

#include "deltak/material.h"
#include "deltak/tolerance.h"
#include "design/design_fast.h"

int
dk_design_applies(const dk_design *d, dk_tol_param p)
{
    switch (p) {
    case DK_TOL_TEMPERATURE:
    case DK_TOL_SIGNAL:
        return 1;
    case DK_TOL_PUMP:
        return !d->shg;
    case DK_TOL_THETA:
        return d->scheme == DK_SCHEME_ANGLE;
    case DK_TOL_PHI:
        /* In a uniaxial crystal Δk does not depend on φ at all. */
        return d->scheme == DK_SCHEME_ANGLE &&
               d->crystal->optical_class == DK_BIAXIAL;
    case DK_TOL_PERIOD:
    case DK_TOL_TILT:
        return d->scheme == DK_SCHEME_QPM;
    }
    return 0;
}

double
dk_design_operating_value(const dk_design *d, dk_tol_param p)
{
    switch (p) {
    case DK_TOL_TEMPERATURE: return d->temp_c;
    case DK_TOL_SIGNAL: return d->waves.signal_um;
    case DK_TOL_PUMP: return d->waves.pump_um;
    case DK_TOL_THETA: return d->theta_rad;
    case DK_TOL_PHI: return d->phi_rad;
    case DK_TOL_PERIOD: return d->period_um;
    case DK_TOL_TILT: return 0;
    }
    return NAN;
}

/* The waves with the signal (or pump) moved, energy conserved. */
static dk_waves
moved_waves(const dk_design *d, dk_tol_param p, double x)
{
    dk_waves w = d->waves;
    if (p == DK_TOL_SIGNAL) {
        if (d->shg)
            return dk_waves_shg(x);
        w.signal_um = x;
    } else if (p == DK_TOL_PUMP) {
        w.pump_um = x;
    } else {
        return w;
    }
    w.idler_um = dk_third_wave_um(w.pump_um, w.signal_um);
    return w;
}

double
dk_design_delta_k(dk_design *d, dk_tol_param p, double x)
{
    if (!dk_design_applies(d, p))
        return NAN;
    dk_waves w = moved_waves(d, p, x);
    if (!isfinite(w.idler_um))
        return NAN;
    double t = p == DK_TOL_TEMPERATURE ? x : d->temp_c;
    if (d->scheme == DK_SCHEME_QPM) {
        if (p == DK_TOL_PERIOD)
            return dk_qpm_delta_k(&d->qpm, &w, t, x);
        if (p == DK_TOL_TILT) {
            /* The grating projected on the beams: K cos δ. */
            double k0 = dk_qpm_delta_k(&d->qpm, &w, t, d->period_um);
            double kg = dk_qpm_grating_k(&d->qpm, d->period_um, t);
            return k0 + kg * (1 - cos(x));
        }
        return dk_qpm_delta_k(&d->qpm, &w, t, d->period_um);
    }
    dk_angle_problem pb = d->angle;
    pb.waves = w;
    pb.temp_c = t;
    double th = p == DK_TOL_THETA ? x : d->theta_rad;
    double ph = p == DK_TOL_PHI ? x : d->phi_rad;
    double r = dk_angle_delta_k(&pb, d->pol, th, ph);
    d->angle.warnings |= pb.warnings;
    return r;
}

/* Δk of a design along one parameter, for the root finders and scans:
 * the dispersion compiled once at the operating temperature (or once per
 * temperature when the temperature is the parameter) instead of at every
 * call (design_fast.h: the same bits as dk_design_delta_k()). The QPM
 * period and tilt move the grating and take the general path. */
typedef struct probe {
    dk_design *d;
    dk_tol_param p;
    int fast;
    dk_design_fast f;
} probe;

static void
probe_init(probe *pr, dk_design *d, dk_tol_param p)
{
    pr->d = d;
    pr->p = p;
    pr->fast = dk_design_applies(d, p) && p != DK_TOL_PERIOD &&
               p != DK_TOL_TILT;
    if (pr->fast && p != DK_TOL_TEMPERATURE) {
        dk_design_fast_init(&pr->f, d, d->temp_c);
        pr->fast = pr->f.ready;
    }
}

static double
dk_at(double x, void *pp)
{
    probe *pr = pp;
    const dk_design *d = pr->d;
    if (!pr->fast)
        return dk_design_delta_k(pr->d, pr->p, x);
    if (pr->p == DK_TOL_TEMPERATURE) {
        dk_design_fast_init(&pr->f, d, x);
        if (!pr->f.ready)
            return dk_design_delta_k(pr->d, pr->p, x);
    }
    dk_waves w = moved_waves(d, pr->p, x);
    if (!isfinite(w.idler_um))
        return NAN;
    return dk_design_fast_dk(&pr->f, &w,
                             pr->p == DK_TOL_THETA ? x : d->theta_rad,
                             pr->p == DK_TOL_PHI ? x : d->phi_rad);
}

/* The whole domain of parameter @p: where the outward search may go and
 * where dk_design_acceptance_lobes samples. Wavelengths stay where every
 * wave is inside the transparency (energy conserved); temperatures within
 * ±300 °C of the operating point (above absolute zero); θ over [0, π],
 * φ over ±π/2, the period over a factor of 2, the tilt over ±1.2 rad. */
static void
domain_of(const dk_design *d, dk_tol_param p, double x0, double *step,
          double *lo, double *hi)
{
    const double t0 = d->crystal->transparency_um[0],
                 t1 = d->crystal->transparency_um[1];
    const double eps = 1e-9;
    switch (p) {
    case DK_TOL_TEMPERATURE:
        *step = 0.01, *lo = fmax(x0 - 300, -273), *hi = x0 + 300;
        return;
    case DK_TOL_SIGNAL:
        *step = 1e-5 * x0;
        if (d->shg) {
            /* fundamental and its harmonic inside the transparency */
            *lo = 2 * t0 * (1 + eps), *hi = t1 * (1 - eps);
        } else {
            /* pump fixed: signal and idler both inside */
            double ip = 1 / d->waves.pump_um;
            *lo = fmax(t0, 1 / (ip - 1 / t1)) * (1 + eps);
            *hi = ip > 1 / t0 ? fmin(t1, 1 / (ip - 1 / t0)) : t1;
            *hi *= 1 - eps;
        }
        break;
    case DK_TOL_PUMP: {
        /* signal fixed: the idler 1/(1/λp − 1/λs) inside */
        double is = 1 / d->waves.signal_um;
        *step = 1e-5 * x0;
        *lo = fmax(t0, 1 / (is + 1 / t0)) * (1 + eps);
        *hi = fmin(1 / (is + 1 / t1), d->waves.signal_um) * (1 - eps);
        break;
    }
    case DK_TOL_THETA:
        *step = 1e-5, *lo = fmax(0, x0 - M_PI / 4);
        *hi = fmin(M_PI, x0 + M_PI / 4);
        break;
    case DK_TOL_PHI:
        *step = 1e-5, *lo = x0 - M_PI / 4, *hi = x0 + M_PI / 4;
        break;
    case DK_TOL_PERIOD:
        *step = 1e-4 * x0, *lo = 0.5 * x0, *hi = 2 * x0;
        break;
    case DK_TOL_TILT:
        *step = 1e-4, *lo = -1.2, *hi = 1.2;
        break;
    }
    /* The operating point is always inside. */
    *lo = fmin(*lo, x0);
    *hi = fmax(*hi, x0);
}

dk_status
dk_design_tolerance(dk_design *d, dk_tol_param p, dk_acceptance *out,
                    dk_error *err)
{
    if (!dk_design_applies(d, p))
        return dk_error_set(err, DK_EINVAL,
                            "this acceptance does not apply to the design");
    if (!(d->length_mm > 0))
        return dk_error_set(err, DK_EINVAL,
                            "an acceptance needs the crystal length (e.g. "
                            "--length 10mm)");
    double x0 = dk_design_operating_value(d, p);
    double step, lo, hi;
    domain_of(d, p, x0, &step, &lo, &hi);
    probe pr;
    probe_init(&pr, d, p);
    dk_status s = dk_acceptance_fwhm(dk_at, &pr, x0, d->length_mm * 1e3, step,
                                     lo, hi, out, err);
    if (s)
        return s;
    if (p == DK_TOL_TILT) {
        /* The tilt curve is even in δ: its peak is δ = 0 by symmetry. */
        out->peak = 0;
    }
    return DK_OK;
}

dk_status
dk_design_acceptance_lobes(dk_design *d, dk_tol_param p, dk_acceptance *acc,
                           dk_acceptance_lobes *lobes, double domain[2],
                           dk_error *err)
{
    dk_status s = dk_design_tolerance(d, p, acc, err);
    if (s)
        return s;
    double x0 = dk_design_operating_value(d, p), step, lo, hi;
    domain_of(d, p, x0, &step, &lo, &hi);
    if (domain)
        domain[0] = lo, domain[1] = hi;
    probe pr;
    probe_init(&pr, d, p);
    return dk_acceptance_lobes_scan(dk_at, &pr, d->length_mm * 1e3, lo, hi,
                                    LOBE_SAMPLES, acc, lobes, err);
}

dk_status
dk_design_acceptance_curve(dk_design *d, dk_tol_param p, double span_fwhm,
                           int n, double *x, double *sinc2,
                           dk_acceptance *acc, dk_error *err)
{
    if (n < 2 || !(span_fwhm > 0))
        return dk_error_set(err, DK_EINVAL,
                            "an acceptance curve needs 2 or more points");
    dk_acceptance_lobes lb;
    double dom[2];
    dk_status s = dk_design_acceptance_lobes(d, p, acc, &lb, dom, err);
    if (s)
        return s;
    /* Span the outermost half-maximum points (every lobe), centred on
     * them, @span_fwhm times their distance each way, inside the domain. */
    double a = acc->lo, b = acc->hi;
    if (lb.n > 0)
        a = fmin(a, lb.lo[0]), b = fmax(b, lb.hi[lb.n - 1]);
    if (!isfinite(a) || !isfinite(b) || !(b > a))
        return dk_error_set(err, DK_ENOROOT,
                            "the acceptance curve could not be bounded");
    double c = 0.5 * (a + b), w = b - a;
    double x0 = fmax(dom[0], c - span_fwhm * w),
           x1 = fmin(dom[1], c + span_fwhm * w);
    probe pr;
    probe_init(&pr, d, p);
    for (int k = 0; k < n; k++) {
        x[k] = x0 + (x1 - x0) * k / (n - 1);
        double dk = dk_at(x[k], &pr);
        sinc2[k] = isfinite(dk) ? dk_sinc2(dk, d->length_mm * 1e3) : NAN;
    }
    return DK_OK;
}
