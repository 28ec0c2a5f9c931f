/*
 * sweep.h - tuning curves and phase-matching maps of a design: set one or
 * two design variables over a grid and, at each point, solve for another
 * quantity (every root) or evaluate an analysis of the phase-matched
 * design (GVM, d_eff, acceptance) or the phase-matching function
 * sinc²(ΔkL/2).
 *
 * Variables: QPM period (µm, as written), temperature (°C), pump, signal,
 * idler or fundamental wavelength (µm), the propagation angles θ, φ and
 * the noncollinear angle α (degrees), and the crystal length (mm). When
 * the pump changes, the wave the user fixed (signal or idler) stays and
 * the other follows energy conservation; when the signal or idler
 * changes, the pump stays.
 * Targets: the idler or signal wavelength (both of each pair for
 * DK_VAR_WAVELENGTHS), the QPM period, the phase-matching temperature, or
 * the birefringent angle θ (φ in a biaxial XY plane).
 *
 * Analyses follow the phase-matched design: at each point the design is
 * first brought back to phase matching (the QPM period of the current
 * waves unless the grating is given or swept; the birefringent θ, or φ in
 * the XY plane, nearest the previous point's), then analysed — so a d_eff
 * or GVM sweep shows what a crystal cut for each point would give.
 *
 * Every point carries the DK_RANGE_* flags of deltak/design.h; notes say
 * which wave left which fitted range and how far.
 *
 * How (the answers are those of dk_sweep_solve() and dk_sweep_sinc2() at
 * every point; only the work differs): roots along a curve and the map's
 * Δk = 0 line are followed by continuation from point to point (Newton on
 * exact derivatives, a bracketed safeguard, the scan's grid kept under
 * watch so that every root the full scan finds is found), and the points
 * where two branches meet - signal and idler at degeneracy - are added to
 * the series they end or start; maps and sinc² curves (QPM, or a
 * birefringent design at a fixed direction) are computed in vectorised
 * lines with the formulas compiled once per temperature; family members
 * and map lines run on all cores (OpenMP), with results that do not
 * depend on the number of threads.
 *
 * Limits (a request beyond them is an error, never cut silently):
 * DK_SWEEP_MAX_POINTS points per curve, DK_SWEEP_MAX_FAMILY family
 * members, DK_MAP_MAX_CELLS map cells (about 10 bytes each while the map
 * is made, 9 in the result).
 */
#ifndef DK_SWEEP_H
#define DK_SWEEP_H

#include <stddef.h>

#include "deltak/tolerance.h"

#define DK_SWEEP_MAX_POINTS 100000
#define DK_SWEEP_MAX_FAMILY 12
#define DK_SWEEP_MAX_ROOTS 16
#define DK_MAP_MAX_SIDE 20000
#define DK_MAP_MAX_CELLS (2048 * 2048)

typedef enum dk_var {
    DK_VAR_PERIOD,
    DK_VAR_TEMP,
    DK_VAR_PUMP,
    DK_VAR_SIGNAL,
    DK_VAR_IDLER,
    DK_VAR_FUNDAMENTAL,
    DK_VAR_THETA,
    DK_VAR_PHI,
    DK_VAR_ALPHA,        /* noncollinear internal pump-signal angle */
    DK_VAR_LENGTH,       /* crystal length, mm */
    DK_VAR_WAVELENGTHS   /* target only: signal and idler of each pair */
} dk_var;

/* What is computed at each point of a curve. */
typedef enum dk_sweep_quantity {
    DK_SWEEP_SOLVE,          /* every value of the target variable */
    DK_SWEEP_GVM,            /* three series: signal−pump, idler−pump,
                              * signal−idler, fs/mm (projected when
                              * noncollinear, deltak/pulse.h) */
    DK_SWEEP_DEFF,           /* |d_eff|, pm/V */
    DK_SWEEP_SINC2,          /* sinc²(ΔkL/2) of the design held fixed */
    DK_SWEEP_ACCEPT_TEMP,    /* temperature acceptance FWHM, °C */
    DK_SWEEP_ACCEPT_SIGNAL,  /* spectral acceptance FWHM of the signal
                              * (fundamental), nm */
    DK_SWEEP_ACCEPT_THETA    /* angular acceptance FWHM in θ, mrad */
} dk_sweep_quantity;

/* A design being swept. */
typedef struct dk_sweep {
    dk_design d;
    double t_lo_c, t_hi_c;   /* where temperature roots are sought */
} dk_sweep;

/* One curve: NaN in y breaks the line. */
typedef struct dk_series {
    char label[96];      /* UTF-8 legend text, may be empty */
    int family;          /* index of the family member, -1 if none */
    int branch;          /* root branch (solve) or component (GVM) */
    int wave;            /* for DK_VAR_WAVELENGTHS: 0 signal, 1 idler; -1 */
    size_t n;
    double *x, *y;
    unsigned *flags;     /* DK_RANGE_* per point */
} dk_series;

typedef struct dk_sweep_spec {
    dk_var x;
    double x_lo, x_hi;   /* in the variable's sweep unit */
    int nx;              /* 2 … DK_SWEEP_MAX_POINTS */
    int nfamily;         /* 0: no family */
    dk_var family;
    double family_values[DK_SWEEP_MAX_FAMILY];
    dk_sweep_quantity quantity;
    dk_var target;       /* for DK_SWEEP_SOLVE */
} dk_sweep_spec;

typedef struct dk_sweep_result {
    int nseries;
    dk_series *series;
    unsigned flags;      /* OR of every point's flags */
    dk_notes notes;      /* which wave left which range, how far */
} dk_sweep_result;

typedef struct dk_map_spec {
    dk_var x, y;
    double x_lo, x_hi, y_lo, y_hi;
    int nx, ny;          /* 2 … DK_MAP_MAX_SIDE, nx·ny ≤ DK_MAP_MAX_CELLS */
} dk_map_spec;

/* Cell states of a map. */
#define DK_CELL_OK 0
#define DK_CELL_EXTRAPOLATED 1   /* outside a fitted range */
#define DK_CELL_UNDEFINED 2      /* no index (opaque, resonance) */

typedef struct dk_map_result {
    int nx, ny;
    double *x, *y;       /* grid values, nx and ny of them */
    double *z;           /* sinc², row-major: z[j·nx + i]; NaN undefined */
    unsigned char *cell; /* DK_CELL_* per cell */
    dk_series ridge;     /* Δk = 0 from the solver (NaN breaks), may be
                          * empty when y cannot be solved for */
    unsigned flags;
    dk_notes notes;
} dk_map_result;

/*
 * dk_var_parse:
 * @name: "period", "temp", "pump", "signal", "idler", "fundamental",
 *   "theta", "phi", "alpha", "length" (and, as a target, "wavelengths")
 * Returns: DK_OK or DK_EINVAL listing the names.
 */
dk_status dk_var_parse(const char *name, dk_var *v, dk_error *err);

/* The variable's name and its unit in sweeps ("um", "C", "deg", "mm"). */
const char *dk_var_name(dk_var v);
const char *dk_var_unit(dk_var v);

/*
 * dk_var_check:
 * Whether @value (sweep unit) is one a sweep of @v takes: temperatures
 * −273.15 to 1000 °C, wavelengths 1 nm to 1 mm, periods 1 nm to 10 mm,
 * angles ±360° (α below 45°), lengths up to 10 m.
 * Returns: DK_OK or DK_EINVAL naming the variable and the limits.
 */
dk_status dk_var_check(dk_var v, double value, dk_error *err);

/* 1 for the wavelength variables. */
int dk_var_is_wavelength(dk_var v);

/*
 * dk_sweep_quantity_parse:
 * "gvm", "deff", "sinc2", "accept-temp", "accept-signal", "accept-theta",
 * or a target variable name (DK_SWEEP_SOLVE with *target set).
 * Returns: DK_OK or DK_EINVAL listing the names.
 */
dk_status dk_sweep_quantity_parse(const char *name, dk_sweep_quantity *q,
                                  dk_var *target, dk_error *err);

/* Name and unit of a quantity's values ("deff", "pm_per_V"); for
 * DK_SWEEP_SOLVE those of @target. */
const char *dk_sweep_quantity_name(dk_sweep_quantity q, dk_var target);
const char *dk_sweep_quantity_unit(dk_sweep_quantity q, dk_var target);

/*
 * dk_sweep_init:
 * Start sweeping a copy of @base (set up, solved or not). The temperature
 * search range is the request's, else the set's fitted range ±50 °C.
 */
void dk_sweep_init(dk_sweep *s, const dk_design *base);

/*
 * dk_sweep_set:
 * Set variable @v of @s to @value (in the unit of dk_var_unit(): µm, °C,
 * degrees or mm).
 * Returns: DK_OK; DK_EINVAL when @v does not apply to the design (e.g. θ
 * for QPM) or the waves become impossible.
 */
dk_status dk_sweep_set(dk_sweep *s, dk_var v, double value, dk_error *err);

/*
 * dk_sweep_solve:
 * Every value of @target (in its sweep unit) that phase-matches the
 * current design, ascending; for DK_VAR_WAVELENGTHS the signal and idler
 * of each pair (signal first). *n = 0 when there is none.
 * Returns: DK_OK; DK_EINVAL when @target cannot be solved for this kind
 * of design.
 */
dk_status dk_sweep_solve(dk_sweep *s, dk_var target, double *values,
                         int max, int *n, dk_error *err);

/*
 * dk_sweep_rephase:
 * Put the design back on phase matching after a change: a QPM design
 * gets the period of the current waves and temperature (unless
 * @keep_period), a birefringent one the θ (φ in a biaxial XY plane)
 * nearest its current one.
 * Returns: DK_OK; DK_ENOROOT when nothing phase-matches here.
 */
dk_status dk_sweep_rephase(dk_sweep *s, int keep_period, dk_error *err);

/* sinc²(ΔkL/2) of the current design; NAN where Δk is undefined or no
 * length is set. */
double dk_sweep_sinc2(dk_sweep *s);

/*
 * dk_sweep_curves:
 * Every point of @spec for @base, as series: for DK_SWEEP_SOLVE one per
 * family member and root branch (per wave for DK_VAR_WAVELENGTHS); three
 * per member for GVM; one otherwise. Points without a value are NaN.
 * Returns: DK_OK (series may be all NaN: check res->nseries and the
 * values); DK_EINVAL for a bad spec (beyond the limits, a variable that
 * does not apply); DK_ENOROOT when no point of the sweep has a value
 * (the message says why the first point failed); DK_ENOMEM.
 */
dk_status dk_sweep_curves(const dk_design *base, const dk_sweep_spec *spec,
                          dk_sweep_result *res, dk_error *err);

void dk_sweep_result_free(dk_sweep_result *res);

/*
 * dk_sweep_map:
 * sinc²(ΔkL/2) of @base (its length) over the grid of @spec, with the
 * Δk = 0 line found by the solver along y for each x (when y can be solved
 * for).
 * Returns: DK_OK; DK_EINVAL for a bad spec or a design without a length;
 * DK_ENOROOT when the model is undefined over the whole grid; DK_ENOMEM.
 */
dk_status dk_sweep_map(const dk_design *base, const dk_map_spec *spec,
                       dk_map_result *res, dk_error *err);

void dk_map_result_free(dk_map_result *res);

#endif /* DK_SWEEP_H */
