/*
 * test_crystal_load.c - the crystal database and its schema checks
 * (deltak/crystal.h, src/data/crystal_load.c).
 *
 * Every shipped file must load; every malformed fixture in tests/data/bad
 * must fail with DK_EPARSE and a message naming file, line and column.
 */
#include "testutil.h"

#include "deltak/crystal.h"

static void
shipped_database_loads(void **state)
{
    (void)state;
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(DK_CRYSTAL_DIR, &db, &err), DK_OK);
    for (int i = 0; i < db->nerrors; i++)
        print_error("%s\n", db->errors[i]);
    assert_int_equal(db->nerrors, 0);
    assert_true(db->ncrystals >= 1);
    /* Aliases match case-insensitively. */
    const dk_crystal *c = dk_db_find(db, "mgo:ln");
    assert_non_null(c);
    assert_ptr_equal(c, dk_db_find(db, "PPMGLN"));
    assert_string_equal(c->id, "MgO:LiNbO3");
    assert_null(dk_db_find(db, "unobtainium"));
    /* Every poled crystal expands along its grating axis. */
    for (int i = 0; i < db->ncrystals; i++) {
        const dk_crystal *k = db->crystals[i];
        if (k->poling != DK_POLING_NONE)
            assert_true(k->expansion[k->grating_axis].present);
        assert_true(k->nsets >= 1);
    }
    dk_db_free(db);
}

static void
minimal_file(void **state)
{
    (void)state;
    dk_crystal *c = NULL;
    dk_error err = {0};
    assert_int_equal(dk_crystal_load(DK_TEST_DATA "/good/minimal.yaml", &c,
                                     &err),
                     DK_OK);
    assert_string_equal(c->id, "Testium");
    assert_int_equal(c->nsets, 1);
    const dk_dispersion_set *s = dk_crystal_find_set(c, "NOBODY2000");
    assert_non_null(s);
    /* n_o² = 4 + 0.1/(λ² − 0.04), the file's invented formula. */
    double n = dk_index_n(s, dk_set_find_axis(s, 'o'), 1.0, 20);
    assert_within(n, sqrt(4.0 + 0.1 / 0.96), 1e-15, 0);
    dk_crystal_free(c);
}

/* tests/data/good/defaults.yaml: default sets per use, wavelength
 * cautions and per-order thermo-optic factors (invented numbers). */
static void
defaults_cautions_and_order_factors(void **state)
{
    (void)state;
    dk_crystal *c = NULL;
    dk_error err = {0};
    assert_int_equal(dk_crystal_load(DK_TEST_DATA "/good/defaults.yaml", &c,
                                     &err),
                     DK_OK);
    const char *why = NULL;
    /* Set names match case-insensitively; the angle default is sets[0]. */
    assert_ptr_equal(dk_crystal_default_set(c, DK_USE_ANGLE, &why),
                     &c->sets[0]);
    assert_string_equal(why, "invented angle reason");
    assert_ptr_equal(dk_crystal_default_set(c, DK_USE_QPM, &why),
                     &c->sets[1]);
    assert_string_equal(why, "invented QPM reason");
    assert_ptr_equal(dk_crystal_default_set(c, DK_USE_QPM, NULL),
                     &c->sets[1]);

    /* "below 0.8" applies strictly below, "above 4.5" strictly above. */
    assert_string_equal(dk_crystal_caution_wavelength(c, 0.79),
                        "invented two-photon caution");
    assert_null(dk_crystal_caution_wavelength(c, 0.8));
    assert_null(dk_crystal_caution_wavelength(c, 2.0));
    assert_string_equal(dk_crystal_caution_wavelength(c, 4.6),
                        "invented long-wave caution");

    /* Δn = (2 λ + 3)·1e-6·(ΔT + 0.01 ΔT²): at λ = 1, ΔT = 50 that is
     * 5e-6 · 75 = 3.75e-4 (hand computation), and dn/dT = 5e-6·(1 + 1). */
    const dk_dispersion_set *s = &c->sets[0];
    const dk_axis_formula *o = dk_set_find_axis(s, 'o');
    double n20 = sqrt(4.0 + 0.1 / 0.96);
    dk_index_value v;
    assert_int_equal(dk_index_eval(s, o, 1.0, 70, &v, &err), DK_OK);
    assert_within(v.n, n20 + 3.75e-4, 1e-14, 0);
    assert_within(v.dn_dt, 5e-6 * 2.0, 1e-9, 0);
    /* The e axis has no add-on. */
    assert_within(dk_index_n(s, dk_set_find_axis(s, 'e'), 1.0, 70),
                  sqrt(3.8 + 0.1 / 0.96), 1e-15, 0);
    dk_crystal_free(c);

    /* A file without default_sets: sets[0] for both uses, and the reason
     * says so. */
    assert_int_equal(dk_crystal_load(DK_TEST_DATA "/good/minimal.yaml", &c,
                                     &err),
                     DK_OK);
    assert_ptr_equal(dk_crystal_default_set(c, DK_USE_QPM, &why),
                     &c->sets[0]);
    assert_string_equal(why, "first set in the file");
    assert_null(dk_crystal_caution_wavelength(c, 0.3));
    dk_crystal_free(c);
}

static void
malformed_files(void **state)
{
    (void)state;
    static const struct {
        const char *file;
        const char *expect;   /* a part of the message */
        int has_position;     /* message gives line and column */
    } cases[] = {
        {"missing-field", "missing required key 'transparency_um'", 1},
        {"wrong-type", "must be a list of two numbers", 1},
        {"unknown-kind", "unknown term kind 'rational'", 1},
        {"duplicate-key", "duplicate key 'name'", 1},
        {"nonfinite", "not a finite number", 1},
        {"syntax", "line", 1},
        {"unknown-name", "'Q' is neither a number nor a name", 1},
        {"wrong-axis", "axis 'X' does not fit", 1},
        {"unknown-key", "unknown key 'pointgroup'", 1},
        {"bad-range", "low <= high", 1},
        {"empty", "empty", 0},
        {"default-unknown-set", "default set 'Third2002' is not a data set",
         1},
        {"default-angle-not-first", "must be listed first", 1},
        {"default-no-reason", "missing required key 'reason'", 1},
        {"caution-both-bounds", "exactly one of 'below_um' or 'above_um'", 1},
        {"caution-negative", "must be positive", 1},
        {"order-factors-length", "one factor per row of 'orders' (2)", 1},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        char path[512];
        snprintf(path, sizeof path, "%s/bad/%s.yaml", DK_TEST_DATA,
                 cases[i].file);
        dk_crystal *c = NULL;
        dk_error err = {0};
        dk_status s = dk_crystal_load(path, &c, &err);
        if (s != DK_EPARSE || !strstr(err.msg, cases[i].expect) ||
            !strstr(err.msg, path) ||
            (cases[i].has_position && !strstr(err.msg, "column"))) {
            print_error("%s: status %d, message '%s'\n", cases[i].file, s,
                        err.msg);
            fail();
        }
        assert_null(c);
    }
    dk_crystal *c = NULL;
    dk_error err = {0};
    assert_int_equal(dk_crystal_load("/nonexistent/x.yaml", &c, &err),
                     DK_EIO);
}

static void
bad_file_in_folder_is_skipped(void **state)
{
    (void)state;
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(DK_TEST_DATA "/bad", &db, &err), DK_OK);
    assert_int_equal(db->ncrystals, 0);
    assert_int_equal(db->nerrors, 17);
    dk_db_free(db);
    assert_int_equal(dk_db_load("/nonexistent", &db, &err), DK_EIO);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(shipped_database_loads),
        cmocka_unit_test(minimal_file),
        cmocka_unit_test(defaults_cautions_and_order_factors),
        cmocka_unit_test(malformed_files),
        cmocka_unit_test(bad_file_in_folder_is_skipped),
    };
    return cmocka_run_group_tests_name("crystal_load", tests, NULL, NULL);
}
