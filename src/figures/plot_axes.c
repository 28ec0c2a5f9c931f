/*
 * plot_axes.c - ranges, ticks, the axes box and every text of the axes,
 * the colour bar and the title, worked out before anything is drawn.
 *
 * Ranges: a set range wins; otherwise x is the extent of the map, or of
 * the data (series, markers, bands) edge to edge, widened by 4 % at an
 * end where a curve runs steeply into it (the turning point of a tuning
 * curve stays clear of the frame); y is the extent of the map, or of the
 * data inside the x range widened by 4 % at each end so that curves do
 * not run along the frame. A flat extent is widened to ±5 % of its value
 * (±0.5 at zero). Logarithmic axes do all this on log10 of the positive
 * values. Shaded regions never widen a range.
 *
 * Over a map, ticks point outwards (inward ticks vanish on dark data,
 * common practice for images), and the tick labels move out by a tick.
 *
 * Ticks: the most 1-2-5 ticks whose labels keep at least one em apart (x
 * and the top axis, measured between the labels as they fall) or 2.6 em
 * apart (y), at most 10. A label that would still touch its neighbour or
 * leave the page is left out (its tick stays).
 *
 * Values of magnitude ≥ 1e5 or < 1e-3 on the y axis and the colour bar
 * are labelled in units of 10^k; "(×10^k)" then ends the axis label
 * (common practice), or, for an axis without a label, stands above its
 * end.
 *
 * Type: the axis labels and the title keep the figure's type size unless
 * they are longer than the page allows; then that label alone is set
 * smaller to fit (down to half size), so that no text is cut by the page
 * edge. The title is 1.15 times the type size.
 *
 * Footnotes (dk_plot_add_note) are set at FOOT_SIZE at the bottom left,
 * joined by "; " and broken between notes where the width runs out (a
 * note wider than the page alone is set smaller, as a long label).
 *
 * The box: the page less an outer pad, the title, the tick labels, the
 * axis labels, the colour bar with its labels, the footnote, and room
 * for a legend outside (on the right or below) when one is asked for. Ticks and box depend on
 * each other through the label sizes, so the two are iterated (labels
 * change by whole ticks, so this settles). All lengths are multiples of
 * the type size f.
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
#define MIN_LABEL_SPACE 0.4 /* below this a tick label is left out, em */
#define EDGE_SPACE 0.25    /* nor may it come closer to the page edge, em */
#define Y_TICK_SPACE 2.6   /* between y ticks, em */
#define MAX_AXIS_TICKS 10
#define RANGE_PAD 0.04     /* automatic range widening, each end */
#define STEEP 3.0          /* slope (axis fractions) that counts as steep */
#define CB_GAP 0.9         /* axes to colour bar, em */
#define CB_W 0.9           /* colour bar width, em */
#define TOP_SAMPLES 64     /* monotonicity check of the top transform */
#define LAYOUT_PASSES 4
#define OFFSET_ABOVE 1e5   /* y and colour-bar labels in units of 10^k */
#define OFFSET_BELOW 1e-3  /* from these magnitudes on */
#define MULT_GAP 0.3       /* "×10^k" above the frame, em */
#define TITLE_SIZE 1.15    /* title type, em */
#define TITLE_GAP 0.6      /* title to what is below it, em */
#define MIN_SHRINK 0.5     /* smallest size a long label is set at */
#define FOOT_SIZE 0.8      /* footnote type, em */
#define FOOT_ROW 1.2       /* footnote line pitch, in its type size */
#define FOOT_GAP 0.4       /* what is above to the footnote, em */

static const double INK[3] = {0.10, 0.10, 0.10};

/* ---- Ranges ------------------------------------------------------------ */

/* Widen a flat extent. */
static void
unflatten(double *lo, double *hi, int log)
{
    if (*hi > *lo)
        return;
    if (log) {
        *lo /= 1.5;
        *hi *= 1.5;
        return;
    }
    double d = *lo == 0 ? 0.5 : 0.05 * fabs(*lo);
    *lo -= d;
    *hi += d;
}

static void
extend(double *lo, double *hi, double v, int log)
{
    if (!isfinite(v) || (log && !(v > 0)))
        return;
    if (v < *lo)
        *lo = v;
    if (v > *hi)
        *hi = v;
}

/* Widen [lo, hi] by @frac of its length at the chosen ends. */
static void
widen(double *lo, double *hi, double frac_lo, double frac_hi, int log)
{
    if (log) {
        double r = log10(*hi / *lo);
        *lo /= pow(10, frac_lo * r);
        *hi *= pow(10, frac_hi * r);
        return;
    }
    double d = *hi - *lo;
    *lo -= frac_lo * d;
    *hi += frac_hi * d;
}

static double
frac(double v, double lo, double hi, int log)
{
    return log ? (log10(v) - log10(lo)) / (log10(hi) - log10(lo))
               : (v - lo) / (hi - lo);
}

/* Whether a curve turns or runs steeply (in axis fractions) at x = @end:
 * a point there with finite neighbours on both sides (a turning point),
 * two branches of one series ending there (the two halves of a turning
 * curve), or a last segment steeper than STEEP. */
static int
steep_at(const dk_plot *p, double end, double xlo, double xhi, double ylo,
         double yhi)
{
    double tol = 1e-9 * (xhi - xlo);
    if (!(yhi > ylo))
        return 0;
    for (size_t s = 0; s < p->nseries; s++) {
        const plot_series *S = &p->series[s];
        int ends = 0;
        for (size_t i = 0; i < S->n; i++) {
            if (!(fabs(S->x[i] - end) <= tol) || !isfinite(S->y[i]))
                continue;
            int finite_nb = 0;
            for (int d = -1; d <= 1; d += 2) {
                if ((d < 0 && i == 0) || (d > 0 && i + 1 >= S->n))
                    continue;
                size_t j = i + (size_t)(long)d;
                if (!isfinite(S->x[j]) || !isfinite(S->y[j]))
                    continue;
                finite_nb++;
                double dx = fabs(frac(S->x[j], xlo, xhi, p->xlog) -
                                 frac(S->x[i], xlo, xhi, p->xlog));
                double dy = fabs(frac(S->y[j], ylo, yhi, p->ylog) -
                                 frac(S->y[i], ylo, yhi, p->ylog));
                if (dy > STEEP * dx && dy > 0)
                    return 1;
            }
            if (finite_nb == 2)
                return 1;
            ends += finite_nb == 1;
        }
        if (ends >= 2)
            return 1;
    }
    return 0;
}

static dk_status
ranges(const dk_plot *p, plot_layout *L, dk_error *err)
{
    double xlo = p->xlo, xhi = p->xhi, ylo = p->ylo, yhi = p->yhi;
    const plot_map *m = p->map;
    if ((p->xlog && !isnan(xlo) && !(xlo > 0)) ||
        (p->ylog && !isnan(ylo) && !(ylo > 0)))
        return dk_error_set(err, DK_EINVAL,
                            "a logarithmic axis needs a range above zero "
                            "(set the range or a linear axis)");
    if (isnan(xlo)) {
        xlo = INFINITY, xhi = -INFINITY;
        if (m) {
            extend(&xlo, &xhi, m->x0, p->xlog);
            extend(&xlo, &xhi, m->x1, p->xlog);
        } else {
            for (size_t s = 0; s < p->nseries; s++)
                for (size_t i = 0; i < p->series[s].n; i++)
                    if (isfinite(p->series[s].y[i]) &&
                        (!p->ylog || p->series[s].y[i] > 0))
                        extend(&xlo, &xhi, p->series[s].x[i], p->xlog);
            for (size_t i = 0; i < p->nmarkers; i++)
                extend(&xlo, &xhi, p->markers[i].x, p->xlog);
            for (size_t i = 0; i < p->nbands; i++) {
                extend(&xlo, &xhi, p->bands[i].x0, p->xlog);
                extend(&xlo, &xhi, p->bands[i].x1, p->xlog);
            }
        }
        if (xlo > xhi)
            return dk_error_set(err, DK_EINVAL,
                                p->xlog || p->ylog
                                    ? "nothing to plot: no data above zero "
                                      "for the logarithmic axis"
                                        : "nothing to plot: no data and no "
                                          "x range");
        unflatten(&xlo, &xhi, p->xlog);
        if (!m) {
            double a = INFINITY, b = -INFINITY;
            for (size_t s = 0; s < p->nseries; s++)
                for (size_t i = 0; i < p->series[s].n; i++)
                    if (isfinite(p->series[s].x[i]))
                        extend(&a, &b, p->series[s].y[i], p->ylog);
            double wl = steep_at(p, xlo, xlo, xhi, a, b) ? RANGE_PAD : 0;
            double wh = steep_at(p, xhi, xlo, xhi, a, b) ? RANGE_PAD : 0;
            widen(&xlo, &xhi, wl, wh, p->xlog);
        }
    }
    if (isnan(ylo)) {
        ylo = INFINITY, yhi = -INFINITY;
        if (m) {
            extend(&ylo, &yhi, m->y0, p->ylog);
            extend(&ylo, &yhi, m->y1, p->ylog);
            if (ylo > yhi)
                return dk_error_set(err, DK_EINVAL,
                                    "the map lies below zero on the "
                                    "logarithmic y axis");
        } else {
            for (size_t s = 0; s < p->nseries; s++)
                for (size_t i = 0; i < p->series[s].n; i++) {
                    double x = p->series[s].x[i];
                    if (x >= xlo && x <= xhi)
                        extend(&ylo, &yhi, p->series[s].y[i], p->ylog);
                }
            for (size_t i = 0; i < p->nmarkers; i++)
                if (p->markers[i].x >= xlo && p->markers[i].x <= xhi)
                    extend(&ylo, &yhi, p->markers[i].y, p->ylog);
            if (ylo > yhi) {
                if (p->ylog)
                    return dk_error_set(err, DK_EINVAL,
                                        "nothing to plot: no data above "
                                        "zero for the logarithmic y axis");
                if (p->nseries || p->nmarkers || p->nbands)
                    ylo = 0, yhi = 1; /* bands only, or data out of x range */
                else
                    return dk_error_set(err, DK_EINVAL,
                                        "nothing to plot: no data and no y "
                                        "range");
            } else {
                unflatten(&ylo, &yhi, p->ylog);
                widen(&ylo, &yhi, RANGE_PAD, RANGE_PAD, p->ylog);
            }
        }
    }
    if (m && p->xlog && !(fmin(m->x0, m->x1) > 0))
        return dk_error_set(err, DK_EINVAL, "the map reaches zero or below "
                            "on the logarithmic x axis");
    if (m && p->ylog && !(fmin(m->y0, m->y1) > 0))
        return dk_error_set(err, DK_EINVAL, "the map reaches zero or below "
                            "on the logarithmic y axis");
    L->x.lo = xlo, L->x.hi = xhi, L->x.log = p->xlog;
    L->y.lo = ylo, L->y.hi = yhi, L->y.log = p->ylog;
    if (m) {
        double zlo = p->zlo, zhi = p->zhi;
        if (isnan(zlo)) {
            zlo = INFINITY, zhi = -INFINITY;
            for (long i = 0; i < (long)m->nx * m->ny; i++)
                extend(&zlo, &zhi, m->z[i], 0);
            unflatten(&zlo, &zhi, 0);
        }
        L->zlo = L->z.lo = zlo;
        L->zhi = L->z.hi = zhi;
        L->has_map = 1;
    }
    return DK_OK;
}

/* ---- Ticks ------------------------------------------------------------- */

/* Ticks of @a with at most @max, their labels and label sizes. With
 * @offset (the y axis and the colour bar), ticks of magnitude ≥ 1e5 or
 * < 1e-3 are labelled in units of a common power of ten. */
static dk_status
axis_ticks(PangoContext *ctx, plot_axis *a, int max, double f, int offset,
           dk_error *err)
{
    a->exp10 = 0;
    a->mult[0] = '\0';
    a->mult_w = a->mult_h = 0;
    a->label_w = a->label_h = 0;
    if (a->log) {
        if (plot_log_ticks(a->lo, a->hi, max, a->ticks, &a->nticks,
                           &a->step))
            return dk_error_set(err, DK_EINVAL,
                                "no ticks for the logarithmic range %g..%g",
                                a->lo, a->hi);
        for (int i = 0; i < a->nticks; i++) {
            double w, h;
            if (a->step < 0)
                plot_tick_label(a->ticks[i], -a->step, a->labels[i],
                                sizeof a->labels[i]);
            else
                plot_log_tick_label(a->ticks[i], a->labels[i],
                                    sizeof a->labels[i]);
            plot_text_size(ctx, a->labels[i], f, &w, &h);
            a->label_w = fmax(a->label_w, w);
            a->label_h = fmax(a->label_h, h);
        }
        return DK_OK;
    }
    dk_status s = dk_plot_nice_ticks(a->lo, a->hi, max, a->ticks, &a->nticks,
                                     &a->step, err);
    if (s)
        return s;
    double big = 0;
    for (int i = 0; i < a->nticks; i++)
        big = fmax(big, fabs(a->ticks[i]));
    if (offset && big > 0 && (big >= OFFSET_ABOVE || big < OFFSET_BELOW)) {
        a->exp10 = (int)floor(log10(big) + 1e-9);
        snprintf(a->mult, sizeof a->mult, "\xc3\x97" "10<sup>%s%d</sup>",
                 a->exp10 < 0 ? "\xe2\x88\x92" : "", abs(a->exp10));
        plot_text_size(ctx, a->mult, f, &a->mult_w, &a->mult_h);
    }
    double unit = pow(10, a->exp10);
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

/* Where tick i of a horizontal axis falls, pt (the top axis through its
 * inverse transform). */
static double
htick_pt(const dk_plot *p, const plot_layout *L, const plot_axis *a, int i)
{
    double v = a->ticks[i];
    if (a == &L->top)
        v = p->from_top(v, p->top_params);
    return plot_x_pt(L, v);
}

/* The smallest gap between neighbouring labels of a horizontal axis,
 * pt (labels centred on their ticks). */
static double
min_label_gap(PangoContext *ctx, const dk_plot *p, const plot_layout *L,
              const plot_axis *a)
{
    double gap = INFINITY, prev_x = 0, prev_w = 0;
    for (int i = 0; i < a->nticks; i++) {
        double w, h, x = htick_pt(p, L, a, i);
        plot_text_size(ctx, a->labels[i], L->f, &w, &h);
        if (i > 0)
            gap = fmin(gap, fabs(x - prev_x) - (w + prev_w) / 2);
        prev_x = x;
        prev_w = w;
    }
    return gap;
}

/* A horizontal axis (bottom or top): fewer ticks until neighbouring
 * labels keep an em apart. */
static dk_status
h_ticks(const dk_plot *p, PangoContext *ctx, plot_layout *L, plot_axis *a,
        dk_error *err)
{
    for (int max = MAX_AXIS_TICKS; max >= 2; max--) {
        dk_status s = axis_ticks(ctx, a, max, L->f, 0, err);
        if (s)
            return s;
        if (min_label_gap(ctx, p, L, a) >= X_LABEL_SPACE * L->f)
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

/* How far the labels of a horizontal axis reach past the left and right
 * ends of the frame, pt (≥ 0). */
static void
overhang(PangoContext *ctx, const dk_plot *p, const plot_layout *L,
         const plot_axis *a, double *left, double *right)
{
    for (int i = 0; i < a->nticks; i++) {
        double w, h, x = htick_pt(p, L, a, i);
        plot_text_size(ctx, a->labels[i], L->f, &w, &h);
        *left = fmax(*left, L->ax_x - (x - w / 2));
        *right = fmax(*right, x + w / 2 - (L->ax_x + L->ax_w));
    }
}

/* ---- Texts ------------------------------------------------------------- */

enum { H_LEFT, H_CENTER, H_RIGHT };
enum { V_TOP, V_BOTTOM, V_CAPTOP, V_CAPMID, V_BASE };

/* A text whose anchor (@h, @v) is at (@x, @y); rotated texts read bottom
 * to top and are anchored in their own frame (h along the text). */
static plot_text
text_at(PangoContext *ctx, int kind, const char *markup, double size,
        double x, double y, int h, int v, int rotated)
{
    plot_text_metrics m;
    plot_text_measure(ctx, markup, size, &m);
    double cap = PLOT_CAP_HEIGHT * size;
    double along = h == H_CENTER ? m.w / 2 : h == H_RIGHT ? m.w : 0;
    double across = v == V_TOP      ? 0
                    : v == V_BOTTOM ? m.h
                    : v == V_CAPTOP ? m.base - cap
                    : v == V_CAPMID ? m.base - cap / 2
                                    : m.base;
    plot_text t = {.kind = kind, .markup = markup, .size = size,
                   .rotated = rotated,
                   .rgb = {INK[0], INK[1], INK[2]}};
    if (!rotated) {
        t.x = x - along, t.y = y - across, t.w = m.w, t.h = m.h;
    } else {
        t.x = x - across, t.y = y - (m.w - along), t.w = m.h, t.h = m.w;
    }
    return t;
}

/* Add @t unless it comes within EDGE_SPACE of the page edge, within
 * @space of a text of the same kind already there, or onto any other
 * text (the corner where the x and y labels meet); returns -1 when out
 * of memory. */
static int
add_if_clear(plot_layout *L, const plot_text *t, double space)
{
    double e = EDGE_SPACE * L->f;
    if (t->x < e || t->y < e || t->x + t->w > L->page_w - e ||
        t->y + t->h > L->page_h - e)
        return 0;
    for (int i = 0; i < L->ntexts; i++) {
        const plot_text *o = &L->texts[i];
        double sp = o->kind == t->kind ? space : 0;
        if (t->x < o->x + o->w + sp && o->x < t->x + t->w + sp &&
            t->y < o->y + o->h && o->y < t->y + t->h)
            return 0;
    }
    return plot_layout_add_text(L, t) < 0 ? -1 : 0;
}

/* A label's type size: the figure's, or smaller when it is longer than
 * @room. */
static double
fitting_size(PangoContext *ctx, const char *markup, double f, double room)
{
    if (!markup)
        return f;
    double w, h;
    plot_text_size(ctx, markup, f, &w, &h);
    if (w <= room)
        return f;
    return fmax(MIN_SHRINK * f, f * room / w * 0.999);
}

/* Keep a centred extent [c − len/2, c + len/2] on [lo, hi]: the centre
 * to use. */
static double
clamp_centre(double c, double len, double lo, double hi)
{
    if (len >= hi - lo)
        return (lo + hi) / 2;
    if (c - len / 2 < lo)
        return lo + len / 2;
    if (c + len / 2 > hi)
        return hi - len / 2;
    return c;
}

/* "label (×10^k)", or a copy of the label; NULL for none. */
static char *
label_with_mult(const char *label, const plot_axis *a)
{
    if (!label)
        return NULL;
    if (!a->mult[0])
        return g_strdup(label);
    return g_strdup_printf("%s (%s)", label, a->mult);
}

typedef struct sizes {
    double xl, yl, tl, zl, title;      /* type sizes */
    double xl_h, yl_h, tl_h, zl_h, title_h;
} sizes;

static void
label_sizes(const dk_plot *p, PangoContext *ctx, const plot_layout *L,
            sizes *S)
{
    double f = L->f, pw = L->page_w - 2 * PAD * f,
           ph = L->page_h - 2 * PAD * f;
    const char *zl = L->zlabel;
    S->xl = fitting_size(ctx, p->xlabel, f, pw);
    S->yl = fitting_size(ctx, L->ylabel, f, ph);
    S->tl = fitting_size(ctx, p->toplabel, f, pw);
    S->zl = fitting_size(ctx, zl, f, ph);
    S->title = fitting_size(ctx, p->title, TITLE_SIZE * f, pw);
    double w;
    S->xl_h = S->yl_h = S->tl_h = S->zl_h = S->title_h = 0;
    if (p->xlabel)
        plot_text_size(ctx, p->xlabel, S->xl, &w, &S->xl_h);
    if (L->ylabel)
        plot_text_size(ctx, L->ylabel, S->yl, &w, &S->yl_h);
    if (p->toplabel && L->has_top)
        plot_text_size(ctx, p->toplabel, S->tl, &w, &S->tl_h);
    if (zl)
        plot_text_size(ctx, zl, S->zl, &w, &S->zl_h);
    if (p->title)
        plot_text_size(ctx, p->title, S->title, &w, &S->title_h);
}

static dk_status
all_ticks(const dk_plot *p, PangoContext *ctx, plot_layout *L, dk_error *err)
{
    double f = L->f;
    int ny = clampi((int)(L->ax_h / (Y_TICK_SPACE * f)) + 1, 2,
                    MAX_AXIS_TICKS);
    dk_status s = h_ticks(p, ctx, L, &L->x, err);
    if (!s)
        s = axis_ticks(ctx, &L->y, ny, f, 1, err);
    if (!s && L->has_top)
        s = h_ticks(p, ctx, L, &L->top, err);
    if (!s && L->has_map)
        s = axis_ticks(ctx, &L->z, ny, f, 1, err);
    return s;
}

/* Pack the notes into lines that fit the page width; their size and the
 * height they take at the bottom. Returns -1 when out of memory. */
static int
foot_lines(const dk_plot *p, PangoContext *ctx, plot_layout *L)
{
    for (int i = 0; i < L->nfoot; i++)
        g_free(L->foot[i]);
    L->nfoot = 0;
    L->foot_h = 0;
    if (!p->nnotes)
        return 0;
    double f = L->f, size = FOOT_SIZE * f, room = L->page_w - 2 * PAD * f;
    char *line = NULL;
    for (size_t i = 0; i < p->nnotes; i++) {
        char *joined = line ? g_strconcat(line, "; ", p->notes[i], NULL)
                            : g_strdup(p->notes[i]);
        if (!joined)
            return -1;
        double w, h;
        plot_text_size(ctx, joined, size, &w, &h);
        if (!line || w <= room) {
            g_free(line);
            line = joined;
            continue;
        }
        g_free(joined);
        L->foot[L->nfoot++] = line;
        line = g_strdup(p->notes[i]);
    }
    L->foot[L->nfoot++] = line;
    L->foot_size = size;
    for (int i = 0; i < L->nfoot; i++)
        L->foot_size = fmin(L->foot_size,
                            fitting_size(ctx, L->foot[i], size, room));
    L->foot_h = FOOT_GAP * f + L->nfoot * FOOT_ROW * L->foot_size;
    return 0;
}

/* Settle ticks and margins. */
static dk_status
place_box(const dk_plot *p, PangoContext *ctx, plot_layout *L, sizes *S,
          dk_error *err)
{
    double f = L->f, gap = L->tick_gap;
    L->ax_x = 6 * f;
    L->ax_y = (L->has_top ? 4 : 1) * f + (p->title ? 2 * f : 0);
    L->ax_w = L->page_w - L->ax_x - (L->has_map ? 8 : 1.5) * f -
              L->reserve_right;
    L->ax_h = L->page_h - L->ax_y - 4 * f - L->reserve_bottom - L->foot_h;
    for (int pass = 0; pass < LAYOUT_PASSES; pass++) {
        if (L->ax_w < 3 * f || L->ax_h < 3 * f)
            break;
        dk_status s = all_ticks(p, ctx, L, err);
        if (s)
            return s;
        g_free(L->ylabel);
        g_free(L->zlabel);
        L->ylabel = label_with_mult(p->ylabel, &L->y);
        L->zlabel = label_with_mult(p->map ? p->map->label : NULL, &L->z);
        label_sizes(p, ctx, L, S);

        double oh_l = 0, oh_r = 0;
        overhang(ctx, p, L, &L->x, &oh_l, &oh_r);
        if (L->has_top)
            overhang(ctx, p, L, &L->top, &oh_l, &oh_r);

        double left = PAD * f + (S->yl_h > 0 ? S->yl_h + LABEL_GAP * f : 0) +
                      L->y.label_w + gap;
        left = fmax(left, PAD * f + oh_l);
        double bottom = PAD * f +
                        (S->xl_h > 0 ? S->xl_h + LABEL_GAP * f : 0) +
                        L->x.label_h + gap + L->reserve_bottom + L->foot_h;
        double top = PAD * f + (S->title_h > 0 ? S->title_h + TITLE_GAP * f
                                               : 0);
        if (L->has_top) {
            top += (S->tl_h > 0 ? S->tl_h + LABEL_GAP * f : 0) +
                   L->top.label_h + gap;
        } else {
            double stick = 0.5 * fmax(L->y.label_h,
                                      L->has_map ? L->z.label_h : 0);
            if (!L->ylabel && L->y.mult[0])
                stick = fmax(stick, L->y.mult_h + MULT_GAP * f);
            if (!L->zlabel && L->z.mult[0])
                stick = fmax(stick, L->z.mult_h + MULT_GAP * f);
            top += stick;
        }
        double right = PAD * f + oh_r;
        if (L->has_map)
            right = fmax(right, PAD * f + CB_GAP * f + CB_W * f +
                                    TICK_GAP * f + L->z.label_w +
                                    (S->zl_h > 0 ? LABEL_GAP * f + S->zl_h
                                                 : 0));
        right += L->reserve_right;
        L->ax_x = left;
        L->ax_y = top;
        L->ax_w = L->page_w - left - right;
        L->ax_h = L->page_h - top - bottom;
    }
    if (L->ax_w < 3 * f || L->ax_h < 3 * f)
        return dk_error_set(err, DK_EINVAL,
                            "figure %g x %g mm is too small for its labels "
                            "at %g pt type: make it larger or set a smaller "
                            "type size",
                            p->width_mm, p->height_mm, f);
    /* The last pass moved the box a little: ticks for the final box. */
    dk_status s = all_ticks(p, ctx, L, err);
    if (s)
        return s;
    if (L->has_map) {
        L->cb_x = L->ax_x + L->ax_w + CB_GAP * f;
        L->cb_w = CB_W * f;
    }
    return DK_OK;
}

/* The texts of the axes, colour bar and title. */
static int
axis_texts(const dk_plot *p, PangoContext *ctx, plot_layout *L,
           const sizes *S)
{
    double f = L->f, gap = L->tick_gap, space = MIN_LABEL_SPACE * f;
    int rc = 0;
    for (int i = 0; i < L->y.nticks && !rc; i++) {
        plot_text t = text_at(ctx, PLOT_TEXT_TICK_Y, L->y.labels[i], f,
                              L->ax_x - gap, plot_y_pt(L, L->y.ticks[i]),
                              H_RIGHT, V_CAPMID, 0);
        rc = add_if_clear(L, &t, 0);
    }
    for (int i = 0; i < L->x.nticks && !rc; i++) {
        plot_text t = text_at(ctx, PLOT_TEXT_TICK_X, L->x.labels[i], f,
                              htick_pt(p, L, &L->x, i),
                              L->ax_y + L->ax_h + gap, H_CENTER, V_CAPTOP, 0);
        rc = add_if_clear(L, &t, space);
    }
    for (int i = 0; L->has_top && i < L->top.nticks && !rc; i++) {
        plot_text t = text_at(ctx, PLOT_TEXT_TICK_TOP, L->top.labels[i], f,
                              htick_pt(p, L, &L->top, i), L->ax_y - gap,
                              H_CENTER, V_BASE, 0);
        rc = add_if_clear(L, &t, space);
    }
    double span = L->zhi - L->zlo;
    for (int i = 0; L->has_map && i < L->z.nticks && !rc; i++) {
        double yy = L->ax_y + L->ax_h -
                    (L->z.ticks[i] - L->zlo) / span * L->ax_h;
        plot_text t = text_at(ctx, PLOT_TEXT_TICK_Z, L->z.labels[i], f,
                              L->cb_x + L->cb_w + TICK_GAP * f, yy, H_LEFT,
                              V_CAPMID, 0);
        rc = add_if_clear(L, &t, 0);
    }
    if (rc)
        return rc;

    double cx = L->ax_x + L->ax_w / 2, cy = L->ax_y + L->ax_h / 2;
    double pad = PAD * f;
    plot_text t;
    if (p->xlabel) {
        t = text_at(ctx, PLOT_TEXT_XLABEL, p->xlabel, S->xl, cx,
                    L->ax_y + L->ax_h + gap + L->x.label_h +
                        LABEL_GAP * f * 0.6,
                    H_CENTER, V_TOP, 0);
        t.x = clamp_centre(t.x + t.w / 2, t.w, pad, L->page_w - pad) -
              t.w / 2;
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    }
    if (L->has_top && p->toplabel) {
        t = text_at(ctx, PLOT_TEXT_TOPLABEL, p->toplabel, S->tl, cx,
                    L->ax_y - gap - L->top.label_h - LABEL_GAP * f * 0.6,
                    H_CENTER, V_BOTTOM, 0);
        t.x = clamp_centre(t.x + t.w / 2, t.w, pad, L->page_w - pad) -
              t.w / 2;
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    }
    if (L->ylabel) {
        t = text_at(ctx, PLOT_TEXT_YLABEL, L->ylabel, S->yl,
                    L->ax_x - gap - L->y.label_w - LABEL_GAP * f, cy,
                    H_CENTER, V_BOTTOM, 1);
        t.y = clamp_centre(t.y + t.h / 2, t.h, pad, L->page_h - pad) -
              t.h / 2;
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    } else if (L->y.mult[0]) {
        t = text_at(ctx, PLOT_TEXT_MULT, L->y.mult, f, L->ax_x - gap,
                    L->ax_y - MULT_GAP * f, H_RIGHT, V_BOTTOM, 0);
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    }
    if (L->has_map) {
        if (L->zlabel) {
            t = text_at(ctx, PLOT_TEXT_ZLABEL, L->zlabel, S->zl,
                        L->cb_x + L->cb_w + TICK_GAP * f + L->z.label_w +
                            LABEL_GAP * f,
                        cy, H_CENTER, V_TOP, 1);
            t.y = clamp_centre(t.y + t.h / 2, t.h, pad, L->page_h - pad) -
                  t.h / 2;
            if (plot_layout_add_text(L, &t) < 0)
                return -1;
        } else if (L->z.mult[0]) {
            t = text_at(ctx, PLOT_TEXT_MULT, L->z.mult, f, L->cb_x,
                        L->ax_y - MULT_GAP * f, H_LEFT, V_BOTTOM, 0);
            if (plot_layout_add_text(L, &t) < 0)
                return -1;
        }
    }
    if (p->title) {
        t = text_at(ctx, PLOT_TEXT_TITLE, p->title, S->title, cx, pad,
                    H_CENTER, V_TOP, 0);
        t.x = clamp_centre(t.x + t.w / 2, t.w, pad, L->page_w - pad) -
              t.w / 2;
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    }
    for (int i = 0; i < L->nfoot; i++) {
        double row = FOOT_ROW * L->foot_size;
        t = text_at(ctx, PLOT_TEXT_NOTE, L->foot[i], L->foot_size, pad,
                    L->page_h - pad - (L->nfoot - i) * row, H_LEFT, V_TOP,
                    0);
        if (plot_layout_add_text(L, &t) < 0)
            return -1;
    }
    return 0;
}

dk_status
plot_axes_compute(const dk_plot *p, PangoContext *ctx, plot_layout *L,
                  dk_error *err)
{
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
    sizes S;
    if (foot_lines(p, ctx, L))
        return dk_error_set(err, DK_ENOMEM, "out of memory for the notes");
    s = place_box(p, ctx, L, &S, err);
    if (s)
        return s;
    if (axis_texts(p, ctx, L, &S))
        return dk_error_set(err, DK_ENOMEM, "out of memory for the figure's "
                            "labels");
    return DK_OK;
}
