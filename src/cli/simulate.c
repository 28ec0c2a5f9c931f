/*
 * simulate.c - `deltak simulate`: pulsed three-wave mixing along the
 * crystal of a design (deltak/simulate.h over deltak/design_sim.h):
 * energies along z, spectra, temporal intensities, durations and
 * transform limits, with the convergence check and the Manley-Rowe
 * bookkeeping; text, JSON, CSV and figures.
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "commands.h"
#include "design_args.h"
#include "options.h"
#include "pulse_spec.h"
#include "deltak/broadband.h"
#include "deltak/constants.h"
#include "deltak/design_sim.h"
#include "deltak/plot.h"
#include "deltak/units.h"

static const char *const simulate_usage[] = {
    "deltak simulate --crystal <name> (--fundamental <wl> | two of --pump/"
    "--signal/--idler) --length <L>",
    "                [--temp <T>] [--period <P> | --type I|II [--pol <sip>] "
    "[--theta <deg>] [--solution <n>]]",
    "                [--noncollinear <deg> | --broadband] [--phi <deg>] "
    "[--plane XY|YZ|XZ] [--dispersion <set>]",
    "                --pump-in <pulse> [--signal-in <pulse>] [--idler-in "
    "<pulse>] | --fundamental-in <pulse>",
    "                [--beam-radius <w>] [--samples <n>] [--max-step <h>] "
    "[--tolerance <x>] [--no-check]",
    "                [--frame signal|idler|pump] [--json | --csv [--table "
    "energy|spectra|pulses]]",
    "                [--plot <file> [--figure energy|spectra|pulses]] "
    "[--model full|low-conversion|opa-gain]",
    "",
    "  --pump-in, --signal-in, --idler-in, --fundamental-in <pulse>  an "
    "input pulse, key=value items:",
    "        energy=50uJ | fluence=2mJ/cm2 | peak=80GW/cm2 (one), fwhm=30fs "
    "or width=40nm (nm, THz, cm-1),",
    "        shape=gaussian|sech2|cw, gdd=200fs2, delay=-20fs, "
    "spectrum=FILE.csv (wavelength_nm,intensity[,phase_rad])",
    "        e.g. --pump-in energy=40uJ,fwhm=120fs --signal-in "
    "energy=20nJ,width=60nm",
    "  --beam-radius <w> 1/e^2 intensity radius, e.g. 1.5mm: energies of "
    "the beam centre (area pi w^2/2)",
    "  --samples, --max-step  force the time grid (a power of two) or the "
    "largest step (e.g. 5um)",
    "  --tolerance <x>   allowed change of the energies when the step is "
    "halved (default 1e-3); --no-check: one run",
    "  --frame <wave>    move with that wave's group velocity (default: "
    "between the fastest and slowest)",
    "  --table <t>       with --csv: energy (along z, default), spectra or "
    "pulses",
    "  --figure <f>      with --plot: spectra (default), pulses or energy",
    "  --model <m>       full (default): propagate the fields; "
    "low-conversion: the SFG/DFG output spectrum of",
    "                    the two inputs with the phase-matching amplitude "
    "and phase (undepleted); opa-gain: the",
    "                    seed times the gain of a narrowband pump",
    CLI_PLOT_USAGE,
    "",
    "Plane waves along z (no diffraction or spatial walk-off, reported "
    "beside); exact k(w) of each wave's mode;",
    "QPM crystals get their domains written (bulk d); the step is checked "
    "by halving it.",
    CLI_DESIGN_USAGE,
    NULL};

#define ALLOWED CLI_D_ALL

enum { O_SIG_IN = 500, O_IDL_IN, O_PUMP_IN, O_FUND_IN, O_BEAM, O_SAMPLES,
       O_STEP, O_TOL, O_NOCHECK, O_FRAME, O_TABLE, O_FIGURE, O_MODEL,
       O_END };

static const char *
rule_text(const dk_sim_result *r)
{
    return dk_sim_step_rule_str(r->step_rule);
}

/* The range flags of the simulated bands, their notes recorded. */
static unsigned
band_flags(dk_design *d, const dk_sim_result *r)
{
    dk_notes n;
    dk_notes_clear(&n);
    unsigned all = dk_design_sim_band_flags(d, r, &n);
    cli_take_notes(&n);
    return all;
}

/* The amounts shown: energies with a beam, else fluences. */
static double
amount(const dk_sim_result *r, int j, int out, int energy)
{
    const dk_sim_wave_out *w = &r->wave[j];
    if (energy)
        return out ? w->energy_out_j : w->energy_in_j;
    return out ? w->fluence_out_j_per_cm2 : w->fluence_in_j_per_cm2;
}

static void
print_amount(FILE *f, double v, int energy)
{
    if (!energy)
        fprintf(f, "%10.4g mJ/cm2", v * 1e3);
    else if (v >= 1e-3)
        fprintf(f, "%10.4g mJ    ", v * 1e3);
    else if (v >= 1e-6)
        fprintf(f, "%10.4g uJ    ", v * 1e6);
    else
        fprintf(f, "%10.4g nJ    ", v * 1e9);
}

static void
print_text(FILE *f, dk_design *d, const dk_sim_problem *p,
           const dk_sim_result *r, const dk_deff_scaled *ds, double area,
           unsigned flags)
{
    const dk_crystal *c = d->crystal;
    int qpm = d->scheme == DK_SCHEME_QPM;
    char how[256], dl[256];
    if (qpm)
        snprintf(how, sizeof how, "period %.4f um (%.4f um at this "
                                  "temperature), order %d, duty %.2f",
                 d->period_um, r->qpm_period_um,
                 p->qpm_order ? p->qpm_order : 1, p->qpm_duty);
    else
        snprintf(how, sizeof how, "modes %s, theta %.3f deg, phi %.2f deg%s",
                 d->pol, d->theta_rad / DK_RAD_PER_DEG,
                 d->phi_rad / DK_RAD_PER_DEG,
                 d->angle.alpha_rad != 0 ? ", noncollinear" : "");
    cli_wrapf(f, "", "    ", "%s (data set %s), %s design, %.4g mm, %.4g C, %s",
              c->id, d->set->name, qpm ? "QPM" : "birefringent",
              d->length_mm, d->temp_c, how);
    if (!qpm && d->angle.alpha_rad != 0)
        cli_wrapf(f, "  ", "    ",
                  "signal at %+.3f deg from the pump (internal); each "
                  "wave's k projected on the pump direction",
                  d->angle.alpha_rad / DK_RAD_PER_DEG);
    int n = snprintf(dl, sizeof dl, "d_eff %.3g pm/V", p->deff_pm_per_v);
    if (qpm && n > 0 && (size_t)n < sizeof dl)
        n += snprintf(dl + n, sizeof dl - (size_t)n,
                      " (bulk d of the domains, Miller-scaled; the grating "
                      "averages it to %.3g pm/V)",
                      r->deff_first_order_pm_per_v);
    if (isfinite(ds->factor) && n > 0 && (size_t)n < sizeof dl)
        snprintf(dl + n, sizeof dl - (size_t)n, "; Miller factor %.3f",
                 ds->factor);
    cli_wrap(f, "  ", "    ", dl);
    cli_flags_text(f, flags, d->shg);
    fputc('\n', f);
    cli_wrapf(f, "  ", "    ",
              "grid %zu samples, dt %.4g fs, window %.4g ps; step %.4g um "
              "(%s), %ld steps",
              r->samples, r->dt_fs, r->window_fs * 1e-3, r->step_um,
              rule_text(r), r->steps);
    if (r->convergence_checked)
        cli_wrapf(f, "  ", "    ",
                  "convergence: %s (halving the step changed the output "
                  "energies by %.2g; tolerance %.2g, %d halving%s)",
                  r->converged ? "converged" : "NOT converged",
                  r->convergence_change, r->tolerance, r->halvings,
                  r->halvings == 1 ? "" : "s");
    else
        fprintf(f, "  convergence: not checked (--no-check)\n");
    cli_wrapf(f, "  ", "    ",
              "Manley-Rowe: photon-number invariants kept to %.2g "
              "(relative, worst point along z)",
              r->manley_rowe_defect);
    int energy = area > 0;
    /* two tables of at most 71 columns: amounts, then durations */
    fprintf(f, "\n  %-12s %8s %17s %17s %11s\n", "wave", "um",
            energy ? "energy in" : "fluence in",
            energy ? "energy out" : "fluence out", "peak GW/cm2");
    for (int j = 0; j < 3; j++) {
        const dk_sim_wave_out *w = &r->wave[j];
        if (!w->present)
            continue;
        fprintf(f, "  %-12s %8.5g ", p->wave[j].name, w->lambda_um);
        print_amount(f, amount(r, j, 0, energy), energy);
        fputc(' ', f);
        print_amount(f, amount(r, j, 1, energy), energy);
        fprintf(f, " %11.4g\n", w->peak_out_gw_per_cm2);
    }
    fprintf(f, "\n  %-12s %11s %11s %9s %17s\n", "wave", "FWHM in fs",
            "FWHM out fs", "TL out fs", "band out um");
    for (int j = 0; j < 3; j++) {
        const dk_sim_wave_out *w = &r->wave[j];
        if (!w->present)
            continue;
        char fin[24], fout[24], tout[24];
        snprintf(fin, sizeof fin, isfinite(w->fwhm_in_fs) ? "%.4g" : "-",
                 w->fwhm_in_fs);
        snprintf(fout, sizeof fout, isfinite(w->fwhm_out_fs) ? "%.4g" : "-",
                 w->fwhm_out_fs);
        snprintf(tout, sizeof tout,
                 isfinite(w->transform_limit_out_fs) ? "%.4g" : "-",
                 w->transform_limit_out_fs);
        fprintf(f, "  %-12s %11s %11s %9s", p->wave[j].name, fin, fout, tout);
        if (isfinite(w->band_um[0]))
            fprintf(f, " %8.4g-%-8.4g", w->band_um[0], w->band_um[1]);
        fputc('\n', f);
    }
    /* Photon and energy balance. */
    double ein = 0, eout = 0;
    for (int j = 0; j < 3; j++)
        if (r->wave[j].present)
            ein += r->wave[j].fluence_in_j_per_cm2,
            eout += r->wave[j].fluence_out_j_per_cm2;
    fprintf(f, "\n  energy out / in %.6f", ein > 0 ? eout / ein : NAN);
    const dk_sim_wave_out *pw = &r->wave[2];
    if (!d->shg && pw->fluence_in_j_per_cm2 > 0)
        fprintf(f, "; pump depleted by %.3g %%",
                100 * (1 - pw->fluence_out_j_per_cm2 /
                               pw->fluence_in_j_per_cm2));
    if (d->shg && r->wave[0].fluence_in_j_per_cm2 > 0)
        fprintf(f, "; conversion to the harmonic %.4g %%",
                100 * pw->fluence_out_j_per_cm2 /
                    (r->wave[0].fluence_in_j_per_cm2 +
                     (r->wave[1].present ? r->wave[1].fluence_in_j_per_cm2
                                         : 0)));
    fputc('\n', f);
    cli_wrap(f, "  ", "  ",
             "FWHM: intensity, outermost half-maximum points; TL: the same "
             "spectrum with a flat phase; band: 99.9 % of the energy");
    if (energy)
        cli_wrapf(f, "  ", "  ",
                  "energies of a beam of 1/e^2 radius %.4g mm taken as its "
                  "centre's plane wave over pi w^2/2",
                  sqrt(2 * area / M_PI) * 10);
}

static void
warn_result(const dk_sim_result *r)
{
    if (r->warnings & DK_SIM_WARN_TIME_EDGE)
        cli_warn("light reached the edges of the time window: give more "
                 "--samples");
    if (r->warnings & DK_SIM_WARN_SPECTRAL_EDGE)
        cli_warn("light reached the edges of the spectral window: the grid "
                 "is too coarse (give --samples with a larger window)");
    if (r->warnings & DK_SIM_WARN_ABSORBED)
        cli_warn("light reached frequencies where the crystal has no data "
                 "(outside its transparency) and was removed");
    if (r->warnings & DK_SIM_WARN_NOT_CONVERGED)
        cli_warn("not converged: halving the step still changed the "
                 "energies by %.2g; give a smaller --max-step",
                 r->convergence_change);
    if (r->warnings & DK_SIM_WARN_BROADBAND)
        cli_warn("a band is wider than 25 %% of its carrier: the "
                 "slowly-varying-envelope coupling is questionable");
}

static json_object *
json_wave(const dk_sim_problem *p, const dk_sim_result *r, int j)
{
    const dk_sim_wave_out *w = &r->wave[j];
    json_object *o = json_object_new_object();
    json_object_object_add(o, "name", json_object_new_string(p->wave[j].name));
    json_object_object_add(o, "wavelength_um", cli_json_num(w->lambda_um));
    json_object_object_add(o, "n", cli_json_num(w->n));
    json_object_object_add(o, "group_delay_fs_per_mm",
                           cli_json_num(w->group_delay_fs_per_mm));
    json_object_object_add(o, "gvd_fs2_per_mm",
                           cli_json_num(w->gvd_fs2_per_mm));
    json_object_object_add(o, "fluence_in_J_per_cm2",
                           cli_json_num(w->fluence_in_j_per_cm2));
    json_object_object_add(o, "fluence_out_J_per_cm2",
                           cli_json_num(w->fluence_out_j_per_cm2));
    if (isfinite(w->energy_in_j)) {
        json_object_object_add(o, "energy_in_J", cli_json_num(w->energy_in_j));
        json_object_object_add(o, "energy_out_J",
                               cli_json_num(w->energy_out_j));
    }
    json_object_object_add(o, "photons_in_per_cm2",
                           cli_json_num(w->photons_in_per_cm2));
    json_object_object_add(o, "photons_out_per_cm2",
                           cli_json_num(w->photons_out_per_cm2));
    json_object_object_add(o, "peak_in_GW_per_cm2",
                           cli_json_num(w->peak_in_gw_per_cm2));
    json_object_object_add(o, "peak_out_GW_per_cm2",
                           cli_json_num(w->peak_out_gw_per_cm2));
    json_object_object_add(o, "fwhm_in_fs", cli_json_num(w->fwhm_in_fs));
    json_object_object_add(o, "fwhm_out_fs", cli_json_num(w->fwhm_out_fs));
    json_object_object_add(o, "transform_limit_in_fs",
                           cli_json_num(w->transform_limit_in_fs));
    json_object_object_add(o, "transform_limit_out_fs",
                           cli_json_num(w->transform_limit_out_fs));
    json_object_object_add(o, "spectral_fwhm_in_THz",
                           cli_json_num(w->spectral_fwhm_in_thz));
    json_object_object_add(o, "spectral_fwhm_out_THz",
                           cli_json_num(w->spectral_fwhm_out_thz));
    json_object_object_add(o, "band_um", cli_json_range(w->band_um));
    json_object_object_add(o, "absorbed_J_per_cm2",
                           cli_json_num(w->absorbed_j_per_cm2));
    return o;
}

static json_object *
json_result(dk_design *d, const dk_sim_problem *p, const dk_sim_result *r,
            double area, unsigned flags)
{
    json_object *o = cli_design_json(d);
    json_object_object_add(o, "process",
                           json_object_new_string(dk_process_str(d->process)));
    json_object_object_add(o, "length_mm", cli_json_num(d->length_mm));
    json_object_object_add(o, "temperature_C", cli_json_num(d->temp_c));
    if (d->scheme == DK_SCHEME_QPM) {
        json_object_object_add(o, "period_um", cli_json_num(d->period_um));
        json_object_object_add(o, "period_at_temperature_um",
                               cli_json_num(r->qpm_period_um));
    } else {
        json_object_object_add(o, "pol", json_object_new_string(d->pol));
        json_object_object_add(o, "theta_deg",
                               cli_json_num(d->theta_rad / DK_RAD_PER_DEG));
        json_object_object_add(o, "phi_deg",
                               cli_json_num(d->phi_rad / DK_RAD_PER_DEG));
        if (d->angle.alpha_rad != 0)
            json_object_object_add(o, "alpha_deg",
                                   cli_json_num(d->angle.alpha_rad /
                                                DK_RAD_PER_DEG));
    }
    json_object_object_add(o, "deff_pm_per_V", cli_json_num(p->deff_pm_per_v));
    if (area > 0)
        json_object_object_add(o, "beam_area_cm2", cli_json_num(area));
    json_object *g = json_object_new_object();
    json_object_object_add(g, "samples",
                           json_object_new_int64((int64_t)r->samples));
    json_object_object_add(g, "dt_fs", cli_json_num(r->dt_fs));
    json_object_object_add(g, "window_fs", cli_json_num(r->window_fs));
    json_object_object_add(g, "step_um", cli_json_num(r->step_um));
    json_object_object_add(g, "steps", json_object_new_int64(r->steps));
    json_object_object_add(g, "step_rule",
                           json_object_new_string(rule_text(r)));
    json_object_object_add(o, "grid", g);
    json_object *cv = json_object_new_object();
    json_object_object_add(cv, "checked",
                           json_object_new_boolean(r->convergence_checked));
    json_object_object_add(cv, "converged",
                           json_object_new_boolean(r->converged));
    json_object_object_add(cv, "change", cli_json_num(r->convergence_change));
    json_object_object_add(cv, "tolerance", cli_json_num(r->tolerance));
    json_object_object_add(cv, "halvings", json_object_new_int(r->halvings));
    json_object_object_add(o, "convergence", cv);
    json_object_object_add(o, "manley_rowe_defect",
                           cli_json_num(r->manley_rowe_defect));
    json_object *ws = json_object_new_array();
    for (int j = 0; j < 3; j++)
        if (r->wave[j].present)
            json_object_array_add(ws, json_wave(p, r, j));
    json_object_object_add(o, "waves", ws);
    json_object *z = json_object_new_object(), *zs = json_object_new_array();
    for (size_t k = 0; k < r->nz; k++)
        json_object_array_add(zs, cli_json_num(r->z_mm[k]));
    json_object_object_add(z, "z_mm", zs);
    for (int j = 0; j < 3; j++) {
        if (!r->fluence_j_per_cm2[j])
            continue;
        json_object *a = json_object_new_array();
        for (size_t k = 0; k < r->nz; k++)
            json_object_array_add(a, cli_json_num(r->fluence_j_per_cm2[j][k]));
        char key[64];
        snprintf(key, sizeof key, "%s_fluence_J_per_cm2",
                 j == 0 ? "wave1" : j == 1 ? "wave2" : "wave3");
        json_object_object_add(z, key, a);
    }
    json_object_object_add(o, "along_z", z);
    json_object *wn = json_object_new_array();
    if (r->warnings & DK_SIM_WARN_TIME_EDGE)
        json_object_array_add(wn, json_object_new_string("time-edge"));
    if (r->warnings & DK_SIM_WARN_SPECTRAL_EDGE)
        json_object_array_add(wn, json_object_new_string("spectral-edge"));
    if (r->warnings & DK_SIM_WARN_ABSORBED)
        json_object_array_add(wn, json_object_new_string("absorbed"));
    if (r->warnings & DK_SIM_WARN_NOT_CONVERGED)
        json_object_array_add(wn, json_object_new_string("not-converged"));
    if (r->warnings & DK_SIM_WARN_BROADBAND)
        json_object_array_add(wn, json_object_new_string("broadband-svea"));
    json_object_object_add(o, "simulation_flags", wn);
    cli_flags_json(o, flags, d->shg);
    return o;
}

static void
csv_table(FILE *f, const dk_sim_problem *p, const dk_sim_result *r,
          const char *table, double area, unsigned flags, int shg)
{
    char fl[256];
    cli_csv_flags(flags, shg, fl, sizeof fl);
    if (!strcmp(table, "energy")) {
        fprintf(f, "z_mm");
        for (int j = 0; j < 3; j++)
            if (r->fluence_j_per_cm2[j])
            {
                fprintf(f, ",%s_fluence_J_per_cm2", p->wave[j].name);
                if (area > 0)
                    fprintf(f, ",%s_energy_J", p->wave[j].name);
            }
        fprintf(f, ",flags\n");
        for (size_t k = 0; k < r->nz; k++) {
            fprintf(f, "%.8g", r->z_mm[k]);
            for (int j = 0; j < 3; j++) {
                if (!r->fluence_j_per_cm2[j])
                    continue;
                fprintf(f, ",%.8g", r->fluence_j_per_cm2[j][k]);
                if (area > 0)
                    fprintf(f, ",%.8g", r->fluence_j_per_cm2[j][k] * area);
            }
            fprintf(f, ",%s\n", fl);
        }
        return;
    }
    int spectra = !strcmp(table, "spectra");
    if (!spectra)
        fprintf(f, "time_fs");
    for (int j = 0; j < 3; j++) {
        if (!r->wave[j].present)
            continue;
        const char *n = p->wave[j].name;
        if (spectra)
            fprintf(f, "%s%s_frequency_THz,%s_wavelength_um,%s_in_J_per_cm2_"
                       "THz,%s_out_J_per_cm2_THz,%s_phase_out_rad",
                    j ? "," : "", n, n, n, n, n);
        else
            fprintf(f, ",%s_in_GW_per_cm2,%s_out_GW_per_cm2,%s_phase_out_rad",
                    n, n, n);
    }
    fprintf(f, ",flags\n");
    for (size_t k = 0; k < r->samples; k++) {
        int first = 1;
        if (!spectra)
            fprintf(f, "%.8g", r->time_fs[k]), first = 0;
        for (int j = 0; j < 3; j++) {
            const dk_sim_wave_out *w = &r->wave[j];
            if (!w->present)
                continue;
            if (spectra)
                fprintf(f, "%s%.10g,%.10g,%.6g,%.6g,%.6g", first ? "" : ",",
                        w->frequency_thz[k], 299.792458 / w->frequency_thz[k],
                        w->spectrum_in_j_per_cm2_thz[k],
                        w->spectrum_out_j_per_cm2_thz[k],
                        w->spectral_phase_out_rad[k]);
            else
                fprintf(f, ",%.6g,%.6g,%.6g", w->intensity_in_gw_per_cm2[k],
                        w->intensity_out_gw_per_cm2[k], w->phase_out_rad[k]);
            first = 0;
        }
        fprintf(f, ",%s\n", fl);
    }
}

/* A series of @y over @x keeping only points above 1e-4 of the peak
 * (NAN elsewhere, which breaks the line), scaled by @scale. */
static dk_status
add_trimmed(dk_plot *fig, const double *x, const double *y, size_t n,
            double scale, double rel, const char *label, dk_error *err)
{
    double peak = 0;
    for (size_t k = 0; k < n; k++)
        peak = fmax(peak, y[k]);
    if (!(peak > 0))
        return DK_OK;
    double *xs = malloc(2 * n * sizeof *xs);
    if (!xs)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    double *ys = xs + n;
    for (size_t k = 0; k < n; k++) {
        int keep = y[k] >= 1e-4 * peak;
        xs[k] = x[k];
        ys[k] = keep ? y[k] * (rel ? 1 / peak : scale) : NAN;
    }
    dk_status s = dk_plot_add_line(fig, xs, ys, n, label, err);
    free(xs);
    return s;
}

static dk_status
draw(const cli_plot_args *pa, const char *path, const char *figure,
     const dk_sim_problem *p, const dk_sim_result *r, double area,
     dk_error *err)
{
    dk_plot *fig = NULL;
    dk_status s = cli_plot_new(pa, &fig, err);
    char label[96];
    if (!s && !strcmp(figure, "energy")) {
        int energy = area > 0;
        s = dk_plot_set_xlabel(fig, "Position in the crystal z (mm)", err);
        if (!s)
            s = dk_plot_set_ylabel(fig, energy ? "Energy (µJ)"
                                               : "Fluence (mJ/cm<sup>2</sup>)",
                                   err);
        for (int j = 0; !s && j < 3; j++) {
            if (!r->fluence_j_per_cm2[j])
                continue;
            double *y = malloc(r->nz * sizeof *y);
            if (!y) {
                s = dk_error_set(err, DK_ENOMEM, "out of memory");
                break;
            }
            for (size_t k = 0; k < r->nz; k++)
                y[k] = r->fluence_j_per_cm2[j][k] *
                       (energy ? area * 1e6 : 1e3);
            snprintf(label, sizeof label, "%s %.4g µm", p->wave[j].name,
                     r->wave[j].lambda_um);
            s = dk_plot_add_line(fig, r->z_mm, y, r->nz, label, err);
            free(y);
        }
    } else if (!s && !strcmp(figure, "spectra")) {
        s = dk_plot_set_xlabel(fig, "Wavelength (µm)", err);
        if (!s)
            s = dk_plot_set_ylabel(fig, "Spectral density, each wave to its "
                                        "peak",
                                   err);
        double *wl = malloc(r->samples * sizeof *wl);
        if (!wl && !s)
            s = dk_error_set(err, DK_ENOMEM, "out of memory");
        for (int j = 0; !s && j < 3; j++) {
            const dk_sim_wave_out *w = &r->wave[j];
            if (!w->present)
                continue;
            for (size_t k = 0; k < r->samples; k++)
                wl[k] = 299.792458 / w->frequency_thz[k];
            snprintf(label, sizeof label, "%s out", p->wave[j].name);
            s = add_trimmed(fig, wl, w->spectrum_out_j_per_cm2_thz,
                            r->samples, 1, 1, label, err);
            if (!s && w->fluence_in_j_per_cm2 > 0) {
                snprintf(label, sizeof label, "%s in", p->wave[j].name);
                s = add_trimmed(fig, wl, w->spectrum_in_j_per_cm2_thz,
                                r->samples, 1, 1, label, err);
            }
        }
        free(wl);
        if (!s)
            s = dk_plot_set_yrange(fig, 0, 1.08, err);
    } else if (!s) {
        s = dk_plot_set_xlabel(fig, "Time in the moving frame (fs)", err);
        if (!s)
            s = dk_plot_set_ylabel(fig, "Intensity, each wave to its peak",
                                   err);
        for (int j = 0; !s && j < 3; j++) {
            const dk_sim_wave_out *w = &r->wave[j];
            if (!w->present)
                continue;
            snprintf(label, sizeof label, "%s out (%.3g GW/cm<sup>2</sup>)",
                     p->wave[j].name, w->peak_out_gw_per_cm2);
            s = add_trimmed(fig, r->time_fs, w->intensity_out_gw_per_cm2,
                            r->samples, 1, 1, label, err);
            if (!s && w->fluence_in_j_per_cm2 > 0) {
                snprintf(label, sizeof label, "%s in (%.3g GW/cm<sup>2</sup>)",
                         p->wave[j].name, w->peak_in_gw_per_cm2);
                s = add_trimmed(fig, r->time_fs, w->intensity_in_gw_per_cm2,
                                r->samples, 1, 1, label, err);
            }
        }
        if (!s)
            s = dk_plot_set_yrange(fig, 0, 1.08, err);
    }
    if (!s)
        s = cli_plot_add_notes(fig, err);
    if (!s)
        s = dk_plot_write(fig, path, err);
    dk_plot_free(fig);
    return s;
}

/* The low-conversion (or narrowband-pump gain) output spectrum. */
static int
run_mix(const int *mode, dk_design *d, const dk_sim_problem *p,
        const dk_sim_options *so, int model, double area,
        const cli_plot_args *pa, const char *plot, const char *figure,
        const char *table)
{
    (void)figure;
    (void)table;
    dk_error err = {0};
    dk_mix_result *m = NULL;
    dk_mix_kind kind = model == DK_MIX_OPA ? DK_MIX_OPA : DK_MIX_AUTO;
    if (dk_mix_spectrum(p, so, kind, &m, &err))
        return cli_error("%s", err.msg);
    int g = m->generated, rc = CLI_FAIL;
    const char *gname = p->wave[g].name;
    size_t n = m->n;
    if (m->photon_fraction > 0.05)
        cli_warn("the %s takes %.2g of the %s photons: beyond the "
                 "low-conversion limit; use --model full",
                 gname, m->photon_fraction,
                 m->kind == DK_MIX_OPA ? "pump's" : "scarcer input's");
    cli_caution_laser();
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (plot) {
        dk_plot *fig = NULL;
        dk_status s = cli_plot_new(pa, &fig, &err);
        double *x = malloc(2 * n * sizeof *x), *y = x ? x + n : NULL;
        if (!x && !s)
            s = dk_error_set(&err, DK_ENOMEM, "out of memory");
        if (!s)
            s = dk_plot_set_xlabel(fig, "Wavelength (µm)", &err);
        if (!s)
            s = dk_plot_set_ylabel(fig, "Spectral density, each to its "
                                        "peak; |h|<sup>2</sup>",
                                   &err);
        for (int j = 0; !s && j < 3; j++) {
            if (!m->frequency_thz[j])
                continue;
            double peak = 0;
            for (size_t k = 0; k < n; k++)
                peak = fmax(peak, m->spectrum_out[j][k]);
            if (!(peak > 0))
                continue;
            for (size_t k = 0; k < n; k++) {
                x[k] = 299.792458 / m->frequency_thz[j][k];
                y[k] = m->spectrum_out[j][k] >= 1e-4 * peak
                           ? m->spectrum_out[j][k] / peak
                           : NAN;
            }
            char label[96];
            snprintf(label, sizeof label, "%s%s", p->wave[j].name,
                     j == g ? " (generated)" : "");
            s = dk_plot_add_line(fig, x, y, n, label, &err);
            if (!s && j == g) {
                double lo = INFINITY, hi = -INFINITY;
                for (size_t k = 0; k < n; k++)
                    if (isfinite(y[k]))
                        lo = fmin(lo, x[k]), hi = fmax(hi, x[k]);
                for (size_t k = 0; k < n; k++)
                    y[k] = x[k] >= lo - 0.5 * (hi - lo) &&
                                   x[k] <= hi + 0.5 * (hi - lo)
                               ? pow(m->pm_modulus[k], 2)
                               : NAN;
                s = dk_plot_add_line(fig, x, y, n,
                                     "phase matching |h|<sup>2</sup>", &err);
            }
        }
        if (!s)
            s = dk_plot_set_yrange(fig, 0, 1.08, &err);
        if (!s)
            s = cli_plot_add_notes(fig, &err);
        if (!s)
            s = dk_plot_write(fig, plot, &err);
        free(x);
        dk_plot_free(fig);
        if (s) {
            cli_out_discard(&out);
            cli_error("%s", err.msg);
            goto done;
        }
    }
    const char *kname = m->kind == DK_MIX_SFG   ? "sum-frequency"
                        : m->kind == DK_MIX_DFG ? "difference-frequency"
                                                : "parametric gain";
    if (*mode == CLI_JSON) {
        json_object *o = json_object_new_object();
        json_object_object_add(o, "crystal",
                               json_object_new_string(d->crystal->id));
        json_object_object_add(o, "model",
                               json_object_new_string(
                                   m->kind == DK_MIX_OPA ? "opa-gain"
                                                         : "low-conversion"));
        json_object_object_add(o, "process", json_object_new_string(kname));
        json_object_object_add(o, "generated", json_object_new_string(gname));
        json_object_object_add(o, "length_mm", cli_json_num(d->length_mm));
        json_object_object_add(o, "fluence_J_per_cm2",
                               cli_json_num(m->fluence_j_per_cm2[g]));
        if (area > 0)
            json_object_object_add(o, "energy_J", cli_json_num(m->energy_j[g]));
        json_object_object_add(o, "centre_THz", cli_json_num(m->centre_thz));
        json_object_object_add(o, "centre_um",
                               cli_json_num(299.792458 / m->centre_thz));
        json_object_object_add(o, "spectral_fwhm_THz",
                               cli_json_num(m->fwhm_thz));
        json_object_object_add(o, "transform_limit_fs",
                               cli_json_num(m->transform_limit_fs));
        json_object_object_add(o, "photon_fraction",
                               cli_json_num(m->photon_fraction));
        if (m->kind == DK_MIX_OPA)
            json_object_object_add(o, "gain_peak", cli_json_num(m->gain_peak));
        cli_notes_to_json(o);
        cli_out_json(&out, o);
    } else if (*mode == CLI_CSV) {
        fprintf(out.f, "frequency_THz,wavelength_um,spectrum_J_per_cm2_THz,"
                       "phase_rad,pm_modulus,pm_phase_rad\n");
        for (size_t k = 0; k < n; k++)
            fprintf(out.f, "%.10g,%.10g,%.6g,%.6g,%.6g,%.6g\n",
                    m->frequency_thz[g][k],
                    299.792458 / m->frequency_thz[g][k],
                    m->spectrum_out[g][k], m->phase_out_rad[k],
                    m->pm_modulus[k], m->pm_phase_rad[k]);
    } else {
        fprintf(out.f, "%s (data set %s), %s design, %.4g mm, %.4g C\n",
                d->crystal->id, d->set->name,
                d->scheme == DK_SCHEME_QPM ? "QPM" : "birefringent",
                d->length_mm, d->temp_c);
        fprintf(out.f, "  %s model: %s of the inputs into the %s\n",
                m->kind == DK_MIX_OPA ? "narrowband-pump gain"
                                      : "low-conversion",
                kname, gname);
        cli_wrap(out.f, "  ", "   ",
                 "(inputs undepleted; each pair of input frequencies with "
                 "its own phase mismatch over the crystal, h = e^{-iqL/2} "
                 "sinc(qL/2))");
        fputc('\n', out.f);
        cli_wrapf(out.f, "  ", "    ",
                  "%s: centre %.5g um (%.5g THz), spectral FWHM %.4g THz, "
                  "transform limit %.4g fs",
                gname, 299.792458 / m->centre_thz, m->centre_thz, m->fwhm_thz,
                m->transform_limit_fs);
        fprintf(out.f, "  fluence %.4g mJ/cm2", m->fluence_j_per_cm2[g] * 1e3);
        if (area > 0)
            fprintf(out.f, ", energy %.4g nJ", m->energy_j[g] * 1e9);
        fprintf(out.f, "; photons made / photons of the %s %.3g\n",
                m->kind == DK_MIX_OPA ? "pump" : "scarcer input",
                m->photon_fraction);
        if (m->kind == DK_MIX_OPA) {
            fprintf(out.f, "  largest gain over the seed's band %.4g; "
                           "amplified signal %.4g mJ/cm2",
                    m->gain_peak, m->fluence_j_per_cm2[0] * 1e3);
            if (area > 0)
                fprintf(out.f, " (%.4g nJ)", m->energy_j[0] * 1e9);
            fputc('\n', out.f);
        }
        if (plot)
            fprintf(out.f, "  wrote %s\n", plot);
    }
    rc = cli_out_commit(&out);
done:
    dk_mix_result_free(m);
    return rc;
}

/* Put the parsed pulse on wave @j (half of it on each of waves 0 and 1
 * for a type-II SHG input). */
static void
place(dk_sim_problem *p, int j, const pulse_spec *ps, int split)
{
    dk_sim_pulse in = ps->pulse;
    if (split) {
        in.energy_j /= 2, in.fluence_j_per_cm2 /= 2, in.peak_gw_per_cm2 /= 2;
        p->wave[0].input = in;
        p->wave[1].input = in;
        return;
    }
    p->wave[j].input = in;
}

int
cmd_simulate(int argc, char **argv)
{
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        CLI_PLOT_OPTIONS,
        {"signal-in", required_argument, NULL, O_SIG_IN},
        {"idler-in", required_argument, NULL, O_IDL_IN},
        {"pump-in", required_argument, NULL, O_PUMP_IN},
        {"fundamental-in", required_argument, NULL, O_FUND_IN},
        {"beam-radius", required_argument, NULL, O_BEAM},
        {"samples", required_argument, NULL, O_SAMPLES},
        {"max-step", required_argument, NULL, O_STEP},
        {"tolerance", required_argument, NULL, O_TOL},
        {"no-check", no_argument, NULL, O_NOCHECK},
        {"frame", required_argument, NULL, O_FRAME},
        {"table", required_argument, NULL, O_TABLE},
        {"figure", required_argument, NULL, O_FIGURE},
        {"model", required_argument, NULL, O_MODEL},
        {NULL, 0, NULL, 0}};
    const char *v[O_END - O_SIG_IN] = {0};
    cli_slots sl = {O_SIG_IN, O_END - O_SIG_IN, v, opts, simulate_usage};
    cli_common cm = {0};
    cli_design_args da = {0};
    cli_plot_args pa = {0};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, simulate_usage, &cm, &da,
                                &pa, cli_slot_option, &sl, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    if ((rc = cli_common_finish(&cm, argc, argv, 0, simulate_usage)))
        return rc;
#define V(o) v[(o) - O_SIG_IN]
    if (!cli_design_given(&da, OPT_LENGTH))
        return cli_usage_error(simulate_usage, "--length is required, e.g. "
                                               "--length 2mm");
    int shg = cli_design_given(&da, OPT_FUNDAMENTAL);
    if (shg && (V(O_SIG_IN) || V(O_IDL_IN) || V(O_PUMP_IN)))
        return cli_usage_error(simulate_usage,
                               "an SHG design takes --fundamental-in (the "
                               "harmonic is generated)");
    if (!shg && V(O_FUND_IN))
        return cli_usage_error(simulate_usage,
                               "--fundamental-in is for SHG (--fundamental); "
                               "give --pump-in, --signal-in, --idler-in");
    if (!V(O_SIG_IN) && !V(O_IDL_IN) && !V(O_PUMP_IN) && !V(O_FUND_IN))
        return cli_usage_error(simulate_usage,
                               "give the input pulses, e.g. --pump-in "
                               "energy=40uJ,fwhm=120fs --signal-in "
                               "energy=20nJ,fwhm=60fs");
    const char *table = V(O_TABLE) ? V(O_TABLE) : "energy";
    int model = 0;
    if (V(O_MODEL)) {
        if (!strcmp(V(O_MODEL), "low-conversion"))
            model = DK_MIX_AUTO + 100;
        else if (!strcmp(V(O_MODEL), "opa-gain"))
            model = DK_MIX_OPA;
        else if (strcmp(V(O_MODEL), "full"))
            return cli_usage_error(simulate_usage, "--model '%s' must be "
                                                   "full, low-conversion or "
                                                   "opa-gain",
                                   V(O_MODEL));
        if (model && V(O_TABLE) && strcmp(V(O_TABLE), "spectra"))
            return cli_usage_error(simulate_usage, "--model %s gives spectra "
                                                   "only: --table spectra",
                                   V(O_MODEL));
        if (model && V(O_FIGURE) && strcmp(V(O_FIGURE), "spectra"))
            return cli_usage_error(simulate_usage, "--model %s draws spectra "
                                                   "only: --figure spectra",
                                   V(O_MODEL));
    }
    const char *figure = V(O_FIGURE) ? V(O_FIGURE) : "spectra";
    if (strcmp(table, "energy") && strcmp(table, "spectra") &&
        strcmp(table, "pulses"))
        return cli_usage_error(simulate_usage, "--table '%s' must be energy, "
                                               "spectra or pulses",
                               table);
    if (strcmp(figure, "energy") && strcmp(figure, "spectra") &&
        strcmp(figure, "pulses"))
        return cli_usage_error(simulate_usage, "--figure '%s' must be "
                                               "energy, spectra or pulses",
                               figure);
    if (V(O_TABLE) && !cm.csv)
        return cli_usage_error(simulate_usage, "--table chooses the --csv "
                                               "table; give --csv too");
    if (cli_plot_parse(&pa, simulate_usage))
        return CLI_USAGE;
    const char *plot = cli_plot_path(&pa);
    if (V(O_FIGURE) && !plot)
        return cli_usage_error(simulate_usage, "--figure chooses the --plot "
                                               "figure; give --plot too");
    dk_sim_options so = {0};
    dk_error err = {0};
    double area = 0;
    int out_mode = cm.json ? CLI_JSON : cm.csv ? CLI_CSV : CLI_TEXT;
    if (V(O_BEAM)) {
        double w_mm;
        if (dk_parse_length(V(O_BEAM), &w_mm, &err))
            return cli_usage_error(simulate_usage, "--beam-radius: %s",
                                   err.msg);
        area = M_PI * pow(w_mm * 0.1, 2) / 2;   /* cm² */
    }
    if (V(O_SAMPLES)) {
        int n;
        if ((rc = cli_int("--samples", V(O_SAMPLES), 64,
                          (long)DK_SIM_MAX_SAMPLES, &n, simulate_usage)))
            return rc;
        if (n & (n - 1))
            return cli_usage_error(simulate_usage, "--samples %d must be a "
                                                   "power of two, e.g. 4096",
                                   n);
        so.samples = (size_t)n;
    }
    if (V(O_STEP)) {
        double mm;
        if (dk_parse_length(V(O_STEP), &mm, &err))
            return cli_usage_error(simulate_usage, "--max-step: %s", err.msg);
        so.max_step_um = mm * 1e3;
    }
    if (V(O_TOL) && (rc = cli_real("--tolerance", V(O_TOL), 1e-9, 0.49,
                                   &so.tolerance, simulate_usage)))
        return rc;
    so.no_convergence_check = V(O_NOCHECK) != NULL;
    if (so.no_convergence_check && V(O_TOL))
        return cli_usage_error(simulate_usage, "--tolerance and --no-check "
                                               "contradict each other");
    if (V(O_FRAME)) {
        static const char *const fw[3] = {"signal", "idler", "pump"};
        for (int j = 0; j < 3; j++)
            if (!strcmp(V(O_FRAME), fw[j]))
                so.frame_wave = j + 1;
        if (!so.frame_wave)
            return cli_usage_error(simulate_usage, "--frame '%s' must be "
                                                   "signal, idler or pump",
                                   V(O_FRAME));
    }

    dk_db *db;
    dk_design *dp;
    if ((rc = cli_design_open(&cm, &da, ALLOWED, 1, 1, simulate_usage, &db,
                              &dp)))
        return rc;
    rc = CLI_FAIL;
    dk_design_wave_k wk[3];
    dk_sim_problem prob;
    dk_sim_result *res = NULL;
    pulse_spec ps[4];
    memset(ps, 0, sizeof ps);
    dk_deff_scaled ds;
    if (dk_design_sim_problem(dp, wk, &prob, &ds, &err)) {
        cli_error("%s", err.msg);
        goto done;
    }
    {
        const int slot[4] = {O_SIG_IN, O_IDL_IN, O_PUMP_IN, O_FUND_IN};
        static const char *const oname[4] = {"--signal-in", "--idler-in",
                                             "--pump-in", "--fundamental-in"};
        const double lam[4] = {dp->waves.signal_um, dp->waves.idler_um,
                               dp->waves.pump_um, dp->waves.signal_um};
        for (int i = 0; i < 4; i++) {
            if (!V(slot[i]))
                continue;
            int r2 = pulse_spec_parse(oname[i], V(slot[i]), lam[i], &ps[i]);
            if (r2) {
                rc = r2;
                goto done;
            }
            if (ps[i].pulse.energy_j > 0 && !(area > 0)) {
                rc = cli_usage_error(simulate_usage,
                                     "%s gives an energy: give the "
                                     "--beam-radius too (or fluence=, "
                                     "peak=)",
                                     oname[i]);
                goto done;
            }
            place(&prob, i == 3 ? 0 : i, &ps[i], i == 3 && !prob.degenerate);
        }
    }
    prob.beam_area_cm2 = area;
    if (dp->crystal->has_damage)
        for (int i = 0; i < 4; i++)
            if (ps[i].pulse.peak_gw_per_cm2 >
                0.5 * dp->crystal->damage_gw_per_cm2)
                cli_warn("an input peak of %.3g GW/cm2 is more than half the "
                         "damage threshold of %s (about %g GW/cm2, %s)",
                         ps[i].pulse.peak_gw_per_cm2, dp->crystal->id,
                         dp->crystal->damage_gw_per_cm2,
                         dp->crystal->damage_pulse);
    if (model) {
        rc = run_mix(&out_mode, dp, &prob, &so, model, area, &pa, plot,
                     figure, table);
        goto done;
    }
    if (dk_sim_run(&prob, &so, &res, &err)) {
        cli_error("%s", err.msg);
        goto done;
    }
    for (int j = 0; dp->crystal->has_damage && j < 3; j++)
        if (res->wave[j].present &&
            res->wave[j].peak_in_gw_per_cm2 >
                0.5 * dp->crystal->damage_gw_per_cm2)
            cli_warn("the %s enters at %.3g GW/cm2 peak, more than half the "
                     "damage threshold of %s (about %g GW/cm2, %s)",
                     prob.wave[j].name, res->wave[j].peak_in_gw_per_cm2,
                     dp->crystal->id, dp->crystal->damage_gw_per_cm2,
                     dp->crystal->damage_pulse);
    unsigned flags = band_flags(dp, res);
    warn_result(res);
    if (dp->scheme == DK_SCHEME_ANGLE) {
        double rho = fmax(dp->sol[dp->chosen >= 0 ? dp->chosen : 0]
                              .walkoff_rad[2],
                          dp->sol[dp->chosen >= 0 ? dp->chosen : 0]
                              .walkoff_rad[0]);
        if (rho > 0)
            cli_warn("spatial walk-off (up to %.3g mrad, %.3g um over the "
                     "crystal) is not simulated: beams narrower than a few "
                     "times that separate",
                     rho * 1e3, rho * dp->length_mm * 1e3);
    }
    cli_caution_laser();
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (plot) {
        if (draw(&pa, plot, figure, &prob, res, area, &err)) {
            cli_out_discard(&out);
            cli_error("%s", err.msg);
            goto done;
        }
    }
    if (cm.json) {
        json_object *o = json_result(dp, &prob, res, area, flags);
        cli_notes_to_json(o);
        cli_out_json(&out, o);
    } else if (cm.csv) {
        csv_table(out.f, &prob, res, table, area, flags, dp->shg);
    } else {
        print_text(out.f, dp, &prob, res, &ds, area, flags);
        if (plot)
            fprintf(out.f, "  wrote %s\n", plot);
    }
    rc = cli_out_commit(&out);
#undef V
done:
    for (int i = 0; i < 4; i++)
        pulse_spec_free(&ps[i]);
    dk_sim_result_free(res);
    free(dp);
    dk_db_free(db);
    return rc;
}
