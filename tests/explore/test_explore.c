/*
 * test_explore.c - the parts of `deltak explore` below HTTP: requests
 * turned into command lines (explore_request.c), the bounds on work, and
 * the worker pool with its deadline (explore_pool.c). The HTTP side is
 * tested against the running program in tests/explore/api.py.
 */
#include <errno.h>

#include "../testutil.h"

#include "explore/explore.h"

/* Build a call from a path and NULL-terminated key/value pairs; returns
 * the first non-zero status, with the message in @msg. */
static int
build(explore_call *c, const char *path, const char *const *kv, char *msg,
      size_t n)
{
    int st = explore_call_begin(c, path, msg, n);
    for (size_t i = 0; !st && kv[i]; i += 2)
        st = explore_call_param(c, kv[i], kv[i + 1],
                                kv[i + 1] ? strlen(kv[i + 1]) : 0, msg, n);
    return st ? st : explore_call_finish(c, msg, n);
}

static void
command_lines(void **state)
{
    (void)state;
    explore_call c;
    char msg[320];
    const char *const period[] = {"crystal", "MgO:LN", "pump", "1064nm",
                                  "all-sets", "", "temp", "-10", NULL};
    assert_int_equal(build(&c, "/api/period", period, msg, sizeof msg), 0);
    const char *want[] = {"period", "--crystal=MgO:LN", "--pump=1064nm",
                          "--temp=-10", "--all-sets", "--json"};
    assert_int_equal(c.argc, 6);
    for (int i = 0; i < 6; i++)
        assert_string_equal(c.argv[i], want[i]);
    assert_null(c.argv[6]);

    const char *const sweep[] = {"crystal", "BBO", "vary", "theta=20:30:11",
                                 "solve", "signal", NULL};
    assert_int_equal(build(&c, "/figure/sweep.png", sweep, msg, sizeof msg),
                     0);
    assert_int_equal(c.kind, EXPLORE_FIGURE);
    assert_string_equal(c.argv[c.argc - 1], "--plot=-.png");

    /* crystals: "name" is the crystal, after "--". */
    const char *const one[] = {"name", "-bbo", NULL};
    assert_int_equal(build(&c, "/api/crystals", one, msg, sizeof msg), 0);
    assert_int_equal(c.argc, 4);
    assert_string_equal(c.argv[1], "--json");
    assert_string_equal(c.argv[2], "--");
    assert_string_equal(c.argv[3], "-bbo");
}

static void
refused_requests(void **state)
{
    (void)state;
    explore_call c;
    char msg[320];
    struct {
        const char *path;
        const char *kv[8];
        int status;
        const char *text;
    } cases[] = {
        {"/api/run", {NULL}, 404, "no command 'run'"},
        {"/api/explore", {NULL}, 404, "no command"},
        {"/api/", {NULL}, 404, "no command"},
        {"/figure/period.svg", {NULL}, 404, "no figure"},
        {"/figure/sweep.gif", {NULL}, 404, "no figure"},
        {"/etc/passwd", {NULL}, 404, "nothing at"},
        {"/api/period", {"plot", "/tmp/x.svg", NULL}, 400, "set by the page"},
        {"/api/period", {"json", "", NULL}, 400, "set by the page"},
        {"/api/period", {"Crystal", "BBO", NULL}, 400, "not an option name"},
        {"/api/period", {"crys tal", "BBO", NULL}, 400, "not an option"},
        {"/api/period", {"crystal", "BBO\n", NULL}, 400, "control character"},
        {"/api/period", {"crystal", "BBO", "crystal", "LBO", NULL}, 400,
         "given twice"},
        {"/api/period", {"size", "single", NULL}, 400, "for figures"},
        {"/figure/sweep.svg", {"size", "5000x5000", NULL}, 400,
         "single, double or slide"},
        /* The work asked for: 2000 points, 400 x 400 cells. */
        {"/api/sweep", {"vary", "temp=20:200:2001", NULL}, 400,
         "2001 points"},
        {"/api/sweep", {"vary", "temp=20:200:1000", "family",
                        "period=29um,30um,31um", NULL}, 400, "3000 points"},
        {"/figure/sweep.svg", {"vary", "pump=1um:1.1um:401", "map",
                               "temp=20:200:400", NULL}, 400,
         "401 x 400 cells"},
        {"/figure/sweep.svg", {"vary", "pump=1um:1.1um:99999999999999999999",
                               "map", "temp=20:200:3", NULL}, 0, NULL},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        int st = build(&c, cases[i].path, cases[i].kv, msg, sizeof msg);
        if (st != cases[i].status ||
            (cases[i].text && !strstr(msg, cases[i].text))) {
            print_error("case %zu (%s): status %d, message '%s'\n", i,
                        cases[i].path, st, msg);
            fail();
        }
    }
    /* Within the bounds: 2000 points, 400 x 400 cells, the default 201. */
    const char *const ok1[] = {"vary", "temp=20:200:2000", NULL};
    assert_int_equal(build(&c, "/api/sweep", ok1, msg, sizeof msg), 0);
    const char *const ok2[] = {"vary", "temp=20:200", "family",
                               "period=1um,2um,3um,4um,5um,6um,7um,8um,9um",
                               NULL};
    assert_int_equal(build(&c, "/api/sweep", ok2, msg, sizeof msg), 0);
    const char *const ok3[] = {"vary", "temp=20:200:400", "map",
                               "pump=1um:2um:400", NULL};
    assert_int_equal(build(&c, "/figure/sweep.svg", ok3, msg, sizeof msg), 0);

    /* Too many and too long parameters. */
    assert_int_equal(explore_call_begin(&c, "/api/index", msg, sizeof msg), 0);
    char key[40], big[300];
    memset(big, 'x', sizeof big - 1);
    big[sizeof big - 1] = '\0';
    assert_int_equal(explore_call_param(&c, "crystal", big, strlen(big), msg,
                                        sizeof msg),
                     400);
    assert_non_null(strstr(msg, "longer than 256"));
    memset(key, 'k', 33);
    key[33] = '\0';
    assert_int_equal(explore_call_param(&c, key, "1", 1, msg, sizeof msg),
                     400);
    int st = 0;
    for (int i = 0; i < 30 && !st; i++) {
        snprintf(key, sizeof key, "k%d", i);
        st = explore_call_param(&c, key, "1", 1, msg, sizeof msg);
    }
    assert_int_equal(st, 400);
    assert_non_null(strstr(msg, "query parameters"));
}

/* Calls through the pool answer as dk_command_run does. */
static void
pool_answers(void **state)
{
    (void)state;
    explore_pool *p;
    assert_int_equal(explore_pool_start(2, 4, &p), 0);
    char *argv[] = {"period", "--crystal=MgO:LN", "--dispersion=Gayer2008",
                    "--fundamental=1064nm", "--json", NULL};
    dk_command_result direct, pooled;
    dk_command_run(5, (const char *const *)argv, &direct);
    assert_int_equal(explore_pool_run(p, 5, argv, 30, &pooled), EXPLORE_DONE);
    assert_int_equal(pooled.exit_code, 0);
    assert_int_equal(pooled.nout, direct.nout);
    assert_memory_equal(pooled.out, direct.out, direct.nout);
    dk_command_result_free(&pooled);
    dk_command_result_free(&direct);

    char *bad[] = {"index", "--crystal=MgO:LN", "--wavelength=1064", NULL};
    assert_int_equal(explore_pool_run(p, 3, bad, 30, &pooled), EXPLORE_DONE);
    assert_int_equal(pooled.exit_code, 2);
    assert_non_null(strstr(pooled.err, "has no unit"));
    dk_command_result_free(&pooled);
    /* explore itself is no in-process command (it serves forever). */
    char *self[] = {"explore", "--port=0", NULL};
    assert_int_equal(explore_pool_run(p, 2, self, 30, &pooled), EXPLORE_DONE);
    assert_int_equal(pooled.exit_code, 2);
    dk_command_result_free(&pooled);
    assert_int_equal(explore_pool_stop(p), 0);
    assert_int_equal(explore_pool_stop(NULL), 0);
    assert_int_equal(explore_pool_start(0, 4, &p), EINVAL);
    assert_int_equal(explore_pool_start(2, 0, &p), EINVAL);
}

/* Past the deadline the requester is answered at once and the call is
 * dropped. The pool is held, so the call is still queued when its
 * deadline passes whatever the scheduler does; once released, the pool
 * answers the same call in time. */
static void
pool_deadline(void **state)
{
    (void)state;
    explore_pool *p;
    assert_int_equal(explore_pool_start(1, 1, &p), 0);
    char *call[] = {"period", "--crystal=MgO:LN", "--pump=1064nm",
                    "--idler=3.4um", "--json", NULL};
    dk_command_result r;
    explore_pool_hold(p, 1);
    assert_int_equal(explore_pool_run(p, 5, call, 1e-3, &r), EXPLORE_LATE);
    assert_null(r.out);
    /* The late call left the queue: the queue of one has room again. */
    explore_pool_hold(p, 0);
    assert_int_equal(explore_pool_run(p, 5, call, 30, &r), EXPLORE_DONE);
    assert_int_equal(r.exit_code, 0);
    assert_non_null(strstr(r.out, "period_um"));
    dk_command_result_free(&r);
    assert_int_equal(explore_pool_stop(p), 0);
}

static void
assets(void **state)
{
    (void)state;
    const explore_asset *a = explore_asset_find("/");
    assert_non_null(a);
    assert_string_equal(a->path, "/index.html");
    assert_non_null(strstr(a->content_type, "text/html"));
    assert_true(a->size > 100);
    assert_non_null(explore_asset_find("/explore.js"));
    assert_non_null(explore_asset_find("/explore.css"));
    assert_null(explore_asset_find("/../Makefile"));
    assert_null(explore_asset_find("/index.html/"));
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(command_lines),
        cmocka_unit_test(refused_requests),
        cmocka_unit_test(pool_answers),
        cmocka_unit_test(pool_deadline),
        cmocka_unit_test(assets),
    };
    return cmocka_run_group_tests_name("explore", tests, NULL, NULL);
}
