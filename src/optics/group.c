/*
 * group.c - group index, GVD and TOD from the λ-derivatives of n
 * (formulas and references in deltak/group.h).
 *
 * Units: λ in µm and derivatives per µm^k go in; the factors below turn
 * µm into m and s into fs, per mm of crystal.
 */
#include <math.h>

#include "deltak/group.h"
#include "deltak/units.h"

double
dk_group_index(double lambda_um, double n, double dn_dl)
{
    return n - lambda_um * dn_dl;
}

double
dk_gvd_fs2_per_mm(double lambda_um, double d2n_dl2)
{
    const double c = DK_C_M_PER_S;
    /* λ³ n'' is in µm; ×1e-6 → m; s²/m → fs²/mm is ×1e30 × 1e-3. */
    double x_m = lambda_um * lambda_um * lambda_um * d2n_dl2 * 1e-6;
    return x_m / (2 * M_PI * c * c) * 1e27;
}

double
dk_tod_fs3_per_mm(double lambda_um, double d2n_dl2, double d3n_dl3)
{
    const double c = DK_C_M_PER_S;
    double l4 = lambda_um * lambda_um * lambda_um * lambda_um;
    /* λ⁴ (3n'' + λ n''') is in µm²; ×1e-12 → m²; s³/m → fs³/mm ×1e42. */
    double y_m2 = l4 * (3 * d2n_dl2 + lambda_um * d3n_dl3) * 1e-12;
    return -y_m2 / (4 * M_PI * M_PI * c * c * c) * 1e42;
}

double
dk_inverse_group_velocity_fs_per_mm(double group_index)
{
    /* n_g / c in s/m, ×1e15 fs/s × 1e-3 m/mm. */
    return group_index / DK_C_M_PER_S * 1e12;
}
