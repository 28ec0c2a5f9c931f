/*
 * sweep_internal.h - the machinery behind deltak/sweep.h (internal):
 *
 *   the solve problem of one sweep point: the function whose roots
 *     dk_sweep_solve() returns, its scan grid, and how roots become
 *     values (sweep_problem.c);
 *   the tracer: every root of that problem along a sweep, by continuation
 *     instead of a full scan per point, with the turning points of the
 *     branches (sweep_trace.c);
 *   the batch map: sinc²(ΔkL/2) of a map in vectorised lines on all
 *     cores (sweep_batch.c).
 */
#ifndef DK_SWEEP_INTERNAL_H
#define DK_SWEEP_INTERNAL_H

#include "deltak/sweep.h"
#include "design/angle_fast.h"
#include "design/qpm_fast.h"

/* Scan grids of dk_sweep_solve() for birefringent designs. */
#define DK_SWEEP_ANGLE_SCAN 900    /* intervals over 90° of θ or φ */
#define DK_SWEEP_SHARE_SCAN 1000   /* intervals over the signal share */
#define DK_SWEEP_TEMP_SCAN 400     /* intervals over the temperature range */
#define DK_SWEEP_SHARE_TOL 1e-12
#define DK_SWEEP_TEMP_TOL 1e-7
#define DK_SWEEP_ANGLE_TOL 1e-10
#define DK_SWEEP_PAIRS 32          /* signal/idler pairs kept per point */

typedef enum sweep_kind {
    SP_QPM_SHARE,     /* signal share x = ν_s/ν_p, QPM */
    SP_ANGLE_SHARE,   /* signal share, birefringent */
    SP_QPM_TEMP,      /* temperature, QPM */
    SP_ANGLE_TEMP,    /* temperature, birefringent */
    SP_ANGLE_DIR      /* θ or φ, birefringent */
} sweep_kind;

/* What one value of dk_sweep_solve() is, given the root y it comes from. */
enum { SP_WAVE_SIGNAL, SP_WAVE_IDLER, SP_WAVE_SELF };

/* The solve problem at the current state of a sweep. */
typedef struct sweep_problem {
    sweep_kind kind;
    dk_var target;
    dk_sweep *s;
    double lo, hi;      /* the scan grid of dk_sweep_solve() */
    int nscan;
    double xtol;
    int maxroots;       /* roots the scan keeps */
    double pump_um;     /* share problems */
    int symmetric;      /* Δk(x) = Δk(1 − x): signal and idler alike */
    int half;           /* the grid starts at the symmetry point x = 1/2 */
    int vary_phi;       /* SP_ANGLE_DIR: φ (else θ) */
    int fast;           /* the compiled forms below are valid */
    dk_qpm_fast qf;
    dk_angle_fast af;
    double fast_temp_c; /* temperature they were compiled at */
    double np;          /* QPM share: the pump's index at this point */
} sweep_problem;

/*
 * sweep_problem_setup:
 * The problem of @target at @s's current state (@p may hold the previous
 * point's problem: compiled forms are kept while the temperature is).
 * Returns 1, or 0 when the point must go through dk_sweep_solve() (a
 * target without roots to trace, or a state that solver reports as an
 * error).
 */
int sweep_problem_setup(sweep_problem *p, dk_sweep *s, dk_var target);

/* The function at y, as dk_sweep_solve() evaluates it; *dfdy gets the
 * exact derivative where one is known, NAN otherwise (@dfdy may be NULL). */
double sweep_problem_eval(sweep_problem *p, double y, double *dfdy);

/* The same, as a dk_scalar_fn over a sweep_problem. */
double sweep_problem_fn(double y, void *p);

/*
 * sweep_problem_values:
 * The values dk_sweep_solve() returns for the ascending roots @roots (as
 * its scan returns them), in its order, at most @max; @src[k] gets the
 * index of the root value k comes from and @wave[k] its SP_WAVE_* kind.
 * Returns: how many.
 */
int sweep_problem_values(const sweep_problem *p, const double *roots, int nr,
                         double *values, int *src, int *wave, int max);

/* Value of kind @wave for root @y (µm, °C or degrees). */
double sweep_problem_value(const sweep_problem *p, double y, int wave);

/* A turning point between two sweep points: where two roots meet (or one
 * meets the symmetry point of signal and idler). */
typedef struct sweep_fold {
    int at;             /* the point whose roots meet (end) or are born */
    int birth;          /* 0: the roots end after point @at; 1: they are
                         * born before it */
    int root[2];        /* their indices among that point's roots (−1) */
    double x;           /* sweep value of the turning point */
    double y[3];        /* its values by SP_WAVE_* */
    unsigned flags;     /* DK_RANGE_* there */
    dk_waves waves;     /* there (for the range notes) */
    double temp_c;
} sweep_fold;

/* The roots of one sweep point. */
typedef struct trace_point {
    int status;         /* DK_OK, or why the point has no value */
    int n;              /* values, in dk_sweep_solve()'s order */
    double v[DK_SWEEP_MAX_ROOTS];
    int src[DK_SWEEP_MAX_ROOTS];
} trace_point;

typedef struct sweep_trace_opts {
    int folds;          /* find turning points (curves; not map ridges) */
    /* Called after each point with the sweep at that point (may be
     * NULL). */
    void (*each)(void *ctx, int i, dk_sweep *s, const trace_point *pt);
    void *ctx;
} sweep_trace_opts;

/* Counters of the work done (for the benchmark). */
typedef struct sweep_trace_stats {
    long evals;         /* function evaluations */
    long full_scans;    /* points scanned over the whole grid */
} sweep_trace_stats;

/*
 * sweep_trace:
 * dk_sweep_solve(@s, @target) at each of the @n values @xs of variable
 * @xv, by continuation (see sweep_trace.c). @s is set to each point in
 * turn. @pts[i].status is the status of dk_sweep_set() or the solver at
 * point i (its message in @first when it is the first failure).
 * @folds, @nfolds (may be NULL): the turning points found (*folds is
 * allocated; free() it).
 * Returns: DK_OK or DK_ENOMEM.
 */
dk_status sweep_trace(dk_sweep *s, dk_var xv, const double *xs, int n,
                      dk_var target, const sweep_trace_opts *opts,
                      trace_point *pts, sweep_fold **folds, int *nfolds,
                      dk_error *first, sweep_trace_stats *stats);

/* The old way, kept as the reference the tests compare the tracer with:
 * dk_sweep_solve() at every point. */
dk_status sweep_scan_each(dk_sweep *s, dk_var xv, const double *xs, int n,
                          dk_var target, trace_point *pts, dk_error *first);

/*
 * sweep_map_batch:
 * The cells of a map (res->x, res->y filled) by the batch engine when the
 * design allows (QPM, or a collinear birefringent design at a fixed
 * direction, with no angle among the variables): res->z, res->cell,
 * res->flags and the range notes, as the cell-by-cell path gives them.
 * *done = 0 when the design does not allow it (nothing changed).
 * Returns: DK_OK or DK_ENOMEM; *defined gets the cells with a value.
 */
dk_status sweep_map_batch(const dk_design *base, const dk_map_spec *sp,
                          dk_map_result *res, int *done, size_t *defined);

/* 1 when the batch engine takes a map of @x and @y of @base. */
int sweep_batch_allows(const dk_design *base, dk_var x, dk_var y);

/*
 * sweep_cells_batch:
 * The cells of @res (x, y filled; z and cell allocated) by the batch
 * engine, with the DK_RANGE_* flags of each cell in @flags (nx·ny, 0
 * where undefined); no notes. The caller has checked
 * sweep_batch_allows(). Returns DK_OK or DK_ENOMEM.
 */
dk_status sweep_cells_batch(const dk_design *base, const dk_map_spec *sp,
                            dk_map_result *res, unsigned char *flags,
                            size_t *defined);

/* The waves and temperature of a cell: @base with @y set to @yval, then
 * @x to @xval, as dk_sweep_set() leaves them; 0 when a setting fails. */
int sweep_cell_state(const dk_design *base, dk_var y, double yval, dk_var x,
                     double xval, dk_waves *w, double *temp_c);

/*
 * dk_sinc2_batch:
 * sinc²(Δk L/2) for @n mismatches (rad/µm) and lengths (µm), vectorised,
 * NaN where Δk is; agrees with dk_sinc2() to ~1e-15 relative.
 */
void dk_sinc2_batch(const double *dk, const double *length_um, double *out,
                    size_t n);

#endif /* DK_SWEEP_INTERNAL_H */
