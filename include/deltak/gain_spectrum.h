/*
 * gain_spectrum.h - gain and conversion of a design at its operating
 * point: the small-signal parametric gain, its spectrum and bandwidth,
 * and SHG efficiency (plane wave, depleted, focused), built on the
 * formulas of deltak/gain.h with the design's d_eff, indices and
 * walk-off.
 *
 * G(λs) = 1 + (Γ/g)² sinh²(gL), g² = Γ² − (Δk(λs)/2)² (deltak/gain.h),
 * with Δk(λs) from the design (deltak/tolerance.h: the pump and, for a
 * noncollinear design, the pump and signal directions held) and Γ held at
 * its value at the operating point (its slow change with λs across the
 * gain band is neglected). The width is that of the amplified part G − 1,
 * the half-maximum points found by stepping outward and Brent refinement.
 */
#ifndef DK_GAIN_SPECTRUM_H
#define DK_GAIN_SPECTRUM_H

#include "deltak/gain.h"
#include "deltak/pulse.h"
#include "deltak/tolerance.h"

/* ΓL at which the low-gain width 4·1.39156/L and the high-gain width
 * 4 (ln2 Γ/L)^½ of Δk are equal: (1.39156)²/ln2 = 2.7937. Below it the
 * gain band is the sinc² acceptance, above it the high-gain formula
 * (R. L. Byer, in Quantum Electronics, Vol. I, Academic Press (1975);
 * Cerullo and De Silvestri, Rev. Sci. Instrum. 74, 1 (2003), eq. 9 —
 * the crossover is our algebra on the two limits). */
#define DK_GAIN_REGIME_GL 2.7937

/* G at signal wavelength @signal_um; NAN where undefined. */
double dk_design_gain(dk_design *d, double gamma_per_mm, double signal_um);

/*
 * dk_design_gain_fwhm:
 * The signal wavelengths @lo_um < @hi_um where G − 1 falls to half its
 * value at the operating point.
 * Returns: DK_OK; DK_ENOROOT when an edge lies beyond ±30 % of the signal
 * wavelength or the transparency range; DK_EDOM when G overflows.
 */
dk_status dk_design_gain_fwhm(dk_design *d, double gamma_per_mm,
                              double *lo_um, double *hi_um, dk_error *err);

/* Parametric amplification of a design (three-wave mixing). */
typedef struct dk_opa_result {
    double deff_pm_per_v;     /* as used: Miller-scaled when possible
                               * (dk_design_deff_scaled) */
    dk_deff_scaled deff;      /* measured, factor, why not scaled */
    double gamma_per_mm;      /* Γ */
    double gain;              /* G at phase matching */
    int have_band;            /* 1: the FWHM below was found */
    double signal_lo_um, signal_hi_um;   /* FWHM of G − 1 */
    double idler_lo_um, idler_hi_um;
    double band_thz;          /* the same in frequency */
    double first_order_thz;   /* high-gain estimate from the signal-idler
                               * GVM (deltak/gain.h); NAN when GVM = 0 */
    double low_gain_thz;      /* low-gain estimate: the sinc² width
                               * 4·1.39156/(2π L |GVM|) = 0.8859/(L|GVM|);
                               * NAN when GVM = 0 */
    int high_gain;            /* 1 when ΓL > DK_GAIN_REGIME_GL: the
                               * high-gain estimate is the one that
                               * applies, else the low-gain one */
    double estimate_thz;      /* the estimate of the regime (one of the
                               * two above) */
    dk_pulse_props pulse;     /* indices, GVM at the operating point */
} dk_opa_result;

/*
 * dk_design_opa:
 * Γ, G and the gain bandwidth of @d for a pump intensity of
 * @pump_gw_per_cm2.
 * Returns: DK_OK (have_band 0 when the band edge was not found, with the
 * reason in @err's message); DK_EDOM when d_eff is zero or undefined
 * ("no usable d_eff"); the index errors.
 */
dk_status dk_design_opa(dk_design *d, double pump_gw_per_cm2,
                        dk_opa_result *out, dk_error *err);

/*
 * dk_design_gain_spectrum:
 * @n signal wavelengths evenly over [@lo_um, @hi_um] in @signal_um and
 * the gain there in @gain (NAN where undefined).
 * Returns: DK_OK or DK_EINVAL (n < 2, bad range).
 */
dk_status dk_design_gain_spectrum(dk_design *d, double gamma_per_mm,
                                  double lo_um, double hi_um, int n,
                                  double *signal_um, double *gain,
                                  dk_error *err);

/* Focused SHG of a design (Boyd–Kleinman). */
typedef struct dk_focus_result {
    double power_w;
    double waist_um;          /* as given, or the optimum's */
    double xi, walkoff_b, h;  /* ξ = L/b, B, h(ξ, B) maximised over σ */
    double xi_opt, h_opt;     /* the optimum for this B */
    double efficiency;        /* P_2ω / P_ω */
} dk_focus_result;

/*
 * dk_design_shg_focused:
 * @power_w: fundamental power; @waist_um: waist radius, or NAN for the
 * optimum focusing of this walk-off.
 * Returns: DK_OK or the errors of deltak/gain.h.
 */
dk_status dk_design_shg_focused(dk_design *d, double deff_pm_per_v,
                                double power_w, double waist_um,
                                dk_focus_result *out, dk_error *err);

/*
 * dk_design_shg_plane:
 * Plane-wave, low-conversion SHG efficiency at @fund_gw_per_cm2.
 */
dk_status dk_design_shg_plane(dk_design *d, double deff_pm_per_v,
                              double fund_gw_per_cm2, double *efficiency,
                              dk_error *err);

/*
 * dk_design_shg_depleted:
 * SHG efficiency with pump depletion (coupled-wave ODE) at @nz positions
 * evenly from 0 to the crystal length: @z_mm and @efficiency.
 */
dk_status dk_design_shg_depleted(dk_design *d, double deff_pm_per_v,
                                 double fund_gw_per_cm2, int nz,
                                 double *z_mm, double *efficiency,
                                 dk_error *err);

#endif /* DK_GAIN_SPECTRUM_H */
