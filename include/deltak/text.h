/*
 * text.h - text shown to people: untrusted text made safe to print, and
 * numbers printed with enough digits to be exact where it matters.
 *
 * Text from files and arguments may carry control characters (escape
 * sequences that rewrite the terminal, newlines that forge a line of a
 * report or a CSV row). dk_text_escape() writes such text so that every
 * byte is visible; dk_text_is_clean() lets a reader refuse it instead.
 * "Control character" here means C0 (U+0000-U+001F), DEL (U+007F) and
 * C1 (U+0080-U+009F, which some terminals obey as escape sequences);
 * bytes that are not valid UTF-8 are treated the same way.
 */
#ifndef DK_TEXT_H
#define DK_TEXT_H

#include <stddef.h>

/*
 * dk_text_escape:
 * @in: any NUL-terminated text; NULL is shown as "(null)"
 * @out: where to write, @n bytes (n >= 8)
 *
 * Copies @in with each control character and each byte that is not part
 * of valid UTF-8 written as \xNN (and a backslash as \\), so that the
 * result prints on one line and shows every byte. When @out is too
 * small the copy ends at a character boundary with "...".
 *
 * Returns: @out, always NUL-terminated.
 */
char *dk_text_escape(const char *in, char *out, size_t n);

/*
 * dk_text_is_clean:
 * @s: NUL-terminated text
 * @allow_layout: non-zero to accept newline and tab (multi-line notes)
 *
 * Returns: 1 when @s is valid UTF-8 without control characters (save
 * newline and tab when @allow_layout), else 0.
 */
int dk_text_is_clean(const char *s, int allow_layout);

/*
 * dk_format_exact:
 * @v: any double
 * @out: at least 32 bytes
 *
 * Writes the shortest "%g" form (1 to 17 significant digits) that reads
 * back as exactly @v: 0.35 prints as "0.35", 0.3499999 as "0.3499999".
 * Use it for bounds and limits quoted in messages.
 *
 * Returns: @out.
 */
char *dk_format_exact(double v, char *out, size_t n);

/*
 * dk_format_against_range:
 * @v: the value to show
 * @lo, @hi: the range it is compared with in the same message
 * @out: at least 32 bytes
 *
 * Writes @v with 6 significant digits, or with more where 6 would put it
 * on the other side of (or onto) @lo or @hi: 0.3499999 against
 * 0.35-5 prints "0.3499999", never "0.35". Pair it with
 * dk_format_exact() for the bounds.
 *
 * Returns: @out.
 */
char *dk_format_against_range(double v, double lo, double hi, char *out,
                              size_t n);

#endif /* DK_TEXT_H */
