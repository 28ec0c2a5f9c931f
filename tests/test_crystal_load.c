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
    assert_int_equal(db->nerrors, 11);
    dk_db_free(db);
    assert_int_equal(dk_db_load("/nonexistent", &db, &err), DK_EIO);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(shipped_database_loads),
        cmocka_unit_test(minimal_file),
        cmocka_unit_test(malformed_files),
        cmocka_unit_test(bad_file_in_folder_is_skipped),
    };
    return cmocka_run_group_tests_name("crystal_load", tests, NULL, NULL);
}
