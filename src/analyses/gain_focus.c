/*
 * gain_focus.c - the Boyd–Kleinman focusing function h(σ, ξ, B) for
 * second-harmonic generation (and, with the same h, SFG of equal confocal
 * parameters) by a focused TEM00 beam (declarations in deltak/gain.h).
 *
 * Definition (Boyd & Kleinman 1968, eqs. for H(σ, B, κ, ξ, μ) with no
 * absorption, κ = 0, and the waist at the crystal centre, μ = 0):
 *   h(σ, ξ, B) = 1/(4ξ) ∫∫_{−ξ}^{ξ} dτ dτ' K(τ − τ') / ((1+iτ)(1−iτ')),
 *   K(u) = exp(iσu − B²u²/ξ),
 * with τ = 2(z − f)/b, b = w0² k1 the confocal parameter, ξ = L/b,
 * σ = bΔk/2 and B = ρ(L k1)^½/2 the walk-off parameter.
 *
 * Reduction to one integral (derived here; the C code is checked against
 * direct 2-D quadrature). Put u = τ − τ'. For fixed u, partial fractions
 * with (1 + i(τ'+u)) + (1 − iτ') = 2 + iu give
 *   1/((1+i(τ'+u))(1−iτ')) = [1/(1+i(τ'+u)) + 1/(1−iτ')] / (2 + iu),
 * whose τ'-integral over the overlap of both ranges is, for u ≥ 0
 * (τ' ∈ [−ξ, ξ−u]), with the principal logarithm (Re(1 + ix) > 0),
 *   F(u) = 2i [ln(1 + i(u−ξ)) − ln(1 + iξ)] / (2 + iu)
 *        = 2i [½ ln((1 + (u−ξ)²)/(1 + ξ²)) + i(atan(u−ξ) − atan ξ)]
 *          / (2 + iu).
 * Exchanging τ and τ' conjugates the integrand, so the part u < 0 is the
 * complex conjugate of the part u > 0 and
 *   h = (1/2ξ) Re ∫_0^{2ξ} K(u) F(u) du
 *     = (1/2ξ) ∫_0^{2ξ} e^{−B²u²/ξ} [cos(σu) f_c(u) − sin(σu) f_s(u)] du,
 *   f_c = (2u ℓ − 4a)/(4 + u²),  f_s = (4ℓ + 2u a)/(4 + u²),
 *   ℓ = ½ ln((1+(u−ξ)²)/(1+ξ²)),  a = atan(u−ξ) − atan ξ.
 * Checks built into this form: for ξ → 0, F(u) → 2ξ − u (the overlap
 * length) and h → ξ; for σ = B = 0, h = atan²(ξ)/ξ.
 * For B > 0 the range is cut where e^{−B²u²/ξ} < e^{−64}. The integral is
 * done by GSL's adaptive Gauss–Kronrod rule (QAG, 41 points), or, when
 * σ·u_max is large, as two Fourier integrals by QAWO (Clenshaw–Curtis
 * with Chebyshev moments), which stays accurate for many oscillations.
 *
 * Maxima. h_m(ξ, B) = max_σ h: a scan of −1 ≤ σ ≤ 3 with steps
 * min(0.05, 0.5/ξ) (several points per side lobe, whose period in σ is
 * π/ξ) picks the best point, then GSL's Brent minimiser on −h refines it.
 * Optimum focusing: a 16-point scan of ln ξ over [ln 0.5, ln 10], then
 * Brent in ln ξ on −h_m. The B = 0 optimum, ξ = 2.84, h = 1.068, σ = 0.57,
 * is reproduced (Boyd & Kleinman 1968); for B ≫ 1 the integral
 * reduces to h ≈ (√π/2) atan(ξ) / (B √ξ) (K confines u to ≲ √ξ/B, where
 * F(u) ≈ F(0) = 2 atan ξ), whose maximum lies at ξ = 1.392.
 *
 * Units: σ, ξ, B, h are dimensionless; lengths at the helpers' interface
 * in mm, waists and wavelengths in µm, ρ in rad.
 *
 * References:
 *   G. D. Boyd and D. A. Kleinman, "Parametric interaction of focused
 *     Gaussian light beams", J. Appl. Phys. 39, 3597–3639 (1968)
 *     (H and h, B = ρ(l k1)^½/2, ξ = l/b; h_m and optimum focusing; the
 *     paper's section and equation numbers are not quoted here).
 *   R. Piessens, E. de Doncker-Kapenga, C. Überhuber, D. Kahaner,
 *     QUADPACK, Springer (1983) (QAG, QAWO), as in the GSL manual,
 *     "Numerical Integration".
 *   R. P. Brent, Algorithms for Minimization without Derivatives,
 *     Prentice-Hall (1973), ch. 5 (gsl_min_fminimizer_brent).
 */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <gsl/gsl_min.h>
#include <math.h>

#include "core/gsl_guard.h"
#include <stdlib.h>

#include "deltak/gain.h"
#include "deltak/units.h"

#define QUAD_LIMIT 2000        /* subintervals of the adaptive quadrature */
#define QAWO_LEVELS 25         /* bisection levels of the QAWO table */
#define QUAD_EPSREL 1e-11      /* relative tolerance of h */
#define QUAD_EPSABS 1e-13      /* absolute tolerance of h / min(1, ξ) */
#define OSC_SWITCH_RAD 100.0   /* σ·u_max above which QAWO is used */
#define GAUSS_CUT 8.0          /* cut K where B²u²/ξ = GAUSS_CUT² */
#define SIGMA_LO (-1.0)        /* σ scan range of dk_bk_h_max */
#define SIGMA_HI 3.0
#define SIGMA_STEP 0.05        /* ... and its step, at most */
#define SIGMA_STEPS_PER_XI 0.5 /* step ≤ this / ξ (side-lobe period π/ξ) */
#define SIGMA_TOL 1e-7         /* Brent tolerance on σ_m (abs + rel) */
#define XI_LO 0.5              /* ξ scan range of dk_bk_optimum */
#define XI_HI 10.0
#define XI_SCAN 16
#define LNXI_TOL 1e-7          /* Brent tolerance on ln ξ_m */
#define MAX_ITER 200
#define UM_TO_M 1e-6
#define MM_TO_M 1e-3
#define PM_PER_V_TO_M_PER_V 1e-12

typedef struct bk_args {
    double sigma, xi, b2_over_xi;
    int part; /* 0: cos·f_c − sin·f_s; 1: f_c only; 2: f_s only */
} bk_args;

static double
bk_integrand(double u, void *p)
{
    const bk_args *a = p;
    double xi = a->xi;
    /* ℓ = ½ ln((1+(u−ξ)²)/(1+ξ²)) = ½ log1p(u(u−2ξ)/(1+ξ²)) */
    double ell = 0.5 * log1p(u * (u - 2 * xi) / (1 + xi * xi));
    double at = atan(u - xi) - atan(xi);
    double den = 4 + u * u;
    double fc = (2 * u * ell - 4 * at) / den;
    double fs = (4 * ell + 2 * u * at) / den;
    double g = a->b2_over_xi > 0 ? exp(-a->b2_over_xi * u * u) : 1;
    switch (a->part) {
    case 1:
        return g * fc;
    case 2:
        return g * fs;
    default:
        return g * (cos(a->sigma * u) * fc - sin(a->sigma * u) * fs);
    }
}

static int
quad_ok(int status)
{
    /* GSL_EROUND: the tolerance is below what rounding allows; the
     * result is then as good as the arithmetic permits. */
    return status == GSL_SUCCESS || status == GSL_EROUND;
}

/* h with a caller-owned workspace; arguments already validated. */
static dk_status
bk_h_ws(double sigma, double xi, double walkoff_b,
        gsl_integration_workspace *ws, double *h, dk_error *err)
{
    bk_args a = {sigma, xi, walkoff_b * walkoff_b / xi, 0};
    double umax = 2 * xi;
    if (walkoff_b > 0)
        umax = fmin(umax, GAUSS_CUT * sqrt(xi) / walkoff_b);
    double epsabs = QUAD_EPSABS * 2 * xi * fmin(1, xi);
    double val, abserr;
    gsl_function f = {bk_integrand, &a};
    if (fabs(sigma) * umax <= OSC_SWITCH_RAD) {
        int st = gsl_integration_qag(&f, 0, umax, epsabs, QUAD_EPSREL,
                                     QUAD_LIMIT, GSL_INTEG_GAUSS41, ws,
                                     &val, &abserr);
        if (!quad_ok(st))
            return dk_error_set(err, DK_ENOCONV,
                                "Boyd-Kleinman quadrature failed at sigma "
                                "%g, xi %g, B %g: %s",
                                sigma, xi, walkoff_b, gsl_strerror(st));
    } else {
        gsl_integration_qawo_table *t = gsl_integration_qawo_table_alloc(
            sigma, umax, GSL_INTEG_COSINE, QAWO_LEVELS);
        if (!t)
            return dk_error_set(err, DK_ENOMEM, "out of memory");
        double vc, vs;
        a.part = 1;
        int st = gsl_integration_qawo(&f, 0, epsabs, QUAD_EPSREL, QUAD_LIMIT,
                                      ws, t, &vc, &abserr);
        if (quad_ok(st)) {
            gsl_integration_qawo_table_set(t, sigma, umax, GSL_INTEG_SINE);
            a.part = 2;
            st = gsl_integration_qawo(&f, 0, epsabs, QUAD_EPSREL,
                                      QUAD_LIMIT, ws, t, &vs, &abserr);
        }
        gsl_integration_qawo_table_free(t);
        if (!quad_ok(st))
            return dk_error_set(err, DK_ENOCONV,
                                "Boyd-Kleinman oscillatory quadrature "
                                "failed at sigma %g, xi %g, B %g: %s",
                                sigma, xi, walkoff_b, gsl_strerror(st));
        val = vc - vs;
    }
    /* h is a squared modulus in disguise: ≥ 0 up to rounding. */
    *h = fmax(0, val / (2 * xi));
    return DK_OK;
}

static dk_status
check_b(double walkoff_b, dk_error *err)
{
    if (!(isfinite(walkoff_b) && walkoff_b >= 0 && walkoff_b <= 1e3))
        return dk_error_set(err, DK_EINVAL,
                            "walk-off parameter B = %g must lie in [0, 1000]",
                            walkoff_b);
    return DK_OK;
}

static dk_status
dk_bk_h_impl(double sigma, double xi, double walkoff_b, double *h, dk_error *err)
{
    if (!(isfinite(sigma) && fabs(sigma) <= 1e4))
        return dk_error_set(err, DK_EINVAL,
                            "sigma = %g must be finite, |sigma| <= 1e4",
                            sigma);
    if (!(xi >= 1e-6 && xi <= 1e3))
        return dk_error_set(err, DK_EINVAL,
                            "focusing parameter xi = %g must lie in "
                            "[1e-6, 1000]",
                            xi);
    dk_status s = check_b(walkoff_b, err);
    if (s)
        return s;
    gsl_integration_workspace *ws =
        gsl_integration_workspace_alloc(QUAD_LIMIT);
    if (!ws)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    s = bk_h_ws(sigma, xi, walkoff_b, ws, h, err);
    gsl_integration_workspace_free(ws);
    return s;
}

/* State shared by the σ search. */
typedef struct sigma_search {
    double xi, b;
    gsl_integration_workspace *ws;
    dk_status status; /* the first failure inside a GSL callback */
    dk_error *err;
} sigma_search;

static double
minus_h(double sigma, void *p)
{
    sigma_search *s = p;
    double h = 0;
    if (s->status)
        return NAN;
    s->status = bk_h_ws(sigma, s->xi, s->b, s->ws, &h, s->err);
    return s->status ? NAN : -h;
}

/*
 * Brent minimisation of @f on [lo, hi] from @mid, where f(mid) is below
 * f(lo) and f(hi). On success *x, *fx hold the minimum; when GSL refuses
 * the bracket (a function flat to rounding) they keep mid, f(mid).
 */
static dk_status
brent_min(double (*f)(double, void *), void *params, double lo, double mid,
          double hi, double fmid, double tol, double *x, double *fx,
          dk_error *err)
{
    *x = mid;
    *fx = fmid;
    gsl_function gf = {f, params};
    gsl_min_fminimizer *m = gsl_min_fminimizer_alloc(gsl_min_fminimizer_brent);
    if (!m)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    if (gsl_min_fminimizer_set(m, &gf, mid, lo, hi) != GSL_SUCCESS) {
        gsl_min_fminimizer_free(m);
        return DK_OK;
    }
    int st = GSL_CONTINUE;
    for (int i = 0; i < MAX_ITER && st == GSL_CONTINUE; i++) {
        if (gsl_min_fminimizer_iterate(m) != GSL_SUCCESS)
            break;
        st = gsl_min_test_interval(gsl_min_fminimizer_x_lower(m),
                                   gsl_min_fminimizer_x_upper(m), tol, tol);
    }
    double xm = gsl_min_fminimizer_x_minimum(m);
    double fm = gsl_min_fminimizer_f_minimum(m);
    gsl_min_fminimizer_free(m);
    if (st != GSL_SUCCESS || !isfinite(fm))
        return dk_error_set(err, DK_ENOCONV,
                            "maximum search did not converge in [%g, %g]",
                            lo, hi);
    if (fm <= fmid) {
        *x = xm;
        *fx = fm;
    }
    return DK_OK;
}

static dk_status
h_max_ws(double xi, double walkoff_b, gsl_integration_workspace *ws,
         double *h_max, double *sigma_max, dk_error *err)
{
    sigma_search s = {xi, walkoff_b, ws, DK_OK, err};
    double step = fmin(SIGMA_STEP, SIGMA_STEPS_PER_XI / xi);
    int n = (int)ceil((SIGMA_HI - SIGMA_LO) / step);
    step = (SIGMA_HI - SIGMA_LO) / n;
    int best = 0;
    double fbest = INFINITY;
    for (int i = 0; i <= n; i++) {
        double f = minus_h(SIGMA_LO + i * step, &s);
        if (s.status)
            return s.status;
        if (f < fbest) {
            fbest = f;
            best = i;
        }
    }
    if (best == 0 || best == n)
        return dk_error_set(err, DK_ENOCONV,
                            "the maximum of h over sigma lies at the edge of "
                            "the searched range [%g, %g] (xi %g, B %g)",
                            SIGMA_LO, SIGMA_HI, xi, walkoff_b);
    double x, fx;
    dk_status st = brent_min(minus_h, &s, SIGMA_LO + (best - 1) * step,
                             SIGMA_LO + best * step,
                             SIGMA_LO + (best + 1) * step, fbest, SIGMA_TOL,
                             &x, &fx, err);
    if (s.status)
        return s.status;
    if (st)
        return st;
    *h_max = -fx;
    if (sigma_max)
        *sigma_max = x;
    return DK_OK;
}

static dk_status
dk_bk_h_max_impl(double xi, double walkoff_b, double *h_max, double *sigma_max,
            dk_error *err)
{
    if (!(xi >= 1e-6 && xi <= 100))
        return dk_error_set(err, DK_EINVAL,
                            "focusing parameter xi = %g must lie in "
                            "[1e-6, 100] for the maximum over sigma",
                            xi);
    dk_status s = check_b(walkoff_b, err);
    if (s)
        return s;
    gsl_integration_workspace *ws =
        gsl_integration_workspace_alloc(QUAD_LIMIT);
    if (!ws)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    s = h_max_ws(xi, walkoff_b, ws, h_max, sigma_max, err);
    gsl_integration_workspace_free(ws);
    return s;
}

/* State shared by the ξ search. */
typedef struct xi_search {
    double b;
    gsl_integration_workspace *ws;
    dk_status status;
    dk_error *err;
} xi_search;

static double
minus_h_max(double ln_xi, void *p)
{
    xi_search *s = p;
    double h = 0;
    if (s->status)
        return NAN;
    s->status = h_max_ws(exp(ln_xi), s->b, s->ws, &h, NULL, s->err);
    return s->status ? NAN : -h;
}

static dk_status
dk_bk_optimum_impl(double walkoff_b, double *xi_opt, double *h_opt,
              double *sigma_opt, dk_error *err)
{
    dk_status s = check_b(walkoff_b, err);
    if (s)
        return s;
    gsl_integration_workspace *ws =
        gsl_integration_workspace_alloc(QUAD_LIMIT);
    if (!ws)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    xi_search xs = {walkoff_b, ws, DK_OK, err};
    double lo = log(XI_LO), hi = log(XI_HI);
    double step = (hi - lo) / (XI_SCAN - 1);
    int best = 0;
    double fbest = INFINITY;
    for (int i = 0; i < XI_SCAN; i++) {
        double f = minus_h_max(lo + i * step, &xs);
        if (xs.status)
            break;
        if (f < fbest) {
            fbest = f;
            best = i;
        }
    }
    double x = 0, fx = 0;
    if (!xs.status) {
        if (best == 0 || best == XI_SCAN - 1)
            s = dk_error_set(err, DK_ENOCONV,
                             "optimum focusing lies outside xi in [%g, %g] "
                             "(B %g)",
                             XI_LO, XI_HI, walkoff_b);
        else
            s = brent_min(minus_h_max, &xs, lo + (best - 1) * step,
                          lo + best * step, lo + (best + 1) * step, fbest,
                          LNXI_TOL, &x, &fx, err);
    }
    if (xs.status)
        s = xs.status;
    double sig = 0;
    if (!s) {
        *xi_opt = exp(x);
        s = h_max_ws(*xi_opt, walkoff_b, ws, h_opt, &sig, err);
        if (!s && sigma_opt)
            *sigma_opt = sig;
    }
    gsl_integration_workspace_free(ws);
    return s;
}

static int
positive(double x)
{
    return isfinite(x) && x > 0;
}

dk_status
dk_bk_confocal_mm(double waist_um, double n1, double lambda1_um,
                  double *confocal_mm, dk_error *err)
{
    if (!positive(waist_um) || !positive(n1) || !positive(lambda1_um))
        return dk_error_set(err, DK_EINVAL,
                            "confocal parameter needs a positive waist (um), "
                            "index and wavelength (um)");
    /* b = w0² k1 = 2π n1 w0² / λ1, in µm, then mm */
    *confocal_mm = 2 * M_PI * n1 * waist_um * waist_um / lambda1_um * 1e-3;
    return DK_OK;
}

dk_status
dk_bk_xi(double length_mm, double waist_um, double n1, double lambda1_um,
         double *xi, dk_error *err)
{
    if (!positive(length_mm))
        return dk_error_set(err, DK_EINVAL,
                            "crystal length %g mm must be positive",
                            length_mm);
    double b;
    dk_status s = dk_bk_confocal_mm(waist_um, n1, lambda1_um, &b, err);
    if (s)
        return s;
    *xi = length_mm / b;
    return DK_OK;
}

dk_status
dk_bk_walkoff_b(double rho_rad, double length_mm, double n1,
                double lambda1_um, double *walkoff_b, dk_error *err)
{
    if (!isfinite(rho_rad) || !positive(length_mm) || !positive(n1) ||
        !positive(lambda1_um))
        return dk_error_set(err, DK_EINVAL,
                            "walk-off parameter needs a finite angle (rad), "
                            "positive length (mm), index and wavelength "
                            "(um)");
    double k1_per_um = 2 * M_PI * n1 / lambda1_um;
    double len_um = length_mm * 1e3;
    *walkoff_b = fabs(rho_rad) * sqrt(len_um * k1_per_um) / 2;
    return DK_OK;
}

dk_status
dk_bk_shg_efficiency(double deff_pm_per_v, double n_fund, double n_sh,
                     double fund_um, double length_mm, double fund_w,
                     double h, double *eta, dk_error *err)
{
    if (!isfinite(deff_pm_per_v) || !positive(n_fund) || !positive(n_sh) ||
        !positive(fund_um) || !positive(length_mm) ||
        !(isfinite(fund_w) && fund_w >= 0) || !(isfinite(h) && h >= 0))
        return dk_error_set(err, DK_EINVAL,
                            "focused SHG needs finite d_eff (pm/V), positive "
                            "indices, wavelength (um) and length (mm), "
                            "power >= 0 (W) and h >= 0");
    const double c = DK_C_M_PER_S;
    double d = deff_pm_per_v * PM_PER_V_TO_M_PER_V;
    double omega = 2 * M_PI * c / (fund_um * UM_TO_M);
    double k1 = n_fund * omega / c;
    double len = length_mm * MM_TO_M;
    *eta = 2 * omega * omega * d * d * k1 * len * fund_w * h /
           (M_PI * DK_EPS0_F_PER_M * c * c * c * n_fund * n_fund * n_sh);
    return DK_OK;
}

/* The entry point: GSL's aborting handler off for the call. */
dk_status
dk_bk_h(double sigma, double xi, double walkoff_b, double *h, dk_error *err)
{
    dk_gsl_guard_enter();
    dk_status s = dk_bk_h_impl(sigma, xi, walkoff_b, h, err);
    dk_gsl_guard_leave();
    return s;
}

/* The entry point: GSL's aborting handler off for the call. */
dk_status
dk_bk_h_max(double xi, double walkoff_b, double *h_max, double *sigma_max,
            dk_error *err)
{
    dk_gsl_guard_enter();
    dk_status s = dk_bk_h_max_impl(xi, walkoff_b, h_max, sigma_max, err);
    dk_gsl_guard_leave();
    return s;
}

/* The entry point: GSL's aborting handler off for the call. */
dk_status
dk_bk_optimum(double walkoff_b, double *xi_opt, double *h_opt,
              double *sigma_opt, dk_error *err)
{
    dk_gsl_guard_enter();
    dk_status s = dk_bk_optimum_impl(walkoff_b, xi_opt, h_opt, sigma_opt, err);
    dk_gsl_guard_leave();
    return s;
}
