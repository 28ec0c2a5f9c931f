/*
 * bench_index.c - time n(λ, T) with its derivatives and the database load.
 * Prints rates; asserts nothing (speed is measured, never tested).
 */
#include <stdio.h>
#include <time.h>

#include "deltak/crystal.h"
#include "deltak/material.h"

static double
now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

int
main(void)
{
    dk_db *db = NULL;
    dk_error err = {0};
    double t0 = now();
    for (int i = 0; i < 20; i++) {
        dk_db_free(db);
        if (dk_db_load(DK_CRYSTAL_DIR, &db, &err)) {
            fprintf(stderr, "error: %s\n", err.msg);
            return 1;
        }
    }
    double t1 = now();
    printf("database load (%d crystals): %.2f ms\n", db->ncrystals,
           (t1 - t0) / 20 * 1e3);
    const dk_crystal *c = dk_db_find(db, "MgO:LN");
    const dk_dispersion_set *s = &c->sets[0];
    const int n = 1000000;
    double sum = 0;
    t0 = now();
    for (int i = 0; i < n; i++) {
        dk_index_value v;
        dk_material_index(c, s, 'e', 1.0 + 2.0 * i / n, 40, &v, NULL);
        sum += v.n;
    }
    t1 = now();
    printf("index with derivatives (Gayer2008, e): %.0f ns per call "
           "(checksum %.6f)\n", (t1 - t0) / n * 1e9, sum / n);
    dk_db_free(db);
    return 0;
}
