/*
 * design_deff.c - d_eff of a design at its operating point, as measured
 * and scaled to the design's wavelengths by Miller's rule, and the index
 * of the wave that enters the crystal (references in deltak/design.h).
 */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "deltak/material.h"
#include "deltak/nonlinear.h"
#include "design_internal.h"

/* The birefringent solution at the operating point, described. */
static int
describe_here(dk_design *d, dk_angle_solution *a)
{
    memset(a, 0, sizeof *a);
    memcpy(a->pol, d->pol, 4);
    a->theta_rad = d->theta_rad;
    a->phi_rad = d->phi_rad;
    dk_angle_problem pb = d->angle;
    pb.waves = d->waves;
    pb.temp_c = d->temp_c;
    return dk_angle_describe(&pb, a, NULL) == DK_OK;
}

double
dk_design_deff(dk_design *d)
{
    if (d->scheme == DK_SCHEME_QPM) {
        double v;
        return dk_qpm_deff(&d->qpm, &v, NULL) ? NAN : v;
    }
    dk_angle_solution a;
    return describe_here(d, &a) ? a.deff_pm_per_v : NAN;
}

/* The indices of the three waves of @d in their modes (or axes) at waves
 * @w, the direction held. Returns 0 on success. */
static int
indices_at(dk_design *d, const dk_waves *w, double n[3])
{
    const double lam[3] = {w->signal_um, w->idler_um, w->pump_um};
    if (d->scheme == DK_SCHEME_QPM) {
        for (int k = 0; k < 3; k++)
            if (dk_material_n(d->crystal, d->set, d->qpm.pol[k], lam[k],
                              d->temp_c, &n[k], NULL, NULL))
                return -1;
        return 0;
    }
    dk_angle_problem pb = d->angle;
    pb.waves = *w;
    pb.temp_c = d->temp_c;
    double dir[3][3];
    dk_mode m[3];
    if (dk_angle_waves(&pb, d->pol, d->theta_rad, d->phi_rad, dir, m, NULL))
        return -1;
    for (int k = 0; k < 3; k++)
        n[k] = m[k].n;
    return 0;
}

dk_status
dk_design_deff_scaled(dk_design *d, dk_deff_scaled *out, dk_error *err)
{
    const dk_crystal *c = d->crystal;
    memset(out, 0, sizeof *out);
    if (!c->has_nonlinear)
        return dk_error_set(err, DK_ENOTFOUND,
                            "%s has no nonlinear coefficients in its file",
                            c->id);
    out->measured_pm_per_v = dk_design_deff(d);
    out->measured_um = c->nl_wavelength_um;
    out->scaled_pm_per_v = out->measured_pm_per_v;
    out->factor = NAN;
    double np[3], nm[3];
    dk_waves wm = dk_waves_shg(c->nl_wavelength_um);
    if (!(c->nl_wavelength_um > 0)) {
        snprintf(out->why_not, sizeof out->why_not,
                 "the file gives no measurement wavelength");
    } else if (indices_at(d, &d->waves, np)) {
        snprintf(out->why_not, sizeof out->why_not,
                 "no index at the design's wavelengths");
    } else if (indices_at(d, &wm, nm)) {
        snprintf(out->why_not, sizeof out->why_not,
                 "no index at the measurement wavelengths %.4g and %.4g um "
                 "(outside the transparency or the data)",
                 wm.signal_um, wm.pump_um);
    } else {
        out->factor = dk_miller_factor(np, nm);
        if (isfinite(out->factor))
            out->scaled_pm_per_v = out->measured_pm_per_v * out->factor;
        else
            snprintf(out->why_not, sizeof out->why_not,
                     "n^2 - 1 is not positive at one of the wavelengths");
    }
    return DK_OK;
}

double
dk_design_input_index(dk_design *d)
{
    int k = d->shg ? 0 : 2;
    if (d->scheme == DK_SCHEME_QPM) {
        const double lam = k ? d->waves.pump_um : d->waves.signal_um;
        double n;
        return dk_material_n(d->crystal, d->set, d->qpm.pol[k], lam,
                             d->temp_c, &n, NULL, NULL)
                   ? NAN
                   : n;
    }
    dk_angle_solution a;
    return describe_here(d, &a) ? a.n[k] : NAN;
}
