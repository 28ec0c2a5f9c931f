/*
 * test_design.c - the design layer (deltak/design.h): which solution,
 * which set, which scheme and modes, and the range policy; and that the
 * analyses follow the design it makes.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/gain_spectrum.h"
#include "deltak/sweep.h"

#define DEG (M_PI / 180)

static dk_design d, e;

static void
request(dk_design_request *rq, const char *crystal)
{
    dk_design_request_init(rq);
    rq->crystal = dk_db_find(db, crystal);
    assert_non_null(rq->crystal);
    rq->crystal_name = crystal;
}

/* BIBO type-I SHG: the cut the trade uses is θ ≈ 168.8° at 1064 nm and
 * ≈ 151.2° at 800 nm in the YZ plane, where the measured tensor gives the
 * largest d_eff (Hellwig, Liebertz, Bohatý, Solid State Commun. 109, 249
 * (1999); the angles as quoted by crystal suppliers, from memory). Both
 * cuts, θ and 180° − θ, must be listed. */
static void
bibo_default_cut(void **state)
{
    (void)state;
    static const struct {
        double fund, theta;
    } cases[] = {{1.064, 168.8}, {0.8, 151.2}};
    for (size_t i = 0; i < 2; i++) {
        dk_design_request rq;
        request(&rq, "BIBO");
        rq.waves = dk_waves_shg(cases[i].fund);
        rq.shg = 1;
        rq.type = "I";
        dk_error err = {0};
        assert_int_equal(dk_design_resolve(&rq, &d, &err), DK_OK);
        assert_published(d.theta_rad / DEG, cases[i].theta, 0, 0.3,
                         "BIBO type-I SHG default cut (deg)",
                         "supplier cut angles, from memory");
        assert_string_equal(d.plane, "YZ");
        int twin = 0;
        for (int k = 0; k < d.nsol; k++)
            twin |= fabs(d.sol[k].theta_rad / DEG - (180 - cases[i].theta)) <
                    0.3;
        assert_true(twin);
        for (int k = 0; k < d.nsol; k++)
            assert_true(d.sol[k].deff_pm_per_v <=
                        d.sol[d.chosen].deff_pm_per_v + 1e-12);
    }
}

/* LBO type II and LGS type I: the design other commands analyse is the
 * solution with the largest |d_eff|, never one where d_eff vanishes. */
static void
largest_deff_for_analyses(void **state)
{
    (void)state;
    dk_design_request rq;
    request(&rq, "LBO");
    rq.waves = dk_waves_shg(1.064);
    rq.shg = 1;
    rq.type = "II";
    rq.length_mm = 10;
    assert_int_equal(dk_design_resolve(&rq, &d, NULL), DK_OK);
    assert_true(dk_design_deff(&d) > 0.1);
    double eta;
    assert_int_equal(dk_design_shg_plane(&d, dk_design_deff(&d), 1, &eta,
                                         NULL),
                     DK_OK);
    assert_true(eta > 1e-6);
    request(&rq, "LGS");
    rq.waves = (dk_waves){1.064, 0, 4.0};
    dk_waves_complete(&rq.waves, NULL);
    rq.type = "I";
    rq.length_mm = 5;
    assert_int_equal(dk_design_resolve(&rq, &d, NULL), DK_OK);
    dk_opa_result r;
    dk_error err = {0};
    assert_int_equal(dk_design_opa(&d, 1, &r, &err), DK_OK);
    assert_true(r.gain > 1.5);
}

/* A sweep of d_eff follows the phase-matched design: at each point it
 * equals what `angle` chooses for that wavelength (BBO type-I SHG). */
static void
sweep_deff_follows_angle(void **state)
{
    (void)state;
    dk_design_request rq;
    request(&rq, "BBO");
    rq.set_name = "Tamosauskas2018";
    rq.waves = dk_waves_shg(1.064);
    rq.shg = 1;
    rq.type = "I";
    assert_int_equal(dk_design_resolve(&rq, &d, NULL), DK_OK);
    dk_sweep_spec sp = {0};
    sp.x = DK_VAR_FUNDAMENTAL;
    sp.x_lo = 0.5, sp.x_hi = 1.5, sp.nx = 6;
    sp.quantity = DK_SWEEP_DEFF;
    dk_sweep_result res;
    assert_int_equal(dk_sweep_curves(&d, &sp, &res, NULL), DK_OK);
    assert_int_equal(res.nseries, 1);
    for (int i = 0; i < sp.nx; i++) {
        rq.waves = dk_waves_shg(res.series[0].x[i]);
        assert_int_equal(dk_design_resolve(&rq, &e, NULL), DK_OK);
        assert_within(res.series[0].y[i], dk_design_deff(&e), 1e-9, 0);
    }
    /* And d_eff changes along the curve (1.34 to 2.09 pm/V). */
    assert_true(res.series[0].y[0] < 0.8 * res.series[0].y[5]);
    dk_sweep_result_free(&res);
}

/* A noncollinear BBO OPA pumped at 400 nm at its broadband angle: the
 * signal acceptance and the gain bandwidth at 600 nm are several times
 * the collinear ones (Cerullo & De Silvestri, Rev. Sci. Instrum. 74, 1
 * (2003), §IV: the group-velocity-matched geometry), and the projected
 * signal-idler GVM vanishes there. */
static void
noncollinear_broadband(void **state)
{
    (void)state;
    dk_design_request rq;
    request(&rq, "BBO");
    rq.set_name = "Tamosauskas2018";
    rq.waves = (dk_waves){0.4, 0.6, 0};
    dk_waves_complete(&rq.waves, NULL);
    rq.type = "I";
    rq.length_mm = 2;
    assert_int_equal(dk_design_resolve(&rq, &d, NULL), DK_OK);
    rq.broadband = 1;
    assert_int_equal(dk_design_resolve(&rq, &e, NULL), DK_OK);
    assert_within(e.angle.alpha_rad / DEG, 3.7, 0, 0.25);
    dk_acceptance a, b;
    assert_int_equal(dk_design_tolerance(&d, DK_TOL_SIGNAL, &a, NULL), DK_OK);
    assert_int_equal(dk_design_tolerance(&e, DK_TOL_SIGNAL, &b, NULL), DK_OK);
    assert_true(b.fwhm > 5 * a.fwhm);
    double lo1, hi1, lo2, hi2;
    assert_int_equal(dk_design_gain_fwhm(&d, 2, &lo1, &hi1, NULL), DK_OK);
    assert_int_equal(dk_design_gain_fwhm(&e, 2, &lo2, &hi2, NULL), DK_OK);
    assert_true(hi2 - lo2 > 5 * (hi1 - lo1));
    dk_pulse_props pp;
    assert_int_equal(dk_pulse_props_of(&e, &pp, NULL), DK_OK);
    assert_true(pp.noncollinear);
    assert_within(pp.gvm_fs_per_mm[2], 0, 0, 1e-6);
}

/* The choices are recorded, and a request that cannot be met says why. */
static void
choices_and_refusals(void **state)
{
    (void)state;
    dk_design_request rq;
    dk_error err = {0};
    /* PPKTP type II at degeneracy: the QPM default set and one ordering
     * (crystal-data-resolved.md §9: 46.22 um with Fradkin + König–Wong). */
    request(&rq, "PPKTP");
    rq.waves = (dk_waves){0.775, 1.55, 1.55};
    rq.type = "II";
    assert_int_equal(dk_design_resolve(&rq, &d, &err), DK_OK);
    assert_published(d.period_um, 46.1, 0, 0.3, "PPKTP 775 -> 1550 type II",
                     "common practice, about 46.1-46.2 um");
    assert_string_equal(d.pol, "YZY");
    int noted = 0;
    for (int i = 0; i < d.notes.n; i++)
        noted |= !strcmp(d.notes.item[i].code, "default-set");
    assert_true(noted);
    /* Away from degeneracy type II is ambiguous in QPM. */
    rq.waves = (dk_waves){0.775, 1.5, 0};
    dk_waves_complete(&rq.waves, NULL);
    assert_int_equal(dk_design_resolve(&rq, &d, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "ambiguous"));
    /* A pump below the transparency edge is an error naming the wave. */
    request(&rq, "ZGP");
    rq.waves = (dk_waves){0.72, 1.2, 0};
    dk_waves_complete(&rq.waves, NULL);
    assert_int_equal(dk_design_resolve(&rq, &d, &err), DK_ERANGE);
    assert_non_null(strstr(err.msg, "the pump"));
    /* An even QPM order at 50 % duty couples nothing. */
    request(&rq, "MgO:LN");
    rq.waves = dk_waves_shg(1.064);
    rq.shg = 1;
    rq.order = 2;
    assert_int_equal(dk_design_resolve(&rq, &d, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "even QPM order"));
}

/* Range flags name the wave that is outside: BIBO Umemura2007 is fitted
 * over 0.48-3.1 um, so for SHG of 800 nm the 0.4 um harmonic (the pump)
 * is outside, not the fundamental. */
static void
range_names_the_wave(void **state)
{
    (void)state;
    dk_design_request rq;
    request(&rq, "BIBO");
    rq.set_name = "Umemura2007";
    rq.waves = dk_waves_shg(0.8);
    rq.shg = 1;
    rq.type = "I";
    assert_int_equal(dk_design_resolve(&rq, &d, NULL), DK_OK);
    assert_int_equal(d.sol[d.chosen].range, DK_RANGE_PUMP);
    int found = 0;
    for (int i = 0; i < d.notes.n; i++)
        found |= strstr(d.notes.item[i].text, "the second harmonic 0.4 um") !=
                 NULL;
    assert_true(found);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(bibo_default_cut),
        cmocka_unit_test(largest_deff_for_analyses),
        cmocka_unit_test(sweep_deff_follows_angle),
        cmocka_unit_test(noncollinear_broadband),
        cmocka_unit_test(choices_and_refusals),
        cmocka_unit_test(range_names_the_wave),
    };
    return cmocka_run_group_tests_name("design", tests, db_setup, db_teardown);
}
