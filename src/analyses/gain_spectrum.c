/*
 * gain_spectrum.c - parametric gain against signal wavelength and its
 * FWHM (see deltak/gain_spectrum.h).
 */
#include <math.h>

#include "deltak/gain_spectrum.h"
#include "deltak/roots.h"

#define STEP_REL 1e-4     /* first outward step, relative to λs */
#define GROWTH 1.5
#define REACH 0.3         /* search at most ±30 % of λs */

double
dk_design_gain(dk_design *d, double gamma_per_mm, double signal_um)
{
    double dk = dk_design_delta_k(d, DK_TOL_SIGNAL, signal_um);
    double g;
    if (!isfinite(dk) ||
        dk_opa_signal_gain(gamma_per_mm, dk * 1e3, d->length_mm, &g, NULL))
        return NAN;
    return g;
}

typedef struct half_probe {
    dk_design *d;
    double gamma, half;   /* half = (G0 − 1)/2 */
} half_probe;

static double
above_half(double x, void *p)
{
    half_probe *h = p;
    double g = dk_design_gain(h->d, h->gamma, x);
    return isfinite(g) ? g - 1 - h->half : NAN;
}

static int
edge(half_probe *h, double x0, int dir, double *out)
{
    double a = x0, fa = above_half(a, h), s = STEP_REL * x0;
    while (fabs(a - x0) < REACH * x0) {
        double b = a + dir * s, fb = above_half(b, h);
        if (!isfinite(fb))
            return 0;
        if (fa > 0 && fb <= 0)
            return !dk_root_bracketed(above_half, h, fmin(a, b), fmax(a, b),
                                      1e-12 * x0, out, NULL);
        a = b, fa = fb, s *= GROWTH;
    }
    return 0;
}

dk_status
dk_design_gain_fwhm(dk_design *d, double gamma_per_mm, double *lo_um,
                    double *hi_um, dk_error *err)
{
    double x0 = d->waves.signal_um;
    double g0 = dk_design_gain(d, gamma_per_mm, x0);
    if (!isfinite(g0))
        return dk_error_set(err, DK_EDOM, "the gain is not finite at the "
                                          "operating point");
    half_probe h = {d, gamma_per_mm, 0.5 * (g0 - 1)};
    if (!(h.half > 0))
        return dk_error_set(err, DK_EDOM, "no gain at the operating point");
    if (!edge(&h, x0, -1, lo_um) || !edge(&h, x0, +1, hi_um))
        return dk_error_set(err, DK_ENOROOT,
                            "the gain band reaches beyond 30 %% of the signal "
                            "wavelength or the crystal's range");
    return DK_OK;
}
