/*
 * dispersion_batch.h - value-only refractive index of one axis of one data
 * set at one temperature, for the hot loops of solvers, sweeps and maps
 * (internal to the library).
 *
 * Method: the set's formula (deltak/dispersion.h) is "compiled" once per
 * (set, axis, temperature): every coefficient polynomial in the
 * temperature variable is evaluated, pole positions squared, term factors
 * folded into the strengths, and the thermo-optic add-on reduced to
 * Σ_j C_j λ^e_j. Formulas in λ made of constants, poles and even integer
 * powers (all but the photon-energy forms) take the canonical form
 *
 *   n² (or n) = C + N(λ²)/D(λ²) + Σ_k c_k λ^2k,  k = −3 … 3,
 *
 * with the poles A_m/(λ² − P_m) (a pole_x2 S λ²/(λ² − P) being S + S P /
 * (λ² − P)) summed into one fraction, N/D = Σ_m A_m/(λ² − P_m), built pole
 * by pole as (N, D) ← (N u + A D, D u), u = λ² − P: one division and one
 * square root per wavelength, the least a Sellmeier formula needs (the
 * summed fraction is as well conditioned as the sum of the poles for the
 * database's formulas, whose poles lie outside the fitted ranges). Other
 * forms are evaluated term by term. The scalar and the batch evaluation
 * share the arithmetic and give identical bits; both agree with
 * dk_index_eval() (Taylor arithmetic, the terms one by one) to ~1e-15
 * (tests/test_batch.c).
 *
 * The batch evaluation is one vectorised loop over the wavelengths per
 * formula shape (number of poles, negative powers), built for x86-64
 * baseline, AVX2 and AVX-512 and chosen at run time by GCC's
 * target_clones where the compiler and CPU support them.
 *
 * Outside [lo_um, hi_um] (the crystal's transparency range, or (0, ∞)),
 * at a resonance of the formula or where n² ≤ 0 the value is NaN; range
 * flags are the caller's business (deltak/design.h).
 */
#ifndef DK_DISPERSION_BATCH_H
#define DK_DISPERSION_BATCH_H

#include <stddef.h>

#include "deltak/dispersion.h"

#define DK_NFAST_TERMS 16   /* terms of one axis (the database uses ≤ 8) */
#define DK_NFAST_POLES 4    /* poles of the canonical form (database ≤ 3) */

/* One term with its coefficients evaluated at the temperature. */
typedef struct dk_nfast_term {
    dk_term_kind kind;
    int ipow;          /* power: exponent / 2 when it is an even integer
                        * (x^p = (x²)^ipow), else 0 and pow() is used */
    double s;          /* strength × factor */
    double p;          /* pole position P (squared if the set says so);
                        * log_ratio: A² */
    double b2;         /* log_ratio: B² */
    double e;          /* power: the exponent */
} dk_nfast_term;

/* The canonical form (see the top of this file). */
typedef struct dk_nfast_canon {
    double c;          /* the constant */
    int npole;
    double pa[DK_NFAST_POLES], pp[DK_NFAST_POLES];   /* A_m, P_m */
    double cpos[3];    /* c_1 … c_3 of λ², λ⁴, λ⁶ */
    double cneg[3];    /* c_−1 … c_−3 */
    int neg;           /* some c_−k ≠ 0 */
    int thermo;        /* a thermo-optic add-on: */
    double tpos[2];    /* its λ⁰, λ¹ coefficients */
    double tneg[3];    /* and λ⁻¹ … λ⁻³ */
    int squared;
    double lo_um, hi_um;
} dk_nfast_canon;

typedef struct dk_nfast {
    int canonical;     /* use cf (else the terms below) */
    dk_nfast_canon cf;
    int nterms;
    dk_nfast_term t[DK_NFAST_TERMS];
    int energy;        /* x = kev / λ (photon energy in eV) */
    double kev;
    int squared;       /* the terms sum to n² */
    int nthermo;       /* thermo-optic add-on Σ_j C_j λ^e_j */
    double th_c[DK_THERMO_EXPS];
    double th_e[DK_THERMO_EXPS];
    int th_int[DK_THERMO_EXPS];   /* 1 when e_j is a small integer */
    double lo_um, hi_um;          /* NaN outside [lo, hi] */
} dk_nfast;

/*
 * dk_nfast_compile:
 * @set, @axis: one axis of a data set
 * @temp_c: temperature, °C (finite)
 * @lo_um, @hi_um: where values are wanted (the transparency range), or
 *   0 and INFINITY
 * Returns: DK_OK; DK_EDOM when a coefficient is not finite at @temp_c;
 * DK_EINVAL when the axis has more than DK_NFAST_TERMS terms (the caller
 * then uses dk_index_eval()).
 */
dk_status dk_nfast_compile(const dk_dispersion_set *set,
                           const dk_axis_formula *axis, double temp_c,
                           double lo_um, double hi_um, dk_nfast *out);

/* n at @lambda_um (µm); NaN outside the range or at a resonance. */
double dk_nfast_n(const dk_nfast *f, double lambda_um);

/* n and dn/dλ (1/µm) at @lambda_um; NaN (both) as dk_nfast_n(). */
double dk_nfast_n_d(const dk_nfast *f, double lambda_um, double *dn_dl);

/*
 * dk_nfast_batch:
 * n at @count wavelengths @lambda_um into @n (which may not alias
 * @lambda_um). @work must hold 3·@count doubles. No allocation.
 */
void dk_nfast_batch(const dk_nfast *f, const double *lambda_um, double *n,
                    double *work, size_t count);

#endif /* DK_DISPERSION_BATCH_H */
