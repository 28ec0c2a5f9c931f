/*
 * pulse.c - group velocities, GVM, GVD and parting lengths of a design
 * (formulas and references in deltak/pulse.h).
 *
 * QPM designs: each wave along the grating axis, polarised along its
 * principal axis (no walk-off). Birefringent designs: each wave in its
 * eigenmode along the pump direction (collinear; for a noncollinear
 * design along its own direction), with the mode's exact λ-derivatives
 * from deltak/modes.h.
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
    memset(out, 0, sizeof *out);
    if (d->kind == DK_DESIGN_QPM) {
        const dk_qpm *q = &d->qpm;
        for (int k = 0; k < 3; k++) {
            dk_index_value v;
            dk_status s = dk_material_index(q->crystal, q->set, q->pol[k],
                                            lam[k], d->temp_c, &v, err);
            if (s)
                return s;
            fill(&out->w[k], lam[k], v.n, v.dn_dl, v.d2n_dl2, v.d3n_dl3);
            out->w[k].poynting[q->crystal->grating_axis] = 1;
        }
    } else {
        dk_angle_problem *pb = &d->angle;
        double sp[3], ss[3];
        dk_direction(d->theta_rad, d->phi_rad, sp);
        dk_direction(d->theta_rad + pb->alpha_rad, d->phi_rad, ss);
        for (int k = 0; k < 3; k++) {
            /* The idler of a noncollinear design would need its own
             * direction; the collinear case is the common one here. */
            const double *s = k == 0 ? ss : sp;
            dk_mode m[2];
            dk_status st = dk_modes_at(pb->crystal, pb->set, lam[k],
                                       d->temp_c, s, m, &pb->warnings, err);
            if (st)
                return st;
            int i = dk_mode_select(m, d->pol[k]);
            if (i < 0)
                return dk_error_set(err, DK_ENOTFOUND, "no mode '%c'",
                                    d->pol[k]);
            fill(&out->w[k], lam[k], m[i].n, m[i].dn_dl, m[i].d2n_dl2,
                 m[i].d3n_dl3);
            out->w[k].walkoff_rad = m[i].walkoff_rad;
            memcpy(out->w[k].poynting, m[i].poynting, sizeof m[i].poynting);
        }
    }
    static const int pairs[3][2] = {{0, 2}, {1, 2}, {0, 1}};
    for (int k = 0; k < 3; k++) {
        const dk_wave_props *a = &out->w[pairs[k][0]], *b = &out->w[pairs[k][1]];
        out->gvm_fs_per_mm[k] = dk_inverse_group_velocity_fs_per_mm(
                                    a->group_index) -
                                dk_inverse_group_velocity_fs_per_mm(
                                    b->group_index);
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
