/*
 * material.h - the index of one axis of a crystal at (λ, T), with the
 * crystal's transparency range enforced and the data set's fitted
 * ranges turned into warnings.
 */
#ifndef DK_MATERIAL_H
#define DK_MATERIAL_H

#include <stddef.h>

#include "deltak/crystal.h"
#include "deltak/dispersion.h"

/*
 * dk_transparency_check:
 * DK_OK when @lambda_um lies inside @c's transparency range, else
 * DK_ERANGE with the message "[the @wave (]λ um[)] is outside the
 * transparency range lo-hi um of <crystal>" (λ printed with enough digits
 * to differ from the edge). @wave (e.g. "idler") may be NULL.
 */
dk_status dk_transparency_check(const dk_crystal *c, double lambda_um,
                                const char *wave, dk_error *err);

/*
 * dk_material_index:
 * @c: the crystal
 * @set: one of @c's data sets
 * @axis: an axis label of @set ('o', 'e', 'X', 'Y', 'Z', 'n')
 * @lambda_um: vacuum wavelength in µm
 * @temp_c: temperature in °C; a set with no temperature dependence is
 *   evaluated at its reference temperature (warning flag DK_WARN_NO_TEMP)
 * @out: the index and its derivatives
 *
 * Returns: DK_OK; DK_ERANGE outside the transparency range; DK_ENOTFOUND
 * when @set lacks @axis; DK_EDOM / DK_EINVAL from dk_index_eval().
 */
dk_status dk_material_index(const dk_crystal *c, const dk_dispersion_set *set,
                            char axis, double lambda_um, double temp_c,
                            dk_index_value *out, dk_error *err);

/*
 * dk_material_n:
 * As dk_material_index() but only n (no derivatives): the fast path for
 * solvers that evaluate Δk many times. @warnings gets the DK_WARN_* flags.
 */
dk_status dk_material_n(const dk_crystal *c, const dk_dispersion_set *set,
                        char axis, double lambda_um, double temp_c, double *n,
                        unsigned *warnings, dk_error *err);

/*
 * dk_warning_text:
 * Writes into @buf a one-line explanation of the warning flags in @v
 * for @set at (λ, T), e.g. "1.064 um is outside the fitted range
 * 0.5-4 um of data set 'Gayer2008'". Returns the number of flags
 * explained; each flag is one line separated by '\n'.
 */
int dk_warning_text(const dk_dispersion_set *set, unsigned flags,
                    double lambda_um, double temp_c, char *buf, size_t n);

#endif /* DK_MATERIAL_H */
