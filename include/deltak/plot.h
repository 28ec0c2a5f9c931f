/*
 * plot.h - publication figures: line plots (tuning curves, sinc² curves)
 * and 2-D maps with a colour bar and contour lines, written as PDF, SVG
 * or PNG through cairo and pango.
 *
 * The caller builds a dk_plot, adds data to it and writes it; nothing is
 * drawn until dk_plot_write(). All lengths on the page are in mm (the
 * figure size) or pt (font size, 1 pt = 1/72 inch); data are in the
 * caller's own units. Text is pango markup: UTF-8 symbols such as λ, Λ,
 * Δk, θ, µm, °C, and <sub>, <sup>, <i> are allowed, e.g.
 * "Idler wavelength λ<sub>i</sub> (µm)". Markup is checked when it is
 * set, so a malformed label is reported where it was given.
 *
 * House style: sans-serif type ("Sans" through fontconfig), a thin frame
 * with inward ticks on all four sides (outward on two over a map), 1-2-5
 * tick steps with minor ticks, a true minus sign, y and colour-bar
 * values of magnitude ≥ 1e5 or < 1e-3 labelled in units of 10^k with
 * "×10^k" once at the axis end, no grid and no title; five line colours
 * chosen to stay apart for protan, deutan and tritan viewers; maps use
 * the "afterglow" colour scale (dk_colormap_rgb), whose CIELAB lightness
 * rises monotonically.
 *
 * Output is deterministic: the same figure gives the same bytes (the
 * PDF carries no creation date). Files are written atomically: a
 * temporary file beside the target is renamed over it only when complete.
 *
 * References (methods in src/plot_*.c):
 *   P. Kovesi, "Good colour maps: how to design them", arXiv:1509.03700
 *   (2015) - the colour scale.
 *   IEC 61966-2-1:1999, sRGB; CIE 15:2004, Colorimetry, 3rd ed. - colour
 *   conversions. G. Sharma, W. Wu, E. N. Dalal, Color Res. Appl. 30, 21
 *   (2005) - CIEDE2000.
 *   W. E. Lorensen, H. E. Cline, Computer Graphics 21(4), 163 (1987) -
 *   marching cubes, whose 2-D case (marching squares) traces contours.
 *   P. S. Heckbert, "Nice numbers for graph labels", in Graphics Gems,
 *   Academic Press (1990), pp. 61-63 - 1-2-5 tick steps.
 *   Y.-D. Liang, B. A. Barsky, ACM Trans. Graph. 3, 1 (1984) - line
 *   clipping.
 */
#ifndef DK_PLOT_H
#define DK_PLOT_H

#include <stddef.h>

#include "deltak/status.h"

/* ---- Figure sizes ------------------------------------------------------ */

/* Journal column widths and a 16:9 slide (common practice). */
#define DK_PLOT_SINGLE_COLUMN_MM 85.0
#define DK_PLOT_DOUBLE_COLUMN_MM 175.0
#define DK_PLOT_SLIDE_WIDTH_MM 254.0
#define DK_PLOT_SLIDE_HEIGHT_MM 143.0

/* Figure sizes accepted by dk_plot_new() and dk_plot_size_parse(), mm. */
#define DK_PLOT_MIN_MM 20.0
#define DK_PLOT_MAX_MM 1000.0

/* A named figure size. */
typedef struct dk_plot_size {
    const char *name;   /* "single", "double", "slide" */
    double width_mm;
    double height_mm;
    const char *use;    /* one line for help text */
} dk_plot_size;

/*
 * dk_plot_size_presets:
 * @n: out, the number of presets
 *
 * Returns: the preset table (static, never NULL): "single" 85 x 64 mm,
 * "double" 175 x 105 mm, "slide" 254 x 143 mm.
 */
const dk_plot_size *dk_plot_size_presets(int *n);

/*
 * dk_plot_size_parse:
 * @text: a preset name (case-insensitive) or "WxH" in mm, e.g. "85x60",
 *        "85x60mm", "85 x 60 mm"; 'X' and '×' are accepted for 'x'
 * @width_mm, @height_mm: out, each in [DK_PLOT_MIN_MM, DK_PLOT_MAX_MM]
 *
 * Returns: DK_OK; DK_EINVAL for anything else, with a message that lists
 * the accepted forms. The outputs are untouched on error.
 */
dk_status dk_plot_size_parse(const char *text, double *width_mm,
                             double *height_mm, dk_error *err);

/* ---- Building a figure ------------------------------------------------- */

typedef struct dk_plot dk_plot;

/*
 * dk_plot_new:
 * @width_mm, @height_mm: figure size in mm, each in [DK_PLOT_MIN_MM,
 *        DK_PLOT_MAX_MM]
 * @plot: out, a new empty figure; free with dk_plot_free()
 *
 * Defaults: auto ranges, legend placed automatically, PNG at 300 dpi,
 * type size 8 pt up to 180 mm width and growing with the width beyond
 * (14.5 pt on a 254 mm slide).
 *
 * Returns: DK_OK; DK_EINVAL for a size out of range; DK_ENOMEM.
 */
dk_status dk_plot_new(double width_mm, double height_mm, dk_plot **plot,
                      dk_error *err);

/* Free @plot and everything it owns; NULL does nothing. */
void dk_plot_free(dk_plot *plot);

/*
 * dk_plot_set_xlabel, dk_plot_set_ylabel:
 * @markup: pango markup (copied); NULL or "" removes the label
 *
 * Returns: DK_OK; DK_EINVAL for malformed markup (pango's reason in the
 * message); DK_ENOMEM.
 */
dk_status dk_plot_set_xlabel(dk_plot *plot, const char *markup,
                             dk_error *err);
dk_status dk_plot_set_ylabel(dk_plot *plot, const char *markup,
                             dk_error *err);

/*
 * dk_plot_set_xrange, dk_plot_set_yrange:
 * @lo, @hi: the axis range in data units, finite with lo < hi; both NAN
 *        restores the automatic range (x: the data's extent; y: the
 *        data's extent widened by 4 % at each end; with a map, the map's
 *        extent)
 *
 * Returns: DK_OK; DK_EINVAL otherwise (the range is unchanged).
 */
dk_status dk_plot_set_xrange(dk_plot *plot, double lo, double hi,
                             dk_error *err);
dk_status dk_plot_set_yrange(dk_plot *plot, double lo, double hi,
                             dk_error *err);

/*
 * dk_plot_set_font_size_pt:
 * @size_pt: type size for all text in pt, in [4, 48]
 *
 * Line widths and tick lengths scale with it.
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_plot_set_font_size_pt(dk_plot *plot, double size_pt,
                                   dk_error *err);

/*
 * dk_plot_add_line:
 * @x, @y: @n points (copied). A point where x or y is NaN or infinite
 *        breaks the line, so several branches of a curve can share one
 *        series: {x0, x1, NAN, x2, x3}.
 * @n: number of points, ≥ 1, at least one of them finite
 * @label: legend text, pango markup (copied); NULL leaves the series out
 *        of the legend
 *
 * Series take the line colours in turn; from the sixth series on, the
 * colours repeat with dashes.
 *
 * Returns: DK_OK; DK_EINVAL for NULL data, n = 0, no finite point or
 * malformed markup; DK_ENOMEM.
 */
dk_status dk_plot_add_line(dk_plot *plot, const double *x, const double *y,
                           size_t n, const char *label, dk_error *err);

/*
 * dk_plot_add_marker:
 * A point marked with a dot and an optional label beside it (e.g. the
 * operating point).
 * @x, @y: position in data units, finite
 * @label: pango markup (copied) or NULL
 *
 * Returns: DK_OK; DK_EINVAL (non-finite position, malformed markup);
 * DK_ENOMEM.
 */
dk_status dk_plot_add_marker(dk_plot *plot, double x, double y,
                             const char *label, dk_error *err);

/*
 * dk_plot_add_band:
 * A shaded vertical band from @x0 to @x1 (data units, finite, x0 ≠ x1;
 * either order) over the full height, e.g. an acceptance band. It is drawn
 * under the data.
 * @label: legend text, pango markup (copied), or NULL
 *
 * Returns: DK_OK; DK_EINVAL; DK_ENOMEM.
 */
dk_status dk_plot_add_band(dk_plot *plot, double x0, double x1,
                           const char *label, dk_error *err);

/* A monotonic map between the bottom axis and the top axis. */
typedef double (*dk_plot_transform)(double v, void *params);

/*
 * dk_plot_set_top_axis:
 * A secondary top x axis showing another quantity, e.g. wavenumber over a
 * wavelength axis. Its ticks sit at nice values of the secondary quantity.
 * @to_top: primary x → secondary value; strictly monotonic (increasing or
 *        decreasing) and finite over the x range
 * @from_top: its inverse
 * @params: handed to both (may be NULL); must outlive the figure
 * @label: pango markup (copied) or NULL
 *
 * NULL @to_top removes the top axis. Monotonicity is checked when the
 * figure is drawn (DK_EDOM then).
 *
 * Returns: DK_OK; DK_EINVAL (one transform missing, malformed markup);
 * DK_ENOMEM.
 */
dk_status dk_plot_set_top_axis(dk_plot *plot, dk_plot_transform to_top,
                               dk_plot_transform from_top, void *params,
                               const char *label, dk_error *err);

/* Wavelength in µm ↔ vacuum wavenumber in cm⁻¹ (1e4/v); for
 * dk_plot_set_top_axis(). @params is ignored. */
double dk_plot_um_to_per_cm(double um, void *params);
double dk_plot_per_cm_to_um(double per_cm, void *params);

/* Where the legend goes. AUTO picks the inside corner (or, when all four
 * cover data, the middle of a side) that covers the least data. */
typedef enum dk_plot_legend {
    DK_PLOT_LEGEND_AUTO = 0,
    DK_PLOT_LEGEND_NONE,
    DK_PLOT_LEGEND_UPPER_RIGHT,
    DK_PLOT_LEGEND_UPPER_LEFT,
    DK_PLOT_LEGEND_LOWER_RIGHT,
    DK_PLOT_LEGEND_LOWER_LEFT
} dk_plot_legend;

/* Place the legend (listing labelled series, bands and contours). A
 * legend that does not fit inside the axes box is left out. */
void dk_plot_set_legend(dk_plot *plot, dk_plot_legend where);

/*
 * dk_plot_set_map:
 * A 2-D map shown as a colour image with a colour bar on the right.
 * @z: ny rows of nx values (copied), row j at y_j = y0 + j (y1 − y0)/(ny − 1)
 *     and column i at x_i = x0 + i (x1 − x0)/(nx − 1): z[j·nx + i].
 *     Values are interpolated bilinearly between the grid points; NaN
 *     cells are left blank.
 * @nx, @ny: grid size, each ≥ 2, nx·ny ≤ 2^24
 * @x0, @x1, @y0, @y1: grid extent in data units, finite, x0 ≠ x1, y0 ≠ y1
 * @z_label: colour bar label, pango markup (copied), or NULL
 *
 * The colour range is the finite extent of z unless set with
 * dk_plot_set_zrange(). A second call replaces the map (and keeps the
 * contour levels).
 *
 * Returns: DK_OK; DK_EINVAL (NULL z, bad size or extent, no finite z,
 * malformed markup); DK_ENOMEM.
 */
dk_status dk_plot_set_map(dk_plot *plot, const double *z, int nx, int ny,
                          double x0, double x1, double y0, double y1,
                          const char *z_label, dk_error *err);

/*
 * dk_plot_set_zrange:
 * @lo, @hi: colour range, finite, lo < hi; both NAN restores the
 *        automatic range. Values beyond it take the end colours.
 *
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_plot_set_zrange(dk_plot *plot, double lo, double hi,
                             dk_error *err);

/*
 * dk_plot_add_contour:
 * A contour line of the map at @level (finite, in z units), traced by
 * marching squares on the grid with linear interpolation along cell edges,
 * drawn over the map as a dark line with a light halo.
 * @label: legend text, pango markup (copied), or NULL
 *
 * A level the map never crosses draws nothing. Up to 8 levels.
 *
 * Returns: DK_OK; DK_EINVAL (non-finite level, malformed markup, too
 * many levels); DK_ENOMEM.
 */
dk_status dk_plot_add_contour(dk_plot *plot, double level,
                              const char *label, dk_error *err);

/*
 * dk_plot_set_png_dpi:
 * @dpi: raster resolution for .png output, in [36, 1200]; default 300
 *
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_plot_set_png_dpi(dk_plot *plot, double dpi, dk_error *err);

/* ---- Output ------------------------------------------------------------ */

/* The accepted file name extensions, for messages and help. */
#define DK_PLOT_FORMATS ".pdf, .svg, .png"

/*
 * dk_plot_write:
 * Draw the figure into @path; the format follows the extension
 * (case-insensitive): .pdf and .svg (vector), .png (raster at the figure's
 * dpi, opaque white background). The file is first written under a
 * temporary name in the same directory and renamed over @path when
 * complete; on any failure the temporary file is removed and an existing
 * @path is left as it was.
 *
 * Returns: DK_OK; DK_EINVAL for an unknown extension (the message lists
 * DK_PLOT_FORMATS), for a figure with neither data nor explicit ranges,
 * or one too small for its labels; DK_EDOM when the top-axis transform is
 * not finite and monotonic over the x range; DK_EIO when the file cannot
 * be created, written or renamed (the message names @path); DK_ENOMEM.
 */
dk_status dk_plot_write(const dk_plot *plot, const char *path,
                        dk_error *err);

/*
 * dk_plot_data_to_pixel:
 * Where the data point (@x, @y) lands in the PNG that dk_plot_write()
 * would write now: @px from the left edge and @py from the top edge, in
 * pixels (pixel (i, j) covers [i, i+1) x [j, j+1)). Points outside the
 * ranges map outside the axes box; nothing is clipped.
 *
 * Returns: DK_OK; DK_EINVAL (non-finite point, or as for
 * dk_plot_write()); DK_EDOM; DK_ENOMEM.
 */
dk_status dk_plot_data_to_pixel(const dk_plot *plot, double x, double y,
                                double *px, double *py, dk_error *err);

/* ---- Axis ticks -------------------------------------------------------- */

/* The most ticks dk_plot_nice_ticks() returns. */
#define DK_PLOT_MAX_TICKS 32

/*
 * dk_plot_nice_ticks:
 * Ticks at the multiples of the smallest step s = m·10^k, m ∈ {1, 2, 5},
 * that puts at most @max_ticks of them in [lo, hi], e.g. 0..7.3 with 8
 * → 0, 1, …, 7; with 5 → 0, 2, 4, 6.
 * @lo, @hi: the range, finite, lo < hi, with (hi − lo) > 1e-12·max(|lo|,|hi|)
 * @max_ticks: in [2, DK_PLOT_MAX_TICKS]
 * @ticks: out, DK_PLOT_MAX_TICKS entries, ascending; exact decimal values
 *        as nearly as doubles allow (0.3, not 0.30000000000000004)
 * @n: out, the number of ticks (may be 1 when the range is short)
 * @step: out, the step s; may be NULL
 *
 * Returns: DK_OK; DK_EINVAL.
 */
dk_status dk_plot_nice_ticks(double lo, double hi, int max_ticks,
                             double *ticks, int *n, double *step,
                             dk_error *err);

/* ---- Colour ------------------------------------------------------------ */

/* The name of the map colour scale. */
#define DK_COLORMAP_NAME "afterglow"

/*
 * dk_color_lab_to_srgb:
 * CIELAB (D65 white, 2° observer) to sRGB by CIE 15:2004 (L*a*b* → XYZ)
 * and IEC 61966-2-1 (XYZ → linear RGB matrix, then the sRGB transfer
 * curve).
 * @lab: L* in [0, 100], a*, b*
 * @rgb: out, sRGB in [0, 1] when in gamut; NOT clipped, so a component
 *       outside [0, 1] marks an out-of-gamut colour
 *
 * Returns: 1 when all three components lie in [0, 1] (within 1e-9), else 0.
 */
int dk_color_lab_to_srgb(const double lab[3], double rgb[3]);

/* sRGB in [0, 1] to CIELAB (D65): the inverse of dk_color_lab_to_srgb(). */
void dk_color_srgb_to_lab(const double rgb[3], double lab[3]);

/*
 * dk_color_delta_e2000:
 * The CIEDE2000 colour difference ΔE00 between two CIELAB colours
 * (kL = kC = kH = 1), by Sharma, Wu and Dalal (2005), eqs. (1)-(22).
 */
double dk_color_delta_e2000(const double lab1[3], const double lab2[3]);

/*
 * dk_colormap_lab, dk_colormap_rgb:
 * The "afterglow" scale at @t in [0, 1] (clamped; NaN gives the t = 0
 * colour): deep indigo (L* 12) through plum, rose and apricot to pale
 * straw (L* 94). L* rises linearly along a hue path in CIELAB and the
 * path is re-spaced so that equal steps in t are equal steps of CIEDE2000
 * colour difference. Every colour is inside the sRGB gamut.
 * Each call rebuilds the re-spacing table (about 0.1 ms); the figure code
 * builds it once per drawing.
 */
void dk_colormap_lab(double t, double lab[3]);
void dk_colormap_rgb(double t, double rgb[3]);

/* The number of line colours, and colour @i (taken modulo the number)
 * as sRGB in [0, 1]. */
int dk_palette_size(void);
void dk_palette_rgb(int i, double rgb[3]);

#endif /* DK_PLOT_H */
