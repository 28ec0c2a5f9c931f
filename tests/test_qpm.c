/*
 * test_qpm.c - quasi-phase matching (deltak/qpm.h, deltak/interaction.h).
 *
 * Checks against outside values name their source beside them; the rest
 * are round trips and the mathematics of the solvers.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/qpm.h"

static void
init(dk_qpm *q, const char *crystal, const char *set, const char *pol)
{
    const dk_crystal *c = dk_db_find(db, crystal);
    assert_non_null(c);
    const dk_dispersion_set *s = dk_crystal_find_set(c, set);
    assert_non_null(s);
    dk_error err = {0};
    if (dk_qpm_init(q, c, s, pol, 1, 0.5, 25, &err)) {
        print_error("%s\n", err.msg);
        fail();
    }
}

static double
period_of(dk_qpm *q, dk_waves w, double temp)
{
    double pw, pt;
    dk_error err = {0};
    if (dk_waves_complete(&w, &err) && w.pump_um * w.signal_um * w.idler_um == 0)
        fail_msg("%s", err.msg);
    if (dk_qpm_period(q, &w, temp, &pw, &pt, &err))
        fail_msg("%s", err.msg);
    return pw;
}

/* Energy conservation (common practice): 720 nm − 880 nm → 3.96 µm. */
static void
energy_conservation(void **state)
{
    (void)state;
    dk_waves w = {0.72, 0.88, 0};
    dk_error err = {0};
    assert_int_equal(dk_waves_complete(&w, &err), DK_OK);
    assert_within(w.idler_um, 3.96, 0, 1e-9);
    w = (dk_waves){0, 1.5, 3.4};
    assert_int_equal(dk_waves_complete(&w, &err), DK_OK);
    assert_within(1 / w.pump_um, 1 / 1.5 + 1 / 3.4, 1e-14, 0);
    /* A signal shorter than the pump would need a negative idler. */
    w = (dk_waves){1.064, 0.8, 0};
    assert_int_equal(dk_waves_complete(&w, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "longer than the pump"));
    w = (dk_waves){1.064, 0, 0};
    assert_int_equal(dk_waves_complete(&w, &err), DK_EINVAL);
}

static void
published_periods(void **state)
{
    (void)state;
    static const struct {
        const char *crystal, *set, *pol;
        dk_waves w;
        double temp, period, tol;
        const char *source;
    } cases[] = {
        /* crystal-data-notes §1: Λ = 6.973 µm recomputed from Gayer et al.,
         * Appl. Phys. B 91, 343 (2008), Table, at 25 C. */
        {"MgO:LN", "Gayer2008", NULL, {0.532, 1.064, 1.064}, 25, 6.973, 0.002,
         "Gayer 2008 via notes"},
        /* crystal-data-notes §2, recomputed from Jundt, Opt. Lett. 22,
         * 1553 (1997): SHG 1064 Λ = 6.784 µm; 1.064 → 1.55 + 3.39 µm
         * Λ = 30.06 µm, at 25 C. */
        {"LN", "Jundt1997", NULL, {0.532, 1.064, 1.064}, 25, 6.784, 0.002,
         "Jundt 1997 via notes"},
        {"LN", "Jundt1997", NULL, {1.064, 1.55, 0}, 25, 30.06, 0.02,
         "Jundt 1997 via notes"},
        /* Type-II PPKTP, degenerate 775 → 1550 nm: Λ ≈ 46.1 µm, and
         * 405 → 810 nm: Λ ≈ 10.0 µm, as used in many photon-pair sources
         * near room temperature (from memory). */
        {"PPKTP", "Fradkin1999", "yzy", {0.775, 1.55, 1.55}, 25, 46.1, 0.3,
         "from memory"},
        {"PPKTP", "Fradkin1999", "yzy", {0.405, 0.81, 0.81}, 25, 10.0, 0.1,
         "from memory"},
        /* SHG of 1550 nm in congruent PPLN: Λ ≈ 19 µm near room
         * temperature (from memory). */
        {"LN", "Jundt1997", NULL, {0.775, 1.55, 1.55}, 25, 19.0, 0.3,
         "from memory"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        dk_qpm q;
        char what[128];
        init(&q, cases[i].crystal, cases[i].set, cases[i].pol);
        snprintf(what, sizeof what, "%s %s period, pump %.4g um, signal "
                                    "%.4g um, %.4g C",
                 cases[i].crystal, cases[i].set, cases[i].w.pump_um,
                 cases[i].w.signal_um, cases[i].temp);
        assert_published(period_of(&q, cases[i].w, cases[i].temp),
                         cases[i].period, 0, cases[i].tol, what,
                         cases[i].source);
    }
}

/* A 1064 nm-pumped MgO:PPLN OPO with a 30.5 µm grating gives an idler near
 * 3.4 µm at an oven temperature of a few tens of C, the usual design
 * point of such oscillators (from memory; loose check). */
static void
opo_design_point(void **state)
{
    (void)state;
    dk_qpm q;
    init(&q, "MgO:LN", "Gayer2008", NULL);
    dk_waves sol[8];
    int n;
    dk_error err = {0};
    assert_int_equal(dk_qpm_solve_wavelengths(&q, 1.064, 30.5, 50, sol, 8, &n,
                                              &err),
                     DK_OK);
    assert_int_equal(n, 1);
    assert_published(sol[0].idler_um, 3.4, 0, 0.1,
                     "MgO:PPLN 30.5 um grating, 1064 nm pump, 50 C: idler",
                     "usual design point of such OPOs, from memory");
    assert_true(sol[0].signal_um < sol[0].idler_um);
}

static void
round_trips(void **state)
{
    (void)state;
    dk_qpm q;
    init(&q, "MgO:LN", "Gayer2008", NULL);
    dk_error err = {0};
    /* period → temperature → period */
    dk_waves w = {1.064, 0, 3.4};
    dk_waves_complete(&w, &err);
    double p = period_of(&q, w, 87.5);
    double t[8];
    int n;
    assert_int_equal(dk_qpm_solve_temperature(&q, &w, p, 20, 200, t, 8, &n,
                                              &err),
                     DK_OK);
    assert_int_equal(n, 1);
    assert_within(t[0], 87.5, 0, 1e-4);
    /* period → wavelengths → period */
    dk_waves sol[8];
    assert_int_equal(dk_qpm_solve_wavelengths(&q, 1.064, p, 87.5, sol, 8, &n,
                                              &err),
                     DK_OK);
    assert_int_equal(n, 1);
    assert_within(sol[0].idler_um, 3.4, 0, 1e-6);
    assert_within(period_of(&q, sol[0], 87.5), p, 1e-9, 0);
    /* Type II: signal and idler differ, so x and 1 − x are two solutions. */
    dk_qpm k;
    init(&k, "PPKTP", "Fradkin1999", "yzy");
    dk_waves w2 = {0.775, 1.5, 0};
    dk_waves_complete(&w2, &err);
    double p2 = period_of(&k, w2, 40);
    assert_int_equal(dk_qpm_solve_wavelengths(&k, 0.775, p2, 40, sol, 8, &n,
                                              &err),
                     DK_OK);
    int found = 0;
    for (int i = 0; i < n; i++)
        found += fabs(sol[i].signal_um - 1.5) < 1e-6;
    assert_int_equal(found, 1);
}

/* An invented crystal whose mismatch turns over at 100 C: both
 * temperatures must be found, symmetric about 100 C. */
static void
turning_curve_has_two_roots(void **state)
{
    (void)state;
    dk_crystal *c = NULL;
    dk_error err = {0};
    assert_int_equal(dk_crystal_load(DK_TEST_DATA "/good/turning.yaml", &c,
                                     &err),
                     DK_OK);
    dk_qpm q;
    assert_int_equal(dk_qpm_init(&q, c, &c->sets[0], NULL, 1, 0.5, 25, &err),
                     DK_OK);
    dk_waves w = dk_waves_shg(1.2);
    double p = period_of(&q, w, 140);
    double t[8];
    int n;
    assert_int_equal(dk_qpm_solve_temperature(&q, &w, p, 0, 200, t, 8, &n,
                                              &err),
                     DK_OK);
    assert_int_equal(n, 2);
    assert_within(t[0], 60, 0, 1e-4);
    assert_within(t[1], 140, 0, 1e-4);
    dk_crystal_free(c);
}

/* Kim & Smith, J. Appl. Phys. 40, 4637 (1969): along a, α = 1.54e-5 /C,
 * β = 5.3e-9 /C² about 25 C (crystal-data-notes §1). At 150 C the
 * grating is longer by α·125 + β·125² = 2.0078e-3. */
static void
thermal_expansion_of_period(void **state)
{
    (void)state;
    dk_qpm q;
    init(&q, "MgO:LN", "Gayer2008", NULL);
    dk_waves w = dk_waves_shg(1.064);
    double pw, pt;
    assert_int_equal(dk_qpm_period(&q, &w, 150, &pw, &pt, NULL), DK_OK);
    assert_within(pt / pw - 1, 1.54e-5 * 125 + 5.3e-9 * 125 * 125, 1e-9, 0);
}

static void
deff_and_errors(void **state)
{
    (void)state;
    /* (2/πm) sin(πmD): Fejer et al., IEEE JQE 28, 2631 (1992), eq. 11. */
    assert_within(dk_qpm_deff_factor(1, 0.5), 2 / M_PI, 1e-15, 0);
    assert_within(dk_qpm_deff_factor(3, 0.5), 2 / (3 * M_PI), 1e-15, 0);
    assert_within(dk_qpm_deff_factor(2, 0.5), 0, 0, 1e-15);
    dk_qpm q;
    init(&q, "MgO:LN", "Gayer2008", NULL);
    double d;
    assert_int_equal(dk_qpm_deff(&q, &d, NULL), DK_OK);
    const dk_crystal *c = dk_db_find(db, "MgO:LN");
    double d33 = 0;
    for (int i = 0; i < c->nd; i++)
        if (strcmp(c->d_names[i], "d33") == 0)
            d33 = c->d_values[i];
    assert_within(d, 2 / M_PI * d33, 1e-12, 0);
    /* Orientation-patterned GaAs, fields along <111>: (2/√3) d14 (Skauli
     * et al., Opt. Lett. 27, 628 (2002)) times 2/π. */
    init(&q, "GaAs", "Skauli2003", NULL);
    const dk_crystal *g = dk_db_find(db, "GaAs");
    assert_int_equal(dk_qpm_deff(&q, &d, NULL), DK_OK);
    assert_within(d, 2 / M_PI * 2 / sqrt(3) * g->d_values[0], 1e-12, 0);

    dk_error err = {0};
    const dk_crystal *bbo = dk_db_find(db, "BBO");
    assert_int_equal(dk_qpm_init(&q, bbo, &bbo->sets[0], NULL, 1, 0.5, 25,
                                 &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "cannot be periodically poled"));
    assert_int_equal(dk_qpm_init(&q, c, &c->sets[0], "zz", 1, 0.5, 25, &err),
                     DK_EINVAL);
    assert_int_equal(dk_qpm_init(&q, c, &c->sets[0], "eeq", 1, 0.5, 25,
                                 &err),
                     DK_EINVAL);
    assert_int_equal(dk_qpm_init(&q, c, &c->sets[0], NULL, 0, 0.5, 25, &err),
                     DK_EINVAL);
    assert_int_equal(dk_qpm_init(&q, c, &c->sets[0], NULL, 1, 1.0, 25, &err),
                     DK_EINVAL);
    const dk_crystal *ktp = dk_db_find(db, "KTP");
    /* Polarised along the beam (X) is impossible. */
    assert_int_equal(dk_qpm_init(&q, ktp, &ktp->sets[0], "xzz", 1, 0.5, 25,
                                 &err),
                     DK_EINVAL);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(energy_conservation),
        cmocka_unit_test(published_periods),
        cmocka_unit_test(opo_design_point),
        cmocka_unit_test(round_trips),
        cmocka_unit_test(turning_curve_has_two_roots),
        cmocka_unit_test(thermal_expansion_of_period),
        cmocka_unit_test(deff_and_errors),
    };
    return cmocka_run_group_tests_name("qpm", tests, db_setup, db_teardown);
}
