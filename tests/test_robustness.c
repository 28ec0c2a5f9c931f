/*
 * test_robustness.c - malformed crystal files must never crash the loader:
 * every shipped file and every fixture is mutated many times (byte flips,
 * truncation, duplicated lines; a fixed pseudo-random sequence, so the
 * test repeats exactly) and loaded. Each load must succeed or fail with
 * a message. Every mutated file that loads has the index of each set and
 * axis evaluated where formulas break (poles, n² < 0, far outside the
 * ranges): each value is finite or an error with a message. make check
 * also runs this under ASan and UBSan, which turn any memory error into a
 * failure. tests/fuzz/ has the open-ended libFuzzer targets (make fuzz).
 */
#include <glob.h>
#include <limits.h>
#include <stdint.h>
#include <unistd.h>

#include "testutil.h"

#include "deltak/crystal.h"
#include "deltak/material.h"
#include "deltak/text.h"
#include "deltak/units.h"

#define MUTATIONS 60

static uint64_t rng = 0x9e3779b97f4a7c15ull;

static uint32_t
next(void)
{
    /* xorshift64* (Vigna, ACM TOMS 42, 2016) */
    rng ^= rng >> 12;
    rng ^= rng << 25;
    rng ^= rng >> 27;
    return (uint32_t)((rng * 2685821657736338717ull) >> 32);
}

static char *
slurp(const char *path, size_t *n)
{
    FILE *f = fopen(path, "rb");
    if (!f)
        return NULL;
    fseek(f, 0, SEEK_END);
    long len = ftell(f);
    fseek(f, 0, SEEK_SET);
    char *buf = malloc(len + 1);
    if (buf && fread(buf, 1, len, f) != (size_t)len) {
        free(buf);
        buf = NULL;
    }
    fclose(f);
    *n = (size_t)len;
    return buf;
}

static void
mutate(char *buf, size_t *n)
{
    static const char junk[] = ":-[]{}#&*!|>'\"\n\t 0.e9nan";
    switch (next() % 4) {
    case 0: /* flip a few bytes */
        for (int k = 0; k < 3 && *n; k++)
            buf[next() % *n] = junk[next() % (sizeof junk - 1)];
        break;
    case 1: /* truncate */
        *n = *n ? next() % *n : 0;
        break;
    case 2: /* overwrite a run with a copy of another */
        if (*n > 64) {
            size_t a = next() % (*n - 32), b = next() % (*n - 32);
            memmove(buf + a, buf + b, 32);
        }
        break;
    default: /* change a digit */
        for (size_t i = next() % (*n ? *n : 1); i < *n; i++)
            if (buf[i] >= '0' && buf[i] <= '9') {
                buf[i] = (char)('0' + next() % 10);
                break;
            }
    }
}

/* One line a terminal shows as it is. */
static int
printable(const char *m)
{
    if (!*m)
        return 0;
    for (const unsigned char *p = (const unsigned char *)m; *p; p++)
        if (*p < 0x20 || *p == 0x7f)
            return 0;
    return 1;
}

/* Evaluate every set and axis of @c at awkward points; returns the number
 * of evaluations refused (with a message). */
static int
evaluate_everywhere(const dk_crystal *c)
{
    int refused = 0;
    for (int i = 0; i < c->nsets; i++) {
        const dk_dispersion_set *set = &c->sets[i];
        const double *wr = set->wavelength_range_um;
        double lambdas[] = {wr[0], wr[1], c->transparency_um[0], 1e-3, 1.064,
                            1e4};
        double temps[] = {set->reference_temperature_c, -273, 1e5};
        for (int a = 0; a < set->naxes; a++)
            for (size_t l = 0; l < sizeof lambdas / sizeof lambdas[0]; l++)
                for (size_t t = 0; t < sizeof temps / sizeof temps[0]; t++) {
                    dk_index_value v;
                    dk_error err = {0};
                    if (dk_index_eval(set, &set->axes[a], lambdas[l],
                                      temps[t], &v, &err) == DK_OK) {
                        assert_true(isfinite(v.n) && isfinite(v.dn_dl) &&
                                    isfinite(v.d2n_dl2) &&
                                    isfinite(v.d3n_dl3) &&
                                    isfinite(v.dn_dt));
                    } else {
                        assert_true(printable(err.msg));
                        refused++;
                    }
                    double n = 0;
                    if (dk_material_n(c, set, set->axes[a].label, lambdas[l],
                                      temps[t], &n, NULL, &err) == DK_OK)
                        assert_true(isfinite(n));
                    else
                        assert_true(printable(err.msg));
                }
    }
    return refused;
}

static void
mutated_files_never_crash(void **state)
{
    (void)state;
    glob_t g;
    assert_int_equal(glob(DK_CRYSTAL_DIR "/*.yaml", 0, NULL, &g), 0);
    glob(DK_TEST_DATA "/*/*.yaml", GLOB_APPEND, NULL, &g);
    char tmp[] = "/tmp/deltak-robust-XXXXXX";
    int fd = mkstemp(tmp);
    assert_true(fd >= 0);
    close(fd);
    int ok = 0, failed = 0, refused = 0;
    for (size_t i = 0; i < g.gl_pathc; i++) {
        size_t n0 = 0;
        char *orig = slurp(g.gl_pathv[i], &n0);
        assert_non_null(orig);
        for (int m = 0; m < MUTATIONS; m++) {
            size_t n = n0;
            char *buf = malloc(n0 + 1);
            memcpy(buf, orig, n0);
            mutate(buf, &n);
            FILE *f = fopen(tmp, "wb");
            fwrite(buf, 1, n, f);
            fclose(f);
            dk_crystal *c = NULL;
            dk_error err = {0};
            if (dk_crystal_load(tmp, &c, &err) == DK_OK) {
                refused += evaluate_everywhere(c);
                dk_crystal_free(c);
                ok++;
            } else {
                assert_true(printable(err.msg));
                failed++;
            }
            free(buf);
        }
        free(orig);
    }
    unlink(tmp);
    globfree(&g);
    print_message("%d mutated files loaded, %d refused with a message; "
                  "%d index evaluations refused with a message\n",
                  ok, failed, refused);
    assert_true(failed > 0 && ok > 0);
}

static void
unit_parsers_take_anything(void **state)
{
    (void)state;
    /* Digits, signs, exponents, unit letters, hex and nan/inf pieces,
     * control characters and a UTF-8 lead byte. */
    static const char alphabet[] = "0123456789.eE+-umnµcsTHzKCWk/^2 \txpaifr"
                                   "\n\x1b\x7f\xc2\xb0";
    typedef dk_status (*parser)(const char *, double *, dk_error *);
    static const struct {
        parser fn;
        double lo;
        int strict;
    } units[] = {{dk_parse_wavelength, 0, 1},  {dk_parse_temperature, -273.15, 1},
                 {dk_parse_length, 0, 1},      {dk_parse_duration, 0, 1},
                 {dk_parse_intensity, 0, 0},   {dk_parse_power, 0, 0}};
    int accepted = 0;
    for (int k = 0; k < 20000; k++) {
        char s[40];
        int len = (int)(next() % 32);
        for (int i = 0; i < len; i++)
            s[i] = alphabet[next() % (sizeof alphabet - 1)];
        s[len] = '\0';
        for (size_t u = 0; u < sizeof units / sizeof units[0]; u++) {
            double v = -1234.5;
            dk_error err = {0};
            if (units[u].fn(s, &v, &err) == DK_OK) {
                assert_true(isfinite(v));
                assert_true(units[u].strict ? v > units[u].lo
                                            : v >= units[u].lo);
                accepted++;
            } else {
                assert_true(v == -1234.5 && printable(err.msg));
            }
        }
        double d = -1234.5;
        dk_error err = {0};
        if (dk_parse_double(s, -1, 1, &d, &err) == DK_OK)
            assert_true(d >= -1 && d <= 1);
        else
            assert_true(d == -1234.5 && printable(err.msg));
        if (dk_parse_angle_deg(s, -90, 90, &d, &err) == DK_OK)
            assert_true(d >= -90 && d <= 90);
        else
            assert_true(printable(err.msg));
        long l = -7;
        if (dk_parse_int(s, LONG_MIN, LONG_MAX, &l, &err) != DK_OK)
            assert_true(l == -7 && printable(err.msg));
        char esc[24];
        dk_text_escape(s, esc, sizeof esc);
        assert_true(strlen(esc) < sizeof esc && dk_text_is_clean(esc, 0));
    }
    assert_true(accepted > 0);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(mutated_files_never_crash),
        cmocka_unit_test(unit_parsers_take_anything),
    };
    return cmocka_run_group_tests_name("robustness", tests, NULL, NULL);
}
