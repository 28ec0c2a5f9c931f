/*
 * chip.c - multi-grating and fan-out poling layouts (method and reference
 * in deltak/chip.h).
 *
 * The tuning range of one grating over the oven is sampled at OVEN_SAMPLES
 * temperatures (tuning is monotonic away from degeneracy, but sampling
 * also catches a turning curve). The target wavelength at one (Λ, T) is a
 * root of Δk in the target's share of the pump frequency, searched in a
 * window about a guess so that the neighbouring branch is not taken.
 */
#include <math.h>

#include "deltak/chip.h"
#include "deltak/roots.h"

#define OVEN_SAMPLES 9
#define WINDOW 0.2        /* frequency-share window about the guess */
#define WINDOW_SCAN 80
#define MIN_PROGRESS 1e-4 /* µm: a grating must advance the start by this */

static dk_waves
waves_for(double pump_um, int signal, double target_um)
{
    dk_waves w = {pump_um, 0, 0};
    double other = dk_third_wave_um(pump_um, target_um);
    w.signal_um = signal ? target_um : other;
    w.idler_um = signal ? other : target_um;
    return w;
}

dk_status
dk_chip_period_for(dk_qpm *q, double pump_um, int signal, double target_um,
                   double temp_c, double *period_um, dk_error *err)
{
    if (!(target_um > pump_um))
        return dk_error_set(err, DK_EINVAL,
                            "target %.6g um must be longer than the pump",
                            target_um);
    dk_waves w = waves_for(pump_um, signal, target_um);
    double at_t;
    return dk_qpm_period(q, &w, temp_c, period_um, &at_t, err);
}

typedef struct share_probe {
    dk_qpm *q;
    double pump, period, temp;
    int signal;
} share_probe;

/* x = ν_target / ν_pump */
static double
dk_of_share(double x, void *p)
{
    share_probe *sp = p;
    dk_waves w = waves_for(sp->pump, sp->signal, sp->pump / x);
    return dk_qpm_delta_k(sp->q, &w, sp->temp, sp->period);
}

double
dk_chip_target_at(dk_qpm *q, double pump_um, int signal, double period_um,
                  double temp_c, double guess_um)
{
    share_probe sp = {q, pump_um, period_um, temp_c, signal};
    double g = pump_um / guess_um;
    double lo = fmax(g - WINDOW, 1e-4), hi = fmin(g + WINDOW, 1 - 1e-4);
    double x[16];
    int n;
    if (dk_roots_all(dk_of_share, &sp, lo, hi, WINDOW_SCAN, 1e-13, x, 16, &n,
                     NULL) ||
        n == 0)
        return NAN;
    double best = x[0];
    for (int i = 1; i < n; i++)
        if (fabs(x[i] - g) < fabs(best - g))
            best = x[i];
    return pump_um / best;
}

/* The range of the target over the oven for one grating. */
static int
oven_range(dk_qpm *q, double pump_um, int signal, double period,
           const double oven[2], double guess, dk_grating *g)
{
    g->period_um = period;
    g->lo_um = INFINITY;
    g->hi_um = -INFINITY;
    for (int k = 0; k < OVEN_SAMPLES; k++) {
        double t = oven[0] + (oven[1] - oven[0]) * k / (OVEN_SAMPLES - 1);
        double lam = dk_chip_target_at(q, pump_um, signal, period, t, guess);
        if (!isfinite(lam))
            continue;
        if (lam < g->lo_um)
            g->lo_um = lam, g->t_lo_c = t;
        if (lam > g->hi_um)
            g->hi_um = lam, g->t_hi_c = t;
    }
    return isfinite(g->lo_um) && isfinite(g->hi_um);
}

dk_status
dk_chip_gratings(dk_qpm *q, double pump_um, int signal, double lo_um,
                 double hi_um, const double oven_c[2], double overlap,
                 dk_grating *out, int max, int *n, dk_error *err)
{
    *n = 0;
    if (!(lo_um < hi_um) || !(lo_um > pump_um))
        return dk_error_set(err, DK_EINVAL,
                            "target range %.6g-%.6g um must have low < high "
                            "and lie beyond the pump",
                            lo_um, hi_um);
    if (!(oven_c[0] < oven_c[1]))
        return dk_error_set(err, DK_EINVAL,
                            "oven range must have low < high");
    if (!(overlap >= 0 && overlap < 0.9))
        return dk_error_set(err, DK_EINVAL,
                            "overlap %g must lie in [0, 0.9)", overlap);
    double start = lo_um;
    while (start < hi_um) {
        if (*n >= max)
            return dk_error_set(err, DK_ERANGE,
                                "more than %d gratings would be needed; "
                                "widen the oven range",
                                max);
        /* Try the start at either end of the oven; keep the grating whose
         * range begins at the start and reaches furthest. */
        dk_grating best = {0};
        int have = 0;
        for (int end = 0; end < 2; end++) {
            double p;
            if (dk_chip_period_for(q, pump_um, signal, start, oven_c[end], &p,
                                   err))
                return err ? err->status : DK_EINVAL;
            dk_grating g = {0};
            if (!oven_range(q, pump_um, signal, p, oven_c, start, &g))
                continue;
            if (g.lo_um < start - 1e-6 * start)
                continue;   /* this grating reaches below the start */
            if (!have || g.hi_um > best.hi_um)
                best = g, have = 1;
        }
        if (!have || best.hi_um - start < MIN_PROGRESS)
            return dk_error_set(err, DK_ENOROOT,
                                "no grating tunes beyond %.6g um over the "
                                "oven range %.4g-%.4g C",
                                start, oven_c[0], oven_c[1]);
        out[(*n)++] = best;
        if (best.hi_um >= hi_um)
            break;
        double next = best.hi_um - overlap * (best.hi_um - best.lo_um);
        start = fmax(next, start + MIN_PROGRESS);
    }
    return DK_OK;
}
