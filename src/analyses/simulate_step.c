/*
 * simulate_step.c - the split-step propagation of a pulsed three-wave-
 * mixing simulation through the crystal (deltak/simulate.h).
 *
 * Method: symmetric (Strang) splitting, e^{hL/2} e^{hN} e^{hL/2}, with
 * adjacent linear half steps merged into one, so that each step costs one
 * FFT to the frequency domain and one back per wave (Strang 1968; the
 * split-step Fourier method of Agrawal, Nonlinear Fiber Optics §2.4). The
 * linear factor exp(i D_j(Ω) h) / n is exact for any h and also undoes
 * the FFT's factor n; frequencies where k had no data get 0 and the
 * energy they held is counted as absorbed. The nonlinear step solves, at
 * every time sample separately, da_j/dz = i κ_j s e^{±iΔkz} (product of
 * the other two fields) over [z, z + h] by the classical fourth-order
 * Runge–Kutta method (Butcher, Numerical Methods for Ordinary
 * Differential Equations, 3rd ed. (2016), §23), the phase e^{±iΔkz} taken
 * exactly at the stages z, z + h/2, z + h.
 *
 * Steps follow the grating: each domain (duty·Λ with +d, then (1 − duty)·Λ
 * with −d; the last one cut at the crystal's end) is divided into equal
 * steps no longer than the largest allowed, so d is constant within every
 * step. Step lengths are computed from the nominal domain lengths, never
 * from differences of positions, so that the few distinct lengths reuse
 * their propagators (a cache of SIM_CACHE_MAX).
 *
 * Samples are processed in blocks of SKIP_BLOCK; a block in which
 * Σ_j |a_j|² stays below s->skip_below (1e-17 of the peak input) skips the
 * nonlinear step: every product there is below 1e-17 of the peak and
 * changes no field by more than double rounding of the peak amplitude.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analyses/sim_state.h"

#define SKIP_BLOCK 64
#define MAX_STEPS 100000000L

/* The Runge–Kutta kernels are also compiled for x86-64-v3 (AVX2, FMA) and
 * chosen at run time where the processor has it (GCC's target_clones):
 * about twice as fast there, the same results to rounding. */
#if defined(__GNUC__) && !defined(__clang__) && defined(__x86_64__) &&       \
    defined(__linux__) && __GNUC__ >= 8
#define SIM_KERNEL __attribute__((target_clones("arch=x86-64-v3", "default")))
#else
#define SIM_KERNEL
#endif
#define WALL_TOL 1e-9   /* of a period: a domain shorter than this is none */

/* ---- the step sequence --------------------------------------------------- */

typedef struct step_seq {
    const dk_sim *s;
    double hmax;
    long domain;      /* index of the current domain */
    double start;     /* its start, µm */
    double h;         /* its step length, µm */
    long nsub, sub;   /* steps in it, steps taken */
    int sign;         /* sign of d in it */
    int done;
} step_seq;

/* Set up domain @d; 0 when the crystal ends before it. */
static int
seq_domain(step_seq *q, long d)
{
    const dk_sim *s = q->s;
    double L = s->length_um, start, nominal;
    int sign = 1;
    if (!s->qpm) {
        if (d > 0)
            return 0;
        start = 0;
        nominal = L;
    } else {
        double per = s->period_um, D = s->duty;
        long m = d / 2;
        if (d % 2 == 0) {
            start = m * per;
            nominal = D * per;
        } else {
            start = (m + D) * per;
            nominal = (1 - D) * per;
            sign = -1;
        }
        if (start >= L - WALL_TOL * per)
            return 0;
        if (start + nominal > L - WALL_TOL * per)
            nominal = L - start; /* the last domain, cut */
    }
    double want = ceil(nominal / q->hmax * (1 - 1e-12));
    /* more than MAX_STEPS in one domain is refused by the caller anyway */
    long nsub = want < 1 ? 1 : want > MAX_STEPS ? MAX_STEPS + 1 : (long)want;
    q->domain = d;
    q->start = start;
    q->h = nominal / nsub;
    q->nsub = nsub;
    q->sub = 0;
    q->sign = sign;
    return 1;
}

static void
seq_init(step_seq *q, const dk_sim *s, double hmax)
{
    q->s = s;
    q->hmax = hmax;
    q->done = !seq_domain(q, 0);
}

/* The next step (start, length, sign); 0 at the end of the crystal. */
static int
seq_next(step_seq *q, double *z, double *h, int *sign)
{
    if (q->done)
        return 0;
    if (q->sub == q->nsub && !seq_domain(q, q->domain + 1)) {
        q->done = 1;
        return 0;
    }
    *z = q->start + q->sub * q->h;
    *h = q->h;
    *sign = q->sign;
    q->sub++;
    return 1;
}

long
sim_count_steps(const dk_sim *s, double max_step_um)
{
    step_seq q;
    seq_init(&q, s, max_step_um);
    long count = 0;
    while (!q.done && count <= MAX_STEPS) {
        count += q.nsub;
        if (!seq_domain(&q, q.domain + 1))
            break;
    }
    return count;
}

/* ---- the linear step ----------------------------------------------------- */

void
sim_release_cache(dk_sim *s)
{
    for (int c = 0; c < s->ncache; c++) {
        fftw_free(s->cache[c].p);
        s->cache[c].p = NULL;
    }
    s->ncache = 0;
}

/* exp(i D h)/n for length @h, from the cache or computed; NULL when out
 * of memory. */
static const double complex *
propagator(dk_sim *s, double h)
{
    s->clock++;
    for (int c = 0; c < s->ncache; c++)
        if (s->cache[c].h_um == h) {
            s->cache[c].used = s->clock;
            return s->cache[c].p;
        }
    size_t n = s->n, total = (size_t)s->nw * n;
    size_t fit = SIM_CACHE_BYTES / (total * sizeof(double complex));
    int limit = fit < 1 ? 1 : fit > SIM_CACHE_MAX ? SIM_CACHE_MAX : (int)fit;
    int slot;
    if (s->ncache < limit) {
        slot = s->ncache;
        s->cache[slot].p = fftw_alloc_complex(total);
        if (!s->cache[slot].p)
            return NULL;
        s->ncache++;
    } else {
        slot = 0;
        for (int c = 1; c < s->ncache; c++)
            if (s->cache[c].used < s->cache[slot].used)
                slot = c;
    }
    sim_prop *pr = &s->cache[slot];
    double inv = 1.0 / (double)n;
    for (size_t i = 0; i < total; i++) {
        double D = s->disp[i];
        pr->p[i] = isfinite(D) ? inv * cexp(I * D * h) : 0;
    }
    pr->h_um = h;
    pr->used = s->clock;
    return pr->p;
}

/* Multiply the spectra in s->field by the propagator of length @h,
 * counting what undefined frequencies remove. */
static dk_status
linear_step(dk_sim *s, double h, dk_error *err)
{
    const double complex *P = propagator(s, h);
    if (!P)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    size_t n = s->n;
    for (int j = 0; j < s->nw; j++) {
        double *f = (double *)(s->field + (size_t)j * n);
        const double *p = (const double *)(P + (size_t)j * n);
        double lost = 0;
        for (size_t b = 0; b < s->nbad[j]; b++) {
            size_t i = s->bad[j][b];
            lost += f[2 * i] * f[2 * i] + f[2 * i + 1] * f[2 * i + 1];
        }
        s->absorbed[j] += lost * s->dt / (double)n;
        for (size_t i = 0; i < n; i++) {
            double fr = f[2 * i], fi = f[2 * i + 1];
            double pr = p[2 * i], pi = p[2 * i + 1];
            f[2 * i] = fr * pr - fi * pi;
            f[2 * i + 1] = fr * pi + fi * pr;
        }
    }
    return DK_OK;
}

/* ---- the nonlinear step -------------------------------------------------- */

/* (r, i) = c · x · y for complex c, x, y given as real and imaginary parts. */
#define CMUL3(r, i, cr, ci, xr, xi, yr, yi)                                   \
    do {                                                                      \
        double pr_ = (xr) * (yr) - (xi) * (yi);                               \
        double pi_ = (xr) * (yi) + (xi) * (yr);                               \
        (r) = (cr) * pr_ - (ci) * pi_;                                        \
        (i) = (cr) * pi_ + (ci) * pr_;                                        \
    } while (0)

/* Stage coefficients c[stage][wave] = i κ_j s h e^{±iΔk z_stage} as
 * (re, im) pairs: stage 0 at z, 1 at z + h/2, 2 at z + h. */
static void
stage_coefficients(const dk_sim *s, double z, double h, int sign,
                   double c[3][6])
{
    double zs[3] = {z, z + 0.5 * h, z + h};
    for (int st = 0; st < 3; st++) {
        double complex e = cexp(I * s->dk0 * zs[st]);
        for (int j = 0; j < s->nw; j++) {
            double complex ph = j == s->nw - 1 ? conj(e) : e;
            double complex v = I * s->kappa[j] * sign * h * ph;
            c[st][2 * j] = creal(v);
            c[st][2 * j + 1] = cimag(v);
        }
    }
}

/* Three waves: k1 = c1 a3 a2*, k2 = c2 a3 a1*, k3 = c3 a1 a2. */
#define DRIVE3(C, y1r, y1i, y2r, y2i, y3r, y3i)                               \
    do {                                                                      \
        CMUL3(k1r, k1i, (C)[0], (C)[1], y3r, y3i, y2r, -(y2i));               \
        CMUL3(k2r, k2i, (C)[2], (C)[3], y3r, y3i, y1r, -(y1i));               \
        CMUL3(k3r, k3i, (C)[4], (C)[5], y1r, y1i, y2r, y2i);                  \
    } while (0)

/* RK4 over one block; R holds rows a1r, a1i, a2r, a2i, a3r, a3i of
 * SKIP_BLOCK samples each (a fixed count, so that the compiler can
 * vectorise the loop). */
SIM_KERNEL static void
rk4_three(double *restrict R, const double c[3][6])
{
    double *restrict x1r = R, *restrict x1i = R + SKIP_BLOCK;
    double *restrict x2r = R + 2 * SKIP_BLOCK, *restrict x2i = R + 3 * SKIP_BLOCK;
    double *restrict x3r = R + 4 * SKIP_BLOCK, *restrict x3i = R + 5 * SKIP_BLOCK;
    for (int i = 0; i < SKIP_BLOCK; i++) {
        double a1r = x1r[i], a1i = x1i[i], a2r = x2r[i], a2i = x2i[i];
        double a3r = x3r[i], a3i = x3i[i];
        double k1r, k1i, k2r, k2i, k3r, k3i;
        double s1r, s1i, s2r, s2i, s3r, s3i;
        double t1r, t1i, t2r, t2i, t3r, t3i;
        DRIVE3(c[0], a1r, a1i, a2r, a2i, a3r, a3i);
        s1r = k1r, s1i = k1i, s2r = k2r, s2i = k2i, s3r = k3r, s3i = k3i;
        t1r = a1r + 0.5 * k1r, t1i = a1i + 0.5 * k1i;
        t2r = a2r + 0.5 * k2r, t2i = a2i + 0.5 * k2i;
        t3r = a3r + 0.5 * k3r, t3i = a3i + 0.5 * k3i;
        DRIVE3(c[1], t1r, t1i, t2r, t2i, t3r, t3i);
        s1r += 2 * k1r, s1i += 2 * k1i, s2r += 2 * k2r, s2i += 2 * k2i;
        s3r += 2 * k3r, s3i += 2 * k3i;
        t1r = a1r + 0.5 * k1r, t1i = a1i + 0.5 * k1i;
        t2r = a2r + 0.5 * k2r, t2i = a2i + 0.5 * k2i;
        t3r = a3r + 0.5 * k3r, t3i = a3i + 0.5 * k3i;
        DRIVE3(c[1], t1r, t1i, t2r, t2i, t3r, t3i);
        s1r += 2 * k1r, s1i += 2 * k1i, s2r += 2 * k2r, s2i += 2 * k2i;
        s3r += 2 * k3r, s3i += 2 * k3i;
        t1r = a1r + k1r, t1i = a1i + k1i;
        t2r = a2r + k2r, t2i = a2i + k2i;
        t3r = a3r + k3r, t3i = a3i + k3i;
        DRIVE3(c[2], t1r, t1i, t2r, t2i, t3r, t3i);
        s1r += k1r, s1i += k1i, s2r += k2r, s2i += k2i, s3r += k3r;
        s3i += k3i;
        x1r[i] = a1r + s1r / 6, x1i[i] = a1i + s1i / 6;
        x2r[i] = a2r + s2r / 6, x2i[i] = a2i + s2i / 6;
        x3r[i] = a3r + s3r / 6, x3i[i] = a3i + s3i / 6;
    }
}

/* Degenerate: k1 = c1 a3 a1*, k3 = c3 a1 a1 (c3 holds κ3/2). */
#define DRIVE2(C, y1r, y1i, y3r, y3i)                                         \
    do {                                                                      \
        CMUL3(k1r, k1i, (C)[0], (C)[1], y3r, y3i, y1r, -(y1i));               \
        CMUL3(k3r, k3i, (C)[2], (C)[3], y1r, y1i, y1r, y1i);                  \
    } while (0)

/* As rk4_three with rows a1r, a1i, a3r, a3i. */
SIM_KERNEL static void
rk4_two(double *restrict R, const double c[3][6])
{
    double *restrict x1r = R, *restrict x1i = R + SKIP_BLOCK;
    double *restrict x3r = R + 2 * SKIP_BLOCK, *restrict x3i = R + 3 * SKIP_BLOCK;
    for (int i = 0; i < SKIP_BLOCK; i++) {
        double a1r = x1r[i], a1i = x1i[i], a3r = x3r[i], a3i = x3i[i];
        double k1r, k1i, k3r, k3i, s1r, s1i, s3r, s3i, t1r, t1i, t3r, t3i;
        DRIVE2(c[0], a1r, a1i, a3r, a3i);
        s1r = k1r, s1i = k1i, s3r = k3r, s3i = k3i;
        t1r = a1r + 0.5 * k1r, t1i = a1i + 0.5 * k1i;
        t3r = a3r + 0.5 * k3r, t3i = a3i + 0.5 * k3i;
        DRIVE2(c[1], t1r, t1i, t3r, t3i);
        s1r += 2 * k1r, s1i += 2 * k1i, s3r += 2 * k3r, s3i += 2 * k3i;
        t1r = a1r + 0.5 * k1r, t1i = a1i + 0.5 * k1i;
        t3r = a3r + 0.5 * k3r, t3i = a3i + 0.5 * k3i;
        DRIVE2(c[1], t1r, t1i, t3r, t3i);
        s1r += 2 * k1r, s1i += 2 * k1i, s3r += 2 * k3r, s3i += 2 * k3i;
        t1r = a1r + k1r, t1i = a1i + k1i;
        t3r = a3r + k3r, t3i = a3i + k3i;
        DRIVE2(c[2], t1r, t1i, t3r, t3i);
        s1r += k1r, s1i += k1i, s3r += k3r, s3i += k3i;
        x1r[i] = a1r + s1r / 6, x1i[i] = a1i + s1i / 6;
        x3r[i] = a3r + s3r / 6, x3i[i] = a3i + s3i / 6;
    }
}

/* The nonlinear step over [z, z + h] at every sample; fills the fluence of
 * each stored wave after it (GW/cm² fs). Samples go through a block of
 * rows (real parts, imaginary parts per wave) so that the arithmetic runs
 * on contiguous arrays. */
static void
nonlinear_step(dk_sim *s, double z, double h, int sign, double fl[3])
{
    double c[3][6];
    stage_coefficients(s, z, h, sign, c);
    size_t n = s->n; /* a power of two ≥ 64: whole blocks */
    int nw = s->nw;
    double *x[3] = {NULL, NULL, NULL};
    for (int j = 0; j < nw; j++)
        x[j] = (double *)(s->field + (size_t)j * n);
    double R[6 * SKIP_BLOCK], tot[SKIP_BLOCK];
    double sum[3] = {0, 0, 0};
    for (size_t b = 0; b < n; b += SKIP_BLOCK) {
        for (int j = 0; j < nw; j++) {
            double *re = R + 2 * j * SKIP_BLOCK, *im = re + SKIP_BLOCK;
            const double *src = x[j] + 2 * b;
            for (int i = 0; i < SKIP_BLOCK; i++) {
                re[i] = src[2 * i];
                im[i] = src[2 * i + 1];
            }
        }
        for (int i = 0; i < SKIP_BLOCK; i++)
            tot[i] = 0;
        for (int j = 0; j < 2 * nw; j++)
            for (int i = 0; i < SKIP_BLOCK; i++)
                tot[i] += R[j * SKIP_BLOCK + i] * R[j * SKIP_BLOCK + i];
        double top = 0;
        for (int i = 0; i < SKIP_BLOCK; i++)
            top = tot[i] > top ? tot[i] : top;
        if (top >= s->skip_below) {
            if (nw == 3)
                rk4_three(R, c);
            else
                rk4_two(R, c);
            for (int j = 0; j < nw; j++) {
                const double *re = R + 2 * j * SKIP_BLOCK;
                const double *im = re + SKIP_BLOCK;
                double *dst = x[j] + 2 * b;
                for (int i = 0; i < SKIP_BLOCK; i++) {
                    dst[2 * i] = re[i];
                    dst[2 * i + 1] = im[i];
                }
            }
        }
        for (int j = 0; j < nw; j++) {
            const double *re = R + 2 * j * SKIP_BLOCK;
            for (int i = 0; i < 2 * SKIP_BLOCK; i++)
                sum[j] += re[i] * re[i];
        }
    }
    for (int j = 0; j < 3; j++)
        fl[j] = sum[j] * s->dt;
}

/* ---- the run ------------------------------------------------------------- */

/* The Manley–Rowe invariants of fluences @f (absorbed light added back). */
static void
invariants(const dk_sim *s, const double f[3], double m[2])
{
    double q[3];
    for (int j = 0; j < s->nw; j++)
        q[j] = (f[j] + s->absorbed[j]) / s->omega0[j];
    if (s->nw == 3) {
        m[0] = q[0] + q[2];
        m[1] = q[1] + q[2];
    } else {
        m[0] = q[0] + 2 * q[1];
        m[1] = 0;
    }
}

static void
record(dk_sim *s, double z_um, const double f[3])
{
    size_t cap = (size_t)s->record_max + 2;
    if (s->nrec >= cap)
        return;
    s->rec_z[s->nrec] = z_um;
    for (int j = 0; j < s->nw; j++)
        s->rec_f[(size_t)j * cap + s->nrec] = f[j];
    s->nrec++;
}

dk_status
dk_sim_propagate(dk_sim *s, double max_step_um, double fluence_out[3],
                 dk_error *err)
{
    if (!(isfinite(max_step_um) && max_step_um > 0))
        return dk_error_set(err, DK_EINVAL,
                            "the largest step must be a positive number of "
                            "micrometres (got %g)",
                            max_step_um);
    long total = sim_count_steps(s, max_step_um);
    if (total > MAX_STEPS)
        return dk_error_set(err, DK_EINVAL,
                            "a step of %g um needs more than %ld steps "
                            "through %g mm",
                            max_step_um, MAX_STEPS, s->length_um * 1e-3);
    size_t n = s->n;
    int nw = s->nw;
    s->ran = 0;
    s->steps = 0;
    s->h_max_used = 0;
    s->nrec = 0;
    s->mr_defect = 0;
    memcpy(s->field, s->input, (size_t)nw * n * sizeof(double complex));
    double f[3] = {0, 0, 0}, m0[2], m[2];
    for (int j = 0; j < nw; j++) {
        s->absorbed[j] = 0;
        f[j] = s->fluence_in[j] = sim_fluence(s->field + (size_t)j * n, n,
                                              s->dt);
    }
    invariants(s, f, m0);
    double norm = nw == 3 ? m0[0] + m0[1] : m0[0];
    long stride = (total + s->record_max - 1) / s->record_max;
    if (stride < 1)
        stride = 1;
    record(s, 0, f);

    step_seq q;
    seq_init(&q, s, max_step_um);
    double z, h, z1, h1;
    int sign, sign1;
    if (!seq_next(&q, &z, &h, &sign))
        return dk_error_set(err, DK_EINVAL, "the crystal has no length");
    dk_status st;
    fftw_execute(s->to_freq);
    if ((st = linear_step(s, 0.5 * h, err)))
        return st;
    fftw_execute(s->to_time);
    for (;;) {
        nonlinear_step(s, z, h, sign, f);
        s->steps++;
        s->h_max_used = fmax(s->h_max_used, h);
        for (int j = 0; j < nw; j++)
            if (!isfinite(f[j]))
                return dk_error_set(err, DK_EDOM,
                                    "the fields stopped being finite at z = "
                                    "%g mm (try a shorter step)",
                                    (z + h) * 1e-3);
        invariants(s, f, m);
        if (norm > 0)
            for (int i = 0; i < (nw == 3 ? 2 : 1); i++)
                s->mr_defect =
                    fmax(s->mr_defect, fabs(m[i] - m0[i]) / norm);
        int more = seq_next(&q, &z1, &h1, &sign1);
        if (!more || s->steps % stride == 0)
            record(s, more ? z + h : s->length_um, f);
        fftw_execute(s->to_freq);
        if ((st = linear_step(s, more ? 0.5 * (h + h1) : 0.5 * h, err)))
            return st;
        if (!more)
            break;
        fftw_execute(s->to_time);
        z = z1, h = h1, sign = sign1;
    }
    /* The state is now the exit spectrum, normalised by 1/n. */
    for (int j = 0; j < nw; j++)
        s->fluence_out[j] =
            sim_fluence(s->field + (size_t)j * n, n, s->dt) * (double)n;
    s->ran = 1;
    if (fluence_out) {
        fluence_out[0] = fluence_out[1] = fluence_out[2] = 0;
        for (int j = 0; j < nw; j++)
            fluence_out[s->role[j]] =
                s->fluence_out[j] * SIM_FLUENCE_TO_J_PER_CM2;
    }
    return DK_OK;
}
