/*
 * bench_simulate.c - speed of the pulse simulator (deltak/simulate.h):
 * a 2^14-sample grid through 1000 steps, for three waves (an OPA in
 * MgO:LiNbO3) and for degenerate SHG, with the pulses filling a small or a
 * large part of the window (samples where every field is negligible skip
 * the nonlinear step). Prints times; asserts nothing (speed is measured,
 * never tested). The scenarios are our own.
 */
#include <stdio.h>
#include <time.h>

#include "deltak/crystal.h"
#include "deltak/simulate.h"

static double
now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

/* CPU time of this process: less disturbed than wall time when other
 * jobs share the machine. */
static double
cpu_now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
    return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

typedef struct scenario {
    const char *what;
    int degenerate;
    double fwhm_fs;       /* every input pulse */
} scenario;

static int
run(const dk_crystal *c, const scenario *sc)
{
    dk_sim_crystal ke = {.crystal = c, .temp_c = 100, .axis = 'e'};
    dk_sim_problem p = {0};
    p.length_mm = 1;
    p.deff_pm_per_v = 14;
    p.qpm = 1;
    p.degenerate = sc->degenerate;
    for (int j = 0; j < 3; j++) {
        p.wave[j].k = dk_sim_crystal_k;
        p.wave[j].k_ctx = &ke;
    }
    if (sc->degenerate) {
        p.wave[0].lambda_um = 1.064;
        p.wave[0].input = (dk_sim_pulse){.shape = DK_SIM_GAUSSIAN,
                                         .fwhm_fs = sc->fwhm_fs,
                                         .peak_gw_per_cm2 = 1};
    } else {
        p.wave[0].lambda_um = 1.55;
        p.wave[1].lambda_um = 1 / (1 / 1.064 - 1 / 1.55);
        p.wave[0].input = (dk_sim_pulse){.shape = DK_SIM_GAUSSIAN,
                                         .fwhm_fs = sc->fwhm_fs,
                                         .peak_gw_per_cm2 = 1e-3};
        p.wave[2].input = (dk_sim_pulse){.shape = DK_SIM_GAUSSIAN,
                                         .fwhm_fs = sc->fwhm_fs,
                                         .peak_gw_per_cm2 = 5};
    }
    /* A largest step of 1 µm: 1000 steps through 1 mm (a few more, since
     * each domain of the grating is cut into equal steps). */
    dk_sim_options o = {.samples = 16384, .dt_fs = 1.0, .fft_planning = 1,
                        .max_step_um = 1.0};
    dk_sim *s;
    dk_error err = {0};
    double t0 = now();
    if (dk_sim_new(&p, &o, &s, &err)) {
        fprintf(stderr, "error: %s\n", err.msg);
        return 1;
    }
    double t1 = now();
    dk_sim_info info;
    dk_sim_get_info(s, &info);
    double best = 1e30, best_cpu = 1e30;
    for (int rep = 0; rep < 3; rep++) {
        double a = now(), ca = cpu_now();
        if (dk_sim_propagate(s, info.step_um, NULL, &err)) {
            fprintf(stderr, "error: %s\n", err.msg);
            dk_sim_free(s);
            return 1;
        }
        double b = now(), cb = cpu_now();
        if (b - a < best)
            best = b - a;
        if (cb - ca < best_cpu)
            best_cpu = cb - ca;
    }
    printf("simulate %-44s %zu samples, %ld steps: %.3f s wall, %.3f s "
           "CPU (%.3f s CPU per 1000 steps; setup %.2f s)\n",
           sc->what, info.samples, info.steps, best, best_cpu,
           best_cpu / info.steps * 1000, t1 - t0);
    dk_sim_free(s);
    return 0;
}

int
main(void)
{
    dk_db *db = NULL;
    dk_error err = {0};
    if (dk_db_load(DK_CRYSTAL_DIR, &db, &err)) {
        fprintf(stderr, "error: %s\n", err.msg);
        return 1;
    }
    const dk_crystal *c = dk_db_find(db, "MgO:LN");
    static const scenario sc[] = {
        {"OPA, 3 waves, 300 fs pulses (1/7 of window)", 0, 300},
        {"OPA, 3 waves, 2 ps pulses (whole window)", 0, 2000},
        {"SHG, 2 waves, 300 fs pulses (1/7 of window)", 1, 300},
        {"SHG, 2 waves, 2 ps pulses (whole window)", 1, 2000},
    };
    int rc = 0;
    for (size_t i = 0; i < sizeof sc / sizeof sc[0]; i++)
        rc |= run(c, &sc[i]);
    dk_db_free(db);
    return rc;
}
