/*
 * design.c - put a QPM or birefringent design at its operating point
 * (see deltak/tolerance.h): solve the temperature for a given grating,
 * the period for a given temperature, or pick one birefringent solution.
 */
#include <math.h>
#include <string.h>

#include "deltak/tolerance.h"

#define SEARCH_MARGIN_C 50   /* look this far beyond the set's range */

dk_status
dk_design_setup_qpm(dk_design *d, const dk_crystal *c,
                    const dk_dispersion_set *set, const char *pol, int order,
                    double period_um, int near_temp, dk_error *err)
{
    d->kind = DK_DESIGN_QPM;
    dk_status s = dk_qpm_init(&d->qpm, c, set, pol, order, 0.5, 25, err);
    if (s)
        return s;
    if (!(period_um > 0)) {
        double at_t;
        return dk_qpm_period(&d->qpm, &d->waves, d->temp_c, &d->period_um,
                             &at_t, err);
    }
    if (!dk_set_has_temperature(set))
        return dk_error_set(err, DK_EINVAL,
                            "data set '%s' has no temperature dependence: "
                            "give a temperature instead of a period",
                            set->name);
    const double *r = set->temp_form == DK_TEMP_NONE
                          ? set->thermo.temperature_range_c
                          : set->temperature_range_c;
    double lo = r[0] - SEARCH_MARGIN_C, hi = r[1] + SEARCH_MARGIN_C;
    if (near_temp) {
        lo = fmin(lo, d->temp_c - SEARCH_MARGIN_C);
        hi = fmax(hi, d->temp_c + SEARCH_MARGIN_C);
    }
    double t[16];
    int n;
    s = dk_qpm_solve_temperature(&d->qpm, &d->waves, period_um, lo, hi, t,
                                 16, &n, err);
    if (s)
        return s;
    if (n == 0)
        return dk_error_set(err, DK_ENOROOT,
                            "the %.6g um period phase-matches at no "
                            "temperature between %.4g and %.4g C",
                            period_um, lo, hi);
    int best = 0;
    for (int i = 1; near_temp && i < n; i++)
        if (fabs(t[i] - d->temp_c) < fabs(t[best] - d->temp_c))
            best = i;
    d->temp_c = t[best];
    d->period_um = period_um;
    return DK_OK;
}

dk_status
dk_design_setup_angle(dk_design *d, const dk_crystal *c,
                      const dk_dispersion_set *set, const char *pol,
                      const char *type, double theta_rad, dk_error *err)
{
    d->kind = DK_DESIGN_ANGLE;
    dk_angle_problem pb = {c, set, d->waves, d->shg, d->temp_c, 0, 0};
    dk_angle_solution sol[DK_ANGLE_MAX_SOL];
    int n;
    dk_status s = dk_angle_solve(&pb, NAN, pol, sol, DK_ANGLE_MAX_SOL, &n,
                                 err);
    if (s)
        return s;
    int best = -1;
    for (int i = 0; i < n; i++) {
        if (type && strcmp(sol[i].type, type))
            continue;
        if (best < 0 || (isfinite(theta_rad) &&
                         fabs(sol[i].theta_rad - theta_rad) <
                             fabs(sol[best].theta_rad - theta_rad)))
            best = i;
    }
    if (best < 0)
        return dk_error_set(err, DK_ENOROOT,
                            "%s does not phase-match this process%s%s%s",
                            c->id, type ? " in type " : "", type ? type : "",
                            pol ? " with the given modes" : "");
    d->angle = pb;
    memcpy(d->pol, sol[best].pol, 4);
    d->theta_rad = sol[best].theta_rad;
    d->phi_rad = sol[best].phi_rad;
    return DK_OK;
}
