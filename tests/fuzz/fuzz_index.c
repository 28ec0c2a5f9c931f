/*
 * fuzz_index.c - libFuzzer target: load a fuzzed crystal file and
 * evaluate the index of every set and axis (src/data/dispersion.c,
 * src/data/material.c) where formulas break: at and near poles, where
 * n² < 0, far outside the fitted ranges, at extreme temperatures.
 *
 * Promises checked: dk_index_eval and dk_material_n either succeed with
 * finite n and derivatives, or fail with a printable message;
 * dk_index_n gives a finite number or NaN, never an infinity.
 * The last 16 bytes of the input also serve as one (λ, T) pair.
 *
 * Not yet promised: that a successful index is physical (n > 0). A set
 * with "quantity: n" or a thermo-optic add-on far outside its range gives
 * n <= 0 with DK_OK today; the check belongs in dk_index_eval
 * (src/data/dispersion.c). Build with -DDK_FUZZ_REQUIRE_PHYSICAL_N to
 * hold the engine to it once that is fixed.
 */
#include <math.h>

#include "data/crystal_load.h"
#include "deltak/crystal.h"
#include "deltak/material.h"
#include "fuzz_common.h"

static void
evaluate(const dk_crystal *c, const dk_dispersion_set *set,
         const dk_axis_formula *ax, double lambda_um, double temp_c)
{
    dk_index_value v;
    dk_error err = {0};
    if (dk_index_eval(set, ax, lambda_um, temp_c, &v, &err) == DK_OK) {
        FUZZ_REQUIRE(isfinite(v.n) && isfinite(v.dn_dl) &&
                     isfinite(v.d2n_dl2) && isfinite(v.d3n_dl3) &&
                     isfinite(v.dn_dt));
#ifdef DK_FUZZ_REQUIRE_PHYSICAL_N
        FUZZ_REQUIRE(v.n > 0);
#endif
    } else {
        FUZZ_REQUIRE(fuzz_message_ok(&err));
    }
    double n = dk_index_n(set, ax, lambda_um, temp_c);
    FUZZ_REQUIRE(!isinf(n));
    unsigned warnings = 0;
    dk_error err2 = {0};
    if (dk_material_n(c, set, ax->label, lambda_um, temp_c, &n, &warnings,
                      &err2) == DK_OK)
        FUZZ_REQUIRE(isfinite(n));
    else
        FUZZ_REQUIRE(fuzz_message_ok(&err2));
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    dk_crystal *c = NULL;
    dk_error err = {0};
    if (dk_crystal_load_buffer("fuzz.yaml", data, size, &c, &err) != DK_OK)
        return 0;
    double extra[2] = {1.0, 25.0};
    if (size >= 16)
        memcpy(extra, data + size - 16, sizeof extra);
    for (int i = 0; i < c->nsets; i++) {
        const dk_dispersion_set *set = &c->sets[i];
        const double *wr = set->wavelength_range_um;
        const double *tr = set->temperature_range_c;
        double lambdas[] = {wr[0], 0.5 * (wr[0] + wr[1]), wr[1],
                            c->transparency_um[0], c->transparency_um[1],
                            1e-6, 1e-3, 0.35, 1.064, 10.0, 1e4, 1e300,
                            extra[0]};
        double temps[] = {tr[0], tr[1], set->reference_temperature_c,
                          -273.0, 25.0, 1e5, -1e300, extra[1]};
        for (int a = 0; a < set->naxes; a++) {
            const dk_axis_formula *ax = &set->axes[a];
            for (size_t l = 0; l < sizeof lambdas / sizeof lambdas[0]; l++)
                for (size_t t = 0; t < sizeof temps / sizeof temps[0]; t++)
                    evaluate(c, set, ax, lambdas[l], temps[t]);
            /* At the poles of the formula and just beside them. */
            for (int k = 0; k < ax->nterms; k++) {
                const dk_term *tm = &ax->terms[k];
                if (tm->kind != DK_TERM_POLE && tm->kind != DK_TERM_POLE_X2)
                    continue;
                double p = tm->position.n ? tm->position.c[0] : 0;
                if (tm->squared)
                    p *= p;
                if (!(p > 0) || !isfinite(p))
                    continue;
                double x = sqrt(p);
                if (set->variable == DK_VAR_ENERGY_EV && x > 0)
                    x = set->energy_constant_ev_um / x;
                double near[] = {x, nextafter(x, 0), nextafter(x, 1e308),
                                 x * (1 + 1e-9)};
                for (size_t q = 0; q < sizeof near / sizeof near[0]; q++)
                    evaluate(c, set, ax, near[q],
                             set->reference_temperature_c);
            }
        }
    }
    dk_crystal_free(c);
    return 0;
}
