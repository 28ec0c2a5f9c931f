/*
 * modes.h - the two eigenmodes of a plane wave travelling in any direction
 * of an anisotropic crystal: their refractive indices (with exact
 * wavelength derivatives), displacement and field directions, and the
 * walk-off of the Poynting vector from the wave vector.
 *
 * Method: for a wave normal s and the principal indices n_X, n_Y, n_Z, the
 * eigen-indices follow from the Fresnel equation of wave normals,
 *   Σ_i s_i² / (n⁻² − n_i⁻²) = 0,
 * solved here in its equivalent, always well-posed form: 1/n² are the
 * eigenvalues of the impermeability tensor diag(n_i⁻²) projected onto the
 * plane normal to s, and D of each mode is the matching eigenvector.
 * E ∝ diag(n_i⁻²)·D; the walk-off angle ρ is the angle between D and E,
 * equal to the angle between s and the Poynting vector S ∝ E × (s × E).
 * Valid for uniaxial and biaxial crystals in every direction, including
 * the principal planes and optic axes (where the modes are degenerate).
 *
 * References: M. Born, E. Wolf, Principles of Optics, 7th ed., Cambridge
 * (1999), §15.2-15.3; V. G. Dmitriev, G. G. Gurzadyan, D. N. Nikogosyan,
 * Handbook of Nonlinear Optical Crystals, 3rd ed., Springer (1999), §1.
 */
#ifndef DK_MODES_H
#define DK_MODES_H

#include "deltak/crystal.h"

typedef struct dk_mode {
    double n;          /* eigen-index */
    double dn_dl;      /* dn/dλ at fixed direction, 1/µm */
    double d2n_dl2;    /* 1/µm² */
    double d3n_dl3;    /* 1/µm³ */
    double d[3];       /* unit displacement vector D (optical frame) */
    double e[3];       /* unit electric field vector E */
    double walkoff_rad;/* angle between s and the Poynting vector, ≥ 0 */
    double poynting[3];/* unit Poynting vector */
    char label;        /* 'o' or 'e' (uniaxial); 's' slow or 'f' fast
                        * (biaxial); 'n' (isotropic) */
} dk_mode;

/* The unit wave vector of polar angle @theta_rad from Z and azimuth
 * @phi_rad from X in the optical frame. */
void dk_direction(double theta_rad, double phi_rad, double s[3]);

/*
 * dk_modes_at:
 * @c, @set: crystal and data set (uniaxial sets give o and e; biaxial X,
 *   Y, Z; isotropic n)
 * @lambda_um: vacuum wavelength; @temp_c: temperature
 * @s: unit wave vector in the optical frame
 * @out: out[0] the slow mode (larger n), out[1] the fast one; for
 *   uniaxial crystals their labels say which is o and which e
 * @warnings: OR-ed DK_WARN_* flags of the index evaluations (may be NULL)
 *
 * Returns: DK_OK, or the dk_material_index() error (DK_ERANGE outside
 * the transparency range, DK_ENOTFOUND when the set lacks an axis).
 */
dk_status dk_modes_at(const dk_crystal *c, const dk_dispersion_set *set,
                      double lambda_um, double temp_c, const double s[3],
                      dk_mode out[2], unsigned *warnings, dk_error *err);

/*
 * dk_mode_select:
 * Returns: the index (0 or 1) in @m of the mode labelled @label ('o', 'e',
 * 's', 'f', 'n'), or -1 when neither carries it.
 */
int dk_mode_select(const dk_mode m[2], char label);

#endif /* DK_MODES_H */
