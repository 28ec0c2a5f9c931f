/*
 * gain_depletion.c - plane-wave three-wave mixing with pump depletion:
 * SFG, SHG (degenerate), DFG and OPA, by integrating the coupled-wave
 * equations with GSL's ODE driver (declarations in deltak/gain.h).
 *
 * Equations. With E_j = A_j exp(i(k_j z − ω_j t)) + c.c., I_j =
 * 2 n_j ε0 c |A_j|², ω3 = ω1 + ω2 and Δk = k3 − k1 − k2, the slowly-
 * varying-envelope equations of a lossless χ(2) medium are
 *   dA1/dz = i (2 d ω1 / n1 c) A3 A2* e^{iΔkz},
 *   dA2/dz = i (2 d ω2 / n2 c) A3 A1* e^{iΔkz},
 *   dA3/dz = i (2 d ω3 / n3 c) A1 A2 e^{−iΔkz}
 * (Armstrong et al. 1962; Boyd §2.2–2.3). Scaling each amplitude to the
 * photon flux, a_j = A_j (2 n_j ε0 c / ħω_j)^½ so that |a_j|² = I_j / ħω_j,
 * makes the coupling the same for all three waves:
 *   da1/dz = iK a3 a2* e^{iΔkz},  da2/dz = iK a3 a1* e^{iΔkz},
 *   da3/dz = iK a1 a2 e^{−iΔkz},
 *   K = (2 d / c) (ħ ω1 ω2 ω3 / (2 ε0 c n1 n2 n3))^½.
 * In this form d|a1|²/dz = d|a2|²/dz = −d|a3|²/dz (Manley–Rowe) follows at
 * sight, and K²|a3|² is the Γ² of dk_opa_gamma_per_mm. The code integrates
 * q_j = a_j / N0^½, N0 the total photon flux at z = 0, so |q_j| ≤ 1, with
 * z in mm and κ = K N0^½ in 1/mm: six real equations, solved by the
 * embedded Runge–Kutta–Prince–Dormand (8,9) method with absolute and
 * relative tolerances 1e-14 and 1e-12 on q. ω3 is taken as ω1 + ω2
 * exactly (after checking the wavelengths agree to 1e-9) so that energy
 * is conserved to the integrator's accuracy.
 *
 * SHG of one beam is the case ω1 = ω2 with half the fundamental in each,
 * in phase: the three-wave system then stays symmetric (a1 = a2) and
 * reproduces the degenerate equations dA_ω/dz = i(2dω/n_ω c) A_2ω A_ω*
 * e^{iΔkz}, dA_2ω/dz = i(2dω/n_2ω c) A_ω² e^{−iΔkz}; at Δk = 0 the
 * harmonic grows as I_2ω/I_ω(0) = tanh²(Γ_SH z) (Armstrong et al.
 * 1962), Γ_SH² the low-conversion η per unit length squared.
 *
 * Valid: plane waves, no absorption, no group-velocity effects, Δk
 * constant along z; 0 ≤ z ≤ 1e6 mm. Units as in deltak/gain.h.
 *
 * References:
 *   J. A. Armstrong, N. Bloembergen, J. Ducuing, P. S. Pershan,
 *     "Interactions between light waves in a nonlinear dielectric",
 *     Phys. Rev. 127, 1918–1939 (1962) (coupled equations, Manley–Rowe
 *     integrals, tanh² and Jacobi elliptic solutions for Δk = 0).
 *   R. W. Boyd, Nonlinear Optics, 3rd ed., Academic Press (2008), §2.2–2.3
 *     (coupled-amplitude equations) and §2.6 (Manley–Rowe); section
 *     numbers from memory.
 *   P. J. Prince and J. R. Dormand, "High order embedded Runge-Kutta
 *     formulae", J. Comput. Appl. Math. 7, 67–75 (1981)
 *     (gsl_odeiv2_step_rk8pd).
 */
#include <complex.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include <math.h>

#include "core/gsl_guard.h"

#include "deltak/gain.h"
#include "deltak/units.h"

#define ODE_EPSABS 1e-14   /* on the normalised amplitudes q, |q| ≤ 1 */
#define ODE_EPSREL 1e-12
#define ODE_MAX_STEPS 2000000
#define MAX_Z_MM 1e6
#define LAMBDA_RTOL 1e-9   /* 1/λ3 = 1/λ1 + 1/λ2 to this, relative */
#define UM_TO_M 1e-6
#define PM_PER_V_TO_M_PER_V 1e-12
#define GW_PER_CM2_TO_W_PER_M2 1e13
#define PER_M2_TO_PER_CM2 1e-4
#define PER_M_TO_PER_MM 1e-3

static int
positive(double x)
{
    return isfinite(x) && x > 0;
}

dk_status
dk_twm_shg_init(dk_twm *m, double fund_um, double n_fund, double n_sh,
                double deff_pm_per_v, double fund_gw_per_cm2,
                double dk_rad_per_mm, dk_error *err)
{
    if (!positive(fund_um) || !positive(n_fund) || !positive(n_sh) ||
        !isfinite(deff_pm_per_v) ||
        !(isfinite(fund_gw_per_cm2) && fund_gw_per_cm2 >= 0) ||
        !isfinite(dk_rad_per_mm))
        return dk_error_set(err, DK_EINVAL,
                            "SHG needs a positive wavelength (um) and "
                            "indices, finite d_eff (pm/V) and dk (rad/mm), "
                            "intensity >= 0 (GW/cm2)");
    dk_twm_wave half = {fund_um, n_fund, fund_gw_per_cm2 / 2, 0};
    m->wave[0] = half;
    m->wave[1] = half;
    m->wave[2] = (dk_twm_wave){fund_um / 2, n_sh, 0, 0};
    m->deff_pm_per_v = deff_pm_per_v;
    m->dk_rad_per_mm = dk_rad_per_mm;
    return DK_OK;
}

typedef struct twm_rhs {
    double kappa_per_mm; /* K N0^½ */
    double dk_rad_per_mm;
} twm_rhs;

static int
rhs(double z, const double y[], double dydz[], void *p)
{
    const twm_rhs *r = p;
    double complex q1 = y[0] + I * y[1];
    double complex q2 = y[2] + I * y[3];
    double complex q3 = y[4] + I * y[5];
    double complex ph = cexp(I * r->dk_rad_per_mm * z);
    double complex ik = I * r->kappa_per_mm;
    double complex d1 = ik * q3 * conj(q2) * ph;
    double complex d2 = ik * q3 * conj(q1) * ph;
    double complex d3 = ik * q1 * q2 * conj(ph);
    dydz[0] = creal(d1);
    dydz[1] = cimag(d1);
    dydz[2] = creal(d2);
    dydz[3] = cimag(d2);
    dydz[4] = creal(d3);
    dydz[5] = cimag(d3);
    return GSL_SUCCESS;
}

static dk_status
check_model(const dk_twm *m, dk_error *err)
{
    static const char *const name[3] = {"1", "2", "3"};
    for (int j = 0; j < 3; j++) {
        const dk_twm_wave *w = &m->wave[j];
        if (!positive(w->lambda_um) || !positive(w->n))
            return dk_error_set(err, DK_EINVAL,
                                "wave %s needs a positive wavelength (um) "
                                "and index",
                                name[j]);
        if (!(isfinite(w->intensity_gw_per_cm2) &&
              w->intensity_gw_per_cm2 >= 0) ||
            !isfinite(w->phase_rad))
            return dk_error_set(err, DK_EINVAL,
                                "wave %s needs an intensity >= 0 (GW/cm2) "
                                "and a finite phase (rad)",
                                name[j]);
    }
    double s = 1 / m->wave[0].lambda_um + 1 / m->wave[1].lambda_um;
    if (fabs(1 / m->wave[2].lambda_um - s) > LAMBDA_RTOL * s)
        return dk_error_set(err, DK_EINVAL,
                            "wavelengths %.9g, %.9g, %.9g um do not conserve "
                            "energy: 1/lambda3 must equal 1/lambda1 + "
                            "1/lambda2",
                            m->wave[0].lambda_um, m->wave[1].lambda_um,
                            m->wave[2].lambda_um);
    if (!isfinite(m->deff_pm_per_v) || !isfinite(m->dk_rad_per_mm))
        return dk_error_set(err, DK_EINVAL,
                            "d_eff (pm/V) and dk (rad/mm) must be finite");
    return DK_OK;
}

/* Fill one output point from the normalised amplitudes. */
static void
report(const double y[6], double z_mm, double n0_per_m2_s,
       const double omega[3], dk_twm_point *p)
{
    p->z_mm = z_mm;
    for (int j = 0; j < 3; j++) {
        double re = y[2 * j], im = y[2 * j + 1];
        double flux = (re * re + im * im) * n0_per_m2_s; /* 1/(m² s) */
        p->photon_flux_per_cm2_s[j] = flux * PER_M2_TO_PER_CM2;
        p->intensity_gw_per_cm2[j] =
            flux * DK_HBAR_J_S * omega[j] / GW_PER_CM2_TO_W_PER_M2;
        p->phase_rad[j] = (re == 0 && im == 0) ? 0 : atan2(im, re);
    }
}

static dk_status
dk_twm_propagate_impl(const dk_twm *m, const double *z_mm, int nz,
                 dk_twm_point *out, dk_error *err)
{
    dk_status s = check_model(m, err);
    if (s)
        return s;
    if (nz < 1 || !z_mm)
        return dk_error_set(err, DK_EINVAL, "no positions to report");
    for (int k = 0; k < nz; k++)
        if (!(z_mm[k] >= (k ? z_mm[k - 1] : 0) && z_mm[k] <= MAX_Z_MM))
            return dk_error_set(err, DK_EINVAL,
                                "positions must increase from 0 and stay "
                                "below %g mm (position %d is %g)",
                                MAX_Z_MM, k, z_mm[k]);

    const double c = DK_C_M_PER_S;
    double omega[3];
    omega[0] = 2 * M_PI * c / (m->wave[0].lambda_um * UM_TO_M);
    omega[1] = 2 * M_PI * c / (m->wave[1].lambda_um * UM_TO_M);
    omega[2] = omega[0] + omega[1];
    double flux[3], n0 = 0; /* photons / (m² s) */
    for (int j = 0; j < 3; j++) {
        flux[j] = m->wave[j].intensity_gw_per_cm2 * GW_PER_CM2_TO_W_PER_M2 /
                  (DK_HBAR_J_S * omega[j]);
        n0 += flux[j];
    }
    double y[6] = {0};
    if (n0 > 0)
        for (int j = 0; j < 3; j++) {
            double amp = sqrt(flux[j] / n0);
            y[2 * j] = amp * cos(m->wave[j].phase_rad);
            y[2 * j + 1] = amp * sin(m->wave[j].phase_rad);
        }
    double d = m->deff_pm_per_v * PM_PER_V_TO_M_PER_V;
    double nprod = m->wave[0].n * m->wave[1].n * m->wave[2].n;
    double k_si = 2 * d / c *
                  sqrt(DK_HBAR_J_S * omega[0] * omega[1] * omega[2] /
                       (2 * DK_EPS0_F_PER_M * c * nprod));
    twm_rhs r = {k_si * sqrt(n0) * PER_M_TO_PER_MM, m->dk_rad_per_mm};

    double zmax = z_mm[nz - 1];
    if (r.kappa_per_mm == 0 || zmax == 0) {
        /* Nothing couples (or nowhere to go): the input at every z. */
        for (int k = 0; k < nz; k++)
            report(y, z_mm[k], n0, omega, &out[k]);
        return DK_OK;
    }
    /* First step: a small fraction of the shortest length scale. */
    double scale = fmin(zmax, 1 / r.kappa_per_mm);
    if (r.dk_rad_per_mm != 0)
        scale = fmin(scale, 1 / fabs(r.dk_rad_per_mm));
    gsl_odeiv2_system sys = {rhs, NULL, 6, &r};
    gsl_odeiv2_driver *drv = gsl_odeiv2_driver_alloc_y_new(
        &sys, gsl_odeiv2_step_rk8pd, 1e-3 * scale, ODE_EPSABS, ODE_EPSREL);
    if (!drv)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    gsl_odeiv2_driver_set_nmax(drv, ODE_MAX_STEPS);
    double z = 0;
    for (int k = 0; k < nz; k++) {
        if (z_mm[k] > z) {
            int st = gsl_odeiv2_driver_apply(drv, &z, z_mm[k], y);
            if (st != GSL_SUCCESS) {
                gsl_odeiv2_driver_free(drv);
                return dk_error_set(err, DK_ENOCONV,
                                    "coupled-wave integration stopped at "
                                    "z = %g mm: %s",
                                    z, gsl_strerror(st));
            }
        }
        report(y, z_mm[k], n0, omega, &out[k]);
    }
    gsl_odeiv2_driver_free(drv);
    return DK_OK;
}

/* The entry point: GSL's aborting handler off for the call. */
dk_status
dk_twm_propagate(const dk_twm *m, const double *z_mm, int nz,
                 dk_twm_point *out, dk_error *err)
{
    dk_gsl_guard_enter();
    dk_status s = dk_twm_propagate_impl(m, z_mm, nz, out, err);
    dk_gsl_guard_leave();
    return s;
}
