/*
 * test_plot.c - figures (deltak/plot.h): ticks, sizes, colour science,
 * contours, pixel placement, file formats, determinism, error paths.
 *
 * Checks against the outside world name their source beside them; the
 * rest check the drawing against its own data-to-pixel map, or are
 * round trips.
 */
#include "testutil.h"

#include <dirent.h>
#include <errno.h>
#include <sys/stat.h>
#include <unistd.h>

#include "deltak/plot.h"
#include "figures/plot_internal.h"

static char tmpdir[64];

/*
 * LeakSanitizer's documented hook for built-in suppressions (read only
 * when the tests run under -fsanitize=address): fontconfig keeps 288
 * bytes of its parsed configuration for the life of the process
 * (allocated inside FcInitLoadConfigAndFonts, freed only by FcFini, which
 * pango never calls). The sanitizer's fast unwinder sees only the
 * allocating library, so the suppression names it; the library never
 * calls fontconfig itself, so nothing of ours is hidden.
 */
const char *__lsan_default_suppressions(void);
__attribute__((used)) const char *
__lsan_default_suppressions(void)
{
    return "leak:libfontconfig.so\n";
}

static int
setup(void **state)
{
    (void)state;
    snprintf(tmpdir, sizeof tmpdir, "/tmp/dk-test-plot-XXXXXX");
    return mkdtemp(tmpdir) ? 0 : -1;
}

/* Remove the files (and empty folders) of tmpdir, then tmpdir. */
static void
clean_dir(const char *dir)
{
    DIR *d = opendir(dir);
    if (!d)
        return;
    struct dirent *e;
    char path[512];
    while ((e = readdir(d))) {
        if (strcmp(e->d_name, ".") == 0 || strcmp(e->d_name, "..") == 0)
            continue;
        snprintf(path, sizeof path, "%s/%s", dir, e->d_name);
        struct stat st;
        if (stat(path, &st) == 0 && S_ISDIR(st.st_mode)) {
            chmod(path, 0755);
            clean_dir(path);
        } else {
            unlink(path);
        }
    }
    closedir(d);
    rmdir(dir);
}

static int
teardown(void **state)
{
    (void)state;
    clean_dir(tmpdir);
    /* Let go of pango's font map and cairo's caches, so that the leak
     * checker sees only what the library itself keeps. */
    pango_cairo_font_map_set_default(NULL);
    cairo_debug_reset_static_data();
    return 0;
}

static void
path_in(char *buf, size_t size, const char *name)
{
    snprintf(buf, size, "%s/%s", tmpdir, name);
}

static dk_plot *
new_plot(double w, double h)
{
    dk_plot *p;
    dk_error err = {0};
    if (dk_plot_new(w, h, &p, &err))
        fail_msg("%s", err.msg);
    return p;
}

/* Run @call, which reports into OKERR, and fail with its message. */
#define OK(call)                                                              \
    do {                                                                      \
        dk_error ok_err_ = {0};                                               \
        if ((call) != DK_OK)                                                  \
            fail_msg("%s: %s", #call, ok_err_.msg);                           \
    } while (0)
#define OKERR (&ok_err_)

/* ---- Ticks ----------------------------------------------------------- */

/* 1-2-5 steps, the most that fit (Heckbert 1990's nice numbers; the
 * expected lists are common practice for axis labelling). */
static void
nice_ticks_table(void **state)
{
    (void)state;
    static const struct {
        double lo, hi;
        int max;
        int n;
        double first, step;
    } cases[] = {
        {0, 7.3, 8, 8, 0, 1},          /* 0, 1, ..., 7 */
        {0, 7.3, 5, 4, 0, 2},          /* 0, 2, 4, 6 */
        {28, 32, 8, 5, 28, 1},         /* 28, 29, ..., 32 */
        {28, 32, 10, 9, 28, 0.5},
        {0, 1, 6, 6, 0, 0.2},
        {-0.35, 0.35, 8, 7, -0.3, 0.1},
        {2174, 3846, 10, 9, 2200, 200}, /* wavenumbers of 2.6-4.6 µm */
        {1e-6, 5e-6, 8, 5, 1e-6, 1e-6},
        {0.999, 1.001, 6, 5, 0.999, 5e-4},
        {-40, -10, 4, 4, -40, 10},
        {3.05, 3.15, 3, 3, 3.05, 0.05}, /* both ends are ticks */
        {3.05, 3.15, 2, 1, 3.1, 0.1},   /* a short range: one tick */
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        double t[DK_PLOT_MAX_TICKS], step;
        int n;
        dk_error err = {0};
        assert_int_equal(dk_plot_nice_ticks(cases[i].lo, cases[i].hi,
                                            cases[i].max, t, &n, &step, &err),
                         DK_OK);
        if (n != cases[i].n)
            fail_msg("case %zu: %d ticks, expected %d", i, n, cases[i].n);
        assert_within(step, cases[i].step, 1e-12, 0);
        for (int k = 0; k < n; k++) {
            assert_within(t[k], cases[i].first + k * cases[i].step, 1e-12,
                          1e-15);
            assert_true(t[k] >= cases[i].lo - 1e-9 * step);
            assert_true(t[k] <= cases[i].hi + 1e-9 * step);
        }
    }
    /* Ticks are the doubles nearest the decimals (no 0.30000000000000004). */
    double t[DK_PLOT_MAX_TICKS];
    int n;
    assert_int_equal(dk_plot_nice_ticks(0, 1, 11, t, &n, NULL, NULL), DK_OK);
    assert_int_equal(n, 11);
    assert_true(t[3] == 0.3);
    assert_true(t[7] == 0.7);
    assert_int_equal(dk_plot_nice_ticks(-1, 1, 3, t, &n, NULL, NULL), DK_OK);
    assert_true(t[1] == 0 && !signbit(t[1]));
}

static void
nice_ticks_errors(void **state)
{
    (void)state;
    double t[DK_PLOT_MAX_TICKS];
    int n;
    dk_error err = {0};
    assert_int_equal(dk_plot_nice_ticks(1, 1, 5, t, &n, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_nice_ticks(2, 1, 5, t, &n, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_nice_ticks(NAN, 1, 5, t, &n, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_nice_ticks(0, INFINITY, 5, t, &n, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_nice_ticks(0, 1, 1, t, &n, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_nice_ticks(0, 1, DK_PLOT_MAX_TICKS + 1, t, &n,
                                        NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_nice_ticks(1, 1 + 1e-15, 5, t, &n, NULL, &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "too narrow"));
}

/* Labels: decimals as the step needs, U+2212 minus, m×10^k for extreme
 * steps (common typographic practice). */
static void
tick_labels(void **state)
{
    (void)state;
    static const struct {
        double v, step;
        const char *text;
    } cases[] = {
        {0, 0.5, "0"},
        {0.5, 0.5, "0.5"},
        {1, 0.5, "1.0"},
        {28, 1, "28"},
        {0.05, 0.05, "0.05"},
        {-1, 1, "\xe2\x88\x92" "1"},
        {2500, 500, "2500"},
        {2e5, 1e5, "2\xc3\x97" "10<sup>5</sup>"},
        {1e5, 1e5, "10<sup>5</sup>"},
        {1.5e5, 5e5 / 10, "150000"},
        {3e-5, 1e-5, "3\xc3\x97" "10<sup>\xe2\x88\x92" "5</sup>"},
        {-2e-5, 1e-5, "\xe2\x88\x92" "2\xc3\x97" "10<sup>\xe2\x88\x92"
                      "5</sup>"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        char buf[64];
        plot_tick_label(cases[i].v, cases[i].step, buf, sizeof buf);
        if (strcmp(buf, cases[i].text) != 0)
            fail_msg("label of %g (step %g) is '%s', expected '%s'",
                     cases[i].v, cases[i].step, buf, cases[i].text);
        /* Every label is valid pango markup. */
        assert_true(pango_parse_markup(buf, -1, 0, NULL, NULL, NULL, NULL));
    }
}

/* ---- Sizes ----------------------------------------------------------- */

/* Column widths: 85 mm single, 175 mm double, 16:9 slide (common
 * practice of journals and presentation software). */
static void
sizes(void **state)
{
    (void)state;
    static const struct {
        const char *text;
        double w, h;
    } good[] = {
        {"85x60", 85, 60},         {"85X60", 85, 60},
        {"85 x 60 mm", 85, 60},    {"85mm x 60mm", 85, 60},
        {"85\xc3\x97" "60", 85, 60}, {"120.5x80", 120.5, 80},
        {"single", 85, 64},        {"SLIDE", 254, 143},
        {" double ", 175, 105},    {"20x1000", 20, 1000},
    };
    for (size_t i = 0; i < sizeof good / sizeof good[0]; i++) {
        double w = 0, h = 0;
        dk_error err = {0};
        if (dk_plot_size_parse(good[i].text, &w, &h, &err))
            fail_msg("'%s': %s", good[i].text, err.msg);
        assert_within(w, good[i].w, 0, 1e-12);
        assert_within(h, good[i].h, 0, 1e-12);
    }
    static const char *const bad[] = {"85",      "x60",    "85x",
                                      "abc",     "10x60",  "85x60cm",
                                      "85x60x3", "-85x60", "85x2000",
                                      "",        "singles"};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        double w = -1, h = -1;
        dk_error err = {0};
        if (dk_plot_size_parse(bad[i], &w, &h, &err) != DK_EINVAL)
            fail_msg("'%s' was accepted", bad[i]);
        assert_true(w == -1 && h == -1);
        assert_true(strlen(err.msg) > 0);
    }
    dk_error err = {0};
    double w, h;
    assert_int_equal(dk_plot_size_parse(NULL, &w, &h, &err), DK_EINVAL);
    int n;
    const dk_plot_size *pre = dk_plot_size_presets(&n);
    assert_int_equal(n, 3);
    assert_within(pre[0].width_mm, DK_PLOT_SINGLE_COLUMN_MM, 0, 0);
    assert_within(pre[1].width_mm, DK_PLOT_DOUBLE_COLUMN_MM, 0, 0);
    assert_within(pre[2].width_mm / pre[2].height_mm, 16.0 / 9, 0.005, 0);

    dk_plot *p;
    assert_int_equal(dk_plot_new(0, 60, &p, &err), DK_EINVAL);
    assert_null(p);
    assert_int_equal(dk_plot_new(85, 5000, &p, &err), DK_EINVAL);
    assert_int_equal(dk_plot_new(NAN, 60, &p, &err), DK_EINVAL);
    dk_plot_free(NULL);
}

/* ---- Colour ---------------------------------------------------------- */

/* The sRGB transfer curve and its inverse (IEC 61966-2-1), for [0, 1]. */
static double
decode(double c)
{
    return c <= 0.04045 ? c / 12.92 : pow((c + 0.055) / 1.055, 2.4);
}

static double
encode(double c)
{
    return c <= 0.0031308 ? 12.92 * c : 1.055 * pow(c, 1 / 2.4) - 0.055;
}


/* CIELAB ↔ sRGB against python3-colorspacious 1.1.2 (Debian), which
 * implements the same IEC 61966-2-1 matrix and CIE 15 formulas
 * independently: cspace_convert(..., "CIELab", "sRGB1") and back. */
static void
lab_srgb_reference(void **state)
{
    (void)state;
    static const struct {
        double lab[3], rgb[3];
        int in_gamut;
    } cases[] = {
        {{50, 0, 0}, {0.466327, 0.466343, 0.466291}, 1},
        {{75, -20, 40}, {0.680280, 0.757718, 0.427756}, 1},
        {{30, 20, -50}, {0.121368, 0.254189, 0.586260}, 1},
        {{12, 5, -20}, {0.067609, 0.120748, 0.231439}, 1},
        {{90, 5, 60}, {1.055012, 0.862769, 0.426511}, 0},
        {{50, 100, 0}, {1.007601, -0.838688, 0.482814}, 0},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        double rgb[3];
        assert_int_equal(dk_color_lab_to_srgb(cases[i].lab, rgb),
                         cases[i].in_gamut);
        for (int c = 0; c < 3; c++) {
            if (cases[i].rgb[c] >= 0) {
                assert_within(rgb[c], cases[i].rgb[c], 0, 2e-6);
                continue;
            }
            /* Below 0, colorspacious continues the curve's linear part
             * and we continue it as an odd function: compare the linear
             * light, −decode(−v) against v/12.92. */
            assert_true(rgb[c] < 0);
            assert_within(-decode(-rgb[c]), cases[i].rgb[c] / 12.92, 0, 2e-6);
        }
    }
    static const struct {
        double rgb[3], lab[3];
    } back[] = {
        {{1, 0, 0}, {53.2314, 80.1144, 67.2200}},
        {{0, 1, 0}, {87.7356, -86.1840, 83.1830}},
        {{0, 0, 1}, {32.3027, 79.1923, -107.8633}},
        {{0.2, 0.6, 0.3}, {56.1019, -46.2371, 31.6712}},
    };
    for (size_t i = 0; i < sizeof back / sizeof back[0]; i++) {
        double lab[3];
        dk_color_srgb_to_lab(back[i].rgb, lab);
        for (int c = 0; c < 3; c++)
            assert_within(lab[c], back[i].lab[c], 0, 2e-4);
    }
    /* sRGB red is L* 53.24, a* 80.09, b* 67.20 with unrounded matrices
     * (B. Lindbloom's colour calculator, from memory); the 4-decimal IEC
     * matrix moves it by a few hundredths. */
    double lab[3];
    dk_color_srgb_to_lab((double[3]){1, 0, 0}, lab);
    assert_within(lab[0], 53.24, 0, 0.05);
    assert_within(lab[1], 80.09, 0, 0.05);
    assert_within(lab[2], 67.20, 0, 0.05);
    /* White is L* 100 by definition (CIE 15), within the matrix rounding. */
    dk_color_srgb_to_lab((double[3]){1, 1, 1}, lab);
    assert_within(lab[0], 100, 0, 0.01);
    assert_within(hypot(lab[1], lab[2]), 0, 0, 0.02);
}

static void
lab_srgb_round_trip(void **state)
{
    (void)state;
    for (int r = 0; r <= 4; r++)
        for (int g = 0; g <= 4; g++)
            for (int b = 0; b <= 4; b++) {
                double rgb[3] = {r / 4.0, g / 4.0, b / 4.0}, lab[3], out[3];
                dk_color_srgb_to_lab(rgb, lab);
                assert_int_equal(dk_color_lab_to_srgb(lab, out), 1);
                for (int c = 0; c < 3; c++)
                    assert_within(out[c], rgb[c], 0, 1e-9);
            }
}

/* CIEDE2000: G. Sharma, W. Wu, E. N. Dalal, Color Res. Appl. 30, 21
 * (2005), Table 1 (pairs typed from memory; every value confirmed with
 * python3-colormath 3.0.0's delta_e_cie2000). */
static void
ciede2000_reference(void **state)
{
    (void)state;
    static const struct {
        double a[3], b[3], de;
    } cases[] = {
        {{50, 2.6772, -79.7751}, {50, 0, -82.7485}, 2.0425},
        {{50, 3.1571, -77.2803}, {50, 0, -82.7485}, 2.8615},
        {{50, 2.8361, -74.0200}, {50, 0, -82.7485}, 3.4412},
        {{50, 0, 0}, {50, -1, 2}, 2.3669},
        {{50, -1, 2}, {50, 0, 0}, 2.3669},
        {{50, 2.5, 0}, {73, 25, -18}, 27.1492},
        {{50, 2.5, 0}, {61, -5, 29}, 22.8977},
        {{50, 2.5, 0}, {56, -27, -3}, 31.9030},
        {{50, 2.5, 0}, {58, 24, 15}, 19.4535},
        {{60.2574, -34.0099, 36.2677}, {60.4626, -34.1751, 39.4387}, 1.2644},
        {{22.7233, 20.0904, -46.6940}, {23.0331, 14.9730, -42.5619}, 2.0373},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
        assert_within(dk_color_delta_e2000(cases[i].a, cases[i].b),
                      cases[i].de, 0, 6e-5);
    double same[3] = {40, 10, -10};
    assert_within(dk_color_delta_e2000(same, same), 0, 0, 1e-12);
}

/* Colour-vision deficiency: full protanopia, deuteranopia, tritanopia
 * (severity 1.0) as linear-RGB matrices of G. M. Machado, M. M.
 * Oliveira, L. A. F. Fernandes, IEEE TVCG 15, 1291 (2009), values as
 * tabulated in python3-colorspacious 1.1.2 (cvd.py). */
static const double CVD[3][3][3] = {
    {{0.152286, 1.052583, -0.204868},
     {0.114503, 0.786281, 0.099216},
     {-0.003882, -0.048116, 1.051998}},
    {{0.367322, 0.860646, -0.227968},
     {0.280085, 0.672501, 0.047413},
     {-0.011820, 0.042940, 0.968881}},
    {{1.255528, -0.076749, -0.178779},
     {-0.078411, 0.930809, 0.147602},
     {0.004733, 0.691367, 0.303900}},
};

/* The CIELAB colour a viewer of kind @k (-1 normal, 0 protan, 1 deutan,
 * 2 tritan) sees for sRGB @rgb. */
static void
seen_as(int k, const double rgb[3], double lab[3])
{
    double out[3] = {rgb[0], rgb[1], rgb[2]};
    if (k >= 0) {
        double lin[3] = {decode(rgb[0]), decode(rgb[1]), decode(rgb[2])};
        for (int i = 0; i < 3; i++) {
            double v = CVD[k][i][0] * lin[0] + CVD[k][i][1] * lin[1] +
                       CVD[k][i][2] * lin[2];
            out[i] = encode(fmin(fmax(v, 0), 1));
        }
    }
    dk_color_srgb_to_lab(out, lab);
}

/* The map scale: L* rises monotonically, linearly from 12 to 94, every
 * colour is in gamut, equal steps are equal CIEDE2000 differences, and
 * the lightness order survives every simulated colour-vision deficiency
 * (Kovesi 2015's criteria for a sequential map). */
static void
colormap_properties(void **state)
{
    (void)state;
    enum { N = 256 };
    double lab[N][3], rgb[N][3];
    for (int i = 0; i < N; i++) {
        dk_colormap_lab((double)i / (N - 1), lab[i]);
        assert_int_equal(dk_color_lab_to_srgb(lab[i], rgb[i]), 1);
        dk_colormap_rgb((double)i / (N - 1), rgb[i]);
    }
    assert_within(lab[0][0], 12, 0, 1e-9);
    assert_within(lab[N - 1][0], 94, 0, 1e-9);
    double dmin = INFINITY, dmax = 0;
    for (int i = 1; i < N; i++) {
        assert_true(lab[i][0] > lab[i - 1][0]);
        double d = dk_color_delta_e2000(lab[i - 1], lab[i]);
        dmin = fmin(dmin, d);
        dmax = fmax(dmax, d);
    }
    /* Uniform to 3 % (the re-spacing samples the path at 1024 points). */
    assert_true(dmax / dmin < 1.03);
    for (int k = 0; k < 3; k++) {
        double prev = -1;
        for (int i = 0; i < N; i++) {
            double seen[3];
            seen_as(k, rgb[i], seen);
            if (!(seen[0] > prev))
                fail_msg("vision %d: L* falls at step %d", k, i);
            prev = seen[0];
        }
    }
    /* The scale itself, against an independent re-implementation in
     * Python (colorspacious for CIELAB → sRGB, colormath for CIEDE2000,
     * re-spacing on 4096 samples), so that it cannot drift unnoticed. */
    static const struct {
        double t, rgb[3];
    } ref[] = {
        {0.0, {0.06401, 0.11997, 0.23835}},
        {0.25, {0.50620, 0.19839, 0.45524}},
        {0.5, {0.86656, 0.31190, 0.41638}},
        {0.75, {0.94145, 0.61741, 0.44504}},
        {1.0, {0.97836, 0.93720, 0.70851}},
    };
    for (size_t i = 0; i < sizeof ref / sizeof ref[0]; i++) {
        double c[3];
        dk_colormap_rgb(ref[i].t, c);
        for (int k = 0; k < 3; k++)
            assert_within(c[k], ref[i].rgb[k], 0, 2e-5);
    }
    /* Clamping and NaN. */
    double a[3], b[3];
    dk_colormap_lab(-1, a);
    dk_colormap_lab(0, b);
    assert_within(a[0], b[0], 0, 0);
    dk_colormap_lab(NAN, a);
    assert_within(a[0], b[0], 0, 0);
    dk_colormap_lab(7, a);
    dk_colormap_lab(1, b);
    assert_within(a[2], b[2], 0, 0);
}

/* Line colours stay apart (CIEDE2000 ≥ 10, a clearly visible difference,
 * common practice) for normal vision and the three dichromacies, and are
 * dark enough for thin lines on white (L* ≤ 75, common practice). */
static void
palette_distinguishable(void **state)
{
    (void)state;
    int n = dk_palette_size();
    assert_true(n >= 4);
    for (int k = -1; k < 3; k++)
        for (int i = 0; i < n; i++)
            for (int j = i + 1; j < n; j++) {
                double ri[3], rj[3], li[3], lj[3];
                dk_palette_rgb(i, ri);
                dk_palette_rgb(j, rj);
                seen_as(k, ri, li);
                seen_as(k, rj, lj);
                double d = dk_color_delta_e2000(li, lj);
                if (d < 10)
                    fail_msg("vision %d: colours %d and %d differ by "
                             "only %.1f",
                             k, i, j, d);
                if (k < 0)
                    assert_true(li[0] >= 25 && li[0] <= 75);
            }
    double a[3], b[3];
    dk_palette_rgb(n, a);
    dk_palette_rgb(0, b);
    assert_true(a[0] == b[0] && a[1] == b[1] && a[2] == b[2]);
    dk_palette_rgb(-1, a);
    dk_palette_rgb(n - 1, b);
    assert_true(a[0] == b[0] && a[1] == b[1] && a[2] == b[2]);
}

/* ---- Contours -------------------------------------------------------- */

typedef struct lines {
    int n, closed[16], npts[16];
    double rmin[16], rmax[16];
    double xmin[16], xmax[16];
    double cx, cy, h;      /* grid → data: x = cx + h·gi */
} lines;

static void
record(const double *gx, const double *gy, int n, int closed, void *ctx)
{
    lines *l = ctx;
    if (l->n >= 16)
        return;
    int k = l->n++;
    l->closed[k] = closed;
    l->npts[k] = n;
    l->rmin[k] = l->xmin[k] = INFINITY;
    l->rmax[k] = l->xmax[k] = -INFINITY;
    for (int i = 0; i < n; i++) {
        double x = l->cx + l->h * gx[i], y = l->cy + l->h * gy[i];
        double r = hypot(x, y);
        l->rmin[k] = fmin(l->rmin[k], r);
        l->rmax[k] = fmax(l->rmax[k], r);
        l->xmin[k] = fmin(l->xmin[k], x);
        l->xmax[k] = fmax(l->xmax[k], x);
    }
    if (closed && !(gx[0] == gx[n - 1] && gy[0] == gy[n - 1]))
        l->closed[k] = -1; /* a closed line must end where it starts */
}

/* Marching squares on functions whose level sets are known exactly
 * (mathematics). */
static void
contour_shapes(void **state)
{
    (void)state;
    enum { N = 41 };
    static double z[N * N];
    double h = 2.0 / (N - 1);
    /* r² = 0.25: one closed circle of radius 0.5; linear interpolation
     * of r² along an edge errs by at most h²/4 in r². */
    for (int j = 0; j < N; j++)
        for (int i = 0; i < N; i++) {
            double x = -1 + i * h, y = -1 + j * h;
            z[j * N + i] = x * x + y * y;
        }
    lines l = {.cx = -1, .cy = -1, .h = h};
    assert_int_equal(plot_contour_trace(z, N, N, 0.25, record, &l), 0);
    assert_int_equal(l.n, 1);
    assert_int_equal(l.closed[0], 1);
    assert_within(l.rmin[0], 0.5, 0, h * h);
    assert_within(l.rmax[0], 0.5, 0, h * h);
    assert_true(l.npts[0] > 40);

    /* A level above the maximum draws nothing. */
    l = (lines){.cx = -1, .cy = -1, .h = h};
    assert_int_equal(plot_contour_trace(z, N, N, 5, record, &l), 0);
    assert_int_equal(l.n, 0);

    /* A plane z = x: one open straight line at x = 0.3, exactly. */
    for (int j = 0; j < N; j++)
        for (int i = 0; i < N; i++)
            z[j * N + i] = -1 + i * h;
    l = (lines){.cx = -1, .cy = -1, .h = h};
    assert_int_equal(plot_contour_trace(z, N, N, 0.3, record, &l), 0);
    assert_int_equal(l.n, 1);
    assert_int_equal(l.closed[0], 0);
    assert_int_equal(l.npts[0], N);
    assert_within(l.xmin[0], 0.3, 0, 1e-12);
    assert_within(l.xmax[0], 0.3, 0, 1e-12);

    /* A NaN next to the line splits it in two. */
    z[20 * N + 26] = NAN;
    l = (lines){.cx = -1, .cy = -1, .h = h};
    assert_int_equal(plot_contour_trace(z, N, N, 0.32, record, &l), 0);
    assert_int_equal(l.n, 2);
    assert_int_equal(l.npts[0] + l.npts[1], N - 1); /* one row lost */
    assert_within(l.xmin[0], 0.32, 0, 1e-12);
    assert_within(l.xmax[1], 0.32, 0, 1e-12);

    /* Saddle z = x·y at level 0.1: two branches of a hyperbola, each
     * open. */
    for (int j = 0; j < N; j++)
        for (int i = 0; i < N; i++)
            z[j * N + i] = (-1 + i * h) * (-1 + j * h);
    l = (lines){.cx = -1, .cy = -1, .h = h};
    assert_int_equal(plot_contour_trace(z, N, N, 0.1, record, &l), 0);
    assert_int_equal(l.n, 2);
    assert_int_equal(l.closed[0], 0);
    assert_int_equal(l.closed[1], 0);
}

typedef struct centroids {
    int n;
    double x[4], y[4];
} centroids;

static void
record_centroid(const double *gx, const double *gy, int n, int closed,
                void *ctx)
{
    (void)closed;
    centroids *c = ctx;
    if (c->n >= 4)
        return;
    double sx = 0, sy = 0;
    for (int i = 0; i < n; i++)
        sx += gx[i], sy += gy[i];
    c->x[c->n] = sx / n;
    c->y[c->n++] = sy / n;
}

/* One saddle cell, corners 1, 0, 1, 0 (v0 (0,0), v1 (1,0), v2 (1,1),
 * v3 (0,1)): the bilinear interpolant is 0.5 at the centre, so below 0.5
 * the high corners v0 and v2 join and the lines cut off v1 and v3; above
 * 0.5 they cut off v0 and v2 (mathematics of the bilinear saddle; the
 * crossing points follow from linear interpolation along the edges). */
static void
contour_saddle(void **state)
{
    (void)state;
    double z[4] = {1, 0, 0, 1}; /* row 0: v0 v1; row 1: v3 v2 */
    static const struct {
        double level;
        double cx[2], cy[2];
    } cases[] = {
        {0.4, {0.8, 0.2}, {0.2, 0.8}}, /* around v1 and v3 */
        {0.6, {0.2, 0.8}, {0.2, 0.8}}, /* around v0 and v2 */
    };
    for (size_t k = 0; k < 2; k++) {
        centroids c = {0};
        assert_int_equal(plot_contour_trace(z, 2, 2, cases[k].level,
                                            record_centroid, &c),
                         0);
        assert_int_equal(c.n, 2);
        for (int i = 0; i < 2; i++) {
            int m = fabs(c.x[i] - cases[k].cx[0]) < 1e-12 ? 0 : 1;
            assert_within(c.x[i], cases[k].cx[m], 0, 1e-12);
            assert_within(c.y[i], cases[k].cy[m], 0, 1e-12);
        }
    }
}

/* ---- Files ----------------------------------------------------------- */

static unsigned char *
slurp(const char *path, size_t *len)
{
    FILE *f = fopen(path, "rb");
    if (!f)
        return NULL;
    fseek(f, 0, SEEK_END);
    long n = ftell(f);
    fseek(f, 0, SEEK_SET);
    unsigned char *buf = malloc((size_t)n + 1);
    if (buf && fread(buf, 1, (size_t)n, f) != (size_t)n) {
        free(buf);
        buf = NULL;
    }
    fclose(f);
    if (buf)
        buf[n] = 0;
    *len = (size_t)n;
    return buf;
}

static int
same_bytes(const char *a, const char *b)
{
    size_t la, lb;
    unsigned char *x = slurp(a, &la), *y = slurp(b, &lb);
    int same = x && y && la == lb && memcmp(x, y, la) == 0;
    free(x);
    free(y);
    return same;
}

/*
 * A minimal XML well-formedness check: every element closed in order,
 * attributes quoted, comments and declarations skipped. Returns 1 when
 * well-formed (W3C XML 1.0 §2.1, reduced to nesting and quoting).
 */
static int
xml_well_formed(const char *s)
{
    char stack[64][64];
    int depth = 0, seen_root = 0;
    while (*s) {
        if (*s != '<') {
            s++;
            continue;
        }
        if (strncmp(s, "<?", 2) == 0) {
            s = strstr(s, "?>");
            if (!s)
                return 0;
            s += 2;
            continue;
        }
        if (strncmp(s, "<!--", 4) == 0) {
            s = strstr(s, "-->");
            if (!s)
                return 0;
            s += 3;
            continue;
        }
        if (strncmp(s, "<!", 2) == 0) {
            s = strchr(s, '>');
            if (!s)
                return 0;
            s++;
            continue;
        }
        int closing = s[1] == '/';
        const char *name = s + 1 + closing;
        size_t nl = strcspn(name, " \t\r\n/>");
        if (nl == 0 || nl >= sizeof stack[0])
            return 0;
        const char *p = name + nl;
        int self = 0;
        while (*p && *p != '>') {
            if (*p == '"' || *p == '\'') {
                const char *q = strchr(p + 1, *p);
                if (!q)
                    return 0;
                p = q + 1;
                continue;
            }
            if (*p == '<')
                return 0;
            self = *p == '/';
            p++;
        }
        if (!*p)
            return 0;
        if (closing) {
            if (depth == 0 || strlen(stack[depth - 1]) != nl ||
                strncmp(stack[depth - 1], name, nl) != 0)
                return 0;
            depth--;
        } else if (!self) {
            if (depth == 64 || (depth == 0 && seen_root))
                return 0;
            memcpy(stack[depth], name, nl);
            stack[depth++][nl] = 0;
            seen_root = 1;
        }
        s = p + 1;
    }
    return depth == 0 && seen_root;
}

/* A tuning-curve figure like the ones the program writes. */
static dk_plot *
tuning_figure(void)
{
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    enum { N = 60 };
    for (int k = 0; k < 3; k++) {
        double x[N], y[N];
        for (int i = 0; i < N; i++) {
            x[i] = 2.6 + 2.0 * i / (N - 1);
            y[i] = 32 - 0.3 * k - 2.2 * (x[i] - 2.6) * (x[i] - 2.6) / 4;
        }
        char label[32];
        snprintf(label, sizeof label, "%d °C", 40 + 60 * k);
        OK(dk_plot_add_line(p, x, y, N, label, OKERR));
    }
    OK(dk_plot_set_xlabel(p, "Idler wavelength λ<sub>i</sub> (µm)", OKERR));
    OK(dk_plot_set_ylabel(p, "Poling period Λ (µm)", OKERR));
    OK(dk_plot_set_top_axis(p, dk_plot_um_to_per_cm, dk_plot_per_cm_to_um,
                            NULL, "Wavenumber (cm<sup>−1</sup>)", OKERR));
    OK(dk_plot_add_marker(p, 3.4, 31.6, "operating point", OKERR));
    OK(dk_plot_add_band(p, 3.3, 3.5, "acceptance", OKERR));
    return p;
}

static dk_plot *
map_figure(void)
{
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    enum { NX = 30, NY = 20 };
    double z[NX * NY];
    for (int j = 0; j < NY; j++)
        for (int i = 0; i < NX; i++) {
            double a = (i - 15 + 0.3 * (j - 10)) * 0.4;
            z[j * NX + i] = a == 0 ? 1 : pow(sin(a) / a, 2);
        }
    OK(dk_plot_set_map(p, z, NX, NY, 3.0, 3.8, 20, 200,
                       "sinc<sup>2</sup>(Δ<i>k</i>L/2)", OKERR));
    OK(dk_plot_add_contour(p, 0.5, "half maximum", OKERR));
    OK(dk_plot_set_xlabel(p, "λ (µm)", OKERR));
    OK(dk_plot_set_ylabel(p, "Temperature (°C)", OKERR));
    return p;
}

/* Whether @needle occurs in the @n bytes of @b (which may hold NULs). */
static int
has_bytes(const unsigned char *b, size_t n, const char *needle)
{
    size_t m = strlen(needle);
    for (size_t i = 0; i + m <= n; i++)
        if (memcmp(b + i, needle, m) == 0)
            return 1;
    return 0;
}

static void
check_pdf(const char *path)
{
    size_t n;
    unsigned char *b = slurp(path, &n);
    assert_non_null(b);
    /* ISO 32000-1 §7.5.2 and §7.5.5: header "%PDF-", last line "%%EOF". */
    assert_true(n > 100 && memcmp(b, "%PDF-", 5) == 0);
    size_t end = n;
    while (end > 0 && (b[end - 1] == '\n' || b[end - 1] == '\r'))
        end--;
    assert_true(end >= 5 && memcmp(b + end - 5, "%%EOF", 5) == 0);
    /* No creation date: the bytes must not depend on the clock. */
    assert_false(has_bytes(b, n, "/CreationDate"));
    assert_true(has_bytes(b, n, "/Creator (deltak)"));
    free(b);
}

static void
check_svg(const char *path)
{
    size_t n;
    unsigned char *b = slurp(path, &n);
    assert_non_null(b);
    assert_non_null(strstr((char *)b, "<svg"));
    assert_true(xml_well_formed((char *)b));
    free(b);
    if (access("/usr/bin/python3", X_OK) == 0) {
        char cmd[512];
        snprintf(cmd, sizeof cmd,
                 "/usr/bin/python3 -c 'import sys, xml.dom.minidom as m; "
                 "m.parse(sys.argv[1])' '%s' 2>/dev/null",
                 path);
        assert_int_equal(system(cmd), 0);
    }
}

static void
check_png(const dk_plot *p, const char *path, double width_mm,
          double height_mm, double dpi)
{
    (void)p;
    cairo_surface_t *s = cairo_image_surface_create_from_png(path);
    assert_int_equal(cairo_surface_status(s), CAIRO_STATUS_SUCCESS);
    assert_int_equal(cairo_image_surface_get_width(s),
                     (int)lround(width_mm / 25.4 * dpi));
    assert_int_equal(cairo_image_surface_get_height(s),
                     (int)lround(height_mm / 25.4 * dpi));
    cairo_surface_destroy(s);
}

/* Each format: valid, and the same bytes when written twice. */
static void
formats_valid_and_deterministic(void **state)
{
    (void)state;
    dk_plot *figs[2] = {tuning_figure(), map_figure()};
    static const char *const ext[] = {"pdf", "svg", "png", "PDF"};
    for (int f = 0; f < 2; f++)
        for (size_t e = 0; e < sizeof ext / sizeof ext[0]; e++) {
            char a[256], b[256], name[32];
            snprintf(name, sizeof name, "fig%d-a.%s", f, ext[e]);
            path_in(a, sizeof a, name);
            snprintf(name, sizeof name, "fig%d-b.%s", f, ext[e]);
            path_in(b, sizeof b, name);
            OK(dk_plot_write(figs[f], a, OKERR));
            OK(dk_plot_write(figs[f], b, OKERR));
            if (!same_bytes(a, b))
                fail_msg("%s and %s differ", a, b);
            if (e == 0 || e == 3)
                check_pdf(a);
            else if (e == 1)
                check_svg(a);
            else
                check_png(figs[f], a, DK_PLOT_SINGLE_COLUMN_MM, 64, 300);
        }
    /* Another resolution. */
    char path[256];
    path_in(path, sizeof path, "lowres.png");
    OK(dk_plot_set_png_dpi(figs[0], 96, OKERR));
    OK(dk_plot_write(figs[0], path, OKERR));
    check_png(figs[0], path, DK_PLOT_SINGLE_COLUMN_MM, 64, 96);
    /* Writing over an existing file replaces it. */
    OK(dk_plot_write(figs[1], path, OKERR));
    check_png(figs[1], path, DK_PLOT_SINGLE_COLUMN_MM, 64, 300);
    dk_plot_free(figs[0]);
    dk_plot_free(figs[1]);
}

/* ---- Pixels ---------------------------------------------------------- */

static void
pixel(cairo_surface_t *s, int x, int y, double rgb[3])
{
    cairo_surface_flush(s);
    const unsigned char *d = cairo_image_surface_get_data(s);
    uint32_t v = *(const uint32_t *)(const void *)(d + (long)y *
                                    cairo_image_surface_get_stride(s) +
                                    4L * x);
    rgb[0] = ((v >> 16) & 0xff) / 255.0;
    rgb[1] = ((v >> 8) & 0xff) / 255.0;
    rgb[2] = (v & 0xff) / 255.0;
}

static void
assert_colour(cairo_surface_t *s, double px, double py, const double want[3],
              double tol, const char *what)
{
    double got[3];
    pixel(s, (int)floor(px), (int)floor(py), got);
    for (int c = 0; c < 3; c++)
        if (fabs(got[c] - want[c]) > tol)
            fail_msg("%s at pixel (%d, %d): (%.3f %.3f %.3f), expected "
                     "(%.3f %.3f %.3f)",
                     what, (int)floor(px), (int)floor(py), got[0], got[1],
                     got[2], want[0], want[1], want[2]);
}

static cairo_surface_t *
render_png(const dk_plot *p, const char *name)
{
    char path[256];
    path_in(path, sizeof path, name);
    OK(dk_plot_write(p, path, OKERR));
    cairo_surface_t *s = cairo_image_surface_create_from_png(path);
    assert_int_equal(cairo_surface_status(s), CAIRO_STATUS_SUCCESS);
    return s;
}

/* The data land where dk_plot_data_to_pixel says: a horizontal line
 * y = 0.5 on 0..1 axes, broken by a NaN, and a diagonal. */
static void
line_pixels(void **state)
{
    (void)state;
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    OK(dk_plot_set_xrange(p, 0, 1, OKERR));
    OK(dk_plot_set_yrange(p, 0, 1, OKERR));
    double x[5] = {0, 0.4, NAN, 0.6, 1}, y[5] = {0.5, 0.5, NAN, 0.5, 0.5};
    OK(dk_plot_add_line(p, x, y, 5, NULL, OKERR));
    double dx[2] = {0, 1}, dy[2] = {0, 0.5};
    OK(dk_plot_add_line(p, dx, dy, 2, NULL, OKERR));
    cairo_surface_t *s = render_png(p, "line.png");
    double c0[3], c1[3], white[3] = {1, 1, 1}, px, py;
    dk_palette_rgb(0, c0);
    dk_palette_rgb(1, c1);

    OK(dk_plot_data_to_pixel(p, 0.2, 0.5, &px, &py, OKERR));
    assert_colour(s, px, py, c0, 2.5 / 255, "line y = 0.5");
    /* 0.1 of the axis height (> 40 px at 300 dpi) above and below: paper. */
    double px2, py2;
    OK(dk_plot_data_to_pixel(p, 0.2, 0.6, &px2, &py2, OKERR));
    assert_true(py2 < py - 40);
    assert_colour(s, px2, py2, white, 0, "above the line");
    OK(dk_plot_data_to_pixel(p, 0.2, 0.4, &px2, &py2, OKERR));
    assert_colour(s, px2, py2, white, 0, "below the line");
    /* The NaN gap. */
    OK(dk_plot_data_to_pixel(p, 0.5, 0.5, &px, &py, OKERR));
    assert_colour(s, px, py, white, 0, "gap at the NaN");
    OK(dk_plot_data_to_pixel(p, 0.8, 0.5, &px, &py, OKERR));
    assert_colour(s, px, py, c0, 2.5 / 255, "line after the NaN");
    /* The second series takes the second colour, on y = x/2. */
    OK(dk_plot_data_to_pixel(p, 0.25, 0.125, &px, &py, OKERR));
    assert_colour(s, px, py, c1, 2.5 / 255, "diagonal");
    OK(dk_plot_data_to_pixel(p, 0.75, 0.375, &px, &py, OKERR));
    assert_colour(s, px, py, c1, 2.5 / 255, "diagonal");
    /* The axes box: (0, 0) is the lower left, (1, 1) the upper right. */
    double ax0, ay0, ax1, ay1;
    OK(dk_plot_data_to_pixel(p, 0, 0, &ax0, &ay0, OKERR));
    OK(dk_plot_data_to_pixel(p, 1, 1, &ax1, &ay1, OKERR));
    assert_true(ax0 > 0 && ax1 > ax0 && ax1 < cairo_image_surface_get_width(s));
    assert_true(ay1 > 0 && ay0 > ay1 &&
                ay0 < cairo_image_surface_get_height(s));
    cairo_surface_destroy(s);

    dk_error err = {0};
    assert_int_equal(dk_plot_data_to_pixel(p, NAN, 0, &px, &py, &err),
                     DK_EINVAL);
    dk_plot_free(p);
}

/* The map shows the colour scale the right way round and in the right
 * place, the contour sits on its level, and the legend stays out of the
 * data: z = x on [0, 1]², colour range 0..1, contour at 0.5. */
static void
map_pixels(void **state)
{
    (void)state;
    enum { NX = 11, NY = 6 };
    double z[NX * NY];
    for (int j = 0; j < NY; j++)
        for (int i = 0; i < NX; i++)
            z[j * NX + i] = i / 10.0;
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    OK(dk_plot_set_map(p, z, NX, NY, 0, 1, 0, 1, "z", OKERR));
    OK(dk_plot_set_zrange(p, 0, 1, OKERR));
    OK(dk_plot_add_contour(p, 0.5, NULL, OKERR));
    cairo_surface_t *s = render_png(p, "map.png");
    static const double at[] = {0.1, 0.3, 0.7, 0.9};
    for (size_t k = 0; k < sizeof at / sizeof at[0]; k++) {
        double want[3], px, py;
        dk_colormap_rgb(at[k], want);
        OK(dk_plot_data_to_pixel(p, at[k], 0.3, &px, &py, OKERR));
        /* The pixel centre is within half a pixel of at[k]: allow the
         * colour change over one pixel plus rounding. */
        assert_colour(s, px, py, want, 4.0 / 255, "map colour");
    }
    double px, py, ink[3] = {0.1, 0.1, 0.1};
    OK(dk_plot_data_to_pixel(p, 0.5, 0.6, &px, &py, OKERR));
    assert_colour(s, px, py, ink, 6.0 / 255, "contour at z = 0.5");
    cairo_surface_destroy(s);
    dk_plot_free(p);
}

/* Automatic ranges and the top axis (via the layout). */
static void
ranges_and_top_axis(void **state)
{
    (void)state;
    dk_plot *p = tuning_figure();
    plot_layout L;
    OK(plot_layout_compute(p, &L, OKERR));
    /* x edge to edge; y widened by 4 % each end. */
    assert_within(L.x.lo, 2.6, 0, 1e-12);
    assert_within(L.x.hi, 4.6, 0, 1e-12);
    double ymin = 32 - 0.6 - 2.2, ymax = 32, pad = 0.04 * (ymax - ymin);
    assert_within(L.y.lo, ymin - pad, 1e-12, 1e-12);
    assert_within(L.y.hi, ymax + pad, 1e-12, 1e-12);
    /* Top axis: 1e4/λ over 2.6-4.6 µm is 2173.9-3846.2 cm⁻¹; its ticks are
     * multiples of a 1-2-5 step inside that range. */
    assert_true(L.has_top);
    assert_within(L.top.lo, 1e4 / 4.6, 1e-12, 0);
    assert_within(L.top.hi, 1e4 / 2.6, 1e-12, 0);
    assert_true(L.top.nticks >= 2);
    for (int i = 0; i < L.top.nticks; i++) {
        double t = L.top.ticks[i], k = t / L.top.step;
        assert_within(k, round(k), 0, 1e-9);
        double x = dk_plot_per_cm_to_um(t, NULL);
        assert_true(x >= 2.6 - 1e-12 && x <= 4.6 + 1e-12);
    }
    /* The box lies inside the page, below the top axis labels. */
    assert_true(L.ax_x > 0 && L.ax_x + L.ax_w < L.page_w);
    assert_true(L.ax_y > 2 * L.f && L.ax_y + L.ax_h < L.page_h);
    dk_plot_free(p);

    /* A flat series is widened; a map sets both ranges. */
    p = new_plot(85, 60);
    double x[2] = {1, 2}, y[2] = {3, 3};
    OK(dk_plot_add_line(p, x, y, 2, "flat", OKERR));
    OK(plot_layout_compute(p, &L, OKERR));
    assert_true(L.y.lo < 3 && L.y.hi > 3);
    dk_plot_free(p);
    /* Large and small values on the y axis are labelled in units of a
     * power of ten shown once ("×10^5"); x labels stay plain. */
    static const struct {
        double ymax;
        int exp10;
        const char *mult;
    } scale[] = {
        {2.8e5, 5, "\xc3\x97" "10<sup>5</sup>"},
        {4e-4, -4, "\xc3\x97" "10<sup>\xe2\x88\x92" "4</sup>"},
        {9e4, 0, ""},
    };
    for (size_t i = 0; i < sizeof scale / sizeof scale[0]; i++) {
        p = new_plot(85, 60);
        double gx[2] = {1, 2}, gy[2] = {0, scale[i].ymax};
        OK(dk_plot_add_line(p, gx, gy, 2, NULL, OKERR));
        OK(plot_layout_compute(p, &L, OKERR));
        assert_int_equal(L.y.exp10, scale[i].exp10);
        assert_string_equal(L.y.mult, scale[i].mult);
        assert_int_equal(L.x.exp10, 0);
        double unit = pow(10, L.y.exp10);
        for (int k = 0; k < L.y.nticks; k++) {
            char want[64];
            plot_tick_label(L.y.ticks[k] / unit, L.y.step / unit, want,
                            sizeof want);
            assert_string_equal(L.y.labels[k], want);
            assert_true(strlen(L.y.labels[k]) <= 5); /* e.g. "2.5", "0" */
        }
        dk_plot_free(p);
    }
    p = map_figure();
    OK(plot_layout_compute(p, &L, OKERR));
    assert_within(L.x.lo, 3.0, 0, 0);
    assert_within(L.y.hi, 200, 0, 0);
    assert_true(L.has_map && L.cb_x > L.ax_x + L.ax_w);
    dk_plot_free(p);
}

/* ---- Errors ---------------------------------------------------------- */

static int
count_entries(const char *dir)
{
    DIR *d = opendir(dir);
    int n = 0;
    struct dirent *e;
    while (d && (e = readdir(d)))
        n += strcmp(e->d_name, ".") != 0 && strcmp(e->d_name, "..") != 0;
    if (d)
        closedir(d);
    return n;
}

static void
write_errors(void **state)
{
    (void)state;
    dk_plot *p = tuning_figure();
    dk_error err = {0};
    char path[256], dir[128];

    /* Unknown or missing extension. */
    static const char *const bad[] = {"fig.jpg", "fig", "fig.", ".pdf",
                                      "dir.pdf/fig", "fig.pdf.gz"};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        path_in(path, sizeof path, bad[i]);
        assert_int_equal(dk_plot_write(p, path, &err), DK_EINVAL);
        assert_non_null(strstr(err.msg, DK_PLOT_FORMATS));
    }
    assert_int_equal(dk_plot_write(p, NULL, &err), DK_EINVAL);

    /* A folder that does not exist. */
    path_in(path, sizeof path, "no/such/folder/fig.pdf");
    assert_int_equal(dk_plot_write(p, path, &err), DK_EIO);
    assert_non_null(strstr(err.msg, path));

    /* The rename fails (the target is a folder): the temporary file is
     * removed and nothing else is left behind. */
    snprintf(dir, sizeof dir, "%.100s/sub", tmpdir);
    assert_int_equal(mkdir(dir, 0755), 0);
    snprintf(path, sizeof path, "%s/taken.png", dir);
    assert_int_equal(mkdir(path, 0755), 0);
    assert_int_equal(dk_plot_write(p, path, &err), DK_EIO);
    assert_non_null(strstr(err.msg, path));
    assert_int_equal(count_entries(dir), 1);
    rmdir(path);

    /* An unwritable folder (not for root, who may write anywhere). */
    if (geteuid() != 0) {
        assert_int_equal(chmod(dir, 0555), 0);
        snprintf(path, sizeof path, "%s/fig.svg", dir);
        assert_int_equal(dk_plot_write(p, path, &err), DK_EIO);
        assert_non_null(strstr(err.msg, path));
        chmod(dir, 0755);
    }
    assert_int_equal(count_entries(dir), 0);

    /* A failed write leaves an existing file as it was. */
    snprintf(path, sizeof path, "%s/keep.pdf", dir);
    OK(dk_plot_write(p, path, OKERR));
    size_t n0, n1;
    unsigned char *before = slurp(path, &n0);
    OK(dk_plot_set_top_axis(p, dk_plot_um_to_per_cm, dk_plot_per_cm_to_um,
                            NULL, NULL, OKERR));
    OK(dk_plot_set_xrange(p, -1, 1, OKERR)); /* 1e4/λ is infinite at 0 */
    assert_int_equal(dk_plot_write(p, path, &err), DK_EDOM);
    unsigned char *after = slurp(path, &n1);
    assert_true(n0 == n1 && memcmp(before, after, n0) == 0);
    assert_int_equal(count_entries(dir), 1);
    free(before);
    free(after);
    dk_plot_free(p);
}

static double
square(double x, void *unused)
{
    (void)unused;
    return x * x;
}

static void
build_errors(void **state)
{
    (void)state;
    dk_error err = {0};
    dk_plot *p = new_plot(85, 60);
    double x[3] = {0, 1, 2}, y[3] = {1, 2, 3}, nan3[3] = {NAN, NAN, NAN};

    /* Empty series. */
    assert_int_equal(dk_plot_add_line(p, x, y, 0, "none", &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "empty series 'none'"));
    assert_int_equal(dk_plot_add_line(p, NULL, y, 3, NULL, &err), DK_EINVAL);
    assert_int_equal(dk_plot_add_line(p, x, nan3, 3, "nan", &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "no finite point"));

    /* Nothing to plot. */
    char path[256];
    path_in(path, sizeof path, "empty.png");
    assert_int_equal(dk_plot_write(p, path, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "nothing to plot"));
    assert_int_equal(access(path, F_OK), -1);
    double px, py;
    assert_int_equal(dk_plot_data_to_pixel(p, 0, 0, &px, &py, &err),
                     DK_EINVAL);
    /* ... but explicit ranges make an empty frame. */
    OK(dk_plot_set_xrange(p, 0, 1, OKERR));
    OK(dk_plot_set_yrange(p, 0, 1, OKERR));
    OK(dk_plot_write(p, path, OKERR));

    /* Markup. */
    assert_int_equal(dk_plot_set_xlabel(p, "λ<sub>i (µm)", &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "malformed label markup"));
    assert_int_equal(dk_plot_set_ylabel(p, "a & b", &err), DK_EINVAL);
    assert_int_equal(dk_plot_add_line(p, x, y, 3, "<b>x", &err), DK_EINVAL);
    assert_int_equal(dk_plot_add_marker(p, 1, 1, "<i>", &err), DK_EINVAL);
    assert_int_equal(dk_plot_add_band(p, 0, 1, "<q>x</q>", &err), DK_EINVAL);
    OK(dk_plot_set_xlabel(p, "a &amp; b", OKERR));
    OK(dk_plot_set_xlabel(p, NULL, OKERR));

    /* Ranges and settings. */
    assert_int_equal(dk_plot_set_xrange(p, 1, 1, &err), DK_EINVAL);
    assert_int_equal(dk_plot_set_yrange(p, 2, 1, &err), DK_EINVAL);
    assert_int_equal(dk_plot_set_yrange(p, NAN, 1, &err), DK_EINVAL);
    assert_int_equal(dk_plot_set_zrange(p, 0, INFINITY, &err), DK_EINVAL);
    assert_int_equal(dk_plot_set_png_dpi(p, 10, &err), DK_EINVAL);
    assert_int_equal(dk_plot_set_png_dpi(p, NAN, &err), DK_EINVAL);
    assert_int_equal(dk_plot_set_font_size_pt(p, 2, &err), DK_EINVAL);
    assert_int_equal(dk_plot_set_font_size_pt(p, 100, &err), DK_EINVAL);
    assert_int_equal(dk_plot_add_marker(p, NAN, 1, NULL, &err), DK_EINVAL);
    assert_int_equal(dk_plot_add_band(p, 1, 1, NULL, &err), DK_EINVAL);
    assert_int_equal(dk_plot_add_band(p, 0, INFINITY, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_set_top_axis(p, square, NULL, NULL, NULL, &err),
                     DK_EINVAL);

    /* Maps and contours. */
    double z[6] = {0, 1, 2, 3, 4, 5};
    assert_int_equal(dk_plot_set_map(p, NULL, 3, 2, 0, 1, 0, 1, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_set_map(p, z, 1, 6, 0, 1, 0, 1, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_set_map(p, z, 3, 2, 0, 0, 0, 1, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_set_map(p, z, 3, 2, 0, 1, 0, NAN, NULL, &err),
                     DK_EINVAL);
    double zn[6] = {NAN, NAN, NAN, NAN, NAN, NAN};
    assert_int_equal(dk_plot_set_map(p, zn, 3, 2, 0, 1, 0, 1, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_set_map(p, z, 3, 2, 0, 1, 0, 1, "<x", &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_add_contour(p, NAN, NULL, &err), DK_EINVAL);
    for (int i = 0; i < PLOT_MAX_CONTOURS; i++)
        OK(dk_plot_add_contour(p, i, NULL, OKERR));
    assert_int_equal(dk_plot_add_contour(p, 9, NULL, &err), DK_EINVAL);

    /* A top axis that turns back over the x range. */
    OK(dk_plot_set_xrange(p, -1, 1, OKERR));
    OK(dk_plot_set_top_axis(p, square, square, NULL, NULL, OKERR));
    path_in(path, sizeof path, "turning.pdf");
    assert_int_equal(dk_plot_write(p, path, &err), DK_EDOM);
    assert_non_null(strstr(err.msg, "monotonic"));
    assert_int_equal(access(path, F_OK), -1);
    OK(dk_plot_set_top_axis(p, NULL, NULL, NULL, NULL, OKERR));
    OK(dk_plot_write(p, path, OKERR));
    dk_plot_free(p);

    /* Too small for its labels. */
    p = new_plot(20, 20);
    OK(dk_plot_set_font_size_pt(p, 40, OKERR));
    OK(dk_plot_add_line(p, x, y, 3, NULL, OKERR));
    OK(dk_plot_set_xlabel(p, "a long label", OKERR));
    assert_int_equal(dk_plot_write(p, path, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "too small"));
    dk_plot_free(p);
}

/* All the options together, every preset, and a legend in each corner. */
static void
presets_and_legends(void **state)
{
    (void)state;
    int n;
    const dk_plot_size *pre = dk_plot_size_presets(&n);
    static const dk_plot_legend where[] = {
        DK_PLOT_LEGEND_AUTO, DK_PLOT_LEGEND_UPPER_LEFT,
        DK_PLOT_LEGEND_LOWER_RIGHT, DK_PLOT_LEGEND_NONE};
    for (int i = 0; i < n; i++) {
        dk_plot *p = tuning_figure();
        dk_plot_free(p);
        p = new_plot(pre[i].width_mm, pre[i].height_mm);
        double x[7], y[7];
        for (int s = 0; s < 7; s++) { /* more series than colours */
            for (int k = 0; k < 7; k++) {
                x[k] = k;
                y[k] = s + 0.1 * k * k;
            }
            OK(dk_plot_add_line(p, x, y, 7, "s", OKERR));
        }
        dk_plot_set_legend(p, where[i % 4]);
        char path[256], name[32];
        snprintf(name, sizeof name, "preset-%s.svg", pre[i].name);
        path_in(path, sizeof path, name);
        OK(dk_plot_write(p, path, OKERR));
        check_svg(path);
        dk_plot_free(p);
    }
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(nice_ticks_table),
        cmocka_unit_test(nice_ticks_errors),
        cmocka_unit_test(tick_labels),
        cmocka_unit_test(sizes),
        cmocka_unit_test(lab_srgb_reference),
        cmocka_unit_test(lab_srgb_round_trip),
        cmocka_unit_test(ciede2000_reference),
        cmocka_unit_test(colormap_properties),
        cmocka_unit_test(palette_distinguishable),
        cmocka_unit_test(contour_shapes),
        cmocka_unit_test(contour_saddle),
        cmocka_unit_test(formats_valid_and_deterministic),
        cmocka_unit_test(line_pixels),
        cmocka_unit_test(map_pixels),
        cmocka_unit_test(ranges_and_top_axis),
        cmocka_unit_test(write_errors),
        cmocka_unit_test(build_errors),
        cmocka_unit_test(presets_and_legends),
    };
    return cmocka_run_group_tests_name("plot", tests, setup, teardown);
}
