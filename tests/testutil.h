/*
 * testutil.h - helpers shared by the cmocka tests.
 */
#ifndef DK_TESTUTIL_H
#define DK_TESTUTIL_H

#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>

/* |a - b| <= epsabs + epsrel·|b|, reporting both values on failure. */
#define assert_within(a, b, epsrel, epsabs)                                   \
    do {                                                                      \
        double a_ = (a), b_ = (b);                                            \
        if (!(fabs(a_ - b_) <= (epsabs) + (epsrel) * fabs(b_))) {             \
            print_error("%s = %.12g, expected %.12g (tolerance %g + %g rel)\n", \
                        #a, a_, b_, (double)(epsabs), (double)(epsrel));      \
            fail();                                                           \
        }                                                                     \
    } while (0)

/* A check against the outside world: on failure the message names the
 * case and its source, not only the numbers. */
#define assert_published(a, b, epsrel, epsabs, what, source)                 \
    do {                                                                      \
        double a_ = (a), b_ = (b);                                            \
        if (!(fabs(a_ - b_) <= (epsabs) + (epsrel) * fabs(b_))) {             \
            print_error("%s: got %.10g, published %.10g (tolerance %g + %g "  \
                        "rel; source: %s)\n",                                 \
                        (what), a_, b_, (double)(epsabs), (double)(epsrel),   \
                        (source));                                            \
            fail();                                                           \
        }                                                                     \
    } while (0)

#ifdef DK_TEST_WITH_DB
/* The shipped crystal database, loaded once per test group. */
#include "deltak/crystal.h"

static dk_db *db;

static int
db_setup(void **state)
{
    (void)state;
    dk_error err = {0};
    return dk_db_load(DK_CRYSTAL_DIR, &db, &err) == DK_OK ? 0 : -1;
}

static int
db_teardown(void **state)
{
    (void)state;
    dk_db_free(db);
    return 0;
}

#include "deltak/design.h"

/* A design resolved by the design layer, as the commands make it: crystal
 * and set by name (set NULL: the default), waves (shg: signal = idler =
 * fundamental), temperature (NAN: default), modes or axes (NULL: the
 * default rule), scheme, length (NAN: none). Fails the test on error. */
static inline void
test_design(dk_design *d, const char *crystal, const char *set, dk_waves w,
            int shg, double temp_c, const char *pol, dk_scheme scheme,
            double length_mm)
{
    dk_design_request rq;
    dk_design_request_init(&rq);
    rq.crystal = dk_db_find(db, crystal);
    assert_non_null(rq.crystal);
    rq.set_name = set;
    rq.waves = w;
    rq.shg = shg;
    rq.temp_c = temp_c;
    rq.pol = pol;
    rq.scheme = scheme;
    rq.length_mm = length_mm;
    dk_error err = {0};
    if (dk_design_resolve(&rq, d, &err)) {
        print_error("design %s %s: %s\n", crystal, set ? set : "", err.msg);
        fail();
    }
}
#endif

#endif /* DK_TESTUTIL_H */
