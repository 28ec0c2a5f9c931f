/*
 * acceptance.c - FWHM of sinc²(ΔkL/2) along one parameter (method and
 * references in deltak/acceptance.h).
 */
#include <math.h>

#include "deltak/acceptance.h"

#define GROWTH 1.6       /* outward step growth factor */
#define MAX_STEPS 200

double
dk_sinc(double x)
{
    return fabs(x) < 1e-4 ? 1 - x * x / 6 : sin(x) / x;
}

double
dk_sinc2(double dk_rad_per_um, double length_um)
{
    double s = dk_sinc(0.5 * dk_rad_per_um * length_um);
    return s * s;
}

typedef struct half_probe {
    dk_scalar_fn dk;
    void *params;
    double half_length;   /* L/2 in µm */
} half_probe;

/* |Δk|·L/2 − u½: negative inside the FWHM, positive outside. */
static double
half_level(double x, void *p)
{
    half_probe *h = p;
    double d = h->dk(x, h->params);
    return isfinite(d) ? fabs(d) * h->half_length - DK_SINC2_HALF_U : NAN;
}

/* Step from @x0 in direction @dir until outside the half maximum; then
 * refine. Returns 1 and *edge on success. */
static int
find_edge(half_probe *h, double x0, double step, int dir, double xmin,
          double xmax, double *edge)
{
    double a = x0, fa = half_level(a, h);
    double s = step;
    for (int i = 0; i < MAX_STEPS; i++) {
        double b = a + dir * s;
        if (b < xmin || b > xmax)
            b = dir > 0 ? xmax : xmin;
        double fb = half_level(b, h);
        if (!isfinite(fb))
            return 0;
        if (fb >= 0 && fa < 0) {
            double lo = fmin(a, b), hi = fmax(a, b), r;
            if (dk_root_bracketed(half_level, h, lo, hi,
                                  1e-12 * fmax(1, fabs(x0)), &r, NULL))
                return 0;
            *edge = r;
            return 1;
        }
        if (b == xmin || b == xmax)
            return 0;
        a = b, fa = fb;
        s *= GROWTH;
    }
    return 0;
}

dk_status
dk_acceptance_fwhm(dk_scalar_fn dk, void *params, double x0,
                   double length_um, double step, double xmin, double xmax,
                   dk_acceptance *out, dk_error *err)
{
    if (!(length_um > 0) || !(step > 0) || !(xmin <= x0 && x0 <= xmax))
        return dk_error_set(err, DK_EINVAL,
                            "bad length, step or search range for the "
                            "acceptance");
    double f0 = dk(x0, params);
    if (!isfinite(f0))
        return dk_error_set(err, DK_EDOM,
                            "phase mismatch is not defined at the operating "
                            "point");
    /* Refine the peak to the zero of Δk near x0, if there is one. */
    double peak = x0;
    for (double s = step; s <= 64 * step && f0 != 0; s *= 2) {
        double a = fmax(xmin, x0 - s), b = fmin(xmax, x0 + s);
        double fa = dk(a, params), fb = dk(b, params);
        if (isfinite(fa) && fa * f0 <= 0 &&
            !dk_root_bracketed(dk, params, a, x0, 1e-13 * fmax(1, fabs(x0)),
                               &peak, NULL))
            break;
        if (isfinite(fb) && fb * f0 <= 0 &&
            !dk_root_bracketed(dk, params, x0, b, 1e-13 * fmax(1, fabs(x0)),
                               &peak, NULL))
            break;
    }
    out->peak = peak;
    /* Derivatives at the peak by central differences. */
    double h = step * 1e-2;
    double fp = dk(peak + h, params), fm = dk(peak - h, params);
    double fc = dk(peak, params);
    out->slope = (fp - fm) / (2 * h);
    double curv = (fp - 2 * fc + fm) / (h * h);
    double lin = 2 * 2 * DK_SINC2_HALF_U / length_um;   /* 2·2.78311/L */
    out->linear_fwhm = fabs(out->slope) > 0 ? lin / fabs(out->slope)
                                            : INFINITY;
    out->quadratic_fwhm = fabs(curv) > 0
                              ? 2 * sqrt(2 * 2 * DK_SINC2_HALF_U /
                                         (length_um * fabs(curv)))
                              : INFINITY;
    half_probe hp = {dk, params, length_um / 2};
    int a = find_edge(&hp, peak, step, -1, xmin, xmax, &out->lo);
    int b = find_edge(&hp, peak, step, +1, xmin, xmax, &out->hi);
    out->bounded = a && b;
    if (!a)
        out->lo = -INFINITY;
    if (!b)
        out->hi = INFINITY;
    out->fwhm = out->hi - out->lo;
    return DK_OK;
}
