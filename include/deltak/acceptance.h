/*
 * acceptance.h - the full width at half maximum of the phase-matching
 * curve sinc²(ΔkL/2) along one parameter, exact and first-order.
 *
 * sinc²(u) = (sin u / u)² falls to ½ at u = 1.39155737825 (the root of
 * sin u / u = 1/√2). With Δk(x) known, the half-maximum points are the
 * roots of |Δk(x)|·L/2 = 1.39156 on either side of the peak, found by
 * stepping outward and refining with Brent's method; this is valid also
 * where dΔk/dx vanishes (noncritical phase matching, group-velocity-
 * matched points, turning points). Beside it:
 *   linear estimate     Δx = 2·2.78311 / (L |Δk'|)
 *   quadratic estimate  Δx = 2·√(2·2.78311 / (L |Δk''|))  (noncritical)
 * Reference: R. W. Boyd, Nonlinear Optics, 3rd ed. (2008), §2.2–2.3;
 * Dmitriev et al., Handbook of Nonlinear Optical Crystals (1999), §1.3.
 */
#ifndef DK_ACCEPTANCE_H
#define DK_ACCEPTANCE_H

#include "deltak/roots.h"
#include "deltak/status.h"

#define DK_SINC2_HALF_U 1.3915573782515103 /* sinc²(u) = 1/2 */

typedef struct dk_acceptance {
    double peak;           /* x where Δk = 0 (the operating point) */
    double lo, hi;         /* x where sinc² = 1/2 */
    double fwhm;           /* hi − lo (INFINITY when unbounded) */
    double linear_fwhm;    /* first-order estimate; INFINITY if Δk' = 0 */
    double quadratic_fwhm; /* second-order estimate; INFINITY if Δk'' = 0 */
    double slope;          /* dΔk/dx at the peak, rad/µm per unit x */
    int bounded;           /* 1 when both half-maximum points were found */
} dk_acceptance;

/* sinc x = sin x / x, with its limit 1 at x = 0 (series below 1e-4). */
double dk_sinc(double x);

/* sinc²(Δk L / 2) for Δk in rad/µm and L in µm. */
double dk_sinc2(double dk_rad_per_um, double length_um);

/*
 * dk_acceptance_fwhm:
 * @dk: Δk(x) in rad/µm (NAN where undefined)
 * @x0: the operating point; Δk(x0) should be (near) zero: the peak is
 *   first refined to the zero of Δk within ±@step of @x0 when one is there
 * @length_um: crystal length in µm, > 0
 * @step: a small natural step of x for derivatives and the outward search
 * @xmin, @xmax: the search never leaves [xmin, xmax]
 *
 * Returns: DK_OK (out->bounded = 0 when a half-maximum point lies beyond
 * the search limits); DK_EINVAL for a bad length or step; DK_EDOM when
 * Δk is not finite at x0.
 */
dk_status dk_acceptance_fwhm(dk_scalar_fn dk, void *params, double x0,
                             double length_um, double step, double xmin,
                             double xmax, dk_acceptance *out, dk_error *err);

#endif /* DK_ACCEPTANCE_H */
