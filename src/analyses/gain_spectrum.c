/*
 * gain_spectrum.c - gain and conversion of a design at its operating
 * point (see deltak/gain_spectrum.h): the parametric gain against signal
 * wavelength and its FWHM, and SHG efficiency plane-wave, depleted and
 * focused.
 */
#include <math.h>
#include <stdlib.h>

#include "deltak/constants.h"

#include "deltak/gain_spectrum.h"
#include "deltak/roots.h"

#define STEP_REL 1e-4     /* first outward step, relative to λs */
#define GROWTH 1.5
#define REACH 0.3         /* search at most ±30 % of λs */

double
dk_design_gain(dk_design *d, double gamma_per_mm, double signal_um)
{
    double dk = dk_design_delta_k(d, DK_TOL_SIGNAL, signal_um);
    double g;
    if (!isfinite(dk) ||
        dk_opa_signal_gain(gamma_per_mm, dk * 1e3, d->length_mm, &g, NULL))
        return NAN;
    return g;
}

typedef struct half_probe {
    dk_design *d;
    double gamma, half;   /* half = (G0 − 1)/2 */
} half_probe;

static double
above_half(double x, void *p)
{
    half_probe *h = p;
    double g = dk_design_gain(h->d, h->gamma, x);
    return isfinite(g) ? g - 1 - h->half : NAN;
}

static int
edge(half_probe *h, double x0, int dir, double *out)
{
    double a = x0, fa = above_half(a, h), s = STEP_REL * x0;
    while (fabs(a - x0) < REACH * x0) {
        double b = a + dir * s, fb = above_half(b, h);
        if (!isfinite(fb))
            return 0;
        if (fa > 0 && fb <= 0)
            return !dk_root_bracketed(above_half, h, fmin(a, b), fmax(a, b),
                                      1e-12 * x0, out, NULL);
        a = b, fa = fb, s *= GROWTH;
    }
    return 0;
}

dk_status
dk_design_gain_fwhm(dk_design *d, double gamma_per_mm, double *lo_um,
                    double *hi_um, dk_error *err)
{
    double x0 = d->waves.signal_um;
    double g0 = dk_design_gain(d, gamma_per_mm, x0);
    if (!isfinite(g0))
        return dk_error_set(err, DK_EDOM, "the gain is not finite at the "
                                          "operating point");
    half_probe h = {d, gamma_per_mm, 0.5 * (g0 - 1)};
    if (!(h.half > 0))
        return dk_error_set(err, DK_EDOM, "no gain at the operating point");
    if (!edge(&h, x0, -1, lo_um) || !edge(&h, x0, +1, hi_um))
        return dk_error_set(err, DK_ENOROOT,
                            "the gain band reaches beyond 30 %% of the signal "
                            "wavelength or the crystal's range");
    return DK_OK;
}

dk_status
dk_design_opa(dk_design *d, double pump_gw_per_cm2, dk_opa_result *out,
              dk_error *err)
{
    dk_opa_result *r = out;
    *r = (dk_opa_result){0};
    r->first_order_thz = r->low_gain_thz = r->estimate_thz = NAN;
    dk_status s = dk_pulse_props_of(d, &r->pulse, err);
    if (s)
        return s;
    if (dk_design_deff_scaled(d, &r->deff, NULL) == DK_OK)
        r->deff_pm_per_v = r->deff.scaled_pm_per_v;
    else
        r->deff_pm_per_v = NAN;
    if (!isfinite(r->deff_pm_per_v) || r->deff_pm_per_v == 0)
        return dk_error_set(err, DK_EDOM,
                            "%s has no usable d_eff for this design (%s)",
                            d->crystal->id,
                            d->crystal->has_nonlinear
                                ? "d_eff vanishes in this direction and "
                                  "polarisation"
                                : "the crystal file gives no nonlinear "
                                  "coefficients");
    const dk_waves *w = &d->waves;
    const dk_pulse_props *pp = &r->pulse;
    if ((s = dk_opa_gamma_per_mm(r->deff_pm_per_v, pp->w[2].n, pp->w[0].n,
                                 pp->w[1].n, w->signal_um, w->idler_um,
                                 pump_gw_per_cm2, &r->gamma_per_mm, err)) ||
        (s = dk_opa_signal_gain(r->gamma_per_mm, 0, d->length_mm, &r->gain,
                                err)))
        return s;
    /* Matched group velocities (the broadband geometry): the first-order
     * estimate diverges and does not apply. */
    if (fabs(pp->gvm_fs_per_mm[2]) > 1e-3) {
        dk_opa_bandwidth_thz(r->gamma_per_mm, d->length_mm,
                             pp->gvm_fs_per_mm[2], &r->first_order_thz, NULL);
        /* Δk = 2π Δν GVM: the sinc² width 4·1.39156/L in frequency
         * (GVM fs/mm, L mm: THz = 1e3 / (fs)). */
        r->low_gain_thz = 1e3 * 4 * DK_SINC2_HALF_U /
                          (2 * M_PI * d->length_mm *
                           fabs(pp->gvm_fs_per_mm[2]));
    }
    r->high_gain = r->gamma_per_mm * d->length_mm > DK_GAIN_REGIME_GL;
    r->estimate_thz = r->high_gain ? r->first_order_thz : r->low_gain_thz;
    if (dk_design_gain_fwhm(d, r->gamma_per_mm, &r->signal_lo_um,
                            &r->signal_hi_um, err) == DK_OK) {
        r->have_band = 1;
        r->idler_lo_um = dk_third_wave_um(w->pump_um, r->signal_hi_um);
        r->idler_hi_um = dk_third_wave_um(w->pump_um, r->signal_lo_um);
        r->band_thz = DK_C_M_PER_S *
                      (1 / r->signal_lo_um - 1 / r->signal_hi_um) * 1e-6;
    }
    return DK_OK;
}

dk_status
dk_design_gain_spectrum(dk_design *d, double gamma_per_mm, double lo_um,
                        double hi_um, int n, double *signal_um, double *gain,
                        dk_error *err)
{
    if (n < 2 || !(lo_um > 0) || !(hi_um > lo_um) || !isfinite(hi_um))
        return dk_error_set(err, DK_EINVAL,
                            "a gain spectrum needs 2 or more points over "
                            "lo < hi");
    for (int k = 0; k < n; k++) {
        signal_um[k] = lo_um + (hi_um - lo_um) * k / (n - 1);
        gain[k] = dk_design_gain(d, gamma_per_mm, signal_um[k]);
    }
    return DK_OK;
}

/* Indices of fundamental and second harmonic at the operating point. */
static dk_status
shg_indices(dk_design *d, double *nf, double *nsh, double *rho,
            dk_error *err)
{
    dk_pulse_props pp;
    dk_status s = dk_pulse_props_of(d, &pp, err);
    if (s)
        return s;
    *nf = pp.w[0].n;
    *nsh = pp.w[2].n;
    *rho = pp.walkoff_rad[0];
    return DK_OK;
}

dk_status
dk_design_shg_plane(dk_design *d, double deff_pm_per_v,
                    double fund_gw_per_cm2, double *efficiency,
                    dk_error *err)
{
    double nf, nsh, rho;
    dk_status s = shg_indices(d, &nf, &nsh, &rho, err);
    return s ? s
             : dk_shg_efficiency(deff_pm_per_v, nf, nsh, d->waves.signal_um,
                                 d->length_mm, fund_gw_per_cm2, 0,
                                 efficiency, err);
}

dk_status
dk_design_shg_depleted(dk_design *d, double deff_pm_per_v,
                       double fund_gw_per_cm2, int nz, double *z_mm,
                       double *efficiency, dk_error *err)
{
    double nf, nsh, rho;
    dk_status s = shg_indices(d, &nf, &nsh, &rho, err);
    if (s)
        return s;
    if (nz < 2)
        return dk_error_set(err, DK_EINVAL, "need two or more positions");
    dk_twm m;
    dk_twm_point *pt = malloc((size_t)nz * sizeof *pt);
    if (!pt)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    for (int k = 0; k < nz; k++)
        z_mm[k] = d->length_mm * k / (nz - 1);
    s = dk_twm_shg_init(&m, d->waves.signal_um, nf, nsh, deff_pm_per_v,
                        fund_gw_per_cm2, 0, err);
    if (!s)
        s = dk_twm_propagate(&m, z_mm, nz, pt, err);
    for (int k = 0; !s && k < nz; k++)
        efficiency[k] = fund_gw_per_cm2 > 0
                            ? pt[k].intensity_gw_per_cm2[2] / fund_gw_per_cm2
                            : 0;
    free(pt);
    return s;
}

dk_status
dk_design_shg_focused(dk_design *d, double deff_pm_per_v, double power_w,
                      double waist_um, dk_focus_result *out, dk_error *err)
{
    double nf, nsh, rho;
    dk_status s = shg_indices(d, &nf, &nsh, &rho, err);
    if (s)
        return s;
    const double lam = d->waves.signal_um;
    dk_focus_result *r = out;
    r->power_w = power_w;
    if ((s = dk_bk_walkoff_b(rho, d->length_mm, nf, lam, &r->walkoff_b,
                             err)) ||
        (s = dk_bk_optimum(r->walkoff_b, &r->xi_opt, &r->h_opt, NULL, err)))
        return s;
    if (isfinite(waist_um)) {
        r->waist_um = waist_um;
        if ((s = dk_bk_xi(d->length_mm, waist_um, nf, lam, &r->xi, err)))
            return s;
    } else {
        /* w0 from b = L/ξ = 2π n w0²/λ at the optimum ξ. */
        r->xi = r->xi_opt;
        double b_mm = d->length_mm / r->xi;
        r->waist_um = 1e3 * sqrt(b_mm * lam * 1e-3 / (2 * DK_PI * nf));
    }
    if ((s = dk_bk_h_max(r->xi, r->walkoff_b, &r->h, NULL, err)))
        return s;
    return dk_bk_shg_efficiency(deff_pm_per_v, nf, nsh, lam, d->length_mm,
                                power_w, r->h, &r->efficiency, err);
}
