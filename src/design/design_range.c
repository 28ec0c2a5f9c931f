/*
 * design_range.c - the range policy (DESIGN.md §4) and the provenance
 * notes of a design.
 *
 * One rule for every command: outside the crystal's transparency range is
 * an error (checked in design.c and by the index evaluation); outside a
 * data set's fitted wavelength or temperature range the answer is given
 * and flagged, per wave, with the wave named; a set with no temperature
 * dependence evaluated away from its reference temperature is flagged too.
 */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "deltak/material.h"
#include "design_internal.h"

const char *
dk_design_wave_name(const dk_design *d, int k)
{
    static const char *const three[3] = {"signal", "idler", "pump"};
    static const char *const shg[3] = {"fundamental", "fundamental",
                                       "second harmonic"};
    if (k < 0 || k > 2)
        return "?";
    return d && d->shg ? shg[k] : three[k];
}

unsigned
dk_design_range_flags(const dk_design *d, const dk_waves *w, double temp_c)
{
    const double lam[3] = {w->signal_um, w->idler_um, w->pump_um};
    static const unsigned bit[3] = {DK_RANGE_SIGNAL, DK_RANGE_IDLER,
                                    DK_RANGE_PUMP};
    unsigned f = 0;
    for (int k = 0; k < 3; k++) {
        if (!(lam[k] > 0))
            continue;
        unsigned w3 = dk_set_range_warnings(d->set, lam[k], temp_c);
        if (w3 & DK_WARN_LAMBDA_RANGE)
            f |= bit[k];
        if (w3 & DK_WARN_TEMP_RANGE)
            f |= DK_RANGE_TEMP;
        if (w3 & DK_WARN_NO_TEMP)
            f |= DK_RANGE_NO_TEMP;
    }
    if (d->shg && (f & (DK_RANGE_SIGNAL | DK_RANGE_IDLER)))
        f |= DK_RANGE_SIGNAL | DK_RANGE_IDLER;
    return f;
}

void
dk_design_note_range(const dk_design *d, unsigned flags, const dk_waves *w,
                     double temp_c, dk_notes *notes)
{
    const dk_dispersion_set *s = d->set;
    const double lam[3] = {w->signal_um, w->idler_um, w->pump_um};
    static const unsigned bit[3] = {DK_RANGE_SIGNAL, DK_RANGE_IDLER,
                                    DK_RANGE_PUMP};
    static const char *const code[3] = {"range:signal", "range:idler",
                                        "range:pump"};
    for (int k = 0; k < 3; k++) {
        if (!(flags & bit[k]) || (d->shg && k == 1))
            continue;
        const char *c = d->shg ? (k == 2 ? "range:second-harmonic"
                                         : "range:fundamental")
                               : code[k];
        dk_notes_add(notes, DK_NOTE_RANGE, c,
                     "the %s %.6g um is outside the fitted range %.6g-%.6g "
                     "um of data set '%s': extrapolated",
                     dk_design_wave_name(d, k), lam[k],
                     s->wavelength_range_um[0], s->wavelength_range_um[1],
                     s->name);
    }
    if (flags & DK_RANGE_TEMP) {
        const double *r = s->has_thermo && s->temp_form == DK_TEMP_NONE
                              ? s->thermo.temperature_range_c
                              : s->temperature_range_c;
        dk_notes_add(notes, DK_NOTE_RANGE, "range:temperature",
                     "%.6g C is outside the fitted range %.6g-%.6g C of "
                     "data set '%s': extrapolated",
                     temp_c, r[0], r[1], s->name);
    }
    if (flags & DK_RANGE_NO_TEMP)
        dk_notes_add(notes, DK_NOTE_RANGE, "no-temperature-dependence",
                     "data set '%s' has no temperature dependence: "
                     "evaluated at its %.6g C, not at %.6g C",
                     s->name, s->reference_temperature_c, temp_c);
}

char *
dk_range_codes(unsigned flags, int shg, char *buf, size_t n)
{
    struct {
        unsigned bit;
        const char *code, *shg_code;
    } t[] = {
        {DK_RANGE_SIGNAL, "range:signal", "range:fundamental"},
        {DK_RANGE_IDLER, "range:idler", NULL},
        {DK_RANGE_PUMP, "range:pump", "range:second-harmonic"},
        {DK_RANGE_TEMP, "range:temperature", "range:temperature"},
        {DK_RANGE_NO_TEMP, "no-temperature-dependence",
         "no-temperature-dependence"},
    };
    size_t used = 0;
    if (n)
        buf[0] = '\0';
    for (size_t i = 0; i < sizeof t / sizeof t[0] && n; i++) {
        const char *c = shg ? t[i].shg_code : t[i].code;
        if (!(flags & t[i].bit) || !c)
            continue;
        int w = snprintf(buf + used, n - used, "%s%s", used ? ";" : "", c);
        if (w < 0 || (size_t)w >= n - used)
            break;
        used += (size_t)w;
    }
    return buf;
}

char *
dk_range_words(unsigned flags, int shg, char *buf, size_t n)
{
    struct {
        unsigned bit;
        const char *word, *shg_word;
    } t[] = {
        {DK_RANGE_SIGNAL, "signal", "fundamental"},
        {DK_RANGE_IDLER, "idler", NULL},
        {DK_RANGE_PUMP, "pump", "second harmonic"},
        {DK_RANGE_TEMP, "temperature", "temperature"},
        {DK_RANGE_NO_TEMP, "temperature ignored", "temperature ignored"},
    };
    size_t used = 0;
    if (n)
        buf[0] = '\0';
    for (size_t i = 0; i < sizeof t / sizeof t[0] && n; i++) {
        const char *c = shg ? t[i].shg_word : t[i].word;
        if (!(flags & t[i].bit) || !c)
            continue;
        int w = snprintf(buf + used, n - used, "%s%s", used ? ", " : "", c);
        if (w < 0 || (size_t)w >= n - used)
            break;
        used += (size_t)w;
    }
    return buf;
}

void
dk_design_note_provenance(dk_design *d)
{
    const dk_crystal *c = d->crystal;
    if (d->set->from_memory)
        dk_notes_add(&d->notes, DK_NOTE_MEMORY, "from-memory:set",
                     "data set '%s' is typed from memory and not yet "
                     "checked against an independent source (see "
                     "'deltak crystals %s')",
                     d->set->name, c->id);
    const char *t = dk_crystal_caution_at(c, d->temp_c);
    if (t)
        dk_notes_add(&d->notes, DK_NOTE_CAUTION, "caution",
                     "%s at %.4g C: %s", c->id, d->temp_c, t);
    const double lam[3] = {d->waves.signal_um, d->waves.idler_um,
                           d->waves.pump_um};
    for (int k = 0; k < 3; k++) {
        if (!(lam[k] > 0) || (d->shg && k == 1))
            continue;
        const char *w = dk_crystal_caution_wavelength(c, lam[k]);
        if (w)
            dk_notes_add(&d->notes, DK_NOTE_CAUTION, "caution:wavelength",
                         "%s, the %s at %.5g um: %s", c->id,
                         dk_design_wave_name(d, k), lam[k], w);
    }
}

void
dk_range_span_init(dk_range_span *span)
{
    span->flags = 0;
    for (int k = 0; k < 3; k++) {
        span->lam_min[k] = INFINITY;
        span->lam_max[k] = -INFINITY;
    }
    span->t_min = INFINITY;
    span->t_max = -INFINITY;
}

void
dk_range_span_add(dk_range_span *span, unsigned flags, const dk_waves *w,
                  double temp_c)
{
    const double lam[3] = {w->signal_um, w->idler_um, w->pump_um};
    static const unsigned bit[3] = {DK_RANGE_SIGNAL, DK_RANGE_IDLER,
                                    DK_RANGE_PUMP};
    span->flags |= flags;
    for (int k = 0; k < 3; k++)
        if ((flags & bit[k]) && isfinite(lam[k])) {
            span->lam_min[k] = fmin(span->lam_min[k], lam[k]);
            span->lam_max[k] = fmax(span->lam_max[k], lam[k]);
        }
    if (flags & (DK_RANGE_TEMP | DK_RANGE_NO_TEMP)) {
        span->t_min = fmin(span->t_min, temp_c);
        span->t_max = fmax(span->t_max, temp_c);
    }
}

void
dk_design_note_span(const dk_design *d, const dk_range_span *span,
                    dk_notes *notes)
{
    const dk_dispersion_set *s = d->set;
    static const unsigned bit[3] = {DK_RANGE_SIGNAL, DK_RANGE_IDLER,
                                    DK_RANGE_PUMP};
    for (int k = 0; k < 3; k++) {
        if (!(span->flags & bit[k]) || (d->shg && k == 1))
            continue;
        char code[40];
        snprintf(code, sizeof code, "range:%s", dk_design_wave_name(d, k));
        for (char *c = code; *c; c++)
            if (*c == ' ')
                *c = '-';
        char vals[64];
        if (span->lam_min[k] == span->lam_max[k])
            snprintf(vals, sizeof vals, "%.5g um", span->lam_min[k]);
        else
            snprintf(vals, sizeof vals, "%.5g-%.5g um", span->lam_min[k],
                     span->lam_max[k]);
        dk_notes_add(notes, DK_NOTE_RANGE, code,
                     "the %s at %s lies outside the fitted range %.5g-%.5g "
                     "um of data set '%s': extrapolated there (flagged)",
                     dk_design_wave_name(d, k), vals,
                     s->wavelength_range_um[0], s->wavelength_range_um[1],
                     s->name);
    }
    if (span->flags & DK_RANGE_TEMP) {
        const double *r = s->temp_form == DK_TEMP_NONE
                              ? s->thermo.temperature_range_c
                              : s->temperature_range_c;
        dk_notes_add(notes, DK_NOTE_RANGE, "range:temperature",
                     "temperatures %.5g-%.5g C lie outside the fitted range "
                     "%.5g-%.5g C of data set '%s': extrapolated there "
                     "(flagged)",
                     span->t_min, span->t_max, r[0], r[1], s->name);
    }
    if (span->flags & DK_RANGE_NO_TEMP)
        dk_notes_add(notes, DK_NOTE_RANGE, "no-temperature-dependence",
                     "data set '%s' has no temperature dependence: "
                     "evaluated at its %.5g C",
                     s->name, s->reference_temperature_c);
}
