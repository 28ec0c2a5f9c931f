/*
 * test_chip.c - multi-grating layouts (deltak/chip.h): the union of the
 * gratings' oven-tuning ranges must cover the target range with the
 * requested overlap, and each range end must be what the period solver
 * gives back (a round trip through dk_qpm_solve_temperature).
 */
#include "testutil.h"

#include "deltak/chip.h"
#include "deltak/crystal.h"

static void
covers_target_with_overlap(void **state)
{
    (void)state;
    dk_db *db = NULL;
    dk_error err = {0};
    assert_int_equal(dk_db_load(DK_CRYSTAL_DIR, &db, &err), DK_OK);
    const dk_crystal *c = dk_db_find(db, "MgO:LN");
    dk_qpm q;
    assert_int_equal(dk_qpm_init(&q, c, &c->sets[0], NULL, 1, 0.5, 25, &err),
                     DK_OK);
    const double oven[2] = {30, 200};
    dk_grating g[32];
    int n;
    assert_int_equal(dk_chip_gratings(&q, 1.064, 0, 2.8, 4.2, oven, 0.1, g,
                                      32, &n, &err),
                     DK_OK);
    assert_true(n >= 2 && n < 32);
    assert_within(g[0].lo_um, 2.8, 0, 1e-6);
    assert_true(g[n - 1].hi_um >= 4.2);
    for (int i = 0; i < n; i++) {
        assert_true(g[i].hi_um > g[i].lo_um);
        if (i > 0) {
            /* Continuous, and overlapping by 10 % of the previous range. */
            double want = g[i - 1].hi_um - 0.1 * (g[i - 1].hi_um -
                                                  g[i - 1].lo_um);
            assert_within(g[i].lo_um, want, 0, 1e-5);
            assert_true(g[i].period_um < g[i - 1].period_um);
        }
        /* Round trip: the idler at the low end phase-matches at the
         * temperature the layout says. */
        dk_waves w = {1.064, 0, g[i].lo_um};
        dk_waves_complete(&w, &err);
        double t[4];
        int nt;
        assert_int_equal(dk_qpm_solve_temperature(&q, &w, g[i].period_um,
                                                  oven[0] - 1, oven[1] + 1, t,
                                                  4, &nt, &err),
                         DK_OK);
        assert_int_equal(nt, 1);
        assert_within(t[0], g[i].t_lo_c, 0, 1e-3);
    }
    /* An oven range of zero width cannot tune anything. */
    const double flat[2] = {50, 50.001};
    assert_int_equal(dk_chip_gratings(&q, 1.064, 0, 2.8, 4.2, flat, 0.1, g, 4,
                                      &n, &err),
                     DK_ENOROOT);
    dk_db_free(db);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(covers_target_with_overlap),
    };
    return cmocka_run_group_tests_name("chip", tests, NULL, NULL);
}
