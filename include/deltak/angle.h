/*
 * angle.h - birefringent (angle) phase matching in uniaxial and biaxial
 * crystals: collinear and noncollinear, every solution, d_eff from the
 * full tensor and the modes' field vectors, walk-off, and the
 * temperature of noncritical phase matching.
 *
 * Collinear mismatch along the unit wave normal s(θ, φ):
 *   Δk = 2π [n_p(s)/λp − n_s(s)/λs − n_i(s)/λi]           (rad/µm)
 * with each wave in one of the two eigenmodes of deltak/modes.h.
 * Noncollinear: the signal leaves the pump at internal angle α in the
 * plane of the pump and the Z axis (α > 0: farther from Z than the pump,
 * θ_s = θ + α; α < 0: nearer to Z); the idler takes the direction of
 * k_p − k_s and
 *   Δk = |k_p − k_s| − 2π n_i(ŝ_i)/λi.
 * d_eff = Σ d_ijk E_p,i E_s,j E_i,k over unit field vectors (Boyd,
 * Nonlinear Optics, 3rd ed. (2008), §2.3; Dmitriev et al., Handbook of
 * Nonlinear Optical Crystals, 3rd ed. (1999), §2.1).
 * Angles: θ from Z, φ from X towards Y, in the optical frame; internal.
 */
#ifndef DK_ANGLE_H
#define DK_ANGLE_H

#include "deltak/crystal.h"
#include "deltak/interaction.h"
#include "deltak/modes.h"

#define DK_ANGLE_MAX_SOL 32

typedef struct dk_angle_problem {
    const dk_crystal *crystal;
    const dk_dispersion_set *set;
    dk_waves waves;
    int shg;            /* signal = idler = fundamental: merge the two
                         * type-II orderings */
    double temp_c;
    double alpha_rad;   /* noncollinear pump-signal angle; 0: collinear */
    unsigned warnings;  /* DK_WARN_* flags met so far */
} dk_angle_problem;

typedef struct dk_angle_solution {
    char pol[4];          /* mode labels of signal, idler, pump */
    char type[4];         /* "I", "II" or "0" */
    char plane[4];        /* biaxial: "XY", "YZ" or "XZ"; else "" */
    double theta_rad, phi_rad;  /* pump wave normal */
    double deff_pm_per_v; /* |d_eff| at (θ, φ) */
    double walkoff_rad[3];/* signal, idler, pump */
    double n[3];          /* eigen-indices of signal, idler, pump */
} dk_angle_solution;

/* The type of three mode (or axis) letters of signal, idler, pump: "0"
 * when all are alike, "I" when signal and idler are alike, else "II". */
void dk_angle_type_of(const char pol[3], char type[4]);

/*
 * dk_angle_waves:
 * The unit wave vectors @dir (signal, idler, pump, optical frame) and the
 * modes @m (same order) of the three waves for the pump along (θ, φ):
 * collinear, or noncollinear with pb->alpha_rad (the idler along
 * k_p − k_s).
 * Returns: DK_OK; DK_EDOM when the idler direction is undefined or a mode
 * is missing; the dk_modes_at() errors.
 */
dk_status dk_angle_waves(dk_angle_problem *pb, const char pol[3],
                         double theta_rad, double phi_rad, double dir[3][3],
                         dk_mode m[3], dk_error *err);

/*
 * dk_angle_delta_k:
 * Δk (rad/µm) for modes @pol (signal, idler, pump labels) with the pump
 * along (θ, φ). Returns NAN where a wave is outside the transparency
 * range or the idler direction is undefined.
 */
double dk_angle_delta_k(dk_angle_problem *pb, const char pol[3],
                        double theta_rad, double phi_rad);

/* Where dk_angle_solve() looks. */
typedef struct dk_angle_search {
    const char *pol;    /* only this mode combination ("ooe"); NULL: all */
    double phi_rad;     /* uniaxial: the azimuth for d_eff (NAN: the one
                         * maximising |d_eff|); biaxial: solve θ at this φ
                         * instead of in the principal planes (NAN: planes) */
    const char *plane;  /* biaxial: only "XY", "YZ" or "XZ"; NULL: all */
} dk_angle_search;

/*
 * dk_angle_solve:
 * Every phase-matching direction of every mode combination, over the
 * whole range that matters: θ in [0°, 180°] (uniaxial, the YZ and XZ
 * planes, or at a given φ) and φ in [0°, 180°) in the XY plane. Δk of a
 * collinear design depends on the direction only through s_i², so each
 * root θ has a twin 180° − θ (φ: 180° − φ); the twin is a different cut
 * with a different d_eff in crystals of low symmetry (BIBO, point group 2)
 * and is listed unless its |d_eff| and walk-offs equal the first's (then
 * the two are the same cut up to symmetry). Noncollinear designs have no
 * such twin and are scanned over the whole range.
 * @opt: restrictions; NULL for none
 *
 * Returns: DK_OK (with *n = 0 when nothing phase-matches); DK_EINVAL for
 * an isotropic crystal or a bad plane.
 */
dk_status dk_angle_solve(dk_angle_problem *pb, const dk_angle_search *opt,
                         dk_angle_solution *sol, int max, int *n,
                         dk_error *err);

/*
 * dk_angle_describe:
 * Fill the d_eff, walk-off and indices of @sol at its direction (used by
 * the solver; public for sweeps of d_eff over φ).
 * Returns: DK_OK or the dk_modes_at() error.
 */
dk_status dk_angle_describe(dk_angle_problem *pb, dk_angle_solution *sol,
                            dk_error *err);

/*
 * dk_angle_curve:
 * The curve of phase-matching directions of modes @pol in a biaxial (or
 * uniaxial) crystal: for each of @nphi azimuths φ_k = k·90°/(nphi − 1)
 * the polar angles θ in [0, 90°] where Δk = 0. @theta_rad[k·maxper + j]
 * holds the j-th root of φ_k and @count[k] how many there are.
 * Returns: DK_OK or DK_EINVAL (nphi < 2).
 */
dk_status dk_angle_curve(dk_angle_problem *pb, const char pol[3], int nphi,
                         int maxper, double *theta_rad, int *count,
                         dk_error *err);

/*
 * dk_angle_best_phi:
 * The azimuth maximising |d_eff| of @sol at its θ (uniaxial crystals,
 * where Δk does not depend on φ); also sets sol->phi_rad and describes
 * the solution there. Returns: the azimuth in radians.
 */
double dk_angle_best_phi(dk_angle_problem *pb, dk_angle_solution *sol);

/*
 * dk_angle_ncpm_temperatures:
 * Temperatures in [@lo_c, @hi_c] at which modes @pol phase-match
 * collinearly along (θ, φ) (e.g. θ = 90°, φ = 0 for the X axis).
 * Returns: DK_OK (*n may be 0); DK_EINVAL when the set has no
 * temperature dependence.
 */
dk_status dk_angle_ncpm_temperatures(dk_angle_problem *pb, const char pol[3],
                                     double theta_rad, double phi_rad,
                                     double lo_c, double hi_c, double *temps,
                                     int max, int *n, dk_error *err);

/*
 * dk_angle_magic_alpha:
 * The noncollinear angle α at which the signal group velocity equals the
 * idler's projected on the signal direction, v_gs = v_gi cos Ω (Ω the
 * signal-idler angle): the broadband condition of noncollinear parametric
 * amplification (G. Cerullo, S. De Silvestri, Rev. Sci. Instrum. 74, 1
 * (2003), eq. 14). For each α the pump angle θ that phase-matches modes
 * @pol is solved; @theta_rad returns it at the answer. @sign (+1 or −1)
 * says on which side of the pump the signal lies: +1 farther from Z than
 * the pump (θ_s = θ + α), −1 nearer to Z (θ_s = θ − α); *alpha_rad has
 * that sign.
 * Returns: DK_OK; DK_ENOROOT when no |α| in (0, @alpha_max_rad] works.
 */
dk_status dk_angle_magic_alpha(dk_angle_problem *pb, const char pol[3],
                               double phi_rad, int sign, double alpha_max_rad,
                               double *alpha_rad, double *theta_rad,
                               dk_error *err);

/*
 * dk_external_angle:
 * Snell's law at the entrance face of a crystal cut at @cut_theta_rad
 * (face normal in the plane of incidence): the external angle of
 * incidence for an internal wave normal at @theta_rad with index @n.
 * Returns NAN beyond total internal reflection.
 */
double dk_external_angle(double theta_rad, double cut_theta_rad, double n);

#endif /* DK_ANGLE_H */
