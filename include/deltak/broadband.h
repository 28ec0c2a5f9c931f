/*
 * broadband.h - the output spectrum of three-wave mixing from broadband
 * inputs in the low-conversion limit: SFG, DFG and (with a narrowband
 * pump) OPA, from two input spectra, with the phase-matching amplitude
 * and phase over the crystal length. Collinear, or noncollinear with
 * each wave's k projected on the pump direction (the model of
 * deltak/design_sim.h).
 *
 * The inputs are those of a dk_sim_problem (deltak/simulate.h): the same
 * grid, the same exact k(ω) of each wave, the same input pulses or
 * measured spectra. With undepleted inputs the coupled-wave equations of
 * deltak/simulate.h integrate in closed form for each pair of input
 * frequencies (Boyd, Nonlinear Optics, 3rd ed., §2.2 and §2.7):
 *
 *   SFG   ã3(Ω3) = i κ3 ∫ ã1(Ω) ã2(Ω3 − Ω) L h(q) dΩ/2π
 *   DFG   ã2(Ω2) = i κ2 ∫ ã3(Ω2 + Ω) ã1*(Ω) L h(q)* dΩ/2π   (and 1 ↔ 2)
 *   h(q) = (1/L) ∫0^L e^{−iqz} dz = e^{−iqL/2} sinc(qL/2)
 *
 * with q = k3 − k1 − k2 at the three frequencies of the pair, less the
 * grating vector 2πm/Λ nearest the carriers' mismatch (a grating
 * contributes its first Fourier term: κ with d (2/mπ) sin(mπD), Fejer et
 * al. 1992), and the generated field then carried to the exit with its
 * own dispersion. h is the phase-matching amplitude and phase; its
 * modulus squared is the sinc² of deltak/acceptance.h.
 *
 * OPA: the signal (seed, wave 1) amplified by a quasi-monochromatic pump
 * (wave 3, its peak intensity), each seed frequency with its own
 * mismatch: G(Ω) = 1 + (Γ/g)² sinh²(gL), g² = Γ² − (q/2)², Γ² = κ1 κ2
 * I3 (deltak/gain.h); the idler gets (G − 1) times the seed's photons at
 * the matching frequency. A pump whose band is not small against the gain
 * band needs the full simulation (deltak/simulate.h).
 *
 * The low-conversion result holds while the generated wave takes a small
 * fraction of the inputs' photons; the result says how large that
 * fraction is.
 */
#ifndef DK_BROADBAND_H
#define DK_BROADBAND_H

#include "deltak/simulate.h"

typedef enum dk_mix_kind {
    DK_MIX_AUTO = 0,  /* from the inputs: 1 and 2 → SFG; 3 and 1 → DFG of
                       * 2; 3 and 2 → DFG of 1 */
    DK_MIX_SFG,       /* wave 3 from waves 1 and 2 (SHG when degenerate) */
    DK_MIX_DFG,       /* wave 2 from 3 and 1, or wave 1 from 3 and 2 */
    DK_MIX_OPA        /* wave 1 amplified by 3, wave 2 generated */
} dk_mix_kind;

typedef struct dk_mix_result {
    dk_mix_kind kind;
    int generated;              /* the wave made, 0, 1, 2 (problem index) */
    size_t n;                   /* bins, ascending frequency */
    double *frequency_thz[3];   /* absolute frequency of each wave's bins
                                 * (NULL for an absent wave) */
    double *spectrum_in[3];     /* J/cm²/THz at the entrance */
    double *spectrum_out[3];    /* at the exit: the generated wave (and
                                 * the amplified signal for OPA); the
                                 * other inputs as they entered */
    double *phase_out_rad;      /* spectral phase of the generated wave at
                                 * the exit (wrapped, frame of dk_sim);
                                 * 0 where below 1e-12 of the peak */
    double *pm_modulus;         /* |h| over the generated wave's bins with
                                 * the narrower input at its carrier */
    double *pm_phase_rad;       /* arg h there */
    double fluence_j_per_cm2[3];/* out, per wave */
    double energy_j[3];         /* NAN without a beam area */
    double photon_fraction;     /* photons made / photons of the scarcer
                                 * input (OPA: of the pump); the model
                                 * holds while ≪ 1 */
    double centre_thz, fwhm_thz;/* of the generated spectrum (outermost
                                 * half-maximum points) */
    double transform_limit_fs;  /* of the generated spectrum, flat phase */
    double gain_peak;           /* OPA: the largest G; else NAN */
} dk_mix_result;

/*
 * dk_mix_spectrum:
 * The low-conversion output of @p (its inputs, grid options @opt as for
 * dk_sim_run; NULL: automatic) for the process @kind.
 * Returns: DK_OK; DK_EINVAL when the inputs do not fit @kind (names
 * which wave is missing) or a field of @p is bad; the errors of
 * dk_sim_new; DK_ENOMEM.
 */
dk_status dk_mix_spectrum(const dk_sim_problem *p, const dk_sim_options *opt,
                          dk_mix_kind kind, dk_mix_result **out,
                          dk_error *err);

/* Free @r; NULL does nothing. */
void dk_mix_result_free(dk_mix_result *r);

#endif /* DK_BROADBAND_H */
