/*
 * plot_draw.c - drawing a laid-out figure with cairo and pango, in page
 * pt. Everything was placed by plot_layout.c; this file only renders it.
 *
 * Order, back to front: map image, shaded regions ("not transparent"),
 * bands, contour lines, series, marker dots (all clipped to the axes
 * box); the frame with major and minor ticks, inward on four sides, or
 * outward on the bottom and left over a map (the top side carries the
 * secondary axis when there is one); the colour bar; the legend's backing
 * and samples; then every text (tick and axis labels, title, marker and
 * branch labels, legend entries), those over data with a thin white halo.
 *
 * Series: colour, dash pattern and markers cycle together
 * (plot_style.c); markers sit every 5 em along the line, each series
 * starting at another phase so that markers of neighbouring curves do not
 * stack. Parts outside a data set's fitted range (flagged points, and the
 * segments that touch them) are lighter, thinner and dotted.
 *
 * The map image is computed at the output's pixel grid (PNG) or at 200
 * pixels per inch (vector output): each pixel takes the bilinear
 * interpolant of z at its centre, through a 1024-step table of the colour
 * scale, so that the image and the contour lines (linear along cell
 * edges) agree. Pixels without a value (NaN corners) are light grey with
 * a diagonal hatch; pixels whose nearest grid point is flagged "not
 * transparent" are a darker grey, cross-hatched; "outside the fitted
 * range" keeps the colour under a white hatch. Shaded regions on an axis
 * are the same cross-hatched grey. The hatches run in pixel space at a
 * pitch of 0.5 em, so the patterns read in greyscale and in print.
 *
 * Lines are clipped to a slightly enlarged axes box before they reach
 * cairo (plot_scale.c), so far-off points cannot overflow cairo's
 * fixed-point coordinates.
 */
#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "plot_internal.h"

/* House style, as multiples of the type size f (pt). */
#define LW_FRAME 0.065
#define LW_LINE 0.14
#define LW_CONTOUR 0.11
#define HALO_CONTOUR 0.16    /* light edge each side of a contour line */
#define HALO_TEXT 0.28
#define TICK_MAJOR 0.45
#define TICK_MINOR 0.25
#define MARKER_R 0.3         /* the marker dot of dk_plot_add_marker */
#define MARKER_RING 0.06
#define MARK_R 0.26          /* series markers */
#define MARK_SPACING 5.0     /* along a series, em */
#define LEGEND_SAMPLE 2.0    /* as plot_place.c */
#define CLIP_MARGIN 10.0     /* pt beyond the axes box kept by clipping */
#define HATCH_PITCH 0.5      /* em */
#define HATCH_LW 0.06        /* em */
#define MAP_MAX_PX 4000
#define MAP_TABLE 1024
#define CBAR_STOPS 64

static const double INK[3] = {0.10, 0.10, 0.10};
static const double BAND_RGB[3] = {0.84, 0.87, 0.92};
static const double BAND_EDGE[3] = {0.66, 0.71, 0.80};
static const double BLANK_RGB[3] = {0.90, 0.90, 0.90};
static const double BLANK_LINE[3] = {0.70, 0.70, 0.70};
static const double OPAQUE_RGB[3] = {0.78, 0.78, 0.78};
static const double OPAQUE_LINE[3] = {0.45, 0.45, 0.45};
static const double DASH_CONTOUR[3][2] = {{0, 0}, {5, 2.5}, {1.5, 2}};

typedef struct draw {
    const dk_plot *p;
    const plot_layout *L;
    cairo_t *cr;
    PangoContext *pc;
    double raster_scale;  /* output pixels per pt */
    double f;
    int oom;
} draw;

/* ---- Text ------------------------------------------------------------ */

static void
draw_text(draw *d, const plot_text *t)
{
    cairo_t *cr = d->cr;
    PangoLayout *lay = plot_text_layout(d->pc, t->markup, t->size);
    pango_cairo_update_layout(cr, lay);
    PangoRectangle lg;
    pango_layout_get_extents(lay, NULL, &lg);
    double lx = (double)lg.x / PANGO_SCALE, ly = (double)lg.y / PANGO_SCALE;
    cairo_save(cr);
    if (t->rotated) {
        cairo_translate(cr, t->x, t->y + t->h);
        cairo_rotate(cr, -G_PI / 2);
    } else {
        cairo_translate(cr, t->x, t->y);
    }
    if (t->halo) {
        cairo_move_to(cr, -lx, -ly);
        pango_cairo_layout_path(cr, lay);
        cairo_set_source_rgba(cr, 1, 1, 1, 0.9);
        cairo_set_line_width(cr, HALO_TEXT * d->f);
        cairo_set_line_join(cr, CAIRO_LINE_JOIN_ROUND);
        cairo_stroke(cr);
    }
    cairo_set_source_rgb(cr, t->rgb[0], t->rgb[1], t->rgb[2]);
    cairo_move_to(cr, -lx, -ly);
    pango_cairo_show_layout(cr, lay);
    cairo_restore(cr);
    g_object_unref(lay);
}

/* ---- Hatching -------------------------------------------------------- */

/* Fill rectangle (x, y, w, h) with @bg and hatch it with lines of @fg at
 * +45° (dir 1), −45° (dir −1) or both (dir 0). */
static void
hatch_rect(draw *d, double x, double y, double w, double h,
           const double bg[3], double bg_alpha, const double fg[3], int dir)
{
    cairo_t *cr = d->cr;
    double pitch = HATCH_PITCH * d->f;
    cairo_save(cr);
    cairo_rectangle(cr, x, y, w, h);
    cairo_clip(cr);
    if (bg) {
        cairo_set_source_rgba(cr, bg[0], bg[1], bg[2], bg_alpha);
        cairo_paint(cr);
    }
    cairo_new_path(cr);
    for (int s = -1; s <= 1; s += 2) {
        if (dir && s != dir)
            continue;
        /* Lines x − s·y = c, c on a grid of the page (so that two hatched
         * areas side by side line up). */
        double c0 = s > 0 ? x - (y + h) : x + y;
        double c1 = s > 0 ? x + w - y : x + w + y + h;
        for (double c = floor(c0 / pitch) * pitch; c <= c1; c += pitch) {
            cairo_move_to(cr, c + s * (y - 1), y - 1);
            cairo_line_to(cr, c + s * (y + h + 1), y + h + 1);
        }
    }
    cairo_set_source_rgb(cr, fg[0], fg[1], fg[2]);
    cairo_set_line_width(cr, HATCH_LW * d->f);
    cairo_set_dash(cr, NULL, 0, 0);
    cairo_stroke(cr);
    cairo_restore(cr);
}

/* ---- Lines ----------------------------------------------------------- */

/* Add to the path the segments of a polyline in page pt whose "outside"
 * state is @want (−1: every segment); non-finite points break it. */
static void
path_polyline(draw *d, const double *x, const double *y,
              const unsigned char *flags, size_t n, int want)
{
    const plot_layout *L = d->L;
    double box[4] = {L->ax_x - CLIP_MARGIN, L->ax_y - CLIP_MARGIN,
                     L->ax_x + L->ax_w + CLIP_MARGIN,
                     L->ax_y + L->ax_h + CLIP_MARGIN};
    int pen = 0;
    double lx = 0, ly = 0;
    for (size_t i = 1; i < n; i++) {
        if (!(isfinite(x[i - 1]) && isfinite(y[i - 1]) && isfinite(x[i]) &&
              isfinite(y[i]))) {
            pen = 0;
            continue;
        }
        if (want >= 0) {
            int out = flags && ((flags[i - 1] | flags[i]) &
                                DK_PLOT_FLAG_OUTSIDE_FIT);
            if (out != want) {
                pen = 0;
                continue;
            }
        }
        double ax = x[i - 1], ay = y[i - 1], bx = x[i], by = y[i];
        if (!plot_clip_segment(box, &ax, &ay, &bx, &by)) {
            pen = 0;
            continue;
        }
        if (!pen || ax != lx || ay != ly)
            cairo_move_to(d->cr, ax, ay);
        cairo_line_to(d->cr, bx, by);
        pen = 1;
        lx = bx, ly = by;
    }
}

static void
set_line_style(draw *d, const plot_style *st, double width_factor)
{
    cairo_t *cr = d->cr;
    double lw = LW_LINE * d->f * width_factor;
    cairo_set_source_rgb(cr, st->rgb[0], st->rgb[1], st->rgb[2]);
    cairo_set_line_width(cr, lw);
    cairo_set_line_join(cr, CAIRO_LINE_JOIN_ROUND);
    cairo_set_line_cap(cr, CAIRO_LINE_CAP_ROUND);
    if (st->ndash) {
        double dash[PLOT_MAX_DASH];
        for (int i = 0; i < st->ndash; i++)
            dash[i] = st->dash[i] * LW_LINE * d->f;
        cairo_set_dash(cr, dash, st->ndash, 0);
    } else {
        cairo_set_dash(cr, NULL, 0, 0);
    }
}

/* A series marker of @shape at (x, y). */
static void
draw_mark(draw *d, int shape, double x, double y, const double rgb[3])
{
    cairo_t *cr = d->cr;
    double r = MARK_R * d->f;
    cairo_new_path(cr);
    cairo_set_dash(cr, NULL, 0, 0);
    cairo_set_line_width(cr, 0.9 * LW_LINE * d->f);
    cairo_set_line_join(cr, CAIRO_LINE_JOIN_MITER);
    switch (shape) {
    case PLOT_MARK_CIRCLE:
        cairo_arc(cr, x, y, r, 0, 2 * G_PI);
        break;
    case PLOT_MARK_SQUARE:
        cairo_rectangle(cr, x - 0.85 * r, y - 0.85 * r, 1.7 * r, 1.7 * r);
        break;
    case PLOT_MARK_TRIANGLE:
        cairo_move_to(cr, x, y - 1.15 * r);
        cairo_line_to(cr, x + r, y + 0.6 * r);
        cairo_line_to(cr, x - r, y + 0.6 * r);
        cairo_close_path(cr);
        break;
    case PLOT_MARK_DIAMOND:
        cairo_move_to(cr, x, y - 1.2 * r);
        cairo_line_to(cr, x + r, y);
        cairo_line_to(cr, x, y + 1.2 * r);
        cairo_line_to(cr, x - r, y);
        cairo_close_path(cr);
        break;
    default:
        return;
    }
    int open = shape == PLOT_MARK_CIRCLE || shape == PLOT_MARK_TRIANGLE;
    cairo_set_source_rgb(cr, open ? 1 : rgb[0], open ? 1 : rgb[1],
                         open ? 1 : rgb[2]);
    cairo_fill_preserve(cr);
    cairo_set_source_rgb(cr, rgb[0], rgb[1], rgb[2]);
    cairo_stroke(cr);
}

/* Markers every MARK_SPACING em along the part of the line inside the
 * axes, starting at a phase of its own; none on the parts outside the
 * fitted range (their places are kept, so the spacing stays even). */
static void
series_marks(draw *d, size_t k, const double *x, const double *y,
             const unsigned char *flags, size_t n, const plot_style *st)
{
    if (st->marker == PLOT_MARK_NONE)
        return;
    const plot_layout *L = d->L;
    double r = 1.3 * MARK_R * d->f; /* whole markers only, off the frame */
    double box[4] = {L->ax_x + r, L->ax_y + r, L->ax_x + L->ax_w - r,
                     L->ax_y + L->ax_h - r};
    double spacing = MARK_SPACING * d->f;
    double next = spacing * fmod(0.3 + 0.37 * (double)k, 1.0), run = 0;
    for (size_t i = 1; i < n; i++) {
        double ax = x[i - 1], ay = y[i - 1], bx = x[i], by = y[i];
        if (!(isfinite(ax) && isfinite(ay) && isfinite(bx) &&
              isfinite(by)) ||
            !plot_clip_segment(box, &ax, &ay, &bx, &by))
            continue;
        double len = hypot(bx - ax, by - ay);
        int out = flags && ((flags[i - 1] | flags[i]) &
                            DK_PLOT_FLAG_OUTSIDE_FIT);
        while (run + len >= next) {
            double t = len > 0 ? (next - run) / len : 0;
            if (!out)
                draw_mark(d, st->marker, ax + t * (bx - ax),
                          ay + t * (by - ay), st->rgb);
            next += spacing;
        }
        run += len;
    }
}

static void
draw_series(draw *d)
{
    for (size_t k = 0; k < d->p->nseries; k++) {
        const plot_series *s = &d->p->series[k];
        double *x = malloc(s->n * sizeof *x), *y = malloc(s->n * sizeof *y);
        if (!x || !y) {
            free(x);
            free(y);
            d->oom = 1;
            return;
        }
        for (size_t i = 0; i < s->n; i++) {
            x[i] = plot_x_pt(d->L, s->x[i]);
            y[i] = plot_y_pt(d->L, s->y[i]);
        }
        plot_style st, out;
        plot_series_style(k, &st);
        double wf;
        plot_outside_style(&st, &out, &wf);
        if (s->flags) {
            cairo_new_path(d->cr);
            path_polyline(d, x, y, s->flags, s->n, 1);
            set_line_style(d, &out, wf);
            cairo_stroke(d->cr);
        }
        cairo_new_path(d->cr);
        path_polyline(d, x, y, s->flags, s->n, s->flags ? 0 : -1);
        set_line_style(d, &st, 1);
        cairo_stroke(d->cr);
        series_marks(d, k, x, y, s->flags, s->n, &st);
        free(x);
        free(y);
    }
    cairo_set_dash(d->cr, NULL, 0, 0);
}

/* ---- Contours -------------------------------------------------------- */

static void
set_contour_dash(draw *d, int level, double lw)
{
    const double *pat = DASH_CONTOUR[level % 3];
    if (pat[0] == 0) {
        cairo_set_dash(d->cr, NULL, 0, 0);
        return;
    }
    double dash[2] = {pat[0] * lw, pat[1] * lw};
    cairo_set_dash(d->cr, dash, 2, 0);
}

/* A contour stroke: a light halo, then the dark line. */
static void
stroke_contour_path(draw *d, int level)
{
    double lw = LW_CONTOUR * d->f;
    cairo_set_line_join(d->cr, CAIRO_LINE_JOIN_ROUND);
    cairo_set_line_cap(d->cr, CAIRO_LINE_CAP_BUTT);
    cairo_set_dash(d->cr, NULL, 0, 0);
    cairo_set_source_rgba(d->cr, 1, 1, 1, 0.75);
    cairo_set_line_width(d->cr, lw + 2 * HALO_CONTOUR * d->f);
    cairo_stroke_preserve(d->cr);
    set_contour_dash(d, level, lw);
    cairo_set_source_rgb(d->cr, INK[0], INK[1], INK[2]);
    cairo_set_line_width(d->cr, lw);
    cairo_stroke(d->cr);
    cairo_set_dash(d->cr, NULL, 0, 0);
}

static void
draw_contours(draw *d)
{
    const plot_layout *L = d->L;
    for (int i = 0; i < L->ncontours; i++) {
        cairo_new_path(d->cr);
        path_polyline(d, L->contours[i].x, L->contours[i].y, NULL,
                      (size_t)L->contours[i].n, -1);
        stroke_contour_path(d, L->contours[i].level);
    }
}

/* ---- Map ------------------------------------------------------------- */

/* z at grid coordinates (gi, gj) by bilinear interpolation, NaN outside
 * or next to a NaN. */
static double
map_at(const plot_map *m, double gi, double gj)
{
    if (!(gi >= 0 && gi <= m->nx - 1 && gj >= 0 && gj <= m->ny - 1))
        return NAN;
    int i = (int)gi, j = (int)gj;
    if (i > m->nx - 2)
        i = m->nx - 2;
    if (j > m->ny - 2)
        j = m->ny - 2;
    double u = gi - i, v = gj - j;
    const double *r0 = m->z + (long)j * m->nx + i, *r1 = r0 + m->nx;
    return (1 - v) * ((1 - u) * r0[0] + u * r0[1]) +
           v * ((1 - u) * r1[0] + u * r1[1]);
}

static uint32_t
pack(const double rgb[3])
{
    uint32_t R = (uint32_t)lround(fmin(fmax(rgb[0], 0), 1) * 255);
    uint32_t G = (uint32_t)lround(fmin(fmax(rgb[1], 0), 1) * 255);
    uint32_t B = (uint32_t)lround(fmin(fmax(rgb[2], 0), 1) * 255);
    return 0xff000000u | R << 16 | G << 8 | B;
}

/* Whether pixel (c, r) lies on a hatch line of pitch @pitch px (dir as
 * hatch_rect). */
static int
on_hatch(int c, int r, double pitch, double width, int dir)
{
    for (int s = -1; s <= 1; s += 2) {
        if (dir && s != dir)
            continue;
        double u = fmod(c + 0.5 - s * (r + 0.5), pitch);
        if (u < 0)
            u += pitch;
        if (u < width * 1.4142)
            return 1;
    }
    return 0;
}

static void
draw_map(draw *d)
{
    const plot_map *m = d->p->map;
    const plot_layout *L = d->L;
    double s = d->raster_scale;
    if (L->ax_w * s > MAP_MAX_PX)
        s = MAP_MAX_PX / L->ax_w;
    if (L->ax_h * s > MAP_MAX_PX)
        s = MAP_MAX_PX / L->ax_h;
    int X0 = (int)floor(L->ax_x * s), Y0 = (int)floor(L->ax_y * s);
    int W = (int)ceil((L->ax_x + L->ax_w) * s) - X0;
    int H = (int)ceil((L->ax_y + L->ax_h) * s) - Y0;
    double *lut = malloc(3 * MAP_TABLE * sizeof *lut);
    cairo_surface_t *img =
        cairo_image_surface_create(CAIRO_FORMAT_ARGB32, W, H);
    if (!lut || cairo_surface_status(img) != CAIRO_STATUS_SUCCESS) {
        free(lut);
        cairo_surface_destroy(img);
        d->oom = 1;
        return;
    }
    plot_colormap_table(MAP_TABLE, lut);
    cairo_surface_flush(img);
    unsigned char *data = cairo_image_surface_get_data(img);
    int stride = cairo_image_surface_get_stride(img);
    double dz = L->zhi - L->zlo;
    double pitch = HATCH_PITCH * d->f * s, width = HATCH_LW * d->f * s;
    if (width < 0.75)
        width = 0.75;
    uint32_t blank = pack(BLANK_RGB), blank_line = pack(BLANK_LINE);
    uint32_t opaque = pack(OPAQUE_RGB), opaque_line = pack(OPAQUE_LINE);
    for (int r = 0; r < H; r++) {
        uint32_t *row = (uint32_t *)(void *)(data + (long)r * stride);
        double yd = plot_y_data(L, (Y0 + r + 0.5) / s);
        double gj = (yd - m->y0) / (m->y1 - m->y0) * (m->ny - 1);
        for (int c = 0; c < W; c++) {
            double xd = plot_x_data(L, (X0 + c + 0.5) / s);
            double gi = (xd - m->x0) / (m->x1 - m->x0) * (m->nx - 1);
            unsigned flag = 0;
            if (m->flags && gi > -0.5 && gi < m->nx - 0.5 && gj > -0.5 &&
                gj < m->ny - 0.5)
                flag = m->flags[(long)lround(gj) * m->nx + lround(gi)];
            int X = X0 + c, Y = Y0 + r;
            if (flag & DK_PLOT_FLAG_NOT_TRANSPARENT) {
                row[c] = on_hatch(X, Y, pitch, width, 0) ? opaque_line
                                                         : opaque;
                continue;
            }
            double z = map_at(m, gi, gj);
            if (!isfinite(z)) {
                row[c] = on_hatch(X, Y, pitch, width, 1) ? blank_line
                                                         : blank;
                continue;
            }
            double t = (z - L->zlo) / dz;
            int k = (int)lround(t * (MAP_TABLE - 1));
            k = k < 0 ? 0 : k >= MAP_TABLE ? MAP_TABLE - 1 : k;
            double rgb[3] = {lut[3 * k], lut[3 * k + 1], lut[3 * k + 2]};
            if ((flag & DK_PLOT_FLAG_OUTSIDE_FIT) &&
                on_hatch(X, Y, pitch, width, -1))
                for (int q = 0; q < 3; q++)
                    rgb[q] = 0.35 * rgb[q] + 0.65;
            row[c] = pack(rgb);
        }
    }
    free(lut);
    cairo_surface_mark_dirty(img);
    cairo_save(d->cr);
    cairo_scale(d->cr, 1 / s, 1 / s);
    cairo_set_source_surface(d->cr, img, X0, Y0);
    cairo_pattern_set_filter(cairo_get_source(d->cr), CAIRO_FILTER_NEAREST);
    cairo_rectangle(d->cr, X0, Y0, W, H);
    cairo_fill(d->cr);
    cairo_restore(d->cr);
    cairo_surface_destroy(img);
}

/* ---- Regions, bands and markers -------------------------------------- */

/* The page extent of a region, clipped to the axes; 0 when empty. */
static int
region_box(const plot_layout *L, const plot_region *g, double r[4])
{
    const plot_axis *a = g->axis == DK_PLOT_X_AXIS ? &L->x : &L->y;
    double lo = fmax(g->lo, a->lo), hi = fmin(g->hi, a->hi);
    if (!(hi > lo))
        return 0;
    if (g->axis == DK_PLOT_X_AXIS) {
        double x0 = plot_x_pt(L, lo), x1 = plot_x_pt(L, hi);
        r[0] = fmin(x0, x1), r[1] = L->ax_y;
        r[2] = fabs(x1 - x0), r[3] = L->ax_h;
    } else {
        double y0 = plot_y_pt(L, lo), y1 = plot_y_pt(L, hi);
        r[0] = L->ax_x, r[1] = fmin(y0, y1);
        r[2] = L->ax_w, r[3] = fabs(y1 - y0);
    }
    return 1;
}

static void
draw_regions(draw *d)
{
    for (size_t i = 0; i < d->p->nregions; i++) {
        double r[4];
        if (region_box(d->L, &d->p->regions[i], r))
            hatch_rect(d, r[0], r[1], r[2], r[3], OPAQUE_RGB,
                       d->p->map ? 1.0 : 0.55, OPAQUE_LINE, 0);
    }
}

static void
draw_bands(draw *d)
{
    const plot_layout *L = d->L;
    for (size_t i = 0; i < d->p->nbands; i++) {
        double a = plot_x_pt(L, d->p->bands[i].x0);
        double b = plot_x_pt(L, d->p->bands[i].x1);
        double x0 = fmax(fmin(a, b), L->ax_x - CLIP_MARGIN);
        double x1 = fmin(fmax(a, b), L->ax_x + L->ax_w + CLIP_MARGIN);
        if (!(x1 > x0))
            continue;
        cairo_rectangle(d->cr, x0, L->ax_y, x1 - x0, L->ax_h);
        cairo_set_source_rgba(d->cr, BAND_RGB[0], BAND_RGB[1], BAND_RGB[2],
                              d->p->map ? 0.45 : 1.0);
        cairo_fill(d->cr);
        cairo_set_source_rgb(d->cr, BAND_EDGE[0], BAND_EDGE[1], BAND_EDGE[2]);
        cairo_set_line_width(d->cr, 0.5 * LW_FRAME * d->f);
        for (int e = 0; e < 2; e++) {
            double x = e ? x1 : x0;
            cairo_move_to(d->cr, x, L->ax_y);
            cairo_line_to(d->cr, x, L->ax_y + L->ax_h);
        }
        cairo_stroke(d->cr);
    }
}

static void
draw_marker_dots(draw *d)
{
    const plot_layout *L = d->L;
    double r = MARKER_R * d->f;
    for (size_t i = 0; i < d->p->nmarkers; i++) {
        double x = plot_x_pt(L, d->p->markers[i].x);
        double y = plot_y_pt(L, d->p->markers[i].y);
        if (!(x >= L->ax_x - 1e-9 && x <= L->ax_x + L->ax_w + 1e-9 &&
              y >= L->ax_y - 1e-9 && y <= L->ax_y + L->ax_h + 1e-9))
            continue;
        cairo_new_sub_path(d->cr);
        cairo_arc(d->cr, x, y, r, 0, 2 * G_PI);
        cairo_set_source_rgb(d->cr, 1, 1, 1);
        cairo_set_line_width(d->cr, 2 * MARKER_RING * d->f);
        cairo_stroke_preserve(d->cr);
        cairo_set_source_rgb(d->cr, INK[0], INK[1], INK[2]);
        cairo_fill(d->cr);
    }
}

/* ---- Frame and ticks ------------------------------------------------- */

/* Minor subdivisions of a 1-2-5 step: 5, 4, 5. */
static double
minor_step(double step)
{
    double mant = step / pow(10, floor(log10(step) + 1e-9));
    return step / (fabs(mant - 2) < 0.5 ? 4 : 5);
}

/* One tick mark at @v on @side (0 bottom, 1 top, 2 left, 3 right). */
static void
tick_at(draw *d, int side, double v, double len)
{
    const plot_layout *L = d->L;
    double dir = L->ticks_out ? -1 : 1;
    if (side <= 1) {
        double pos = plot_x_pt(L, v);
        if (!(pos >= L->ax_x - 1e-6 && pos <= L->ax_x + L->ax_w + 1e-6))
            return;
        double y0 = side == 0 ? L->ax_y + L->ax_h : L->ax_y;
        cairo_move_to(d->cr, pos, y0);
        cairo_line_to(d->cr, pos, side == 0 ? y0 - dir * len
                                            : y0 + dir * len);
    } else {
        double pos = plot_y_pt(L, v);
        if (!(pos >= L->ax_y - 1e-6 && pos <= L->ax_y + L->ax_h + 1e-6))
            return;
        double x0 = side == 2 ? L->ax_x : L->ax_x + L->ax_w;
        cairo_move_to(d->cr, x0, pos);
        cairo_line_to(d->cr, side == 2 ? x0 + dir * len : x0 - dir * len,
                      pos);
    }
}

/* Tick marks of axis @a along @side; @secondary: the values are the top
 * axis's, placed through its inverse transform. */
static void
side_ticks(draw *d, const plot_axis *a, int side, int secondary)
{
    const dk_plot *p = d->p;
    double f = d->f;
#define PLACE(v) (secondary ? p->from_top((v), p->top_params) : (v))
    if (a->log && a->step >= 0) {
        /* Majors at the ticks; minors at 2..9 × 10^k (one-decade steps or
         * less) or at the skipped decades. */
        for (int i = 0; i < a->nticks; i++)
            tick_at(d, side, PLACE(a->ticks[i]), TICK_MAJOR * f);
        int k0 = (int)floor(log10(a->lo)), k1 = (int)ceil(log10(a->hi));
        for (int k = k0; k <= k1; k++)
            for (int m = 1; m <= 9; m++) {
                if (a->step > 1 && m > 1)
                    break;
                double v = m * pow(10, k);
                int major = 0;
                for (int i = 0; i < a->nticks; i++)
                    major |= fabs(v / a->ticks[i] - 1) < 1e-9;
                if (!major && v >= a->lo * (1 - 1e-12) &&
                    v <= a->hi * (1 + 1e-12))
                    tick_at(d, side, PLACE(v), TICK_MINOR * f);
            }
        return;
    }
    double step = a->log ? -a->step : a->step;
    double ms = minor_step(step);
    double k0 = ceil(a->lo / ms - 1e-9), k1 = floor(a->hi / ms + 1e-9);
    for (double k = k0; k <= k1; k++) {
        int major = fmod(fabs(k), (double)lround(step / ms)) == 0;
        tick_at(d, side, PLACE(k * ms), (major ? TICK_MAJOR : TICK_MINOR) * f);
    }
#undef PLACE
}

static void
draw_frame(draw *d)
{
    const plot_layout *L = d->L;
    cairo_t *cr = d->cr;
    cairo_set_source_rgb(cr, INK[0], INK[1], INK[2]);
    cairo_set_line_width(cr, LW_FRAME * d->f);
    cairo_set_line_cap(cr, CAIRO_LINE_CAP_BUTT);
    cairo_set_line_join(cr, CAIRO_LINE_JOIN_MITER);
    cairo_set_dash(cr, NULL, 0, 0);
    cairo_new_path(cr);
    cairo_rectangle(cr, L->ax_x, L->ax_y, L->ax_w, L->ax_h);
    side_ticks(d, &L->x, 0, 0);
    if (L->has_top)
        side_ticks(d, &L->top, 1, 1);
    else if (!L->ticks_out)
        side_ticks(d, &L->x, 1, 0); /* mirror ticks inside the frame */
    side_ticks(d, &L->y, 2, 0);
    if (!L->ticks_out)
        side_ticks(d, &L->y, 3, 0);
    cairo_stroke(cr);
}

/* ---- Legend ---------------------------------------------------------- */

static void
draw_legend_sample(draw *d, const plot_legend_item *it, double x, double y)
{
    double len = LEGEND_SAMPLE * d->f, h = 0.7 * d->f;
    cairo_t *cr = d->cr;
    cairo_new_path(cr);
    switch (it->kind) {
    case PLOT_ITEM_SERIES: {
        plot_style st;
        plot_series_style(it->index, &st);
        set_line_style(d, &st, 1);
        cairo_move_to(cr, x, y);
        cairo_line_to(cr, x + len, y);
        cairo_stroke(cr);
        draw_mark(d, st.marker, x + len / 2, y, st.rgb);
        break;
    }
    case PLOT_ITEM_OUTSIDE_FIT: {
        plot_style ink = {.rgb = {INK[0], INK[1], INK[2]}}, st;
        double wf;
        plot_outside_style(&ink, &st, &wf);
        set_line_style(d, &st, wf);
        cairo_move_to(cr, x, y);
        cairo_line_to(cr, x + len, y);
        cairo_stroke(cr);
        break;
    }
    case PLOT_ITEM_BAND:
        cairo_rectangle(cr, x, y - h / 2, len, h);
        cairo_set_source_rgb(cr, BAND_RGB[0], BAND_RGB[1], BAND_RGB[2]);
        cairo_fill_preserve(cr);
        cairo_set_source_rgb(cr, BAND_EDGE[0], BAND_EDGE[1], BAND_EDGE[2]);
        cairo_set_line_width(cr, 0.5 * LW_FRAME * d->f);
        cairo_stroke(cr);
        break;
    case PLOT_ITEM_REGION:
    case PLOT_ITEM_MAP_OPAQUE:
        hatch_rect(d, x, y - h / 2, len, h, OPAQUE_RGB, 1, OPAQUE_LINE, 0);
        break;
    case PLOT_ITEM_MAP_BLANK:
        hatch_rect(d, x, y - h / 2, len, h, BLANK_RGB, 1, BLANK_LINE, 1);
        break;
    case PLOT_ITEM_MAP_OUTSIDE_FIT: {
        double mid[3];
        dk_colormap_rgb(0.35, mid);
        const double white[3] = {0.35 * mid[0] + 0.65, 0.35 * mid[1] + 0.65,
                                 0.35 * mid[2] + 0.65};
        hatch_rect(d, x, y - h / 2, len, h, mid, 1, white, -1);
        break;
    }
    case PLOT_ITEM_CONTOUR:
        cairo_move_to(cr, x, y);
        cairo_line_to(cr, x + len, y);
        stroke_contour_path(d, (int)it->index);
        break;
    }
    cairo_set_dash(cr, NULL, 0, 0);
}

static void
draw_legend(draw *d)
{
    const plot_layout *L = d->L;
    if (L->legend_where == PLOT_LEGEND_HIDDEN)
        return;
    double x = L->legend_box[0], y = L->legend_box[1];
    if (L->legend_backing) {
        cairo_rectangle(d->cr, x, y, L->legend_box[2], L->legend_box[3]);
        cairo_set_source_rgba(d->cr, 1, 1, 1, 0.85);
        cairo_fill(d->cr);
    }
    for (int i = 0; i < L->nitems; i++) {
        double capmid = y + L->legend_pad + L->legend_row * i +
                        PLOT_CAP_HEIGHT * L->legend_size / 2;
        draw_legend_sample(d, &L->items[i], x + L->legend_pad, capmid);
    }
}

/* ---- Colour bar ------------------------------------------------------ */

static void
draw_colour_bar(draw *d)
{
    const plot_layout *L = d->L;
    const dk_plot *p = d->p;
    cairo_t *cr = d->cr;
    double f = d->f, x = L->cb_x, w = L->cb_w, y = L->ax_y, h = L->ax_h;
    double rgb[3 * CBAR_STOPS];
    plot_colormap_table(CBAR_STOPS, rgb);
    cairo_pattern_t *g = cairo_pattern_create_linear(0, y + h, 0, y);
    for (int k = 0; k < CBAR_STOPS; k++)
        cairo_pattern_add_color_stop_rgb(g, (double)k / (CBAR_STOPS - 1),
                                         fmin(fmax(rgb[3 * k], 0), 1),
                                         fmin(fmax(rgb[3 * k + 1], 0), 1),
                                         fmin(fmax(rgb[3 * k + 2], 0), 1));
    cairo_rectangle(cr, x, y, w, h);
    cairo_set_source(cr, g);
    cairo_fill(cr);
    cairo_pattern_destroy(g);

    double span = L->zhi - L->zlo;
    for (int i = 0; i < p->ncontours; i++) {
        double t = (p->contours[i].level - L->zlo) / span;
        if (t < 0 || t > 1)
            continue;
        double yy = y + h - t * h;
        cairo_new_path(cr);
        cairo_move_to(cr, x, yy);
        cairo_line_to(cr, x + w, yy);
        stroke_contour_path(d, i);
    }
    cairo_set_source_rgb(cr, INK[0], INK[1], INK[2]);
    cairo_set_line_width(cr, LW_FRAME * f);
    cairo_rectangle(cr, x, y, w, h);
    for (int i = 0; i < L->z.nticks; i++) {
        double yy = y + h - (L->z.ticks[i] - L->zlo) / span * h;
        cairo_move_to(cr, x + w, yy);
        cairo_line_to(cr, x + w + 0.6 * TICK_MAJOR * f, yy);
    }
    cairo_stroke(cr);
}

/* ---- The figure ------------------------------------------------------ */

int
plot_draw(const dk_plot *p, const plot_layout *L, cairo_t *cr,
          double raster_scale)
{
    draw d = {.p = p, .L = L, .cr = cr, .f = L->f,
              .raster_scale = raster_scale};
    d.pc = plot_text_context(cr);
    if (!d.pc)
        return -1;
    pango_cairo_update_context(cr, d.pc);

    cairo_save(cr);
    cairo_rectangle(cr, L->ax_x, L->ax_y, L->ax_w, L->ax_h);
    cairo_clip(cr);
    if (p->map)
        draw_map(&d);
    draw_regions(&d);
    draw_bands(&d);
    draw_contours(&d);
    draw_series(&d);
    draw_marker_dots(&d);
    cairo_restore(cr);

    draw_frame(&d);
    if (p->map)
        draw_colour_bar(&d);
    draw_legend(&d);
    for (int i = 0; i < L->ntexts; i++)
        draw_text(&d, &L->texts[i]);
    g_object_unref(d.pc);
    return d.oom ? -1 : 0;
}
