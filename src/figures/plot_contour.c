/*
 * plot_contour.c - contour lines of a gridded function by marching
 * squares.
 *
 * Method: each grid cell is classed by which of its four corners lie at
 * or above the level (16 cases); the level crosses an edge whose two ends
 * differ, at the point given by linear interpolation of z along that edge.
 * The two saddle cases (opposite corners above) are resolved by the mean
 * of the four corners, the value of the bilinear interpolant at the cell
 * centre. A crossing point is computed from its edge alone, so the two
 * cells sharing an edge agree on it exactly; segments are then chained
 * through their shared edges into polylines: open ones (ending at the
 * grid border or at a cell with a NaN corner, which is skipped) first,
 * then closed loops. Points are in grid coordinates (i, j), i along a
 * row; the caller maps them to data.
 *
 * References:
 *   W. E. Lorensen, H. E. Cline, "Marching cubes: a high resolution 3D
 *   surface construction algorithm", Computer Graphics 21(4), 163-169
 *   (1987) - the cell-by-case method, of which this is the 2-D form.
 */
#include <math.h>
#include <stdlib.h>

#include "plot_internal.h"

/* Cell edges: 0 bottom (v0-v1), 1 right (v1-v2), 2 top (v3-v2), 3 left
 * (v0-v3), with corners v0 (i, j), v1 (i+1, j), v2 (i+1, j+1), v3 (i, j+1).
 * For each case (bit c set when corner c is at or above the level), the
 * segments as pairs of edges; -1 ends the list. Cases 5 and 10 (saddles)
 * are listed for a centre below the level; a centre above swaps them. */
static const signed char CASES[16][5] = {
    {-1},         {0, 3, -1},   {0, 1, -1},   {3, 1, -1},
    {1, 2, -1},   {0, 3, 1, 2, -1}, {0, 2, -1}, {2, 3, -1},
    {2, 3, -1},   {0, 2, -1},   {0, 1, 2, 3, -1}, {1, 2, -1},
    {3, 1, -1},   {0, 1, -1},   {0, 3, -1},   {-1},
};
static const signed char SADDLE_ABOVE[16][5] = {
    [5] = {0, 1, 2, 3, -1},
    [10] = {0, 3, 1, 2, -1},
};

typedef struct seg {
    long e[2];          /* global edge ids */
} seg;

typedef struct edge_ref {
    long edge;
    long seg;
} edge_ref;

typedef struct trace {
    const double *z;
    int nx, ny;
    double level;
    seg *segs;
    long nsegs, capsegs;
    edge_ref *refs;     /* two per segment, sorted by edge */
    double *px, *py;    /* polyline being built */
    long npts, cappts;
} trace;

/* Global edge ids: horizontal (i, j)-(i+1, j) first, then vertical. */
static long
hedge(const trace *t, int i, int j)
{
    return (long)j * (t->nx - 1) + i;
}

static long
vedge(const trace *t, int i, int j)
{
    return (long)t->ny * (t->nx - 1) + (long)j * t->nx + i;
}

/* The crossing point on a global edge, in grid coordinates. */
static void
edge_point(const trace *t, long e, double *gx, double *gy)
{
    long nh = (long)t->ny * (t->nx - 1);
    int i0, j0, i1, j1;
    if (e < nh) {
        j0 = j1 = (int)(e / (t->nx - 1));
        i0 = (int)(e % (t->nx - 1));
        i1 = i0 + 1;
    } else {
        e -= nh;
        j0 = (int)(e / t->nx);
        i0 = i1 = (int)(e % t->nx);
        j1 = j0 + 1;
    }
    double za = t->z[(long)j0 * t->nx + i0], zb = t->z[(long)j1 * t->nx + i1];
    double f = (t->level - za) / (zb - za);
    *gx = i0 + f * (i1 - i0);
    *gy = j0 + f * (j1 - j0);
}

static int
add_seg(trace *t, long a, long b)
{
    if (t->nsegs == t->capsegs) {
        long c = t->capsegs ? 2 * t->capsegs : 64;
        seg *s = realloc(t->segs, (size_t)c * sizeof *s);
        if (!s)
            return -1;
        t->segs = s;
        t->capsegs = c;
    }
    t->segs[t->nsegs++] = (seg){{a, b}};
    return 0;
}

static int
add_point(trace *t, long e)
{
    if (t->npts == t->cappts) {
        long c = t->cappts ? 2 * t->cappts : 64;
        double *x = realloc(t->px, (size_t)c * sizeof *x);
        if (!x)
            return -1;
        t->px = x;
        double *y = realloc(t->py, (size_t)c * sizeof *y);
        if (!y)
            return -1;
        t->py = y;
        t->cappts = c;
    }
    edge_point(t, e, &t->px[t->npts], &t->py[t->npts]);
    t->npts++;
    return 0;
}

static int
cmp_ref(const void *a, const void *b)
{
    const edge_ref *x = a, *y = b;
    if (x->edge != y->edge)
        return x->edge < y->edge ? -1 : 1;
    return x->seg < y->seg ? -1 : x->seg > y->seg;
}

/* The segments touching edge @e: their indices in refs[*first..*first+*n). */
static void
refs_of(const trace *t, long e, long *first, long *n)
{
    long lo = 0, hi = 2 * t->nsegs;
    while (lo < hi) {
        long mid = (lo + hi) / 2;
        if (t->refs[mid].edge < e)
            lo = mid + 1;
        else
            hi = mid;
    }
    *first = lo;
    *n = 0;
    while (lo + *n < 2 * t->nsegs && t->refs[lo + *n].edge == e)
        (*n)++;
}

/* Another unused segment at edge @e, or -1. */
static long
next_seg(const trace *t, long e, const unsigned char *used)
{
    long first, n;
    refs_of(t, e, &first, &n);
    for (long k = 0; k < n; k++)
        if (!used[t->refs[first + k].seg])
            return t->refs[first + k].seg;
    return -1;
}

/* Follow the chain from segment @s entered at edge @e. */
static int
walk(trace *t, long s, long e, unsigned char *used, plot_polyline_fn emit,
     void *ctx)
{
    long start = e;
    t->npts = 0;
    if (add_point(t, e))
        return -1;
    int closed = 0;
    while (s >= 0) {
        used[s] = 1;
        e = t->segs[s].e[0] == e ? t->segs[s].e[1] : t->segs[s].e[0];
        if (e == start) {
            closed = 1;
            if (add_point(t, e))
                return -1;
            break;
        }
        if (add_point(t, e))
            return -1;
        s = next_seg(t, e, used);
    }
    if (t->npts >= 2)
        emit(t->px, t->py, (int)t->npts, closed, ctx);
    return 0;
}

int
plot_contour_trace(const double *z, int nx, int ny, double level,
                   plot_polyline_fn emit, void *ctx)
{
    trace t = {.z = z, .nx = nx, .ny = ny, .level = level};
    int rc = -1;
    unsigned char *used = NULL;
    for (int j = 0; j + 1 < ny; j++) {
        for (int i = 0; i + 1 < nx; i++) {
            double v[4] = {z[(long)j * nx + i], z[(long)j * nx + i + 1],
                           z[(long)(j + 1) * nx + i + 1],
                           z[(long)(j + 1) * nx + i]};
            if (!(isfinite(v[0]) && isfinite(v[1]) && isfinite(v[2]) &&
                  isfinite(v[3])))
                continue;
            int c = 0;
            for (int k = 0; k < 4; k++)
                c |= (v[k] >= level) << k;
            const signed char *segs = CASES[c];
            if ((c == 5 || c == 10) &&
                (v[0] + v[1] + v[2] + v[3]) / 4 >= level)
                segs = SADDLE_ABOVE[c];
            long edges[4] = {hedge(&t, i, j), vedge(&t, i + 1, j),
                             hedge(&t, i, j + 1), vedge(&t, i, j)};
            for (int k = 0; segs[k] >= 0; k += 2)
                if (add_seg(&t, edges[segs[k]], edges[segs[k + 1]]))
                    goto out;
        }
    }
    if (t.nsegs == 0) {
        rc = 0;
        goto out;
    }
    t.refs = malloc((size_t)(2 * t.nsegs) * sizeof *t.refs);
    used = calloc((size_t)t.nsegs, 1);
    if (!t.refs || !used)
        goto out;
    for (long s = 0; s < t.nsegs; s++) {
        t.refs[2 * s] = (edge_ref){t.segs[s].e[0], s};
        t.refs[2 * s + 1] = (edge_ref){t.segs[s].e[1], s};
    }
    qsort(t.refs, (size_t)(2 * t.nsegs), sizeof *t.refs, cmp_ref);
    /* Open chains start at an edge that only one segment touches. */
    for (long r = 0; r < 2 * t.nsegs; r++) {
        long e = t.refs[r].edge, s = t.refs[r].seg, first, n;
        if (used[s])
            continue;
        refs_of(&t, e, &first, &n);
        if (n == 1 && walk(&t, s, e, used, emit, ctx))
            goto out;
    }
    for (long s = 0; s < t.nsegs; s++)
        if (!used[s] && walk(&t, s, t.segs[s].e[0], used, emit, ctx))
            goto out;
    rc = 0;
out:
    free(t.segs);
    free(t.refs);
    free(t.px);
    free(t.py);
    free(used);
    return rc;
}
