/*
 * gain.c - `deltak gain`: conversion efficiency (plane-wave, depleted,
 * focused Boyd-Kleinman) and parametric gain with its bandwidth, for a
 * QPM or birefringent design.
 */
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "options.h"
#include "commands.h"
#include "design_args.h"
#include "deltak/bandwidth.h"
#include "deltak/gain_spectrum.h"
#include "deltak/plot.h"
#include "deltak/pulse.h"
#include "deltak/constants.h"
#include "deltak/units.h"

static const char *const gain_usage[] = {
    "deltak gain --crystal <name> (--fundamental <wl> | two of --pump/"
    "--signal/--idler) --length <L>",
    "            [--intensity <I>] [--seed <I>] [--power <P> [--waist <w0>]] "
    "[--depletion]",
    "            [--temp <T>] [--period <P> | --type I|II [--pol <sip>] "
    "[--theta <deg>] [--solution <n>]]",
    "            [--noncollinear <deg> | --broadband] [--phi <deg>] "
    "[--plane XY|YZ|XZ]",
    "            [--dispersion <set>] [--json] [--spectrum] [--plot <file>] "
    "[--size <s>]",
    "",
    "  --intensity <I>  pump (or, for SHG, fundamental) intensity, e.g. "
    "5GW/cm2: plane-wave gain or efficiency",
    "  --seed <I>       signal intensity of a DFG stage: the idler it "
    "generates (low conversion)",
    "  --power <P>      SHG with a focused Gaussian beam of this power "
    "(Boyd-Kleinman)",
    "  --waist <w0>     its waist radius, e.g. 40um (default: the optimum "
    "focusing)",
    "  --depletion      SHG conversion along the crystal with pump "
    "depletion (coupled-wave ODE)",
    "  --spectrum       CSV of the parametric gain against signal "
    "wavelength",
    "  --plot <file>    the gain spectrum as a figure (.pdf, .svg, .png)",
    CLI_PLOT_OPTIONS_USAGE,
    CLI_DESIGN_USAGE,
    NULL};

#define ALLOWED CLI_D_ALL
#define NSPEC 241

static void
damage_check(const dk_crystal *c, double gw_per_cm2)
{
    if (c->has_damage && gw_per_cm2 > 0.5 * c->damage_gw_per_cm2)
        cli_warn("%.3g GW/cm2 is more than half the damage threshold of %s "
                 "(about %g GW/cm2, %s; %s)",
                 gw_per_cm2, c->id, c->damage_gw_per_cm2, c->damage_pulse,
                 c->damage_source);
}

int
cmd_gain(int argc, char **argv)
{
    enum { O_INTEN = 500, O_SEED, O_POWER, O_WAIST, O_DEPLETION, O_SPECTRUM,
           O_END };
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        CLI_PLOT_OPTIONS,
        {"intensity", required_argument, NULL, O_INTEN},
        {"seed", required_argument, NULL, O_SEED},
        {"power", required_argument, NULL, O_POWER},
        {"waist", required_argument, NULL, O_WAIST},
        {"depletion", no_argument, NULL, O_DEPLETION},
        {"spectrum", no_argument, NULL, O_SPECTRUM},
        {NULL, 0, NULL, 0}};
    const char *v[O_END - O_INTEN] = {0};
    cli_slots sl = {O_INTEN, O_END - O_INTEN, v, opts, gain_usage};
    cli_common cm = {0};
    cli_design_args da = {0};
    cli_plot_args pa = {0};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, gain_usage, &cm, &da, &pa,
                                cli_slot_option, &sl, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    const char *inten_s = v[0], *seed_s = v[1], *power_s = v[2],
               *waist_s = v[3];
    int depletion = v[4] != NULL, spectrum = v[5] != NULL;
    if ((rc = cli_common_finish(&cm, argc, argv, 0, gain_usage)))
        return rc;
    if (cm.csv)
        return cli_usage_error(gain_usage, "--csv: use --spectrum for the "
                                           "gain spectrum as CSV");
    dk_error err = {0};
    int shg = cli_design_given(&da, OPT_FUNDAMENTAL);
    if (!cli_design_given(&da, OPT_LENGTH))
        return cli_usage_error(gain_usage, "--length is required, e.g. "
                                           "--length 10mm");
    double inten = NAN, seed = NAN, power = NAN, waist_mm = NAN;
    if ((inten_s && dk_parse_intensity(inten_s, &inten, &err)) ||
        (seed_s && dk_parse_intensity(seed_s, &seed, &err)) ||
        (power_s && dk_parse_power(power_s, &power, &err)) ||
        (waist_s && dk_parse_length(waist_s, &waist_mm, &err)))
        return cli_usage_error(gain_usage, "%s", err.msg);
    if (cli_plot_parse(&pa, gain_usage))
        return CLI_USAGE;
    const char *plot = cli_plot_path(&pa);
    if (cli_plot_stdout_format(&pa))
        return cli_usage_error(gain_usage, "--plot %s (standard output) is "
                                           "for sweep and tolerance; give "
                                           "gain a file name",
                               plot);
    if (shg && (spectrum || plot || seed_s))
        return cli_usage_error(gain_usage, "--spectrum, --plot and --seed "
                                           "are for three-wave mixing, not "
                                           "SHG");
    if (!shg && (power_s || depletion))
        return cli_usage_error(gain_usage, "--power and --depletion are for "
                                           "SHG (--fundamental)");
    if (depletion && !inten_s)
        return cli_usage_error(gain_usage, "--depletion needs --intensity");
    if (waist_s && !power_s)
        return cli_usage_error(gain_usage, "--waist needs --power");
    if (!shg && !inten_s)
        return cli_usage_error(gain_usage, "give the pump --intensity, e.g. "
                                           "--intensity 5GW/cm2");
    if (shg && !inten_s && !power_s)
        return cli_usage_error(gain_usage, "give --intensity (plane wave) or "
                                           "--power (focused beam)");

    dk_db *db;
    dk_design *dp;
    if ((rc = cli_design_open(&cm, &da, ALLOWED, 1, 1, gain_usage, &db, &dp)))
        return rc;
    rc = CLI_FAIL;
    const dk_crystal *c = dp->crystal;
    dk_plot *fig = NULL;
    json_object *o = NULL;
#define d (*dp)
    int qpm = d.scheme == DK_SCHEME_QPM;
    dk_deff_scaled ds = {0};
    dk_design_deff_scaled(&d, &ds, NULL);
    double deff = ds.scaled_pm_per_v;
    if (!isfinite(deff) || deff == 0) {
        cli_error("%s has no usable d_eff for this design (%s)", c->id,
                  c->has_nonlinear ? "it vanishes for these modes and this "
                                     "direction; see 'deltak angle' for "
                                     "the others"
                                   : "the crystal file gives no nonlinear "
                                     "coefficients");
        goto done;
    }
    if (isfinite(inten))
        damage_check(c, inten);
    o = cli_design_json(&d);
    json_object_object_add(o, "length_mm", cli_json_num(d.length_mm));
    json_object_object_add(o, "temperature_C", cli_json_num(d.temp_c));
    json_object_object_add(o, "deff_pm_per_V", cli_json_num(deff));
    json_object_object_add(o, "deff_measured_pm_per_V",
                           cli_json_num(ds.measured_pm_per_v));
    json_object_object_add(o, "deff_measured_wavelength_um",
                           cli_json_num(ds.measured_um));
    if (isfinite(ds.factor))
        json_object_object_add(o, "miller_factor", cli_json_num(ds.factor));
    else
        cli_warn("d_eff not scaled by Miller's rule (%s): used as measured "
                 "at %.4g um",
                 ds.why_not, ds.measured_um);
    if (!qpm && d.angle.alpha_rad != 0)
        json_object_object_add(o, "alpha_deg",
                               cli_json_num(d.angle.alpha_rad /
                                            DK_RAD_PER_DEG));
    cli_caution_laser();   /* the numbers size a working source */
    cli_out out;
    if (cli_out_open(&out))
        goto done;
    FILE *f = out.f;
    cli_wrapf(f, "", "    ",
              "%s (data set %s), %s design, %.4g mm, %.4g C, d_eff %.3g pm/V",
            c->id, d.set->name, qpm ? "QPM" : "birefringent", d.length_mm,
            d.temp_c, deff);
    if (isfinite(ds.factor))
        cli_wrapf(f, "  ", "   ",
                  "(d_eff %.3g pm/V from d measured at %.4g um, scaled to "
                  "these wavelengths by Miller's rule: x %.3f)",
                ds.measured_pm_per_v, ds.measured_um, ds.factor);
    else
        cli_wrapf(f, "  ", "   ",
                  "(d_eff from d measured at %.4g um, not scaled: %s)",
                ds.measured_um, ds.why_not);
    if (!qpm)
        fprintf(f, "  modes %s, theta %.3f deg, phi %.2f deg%s", d.pol,
                d.theta_rad / DK_RAD_PER_DEG, d.phi_rad / DK_RAD_PER_DEG,
                d.angle.alpha_rad != 0 ? "" : "\n");
    if (!qpm && d.angle.alpha_rad != 0)
        fprintf(f, ", noncollinear alpha %+.3f deg\n",
                d.angle.alpha_rad / DK_RAD_PER_DEG);
    cli_flags_text(f, dk_design_range_flags(&d, &d.waves, d.temp_c), d.shg);
    dk_status st = DK_OK;
    if (d.shg) {
        fprintf(f, "  SHG of %.6g um\n", d.waves.signal_um);
        if (isfinite(inten)) {
            double eta;
            st = dk_design_shg_plane(&d, deff, inten, &eta, &err);
            if (!st) {
                fprintf(f, "\n  plane wave, %.4g GW/cm2, low conversion: "
                           "efficiency %.4g %%%s\n",
                        inten, 100 * eta,
                        eta > 0.1 ? "  (beyond the low-conversion limit: "
                                    "see --depletion)"
                                  : "");
                json_object_object_add(o, "intensity_GW_per_cm2",
                                       cli_json_num(inten));
                json_object_object_add(o, "efficiency_low_conversion",
                                       cli_json_num(eta));
            }
        }
        if (!st && depletion) {
            enum { NZ = 11 };
            double z[NZ], eta[NZ];
            st = dk_design_shg_depleted(&d, deff, inten, NZ, z, eta, &err);
            if (!st) {
                fprintf(f, "\n  with pump depletion (plane wave, coupled-wave "
                           "equations):\n  %10s %14s\n",
                        "z mm", "efficiency %");
                json_object *arr = json_object_new_array();
                for (int k = 0; k < NZ; k++) {
                    fprintf(f, "  %10.4g %14.4g\n", z[k], 100 * eta[k]);
                    json_object *e = json_object_new_object();
                    json_object_object_add(e, "z_mm", cli_json_num(z[k]));
                    json_object_object_add(e, "efficiency",
                                           cli_json_num(eta[k]));
                    json_object_array_add(arr, e);
                }
                json_object_object_add(o, "depletion", arr);
            }
        }
        if (!st && isfinite(power)) {
            dk_focus_result r;
            st = dk_design_shg_focused(&d, deff, power,
                                       isfinite(waist_mm) ? waist_mm * 1e3
                                                          : NAN,
                                       &r, &err);
            if (!st) {
                fprintf(f, "\n  focused Gaussian beam, %.4g W (Boyd-Kleinman):"
                           "\n    waist %.4g um, xi = L/b = %.4g, walk-off "
                           "B = %.3g, h = %.4g\n    efficiency %.4g %% "
                           "(optimum for this B: xi = %.3g, h = %.4g)\n",
                        power, r.waist_um, r.xi, r.walkoff_b, r.h,
                        100 * r.efficiency, r.xi_opt, r.h_opt);
                json_object *bk = json_object_new_object();
                json_object_object_add(bk, "power_W", cli_json_num(power));
                json_object_object_add(bk, "waist_um",
                                       cli_json_num(r.waist_um));
                json_object_object_add(bk, "xi", cli_json_num(r.xi));
                json_object_object_add(bk, "B", cli_json_num(r.walkoff_b));
                json_object_object_add(bk, "h", cli_json_num(r.h));
                json_object_object_add(bk, "efficiency",
                                       cli_json_num(r.efficiency));
                json_object_object_add(bk, "xi_optimum",
                                       cli_json_num(r.xi_opt));
                json_object_object_add(bk, "h_optimum", cli_json_num(r.h_opt));
                json_object_object_add(o, "focused", bk);
            }
        }
    } else {
        dk_opa_result r;
        const dk_waves *w = &d.waves;
        fprintf(f, "  pump %.6g um, signal %.6g um, idler %.6g um, pump "
                   "%.4g GW/cm2\n",
                w->pump_um, w->signal_um, w->idler_um, inten);
        st = dk_design_opa(&d, inten, &r, &err);
        if (!st && !r.have_band) {
            cli_warn("gain bandwidth not found: %s", err.msg);
        }
        if (!st) {
            fprintf(f, "\n  coupling Gamma %.4g /mm, Gamma L = %.4g\n"
                       "  small-signal gain at phase matching %.4g (%.3g "
                       "dB)\n",
                    r.gamma_per_mm, r.gamma_per_mm * d.length_mm, r.gain,
                    10 * log10(r.gain));
            if (r.have_band)
                fprintf(f,
                        "  gain bandwidth (FWHM of G - 1):\n"
                        "    signal %.4g-%.4g um (%.4g nm, %.4g cm-1, %.4g "
                        "THz)\n"
                        "    idler  %.4g-%.4g um (%.4g nm)\n",
                        r.signal_lo_um, r.signal_hi_um,
                        (r.signal_hi_um - r.signal_lo_um) * 1e3,
                        1e4 * (1 / r.signal_lo_um - 1 / r.signal_hi_um),
                        r.band_thz, r.idler_lo_um, r.idler_hi_um,
                        (r.idler_hi_um - r.idler_lo_um) * 1e3);
            if (r.have_band)
                cli_wrapf(f, "  ", "    ",
                          "exact gain bandwidth %.4g THz: supports a "
                          "transform-limited %.4g fs Gaussian or %.4g fs "
                          "sech2 pulse",
                        r.band_thz,
                        dk_transform_limit_fs(r.band_thz, DK_SHAPE_GAUSSIAN),
                        dk_transform_limit_fs(r.band_thz, DK_SHAPE_SECH2));
            if (isfinite(r.estimate_thz))
                cli_wrapf(f, "  ", "    ",
                          "%s-gain estimate (Gamma L %s %.4g) from the "
                          "signal-idler GVM (%.3g fs/mm%s): %.4g THz%s",
                        r.high_gain ? "high" : "low",
                        r.high_gain ? ">" : "<=", DK_GAIN_REGIME_GL,
                        r.pulse.gvm_fs_per_mm[2],
                        r.pulse.noncollinear ? ", projected" : "",
                        r.estimate_thz,
                        r.high_gain ? " [(2 sqrt(ln2)/pi) sqrt(Gamma/L)/|GVM|]"
                                    : " [sinc^2 width 0.886/(L |GVM|)]");
            else
                cli_wrap(f, "  ", "    ",
                         "signal and idler group velocities matched: "
                         "first-order estimates do not apply (the band is "
                         "set by GVD)");
            json_object_object_add(o, "intensity_GW_per_cm2",
                                   cli_json_num(inten));
            json_object_object_add(o, "gamma_per_mm",
                                   cli_json_num(r.gamma_per_mm));
            json_object_object_add(o, "gain", cli_json_num(r.gain));
            json_object *bw = json_object_new_object();
            if (r.have_band) {
                json_object_object_add(
                    bw, "signal_nm",
                    cli_json_num((r.signal_hi_um - r.signal_lo_um) * 1e3));
                json_object_object_add(
                    bw, "idler_nm",
                    cli_json_num((r.idler_hi_um - r.idler_lo_um) * 1e3));
                json_object_object_add(bw, "THz", cli_json_num(r.band_thz));
            }
            if (isfinite(r.first_order_thz))
                json_object_object_add(bw, "first_order_THz",
                                       cli_json_num(r.first_order_thz));
            if (isfinite(r.first_order_thz))
                json_object_object_add(bw, "high_gain_estimate_THz",
                                       cli_json_num(r.first_order_thz));
            if (isfinite(r.low_gain_thz))
                json_object_object_add(bw, "low_gain_estimate_THz",
                                       cli_json_num(r.low_gain_thz));
            json_object_object_add(bw, "regime",
                                   json_object_new_string(r.high_gain
                                                              ? "high gain"
                                                              : "low gain"));
            if (isfinite(r.estimate_thz))
                json_object_object_add(bw, "estimate_THz",
                                       cli_json_num(r.estimate_thz));
            if (r.have_band) {
                json_object_object_add(
                    bw, "transform_limit_gaussian_fs",
                    cli_json_num(dk_transform_limit_fs(r.band_thz,
                                                       DK_SHAPE_GAUSSIAN)));
                json_object_object_add(
                    bw, "transform_limit_sech2_fs",
                    cli_json_num(dk_transform_limit_fs(r.band_thz,
                                                       DK_SHAPE_SECH2)));
            }
            json_object_object_add(o, "gain_fwhm", bw);
            if (isfinite(seed)) {
                double out_i;
                const dk_pulse_props *pp = &r.pulse;
                if (!dk_mixing_intensity_gw_per_cm2(
                        deff, pp->w[2].n, pp->w[0].n, pp->w[1].n, w->idler_um,
                        d.length_mm, inten, seed, 0, &out_i, NULL)) {
                    fprintf(f, "  DFG with a %.4g GW/cm2 signal, low "
                               "conversion: idler %.4g MW/cm2\n",
                            seed, out_i * 1e3);
                    json_object_object_add(o, "idler_GW_per_cm2",
                                           cli_json_num(out_i));
                }
            }
            if ((spectrum || plot) && !r.have_band) {
                st = dk_error_set(&err, DK_ENOROOT,
                                  "no gain spectrum: the band edges were "
                                  "not found");
            } else if (spectrum || plot) {
                double xs[NSPEC], gs[NSPEC];
                double x0 = w->signal_um,
                       span = 2 * (r.signal_hi_um - r.signal_lo_um);
                st = dk_design_gain_spectrum(&d, r.gamma_per_mm, x0 - span,
                                             x0 + span, NSPEC, xs, gs, &err);
                if (!st && spectrum && !cm.json) {
                    /* The CSV replaces the text answer. */
                    cli_out_discard(&out);
                    if (cli_out_open(&out))
                        goto done;
                    f = out.f;
                    cli_set_output_mode(CLI_CSV);
                    char flags[256];
                    fprintf(f, "signal_um,idler_um,gain,flags\n");
                    for (int k = 0; k < NSPEC; k++) {
                        dk_waves wk = *w;
                        wk.signal_um = xs[k];
                        wk.idler_um = dk_third_wave_um(w->pump_um, xs[k]);
                        fprintf(f, "%.8g,%.8g,%.8g,%s\n", xs[k], wk.idler_um,
                                gs[k],
                                cli_csv_flags(dk_design_range_flags(
                                                  &d, &wk, d.temp_c),
                                              0, flags, sizeof flags));
                    }
                }
                if (!st && plot) {
                    st = cli_plot_new(&pa, &fig, &err);
                    if (!st)
                        st = dk_plot_set_xlabel(
                            fig, "Signal wavelength λ<sub>s</sub> (µm)", &err);
                    if (!st)
                        st = dk_plot_set_ylabel(fig, "Parametric gain G",
                                                &err);
                    if (!st)
                        st = dk_plot_add_band(fig, r.signal_lo_um,
                                              r.signal_hi_um, "FWHM", &err);
                    if (!st)
                        st = dk_plot_add_line(fig, xs, gs, NSPEC, NULL, &err);
                    if (!st)
                        st = dk_plot_set_top_axis(
                            fig, dk_plot_um_to_per_cm, dk_plot_per_cm_to_um,
                            NULL, "Wavenumber (cm<sup>−1</sup>)", &err);
                    if (!st)
                        st = cli_plot_add_notes(fig, &err);
                    if (!st)
                        st = dk_plot_write(fig, plot, &err);
                }
            }
        }
    }
    if (st) {
        cli_error("%s", err.msg);
        cli_out_discard(&out);
        goto done;
    }
    if (cm.json) {
        /* Replace the text with the JSON object. */
        cli_out_discard(&out);
        if (cli_out_open(&out))
            goto done;
        cli_flags_json(o, dk_design_range_flags(&d, &d.waves, d.temp_c),
                       d.shg);
        cli_notes_to_json(o);
        cli_out_json(&out, o);
        o = NULL;
    } else if (!spectrum) {
        fputc('\n', out.f);
        cli_wrap(out.f, "  ", "  ",
                 "plane-wave and Gaussian-beam estimates; real beams, "
                 "losses and thermal effects lower them");
    }
    rc = cli_out_commit(&out);
#undef d
done:
    json_object_put(o);
    dk_plot_free(fig);
    free(dp);
    dk_db_free(db);
    return rc;
}
