/*
 * test_units.c - quantities with units (deltak/units.h).
 * Conversion facts: λ[µm] = 1e4/ν̃[cm⁻¹] = c/f with c = 299792458 m/s
 * exact (SI definition).
 */
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

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(wavelength_forms),
        cmocka_unit_test(wavelength_errors),
        cmocka_unit_test(temperatures),
        cmocka_unit_test(lengths),
    };
    return cmocka_run_group_tests_name("units", tests, NULL, NULL);
}
