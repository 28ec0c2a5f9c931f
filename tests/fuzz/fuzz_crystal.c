/*
 * fuzz_crystal.c - libFuzzer target for one crystal file, loaded from
 * memory with the same limits and checks as from disk
 * (src/data/crystal_load.h).
 *
 * Promises checked: any input gives DK_OK or an error with a printable
 * one-line message, never a crash, leak or undefined behaviour; a loaded
 * crystal has one-line names without control characters and sane counts.
 */
#include "data/crystal_load.h"
#include "deltak/crystal.h"
#include "deltak/text.h"
#include "fuzz_common.h"

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    dk_crystal *c = NULL;
    dk_error err = {0};
    if (dk_crystal_load_buffer("fuzz.yaml", data, size, &c, &err) != DK_OK) {
        FUZZ_REQUIRE(c == NULL);
        FUZZ_REQUIRE(fuzz_message_ok(&err));
        return 0;
    }
    FUZZ_REQUIRE(dk_text_is_clean(c->id, 0) && dk_text_is_clean(c->name, 0));
    for (int i = 0; i < c->naliases; i++)
        FUZZ_REQUIRE(dk_text_is_clean(c->aliases[i], 0));
    FUZZ_REQUIRE(c->nsets >= 1);
    for (int i = 0; i < c->nsets; i++) {
        FUZZ_REQUIRE(dk_text_is_clean(c->sets[i].name, 0));
        FUZZ_REQUIRE(c->sets[i].naxes >= 1 &&
                     c->sets[i].naxes <= DK_SET_AXES);
    }
    FUZZ_REQUIRE(c->transparency_um[0] > 0 &&
                 c->transparency_um[0] <= c->transparency_um[1]);
    dk_crystal_free(c);
    return 0;
}
