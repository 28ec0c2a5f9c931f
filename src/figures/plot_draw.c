/*
 * plot_draw.c - drawing a laid-out figure with cairo and pango, in page
 * pt (plot_layout.c decides where everything goes).
 *
 * Order, back to front: map image, shaded bands, contour lines, series,
 * marker dots (all clipped to the axes box); the frame with major and
 * minor ticks, inward on four sides, or outward on the bottom and left
 * over a map (the top side carries the secondary axis when there is one);
 * tick labels and axis labels; marker labels; the legend; the colour bar.
 *
 * The map image is computed at the output's pixel grid (PNG) or at 200
 * pixels per inch (vector output): each pixel takes the bilinear
 * interpolant of z at its centre, through a 1024-step table of the colour
 * scale, so the image and the contour lines (linear along cell edges)
 * agree. Lines are clipped to a slightly enlarged axes box before they
 * reach cairo (Liang-Barsky), so far-off points cannot overflow cairo's
 * fixed-point coordinates.
 *
 * Placement: a marker label goes beside its dot in the quadrant that stays
 * inside the axes and covers the least line length; the legend (AUTO) in the
 * inside corner, or failing that the middle of a side, that covers the least
 * line length, marker and label (heavily) and band area (lightly), with a
 * light backing only over a map or lines. Text labels get a thin white halo
 * so that they read over lines.
 *
 * Text: pango with "Sans", no hinting, unrounded glyph positions and a
 * 72 ppi resolution, so that 1 pango point is 1 page pt whatever the
 * backend and text measured for the layout is the text drawn. Vertical
 * placement uses the capital height, taken as 0.72 em (DejaVu Sans, the
 * usual "Sans" of fontconfig, has 0.73 em; from memory).
 *
 * References:
 *   Y.-D. Liang, B. A. Barsky, "A new concept and method for line
 *   clipping", ACM Trans. Graph. 3, 1-22 (1984).
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
#define TICK_GAP 0.45        /* as plot_layout.c */
#define LABEL_GAP 0.5        /* as plot_layout.c */
#define MULT_GAP 0.3         /* as plot_layout.c */
#define CAP_HEIGHT 0.72      /* capital height of the sans face, em */
#define MARKER_R 0.3
#define MARKER_RING 0.06
#define LEGEND_SAMPLE 2.0
#define LEGEND_GAP 0.5
#define LEGEND_PAD 0.4
#define LEGEND_INSET 0.5
#define LEGEND_ROW 1.15      /* row pitch, em */
#define LEGEND_SIZE 0.92     /* legend and marker label type, em */
#define CLIP_MARGIN 10.0     /* pt beyond the axes box kept by clipping */
#define MAP_MAX_PX 4000
#define MAP_TABLE 1024
#define CBAR_STOPS 64
#define BAND_WEIGHT 0.02     /* legend placement cost per pt² of band */
#define SIDE_PENALTY 20.0    /* legend placement cost of a side middle */

static const double INK[3] = {0.10, 0.10, 0.10};
static const double BAND_RGB[3] = {0.84, 0.87, 0.92};
static const double BAND_EDGE[3] = {0.66, 0.71, 0.80};
static const double DASH_SERIES[2] = {4.0, 2.0};   /* × line width */
static const double DASH_CONTOUR[3][2] = {{0, 0}, {5, 2.5}, {1.5, 2}};

typedef struct polyline {
    double *x, *y;        /* page pt */
    int n;
    int level;            /* contour index */
} polyline;

enum { H_LEFT, H_CENTER, H_RIGHT };
enum { V_TOP, V_BOTTOM, V_CAPTOP, V_CAPMID, V_BASE };

typedef struct marker_label {
    int placed;
    double box[4];        /* x, y, w, h in pt */
    int hal;              /* H_LEFT or H_RIGHT */
} marker_label;

typedef struct draw {
    const dk_plot *p;
    const plot_layout *L;
    cairo_t *cr;
    PangoContext *pc;
    double raster_scale;  /* output pixels per pt */
    double f;
    polyline *contours;
    int ncontours, capcontours;
    marker_label *mlabels; /* one per marker */
    int oom;
} draw;

static double line_ink(const draw *d, const double r[4]);

/* ---- Text ------------------------------------------------------------ */

PangoContext *
plot_text_context(cairo_t *cr)
{
    PangoContext *ctx = pango_cairo_create_context(cr);
    if (!ctx)
        return NULL;
    cairo_font_options_t *fo = cairo_font_options_create();
    cairo_font_options_set_hint_style(fo, CAIRO_HINT_STYLE_NONE);
    cairo_font_options_set_hint_metrics(fo, CAIRO_HINT_METRICS_OFF);
    cairo_font_options_set_antialias(fo, CAIRO_ANTIALIAS_GRAY);
    pango_cairo_context_set_font_options(ctx, fo);
    cairo_font_options_destroy(fo);
    pango_cairo_context_set_resolution(ctx, 72);
    pango_context_set_round_glyph_positions(ctx, FALSE);
    return ctx;
}

PangoLayout *
plot_text_layout(PangoContext *ctx, const char *markup, double size_pt)
{
    PangoLayout *lay = pango_layout_new(ctx);
    PangoFontDescription *fd = pango_font_description_from_string("Sans");
    pango_font_description_set_size(fd, (gint)lround(size_pt * PANGO_SCALE));
    pango_layout_set_font_description(lay, fd);
    pango_font_description_free(fd);
    pango_layout_set_markup(lay, markup, -1);
    return lay;
}

void
plot_text_size(PangoContext *ctx, const char *markup, double size_pt,
               double *w, double *h)
{
    PangoLayout *lay = plot_text_layout(ctx, markup, size_pt);
    PangoRectangle logical;
    pango_layout_get_extents(lay, NULL, &logical);
    *w = (double)logical.width / PANGO_SCALE;
    *h = (double)logical.height / PANGO_SCALE;
    g_object_unref(lay);
}


/* Draw @markup with the anchor (@h, @v) at (@x, @y) in the current user
 * space; a light halo under it when @halo. */
static void
text_at(draw *d, const char *markup, double size, double x, double y, int h,
        int v, int halo)
{
    cairo_t *cr = d->cr;
    PangoLayout *lay = plot_text_layout(d->pc, markup, size);
    pango_cairo_update_layout(cr, lay);
    PangoRectangle lg;
    pango_layout_get_extents(lay, NULL, &lg);
    double w = (double)lg.width / PANGO_SCALE;
    double ht = (double)lg.height / PANGO_SCALE;
    double base = (double)pango_layout_get_baseline(lay) / PANGO_SCALE;
    double cap = CAP_HEIGHT * size;
    double left = x - (double)lg.x / PANGO_SCALE -
                  (h == H_CENTER ? w / 2 : h == H_RIGHT ? w : 0);
    double top = v == V_TOP      ? y
                 : v == V_BOTTOM ? y - ht
                 : v == V_CAPTOP ? y + cap - base
                 : v == V_CAPMID ? y + cap / 2 - base
                                 : y - base;
    top -= (double)lg.y / PANGO_SCALE;
    if (halo) {
        cairo_move_to(cr, left, top);
        pango_cairo_layout_path(cr, lay);
        cairo_set_source_rgba(cr, 1, 1, 1, 0.9);
        cairo_set_line_width(cr, HALO_TEXT * d->f);
        cairo_set_line_join(cr, CAIRO_LINE_JOIN_ROUND);
        cairo_stroke(cr);
    }
    cairo_set_source_rgb(cr, INK[0], INK[1], INK[2]);
    cairo_move_to(cr, left, top);
    pango_cairo_show_layout(cr, lay);
    g_object_unref(lay);
}

/* ---- Lines ----------------------------------------------------------- */

/* Liang-Barsky: clip the segment a-b to the box; 0 when nothing is left. */
static int
clip_segment(double box[4], double *ax, double *ay, double *bx, double *by)
{
    double dx = *bx - *ax, dy = *by - *ay, t0 = 0, t1 = 1;
    double pq[4][2] = {{-dx, *ax - box[0]}, {dx, box[2] - *ax},
                       {-dy, *ay - box[1]}, {dy, box[3] - *ay}};
    for (int k = 0; k < 4; k++) {
        double pk = pq[k][0], qk = pq[k][1];
        if (pk == 0) {
            if (qk < 0)
                return 0;
            continue;
        }
        double r = qk / pk;
        if (pk < 0) {
            if (r > t1)
                return 0;
            if (r > t0)
                t0 = r;
        } else {
            if (r < t0)
                return 0;
            if (r < t1)
                t1 = r;
        }
    }
    double x0 = *ax + t0 * dx, y0 = *ay + t0 * dy;
    *bx = *ax + t1 * dx;
    *by = *ay + t1 * dy;
    *ax = x0;
    *ay = y0;
    return 1;
}

/* Add a polyline in page pt to the path; non-finite points break it. */
static void
path_polyline(draw *d, const double *x, const double *y, size_t n)
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
        double ax = x[i - 1], ay = y[i - 1], bx = x[i], by = y[i];
        if (!clip_segment(box, &ax, &ay, &bx, &by)) {
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

/* A data series in page pt (NULL when out of memory). */
static void
series_pt(const draw *d, const plot_series *s, double *x, double *y)
{
    for (size_t i = 0; i < s->n; i++) {
        x[i] = plot_x_pt(d->L, s->x[i]);
        y[i] = plot_y_pt(d->L, s->y[i]);
    }
}

static void
set_series_style(draw *d, size_t k)
{
    double rgb[3];
    int np = dk_palette_size();
    dk_palette_rgb((int)(k % (size_t)np), rgb);
    cairo_set_source_rgb(d->cr, rgb[0], rgb[1], rgb[2]);
    double lw = LW_LINE * d->f;
    cairo_set_line_width(d->cr, lw);
    cairo_set_line_join(d->cr, CAIRO_LINE_JOIN_ROUND);
    cairo_set_line_cap(d->cr, CAIRO_LINE_CAP_ROUND);
    if (k >= (size_t)np) {
        double dash[2] = {DASH_SERIES[0] * lw, DASH_SERIES[1] * lw};
        cairo_set_line_cap(d->cr, CAIRO_LINE_CAP_BUTT);
        cairo_set_dash(d->cr, dash, 2, 0);
    } else {
        cairo_set_dash(d->cr, NULL, 0, 0);
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
        series_pt(d, s, x, y);
        cairo_new_path(d->cr);
        path_polyline(d, x, y, s->n);
        set_series_style(d, k);
        cairo_stroke(d->cr);
        free(x);
        free(y);
    }
    cairo_set_dash(d->cr, NULL, 0, 0);
}

/* ---- Contours -------------------------------------------------------- */

typedef struct collect {
    draw *d;
    int level;
} collect;

static void
collect_polyline(const double *gx, const double *gy, int n, int closed,
                 void *ctx)
{
    (void)closed;
    collect *c = ctx;
    draw *d = c->d;
    const plot_map *m = d->p->map;
    if (d->oom)
        return;
    if (d->ncontours == d->capcontours) {
        int cap = d->capcontours ? 2 * d->capcontours : 16;
        polyline *pl = realloc(d->contours, (size_t)cap * sizeof *pl);
        if (!pl) {
            d->oom = 1;
            return;
        }
        d->contours = pl;
        d->capcontours = cap;
    }
    polyline *pl = &d->contours[d->ncontours];
    pl->x = malloc((size_t)n * sizeof *pl->x);
    pl->y = malloc((size_t)n * sizeof *pl->y);
    if (!pl->x || !pl->y) {
        free(pl->x);
        free(pl->y);
        d->oom = 1;
        return;
    }
    for (int i = 0; i < n; i++) {
        double x = m->x0 + gx[i] * (m->x1 - m->x0) / (m->nx - 1);
        double y = m->y0 + gy[i] * (m->y1 - m->y0) / (m->ny - 1);
        pl->x[i] = plot_x_pt(d->L, x);
        pl->y[i] = plot_y_pt(d->L, y);
    }
    pl->n = n;
    pl->level = c->level;
    d->ncontours++;
}

static void
trace_contours(draw *d)
{
    const plot_map *m = d->p->map;
    if (!m)
        return;
    for (int k = 0; k < d->p->ncontours; k++) {
        collect c = {d, k};
        if (plot_contour_trace(m->z, m->nx, m->ny, d->p->contours[k].level,
                               collect_polyline, &c))
            d->oom = 1;
    }
}

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
    for (int i = 0; i < d->ncontours; i++) {
        cairo_new_path(d->cr);
        path_polyline(d, d->contours[i].x, d->contours[i].y,
                      (size_t)d->contours[i].n);
        stroke_contour_path(d, d->contours[i].level);
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
    for (int r = 0; r < H; r++) {
        uint32_t *row = (uint32_t *)(void *)(data + (long)r * stride);
        double yd = L->y.hi - ((Y0 + r + 0.5) / s - L->ax_y) / L->ax_h *
                                  (L->y.hi - L->y.lo);
        double gj = (yd - m->y0) / (m->y1 - m->y0) * (m->ny - 1);
        for (int c = 0; c < W; c++) {
            double xd = L->x.lo + ((X0 + c + 0.5) / s - L->ax_x) / L->ax_w *
                                      (L->x.hi - L->x.lo);
            double gi = (xd - m->x0) / (m->x1 - m->x0) * (m->nx - 1);
            double z = map_at(m, gi, gj);
            if (!isfinite(z)) {
                row[c] = 0;
                continue;
            }
            double t = (z - L->zlo) / dz;
            int k = (int)lround(t * (MAP_TABLE - 1));
            k = k < 0 ? 0 : k >= MAP_TABLE ? MAP_TABLE - 1 : k;
            const double *rgb = lut + 3 * k;
            uint32_t R = (uint32_t)lround(fmin(fmax(rgb[0], 0), 1) * 255);
            uint32_t G = (uint32_t)lround(fmin(fmax(rgb[1], 0), 1) * 255);
            uint32_t B = (uint32_t)lround(fmin(fmax(rgb[2], 0), 1) * 255);
            row[c] = 0xff000000u | R << 16 | G << 8 | B;
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

/* ---- Bands and markers ----------------------------------------------- */

static void
draw_bands(draw *d)
{
    const plot_layout *L = d->L;
    for (size_t i = 0; i < d->p->nbands; i++) {
        double a = plot_x_pt(L, d->p->bands[i].x0);
        double b = plot_x_pt(L, d->p->bands[i].x1);
        double x0 = fmax(fmin(a, b), L->ax_x - CLIP_MARGIN);
        double x1 = fmin(fmax(a, b), L->ax_x + L->ax_w + CLIP_MARGIN);
        if (x1 <= x0)
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

static int
inside_axes(const plot_layout *L, double x, double y)
{
    return x >= L->ax_x - 1e-9 && x <= L->ax_x + L->ax_w + 1e-9 &&
           y >= L->ax_y - 1e-9 && y <= L->ax_y + L->ax_h + 1e-9;
}

static void
draw_marker_dots(draw *d)
{
    double r = MARKER_R * d->f;
    for (size_t i = 0; i < d->p->nmarkers; i++) {
        double x = plot_x_pt(d->L, d->p->markers[i].x);
        double y = plot_y_pt(d->L, d->p->markers[i].y);
        if (!inside_axes(d->L, x, y))
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

/* Place every marker label: beside its dot in the quadrant (right-above,
 * right-below, left-above, left-below, in that preference) that stays
 * inside the axes and covers the least line ink. */
static void
place_marker_labels(draw *d)
{
    const plot_layout *L = d->L;
    double size = LEGEND_SIZE * d->f, off = 0.55 * d->f;
    for (size_t i = 0; i < d->p->nmarkers; i++) {
        const plot_marker *mk = &d->p->markers[i];
        marker_label *ml = &d->mlabels[i];
        ml->placed = 0;
        double x = plot_x_pt(L, mk->x), y = plot_y_pt(L, mk->y);
        if (!mk->label || !inside_axes(L, x, y))
            continue;
        double w, h, best = INFINITY;
        plot_text_size(d->pc, mk->label, size, &w, &h);
        for (int q = 0; q < 4; q++) {
            double r[4] = {q < 2 ? x + off : x - off - w,
                           q % 2 == 0 ? y - off - h : y + off, w, h};
            int in = r[0] >= L->ax_x && r[0] + w <= L->ax_x + L->ax_w &&
                     r[1] >= L->ax_y && r[1] + h <= L->ax_y + L->ax_h;
            double score = line_ink(d, r) + (in ? 0 : 1e6);
            for (size_t j = 0; j < d->p->nmarkers; j++) {
                double mx = plot_x_pt(L, d->p->markers[j].x);
                double my = plot_y_pt(L, d->p->markers[j].y);
                if (j != i && mx >= r[0] - off && mx <= r[0] + w + off &&
                    my >= r[1] - off && my <= r[1] + h + off)
                    score += 1000;
            }
            if (score < best - 1e-9) {
                best = score;
                memcpy(ml->box, r, sizeof r);
                ml->hal = q < 2 ? H_LEFT : H_RIGHT;
            }
        }
        ml->placed = 1;
    }
}

static void
draw_marker_labels(draw *d)
{
    for (size_t i = 0; i < d->p->nmarkers; i++) {
        const marker_label *ml = &d->mlabels[i];
        if (ml->placed)
            text_at(d, d->p->markers[i].label, LEGEND_SIZE * d->f,
                    ml->hal == H_LEFT ? ml->box[0] : ml->box[0] + ml->box[2],
                    ml->box[1], ml->hal, V_TOP, 1);
    }
}

/* ---- Frame, ticks and labels ----------------------------------------- */

/* Minor subdivisions of a 1-2-5 step: 5, 4, 5. */
static double
minor_step(double step)
{
    double mant = step / pow(10, floor(log10(step) + 1e-9));
    return step / (fabs(mant - 2) < 0.5 ? 4 : 5);
}

/* Tick marks along one side (inward, or outward over a map), major at
 * the axis step and minor between. @side: 0 bottom, 1 top, 2 left,
 * 3 right; @secondary: the values are the top axis's, placed through its
 * inverse transform. */
static void
side_ticks(draw *d, const plot_axis *a, int side, const dk_plot *p,
           int secondary)
{
    const plot_layout *L = d->L;
    double f = d->f;
    double ms = minor_step(a->step);
    double dir = L->ticks_out ? -1 : 1;
    double k0 = ceil(a->lo / ms - 1e-9), k1 = floor(a->hi / ms + 1e-9);
    for (double k = k0; k <= k1; k++) {
        double v = k * ms;
        int major = fmod(fabs(k), (double)lround(a->step / ms)) == 0;
        double len = (major ? TICK_MAJOR : TICK_MINOR) * f;
        double pos;
        if (side <= 1) {
            double x = secondary ? p->from_top(v, p->top_params) : v;
            pos = plot_x_pt(L, x);
            if (pos < L->ax_x - 1e-6 || pos > L->ax_x + L->ax_w + 1e-6)
                continue;
            double y0 = side == 0 ? L->ax_y + L->ax_h : L->ax_y;
            cairo_move_to(d->cr, pos, y0);
            cairo_line_to(d->cr, pos, side == 0 ? y0 - dir * len
                                                : y0 + dir * len);
        } else {
            pos = plot_y_pt(L, v);
            if (pos < L->ax_y - 1e-6 || pos > L->ax_y + L->ax_h + 1e-6)
                continue;
            double x0 = side == 2 ? L->ax_x : L->ax_x + L->ax_w;
            cairo_move_to(d->cr, x0, pos);
            cairo_line_to(d->cr, side == 2 ? x0 + dir * len : x0 - dir * len,
                          pos);
        }
    }
}

static void
draw_frame(draw *d)
{
    const plot_layout *L = d->L;
    const dk_plot *p = d->p;
    cairo_t *cr = d->cr;
    cairo_set_source_rgb(cr, INK[0], INK[1], INK[2]);
    cairo_set_line_width(cr, LW_FRAME * d->f);
    cairo_set_line_cap(cr, CAIRO_LINE_CAP_BUTT);
    cairo_set_line_join(cr, CAIRO_LINE_JOIN_MITER);
    cairo_set_dash(cr, NULL, 0, 0);
    cairo_new_path(cr);
    cairo_rectangle(cr, L->ax_x, L->ax_y, L->ax_w, L->ax_h);
    side_ticks(d, &L->x, 0, p, 0);
    if (L->has_top)
        side_ticks(d, &L->top, 1, p, 1);
    else if (!L->ticks_out)
        side_ticks(d, &L->x, 1, p, 0); /* mirror ticks inside the frame */
    side_ticks(d, &L->y, 2, p, 0);
    if (!L->ticks_out)
        side_ticks(d, &L->y, 3, p, 0);
    cairo_stroke(cr);
}

static void
draw_tick_labels(draw *d)
{
    const plot_layout *L = d->L;
    const dk_plot *p = d->p;
    double f = d->f;
    for (int i = 0; i < L->x.nticks; i++)
        text_at(d, L->x.labels[i], f, plot_x_pt(L, L->x.ticks[i]),
                L->ax_y + L->ax_h + L->tick_gap, H_CENTER, V_CAPTOP, 0);
    for (int i = 0; i < L->y.nticks; i++)
        text_at(d, L->y.labels[i], f, L->ax_x - L->tick_gap,
                plot_y_pt(L, L->y.ticks[i]), H_RIGHT, V_CAPMID, 0);
    if (L->y.mult[0])
        text_at(d, L->y.mult, f, L->ax_x - L->tick_gap,
                L->ax_y - MULT_GAP * f, H_RIGHT, V_BOTTOM, 0);
    if (L->has_top)
        for (int i = 0; i < L->top.nticks; i++) {
            double x = p->from_top(L->top.ticks[i], p->top_params);
            text_at(d, L->top.labels[i], f, plot_x_pt(L, x),
                    L->ax_y - L->tick_gap, H_CENTER, V_BASE, 0);
        }
}

static void
draw_axis_labels(draw *d)
{
    const plot_layout *L = d->L;
    const dk_plot *p = d->p;
    double f = d->f;
    double cx = L->ax_x + L->ax_w / 2, cy = L->ax_y + L->ax_h / 2;
    if (p->xlabel)
        text_at(d, p->xlabel, f, cx,
                L->ax_y + L->ax_h + L->tick_gap + L->x.label_h +
                    LABEL_GAP * f * 0.6,
                H_CENTER, V_TOP, 0);
    if (L->has_top && p->toplabel)
        text_at(d, p->toplabel, f, cx,
                L->ax_y - L->tick_gap - L->top.label_h - LABEL_GAP * f * 0.6,
                H_CENTER, V_BOTTOM, 0);
    if (p->ylabel) {
        cairo_save(d->cr);
        cairo_translate(d->cr, L->ax_x - L->tick_gap - L->y.label_w -
                                   LABEL_GAP * f,
                        cy);
        cairo_rotate(d->cr, -G_PI / 2);
        text_at(d, p->ylabel, f, 0, 0, H_CENTER, V_BOTTOM, 0);
        cairo_restore(d->cr);
    }
}

/* ---- Legend ---------------------------------------------------------- */

enum { ITEM_SERIES, ITEM_BAND, ITEM_CONTOUR };

typedef struct legend_item {
    int kind;
    size_t index;
    const char *label;
    double w, h;
} legend_item;

/* Line ink inside rectangle r (x, y, w, h): series and contour lengths
 * in pt, plus one per segment that enters. */
static double
line_ink(const draw *d, const double r[4])
{
    const plot_layout *L = d->L;
    double box[4] = {r[0], r[1], r[0] + r[2], r[1] + r[3]}, score = 0;
    for (size_t k = 0; k < d->p->nseries; k++) {
        const plot_series *s = &d->p->series[k];
        for (size_t i = 1; i < s->n; i++) {
            double ax = plot_x_pt(L, s->x[i - 1]);
            double ay = plot_y_pt(L, s->y[i - 1]);
            double bx = plot_x_pt(L, s->x[i]), by = plot_y_pt(L, s->y[i]);
            if (isfinite(ax) && isfinite(ay) && isfinite(bx) &&
                isfinite(by) && clip_segment(box, &ax, &ay, &bx, &by))
                score += 1 + hypot(bx - ax, by - ay);
        }
    }
    for (int c = 0; c < d->ncontours; c++) {
        const polyline *pl = &d->contours[c];
        for (int i = 1; i < pl->n; i++) {
            double ax = pl->x[i - 1], ay = pl->y[i - 1];
            double bx = pl->x[i], by = pl->y[i];
            if (clip_segment(box, &ax, &ay, &bx, &by))
                score += 1 + hypot(bx - ax, by - ay);
        }
    }
    return score;
}

static int
overlap(const double a[4], const double b[4])
{
    return a[0] < b[0] + b[2] && a[0] + a[2] > b[0] && a[1] < b[1] + b[3] &&
           a[1] + a[3] > b[1];
}

/* Everything a legend at r would cover: line ink, marker dots and labels
 * (heavily), and band area (lightly: a legend over a band is better than
 * one over a curve). */
static double
ink_in(const draw *d, const double r[4])
{
    const plot_layout *L = d->L;
    double score = line_ink(d, r);
    for (size_t i = 0; i < d->p->nmarkers; i++) {
        double x = plot_x_pt(L, d->p->markers[i].x);
        double y = plot_y_pt(L, d->p->markers[i].y);
        if (x >= r[0] && x <= r[0] + r[2] && y >= r[1] && y <= r[1] + r[3])
            score += 1000;
        if (d->mlabels[i].placed && overlap(d->mlabels[i].box, r))
            score += 1000;
    }
    for (size_t i = 0; i < d->p->nbands; i++) {
        double a = plot_x_pt(L, d->p->bands[i].x0);
        double b = plot_x_pt(L, d->p->bands[i].x1);
        double w = fmin(b, r[0] + r[2]) - fmax(a, r[0]);
        if (w > 0)
            score += BAND_WEIGHT * w * r[3];
    }
    return score;
}

static void
draw_legend_sample(draw *d, const legend_item *it, double x, double y)
{
    double len = LEGEND_SAMPLE * d->f;
    cairo_t *cr = d->cr;
    cairo_new_path(cr);
    switch (it->kind) {
    case ITEM_SERIES:
        set_series_style(d, it->index);
        cairo_move_to(cr, x, y);
        cairo_line_to(cr, x + len, y);
        cairo_stroke(cr);
        cairo_set_dash(cr, NULL, 0, 0);
        break;
    case ITEM_BAND: {
        double h = 0.7 * d->f;
        cairo_rectangle(cr, x, y - h / 2, len, h);
        cairo_set_source_rgb(cr, BAND_RGB[0], BAND_RGB[1], BAND_RGB[2]);
        cairo_fill_preserve(cr);
        cairo_set_source_rgb(cr, BAND_EDGE[0], BAND_EDGE[1], BAND_EDGE[2]);
        cairo_set_line_width(cr, 0.5 * LW_FRAME * d->f);
        cairo_stroke(cr);
        break;
    }
    case ITEM_CONTOUR:
        cairo_move_to(cr, x, y);
        cairo_line_to(cr, x + len, y);
        stroke_contour_path(d, (int)it->index);
        break;
    }
}

static void
draw_legend(draw *d)
{
    const dk_plot *p = d->p;
    const plot_layout *L = d->L;
    if (p->legend == DK_PLOT_LEGEND_NONE)
        return;
    size_t cap = p->nseries + p->nbands + (size_t)p->ncontours, n = 0;
    if (cap == 0)
        return;
    legend_item *items = malloc(cap * sizeof *items);
    if (!items) {
        d->oom = 1;
        return;
    }
    for (size_t i = 0; i < p->nseries; i++)
        if (p->series[i].label)
            items[n++] = (legend_item){ITEM_SERIES, i, p->series[i].label, 0,
                                       0};
    for (size_t i = 0; i < p->nbands; i++)
        if (p->bands[i].label)
            items[n++] = (legend_item){ITEM_BAND, i, p->bands[i].label, 0, 0};
    if (p->map)
        for (int i = 0; i < p->ncontours; i++)
            if (p->contours[i].label)
                items[n++] = (legend_item){ITEM_CONTOUR, (size_t)i,
                                           p->contours[i].label, 0, 0};
    if (n == 0) {
        free(items);
        return;
    }
    double f = d->f, size = LEGEND_SIZE * f, tw = 0;
    for (size_t i = 0; i < n; i++) {
        plot_text_size(d->pc, items[i].label, size, &items[i].w, &items[i].h);
        tw = fmax(tw, items[i].w);
    }
    double pad = LEGEND_PAD * f, row = LEGEND_ROW * size;
    double w = 2 * pad + LEGEND_SAMPLE * f + LEGEND_GAP * f + tw;
    double h = 2 * pad + row * (double)n - (row - CAP_HEIGHT * size) +
               0.1 * f;
    double inset = (LEGEND_INSET + TICK_MAJOR) * f;
    double left = L->ax_x + inset, right = L->ax_x + L->ax_w - inset - w;
    double top = L->ax_y + inset, bottom = L->ax_y + L->ax_h - inset - h;
    double midx = (left + right) / 2, midy = (top + bottom) / 2;
    /* The four corners first, then the middles of the sides; a side
     * position must cover less to win (it reads less well). */
    double cand[8][2] = {{right, top},    {left, top},   {right, bottom},
                         {left, bottom},  {midx, top},   {midx, bottom},
                         {right, midy},   {left, midy}};
    int pick = 0;
    switch (p->legend) {
    case DK_PLOT_LEGEND_UPPER_LEFT: pick = 1; break;
    case DK_PLOT_LEGEND_LOWER_RIGHT: pick = 2; break;
    case DK_PLOT_LEGEND_LOWER_LEFT: pick = 3; break;
    case DK_PLOT_LEGEND_UPPER_RIGHT: pick = 0; break;
    default: {
        double best = INFINITY;
        for (int c = 0; c < 8; c++) {
            double r[4] = {cand[c][0], cand[c][1], w, h};
            double s = ink_in(d, r) + (c < 4 ? 0 : SIDE_PENALTY);
            if (s < best - 1e-9) {
                best = s;
                pick = c;
            }
        }
    }
    }
    if (right < left || bottom < top) {
        free(items); /* no room inside the axes: left out */
        return;
    }
    double x = cand[pick][0], y = cand[pick][1];
    /* A light backing only where it hides something: over a map, or
     * over lines; over paper or a band the text stands on its own. */
    double r[4] = {x, y, w, h};
    if (p->map || line_ink(d, r) > 0) {
        cairo_rectangle(d->cr, x, y, w, h);
        cairo_set_source_rgba(d->cr, 1, 1, 1, 0.85);
        cairo_fill(d->cr);
    }
    for (size_t i = 0; i < n; i++) {
        double capmid = y + pad + row * (double)i + CAP_HEIGHT * size / 2;
        draw_legend_sample(d, &items[i], x + pad, capmid);
        text_at(d, items[i].label, size,
                x + pad + LEGEND_SAMPLE * f + LEGEND_GAP * f, capmid, H_LEFT,
                V_CAPMID, 0);
    }
    free(items);
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
    /* Contour levels across the bar. */
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
    for (int i = 0; i < L->z.nticks; i++) {
        double yy = y + h - (L->z.ticks[i] - L->zlo) / span * h;
        text_at(d, L->z.labels[i], f, x + w + TICK_GAP * f, yy, H_LEFT,
                V_CAPMID, 0);
    }
    if (L->z.mult[0])
        text_at(d, L->z.mult, f, x, y - MULT_GAP * f, H_LEFT, V_BOTTOM, 0);
    if (p->map->label) {
        cairo_save(cr);
        cairo_translate(cr, x + w + TICK_GAP * f + L->z.label_w +
                                LABEL_GAP * f,
                        y + h / 2);
        cairo_rotate(cr, -G_PI / 2);
        text_at(d, p->map->label, f, 0, 0, H_CENTER, V_TOP, 0);
        cairo_restore(cr);
    }
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
    trace_contours(&d);
    d.mlabels = calloc(p->nmarkers + 1, sizeof *d.mlabels);
    if (!d.mlabels)
        d.oom = 1;
    else
        place_marker_labels(&d);

    cairo_save(cr);
    cairo_rectangle(cr, L->ax_x, L->ax_y, L->ax_w, L->ax_h);
    cairo_clip(cr);
    if (p->map)
        draw_map(&d);
    draw_bands(&d);
    draw_contours(&d);
    draw_series(&d);
    draw_marker_dots(&d);
    cairo_restore(cr);

    draw_frame(&d);
    draw_tick_labels(&d);
    draw_axis_labels(&d);
    if (d.mlabels) {
        draw_marker_labels(&d);
        draw_legend(&d);
    }
    if (p->map)
        draw_colour_bar(&d);

    for (int i = 0; i < d.ncontours; i++) {
        free(d.contours[i].x);
        free(d.contours[i].y);
    }
    free(d.contours);
    free(d.mlabels);
    g_object_unref(d.pc);
    return d.oom ? -1 : 0;
}
