/*
 * test_gain.c - conversion efficiency and parametric gain
 * (deltak/gain.h: src/analyses/gain_parametric.c, src/analyses/gain_focus.c,
 * src/analyses/gain_depletion.c).
 *
 * Sources of the expected values, named beside each check:
 *   - Boyd & Kleinman, J. Appl. Phys. 39, 3597 (1968) (BK 1968);
 *   - closed forms and limits derived in the comments here (the
 *     derivation is given, so it can be checked by hand);
 *   - "independent scipy computation, this project": Python scripts run
 *     once with /usr/bin/python3 (scipy 1.10, mpmath 1.2) that evaluate the
 *     same physics by a different route — the Boyd–Kleinman double
 *     integral by scipy.integrate.dblquad, h at σ-large by mpmath, the
 *     coupled field equations in SI units (scipy.constants, solve_ivp
 *     DOP853) rather than the closed-form formulas;
 *   - cross-checks between the three modules (depletion in the
 *     undepleted limit against the plane-wave formulas).
 */
#include "testutil.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <gsl/gsl_sf_elljac.h>

#include "deltak/gain.h"

/* sinc²(x) = 1/2 at x = 1.3915573782515103 (independent scipy
 * computation, this project; the usual 1.39156, common practice). */
#define SINC2_HALF 1.3915573782515103

/* ------------------------------------------------------------------ */
/* Plane waves, undepleted pump                                        */
/* ------------------------------------------------------------------ */

/* A BBO-like OPA (indices and d_eff invented, round): pump 532 nm,
 * signal 800 nm, idler 1/(1/0.532 − 1/0.8) µm, d_eff 2 pm/V,
 * n_p, n_s, n_i = 1.67, 1.66, 1.65, 50 GW/cm². */
#define OPA_D 2.0
#define OPA_NP 1.67
#define OPA_NS 1.66
#define OPA_NI 1.65
#define OPA_LS 0.8
#define OPA_LP 0.532
#define OPA_IP 50.0

static double
opa_idler_um(void)
{
    return 1 / (1 / OPA_LP - 1 / OPA_LS);
}

static double
opa_gamma(double pump_gw_per_cm2)
{
    double g;
    dk_error err = {0};
    if (dk_opa_gamma_per_mm(OPA_D, OPA_NP, OPA_NS, OPA_NI, OPA_LS,
                            opa_idler_um(), pump_gw_per_cm2, &g, &err))
        fail_msg("%s", err.msg);
    return g;
}

static void
opa_coupling(void **state)
{
    (void)state;
    /* Independent scipy computation, this project: Γ² = κs κi |A_p|²
     * from the field equations with ω, not λ (SI, scipy.constants):
     * 3.19957643689 /mm. */
    assert_within(opa_gamma(OPA_IP), 3.19957643689, 1e-10, 0);
    /* Γ ∝ d_eff √I_p (the formula; Cerullo & De Silvestri 2003). */
    assert_within(opa_gamma(4 * OPA_IP), 2 * opa_gamma(OPA_IP), 1e-14, 0);
    double g;
    assert_int_equal(dk_opa_gamma_per_mm(-2 * OPA_D, OPA_NP, OPA_NS, OPA_NI,
                                         OPA_LS, opa_idler_um(), OPA_IP, &g,
                                         NULL),
                     DK_OK);
    assert_within(g, 2 * opa_gamma(OPA_IP), 1e-14, 0);
    assert_within(opa_gamma(0), 0, 0, 0);

    static const struct {
        double d, np, ns, ni, ls, li, ip;
    } bad[] = {
        {NAN, 1.6, 1.6, 1.6, 0.8, 1.6, 1},
        {2, 0, 1.6, 1.6, 0.8, 1.6, 1},
        {2, 1.6, -1, 1.6, 0.8, 1.6, 1},
        {2, 1.6, 1.6, 1.6, 0, 1.6, 1},
        {2, 1.6, 1.6, 1.6, 0.8, INFINITY, 1},
        {2, 1.6, 1.6, 1.6, 0.8, 1.6, -1},
        {2, 1.6, 1.6, 1.6, 0.8, 1.6, NAN},
    };
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        dk_error err = {0};
        assert_int_equal(dk_opa_gamma_per_mm(bad[i].d, bad[i].np, bad[i].ns,
                                             bad[i].ni, bad[i].ls, bad[i].li,
                                             bad[i].ip, &g, &err),
                         DK_EINVAL);
        assert_true(err.msg[0] != 0);
    }
}

static double
gain(double gamma, double dk, double len)
{
    double g;
    dk_error err = {0};
    if (dk_opa_signal_gain(gamma, dk, len, &g, &err))
        fail_msg("%s", err.msg);
    return g;
}

static void
opa_signal_gain(void **state)
{
    (void)state;
    /* Independent scipy computation, this project: the undepleted-pump
     * field equations for A_s, A_i integrated in SI (solve_ivp DOP853,
     * rtol 1e-12) for the OPA above, L = 2 mm. The three cases cover
     * g² > 0 (Δk = 0, 3 rad/mm) and g² < 0 (Δk = 10 rad/mm). */
    static const struct {
        double dk, g;
    } cases[] = {
        {0, 90401.5703478},
        {3, 26020.0331065},
        {-3, 26020.0331065}, /* only Δk² enters */
        {10, 1.67371661277},
    };
    double gam = opa_gamma(OPA_IP);
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
        assert_within(gain(gam, cases[i].dk, 2), cases[i].g, 1e-9, 0);

    /* Δk = 0: G = 1 + sinh² = cosh²(ΓL) (Boyd §2.9, from memory). */
    assert_within(gain(1.7, 0, 3), pow(cosh(5.1), 2), 1e-13, 0);
    /* g = 0 exactly (Δk = 2Γ): G = 1 + Γ²L², and continuous across it
     * from both sides (the analytic continuation). */
    assert_within(gain(1.5, 3, 2), 1 + 9, 1e-15, 0);
    assert_within(gain(1.5, 3 * (1 + 1e-9), 2), 10, 1e-8, 0);
    assert_within(gain(1.5, 3 * (1 - 1e-9), 2), 10, 1e-8, 0);
    /* Low gain: G − 1 → Γ²L² sinc²(ΔkL/2), the DFG limit; the relative
     * correction is of order Γ²/(Δk/2)² = 1e-6 here. */
    double x = 2.0 * 4 / 2;
    assert_within(gain(1e-3, 2, 4) - 1, 1e-6 * 16 * pow(sin(x) / x, 2),
                  1e-5, 0);
    /* No pump or no crystal: no gain. */
    assert_within(gain(0, 5, 4), 1, 0, 0);
    assert_within(gain(3, 5, 0), 1, 0, 0);

    double g;
    dk_error err = {0};
    assert_int_equal(dk_opa_signal_gain(-1, 0, 1, &g, &err), DK_EINVAL);
    assert_int_equal(dk_opa_signal_gain(1, NAN, 1, &g, &err), DK_EINVAL);
    assert_int_equal(dk_opa_signal_gain(1, 0, -1, &g, &err), DK_EINVAL);
    assert_int_equal(dk_opa_signal_gain(400, 0, 1, &g, &err), DK_EDOM);
    assert_non_null(strstr(err.msg, "overflows"));
}

static double
dk_fwhm(double gamma, double len)
{
    double w;
    dk_error err = {0};
    if (dk_opa_dk_fwhm_rad_per_mm(gamma, len, &w, &err))
        fail_msg("%s", err.msg);
    return w;
}

static void
opa_bandwidth(void **state)
{
    (void)state;
    /* Low gain: the sinc² width, FWHM in Δk = 4 · 1.39156 / L (common
     * practice; SINC2_HALF above). */
    assert_within(dk_fwhm(0, 2.5), 4 * SINC2_HALF / 2.5, 1e-12, 0);
    assert_within(dk_fwhm(1e-4, 2.5), 4 * SINC2_HALF / 2.5, 1e-8, 0);
    /* Independent scipy computation, this project: half-height of
     * Γ² (sinh(gL)/g)² by brentq, L = 1 mm, ΓL as listed. */
    static const struct {
        double gl, fwhm_l;
    } cases[] = {
        {1, 5.75476797299},  {5, 8.18812572932},  {10, 11.0052206865},
        {20, 15.2139153439}, {40, 21.2842425934},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
        assert_within(dk_fwhm(cases[i].gl / 3, 3) * 3, cases[i].fwhm_l, 1e-9,
                      0);

    /* The estimate Δν = (2√ln2/π)(Γ/L)^½/|δ| (Cerullo & De Silvestri
     * 2003). Converted back to a Δk width (Δk = 2π δ Δν) it must approach
     * the exact width at high gain, the error shrinking like 1/ΓL
     * (4.5 % at ΓL = 10, 1.05 % at ΓL = 40 by the independent scipy
     * computation above). */
    const double gvm_fs_per_mm = 125;
    double prev = INFINITY;
    for (double gl = 10; gl <= 40; gl *= 2) {
        double gam = gl / 2, len = 2, nu_thz;
        assert_int_equal(dk_opa_bandwidth_thz(gam, len, gvm_fs_per_mm,
                                              &nu_thz, NULL),
                         DK_OK);
        double dk_est = 2 * M_PI * gvm_fs_per_mm * nu_thz * 1e-3;
        double rel = dk_fwhm(gam, len) / dk_est - 1;
        assert_true(rel > 0 && rel < 0.46 / gl && rel < prev);
        prev = rel;
    }
    /* The same estimate is symmetric in the sign of the GVM, and a
     * worked number: Γ = 10 /mm, L = 1 mm, |δ| = 100 fs/mm gives
     * 1000·(2√ln2/π)·√10/100 = 16.7607 THz (hand arithmetic). */
    double a, b;
    assert_int_equal(dk_opa_bandwidth_thz(10, 1, 100, &a, NULL), DK_OK);
    assert_int_equal(dk_opa_bandwidth_thz(10, 1, -100, &b, NULL), DK_OK);
    assert_within(a, b, 0, 0);
    assert_within(a, 16.7607, 0, 1e-4);

    dk_error err = {0};
    assert_int_equal(dk_opa_bandwidth_thz(10, 1, 0, &a, &err), DK_EDOM);
    assert_non_null(strstr(err.msg, "group velocities are matched"));
    assert_int_equal(dk_opa_bandwidth_thz(0, 1, 10, &a, &err), DK_EINVAL);
    assert_int_equal(dk_opa_bandwidth_thz(1, 0, 10, &a, &err), DK_EINVAL);
    assert_int_equal(dk_opa_bandwidth_thz(1, 1, NAN, &a, &err), DK_EINVAL);
    assert_int_equal(dk_opa_dk_fwhm_rad_per_mm(-1, 1, &a, &err), DK_EINVAL);
    assert_int_equal(dk_opa_dk_fwhm_rad_per_mm(1, 0, &a, &err), DK_EINVAL);
    assert_int_equal(dk_opa_dk_fwhm_rad_per_mm(400, 1, &a, &err), DK_EDOM);
}

/* A PPLN-like SHG case (indices typed from memory, rounded; d_eff
 * 14 pm/V invented): 1064 nm, n_ω 2.156, n_2ω 2.234, L = 10 mm. */
#define SHG_D 14.0
#define SHG_NW 2.156
#define SHG_N2W 2.234
#define SHG_L 1.064
#define SHG_LEN 10.0

static double
shg_eta(double i_gw_per_cm2, double len, double dk)
{
    double eta;
    dk_error err = {0};
    if (dk_shg_efficiency(SHG_D, SHG_NW, SHG_N2W, SHG_L, len, i_gw_per_cm2,
                          dk, &eta, &err))
        fail_msg("%s", err.msg);
    return eta;
}

static void
shg_low_conversion(void **state)
{
    (void)state;
    /* Independent scipy computation, this project: 8π²d²L²I/(ε0 c n²
     * n_2ω λ²) with scipy.constants at 0.5 MW/cm²: 0.247960462385; and
     * the full SI degenerate SHG field equations integrated at
     * 1e-9 GW/cm², Δk = 0.3 rad/mm: 2.19306340129e-07 (the formula
     * differs from it by 4e-7, the depletion at η = 2e-7). */
    assert_within(shg_eta(5e-4, SHG_LEN, 0), 0.247960462385, 1e-11, 0);
    assert_within(shg_eta(1e-9, SHG_LEN, 0.3), 2.19306340129e-07, 1e-6, 0);
    /* η ∝ L² I sinc²(ΔkL/2) (Fejer et al. 1992): zero at ΔkL = 2π,
     * half at ΔkL/2 = 1.39156. */
    assert_within(shg_eta(1e-3, 2 * SHG_LEN, 0), 8 * shg_eta(5e-4, SHG_LEN, 0),
                  1e-14, 0);
    assert_within(shg_eta(1e-3, SHG_LEN, 2 * M_PI / SHG_LEN), 0, 0, 1e-30);
    assert_within(shg_eta(1e-3, SHG_LEN, 2 * SINC2_HALF / SHG_LEN),
                  shg_eta(1e-3, SHG_LEN, 0) / 2, 1e-14, 0);

    /* SFG of two halves of one beam is SHG (the degenerate case):
     * I_a = I_b = I/2 and λ_out = λ/2 give the same output. */
    double out;
    assert_int_equal(dk_mixing_intensity_gw_per_cm2(
                         SHG_D, SHG_NW, SHG_NW, SHG_N2W, SHG_L / 2, SHG_LEN,
                         5e-4 / 2, 5e-4 / 2, 0.2, &out, NULL),
                     DK_OK);
    assert_within(out, 5e-4 * shg_eta(5e-4, SHG_LEN, 0.2), 1e-14, 0);

    double eta;
    dk_error err = {0};
    assert_int_equal(dk_shg_efficiency(NAN, 2, 2, 1, 1, 1, 0, &eta, &err),
                     DK_EINVAL);
    assert_int_equal(dk_shg_efficiency(1, 0, 2, 1, 1, 1, 0, &eta, &err),
                     DK_EINVAL);
    assert_int_equal(dk_shg_efficiency(1, 2, 2, -1, 1, 1, 0, &eta, &err),
                     DK_EINVAL);
    assert_int_equal(dk_shg_efficiency(1, 2, 2, 1, -1, 1, 0, &eta, &err),
                     DK_EINVAL);
    assert_int_equal(dk_shg_efficiency(1, 2, 2, 1, 1, -1, 0, &eta, &err),
                     DK_EINVAL);
    assert_int_equal(dk_shg_efficiency(1, 2, 2, 1, 1, 1, INFINITY, &eta,
                                       &err),
                     DK_EINVAL);
    assert_int_equal(dk_mixing_intensity_gw_per_cm2(1, 2, 2, 2, 1, 1, 1, -1,
                                                    0, &out, &err),
                     DK_EINVAL);
    assert_int_equal(dk_mixing_intensity_gw_per_cm2(1, 2, 2, 2, 0, 1, 1, 1,
                                                    0, &out, &err),
                     DK_EINVAL);
}

/* ------------------------------------------------------------------ */
/* Focused beams: Boyd–Kleinman                                        */
/* ------------------------------------------------------------------ */

static double
bk_h(double sigma, double xi, double b)
{
    double h;
    dk_error err = {0};
    if (dk_bk_h(sigma, xi, b, &h, &err))
        fail_msg("%s", err.msg);
    return h;
}

static void
bk_h_values(void **state)
{
    (void)state;
    /* Independent scipy computation, this project: the double integral
     * of BK 1968 by scipy.integrate.dblquad (epsrel 1e-11). */
    static const struct {
        double sigma, xi, b, h;
    } cases[] = {
        {0.57, 2.84, 0, 1.067702329013}, {0, 1, 0, 0.616850275068},
        {0.5, 1, 1, 0.500093329860},     {0.8, 2, 1, 0.568082663040},
        {0.3, 0.5, 2, 0.232724200405},   {1, 5, 0.5, 0.346276568585},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
        assert_within(bk_h(cases[i].sigma, cases[i].xi, cases[i].b),
                      cases[i].h, 0, 2e-12);

    /* σ = B = 0: ∫_{−ξ}^{ξ} dτ/(1+iτ) = 2 atan ξ, so h = atan²(ξ)/ξ
     * (derived from BK 1968's definition). */
    static const double xis[] = {1e-6, 1e-3, 0.1, 1, 2.84, 10, 100, 1000};
    for (size_t i = 0; i < sizeof xis / sizeof xis[0]; i++)
        assert_within(bk_h(0, xis[i], 0), pow(atan(xis[i]), 2) / xis[i],
                      1e-10, 0);

    /* B = 0 for any σ: h = (1/ξ)[∫_0^ξ (cos στ + τ sin στ)/(1+τ²) dτ]²
     * (the double integral factorises). Independent mpmath computation,
     * this project (30 digits, split at each period). Large σ·ξ takes
     * the oscillatory (QAWO) branch; σ·u_max = 100 exactly the other. */
    static const struct {
        double sigma, xi, h, tol;
    } osc[] = {
        {50, 10, 2.75582015632395e-7, 1e-16},
        {-3, 100, 1.39394521635901e-10, 1e-16},
        {200, 5, 2.92881379252455e-8, 1e-16},
        {0.5, 1000, 0.00363756781231803, 1e-15},
        {5, 10, 2.50295831034976e-7, 1e-16},
        {0, 1000, 0.00246426050866528, 1e-15},
    };
    for (size_t i = 0; i < sizeof osc / sizeof osc[0]; i++)
        assert_within(bk_h(osc[i].sigma, osc[i].xi, 0), osc[i].h, 0,
                      osc[i].tol);
    /* The two quadrature branches agree where they meet (σ·u_max = 100,
     * u_max = 2ξ = 4). */
    assert_within(bk_h(25 * (1 + 1e-12), 2, 0.1), bk_h(25, 2, 0.1), 0,
                  1e-12);

    /* Walk-off only lowers h: B enters as e^{−B²u²/ξ} (BK 1968). */
    double prev = INFINITY;
    for (double b = 0; b <= 8; b = b ? 2 * b : 0.25) {
        double h = bk_h(0.6, 2, b);
        assert_true(h < prev);
        prev = h;
    }

    double h;
    dk_error err = {0};
    assert_int_equal(dk_bk_h(0, 0, 0, &h, &err), DK_EINVAL);
    assert_int_equal(dk_bk_h(0, 1e-7, 0, &h, &err), DK_EINVAL);
    assert_int_equal(dk_bk_h(0, 2e3, 0, &h, &err), DK_EINVAL);
    assert_int_equal(dk_bk_h(NAN, 1, 0, &h, &err), DK_EINVAL);
    assert_int_equal(dk_bk_h(2e4, 1, 0, &h, &err), DK_EINVAL);
    assert_int_equal(dk_bk_h(0, 1, -1, &h, &err), DK_EINVAL);
    assert_int_equal(dk_bk_h(0, 1, 2e3, &h, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "walk-off"));
}

static void
bk_maxima(void **state)
{
    (void)state;
    double h, s, xi;
    dk_error err = {0};
    /* BK 1968 (values as quoted in the project's issue): for B = 0
     * the best focusing is ξ = 2.84 with h = 1.068 at σ = 0.57. */
    assert_int_equal(dk_bk_optimum(0, &xi, &h, &s, &err), DK_OK);
    assert_within(xi, 2.84, 0, 0.005);
    assert_within(h, 1.068, 0, 0.0005);
    assert_within(s, 0.57, 0, 0.005);

    /* Independent scipy computation, this project: quad of the reduced
     * integral (itself equal to dblquad to 1e-12 above) maximised with
     * scipy.optimize.minimize_scalar over σ, then over ln ξ. */
    static const struct {
        double b, xi, h, sigma;
    } opt[] = {
        {0, 2.837519, 1.067724975, 0.573589},
        {0.5, 2.259895, 0.832753765, 0.656969},
        {1, 1.870208, 0.570766180, 0.719745},
        {2, 1.635315, 0.326407986, 0.747144},
        {5, 1.493993, 0.138440771, 0.751953},
        {50, 1.402416, 0.014204677, 0.750364},
    };
    double prev = INFINITY;
    for (size_t i = 0; i < sizeof opt / sizeof opt[0]; i++) {
        assert_int_equal(dk_bk_optimum(opt[i].b, &xi, &h, &s, &err), DK_OK);
        assert_within(xi, opt[i].xi, 0, 2e-5);
        assert_within(h, opt[i].h, 0, 2e-9);
        assert_within(s, opt[i].sigma, 0, 2e-5);
        assert_true(h < prev); /* h_mm falls with B (BK 1968) */
        prev = h;
    }
    /* For B ≫ 1, h ≈ (√π/2) atan(ξ)/(B√ξ) (derived in src/analyses/gain_focus.c),
     * maximal at ξ = 1.3917452, the root of 2ξ/(1+ξ²) = atan ξ, where
     * h·B = 0.7119632 (both by scipy brentq, this project); BK 1968 give
     * the same large-B optimum ξ = 1.392 (from memory). */
    assert_int_equal(dk_bk_optimum(1000, &xi, &h, NULL, &err), DK_OK);
    assert_within(xi, 1.3917452, 0, 1e-3);
    assert_within(h * 1000, 0.7119632, 0.15 / 1000, 0);

    /* h_m(ξ, B) at fixed ξ: independent scipy computation, this project
     * (dblquad maximised over σ). */
    static const struct {
        double xi, b, h, sigma;
    } hm[] = {
        {2.84, 0, 1.067724742499, 0.57331690},
        {1, 1, 0.510149453285, 0.86793054},
        {2, 1, 0.570038731937, 0.70146456},
        /* quad of the reduced integral, σ scan 0.5/ξ, as the code: */
        {10, 0, 0.7197549738, 0.243109},
        {100, 0, 0.1107840721, 0.030402},
    };
    for (size_t i = 0; i < sizeof hm / sizeof hm[0]; i++) {
        assert_int_equal(dk_bk_h_max(hm[i].xi, hm[i].b, &h, &s, &err),
                         DK_OK);
        assert_within(h, hm[i].h, 0, 2e-10);
        assert_within(s, hm[i].sigma, 0, 2e-5);
    }

    /* Weak focusing: h_m → ξ for ξ ≪ 1 (BK 1968, near-field limit); the
     * first correction is −ξ³/3 for B = 0 (independent scipy computation,
     * this project: h_m(1e-3) = 0.000999999666667). */
    assert_int_equal(dk_bk_h_max(1e-3, 0, &h, NULL, &err), DK_OK);
    assert_within(h, 0.000999999666667, 1e-10, 0);
    assert_int_equal(dk_bk_h_max(1e-6, 0, &h, NULL, &err), DK_OK);
    assert_within(h, 1e-6, 1e-11, 0);
    assert_int_equal(dk_bk_h_max(1e-4, 1, &h, NULL, &err), DK_OK);
    assert_within(h, 1e-4, 1e-4, 0); /* B²ξ = 1e-4 ≪ 1 */

    /* Strong walk-off, B ≫ 1: h_m → (√π/2) atan(ξ)/(B√ξ) with a relative
     * error of order 1/B (independent scipy computation, this project:
     * ratio 0.993713 at B = 20, 0.997560 at B = 50, ξ = 1.392). */
    static const struct {
        double b, ratio;
    } big[] = {{20, 0.993713}, {50, 0.997560}};
    for (size_t i = 0; i < 2; i++) {
        double x = 1.392;
        assert_int_equal(dk_bk_h_max(x, big[i].b, &h, NULL, &err), DK_OK);
        double asym = sqrt(M_PI) / 2 * atan(x) / (big[i].b * sqrt(x));
        assert_within(h / asym, big[i].ratio, 0, 2e-6);
        assert_true(fabs(h / asym - 1) < 0.15 / big[i].b);
    }

    assert_int_equal(dk_bk_h_max(0, 0, &h, &s, &err), DK_EINVAL);
    assert_int_equal(dk_bk_h_max(101, 0, &h, &s, &err), DK_EINVAL);
    assert_int_equal(dk_bk_h_max(1, NAN, &h, &s, &err), DK_EINVAL);
    assert_int_equal(dk_bk_optimum(-1, &xi, &h, &s, &err), DK_EINVAL);
}

static void
bk_helpers(void **state)
{
    (void)state;
    double b, xi, bw;
    dk_error err = {0};
    /* b = w0² k1 = 2π n w0²/λ: w0 = 20 µm, n = 2.156, λ = 1.064 µm gives
     * 2π·2.156·400/1.064 µm = 5.09269 mm (hand arithmetic). */
    assert_int_equal(dk_bk_confocal_mm(20, 2.156, 1.064, &b, &err), DK_OK);
    assert_within(b, 2 * M_PI * 2.156 * 400 / 1.064 * 1e-3, 1e-15, 0);
    assert_within(b, 5.09269, 0, 1e-5);
    assert_int_equal(dk_bk_xi(10, 20, 2.156, 1.064, &xi, &err), DK_OK);
    assert_within(xi, 10 / b, 1e-15, 0);
    /* B = ρ(L k1)^½/2 (BK 1968). Its meaning fixes the factor: BK's
     * kernel e^{−B²u²/ξ} with u = 2Δz/b must equal the overlap
     * e^{−ρ²Δz²/w0²} of two harmonic sources walked apart by ρΔz, i.e.
     * B²/ξ = (ρ k1 w0 / 2)² (derived here). */
    double rho = 0.0565, len = 1.5, w0 = 35, n = 1.6551, lam = 1.064;
    assert_int_equal(dk_bk_walkoff_b(rho, len, n, lam, &bw, &err), DK_OK);
    assert_int_equal(dk_bk_xi(len, w0, n, lam, &xi, &err), DK_OK);
    double k1_per_um = 2 * M_PI * n / lam;
    assert_within(bw * bw / xi, pow(rho * k1_per_um * w0 / 2, 2), 1e-13, 0);
    double bneg;
    assert_int_equal(dk_bk_walkoff_b(-rho, len, n, lam, &bneg, &err), DK_OK);
    assert_within(bneg, bw, 0, 0);

    /* Focused SHG in the near field (h = ξ) equals the plane-wave
     * efficiency integrated over the Gaussian profile, i.e. the plane-wave
     * η at intensity P/(πw0²) (derived in deltak/gain.h). */
    double p_w = 2.0, eta_f, len10 = 10;
    assert_int_equal(dk_bk_xi(len10, 200, SHG_NW, SHG_L, &xi, &err), DK_OK);
    assert_int_equal(dk_bk_shg_efficiency(SHG_D, SHG_NW, SHG_N2W, SHG_L,
                                          len10, p_w, xi, &eta_f, &err),
                     DK_OK);
    double i_gw_per_cm2 = p_w / (M_PI * pow(200e-4, 2)) * 1e-9;
    assert_within(eta_f, shg_eta(i_gw_per_cm2, len10, 0), 1e-13, 0);

    assert_int_equal(dk_bk_confocal_mm(0, 2, 1, &b, &err), DK_EINVAL);
    assert_int_equal(dk_bk_confocal_mm(1, NAN, 1, &b, &err), DK_EINVAL);
    assert_int_equal(dk_bk_xi(0, 20, 2, 1, &xi, &err), DK_EINVAL);
    assert_int_equal(dk_bk_xi(1, 20, 2, -1, &xi, &err), DK_EINVAL);
    assert_int_equal(dk_bk_walkoff_b(NAN, 1, 2, 1, &bw, &err), DK_EINVAL);
    assert_int_equal(dk_bk_walkoff_b(0.01, 0, 2, 1, &bw, &err), DK_EINVAL);
    assert_int_equal(dk_bk_shg_efficiency(1, 2, 2, 1, 1, 1, -1, &eta_f, &err),
                     DK_EINVAL);
    assert_int_equal(dk_bk_shg_efficiency(1, 2, 2, 1, 1, -1, 1, &eta_f, &err),
                     DK_EINVAL);
}

/* ------------------------------------------------------------------ */
/* Pump depletion                                                      */
/* ------------------------------------------------------------------ */

static void
run(const dk_twm *m, const double *z, int nz, dk_twm_point *out)
{
    dk_error err = {0};
    if (dk_twm_propagate(m, z, nz, out, &err))
        fail_msg("%s", err.msg);
}

#define NZ 9
static const double zs[NZ] = {0, 0.05, 0.2, 0.5, 1, 1.5, 2, 3, 4};

/* Photon numbers change in step: N1 − N2 and N1 + N3 stay constant
 * (Manley–Rowe; Armstrong et al. 1962), and Σ I_j is constant. */
static void
manley_rowe(void **state)
{
    (void)state;
    static const struct {
        double i[3], phase[3], dk;
    } cases[] = {
        {{0.3, 0.1, 2}, {0.3, -1, 2.5}, 0},   /* all three present */
        {{0.3, 0.1, 2}, {0.3, -1, 2.5}, 4.5}, /* and mismatched */
        {{1, 2, 0}, {0, 0, 0}, 1.5},          /* SFG */
        {{0.01, 0, 3}, {0, 0, 0}, -2},        /* OPA */
    };
    for (size_t c = 0; c < sizeof cases / sizeof cases[0]; c++) {
        dk_twm m = {{{1.55, 2.14, cases[c].i[0], cases[c].phase[0]},
                     {3.2, 2.08, cases[c].i[1], cases[c].phase[1]},
                     {1 / (1 / 1.55 + 1 / 3.2), 2.17, cases[c].i[2],
                      cases[c].phase[2]}},
                    14,
                    cases[c].dk};
        dk_twm_point p[NZ];
        run(&m, zs, NZ, p);
        double n0 = p[0].photon_flux_per_cm2_s[0] +
                    p[0].photon_flux_per_cm2_s[1] +
                    p[0].photon_flux_per_cm2_s[2];
        double e0 = p[0].intensity_gw_per_cm2[0] +
                    p[0].intensity_gw_per_cm2[1] +
                    p[0].intensity_gw_per_cm2[2];
        double moved = 0;
        for (int k = 0; k < NZ; k++) {
            const double *f = p[k].photon_flux_per_cm2_s;
            const double *f0 = p[0].photon_flux_per_cm2_s;
            assert_within((f[0] - f[1]) - (f0[0] - f0[1]), 0, 0, 1e-9 * n0);
            assert_within((f[0] + f[2]) - (f0[0] + f0[2]), 0, 0, 1e-9 * n0);
            const double *in = p[k].intensity_gw_per_cm2;
            assert_within(in[0] + in[1] + in[2], e0, 1e-9, 0);
            moved = fmax(moved, fabs(f[2] - f0[2]) / n0);
        }
        /* ... and the test is not vacuous: light did move. */
        assert_true(moved > 0.01);
    }
}

/* SHG with Δk = 0: I_2ω/I_ω(0) = tanh²(Γ_SH z), Γ_SH² = η_low / L²
 * (Armstrong et al. 1962). */
static void
shg_depletion(void **state)
{
    (void)state;
    dk_twm m;
    dk_error err = {0};
    const double i0 = 5e-4;
    assert_int_equal(dk_twm_shg_init(&m, SHG_L, SHG_NW, SHG_N2W, SHG_D, i0, 0,
                                     &err),
                     DK_OK);
    const double z[] = {0, 1, 2.5, 5, 10, 20, 40};
    dk_twm_point p[7];
    run(&m, z, 7, p);
    double rate = sqrt(shg_eta(i0, 1, 0)); /* 1/mm */
    for (int k = 0; k < 7; k++) {
        assert_within(p[k].intensity_gw_per_cm2[2] / i0,
                      pow(tanh(rate * z[k]), 2), 0, 1e-10);
        /* the fundamental, split in two equal halves, stays split */
        assert_within(p[k].intensity_gw_per_cm2[0],
                      p[k].intensity_gw_per_cm2[1], 1e-12, 0);
    }
    /* Independent scipy computation, this project: the degenerate SHG
     * field equations in SI (not split in two waves) at L = 10 mm:
     * η = 0.212067954747 (Δk = 0), 0.0905268515727 (Δk = 0.3 rad/mm). */
    assert_within(p[4].intensity_gw_per_cm2[2] / i0, 0.212067954747, 1e-9,
                  0);
    m.dk_rad_per_mm = 0.3;
    const double zl[] = {SHG_LEN};
    run(&m, zl, 1, p);
    assert_within(p[0].intensity_gw_per_cm2[2] / i0, 0.0905268515727, 1e-9,
                  0);

    /* Low conversion with Δk ≠ 0: the sinc² of dk_shg_efficiency
     * (cross-check of the two modules), also near the first zero. */
    const double ilow = 1e-12;
    static const double dks[] = {0, 0.1, -0.25, 0.6, 2 * M_PI / SHG_LEN};
    for (size_t i = 0; i < sizeof dks / sizeof dks[0]; i++) {
        assert_int_equal(dk_twm_shg_init(&m, SHG_L, SHG_NW, SHG_N2W, SHG_D,
                                         ilow, dks[i], &err),
                         DK_OK);
        run(&m, zl, 1, p);
        double eta = shg_eta(ilow, SHG_LEN, dks[i]);
        assert_within(p[0].intensity_gw_per_cm2[2] / ilow, eta, 1e-6,
                      1e-6 * shg_eta(ilow, SHG_LEN, 0));
    }

    assert_int_equal(dk_twm_shg_init(&m, 0, 2, 2, 1, 1, 0, &err), DK_EINVAL);
    assert_int_equal(dk_twm_shg_init(&m, 1, 2, 2, NAN, 1, 0, &err),
                     DK_EINVAL);
    assert_int_equal(dk_twm_shg_init(&m, 1, 2, 2, 1, -1, 0, &err), DK_EINVAL);
    assert_int_equal(dk_twm_shg_init(&m, 1, 2, 2, 1, 1, NAN, &err),
                     DK_EINVAL);
}

static void
elljac(double u, double mpar, double *sn, double *cn, double *dn)
{
    if (gsl_sf_elljac_e(u, mpar, sn, cn, dn) != GSL_SUCCESS)
        fail_msg("gsl_sf_elljac_e(%g, %g) failed", u, mpar);
}

/*
 * Δk = 0, general three-wave case: the Jacobi elliptic solutions
 * (Armstrong et al. 1962; the forms below derived here). In photon
 * units the equations give, with the phases locked as they are when one
 * wave starts at zero, (dN/dz)² = 4K² N1 N2 N3 and the Manley–Rowe
 * integrals; K²N_j is the Γ² of dk_opa_gamma_per_mm with wave j as the
 * "pump" (shown in src/analyses/gain_depletion.c).
 *
 * SFG, N3(0) = 0, m1 = N1(0) ≤ m2 = N2(0): N3 = m1 − N1 and
 *   N3(z) = m1 sn²(K √m2 z | m1/m2)
 * (check: d/dz of m1 sn² squared is 4K² m1² m2 sn² cn² dn², and
 * 4K²(m1 − N3)(m2 − N3)N3 is the same since dn² = 1 − (m1/m2) sn²).
 *
 * OPA, seed n1 = N1(0), N2(0) = 0, pump m3 = N3(0); p = N2 = N1 − n1:
 * (dp/dz)² = 4K²(n1 + p) p (m3 − p), solved by p = m3 sn²(K√n1 z | −m3/n1);
 * the negative parameter is removed by sn(u|−μ) = sd(u√(1+μ) | μ/(1+μ)) /
 * √(1+μ) (Abramowitz & Stegun 16.10.2), giving
 *   p(z) = m3 n1/(n1 + m3) sd²(K √(n1 + m3) z | m3/(n1 + m3)),
 * which → n1 sinh²(Γz) when m3 ≫ n1, the small-signal gain.
 */
static void
elliptic_solutions(void **state)
{
    (void)state;
    dk_error err = {0};
    /* SFG 1.55 µm (weak) + 1.064 µm (strong, 1 GW/cm²), m1/m2 = 0.3;
     * indices invented, round. */
    const double l1 = 1.55, l2 = 1.064, l3 = 1 / (1 / l1 + 1 / l2);
    const double i2 = 1, i1 = 0.3 * i2 * l2 / l1; /* N ∝ I λ */
    dk_twm m = {{{l1, 2.14, i1, 0.4}, {l2, 2.16, i2, -1.1}, {l3, 2.2, 0, 0}},
                14,
                0};
    const double z[] = {0, 0.1, 0.25, 0.5, 0.8, 1.2, 1.6, 2, 3};
    const int nz = sizeof z / sizeof z[0];
    dk_twm_point p[sizeof z / sizeof z[0]];
    run(&m, z, nz, p);
    double k_sqrt_m2;
    assert_int_equal(dk_opa_gamma_per_mm(14, 2.16, 2.14, 2.2, l1, l3, i2,
                                         &k_sqrt_m2, &err),
                     DK_OK);
    double m1 = p[0].photon_flux_per_cm2_s[0];
    double m2 = p[0].photon_flux_per_cm2_s[1];
    assert_within(m1 / m2, 0.3, 1e-12, 0);
    int past_peak = 0;
    for (int k = 0; k < nz; k++) {
        double sn, cn, dn;
        elljac(k_sqrt_m2 * z[k], m1 / m2, &sn, &cn, &dn);
        assert_within(p[k].photon_flux_per_cm2_s[2] / m1, sn * sn, 0, 1e-9);
        past_peak += cn < 0;
    }
    assert_true(past_peak > 0); /* the run goes through full conversion */
    /* The generated wave takes the phase φ1 + φ2 + π/2 (from
     * dA3/dz = i(...)A1A2 with Δk = 0). */
    double ph = p[1].phase_rad[2] - (0.4 - 1.1 + M_PI / 2);
    assert_within(remainder(ph, 2 * M_PI), 0, 0, 1e-9);

    /* OPA: the BBO-like amplifier of the first tests with a 5 % seed. */
    const double ii = opa_idler_um();
    const double is = 0.05 * OPA_IP * OPA_LP / OPA_LS;
    dk_twm o = {{{OPA_LS, OPA_NS, is, 0},
                 {ii, OPA_NI, 0, 0},
                 {OPA_LP, OPA_NP, OPA_IP, 0}},
                OPA_D,
                0};
    const double zo[] = {0, 0.1, 0.3, 0.6, 0.9, 1.2, 1.8, 2.5};
    const int no = sizeof zo / sizeof zo[0];
    dk_twm_point q[sizeof zo / sizeof zo[0]];
    run(&o, zo, no, q);
    double n1 = q[0].photon_flux_per_cm2_s[0];
    double m3 = q[0].photon_flux_per_cm2_s[2];
    assert_within(n1 / m3, 0.05, 1e-12, 0);
    double rate = opa_gamma(OPA_IP) * sqrt(1 + n1 / m3); /* K√(n1 + m3) */
    double mu = m3 / (n1 + m3);
    int turned = 0;
    for (int k = 0; k < no; k++) {
        double sn, cn, dn;
        elljac(rate * zo[k], mu, &sn, &cn, &dn);
        double pp = m3 * n1 / (n1 + m3) * pow(sn / dn, 2);
        assert_within(q[k].photon_flux_per_cm2_s[1] / m3, pp / m3, 0, 1e-9);
        assert_within(q[k].photon_flux_per_cm2_s[0] / n1, 1 + pp / n1, 1e-8,
                      0);
        turned += cn < 0;
    }
    assert_true(turned > 0); /* past the point of full pump depletion */
}

/* The undepleted limits reproduce the plane-wave formulas. */
static void
undepleted_limits(void **state)
{
    (void)state;
    /* OPA with a seed 1e-12 of the pump: G of dk_opa_signal_gain for
     * g² > 0 and g² < 0, and idler photons = (G − 1) × seed photons. */
    const double ii = opa_idler_um();
    const double zl[] = {1.5};
    static const double dks[] = {0, 3, -4.5, 10};
    for (size_t i = 0; i < sizeof dks / sizeof dks[0]; i++) {
        dk_twm o = {{{OPA_LS, OPA_NS, 1e-12 * OPA_IP, 0.7},
                     {ii, OPA_NI, 0, 0},
                     {OPA_LP, OPA_NP, OPA_IP, -0.2}},
                    OPA_D,
                    dks[i]};
        dk_twm_point p[1];
        run(&o, zl, 1, p);
        double g = gain(opa_gamma(OPA_IP), dks[i], zl[0]);
        double seed = 1e-12 * OPA_IP;
        assert_within(p[0].intensity_gw_per_cm2[0] / seed, g, 1e-6, 0);
        assert_within(p[0].intensity_gw_per_cm2[1] * ii /
                          (seed * OPA_LS), /* photons: I λ */
                      g - 1, 1e-6, 0);
    }
    /* Weak SFG and DFG: dk_mixing_intensity_gw_per_cm2. */
    const double l1 = 1.55, l2 = 3.2, l3 = 1 / (1 / l1 + 1 / l2);
    const double n1 = 2.14, n2 = 2.08, n3 = 2.17, d = 14, len = 3;
    static const double dkm[] = {0, 0.8, -2.2};
    for (size_t i = 0; i < sizeof dkm / sizeof dkm[0]; i++) {
        double want;
        dk_twm_point p[1];
        const double zz[] = {len};
        /* SFG: 1 and 2 in, 3 out. */
        dk_twm s = {{{l1, n1, 2e-10, 0}, {l2, n2, 1e-10, 0}, {l3, n3, 0, 0}},
                    d,
                    dkm[i]};
        run(&s, zz, 1, p);
        assert_int_equal(dk_mixing_intensity_gw_per_cm2(d, n1, n2, n3, l3,
                                                        len, 2e-10, 1e-10,
                                                        dkm[i], &want, NULL),
                         DK_OK);
        assert_within(p[0].intensity_gw_per_cm2[2], want, 1e-6, 0);
        /* DFG: pump 3 and signal 1 in, idler 2 out. */
        dk_twm f = {{{l1, n1, 1e-10, 0}, {l2, n2, 0, 0}, {l3, n3, 3e-10, 0}},
                    d,
                    dkm[i]};
        run(&f, zz, 1, p);
        assert_int_equal(dk_mixing_intensity_gw_per_cm2(d, n3, n1, n2, l2,
                                                        len, 3e-10, 1e-10,
                                                        dkm[i], &want, NULL),
                         DK_OK);
        assert_within(p[0].intensity_gw_per_cm2[1], want, 1e-6, 0);
    }
}

static void
depletion_edges_and_errors(void **state)
{
    (void)state;
    dk_twm_point p[NZ];
    dk_error err = {0};
    const double l3 = 1 / (1 / 1.55 + 1 / 3.2);
    /* No light, or no nonlinearity: nothing changes, no NaN. */
    dk_twm dark = {{{1.55, 2, 0, 0}, {3.2, 2, 0, 0}, {l3, 2, 0, 0}}, 14, 1};
    run(&dark, zs, NZ, p);
    for (int k = 0; k < NZ; k++)
        for (int j = 0; j < 3; j++)
            assert_within(p[k].intensity_gw_per_cm2[j], 0, 0, 0);
    dk_twm lin = {{{1.55, 2, 1, 0}, {3.2, 2, 0, 0}, {l3, 2, 2, 0}}, 0, 1};
    run(&lin, zs, NZ, p);
    assert_within(p[NZ - 1].intensity_gw_per_cm2[0], 1, 1e-15, 0);
    assert_within(p[NZ - 1].intensity_gw_per_cm2[2], 2, 1e-15, 0);
    /* Only the pump: spontaneous generation is not modelled. */
    dk_twm pump = {{{1.55, 2, 0, 0}, {3.2, 2, 0, 0}, {l3, 2, 5, 0}}, 14, 0};
    run(&pump, zs, NZ, p);
    assert_within(p[NZ - 1].intensity_gw_per_cm2[0], 0, 0, 0);

    dk_twm good = {{{1.55, 2, 1, 0}, {3.2, 2, 0, 0}, {l3, 2, 2, 0}}, 14, 1};
    dk_twm m = good;
    m.wave[2].lambda_um = l3 * (1 + 1e-6);
    assert_int_equal(dk_twm_propagate(&m, zs, NZ, p, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "conserve energy"));
    m = good;
    m.wave[1].intensity_gw_per_cm2 = -1;
    assert_int_equal(dk_twm_propagate(&m, zs, NZ, p, &err), DK_EINVAL);
    m = good;
    m.wave[0].n = 0;
    assert_int_equal(dk_twm_propagate(&m, zs, NZ, p, &err), DK_EINVAL);
    m = good;
    m.wave[2].phase_rad = NAN;
    assert_int_equal(dk_twm_propagate(&m, zs, NZ, p, &err), DK_EINVAL);
    m = good;
    m.deff_pm_per_v = INFINITY;
    assert_int_equal(dk_twm_propagate(&m, zs, NZ, p, &err), DK_EINVAL);
    const double back[] = {0, 2, 1};
    assert_int_equal(dk_twm_propagate(&good, back, 3, p, &err), DK_EINVAL);
    const double neg[] = {-1};
    assert_int_equal(dk_twm_propagate(&good, neg, 1, p, &err), DK_EINVAL);
    const double far[] = {2e6};
    assert_int_equal(dk_twm_propagate(&good, far, 1, p, &err), DK_EINVAL);
    assert_int_equal(dk_twm_propagate(&good, zs, 0, p, &err), DK_EINVAL);
    /* A strongly mismatched run over a very long path needs more steps
     * than the solver allows. */
    m = good;
    m.dk_rad_per_mm = 1e3;
    const double longz[] = {1e6};
    assert_int_equal(dk_twm_propagate(&m, longz, 1, p, &err), DK_ENOCONV);
    assert_non_null(strstr(err.msg, "integration stopped"));
}

/* A host program's own GSL error handler: the library must neither call
 * it (it maps GSL failures to dk_status) nor leave it replaced. */
static int host_calls;

static void
host_handler(const char *reason, const char *file, int line, int gsl_errno)
{
    (void)reason, (void)file, (void)line, (void)gsl_errno;
    host_calls++;
}

static void
gsl_handler_left_alone(void **state)
{
    (void)state;
    gsl_error_handler_t *before = gsl_set_error_handler(host_handler);
    dk_twm m;
    dk_error err = {0};
    assert_int_equal(dk_twm_shg_init(&m, 1.064, 2.15, 2.23, 14, 1, 1e3,
                                     &err),
                     DK_OK);
    dk_twm_point p[1];
    const double longz[] = {1e6};
    assert_int_equal(dk_twm_propagate(&m, longz, 1, p, &err), DK_ENOCONV);
    double h;
    assert_int_equal(dk_bk_h(0.5, 2.84, 0, &h, &err), DK_OK);
    assert_int_equal(host_calls, 0);
    /* The host's handler is in place again. */
    assert_ptr_equal(gsl_set_error_handler(before), host_handler);
}

int
main(void)
{
    /* GSL's default handler stays on: the library switches it off around
     * its own GSL calls (src/core/gsl_guard.c), never the caller. */
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(gsl_handler_left_alone),
        cmocka_unit_test(opa_coupling),
        cmocka_unit_test(opa_signal_gain),
        cmocka_unit_test(opa_bandwidth),
        cmocka_unit_test(shg_low_conversion),
        cmocka_unit_test(bk_h_values),
        cmocka_unit_test(bk_maxima),
        cmocka_unit_test(bk_helpers),
        cmocka_unit_test(manley_rowe),
        cmocka_unit_test(shg_depletion),
        cmocka_unit_test(elliptic_solutions),
        cmocka_unit_test(undepleted_limits),
        cmocka_unit_test(depletion_edges_and_errors),
    };
    return cmocka_run_group_tests_name("gain", tests, NULL, NULL);
}
