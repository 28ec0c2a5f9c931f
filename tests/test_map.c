/*
 * test_map.c - maps by the batch engine (src/analyses/sweep_batch.c)
 * against the cell-by-cell path (dk_sweep_set(), dk_sweep_sinc2(),
 * dk_design_range_flags(): what dk_sweep_map() did for every cell), on
 * QPM and birefringent designs, rows and columns (temperature along x),
 * every variable the engine takes; the same map on one and on two threads
 * bit for bit; the Δk = 0 line against dk_sweep_solve() per column; the
 * vectorised sinc² against dk_sinc2(). Internal consistency checks: the
 * physics of each path is checked elsewhere against published values.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#ifdef _OPENMP
#include <omp.h>
#endif

#include "analyses/sweep_internal.h"
#include "deltak/sweep.h"

typedef struct map_case {
    const char *what;
    const char *crystal;
    const char *pol;
    dk_scheme scheme;
    dk_waves waves;
    int shg, held;
    double temp_c, period_um, theta_deg;
    dk_var x, y;
    double x_lo, x_hi, y_lo, y_hi;
} map_case;

static const map_case cases[] = {
    {"QPM pump x temperature", "MgO:LN", NULL, DK_SCHEME_QPM,
     {1.064, 1.55, 1.064 * 1.55 / (1.55 - 1.064)}, 0, 1, 25, 30.5, NAN,
     DK_VAR_PUMP, DK_VAR_TEMP, 1.05, 1.08, 20, 200},
    {"QPM temperature x pump (columns)", "MgO:LN", NULL, DK_SCHEME_QPM,
     {1.064, 1.55, 1.064 * 1.55 / (1.55 - 1.064)}, 0, 1, 25, 30.5, NAN,
     DK_VAR_TEMP, DK_VAR_PUMP, 20, 200, 1.05, 1.08},
    {"QPM period x temperature, idler held, out of the fitted range",
     "MgO:LN", NULL, DK_SCHEME_QPM,
     {1.064, 1.064 * 3.0 / (3.0 - 1.064), 3.0}, 0, 2, 25, 30.5, NAN,
     DK_VAR_PERIOD, DK_VAR_TEMP, 29, 32, -20, 260},
    {"QPM signal x idler (x wins: the idler follows)", "MgO:LN", NULL,
     DK_SCHEME_QPM, {1.064, 1.55, 1.064 * 1.55 / (1.55 - 1.064)}, 0, 1, 60,
     30.5, NAN, DK_VAR_SIGNAL,
     DK_VAR_IDLER, 1.4, 1.8, 3.0, 4.0},
    {"QPM length x temperature, type II", "PPKTP", "yzy", DK_SCHEME_QPM,
     {0.775, 1.55, 1.55}, 0, 1, 40, 46.0, NAN, DK_VAR_LENGTH, DK_VAR_TEMP, 1,
     30, 20, 80},
    {"QPM SHG fundamental x temperature, opaque corner", "PPKTP", NULL,
     DK_SCHEME_QPM, {0.532, 1.064, 1.064}, 1, 0, 40, 9.0, NAN,
     DK_VAR_FUNDAMENTAL, DK_VAR_TEMP, 0.6, 1.2, 20, 120},
    {"BBO SHG fundamental x temperature at a fixed cut", "BBO", "ooe",
     DK_SCHEME_ANGLE, {0.532, 1.064, 1.064}, 1, 0, 25, 0, 22.8,
     DK_VAR_FUNDAMENTAL, DK_VAR_TEMP, 1.0, 1.13, 0, 100},
    {"LBO SHG temperature x fundamental (columns), biaxial", "LBO", "ssf",
     DK_SCHEME_ANGLE, {0.532, 1.064, 1.064}, 1, 0, 25, 0, 90, DK_VAR_TEMP,
     DK_VAR_FUNDAMENTAL, 100, 200, 1.0, 1.1},
};

static dk_design base;

static void
setup(const map_case *c)
{
    dk_design_request rq;
    dk_design_request_init(&rq);
    rq.crystal = dk_db_find(db, c->crystal);
    assert_non_null(rq.crystal);
    rq.crystal_name = c->crystal;
    rq.waves = c->waves;
    rq.shg = c->shg;
    rq.held = c->held;
    rq.temp_c = c->temp_c;
    rq.pol = c->pol;
    rq.scheme = c->scheme;
    if (c->period_um > 0)
        rq.period_um = c->period_um;
    if (isfinite(c->theta_deg))
        rq.theta_rad = c->theta_deg * M_PI / 180;
    rq.length_mm = 12;
    dk_error err = {0};
    if (dk_design_setup(&rq, &base, &err)) {
        print_error("%s: %s\n", c->what, err.msg);
        fail();
    }
    if (c->scheme == DK_SCHEME_ANGLE)
        assert_int_equal(dk_design_solve(&base, NULL), DK_OK);
}

static void
batch_matches_cells(void **state)
{
    (void)state;
    static dk_sweep s;
    for (size_t k = 0; k < sizeof cases / sizeof cases[0]; k++) {
        const map_case *c = &cases[k];
        setup(c);
        dk_map_spec sp = {c->x, c->y, c->x_lo, c->x_hi, c->y_lo, c->y_hi,
                          61, 47};
        dk_map_result m;
        dk_error err = {0};
        if (dk_sweep_map(&base, &sp, &m, &err)) {
            print_error("%s: %s\n", c->what, err.msg);
            fail();
        }
        /* The cell-by-cell path, as dk_sweep_map() ran it before. */
        dk_sweep_init(&s, &base);
        unsigned flags = 0;
        dk_notes notes;
        dk_notes_clear(&notes);
        for (int j = 0; j < m.ny; j++)
            for (int i = 0; i < m.nx; i++) {
                size_t cix = (size_t)j * m.nx + i;
                double z = NAN;
                if (!dk_sweep_set(&s, sp.y, m.y[j], NULL) &&
                    !dk_sweep_set(&s, sp.x, m.x[i], NULL))
                    z = dk_sweep_sinc2(&s);
                if (!isfinite(z)) {
                    if (m.cell[cix] != DK_CELL_UNDEFINED)
                        print_error("%s: cell %d,%d defined, %g\n", c->what,
                                    i, j, m.z[cix]);
                    assert_int_equal(m.cell[cix], DK_CELL_UNDEFINED);
                    assert_true(isnan(m.z[cix]));
                    continue;
                }
                unsigned f = dk_design_range_flags(&s.d, &s.d.waves,
                                                   s.d.temp_c);
                if (f && !(flags & f))
                    dk_design_note_range(&s.d, f, &s.d.waves, s.d.temp_c,
                                         &notes);
                flags |= f;
                if (m.cell[cix] != (f ? DK_CELL_EXTRAPOLATED : DK_CELL_OK))
                    print_error("%s: cell %d,%d state %d, flags %u\n",
                                c->what, i, j, m.cell[cix], f);
                assert_int_equal(m.cell[cix], f ? DK_CELL_EXTRAPOLATED
                                                : DK_CELL_OK);
                if (!(fabs(m.z[cix] - z) <= 1e-9)) {
                    print_error("%s: cell %d,%d: batch %.15g, cell by cell "
                                "%.15g\n",
                                c->what, i, j, m.z[cix], z);
                    fail();
                }
            }
        assert_int_equal(m.flags, flags);
        /* The same range notes (the map adds one for undefined cells). */
        int n = 0;
        for (int a = 0; a < m.notes.n; a++) {
            if (strcmp(m.notes.item[a].code, "cells-undefined") == 0)
                continue;
            assert_true(n < notes.n);
            assert_string_equal(m.notes.item[a].text, notes.item[n].text);
            n++;
        }
        assert_int_equal(n, notes.n);
        dk_map_result_free(&m);
    }
}

/* sinc² curves and their families (rows of the batch engine) against
 * the point-by-point evaluation. */
static void
sinc2_curves_match(void **state)
{
    (void)state;
    static dk_sweep s;
    for (size_t k = 0; k < sizeof cases / sizeof cases[0]; k++) {
        const map_case *c = &cases[k];
        setup(c);
        for (int fam = 0; fam < 2; fam++) {
            dk_sweep_spec sp = {0};
            sp.x = c->x, sp.x_lo = c->x_lo, sp.x_hi = c->x_hi, sp.nx = 73;
            sp.quantity = DK_SWEEP_SINC2;
            if (fam) {
                sp.nfamily = 3;
                sp.family = c->y;
                for (int f = 0; f < 3; f++)
                    sp.family_values[f] =
                        c->y_lo + (c->y_hi - c->y_lo) * f / 2;
            }
            dk_sweep_result res;
            dk_error err = {0};
            dk_status st = dk_sweep_curves(&base, &sp, &res, &err);
            if (st == DK_ENOROOT)
                continue;   /* nothing defined: the paths agree on that */
            assert_int_equal(st, DK_OK);
            assert_int_equal(res.nseries, fam ? 3 : 1);
            for (int f = 0; f < res.nseries; f++) {
                dk_sweep_init(&s, &base);
                if (fam)
                    assert_int_equal(dk_sweep_set(&s, sp.family,
                                                  sp.family_values[f], NULL),
                                     DK_OK);
                const dk_series *se = &res.series[f];
                assert_int_equal(se->n, (size_t)sp.nx);
                for (int i = 0; i < sp.nx; i++) {
                    double z = NAN;
                    if (!dk_sweep_set(&s, sp.x, se->x[i], NULL))
                        z = dk_sweep_sinc2(&s);
                    if (isnan(z)) {
                        assert_true(isnan(se->y[i]));
                        continue;
                    }
                    assert_within(se->y[i], z, 0, 1e-9);
                    assert_int_equal(se->flags[i],
                                     dk_design_range_flags(&s.d, &s.d.waves,
                                                           s.d.temp_c));
                }
            }
            dk_sweep_result_free(&res);
        }
    }
}

/* One thread or two: the same bits. */
static void
threads_agree(void **state)
{
    (void)state;
#ifdef _OPENMP
    for (size_t k = 0; k < sizeof cases / sizeof cases[0]; k++) {
        const map_case *c = &cases[k];
        setup(c);
        dk_map_spec sp = {c->x, c->y, c->x_lo, c->x_hi, c->y_lo, c->y_hi,
                          301, 257};
        dk_map_result a, b;
        int keep = omp_get_max_threads();
        omp_set_num_threads(1);
        assert_int_equal(dk_sweep_map(&base, &sp, &a, NULL), DK_OK);
        omp_set_num_threads(2);
        assert_int_equal(dk_sweep_map(&base, &sp, &b, NULL), DK_OK);
        omp_set_num_threads(keep);
        size_t cells = (size_t)a.nx * a.ny;
        assert_memory_equal(a.z, b.z, cells * sizeof *a.z);
        assert_memory_equal(a.cell, b.cell, cells);
        assert_int_equal(a.flags, b.flags);
        assert_int_equal(a.ridge.n, b.ridge.n);
        dk_map_result_free(&a);
        dk_map_result_free(&b);
    }
#else
    skip();
#endif
}

/* The Δk = 0 line against dk_sweep_solve() at each x. */
static void
ridge_matches_solver(void **state)
{
    (void)state;
    static dk_sweep s;
    setup(&cases[0]);
    dk_map_spec sp = {DK_VAR_PUMP, DK_VAR_TEMP, 1.05, 1.08, 0, 250, 401, 11};
    dk_map_result m;
    assert_int_equal(dk_sweep_map(&base, &sp, &m, NULL), DK_OK);
    dk_sweep_init(&s, &base);
    int found = 0;
    for (int i = 0; i < m.nx; i++) {
        double v[DK_SWEEP_MAX_ROOTS];
        int n = 0;
        assert_int_equal(dk_sweep_set(&s, sp.x, m.x[i], NULL), DK_OK);
        assert_int_equal(dk_sweep_solve(&s, sp.y, v, DK_SWEEP_MAX_ROOTS, &n,
                                        NULL),
                         DK_OK);
        /* Branch k of the ridge holds the k-th root at column i. */
        for (int k = 0; k < n; k++) {
            double r = m.ridge.y[(size_t)k * (m.nx + 1) + i];
            if (v[k] < 0 || v[k] > 250)
                continue;
            assert_within(r, v[k], 0, 1e-6);
            found++;
        }
    }
    assert_true(found > 100);
    dk_map_result_free(&m);
}

/* The vectorised sinc² against dk_sinc2(), across the range reduction. */
static void
sinc2_matches(void **state)
{
    (void)state;
    enum { N = 4001 };
    static double dk[N], len[N], z[N];
    /* |ΔkL/2| up to 4·10⁶ rad, where the reduction is exact */
    for (int i = 0; i < N; i++) {
        dk[i] = ldexp((double)(i - N / 2) / (N / 2), i % 24 - 14);
        len[i] = 1e3 + 4.0 * i;
    }
    dk[0] = 0;
    dk[1] = NAN;
    dk[2] = 1e-12;
    dk_sinc2_batch(dk, len, z, N);
    assert_true(isnan(z[1]));
    for (int i = 0; i < N; i++) {
        if (i == 1)
            continue;
        double ref = dk_sinc2(dk[i], len[i]);
        /* Relative to the envelope 1/x² where sinc² vanishes. */
        double x = 0.5 * dk[i] * len[i];
        double scale = fmin(1, 1 / (x * x));
        assert_within(z[i], ref, 0, 1e-14 * scale + 1e-300);
    }
    /* Beyond, the value stays under the envelope. */
    double big = 3e8, l = 2e4, zz;
    dk_sinc2_batch(&big, &l, &zz, 1);
    double x = 0.5 * big * l;
    assert_true(zz >= 0 && zz <= 1 / (x * x));
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(batch_matches_cells),
        cmocka_unit_test(sinc2_curves_match),
        cmocka_unit_test(threads_agree),
        cmocka_unit_test(ridge_matches_solver),
        cmocka_unit_test(sinc2_matches),
    };
    return cmocka_run_group_tests_name("map", tests, db_setup, db_teardown);
}
