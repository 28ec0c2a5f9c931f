/*
 * plot_place.c - where the legend, the marker labels ("operating point")
 * and the branch labels ("signal", "idler") go, and the contour lines in
 * page pt that they must avoid.
 *
 * Method: each label has a short list of candidate boxes; each box is
 * scored by the ink it would cover (the length of every series and
 * contour line inside it, grown by a small margin, plus one per segment,
 * and marker dots heavily), by the texts already placed that it would
 * touch (very heavily), and lightly by the shaded bands and regions it
 * covers; the cheapest wins, the earlier candidate on a tie. Candidates:
 *  - a marker label: beside its dot in eight directions, at three
 *    distances (nearest first);
 *  - a branch label: in eight directions, at two distances, around
 *    points at fixed fractions of the branch's length (from its middle
 *    outwards);
 *  - the legend: the four inside corners, then points along the top and
 *    bottom, then along the sides, then inside. With AUTO, when every
 *    inside place covers a line or a text (or the legend is larger than
 *    the axes), the legend goes outside, on the right or below
 *    (plot_layout.c), if there is room.
 * Marker labels are placed first, then branch labels, then the legend,
 * each avoiding what was placed before it. The legend gets a light
 * backing over a map or when it had to cover a line.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "plot_internal.h"

#define TICK_MAJOR 0.45      /* as plot_axes.c */
#define MARKER_R 0.3         /* marker dot radius, em (as plot_draw.c) */
#define LEGEND_SAMPLE 2.0    /* sample line length, em */
#define LEGEND_GAP 0.5       /* sample to text, em */
#define LEGEND_PAD 0.4       /* inside the legend box, em */
#define LEGEND_INSET 0.5     /* frame to legend, em, past the ticks */
#define LEGEND_ROW 1.2       /* row pitch, in legend type sizes (≥ the
                                logical line height, 1.16 em) */
#define LEGEND_SIZE 0.92     /* legend and label type, em */
#define OUTSIDE_GAP 0.8      /* as plot_layout.c */
#define CLEAR 0.25           /* margin kept clear around a label, em */
#define TEXT_COST 1e6        /* touching a placed text */
#define INK_COST 1e3         /* per pt of line (and per segment) */
#define SHADE_COST 200.0     /* covering a band or region fully */
#define OUTSIDE_COST 1e9     /* a label box leaving the axes */
#define LABEL_DARKEN 0.3     /* branch labels: series colour to black */

static const double INK[3] = {0.10, 0.10, 0.10};

/* ---- Contours -------------------------------------------------------- */

typedef struct collect {
    const dk_plot *p;
    plot_layout *L;
    int level;
    int oom;
} collect;

static void
collect_polyline(const double *gx, const double *gy, int n, int closed,
                 void *ctx)
{
    (void)closed;
    collect *c = ctx;
    plot_layout *L = c->L;
    const plot_map *m = c->p->map;
    if (c->oom)
        return;
    if (L->ncontours == L->capcontours) {
        int cap = L->capcontours ? 2 * L->capcontours : 16;
        plot_polyline *pl = realloc(L->contours, (size_t)cap * sizeof *pl);
        if (!pl) {
            c->oom = 1;
            return;
        }
        L->contours = pl;
        L->capcontours = cap;
    }
    plot_polyline *pl = &L->contours[L->ncontours];
    pl->x = malloc((size_t)n * sizeof *pl->x);
    pl->y = malloc((size_t)n * sizeof *pl->y);
    if (!pl->x || !pl->y) {
        free(pl->x);
        free(pl->y);
        c->oom = 1;
        return;
    }
    for (int i = 0; i < n; i++) {
        double x = m->x0 + gx[i] * (m->x1 - m->x0) / (m->nx - 1);
        double y = m->y0 + gy[i] * (m->y1 - m->y0) / (m->ny - 1);
        pl->x[i] = plot_x_pt(L, x);
        pl->y[i] = plot_y_pt(L, y);
    }
    pl->n = n;
    pl->level = c->level;
    L->ncontours++;
}

int
plot_place_contours(const dk_plot *p, plot_layout *L)
{
    const plot_map *m = p->map;
    if (!m)
        return 0;
    for (int k = 0; k < p->ncontours; k++) {
        collect c = {p, L, k, 0};
        if (plot_contour_trace(m->z, m->nx, m->ny, p->contours[k].level,
                               collect_polyline, &c) ||
            c.oom)
            return -1;
    }
    return 0;
}

/* ---- Ink ------------------------------------------------------------- */

double
plot_ink_in(const dk_plot *p, const plot_layout *L, const double r[4])
{
    double box[4] = {r[0], r[1], r[0] + r[2], r[1] + r[3]}, score = 0;
    for (size_t k = 0; k < p->nseries; k++) {
        const plot_series *s = &p->series[k];
        double ax = NAN, ay = NAN;
        for (size_t i = 0; i < s->n; i++) {
            double bx = plot_x_pt(L, s->x[i]), by = plot_y_pt(L, s->y[i]);
            double cx = ax, cy = ay, dx = bx, dy = by;
            if (isfinite(cx) && isfinite(cy) && isfinite(dx) &&
                isfinite(dy) && plot_clip_segment(box, &cx, &cy, &dx, &dy))
                score += 1 + hypot(dx - cx, dy - cy);
            else if (i == 0 && isfinite(bx) && isfinite(by) &&
                     bx >= box[0] && bx <= box[2] && by >= box[1] &&
                     by <= box[3])
                score += 1; /* a lone first point */
            ax = bx, ay = by;
        }
    }
    for (int c = 0; c < L->ncontours; c++) {
        const plot_polyline *pl = &L->contours[c];
        for (int i = 1; i < pl->n; i++) {
            double ax = pl->x[i - 1], ay = pl->y[i - 1];
            double bx = pl->x[i], by = pl->y[i];
            if (plot_clip_segment(box, &ax, &ay, &bx, &by))
                score += 1 + hypot(bx - ax, by - ay);
        }
    }
    double rad = MARKER_R * L->f;
    for (size_t i = 0; i < p->nmarkers; i++) {
        double x = plot_x_pt(L, p->markers[i].x);
        double y = plot_y_pt(L, p->markers[i].y);
        if (x >= box[0] - rad && x <= box[2] + rad && y >= box[1] - rad &&
            y <= box[3] + rad)
            score += 1000;
    }
    return score;
}

static int
overlap(const double a[4], const double b[4])
{
    return a[0] < b[0] + b[2] && a[0] + a[2] > b[0] && a[1] < b[1] + b[3] &&
           a[1] + a[3] > b[1];
}

/* Texts already placed that box r touches. */
static int
texts_in(const plot_layout *L, const double r[4])
{
    int n = 0;
    for (int i = 0; i < L->ntexts; i++) {
        const plot_text *t = &L->texts[i];
        double b[4] = {t->x, t->y, t->w, t->h};
        n += overlap(b, r);
    }
    return n;
}

/* The fraction of box r covered by bands and shaded regions. */
static double
shade_in(const dk_plot *p, const plot_layout *L, const double r[4])
{
    double cover = 0, area = r[2] * r[3];
    for (size_t i = 0; i < p->nbands; i++) {
        double a = plot_x_pt(L, p->bands[i].x0);
        double b = plot_x_pt(L, p->bands[i].x1);
        double w = fmin(fmax(a, b), r[0] + r[2]) - fmax(fmin(a, b), r[0]);
        if (w > 0)
            cover += w * r[3];
    }
    for (size_t i = 0; i < p->nregions; i++) {
        const plot_region *g = &p->regions[i];
        double a, b, w;
        if (g->axis == DK_PLOT_X_AXIS) {
            a = plot_x_pt(L, fmax(g->lo, L->x.lo));
            b = plot_x_pt(L, fmin(g->hi, L->x.hi));
            w = fmin(fmax(a, b), r[0] + r[2]) - fmax(fmin(a, b), r[0]);
            if (w > 0)
                cover += w * r[3];
        } else {
            a = plot_y_pt(L, fmax(g->lo, L->y.lo));
            b = plot_y_pt(L, fmin(g->hi, L->y.hi));
            w = fmin(fmax(a, b), r[1] + r[3]) - fmax(fmin(a, b), r[1]);
            if (w > 0)
                cover += w * r[2];
        }
    }
    return area > 0 ? fmin(cover / area, 1) : 0;
}

static int
inside_axes(const plot_layout *L, const double r[4])
{
    return r[0] >= L->ax_x && r[0] + r[2] <= L->ax_x + L->ax_w &&
           r[1] >= L->ax_y && r[1] + r[3] <= L->ax_y + L->ax_h;
}

/* The cost of a label at r, with a clear margin around it. */
static double
label_cost(const dk_plot *p, const plot_layout *L, const double r[4],
           double *ink_out)
{
    double m = CLEAR * L->f;
    double grown[4] = {r[0] - m, r[1] - m, r[2] + 2 * m, r[3] + 2 * m};
    double ink = plot_ink_in(p, L, grown);
    if (ink_out)
        *ink_out = ink + TEXT_COST * texts_in(L, grown);
    return INK_COST * ink + TEXT_COST * texts_in(L, grown) +
           SHADE_COST * shade_in(p, L, r) +
           (inside_axes(L, r) ? 0 : OUTSIDE_COST);
}

/* ---- Marker labels --------------------------------------------------- */

static int
place_marker_labels(const dk_plot *p, PangoContext *ctx, plot_layout *L)
{
    double f = L->f, size = LEGEND_SIZE * f;
    static const double dist[3] = {0.55, 1.3, 2.4};
    /* Directions (dx, dy): right-above first, as text reads from the dot. */
    static const int dir[8][2] = {{1, -1}, {1, 1}, {-1, -1}, {-1, 1},
                                  {1, 0},  {-1, 0}, {0, -1}, {0, 1}};
    for (size_t i = 0; i < p->nmarkers; i++) {
        const plot_marker *mk = &p->markers[i];
        double x = plot_x_pt(L, mk->x), y = plot_y_pt(L, mk->y);
        if (!mk->label || !(x >= L->ax_x && x <= L->ax_x + L->ax_w &&
                            y >= L->ax_y && y <= L->ax_y + L->ax_h))
            continue;
        plot_text_metrics m;
        plot_text_measure(ctx, mk->label, size, &m);
        double best = INFINITY, bx = 0, by = 0;
        for (int d = 0; d < 3; d++)
            for (int k = 0; k < 8; k++) {
                double off = dist[d] * f;
                double rx = dir[k][0] > 0   ? x + off
                            : dir[k][0] < 0 ? x - off - m.w
                                            : x - m.w / 2;
                double ry = dir[k][1] < 0   ? y - off - m.h
                            : dir[k][1] > 0 ? y + off
                                            : y - m.h / 2;
                double r[4] = {rx, ry, m.w, m.h};
                double c = label_cost(p, L, r, NULL) + d + 0.01 * k;
                if (c < best) {
                    best = c;
                    bx = rx, by = ry;
                }
            }
        plot_text t = {.kind = PLOT_TEXT_MARKER, .markup = mk->label,
                       .size = size, .x = bx, .y = by, .w = m.w, .h = m.h,
                       .halo = 1, .rgb = {INK[0], INK[1], INK[2]}};
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    }
    return 0;
}

/* ---- Branch labels --------------------------------------------------- */

/* Points of piece @branch of series @s in page pt (finite, inside the
 * axes); their number. */
static size_t
branch_points(const plot_layout *L, const plot_series *s, int branch,
              double *px, double *py)
{
    int piece = 0, in_piece = 0;
    size_t n = 0;
    for (size_t i = 0; i < s->n; i++) {
        double x = plot_x_pt(L, s->x[i]), y = plot_y_pt(L, s->y[i]);
        if (!(isfinite(x) && isfinite(y))) {
            if (in_piece)
                piece++;
            in_piece = 0;
            continue;
        }
        in_piece = 1;
        if (piece == branch && x >= L->ax_x && x <= L->ax_x + L->ax_w &&
            y >= L->ax_y && y <= L->ax_y + L->ax_h) {
            px[n] = x;
            py[n++] = y;
        }
    }
    return n;
}

static int
place_branch_labels(const dk_plot *p, PangoContext *ctx, plot_layout *L)
{
    double f = L->f, size = LEGEND_SIZE * f;
    static const double along[] = {0.5, 0.35, 0.65, 0.2, 0.8, 0.1, 0.9};
    for (size_t b = 0; b < p->nbranches; b++) {
        const plot_branch_label *bl = &p->branches[b];
        if (bl->series >= p->nseries)
            continue;
        const plot_series *s = &p->series[bl->series];
        double *px = malloc(s->n * sizeof *px), *py = malloc(s->n * sizeof *py);
        if (!px || !py) {
            free(px);
            free(py);
            return -1;
        }
        size_t n = branch_points(L, s, bl->branch, px, py);
        if (n == 0) {
            free(px);
            free(py);
            continue;
        }
        plot_text_metrics m;
        plot_text_measure(ctx, bl->label, size, &m);
        double best = INFINITY, bx = 0, by = 0;
        static const double dist[2] = {0.35, 1.0};
        static const int dir[8][2] = {{0, -1}, {0, 1},  {1, 0},  {-1, 0},
                                      {1, -1}, {-1, -1}, {1, 1}, {-1, 1}};
        for (size_t a = 0; a < sizeof along / sizeof along[0]; a++) {
            size_t i = (size_t)lround(along[a] * (double)(n - 1));
            double x = px[i], y = py[i];
            for (int dd = 0; dd < 2; dd++)
                for (int k = 0; k < 8; k++) {
                    double o = dist[dd] * f;
                    double r[4] = {dir[k][0] > 0   ? x + o
                                   : dir[k][0] < 0 ? x - o - m.w
                                                   : x - m.w / 2,
                                   dir[k][1] < 0   ? y - o - m.h
                                   : dir[k][1] > 0 ? y + o
                                                   : y - m.h / 2,
                                   m.w, m.h};
                    double c = label_cost(p, L, r, NULL) +
                               0.1 * (double)a + 0.5 * dd + 0.01 * k;
                    if (c < best) {
                        best = c;
                        bx = r[0], by = r[1];
                    }
                }
        }
        free(px);
        free(py);
        plot_style st;
        plot_series_style(bl->series, &st);
        plot_text t = {.kind = PLOT_TEXT_BRANCH, .markup = bl->label,
                       .size = size, .x = bx, .y = by, .w = m.w, .h = m.h,
                       .halo = 1};
        for (int c = 0; c < 3; c++)
            t.rgb[c] = (1 - LABEL_DARKEN) * st.rgb[c];
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    }
    return 0;
}

/* ---- Legend ---------------------------------------------------------- */

static int
add_item(plot_layout *L, int kind, size_t index, const char *markup)
{
    plot_legend_item *a = realloc(L->items, (size_t)(L->nitems + 1) *
                                                sizeof *a);
    if (!a)
        return -1;
    L->items = a;
    L->items[L->nitems++] = (plot_legend_item){kind, index, markup};
    return 0;
}

int
plot_place_legend_items(const dk_plot *p, PangoContext *ctx, plot_layout *L,
                        double *w, double *h)
{
    *w = *h = 0;
    free(L->items);
    L->items = NULL;
    L->nitems = 0;
    L->any_outside_fit = 0;
    L->map_flags = 0;
    for (size_t i = 0; i < p->nseries; i++) {
        const plot_series *s = &p->series[i];
        for (size_t k = 0; s->flags && k < s->n; k++)
            if (s->flags[k] & DK_PLOT_FLAG_OUTSIDE_FIT)
                L->any_outside_fit = 1;
    }
    if (p->map) {
        const plot_map *m = p->map;
        for (long k = 0; k < (long)m->nx * m->ny; k++) {
            if (m->flags)
                L->map_flags |= m->flags[k] & (DK_PLOT_FLAG_OUTSIDE_FIT |
                                               DK_PLOT_FLAG_NOT_TRANSPARENT);
            if (!isfinite(m->z[k]))
                L->map_flags |= PLOT_MAP_BLANK;
        }
    }
    if (p->legend == DK_PLOT_LEGEND_NONE)
        return 0;
    int rc = 0;
    for (size_t i = 0; i < p->nseries && !rc; i++)
        if (p->series[i].label)
            rc = add_item(L, PLOT_ITEM_SERIES, i, p->series[i].label);
    if (L->any_outside_fit && !rc)
        rc = add_item(L, PLOT_ITEM_OUTSIDE_FIT, 0,
                      "outside the data set's fitted range");
    for (size_t i = 0; i < p->nbands && !rc; i++)
        if (p->bands[i].label)
            rc = add_item(L, PLOT_ITEM_BAND, i, p->bands[i].label);
    for (size_t i = 0; i < p->nregions && !rc; i++)
        if (p->regions[i].label)
            rc = add_item(L, PLOT_ITEM_REGION, i, p->regions[i].label);
    if (p->map) {
        for (int i = 0; i < p->ncontours && !rc; i++)
            if (p->contours[i].label)
                rc = add_item(L, PLOT_ITEM_CONTOUR, (size_t)i,
                              p->contours[i].label);
        if (!rc && (L->map_flags & DK_PLOT_FLAG_OUTSIDE_FIT))
            rc = add_item(L, PLOT_ITEM_MAP_OUTSIDE_FIT, 0,
                          "outside the data set's fitted range");
        if (!rc && (L->map_flags & DK_PLOT_FLAG_NOT_TRANSPARENT))
            rc = add_item(L, PLOT_ITEM_MAP_OPAQUE, 0, "not transparent");
        if (!rc && (L->map_flags & PLOT_MAP_BLANK) && p->map->blank_label)
            rc = add_item(L, PLOT_ITEM_MAP_BLANK, 0, p->map->blank_label);
    }
    if (rc)
        return -1;
    if (L->nitems == 0)
        return 0;
    double f = p->font_pt, size = LEGEND_SIZE * f, tw = 0;
    for (int i = 0; i < L->nitems; i++) {
        double iw, ih;
        plot_text_size(ctx, L->items[i].markup, size, &iw, &ih);
        tw = fmax(tw, iw);
    }
    L->legend_size = size;
    L->legend_pad = LEGEND_PAD * f;
    L->legend_row = LEGEND_ROW * size;
    *w = 2 * L->legend_pad + LEGEND_SAMPLE * f + LEGEND_GAP * f + tw;
    *h = 2 * L->legend_pad + L->legend_row * L->nitems -
         (L->legend_row - PLOT_CAP_HEIGHT * size) + 0.1 * f;
    L->legend_box[2] = *w;
    L->legend_box[3] = *h;
    return 0;
}

/* The legend's texts at box (x, y). */
static int
legend_texts(PangoContext *ctx, plot_layout *L, double x, double y)
{
    double f = L->f, size = L->legend_size;
    for (int i = 0; i < L->nitems; i++) {
        double capmid = y + L->legend_pad + L->legend_row * i +
                        PLOT_CAP_HEIGHT * size / 2;
        plot_text_metrics m;
        plot_text_measure(ctx, L->items[i].markup, size, &m);
        plot_text t = {.kind = PLOT_TEXT_LEGEND,
                       .markup = L->items[i].markup, .size = size,
                       .x = x + L->legend_pad + (LEGEND_SAMPLE + LEGEND_GAP) * f,
                       .y = capmid - (m.base - PLOT_CAP_HEIGHT * size / 2),
                       .w = m.w, .h = m.h,
                       .rgb = {INK[0], INK[1], INK[2]}};
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    }
    return 0;
}

static int
place_legend(const dk_plot *p, PangoContext *ctx, plot_layout *L,
             int allow_outside)
{
    L->legend_where = PLOT_LEGEND_HIDDEN;
    if (L->nitems == 0 || p->legend == DK_PLOT_LEGEND_NONE)
        return 0;
    double f = L->f, w = L->legend_box[2], h = L->legend_box[3];
    if (L->reserve_right > 0 || L->reserve_bottom > 0) {
        /* Outside: on the right, level with the top of the axes; or
         * below, centred under the axes and kept on the page. */
        double x = L->page_w - 0.5 * f - w, y = L->ax_y;
        if (L->reserve_bottom > 0) {
            y = L->page_h - 0.5 * f - h - L->foot_h;
            x = fmin(fmax(L->ax_x + (L->ax_w - w) / 2, 0.5 * f),
                     L->page_w - 0.5 * f - w);
        }
        if (y + h > L->page_h)
            return 0;
        L->legend_where = PLOT_LEGEND_OUTSIDE;
        L->legend_box[0] = x, L->legend_box[1] = y;
        L->legend_backing = 0;
        return legend_texts(ctx, L, x, y);
    }
    double inset = (LEGEND_INSET + TICK_MAJOR) * f;
    double left = L->ax_x + inset, right = L->ax_x + L->ax_w - inset - w;
    double top = L->ax_y + inset, bottom = L->ax_y + L->ax_h - inset - h;
    if (right < left || bottom < top)
        return allow_outside ? 1 : 0; /* no room inside */
    /* Candidates: corners; along top and bottom; along the sides;
     * inside. */
    double fx[5] = {1, 0, 0.5, 0.75, 0.25}, fy[5] = {0, 1, 0.5, 0.25, 0.75};
    double cand[25][2];
    int nc = 0;
    for (int j = 0; j < 2; j++)
        for (int i = 0; i < 2; i++)
            cand[nc][0] = left + fx[i] * (right - left),
            cand[nc++][1] = top + fy[j] * (bottom - top);
    for (int j = 0; j < 2; j++)
        for (int i = 2; i < 5; i++)
            cand[nc][0] = left + fx[i] * (right - left),
            cand[nc++][1] = top + fy[j] * (bottom - top);
    for (int j = 2; j < 5; j++)
        for (int i = 0; i < 2; i++)
            cand[nc][0] = left + fx[i] * (right - left),
            cand[nc++][1] = top + fy[j] * (bottom - top);
    for (int j = 2; j < 5; j++)
        for (int i = 2; i < 5; i++)
            cand[nc][0] = left + fx[i] * (right - left),
            cand[nc++][1] = top + fy[j] * (bottom - top);
    int pick = 0;
    switch (p->legend) {
    case DK_PLOT_LEGEND_UPPER_RIGHT: pick = 0; break;
    case DK_PLOT_LEGEND_UPPER_LEFT: pick = 1; break;
    case DK_PLOT_LEGEND_LOWER_RIGHT: pick = 2; break;
    case DK_PLOT_LEGEND_LOWER_LEFT: pick = 3; break;
    default: {
        double best = INFINITY;
        for (int c = 0; c < nc; c++) {
            double r[4] = {cand[c][0], cand[c][1], w, h};
            double s = label_cost(p, L, r, NULL) + 0.5 * c;
            if (s < best) {
                best = s;
                pick = c;
            }
        }
    }
    }
    double r[4] = {cand[pick][0], cand[pick][1], w, h}, ink;
    label_cost(p, L, r, &ink);
    if (p->legend == DK_PLOT_LEGEND_AUTO && ink > 0 && allow_outside)
        return 1;
    L->legend_where = PLOT_LEGEND_INSIDE;
    L->legend_box[0] = r[0], L->legend_box[1] = r[1];
    L->legend_backing = p->map != NULL || ink > 0;
    return legend_texts(ctx, L, r[0], r[1]);
}

int
plot_place_labels(const dk_plot *p, PangoContext *ctx, plot_layout *L,
                  int allow_outside)
{
    if (place_marker_labels(p, ctx, L) || place_branch_labels(p, ctx, L))
        return -1;
    return place_legend(p, ctx, L, allow_outside);
}
