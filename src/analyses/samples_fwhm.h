/*
 * samples_fwhm.h - the FWHM of sampled data (samples_fwhm.c).
 */
#ifndef DELTAK_ANALYSES_SAMPLES_FWHM_H
#define DELTAK_ANALYSES_SAMPLES_FWHM_H

#include <stddef.h>

/* FWHM of @y (n samples at spacing @dx) between the outermost crossings
 * of half its maximum; NAN when y has no positive peak or does not fall
 * to half of it inside the array. */
double dk_samples_fwhm(const double *y, size_t n, double dx);

/* The abscissa (in samples) in [i − 1, i] where y crosses @half, on the
 * cubic through samples i − 2 … i + 1 (linear at the array's ends);
 * y[i − 1] < half ≤ y[i] or the reverse, 1 ≤ i < n. */
double dk_samples_crossing(const double *y, size_t n, size_t i,
                           double half);

#endif
