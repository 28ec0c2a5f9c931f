/*
 * test_command.c - deltak's commands called in-process (deltak/command.h):
 * the same answers as the program, errors with the same exit codes, and
 * independent calls from several threads at once.
 */
#include <pthread.h>

#include "testutil.h"

#include "cli/cli.h"
#include "deltak/command.h"

#define RUN(res, ...)                                                        \
    dk_command_run(sizeof((const char *[]){__VA_ARGS__}) / sizeof(char *),  \
                   (const char *[]){__VA_ARGS__}, res)

static void
answers_and_errors(void **state)
{
    (void)state;
    dk_command_result r;
    assert_int_equal(RUN(&r, "period", "--crystal", "MgO:LN", "--dispersion",
                         "Gayer2008", "--fundamental", "1064nm", "--json"),
                     0);
    /* The QPM period of 1064 nm SHG in MgO:LN, 6.973 µm (crystal-data-
     * notes §1, from Gayer et al. 2008). */
    assert_non_null(strstr(r.out, "\"period_um\": 6.97"));
    dk_command_result_free(&r);
    assert_int_equal(RUN(&r, "period", "--crystal", "MgO:LN", "--frobnicate"),
                     2);
    assert_non_null(strstr(r.err, "unknown option '--frobnicate'"));
    assert_int_equal(r.nout, 0);
    dk_command_result_free(&r);
    assert_int_equal(RUN(&r, "run", "x.dk"), 2);
    dk_command_result_free(&r);
    assert_int_equal(RUN(&r, "nonsense"), 2);
    dk_command_result_free(&r);
    /* Notes of one call do not leak into the next. */
    assert_int_equal(RUN(&r, "index", "--crystal", "BBO", "--wavelength",
                         "1064nm"),
                     0);
    assert_non_null(strstr(r.out, "assumed: temperature 25 C"));
    dk_command_result_free(&r);
    assert_int_equal(RUN(&r, "index", "--crystal", "BBO", "--wavelength",
                         "1064nm", "--temp", "25", "--dispersion",
                         "Eimerl1987"),
                     0);
    assert_null(strstr(r.out, "assumed:"));
    dk_command_result_free(&r);
}

typedef struct job {
    int id;
    char *out;
    int rc;
} job;

static void *
worker(void *p)
{
    job *j = p;
    for (int k = 0; k < 20; k++) {
        dk_command_result r;
        const char *argv[] = {"angle",  "--crystal", j->id % 2 ? "BBO" : "LBO",
                              "--fundamental", "1064nm", "--type", "I",
                              "--json"};
        j->rc |= dk_command_run(8, argv, &r);
        if (k == 0)
            j->out = strdup(r.out ? r.out : "");
        else if (strcmp(j->out, r.out))
            j->rc |= 64;
        dk_command_result_free(&r);
    }
    return NULL;
}

/* Four threads, two questions: every answer equals the first of its kind. */
static void
threads(void **state)
{
    (void)state;
    pthread_t t[4];
    job j[4] = {{0, NULL, 0}, {1, NULL, 0}, {2, NULL, 0}, {3, NULL, 0}};
    for (int i = 0; i < 4; i++)
        assert_int_equal(pthread_create(&t[i], NULL, worker, &j[i]), 0);
    for (int i = 0; i < 4; i++)
        pthread_join(t[i], NULL);
    for (int i = 0; i < 4; i++)
        assert_int_equal(j[i].rc, 0);
    assert_string_equal(j[0].out, j[2].out);
    assert_string_equal(j[1].out, j[3].out);
    assert_true(strcmp(j[0].out, j[1].out) != 0);
    for (int i = 0; i < 4; i++)
        free(j[i].out);
}

/* Explanations folded to 79 columns (cli_wrap): every line within the
 * width counting characters (a "°" is one column, two bytes), the words
 * and their order kept, the lead and the hang in place, a word longer
 * than a line alone on its line, a '\n' in the text a line break. */
static void
wrapped_text(void **state)
{
    (void)state;
    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    assert_non_null(f);
    /* 20 words of 3 columns (4 bytes each: "ab°") and a spaced run */
    char text[512] = "";
    for (int i = 0; i < 20; i++)
        strcat(text, "ab° ");
    strcat(text, "x\ny   ");
    char big[120];
    memset(big, 'w', 100);
    big[100] = '\0';
    strcat(text, big);
    cli_wrap(f, "  note: ", "        ", text);
    /* a number keeps its unit: "25 C" moves down whole */
    cli_wrap(f, "", "    ",
             "beta-BaB2O4, data set Tamosauskas2018: pump 0.4, signal 0.6, "
             "idler 1.2 um at 25 C");
    fclose(f);
    /* 8 + 20 words: 8 + 3 + 19 x 4 = 87 columns: the first line holds
     * 18 words (8 + 3 + 17 x 4 = 79), the second the other two and "x" */
    const char *want =
        "  note: ab° ab° ab° ab° ab° ab° ab° ab° ab° ab° ab° ab° ab° ab° ab° "
        "ab° ab° ab°\n"
        "        ab° ab° x\n"
        "        y\n";
    assert_memory_equal(buf, want, strlen(want));
    const char *rest = buf + strlen(want);
    assert_int_equal(strncmp(rest, "        ", 8), 0);
    assert_memory_equal(rest + 8, big, 100);
    assert_string_equal(rest + 108,
                        "\nbeta-BaB2O4, data set Tamosauskas2018: pump 0.4, "
                        "signal 0.6, idler 1.2 um at\n    25 C\n");
    free(buf);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(answers_and_errors),
        cmocka_unit_test(wrapped_text),
        cmocka_unit_test(threads),
    };
    return cmocka_run_group_tests_name("command", tests, NULL, NULL);
}
