/*
 * tolerance.h - acceptance widths of a phase-matched design (QPM or
 * birefringent) along temperature, wavelength, angle and period.
 *
 * A design is an operating point where Δk = 0. Each parameter is varied
 * alone with the rest held at the operating point:
 *   temperature  pump and signal fixed, idler from energy conservation
 *                (SHG: fundamental fixed); the QPM period follows the
 *                crystal's thermal expansion
 *   signal       signal wavelength with the pump fixed (SHG: the
 *                fundamental, its harmonic following)
 *   pump         pump wavelength with the signal fixed (not for SHG)
 *   theta, phi   the propagation direction (birefringent designs; φ only
 *                in biaxial crystals: in uniaxial ones Δk ignores it)
 *   period       the QPM period as written (fabrication tolerance)
 *   tilt         QPM: all beams tilted by δ from the grating vector,
 *                which then contributes 2πm cos δ / Λ (the crystal's
 *                birefringence along the tilt is neglected)
 * Widths come from dk_acceptance_fwhm() (deltak/acceptance.h).
 */
#ifndef DK_TOLERANCE_H
#define DK_TOLERANCE_H

#include "deltak/acceptance.h"
#include "deltak/angle.h"
#include "deltak/qpm.h"

typedef enum dk_design_kind {
    DK_DESIGN_QPM,
    DK_DESIGN_ANGLE
} dk_design_kind;

typedef enum dk_tol_param {
    DK_TOL_TEMPERATURE,   /* x in °C */
    DK_TOL_SIGNAL,        /* x = signal (or fundamental) wavelength, µm */
    DK_TOL_PUMP,          /* x = pump wavelength, µm */
    DK_TOL_THETA,         /* x = θ, rad */
    DK_TOL_PHI,           /* x = φ, rad */
    DK_TOL_PERIOD,        /* x = written period, µm */
    DK_TOL_TILT           /* x = beam tilt from the grating vector, rad */
} dk_tol_param;

typedef struct dk_design {
    dk_design_kind kind;
    dk_waves waves;        /* at the operating point */
    int shg;
    double temp_c;
    double length_mm;
    /* QPM */
    dk_qpm qpm;
    double period_um;      /* as written */
    /* birefringent */
    dk_angle_problem angle;
    char pol[4];
    double theta_rad, phi_rad;
} dk_design;

/*
 * dk_design_setup_qpm:
 * Make @d a QPM design at its operating point. @d->waves, shg, temp_c
 * and length_mm are set by the caller. With @period_um > 0 the grating
 * is given and the temperature is solved (the root nearest d->temp_c
 * when @near_temp, else the lowest); otherwise the period is computed
 * at d->temp_c.
 * Returns: DK_OK; the dk_qpm_init()/dk_qpm_period() errors; DK_ENOROOT
 * when the period phase-matches at no temperature near the set's range;
 * DK_EINVAL for a period with a set without temperature dependence.
 */
dk_status dk_design_setup_qpm(dk_design *d, const dk_crystal *c,
                              const dk_dispersion_set *set, const char *pol,
                              int order, double period_um, int near_temp,
                              dk_error *err);

/*
 * dk_design_setup_angle:
 * Make @d a birefringent design: the phase-matching solution of modes
 * @pol (NULL: any) and type @type ("I", "II" or NULL) nearest
 * @theta_rad (NAN: the first found), at d->temp_c.
 * Returns: DK_OK; DK_ENOROOT when nothing phase-matches; DK_EINVAL for
 * an isotropic crystal.
 */
dk_status dk_design_setup_angle(dk_design *d, const dk_crystal *c,
                                const dk_dispersion_set *set, const char *pol,
                                const char *type, double theta_rad,
                                dk_error *err);

/*
 * dk_design_delta_k:
 * Δk (rad/µm) of @d with parameter @p set to @x and everything else at
 * the operating point. Returns NAN where undefined or not applicable.
 */
double dk_design_delta_k(dk_design *d, dk_tol_param p, double x);

/*
 * dk_design_applies:
 * Returns: 1 when parameter @p makes sense for @d (e.g. no pump width for
 * SHG, no θ for QPM, no period for a birefringent design).
 */
int dk_design_applies(const dk_design *d, dk_tol_param p);

/*
 * dk_design_tolerance:
 * The acceptance along @p about the operating point, in the units of x
 * listed at dk_tol_param.
 * Returns: DK_OK; DK_EINVAL when @p does not apply; DK_EDOM when Δk is
 * undefined at the operating point.
 */
dk_status dk_design_tolerance(dk_design *d, dk_tol_param p,
                              dk_acceptance *out, dk_error *err);

/*
 * dk_design_input_index:
 * The index of the wave that enters the crystal (the fundamental for SHG,
 * else the pump) at the operating point: external angular widths are
 * about this times the internal ones (Snell's law, small angles, normal
 * incidence). Returns NAN on error.
 */
double dk_design_input_index(dk_design *d);

/*
 * dk_design_deff:
 * |d_eff| of @d at its operating point in pm/V (QPM: with the grating
 * factor; birefringent: from the modes' field vectors). NAN when the
 * crystal has no nonlinear data.
 */
double dk_design_deff(dk_design *d);

/* The parameter value at the operating point. */
double dk_design_operating_value(const dk_design *d, dk_tol_param p);

#endif /* DK_TOLERANCE_H */
