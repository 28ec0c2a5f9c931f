/*
 * test_text.c - escaping untrusted text and exact numbers in messages
 * (deltak/text.h).
 *
 * UTF-8 well-formedness follows RFC 3629 / Unicode table 3-7: C0 80 is an
 * overlong NUL, ED A0 80 a surrogate, F4 90 80 80 beyond U+10FFFF. C1
 * control U+009B (CSI) is C2 9B in UTF-8 (ECMA-48 §5.3, 8-bit CSI).
 */
#include "testutil.h"

#include "deltak/notes.h"
#include "deltak/text.h"

static void
escape_controls(void **state)
{
    (void)state;
    static const struct {
        const char *in, *out;
    } cases[] = {
        {"BBO", "BBO"},
        {"1.064 µm", "1.064 µm"},           /* UTF-8 stays as it is */
        {"a\nb", "a\\x0ab"},
        {"\x1b[31mred", "\\x1b[31mred"},     /* ANSI colour sequence */
        {"tab\there", "tab\\x09here"},
        {"del\x7f", "del\\x7f"},
        {"csi\xc2\x9b" "2J", "csi\\xc2\\x9b2J"},  /* C1 control */
        {"bad\xff", "bad\\xff"},             /* not UTF-8 */
        {"\xc0\x80", "\\xc0\\x80"},          /* overlong NUL */
        {"\xed\xa0\x80", "\\xed\\xa0\\x80"}, /* surrogate */
        {"\xf4\x90\x80\x80", "\\xf4\\x90\\x80\\x80"},
        {"cut\xe2\x82", "cut\\xe2\\x82"},    /* truncated sequence */
        {"back\\slash", "back\\\\slash"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        char out[64];
        dk_text_escape(cases[i].in, out, sizeof out);
        if (strcmp(out, cases[i].out) != 0) {
            print_error("case %zu: got '%s', expected '%s'\n", i, out,
                        cases[i].out);
            fail();
        }
    }
    char out[16];
    assert_string_equal(dk_text_escape(NULL, out, sizeof out), "(null)");
}

static void
escape_truncates_at_a_character(void **state)
{
    (void)state;
    char out[12];
    dk_text_escape("abcdefghijklmnop", out, sizeof out);
    assert_string_equal(out, "abcdefgh...");
    /* A multi-byte character is never cut in half. */
    dk_text_escape("µµµµµµµµ", out, sizeof out);
    assert_string_equal(out, "µµµµ...");
    /* Exactly fitting text is not cut. */
    dk_text_escape("abcdefghijk", out, sizeof out);
    assert_string_equal(out, "abcdefghijk");
    /* An escape is not cut either. */
    dk_text_escape("abcde\n\n", out, sizeof out);
    assert_string_equal(out, "abcde...");
    dk_text_escape("abcdef\n", out, sizeof out);
    assert_string_equal(out, "abcdef\\x0a");
}

static void
clean_text(void **state)
{
    (void)state;
    assert_true(dk_text_is_clean("MgO:LiNbO3", 0));
    assert_true(dk_text_is_clean("β-BaB2O4, 1.064 µm", 0));
    assert_false(dk_text_is_clean("two\nlines", 0));
    assert_true(dk_text_is_clean("two\nlines\twith tab", 1));
    assert_false(dk_text_is_clean("\x1b[2J", 1));
    assert_false(dk_text_is_clean("\r", 1));
    assert_false(dk_text_is_clean("\xc2\x9b", 1));
    assert_false(dk_text_is_clean("\xff", 1));
}

static void
exact_numbers(void **state)
{
    (void)state;
    char b[32];
    assert_string_equal(dk_format_exact(0.35, b, sizeof b), "0.35");
    assert_string_equal(dk_format_exact(5, b, sizeof b), "5");
    assert_string_equal(dk_format_exact(-90, b, sizeof b), "-90");
    assert_string_equal(dk_format_exact(1064, b, sizeof b), "1064");
    assert_string_equal(dk_format_exact(0.3499999, b, sizeof b),
                        "0.3499999");
    assert_string_equal(dk_format_exact(1e-300, b, sizeof b), "1e-300");
    assert_string_equal(dk_format_exact(HUGE_VAL, b, sizeof b), "inf");
    /* Every value reads back exactly. */
    double vals[] = {0.1, 1.0 / 3, M_PI, 2.5e-7, 123456789.123, -1e22};
    for (size_t i = 0; i < sizeof vals / sizeof vals[0]; i++)
        assert_true(strtod(dk_format_exact(vals[i], b, sizeof b), NULL) ==
                    vals[i]);
}

static void
numbers_against_a_range(void **state)
{
    (void)state;
    char b[32];
    /* "0.35 um is outside 0.35-5 um" must not happen. */
    assert_string_equal(dk_format_against_range(0.3499999, 0.35, 5, b,
                                                sizeof b),
                        "0.3499999");
    assert_string_equal(dk_format_against_range(5.0000001, 0.35, 5, b,
                                                sizeof b),
                        "5.0000001");
    /* Just inside stays inside. */
    assert_string_equal(dk_format_against_range(0.35000001, 0.35, 5, b,
                                                sizeof b),
                        "0.35000001");
    /* Far from the bounds, six digits are enough. */
    assert_string_equal(dk_format_against_range(1.0640001, 0.35, 5, b,
                                                sizeof b),
                        "1.064");
    assert_string_equal(dk_format_against_range(0.35, 0.35, 5, b, sizeof b),
                        "0.35");
    /* Large values print their integer part. */
    assert_string_equal(dk_format_against_range(100000.5, 0, 100000, b,
                                                sizeof b),
                        "100000.5");
}

/* The CSV flag column: codes of the chosen kinds, each once, separated by
 * ';'; a code that does not fit is left out whole. */
static void
flag_codes(void **state)
{
    (void)state;
    dk_notes n;
    dk_notes_clear(&n);
    dk_notes_add(&n, DK_NOTE_DEFAULT, "default-set", "set A");
    dk_notes_add(&n, DK_NOTE_WARNING, "range", "outside");
    dk_notes_add(&n, DK_NOTE_DEFAULT, "default-set", "another text");
    dk_notes_add(&n, DK_NOTE_MEMORY, "memory-d", "d from memory");
    const unsigned mask = 1u << DK_NOTE_DEFAULT | 1u << DK_NOTE_MEMORY;
    char b[64];
    assert_int_equal(dk_notes_codes(&n, mask, b, sizeof b), 20);
    assert_string_equal(b, "default-set;memory-d");
    /* room for the first code only: the second is not cut in half */
    char s[16];
    assert_int_equal(dk_notes_codes(&n, mask, s, sizeof s), 11);
    assert_string_equal(s, "default-set");
    assert_int_equal(dk_notes_codes(&n, 1u << DK_NOTE_CAUTION, b, sizeof b),
                     0);
    assert_string_equal(b, "");
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(escape_controls),
        cmocka_unit_test(escape_truncates_at_a_character),
        cmocka_unit_test(clean_text),
        cmocka_unit_test(exact_numbers),
        cmocka_unit_test(numbers_against_a_range),
        cmocka_unit_test(flag_codes),
    };
    return cmocka_run_group_tests_name("text", tests, NULL, NULL);
}
