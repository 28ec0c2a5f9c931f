/*
 * nonlinear.c - full d tensor from a crystal file and d_eff (see
 * deltak/nonlinear.h for the method and references).
 *
 * Point-group relations, for the frames our crystal files state (each
 * relation fills an element the file left out, from one it gave):
 *   3m (mirror ⟂ X): d21 = d16 = −d22, d32 = d31, d24 = d15
 *   3m (mirror ⟂ Y): d12 = d26 = −d11, d32 = d31, d24 = d15
 *   4mm, 6mm, 6:     d32 = d31, d24 = d15   (6: also d25 = −d14)
 *   mm2:             none beyond Kleinman
 *   -42m:            d25 = d14
 *   -43m, 23:        d25 = d36 = d14
 *   -62m:            d21 = d16 = −d22
 *   32:              d12 = d26 = −d11, d25 = −d14
 * Kleinman symmetry then copies each nonzero element to every index
 * permutation whose element is still zero (so, e.g., d15 = d31 in 3m
 * when only d31 is given).
 *
 * Miller's rule: d(ω3; ω1, ω2) ∝ χ(ω1) χ(ω2) χ(ω3), χ = n² − 1
 * (R. C. Miller, Optical second harmonic generation in piezoelectric
 * crystals, Appl. Phys. Lett. 5, 17-19 (1964)).
 */
#include <math.h>
#include <string.h>

#include "deltak/nonlinear.h"

/* Contracted index l (1..6) → (j, k). */
static const int jk_of[6][2] = {{0, 0}, {1, 1}, {2, 2},
                                {1, 2}, {0, 2}, {0, 1}};

typedef struct relation {
    const char *group;
    const char *target;  /* e.g. "d21" */
    const char *source;  /* e.g. "d22" */
    double sign;
} relation;

static const relation relations[] = {
    {"3m", "d21", "d22", -1}, {"3m", "d16", "d22", -1},
    {"3m", "d12", "d11", -1}, {"3m", "d26", "d11", -1},
    {"3m", "d32", "d31", 1},  {"3m", "d24", "d15", 1},
    {"4mm", "d32", "d31", 1}, {"4mm", "d24", "d15", 1},
    {"6mm", "d32", "d31", 1}, {"6mm", "d24", "d15", 1},
    {"6", "d32", "d31", 1},   {"6", "d24", "d15", 1},
    {"6", "d25", "d14", -1},
    {"-42m", "d25", "d14", 1}, {"-42m", "d14", "d25", 1},
    {"-43m", "d25", "d14", 1}, {"-43m", "d36", "d14", 1},
    {"23", "d25", "d14", 1},   {"23", "d36", "d14", 1},
    {"-62m", "d21", "d22", -1}, {"-62m", "d16", "d22", -1},
    {"32", "d12", "d11", -1},  {"32", "d26", "d11", -1},
    {"32", "d25", "d14", -1},
};

static void
set_il(double d[3][3][3], int i, int l, double v)
{
    d[i][jk_of[l][0]][jk_of[l][1]] = v;
    d[i][jk_of[l][1]][jk_of[l][0]] = v;
}

static double
get_named(const double d[3][3][3], const char *name)
{
    int i = name[1] - '1', l = name[2] - '1';
    return d[i][jk_of[l][0]][jk_of[l][1]];
}

static int
given(const dk_crystal *c, const char *name)
{
    for (int n = 0; n < c->nd; n++)
        if (strcmp(c->d_names[n], name) == 0)
            return 1;
    return 0;
}

dk_status
dk_dtensor_from_crystal(const dk_crystal *c, dk_dtensor *t, dk_error *err)
{
    memset(t, 0, sizeof *t);
    if (!c->has_nonlinear)
        return dk_error_set(err, DK_ENOTFOUND,
                            "%s has no nonlinear coefficients in its file",
                            c->id);
    for (int n = 0; n < c->nd; n++)
        set_il(t->d, c->d_names[n][1] - '1', c->d_names[n][2] - '1',
               c->d_values[n]);
    for (size_t r = 0; r < sizeof relations / sizeof relations[0]; r++) {
        const relation *rel = &relations[r];
        if (strcmp(rel->group, c->point_group) != 0 ||
            given(c, rel->target))
            continue;
        double v = get_named(t->d, rel->source);
        if (v != 0)
            set_il(t->d, rel->target[1] - '1', rel->target[2] - '1',
                   rel->sign * v);
    }
    /* Kleinman: fill zero elements from any permutation of the indices. */
    for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
            for (int k = 0; k < 3; k++) {
                if (t->d[i][j][k] != 0)
                    continue;
                const double perm[] = {t->d[j][i][k], t->d[k][j][i],
                                       t->d[j][k][i], t->d[k][i][j]};
                for (int p = 0; p < 4; p++)
                    if (perm[p] != 0) {
                        t->d[i][j][k] = perm[p];
                        break;
                    }
            }
    return DK_OK;
}

double
dk_deff(const dk_dtensor *t, const double a[3], const double b[3],
        const double c[3])
{
    double s = 0;
    for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
            for (int k = 0; k < 3; k++)
                s += t->d[i][j][k] * a[i] * b[j] * c[k];
    return s;
}

double
dk_qpm_deff_factor(int m, double duty)
{
    if (m < 1)
        return 0;
    /* Exactly zero where sin(π m D) vanishes (an even order at 50 %):
     * rounding would otherwise leave a d_eff of 1e-16 that looks real. */
    double s = sin(M_PI * m * duty);
    if (fabs(s) < 1e-12)
        return 0;
    return fabs(2.0 / (M_PI * m) * s);
}

double
dk_miller_factor(const double n_process[3], const double n_measured[3])
{
    double num = 1, den = 1;
    for (int k = 0; k < 3; k++) {
        double cp = n_process[k] * n_process[k] - 1;
        double cm = n_measured[k] * n_measured[k] - 1;
        if (!isfinite(cp) || !isfinite(cm) || !(cp > 0) || !(cm > 0))
            return NAN;
        num *= cp;
        den *= cm;
    }
    return num / den;
}
