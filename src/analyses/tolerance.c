/*
 * tolerance.c - acceptance widths of a design (see deltak/tolerance.h).
 *
 * Each parameter gets a natural step for the outward search (0.01 °C,
 * 0.01 nm relative 1e-5, 1e-5 rad, 1e-4 of the period) and a search range
 * wide enough for noncritical widths (±300 °C, ±30 % in wavelength,
 * ±0.5 rad, ±20 % in period) but limited to where the model is defined.
 */
#include <math.h>
#include <string.h>

#include "deltak/material.h"
#include "deltak/tolerance.h"

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

typedef struct probe {
    dk_design *d;
    dk_tol_param p;
} probe;

static double
dk_at(double x, void *pp)
{
    probe *pr = pp;
    return dk_design_delta_k(pr->d, pr->p, x);
}

dk_status
dk_design_tolerance(dk_design *d, dk_tol_param p, dk_acceptance *out,
                    dk_error *err)
{
    if (!dk_design_applies(d, p))
        return dk_error_set(err, DK_EINVAL,
                            "this acceptance does not apply to the design");
    double x0 = dk_design_operating_value(d, p);
    double step, lo, hi;
    switch (p) {
    case DK_TOL_TEMPERATURE:
        step = 0.01, lo = x0 - 300, hi = x0 + 300;
        lo = fmax(lo, -270);
        break;
    case DK_TOL_SIGNAL:
    case DK_TOL_PUMP:
        step = 1e-5 * x0, lo = 0.7 * x0, hi = 1.3 * x0;
        if (p == DK_TOL_SIGNAL && !d->shg)
            lo = fmax(lo, d->waves.pump_um * (1 + 1e-6));
        if (p == DK_TOL_PUMP)
            hi = fmin(hi, d->waves.signal_um * (1 - 1e-6));
        break;
    case DK_TOL_THETA:
    case DK_TOL_PHI:
        step = 1e-5, lo = x0 - 0.5, hi = x0 + 0.5;
        break;
    case DK_TOL_PERIOD:
        step = 1e-4 * x0, lo = 0.8 * x0, hi = 1.2 * x0;
        break;
    case DK_TOL_TILT:
        step = 1e-4, lo = -0.5, hi = 0.5;
        break;
    default:
        return dk_error_set(err, DK_EINVAL, "unknown acceptance parameter");
    }
    probe pr = {d, p};
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
dk_design_acceptance_curve(dk_design *d, dk_tol_param p, double span_fwhm,
                           int n, double *x, double *sinc2,
                           dk_acceptance *acc, dk_error *err)
{
    if (n < 2 || !(span_fwhm > 0))
        return dk_error_set(err, DK_EINVAL,
                            "an acceptance curve needs 2 or more points");
    dk_status s = dk_design_tolerance(d, p, acc, err);
    if (s)
        return s;
    if (!acc->bounded)
        return dk_error_set(err, DK_ENOROOT,
                            "the acceptance is unbounded in the search "
                            "range; no curve to draw");
    double w = acc->fwhm, x0 = acc->peak;
    for (int k = 0; k < n; k++) {
        x[k] = x0 - span_fwhm * w + 2 * span_fwhm * w * k / (n - 1);
        double dk = dk_design_delta_k(d, p, x[k]);
        sinc2[k] = isfinite(dk) ? dk_sinc2(dk, d->length_mm * 1e3) : NAN;
    }
    return DK_OK;
}
