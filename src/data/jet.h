/*
 * jet.h - truncated Taylor arithmetic (automatic differentiation) to third
 * order, internal to the library.
 *
 * A jet holds the Taylor coefficients t[k] = f^(k)(x0)/k!, k = 0..3, of a
 * quantity as a function of one independent variable. Sums, products,
 * quotients, logarithms and real powers of jets give the exact derivatives
 * of the result, so n(λ) and its first three λ-derivatives come out of one
 * evaluation of a dispersion formula with no step-size error.
 *
 * Recurrences (for k ≥ 1): quotient c = a/b, c_k = (a_k − Σ_{i=1..k} b_i c_{k−i}) / b_0;
 * logarithm c = ln a, c_k = (a_k − (1/k) Σ_{j=1..k−1} j c_j a_{k−j}) / a_0;
 * power c = a^r, c_k = (1/(k a_0)) Σ_{j=1..k} ((r+1) j − k) a_j c_{k−j}.
 *
 * References: A. Griewank, A. Walther, Evaluating Derivatives, 2nd ed.,
 * SIAM (2008), ch. 13 (Taylor arithmetic).
 */
#ifndef DK_JET_H
#define DK_JET_H

#include <math.h>

#define DK_JET_N 4

typedef struct dk_jet {
    double t[DK_JET_N]; /* Taylor coefficients f^(k)/k! */
} dk_jet;

static inline dk_jet
jet_const(double v)
{
    dk_jet r = {{v, 0, 0, 0}};
    return r;
}

static inline dk_jet
jet_var(double v)
{
    dk_jet r = {{v, 1, 0, 0}};
    return r;
}

static inline dk_jet
jet_add(dk_jet a, dk_jet b)
{
    for (int k = 0; k < DK_JET_N; k++)
        a.t[k] += b.t[k];
    return a;
}

static inline dk_jet
jet_sub(dk_jet a, dk_jet b)
{
    for (int k = 0; k < DK_JET_N; k++)
        a.t[k] -= b.t[k];
    return a;
}

static inline dk_jet
jet_scale(dk_jet a, double s)
{
    for (int k = 0; k < DK_JET_N; k++)
        a.t[k] *= s;
    return a;
}

static inline dk_jet
jet_mul(dk_jet a, dk_jet b)
{
    dk_jet c;
    for (int k = 0; k < DK_JET_N; k++) {
        double s = 0;
        for (int i = 0; i <= k; i++)
            s += a.t[i] * b.t[k - i];
        c.t[k] = s;
    }
    return c;
}

/* b.t[0] must be nonzero; the caller checks. */
static inline dk_jet
jet_div(dk_jet a, dk_jet b)
{
    dk_jet c;
    for (int k = 0; k < DK_JET_N; k++) {
        double s = a.t[k];
        for (int i = 1; i <= k; i++)
            s -= b.t[i] * c.t[k - i];
        c.t[k] = s / b.t[0];
    }
    return c;
}

/* a.t[0] must be positive; the caller checks. */
static inline dk_jet
jet_log(dk_jet a)
{
    dk_jet c;
    c.t[0] = log(a.t[0]);
    for (int k = 1; k < DK_JET_N; k++) {
        double s = 0;
        for (int j = 1; j < k; j++)
            s += j * c.t[j] * a.t[k - j];
        c.t[k] = (a.t[k] - s / k) / a.t[0];
    }
    return c;
}

/* a.t[0] must be positive; the caller checks. */
static inline dk_jet
jet_pow(dk_jet a, double r)
{
    dk_jet c;
    c.t[0] = pow(a.t[0], r);
    for (int k = 1; k < DK_JET_N; k++) {
        double s = 0;
        for (int j = 1; j <= k; j++)
            s += ((r + 1) * j - k) * a.t[j] * c.t[k - j];
        c.t[k] = s / (k * a.t[0]);
    }
    return c;
}

static inline int
jet_isfinite(dk_jet a)
{
    for (int k = 0; k < DK_JET_N; k++)
        if (!isfinite(a.t[k]))
            return 0;
    return 1;
}

#endif /* DK_JET_H */
