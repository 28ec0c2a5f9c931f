/*
 * design_fast.c - Δk of a design with its dispersion compiled once per
 * temperature (see design_fast.h).
 */
#include <math.h>

#include "design_fast.h"

void
dk_design_fast_init(dk_design_fast *f, const dk_design *d, double temp_c)
{
    f->d = d;
    f->temp_c = temp_c;
    f->ready = 0;
    if (!isfinite(temp_c))
        return;
    if (d->scheme == DK_SCHEME_QPM) {
        if (!(d->period_um > 0))
            return;
        f->ready = dk_qpm_fast_init(&d->qpm, temp_c, d->period_um,
                                    &f->qf) == DK_OK;
        return;
    }
    dk_angle_problem pb = d->angle;
    pb.temp_c = temp_c;
    f->ready = dk_angle_fast_init(&pb, d->pol, &f->af) == DK_OK;
}

double
dk_design_fast_dk(const dk_design_fast *f, const dk_waves *w,
                  double theta_rad, double phi_rad)
{
    if (f->d->scheme == DK_SCHEME_QPM)
        return dk_qpm_fast_dk(&f->qf, w);
    return dk_angle_fast_dk(&f->af, w, theta_rad, phi_rad);
}
