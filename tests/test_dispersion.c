/*
 * test_dispersion.c - the dispersion engine (deltak/dispersion.h) and the
 * group quantities (deltak/group.h).
 *
 * Independent checks:
 *  - each term kind against the formula written out by hand;
 *  - the Taylor-arithmetic derivatives of every axis of every data set in
 *    the database against GSL's numerical differentiation (gsl_deriv_central,
 *    an independent method): group index to 1e-7, GVD to 0.1 %, TOD to 1 %,
 *    dn/dT to 1e-9 /°C;
 *  - the GVD unit conversion against a hand computation.
 */
#include <gsl/gsl_deriv.h>
#include <gsl/gsl_errno.h>

#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/group.h"
#include "deltak/material.h"
#include "deltak/units.h"

static dk_db *db;

static int
setup(void **state)
{
    (void)state;
    dk_error err = {0};
    gsl_set_error_handler_off();
    return dk_db_load(DK_CRYSTAL_DIR, &db, &err) == DK_OK ? 0 : -1;
}

static int
teardown(void **state)
{
    (void)state;
    dk_db_free(db);
    return 0;
}

/* One hand-built axis of one term, evaluated at λ = 1.3 µm. */
static double
one_term(dk_term t, dk_quantity q, double lam)
{
    dk_dispersion_set set = {0};
    set.name = "test";
    set.wavelength_range_um[0] = 0.1;
    set.wavelength_range_um[1] = 10;
    set.quantity = q;
    set.naxes = 1;
    set.axes[0].label = 'n';
    set.axes[0].nterms = 1;
    set.axes[0].terms = &t;
    return dk_index_n(&set, &set.axes[0], lam, 25);
}

static void
term_kinds_by_hand(void **state)
{
    (void)state;
    const double l = 1.3, l2 = l * l;
    dk_term t = {.factor = 1};
    t.kind = DK_TERM_CONSTANT;
    t.strength = (dk_poly){1, {4.5}};
    assert_within(one_term(t, DK_QTY_N_SQUARED, l), sqrt(4.5), 1e-15, 0);

    t.kind = DK_TERM_POLE;
    t.strength = (dk_poly){1, {4.0}};
    t.position = (dk_poly){1, {0.2}};
    t.squared = 1;
    assert_within(one_term(t, DK_QTY_N, l), 4.0 / (l2 - 0.04), 1e-15, 0);

    t.kind = DK_TERM_POLE_X2;
    t.squared = 0;
    assert_within(one_term(t, DK_QTY_N, l), 4.0 * l2 / (l2 - 0.2), 1e-15, 0);

    t.kind = DK_TERM_POWER;
    t.exponent = -2;
    assert_within(one_term(t, DK_QTY_N, l), 4.0 / l2, 1e-15, 0);

    t.kind = DK_TERM_LOG_RATIO;
    t.position = (dk_poly){1, {3.0}};
    t.lower = (dk_poly){1, {2.0}};
    t.factor = 1 / M_PI;
    assert_within(one_term(t, DK_QTY_N, l),
                  4.0 / M_PI * log((9 - l2) / (4 - l2)), 1e-14, 0);

    /* Across a resonance the index is not real: NaN, never garbage. */
    t.kind = DK_TERM_POLE;
    t.factor = -1;
    t.position = (dk_poly){1, {1.0}};
    t.squared = 0;
    assert_true(isnan(one_term(t, DK_QTY_N_SQUARED, 1.1)));
}

/* gsl_function adaptors over one axis of one set. */
typedef struct probe {
    const dk_dispersion_set *set;
    const dk_axis_formula *ax;
    double lam, temp;
    int what; /* 0: n(λ), 1: dn/dλ(λ), 2: d²n/dλ²(λ), 3: n(T) */
} probe;

static double
probe_fn(double x, void *p)
{
    probe *pr = p;
    dk_index_value v;
    double lam = pr->what == 3 ? pr->lam : x;
    double t = pr->what == 3 ? x : pr->temp;
    if (dk_index_eval(pr->set, pr->ax, lam, t, &v, NULL))
        return NAN;
    switch (pr->what) {
    case 1: return v.dn_dl;
    case 2: return v.d2n_dl2;
    default: return v.n;
    }
}

static double
numeric(probe *pr, int what, double x, double h)
{
    pr->what = what;
    gsl_function f = {probe_fn, pr};
    double r, abserr;
    gsl_deriv_central(&f, x, h, &r, &abserr);
    return r;
}

static void
derivatives_against_gsl_deriv(void **state)
{
    (void)state;
    int checked = 0;
    for (int ci = 0; ci < db->ncrystals; ci++) {
        const dk_crystal *c = db->crystals[ci];
        for (int si = 0; si < c->nsets; si++) {
            const dk_dispersion_set *set = &c->sets[si];
            double lo = fmax(set->wavelength_range_um[0],
                             c->transparency_um[0]);
            double hi = fmin(set->wavelength_range_um[1],
                             c->transparency_um[1]);
            double temp = dk_set_has_temperature(set)
                              ? 0.5 * (set->temperature_range_c[0] +
                                       set->temperature_range_c[1])
                              : set->reference_temperature_c;
            for (int ai = 0; ai < set->naxes; ai++) {
                /* Two points: a third and two thirds into the range. */
                for (int k = 1; k <= 2; k++) {
                    double lam = lo + (hi - lo) * k / 3.0;
                    probe pr = {set, &set->axes[ai], lam, temp, 0};
                    dk_index_value v;
                    dk_error err = {0};
                    if (dk_index_eval(set, pr.ax, lam, temp, &v, &err)) {
                        print_error("%s %s %c: %s\n", c->id, set->name,
                                    pr.ax->label, err.msg);
                        fail();
                    }
                    double h = 1e-3 * lam;
                    double d1 = numeric(&pr, 0, lam, h);
                    double d2 = numeric(&pr, 1, lam, h);
                    double d3 = numeric(&pr, 2, lam, h);
                    double ng = dk_group_index(lam, v.n, v.dn_dl);
                    assert_within(ng, dk_group_index(lam, v.n, d1), 0, 1e-7);
                    assert_within(v.d2n_dl2, d2, 1e-3, 1e-9);
                    assert_within(v.d3n_dl3, d3, 1e-2, 1e-8);
                    double dt = numeric(&pr, 3, temp, 1.0);
                    assert_within(v.dn_dt, dt, 1e-4, 1e-9);
                    checked++;
                }
            }
        }
    }
    assert_true(checked >= 4);
}

/* β2 = λ³/(2πc²)·n'': for λ = 1 µm and n'' = 1 µm⁻² this is
 * 1e-6 m / (2π c²) = 1.7708e-24 s²/m = 1770.8 fs²/mm (hand computation). */
static void
gvd_units(void **state)
{
    (void)state;
    assert_within(dk_gvd_fs2_per_mm(1.0, 1.0), 1770.8, 1e-4, 0);
    /* 1/v_g for n_g = 1 is 1/c = 3.33564 fs/µm = 3335.64 fs/mm. */
    assert_within(dk_inverse_group_velocity_fs_per_mm(1.0), 3335.641, 1e-6,
                  0);
    /* β3 = −λ⁴/(4π²c³)·(3n'' + λn'''): λ = 1 µm, n'' = 1, n''' = 0 gives
     * −3e-12 m² / (4π² c³) = −2.82033e-39 s³/m = −2820.33 fs³/mm. */
    assert_within(dk_tod_fs3_per_mm(1.0, 1.0, 0.0), -2820.33, 1e-5, 0);
}

static void
transparency_and_ranges(void **state)
{
    (void)state;
    const dk_crystal *c = dk_db_find(db, "MgO:LN");
    assert_non_null(c);
    const dk_dispersion_set *s = dk_crystal_find_set(c, "gayer2008");
    assert_non_null(s);
    dk_index_value v;
    dk_error err = {0};
    /* 6 µm is beyond MgO:LN's transparency: an error, not a number. */
    assert_int_equal(dk_material_index(c, s, 'e', 6.0, 25, &v, &err),
                     DK_ERANGE);
    assert_non_null(strstr(err.msg, "transparency"));
    /* 4.5 µm is transparent but outside Gayer's fit: a warning. */
    assert_int_equal(dk_material_index(c, s, 'e', 4.5, 25, &v, &err), DK_OK);
    assert_true(v.warnings & DK_WARN_LAMBDA_RANGE);
    assert_int_equal(dk_material_index(c, s, 'e', 1.064, 250, &v, &err),
                     DK_OK);
    assert_true(v.warnings & DK_WARN_TEMP_RANGE);
    assert_int_equal(dk_material_index(c, s, 'X', 1.064, 25, &v, &err),
                     DK_ENOTFOUND);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(term_kinds_by_hand),
        cmocka_unit_test(derivatives_against_gsl_deriv),
        cmocka_unit_test(gvd_units),
        cmocka_unit_test(transparency_and_ranges),
    };
    return cmocka_run_group_tests_name("dispersion", tests, setup, teardown);
}
