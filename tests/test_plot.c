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
#include "cli/cli.h"

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
    /* The second series takes the second colour, on y = x/2; it is
     * dashed, so some points along it fall in the gaps, but most on a
     * dash. */
    int on = 0, tries = 0;
    for (double xx = 0.2; xx < 0.8; xx += 0.01, tries++) {
        double got[3];
        OK(dk_plot_data_to_pixel(p, xx, xx / 2, &px, &py, OKERR));
        pixel(s, (int)floor(px), (int)floor(py), got);
        on += fabs(got[0] - c1[0]) < 2.5 / 255 &&
              fabs(got[1] - c1[1]) < 2.5 / 255 &&
              fabs(got[2] - c1[2]) < 2.5 / 255;
    }
    if (!(on > tries / 2))
        fail_msg("diagonal: %d of %d points in the second colour", on, tries);
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
    plot_layout_release(&L);
    dk_plot_free(p);

    /* A flat series is widened; a map sets both ranges. */
    p = new_plot(85, 60);
    double x[2] = {1, 2}, y[2] = {3, 3};
    OK(dk_plot_add_line(p, x, y, 2, "flat", OKERR));
    OK(plot_layout_compute(p, &L, OKERR));
    assert_true(L.y.lo < 3 && L.y.hi > 3);
    plot_layout_release(&L);
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
        plot_layout_release(&L);
        dk_plot_free(p);
    }
    p = map_figure();
    OK(plot_layout_compute(p, &L, OKERR));
    assert_within(L.x.lo, 3.0, 0, 0);
    assert_within(L.y.hi, 200, 0, 0);
    assert_true(L.has_map && L.cb_x > L.ax_x + L.ax_w);
    plot_layout_release(&L);
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


/* ---- Reading in black and white --------------------------------------- */

/* CIELAB lightness of an sRGB colour: what a greyscale print keeps. */
static double
lightness(const double rgb[3])
{
    double lab[3];
    dk_color_srgb_to_lab(rgb, lab);
    return lab[0];
}

/* The first 20 series differ in dash pattern or marker (or, failing both,
 * by at least 20 in L*), so that no two look alike in greyscale. Two of
 * the five colours are within 10 of each other in L*, which is why the
 * other cues are needed at all (checked too). */
static void
styles_distinct_in_greyscale(void **state)
{
    (void)state;
    enum { N = 20 };
    plot_style st[N];
    for (int i = 0; i < N; i++)
        plot_series_style((size_t)i, &st[i]);
    int close_colours = 0;
    for (int i = 0; i < N; i++)
        for (int j = 0; j < i; j++) {
            double dl = fabs(lightness(st[i].rgb) - lightness(st[j].rgb));
            int same_dash = st[i].ndash == st[j].ndash &&
                            memcmp(st[i].dash, st[j].dash,
                                   (size_t)st[i].ndash * sizeof(double)) == 0;
            int same_mark = st[i].marker == st[j].marker;
            if (same_dash && same_mark && dl < 20)
                fail_msg("series %d and %d look alike in greyscale "
                         "(ΔL* %.1f, same dash and marker)",
                         j, i, dl);
            if (i < dk_palette_size() && dl < 10)
                close_colours = 1;
        }
    assert_true(close_colours);
    /* Series 0 is a plain solid line. */
    assert_int_equal(st[0].ndash, 0);
    assert_int_equal(st[0].marker, PLOT_MARK_NONE);
    /* The outside-the-fit style differs from its series: lighter, thinner
     * and dashed. */
    for (int i = 0; i < N; i++) {
        plot_style o;
        double w;
        plot_outside_style(&st[i], &o, &w);
        assert_true(lightness(o.rgb) > lightness(st[i].rgb) + 10);
        assert_true(w < 1);
        assert_true(o.ndash > 0);
    }
}

/* ---- Layout: nothing overlaps ----------------------------------------- */

static int
boxes_overlap(const double a[4], const double b[4])
{
    return a[0] < b[0] + b[2] - 1e-6 && b[0] < a[0] + a[2] - 1e-6 &&
           a[1] < b[1] + b[3] - 1e-6 && b[1] < a[1] + a[3] - 1e-6;
}

/* Whether any line of @p (sampled finely along every segment, in page
 * pt) or any marker dot enters box r: an independent check of the
 * placement, which scores ink by clipping. */
static int
data_in_box(const dk_plot *p, const plot_layout *L, const double r[4])
{
    for (size_t k = 0; k < p->nseries; k++) {
        const plot_series *S = &p->series[k];
        for (size_t i = 0; i < S->n; i++) {
            double bx = plot_x_pt(L, S->x[i]), by = plot_y_pt(L, S->y[i]);
            double ax = i ? plot_x_pt(L, S->x[i - 1]) : bx;
            double ay = i ? plot_y_pt(L, S->y[i - 1]) : by;
            if (!(isfinite(ax) && isfinite(ay) && isfinite(bx) &&
                  isfinite(by)))
                continue;
            for (int t = 0; t <= 40; t++) {
                double x = ax + (bx - ax) * t / 40, y = ay + (by - ay) * t / 40;
                if (x < L->ax_x || x > L->ax_x + L->ax_w || y < L->ax_y ||
                    y > L->ax_y + L->ax_h)
                    continue;
                if (x > r[0] && x < r[0] + r[2] && y > r[1] &&
                    y < r[1] + r[3])
                    return 1;
            }
        }
    }
    for (size_t i = 0; i < p->nmarkers; i++) {
        double x = plot_x_pt(L, p->markers[i].x);
        double y = plot_y_pt(L, p->markers[i].y);
        if (x > r[0] && x < r[0] + r[2] && y > r[1] && y < r[1] + r[3])
            return 1;
    }
    return 0;
}

/* Every text inside the page (tick labels a quarter em from the edge),
 * no two texts overlapping, labels and legend off the data, no "×10^k"
 * among the tick labels when the axis has a label. */
static void
check_layout(const dk_plot *p, const char *name)
{
    plot_layout L;
    OK(plot_layout_compute(p, &L, OKERR));
    double edge = 0.25 * L.f - 1e-9;
    for (int i = 0; i < L.ntexts; i++) {
        const plot_text *t = &L.texts[i];
        double e = t->kind <= PLOT_TEXT_TICK_Z ? edge : 0;
        if (t->x < e || t->y < e || t->x + t->w > L.page_w - e ||
            t->y + t->h > L.page_h - e)
            fail_msg("%s: text '%s' (%.1f, %.1f, %.1f x %.1f) leaves the "
                     "%.1f x %.1f pt page",
                     name, t->markup, t->x, t->y, t->w, t->h, L.page_w,
                     L.page_h);
        double a[4] = {t->x, t->y, t->w, t->h};
        for (int j = 0; j < i; j++) {
            const plot_text *u = &L.texts[j];
            double b[4] = {u->x, u->y, u->w, u->h};
            if (boxes_overlap(a, b))
                fail_msg("%s: texts '%s' and '%s' overlap", name, t->markup,
                         u->markup);
        }
        if ((t->kind == PLOT_TEXT_MARKER || t->kind == PLOT_TEXT_BRANCH) &&
            data_in_box(p, &L, a))
            fail_msg("%s: label '%s' lies on the data", name, t->markup);
        if (t->kind == PLOT_TEXT_MULT && p->ylabel && t->x < L.ax_x)
            fail_msg("%s: ×10^k stands apart although the axis has a "
                     "label", name);
    }
    if (L.legend_where != PLOT_LEGEND_HIDDEN) {
        if (p->legend == DK_PLOT_LEGEND_AUTO && data_in_box(p, &L, L.legend_box))
            fail_msg("%s: the legend covers data", name);
        for (int i = 0; i < L.ntexts; i++) {
            const plot_text *t = &L.texts[i];
            double b[4] = {t->x, t->y, t->w, t->h};
            if (t->kind != PLOT_TEXT_LEGEND && boxes_overlap(L.legend_box, b))
                fail_msg("%s: the legend covers '%s'", name, t->markup);
        }
        assert_true(L.legend_box[0] >= 0 &&
                    L.legend_box[0] + L.legend_box[2] <= L.page_w &&
                    L.legend_box[1] >= 0 &&
                    L.legend_box[1] + L.legend_box[3] <= L.page_h);
    }
    /* What is drawn must also be written. */
    char path[256], file[64];
    snprintf(file, sizeof file, "%s.png", name);
    path_in(path, sizeof path, file);
    OK(dk_plot_write(p, path, OKERR));
    plot_layout_release(&L);
}

/* A family of temperature-tuning curves, each turning at a degeneracy
 * (two branches in one series), like the program's wavelength sweeps. */
static dk_plot *
turning_family(double w, double h)
{
    dk_plot *p = new_plot(w, h);
    enum { N = 181 };
    for (int k = 0; k < 3; k++) {
        double x[2 * N + 1], y[2 * N + 1], tmax = 140 - 40 * k;
        int m = 0;
        for (int b = 0; b < 2; b++) {
            for (int i = 0; i < N; i++) {
                double t = 20 + i;
                if (t > tmax)
                    break;
                x[m] = t;
                y[m++] = 2.128 + (b ? -1 : 1) *
                                     (0.06 + 0.06 * sqrt(tmax - t)) *
                                     (1 - 0.2 * k);
            }
            x[m] = y[m] = NAN;
            m++;
        }
        char label[32];
        snprintf(label, sizeof label, "Λ = %.1f µm", 31.8 + 0.2 * k);
        OK(dk_plot_add_line(p, x, y, (size_t)m, label, OKERR));
    }
    OK(dk_plot_label_branch(p, 0, 0, "signal", OKERR));
    OK(dk_plot_label_branch(p, 0, 1, "idler", OKERR));
    OK(dk_plot_set_xlabel(p, "Temperature (°C)", OKERR));
    OK(dk_plot_set_ylabel(p, "Signal and idler wavelength (µm)", OKERR));
    return p;
}

/* The sinc² curve of a temperature acceptance with its band and
 * operating point. */
static dk_plot *
acceptance_figure(void)
{
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    enum { N = 400 };
    double x[N], y[N];
    for (int i = 0; i < N; i++) {
        x[i] = 30 + 42.0 * i / (N - 1);
        double a = (x[i] - 51.2) * 0.29;
        y[i] = a == 0 ? 1 : pow(sin(a) / a, 2);
    }
    OK(dk_plot_add_line(p, x, y, N, NULL, OKERR));
    OK(dk_plot_add_band(p, 46.0, 56.4, "FWHM 10.4 °C", OKERR));
    OK(dk_plot_add_marker(p, 51.2, 1, "operating point", OKERR));
    OK(dk_plot_set_yrange(p, 0, 1.08, OKERR));
    OK(dk_plot_set_xlabel(p, "Temperature (°C)", OKERR));
    OK(dk_plot_set_ylabel(p, "sinc<sup>2</sup>(Δk L/2)", OKERR));
    return p;
}

/* A gain spectrum up to 2.8e5 under a wavenumber axis. */
static dk_plot *
gain_figure(void)
{
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    enum { N = 200 };
    double x[N], y[N];
    for (int i = 0; i < N; i++) {
        x[i] = 1.06 + 0.48 * i / (N - 1);
        y[i] = 2.8e5 * exp(-pow((x[i] - 1.3) / 0.07, 2));
    }
    OK(dk_plot_add_line(p, x, y, N, NULL, OKERR));
    OK(dk_plot_add_band(p, 1.25, 1.37, "FWHM", OKERR));
    OK(dk_plot_set_xlabel(p, "Signal wavelength λ<sub>s</sub> (µm)", OKERR));
    OK(dk_plot_set_ylabel(p, "Parametric gain G", OKERR));
    OK(dk_plot_set_top_axis(p, dk_plot_um_to_per_cm, dk_plot_per_cm_to_um,
                            NULL, "Wavenumber (cm<sup>−1</sup>)", OKERR));
    return p;
}

/* A phase-matching angle over 0.6-2 µm: top-axis labels from 16667 to
 * 5000 cm⁻¹, the last at the right edge. */
static dk_plot *
angle_figure(double w, double h)
{
    dk_plot *p = new_plot(w, h);
    enum { N = 100 };
    double x[N], y[N];
    for (int i = 0; i < N; i++) {
        x[i] = 0.6 + 1.4 * i / (N - 1);
        y[i] = 20 + 20 * pow((x[i] - 1.52) / 0.92, 2);
    }
    OK(dk_plot_add_line(p, x, y, N, NULL, OKERR));
    OK(dk_plot_set_xlabel(p, "Fundamental wavelength (µm)", OKERR));
    OK(dk_plot_set_ylabel(p, "Phase-matching angle θ (°)", OKERR));
    OK(dk_plot_set_top_axis(p, dk_plot_um_to_per_cm, dk_plot_per_cm_to_um,
                            NULL, "Wavenumber (cm<sup>−1</sup>)", OKERR));
    return p;
}

/* The footnote lines, joined again by "; ", into @buf; their count. Each
 * lies on the page at the bottom left, below every other text and the
 * legend. */
static int
footnote_of(const plot_layout *L, char *buf, size_t n)
{
    buf[0] = '\0';
    int nlines = 0;
    double left = NAN;
    double top = INFINITY;
    for (int i = 0; i < L->ntexts; i++) {
        const plot_text *t = &L->texts[i];
        if (t->kind != PLOT_TEXT_NOTE)
            continue;
        if (nlines++)
            g_strlcat(buf, "; ", n);
        g_strlcat(buf, t->markup, n);
        assert_true(t->x >= 0 && t->x + t->w <= L->page_w + 1e-9);
        assert_true(t->y + t->h <= L->page_h + 1e-9);
        if (isnan(left))
            left = t->x;
        assert_true(fabs(t->x - left) < 1e-9);   /* flush left */
        top = fmin(top, t->y);
    }
    for (int i = 0; i < L->ntexts; i++) {
        const plot_text *t = &L->texts[i];
        if (t->kind != PLOT_TEXT_NOTE)
            assert_true(t->y + t->h <= top + 1e-9);
    }
    if (nlines && L->legend_where != PLOT_LEGEND_HIDDEN)
        assert_true(L->legend_box[1] + L->legend_box[3] <= top + 1e-9);
    return nlines;
}

/* Notes (what a figure rests on) are a footnote: joined by "; ", wrapped
 * between notes on a narrow page, below the axes, labels and an outside
 * legend; refused when empty, malformed or too many. */
static void
figure_notes(void **state)
{
    (void)state;
    static const char *const notes[] = {
        "<i>assumed:</i> data set Alpha2001", "temperature 25 C",
        "solution 2 of 3", "<i>from memory:</i> the d coefficients of B"};
    const char *joined = "<i>assumed:</i> data set Alpha2001; temperature "
                         "25 C; solution 2 of 3; <i>from memory:</i> the d "
                         "coefficients of B";
    static const double widths[] = {DK_PLOT_DOUBLE_COLUMN_MM,
                                    DK_PLOT_SINGLE_COLUMN_MM, 45};
    int rows[3];
    for (int w = 0; w < 3; w++) {
        dk_plot *p = new_plot(widths[w], 64);
        double x[5] = {0, 1, 2, 3, 4}, y[5] = {0, 1, 4, 9, 16};
        for (int s = 0; s < 6; s++) {
            double ys[5];
            for (int k = 0; k < 5; k++)
                ys[k] = y[k] + s;
            OK(dk_plot_add_line(p, x, ys, 5, "a labelled series", OKERR));
        }
        dk_plot_set_legend(p, DK_PLOT_LEGEND_OUTSIDE);
        for (int i = 0; i < 4; i++)
            OK(dk_plot_add_note(p, notes[i], OKERR));
        char name[32];
        snprintf(name, sizeof name, "notes-%d", w);
        check_layout(p, name);
        plot_layout L;
        OK(plot_layout_compute(p, &L, OKERR));
        char buf[512];
        rows[w] = footnote_of(&L, buf, sizeof buf);
        assert_string_equal(buf, joined);
        plot_layout_release(&L);
        dk_plot_free(p);
    }
    assert_int_equal(rows[0], 1);      /* a wide page takes it in one */
    assert_true(rows[2] > 1 && rows[2] >= rows[1]);
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    dk_error e = {0};
    assert_int_equal(dk_plot_add_note(p, "", &e), DK_EINVAL);
    assert_int_equal(dk_plot_add_note(p, NULL, &e), DK_EINVAL);
    assert_int_equal(dk_plot_add_note(p, "<i>open", &e), DK_EINVAL);
    assert_non_null(strstr(e.msg, "malformed"));
    for (int i = 0; i < DK_PLOT_MAX_NOTES; i++)
        OK(dk_plot_add_note(p, "a note", OKERR));
    assert_int_equal(dk_plot_add_note(p, "one too many", &e), DK_EINVAL);
    assert_non_null(strstr(e.msg, "at most"));
    dk_plot_free(p);
}

/* A command's figure carries the default choices and from-memory numbers
 * noted so far as its footnote (cli_plot_add_notes), each cut to its
 * head, each kind named once; range notes and cautions are left to the
 * lines' own marks and the text output. */
static void
command_figure_notes(void **state)
{
    (void)state;
    cli_set_streams(NULL, NULL);   /* starts with no notes */
    dk_notes n;
    dk_notes_clear(&n);
    dk_notes_add(&n, DK_NOTE_DEFAULT, "default-set",
                 "data set Gayer2008 (first set in the file); 2 sets exist: "
                 "pick one with --dispersion");
    dk_notes_add(&n, DK_NOTE_DEFAULT, "default-temperature",
                 "temperature 25 C (not given; set it with --temp)");
    dk_notes_add(&n, DK_NOTE_MEMORY, "from-memory:d",
                 "the d coefficients of A&B are typed from memory; treat "
                 "d_eff as an estimate");
    dk_notes_add(&n, DK_NOTE_RANGE, "range:idler",
                 "the idler lies outside the fitted range");
    cli_take_notes(&n);
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    double x[3] = {0, 1, 2}, y[3] = {0, 1, 4};
    OK(dk_plot_add_line(p, x, y, 3, NULL, OKERR));
    OK(cli_plot_add_notes(p, OKERR));
    plot_layout L;
    OK(plot_layout_compute(p, &L, OKERR));
    char buf[512];
    footnote_of(&L, buf, sizeof buf);
    assert_string_equal(buf, "<i>assumed:</i> data set Gayer2008; "
                             "temperature 25 C; <i>from memory:</i> the d "
                             "coefficients of A&amp;B");
    plot_layout_release(&L);
    dk_plot_free(p);
    cli_set_streams(NULL, NULL);
}

static void
layouts_without_overlap(void **state)
{
    (void)state;
    dk_plot *p = tuning_figure();
    check_layout(p, "tuning");
    dk_plot_free(p);
    p = map_figure();
    check_layout(p, "map");
    dk_plot_free(p);
    p = turning_family(DK_PLOT_SINGLE_COLUMN_MM, 64);
    check_layout(p, "turning");
    dk_plot_free(p);
    p = acceptance_figure();
    check_layout(p, "acceptance");
    dk_plot_free(p);
    p = gain_figure();
    check_layout(p, "gain");
    dk_plot_free(p);
    p = angle_figure(DK_PLOT_SINGLE_COLUMN_MM, 64);
    check_layout(p, "angle");
    dk_plot_free(p);
    /* Every preset, and tiny figures that keep every label on the page. */
    int n;
    const dk_plot_size *pre = dk_plot_size_presets(&n);
    for (int i = 0; i < n; i++) {
        char name[32];
        p = turning_family(pre[i].width_mm, pre[i].height_mm);
        snprintf(name, sizeof name, "turning-%s", pre[i].name);
        check_layout(p, name);
        dk_plot_free(p);
        p = angle_figure(pre[i].width_mm, pre[i].height_mm);
        snprintf(name, sizeof name, "angle-%s", pre[i].name);
        check_layout(p, name);
        dk_plot_free(p);
    }
    p = turning_family(40, 30);
    check_layout(p, "turning-40x30");
    dk_plot_free(p);
    p = angle_figure(40, 30);
    check_layout(p, "angle-40x30");
    dk_plot_free(p);
}

/* The y multiplier ends the axis label instead of standing in the
 * top-axis label row; the turning point of a tuning curve is clear of
 * the frame; the legend leaves the data for outside when it must. */
static void
layout_details(void **state)
{
    (void)state;
    dk_plot *p = gain_figure();
    plot_layout L;
    OK(plot_layout_compute(p, &L, OKERR));
    assert_int_equal(L.y.exp10, 5);
    assert_non_null(strstr(L.ylabel, "(\xc3\x97" "10<sup>5</sup>)"));
    for (int i = 0; i < L.ntexts; i++)
        assert_int_not_equal(L.texts[i].kind, PLOT_TEXT_MULT);
    plot_layout_release(&L);
    dk_plot_free(p);

    p = turning_family(DK_PLOT_SINGLE_COLUMN_MM, 64);
    OK(plot_layout_compute(p, &L, OKERR));
    assert_true(L.x.hi > 140 + 0.02 * (140 - 20)); /* turning point clear */
    int branches = 0;
    for (int i = 0; i < L.ntexts; i++)
        branches += L.texts[i].kind == PLOT_TEXT_BRANCH;
    assert_int_equal(branches, 2);
    plot_layout_release(&L);
    /* Forced outside: right of the axes, clear of them. */
    dk_plot_set_legend(p, DK_PLOT_LEGEND_OUTSIDE);
    OK(plot_layout_compute(p, &L, OKERR));
    assert_int_equal(L.legend_where, PLOT_LEGEND_OUTSIDE);
    assert_true(L.legend_box[0] > L.ax_x + L.ax_w);
    plot_layout_release(&L);
    /* No legend at all. */
    dk_plot_set_legend(p, DK_PLOT_LEGEND_NONE);
    OK(plot_layout_compute(p, &L, OKERR));
    assert_int_equal(L.legend_where, PLOT_LEGEND_HIDDEN);
    for (int i = 0; i < L.ntexts; i++)
        assert_int_not_equal(L.texts[i].kind, PLOT_TEXT_LEGEND);
    plot_layout_release(&L);
    dk_plot_free(p);

    /* A title sits above everything else. */
    p = map_figure();
    OK(dk_plot_set_title(p, "Phase matching of the demo OPO", OKERR));
    dk_plot_set_legend(p, DK_PLOT_LEGEND_OUTSIDE);
    check_layout(p, "map-title");
    OK(plot_layout_compute(p, &L, OKERR));
    double title_bottom = -1, others_top = INFINITY;
    for (int i = 0; i < L.ntexts; i++)
        if (L.texts[i].kind == PLOT_TEXT_TITLE)
            title_bottom = L.texts[i].y + L.texts[i].h;
        else
            others_top = fmin(others_top, L.texts[i].y);
    assert_true(title_bottom > 0 && title_bottom <= others_top);
    assert_true(title_bottom <= L.ax_y);
    plot_layout_release(&L);
    dk_plot_free(p);
}

/* Type follows the figure: 8 pt for a column, 18 pt on a slide, 5 pt at
 * 40 x 30 mm; a set size wins. */
static void
type_sizes(void **state)
{
    (void)state;
    static const struct {
        double w, h, pt;
    } cases[] = {
        {85, 64, 8}, {175, 105, 8}, {254, 143, 18}, {40, 30, 5},
        {60, 45, 8 * 45.0 / 64}, {1000, 1000, 48},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        dk_plot *p = new_plot(cases[i].w, cases[i].h);
        OK(dk_plot_set_xrange(p, 0, 1, OKERR));
        OK(dk_plot_set_yrange(p, 0, 1, OKERR));
        plot_layout L;
        OK(plot_layout_compute(p, &L, OKERR));
        assert_within(L.f, cases[i].pt, 1e-9, 0);
        plot_layout_release(&L);
        OK(dk_plot_set_font_size_pt(p, 6, OKERR));
        OK(plot_layout_compute(p, &L, OKERR));
        assert_within(L.f, 6, 0, 0);
        plot_layout_release(&L);
        dk_plot_free(p);
    }
}

/* ---- Flags, regions, branches, log axes ------------------------------- */

/* Whether some pixel in the @r-pixel square around (px, py) is within
 * @tol of @want. */
static int
colour_near(cairo_surface_t *s, double px, double py, int r,
            const double want[3], double tol)
{
    for (int dy = -r; dy <= r; dy++)
        for (int dx = -r; dx <= r; dx++) {
            double got[3];
            pixel(s, (int)floor(px) + dx, (int)floor(py) + dy, got);
            if (fabs(got[0] - want[0]) <= tol &&
                fabs(got[1] - want[1]) <= tol && fabs(got[2] - want[2]) <= tol)
                return 1;
        }
    return 0;
}

static void
flagged_lines_and_regions(void **state)
{
    (void)state;
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    OK(dk_plot_set_xrange(p, 0, 1, OKERR));
    OK(dk_plot_set_yrange(p, 0, 1, OKERR));
    enum { N = 101 };
    double x[N], y[N];
    unsigned char fl[N];
    for (int i = 0; i < N; i++) {
        x[i] = i / 100.0;
        y[i] = 0.5;
        fl[i] = x[i] > 0.6 ? DK_PLOT_FLAG_OUTSIDE_FIT : 0;
    }
    OK(dk_plot_add_line_flagged(p, x, y, fl, N, "idler", OKERR));
    OK(dk_plot_add_region(p, DK_PLOT_Y_AXIS, -INFINITY, 0.2,
                          "not transparent", OKERR));
    dk_plot_set_legend(p, DK_PLOT_LEGEND_UPPER_RIGHT);
    cairo_surface_t *s = render_png(p, "flagged.png");
    double c0[3], light[3], px, py;
    dk_palette_rgb(0, c0);
    for (int c = 0; c < 3; c++)
        light[c] = c0[c] + 0.5 * (1 - c0[c]);
    /* Inside the fitted range: the series colour; outside: never the full
     * colour, but its lighter form (the dots). */
    OK(dk_plot_data_to_pixel(p, 0.3, 0.5, &px, &py, OKERR));
    assert_colour(s, px, py, c0, 2.5 / 255, "line inside the fit");
    int light_seen = 0;
    for (double xx = 0.7; xx <= 0.9; xx += 0.01) {
        OK(dk_plot_data_to_pixel(p, xx, 0.5, &px, &py, OKERR));
        if (colour_near(s, px, py, 3, c0, 0.08))
            fail_msg("full-strength line at x = %.2f, outside the fit", xx);
        light_seen |= colour_near(s, px, py, 3, light, 0.06);
    }
    assert_true(light_seen);
    /* The region is neutral grey (fill or hatch), the paper above it
     * white. */
    OK(dk_plot_data_to_pixel(p, 0.5, 0.1, &px, &py, OKERR));
    double g[3];
    pixel(s, (int)px, (int)py, g);
    assert_true(fabs(g[0] - g[1]) < 0.02 && fabs(g[1] - g[2]) < 0.02);
    assert_true(g[0] > 0.3 && g[0] < 0.95);
    double white[3] = {1, 1, 1};
    OK(dk_plot_data_to_pixel(p, 0.5, 0.3, &px, &py, OKERR));
    assert_colour(s, px, py, white, 0, "paper above the region");
    cairo_surface_destroy(s);
    /* The legend names the flagged style and the region. */
    plot_layout L;
    OK(plot_layout_compute(p, &L, OKERR));
    int note = 0, region = 0;
    for (int i = 0; i < L.nitems; i++) {
        note += L.items[i].kind == PLOT_ITEM_OUTSIDE_FIT &&
                strstr(L.items[i].markup, "fitted range") != NULL;
        region += L.items[i].kind == PLOT_ITEM_REGION;
    }
    assert_int_equal(note, 1);
    assert_int_equal(region, 1);
    plot_layout_release(&L);
    /* A region never widens the automatic range. */
    dk_plot_free(p);
    p = new_plot(85, 60);
    double lx[2] = {1, 2}, ly[2] = {1, 2};
    OK(dk_plot_add_line(p, lx, ly, 2, NULL, OKERR));
    OK(dk_plot_add_region(p, DK_PLOT_X_AXIS, 1.8, 5, NULL, OKERR));
    OK(plot_layout_compute(p, &L, OKERR));
    assert_true(L.x.hi < 2.5);
    plot_layout_release(&L);
    dk_plot_free(p);

    /* Map cells: NaN light grey hatched, "not transparent" grey
     * cross-hatched, both neutral, never white. */
    enum { NX = 11, NY = 6 };
    double z[NX * NY];
    unsigned char mf[NX * NY];
    for (int j = 0; j < NY; j++)
        for (int i = 0; i < NX; i++) {
            z[j * NX + i] = i < 3 ? NAN : i / 10.0;
            mf[j * NX + i] = i >= 8 ? DK_PLOT_FLAG_NOT_TRANSPARENT : 0;
        }
    p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    OK(dk_plot_set_map(p, z, NX, NY, 0, 1, 0, 1, "z", OKERR));
    OK(dk_plot_set_map_flags(p, mf, "no phase matching", OKERR));
    s = render_png(p, "map-flags.png");
    static const double at[2] = {0.1, 0.95};
    for (int k = 0; k < 2; k++) {
        OK(dk_plot_data_to_pixel(p, at[k], 0.5, &px, &py, OKERR));
        pixel(s, (int)px, (int)py, g);
        assert_true(fabs(g[0] - g[1]) < 0.02 && fabs(g[1] - g[2]) < 0.02);
        assert_true(g[0] > 0.3 && g[0] < 0.95);
    }
    cairo_surface_destroy(s);
    OK(plot_layout_compute(p, &L, OKERR));
    int blank = 0, opaque = 0;
    for (int i = 0; i < L.nitems; i++) {
        blank += L.items[i].kind == PLOT_ITEM_MAP_BLANK;
        opaque += L.items[i].kind == PLOT_ITEM_MAP_OPAQUE;
    }
    assert_int_equal(blank, 1);
    assert_int_equal(opaque, 1);
    plot_layout_release(&L);
    dk_plot_free(p);
}

/* Logarithmic axes: decades equally spaced, labels 1, 10, 100, 1000 and
 * 10^k beyond; values ≤ 0 have no place. */
static void
log_axes(void **state)
{
    (void)state;
    dk_plot *p = new_plot(DK_PLOT_SINGLE_COLUMN_MM, 64);
    enum { N = 50 };
    double x[N], y[N];
    for (int i = 0; i < N; i++) {
        x[i] = pow(10, 3.0 * i / (N - 1));
        y[i] = x[i] * x[i] * 1e3;
    }
    OK(dk_plot_add_line(p, x, y, N, "x²", OKERR));
    OK(dk_plot_set_log(p, 1, 1, OKERR));
    OK(dk_plot_set_xlabel(p, "Length (mm)", OKERR));
    OK(dk_plot_set_ylabel(p, "Something", OKERR));
    plot_layout L;
    OK(plot_layout_compute(p, &L, OKERR));
    assert_true(L.x.log && L.y.log);
    assert_int_equal(L.x.nticks, 4);
    static const char *const want[4] = {"1", "10", "100", "1000"};
    for (int i = 0; i < 4; i++) {
        assert_within(L.x.ticks[i], pow(10, i), 1e-12, 0);
        assert_string_equal(L.x.labels[i], want[i]);
    }
    assert_true(L.y.nticks >= 3);
    for (int i = 0; i < L.y.nticks; i++)
        assert_int_equal(strstr(L.y.labels[i], "10<sup>") != NULL,
                         L.y.ticks[i] >= 1e4);
    plot_layout_release(&L);
    double p1, p10, p100, py;
    OK(dk_plot_data_to_pixel(p, 1, 1e3, &p1, &py, OKERR));
    OK(dk_plot_data_to_pixel(p, 10, 1e3, &p10, &py, OKERR));
    OK(dk_plot_data_to_pixel(p, 100, 1e3, &p100, &py, OKERR));
    assert_within(p100 - p10, p10 - p1, 1e-9, 0);
    dk_error err = {0};
    assert_int_equal(dk_plot_data_to_pixel(p, -1, 1e3, &p1, &py, &err),
                     DK_EINVAL);
    check_layout(p, "loglog");
    /* Ranges that reach zero cannot be logarithmic. */
    assert_int_equal(dk_plot_set_xrange(p, 0, 10, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "logarithmic"));
    OK(dk_plot_set_log(p, 0, 1, OKERR));
    OK(dk_plot_set_xrange(p, -1, 10, OKERR));
    assert_int_equal(dk_plot_set_log(p, 1, 1, &err), DK_EINVAL);
    dk_plot_free(p);
    /* No positive data on a log axis. */
    p = new_plot(85, 60);
    double nx[2] = {1, 2}, ny[2] = {-1, -2};
    OK(dk_plot_add_line(p, nx, ny, 2, NULL, OKERR));
    OK(dk_plot_set_log(p, 0, 1, OKERR));
    char path[256];
    path_in(path, sizeof path, "neg-log.pdf");
    assert_int_equal(dk_plot_write(p, path, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "logarithmic"));
    dk_plot_free(p);
}

static void
new_api_errors(void **state)
{
    (void)state;
    dk_error err = {0};
    dk_plot *p = new_plot(85, 60);
    double x[3] = {0, 1, 2}, y[3] = {1, 2, 3};
    unsigned char bad[3] = {0, 4, 0};
    assert_int_equal(dk_plot_add_line_flagged(p, x, y, bad, 3, "f", &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "flag"));
    assert_int_equal(dk_plot_series_count(p), 0);
    assert_int_equal(dk_plot_label_branch(p, 0, 0, "signal", &err),
                     DK_EINVAL);
    assert_non_null(strstr(err.msg, "no line 0"));
    OK(dk_plot_add_line(p, x, y, 3, NULL, OKERR));
    assert_int_equal(dk_plot_series_count(p), 1);
    assert_int_equal(dk_plot_label_branch(p, 0, -1, "signal", &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_label_branch(p, 0, 0, "", &err), DK_EINVAL);
    assert_int_equal(dk_plot_label_branch(p, 0, 0, "<b>s", &err), DK_EINVAL);
    OK(dk_plot_label_branch(p, 0, 5, "no such branch", OKERR)); /* skipped */
    assert_int_equal(dk_plot_add_region(p, DK_PLOT_X_AXIS, 2, 1, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_add_region(p, DK_PLOT_X_AXIS, NAN, 1, NULL,
                                        &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_add_region(p, (dk_plot_axis)7, 0, 1, NULL, &err),
                     DK_EINVAL);
    assert_int_equal(dk_plot_set_map_flags(p, bad, NULL, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "dk_plot_set_map"));
    assert_int_equal(dk_plot_set_title(p, "<i>t", &err), DK_EINVAL);
    OK(dk_plot_set_title(p, "t", OKERR));
    OK(dk_plot_set_title(p, NULL, OKERR));
    char path[256];
    path_in(path, sizeof path, "api.svg");
    OK(dk_plot_write(p, path, OKERR));
    check_svg(path);
    dk_plot_free(p);
}

/* ---- PNG resolution --------------------------------------------------- */

/* The pHYs chunk of a PNG file: pixels per metre and unit; -1 when there
 * is none before the first IDAT (PNG specification §11.3.5.3). */
static long
png_ppm(const char *path, int *unit, int *crc_ok)
{
    size_t n;
    unsigned char *b = slurp(path, &n);
    long ppm = -1;
    size_t at = 8;
    while (b && at + 12 <= n) {
        unsigned long len = (unsigned long)b[at] << 24 |
                            (unsigned long)b[at + 1] << 16 |
                            (unsigned long)b[at + 2] << 8 | b[at + 3];
        if (at + 12 + len > n || memcmp(b + at + 4, "IDAT", 4) == 0)
            break;
        if (memcmp(b + at + 4, "pHYs", 4) == 0 && len == 9) {
            const unsigned char *d = b + at + 8;
            ppm = (long)((unsigned long)d[0] << 24 |
                         (unsigned long)d[1] << 16 |
                         (unsigned long)d[2] << 8 | d[3]);
            *unit = d[8];
            const unsigned char *c = d + 9;
            unsigned long crc = (unsigned long)c[0] << 24 |
                                (unsigned long)c[1] << 16 |
                                (unsigned long)c[2] << 8 | c[3];
            *crc_ok = crc == plot_png_crc(b + at + 4, 13);
            break;
        }
        at += 12 + len;
    }
    free(b);
    return ppm;
}

static void
png_resolution(void **state)
{
    (void)state;
    /* CRC-32 check value of "123456789": 0xCBF43926 (the standard check
     * of the ISO 3309 / ITU-T V.42 CRC, as listed in G. Cook's catalogue
     * of parametrised CRC algorithms, "CRC-32/ISO-HDLC"). */
    assert_int_equal(plot_png_crc((const unsigned char *)"123456789", 9),
                     0xcbf43926UL);
    dk_plot *p = tuning_figure();
    static const struct {
        double dpi;
        long ppm;
    } cases[] = {{300, 11811}, {96, 3780}, {600, 23622}};
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        char path[256];
        path_in(path, sizeof path, "dpi.png");
        OK(dk_plot_set_png_dpi(p, cases[i].dpi, OKERR));
        OK(dk_plot_write(p, path, OKERR));
        int unit = -1, crc_ok = 0;
        assert_int_equal(png_ppm(path, &unit, &crc_ok), cases[i].ppm);
        assert_int_equal(unit, 1);
        assert_true(crc_ok);
        /* Still a PNG that a reader accepts, of the right size. */
        check_png(p, path, DK_PLOT_SINGLE_COLUMN_MM, 64, cases[i].dpi);
        if (access("/usr/bin/python3", X_OK) == 0) {
            /* An independent CRC: Python's zlib over the whole file. */
            char cmd[600];
            snprintf(cmd, sizeof cmd,
                     "/usr/bin/python3 -c 'import sys, zlib, struct\n"
                     "b = open(sys.argv[1], \"rb\").read(); i = 8\n"
                     "while i < len(b):\n"
                     "    n, = struct.unpack(\">I\", b[i:i+4])\n"
                     "    c, = struct.unpack(\">I\", b[i+8+n:i+12+n])\n"
                     "    assert zlib.crc32(b[i+4:i+8+n]) == c\n"
                     "    i += 12 + n\n' '%s'",
                     path);
            assert_int_equal(system(cmd), 0);
        }
    }
    dk_plot_free(p);
}

/* Cairo's SVG surface writes glyph outlines, not <text> (see plot.h):
 * if a cairo update ever writes text, this fails and the note in plot.h
 * must change. */
static void
svg_text_is_outlines(void **state)
{
    (void)state;
    dk_plot *p = tuning_figure();
    char path[256];
    path_in(path, sizeof path, "text.svg");
    OK(dk_plot_write(p, path, OKERR));
    size_t n;
    unsigned char *b = slurp(path, &n);
    assert_non_null(b);
    assert_null(strstr((char *)b, "<text"));
    assert_non_null(strstr((char *)b, "glyph"));
    free(b);
    dk_plot_free(p);
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
        cmocka_unit_test(figure_notes),
        cmocka_unit_test(command_figure_notes),
        cmocka_unit_test(styles_distinct_in_greyscale),
        cmocka_unit_test(layouts_without_overlap),
        cmocka_unit_test(layout_details),
        cmocka_unit_test(type_sizes),
        cmocka_unit_test(flagged_lines_and_regions),
        cmocka_unit_test(log_axes),
        cmocka_unit_test(new_api_errors),
        cmocka_unit_test(png_resolution),
        cmocka_unit_test(svg_text_is_outlines),
    };
    return cmocka_run_group_tests_name("plot", tests, setup, teardown);
}
