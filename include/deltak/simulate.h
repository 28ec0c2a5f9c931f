/*
 * simulate.h - pulsed three-wave mixing along a crystal: SHG, SFG, DFG
 * and OPA of plane-wave pulses, each wave with its exact k(ω), on an FFT
 * time grid (the engine of `deltak simulate`).
 *
 * Model. Waves 1, 2, 3 with carriers ω1, ω2 and ω3 = ω1 + ω2 (exactly).
 * Wave j is E_j = Re[a_j(z, τ) e^{i(k_j z − ω_j t)}] up to the constant
 * that makes |a_j|² its intensity in GW/cm²; τ = t − z/v_ref is the time
 * in a frame moving with the reference group velocity v_ref. In the
 * slowly-varying-envelope approximation (SVEA) the coupled-wave equations
 * of a lossless χ(2) crystal are (Armstrong, Bloembergen, Ducuing and
 * Pershan 1962; Boyd, Nonlinear Optics §2.2, in intensity units)
 *
 *   ∂a1/∂z = L1[a1] + i κ1 s(z) a3 a2* e^{+iΔk z}
 *   ∂a2/∂z = L2[a2] + i κ2 s(z) a3 a1* e^{+iΔk z}
 *   ∂a3/∂z = L3[a3] + i κ3 s(z) a1 a2  e^{−iΔk z}
 *   κ_j = ω_j d_eff (2 / (ε0 c³ n1 n2 n3))^½,   Δk = k3(ω3) − k1(ω1) − k2(ω2)
 *
 * with n_j and k_j at the carriers and s(z) = ±1 the sign of d along z
 * (a poled grating) or 1. The linear operator acts on each frequency
 * component exactly: a_j(z, Ω) gains the phase
 *   D_j(Ω) z,  D_j(Ω) = k_j(ω_j + Ω) − k_j(ω_j) − Ω / v_ref,
 * from the caller's k_j(ω) over the whole grid, not a Taylor series, so
 * group velocity, GVD and every higher order are in. In the degenerate
 * case (type-I SHG, degenerate type-I OPA: waves 1 and 2 are one wave)
 * the equations are ∂a1/∂z = … i κ1 s a3 a1* e^{iΔkz}, ∂a3/∂z = …
 * i (κ3/2) s a1² e^{−iΔkz}, Δk = k3 − 2 k1; these give the plane-wave
 * SHG efficiency 8π² d² L² I / (ε0 c n1² n3 λ1²) of deltak/gain.h.
 * The coupling is taken at the carriers (SVEA): the ω/n(ω) dependence of
 * the nonlinear drive across a wave's band is not included, nor is
 * absorption, χ(3), diffraction or spatial walk-off.
 *
 * Photon numbers. The equations conserve F1/ω1 + F3/ω3 and F2/ω2 + F3/ω3
 * (F2/ω2 is absent and F3/ω3 counts twice in the degenerate case), with
 * F_j = ∫ |a_j|² dτ the fluence: the Manley–Rowe relations (Manley and
 * Rowe 1956; Armstrong et al. 1962). The result reports how well the
 * numerical solution keeps them.
 *
 * Grating. A QPM crystal is a real domain pattern: d changes sign at every
 * domain wall, positive over the first duty·Λ of each period Λ from z = 0.
 * Not its first Fourier term, because the duty-cycle error, higher-order
 * QPM, and the ripple of the conversion within each coherence length then
 * come out of the equations instead of an assumption (the first-order
 * result d_eff·(2/mπ) sin(mπD) of Fejer, Magel, Jundt and Byer 1992 is
 * what a long grating averages to, and the tests check that it does).
 * Steps never cross a domain wall. Without a period the engine uses the
 * one that phase-matches the carriers at the given order, 2πm/|Δk|.
 *
 * Scheme. Symmetric (Strang) split-step Fourier: over a step h from z, a
 * half step of the linear operator in the frequency domain, the full
 * nonlinear step in the time domain, another linear half step; adjacent
 * linear half steps are merged, so a step costs one forward and one
 * backward FFT per wave (FFTW, plans made once). The nonlinear step is
 * pointwise in τ and is integrated by the classical fourth-order
 * Runge–Kutta method with the carrier phase e^{±iΔkz} and the domain sign
 * evaluated exactly at each stage. The scheme is second order in h overall
 * (Strang splitting); the nonlinear part alone is fourth order. Blocks of
 * 64 samples in which every field is below 10^−8.5 of the peak input
 * amplitude skip the nonlinear step (its change there is below double
 * rounding of the peak).
 *
 * Transverse grid (later). The state is one contiguous block of time
 * samples per wave, all transformed by one FFTW plan over the time axis
 * (fftw_plan_many_dft). A transverse grid makes each wave's block (x, y,
 * τ), the plan a rank-2 or rank-3 transform, and adds the diffraction term
 * −(kx² + ky²)/2k_j(ω) (and spatial walk-off, linear in kx) to D_j; the
 * nonlinear step is pointwise and does not change, nor does the stepping
 * along the domains.
 *
 * Grid rule (automatic). Spectral half-width W_j of each input: Gaussian
 * 3.5 × its intensity FWHM 4 ln2 / τ, sech² 19 / τ (both where the
 * intensity spectrum is 1e-14 of its peak), a measured spectrum its data
 * span, CW 0; each wave's band W'_j is the larger of its own and the sum
 * of the bands of the two waves that drive it; the grid spans ±1.3 max W'
 * around every carrier, so dt = π / (1.3 max W'). The time window holds
 * every input to 1e-14 of its peak (chirp, delay included) plus the
 * largest spread of group delays over every wave's band across the
 * crystal (from the exact k), with 25 % margin, rounded up to a power of
 * two of samples. The inputs are then built and the window doubled (or
 * dt halved) until each input has less than 1e-10 of its energy in the
 * outer eighth of the window at either end (and of the spectral window).
 *
 * Step rule (automatic): the smallest of
 *   0.1 / (κ_max √P)        nonlinear length, P the peak total intensity;
 *   0.5 / max |D_j(Ω)|      over each wave's band W'_j: walk-off and
 *                           dispersion of every wave relative to the frame;
 *   0.8 / |Δk|              the carrier phase mismatch (for a first-order
 *                           grating: four steps per domain);
 *   L / 50                  at least 50 steps;
 * then shortened to fit a whole number of steps into each domain. When
 * nothing couples (d_eff = 0) the linear steps are exact and L/50 is kept.
 *
 * Convergence. dk_sim_run runs the crystal at the step h and again at
 * h/2; the change is max over waves of |F_j(h) − F_j(h/2)| / max(F_j(h/2),
 * 1e-9 ΣF_in). Above the tolerance (default 1e-3) it halves again, up to
 * max_halvings (default 3) halvings in all. The reported run is the
 * finest; its error is about a third of the last change (second order),
 * less where the fourth-order nonlinear part dominates.
 *
 * Units: wavelengths µm (vacuum), lengths mm (crystal) and µm (steps,
 * period), time fs, angular frequency rad/fs, k rad/µm, intensity GW/cm²,
 * fluence J/cm², energy J, d_eff pm/V, frequency THz (spectra).
 * Fourier convention: a(τ) = ∫ ã(Ω) e^{−iΩτ} dΩ/2π, so a spectral phase
 * (GDD/2) Ω² with GDD > 0 is a positive chirp (red first, as after normal
 * dispersion), and ã(Ω) e^{iΩ t0} is the pulse delayed by t0.
 *
 * Not safe to create simulations from several threads at once (FFTW's
 * planner is not thread-safe); a created simulation may run on any thread.
 *
 * References:
 *   J. A. Armstrong, N. Bloembergen, J. Ducuing, P. S. Pershan, Phys. Rev.
 *     127, 1918 (1962).
 *   J. M. Manley, H. E. Rowe, Proc. IRE 44, 904 (1956).
 *   R. W. Boyd, Nonlinear Optics, 3rd ed., Academic Press (2008), §2.2, §2.7
 *     (section numbers from memory).
 *   M. M. Fejer, G. A. Magel, D. H. Jundt, R. L. Byer, IEEE J. Quantum
 *     Electron. 28, 2631 (1992).
 *   G. Strang, SIAM J. Numer. Anal. 5, 506 (1968) (symmetric splitting).
 *   G. P. Agrawal, Nonlinear Fiber Optics, 5th ed., Academic Press (2013),
 *     §2.4 (split-step Fourier method).
 *   M. Frigo, S. G. Johnson, Proc. IEEE 93, 216 (2005) (FFTW3).
 */
#ifndef DK_SIMULATE_H
#define DK_SIMULATE_H

#include <stddef.h>

#include "deltak/crystal.h"
#include "deltak/status.h"

/* Largest time grid, samples (memory: up to about 1 kB per sample with
 * three waves, the cached propagators included). */
#define DK_SIM_MAX_SAMPLES ((size_t)1 << 20)

/*
 * dk_sim_k_fn:
 * The wave number of one wave's mode in the crystal.
 * @ctx: the caller's data
 * @omega_rad_per_fs: @n angular frequencies, rad/fs, all > 0
 * @n: ≥ 1
 * @k_rad_per_um: out, k(ω) = n(ω) ω / c in rad/µm; NAN where the crystal
 *   has no data (outside its transparency, at a resonance): the engine
 *   then removes light at that frequency and reports the energy removed
 * Returns: DK_OK, or any status with @err set (the simulation stops).
 */
typedef dk_status (*dk_sim_k_fn)(void *ctx, const double *omega_rad_per_fs,
                                 size_t n, double *k_rad_per_um,
                                 dk_error *err);

/* The shape of an input. DK_SIM_DARK (0): no input. */
typedef enum dk_sim_shape {
    DK_SIM_DARK = 0,
    DK_SIM_GAUSSIAN,   /* intensity exp(−4 ln2 t²/τ²) before the chirp */
    DK_SIM_SECH2,      /* intensity sech²(1.7627 t/τ) before the chirp */
    DK_SIM_SPECTRUM,   /* a measured spectrum (dk_sim_spectrum) */
    DK_SIM_CW          /* constant over the window (quasi-monochromatic) */
} dk_sim_shape;

/* A measured spectrum. Only its shape is used; the amount comes from the
 * pulse's fluence, energy or peak intensity. */
typedef struct dk_sim_spectrum {
    size_t n;                     /* points, ≥ 2 */
    const double *wavelength_um;  /* vacuum, > 0, strictly monotonic */
    const double *intensity;      /* ≥ 0, any unit, not all zero */
    const double *phase_rad;      /* spectral phase at each point, in the
                                   * convention above; NULL: flat */
    int per_frequency;            /* 0: intensity per unit wavelength (as
                                   * spectrometers give it; converted with
                                   * the λ² Jacobian); 1: per unit
                                   * frequency */
} dk_sim_spectrum;

/* One input pulse. Give exactly one of fluence, energy or peak intensity
 * (CW: the peak intensity only). */
typedef struct dk_sim_pulse {
    dk_sim_shape shape;
    double fluence_j_per_cm2;   /* > 0, or 0 when not the amount given */
    double energy_j;            /* > 0; needs the problem's beam area */
    double peak_gw_per_cm2;     /* peak intensity as the pulse enters (with
                                 * its chirp), > 0 */
    double fwhm_fs;             /* Gaussian, sech²: intensity FWHM of the
                                 * unchirped pulse, > 0 */
    double gdd_fs2;             /* GDD added before the crystal, finite */
    double delay_fs;            /* arrival of the pulse centre in the moving
                                 * frame; > 0 is later; finite */
    dk_sim_spectrum spectrum;   /* for DK_SIM_SPECTRUM */
} dk_sim_pulse;

/* One wave. */
typedef struct dk_sim_wave {
    const char *name;        /* e.g. "signal", for messages; may be NULL */
    double lambda_um;        /* carrier, vacuum, µm, > 0; for wave 3 also 0
                              * (derived as 1/(1/λ1 + 1/λ2)) */
    dk_sim_k_fn k;           /* k(ω) of the mode it travels in */
    void *k_ctx;             /* handed to @k */
    dk_sim_pulse input;      /* zero: dark (generated in the crystal) */
} dk_sim_wave;

/* The interaction. */
typedef struct dk_sim_problem {
    dk_sim_wave wave[3];   /* [0] ω1, [1] ω2, [2] ω3 = ω1 + ω2 */
    int degenerate;        /* 1: ω1 = ω2 is one wave (type-I SHG or
                            * degenerate type-I OPA); wave[1] is unused */
    double length_mm;      /* crystal length, 0 < L ≤ 1000 */
    double deff_pm_per_v;  /* d_eff, finite; with a grating the bulk value
                            * (e.g. d33), not the grating-reduced one */
    int qpm;               /* 1: periodically poled */
    double qpm_period_um;  /* > 0; 0: phase-match the carriers */
    int qpm_order;         /* m ≥ 1, used when the period is 0; 0 means 1 */
    double qpm_duty;       /* fraction of a period with +d, in (0, 1); 0
                            * means 0.5 */
    double beam_area_cm2;  /* > 0 to report energies; 0: fluences only */
} dk_sim_problem;

/* Choices a caller may force; all zero: automatic. */
typedef struct dk_sim_options {
    size_t samples;          /* time samples, a power of two in
                              * [64, DK_SIM_MAX_SAMPLES]; 0: automatic */
    double dt_fs;            /* sample spacing, > 0; 0: automatic */
    double max_step_um;      /* largest step, > 0; 0: automatic */
    int frame_wave;          /* 1, 2, 3: move with that wave's group
                              * velocity; 0: the middle of the fastest and
                              * slowest */
    int no_convergence_check;/* 1: one run at the step only */
    double tolerance;        /* allowed relative change on halving the
                              * step, in (0, 0.5); 0: 1e-3 */
    int max_halvings;        /* halvings in all, 1 … 20; 0: 3 */
    int record_points;       /* most z positions recorded; 0: 512 */
    int fft_planning;        /* 0: automatic (measured plans for large
                              * runs), 1: FFTW_MEASURE, 2: FFTW_ESTIMATE */
} dk_sim_options;

/* Which limit set the step. */
typedef enum dk_sim_step_rule {
    DK_SIM_STEP_NONLINEAR,
    DK_SIM_STEP_DISPERSION,
    DK_SIM_STEP_MISMATCH,
    DK_SIM_STEP_COUNT,
    DK_SIM_STEP_USER
} dk_sim_step_rule;

/* Flags in dk_sim_result.warnings. */
#define DK_SIM_WARN_TIME_EDGE     1u  /* > 1e-6 of a wave's output in the
                                       * outer eighths of the window */
#define DK_SIM_WARN_SPECTRAL_EDGE 2u  /* the same for the spectral window */
#define DK_SIM_WARN_ABSORBED      4u  /* > 1e-6 of the input energy reached
                                       * frequencies with no k data */
#define DK_SIM_WARN_NOT_CONVERGED 8u  /* change above the tolerance after
                                       * the last halving */
#define DK_SIM_WARN_BROADBAND    16u  /* a band wider than ±25 % of its
                                       * carrier: the SVEA coupling is
                                       * questionable */

/* One wave's results. Arrays have dk_sim_result.samples entries, in
 * ascending time (dk_sim_result.time_fs) or ascending frequency; they are
 * NULL for an absent wave (wave[1] of a degenerate run). */
typedef struct dk_sim_wave_out {
    int present;                  /* 0 for wave[1] of a degenerate run */
    double lambda_um;             /* carrier */
    double omega_rad_per_fs;
    double n;                     /* phase index at the carrier */
    double group_delay_fs_per_mm; /* 1/v_g at the carrier */
    double gvd_fs2_per_mm;        /* d²k/dω² at the carrier */
    double fluence_in_j_per_cm2, fluence_out_j_per_cm2;
    double energy_in_j, energy_out_j;      /* NAN without a beam area */
    double photons_in_per_cm2, photons_out_per_cm2; /* Σ F(ω)/ħω */
    double peak_in_gw_per_cm2, peak_out_gw_per_cm2;
    double fwhm_in_fs, fwhm_out_fs;        /* NAN when dark */
    double transform_limit_in_fs;          /* FWHM with the same spectrum
                                            * and a flat phase */
    double transform_limit_out_fs;
    double spectral_fwhm_in_thz, spectral_fwhm_out_thz;
    double band_um[2];            /* holds 99.9 % of the input and of the
                                   * output energy (NAN when dark) */
    double absorbed_j_per_cm2;    /* removed where k had no data */
    double edge_fraction;         /* output in the outer window eighths */
    double spectral_edge_fraction;
    double *intensity_in_gw_per_cm2;
    double *intensity_out_gw_per_cm2;
    double *phase_out_rad;        /* temporal phase of a_j, wrapped */
    double *frequency_thz;        /* absolute frequency of each bin */
    double *spectrum_in_j_per_cm2_thz;
    double *spectrum_out_j_per_cm2_thz;
    double *spectral_phase_out_rad; /* wrapped; 0 where the spectrum is
                                     * below 1e-12 of its peak */
} dk_sim_wave_out;

typedef struct dk_sim_result {
    int degenerate;
    size_t samples;
    double dt_fs;
    double window_fs;
    double *time_fs;                 /* ascending, 0 at the centre */
    double frame_fs_per_mm;          /* 1/v_ref */
    double delta_k_rad_per_um;       /* k3 − k1 − k2 at the carriers */
    double qpm_period_um;            /* the period used; 0: no grating */
    double deff_first_order_pm_per_v;/* d (2/mπ) sin(mπD) of the grating at
                                      * the order nearest Δk; d without */
    double step_um;                  /* largest step of the reported run */
    long steps;                      /* steps of the reported run */
    dk_sim_step_rule step_rule;      /* what set the automatic step */
    int convergence_checked;
    int converged;
    double convergence_change;       /* last change on halving */
    double tolerance;
    int halvings;                    /* halvings beyond the first run */
    double manley_rowe_defect;       /* max over z of the relative change
                                      * of the Manley–Rowe invariants */
    size_t nz;                       /* recorded positions */
    double *z_mm;                    /* nz positions, 0 … L */
    double *fluence_j_per_cm2[3];    /* nz values per wave (NULL for an
                                      * absent wave) */
    unsigned warnings;               /* DK_SIM_WARN_* */
    dk_sim_wave_out wave[3];
} dk_sim_result;

/*
 * dk_sim_run:
 * Simulate @p: choose grid and step (unless @opt forces them), propagate
 * through the crystal, check convergence by halving the step, and report.
 * @p: the problem; its k functions are called during this call only
 * @opt: choices; NULL for all automatic
 * @out: on success a new result, freed with dk_sim_result_free()
 *
 * Returns: DK_OK (with warnings in (*out)->warnings); DK_EINVAL for a bad
 * field of @p or @opt, with a message naming it and the fix; DK_EDOM when
 * the carriers need no grating but one was asked for without a period, or
 * a computed field is not finite; DK_ERANGE when the grid needed exceeds
 * DK_SIM_MAX_SAMPLES, or a carrier lies where a k function has no data;
 * DK_ENOMEM; any status a k function returns.
 */
dk_status dk_sim_run(const dk_sim_problem *p, const dk_sim_options *opt,
                     dk_sim_result **out, dk_error *err);

/* Free @r and its arrays; NULL does nothing. */
void dk_sim_result_free(dk_sim_result *r);

/* A short name of @r, e.g. "walk-off and dispersion"; never NULL. */
const char *dk_sim_step_rule_str(dk_sim_step_rule r);

/* ---- Lower level: one simulation, stepped by the caller (benchmarks,
 * studies of the step) ------------------------------------------------ */

typedef struct dk_sim dk_sim;

/* The grid and step chosen for a simulation. */
typedef struct dk_sim_info {
    size_t samples;
    double dt_fs;
    double window_fs;
    double step_um;          /* the automatic (or forced) largest step */
    dk_sim_step_rule step_rule;
    long steps;              /* steps at step_um */
    double qpm_period_um;
    double frame_fs_per_mm;
    double delta_k_rad_per_um;
} dk_sim_info;

/*
 * dk_sim_new:
 * Validate @p, evaluate every k function over the grid, build the input
 * pulses and the FFT plans.
 * @out: on success a new simulation, freed with dk_sim_free()
 * Returns: as dk_sim_run.
 */
dk_status dk_sim_new(const dk_sim_problem *p, const dk_sim_options *opt,
                     dk_sim **out, dk_error *err);

/* Free @s; NULL does nothing. */
void dk_sim_free(dk_sim *s);

/* The grid and step of @s. */
void dk_sim_get_info(const dk_sim *s, dk_sim_info *info);

/*
 * dk_sim_propagate:
 * Propagate the inputs of @s through the whole crystal with steps no
 * longer than @max_step_um (aligned to the domains of a grating).
 * @fluence_out: out, the fluence of waves 1, 2, 3 at the exit, J/cm²
 *   (0 for wave 2 of a degenerate run); may be NULL
 * Returns: DK_OK; DK_EINVAL for a step that is not positive and finite or
 * would need more than 1e8 steps; DK_EDOM when a field stops being finite.
 */
dk_status dk_sim_propagate(dk_sim *s, double max_step_um,
                           double fluence_out[3], dk_error *err);

/* ---- k(ω) from the crystal database ---------------------------------- */

/* The context of dk_sim_crystal_k: one wave's mode in one crystal. */
typedef struct dk_sim_crystal {
    const dk_crystal *crystal;
    const dk_dispersion_set *set;  /* NULL: the crystal's default set */
    double temp_c;                 /* °C */
    char axis;        /* a principal axis ('o', 'e', 'X', 'Y', 'Z', 'n')
                       * for light polarised along it; 0: use @mode along
                       * the direction @theta_rad, @phi_rad */
    char mode;        /* with axis 0: 'o'/'e' (uniaxial), 's'/'f' (slow,
                       * fast; biaxial), 'n' (isotropic) */
    double theta_rad; /* direction from Z, with axis 0 */
    double phi_rad;   /* azimuth from X, with axis 0 */
    unsigned warnings;   /* out: DK_WARN_* of the points evaluated (the
                          * whole grid: range warnings are to be judged on
                          * dk_sim_wave_out.band_um) */
    size_t undefined;    /* out: frequencies given NAN */
} dk_sim_crystal;

/*
 * dk_sim_crystal_k:
 * A dk_sim_k_fn: k(ω) = n(λ) ω / c, λ = 2πc/ω, from dk_material_n (a
 * principal axis) or dk_modes_at (a direction). Frequencies outside the
 * crystal's transparency, or where the formula has no finite index, get
 * NAN and are counted in @ctx->undefined.
 * @ctx: a dk_sim_crystal
 * Returns: DK_OK; DK_EINVAL for a missing crystal or a bad axis or mode
 * letter; DK_ENOTFOUND when the set lacks the axis.
 */
dk_status dk_sim_crystal_k(void *ctx, const double *omega_rad_per_fs,
                           size_t n, double *k_rad_per_um, dk_error *err);

#endif /* DK_SIMULATE_H */
