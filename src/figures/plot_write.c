/*
 * plot_write.c - writing a figure to PDF, SVG or PNG, atomically and
 * reproducibly.
 *
 * The format follows the file name's extension. The figure is laid out
 * first (so that a bad figure fails before any file exists), then drawn
 * into a file opened with dk_safe_write_open() (deltak/safe_write.h: a
 * temporary file created exclusively beside a regular target and renamed
 * over it atomically; devices, FIFOs and links to them written in place,
 * never replaced; temporary files removed on SIGINT/SIGTERM). Cairo writes
 * through a stream callback that records the first write error. Only when
 * cairo reports success for the drawing and the surface is the file
 * committed; on any failure it is aborted and the target left as it was.
 *
 * Reproducible bytes: PNG has no time stamp. Cairo's PDF carries a creation
 * date unless it is set; from cairo 1.16 on we set it empty, which cairo
 * takes as "omit" (checked by the tests), and fix the creator. Cairo's SVG
 * names its page group and embedded images after a process-wide counter, so
 * the SVG is built in memory and those ids are renumbered per document
 * before it is written; the map image inside is PNG, without time stamp. PDF
 * sizes are the page in pt; SVG gets the size in pt; PNG is
 * width_mm/25.4·dpi pixels wide, with the page scaled by dpi/72, and is
 * built in memory too so that its resolution can be recorded in a pHYs
 * chunk (plot_png.c), which cairo does not write.
 * dk_plot_write_stream() draws the same bytes into a caller's open stream
 * (a memory buffer, a command's standard output), with no file at all.
 *
 * References:
 *   IEEE Std 1003.1-2017 (POSIX), rename(): atomic replacement of the
 *   target within one file system.
 *   cairo 1.16 API: cairo_pdf_surface_set_metadata,
 *   cairo_svg_surface_set_document_unit, cairo_surface_write_to_png_stream.
 */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include <cairo-pdf.h>
#include <cairo-svg.h>

#include "deltak/safe_write.h"
#include "plot_internal.h"

#define VECTOR_RASTER_PPI 200.0   /* map image resolution in PDF/SVG */
/* The largest PNG drawn: its pixels take 4 bytes each in cairo's image
 * surface and the encoded file is built in memory beside them, so 64
 * megapixels is about 260 MB (an 8000 x 8000 image; a 1 x 1 m figure at
 * 300 dpi would be 139 megapixels and 560 MB). */
#define PNG_MAX_PIXELS 64e6

typedef enum { FMT_PDF, FMT_SVG, FMT_PNG } fmt;

typedef struct sink {
    FILE *fp;
    int err_no;           /* first write error, 0 if none */
} sink;

static cairo_status_t
sink_write(void *closure, const unsigned char *data, unsigned int length)
{
    sink *s = closure;
    if (s->err_no)
        return CAIRO_STATUS_WRITE_ERROR;
    if (fwrite(data, 1, length, s->fp) != length) {
        s->err_no = errno ? errno : EIO;
        return CAIRO_STATUS_WRITE_ERROR;
    }
    return CAIRO_STATUS_SUCCESS;
}

/* SVG goes to memory first, to renumber its ids (see svg_write_stable). */
typedef struct membuf {
    unsigned char *data;
    size_t len, cap;
} membuf;

static cairo_status_t
mem_write(void *closure, const unsigned char *data, unsigned int length)
{
    membuf *m = closure;
    if (m->len + length > m->cap) {
        size_t cap = m->cap ? m->cap : 65536;
        while (cap < m->len + length)
            cap *= 2;
        unsigned char *d = realloc(m->data, cap);
        if (!d)
            return CAIRO_STATUS_NO_MEMORY;
        m->data = d;
        m->cap = cap;
    }
    memcpy(m->data + m->len, data, length);
    m->len += length;
    return CAIRO_STATUS_SUCCESS;
}

/*
 * Write the SVG in @m to @s with cairo's process-wide ids made
 * per-document: cairo names the page group "surfaceN" and embedded images
 * "imageN" after a counter shared by every surface the process has made,
 * so the same figure drawn twice would differ. Each such id (after '"' or
 * '#', which base64 data never contain) is renumbered 1, 2, ... in order
 * of first appearance. Returns a cairo status.
 */
#define SVG_MAX_IDS 64
static cairo_status_t
svg_write_stable(const membuf *m, sink *s)
{
    static const char *const kinds[] = {"surface", "image"};
    unsigned long orig[2][SVG_MAX_IDS];
    int nids[2] = {0, 0};
    size_t done = 0, i = 0;
    while (i < m->len) {
        unsigned char c = m->data[i];
        int kind = -1;
        size_t klen = 0;
        if (c == '"' || c == '#')
            for (int k = 0; k < 2; k++) {
                klen = strlen(kinds[k]);
                if (i + 1 + klen < m->len &&
                    memcmp(m->data + i + 1, kinds[k], klen) == 0 &&
                    m->data[i + 1 + klen] >= '0' &&
                    m->data[i + 1 + klen] <= '9') {
                    kind = k;
                    break;
                }
            }
        if (kind < 0) {
            i++;
            continue;
        }
        size_t j = i + 1 + klen;
        unsigned long v = 0;
        while (j < m->len && m->data[j] >= '0' && m->data[j] <= '9')
            v = 10 * v + (unsigned long)(m->data[j++] - '0');
        int idx = 0;
        while (idx < nids[kind] && orig[kind][idx] != v)
            idx++;
        if (idx == nids[kind]) {
            if (idx == SVG_MAX_IDS)
                return CAIRO_STATUS_NO_MEMORY;
            orig[kind][nids[kind]++] = v;
        }
        char num[32];
        int len = snprintf(num, sizeof num, "%c%s%d", c, kinds[kind],
                           idx + 1);
        cairo_status_t cs = sink_write(s, m->data + done,
                                       (unsigned)(i - done));
        if (cs == CAIRO_STATUS_SUCCESS)
            cs = sink_write(s, (const unsigned char *)num, (unsigned)len);
        if (cs != CAIRO_STATUS_SUCCESS)
            return cs;
        i = done = j;
    }
    return sink_write(s, m->data + done, (unsigned)(m->len - done));
}

/* Write the PNG in @m to @s with its resolution recorded. */
static cairo_status_t
png_write_with_dpi(membuf *m, double dpi, sink *s)
{
    unsigned char room[32] = {0};
    if (mem_write(m, room, sizeof room) != CAIRO_STATUS_SUCCESS)
        return CAIRO_STATUS_NO_MEMORY;
    m->len -= sizeof room; /* keep the room, not the bytes */
    if (plot_png_set_dpi(m->data, &m->len, m->cap, dpi))
        return CAIRO_STATUS_WRITE_ERROR;
    return sink_write(s, m->data, (unsigned)m->len);
}

static int
format_of(const char *path, fmt *f)
{
    const char *slash = strrchr(path, '/');
    const char *base = slash ? slash + 1 : path;
    const char *dot = strrchr(base, '.');
    if (!dot || dot == base)
        return 0;
    if (strcasecmp(dot, ".pdf") == 0)
        *f = FMT_PDF;
    else if (strcasecmp(dot, ".svg") == 0)
        *f = FMT_SVG;
    else if (strcasecmp(dot, ".png") == 0)
        *f = FMT_PNG;
    else
        return 0;
    return 1;
}

/* Map a cairo status to ours, with a message naming @path. */
static dk_status
cairo_failure(cairo_status_t cs, const sink *s, const char *path,
              dk_error *err)
{
    if (cs == CAIRO_STATUS_NO_MEMORY)
        return dk_error_set(err, DK_ENOMEM, "cannot write '%s': out of memory",
                            path);
    if (cs == CAIRO_STATUS_WRITE_ERROR && s->err_no)
        return dk_error_set(err, DK_EIO, "cannot write '%s': %s", path,
                            strerror(s->err_no));
    return dk_error_set(err, DK_EIO, "cannot write '%s': cairo: %s", path,
                        cairo_status_to_string(cs));
}

static cairo_surface_t *
make_surface(fmt f, const plot_layout *L, double scale, sink *s,
             membuf *mem)
{
    switch (f) {
    case FMT_PDF: {
        cairo_surface_t *surf = cairo_pdf_surface_create_for_stream(
            sink_write, s, L->page_w, L->page_h);
#if CAIRO_VERSION >= CAIRO_VERSION_ENCODE(1, 16, 0)
        cairo_pdf_surface_set_metadata(surf, CAIRO_PDF_METADATA_CREATE_DATE,
                                       "");
        cairo_pdf_surface_set_metadata(surf, CAIRO_PDF_METADATA_CREATOR,
                                       "deltak");
#endif
        return surf;
    }
    case FMT_SVG: {
        cairo_surface_t *surf = cairo_svg_surface_create_for_stream(
            mem_write, mem, L->page_w, L->page_h);
#if CAIRO_VERSION >= CAIRO_VERSION_ENCODE(1, 16, 0)
        cairo_svg_surface_set_document_unit(surf, CAIRO_SVG_UNIT_PT);
#endif
        return surf;
    }
    case FMT_PNG:
        return cairo_image_surface_create(CAIRO_FORMAT_RGB24,
                                          (int)lround(L->page_w * scale),
                                          (int)lround(L->page_h * scale));
    }
    return NULL;
}

/*
 * Draw the figure on a fresh context of @target (page pt for PDF and SVG).
 * A PNG is drawn in pt onto a recording surface, which is then replayed
 * onto the pixels at dpi/72: pango sizes <sub>/<sup> text wrongly under a
 * scaled transformation (seen with pango 1.50), and a replay scales the
 * glyphs already laid out. Returns a cairo status; *oom when plot_draw()
 * ran out of memory.
 */
static cairo_status_t
draw_on(const dk_plot *p, const plot_layout *L, fmt f, double scale,
        cairo_surface_t *target, int *oom)
{
    cairo_surface_t *surf = target;
    if (f == FMT_PNG) {
        cairo_rectangle_t ext = {0, 0, L->page_w, L->page_h};
        surf = cairo_recording_surface_create(CAIRO_CONTENT_COLOR_ALPHA,
                                              &ext);
    }
    cairo_t *cr = cairo_create(surf);
    if (cairo_status(cr) == CAIRO_STATUS_SUCCESS)
        *oom = plot_draw(p, L, cr, scale) != 0;
    cairo_status_t cs = cairo_status(cr);
    cairo_destroy(cr);
    if (f != FMT_PNG)
        return cs;
    if (cs == CAIRO_STATUS_SUCCESS && !*oom) {
        cr = cairo_create(target);
        cairo_set_source_rgb(cr, 1, 1, 1);
        cairo_paint(cr);
        cairo_scale(cr, scale, scale);
        cairo_set_source_surface(cr, surf, 0, 0);
        cairo_paint(cr);
        cs = cairo_status(cr);
        cairo_destroy(cr);
    }
    cairo_surface_destroy(surf);
    return cs;
}

/* Draw into an open stream; DK_OK when cairo reports no error. */
static dk_status
render(const dk_plot *p, const plot_layout *L, fmt f, sink *s,
       const char *path, dk_error *err)
{
    double scale = f == FMT_PNG ? p->dpi / 72 : VECTOR_RASTER_PPI / 72;
    if (f == FMT_PNG) {
        double w = lround(L->page_w * scale), h = lround(L->page_h * scale);
        if (w * h > PNG_MAX_PIXELS)
            return dk_error_set(err, DK_EINVAL,
                                "cannot draw '%s': %.0f x %.0f pixels at "
                                "%.0f dpi exceed the PNG budget of %.0f "
                                "megapixels (about %.0f MB); give a smaller "
                                "figure size, or write PDF or SVG",
                                path, w, h, p->dpi, PNG_MAX_PIXELS / 1e6,
                                PNG_MAX_PIXELS * 4 / 1e6);
    }
    membuf mem = {0};
    cairo_surface_t *surf = make_surface(f, L, scale, s, &mem);
    cairo_status_t cs = cairo_surface_status(surf);
    if (cs != CAIRO_STATUS_SUCCESS) {
        cairo_surface_destroy(surf);
        free(mem.data);
        return cairo_failure(cs, s, path, err);
    }
    int oom = 0;
    cs = draw_on(p, L, f, scale, surf, &oom);
    if (cs == CAIRO_STATUS_SUCCESS && !oom) {
        if (f == FMT_PNG)
            cs = cairo_surface_write_to_png_stream(surf, mem_write, &mem);
        else
            cairo_surface_finish(surf);
        if (cs == CAIRO_STATUS_SUCCESS)
            cs = cairo_surface_status(surf);
    }
    cairo_surface_destroy(surf);
    if (f == FMT_SVG && cs == CAIRO_STATUS_SUCCESS && !oom)
        cs = svg_write_stable(&mem, s);
    if (f == FMT_PNG && cs == CAIRO_STATUS_SUCCESS && !oom)
        cs = png_write_with_dpi(&mem, p->dpi, s);
    free(mem.data);
    if (oom)
        return dk_error_set(err, DK_ENOMEM, "cannot draw '%s': out of "
                            "memory", path);
    if (cs != CAIRO_STATUS_SUCCESS)
        return cairo_failure(cs, s, path, err);
    return DK_OK;
}

static dk_status write_layout(const dk_plot *p, const plot_layout *L, fmt f,
                              const char *path, dk_error *err);

dk_status
dk_plot_write(const dk_plot *p, const char *path, dk_error *err)
{
    fmt f;
    if (!path || !format_of(path, &f))
        return dk_error_set(err, DK_EINVAL,
                            "unknown figure format '%s': use a file name "
                            "ending in %s",
                            path ? path : "(null)", DK_PLOT_FORMATS);
    plot_layout L;
    dk_status st = plot_layout_compute(p, &L, err);
    if (st)
        return st;
    st = write_layout(p, &L, f, path, err);
    plot_layout_release(&L);
    return st;
}

dk_status
dk_plot_write_stream(const dk_plot *p, FILE *stream, const char *format,
                     dk_error *err)
{
    static const struct {
        const char *name;
        fmt f;
    } formats[] = {{"pdf", FMT_PDF}, {"svg", FMT_SVG}, {"png", FMT_PNG}};
    if (!stream)
        return dk_error_set(err, DK_EINVAL, "no stream to write the figure "
                                            "into");
    size_t i = 0;
    while (format && i < sizeof formats / sizeof formats[0] &&
           strcasecmp(format, formats[i].name) != 0)
        i++;
    if (!format || i == sizeof formats / sizeof formats[0])
        return dk_error_set(err, DK_EINVAL,
                            "unknown figure format '%s': use pdf, svg or png",
                            format ? format : "(null)");
    plot_layout L;
    dk_status st = plot_layout_compute(p, &L, err);
    if (st)
        return st;
    sink s = {stream, 0};
    st = render(p, &L, formats[i].f, &s, "the figure", err);
    plot_layout_release(&L);
    if (!st && fflush(stream) != 0)
        st = dk_error_set(err, DK_EIO, "cannot write the figure: %s",
                          strerror(errno ? errno : EIO));
    return st;
}

/* The file part of dk_plot_write(), once the figure is laid out. */
static dk_status
write_layout(const dk_plot *p, const plot_layout *L, fmt f, const char *path,
             dk_error *err)
{
    dk_status st;

    dk_safe_file *out = NULL;
    if ((st = dk_safe_write_open(path, &out, err)))
        return st;
    sink s = {dk_safe_write_stream(out), 0};
    st = render(p, L, f, &s, path, err);
    if (st) {
        dk_safe_write_abort(out);
        return st;
    }
    return dk_safe_write_commit(out, err);
}
