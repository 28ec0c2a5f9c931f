/*
 * group.h - group index, group-velocity dispersion and third-order
 * dispersion of a material from n(λ) and its λ-derivatives.
 *
 *   n_g = n − λ dn/dλ
 *   β2  = λ³/(2π c²) · d²n/dλ²
 *   β3  = −λ⁴/(4π² c³) · (3 d²n/dλ² + λ d³n/dλ³)
 *
 * with λ the vacuum wavelength. Reference: A. M. Weiner, Ultrafast Optics,
 * Wiley (2009), ch. 4 (standard results, also in Diels & Rudolph,
 * Ultrashort Laser Pulse Phenomena, 2nd ed., Academic Press (2006), ch. 1).
 */
#ifndef DK_GROUP_H
#define DK_GROUP_H

/* Group index n_g; @lambda_um in µm, @dn_dl in 1/µm. */
double dk_group_index(double lambda_um, double n, double dn_dl);

/* GVD β2 in fs²/mm; @d2n_dl2 in 1/µm². */
double dk_gvd_fs2_per_mm(double lambda_um, double d2n_dl2);

/* TOD β3 in fs³/mm; derivatives in 1/µm² and 1/µm³. */
double dk_tod_fs3_per_mm(double lambda_um, double d2n_dl2, double d3n_dl3);

/* Inverse group velocity 1/v_g = n_g/c in fs/mm. */
double dk_inverse_group_velocity_fs_per_mm(double group_index);

#endif /* DK_GROUP_H */
