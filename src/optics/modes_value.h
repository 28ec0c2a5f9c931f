/*
 * modes_value.h - the eigenmodes of deltak/modes.h evaluated value-only
 * from principal indices computed beforehand (internal).
 *
 * A direction search evaluates Δk at thousands of directions for the same
 * three wavelengths; the principal indices do not depend on the direction,
 * so they are computed once (dk_principal_n) and each direction costs only
 * the 2×2 eigenproblem of the projected impermeability, in plain
 * arithmetic. The method, basis and labels are those of src/optics/modes.c
 * (Born & Wolf, Principles of Optics, 7th ed., §15.2-15.3); without the
 * λ-derivatives (dn_dl, d2n_dl2, d3n_dl3 are NaN). tests/test_batch.c
 * compares both.
 */
#ifndef DK_MODES_VALUE_H
#define DK_MODES_VALUE_H

#include "deltak/modes.h"

/*
 * dk_principal_n:
 * The principal indices of @c in the order of the optical frame X, Y, Z
 * (uniaxial: o, o, e; isotropic: n, n, n) at @lambda_um, @temp_c.
 * Returns: DK_OK or the dk_material_n() error (DK_ERANGE outside the
 * transparency range, DK_ENOTFOUND, DK_EDOM).
 */
dk_status dk_principal_n(const dk_crystal *c, const dk_dispersion_set *set,
                         double lambda_um, double temp_c, double n[3],
                         dk_error *err);

/* A wave normal and the basis (p, q) of the plane normal to it that
 * modes.c uses: p in the plane of s and Z, q normal to both. */
typedef struct dk_dir_basis {
    double s[3], p[3], q[3];
} dk_dir_basis;

/* The basis of unit vector @s (normalised again here). */
void dk_dir_basis_of(const double s[3], dk_dir_basis *b);

/*
 * dk_modes_value_ab:
 * The two eigen-indices (nm[0] slow, nm[1] fast) and labels along @b->s
 * from the principal impermeabilities @a (a_i = 1/n_i²): the cheapest
 * form, for scans that share one basis among the three waves.
 */
void dk_modes_value_ab(const dk_crystal *c, const double a[3],
                       const dk_dir_basis *b, double nm[2], char label[2]);

/*
 * dk_mode_index_ab:
 * The eigen-index of the mode labelled @label (as dk_mode_select: 'o',
 * 'e', 's', 'f', 'n') along @b->s from impermeabilities @a; NAN when
 * neither mode carries the label.
 */
double dk_mode_index_ab(const dk_crystal *c, const double a[3],
                        const dk_dir_basis *b, char label);

/*
 * dk_modes_value_n:
 * The two eigen-indices along unit vector @s (nm[0] slow, nm[1] fast) and
 * their labels ('o'/'e', 's'/'f', 'n'), from principal indices @n.
 */
void dk_modes_value_n(const dk_crystal *c, const double n[3],
                      const double s[3], double nm[2], char label[2]);

/*
 * dk_modes_value:
 * As dk_modes_at() from principal indices @n: index, D, E, walk-off,
 * Poynting vector and label of both modes; the derivatives are NaN.
 */
void dk_modes_value(const dk_crystal *c, const double n[3], const double s[3],
                    dk_mode out[2]);

#endif /* DK_MODES_VALUE_H */
