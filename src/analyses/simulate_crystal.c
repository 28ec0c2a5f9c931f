/*
 * simulate_crystal.c - k(ω) of one wave's mode from the crystal database,
 * for the pulse simulator (dk_sim_crystal_k in deltak/simulate.h).
 *
 *   k(ω) = n(λ) ω / c,   λ = 2π c / ω   (c = 0.299792458 µm/fs)
 *
 * with n from dk_material_n for light polarised along a principal axis,
 * or the eigen-index of dk_modes_at for a mode travelling in a given
 * direction (uniaxial o/e, biaxial slow/fast). The group velocity, GVD
 * and every higher order then follow from the data set's own formula,
 * evaluated at each frequency of the grid.
 */
#include <math.h>

#include "analyses/sim_state.h"
#include "deltak/material.h"
#include "deltak/modes.h"

dk_status
dk_sim_crystal_k(void *ctx, const double *omega_rad_per_fs, size_t n,
                 double *k_rad_per_um, dk_error *err)
{
    dk_sim_crystal *c = ctx;
    if (!c || !c->crystal)
        return dk_error_set(err, DK_EINVAL,
                            "k(omega) from a crystal needs the crystal");
    const dk_dispersion_set *set =
        c->set ? c->set : (c->crystal->nsets > 0 ? &c->crystal->sets[0]
                                                 : NULL);
    if (!set)
        return dk_error_set(err, DK_EINVAL, "crystal '%s' has no dispersion "
                            "data", c->crystal->id);
    double s[3];
    int use_dir = c->axis == 0;
    if (use_dir) {
        if (!c->mode)
            return dk_error_set(err, DK_EINVAL,
                                "give a principal axis ('o', 'e', 'X', 'Y', "
                                "'Z', 'n') or a mode ('o', 'e', 's', 'f', "
                                "'n') with a direction");
        dk_direction(c->theta_rad, c->phi_rad, s);
    } else if (!dk_set_find_axis(set, c->axis)) {
        return dk_error_set(err, DK_ENOTFOUND,
                            "data set '%s' of '%s' has no axis '%c' (it has "
                            "'%s')",
                            set->name, c->crystal->id, c->axis,
                            dk_crystal_axis_labels(c->crystal));
    }
    for (size_t i = 0; i < n; i++) {
        double om = omega_rad_per_fs[i];
        double lam = 2 * M_PI * DK_C_UM_PER_FS / om;
        double idx = NAN;
        unsigned w = 0;
        dk_status st;
        if (use_dir) {
            dk_mode m[2];
            st = dk_modes_at(c->crystal, set, lam, c->temp_c, s, m, &w, NULL);
            if (st == DK_OK) {
                int sel = dk_mode_select(m, c->mode);
                if (sel < 0)
                    return dk_error_set(err, DK_EINVAL,
                                        "'%s' has no mode '%c' in that "
                                        "direction",
                                        c->crystal->id, c->mode);
                idx = m[sel].n;
            }
        } else {
            st = dk_material_n(c->crystal, set, c->axis, lam, c->temp_c, &idx,
                               &w, NULL);
        }
        if (st == DK_OK && isfinite(idx) && idx > 0) {
            k_rad_per_um[i] = idx * om / DK_C_UM_PER_FS;
            c->warnings |= w;
        } else if (st == DK_OK || st == DK_ERANGE || st == DK_EDOM) {
            k_rad_per_um[i] = NAN;
            c->undefined++;
        } else {
            return dk_error_set(err, st, "cannot evaluate '%s' at %g um",
                                c->crystal->id, lam);
        }
    }
    return DK_OK;
}
