/*
 * material.c - index of a crystal axis with the database's range rules
 * (DESIGN.md §6): outside the transparency range is an error, outside a
 * data set's fitted ranges a warning.
 */
#include <math.h>
#include <stdio.h>

#include "deltak/material.h"

/* The axis of @set for (λ) inside @c's transparency range, or an error. */
static dk_status
checked_axis(const dk_crystal *c, const dk_dispersion_set *set, char axis,
             double lambda_um, const dk_axis_formula **ax, dk_error *err)
{
    if (!(lambda_um >= c->transparency_um[0] &&
          lambda_um <= c->transparency_um[1]))
        return dk_error_set(err, DK_ERANGE,
                            "%.6g um is outside the transparency range "
                            "%.6g-%.6g um of %s",
                            lambda_um, c->transparency_um[0],
                            c->transparency_um[1], c->id);
    *ax = dk_set_find_axis(set, axis);
    if (!*ax)
        return dk_error_set(err, DK_ENOTFOUND,
                            "data set '%s' of %s has no '%c' axis; pick "
                            "another set with --dispersion",
                            set->name, c->id, axis);
    return DK_OK;
}

dk_status
dk_material_index(const dk_crystal *c, const dk_dispersion_set *set,
                  char axis, double lambda_um, double temp_c,
                  dk_index_value *out, dk_error *err)
{
    const dk_axis_formula *ax;
    dk_status s = checked_axis(c, set, axis, lambda_um, &ax, err);
    return s ? s : dk_index_eval(set, ax, lambda_um, temp_c, out, err);
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
                            "data set '%s', axis %c has no finite index at "
                            "%.6g um, %.6g C",
                            set->name, axis, lambda_um, temp_c);
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
