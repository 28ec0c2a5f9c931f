/*
 * fuzz_common.h - checks shared by the libFuzzer targets (tests/fuzz/).
 *
 * A finding is any crash, sanitizer report (UBSan is built to halt) or a
 * broken promise of the API, which the targets turn into abort().
 */
#ifndef DK_FUZZ_COMMON_H
#define DK_FUZZ_COMMON_H

#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/status.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* Stop the run with a reason: libFuzzer saves the input as a finding. */
#define FUZZ_REQUIRE(cond)                                                    \
    do {                                                                      \
        if (!(cond)) {                                                        \
            fprintf(stderr, "fuzz: broken promise at %s:%d: %s\n", __FILE__,  \
                    __LINE__, #cond);                                         \
            abort();                                                          \
        }                                                                     \
    } while (0)

/* A failure explains itself on one line that a terminal shows as it is:
 * non-empty, no control bytes (deltak/text.h escapes them). */
static inline int
fuzz_message_ok(const dk_error *err)
{
    if (!err->msg[0])
        return 0;
    for (const unsigned char *m = (const unsigned char *)err->msg; *m; m++)
        if (*m < 0x20 || *m == 0x7f)
            return 0;
    return 1;
}

/* The input as a NUL-terminated string (cut at an embedded NUL). */
static inline char *
fuzz_string(const uint8_t *data, size_t size)
{
    char *s = malloc(size + 1);
    if (!s)
        abort();
    memcpy(s, data, size);
    s[size] = '\0';
    return s;
}

#endif /* DK_FUZZ_COMMON_H */
