/*
 * roots_sampled.h - dk_roots_all() for callers that evaluated the scan
 * grid themselves (a vectorised batch, a continuation that knows most
 * signs already): the same grid, the same bracketing rules and the same
 * Brent refinement, so the roots are those dk_roots_all() would return
 * (internal).
 *
 * Grid: x_i = lo + (hi − lo)·i/nscan, i = 0..nscan (exactly the
 * expression dk_roots_all() uses). A root is reported at a node where f is
 * exactly 0, and in each interval whose two ends are finite and of
 * opposite sign (Brent, deltak/roots.h).
 */
#ifndef DK_ROOTS_SAMPLED_H
#define DK_ROOTS_SAMPLED_H

#include "deltak/roots.h"

/* The i-th node of the grid. */
static inline double
dk_scan_node(double lo, double hi, int nscan, int i)
{
    return lo + (hi - lo) * i / nscan;
}

/*
 * dk_roots_sampled:
 * @values: f at the nscan + 1 nodes (NAN where undefined)
 * Other arguments and the result as dk_roots_all().
 */
dk_status dk_roots_sampled(dk_scalar_fn f, void *params, double lo,
                           double hi, int nscan, const double *values,
                           double xtol, double *roots, int maxroots,
                           int *nroots, dk_error *err);

#endif /* DK_ROOTS_SAMPLED_H */
