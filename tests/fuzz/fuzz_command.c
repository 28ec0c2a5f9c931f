/*
 * fuzz_command.c - libFuzzer target for the command line of every command
 * called in-process (deltak/command.h): option parsing, units, ranges,
 * sweep and map specifications, the design layer's checks.
 *
 * The input is the argument list: the first byte picks the command, the
 * rest is split at NUL bytes into arguments (at most 24). Figures are
 * not drawn (--plot is dropped: the figure writer has its own tests).
 *
 * Promises checked: the exit code is 0, 1 or 2; a failure explains itself
 * on stderr and writes nothing on stdout; messages carry no raw control
 * bytes (user text is escaped).
 */
#include "deltak/command.h"
#include "fuzz_common.h"

static const char *const commands[] = {"index", "period", "angle",
                                       "tolerance", "pulse", "gain",
                                       "sweep", "chip", "crystals"};

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (size < 1 || size > 4096)
        return 0;
    const char *argv[26];
    int argc = 0;
    argv[argc++] = commands[data[0] % (sizeof commands / sizeof *commands)];
    char *text = fuzz_string(data + 1, size - 1);
    /* fuzz_string stops at the first NUL: split the raw bytes instead. */
    free(text);
    text = malloc(size);
    FUZZ_REQUIRE(text != NULL);
    memcpy(text, data + 1, size - 1);
    text[size - 1] = '\0';
    for (size_t i = 0, start = 0; i < size && argc < 25; i++)
        if (i == size - 1 || text[i] == '\0') {
            const char *a = text + start;
            if (strcmp(a, "--plot") == 0 && i + 1 < size - 1) {
                /* skip the option and its value */
                size_t j = i + 1;
                while (j < size - 1 && text[j])
                    j++;
                i = j;
                start = j + 1;
                continue;
            }
            argv[argc++] = a;
            start = i + 1;
        }
    argv[argc] = NULL;
    dk_command_result r;
    int rc = dk_command_run(argc, argv, &r);
    FUZZ_REQUIRE(rc == 0 || rc == 1 || rc == 2);
    if (rc != 0) {
        FUZZ_REQUIRE(r.nout == 0);
        FUZZ_REQUIRE(r.nerr > 0);
    }
    for (size_t i = 0; i < r.nerr; i++)
        FUZZ_REQUIRE((unsigned char)r.err[i] >= 0x20 || r.err[i] == '\n');
    dk_command_result_free(&r);
    free(text);
    return 0;
}
