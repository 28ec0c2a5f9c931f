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
 * between the outermost half-maximum crossings (samples_fwhm.c; common
 * practice for pulses with structure); the transform limit is that
 * width for the same spectrum with a flat phase.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analyses/samples_fwhm.h"
#include "analyses/sim_state.h"

#define EDGE_WARN 1e-6
#define ABSORB_WARN 1e-6
#define BROAD_WARN 0.25        /* band edge beyond ±25 % of the carrier */
#define BAND_TAIL 5e-4         /* each side: the band holds 99.9 % */
#define PHASE_FLOOR 1e-12      /* spectral phase shown above this × peak */
#define PER_FS_TO_THZ 1e3
#define REFINE_BELOW 32        /* samples across a FWHM */

/* |Σ_k c_k e^{i σ m_k u x}|², m_k = k or k − n (FFT order): the band-
 * limited interpolation of sampled data between its samples. With the
 * spectrum as c, u = dΩ and σ = −1 it is the field's intensity at time x;
 * with the time samples, u = dt and σ = +1, the spectrum at frequency x
 * (up to a constant factor). Phasors by recurrence. */
static double
power_at(const double complex *c, size_t n, double u, double x, int sigma)
{
    const double *v = (const double *)c;
    double a = sigma * u * x;
    double zr = cos(a), zi = sin(a);
    double sr = 0, si = 0, pr = 1, pi = 0;
    for (size_t k = 0; k < n; k++) {
        if (k == n / 2) {
            double ph = -0.5 * (double)n * a;
            pr = cos(ph), pi = sin(ph);
        }
        sr += v[2 * k] * pr - v[2 * k + 1] * pi;
        si += v[2 * k] * pi + v[2 * k + 1] * pr;
        double qr = pr * zr - pi * zi;
        pi = pr * zi + pi * zr;
        pr = qr;
    }
    return sr * sr + si * si;
}

/* The FWHM of y (samples at x = (i − n/2) dx), refined when fewer than
 * REFINE_BELOW samples lie across it: the peak by golden-section search
 * and each half-maximum crossing by the secant method on the band-limited
 * interpolation power_at(c, n, u, x, σ), scaled to y at the top sample. */
static double
fwhm_refined(const double *y, size_t n, double dx, const double complex *c,
             double u, int sigma)
{
    double w = dk_samples_fwhm(y, n, dx);
    if (!isfinite(w) || w >= REFINE_BELOW * dx)
        return w;
    size_t im = 0;
    for (size_t i = 1; i < n; i++)
        if (y[i] > y[im])
            im = i;
    double x0 = ((double)im - (double)(n / 2)) * dx;
    double p0 = power_at(c, n, u, x0, sigma);
    if (!(p0 > 0))
        return w;
    double scale = y[im] / p0;
#define AT(x) (scale * power_at(c, n, u, (x), sigma))
    const double g = 0.5 * (sqrt(5.0) - 1);
    double a = x0 - dx, b = x0 + dx;
    double xc = b - g * (b - a), xd = a + g * (b - a);
    double fc = AT(xc), fd = AT(xd);
    for (int it = 0; it < 40; it++) {
        if (fc > fd) {
            b = xd, xd = xc, fd = fc;
            xc = b - g * (b - a);
            fc = AT(xc);
        } else {
            a = xc, xc = xd, fc = fd;
            xd = a + g * (b - a);
            fd = AT(xd);
        }
    }
    double half = 0.5 * fmax(fmax(fc, fd), y[im]);
    size_t lo = 0, hi = n - 1;
    while (y[lo] < half)
        lo++;
    while (y[hi] < half)
        hi--;
    if (lo == 0 || hi == n - 1)
        return w;
    double edge[2] = {dk_samples_crossing(y, n, lo, half),
                       dk_samples_crossing(y, n, hi + 1, half)};
    for (int e = 0; e < 2; e++) {
        double s0 = (edge[e] - (double)(n / 2)) * dx, s1 = s0 + 0.01 * dx;
        double f0 = AT(s0) - half, f1 = AT(s1) - half;
        for (int it = 0; it < 8 && f1 != f0; it++) {
            double s2 = s1 - f1 * (s1 - s0) / (f1 - f0);
            s0 = s1, f0 = f1;
            s1 = s2;
            f1 = AT(s1) - half;
            if (fabs(s1 - s0) < 1e-9 * dx)
                break;
        }
        double idx = s1 / dx + (double)(n / 2);
        if (fabs(idx - edge[e]) < 1.5)
            edge[e] = idx;
    }
#undef AT
    return (edge[1] - edge[0]) * dx;
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

/* The spectrum of stored wave @j, @spec in FFT order and normalised by
 * 1/n, into @S (ascending, J/cm² per THz). Returns its photon number per
 * cm². */
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
            photons += S[i] * dnu / (DK_HBAR_J_S * om * 1e15);
    }
    return photons;
}

/* Transform-limited FWHM of each stored wave with the spectra @spec
 * (normalised, FFT order): |spec| back to time through s->scratch, the
 * magnitudes kept for the refinement. */
static void
transform_limits(dk_sim *s, const double complex *spec, double *out)
{
    size_t n = s->n, total = (size_t)s->nw * n;
    for (int j = 0; j < s->nw; j++)
        out[j] = NAN;
    double complex *mag = fftw_alloc_complex(total);
    double *y = malloc(n * sizeof(double));
    if (mag && y) {
        for (size_t i = 0; i < total; i++)
            mag[i] = s->scratch[i] = cabs(spec[i]);
        fftw_execute_dft(s->to_time, s->scratch, s->scratch);
        double dom = 2 * M_PI / (n * s->dt);
        for (int j = 0; j < s->nw; j++) {
            const double complex *a = s->scratch + (size_t)j * n;
            for (size_t i = 0; i < n; i++)
                y[i] = norm2(a[(i + n / 2) % n]);
            out[j] = fwhm_refined(y, n, s->dt, mag + (size_t)j * n, dom, -1);
        }
    }
    fftw_free(mag);
    free(y);
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

    /* Fields: exit spectra (s->field) and times, entrance times
     * (s->input) and spectra. */
    size_t cells = nw * n;
    double complex *t_out = fftw_alloc_complex(cells);
    double complex *f_in = fftw_alloc_complex(cells);
    if (!t_out || !f_in) {
        fftw_free(t_out);
        fftw_free(f_in);
        return dk_error_set(err, DK_ENOMEM, "out of memory for the result");
    }
    memcpy(t_out, s->field, cells * sizeof(double complex));
    fftw_execute_dft(s->to_time, t_out, t_out);
    memcpy(f_in, s->input, cells * sizeof(double complex));
    fftw_execute_dft(s->to_freq, f_in, f_in);
    for (size_t i = 0; i < cells; i++)
        f_in[i] /= (double)n;
    double tl_out[3], tl_in[3], ph_out[3], ph_in[3];
    transform_limits(s, s->field, tl_out);
    transform_limits(s, f_in, tl_in);
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
        const double complex *a_out = t_out + (size_t)j * n;
        const double complex *a_in = s->input + (size_t)j * n;
        ph_out[j] = fill_spectrum(s, j, spec, w->spectrum_out_j_per_cm2_thz);
        ph_in[j] = fill_spectrum(s, j, f_in + (size_t)j * n,
                                 w->spectrum_in_j_per_cm2_thz);
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
            w->intensity_out_gw_per_cm2[i] = norm2(a_out[k]);
            w->phase_out_rad[i] = norm2(a_out[k]) > 0 ? carg(a_out[k]) : 0;
            w->intensity_in_gw_per_cm2[i] = norm2(a_in[k]);
        }
        in_total += s->fluence_in[j];
        absorbed += s->absorbed[j];
    }

    /* Scalars. */
    double nyq = M_PI / s->dt;
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
        double dom = 2 * M_PI / (n * s->dt), to_thz = PER_FS_TO_THZ / (2 * M_PI);
        w->fwhm_in_fs = fwhm_refined(w->intensity_in_gw_per_cm2, n, s->dt,
                                     f_in + (size_t)j * n, dom, -1);
        w->fwhm_out_fs = fwhm_refined(w->intensity_out_gw_per_cm2, n, s->dt,
                                      s->field + (size_t)j * n, dom, -1);
        w->transform_limit_in_fs = tl_in[j];
        w->transform_limit_out_fs = tl_out[j];
        w->spectral_fwhm_in_thz =
            to_thz * fwhm_refined(w->spectrum_in_j_per_cm2_thz, n, dom,
                                  s->input + (size_t)j * n, s->dt, 1);
        w->spectral_fwhm_out_thz =
            to_thz * fwhm_refined(w->spectrum_out_j_per_cm2_thz, n, dom,
                                  t_out + (size_t)j * n, s->dt, 1);
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
        const double c_um_thz = DK_C_UM_PER_FS * PER_FS_TO_THZ;
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
    fftw_free(t_out);
    fftw_free(f_in);
    if (absorbed > ABSORB_WARN * in_total)
        r->warnings |= DK_SIM_WARN_ABSORBED;
    for (int j = 0; j < 3; j++)
        if (!r->wave[j].present) {
            r->wave[j].fwhm_in_fs = r->wave[j].fwhm_out_fs = NAN;
            r->wave[j].band_um[0] = r->wave[j].band_um[1] = NAN;
        }
    return DK_OK;
}
