/*
 * bench_speed.c - the engine's speed on the benchmark jobs of `make bench`
 * (speed is measured here, never tested). Prints one "key value" line per
 * figure, read by tests/bench/run.sh:
 *
 *   map_*      sinc²(ΔkL/2) over 1000 × 1000 cells (MgO:LN, Gayer 2008,
 *              zzz, pump 1.05-1.08 µm × 20-200 °C, signal 1550 nm held,
 *              period 30.5 µm, L = 20 mm): Δk evaluations per second with
 *              one thread and with all; the bare Sellmeier floor it
 *              contains (the index evaluations alone, batch kernel, one
 *              thread); the same map cell by cell (the general path).
 *   curve_*    idler vs period 28-32 µm at 100 °C, pump 1064 nm, 10⁴
 *              points, by continuation; and by a full scan per point
 *              (the old way) on 500 points.
 *   angle_*, period_*   one design resolved in-process (no start-up).
 * Each figure is the best of several runs.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#ifdef _OPENMP
#include <omp.h>
#endif

#include "analyses/sweep_internal.h"
#include "data/dispersion_batch.h"
#include "deltak/crystal.h"
#include "deltak/sweep.h"

static double
now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

static dk_db *db;

static void
need(int ok, const char *what)
{
    if (!ok) {
        fprintf(stderr, "bench: %s failed\n", what);
        exit(1);
    }
}

static void
qpm_design(dk_design *d, dk_waves w, double temp, double period,
           double length_mm)
{
    dk_design_request rq;
    dk_design_request_init(&rq);
    rq.crystal = dk_db_find(db, "MgO:LN");
    rq.crystal_name = "MgO:LN";
    rq.set_name = "Gayer2008";
    rq.waves = w;
    rq.held = w.signal_um > 0 ? 1 : 0;
    rq.temp_c = temp;
    rq.period_um = period;
    rq.length_mm = length_mm;
    dk_error err = {0};
    if (dk_design_setup(&rq, d, &err)) {
        fprintf(stderr, "bench: %s\n", err.msg);
        exit(1);
    }
}

/* Best time of @runs calls of the map. */
static double
time_map(const dk_design *d, const dk_map_spec *sp, int runs, double *sum)
{
    double best = INFINITY;
    for (int r = 0; r < runs; r++) {
        dk_map_result res;
        double t0 = now();
        need(dk_sweep_map(d, sp, &res, NULL) == DK_OK, "map");
        double t = now() - t0;
        best = t < best ? t : best;
        double s = 0;
        for (int c = 0; c < res.nx * res.ny; c++)
            s += isfinite(res.z[c]) ? res.z[c] : 0;
        *sum = s;
        dk_map_result_free(&res);
    }
    return best;
}

static void
bench_map(void)
{
    static dk_design d;
    dk_waves w = {1.064, 1.55, 0};
    dk_waves_complete(&w, NULL);
    qpm_design(&d, w, 25, 30.5, 20);
    dk_map_spec sp = {DK_VAR_PUMP, DK_VAR_TEMP, 1.05, 1.08, 20, 200,
                      1000, 1000};
    double cells = 1e6, sum;
    int threads = 1;
#ifdef _OPENMP
    threads = omp_get_max_threads();
    omp_set_num_threads(1);
#endif
    double t1 = time_map(&d, &sp, 5, &sum);
#ifdef _OPENMP
    omp_set_num_threads(threads);
#endif
    double tn = time_map(&d, &sp, 5, &sum);
    /* The cells alone (the batch engine on arrays allocated once), one
     * thread: the map without its Δk = 0 line and allocation. */
    {
        dk_map_result m = {0};
        m.nx = m.ny = 1000;
        m.x = malloc(1000 * sizeof *m.x);
        m.y = malloc(1000 * sizeof *m.y);
        m.z = malloc(cells * sizeof *m.z);
        m.cell = malloc((size_t)cells);
        unsigned char *fl = malloc((size_t)cells);
        need(m.x && m.y && m.z && m.cell && fl, "allocation");
        for (int i = 0; i < 1000; i++) {
            m.x[i] = 1.05 + 0.03 * i / 999;
            m.y[i] = 20 + 180.0 * i / 999;
        }
#ifdef _OPENMP
        omp_set_num_threads(1);
#endif
        double best = INFINITY;
        for (int r = 0; r < 5; r++) {
            size_t def;
            double t0 = now();
            need(sweep_cells_batch(&d, &sp, &m, fl, &def) == DK_OK, "cells");
            double t = now() - t0;
            best = t < best ? t : best;
        }
#ifdef _OPENMP
        omp_set_num_threads(threads);
#endif
        printf("map_cells_seconds_1 %.6f\n", best);
        free(m.x), free(m.y), free(m.z), free(m.cell), free(fl);
    }
    printf("map_threads %d\n", threads);
    printf("map_seconds_1 %.6f\n", t1);
    printf("map_seconds_all %.6f\n", tn);
    printf("map_evals_per_s_1 %.4g\n", cells / t1);
    printf("map_evals_per_s_all %.4g\n", cells / tn);
    printf("map_checksum %.9f\n", sum);

    /* The bare floor: the index evaluations the map contains, by the
     * batch kernel on one thread (pump and idler vary over every cell;
     * the held signal once per row). */
    const dk_dispersion_set *set = d.set;
    const dk_axis_formula *ax = dk_set_find_axis(set, 'e');
    const double *tr = d.crystal->transparency_um;
    double *lp = malloc(1000 * sizeof *lp), *li = malloc(1000 * sizeof *li);
    double *n = malloc(1000 * sizeof *n), *work = malloc(3000 * sizeof *n);
    for (int i = 0; i < 1000; i++) {
        lp[i] = 1.05 + 0.03 * i / 999;
        li[i] = dk_third_wave_um(lp[i], 1.55);
    }
    double best = INFINITY, chk = 0;
    for (int r = 0; r < 5; r++) {
        double t0 = now();
        chk = 0;
        for (int j = 0; j < 1000; j++) {
            dk_nfast f;
            dk_nfast_compile(set, ax, 20 + 180.0 * j / 999, tr[0], tr[1], &f);
            dk_nfast_batch(&f, lp, n, work, 1000);
            chk += n[0];
            dk_nfast_batch(&f, li, n, work, 1000);
            chk += n[999];
            chk += dk_nfast_n(&f, 1.55);
        }
        double t = now() - t0;
        best = t < best ? t : best;
    }
    printf("floor_seconds %.6f\n", best);
    printf("floor_cells_per_s %.4g\n", cells / best);
    printf("floor_checksum %.6f\n", chk);
    free(lp), free(li), free(n), free(work);

    /* The same map cell by cell (angle variables force the general path;
     * here a smaller map through dk_sweep_set/dk_sweep_sinc2). */
    static dk_sweep s;
    dk_sweep_init(&s, &d);
    double t0 = now();
    int m = 200;
    for (int j = 0; j < m; j++)
        for (int i = 0; i < m; i++) {
            dk_sweep_set(&s, DK_VAR_TEMP, 20 + 180.0 * j / (m - 1), NULL);
            dk_sweep_set(&s, DK_VAR_PUMP, 1.05 + 0.03 * i / (m - 1), NULL);
            sum += dk_sweep_sinc2(&s);
        }
    double tc = now() - t0;
    printf("map_cell_by_cell_evals_per_s %.4g\n", m * m / tc);
}

static void
bench_curve(void)
{
    static dk_design d;
    qpm_design(&d, (dk_waves){1.064, 0, 0}, 100, 30, NAN);
    static dk_sweep s;
    int n = 10000;
    double *xs = malloc(n * sizeof *xs);
    trace_point *pts = malloc(n * sizeof *pts);
    for (int i = 0; i < n; i++)
        xs[i] = 28 + 4.0 * i / (n - 1);
    double best = INFINITY, chk = 0;
    sweep_trace_stats st = {0};
    for (int r = 0; r < 5; r++) {
        dk_sweep_init(&s, &d);
        double t0 = now();
        need(sweep_trace(&s, DK_VAR_PERIOD, xs, n, DK_VAR_IDLER, NULL, pts,
                         NULL, NULL, NULL, &st) == DK_OK,
             "trace");
        double t = now() - t0;
        best = t < best ? t : best;
    }
    for (int i = 0; i < n; i++)
        if (pts[i].n)
            chk += pts[i].v[0];
    printf("curve_points %d\n", n);
    printf("curve_seconds %.6f\n", best);
    printf("curve_points_per_s %.4g\n", n / best);
    printf("curve_evals_per_point %.2f\n", (double)st.evals / n);
    printf("curve_checksum %.9f\n", chk);
    /* The public entry point (series, flags, turning points). */
    dk_sweep_spec sp = {0};
    sp.x = DK_VAR_PERIOD, sp.x_lo = 28, sp.x_hi = 32, sp.nx = n;
    sp.quantity = DK_SWEEP_SOLVE, sp.target = DK_VAR_IDLER;
    best = INFINITY;
    for (int r = 0; r < 5; r++) {
        dk_sweep_result res;
        double t0 = now();
        need(dk_sweep_curves(&d, &sp, &res, NULL) == DK_OK, "curves");
        double t = now() - t0;
        best = t < best ? t : best;
        dk_sweep_result_free(&res);
    }
    printf("curve_api_seconds %.6f\n", best);
    /* The old way on 500 points: a full scan per point. */
    int m = 500;
    double *xm = malloc(m * sizeof *xm);
    for (int i = 0; i < m; i++)
        xm[i] = 28 + 4.0 * i / (m - 1);
    dk_sweep_init(&s, &d);
    double t0 = now();
    sweep_scan_each(&s, DK_VAR_PERIOD, xm, m, DK_VAR_IDLER, pts, NULL);
    double ts = now() - t0;
    printf("curve_scan_points_per_s %.4g\n", m / ts);
    free(xm);
    free(xs);
    free(pts);
}

static void
bench_designs(void)
{
    static dk_design d;
    static const struct {
        const char *key, *crystal, *type;
        dk_waves w;
        int shg;
        dk_scheme scheme;
    } cases[] = {
        {"period_MgO:LN", "MgO:LN", NULL, {1.064, 0, 3.4}, 0, DK_SCHEME_QPM},
        {"angle_BBO", "BBO", NULL, {0.532, 1.064, 1.064}, 1, DK_SCHEME_ANGLE},
        {"angle_KTP_II", "KTP", "II", {0.532, 1.064, 1.064}, 1,
         DK_SCHEME_ANGLE},
        {"angle_LBO", "LBO", NULL, {0.532, 1.064, 1.064}, 1, DK_SCHEME_ANGLE},
        {"angle_BIBO", "BIBO", NULL, {0.532, 1.064, 1.064}, 1,
         DK_SCHEME_ANGLE},
    };
    for (size_t k = 0; k < sizeof cases / sizeof cases[0]; k++) {
        dk_design_request rq;
        dk_design_request_init(&rq);
        rq.crystal = dk_db_find(db, cases[k].crystal);
        rq.crystal_name = cases[k].crystal;
        rq.waves = cases[k].w;
        if (!cases[k].shg)
            dk_waves_complete(&rq.waves, NULL);
        rq.held = cases[k].shg ? 0 : 2;
        rq.shg = cases[k].shg;
        rq.type = cases[k].type;
        rq.scheme = cases[k].scheme;
        rq.temp_c = 100;
        double best = INFINITY;
        for (int r = 0; r < 20; r++) {
            double t0 = now();
            need(dk_design_resolve(&rq, &d, NULL) == DK_OK, cases[k].key);
            double t = now() - t0;
            best = t < best ? t : best;
        }
        printf("%s_ms %.3f\n", cases[k].key, best * 1e3);
    }
}

int
main(void)
{
    dk_error err = {0};
    double t0 = now();
    if (dk_db_load(DK_CRYSTAL_DIR, &db, &err)) {
        fprintf(stderr, "bench: %s\n", err.msg);
        return 1;
    }
    printf("db_full_load_ms %.3f\n", (now() - t0) * 1e3);
    dk_db *one = NULL;
    t0 = now();
    dk_db_load_for(DK_CRYSTAL_DIR, "KTP", &one, NULL);
    printf("db_one_crystal_ms %.3f\n", (now() - t0) * 1e3);
    dk_db_free(one);
    bench_map();
    bench_curve();
    bench_designs();
    dk_db_free(db);
    return 0;
}
