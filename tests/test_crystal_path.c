/*
 * test_crystal_path.c - the crystal search path (deltak/crystal.h:
 * dk_db_load_path, dk_db_add_file, dk_db_shipped_dir).
 *
 * A user's files add to the shipped database; a name two files share
 * goes to the earlier entry (the rule of search paths such as the
 * shell's PATH, common practice), with a notice naming both files,
 * except where both hold the same bytes. The crystals written here are
 * invented (the loader's minimal test crystal under other names).
 */
#include <stdio.h>
#include <sys/stat.h>
#include <unistd.h>

#include "testutil.h"

#include "deltak/crystal.h"

static char tmpdir[] = "/tmp/dk-path-XXXXXX";

/* Write an invented crystal @id with @aliases (YAML flow list body) and
 * refractive index constant @a to @dir/@file. */
static void
write_crystal(const char *dir, const char *file, const char *id,
              const char *aliases, double a)
{
    char path[512];
    snprintf(path, sizeof path, "%s/%s", dir, file);
    FILE *f = fopen(path, "w");
    assert_non_null(f);
    fprintf(f,
            "id: %s\nname: an invented crystal for the search-path tests\n"
            "aliases: [%s]\nclass: isotropic\npoint_group: \"-43m\"\n"
            "frame: \"cubic\"\ntransparency_um: [0.4, 5.0]\n"
            "transparency_source: \"invented for tests\"\n"
            "dispersion:\n  - name: Nobody2000\n"
            "    citation: \"invented for tests\"\n    status: checked\n"
            "    wavelength_range_um: [0.5, 4.0]\n"
            "    reference_temperature_C: 20\n    quantity: n_squared\n"
            "    axes:\n      n:\n        formula: \"n^2 = A\"\n"
            "        coefficients: {A: %g}\n"
            "        terms:\n          - {kind: constant, value: [A]}\n",
            id, aliases, a);
    assert_int_equal(fclose(f), 0);
}

static int
setup(void **state)
{
    (void)state;
    if (!mkdtemp(tmpdir))
        return -1;
    char d[256];
    snprintf(d, sizeof d, "%s/user", tmpdir);
    mkdir(d, 0700);
    snprintf(d, sizeof d, "%s/other", tmpdir);
    mkdir(d, 0700);
    return 0;
}

static int
teardown(void **state)
{
    (void)state;
    char cmd[300];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", tmpdir);
    return system(cmd) == 0 ? 0 : -1;
}

static int
count_shipped(void)
{
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(DK_CRYSTAL_DIR, &db, &err), DK_OK);
    int n = db->ncrystals;
    dk_db_free(db);
    return n;
}

static void
shipped_dir_is_the_tree(void **state)
{
    (void)state;
    /* An in-tree build reads the source tree's crystals/. */
    assert_string_equal(dk_db_shipped_dir(), DK_CRYSTAL_DIR);
}

static void
user_folder_adds_and_replaces(void **state)
{
    (void)state;
    char user[256];
    snprintf(user, sizeof user, "%s/user", tmpdir);
    write_crystal(user, "new.yaml", "Inventium", "INV", 4.0);
    /* Same id as a shipped crystal, different bytes: the user's wins. */
    write_crystal(user, "gaas.yaml", "GaAs", "my GaAs", 11.0);
    const char *paths[] = {user, DK_CRYSTAL_DIR};
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load_path(paths, 2, &db, &err), DK_OK);
    assert_int_equal(db->ncrystals, count_shipped() + 1);
    assert_int_equal(db->nerrors, 0);
    assert_non_null(dk_db_find(db, "inv"));
    const dk_crystal *g = dk_db_find(db, "GaAs");
    assert_non_null(g);
    assert_non_null(strstr(g->path, "/user/gaas.yaml"));
    /* The shipped GaAs's aliases went with it. */
    assert_null(dk_db_find(db, "OP-GaAs"));
    assert_int_equal(db->nnotices, 1);
    assert_non_null(strstr(db->notices[0], "/user/gaas.yaml' is used"));
    assert_non_null(strstr(db->notices[0], DK_CRYSTAL_DIR));
    /* Sorted by id, as dk_db_load leaves it. */
    for (int i = 1; i < db->ncrystals; i++)
        assert_true(strcasecmp(db->crystals[i - 1]->id,
                               db->crystals[i]->id) < 0);
    dk_db_free(db);
    unlink(strcat(user, "/gaas.yaml"));
}

static void
same_folder_twice_is_quiet(void **state)
{
    (void)state;
    const char *paths[] = {DK_CRYSTAL_DIR, "", NULL, DK_CRYSTAL_DIR};
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load_path(paths, 4, &db, &err), DK_OK);
    assert_int_equal(db->ncrystals, count_shipped());
    assert_int_equal(db->nnotices, 0);
    assert_int_equal(db->nerrors, 0);
    dk_db_free(db);
}

static void
shared_alias_goes_to_the_first(void **state)
{
    (void)state;
    char other[256], file[300];
    snprintf(other, sizeof other, "%s/other", tmpdir);
    write_crystal(other, "alias.yaml", "Aliasium", "PPLN, ALS", 4.0);
    snprintf(file, sizeof file, "%s/alias.yaml", other);
    const char *paths[] = {file, DK_CRYSTAL_DIR};
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load_path(paths, 2, &db, &err), DK_OK);
    const dk_crystal *a = dk_db_find(db, "PPLN");
    assert_non_null(a);
    assert_string_equal(a->id, "Aliasium");
    /* LiNbO3 keeps its id and its other names. */
    const dk_crystal *ln = dk_db_find(db, "LN");
    assert_non_null(ln);
    assert_string_equal(ln->id, "LiNbO3");
    assert_int_equal(db->nnotices, 1);
    assert_non_null(strstr(db->notices[0], "the name 'PPLN' means "
                                           "'Aliasium'"));
    dk_db_free(db);

    /* In the other order the shipped crystal keeps PPLN. */
    const char *reversed[] = {DK_CRYSTAL_DIR, file};
    assert_int_equal(dk_db_load_path(reversed, 2, &db, &err), DK_OK);
    assert_string_equal(dk_db_find(db, "PPLN")->id, "LiNbO3");
    assert_string_equal(dk_db_find(db, "ALS")->id, "Aliasium");
    dk_db_free(db);

    /* A later crystal whose id is an earlier one's alias is left out. */
    write_crystal(other, "ln.yaml", "PPLN", "", 4.0);
    snprintf(file, sizeof file, "%s/ln.yaml", other);
    const char *later[] = {DK_CRYSTAL_DIR, file};
    assert_int_equal(dk_db_load_path(later, 2, &db, &err), DK_OK);
    assert_int_equal(db->ncrystals, count_shipped());
    assert_int_equal(db->nnotices, 1);
    dk_db_free(db);
}

static void
unreadable_entries(void **state)
{
    (void)state;
    const char *paths[] = {"/nonexistent/deltak", DK_CRYSTAL_DIR};
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load_path(paths, 2, &db, &err), DK_OK);
    assert_int_equal(db->nerrors, 1);
    assert_non_null(strstr(db->errors[0], "'/nonexistent/deltak'"));
    assert_int_equal(db->ncrystals, count_shipped());
    dk_db_free(db);

    db = NULL;
    assert_int_equal(dk_db_load_path(paths, 1, &db, &err), DK_EIO);
    assert_null(db);
    assert_non_null(strstr(err.msg, "/nonexistent/deltak"));
    const char *empty[] = {"", NULL};
    assert_int_equal(dk_db_load_path(empty, 2, &db, &err), DK_EINVAL);
    assert_int_equal(dk_db_load_path(NULL, 0, &db, &err), DK_EINVAL);
    assert_null(db);
}

static void
broken_file_is_skipped(void **state)
{
    (void)state;
    const char *paths[] = {DK_TEST_DATA "/bad/syntax.yaml", DK_CRYSTAL_DIR};
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load_path(paths, 2, &db, &err), DK_OK);
    assert_int_equal(db->nerrors, 1);
    assert_non_null(strstr(db->errors[0], "syntax.yaml"));
    assert_int_equal(db->ncrystals, count_shipped());
    dk_db_free(db);
}

static void
add_file_takes_precedence(void **state)
{
    (void)state;
    char other[256], file[300];
    snprintf(other, sizeof other, "%s/other", tmpdir);
    write_crystal(other, "bbo.yaml", "beta-BaB2O4", "BBO", 2.5);
    snprintf(file, sizeof file, "%s/bbo.yaml", other);
    const char *paths[] = {DK_CRYSTAL_DIR};
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load_path(paths, 1, &db, &err), DK_OK);
    int n = db->ncrystals;
    const dk_crystal *c = NULL;
    assert_int_equal(dk_db_add_file(db, file, &c, &err), DK_OK);
    assert_int_equal(db->ncrystals, n);
    assert_ptr_equal(dk_db_find(db, "bbo"), c);
    assert_null(dk_db_find(db, "beta barium borate"));
    assert_int_equal(db->nnotices, 1);
    assert_non_null(strstr(db->notices[0], "the file added last wins"));

    /* A broken file changes nothing. */
    assert_int_equal(dk_db_add_file(db, DK_TEST_DATA "/bad/syntax.yaml", &c,
                                    &err),
                     DK_EPARSE);
    assert_int_equal(db->ncrystals, n);
    assert_int_equal(db->nnotices, 1);
    assert_int_equal(dk_db_add_file(db, "/nonexistent.yaml", &c, &err),
                     DK_EIO);
    /* Adding a shipped file unchanged is quiet. */
    assert_int_equal(dk_db_add_file(db, DK_CRYSTAL_DIR "/gaas.yaml", &c,
                                    &err),
                     DK_OK);
    assert_int_equal(db->nnotices, 1);
    assert_int_equal(db->ncrystals, n);
    dk_db_free(db);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(shipped_dir_is_the_tree),
        cmocka_unit_test(user_folder_adds_and_replaces),
        cmocka_unit_test(same_folder_twice_is_quiet),
        cmocka_unit_test(shared_alias_goes_to_the_first),
        cmocka_unit_test(unreadable_entries),
        cmocka_unit_test(broken_file_is_skipped),
        cmocka_unit_test(add_file_takes_precedence),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
