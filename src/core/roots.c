/*
 * roots.c - bracket by scanning, refine with Brent (see deltak/roots.h).
 */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_roots.h>
#include <math.h>
#include <stdlib.h>

#include "core/gsl_guard.h"
#include "roots_sampled.h"

#include "deltak/roots.h"

#define MAX_ITER 200   /* Brent converges superlinearly; 200 is ample */

typedef struct wrap {
    dk_scalar_fn f;
    void *params;
} wrap;

static double
call(double x, void *p)
{
    wrap *w = p;
    return w->f(x, w->params);
}

static dk_status
dk_root_bracketed_impl(dk_scalar_fn f, void *params, double lo, double hi,
                  double xtol, double *root, dk_error *err)
{
    double flo = f(lo, params), fhi = f(hi, params);
    if (flo == 0) {
        *root = lo;
        return DK_OK;
    }
    if (fhi == 0) {
        *root = hi;
        return DK_OK;
    }
    if (!(flo * fhi < 0))
        return dk_error_set(err, DK_EINVAL, "no sign change in [%g, %g]", lo,
                            hi);
    wrap w = {f, params};
    gsl_function gf = {call, &w};
    gsl_root_fsolver *s = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
    if (!s)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    if (gsl_root_fsolver_set(s, &gf, lo, hi) != GSL_SUCCESS) {
        gsl_root_fsolver_free(s);
        return dk_error_set(err, DK_ENOCONV, "root solver could not start "
                                             "in [%g, %g]", lo, hi);
    }
    int status = GSL_CONTINUE;
    for (int i = 0; i < MAX_ITER && status == GSL_CONTINUE; i++) {
        if (gsl_root_fsolver_iterate(s) != GSL_SUCCESS)
            break;
        status = gsl_root_test_interval(gsl_root_fsolver_x_lower(s),
                                        gsl_root_fsolver_x_upper(s), xtol, 0);
    }
    double x = gsl_root_fsolver_root(s);
    gsl_root_fsolver_free(s);
    if (status != GSL_SUCCESS || !isfinite(x))
        return dk_error_set(err, DK_ENOCONV, "root solver did not converge "
                                             "in [%g, %g]", lo, hi);
    *root = x;
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

/* The entry point: GSL's aborting handler off for the call. */
dk_status
dk_root_bracketed(dk_scalar_fn f, void *params, double lo, double hi,
                  double xtol, double *root, dk_error *err)
{
    dk_gsl_guard_enter();
    dk_status s = dk_root_bracketed_impl(f, params, lo, hi, xtol, root, err);
    dk_gsl_guard_leave();
    return s;
}
