/*
 * design_solve.c - every solution of a design's question, and the choice
 * of one (rules in deltak/design.h).
 *
 * QPM: the period is explicit; temperatures and signal/idler pairs are
 * every root of Δk (deltak/qpm.h). Birefringent: every direction of every
 * mode combination over the whole angular range (deltak/angle.h), or, for
 * the broadband noncollinear geometry, the group-velocity-matched α on
 * both sides of the pump. The default choice is the direction with the
 * largest |d_eff|: a solution with d_eff ≈ 0 phase-matches but converts
 * nothing, so taking the first root found misleads.
 */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "deltak/constants.h"
#include "deltak/material.h"
#include "design_internal.h"

#define TEMP_MARGIN_C 50   /* default temperature search beyond the set */
#define BROADBAND_ALPHA_MAX (20 * DK_RAD_PER_DEG)

/* The temperature range where a design looks for temperatures. */
static void
temp_search_range(const dk_design *d, double r[2])
{
    if (isfinite(d->rq.temp_range_c[0])) {
        r[0] = d->rq.temp_range_c[0];
        r[1] = d->rq.temp_range_c[1];
        return;
    }
    const dk_dispersion_set *s = d->set;
    const double *f = s->temp_form == DK_TEMP_NONE
                          ? s->thermo.temperature_range_c
                          : s->temperature_range_c;
    r[0] = fmax(f[0] - TEMP_MARGIN_C, -270);
    r[1] = f[1] + TEMP_MARGIN_C;
}

static void
finish_solution(dk_design *d, dk_solution *o)
{
    o->range = dk_design_range_flags(d, &o->waves, o->temp_c);
    dk_design_note_range(d, o->range, &o->waves, o->temp_c, &d->notes);
}

static void
qpm_solution(dk_design *d, const dk_waves *w, double temp_c,
             double period_um, dk_solution *o)
{
    memset(o, 0, sizeof *o);
    o->waves = *w;
    o->temp_c = temp_c;
    o->period_um = period_um;
    memcpy(o->pol, d->qpm.pol, 3);
    dk_angle_type_of(o->pol, o->type);
    double deff;
    o->deff_pm_per_v = dk_qpm_deff(&d->qpm, &deff, NULL) ? NAN : deff;
    const double lam[3] = {w->signal_um, w->idler_um, w->pump_um};
    for (int k = 0; k < 3; k++)
        if (dk_material_n(d->crystal, d->set, d->qpm.pol[k], lam[k], temp_c,
                          &o->n[k], NULL, NULL))
            o->n[k] = NAN;
    finish_solution(d, o);
}

static dk_status
solve_qpm(dk_design *d, dk_error *err)
{
    dk_qpm *q = &d->qpm;
    int known = d->shg ? 3 : dk_waves_given(&d->waves);
    dk_status s;
    if (known == 3 && !(d->period_um > 0)) {
        double pw, pt;
        if ((s = dk_qpm_period(q, &d->waves, d->temp_c, &pw, &pt, err)))
            return s;
        d->solved = DK_SOLVED_PERIOD;
        qpm_solution(d, &d->waves, d->temp_c, pw, &d->sol[0]);
        d->nsol = 1;
        return DK_OK;
    }
    if (known == 3) {
        if (!dk_set_has_temperature(d->set))
            return dk_error_set(err, DK_EINVAL,
                                "data set '%s' has no temperature "
                                "dependence, so it cannot give a "
                                "phase-matching temperature; pick a "
                                "temperature-dependent set with "
                                "--dispersion",
                                d->set->name);
        double r[2], t[DK_DESIGN_MAX_SOL];
        int n;
        temp_search_range(d, r);
        if ((s = dk_qpm_solve_temperature(q, &d->waves, d->period_um, r[0],
                                          r[1], t, DK_DESIGN_MAX_SOL, &n,
                                          err)))
            return s;
        if (n == 0)
            return dk_error_set(err, DK_ENOROOT,
                                "no phase-matching temperature between "
                                "%.4g and %.4g C for a %.6g um period with "
                                "data set '%s' (widen --temp-range or check "
                                "the period)",
                                r[0], r[1], d->period_um, d->set->name);
        d->solved = DK_SOLVED_TEMPERATURE;
        for (int i = 0; i < n; i++)
            qpm_solution(d, &d->waves, t[i], d->period_um, &d->sol[i]);
        d->nsol = n;
        return DK_OK;
    }
    if (d->waves.pump_um > 0 && d->period_um > 0 && known == 1) {
        dk_waves w[DK_DESIGN_MAX_SOL];
        int n;
        if ((s = dk_qpm_solve_wavelengths(q, d->waves.pump_um, d->period_um,
                                          d->temp_c, w, DK_DESIGN_MAX_SOL,
                                          &n, err)))
            return s;
        if (n == 0)
            return dk_error_set(err, DK_ENOROOT,
                                "a %.6g um period phase-matches no signal/"
                                "idler pair of a %.6g um pump at %.4g C "
                                "with data set '%s'",
                                d->period_um, d->waves.pump_um, d->temp_c,
                                d->set->name);
        d->solved = DK_SOLVED_WAVELENGTHS;
        for (int i = 0; i < n; i++)
            qpm_solution(d, &w[i], d->temp_c, d->period_um, &d->sol[i]);
        d->nsol = n;
        return DK_OK;
    }
    return dk_error_set(err, DK_EINVAL,
                        "give two of pump, signal and idler (or a "
                        "fundamental); with a period and a temperature the "
                        "pump alone is enough");
}

static void
angle_solution(dk_design *d, const dk_angle_solution *a, double alpha_rad,
               dk_solution *o)
{
    memset(o, 0, sizeof *o);
    o->waves = d->waves;
    o->temp_c = d->temp_c;
    memcpy(o->pol, a->pol, 4);
    memcpy(o->type, a->type, 4);
    memcpy(o->plane, a->plane, 4);
    o->theta_rad = a->theta_rad;
    o->phi_rad = a->phi_rad;
    o->alpha_rad = alpha_rad;
    o->deff_pm_per_v = a->deff_pm_per_v;
    memcpy(o->walkoff_rad, a->walkoff_rad, sizeof o->walkoff_rad);
    memcpy(o->n, a->n, sizeof o->n);
    finish_solution(d, o);
}

/* A uniaxial noncollinear root beyond 90° is the mirror image of one
 * below 90° with the signal on the other side of the pump. */
static void
fold_noncollinear(dk_angle_problem *pb, dk_angle_solution *a, double *alpha)
{
    if (pb->crystal->optical_class != DK_UNIAXIAL ||
        a->theta_rad <= DK_PI / 2)
        return;
    a->theta_rad = DK_PI - a->theta_rad;
    *alpha = -*alpha;
    pb->alpha_rad = *alpha;
    dk_angle_best_phi(pb, a);
}

/* The broadband noncollinear geometry, on both sides of the pump. */
static dk_status
solve_broadband(dk_design *d, dk_error *err)
{
    const char *def = d->crystal->optical_class == DK_BIAXIAL ? "ssf"
                                                               : "ooe";
    const char *alt = d->crystal->optical_class == DK_BIAXIAL ? "ffs"
                                                               : "eeo";
    const char *cands[2] = {d->pol[0] ? d->pol : def, d->pol[0] ? NULL : alt};
    dk_error last = {0};
    for (int c = 0; c < 2; c++) {
        if (!cands[c])
            continue;
        char t[4];
        dk_angle_type_of(cands[c], t);
        if (d->type[0] && strcmp(t, d->type))
            continue;
        /* The broadband geometry lies near a collinear solution of the
         * same modes: without one, the α search would scan in vain. */
        dk_angle_problem col = d->angle;
        col.alpha_rad = 0;
        dk_angle_solution tmp[DK_ANGLE_MAX_SOL];
        int ncol = 0;
        dk_angle_search only = {cands[c], d->rq.phi_rad, d->rq.plane};
        if (dk_angle_solve(&col, &only, tmp, DK_ANGLE_MAX_SOL, &ncol, NULL) ||
            ncol == 0) {
            if (!last.msg[0])
                dk_error_set(&last, DK_ENOROOT,
                             "modes %s do not phase-match collinearly, so "
                             "there is no broadband noncollinear geometry "
                             "near them",
                             cands[c]);
            continue;
        }
        for (int sign = 1; sign >= -1; sign -= 2) {
            dk_angle_problem pb = d->angle;
            double alpha, theta;
            double phi = isfinite(d->rq.phi_rad) ? d->rq.phi_rad : 0;
            if (dk_angle_magic_alpha(&pb, cands[c], phi, sign,
                                     BROADBAND_ALPHA_MAX, &alpha, &theta,
                                     &last))
                continue;
            dk_angle_solution a;
            memset(&a, 0, sizeof a);
            memcpy(a.pol, cands[c], 4);
            a.theta_rad = theta;
            a.phi_rad = phi;
            pb.alpha_rad = alpha;
            if (d->crystal->optical_class == DK_UNIAXIAL &&
                !isfinite(d->rq.phi_rad))
                dk_angle_best_phi(&pb, &a);
            else if (dk_angle_describe(&pb, &a, NULL))
                continue;
            /* At degeneracy both sides give α = 0: one solution. */
            int dup = 0;
            for (int k = 0; k < d->nsol && !dup; k++)
                dup = !strcmp(d->sol[k].pol, a.pol) &&
                      fabs(d->sol[k].alpha_rad - alpha) < 1e-12 &&
                      fabs(d->sol[k].theta_rad - a.theta_rad) < 1e-9;
            if (!dup && d->nsol < DK_DESIGN_MAX_SOL)
                angle_solution(d, &a, alpha, &d->sol[d->nsol++]);
        }
    }
    if (d->nsol == 0)
        return dk_error_set(err, DK_ENOROOT, "%s",
                            last.msg[0] ? last.msg
                                        : "no broadband noncollinear "
                                          "geometry for these modes");
    d->solved = DK_SOLVED_DIRECTION;
    return DK_OK;
}

static dk_status
solve_angle(dk_design *d, dk_error *err)
{
    if (!d->shg && dk_waves_given(&d->waves) != 3)
        return dk_error_set(err, DK_EINVAL,
                            "give two of pump, signal and idler (or a "
                            "fundamental) to find phase-matching "
                            "directions");
    d->angle.waves = d->waves;
    d->angle.temp_c = d->temp_c;
    if (d->rq.broadband)
        return solve_broadband(d, err);
    dk_angle_search opt = {d->pol[0] ? d->pol : NULL, d->rq.phi_rad,
                           d->rq.plane};
    dk_angle_solution a[DK_ANGLE_MAX_SOL];
    int n;
    dk_angle_problem pb = d->angle;
    dk_status s = dk_angle_solve(&pb, &opt, a, DK_ANGLE_MAX_SOL, &n, err);
    if (s)
        return s;
    for (int i = 0; i < n && d->nsol < DK_DESIGN_MAX_SOL; i++) {
        if (d->type[0] && strcmp(a[i].type, d->type))
            continue;
        double alpha = pb.alpha_rad;
        fold_noncollinear(&pb, &a[i], &alpha);
        pb.alpha_rad = d->angle.alpha_rad;
        angle_solution(d, &a[i], alpha, &d->sol[d->nsol++]);
    }
    if (d->nsol == 0) {
        char what[96];
        snprintf(what, sizeof what, "%s%s%s%s%s",
                 d->type[0] ? " in type " : "", d->type,
                 d->pol[0] ? " with modes " : "", d->pol,
                 d->rq.plane ? " in the requested plane" : "");
        return dk_error_set(err, DK_ENOROOT,
                            "%s (data set %s) does not phase-match this "
                            "process at %.4g C in any direction%s",
                            d->crystal->id, d->set->name, d->temp_c, what);
    }
    d->solved = DK_SOLVED_DIRECTION;
    return DK_OK;
}

/* Index of the solution the rules pick (see deltak/design.h). */
static int
default_choice(dk_design *d, dk_error *err, const char **why)
{
    const dk_design_request *rq = &d->rq;
    if (rq->solution > 0) {
        if (rq->solution > d->nsol) {
            dk_error_set(err, DK_EINVAL,
                         "--solution %d: there %s only %d solution%s",
                         rq->solution, d->nsol == 1 ? "is" : "are", d->nsol,
                         d->nsol == 1 ? "" : "s");
            return -1;
        }
        *why = NULL;
        return rq->solution - 1;
    }
    int best = 0;
    if (d->solved == DK_SOLVED_TEMPERATURE) {
        if (!isfinite(rq->temp_c)) {
            *why = "the lowest phase-matching temperature; --temp picks the "
                   "nearest";
            return 0;
        }
        for (int i = 1; i < d->nsol; i++)
            if (fabs(d->sol[i].temp_c - rq->temp_c) <
                fabs(d->sol[best].temp_c - rq->temp_c))
                best = i;
        *why = "the phase-matching temperature nearest --temp";
        return best;
    }
    if (d->solved == DK_SOLVED_WAVELENGTHS) {
        *why = "the pair with the shortest signal; --solution picks another";
        return 0;
    }
    if (isfinite(rq->theta_rad)) {
        for (int i = 1; i < d->nsol; i++)
            if (fabs(d->sol[i].theta_rad - rq->theta_rad) <
                fabs(d->sol[best].theta_rad - rq->theta_rad))
                best = i;
        *why = "the direction nearest --theta";
        return best;
    }
    for (int i = 1; i < d->nsol; i++) {
        double a = d->sol[i].deff_pm_per_v, b = d->sol[best].deff_pm_per_v;
        if (isfinite(a) && (!isfinite(b) || a > b * (1 + 1e-9)))
            best = i;
    }
    *why = "the largest |d_eff|; --solution, --theta, --phi or --plane "
           "picks another";
    return best;
}

dk_status
dk_design_choose(dk_design *d, int index, dk_error *err)
{
    if (index < 0 || index >= d->nsol)
        return dk_error_set(err, DK_EINVAL, "no solution %d", index + 1);
    const dk_solution *o = &d->sol[index];
    d->chosen = index;
    d->waves = o->waves;
    d->temp_c = o->temp_c;
    if (d->scheme == DK_SCHEME_QPM) {
        d->period_um = o->period_um;
    } else {
        memcpy(d->pol, o->pol, 4);
        memcpy(d->type, o->type, 4);
        memcpy(d->plane, o->plane, 4);
        d->theta_rad = o->theta_rad;
        d->phi_rad = o->phi_rad;
        d->angle.alpha_rad = o->alpha_rad;
    }
    d->angle.waves = d->waves;
    d->angle.temp_c = d->temp_c;
    return DK_OK;
}

static void
note_choice(dk_design *d, const char *why)
{
    if (d->nsol < 2 || !why)
        return;
    const dk_solution *o = &d->sol[d->chosen];
    char what[96];
    switch (d->solved) {
    case DK_SOLVED_TEMPERATURE:
        snprintf(what, sizeof what, "%.2f C", o->temp_c);
        break;
    case DK_SOLVED_WAVELENGTHS:
        snprintf(what, sizeof what, "signal %.5g um, idler %.5g um",
                 o->waves.signal_um, o->waves.idler_um);
        break;
    default:
        snprintf(what, sizeof what, "%s, theta %.2f deg, phi %.2f deg",
                 o->pol, o->theta_rad / DK_RAD_PER_DEG,
                 o->phi_rad / DK_RAD_PER_DEG);
    }
    dk_notes_add(&d->notes, DK_NOTE_DEFAULT, "default-solution",
                 "solution %d of %d (%s) chosen: %s", d->chosen + 1, d->nsol,
                 what, why);
}

dk_status
dk_design_solve(dk_design *d, dk_error *err)
{
    d->nsol = 0;
    d->chosen = -1;
    dk_status s = d->scheme == DK_SCHEME_QPM ? solve_qpm(d, err)
                                             : solve_angle(d, err);
    if (s)
        return s;
    const char *why = NULL;
    int k = default_choice(d, err, &why);
    if (k < 0)
        return DK_EINVAL;
    dk_design_choose(d, k, NULL);
    note_choice(d, why);
    if (d->crystal->has_nonlinear && d->crystal->nl_from_memory)
        dk_notes_add(&d->notes, DK_NOTE_MEMORY, "from-memory:d",
                     "the d coefficients of %s are typed from memory; "
                     "treat d_eff and efficiencies as estimates",
                     d->crystal->id);
    dk_design_note_provenance(d);
    return DK_OK;
}

dk_status
dk_design_ncpm(dk_design *d, dk_error *err)
{
    if (d->scheme != DK_SCHEME_ANGLE)
        return dk_error_set(err, DK_EINVAL,
                            "noncritical phase matching is a birefringent "
                            "design");
    if (!dk_set_has_temperature(d->set))
        return dk_error_set(err, DK_EINVAL,
                            "data set '%s' has no temperature dependence; "
                            "noncritical temperatures need one",
                            d->set->name);
    static const struct {
        const char *axis;
        double theta, phi;
    } dirs[] = {{"X", DK_PI / 2, 0}, {"Y", DK_PI / 2, DK_PI / 2},
                {"Z", 0, 0}};
    const char *l = d->crystal->optical_class == DK_BIAXIAL ? "sf" : "oe";
    double r[2];
    if (isfinite(d->rq.temp_range_c[0])) {
        r[0] = d->rq.temp_range_c[0];
        r[1] = d->rq.temp_range_c[1];
    } else {
        const dk_dispersion_set *s = d->set;
        const double *f = s->temp_form == DK_TEMP_NONE
                              ? s->thermo.temperature_range_c
                              : s->temperature_range_c;
        r[0] = f[0], r[1] = f[1];
    }
    d->nsol = 0;
    d->angle.waves = d->waves;
    /* The temperature is what is solved for here. */
    dk_notes_remove(&d->notes, "default-temperature");
    /* In a uniaxial crystal every direction at θ = 90° has the same Δk
     * (X and Y alike) while d_eff depends on φ: one entry, "XY", at the
     * φ of the largest |d_eff| or at --phi. */
    const int uniaxial = d->crystal->optical_class == DK_UNIAXIAL;
    for (size_t k = 0; k < 3; k++)
        for (int c = 0; c < 8 && !(uniaxial && k == 1); c++) {
            char p[4] = {l[(c >> 2) & 1], l[(c >> 1) & 1], l[c & 1], 0};
            char t[4];
            dk_angle_type_of(p, t);
            if (!strcmp(t, "0") || (d->shg && p[0] != p[1] && p[0] == l[1]))
                continue;
            if ((d->pol[0] && strcmp(d->pol, p)) ||
                (d->type[0] && strcmp(d->type, t)))
                continue;
            double temps[8];
            int n;
            dk_angle_problem pb = d->angle;
            dk_status s = dk_angle_ncpm_temperatures(
                &pb, p, dirs[k].theta, dirs[k].phi, r[0], r[1], temps, 8, &n,
                err);
            if (s)
                return s;
            for (int i = 0; i < n && d->nsol < DK_DESIGN_MAX_SOL; i++) {
                dk_angle_solution a;
                memset(&a, 0, sizeof a);
                memcpy(a.pol, p, 4);
                a.theta_rad = dirs[k].theta;
                a.phi_rad = dirs[k].phi;
                pb.temp_c = temps[i];
                if (uniaxial && k == 0 && isfinite(d->rq.phi_rad))
                    a.phi_rad = d->rq.phi_rad;
                if (dk_angle_describe(&pb, &a, NULL))
                    continue;
                if (uniaxial && k == 0 && !isfinite(d->rq.phi_rad))
                    dk_angle_best_phi(&pb, &a);
                snprintf(a.plane, sizeof a.plane, "%s",
                         uniaxial && k == 0 ? "XY" : dirs[k].axis);
                double keep = d->temp_c;
                d->temp_c = temps[i];
                angle_solution(d, &a, 0, &d->sol[d->nsol++]);
                d->temp_c = keep;
            }
        }
    d->solved = DK_SOLVED_NCPM;
    d->chosen = -1;
    if (d->nsol == 0)
        return DK_OK;
    /* The default, as for every other solve: the largest |d_eff|. */
    int best = 0;
    for (int i = 1; i < d->nsol; i++)
        if (fabs(d->sol[i].deff_pm_per_v) > fabs(d->sol[best].deff_pm_per_v))
            best = i;
    dk_design_choose(d, best, NULL);
    note_choice(d, "the largest |d_eff|; --pol or --type narrows the list");
    return DK_OK;
}

