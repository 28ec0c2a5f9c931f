/*
 * roots.h - every root of a scalar function in an interval.
 *
 * Phase-matching curves turn over, so a solver that stops at the first
 * root hides the second branch. dk_roots_all() samples the interval on a
 * uniform grid, brackets each sign change, and refines each bracket with
 * GSL's Brent solver. A point where the function is not finite breaks
 * the bracket (no root is reported across it). Roots where the function
 * touches zero without changing sign are found only if a sample lands on
 * them; the callers that need those (turning points) look for minima of
 * |f| separately.
 *
 * Reference: R. P. Brent, Algorithms for Minimization without Derivatives,
 * Prentice-Hall (1973), ch. 4; GSL manual, "One Dimensional Root-Finding".
 */
#ifndef DK_ROOTS_H
#define DK_ROOTS_H

#include "deltak/status.h"

/* f(x) for root finding; return NAN where undefined. */
typedef double (*dk_scalar_fn)(double x, void *params);

/* The largest scan grid dk_roots_all() takes. */
#define DK_ROOTS_MAX_SCAN 1000000

/*
 * dk_roots_all:
 * @f, @params: the function
 * @lo, @hi: the interval, lo < hi
 * @nscan: grid intervals for bracketing, ≥ 1
 * @xtol: absolute tolerance on each root, > 0
 * @roots: out, up to @maxroots roots in increasing order
 * @nroots: out, how many were found (0 is not an error)
 *
 * Returns: DK_OK; DK_EINVAL for a bad interval or tolerance; DK_ENOCONV
 * if Brent's method failed to converge in a bracket.
 */
dk_status dk_roots_all(dk_scalar_fn f, void *params, double lo, double hi,
                       int nscan, double xtol, double *roots, int maxroots,
                       int *nroots, dk_error *err);

/*
 * dk_root_bracketed:
 * One root in [lo, hi] where f(lo) and f(hi) differ in sign.
 * Returns: DK_OK, DK_EINVAL (no sign change), DK_ENOCONV.
 */
dk_status dk_root_bracketed(dk_scalar_fn f, void *params, double lo,
                            double hi, double xtol, double *root,
                            dk_error *err);

#endif /* DK_ROOTS_H */
