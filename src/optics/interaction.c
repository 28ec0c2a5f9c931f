/*
 * interaction.c - energy conservation for three waves (see
 * deltak/interaction.h): 1/λp = 1/λs + 1/λi.
 */
#include <math.h>

#include "deltak/interaction.h"

dk_status
dk_waves_complete(dk_waves *w, dk_error *err)
{
    double *v[3] = {&w->pump_um, &w->signal_um, &w->idler_um};
    int given = 0;
    for (int i = 0; i < 3; i++) {
        if (!isfinite(*v[i]) || *v[i] < 0)
            return dk_error_set(err, DK_EINVAL,
                                "wavelengths must be positive and finite");
        given += *v[i] > 0;
    }
    if (given != 2)
        return dk_error_set(err, DK_EINVAL,
                            "give exactly two of pump, signal and idler "
                            "(the third follows from energy conservation)");
    if (w->pump_um == 0) {
        w->pump_um = 1 / (1 / w->signal_um + 1 / w->idler_um);
        return DK_OK;
    }
    double other = w->signal_um > 0 ? w->signal_um : w->idler_um;
    if (!(other > w->pump_um))
        return dk_error_set(err, DK_EINVAL,
                            "the %s (%.6g um) must be longer than the pump "
                            "(%.6g um): the pump has the highest frequency",
                            w->signal_um > 0 ? "signal" : "idler", other,
                            w->pump_um);
    double third = dk_third_wave_um(w->pump_um, other);
    if (w->signal_um > 0)
        w->idler_um = third;
    else
        w->signal_um = third;
    return DK_OK;
}

dk_waves
dk_waves_shg(double fundamental_um)
{
    dk_waves w = {fundamental_um / 2, fundamental_um, fundamental_um};
    return w;
}

int
dk_waves_given(const dk_waves *w)
{
    return (w->pump_um > 0) + (w->signal_um > 0) + (w->idler_um > 0);
}

double
dk_third_wave_um(double pump_um, double other_um)
{
    double inv = 1 / pump_um - 1 / other_um;
    return inv > 0 && isfinite(inv) ? 1 / inv : NAN;
}

dk_waves
dk_waves_of_share(double pump_um, double share)
{
    dk_waves w = {pump_um, pump_um / share, pump_um / (1 - share)};
    return w;
}
