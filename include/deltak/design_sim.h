/*
 * design_sim.h - a design (deltak/design.h) as input to the pulse
 * simulator (deltak/simulate.h) and to the bandwidth analyses: each
 * wave's k(ω) in the mode the design puts it in, the coupling, the
 * grating.
 *
 * Waves: the simulator's wave 1 is the design's signal, 2 its idler, 3
 * its pump (ω3 = ω1 + ω2); for SHG the fundamental is wave 1 (and wave 2
 * for type II), the harmonic wave 3. Type-I SHG is the degenerate case.
 *
 * k(ω) of each wave (exact over the grid, from the design's data set and
 * temperature):
 *   QPM            light polarised along the principal axis of the
 *                  design's letters (dk_material_n);
 *   birefringent   the eigen-index of the design's mode along the wave's
 *                  own direction (pump along (θ, φ); signal and idler of a
 *                  noncollinear design along their directions from
 *                  dk_angle_waves), projected on the pump direction:
 *                  k_z(ω) = k(ω) cos α_j. The plane-wave model keeps each
 *                  wave's direction fixed at its carrier's: the angular
 *                  dispersion of a noncollinear idler is not modelled.
 * Coupling: |d_eff| scaled by Miller's rule (dk_design_deff_scaled); for
 * QPM the bulk value d_eff / ((2/mπ) sin(mπD)), since the simulator
 * writes the domains itself. Walk-off is reported, not simulated (the
 * engine is 1-D).
 */
#ifndef DK_DESIGN_SIM_H
#define DK_DESIGN_SIM_H

#include "deltak/design.h"
#include "deltak/simulate.h"

/* The k(ω) of one wave of a design: a dk_sim_k_fn context. */
typedef struct dk_design_wave_k {
    dk_sim_crystal mode;   /* the crystal mode (axis, or mode + direction) */
    double cos_angle;      /* projection on the pump direction, (0, 1] */
} dk_design_wave_k;

/*
 * dk_design_wave_k_fn:
 * A dk_sim_k_fn over a dk_design_wave_k: cos α · k(ω) of the mode.
 * Returns: as dk_sim_crystal_k.
 */
dk_status dk_design_wave_k_fn(void *ctx, const double *omega_rad_per_fs,
                              size_t n, double *k_rad_per_um, dk_error *err);

/*
 * dk_design_sim_modes:
 * The k(ω) contexts of the signal, idler and pump of @d at its operating
 * point (SHG: fundamental, fundamental, harmonic).
 * Returns: DK_OK; DK_EINVAL for a design that was not solved; the mode
 * errors of dk_angle_waves.
 */
dk_status dk_design_sim_modes(dk_design *d, dk_design_wave_k k[3],
                              dk_error *err);

/*
 * dk_design_sim_problem:
 * Fill @p from @d: carriers, k functions (over @k, which must outlive
 * @p), degeneracy, length, d_eff (bulk for QPM), grating (the period at
 * the design's temperature, order, duty). Inputs and beam area are left
 * dark and 0 for the caller.
 * @deff_used: out (may be NULL): how d_eff was scaled
 * Returns: DK_OK; DK_EINVAL (no length, not solved); DK_EDOM (no usable
 * d_eff, with the reason); the errors of dk_design_sim_modes.
 */
dk_status dk_design_sim_problem(dk_design *d, dk_design_wave_k k[3],
                                dk_sim_problem *p, dk_deff_scaled *deff_used,
                                dk_error *err);

/*
 * dk_design_sim_band_flags:
 * The range flags (DK_RANGE_*) of the simulated bands of @r: each wave's
 * 99.9 % band edges, in and out, set on that wave of @d with the others
 * held. The span reached outside the set's ranges is noted in @notes
 * (dk_design_note_span). Returns the union of the flags.
 */
unsigned dk_design_sim_band_flags(const dk_design *d, const dk_sim_result *r,
                                  dk_notes *notes);

#endif /* DK_DESIGN_SIM_H */
