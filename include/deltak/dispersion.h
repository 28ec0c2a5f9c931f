/*
 * dispersion.h - refractive index n(λ, T) of one axis of one published data
 * set, with its exact first three wavelength derivatives and dn/dT.
 *
 * Every published form the database uses is written as a sum of terms in
 * one variable x (the vacuum wavelength λ in µm, or the photon energy
 * E = K/λ in eV), each term's coefficients being polynomials in a
 * temperature variable f (f = T − t0, or f = (T − t0)(T + t1)):
 *
 *   constant   S
 *   pole       S / (x² − P)          (P squared first when `squared`)
 *   pole_x2    S x² / (x² − P)
 *   power      S x^p
 *   log_ratio  S ln[(A² − x²) / (B² − x²)]
 *
 * The sum is n² or n. A separate thermo-optic formula may add
 * Σ_k ΔT^k · factor · g_k · Σ_j c_kj λ^e_j to n, where g_k is an optional
 * per-order factor (1 by default). The per-order factor carries forms that
 * print the temperature part as one product, e.g. K. Kato, IEEE J. Quantum
 * Electron. 30, 2950 (1994) for LiB3O5:
 *   Δn_X = (−3.76 λ + 2.30)·1e-6 · (ΔT + 29.13e-3 ΔT²),
 * entered as orders [[a, b], [a, b]] with g = [1, 29.13e-3], so the
 * paper's numbers stay as printed. The crystal-file schema is in
 * crystals/README.md.
 */
#ifndef DK_DISPERSION_H
#define DK_DISPERSION_H

#include "deltak/status.h"

#define DK_POLY_MAX 6        /* coefficients of one polynomial in f */
#define DK_THERMO_ORDERS 4   /* powers of ΔT in a thermo-optic add-on */
#define DK_THERMO_EXPS 8     /* λ powers in a thermo-optic add-on */
#define DK_SET_AXES 3        /* at most three principal axes */

/* c[0] + c[1] f + c[2] f² + ...; n = 0 means the zero polynomial. */
typedef struct dk_poly {
    int n;
    double c[DK_POLY_MAX];
} dk_poly;

typedef enum dk_term_kind {
    DK_TERM_CONSTANT,
    DK_TERM_POLE,
    DK_TERM_POLE_X2,
    DK_TERM_POWER,
    DK_TERM_LOG_RATIO
} dk_term_kind;

typedef struct dk_term {
    dk_term_kind kind;
    dk_poly strength;  /* S; for constant the value */
    dk_poly position;  /* P for poles, A for log_ratio */
    dk_poly lower;     /* B for log_ratio */
    int squared;       /* poles: P = position(f)² */
    double exponent;   /* power: p */
    double factor;     /* multiplies the whole term; 1 by default */
} dk_term;

typedef enum dk_variable {
    DK_VAR_WAVELENGTH_UM,
    DK_VAR_ENERGY_EV
} dk_variable;

typedef enum dk_temp_form {
    DK_TEMP_NONE,       /* coefficients do not depend on T */
    DK_TEMP_DIFFERENCE, /* f = T − t0 */
    DK_TEMP_PRODUCT     /* f = (T − t0)(T + t1) */
} dk_temp_form;

typedef enum dk_quantity {
    DK_QTY_N_SQUARED,
    DK_QTY_N
} dk_quantity;

/* Coefficients of a thermo-optic add-on for one axis. */
typedef struct dk_thermo_axis {
    int orders;                                   /* highest power of ΔT */
    double c[DK_THERMO_ORDERS][DK_THERMO_EXPS];   /* c[k-1][j] */
    double order_factor[DK_THERMO_ORDERS];        /* g_k; 1 when not given */
} dk_thermo_axis;

/* One axis of a set: its terms and, if any, its thermo-optic add-on. */
typedef struct dk_axis_formula {
    char label;            /* 'o', 'e', 'X', 'Y', 'Z' or 'n' */
    const char *formula;   /* the paper's formula, as text */
    const char *citation;  /* set when this axis comes from another paper */
    int nterms;
    dk_term *terms;
    int has_thermo;
    dk_thermo_axis thermo;
} dk_axis_formula;

/* A thermo-optic formula that adds to a set with no T dependence. */
typedef struct dk_thermo {
    const char *citation;
    const char *formula;
    double reference_temperature_c;
    double temperature_range_c[2];
    double factor;
    int nexps;
    double exps[DK_THERMO_EXPS];   /* λ exponents e_j */
} dk_thermo;

/* One published dispersion data set. */
typedef struct dk_dispersion_set {
    const char *name;              /* first author + year, e.g. "Gayer2008" */
    const char *citation;
    const char *doi;               /* may be NULL */
    const char *note;              /* may be NULL */
    int from_memory;               /* 1 when typed from memory */
    double wavelength_range_um[2]; /* fitted range */
    double temperature_range_c[2]; /* fitted range */
    double reference_temperature_c;
    dk_variable variable;
    double energy_constant_ev_um;  /* E = K/λ for DK_VAR_ENERGY_EV */
    dk_temp_form temp_form;
    double t0, t1;                 /* temperature variable parameters, °C */
    dk_quantity quantity;
    int naxes;
    dk_axis_formula axes[DK_SET_AXES];
    int has_thermo;
    dk_thermo thermo;
} dk_dispersion_set;

/* Flags in dk_index_value.warnings. */
#define DK_WARN_LAMBDA_RANGE 1u  /* λ outside the set's fitted range */
#define DK_WARN_TEMP_RANGE   2u  /* T outside the set's fitted range */
#define DK_WARN_NO_TEMP      4u  /* set has no T dependence; T ignored */

/* n and its derivatives at one (λ, T). */
typedef struct dk_index_value {
    double n;
    double dn_dl;     /* dn/dλ, 1/µm */
    double d2n_dl2;   /* d²n/dλ², 1/µm² */
    double d3n_dl3;   /* d³n/dλ³, 1/µm³ */
    double dn_dt;     /* dn/dT, 1/°C (0 for a set with no T dependence) */
    unsigned warnings;
} dk_index_value;

/*
 * dk_set_find_axis:
 * Returns: the axis of @set labelled @label, or NULL if the set lacks it.
 */
const dk_axis_formula *dk_set_find_axis(const dk_dispersion_set *set,
                                        char label);

/*
 * dk_set_has_temperature:
 * Returns: 1 when @set (or its thermo-optic add-on) depends on T.
 */
int dk_set_has_temperature(const dk_dispersion_set *set);

/*
 * dk_set_range_warnings:
 * Returns: the DK_WARN_* flags for evaluating @set at (λ, T): outside the
 * fitted wavelength or temperature range, or T ignored by a set with no
 * temperature dependence (more than 0.5 °C from its reference).
 */
unsigned dk_set_range_warnings(const dk_dispersion_set *set,
                               double lambda_um, double temp_c);

/*
 * dk_index_eval:
 * @set: the data set
 * @axis: one of @set's axes
 * @lambda_um: vacuum wavelength, µm, > 0
 * @temp_c: temperature, °C
 * @out: n, dn/dλ, d²n/dλ², d³n/dλ³, dn/dT and range warnings
 *
 * Evaluates by Taylor arithmetic, so the derivatives are exact up to
 * rounding. Outside the fitted ranges the formula is still evaluated and
 * a warning flag is set; the transparency range is the caller's business.
 *
 * Returns: DK_OK; DK_EINVAL for λ ≤ 0; DK_EDOM where the formula has no
 * finite real value (at or across a resonance, n² ≤ 0).
 */
dk_status dk_index_eval(const dk_dispersion_set *set,
                        const dk_axis_formula *axis, double lambda_um,
                        double temp_c, dk_index_value *out, dk_error *err);

/*
 * dk_index_n:
 * Returns: n alone (a convenience for solvers); NAN when dk_index_eval
 * fails. Callers must check isfinite().
 */
double dk_index_n(const dk_dispersion_set *set, const dk_axis_formula *axis,
                  double lambda_um, double temp_c);

#endif /* DK_DISPERSION_H */
