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
 * Common rules of every dk_parse_* function:
 * - the number is decimal ("1.5", "-2", ".5e3"); hexadecimal ("0x1p3"),
 *   "nan", "inf", an empty text and text that is not a number are errors
 *   that say which of these it is;
 * - spaces may surround the text and separate number and unit; any other
 *   text after the number must be a listed unit;
 * - the value is checked after its unit is applied: "1e308m" overflows in
 *   mm and is an error ("too large"), never an infinity;
 * - messages name the quantity and the rule broken ("intensity '-5GW/cm2'
 *   must not be negative"), quote the text with control characters
 *   escaped (deltak/text.h) and, where a range applies, print its bounds
 *   exactly;
 * - on error the output is left unchanged; NULL @err is allowed.
 * All return DK_OK or DK_EINVAL.
 */

/*
 * dk_parse_wavelength:
 * @text: e.g. "1064nm"; units nm, um (µm, μm, micron), mm, cm-1 (/cm,
 *        cm^-1, cm⁻¹: vacuum wavenumber), THz (frequency)
 * @lambda_um: out, vacuum wavelength in µm, > 0 and finite
 *
 * Returns: DK_OK, or DK_EINVAL (missing or unknown unit, not a number,
 * not positive, overflow) with a message that lists the accepted forms.
 */
dk_status dk_parse_wavelength(const char *text, double *lambda_um,
                              dk_error *err);

/*
 * dk_parse_temperature:
 * @text: "40", "40C", "40°C", "40degC", "313.15K"
 * @temp_c: out, temperature in °C, finite, above absolute zero
 *
 * Returns: DK_OK or DK_EINVAL.
 */
dk_status dk_parse_temperature(const char *text, double *temp_c,
                               dk_error *err);

/*
 * dk_parse_length:
 * @text: a length with unit: "20mm", "2cm", "500um", "0.02m", "800nm"
 * @length_mm: out, length in mm, > 0 and finite
 *
 * Returns: DK_OK or DK_EINVAL (a bare number is an error here too).
 */
dk_status dk_parse_length(const char *text, double *length_mm, dk_error *err);

/*
 * dk_parse_duration:
 * @text: a pulse duration with unit: "30fs", "1.2ps", "10ns", "500as"
 * @fs: out, duration in femtoseconds, > 0 and finite
 *
 * Returns: DK_OK or DK_EINVAL (a bare number is an error).
 */
dk_status dk_parse_duration(const char *text, double *fs, dk_error *err);

/*
 * dk_parse_intensity:
 * @text: "5GW/cm2", "500MW/cm2", "2e9W/cm2" (kW, TW too; "cm^2" and
 *        "cm²" as well as "cm2")
 * @gw_per_cm2: out, >= 0 and finite
 * Returns: DK_OK or DK_EINVAL (a bare number is an error).
 */
dk_status dk_parse_intensity(const char *text, double *gw_per_cm2,
                             dk_error *err);

/*
 * dk_parse_power:
 * @text: "2W", "500mW", "1.5kW", "10uW" ("µW"), "1MW"
 * @watts: out, >= 0 and finite
 * Returns: DK_OK or DK_EINVAL.
 */
dk_status dk_parse_power(const char *text, double *watts, dk_error *err);

/*
 * Strict readers for command options. Their messages start with the
 * quoted value, so that a caller prefixes the option name:
 * "--order: '4294967297' is out of range: expected a whole number from
 * 1 to 1000".
 */

/*
 * dk_parse_int:
 * @text: decimal digits with an optional sign, surrounding spaces allowed
 *        ("12"); not "1.0", "1e3", "0x10", "" or "12abc"
 * @lo, @hi: the accepted range, inclusive (lo <= hi)
 * @out: out, the value; no wrap-around: "4294967297" is out of range
 *       for any @hi below it
 *
 * Returns: DK_OK or DK_EINVAL (not a whole number; out of range).
 */
dk_status dk_parse_int(const char *text, long lo, long hi, long *out,
                       dk_error *err);

/*
 * dk_parse_double:
 * @text: a plain decimal number without unit ("0.5", "-2e-3")
 * @lo, @hi: the accepted range, inclusive; give -HUGE_VAL / HUGE_VAL for
 *           "any finite number"
 * @out: out, the value, finite and in [lo, hi]
 *
 * Returns: DK_OK or DK_EINVAL (not a number, non-finite, has a unit,
 * out of range).
 */
dk_status dk_parse_double(const char *text, double lo, double hi,
                          double *out, dk_error *err);

/*
 * dk_parse_angle_deg:
 * @text: an angle: a bare number is degrees ("30"); units deg, °, rad,
 *        mrad, urad (µrad)
 * @lo, @hi: the accepted range in degrees, inclusive
 * @deg: out, the angle in degrees, in [lo, hi]
 *
 * Returns: DK_OK or DK_EINVAL (not a number, unknown unit, overflow,
 * out of range).
 */
dk_status dk_parse_angle_deg(const char *text, double lo, double hi,
                             double *deg, dk_error *err);

#endif /* DK_UNITS_H */
