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
 *                which then contributes K(T) cos δ, K(T) = 2πm/Λ(T) with
 *                the thermal expansion of the period (the crystal's
 *                birefringence along the tilt is neglected)
 * Widths come from dk_acceptance_fwhm() (deltak/acceptance.h).
 */
#ifndef DK_TOLERANCE_H
#define DK_TOLERANCE_H

#include "deltak/acceptance.h"
#include "deltak/design.h"

typedef enum dk_tol_param {
    DK_TOL_TEMPERATURE,   /* x in °C */
    DK_TOL_SIGNAL,        /* x = signal (or fundamental) wavelength, µm */
    DK_TOL_PUMP,          /* x = pump wavelength, µm */
    DK_TOL_THETA,         /* x = θ, rad */
    DK_TOL_PHI,           /* x = φ, rad */
    DK_TOL_PERIOD,        /* x = written period, µm */
    DK_TOL_TILT           /* x = beam tilt from the grating vector, rad */
} dk_tol_param;

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
 * The search runs over the parameter's whole domain (see
 * dk_design_acceptance_lobes); where sinc² stays above ½ to the domain's
 * end, open_lo/open_hi say so and lo/hi hold the end.
 * Returns: DK_OK; DK_EINVAL when @p does not apply or the design has no
 * length; DK_EDOM when Δk is undefined at the operating point.
 */
dk_status dk_design_tolerance(dk_design *d, dk_tol_param p,
                              dk_acceptance *out, dk_error *err);

/*
 * dk_design_acceptance_lobes:
 * The acceptance along @p (@acc, as dk_design_tolerance) and every
 * interval of the parameter's whole domain where sinc² ≥ ½ (@lobes,
 * deltak/acceptance.h): a double-humped or turning-over curve gets its
 * outer FWHM. @domain (may be NULL) gets the domain searched: wavelengths
 * where every wave is inside the transparency, ±300 °C, θ and φ ±π/4
 * about the operating point (θ inside [0, π]), the period over a factor of 2, the tilt
 * ±1.2 rad.
 * Returns: as dk_design_tolerance; DK_ENOMEM.
 */
dk_status dk_design_acceptance_lobes(dk_design *d, dk_tol_param p,
                                     dk_acceptance *acc,
                                     dk_acceptance_lobes *lobes,
                                     double domain[2], dk_error *err);

/*
 * dk_design_acceptance_curve:
 * sinc²(ΔkL/2) along @p at @n points evenly over ±@span_fwhm times the
 * distance between the outermost half-maximum points (every lobe), about
 * their centre and inside the domain (x in the units of dk_tol_param);
 * @acc gets the acceptance.
 * Returns: DK_OK; DK_EINVAL (n < 2, p not applicable); DK_ENOROOT when no
 * half-maximum interval could be found (Δk undefined about the point).
 */
dk_status dk_design_acceptance_curve(dk_design *d, dk_tol_param p,
                                     double span_fwhm, int n, double *x,
                                     double *sinc2, dk_acceptance *acc,
                                     dk_error *err);

/* The parameter value at the operating point. */
double dk_design_operating_value(const dk_design *d, dk_tol_param p);

#endif /* DK_TOLERANCE_H */
