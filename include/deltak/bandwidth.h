/*
 * bandwidth.h - bandwidth as time: the acceptance of a design in
 * frequency for each pair of waves, the transform-limited pulse it
 * supports, the longest crystal that supports a given pulse, and the
 * duration of a pulse after the crystal's own dispersion.
 *
 * Pairs. Over a band of frequencies one wave may be held while the other
 * two move together (energy conservation ω_p = ω_s + ω_i):
 *   signal-idler  pump held, signal +δ, idler −δ   (first order: GVM s−i)
 *   pump-idler    signal held, pump +δ, idler +δ   (GVM p−i)
 *   pump-signal   idler held, pump +δ, signal +δ   (GVM p−s)
 *   SHG           fundamental +δ, harmonic +2δ     (GVM fund.−harm.)
 * The acceptance along a pair is the FWHM in δ (THz, the frequency of
 * either moving wave) of sinc²(Δk(δ)L/2), exact by root finding over the
 * whole band where every wave is inside the transparency (deltak/
 * acceptance.h); to first order it is 2·2.78311/(2π L |GVM|) = 0.8859/
 * (L |GVM|) with GVM the pair's group-velocity mismatch (for SHG 2π·...
 * with the factor of the harmonic's 2δ folded into its GVM).
 *
 * Transform limit. A pulse whose intensity spectrum has the FWHM Δν has
 * at best the duration τ = K/Δν (intensity FWHM), K = 2 ln2/π = 0.441271
 * (Gaussian) or 4 ln²(1+√2)/π² = 0.314833 (sech²) (A. M. Weiner,
 * Ultrafast Optics, Wiley 2009, Table 3.1; the constants follow from the
 * shapes' Fourier transforms). "The acceptance supports τ" means: the
 * sinc² FWHM equals the spectral FWHM of a transform-limited pulse of
 * duration τ — the sinc² transfer then passes the pulse's spectrum to its
 * half points; shorter pulses lose their wings.
 *
 * Longest crystal. The length at which the pair's acceptance equals K/τ,
 * found by bisection in log L over the exact acceptance (which shrinks
 * as 1/L where the GVM rules and as 1/√L where it vanishes). To first
 * order L_max = 0.8859 τ/(K |GVM|), about twice the pulse-splitting
 * length τ/|GVM|.
 *
 * Dispersion. A transform-limited pulse of one wave, after the length L
 * in its own mode: the spectral phase [k(ω) − k(ω0) − k'(ω0)(ω − ω0)] L
 * from the exact k(ω) of the data set (every order, as the simulator
 * uses it), the intensity by a direct Fourier sum, its FWHM between the
 * outermost half-maximum points. For a Gaussian and the GVD term alone
 * τ_out = τ √(1 + (4 ln2 · GDD/τ²)²) (Weiner §4.2), reported beside it.
 */
#ifndef DK_BANDWIDTH_H
#define DK_BANDWIDTH_H

#include "deltak/acceptance.h"
#include "deltak/design.h"

typedef enum dk_pulse_shape {
    DK_SHAPE_GAUSSIAN = 0,
    DK_SHAPE_SECH2
} dk_pulse_shape;

typedef enum dk_pair {
    DK_PAIR_SIGNAL_IDLER = 0,  /* pump held (SHG: fundamental-harmonic) */
    DK_PAIR_PUMP_IDLER,        /* signal held */
    DK_PAIR_PUMP_SIGNAL        /* idler held */
} dk_pair;

#define DK_NPAIRS 3

/* Time-bandwidth product K of a transform-limited pulse (above). */
double dk_time_bandwidth(dk_pulse_shape s);

/* "Gaussian" or "sech2". */
const char *dk_pulse_shape_str(dk_pulse_shape s);

/* K/Δν in fs for a spectral FWHM in THz (> 0); INFINITY for 0. */
double dk_transform_limit_fs(double fwhm_thz, dk_pulse_shape s);

/* K/τ in THz for a duration in fs (> 0). */
double dk_pulse_bandwidth_thz(double fwhm_fs, dk_pulse_shape s);

/* "signal-idler", "pump-idler", "pump-signal"; for SHG the first is
 * "fundamental-harmonic". */
const char *dk_pair_str(dk_pair p, int shg);

/* 1 when pair @p applies to @d (SHG: only the first). */
int dk_pair_applies(const dk_design *d, dk_pair p);

/*
 * dk_design_pair_delta_k:
 * Δk (rad/µm) of @d with the pair @p detuned by @delta_thz (above);
 * NAN where a wave leaves the transparency or Δk is undefined.
 */
double dk_design_pair_delta_k(dk_design *d, dk_pair p, double delta_thz);

/*
 * dk_design_pair_acceptance:
 * The acceptance of @d along pair @p in THz (x = δ; peak near 0), with
 * its first-order estimate from the pair's GVM (linear_fwhm), over the
 * whole band where every wave is in the transparency. @lobes (may be
 * NULL) gets every interval above half (a turning-over curve).
 * Returns: DK_OK; DK_EINVAL (pair does not apply, no length); DK_EDOM
 * (Δk undefined at the operating point); DK_ENOMEM.
 */
dk_status dk_design_pair_acceptance(dk_design *d, dk_pair p,
                                    dk_acceptance *acc,
                                    dk_acceptance_lobes *lobes,
                                    dk_error *err);

/*
 * dk_design_longest_crystal:
 * The longest crystal (mm) whose acceptance along @p supports a
 * transform-limited pulse of @fwhm_fs (> 0) of shape @s (above). The
 * design's length is restored. INFINITY when even 10 m supports it (the
 * pair is matched to every order that matters); searched from 1 µm.
 * Returns: DK_OK; DK_EINVAL (bad duration, pair not applicable); DK_EDOM
 * (Δk undefined); DK_ENOROOT when even 1 µm is too long.
 */
dk_status dk_design_longest_crystal(dk_design *d, dk_pair p, double fwhm_fs,
                                    dk_pulse_shape s, double *length_mm,
                                    dk_error *err);

/*
 * dk_design_pulse_limit:
 * The longest crystal (mm) that supports the pulse along every pair that
 * applies: the shortest of dk_design_longest_crystal() over them, in
 * *length_mm (INFINITY when no pair limits it, 0 when a pair fails even
 * at 1 µm), and that pair in *pair (−1 when none limits).
 * Returns: DK_OK; the other errors of dk_design_longest_crystal().
 */
dk_status dk_design_pulse_limit(dk_design *d, double fwhm_fs,
                                dk_pulse_shape s, double *length_mm,
                                int *pair, dk_error *err);

/*
 * dk_low_conversion_merit:
 * (d_eff L)² / (n_s n_i n_p): the relative efficiency of a low-
 * conversion stage (plane waves, no walk-off or absorption; Boyd,
 * Nonlinear Optics §2.2, efficiency ∝ d_eff² L² / (n_s n_i n_p)), with
 * @deff in pm/V and @length_mm in mm. For ranking, not an efficiency.
 */
double dk_low_conversion_merit(double deff_pm_per_v, double length_mm,
                               const double n[3]);

/* One wave's pulse after its own dispersion. */
typedef struct dk_dispersed {
    double fwhm_in_fs;       /* the transform-limited input */
    double fwhm_out_fs;      /* exact k(ω), every order */
    double gdd_fs2;          /* GVD·L at the carrier */
    double gdd_only_fs;      /* the Gaussian GDD-only closed form (NAN for
                              * sech²) */
    double group_delay_fs;   /* L/v_g at the carrier */
} dk_dispersed;

/*
 * dk_design_dispersed:
 * A transform-limited pulse of @fwhm_fs (> 0), shape @s, on wave @wave
 * (0 signal, 1 idler, 2 pump; SHG 0 fundamental, 2 harmonic) of @d
 * after @length_mm (> 0) of the crystal in the wave's mode.
 * Returns: DK_OK; DK_EINVAL (bad argument); DK_ERANGE when the pulse's
 * band leaves the transparency; DK_ENOMEM; the k(ω) errors.
 */
dk_status dk_design_dispersed(dk_design *d, int wave, double fwhm_fs,
                              dk_pulse_shape s, double length_mm,
                              dk_dispersed *out, dk_error *err);

#endif /* DK_BANDWIDTH_H */
