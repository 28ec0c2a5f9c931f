/*
 * simulate_diag.c - what a pulsed three-wave-mixing run reports: spectra
 * and temporal intensities at the entrance and the exit, fluences and
 * photon numbers, durations and transform limits, the band holding the
 * energy, edge fractions and warnings (deltak/simulate.h).
 *
 * Spectral density. With ã_k = (1/n) Σ_τ a(τ) e^{iΩ_k τ} (the state after
 * the last linear step), Parseval gives F = dt Σ_τ |a|² = n dt Σ_k |ã_k|²;
 * per bin of width 1/(n dt) in frequency the density is (n dt)² |ã_k|².
 * Photon numbers are Σ_k F_k / ħω_k over the bins (exact for the spectrum,
 * not a carrier estimate). Durations are full widths at half maximum
 * between the outermost half-maximum crossings, interpolated linearly
 * (common practice for pulses with structure); the transform limit is that
 * width for the same spectrum with a flat phase.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analyses/simulate_internal.h"

#define HBAR_J_S 1.054571817e-34
#define EDGE_WARN 1e-6
#define ABSORB_WARN 1e-6
#define BROAD_WARN 0.25        /* band edge beyond ±25 % of the carrier */
#define BAND_TAIL 5e-4         /* each side: the band holds 99.9 % */
#define PHASE_FLOOR 1e-12      /* spectral phase shown above this × peak */
#define PER_FS_TO_THZ 1e3
#define REFINE_BELOW 32        /* samples across a FWHM */

/* The abscissa (in samples) in [i − 1, i] where y crosses @half, from
 * the cubic through samples i − 2 … i + 1 (linear at the array's ends);
 * y[i − 1] < half ≤ y[i] or the reverse. */
static double
crossing(const double *y, size_t n, size_t i, double half)
{
    double lin = (double)(i - 1) + (half - y[i - 1]) / (y[i] - y[i - 1]);
    if (i < 2 || i + 1 >= n)
        return lin;
    const double *p = y + i - 2; /* nodes at −1, 0, 1, 2 relative to i − 1 */
    double a = i - 1.0, lo = 0, hi = 1;
    double flo = p[1] - half;
    for (int it = 0; it < 60; it++) {
        double t = 0.5 * (lo + hi);
        double v = -p[0] * t * (t - 1) * (t - 2) / 6 +
                   p[1] * (t + 1) * (t - 1) * (t - 2) / 2 -
                   p[2] * (t + 1) * t * (t - 2) / 2 +
                   p[3] * (t + 1) * t * (t - 1) / 6 - half;
        if ((v < 0) == (flo < 0))
            lo = t;
        else
            hi = t;
    }
    return a + 0.5 * (lo + hi);
}

/* FWHM of y on a uniform axis of spacing dx, between the outermost
 * half-maximum crossings; NAN when y has no peak or does not fall to half
 * of it inside the array. */
static double
fwhm(const double *y, size_t n, double dx)
{
    size_t im = 0;
    for (size_t i = 1; i < n; i++)
        if (y[i] > y[im])
            im = i;
    double half = 0.5 * y[im];
    if (!(half > 0))
        return NAN;
    size_t lo = 0, hi = n - 1;
    while (y[lo] < half)
        lo++;
    while (y[hi] < half)
        hi--;
    if (lo == 0 || hi == n - 1)
        return NAN;
    double xl = crossing(y, n, lo, half);
    double xr = crossing(y, n, hi + 1, half);
    return (xr - xl) * dx;
}

/* a(t) = Σ_k spec_k e^{−iΩ_k t} at any t (band-limited interpolation of
 * the sampled field), Ω_k = k dΩ in FFT order; phasors by recurrence. */
static double
intensity_at(const double complex *spec, size_t n, double dom, double t)
{
    const double *x = (const double *)spec;
    double zr = cos(dom * t), zi = -sin(dom * t);
    double sr = 0, si = 0, pr = 1, pi = 0;
    for (size_t k = 0; k < n; k++) {
        if (k == n / 2) {
            double ph = 0.5 * (double)n * dom * t;
            pr = cos(ph), pi = sin(ph);
        }
        sr += x[2 * k] * pr - x[2 * k + 1] * pi;
        si += x[2 * k] * pi + x[2 * k + 1] * pr;
        double qr = pr * zr - pi * zi;
        pi = pr * zi + pi * zr;
        pr = qr;
    }
    return sr * sr + si * si;
}

/* Refine the FWHM of a pulse sampled too coarsely for interpolation
 * (fewer than REFINE_BELOW samples across): the peak by golden-section
 * search and each half-maximum crossing by the secant method, on the
 * exact band-limited intensity. @y is |a|² in ascending time, @spec the
 * spectrum of a in FFT order (a(τ) = Σ ã e^{−iΩτ}). */
static double
fwhm_refined(const double *y, size_t n, double dt, const double complex *spec)
{
    double w = fwhm(y, n, dt);
    if (!isfinite(w) || w >= REFINE_BELOW * dt)
        return w;
    double dom = 2 * M_PI / (n * dt);
    size_t im = 0;
    for (size_t i = 1; i < n; i++)
        if (y[i] > y[im])
            im = i;
    /* the peak */
    const double g = 0.5 * (sqrt(5.0) - 1);
    double t0 = ((double)im - (double)(n / 2)) * dt;
    double a = t0 - dt, b = t0 + dt;
    double c = b - g * (b - a), d = a + g * (b - a);
    double fc = intensity_at(spec, n, dom, c), fd = intensity_at(spec, n, dom, d);
    for (int it = 0; it < 40; it++) {
        if (fc > fd) {
            b = d, d = c, fd = fc;
            c = b - g * (b - a);
            fc = intensity_at(spec, n, dom, c);
        } else {
            a = c, c = d, fc = fd;
            d = a + g * (b - a);
            fd = intensity_at(spec, n, dom, d);
        }
    }
    double half = 0.5 * fmax(fmax(fc, fd), y[im]);
    /* the crossings, from the sampled estimate */
    size_t lo = 0, hi = n - 1;
    while (y[lo] < half)
        lo++;
    while (y[hi] < half)
        hi--;
    if (lo == 0 || hi == n - 1)
        return w;
    double edge[2] = {crossing(y, n, lo, half), crossing(y, n, hi + 1, half)};
    for (int e = 0; e < 2; e++) {
        double x0 = (edge[e] - (double)(n / 2)) * dt, x1 = x0 + 0.01 * dt;
        double f0 = intensity_at(spec, n, dom, x0) - half;
        double f1 = intensity_at(spec, n, dom, x1) - half;
        for (int it = 0; it < 8 && f1 != f0; it++) {
            double x2 = x1 - f1 * (x1 - x0) / (f1 - f0);
            x0 = x1, f0 = f1;
            x1 = x2;
            f1 = intensity_at(spec, n, dom, x1) - half;
            if (fabs(x1 - x0) < 1e-9 * dt)
                break;
        }
        if (fabs(x1 / dt + (double)(n / 2) - edge[e]) < 1.5)
            edge[e] = x1 / dt + (double)(n / 2);
    }
    return (edge[1] - edge[0]) * dt;
}

static double
norm2(double complex v)
{
    return creal(v) * creal(v) + cimag(v) * cimag(v);
}

/* Frequency bins (ascending) of the lower and upper BAND_TAIL quantiles. */
static void
quantiles(const double *S, size_t n, size_t *lo, size_t *hi)
{
    double total = 0, acc = 0;
    for (size_t i = 0; i < n; i++)
        total += S[i];
    *lo = 0;
    *hi = n - 1;
    for (size_t i = 0; i < n; i++) {
        acc += S[i];
        if (acc >= BAND_TAIL * total) {
            *lo = i;
            break;
        }
    }
    acc = 0;
    for (size_t i = n; i-- > 0;) {
        acc += S[i];
        if (acc >= BAND_TAIL * total) {
            *hi = i;
            break;
        }
    }
}

/* The spectrum (ascending) of the FFT-ordered spectra in @spec (already
 * normalised by 1/n) of stored wave @j into @S (J/cm² per THz), and the
 * transform-limited temporal intensity into s->scratch is done by the
 * caller. Returns the photon number per cm². */
static double
fill_spectrum(const dk_sim *s, int j, const double complex *spec, double *S)
{
    size_t n = s->n;
    double nd = n * s->dt, dnu = PER_FS_TO_THZ / nd, photons = 0;
    for (size_t i = 0; i < n; i++) {
        size_t k = (i + n / 2) % n;
        S[i] = nd * nd * norm2(spec[k]) / PER_FS_TO_THZ *
               SIM_FLUENCE_TO_J_PER_CM2;
        double om = s->omega0[j] + s->omega[k];
        if (om > 0)
            photons += S[i] * dnu / (HBAR_J_S * om * 1e15);
    }
    return photons;
}

/* Transform-limited FWHM of the spectra of every stored wave in @spec
 * (normalised, FFT order), through s->scratch. */
static void
transform_limits(dk_sim *s, const double complex *spec, double *out)
{
    size_t n = s->n;
    for (size_t i = 0; i < (size_t)s->nw * n; i++)
        s->scratch[i] = cabs(spec[i]);
    fftw_execute_dft(s->to_time, s->scratch, s->scratch);
    double *y = malloc(n * sizeof(double));
    double complex *a2 = fftw_alloc_complex(n);
    for (int j = 0; j < s->nw; j++) {
        out[j] = NAN;
        if (!y || !a2)
            continue;
        const double complex *a = s->scratch + (size_t)j * n;
        for (size_t i = 0; i < n; i++)
            y[i] = norm2(a[(i + n / 2) % n]);
        for (size_t i = 0; i < n; i++)
            a2[i] = cabs(spec[(size_t)j * n + i]);
        out[j] = fwhm_refined(y, n, s->dt, a2);
    }
    free(y);
    fftw_free(a2);
}

dk_status
sim_fill_result(dk_sim *s, dk_sim_result *r, dk_error *err)
{
    size_t n = s->n, nz = s->nrec, nw = (size_t)s->nw;
    size_t total = n + nz + nw * nz + nw * 7 * n;
    double *pool = calloc(total, sizeof(double));
    if (!pool)
        return dk_error_set(err, DK_ENOMEM, "out of memory for the result");
    r->time_fs = pool;
    pool += n;
    r->z_mm = pool;
    pool += nz;
    r->degenerate = s->nw == 2;
    r->samples = n;
    r->dt_fs = s->dt;
    r->window_fs = n * s->dt;
    r->frame_fs_per_mm = s->tau_ref * 1e3;
    r->delta_k_rad_per_um = s->dk0;
    r->qpm_period_um = s->period_um;
    r->deff_first_order_pm_per_v = s->deff_first_order;
    r->step_um = s->h_max_used;
    r->steps = s->steps;
    r->manley_rowe_defect = s->mr_defect;
    r->nz = nz;
    for (size_t i = 0; i < n; i++)
        r->time_fs[i] = ((double)i - (double)(n / 2)) * s->dt;
    size_t cap = (size_t)s->record_max + 2;
    for (size_t q = 0; q < nz; q++)
        r->z_mm[q] = s->rec_z[q] * 1e-3;
    for (int j = 0; j < s->nw; j++) {
        double *f = pool;
        pool += nz;
        for (size_t q = 0; q < nz; q++)
            f[q] = s->rec_f[(size_t)j * cap + q] * SIM_FLUENCE_TO_J_PER_CM2;
        r->fluence_j_per_cm2[s->role[j]] = f;
    }

    /* Exit: spectra (s->field), then the temporal fields. */
    double tl_out[3], tl_in[3], ph_out[3], ph_in[3];
    transform_limits(s, s->field, tl_out);
    double in_total = 0, absorbed = 0;
    for (int j = 0; j < s->nw; j++) {
        dk_sim_wave_out *w = &r->wave[s->role[j]];
        w->intensity_in_gw_per_cm2 = pool;
        w->intensity_out_gw_per_cm2 = pool + n;
        w->phase_out_rad = pool + 2 * n;
        w->frequency_thz = pool + 3 * n;
        w->spectrum_in_j_per_cm2_thz = pool + 4 * n;
        w->spectrum_out_j_per_cm2_thz = pool + 5 * n;
        w->spectral_phase_out_rad = pool + 6 * n;
        pool += 7 * n;
        const double complex *spec = s->field + (size_t)j * n;
        ph_out[j] = fill_spectrum(s, j, spec, w->spectrum_out_j_per_cm2_thz);
        double smax = 0;
        for (size_t i = 0; i < n; i++)
            smax = fmax(smax, w->spectrum_out_j_per_cm2_thz[i]);
        for (size_t i = 0; i < n; i++) {
            size_t k = (i + n / 2) % n;
            w->frequency_thz[i] = (s->omega0[j] + s->omega[k]) / (2 * M_PI) *
                                  PER_FS_TO_THZ;
            w->spectral_phase_out_rad[i] =
                w->spectrum_out_j_per_cm2_thz[i] > PHASE_FLOOR * smax
                    ? carg(spec[k])
                    : 0;
        }
        in_total += s->fluence_in[j];
        absorbed += s->absorbed[j];
    }
    memcpy(s->scratch, s->field, nw * n * sizeof(double complex));
    fftw_execute_dft(s->to_time, s->scratch, s->scratch);
    for (int j = 0; j < s->nw; j++) {
        dk_sim_wave_out *w = &r->wave[s->role[j]];
        const double complex *a = s->scratch + (size_t)j * n;
        for (size_t i = 0; i < n; i++) {
            size_t k = (i + n / 2) % n;
            w->intensity_out_gw_per_cm2[i] = norm2(a[k]);
            w->phase_out_rad[i] = norm2(a[k]) > 0 ? carg(a[k]) : 0;
        }
    }
    /* Entrance: the input fields, their spectra. */
    memcpy(s->scratch, s->input, nw * n * sizeof(double complex));
    fftw_execute_dft(s->to_freq, s->scratch, s->scratch);
    for (size_t i = 0; i < nw * n; i++)
        s->scratch[i] /= (double)n;
    for (int j = 0; j < s->nw; j++) {
        dk_sim_wave_out *w = &r->wave[s->role[j]];
        ph_in[j] = fill_spectrum(s, j, s->scratch + (size_t)j * n,
                                 w->spectrum_in_j_per_cm2_thz);
        const double complex *a = s->input + (size_t)j * n;
        for (size_t i = 0; i < n; i++)
            w->intensity_in_gw_per_cm2[i] = norm2(a[(i + n / 2) % n]);
    }
    double complex *spec_in = fftw_alloc_complex(nw * n);
    if (!spec_in)
        return dk_error_set(err, DK_ENOMEM, "out of memory for the result");
    memcpy(spec_in, s->scratch, nw * n * sizeof(double complex));
    transform_limits(s, spec_in, tl_in);

    /* Scalars. */
    double nu_step = PER_FS_TO_THZ / (n * s->dt), nyq = M_PI / s->dt;
    for (int j = 0; j < s->nw; j++) {
        dk_sim_wave_out *w = &r->wave[s->role[j]];
        w->present = 1;
        w->lambda_um = s->lambda0[j];
        w->omega_rad_per_fs = s->omega0[j];
        w->n = s->n0[j];
        w->group_delay_fs_per_mm = s->tau_g[j] * 1e3;
        w->gvd_fs2_per_mm = s->beta2[j] * 1e3;
        w->fluence_in_j_per_cm2 = s->fluence_in[j] * SIM_FLUENCE_TO_J_PER_CM2;
        w->fluence_out_j_per_cm2 =
            s->fluence_out[j] * SIM_FLUENCE_TO_J_PER_CM2;
        w->energy_in_j = s->area_cm2 > 0
                             ? w->fluence_in_j_per_cm2 * s->area_cm2
                             : NAN;
        w->energy_out_j = s->area_cm2 > 0
                              ? w->fluence_out_j_per_cm2 * s->area_cm2
                              : NAN;
        w->photons_in_per_cm2 = ph_in[j];
        w->photons_out_per_cm2 = ph_out[j];
        w->absorbed_j_per_cm2 = s->absorbed[j] * SIM_FLUENCE_TO_J_PER_CM2;
        double pin = 0, pout = 0, edge = 0, all = 0, sedge = 0, sall = 0;
        for (size_t i = 0; i < n; i++) {
            pin = fmax(pin, w->intensity_in_gw_per_cm2[i]);
            double y = w->intensity_out_gw_per_cm2[i];
            pout = fmax(pout, y);
            all += y;
            if (fabs(r->time_fs[i]) > 0.375 * r->window_fs)
                edge += y;
            double S = w->spectrum_out_j_per_cm2_thz[i];
            sall += S;
            if (fabs(s->omega[(i + n / 2) % n]) > 0.75 * nyq)
                sedge += S;
        }
        w->peak_in_gw_per_cm2 = pin;
        w->peak_out_gw_per_cm2 = pout;
        w->edge_fraction = all > 0 ? edge / all : 0;
        w->spectral_edge_fraction = sall > 0 ? sedge / sall : 0;
        if (w->edge_fraction > EDGE_WARN && !s->cw_like[j])
            r->warnings |= DK_SIM_WARN_TIME_EDGE;
        if (w->spectral_edge_fraction > EDGE_WARN)
            r->warnings |= DK_SIM_WARN_SPECTRAL_EDGE;
        w->fwhm_in_fs = fwhm_refined(w->intensity_in_gw_per_cm2, n, s->dt,
                                     spec_in + (size_t)j * n);
        w->fwhm_out_fs = fwhm_refined(w->intensity_out_gw_per_cm2, n, s->dt,
                                      s->field + (size_t)j * n);
        w->transform_limit_in_fs = tl_in[j];
        w->transform_limit_out_fs = tl_out[j];
        w->spectral_fwhm_in_thz =
            fwhm(w->spectrum_in_j_per_cm2_thz, n, nu_step);
        w->spectral_fwhm_out_thz =
            fwhm(w->spectrum_out_j_per_cm2_thz, n, nu_step);
        /* The band holding the energy, in and out. */
        double nu_lo = INFINITY, nu_hi = -INFINITY;
        const double *S2[2] = {w->spectrum_in_j_per_cm2_thz,
                               w->spectrum_out_j_per_cm2_thz};
        for (int t = 0; t < 2; t++) {
            double sum = 0;
            for (size_t i = 0; i < n; i++)
                sum += S2[t][i];
            if (!(sum > 0))
                continue;
            size_t lo, hi;
            quantiles(S2[t], n, &lo, &hi);
            nu_lo = fmin(nu_lo, w->frequency_thz[lo]);
            nu_hi = fmax(nu_hi, w->frequency_thz[hi]);
        }
        const double c_um_thz = SIM_C_UM_PER_FS * PER_FS_TO_THZ;
        if (nu_hi > 0 && nu_lo > 0) {
            w->band_um[0] = c_um_thz / nu_hi;
            w->band_um[1] = c_um_thz / nu_lo;
            double nu0 = s->omega0[j] / (2 * M_PI) * PER_FS_TO_THZ;
            if (nu_hi - nu0 > BROAD_WARN * nu0 ||
                nu0 - nu_lo > BROAD_WARN * nu0)
                r->warnings |= DK_SIM_WARN_BROADBAND;
        } else {
            w->band_um[0] = w->band_um[1] = NAN;
        }
    }
    fftw_free(spec_in);
    if (absorbed > ABSORB_WARN * in_total)
        r->warnings |= DK_SIM_WARN_ABSORBED;
    for (int j = 0; j < 3; j++)
        if (!r->wave[j].present) {
            r->wave[j].fwhm_in_fs = r->wave[j].fwhm_out_fs = NAN;
            r->wave[j].band_um[0] = r->wave[j].band_um[1] = NAN;
        }
    return DK_OK;
}
