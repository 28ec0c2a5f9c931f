/*
 * plot_layout.c - ranges, ticks and the axes box of a figure, worked out
 * before anything is drawn.
 *
 * Ranges: a set range wins; otherwise x is the extent of the map, or of
 * the data (series, markers, bands) edge to edge; y is the extent of the
 * map, or of the data inside the x range widened by 4 % at each end so
 * that curves do not run along the frame. A flat extent is widened to
 * ±5 % of its value (±0.5 at zero).
 *
 * Over a map, ticks point outwards (inward ticks vanish on dark data,
 * common practice for images), and the tick labels move out by a tick.
 *
 * Ticks: the most 1-2-5 ticks whose labels keep at least about one em
 * apart (x) or 2.6 em apart (y), at most 10; the top axis likewise at
 * nice values of the secondary quantity, spaced as they fall.
 *
 * The box: the page less an outer pad, the tick labels and the axis
 * labels (measured with pango in pt), and on the right the colour bar
 * with its labels. Ticks and box depend on each other through the label
 * sizes, so the two are iterated three times (labels change by whole
 * ticks, so this settles). All lengths are multiples of the type size f.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "plot_internal.h"

#define PAD 0.5            /* outer padding, em */
#define TICK_GAP 0.45      /* tick label to frame (or tick end), em */
#define TICK_MAJOR 0.45    /* tick length, em (as plot_draw.c) */
#define LABEL_GAP 0.5      /* axis label to tick labels, em */
#define X_LABEL_SPACE 1.0  /* between neighbouring x tick labels, em */
#define Y_TICK_SPACE 2.6   /* between y ticks, em */
#define MAX_AXIS_TICKS 10
#define Y_PAD 0.04         /* automatic y range widening, each end */
#define CB_GAP 0.9         /* axes to colour bar, em */
#define CB_W 0.9           /* colour bar width, em */
#define TOP_SAMPLES 64     /* monotonicity check of the top transform */
#define LAYOUT_PASSES 3
#define OFFSET_ABOVE 1e5   /* y and colour-bar labels in units of 10^k */
#define OFFSET_BELOW 1e-3  /* from these magnitudes on */
#define MULT_GAP 0.3       /* "×10^k" above the frame, em */

double
plot_x_pt(const plot_layout *L, double x)
{
    return L->ax_x + (x - L->x.lo) / (L->x.hi - L->x.lo) * L->ax_w;
}

double
plot_y_pt(const plot_layout *L, double y)
{
    return L->ax_y + (L->y.hi - y) / (L->y.hi - L->y.lo) * L->ax_h;
}

/* Widen a flat extent. */
static void
unflatten(double *lo, double *hi)
{
    if (*hi > *lo)
        return;
    double d = *lo == 0 ? 0.5 : 0.05 * fabs(*lo);
    *lo -= d;
    *hi += d;
}

static void
extend(double *lo, double *hi, double v)
{
    if (!isfinite(v))
        return;
    if (v < *lo)
        *lo = v;
    if (v > *hi)
        *hi = v;
}

static dk_status
ranges(const dk_plot *p, plot_layout *L, dk_error *err)
{
    double xlo = p->xlo, xhi = p->xhi, ylo = p->ylo, yhi = p->yhi;
    const plot_map *m = p->map;
    if (isnan(xlo)) {
        xlo = INFINITY, xhi = -INFINITY;
        if (m) {
            xlo = fmin(m->x0, m->x1), xhi = fmax(m->x0, m->x1);
        } else {
            for (size_t s = 0; s < p->nseries; s++)
                for (size_t i = 0; i < p->series[s].n; i++)
                    if (isfinite(p->series[s].y[i]))
                        extend(&xlo, &xhi, p->series[s].x[i]);
            for (size_t i = 0; i < p->nmarkers; i++)
                extend(&xlo, &xhi, p->markers[i].x);
            for (size_t i = 0; i < p->nbands; i++) {
                extend(&xlo, &xhi, p->bands[i].x0);
                extend(&xlo, &xhi, p->bands[i].x1);
            }
        }
        if (xlo > xhi)
            return dk_error_set(err, DK_EINVAL,
                                "nothing to plot: no data and no x range");
        unflatten(&xlo, &xhi);
    }
    if (isnan(ylo)) {
        ylo = INFINITY, yhi = -INFINITY;
        if (m) {
            ylo = fmin(m->y0, m->y1), yhi = fmax(m->y0, m->y1);
        } else {
            for (size_t s = 0; s < p->nseries; s++)
                for (size_t i = 0; i < p->series[s].n; i++) {
                    double x = p->series[s].x[i];
                    if (x >= xlo && x <= xhi)
                        extend(&ylo, &yhi, p->series[s].y[i]);
                }
            for (size_t i = 0; i < p->nmarkers; i++)
                if (p->markers[i].x >= xlo && p->markers[i].x <= xhi)
                    extend(&ylo, &yhi, p->markers[i].y);
            if (ylo > yhi) {
                if (p->nseries || p->nmarkers || p->nbands)
                    ylo = 0, yhi = 1; /* bands only, or data out of x range */
                else
                    return dk_error_set(err, DK_EINVAL,
                                        "nothing to plot: no data and no y "
                                        "range");
            } else {
                unflatten(&ylo, &yhi);
                double pad = Y_PAD * (yhi - ylo);
                ylo -= pad;
                yhi += pad;
            }
        }
    }
    L->x.lo = xlo, L->x.hi = xhi;
    L->y.lo = ylo, L->y.hi = yhi;
    if (m) {
        double zlo = p->zlo, zhi = p->zhi;
        if (isnan(zlo)) {
            zlo = INFINITY, zhi = -INFINITY;
            for (long i = 0; i < (long)m->nx * m->ny; i++)
                extend(&zlo, &zhi, m->z[i]);
            unflatten(&zlo, &zhi);
        }
        L->zlo = L->z.lo = zlo;
        L->zhi = L->z.hi = zhi;
        L->has_map = 1;
    }
    return DK_OK;
}

/* Ticks of @a with at most @max, their labels and label sizes. With
 * @offset (the y axis and the colour bar), ticks of magnitude ≥ 1e5 or
 * < 1e-3 are labelled in units of a common power of ten, shown once as
 * "×10^k" at the end of the axis, instead of as long numbers. */
static dk_status
axis_ticks(PangoContext *ctx, plot_axis *a, int max, double f, int offset,
           dk_error *err)
{
    dk_status s = dk_plot_nice_ticks(a->lo, a->hi, max, a->ticks, &a->nticks,
                                     &a->step, err);
    if (s)
        return s;
    double big = 0;
    for (int i = 0; i < a->nticks; i++)
        big = fmax(big, fabs(a->ticks[i]));
    a->exp10 = 0;
    a->mult[0] = '\0';
    a->mult_w = a->mult_h = 0;
    if (offset && big > 0 && (big >= OFFSET_ABOVE || big < OFFSET_BELOW)) {
        a->exp10 = (int)floor(log10(big) + 1e-9);
        snprintf(a->mult, sizeof a->mult, "\xc3\x97" "10<sup>%s%d</sup>",
                 a->exp10 < 0 ? "\xe2\x88\x92" : "", abs(a->exp10));
        plot_text_size(ctx, a->mult, f, &a->mult_w, &a->mult_h);
    }
    double unit = pow(10, a->exp10);
    a->label_w = a->label_h = 0;
    for (int i = 0; i < a->nticks; i++) {
        double w, h;
        plot_tick_label(a->ticks[i] / unit, a->step / unit, a->labels[i],
                        sizeof a->labels[i]);
        plot_text_size(ctx, a->labels[i], f, &w, &h);
        a->label_w = fmax(a->label_w, w);
        a->label_h = fmax(a->label_h, h);
    }
    return DK_OK;
}

static int
clampi(int v, int lo, int hi)
{
    return v < lo ? lo : v > hi ? hi : v;
}

/* Bottom axis: fewer ticks until neighbouring labels keep apart. */
static dk_status
x_ticks(PangoContext *ctx, plot_layout *L, dk_error *err)
{
    double f = L->f;
    for (int max = MAX_AXIS_TICKS; max >= 2; max--) {
        dk_status s = axis_ticks(ctx, &L->x, max, f, 0, err);
        if (s)
            return s;
        double pitch = L->x.step / (L->x.hi - L->x.lo) * L->ax_w;
        if (pitch >= L->x.label_w + X_LABEL_SPACE * f)
            break;
    }
    return DK_OK;
}

/* Top axis: nice values of the secondary quantity, checked for spacing
 * where they fall on the primary axis. */
static dk_status
top_ticks(const dk_plot *p, PangoContext *ctx, plot_layout *L,
          dk_error *err)
{
    double f = L->f;
    for (int max = MAX_AXIS_TICKS; max >= 2; max--) {
        dk_status s = axis_ticks(ctx, &L->top, max, f, 0, err);
        if (s)
            return s;
        double minpitch = INFINITY;
        for (int i = 1; i < L->top.nticks; i++) {
            double a = p->from_top(L->top.ticks[i - 1], p->top_params);
            double b = p->from_top(L->top.ticks[i], p->top_params);
            minpitch = fmin(minpitch, fabs(plot_x_pt(L, b) - plot_x_pt(L, a)));
        }
        if (minpitch >= L->top.label_w + X_LABEL_SPACE * f)
            break;
    }
    return DK_OK;
}

/* The secondary range, or DK_EDOM when the transform is not finite and
 * strictly monotonic over the x range. */
static dk_status
top_range(const dk_plot *p, plot_layout *L, dk_error *err)
{
    double prev = NAN;
    int dir = 0;
    for (int k = 0; k <= TOP_SAMPLES; k++) {
        double x = L->x.lo + (L->x.hi - L->x.lo) * k / TOP_SAMPLES;
        double v = p->to_top(x, p->top_params);
        if (!isfinite(v))
            return dk_error_set(err, DK_EDOM,
                                "top axis transform is not finite at "
                                "x = %g",
                                x);
        if (k > 0) {
            int d = v > prev ? 1 : v < prev ? -1 : 0;
            if (d == 0 || (dir && d != dir))
                return dk_error_set(err, DK_EDOM,
                                    "top axis transform is not strictly "
                                    "monotonic over x %g..%g",
                                    L->x.lo, L->x.hi);
            dir = d;
        }
        prev = v;
    }
    double a = p->to_top(L->x.lo, p->top_params);
    double b = p->to_top(L->x.hi, p->top_params);
    L->top.lo = fmin(a, b);
    L->top.hi = fmax(a, b);
    L->has_top = 1;
    return DK_OK;
}

static void
label_size(PangoContext *ctx, const char *markup, double f, double *w,
           double *h)
{
    *w = *h = 0;
    if (markup)
        plot_text_size(ctx, markup, f, w, h);
}

static dk_status
place(const dk_plot *p, PangoContext *ctx, plot_layout *L, dk_error *err)
{
    double f = L->f, gap = L->tick_gap;
    double xl_w, xl_h, yl_w, yl_h, tl_w, tl_h, zl_w, zl_h;
    label_size(ctx, p->xlabel, f, &xl_w, &xl_h);
    label_size(ctx, p->ylabel, f, &yl_w, &yl_h);
    label_size(ctx, p->toplabel, f, &tl_w, &tl_h);
    label_size(ctx, p->map ? p->map->label : NULL, f, &zl_w, &zl_h);

    /* A first guess of the box, then settle ticks and margins. */
    L->ax_x = 6 * f;
    L->ax_y = (L->has_top ? 4 : 1) * f;
    L->ax_w = L->page_w - L->ax_x - (L->has_map ? 8 : 1.5) * f;
    L->ax_h = L->page_h - L->ax_y - 4 * f;
    for (int pass = 0; pass < LAYOUT_PASSES; pass++) {
        if (L->ax_w < 3 * f || L->ax_h < 3 * f)
            break;
        dk_status s = x_ticks(ctx, L, err);
        if (!s)
            s = axis_ticks(ctx, &L->y, clampi((int)(L->ax_h / (Y_TICK_SPACE
                                                                * f)) + 1,
                                              2, MAX_AXIS_TICKS),
                           f, 1, err);
        if (!s && L->has_top)
            s = top_ticks(p, ctx, L, err);
        if (!s && L->has_map)
            s = axis_ticks(ctx, &L->z, clampi((int)(L->ax_h / (Y_TICK_SPACE
                                                                * f)) + 1,
                                              2, MAX_AXIS_TICKS),
                           f, 1, err);
        if (s)
            return s;

        double left = PAD * f + (yl_h > 0 ? yl_h + LABEL_GAP * f : 0) +
                      L->y.label_w + gap;
        double bottom = PAD * f + (xl_h > 0 ? xl_h + LABEL_GAP * f : 0) +
                        L->x.label_h + gap;
        double top = PAD * f + 0.5 * L->y.label_h;
        double mult_h = fmax(L->y.mult_h, L->has_map ? L->z.mult_h : 0);
        if (mult_h > 0)
            top = fmax(top, PAD * f + mult_h + MULT_GAP * f);
        if (L->has_top)
            top = PAD * f + (tl_h > 0 ? tl_h + LABEL_GAP * f : 0) +
                  L->top.label_h + gap;
        double right = PAD * f + 0.5 * L->x.label_w;
        if (L->has_map)
            right = PAD * f + CB_GAP * f + CB_W * f + TICK_GAP * f +
                    L->z.label_w + (zl_h > 0 ? LABEL_GAP * f + zl_h : 0);
        left = fmax(left, PAD * f + 0.5 * L->x.label_w);
        L->ax_x = left;
        L->ax_y = top;
        L->ax_w = L->page_w - left - right;
        L->ax_h = L->page_h - top - bottom;
    }
    if (L->ax_w < 3 * f || L->ax_h < 3 * f)
        return dk_error_set(err, DK_EINVAL,
                            "figure %g x %g mm is too small for its labels "
                            "at %g pt type",
                            p->width_mm, p->height_mm, f);
    if (L->has_map) {
        L->cb_x = L->ax_x + L->ax_w + CB_GAP * f;
        L->cb_w = CB_W * f;
    }
    return DK_OK;
}

dk_status
plot_layout_compute(const dk_plot *p, plot_layout *L, dk_error *err)
{
    memset(L, 0, sizeof *L);
    L->page_w = p->width_mm * PLOT_PT_PER_MM;
    L->page_h = p->height_mm * PLOT_PT_PER_MM;
    L->f = p->font_pt;
    L->ticks_out = p->map != NULL;
    L->tick_gap = (TICK_GAP + (L->ticks_out ? TICK_MAJOR : 0)) * L->f;
    dk_status s = ranges(p, L, err);
    if (s)
        return s;
    if (p->to_top && (s = top_range(p, L, err)))
        return s;

    cairo_surface_t *surf = cairo_image_surface_create(CAIRO_FORMAT_ARGB32,
                                                       1, 1);
    cairo_t *cr = cairo_create(surf);
    PangoContext *ctx = NULL;
    if (cairo_status(cr) == CAIRO_STATUS_SUCCESS)
        ctx = plot_text_context(cr);
    if (!ctx)
        s = dk_error_set(err, DK_ENOMEM, "cannot measure text: out of "
                         "memory");
    else
        s = place(p, ctx, L, err);
    if (ctx)
        g_object_unref(ctx);
    cairo_destroy(cr);
    cairo_surface_destroy(surf);
    return s;
}
