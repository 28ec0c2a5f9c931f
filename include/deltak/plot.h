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
 * "(×10^k)" at the end of the axis label, no grid, a title only when one
 * is set. Lines cycle five colours chosen to stay apart for protan,
 * deutan and tritan viewers together with four dash patterns and five
 * marker shapes, so that the first 20 series differ in greyscale too;
 * maps use the "afterglow" colour scale (dk_colormap_rgb), whose CIELAB
 * lightness rises monotonically.
 *
 * Nothing overlaps: the legend, marker labels and branch labels are placed
 * where they cover no line, marker or other text (the legend goes outside
 * on the right when no such place is left inside); tick labels that would
 * touch a neighbour or the page edge are thinned; axis labels longer than
 * the page are set smaller; the layout is checked by the tests box by box.
 *
 * Output is deterministic: the same figure gives the same bytes (the
 * PDF carries no creation date). Files are written atomically: a
 * temporary file beside the target is renamed over it only when complete.
 *
 * SVG text: cairo's SVG surface (1.16 here, and 1.18) always writes each
 * glyph as an outline (a <symbol> with a <path>, placed with <use>); it
 * has no option to write <text> elements, and cairo_tag_begin() marks
 * structure only in PDF. So SVG text is drawn exactly but cannot be
 * selected or edited as text; use PDF (real text, fonts embedded) where
 * that matters.
 *
 * References (methods in src/figures/plot_*.c):
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
#include <stdio.h>

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
 * Defaults: auto ranges, linear axes, no title, legend placed
 * automatically, PNG at 300 dpi, and a type size that follows the
 * figure: 8 pt from 85 to 180 mm width (journal figures are printed at
 * 7-9 pt), growing beyond to 18 pt on a 254 mm slide (and on, up to 48
 * pt), and shrinking below 85 mm with the smaller of width/85 mm and
 * height/64 mm, down to 5 pt (a 40 x 30 mm figure gets 5 pt).
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
 * @size_pt: type size for all text in pt, in [4, 48]; replaces the
 *        default that follows the figure size (see dk_plot_new())
 *
 * Line widths, tick lengths, markers and the legend scale with it.
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
 * Series take colours, dash patterns and markers in turn (see the top of
 * this file); the first is a plain solid line.
 *
 * Returns: DK_OK; DK_EINVAL for NULL data, n = 0, no finite point or
 * malformed markup; DK_ENOMEM.
 */
dk_status dk_plot_add_line(dk_plot *plot, const double *x, const double *y,
                           size_t n, const char *label, dk_error *err);

/* Per-point flags for dk_plot_add_line_flagged() and dk_plot_set_map_flags(). */
#define DK_PLOT_FLAG_OUTSIDE_FIT 0x01u     /* outside the data set's fitted
                                              wavelength or temperature
                                              range */
#define DK_PLOT_FLAG_NOT_TRANSPARENT 0x02u /* outside the crystal's
                                              transparency (maps) */

/*
 * dk_plot_add_line_flagged:
 * As dk_plot_add_line(), with a flag per point. A segment with a point
 * flagged DK_PLOT_FLAG_OUTSIDE_FIT at either end is drawn lighter,
 * thinner and dotted, and the legend gains the entry "outside the data
 * set's fitted range" (once per figure).
 * @flags: @n values, each 0 or DK_PLOT_FLAG_OUTSIDE_FIT (copied); NULL is
 *        the same as dk_plot_add_line()
 *
 * Returns: as dk_plot_add_line(); DK_EINVAL also for an unknown flag bit.
 */
dk_status dk_plot_add_line_flagged(dk_plot *plot, const double *x,
                                   const double *y,
                                   const unsigned char *flags, size_t n,
                                   const char *label, dk_error *err);

/* The number of lines added so far; line i (from 0, in the order added)
 * is the @series argument of dk_plot_label_branch(). */
size_t dk_plot_series_count(const dk_plot *plot);

/*
 * dk_plot_label_branch:
 * A label written on the figure beside one branch of a line, in the
 * line's colour, e.g. "signal" and "idler" on the two branches of a
 * temperature-tuning curve. Branches are the pieces of a line between its
 * non-finite points, counted from 0 in the order of the points. The label
 * is placed beside a point of the branch where it covers no line and no
 * other text; a branch with no point inside the axes gets no label.
 * @series: the line, in [0, dk_plot_series_count())
 * @branch: ≥ 0; a branch the line does not have is left unlabelled
 * @markup: pango markup (copied), non-empty
 *
 * Returns: DK_OK; DK_EINVAL (no such line, negative branch, empty or
 * malformed markup); DK_ENOMEM.
 */
dk_status dk_plot_label_branch(dk_plot *plot, size_t series, int branch,
                               const char *markup, dk_error *err);

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

/*
 * dk_plot_add_note:
 * A footnote under the figure: what the figure rests on that its lines
 * do not show (a default choice, a number typed from memory). Notes are
 * set small at the bottom left, joined by "; " and wrapped between notes
 * into as few lines as the width allows; the legend and axes make room.
 * @markup: pango markup (copied), not empty
 *
 * Returns: DK_OK; DK_EINVAL (empty or malformed markup, more than
 * DK_PLOT_MAX_NOTES notes); DK_ENOMEM.
 */
#define DK_PLOT_MAX_NOTES 16
dk_status dk_plot_add_note(dk_plot *plot, const char *markup,
                           dk_error *err);

/* An axis, for dk_plot_add_region(). */
typedef enum dk_plot_axis {
    DK_PLOT_X_AXIS = 0,
    DK_PLOT_Y_AXIS
} dk_plot_axis;

/*
 * dk_plot_add_region:
 * A grey, cross-hatched interval of @axis over the full other extent, for
 * values where nothing can be had, e.g. wavelengths outside the crystal's
 * transparency ("not transparent"). Drawn over a map and under lines; it
 * never widens an automatic range.
 * @lo, @hi: the interval in data units, lo < hi, not NaN; −INFINITY and
 *        INFINITY reach the axis end
 * @label: legend text, pango markup (copied), or NULL
 *
 * Returns: DK_OK; DK_EINVAL (bad axis or interval, malformed markup);
 * DK_ENOMEM.
 */
dk_status dk_plot_add_region(dk_plot *plot, dk_plot_axis axis, double lo,
                             double hi, const char *label, dk_error *err);

/*
 * dk_plot_set_title:
 * @markup: a title above the figure, pango markup (copied), set at 1.15
 *        times the type size; NULL or "" removes it. Journals put titles
 *        in the caption, so figures have none by default.
 *
 * Returns: DK_OK; DK_EINVAL (malformed markup); DK_ENOMEM.
 */
dk_status dk_plot_set_title(dk_plot *plot, const char *markup,
                            dk_error *err);

/*
 * dk_plot_set_log:
 * Logarithmic x and/or y axes (nonzero for logarithmic). Points with a
 * value ≤ 0 on a logarithmic axis are left out and break the line there;
 * ticks sit at the decades (10^k labels beyond 0.001-10^4) or, over less
 * than two decades, at 1, 2 and 5 times them. The top axis and the colour
 * bar stay linear.
 *
 * Returns: DK_OK; DK_EINVAL when a range already set reaches zero or
 * below on an axis made logarithmic (nothing is changed).
 * dk_plot_write() fails with DK_EINVAL when a logarithmic axis has no
 * positive data and no range.
 */
dk_status dk_plot_set_log(dk_plot *plot, int x_log, int y_log,
                          dk_error *err);

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

/* Where the legend goes. AUTO: an inside corner, or a place along the
 * edges or inside, that covers no line, marker or label; when there is
 * none, outside on the right if that leaves half the width, else below
 * the axes if it takes at most 35 % of the height, else the inside place
 * that covers least (on a light backing). */
typedef enum dk_plot_legend {
    DK_PLOT_LEGEND_AUTO = 0,
    DK_PLOT_LEGEND_NONE,
    DK_PLOT_LEGEND_UPPER_RIGHT,
    DK_PLOT_LEGEND_UPPER_LEFT,
    DK_PLOT_LEGEND_LOWER_RIGHT,
    DK_PLOT_LEGEND_LOWER_LEFT,
    DK_PLOT_LEGEND_OUTSIDE      /* right of the axes (and colour bar), or
                                   below them when the right has no room */
} dk_plot_legend;

/* Place the legend (listing labelled series, bands, regions, contours,
 * and a note for flagged points). A legend that does not fit inside the
 * axes box (corners) or the page height (outside) is left out. */
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
 * dk_plot_set_map_flags:
 * Flags for the grid points of the map (the same layout as its z); each
 * pixel takes the flag of its nearest grid point. DK_PLOT_FLAG_OUTSIDE_FIT
 * keeps the colour under a white hatch; DK_PLOT_FLAG_NOT_TRANSPARENT
 * draws the cell cross-hatched grey, as dk_plot_add_region(). The legend
 * names each kind present. NaN cells of z are drawn light grey with a
 * single hatch whether flagged or not.
 * @flags: nx·ny values (copied), or NULL to drop flags
 * @blank_label: legend text for the NaN cells, pango markup (copied),
 *        e.g. "no phase matching"; NULL for no entry
 *
 * Returns: DK_OK; DK_EINVAL (no map set, unknown flag bit, malformed
 * markup); DK_ENOMEM.
 */
dk_status dk_plot_set_map_flags(dk_plot *plot, const unsigned char *flags,
                                const char *blank_label, dk_error *err);

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
 * @dpi: raster resolution for .png output, in [36, 1200]; default 300.
 *        The PNG records it (a pHYs chunk in pixels per metre), so that
 *        programs that read it show the figure at its size in mm.
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
 * a logarithmic axis without positive data, or one too small for its
 * labels; DK_EDOM when the top-axis transform is
 * not finite and monotonic over the x range; DK_EIO when the file cannot
 * be created, written or renamed (the message names @path); DK_ENOMEM.
 */
dk_status dk_plot_write(const dk_plot *plot, const char *path,
                        dk_error *err);

/*
 * dk_plot_write_stream:
 * Draw the figure as dk_plot_write() would, but into the open stream
 * @stream (e.g. a memory stream, or a command's standard output) instead
 * of a file: the same bytes as the file of that format. Nothing is
 * written when the figure fails before drawing (bad figure, unknown
 * format); after a write error the stream may hold part of the figure,
 * so write into a buffer that can be discarded when that matters.
 * @format: "pdf", "svg" or "png" (case-insensitive)
 *
 * Returns: DK_OK; DK_EINVAL (NULL stream, unknown format, or as for
 * dk_plot_write()); DK_EDOM; DK_EIO when the stream refuses a write;
 * DK_ENOMEM.
 */
dk_status dk_plot_write_stream(const dk_plot *plot, FILE *stream,
                               const char *format, dk_error *err);

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
