/*
 * acceptance.c - FWHM of sinc²(ΔkL/2) along one parameter (method and
 * references in deltak/acceptance.h).
 */
#include <math.h>
#include <stdlib.h>

#include "deltak/acceptance.h"
#include "deltak/constants.h"

#define GROWTH 1.6       /* outward step growth factor */
#define MAX_STEPS 200

double
dk_sinc(double x)
{
    return fabs(x) < 1e-4 ? 1 - x * x / 6 : sin(x) / x;
}

double
dk_sinc2(double dk_rad_per_um, double length_um)
{
    double s = dk_sinc(0.5 * dk_rad_per_um * length_um);
    return s * s;
}

typedef struct half_probe {
    dk_scalar_fn dk;
    void *params;
    double half_length;   /* L/2 in µm */
} half_probe;

/* |Δk|·L/2 − u½: negative inside the FWHM, positive outside. */
static double
half_level(double x, void *p)
{
    half_probe *h = p;
    double d = h->dk(x, h->params);
    return isfinite(d) ? fabs(d) * h->half_length - DK_SINC2_HALF_U : NAN;
}

/* The last point between @a (Δk defined) and @b (not) where Δk is
 * still defined, by bisection. */
static double
defined_edge(half_probe *h, double a, double b)
{
    for (int i = 0; i < 60; i++) {
        double m = 0.5 * (a + b);
        if (m == a || m == b)
            break;
        if (isfinite(half_level(m, h)))
            a = m;
        else
            b = m;
    }
    return a;
}

/* Step from @x0 in direction @dir until outside the half maximum; then
 * refine. Returns 1 and *edge on success; 2 and *edge = the end of the
 * domain (a search limit, or where Δk stops being defined) when sinc²
 * stays above ½ up to there; 0 when the root refinement fails. */
static int
find_edge(half_probe *h, double x0, double step, int dir, double xmin,
          double xmax, double *edge)
{
    double a = x0, fa = half_level(a, h);
    double s = step;
    for (int i = 0; i < MAX_STEPS; i++) {
        double b = a + dir * s;
        if (b < xmin || b > xmax)
            b = dir > 0 ? xmax : xmin;
        double fb = half_level(b, h);
        if (!isfinite(fb)) {
            *edge = defined_edge(h, a, b);
            return 2;
        }
        if (fb >= 0 && fa < 0) {
            double lo = fmin(a, b), hi = fmax(a, b), r;
            if (dk_root_bracketed(half_level, h, lo, hi,
                                  1e-12 * fmax(1, fabs(x0)), &r, NULL))
                return 0;
            *edge = r;
            return 1;
        }
        if (b == xmin || b == xmax) {
            *edge = b;
            return 2;
        }
        a = b, fa = fb;
        s *= GROWTH;
    }
    *edge = a;
    return 2;
}

dk_status
dk_acceptance_fwhm(dk_scalar_fn dk, void *params, double x0,
                   double length_um, double step, double xmin, double xmax,
                   dk_acceptance *out, dk_error *err)
{
    if (!(length_um > 0) || !(step > 0) || !(xmin <= x0 && x0 <= xmax))
        return dk_error_set(err, DK_EINVAL,
                            "bad length, step or search range for the "
                            "acceptance");
    double f0 = dk(x0, params);
    if (!isfinite(f0))
        return dk_error_set(err, DK_EDOM,
                            "phase mismatch is not defined at the operating "
                            "point");
    /* Refine the peak to the zero of Δk near x0, if there is one. */
    double peak = x0;
    for (double s = step; s <= 64 * step && f0 != 0; s *= 2) {
        double a = fmax(xmin, x0 - s), b = fmin(xmax, x0 + s);
        double fa = dk(a, params), fb = dk(b, params);
        if (isfinite(fa) && fa * f0 <= 0 &&
            !dk_root_bracketed(dk, params, a, x0, 1e-13 * fmax(1, fabs(x0)),
                               &peak, NULL))
            break;
        if (isfinite(fb) && fb * f0 <= 0 &&
            !dk_root_bracketed(dk, params, x0, b, 1e-13 * fmax(1, fabs(x0)),
                               &peak, NULL))
            break;
    }
    out->peak = peak;
    /* Derivatives at the peak by central differences. */
    double h = step * 1e-2;
    double fp = dk(peak + h, params), fm = dk(peak - h, params);
    double fc = dk(peak, params);
    out->slope = (fp - fm) / (2 * h);
    double curv = (fp - 2 * fc + fm) / (h * h);
    double lin = 2 * 2 * DK_SINC2_HALF_U / length_um;   /* 2·2.78311/L */
    out->linear_fwhm = fabs(out->slope) > 0 ? lin / fabs(out->slope)
                                            : INFINITY;
    out->quadratic_fwhm = fabs(curv) > 0
                              ? 2 * sqrt(2 * 2 * DK_SINC2_HALF_U /
                                         (length_um * fabs(curv)))
                              : INFINITY;
    half_probe hp = {dk, params, length_um / 2};
    int a = find_edge(&hp, peak, step, -1, xmin, xmax, &out->lo);
    int b = find_edge(&hp, peak, step, +1, xmin, xmax, &out->hi);
    out->open_lo = a == 2;
    out->open_hi = b == 2;
    out->bounded = a == 1 && b == 1;
    if (!a)
        out->lo = -INFINITY;
    if (!b)
        out->hi = INFINITY;
    out->fwhm = out->hi - out->lo;
    return DK_OK;
}

/* Append [lo, hi] to @out, merging with the last interval when they
 * touch. Intervals arrive in ascending order. */
static void
add_lobe(dk_acceptance_lobes *out, double lo, double hi)
{
    if (out->n > 0 && lo <= out->hi[out->n - 1]) {
        out->hi[out->n - 1] = fmax(out->hi[out->n - 1], hi);
        return;
    }
    if (out->n == DK_ACCEPTANCE_MAX_LOBES) {
        out->truncated = 1;
        return;
    }
    out->lo[out->n] = lo;
    out->hi[out->n] = hi;
    out->n++;
}

/* Refine the crossing of the half level between @a and @b (opposite
 * sides); the midpoint when the solver fails. */
static double
crossing(half_probe *h, double a, double b)
{
    double r;
    if (dk_root_bracketed(half_level, h, fmin(a, b), fmax(a, b),
                          1e-12 * fmax(1, fmax(fabs(a), fabs(b))), &r, NULL))
        return 0.5 * (a + b);
    return r;
}

/* Δk itself, for the root refinement of narrow lobes. */
static double
plain_dk(double x, void *p)
{
    half_probe *h = p;
    return h->dk(x, h->params);
}

dk_status
dk_acceptance_lobes_scan(dk_scalar_fn dk, void *params, double length_um,
                         double xmin, double xmax, int nsamples,
                         const dk_acceptance *central,
                         dk_acceptance_lobes *out, dk_error *err)
{
    if (!(length_um > 0) || !(xmin < xmax) || !isfinite(xmin) ||
        !isfinite(xmax) || nsamples < 16 || nsamples > 1000000)
        return dk_error_set(err, DK_EINVAL,
                            "bad length, domain or sample count for the "
                            "acceptance scan");
    *out = (dk_acceptance_lobes){0};
    out->central = -1;
    half_probe hp = {dk, params, length_um / 2};
    double *x = malloc(2 * (size_t)nsamples * sizeof *x);
    if (!x)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    double *f = x + nsamples;
    for (int k = 0; k < nsamples; k++) {
        x[k] = xmin + (xmax - xmin) * k / (nsamples - 1);
        f[k] = half_level(x[k], &hp);
    }
    /* Walk the samples; an interval opens where f < 0 begins. */
    int inside = 0;
    double start = NAN;
    for (int k = 0; k < nsamples; k++) {
        int in = isfinite(f[k]) && f[k] < 0;
        if (in && !inside) {
            if (k == 0)
                start = x[0];
            else if (isfinite(f[k - 1]))
                start = crossing(&hp, x[k - 1], x[k]);
            else
                start = defined_edge(&hp, x[k], x[k - 1]);
            inside = 1;
        } else if (!in && inside) {
            double end = isfinite(f[k]) ? crossing(&hp, x[k - 1], x[k])
                                        : defined_edge(&hp, x[k - 1], x[k]);
            add_lobe(out, start, end);
            inside = 0;
        } else if (!in && k > 0 && isfinite(f[k]) && isfinite(f[k - 1])) {
            /* Both outside: a root of Δk between them is a narrow lobe. */
            double da = dk(x[k - 1], params), db = dk(x[k], params), r;
            if (isfinite(da) && isfinite(db) && da * db < 0 &&
                !dk_root_bracketed(plain_dk, &hp, x[k - 1], x[k],
                                   1e-13 * fmax(1, fabs(x[k])), &r, NULL) &&
                half_level(r, &hp) < 0)
                add_lobe(out, crossing(&hp, x[k - 1], r),
                         crossing(&hp, r, x[k]));
        }
    }
    if (inside)
        add_lobe(out, start, xmax);
    free(x);
    /* The exact central lobe replaces the sampled one(s) it overlaps. */
    if (central && isfinite(central->lo) && isfinite(central->hi)) {
        dk_acceptance_lobes merged = {0};
        merged.central = -1;
        int placed = 0;
        for (int i = 0; i <= out->n; i++) {
            int last = i == out->n;
            if (!placed && (last || out->lo[i] >= central->lo)) {
                add_lobe(&merged, central->lo, central->hi);
                placed = 1;
            }
            if (last)
                break;
            if (out->hi[i] >= central->lo && out->lo[i] <= central->hi)
                continue;   /* the sampled view of the central lobe */
            add_lobe(&merged, out->lo[i], out->hi[i]);
        }
        merged.truncated |= out->truncated;
        *out = merged;
        for (int i = 0; i < out->n; i++)
            if (out->lo[i] <= central->peak && central->peak <= out->hi[i])
                out->central = i;
    }
    out->group_first = out->group_last = out->central;
    if (out->central >= 0) {
        int a = out->central, b = out->central;
        for (int grew = 1; grew;) {
            grew = 0;
            double w = out->hi[b] - out->lo[a];
            if (a > 0 && out->lo[a] - out->hi[a - 1] < w)
                a--, grew = 1;
            else if (b < out->n - 1 && out->lo[b + 1] - out->hi[b] < w)
                b++, grew = 1;
        }
        out->group_first = a, out->group_last = b;
        out->outer_lo = out->lo[a], out->outer_hi = out->hi[b];
        out->outer_fwhm = out->outer_hi - out->outer_lo;
        out->contiguous = a == b;
    }
    if (out->n > 0) {
        out->open_lo = out->lo[0] <= xmin ||
                       (central && out->central == 0 && central->open_lo);
        out->open_hi = out->hi[out->n - 1] >= xmax ||
                       (central && out->central == out->n - 1 &&
                        central->open_hi);
    }
    return DK_OK;
}

double
dk_acceptance_per_length(const dk_acceptance *a, double length_cm,
                         int *sqrt_law)
{
    int root = !(isfinite(a->linear_fwhm) &&
                 fabs(a->linear_fwhm - a->fwhm) < 0.2 * a->fwhm);
    if (sqrt_law)
        *sqrt_law = root;
    if (!(length_cm > 0) || !isfinite(length_cm) || !(a->fwhm >= 0))
        return NAN;
    return a->fwhm * (root ? sqrt(length_cm) : length_cm);
}

double
dk_interval_thz(double lo_um, double hi_um)
{
    if (!(lo_um > 0) || !(hi_um > 0))
        return NAN;
    return DK_C_UM_PER_FS * 1e3 * fabs(1 / lo_um - 1 / hi_um);
}
