/*
 * design_sets.c - one request answered by every data set of a crystal,
 * and the spread between the answers (see deltak/design.h).
 *
 * The spread is only meaningful between like answers: sets without
 * temperature dependence are held at their own reference temperature, so
 * they are compared only when that is (within 0.5 °C) the temperature the
 * others use; birefringent answers are compared for the mode combination
 * and plane the first answering set chose.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/constants.h"
#include "deltak/design.h"

static double
key_value(const dk_design *d, const char **name)
{
    const dk_solution *o = &d->sol[d->chosen];
    switch (d->solved) {
    case DK_SOLVED_PERIOD:
        *name = "period_um";
        return o->period_um;
    case DK_SOLVED_TEMPERATURE:
    case DK_SOLVED_NCPM:
        *name = "temperature_C";
        return o->temp_c;
    case DK_SOLVED_WAVELENGTHS:
        *name = "idler_um";
        return o->waves.idler_um;
    case DK_SOLVED_DIRECTION:
        if (strcmp(o->plane, "XY") == 0) {
            *name = "phi_deg";
            return o->phi_rad / DK_RAD_PER_DEG;
        }
        *name = "theta_deg";
        return o->theta_rad / DK_RAD_PER_DEG;
    case DK_SOLVED_NONE:
        break;
    }
    *name = "";
    return NAN;
}

dk_status
dk_design_across_sets(const dk_design_request *rq, dk_set_outcome *out,
                      int max, int *n, dk_spread *spread, dk_error *err)
{
    *n = 0;
    memset(spread, 0, sizeof *spread);
    spread->quantity = "";
    spread->lo = INFINITY;
    spread->hi = -INFINITY;
    if (!rq->crystal)
        return dk_error_set(err, DK_EINVAL, "no crystal given");
    dk_design *dp = malloc(sizeof *dp);   /* large: not on the stack */
    if (!dp)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
#define d (*dp)
    const dk_set_outcome *ref = NULL;
    double ref_temp = NAN;
    dk_error first = {0};
    for (int i = 0; i < rq->crystal->nsets && *n < max; i++) {
        dk_set_outcome *o = &out[(*n)++];
        memset(o, 0, sizeof *o);
        dk_design_request r = *rq;
        r.set_name = rq->crystal->sets[i].name;
        o->set = &rq->crystal->sets[i];
        dk_error e = {0};
        o->status = dk_design_resolve(&r, &d, &e);
        o->notes = d.notes;
        if (o->status) {
            snprintf(o->message, sizeof o->message, "%s", e.msg);
            if (!first.msg[0])
                first = e;
            if (o->status == DK_EINVAL && i == 0) {
                free(dp);
                return dk_error_set(err, DK_EINVAL, "%s", e.msg);
            }
            continue;
        }
        o->solved = d.solved;
        o->nsol = d.nsol;
        o->sol = d.sol[d.chosen];
        o->value = key_value(&d, &spread->quantity);
        o->in_spread = isfinite(o->value);
        int held = !dk_set_has_temperature(o->set);
        if (!ref) {
            ref = o;
            ref_temp = o->sol.temp_c;
        } else if (held && fabs(o->sol.temp_c - ref_temp) > 0.5) {
            o->in_spread = 0;
            dk_notes_add(&o->notes, DK_NOTE_WARNING, "spread:held",
                         "data set '%s' has no temperature dependence and "
                         "answers at its %.4g C, not %.4g C: left out of the "
                         "spread",
                         o->set->name, o->sol.temp_c, ref_temp);
        } else if (o->solved == DK_SOLVED_DIRECTION &&
                   (strcmp(o->sol.pol, ref->sol.pol) ||
                    strcmp(o->sol.plane, ref->sol.plane))) {
            o->in_spread = 0;
            dk_notes_add(&o->notes, DK_NOTE_WARNING, "spread:other-solution",
                         "data set '%s' chose modes %s%s%s, not %s%s%s as "
                         "data set '%s': left out of the spread",
                         o->set->name, o->sol.pol, o->sol.plane[0] ? " in " : "",
                         o->sol.plane, ref->sol.pol,
                         ref->sol.plane[0] ? " in " : "", ref->sol.plane,
                         ref->set->name);
        }
        if (o->in_spread) {
            spread->n++;
            spread->lo = fmin(spread->lo, o->value);
            spread->hi = fmax(spread->hi, o->value);
        }
    }
#undef d
    free(dp);
    if (!ref)
        return dk_error_set(err, DK_ENOROOT,
                            "no data set of %s could answer (first: %s)",
                            rq->crystal->id, first.msg);
    spread->spread = spread->n > 1 ? spread->hi - spread->lo : 0;
    return DK_OK;
}
