/*
 * test_units.c - quantities with units and strict option numbers
 * (deltak/units.h).
 * Conversion facts: λ[µm] = 1e4/ν̃[cm⁻¹] = c/f with c = 299792458 m/s
 * exact (SI definition); 1 rad = 180/π degrees.
 * Limits of IEEE 754 binary64 (IEEE Std 754-2008): largest finite double
 * about 1.797e308, so 1e308 m = 1e311 mm overflows.
 */
#include <limits.h>

#include "testutil.h"

#include "deltak/units.h"

static void
wavelength_forms(void **state)
{
    (void)state;
    static const struct {
        const char *text;
        double um;
    } cases[] = {
        {"1064nm", 1.064},       {"1.064um", 1.064},
        {"1.064µm", 1.064},      {" 1.064 um ", 1.064},
        {"9398.4962406cm-1", 1.064}, /* 1e4 / 1.064 */
        {"281.7598289THz", 1.064},   /* c / 1.064 um */
        {"3.4um", 3.4},          {"0.5mm", 500},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        double um = 0;
        dk_error err = {0};
        assert_int_equal(dk_parse_wavelength(cases[i].text, &um, &err), DK_OK);
        assert_within(um, cases[i].um, 1e-9, 0);
    }
}

static void
wavelength_errors(void **state)
{
    (void)state;
    static const char *const bad[] = {"1064", "", "nm", "1064 parsecs",
                                      "-3um", "0nm", "nanum", "1e999um"};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        double um = -1;
        dk_error err = {0};
        assert_int_equal(dk_parse_wavelength(bad[i], &um, &err), DK_EINVAL);
        assert_true(strlen(err.msg) > 0);
        assert_within(um, -1, 0, 0); /* untouched on error */
    }
    /* A bare number must show the accepted forms. */
    dk_error err = {0};
    double um;
    dk_parse_wavelength("1064", &um, &err);
    assert_non_null(strstr(err.msg, "1064nm"));
    assert_non_null(strstr(err.msg, "cm-1"));
}

static void
temperatures(void **state)
{
    (void)state;
    double t;
    dk_error err = {0};
    assert_int_equal(dk_parse_temperature("40", &t, &err), DK_OK);
    assert_within(t, 40, 0, 1e-12);
    assert_int_equal(dk_parse_temperature("313.15K", &t, &err), DK_OK);
    assert_within(t, 40, 0, 1e-9);
    assert_int_equal(dk_parse_temperature("40C", &t, &err), DK_OK);
    assert_int_equal(dk_parse_temperature("-300", &t, &err), DK_EINVAL);
    assert_int_equal(dk_parse_temperature("warm", &t, &err), DK_EINVAL);
    assert_int_equal(dk_parse_temperature("40F", &t, &err), DK_EINVAL);
}

static void
lengths(void **state)
{
    (void)state;
    double mm;
    dk_error err = {0};
    assert_int_equal(dk_parse_length("20mm", &mm, &err), DK_OK);
    assert_within(mm, 20, 0, 1e-12);
    assert_int_equal(dk_parse_length("2cm", &mm, &err), DK_OK);
    assert_within(mm, 20, 0, 1e-12);
    assert_int_equal(dk_parse_length("500um", &mm, &err), DK_OK);
    assert_within(mm, 0.5, 0, 1e-12);
    assert_int_equal(dk_parse_length("20", &mm, &err), DK_EINVAL);
    assert_int_equal(dk_parse_length("-1mm", &mm, &err), DK_EINVAL);
}

/* Every byte of @s is printable or UTF-8 beyond U+009F: nothing a
 * terminal would obey. */
static int
printable(const char *s)
{
    for (const unsigned char *p = (const unsigned char *)s; *p; p++)
        if (*p < 0x20 || *p == 0x7f)
            return 0;
    return 1;
}

/* Parse @text with @fn and require DK_EINVAL, the output untouched and
 * every @parts[] (NULL-terminated) in the message. */
typedef dk_status (*parser)(const char *, double *, dk_error *);

static void
expect_error(parser fn, const char *text, const char *const parts[])
{
    double v = -12345;
    dk_error err = {0};
    dk_status s = fn(text, &v, &err);
    int ok = s == DK_EINVAL && v == -12345 && printable(err.msg);
    for (int i = 0; ok && parts[i]; i++)
        ok = strstr(err.msg, parts[i]) != NULL;
    if (!ok) {
        print_error("'%s': status %d, value %g, message '%s'\n", text, s, v,
                    err.msg);
        fail();
    }
}

#define EXPECT(fn, text, ...)                                                 \
    do {                                                                      \
        static const char *const parts_[] = {__VA_ARGS__, NULL};              \
        expect_error(fn, text, parts_);                                       \
    } while (0)

static void
overflow_after_scaling_is_an_error(void **state)
{
    (void)state;
    /* Finite as numbers, infinite once the unit is applied. */
    EXPECT(dk_parse_length, "1e308m", "length", "1e308m", "too large");
    EXPECT(dk_parse_length, "1e308cm", "length", "too large");
    EXPECT(dk_parse_wavelength, "1e306mm", "wavelength", "too large");
    EXPECT(dk_parse_wavelength, "1e-320cm-1", "wavelength", "too large");
    EXPECT(dk_parse_wavelength, "1e-310THz", "wavelength", "too large");
    EXPECT(dk_parse_duration, "1e305ns", "duration", "too large");
    EXPECT(dk_parse_intensity, "1e306TW/cm2", "intensity", "too large");
    EXPECT(dk_parse_power, "1e303MW", "power", "too large");
    /* Beyond the double range as written. */
    EXPECT(dk_parse_length, "1e999mm", "length", "too large");
    EXPECT(dk_parse_temperature, "1e999", "temperature", "too large");
    /* Underflow to nothing is not a positive length. */
    EXPECT(dk_parse_length, "1e-400mm", "length", "must be positive");
    EXPECT(dk_parse_length, "1e-320nm", "length", "too small");
    /* The largest values that fit still pass. */
    double v;
    assert_int_equal(dk_parse_length("1e300m", &v, NULL), DK_OK);
    assert_within(v, 1e303, 1e-15, 0);
}

static void
non_numbers_are_refused_with_their_reason(void **state)
{
    (void)state;
    static const parser all[] = {dk_parse_wavelength, dk_parse_temperature,
                                 dk_parse_length,     dk_parse_duration,
                                 dk_parse_intensity,  dk_parse_power};
    static const struct {
        const char *text, *reason;
    } cases[] = {
        {"nan", "not a finite number"},   {"NaN", "not a finite number"},
        {"nanum", "not a finite number"}, {"-nan", "not a finite number"},
        {"inf", "not a finite number"},   {"-inf", "not a finite number"},
        {"Infinity", "not a finite number"},
        {"", "empty"},                    {"   ", "empty"},
        {"0x1p3um", "hexadecimal"},       {"0x10", "hexadecimal"},
        {"-0X1.8p1mm", "hexadecimal"},    {"x1um", "cannot read"},
        {"um", "cannot read"},            {".", "cannot read"},
        {"+-1mm", "cannot read"},         {"1,5mm", "unit"},
        {"1.0.0um", "unit"},              {"1um x", "unit"},
        {"1 um,", "unit"},                {"1e", "unit"},
    };
    for (size_t p = 0; p < sizeof all / sizeof all[0]; p++)
        for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
            const char *const parts[] = {cases[i].reason, NULL};
            expect_error(all[p], cases[i].text, parts);
        }
    /* NULL is an empty value, not a crash. */
    for (size_t p = 0; p < sizeof all / sizeof all[0]; p++) {
        const char *const parts[] = {"empty", NULL};
        expect_error(all[p], NULL, parts);
    }
}

static void
messages_name_the_quantity_and_the_rule(void **state)
{
    (void)state;
    EXPECT(dk_parse_intensity, "-5GW/cm2", "intensity '-5GW/cm2'",
           "must not be negative");
    EXPECT(dk_parse_power, "-1W", "power '-1W'", "must not be negative");
    EXPECT(dk_parse_length, "0mm", "length '0mm'", "must be positive");
    EXPECT(dk_parse_length, "-0mm", "length", "must be positive");
    EXPECT(dk_parse_duration, "-30fs", "duration", "must be positive");
    EXPECT(dk_parse_wavelength, "0nm", "wavelength", "must be positive");
    EXPECT(dk_parse_temperature, "-300", "temperature '-300'",
           "absolute zero");
    EXPECT(dk_parse_temperature, "0K", "absolute zero");
    EXPECT(dk_parse_intensity, "5", "intensity '5' has no unit");
    EXPECT(dk_parse_intensity, "5GW", "unknown unit in intensity");
    EXPECT(dk_parse_duration, "30", "duration '30' has no unit");
    /* Zero intensity and power are allowed (nothing incident). */
    double v = -1;
    assert_int_equal(dk_parse_intensity("0GW/cm2", &v, NULL), DK_OK);
    assert_true(v == 0 && !signbit(v));
    assert_int_equal(dk_parse_power("-0W", &v, NULL), DK_OK);
    assert_true(v == 0 && !signbit(v));
}

static void
quoted_text_is_escaped(void **state)
{
    (void)state;
    /* An escape sequence or newline in an argument must not reach the
     * terminal raw through the message. */
    EXPECT(dk_parse_wavelength, "1um\x1b[2J", "\\x1b[2J");
    EXPECT(dk_parse_length, "1\nmm", "\\x0a");
    EXPECT(dk_parse_temperature, "\x1b]0;owned\x07", "cannot read");
    /* A very long argument is cut, with "...". */
    char longtext[600];
    memset(longtext, '7', sizeof longtext - 3);
    memcpy(longtext + sizeof longtext - 3, "q", 2);
    dk_error err = {0};
    double v;
    assert_int_equal(dk_parse_length(longtext, &v, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "..."));
    assert_true(strlen(err.msg) < 200);
}

static void
strict_integers(void **state)
{
    (void)state;
    long v = -7;
    dk_error err = {0};
    assert_int_equal(dk_parse_int("12", 1, 1000, &v, &err), DK_OK);
    assert_int_equal(v, 12);
    assert_int_equal(dk_parse_int(" +3 ", 1, 1000, &v, &err), DK_OK);
    assert_int_equal(v, 3);
    assert_int_equal(dk_parse_int("-5", -10, 10, &v, &err), DK_OK);
    assert_int_equal(v, -5);
    assert_int_equal(dk_parse_int("1000", 1, 1000, &v, &err), DK_OK);
    /* No wrap-around: 2^32 + 1 is not order 1. */
    v = -7;
    assert_int_equal(dk_parse_int("4294967297", 1, 1000, &v, &err),
                     DK_EINVAL);
    assert_int_equal(v, -7);
    assert_non_null(strstr(err.msg, "'4294967297' is out of range"));
    assert_non_null(strstr(err.msg, "from 1 to 1000"));
    assert_int_equal(dk_parse_int("99999999999999999999999", LONG_MIN,
                                  LONG_MAX, &v, &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "out of range"));
    assert_int_equal(dk_parse_int("0", 1, 1000, &v, &err), DK_EINVAL);
    assert_int_equal(dk_parse_int("1001", 1, 1000, &v, &err), DK_EINVAL);
    static const char *const bad[] = {"",    " ",   "1.0",  "1e3", "0x10",
                                      "12abc", "-",  "+",   "1 2", "one",
                                      "\xef\xbc\x91" /* fullwidth 1 */};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        assert_int_equal(dk_parse_int(bad[i], 1, 1000, &v, &err), DK_EINVAL);
        assert_true(strstr(err.msg, "whole number") != NULL);
        assert_true(printable(err.msg));
        assert_int_equal(v, -7);
    }
    assert_int_equal(dk_parse_int(NULL, 1, 3, &v, NULL), DK_EINVAL);
}

static void
strict_plain_numbers(void **state)
{
    (void)state;
    double v = -7;
    dk_error err = {0};
    assert_int_equal(dk_parse_double("0.5", 0, 1, &v, &err), DK_OK);
    assert_within(v, 0.5, 0, 0);
    assert_int_equal(dk_parse_double("-2e-3", -1, 1, &v, &err), DK_OK);
    assert_int_equal(dk_parse_double("1e300", -HUGE_VAL, HUGE_VAL, &v, &err),
                     DK_OK);
    v = -7;
    static const char *const bad[] = {"", "nan", "inf", "-inf", "0x1p-1",
                                      "0.5mm", "0.5 x", "."};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        assert_int_equal(dk_parse_double(bad[i], 0, 1, &v, &err), DK_EINVAL);
        assert_within(v, -7, 0, 0);
    }
    assert_int_equal(dk_parse_double("nan", -HUGE_VAL, HUGE_VAL, &v, &err),
                     DK_EINVAL);
    /* The bounds are printed exactly: 0.3499999 is not shown as if it
     * were 0.35, inside the range. */
    assert_int_equal(dk_parse_double("0.3499999", 0.35, 5, &v, &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "'0.3499999' is out of range"));
    assert_non_null(strstr(err.msg, "from 0.35 to 5"));
    assert_int_equal(dk_parse_double("0.35", 0.3500001, 5, &v, &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "from 0.3500001 to 5"));
}

static void
angles(void **state)
{
    (void)state;
    double d = -7;
    dk_error err = {0};
    assert_int_equal(dk_parse_angle_deg("30", -90, 90, &d, &err), DK_OK);
    assert_within(d, 30, 0, 0);
    assert_int_equal(dk_parse_angle_deg("30deg", -90, 90, &d, &err), DK_OK);
    assert_int_equal(dk_parse_angle_deg("-30°", -90, 90, &d, &err), DK_OK);
    assert_within(d, -30, 0, 0);
    assert_int_equal(dk_parse_angle_deg("0.5rad", 0, 90, &d, &err), DK_OK);
    assert_within(d, 0.5 * 180 / M_PI, 1e-15, 0);
    assert_int_equal(dk_parse_angle_deg("10mrad", 0, 90, &d, &err), DK_OK);
    assert_within(d, 0.01 * 180 / M_PI, 1e-15, 0);
    assert_int_equal(dk_parse_angle_deg("100urad", 0, 90, &d, &err), DK_OK);
    assert_within(d, 1e-4 * 180 / M_PI, 1e-15, 0);
    d = -7;
    assert_int_equal(dk_parse_angle_deg("95deg", -90, 90, &d, &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "angle '95deg' is out of range"));
    assert_non_null(strstr(err.msg, "from -90 to 90 degrees"));
    assert_int_equal(dk_parse_angle_deg("2rad", -90, 90, &d, &err),
                     DK_EINVAL);
    assert_int_equal(dk_parse_angle_deg("nan", -90, 90, &d, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "not a finite number"));
    assert_int_equal(dk_parse_angle_deg("", -90, 90, &d, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "empty"));
    assert_int_equal(dk_parse_angle_deg("30 gon", -90, 90, &d, &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "unknown angle unit"));
    assert_int_equal(dk_parse_angle_deg("1e307rad", -HUGE_VAL, HUGE_VAL, &d,
                                        &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "too large"));
    assert_within(d, -7, 0, 0);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(wavelength_forms),
        cmocka_unit_test(wavelength_errors),
        cmocka_unit_test(temperatures),
        cmocka_unit_test(lengths),
        cmocka_unit_test(overflow_after_scaling_is_an_error),
        cmocka_unit_test(non_numbers_are_refused_with_their_reason),
        cmocka_unit_test(messages_name_the_quantity_and_the_rule),
        cmocka_unit_test(quoted_text_is_escaped),
        cmocka_unit_test(strict_integers),
        cmocka_unit_test(strict_plain_numbers),
        cmocka_unit_test(angles),
    };
    return cmocka_run_group_tests_name("units", tests, NULL, NULL);
}
