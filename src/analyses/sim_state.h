/*
 * sim_state.h - the state of one pulsed three-wave-mixing
 * simulation, shared by the files of the engine (deltak/simulate.h):
 *   simulate.c         validation, dk_sim_new/free, dk_sim_run and the
 *                      convergence check;
 *   simulate_grid.c    carriers, the grid rule, k(ω) over the grid, the
 *                      step rule;
 *   simulate_pulse.c   the input pulses and the widths they need;
 *   simulate_step.c    the split-step propagation;
 *   simulate_diag.c    fluences, spectra, durations, photon numbers;
 *   simulate_crystal.c k(ω) from the crystal database.
 *
 * Internal units: z in µm, time in fs, Ω in rad/fs, k in rad/µm, fields
 * a with |a|² in GW/cm², fluence in GW/cm²·fs (= 1e-6 J/cm²).
 * Fields are stored wave after wave, each in FFT order (index 0 is τ = 0
 * or Ω = 0), so that one FFTW plan transforms all of them.
 */
#ifndef DK_SIM_STATE_H
#define DK_SIM_STATE_H

#include <complex.h>
#include <fftw3.h>

#include "deltak/constants.h"
#include "deltak/simulate.h"

/* c in µm/fs. */
/* 1 GW/cm² · fs in J/cm². */
#define SIM_FLUENCE_TO_J_PER_CM2 1e-6
/* Propagators kept for reuse (distinct step lengths of a run). */
#define SIM_CACHE_MAX 8
/* Total memory the propagator cache may take, bytes. */
#define SIM_CACHE_BYTES ((size_t)256 << 20)

/* exp(i D_j(Ω) h) / n for every stored wave, for one step length h. */
typedef struct sim_prop {
    double h_um;            /* NAN: unused slot */
    unsigned long used;     /* last use, for replacement */
    double complex *p;      /* nw × n */
} sim_prop;

struct dk_sim {
    /* The waves as stored: nw = 3 (ω1, ω2, ω3) or 2 (degenerate: ω1, ω3). */
    int nw;
    int role[3];             /* problem index of each stored wave */
    char name[3][40];        /* for messages: "wave 1 ('signal')" */
    double omega0[3];        /* carriers, rad/fs */
    double lambda0[3];       /* µm */
    double k0[3];            /* k at the carriers, rad/µm */
    double n0[3];            /* phase index at the carriers */
    double tau_g[3];         /* dk/dω at the carriers, fs/µm */
    double beta2[3];         /* d²k/dω² at the carriers, fs²/µm */
    double kappa[3];         /* coupling of each stored wave's equation,
                              * 1/(µm √(GW/cm²)); the degenerate
                              * harmonic's includes the 1/2 */
    double dk0;              /* carrier mismatch, rad/µm */
    double length_um;
    int qpm;
    double period_um;        /* 0 without a grating */
    double duty;
    double deff_pm_per_v;
    double deff_first_order; /* pm/V */
    double area_cm2;         /* 0: none */
    int cw_like[3];          /* the wave is CW or driven by CW waves only:
                              * it fills the window by nature */

    /* The grid. */
    size_t n;
    double dt;               /* fs */
    double tau_ref;          /* frame, fs/µm */
    double band[3];          /* W'_j, rad/fs */
    double *omega;           /* Ω_k, FFT order */
    double *disp;            /* D_j(Ω_k), nw × n; NAN where undefined */
    size_t *bad[3];          /* indices where D_j is undefined */
    size_t nbad[3];
    double complex *input;   /* the inputs at z = 0, time domain, nw × n */
    double complex *field;   /* the working state, nw × n */
    double complex *scratch; /* nw × n, for diagnostics */
    fftw_plan to_freq;       /* e^{+iΩτ}, unnormalised */
    fftw_plan to_time;       /* e^{−iΩτ}, unnormalised */
    sim_prop cache[SIM_CACHE_MAX];
    int ncache;
    unsigned long clock;
    double peak_total;       /* max over τ of Σ_j |a_j|² at the input */
    double skip_below;       /* Σ_j |a_j|² under which a block of samples
                              * skips the nonlinear step */

    /* The automatic step. */
    double h_auto;           /* µm */
    dk_sim_step_rule rule;

    /* The last run. */
    int ran;
    long steps;
    double h_max_used;
    double fluence_in[3];    /* GW/cm² fs */
    double fluence_out[3];
    double absorbed[3];
    double mr_defect;
    int record_max;
    size_t nrec;
    double *rec_z;           /* µm, record_max + 2 */
    double *rec_f;           /* nw × (record_max + 2) */
};

/* simulate_grid.c */
dk_status sim_setup_waves(dk_sim *s, const dk_sim_problem *p, dk_error *err);
dk_status sim_setup_grid(dk_sim *s, const dk_sim_problem *p,
                         const dk_sim_options *opt, dk_error *err);
void sim_choose_step(dk_sim *s);

/* dt Σ |a|²: the fluence of a field sampled at spacing dt (the pulses
 * and every step of the run use it). */
static inline double
sim_fluence(const double complex *a, size_t n, double dt)
{
    double sum = 0;
    const double *x = (const double *)a;
    for (size_t i = 0; i < 2 * n; i++)
        sum += x[i] * x[i];
    return sum * dt;
}

/* simulate_pulse.c */
int sim_pulsed(const dk_sim_pulse *in);
double sim_input_band(const dk_sim *s, int j, const dk_sim_pulse *in);
double sim_input_extent(const dk_sim_pulse *in, double band);
dk_status sim_build_inputs(dk_sim *s, const dk_sim_problem *p, double *tedge,
                           double *sedge, dk_error *err);

/* simulate_step.c */
long sim_count_steps(const dk_sim *s, double max_step_um);
void sim_release_cache(dk_sim *s);

/* simulate_diag.c */
dk_status sim_fill_result(dk_sim *s, dk_sim_result *r, dk_error *err);

#endif /* DK_SIM_STATE_H */
