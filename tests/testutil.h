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

#endif /* DK_TESTUTIL_H */
