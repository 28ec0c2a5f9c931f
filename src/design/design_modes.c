/*
 * design_modes.c - polarisation letters and type names of a design.
 *
 * Type names follow the trade: type 0, all three waves in one
 * polarisation (QPM only: birefringence cannot phase-match it); type I,
 * signal and idler alike and the pump orthogonal; type II, signal and
 * idler orthogonal. For QPM a type name is resolved to the axis letters
 * whose bulk d_eff (deltak/nonlinear.h) is not zero; when several remain
 * (e.g. type II with signal and idler exchangeable, away from degeneracy)
 * the name is ambiguous and the candidates are listed.
 */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "deltak/nonlinear.h"
#include "design_internal.h"

/* The two polarisation letters a QPM design of @c may use. */
static void
qpm_letters(const dk_crystal *c, char letters[3])
{
    if (c->optical_class == DK_UNIAXIAL) {
        strcpy(letters, "oe");
        return;
    }
    int k = 0;
    for (int a = 0; a < 3; a++)
        if (a != c->grating_axis)
            letters[k++] = (char)("xyz"[a]);
    letters[2] = '\0';
}

/* Bulk |d_eff| of QPM letters @pol; NAN without d data or on error. */
static double
bulk_deff(const dk_design *d, const char *pol)
{
    dk_qpm q;
    double v;
    if (dk_qpm_init(&q, d->crystal, d->set, pol, 1, 0.5, 25, NULL) ||
        dk_qpm_deff(&q, &v, NULL))
        return NAN;
    return v;
}

dk_status
dk_design_qpm_modes(dk_design *d, char pol[4], dk_error *err)
{
    const dk_design_request *rq = &d->rq;
    const dk_crystal *c = d->crystal;
    pol[0] = '\0';
    if (c->optical_class == DK_ISOTROPIC) {
        if (rq->pol)
            return dk_error_set(err, DK_EINVAL,
                                "%s is isotropic: polarisation letters do "
                                "not apply (d_eff assumes all fields along "
                                "<111>, the usual orientation); drop --pol",
                                c->id);
        if (rq->type && strcmp(rq->type, "0"))
            return dk_error_set(err, DK_EINVAL,
                                "%s is isotropic: all waves share one "
                                "polarisation (type 0), not type %s",
                                c->id, rq->type);
        strcpy(d->type, "0");
        return DK_OK;
    }
    if (rq->pol) {
        if (strlen(rq->pol) != 3)
            return dk_error_set(err, DK_EINVAL,
                                "--pol '%s' must have three letters: "
                                "signal, idler, pump (e.g. zzz or eee)",
                                rq->pol);
        snprintf(pol, 4, "%s", rq->pol);
        char t[4];
        dk_angle_type_of(pol, t);
        if (rq->type && strcmp(rq->type, t))
            return dk_error_set(err, DK_EINVAL,
                                "--pol %s is type %s, not type %s as "
                                "--type says",
                                pol, t, rq->type);
        strcpy(d->type, t);
        return DK_OK;
    }
    if (!rq->type) {
        strcpy(d->type, "0");
        return DK_OK;
    }
    char l[3], cand[8][4];
    double deff[8], dmax = 0;
    int n = 0;
    /* At degeneracy (SHG, or equal signal and idler) the two orderings of
     * signal and idler are one process. */
    const dk_waves *w = &rq->waves;
    int degenerate = d->shg || (w->signal_um > 0 &&
                                fabs(w->signal_um - w->idler_um) <
                                    1e-9 * w->signal_um);
    qpm_letters(c, l);
    for (int k = 0; k < 8; k++) {
        char p[4] = {l[(k >> 2) & 1], l[(k >> 1) & 1], l[k & 1], 0};
        char t[4];
        dk_angle_type_of(p, t);
        if (strcmp(t, rq->type))
            continue;
        if (degenerate && p[0] != p[1] && strchr(l, p[1]) < strchr(l, p[0]))
            continue;
        memcpy(cand[n], p, 4);
        deff[n] = bulk_deff(d, p);
        if (isfinite(deff[n]))
            dmax = fmax(dmax, deff[n]);
        n++;
    }
    int keep = 0;
    char list[64] = "";
    size_t used = 0;
    for (int i = 0; i < n; i++) {
        /* No d data: every candidate stays; else only nonzero d_eff. */
        if (dmax > 0 && !(deff[i] > 1e-6 * dmax))
            continue;
        if (keep++ == 0)
            memcpy(pol, cand[i], 4);
        used += (size_t)snprintf(list + used, sizeof list - used, "%s%s",
                                 used ? ", " : "", cand[i]);
    }
    if (keep == 0)
        return dk_error_set(err, DK_EINVAL,
                            "no type %s polarisation of %s has a nonzero "
                            "d_eff for a beam along %c",
                            rq->type, c->id, "XYZ"[c->grating_axis]);
    if (keep > 1)
        return dk_error_set(err, DK_EINVAL,
                            "type %s is ambiguous in %s: give --pol, one "
                            "of %s (signal idler pump)",
                            rq->type, c->id, list);
    strcpy(d->type, rq->type);
    return DK_OK;
}

dk_status
dk_design_angle_modes(dk_design *d, dk_error *err)
{
    const dk_design_request *rq = &d->rq;
    const char *labels = d->crystal->optical_class == DK_BIAXIAL ? "sf"
                                                                 : "oe";
    d->pol[0] = '\0';
    d->type[0] = '\0';
    if (rq->type) {
        if (!strcmp(rq->type, "0"))
            return dk_error_set(err, DK_EINVAL,
                                "type 0 (all waves in one mode) cannot be "
                                "birefringently phase-matched; use QPM");
        snprintf(d->type, sizeof d->type, "%s", rq->type);
    }
    if (!rq->pol)
        return DK_OK;
    if (strlen(rq->pol) != 3 || strspn(rq->pol, labels) != 3)
        return dk_error_set(err, DK_EINVAL,
                            "--pol '%s' must be three of the letters %c/%c "
                            "(%s modes of signal, idler, pump), e.g. %s",
                            rq->pol, labels[0], labels[1],
                            labels[0] == 's' ? "slow/fast" : "o/e",
                            labels[0] == 's' ? "ssf" : "ooe");
    char t[4];
    dk_angle_type_of(rq->pol, t);
    if (!strcmp(t, "0"))
        return dk_error_set(err, DK_EINVAL,
                            "--pol %s puts every wave in one mode, which "
                            "birefringence cannot phase-match",
                            rq->pol);
    if (d->type[0] && strcmp(d->type, t))
        return dk_error_set(err, DK_EINVAL,
                            "--pol %s is type %s, not type %s as --type "
                            "says",
                            rq->pol, t, d->type);
    memcpy(d->pol, rq->pol, 4);
    strcpy(d->type, t);
    return DK_OK;
}
