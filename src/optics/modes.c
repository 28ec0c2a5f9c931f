/*
 * modes.c - eigenmodes of the index surface (method and references in
 * deltak/modes.h).
 *
 * The 2×2 projected impermeability M = Pᵀ diag(a) P (a_i = 1/n_i², P an
 * orthonormal basis of the plane normal to s) is evaluated in truncated
 * Taylor arithmetic in λ (src/data/jet.h) so that the eigen-indices carry their
 * exact λ-derivatives at fixed direction, which the group index, GVD and
 * GVM of extraordinary waves need. On an optic axis the two eigenvalues
 * coincide; there the derivative of the square root is singular and the
 * mode derivatives fall back to those of the mean eigenvalue.
 */
#include <math.h>
#include <string.h>

#include "deltak/material.h"
#include "deltak/modes.h"
#include "optics/vec3.h"
#include "data/jet.h"

#define DEGENERATE 1e-14   /* relative eigenvalue split below which the
                            * two modes count as degenerate */

void
dk_direction(double theta_rad, double phi_rad, double s[3])
{
    s[0] = sin(theta_rad) * cos(phi_rad);
    s[1] = sin(theta_rad) * sin(phi_rad);
    s[2] = cos(theta_rad);
}

/* n jet of a principal axis from its value and derivatives. */
static dk_jet
axis_jet(const dk_index_value *v)
{
    dk_jet j = {{v->n, v->dn_dl, v->d2n_dl2 / 2, v->d3n_dl3 / 6}};
    return j;
}

dk_status
dk_modes_at(const dk_crystal *c, const dk_dispersion_set *set,
            double lambda_um, double temp_c, const double s_in[3],
            dk_mode out[2], unsigned *warnings, dk_error *err)
{
    const char *labels = dk_crystal_axis_labels(c);
    dk_jet a[3];
    for (int i = 0; i < 3; i++) {
        char ax = c->optical_class == DK_BIAXIAL    ? labels[i]
                  : c->optical_class == DK_UNIAXIAL ? (i < 2 ? 'o' : 'e')
                                                    : 'n';
        dk_index_value v;
        dk_status st = dk_material_index(c, set, ax, lambda_um, temp_c, &v,
                                         err);
        if (st)
            return st;
        if (warnings)
            *warnings |= v.warnings;
        dk_jet n = axis_jet(&v);
        a[i] = jet_div(jet_const(1), jet_mul(n, n));
    }
    double s[3] = {s_in[0], s_in[1], s_in[2]};
    vec3_normalise(s);
    double p[3], q[3];
    vec3_basis(s, p, q);
    /* M = [[pᵀAp, pᵀAq], [pᵀAq, qᵀAq]] with A = diag(a). */
    dk_jet m11 = jet_const(0), m12 = jet_const(0), m22 = jet_const(0);
    for (int i = 0; i < 3; i++) {
        m11 = jet_add(m11, jet_scale(a[i], p[i] * p[i]));
        m12 = jet_add(m12, jet_scale(a[i], p[i] * q[i]));
        m22 = jet_add(m22, jet_scale(a[i], q[i] * q[i]));
    }
    dk_jet mean = jet_scale(jet_add(m11, m22), 0.5);
    dk_jet half = jet_scale(jet_sub(m11, m22), 0.5);
    dk_jet disc = jet_add(jet_mul(half, half), jet_mul(m12, m12));
    dk_jet root;
    if (disc.t[0] > DEGENERATE * DEGENERATE * mean.t[0] * mean.t[0])
        root = jet_pow(disc, 0.5);
    else
        root = jet_const(sqrt(fmax(disc.t[0], 0)));
    /* u = 1/n²: the smaller u is the slow mode. */
    dk_jet u[2] = {jet_sub(mean, root), jet_add(mean, root)};
    /* Eigenvectors of the value matrix, in the (p, q) basis. */
    double h = half.t[0], b = m12.t[0];
    double ang = 0.5 * atan2(2 * b, 2 * h); /* angle of the larger-u vector */
    double vbig[2] = {cos(ang), sin(ang)};
    double vsmall[2] = {-sin(ang), cos(ang)};
    for (int k = 0; k < 2; k++) {
        dk_mode *m = &out[k];
        dk_jet n = jet_pow(u[k], -0.5);
        m->n = n.t[0];
        m->dn_dl = n.t[1];
        m->d2n_dl2 = 2 * n.t[2];
        m->d3n_dl3 = 6 * n.t[3];
        const double *v = k == 0 ? vsmall : vbig;
        for (int i = 0; i < 3; i++)
            m->d[i] = v[0] * p[i] + v[1] * q[i];
        vec3_normalise(m->d);
        for (int i = 0; i < 3; i++)
            m->e[i] = a[i].t[0] * m->d[i];
        vec3_normalise(m->e);
        double cr = fmin(1.0, fabs(vec3_dot(m->d, m->e)));
        m->walkoff_rad = acos(cr);
        double sxe[3];
        vec3_cross(s, m->e, sxe);
        vec3_cross(m->e, sxe, m->poynting);
        vec3_normalise(m->poynting);
        m->label = c->optical_class == DK_BIAXIAL ? (k == 0 ? 's' : 'f')
                                                  : 'n';
    }
    if (c->optical_class == DK_UNIAXIAL) {
        /* The o mode has 1/n² = 1/n_o² exactly, D normal to s and Z. */
        double d0 = fabs(u[0].t[0] - a[0].t[0]);
        double d1 = fabs(u[1].t[0] - a[0].t[0]);
        int o = d0 < d1 ? 0 : 1;
        out[o].label = 'o';
        out[1 - o].label = 'e';
    }
    return DK_OK;
}

int
dk_mode_select(const dk_mode m[2], char label)
{
    if (m[0].label == label)
        return 0;
    if (m[1].label == label)
        return 1;
    if (label == 'n' || m[0].label == 'n')
        return 0;
    return -1;
}
