/*
 * plot_internal.h - what the plot_*.c files share: the figure record, the
 * page layout, and the helpers of each file. Not part of the public API.
 *
 * Page coordinates are pt (1/72 inch) from the top-left corner of the
 * figure; the PNG backend scales them by dpi/72.
 *
 * The files depend on each other one way only (each uses only those
 * listed before it):
 *   plot_text.c, plot_ticks.c, plot_color.c, plot_contour.c, plot_png.c
 *                           leaves: text measure and the list of texts,
 *                           ticks, colour, contours, PNG chunks
 *   plot_style.c            series styles (colour, dash, marker)
 *   plot_scale.c            data ↔ page pt (linear or logarithmic)
 *   plot_axes.c             ranges, ticks, the axes box, every axis text
 *   plot_place.c            legend, marker and branch labels
 *   plot_layout.c           the whole layout: axes, then placement
 *   plot_draw.c             drawing a finished layout
 *   plot_write.c            files
 *   plot.c                  the public record (uses plot_layout.c for
 *                           dk_plot_data_to_pixel)
 */
#ifndef DK_PLOT_INTERNAL_H
#define DK_PLOT_INTERNAL_H

#include <cairo.h>
#include <pango/pangocairo.h>

#include "deltak/plot.h"

#define PLOT_MAX_CONTOURS 8
#define PLOT_PT_PER_MM (72.0 / 25.4)

/* ---- The figure record (plot.c) ---------------------------------------- */

typedef struct plot_series {
    double *x, *y;      /* owned copies */
    size_t n;
    char *label;        /* markup or NULL */
    unsigned char *flags; /* n DK_PLOT_FLAG_* values, or NULL */
} plot_series;

typedef struct plot_marker {
    double x, y;
    char *label;
} plot_marker;

typedef struct plot_band {
    double x0, x1;      /* x0 < x1 */
    char *label;
} plot_band;

typedef struct plot_region {
    dk_plot_axis axis;  /* which axis the interval is on */
    double lo, hi;      /* lo < hi; may be infinite */
    char *label;
} plot_region;

typedef struct plot_branch_label {
    size_t series;      /* series index */
    int branch;         /* piece between non-finite points, from 0 */
    char *label;
} plot_branch_label;

typedef struct plot_contour {
    double level;
    char *label;
} plot_contour;

typedef struct plot_map {
    double *z;          /* ny rows of nx, row 0 at y0 */
    unsigned char *flags; /* nx·ny DK_PLOT_FLAG_* values, or NULL */
    int nx, ny;
    double x0, x1, y0, y1;
    char *label;
    char *blank_label;  /* legend text for NaN cells, or NULL */
} plot_map;

struct dk_plot {
    double width_mm, height_mm;
    double font_pt;
    double dpi;
    char *xlabel, *ylabel, *title;
    double xlo, xhi, ylo, yhi;  /* NAN = automatic */
    int xlog, ylog;             /* logarithmic axes */
    double zlo, zhi;            /* NAN = automatic */
    plot_series *series;
    size_t nseries, capseries;
    plot_marker *markers;
    size_t nmarkers, capmarkers;
    plot_band *bands;
    size_t nbands, capbands;
    plot_region *regions;
    size_t nregions, capregions;
    char **notes;               /* legend lines without a sample */
    size_t nnotes, capnotes;
    plot_branch_label *branches;
    size_t nbranches, capbranches;
    plot_contour contours[PLOT_MAX_CONTOURS];
    int ncontours;
    plot_map *map;              /* NULL when none */
    dk_plot_transform to_top, from_top;
    void *top_params;
    char *toplabel;
    dk_plot_legend legend;
};

/* ---- Text (plot_text.c) ------------------------------------------------ */

/* Capital height of the sans face, em (DejaVu Sans has 0.73 em; from
 * memory): vertical placement of tick labels uses it. */
#define PLOT_CAP_HEIGHT 0.72

/* Make a PangoContext with the house text settings (no hinting, 72 ppi,
 * so layout in pt does not depend on the backend) for @cr. */
PangoContext *plot_text_context(cairo_t *cr);

/* A layout of @markup at @size_pt; the caller unrefs it. */
PangoLayout *plot_text_layout(PangoContext *ctx, const char *markup,
                              double size_pt);

/* The logical box of a text, pt: its size, where the box starts relative
 * to the layout origin (lx, ly) and the baseline below the box top. */
typedef struct plot_text_metrics {
    double w, h, lx, ly, base;
} plot_text_metrics;

void plot_text_measure(PangoContext *ctx, const char *markup, double size_pt,
                       plot_text_metrics *m);

/* Logical width and height of @markup, pt. */
void plot_text_size(PangoContext *ctx, const char *markup, double size_pt,
                    double *w, double *h);

/* ---- Ticks (plot_ticks.c) ---------------------------------------------- */

/* Tick label markup for @v on an axis of step @step. */
void plot_tick_label(double v, double step, char *buf, size_t size);

/* Ticks of a logarithmic axis on [lo, hi] (lo > 0): the decades (every
 * first, second, ... so that at most @max fall inside), or 1-2-5 values
 * of each decade when the range spans less than about two decades.
 * Labels: plain decimals from 0.001 to 10^4, 10^k beyond. */
int plot_log_ticks(double lo, double hi, int max, double *ticks, int *n,
                   double *step_decades);
void plot_log_tick_label(double v, char *buf, size_t size);

/* ---- Colour (plot_color.c) ----------------------------------------------*/

/* The colour scale sampled at @n ≥ 2 equal steps into rgb[3n] (sRGB). */
void plot_colormap_table(int n, double *rgb);

/* ---- Contours (plot_contour.c) ----------------------------------------- */

/*
 * plot_contour_trace:
 * Marching squares on z (ny rows of nx, grid points at integer (i, j)).
 * Calls @emit once per polyline with its points in grid coordinates
 * (fractional i, j) and whether it is closed. Returns 0, or -1 when out
 * of memory.
 */
typedef void (*plot_polyline_fn)(const double *gx, const double *gy, int n,
                                 int closed, void *ctx);
int plot_contour_trace(const double *z, int nx, int ny, double level,
                       plot_polyline_fn emit, void *ctx);

/* ---- PNG (plot_png.c) -------------------------------------------------- */

/*
 * plot_png_set_dpi:
 * Insert a pHYs chunk (pixels per metre, unit 1) for @dpi after the IHDR
 * chunk of the PNG in buf[0..*len), which has room for @cap bytes.
 * Returns 0, or -1 when the data are not a PNG or there is no room.
 */
int plot_png_set_dpi(unsigned char *buf, size_t *len, size_t cap, double dpi);

/* CRC-32 of PNG chunks (ISO 3309 / ITU-T V.42 polynomial). */
unsigned long plot_png_crc(const unsigned char *data, size_t n);

/* ---- Series styles (plot_style.c) -------------------------------------- */

enum {
    PLOT_MARK_NONE,
    PLOT_MARK_CIRCLE,   /* open */
    PLOT_MARK_SQUARE,   /* filled */
    PLOT_MARK_TRIANGLE, /* open */
    PLOT_MARK_DIAMOND,  /* filled */
    PLOT_MARK_COUNT
};

#define PLOT_MAX_DASH 4

/* How series @k is drawn: its colour, dash pattern (in line widths; none
 * for a solid line) and marker shape. */
typedef struct plot_style {
    double rgb[3];
    double dash[PLOT_MAX_DASH];
    int ndash;
    int marker;
} plot_style;

void plot_series_style(size_t k, plot_style *s);

/* The style of the parts of a line outside a data set's fitted range:
 * @s made lighter, thinner (factor *width) and dotted. */
void plot_outside_style(const plot_style *s, plot_style *out,
                        double *width);

/* ---- The layout -------------------------------------------------------- */

/* One axis: range, ticks and their label markup. */
typedef struct plot_axis {
    double lo, hi;                      /* data range (secondary: its own) */
    int log;                            /* logarithmic */
    double ticks[DK_PLOT_MAX_TICKS];
    int nticks;
    double step;                        /* log axes: in decades */
    char labels[DK_PLOT_MAX_TICKS][64]; /* tick label markup */
    double label_w, label_h;            /* widest / tallest label, pt */
    int exp10;                          /* labels show value / 10^exp10 */
    char mult[48];                      /* "×10^exp10" markup, or "" */
    double mult_w, mult_h;              /* its size, pt */
} plot_axis;

/* What a piece of text on the page is (for tests and the drawing). */
enum {
    PLOT_TEXT_TICK_X, PLOT_TEXT_TICK_Y, PLOT_TEXT_TICK_TOP, PLOT_TEXT_TICK_Z,
    PLOT_TEXT_XLABEL, PLOT_TEXT_YLABEL, PLOT_TEXT_TOPLABEL, PLOT_TEXT_ZLABEL,
    PLOT_TEXT_MULT, PLOT_TEXT_TITLE, PLOT_TEXT_LEGEND, PLOT_TEXT_MARKER,
    PLOT_TEXT_BRANCH, PLOT_TEXT_NOTE
};

/* A text placed on the page: its box (pt, y down; for a rotated text the
 * box on the page, rotated by 90° anticlockwise), size and colour. */
typedef struct plot_text {
    int kind;
    const char *markup;     /* into the figure or the layout */
    double size;            /* pt */
    double x, y, w, h;      /* the logical box on the page */
    int rotated;            /* reads bottom to top */
    int halo;               /* a white halo under it */
    double rgb[3];
} plot_text;

/* Legend entries. */
enum {
    PLOT_ITEM_SERIES, PLOT_ITEM_BAND, PLOT_ITEM_CONTOUR, PLOT_ITEM_REGION,
    PLOT_ITEM_OUTSIDE_FIT, PLOT_ITEM_MAP_OUTSIDE_FIT, PLOT_ITEM_MAP_OPAQUE,
    PLOT_ITEM_MAP_BLANK
};

typedef struct plot_legend_item {
    int kind;
    size_t index;
    const char *markup;
} plot_legend_item;

/* A polyline in page pt (contours). */
typedef struct plot_polyline {
    double *x, *y;
    int n;
    int level;              /* contour index */
} plot_polyline;

/* Where the legend went. */
enum { PLOT_LEGEND_HIDDEN, PLOT_LEGEND_INSIDE, PLOT_LEGEND_OUTSIDE };

/* Everything the renderer needs, worked out before drawing. Fill with
 * plot_layout_compute(); release with plot_layout_release(). */
typedef struct plot_layout {
    double page_w, page_h;              /* pt */
    double ax_x, ax_y, ax_w, ax_h;      /* axes box, pt, y down */
    double f;                           /* type size, pt */
    int ticks_out;                      /* ticks point out (over a map) */
    double tick_gap;                    /* frame to tick labels, pt */
    plot_axis x, y;
    int has_top;
    plot_axis top;                      /* secondary axis values */
    int has_map;
    plot_axis z;                        /* colour bar */
    double zlo, zhi;
    double cb_x, cb_w;                  /* colour bar box (y as axes) */
    double reserve_right;               /* room kept for an outside legend, */
    double reserve_bottom;              /* on the right or below */
    char *ylabel, *zlabel;              /* axis labels with "(×10^k)" */
    char *foot[DK_PLOT_MAX_NOTES];      /* the notes packed into lines */
    int nfoot;
    double foot_size, foot_h;           /* their type size; the height
                                           kept for them at the bottom */

    plot_text *texts;                   /* every text on the page */
    int ntexts, captexts;

    int legend_where;                   /* PLOT_LEGEND_* */
    double legend_box[4];               /* x, y, w, h, pt */
    double legend_pad, legend_row, legend_size;
    int legend_backing;                 /* a light backing under it */
    plot_legend_item *items;
    int nitems;

    plot_polyline *contours;            /* traced contour lines */
    int ncontours, capcontours;
    int any_outside_fit;                /* some series point is flagged */
    int map_flags;                      /* DK_PLOT_FLAG_*s the map uses,
                                           PLOT_MAP_BLANK for NaN cells */
} plot_layout;

#define PLOT_MAP_BLANK 0x80u

/* Work out ranges, ticks, the axes box and every text (plot_layout.c).
 * On error, @L holds nothing to release. */
dk_status plot_layout_compute(const dk_plot *p, plot_layout *L,
                              dk_error *err);
void plot_layout_release(plot_layout *L);

/* Add a text (its box already worked out) to the layout's list
 * (plot_text.c); returns its index or -1 when out of memory. */
int plot_layout_add_text(plot_layout *L, const plot_text *t);

/* ---- Scales (plot_scale.c) --------------------------------------------- */

/* Data → page pt, and back. On a log axis a value ≤ 0 gives NaN. */
double plot_x_pt(const plot_layout *L, double x);
double plot_y_pt(const plot_layout *L, double y);
double plot_x_data(const plot_layout *L, double xpt);
double plot_y_data(const plot_layout *L, double ypt);
/* The fraction of the way from lo to hi that @v is on axis @a. */
double plot_axis_frac(const plot_axis *a, double v);

/* Liang-Barsky: clip the segment a-b to box (x0, y0, x1, y1); 0 when
 * nothing is left. */
int plot_clip_segment(const double box[4], double *ax, double *ay,
                      double *bx, double *by);

/* ---- Axes (plot_axes.c) ------------------------------------------------ */

/* Ranges, ticks, the axes box (leaving @L->reserve_right free on the
 * right) and the texts of the axes, colour bar and title. */
dk_status plot_axes_compute(const dk_plot *p, PangoContext *ctx,
                            plot_layout *L, dk_error *err);

/* ---- Placement (plot_place.c) ------------------------------------------ */

/* Trace the contour lines into @L (page pt). Returns 0 or -1 (memory). */
int plot_place_contours(const dk_plot *p, plot_layout *L);

/* The legend entries and the size of the legend box. Returns 0 or -1. */
int plot_place_legend_items(const dk_plot *p, PangoContext *ctx,
                            plot_layout *L, double *w, double *h);

/*
 * Place marker labels, branch labels and the legend (in that order, each
 * avoiding the ink and the texts placed before it). Returns 1 when the
 * legend (AUTO) found no free place inside and would go outside, 0 when
 * done, -1 when out of memory.
 */
int plot_place_labels(const dk_plot *p, PangoContext *ctx, plot_layout *L,
                      int allow_outside);

/* Line ink inside rectangle r (x, y, w, h), pt: the length of series and
 * contour lines in it, plus one per segment, and marker dots (heavily). */
double plot_ink_in(const dk_plot *p, const plot_layout *L, const double r[4]);

/* ---- Drawing (plot_draw.c) --------------------------------------------- */

/* Draw the figure on @cr in page pt; @raster_scale is the output's pixels
 * per pt, for the map image. Returns 0, or -1 when out of memory. Cairo
 * errors stay in @cr for the caller to check. */
int plot_draw(const dk_plot *p, const plot_layout *L, cairo_t *cr,
              double raster_scale);

#endif /* DK_PLOT_INTERNAL_H */
