/*
 * bandwidth.c - bandwidth as time (method, constants and references in
 * deltak/bandwidth.h): pair acceptances in frequency, transform limits,
 * the longest crystal for a pulse, and dispersion of a pulse by the
 * crystal.
 */
#include <complex.h>
#include <math.h>
#include <stdlib.h>

#include "analyses/samples_fwhm.h"
#include "deltak/bandwidth.h"
#include "deltak/constants.h"
#include "deltak/design_sim.h"
#include "deltak/tolerance.h"
#include "design/design_fast.h"

#define C_UM_THZ 299.792458     /* c in µm·THz */
#define LOBE_SAMPLES 4001
#define L_MIN_MM 1e-3
#define L_MAX_MM 1e4

double
dk_time_bandwidth(dk_pulse_shape s)
{
    /* 2 ln2/π; 4 ln²(1+√2)/π² */
    return s == DK_SHAPE_SECH2 ? 4 * pow(log(1 + M_SQRT2), 2) / (M_PI * M_PI)
                               : 2 * M_LN2 / M_PI;
}

const char *
dk_pulse_shape_str(dk_pulse_shape s)
{
    return s == DK_SHAPE_SECH2 ? "sech2" : "Gaussian";
}

double
dk_transform_limit_fs(double fwhm_thz, dk_pulse_shape s)
{
    return fwhm_thz > 0 ? 1e3 * dk_time_bandwidth(s) / fwhm_thz : INFINITY;
}

double
dk_pulse_bandwidth_thz(double fwhm_fs, dk_pulse_shape s)
{
    return fwhm_fs > 0 ? 1e3 * dk_time_bandwidth(s) / fwhm_fs : NAN;
}

const char *
dk_pair_str(dk_pair p, int shg)
{
    switch (p) {
    case DK_PAIR_SIGNAL_IDLER:
        return shg ? "fundamental-harmonic" : "signal-idler";
    case DK_PAIR_PUMP_IDLER: return "pump-idler";
    case DK_PAIR_PUMP_SIGNAL: return "pump-signal";
    }
    return "?";
}

int
dk_pair_applies(const dk_design *d, dk_pair p)
{
    return p == DK_PAIR_SIGNAL_IDLER ||
           (!d->shg && (p == DK_PAIR_PUMP_IDLER || p == DK_PAIR_PUMP_SIGNAL));
}

/* The frequency steps (THz per unit δ) of signal, idler, pump. */
static void
pair_steps(const dk_design *d, dk_pair p, double m[3])
{
    if (d->shg) {
        m[0] = m[1] = 1, m[2] = 2;
        return;
    }
    switch (p) {
    case DK_PAIR_SIGNAL_IDLER: m[0] = 1, m[1] = -1, m[2] = 0; return;
    case DK_PAIR_PUMP_IDLER: m[0] = 0, m[1] = 1, m[2] = 1; return;
    case DK_PAIR_PUMP_SIGNAL: m[0] = 1, m[1] = 0, m[2] = 1; return;
    }
}

/* Δk of @d at waves @w, everything else at the operating point. */
static double
dk_at_waves(dk_design *d, const dk_waves *w)
{
    if (d->scheme == DK_SCHEME_QPM)
        return dk_qpm_delta_k(&d->qpm, w, d->temp_c, d->period_um);
    dk_angle_problem pb = d->angle;
    pb.waves = *w;
    pb.temp_c = d->temp_c;
    double r = dk_angle_delta_k(&pb, d->pol, d->theta_rad, d->phi_rad);
    d->angle.warnings |= pb.warnings;
    return r;
}

/* The waves of @d with pair @p detuned by @delta_thz; 0 when a frequency
 * is not positive or the pair does not apply. */
static int
pair_waves(const dk_design *d, dk_pair p, double delta_thz, dk_waves *w)
{
    if (!dk_pair_applies(d, p) || !isfinite(delta_thz))
        return 0;
    double m[3];
    pair_steps(d, p, m);
    const double lam[3] = {d->waves.signal_um, d->waves.idler_um,
                           d->waves.pump_um};
    double nu[3];
    for (int j = 0; j < 3; j++) {
        nu[j] = C_UM_THZ / lam[j] + m[j] * delta_thz;
        if (!(nu[j] > 0))
            return 0;
    }
    *w = (dk_waves){.signal_um = C_UM_THZ / nu[0],
                    .idler_um = C_UM_THZ / nu[1],
                    .pump_um = C_UM_THZ / nu[2]};
    return 1;
}

double
dk_design_pair_delta_k(dk_design *d, dk_pair p, double delta_thz)
{
    dk_waves w;
    if (!pair_waves(d, p, delta_thz, &w))
        return NAN;
    return dk_at_waves(d, &w);
}

/* The band of δ (THz) where every wave stays inside the transparency. */
static void
pair_domain(const dk_design *d, dk_pair p, double *lo, double *hi)
{
    double m[3];
    pair_steps(d, p, m);
    const double nlo = C_UM_THZ / d->crystal->transparency_um[1],
                 nhi = C_UM_THZ / d->crystal->transparency_um[0];
    const double lam[3] = {d->waves.signal_um, d->waves.idler_um,
                           d->waves.pump_um};
    *lo = -INFINITY, *hi = INFINITY;
    for (int j = 0; j < 3; j++) {
        if (m[j] == 0)
            continue;
        double nu = C_UM_THZ / lam[j];
        double a = (nlo - nu) / m[j], b = (nhi - nu) / m[j];
        *lo = fmax(*lo, fmin(a, b));
        *hi = fmin(*hi, fmax(a, b));
    }
    /* Stay a hair inside, and keep the operating point in. */
    double span = *hi - *lo;
    *lo = fmin(*lo + 1e-9 * span, 0);
    *hi = fmax(*hi - 1e-9 * span, 0);
}

/* The pair's Δk for the root finders and scans, the dispersion compiled
 * once (design_fast.h: the same bits as dk_design_pair_delta_k()). */
typedef struct pair_probe {
    dk_design *d;
    dk_pair p;
    dk_design_fast f;
} pair_probe;

static void
pair_probe_init(pair_probe *pr, dk_design *d, dk_pair p)
{
    pr->d = d;
    pr->p = p;
    dk_design_fast_init(&pr->f, d, d->temp_c);
}

static double
pair_dk(double x, void *pp)
{
    pair_probe *pr = pp;
    dk_waves w;
    if (!pr->f.ready || !pair_waves(pr->d, pr->p, x, &w))
        return dk_design_pair_delta_k(pr->d, pr->p, x);
    return dk_design_fast_dk(&pr->f, &w, pr->d->theta_rad, pr->d->phi_rad);
}

dk_status
dk_design_pair_acceptance(dk_design *d, dk_pair p, dk_acceptance *acc,
                          dk_acceptance_lobes *lobes, dk_error *err)
{
    if (!dk_pair_applies(d, p))
        return dk_error_set(err, DK_EINVAL, "the %s pair does not apply to "
                                            "an SHG design",
                            dk_pair_str(p, 0));
    if (!(d->length_mm > 0))
        return dk_error_set(err, DK_EINVAL, "an acceptance needs the "
                                            "crystal length (--length)");
    double lo, hi;
    pair_domain(d, p, &lo, &hi);
    pair_probe pr;
    pair_probe_init(&pr, d, p);
    double step = 1e-5 * C_UM_THZ / d->waves.pump_um;
    dk_status s = dk_acceptance_fwhm(pair_dk, &pr, 0, d->length_mm * 1e3,
                                     step, lo, hi, acc, err);
    if (s || !lobes)
        return s;
    return dk_acceptance_lobes_scan(pair_dk, &pr, d->length_mm * 1e3, lo, hi,
                                    LOBE_SAMPLES, acc, lobes, err);
}

/* ln((f + need) / need) for a width f − need; a vanishing width counts
 * as far below (−50). */
static double
log_ratio(double f, double need)
{
    double w = f + need;
    return w > 0 ? log(w / need) : -50;
}

dk_status
dk_design_longest_crystal(dk_design *d, dk_pair p, double fwhm_fs,
                          dk_pulse_shape s, double *length_mm, dk_error *err)
{
    if (!(fwhm_fs > 0) || !isfinite(fwhm_fs))
        return dk_error_set(err, DK_EINVAL, "the pulse duration must be "
                                            "positive, e.g. 30fs");
    if (!dk_pair_applies(d, p))
        return dk_error_set(err, DK_EINVAL, "the pair does not apply");
    const double need = dk_pulse_bandwidth_thz(fwhm_fs, s);
    const double keep = d->length_mm;
    dk_acceptance a;
    dk_status st;
    /* width(L) − need: positive for short crystals. */
#define WIDTH_AT(L, out)                                                     \
    do {                                                                     \
        d->length_mm = (L);                                                  \
        st = dk_design_pair_acceptance(d, p, &a, NULL, err);                 \
        if (st)                                                              \
            goto done;                                                       \
        (out) = (a.fwhm) - need;                                             \
    } while (0)
    double flo, fhi;
    WIDTH_AT(L_MIN_MM, flo);
    if (flo < 0) {
        st = dk_error_set(err, DK_ENOROOT,
                          "even a %g um crystal does not support %g fs "
                          "along the %s pair",
                          L_MIN_MM * 1e3, fwhm_fs, dk_pair_str(p, d->shg));
        goto done;
    }
    WIDTH_AT(L_MAX_MM, fhi);
    if (fhi >= 0) {
        *length_mm = INFINITY;
        goto done;
    }
    /* g(ln L) = ln(width / need) is close to linear in ln L (slope −1
     * where the pair's GVM rules, −½ where it is group-velocity matched):
     * regula falsi with the Illinois step on the bracket [ln L_MIN,
     * ln L_MAX] closes it to 1e-7 in a few widths where bisection took
     * 27 (each width is a whole acceptance search). */
    double la = log(L_MIN_MM), lb = log(L_MAX_MM);
    double ga = log1p(flo / need), gb = log_ratio(fhi, need);
    int kept = 0;   /* which end stayed last: −1 la, +1 lb */
    for (int i = 0; i < 100 && lb - la > 1e-7; i++) {
        double c = (la * gb - lb * ga) / (gb - ga);
        if (!(c > la && c < lb))
            c = 0.5 * (la + lb);
        double fc;
        WIDTH_AT(exp(c), fc);
        double gc = log_ratio(fc, need);
        if (gc >= 0) {
            la = c, ga = gc;
            if (kept == 1)
                gb *= 0.5;
            kept = 1;
        } else {
            lb = c, gb = gc;
            if (kept == -1)
                ga *= 0.5;
            kept = -1;
        }
        /* an end that does not move for long: bisect once */
        if (i % 8 == 7) {
            double m = 0.5 * (la + lb), fm;
            WIDTH_AT(exp(m), fm);
            double gm = log_ratio(fm, need);
            if (gm >= 0)
                la = m, ga = gm;
            else
                lb = m, gb = gm;
            kept = 0;
        }
    }
    *length_mm = exp(0.5 * (la + lb));
#undef WIDTH_AT
done:
    d->length_mm = keep;
    return st;
}

dk_status
dk_design_pulse_limit(dk_design *d, double fwhm_fs, dk_pulse_shape s,
                      double *length_mm, int *pair, dk_error *err)
{
    *length_mm = INFINITY;
    *pair = -1;
    for (int q = 0; q < DK_NPAIRS; q++) {
        if (!dk_pair_applies(d, (dk_pair)q))
            continue;
        double L;
        dk_status st = dk_design_longest_crystal(d, (dk_pair)q, fwhm_fs, s,
                                                 &L, err);
        if (st == DK_ENOROOT)
            L = 0;
        else if (st)
            return st;
        if (L < *length_mm)
            *length_mm = L, *pair = q;
    }
    return DK_OK;
}

double
dk_low_conversion_merit(double deff_pm_per_v, double length_mm,
                        const double n[3])
{
    return pow(deff_pm_per_v * length_mm, 2) / (n[0] * n[1] * n[2]);
}

/* Spectral field amplitude of a transform-limited pulse (intensity FWHM
 * τ) at detuning Ω (rad/fs): Gaussian exp(−Ω²τ²/(8 ln2)); sech²: the
 * field sech(t/T), T = τ/(2 acosh √2), has the spectrum sech(πΩT/2). */
static double
amplitude(double om, double tau, dk_pulse_shape s)
{
    if (s == DK_SHAPE_SECH2) {
        double t = tau / (2 * acosh(M_SQRT2));
        return 1 / cosh(M_PI * om * t / 2);
    }
    return exp(-om * om * tau * tau / (8 * M_LN2));
}

/* Half-width (rad/fs) beyond which the amplitude is below 1e-6 (the
 * intensity below 1e-12 of its peak). */
static double
half_band(double tau, dk_pulse_shape s)
{
    if (s == DK_SHAPE_SECH2) {
        double t = tau / (2 * acosh(M_SQRT2));
        return 2 * acosh(1e6) / (M_PI * t);
    }
    return sqrt(8 * M_LN2 * log(1e6)) / tau;
}

dk_status
dk_design_dispersed(dk_design *d, int wave, double fwhm_fs,
                    dk_pulse_shape s, double length_mm, dk_dispersed *out,
                    dk_error *err)
{
    if (!(fwhm_fs > 0) || !isfinite(fwhm_fs) || !(length_mm > 0) ||
        !isfinite(length_mm) || wave < 0 || wave > 2)
        return dk_error_set(err, DK_EINVAL,
                            "bad duration, length or wave for the "
                            "dispersed pulse");
    dk_design_wave_k wk[3];
    dk_status st = dk_design_sim_modes(d, wk, err);
    if (st)
        return st;
    const double lam[3] = {d->waves.signal_um, d->waves.idler_um,
                           d->waves.pump_um};
    const double w0 = 2 * M_PI * DK_C_UM_PER_FS / lam[wave];
    const double W = half_band(fwhm_fs, s);
    if (!(W < 0.95 * w0))
        return dk_error_set(err, DK_ERANGE, "a %g fs pulse at %g um is "
                                            "shorter than a cycle",
                            fwhm_fs, lam[wave]);
    /* Carrier derivatives by central differences of k. */
    double h = 1e-3 * W, om3[3] = {w0 - h, w0, w0 + h}, k3[3];
    if ((st = dk_design_wave_k_fn(&wk[wave], om3, 3, k3, err)))
        return st;
    if (!isfinite(k3[0]) || !isfinite(k3[1]) || !isfinite(k3[2]))
        return dk_error_set(err, DK_ERANGE, "%g um is outside the data of "
                                            "the crystal",
                            lam[wave]);
    double k1 = (k3[2] - k3[0]) / (2 * h);                 /* fs/µm */
    double k2 = (k3[2] - 2 * k3[1] + k3[0]) / (h * h);     /* fs²/µm */
    const double Lum = length_mm * 1e3;
    out->fwhm_in_fs = fwhm_fs;
    out->gdd_fs2 = k2 * Lum;
    out->group_delay_fs = k1 * Lum;
    out->gdd_only_fs =
        s == DK_SHAPE_GAUSSIAN
            ? fwhm_fs * sqrt(1 + pow(4 * M_LN2 * out->gdd_fs2 /
                                         (fwhm_fs * fwhm_fs), 2))
            : NAN;
    /* Spectral grid: the window must hold the dispersed pulse; estimate
     * its spread from the GDD and grow M until the FWHM is resolved. */
    double spread = fabs(out->gdd_fs2) * 2 * W + 4 * fwhm_fs;
    size_t M = 1024;
    while (M < (1u << 16) && 2 * M_PI * (M - 1) / (2 * W) < 3 * spread)
        M *= 2;
    double *om = malloc(M * sizeof *om), *kk = malloc(M * sizeof *kk);
    double complex *A = malloc(M * sizeof *A);
    size_t NT = 4096;
    double *y = malloc(NT * sizeof *y);
    if (!om || !kk || !A || !y) {
        st = dk_error_set(err, DK_ENOMEM, "out of memory");
        goto done;
    }
    double dOm = 2 * W / (M - 1);
    for (size_t i = 0; i < M; i++)
        om[i] = w0 - W + dOm * i;
    if ((st = dk_design_wave_k_fn(&wk[wave], om, M, kk, err)))
        goto done;
    for (size_t i = 0; i < M; i++) {
        double a = amplitude(om[i] - w0, fwhm_fs, s);
        if (!isfinite(kk[i])) {
            if (a > 1e-4) {
                st = dk_error_set(err, DK_ERANGE,
                                  "the band of a %g fs pulse at %g um "
                                  "leaves the crystal's transparency",
                                  fwhm_fs, lam[wave]);
                goto done;
            }
            A[i] = 0;
            continue;
        }
        double ph = (kk[i] - k3[1] - k1 * (om[i] - w0)) * Lum;
        A[i] = a * cexp(I * ph);
    }
    /* Times: the window of the spectral grid, 2π/dΩ, centred. */
    double Tw = 2 * M_PI / dOm, dt = Tw / NT;
    for (size_t j = 0; j < NT; j++) {
        double t = -0.5 * Tw + dt * j;
        double complex step = cexp(-I * dOm * t), ph = cexp(-I * (-W) * t);
        double complex sum = 0;
        for (size_t i = 0; i < M; i++) {
            sum += A[i] * ph;
            ph *= step;
        }
        y[j] = creal(sum) * creal(sum) + cimag(sum) * cimag(sum);
    }
    out->fwhm_out_fs = dk_samples_fwhm(y, NT, dt);
    if (!isfinite(out->fwhm_out_fs))
        st = dk_error_set(err, DK_ERANGE, "the dispersed pulse was not "
                                          "resolved");
done:
    free(om), free(kk), free(A), free(y);
    return st;
}
