/*
 * design_fast.h - Δk of a design at one temperature with its dispersion
 * compiled once (internal).
 *
 * dk_design_delta_k() and the pair acceptances evaluate Δk of one design
 * thousands of times with only a wavelength, an angle or the temperature
 * moved. The general path compiles the dispersion formulas at every call
 * (for a birefringent design once per wave and axis); here they are
 * compiled once per temperature: the principal axes (angle_fast.h) or the
 * QPM axes and grating at the design's period (qpm_fast.h). The result
 * has the bits of the general path at the same waves, temperature and
 * direction (the same compiled coefficients and arithmetic; checked in
 * tests/test_tolerance.c).
 */
#ifndef DK_DESIGN_FAST_H
#define DK_DESIGN_FAST_H

#include "deltak/design.h"
#include "design/angle_fast.h"
#include "design/qpm_fast.h"

typedef struct dk_design_fast {
    const dk_design *d;
    int ready;          /* compiled; else use the general path */
    double temp_c;
    dk_angle_fast af;   /* birefringent designs */
    dk_qpm_fast qf;     /* QPM designs: grating of d->period_um at temp_c */
} dk_design_fast;

/*
 * dk_design_fast_init:
 * Compile @d's dispersion at @temp_c. f->ready is 0 when a formula cannot
 * be compiled there (callers then take the general path, which handles
 * or reports it).
 */
void dk_design_fast_init(dk_design_fast *f, const dk_design *d,
                         double temp_c);

/*
 * dk_design_fast_dk:
 * Δk (rad/µm) at waves @w: birefringent, with the pump along
 * (@theta_rad, @phi_rad); QPM, with the design's period (the angles are
 * ignored). NAN where undefined. f->ready must be 1.
 */
double dk_design_fast_dk(const dk_design_fast *f, const dk_waves *w,
                         double theta_rad, double phi_rad);

#endif /* DK_DESIGN_FAST_H */
