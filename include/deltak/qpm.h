/*
 * qpm.h - collinear quasi-phase matching in a poled (or orientation-
 * patterned) crystal: period, temperature and wavelength solvers.
 *
 *   Δk = |2π (n_p/λp − n_s/λs − n_i/λi)| − 2π m / Λ(T)        (rad/µm)
 *   Λ(T) = Λ_w · e(T) / e(T_w),  e(T) = 1 + α(T − T_ref) + β(T − T_ref)²
 *
 * (the grating supplies ±2πm/Λ, so the sign of the material mismatch does
 * not matter), with Λ_w the period as written at T_w (default 25 °C) and
 * e the thermal expansion along the grating axis from the crystal file.
 * Beams propagate along the grating axis; each wave's polarisation is a
 * principal axis. Range flags of answers are the design layer's
 * (dk_design_range_flags() in deltak/design.h); the solvers keep none.
 * References: M. M. Fejer, G. A. Magel, D. H. Jundt, R. L. Byer, IEEE J.
 * Quantum Electron. 28, 2631 (1992).
 */
#ifndef DK_QPM_H
#define DK_QPM_H

#include "deltak/crystal.h"
#include "deltak/interaction.h"
#include "deltak/nonlinear.h"

typedef struct dk_qpm {
    const dk_crystal *crystal;
    const dk_dispersion_set *set;
    char pol[3];            /* axis label of signal, idler, pump */
    int order;              /* QPM order m ≥ 1 */
    double duty;            /* duty cycle, 0 < D < 1 */
    double written_temp_c;  /* the period is as written at this T */
} dk_qpm;

/*
 * dk_qpm_init:
 * @pol: polarisation letters for signal, idler, pump, e.g. "zzz", "eee",
 *   "yzy", "ooe"; NULL for type 0 (all along the polar axis). Uniaxial
 *   crystals take o/e (z = e, x or y = o); biaxial x/y/z (not along the
 *   grating axis); isotropic crystals ignore it.
 *
 * Returns: DK_OK; DK_EINVAL for a crystal that cannot be poled, a bad
 * polarisation, order or duty cycle; DK_ENOTFOUND when @set lacks an axis.
 */
dk_status dk_qpm_init(dk_qpm *q, const dk_crystal *c,
                      const dk_dispersion_set *set, const char *pol,
                      int order, double duty, double written_temp_c,
                      dk_error *err);

/*
 * dk_qpm_material_dk:
 * k_p − k_s − k_i (rad/µm) without the grating, at @temp_c.
 * Returns: DK_OK, or the dk_material_index() error of the first wave
 * that fails (e.g. DK_ERANGE outside the transparency range).
 */
dk_status dk_qpm_material_dk(dk_qpm *q, const dk_waves *w, double temp_c,
                             double *dk, dk_error *err);

/*
 * dk_qpm_period:
 * The period that phase-matches @w at @temp_c: @period_written_um as
 * written at q->written_temp_c, @period_at_t_um as it is at @temp_c.
 * Returns: DK_OK; DK_EDOM when k_p = k_s + k_i already (no grating is
 * needed).
 */
dk_status dk_qpm_period(dk_qpm *q, const dk_waves *w, double temp_c,
                        double *period_written_um, double *period_at_t_um,
                        dk_error *err);

/* The grating vector 2πm/Λ(T) (rad/µm) of a grating written with period
 * @period_um at q->written_temp_c, at @temp_c (thermal expansion). */
double dk_qpm_grating_k(const dk_qpm *q, double period_um, double temp_c);

/* Δk (rad/µm) with a grating of written period @period_um; NAN on error. */
double dk_qpm_delta_k(dk_qpm *q, const dk_waves *w, double temp_c,
                      double period_um);

/*
 * dk_qpm_solve_temperature:
 * Every temperature in [@lo_c, @hi_c] at which @w phase-matches a grating
 * of written period @period_um, in increasing order.
 * Returns: DK_OK (with *n = 0 when there is none); DK_EINVAL.
 */
dk_status dk_qpm_solve_temperature(dk_qpm *q, const dk_waves *w,
                                   double period_um, double lo_c,
                                   double hi_c, double *temps, int max,
                                   int *n, dk_error *err);

/*
 * dk_qpm_solve_wavelengths:
 * Every (signal, idler) pair that @pump_um phase-matches at @temp_c with
 * written period @period_um, both waves inside the transparency range.
 * When signal and idler share a polarisation the pair is reported once
 * with the signal the shorter wavelength.
 * Returns: DK_OK (with *n = 0 when there is none); DK_EINVAL.
 */
dk_status dk_qpm_solve_wavelengths(dk_qpm *q, double pump_um,
                                   double period_um, double temp_c,
                                   dk_waves *sol, int max, int *n,
                                   dk_error *err);

/*
 * dk_qpm_deff:
 * |d_eff| in pm/V: the bulk coefficient of the three field directions
 * times the grating factor (2/πm) sin(πmD). For isotropic
 * (orientation-patterned, -43m) crystals the fields lie along <111>,
 * the usual orientation, giving (2/√3) d14 before the grating factor.
 * Returns: DK_OK or DK_ENOTFOUND (no nonlinear data).
 */
dk_status dk_qpm_deff(const dk_qpm *q, double *deff, dk_error *err);

#endif /* DK_QPM_H */
