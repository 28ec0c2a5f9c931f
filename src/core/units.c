/*
 * units.c - parse quantities with units and plain numbers for options
 * (see deltak/units.h).
 *
 * Numbers are read by one strict grammar, decimal only:
 *     [+-] digits [. digits] [(e|E) [+-] digits]   (or [+-] . digits ...)
 * checked here before strtod converts the span, so that what strtod alone
 * would also take (hexadecimal floats, "nan", "inf", leading junk, a
 * locale's decimal comma) is an error with its reason. Spaces may
 * surround the text and separate number and unit; anything else after
 * the number must be one of the unit names listed below.
 *
 * Every value is checked AFTER its unit is applied: "1e308m" is finite as
 * a number but infinite in mm, and is refused as too large.
 * Conversions: λ[µm] = 1e4 / ν̃[cm⁻¹] = c / f, with c exact (SI).
 */
#include <ctype.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "deltak/text.h"
#include "deltak/units.h"

/* How a text failed to give a number. */
typedef enum {
    NUM_OK,
    NUM_EMPTY,      /* nothing but spaces */
    NUM_NONFINITE,  /* nan, inf, infinity */
    NUM_HEX,        /* 0x... */
    NUM_GARBAGE,    /* does not start with a number */
    NUM_OVERFLOW    /* a decimal number beyond the double range */
} num_result;

typedef struct quantity {
    double value;
    const char *unit;   /* the rest, spaces trimmed (not NUL-terminated) */
    size_t unit_len;
} quantity;

/* The text as it may be quoted in a message: escaped, at most ~60 bytes. */
typedef struct shown {
    char s[64];
} shown;

static shown
show(const char *text)
{
    shown sh;
    dk_text_escape(text ? text : "", sh.s, sizeof sh.s);
    return sh;
}

/* Spaces allowed around the text and between number and unit: blank and
 * tab only, so that a newline cannot hide in an argument. */
static int
is_blank(char c)
{
    return c == ' ' || c == '\t';
}

/* Length of the decimal number at @s by the grammar above, or 0. */
static size_t
decimal_span(const char *s)
{
    size_t i = 0, digits = 0;
    if (s[i] == '+' || s[i] == '-')
        i++;
    while (isdigit((unsigned char)s[i]))
        i++, digits++;
    if (s[i] == '.') {
        i++;
        while (isdigit((unsigned char)s[i]))
            i++, digits++;
    }
    if (digits == 0)
        return 0;
    if (s[i] == 'e' || s[i] == 'E') {
        size_t j = i + 1;
        if (s[j] == '+' || s[j] == '-')
            j++;
        if (isdigit((unsigned char)s[j])) {
            while (isdigit((unsigned char)s[j]))
                j++;
            i = j;
        }
        /* "3e" is the number 3 followed by "e": left to the unit check. */
    }
    return i;
}

/* Read the number of @text and the unit after it. */
static num_result
read_quantity(const char *text, quantity *q)
{
    const char *s = text;
    while (is_blank(*s))
        s++;
    if (!*s)
        return NUM_EMPTY;
    const char *body = s + (*s == '+' || *s == '-');
    if (body[0] == '0' && (body[1] == 'x' || body[1] == 'X'))
        return NUM_HEX;
    if (strncasecmp(body, "nan", 3) == 0 || strncasecmp(body, "inf", 3) == 0)
        return NUM_NONFINITE;
    size_t len = decimal_span(s);
    if (len == 0)
        return NUM_GARBAGE;
    char *end;
    errno = 0;
    double v = strtod(s, &end);
    if (end != s + len)
        return NUM_GARBAGE; /* a locale whose decimal point is not '.' */
    if (!isfinite(v))
        return NUM_OVERFLOW;
    /* Underflow (1e-400) gives 0 or a subnormal: the rules that follow
     * (positive, in range) judge the value, not errno. */
    const char *u = end;
    while (is_blank(*u))
        u++;
    size_t ulen = strlen(u);
    while (ulen > 0 && is_blank(u[ulen - 1]))
        ulen--;
    q->value = v + 0.0; /* -0 becomes +0 */
    q->unit = u;
    q->unit_len = ulen;
    return NUM_OK;
}

static int
unit_is(const quantity *q, const char *name)
{
    return strlen(name) == q->unit_len &&
           memcmp(q->unit, name, q->unit_len) == 0;
}

/* The message for a text that gave no number, naming @what. */
static dk_status
unreadable(num_result r, const char *what, const char *text,
           const char *example, dk_error *err)
{
    shown t = show(text);
    switch (r) {
    case NUM_EMPTY:
        return dk_error_set(err, DK_EINVAL, "%s is empty: give e.g. %s", what,
                            example);
    case NUM_NONFINITE:
        return dk_error_set(err, DK_EINVAL,
                            "%s '%s' is not a finite number: give e.g. %s",
                            what, t.s, example);
    case NUM_HEX:
        return dk_error_set(err, DK_EINVAL,
                            "%s '%s' is hexadecimal: write it in decimal, "
                            "e.g. %s",
                            what, t.s, example);
    case NUM_OVERFLOW:
        return dk_error_set(err, DK_EINVAL,
                            "%s '%s' is too large to represent: give e.g. %s",
                            what, t.s, example);
    default:
        return dk_error_set(err, DK_EINVAL,
                            "cannot read %s '%s': expected a number, e.g. %s",
                            what, t.s, example);
    }
}

/* The message for a value that became non-finite when scaled. */
static dk_status
overflows(const char *what, const char *text, const char *unit,
          dk_error *err)
{
    shown t = show(text);
    return dk_error_set(err, DK_EINVAL,
                        "%s '%s' is too large: it overflows when converted "
                        "to %s",
                        what, t.s, unit);
}

dk_status
dk_parse_wavelength(const char *text, double *lambda_um, dk_error *err)
{
    static const char what[] = "wavelength";
    quantity q;
    num_result r = read_quantity(text ? text : "", &q);
    if (r != NUM_OK)
        return unreadable(r, what, text, DK_WAVELENGTH_FORMS, err);
    shown t = show(text);
    if (q.unit_len == 0)
        return dk_error_set(err, DK_EINVAL,
                            "wavelength '%s' has no unit: write it as e.g. "
                            "%s",
                            t.s, DK_WAVELENGTH_FORMS);
    if (!(q.value > 0))
        return dk_error_set(err, DK_EINVAL,
                            "wavelength '%s' must be positive", t.s);
    double v = q.value, um;
    if (unit_is(&q, "nm"))
        um = v * 1e-3;
    else if (unit_is(&q, "um") || unit_is(&q, "µm") || unit_is(&q, "μm") ||
             unit_is(&q, "micron"))
        um = v;
    else if (unit_is(&q, "mm"))
        um = v * 1e3;
    else if (unit_is(&q, "cm-1") || unit_is(&q, "/cm") ||
             unit_is(&q, "cm^-1") || unit_is(&q, "cm⁻¹"))
        um = 1e4 / v;
    else if (unit_is(&q, "THz"))
        um = DK_C_M_PER_S / (v * 1e12) * 1e6;
    else {
        char unit[48];
        char raw[40];
        size_t n = q.unit_len < sizeof raw - 1 ? q.unit_len : sizeof raw - 1;
        memcpy(raw, q.unit, n);
        raw[n] = '\0';
        dk_text_escape(raw, unit, sizeof unit);
        return dk_error_set(err, DK_EINVAL,
                            "unknown wavelength unit '%s' in '%s': use e.g. "
                            "%s",
                            unit, t.s, DK_WAVELENGTH_FORMS);
    }
    if (!isfinite(um))
        return overflows(what, text, "um", err);
    if (!(um > 0))
        return dk_error_set(err, DK_EINVAL,
                            "wavelength '%s' is too small to represent in "
                            "um",
                            t.s);
    *lambda_um = um;
    return DK_OK;
}

dk_status
dk_parse_temperature(const char *text, double *temp_c, dk_error *err)
{
    static const char example[] = "40, 40C or 313.15K";
    quantity q;
    num_result r = read_quantity(text ? text : "", &q);
    if (r != NUM_OK)
        return unreadable(r, "temperature", text, example, err);
    shown t = show(text);
    double c;
    if (q.unit_len == 0 || unit_is(&q, "C") || unit_is(&q, "°C") ||
        (q.unit_len == 4 && strncasecmp(q.unit, "degC", 4) == 0))
        c = q.value;
    else if (unit_is(&q, "K"))
        c = q.value - 273.15;
    else
        return dk_error_set(err, DK_EINVAL,
                            "unknown temperature unit in '%s': use °C (40 "
                            "or 40C) or kelvin (313.15K)",
                            t.s);
    if (c <= -273.15)
        return dk_error_set(err, DK_EINVAL,
                            "temperature '%s' is at or below absolute zero "
                            "(-273.15 C = 0 K)",
                            t.s);
    *temp_c = c;
    return DK_OK;
}

/* A unit name and its factor to the output unit. */
typedef struct unit_scale {
    const char *name;
    double factor;
} unit_scale;

/*
 * A number with one of @units, scaled; @positive: must be > 0 (else
 * >= 0). Messages name @what and the rule broken.
 */
static dk_status
parse_scaled(const char *text, const char *what, const char *example,
             const char *out_unit, const unit_scale *units, size_t nunits,
             int positive, double *out, dk_error *err)
{
    quantity q;
    num_result r = read_quantity(text ? text : "", &q);
    if (r != NUM_OK)
        return unreadable(r, what, text, example, err);
    shown t = show(text);
    const unit_scale *u = NULL;
    for (size_t i = 0; i < nunits && !u; i++)
        if (unit_is(&q, units[i].name))
            u = &units[i];
    if (!u)
        return dk_error_set(err, DK_EINVAL,
                            q.unit_len ? "unknown unit in %s '%s': write "
                                         "e.g. %s"
                                       : "%s '%s' has no unit: write e.g. %s",
                            what, t.s, example);
    if (positive && !(q.value > 0))
        return dk_error_set(err, DK_EINVAL, "%s '%s' must be positive", what,
                            t.s);
    if (q.value < 0)
        return dk_error_set(err, DK_EINVAL, "%s '%s' must not be negative",
                            what, t.s);
    double v = q.value * u->factor;
    if (!isfinite(v))
        return overflows(what, text, out_unit, err);
    if (positive && !(v > 0))
        return dk_error_set(err, DK_EINVAL,
                            "%s '%s' is too small to represent in %s", what,
                            t.s, out_unit);
    *out = v;
    return DK_OK;
}

#define COUNT(a) (sizeof(a) / sizeof((a)[0]))

dk_status
dk_parse_length(const char *text, double *length_mm, dk_error *err)
{
    static const unit_scale units[] = {
        {"mm", 1},      {"cm", 10},      {"m", 1e3},      {"um", 1e-3},
        {"µm", 1e-3},   {"μm", 1e-3},    {"nm", 1e-6}};
    return parse_scaled(text, "length", "20mm, 2cm or 500um", "mm", units,
                        COUNT(units), 1, length_mm, err);
}

dk_status
dk_parse_duration(const char *text, double *fs, dk_error *err)
{
    static const unit_scale units[] = {
        {"fs", 1}, {"ps", 1e3}, {"ns", 1e6}, {"as", 1e-3}};
    return parse_scaled(text, "duration", "30fs or 1.2ps", "fs", units,
                        COUNT(units), 1, fs, err);
}

dk_status
dk_parse_intensity(const char *text, double *gw_per_cm2, dk_error *err)
{
    static const unit_scale units[] = {
        {"GW/cm2", 1},     {"GW/cm^2", 1},    {"GW/cm²", 1},
        {"MW/cm2", 1e-3},  {"MW/cm^2", 1e-3}, {"MW/cm²", 1e-3},
        {"kW/cm2", 1e-6},  {"kW/cm^2", 1e-6}, {"kW/cm²", 1e-6},
        {"W/cm2", 1e-9},   {"W/cm^2", 1e-9},  {"W/cm²", 1e-9},
        {"TW/cm2", 1e3},   {"TW/cm^2", 1e3},  {"TW/cm²", 1e3}};
    return parse_scaled(text, "intensity", "5GW/cm2 or 500MW/cm2", "GW/cm2",
                        units, COUNT(units), 0, gw_per_cm2, err);
}

dk_status
dk_parse_power(const char *text, double *watts, dk_error *err)
{
    static const unit_scale units[] = {{"W", 1},    {"mW", 1e-3},
                                       {"kW", 1e3}, {"uW", 1e-6},
                                       {"µW", 1e-6}, {"MW", 1e6}};
    return parse_scaled(text, "power", "2W or 500mW", "W", units,
                        COUNT(units), 0, watts, err);
}

/* ---- plain numbers and angles for options ---- */

/* "from LO to HI" with both bounds exact. */
typedef struct bounds {
    char lo[32], hi[32];
} bounds;

static bounds
exact_bounds(double lo, double hi)
{
    bounds b;
    dk_format_exact(lo, b.lo, sizeof b.lo);
    dk_format_exact(hi, b.hi, sizeof b.hi);
    return b;
}

dk_status
dk_parse_int(const char *text, long lo, long hi, long *out, dk_error *err)
{
    const char *s = text ? text : "";
    while (is_blank(*s))
        s++;
    size_t i = (*s == '+' || *s == '-');
    size_t digits = 0;
    while (isdigit((unsigned char)s[i + digits]))
        digits++;
    size_t end = i + digits;
    while (is_blank(s[end]))
        end++;
    shown t = show(text);
    if (!*s)
        return dk_error_set(err, DK_EINVAL,
                            "empty value: expected a whole number from %ld "
                            "to %ld",
                            lo, hi);
    if (digits == 0 || s[end] != '\0')
        return dk_error_set(err, DK_EINVAL,
                            "'%s' is not a whole number: expected one from "
                            "%ld to %ld, written in decimal digits",
                            t.s, lo, hi);
    errno = 0;
    char *stop;
    long v = strtol(s, &stop, 10);
    if (errno == ERANGE || v < lo || v > hi)
        return dk_error_set(err, DK_EINVAL,
                            "'%s' is out of range: expected a whole number "
                            "from %ld to %ld",
                            t.s, lo, hi);
    *out = v;
    return DK_OK;
}

dk_status
dk_parse_double(const char *text, double lo, double hi, double *out,
                dk_error *err)
{
    bounds b = exact_bounds(lo, hi);
    char example[96];
    snprintf(example, sizeof example, "a number from %s to %s", b.lo, b.hi);
    quantity q;
    num_result r = read_quantity(text ? text : "", &q);
    if (r != NUM_OK)
        return unreadable(r, "value", text, example, err);
    shown t = show(text);
    if (q.unit_len)
        return dk_error_set(err, DK_EINVAL,
                            "'%s' is not a plain number: expected %s, "
                            "without a unit",
                            t.s, example);
    if (!(q.value >= lo && q.value <= hi))
        return dk_error_set(err, DK_EINVAL, "'%s' is out of range: expected %s",
                            t.s, example);
    *out = q.value;
    return DK_OK;
}

dk_status
dk_parse_angle_deg(const char *text, double lo, double hi, double *deg,
                   dk_error *err)
{
    static const unit_scale units[] = {
        {"", 1},   {"deg", 1},  {"°", 1},  {"rad", 180 / M_PI},
        {"mrad", 0.18 / M_PI},  {"urad", 1.8e-4 / M_PI},
        {"µrad", 1.8e-4 / M_PI}};
    bounds b = exact_bounds(lo, hi);
    char example[128];
    snprintf(example, sizeof example,
             "an angle from %s to %s degrees (30, 30deg or 0.5rad)", b.lo,
             b.hi);
    quantity q;
    num_result r = read_quantity(text ? text : "", &q);
    if (r != NUM_OK)
        return unreadable(r, "angle", text, example, err);
    shown t = show(text);
    const unit_scale *u = NULL;
    for (size_t i = 0; i < COUNT(units) && !u; i++)
        if (unit_is(&q, units[i].name))
            u = &units[i];
    if (!u)
        return dk_error_set(err, DK_EINVAL,
                            "unknown angle unit in '%s': expected %s", t.s,
                            example);
    double v = q.value * u->factor;
    if (!isfinite(v))
        return overflows("angle", text, "degrees", err);
    if (!(v >= lo && v <= hi))
        return dk_error_set(err, DK_EINVAL,
                            "angle '%s' is out of range: expected %s", t.s,
                            example);
    *deg = v;
    return DK_OK;
}
