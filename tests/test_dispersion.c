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

#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/group.h"
#include "deltak/material.h"
#include "deltak/units.h"

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

/* Group index and GVD against independent values. */
static void
group_quantities_published(void **state)
{
    (void)state;
    static const struct {
        const char *crystal, *set;
        char axis;
        double lam, ng, gvd, gvd_tol;
        const char *source;
    } cases[] = {
        /* Debian python3-meep 1.25.0, meep.materials.LiNbO3 (Zelmon et al.
         * 1997), central differences with h = 1e-3 um, computed for this
         * test: n_g to ~1e-6, GVD to ~0.05 fs2/mm. */
        {"LiNbO3", "Zelmon1997", 'o', 0.8, 2.358523, 430.01, 0.1, "meep"},
        {"LiNbO3", "Zelmon1997", 'e', 0.8, 2.264221, 368.25, 0.1, "meep"},
        {"LiNbO3", "Zelmon1997", 'o', 1.55, 2.263675, 112.19, 0.1, "meep"},
        {"LiNbO3", "Zelmon1997", 'e', 1.55, 2.182319, 99.49, 0.1, "meep"},
        /* BBO o-wave GVD at 800 nm, about 75 fs2/mm as quoted throughout
         * the ultrafast literature (from memory); n_g not checked here. */
        {"BBO", "Tamosauskas2018", 'o', 0.8, 0, 75.0, 2.0, "from memory"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        const dk_crystal *c = dk_db_find(db, cases[i].crystal);
        assert_non_null(c);
        const dk_dispersion_set *s = dk_crystal_find_set(c, cases[i].set);
        assert_non_null(s);
        dk_index_value v;
        assert_int_equal(dk_material_index(c, s, cases[i].axis, cases[i].lam,
                                           s->reference_temperature_c, &v,
                                           NULL),
                         DK_OK);
        if (cases[i].ng > 0)
            assert_within(dk_group_index(cases[i].lam, v.n, v.dn_dl),
                          cases[i].ng, 0, 3e-6);
        assert_within(dk_gvd_fs2_per_mm(cases[i].lam, v.d2n_dl2),
                      cases[i].gvd, 0, cases[i].gvd_tol);
    }
}

/* dn/dT against values published or cross-checked in
 * ../shared/reference/crystal-data-notes.md. */
static void
thermo_optic_published(void **state)
{
    (void)state;
    static const struct {
        const char *crystal, *set;
        char axis;
        double lam, temp, dndt, tol;
    } cases[] = {
        /* Kato & Takaoka, Appl. Opt. 41, 5040 (2002), dn_z/dT at 1.064 um
         * = 1.44e-5 /C with n4 = -0.1897; Emanueli & Arie, Appl. Opt. 42,
         * 6661 (2003) give 1.48e-5 (crystal-data-notes §3). */
        {"KTP", "KatoTakaoka2002", 'Z', 1.064, 25, 1.44e-5, 0.05e-5},
        {"KTP", "Fradkin1999", 'Z', 1.064, 25, 1.48e-5, 0.1e-5},
        /* Eimerl et al., J. Appl. Phys. 62, 1968 (1987): dn_o/dT =
         * -16.6e-6, dn_e/dT = -9.3e-6 /C (crystal-data-notes §7). */
        {"BBO", "Eimerl1987", 'o', 0.8, 40, -16.6e-6, 0.05e-6},
        {"BBO", "Eimerl1987", 'e', 0.8, 40, -9.3e-6, 0.05e-6},
        /* Skauli et al., J. Appl. Phys. 94, 6447 (2003): dn/dT of GaAs is
         * positive, about +2e-4 /K at 2-8 um (crystal-data-notes §5). */
        {"GaAs", "Skauli2003", 'n', 4.0, 25, 2.0e-4, 0.3e-4},
        /* Gayer et al. 2008: dn_e/dT of MgO:LN near 3e-4 /K at 1064 nm
         * (crystal-data-notes §1; approximate). */
        {"MgO:LN", "Gayer2008", 'e', 1.064, 40, 2.9e-4, 0.4e-4},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        const dk_crystal *c = dk_db_find(db, cases[i].crystal);
        assert_non_null(c);
        const dk_dispersion_set *s = dk_crystal_find_set(c, cases[i].set);
        assert_non_null(s);
        dk_index_value v;
        assert_int_equal(dk_material_index(c, s, cases[i].axis, cases[i].lam,
                                           cases[i].temp, &v, NULL),
                         DK_OK);
        assert_within(v.dn_dt, cases[i].dndt, 0, cases[i].tol);
    }
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(term_kinds_by_hand),
        cmocka_unit_test(derivatives_against_gsl_deriv),
        cmocka_unit_test(gvd_units),
        cmocka_unit_test(group_quantities_published),
        cmocka_unit_test(thermo_optic_published),
        cmocka_unit_test(transparency_and_ranges),
    };
    return cmocka_run_group_tests_name("dispersion", tests, db_setup, db_teardown);
}
