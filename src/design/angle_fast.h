/*
 * angle_fast.h - the birefringent phase mismatch of deltak/angle.h with
 * the crystal's principal axes compiled once at one temperature
 * (src/data/dispersion_batch.h), for sweeps and maps that evaluate it at
 * many wavelengths and directions (internal).
 *
 * dk_angle_fast_dk() gives the bits of dk_angle_delta_k() at the same
 * waves, temperature and direction (the same compiled coefficients and
 * the same value-only eigenproblem), without recompiling the formulas at
 * every call. dk_angle_fast_batch() evaluates a whole line of waves at one
 * direction: principal indices by the batch kernel, then the eigenproblem
 * in one vectorised loop (collinear only; other cases fall back to the
 * scalar form, cell by cell).
 */
#ifndef DK_ANGLE_FAST_H
#define DK_ANGLE_FAST_H

#include <stddef.h>

#include "data/dispersion_batch.h"
#include "deltak/angle.h"

typedef struct dk_angle_fast {
    dk_angle_problem pb;   /* crystal, set, temperature, α (waves unused) */
    char pol[4];           /* modes of signal, idler, pump */
    dk_nfast ax[3];        /* principal axes X, Y, Z (uniaxial o, o, e) */
} dk_angle_fast;

/*
 * dk_angle_fast_init:
 * Compile the principal axes of @pb's crystal and set at pb->temp_c.
 * Returns: DK_OK; DK_ENOTFOUND (an axis missing), DK_EDOM / DK_EINVAL from
 * dk_nfast_compile() (the caller then uses dk_angle_delta_k()).
 */
dk_status dk_angle_fast_init(const dk_angle_problem *pb, const char pol[3],
                             dk_angle_fast *f);

/* Δk (rad/µm) of waves @w with the pump along (θ, φ); NAN where
 * undefined, as dk_angle_delta_k(). */
double dk_angle_fast_dk(const dk_angle_fast *f, const dk_waves *w,
                        double theta_rad, double phi_rad);

/*
 * dk_angle_fast_batch:
 * Δk of @n wave triples (@ls signal, @li idler, @lp pump, µm) at one
 * direction into @dk. @work holds 12·@n doubles. No allocation.
 */
void dk_angle_fast_batch(const dk_angle_fast *f, double theta_rad,
                         double phi_rad, const double *ls, const double *li,
                         const double *lp, double *dk, double *work,
                         size_t n);

#endif /* DK_ANGLE_FAST_H */
