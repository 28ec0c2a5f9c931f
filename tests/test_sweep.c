/*
 * test_sweep.c - sweeps (deltak/sweep.h) and the gain spectrum
 * (deltak/gain_spectrum.h): round trips against the solvers they call,
 * energy conservation, and the limits of the gain formula.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/gain_spectrum.h"
#include "deltak/pulse.h"
#include "deltak/sweep.h"
#include "deltak/units.h"

static dk_sweep s;
static dk_design d;

/* A QPM sweep of MgO:LN pumped at @pump with a given grating. */
static void
qpm_sweep(double pump, double period, double temp)
{
    dk_design_request rq;
    dk_design_request_init(&rq);
    rq.crystal = dk_db_find(db, "MgO:LN");
    rq.set_name = rq.crystal->sets[0].name;
    rq.waves.pump_um = pump;
    rq.temp_c = temp;
    rq.period_um = period;
    rq.length_mm = 20;
    rq.temp_range_c[0] = 0;
    rq.temp_range_c[1] = 250;
    assert_int_equal(dk_design_setup(&rq, &d, NULL), DK_OK);
    dk_sweep_init(&s, &d);
}

static void
qpm_round_trips(void **state)
{
    (void)state;
    qpm_sweep(1.064, 30.5, 40);
    double v[16];
    int n;
    assert_int_equal(dk_sweep_solve(&s, DK_VAR_WAVELENGTHS, v, 16, &n, NULL),
                     DK_OK);
    assert_int_equal(n, 2);
    /* Energy conservation (common practice). */
    assert_within(1 / v[0] + 1 / v[1], 1 / 1.064, 1e-12, 0);
    /* Idler → period gives the period back. */
    assert_int_equal(dk_sweep_set(&s, DK_VAR_IDLER, v[1], NULL), DK_OK);
    double p[4];
    assert_int_equal(dk_sweep_solve(&s, DK_VAR_PERIOD, p, 4, &n, NULL), DK_OK);
    assert_int_equal(n, 1);
    assert_within(p[0], 30.5, 1e-9, 0);
    /* ... and temperature solves back to 40 C. */
    assert_int_equal(dk_sweep_solve(&s, DK_VAR_TEMP, p, 4, &n, NULL), DK_OK);
    assert_int_equal(n, 1);
    assert_within(p[0], 40, 0, 1e-5);
    /* At that point the phase-matching function peaks at 1. */
    assert_within(dk_sweep_sinc2(&s), 1, 0, 1e-9);
    /* Holding the idler while the pump moves keeps the idler. */
    assert_int_equal(dk_sweep_set(&s, DK_VAR_PUMP, 1.03, NULL), DK_OK);
    assert_within(s.d.waves.idler_um, v[1], 1e-15, 0);
    assert_within(1 / s.d.waves.signal_um + 1 / s.d.waves.idler_um, 1 / 1.03,
                  1e-12, 0);
    assert_int_equal(dk_sweep_set(&s, DK_VAR_THETA, 10, NULL), DK_EINVAL);
}

static void
angle_theta_matches_solver(void **state)
{
    (void)state;
    const dk_crystal *c = dk_db_find(db, "BBO");
    test_design(&d, "BBO", c->sets[0].name, dk_waves_shg(1.064), 1, 25,
                "ooe", DK_SCHEME_ANGLE, 1);
    dk_sweep_init(&s, &d);
    for (double f = 0.7; f < 1.6; f += 0.2) {
        assert_int_equal(dk_sweep_set(&s, DK_VAR_FUNDAMENTAL, f, NULL), DK_OK);
        double th[8];
        int n;
        assert_int_equal(dk_sweep_solve(&s, DK_VAR_THETA, th, 8, &n, NULL),
                         DK_OK);
        assert_int_equal(n, 1);
        dk_angle_problem pb = {c, &c->sets[0], dk_waves_shg(f), 1, 25, 0, 0};
        dk_angle_solution sol[4];
        int ns;
        assert_int_equal(dk_angle_solve(&pb,
                                        &(dk_angle_search){"ooe", NAN, NULL},
                                        sol, 4, &ns, NULL),
                         DK_OK);
        assert_within(th[0], sol[0].theta_rad * 180 / M_PI, 0, 1e-7);
    }
}

/* The gain spectrum: at phase matching G = cosh²(ΓL) (Δk = 0 limit of
 * G = 1 + (Γ/g)² sinh²(gL)); its exact width against the first-order GVM
 * estimate, which is a few per cent narrower at ΓL ≈ 7 (Cerullo & De
 * Silvestri, Rev. Sci. Instrum. 74, 1 (2003)). */
static void
gain_spectrum(void **state)
{
    (void)state;
    const dk_crystal *c = dk_db_find(db, "BBO");
    dk_waves w = {0.8, 1.3, 0};
    dk_waves_complete(&w, NULL);
    test_design(&d, "BBO", c->sets[0].name, w, 0, 25, "ooe", DK_SCHEME_ANGLE,
                3);
    double gamma = 2.3;
    assert_within(dk_design_gain(&d, gamma, 1.3),
                  pow(cosh(gamma * 3), 2), 1e-9, 0);
    double lo, hi;
    assert_int_equal(dk_design_gain_fwhm(&d, gamma, &lo, &hi, NULL), DK_OK);
    assert_true(lo < 1.3 && hi > 1.3);
    double g0 = dk_design_gain(&d, gamma, 1.3);
    assert_within(dk_design_gain(&d, gamma, lo) - 1, 0.5 * (g0 - 1), 1e-6, 0);
    dk_pulse_props pp;
    assert_int_equal(dk_pulse_props_of(&d, &pp, NULL), DK_OK);
    double est;
    assert_int_equal(dk_opa_bandwidth_thz(gamma, 3, pp.gvm_fs_per_mm[2], &est,
                                          NULL),
                     DK_OK);
    double exact = DK_C_M_PER_S * (1 / lo - 1 / hi) * 1e-6;
    assert_true(est < exact && est > 0.8 * exact);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(qpm_round_trips),
        cmocka_unit_test(angle_theta_matches_solver),
        cmocka_unit_test(gain_spectrum),
    };
    return cmocka_run_group_tests_name("sweep", tests, db_setup, db_teardown);
}
