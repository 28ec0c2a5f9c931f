/*
 * simulate_pulse.c - the input pulses of a pulsed three-wave-mixing
 * simulation on its time grid, and the spectral width and temporal extent
 * each one needs (the grid rule that uses them is in simulate_grid.c;
 * both stated in deltak/simulate.h).
 *
 * Shapes. Gaussian field exp(−2 ln2 t²/τ²) (intensity FWHM τ), sech field
 * sech(t/T0), T0 = τ / (2 acosh √2) = τ / 1.7627 (Diels and Rudolph,
 * Ultrashort Laser Pulse Phenomena, 2nd ed. (2006), table 2.1, from
 * memory), CW a constant. GDD and delay are the spectral phases
 * (GDD/2) Ω² + t0 Ω. A measured spectrum per unit wavelength is turned
 * into one per unit frequency with the Jacobian λ²/2πc; amplitude √S and
 * phase are interpolated linearly in ω, zero outside the data. The amount
 * (fluence, energy over the beam area, or peak intensity) scales the
 * result.
 *
 * Widths (where the intensity falls to 1e-14 of its peak): Gaussian
 * spectrum ±3.5 × 4 ln2/τ, sech² ±19/τ; Gaussian in time ±3.41 τ_c
 * (τ_c the chirped FWHM τ √(1 + (4 ln2 GDD/τ²)²)), sech² ±9.5 τ plus the
 * chirp's spread GDD × band.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analyses/sim_state.h"

#define GAUSS_SPAN 3.5          /* W = 3.5 × 4 ln2/τ */
#define SECH_SPAN 19.0          /* W = 19/τ */
#define GAUSS_EXTENT 3.41       /* intensity 1e-14 at 3.41 FWHM */
#define SECH_EXTENT 9.5         /* the same for sech² */
#define SECH_T0 1.7627471740390860 /* 2 acosh √2 */

static double
time_at(size_t i, size_t n, double dt)
{
    return (i < n / 2 ? (double)i : (double)i - (double)n) * dt;
}

/* A measured spectrum as amplitude and phase on increasing ω. */
typedef struct spec_table {
    size_t n;
    double *omega, *amp, *phase;
} spec_table;

static void
spec_free(spec_table *t)
{
    free(t->omega);
    t->omega = t->amp = t->phase = NULL;
}

static dk_status
spec_table_of(const dk_sim_spectrum *sp, spec_table *t, dk_error *err)
{
    size_t n = sp->n;
    t->n = n;
    t->omega = malloc(3 * n * sizeof(double));
    if (!t->omega)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    t->amp = t->omega + n;
    t->phase = t->omega + 2 * n;
    int rising = sp->wavelength_um[1] > sp->wavelength_um[0];
    for (size_t i = 0; i < n; i++) {
        /* increasing ω is decreasing λ */
        size_t src = rising ? n - 1 - i : i;
        double lam = sp->wavelength_um[src];
        double s = sp->intensity[src];
        if (!sp->per_frequency)
            s *= lam * lam;
        t->omega[i] = 2 * M_PI * DK_C_UM_PER_FS / lam;
        t->amp[i] = sqrt(s);
        t->phase[i] = sp->phase_rad ? sp->phase_rad[src] : 0;
    }
    return DK_OK;
}

/* Linear interpolation of the table at ω; 0 outside. */
static double complex
spec_at(const spec_table *t, double om)
{
    if (!(om >= t->omega[0] && om <= t->omega[t->n - 1]))
        return 0;
    size_t lo = 0, hi = t->n - 1;
    while (hi - lo > 1) {
        size_t mid = (lo + hi) / 2;
        if (t->omega[mid] <= om)
            lo = mid;
        else
            hi = mid;
    }
    double f = (om - t->omega[lo]) / (t->omega[hi] - t->omega[lo]);
    double a = t->amp[lo] + f * (t->amp[hi] - t->amp[lo]);
    double ph = t->phase[lo] + f * (t->phase[hi] - t->phase[lo]);
    return a * cexp(I * ph);
}

/* Half-width of an input's spectrum around its carrier, rad/fs. */
double
sim_input_band(const dk_sim *s, int j, const dk_sim_pulse *in)
{
    switch (in->shape) {
    case DK_SIM_GAUSSIAN:
        return GAUSS_SPAN * 4 * M_LN2 / in->fwhm_fs;
    case DK_SIM_SECH2:
        return SECH_SPAN / in->fwhm_fs;
    case DK_SIM_SPECTRUM: {
        double w = 0;
        for (size_t i = 0; i < in->spectrum.n; i++)
            if (in->spectrum.intensity[i] > 0) {
                double om = 2 * M_PI * DK_C_UM_PER_FS /
                            in->spectrum.wavelength_um[i];
                w = fmax(w, fabs(om - s->omega0[j]));
            }
        return w;
    }
    case DK_SIM_DARK:
    case DK_SIM_CW:
        break;
    }
    return 0;
}

/* Half-extent in time of an input around its centre, fs (0 for CW). */
double
sim_input_extent(const dk_sim_pulse *in, double band)
{
    switch (in->shape) {
    case DK_SIM_GAUSSIAN: {
        double x = 4 * M_LN2 * in->gdd_fs2 / (in->fwhm_fs * in->fwhm_fs);
        return GAUSS_EXTENT * in->fwhm_fs * sqrt(1 + x * x);
    }
    case DK_SIM_SECH2:
        return SECH_EXTENT * in->fwhm_fs + fabs(in->gdd_fs2) * band;
    case DK_SIM_SPECTRUM: {
        /* A first guess; the build-and-check loop enlarges it. */
        const dk_sim_spectrum *sp = &in->spectrum;
        double om0 = 2 * M_PI * DK_C_UM_PER_FS / sp->wavelength_um[0];
        double om1 = 2 * M_PI * DK_C_UM_PER_FS / sp->wavelength_um[sp->n - 1];
        double span = fabs(om1 - om0);
        double gd = 0;
        if (sp->phase_rad)
            for (size_t i = 1; i < sp->n; i++) {
                double a = 2 * M_PI * DK_C_UM_PER_FS / sp->wavelength_um[i];
                double b =
                    2 * M_PI * DK_C_UM_PER_FS / sp->wavelength_um[i - 1];
                gd = fmax(gd, fabs((sp->phase_rad[i] - sp->phase_rad[i - 1]) /
                                   (a - b)));
            }
        return 40 * M_PI / span + gd + fabs(in->gdd_fs2) * band;
    }
    case DK_SIM_DARK:
    case DK_SIM_CW:
        break;
    }
    return 0;
}

/* 1 for an input with a shape in time (not dark, not CW). */
int
sim_pulsed(const dk_sim_pulse *in)
{
    return in->shape != DK_SIM_DARK && in->shape != DK_SIM_CW;
}

/* Build the inputs in s->input (time domain, FFT order) and s->peak_total;
 * report the largest fraction of a pulsed input's energy in the outer
 * eighths of the window (@tedge) and of the spectral window (@sedge). */
dk_status
sim_build_inputs(dk_sim *s, const dk_sim_problem *p, double *tedge,
                 double *sedge, dk_error *err)
{
    size_t n = s->n;
    int nw = s->nw;
    int nn = (int)n;
    fftw_plan fwd = fftw_plan_many_dft(1, &nn, nw, s->input, NULL, 1, nn,
                                       s->input, NULL, 1, nn, FFTW_BACKWARD,
                                       FFTW_ESTIMATE);
    fftw_plan bwd = fftw_plan_many_dft(1, &nn, nw, s->input, NULL, 1, nn,
                                       s->input, NULL, 1, nn, FFTW_FORWARD,
                                       FFTW_ESTIMATE);
    dk_status st = DK_OK;
    if (!fwd || !bwd) {
        st = dk_error_set(err, DK_ENOMEM, "cannot plan an FFT of %zu "
                          "samples", n);
        goto done;
    }
    /* 1. Shapes in time (unchirped, centred). */
    for (int j = 0; j < nw; j++) {
        const dk_sim_pulse *in = &p->wave[s->role[j]].input;
        double complex *a = s->input + (size_t)j * n;
        for (size_t i = 0; i < n; i++) {
            double t = time_at(i, n, s->dt);
            switch (in->shape) {
            case DK_SIM_GAUSSIAN:
                a[i] = exp(-2 * M_LN2 * t * t / (in->fwhm_fs * in->fwhm_fs));
                break;
            case DK_SIM_SECH2:
                a[i] = 1 / cosh(SECH_T0 * t / in->fwhm_fs);
                break;
            case DK_SIM_CW:
                a[i] = 1;
                break;
            case DK_SIM_DARK:
            case DK_SIM_SPECTRUM:
                a[i] = 0;
                break;
            }
        }
    }
    fftw_execute(fwd);
    /* 2. Spectral shapes and phases. */
    *tedge = *sedge = 0;
    for (int j = 0; j < nw && !st; j++) {
        const dk_sim_pulse *in = &p->wave[s->role[j]].input;
        double complex *a = s->input + (size_t)j * n;
        if (in->shape == DK_SIM_SPECTRUM) {
            spec_table t = {0};
            st = spec_table_of(&in->spectrum, &t, err);
            if (st)
                break;
            for (size_t i = 0; i < n; i++)
                a[i] = spec_at(&t, s->omega0[j] + s->omega[i]);
            spec_free(&t);
        }
        if (!sim_pulsed(in))
            continue;
        double all = 0, edge = 0, nyq = M_PI / s->dt;
        for (size_t i = 0; i < n; i++) {
            double o = s->omega[i];
            a[i] *= cexp(I * (0.5 * in->gdd_fs2 * o * o + in->delay_fs * o));
            double e = creal(a[i]) * creal(a[i]) + cimag(a[i]) * cimag(a[i]);
            all += e;
            if (fabs(o) > 0.75 * nyq)
                edge += e;
        }
        if (!(all > 0)) {
            st = dk_error_set(err, DK_EINVAL,
                              "%s: the input spectrum lies outside the "
                              "frequency grid (check its wavelengths against "
                              "the carrier %.6g um)",
                              s->name[j], s->lambda0[j]);
            break;
        }
        *sedge = fmax(*sedge, edge / all);
    }
    if (st)
        goto done;
    fftw_execute(bwd);
    /* 3. The amount. */
    s->peak_total = 0;
    for (int j = 0; j < nw; j++) {
        const dk_sim_pulse *in = &p->wave[s->role[j]].input;
        double complex *a = s->input + (size_t)j * n;
        if (in->shape == DK_SIM_DARK)
            continue;
        double peak = 0;
        for (size_t i = 0; i < n; i++) {
            a[i] /= (double)n;
            double e = creal(a[i]) * creal(a[i]) + cimag(a[i]) * cimag(a[i]);
            peak = fmax(peak, e);
        }
        double f = sim_fluence(a, n, s->dt);
        double scale;
        if (in->peak_gw_per_cm2 > 0)
            scale = in->peak_gw_per_cm2 / peak;
        else if (in->fluence_j_per_cm2 > 0)
            scale = in->fluence_j_per_cm2 / SIM_FLUENCE_TO_J_PER_CM2 / f;
        else
            scale = in->energy_j / p->beam_area_cm2 /
                    SIM_FLUENCE_TO_J_PER_CM2 / f;
        double r = sqrt(scale);
        double edge = 0, all = 0, quarter = 0.375 * n * s->dt;
        for (size_t i = 0; i < n; i++) {
            a[i] *= r;
            double e = creal(a[i]) * creal(a[i]) + cimag(a[i]) * cimag(a[i]);
            all += e;
            if (fabs(time_at(i, n, s->dt)) > quarter)
                edge += e;
        }
        if (sim_pulsed(in))
            *tedge = fmax(*tedge, edge / all);
    }
    for (size_t i = 0; i < n; i++) {
        double e = 0;
        for (int j = 0; j < nw; j++) {
            double complex v = s->input[(size_t)j * n + i];
            e += creal(v) * creal(v) + cimag(v) * cimag(v);
        }
        s->peak_total = fmax(s->peak_total, e);
    }
    for (int j = 0; j < nw; j++)
        if (!isfinite(sim_fluence(s->input + (size_t)j * n, n, s->dt)))
            st = dk_error_set(err, DK_EDOM, "%s: the input pulse is not "
                              "finite", s->name[j]);
done:
    if (fwd)
        fftw_destroy_plan(fwd);
    if (bwd)
        fftw_destroy_plan(bwd);
    return st;
}
