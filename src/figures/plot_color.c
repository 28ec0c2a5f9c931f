/*
 * plot_color.c - colour for figures: CIELAB ↔ sRGB, the CIEDE2000
 * difference, the "afterglow" map colour scale and the line palette.
 *
 * Conversions. CIELAB → XYZ by CIE 15:2004 with the D65 white
 * (Xn, Yn, Zn) = (0.95047, 1, 1.08883) and ε = 216/24389, κ = 24389/27;
 * XYZ → linear sRGB by the 4-decimal matrix of IEC 61966-2-1:1999, then
 * the sRGB transfer curve (12.92·c up to 0.0031308, else
 * 1.055·c^(1/2.4) − 0.055). The reverse uses the exact inverse of that
 * matrix, so round trips close to rounding error. Out-of-gamut values are
 * not clipped: the transfer curve is extended as an odd function.
 *
 * CIEDE2000: Sharma, Wu and Dalal (2005), eqs. (1)-(22), with the hue
 * conventions of their implementation notes (h = 0 for a neutral colour,
 * mean hue of a neutral pair = sum).
 *
 * The colour scale follows Kovesi (2015): a path in CIELAB whose lightness
 * L* rises linearly (the eye reads order and gradient from lightness, so the
 * scale reads the same to colour-blind viewers and in greyscale), whose hue
 * turns steadily, and whose chroma is a smooth arch kept inside the sRGB
 * gamut; the path is then re-spaced so that equal steps of the parameter are
 * equal CIEDE2000 differences (Kovesi equalises the perceptual contrast
 * along his maps in this spirit). Ours: L* 12 → 94, hue angle h_ab 285° →
 * 460° (indigo, plum, rose, apricot, straw), chroma 22 → 60 (at 45 % of the
 * path) → 30. The parameters were chosen by us and checked for gamut and for
 * lightness order under simulated protan, deutan and tritan vision
 * (tests/test_plot.c).
 *
 * Line palette: five colours of our choosing (ink blue, amber, teal,
 * wine, sky) whose pairwise CIEDE2000 differences stay ≥ 10 for normal
 * vision and for full protan, deutan and tritan dichromacy simulated by
 * Machado, Oliveira and Fernandes (2009) (checked in tests/test_plot.c);
 * L* 34-71 so that thin lines stay visible on white.
 *
 * References:
 *   CIE 15:2004, Colorimetry, 3rd ed., Commission Internationale de
 *   l'Eclairage, Vienna (2004).
 *   IEC 61966-2-1:1999, Multimedia systems and equipment - Colour
 *   measurement and management - Part 2-1: Default RGB colour space - sRGB.
 *   G. Sharma, W. Wu, E. N. Dalal, "The CIEDE2000 color-difference
 *   formula: implementation notes, supplementary test data, and
 *   mathematical observations", Color Res. Appl. 30, 21-30 (2005).
 *   P. Kovesi, "Good colour maps: how to design them", arXiv:1509.03700
 *   (2015).
 *   G. M. Machado, M. M. Oliveira, L. A. F. Fernandes, "A physiologically-
 *   based model for simulation of color vision deficiency", IEEE Trans.
 *   Vis. Comput. Graph. 15, 1291-1298 (2009).
 */
#include <math.h>

#include "deltak/constants.h"
#include "plot_internal.h"

#define PI DK_PI
#define DEG DK_RAD_PER_DEG

/* D65 reference white, 2° observer (CIE 15:2004), Y = 1. */
static const double WHITE[3] = {0.95047, 1.0, 1.08883};
#define LAB_EPS (216.0 / 24389.0)
#define LAB_KAPPA (24389.0 / 27.0)

/* XYZ (Y = 1 white) → linear sRGB, IEC 61966-2-1:1999. */
static const double XYZ_TO_RGB[3][3] = {
    {3.2406, -1.5372, -0.4986},
    {-0.9689, 1.8758, 0.0415},
    {0.0557, -0.2040, 1.0570},
};

#define GAMUT_TOL 1e-9

/* The afterglow path (see the header comment). */
#define MAP_L0 12.0
#define MAP_L1 94.0
#define MAP_H0_DEG 285.0
#define MAP_H1_DEG 460.0
#define MAP_C0 22.0
#define MAP_CPEAK 60.0
#define MAP_SPEAK 0.45
#define MAP_C1 30.0
/* Path samples for the CIEDE2000 re-spacing. */
#define MAP_SAMPLES 1024

static const unsigned PALETTE[] = {0x1d4e9a, 0xe0902c, 0x2f9e86, 0xa3345a,
                                   0x7fb2dc};
#define NPALETTE ((int)(sizeof PALETTE / sizeof PALETTE[0]))

static double
srgb_encode(double c)
{
    if (c < 0)
        return -srgb_encode(-c);
    return c <= 0.0031308 ? 12.92 * c : 1.055 * pow(c, 1 / 2.4) - 0.055;
}

static double
srgb_decode(double c)
{
    if (c < 0)
        return -srgb_decode(-c);
    return c <= 0.04045 ? c / 12.92 : pow((c + 0.055) / 1.055, 2.4);
}

static double
lab_finv(double f)
{
    double f3 = f * f * f;
    return f3 > LAB_EPS ? f3 : (116 * f - 16) / LAB_KAPPA;
}

static double
lab_f(double t)
{
    return t > LAB_EPS ? cbrt(t) : (LAB_KAPPA * t + 16) / 116;
}

int
dk_color_lab_to_srgb(const double lab[3], double rgb[3])
{
    double fy = (lab[0] + 16) / 116;
    double fx = fy + lab[1] / 500;
    double fz = fy - lab[2] / 200;
    double xyz[3] = {
        WHITE[0] * lab_finv(fx),
        WHITE[1] * (lab[0] > LAB_KAPPA * LAB_EPS ? fy * fy * fy
                                                 : lab[0] / LAB_KAPPA),
        WHITE[2] * lab_finv(fz),
    };
    int ok = 1;
    for (int i = 0; i < 3; i++) {
        double lin = XYZ_TO_RGB[i][0] * xyz[0] + XYZ_TO_RGB[i][1] * xyz[1] +
                     XYZ_TO_RGB[i][2] * xyz[2];
        rgb[i] = srgb_encode(lin);
        if (!(rgb[i] >= -GAMUT_TOL && rgb[i] <= 1 + GAMUT_TOL))
            ok = 0;
    }
    return ok;
}

void
dk_color_srgb_to_lab(const double rgb[3], double lab[3])
{
    /* Inverse of XYZ_TO_RGB by cofactors (its condition number is 4.3). */
    const double(*m)[3] = XYZ_TO_RGB;
    double inv[3][3];
    inv[0][0] = m[1][1] * m[2][2] - m[1][2] * m[2][1];
    inv[0][1] = m[0][2] * m[2][1] - m[0][1] * m[2][2];
    inv[0][2] = m[0][1] * m[1][2] - m[0][2] * m[1][1];
    inv[1][0] = m[1][2] * m[2][0] - m[1][0] * m[2][2];
    inv[1][1] = m[0][0] * m[2][2] - m[0][2] * m[2][0];
    inv[1][2] = m[0][2] * m[1][0] - m[0][0] * m[1][2];
    inv[2][0] = m[1][0] * m[2][1] - m[1][1] * m[2][0];
    inv[2][1] = m[0][1] * m[2][0] - m[0][0] * m[2][1];
    inv[2][2] = m[0][0] * m[1][1] - m[0][1] * m[1][0];
    double det = m[0][0] * inv[0][0] + m[0][1] * inv[1][0] +
                 m[0][2] * inv[2][0];
    double lin[3], xyz[3];
    for (int i = 0; i < 3; i++)
        lin[i] = srgb_decode(rgb[i]);
    for (int i = 0; i < 3; i++)
        xyz[i] = (inv[i][0] * lin[0] + inv[i][1] * lin[1] +
                  inv[i][2] * lin[2]) / det / WHITE[i];
    lab[0] = 116 * lab_f(xyz[1]) - 16;
    lab[1] = 500 * (lab_f(xyz[0]) - lab_f(xyz[1]));
    lab[2] = 200 * (lab_f(xyz[1]) - lab_f(xyz[2]));
}

/* Hue angle in degrees, [0, 360); 0 for a neutral colour. */
static double
hue_deg(double b, double a)
{
    if (a == 0 && b == 0)
        return 0;
    double h = atan2(b, a) / DEG;
    return h < 0 ? h + 360 : h;
}

double
dk_color_delta_e2000(const double lab1[3], const double lab2[3])
{
    const double p25_7 = 6103515625.0; /* 25^7 */
    double L1 = lab1[0], a1 = lab1[1], b1 = lab1[2];
    double L2 = lab2[0], a2 = lab2[1], b2 = lab2[2];
    double cbar = (hypot(a1, b1) + hypot(a2, b2)) / 2;
    double cbar7 = pow(cbar, 7);
    double g = 0.5 * (1 - sqrt(cbar7 / (cbar7 + p25_7)));
    double ap1 = (1 + g) * a1, ap2 = (1 + g) * a2;
    double cp1 = hypot(ap1, b1), cp2 = hypot(ap2, b2);
    double hp1 = hue_deg(b1, ap1), hp2 = hue_deg(b2, ap2);

    double dl = L2 - L1, dc = cp2 - cp1, dh = 0;
    if (cp1 * cp2 != 0) {
        dh = hp2 - hp1;
        if (dh > 180)
            dh -= 360;
        else if (dh < -180)
            dh += 360;
    }
    double dH = 2 * sqrt(cp1 * cp2) * sin(dh * DEG / 2);

    double lbar = (L1 + L2) / 2, cpbar = (cp1 + cp2) / 2, hbar;
    if (cp1 * cp2 == 0)
        hbar = hp1 + hp2;
    else if (fabs(hp1 - hp2) <= 180)
        hbar = (hp1 + hp2) / 2;
    else if (hp1 + hp2 < 360)
        hbar = (hp1 + hp2 + 360) / 2;
    else
        hbar = (hp1 + hp2 - 360) / 2;

    double t = 1 - 0.17 * cos((hbar - 30) * DEG) + 0.24 * cos(2 * hbar * DEG) +
               0.32 * cos((3 * hbar + 6) * DEG) -
               0.20 * cos((4 * hbar - 63) * DEG);
    double dtheta = 30 * exp(-pow((hbar - 275) / 25, 2));
    double cpbar7 = pow(cpbar, 7);
    double rc = 2 * sqrt(cpbar7 / (cpbar7 + p25_7));
    double l50 = (lbar - 50) * (lbar - 50);
    double sl = 1 + 0.015 * l50 / sqrt(20 + l50);
    double sc = 1 + 0.045 * cpbar;
    double sh = 1 + 0.015 * cpbar * t;
    double rt = -sin(2 * dtheta * DEG) * rc;
    double tl = dl / sl, tc = dc / sc, th = dH / sh;
    return sqrt(tl * tl + tc * tc + th * th + rt * tc * th);
}

/* The path before re-spacing, s in [0, 1]. */
static void
path_lab(double s, double lab[3])
{
    double c;
    if (s < MAP_SPEAK) {
        double u = sin(0.5 * PI * s / MAP_SPEAK);
        c = MAP_C0 + (MAP_CPEAK - MAP_C0) * u * u;
    } else {
        double u = sin(0.5 * PI * (1 - s) / (1 - MAP_SPEAK));
        c = MAP_C1 + (MAP_CPEAK - MAP_C1) * u * u;
    }
    double h = (MAP_H0_DEG + (MAP_H1_DEG - MAP_H0_DEG) * s) * DEG;
    lab[0] = MAP_L0 + (MAP_L1 - MAP_L0) * s;
    lab[1] = c * cos(h);
    lab[2] = c * sin(h);
}

/* Cumulative CIEDE2000 length along the path at s = k / MAP_SAMPLES. */
static void
path_length(double cum[MAP_SAMPLES + 1])
{
    double prev[3], cur[3];
    path_lab(0, prev);
    cum[0] = 0;
    for (int k = 1; k <= MAP_SAMPLES; k++) {
        path_lab((double)k / MAP_SAMPLES, cur);
        cum[k] = cum[k - 1] + dk_color_delta_e2000(prev, cur);
        prev[0] = cur[0], prev[1] = cur[1], prev[2] = cur[2];
    }
}

/* The path point a fraction t of the way along its length. */
static void
respaced_lab(const double cum[MAP_SAMPLES + 1], double t, double lab[3])
{
    if (!(t > 0))
        t = 0;
    if (t > 1)
        t = 1;
    double d = t * cum[MAP_SAMPLES];
    int lo = 0, hi = MAP_SAMPLES;
    while (hi - lo > 1) {
        int mid = (lo + hi) / 2;
        if (cum[mid] <= d)
            lo = mid;
        else
            hi = mid;
    }
    double seg = cum[hi] - cum[lo];
    double frac = seg > 0 ? (d - cum[lo]) / seg : 0;
    path_lab((lo + frac) / MAP_SAMPLES, lab);
}

void
dk_colormap_lab(double t, double lab[3])
{
    double cum[MAP_SAMPLES + 1];
    path_length(cum);
    respaced_lab(cum, t, lab);
}

void
dk_colormap_rgb(double t, double rgb[3])
{
    double lab[3];
    dk_colormap_lab(t, lab);
    dk_color_lab_to_srgb(lab, rgb);
}

void
plot_colormap_table(int n, double *rgb)
{
    double cum[MAP_SAMPLES + 1], lab[3];
    path_length(cum);
    for (int k = 0; k < n; k++) {
        respaced_lab(cum, (double)k / (n - 1), lab);
        dk_color_lab_to_srgb(lab, rgb + 3 * k);
    }
}

int
dk_palette_size(void)
{
    return NPALETTE;
}

void
dk_palette_rgb(int i, double rgb[3])
{
    i %= NPALETTE;
    if (i < 0)
        i += NPALETTE;
    unsigned c = PALETTE[i];
    rgb[0] = ((c >> 16) & 0xff) / 255.0;
    rgb[1] = ((c >> 8) & 0xff) / 255.0;
    rgb[2] = (c & 0xff) / 255.0;
}
