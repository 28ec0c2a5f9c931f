/*
 * test_tolerance.c - acceptance widths (deltak/acceptance.h,
 * deltak/tolerance.h): the mathematics of sinc², closed forms, scaling
 * with length, and values handbooks quote.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/group.h"
#include "deltak/material.h"
#include "deltak/tolerance.h"
#include "design/design_fast.h"

#define DEG (M_PI / 180)
#define U2 (2 * DK_SINC2_HALF_U)   /* 2.78311: |Δk| L at half maximum */

static double
lin(double x, void *p)
{
    return *(double *)p * (x - 3.0);
}

static double
quad(double x, void *p)
{
    return *(double *)p * (x - 3.0) * (x - 3.0);
}

/* sinc²(u) = 1/2 at u = 1.39156; a linear Δk = a(x − x0) has the exact
 * width 2·2.78311/(L a); a quadratic one b(x − x0)² has 2√(2.78311/(L b))
 * (algebra of sinc², Boyd §2.3). */
static void
mathematics(void **state)
{
    (void)state;
    assert_within(dk_sinc2(2 * DK_SINC2_HALF_U / 1000, 1000), 0.5, 0, 1e-15);
    assert_within(dk_sinc2(0, 1000), 1, 0, 1e-15);
    double a = 0.37, b = 0.021, L = 2500;
    dk_acceptance acc;
    assert_int_equal(dk_acceptance_fwhm(lin, &a, 3.0, L, 1e-3, -100, 100,
                                        &acc, NULL),
                     DK_OK);
    assert_true(acc.bounded);
    assert_within(acc.fwhm, 2 * U2 / (L * a), 1e-9, 0);
    assert_within(acc.linear_fwhm, acc.fwhm, 1e-6, 0);
    assert_int_equal(dk_acceptance_fwhm(quad, &b, 3.0, L, 1e-3, -100, 100,
                                        &acc, NULL),
                     DK_OK);
    assert_within(acc.fwhm, 2 * sqrt(U2 / (L * b)), 1e-9, 0);
    assert_within(acc.quadratic_fwhm, acc.fwhm, 1e-4, 0);
    assert_true(!isfinite(acc.linear_fwhm) || acc.linear_fwhm > 1e3);
    /* Off the peak by a little, the peak is found again. */
    assert_int_equal(dk_acceptance_fwhm(lin, &a, 3.0005, L, 1e-3, -100, 100,
                                        &acc, NULL),
                     DK_OK);
    assert_within(acc.peak, 3.0, 0, 1e-9);
    assert_int_equal(dk_acceptance_fwhm(lin, &a, 3.0, -1, 1e-3, -100, 100,
                                        &acc, NULL),
                     DK_EINVAL);
}

/* Designs live in static storage: each is about 20 kB. */
static dk_design pool[4];

static dk_design *
angle_design(int slot, const char *crystal, const char *set, double fund,
             const char *pol, double temp, double length_mm)
{
    dk_design *d = &pool[slot];
    dk_design_request rq;
    dk_design_request_init(&rq);
    rq.crystal = dk_db_find(db, crystal);
    rq.set_name = set;
    rq.waves = dk_waves_shg(fund);
    rq.shg = 1;
    rq.temp_c = temp;
    rq.pol = pol;
    rq.scheme = DK_SCHEME_ANGLE;
    rq.length_mm = length_mm;
    /* Biaxial crystals here: the XY-plane solution. */
    if (rq.crystal->optical_class == DK_BIAXIAL)
        rq.plane = "XY";
    dk_error err = {0};
    if (dk_design_resolve(&rq, d, &err))
        fail_msg("%s", err.msg);
    return d;
}

static dk_design *
qpm_design(int slot, const char *crystal, double fund, double temp,
           double length_mm)
{
    dk_design *d = &pool[slot];
    test_design(d, crystal, dk_db_find(db, crystal)->sets[0].name,
                dk_waves_shg(fund), 1, temp, NULL, DK_SCHEME_QPM, length_mm);
    return d;
}

static double
width(dk_design *d, dk_tol_param p)
{
    dk_acceptance a;
    dk_error err = {0};
    if (dk_design_tolerance(d, p, &a, &err))
        fail_msg("%s", err.msg);
    assert_true(a.bounded);
    /* At the operating point the curve peaks at 1. */
    assert_within(dk_sinc2(dk_design_delta_k(d, p, a.peak),
                           d->length_mm * 1e3),
                  1, 0, 1e-9);
    return a.fwhm;
}

/* BBO type-I SHG of 1064 nm: Δθ = 2·2.78311 / (L |dΔk/dθ|) with
 * dΔk/dθ = (4π/λ) dn_e(θ)/dθ, dn_e/dθ = −(n_e(θ)³/2)(n_e⁻² − n_o⁻²) sin 2θ
 * at the harmonic (Dmitriev et al., Handbook (1999), eq. 1.6 differentiated;
 * hand algebra). Walk-off does not enter Δk. */
static void
bbo_angular_closed_form(void **state)
{
    (void)state;
    dk_design *d = angle_design(0, "BBO", "Tamosauskas2018", 1.064, "ooe", 25,
                                10);
    const dk_crystal *c = d->crystal;
    dk_index_value vo, ve;
    dk_material_index(c, d->set, 'o', 0.532, 25, &vo, NULL);
    dk_material_index(c, d->set, 'e', 0.532, 25, &ve, NULL);
    double th = d->theta_rad;
    double inv = cos(th) * cos(th) / (vo.n * vo.n) +
                 sin(th) * sin(th) / (ve.n * ve.n);
    double nth = 1 / sqrt(inv);
    double dn = -0.5 * nth * nth * nth *
                (1 / (ve.n * ve.n) - 1 / (vo.n * vo.n)) * sin(2 * th);
    double want = 2 * U2 / (1e4 * 4 * M_PI / 1.064 * fabs(dn));
    assert_within(width(d, DK_TOL_THETA), want, 1e-3, 0);
    /* Handbooks quote about 0.5 mrad·cm, internal (from memory). */
    assert_within(width(d, DK_TOL_THETA) * 1e3, 0.5, 0, 0.1);
}

/* SHG spectral width from the group indices: dΔk/dω = (2/c)(n_g(2ω) −
 * n_g(ω)), so Δλ = λ²·2·2.78311 / (2π L · 2|n_g(2ω) − n_g(ω)|)
 * (standard GVM argument; hand algebra), here for congruent PPLN. */
static void
spectral_width_from_group_index(void **state)
{
    (void)state;
    dk_design *d = qpm_design(0, "LN", 1.55, 150, 10);
    const dk_crystal *c = d->crystal;
    dk_index_value v1, v2;
    dk_material_index(c, &c->sets[0], 'e', 1.55, 150, &v1, NULL);
    dk_material_index(c, &c->sets[0], 'e', 0.775, 150, &v2, NULL);
    double ng1 = dk_group_index(1.55, v1.n, v1.dn_dl);
    double ng2 = dk_group_index(0.775, v2.n, v2.dn_dl);
    double want = 1.55 * 1.55 * 2 * U2 / (2 * M_PI * 1e4 * 2 * fabs(ng2 - ng1));
    assert_within(width(d, DK_TOL_SIGNAL), want, 2e-3, 0);
    /* 1550 nm SHG in 1 cm of PPLN: about 1.1 nm and 6-7 C acceptance
     * (the usual numbers for telecom PPLN doublers; from memory). */
    assert_within(width(d, DK_TOL_SIGNAL) * 1e3, 1.1, 0, 0.2);
    assert_within(width(d, DK_TOL_TEMPERATURE), 6.5, 0, 1.5);
}

/* Critical widths scale as 1/L, noncritical ones as 1/√L. */
static void
length_scaling(void **state)
{
    (void)state;
    dk_design *a = angle_design(0, "BBO", "Tamosauskas2018", 1.064, "ooe", 25,
                                5);
    dk_design *b = angle_design(1, "BBO", "Tamosauskas2018", 1.064, "ooe", 25,
                                20);
    assert_within(width(a, DK_TOL_THETA) / width(b, DK_TOL_THETA), 4, 1e-4,
                  0);
    dk_design *k1 = angle_design(2, "KTP", "KatoTakaoka2002", 1.064, "sff",
                                 25, 5);
    dk_design *k2 = angle_design(3, "KTP", "KatoTakaoka2002", 1.064, "sff",
                                 25, 20);
    /* θ = 90° in the XY plane is noncritical in θ. */
    assert_within(width(k1, DK_TOL_THETA) / width(k2, DK_TOL_THETA), 2,
                  2e-3, 0);
    assert_within(width(k1, DK_TOL_PHI) / width(k2, DK_TOL_PHI), 4, 1e-3, 0);
}

/* KTP type-II SHG of 1064 nm in the XY plane: ΔT·l ≈ 20-25 C·cm,
 * Δφ·l ≈ 9-10 mrad·cm, Δθ·l^1/2 ≈ 45-55 mrad·cm^1/2 (Dmitriev et al.,
 * Handbook (1999), KTP table; from memory, so loose). */
static void
ktp_handbook(void **state)
{
    (void)state;
    dk_design *d = angle_design(0, "KTP", "KatoTakaoka2002", 1.064, "sff", 25,
                                10);
    assert_within(width(d, DK_TOL_TEMPERATURE), 22.5, 0, 5);
    assert_within(width(d, DK_TOL_PHI) * 1e3, 9.5, 0, 2.5);
    assert_within(width(d, DK_TOL_THETA) * 1e3, 50, 0, 10);
    dk_acceptance a;
    assert_int_equal(dk_design_tolerance(d, DK_TOL_PERIOD, &a, NULL),
                     DK_EINVAL);
    dk_design *u = angle_design(1, "BBO", "Tamosauskas2018", 1.064, "ooe", 25,
                                10);
    assert_int_equal(dk_design_tolerance(u, DK_TOL_PHI, &a, NULL),
                     DK_EINVAL);
}

/* Per-length products and frequency widths. A critical width (first-
 * order estimate within 20 %) scales as 1/L and is quoted × L; a
 * noncritical one (Δk' = 0, no first-order estimate) as 1/√L, × √L. The
 * frequency width of 1.0-1.1 um: 299.792458 THz - 272.538598 THz =
 * 27.253860 THz (c = 299792458 m/s, exact). */
static void
per_length_and_thz(void **state)
{
    (void)state;
    dk_acceptance crit = {.fwhm = 2.0, .linear_fwhm = 2.1};
    dk_acceptance noncrit = {.fwhm = 2.0, .linear_fwhm = INFINITY};
    dk_acceptance far = {.fwhm = 2.0, .linear_fwhm = 3.0};
    int root = -1;
    assert_within(dk_acceptance_per_length(&crit, 4, &root), 8, 0, 1e-15);
    assert_int_equal(root, 0);
    assert_within(dk_acceptance_per_length(&noncrit, 4, &root), 4, 0, 1e-15);
    assert_int_equal(root, 1);
    assert_within(dk_acceptance_per_length(&far, 4, NULL), 4, 0, 1e-15);
    assert_true(isnan(dk_acceptance_per_length(&crit, 0, NULL)));
    assert_true(isnan(dk_acceptance_per_length(&crit, NAN, NULL)));
    assert_within(dk_interval_thz(1.0, 1.1), 27.253859818, 0, 1e-8);
    assert_within(dk_interval_thz(1.1, 1.0), 27.253859818, 0, 1e-8);
    assert_true(isnan(dk_interval_thz(0, 1.0)));
    assert_true(isnan(dk_interval_thz(1.0, -1)));
}

/* The compiled evaluator the acceptance searches use (design_fast.h)
 * gives the bits of dk_design_delta_k() along every parameter it serves:
 * uniaxial, biaxial off the principal axes, noncollinear and QPM designs,
 * at the operating point and away from it (a change of arithmetic in one
 * path and not the other fails here). */
static void
compiled_design_same_bits(void **state)
{
    (void)state;
    dk_design *d[4];
    d[0] = angle_design(0, "BBO", "Tamosauskas2018", 1.064, "ooe", 25, 5);
    d[1] = angle_design(1, "KTP", "KatoTakaoka2002", 1.064, "sff", 40, 5);
    d[2] = qpm_design(2, "MgO:LN", 1.55, 120, 10);
    dk_design_request rq;
    dk_design_request_init(&rq);
    rq.crystal = dk_db_find(db, "BBO");
    rq.waves = (dk_waves){.pump_um = 0.4, .signal_um = 0.65};
    rq.waves.idler_um = dk_third_wave_um(0.4, 0.65);
    rq.temp_c = 25;
    rq.pol = "ooe";
    rq.scheme = DK_SCHEME_ANGLE;
    rq.alpha_rad = 3.7 * DEG;
    rq.length_mm = 2;
    d[3] = &pool[3];
    dk_error err = {0};
    if (dk_design_resolve(&rq, d[3], &err))
        fail_msg("%s", err.msg);
    const dk_tol_param ps[] = {DK_TOL_TEMPERATURE, DK_TOL_SIGNAL,
                               DK_TOL_PUMP, DK_TOL_THETA, DK_TOL_PHI};
    const double rel[] = {-0.3, -0.01, 0, 1e-4, 0.02};
    int compared = 0;
    for (int k = 0; k < 4; k++)
        for (size_t j = 0; j < sizeof ps / sizeof ps[0]; j++) {
            if (!dk_design_applies(d[k], ps[j]))
                continue;
            double x0 = dk_design_operating_value(d[k], ps[j]);
            for (size_t r = 0; r < sizeof rel / sizeof rel[0]; r++) {
                double x = ps[j] == DK_TOL_TEMPERATURE ? x0 + 100 * rel[r]
                                                       : x0 * (1 + rel[r]);
                double t = ps[j] == DK_TOL_TEMPERATURE ? x : d[k]->temp_c;
                dk_design_fast f;
                dk_design_fast_init(&f, d[k], t);
                assert_true(f.ready);
                dk_waves w = d[k]->waves;
                if (ps[j] == DK_TOL_SIGNAL)
                    w = d[k]->shg ? dk_waves_shg(x) : w, w.signal_um = x;
                if (ps[j] == DK_TOL_PUMP)
                    w.pump_um = x;
                if (!d[k]->shg)
                    w.idler_um = dk_third_wave_um(w.pump_um, w.signal_um);
                double fast = dk_design_fast_dk(
                    &f, &w, ps[j] == DK_TOL_THETA ? x : d[k]->theta_rad,
                    ps[j] == DK_TOL_PHI ? x : d[k]->phi_rad);
                double slow = dk_design_delta_k(d[k], ps[j], x);
                if (memcmp(&fast, &slow, sizeof fast) != 0)
                    fail_msg("design %d, parameter %d at %.9g: compiled "
                             "%.17g, general %.17g",
                             k, (int)ps[j], x, fast, slow);
                assert_true(isfinite(fast));
                compared++;
            }
        }
    assert_true(compared >= 50);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(mathematics),
        cmocka_unit_test(per_length_and_thz),
        cmocka_unit_test(bbo_angular_closed_form),
        cmocka_unit_test(spectral_width_from_group_index),
        cmocka_unit_test(length_scaling),
        cmocka_unit_test(ktp_handbook),
        cmocka_unit_test(compiled_design_same_bits),
    };
    return cmocka_run_group_tests_name("tolerance", tests, db_setup, db_teardown);
}
