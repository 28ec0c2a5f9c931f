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
 *
 * Speed: the principal indices of the three waves do not depend on the
 * direction, so every scan computes them once ("frozen") and each
 * direction costs only the value-only eigenproblem (optics/modes_value.h);
 * the λ-derivatives (dk_modes_at) are computed only where a caller needs
 * them (dk_angle_waves, the group-velocity match of dk_angle_magic_alpha).
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "deltak/angle.h"
#include "deltak/constants.h"
#include "deltak/nonlinear.h"
#include "deltak/roots.h"
#include "angle_fast.h"
#include "core/roots_sampled.h"
#include "core/simd.h"
#include "optics/modes_value.h"

#define ANGLE_SCAN 1800     /* grid intervals over 90 degrees */
#define ANGLE_TOL 1e-10     /* rad */
#define PHI_SCAN 720        /* grid over 360 degrees for the d_eff search */
#define TEMP_SCAN 400
#define ALPHA_STEP 0.0005   /* rad, scan step of the magic-angle search */

/* The principal indices of the three waves (signal, idler, pump) at the
 * problem's wavelengths and temperature. They do not depend on the
 * direction: a scan computes them once and each direction then costs only
 * the eigenproblem (modes_value.h). */
typedef struct frozen {
    double n[3][3];     /* principal indices of signal, idler, pump */
    double a[3][3];     /* 1/n² of the same */
    int has_d;          /* the crystal has nonlinear data, in d */
    dk_dtensor d;
} frozen;

static int
freeze(const dk_angle_problem *pb, frozen *fz, int want_d, dk_error *err)
{
    const dk_waves *w = &pb->waves;
    const double lam[3] = {w->signal_um, w->idler_um, w->pump_um};
    for (int k = 0; k < 3; k++) {
        if (k == 1 && lam[1] == lam[0]) {
            memcpy(fz->n[1], fz->n[0], sizeof fz->n[0]);
            continue;
        }
        if (dk_principal_n(pb->crystal, pb->set, lam[k], pb->temp_c,
                           fz->n[k], err))
            return 0;
    }
    for (int k = 0; k < 3; k++)
        for (int i = 0; i < 3; i++)
            fz->a[k][i] = 1 / (fz->n[k][i] * fz->n[k][i]);
    fz->has_d = want_d &&
                dk_dtensor_from_crystal(pb->crystal, &fz->d, NULL) == DK_OK;
    return 1;
}

/* The mode labelled @label of wave @k (0 signal, 1 idler, 2 pump) along
 * @s: with λ-derivatives (dk_modes_at) when @fz is NULL, else value-only
 * from the frozen principal indices. 0 on error. */
static int
mode_of(dk_angle_problem *pb, const frozen *fz, int k, double lam,
        const double s[3], char label, dk_mode *m, dk_error *err)
{
    dk_mode two[2];
    if (fz)
        dk_modes_value(pb->crystal, fz->n[k], s, two);
    else if (dk_modes_at(pb->crystal, pb->set, lam, pb->temp_c, s, two,
                         &pb->warnings, err))
        return 0;
    int j = dk_mode_select(two, label);
    if (j < 0)
        return 0;
    *m = two[j];
    return 1;
}

/* Rotate the pump direction by α in the plane of the pump and Z. */
static void
signal_direction(double theta, double phi, double alpha, double s[3])
{
    dk_direction(theta + alpha, phi, s);
}

/* Directions of the three waves for a pump along (θ, φ), and their modes
 * (see mode_of for @fz). Returns 0 when the idler direction is
 * undefined. */
static int
directions_of(dk_angle_problem *pb, const frozen *fz, const char pol[3],
              double theta, double phi, double sp[3], double ss[3],
              double si[3], dk_mode m[3], dk_error *err)
{
    const dk_waves *w = &pb->waves;
    dk_direction(theta, phi, sp);
    if (!mode_of(pb, fz, 2, w->pump_um, sp, pol[2], &m[2], err))
        return 0;
    if (pb->alpha_rad == 0) {
        memcpy(ss, sp, sizeof(double) * 3);
        memcpy(si, sp, sizeof(double) * 3);
        return mode_of(pb, fz, 0, w->signal_um, ss, pol[0], &m[0], err) &&
               mode_of(pb, fz, 1, w->idler_um, si, pol[1], &m[1], err);
    }
    signal_direction(theta, phi, pb->alpha_rad, ss);
    if (!mode_of(pb, fz, 0, w->signal_um, ss, pol[0], &m[0], err))
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
    return mode_of(pb, fz, 1, w->idler_um, si, pol[1], &m[1], err);
}

dk_status
dk_angle_waves(dk_angle_problem *pb, const char pol[3], double theta_rad,
               double phi_rad, double dir[3][3], dk_mode m[3], dk_error *err)
{
    dk_error e2 = {0};
    if (!directions_of(pb, NULL, pol, theta_rad, phi_rad, dir[2], dir[0],
                       dir[1], m, &e2))
        return dk_error_set(err, e2.status ? e2.status : DK_EDOM, "%s",
                            e2.msg[0] ? e2.msg
                                      : "no mode at this direction");
    return DK_OK;
}

/* Which eigenvalue of the projected impermeability a wave takes: the
 * slow (smaller 1/n²) or fast one of a biaxial crystal, the o or e mode
 * of a uniaxial one (dk_mode_select), or none. */
enum { PICK_SLOW, PICK_FAST, PICK_O, PICK_E, PICK_NONE };

static void
picks_of(const dk_crystal *c, const char pol[3], int pick[3])
{
    for (int k = 0; k < 3; k++) {
        char l = pol[k];
        switch (c->optical_class) {
        case DK_BIAXIAL:
            pick[k] = l == 's' ? PICK_SLOW : l == 'f' ? PICK_FAST : PICK_NONE;
            break;
        case DK_UNIAXIAL:
            pick[k] = l == 'o' ? PICK_O : l == 'e' ? PICK_E : PICK_NONE;
            break;
        default:
            pick[k] = PICK_SLOW;   /* isotropic: both modes are 'n' */
        }
    }
}

/* The index of one wave along the normal of basis (p, q), from its
 * principal impermeabilities a_i = 1/n_i²: the eigenproblem of
 * modes_value.c, with the label choice of dk_mode_select (uniaxial: the
 * eigenvalue nearer 1/n_o² is o). Scalar arguments and branch-free
 * selects, so that the line kernel below vectorises. */
DK_INLINE double
pick_index3(double a0, double a1, double a2, double p0, double p1, double p2,
            double q0, double q1, double q2, int pick)
{
    double m11 = 0 + a0 * (p0 * p0) + a1 * (p1 * p1) + a2 * (p2 * p2);
    double m12 = 0 + a0 * (p0 * q0) + a1 * (p1 * q1) + a2 * (p2 * q2);
    double m22 = 0 + a0 * (q0 * q0) + a1 * (q1 * q1) + a2 * (q2 * q2);
    double mean = (m11 + m22) * 0.5, half = (m11 - m22) * 0.5;
    double root = sqrt(half * half + m12 * m12);
    double u0 = mean - root, u1 = mean + root;
    int o_first = fabs(u0 - a0) < fabs(u1 - a0);
    int take_u1 = (pick == PICK_FAST) | ((pick == PICK_O) & !o_first) |
                  ((pick == PICK_E) & o_first);
    double u = take_u1 ? u1 : u0;
    return pick == PICK_NONE ? NAN : 1 / sqrt(u);
}

DK_INLINE double
pick_index(const double a[3], double p0, double p1, double p2, double q0,
           double q1, double q2, int pick)
{
    return pick_index3(a[0], a[1], a[2], p0, p1, p2, q0, q1, q2, pick);
}

static inline double
pick_index_b(const double a[3], const dk_dir_basis *b, int pick)
{
    return pick_index(a, b->p[0], b->p[1], b->p[2], b->q[0], b->q[1],
                      b->q[2], pick);
}

/* Collinear Δk for a wave normal given by sin and cos of θ and φ, with
 * the basis of modes.c in closed form: q = ẑ × s/|ẑ × s| =
 * (−sin φ, cos φ, 0), p = q × s = (cos φ cos θ, sin φ cos θ, −sin θ)
 * (valid for sin θ > 0). */
DK_INLINE double
collinear_dk(const frozen *fz, const int pick[3], const dk_waves *w,
             double st, double ct, double sp, double cp)
{
    double p0 = cp * ct, p1 = sp * ct, p2 = -st, q0 = -sp, q1 = cp;
    double kp = pick_index(fz->a[2], p0, p1, p2, q0, q1, 0, pick[2]) /
                w->pump_um;
    double ks = pick_index(fz->a[0], p0, p1, p2, q0, q1, 0, pick[0]) /
                w->signal_um;
    double ki = pick_index(fz->a[1], p0, p1, p2, q0, q1, 0, pick[1]) /
                w->idler_um;
    return 2 * M_PI * (kp - ks - ki);
}

#define AXIS_SIN 1e-9   /* below this sin θ the normal counts as along Z */

/* Δk at (θ, φ) from frozen principal indices: indices only, no vectors. */
static double
delta_k_frozen(const dk_angle_problem *pb, const frozen *fz,
               const char pol[3], double theta_rad, double phi_rad)
{
    const dk_waves *w = &pb->waves;
    int pick[3];
    picks_of(pb->crystal, pol, pick);
    double st = sin(theta_rad), ct = cos(theta_rad);
    double sp = sin(phi_rad), cp = cos(phi_rad);
    if (pb->alpha_rad == 0 && st > AXIS_SIN)
        return collinear_dk(fz, pick, w, st, ct, sp, cp);
    /* Along Z, or noncollinear: the generic basis of each normal. */
    dk_dir_basis bp, bs, bi;
    double s0[3] = {st * cp, st * sp, ct};
    dk_dir_basis_of(s0, &bp);
    double kp = pick_index_b(fz->a[2], &bp, pick[2]) / w->pump_um;
    if (pb->alpha_rad == 0) {
        double ks = pick_index_b(fz->a[0], &bp, pick[0]) / w->signal_um;
        double ki = pick_index_b(fz->a[1], &bp, pick[1]) / w->idler_um;
        return 2 * M_PI * (kp - ks - ki);
    }
    double ss[3];
    signal_direction(theta_rad, phi_rad, pb->alpha_rad, ss);
    dk_dir_basis_of(ss, &bs);
    double ks = pick_index_b(fz->a[0], &bs, pick[0]) / w->signal_um;
    double si[3], len = 0;
    for (int i = 0; i < 3; i++) {
        si[i] = kp * bp.s[i] - ks * bs.s[i];
        len += si[i] * si[i];
    }
    if (!(len > 0) || !isfinite(len))
        return NAN;
    dk_dir_basis_of(si, &bi);
    double ki = pick_index_b(fz->a[1], &bi, pick[1]) / w->idler_um;
    return 2 * M_PI * (sqrt(len) - ki);
}

/* Sines and cosines of the nodes of a line scan, shared by every mode
 * combination and plane of one dk_angle_solve() call. */
typedef struct node_trig {
    double lo, hi;
    int nscan;
    double *sn, *cs;   /* nscan + 1 each */
    double *values;    /* room for one line's Δk */
} node_trig;

/* The table for nodes lo + (hi − lo)·i/nscan; 0 when out of memory. */
static int
node_trig_init(node_trig *t, double lo, double hi, int nscan)
{
    t->lo = lo, t->hi = hi, t->nscan = nscan;
    t->sn = malloc(3 * (size_t)(nscan + 1) * sizeof *t->sn);
    if (!t->sn)
        return 0;
    t->cs = t->sn + nscan + 1;
    t->values = t->cs + nscan + 1;
    for (int i = 0; i <= nscan; i++) {
        double x = dk_scan_node(lo, hi, nscan, i);
        t->sn[i] = sin(x);
        t->cs[i] = cos(x);
    }
    return 1;
}

/* Collinear Δk at every node of a line (θ at fixed φ, or φ at fixed θ),
 * in one vectorised pass; the bits equal delta_k_frozen()'s at each node,
 * so the bracketing agrees with Brent's own evaluations. */
DK_CLONES static void
line_values(const dk_angle_problem *pb, const frozen *fz, const char pol[3],
            int vary_phi, double fixed, const node_trig *t, double *out)
{
    int pick[3];
    picks_of(pb->crystal, pol, pick);
    const frozen f = *fz;           /* invariants in registers */
    const dk_waves w = pb->waves;
    const double sf = sin(fixed), cf = cos(fixed);
    const int n = t->nscan + 1;
    const double *restrict sn = t->sn, *restrict cs = t->cs;
    double *restrict o = out;
    if (vary_phi) {
#pragma omp simd
        for (int i = 0; i < n; i++)
            o[i] = collinear_dk(&f, pick, &w, sf, cf, sn[i], cs[i]);
    } else {
#pragma omp simd
        for (int i = 0; i < n; i++)
            o[i] = collinear_dk(&f, pick, &w, sn[i], cs[i], sf, cf);
    }
    for (int i = 0; i < n; i++)
        if (!((vary_phi ? sf : sn[i]) > AXIS_SIN)) {
            double x = dk_scan_node(t->lo, t->hi, t->nscan, i);
            out[i] = vary_phi ? delta_k_frozen(pb, fz, pol, fixed, x)
                              : delta_k_frozen(pb, fz, pol, x, fixed);
        }
}

double
dk_angle_delta_k(dk_angle_problem *pb, const char pol[3], double theta_rad,
                 double phi_rad)
{
    frozen fz;
    if (!freeze(pb, &fz, 0, NULL))
        return NAN;
    return delta_k_frozen(pb, &fz, pol, theta_rad, phi_rad);
}

dk_status
dk_angle_fast_init(const dk_angle_problem *pb, const char pol[3],
                   dk_angle_fast *f)
{
    const dk_crystal *c = pb->crystal;
    const char *labels = dk_crystal_axis_labels(c);
    f->pb = *pb;
    memcpy(f->pol, pol, 3);
    f->pol[3] = '\0';
    for (int i = 0; i < 3; i++) {
        if (c->optical_class == DK_UNIAXIAL && i == 1) {
            f->ax[1] = f->ax[0];   /* o again */
            continue;
        }
        char ax = c->optical_class == DK_BIAXIAL    ? labels[i]
                  : c->optical_class == DK_UNIAXIAL ? (i < 2 ? 'o' : 'e')
                                                    : 'n';
        const dk_axis_formula *a = dk_set_find_axis(pb->set, ax);
        if (!a)
            return DK_ENOTFOUND;
        dk_status s = dk_nfast_compile(pb->set, a, pb->temp_c,
                                       c->transparency_um[0],
                                       c->transparency_um[1], &f->ax[i]);
        if (s)
            return s;
    }
    return DK_OK;
}

/* freeze() from compiled axes: the same indices dk_principal_n() gives. */
static int
freeze_fast(const dk_angle_fast *f, const dk_waves *w, frozen *fz)
{
    const double lam[3] = {w->signal_um, w->idler_um, w->pump_um};
    dk_optical_class k = f->pb.crystal->optical_class;
    for (int j = 0; j < 3; j++) {
        double *n = fz->n[j];
        if (j == 1 && lam[1] == lam[0]) {   /* degenerate: as freeze() */
            memcpy(fz->n[1], fz->n[0], sizeof fz->n[0]);
            memcpy(fz->a[1], fz->a[0], sizeof fz->a[0]);
            continue;
        }
        n[0] = dk_nfast_n(&f->ax[0], lam[j]);
        n[1] = k == DK_BIAXIAL ? dk_nfast_n(&f->ax[1], lam[j]) : n[0];
        n[2] = k == DK_ISOTROPIC ? n[0] : dk_nfast_n(&f->ax[2], lam[j]);
        if (!isfinite(n[0]) || !isfinite(n[1]) || !isfinite(n[2]))
            return 0;
        for (int i = 0; i < 3; i++)
            fz->a[j][i] = 1 / (n[i] * n[i]);
    }
    fz->has_d = 0;
    return 1;
}

double
dk_angle_fast_dk(const dk_angle_fast *f, const dk_waves *w, double theta_rad,
                 double phi_rad)
{
    frozen fz;
    if (!freeze_fast(f, w, &fz))
        return NAN;
    dk_angle_problem pb = f->pb;
    pb.waves = *w;
    return delta_k_frozen(&pb, &fz, f->pol, theta_rad, phi_rad);
}

/* The collinear kernel of dk_angle_fast_batch(): principal indices in, Δk
 * out, one vectorised loop with the arithmetic of collinear_dk(). */
DK_CLONES static void
batch_collinear(const int pick[3], double st, double ct, double sp,
                double cp, const double *restrict ls,
                const double *restrict li, const double *restrict lp,
                const double *restrict n9, double *restrict dk, size_t n)
{
    const double p0 = cp * ct, p1 = sp * ct, p2 = -st, q0 = -sp, q1 = cp;
    const int k0 = pick[0], k1 = pick[1], k2 = pick[2];
    const double *restrict sx = n9, *restrict sy = n9 + n;
    const double *restrict sz = n9 + 2 * n, *restrict ix = n9 + 3 * n;
    const double *restrict iy = n9 + 4 * n, *restrict iz = n9 + 5 * n;
    const double *restrict px = n9 + 6 * n, *restrict py = n9 + 7 * n;
    const double *restrict pz = n9 + 8 * n;
#pragma omp simd
    for (size_t c = 0; c < n; c++) {
        double kp = pick_index3(1 / (px[c] * px[c]), 1 / (py[c] * py[c]),
                                1 / (pz[c] * pz[c]), p0, p1, p2, q0, q1, 0,
                                k2) /
                    lp[c];
        double ks = pick_index3(1 / (sx[c] * sx[c]), 1 / (sy[c] * sy[c]),
                                1 / (sz[c] * sz[c]), p0, p1, p2, q0, q1, 0,
                                k0) /
                    ls[c];
        double ki = pick_index3(1 / (ix[c] * ix[c]), 1 / (iy[c] * iy[c]),
                                1 / (iz[c] * iz[c]), p0, p1, p2, q0, q1, 0,
                                k1) /
                    li[c];
        dk[c] = 2 * M_PI * (kp - ks - ki);
    }
}

void
dk_angle_fast_batch(const dk_angle_fast *f, double theta_rad, double phi_rad,
                    const double *ls, const double *li, const double *lp,
                    double *dk, double *work, size_t n)
{
    double st = sin(theta_rad), ct = cos(theta_rad);
    double sp = sin(phi_rad), cp = cos(phi_rad);
    if (f->pb.alpha_rad != 0 || !(st > AXIS_SIN)) {
        for (size_t c = 0; c < n; c++) {
            dk_waves w = {lp[c], ls[c], li[c]};
            dk[c] = dk_angle_fast_dk(f, &w, theta_rad, phi_rad);
        }
        return;
    }
    /* work: the index of each wave on each axis (9n), then the batch
     * kernel's scratch (3n). */
    double *n9 = work, *scratch = work + 9 * n;
    const double *src[3] = {ls, li, lp};
    dk_optical_class k = f->pb.crystal->optical_class;
    for (int j = 0; j < 3; j++) {
        double *nn = n9 + 3 * (size_t)j * n;
        dk_nfast_batch(&f->ax[0], src[j], nn, scratch, n);
        if (k == DK_BIAXIAL)
            dk_nfast_batch(&f->ax[1], src[j], nn + n, scratch, n);
        else
            memcpy(nn + n, nn, n * sizeof *nn);
        if (k == DK_ISOTROPIC)
            memcpy(nn + 2 * n, nn, n * sizeof *nn);
        else
            dk_nfast_batch(&f->ax[2], src[j], nn + 2 * n, scratch, n);
    }
    int pick[3];
    picks_of(f->pb.crystal, f->pol, pick);
    batch_collinear(pick, st, ct, sp, cp, ls, li, lp, n9, dk, n);
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

/* Fill d_eff, walk-offs and indices of @sol at its direction. */
static dk_status
describe_frozen(dk_angle_problem *pb, const frozen *fz,
                dk_angle_solution *sol, dk_error *err)
{
    double sp[3], ss[3], si[3];
    dk_mode m[3];
    if (!directions_of(pb, fz, sol->pol, sol->theta_rad, sol->phi_rad, sp, ss,
                       si, m, NULL))
        return dk_error_set(err, DK_EDOM, "no mode at this direction");
    for (int k = 0; k < 3; k++) {
        sol->walkoff_rad[k] = m[k].walkoff_rad;
        sol->n[k] = m[k].n;
    }
    dk_angle_type_of(sol->pol, sol->type);
    sol->deff_pm_per_v = fz->has_d ? fabs(dk_deff(&fz->d, m[2].e, m[0].e,
                                                  m[1].e))
                                   : NAN;
    return DK_OK;
}

dk_status
dk_angle_describe(dk_angle_problem *pb, dk_angle_solution *sol,
                  dk_error *err)
{
    frozen fz;
    dk_error e2 = {0};
    if (!freeze(pb, &fz, 1, &e2))
        return dk_error_set(err, e2.status ? e2.status : DK_EDOM, "%s",
                            e2.msg[0] ? e2.msg : "no mode at this direction");
    return describe_frozen(pb, &fz, sol, err);
}

/* Δk along one angle, for the root finder. */
typedef struct scan_probe {
    dk_angle_problem *pb;
    const char *pol;
    int vary_phi;       /* 1: the angle is φ at fixed θ; 0: θ at fixed φ */
    double fixed;
    const frozen *fz;   /* the principal indices of pb's waves */
} scan_probe;

static double
dk_along(double x, void *p)
{
    scan_probe *sp = p;
    return sp->vary_phi
               ? delta_k_frozen(sp->pb, sp->fz, sp->pol, sp->fixed, x)
               : delta_k_frozen(sp->pb, sp->fz, sp->pol, x, sp->fixed);
}

/* |d_eff| of a solution as a function of the azimuth φ at fixed θ. In a
 * uniaxial crystal the index surface is symmetric about Z, so the modes
 * at (θ, φ) are those at (θ, 0) turned by φ about Z: their field vectors
 * are found once and rotated (@rot); otherwise each φ is described anew. */
typedef struct phi_probe {
    dk_angle_problem *pb;
    const frozen *fz;
    dk_angle_solution *sol;
    int rot;
    double e[3][3];     /* field vectors of signal, idler, pump at φ = 0 */
} phi_probe;

static void
phi_probe_init(phi_probe *pp, dk_angle_problem *pb, const frozen *fz,
               dk_angle_solution *sol)
{
    pp->pb = pb, pp->fz = fz, pp->sol = sol, pp->rot = 0;
    double sp[3], ss[3], si[3];
    dk_mode m[3];
    if (pb->crystal->optical_class != DK_UNIAXIAL || !fz->has_d ||
        !directions_of(pb, fz, sol->pol, sol->theta_rad, 0, sp, ss, si, m,
                       NULL))
        return;
    for (int k = 0; k < 3; k++)
        memcpy(pp->e[k], m[k].e, sizeof pp->e[k]);
    pp->rot = 1;
}

static double
deff_at(const phi_probe *pp, double phi)
{
    if (pp->rot) {
        double c = cos(phi), sn = sin(phi), e[3][3];
        for (int k = 0; k < 3; k++) {
            e[k][0] = c * pp->e[k][0] - sn * pp->e[k][1];
            e[k][1] = sn * pp->e[k][0] + c * pp->e[k][1];
            e[k][2] = pp->e[k][2];
        }
        double v = fabs(dk_deff(&pp->fz->d, e[2], e[0], e[1]));
        return isfinite(v) ? v : -1;
    }
    dk_angle_solution t = *pp->sol;
    t.phi_rad = phi;
    if (describe_frozen(pp->pb, pp->fz, &t, NULL))
        return -1;
    return isfinite(t.deff_pm_per_v) ? t.deff_pm_per_v : -1;
}

/* The φ maximising |d_eff|: grid, then golden-section refinement. */
static double
best_phi_frozen(dk_angle_problem *pb, const frozen *fz,
                dk_angle_solution *sol)
{
    phi_probe pp;
    phi_probe_init(&pp, pb, fz, sol);
    double best = 0, fbest = -2;
    for (int k = 0; k < PHI_SCAN; k++) {
        double phi = 2 * M_PI * k / PHI_SCAN;
        double f = deff_at(&pp, phi);
        if (f > fbest + 1e-12)
            fbest = f, best = phi;
    }
    double a = best - 2 * M_PI / PHI_SCAN, b = best + 2 * M_PI / PHI_SCAN;
    const double g = (sqrt(5.0) - 1) / 2;
    double x1 = b - g * (b - a), x2 = a + g * (b - a);
    double f1 = deff_at(&pp, x1), f2 = deff_at(&pp, x2);
    for (int it = 0; it < 60; it++) {
        if (f1 > f2) {
            b = x2, x2 = x1, f2 = f1;
            x1 = b - g * (b - a), f1 = deff_at(&pp, x1);
        } else {
            a = x1, x1 = x2, f1 = f2;
            x2 = a + g * (b - a), f2 = deff_at(&pp, x2);
        }
    }
    double phi = fmod(0.5 * (a + b) + 2 * M_PI, 2 * M_PI);
    if (deff_at(&pp, phi) < fbest)
        phi = best;
    sol->phi_rad = phi;
    describe_frozen(pb, fz, sol, NULL);
    return phi;
}

double
dk_angle_best_phi(dk_angle_problem *pb, dk_angle_solution *sol)
{
    frozen fz;
    if (!freeze(pb, &fz, 1, NULL))
        return sol->phi_rad;
    return best_phi_frozen(pb, &fz, sol);
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
root_solution(dk_angle_problem *pb, const frozen *fz, const char *pol,
              int vary_phi, double fixed, double x, const char *plane,
              int uniaxial, double phi_opt, dk_angle_solution *o)
{
    memset(o, 0, sizeof *o);
    memcpy(o->pol, pol, 4);
    snprintf(o->plane, sizeof o->plane, "%s", plane);
    o->theta_rad = vary_phi ? fixed : x;
    o->phi_rad = vary_phi ? x : fixed;
    if (uniaxial) {
        o->phi_rad = isfinite(phi_opt) ? phi_opt : best_phi_frozen(pb, fz, o);
        return 1;
    }
    return describe_frozen(pb, fz, o, NULL) == DK_OK;
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
solve_line(dk_angle_problem *pb, const frozen *fzc, const node_trig *trig,
           const char *pol, int vary_phi, double fixed, const char *plane,
           int uniaxial, double phi_opt, dk_angle_solution *sol, int max,
           int *n, dk_error *err)
{
    const frozen *fz = fzc;
    scan_probe sp = {pb, pol, vary_phi, fixed, fz};
    int collinear = pb->alpha_rad == 0;
    /* Collinear Δk is symmetric about 90°: scan half, mirror the roots. */
    double hi = collinear ? M_PI / 2 : (vary_phi ? M_PI * (1 - 1e-12) : M_PI);
    int nscan = collinear ? ANGLE_SCAN : 2 * ANGLE_SCAN;
    double roots[16];
    int nr;
    dk_status s;
    if (collinear && trig && trig->hi == hi && trig->nscan == nscan) {
        line_values(pb, fz, pol, vary_phi, fixed, trig, trig->values);
        s = dk_roots_sampled(dk_along, &sp, 0, hi, nscan, trig->values,
                             ANGLE_TOL, roots, 16, &nr, err);
    } else {
        s = dk_roots_all(dk_along, &sp, 0, hi, nscan, ANGLE_TOL, roots, 16,
                         &nr, err);
    }
    if (s)
        return s;
    int first = *n;
    for (int r = 0; r < nr && *n < max; r++) {
        dk_angle_solution *o = &sol[*n];
        if (!root_solution(pb, fz, pol, vary_phi, fixed, roots[r], plane,
                           uniaxial, phi_opt, o))
            continue;
        (*n)++;
        double twin = M_PI - roots[r];
        if (!collinear || fabs(twin - roots[r]) < 1e-9 || *n >= max ||
            (vary_phi && twin >= M_PI))
            continue;
        dk_angle_solution *t = &sol[*n];
        if (root_solution(pb, fz, pol, vary_phi, fixed, twin, plane,
                          uniaxial, phi_opt, t) &&
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
    frozen fz;
    if (!freeze(pb, &fz, 1, NULL))
        return DK_OK;   /* a wave outside the transparency: no root */
    node_trig trig, *tp = NULL;
    if (pb->alpha_rad == 0 && node_trig_init(&trig, 0, M_PI / 2, ANGLE_SCAN))
        tp = &trig;
    char combos[8][4];
    int nc = combinations(pb, combos);
    dk_status s = DK_OK;
    for (int k = 0; k < nc && !s; k++) {
        if (only && strncmp(only, combos[k], 3) != 0)
            continue;
        if (c->optical_class == DK_UNIAXIAL) {
            /* Δk does not depend on φ here; solve at φ = 0. */
            s = solve_line(pb, &fz, tp, combos[k], 0, 0.0, "", 1, phi, sol,
                           max, n, err);
        } else if (isfinite(phi)) {
            s = solve_line(pb, &fz, tp, combos[k], 0, phi, "", 0, NAN, sol,
                           max, n, err);
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
                    s = solve_line(pb, &fz, tp, combos[k],
                                   planes[p].vary_phi, planes[p].fixed,
                                   planes[p].name, 0, NAN, sol, max, n, err);
        }
    }
    if (tp)
        free(trig.sn);
    return s;
}

dk_status
dk_angle_curve(dk_angle_problem *pb, const char pol[3], int nphi, int maxper,
               double *theta_rad, int *count, dk_error *err)
{
    if (nphi < 2 || maxper < 1)
        return dk_error_set(err, DK_EINVAL, "the curve needs at least two "
                                            "azimuths");
    frozen fz;
    if (!freeze(pb, &fz, 0, NULL)) {
        for (int k = 0; k < nphi; k++)
            count[k] = 0;
        return DK_OK;
    }
    for (int k = 0; k < nphi; k++) {
        scan_probe sp = {pb, pol, 0, M_PI / 2 * k / (nphi - 1), &fz};
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
    frozen fz;
    if (!freeze(pb, &fz, 0, NULL))
        return NAN;
    scan_probe sp = {pb, pol, 0, phi, &fz};
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
    if (!directions_of(mp->pb, NULL, mp->pol, th, mp->phi, sp, ss, si, m,
                       NULL))
        return NAN;
    const dk_waves *w = &mp->pb->waves;
    double ngs = m[0].n - w->signal_um * m[0].dn_dl;
    double ngi = m[1].n - w->idler_um * m[1].dn_dl;
    /* Collinear, cos Ω is 1 exactly (the product of a unit vector with
     * itself can round below 1, which would hide the root at α = 0 of a
     * degenerate design). */
    double cosom = mp->pb->alpha_rad == 0
                       ? 1
                       : ss[0] * si[0] + ss[1] * si[1] + ss[2] * si[2];
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
