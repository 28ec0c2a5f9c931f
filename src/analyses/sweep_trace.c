/*
 * sweep_trace.c - every root of dk_sweep_solve() along a sweep, by
 * continuation (see sweep_internal.h).
 *
 * dk_sweep_solve() brackets roots by sampling the function on a fixed grid
 * of nodes (400 to 2000 intervals) and refines each sign change with
 * Brent's method; done at every point of a curve that is 10³ evaluations
 * a point. The tracer finds the same roots - one in each grid interval
 * whose ends differ in sign - while evaluating only a few nodes a point:
 *
 *   Nodes. Each node's value is a smooth function of the sweep variable.
 *   After each evaluation the node gets a deadline: the point at which a
 *   linear extrapolation of its last two values would have covered three
 *   quarters of the distance to zero (0.75 |f| / |df/dpoint|, at least the
 *   next point, at most 1/4 of the sweep: a slope that grows by a third
 *   within the step is still caught). Until then its sign is taken as known
 *   (the nodes wait in buckets by deadline, and the intervals whose ends
 *   differ in sign are kept in a list updated from the nodes evaluated,
 *   so a point touches only those nodes and intervals). A
 *   node approaching a root is thus evaluated ever more often and at the
 *   crossing itself, a node far from any root seldom. Points where the
 *   state of the problem changes (an error, a new grid) are scanned in
 *   full, as is the first.
 *
 *   Roots. In each interval whose (known) end signs differ, the root is
 *   found by Newton's method from the prediction of the branch that was
 *   there (cubic extrapolation of its last four roots), on exact
 *   derivatives where the problem has them (the QPM signal share:
 *   dΔk/dx = 2π(n_g,i − n_g,s)/λp from the Taylor-arithmetic-free value
 *   and slope of the compiled formulas) and secant steps otherwise, kept
 *   inside the interval; a step that leaves it, or an interval with no
 *   branch, falls back to Brent on the interval with freshly evaluated
 *   ends. Fresh ends that contradict the known signs make the point
 *   scanned in full again (a safeguard; it also counts in the stats).
 *
 *   Turning points. A pair of branches that meet between two points (or
 *   one branch that meets the symmetry point x = 1/2 of a signal/idler
 *   pair at degeneracy) is a fold of the tuning curve. Its place is found
 *   by Brent's method along the sweep variable on the extremal value of
 *   the function between the two roots (golden-section search), so that
 *   the branches can be drawn to the point where they meet.
 *
 * Newton converges from the predictions in one or two steps, so a curve
 * costs a few evaluations a point instead of a thousand. tests/test_trace.c
 * compares the roots with dk_sweep_solve() at every point of many curves.
 *
 * References: E. L. Allgower, K. Georg, Introduction to Numerical
 * Continuation Methods, SIAM (2003), ch. 2 (predictor-corrector); R. P.
 * Brent, Algorithms for Minimization without Derivatives (1973), ch. 4-5.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/roots.h"
#include "core/roots_sampled.h"
#include "sweep_internal.h"

#define SAFETY 0.75       /* fraction of the extrapolated way to zero */
#define SKIP_PARTS 4      /* at most 1/4 of the sweep between evaluations */
#define NEWTON_STEPS 8
#define MAX_TRACK 64
#define GOLDEN_STEPS 60

typedef struct branch {
    double y[4];          /* roots at the last points, newest first */
    int nh;               /* how many of them */
    double slope;         /* df/dy at the last root (NAN unknown) */
    int used;             /* continued at the current point */
} branch;

typedef struct tracer {
    sweep_problem p;
    int nscan;            /* grid of the nodes below; 0: none yet */
    double *v;            /* node values */
    int *last;            /* point of their last evaluation (−1: none) */
    int *due;             /* point at which they must be evaluated */
    int *gap;             /* backoff for nodes without a value */
    int *lnext, *lprev;   /* the bucket lists of nodes by deadline */
    unsigned char *ist;   /* interval k = [k − 1, k] may hold a root */
    int *iv, niv;         /* those intervals, ascending */
    int *tch, ntch;       /* nodes evaluated since the intervals were
                           * brought up to date */
    int *tgen, gen;       /* generation of each node's entry in tch */
    int *head;            /* first node of each bucket (−1: empty) */
    int nbucket;          /* maxskip + 1 buckets, deadline mod nbucket */
    int cap;              /* nodes allocated */
    int maxskip;
    int nb;               /* branches of the previous point */
    branch b[MAX_TRACK];
    int nnext;            /* branches of the current point */
    branch next[MAX_TRACK];
    sweep_trace_stats st;
} tracer;

static double
eval(tracer *t, double y, double *d)
{
    t->st.evals++;
    return sweep_problem_eval(&t->p, y, d);
}

static double
eval_fn(double y, void *p)
{
    return eval(p, y, NULL);
}

static double
node_y(const tracer *t, int j)
{
    return dk_scan_node(t->p.lo, t->p.hi, t->p.nscan, j);
}

/* Take node j out of its bucket. */
static void
unlink_node(tracer *t, int j)
{
    if (t->due[j] < 0)
        return;
    int b = t->due[j] % t->nbucket;
    if (t->lprev[j] >= 0)
        t->lnext[t->lprev[j]] = t->lnext[j];
    else
        t->head[b] = t->lnext[j];
    if (t->lnext[j] >= 0)
        t->lprev[t->lnext[j]] = t->lprev[j];
    t->due[j] = -1;
}

/* Put node j in the bucket of point @due. */
static void
schedule(tracer *t, int j, int due)
{
    int b = due % t->nbucket;
    t->due[j] = due;
    t->lprev[j] = -1;
    t->lnext[j] = t->head[b];
    if (t->head[b] >= 0)
        t->lprev[t->head[b]] = j;
    t->head[b] = j;
}

/* Evaluate node j at point i and set its deadline. */
static void
eval_node(tracer *t, int j, int i)
{
    unlink_node(t, j);
    if (t->tgen[j] != t->gen) {
        t->tgen[j] = t->gen;
        t->tch[t->ntch++] = j;
    }
    double f = eval(t, node_y(t, j), NULL);
    double rate = NAN;
    if (t->last[j] >= 0 && t->last[j] < i && isfinite(t->v[j]) &&
        isfinite(f))
        rate = (f - t->v[j]) / (i - t->last[j]);
    t->v[j] = f;
    t->last[j] = i;
    int step;
    if (!isfinite(f)) {
        step = t->gap[j];
        t->gap[j] = t->gap[j] < t->maxskip / 2 ? 2 * t->gap[j] : t->maxskip;
    } else {
        t->gap[j] = 1;
        if (!isfinite(rate))
            step = 1;
        else if (rate == 0)
            step = t->maxskip;
        else {
            double d = SAFETY * fabs(f) / fabs(rate);
            step = d < 1 ? 1 : d > t->maxskip ? t->maxskip : (int)d;
        }
    }
    schedule(t, j, i + step);
}

static int
grow(tracer *t, int n)
{
    if (n <= t->cap)
        return 1;
    double *v = realloc(t->v, n * sizeof *v);
    if (v)
        t->v = v;
    int *l = realloc(t->last, n * sizeof *l);
    if (l)
        t->last = l;
    int *d = realloc(t->due, n * sizeof *d);
    if (d)
        t->due = d;
    int *g = realloc(t->gap, n * sizeof *g);
    if (g)
        t->gap = g;
    int *nx = realloc(t->lnext, n * sizeof *nx);
    if (nx)
        t->lnext = nx;
    int *pv = realloc(t->lprev, n * sizeof *pv);
    if (pv)
        t->lprev = pv;
    unsigned char *is = realloc(t->ist, n);
    if (is)
        t->ist = is;
    int *iv = realloc(t->iv, n * sizeof *iv);
    if (iv)
        t->iv = iv;
    int *tc = realloc(t->tch, n * sizeof *tc);
    if (tc)
        t->tch = tc;
    int *tg = realloc(t->tgen, n * sizeof *tg);
    if (tg)
        t->tgen = tg;
    if (!v || !l || !d || !g || !nx || !pv || !is || !iv || !tc || !tg)
        return 0;
    t->cap = n;
    return 1;
}

/* Interval k = [node k − 1, node k] as dk_roots_sampled() looks at it:
 * both ends finite, and a sign change, a zero at the left end, or a zero
 * at the right end of the last interval. */
static int
interesting(const tracer *t, int k)
{
    double f0 = t->v[k - 1], f1 = t->v[k];
    if (!isfinite(f0) || !isfinite(f1))
        return 0;
    return f0 == 0 || f0 * f1 < 0 || (k == t->p.nscan && f1 == 0);
}

/* Bring the interval list up to date with the nodes evaluated since. */
static void
update_intervals(tracer *t)
{
    int n = t->p.nscan + 1;
    for (int a = 0; a < t->ntch; a++)
        for (int k = t->tch[a]; k <= t->tch[a] + 1; k++) {
            if (k < 1 || k >= n)
                continue;
            int now = interesting(t, k);
            if (now == t->ist[k])
                continue;
            t->ist[k] = (unsigned char)now;
            int pos = 0;
            while (pos < t->niv && t->iv[pos] < k)
                pos++;
            if (now) {
                memmove(t->iv + pos + 1, t->iv + pos,
                        (t->niv - pos) * sizeof *t->iv);
                t->iv[pos] = k;
                t->niv++;
            } else {
                memmove(t->iv + pos, t->iv + pos + 1,
                        (t->niv - pos - 1) * sizeof *t->iv);
                t->niv--;
            }
        }
    t->ntch = 0;
    t->gen++;
}

/* The predicted root of branch @b at the next point. */
static double
predict(const branch *b)
{
    switch (b->nh) {
    case 1: return b->y[0];
    case 2: return 2 * b->y[0] - b->y[1];
    case 3: return 3 * b->y[0] - 3 * b->y[1] + b->y[2];
    default: return 4 * b->y[0] - 6 * b->y[1] + 4 * b->y[2] - b->y[3];
    }
}

static void
push(branch *b, double y, double slope)
{
    b->y[3] = b->y[2];
    b->y[2] = b->y[1];
    b->y[1] = b->y[0];
    b->y[0] = y;
    b->nh = b->nh < 4 ? b->nh + 1 : 4;
    if (isfinite(slope))
        b->slope = slope;
}

/* Record root @r of the current point, continued from branch @from (−1:
 * a new branch). */
static void
keep(tracer *t, int from, double r, double slope)
{
    if (t->nnext >= MAX_TRACK)
        return;
    branch *b = &t->next[t->nnext++];
    if (from >= 0)
        *b = t->b[from];
    else {
        memset(b, 0, sizeof *b);
        b->slope = NAN;
    }
    b->used = 0;
    push(b, r, slope);
}

/*
 * Newton's method (secant where no derivative is known) from @y0, kept
 * inside [a, b]. Returns 1 with *root when a step below the solver's
 * tolerance is taken (the root is then the stepped point, whose error is
 * of the order of the step squared over the scale of the curvature: far
 * below the tolerance); 0 when a step leaves the interval or it does not
 * converge.
 */
static int
newton(tracer *t, double a, double b, double y0, double slope0,
       double *root, double *slope)
{
    double tol = t->p.xtol;
    double y = y0, yp = NAN, fp = NAN, s = slope0;
    for (int k = 0; k < NEWTON_STEPS; k++) {
        double d;
        double f = eval(t, y, &d);
        if (!isfinite(f))
            return 0;
        if (isfinite(d))
            s = d;
        else if (isfinite(fp) && y != yp)
            s = (f - fp) / (y - yp);
        if (f == 0) {
            *root = y, *slope = s;
            return 1;
        }
        if (!isfinite(s) || s == 0)
            return 0;
        double step = -f / s, yn = y + step;
        if (!(yn >= a && yn <= b))
            return 0;
        if (fabs(step) <= tol) {
            *root = yn, *slope = s;
            return 1;
        }
        yp = y, fp = f, y = yn;
    }
    return 0;
}

/* A full scan at point @i (as dk_sweep_solve() does it); the branches
 * start anew. */
static dk_status
full_scan(tracer *t, int i, double *roots, int *nr, int *born,
          dk_error *err)
{
    int n = t->p.nscan + 1;
    if (!grow(t, n))
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    t->nscan = t->p.nscan;
    t->st.full_scans++;
    for (int k = 0; k < t->nbucket; k++)
        t->head[k] = -1;
    for (int j = 0; j < n; j++) {
        t->last[j] = -1;
        t->gap[j] = 1;
        t->due[j] = -1;
        t->tgen[j] = t->gen;   /* not recorded: the list is rebuilt */
        eval_node(t, j, i);
    }
    t->ntch = 0;
    t->gen++;
    t->niv = 0;
    t->ist[0] = 0;
    for (int k = 1; k < n; k++)
        if ((t->ist[k] = (unsigned char)interesting(t, k)))
            t->iv[t->niv++] = k;
    dk_status s = dk_roots_sampled(eval_fn, t, t->p.lo, t->p.hi, t->p.nscan,
                                   t->v, t->p.xtol, roots, t->p.maxroots,
                                   nr, err);
    t->nnext = 0;
    for (int k = 0; !s && k < *nr; k++) {
        born[k] = 1;
        keep(t, -1, roots[k], NAN);
    }
    return s;
}

/* The unused branch whose prediction is nearest [a, b] (at most one
 * interval away); −1 if none. */
static int
branch_for(tracer *t, double a, double b, const double *pred)
{
    int best = -1;
    double bd = b - a;
    for (int k = 0; k < t->nb; k++) {
        if (t->b[k].used)
            continue;
        double y = pred[k];
        double d = y < a ? a - y : y > b ? y - b : 0;
        if (d <= bd)
            bd = d, best = k;
    }
    return best;
}

/*
 * The roots at point @i from the known node signs (see the top of this
 * file). *rescan = 1 when a fresh evaluation contradicted a known sign.
 * @born[k] = 1 for roots not continued from a branch.
 */
static dk_status
continue_roots(tracer *t, int i, double *roots, int *nr, int *born,
               int *rescan, dk_error *err)
{
    int n = t->p.nscan + 1;
    /* The nodes due at this point: deadlines lie 1 to maxskip points
     * ahead, so the bucket of point i holds exactly them. */
    int bucket = i % t->nbucket;
    while (t->head[bucket] >= 0)
        eval_node(t, t->head[bucket], i);
    double pred[MAX_TRACK];
    for (int k = 0; k < t->nb; k++) {
        pred[k] = predict(&t->b[k]);
        t->b[k].used = 0;
    }
    t->nnext = 0;
    *nr = 0;
    update_intervals(t);
    /* The intervals to look at, as dk_roots_sampled() would find them
     * walking the whole grid (a copy: refreshing nodes below may change
     * the list, for the next point). */
    int list[MAX_TRACK * 4], niv = t->niv;
    if (niv > (int)(sizeof list / sizeof list[0])) {
        *rescan = 1;   /* a pathological grid: scan it whole */
        return DK_OK;
    }
    memcpy(list, t->iv, niv * sizeof *list);
    for (int a = 0; a < niv && *nr < t->p.maxroots; a++) {
        int j = list[a];
        double x0 = node_y(t, j - 1), f0 = t->v[j - 1];
        double x1 = node_y(t, j), f1 = t->v[j];
        if (!isfinite(f0) || !isfinite(f1))
            continue;
        double r = NAN, slope = NAN;
        int from = -1;
        if (f0 == 0) {
            if (*nr == 0 || roots[*nr - 1] != x0)
                r = x0;
        } else if (f0 * f1 < 0) {
            from = branch_for(t, x0, x1, pred);
            double g = from >= 0 ? fmin(fmax(pred[from], x0), x1) : NAN;
            if (from < 0 ||
                !newton(t, x0, x1, g, t->b[from].slope, &r, &slope)) {
                /* Brent on the interval, with fresh ends. */
                eval_node(t, j - 1, i);
                eval_node(t, j, i);
                double fa = t->v[j - 1], fb = t->v[j];
                f1 = fb;
                if (!(isfinite(fa) && isfinite(fb) && fa * fb <= 0)) {
                    *rescan = 1;
                    return DK_OK;
                }
                if (fa == 0)
                    r = x0;
                else if (fb == 0)
                    r = x1;
                else {
                    dk_status s = dk_root_bracketed(eval_fn, t, x0, x1,
                                                    t->p.xtol, &r, err);
                    if (s)
                        return s;
                }
            }
        }
        if (isfinite(r)) {
            born[*nr] = from < 0;
            roots[(*nr)++] = r;
            if (from >= 0)
                t->b[from].used = 1;
            keep(t, from, r, slope);
        }
        if (j == n - 1 && f1 == 0 && *nr < t->p.maxroots) {
            born[*nr] = 1;
            roots[(*nr)++] = x1;
            keep(t, -1, x1, NAN);
        }
    }
    return DK_OK;
}

/* --- Turning points --------------------------------------------------- */

typedef struct fold_probe {
    dk_sweep *s;          /* a scratch copy of the sweep */
    dk_var xv, target;
    double xa, xb;        /* the two points */
    double ya, yb;        /* where the meeting roots are, at the roots' side */
    int at_symmetry;      /* one root meeting its twin at x = 1/2 */
    double sigma;         /* sign making the extremum negative where the
                           * roots exist */
    sweep_problem q;
    double arg;           /* where the last extremum was */
    long evals;
} fold_probe;

/* Put the scratch sweep at u ∈ [0, 1] between the two points. */
static int
fold_at(fold_probe *fp, double u)
{
    if (dk_sweep_set(fp->s, fp->xv, fp->xa + u * (fp->xb - fp->xa), NULL))
        return 0;
    return sweep_problem_setup(&fp->q, fp->s, fp->target);
}

static double
fold_f(fold_probe *fp, double y)
{
    fp->evals++;
    double f = sweep_problem_eval(&fp->q, y, NULL);
    return isfinite(f) ? fp->sigma * f : INFINITY;
}

/* The extremal value of σF over the bracket about the roots, at u. */
static double
fold_extremum(double u, void *p)
{
    fold_probe *fp = p;
    if (!fold_at(fp, u))
        return NAN;
    if (fp->at_symmetry) {
        fp->arg = 0.5;
        double f = fold_f(fp, 0.5);
        return isfinite(f) ? f : NAN;
    }
    double w = (fp->yb - fp->ya) + 2 * (fp->q.hi - fp->q.lo) / fp->q.nscan;
    double a = fmax(fp->ya - w, fp->q.lo), b = fmin(fp->yb + w, fp->q.hi);
    const double g = (sqrt(5.0) - 1) / 2;
    double x1 = b - g * (b - a), x2 = a + g * (b - a);
    double f1 = fold_f(fp, x1), f2 = fold_f(fp, x2);
    for (int k = 0; k < GOLDEN_STEPS && b - a > 1e-15 * fabs(b); k++) {
        if (f1 < f2) {
            b = x2, x2 = x1, f2 = f1;
            x1 = b - g * (b - a), f1 = fold_f(fp, x1);
        } else {
            a = x1, x1 = x2, f1 = f2;
            x2 = a + g * (b - a), f2 = fold_f(fp, x2);
        }
    }
    fp->arg = f1 < f2 ? x1 : x2;
    double m = fmin(f1, f2);
    return isfinite(m) ? m : NAN;
}

/*
 * Where the roots @ya < @yb (at point @i − 1 + @birth) meet between points
 * @i − 1 and @i; 0 when the function does not behave as at a fold.
 */
static int
refine_fold(tracer *t, dk_sweep *scratch, const dk_sweep *s, dk_var xv,
            const double *xs, int i, int birth, double ya, double yb,
            int at_symmetry, sweep_fold *out)
{
    fold_probe fp = {0};
    memcpy(scratch, s, sizeof *scratch);
    fp.s = scratch;
    fp.xv = xv;
    fp.target = t->p.target;
    fp.xa = xs[i - 1];
    fp.xb = xs[i];
    fp.ya = ya;
    fp.yb = yb;
    fp.at_symmetry = at_symmetry;
    double u_roots = birth ? 1 : 0;
    fp.sigma = 1;
    if (!fold_at(&fp, u_roots))
        return 0;
    double mid = sweep_problem_eval(&fp.q, at_symmetry ? 0.5 : 0.5 * (ya + yb),
                                    NULL);
    if (!isfinite(mid) || mid == 0)
        return 0;
    fp.sigma = mid < 0 ? 1 : -1;
    double e_roots = fold_extremum(u_roots, &fp);
    double e_other = fold_extremum(1 - u_roots, &fp);
    double u;
    if (!(e_roots < 0 && e_other > 0) ||
        dk_root_bracketed(fold_extremum, &fp, 0, 1, 1e-12, &u, NULL))
        return 0;
    fold_extremum(u, &fp);
    t->st.evals += fp.evals;
    double y = fp.arg;
    const dk_design *d = &scratch->d;
    out->x = fp.xa + u * (fp.xb - fp.xa);
    for (int k = 0; k < 3; k++)
        out->y[k] = sweep_problem_value(&fp.q, y, k);
    out->waves = d->waves;
    out->temp_c = d->temp_c;
    if (fp.q.kind == SP_QPM_SHARE || fp.q.kind == SP_ANGLE_SHARE)
        out->waves = dk_waves_of_share(fp.q.pump_um, y);
    else if (fp.q.kind == SP_QPM_TEMP || fp.q.kind == SP_ANGLE_TEMP)
        out->temp_c = y;
    out->flags = dk_design_range_flags(d, &out->waves, out->temp_c);
    return 1;
}

static int
add_fold(sweep_fold **folds, int *nfolds, int *cap, const sweep_fold *f)
{
    if (*nfolds == *cap) {
        int nc = *cap ? 2 * *cap : 8;
        sweep_fold *g = realloc(*folds, nc * sizeof *g);
        if (!g)
            return 0;
        *folds = g;
        *cap = nc;
    }
    (*folds)[(*nfolds)++] = *f;
    return 1;
}

/* The turning points between points i − 1 and i: pairs of neighbouring
 * branches that ended, pairs of neighbouring roots that are new, and a
 * branch of a symmetric half grid ending or starting at x = 1/2. */
static int
find_folds(tracer *t, dk_sweep *scratch, const dk_sweep *s, dk_var xv,
           const double *xs, int i, const double *prev, int nprev,
           const double *roots, int nr, const int *born, sweep_fold **folds,
           int *nfolds, int *cap)
{
    for (int side = 0; side < 2; side++) {
        /* side 0: ends after point i − 1; side 1: births before point i */
        const double *y = side ? roots : prev;
        int ny = side ? nr : (nprev < t->nb ? nprev : t->nb);
        for (int k = 0; k < ny; k++) {
            int gone = side ? born[k] : !t->b[k].used;
            if (!gone)
                continue;
            int pair = k + 1 < ny &&
                       (side ? born[k + 1] : !t->b[k + 1].used);
            /* The lowest branch of a half grid meets its twin at 1/2
             * (refine_fold() checks that it does). */
            int sym = !pair && k == 0 && t->p.half;
            if (!pair && !sym)
                continue;
            sweep_fold f = {0};
            f.at = side ? i : i - 1;
            f.birth = side;
            f.root[0] = k;
            f.root[1] = pair ? k + 1 : -1;
            if (refine_fold(t, scratch, s, xv, xs, i, side,
                            pair ? y[k] : t->p.lo, pair ? y[k + 1] : y[0],
                            !pair, &f) &&
                !add_fold(folds, nfolds, cap, &f))
                return 0;
            if (pair)
                k++;
        }
    }
    return 1;
}

/* --- The sweep -------------------------------------------------------- */

static void
note_failure(trace_point *pt, dk_status st, const dk_error *e,
             dk_error *first)
{
    pt->status = st ? st : DK_EINVAL;
    pt->n = 0;
    if (first && !first->msg[0])
        *first = *e;
}

/* A point through dk_sweep_solve() itself. */
static void
solve_point(dk_sweep *s, dk_var target, trace_point *pt, dk_error *first)
{
    dk_error e = {0};
    int n = 0;
    dk_status st = dk_sweep_solve(s, target, pt->v, DK_SWEEP_MAX_ROOTS, &n,
                                  &e);
    if (st) {
        note_failure(pt, st, &e, first);
        return;
    }
    pt->status = DK_OK;
    pt->n = n;
    for (int k = 0; k < n; k++)
        pt->src[k] = -1;
}

dk_status
sweep_scan_each(dk_sweep *s, dk_var xv, const double *xs, int n,
                dk_var target, trace_point *pts, dk_error *first)
{
    for (int i = 0; i < n; i++) {
        dk_error e = {0};
        dk_status st = dk_sweep_set(s, xv, xs[i], &e);
        if (st)
            note_failure(&pts[i], st, &e, first);
        else
            solve_point(s, target, &pts[i], first);
    }
    return DK_OK;
}

dk_status
sweep_trace(dk_sweep *s, dk_var xv, const double *xs, int n, dk_var target,
            const sweep_trace_opts *opts, trace_point *pts,
            sweep_fold **folds, int *nfolds, dk_error *first,
            sweep_trace_stats *stats)
{
    tracer *t = calloc(1, sizeof *t);
    dk_sweep *scratch = NULL;
    int cap = 0, reset = 1;
    double prev[64];
    int nprev = 0, have_prev = 0;
    dk_status ret = DK_OK;
    if (folds)
        *folds = NULL, *nfolds = 0;
    if (!t)
        return DK_ENOMEM;
    t->maxskip = n / SKIP_PARTS > 1 ? n / SKIP_PARTS : 1;
    t->nbucket = t->maxskip + 1;
    t->head = malloc(t->nbucket * sizeof *t->head);
    if (!t->head) {
        free(t);
        return DK_ENOMEM;
    }
    for (int i = 0; i < n; i++) {
        dk_error e;   /* not zeroed: 0.5 kB a point; only the message */
        e.status = DK_OK;
        e.msg[0] = '\0';
        trace_point *pt = &pts[i];
        pt->n = 0;
        pt->status = DK_OK;
        dk_status st = dk_sweep_set(s, xv, xs[i], &e);
        if (st) {
            note_failure(pt, st, &e, first);
            reset = 1, have_prev = 0;
            continue;
        }
        if (!sweep_problem_setup(&t->p, s, target)) {
            solve_point(s, target, pt, first);
            if (opts && opts->each)
                opts->each(opts->ctx, i, s, pt);
            reset = 1, have_prev = 0;
            continue;
        }
        double roots[64];
        int nr = 0, born[64], rescan = 0, scanned = 0;
        if (reset || t->p.nscan != t->nscan)
            st = full_scan(t, i, roots, &nr, born, &e), scanned = 1;
        else {
            st = continue_roots(t, i, roots, &nr, born, &rescan, &e);
            if (!st && rescan)
                st = full_scan(t, i, roots, &nr, born, &e), scanned = 1;
        }
        if (st == DK_ENOMEM) {
            ret = st;
            break;
        }
        if (st) {
            note_failure(pt, st, &e, first);
            reset = 1, have_prev = 0;
            continue;
        }
        if (opts && opts->folds && folds && have_prev && !scanned) {
            if (!scratch && !(scratch = malloc(sizeof *scratch))) {
                ret = DK_ENOMEM;
                break;
            }
            if (!find_folds(t, scratch, s, xv, xs, i, prev, nprev, roots, nr,
                            born, folds, nfolds, &cap)) {
                ret = DK_ENOMEM;
                break;
            }
        }
        /* The branches of this point become the previous ones. */
        memcpy(t->b, t->next, t->nnext * sizeof *t->b);
        t->nb = t->nnext;
        int wave[DK_SWEEP_MAX_ROOTS];
        pt->n = sweep_problem_values(&t->p, roots, nr, pt->v, pt->src, wave,
                                     DK_SWEEP_MAX_ROOTS);
        if (opts && opts->each)
            opts->each(opts->ctx, i, s, pt);
        memcpy(prev, roots, nr * sizeof *prev);
        nprev = nr;
        have_prev = 1;
        reset = 0;
    }
    if (stats)
        *stats = t->st;
    free(t->v), free(t->last), free(t->due), free(t->gap);
    free(t->lnext), free(t->lprev), free(t->head);
    free(t->ist), free(t->iv), free(t->tch), free(t->tgen);
    free(t);
    free(scratch);
    if (ret && folds) {
        free(*folds);
        *folds = NULL, *nfolds = 0;
    }
    return ret;
}
