/*
 * simulate.c - the front of the pulsed three-wave-mixing engine: checks
 * the problem, creates a simulation (grid, k(ω), inputs, FFTW plans),
 * runs it, and checks convergence by halving the step
 * (deltak/simulate.h states the model, the rules and the references).
 *
 * Convergence: the run at the automatic step h is repeated at h/2; the
 * change max_j |F_j(h) − F_j(h/2)| / max(F_j(h/2), 1e-9 ΣF_in) of the exit
 * fluences must stay under the tolerance (default 1e-3), else the step is
 * halved again (at most max_halvings times, default 3). For a second-order
 * scheme the error of the finer run is about a third of the change
 * (Richardson; e.g. Hairer, Nørsett and Wanner, Solving Ordinary
 * Differential Equations I, 2nd ed. (1993), §II.4).
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analyses/sim_state.h"

#define MAX_LENGTH_MM 1000.0
#define LAMBDA_RTOL 1e-9
#define DEFAULT_TOLERANCE 1e-3
#define DEFAULT_HALVINGS 3
#define DEFAULT_RECORD 512
#define DARK_FLOOR 1e-9        /* of the total input, in the change */
#define MEASURE_WORK 67108864.0 /* samples × steps above which plans are
                                 * measured: FFTW_MEASURE costs 1-2 s once
                                 * per size and saves about 40 % per FFT */

static const char *const wave_label[3] = {"wave 1", "wave 2", "wave 3"};

static int
finite_nonneg(double x)
{
    return isfinite(x) && x >= 0;
}

static dk_status
check_spectrum(const char *w, const dk_sim_spectrum *sp, dk_error *err)
{
    if (sp->n < 2 || !sp->wavelength_um || !sp->intensity)
        return dk_error_set(err, DK_EINVAL,
                            "%s: a measured spectrum needs at least two "
                            "points of wavelength and intensity",
                            w);
    double dir = sp->wavelength_um[1] - sp->wavelength_um[0];
    int any = 0;
    for (size_t i = 0; i < sp->n; i++) {
        double l = sp->wavelength_um[i];
        if (!(isfinite(l) && l > 0))
            return dk_error_set(err, DK_EINVAL,
                                "%s: spectrum wavelength %zu is not a "
                                "positive number of micrometres (%g)",
                                w, i, l);
        if (i > 0 && !((l - sp->wavelength_um[i - 1]) * dir > 0))
            return dk_error_set(err, DK_EINVAL,
                                "%s: spectrum wavelengths must be strictly "
                                "increasing or decreasing (point %zu)",
                                w, i);
        if (!finite_nonneg(sp->intensity[i]))
            return dk_error_set(err, DK_EINVAL,
                                "%s: spectrum intensity %zu must be a number "
                                ">= 0 (%g)",
                                w, i, sp->intensity[i]);
        any |= sp->intensity[i] > 0;
        if (sp->phase_rad && !isfinite(sp->phase_rad[i]))
            return dk_error_set(err, DK_EINVAL,
                                "%s: spectral phase %zu is not finite", w, i);
    }
    if (!any)
        return dk_error_set(err, DK_EINVAL,
                            "%s: the measured spectrum is zero everywhere", w);
    return DK_OK;
}

static dk_status
check_pulse(const char *w, const dk_sim_pulse *in, double area,
            dk_error *err)
{
    if ((int)in->shape < (int)DK_SIM_DARK || (int)in->shape > (int)DK_SIM_CW)
        return dk_error_set(err, DK_EINVAL, "%s: unknown pulse shape %d", w,
                            (int)in->shape);
    if (!finite_nonneg(in->fluence_j_per_cm2) || !finite_nonneg(in->energy_j) ||
        !finite_nonneg(in->peak_gw_per_cm2))
        return dk_error_set(err, DK_EINVAL,
                            "%s: fluence (J/cm2), energy (J) and peak "
                            "intensity (GW/cm2) must be numbers >= 0",
                            w);
    int amounts = (in->fluence_j_per_cm2 > 0) + (in->energy_j > 0) +
                  (in->peak_gw_per_cm2 > 0);
    if (in->shape == DK_SIM_DARK) {
        if (amounts)
            return dk_error_set(err, DK_EINVAL,
                                "%s: an amount of light is given but no pulse "
                                "shape (Gaussian, sech2, spectrum or CW)",
                                w);
        return DK_OK;
    }
    if (amounts != 1)
        return dk_error_set(err, DK_EINVAL,
                            "%s: give exactly one of fluence (J/cm2), energy "
                            "(J) or peak intensity (GW/cm2)",
                            w);
    if (in->energy_j > 0 && !(area > 0))
        return dk_error_set(err, DK_EINVAL,
                            "%s: an energy needs the beam area (cm2) to "
                            "become a fluence",
                            w);
    if (!isfinite(in->gdd_fs2) || !isfinite(in->delay_fs))
        return dk_error_set(err, DK_EINVAL,
                            "%s: GDD (fs2) and delay (fs) must be finite", w);
    switch (in->shape) {
    case DK_SIM_GAUSSIAN:
    case DK_SIM_SECH2:
        if (!(isfinite(in->fwhm_fs) && in->fwhm_fs > 0))
            return dk_error_set(err, DK_EINVAL,
                                "%s: the pulse duration (FWHM) must be a "
                                "positive number of fs (got %g)",
                                w, in->fwhm_fs);
        break;
    case DK_SIM_SPECTRUM:
        return check_spectrum(w, &in->spectrum, err);
    case DK_SIM_CW:
        if (!(in->peak_gw_per_cm2 > 0))
            return dk_error_set(err, DK_EINVAL,
                                "%s: a CW input is given by its intensity "
                                "(GW/cm2), not a fluence or an energy",
                                w);
        if (in->gdd_fs2 != 0 || in->delay_fs != 0)
            return dk_error_set(err, DK_EINVAL,
                                "%s: a CW input has no GDD or delay", w);
        break;
    case DK_SIM_DARK:
        break;
    }
    return DK_OK;
}

static dk_status
check_problem(const dk_sim_problem *p, const dk_sim_options *o,
              dk_error *err)
{
    if (!p)
        return dk_error_set(err, DK_EINVAL, "no problem to simulate");
    if (p->degenerate != 0 && p->degenerate != 1)
        return dk_error_set(err, DK_EINVAL, "degenerate must be 0 or 1");
    if (!(isfinite(p->length_mm) && p->length_mm > 0 &&
          p->length_mm <= MAX_LENGTH_MM))
        return dk_error_set(err, DK_EINVAL,
                            "the crystal length must be in (0, %g] mm (got "
                            "%g)",
                            MAX_LENGTH_MM, p->length_mm);
    if (!isfinite(p->deff_pm_per_v))
        return dk_error_set(err, DK_EINVAL, "d_eff (pm/V) must be finite");
    if (!finite_nonneg(p->beam_area_cm2))
        return dk_error_set(err, DK_EINVAL,
                            "the beam area must be a number >= 0 (cm2)");
    int lit = 0;
    for (int j = 0; j < 3; j++) {
        const dk_sim_wave *w = &p->wave[j];
        if (p->degenerate && j == 1) {
            if (w->input.shape != DK_SIM_DARK)
                return dk_error_set(err, DK_EINVAL,
                                    "wave 2 is unused in a degenerate run: "
                                    "give the fundamental as wave 1");
            continue;
        }
        if (!w->k)
            return dk_error_set(err, DK_EINVAL,
                                "%s has no k(omega) function", wave_label[j]);
        int derived = j == 2 && w->lambda_um == 0;
        if (!derived && !(isfinite(w->lambda_um) && w->lambda_um > 0))
            return dk_error_set(err, DK_EINVAL,
                                "%s: the carrier wavelength must be a "
                                "positive number of micrometres (got %g)",
                                wave_label[j], w->lambda_um);
        dk_status st = check_pulse(wave_label[j], &w->input,
                                   p->beam_area_cm2, err);
        if (st)
            return st;
        lit |= w->input.shape != DK_SIM_DARK;
    }
    double l1 = p->wave[0].lambda_um;
    double l2 = p->degenerate ? l1 : p->wave[1].lambda_um;
    double l3 = 1 / (1 / l1 + 1 / l2);
    if (p->wave[2].lambda_um != 0 &&
        fabs(p->wave[2].lambda_um - l3) > LAMBDA_RTOL * l3)
        return dk_error_set(err, DK_EINVAL,
                            "wave 3: %.9g um is not 1/(1/lambda1 + 1/lambda2) "
                            "= %.9g um; give 0 to derive it",
                            p->wave[2].lambda_um, l3);
    if (!lit)
        return dk_error_set(err, DK_EINVAL,
                            "nothing to simulate: every wave is dark; give "
                            "at least one input pulse");
    if (p->qpm != 0 && p->qpm != 1)
        return dk_error_set(err, DK_EINVAL, "qpm must be 0 or 1");
    if (p->qpm) {
        if (!finite_nonneg(p->qpm_period_um))
            return dk_error_set(err, DK_EINVAL,
                                "the QPM period must be > 0 um, or 0 to "
                                "phase-match the carriers");
        if (p->qpm_order < 0 || p->qpm_order > 99)
            return dk_error_set(err, DK_EINVAL,
                                "the QPM order must be 1 to 99 (got %d)",
                                p->qpm_order);
        if (!(p->qpm_duty == 0 || (p->qpm_duty > 0 && p->qpm_duty < 1)))
            return dk_error_set(err, DK_EINVAL,
                                "the QPM duty cycle must lie in (0, 1) (got "
                                "%g)",
                                p->qpm_duty);
    }
    if (o->samples != 0 &&
        (o->samples < 64 || o->samples > DK_SIM_MAX_SAMPLES ||
         (o->samples & (o->samples - 1)) != 0))
        return dk_error_set(err, DK_EINVAL,
                            "samples must be a power of two from 64 to %zu "
                            "(got %zu)",
                            DK_SIM_MAX_SAMPLES, o->samples);
    if (!finite_nonneg(o->dt_fs) || !finite_nonneg(o->max_step_um))
        return dk_error_set(err, DK_EINVAL,
                            "dt (fs) and the largest step (um) must be > 0, "
                            "or 0 for automatic");
    if (o->frame_wave < 0 || o->frame_wave > 3 ||
        (p->degenerate && o->frame_wave == 2))
        return dk_error_set(err, DK_EINVAL,
                            "the frame wave must be 1, 2 or 3 (not 2 in a "
                            "degenerate run), or 0 for the middle");
    if (!(o->tolerance == 0 || (o->tolerance > 0 && o->tolerance < 0.5)))
        return dk_error_set(err, DK_EINVAL,
                            "the convergence tolerance must lie in (0, 0.5)");
    if (o->max_halvings < 0 || o->max_halvings > 20)
        return dk_error_set(err, DK_EINVAL,
                            "at most 20 halvings of the step");
    if (o->record_points != 0 &&
        (o->record_points < 2 || o->record_points > 1000000))
        return dk_error_set(err, DK_EINVAL,
                            "record_points must be 2 to 1000000");
    if (o->fft_planning < 0 || o->fft_planning > 2)
        return dk_error_set(err, DK_EINVAL,
                            "fft_planning must be 0, 1 or 2");
    return DK_OK;
}

void
dk_sim_free(dk_sim *s)
{
    if (!s)
        return;
    sim_release_cache(s);
    if (s->to_freq)
        fftw_destroy_plan(s->to_freq);
    if (s->to_time)
        fftw_destroy_plan(s->to_time);
    free(s->omega);
    free(s->disp);
    for (int j = 0; j < 3; j++)
        free(s->bad[j]);
    fftw_free(s->input);
    fftw_free(s->field);
    fftw_free(s->scratch);
    free(s->rec_z);
    free(s->rec_f);
    free(s);
}

dk_status
dk_sim_new(const dk_sim_problem *p, const dk_sim_options *opt, dk_sim **out,
           dk_error *err)
{
    dk_sim_options none = {0};
    if (!opt)
        opt = &none;
    if (!out)
        return dk_error_set(err, DK_EINVAL, "no place for the simulation");
    dk_status st = check_problem(p, opt, err);
    if (st)
        return st;
    dk_sim *s = calloc(1, sizeof *s);
    if (!s)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    s->length_um = p->length_mm * 1e3;
    s->area_cm2 = p->beam_area_cm2;
    s->record_max = opt->record_points ? opt->record_points : DEFAULT_RECORD;
    for (int c = 0; c < SIM_CACHE_MAX; c++)
        s->cache[c].h_um = NAN;
    if ((st = sim_setup_waves(s, p, err)) ||
        (st = sim_setup_grid(s, p, opt, err)))
        goto fail;
    sim_choose_step(s);
    if (opt->max_step_um > 0) {
        s->h_auto = opt->max_step_um;
        s->rule = DK_SIM_STEP_USER;
    }
    unsigned flags = FFTW_ESTIMATE;
    if (opt->fft_planning == 1 ||
        (opt->fft_planning == 0 &&
         (double)s->n * (double)sim_count_steps(s, s->h_auto) > MEASURE_WORK))
        flags = FFTW_MEASURE;
    int nn = (int)s->n;
    s->to_freq = fftw_plan_many_dft(1, &nn, s->nw, s->field, NULL, 1, nn,
                                    s->field, NULL, 1, nn, FFTW_BACKWARD,
                                    flags);
    s->to_time = fftw_plan_many_dft(1, &nn, s->nw, s->field, NULL, 1, nn,
                                    s->field, NULL, 1, nn, FFTW_FORWARD,
                                    flags);
    size_t cap = (size_t)s->record_max + 2;
    s->rec_z = malloc(cap * sizeof(double));
    s->rec_f = malloc((size_t)s->nw * cap * sizeof(double));
    if (!s->to_freq || !s->to_time || !s->rec_z || !s->rec_f) {
        st = dk_error_set(err, DK_ENOMEM, "out of memory (FFT plans for %zu "
                          "samples)", s->n);
        goto fail;
    }
    *out = s;
    return DK_OK;
fail:
    dk_sim_free(s);
    return st;
}

void
dk_sim_get_info(const dk_sim *s, dk_sim_info *info)
{
    info->samples = s->n;
    info->dt_fs = s->dt;
    info->window_fs = s->n * s->dt;
    info->step_um = s->h_auto;
    info->step_rule = s->rule;
    info->steps = sim_count_steps(s, s->h_auto);
    info->qpm_period_um = s->period_um;
    info->frame_fs_per_mm = s->tau_ref * 1e3;
    info->delta_k_rad_per_um = s->dk0;
}

const char *
dk_sim_step_rule_str(dk_sim_step_rule r)
{
    switch (r) {
    case DK_SIM_STEP_NONLINEAR: return "nonlinear length";
    case DK_SIM_STEP_DISPERSION: return "walk-off and dispersion";
    case DK_SIM_STEP_MISMATCH: return "phase mismatch (domains)";
    case DK_SIM_STEP_COUNT: return "minimum number of steps";
    case DK_SIM_STEP_USER: return "given";
    }
    return "unknown";
}

/* max_j |a_j − b_j| / max(b_j, floor). */
static double
relative_change(const dk_sim *s, const double a[3], const double b[3])
{
    double total = 0, worst = 0;
    for (int j = 0; j < s->nw; j++)
        total += s->fluence_in[j];
    for (int j = 0; j < s->nw; j++) {
        double den = fmax(b[j], DARK_FLOOR * total);
        if (den > 0)
            worst = fmax(worst, fabs(a[j] - b[j]) / den);
    }
    return worst;
}

dk_status
dk_sim_run(const dk_sim_problem *p, const dk_sim_options *opt,
           dk_sim_result **out, dk_error *err)
{
    dk_sim_options none = {0};
    if (!opt)
        opt = &none;
    if (!out)
        return dk_error_set(err, DK_EINVAL, "no place for the result");
    dk_sim *s = NULL;
    dk_sim_result *r = NULL;
    dk_status st = dk_sim_new(p, opt, &s, err);
    if (st)
        return st;
    double tol = opt->tolerance > 0 ? opt->tolerance : DEFAULT_TOLERANCE;
    int most = opt->max_halvings > 0 ? opt->max_halvings : DEFAULT_HALVINGS;
    double h = s->h_auto, fa[3], fb[3];
    if ((st = dk_sim_propagate(s, h, NULL, err)))
        goto done;
    memcpy(fa, s->fluence_out, sizeof fa);
    int checked = !opt->no_convergence_check, converged = 0, halvings = 0;
    double change = NAN;
    while (checked) {
        h /= 2;
        halvings++;
        if ((st = dk_sim_propagate(s, h, NULL, err)))
            goto done;
        memcpy(fb, s->fluence_out, sizeof fb);
        change = relative_change(s, fa, fb);
        if (change <= tol) {
            converged = 1;
            break;
        }
        if (halvings >= most)
            break;
        memcpy(fa, fb, sizeof fa);
    }
    r = calloc(1, sizeof *r);
    if (!r) {
        st = dk_error_set(err, DK_ENOMEM, "out of memory");
        goto done;
    }
    r->step_rule = s->rule;
    r->convergence_checked = checked;
    r->converged = converged;
    r->convergence_change = change;
    r->tolerance = tol;
    r->halvings = halvings;
    if (checked && !converged)
        r->warnings |= DK_SIM_WARN_NOT_CONVERGED;
    if ((st = sim_fill_result(s, r, err)))
        goto done;
    *out = r;
    r = NULL;
done:
    dk_sim_result_free(r);
    dk_sim_free(s);
    return st;
}

void
dk_sim_result_free(dk_sim_result *r)
{
    if (!r)
        return;
    free(r->time_fs); /* the pool that holds every array */
    free(r);
}
