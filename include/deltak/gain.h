/*
 * gain.h - conversion efficiency and parametric gain of a three-wave
 * interaction, from physical inputs that other modules have already
 * computed (refractive indices, d_eff, wavelengths, length, intensity,
 * Δk). Nothing here reads the crystal database.
 *
 * Three parts, one source file each:
 *   src/analyses/gain_parametric.c  plane waves, undepleted pump: OPA coupling Γ,
 *                          signal gain G(Γ, Δk, L), gain bandwidth, and
 *                          low-conversion SHG / SFG / DFG efficiency;
 *   src/analyses/gain_focus.c       focused Gaussian beams: the Boyd–Kleinman
 *                          function h(σ, ξ, B), its maximum over σ and the
 *                          optimum focusing ξ, with the helpers B and ξ;
 *   src/analyses/gain_depletion.c   plane waves with pump depletion: the coupled-
 *                          wave equations integrated with GSL's ODE solver.
 *
 * Conventions shared by all three:
 *   - Fields E_j = A_j exp(i(k_j z − ω_j t)) + c.c., intensity
 *     I_j = 2 n_j ε0 c |A_j|² (Boyd, Nonlinear Optics, 3rd ed., §2.2–2.3).
 *   - The waves are numbered 1, 2, 3 with ω3 = ω1 + ω2; for an OPA 1 is
 *     the signal, 2 the idler, 3 the pump; Δk = k3 − k1 − k2, the same
 *     sign as the material mismatch k_p − k_s − k_i of deltak/qpm.h.
 *   - Units: d_eff in pm/V, intensities in GW/cm², powers in W,
 *     wavelengths in µm (vacuum), lengths in mm, Δk in rad/mm, Γ in 1/mm,
 *     group-velocity mismatch in fs/mm, frequencies in THz.
 *   - For a QPM crystal pass the grating-reduced d_eff (dk_qpm_deff) and
 *     the residual Δk (dk_qpm_delta_k, converted to rad/mm).
 */
#ifndef DK_GAIN_H
#define DK_GAIN_H

#include "deltak/status.h"

#include "deltak/constants.h"   /* DK_EPS0_F_PER_M, DK_HBAR_J_S */

/* ---- Plane waves, undepleted pump (src/analyses/gain_parametric.c) ---------- */

/*
 * dk_opa_gamma_per_mm:
 * The parametric coupling constant of a plane-wave OPA,
 *   Γ² = 8π² d_eff² I_p / (ε0 c n_p n_s n_i λs λi)     (SI),
 * returned in 1/mm. The same formula with the roles renamed gives the
 * rate at which any one wave of intensity I couples the other two.
 * @deff_pm_per_v: effective nonlinear coefficient, pm/V, finite (its sign
 *   does not matter)
 * @n_pump, @n_signal, @n_idler: phase indices of the three waves, > 0
 * @signal_um, @idler_um: vacuum wavelengths of signal and idler, µm, > 0
 * @pump_gw_per_cm2: pump intensity, GW/cm², ≥ 0
 * @gamma_per_mm: out, Γ ≥ 0 in 1/mm
 *
 * Returns: DK_OK; DK_EINVAL for an argument outside its range.
 */
dk_status dk_opa_gamma_per_mm(double deff_pm_per_v, double n_pump,
                              double n_signal, double n_idler,
                              double signal_um, double idler_um,
                              double pump_gw_per_cm2, double *gamma_per_mm,
                              dk_error *err);

/*
 * dk_opa_signal_gain:
 * Small-signal plane-wave gain of a seeded signal with the idler starting
 * at zero,
 *   G = I_s(L) / I_s(0) = 1 + (Γ/g)² sinh²(gL),  g² = Γ² − (Δk/2)²,
 * continued analytically for g² < 0 (sinh(gL)/g → sin(|g|L)/|g|) and at
 * g = 0 (sinh(gL)/g → L). The idler photon flux at L is (G − 1) times the
 * seed's (Manley–Rowe).
 * @gamma_per_mm: Γ from dk_opa_gamma_per_mm, 1/mm, ≥ 0
 * @dk_rad_per_mm: Δk = k_p − k_s − k_i, rad/mm, finite
 * @length_mm: crystal length, mm, ≥ 0
 * @gain: out, G ≥ 1
 *
 * Returns: DK_OK; DK_EINVAL for an argument outside its range; DK_EDOM
 * when G overflows a double (gL above about 354).
 */
dk_status dk_opa_signal_gain(double gamma_per_mm, double dk_rad_per_mm,
                             double length_mm, double *gain, dk_error *err);

/*
 * dk_opa_dk_fwhm_rad_per_mm:
 * The full width in Δk (rad/mm) at which the amplified part G − 1 of the
 * exact formula above falls to half its value at Δk = 0, found by root
 * finding. At low gain it tends to the sinc² width 4·1.39156/L; at high
 * gain to 4 (ln2 · Γ/L)^½, the basis of dk_opa_bandwidth_thz. Divided by
 * 2π |1/v_gs − 1/v_gi| it gives the gain bandwidth in frequency to first
 * order in the detuning.
 * @gamma_per_mm: 1/mm, ≥ 0
 * @length_mm: mm, > 0
 * @fwhm_rad_per_mm: out, > 0
 *
 * Returns: DK_OK; DK_EINVAL; DK_EDOM when the gain overflows; DK_ENOCONV
 * if the root solver fails.
 */
dk_status dk_opa_dk_fwhm_rad_per_mm(double gamma_per_mm, double length_mm,
                                    double *fwhm_rad_per_mm, dk_error *err);

/*
 * dk_opa_bandwidth_thz:
 * The high-gain, first-order estimate of the OPA gain bandwidth (FWHM in
 * signal frequency, the idler following by energy conservation),
 *   Δν = (2 √ln2 / π) (Γ/L)^½ / |1/v_gs − 1/v_gi|.
 * Valid for ΓL ≫ 1 away from signal–idler group-velocity matching; at
 * ΓL = 10 it is about 4.5 % narrower than the exact width of
 * dk_opa_dk_fwhm_rad_per_mm.
 * @gamma_per_mm: 1/mm, > 0
 * @length_mm: mm, > 0
 * @gvm_fs_per_mm: 1/v_gs − 1/v_gi in fs/mm, finite, non-zero (either
 *   sign)
 * @fwhm_thz: out, THz
 *
 * Returns: DK_OK; DK_EINVAL for an argument outside its range; DK_EDOM
 * when the group-velocity mismatch is zero (the first-order estimate
 * diverges: the bandwidth is then set by group-velocity dispersion).
 */
dk_status dk_opa_bandwidth_thz(double gamma_per_mm, double length_mm,
                               double gvm_fs_per_mm, double *fwhm_thz,
                               dk_error *err);

/*
 * dk_shg_efficiency:
 * Plane-wave second-harmonic conversion efficiency at low conversion
 * (undepleted fundamental),
 *   η = I_2ω / I_ω = 8π² d_eff² L² I_ω / (ε0 c n_ω² n_2ω λ_ω²)
 *                    · sinc²(ΔkL/2),           sinc x = sin x / x.
 * Valid while η ≪ 1; dk_twm_propagate gives the depleted result.
 * @deff_pm_per_v: pm/V, finite
 * @n_fund, @n_sh: phase indices at ω and 2ω, > 0
 * @fund_um: fundamental vacuum wavelength, µm, > 0
 * @length_mm: mm, ≥ 0
 * @fund_gw_per_cm2: fundamental intensity, GW/cm², ≥ 0
 * @dk_rad_per_mm: Δk = k_2ω − 2 k_ω, rad/mm, finite
 * @eta: out, η ≥ 0 (may exceed 1 where the formula no longer applies)
 *
 * Returns: DK_OK; DK_EINVAL for an argument outside its range.
 */
dk_status dk_shg_efficiency(double deff_pm_per_v, double n_fund,
                            double n_sh, double fund_um, double length_mm,
                            double fund_gw_per_cm2, double dk_rad_per_mm,
                            double *eta, dk_error *err);

/*
 * dk_mixing_intensity_gw_per_cm2:
 * The intensity generated by sum- or difference-frequency mixing of two
 * undepleted plane waves a and b, at low conversion:
 *   I_out = 8π² d_eff² L² I_a I_b / (ε0 c n_a n_b n_out λ_out²)
 *           · sinc²(ΔkL/2).
 * SFG: a, b = ω1, ω2, out = ω3. DFG: a, b = pump and signal, out = idler.
 * Two distinguishable beams are assumed; SHG of one beam is
 * dk_shg_efficiency (which equals this with I_a = I_b = I_ω/2).
 * @deff_pm_per_v: pm/V, finite
 * @n_a, @n_b, @n_out: phase indices, > 0
 * @out_um: vacuum wavelength of the generated wave, µm, > 0
 * @length_mm: mm, ≥ 0
 * @a_gw_per_cm2, @b_gw_per_cm2: input intensities, GW/cm², ≥ 0
 * @dk_rad_per_mm: rad/mm, finite
 * @out_gw_per_cm2: out, generated intensity, GW/cm²
 *
 * Returns: DK_OK; DK_EINVAL for an argument outside its range.
 */
dk_status dk_mixing_intensity_gw_per_cm2(double deff_pm_per_v, double n_a,
                                         double n_b, double n_out,
                                         double out_um, double length_mm,
                                         double a_gw_per_cm2,
                                         double b_gw_per_cm2,
                                         double dk_rad_per_mm,
                                         double *out_gw_per_cm2,
                                         dk_error *err);

/* ---- Focused Gaussian beams: Boyd–Kleinman (src/analyses/gain_focus.c) ------ */

/*
 * dk_bk_h:
 * The Boyd–Kleinman focusing function for a lossless crystal with the
 * waist at its centre (μ = 0, κ = 0),
 *   h(σ, ξ, B) = 1/(4ξ) ∫∫_{−ξ}^{ξ} dτ dτ'
 *       exp(iσ(τ−τ') − B²(τ−τ')²/ξ) / ((1 + iτ)(1 − iτ')),
 * which is real. h → ξ for ξ ≪ 1 (weak focusing, B²ξ ≪ 1); for B = 0
 * its maximum over σ and ξ is 1.068 at ξ = 2.84, σ = 0.57. Quadrature
 * target: 1e-11 relative or 1e-13·min(1, ξ) absolute, the larger.
 * @sigma: σ = b Δk / 2 (b the confocal parameter), finite, |σ| ≤ 1e4
 * @xi: focusing parameter ξ = L/b, 1e-6 ≤ ξ ≤ 1e3
 * @walkoff_b: walk-off parameter B (dk_bk_walkoff_b), 0 ≤ B ≤ 1e3
 * @h: out, h ≥ 0
 *
 * Returns: DK_OK; DK_EINVAL for an argument outside its range;
 * DK_ENOCONV if the quadrature fails to reach its tolerance; DK_ENOMEM.
 */
dk_status dk_bk_h(double sigma, double xi, double walkoff_b, double *h,
                  dk_error *err);

/*
 * dk_bk_h_max:
 * h_m(ξ, B) = max over σ of h(σ, ξ, B), and the σ_m where it occurs (the
 * optimum phase mismatch is Δk = 2σ_m / b). Searched by a scan over
 * −1 ≤ σ ≤ 3 fine enough to resolve the side lobes, then GSL's Brent
 * minimiser; the maximum has always been found in 0 < σ < 1.1.
 * @xi: 1e-6 ≤ ξ ≤ 100
 * @walkoff_b: 0 ≤ B ≤ 1e3
 * @h_max: out, h_m
 * @sigma_max: out, σ_m; may be NULL
 *
 * Returns: DK_OK; DK_EINVAL; DK_ENOCONV (quadrature or minimiser, or
 * the maximum at the edge of the scanned σ range); DK_ENOMEM.
 */
dk_status dk_bk_h_max(double xi, double walkoff_b, double *h_max,
                      double *sigma_max, dk_error *err);

/*
 * dk_bk_optimum:
 * The focusing that maximises h_m(ξ, B) for a given B: ξ_m, h_mm and σ_m.
 * For B = 0: ξ_m = 2.84, h_mm = 1.068; ξ_m falls towards 1.39 as B grows.
 * Searched over 0.5 ≤ ξ ≤ 10 (log scan, then Brent in log ξ).
 * @walkoff_b: 0 ≤ B ≤ 1e3
 * @xi_opt: out, ξ_m
 * @h_opt: out, h_mm = h_m(ξ_m, B)
 * @sigma_opt: out, σ_m at ξ_m; may be NULL
 *
 * Returns: DK_OK; DK_EINVAL; DK_ENOCONV (as dk_bk_h_max, or the optimum
 * at the edge of the scanned ξ range); DK_ENOMEM.
 */
dk_status dk_bk_optimum(double walkoff_b, double *xi_opt, double *h_opt,
                        double *sigma_opt, dk_error *err);

/*
 * dk_bk_confocal_mm:
 * The confocal parameter b = w0² k1 = 2π n1 w0² / λ1 of a Gaussian beam
 * of waist radius w0 (1/e² intensity), in mm.
 * @waist_um: w0, µm, > 0
 * @n1: phase index of the fundamental in the crystal, > 0
 * @lambda1_um: its vacuum wavelength, µm, > 0
 * @confocal_mm: out, b in mm
 *
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_bk_confocal_mm(double waist_um, double n1, double lambda1_um,
                            double *confocal_mm, dk_error *err);

/*
 * dk_bk_xi:
 * ξ = L / b for a crystal of length L and a waist w0 (b as above).
 * @length_mm: L, mm, > 0
 * @waist_um, @n1, @lambda1_um: as dk_bk_confocal_mm
 * @xi: out
 *
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_bk_xi(double length_mm, double waist_um, double n1,
                   double lambda1_um, double *xi, dk_error *err);

/*
 * dk_bk_walkoff_b:
 * Boyd and Kleinman's walk-off parameter B = ρ (L k1)^½ / 2, with
 * k1 = 2π n1 / λ1 the wave number of the fundamental in the crystal.
 * @rho_rad: walk-off angle ρ, rad, ≥ 0 (its sign does not matter)
 * @length_mm: L, mm, > 0
 * @n1, @lambda1_um: as dk_bk_confocal_mm
 * @walkoff_b: out, B ≥ 0
 *
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_bk_walkoff_b(double rho_rad, double length_mm, double n1,
                          double lambda1_um, double *walkoff_b,
                          dk_error *err);

/*
 * dk_bk_shg_efficiency:
 * Second-harmonic power over fundamental power for a focused TEM00 beam
 * at low conversion,
 *   P_2ω / P_ω = 2 ω² d_eff² k1 L P_ω h / (π ε0 c³ n_ω² n_2ω),
 * with k1 = n_ω ω / c; for ξ ≪ 1 (h = ξ) it equals the plane-wave result
 * integrated over the Gaussian profile.
 * @deff_pm_per_v: pm/V, finite
 * @n_fund, @n_sh: phase indices at ω and 2ω, > 0
 * @fund_um: µm, > 0
 * @length_mm: mm, > 0
 * @fund_w: fundamental power, W, ≥ 0
 * @h: the focusing function, from dk_bk_h or dk_bk_h_max, ≥ 0
 * @eta: out, P_2ω / P_ω
 *
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_bk_shg_efficiency(double deff_pm_per_v, double n_fund,
                               double n_sh, double fund_um, double length_mm,
                               double fund_w, double h, double *eta,
                               dk_error *err);

/* ---- Plane waves with depletion (src/analyses/gain_depletion.c) ------------- */

/* One wave at the entrance face. */
typedef struct dk_twm_wave {
    double lambda_um;            /* vacuum wavelength, µm, > 0 */
    double n;                    /* phase index, > 0 */
    double intensity_gw_per_cm2; /* at z = 0, GW/cm², ≥ 0 */
    double phase_rad;            /* phase of A_j at z = 0, rad */
} dk_twm_wave;

/* A plane-wave three-wave interaction. */
typedef struct dk_twm {
    dk_twm_wave wave[3];   /* [0] = ω1, [1] = ω2, [2] = ω3 = ω1 + ω2 */
    double deff_pm_per_v;  /* pm/V, finite */
    double dk_rad_per_mm;  /* Δk = k3 − k1 − k2, rad/mm, finite */
} dk_twm;

/* The three waves at one position. */
typedef struct dk_twm_point {
    double z_mm;                       /* position, mm */
    double intensity_gw_per_cm2[3];    /* GW/cm² */
    double photon_flux_per_cm2_s[3];   /* I / ħω, photons per cm² per s */
    double phase_rad[3];               /* arg A_j in (−π, π]; 0 if A_j = 0 */
} dk_twm_point;

/*
 * dk_twm_shg_init:
 * Fill @m for type-I-like SHG of one beam: the degenerate case, written
 * as waves 1 and 2 at ω each carrying half the fundamental intensity in
 * phase (this reproduces the degenerate SHG equations exactly), wave 3
 * the second harmonic starting at zero. The fundamental at z is then
 * wave[0] + wave[1] of the result.
 * @fund_um: µm, > 0
 * @n_fund, @n_sh: phase indices at ω and 2ω, > 0
 * @deff_pm_per_v: pm/V, finite
 * @fund_gw_per_cm2: GW/cm², ≥ 0
 * @dk_rad_per_mm: k_2ω − 2k_ω, rad/mm, finite
 *
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_twm_shg_init(dk_twm *m, double fund_um, double n_fund,
                          double n_sh, double deff_pm_per_v,
                          double fund_gw_per_cm2, double dk_rad_per_mm,
                          dk_error *err);

/*
 * dk_twm_propagate:
 * Integrates the plane-wave coupled-wave equations (slowly varying
 * envelopes, lossless, no dispersion within each wave) from z = 0 and
 * reports the waves at each requested position. Wave 3 is depleted (SFG,
 * SHG) or amplifies waves 1 and 2 (DFG, OPA) as the phases dictate;
 * spontaneous generation is not modelled, so a run with no light at
 * ω1 or ω2 and none at ω3 stays dark.
 * @m: the interaction; 1/λ3 must equal 1/λ1 + 1/λ2 to 1e-9 relative
 * @z_mm: positions, mm, 0 ≤ z_0 ≤ z_1 ≤ … ≤ 1e6
 * @nz: number of positions, ≥ 1
 * @out: out, @nz points
 *
 * Returns: DK_OK; DK_EINVAL for a bad field in @m, wavelengths that do
 * not conserve energy, or bad positions; DK_ENOMEM; DK_ENOCONV if the ODE
 * solver cannot reach its tolerance.
 */
dk_status dk_twm_propagate(const dk_twm *m, const double *z_mm, int nz,
                           dk_twm_point *out, dk_error *err);

#endif /* DK_GAIN_H */
