/*
 * test_broadband.c - bandwidth as time (deltak/bandwidth.h), acceptance
 * over the whole domain (deltak/acceptance.h), the gain-bandwidth regime
 * (deltak/gain_spectrum.h) and the design-to-simulator adapter
 * (deltak/design_sim.h): closed forms, limits that other modules compute
 * by other routes, and the pulse simulator against the plane-wave and
 * sinc² results.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/bandwidth.h"
#include "deltak/broadband.h"
#include "deltak/design_sim.h"
#include "deltak/gain_spectrum.h"
#include "deltak/pulse.h"
#include "deltak/tolerance.h"

#define U2 (2 * DK_SINC2_HALF_U)   /* 2.78311: |Δk| L at half maximum */

static dk_waves
opa(double pump_um, double signal_um)
{
    return (dk_waves){.pump_um = pump_um, .signal_um = signal_um,
                      .idler_um = 1 / (1 / pump_um - 1 / signal_um)};
}

/* Time-bandwidth products: 2 ln2/π and 4 ln²(1+√2)/π², the values 0.441
 * and 0.315 every ultrafast text tabulates (A. M. Weiner, Ultrafast
 * Optics, Wiley 2009, §3.1; table number from memory). */
static void
transform_limits(void **state)
{
    (void)state;
    assert_published(dk_time_bandwidth(DK_SHAPE_GAUSSIAN), 0.441, 0, 5e-4,
                     "Gaussian time-bandwidth product", "Weiner 2009 §3.1");
    assert_published(dk_time_bandwidth(DK_SHAPE_SECH2), 0.315, 0, 5e-4,
                     "sech2 time-bandwidth product", "Weiner 2009 §3.1");
    assert_within(dk_transform_limit_fs(10, DK_SHAPE_GAUSSIAN), 44.1271, 1e-5,
                  0);
    assert_within(dk_pulse_bandwidth_thz(dk_transform_limit_fs(
                                             7, DK_SHAPE_SECH2),
                                         DK_SHAPE_SECH2),
                  7, 1e-12, 0);
    assert_true(isinf(dk_transform_limit_fs(0, DK_SHAPE_GAUSSIAN)));
}

static double
two_roots(double x, void *p)
{
    double a = *(double *)p;
    return a * (x - 3.0) * (x - 3.3);
}

static double
flat(double x, void *p)
{
    (void)p;
    return 1e-9 * (x - 3.0);
}

static double
far_roots(double x, void *p)
{
    (void)p;
    return 0.05 * (x - 3.0) * (x - 7.0);
}

/* Every half-maximum interval, against the algebra of the quadratic
 * Δk = a(x − 3)(x − 3.3): half maximum where (x − 3)(x − 3.3) = ±U2/(aL),
 * i.e. x = 3.15 ± √(0.0225 ± U2/(aL)). */
static void
lobes(void **state)
{
    (void)state;
    const double L = 1000;
    double a = 130.0 / L;     /* the dip between the roots is just deeper
                               * than the half level: a double hump */
    dk_acceptance acc;
    dk_acceptance_lobes lb;
    assert_int_equal(dk_acceptance_fwhm(two_roots, &a, 3.0, L, 1e-4, 0, 10,
                                        &acc, NULL),
                     DK_OK);
    assert_int_equal(dk_acceptance_lobes_scan(two_roots, &a, L, 0, 10, 2001,
                                              &acc, &lb, NULL),
                     DK_OK);
    double c = U2 / (a * L);
    assert_int_equal(lb.n, 2);
    assert_int_equal(lb.central, 0);
    assert_false(lb.contiguous);
    assert_int_equal(lb.group_last, 1);
    assert_within(lb.lo[0], 3.15 - sqrt(0.0225 + c), 0, 1e-9);
    assert_within(lb.hi[0], 3.15 - sqrt(0.0225 - c), 0, 1e-9);
    assert_within(lb.lo[1], 3.15 + sqrt(0.0225 - c), 0, 1e-9);
    assert_within(lb.outer_fwhm, 2 * sqrt(0.0225 + c), 0, 1e-9);
    assert_within(acc.fwhm, lb.hi[0] - lb.lo[0], 0, 1e-9);
    assert_true(acc.bounded);
    /* Far apart: a second phase-matching point, listed, not joined. */
    assert_int_equal(dk_acceptance_fwhm(far_roots, NULL, 3.0, L, 1e-4, 0, 10,
                                        &acc, NULL),
                     DK_OK);
    assert_int_equal(dk_acceptance_lobes_scan(far_roots, NULL, L, 0, 10,
                                              2001, &acc, &lb, NULL),
                     DK_OK);
    assert_int_equal(lb.n, 2);
    assert_true(lb.contiguous);
    assert_within(lb.outer_fwhm, acc.fwhm, 1e-12, 0);
    assert_within(lb.lo[1], 7 - U2 / (0.05 * 4 * L), 1e-4, 0);
    /* Above half over the whole domain: both sides open, not a failure. */
    assert_int_equal(dk_acceptance_fwhm(flat, NULL, 3.0, L, 1e-4, 0, 10,
                                        &acc, NULL),
                     DK_OK);
    assert_false(acc.bounded);
    assert_true(acc.open_lo && acc.open_hi);
    assert_within(acc.fwhm, 10, 1e-12, 0);
    assert_int_equal(dk_acceptance_lobes_scan(flat, NULL, L, 0, 10, 16, &acc,
                                              &lb, NULL),
                     DK_OK);
    assert_true(lb.open_lo && lb.open_hi && lb.n == 1);
    assert_int_equal(dk_acceptance_lobes_scan(flat, NULL, L, 0, 10, 3, &acc,
                                              &lb, NULL),
                     DK_EINVAL);
}

/* LiIO3, type I, pump 1030 nm, signal 1.6 µm, 1 mm: the signal
 * acceptance that the ±30 % search could not bound (issue 15) now has
 * both edges inside the transparency, and the whole-domain scan agrees
 * on the central interval. */
static void
liio3_broad(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "LiIO3", NULL, opa(1.03, 1.6), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 1);
    dk_acceptance acc;
    dk_acceptance_lobes lb;
    double dom[2];
    assert_int_equal(dk_design_acceptance_lobes(&d, DK_TOL_SIGNAL, &acc, &lb,
                                                dom, NULL),
                     DK_OK);
    assert_true(acc.bounded);
    assert_true(isfinite(acc.fwhm) && acc.fwhm > 0.3 * 1.6);
    assert_true(acc.lo > dom[0] && acc.hi < dom[1]);
    assert_true(lb.central >= 0);
    assert_within(lb.lo[lb.central], acc.lo, 0, 1e-9);
    assert_within(lb.hi[lb.central], acc.hi, 0, 1e-9);
    /* sinc² is ½ at both edges. */
    for (int e = 0; e < 2; e++) {
        double x = e ? acc.hi : acc.lo;
        assert_within(dk_sinc2(dk_design_delta_k(&d, DK_TOL_SIGNAL, x), 1e3),
                      0.5, 0, 1e-6);
    }
    /* The curve now draws. */
    double x[41], y[41];
    assert_int_equal(dk_design_acceptance_curve(&d, DK_TOL_SIGNAL, 1, 41, x,
                                                y, &acc, NULL),
                     DK_OK);
}

/* The pair acceptances to first order are 0.8859/(L |GVM|) with the GVM
 * of deltak/pulse.h, computed by another route (analytic dn/dλ of the
 * Taylor jets, not differences of Δk). */
static void
pair_first_order(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 2);
    dk_pulse_props pp;
    assert_int_equal(dk_pulse_props_of(&d, &pp, NULL), DK_OK);
    /* signal-idler: gvm[2]; pump-idler: gvm[1]; pump-signal: gvm[0] */
    const int g[3] = {2, 1, 0};
    for (int k = 0; k < DK_NPAIRS; k++) {
        dk_acceptance a;
        assert_int_equal(dk_design_pair_acceptance(&d, (dk_pair)k, &a, NULL,
                                                   NULL),
                         DK_OK);
        double expect = 1e3 * 2 * U2 /
                        (2 * M_PI * 2 * fabs(pp.gvm_fs_per_mm[g[k]]));
        assert_within(a.linear_fwhm, expect, 2e-3, 0);
        assert_true(a.bounded);
        /* The exact width differs from the first order by GVD only:
         * little for the signal-idler pair; the pump-signal pair, with
         * the smallest GVM, is broad enough for GVD to rule. */
        if (k == DK_PAIR_SIGNAL_IDLER)
            assert_within(a.fwhm, expect, 0.1, 0);
        else
            assert_true(a.fwhm > 0.9 * expect);
    }
    /* SHG has one pair. */
    dk_design s;
    test_design(&s, "BBO", NULL, dk_waves_shg(1.03), 1, NAN, "ooe",
                DK_SCHEME_ANGLE, 1);
    assert_false(dk_pair_applies(&s, DK_PAIR_PUMP_IDLER));
    dk_acceptance a;
    assert_int_equal(dk_design_pair_acceptance(&s, DK_PAIR_PUMP_IDLER, &a,
                                               NULL, NULL),
                     DK_EINVAL);
}

/* Longest crystal for a long pulse (GVD negligible): 0.8859 τ/(K |GVM|),
 * about 2.008 τ/|GVM| for a Gaussian. */
static void
longest_crystal(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 2);
    dk_pulse_props pp;
    assert_int_equal(dk_pulse_props_of(&d, &pp, NULL), DK_OK);
    double L;
    assert_int_equal(dk_design_longest_crystal(&d, DK_PAIR_SIGNAL_IDLER, 300,
                                               DK_SHAPE_GAUSSIAN, &L, NULL),
                     DK_OK);
    double expect = 2 * U2 / (2 * M_PI) * 300 /
                    (dk_time_bandwidth(DK_SHAPE_GAUSSIAN) *
                     fabs(pp.gvm_fs_per_mm[2]));
    assert_within(L, expect, 0.02, 0);
    assert_within(d.length_mm, 2, 0, 0);   /* restored */
    /* At that length the acceptance equals the pulse's bandwidth. */
    dk_acceptance a;
    d.length_mm = L;
    assert_int_equal(dk_design_pair_acceptance(&d, DK_PAIR_SIGNAL_IDLER, &a,
                                               NULL, NULL),
                     DK_OK);
    assert_within(a.fwhm, dk_pulse_bandwidth_thz(300, DK_SHAPE_GAUSSIAN),
                  1e-6, 0);
    /* sech² has the narrower spectrum: a longer crystal. */
    double Ls;
    d.length_mm = 2;
    assert_int_equal(dk_design_longest_crystal(&d, DK_PAIR_SIGNAL_IDLER, 300,
                                               DK_SHAPE_SECH2, &Ls, NULL),
                     DK_OK);
    assert_within(Ls / L, 0.441271 / 0.314833, 0.02, 0);
    assert_int_equal(dk_design_longest_crystal(&d, DK_PAIR_SIGNAL_IDLER, -1,
                                               DK_SHAPE_SECH2, &Ls, NULL),
                     DK_EINVAL);
}

/* A pulse after the crystal: for a long Gaussian the GDD-only closed form
 * τ√(1 + (4 ln2 GDD/τ²)²) (Weiner §4.2); for a short one the pulse
 * simulator with nothing coupling (split-step FFT over the same exact
 * k(ω)) gives the same duration as the direct Fourier sum. */
static void
dispersed(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 10);
    dk_dispersed o;
    assert_int_equal(dk_design_dispersed(&d, 2, 60, DK_SHAPE_GAUSSIAN, 10, &o,
                                         NULL),
                     DK_OK);
    assert_true(o.gdd_fs2 > 500 && o.gdd_fs2 < 1000);   /* BBO e-wave */
    assert_within(o.fwhm_out_fs, o.gdd_only_fs, 0.01, 0);
    assert_true(o.fwhm_out_fs > 60);
    assert_int_equal(dk_design_dispersed(&d, 1, 25, DK_SHAPE_SECH2, 3, &o,
                                         NULL),
                     DK_OK);
    dk_design_wave_k wk[3];
    dk_sim_problem p;
    assert_int_equal(dk_design_sim_problem(&d, wk, &p, NULL, NULL), DK_OK);
    p.length_mm = 3;
    p.deff_pm_per_v = 0;
    p.wave[1].input = (dk_sim_pulse){.shape = DK_SIM_SECH2, .fwhm_fs = 25,
                                     .fluence_j_per_cm2 = 1e-6};
    dk_sim_options so = {.frame_wave = 2, .no_convergence_check = 1};
    dk_sim_result *r = NULL;
    assert_int_equal(dk_sim_run(&p, &so, &r, NULL), DK_OK);
    assert_within(r->wave[1].fwhm_out_fs, o.fwhm_out_fs, 0.01, 0);
    dk_sim_result_free(r);
    assert_int_equal(dk_design_dispersed(&d, 1, 0, DK_SHAPE_SECH2, 3, &o,
                                         NULL),
                     DK_EINVAL);
}

/* The simulated SHG of a quasi-monochromatic wave at low conversion
 * equals the plane-wave efficiency of deltak/gain.h with the design's
 * d_eff, birefringent (BBO) and QPM (MgO:LN: the simulator writes the
 * domains with the bulk d; the plane-wave formula uses the first-order
 * grating d_eff 2d/π, Fejer et al. 1992, which a whole number of
 * periods reproduces to about 1/(KL)). */
static void
shg_plane_wave(void **state)
{
    (void)state;
    const struct {
        const char *crystal, *pol;
        dk_scheme scheme;
        double fund_um, len_mm, tol;
    } cases[] = {
        {"BBO", "ooe", DK_SCHEME_ANGLE, 1.03, 1, 5e-3},
        {"MgO:LN", NULL, DK_SCHEME_QPM, 1.064, 1, 1e-2},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        dk_design d;
        test_design(&d, cases[i].crystal, NULL, dk_waves_shg(cases[i].fund_um),
                    1, NAN, cases[i].pol, cases[i].scheme, cases[i].len_mm);
        dk_design_wave_k wk[3];
        dk_sim_problem p;
        dk_deff_scaled ds;
        assert_int_equal(dk_design_sim_problem(&d, wk, &p, &ds, NULL), DK_OK);
        assert_true(p.degenerate);
        const double I = 1e-4;   /* GW/cm², η ~ 1e-4 */
        p.wave[0].input = (dk_sim_pulse){.shape = DK_SIM_CW,
                                         .peak_gw_per_cm2 = I};
        dk_sim_options so = {.samples = 256};
        dk_sim_result *r = NULL;
        assert_int_equal(dk_sim_run(&p, &so, &r, NULL), DK_OK);
        double eta_sim = r->wave[2].fluence_out_j_per_cm2 /
                         r->wave[0].fluence_in_j_per_cm2;
        double eta;
        assert_int_equal(dk_design_shg_plane(&d, ds.scaled_pm_per_v, I, &eta,
                                             NULL),
                         DK_OK);
        assert_true(eta < 1e-2);
        assert_within(eta_sim, eta, cases[i].tol, 0);
        assert_true(r->converged);
        dk_sim_result_free(r);
    }
}

/* Small-signal SFG in a BBO design (signal CW, a 20 fs idler, the sum at
 * the pump): the ratio of the sum spectrum to the idler spectrum is the
 * sinc² of the design's pump-idler pair acceptance, computed by the
 * angle module from the same data (Boyd §2.7; the engine's own test
 * checks the same law on a QPM grating). */
static void
sfg_spectrum_pair(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 1);
    dk_design_wave_k wk[3];
    dk_sim_problem p;
    assert_int_equal(dk_design_sim_problem(&d, wk, &p, NULL, NULL), DK_OK);
    p.wave[0].input = (dk_sim_pulse){.shape = DK_SIM_CW,
                                     .peak_gw_per_cm2 = 1e-3};
    p.wave[1].input = (dk_sim_pulse){.shape = DK_SIM_GAUSSIAN, .fwhm_fs = 20,
                                     .peak_gw_per_cm2 = 1e-3};
    dk_sim_options so = {.samples = 2048};
    dk_sim_result *r = NULL;
    assert_int_equal(dk_sim_run(&p, &so, &r, NULL), DK_OK);
    const dk_sim_wave_out *wi = &r->wave[1], *wp = &r->wave[2];
    double smax = 0, rmax = 0;
    for (size_t i = 0; i < r->samples; i++)
        smax = fmax(smax, wi->spectrum_in_j_per_cm2_thz[i]);
    double *ratio = malloc(r->samples * sizeof *ratio);
    for (size_t i = 0; i < r->samples; i++) {
        ratio[i] = NAN;
        if (wi->spectrum_in_j_per_cm2_thz[i] < 1e-4 * smax)
            continue;
        ratio[i] = wp->spectrum_out_j_per_cm2_thz[i] /
                   wi->spectrum_in_j_per_cm2_thz[i];
        rmax = fmax(rmax, ratio[i]);
    }
    double nu_i = 299.792458 / d.waves.idler_um;
    int bins = 0, below = 0;
    for (size_t i = 0; i < r->samples; i++) {
        if (isnan(ratio[i]))
            continue;
        double delta = wi->frequency_thz[i] - nu_i;
        double dk = dk_design_pair_delta_k(&d, DK_PAIR_PUMP_IDLER, delta);
        double s2 = dk_sinc2(dk, 1e3);
        assert_within(ratio[i] / rmax, s2, 0, 1e-2);
        bins++;
        below += s2 < 0.5;
    }
    assert_true(bins > 50);
    assert_true(below > 5);   /* the band reaches beyond the half points */
    free(ratio);
    dk_sim_result_free(r);
}

/* The gain-bandwidth estimate follows the regime: at ΓL = 0.3 the sinc²
 * width (the high-gain formula would be 3× too narrow), at ΓL = 6.5 the
 * high-gain one; each within the GVD correction of the exact width. */
static void
gain_regime(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 1);
    dk_opa_result r;
    assert_int_equal(dk_design_opa(&d, 1, &r, NULL), DK_OK);
    assert_true(r.gamma_per_mm * d.length_mm < DK_GAIN_REGIME_GL);
    assert_false(r.high_gain);
    assert_within(r.estimate_thz, r.low_gain_thz, 0, 0);
    assert_true(r.have_band);
    assert_within(r.estimate_thz, r.band_thz, 0.3, 0);
    assert_true(r.first_order_thz < 0.5 * r.band_thz);
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 3);
    assert_int_equal(dk_design_opa(&d, 50, &r, NULL), DK_OK);
    assert_true(r.high_gain);
    assert_within(r.estimate_thz, r.first_order_thz, 0, 0);
    assert_within(r.estimate_thz, r.band_thz, 0.15, 0);
    /* The crossover: the two Δk widths agree at ΓL = u½²/ln2. */
    assert_within(DK_GAIN_REGIME_GL,
                  DK_SINC2_HALF_U * DK_SINC2_HALF_U / M_LN2, 1e-4, 0);
}

/* The low-conversion output spectrum (deltak/broadband.h: the closed
 * form of the undepleted coupled-wave equations, summed over input
 * pairs) against the full simulation of the same weak inputs (split-step
 * propagation): DFG to the mid-infrared in GaSe (collinear) and in a
 * noncollinear BBO design, and SHG of a short pulse in BBO. Fluence to
 * 1 %, spectrum shape to 1 % of its peak. */
static void
low_conversion_vs_simulation(void **state)
{
    (void)state;
    const struct {
        const char *crystal, *pol;
        dk_waves w;
        int shg;
        double len_mm, alpha_deg;
        double fwhm[3];   /* signal, idler, pump inputs; 0 dark */
    } cases[] = {
        {"GaSe", "ooe", {.pump_um = 1.65, .signal_um = 2.74}, 0, 0.5, 0,
         {70, 0, 60}},
        {"BBO", "ooe", {.pump_um = 0.8, .signal_um = 1.3}, 0, 1, 2.5,
         {0, 80, 60}},
        {"BBO", "ooe", {.signal_um = 1.03}, 1, 1, 0, {25, 0, 0}},
    };
    for (size_t c = 0; c < sizeof cases / sizeof cases[0]; c++) {
        dk_design_request rq;
        dk_design_request_init(&rq);
        rq.crystal = dk_db_find(db, cases[c].crystal);
        dk_waves w = cases[c].w;
        if (cases[c].shg)
            w = dk_waves_shg(w.signal_um);
        else
            w.idler_um = 1 / (1 / w.pump_um - 1 / w.signal_um);
        rq.waves = w;
        rq.shg = cases[c].shg;
        rq.pol = cases[c].pol;
        rq.scheme = DK_SCHEME_ANGLE;
        rq.length_mm = cases[c].len_mm;
        rq.alpha_rad = cases[c].alpha_deg * M_PI / 180;
        dk_design d;
        assert_int_equal(dk_design_resolve(&rq, &d, NULL), DK_OK);
        dk_design_wave_k wk[3];
        dk_sim_problem p;
        assert_int_equal(dk_design_sim_problem(&d, wk, &p, NULL, NULL),
                         DK_OK);
        for (int j = 0; j < 3; j++)
            if (cases[c].fwhm[j] > 0)
                p.wave[j].input = (dk_sim_pulse){.shape = DK_SIM_GAUSSIAN,
                                                 .fwhm_fs = cases[c].fwhm[j],
                                                 .peak_gw_per_cm2 = 1e-3};
        dk_sim_options so = {.samples = 1024};
        dk_mix_result *m = NULL;
        assert_int_equal(dk_mix_spectrum(&p, &so, DK_MIX_AUTO, &m, NULL),
                         DK_OK);
        dk_sim_result *r = NULL;
        assert_int_equal(dk_sim_run(&p, &so, &r, NULL), DK_OK);
        int g = m->generated;
        assert_true(m->photon_fraction < 1e-3);
        assert_within(m->fluence_j_per_cm2[g],
                      r->wave[g].fluence_out_j_per_cm2, 0.01, 0);
        double pk = 0;
        for (size_t k = 0; k < m->n; k++)
            pk = fmax(pk, m->spectrum_out[g][k]);
        /* the simulation's bins ascend in frequency too */
        for (size_t k = 0; k < m->n; k++) {
            assert_within(m->frequency_thz[g][k], r->wave[g].frequency_thz[k],
                          1e-9, 0);
            assert_within(m->spectrum_out[g][k] / pk,
                          r->wave[g].spectrum_out_j_per_cm2_thz[k] / pk, 0,
                          1e-2);
        }
        /* the transform limit of the same spectrum */
        assert_within(m->transform_limit_fs, r->wave[g].transform_limit_out_fs,
                      0.03, 0);
        dk_mix_result_free(m);
        dk_sim_result_free(r);
    }
    /* Inputs that do not fit the process. */
    dk_design d;
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 1);
    dk_design_wave_k wk[3];
    dk_sim_problem p;
    assert_int_equal(dk_design_sim_problem(&d, wk, &p, NULL, NULL), DK_OK);
    p.wave[2].input = (dk_sim_pulse){.shape = DK_SIM_GAUSSIAN, .fwhm_fs = 50,
                                     .peak_gw_per_cm2 = 1};
    dk_mix_result *m = NULL;
    assert_int_equal(dk_mix_spectrum(&p, NULL, DK_MIX_DFG, &m, NULL),
                     DK_EINVAL);
    assert_int_equal(dk_mix_spectrum(&p, NULL, DK_MIX_SFG, &m, NULL),
                     DK_EINVAL);
}

/* OPA with a narrowband pump: the largest gain over the seed's band is
 * the plane-wave gain of deltak/gain_spectrum.h at phase matching, and
 * the idler carries (G − 1) times the seed's photons (Manley–Rowe). */
static void
opa_gain_spectrum(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 2);
    dk_design_wave_k wk[3];
    dk_sim_problem p;
    assert_int_equal(dk_design_sim_problem(&d, wk, &p, NULL, NULL), DK_OK);
    const double ip = 20;
    p.wave[2].input = (dk_sim_pulse){.shape = DK_SIM_CW,
                                     .peak_gw_per_cm2 = ip};
    p.wave[0].input = (dk_sim_pulse){.shape = DK_SIM_GAUSSIAN, .fwhm_fs = 100,
                                     .peak_gw_per_cm2 = 1e-6};
    dk_mix_result *m = NULL;
    dk_sim_options so = {.samples = 1024};
    assert_int_equal(dk_mix_spectrum(&p, &so, DK_MIX_OPA, &m, NULL), DK_OK);
    dk_opa_result o;
    assert_int_equal(dk_design_opa(&d, ip, &o, NULL), DK_OK);
    assert_within(m->gain_peak, o.gain, 0.01, 0);
    double ph_s = 0, ph_i = 0, ph_in = 0;
    for (size_t k = 0; k < m->n; k++) {
        ph_s += m->spectrum_out[0][k] / m->frequency_thz[0][k];
        ph_in += m->spectrum_in[0][k] / m->frequency_thz[0][k];
        ph_i += m->spectrum_out[1][k] / m->frequency_thz[1][k];
    }
    assert_within(ph_s - ph_in, ph_i, 1e-6, 0);
    dk_mix_result_free(m);
}

/* Range flags of simulated bands: MgO:LN Gayer2008 is fitted over
 * 0.5-4 um (crystal file), so an idler band reaching 4.5 um is flagged as
 * the idler and noted; a signal band inside is not. */
static void
simulated_band_flags(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "MgO:LN", "Gayer2008", opa(1.064, 1.5497), 0, 40, NULL,
                DK_SCHEME_QPM, 10);
    dk_sim_result r;
    memset(&r, 0, sizeof r);
    r.wave[0].present = 1;
    r.wave[0].band_um[0] = 1.50, r.wave[0].band_um[1] = 1.60;
    r.wave[1].present = 1;
    r.wave[1].band_um[0] = 3.0, r.wave[1].band_um[1] = 4.5;
    r.wave[2].present = 0;
    dk_notes n;
    dk_notes_clear(&n);
    unsigned f = dk_design_sim_band_flags(&d, &r, &n);
    assert_int_equal(f & (DK_RANGE_SIGNAL | DK_RANGE_IDLER | DK_RANGE_PUMP),
                     DK_RANGE_IDLER);
    assert_true(n.n >= 1);
    /* both bands inside: no flag, no note */
    r.wave[1].band_um[1] = 3.9;
    dk_notes_clear(&n);
    f = dk_design_sim_band_flags(&d, &r, &n);
    assert_int_equal(f & (DK_RANGE_SIGNAL | DK_RANGE_IDLER | DK_RANGE_PUMP),
                     0);
    assert_int_equal(n.n, 0);
}

/* The pulse's limit over the pairs is the shortest of the pairs' longest
 * crystals, with that pair; the merit is (d_eff L)^2 / (n_s n_i n_p). */
static void
pulse_limit_over_pairs(void **state)
{
    (void)state;
    dk_design d;
    test_design(&d, "BBO", NULL, opa(0.8, 1.3), 0, NAN, "ooe",
                DK_SCHEME_ANGLE, 2);
    double L = 0, shortest = INFINITY;
    int pair = -2, want = -1;
    assert_int_equal(dk_design_pulse_limit(&d, 30, DK_SHAPE_GAUSSIAN, &L,
                                           &pair, NULL),
                     DK_OK);
    for (int q = 0; q < DK_NPAIRS; q++) {
        double Lq;
        assert_int_equal(dk_design_longest_crystal(&d, (dk_pair)q, 30,
                                                   DK_SHAPE_GAUSSIAN, &Lq,
                                                   NULL),
                         DK_OK);
        if (Lq < shortest)
            shortest = Lq, want = q;
    }
    assert_true(L == shortest);
    assert_int_equal(pair, want);
    const double n[3] = {1.5, 2.0, 2.5};
    assert_within(dk_low_conversion_merit(3.0, 2.0, n), 36.0 / 7.5, 0,
                  1e-15);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(transform_limits),
        cmocka_unit_test(lobes),
        cmocka_unit_test(liio3_broad),
        cmocka_unit_test(pair_first_order),
        cmocka_unit_test(longest_crystal),
        cmocka_unit_test(dispersed),
        cmocka_unit_test(shg_plane_wave),
        cmocka_unit_test(sfg_spectrum_pair),
        cmocka_unit_test(gain_regime),
        cmocka_unit_test(low_conversion_vs_simulation),
        cmocka_unit_test(opa_gain_spectrum),
        cmocka_unit_test(simulated_band_flags),
        cmocka_unit_test(pulse_limit_over_pairs),
    };
    return cmocka_run_group_tests(tests, db_setup, db_teardown);
}
