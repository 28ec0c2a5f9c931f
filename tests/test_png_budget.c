/*
 * test_png_budget.c - the pixel budget of PNG output (plot_write.c): the
 * largest figure the figure engine accepts (1000 x 1000 mm) would be an
 * 11811 x 11811 pixel PNG at 300 dpi, 560 MB of pixels; such a request is
 * refused with a message naming the size, the budget and the way out,
 * and leaves no file. A figure under the budget is written.
 */
#include "testutil.h"

#include <pango/pangocairo.h>
#include <unistd.h>

#include "deltak/plot.h"

/* As tests/test_plot.c: fontconfig keeps its parsed configuration for
 * the life of the process; LeakSanitizer is told so (read only under
 * -fsanitize=address). */
const char *__lsan_default_suppressions(void);
__attribute__((used)) const char *
__lsan_default_suppressions(void)
{
    return "leak:libfontconfig.so\n";
}

static dk_plot *
curve_plot(double w, double h)
{
    dk_plot *p = NULL;
    assert_int_equal(dk_plot_new(w, h, &p, NULL), DK_OK);
    double x[3] = {1, 2, 3}, y[3] = {1, 4, 9};
    assert_int_equal(dk_plot_add_line(p, x, y, 3, "y", NULL), DK_OK);
    return p;
}

static void
png_budget(void **state)
{
    (void)state;
    char dir[] = "/tmp/dk-test-png-XXXXXX", big[64], small[64];
    assert_non_null(mkdtemp(dir));
    snprintf(big, sizeof big, "%s/big.png", dir);
    snprintf(small, sizeof small, "%s/small.png", dir);
    dk_plot *p = curve_plot(DK_PLOT_MAX_MM, DK_PLOT_MAX_MM);
    dk_error err = {0};
    assert_int_equal(dk_plot_write(p, big, &err), DK_EINVAL);
    assert_non_null(strstr(err.msg, "11811 x 11811 pixels"));
    assert_non_null(strstr(err.msg, "megapixels"));
    assert_non_null(strstr(err.msg, "smaller figure size"));
    assert_int_equal(access(big, F_OK), -1);
    /* A figure under the budget is written. */
    dk_plot_free(p);
    p = curve_plot(120, 80);
    assert_int_equal(dk_plot_write(p, small, NULL), DK_OK);
    assert_int_equal(access(small, F_OK), 0);
    dk_plot_free(p);
    unlink(small);
    rmdir(dir);
    pango_cairo_font_map_set_default(NULL);
    cairo_debug_reset_static_data();
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(png_budget),
    };
    return cmocka_run_group_tests_name("png-budget", tests, NULL, NULL);
}
