/*
 * plot_scale.c - data ↔ page coordinates, linear or logarithmic, and line
 * clipping.
 *
 * A linear axis maps lo..hi onto the axes box in proportion; a
 * logarithmic one maps log10(lo)..log10(hi), and values ≤ 0 (which have
 * no place on it) map to NaN, which breaks a line there.
 *
 * References:
 *   Y.-D. Liang, B. A. Barsky, "A new concept and method for line
 *   clipping", ACM Trans. Graph. 3, 1-22 (1984).
 */
#include <math.h>

#include "plot_internal.h"

double
plot_axis_frac(const plot_axis *a, double v)
{
    if (a->log) {
        if (!(v > 0))
            return NAN;
        return (log10(v) - log10(a->lo)) / (log10(a->hi) - log10(a->lo));
    }
    return (v - a->lo) / (a->hi - a->lo);
}

static double
axis_value(const plot_axis *a, double t)
{
    if (a->log)
        return pow(10, log10(a->lo) + t * (log10(a->hi) - log10(a->lo)));
    return a->lo + t * (a->hi - a->lo);
}

double
plot_x_pt(const plot_layout *L, double x)
{
    return L->ax_x + plot_axis_frac(&L->x, x) * L->ax_w;
}

double
plot_y_pt(const plot_layout *L, double y)
{
    return L->ax_y + (1 - plot_axis_frac(&L->y, y)) * L->ax_h;
}

double
plot_x_data(const plot_layout *L, double xpt)
{
    return axis_value(&L->x, (xpt - L->ax_x) / L->ax_w);
}

double
plot_y_data(const plot_layout *L, double ypt)
{
    return axis_value(&L->y, 1 - (ypt - L->ax_y) / L->ax_h);
}

int
plot_clip_segment(const double box[4], double *ax, double *ay, double *bx,
                  double *by)
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
