/*
 * units.h - reading physical quantities that carry their unit.
 *
 * A wavelength always carries a unit: "1064nm", "1.064um", "1.064µm",
 * "9398cm-1" (vacuum wavenumber), "281.8THz" (frequency). A bare number is
 * rejected: a nanometre value read as micrometres gives silently wrong
 * answers. Temperatures are °C unless suffixed "K" ("C" is accepted).
 */
#ifndef DK_UNITS_H
#define DK_UNITS_H

#include "deltak/status.h"

#include "deltak/constants.h"   /* DK_C_M_PER_S and the rest */

/* The accepted wavelength forms, for error messages and help. */
#define DK_WAVELENGTH_FORMS "1064nm, 1.064um, 1.064µm, 9398cm-1, 281.8THz"

/*
 * dk_parse_wavelength:
 * @text: e.g. "1064nm"; surrounding spaces allowed
 * @lambda_um: out, vacuum wavelength in µm, > 0 and finite
 *
 * Returns: DK_OK, or DK_EINVAL (missing or unknown unit, not a number,
 * not positive) with a message that lists the accepted forms.
 */
dk_status dk_parse_wavelength(const char *text, double *lambda_um,
                              dk_error *err);

/*
 * dk_parse_temperature:
 * @text: "40", "40C", "313.15K"
 * @temp_c: out, temperature in °C, above absolute zero
 *
 * Returns: DK_OK or DK_EINVAL.
 */
dk_status dk_parse_temperature(const char *text, double *temp_c,
                               dk_error *err);

/*
 * dk_parse_length:
 * @text: a length with unit: "20mm", "2cm", "500um", "0.02m"
 * @length_mm: out, length in mm, > 0
 *
 * Returns: DK_OK or DK_EINVAL (a bare number is an error here too).
 */
dk_status dk_parse_length(const char *text, double *length_mm, dk_error *err);

/*
 * dk_parse_duration:
 * @text: a pulse duration with unit: "30fs", "1.2ps", "10ns"
 * @fs: out, duration in femtoseconds, > 0
 *
 * Returns: DK_OK or DK_EINVAL (a bare number is an error).
 */
dk_status dk_parse_duration(const char *text, double *fs, dk_error *err);

/*
 * dk_parse_intensity:
 * @text: "5GW/cm2", "500MW/cm2", "2e9W/cm2" ("cm^2" and "cm²" too)
 * @gw_per_cm2: out, ≥ 0
 * Returns: DK_OK or DK_EINVAL (a bare number is an error).
 */
dk_status dk_parse_intensity(const char *text, double *gw_per_cm2,
                             dk_error *err);

/*
 * dk_parse_power:
 * @text: "2W", "500mW", "1.5kW"
 * @watts: out, ≥ 0
 * Returns: DK_OK or DK_EINVAL.
 */
dk_status dk_parse_power(const char *text, double *watts, dk_error *err);

#endif /* DK_UNITS_H */
