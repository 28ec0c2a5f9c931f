/*
 * qpm.c - collinear quasi-phase matching (formulas and references in
 * deltak/qpm.h).
 *
 * Solvers: the period is explicit, Λ = m / (n_p/λp − n_s/λs − n_i/λi).
 * Temperature and wavelengths are roots of Δk, found by scanning and Brent
 * refinement (deltak/roots.h) so that both branches of a turning tuning
 * curve are reported. The wavelength scan runs over the signal's share of
 * the pump frequency, x = ν_s/ν_p in (0, 1), where Δk is smooth.
 * Hot paths evaluate the three indices value-only with the formula
 * compiled once per temperature (qpm_fast.h, dispersion_batch.h) and keep
 * no range bookkeeping: flags are the design layer's.
 */
#include <math.h>
#include <string.h>

#include "deltak/material.h"
#include "deltak/qpm.h"
#include "deltak/roots.h"
#include "qpm_fast.h"

#define TEMP_SCAN DK_QPM_TEMP_SCAN
#define FREQ_SCAN DK_QPM_FREQ_SCAN
#define TEMP_TOL_C DK_QPM_TEMP_TOL_C
#define FREQ_TOL DK_QPM_FREQ_TOL

/* The axis label a polarisation letter means in this crystal. */
static int
pol_label(const dk_crystal *c, char letter, char *label)
{
    char l = (char)(letter >= 'A' && letter <= 'Z' ? letter + 32 : letter);
    const char *axes = "xyz";
    switch (c->optical_class) {
    case DK_ISOTROPIC:
        *label = 'n';
        return 1;
    case DK_UNIAXIAL:
        if (l == 'e' || l == 'z')
            *label = 'e';
        else if (l == 'o' || l == 'x' || l == 'y')
            *label = 'o';
        else
            return 0;
        return 1;
    case DK_BIAXIAL:
        if (!strchr(axes, l) || l - 'x' == c->grating_axis)
            return 0;
        *label = (char)(l - 32);
        return 1;
    }
    return 0;
}

dk_status
dk_qpm_init(dk_qpm *q, const dk_crystal *c, const dk_dispersion_set *set,
            const char *pol, int order, double duty, double written_temp_c,
            dk_error *err)
{
    memset(q, 0, sizeof *q);
    if (c->poling == DK_POLING_NONE)
        return dk_error_set(err, DK_EINVAL,
                            "%s cannot be periodically poled or orientation-"
                            "patterned; use birefringent phase matching "
                            "('deltak angle') or a poled crystal such as "
                            "MgO:LN, PPKTP or OP-GaAs",
                            c->id);
    if (order < 1 || order > 99)
        return dk_error_set(err, DK_EINVAL,
                            "QPM order %d must be between 1 and 99", order);
    if (!(duty > 0 && duty < 1))
        return dk_error_set(err, DK_EINVAL,
                            "duty cycle %g must lie strictly between 0 and 1",
                            duty);
    if (!isfinite(written_temp_c))
        return dk_error_set(err, DK_EINVAL, "bad writing temperature");
    q->crystal = c;
    q->set = set;
    q->order = order;
    q->duty = duty;
    q->written_temp_c = written_temp_c;
    char polar = (char)("xyz"[c->polar_axis < 0 ? 2 : c->polar_axis]);
    const char *p = pol ? pol : (char[]){polar, polar, polar, 0};
    if (strlen(p) != 3)
        return dk_error_set(err, DK_EINVAL,
                            "polarisation '%s' must have three letters: "
                            "signal, idler, pump (e.g. zzz or eee)",
                            p);
    for (int i = 0; i < 3; i++) {
        if (!pol_label(c, p[i], &q->pol[i]))
            return dk_error_set(err, DK_EINVAL,
                                "polarisation letter '%c' in '%s' does not "
                                "fit %s (%s; beam along %c): use %s",
                                p[i], p, c->id,
                                dk_optical_class_str(c->optical_class),
                                "XYZ"[c->grating_axis],
                                c->optical_class == DK_UNIAXIAL
                                    ? "o or e (z = e)"
                                    : "x, y or z, not the beam axis");
        if (!dk_set_find_axis(set, q->pol[i]))
            return dk_error_set(err, DK_ENOTFOUND,
                                "data set '%s' of %s has no '%c' axis; pick "
                                "another with --dispersion",
                                set->name, c->id, q->pol[i]);
    }
    return DK_OK;
}

dk_status
dk_qpm_material_dk(dk_qpm *q, const dk_waves *w, double temp_c, double *dk,
                   dk_error *err)
{
    double np, ns, ni;
    dk_status s;
    const dk_crystal *c = q->crystal;
    if ((s = dk_material_n(c, q->set, q->pol[2], w->pump_um, temp_c, &np,
                           NULL, err)) ||
        (s = dk_material_n(c, q->set, q->pol[0], w->signal_um, temp_c, &ns,
                           NULL, err)) ||
        (s = dk_material_n(c, q->set, q->pol[1], w->idler_um, temp_c, &ni,
                           NULL, err)))
        return s;
    *dk = 2 * M_PI * (np / w->pump_um - ns / w->signal_um - ni / w->idler_um);
    return DK_OK;
}

dk_status
dk_qpm_fast_init(const dk_qpm *q, double temp_c, double period_um,
                 dk_qpm_fast *f)
{
    const double *tr = q->crystal->transparency_um;
    f->temp_c = temp_c;
    f->grating_k = period_um > 0 ? dk_qpm_grating_k(q, period_um, temp_c) : 0;
    int nax = 0;
    for (int k = 0; k < 3; k++) {
        int same = -1;
        for (int j = 0; j < k; j++)
            if (q->pol[j] == q->pol[k])
                same = j;
        if (same >= 0) {   /* one axis for waves alike: compiled once */
            f->axi[k] = f->axi[same];
            continue;
        }
        const dk_axis_formula *ax = dk_set_find_axis(q->set, q->pol[k]);
        if (!ax)
            return DK_ENOTFOUND;
        dk_status s = dk_nfast_compile(q->set, ax, temp_c, tr[0], tr[1],
                                       &f->ax[nax]);
        if (s)
            return s;
        f->axi[k] = nax++;
    }
    return DK_OK;
}

double
dk_qpm_fast_material(const dk_qpm_fast *f, const dk_waves *w)
{
    double np = dk_nfast_n(dk_qpm_fast_axis(f, 2), w->pump_um);
    double ns = dk_nfast_n(dk_qpm_fast_axis(f, 0), w->signal_um);
    double ni = dk_nfast_n(dk_qpm_fast_axis(f, 1), w->idler_um);
    return 2 * M_PI * (np / w->pump_um - ns / w->signal_um - ni / w->idler_um);
}

double
dk_qpm_fast_dk(const dk_qpm_fast *f, const dk_waves *w)
{
    double dk = dk_qpm_fast_material(f, w);
    return isfinite(dk) ? fabs(dk) - f->grating_k : NAN;
}

double
dk_qpm_fast_dk_share_np(const dk_qpm_fast *f, double pump_um, double np,
                        double x, double *d_dx)
{
    dk_waves w = dk_waves_of_share(pump_um, x);
    double ds = 0, di = 0;
    double ns = dk_nfast_n_d(dk_qpm_fast_axis(f, 0), w.signal_um,
                             d_dx ? &ds : NULL);
    double ni = dk_nfast_n_d(dk_qpm_fast_axis(f, 1), w.idler_um,
                             d_dx ? &di : NULL);
    double dk = 2 * M_PI * (np / w.pump_um - ns / w.signal_um -
                            ni / w.idler_um);
    if (!isfinite(dk)) {
        if (d_dx)
            *d_dx = NAN;
        return NAN;
    }
    if (d_dx) {
        double ngs = ns - w.signal_um * ds, ngi = ni - w.idler_um * di;
        double slope = 2 * M_PI * (ngi - ngs) / pump_um;
        *d_dx = dk < 0 ? -slope : slope;
    }
    return fabs(dk) - f->grating_k;
}

double
dk_qpm_fast_dk_share(const dk_qpm_fast *f, double pump_um, double x,
                     double *d_dx)
{
    return dk_qpm_fast_dk_share_np(f, pump_um,
                                   dk_nfast_n(dk_qpm_fast_axis(f, 2),
                                              pump_um),
                                   x, d_dx);
}

/* Λ(T) / Λ_w from thermal expansion along the grating axis. */
static double
expansion(const dk_qpm *q, double temp_c)
{
    const dk_crystal *c = q->crystal;
    return dk_crystal_expansion_factor(c, c->grating_axis, temp_c) /
           dk_crystal_expansion_factor(c, c->grating_axis, q->written_temp_c);
}

dk_status
dk_qpm_period(dk_qpm *q, const dk_waves *w, double temp_c,
              double *period_written_um, double *period_at_t_um,
              dk_error *err)
{
    double dk;
    dk_status s = dk_qpm_material_dk(q, w, temp_c, &dk, err);
    if (s)
        return s;
    /* The grating has Fourier components at ±2πm/Λ, so either sign of
     * the material mismatch can be compensated. */
    dk = fabs(dk);
    if (!(dk > 0))
        return dk_error_set(err, DK_EDOM,
                            "the waves are already phase-matched without a "
                            "grating (k_p = k_s + k_i): no period needed");
    double at_t = 2 * M_PI * q->order / dk;
    *period_at_t_um = at_t;
    *period_written_um = at_t / expansion(q, temp_c);
    return DK_OK;
}

double
dk_qpm_grating_k(const dk_qpm *q, double period_um, double temp_c)
{
    return 2 * M_PI * q->order / (period_um * expansion(q, temp_c));
}

double
dk_qpm_delta_k(dk_qpm *q, const dk_waves *w, double temp_c, double period_um)
{
    dk_qpm_fast f;
    if (dk_qpm_fast_init(q, temp_c, period_um, &f) == DK_OK)
        return dk_qpm_fast_dk(&f, w);
    double dk;
    if (dk_qpm_material_dk(q, w, temp_c, &dk, NULL))
        return NAN;
    return fabs(dk) - dk_qpm_grating_k(q, period_um, temp_c);
}

typedef struct temp_probe {
    dk_qpm *q;
    const dk_waves *w;
    double period;
} temp_probe;

static double
dk_of_temp(double t, void *p)
{
    temp_probe *tp = p;
    return dk_qpm_delta_k(tp->q, tp->w, t, tp->period);
}

dk_status
dk_qpm_solve_temperature(dk_qpm *q, const dk_waves *w, double period_um,
                         double lo_c, double hi_c, double *temps, int max,
                         int *n, dk_error *err)
{
    if (!(period_um > 0))
        return dk_error_set(err, DK_EINVAL, "period must be positive");
    temp_probe tp = {q, w, period_um};
    return dk_roots_all(dk_of_temp, &tp, lo_c, hi_c, TEMP_SCAN, TEMP_TOL_C,
                        temps, max, n, err);
}

typedef struct freq_probe {
    dk_qpm *q;
    double pump, period, temp;
    int fast;           /* 1: the axes are compiled in f */
    dk_qpm_fast f;
} freq_probe;

static double
dk_of_share(double x, void *p)
{
    freq_probe *fp = p;
    if (fp->fast)
        return dk_qpm_fast_dk_share(&fp->f, fp->pump, x, NULL);
    dk_waves w = dk_waves_of_share(fp->pump, x);
    return dk_qpm_delta_k(fp->q, &w, fp->temp, fp->period);
}

dk_status
dk_qpm_solve_wavelengths(dk_qpm *q, double pump_um, double period_um,
                         double temp_c, dk_waves *sol, int max, int *n,
                         dk_error *err)
{
    *n = 0;
    if (!(period_um > 0) || !(pump_um > 0))
        return dk_error_set(err, DK_EINVAL,
                            "period and pump must be positive");
    double hi_um = q->crystal->transparency_um[1];
    double xlo = pump_um / hi_um, xhi = 1 - pump_um / hi_um;
    if (!(xlo < xhi))
        return dk_error_set(err, DK_EINVAL,
                            "pump %.6g um is too long for %s to carry both "
                            "signal and idler",
                            pump_um, q->crystal->id);
    freq_probe fp = {.q = q, .pump = pump_um, .period = period_um,
                     .temp = temp_c};
    fp.fast = dk_qpm_fast_init(q, temp_c, period_um, &fp.f) == DK_OK;
    double x[64];
    int nx;
    int same = q->pol[0] == q->pol[1];
    /* Equal polarisations make Δk symmetric about x = 1/2: scan one half
     * (from degeneracy outward) at the same resolution. */
    dk_status s = same ? dk_roots_all(dk_of_share, &fp, 0.5, xhi,
                                      FREQ_SCAN / 2, FREQ_TOL, x, 64, &nx,
                                      err)
                       : dk_roots_all(dk_of_share, &fp, xlo, xhi, FREQ_SCAN,
                                      FREQ_TOL, x, 64, &nx, err);
    if (s)
        return s;
    for (int i = nx - 1; i >= 0 && *n < max; i--) {
        /* Equal polarisations: x and 1 − x are one solution; keep the one
         * with the shorter signal. */
        if (same && x[i] < 0.5 - 1e-9)
            continue;
        sol[(*n)++] = dk_waves_of_share(pump_um, x[i]);
    }
    return DK_OK;
}

dk_status
dk_qpm_deff(const dk_qpm *q, double *deff, dk_error *err)
{
    dk_dtensor t;
    dk_status s = dk_dtensor_from_crystal(q->crystal, &t, err);
    if (s)
        return s;
    double e[3][3] = {{0}};
    const dk_crystal *c = q->crystal;
    for (int i = 0; i < 3; i++) {
        char l = q->pol[i];
        if (l == 'n') {
            e[i][0] = e[i][1] = e[i][2] = 1 / sqrt(3.0);
        } else if (l == 'e') {
            e[i][2] = 1;
        } else if (l == 'o') {
            /* Perpendicular to the optic axis Z and to the beam. */
            e[i][c->grating_axis == 0 ? 1 : 0] = 1;
        } else {
            e[i][l - 'X'] = 1;
        }
    }
    double bulk = dk_deff(&t, e[2], e[0], e[1]);
    *deff = fabs(bulk * dk_qpm_deff_factor(q->order, q->duty));
    return DK_OK;
}
