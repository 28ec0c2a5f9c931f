/*
 * pulse.h - group velocities, group-velocity mismatch and dispersion of
 * the three waves of a design, each in the mode it travels in, and the
 * lengths over which short pulses and narrow beams part.
 *
 *   n_g = n − λ dn/dλ (at fixed direction, for the mode's eigen-index)
 *   GVM(a, b) = 1/v_g,a − 1/v_g,b = (n_g,a − n_g,b)/c       (fs/mm)
 *   pulse-splitting (quasi-static) length  L_qs = τ / |GVM|
 *   aperture length  l_a = √π w0 / ρ (Boyd & Kleinman, J. Appl. Phys. 39,
 *     3597 (1968), eq. 2.27), with ρ the walk-off between two waves
 * For extraordinary waves the group velocity is taken along the wave
 * vector (its small tilt towards the Poynting vector is neglected).
 *
 * Noncollinear designs (signal at angle α from the pump, idler at β, the
 * two at Ω = α + β) project as is done for noncollinear OPAs: the pairs
 * with the pump along the pump direction (the crystal's length),
 *   GVM(s, p) = (n_g,s / cos α − n_g,p)/c,  GVM(i, p) = (n_g,i / cos β − n_g,p)/c,
 * and the signal-idler pair along the signal direction,
 *   GVM(s, i) = (n_g,s − n_g,i / cos Ω)/c,
 * which vanishes at the broadband condition v_g,s = v_g,i cos Ω
 * (G. Cerullo, S. De Silvestri, Rev. Sci. Instrum. 74, 1 (2003), eq. 14).
 * Collinear designs have α = β = Ω = 0 and the plain differences.
 * References: A. M. Weiner, Ultrafast Optics, Wiley (2009), §4;
 * G. Cerullo, S. De Silvestri, Rev. Sci. Instrum. 74, 1 (2003), §II.
 */
#ifndef DK_PULSE_H
#define DK_PULSE_H

#include "deltak/tolerance.h"

typedef struct dk_wave_props {
    double lambda_um;
    double n;
    double group_index;
    double gvd_fs2_per_mm;
    double tod_fs3_per_mm;
    double walkoff_rad;       /* Poynting vector from the wave vector */
    double poynting[3];       /* unit Poynting vector */
} dk_wave_props;

typedef struct dk_pulse_props {
    dk_wave_props w[3];          /* signal, idler, pump */
    double gvm_fs_per_mm[3];     /* signal−pump, idler−pump, signal−idler
                                  * (projected when noncollinear) */
    double walkoff_rad[3];       /* between the same pairs */
    double angle_rad[3];         /* wave-vector angles of the same pairs:
                                  * α, β, Ω; 0 when collinear */
    int noncollinear;
} dk_pulse_props;

/*
 * dk_pulse_props_of:
 * The properties of the three waves of @d at its operating point.
 * Returns: DK_OK or the index/mode error.
 */
dk_status dk_pulse_props_of(dk_design *d, dk_pulse_props *out,
                            dk_error *err);

/* Pulse-splitting length in mm for duration @tau_fs and GVM in fs/mm;
 * INFINITY when GVM = 0. */
double dk_splitting_length_mm(double tau_fs, double gvm_fs_per_mm);

/* Boyd-Kleinman aperture length √π w0/ρ in mm for a waist radius in µm;
 * INFINITY when ρ = 0. */
double dk_aperture_length_mm(double waist_um, double walkoff_rad);

#endif /* DK_PULSE_H */
