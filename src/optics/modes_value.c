/*
 * modes_value.c - value-only eigenmodes from principal indices (see
 * modes_value.h). The arithmetic follows src/optics/modes.c step by step
 * (its jets reduced to their values), so both give the same modes to
 * rounding; the walk-off is taken as atan2(|D × E|, D·E), which keeps
 * full precision for the ordinary wave (modes.c's acos(D·E) can give
 * ~1e-8 rad instead of 0 there).
 */
#include <math.h>

#include "deltak/material.h"
#include "optics/modes_value.h"
#include "optics/vec3.h"

/* Walk-offs below this are rounding (D and E of an ordinary wave are
 * parallel to ~1e-16): reported as 0. */
#define WALKOFF_FLOOR 1e-12   /* rad */

dk_status
dk_principal_n(const dk_crystal *c, const dk_dispersion_set *set,
               double lambda_um, double temp_c, double n[3], dk_error *err)
{
    const char *labels = dk_crystal_axis_labels(c);
    for (int i = 0; i < 3; i++) {
        char ax = c->optical_class == DK_BIAXIAL    ? labels[i]
                  : c->optical_class == DK_UNIAXIAL ? (i < 2 ? 'o' : 'e')
                                                    : 'n';
        if (i == 1 && c->optical_class != DK_BIAXIAL) {
            n[1] = n[0];
            continue;
        }
        if (i == 2 && c->optical_class == DK_ISOTROPIC) {
            n[2] = n[0];
            continue;
        }
        dk_status s = dk_material_n(c, set, ax, lambda_um, temp_c, &n[i],
                                    NULL, err);
        if (s)
            return s;
    }
    return DK_OK;
}

void
dk_dir_basis_of(const double s[3], dk_dir_basis *b)
{
    for (int i = 0; i < 3; i++)
        b->s[i] = s[i];
    vec3_normalise(b->s);
    vec3_basis(b->s, b->p, b->q);
}

/* The projected impermeability and its eigenvalues u[0] ≤ u[1]. */
typedef struct eig {
    double h, b;          /* half difference of the diagonal, off-diagonal */
    double u[2];
} eig;

static inline void
solve_ab(const double a[3], const dk_dir_basis *d, eig *e)
{
    double m11 = 0, m12 = 0, m22 = 0;
    for (int i = 0; i < 3; i++) {
        m11 += a[i] * (d->p[i] * d->p[i]);
        m12 += a[i] * (d->p[i] * d->q[i]);
        m22 += a[i] * (d->q[i] * d->q[i]);
    }
    double mean = (m11 + m22) * 0.5, half = (m11 - m22) * 0.5;
    double disc = half * half + m12 * m12;
    /* (modes.c treats a degenerate split apart only for derivatives) */
    double root = sqrt(disc > 0 ? disc : 0);
    e->u[0] = mean - root;
    e->u[1] = mean + root;
    e->h = half;
    e->b = m12;
}

static inline void
labels_of(const dk_crystal *c, const double a[3], const eig *e,
          char label[2])
{
    if (c->optical_class == DK_UNIAXIAL) {
        int o = fabs(e->u[0] - a[0]) < fabs(e->u[1] - a[0]) ? 0 : 1;
        label[o] = 'o';
        label[1 - o] = 'e';
    } else if (c->optical_class == DK_BIAXIAL) {
        label[0] = 's', label[1] = 'f';
    } else {
        label[0] = label[1] = 'n';
    }
}

static void
impermeability(const double n[3], double a[3])
{
    for (int i = 0; i < 3; i++)
        a[i] = 1 / (n[i] * n[i]);
}

void
dk_modes_value_ab(const dk_crystal *c, const double a[3],
                  const dk_dir_basis *b, double nm[2], char label[2])
{
    eig e;
    solve_ab(a, b, &e);
    nm[0] = 1 / sqrt(e.u[0]);
    nm[1] = 1 / sqrt(e.u[1]);
    labels_of(c, a, &e, label);
}

double
dk_mode_index_ab(const dk_crystal *c, const double a[3],
                 const dk_dir_basis *b, char label)
{
    eig e;
    solve_ab(a, b, &e);
    int k;
    switch (c->optical_class) {
    case DK_BIAXIAL:
        k = label == 's' ? 0 : label == 'f' ? 1 : -1;
        break;
    case DK_UNIAXIAL: {
        int o = fabs(e.u[0] - a[0]) < fabs(e.u[1] - a[0]) ? 0 : 1;
        k = label == 'o' ? o : label == 'e' ? 1 - o : -1;
        break;
    }
    default:
        k = 0;   /* isotropic: both modes are 'n' */
        break;
    }
    return k < 0 ? NAN : 1 / sqrt(e.u[k]);
}

void
dk_modes_value_n(const dk_crystal *c, const double n[3], const double s[3],
                 double nm[2], char label[2])
{
    double a[3];
    dk_dir_basis b;
    impermeability(n, a);
    dk_dir_basis_of(s, &b);
    dk_modes_value_ab(c, a, &b, nm, label);
}

void
dk_modes_value(const dk_crystal *c, const double n[3], const double s[3],
               dk_mode out[2])
{
    double a[3];
    dk_dir_basis d;
    eig e;
    impermeability(n, a);
    dk_dir_basis_of(s, &d);
    solve_ab(a, &d, &e);
    double ang = 0.5 * atan2(2 * e.b, 2 * e.h);
    double vbig[2] = {cos(ang), sin(ang)};
    double vsmall[2] = {-sin(ang), cos(ang)};
    char label[2];
    labels_of(c, a, &e, label);
    for (int k = 0; k < 2; k++) {
        dk_mode *m = &out[k];
        m->n = 1 / sqrt(e.u[k]);
        m->dn_dl = m->d2n_dl2 = m->d3n_dl3 = NAN;
        const double *v = k == 0 ? vsmall : vbig;
        for (int i = 0; i < 3; i++)
            m->d[i] = v[0] * d.p[i] + v[1] * d.q[i];
        vec3_normalise(m->d);
        for (int i = 0; i < 3; i++)
            m->e[i] = a[i] * m->d[i];
        vec3_normalise(m->e);
        /* The angle between D and E; atan2 of |D × E| and D·E keeps full
         * precision near 0, where acos(D·E) loses half the digits. */
        double dxe[3];
        vec3_cross(m->d, m->e, dxe);
        m->walkoff_rad = atan2(sqrt(vec3_dot(dxe, dxe)),
                               fabs(vec3_dot(m->d, m->e)));
        if (m->walkoff_rad < WALKOFF_FLOOR)
            m->walkoff_rad = 0;
        double sxe[3];
        vec3_cross(d.s, m->e, sxe);
        vec3_cross(m->e, sxe, m->poynting);
        vec3_normalise(m->poynting);
        m->label = label[k];
    }
}
