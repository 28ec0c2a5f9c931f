/*
 * design_sim.c - a design as the pulse simulator's problem (see
 * deltak/design_sim.h for the model and its limits).
 */
#include <math.h>
#include <string.h>

#include "deltak/angle.h"
#include "deltak/design_sim.h"
#include "deltak/nonlinear.h"

dk_status
dk_design_wave_k_fn(void *ctx, const double *omega_rad_per_fs, size_t n,
                    double *k_rad_per_um, dk_error *err)
{
    dk_design_wave_k *w = ctx;
    dk_status s = dk_sim_crystal_k(&w->mode, omega_rad_per_fs, n,
                                   k_rad_per_um, err);
    if (s || w->cos_angle == 1)
        return s;
    for (size_t i = 0; i < n; i++)
        k_rad_per_um[i] *= w->cos_angle;
    return DK_OK;
}

/* θ and φ of a unit vector in the optical frame. */
static void
angles_of(const double v[3], double *theta, double *phi)
{
    *theta = acos(fmax(-1, fmin(1, v[2])));
    *phi = atan2(v[1], v[0]);
}

dk_status
dk_design_sim_modes(dk_design *d, dk_design_wave_k k[3], dk_error *err)
{
    if (d->chosen < 0 && d->solved != DK_SOLVED_NONE)
        return dk_error_set(err, DK_EINVAL, "the design has no operating "
                                            "point");
    for (int j = 0; j < 3; j++) {
        memset(&k[j], 0, sizeof k[j]);
        k[j].mode.crystal = d->crystal;
        k[j].mode.set = d->set;
        k[j].mode.temp_c = d->temp_c;
        k[j].cos_angle = 1;
    }
    if (d->scheme == DK_SCHEME_QPM) {
        for (int j = 0; j < 3; j++)
            k[j].mode.axis = d->qpm.pol[j];
        return DK_OK;
    }
    dk_angle_problem pb = d->angle;
    double dir[3][3];
    dk_mode m[3];
    dk_status s = dk_angle_waves(&pb, d->pol, d->theta_rad, d->phi_rad, dir,
                                 m, err);
    if (s)
        return s;
    for (int j = 0; j < 3; j++) {
        k[j].mode.axis = 0;
        k[j].mode.mode = d->pol[j];
        angles_of(dir[j], &k[j].mode.theta_rad, &k[j].mode.phi_rad);
        double c = dir[j][0] * dir[2][0] + dir[j][1] * dir[2][1] +
                   dir[j][2] * dir[2][2];
        k[j].cos_angle = j == 2 ? 1 : fmin(1, c);
    }
    return DK_OK;
}

dk_status
dk_design_sim_problem(dk_design *d, dk_design_wave_k k[3],
                      dk_sim_problem *p, dk_deff_scaled *deff_used,
                      dk_error *err)
{
    memset(p, 0, sizeof *p);
    if (!(d->length_mm > 0))
        return dk_error_set(err, DK_EINVAL, "the simulation needs the "
                                            "crystal length (--length)");
    dk_status s = dk_design_sim_modes(d, k, err);
    if (s)
        return s;
    dk_deff_scaled ds;
    s = dk_design_deff_scaled(d, &ds, NULL);
    if (s || !isfinite(ds.scaled_pm_per_v) || ds.scaled_pm_per_v == 0)
        return dk_error_set(err, DK_EDOM,
                            "%s has no usable d_eff for this design (%s)",
                            d->crystal->id,
                            d->crystal->has_nonlinear
                                ? "d_eff vanishes for these modes and this "
                                  "direction"
                                : "the crystal file gives no nonlinear "
                                  "coefficients");
    if (deff_used)
        *deff_used = ds;
    static const char *const names[3] = {"signal", "idler", "pump"};
    static const char *const shg_names[3] = {"fundamental", "fundamental",
                                             "second harmonic"};
    const double lam[3] = {d->waves.signal_um, d->waves.idler_um,
                           d->waves.pump_um};
    for (int j = 0; j < 3; j++) {
        p->wave[j].name = d->shg ? shg_names[j] : names[j];
        p->wave[j].lambda_um = j == 2 ? 0 : lam[j];
        p->wave[j].k = dk_design_wave_k_fn;
        p->wave[j].k_ctx = &k[j];
    }
    p->degenerate = d->shg && d->pol[0] == d->pol[1];
    p->length_mm = d->length_mm;
    p->deff_pm_per_v = ds.scaled_pm_per_v;
    if (d->scheme == DK_SCHEME_QPM) {
        double f = dk_qpm_deff_factor(d->qpm.order, d->qpm.duty);
        if (!(fabs(f) > 0))
            return dk_error_set(err, DK_EDOM,
                                "the grating (order %d, duty %.3g) has no "
                                "first-order coupling",
                                d->qpm.order, d->qpm.duty);
        p->deff_pm_per_v = ds.scaled_pm_per_v / fabs(f);
        p->qpm = 1;
        double kg = dk_qpm_grating_k(&d->qpm, d->period_um, d->temp_c);
        p->qpm_period_um = kg > 0 ? 2 * M_PI * d->qpm.order / kg : 0;
        p->qpm_order = d->qpm.order;
        p->qpm_duty = d->qpm.duty;
    }
    return DK_OK;
}

unsigned
dk_design_sim_band_flags(const dk_design *d, const dk_sim_result *r,
                         dk_notes *notes)
{
    dk_range_span span;
    dk_range_span_init(&span);
    unsigned all = 0;
    for (int j = 0; j < 3; j++) {
        const dk_sim_wave_out *w = &r->wave[j];
        if (!w->present || !isfinite(w->band_um[0]))
            continue;
        for (int e = 0; e < 2; e++) {
            dk_waves wv = d->waves;
            double x = w->band_um[e];
            if (d->shg)
                wv = j == 2 ? dk_waves_shg(2 * x) : dk_waves_shg(x);
            else if (j == 0)
                wv.signal_um = x;
            else if (j == 1)
                wv.idler_um = x;
            else
                wv.pump_um = x;
            unsigned f = dk_design_range_flags(d, &wv, d->temp_c);
            dk_range_span_add(&span, f, &wv, d->temp_c);
            all |= f;
        }
    }
    dk_design_note_span(d, &span, notes);
    return all;
}
