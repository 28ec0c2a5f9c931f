/*
 * design.c - from a request to a design: data set, scheme (QPM or
 * birefringent), modes, temperature and the checks that must pass before
 * anything is solved. The rules are stated in deltak/design.h; each choice
 * made for the user is recorded as a DK_NOTE_DEFAULT note that says how to
 * change it.
 */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>

#include "deltak/constants.h"
#include "deltak/design.h"
#include "deltak/material.h"
#include "design_internal.h"

void
dk_design_request_init(dk_design_request *rq)
{
    memset(rq, 0, sizeof *rq);
    rq->temp_c = NAN;
    rq->temp_range_c[0] = rq->temp_range_c[1] = NAN;
    rq->order = 1;
    rq->duty = 0.5;
    rq->written_temp_c = 25;
    rq->theta_rad = NAN;
    rq->phi_rad = NAN;
    rq->length_mm = NAN;
}

static const char *const process_names[] = {
    [DK_PROCESS_AUTO] = "auto", [DK_PROCESS_SHG] = "shg",
    [DK_PROCESS_SFG] = "sfg",   [DK_PROCESS_DFG] = "dfg",
    [DK_PROCESS_OPA] = "opa",   [DK_PROCESS_OPO] = "opo",
};

const char *
dk_process_str(dk_process p)
{
    return p <= DK_PROCESS_OPO ? process_names[p] : "?";
}

dk_status
dk_process_parse(const char *text, dk_process *p, dk_error *err)
{
    for (int i = DK_PROCESS_SHG; i <= DK_PROCESS_OPO; i++)
        if (text && strcasecmp(text, process_names[i]) == 0) {
            *p = (dk_process)i;
            return DK_OK;
        }
    return dk_error_set(err, DK_EINVAL,
                        "process '%s' must be one of shg, sfg, dfg, opa, opo",
                        text ? text : "");
}

const char *
dk_scheme_str(dk_scheme s)
{
    switch (s) {
    case DK_SCHEME_QPM: return "QPM";
    case DK_SCHEME_ANGLE: return "birefringent";
    case DK_SCHEME_AUTO: break;
    }
    return "auto";
}

dk_status
dk_scheme_parse(const char *text, dk_scheme *s, dk_error *err)
{
    if (text && strcasecmp(text, "qpm") == 0)
        *s = DK_SCHEME_QPM;
    else if (text && (strcasecmp(text, "birefringent") == 0 ||
                      strcasecmp(text, "angle") == 0))
        *s = DK_SCHEME_ANGLE;
    else
        return dk_error_set(err, DK_EINVAL,
                            "scheme '%s' must be qpm or birefringent",
                            text ? text : "");
    return DK_OK;
}

/* The crystal named by a poled alias: "PPLN", "PPKTP", "OP-GaAs", ... */
static int
named_as_poled(const dk_design_request *rq)
{
    const char *n = rq->crystal_name;
    if (!n || rq->crystal->poling == DK_POLING_NONE)
        return 0;
    return strncasecmp(n, "PP", 2) == 0 || strncasecmp(n, "OP", 2) == 0;
}

static int
angle_options_given(const dk_design_request *rq)
{
    return isfinite(rq->theta_rad) || isfinite(rq->phi_rad) || rq->plane ||
           rq->solution > 0 || rq->alpha_rad != 0 || rq->broadband;
}

/* The QPM-or-birefringent rule of deltak/design.h. */
static dk_status
choose_scheme(const dk_design_request *rq, dk_design *d, dk_error *err)
{
    const dk_crystal *c = rq->crystal;
    int poled = c->poling != DK_POLING_NONE;
    int qpm_given = rq->period_um > 0;
    if (rq->scheme == DK_SCHEME_QPM) {
        if (!poled)
            return dk_qpm_init(&d->qpm, c, &c->sets[0], NULL, 1, 0.5, 25,
                               err);   /* its message says why */
        if (angle_options_given(rq))
            return dk_error_set(err, DK_EINVAL,
                                "angle options (--theta, --phi, --plane, "
                                "--solution, --noncollinear, --broadband) "
                                "do not apply to a QPM design");
        d->scheme = DK_SCHEME_QPM;
        return DK_OK;
    }
    if (rq->scheme == DK_SCHEME_ANGLE) {
        if (qpm_given)
            return dk_error_set(err, DK_EINVAL,
                                "a poling period does not apply to a "
                                "birefringent design");
        if (c->optical_class == DK_ISOTROPIC)
            return dk_error_set(err, DK_EINVAL,
                                "%s is isotropic: it has no birefringence "
                                "to phase-match with; use quasi-phase "
                                "matching",
                                c->id);
        d->scheme = DK_SCHEME_ANGLE;
        return DK_OK;
    }
    if (qpm_given && angle_options_given(rq))
        return dk_error_set(err, DK_EINVAL,
                            "give either a poling period (QPM) or angle "
                            "options (birefringent), not both");
    if (qpm_given || c->optical_class == DK_ISOTROPIC) {
        if (!poled)
            return dk_qpm_init(&d->qpm, c, &c->sets[0], NULL, 1, 0.5, 25,
                               err);
        d->scheme = DK_SCHEME_QPM;
        return DK_OK;
    }
    if (angle_options_given(rq) || !poled) {
        d->scheme = DK_SCHEME_ANGLE;
        return DK_OK;
    }
    if (named_as_poled(rq)) {
        d->scheme = DK_SCHEME_QPM;
        return DK_OK;
    }
    /* A crystal that can be used either way, named plainly. */
    d->scheme = rq->type ? DK_SCHEME_ANGLE : DK_SCHEME_QPM;
    dk_notes_add(&d->notes, DK_NOTE_DEFAULT, "default-scheme",
                 "%s design chosen for %s, which can be %s (%s); give "
                 "--scheme %s for the other",
                 dk_scheme_str(d->scheme), c->id,
                 d->scheme == DK_SCHEME_QPM
                     ? "used birefringently too"
                     : "poled too",
                 d->scheme == DK_SCHEME_QPM ? "no --type given"
                                            : "--type given",
                 d->scheme == DK_SCHEME_QPM ? "birefringent" : "qpm");
    return DK_OK;
}

static dk_status
choose_set(const dk_design_request *rq, dk_design *d, dk_error *err)
{
    const dk_crystal *c = rq->crystal;
    if (rq->set_name) {
        d->set = dk_crystal_find_set(c, rq->set_name);
        if (!d->set) {
            char list[256] = "";
            size_t used = 0;
            for (int i = 0; i < c->nsets && used < sizeof list; i++)
                used += (size_t)snprintf(list + used, sizeof list - used,
                                         "%s%s", i ? ", " : "",
                                         c->sets[i].name);
            return dk_error_set(err, DK_ENOTFOUND,
                                "%s has no data set '%s'; its sets are: %s",
                                c->id, rq->set_name, list);
        }
        return DK_OK;
    }
    const char *why;
    d->set = dk_crystal_default_set(
        c, d->scheme == DK_SCHEME_QPM ? DK_USE_QPM : DK_USE_ANGLE, &why);
    if (c->nsets > 1)
        dk_notes_add(&d->notes, DK_NOTE_DEFAULT, "default-set",
                     "data set %s (%s); %d sets exist: pick one with "
                     "--dispersion or compare them with --all-sets",
                     d->set->name, why, c->nsets);
    return DK_OK;
}

/* Every axis a design of this scheme needs must be in the set. */
static dk_status
check_set_axes(const dk_design *d, dk_error *err)
{
    const char *need = d->scheme == DK_SCHEME_ANGLE
                           ? dk_crystal_axis_labels(d->crystal)
                           : d->qpm.pol;
    size_t n = d->scheme == DK_SCHEME_ANGLE ? strlen(need) : 3;
    for (size_t i = 0; i < n; i++)
        if (!dk_set_find_axis(d->set, need[i]))
            return dk_error_set(err, DK_ENOTFOUND,
                                "data set '%s' of %s has no '%c' axis, "
                                "which this %s design needs; pick another "
                                "set with --dispersion",
                                d->set->name, d->crystal->id, need[i],
                                dk_scheme_str(d->scheme));
    return DK_OK;
}

static void
choose_temperature(const dk_design_request *rq, dk_design *d)
{
    if (isfinite(rq->temp_c)) {
        d->temp_c = rq->temp_c;
        return;
    }
    if (!dk_set_has_temperature(d->set)) {
        d->temp_c = d->set->reference_temperature_c;
        dk_notes_add(&d->notes, DK_NOTE_DEFAULT, "default-temperature",
                     "temperature %.4g C: data set %s has no temperature "
                     "dependence and holds at its own reference temperature",
                     d->temp_c, d->set->name);
        return;
    }
    d->temp_c = 25;
    if (!(rq->period_um > 0 && d->scheme == DK_SCHEME_QPM &&
          (rq->shg || dk_waves_given(&rq->waves) == 3)))
        dk_notes_add(&d->notes, DK_NOTE_DEFAULT, "default-temperature",
                     "temperature 25 C (not given; set it with --temp)");
}

/* Every wave that is given must lie inside the transparency range. */
static dk_status
check_transparency(const dk_design *d, const dk_waves *w, dk_error *err)
{
    const dk_crystal *c = d->crystal;
    const double lam[3] = {w->signal_um, w->idler_um, w->pump_um};
    for (int k = 0; k < 3; k++) {
        dk_status s = lam[k] > 0 ? dk_transparency_check(
                                       c, lam[k], dk_design_wave_name(d, k), err)
                                 : DK_OK;
        if (s)
            return s;
    }
    return DK_OK;
}

static dk_status
check_request(const dk_design_request *rq, dk_error *err)
{
    if (!rq->crystal)
        return dk_error_set(err, DK_EINVAL, "no crystal given");
    if (rq->order < 1 || rq->order > 99)
        return dk_error_set(err, DK_EINVAL,
                            "QPM order %d must be between 1 and 99",
                            rq->order);
    if (!(rq->duty > 0 && rq->duty < 1))
        return dk_error_set(err, DK_EINVAL,
                            "duty cycle %g must lie strictly between 0 and "
                            "1",
                            rq->duty);
    if (isfinite(rq->temp_c) && rq->temp_c < DK_ABSOLUTE_ZERO_C)
        return dk_error_set(err, DK_EINVAL,
                            "temperature %g C is below absolute zero",
                            rq->temp_c);
    if (isfinite(rq->temp_range_c[0]) || isfinite(rq->temp_range_c[1])) {
        const double *r = rq->temp_range_c;
        if (!(r[0] < r[1]) || r[0] < DK_ABSOLUTE_ZERO_C ||
            r[1] > DK_DESIGN_MAX_TEMP_C)
            return dk_error_set(err, DK_EINVAL,
                                "temperature range %g-%g C must have low < "
                                "high within %g to %g C (no data set is "
                                "fitted beyond a few hundred C)",
                                r[0], r[1], DK_ABSOLUTE_ZERO_C,
                                DK_DESIGN_MAX_TEMP_C);
    }
    if (isfinite(rq->temp_c) && rq->temp_c > DK_DESIGN_MAX_TEMP_C)
        return dk_error_set(err, DK_EINVAL,
                            "temperature %g C is above %g C, where no data "
                            "set says anything",
                            rq->temp_c, DK_DESIGN_MAX_TEMP_C);
    if (isfinite(rq->length_mm) && !(rq->length_mm > 0))
        return dk_error_set(err, DK_EINVAL,
                            "crystal length must be positive");
    if (fabs(rq->alpha_rad) >= DK_PI / 4)
        return dk_error_set(err, DK_EINVAL,
                            "noncollinear angle %.4g deg must be below 45 "
                            "deg",
                            rq->alpha_rad / DK_RAD_PER_DEG);
    if (rq->broadband && rq->alpha_rad != 0)
        return dk_error_set(err, DK_EINVAL,
                            "choose one of a noncollinear angle and the "
                            "broadband (group-velocity-matched) angle");
    if (rq->solution < 0 || rq->solution > DK_DESIGN_MAX_SOL)
        return dk_error_set(err, DK_EINVAL,
                            "solution number %d must be 1 to %d",
                            rq->solution, DK_DESIGN_MAX_SOL);
    if (rq->type && strcmp(rq->type, "0") && strcmp(rq->type, "I") &&
        strcmp(rq->type, "II"))
        return dk_error_set(err, DK_EINVAL,
                            "type '%s' must be 0, I or II", rq->type);
    if (rq->shg && rq->broadband)
        return dk_error_set(err, DK_EINVAL,
                            "the broadband noncollinear angle applies to "
                            "three-wave mixing, not SHG");
    return DK_OK;
}

dk_status
dk_design_setup(const dk_design_request *rq, dk_design *d, dk_error *err)
{
    memset(d, 0, sizeof *d);
    dk_notes_clear(&d->notes);
    d->chosen = -1;
    d->rq = *rq;
    dk_status s = check_request(rq, err);
    if (s)
        return s;
    const dk_crystal *c = rq->crystal;
    d->crystal = c;
    d->shg = rq->shg;
    d->held = rq->held;
    d->waves = rq->waves;
    d->length_mm = rq->length_mm;
    d->process = rq->process != DK_PROCESS_AUTO ? rq->process
                 : rq->shg                      ? DK_PROCESS_SHG
                                                : DK_PROCESS_OPA;
    if (rq->shg && d->process != DK_PROCESS_SHG)
        return dk_error_set(err, DK_EINVAL,
                            "a fundamental wavelength means SHG, not %s",
                            dk_process_str(d->process));
    if ((s = choose_scheme(rq, d, err)) || (s = choose_set(rq, d, err)))
        return s;
    if ((s = check_transparency(d, &d->waves, err)))
        return s;
    choose_temperature(rq, d);
    if (d->scheme == DK_SCHEME_QPM) {
        char pol[4];
        s = dk_design_qpm_modes(d, pol, err);
        if (!s)
            s = dk_qpm_init(&d->qpm, c, d->set, pol[0] ? pol : NULL,
                            rq->order, rq->duty, rq->written_temp_c, err);
        if (s)
            return s;
        memcpy(d->pol, d->qpm.pol, 3);
        d->period_um = rq->period_um;
        if (!(rq->order % 2) && fabs(rq->duty - 0.5) < 1e-12)
            return dk_error_set(err, DK_EINVAL,
                                "an even QPM order (%d) at 50 %% duty cycle "
                                "has no nonlinear coupling: use an odd "
                                "order or another duty cycle (--duty)",
                                rq->order);
    } else {
        if ((s = dk_design_angle_modes(d, err)))
            return s;
        d->angle = (dk_angle_problem){c, d->set, d->waves, d->shg,
                                      d->temp_c, rq->alpha_rad, 0};
        d->theta_rad = isfinite(rq->theta_rad) ? rq->theta_rad : 0;
        d->phi_rad = isfinite(rq->phi_rad) ? rq->phi_rad : 0;
    }
    if ((s = check_set_axes(d, err)))
        return s;
    dk_design_note_provenance(d);
    return DK_OK;
}

dk_status
dk_design_resolve(const dk_design_request *rq, dk_design *d, dk_error *err)
{
    dk_status s = dk_design_setup(rq, d, err);
    return s ? s : dk_design_solve(d, err);
}
