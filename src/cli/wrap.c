/*
 * wrap.c - explanatory text folded to a terminal's width (cli_wrap in
 * cli.h).
 *
 * Greedy filling: words (runs without a space) are placed on the line
 * while it stays within CLI_WIDTH columns; a word longer than a line
 * stands alone. A number keeps the word after it ("25 C", "1.2 um",
 * "31.5 deg"): a word ending in a digit is placed together with the
 * next. Width counts characters, not bytes (UTF-8 continuation
 * bytes take no column), so "°" or "λ" count once. A '\n' in the text
 * starts a new line. Tables are laid out by their own formats; notes
 * ("assumed:", "warning:") stay one line each, so that they can be
 * searched with grep.
 */
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"

/* Columns taken by @n bytes of UTF-8 at @s. */
static size_t
columns(const char *s, size_t n)
{
    size_t c = 0;
    for (size_t i = 0; i < n; i++)
        c += ((unsigned char)s[i] & 0xC0) != 0x80;
    return c;
}

void
cli_wrap(FILE *f, const char *lead, const char *hang, const char *text)
{
    size_t hang_cols = columns(hang, strlen(hang));
    size_t col = columns(lead, strlen(lead));
    int fresh = 1;   /* nothing but the lead or hang on this line yet */
    fputs(lead, f);
    for (const char *p = text; *p;) {
        if (*p == '\n') {
            fputc('\n', f);
            fputs(hang, f);
            col = hang_cols, fresh = 1;
            p++;
            continue;
        }
        if (*p == ' ') {
            p++;
            continue;
        }
        size_t n = strcspn(p, " \n");
        /* a number and its unit, as one piece */
        while (n > 0 && p[n - 1] >= '0' && p[n - 1] <= '9' && p[n] == ' ' &&
               p[n + 1] && p[n + 1] != ' ' && p[n + 1] != '\n')
            n += 1 + strcspn(p + n + 1, " \n");
        size_t w = columns(p, n);
        if (!fresh && col + 1 + w > CLI_WIDTH) {
            fputc('\n', f);
            fputs(hang, f);
            col = hang_cols, fresh = 1;
        }
        if (!fresh) {
            fputc(' ', f);
            col++;
        }
        fwrite(p, 1, n, f);
        col += w, fresh = 0;
        p += n;
    }
    fputc('\n', f);
}

void
cli_wrapf(FILE *f, const char *lead, const char *hang, const char *fmt, ...)
{
    char small[1024], *buf = small;
    va_list ap;
    va_start(ap, fmt);
    int n = vsnprintf(small, sizeof small, fmt, ap);
    va_end(ap);
    if (n < 0)
        return;
    /* a crystal file's note may be long: never cut it */
    if ((size_t)n >= sizeof small && (buf = malloc((size_t)n + 1))) {
        va_start(ap, fmt);
        vsnprintf(buf, (size_t)n + 1, fmt, ap);
        va_end(ap);
    } else if (!buf) {
        buf = small;
    }
    cli_wrap(f, lead, hang, buf);
    if (buf != small)
        free(buf);
}
