/*
 * dispersion.c - evaluate one axis of a published dispersion data set.
 *
 * Method: the formula is evaluated once in truncated Taylor arithmetic
 * (src/data/jet.h) with λ as the independent variable, which gives n, dn/dλ,
 * d²n/dλ² and d³n/dλ³ exactly (no finite-difference step); a second pass
 * with T as the variable gives dn/dT. The term kinds and the temperature
 * variable are described in deltak/dispersion.h; the published forms they
 * cover include
 *   Sellmeier n² = A + Σ B λ²/(λ² − C) (e.g. Zelmon et al., JOSA B 14,
 *     3319 (1997)),
 *   temperature-dependent n² with f = (T − T0)(T + T0') (Jundt, Opt. Lett.
 *     22, 1553 (1997); Gayer et al., Appl. Phys. B 91, 343 (2008)),
 *   photon-energy forms with logarithms (Skauli et al., J. Appl. Phys. 94,
 *     6447 (2003)),
 *   thermo-optic polynomials dn/dT = Σ c_j λ^e_j (Kato & Takaoka, Appl.
 *     Opt. 41, 5040 (2002); Emanueli & Arie, Appl. Opt. 42, 6661 (2003)),
 *   thermo-optic products (a λ + b)(ΔT + q ΔT²), with q a per-order factor
 *     of the ΔT² row (Kato, IEEE J. Quantum Electron. 30, 2950 (1994)).
 * dk_index_n() (n alone) takes the value-only path of dispersion_batch.c.
 *
 * Thermo-optic add-on: n(λ, T) = n(λ, T_ref)
 *   + Σ_k ΔT^k · factor · g_k · Σ_j c_kj λ^e_j,   ΔT = T − T_ref.
 */
#include <math.h>
#include <stddef.h>

#include "deltak/dispersion.h"
#include "dispersion_batch.h"
#include "jet.h"

const dk_axis_formula *
dk_set_find_axis(const dk_dispersion_set *set, char label)
{
    for (int i = 0; i < set->naxes; i++)
        if (set->axes[i].label == label)
            return &set->axes[i];
    return NULL;
}

int
dk_set_has_temperature(const dk_dispersion_set *set)
{
    return set->temp_form != DK_TEMP_NONE || set->has_thermo;
}

/* The temperature variable f(T) of the set. */
static dk_jet
temp_variable(const dk_dispersion_set *set, dk_jet t)
{
    switch (set->temp_form) {
    case DK_TEMP_DIFFERENCE:
        return jet_sub(t, jet_const(set->t0));
    case DK_TEMP_PRODUCT:
        return jet_mul(jet_sub(t, jet_const(set->t0)),
                       jet_add(t, jet_const(set->t1)));
    case DK_TEMP_NONE:
        break;
    }
    return jet_const(0);
}

/* p(f) by Horner's rule. */
static dk_jet
poly_eval(const dk_poly *p, dk_jet f)
{
    dk_jet r = jet_const(0);
    for (int i = p->n - 1; i >= 0; i--)
        r = jet_add(jet_mul(r, f), jet_const(p->c[i]));
    return r;
}

/* One term of the sum; returns 0 on a domain error. */
static int
term_eval(const dk_term *tm, dk_jet x, dk_jet f, dk_jet *out)
{
    dk_jet s = poly_eval(&tm->strength, f);
    dk_jet x2 = jet_mul(x, x);
    dk_jet v;
    switch (tm->kind) {
    case DK_TERM_CONSTANT:
        v = s;
        break;
    case DK_TERM_POLE:
    case DK_TERM_POLE_X2: {
        dk_jet p = poly_eval(&tm->position, f);
        if (tm->squared)
            p = jet_mul(p, p);
        dk_jet den = jet_sub(x2, p);
        if (den.t[0] == 0)
            return 0;
        dk_jet num = tm->kind == DK_TERM_POLE_X2 ? jet_mul(s, x2) : s;
        v = jet_div(num, den);
        break;
    }
    case DK_TERM_POWER:
        if (x.t[0] <= 0)
            return 0;
        v = jet_mul(s, jet_pow(x, tm->exponent));
        break;
    case DK_TERM_LOG_RATIO: {
        dk_jet a = poly_eval(&tm->position, f);
        dk_jet b = poly_eval(&tm->lower, f);
        dk_jet up = jet_sub(jet_mul(a, a), x2);
        dk_jet lo = jet_sub(jet_mul(b, b), x2);
        if (lo.t[0] == 0)
            return 0;
        dk_jet ratio = jet_div(up, lo);
        if (!(ratio.t[0] > 0))
            return 0;
        v = jet_mul(s, jet_log(ratio));
        break;
    }
    default:
        return 0;
    }
    *out = jet_scale(v, tm->factor);
    return 1;
}

/* n(λ, T) as a jet in whichever of lam, t carries the derivative. */
static int
eval_jet(const dk_dispersion_set *set, const dk_axis_formula *axis,
         dk_jet lam, dk_jet t, dk_jet *n_out)
{
    /* A set whose coefficients do not depend on T is evaluated at its
     * reference temperature; a thermo-optic add-on then carries T. */
    dk_jet f = temp_variable(set, t);
    dk_jet x = lam;
    if (set->variable == DK_VAR_ENERGY_EV)
        x = jet_div(jet_const(set->energy_constant_ev_um), lam);

    dk_jet sum = jet_const(0);
    for (int i = 0; i < axis->nterms; i++) {
        dk_jet v;
        if (!term_eval(&axis->terms[i], x, f, &v))
            return 0;
        sum = jet_add(sum, v);
    }
    dk_jet n = sum;
    if (set->quantity == DK_QTY_N_SQUARED) {
        if (!(sum.t[0] > 0))
            return 0;
        n = jet_pow(sum, 0.5);
    }
    if (set->has_thermo && axis->has_thermo) {
        const dk_thermo *th = &set->thermo;
        dk_jet dt = jet_sub(t, jet_const(th->reference_temperature_c));
        dk_jet dtk = jet_const(1);
        for (int k = 0; k < axis->thermo.orders; k++) {
            dtk = jet_mul(dtk, dt);
            dk_jet inner = jet_const(0);
            for (int j = 0; j < th->nexps; j++)
                inner = jet_add(inner,
                                jet_scale(jet_pow(lam, th->exps[j]),
                                          axis->thermo.c[k][j]));
            n = jet_add(n, jet_scale(jet_mul(dtk, inner),
                                     th->factor *
                                         axis->thermo.order_factor[k]));
        }
    }
    if (!jet_isfinite(n))
        return 0;
    *n_out = n;
    return 1;
}

unsigned
dk_set_range_warnings(const dk_dispersion_set *set, double lambda_um,
                      double temp_c)
{
    unsigned w = 0;
    if (lambda_um < set->wavelength_range_um[0] ||
        lambda_um > set->wavelength_range_um[1])
        w |= DK_WARN_LAMBDA_RANGE;
    if (!dk_set_has_temperature(set)) {
        if (fabs(temp_c - set->reference_temperature_c) > 0.5)
            w |= DK_WARN_NO_TEMP;
    } else {
        const double *r = set->has_thermo && set->temp_form == DK_TEMP_NONE
                              ? set->thermo.temperature_range_c
                              : set->temperature_range_c;
        if (temp_c < r[0] || temp_c > r[1])
            w |= DK_WARN_TEMP_RANGE;
    }
    return w;
}

dk_status
dk_index_eval(const dk_dispersion_set *set, const dk_axis_formula *axis,
              double lambda_um, double temp_c, dk_index_value *out,
              dk_error *err)
{
    if (!(lambda_um > 0) || !isfinite(lambda_um))
        return dk_error_set(err, DK_EINVAL,
                            "wavelength %g um must be positive", lambda_um);
    if (!isfinite(temp_c))
        return dk_error_set(err, DK_EINVAL, "temperature is not finite");

    dk_jet nl, nt;
    if (!eval_jet(set, axis, jet_var(lambda_um), jet_const(temp_c), &nl) ||
        !eval_jet(set, axis, jet_const(lambda_um), jet_var(temp_c), &nt))
        return dk_error_set(err, DK_EDOM,
                            "data set '%s', axis %c has no real index at "
                            "%.6g um, %.6g C: the formula's n^2 is not "
                            "positive there (at a resonance, or far outside "
                            "the fitted range %.6g-%.6g um)",
                            set->name, axis->label, lambda_um, temp_c,
                            set->wavelength_range_um[0],
                            set->wavelength_range_um[1]);

    out->n = nl.t[0];
    out->dn_dl = nl.t[1];
    out->d2n_dl2 = 2 * nl.t[2];
    out->d3n_dl3 = 6 * nl.t[3];
    out->dn_dt = nt.t[1];
    out->warnings = dk_set_range_warnings(set, lambda_um, temp_c);
    return DK_OK;
}

/* Value only: the formula compiled at @temp_c and evaluated in plain
 * arithmetic (dispersion_batch.c), four times less work than a jet. */
double
dk_index_n(const dk_dispersion_set *set, const dk_axis_formula *axis,
           double lambda_um, double temp_c)
{
    if (!(lambda_um > 0))
        return NAN;
    dk_nfast f;
    dk_status s = dk_nfast_compile(set, axis, temp_c, 0, INFINITY, &f);
    if (s == DK_OK)
        return dk_nfast_n(&f, lambda_um);
    if (s == DK_EDOM)
        return NAN;
    dk_jet n;
    if (!eval_jet(set, axis, jet_const(lambda_um), jet_const(temp_c), &n))
        return NAN;
    return n.t[0];
}
