/*
 * roots_sampled.c - every root of an interval (deltak/roots.h,
 * roots_sampled.h): dk_roots_all() samples the scan grid, and
 * dk_roots_sampled() brackets over a sampled grid (its own or a caller's)
 * and refines each bracket with dk_root_bracketed() (roots.c).
 */
#include <math.h>
#include <stdlib.h>

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

dk_status
dk_roots_all(dk_scalar_fn f, void *params, double lo, double hi, int nscan,
             double xtol, double *roots, int maxroots, int *nroots,
             dk_error *err)
{
    *nroots = 0;
    if (!(lo < hi) || !isfinite(lo) || !isfinite(hi) || nscan < 1 ||
        nscan > DK_ROOTS_MAX_SCAN || !(xtol > 0))
        return dk_error_set(err, DK_EINVAL,
                            "bad search interval [%g, %g], grid of %d or "
                            "tolerance",
                            lo, hi, nscan);
    /* Sample the grid, then bracket: one loop for every caller
     * (roots_sampled.c), whether it samples here or in a batch. */
    double stack[1025], *v = nscan < 1025 ? stack
                                          : malloc(((size_t)nscan + 1) *
                                                   sizeof *v);
    if (!v)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    for (int i = 0; i <= nscan; i++)
        v[i] = f(dk_scan_node(lo, hi, nscan, i), params);
    dk_status s = dk_roots_sampled(f, params, lo, hi, nscan, v, xtol, roots,
                                   maxroots, nroots, err);
    if (v != stack)
        free(v);
    return s;
}
