/*
 * test_batch.c - the fast paths against the general ones they replace in
 * hot loops: the value-only compiled index (src/data/dispersion_batch.h)
 * against the Taylor-arithmetic dk_index_eval() for every axis of every
 * data set in the database; the batch kernel against the scalar value bit
 * for bit; the value-only modes (src/optics/modes_value.h) against
 * dk_modes_at(); and the database loaded for one crystal against the full
 * load. These are internal consistency checks (two independent
 * evaluations of the same published formulas); the formulas themselves
 * are checked against outside sources in test_reference.c.
 */
#define DK_TEST_WITH_DB
#include "testutil.h"

#include <unistd.h>

#include "data/dispersion_batch.h"
#include "deltak/material.h"
#include "deltak/modes.h"
#include "optics/modes_value.h"

/* Wavelengths spread over the set's fitted range (inside the crystal's
 * transparency). */
static int
sample_wavelengths(const dk_crystal *c, const dk_dispersion_set *s,
                   double *lam, int max)
{
    double lo = fmax(s->wavelength_range_um[0], c->transparency_um[0]);
    double hi = fmin(s->wavelength_range_um[1], c->transparency_um[1]);
    int n = 0;
    for (int i = 0; i < max && lo < hi; i++)
        lam[n++] = lo + (hi - lo) * (i + 0.5) / max;
    return n;
}

static void
compiled_index_matches_jets(void **state)
{
    (void)state;
    int checked = 0;
    for (int ci = 0; ci < db->ncrystals; ci++) {
        const dk_crystal *c = db->crystals[ci];
        for (int si = 0; si < c->nsets; si++) {
            const dk_dispersion_set *s = &c->sets[si];
            const double *tr = s->temp_form == DK_TEMP_NONE && s->has_thermo
                                   ? s->thermo.temperature_range_c
                                   : s->temperature_range_c;
            double temps[3] = {tr[0], 0.5 * (tr[0] + tr[1]), tr[1]};
            for (int a = 0; a < s->naxes; a++) {
                const dk_axis_formula *ax = &s->axes[a];
                double lam[12];
                int nl = sample_wavelengths(c, s, lam, 12);
                for (int t = 0; t < 3; t++) {
                    dk_nfast f;
                    assert_int_equal(dk_nfast_compile(s, ax, temps[t], 0,
                                                      INFINITY, &f),
                                     DK_OK);
                    double nb[12], work[36];
                    dk_nfast_batch(&f, lam, nb, work, (size_t)nl);
                    for (int i = 0; i < nl; i++) {
                        dk_index_value v;
                        if (dk_index_eval(s, ax, lam[i], temps[t], &v,
                                          NULL))
                            continue;   /* a resonance: both NaN below */
                        double dn;
                        double n = dk_nfast_n_d(&f, lam[i], &dn);
                        assert_within(n, v.n, 1e-13, 0);
                        assert_within(dn, v.dn_dl, 1e-9, 1e-13);
                        assert_within(dk_nfast_n(&f, lam[i]), v.n, 1e-13,
                                      0);
                        /* The batch kernel gives the scalar's bits. */
                        assert_memory_equal(&nb[i], &n, sizeof n);
                        /* dk_index_n() takes this path. */
                        assert_within(dk_index_n(s, ax, lam[i], temps[t]),
                                      v.n, 1e-13, 0);
                        checked++;
                    }
                }
            }
        }
    }
    assert_true(checked > 1000);
}

/* Outside the range asked for, the compiled index is NaN, in both forms. */
static void
compiled_index_range(void **state)
{
    (void)state;
    const dk_crystal *c = dk_db_find(db, "MgO:LN");
    const dk_dispersion_set *s = &c->sets[0];
    const dk_axis_formula *ax = dk_set_find_axis(s, 'e');
    dk_nfast f;
    assert_int_equal(dk_nfast_compile(s, ax, 40, c->transparency_um[0],
                                      c->transparency_um[1], &f),
                     DK_OK);
    double lam[4] = {c->transparency_um[0] * 0.9, 1.064,
                     c->transparency_um[1] * 1.1, -1};
    double n[4], work[12];
    dk_nfast_batch(&f, lam, n, work, 4);
    assert_true(isnan(n[0]) && isfinite(n[1]) && isnan(n[2]) && isnan(n[3]));
    assert_true(isnan(dk_nfast_n(&f, lam[0])));
    assert_true(isnan(dk_nfast_n(&f, lam[3])));
    double dn;
    assert_true(isnan(dk_nfast_n_d(&f, lam[2], &dn)) && isnan(dn));
    /* A non-finite temperature does not compile. */
    assert_int_equal(dk_nfast_compile(s, ax, NAN, 0, INFINITY, &f), DK_EDOM);
}

/* The value-only eigenmodes against dk_modes_at() in uniaxial and
 * biaxial crystals, in and off the principal planes. */
static void
value_modes_match(void **state)
{
    (void)state;
    const char *names[] = {"BBO", "LBO", "KTP", "BIBO", "LGS", "ZGP"};
    for (size_t k = 0; k < sizeof names / sizeof names[0]; k++) {
        const dk_crystal *c = dk_db_find(db, names[k]);
        assert_non_null(c);
        const dk_dispersion_set *set = &c->sets[0];
        double lam = c->transparency_um[0] * 2.5;
        double n[3];
        assert_int_equal(dk_principal_n(c, set, lam, 25, n, NULL), DK_OK);
        for (double th = 0; th <= 180; th += 22.5)
            for (double ph = 0; ph < 180; ph += 33) {
                double s[3];
                dk_direction(th * M_PI / 180, ph * M_PI / 180, s);
                dk_mode ref[2], val[2];
                assert_int_equal(dk_modes_at(c, set, lam, 25, s, ref, NULL,
                                             NULL),
                                 DK_OK);
                dk_modes_value(c, n, s, val);
                double nm[2];
                char lab[2];
                dk_modes_value_n(c, n, s, nm, lab);
                for (int m = 0; m < 2; m++) {
                    assert_within(val[m].n, ref[m].n, 1e-14, 0);
                    assert_within(nm[m], ref[m].n, 1e-14, 0);
                    assert_int_equal(val[m].label, ref[m].label);
                    assert_int_equal(lab[m], ref[m].label);
                    /* modes.c's acos(D·E) carries ~1e-8 rad of rounding
                     * where the walk-off vanishes. */
                    assert_within(val[m].walkoff_rad, ref[m].walkoff_rad, 0,
                                  3e-8);
                    double de = 0, ee = 0;
                    for (int i = 0; i < 3; i++) {
                        de += val[m].d[i] * ref[m].d[i];
                        ee += val[m].e[i] * ref[m].e[i];
                    }
                    /* Same axis (the sign of D is a convention). */
                    assert_within(fabs(de), 1, 0, 1e-12);
                    assert_within(fabs(ee), 1, 0, 1e-12);
                }
            }
    }
}

/* Loading one crystal gives the crystal the full load gives. */
static void
load_for_one_crystal(void **state)
{
    (void)state;
    const char *names[] = {"MgO:LN", "bbo", "PPKTP", "LiB3O5", "OP-GaAs"};
    for (size_t k = 0; k < sizeof names / sizeof names[0]; k++) {
        dk_db *one = NULL;
        assert_int_equal(dk_db_load_for(DK_CRYSTAL_DIR, names[k], &one, NULL),
                         DK_OK);
        assert_int_equal(one->ncrystals, 1);
        const dk_crystal *a = dk_db_find(one, names[k]);
        const dk_crystal *b = dk_db_find(db, names[k]);
        assert_non_null(a);
        assert_non_null(b);
        assert_string_equal(a->id, b->id);
        assert_string_equal(a->path, b->path);
        assert_int_equal(a->nsets, b->nsets);
        assert_int_equal(a->naliases, b->naliases);
        dk_db_free(one);
    }
    /* An unknown name loads everything (the caller lists the names). */
    dk_db *all = NULL;
    assert_int_equal(dk_db_load_for(DK_CRYSTAL_DIR, "unobtainium", &all,
                                    NULL),
                     DK_OK);
    assert_int_equal(all->ncrystals, db->ncrystals);
    dk_db_free(all);
    /* A NULL name is the full load. */
    assert_int_equal(dk_db_load_for(DK_CRYSTAL_DIR, NULL, &all, NULL), DK_OK);
    assert_int_equal(all->ncrystals, db->ncrystals);
    dk_db_free(all);
}

/* Several names: those crystals alone, in the order named, a crystal
 * named twice (id and alias) once; one unknown name loads everything. */
static void
load_names(void **state)
{
    (void)state;
    const char *names[] = {"LBO", "bbo", "beta-BaB2O4", "GaSe"};
    dk_db *got = NULL;
    assert_int_equal(dk_db_load_names(DK_CRYSTAL_DIR, names, 4, &got, NULL),
                     DK_OK);
    assert_int_equal(got->ncrystals, 3);
    assert_ptr_equal(dk_db_find(got, "LBO"), got->crystals[0]);
    assert_ptr_equal(dk_db_find(got, "BBO"), got->crystals[1]);
    assert_ptr_equal(dk_db_find(got, "GaSe"), got->crystals[2]);
    for (int k = 0; k < 3; k++)
        assert_string_equal(got->crystals[k]->path,
                            dk_db_find(db, got->crystals[k]->id)->path);
    dk_db_free(got);
    const char *some_unknown[] = {"LBO", "unobtainium"};
    assert_int_equal(dk_db_load_names(DK_CRYSTAL_DIR, some_unknown, 2, &got,
                                      NULL),
                     DK_OK);
    assert_int_equal(got->ncrystals, db->ncrystals);
    dk_db_free(got);
}

/* Copy @src to @dir/@name with line @from replaced by @to (NULL: as is). */
static void
copy_with(const char *src, const char *dir, const char *name,
          const char *from, const char *to)
{
    char path[512], line[4096];
    snprintf(path, sizeof path, "%s/%s", dir, name);
    FILE *in = fopen(src, "r"), *out = fopen(path, "w");
    assert_non_null(in);
    assert_non_null(out);
    while (fgets(line, sizeof line, in))
        fputs(from && strncmp(line, from, strlen(from)) == 0 ? to : line,
              out);
    fclose(in);
    fclose(out);
}

/* When the files' names are not plain, or a name is claimed twice, the
 * one-crystal load is the full load, with its errors. */
static void
load_for_falls_back(void **state)
{
    (void)state;
    char dir[] = "/tmp/dk-test-db-XXXXXX", src[512], path[512];
    assert_non_null(mkdtemp(dir));
    snprintf(src, sizeof src, "%s/mgo-linbo3.yaml", DK_CRYSTAL_DIR);
    /* a second file claiming MgO:LN: the later one is refused */
    copy_with(src, dir, "a.yaml", NULL, NULL);
    copy_with(src, dir, "b.yaml", "id:", "id: Other\n");
    dk_db *got = NULL;
    assert_int_equal(dk_db_load_for(dir, "MgO:LN", &got, NULL), DK_OK);
    assert_int_equal(got->ncrystals, 1);
    assert_int_equal(got->nerrors, 1);
    assert_non_null(strstr(got->errors[0], "already taken"));
    dk_db_free(got);
    /* aliases written as a block sequence: parsed in full */
    snprintf(path, sizeof path, "%s/b.yaml", dir);
    unlink(path);
    copy_with(src, dir, "a.yaml", "aliases:",
              "aliases:\n  - MgO:LN\n  - MgO:PPLN\n");
    assert_int_equal(dk_db_load_for(dir, "MgO:PPLN", &got, NULL), DK_OK);
    assert_int_equal(got->ncrystals, 1);
    assert_non_null(dk_db_find(got, "MgO:PPLN"));
    dk_db_free(got);
    snprintf(path, sizeof path, "%s/a.yaml", dir);
    unlink(path);
    rmdir(dir);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(compiled_index_matches_jets),
        cmocka_unit_test(compiled_index_range),
        cmocka_unit_test(value_modes_match),
        cmocka_unit_test(load_for_one_crystal),
        cmocka_unit_test(load_for_falls_back),
        cmocka_unit_test(load_names),
    };
    return cmocka_run_group_tests_name("batch", tests, db_setup, db_teardown);
}
