/*
 * simulate_grid.c - the carriers, the time grid, k(ω) over it and the
 * automatic step of a pulsed three-wave-mixing simulation (rules stated in
 * deltak/simulate.h; the input pulses are built in simulate_pulse.c).
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
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analyses/sim_state.h"

#define PROBE_REL 1e-3          /* δ / ω0 for the carrier derivatives */
#define SPECTRAL_MARGIN 1.3     /* grid half-span over the widest band */
#define WINDOW_MARGIN 1.25
#define EDGE_LIMIT 1e-10        /* input energy allowed in the outer eighths */
#define FORCED_EDGE_LIMIT 1e-6  /* the same when the caller forced the grid */
#define MIN_SAMPLES 64
#define GRID_TRIES 12
#define SKIP_FRACTION 1e-17     /* of the peak total intensity (see .h) */

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
    s->n0[j] = k[2] * DK_C_UM_PER_FS / s->omega0[j];
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
    double om1 = 2 * M_PI * DK_C_UM_PER_FS / p->wave[0].lambda_um;
    double om2 = p->degenerate
                     ? om1
                     : 2 * M_PI * DK_C_UM_PER_FS / p->wave[1].lambda_um;
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
        s->lambda0[j] = 2 * M_PI * DK_C_UM_PER_FS / om[r];
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
    double scale = sqrt(2 / (DK_EPS0_F_PER_M * DK_C_M_PER_S * DK_C_M_PER_S *
                             DK_C_M_PER_S * nprod)) *
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

/* The smallest power of two ≥ max(x, MIN_SAMPLES) (or one beyond the
 * largest grid). */
static size_t
pow2_at_least(double x)
{
    size_t n = MIN_SAMPLES;
    while ((double)n < x && n <= DK_SIM_MAX_SAMPLES)
        n *= 2;
    return n;
}

/* The grid rule of deltak/simulate.h: spacing from the bands, window from
 * the inputs and the walk across the crystal, then enlarged until the
 * built inputs keep clear of the edges. */
dk_status
sim_setup_grid(dk_sim *s, const dk_sim_problem *p, const dk_sim_options *opt,
               dk_error *err)
{
    int nw = s->nw;
    double W[3] = {0, 0, 0};
    for (int j = 0; j < nw; j++)
        W[j] = sim_input_band(s, j, &p->wave[s->role[j]].input);
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
        if (!sim_pulsed(in))
            continue;
        double e = sim_input_extent(in, W[j]);
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
        st = sim_build_inputs(s, p, &tedge, &sedge, err);
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
