/*
 * text.c - safe display of untrusted text and exact numbers in messages
 * (see deltak/text.h).
 *
 * UTF-8 is decoded by the well-formed byte sequences of RFC 3629, table 3
 * (Unicode 15, table 3-7): overlong forms, surrogates and code points
 * above U+10FFFF are invalid. Numbers: the shortest of "%.1g" .. "%.17g"
 * that strtod reads back unchanged is exact, because 17 significant
 * digits identify every IEEE 754 double (IEEE Std 754-2008, 5.12.2).
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/text.h"

/* Length of the well-formed UTF-8 sequence at @s and its code point, or 0
 * when the bytes there are not one. */
static int
utf8_char(const unsigned char *s, unsigned long *cp)
{
    unsigned char c = s[0];
    if (c < 0x80) {
        *cp = c;
        return 1;
    }
    int len;
    unsigned char lo = 0x80, hi = 0xBF;
    if (c >= 0xC2 && c <= 0xDF)
        len = 2;
    else if (c >= 0xE0 && c <= 0xEF) {
        len = 3;
        if (c == 0xE0)
            lo = 0xA0;
        else if (c == 0xED)
            hi = 0x9F;
    } else if (c >= 0xF0 && c <= 0xF4) {
        len = 4;
        if (c == 0xF0)
            lo = 0x90;
        else if (c == 0xF4)
            hi = 0x8F;
    } else
        return 0;
    unsigned long v = c & (0x7F >> len);
    for (int i = 1; i < len; i++) {
        unsigned char b = s[i];
        if (i == 1 ? b < lo || b > hi : b < 0x80 || b > 0xBF)
            return 0; /* also stops at the terminating NUL */
        v = (v << 6) | (b & 0x3F);
    }
    *cp = v;
    return len;
}

static int
is_control(unsigned long cp)
{
    return cp < 0x20 || (cp >= 0x7F && cp <= 0x9F);
}

/* The escaped form of the character at @s into @piece (16 bytes); its
 * length in *plen. Returns the number of input bytes it covers. */
static int
escape_one(const unsigned char *s, char *piece, size_t *plen)
{
    static const char hex[] = "0123456789abcdef";
    unsigned long cp;
    int len = utf8_char(s, &cp);
    if (len == 0 || is_control(cp)) {
        /* Every byte of the offending character, as \xNN. */
        int nb = len ? len : 1;
        *plen = 0;
        for (int i = 0; i < nb; i++) {
            piece[(*plen)++] = '\\';
            piece[(*plen)++] = 'x';
            piece[(*plen)++] = hex[s[i] >> 4];
            piece[(*plen)++] = hex[s[i] & 15];
        }
        return nb;
    }
    if (cp == '\\') {
        piece[0] = piece[1] = '\\';
        *plen = 2;
        return 1;
    }
    memcpy(piece, s, (size_t)len);
    *plen = (size_t)len;
    return len;
}

char *
dk_text_escape(const char *in, char *out, size_t n)
{
    const unsigned char *start =
        (const unsigned char *)(in ? in : "(null)");
    if (n == 0)
        return out;
    /* Does the whole escaped text fit? Otherwise leave room for "...". */
    size_t total = 0;
    char piece[16];
    size_t plen;
    for (const unsigned char *s = start; *s;) {
        s += escape_one(s, piece, &plen);
        total += plen;
    }
    size_t room = total < n ? total : (n > 4 ? n - 4 : 0);
    size_t used = 0;
    for (const unsigned char *s = start; *s;) {
        int len = escape_one(s, piece, &plen);
        if (used + plen > room)
            break;
        memcpy(out + used, piece, plen);
        used += plen;
        s += len;
    }
    if (total >= n && n >= 4) {
        memcpy(out + used, "...", 3);
        used += 3;
    }
    out[used < n ? used : n - 1] = '\0';
    return out;
}

int
dk_text_is_clean(const char *s, int allow_layout)
{
    const unsigned char *p = (const unsigned char *)s;
    while (*p) {
        unsigned long cp;
        int len = utf8_char(p, &cp);
        if (len == 0)
            return 0;
        if (is_control(cp) && !(allow_layout && (cp == '\n' || cp == '\t')))
            return 0;
        p += len;
    }
    return 1;
}

/* Significant digits that print the integer part of @v without an
 * exponent (at least 1, at most 17). */
static int
integer_digits(double v)
{
    double a = fabs(v);
    if (!isfinite(a) || a < 10)
        return 1;
    int d = (int)floor(log10(a)) + 1;
    return d > 17 ? 17 : d;
}

char *
dk_format_exact(double v, char *out, size_t n)
{
    for (int p = integer_digits(v); p <= 17; p++) {
        snprintf(out, n, "%.*g", p, v);
        if (!isfinite(v) || strtod(out, NULL) == v)
            break;
    }
    return out;
}

/* -1, 0 or 1 as a compares with b. */
static int
cmp(double a, double b)
{
    return (a > b) - (a < b);
}

char *
dk_format_against_range(double v, double lo, double hi, char *out, size_t n)
{
    int p0 = integer_digits(v);
    for (int p = p0 > 6 ? p0 : 6; p <= 17; p++) {
        snprintf(out, n, "%.*g", p, v);
        double back = strtod(out, NULL);
        if (!isfinite(v) ||
            (cmp(back, lo) == cmp(v, lo) && cmp(back, hi) == cmp(v, hi)))
            break;
    }
    return out;
}
