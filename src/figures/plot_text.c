/*
 * plot_text.c - measuring text with pango in page pt, and the list of
 * texts a layout places.
 *
 * Text is set in "Sans" through fontconfig with no hinting, unrounded
 * glyph positions and a 72 ppi resolution, so that 1 pango point is 1
 * page pt whatever the backend, and the text measured for the layout is
 * the text drawn.
 */
#include <math.h>
#include <stdlib.h>

#include "plot_internal.h"

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
plot_text_measure(PangoContext *ctx, const char *markup, double size_pt,
                  plot_text_metrics *m)
{
    PangoLayout *lay = plot_text_layout(ctx, markup, size_pt);
    PangoRectangle lg;
    pango_layout_get_extents(lay, NULL, &lg);
    m->w = (double)lg.width / PANGO_SCALE;
    m->h = (double)lg.height / PANGO_SCALE;
    m->lx = (double)lg.x / PANGO_SCALE;
    m->ly = (double)lg.y / PANGO_SCALE;
    m->base = (double)pango_layout_get_baseline(lay) / PANGO_SCALE - m->ly;
    g_object_unref(lay);
}

void
plot_text_size(PangoContext *ctx, const char *markup, double size_pt,
               double *w, double *h)
{
    plot_text_metrics m;
    plot_text_measure(ctx, markup, size_pt, &m);
    *w = m.w;
    *h = m.h;
}

int
plot_layout_add_text(plot_layout *L, const plot_text *t)
{
    if (L->ntexts == L->captexts) {
        int cap = L->captexts ? 2 * L->captexts : 64;
        plot_text *a = realloc(L->texts, (size_t)cap * sizeof *a);
        if (!a)
            return -1;
        L->texts = a;
        L->captexts = cap;
    }
    L->texts[L->ntexts] = *t;
    return L->ntexts++;
}
