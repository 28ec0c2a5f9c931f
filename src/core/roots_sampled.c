/*
 * roots_sampled.c - the bracketing loop of dk_roots_all() over values
 * sampled by the caller (see roots_sampled.h).
 */
#include <math.h>

#include "roots_sampled.h"

dk_status
dk_roots_sampled(dk_scalar_fn f, void *params, double lo, double hi,
                 int nscan, const double *values, double xtol, double *roots,
                 int maxroots, int *nroots, dk_error *err)
{
    *nroots = 0;
    if (!(lo < hi) || !isfinite(lo) || !isfinite(hi) || nscan < 1 ||
        !(xtol > 0))
        return dk_error_set(err, DK_EINVAL,
                            "bad search interval [%g, %g] or tolerance", lo,
                            hi);
    double x0 = lo, f0 = values[0];
    for (int i = 1; i <= nscan && *nroots < maxroots; i++) {
        double x1 = dk_scan_node(lo, hi, nscan, i), f1 = values[i];
        if (isfinite(f0) && isfinite(f1)) {
            if (f0 == 0) {
                if (*nroots == 0 || roots[*nroots - 1] != x0)
                    roots[(*nroots)++] = x0;
            } else if (f0 * f1 < 0) {
                double r;
                dk_status s = dk_root_bracketed(f, params, x0, x1, xtol, &r,
                                                err);
                if (s)
                    return s;
                roots[(*nroots)++] = r;
            }
            if (i == nscan && f1 == 0 && *nroots < maxroots)
                roots[(*nroots)++] = x1;
        }
        x0 = x1;
        f0 = f1;
    }
    return DK_OK;
}
