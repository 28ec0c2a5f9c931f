/*
 * vec3.h - the three-vector arithmetic of the index-surface eigenmodes
 * (modes.c with derivatives, modes_value.c without), kept in one place so
 * that both build the same polarisation basis and so give the same modes
 * and signs to rounding.
 */
#ifndef DELTAK_OPTICS_VEC3_H
#define DELTAK_OPTICS_VEC3_H

#include <math.h>

static inline double
vec3_dot(const double a[3], const double b[3])
{
    return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

static inline void
vec3_cross(const double a[3], const double b[3], double r[3])
{
    r[0] = a[1] * b[2] - a[2] * b[1];
    r[1] = a[2] * b[0] - a[0] * b[2];
    r[2] = a[0] * b[1] - a[1] * b[0];
}

/* Scale @v to unit length; the zero vector is left as it is. */
static inline void
vec3_normalise(double v[3])
{
    double m = sqrt(vec3_dot(v, v));
    if (m > 0)
        for (int i = 0; i < 3; i++)
            v[i] /= m;
}

/* An orthonormal pair (p, q) normal to the unit vector s; p lies in the
 * plane of s and Z (q normal to it), so that in uniaxial crystals p is
 * the e and q the o polarisation, which keeps labels and signs
 * continuous. Along Z the pair is taken from X, then Y. */
static inline void
vec3_basis(const double s[3], double p[3], double q[3])
{
    const double z[3] = {0, 0, 1};
    vec3_cross(z, s, q);
    if (vec3_dot(q, q) < 1e-24) {
        const double x[3] = {1, 0, 0};
        vec3_cross(s, x, q);
        if (vec3_dot(q, q) < 1e-24) {
            q[0] = 0, q[1] = 1, q[2] = 0;
        }
    }
    vec3_normalise(q);
    vec3_cross(q, s, p);
    vec3_normalise(p);
}

#endif
