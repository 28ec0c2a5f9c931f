/*
 * sweep.h - tuning curves and phase-matching maps: set one or two design
 * variables over a grid and, at each point, solve for another quantity
 * (every root) or evaluate the phase-matching function sinc²(ΔkL/2).
 *
 * Variables: QPM period (µm, as written), temperature (°C), pump, signal,
 * idler or fundamental wavelength (µm), and the propagation angles θ, φ
 * (rad). When the pump changes, the wave the user fixed (signal or idler)
 * stays and the other follows energy conservation; when the signal or
 * idler changes, the pump stays.
 * Targets: the idler or signal wavelength (both of the pair for
 * DK_VAR_WAVELENGTHS), the QPM period, the phase-matching temperature,
 * or the birefringent angle θ.
 */
#ifndef DK_SWEEP_H
#define DK_SWEEP_H

#include "deltak/tolerance.h"

typedef enum dk_var {
    DK_VAR_PERIOD,
    DK_VAR_TEMP,
    DK_VAR_PUMP,
    DK_VAR_SIGNAL,
    DK_VAR_IDLER,
    DK_VAR_FUNDAMENTAL,
    DK_VAR_THETA,
    DK_VAR_PHI,
    DK_VAR_WAVELENGTHS   /* target only: signal and idler of each pair */
} dk_var;

/* A design being swept: the design and which wave the user holds. */
typedef struct dk_sweep {
    dk_design d;
    int held;            /* 1: signal fixed, 2: idler fixed, 0: neither */
    double t_lo_c, t_hi_c; /* where temperature roots are sought */
} dk_sweep;

/*
 * dk_var_parse:
 * @name: "period", "temp", "pump", "signal", "idler", "fundamental",
 *   "theta", "phi" (and, as a target, "wavelengths")
 * Returns: DK_OK or DK_EINVAL listing the names.
 */
dk_status dk_var_parse(const char *name, dk_var *v, dk_error *err);

/* The variable's name and its unit in sweeps ("um", "C", "deg"). */
const char *dk_var_name(dk_var v);
const char *dk_var_unit(dk_var v);

/*
 * dk_sweep_set:
 * Set variable @v of @s to @value (in the unit of dk_var_unit(): µm, °C
 * or degrees).
 * Returns: DK_OK; DK_EINVAL when @v does not apply to the design (e.g. θ
 * for QPM) or the waves become impossible.
 */
dk_status dk_sweep_set(dk_sweep *s, dk_var v, double value, dk_error *err);

/*
 * dk_sweep_solve:
 * Every value of @target (in its sweep unit) that phase-matches the
 * current design, ascending; for DK_VAR_WAVELENGTHS the signal and idler
 * of each pair. *n = 0 when there is none.
 * Returns: DK_OK; DK_EINVAL when @target cannot be solved for this kind
 * of design.
 */
dk_status dk_sweep_solve(dk_sweep *s, dk_var target, double *values,
                         int max, int *n, dk_error *err);

/*
 * dk_sweep_rephase:
 * Put the design back on phase matching after a change: a QPM design
 * gets the period of the current waves and temperature (unless
 * @keep_period), a birefringent one the θ nearest its current θ.
 * Returns: DK_OK; DK_ENOROOT when nothing phase-matches here.
 */
dk_status dk_sweep_rephase(dk_sweep *s, int keep_period, dk_error *err);

/*
 * dk_sweep_sinc2:
 * sinc²(ΔkL/2) of the current design (length s->d.length_mm); NAN where
 * Δk is undefined.
 */
double dk_sweep_sinc2(dk_sweep *s);

#endif /* DK_SWEEP_H */
