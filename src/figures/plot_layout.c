/*
 * plot_layout.c - the whole layout of a figure: the axes (plot_axes.c),
 * then the contour lines, marker and branch labels and the legend
 * (plot_place.c), each in page pt, before anything is drawn. The drawing
 * (plot_draw.c) only renders what is decided here, so what the tests
 * measure here is what the page shows.
 *
 * The legend goes outside when asked to, or (AUTO) when no place inside
 * the axes is free of data: on the right when the axes keep at least
 * half the page width, else below the axes when it takes at most 35 % of
 * the page height; the axes are then laid out again with that room kept
 * free. When neither fits, it stays inside where it covers least.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "plot_internal.h"

#define OUTSIDE_GAP 0.8     /* axes (or colour bar text) to legend, em */
#define OUTSIDE_MAX 0.5     /* most of the page width an outside legend
                               may take on the right */
#define OUTSIDE_MAX_BELOW 0.35 /* most of the page height it may take
                                  below */

/* Forget what the axes and placement added, keeping the legend items. */
static void
clear_placed(plot_layout *L)
{
    for (int i = 0; i < L->ncontours; i++) {
        free(L->contours[i].x);
        free(L->contours[i].y);
    }
    free(L->contours);
    L->contours = NULL;
    L->ncontours = L->capcontours = 0;
    L->ntexts = 0;
    g_free(L->ylabel);
    g_free(L->zlabel);
    L->ylabel = L->zlabel = NULL;
}

void
plot_layout_release(plot_layout *L)
{
    clear_placed(L);
    free(L->texts);
    free(L->items);
    for (int i = 0; i < L->nfoot; i++)
        g_free(L->foot[i]);
    memset(L, 0, sizeof *L);
}

/* Axes, contours and labels for the current reserve; 1 when the legend
 * would rather go outside. */
static dk_status
lay_out(const dk_plot *p, PangoContext *ctx, plot_layout *L,
        int allow_outside, int *wants_outside, dk_error *err)
{
    clear_placed(L);
    dk_status s = plot_axes_compute(p, ctx, L, err);
    if (s)
        return s;
    int rc = plot_place_contours(p, L);
    if (!rc)
        rc = plot_place_labels(p, ctx, L, allow_outside);
    if (rc < 0)
        return dk_error_set(err, DK_ENOMEM, "out of memory laying out the "
                            "figure");
    *wants_outside = rc == 1;
    return DK_OK;
}

static dk_status
compute(const dk_plot *p, PangoContext *ctx, plot_layout *L, dk_error *err)
{
    double lw = 0, lh = 0;
    if (plot_place_legend_items(p, ctx, L, &lw, &lh))
        return dk_error_set(err, DK_ENOMEM, "out of memory for the legend");
    double f = p->font_pt;
    double page_w = p->width_mm * PLOT_PT_PER_MM;
    double page_h = p->height_mm * PLOT_PT_PER_MM;
    double right = lw + OUTSIDE_GAP * f, below = lh + OUTSIDE_GAP * f;
    int fits_right = L->nitems > 0 && right <= OUTSIDE_MAX * page_w;
    int fits_below = L->nitems > 0 && lw <= page_w - f &&
                     below <= OUTSIDE_MAX_BELOW * page_h;
    int want = 0;
    if (p->legend == DK_PLOT_LEGEND_OUTSIDE) {
        if (fits_right)
            L->reserve_right = right;
        else if (fits_below)
            L->reserve_bottom = below;
    }
    dk_status s = lay_out(p, ctx, L, p->legend == DK_PLOT_LEGEND_AUTO, &want,
                          err);
    if (s || !want)
        return s;
    if (fits_right)
        L->reserve_right = right;
    else if (fits_below)
        L->reserve_bottom = below;
    return lay_out(p, ctx, L, 0, &want, err);
}

dk_status
plot_layout_compute(const dk_plot *p, plot_layout *L, dk_error *err)
{
    memset(L, 0, sizeof *L);
    cairo_surface_t *surf = cairo_image_surface_create(CAIRO_FORMAT_ARGB32,
                                                       1, 1);
    cairo_t *cr = cairo_create(surf);
    PangoContext *ctx = NULL;
    if (cairo_status(cr) == CAIRO_STATUS_SUCCESS)
        ctx = plot_text_context(cr);
    dk_status s;
    if (!ctx)
        s = dk_error_set(err, DK_ENOMEM, "cannot measure text: out of "
                         "memory");
    else
        s = compute(p, ctx, L, err);
    if (ctx)
        g_object_unref(ctx);
    cairo_destroy(cr);
    cairo_surface_destroy(surf);
    if (s)
        plot_layout_release(L);
    return s;
}
