/*
 * fuzz_crystal.c - libFuzzer target for the crystal-file loader and the
 * unit parsers: any input must give DK_OK or an error with a message,
 * never a crash, a leak or undefined behaviour.
 *
 * Build and run with `make fuzz` (needs clang; Debian package clang).
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "deltak/crystal.h"
#include "deltak/units.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    char path[] = "/tmp/deltak-fuzz-XXXXXX";
    int fd = mkstemp(path);
    if (fd < 0)
        return 0;
    if (write(fd, data, size) != (ssize_t)size) {
        close(fd);
        unlink(path);
        return 0;
    }
    close(fd);
    dk_crystal *c = NULL;
    dk_error err = {0};
    if (dk_crystal_load(path, &c, &err) == DK_OK)
        dk_crystal_free(c);
    else if (!err.msg[0])
        abort(); /* every failure must explain itself */
    unlink(path);

    /* The same bytes as a quantity with a unit. */
    char text[64];
    size_t n = size < sizeof text - 1 ? size : sizeof text - 1;
    memcpy(text, data, n);
    text[n] = '\0';
    double v;
    dk_parse_wavelength(text, &v, NULL);
    dk_parse_temperature(text, &v, NULL);
    dk_parse_length(text, &v, NULL);
    dk_parse_duration(text, &v, NULL);
    dk_parse_intensity(text, &v, NULL);
    return 0;
}
