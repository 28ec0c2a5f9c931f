/*
 * broadband.c - low-conversion output spectra of SFG, DFG and OPA from
 * broadband inputs (model and references in deltak/broadband.h).
 *
 * The simulator's set-up (dk_sim_new) gives the grid, the inputs at the
 * entrance, D_j(Ω) of every wave from its exact k(ω), the couplings κ_j
 * and the grating; nothing is propagated. The inputs are taken to the
 * frequency domain (FFTW's new-array execute on the simulation's plan),
 * and each output bin sums over the significant input bins (those above
 * 1e-7 of their peak amplitude).
 */
#include <complex.h>
#include <fftw3.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analyses/sim_state.h"
#include "deltak/broadband.h"

#define SIGNIFICANT 1e-7   /* of the peak spectral amplitude */

/* Spectral fluence unit: |ã|² in GW/cm²·fs per (rad/fs)/2π, i.e.
 * GW/cm²·fs per PHz = 1e-6 J/cm² per 1e3 THz. */
#define TO_J_CM2_THZ 1e-9

void
dk_mix_result_free(dk_mix_result *r)
{
    if (!r)
        return;
    for (int j = 0; j < 3; j++) {
        free(r->frequency_thz[j]);
        free(r->spectrum_in[j]);
        free(r->spectrum_out[j]);
    }
    free(r->phase_out_rad);
    free(r->pm_modulus);
    free(r->pm_phase_rad);
    free(r);
}

/* h(q) = e^{−iqL/2} sinc(qL/2). */
static double complex
pm_h(double q, double len)
{
    double x = 0.5 * q * len;
    double s = fabs(x) < 1e-4 ? 1 - x * x / 6 : sin(x) / x;
    return s * cexp(-I * x);
}

/* FFT index of the bin at Ω = m dΩ (m in [−n/2, n/2)). */
static size_t
bin_of(long m, size_t n)
{
    return m < 0 ? (size_t)(m + (long)n) : (size_t)m;
}

static long
m_of(size_t i, size_t n)
{
    return i < n / 2 ? (long)i : (long)i - (long)n;
}

/* The ascending order of bins: FFT index of the k-th lowest frequency. */
static size_t
ascending(size_t k, size_t n)
{
    return (k + n / 2) % n;
}

dk_status
dk_mix_spectrum(const dk_sim_problem *p, const dk_sim_options *opt,
                dk_mix_kind kind, dk_mix_result **out, dk_error *err)
{
    *out = NULL;
    int given[3];
    for (int j = 0; j < 3; j++)
        given[j] = p->wave[j].input.shape != DK_SIM_DARK;
    if (p->degenerate)
        given[1] = given[0];
    int gen = -1;
    if (kind == DK_MIX_AUTO)
        kind = given[0] && given[1] && !given[2] ? DK_MIX_SFG : DK_MIX_DFG;
    switch (kind) {
    case DK_MIX_SFG:
        if (!given[0] || !given[1] || given[2])
            return dk_error_set(err, DK_EINVAL,
                                "sum-frequency mixing takes inputs on waves "
                                "1 and 2 (signal and idler, or the "
                                "fundamental) and none on wave 3");
        gen = 2;
        break;
    case DK_MIX_DFG:
        if (p->degenerate || !given[2] || given[0] == given[1])
            return dk_error_set(err, DK_EINVAL,
                                "difference-frequency mixing takes the pump "
                                "(wave 3) and exactly one of signal and "
                                "idler");
        gen = given[0] ? 1 : 0;
        break;
    case DK_MIX_OPA:
        if (p->degenerate || !given[2] || !given[0] || given[1])
            return dk_error_set(err, DK_EINVAL,
                                "the OPA spectrum takes the pump (wave 3) "
                                "and a signal seed (wave 1), no idler");
        gen = 1;
        break;
    default:
        return dk_error_set(err, DK_EINVAL, "unknown mixing process");
    }
    dk_sim *s = NULL;
    dk_status st = dk_sim_new(p, opt, &s, err);
    if (st)
        return st;
    const size_t n = s->n;
    const double dom = 2 * M_PI / (n * s->dt);
    dk_mix_result *r = calloc(1, sizeof *r);
    double complex *spec = fftw_alloc_complex((size_t)s->nw * n);
    double complex *outc = calloc(n, sizeof *outc);
    double complex *amp = calloc(n, sizeof *amp);   /* OPA signal */
    size_t *sig[2] = {malloc(n * sizeof(size_t)), malloc(n * sizeof(size_t))};
    if (!r || !spec || !outc || !amp || !sig[0] || !sig[1]) {
        st = dk_error_set(err, DK_ENOMEM, "out of memory");
        goto done;
    }
    r->kind = kind;
    r->generated = gen;
    r->n = n;
    /* Inputs to the frequency domain: ã(Ω) = dt e^{iΩτ0} Σ a e^{iΩτ}. */
    fftw_execute_dft(s->to_freq, s->input, spec);
    const double t0 = -(double)(n / 2) * s->dt;
    for (int w = 0; w < s->nw; w++)
        for (size_t i = 0; i < n; i++)
            spec[(size_t)w * n + i] *= s->dt * cexp(I * s->omega[i] * t0);
    /* Stored index of each problem wave. */
    int stored[3] = {-1, -1, -1};
    for (int w = 0; w < s->nw; w++)
        stored[s->role[w]] = w;
    if (p->degenerate)
        stored[1] = stored[0];
    /* The grating's first Fourier term: |K| nearest the mismatch. */
    double K = 0, kscale = 1;
    if (s->qpm && s->period_um > 0) {
        double m = fmax(1, round(fabs(s->dk0) * s->period_um / (2 * M_PI)));
        K = copysign(2 * M_PI * m / s->period_um, s->dk0);
        kscale = s->deff_first_order / s->deff_pm_per_v;
    }
    const double len = s->length_um;
    const double *D[3];
    for (int j = 0; j < 3; j++)
        D[j] = stored[j] >= 0 ? s->disp + (size_t)stored[j] * n : NULL;
    const double complex *A[3];
    for (int j = 0; j < 3; j++)
        A[j] = stored[j] >= 0 ? spec + (size_t)stored[j] * n : NULL;
    /* Significant bins of the two inputs. */
    int in_a, in_b;   /* problem indices of the inputs */
    if (gen == 2)
        in_a = 0, in_b = 1;
    else
        in_a = 2, in_b = gen == 1 ? 0 : 1;
    size_t nsig[2] = {0, 0};
    const int ins[2] = {in_a, in_b};
    for (int t = 0; t < 2; t++) {
        double peak = 0;
        for (size_t i = 0; i < n; i++)
            peak = fmax(peak, cabs(A[ins[t]][i]));
        for (size_t i = 0; i < n; i++)
            if (cabs(A[ins[t]][i]) > SIGNIFICANT * peak &&
                isfinite(D[ins[t]][i]))
                sig[t][nsig[t]++] = i;
    }
    const double kap = s->kappa[stored[gen]] * kscale;
    const double q0 = s->dk0 - K;   /* residual carrier mismatch */
    const double dw = dom / (2 * M_PI);
    if (kind == DK_MIX_OPA) {
        /* Narrowband pump: its peak intensity; each seed bin alone. */
        double ip = 0;
        for (size_t i = 0; i < n; i++) {
            double complex a = s->input[(size_t)stored[2] * n + i];
            ip = fmax(ip, creal(a * conj(a)));
        }
        double g2 = s->kappa[stored[0]] * s->kappa[stored[1]] * ip *
                    kscale * kscale;
        r->gain_peak = 1;
        for (size_t t = 0; t < nsig[1]; t++) {
            size_t i = sig[1][t];
            long m = m_of(i, n);
            size_t ii = bin_of(-m, n);   /* idler at −Ω */
            if (m == -(long)(n / 2) || !isfinite(D[1][ii]))
                continue;
            double q = q0 + D[2][0] - D[0][i] - D[1][ii];
            double gg = g2 - 0.25 * q * q, G;
            double gl = sqrt(fabs(gg)) * len;
            if (gg > 0)
                G = 1 + g2 / gg * pow(sinh(gl), 2);
            else if (gg < 0)
                G = 1 + g2 / -gg * pow(sin(gl), 2);
            else
                G = 1 + g2 * len * len;
            if (!isfinite(G)) {
                st = dk_error_set(err, DK_EDOM, "the gain overflows");
                goto done;
            }
            r->gain_peak = fmax(r->gain_peak, G);
            amp[i] = A[0][i] * sqrt(G);
            /* idler photons = (G − 1) × seed photons */
            double wr = (s->omega0[1] - s->omega[i]) /
                        (s->omega0[0] + s->omega[i]);
            outc[ii] = A[0][i] * sqrt(fmax(0, (G - 1) * wr));
        }
    } else {
        /* Output bins: Ω_gen = Ω_a ± Ω_b on the grid. */
        for (size_t ta = 0; ta < nsig[0]; ta++) {
            size_t ia = sig[0][ta];
            long ma = m_of(ia, n);
            for (size_t tb = 0; tb < nsig[1]; tb++) {
                size_t ib = sig[1][tb];
                long mb = m_of(ib, n);
                long mg = gen == 2 ? ma + mb : ma - mb;
                if (mg < -(long)(n / 2) || mg >= (long)(n / 2))
                    continue;
                size_t ig = bin_of(mg, n);
                if (!isfinite(D[gen][ig]))
                    continue;
                double complex v;
                if (gen == 2) {
                    double q = q0 + D[2][ig] - D[0][ia] - D[1][ib];
                    v = A[0][ia] * A[1][ib] * pm_h(q, len);
                } else {
                    double q = q0 + D[2][ia] - D[in_b][ib] - D[gen][ig];
                    v = A[2][ia] * conj(A[in_b][ib]) * conj(pm_h(q, len));
                }
                outc[ig] += v;
            }
        }
        for (size_t i = 0; i < n; i++)
            outc[i] *= I * kap * len * dw;
    }
    /* The generated field at the exit: its own dispersion. */
    for (size_t i = 0; i < n; i++)
        if (isfinite(D[gen][i]))
            outc[i] *= cexp(I * D[gen][i] * len);
    /* Arrays, ascending frequency. */
    for (int j = 0; j < 3; j++) {
        if (stored[j] < 0 || (p->degenerate && j == 1))
            continue;
        r->frequency_thz[j] = malloc(n * sizeof(double));
        r->spectrum_in[j] = malloc(n * sizeof(double));
        r->spectrum_out[j] = malloc(n * sizeof(double));
        if (!r->frequency_thz[j] || !r->spectrum_in[j] || !r->spectrum_out[j]) {
            st = dk_error_set(err, DK_ENOMEM, "out of memory");
            goto done;
        }
        double fl = 0;
        for (size_t k = 0; k < n; k++) {
            size_t i = ascending(k, n);
            r->frequency_thz[j][k] =
                (s->omega0[stored[j]] + s->omega[i]) * 1e3 / (2 * M_PI);
            double complex a = A[j][i];
            double in = creal(a * conj(a)) * TO_J_CM2_THZ;
            double complex b = j == gen ? outc[i]
                               : (kind == DK_MIX_OPA && j == 0) ? amp[i]
                                                                : a;
            r->spectrum_in[j][k] = j == gen ? 0 : in;
            r->spectrum_out[j][k] = creal(b * conj(b)) * TO_J_CM2_THZ;
            fl += r->spectrum_out[j][k] * dw * 1e3;
        }
        r->fluence_j_per_cm2[j] = fl;
        r->energy_j[j] = p->beam_area_cm2 > 0 ? fl * p->beam_area_cm2 : NAN;
    }
    /* Phase, phase-matching amplitude, width of the generated wave. */
    r->phase_out_rad = malloc(n * sizeof(double));
    r->pm_modulus = malloc(n * sizeof(double));
    r->pm_phase_rad = malloc(n * sizeof(double));
    if (!r->phase_out_rad || !r->pm_modulus || !r->pm_phase_rad) {
        st = dk_error_set(err, DK_ENOMEM, "out of memory");
        goto done;
    }
    const double *S = r->spectrum_out[gen];
    double smax = 0;
    size_t kmax = 0;
    for (size_t k = 0; k < n; k++)
        if (S[k] > smax)
            smax = S[k], kmax = k;
    /* The narrower input (fewer significant bins) is held at its carrier. */
    int held = nsig[0] <= nsig[1] ? ins[0] : ins[1];
    for (size_t k = 0; k < n; k++) {
        size_t i = ascending(k, n);
        r->phase_out_rad[k] = S[k] > 1e-12 * smax ? carg(outc[i]) : 0;
        double q = NAN;
        long m = m_of(i, n);
        /* the other input moves with the generated wave */
        if (gen == 2) {
            size_t io = i;   /* Ω_other = Ω3 when the held one is at 0 */
            q = q0 + D[2][i] - D[held][0] - D[held == 0 ? 1 : 0][io];
        } else if (held == 2) {
            size_t io = bin_of(-m, n);   /* Ω_b = −Ω_gen */
            q = q0 + D[2][0] - D[in_b][io] - D[gen][i];
        } else {
            size_t io = i;   /* Ω_pump = Ω_gen */
            q = q0 + D[2][io] - D[in_b][0] - D[gen][i];
        }
        if (isfinite(q)) {
            double complex h = pm_h(q, len);
            r->pm_modulus[k] = cabs(h);
            r->pm_phase_rad[k] = carg(gen == 2 ? h : conj(h));
        } else {
            r->pm_modulus[k] = r->pm_phase_rad[k] = NAN;
        }
    }
    r->centre_thz = r->frequency_thz[gen][kmax];
    {
        size_t a = 0, b = n - 1;
        while (a < kmax && S[a] < 0.5 * smax)
            a++;
        while (b > kmax && S[b] < 0.5 * smax)
            b--;
        r->fwhm_thz = smax > 0 ? r->frequency_thz[gen][b] -
                                     r->frequency_thz[gen][a] + dw * 1e3
                               : NAN;
    }
    /* Transform limit: |ã| with a flat phase, back to time. */
    {
        double complex *tl = fftw_alloc_complex((size_t)s->nw * n);
        if (!tl) {
            st = dk_error_set(err, DK_ENOMEM, "out of memory");
            goto done;
        }
        memset(tl, 0, (size_t)s->nw * n * sizeof *tl);
        for (size_t i = 0; i < n; i++)
            spec[i] = cabs(outc[i]);
        fftw_execute_dft(s->to_time, spec, tl);
        double ymax = 0;
        size_t im = 0;
        for (size_t i = 0; i < n; i++) {
            double y = creal(tl[i] * conj(tl[i]));
            if (y > ymax)
                ymax = y, im = i;
        }
        /* walk out from the peak (cyclic) to the half points */
        double h = 0.5 * ymax, width = NAN;
        if (ymax > 0) {
            size_t lo = 0, hi = 0;
            while (lo < n / 2 &&
                   creal(tl[(im + n - lo) % n] * conj(tl[(im + n - lo) % n])) >
                       h)
                lo++;
            while (hi < n / 2 &&
                   creal(tl[(im + hi) % n] * conj(tl[(im + hi) % n])) > h)
                hi++;
            /* linear interpolation at both ends */
            double ya = creal(tl[(im + n - lo) % n] *
                              conj(tl[(im + n - lo) % n])),
                   yb = creal(tl[(im + n - lo + 1) % n] *
                              conj(tl[(im + n - lo + 1) % n]));
            double fa = lo > 0 && yb != ya ? (h - ya) / (yb - ya) : 0;
            double yc = creal(tl[(im + hi) % n] * conj(tl[(im + hi) % n])),
                   yd = creal(tl[(im + hi - 1) % n] *
                              conj(tl[(im + hi - 1) % n]));
            double fb = hi > 0 && yd != yc ? (h - yc) / (yd - yc) : 0;
            width = ((double)lo - fa + (double)hi - fb) * s->dt;
        }
        r->transform_limit_fs = width;
        fftw_free(tl);
    }
    /* Photons made against the scarcer input. */
    {
        double made = r->fluence_j_per_cm2[gen] / s->omega0[stored[gen]];
        double have = INFINITY;
        for (int t = 0; t < 2; t++)
            if (r->frequency_thz[ins[t]] && (kind != DK_MIX_OPA || ins[t] == 2))
                have = fmin(have, r->fluence_j_per_cm2[ins[t]] /
                                      s->omega0[stored[ins[t]]]);
        r->photon_fraction = have > 0 ? made / have : NAN;
    }
    if (kind != DK_MIX_OPA)
        r->gain_peak = NAN;
done:
    fftw_free(spec);
    free(outc);
    free(amp);
    free(sig[0]);
    free(sig[1]);
    dk_sim_free(s);
    if (st) {
        dk_mix_result_free(r);
        return st;
    }
    *out = r;
    return DK_OK;
}
