/*
 * phase_match.c - libdeltak from a C program of your own, built through
 * pkg-config against the installed library (see Makefile here).
 *
 * An invented scenario: the Millbrook Street lab pumps an MgO:PPLN chip
 * at 1064 nm for a 3.4 um idler at 40 C. The program
 *   1. loads the crystal database the library was installed with, plus
 *      the folders in $DELTAK_CRYSTALS (as the deltak program does),
 *   2. evaluates the extraordinary index and group index of MgO:LN at
 *      the pump with the data layer (deltak/material.h, deltak/group.h),
 *   3. asks for the poling period through the command interface
 *      (deltak/command.h): the same answer, as JSON, that
 *      `deltak period ... --json` prints.
 * Errors come back as a dk_status and a message; the library never
 * prints or exits.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <deltak/command.h>
#include <deltak/crystal.h>
#include <deltak/group.h>
#include <deltak/material.h>

int
main(void)
{
    /* The search path: the user's folders first, the shipped database
     * last (a single folder from $DELTAK_CRYSTALS is enough here). */
    const char *paths[2] = {getenv("DELTAK_CRYSTALS"), dk_db_shipped_dir()};
    dk_db *db = NULL;
    dk_error err = {0};
    if (dk_db_load_path(paths, 2, &db, &err)) {
        fprintf(stderr, "phase_match: %s\n", err.msg);
        return 1;
    }
    printf("database: %s (%d crystals)\n", dk_db_shipped_dir(),
           db->ncrystals);

    const dk_crystal *c = dk_db_find(db, "MgO:LN");
    if (!c) {
        fprintf(stderr, "phase_match: no MgO:LN in the database\n");
        dk_db_free(db);
        return 1;
    }
    const char *why;
    const dk_dispersion_set *set = dk_crystal_default_set(c, DK_USE_QPM, &why);
    dk_index_value v;
    if (dk_material_index(c, set, 'e', 1.064, 40.0, &v, &err)) {
        fprintf(stderr, "phase_match: %s\n", err.msg);
        dk_db_free(db);
        return 1;
    }
    printf("%s, data set %s: n_e(1.064 um, 40 C) = %.10f, group index "
           "%.10f\n",
           c->id, set->name, v.n, dk_group_index(1.064, v.n, v.dn_dl));
    dk_db_free(db);

    const char *argv[] = {"period", "--crystal", "MgO:LN", "--pump",
                          "1064nm", "--idler", "3.4um", "--temp", "40",
                          "--json"};
    dk_command_result res;
    int rc = dk_command_run(10, argv, &res);
    if (rc != 0) {
        fprintf(stderr, "phase_match: period failed (exit %d): %s", rc,
                res.err ? res.err : "");
        dk_command_result_free(&res);
        return 1;
    }
    /* The answer is JSON; a real program would parse it (json-c, ...).
     * Here the line with the period is enough. */
    const char *p = strstr(res.out, "\"period_um\"");
    printf("period: %.*s\n", p ? (int)strcspn(p, ",\n") : 0, p ? p : "");
    dk_command_result_free(&res);
    return 0;
}
