/*
 * test_crystal_load.c - the crystal database and its schema checks
 * (deltak/crystal.h, src/data/crystal_load.c).
 *
 * Every shipped file must load; every malformed fixture in tests/data/bad
 * must fail with DK_EPARSE and a message naming file, line and column.
 * Hostile folders and files (huge, deeply nested, many keys, links to
 * files that are not crystal files, FIFOs, control characters) must be
 * refused with a message naming the file and the limit or rule, without
 * quoting what a non-crystal file contains.
 */
#include <dirent.h>
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include "testutil.h"

#include "data/crystal_load.h"
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

/* ---- a scratch folder per test ---- */

static char scratch[64];

static void
make_scratch(void)
{
    strcpy(scratch, "/tmp/deltak-load-XXXXXX");
    assert_non_null(mkdtemp(scratch));
}

static void
remove_scratch(void)
{
    DIR *d = opendir(scratch);
    assert_non_null(d);
    struct dirent *e;
    char path[512];
    while ((e = readdir(d)))
        if (strcmp(e->d_name, ".") && strcmp(e->d_name, "..")) {
            snprintf(path, sizeof path, "%s/%s", scratch, e->d_name);
            if (unlink(path) != 0)
                rmdir(path);
        }
    closedir(d);
    assert_int_equal(rmdir(scratch), 0);
}

/* Write @n bytes of @text to scratch/@name; returns the path (static). */
static const char *
put(const char *name, const char *text, size_t n)
{
    static char path[512];
    snprintf(path, sizeof path, "%s/%s", scratch, name);
    FILE *f = fopen(path, "wb");
    assert_non_null(f);
    assert_int_equal(fwrite(text, 1, n, f), n);
    assert_int_equal(fclose(f), 0);
    return path;
}

static char *
slurp_fixture(const char *path)
{
    FILE *f = fopen(path, "rb");
    assert_non_null(f);
    static char buf[8192];
    size_t n = fread(buf, 1, sizeof buf - 1, f);
    buf[n] = '\0';
    fclose(f);
    return buf;
}

/* Load @path and require DK_EPARSE/@status with every @parts[i] in the
 * message and no control byte in it. */
static void
expect_refused(const char *path, dk_status status, const char *const parts[])
{
    dk_crystal *c = NULL;
    dk_error err = {0};
    dk_status s = dk_crystal_load(path, &c, &err);
    int ok = s == status && c == NULL;
    for (int i = 0; ok && parts[i]; i++)
        ok = strstr(err.msg, parts[i]) != NULL;
    for (const unsigned char *m = (const unsigned char *)err.msg; ok && *m;
         m++)
        ok = *m >= 0x20 && *m != 0x7f;
    if (!ok) {
        print_error("%s: status %d (wanted %d), message '%s'\n", path, s,
                    status, err.msg);
        fail();
    }
}

#define REFUSED(path, status, ...)                                            \
    do {                                                                      \
        const char *const parts_[] = {__VA_ARGS__, NULL};                     \
        expect_refused(path, status, parts_);                                 \
    } while (0)

static void
empty_folder_gives_empty_database(void **state)
{
    (void)state;
    /* Before: qsort(NULL, 0, ...), undefined behaviour that aborts the
     * sanitizer build. */
    make_scratch();
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(scratch, &db, &err), DK_OK);
    assert_int_equal(db->ncrystals, 0);
    assert_int_equal(db->nerrors, 0);
    assert_null(dk_db_find(db, "BBO"));
    dk_db_free(db);
    /* Only files that are not crystal files: same. */
    put("README.txt", "not yaml", 8);
    put(".hidden.yaml", "id: x", 5);
    assert_int_equal(dk_db_load(scratch, &db, &err), DK_OK);
    assert_int_equal(db->ncrystals + db->nerrors, 0);
    dk_db_free(db);
    remove_scratch();
}

static void
huge_files_are_refused(void **state)
{
    (void)state;
    make_scratch();
    /* 0.9 MB with 60,000 keys (stalled every command for 26 s before). */
    size_t cap = 1100000, n = 0;
    char *big = malloc(cap);
    assert_non_null(big);
    n += (size_t)sprintf(big, "id: Big\n");
    for (int i = 0; i < 60000; i++)
        n += (size_t)sprintf(big + n, "key%06d: 1234\n", i);
    assert_true(n > 850000);
    const char *path = put("big.yaml", big, n);
    REFUSED(path, DK_EPARSE, path, "bytes", "262144",
            "allowed for a crystal file");
    /* Under the size limit but with 25,000 keys: the node limit. */
    n = (size_t)sprintf(big, "id: Many\n");
    for (int i = 0; i < 25000; i++)
        n += (size_t)sprintf(big + n, "k%05d: 1\n", i);
    assert_true(n < DK_CRYSTAL_MAX_BYTES);
    path = put("many.yaml", big, n);
    REFUSED(path, DK_EPARSE, path, "more than 20000 keys",
            "the limit for a crystal file");
    /* The same from memory, as the fuzz targets load it. */
    dk_crystal *c = NULL;
    dk_error err = {0};
    assert_int_equal(dk_crystal_load_buffer("mem.yaml", big, n, &c, &err),
                     DK_EPARSE);
    assert_non_null(strstr(err.msg, "more than 20000"));
    free(big);
    remove_scratch();
}

static void
deep_nesting_is_refused(void **state)
{
    (void)state;
    make_scratch();
    /* 100,000 levels, flow and block style (67 s per command before). */
    size_t depth = 100000;
    char *deep = malloc(2 * depth + 16);
    assert_non_null(deep);
    memset(deep, '[', depth);
    memset(deep + depth, ']', depth);
    const char *path = put("flow.yaml", deep, 2 * depth);
    REFUSED(path, DK_EPARSE, path, "nested more than 32 levels",
            "line 1, column 33");
    for (size_t i = 0; i < depth; i++)
        memcpy(deep + 2 * i, "- ", 2);
    memcpy(deep + 2 * depth, "x\n", 2);
    path = put("block.yaml", deep, 2 * depth + 2);
    REFUSED(path, DK_EPARSE, path, "nested more than 32 levels");
    /* {a: {a: ... inside a real-looking file. */
    size_t n = (size_t)sprintf(deep, "id: Deep\nnote: ");
    for (int i = 0; i < 40; i++)
        n += (size_t)sprintf(deep + n, "{a: ");
    n += (size_t)sprintf(deep + n, "1");
    for (int i = 0; i < 40; i++)
        deep[n++] = '}';
    path = put("map.yaml", deep, n);
    REFUSED(path, DK_EPARSE, "nested more than 32 levels");
    free(deep);
    remove_scratch();
}

static void
aliases_are_refused(void **state)
{
    (void)state;
    /* An alias makes one node appear many times ("billion laughs"). */
    make_scratch();
    static const char text[] = "id: A\na: &x [1, 2]\nb: [*x, *x]\n";
    const char *path = put("alias.yaml", text, sizeof text - 1);
    REFUSED(path, DK_EPARSE, "line 3", "aliases", "not allowed");
    remove_scratch();
}

/* minimal.yaml with the first "coefficients: {...}" replaced by a block
 * mapping of @keys ("name: value" lines); *first_line gets the line
 * number of the first key. */
static const char *
with_coefficients(const char *name, const char *keys, int *first_line)
{
    static const char find[] = "coefficients: {A: 4.0, B: 0.1, C: 0.04}";
    const char *orig = slurp_fixture(DK_TEST_DATA "/good/minimal.yaml");
    const char *at = strstr(orig, find);
    assert_non_null(at);
    int line = 1;
    for (const char *q = orig; q < at; q++)
        line += *q == '\n';
    *first_line = line + 1;
    size_t cap = strlen(orig) + strlen(keys) + 64;
    char *text = malloc(cap);
    assert_non_null(text);
    int n = snprintf(text, cap, "%.*scoefficients:\n%s%s", (int)(at - orig),
                     orig, keys, at + strlen(find) + 1);
    const char *path = put(name, text, (size_t)n);
    free(text);
    return path;
}

static void
duplicate_keys_among_many(void **state)
{
    (void)state;
    make_scratch();
    /* 9,000 distinct keys (under the node limit) and one repeat at the
     * end: found, with its line (the check is n log n, not n²). */
    size_t cap = 300000, n = 0;
    char *keys = malloc(cap);
    assert_non_null(keys);
    for (int i = 0; i < 9000; i++)
        n += (size_t)sprintf(keys + n, "          k%05d: 1\n", i);
    n += (size_t)sprintf(keys + n, "          k00042: 2\n");
    int first;
    const char *path = with_coefficients("dup.yaml", keys, &first);
    char where[64];
    snprintf(where, sizeof where, "line %d, column 11", first + 9000);
    REFUSED(path, DK_EPARSE, where, "duplicate key 'k00042'");
    /* The first repeat in file order is the one reported. */
    path = with_coefficients("order.yaml",
                             "          b: 1\n          a: 1\n"
                             "          a: 2\n          b: 2\n",
                             &first);
    snprintf(where, sizeof where, "line %d, column 11", first + 2);
    REFUSED(path, DK_EPARSE, where, "duplicate key 'a'");
    /* Without repeats the file loads (its coefficients are unused). */
    path = with_coefficients("fine.yaml",
                             "          A: 4.0\n          B: 0.1\n"
                             "          C: 0.04\n",
                             &first);
    dk_crystal *c = NULL;
    dk_error err = {0};
    assert_int_equal(dk_crystal_load(path, &c, &err), DK_OK);
    dk_crystal_free(c);
    free(keys);
    remove_scratch();
}

static void
non_crystal_files_are_not_quoted(void **state)
{
    (void)state;
    make_scratch();
    /* A "secret" file reached through a link in the crystal folder: its
     * keys must not appear in the warning. */
    static const char secret[] = "password: hunter2\nuser: root\n";
    char target[512];
    snprintf(target, sizeof target, "%s/secret.txt", scratch);
    put("secret.txt", secret, sizeof secret - 1);
    char link[512];
    snprintf(link, sizeof link, "%s/linked.yaml", scratch);
    assert_int_equal(symlink(target, link), 0);
    static const char list[] = "- root:x:0:0:root:/root:/bin/bash\n";
    put("list.yaml", list, sizeof list - 1);
    static const char words[] = "lorem ipsum\n";
    put("words.yaml", words, sizeof words - 1);
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(scratch, &db, &err), DK_OK);
    assert_int_equal(db->ncrystals, 0);
    assert_int_equal(db->nerrors, 3);
    for (int i = 0; i < db->nerrors; i++) {
        const char *m = db->errors[i];
        if (!strstr(m, "not a crystal file") || !strstr(m, scratch) ||
            strstr(m, "password") || strstr(m, "hunter2") ||
            strstr(m, "root") || strstr(m, "lorem")) {
            print_error("message '%s'\n", m);
            fail();
        }
    }
    dk_db_free(db);
    remove_scratch();
}

static void
special_files_are_refused_without_blocking(void **state)
{
    (void)state;
    make_scratch();
    char path[512];
    /* A FIFO: opening it for reading used to wait for a writer forever. */
    snprintf(path, sizeof path, "%s/fifo.yaml", scratch);
    assert_int_equal(mkfifo(path, 0600), 0);
    REFUSED(path, DK_EIO, path, "not a regular file");
    /* A folder named like a crystal file. */
    snprintf(path, sizeof path, "%s/folder.yaml", scratch);
    assert_int_equal(mkdir(path, 0700), 0);
    REFUSED(path, DK_EIO, "not a regular file");
    /* A link to a device that never ends. */
    snprintf(path, sizeof path, "%s/zero.yaml", scratch);
    assert_int_equal(symlink("/dev/zero", path), 0);
    REFUSED(path, DK_EIO, "not a regular file");
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(scratch, &db, &err), DK_OK);
    assert_int_equal(db->nerrors, 3);
    dk_db_free(db);
    remove_scratch();
}

/* minimal.yaml with its first "id: Testium" line replaced by @id_line. */
static const char *
minimal_with(const char *name, const char *find, const char *replace)
{
    const char *orig = slurp_fixture(DK_TEST_DATA "/good/minimal.yaml");
    const char *at = strstr(orig, find);
    assert_non_null(at);
    static char text[8192];
    size_t head = (size_t)(at - orig);
    snprintf(text, sizeof text, "%.*s%s%s", (int)head, orig, replace,
             at + strlen(find));
    return put(name, text, strlen(text));
}

/* The document is built from libyaml's events in the pass that checks the
 * limits: the first document is the crystal, later ones are still parsed
 * (a syntax error there is reported with its line) but not kept; anchors
 * without aliases are harmless; a schema error inside a flow collection
 * points at its own line. */
static void
documents_in_one_pass(void **state)
{
    (void)state;
    make_scratch();
    const char *orig = slurp_fixture(DK_TEST_DATA "/good/minimal.yaml");
    static char text[9000];
    snprintf(text, sizeof text, "%s\n---\nid: Other\n", orig);
    const char *path = put("two.yaml", text, strlen(text));
    dk_crystal *c = NULL;
    dk_error err = {0};
    assert_int_equal(dk_crystal_load(path, &c, &err), DK_OK);
    assert_string_equal(c->id, "Testium");
    dk_crystal_free(c);
    int lines = 1;
    for (const char *q = orig; *q; q++)
        lines += *q == '\n';
    snprintf(text, sizeof text, "%s\n---\nid: [\n", orig);
    path = put("broken.yaml", text, strlen(text));
    char where[32];
    snprintf(where, sizeof where, "line %d,", lines + 3);
    REFUSED(path, DK_EPARSE, where);
    path = minimal_with("anchor.yaml", "aliases: [TST]", "aliases: &a [TST]");
    assert_int_equal(dk_crystal_load(path, &c, &err), DK_OK);
    assert_int_equal(c->naliases, 1);
    dk_crystal_free(c);
    path = minimal_with("flow.yaml", "transparency_um: [0.4, 5.0]",
                        "transparency_um: [0.4, x]");
    REFUSED(path, DK_EPARSE, "line 8");
    remove_scratch();
}

static void
control_characters_are_refused(void **state)
{
    (void)state;
    make_scratch();
    /* Escape sequences and line breaks in names would reach terminals,
     * Markdown reports and CSV files raw. */
    const char *p = minimal_with("esc.yaml", "id: Testium",
                                 "id: \"Test\\e[2Jium\"");
    REFUSED(p, DK_EPARSE, "'id' contains control characters", "line 2");
    p = minimal_with("nl.yaml", "name: an invented test crystal",
                     "name: \"two\\nlines\"");
    REFUSED(p, DK_EPARSE, "'name' contains control characters or line "
                          "breaks");
    p = minimal_with("alias.yaml", "aliases: [TST]",
                     "aliases: [TST, \"T\\x9bS\"]");
    REFUSED(p, DK_EPARSE, "an item of 'aliases' contains control");
    p = minimal_with("setname.yaml", "name: Nobody2000",
                     "name: \"Nobody\\r2000\"");
    REFUSED(p, DK_EPARSE, "'name' contains control characters");
    p = minimal_with("frame.yaml", "frame: \"Z is the optic axis\"",
                     "frame: \"Z is \\e]0;the optic axis\\a\"");
    REFUSED(p, DK_EPARSE, "'frame' contains control characters");
    /* A key with an escape sequence is quoted escaped, never raw. */
    p = minimal_with("key.yaml", "point_group: 3m",
                     "point_group: 3m\n\"\\e[31mred\": 1");
    REFUSED(p, DK_EPARSE, "control characters");
    p = minimal_with("unknown.yaml", "point_group: 3m",
                     "point_group: 3m\n\"p\\u00e9\\u0085x\": 1");
    REFUSED(p, DK_EPARSE, "contains control characters");
    /* Line breaks in prose (a citation over two lines) are fine. */
    p = minimal_with("prose.yaml", "transparency_source: \"invented for "
                                   "tests\"",
                     "transparency_source: |\n  invented\n  for tests");
    dk_crystal *c = NULL;
    dk_error err = {0};
    assert_int_equal(dk_crystal_load(p, &c, &err), DK_OK);
    assert_string_equal(c->transparency_source, "invented\nfor tests\n");
    dk_crystal_free(c);
    remove_scratch();
}

static void
paths_are_quoted_escaped(void **state)
{
    (void)state;
    make_scratch();
    static const char bad[] = "id: X\n";
    put("evil\x1b[2J\n.yaml", bad, sizeof bad - 1);
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(scratch, &db, &err), DK_OK);
    assert_int_equal(db->nerrors, 1);
    assert_non_null(strstr(db->errors[0], "evil\\x1b[2J\\x0a.yaml"));
    for (const char *m = db->errors[0]; *m; m++)
        assert_true((unsigned char)*m >= 0x20);
    dk_db_free(db);
    remove_scratch();
    /* Unreadable folder: named, escaped. */
    assert_int_equal(dk_db_load("/nonexistent/\x1b[2J", &db, &err), DK_EIO);
    assert_non_null(strstr(err.msg, "\\x1b[2J"));
}

static void
too_many_aliases(void **state)
{
    (void)state;
    make_scratch();
    char list[1024] = "aliases: [A0";
    for (int i = 1; i <= DK_CRYSTAL_MAX_ALIASES; i++)
        snprintf(list + strlen(list), sizeof list - strlen(list), ", A%d", i);
    strcat(list, "]");
    const char *p = minimal_with("aliases.yaml", "aliases: [TST]", list);
    REFUSED(p, DK_EPARSE, "more than 32 aliases");
    remove_scratch();
}

static void
too_many_files(void **state)
{
    (void)state;
    make_scratch();
    for (int i = 0; i < DK_DB_MAX_FILES + 5; i++) {
        char name[32];
        snprintf(name, sizeof name, "f%04d.yaml", i);
        put(name, "", 0);
    }
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(scratch, &db, &err), DK_OK);
    /* One error per empty file read, and one for the rest. */
    assert_int_equal(db->nerrors, DK_DB_MAX_FILES + 1);
    assert_non_null(strstr(db->errors[0], "more than 256 .yaml files"));
    dk_db_free(db);
    remove_scratch();
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
        cmocka_unit_test(empty_folder_gives_empty_database),
        cmocka_unit_test(huge_files_are_refused),
        cmocka_unit_test(deep_nesting_is_refused),
        cmocka_unit_test(aliases_are_refused),
        cmocka_unit_test(documents_in_one_pass),
        cmocka_unit_test(duplicate_keys_among_many),
        cmocka_unit_test(non_crystal_files_are_not_quoted),
        cmocka_unit_test(special_files_are_refused_without_blocking),
        cmocka_unit_test(control_characters_are_refused),
        cmocka_unit_test(paths_are_quoted_escaped),
        cmocka_unit_test(too_many_aliases),
        cmocka_unit_test(too_many_files),
    };
    return cmocka_run_group_tests_name("crystal_load", tests, NULL, NULL);
}
