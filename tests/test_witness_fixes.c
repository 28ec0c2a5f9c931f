/*
 * test_witness_fixes.c - the published witnesses of the data sets entered
 * or corrected under issue 12, computed from refractive indices alone
 * (dk_material_index), with no use of the phase-matching solvers: the
 * solvers are checked elsewhere, these check the data.
 *
 * Methods: collinear phase matching Δk = 0 for plane waves; noncritical
 * temperatures and wavelengths by bisection; angles from the closed forms
 * for a uniaxial crystal and for a principal plane of a biaxial crystal,
 *   1/n(θ)² = cos²θ/n_o² + sin²θ/n_e²   (Born & Wolf, Principles of
 *   Optics, §15.3);
 * first-order QPM period Λ = 1/|n_p/λp − n_s/λs − n_i/λi| (Fejer et al.,
 * IEEE J. Quantum Electron. 28, 2631 (1992)).
 *
 * Each witness names its source beside it; the expected numbers are those
 * of shared/reference/crystal-data-resolved.md, recomputed there from the
 * coefficients as printed (nothing fitted), and the published or observed
 * values they stand for.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/material.h"
#include "deltak/nonlinear.h"

#define DEG (M_PI / 180)

static const dk_crystal *
crystal(const char *name)
{
    const dk_crystal *c = dk_db_find(db, name);
    assert_non_null(c);
    return c;
}

static const dk_dispersion_set *
set_of(const dk_crystal *c, const char *name)
{
    const dk_dispersion_set *s = dk_crystal_find_set(c, name);
    assert_non_null(s);
    return s;
}

/* n from the database with its range rules (transparency is an error). */
static double
n_at(const dk_crystal *c, const dk_dispersion_set *s, char axis, double lam,
     double t)
{
    dk_index_value v;
    dk_error err = {0};
    if (dk_material_index(c, s, axis, lam, t, &v, &err) != DK_OK) {
        print_error("%s\n", err.msg);
        fail();
    }
    return v.n;
}

typedef double (*fn1)(const void *ctx, double x);

/* A root of f in [a, b], where f changes sign, by bisection to 1e-10. */
static double
bisect(fn1 f, const void *ctx, double a, double b)
{
    double fa = f(ctx, a), fb = f(ctx, b);
    assert_true(fa * fb < 0);
    for (int i = 0; i < 200 && b - a > 1e-10; i++) {
        double m = 0.5 * (a + b), fm = f(ctx, m);
        if (fa * fm <= 0)
            b = m;
        else
            a = m, fa = fm;
    }
    return 0.5 * (a + b);
}

/* ---- LiB3O5 (crystal-data-resolved §1) ---- */

typedef struct shg_ctx {
    const dk_crystal *c;
    const dk_dispersion_set *s;
    double lam;   /* fundamental, µm */
} shg_ctx;

/* Type-I SHG along X: Z-polarized fundamental, Y-polarized harmonic. */
static double
lbo_x_mismatch(const void *p, double t)
{
    const shg_ctx *x = p;
    return n_at(x->c, x->s, 'Z', x->lam, t) -
           n_at(x->c, x->s, 'Y', x->lam / 2, t);
}

static double
lbo_ncpm(const char *set, double lam)
{
    const dk_crystal *c = crystal("LBO");
    shg_ctx x = {c, set_of(c, set), lam};
    return bisect(lbo_x_mismatch, &x, -20, 300);
}

static void
lbo_noncritical_shg(void **state)
{
    (void)state;
    /* Kato, IEEE JQE 30, 2950 (1994) with the ΔT² factors: 149.15 C;
     * observed 148-149 C (common practice). Kato, Grechin, Umemura, Laser
     * Phys. 28, 095403 (2018): 149.21 C. */
    double t94 = lbo_ncpm("Kato1994", 1.064);
    double t18 = lbo_ncpm("Kato2018", 1.064);
    print_message("LBO NCPM SHG 1064: Kato1994 %.3f C, Kato2018 %.3f C\n",
                  t94, t18);
    assert_within(t94, 149.15, 0, 0.01);
    assert_within(t18, 149.21, 0, 0.01);

    /* The default LBO set depends on T and meets 149 ± 2 C (issue 12). */
    const dk_crystal *c = crystal("LBO");
    const char *why = NULL;
    const dk_dispersion_set *d = dk_crystal_default_set(c, DK_USE_ANGLE,
                                                        &why);
    assert_true(dk_set_has_temperature(d));
    assert_string_not_equal(why, "first set in the file");
    assert_within(lbo_ncpm(d->name, 1.064), 149, 0, 2);

    /* Kato 1994's noncritical table, 1.000 ... 1.200 um (resolved §1). */
    static const double lam[] = {1.000, 1.030, 1.047, 1.053, 1.100, 1.200};
    static const double want[] = {238.5, 194.2, 171.0, 163.1, 107.6, 26.7};
    for (int i = 0; i < 6; i++)
        assert_within(lbo_ncpm("Kato1994", lam[i]), want[i], 0, 0.05);
    /* The two sets differ by 8 C at 1.030 um (194.2 vs 202.3 C). */
    assert_within(lbo_ncpm("Kato2018", 1.030), 202.3, 0, 0.05);
}

static void
lbo_xy_plane_angle(void **state)
{
    (void)state;
    /* Type-I SHG of 1064 nm in the XY plane at 20 C: Z-polarized
     * fundamental, harmonic polarized in the plane with
     * 1/n² = sin²φ/n_X² + cos²φ/n_Y². φ = 11.61° (resolved §1; observed
     * about 11.6°, common practice). */
    const dk_crystal *c = crystal("LBO");
    const dk_dispersion_set *s = set_of(c, "Kato1994");
    double nz = n_at(c, s, 'Z', 1.064, 20);
    double nx = n_at(c, s, 'X', 0.532, 20), ny = n_at(c, s, 'Y', 0.532, 20);
    double s2 = (1 / (nz * nz) - 1 / (ny * ny)) /
                (1 / (nx * nx) - 1 / (ny * ny));
    double phi = asin(sqrt(s2)) / DEG;
    print_message("LBO XY-plane type-I SHG 1064 at 20 C: phi = %.3f deg\n",
                  phi);
    assert_within(phi, 11.61, 0, 0.01);
}

/* ---- KTiOPO4 type-II QPM (resolved §9) ---- */

/* |Λ| in µm for signal Y, idler Z, pump Y, beam along X, no expansion. */
static double
ktp_yzy_period(const dk_dispersion_set *s, double lp, double t)
{
    const dk_crystal *c = crystal("KTP");
    double ls = 2 * lp, li = 2 * lp;
    double dk = n_at(c, s, 'Y', lp, t) / lp - n_at(c, s, 'Y', ls, t) / ls -
                n_at(c, s, 'Z', li, t) / li;
    return 1 / fabs(dk);
}

static void
ktp_type2_period_with_qpm_default(void **state)
{
    (void)state;
    const dk_crystal *c = crystal("PPKTP");
    const char *why = NULL;
    const dk_dispersion_set *q = dk_crystal_default_set(c, DK_USE_QPM, &why);
    const dk_dispersion_set *a = dk_crystal_default_set(c, DK_USE_ANGLE,
                                                        NULL);
    assert_string_equal(q->name, "Fradkin1999");
    assert_non_null(strstr(why, "46.22"));
    assert_ptr_equal(a, &c->sets[0]);
    /* Degenerate 775 -> 1550 nm at 25 C: about 46.1-46.2 um in use
     * (common practice); 46.22 um with Fradkin + König-Wong, 45.03 um with
     * Kato-Takaoka (resolved §9). */
    double lq = ktp_yzy_period(q, 0.775, 25), la = ktp_yzy_period(a, 0.775,
                                                                 25);
    print_message("PPKTP type II 775 -> 1550 nm at 25 C: %.3f um (QPM "
                  "default %s), %.3f um (%s)\n",
                  lq, q->name, la, a->name);
    assert_within(lq, 46.1, 0, 0.3);
    assert_within(lq, 46.22, 0, 0.01);
    assert_within(la, 45.03, 0, 0.01);
    /* 405 -> 810 nm: both about 10.0-10.1 um (resolved §9). */
    assert_within(ktp_yzy_period(q, 0.405, 25), 10.05, 0, 0.06);
    assert_within(ktp_yzy_period(a, 0.405, 25), 10.05, 0, 0.06);
}

/* ---- CdSiP2 (resolved §2) ---- */

typedef struct csp_ctx {
    const dk_crystal *c;
    const dk_dispersion_set *s;
    double lam, t;
} csp_ctx;

static double
csp_ne_theta(const csp_ctx *x, double lam, double th)
{
    double no = n_at(x->c, x->s, 'o', lam, x->t);
    double ne = n_at(x->c, x->s, 'e', lam, x->t);
    return 1 / sqrt(cos(th) * cos(th) / (no * no) +
                    sin(th) * sin(th) / (ne * ne));
}

static double
csp_birefringence(const void *p, double lam)
{
    const csp_ctx *x = p;
    return n_at(x->c, x->s, 'o', lam, x->t) -
           n_at(x->c, x->s, 'e', lam, x->t);
}

/* Type II e + o -> e SHG mismatch at angle th. */
static double
csp_type2(const void *p, double th)
{
    const csp_ctx *x = p;
    return 0.5 * (csp_ne_theta(x, x->lam, th) +
                  n_at(x->c, x->s, 'o', x->lam, x->t)) -
           csp_ne_theta(x, x->lam / 2, th);
}

/* Noncritical OPO, pump e (θ = 90°) at x->lam, signal and idler o. */
static double
csp_opo(const void *p, double li)
{
    const csp_ctx *x = p;
    double lp = x->lam, ls = 1 / (1 / lp - 1 / li);
    return n_at(x->c, x->s, 'e', lp, x->t) / lp -
           n_at(x->c, x->s, 'o', ls, x->t) / ls -
           n_at(x->c, x->s, 'o', li, x->t) / li;
}

static void
cdsip2_witnesses(void **state)
{
    (void)state;
    /* Kato, Umemura, Petrov, J. Appl. Phys. 109, 116104 (2011), as
     * recomputed in resolved §2; the paper's own values in brackets. */
    const dk_crystal *c = crystal("CSP");
    csp_ctx x = {c, set_of(c, "Kato2011"), 0, 25};
    assert_ptr_equal(x.s, dk_crystal_default_set(c, DK_USE_ANGLE, NULL));

    /* Isotropic point n_o = n_e: 0.5143 um. */
    double iso = bisect(csp_birefringence, &x, 0.505, 0.6);
    assert_within(iso, 0.5143, 0, 0.0001);

    /* Type-I (o + o -> e) SHG of 4.7846 um: 43.14° (paper 43.13°). */
    double lf = 4.7846;
    double no1 = n_at(c, x.s, 'o', lf, 25), no2 = n_at(c, x.s, 'o', lf / 2, 25);
    double ne2 = n_at(c, x.s, 'e', lf / 2, 25);
    double s2 = (1 / (no1 * no1) - 1 / (no2 * no2)) /
                (1 / (ne2 * ne2) - 1 / (no2 * no2));
    double th1 = asin(sqrt(s2)) / DEG;
    assert_within(th1, 43.14, 0, 0.01);

    /* Type-II (e + o -> e) SHG of 5.2955 um: 76.45° (paper 76.47°). */
    x.lam = 5.2955;
    double th2 = bisect(csp_type2, &x, 30 * DEG, 89.9 * DEG) / DEG;
    assert_within(th2, 76.45, 0, 0.01);

    /* 1064-pumped noncritical OPO: idler 6.117 um at 20 C, 6.133 um at
     * 25 C, signal 1.288 um (published about 6.2 um, from memory). */
    x.lam = 1.064;
    x.t = 20;
    double li20 = bisect(csp_opo, &x, 4.0, 8.0);
    x.t = 25;
    double li25 = bisect(csp_opo, &x, 4.0, 8.0);
    print_message("CdSiP2: isotropic %.4f um, type I %.3f deg, type II "
                  "%.3f deg, NCPM idler %.4f um (20 C), %.4f um (25 C)\n",
                  iso, th1, th2, li20, li25);
    assert_within(li20, 6.117, 0, 0.001);
    assert_within(li25, 6.133, 0, 0.001);
    assert_within(1 / (1 / 1.064 - 1 / li25), 1.288, 0, 0.001);
}

/* ---- MgO:SLT SHG 1064 (resolved §3) ---- */

static void
mgo_slt_shg_periods(void **state)
{
    (void)state;
    /* First-order QPM SHG of 1.064 um, e + e -> e, without thermal
     * expansion; periods in use 7.9-8.0 um near room temperature. */
    const dk_crystal *c = crystal("MgO:SLT");
    static const double t[] = {25, 40, 60, 80, 100};
    static const struct {
        const char *set;
        double period[5];
    } rows[] = {
        {"Bruner2003", {8.030, 8.003, 7.964, 7.924, 7.882}},
        {"Dolev2009", {8.012, 7.985, 7.948, 7.909, 7.869}},
    };
    for (int r = 0; r < 2; r++) {
        const dk_dispersion_set *s = set_of(c, rows[r].set);
        for (int i = 0; i < 5; i++) {
            double dk = n_at(c, s, 'e', 0.532, t[i]) / 0.532 -
                        2 * n_at(c, s, 'e', 1.064, t[i]) / 1.064;
            assert_within(1 / dk, rows[r].period[i], 0, 0.0006);
        }
    }
    /* Dolev has both axes (type-I and type-II QPM need n_o). */
    assert_non_null(dk_set_find_axis(set_of(c, "Dolev2009"), 'o'));
    assert_within(dk_crystal_expansion_factor(c, 0, 100), 1 + 1.6e-5 * 75,
                  1e-15, 0);
}

/* ---- GaP (resolved §4) ---- */

static void
gap_wei_against_bond(void **state)
{
    (void)state;
    const dk_crystal *c = crystal("GaP");
    const dk_dispersion_set *s = dk_crystal_default_set(c, DK_USE_ANGLE,
                                                        NULL);
    assert_string_equal(s->name, "Wei2018");
    assert_false(s->from_memory);
    /* n(1.0 um, 293.15 K) = 3.1173; Bond, J. Appl. Phys. 36, 1674 (1965)
     * (refractiveindex.info GaP/nk/Bond.yml) has 3.1192, 1.93e-3 higher,
     * the largest difference from 0.6 to 4 um ("within 1.9e-3", resolved
     * §4; the other Bond points are in index-checks-fixes.tsv). */
    double n = n_at(c, s, 'n', 1.0, 20);
    assert_within(n, 3.1173, 0, 0.0001);
    assert_within(n, 3.1192, 0, 0.002);
    /* The kelvin trap: the set must not read T in °C as kelvin (that
     * would put n about 0.03 lower); dn/dT about 1.3e-4 /K at 1.064 um. */
    dk_index_value v;
    assert_int_equal(dk_material_index(c, s, 'n', 1.064, 20, &v, NULL),
                     DK_OK);
    assert_within(v.dn_dt, 1.34e-4, 0, 0.03e-4);
}

/* ---- AgGaSe2 Bhar 1976 with C5 = 1600 (resolved §5) ---- */

static double
ooe_angle(const char *crys, const char *set, double lf, double t)
{
    const dk_crystal *c = crystal(crys);
    const dk_dispersion_set *s = set_of(c, set);
    double no1 = n_at(c, s, 'o', lf, t), no2 = n_at(c, s, 'o', lf / 2, t);
    double ne2 = n_at(c, s, 'e', lf / 2, t);
    return asin(sqrt((1 / (no1 * no1) - 1 / (no2 * no2)) /
                     (1 / (ne2 * ne2) - 1 / (no2 * no2)))) /
           DEG;
}

static void
aggase2_co2_shg(void **state)
{
    (void)state;
    /* Type-I SHG of the 10.591 um CO2 line: Bhar 57.03°, Kato 2021
     * 55.50° (resolved §5; about 55° commonly quoted, from memory). */
    double b = ooe_angle("AgGaSe2", "Bhar1976", 10.591, 20);
    double k = ooe_angle("AgGaSe2", "Kato2021", 10.591, 21);
    print_message("AgGaSe2 SHG 10.591 um: Bhar1976 %.3f deg, Kato2021 "
                  "%.3f deg\n", b, k);
    assert_within(b, 57.03, 0, 0.01);
    assert_within(k, 55.50, 0, 0.01);
}

/* ---- Miller's rule ---- */

static void
miller_rule(void **state)
{
    (void)state;
    /* Definition: Π(n_k² − 1) over Π(n_k² − 1). n = 2, 2, 3 → 3·3·8 = 72;
     * n = √2 ×3 → 1; ratio 72 (hand computation). */
    const double a[3] = {2, 2, 3}, one[3] = {sqrt(2), sqrt(2), sqrt(2)};
    assert_within(dk_miller_factor(a, one), 72, 1e-12, 0);
    assert_within(dk_miller_factor(one, a), 1.0 / 72, 1e-12, 0);
    const double bad[3] = {2, 1.0, 2}, nan3[3] = {2, NAN, 2};
    assert_true(isnan(dk_miller_factor(bad, a)));
    assert_true(isnan(dk_miller_factor(a, bad)));
    assert_true(isnan(dk_miller_factor(nan3, a)));

    /* GaAs d14: Shoji et al., JOSA B 14, 2268 (1997) give 170 pm/V for
     * SHG of 1.064 um and 119 pm/V for SHG of 1.533 um. The harmonics
     * (0.532, 0.7665 um) lie above the band gap, outside the Skauli 2003
     * fit, so their indices are the ellipsometric values of D. E. Aspnes,
     * A. A. Studna, Phys. Rev. B 27, 985 (1983): n = 4.13 at 0.532 um and
     * 3.68 at 0.7665 um (from memory). Miller's rule gives 116.8 pm/V,
     * 1.8 % below the measured 119: close, though the rule is only a guide
     * this near the gap. */
    const dk_crystal *g = crystal("GaAs");
    const dk_dispersion_set *s = set_of(g, "Skauli2003");
    double n1064 = n_at(g, s, 'n', 1.064, 22), n1533 = n_at(g, s, 'n', 1.533,
                                                           22);
    const double meas[3] = {n1064, n1064, 4.13};
    const double proc[3] = {n1533, n1533, 3.68};
    double d1533 = 170 * dk_miller_factor(proc, meas);
    print_message("GaAs d14 by Miller's rule: 170 pm/V at 1.064 um SHG -> "
                  "%.1f pm/V at 1.533 um SHG (Shoji 1997: 119)\n", d1533);
    assert_within(d1533, 119, 0.05, 0);

    /* The file's own entry, 94 pm/V for SHG of 4.1 um (Skauli et al.,
     * Opt. Lett. 27, 628 (2002), from memory), scaled to SHG of 10.6 um,
     * against 83-86 pm/V measured there (resolved §7): 87.7 pm/V, 2-6 %
     * above. */
    double f = dk_miller_factor(
        (const double[3]){n_at(g, s, 'n', 10.6, 22), n_at(g, s, 'n', 10.6, 22),
                          n_at(g, s, 'n', 5.3, 22)},
        (const double[3]){n_at(g, s, 'n', 4.1, 22), n_at(g, s, 'n', 4.1, 22),
                          n_at(g, s, 'n', 2.05, 22)});
    double d106 = g->d_values[0] * f;
    print_message("GaAs d14 by Miller's rule: %.0f pm/V at %.2f um SHG -> "
                  "%.1f pm/V at 10.6 um SHG (measured 83-86)\n",
                  g->d_values[0], g->nl_wavelength_um, d106);
    assert_within(g->nl_wavelength_um, 4.1, 0, 1e-12);
    assert_within(d106, 84.5, 0.05, 0);

    /* GaP: Shoji 1997 Table 11 gives 70.6 pm/V for SHG of 1.064 um (the
     * harmonic absorbed: resonant) and 36.8 pm/V for SHG of 1.313 um.
     * Miller's rule cannot bridge the resonance: from 70.6 it gives about
     * 59 pm/V at 1.313 um. The index at 0.532 um is the Wei 2018 formula
     * evaluated outside the transparency range (dk_index_n, no range
     * rules), as the crystal file says. */
    const dk_crystal *p = crystal("GaP");
    const dk_dispersion_set *w = set_of(p, "Wei2018");
    const dk_axis_formula *ax = dk_set_find_axis(w, 'n');
    double n1 = n_at(p, w, 'n', 1.064, 20), n2 = dk_index_n(w, ax, 0.532, 20);
    double m1 = n_at(p, w, 'n', 1.313, 20), m2 = n_at(p, w, 'n', 0.6565, 20);
    assert_within(p->nl_wavelength_um, 1.064, 0, 1e-12);
    double d1313 = p->d_values[0] * dk_miller_factor((const double[3]){m1, m1, m2},
                                                     (const double[3]){n1, n1, n2});
    print_message("GaP d14 by Miller's rule: 70.6 pm/V at 1.064 um SHG -> "
                  "%.1f pm/V at 1.313 um SHG (Shoji 1997: 36.8)\n", d1313);
    assert_within(d1313, 59.5, 0, 0.5);
}

/* ---- wavelength cautions ---- */

static void
wavelength_cautions(void **state)
{
    (void)state;
    /* Two-photon absorption of GaSe and AgGaS2 pumped at 800 nm; ZGP
     * below its 2 um absorption edge (common practice). */
    const char *t = dk_crystal_caution_wavelength(crystal("GaSe"), 0.8);
    assert_non_null(t);
    assert_non_null(strstr(t, "two-photon"));
    assert_null(dk_crystal_caution_wavelength(crystal("GaSe"), 2.0));
    t = dk_crystal_caution_wavelength(crystal("AgGaS2"), 0.8);
    assert_non_null(t);
    assert_non_null(strstr(t, "two-photon"));
    assert_null(dk_crystal_caution_wavelength(crystal("AgGaS2"), 1.064));
    assert_non_null(dk_crystal_caution_wavelength(crystal("ZGP"), 1.064));
    assert_null(dk_crystal_caution_wavelength(crystal("ZGP"), 2.09));
    /* The first that applies: two-photon before three-photon in GaAs. */
    t = dk_crystal_caution_wavelength(crystal("GaAs"), 1.55);
    assert_non_null(strstr(t, "two-photon"));
    t = dk_crystal_caution_wavelength(crystal("GaAs"), 2.1);
    assert_non_null(strstr(t, "three-photon"));
    assert_null(dk_crystal_caution_wavelength(crystal("GaAs"), 3.0));
    assert_null(dk_crystal_caution_wavelength(crystal("CSP"), 1.064));
    assert_null(dk_crystal_caution_wavelength(crystal("BBO"), 0.2));
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(lbo_noncritical_shg),
        cmocka_unit_test(lbo_xy_plane_angle),
        cmocka_unit_test(ktp_type2_period_with_qpm_default),
        cmocka_unit_test(cdsip2_witnesses),
        cmocka_unit_test(mgo_slt_shg_periods),
        cmocka_unit_test(gap_wei_against_bond),
        cmocka_unit_test(aggase2_co2_shg),
        cmocka_unit_test(miller_rule),
        cmocka_unit_test(wavelength_cautions),
    };
    return cmocka_run_group_tests_name("witness_fixes", tests, db_setup,
                                       db_teardown);
}
