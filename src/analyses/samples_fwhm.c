/*
 * samples_fwhm.c - full width at half maximum of uniformly sampled data
 * (a pulse's intensity, a spectrum), between the outermost half-maximum
 * crossings (common practice for pulses with structure). The maximum is
 * the top of the parabola through the three highest samples. Each
 * crossing is refined on the cubic through the four samples around it,
 * by bisection (linear at the array's ends): with ten samples across a
 * Gaussian or sech^2 the width holds to 1e-3, where straight lines between
 * samples miss by 3-6e-3 (tests/test_samples.c).
 */
#include <math.h>
#include <stddef.h>

#include "analyses/samples_fwhm.h"

/* The abscissa (in samples) in [i − 1, i] where y crosses @half, from
 * the cubic through samples i − 2 … i + 1 (linear at the array's ends);
 * y[i − 1] < half ≤ y[i] or the reverse. */
double
dk_samples_crossing(const double *y, size_t n, size_t i, double half)
{
    double lin = (double)(i - 1) + (half - y[i - 1]) / (y[i] - y[i - 1]);
    if (i < 2 || i + 1 >= n)
        return lin;
    const double *p = y + i - 2; /* nodes at −1, 0, 1, 2 relative to i − 1 */
    double a = i - 1.0, lo = 0, hi = 1;
    double flo = p[1] - half;
    for (int it = 0; it < 60; it++) {
        double t = 0.5 * (lo + hi);
        double v = -p[0] * t * (t - 1) * (t - 2) / 6 +
                   p[1] * (t + 1) * (t - 1) * (t - 2) / 2 -
                   p[2] * (t + 1) * t * (t - 2) / 2 +
                   p[3] * (t + 1) * t * (t - 1) / 6 - half;
        if ((v < 0) == (flo < 0))
            lo = t;
        else
            hi = t;
    }
    return a + 0.5 * (lo + hi);
}

/* FWHM of y on a uniform axis of spacing dx, between the outermost
 * half-maximum crossings; NAN when y has no peak or does not fall to half
 * of it inside the array. */
double
dk_samples_fwhm(const double *y, size_t n, double dx)
{
    if (n < 3)
        return NAN;
    size_t im = 0;
    for (size_t i = 1; i < n; i++)
        if (y[i] > y[im])
            im = i;
    /* The top of the parabola through the three samples around the
     * largest: a peak between samples is not cut short. */
    double top = y[im];
    if (im > 0 && im + 1 < n) {
        double c = y[im - 1] - 2 * y[im] + y[im + 1];
        double b = y[im + 1] - y[im - 1];
        if (c < 0)
            top = fmax(top, y[im] - b * b / (8 * c));
    }
    double half = 0.5 * top;
    if (!(half > 0))
        return NAN;
    size_t lo = 0, hi = n - 1;
    while (y[lo] < half)
        lo++;
    while (y[hi] < half)
        hi--;
    if (lo == 0 || hi == n - 1)
        return NAN;
    double xl = dk_samples_crossing(y, n, lo, half);
    double xr = dk_samples_crossing(y, n, hi + 1, half);
    return (xr - xl) * dx;
}
