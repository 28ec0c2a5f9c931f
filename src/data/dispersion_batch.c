/*
 * dispersion_batch.c - value-only n(λ) of one axis at a fixed temperature
 * (see dispersion_batch.h for the method).
 *
 * The terms are those of deltak/dispersion.h with their coefficients
 * evaluated at the temperature:
 *   constant   S
 *   pole       S / (x² − P)
 *   pole_x2    S x² / (x² − P)
 *   power      S x^p           (even integer p: (x²)^(p/2) by products)
 *   log_ratio  S ln[(A² − x²) / (B² − x²)]
 * The canonical form (dispersion_batch.h) and its derivative in x² = λ²:
 *   (N, D) ← (N u + A D, D u), (N', D') ← (N' u + N + A D', D' u + D),
 *   (N/D)' = (N'D − N D')/D².
 * Term by term, for the other forms, with x' = dx/dλ (1, or −K/λ²):
 *   pole −2xS/(x² − P)², pole_x2 −2xSP/(x² − P)², power pSx^(p−1),
 *   log_ratio 2xS [1/(B² − x²) − 1/(A² − x²)];  n = √Σ: n' = Σ'/(2n).
 */
#include <float.h>
#include <math.h>
#include <string.h>

#include "core/simd.h"
#include "dispersion_batch.h"

#define MAX_INT_EXP 8   /* |e| up to which λ^e is a product */

/* p(f) by Horner's rule, as dispersion.c evaluates it. */
static double
poly_at(const dk_poly *p, double f)
{
    double r = 0;
    for (int i = p->n - 1; i >= 0; i--)
        r = r * f + p->c[i];
    return r;
}

static double
temp_variable(const dk_dispersion_set *set, double t)
{
    switch (set->temp_form) {
    case DK_TEMP_DIFFERENCE:
        return t - set->t0;
    case DK_TEMP_PRODUCT:
        return (t - set->t0) * (t + set->t1);
    case DK_TEMP_NONE:
        break;
    }
    return 0;
}

/* x^k for a small integer k. */
static inline double
ipow(double x, int k)
{
    double r = 1, b = k < 0 ? 1 / x : x;
    for (int n = k < 0 ? -k : k; n > 0; n--)
        r *= b;
    return r;
}

static int
small_int(double e)
{
    return e == floor(e) && fabs(e) <= MAX_INT_EXP;
}

/* The canonical form of the compiled terms, when they have one. */
static void
canonicalise(dk_nfast *f)
{
    dk_nfast_canon *cf = &f->cf;
    memset(cf, 0, sizeof *cf);
    cf->squared = f->squared;
    cf->lo_um = f->lo_um;
    cf->hi_um = f->hi_um;
    f->canonical = 0;
    if (f->energy || !f->squared)
        return;
    for (int i = 0; i < f->nterms; i++) {
        const dk_nfast_term *o = &f->t[i];
        switch (o->kind) {
        case DK_TERM_CONSTANT:
            cf->c += o->s;
            break;
        case DK_TERM_POLE:
        case DK_TERM_POLE_X2:
            if (cf->npole == DK_NFAST_POLES)
                return;
            /* S x²/(x² − P) = S + S P/(x² − P) */
            if (o->kind == DK_TERM_POLE_X2)
                cf->c += o->s;
            cf->pa[cf->npole] = o->kind == DK_TERM_POLE_X2 ? o->s * o->p
                                                           : o->s;
            cf->pp[cf->npole++] = o->p;
            break;
        case DK_TERM_POWER:
            if (!o->ipow || o->ipow > 3 || o->ipow < -3)
                return;
            if (o->ipow > 0)
                cf->cpos[o->ipow - 1] += o->s;
            else
                cf->cneg[-o->ipow - 1] += o->s, cf->neg = 1;
            break;
        default:
            return;
        }
    }
    f->canonical = 1;
}

dk_status
dk_nfast_compile(const dk_dispersion_set *set, const dk_axis_formula *axis,
                 double temp_c, double lo_um, double hi_um, dk_nfast *out)
{
    memset(out, 0, sizeof *out);
    if (axis->nterms > DK_NFAST_TERMS)
        return DK_EINVAL;
    if (!isfinite(temp_c))
        return DK_EDOM;
    double f = temp_variable(set, temp_c);
    out->nterms = axis->nterms;
    out->energy = set->variable == DK_VAR_ENERGY_EV;
    out->kev = set->energy_constant_ev_um;
    out->squared = set->quantity == DK_QTY_N_SQUARED;
    out->lo_um = lo_um;
    out->hi_um = hi_um;
    int ok = 1;
    for (int i = 0; i < axis->nterms; i++) {
        const dk_term *tm = &axis->terms[i];
        dk_nfast_term *o = &out->t[i];
        o->kind = tm->kind;
        o->s = poly_at(&tm->strength, f) * tm->factor;
        switch (tm->kind) {
        case DK_TERM_POLE:
        case DK_TERM_POLE_X2:
            o->p = poly_at(&tm->position, f);
            if (tm->squared)
                o->p *= o->p;
            break;
        case DK_TERM_POWER:
            o->e = tm->exponent;
            if (o->e == 2 * floor(o->e / 2) && fabs(o->e) <= 2 * MAX_INT_EXP)
                o->ipow = (int)(o->e / 2);
            if (o->ipow == 0 && o->e == 0)
                o->kind = DK_TERM_CONSTANT;   /* x^0 = 1 */
            break;
        case DK_TERM_LOG_RATIO: {
            double a = poly_at(&tm->position, f), b = poly_at(&tm->lower, f);
            o->p = a * a;
            o->b2 = b * b;
            break;
        }
        case DK_TERM_CONSTANT:
            break;
        }
        ok &= isfinite(o->s) && isfinite(o->p) && isfinite(o->b2);
    }
    if (ok)
        canonicalise(out);
    if (set->has_thermo && axis->has_thermo) {
        const dk_thermo *th = &set->thermo;
        double dt = temp_c - th->reference_temperature_c, dtk = 1;
        out->nthermo = th->nexps;
        for (int k = 0; k < axis->thermo.orders; k++) {
            dtk *= dt;
            double g = dtk * th->factor * axis->thermo.order_factor[k];
            for (int j = 0; j < th->nexps; j++)
                out->th_c[j] += g * axis->thermo.c[k][j];
        }
        dk_nfast_canon *cf = &out->cf;
        cf->thermo = 1;
        for (int j = 0; j < th->nexps; j++) {
            double e = th->exps[j];
            out->th_e[j] = e;
            out->th_int[j] = small_int(e);
            ok &= isfinite(out->th_c[j]);
            if (e == 0 || e == 1)
                cf->tpos[(int)e] += out->th_c[j];
            else if (e <= -1 && e >= -3 && e == floor(e))
                cf->tneg[(int)-e - 1] += out->th_c[j];
            else
                out->canonical = 0;
        }
    }
    return ok ? DK_OK : DK_EDOM;
}

/* One term and, if @d, its derivative in x. */
static inline double
term_value(const dk_nfast_term *o, double x, double x2, double *d)
{
    switch (o->kind) {
    case DK_TERM_CONSTANT:
        if (d)
            *d = 0;
        return o->s;
    case DK_TERM_POLE: {
        double den = x2 - o->p, v = o->s / den;
        if (d)
            *d = -2 * x * v / den;
        return v;
    }
    case DK_TERM_POLE_X2: {
        double den = x2 - o->p, v = o->s * x2 / den;
        if (d)
            *d = -2 * x * o->s * o->p / (den * den);
        return v;
    }
    case DK_TERM_POWER: {
        double v = o->ipow || o->e == 0 ? o->s * ipow(x2, o->ipow)
                                        : o->s * pow(x, o->e);
        if (d)
            *d = o->e * v / x;
        return v;
    }
    case DK_TERM_LOG_RATIO: {
        double up = o->p - x2, lo = o->b2 - x2;
        if (d)
            *d = 2 * x * o->s * (1 / lo - 1 / up);
        return o->s * log(up / lo);
    }
    }
    return NAN;
}

/* λ^e_j of the thermo-optic add-on. */
static inline double
thermo_power(const dk_nfast *f, int j, double lam)
{
    return f->th_int[j] ? ipow(lam, (int)f->th_e[j]) : pow(lam, f->th_e[j]);
}

/* The canonical form at λ, with @np poles, negative powers when @neg and
 * a thermo-optic add-on when @th: the one arithmetic of the scalar and
 * the batch evaluation (the batch kernels call it with constants). */
DK_INLINE double
canon_n(const dk_nfast_canon *f, double lam, int np, int neg, int th)
{
    double x2 = lam * lam;
    double nn = 0, dd = 1;
    for (int m = 0; m < np; m++) {
        double u = x2 - f->pp[m];
        nn = nn * u + f->pa[m] * dd;
        dd = dd * u;
    }
    double sum = np ? f->c + nn / dd : f->c;
    sum += x2 * (f->cpos[0] + x2 * (f->cpos[1] + x2 * f->cpos[2]));
    if (neg) {
        double y = 1 / x2;
        sum += y * (f->cneg[0] + y * (f->cneg[1] + y * f->cneg[2]));
    }
    /* n² ≤ 0 has no index: one select at the end (vectorises) */
    double n = sqrt(sum);
    if (th) {
        double mu = 1 / lam;
        n += f->tpos[0] + lam * f->tpos[1] +
             mu * (f->tneg[0] + mu * (f->tneg[1] + mu * f->tneg[2]));
    }
    int valid = (sum > 0) & (lam >= f->lo_um) & (lam <= f->hi_um) &
                (lam > 0) & (fabs(n) <= DBL_MAX);
    return valid ? n : NAN;
}

/* dn/dλ of the canonical form (see the top of this file). */
static double
canon_dn(const dk_nfast_canon *f, double lam, double n)
{
    double x2 = lam * lam;
    double nn = 0, dd = 1, dn_ = 0, dd_ = 0;
    for (int m = 0; m < f->npole; m++) {
        double u = x2 - f->pp[m];
        double nn1 = nn * u + f->pa[m] * dd, dd1 = dd * u;
        dn_ = dn_ * u + nn + f->pa[m] * dd_;
        dd_ = dd_ * u + dd;
        nn = nn1, dd = dd1;
    }
    double ds = f->npole ? (dn_ * dd - nn * dd_) / (dd * dd) : 0;
    ds += f->cpos[0] + x2 * (2 * f->cpos[1] + x2 * 3 * f->cpos[2]);
    if (f->neg) {
        double y = 1 / x2;
        ds -= y * y *
              (f->cneg[0] + y * (2 * f->cneg[1] + y * 3 * f->cneg[2]));
    }
    double d = ds * 2 * lam;   /* d(n²)/dλ */
    {
        double thermo = 0;
        if (f->thermo) {
            double mu = 1 / lam;
            thermo = f->tpos[0] + lam * f->tpos[1] +
                     mu * (f->tneg[0] + mu * (f->tneg[1] + mu * f->tneg[2]));
        }
        d /= 2 * (n - thermo);
    }
    if (f->thermo) {
        double mu = 1 / lam;
        d += f->tpos[1] -
             mu * mu *
                 (f->tneg[0] + mu * (2 * f->tneg[1] + mu * 3 * f->tneg[2]));
    }
    return d;
}

double
dk_nfast_n_d(const dk_nfast *f, double lam, double *dn_dl)
{
    if (f->canonical) {
        const dk_nfast_canon *cf = &f->cf;
        double n;
        /* The shape as constants, as in the batch loops (same bits). */
        if (cf->neg || cf->thermo)
            n = canon_n(cf, lam, cf->npole, cf->neg, cf->thermo);
        else if (cf->npole == 2)
            n = canon_n(cf, lam, 2, 0, 0);
        else if (cf->npole == 3)
            n = canon_n(cf, lam, 3, 0, 0);
        else
            n = canon_n(cf, lam, cf->npole, 0, 0);
        if (dn_dl) {
            double d = isfinite(n) ? canon_dn(cf, lam, n) : NAN;
            *dn_dl = isfinite(d) ? d : NAN;
            if (!isfinite(d))
                return NAN;
        }
        return n;
    }
    if (!(lam >= f->lo_um && lam <= f->hi_um && lam > 0)) {
        if (dn_dl)
            *dn_dl = NAN;
        return NAN;
    }
    double x = f->energy ? f->kev / lam : lam, x2 = x * x;
    double sum = 0, dsum = 0;
    for (int i = 0; i < f->nterms; i++) {
        double d;
        sum += term_value(&f->t[i], x, x2, dn_dl ? &d : NULL);
        if (dn_dl)
            dsum += d;
    }
    double n = sum, dn = dsum;
    if (f->squared) {
        n = sum > 0 ? sqrt(sum) : NAN;
        dn = dsum / (2 * n);
    }
    if (f->energy)
        dn *= -f->kev / (lam * lam);
    for (int j = 0; j < f->nthermo; j++) {
        double p = thermo_power(f, j, lam);
        n += f->th_c[j] * p;
        dn += f->th_c[j] * f->th_e[j] * p / lam;
    }
    if (!isfinite(n) || (dn_dl && !isfinite(dn))) {
        if (dn_dl)
            *dn_dl = NAN;
        return NAN;
    }
    if (dn_dl)
        *dn_dl = dn;
    return n;
}

double
dk_nfast_n(const dk_nfast *f, double lam)
{
    return dk_nfast_n_d(f, lam, NULL);
}

/* t[i] = b[i]^k for a small integer k, by the products ipow() uses. */
static inline void
powers(const double *restrict b, double *restrict t, int k, size_t count)
{
    int m = k < 0 ? -k : k;
    if (k < 0) {
#pragma omp simd
        for (size_t i = 0; i < count; i++)
            t[i] = 1 * (1 / b[i]);
    } else {
#pragma omp simd
        for (size_t i = 0; i < count; i++)
            t[i] = 1 * b[i];
    }
    if (m == 0) {
#pragma omp simd
        for (size_t i = 0; i < count; i++)
            t[i] = 1;
    }
    for (int r = 1; r < m; r++) {
        if (k < 0) {
#pragma omp simd
            for (size_t i = 0; i < count; i++)
                t[i] *= 1 / b[i];
        } else {
#pragma omp simd
            for (size_t i = 0; i < count; i++)
                t[i] *= b[i];
        }
    }
}

/* The batch kernel: one pass per term, each a plain loop over the
 * wavelengths; x², the sum and powers live in @work. The arithmetic per
 * element is that of dk_nfast_n_d(), in the same order. */
/* One loop of canon_n() per formula shape: the shape constants make
 * the pole loop unroll and the loop vectorise. */
#define CANON_LOOP(NP, NEG, TH)                                               \
    do {                                                                      \
        _Pragma("omp simd") for (size_t i = 0; i < count; i++) n[i] =        \
            canon_n(&cf, lam[i], NP, NEG, TH);                                \
    } while (0)

#define CANON_CASES(NEG, TH)                                                  \
    switch (cf.npole) {                                                       \
    case 0: CANON_LOOP(0, NEG, TH); break;                                    \
    case 1: CANON_LOOP(1, NEG, TH); break;                                    \
    case 2: CANON_LOOP(2, NEG, TH); break;                                    \
    case 3: CANON_LOOP(3, NEG, TH); break;                                    \
    default: CANON_LOOP(4, NEG, TH); break;                                   \
    }

DK_CLONES static void
canon_batch(const dk_nfast_canon *restrict f, const double *restrict lam,
            double *restrict n, size_t count)
{
    const dk_nfast_canon cf = *f;
    if (cf.neg && cf.thermo)
        CANON_CASES(1, 1)
    else if (cf.neg)
        CANON_CASES(1, 0)
    else if (cf.thermo)
        CANON_CASES(0, 1)
    else
        CANON_CASES(0, 0)
}

DK_CLONES void
dk_nfast_batch(const dk_nfast *f, const double *restrict lam,
               double *restrict n, double *restrict work, size_t count)
{
    if (f->canonical) {
        canon_batch(&f->cf, lam, n, count);
        return;
    }
    double *restrict x2 = work, *restrict sum = work + count;
    double *restrict tmp = work + 2 * count;
    const double kev = f->kev;
    if (f->energy) {
#pragma omp simd
        for (size_t i = 0; i < count; i++) {
            double x = kev / lam[i];
            x2[i] = x * x;
        }
    } else {
#pragma omp simd
        for (size_t i = 0; i < count; i++)
            x2[i] = lam[i] * lam[i];
    }
#pragma omp simd
    for (size_t i = 0; i < count; i++)
        sum[i] = 0;
    for (int t = 0; t < f->nterms; t++) {
        const dk_nfast_term *o = &f->t[t];
        const double s = o->s, p = o->p, b2 = o->b2, e = o->e;
        switch (o->kind) {
        case DK_TERM_CONSTANT:
#pragma omp simd
            for (size_t i = 0; i < count; i++)
                sum[i] += s;
            break;
        case DK_TERM_POLE:
#pragma omp simd
            for (size_t i = 0; i < count; i++)
                sum[i] += s / (x2[i] - p);
            break;
        case DK_TERM_POLE_X2:
#pragma omp simd
            for (size_t i = 0; i < count; i++)
                sum[i] += s * x2[i] / (x2[i] - p);
            break;
        case DK_TERM_POWER:
            if (o->ipow) {
                powers(x2, tmp, o->ipow, count);
#pragma omp simd
                for (size_t i = 0; i < count; i++)
                    sum[i] += s * tmp[i];
            } else {
                for (size_t i = 0; i < count; i++) {
                    double x = f->energy ? kev / lam[i] : lam[i];
                    sum[i] += s * pow(x, e);
                }
            }
            break;
        case DK_TERM_LOG_RATIO:
            for (size_t i = 0; i < count; i++)
                sum[i] += s * log((p - x2[i]) / (b2 - x2[i]));
            break;
        }
    }
    const double lo = f->lo_um, hi = f->hi_um;
    if (f->squared) {
#pragma omp simd
        for (size_t i = 0; i < count; i++) {
            double v = sum[i] > 0 ? sqrt(sum[i]) : NAN;
            n[i] = lam[i] >= lo && lam[i] <= hi && lam[i] > 0 ? v : NAN;
        }
    } else {
#pragma omp simd
        for (size_t i = 0; i < count; i++)
            n[i] = lam[i] >= lo && lam[i] <= hi && lam[i] > 0 ? sum[i] : NAN;
    }
    for (int j = 0; j < f->nthermo; j++) {
        const double c = f->th_c[j], e = f->th_e[j];
        if (f->th_int[j]) {
            powers(lam, tmp, (int)e, count);
#pragma omp simd
            for (size_t i = 0; i < count; i++)
                n[i] += c * tmp[i];
        } else {
            for (size_t i = 0; i < count; i++)
                n[i] += c * pow(lam[i], e);
        }
    }
#pragma omp simd
    for (size_t i = 0; i < count; i++)
        n[i] = isfinite(n[i]) ? n[i] : NAN;
}
