/*
 * test_roots.c - the root finder (deltak/roots.h) on labelled problems
 * with known roots, and the cases that must fail, in the manner of GSL's
 * own roots/test.c (every solver against a table of functions, then the
 * failures).
 */
#include <gsl/gsl_errno.h>

#include "testutil.h"

#include "deltak/roots.h"

static double
cubic(double x, void *p)
{
    (void)p;
    return (x - 1) * (x - 2) * (x + 3);   /* roots −3, 1, 2 */
}

static double
trig(double x, void *p)
{
    (void)p;
    return sin(x);   /* roots kπ */
}

static double
touching(double x, void *p)
{
    (void)p;
    return (x - 0.33) * (x - 0.33);   /* a double root: no sign change */
}

static double
grid_cubic(double x, void *p)
{
    (void)p;
    return x * (x - 1) * (x - 2);   /* roots 0, 1, 2 on the scan grid */
}

static double
hole(double x, void *p)
{
    (void)p;
    /* Undefined on (−0.1, 0.1): no root may be reported across it. */
    return fabs(x) < 0.1 ? NAN : x;
}

static double
steep(double x, void *p)
{
    (void)p;
    return tanh(1e4 * (x - 0.123456789));
}

/* Every root of labelled problems, to the tolerance asked. */
static void
known_roots(void **state)
{
    (void)state;
    static const struct {
        const char *name;
        dk_scalar_fn f;
        double lo, hi;
        int nscan;
        int n;
        double roots[4];
    } cases[] = {
        {"cubic (x-1)(x-2)(x+3)", cubic, -5, 5, 100, 3, {-3, 1, 2}},
        {"sin x over [0.5, 10]", trig, 0.5, 10, 200, 3,
         {M_PI, 2 * M_PI, 3 * M_PI}},
        {"steep tanh", steep, 0, 1, 10, 1, {0.123456789}},
        {"roots on grid points and both ends", grid_cubic, 0, 2, 4, 3,
         {0, 1, 2}},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        double r[8];
        int n;
        dk_error err = {0};
        assert_int_equal(dk_roots_all(cases[i].f, NULL, cases[i].lo,
                                      cases[i].hi, cases[i].nscan, 1e-12, r,
                                      8, &n, &err),
                         DK_OK);
        if (n != cases[i].n)
            fail_msg("%s: %d roots, expected %d", cases[i].name, n,
                     cases[i].n);
        for (int k = 0; k < n; k++)
            if (fabs(r[k] - cases[i].roots[k]) > 1e-10)
                fail_msg("%s: root %d = %.15g, expected %.15g", cases[i].name,
                         k, r[k], cases[i].roots[k]);
    }
}

/* What the scan cannot or must not find. */
static void
must_fail(void **state)
{
    (void)state;
    double r[4], root;
    int n;
    dk_error err = {0};
    /* A double root between grid points has no sign change: not found
     * (documented; turning points are sought separately). */
    assert_int_equal(dk_roots_all(touching, NULL, 0, 1, 10, 1e-12, r, 4, &n,
                                  NULL),
                     DK_OK);
    assert_int_equal(n, 0);
    /* No root across an undefined stretch. */
    assert_int_equal(dk_roots_all(hole, NULL, -1, 1, 10, 1e-12, r, 4, &n,
                                  NULL),
                     DK_OK);
    assert_int_equal(n, 0);
    /* Bad intervals and tolerances. */
    assert_int_equal(dk_roots_all(cubic, NULL, 1, 1, 10, 1e-12, r, 4, &n,
                                  &err),
                     DK_EINVAL);
    assert_int_equal(dk_roots_all(cubic, NULL, 0, NAN, 10, 1e-12, r, 4, &n,
                                  NULL),
                     DK_EINVAL);
    assert_int_equal(dk_roots_all(cubic, NULL, 0, 1, 0, 1e-12, r, 4, &n,
                                  NULL),
                     DK_EINVAL);
    assert_int_equal(dk_roots_all(cubic, NULL, 0, 1, 10, 0, r, 4, &n, NULL),
                     DK_EINVAL);
    /* A bracket without a sign change. */
    assert_int_equal(dk_root_bracketed(cubic, NULL, 3, 4, 1e-12, &root,
                                       &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "no sign change"));
    /* More roots than room: the first ones, in order. */
    assert_int_equal(dk_roots_all(trig, NULL, 0.5, 30, 300, 1e-12, r, 2, &n,
                                  NULL),
                     DK_OK);
    assert_int_equal(n, 2);
    assert_within(r[1], 2 * M_PI, 0, 1e-10);
}

/* A host program's own GSL error handler: the root finder maps GSL's
 * failures (here a non-finite value met inside the bracket, which GSL
 * reports through its handler) to a status, never calling the host's
 * handler, and restores it afterwards. */
static int host_calls;

static void
host_handler(const char *reason, const char *file, int line, int gsl_errno)
{
    (void)reason, (void)file, (void)line, (void)gsl_errno;
    host_calls++;
}

static double
nan_inside(double x, void *p)
{
    (void)p;
    return x < -0.5 ? -1 : x > 0.9 ? 1 : NAN;
}

static void
gsl_handler_untouched(void **state)
{
    (void)state;
    gsl_error_handler_t *before = gsl_set_error_handler(host_handler);
    double root;
    dk_error err = {0};
    assert_int_equal(dk_root_bracketed(nan_inside, NULL, -1, 1, 1e-12, &root,
                                       &err),
                     DK_ENOCONV);
    assert_int_equal(host_calls, 0);
    assert_ptr_equal(gsl_set_error_handler(before), host_handler);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(known_roots),
        cmocka_unit_test(must_fail),
        cmocka_unit_test(gsl_handler_untouched),
    };
    return cmocka_run_group_tests_name("roots", tests, NULL, NULL);
}
