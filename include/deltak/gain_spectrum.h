/*
 * gain_spectrum.h - the small-signal parametric gain of a design as a
 * function of the signal wavelength (pump fixed, idler following), and
 * its full width at half maximum.
 *
 * G(λs) = 1 + (Γ/g)² sinh²(gL), g² = Γ² − (Δk(λs)/2)² (deltak/gain.h),
 * with Δk(λs) from the design (deltak/tolerance.h) and Γ held at its
 * value at the operating point (its slow change with λs across the gain
 * band is neglected). The width is that of the amplified part G − 1, the
 * half-maximum points found by stepping outward and Brent refinement.
 */
#ifndef DK_GAIN_SPECTRUM_H
#define DK_GAIN_SPECTRUM_H

#include "deltak/gain.h"
#include "deltak/tolerance.h"

/* G at signal wavelength @signal_um; NAN where undefined. */
double dk_design_gain(dk_design *d, double gamma_per_mm, double signal_um);

/*
 * dk_design_gain_fwhm:
 * The signal wavelengths @lo_um < @hi_um where G − 1 falls to half its
 * value at the operating point.
 * Returns: DK_OK; DK_ENOROOT when an edge lies beyond ±30 % of the signal
 * wavelength or the transparency range; DK_EDOM when G overflows.
 */
dk_status dk_design_gain_fwhm(dk_design *d, double gamma_per_mm,
                              double *lo_um, double *hi_um, dk_error *err);

#endif /* DK_GAIN_SPECTRUM_H */
