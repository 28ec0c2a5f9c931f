/*
 * test_witness_crystals_a.c - published or observed phase-matching facts
 * that the crystals of group a (LiTaO3, MgO:CLT, KNbO3, ADP, CdGa2S4,
 * CdGeP2, CuGaS2) must reproduce, computed from dk_material_n() values only
 * (closed forms and bisection here; the angle solver is not used).
 *
 * Methods:
 *  - type-I SHG in a negative uniaxial crystal (o + o -> e):
 *      sin²θ = (n_o(ω)⁻² − n_o(2ω)⁻²) / (n_e(2ω)⁻² − n_o(2ω)⁻²);
 *  - noncritical (90°) type-I SHG in a biaxial crystal along a principal
 *    axis: the fundamental wavelength λ at which n_P(λ) = n_Q(λ/2), with P
 *    the fundamental's and Q the harmonic's polarisation axis, by bisection;
 *  - an isotropic point: the λ at which n_o(λ) = n_e(λ), by bisection.
 *
 * Each witness names its source. Values recalled from the literature
 * without the paper at hand say "from memory" and get loose tolerances.
 * The checks marked "file statement" guard what a crystal file asserts in
 * its cautions (computed from its own data, not a published witness).
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/material.h"

typedef struct probe {
    const dk_crystal *c;
    const dk_dispersion_set *set;
    double temp_c;
} probe;

static probe
probe_of(const char *crystal, const char *set, double temp_c)
{
    probe p = {dk_db_find(db, crystal), NULL, temp_c};
    assert_non_null(p.c);
    p.set = dk_crystal_find_set(p.c, set);
    assert_non_null(p.set);
    return p;
}

static double
n_at(const probe *p, char axis, double lambda_um)
{
    double n = NAN;
    unsigned warn = 0;
    dk_error err = {0};
    if (dk_material_n(p->c, p->set, axis, lambda_um, p->temp_c, &n, &warn,
                      &err) != DK_OK) {
        print_error("%s %s axis %c at %g um: %s\n", p->c->id, p->set->name,
                    axis, lambda_um, err.msg);
        fail();
    }
    return n;
}

/* Phase mismatch of noncritical type-I SHG: n_P(λ) − n_Q(λ/2). */
static double
ncpm_mismatch(const probe *p, char fund, char harm, double lam)
{
    return n_at(p, fund, lam) - n_at(p, harm, lam / 2);
}

static double
ncpm_wavelength(const probe *p, char fund, char harm, double lo, double hi)
{
    double flo = ncpm_mismatch(p, fund, harm, lo);
    double fhi = ncpm_mismatch(p, fund, harm, hi);
    assert_true(flo * fhi < 0);
    for (int i = 0; i < 60; i++) {
        double mid = 0.5 * (lo + hi), fm = ncpm_mismatch(p, fund, harm, mid);
        if ((fm < 0) == (flo < 0))
            lo = mid, flo = fm;
        else
            hi = mid;
    }
    return 0.5 * (lo + hi);
}

static double
isotropic_point(const probe *p, double lo, double hi)
{
    double flo = n_at(p, 'o', lo) - n_at(p, 'e', lo);
    assert_true(flo * (n_at(p, 'o', hi) - n_at(p, 'e', hi)) < 0);
    for (int i = 0; i < 60; i++) {
        double mid = 0.5 * (lo + hi), fm = n_at(p, 'o', mid) - n_at(p, 'e', mid);
        if ((fm < 0) == (flo < 0))
            lo = mid, flo = fm;
        else
            hi = mid;
    }
    return 0.5 * (lo + hi);
}

/* Type-I (o + o -> e) SHG angle from the Z axis in degrees, or NAN. */
static double
type1_shg_angle_deg(const probe *p, double lam)
{
    double no1 = n_at(p, 'o', lam), no2 = n_at(p, 'o', lam / 2);
    double ne2 = n_at(p, 'e', lam / 2);
    double s2 = (pow(no1, -2) - pow(no2, -2)) / (pow(ne2, -2) - pow(no2, -2));
    if (!(s2 >= 0 && s2 <= 1))
        return NAN;
    return asin(sqrt(s2)) * 180 / M_PI;
}

/*
 * KNbO3 at room temperature: noncritical type-I SHG with the harmonic
 * polarised along the polar axis c (X here). Along b (Y), fundamental
 * along a (Z): about 0.86 µm, the blue source made by doubling GaAlAs
 * diode lasers; along a (Z), fundamental along b (Y): about 0.98 µm.
 * Both wavelengths are from memory (Biaggio et al., J. Opt. Soc. Am. B 9,
 * 507 (1992), the companion paper to Zysset et al. 1992, and the
 * diode-doubling literature), so the tolerance is 0.01 µm. The two sets
 * give 0.8570 / 0.9820 µm (Zysset1992) and 0.8577 / 0.9831 µm
 * (Umemura1999) at 22 °C, computed independently from the
 * refractiveindex.info copies; they must agree with each other to 2 nm.
 */
static void
knbo3_noncritical_shg(void **state)
{
    (void)state;
    static const char *const sets[] = {"Zysset1992", "Umemura1999"};
    double along_b[2], along_a[2];
    for (int i = 0; i < 2; i++) {
        probe p = probe_of("KNbO3", sets[i], 22);
        /* The frame: n_X < n_Y < n_Z across the range both sets cover. */
        for (double lam = 0.45; lam < 3.4; lam += 0.25) {
            assert_true(n_at(&p, 'X', lam) < n_at(&p, 'Y', lam));
            assert_true(n_at(&p, 'Y', lam) < n_at(&p, 'Z', lam));
        }
        along_b[i] = ncpm_wavelength(&p, 'Z', 'X', 0.82, 1.2);
        along_a[i] = ncpm_wavelength(&p, 'Y', 'X', 0.82, 1.2);
        assert_within(along_b[i], 0.86, 0, 0.01);
        assert_within(along_a[i], 0.98, 0, 0.01);
    }
    assert_within(along_b[0], along_b[1], 0, 0.002);
    assert_within(along_a[0], along_a[1], 0, 0.002);
}

/*
 * ADP: type-I SHG of 1.064 µm at θ ≈ 41.9° (Dmitriev, Gurzadyan,
 * Nikogosyan, Handbook of Nonlinear Optical Crystals; from memory,
 * tolerance 0.5°). Zernike1964 gives 41.74° at 24.8 °C (computed
 * independently from the refractiveindex.info copy). As a relative check,
 * ADP phase-matches at a larger angle than KDP for the same process (KDP
 * about 41.2°, common practice): both sets are Zernike's.
 */
static void
adp_type1_shg_1064(void **state)
{
    (void)state;
    probe adp = probe_of("ADP", NULL, 24.8);
    double theta = type1_shg_angle_deg(&adp, 1.064);
    assert_within(theta, 41.9, 0, 0.5);
    probe kdp = probe_of("KDP", "Zernike1964", 24.8);
    double theta_kdp = type1_shg_angle_deg(&kdp, 1.064);
    assert_within(theta_kdp, 41.2, 0, 0.5);
    assert_true(theta > theta_kdp);
}

/*
 * CdGa2S4: isotropic point (n_o = n_e) in the blue, about 0.485-0.49 µm,
 * the basis of its narrow-band filters (from memory, low confidence;
 * tolerance 0.005 µm). Kato2017 puts it at 0.4883 µm (computed
 * independently from the refractiveindex.info copy), just below the fitted
 * range that starts at 0.49 µm.
 */
static void
cdga2s4_isotropic_point(void **state)
{
    (void)state;
    probe p = probe_of("CdGa2S4", NULL, 20);
    assert_within(isotropic_point(&p, 0.45, 0.6), 0.4875, 0, 0.005);
}

/*
 * File statements (not published witnesses): the cautions of cdga2s4.yaml,
 * cdgep2.yaml and cugas2.yaml say type-I SHG cannot be phase-matched in
 * their fitted ranges; cugas2.yaml states its isotropic point (0.656 µm at
 * 20 °C, 0.668 µm at 120 °C, computed independently from the
 * refractiveindex.info copies of Bhar & Ghosh's coefficients).
 */
static void
chalcopyrite_statements(void **state)
{
    (void)state;
    probe cgs4 = probe_of("CdGa2S4", NULL, 20);
    for (double lam = 0.98; lam <= 7.5; lam += 0.02) {
        /* o + o -> e needs n_o(ω) >= n_e(2ω); e + e -> o n_e(ω) >= n_o(2ω). */
        assert_true(n_at(&cgs4, 'o', lam) < n_at(&cgs4, 'e', lam / 2));
        assert_true(n_at(&cgs4, 'e', lam) < n_at(&cgs4, 'o', lam / 2));
    }
    for (int k = 0; k < 2; k++) {
        probe cgp = probe_of("CdGeP2", NULL, k ? 118 : 20);
        for (double lam = 1.6; lam <= 12.5; lam += 0.05)
            assert_true(n_at(&cgp, 'e', lam) < n_at(&cgp, 'o', lam / 2));
        probe cus = probe_of("CuGaS2", NULL, k ? 120 : 20);
        for (double lam = 1.1; lam <= 11.5; lam += 0.05) {
            assert_true(n_at(&cus, 'o', lam) < n_at(&cus, 'e', lam / 2));
            assert_true(n_at(&cus, 'e', lam) < n_at(&cus, 'o', lam / 2));
        }
        assert_within(isotropic_point(&cus, 0.56, 1.0), k ? 0.668 : 0.656, 0,
                      0.001);
    }
}

/*
 * The two-temperature sets: between 20 °C and 118 / 120 °C the index
 * moves monotonically (the linear interpolation of the coefficients must
 * not overshoot either published end), checked on both axes.
 */
static void
chalcopyrite_interpolation_monotonic(void **state)
{
    (void)state;
    static const struct {
        const char *crystal;
        double t_hi, lam;
    } cases[] = {{"CdGeP2", 118, 0.85}, {"CdGeP2", 118, 5.0},
                 {"CuGaS2", 120, 0.6},  {"CuGaS2", 120, 5.0}};
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
        for (const char *ax = "oe"; *ax; ax++) {
            double prev = -1;
            for (double t = 20; t <= cases[i].t_hi + 1e-9; t += 7) {
                probe p = probe_of(cases[i].crystal, NULL, t);
                double n = n_at(&p, *ax, cases[i].lam);
                assert_true(n > prev);
                prev = n;
            }
        }
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(knbo3_noncritical_shg),
        cmocka_unit_test(adp_type1_shg_1064),
        cmocka_unit_test(cdga2s4_isotropic_point),
        cmocka_unit_test(chalcopyrite_statements),
        cmocka_unit_test(chalcopyrite_interpolation_monotonic),
    };
    return cmocka_run_group_tests_name("witness_crystals_a", tests, db_setup,
                                       db_teardown);
}
