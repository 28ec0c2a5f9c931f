/*
 * fuzz_design.c - libFuzzer target for the design-file reader of
 * `deltak run` (src/cli/run.c), in its --check mode: the file is read and
 * every rule checked (line length, NUL bytes, control characters, the
 * commands allowed, where outputs may go), nothing is run.
 *
 * Promises checked: the exit code is 0, 1 or 2; every message is one line
 * per error without raw control bytes; nothing is written but into the
 * command's own buffers.
 */
#include <unistd.h>

#include "cli/cli.h"
#include "cli/commands.h"
#include "fuzz_common.h"

static char dir[] = "/tmp/deltak-fuzz-design-XXXXXX";
static char path[64];

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (!path[0]) {
        FUZZ_REQUIRE(mkdtemp(dir) != NULL);
        snprintf(path, sizeof path, "%s/d.dk", dir);
    }
    FILE *f = fopen(path, "wb");
    FUZZ_REQUIRE(f != NULL);
    fwrite(data, 1, size, f);
    fclose(f);
    char *out = NULL, *err = NULL;
    size_t nout = 0, nerr = 0;
    FILE *o = open_memstream(&out, &nout), *e = open_memstream(&err, &nerr);
    FUZZ_REQUIRE(o && e);
    cli_set_streams(o, e);
    char *argv[] = {"run", "--check", path, NULL};
    int rc = cmd_run(3, argv);
    cli_warnings_flush();
    cli_set_streams(NULL, NULL);
    fclose(o);
    fclose(e);
    FUZZ_REQUIRE(rc == 0 || rc == 1 || rc == 2);
    for (size_t i = 0; i < nerr; i++)
        FUZZ_REQUIRE((unsigned char)err[i] >= 0x20 || err[i] == '\n');
    /* Only the folder's own file: the check writes nothing. */
    FUZZ_REQUIRE(access(path, F_OK) == 0);
    free(out);
    free(err);
    return 0;
}
