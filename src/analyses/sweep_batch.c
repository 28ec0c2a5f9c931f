/*
 * sweep_batch.c - maps by the batch Δk engine (see sweep_internal.h).
 *
 * A map of sinc²(ΔkL/2) over two design variables is computed line by
 * line, a line being the cells at one temperature (a row, or a column
 * when x is the temperature). Per line:
 *   1. the state of each cell - waves, period, length - exactly as
 *      dk_sweep_set() leaves it after setting y and then x (plain scalar
 *      code, no allocation, no messages), with its DK_RANGE_* flags from
 *      comparisons with the set's fitted ranges;
 *   2. the formulas compiled once at the line's temperature
 *      (dispersion_batch.h) and the index of each wave over the line by
 *      the vectorised batch kernel (a wave constant along the line, such
 *      as a held signal along a row of pump values, is evaluated once);
 *   3. Δk as dk_qpm_delta_k() or dk_angle_delta_k() computes it, bit for
 *      bit (the same compiled coefficients and arithmetic), then sinc² with
 *      a vectorised sine (below).
 * Lines run on all cores (OpenMP); each cell is computed by the same code
 * whatever thread takes its line, so the map is identical bit for bit
 * whatever the thread count (tests/test_map.c compares 1 and 2 threads).
 * The range notes are made afterwards in row order, as the cell-by-cell
 * loop makes them.
 *
 * sinc² uses sin x = ±sin r, r = x − kπ (k = the integer nearest x/π, π in
 * three parts of 32, 32 and 53 bits so that kπ is exact for |x| < 6·10⁶;
 * Cody & Waite, Software Manual for the Elementary Functions (1980),
 * ch. 8) and the Taylor series of sin r to r²¹ on |r| ≤ π/2 (truncation
 * below 1.3e-18). Beyond |x| ≈ 6·10⁶ rad, where sinc² < 3e-14, the
 * reduction loses digits.
 */
#include <float.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#ifdef _OPENMP
#include <omp.h>
#endif

#include "core/simd.h"
#include "deltak/constants.h"
#include "sweep_internal.h"

/* π = PI_1 + PI_2 + PI_3 (32, 32 and 53 significant bits). */
#define PI_1 0x1.921fb54400000p+1
#define PI_2 0x1.0b4611a600000p-33
#define PI_3 0x1.3198a2e037073p-68
#define ROUND_MAGIC 0x1.8p52   /* (t + M) − M rounds t to an integer */

_Static_assert(DK_CELL_OK == 0 && DK_CELL_EXTRAPOLATED == 1 &&
                   DK_CELL_UNDEFINED == 2,
               "finish_line() computes the cell states arithmetically");

DK_INLINE double
sinc2_one(double dk, double length_um)
{
    double x = 0.5 * dk * length_um;
    double k = (x * (1 / DK_PI) + ROUND_MAGIC) - ROUND_MAGIC;
    double r = ((x - k * PI_1) - k * PI_2) - k * PI_3;
    double r2 = r * r;
    /* sin r = r Σ (−1)^n r^2n / (2n + 1)!, n = 0 … 10 */
    double p = -1.0 / 51090942171709440000.0;           /* 1/21! */
    p = p * r2 + 1.0 / 121645100408832000.0;            /* 1/19! */
    p = p * r2 - 1.0 / 355687428096000.0;               /* 1/17! */
    p = p * r2 + 1.0 / 1307674368000.0;                 /* 1/15! */
    p = p * r2 - 1.0 / 6227020800.0;                    /* 1/13! */
    p = p * r2 + 1.0 / 39916800.0;                      /* 1/11! */
    p = p * r2 - 1.0 / 362880.0;                        /* 1/9! */
    p = p * r2 + 1.0 / 5040.0;                          /* 1/7! */
    p = p * r2 - 1.0 / 120.0;                           /* 1/5! */
    p = p * r2 + 1.0 / 6.0;                             /* 1/3! */
    double sin_r = r - r * r2 * p;
    /* dk_sinc(): 1 − x²/6 below 1e-4 (x² · (1/6): no second division;
     * the term is below 2e-9, so the sum rounds alike) */
    double s = fabs(x) < 1e-4 ? 1 - x * x * (1.0 / 6) : sin_r / x;
    return s * s;
}

DK_CLONES void
dk_sinc2_batch(const double *restrict dk, const double *restrict length_um,
               double *restrict out, size_t n)
{
#pragma omp simd
    for (size_t i = 0; i < n; i++)
        out[i] = sinc2_one(dk[i], length_um[i]);
}

/* --- The state of one cell -------------------------------------------- */

typedef struct cell_state {
    dk_waves w;
    int held;
    double temp_c, period_um, length_mm;
    int ok;
} cell_state;

/* dk_sweep_set() for the variables a batch map takes, on a plain state. */
static void
apply(cell_state *c, int shg, dk_var v, double value)
{
    if (!isfinite(value)) {
        c->ok = 0;
        return;
    }
    switch (v) {
    case DK_VAR_PERIOD:
        c->ok &= value > 0;
        c->period_um = value;
        return;
    case DK_VAR_TEMP:
        c->ok &= value >= DK_ABSOLUTE_ZERO_C;
        c->temp_c = value;
        return;
    case DK_VAR_LENGTH:
        c->ok &= value > 0;
        c->length_mm = value;
        return;
    case DK_VAR_FUNDAMENTAL:
        c->ok &= value > 0;
        c->w = dk_waves_shg(value);
        break;
    case DK_VAR_PUMP:
        c->ok &= value > 0;
        c->w.pump_um = value;
        break;
    case DK_VAR_SIGNAL:
        c->ok &= value > 0;
        c->w.signal_um = value, c->held = 1;
        break;
    case DK_VAR_IDLER:
        c->ok &= value > 0;
        c->w.idler_um = value, c->held = 2;
        break;
    default:
        c->ok = 0;
        return;
    }
    /* follow() of sweep_point.c: energy conservation, held wave fixed */
    if (c->held && !shg) {
        if (c->held == 1 && c->w.signal_um > 0)
            c->w.idler_um = dk_third_wave_um(c->w.pump_um, c->w.signal_um);
        else if (c->held == 2 && c->w.idler_um > 0)
            c->w.signal_um = dk_third_wave_um(c->w.pump_um, c->w.idler_um);
        c->ok &= isfinite(c->w.signal_um) && isfinite(c->w.idler_um);
    }
}

/* The fitted ranges of the design's set, for flags without calls (the
 * rules of dk_set_range_warnings() and dk_design_range_flags()). */
typedef struct ranges {
    double lam[2], temp[2], ref;
    int has_t;
    int shg;
} ranges;

static void
ranges_of(const dk_design *d, ranges *r)
{
    const dk_dispersion_set *s = d->set;
    r->lam[0] = s->wavelength_range_um[0];
    r->lam[1] = s->wavelength_range_um[1];
    r->has_t = dk_set_has_temperature(s);
    const double *t = s->has_thermo && s->temp_form == DK_TEMP_NONE
                          ? s->thermo.temperature_range_c
                          : s->temperature_range_c;
    r->temp[0] = t[0], r->temp[1] = t[1];
    r->ref = s->reference_temperature_c;
    r->shg = d->shg;
}

/* --- Lines ------------------------------------------------------------- */

typedef struct map_job {
    const dk_design *d;
    const dk_map_spec *sp;
    dk_map_result *res;
    unsigned char *flags;   /* DK_RANGE_* per cell, for the notes */
    cell_state *ystate;     /* the state after y is set, per row */
    int by_column;          /* lines are columns (x is the temperature) */
    int nlines, len;        /* lines and cells per line */
    ranges rg;
} map_job;

/* Scratch of one thread: a line's worth of each array. */
typedef struct scratch {
    double *ls, *li, *lp;   /* wavelengths */
    double *rs, *ri, *rp;   /* their reciprocals */
    double *ns, *ni, *np;   /* indices */
    double *kg, *lum;       /* grating vector, length in µm */
    double *dk, *z;
    double *work;           /* 12 per cell */
    unsigned char *f;
    int cached;             /* the row waves above hold for every row */
    int same[3];            /* signal, idler, pump alike along the row */
} scratch;

static int
scratch_new(scratch *s, size_t n)
{
    memset(s, 0, sizeof *s);
    double *m = malloc(25 * n * sizeof *m);
    s->f = malloc(n);
    if (!m || !s->f) {
        free(m), free(s->f);
        return 0;
    }
    s->ls = m, s->li = m + n, s->lp = m + 2 * n;
    s->rs = m + 3 * n, s->ri = m + 4 * n, s->rp = m + 5 * n;
    s->ns = m + 6 * n, s->ni = m + 7 * n, s->np = m + 8 * n;
    s->kg = m + 9 * n, s->lum = m + 10 * n;
    s->dk = m + 11 * n, s->z = m + 12 * n;
    s->work = m + 13 * n;
    return 1;
}

static void
scratch_free(scratch *s)
{
    free(s->ls);
    free(s->f);
}

/* 1 when every cell of the line has the same wavelength. */
static int
all_same(const double *lam, int len)
{
    int same = 1;
    for (int q = 1; q < len && same; q++)
        same = lam[q] == lam[0] || (isnan(lam[q]) && isnan(lam[0]));
    return same;
}

/* n over a line; once when the wavelength is the same in every cell. */
static void
indices(const dk_nfast *f, const double *lam, double *n, double *work,
        int len, int same)
{
    if (!same) {
        dk_nfast_batch(f, lam, n, work, (size_t)len);
        return;
    }
    dk_nfast_batch(f, lam, n, work, 1);
    for (int q = 1; q < len; q++)
        n[q] = n[0];
}

/* 1/λ of a line's waves. */
DK_CLONES static void
reciprocals(const double *restrict ls, const double *restrict li,
            const double *restrict lp, double *restrict rs,
            double *restrict ri, double *restrict rp, int n)
{
#pragma omp simd
    for (int q = 0; q < n; q++) {
        rs[q] = 1 / ls[q];
        ri[q] = 1 / li[q];
        rp[q] = 1 / lp[q];
    }
}

/* sinc²(ΔkL/2) with Δk = |2π(np/λp − ns/λs − ni/λi)| − K, the
 * reciprocals of the waves computed once per map (dk_qpm_fast_dk()
 * divides: the two agree to an ulp of each term). */
DK_CLONES static void
qpm_line(const double *restrict rs, const double *restrict ri,
         const double *restrict rp, const double *restrict ns,
         const double *restrict ni, const double *restrict np,
         const double *restrict kg, const double *restrict lum,
         double *restrict z, size_t n)
{
#pragma omp simd
    for (size_t q = 0; q < n; q++) {
        double m = 2 * M_PI * (np[q] * rp[q] - ns[q] * rs[q] - ni[q] * ri[q]);
        double dk = fabs(m) <= DBL_MAX ? fabs(m) - kg[q] : NAN;
        z[q] = sinc2_one(dk, lum[q]);
    }
}

/* dk_third_wave_um(), inline. */
DK_INLINE double
third(double pump, double other)
{
    double inv = 1 / pump - 1 / other;
    return inv > 0 && isfinite(inv) ? 1 / inv : NAN;
}

/* Waves of a row: the row's state with x set in each cell (the cases of
 * apply() for the variables x can be along a row), as plain loops. */
DK_CLONES static void
row_waves(const cell_state *rs, int shg, dk_var xv, const double *restrict x,
          double *restrict ls, double *restrict li, double *restrict lp,
          int n)
{
    const double s0 = rs->w.signal_um, i0 = rs->w.idler_um;
    const double p0 = rs->w.pump_um;
    const int held = shg ? 0 : rs->held;
    switch (xv) {
    case DK_VAR_PUMP:
#pragma omp simd
        for (int q = 0; q < n; q++) {
            double p = x[q], s = s0, i = i0;
            if (held == 1)
                i = s0 > 0 ? third(p, s0) : i0;
            else if (held == 2)
                s = i0 > 0 ? third(p, i0) : s0;
            int ok = p > 0 && (!held || (isfinite(s) && isfinite(i)));
            lp[q] = ok ? p : NAN;
            ls[q] = ok ? s : NAN;
            li[q] = ok ? i : NAN;
        }
        return;
    case DK_VAR_SIGNAL:
#pragma omp simd
        for (int q = 0; q < n; q++) {
            double s = x[q], i = third(p0, s);
            int ok = s > 0 && isfinite(i);
            lp[q] = ok ? p0 : NAN;
            ls[q] = ok ? s : NAN;
            li[q] = ok ? i : NAN;
        }
        return;
    case DK_VAR_IDLER:
#pragma omp simd
        for (int q = 0; q < n; q++) {
            double i = x[q], s = third(p0, i);
            int ok = i > 0 && isfinite(s);
            lp[q] = ok ? p0 : NAN;
            ls[q] = ok ? s : NAN;
            li[q] = ok ? i : NAN;
        }
        return;
    case DK_VAR_FUNDAMENTAL:
#pragma omp simd
        for (int q = 0; q < n; q++) {
            double f = x[q];
            int ok = f > 0;
            lp[q] = ok ? f / 2 : NAN;
            ls[q] = li[q] = ok ? f : NAN;
        }
        return;
    default:   /* period, length: the row's waves in every cell */
#pragma omp simd
        for (int q = 0; q < n; q++) {
            int ok = isfinite(x[q]) && x[q] > 0;
            lp[q] = ok ? p0 : NAN;
            ls[q] = ok ? s0 : NAN;
            li[q] = ok ? i0 : NAN;
        }
        return;
    }
}

/* @bit when λ (> 0) lies outside [lo, hi]: selects of doubles only, which
 * every vector unit has. */
DK_INLINE double
out_of(double lam, double lo, double hi, double bit)
{
    double v = lam < lo ? bit : 0.0;
    v = lam > hi ? bit : v;
    return lam > 0 ? v : 0.0;
}

/* The end of a line: the DK_RANGE_* flags of each cell
 * (flags_of() as compares: dk_set_range_warnings() per wave, the
 * temperature's flag @tf, SHG's merged fundamental) and its DK_CELL_*
 * state, in one vectorised pass. Returns the cells with a value. */
DK_CLONES static size_t
finish_line(const ranges *r, unsigned tf, const double *restrict ls,
            const double *restrict li, const double *restrict lp,
            const double *restrict z, unsigned char *restrict fl,
            unsigned char *restrict cell, double *restrict tmp, int n)
{
    const double lo = r->lam[0], hi = r->lam[1];
    const int shg = r->shg;
    /* The flags as small integers held in doubles (−1: no value), so
     * that this loop stays in one lane width and vectorises; then bytes. */
    double *restrict fd = tmp;
    const double dt = (double)tf;
#pragma omp simd
    for (int q = 0; q < n; q++) {
        double so = out_of(ls[q], lo, hi, 1);
        double io = out_of(li[q], lo, hi, 1);
        double po = out_of(lp[q], lo, hi, 4);
        double si = so + 2 * io;
        double both = so + io > 0 ? 3.0 : 0.0;
        si = shg ? both : si;
        double v = dt + si + po;
        fd[q] = z[q] == z[q] ? v : -1.0;   /* NaN: no value */
    }
    double def = 0;
#pragma omp simd reduction(+ : def)
    for (int q = 0; q < n; q++)
        def += fd[q] >= 0 ? 1.0 : 0.0;
    /* Bytes through 32-bit integers (DK_CELL_OK 0, _EXTRAPOLATED 1,
     * _UNDEFINED 2): conversions the vector units have. */
    int *restrict fi = (int *)(tmp + n);
#pragma omp simd
    for (int q = 0; q < n; q++)
        fi[q] = (int)fd[q];
#pragma omp simd
    for (int q = 0; q < n; q++) {
        int f = fi[q];
        fl[q] = (unsigned char)(f > 0 ? f : 0);
        cell[q] = (unsigned char)((f > 0) + 2 * (f < 0));
    }
    return (size_t)def;
}

/* The temperature's flag for a line. */
static unsigned
temp_flag(const ranges *r, double temp)
{
    if (!r->has_t)
        return fabs(temp - r->ref) > 0.5 ? DK_RANGE_NO_TEMP : 0;
    return temp < r->temp[0] || temp > r->temp[1] ? DK_RANGE_TEMP : 0;
}

static void
fill(double *restrict a, double v, int n)
{
#pragma omp simd
    for (int q = 0; q < n; q++)
        a[q] = v;
}

/* One line: cells (i, j) with j (rows) or i (columns) = @o. */
static void
map_line(const map_job *jb, scratch *sc, int o, size_t *defined)
{
    const dk_design *d = jb->d;
    const dk_map_spec *sp = jb->sp;
    dk_map_result *res = jb->res;
    int len = jb->len;
    double temp;
    int qpm = d->scheme == DK_SCHEME_QPM;
    if (!jb->by_column) {
        /* A row: y set (its state once), x along the row. When y leaves
         * the waves alone, the row's waves are those of every row. */
        const cell_state *rs = &jb->ystate[o];
        temp = rs->temp_c;
        int keep = sp->y == DK_VAR_TEMP || sp->y == DK_VAR_PERIOD ||
                   sp->y == DK_VAR_LENGTH;
        if (!rs->ok) {
            for (int q = 0; q < len; q++)
                sc->lp[q] = sc->rp[q] = NAN;
            sc->cached = 0;
        } else if (!keep || !sc->cached) {
            row_waves(rs, d->shg, sp->x, res->x, sc->ls, sc->li, sc->lp,
                      len);
            reciprocals(sc->ls, sc->li, sc->lp, sc->rs, sc->ri, sc->rp, len);
            sc->same[0] = all_same(sc->ls, len);
            sc->same[1] = all_same(sc->li, len);
            sc->same[2] = all_same(sc->lp, len);
            sc->cached = keep;
        }
        double kg = qpm ? dk_qpm_grating_k(&d->qpm, rs->period_um, temp) : 0;
        double lum = rs->length_mm > 0 ? rs->length_mm * 1e3 : NAN;
        if (qpm && sp->x == DK_VAR_PERIOD)
            for (int q = 0; q < len; q++)
                sc->kg[q] = dk_qpm_grating_k(&d->qpm, res->x[q], temp);
        else
            fill(sc->kg, kg, len);
        if (sp->x == DK_VAR_LENGTH)
            for (int q = 0; q < len; q++)
                sc->lum[q] = res->x[q] * 1e3;
        else
            fill(sc->lum, lum, len);
    } else {
        /* A column: x is the temperature; each cell has its row's state. */
        temp = res->x[o];
        int t_ok = isfinite(temp) && temp >= DK_ABSOLUTE_ZERO_C;
        double kg = 0;
        sc->cached = 0;
        for (int q = 0; q < len; q++) {
            const cell_state *c = &jb->ystate[q];
            int ok = c->ok && t_ok && isfinite(c->w.idler_um);
            sc->ls[q] = ok ? c->w.signal_um : NAN;
            sc->li[q] = ok ? c->w.idler_um : NAN;
            sc->lp[q] = ok ? c->w.pump_um : NAN;
            sc->rs[q] = 1 / sc->ls[q];
            sc->ri[q] = 1 / sc->li[q];
            sc->rp[q] = 1 / sc->lp[q];
            if (qpm && (q == 0 || sp->y == DK_VAR_PERIOD))
                kg = dk_qpm_grating_k(&d->qpm, c->period_um, temp);
            sc->kg[q] = kg;
            sc->lum[q] = c->length_mm > 0 ? c->length_mm * 1e3 : NAN;
        }
        sc->same[0] = all_same(sc->ls, len);
        sc->same[1] = all_same(sc->li, len);
        sc->same[2] = all_same(sc->lp, len);
    }
    /* A row's values go straight to the map; a column's through z. */
    double *z = jb->by_column ? sc->z : res->z + (size_t)o * res->nx;
    int compiled = 0;
    if (qpm) {
        dk_qpm_fast f;
        if (isfinite(temp) && dk_qpm_fast_init(&d->qpm, temp, 0, &f) == DK_OK) {
            indices(dk_qpm_fast_axis(&f, 0), sc->ls, sc->ns, sc->work, len,
                    sc->same[0]);
            indices(dk_qpm_fast_axis(&f, 1), sc->li, sc->ni, sc->work, len,
                    sc->same[1]);
            indices(dk_qpm_fast_axis(&f, 2), sc->lp, sc->np, sc->work, len,
                    sc->same[2]);
            qpm_line(sc->rs, sc->ri, sc->rp, sc->ns, sc->ni, sc->np, sc->kg,
                     sc->lum, z, (size_t)len);
            compiled = 1;
        }
    } else {
        dk_angle_fast f;
        dk_angle_problem pb = d->angle;
        pb.temp_c = temp;
        if (isfinite(temp) && dk_angle_fast_init(&pb, d->pol, &f) == DK_OK) {
            dk_angle_fast_batch(&f, d->theta_rad, d->phi_rad, sc->ls, sc->li,
                                sc->lp, sc->dk, sc->work, (size_t)len);
            dk_sinc2_batch(sc->dk, sc->lum, z, (size_t)len);
            compiled = 1;
        }
    }
    if (!compiled)   /* formulas that do not compile: cell by cell */
        for (int q = 0; q < len; q++) {
            dk_waves w = {sc->lp[q], sc->ls[q], sc->li[q]};
            if (qpm) {
                dk_qpm qp = d->qpm;
                double m;
                sc->dk[q] = isnan(sc->lp[q]) ||
                                    dk_qpm_material_dk(&qp, &w, temp, &m,
                                                       NULL)
                                ? NAN
                                : fabs(m) - sc->kg[q];
            } else {
                dk_angle_problem pb = d->angle;
                pb.waves = w;
                pb.temp_c = temp;
                sc->dk[q] = isnan(sc->lp[q])
                                ? NAN
                                : dk_angle_delta_k(&pb, d->pol, d->theta_rad,
                                                   d->phi_rad);
            }
            z[q] = isfinite(sc->dk[q]) ? dk_sinc2(sc->dk[q], sc->lum[q])
                                       : NAN;
        }
    unsigned tf = temp_flag(&jb->rg, temp);
    size_t def;
    if (!jb->by_column) {
        size_t c0 = (size_t)o * res->nx;
        def = finish_line(&jb->rg, tf, sc->ls, sc->li, sc->lp, z,
                          jb->flags + c0, res->cell + c0, sc->work, len);
    } else {
        unsigned char *cell = (unsigned char *)sc->ns;   /* free by now */
        def = finish_line(&jb->rg, tf, sc->ls, sc->li, sc->lp, sc->z, sc->f,
                          cell, sc->work, len);
        for (int q = 0; q < len; q++) {
            size_t c = (size_t)q * res->nx + o;
            res->z[c] = sc->z[q];
            jb->flags[c] = sc->f[q];
            res->cell[c] = cell[q];
        }
    }
    *defined += def;
}

static int
batch_var(const dk_design *d, dk_var v)
{
    switch (v) {
    case DK_VAR_PERIOD:
        return d->scheme == DK_SCHEME_QPM;
    case DK_VAR_TEMP:
    case DK_VAR_PUMP:
    case DK_VAR_SIGNAL:
    case DK_VAR_IDLER:
    case DK_VAR_FUNDAMENTAL:
    case DK_VAR_LENGTH:
        return 1;
    default:
        return 0;
    }
}

/* The range notes in row order, as the cell-by-cell loop makes them: a
 * note for a cell's flags when none of them was seen before. */
static void
notes_in_order(const map_job *jb)
{
    const dk_design *d = jb->d;
    dk_map_result *res = jb->res;
    unsigned seen = 0;
    for (int j = 0; j < res->ny; j++) {
        const unsigned char *f = jb->flags + (size_t)j * res->nx;
        unsigned row = 0;
        for (int i = 0; i < res->nx; i++)
            row |= f[i];
        if (!(row & ~seen)) {
            seen |= row;
            continue;
        }
        for (int i = 0; i < res->nx; i++) {
            unsigned fl = f[i];
            if (fl && !(seen & fl)) {
                cell_state c = jb->ystate[j];
                apply(&c, d->shg, jb->sp->x, res->x[i]);
                dk_design_note_range(d, fl, &c.w, c.temp_c, &res->notes);
            }
            seen |= fl;
        }
    }
    res->flags |= seen;
}

int
sweep_batch_allows(const dk_design *base, dk_var x, dk_var y)
{
    return batch_var(base, x) && batch_var(base, y) &&
           (base->scheme == DK_SCHEME_QPM ||
            (base->scheme == DK_SCHEME_ANGLE && base->angle.alpha_rad == 0));
}

dk_status
sweep_cells_batch(const dk_design *base, const dk_map_spec *sp,
                  dk_map_result *res, unsigned char *flags, size_t *defined)
{
    *defined = 0;
    map_job jb = {.d = base, .sp = sp, .res = res, .flags = flags,
                  .by_column = sp->x == DK_VAR_TEMP};
    ranges_of(base, &jb.rg);
    jb.nlines = jb.by_column ? sp->nx : sp->ny;
    jb.len = jb.by_column ? sp->ny : sp->nx;
    jb.ystate = malloc((size_t)sp->ny * sizeof *jb.ystate);
    if (!jb.ystate)
        return DK_ENOMEM;
    for (int j = 0; j < sp->ny; j++) {
        cell_state c = {base->waves, base->held, base->temp_c,
                        base->period_um, base->length_mm, 1};
        apply(&c, base->shg, sp->y, res->y[j]);
        jb.ystate[j] = c;
    }
    int failed = 0;
    size_t def = 0;
#pragma omp parallel reduction(+ : def) reduction(| : failed)
    {
        scratch sc;
        int ok = scratch_new(&sc, (size_t)jb.len);
        failed |= !ok;
#pragma omp for schedule(dynamic, 4)
        for (int o = 0; o < jb.nlines; o++)
            if (ok)
                map_line(&jb, &sc, o, &def);
        if (ok)
            scratch_free(&sc);
    }
    free(jb.ystate);
    if (failed)
        return DK_ENOMEM;
    *defined = def;
    return DK_OK;
}

int
sweep_cell_state(const dk_design *base, dk_var y, double yval, dk_var x,
                 double xval, dk_waves *w, double *temp_c)
{
    cell_state c = {base->waves, base->held, base->temp_c, base->period_um,
                    base->length_mm, 1};
    apply(&c, base->shg, y, yval);
    if (c.ok)
        apply(&c, base->shg, x, xval);
    *w = c.w;
    *temp_c = c.temp_c;
    return c.ok;
}

dk_status
sweep_map_batch(const dk_design *base, const dk_map_spec *sp,
                dk_map_result *res, int *done, size_t *defined)
{
    *done = 0;
    *defined = 0;
    if (!sweep_batch_allows(base, sp->x, sp->y))
        return DK_OK;
    unsigned char *flags = malloc((size_t)sp->nx * sp->ny);
    if (!flags)
        return DK_ENOMEM;
    dk_status st = sweep_cells_batch(base, sp, res, flags, defined);
    if (!st) {
        map_job jb = {.d = base, .sp = sp, .res = res, .flags = flags};
        jb.ystate = malloc((size_t)sp->ny * sizeof *jb.ystate);
        if (!jb.ystate) {
            free(flags);
            return DK_ENOMEM;
        }
        for (int j = 0; j < sp->ny; j++) {
            cell_state c = {base->waves, base->held, base->temp_c,
                            base->period_um, base->length_mm, 1};
            apply(&c, base->shg, sp->y, res->y[j]);
            jb.ystate[j] = c;
        }
        notes_in_order(&jb);
        free(jb.ystate);
        *done = 1;
    }
    free(flags);
    return st;
}
