/*
 * pulse_spec.h - input pulses on the command line and measured spectra
 * from CSV files, for `deltak simulate` and the broadband spectra of
 * `deltak pulse`.
 *
 * A pulse is a comma-separated list of key=value items:
 *   energy=50uJ | fluence=2mJ/cm2 | peak=80GW/cm2   the amount (one)
 *   fwhm=30fs        intensity FWHM of the transform-limited pulse
 *   width=40nm       or its spectral FWHM (nm, THz or cm-1): the
 *                    transform-limited duration follows from the shape
 *   shape=gaussian|sech2|cw
 *   gdd=200fs2       chirp added before the crystal
 *   delay=-20fs      arrival; > 0 later
 *   spectrum=FILE    a measured spectrum (CSV, below); its shape only
 * e.g. "energy=20uJ,fwhm=35fs", "peak=1GW/cm2,shape=cw".
 *
 * Spectrum files: a header line naming the columns, then one point per
 * line: the first column wavelength_nm, wavelength_um or frequency_THz,
 * the second the intensity (per unit wavelength for a wavelength column,
 * as spectrometers give it; per unit frequency for a frequency column),
 * an optional third phase_rad. '#' lines are comments.
 */
#ifndef DK_CLI_PULSE_SPEC_H
#define DK_CLI_PULSE_SPEC_H

#include "deltak/simulate.h"

/* A parsed pulse; the spectrum arrays are owned (pulse_spec_free). */
typedef struct pulse_spec {
    dk_sim_pulse pulse;
    double width_thz;        /* width=, converted; 0 when not given */
    double *data;            /* the spectrum's arrays (one block) */
    char file[256];          /* spectrum file as given */
} pulse_spec;

/*
 * Parse @text for the wave at @lambda_um (needed for width= in nm or
 * cm-1). @base is the folder spectrum files are relative to (NULL: the
 * current one). Returns 0, or CLI_USAGE after printing the error naming
 * @opt.
 */
int pulse_spec_parse(const char *opt, const char *text, double lambda_um,
                     pulse_spec *out);

void pulse_spec_free(pulse_spec *p);

/* Energies: "50uJ", "1.2mJ", "300nJ", "2J", "5pJ"; out in J (> 0). */
int pulse_parse_energy(const char *text, double *j, dk_error *err);

#endif /* DK_CLI_PULSE_SPEC_H */
