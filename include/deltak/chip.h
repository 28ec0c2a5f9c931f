/*
 * chip.h - poling layouts that cover a target wavelength range: a set of
 * gratings tuned by the oven (multi-grating chip), or a fan-out grating
 * whose period changes across the chip width.
 *
 * Multi-grating: starting at the short end of the target range, each
 * grating's period is chosen so that the low end of its oven-tuning range
 * sits at the start; the next grating starts inside the previous range by
 * the chosen overlap fraction, until the target's long end is reached.
 * Fan-out: at one oven temperature the period runs linearly across the
 * width from the period of the target's short end to that of its long end.
 * (Fan-out gratings: P. E. Powers, T. J. Kulp, S. E. Bisson, Opt. Lett. 23,
 * 159 (1998).)
 */
#ifndef DK_CHIP_H
#define DK_CHIP_H

#include "deltak/qpm.h"

typedef struct dk_grating {
    double period_um;     /* as written (q->written_temp_c) */
    double lo_um, hi_um;  /* target wavelength range over the oven range */
    double t_lo_c;        /* oven temperature giving lo_um */
    double t_hi_c;        /* oven temperature giving hi_um */
} dk_grating;

/*
 * dk_chip_gratings:
 * @q: the QPM design (crystal, set, polarisations, order)
 * @pump_um: pump wavelength
 * @signal: 1 when the target range is the signal's, 0 for the idler's
 * @lo_um, @hi_um: target range, lo < hi
 * @oven_c: oven range [low, high] in °C
 * @overlap: fraction (0 ≤ overlap < 0.9) by which neighbours overlap
 * @out: up to @max gratings, short end first
 *
 * Returns: DK_OK; DK_EINVAL for bad ranges; DK_ENOROOT when the oven
 * range tunes a grating too little to progress or the target cannot be
 * phase-matched; DK_ERANGE when more than @max gratings would be needed.
 */
dk_status dk_chip_gratings(dk_qpm *q, double pump_um, int signal,
                           double lo_um, double hi_um, const double oven_c[2],
                           double overlap, dk_grating *out, int max, int *n,
                           dk_error *err);

/*
 * dk_chip_target_at:
 * The target wavelength (signal or idler) that a grating of written period
 * @period_um phase-matches at @temp_c, taking the solution nearest
 * @guess_um. Returns: the wavelength in µm, or NAN when there is none.
 */
double dk_chip_target_at(dk_qpm *q, double pump_um, int signal,
                         double period_um, double temp_c, double guess_um);

/*
 * dk_chip_period_for:
 * The written period that phase-matches target @target_um at @temp_c.
 * Returns: DK_OK or the dk_qpm_period() error.
 */
dk_status dk_chip_period_for(dk_qpm *q, double pump_um, int signal,
                             double target_um, double temp_c,
                             double *period_um, dk_error *err);

#endif /* DK_CHIP_H */
