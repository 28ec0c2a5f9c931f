/*
 * sweep_map.c - phase-matching maps: sinc²(ΔkL/2) over two design
 * variables, and the Δk = 0 line from the root finder (see
 * deltak/sweep.h). The line comes from solving for y at each x, not from
 * contouring the grid, so narrow ridges are drawn at their true place.
 *
 * The cells come from the batch engine (sweep_batch.c) when the design
 * allows it, else cell by cell through dk_sweep_set() and
 * dk_sweep_sinc2(); the Δk = 0 line comes from the tracer
 * (sweep_trace.c), which finds the roots dk_sweep_solve() finds at each x
 * by continuation.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/sweep.h"
#include "sweep_internal.h"

void
dk_map_result_free(dk_map_result *res)
{
    if (!res)
        return;
    free(res->x);
    free(res->y);
    free(res->z);
    free(res->cell);
    free(res->ridge.x);
    free(res->ridge.y);
    free(res->ridge.flags);
    memset(res, 0, sizeof *res);
}

static dk_status
check_spec(const dk_design *base, const dk_map_spec *sp, dk_error *err)
{
    dk_status vs = dk_var_check(sp->x, sp->x_lo, err);
    if (!vs)
        vs = dk_var_check(sp->x, sp->x_hi, err);
    if (!vs)
        vs = dk_var_check(sp->y, sp->y_lo, err);
    if (!vs)
        vs = dk_var_check(sp->y, sp->y_hi, err);
    if (vs)
        return vs;
    if (sp->nx < 2 || sp->ny < 2 || sp->nx > DK_MAP_MAX_SIDE ||
        sp->ny > DK_MAP_MAX_SIDE)
        return dk_error_set(err, DK_EINVAL,
                            "a map has 2 to %d points along each axis, not "
                            "%d x %d",
                            DK_MAP_MAX_SIDE, sp->nx, sp->ny);
    if ((long long)sp->nx * sp->ny > DK_MAP_MAX_CELLS)
        return dk_error_set(err, DK_EINVAL,
                            "a map of %d x %d cells exceeds the limit of %d "
                            "cells (about %d MB); use fewer points",
                            sp->nx, sp->ny, DK_MAP_MAX_CELLS,
                            (int)((double)DK_MAP_MAX_CELLS * 10 / 1e6 + 0.5));
    if (!isfinite(sp->x_lo) || !isfinite(sp->x_hi) || sp->x_lo == sp->x_hi ||
        !isfinite(sp->y_lo) || !isfinite(sp->y_hi) || sp->y_lo == sp->y_hi)
        return dk_error_set(err, DK_EINVAL,
                            "map ranges must be finite with two different "
                            "ends");
    if (sp->x == sp->y)
        return dk_error_set(err, DK_EINVAL,
                            "a map needs two different variables");
    if (!(base->length_mm > 0) && sp->x != DK_VAR_LENGTH &&
        sp->y != DK_VAR_LENGTH)
        return dk_error_set(err, DK_EINVAL,
                            "a sinc^2 map needs a crystal length");
    dk_sweep *probe = malloc(sizeof *probe);
    if (!probe)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    dk_sweep_init(probe, base);
    dk_status s = dk_sweep_set(probe, sp->y, sp->y_lo, err);
    if (!s)
        s = dk_sweep_set(probe, sp->x, sp->x_lo, err);
    free(probe);
    return s;
}

/* y solvable by the root finder (the others get no ridge). */
static int
solvable(const dk_design *d, dk_var y)
{
    switch (y) {
    case DK_VAR_TEMP:
    case DK_VAR_SIGNAL:
    case DK_VAR_IDLER:
        return !d->shg;
    case DK_VAR_PERIOD:
        return d->scheme == DK_SCHEME_QPM;
    case DK_VAR_THETA:
    case DK_VAR_PHI:
        return d->scheme == DK_SCHEME_ANGLE;
    default:
        return 0;
    }
}

static dk_status
ridge(const dk_design *base, const dk_map_spec *sp, dk_sweep *s,
      dk_map_result *res)
{
    enum { RR = DK_SWEEP_MAX_ROOTS };
    size_t cap = (size_t)sp->nx * (RR + 1);
    dk_series *r = &res->ridge;
    r->x = malloc(cap * sizeof *r->x);
    r->y = malloc(cap * sizeof *r->y);
    r->flags = calloc(cap, sizeof *r->flags);
    r->family = r->wave = -1;
    if (!r->x || !r->y || !r->flags)
        return DK_ENOMEM;
    /* Roots per column, then branch k joined across columns. */
    double *v = malloc((size_t)sp->nx * RR * sizeof *v);
    int *nv = calloc((size_t)sp->nx, sizeof *nv);
    if (!v || !nv) {
        free(v), free(nv);
        return DK_ENOMEM;
    }
    int maxk = 0;
    dk_sweep_init(s, base);
    trace_point *tp = malloc((size_t)sp->nx * sizeof *tp);
    if (!tp || sweep_trace(s, sp->x, res->x, sp->nx, sp->y, NULL, tp, NULL,
                           NULL, NULL, NULL)) {
        free(tp), free(v), free(nv);
        return DK_ENOMEM;
    }
    for (int i = 0; i < sp->nx; i++) {
        nv[i] = tp[i].status ? 0 : tp[i].n;
        memcpy(v + (size_t)i * RR, tp[i].v, nv[i] * sizeof *v);
        maxk = nv[i] > maxk ? nv[i] : maxk;
    }
    free(tp);
    size_t m = 0;
    double lo = fmin(sp->y_lo, sp->y_hi), hi = fmax(sp->y_lo, sp->y_hi);
    for (int k = 0; k < maxk; k++) {
        for (int i = 0; i < sp->nx; i++) {
            double y = k < nv[i] ? v[(size_t)i * RR + k] : NAN;
            r->x[m] = res->x[i];
            r->y[m++] = y >= lo && y <= hi ? y : NAN;
        }
        r->x[m] = NAN, r->y[m++] = NAN;
    }
    r->n = m;
    snprintf(r->label, sizeof r->label, "Δk = 0");
    free(v);
    free(nv);
    return DK_OK;
}

dk_status
dk_sweep_map(const dk_design *base, const dk_map_spec *sp,
             dk_map_result *res, dk_error *err)
{
    memset(res, 0, sizeof *res);
    dk_notes_clear(&res->notes);
    dk_status st = check_spec(base, sp, err);
    if (st)
        return st;
    size_t cells = (size_t)sp->nx * sp->ny;
    res->nx = sp->nx;
    res->ny = sp->ny;
    res->x = malloc((size_t)sp->nx * sizeof *res->x);
    res->y = malloc((size_t)sp->ny * sizeof *res->y);
    res->z = malloc(cells * sizeof *res->z);
    res->cell = malloc(cells);
    dk_sweep *s = malloc(sizeof *s);
    if (!res->x || !res->y || !res->z || !res->cell || !s) {
        free(s);
        dk_map_result_free(res);
        return dk_error_set(err, DK_ENOMEM, "out of memory for the map");
    }
    for (int i = 0; i < sp->nx; i++)
        res->x[i] = sp->x_lo + (sp->x_hi - sp->x_lo) * i / (sp->nx - 1);
    for (int j = 0; j < sp->ny; j++)
        res->y[j] = sp->y_lo + (sp->y_hi - sp->y_lo) * j / (sp->ny - 1);
    size_t defined = 0;
    int batched = 0;
    if (sweep_map_batch(base, sp, res, &batched, &defined)) {
        free(s);
        dk_map_result_free(res);
        return dk_error_set(err, DK_ENOMEM, "out of memory for the map");
    }
    dk_sweep_init(s, base);
    for (int j = 0; j < sp->ny && !batched; j++)
        for (int i = 0; i < sp->nx; i++) {
            size_t c = (size_t)j * sp->nx + i;
            double z = NAN;
            if (!dk_sweep_set(s, sp->y, res->y[j], NULL) &&
                !dk_sweep_set(s, sp->x, res->x[i], NULL))
                z = dk_sweep_sinc2(s);
            res->z[c] = z;
            if (!isfinite(z)) {
                res->cell[c] = DK_CELL_UNDEFINED;
                continue;
            }
            defined++;
            unsigned f = dk_design_range_flags(&s->d, &s->d.waves,
                                               s->d.temp_c);
            res->cell[c] = f ? DK_CELL_EXTRAPOLATED : DK_CELL_OK;
            if (f && !(res->flags & f))
                dk_design_note_range(&s->d, f, &s->d.waves, s->d.temp_c,
                                     &res->notes);
            res->flags |= f;
        }
    if (defined == 0) {
        free(s);
        dk_map_result_free(res);
        return dk_error_set(err, DK_ENOROOT,
                            "the phase mismatch is undefined over the whole "
                            "map (outside the transparency range?)");
    }
    if (solvable(base, sp->y) && ridge(base, sp, s, res)) {
        free(s);
        dk_map_result_free(res);
        return dk_error_set(err, DK_ENOMEM, "out of memory for the map");
    }
    if (defined < cells)
        dk_notes_add(&res->notes, DK_NOTE_WARNING, "cells-undefined",
                     "%zu of %zu cells have no phase mismatch (outside the "
                     "transparency range or beyond the model)",
                     cells - defined, cells);
    free(s);
    return DK_OK;
}
