/*
 * plot_png.c - the resolution of a PNG file: a pHYs chunk inserted after
 * IHDR, since cairo writes none.
 *
 * PNG layout (ISO/IEC 15948:2004, §5.3 and §11.3.5.3): an 8-byte
 * signature, then chunks of length (4 bytes, big-endian), type (4),
 * data, and a CRC-32 over type and data. IHDR comes first; pHYs must come
 * before the first IDAT. pHYs holds pixels per unit along x and y (4 bytes
 * each) and a unit byte, 1 for the metre. dpi → pixels per metre is
 * dpi / 0.0254, rounded.
 *
 * CRC-32: the polynomial 0xEDB88320 (reflected), initial value and final
 * XOR 0xFFFFFFFF, as ISO 3309 and ITU-T V.42 (the PNG specification,
 * annex D). Checked in the tests against the published check value
 * CRC-32("123456789") = 0xCBF43926.
 *
 * References:
 *   ISO/IEC 15948:2004, Portable Network Graphics (PNG) specification,
 *   2nd ed. (W3C Recommendation, 10 November 2003).
 */
#include <math.h>
#include <string.h>

#include "plot_internal.h"

static const unsigned char SIGNATURE[8] = {137, 80, 78, 71, 13, 10, 26, 10};
#define PHYS_CHUNK 21   /* 4 length + 4 type + 9 data + 4 CRC */

unsigned long
plot_png_crc(const unsigned char *data, size_t n)
{
    unsigned long c = 0xffffffffUL;
    for (size_t i = 0; i < n; i++) {
        c ^= data[i];
        for (int k = 0; k < 8; k++)
            c = (c & 1) ? 0xedb88320UL ^ (c >> 1) : c >> 1;
    }
    return c ^ 0xffffffffUL;
}

static void
put32(unsigned char *b, unsigned long v)
{
    b[0] = (unsigned char)(v >> 24);
    b[1] = (unsigned char)(v >> 16);
    b[2] = (unsigned char)(v >> 8);
    b[3] = (unsigned char)v;
}

static unsigned long
get32(const unsigned char *b)
{
    return (unsigned long)b[0] << 24 | (unsigned long)b[1] << 16 |
           (unsigned long)b[2] << 8 | b[3];
}

int
plot_png_set_dpi(unsigned char *buf, size_t *len, size_t cap, double dpi)
{
    size_t n = *len;
    if (n < 8 + 25 || memcmp(buf, SIGNATURE, 8) != 0 ||
        memcmp(buf + 12, "IHDR", 4) != 0 || n + PHYS_CHUNK > cap)
        return -1;
    size_t at = 8 + 12 + get32(buf + 8); /* just after IHDR */
    if (at > n)
        return -1;
    unsigned char c[PHYS_CHUNK];
    unsigned long ppm = (unsigned long)lround(dpi / 0.0254);
    put32(c, 9);
    memcpy(c + 4, "pHYs", 4);
    put32(c + 8, ppm);
    put32(c + 12, ppm);
    c[16] = 1; /* unit: metre */
    put32(c + 17, plot_png_crc(c + 4, 13));
    memmove(buf + at + PHYS_CHUNK, buf + at, n - at);
    memcpy(buf + at, c, PHYS_CHUNK);
    *len = n + PHYS_CHUNK;
    return 0;
}
