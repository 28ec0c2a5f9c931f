/*
 * qpm_fast.h - the QPM phase mismatch of deltak/qpm.h at one temperature
 * with the three axes compiled once (src/data/dispersion_batch.h), for
 * solvers, sweeps and maps that evaluate it many times (internal).
 *
 *   Δk = |2π (n_p/λp − n_s/λs − n_i/λi)| − 2πm/Λ(T)            (rad/µm)
 *
 * Along the signal's share x = ν_s/ν_p of the pump frequency (pump fixed,
 * λs = λp/x, λi = λp/(1 − x)) the material part has the exact derivative
 *   d/dx 2π (n_p/λp − n_s/λs − n_i/λi) = 2π (n_g,i − n_g,s)/λp,
 * n_g = n − λ dn/dλ the group index of each wave (differentiate
 * n_s x/λp and n_i (1 − x)/λp).
 */
#ifndef DK_QPM_FAST_H
#define DK_QPM_FAST_H

#include "data/dispersion_batch.h"
#include "deltak/qpm.h"

/* The scan grids of the QPM solvers (qpm.c), shared with the sweeps that
 * reproduce their roots by continuation (src/analyses/sweep_trace.c). */
#define DK_QPM_TEMP_SCAN 400     /* grid intervals over the oven range */
#define DK_QPM_FREQ_SCAN 2000    /* grid intervals over the signal share */
#define DK_QPM_TEMP_TOL_C 1e-7
#define DK_QPM_FREQ_TOL 1e-12

typedef struct dk_qpm_fast {
    dk_nfast ax[3];     /* the distinct axes at temp_c, NaN outside the
                         * transparency range */
    int axi[3];         /* the axis of signal, idler, pump in ax */
    double grating_k;   /* 2πm/Λ(T) of the period given, rad/µm */
    double temp_c;
} dk_qpm_fast;

/* The compiled axis of wave @k (0 signal, 1 idler, 2 pump). */
static inline const dk_nfast *
dk_qpm_fast_axis(const dk_qpm_fast *f, int k)
{
    return &f->ax[f->axi[k]];
}

/*
 * dk_qpm_fast_init:
 * Compile @q's three axes at @temp_c; @period_um as written (0: no grating,
 * grating_k = 0).
 * Returns: DK_OK; DK_EDOM / DK_EINVAL from dk_nfast_compile() (the caller
 * then uses dk_qpm_delta_k()).
 */
dk_status dk_qpm_fast_init(const dk_qpm *q, double temp_c, double period_um,
                           dk_qpm_fast *f);

/* 2π (n_p/λp − n_s/λs − n_i/λi), rad/µm; NaN where undefined. */
double dk_qpm_fast_material(const dk_qpm_fast *f, const dk_waves *w);

/* Δk with the grating, as dk_qpm_delta_k(); NaN where undefined. */
double dk_qpm_fast_dk(const dk_qpm_fast *f, const dk_waves *w);

/* Δk at the signal share @x of pump @pump_um and, if @d_dx, dΔk/dx. */
double dk_qpm_fast_dk_share(const dk_qpm_fast *f, double pump_um, double x,
                            double *d_dx);

/* The same with the pump's index @np (dk_nfast_n() of the pump's axis at
 * @pump_um) given: a search over x at a fixed pump computes it once.
 * The same bits as dk_qpm_fast_dk_share(). */
double dk_qpm_fast_dk_share_np(const dk_qpm_fast *f, double pump_um,
                               double np, double x, double *d_dx);

#endif /* DK_QPM_FAST_H */
