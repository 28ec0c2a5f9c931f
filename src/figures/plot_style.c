/*
 * plot_style.c - how each series is drawn, so that every figure also
 * reads in black and white.
 *
 * Series k takes line colour k mod 5 (plot_color.c), dash pattern k mod 4
 * (solid, long dashes, dots, dash-dot) and marker k mod 5 (none, open
 * circle, filled square, open triangle, filled diamond). 4 and 5 have no
 * common factor, so the first 20 series differ in dash and marker
 * together, whatever their colours look like in greyscale (two of the
 * five colours have nearly the same lightness); series 0 is a plain
 * solid line, so a figure of one curve carries no markers. Cycling
 * several cues together so that curves stay apart without colour is
 * common practice for print figures.
 *
 * The parts of a line outside a data set's fitted range keep the hue but
 * are drawn lighter (half way to white), thinner (0.6) and dotted.
 */
#include <string.h>

#include "plot_internal.h"

#define NDASH 4

/* Dash patterns in line widths (on, off, ...); round caps make the
 * zero-length "on" dashes dots. */
static const struct {
    int n;
    double d[PLOT_MAX_DASH];
} DASHES[NDASH] = {
    {0, {0}},                 /* solid */
    {2, {5.0, 2.6}},          /* long dashes */
    {2, {0.0, 2.0}},          /* dots */
    {4, {5.0, 2.2, 0.0, 2.2}} /* dash-dot */
};

static const double OUTSIDE_DASH[2] = {0.0, 2.6};
#define OUTSIDE_WIDTH 0.6
#define OUTSIDE_WHITE 0.5

void
plot_series_style(size_t k, plot_style *s)
{
    dk_palette_rgb((int)(k % (size_t)dk_palette_size()), s->rgb);
    size_t d = k % NDASH;
    s->ndash = DASHES[d].n;
    memcpy(s->dash, DASHES[d].d, sizeof s->dash);
    s->marker = (int)(k % PLOT_MARK_COUNT);
}

void
plot_outside_style(const plot_style *s, plot_style *out, double *width)
{
    *out = *s;
    for (int c = 0; c < 3; c++)
        out->rgb[c] = s->rgb[c] + OUTSIDE_WHITE * (1 - s->rgb[c]);
    out->ndash = 2;
    memcpy(out->dash, OUTSIDE_DASH, sizeof OUTSIDE_DASH);
    *width = OUTSIDE_WIDTH;
}
