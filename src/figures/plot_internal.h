/*
 * plot_internal.h - what the plot_*.c files share: the figure record, the
 * page layout, and the helpers of each file. Not part of the public API.
 *
 * Page coordinates are pt (1/72 inch) from the top-left corner of the
 * figure; the PNG backend scales them by dpi/72.
 */
#ifndef DK_PLOT_INTERNAL_H
#define DK_PLOT_INTERNAL_H

#include <cairo.h>
#include <pango/pangocairo.h>

#include "deltak/plot.h"

#define PLOT_MAX_CONTOURS 8
#define PLOT_PT_PER_MM (72.0 / 25.4)

typedef struct plot_series {
    double *x, *y;      /* owned copies */
    size_t n;
    char *label;        /* markup or NULL */
} plot_series;

typedef struct plot_marker {
    double x, y;
    char *label;
} plot_marker;

typedef struct plot_band {
    double x0, x1;      /* x0 < x1 */
    char *label;
} plot_band;

typedef struct plot_contour {
    double level;
    char *label;
} plot_contour;

typedef struct plot_map {
    double *z;          /* ny rows of nx, row 0 at y0 */
    int nx, ny;
    double x0, x1, y0, y1;
    char *label;
} plot_map;

struct dk_plot {
    double width_mm, height_mm;
    double font_pt;
    double dpi;
    char *xlabel, *ylabel;
    double xlo, xhi, ylo, yhi;  /* NAN = automatic */
    double zlo, zhi;            /* NAN = automatic */
    plot_series *series;
    size_t nseries, capseries;
    plot_marker *markers;
    size_t nmarkers, capmarkers;
    plot_band *bands;
    size_t nbands, capbands;
    plot_contour contours[PLOT_MAX_CONTOURS];
    int ncontours;
    plot_map *map;              /* NULL when none */
    dk_plot_transform to_top, from_top;
    void *top_params;
    char *toplabel;
    dk_plot_legend legend;
};

/* One axis: range, ticks and their label markup. */
typedef struct plot_axis {
    double lo, hi;                      /* data range (secondary: its own) */
    double ticks[DK_PLOT_MAX_TICKS];
    int nticks;
    double step;
    char labels[DK_PLOT_MAX_TICKS][64]; /* tick label markup */
    double label_w, label_h;            /* widest / tallest label, pt */
    int exp10;                          /* labels show value / 10^exp10 */
    char mult[48];                      /* "×10^exp10" markup, or "" */
    double mult_w, mult_h;              /* its size, pt */
} plot_axis;

/* Everything the renderer needs, worked out before drawing. */
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
} plot_layout;

/* Make a PangoContext with the house text settings (no hinting, 72 ppi,
 * so layout in pt does not depend on the backend) for @cr. */
PangoContext *plot_text_context(cairo_t *cr);

/* A layout of @markup at @size_pt; the caller unrefs it. */
PangoLayout *plot_text_layout(PangoContext *ctx, const char *markup,
                              double size_pt);

/* Logical width and height of @markup, pt. */
void plot_text_size(PangoContext *ctx, const char *markup, double size_pt,
                    double *w, double *h);

/* Work out ranges, ticks and the axes box (plot_layout.c). */
dk_status plot_layout_compute(const dk_plot *p, plot_layout *L,
                              dk_error *err);

/* Data → page pt. */
double plot_x_pt(const plot_layout *L, double x);
double plot_y_pt(const plot_layout *L, double y);

/* Draw the figure on @cr in page pt (plot_draw.c); @raster_scale is the
 * output's pixels per pt, for the map image. Returns 0, or -1 when out of
 * memory. Cairo errors stay in @cr for the caller to check. */
int plot_draw(const dk_plot *p, const plot_layout *L, cairo_t *cr,
              double raster_scale);

/* Tick label markup for @v on an axis of step @step (plot_ticks.c). */
void plot_tick_label(double v, double step, char *buf, size_t size);

/* The colour scale sampled at @n ≥ 2 equal steps into rgb[3n] (sRGB). */
void plot_colormap_table(int n, double *rgb);

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

#endif /* DK_PLOT_INTERNAL_H */
