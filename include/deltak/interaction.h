/*
 * interaction.h - the three waves of a second-order process.
 *
 * Energy conservation 1/λp = 1/λs + 1/λi (ωp = ωs + ωi) ties pump, signal
 * and idler; any two fix the third. SHG is the degenerate case
 * λs = λi = λ_fundamental, λp = λ_fundamental / 2; SFG, DFG and OPA/OPO/
 * OPG share the same phase-matching condition with the pump the highest
 * frequency. Wavelengths are vacuum wavelengths in µm.
 */
#ifndef DK_INTERACTION_H
#define DK_INTERACTION_H

#include "deltak/status.h"

typedef struct dk_waves {
    double pump_um;    /* highest frequency */
    double signal_um;
    double idler_um;
} dk_waves;

/*
 * dk_waves_complete:
 * @w: exactly two of the three wavelengths set (> 0); the third is 0
 *
 * Fills the missing wavelength from energy conservation.
 *
 * Returns: DK_OK; DK_EINVAL when not exactly two are given, when the
 * pump is not shorter than both others (the idler would have zero or
 * negative frequency), or when a value is not finite.
 */
dk_status dk_waves_complete(dk_waves *w, dk_error *err);

/* How many of the three wavelengths are set (> 0). */
int dk_waves_given(const dk_waves *w);

/*
 * dk_third_wave_um:
 * The third wavelength from energy conservation given the pump and one of
 * signal or idler: 1/(1/λp − 1/λ). NAN when λ is not longer than λp.
 */
double dk_third_wave_um(double pump_um, double other_um);

/* The waves of pump @pump_um whose signal carries the fraction @share of
 * the pump frequency (0 < share < 1): λs = λp/share, λi = λp/(1 − share). */
dk_waves dk_waves_of_share(double pump_um, double share);

/* SHG of @fundamental_um: signal = idler = fundamental, pump = half. */
dk_waves dk_waves_shg(double fundamental_um);

#endif /* DK_INTERACTION_H */
