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
#include "commands.h"
#include "design_args.h"
#include "deltak/gain_spectrum.h"
#include "deltak/plot.h"
#include "deltak/pulse.h"
#include "deltak/units.h"

static const char *const gain_usage[] = {
    "deltak gain --crystal <name> (--fundamental <wl> | two of --pump/"
    "--signal/--idler) --length <L>",
    "            [--intensity <I>] [--seed <I>] [--power <P> [--waist <w0>]] "
    "[--depletion]",
    "            [--temp <T>] [--period <P> | --type I|II [--pol <sip>] "
    "[--theta <deg>]]",
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
    NULL};

#define DEG (M_PI / 180)
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
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        CLI_DESIGN_OPTIONS,
        {"length", required_argument, NULL, 'L'},
        {"intensity", required_argument, NULL, 'I'},
        {"seed", required_argument, NULL, 'E'},
        {"power", required_argument, NULL, 'W'},
        {"waist", required_argument, NULL, 'w'},
        {"depletion", no_argument, NULL, 'D'},
        {"spectrum", no_argument, NULL, 'X'},
        {"plot", required_argument, NULL, 'G'},
        {"size", required_argument, NULL, 'Z'},
        {NULL, 0, NULL, 0}};
    cli_common cm = {0};
    cli_design_args da = {0};
    const char *len = NULL, *inten_s = NULL, *seed_s = NULL, *power_s = NULL,
               *waist_s = NULL, *plot = NULL, *size = "single";
    int depletion = 0, spectrum = 0, ch, rc;
    optind = 1;
    opterr = 0;
    while ((ch = getopt_long(argc, argv, "+h", opts, NULL)) != -1) {
        if (cli_common_option(ch, &cm) || cli_design_option(ch, &da))
            continue;
        switch (ch) {
        case 'L': len = optarg; break;
        case 'I': inten_s = optarg; break;
        case 'E': seed_s = optarg; break;
        case 'W': power_s = optarg; break;
        case 'w': waist_s = optarg; break;
        case 'D': depletion = 1; break;
        case 'X': spectrum = 1; break;
        case 'G': plot = optarg; break;
        case 'Z': size = optarg; break;
        case 'h': cli_print_usage(stdout, gain_usage); return 0;
        default: return cli_bad_option(argv, gain_usage);
        }
    }
    if ((rc = cli_common_finish(&cm, argc, argv, 0, gain_usage)))
        return rc;
    cli_design_spec sp;
    dk_design d = {0};
    dk_error err = {0};
    if ((rc = cli_design_parse(&da, &sp, 1, gain_usage)))
        return rc;
    d.shg = sp.shg;
    if (!len)
        return cli_usage_error(gain_usage, "--length is required, e.g. "
                                           "--length 10mm");
    double inten = NAN, seed = NAN, power = NAN, waist_mm = NAN, wmm = 0,
           hmm = 0;
    if (dk_parse_length(len, &d.length_mm, &err) ||
        (inten_s && dk_parse_intensity(inten_s, &inten, &err)) ||
        (seed_s && dk_parse_intensity(seed_s, &seed, &err)) ||
        (power_s && dk_parse_power(power_s, &power, &err)) ||
        (waist_s && dk_parse_length(waist_s, &waist_mm, &err)) ||
        dk_plot_size_parse(size, &wmm, &hmm, &err))
        return cli_usage_error(gain_usage, "%s", err.msg);
    if (d.shg && (spectrum || plot || seed_s))
        return cli_usage_error(gain_usage, "--spectrum, --plot and --seed "
                                           "are for three-wave mixing, not "
                                           "SHG");
    if (!d.shg && (power_s || depletion))
        return cli_usage_error(gain_usage, "--power and --depletion are for "
                                           "SHG (--fundamental)");
    if (depletion && !inten_s)
        return cli_usage_error(gain_usage, "--depletion needs --intensity");
    if (waist_s && !power_s)
        return cli_usage_error(gain_usage, "--waist needs --power");
    if (!d.shg && !inten_s)
        return cli_usage_error(gain_usage, "give the pump --intensity, e.g. "
                                           "--intensity 5GW/cm2");
    if (d.shg && !inten_s && !power_s)
        return cli_usage_error(gain_usage, "give --intensity (plane wave) or "
                                           "--power (focused beam)");

    dk_db *db = NULL;
    if (cli_load_db(&db))
        return CLI_FAIL;
    rc = CLI_FAIL;
    dk_plot *fig = NULL;
    const dk_crystal *c = cli_find_crystal(db, cm.crystal);
    const dk_dispersion_set *set = c ? cli_find_set(c, cm.set_name) : NULL;
    if (!set)
        goto done;
    int qpm;
    dk_pulse_props pp;
    if (cli_design_setup(&sp, c, set, &d, &qpm))
        goto done;
    if (dk_pulse_props_of(&d, &pp, &err)) {
        cli_error("%s", err.msg);
        goto done;
    }
    double deff = dk_design_deff(&d);
    if (!isfinite(deff) || deff == 0) {
        cli_error("%s has no usable d_eff for this design (check the "
                  "crystal file's nonlinear coefficients)",
                  c->id);
        goto done;
    }
    cli_warn_caution(c, d.temp_c);
    if (isfinite(inten))
        damage_check(c, inten);
    if (c->nl_from_memory)
        cli_warn("the d coefficients of %s are typed from memory; treat "
                 "efficiencies as estimates",
                 c->id);
    json_object *o = json_object_new_object();
    json_object_object_add(o, "crystal", json_object_new_string(c->id));
    json_object_object_add(o, "dispersion", json_object_new_string(set->name));
    json_object_object_add(o, "design",
                           json_object_new_string(qpm ? "qpm"
                                                      : "birefringent"));
    json_object_object_add(o, "length_mm", cli_json_num(d.length_mm));
    json_object_object_add(o, "temperature_C", cli_json_num(d.temp_c));
    json_object_object_add(o, "deff_pm_per_V", cli_json_num(deff));
    cli_out out;
    if (cli_out_open(&out)) {
        json_object_put(o);
        goto done;
    }
    FILE *f = out.f;
    fprintf(f, "%s (data set %s), %s design, %.4g mm, %.4g C, d_eff %.3g "
               "pm/V\n",
            c->id, set->name, qpm ? "QPM" : "birefringent", d.length_mm,
            d.temp_c, deff);
    const double nf = pp.w[0].n, nsh = pp.w[2].n, lam = d.waves.signal_um;
    dk_status st = DK_OK;
    if (d.shg) {
        fprintf(f, "  SHG of %.6g um\n", lam);
        if (isfinite(inten)) {
            double eta;
            st = dk_shg_efficiency(deff, nf, nsh, lam, d.length_mm, inten, 0,
                                   &eta, &err);
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
            dk_twm m;
            enum { NZ = 11 };
            double z[NZ];
            dk_twm_point pt[NZ];
            for (int k = 0; k < NZ; k++)
                z[k] = d.length_mm * k / (NZ - 1);
            st = dk_twm_shg_init(&m, lam, nf, nsh, deff, inten, 0, &err);
            if (!st)
                st = dk_twm_propagate(&m, z, NZ, pt, &err);
            if (!st) {
                fprintf(f, "\n  with pump depletion (plane wave, coupled-wave "
                           "equations):\n  %10s %14s\n",
                        "z mm", "efficiency %");
                json_object *arr = json_object_new_array();
                for (int k = 0; k < NZ; k++) {
                    double eta = pt[k].intensity_gw_per_cm2[2] / inten;
                    fprintf(f, "  %10.4g %14.4g\n", z[k], 100 * eta);
                    json_object *e = json_object_new_object();
                    json_object_object_add(e, "z_mm", cli_json_num(z[k]));
                    json_object_object_add(e, "efficiency", cli_json_num(eta));
                    json_object_array_add(arr, e);
                }
                json_object_object_add(o, "depletion", arr);
            }
        }
        if (!st && isfinite(power)) {
            double b, xi, h, sigma, xi_opt, h_opt, eta;
            double rho = pp.walkoff_rad[0];
            st = dk_bk_walkoff_b(rho, d.length_mm, nf, lam, &b, &err);
            if (!st)
                st = dk_bk_optimum(b, &xi_opt, &h_opt, NULL, &err);
            if (!st && isfinite(waist_mm)) {
                st = dk_bk_xi(d.length_mm, waist_mm * 1e3, nf, lam, &xi,
                              &err);
            } else if (!st) {
                xi = xi_opt;
                /* w0 from b = L/ξ = 2π n w0²/λ. */
                double bmm = d.length_mm / xi;
                waist_mm = sqrt(bmm * lam * 1e-3 / (2 * M_PI * nf));
            }
            if (!st)
                st = dk_bk_h_max(xi, b, &h, &sigma, &err);
            if (!st)
                st = dk_bk_shg_efficiency(deff, nf, nsh, lam, d.length_mm,
                                          power, h, &eta, &err);
            if (!st) {
                fprintf(f, "\n  focused Gaussian beam, %.4g W (Boyd-Kleinman):"
                           "\n    waist %.4g um, xi = L/b = %.4g, walk-off "
                           "B = %.3g, h = %.4g\n    efficiency %.4g %% "
                           "(optimum for this B: xi = %.3g, h = %.4g)\n",
                        power, waist_mm * 1e3, xi, b, h, 100 * eta, xi_opt,
                        h_opt);
                json_object *bk = json_object_new_object();
                json_object_object_add(bk, "power_W", cli_json_num(power));
                json_object_object_add(bk, "waist_um",
                                       cli_json_num(waist_mm * 1e3));
                json_object_object_add(bk, "xi", cli_json_num(xi));
                json_object_object_add(bk, "B", cli_json_num(b));
                json_object_object_add(bk, "h", cli_json_num(h));
                json_object_object_add(bk, "efficiency", cli_json_num(eta));
                json_object_object_add(bk, "xi_optimum", cli_json_num(xi_opt));
                json_object_object_add(bk, "h_optimum", cli_json_num(h_opt));
                json_object_object_add(o, "focused", bk);
            }
        }
    } else {
        double gamma, g0, lo, hi, bw_thz = NAN;
        const dk_waves *w = &d.waves;
        fprintf(f, "  pump %.6g um, signal %.6g um, idler %.6g um, pump "
                   "%.4g GW/cm2\n",
                w->pump_um, w->signal_um, w->idler_um, inten);
        st = dk_opa_gamma_per_mm(deff, pp.w[2].n, pp.w[0].n, pp.w[1].n,
                                 w->signal_um, w->idler_um, inten, &gamma,
                                 &err);
        if (!st)
            st = dk_opa_signal_gain(gamma, 0, d.length_mm, &g0, &err);
        if (!st)
            st = dk_design_gain_fwhm(&d, gamma, &lo, &hi, &err);
        if (!st && pp.gvm_fs_per_mm[2] != 0)
            dk_opa_bandwidth_thz(gamma, d.length_mm, pp.gvm_fs_per_mm[2],
                                 &bw_thz, NULL);
        if (!st) {
            double il = 1 / (1 / w->pump_um - 1 / lo);
            double ih = 1 / (1 / w->pump_um - 1 / hi);
            double thz = DK_C_M_PER_S * (1 / lo - 1 / hi) * 1e-6;
            fprintf(f, "\n  coupling Gamma %.4g /mm, Gamma L = %.4g\n"
                       "  small-signal gain at phase matching %.4g (%.3g "
                       "dB)\n"
                       "  gain bandwidth (FWHM of G - 1): signal %.4g-%.4g um "
                       "(%.4g nm, %.4g cm-1, %.4g THz)\n"
                       "                                   idler %.4g-%.4g um "
                       "(%.4g nm)\n",
                    gamma, gamma * d.length_mm, g0, 10 * log10(g0), lo, hi,
                    (hi - lo) * 1e3, 1e4 * (1 / lo - 1 / hi), thz, ih, il,
                    (il - ih) * 1e3);
            if (isfinite(bw_thz))
                fprintf(f, "  first-order estimate from the signal-idler GVM "
                           "(%.3g fs/mm): %.4g THz\n",
                        pp.gvm_fs_per_mm[2], bw_thz);
            json_object_object_add(o, "intensity_GW_per_cm2",
                                   cli_json_num(inten));
            json_object_object_add(o, "gamma_per_mm", cli_json_num(gamma));
            json_object_object_add(o, "gain", cli_json_num(g0));
            json_object *bw = json_object_new_object();
            json_object_object_add(bw, "signal_nm",
                                   cli_json_num((hi - lo) * 1e3));
            json_object_object_add(bw, "idler_nm",
                                   cli_json_num((il - ih) * 1e3));
            json_object_object_add(bw, "THz", cli_json_num(thz));
            if (isfinite(bw_thz))
                json_object_object_add(bw, "first_order_THz",
                                       cli_json_num(bw_thz));
            json_object_object_add(o, "gain_fwhm", bw);
            if (isfinite(seed)) {
                double out_i;
                if (!dk_mixing_intensity_gw_per_cm2(deff, pp.w[2].n, pp.w[0].n,
                                                    pp.w[1].n, w->idler_um,
                                                    d.length_mm, inten, seed,
                                                    0, &out_i, NULL)) {
                    fprintf(f, "  DFG with a %.4g GW/cm2 signal, low "
                               "conversion: idler %.4g MW/cm2\n",
                            seed, out_i * 1e3);
                    json_object_object_add(o, "idler_GW_per_cm2",
                                           cli_json_num(out_i));
                }
            }
            if (spectrum || plot) {
                double xs[NSPEC], gs[NSPEC];
                double x0 = w->signal_um, span = 2 * (hi - lo);
                for (int k = 0; k < NSPEC; k++) {
                    xs[k] = x0 - span + 2 * span * k / (NSPEC - 1);
                    gs[k] = dk_design_gain(&d, gamma, xs[k]);
                }
                if (spectrum && !cm.json) {
                    /* The CSV replaces the text answer. */
                    fclose(f);
                    free(out.buf);
                    if (cli_out_open(&out)) {
                        json_object_put(o);
                        goto done;
                    }
                    f = out.f;
                    fprintf(f, "signal_um,idler_um,gain\n");
                    for (int k = 0; k < NSPEC; k++)
                        fprintf(f, "%.8g,%.8g,%.8g\n", xs[k],
                                1 / (1 / w->pump_um - 1 / xs[k]), gs[k]);
                }
                if (plot) {
                    st = dk_plot_new(wmm, hmm, &fig, &err);
                    if (!st)
                        st = dk_plot_set_xlabel(
                            fig, "Signal wavelength λ<sub>s</sub> (µm)", &err);
                    if (!st)
                        st = dk_plot_set_ylabel(fig, "Parametric gain G",
                                                &err);
                    if (!st)
                        st = dk_plot_add_band(fig, lo, hi, "FWHM", &err);
                    if (!st)
                        st = dk_plot_add_line(fig, xs, gs, NSPEC, NULL, &err);
                    if (!st)
                        st = dk_plot_set_top_axis(
                            fig, dk_plot_um_to_per_cm, dk_plot_per_cm_to_um,
                            NULL, "Wavenumber (cm<sup>−1</sup>)", &err);
                    if (!st)
                        st = dk_plot_write(fig, plot, &err);
                }
            }
        }
    }
    if (st) {
        cli_error("%s", err.msg);
        json_object_put(o);
        cli_out_discard(&out);
        goto done;
    }
    if (cm.json) {
        /* Replace the text with the JSON object. */
        fclose(f);
        free(out.buf);
        if (cli_out_open(&out)) {
            json_object_put(o);
            goto done;
        }
        cli_warnings_to_json(o);
        cli_out_json(&out, o);
    } else {
        json_object_put(o);
        if (!spectrum)
            fprintf(out.f, "\n  plane-wave and Gaussian-beam estimates; real "
                           "beams, losses and thermal effects lower them\n");
    }
    rc = cli_out_commit(&out);
done:
    dk_plot_free(fig);
    dk_db_free(db);
    return rc;
}
