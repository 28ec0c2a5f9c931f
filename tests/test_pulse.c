/*
 * test_pulse.c - group velocities and their mismatch in the mode each
 * wave travels in (deltak/pulse.h).
 */
#include <gsl/gsl_deriv.h>

#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/group.h"
#include "deltak/material.h"
#include "deltak/pulse.h"
#include "deltak/units.h"

#define DEG (M_PI / 180)

static dk_design d;

static void
bbo_shg(double fund)
{
    test_design(&d, "BBO", NULL, dk_waves_shg(fund), 1, 25, "ooe",
                DK_SCHEME_ANGLE, 1);
}

/* GVM between 800 nm and its second harmonic in BBO (type I): about
 * 190-195 fs/mm, as quoted throughout the ultrafast literature (e.g.
 * Cerullo & De Silvestri, Rev. Sci. Instrum. 74, 1 (2003); from memory).
 * GVD of the 800 nm o-wave: about 75 fs2/mm (from memory). */
static void
bbo_800_shg(void **state)
{
    (void)state;
    bbo_shg(0.8);
    dk_pulse_props p;
    assert_int_equal(dk_pulse_props_of(&d, &p, NULL), DK_OK);
    assert_within(fabs(p.gvm_fs_per_mm[0]), 193, 0, 6);
    assert_true(p.gvm_fs_per_mm[0] < 0); /* the harmonic is slower */
    assert_within(p.w[0].gvd_fs2_per_mm, 75, 0, 2);
    assert_within(p.walkoff_rad[0] * 1e3, p.w[2].walkoff_rad * 1e3, 1e-9, 0);
}

/* The e-wave's group index along its direction against a numerical
 * derivative of its eigen-index (gsl_deriv_central, independent method). */
typedef struct eprobe {
    const dk_crystal *c;
    double s[3];
} eprobe;

static double
e_index(double lam, void *p)
{
    eprobe *e = p;
    dk_mode m[2];
    if (dk_modes_at(e->c, &e->c->sets[0], lam, 25, e->s, m, NULL, NULL))
        return NAN;
    return m[dk_mode_select(m, 'e')].n;
}

static void
extraordinary_group_index(void **state)
{
    (void)state;
    bbo_shg(0.8);
    dk_pulse_props p;
    assert_int_equal(dk_pulse_props_of(&d, &p, NULL), DK_OK);
    eprobe e = {d.crystal, {0}};
    dk_direction(d.theta_rad, d.phi_rad, e.s);
    gsl_function f = {e_index, &e};
    double dn, abserr;
    gsl_deriv_central(&f, 0.4, 1e-3, &dn, &abserr);
    assert_within(p.w[2].group_index, e_index(0.4, &e) - 0.4 * dn, 0, 1e-7);
}

static void
lengths(void **state)
{
    (void)state;
    /* τ/|GVM|: 30 fs at 193 fs/mm part after 0.155 mm. */
    assert_within(dk_splitting_length_mm(30, -193), 30.0 / 193, 1e-15, 0);
    assert_true(isinf(dk_splitting_length_mm(30, 0)));
    /* √π w0/ρ: 100 µm at 67.8 mrad → 2.614 mm (hand computation). */
    assert_within(dk_aperture_length_mm(100, 0.0678), 2.6143, 1e-4, 0);
    assert_true(isinf(dk_aperture_length_mm(100, 0)));
}

/* A QPM design: waves along X, e-polarised: the group indices equal those
 * of the principal axis, and there is no walk-off. */
static void
qpm_waves(void **state)
{
    (void)state;
    const dk_crystal *c = dk_db_find(db, "MgO:LN");
    dk_waves w = {1.064, 0, 3.4};
    dk_waves_complete(&w, NULL);
    test_design(&d, "MgO:LN", c->sets[0].name, w, 0, 40, NULL, DK_SCHEME_QPM,
                1);
    dk_pulse_props p;
    assert_int_equal(dk_pulse_props_of(&d, &p, NULL), DK_OK);
    dk_index_value v;
    dk_material_index(c, &c->sets[0], 'e', 1.064, 40, &v, NULL);
    assert_within(p.w[2].group_index, dk_group_index(1.064, v.n, v.dn_dl),
                  1e-15, 0);
    for (int k = 0; k < 3; k++)
        assert_within(p.walkoff_rad[k], 0, 0, 1e-15);
    assert_within(p.gvm_fs_per_mm[2],
                  (p.w[0].group_index - p.w[1].group_index) /
                      DK_C_M_PER_S * 1e12,
                  1e-12, 0);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(bbo_800_shg),
        cmocka_unit_test(extraordinary_group_index),
        cmocka_unit_test(lengths),
        cmocka_unit_test(qpm_waves),
    };
    return cmocka_run_group_tests_name("pulse", tests, db_setup, db_teardown);
}
