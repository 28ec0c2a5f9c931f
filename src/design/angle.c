/*
 * angle.c - birefringent phase matching (method and references in
 * deltak/angle.h).
 *
 * Solutions are roots of Δk along one angle (θ for uniaxial crystals and
 * the YZ and XZ planes of biaxial ones, φ in the XY plane), bracketed on a
 * grid and refined with Brent's method (deltak/roots.h), for every
 * combination of eigenmodes of the three waves. In a uniaxial crystal Δk
 * does not depend on φ; φ is then chosen to maximise |d_eff| (scan, then
 * golden-section refinement).
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/angle.h"
#include "deltak/constants.h"
#include "deltak/nonlinear.h"
#include "deltak/roots.h"

#define ANGLE_SCAN 1800     /* grid intervals over 90 degrees */
#define ANGLE_TOL 1e-10     /* rad */
#define PHI_SCAN 720        /* grid over 360 degrees for the d_eff search */
#define TEMP_SCAN 400
#define ALPHA_STEP 0.0005   /* rad, scan step of the magic-angle search */

/* The mode labelled @label at wavelength @lam along @s; 0 on error. */
static int
mode_of(dk_angle_problem *pb, double lam, const double s[3], char label,
        dk_mode *m, dk_error *err)
{
    dk_mode two[2];
    if (dk_modes_at(pb->crystal, pb->set, lam, pb->temp_c, s, two,
                    &pb->warnings, err))
        return 0;
    int k = dk_mode_select(two, label);
    if (k < 0)
        return 0;
    *m = two[k];
    return 1;
}

/* Rotate the pump direction by α in the plane of the pump and Z. */
static void
signal_direction(double theta, double phi, double alpha, double s[3])
{
    dk_direction(theta + alpha, phi, s);
}

/* Directions of the three waves for a pump along (θ, φ). Returns 0 when
 * the idler direction is undefined. */
static int
directions_of(dk_angle_problem *pb, const char pol[3], double theta, double phi,
           double sp[3], double ss[3], double si[3], dk_mode m[3],
           dk_error *err)
{
    const dk_waves *w = &pb->waves;
    dk_direction(theta, phi, sp);
    if (!mode_of(pb, w->pump_um, sp, pol[2], &m[2], err))
        return 0;
    if (pb->alpha_rad == 0) {
        memcpy(ss, sp, sizeof(double) * 3);
        memcpy(si, sp, sizeof(double) * 3);
        return mode_of(pb, w->signal_um, ss, pol[0], &m[0], err) &&
               mode_of(pb, w->idler_um, si, pol[1], &m[1], err);
    }
    signal_direction(theta, phi, pb->alpha_rad, ss);
    if (!mode_of(pb, w->signal_um, ss, pol[0], &m[0], err))
        return 0;
    double kp = m[2].n / w->pump_um, ks = m[0].n / w->signal_um, len = 0;
    for (int i = 0; i < 3; i++) {
        si[i] = kp * sp[i] - ks * ss[i];
        len += si[i] * si[i];
    }
    len = sqrt(len);
    if (!(len > 0))
        return 0;
    for (int i = 0; i < 3; i++)
        si[i] /= len;
    return mode_of(pb, w->idler_um, si, pol[1], &m[1], err);
}

dk_status
dk_angle_waves(dk_angle_problem *pb, const char pol[3], double theta_rad,
               double phi_rad, double dir[3][3], dk_mode m[3], dk_error *err)
{
    dk_error e2 = {0};
    if (!directions_of(pb, pol, theta_rad, phi_rad, dir[2], dir[0], dir[1], m,
                       &e2))
        return dk_error_set(err, e2.status ? e2.status : DK_EDOM, "%s",
                            e2.msg[0] ? e2.msg
                                      : "no mode at this direction");
    return DK_OK;
}

double
dk_angle_delta_k(dk_angle_problem *pb, const char pol[3], double theta_rad,
                 double phi_rad)
{
    double sp[3], ss[3], si[3];
    dk_mode m[3];
    if (!directions_of(pb, pol, theta_rad, phi_rad, sp, ss, si, m, NULL))
        return NAN;
    const dk_waves *w = &pb->waves;
    double kp = m[2].n / w->pump_um, ks = m[0].n / w->signal_um;
    double ki = m[1].n / w->idler_um;
    if (pb->alpha_rad == 0)
        return 2 * M_PI * (kp - ks - ki);
    double len = 0;
    for (int i = 0; i < 3; i++) {
        double v = kp * sp[i] - ks * ss[i];
        len += v * v;
    }
    return 2 * M_PI * (sqrt(len) - ki);
}

void
dk_angle_type_of(const char pol[3], char type[4])
{
    if (pol[0] == pol[1] && pol[1] == pol[2])
        strcpy(type, "0");
    else if (pol[0] == pol[1])
        strcpy(type, "I");
    else
        strcpy(type, "II");
}

dk_status
dk_angle_describe(dk_angle_problem *pb, dk_angle_solution *sol,
                  dk_error *err)
{
    double sp[3], ss[3], si[3];
    dk_mode m[3];
    dk_error e2 = {0};
    if (!directions_of(pb, sol->pol, sol->theta_rad, sol->phi_rad, sp, ss, si,
                    m, &e2))
        return dk_error_set(err, e2.status ? e2.status : DK_EDOM, "%s",
                            e2.msg[0] ? e2.msg : "no mode at this direction");
    for (int k = 0; k < 3; k++) {
        sol->walkoff_rad[k] = m[k].walkoff_rad;
        sol->n[k] = m[k].n;
    }
    dk_angle_type_of(sol->pol, sol->type);
    dk_dtensor t;
    if (dk_dtensor_from_crystal(pb->crystal, &t, NULL))
        sol->deff_pm_per_v = NAN;
    else
        sol->deff_pm_per_v = fabs(dk_deff(&t, m[2].e, m[0].e, m[1].e));
    return DK_OK;
}

/* Δk along one angle, for the root finder. */
typedef struct scan_probe {
    dk_angle_problem *pb;
    const char *pol;
    int vary_phi;       /* 1: the angle is φ at fixed θ; 0: θ at fixed φ */
    double fixed;
} scan_probe;

static double
dk_along(double x, void *p)
{
    scan_probe *sp = p;
    return sp->vary_phi ? dk_angle_delta_k(sp->pb, sp->pol, sp->fixed, x)
                        : dk_angle_delta_k(sp->pb, sp->pol, x, sp->fixed);
}

/* |d_eff| of a solution at azimuth φ (θ fixed). */
static double
deff_at(dk_angle_problem *pb, dk_angle_solution *sol, double phi)
{
    dk_angle_solution t = *sol;
    t.phi_rad = phi;
    if (dk_angle_describe(pb, &t, NULL))
        return -1;
    return isfinite(t.deff_pm_per_v) ? t.deff_pm_per_v : -1;
}

/* The φ maximising |d_eff|: grid, then golden-section refinement. */
double
dk_angle_best_phi(dk_angle_problem *pb, dk_angle_solution *sol)
{
    double best = 0, fbest = -2;
    for (int k = 0; k < PHI_SCAN; k++) {
        double phi = 2 * M_PI * k / PHI_SCAN;
        double f = deff_at(pb, sol, phi);
        if (f > fbest + 1e-12)
            fbest = f, best = phi;
    }
    double a = best - 2 * M_PI / PHI_SCAN, b = best + 2 * M_PI / PHI_SCAN;
    const double g = (sqrt(5.0) - 1) / 2;
    double x1 = b - g * (b - a), x2 = a + g * (b - a);
    double f1 = deff_at(pb, sol, x1), f2 = deff_at(pb, sol, x2);
    for (int it = 0; it < 60; it++) {
        if (f1 > f2) {
            b = x2, x2 = x1, f2 = f1;
            x1 = b - g * (b - a), f1 = deff_at(pb, sol, x1);
        } else {
            a = x1, x1 = x2, f1 = f2;
            x2 = a + g * (b - a), f2 = deff_at(pb, sol, x2);
        }
    }
    double phi = fmod(0.5 * (a + b) + 2 * M_PI, 2 * M_PI);
    if (deff_at(pb, sol, phi) < fbest)
        phi = best;
    sol->phi_rad = phi;
    dk_angle_describe(pb, sol, NULL);
    return phi;
}

/* Every combination of mode labels worth trying. */
static int
combinations(const dk_angle_problem *pb, char combos[8][4])
{
    const char *l = pb->crystal->optical_class == DK_BIAXIAL ? "sf" : "oe";
    int n = 0;
    for (int p = 0; p < 2; p++)
        for (int s = 0; s < 2; s++)
            for (int i = 0; i < 2; i++) {
                if (s == i && i == p)
                    continue;   /* all in one mode: no birefringence used */
                if (pb->shg && s > i)
                    continue;   /* same as the swapped type-II ordering */
                combos[n][0] = l[s], combos[n][1] = l[i], combos[n][2] = l[p];
                combos[n][3] = '\0';
                n++;
            }
    return n;
}

/* Two solutions are the same cut up to symmetry when their |d_eff| and
 * walk-offs agree. */
static int
same_cut(const dk_angle_solution *a, const dk_angle_solution *b)
{
    double da = a->deff_pm_per_v, db = b->deff_pm_per_v;
    int deff_same = (isnan(da) && isnan(db)) ||
                    fabs(da - db) <= 1e-6 * fmax(fabs(da), fabs(db)) + 1e-12;
    for (int k = 0; k < 3 && deff_same; k++)
        deff_same = fabs(a->walkoff_rad[k] - b->walkoff_rad[k]) < 1e-9;
    return deff_same;
}

/* Describe a root along one line; returns 1 when it is a solution. */
static int
root_solution(dk_angle_problem *pb, const char *pol, int vary_phi,
              double fixed, double x, const char *plane, int uniaxial,
              double phi_opt, dk_angle_solution *o)
{
    memset(o, 0, sizeof *o);
    memcpy(o->pol, pol, 4);
    snprintf(o->plane, sizeof o->plane, "%s", plane);
    o->theta_rad = vary_phi ? fixed : x;
    o->phi_rad = vary_phi ? x : fixed;
    if (uniaxial) {
        o->phi_rad = isfinite(phi_opt) ? phi_opt : dk_angle_best_phi(pb, o);
        return 1;
    }
    return dk_angle_describe(pb, o, NULL) == DK_OK;
}

static int
by_angle(const void *a, const void *b)
{
    const dk_angle_solution *x = a, *y = b;
    double u = strcmp(x->plane, "XY") ? x->theta_rad : x->phi_rad;
    double v = strcmp(y->plane, "XY") ? y->theta_rad : y->phi_rad;
    return (u > v) - (u < v);
}

/* Roots of Δk along θ (or φ when @vary_phi) at the fixed other angle,
 * with their twins (see dk_angle_solve). */
static dk_status
solve_line(dk_angle_problem *pb, const char *pol, int vary_phi, double fixed,
           const char *plane, int uniaxial, double phi_opt,
           dk_angle_solution *sol, int max, int *n, dk_error *err)
{
    scan_probe sp = {pb, pol, vary_phi, fixed};
    int collinear = pb->alpha_rad == 0;
    /* Collinear Δk is symmetric about 90°: scan half, mirror the roots. */
    double hi = collinear ? M_PI / 2 : (vary_phi ? M_PI * (1 - 1e-12) : M_PI);
    int nscan = collinear ? ANGLE_SCAN : 2 * ANGLE_SCAN;
    double roots[16];
    int nr;
    dk_status s = dk_roots_all(dk_along, &sp, 0, hi, nscan, ANGLE_TOL, roots,
                               16, &nr, err);
    if (s)
        return s;
    int first = *n;
    for (int r = 0; r < nr && *n < max; r++) {
        dk_angle_solution *o = &sol[*n];
        if (!root_solution(pb, pol, vary_phi, fixed, roots[r], plane,
                           uniaxial, phi_opt, o))
            continue;
        (*n)++;
        double twin = M_PI - roots[r];
        if (!collinear || fabs(twin - roots[r]) < 1e-9 || *n >= max ||
            (vary_phi && twin >= M_PI))
            continue;
        dk_angle_solution *t = &sol[*n];
        if (root_solution(pb, pol, vary_phi, fixed, twin, plane, uniaxial,
                          phi_opt, t) &&
            !same_cut(o, t))
            (*n)++;
    }
    qsort(sol + first, *n - first, sizeof *sol, by_angle);
    return DK_OK;
}

dk_status
dk_angle_solve(dk_angle_problem *pb, const dk_angle_search *opt,
               dk_angle_solution *sol, int max, int *n, dk_error *err)
{
    *n = 0;
    const dk_crystal *c = pb->crystal;
    if (c->optical_class == DK_ISOTROPIC)
        return dk_error_set(err, DK_EINVAL,
                            "%s is isotropic: it has no birefringence to "
                            "phase-match with; use quasi-phase matching "
                            "('deltak period')",
                            c->id);
    const char *only = opt ? opt->pol : NULL;
    double phi = opt ? opt->phi_rad : NAN;
    const char *plane = opt ? opt->plane : NULL;
    if (plane && c->optical_class != DK_BIAXIAL)
        return dk_error_set(err, DK_EINVAL,
                            "a principal plane applies to biaxial crystals; "
                            "%s is uniaxial (give --phi for the azimuth)",
                            c->id);
    if (plane && strcmp(plane, "XY") && strcmp(plane, "YZ") &&
        strcmp(plane, "XZ"))
        return dk_error_set(err, DK_EINVAL,
                            "plane '%s' must be XY, YZ or XZ", plane);
    char combos[8][4];
    int nc = combinations(pb, combos);
    for (int k = 0; k < nc; k++) {
        if (only && strncmp(only, combos[k], 3) != 0)
            continue;
        dk_status s = DK_OK;
        if (c->optical_class == DK_UNIAXIAL) {
            /* Δk does not depend on φ here; solve at φ = 0. */
            s = solve_line(pb, combos[k], 0, 0.0, "", 1, phi, sol, max, n,
                           err);
        } else if (isfinite(phi)) {
            s = solve_line(pb, combos[k], 0, phi, "", 0, NAN, sol, max, n,
                           err);
        } else {
            static const struct {
                const char *name;
                int vary_phi;
                double fixed;
            } planes[] = {{"XY", 1, M_PI / 2},
                          {"YZ", 0, M_PI / 2},
                          {"XZ", 0, 0.0}};
            for (size_t p = 0; p < 3 && !s; p++)
                if (!plane || !strcmp(plane, planes[p].name))
                    s = solve_line(pb, combos[k], planes[p].vary_phi,
                                   planes[p].fixed, planes[p].name, 0, NAN,
                                   sol, max, n, err);
        }
        if (s)
            return s;
    }
    return DK_OK;
}

dk_status
dk_angle_curve(dk_angle_problem *pb, const char pol[3], int nphi, int maxper,
               double *theta_rad, int *count, dk_error *err)
{
    if (nphi < 2 || maxper < 1)
        return dk_error_set(err, DK_EINVAL, "the curve needs at least two "
                                            "azimuths");
    for (int k = 0; k < nphi; k++) {
        scan_probe sp = {pb, pol, 0, M_PI / 2 * k / (nphi - 1)};
        dk_status s = dk_roots_all(dk_along, &sp, 0, M_PI / 2, ANGLE_SCAN / 2,
                                   ANGLE_TOL, theta_rad + k * maxper, maxper,
                                   &count[k], err);
        if (s)
            return s;
    }
    return DK_OK;
}

typedef struct temp_probe {
    dk_angle_problem *pb;
    const char *pol;
    double theta, phi;
} temp_probe;

static double
dk_of_temp(double t, void *p)
{
    temp_probe *tp = p;
    tp->pb->temp_c = t;
    return dk_angle_delta_k(tp->pb, tp->pol, tp->theta, tp->phi);
}

dk_status
dk_angle_ncpm_temperatures(dk_angle_problem *pb, const char pol[3],
                           double theta_rad, double phi_rad, double lo_c,
                           double hi_c, double *temps, int max, int *n,
                           dk_error *err)
{
    *n = 0;
    if (!dk_set_has_temperature(pb->set))
        return dk_error_set(err, DK_EINVAL,
                            "data set '%s' has no temperature dependence; "
                            "noncritical temperatures need one",
                            pb->set->name);
    double keep = pb->temp_c;
    temp_probe tp = {pb, pol, theta_rad, phi_rad};
    dk_status s = dk_roots_all(dk_of_temp, &tp, lo_c, hi_c, TEMP_SCAN, 1e-7,
                               temps, max, n, err);
    pb->temp_c = keep;
    return s;
}

/* The phase-matching θ for the current α nearest @guess; NAN if none.
 * Near a known root a small bracket around the guess is tried first. */
static double
theta_for_alpha(dk_angle_problem *pb, const char *pol, double phi,
                double guess)
{
    scan_probe sp = {pb, pol, 0, phi};
    if (isfinite(guess)) {
        double h = 2e-3, lo = fmax(0, guess - h), hi = fmin(M_PI, guess + h);
        double flo = dk_along(lo, &sp), fhi = dk_along(hi, &sp), r;
        if (isfinite(flo) && isfinite(fhi) && flo * fhi <= 0 &&
            !dk_root_bracketed(dk_along, &sp, lo, hi, ANGLE_TOL, &r, NULL))
            return r;
    }
    double roots[16];
    int nr;
    if (dk_roots_all(dk_along, &sp, 0, M_PI / 2, 900, ANGLE_TOL, roots, 16,
                     &nr, NULL) ||
        nr == 0)
        return NAN;
    double best = roots[0];
    for (int i = 1; i < nr; i++)
        if (!isfinite(guess) || fabs(roots[i] - guess) < fabs(best - guess))
            best = roots[i];
    return best;
}

typedef struct magic_probe {
    dk_angle_problem *pb;
    const char *pol;
    double phi;
    int sign;       /* which side of the pump the signal lies on */
    double theta;   /* last phase-matching θ, a guess for the next */
} magic_probe;

/* n_gs cos Ω − n_gi at the phase-matching θ of this |α|. */
static double
gv_mismatch(double alpha, void *p)
{
    magic_probe *mp = p;
    mp->pb->alpha_rad = mp->sign * alpha;
    double th = theta_for_alpha(mp->pb, mp->pol, mp->phi, mp->theta);
    if (!isfinite(th))
        return NAN;
    mp->theta = th;
    double sp[3], ss[3], si[3];
    dk_mode m[3];
    if (!directions_of(mp->pb, mp->pol, th, mp->phi, sp, ss, si, m, NULL))
        return NAN;
    const dk_waves *w = &mp->pb->waves;
    double ngs = m[0].n - w->signal_um * m[0].dn_dl;
    double ngi = m[1].n - w->idler_um * m[1].dn_dl;
    double cosom = ss[0] * si[0] + ss[1] * si[1] + ss[2] * si[2];
    return ngs * cosom - ngi;
}

dk_status
dk_angle_magic_alpha(dk_angle_problem *pb, const char pol[3], double phi_rad,
                     int sign, double alpha_max_rad, double *alpha_rad,
                     double *theta_rad, dk_error *err)
{
    magic_probe mp = {pb, pol, phi_rad, sign < 0 ? -1 : 1, NAN};
    double keep = pb->alpha_rad;
    /* Start at α = 0: at degeneracy (equal signal and idler in one mode)
     * the group velocities already match collinearly. */
    double a0 = 0, f0 = gv_mismatch(a0, &mp);
    dk_status s = DK_ENOROOT;
    for (double a1 = ALPHA_STEP; a1 <= alpha_max_rad; a1 += ALPHA_STEP) {
        double f1 = gv_mismatch(a1, &mp);
        if (isfinite(f0) && isfinite(f1) && f0 * f1 <= 0) {
            double r;
            s = dk_root_bracketed(gv_mismatch, &mp, a0, a1, 1e-12, &r, err);
            if (!s) {
                gv_mismatch(r, &mp);
                *alpha_rad = mp.sign * r;
                *theta_rad = mp.theta;
            }
            break;
        }
        a0 = a1, f0 = f1;
    }
    pb->alpha_rad = keep;
    if (s == DK_ENOROOT)
        return dk_error_set(err, DK_ENOROOT,
                            "no noncollinear angle up to %.3g deg (signal %s "
                            "Z than the pump) matches the signal and idler "
                            "group velocities",
                            alpha_max_rad / DK_RAD_PER_DEG,
                            mp.sign > 0 ? "farther from" : "nearer to");
    return s;
}

double
dk_external_angle(double theta_rad, double cut_theta_rad, double n)
{
    double x = n * sin(theta_rad - cut_theta_rad);
    if (fabs(x) > 1)
        return NAN;
    return asin(x);
}
