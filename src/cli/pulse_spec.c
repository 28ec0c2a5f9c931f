/*
 * pulse_spec.c - input pulses and measured spectra for the command line
 * (see pulse_spec.h). Parsing only: the pulse is built by the simulator.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/constants.h"
#include "cli.h"
#include "pulse_spec.h"
#include "deltak/bandwidth.h"
#include "deltak/units.h"

#define SPEC_MAX_POINTS 200000
#define SPEC_MAX_LINE 512

typedef struct unit_scale {
    const char *name;
    double scale;
} unit_scale;

/* A number followed by one of @units (longest match first). */
static int
scaled(const char *text, const unit_scale *units, size_t nunits,
       const char *what, const char *example, double *out, dk_error *err)
{
    size_t len = strlen(text);
    size_t best = nunits;
    for (size_t i = 0; i < nunits; i++) {
        size_t ul = strlen(units[i].name);
        if (ul < len && !strcmp(text + len - ul, units[i].name) &&
            (best == nunits || ul > strlen(units[best].name)))
            best = i;
    }
    if (best == nunits)
        return dk_error_set(err, DK_EINVAL,
                            "'%s' is not a %s with a unit, e.g. %s", text,
                            what, example);
    char num[64];
    size_t nl = len - strlen(units[best].name);
    if (nl >= sizeof num)
        return dk_error_set(err, DK_EINVAL, "'%s' is too long", text);
    memcpy(num, text, nl);
    num[nl] = '\0';
    double v;
    if (dk_parse_double(num, -HUGE_VAL, HUGE_VAL, &v, err))
        return DK_EINVAL;
    *out = v * units[best].scale;
    if (!isfinite(*out))
        return dk_error_set(err, DK_EINVAL, "'%s' is out of range", text);
    return DK_OK;
}

int
pulse_parse_energy(const char *text, double *j, dk_error *err)
{
    static const unit_scale u[] = {{"J", 1},     {"mJ", 1e-3}, {"uJ", 1e-6},
                                   {"µJ", 1e-6}, {"nJ", 1e-9}, {"pJ", 1e-12}};
    if (scaled(text, u, sizeof u / sizeof u[0], "energy", "50uJ", j, err))
        return DK_EINVAL;
    if (!(*j > 0))
        return dk_error_set(err, DK_EINVAL, "energy '%s' must be positive",
                            text);
    return DK_OK;
}

static int
parse_fluence(const char *text, double *jcm2, dk_error *err)
{
    static const unit_scale u[] = {
        {"J/cm2", 1},     {"mJ/cm2", 1e-3}, {"uJ/cm2", 1e-6},
        {"µJ/cm2", 1e-6}, {"nJ/cm2", 1e-9}};
    if (scaled(text, u, sizeof u / sizeof u[0], "fluence", "2mJ/cm2", jcm2,
               err))
        return DK_EINVAL;
    if (!(*jcm2 > 0))
        return dk_error_set(err, DK_EINVAL, "fluence '%s' must be positive",
                            text);
    return DK_OK;
}

static int
parse_gdd(const char *text, double *fs2, dk_error *err)
{
    static const unit_scale u[] = {{"fs2", 1}, {"fs^2", 1}, {"ps2", 1e6},
                                   {"ps^2", 1e6}};
    return scaled(text, u, sizeof u / sizeof u[0], "GDD", "200fs2", fs2, err);
}

static int
parse_delay(const char *text, double *fs, dk_error *err)
{
    static const unit_scale u[] = {{"fs", 1}, {"ps", 1e3}};
    return scaled(text, u, sizeof u / sizeof u[0], "delay", "-20fs", fs, err);
}

/* A spectral width at @lambda_um in THz: nm, um, THz or cm-1. */
static int
parse_width(const char *text, double lambda_um, double *thz, dk_error *err)
{
    static const unit_scale u[] = {{"nm", 1e-3}, {"um", 1}, {"µm", 1},
                                   {"THz", -1}, {"cm-1", -2}};
    size_t len = strlen(text);
    for (size_t i = 0; i < sizeof u / sizeof u[0]; i++) {
        size_t ul = strlen(u[i].name);
        if (ul >= len || strcmp(text + len - ul, u[i].name))
            continue;
        char num[64];
        if (len - ul >= sizeof num)
            break;
        memcpy(num, text, len - ul);
        num[len - ul] = '\0';
        double v;
        if (dk_parse_double(num, 0, HUGE_VAL, &v, err))
            return DK_EINVAL;
        if (!(v > 0))
            return dk_error_set(err, DK_EINVAL, "width '%s' must be "
                                                "positive", text);
        if (u[i].scale == -1)
            *thz = v;
        else if (u[i].scale == -2)
            *thz = v * DK_C_M_PER_S * 1e-10;   /* c in cm/ps */
        else
            *thz = DK_C_UM_PER_FS * 1e3 * v * u[i].scale /
                   (lambda_um * lambda_um);
        return DK_OK;
    }
    return dk_error_set(err, DK_EINVAL, "'%s' is not a spectral width, e.g. "
                                        "40nm, 12THz or 300cm-1", text);
}

/* Read a spectrum CSV into @p (see pulse_spec.h). */
static int
read_spectrum(const char *path, pulse_spec *p, dk_error *err)
{
    FILE *f = fopen(path, "r");
    if (!f)
        return dk_error_set(err, DK_EIO, "cannot read spectrum file '%s'",
                            path);
    char line[SPEC_MAX_LINE + 2];
    int ln = 0, col = -1, have_phase = 0;
    size_t n = 0, cap = 0;
    double *x = NULL, *y = NULL, *ph = NULL;
    dk_status st = DK_OK;
    while (fgets(line, sizeof line, f)) {
        ln++;
        size_t len = strlen(line);
        if (len > SPEC_MAX_LINE) {
            st = dk_error_set(err, DK_EINVAL, "'%s' line %d is too long",
                              path, ln);
            break;
        }
        line[strcspn(line, "\r\n")] = '\0';
        if (line[0] == '#' || line[strspn(line, " \t")] == '\0')
            continue;
        if (col < 0) {
            if (!strncmp(line, "wavelength_nm,", 14))
                col = 0;
            else if (!strncmp(line, "wavelength_um,", 14))
                col = 1;
            else if (!strncmp(line, "frequency_THz,", 14))
                col = 2;
            else {
                st = dk_error_set(err, DK_EINVAL,
                                  "'%s' line %d: the header must start with "
                                  "wavelength_nm, wavelength_um or "
                                  "frequency_THz, then the intensity "
                                  "(optionally phase_rad)",
                                  path, ln);
                break;
            }
            have_phase = strstr(line, "phase_rad") != NULL;
            continue;
        }
        char *fields[4] = {0};
        int nf = 0;
        for (char *s = line, *tok; nf < 4 && (tok = strsep(&s, ","));)
            fields[nf++] = tok;
        double v[3] = {0, 0, 0};
        dk_error e2 = {0};
        if (nf < 2 + have_phase ||
            dk_parse_double(fields[0], 0, HUGE_VAL, &v[0], &e2) ||
            dk_parse_double(fields[1], 0, HUGE_VAL, &v[1], &e2) ||
            (have_phase &&
             dk_parse_double(fields[2], -HUGE_VAL, HUGE_VAL, &v[2], &e2))) {
            st = dk_error_set(err, DK_EINVAL,
                              "'%s' line %d: expected %d numbers "
                              "(position > 0, intensity >= 0%s)%s%s",
                              path, ln, 2 + have_phase,
                              have_phase ? ", phase" : "",
                              e2.msg[0] ? ": " : "", e2.msg);
            break;
        }
        if (!(v[0] > 0)) {
            st = dk_error_set(err, DK_EINVAL, "'%s' line %d: the %s must be "
                                              "positive",
                              path, ln, col == 2 ? "frequency"
                                                 : "wavelength");
            break;
        }
        if (n == SPEC_MAX_POINTS) {
            st = dk_error_set(err, DK_EINVAL, "'%s' has more than %d points",
                              path, SPEC_MAX_POINTS);
            break;
        }
        if (n == cap) {
            cap = cap ? 2 * cap : 256;
            double *nb = realloc(x, 3 * cap * sizeof *nb);
            if (!nb) {
                st = dk_error_set(err, DK_ENOMEM, "out of memory");
                break;
            }
            /* Keep the three columns in one block: x | y | phase. */
            if (n) {
                memmove(nb + 2 * cap, nb + 2 * (cap / 2), n * sizeof *nb);
                memmove(nb + cap, nb + cap / 2, n * sizeof *nb);
            }
            x = nb, y = nb + cap, ph = nb + 2 * cap;
        }
        /* Wavelengths in µm; frequencies to µm too, per frequency. */
        x[n] = col == 0 ? v[0] * 1e-3 : col == 1 ? v[0] : 299.792458 / v[0];
        y[n] = v[1];
        ph[n] = v[2];
        n++;
    }
    fclose(f);
    if (!st && n < 2)
        st = dk_error_set(err, DK_EINVAL, "'%s' has fewer than 2 points",
                          path);
    if (st) {
        free(x);
        return st;
    }
    /* Frequency columns come in ascending ν: descending λ. The engine
     * wants λ strictly monotonic either way; check. */
    for (size_t i = 2; i < n; i++)
        if ((x[i] - x[i - 1]) * (x[1] - x[0]) <= 0) {
            free(x);
            return dk_error_set(err, DK_EINVAL,
                                "'%s': the %s column must be strictly "
                                "increasing or decreasing",
                                path, col == 2 ? "frequency" : "wavelength");
        }
    p->data = x;
    p->pulse.shape = DK_SIM_SPECTRUM;
    p->pulse.spectrum.n = n;
    p->pulse.spectrum.wavelength_um = x;
    p->pulse.spectrum.intensity = y;
    p->pulse.spectrum.phase_rad = have_phase ? ph : NULL;
    p->pulse.spectrum.per_frequency = col == 2;
    return DK_OK;
}

int
pulse_spec_parse(const char *opt, const char *text, double lambda_um,
                 pulse_spec *out)
{
    memset(out, 0, sizeof *out);
    char buf[1024];
    if (strlen(text) >= sizeof buf)
    {
        cli_error("%s: the pulse description is too long", opt);
        return CLI_USAGE;
    }
    strcpy(buf, text);
    dk_sim_pulse *p = &out->pulse;
    p->shape = DK_SIM_GAUSSIAN;
    int amounts = 0, shape_given = 0;
    const char *spectrum = NULL;
    dk_error err = {0};
    for (char *s = buf, *item; (item = strsep(&s, ","));) {
        if (!*item)
            continue;
        char *eq = strchr(item, '=');
        if (!eq) {
            cli_error("%s: '%s' is not key=value (keys: energy, fluence, "
                      "peak, fwhm, width, shape, gdd, delay, spectrum)",
                      opt, item);
            return CLI_USAGE;
        }
        *eq = '\0';
        const char *k = item, *v = eq + 1;
        dk_status st = DK_OK;
        if (!strcmp(k, "energy"))
            st = pulse_parse_energy(v, &p->energy_j, &err), amounts++;
        else if (!strcmp(k, "fluence"))
            st = parse_fluence(v, &p->fluence_j_per_cm2, &err), amounts++;
        else if (!strcmp(k, "peak")) {
            st = dk_parse_intensity(v, &p->peak_gw_per_cm2, &err), amounts++;
            if (!st && !(p->peak_gw_per_cm2 > 0))
                st = dk_error_set(&err, DK_EINVAL, "peak '%s' must be "
                                                   "positive", v);
        } else if (!strcmp(k, "fwhm"))
            st = dk_parse_duration(v, &p->fwhm_fs, &err);
        else if (!strcmp(k, "width"))
            st = parse_width(v, lambda_um, &out->width_thz, &err);
        else if (!strcmp(k, "gdd"))
            st = parse_gdd(v, &p->gdd_fs2, &err);
        else if (!strcmp(k, "delay"))
            st = parse_delay(v, &p->delay_fs, &err);
        else if (!strcmp(k, "spectrum"))
            spectrum = v;
        else if (!strcmp(k, "shape")) {
            shape_given = 1;
            if (!strcmp(v, "gaussian"))
                p->shape = DK_SIM_GAUSSIAN;
            else if (!strcmp(v, "sech2"))
                p->shape = DK_SIM_SECH2;
            else if (!strcmp(v, "cw"))
                p->shape = DK_SIM_CW;
            else
                st = dk_error_set(&err, DK_EINVAL, "shape '%s' must be "
                                                   "gaussian, sech2 or cw",
                                  v);
        } else {
            cli_error("%s: unknown key '%s' (keys: energy, fluence, peak, "
                      "fwhm, width, shape, gdd, delay, spectrum)",
                      opt, k);
            return CLI_USAGE;
        }
        if (st) {
            cli_error("%s: %s", opt, err.msg);
            return CLI_USAGE;
        }
    }
    if (amounts != 1) {
        cli_error("%s: give exactly one of energy=, fluence= or peak= (e.g. "
                  "energy=20uJ)",
                  opt);
        return CLI_USAGE;
    }
    if (p->shape == DK_SIM_CW) {
        if (!(p->peak_gw_per_cm2 > 0) || p->fwhm_fs > 0 || out->width_thz > 0 ||
            spectrum) {
            cli_error("%s: a cw input takes peak= only (e.g. "
                      "peak=1GW/cm2,shape=cw)",
                      opt);
            return CLI_USAGE;
        }
        return 0;
    }
    if (spectrum) {
        if (shape_given || p->fwhm_fs > 0 || out->width_thz > 0) {
            cli_error("%s: spectrum= gives the shape itself; leave out "
                      "shape=, fwhm= and width=",
                      opt);
            return CLI_USAGE;
        }
        snprintf(out->file, sizeof out->file, "%s", spectrum);
        if (read_spectrum(spectrum, out, &err)) {
            cli_error("%s: %s", opt, err.msg);
            return CLI_FAIL;
        }
        return 0;
    }
    if ((p->fwhm_fs > 0) == (out->width_thz > 0)) {
        cli_error("%s: give the duration fwhm= (e.g. fwhm=30fs) or the "
                  "spectral width= (e.g. width=40nm), one of them",
                  opt);
        return CLI_USAGE;
    }
    if (out->width_thz > 0)
        p->fwhm_fs = dk_transform_limit_fs(
            out->width_thz,
            p->shape == DK_SIM_SECH2 ? DK_SHAPE_SECH2 : DK_SHAPE_GAUSSIAN);
    return 0;
}

void
pulse_spec_free(pulse_spec *p)
{
    if (p) {
        free(p->data);
        p->data = NULL;
    }
}
