/*
 * material.c - index of a crystal axis with the database's range rules
 * (DESIGN.md §6): outside the transparency range is an error, outside a
 * data set's fitted ranges a warning.
 */
#include <math.h>
#include <stdio.h>

#include "deltak/material.h"
#include "deltak/text.h"

dk_status
dk_transparency_check(const dk_crystal *c, double lambda_um, const char *wave,
                      dk_error *err)
{
    if (lambda_um >= c->transparency_um[0] &&
        lambda_um <= c->transparency_um[1])
        return DK_OK;
    char v[32], lo[32], hi[32];
    dk_format_against_range(lambda_um, c->transparency_um[0],
                            c->transparency_um[1], v, sizeof v);
    dk_format_exact(c->transparency_um[0], lo, sizeof lo);
    dk_format_exact(c->transparency_um[1], hi, sizeof hi);
    if (wave)
        return dk_error_set(err, DK_ERANGE,
                            "the %s (%s um) is outside the transparency "
                            "range %s-%s um of %s",
                            wave, v, lo, hi, c->id);
    return dk_error_set(err, DK_ERANGE,
                        "%s um is outside the transparency range %s-%s um "
                        "of %s",
                        v, lo, hi, c->id);
}

/* The axis of @set for (λ) inside @c's transparency range, or an error. */
static dk_status
checked_axis(const dk_crystal *c, const dk_dispersion_set *set, char axis,
             double lambda_um, const dk_axis_formula **ax, dk_error *err)
{
    dk_status s = dk_transparency_check(c, lambda_um, NULL, err);
    if (s)
        return s;
    *ax = dk_set_find_axis(set, axis);
    if (!*ax)
        return dk_error_set(err, DK_ENOTFOUND,
                            "data set '%s' of %s has no '%c' axis; pick "
                            "another set with --dispersion",
                            set->name, c->id, axis);
    return DK_OK;
}

/* Transparent crystals have 1 < n < 10: anything else is a formula used
 * far outside its fitted range (e.g. a temperature polynomial at 10^5 C),
 * not an answer. */
static dk_status
physical(const dk_dispersion_set *set, char axis, double lambda_um,
         double temp_c, double n, dk_error *err)
{
    if (n > 1 && n < 10)
        return DK_OK;
    const double *r = set->temp_form == DK_TEMP_NONE
                          ? set->thermo.temperature_range_c
                          : set->temperature_range_c;
    return dk_error_set(err, DK_EDOM,
                        "data set '%s', axis %c gives n = %.4g at %.6g um, "
                        "%.6g C, which no transparent crystal has: the "
                        "formula is used far outside its fitted range "
                        "(%.6g-%.6g um, %.6g-%.6g C)",
                        set->name, axis, n, lambda_um, temp_c,
                        set->wavelength_range_um[0],
                        set->wavelength_range_um[1], r[0], r[1]);
}

dk_status
dk_material_index(const dk_crystal *c, const dk_dispersion_set *set,
                  char axis, double lambda_um, double temp_c,
                  dk_index_value *out, dk_error *err)
{
    const dk_axis_formula *ax;
    dk_status s = checked_axis(c, set, axis, lambda_um, &ax, err);
    if (!s)
        s = dk_index_eval(set, ax, lambda_um, temp_c, out, err);
    return s ? s : physical(set, axis, lambda_um, temp_c, out->n, err);
}

dk_status
dk_material_n(const dk_crystal *c, const dk_dispersion_set *set, char axis,
              double lambda_um, double temp_c, double *n, unsigned *warnings,
              dk_error *err)
{
    const dk_axis_formula *ax;
    dk_status s = checked_axis(c, set, axis, lambda_um, &ax, err);
    if (s)
        return s;
    double v = dk_index_n(set, ax, lambda_um, temp_c);
    if (!isfinite(v))
        return dk_error_set(err, DK_EDOM,
                            "data set '%s', axis %c has no real index at "
                            "%.6g um, %.6g C (a resonance of the formula, "
                            "or far outside its fitted range)",
                            set->name, axis, lambda_um, temp_c);
    if ((s = physical(set, axis, lambda_um, temp_c, v, err)))
        return s;
    *n = v;
    if (warnings)
        *warnings = dk_set_range_warnings(set, lambda_um, temp_c);
    return DK_OK;
}

int
dk_warning_text(const dk_dispersion_set *set, unsigned flags,
                double lambda_um, double temp_c, char *buf, size_t n)
{
    int count = 0;
    size_t used = 0;
    buf[0] = '\0';
    if (flags & DK_WARN_LAMBDA_RANGE) {
        used += snprintf(buf + used, used < n ? n - used : 0,
                         "%s%.6g um is outside the fitted range %.6g-%.6g um "
                         "of data set '%s'",
                         count ? "\n" : "", lambda_um,
                         set->wavelength_range_um[0],
                         set->wavelength_range_um[1], set->name);
        count++;
    }
    if (flags & DK_WARN_TEMP_RANGE) {
        const double *r = set->has_thermo && set->temp_form == DK_TEMP_NONE
                              ? set->thermo.temperature_range_c
                              : set->temperature_range_c;
        used += snprintf(buf + used, used < n ? n - used : 0,
                         "%s%.6g C is outside the fitted range %.6g-%.6g C "
                         "of data set '%s'",
                         count ? "\n" : "", temp_c, r[0], r[1], set->name);
        count++;
    }
    if (flags & DK_WARN_NO_TEMP) {
        used += snprintf(buf + used, used < n ? n - used : 0,
                         "%sdata set '%s' has no temperature dependence; "
                         "evaluated at its %.6g C",
                         count ? "\n" : "", set->name,
                         set->reference_temperature_c);
        count++;
    }
    return count;
}
