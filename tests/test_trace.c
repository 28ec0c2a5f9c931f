/*
 * test_trace.c - tuning curves by continuation (src/analyses/sweep_trace.c)
 * against the full scan at every point (dk_sweep_solve(), the way curves
 * were computed before): on QPM and birefringent designs, curves that turn
 * and curves that do not, families, grids that move with the pump, every
 * target. At every point the tracer must return the same number of roots
 * and each root the scan finds to within its solver's tolerance (1e-9 µm
 * for wavelengths, 1e-6 °C, 1e-7 degree). The turning points found must be
 * where the branches meet: at degeneracy signal = idler = 2 λp, and the
 * full scan finds roots on one side of the turning point and none on the
 * other.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include "analyses/sweep_internal.h"
#include "deltak/sweep.h"

typedef struct trace_case {
    const char *what;
    const char *crystal;
    const char *pol;         /* NULL: the design's default */
    const char *type;
    dk_scheme scheme;
    dk_waves waves;
    int shg, held;
    double temp_c, period_um;
    double theta_deg, alpha_deg;
    const char *plane;
    dk_var x;
    double lo, hi;
    int n;
    dk_var target;
    int family;              /* 1: also at three members of @fvar */
    dk_var fvar;
    double fvals[3];
    int turns;               /* 1: the curve must have a turning point */
} trace_case;

static dk_design base;

static void
setup(const trace_case *c)
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
    rq.type = c->type;
    rq.scheme = c->scheme;
    rq.plane = c->plane;
    if (c->period_um > 0)
        rq.period_um = c->period_um;
    if (isfinite(c->theta_deg))
        rq.theta_rad = c->theta_deg * M_PI / 180;
    rq.alpha_rad = c->alpha_deg * M_PI / 180;
    rq.temp_range_c[0] = 0;
    rq.temp_range_c[1] = 250;
    rq.length_mm = 10;
    dk_error err = {0};
    if (dk_design_setup(&rq, &base, &err)) {
        print_error("%s: %s\n", c->what, err.msg);
        fail();
    }
    /* Curves start from the solved design where it solves (angles). */
    if (c->scheme == DK_SCHEME_ANGLE)
        dk_design_solve(&base, NULL);
}

static double
tolerance(dk_var target)
{
    switch (target) {
    case DK_VAR_TEMP: return 1e-6;
    case DK_VAR_THETA:
    case DK_VAR_PHI: return 1e-7;
    default: return 1e-9;
    }
}

/* Compare tracer and scan over one sweep; returns the turning points. */
static int
compare(const trace_case *c, int member)
{
    static dk_sweep s1, s2;
    int n = c->n;
    double *xs = malloc(n * sizeof *xs);
    trace_point *a = malloc(n * sizeof *a), *b = malloc(n * sizeof *b);
    assert_non_null(xs);
    assert_non_null(a);
    assert_non_null(b);
    for (int i = 0; i < n; i++)
        xs[i] = c->lo + (c->hi - c->lo) * i / (n - 1);
    dk_sweep_init(&s1, &base);
    dk_sweep_init(&s2, &base);
    if (member >= 0) {
        assert_int_equal(dk_sweep_set(&s1, c->fvar, c->fvals[member], NULL),
                         DK_OK);
        assert_int_equal(dk_sweep_set(&s2, c->fvar, c->fvals[member], NULL),
                         DK_OK);
    }
    dk_error e1 = {0}, e2 = {0};
    assert_int_equal(sweep_scan_each(&s1, c->x, xs, n, c->target, a, &e1),
                     DK_OK);
    sweep_fold *folds = NULL;
    int nfolds = 0;
    sweep_trace_opts opts = {1, NULL, NULL};
    sweep_trace_stats st;
    assert_int_equal(sweep_trace(&s2, c->x, xs, n, c->target, &opts, b,
                                 &folds, &nfolds, &e2, &st),
                     DK_OK);
    double tol = tolerance(c->target);
    long roots = 0;
    for (int i = 0; i < n; i++) {
        if (a[i].status != b[i].status || a[i].n != b[i].n) {
            print_error("%s (member %d): point %d (x = %.10g): scan %d roots "
                        "(status %d), tracer %d (status %d)\n",
                        c->what, member, i, xs[i], a[i].n, a[i].status,
                        b[i].n, b[i].status);
            fail();
        }
        for (int k = 0; k < a[i].n; k++) {
            if (!(fabs(a[i].v[k] - b[i].v[k]) <= tol)) {
                print_error("%s: point %d root %d: scan %.15g, tracer "
                            "%.15g\n",
                            c->what, i, k, a[i].v[k], b[i].v[k]);
                fail();
            }
            roots++;
        }
    }
    if (roots == 0) {
        print_error("%s (member %d): no roots at all\n", c->what, member);
        fail();
    }
    /* Turning points: roots on one side, the branch gone on the other. */
    for (int f = 0; f < nfolds; f++) {
        const sweep_fold *fo = &folds[f];
        int g = fo->at - fo->birth;
        assert_true(g >= 0 && g + 1 < n);
        double lo = fmin(xs[g], xs[g + 1]), hi = fmax(xs[g], xs[g + 1]);
        assert_true(fo->x >= lo && fo->x <= hi);
        assert_true(b[g].n != b[g + 1].n);
        if (c->target == DK_VAR_WAVELENGTHS && fo->root[1] < 0) {
            /* Degeneracy: signal = idler = 2 λp at the turning point. */
            assert_within(fo->y[SP_WAVE_SIGNAL], fo->y[SP_WAVE_IDLER], 1e-9,
                          0);
            assert_within(fo->y[SP_WAVE_SIGNAL], 2 * fo->waves.pump_um, 1e-9,
                          0);
        }
    }
    free(folds);
    free(xs);
    free(a);
    free(b);
    return nfolds;
}

static const trace_case cases[] = {
    {"QPM idler vs period, turning at degeneracy", "MgO:LN", NULL, NULL,
     DK_SCHEME_QPM, {1.064, 0, 0}, 0, 0, 100, 0, NAN, 0, NULL, DK_VAR_PERIOD,
     28, 33, 3001, DK_VAR_WAVELENGTHS, 1, DK_VAR_TEMP, {30, 100, 170}, 1},
    {"QPM idler vs period, coarse", "MgO:LN", NULL, NULL, DK_SCHEME_QPM,
     {1.064, 0, 0}, 0, 0, 100, 0, NAN, 0, NULL, DK_VAR_PERIOD, 28, 33, 201,
     DK_VAR_IDLER, 0, DK_VAR_TEMP, {0}, 1},
    {"QPM signal and idler vs temperature", "MgO:LN", NULL, NULL,
     DK_SCHEME_QPM, {1.064, 0, 0}, 0, 0, 100, 31.9, NAN, 0, NULL,
     DK_VAR_TEMP, 20, 200, 1201, DK_VAR_WAVELENGTHS, 1, DK_VAR_PERIOD,
     {31.8, 32.0, 32.2}, 1},
    {"QPM idler vs pump (moving grid)", "MgO:LN", NULL, NULL, DK_SCHEME_QPM,
     {1.064, 0, 0}, 0, 0, 60, 31.0, NAN, 0, NULL, DK_VAR_PUMP, 1.0, 1.1,
     1001, DK_VAR_SIGNAL, 0, DK_VAR_TEMP, {0}, 1},
    {"QPM temperature vs idler", "MgO:LN", NULL, NULL, DK_SCHEME_QPM,
     {1.064, 0, 3.4}, 0, 2, 100, 30.5, NAN, 0, NULL, DK_VAR_IDLER, 3.2, 3.6,
     801, DK_VAR_TEMP, 0, DK_VAR_TEMP, {0}, 0},
    {"QPM type II signal vs period", "PPKTP", "yzy", NULL, DK_SCHEME_QPM,
     {0.775, 0, 0}, 0, 0, 40, 0, NAN, 0, NULL, DK_VAR_PERIOD, 40, 60, 801,
     DK_VAR_WAVELENGTHS, 0, DK_VAR_TEMP, {0}, 0},
    {"QPM SHG temperature vs fundamental", "PPKTP", NULL, NULL,
     DK_SCHEME_QPM, {0.532, 1.064, 1.064}, 1, 0, 40, 9.0, NAN, 0, NULL,
     DK_VAR_FUNDAMENTAL, 1.04, 1.09, 801, DK_VAR_TEMP, 0, DK_VAR_TEMP, {0},
     0},
    {"BBO type I signal vs theta, degenerate turning; noncollinear family",
     "BBO", "ooe", NULL, DK_SCHEME_ANGLE, {0.4, 0.8, 0}, 0, 1, 25, 0, 29.0,
     0, NULL, DK_VAR_THETA, 27, 33, 1201, DK_VAR_WAVELENGTHS, 1,
     DK_VAR_ALPHA, {0, 2, 3.8}, 1},
    {"BBO SHG theta vs fundamental", "BBO", "ooe", NULL, DK_SCHEME_ANGLE,
     {0.532, 1.064, 1.064}, 1, 0, 25, 0, NAN, 0, NULL, DK_VAR_FUNDAMENTAL,
     0.45, 2.5, 1001, DK_VAR_THETA, 0, DK_VAR_TEMP, {0}, 0},
    {"KTP type II phi vs fundamental", "KTP", NULL, "II", DK_SCHEME_ANGLE,
     {0.532, 1.064, 1.064}, 1, 0, 25, 0, NAN, 0, "XY", DK_VAR_FUNDAMENTAL,
     0.95, 1.4, 901, DK_VAR_PHI, 0, DK_VAR_TEMP, {0}, 0},
    {"LBO phi vs temperature (noncritical end)", "LBO", NULL, NULL,
     DK_SCHEME_ANGLE, {0.532, 1.064, 1.064}, 1, 0, 25, 0, NAN, 0, "XY",
     DK_VAR_TEMP, 20, 200, 721, DK_VAR_PHI, 0, DK_VAR_TEMP, {0}, 0},
    {"LBO temperature vs fundamental", "LBO", NULL, "I", DK_SCHEME_ANGLE,
     {0.532, 1.064, 1.064}, 1, 0, 120, 0, NAN, 0, "XY", DK_VAR_FUNDAMENTAL,
     1.0, 1.3, 301, DK_VAR_TEMP, 0, DK_VAR_TEMP, {0}, 0},
    {"BBO noncollinear theta vs alpha", "BBO", "ooe", NULL, DK_SCHEME_ANGLE,
     {0.4, 0.7, 0.4 * 0.7 / (0.7 - 0.4)}, 0, 1, 25, 0, NAN, 1, NULL, DK_VAR_ALPHA, 0.5, 4.5, 401,
     DK_VAR_THETA, 0, DK_VAR_TEMP, {0}, 0},
};

static void
tracer_matches_scan(void **state)
{
    (void)state;
    for (size_t k = 0; k < sizeof cases / sizeof cases[0]; k++) {
        const trace_case *c = &cases[k];
        setup(c);
        int turns = 0;
        if (c->family)
            for (int m = 0; m < 3; m++)
                turns += compare(c, m);
        else
            turns = compare(c, -1);
        if (c->turns && turns == 0) {
            print_error("%s: no turning point found\n", c->what);
            fail();
        }
    }
}

/* The public curve of a degenerate OPO: signal and idler meet at
 * 2 λp, the fold inserted into both series. */
static void
curves_meet_at_degeneracy(void **state)
{
    (void)state;
    setup(&cases[0]);
    dk_sweep_spec sp = {0};
    sp.x = DK_VAR_PERIOD;
    sp.x_lo = 28;
    sp.x_hi = 33;
    sp.nx = 501;
    sp.quantity = DK_SWEEP_SOLVE;
    sp.target = DK_VAR_WAVELENGTHS;
    dk_sweep_result res;
    assert_int_equal(dk_sweep_curves(&base, &sp, &res, NULL), DK_OK);
    assert_int_equal(res.nseries, 2);
    double end[2] = {NAN, NAN};
    for (int s = 0; s < 2; s++) {
        const dk_series *se = &res.series[s];
        assert_true(se->n > (size_t)sp.nx);
        for (size_t i = 0; i < se->n; i++)
            if (isfinite(se->y[i]))
                end[s] = se->y[i];
    }
    assert_within(end[0], 2 * 1.064, 1e-9, 0);
    assert_within(end[1], 2 * 1.064, 1e-9, 0);
    dk_sweep_result_free(&res);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(tracer_matches_scan),
        cmocka_unit_test(curves_meet_at_degeneracy),
    };
    return cmocka_run_group_tests_name("trace", tests, db_setup, db_teardown);
}
