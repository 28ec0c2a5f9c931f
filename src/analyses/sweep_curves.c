/*
 * sweep_curves.c - tuning curves and analyses along one variable, as
 * series of (x, y, range flags) (see deltak/sweep.h).
 *
 * Roots at each point are sorted; branch k of a curve joins the k-th
 * roots of neighbouring points. The roots come from the tracer
 * (sweep_trace.c): the roots dk_sweep_solve() finds at each point, by
 * continuation, plus the turning points where two branches meet (or a
 * signal/idler pair meets at degeneracy): those are inserted into the
 * series they end (or start), and the line is broken there when the
 * series goes on with another branch. Analyses bring the design back to
 * phase matching at each point before they are evaluated, starting from
 * the previous point's angle (a continuation along the curve).
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/pulse.h"
#include "deltak/sweep.h"
#include "sweep_internal.h"

#define R DK_SWEEP_MAX_ROOTS

/* The values of one point. */
typedef struct point {
    int n;
    double y[R];
    unsigned f[R];
    int src[R];      /* root each value comes from (solve; −1 unknown) */
} point;

static const struct {
    const char *name, *value, *unit;
} quantities[] = {
    [DK_SWEEP_SOLVE] = {"", "", ""},
    [DK_SWEEP_GVM] = {"gvm", "gvm", "fs_per_mm"},
    [DK_SWEEP_DEFF] = {"deff", "deff", "pm_per_V"},
    [DK_SWEEP_SINC2] = {"sinc2", "sinc2", "1"},
    [DK_SWEEP_ACCEPT_TEMP] = {"accept-temp", "temperature_fwhm", "C"},
    [DK_SWEEP_ACCEPT_SIGNAL] = {"accept-signal", "signal_fwhm", "nm"},
    [DK_SWEEP_ACCEPT_THETA] = {"accept-theta", "theta_fwhm", "mrad"},
};
#define NQ (sizeof quantities / sizeof quantities[0])

dk_status
dk_sweep_quantity_parse(const char *name, dk_sweep_quantity *q,
                        dk_var *target, dk_error *err)
{
    for (size_t i = 1; name && i < NQ; i++)
        if (strcmp(name, quantities[i].name) == 0) {
            *q = (dk_sweep_quantity)i;
            return DK_OK;
        }
    *q = DK_SWEEP_SOLVE;
    dk_error e2 = {0};
    if (name && dk_var_parse(name, target, &e2) == DK_OK &&
        *target != DK_VAR_PUMP && *target != DK_VAR_FUNDAMENTAL &&
        *target != DK_VAR_ALPHA && *target != DK_VAR_LENGTH)
        return DK_OK;
    return dk_error_set(err, DK_EINVAL,
                        "cannot solve for '%s': give idler, signal, "
                        "wavelengths, period, temp, theta or phi, or an "
                        "analysis: gvm, deff, sinc2, accept-temp, "
                        "accept-signal, accept-theta",
                        name ? name : "");
}

const char *
dk_sweep_quantity_name(dk_sweep_quantity q, dk_var target)
{
    return q == DK_SWEEP_SOLVE ? dk_var_name(target) : quantities[q].value;
}

const char *
dk_sweep_quantity_unit(dk_sweep_quantity q, dk_var target)
{
    return q == DK_SWEEP_SOLVE ? dk_var_unit(target) : quantities[q].unit;
}

/* The design's waves and temperature with @target set to @value. */
static void
point_state(const dk_sweep *s, dk_var target, double value, dk_waves *w,
            double *t)
{
    *w = s->d.waves;
    *t = s->d.temp_c;
    if (target == DK_VAR_TEMP)
        *t = value;
    else if (target == DK_VAR_SIGNAL)
        w->signal_um = value,
        w->idler_um = dk_third_wave_um(w->pump_um, value);
    else if (target == DK_VAR_IDLER)
        w->idler_um = value,
        w->signal_um = dk_third_wave_um(w->pump_um, value);
}

/* The state of root @k of a solved point (@y[0..n-1]): for the
 * wavelength pair the roots come as (signal, idler) pairs, an unpaired
 * last signal with no idler. */
static void
root_state(const dk_sweep *s, dk_var target, const double *y, int n, int k,
           dk_waves *w, double *t)
{
    if (target != DK_VAR_WAVELENGTHS) {
        point_state(s, target, y[k], w, t);
        return;
    }
    *w = s->d.waves;
    *t = s->d.temp_c;
    w->signal_um = y[k & ~1];
    w->idler_um = (k | 1) < n ? y[k | 1] : NAN;
}

static int
keep_period_of(const dk_design *base, const dk_sweep_spec *sp)
{
    return base->period_um > 0 &&
           (base->rq.period_um > 0 || sp->x == DK_VAR_PERIOD ||
            (sp->nfamily && sp->family == DK_VAR_PERIOD));
}

/* Evaluate one point; returns 0 (pt->n may be 0) or a status. */
static dk_status
eval_point(dk_sweep *s, const dk_sweep_spec *sp, int keep_period, point *pt,
           dk_error *err)
{
    dk_design *d = &s->d;
    pt->n = 0;
    dk_status st;
    if (sp->quantity == DK_SWEEP_SOLVE) {
        if ((st = dk_sweep_solve(s, sp->target, pt->y, R, &pt->n, err)))
            return st;
        for (int k = 0; k < pt->n; k++) {
            dk_waves w;
            double t;
            root_state(s, sp->target, pt->y, pt->n, k, &w, &t);
            pt->f[k] = dk_design_range_flags(d, &w, t);
        }
        return DK_OK;
    }
    if (sp->quantity != DK_SWEEP_SINC2 &&
        (st = dk_sweep_rephase(s, keep_period, err)))
        return st == DK_ENOROOT ? DK_OK : st;
    unsigned f = dk_design_range_flags(d, &d->waves, d->temp_c);
    switch (sp->quantity) {
    case DK_SWEEP_GVM: {
        dk_pulse_props pp;
        if ((st = dk_pulse_props_of(d, &pp, err)))
            return st;
        for (int k = 0; k < 3; k++)
            pt->y[k] = pp.gvm_fs_per_mm[k], pt->f[k] = f;
        pt->n = 3;
        return DK_OK;
    }
    case DK_SWEEP_DEFF:
        pt->y[0] = dk_design_deff(d);
        break;
    case DK_SWEEP_SINC2:
        pt->y[0] = dk_sweep_sinc2(s);
        break;
    default: {
        dk_tol_param p = sp->quantity == DK_SWEEP_ACCEPT_TEMP
                             ? DK_TOL_TEMPERATURE
                         : sp->quantity == DK_SWEEP_ACCEPT_SIGNAL
                             ? DK_TOL_SIGNAL
                             : DK_TOL_THETA;
        double scale = p == DK_TOL_TEMPERATURE ? 1 : 1e3;
        dk_acceptance a;
        if (!dk_design_applies(d, p))
            return dk_error_set(err, DK_EINVAL,
                                "this acceptance does not apply to a %s "
                                "design",
                                dk_scheme_str(d->scheme));
        if ((st = dk_design_tolerance(d, p, &a, err)))
            return st;
        pt->y[0] = a.bounded ? a.fwhm * scale : NAN;
    }
    }
    pt->f[0] = f;
    pt->n = isfinite(pt->y[0]);
    return DK_OK;
}

static void
family_label(dk_var v, double val, char *buf, size_t n)
{
    switch (v) {
    case DK_VAR_PERIOD: snprintf(buf, n, "Λ = %.4g µm", val); break;
    case DK_VAR_TEMP: snprintf(buf, n, "%.4g °C", val); break;
    case DK_VAR_THETA: snprintf(buf, n, "θ = %.4g°", val); break;
    case DK_VAR_PHI: snprintf(buf, n, "φ = %.4g°", val); break;
    case DK_VAR_ALPHA: snprintf(buf, n, "α = %.4g°", val); break;
    case DK_VAR_LENGTH: snprintf(buf, n, "L = %.4g mm", val); break;
    default: snprintf(buf, n, "%s %.5g µm", dk_var_name(v), val);
    }
}

void
dk_sweep_result_free(dk_sweep_result *res)
{
    if (!res)
        return;
    for (int i = 0; i < res->nseries; i++) {
        free(res->series[i].x);
        free(res->series[i].y);
        free(res->series[i].flags);
    }
    free(res->series);
    res->series = NULL;
    res->nseries = 0;
}

static dk_status
check_spec(const dk_design *base, const dk_sweep_spec *sp, dk_error *err)
{
    dk_status vs = dk_var_check(sp->x, sp->x_lo, err);
    if (!vs)
        vs = dk_var_check(sp->x, sp->x_hi, err);
    for (int f = 0; !vs && f < sp->nfamily; f++)
        vs = dk_var_check(sp->family, sp->family_values[f], err);
    if (vs)
        return vs;
    if (sp->nx < 2 || sp->nx > DK_SWEEP_MAX_POINTS)
        return dk_error_set(err, DK_EINVAL,
                            "a curve has 2 to %d points, not %d",
                            DK_SWEEP_MAX_POINTS, sp->nx);
    if (!isfinite(sp->x_lo) || !isfinite(sp->x_hi) || sp->x_lo == sp->x_hi)
        return dk_error_set(err, DK_EINVAL,
                            "the range of %s must be finite with two "
                            "different ends",
                            dk_var_name(sp->x));
    if (sp->nfamily < 0 || sp->nfamily > DK_SWEEP_MAX_FAMILY)
        return dk_error_set(err, DK_EINVAL,
                            "a family has at most %d members",
                            DK_SWEEP_MAX_FAMILY);
    if (sp->quantity == DK_SWEEP_SOLVE &&
        (sp->target == sp->x ||
         (sp->nfamily && sp->target == sp->family)))
        return dk_error_set(err, DK_EINVAL,
                            "cannot solve for '%s' while varying it",
                            dk_var_name(sp->target));
    /* Every variable must apply to this design. */
    dk_sweep *probe = malloc(sizeof *probe);
    if (!probe)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    dk_sweep_init(probe, base);
    dk_status s = dk_sweep_set(probe, sp->x, sp->x_lo, err);
    for (int f = 0; !s && f < sp->nfamily; f++)
        s = dk_sweep_set(probe, sp->family, sp->family_values[f], err);
    if (!s && sp->quantity == DK_SWEEP_SINC2 && !(probe->d.length_mm > 0))
        s = dk_error_set(err, DK_EINVAL, "sinc^2 needs a crystal length");
    free(probe);
    return s;
}

/* Append a series of @n points; returns it or NULL when out of memory. */
static dk_series *
new_series(dk_sweep_result *res, size_t n)
{
    dk_series *grown =
        realloc(res->series, (size_t)(res->nseries + 1) * sizeof *grown);
    if (!grown)
        return NULL;
    res->series = grown;
    dk_series *s = &res->series[res->nseries];
    memset(s, 0, sizeof *s);
    s->x = malloc(n * sizeof *s->x);
    s->y = malloc(n * sizeof *s->y);
    s->flags = calloc(n, sizeof *s->flags);
    if (!s->x || !s->y || !s->flags) {
        free(s->x), free(s->y), free(s->flags);
        return NULL;
    }
    s->n = n;
    s->family = -1;
    s->wave = -1;
    res->nseries++;
    return s;
}

static const char *const gvm_labels[3] = {"signal − pump", "idler − pump",
                                          "signal − idler"};

/* Turn the points of one family member into series. */
static dk_status
add_series(dk_sweep_result *res, const dk_sweep_spec *sp, int f,
           const double *xs, const point *pts, dk_error *err)
{
    int pairs = sp->quantity == DK_SWEEP_SOLVE &&
                sp->target == DK_VAR_WAVELENGTHS;
    int maxk = 0;
    for (int i = 0; i < sp->nx; i++)
        maxk = pts[i].n > maxk ? pts[i].n : maxk;
    char fam[40] = "";
    if (sp->nfamily)
        family_label(sp->family, sp->family_values[f], fam, sizeof fam);
    for (int k = 0; k < maxk; k++) {
        dk_series *s = new_series(res, (size_t)sp->nx);
        if (!s)
            return dk_error_set(err, DK_ENOMEM, "out of memory");
        s->family = sp->nfamily ? f : -1;
        s->branch = pairs ? k / 2 : k;
        s->wave = pairs ? k % 2 : -1;
        char br[40] = "";
        if (sp->quantity == DK_SWEEP_GVM)
            snprintf(br, sizeof br, "%s", gvm_labels[k % 3]);
        else if (pairs)
            snprintf(br, sizeof br, "%s%s", k % 2 ? "idler" : "signal",
                     maxk > 2 ? (k / 2 ? " (2nd pair)" : " (1st pair)") : "");
        snprintf(s->label, sizeof s->label, "%s%s%s", fam,
                 fam[0] && br[0] ? ", " : "", br);
        for (int i = 0; i < sp->nx; i++) {
            s->x[i] = xs[i];
            s->y[i] = k < pts[i].n ? pts[i].y[k] : NAN;
            s->flags[i] = k < pts[i].n ? pts[i].f[k] : 0;
            res->flags |= s->flags[i];
        }
    }
    return DK_OK;
}

/* Range flags of the values of one solved point, as eval_point() sets
 * them, and the flagged ones into the span. */
typedef struct solve_ctx {
    const dk_sweep_spec *sp;
    point *pts;
    dk_range_span *ex;
    long valued;
} solve_ctx;

static void
solve_each(void *vctx, int i, dk_sweep *s, const trace_point *tp)
{
    solve_ctx *c = vctx;
    const dk_sweep_spec *sp = c->sp;
    point *pt = &c->pts[i];
    dk_design *d = &s->d;
    pt->n = tp->n;
    for (int k = 0; k < tp->n; k++) {
        pt->y[k] = tp->v[k];
        pt->src[k] = tp->src[k];
    }
    for (int k = 0; k < tp->n; k++) {
        dk_waves w;
        double t;
        root_state(s, sp->target, pt->y, pt->n, k, &w, &t);
        pt->f[k] = dk_design_range_flags(d, &w, t);
        if (pt->f[k])
            dk_range_span_add(c->ex, pt->f[k], &w, t);
    }
    c->valued += pt->n > 0;
}

/* The SP_WAVE_* kind of value slot @k of a solved point. */
static int
slot_wave(const dk_sweep_spec *sp, int k)
{
    switch (sp->target) {
    case DK_VAR_WAVELENGTHS: return k % 2 ? SP_WAVE_IDLER : SP_WAVE_SIGNAL;
    case DK_VAR_SIGNAL: return SP_WAVE_SIGNAL;
    case DK_VAR_IDLER: return SP_WAVE_IDLER;
    default: return SP_WAVE_SELF;
    }
}

static int
from_fold(const point *pt, int k, const sweep_fold *f)
{
    return k < pt->n && pt->src[k] >= 0 &&
           (pt->src[k] == f->root[0] || pt->src[k] == f->root[1]);
}

/* Series of the solved points of one family member, with the turning
 * points inserted (see the top of this file). */
static dk_status
add_solve_series(dk_sweep_result *res, const dk_sweep_spec *sp, int f,
                 const double *xs, const point *pts, const sweep_fold *folds,
                 int nfolds, dk_range_span *ex, dk_error *err)
{
    int pairs = sp->target == DK_VAR_WAVELENGTHS;
    int maxk = 0;
    for (int i = 0; i < sp->nx; i++)
        maxk = pts[i].n > maxk ? pts[i].n : maxk;
    char fam[40] = "";
    if (sp->nfamily)
        family_label(sp->family, sp->family_values[f], fam, sizeof fam);
    for (int k = 0; k < maxk; k++) {
        dk_series *s = new_series(res, (size_t)sp->nx + 2 * (size_t)nfolds);
        if (!s)
            return dk_error_set(err, DK_ENOMEM, "out of memory");
        s->family = sp->nfamily ? f : -1;
        s->branch = pairs ? k / 2 : k;
        s->wave = pairs ? k % 2 : -1;
        char br[40] = "";
        if (pairs)
            snprintf(br, sizeof br, "%s%s", k % 2 ? "idler" : "signal",
                     maxk > 2 ? (k / 2 ? " (2nd pair)" : " (1st pair)") : "");
        snprintf(s->label, sizeof s->label, "%s%s%s", fam,
                 fam[0] && br[0] ? ", " : "", br);
        size_t m = 0;
        int e = 0, wave = slot_wave(sp, k);
        for (int i = 0; i < sp->nx; i++) {
            s->x[m] = xs[i];
            s->y[m] = k < pts[i].n ? pts[i].y[k] : NAN;
            s->flags[m] = k < pts[i].n ? pts[i].f[k] : 0;
            res->flags |= s->flags[m];
            m++;
            /* Turning points between this point and the next. */
            for (; e < nfolds && folds[e].at - folds[e].birth <= i; e++) {
                const sweep_fold *fo = &folds[e];
                if (fo->at - fo->birth < i || i + 1 >= sp->nx)
                    continue;
                int here = fo->birth ? from_fold(&pts[i + 1], k, fo)
                                     : from_fold(&pts[i], k, fo);
                if (!here)
                    continue;
                int go_on = k < pts[i + 1].n;
                int came = k < pts[i].n;
                if (fo->birth && came)
                    s->x[m] = fo->x, s->y[m] = NAN, s->flags[m++] = 0;
                s->x[m] = fo->x;
                s->y[m] = fo->y[wave];
                s->flags[m] = fo->flags;
                res->flags |= fo->flags;
                if (fo->flags)
                    dk_range_span_add(ex, fo->flags, &fo->waves, fo->temp_c);
                m++;
                if (!fo->birth && go_on)
                    s->x[m] = fo->x, s->y[m] = NAN, s->flags[m++] = 0;
            }
        }
        s->n = m;
    }
    return DK_OK;
}

/* What one family member of a solve sweep gives. */
typedef struct member {
    dk_status status;
    dk_error err;           /* why, when status is not DK_OK */
    dk_error first;         /* its first point without a value */
    dk_sweep_result part;   /* its series */
    dk_range_span ex;
    long valued;
} member;

/* One family member (@f; −1: no family) traced with the scratch @s, @pts
 * and @tp, its series into m->part. */
static void
solve_member(const dk_design *base, const dk_sweep_spec *sp, int f,
             const double *xs, dk_sweep *s, point *pts, trace_point *tp,
             member *m)
{
    memset(&m->part, 0, sizeof m->part);
    dk_range_span_init(&m->ex);
    dk_sweep_init(s, base);
    if (f >= 0 &&
        (m->status = dk_sweep_set(s, sp->family, sp->family_values[f],
                                  &m->err)))
        return;
    for (int i = 0; i < sp->nx; i++)
        pts[i].n = 0;
    solve_ctx ctx = {sp, pts, &m->ex, 0};
    sweep_trace_opts opts = {1, solve_each, &ctx};
    sweep_fold *folds = NULL;
    int nfolds = 0;
    m->status = sweep_trace(s, sp->x, xs, sp->nx, sp->target, &opts, tp,
                            &folds, &nfolds, &m->first, NULL);
    if (m->status == DK_ENOMEM)
        m->status = dk_error_set(&m->err, DK_ENOMEM, "out of memory");
    m->valued = ctx.valued;
    if (!m->status)
        m->status = add_solve_series(&m->part, sp, f < 0 ? 0 : f, xs, pts,
                                     folds, nfolds, &m->ex, &m->err);
    free(folds);
}

/* Spans of flagged values: the union (minima, maxima). */
static void
span_merge(dk_range_span *into, const dk_range_span *from)
{
    into->flags |= from->flags;
    for (int k = 0; k < 3; k++) {
        into->lam_min[k] = fmin(into->lam_min[k], from->lam_min[k]);
        into->lam_max[k] = fmax(into->lam_max[k], from->lam_max[k]);
    }
    into->t_min = fmin(into->t_min, from->t_min);
    into->t_max = fmax(into->t_max, from->t_max);
}

/*
 * Solve curves through the tracer: the family members on all cores
 * (each member on its own copy of the sweep; the result is the same
 * whatever the number of threads), then their series in member order.
 */
static dk_status
solve_curves(const dk_design *base, const dk_sweep_spec *sp,
             const double *xs, dk_sweep_result *res, dk_range_span *ex,
             long *valued, dk_error *first, dk_error *err)
{
    int nfam = sp->nfamily ? sp->nfamily : 1;
    member *m = calloc((size_t)nfam, sizeof *m);
    if (!m)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    int failed = 0;
#pragma omp parallel if (nfam > 1) reduction(| : failed)
    {
        dk_sweep *s = malloc(sizeof *s);
        point *pts = malloc((size_t)sp->nx * sizeof *pts);
        trace_point *tp = malloc((size_t)sp->nx * sizeof *tp);
        failed |= !s || !pts || !tp;
#pragma omp for schedule(dynamic, 1)
        for (int f = 0; f < nfam; f++)
            if (s && pts && tp)
                solve_member(base, sp, sp->nfamily ? f : -1, xs, s, pts, tp,
                             &m[f]);
        free(s), free(pts), free(tp);
    }
    dk_status st = failed ? dk_error_set(err, DK_ENOMEM, "out of memory")
                          : DK_OK;
    for (int f = 0; f < nfam; f++) {
        if (!st && m[f].status)
            st = m[f].status, *err = m[f].err;
        if (!first->msg[0] && m[f].first.msg[0])
            *first = m[f].first;
        *valued += m[f].valued;
        span_merge(ex, &m[f].ex);
        /* Move the member's series into the result, in order. */
        dk_sweep_result *part = &m[f].part;
        if (!st && part->nseries) {
            dk_series *grown =
                realloc(res->series, (size_t)(res->nseries + part->nseries) *
                                         sizeof *grown);
            if (!grown) {
                st = dk_error_set(err, DK_ENOMEM, "out of memory");
            } else {
                res->series = grown;
                memcpy(res->series + res->nseries, part->series,
                       part->nseries * sizeof *grown);
                res->nseries += part->nseries;
                res->flags |= part->flags;
                free(part->series);
                part->series = NULL;
                part->nseries = 0;
            }
        }
        dk_sweep_result_free(part);
    }
    free(m);
    return st;
}

/*
 * sinc² curves by the batch engine (sweep_batch.c): the family members
 * are the rows of a map over x (without a family, one row at the
 * design's own temperature, which leaves the state as it is). Returns
 * DK_OK with *done = 0 when the design does not allow it.
 */
static dk_status
sinc2_curves(const dk_design *base, const dk_sweep_spec *sp,
             const double *xs, dk_sweep_result *res, dk_range_span *ex,
             long *valued, dk_error *first, int *done, dk_error *err)
{
    dk_var yv = sp->nfamily ? sp->family : DK_VAR_TEMP;
    *done = 0;
    if (!sweep_batch_allows(base, sp->x, yv))
        return DK_OK;
    int ny = sp->nfamily ? sp->nfamily : 1;
    double yvals[DK_SWEEP_MAX_FAMILY];
    for (int f = 0; f < ny; f++)
        yvals[f] = sp->nfamily ? sp->family_values[f] : base->temp_c;
    size_t cells = (size_t)sp->nx * ny;
    dk_map_result m = {0};
    m.nx = sp->nx, m.ny = ny;
    m.x = (double *)xs, m.y = yvals;
    m.z = malloc(cells * sizeof *m.z);
    m.cell = malloc(cells);
    unsigned char *flags = malloc(cells);
    dk_map_spec ms = {sp->x, yv, sp->x_lo, sp->x_hi, 0, 0, sp->nx, ny};
    size_t def;
    dk_status st = !m.z || !m.cell || !flags
                       ? DK_ENOMEM
                       : sweep_cells_batch(base, &ms, &m, flags, &def);
    dk_sweep *scratch = NULL;
    for (int f = 0; !st && f < ny; f++) {
        dk_series *s = new_series(res, (size_t)sp->nx);
        if (!s) {
            st = DK_ENOMEM;
            break;
        }
        s->family = sp->nfamily ? f : -1;
        s->branch = 0;
        if (sp->nfamily)
            family_label(sp->family, sp->family_values[f], s->label,
                         sizeof s->label);
        long member_valued = 0;
        for (int i = 0; i < sp->nx; i++) {
            size_t c = (size_t)f * sp->nx + i;
            s->x[i] = xs[i];
            s->y[i] = m.z[c];
            s->flags[i] = isnan(m.z[c]) ? 0 : flags[c];
            res->flags |= s->flags[i];
            member_valued += !isnan(m.z[c]);
            dk_waves w;
            double t;
            if (s->flags[i] &&
                sweep_cell_state(base, yv, yvals[f], sp->x, xs[i], &w, &t))
                dk_range_span_add(ex, s->flags[i], &w, t);
            /* The first point without a value that dk_sweep_set()
             * refuses gives the message, as the point-by-point loop. */
            if (isnan(m.z[c]) && !first->msg[0] &&
                (scratch || (scratch = malloc(sizeof *scratch)))) {
                dk_sweep_init(scratch, base);
                if (!sp->nfamily ||
                    !dk_sweep_set(scratch, yv, yvals[f], first))
                    dk_sweep_set(scratch, sp->x, xs[i], first);
            }
        }
        *valued += member_valued;
    }
    free(scratch);
    free(m.z), free(m.cell), free(flags);
    if (st == DK_ENOMEM)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    *done = 1;
    return DK_OK;
}

dk_status
dk_sweep_curves(const dk_design *base, const dk_sweep_spec *sp,
                dk_sweep_result *res, dk_error *err)
{
    memset(res, 0, sizeof *res);
    dk_notes_clear(&res->notes);
    dk_status st = check_spec(base, sp, err);
    if (st)
        return st;
    int keep_period = keep_period_of(base, sp);
    double *xs = malloc((size_t)sp->nx * sizeof *xs);
    point *pts = malloc((size_t)sp->nx * sizeof *pts);
    dk_sweep *s = malloc(sizeof *s);
    if (!xs || !pts || !s) {
        free(xs), free(pts), free(s);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    for (int i = 0; i < sp->nx; i++)
        xs[i] = sp->x_lo + (sp->x_hi - sp->x_lo) * i / (sp->nx - 1);
    dk_range_span ex;
    dk_range_span_init(&ex);
    dk_error first = {0};
    long valued = 0;
    int nfam = sp->nfamily ? sp->nfamily : 1;
    if (sp->quantity == DK_SWEEP_SOLVE) {
        st = solve_curves(base, sp, xs, res, &ex, &valued, &first, err);
        nfam = 0;
    } else if (sp->quantity == DK_SWEEP_SINC2) {
        int done = 0;
        st = sinc2_curves(base, sp, xs, res, &ex, &valued, &first, &done,
                          err);
        if (done)
            nfam = 0;
    }
    for (int f = 0; f < nfam && !st; f++) {
        dk_sweep_init(s, base);
        if (sp->nfamily &&
            (st = dk_sweep_set(s, sp->family, sp->family_values[f], err)))
            break;
        for (int i = 0; i < sp->nx; i++) {
            dk_error e = {0};
            pts[i].n = 0;
            if (dk_sweep_set(s, sp->x, xs[i], &e) ||
                eval_point(s, sp, keep_period, &pts[i], &e)) {
                if (!first.msg[0])
                    first = e;
                continue;
            }
            valued += pts[i].n > 0;
            for (int k = 0; k < pts[i].n; k++)
                if (pts[i].f[k]) {
                    dk_waves w;
                    double t;
                    if (sp->quantity == DK_SWEEP_SOLVE)
                        root_state(s, sp->target, pts[i].y, pts[i].n, k, &w,
                                   &t);
                    else
                        w = s->d.waves, t = s->d.temp_c;
                    dk_range_span_add(&ex, pts[i].f[k], &w, t);
                }
        }
        st = add_series(res, sp, f, xs, pts, err);
    }
    free(xs);
    free(pts);
    free(s);
    if (!st && valued == 0)
        st = dk_error_set(err, DK_ENOROOT,
                          "no point of the sweep has a solution%s%s%s",
                          first.msg[0] ? " (first failure: " : "",
                          first.msg[0] ? first.msg : "",
                          first.msg[0] ? ")" : "");
    if (!st && first.msg[0] && strlen(first.msg) < 200)
        dk_notes_add(&res->notes, DK_NOTE_WARNING, "points-without-value",
                     "some points have no value (e.g. %s)", first.msg);
    if (st) {
        dk_sweep_result_free(res);
        return st;
    }
    dk_design_note_span(base, &ex, &res->notes);
    return DK_OK;
}
