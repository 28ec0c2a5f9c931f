/*
 * roots.c - one root in a bracket, refined with Brent (see deltak/roots.h);
 * every root of an interval is in roots_sampled.c.
 */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_roots.h>
#include <math.h>

#include "core/gsl_guard.h"

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
