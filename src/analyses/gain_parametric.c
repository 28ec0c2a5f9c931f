/*
 * gain_parametric.c - plane-wave parametric gain and low-conversion
 * mixing efficiency (declarations and units in deltak/gain.h).
 *
 * Method. With E_j = A_j exp(i(k_j z − ω_j t)) + c.c. and
 * I_j = 2 n_j ε0 c |A_j|², the slowly-varying-envelope equations are
 *   dA1/dz = i (2 d_eff ω1 / n1 c) A3 A2* exp(iΔkz),
 *   dA2/dz = i (2 d_eff ω2 / n2 c) A3 A1* exp(iΔkz),
 *   dA3/dz = i (2 d_eff ω3 / n3 c) A1 A2 exp(−iΔkz),   Δk = k3 − k1 − k2
 * (Boyd §2.2–2.3 and §2.9). With the pump A3 undepleted and A2(0) = 0 they
 * are linear; A1 grows as cosh/sinh of gz with
 *   g² = Γ² − (Δk/2)²,  Γ² = (2 d ω1/n1 c)(2 d ω2/n2 c)|A3|²
 *      = 8π² d_eff² I3 / (ε0 c n1 n2 n3 λ1 λ2),
 * and I1(L)/I1(0) = 1 + (Γ/g)² sinh²(gL) (Boyd §2.9; Cerullo & De
 * Silvestri 2003). The form sinh(gL)/g is even in g, hence entire in
 * g²: for g² < 0 it is sin(|g|L)/|g|, at g = 0 it is L; it is evaluated in
 * that form so no complex arithmetic is needed.
 *
 * Bandwidth. For ΓL ≫ 1, G ≈ ¼ exp(2gL) and g ≈ Γ − Δk²/(8Γ), so
 * G(Δk) ≈ G(0) exp(−Δk² L / 4Γ); half gain at |Δk| = 2 (ln2 Γ/L)^½. To
 * first order in a signal detuning Δω (idler −Δω), Δk = (1/v_gi −
 * 1/v_gs) Δω, so the FWHM is Δν = (2√ln2/π)(Γ/L)^½ / |1/v_gs − 1/v_gi|
 * (the expression given by Cerullo & De Silvestri 2003, equation
 * number not quoted; derived as above). With Γ/L in 1/mm² and GVM in
 * fs/mm this is in 1/fs = 1000 THz.
 * The exact half-width of G − 1 in Δk is found by Brent root finding on
 * the main lobe, where G − 1 decreases monotonically from Δk = 0 to its
 * first zero at Δk/2 = (Γ² + (π/L)²)^½.
 *
 * Low conversion. Integrating dA3/dz with A1, A2 constant gives
 * |A3(L)| = (2 d ω3/n3 c)|A1 A2| L |sinc(ΔkL/2)|, i.e.
 *   I3 = 8π² d² L² I1 I2 / (ε0 c n1 n2 n3 λ3²) sinc²(ΔkL/2);
 * the same with the idler as output gives DFG. For SHG of one beam the
 * driving polarisation is ε0 χ(2) A1² (no factor 2), which gives the
 * familiar η = 8π² d² L² I_ω / (ε0 c n_ω² n_2ω λ_ω²) sinc²(ΔkL/2) (Fejer
 * et al. 1992, their opening plane-wave expression; equivalently the
 * SFG result with I1 = I2 = I_ω/2).
 *
 * Units at the interface: d pm/V, I GW/cm², λ µm, L mm, Δk rad/mm, Γ
 * 1/mm. Internally SI; the factors are the named conversions below.
 *
 * References:
 *   R. W. Boyd, Nonlinear Optics, 3rd ed., Academic Press (2008), §2.2–2.3
 *     (coupled-amplitude equations) and §2.9 (difference-frequency
 *     generation and parametric amplification); section numbers from
 *     memory.
 *   G. Cerullo and S. De Silvestri, "Ultrafast optical parametric
 *     amplifiers", Rev. Sci. Instrum. 74, 1–18 (2003) (the gain
 *     coefficient Γ and the gain bandwidth of a collinear OPA).
 *   M. M. Fejer, G. A. Magel, D. H. Jundt, R. L. Byer, "Quasi-phase-
 *     matched second harmonic generation: tuning and tolerances", IEEE J.
 *     Quantum Electron. 28, 2631–2654 (1992) (plane-wave low-conversion
 *     SHG).
 */
#include <math.h>

#include "deltak/acceptance.h"
#include "deltak/gain.h"
#include "deltak/roots.h"
#include "deltak/units.h"

#define PM_PER_V_TO_M_PER_V 1e-12
#define GW_PER_CM2_TO_W_PER_M2 1e13
#define UM_TO_M 1e-6
#define MM_TO_M 1e-3
#define PER_M_TO_PER_MM 1e-3
#define PER_FS_TO_THZ 1e3
/* sinh² overflows a double near gL = 355; refuse before that. */
#define MAX_GL 354.0
/* Root tolerance for the Δk half-width, relative to the search interval. */
#define FWHM_XTOL_REL 1e-13

static int
positive(double x)
{
    return isfinite(x) && x > 0;
}

static int
nonnegative(double x)
{
    return isfinite(x) && x >= 0;
}


dk_status
dk_opa_gamma_per_mm(double deff_pm_per_v, double n_pump, double n_signal,
                    double n_idler, double signal_um, double idler_um,
                    double pump_gw_per_cm2, double *gamma_per_mm,
                    dk_error *err)
{
    if (!isfinite(deff_pm_per_v))
        return dk_error_set(err, DK_EINVAL, "d_eff must be finite (pm/V)");
    if (!positive(n_pump) || !positive(n_signal) || !positive(n_idler))
        return dk_error_set(err, DK_EINVAL,
                            "refractive indices must be positive");
    if (!positive(signal_um) || !positive(idler_um))
        return dk_error_set(err, DK_EINVAL,
                            "signal and idler wavelengths must be positive "
                            "(um)");
    if (!nonnegative(pump_gw_per_cm2))
        return dk_error_set(err, DK_EINVAL,
                            "pump intensity %g GW/cm2 must be finite and "
                            "not negative",
                            pump_gw_per_cm2);
    double d = deff_pm_per_v * PM_PER_V_TO_M_PER_V;
    double ip = pump_gw_per_cm2 * GW_PER_CM2_TO_W_PER_M2;
    double g2 = 8 * M_PI * M_PI * d * d * ip /
                (DK_EPS0_F_PER_M * DK_C_M_PER_S * n_pump * n_signal *
                 n_idler * (signal_um * UM_TO_M) * (idler_um * UM_TO_M));
    *gamma_per_mm = sqrt(g2) * PER_M_TO_PER_MM;
    return DK_OK;
}

/*
 * (sinh(gL)/g)² for g² = Γ² − x², x = Δk/2, continued through g² ≤ 0;
 * NAN when it overflows. The amplified part is G − 1 = Γ² times this.
 */
static double
shape(double gamma, double x, double len)
{
    double g2 = gamma * gamma - x * x;
    double s;
    if (g2 > 0) {
        double g = sqrt(g2);
        if (g * len > MAX_GL)
            return NAN;
        s = sinh(g * len) / g;
    } else if (g2 < 0) {
        s = len * dk_sinc(sqrt(-g2) * len);
    } else {
        s = len;
    }
    return s * s;
}

dk_status
dk_opa_signal_gain(double gamma_per_mm, double dk_rad_per_mm,
                   double length_mm, double *gain, dk_error *err)
{
    if (!nonnegative(gamma_per_mm) || !isfinite(dk_rad_per_mm) ||
        !nonnegative(length_mm))
        return dk_error_set(err, DK_EINVAL,
                            "parametric gain: the coupling Gamma must be "
                            ">= 0 (got %g /mm), the mismatch finite (got "
                            "%g rad/mm) and the length >= 0 (got %g mm)",
                            gamma_per_mm, dk_rad_per_mm, length_mm);
    double a = gamma_per_mm * gamma_per_mm *
               shape(gamma_per_mm, dk_rad_per_mm / 2, length_mm);
    if (!isfinite(a))
        return dk_error_set(err, DK_EDOM,
                            "parametric gain overflows (Gamma L = %g): the "
                            "undepleted-pump result no longer applies",
                            gamma_per_mm * length_mm);
    *gain = 1 + a;
    return DK_OK;
}

typedef struct half_probe {
    double gamma, len, half;
} half_probe;

static double
above_half(double x, void *p)
{
    const half_probe *hp = p;
    return shape(hp->gamma, x, hp->len) - hp->half;
}

dk_status
dk_opa_dk_fwhm_rad_per_mm(double gamma_per_mm, double length_mm,
                          double *fwhm_rad_per_mm, dk_error *err)
{
    if (!nonnegative(gamma_per_mm) || !positive(length_mm))
        return dk_error_set(err, DK_EINVAL,
                            "gain bandwidth: the coupling Gamma must be >= "
                            "0 (got %g /mm) and the length > 0 (got %g mm)",
                            gamma_per_mm, length_mm);
    /* G − 1 = Γ² · shape: Γ² drops out of the half-height condition, so
     * Γ = 0 gives the low-gain limit, the sinc² width. */
    half_probe hp = {gamma_per_mm, length_mm,
                     shape(gamma_per_mm, 0, length_mm) / 2};
    if (!isfinite(hp.half))
        return dk_error_set(err, DK_EDOM,
                            "parametric gain overflows (Gamma L = %g)",
                            gamma_per_mm * length_mm);
    double xmax = sqrt(gamma_per_mm * gamma_per_mm +
                       M_PI * M_PI / (length_mm * length_mm));
    double x;
    dk_status s = dk_root_bracketed(above_half, &hp, 0, xmax,
                                    FWHM_XTOL_REL * xmax, &x, err);
    if (s == DK_EINVAL)
        return dk_error_set(err, DK_ENOCONV,
                            "could not bracket the half-gain point");
    if (s)
        return s;
    *fwhm_rad_per_mm = 4 * x; /* x = Δk/2 at half height, both sides */
    return DK_OK;
}

dk_status
dk_opa_bandwidth_thz(double gamma_per_mm, double length_mm,
                     double gvm_fs_per_mm, double *fwhm_thz, dk_error *err)
{
    if (!positive(gamma_per_mm) || !positive(length_mm) ||
        !isfinite(gvm_fs_per_mm))
        return dk_error_set(err, DK_EINVAL,
                            "bandwidth needs Gamma > 0 (1/mm), length > 0 "
                            "(mm) and a finite GVM (fs/mm)");
    if (gvm_fs_per_mm == 0)
        return dk_error_set(err, DK_EDOM,
                            "signal and idler group velocities are matched: "
                            "the first-order bandwidth estimate diverges "
                            "(the width is then set by group-velocity "
                            "dispersion)");
    double per_fs = 2 * sqrt(M_LN2) / M_PI * sqrt(gamma_per_mm / length_mm) /
                    fabs(gvm_fs_per_mm);
    *fwhm_thz = per_fs * PER_FS_TO_THZ;
    return DK_OK;
}

/* 8π² d² L² / (ε0 c λ²) in SI, times I in W/m², over the index product. */
static double
low_conversion(double deff_pm_per_v, double length_mm, double lambda_um,
               double index_product, double intensity_product_w2_per_m4)
{
    double d = deff_pm_per_v * PM_PER_V_TO_M_PER_V;
    double len = length_mm * MM_TO_M;
    double lam = lambda_um * UM_TO_M;
    return 8 * M_PI * M_PI * d * d * len * len * intensity_product_w2_per_m4 /
           (DK_EPS0_F_PER_M * DK_C_M_PER_S * index_product * lam * lam);
}

dk_status
dk_shg_efficiency(double deff_pm_per_v, double n_fund, double n_sh,
                  double fund_um, double length_mm, double fund_gw_per_cm2,
                  double dk_rad_per_mm, double *eta, dk_error *err)
{
    if (!isfinite(deff_pm_per_v) || !positive(n_fund) || !positive(n_sh) ||
        !positive(fund_um) || !nonnegative(length_mm) ||
        !nonnegative(fund_gw_per_cm2) || !isfinite(dk_rad_per_mm))
        return dk_error_set(err, DK_EINVAL,
                            "SHG efficiency needs finite d_eff (pm/V), "
                            "positive indices and wavelength (um), length "
                            ">= 0 (mm), intensity >= 0 (GW/cm2) and finite "
                            "dk (rad/mm)");
    double i = fund_gw_per_cm2 * GW_PER_CM2_TO_W_PER_M2;
    double s = dk_sinc(dk_rad_per_mm * length_mm / 2);
    *eta = low_conversion(deff_pm_per_v, length_mm, fund_um,
                          n_fund * n_fund * n_sh, i) *
           s * s;
    return DK_OK;
}

dk_status
dk_mixing_intensity_gw_per_cm2(double deff_pm_per_v, double n_a, double n_b,
                               double n_out, double out_um, double length_mm,
                               double a_gw_per_cm2, double b_gw_per_cm2,
                               double dk_rad_per_mm, double *out_gw_per_cm2,
                               dk_error *err)
{
    if (!isfinite(deff_pm_per_v) || !positive(n_a) || !positive(n_b) ||
        !positive(n_out) || !positive(out_um) || !nonnegative(length_mm) ||
        !nonnegative(a_gw_per_cm2) || !nonnegative(b_gw_per_cm2) ||
        !isfinite(dk_rad_per_mm))
        return dk_error_set(err, DK_EINVAL,
                            "mixing needs finite d_eff (pm/V), positive "
                            "indices and wavelength (um), length >= 0 (mm), "
                            "intensities >= 0 (GW/cm2) and finite dk "
                            "(rad/mm)");
    double ia = a_gw_per_cm2 * GW_PER_CM2_TO_W_PER_M2;
    double ib = b_gw_per_cm2 * GW_PER_CM2_TO_W_PER_M2;
    double s = dk_sinc(dk_rad_per_mm * length_mm / 2);
    double w_per_m2 = low_conversion(deff_pm_per_v, length_mm, out_um,
                                     n_a * n_b * n_out, ia * ib) *
                      s * s;
    *out_gw_per_cm2 = w_per_m2 / GW_PER_CM2_TO_W_PER_M2;
    return DK_OK;
}
