/*
 * units.c - parse quantities with units (see deltak/units.h).
 *
 * The number is read with strtod in the C locale's format; the rest of
 * the text, spaces aside, must be one of the unit names below.
 * Conversions: λ[µm] = 1e4 / ν̃[cm⁻¹] = c / f, with c exact (SI).
 */
#include <ctype.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "deltak/units.h"

/* Split "  1.064 um " into a number and a trimmed unit string. */
static int
split_number_unit(const char *text, double *value, char *unit, size_t n)
{
    char *end;
    while (isspace((unsigned char)*text))
        text++;
    *value = strtod(text, &end);
    if (end == text)
        return -1;
    while (isspace((unsigned char)*end))
        end++;
    size_t len = strlen(end);
    while (len > 0 && isspace((unsigned char)end[len - 1]))
        len--;
    if (len >= n)
        return -1;
    memcpy(unit, end, len);
    unit[len] = '\0';
    return 0;
}

dk_status
dk_parse_wavelength(const char *text, double *lambda_um, dk_error *err)
{
    double v;
    char unit[32];
    if (!text || split_number_unit(text, &v, unit, sizeof unit) != 0)
        return dk_error_set(err, DK_EINVAL,
                            "cannot read wavelength '%s': expected a number "
                            "with a unit, e.g. %s",
                            text ? text : "", DK_WAVELENGTH_FORMS);
    if (unit[0] == '\0')
        return dk_error_set(err, DK_EINVAL,
                            "wavelength '%s' has no unit: write it as e.g. "
                            "%s",
                            text, DK_WAVELENGTH_FORMS);
    if (!isfinite(v) || v <= 0)
        return dk_error_set(err, DK_EINVAL,
                            "wavelength '%s' must be positive and finite",
                            text);
    double um;
    if (strcmp(unit, "nm") == 0)
        um = v * 1e-3;
    else if (strcmp(unit, "um") == 0 || strcmp(unit, "µm") == 0 ||
             strcmp(unit, "μm") == 0 || strcmp(unit, "micron") == 0)
        um = v;
    else if (strcmp(unit, "mm") == 0)
        um = v * 1e3;
    else if (strcmp(unit, "cm-1") == 0 || strcmp(unit, "/cm") == 0 ||
             strcmp(unit, "cm^-1") == 0 || strcmp(unit, "cm⁻¹") == 0)
        um = 1e4 / v;
    else if (strcmp(unit, "THz") == 0)
        um = DK_C_M_PER_S / (v * 1e12) * 1e6;
    else
        return dk_error_set(err, DK_EINVAL,
                            "unknown wavelength unit '%s' in '%s': use e.g. "
                            "%s",
                            unit, text, DK_WAVELENGTH_FORMS);
    *lambda_um = um;
    return DK_OK;
}

dk_status
dk_parse_temperature(const char *text, double *temp_c, dk_error *err)
{
    double v;
    char unit[32];
    if (!text || split_number_unit(text, &v, unit, sizeof unit) != 0 ||
        !isfinite(v))
        return dk_error_set(err, DK_EINVAL,
                            "cannot read temperature '%s': expected e.g. 40, "
                            "40C or 313.15K",
                            text ? text : "");
    double c;
    if (unit[0] == '\0' || strcmp(unit, "C") == 0 || strcmp(unit, "°C") == 0 ||
        strcasecmp(unit, "degC") == 0)
        c = v;
    else if (strcmp(unit, "K") == 0)
        c = v - 273.15;
    else
        return dk_error_set(err, DK_EINVAL,
                            "unknown temperature unit '%s' in '%s': use °C "
                            "(40 or 40C) or kelvin (313.15K)",
                            unit, text);
    if (c <= -273.15)
        return dk_error_set(err, DK_EINVAL,
                            "temperature '%s' is at or below absolute zero",
                            text);
    *temp_c = c;
    return DK_OK;
}

dk_status
dk_parse_length(const char *text, double *length_mm, dk_error *err)
{
    double v;
    char unit[32];
    if (!text || split_number_unit(text, &v, unit, sizeof unit) != 0 ||
        !isfinite(v))
        return dk_error_set(err, DK_EINVAL,
                            "cannot read length '%s': expected e.g. 20mm, "
                            "2cm or 500um",
                            text ? text : "");
    double mm;
    if (strcmp(unit, "mm") == 0)
        mm = v;
    else if (strcmp(unit, "cm") == 0)
        mm = v * 10;
    else if (strcmp(unit, "m") == 0)
        mm = v * 1e3;
    else if (strcmp(unit, "um") == 0 || strcmp(unit, "µm") == 0 ||
             strcmp(unit, "μm") == 0)
        mm = v * 1e-3;
    else if (strcmp(unit, "nm") == 0)
        mm = v * 1e-6;
    else if (unit[0] == '\0')
        return dk_error_set(err, DK_EINVAL,
                            "length '%s' has no unit: write e.g. 20mm, 2cm or "
                            "500um",
                            text);
    else
        return dk_error_set(err, DK_EINVAL,
                            "unknown length unit '%s' in '%s': use mm, cm, m "
                            "or um",
                            unit, text);
    if (mm <= 0)
        return dk_error_set(err, DK_EINVAL, "length '%s' must be positive",
                            text);
    *length_mm = mm;
    return DK_OK;
}

dk_status
dk_parse_duration(const char *text, double *fs, dk_error *err)
{
    double v;
    char unit[32];
    if (!text || split_number_unit(text, &v, unit, sizeof unit) != 0 ||
        !isfinite(v))
        return dk_error_set(err, DK_EINVAL,
                            "cannot read duration '%s': expected e.g. 30fs "
                            "or 1.2ps",
                            text ? text : "");
    static const struct {
        const char *name;
        double fs;
    } units[] = {{"fs", 1}, {"ps", 1e3}, {"ns", 1e6}, {"as", 1e-3}};
    for (size_t i = 0; i < sizeof units / sizeof units[0]; i++)
        if (strcmp(unit, units[i].name) == 0) {
            if (!(v > 0))
                return dk_error_set(err, DK_EINVAL,
                                    "duration '%s' must be positive", text);
            *fs = v * units[i].fs;
            return DK_OK;
        }
    return dk_error_set(err, DK_EINVAL,
                        "%s duration unit in '%s': write e.g. 30fs or 1.2ps",
                        unit[0] ? "unknown" : "missing", text);
}

/* A number and one of @n units with their scale factors. */
static dk_status
parse_scaled(const char *text, const char *what, const char *example,
             const char *const names[], const double scale[], int n,
             double *out, dk_error *err)
{
    double v;
    char unit[32];
    if (!text || split_number_unit(text, &v, unit, sizeof unit) != 0 ||
        !isfinite(v) || v < 0)
        return dk_error_set(err, DK_EINVAL,
                            "cannot read %s '%s': expected e.g. %s", what,
                            text ? text : "", example);
    for (int i = 0; i < n; i++)
        if (strcmp(unit, names[i]) == 0) {
            *out = v * scale[i];
            return DK_OK;
        }
    return dk_error_set(err, DK_EINVAL, "%s unit in %s '%s': write e.g. %s",
                        unit[0] ? "unknown" : "missing", what, text, example);
}

dk_status
dk_parse_intensity(const char *text, double *gw_per_cm2, dk_error *err)
{
    static const char *const names[] = {
        "GW/cm2", "GW/cm^2", "GW/cm²", "MW/cm2", "MW/cm^2", "MW/cm²",
        "kW/cm2", "kW/cm^2", "kW/cm²", "W/cm2", "W/cm^2", "W/cm²",
        "TW/cm2", "TW/cm^2", "TW/cm²"};
    static const double scale[] = {1, 1, 1, 1e-3, 1e-3, 1e-3, 1e-6, 1e-6,
                                   1e-6, 1e-9, 1e-9, 1e-9, 1e3, 1e3, 1e3};
    return parse_scaled(text, "intensity", "5GW/cm2 or 500MW/cm2", names,
                        scale, 15, gw_per_cm2, err);
}

dk_status
dk_parse_power(const char *text, double *watts, dk_error *err)
{
    static const char *const names[] = {"W", "mW", "kW", "uW", "µW", "MW"};
    static const double scale[] = {1, 1e-3, 1e3, 1e-6, 1e-6, 1e6};
    return parse_scaled(text, "power", "2W or 500mW", names, scale, 6, watts,
                        err);
}
