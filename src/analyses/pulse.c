/*
 * pulse.c - group velocities, GVM, GVD and parting lengths of a design
 * (formulas and references in deltak/pulse.h).
 *
 * QPM designs: each wave along the grating axis, polarised along its
 * principal axis (no walk-off). Birefringent designs: each wave in its
 * eigenmode along its own wave vector (deltak/angle.h: the idler of a
 * noncollinear design along k_p − k_s), with the mode's exact
 * λ-derivatives from deltak/modes.h.
 */
#include <math.h>
#include <string.h>

#include "deltak/group.h"
#include "deltak/material.h"
#include "deltak/pulse.h"

static void
fill(dk_wave_props *p, double lam, double n, double d1, double d2, double d3)
{
    p->lambda_um = lam;
    p->n = n;
    p->group_index = dk_group_index(lam, n, d1);
    p->gvd_fs2_per_mm = dk_gvd_fs2_per_mm(lam, d2);
    p->tod_fs3_per_mm = dk_tod_fs3_per_mm(lam, d2, d3);
}

static double
angle_between(const double a[3], const double b[3])
{
    double c = a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
    return acos(fmax(-1.0, fmin(1.0, c)));
}

dk_status
dk_pulse_props_of(dk_design *d, dk_pulse_props *out, dk_error *err)
{
    const double lam[3] = {d->waves.signal_um, d->waves.idler_um,
                           d->waves.pump_um};
    double dir[3][3] = {{0}};
    memset(out, 0, sizeof *out);
    if (d->scheme == DK_SCHEME_QPM) {
        const dk_qpm *q = &d->qpm;
        for (int k = 0; k < 3; k++) {
            dk_index_value v;
            dk_status s = dk_material_index(q->crystal, q->set, q->pol[k],
                                            lam[k], d->temp_c, &v, err);
            if (s)
                return s;
            fill(&out->w[k], lam[k], v.n, v.dn_dl, v.d2n_dl2, v.d3n_dl3);
            out->w[k].poynting[q->crystal->grating_axis] = 1;
            dir[k][q->crystal->grating_axis] = 1;
        }
    } else {
        dk_angle_problem pb = d->angle;
        pb.waves = d->waves;
        pb.temp_c = d->temp_c;
        dk_mode m[3];
        dk_status st = dk_angle_waves(&pb, d->pol, d->theta_rad, d->phi_rad,
                                      dir, m, err);
        if (st)
            return st;
        for (int k = 0; k < 3; k++) {
            fill(&out->w[k], lam[k], m[k].n, m[k].dn_dl, m[k].d2n_dl2,
                 m[k].d3n_dl3);
            out->w[k].walkoff_rad = m[k].walkoff_rad;
            memcpy(out->w[k].poynting, m[k].poynting, sizeof m[k].poynting);
        }
        out->noncollinear = d->angle.alpha_rad != 0;
    }
    static const int pairs[3][2] = {{0, 2}, {1, 2}, {0, 1}};
    for (int k = 0; k < 3; k++) {
        const dk_wave_props *a = &out->w[pairs[k][0]], *b = &out->w[pairs[k][1]];
        double ang = angle_between(dir[pairs[k][0]], dir[pairs[k][1]]);
        out->angle_rad[k] = out->noncollinear ? ang : 0;
        /* Pairs with the pump: the first wave projected on the pump
         * direction; signal-idler: the idler on the signal direction. */
        double ga = a->group_index, gb = b->group_index;
        if (k < 2)
            ga /= cos(out->angle_rad[k]);
        else
            gb /= cos(out->angle_rad[k]);
        out->gvm_fs_per_mm[k] = dk_inverse_group_velocity_fs_per_mm(ga) -
                                dk_inverse_group_velocity_fs_per_mm(gb);
        out->walkoff_rad[k] = angle_between(a->poynting, b->poynting);
    }
    return DK_OK;
}

double
dk_splitting_length_mm(double tau_fs, double gvm_fs_per_mm)
{
    return gvm_fs_per_mm == 0 ? INFINITY : tau_fs / fabs(gvm_fs_per_mm);
}

double
dk_aperture_length_mm(double waist_um, double walkoff_rad)
{
    return walkoff_rad == 0 ? INFINITY
                            : sqrt(M_PI) * waist_um * 1e-3 / walkoff_rad;
}
