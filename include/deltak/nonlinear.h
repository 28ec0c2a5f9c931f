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

#endif /* DK_NONLINEAR_H */
