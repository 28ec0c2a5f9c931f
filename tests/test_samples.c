/*
 * test_samples.c - the FWHM of sampled data (analyses/samples_fwhm.h)
 * against shapes whose width is known in closed form: a Gaussian
 * exp(−x²/2σ²) has FWHM 2 sqrt(2 ln 2) σ, sech²(x/T) has 2 acosh(√2) T
 * (both textbook results), and the cases that must give NaN.
 */
#include "testutil.h"

#include "analyses/samples_fwhm.h"

enum { N = 257 };

static void
sample(double (*shape)(double), double dx, double shift, double *y)
{
    for (int i = 0; i < N; i++)
        y[i] = shape((i - N / 2) * dx - shift);
}

static double
gauss(double x)
{
    return exp(-x * x / 2);
}

static double
sech2(double x)
{
    double c = cosh(x);
    return 1 / (c * c);
}

/* Sampling from 47 down to 4.4 samples across the width, the peak on and
 * off the grid. With 10 or more samples across, the width holds to 1e-3
 * (straight lines between samples and the top sample as the peak: 3e-3
 * for the Gaussian, 6e-3 for sech^2); at 4.4 to 6 samples, to 1e-2
 * (straight lines: 1.3e-2 and 2.7e-2). */
static void
known_widths(void **state)
{
    (void)state;
    const double g = 2 * sqrt(2 * log(2.0)), s = 2 * acosh(sqrt(2.0));
    double y[N];
    for (double dx = 0.05; dx <= 0.6; dx *= 2)
        for (double shift = 0; shift < 1; shift += 0.37) {
            sample(gauss, dx, shift * dx, y);
            double tol = dx <= 0.2 ? 1e-3 : 1e-2;
            double w = dk_samples_fwhm(y, N, dx);
            if (fabs(w - g) > tol * g)
                fail_msg("Gaussian, dx %g, shift %g: FWHM %.6f, exact %.6f",
                         dx, shift, w, g);
            sample(sech2, dx, shift * dx, y);
            w = dk_samples_fwhm(y, N, dx);
            if (fabs(w - s) > tol * s)
                fail_msg("sech^2, dx %g, shift %g: FWHM %.6f, exact %.6f", dx,
                         shift, w, s);
        }
}

static void
must_be_nan(void **state)
{
    (void)state;
    double y[N];
    for (int i = 0; i < N; i++)
        y[i] = 0;
    assert_true(isnan(dk_samples_fwhm(y, N, 1)));     /* no peak */
    sample(gauss, 1e-3, 0, y);                        /* wider than the array */
    assert_true(isnan(dk_samples_fwhm(y, N, 1e-3)));
    sample(gauss, 0.1, 12, y);                        /* cut by the edge */
    assert_true(isnan(dk_samples_fwhm(y, N, 0.1)));
    assert_true(isnan(dk_samples_fwhm(y, 2, 0.1)));   /* too few samples */
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(known_widths),
        cmocka_unit_test(must_be_nan),
    };
    return cmocka_run_group_tests_name("samples", tests, NULL, NULL);
}
