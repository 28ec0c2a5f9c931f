/*
 * fuzz_units.c - libFuzzer target for the quantity and option parsers
 * (deltak/units.h) and the text helpers (deltak/text.h).
 *
 * Promises checked: DK_OK gives a finite value that obeys the documented
 * rule (positive, above absolute zero, in [lo, hi]); an error leaves the
 * output untouched and has a one-line printable message; escaping always
 * yields printable text within its buffer; exact numbers read back
 * exactly and range-aware numbers keep their side of each bound.
 */
#include <limits.h>
#include <math.h>

#include "deltak/text.h"
#include "deltak/units.h"
#include "fuzz_common.h"

typedef dk_status (*parser)(const char *, double *, dk_error *);

/* Run @fn on @s; on success check lo < v (or <=) and finiteness. */
static void
check_unit(parser fn, const char *s, double lo, int strict)
{
    double v = -1234.5;
    dk_error err = {0};
    if (fn(s, &v, &err) == DK_OK) {
        FUZZ_REQUIRE(isfinite(v));
        FUZZ_REQUIRE(strict ? v > lo : v >= lo);
    } else {
        FUZZ_REQUIRE(v == -1234.5);
        FUZZ_REQUIRE(fuzz_message_ok(&err));
    }
}

static void
check_double(const char *s, double lo, double hi)
{
    double v = -1234.5;
    dk_error err = {0};
    if (dk_parse_double(s, lo, hi, &v, &err) == DK_OK)
        FUZZ_REQUIRE(isfinite(v) && v >= lo && v <= hi);
    else
        FUZZ_REQUIRE(v == -1234.5 && fuzz_message_ok(&err));
    v = -1234.5;
    if (dk_parse_angle_deg(s, lo, hi, &v, &err) == DK_OK)
        FUZZ_REQUIRE(isfinite(v) && v >= lo && v <= hi);
    else
        FUZZ_REQUIRE(v == -1234.5 && fuzz_message_ok(&err));
}

static void
check_int(const char *s, long lo, long hi)
{
    long v = -7;
    dk_error err = {0};
    if (dk_parse_int(s, lo, hi, &v, &err) == DK_OK)
        FUZZ_REQUIRE(v >= lo && v <= hi);
    else
        FUZZ_REQUIRE(v == -7 && fuzz_message_ok(&err));
}

static void
check_text(const char *s)
{
    static const size_t sizes[] = {8, 13, 64, 4096};
    for (size_t i = 0; i < sizeof sizes / sizeof sizes[0]; i++) {
        char out[4096];
        dk_text_escape(s, out, sizes[i]);
        size_t n = strlen(out);
        FUZZ_REQUIRE(n < sizes[i]);
        for (size_t j = 0; j < n; j++)
            FUZZ_REQUIRE((unsigned char)out[j] >= 0x20 &&
                         (unsigned char)out[j] != 0x7f);
        FUZZ_REQUIRE(dk_text_is_clean(out, 0));
    }
}

static void
check_numbers(const uint8_t *data, size_t size)
{
    if (size < 24)
        return;
    double v[3];
    memcpy(v, data + size - 24, sizeof v);
    char b[40];
    for (int i = 0; i < 3; i++) {
        dk_format_exact(v[i], b, sizeof b);
        if (isfinite(v[i]))
            FUZZ_REQUIRE(strtod(b, NULL) == v[i]);
    }
    if (!isfinite(v[0]) || !isfinite(v[1]) || !isfinite(v[2]))
        return;
    dk_format_against_range(v[0], v[1], v[2], b, sizeof b);
    double back = strtod(b, NULL);
    FUZZ_REQUIRE((back < v[1]) == (v[0] < v[1]));
    FUZZ_REQUIRE((back > v[1]) == (v[0] > v[1]));
    FUZZ_REQUIRE((back < v[2]) == (v[0] < v[2]));
    FUZZ_REQUIRE((back > v[2]) == (v[0] > v[2]));
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    char *s = fuzz_string(data, size);
    check_unit(dk_parse_wavelength, s, 0, 1);
    check_unit(dk_parse_temperature, s, -273.15, 1);
    check_unit(dk_parse_length, s, 0, 1);
    check_unit(dk_parse_duration, s, 0, 1);
    check_unit(dk_parse_intensity, s, 0, 0);
    check_unit(dk_parse_power, s, 0, 0);
    check_double(s, 0.35, 5);
    check_double(s, -HUGE_VAL, HUGE_VAL);
    check_int(s, 1, 1000);
    check_int(s, LONG_MIN, LONG_MAX);
    check_text(s);
    check_numbers(data, size);
    free(s);
    return 0;
}
