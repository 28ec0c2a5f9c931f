/*
 * nonlinear.h - the second-order nonlinear tensor d_ijk of a crystal and
 * the effective coefficient d_eff of three given field directions.
 *
 * The crystal file gives the independent elements in contracted notation
 * d_il (l: 1 = xx, 2 = yy, 3 = zz, 4 = yz, 5 = xz, 6 = xy) in the optical
 * frame. The other elements follow from the point group (Nye, Physical
 * Properties of Crystals, Oxford (1957), and R. W. Boyd, Nonlinear Optics,
 * 3rd ed., Academic Press (2008), §1.5, Table 1.5.5) and Kleinman symmetry
 * (d_ijk symmetric under every permutation of i, j, k; valid far from
 * absorption), which every file states it assumes.
 *
 *   d_eff = Σ_ijk d_ijk a_i b_j c_k
 *
 * for unit field vectors a, b, c of the three waves (Boyd, §2.3).
 *
 * Miller's rule (R. C. Miller, Appl. Phys. Lett. 5, 17 (1964)): the ratio
 * δ = χ⁽²⁾(ω3; ω1, ω2) / [χ(ω1) χ(ω2) χ(ω3)] is nearly the same for all
 * frequencies and materials, with χ(ω) = n(ω)² − 1 the linear
 * susceptibility. So d measured at one set of wavelengths scales to
 * another as the product of the three (n² − 1).
 */
#ifndef DK_NONLINEAR_H
#define DK_NONLINEAR_H

#include "deltak/crystal.h"

/* The full tensor d[i][j][k] in pm/V, indices 0, 1, 2 = X, Y, Z. */
typedef struct dk_dtensor {
    double d[3][3][3];
} dk_dtensor;

/*
 * dk_dtensor_from_crystal:
 * Fills @t from @c's given elements, its point group and Kleinman
 * symmetry. An element the file gives explicitly is never overwritten.
 * Returns: DK_OK; DK_ENOTFOUND when @c has no nonlinear data.
 */
dk_status dk_dtensor_from_crystal(const dk_crystal *c, dk_dtensor *t,
                                  dk_error *err);

/* d_eff in pm/V for unit field vectors @a, @b, @c. */
double dk_deff(const dk_dtensor *t, const double a[3], const double b[3],
               const double c[3]);

/*
 * dk_qpm_deff_factor:
 * The reduction of a QPM grating of order @m and duty cycle @duty,
 * in magnitude:
 * (2/(π m)) sin(π m duty) (Fejer et al., IEEE J. Quantum Electron. 28,
 * 2631 (1992), eq. 11). Returns 0 for even orders at 50 % duty.
 */
double dk_qpm_deff_factor(int m, double duty);

/*
 * dk_miller_factor:
 * @n_process: refractive indices of the process waves (signal, idler,
 *             pump), each along its own polarization
 * @n_measured: the same for the measurement (for SHG of the crystal file's
 *             nl_wavelength_um: the fundamental twice, then the second
 *             harmonic)
 *
 * d at the process wavelengths over d at the measurement (SHG of
 * nl_wavelength_um) wavelengths: Π_k (n_k² − 1) for the process over the
 * same for the measurement (Miller's rule, Miller, Appl. Phys. Lett. 5, 17
 * (1964)). Near an absorption edge (a wave inside or close to the band
 * gap, e.g. the second harmonic of GaAs or GaP measured at 1.064 µm) the
 * rule is only a rough guide.
 *
 * Returns: the factor (> 0); NAN when any n is not finite or any
 * χ = n² − 1 is not positive.
 */
double dk_miller_factor(const double n_process[3],
                        const double n_measured[3]);

#endif /* DK_NONLINEAR_H */
