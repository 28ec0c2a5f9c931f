/*
 * plot.c - the figure record: sizes, building a figure, and the checks
 * made when data are handed in (public API in deltak/plot.h).
 *
 * Everything the caller hands in is copied, so the caller's arrays may be
 * freed at once. Label markup is parsed with pango when it is set, so a
 * bad label fails where it was given rather than at drawing time.
 * Figure sizes are mm, in [DK_PLOT_MIN_MM, DK_PLOT_MAX_MM]. The default
 * type size follows the figure: 8 pt from 85 to 180 mm width (journal
 * figures are printed at 7-9 pt, common practice); wider, it grows by
 * 10 pt per 74 mm, to 18 pt on a 254 mm slide (slide text is read from a
 * few metres and is set at 18 pt or more, common practice); smaller, it
 * shrinks with the smaller of width/85 mm and height/64 mm down to 5 pt
 * (the smallest type journals accept is 5-6 pt, common practice).
 *
 * The layout lives in plot_layout.c (with plot_axes.c and plot_place.c),
 * the drawing in plot_draw.c, the output in plot_write.c; see
 * plot_internal.h for how the files depend on each other.
 *
 * References: see deltak/plot.h.
 */
#include <ctype.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "plot_internal.h"

#define DEFAULT_DPI 300.0
#define DEFAULT_FONT_PT 8.0
#define FONT_GROWS_FROM_MM 180.0   /* wider figures get larger type, */
#define FONT_GROWTH_PT_PER_MM (10.0 / 74.0) /* 18 pt at 254 mm */
#define FONT_SHRINKS_BELOW_W 85.0  /* smaller figures smaller type, */
#define FONT_SHRINKS_BELOW_H 64.0
#define MIN_DEFAULT_FONT_PT 5.0
#define MIN_FONT_PT 4.0
#define MAX_FONT_PT 48.0
#define MIN_DPI 36.0
#define MAX_DPI 1200.0
#define MAX_MAP_POINTS (1L << 24)

static const dk_plot_size PRESETS[] = {
    {"single", DK_PLOT_SINGLE_COLUMN_MM, 64.0, "one journal column"},
    {"double", DK_PLOT_DOUBLE_COLUMN_MM, 105.0, "full page width"},
    {"slide", DK_PLOT_SLIDE_WIDTH_MM, DK_PLOT_SLIDE_HEIGHT_MM,
     "16:9 presentation slide"},
};
#define NPRESETS ((int)(sizeof PRESETS / sizeof PRESETS[0]))

const dk_plot_size *
dk_plot_size_presets(int *n)
{
    if (n)
        *n = NPRESETS;
    return PRESETS;
}

static int
size_ok(double w, double h)
{
    return w >= DK_PLOT_MIN_MM && w <= DK_PLOT_MAX_MM &&
           h >= DK_PLOT_MIN_MM && h <= DK_PLOT_MAX_MM;
}

static const char *
skip_space(const char *s)
{
    while (*s && isspace((unsigned char)*s))
        s++;
    return s;
}

/* One positive number in mm, with an optional "mm" after it. */
static const char *
parse_mm(const char *s, double *v)
{
    char *end;
    s = skip_space(s);
    if (!(isdigit((unsigned char)*s) || *s == '.'))
        return NULL;
    *v = strtod(s, &end);
    if (end == s)
        return NULL;
    s = skip_space(end);
    if (strncasecmp(s, "mm", 2) == 0)
        s = skip_space(s + 2);
    return s;
}

dk_status
dk_plot_size_parse(const char *text, double *width_mm, double *height_mm,
                   dk_error *err)
{
    static const char forms[] =
        "give a size in mm as WxH (e.g. 85x60) or one of single (85x64), "
        "double (175x105), slide (254x143)";
    if (!text)
        return dk_error_set(err, DK_EINVAL, "missing figure size: %s", forms);
    const char *s = skip_space(text);
    for (int i = 0; i < NPRESETS; i++) {
        size_t len = strlen(PRESETS[i].name);
        if (strncasecmp(s, PRESETS[i].name, len) == 0 &&
            *skip_space(s + len) == '\0') {
            *width_mm = PRESETS[i].width_mm;
            *height_mm = PRESETS[i].height_mm;
            return DK_OK;
        }
    }
    double w, h;
    const char *p = parse_mm(s, &w);
    if (p && (*p == 'x' || *p == 'X'))
        p++;
    else if (p && strncmp(p, "\xc3\x97", 2) == 0) /* U+00D7 × */
        p += 2;
    else
        p = NULL;
    if (p)
        p = parse_mm(p, &h);
    if (!p || *p != '\0')
        return dk_error_set(err, DK_EINVAL, "cannot read figure size '%s': %s",
                            text, forms);
    if (!size_ok(w, h))
        return dk_error_set(err, DK_EINVAL,
                            "figure size '%s' out of range: each side must "
                            "lie in %g-%g mm",
                            text, DK_PLOT_MIN_MM, DK_PLOT_MAX_MM);
    *width_mm = w;
    *height_mm = h;
    return DK_OK;
}

dk_status
dk_plot_new(double width_mm, double height_mm, dk_plot **plot, dk_error *err)
{
    *plot = NULL;
    if (!size_ok(width_mm, height_mm))
        return dk_error_set(err, DK_EINVAL,
                            "figure size %g x %g mm out of range: each side "
                            "must lie in %g-%g mm",
                            width_mm, height_mm, DK_PLOT_MIN_MM,
                            DK_PLOT_MAX_MM);
    dk_plot *p = calloc(1, sizeof *p);
    if (!p)
        return dk_error_set(err, DK_ENOMEM, "out of memory for a figure");
    p->width_mm = width_mm;
    p->height_mm = height_mm;
    p->font_pt = DEFAULT_FONT_PT;
    if (width_mm > FONT_GROWS_FROM_MM)
        p->font_pt += (width_mm - FONT_GROWS_FROM_MM) * FONT_GROWTH_PT_PER_MM;
    double shrink = fmin(width_mm / FONT_SHRINKS_BELOW_W,
                         height_mm / FONT_SHRINKS_BELOW_H);
    if (shrink < 1)
        p->font_pt = fmax(MIN_DEFAULT_FONT_PT, DEFAULT_FONT_PT * shrink);
    if (p->font_pt > MAX_FONT_PT)
        p->font_pt = MAX_FONT_PT;
    p->dpi = DEFAULT_DPI;
    p->xlo = p->xhi = p->ylo = p->yhi = NAN;
    p->zlo = p->zhi = NAN;
    p->legend = DK_PLOT_LEGEND_AUTO;
    *plot = p;
    return DK_OK;
}

static void
map_free(plot_map *m)
{
    if (!m)
        return;
    free(m->z);
    free(m->flags);
    free(m->label);
    free(m->blank_label);
    free(m);
}

void
dk_plot_free(dk_plot *p)
{
    if (!p)
        return;
    free(p->xlabel);
    free(p->ylabel);
    free(p->toplabel);
    free(p->title);
    for (size_t i = 0; i < p->nseries; i++) {
        free(p->series[i].x);
        free(p->series[i].y);
        free(p->series[i].flags);
        free(p->series[i].label);
    }
    free(p->series);
    for (size_t i = 0; i < p->nmarkers; i++)
        free(p->markers[i].label);
    free(p->markers);
    for (size_t i = 0; i < p->nbands; i++)
        free(p->bands[i].label);
    free(p->bands);
    for (size_t i = 0; i < p->nregions; i++)
        free(p->regions[i].label);
    free(p->regions);
    for (size_t i = 0; i < p->nnotes; i++)
        free(p->notes[i]);
    free(p->notes);
    for (size_t i = 0; i < p->nbranches; i++)
        free(p->branches[i].label);
    free(p->branches);
    for (int i = 0; i < p->ncontours; i++)
        free(p->contours[i].label);
    map_free(p->map);
    free(p);
}

/*
 * Check @markup with pango and copy it into *out (NULL for NULL or "").
 * *out is untouched on error.
 */
static dk_status
markup_copy(const char *markup, char **out, dk_error *err)
{
    if (!markup || !*markup) {
        *out = NULL;
        return DK_OK;
    }
    GError *gerr = NULL;
    if (!pango_parse_markup(markup, -1, 0, NULL, NULL, NULL, &gerr)) {
        dk_status s = dk_error_set(err, DK_EINVAL,
                                   "malformed label markup '%s': %s", markup,
                                   gerr ? gerr->message : "unknown reason");
        if (gerr)
            g_error_free(gerr);
        return s;
    }
    char *c = strdup(markup);
    if (!c)
        return dk_error_set(err, DK_ENOMEM, "out of memory for a label");
    *out = c;
    return DK_OK;
}

/* Replace *slot by a checked copy of @markup. */
static dk_status
markup_replace(char **slot, const char *markup, dk_error *err)
{
    char *c;
    dk_status s = markup_copy(markup, &c, err);
    if (s)
        return s;
    free(*slot);
    *slot = c;
    return DK_OK;
}

dk_status
dk_plot_set_xlabel(dk_plot *p, const char *markup, dk_error *err)
{
    return markup_replace(&p->xlabel, markup, err);
}

dk_status
dk_plot_set_ylabel(dk_plot *p, const char *markup, dk_error *err)
{
    return markup_replace(&p->ylabel, markup, err);
}

dk_status
dk_plot_set_title(dk_plot *p, const char *markup, dk_error *err)
{
    return markup_replace(&p->title, markup, err);
}

/* A range that a logarithmic axis cannot show. */
static dk_status
log_range_check(const char *what, int log, double lo, dk_error *err)
{
    if (log && !isnan(lo) && !(lo > 0))
        return dk_error_set(err, DK_EINVAL,
                            "%s range from %g cannot be shown on a "
                            "logarithmic axis: give a range above zero or "
                            "use a linear axis",
                            what, lo);
    return DK_OK;
}

dk_status
dk_plot_set_log(dk_plot *p, int x_log, int y_log, dk_error *err)
{
    dk_status s = log_range_check("x", x_log, p->xlo, err);
    if (!s)
        s = log_range_check("y", y_log, p->ylo, err);
    if (s)
        return s;
    p->xlog = x_log != 0;
    p->ylog = y_log != 0;
    return DK_OK;
}

/* A range: both NaN (automatic), or finite with lo < hi. */
static dk_status
range_check(const char *what, double lo, double hi, dk_error *err)
{
    if (isnan(lo) && isnan(hi))
        return DK_OK;
    if (!(isfinite(lo) && isfinite(hi) && lo < hi))
        return dk_error_set(err, DK_EINVAL,
                            "%s range %g..%g must be finite with low < high "
                            "(or both NaN for automatic)",
                            what, lo, hi);
    return DK_OK;
}

dk_status
dk_plot_set_xrange(dk_plot *p, double lo, double hi, dk_error *err)
{
    dk_status s = range_check("x", lo, hi, err);
    if (!s)
        s = log_range_check("x", p->xlog, lo, err);
    if (s)
        return s;
    p->xlo = lo;
    p->xhi = hi;
    return DK_OK;
}

dk_status
dk_plot_set_yrange(dk_plot *p, double lo, double hi, dk_error *err)
{
    dk_status s = range_check("y", lo, hi, err);
    if (!s)
        s = log_range_check("y", p->ylog, lo, err);
    if (s)
        return s;
    p->ylo = lo;
    p->yhi = hi;
    return DK_OK;
}

dk_status
dk_plot_set_zrange(dk_plot *p, double lo, double hi, dk_error *err)
{
    dk_status s = range_check("colour", lo, hi, err);
    if (s)
        return s;
    p->zlo = lo;
    p->zhi = hi;
    return DK_OK;
}

dk_status
dk_plot_set_font_size_pt(dk_plot *p, double size_pt, dk_error *err)
{
    if (!(size_pt >= MIN_FONT_PT && size_pt <= MAX_FONT_PT))
        return dk_error_set(err, DK_EINVAL,
                            "type size %g pt must lie in %g-%g pt", size_pt,
                            MIN_FONT_PT, MAX_FONT_PT);
    p->font_pt = size_pt;
    return DK_OK;
}

dk_status
dk_plot_set_png_dpi(dk_plot *p, double dpi, dk_error *err)
{
    if (!(dpi >= MIN_DPI && dpi <= MAX_DPI))
        return dk_error_set(err, DK_EINVAL, "resolution %g dpi must lie in "
                            "%g-%g dpi", dpi, MIN_DPI, MAX_DPI);
    p->dpi = dpi;
    return DK_OK;
}

/* Room for one more element in the array @arr of @n (capacity *cap):
 * the array, moved if need be, or NULL (then @arr is still valid). */
static void *
grow(void *arr, size_t *cap, size_t n, size_t elem)
{
    if (n < *cap)
        return arr;
    size_t c = *cap ? 2 * *cap : 4;
    void *a = realloc(arr, c * elem);
    if (a)
        *cap = c;
    return a;
}

dk_status
dk_plot_add_line_flagged(dk_plot *p, const double *x, const double *y,
                         const unsigned char *flags, size_t n,
                         const char *label, dk_error *err)
{
    const char *name = label ? label : "(unlabelled)";
    if (!x || !y || n == 0)
        return dk_error_set(err, DK_EINVAL, "empty series '%s': no points",
                            name);
    size_t finite = 0;
    for (size_t i = 0; i < n; i++) {
        finite += isfinite(x[i]) && isfinite(y[i]);
        if (flags && (flags[i] & ~DK_PLOT_FLAG_OUTSIDE_FIT))
            return dk_error_set(err, DK_EINVAL,
                                "series '%s': point %zu has flag 0x%x; a "
                                "line takes only DK_PLOT_FLAG_OUTSIDE_FIT",
                                name, i, (unsigned)flags[i]);
    }
    if (finite == 0)
        return dk_error_set(err, DK_EINVAL,
                            "series '%s' has no finite point", name);
    char *lab;
    dk_status s = markup_copy(label, &lab, err);
    if (s)
        return s;
    double *cx = malloc(n * sizeof *cx), *cy = malloc(n * sizeof *cy);
    unsigned char *cf = flags ? malloc(n) : NULL;
    plot_series *arr = grow(p->series, &p->capseries, p->nseries,
                            sizeof *p->series);
    if (arr)
        p->series = arr;
    if (!cx || !cy || !arr || (flags && !cf)) {
        free(cx);
        free(cy);
        free(cf);
        free(lab);
        return dk_error_set(err, DK_ENOMEM, "out of memory for series '%s'",
                            name);
    }
    memcpy(cx, x, n * sizeof *cx);
    memcpy(cy, y, n * sizeof *cy);
    if (cf)
        memcpy(cf, flags, n);
    p->series[p->nseries++] = (plot_series){cx, cy, n, lab, cf};
    return DK_OK;
}

dk_status
dk_plot_add_line(dk_plot *p, const double *x, const double *y, size_t n,
                 const char *label, dk_error *err)
{
    return dk_plot_add_line_flagged(p, x, y, NULL, n, label, err);
}

size_t
dk_plot_series_count(const dk_plot *p)
{
    return p->nseries;
}

dk_status
dk_plot_label_branch(dk_plot *p, size_t series, int branch,
                     const char *markup, dk_error *err)
{
    if (series >= p->nseries)
        return dk_error_set(err, DK_EINVAL,
                            "no line %zu to label: the figure has %zu "
                            "(counted from 0)",
                            series, p->nseries);
    if (branch < 0)
        return dk_error_set(err, DK_EINVAL,
                            "branch %d: branches count from 0", branch);
    if (!markup || !*markup)
        return dk_error_set(err, DK_EINVAL, "a branch label needs text");
    char *lab;
    dk_status s = markup_copy(markup, &lab, err);
    if (s)
        return s;
    plot_branch_label *arr = grow(p->branches, &p->capbranches, p->nbranches,
                                  sizeof *p->branches);
    if (!arr) {
        free(lab);
        return dk_error_set(err, DK_ENOMEM, "out of memory for a label");
    }
    p->branches = arr;
    p->branches[p->nbranches++] = (plot_branch_label){series, branch, lab};
    return DK_OK;
}

dk_status
dk_plot_add_marker(dk_plot *p, double x, double y, const char *label,
                   dk_error *err)
{
    if (!(isfinite(x) && isfinite(y)))
        return dk_error_set(err, DK_EINVAL,
                            "marker position (%g, %g) must be finite", x, y);
    char *lab;
    dk_status s = markup_copy(label, &lab, err);
    if (s)
        return s;
    plot_marker *arr = grow(p->markers, &p->capmarkers, p->nmarkers,
                            sizeof *p->markers);
    if (!arr) {
        free(lab);
        return dk_error_set(err, DK_ENOMEM, "out of memory for a marker");
    }
    p->markers = arr;
    p->markers[p->nmarkers++] = (plot_marker){x, y, lab};
    return DK_OK;
}

dk_status
dk_plot_add_band(dk_plot *p, double x0, double x1, const char *label,
                 dk_error *err)
{
    if (!(isfinite(x0) && isfinite(x1) && x0 != x1))
        return dk_error_set(err, DK_EINVAL,
                            "band %g..%g must have finite, distinct edges",
                            x0, x1);
    char *lab;
    dk_status s = markup_copy(label, &lab, err);
    if (s)
        return s;
    plot_band *arr = grow(p->bands, &p->capbands, p->nbands,
                          sizeof *p->bands);
    if (!arr) {
        free(lab);
        return dk_error_set(err, DK_ENOMEM, "out of memory for a band");
    }
    p->bands = arr;
    p->bands[p->nbands++] = (plot_band){fmin(x0, x1), fmax(x0, x1), lab};
    return DK_OK;
}

dk_status
dk_plot_add_region(dk_plot *p, dk_plot_axis axis, double lo, double hi,
                   const char *label, dk_error *err)
{
    if (axis != DK_PLOT_X_AXIS && axis != DK_PLOT_Y_AXIS)
        return dk_error_set(err, DK_EINVAL, "region axis must be "
                            "DK_PLOT_X_AXIS or DK_PLOT_Y_AXIS");
    if (isnan(lo) || isnan(hi) || !(lo < hi))
        return dk_error_set(err, DK_EINVAL,
                            "region %g..%g must have low < high (infinite "
                            "ends reach the axis end)",
                            lo, hi);
    char *lab;
    dk_status s = markup_copy(label, &lab, err);
    if (s)
        return s;
    plot_region *arr = grow(p->regions, &p->capregions, p->nregions,
                            sizeof *p->regions);
    if (!arr) {
        free(lab);
        return dk_error_set(err, DK_ENOMEM, "out of memory for a region");
    }
    p->regions = arr;
    p->regions[p->nregions++] = (plot_region){axis, lo, hi, lab};
    return DK_OK;
}

dk_status
dk_plot_add_note(dk_plot *p, const char *markup, dk_error *err)
{
    if (!markup || !*markup)
        return dk_error_set(err, DK_EINVAL, "a figure note needs text");
    if (p->nnotes >= DK_PLOT_MAX_NOTES)
        return dk_error_set(err, DK_EINVAL, "a figure takes at most %d notes",
                            DK_PLOT_MAX_NOTES);
    char *text;
    dk_status s = markup_copy(markup, &text, err);
    if (s)
        return s;
    char **arr = grow(p->notes, &p->capnotes, p->nnotes, sizeof *p->notes);
    if (!arr) {
        free(text);
        return dk_error_set(err, DK_ENOMEM, "out of memory for a note");
    }
    p->notes = arr;
    p->notes[p->nnotes++] = text;
    return DK_OK;
}

dk_status
dk_plot_set_top_axis(dk_plot *p, dk_plot_transform to_top,
                     dk_plot_transform from_top, void *params,
                     const char *label, dk_error *err)
{
    if (!to_top) {
        p->to_top = p->from_top = NULL;
        p->top_params = NULL;
        free(p->toplabel);
        p->toplabel = NULL;
        return DK_OK;
    }
    if (!from_top)
        return dk_error_set(err, DK_EINVAL,
                            "top axis needs both the transform and its "
                            "inverse");
    dk_status s = markup_replace(&p->toplabel, label, err);
    if (s)
        return s;
    p->to_top = to_top;
    p->from_top = from_top;
    p->top_params = params;
    return DK_OK;
}

double
dk_plot_um_to_per_cm(double um, void *params)
{
    (void)params;
    return 1e4 / um;
}

double
dk_plot_per_cm_to_um(double per_cm, void *params)
{
    (void)params;
    return 1e4 / per_cm;
}

void
dk_plot_set_legend(dk_plot *p, dk_plot_legend where)
{
    p->legend = where;
}

dk_status
dk_plot_set_map(dk_plot *p, const double *z, int nx, int ny, double x0,
                double x1, double y0, double y1, const char *z_label,
                dk_error *err)
{
    if (!z)
        return dk_error_set(err, DK_EINVAL, "map has no data");
    if (nx < 2 || ny < 2 || (long)nx * ny > MAX_MAP_POINTS)
        return dk_error_set(err, DK_EINVAL,
                            "map grid %d x %d must be at least 2 x 2 and at "
                            "most %ld points",
                            nx, ny, MAX_MAP_POINTS);
    if (!(isfinite(x0) && isfinite(x1) && isfinite(y0) && isfinite(y1) &&
          x0 != x1 && y0 != y1))
        return dk_error_set(err, DK_EINVAL,
                            "map extent x %g..%g, y %g..%g must be finite "
                            "and not empty",
                            x0, x1, y0, y1);
    size_t n = (size_t)nx * (size_t)ny, finite = 0;
    for (size_t i = 0; i < n; i++)
        finite += isfinite(z[i]) != 0;
    if (finite == 0)
        return dk_error_set(err, DK_EINVAL, "map has no finite value");
    plot_map *m = calloc(1, sizeof *m);
    if (!m)
        return dk_error_set(err, DK_ENOMEM, "out of memory for a map");
    dk_status s = markup_copy(z_label, &m->label, err);
    if (s) {
        free(m);
        return s;
    }
    m->z = malloc(n * sizeof *m->z);
    if (!m->z) {
        map_free(m);
        return dk_error_set(err, DK_ENOMEM, "out of memory for a %d x %d map",
                            nx, ny);
    }
    memcpy(m->z, z, n * sizeof *m->z);
    m->nx = nx;
    m->ny = ny;
    m->x0 = x0, m->x1 = x1, m->y0 = y0, m->y1 = y1;
    map_free(p->map);
    p->map = m;
    return DK_OK;
}

dk_status
dk_plot_set_map_flags(dk_plot *p, const unsigned char *flags,
                      const char *blank_label, dk_error *err)
{
    plot_map *m = p->map;
    if (!m)
        return dk_error_set(err, DK_EINVAL, "map flags need a map: call "
                            "dk_plot_set_map() first");
    size_t n = (size_t)m->nx * (size_t)m->ny;
    const unsigned known = DK_PLOT_FLAG_OUTSIDE_FIT |
                           DK_PLOT_FLAG_NOT_TRANSPARENT;
    for (size_t i = 0; flags && i < n; i++)
        if (flags[i] & ~known)
            return dk_error_set(err, DK_EINVAL,
                                "map point %zu has unknown flag 0x%x", i,
                                (unsigned)flags[i]);
    char *lab;
    dk_status s = markup_copy(blank_label, &lab, err);
    if (s)
        return s;
    unsigned char *c = NULL;
    if (flags && !(c = malloc(n))) {
        free(lab);
        return dk_error_set(err, DK_ENOMEM, "out of memory for map flags");
    }
    if (c)
        memcpy(c, flags, n);
    free(m->flags);
    free(m->blank_label);
    m->flags = c;
    m->blank_label = lab;
    return DK_OK;
}

dk_status
dk_plot_add_contour(dk_plot *p, double level, const char *label,
                    dk_error *err)
{
    if (!isfinite(level))
        return dk_error_set(err, DK_EINVAL, "contour level must be finite");
    if (p->ncontours >= PLOT_MAX_CONTOURS)
        return dk_error_set(err, DK_EINVAL, "at most %d contour levels",
                            PLOT_MAX_CONTOURS);
    char *lab;
    dk_status s = markup_copy(label, &lab, err);
    if (s)
        return s;
    p->contours[p->ncontours++] = (plot_contour){level, lab};
    return DK_OK;
}

dk_status
dk_plot_data_to_pixel(const dk_plot *p, double x, double y, double *px,
                      double *py, dk_error *err)
{
    if (!(isfinite(x) && isfinite(y)))
        return dk_error_set(err, DK_EINVAL, "point (%g, %g) must be finite",
                            x, y);
    plot_layout L;
    dk_status s = plot_layout_compute(p, &L, err);
    if (s)
        return s;
    double scale = p->dpi / 72;
    *px = plot_x_pt(&L, x) * scale;
    *py = plot_y_pt(&L, y) * scale;
    plot_layout_release(&L);
    if (!(isfinite(*px) && isfinite(*py)))
        return dk_error_set(err, DK_EINVAL, "point (%g, %g) has no place on "
                            "a logarithmic axis", x, y);
    return DK_OK;
}
