/*
 * test_robustness.c - malformed crystal files must never crash the loader:
 * every shipped file and every fixture is mutated many times (byte flips,
 * truncation, duplicated lines; a fixed pseudo-random sequence, so the
 * test repeats exactly) and loaded. Each load must succeed or fail with
 * a message. make check also runs this under ASan and UBSan, which turn
 * any memory error into a failure. tests/fuzz/ has the open-ended
 * libFuzzer target (make fuzz).
 */
#include <glob.h>
#include <stdint.h>
#include <unistd.h>

#include "testutil.h"

#include "deltak/crystal.h"
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
    int ok = 0, failed = 0;
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
                dk_crystal_free(c);
                ok++;
            } else {
                assert_true(strlen(err.msg) > 0);
                failed++;
            }
            free(buf);
        }
        free(orig);
    }
    unlink(tmp);
    globfree(&g);
    print_message("%d mutated files loaded, %d refused with a message\n", ok,
                  failed);
    assert_true(failed > 0);
}

static void
unit_parsers_take_anything(void **state)
{
    (void)state;
    static const char alphabet[] = "0123456789.eE+-umnµcsTHzKCWk/^2 \t";
    for (int k = 0; k < 5000; k++) {
        char s[24];
        int len = (int)(next() % 20);
        for (int i = 0; i < len; i++)
            s[i] = alphabet[next() % (sizeof alphabet - 1)];
        s[len] = '\0';
        double v = 0;
        dk_error err = {0};
        if (dk_parse_wavelength(s, &v, &err) == DK_OK)
            assert_true(isfinite(v) && v > 0);
        else
            assert_true(strlen(err.msg) > 0);
        if (dk_parse_temperature(s, &v, &err) == DK_OK)
            assert_true(isfinite(v) && v > -273.15);
        dk_parse_length(s, &v, NULL);
        dk_parse_duration(s, &v, NULL);
        dk_parse_intensity(s, &v, NULL);
        dk_parse_power(s, &v, NULL);
    }
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
