/*
 * simulate_grid.c - the carriers, the time grid, k(ω) over it, the input
 * pulses and the automatic step of a pulsed three-wave-mixing simulation
 * (rules stated in deltak/simulate.h).
 *
 * Carriers. k, dk/dω and d²k/dω² at each carrier come from the caller's
 * k(ω) at ω0 + mδ, m = −2 … 2, δ = 1e-3 ω0, by the five-point central
 * differences (error of order δ⁴; Abramowitz and Stegun, Handbook of
 * Mathematical Functions (1964), 25.3.6 and 25.3.24).
 *
 * Coupling in intensity units. With |a|² = I = 2 n ε0 c |A|² the
 * equations of Boyd §2.2 (dA_j/dz = i (2 d ω_j / n_j c) … , from memory
 * for the section) become da_j/dz = i κ_j …, κ_j = ω_j d (2/(ε0 c³ n1 n2
 * n3))^½ in SI; ×(1e13)^½ for a in (GW/cm²)^½ and ×1e-6 per µm. In the
 * degenerate case n1 n2 n3 → n1² n3 and the harmonic's κ is halved.
 *
 * Pulse shapes. Gaussian field exp(−2 ln2 t²/τ²) (intensity FWHM τ),
 * sech field sech(t/T0), T0 = τ / (2 acosh √2) = τ / 1.7627 (Diels and
 * Rudolph, Ultrashort Laser Pulse Phenomena, 2nd ed. (2006), table 2.1,
 * from memory). GDD and delay are spectral phases (GDD/2) Ω² + t0 Ω. A
 * measured spectrum per unit wavelength is turned into one per unit
 * frequency with the Jacobian λ²/2πc; amplitude √S, interpolated linearly
 * in ω, zero outside the data.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analyses/simulate_internal.h"

#define EPS0_F_PER_M 8.8541878128e-12
#define C_M_PER_S 299792458.0
#define PROBE_REL 1e-3          /* δ / ω0 for the carrier derivatives */
#define GAUSS_SPAN 3.5          /* W = 3.5 × 4 ln2/τ */
#define SECH_SPAN 19.0          /* W = 19/τ */
#define GAUSS_EXTENT 3.41       /* intensity 1e-14 at 3.41 FWHM */
#define SECH_EXTENT 9.5         /* the same for sech² */
#define SPECTRAL_MARGIN 1.3     /* grid half-span over the widest band */
#define WINDOW_MARGIN 1.25
#define EDGE_LIMIT 1e-10        /* input energy allowed in the outer eighths */
#define FORCED_EDGE_LIMIT 1e-6  /* the same when the caller forced the grid */
#define MIN_SAMPLES 64
#define GRID_TRIES 12
#define SKIP_FRACTION 1e-17     /* of the peak total intensity (see .h) */
#define SECH_T0 1.7627471740390860 /* 2 acosh √2 */

/* ---- carriers ---------------------------------------------------------- */

static dk_status
probe_carrier(dk_sim *s, int j, const dk_sim_wave *w, dk_error *err)
{
    double om[5], k[5];
    double d = PROBE_REL * s->omega0[j];
    for (int m = 0; m < 5; m++)
        om[m] = s->omega0[j] + (m - 2) * d;
    dk_status st = w->k(w->k_ctx, om, 5, k, err);
    if (st)
        return st;
    for (int m = 0; m < 5; m++)
        if (!isfinite(k[m]) || k[m] <= 0)
            return dk_error_set(err, DK_ERANGE,
                                "%s: k(omega) has no value at or near its "
                                "carrier %.6g um (outside the crystal's data?)",
                                s->name[j], s->lambda0[j]);
    s->k0[j] = k[2];
    s->n0[j] = k[2] * SIM_C_UM_PER_FS / s->omega0[j];
    s->tau_g[j] = (k[0] - 8 * k[1] + 8 * k[3] - k[4]) / (12 * d);
    s->beta2[j] =
        (-k[0] + 16 * k[1] - 30 * k[2] + 16 * k[3] - k[4]) / (12 * d * d);
    return DK_OK;
}

dk_status
sim_setup_waves(dk_sim *s, const dk_sim_problem *p, dk_error *err)
{
    static const char *const label[3] = {"wave 1", "wave 2", "wave 3"};
    s->nw = p->degenerate ? 2 : 3;
    if (p->degenerate) {
        s->role[0] = 0;
        s->role[1] = 2;
    } else {
        for (int j = 0; j < 3; j++)
            s->role[j] = j;
    }
    double om1 = 2 * M_PI * SIM_C_UM_PER_FS / p->wave[0].lambda_um;
    double om2 = p->degenerate
                     ? om1
                     : 2 * M_PI * SIM_C_UM_PER_FS / p->wave[1].lambda_um;
    double om[3] = {om1, om2, om1 + om2};
    for (int j = 0; j < s->nw; j++) {
        int r = s->role[j];
        const char *nm = p->wave[r].name;
        if (nm && nm[0])
            snprintf(s->name[j], sizeof s->name[j], "%s ('%.20s')", label[r],
                     nm);
        else
            snprintf(s->name[j], sizeof s->name[j], "%s", label[r]);
        s->omega0[j] = om[r];
        s->lambda0[j] = 2 * M_PI * SIM_C_UM_PER_FS / om[r];
        dk_status st = probe_carrier(s, j, &p->wave[r], err);
        if (st)
            return st;
    }
    int cw[3];
    for (int j = 0; j < s->nw; j++)
        cw[j] = p->wave[s->role[j]].input.shape == DK_SIM_CW;
    if (s->nw == 3)
        for (int j = 0; j < 3; j++)
            s->cw_like[j] = cw[j] || (cw[(j + 1) % 3] && cw[(j + 2) % 3]);
    else
        s->cw_like[0] = s->cw_like[1] = cw[0] || cw[1];
    int h = s->nw - 1; /* the harmonic / sum wave */
    double nprod = p->degenerate ? s->n0[0] * s->n0[0] * s->n0[1]
                                 : s->n0[0] * s->n0[1] * s->n0[2];
    double d_si = p->deff_pm_per_v * 1e-12;
    double scale = sqrt(2 / (EPS0_F_PER_M * C_M_PER_S * C_M_PER_S *
                             C_M_PER_S * nprod)) *
                   sqrt(1e13) * 1e-6;
    for (int j = 0; j < s->nw; j++)
        s->kappa[j] = s->omega0[j] * 1e15 * d_si * scale;
    if (p->degenerate)
        s->kappa[h] /= 2;
    s->dk0 = p->degenerate ? s->k0[1] - 2 * s->k0[0]
                           : s->k0[2] - s->k0[0] - s->k0[1];
    s->deff_pm_per_v = p->deff_pm_per_v;
    s->deff_first_order = p->deff_pm_per_v;
    s->qpm = p->qpm;
    s->period_um = 0;
    if (p->qpm) {
        s->duty = p->qpm_duty > 0 ? p->qpm_duty : 0.5;
        int order = p->qpm_order > 0 ? p->qpm_order : 1;
        if (p->qpm_period_um > 0) {
            s->period_um = p->qpm_period_um;
        } else {
            if (s->dk0 == 0)
                return dk_error_set(err, DK_EDOM,
                                    "the carriers are phase-matched without "
                                    "a grating (k3 = k1 + k2): give a QPM "
                                    "period or leave the grating out");
            s->period_um = 2 * M_PI * order / fabs(s->dk0);
        }
        double m = round(fabs(s->dk0) * s->period_um / (2 * M_PI));
        if (m < 1)
            m = 1;
        s->deff_first_order = p->deff_pm_per_v * 2 / (m * M_PI) *
                              fabs(sin(m * M_PI * s->duty));
    }
    return DK_OK;
}

/* ---- the grid ---------------------------------------------------------- */

double
sim_fluence(const double complex *a, size_t n, double dt)
{
    double sum = 0;
    const double *x = (const double *)a;
    for (size_t i = 0; i < 2 * n; i++)
        sum += x[i] * x[i];
    return sum * dt;
}

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
        t->omega[i] = 2 * M_PI * SIM_C_UM_PER_FS / lam;
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
static double
input_band(const dk_sim *s, int j, const dk_sim_pulse *in)
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
                double om = 2 * M_PI * SIM_C_UM_PER_FS /
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
static double
input_extent(const dk_sim_pulse *in, double band)
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
        double om0 = 2 * M_PI * SIM_C_UM_PER_FS / sp->wavelength_um[0];
        double om1 = 2 * M_PI * SIM_C_UM_PER_FS / sp->wavelength_um[sp->n - 1];
        double span = fabs(om1 - om0);
        double gd = 0;
        if (sp->phase_rad)
            for (size_t i = 1; i < sp->n; i++) {
                double a = 2 * M_PI * SIM_C_UM_PER_FS / sp->wavelength_um[i];
                double b =
                    2 * M_PI * SIM_C_UM_PER_FS / sp->wavelength_um[i - 1];
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

static int
pulsed(const dk_sim_pulse *in)
{
    return in->shape != DK_SIM_DARK && in->shape != DK_SIM_CW;
}

static void
free_grid_arrays(dk_sim *s)
{
    free(s->omega);
    free(s->disp);
    for (int j = 0; j < 3; j++) {
        free(s->bad[j]);
        s->bad[j] = NULL;
        s->nbad[j] = 0;
    }
    fftw_free(s->input);
    fftw_free(s->field);
    fftw_free(s->scratch);
    s->omega = s->disp = NULL;
    s->input = s->field = s->scratch = NULL;
}

/* Allocate the arrays for n samples and evaluate every k over the grid. */
static dk_status
grid_arrays(dk_sim *s, const dk_sim_problem *p, dk_error *err)
{
    size_t n = s->n;
    int nw = s->nw;
    free_grid_arrays(s);
    s->omega = malloc(n * sizeof(double));
    s->disp = malloc((size_t)nw * n * sizeof(double));
    s->input = fftw_alloc_complex((size_t)nw * n);
    s->field = fftw_alloc_complex((size_t)nw * n);
    s->scratch = fftw_alloc_complex((size_t)nw * n);
    double *om = malloc(n * sizeof(double));
    size_t *map = malloc(n * sizeof(size_t));
    double *kv = malloc(n * sizeof(double));
    dk_status st = DK_OK;
    if (!s->omega || !s->disp || !s->input || !s->field || !s->scratch ||
        !om || !map || !kv) {
        st = dk_error_set(err, DK_ENOMEM, "out of memory for a grid of %zu "
                          "samples", n);
        goto done;
    }
    double dom = 2 * M_PI / (n * s->dt);
    for (size_t i = 0; i < n; i++)
        s->omega[i] = (i < n / 2 ? (double)i : (double)i - (double)n) * dom;
    for (int j = 0; j < nw && !st; j++) {
        const dk_sim_wave *w = &p->wave[s->role[j]];
        size_t m = 0;
        for (size_t i = 0; i < n; i++) {
            double o = s->omega0[j] + s->omega[i];
            if (o > 0) {
                om[m] = o;
                map[m++] = i;
            }
        }
        double *D = s->disp + (size_t)j * n;
        for (size_t i = 0; i < n; i++)
            D[i] = NAN;
        if (m > 0) {
            st = w->k(w->k_ctx, om, m, kv, err);
            if (st)
                break;
        }
        for (size_t q = 0; q < m; q++) {
            size_t i = map[q];
            if (isfinite(kv[q]))
                D[i] = kv[q] - s->k0[j] - s->omega[i] * s->tau_ref;
        }
        D[0] = 0; /* the carrier itself, exactly */
        size_t nb = 0;
        for (size_t i = 0; i < n; i++)
            nb += !isfinite(D[i]);
        if (nb) {
            s->bad[j] = malloc(nb * sizeof(size_t));
            if (!s->bad[j]) {
                st = dk_error_set(err, DK_ENOMEM, "out of memory");
                break;
            }
            for (size_t i = 0; i < n; i++)
                if (!isfinite(D[i]))
                    s->bad[j][s->nbad[j]++] = i;
        }
    }
done:
    free(om);
    free(map);
    free(kv);
    return st;
}

/* The spread of group delays (relative to the frame) over each wave's
 * band across the crystal, from the exact D_j on the grid: [*lo, *hi] fs. */
static void
walk_range(const dk_sim *s, double *lo, double *hi)
{
    size_t n = s->n;
    double dom = 2 * M_PI / (n * s->dt);
    *lo = *hi = 0;
    for (int j = 0; j < s->nw; j++) {
        const double *D = s->disp + (size_t)j * n;
        double gmin = s->tau_g[j] - s->tau_ref, gmax = gmin;
        for (size_t i = 0; i < n; i++) {
            if (fabs(s->omega[i]) > s->band[j])
                continue;
            size_t a = (i + n - 1) % n, b = (i + 1) % n;
            if (a == n / 2 - 1 || i == n / 2 - 1)
                continue; /* the wrap between +Ω and −Ω */
            if (!isfinite(D[a]) || !isfinite(D[b]))
                continue;
            double g = (D[b] - D[a]) / (2 * dom);
            gmin = fmin(gmin, g);
            gmax = fmax(gmax, g);
        }
        *lo = fmin(*lo, gmin * s->length_um);
        *hi = fmax(*hi, gmax * s->length_um);
    }
}

/* Build the inputs in s->input; report the largest time and spectral edge
 * fractions of the pulsed ones. */
static dk_status
build_inputs(dk_sim *s, const dk_sim_problem *p, double *tedge,
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
        if (!pulsed(in))
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
        if (pulsed(in))
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

static size_t
pow2_at_least(double x)
{
    size_t n = MIN_SAMPLES;
    while ((double)n < x && n <= DK_SIM_MAX_SAMPLES)
        n *= 2;
    return n;
}

dk_status
sim_setup_grid(dk_sim *s, const dk_sim_problem *p, const dk_sim_options *opt,
               dk_error *err)
{
    int nw = s->nw;
    double W[3] = {0, 0, 0};
    for (int j = 0; j < nw; j++)
        W[j] = input_band(s, j, &p->wave[s->role[j]].input);
    /* Each wave's band: its own, or that of the product driving it. */
    if (nw == 3) {
        s->band[0] = fmax(W[0], W[1] + W[2]);
        s->band[1] = fmax(W[1], W[0] + W[2]);
        s->band[2] = fmax(W[2], W[0] + W[1]);
    } else {
        s->band[0] = fmax(W[0], W[0] + W[1]);
        s->band[1] = fmax(W[1], 2 * W[0]);
    }
    double wmax = 0;
    for (int j = 0; j < nw; j++) {
        if (s->band[j] > 0.9 * s->omega0[j])
            return dk_error_set(err, DK_EINVAL,
                                "%s: its spectrum would reach zero frequency "
                                "(band +-%.3g rad/fs around %.3g rad/fs); the "
                                "envelope model needs pulses several optical "
                                "cycles long",
                                s->name[j], s->band[j], s->omega0[j]);
        wmax = fmax(wmax, s->band[j]);
    }
    /* The frame. */
    if (opt->frame_wave >= 1) {
        int j = opt->frame_wave - 1;
        if (p->degenerate)
            j = j == 0 ? 0 : 1;
        s->tau_ref = s->tau_g[j];
    } else {
        double lo = s->tau_g[0], hi = s->tau_g[0];
        for (int j = 1; j < nw; j++) {
            lo = fmin(lo, s->tau_g[j]);
            hi = fmax(hi, s->tau_g[j]);
        }
        s->tau_ref = 0.5 * (lo + hi);
    }
    /* Spacing. */
    int auto_dt = !(opt->dt_fs > 0), auto_n = opt->samples == 0;
    s->dt = auto_dt ? (wmax > 0 ? M_PI / (SPECTRAL_MARGIN * wmax) : 1.0)
                    : opt->dt_fs;
    /* First window: inputs plus a walk estimated at the carriers. */
    double in_lo = 0, in_hi = 0;
    for (int j = 0; j < nw; j++) {
        const dk_sim_pulse *in = &p->wave[s->role[j]].input;
        if (!pulsed(in))
            continue;
        double e = input_extent(in, W[j]);
        in_lo = fmin(in_lo, in->delay_fs - e);
        in_hi = fmax(in_hi, in->delay_fs + e);
    }
    double w_lo = 0, w_hi = 0;
    for (int j = 0; j < nw; j++) {
        double g = (s->tau_g[j] - s->tau_ref) * s->length_um;
        double spread = fabs(s->beta2[j]) * s->band[j] * s->length_um;
        w_lo = fmin(w_lo, g - spread);
        w_hi = fmax(w_hi, g + spread);
    }
    double need = WINDOW_MARGIN * 2 * fmax(fabs(in_lo + w_lo),
                                           fabs(in_hi + w_hi));
    s->n = auto_n ? pow2_at_least(need / s->dt) : opt->samples;

    for (int tries = 0;; tries++) {
        if (s->n > DK_SIM_MAX_SAMPLES)
            return dk_error_set(err, DK_ERANGE,
                                "the time grid would need more than %zu "
                                "samples (%.4g fs apart): use longer pulses or "
                                "a shorter crystal",
                                DK_SIM_MAX_SAMPLES, s->dt);
        if (tries == GRID_TRIES)
            return dk_error_set(err, DK_ERANGE,
                                "no time grid holds the input pulses after %d "
                                "enlargements (%zu samples, %.4g fs apart)",
                                GRID_TRIES, s->n, s->dt);
        dk_status st = grid_arrays(s, p, err);
        if (st)
            return st;
        if (auto_n && wmax > 0) {
            double lo, hi;
            walk_range(s, &lo, &hi);
            double exact = WINDOW_MARGIN * 2 *
                           fmax(fabs(in_lo + fmin(lo, 0)),
                                fabs(in_hi + fmax(hi, 0)));
            if (exact > s->n * s->dt) {
                s->n = pow2_at_least(exact / s->dt);
                continue;
            }
        }
        double tedge = 0, sedge = 0;
        st = build_inputs(s, p, &tedge, &sedge, err);
        if (st)
            return st;
        if (sedge > EDGE_LIMIT && auto_dt) {
            s->dt /= 2;
            if (auto_n)
                s->n *= 2;
            continue;
        }
        if (tedge > EDGE_LIMIT && auto_n) {
            s->n *= 2;
            continue;
        }
        if (sedge > FORCED_EDGE_LIMIT)
            return dk_error_set(err, DK_EINVAL,
                                "an input spectrum does not fit the forced "
                                "sample spacing %.4g fs (%.2g of its energy "
                                "at the grid's edge): use a smaller dt or "
                                "leave it automatic",
                                s->dt, sedge);
        if (tedge > FORCED_EDGE_LIMIT)
            return dk_error_set(err, DK_EINVAL,
                                "an input pulse does not fit the forced time "
                                "window %.4g fs (%.2g of its energy at the "
                                "window's edge): use more samples or leave "
                                "them automatic",
                                s->n * s->dt, tedge);
        break;
    }
    s->skip_below = SKIP_FRACTION * s->peak_total;
    return DK_OK;
}

/* ---- the step rule ----------------------------------------------------- */

void
sim_choose_step(dk_sim *s)
{
    double h = s->length_um / 50;
    dk_sim_step_rule rule = DK_SIM_STEP_COUNT;
    double kmax = 0;
    for (int j = 0; j < s->nw; j++)
        kmax = fmax(kmax, fabs(s->kappa[j]));
    if (kmax == 0 || s->peak_total == 0) {
        /* Nothing couples: the linear steps are exact at any length. */
        s->h_auto = h;
        s->rule = rule;
        return;
    }
    if (kmax > 0 && s->peak_total > 0) {
        double hn = 0.1 / (kmax * sqrt(s->peak_total));
        if (hn < h) {
            h = hn;
            rule = DK_SIM_STEP_NONLINEAR;
        }
    }
    double r = 0;
    for (int j = 0; j < s->nw; j++) {
        const double *D = s->disp + (size_t)j * s->n;
        for (size_t i = 0; i < s->n; i++)
            if (fabs(s->omega[i]) <= s->band[j] && isfinite(D[i]))
                r = fmax(r, fabs(D[i]));
    }
    if (r > 0 && 0.5 / r < h) {
        h = 0.5 / r;
        rule = DK_SIM_STEP_DISPERSION;
    }
    if (s->dk0 != 0 && 0.8 / fabs(s->dk0) < h) {
        h = 0.8 / fabs(s->dk0);
        rule = DK_SIM_STEP_MISMATCH;
    }
    s->h_auto = h;
    s->rule = rule;
}
